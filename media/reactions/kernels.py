"""Bit-sliced numba kernels for reaction networks under closure (64 runs per uint64 word).

One round of firing, for every run at once: a reaction fires in a run when
all its reactants are present (the AND of their words; all ones for an
inflow with no reactants), and then every product becomes present (OR the
firing word into it). Firing is decided on the state before the round, so a
round is the same synchronous update as ``ReactionNetwork.step``. Clamped
species are forced after every round, as in ``media.interface.evolve_by_steps``.

The state only grows (after the first round, even under clamps), so every
run reaches a fixed point, the closure, in at most ``n_species + 1`` rounds.
The kernels work on blocks of ``BLOCK_WORDS`` words so a block's species rows
stay in cache while it is iterated, and they stop a block as soon as no run
in it changed in a round.

Reactions come as flattened index lists with pointer arrays: the reactants of
reaction ``r`` are ``reactants[reactant_ptr[r]:reactant_ptr[r + 1]]``, its
products likewise (each species once: stoichiometry does not enter a closure).
"""

import numpy as np

from media.jit import kernel

BLOCK_WORDS = 64


@kernel
def _fire_round(current, nxt, width, reactant_ptr, reactants, product_ptr, products, fire):
    """``nxt`` = ``current`` plus the products of every reaction that fires on ``current`` (first ``width`` words)."""
    n_species = current.shape[0]
    n_reactions = reactant_ptr.shape[0] - 1
    for s in range(n_species):
        for w in range(width):
            nxt[s, w] = current[s, w]
    for r in range(n_reactions):
        for w in range(width):
            fire[w] = ~np.uint64(0)
        for q in range(reactant_ptr[r], reactant_ptr[r + 1]):
            x = reactants[q]
            for w in range(width):
                fire[w] &= current[x, w]
        for q in range(product_ptr[r], product_ptr[r + 1]):
            p = products[q]
            for w in range(width):
                nxt[p, w] |= fire[w]


@kernel
def _clamp_and_compare(current, nxt, width, start, clamp_sites, clamp_words, changed):
    """Force clamped species in ``nxt`` (in order, so a later clamp of the same species wins), then mark
    in ``changed`` the runs of each word whose state differs from ``current``."""
    for j in range(clamp_sites.shape[0]):
        site = clamp_sites[j]
        for w in range(width):
            nxt[site, w] = clamp_words[j, start + w]
    any_change = np.uint64(0)
    for w in range(width):
        changed[w] = np.uint64(0)
    for s in range(current.shape[0]):
        for w in range(width):
            changed[w] |= current[s, w] ^ nxt[s, w]
    for w in range(width):
        any_change |= changed[w]
    return any_change != 0


@kernel
def _evolve_words(words, steps, reactant_ptr, reactants, product_ptr, products, clamp_sites, clamp_words,
                  watch, watch_from, out):
    """Fill ``out[t - watch_from, j, w]`` with species ``watch[j]`` at round ``t`` for ``t = watch_from..steps``."""
    n_species, n_words = words.shape
    current = np.empty((n_species, BLOCK_WORDS), dtype=np.uint64)
    nxt = np.empty((n_species, BLOCK_WORDS), dtype=np.uint64)
    fire = np.empty(BLOCK_WORDS, dtype=np.uint64)
    changed = np.empty(BLOCK_WORDS, dtype=np.uint64)
    for start in range(0, n_words, BLOCK_WORDS):
        width = min(BLOCK_WORDS, n_words - start)
        for s in range(n_species):
            for w in range(width):
                current[s, w] = words[s, start + w]
        if watch_from == 0:
            for j in range(watch.shape[0]):
                for w in range(width):
                    out[0, j, start + w] = current[watch[j], w]
        t = 1
        while t <= steps:
            _fire_round(current, nxt, width, reactant_ptr, reactants, product_ptr, products, fire)
            moved = _clamp_and_compare(current, nxt, width, start, clamp_sites, clamp_words, changed)
            current, nxt = nxt, current
            if t >= watch_from:
                for j in range(watch.shape[0]):
                    for w in range(width):
                        out[t - watch_from, j, start + w] = current[watch[j], w]
            t += 1
            if not moved:
                break  # a fixed point: every later round repeats this state
        while t <= steps:
            if t >= watch_from:
                for j in range(watch.shape[0]):
                    for w in range(width):
                        out[t - watch_from, j, start + w] = current[watch[j], w]
            t += 1


@kernel
def _settle_words(words, max_steps, reactant_ptr, reactants, product_ptr, products, clamp_sites, clamp_words,
                  watch, pattern, met):
    """Iterate every run to its closure; fill ``pattern[j, w]`` with watched species ``watch[j]`` there.

    ``met[w]`` marks the runs whose fixed point came within ``max_steps`` rounds: a run is fixed from
    round ``T`` on exactly when round ``T + 1`` changes nothing, so up to ``max_steps + 1`` rounds are
    computed. This is what Floyd's cycle finding over ``step`` (``settle_by_steps``) reports for a
    fixed point: tortoise and hare meet at the first ``i >= max(T, 1)``, and not at all when
    ``max_steps`` is 0. A run that is not met reports the state after the last round computed.
    """
    n_species, n_words = words.shape
    current = np.empty((n_species, BLOCK_WORDS), dtype=np.uint64)
    nxt = np.empty((n_species, BLOCK_WORDS), dtype=np.uint64)
    fire = np.empty(BLOCK_WORDS, dtype=np.uint64)
    changed = np.empty(BLOCK_WORDS, dtype=np.uint64)
    rounds = max_steps + 1 if max_steps >= 1 else 0
    for start in range(0, n_words, BLOCK_WORDS):
        width = min(BLOCK_WORDS, n_words - start)
        for s in range(n_species):
            for w in range(width):
                current[s, w] = words[s, start + w]
        for w in range(width):
            changed[w] = ~np.uint64(0)  # nothing is known to be fixed before a round is computed
        for _ in range(rounds):
            _fire_round(current, nxt, width, reactant_ptr, reactants, product_ptr, products, fire)
            moved = _clamp_and_compare(current, nxt, width, start, clamp_sites, clamp_words, changed)
            current, nxt = nxt, current
            if not moved:
                break
        for w in range(width):
            met[start + w] = ~changed[w]
        for j in range(watch.shape[0]):
            for w in range(width):
                pattern[j, start + w] = current[watch[j], w]
