"""Transient and cycle lengths from random starts, and attractors by exhaustive enumeration."""

from __future__ import annotations

import numpy as np
import pytest

from media.attractors import attractor_from
from media.boolnet import BooleanNetwork, random_network
from media.eca import ElementaryCA
from naive_measures import seeded_states
from probe.measures import (MeasureUnavailable, attractor_count, compute_measure, cycle_length,
                            mean_attractor_length, transient_length)
from probe.measures.orbits import _brent_scan, orbit_lengths
from ternary_medium import SumModThree

KAUFFMAN = {"A": "B and C", "B": "A or C", "C": "A or B"}


@pytest.mark.parametrize("medium", [
    ElementaryCA(rule=30, width=10), ElementaryCA(rule=45, width=11), ElementaryCA(rule=110, width=12),
    ElementaryCA(rule=90, width=9), ElementaryCA(rule=184, width=10, boundary="fixed"), ElementaryCA(rule=0, width=8),
    random_network(14, 3, 0.5, seed=5), SumModThree(width=7),
], ids=["eca30", "eca45", "eca110", "eca90", "eca184-fixed", "eca0", "rbn", "k3"])
def test_batched_brent_agrees_with_attractor_from(medium):
    # slow twin: media.attractors.attractor_from follows one start with step and a dict of seen states
    transients, cycles = orbit_lengths("transient_length", medium, seed=8, starts=20)
    states, _ = seeded_states(medium, "transient_length", 8, 20)
    for state, transient, cycle in zip(states, transients, cycles):
        first, found = attractor_from(medium, state, max_steps=medium.n_states ** medium.n_sites)
        assert (transient, cycle) == (first, len(found))


def test_brent_scan_streams_across_chunks():
    # computed: the sequence 5, 1, 2, 3, 4, 2, 3, 4, ... has transient 2 and cycle 3
    stream = np.array([[1, 2, 3, 4, 2, 3, 4, 2, 3, 4, 2, 3]], dtype=np.int64)  # times 1..12; time 0 is 5
    for split in (1, 2, 5, 12):
        tortoise, power, lam, cycle = (np.array([5]), np.array([1]), np.array([1]), np.array([0]))
        for start in range(0, stream.shape[1], split):
            _brent_scan(np.ascontiguousarray(stream[:, start:start + split]), tortoise, power, lam, cycle)
        assert cycle.tolist() == [3]


def test_values_for_simple_rules():
    # computed: rule 0 reaches the fixed point 0 in one step from any non-zero start;
    # rule 204 (identity) is already on a fixed point; rule 170 (shift) has periods dividing the width
    assert cycle_length(ElementaryCA(rule=0, width=12)) == 1.0
    assert transient_length(ElementaryCA(rule=204, width=12)) == 0.0
    assert cycle_length(ElementaryCA(rule=204, width=12)) == 1.0
    assert transient_length(ElementaryCA(rule=170, width=12)) == 0.0
    assert 1 < cycle_length(ElementaryCA(rule=170, width=12)) <= 12


def test_wide_rings_are_refused():
    with pytest.raises(MeasureUnavailable) as caught:
        compute_measure("transient_length", ElementaryCA(rule=30, width=64))
    message = str(caught.value)
    assert "\n" not in message
    assert "small rings" in message and "width <= 24" in message and "64 sites" in message
    with pytest.raises(MeasureUnavailable, match="width <= 15"):  # 3^15 <= 2^24 < 3^16
        cycle_length(SumModThree(width=16))
    assert cycle_length(ElementaryCA(rule=0, width=24)) == 1.0  # 24 sites is allowed


def test_kauffman_attractors():
    # Kauffman 1969 via reference-values.md: fixed points 000 and 111, two-cycle 001 <-> 010
    net = BooleanNetwork.from_expressions(KAUFFMAN)
    assert attractor_count(net) == 3.0
    assert mean_attractor_length(net) == pytest.approx(4 / 3)


def test_attractors_of_elementary_rings():
    # computed: under the identity rule every one of the 2^10 states is a fixed point;
    # under rule 0 the only attractor is the all-zero state
    assert attractor_count(ElementaryCA(rule=204, width=10)) == 1024.0
    assert mean_attractor_length(ElementaryCA(rule=204, width=10)) == 1.0
    assert attractor_count(ElementaryCA(rule=0, width=10)) == 1.0


def test_enumeration_limit():
    with pytest.raises(MeasureUnavailable, match="2\\^21 states") as caught:
        attractor_count(random_network(21, 2, 0.5, seed=1))
    assert "\n" not in str(caught.value)
    with pytest.raises(MeasureUnavailable, match="at most 20 sites"):
        compute_measure("mean_attractor_length", ElementaryCA(rule=30, width=21))


@pytest.mark.parametrize("name", ["transient_length", "cycle_length"])
def test_reproducible_for_a_seed_and_different_across_seeds(name):
    medium = ElementaryCA(rule=30, width=12)
    first = compute_measure(name, medium, seed=1, starts=8)
    assert compute_measure(name, medium, seed=1, starts=8) == first
    assert compute_measure(name, medium, seed=2, starts=8) != first
