"""The Derrida value: mean Hamming distance one update after a single-site change.

For random N-K Boolean networks with table bias p the annealed approximation
(Derrida & Pomeau 1986, Europhys. Lett. 1:45) gives ``2p(1-p)K``, which is
1 at the critical point (K = 2 for p = 1/2): below 1 a change dies out on
average (ordered), above 1 it spreads (chaotic).
"""

from __future__ import annotations

from probe.measures.damage_spreading import hamming_after
from probe.measures.diagrams import flip_one_site, random_states
from probe.measures.registry import whole_number
from probe.seeding import rng_for

NAME = "derrida_value"


def derrida_value(medium, *, seed: int = 0, starts: int = 1024) -> float:
    """Mean number of sites that differ one update after one site was changed (sites; not normalised).

    ``starts`` states uniform over the states at every site, from
    ``rng_for(seed, "measure", "derrida_value")``, one uniformly chosen site
    changed in each (as in ``damage_spreading``), one update of both copies
    on the medium as built. For a Boolean network this is the Derrida
    value (the slope of the Derrida map at distance 1).

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> derrida_value(ElementaryCA(rule=150, width=16))  # XOR of three: every change reaches 3 cells
    3.0
    """
    starts = whole_number(starts, "starts", NAME)
    rng = rng_for(seed, "measure", NAME)
    states = random_states(medium, starts, rng)
    changed = flip_one_site(states, medium.n_states, rng)
    return float(hamming_after(medium, states, changed, 1).mean())
