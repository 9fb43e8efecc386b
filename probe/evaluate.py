"""Evaluation: run every (sign, context) pair through a medium and read its meaning.

The result is a :class:`MeaningTable`: ``meanings[c, s]`` is the meaning of
sign ``s`` under the ``c``-th evaluated context, as a pattern number of the
readout sites (base ``n_states``, first readout site least significant), or
``UNDEFINED`` (-1) when the readout did not persist over the window, or, for
one-hot meanings, when not exactly one readout site was on. One-hot meanings
are numbered ``position * (n_states - 1) + value - 1`` from the position and
value of the single non-zero readout site (for two states: its position).

Runs are built and evolved in chunks of contexts, so memory stays bounded
whatever the number of contexts.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from media.jit import kernel
from probe.errors import EnumerationTooLarge
from probe.layout import Layout, ResolvedLayout

UNDEFINED = -1
DEFAULT_MAX_RUNS = 2**26
CHUNK_CELLS = 2**24  # initial-state bytes built at once


@dataclass
class MeaningTable:
    """Meanings of every evaluated (context, sign) pair, with the layout that produced them."""

    meanings: np.ndarray
    resolved: ResolvedLayout

    @property
    def n_contexts(self) -> int:
        return self.meanings.shape[0]

    @property
    def n_signs(self) -> int:
        return self.meanings.shape[1]


def check_size(resolved: ResolvedLayout, max_runs: int) -> None:
    """Refuse an enumeration above ``max_runs`` runs, saying how large it is and what to do."""
    if resolved.runs > max_runs:
        layout = resolved.layout
        if max_runs // resolved.n_signs < 2:
            raise EnumerationTooLarge(
                f"layout {layout.name!r}: {resolved.n_signs} signs x {resolved.n_contexts} contexts = "
                f"{resolved.runs} runs is over the limit of {max_runs}, which leaves too few runs for two "
                f"contexts; use fewer sign sites or raise max_runs")
        suggestion = max(2, max_runs // resolved.n_signs // 16)
        raise EnumerationTooLarge(
            f"layout {layout.name!r}: {resolved.n_signs} signs x {resolved.n_contexts} contexts = "
            f"{resolved.runs} runs is over the limit of {max_runs}; set context_sample = {suggestion} (--sample "
            f"{suggestion} on the command line) to evaluate a seeded sample, "
            f"use fewer sign or context sites, or raise max_runs")


def clamped_sites(resolved: ResolvedLayout) -> np.ndarray:
    """The sites a layout holds at their initial values after every step (clamped signs and contexts)."""
    spec = resolved.layout
    held = [sites for flag, sites in ((spec.clamp_signs, resolved.sign_sites),
                                      (spec.clamp_contexts, resolved.context_sites)) if flag]
    return np.concatenate(held) if held else np.zeros(0, dtype=np.int64)


def meaning_dtype(resolved: ResolvedLayout):
    """The smallest signed integer type that holds every meaning number and -1, to keep big tables small."""
    if resolved.layout.meanings == "one-hot":
        largest = resolved.readout_sites.size * (resolved.n_states - 1)
    else:
        largest = resolved.n_states ** resolved.readout_sites.size
    for dtype in (np.int8, np.int16, np.int32):
        if largest < np.iinfo(dtype).max:
            return dtype
    return np.int64


def initial_states(resolved: ResolvedLayout, start: int, stop: int, n_sites: int) -> np.ndarray:
    """Initial states for contexts ``start .. stop-1`` times every sign; run ``(c - start) * n_signs + s``."""
    states = np.empty(((stop - start) * resolved.n_signs, n_sites), dtype=np.uint8)
    _fill_initial_states(states, resolved.background, resolved.sign_sites, resolved.sign_patterns,
                         resolved.context_sites, resolved.context_patterns(start, stop))
    return states


@kernel
def _fill_initial_states(states, background, sign_sites, sign_patterns, context_sites, context_patterns):
    n_signs = sign_patterns.shape[0]
    for c in range(context_patterns.shape[0]):
        for s in range(n_signs):
            row = states[c * n_signs + s]
            row[:] = background
            for j in range(sign_sites.shape[0]):
                row[sign_sites[j]] = sign_patterns[s, j]
            for j in range(context_sites.shape[0]):
                row[context_sites[j]] = context_patterns[c, j]


def read_meanings(window: np.ndarray, n_states: int, kind: str, persistent=None) -> np.ndarray:
    """Meaning numbers from readout windows of shape ``(runs, times, readout_sites)``.

    ``persistent`` (optional) further marks runs whose readout did not hold,
    e.g. a readout that varies around the attractor.
    """
    first = window[:, 0, :].astype(np.int64)
    held = (window == window[:, :1, :]).all(axis=(1, 2))
    persistent = held if persistent is None else held & np.asarray(persistent, dtype=bool)
    if kind == "one-hot":
        on = first != 0
        single = on.sum(axis=1) == 1
        position = on.argmax(axis=1)
        value = first[np.arange(first.shape[0]), position]
        meanings = position * (n_states - 1) + value - 1
        persistent &= single
    else:
        powers = n_states ** np.arange(first.shape[1], dtype=np.int64)
        meanings = first @ powers
    return np.where(persistent, meanings, UNDEFINED).astype(np.int64)


def evaluate(medium, layout: Layout | ResolvedLayout, *, seed: int = 0, max_runs: int = DEFAULT_MAX_RUNS,
             progress=None) -> MeaningTable:
    """Run every sign under every context and read the meanings.

    Parameters
    ----------
    medium
        Anything that implements :mod:`media.interface`.
    layout
        A :class:`~probe.layout.Layout` (resolved here) or an already resolved one.
    seed
        The run seed (background and context sampling draw from it).
    max_runs
        Refuse enumerations larger than this many runs.
    progress
        Optional callable given the number of runs finished after each chunk.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> table = evaluate(ElementaryCA(rule=90, width=9), Layout(signs="4", contexts="3,5", readout="4", window="2:2"))
    >>> table.meanings.shape
    (4, 2)
    """
    resolved = layout if isinstance(layout, ResolvedLayout) else layout.resolve(medium, seed)
    check_size(resolved, max_runs)
    spec = resolved.layout
    if spec.distinct_contexts:
        resolved = distinct_contexts(medium, resolved)
    clamp_sites = clamped_sites(resolved)

    n_contexts = resolved.n_contexts
    per_chunk = max(1, CHUNK_CELLS // max(1, resolved.n_signs * medium.n_sites))
    meanings = np.empty((n_contexts, resolved.n_signs), dtype=meaning_dtype(resolved))
    for start in range(0, n_contexts, per_chunk):
        stop = min(n_contexts, start + per_chunk)
        states = initial_states(resolved, start, stop, medium.n_sites)
        if spec.on_attractor:
            pattern, constant = medium.settle(states, watch=resolved.readout_sites, max_steps=spec.run_steps,
                                              clamp_sites=clamp_sites, clamp_values=states[:, clamp_sites])
            read = read_meanings(np.asarray(pattern)[:, None, :], resolved.n_states, spec.meanings, constant)
        else:
            t0, t1 = spec.window
            window = medium.evolve(states, t1, watch=resolved.readout_sites, watch_from=t0,
                                   clamp_sites=clamp_sites, clamp_values=states[:, clamp_sites])
            read = read_meanings(window, resolved.n_states, spec.meanings)
        meanings[start:stop] = read.reshape(stop - start, -1)
        if progress is not None:
            progress((stop - start) * resolved.n_signs)
    return MeaningTable(meanings=meanings, resolved=resolved)


def distinct_contexts(medium, resolved: ResolvedLayout) -> ResolvedLayout:
    """``resolved`` with contexts of the same closure merged: the first of each group is kept.

    Every context is run alone (sign sites absent, background elsewhere, contexts clamped if the
    layout clamps them) to the state it settles to; contexts that reach the same full state form
    one group. Under closure ``cl(c + s) = cl(cl(c) + s)``, so the merged contexts have the same
    mapping for every sign (Dittrich & Speroni di Fenizio 2007). The merged set is the context set
    now: ``context_space`` becomes the number of groups.
    """
    spec = resolved.layout
    clamp_sites = resolved.context_sites if spec.clamp_contexts else np.zeros(0, dtype=np.int64)
    every_site = np.arange(medium.n_sites)
    per_chunk = max(1, CHUNK_CELLS // max(1, medium.n_sites))
    seen, kept = set(), []
    for start in range(0, resolved.n_contexts, per_chunk):
        stop = min(resolved.n_contexts, start + per_chunk)
        states = np.empty((stop - start, medium.n_sites), dtype=np.uint8)
        states[:] = resolved.background
        states[:, resolved.sign_sites] = 0
        states[:, resolved.context_sites] = resolved.context_patterns(start, stop)
        settled, _ = medium.settle(states, watch=every_site, max_steps=spec.run_steps, clamp_sites=clamp_sites,
                                   clamp_values=states[:, clamp_sites])
        for offset, key in enumerate(np.packbits(np.asarray(settled, dtype=np.uint8), axis=1)):
            key = key.tobytes()
            if key not in seen:
                seen.add(key)
                kept.append(resolved.context_number(start + offset))
    return replace(resolved, context_numbers=np.asarray(kept, dtype=np.int64), context_space=len(kept))


def light_cone_report(medium, resolved: ResolvedLayout) -> list:
    """Readout sites that the signs or the contexts cannot reach by the window end.

    The meaning cannot depend on such a site's input, so a layout that has
    them wastes readout; the CLI and surveys print them as a warning.
    """
    t1 = resolved.layout.run_steps
    reach_signs = np.asarray(medium.reach(resolved.sign_sites, t1), dtype=bool)
    reach_contexts = np.asarray(medium.reach(resolved.context_sites, t1), dtype=bool)
    messages = []
    for site in resolved.readout_sites.tolist():
        missing = [what for what, mask in (("signs", reach_signs), ("contexts", reach_contexts)) if not mask[site]]
        if missing:
            messages.append(f"layout {resolved.layout.name!r}: readout site {site} lies outside the light cone of "
                            f"the {' and '.join(missing)} by t1 = {t1}; its meaning cannot depend on them")
    return messages
