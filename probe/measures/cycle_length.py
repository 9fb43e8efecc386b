"""Mean cycle length: the period of the attractor reached from a random state."""

from __future__ import annotations

from probe.measures.orbits import orbit_lengths

NAME = "cycle_length"


def cycle_length(medium, *, seed: int = 0, starts: int = 64) -> float:
    """Mean period of the attractor reached (steps; 1 for a fixed point), over seeded random starts.

    ``starts`` states uniform over the states at every site, from
    ``rng_for(seed, "measure", "cycle_length")``, each followed on the medium
    as built until a state repeats (as ``media.attractors.attractor_from``). Each start counts
    once, so attractors with larger basins weigh more (compare
    ``mean_attractor_length``, which weighs every attractor once). Only for
    small media: at most ``2**24`` states (24 binary sites).

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> cycle_length(ElementaryCA(rule=170, width=12)) <= 12  # a shift: the period divides the width
    True
    """
    return float(orbit_lengths(NAME, medium, seed, starts)[1].mean())
