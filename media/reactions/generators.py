"""Random reaction networks: ``n`` species, ``m`` reactions ``a + b -> c``, drawn uniformly and seeded.

The rule
--------
Every reaction has two distinct reactants and one product that is neither
of them (a product equal to a reactant would never add anything to a
closure). There are ``C(n, 2) * (n - 2)`` such reactions; the network is
``m`` of them drawn uniformly *without* replacement, so no reaction appears
twice. The generator is ``numpy.random.default_rng(seed)``; the same
``(n, m, seed)`` always gives the same network.

Species names and groups
------------------------
Probe layouts name sites, and a survey's layouts are fixed text, so the
generator names the species of every network by a stated, seeded rule that
makes one layout fit every network of an ensemble. With group sizes
``sign_species = a``, ``meaning_species = b``, ``context_species = c``, a permutation of the
species drawn from its own stream (``SeedSequence([seed, ROLE_STREAM])``,
independent of the reactions) picks ``a`` species named ``s0..s{a-1}``,
then ``b`` named ``m0..``, then ``c`` named ``c0..``; the remaining species
are ``x0, x1, ...``. Sites are ordered s, m, c, x (so rasters group them).
Because every reaction is drawn uniformly over all species, the species are
exchangeable and the groups are a uniformly random choice of disjoint
species lists; the same network with larger groups keeps the earlier names
(``s0`` stays the same species when ``context_species`` grows).

A layout for such a network is then, for example, ``signs = "s0,s1,s2"``,
``sign_patterns`` one-hot, ``readout = "m0,m1,m2"``, ``meanings = "one-hot"``,
``contexts = "c0,c1,c2,c3"``, ``window = "attractor"``.

Examples
--------
>>> net = random_reaction_network(6, 4, seed=1, sign_species=2, meaning_species=1, context_species=2)
>>> net.site_names()
['s0', 's1', 'm0', 'c0', 'c1', 'x0']
>>> len(net.reactions), all(len(r.reactants) == 2 and len(r.products) == 1 for r in net.reactions)
(4, True)
"""

from __future__ import annotations

import math
import zlib

import numpy as np

from media.errors import require
from media.reactions.network import Reaction, ReactionNetwork

ROLE_STREAM = zlib.crc32(b"reaction-network-roles")
GROUPS = (("sign_species", "s"), ("meaning_species", "m"), ("context_species", "c"))


def possible_reactions(species: int) -> int:
    """How many distinct reactions ``a + b -> c`` (a, b, c distinct) ``species`` species allow."""
    return math.comb(species, 2) * max(0, species - 2)


def reactions_for(species: int, ratio: float) -> int:
    """``m`` for ``n`` species at reactions per species ``ratio``: ``n * ratio`` rounded half up."""
    return int(math.floor(species * float(ratio) + 0.5))


def _whole(value, name, low):
    require(not isinstance(value, bool) and isinstance(value, (int, np.integer)) and value >= low,
            f"{name}: must be a whole number >= {low}, got {value!r}")
    return int(value)


def group_names(species: int, sign_species: int, meaning_species: int, context_species: int) -> list:
    """Names in site order: ``s0.., m0.., c0..`` for the groups, then ``x0..`` for the rest."""
    names = []
    for (_, prefix), size in zip(GROUPS, (sign_species, meaning_species, context_species)):
        names.extend(f"{prefix}{i}" for i in range(size))
    names.extend(f"x{i}" for i in range(species - len(names)))
    return names


def random_reaction_network(species: int, reactions: int, seed: int = 0, *, sign_species: int = 0,
                            meaning_species: int = 0, context_species: int = 0,
                            params: dict | None = None) -> ReactionNetwork:
    """A random network of ``species`` species and ``reactions`` reactions ``a + b -> c`` (rule in the module
    docstring), with species grouped and named for layouts."""
    n = _whole(species, "species", 3)
    m = _whole(reactions, "reactions", 0)
    sizes = [_whole(value, name, 0)
             for (name, _), value in zip(GROUPS, (sign_species, meaning_species, context_species))]
    require(sum(sizes) <= n, f"sign_species + meaning_species + context_species = {sum(sizes)} is more than the "
                             f"{n} species there are")
    total = possible_reactions(n)
    require(m <= total, f"reactions: {m} is more than the {total:,} distinct reactions a + b -> c that {n} species "
                        f"allow; use fewer reactions or more species")
    rng = np.random.default_rng(int(seed))
    chosen = rng.choice(total, size=m, replace=False) if m else np.zeros(0, dtype=np.int64)
    # Unrank: reaction number = pair number * (n - 2) + product rank; pairs (a < b) in lexicographic order.
    pair_numbers, product_ranks = np.divmod(np.asarray(chosen, dtype=np.int64), n - 2)
    firsts = np.repeat(np.arange(n), np.arange(n - 1, -1, -1))
    seconds = np.concatenate([np.arange(a + 1, n) for a in range(n)])
    a, b = firsts[pair_numbers], seconds[pair_numbers]
    c = product_ranks + (product_ranks >= np.minimum(a, b))
    c = c + (c >= np.maximum(a, b))
    order = np.random.default_rng(np.random.SeedSequence([int(seed), ROLE_STREAM])).permutation(n)
    site_of = np.empty(n, dtype=np.int64)
    site_of[order] = np.arange(n)  # the species drawn j-th gets site j
    names = group_names(n, *sizes)
    reaction_list = []
    for x, y, z in zip(site_of[a].tolist(), site_of[b].tolist(), site_of[c].tolist()):
        first, second = sorted((x, y))
        reaction_list.append(Reaction({names[first]: 1, names[second]: 1}, {names[z]: 1}))
    record = {"species": n, "reactions": m, "network_seed": int(seed), "sign_species": sizes[0],
              "meaning_species": sizes[1], "context_species": sizes[2]}
    return ReactionNetwork(names, reaction_list, params=params if params is not None else record)
