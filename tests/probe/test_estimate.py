"""Sampled contexts: the 95% intervals for code_instances and coding_fraction cover the exact value at
about their nominal rate on small cases where the exact value is known (issue 5, "Big context spaces").

The method is in probe/estimate.py: the unbiased U-statistic scaling for code_instances with a
delete-one jackknife standard error, and the Wilson interval (scipy.stats.binomtest) for coding_fraction.
"""

from __future__ import annotations

import numpy as np
import pytest

from media.eca import ElementaryCA
from probe.estimate import estimate_from_sample
from probe.layout import Layout
from probe.tally import tally, tally_meanings

CASES = [(150, "6:6"), (110, "5:5"), (30, "4:4")]


def layout(window, sample=None):
    return Layout(signs="9,10", contexts="2-8,11-17", readout="9,10", window=window, context_sample=sample)


@pytest.mark.parametrize("rule, window", CASES, ids=[f"rule{r}" for r, _ in CASES])
def test_intervals_cover_the_exact_values(rule, window):
    medium = ElementaryCA(rule, 21)
    exact = tally(medium, layout(window))  # 2^14 contexts, all evaluated
    assert exact.code_instances > 0
    covered_instances = covered_fraction = 0
    trials = 120
    for seed in range(trials):
        sampled = tally(medium, layout(window, sample=1024), seed=seed)
        covered_instances += sampled.code_instances_low <= exact.code_instances <= sampled.code_instances_high
        covered_fraction += sampled.coding_fraction_low <= exact.coding_fraction <= sampled.coding_fraction_high
    # Nominal 95%: with 120 trials, fewer than 100 covering would be a 6-sigma shortfall (common practice bound).
    assert covered_instances >= 100, covered_instances
    assert covered_fraction >= 100, covered_fraction


def test_estimate_is_unbiased_on_average():
    medium = ElementaryCA(110, 21)
    exact = tally(medium, layout("5:5")).code_instances
    estimates = [tally(medium, layout("5:5", sample=1024), seed=seed).code_instances_estimate for seed in range(60)]
    spread = np.std(estimates) / np.sqrt(len(estimates))
    assert abs(np.mean(estimates) - exact) < 4 * spread


def test_full_enumeration_gives_exact_degenerate_intervals():
    exact = tally(ElementaryCA(150, 21), layout("6:6"))
    assert exact.code_instances_low == exact.code_instances_high == exact.code_instances_estimate \
        == exact.code_instances
    assert exact.coding_fraction_low == exact.coding_fraction_high == exact.coding_fraction


def test_jackknife_by_hand():
    # Sample of n = 4 from N = 8; X_s = 2 instances; participation d = (1, 1, 1, 1) (two disjoint pairs).
    # Estimate = 2 * 8*7 / (4*3) = 9.333...; leave-one-out = (2 - 1) * 56 / (3*2) = 9.333 for every i,
    # so the jackknife variance is 0 and the interval collapses onto the estimate (raised to X_s = 2 at least).
    result = estimate_from_sample(2, np.array([1, 1, 1, 1]), 4, 8)
    assert result.code_instances_estimate == pytest.approx(56 / 6)
    assert result.code_instances_low == pytest.approx(56 / 6) == result.code_instances_high


def test_sampled_columns_are_reproducible_for_a_seed():
    medium = ElementaryCA(30, 21)
    first = tally(medium, layout("4:4", sample=512), seed=3)
    assert first == tally(medium, layout("4:4", sample=512), seed=3)
    assert first != tally(medium, layout("4:4", sample=512), seed=4)


def test_meaning_table_estimates_match_tally_meanings():
    table = np.array([[0, 1], [1, 0], [0, 1], [0, 0]])
    full = tally_meanings(table, context_space=4)
    assert full.code_instances_estimate == full.code_instances == 2
