"""The number of attractors (fixed points and cycles), by exhaustive enumeration of the state space."""

from __future__ import annotations

from probe.measures.orbits import all_attractors

NAME = "attractor_count"


def attractor_count(medium, *, seed: int = 0) -> float:
    """Number of distinct attractors of ``medium`` as built (a count), from all ``n_states ** n_sites`` states.

    Uses ``media.attractors.attractors``; refused above ``2**20`` states.
    Deterministic: ``seed`` is accepted for the uniform signature and not used.

    Examples
    --------
    Kauffman 1969 (J. Theor. Biol. 22:437): A = B and C, B = A or C, C = A or B.

    >>> from media.boolnet import BooleanNetwork
    >>> attractor_count(BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"}))
    3.0
    """
    return float(len(all_attractors(NAME, medium)))
