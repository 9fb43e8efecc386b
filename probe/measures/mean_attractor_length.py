"""The mean length of the attractors, each attractor counted once, by exhaustive enumeration."""

from __future__ import annotations

import numpy as np

from probe.measures.orbits import all_attractors

NAME = "mean_attractor_length"


def mean_attractor_length(medium, *, seed: int = 0) -> float:
    """Mean number of states on an attractor (steps; 1 for a fixed point), every attractor weighted equally.

    Uses ``media.attractors.attractors`` over all ``n_states ** n_sites``
    states of the medium as built; refused above ``2**20`` states.
    Deterministic: ``seed`` is accepted for the uniform signature and not used.
    Basin-weighted periods are ``cycle_length``.

    Examples
    --------
    Kauffman 1969: fixed points 000 and 111 and the two-cycle 001 <-> 010 give (1 + 2 + 1) / 3.

    >>> from media.boolnet import BooleanNetwork
    >>> round(mean_attractor_length(BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"})), 4)
    1.3333
    """
    return float(np.mean([attractor.length for attractor in all_attractors(NAME, medium)]))
