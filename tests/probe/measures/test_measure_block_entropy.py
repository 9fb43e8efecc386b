"""Entropy density of rows: block entropy over block length, bits per cell (log base 2)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from media.eca import ElementaryCA
from naive_measures import naive_block_entropy
from probe.measures import MeasureOptionError, MeasureUnavailable, block_entropy, compute_measure
from probe.measures.block_entropy import block_codes, entropy_bits
from ternary_medium import SumModThree


def test_null_rule_is_zero():
    # computed: rule 0 sends every row to all zeros after one step, one block value, 0 bits
    assert block_entropy(ElementaryCA(rule=0, width=128)) == 0.0


def test_rule_30_is_near_one_bit_per_cell():
    # computed: rule 30 rows from random starts are statistically close to fair coin flips
    # (Wolfram 1986, Adv. Appl. Math. 7:123, used rule 30 as a random generator), so the
    # 4-block entropy is near its maximum, 1 bit per cell
    value = block_entropy(ElementaryCA(rule=30, width=128))
    assert 0.99 < value <= 1.0


def test_ordering_of_frozen_periodic_and_chaotic_rules():
    # computed: rule 4 freezes into isolated 1s (entropy > 0 but well below 1); rule 30 near 1
    values = {rule: block_entropy(ElementaryCA(rule=rule, width=64), steps=64) for rule in (0, 4, 30)}
    assert values[0] < values[4] < 0.8 < values[30]


def test_agrees_with_naive_counting():
    # computed: Counter over wrapped blocks of step-by-step diagrams
    medium = ElementaryCA(rule=54, width=11)
    expected = naive_block_entropy(medium, seed=7, block=3, steps=9, starts=3, transient=4)
    assert block_entropy(medium, seed=7, block=3, steps=9, starts=3, transient=4) == pytest.approx(expected, rel=1e-12)


def test_three_states_are_measured_in_bits():
    # computed: log base 2 for every k, so at most log2(3) bits per cell
    medium = SumModThree(width=9)
    expected = naive_block_entropy(medium, seed=1, block=2, steps=12, starts=2, transient=3)
    value = block_entropy(medium, seed=1, block=2, steps=12, starts=2, transient=3)
    assert value == pytest.approx(expected, rel=1e-12)
    assert 0 < value <= math.log2(3)


def test_helpers():
    # computed: a ring 0,1 read in 2-blocks gives 01 and 10 (the second wraps), 1 bit
    assert block_codes(np.array([[0, 1]]), 2, 2).tolist() == [1, 2]
    assert entropy_bits(np.array([1, 2])) == 1.0
    assert entropy_bits(np.array([5, 5, 5])) == 0.0


def test_options_are_checked():
    with pytest.raises(MeasureOptionError, match="block = 0"):
        block_entropy(ElementaryCA(rule=30, width=8), block=0)
    with pytest.raises(MeasureUnavailable, match="blocks of 9 sites need a medium of at least 9 sites"):
        block_entropy(ElementaryCA(rule=30, width=8), block=9)
    with pytest.raises(MeasureOptionError, match="steps"):
        block_entropy(ElementaryCA(rule=30, width=8), steps=0)


def test_reproducible_for_a_seed_and_different_across_seeds():
    medium = ElementaryCA(rule=110, width=32)
    first = compute_measure("block_entropy", medium, seed=3, steps=16)
    assert compute_measure("block_entropy", medium, seed=3, steps=16) == first
    assert compute_measure("block_entropy", medium, seed=4, steps=16) != first
