"""The contingency-complexity comparison: statistics agree with scipy.stats, the bootstrap is
reproducible for a seed, rows are reduced to one per elementary-rule class by default (issue 4)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from media import registry
from probe.compare import _kendall_batch, _spearman_batch, compare, correlate, to_markdown


@pytest.mark.parametrize("seed", range(6))
def test_batched_statistics_equal_scipy(seed):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, 6, size=40).astype(float)  # ties on purpose
    y = x + rng.normal(0, 2, size=40)
    y[:5] = y[5]
    # scipy.stats.spearmanr / kendalltau (tau-b) are the reference.
    assert _spearman_batch(x, y) == pytest.approx(stats.spearmanr(x, y).statistic, abs=1e-12)
    assert _kendall_batch(x, y) == pytest.approx(stats.kendalltau(x, y).statistic, abs=1e-12)
    batch = np.stack([rng.permutation(y) for _ in range(5)])
    expected = [stats.kendalltau(x, row).statistic for row in batch]
    assert _kendall_batch(np.broadcast_to(x, batch.shape), batch) == pytest.approx(expected, abs=1e-12)


def test_correlate_point_estimates_are_scipys():
    rng = np.random.default_rng(3)
    x, y = rng.normal(size=30), rng.normal(size=30)
    result = correlate(x, y, n_resamples=199)
    assert result["spearman_rho"] == stats.spearmanr(x, y).statistic
    assert result["kendall_tau"] == stats.kendalltau(x, y).statistic
    assert result["spearman_low"] <= result["spearman_rho"] <= result["spearman_high"]
    assert 0 < result["spearman_p"] <= 1


def test_permutation_p_value_matches_scipy_permutation_test():
    rng = np.random.default_rng(5)
    x = rng.normal(size=25)
    y = 0.4 * x + rng.normal(size=25)
    from probe.seeding import rng_for

    ours = correlate(x, y, seed=7, purpose=("a",), n_resamples=999)["spearman_p"]
    reference = stats.permutation_test((x, y), lambda a, b: stats.spearmanr(a, b).statistic,
                                       permutation_type="pairings", n_resamples=999,
                                       rng=rng_for(7, "permutation", "spearman", "a")).pvalue
    assert ours == pytest.approx(reference)


def test_bootstrap_is_reproducible_for_a_seed():
    rng = np.random.default_rng(1)
    x, y = rng.normal(size=40), rng.normal(size=40)
    first = correlate(x, y, seed=11, n_resamples=299)
    assert first == correlate(x, y, seed=11, n_resamples=299)
    assert first != correlate(x, y, seed=12, n_resamples=299)


def test_constant_columns_give_no_correlation():
    result = correlate([1, 1, 1, 1], [1, 2, 3, 4], n_resamples=99)
    assert math.isnan(result["spearman_rho"]) and math.isnan(result["kendall_p"])


def rows_for_rules(rules, value):
    family = registry.family("eca")
    return [{"rule": rule, **family.annotate({"rule": rule}), "layout": "a", "code_instances": value(rule),
             "codes": 1, "m_x": float(rule % 7)} for rule in rules]


def test_default_reduces_to_one_row_per_class():
    family = registry.family("eca")
    rows = rows_for_rules(range(256), lambda rule: rule)
    table, note = compare(rows, family=family, tallies=("code_instances",), n_resamples=99)
    assert table[0].n == 88 and "88 rows, one per equivalence class" in note
    table_all, note_all = compare(rows, family=family, tallies=("code_instances",), n_resamples=99,
                                  use_all_rows=True)
    assert table_all[0].n == 256 and "all 256 rows" in note_all
    # The kept rows are the minimal representatives.
    kept, _ = family.dedupe(rows)
    assert sorted(row["rule"] for row in kept) == sorted(set(row["class_representative"] for row in rows))


def test_markdown_table_has_one_line_per_row():
    family = registry.family("eca")
    table, _ = compare(rows_for_rules(range(40), lambda rule: rule * 3 % 11), family=family,
                       tallies=("code_instances", "codes"), n_resamples=99)
    text = to_markdown(table)
    assert text.count("\n") == len(table) + 2 and "n/a" in text  # `codes` is constant -> n/a


def test_sparse_capacity_gives_no_interval_rather_than_a_warning(recwarn):
    # Two instances with codes among 40: most resamples hold no coded instance, so rho has no value there.
    x = np.zeros(40)
    x[[3, 17]] = [5.0, 9.0]
    y = np.arange(40, dtype=float)
    result = correlate(x, y, n_resamples=299)
    assert not math.isnan(result["spearman_rho"])
    assert math.isnan(result["spearman_low"]) and math.isnan(result["spearman_high"])
    assert not [w for w in recwarn if "BCa" in str(w.message)]


def test_interval_over_usable_resamples_matches_numpy_percentiles():
    from probe.compare import percentile_interval

    values = np.concatenate([np.linspace(-1, 1, 95), [np.nan] * 5])
    assert percentile_interval(values) == pytest.approx(tuple(np.percentile(np.linspace(-1, 1, 95), [2.5, 97.5])))
    assert all(math.isnan(v) for v in percentile_interval(np.concatenate([np.zeros(80), [np.nan] * 20])))
