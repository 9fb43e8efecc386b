"""Damage spreading: the fraction of sites that differ ``steps`` updates after a single-site change.

Two copies of a random state that differ at one site are run side by side
and their Hamming distance is read after ``steps`` updates; in ordered media
the damage dies out or stays put, in chaotic media it spreads through the
light cone (the classic probe of ordered, critical and chaotic regimes:
Derrida & Pomeau 1986, Europhys. Lett. 1:45; Langton 1990, Physica D 42:12).
"""

from __future__ import annotations

import numpy as np

from probe.measures.diagrams import flip_one_site, random_states
from probe.measures.registry import whole_number
from probe.seeding import rng_for

NAME = "damage_spreading"


def hamming_after(medium, states: np.ndarray, changed: np.ndarray, steps: int) -> np.ndarray:
    """Hamming distance between the rows of ``states`` and ``changed`` after ``steps`` updates."""
    batch = states.shape[0]
    final = medium.evolve(np.concatenate([states, changed]), steps, watch=np.arange(medium.n_sites),
                          watch_from=steps)[:, 0, :]
    return (final[:batch] != final[batch:]).sum(axis=1)


def damage_spreading(medium, *, seed: int = 0, steps: int = 32, starts: int = 64) -> float:
    """Mean Hamming distance after ``steps`` updates over ``n_sites``: the damaged fraction, in [0, 1].

    ``starts`` states uniform over the states at every site, from
    ``rng_for(seed, "measure", "damage_spreading")``; in each, one uniformly
    chosen site is changed (flipped in binary media, set to one of the other
    ``k - 1`` states otherwise). Both copies run on the medium as built. An
    identity rule gives ``1 / n_sites``; damage that heals gives 0.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> damage_spreading(ElementaryCA(rule=204, width=50))  # the identity rule keeps the one changed site
    0.02
    """
    steps = whole_number(steps, "steps", NAME, minimum=0)
    starts = whole_number(starts, "starts", NAME)
    rng = rng_for(seed, "measure", NAME)
    states = random_states(medium, starts, rng)
    changed = flip_one_site(states, medium.n_states, rng)
    return float(hamming_after(medium, states, changed, steps).mean() / medium.n_sites)
