"""Mean transient length: updates from a random state until the state first lies on its attractor."""

from __future__ import annotations

from probe.measures.orbits import orbit_lengths

NAME = "transient_length"


def transient_length(medium, *, seed: int = 0, starts: int = 64) -> float:
    """Mean number of updates before the orbit enters its cycle (steps; 0 when the start is on it).

    ``starts`` states uniform over the states at every site, from
    ``rng_for(seed, "measure", "transient_length")``, each followed on the
    medium as built until a state repeats (batched Brent cycle finding in
    ``probe.measures.orbits``, which agrees with
    ``media.attractors.attractor_from``). Only for small media: at most
    ``2**24`` states (24 binary sites); larger media are refused.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> transient_length(ElementaryCA(rule=0, width=12))  # one step to all zeros, unless already there
    1.0
    """
    return float(orbit_lengths(NAME, medium, seed, starts)[0].mean())
