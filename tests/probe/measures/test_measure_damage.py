"""Damage spreading after a single-site change, and the one-step Derrida value."""

from __future__ import annotations

import numpy as np
import pytest

from media.boolnet import random_network
from media.eca import ElementaryCA
from naive_measures import naive_distances
from probe.measures import compute_measure, damage_spreading, derrida_value
from ternary_medium import SumModThree


def test_identity_rule_keeps_exactly_one_site():
    # computed: rule 204 copies every cell, so the one changed site stays the only difference
    for width in (16, 128):
        assert damage_spreading(ElementaryCA(rule=204, width=width)) == 1 / width


def test_null_rule_heals_and_rule_30_spreads():
    # computed: rule 0 forgets every state in one step; rule 30 spreads damage through its light cone
    assert damage_spreading(ElementaryCA(rule=0, width=128)) == 0.0
    spread = damage_spreading(ElementaryCA(rule=30, width=128))
    assert spread > 20 / 128
    assert damage_spreading(ElementaryCA(rule=30, width=128), steps=8) < spread  # it grows with time


def test_rule_150_changes_three_cells_in_one_step():
    # computed: 150 is XOR of the neighbourhood, so one change reaches exactly three cells
    assert derrida_value(ElementaryCA(rule=150, width=16)) == 3.0


@pytest.mark.parametrize("medium", [ElementaryCA(rule=110, width=12), ElementaryCA(rule=30, width=7, boundary="fixed"),
                                    random_network(12, 3, 0.5, seed=3), SumModThree(width=6)],
                         ids=["eca110", "eca30-fixed", "rbn", "k3"])
def test_agrees_with_naive_stepping(medium):
    # computed: same seeded states, sites and shifts; both copies advanced with step
    distances = naive_distances(medium, "damage_spreading", seed=2, starts=10, steps=5)
    assert damage_spreading(medium, seed=2, starts=10, steps=5) == pytest.approx(np.mean(distances) / medium.n_sites)
    distances = naive_distances(medium, "derrida_value", seed=2, starts=10, steps=1)
    assert derrida_value(medium, seed=2, starts=10) == pytest.approx(np.mean(distances))


# Derrida & Pomeau 1986 (Europhys. Lett. 1:45), via reference-values.md: in random N-K networks with
# bias p, one flipped node differs in 2p(1-p)K nodes one step later, on average over the ensemble
# (exact for one step: K/N of the nodes read the flipped one, N * K/N = K readers, and each reader's
# table is looked up at another row, which differs with probability 2p(1-p)).
# Tolerance: each network's Derrida value (mean over its own starts) is an i.i.d. draw, so the mean
# over M networks has standard error sd/sqrt(M) from their sample standard deviation; we allow 4
# standard errors (a correct implementation fails about once in 16,000 fresh seeds).
NETWORKS, NODES, STARTS = 120, 200, 64


@pytest.mark.parametrize("k", [1, 2, 3, 4])
def test_derrida_value_of_random_networks(k):
    p = 0.5
    values = np.array([derrida_value(random_network(NODES, k, p, seed=1000 * k + m), seed=m, starts=STARTS)
                       for m in range(NETWORKS)])
    mean, standard_error = values.mean(), values.std(ddof=1) / np.sqrt(NETWORKS)
    expected = 2 * p * (1 - p) * k
    assert 0 < standard_error < 0.05  # the sample is large enough for the check to mean something
    assert abs(mean - expected) <= 4 * standard_error, (mean, standard_error, expected)
    # a wrong formula (pK or K) is far outside the same tolerance
    assert abs(mean - k) > 4 * standard_error


@pytest.mark.parametrize("name", ["damage_spreading", "derrida_value"])
def test_reproducible_for_a_seed_and_different_across_seeds(name):
    medium = ElementaryCA(rule=110, width=64)
    first = compute_measure(name, medium, seed=1, starts=16)
    assert compute_measure(name, medium, seed=1, starts=16) == first
    assert compute_measure(name, medium, seed=2, starts=16) != first
