"""Correlating tallies with measures: Spearman and Kendall, bootstrap intervals, permutation p-values.

All statistics come from ``scipy.stats``: ``spearmanr`` and ``kendalltau``
for the point estimates, ``bootstrap`` (paired, percentile method) for 95%
confidence intervals, and ``permutation_test`` (pairings) for two-sided
p-values. Inside the resampling loops the statistics are evaluated on whole
batches at once: Spearman's rho as the Pearson correlation of ``rankdata``
ranks, Kendall's tau-b from pair signs in a numba kernel; both equal the
scipy functions (the tests check this) and only exist because those functions
take one sample at a time.

By default rows are first reduced to one per equivalence class when the
family can say which rows stand for the same medium (``dedupe``), so that no
class counts several times; the output says so.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import asdict, dataclass

import numpy as np
from scipy import stats

from media.jit import kernel
from probe.seeding import rng_for

TALLY_COLUMNS = ("code_instances", "codes", "coding_contexts", "coding_fraction", "distinct_mappings",
                 "undefined_fraction", "co_information_bits")
MEASURE_PREFIX = "m_"
DEFAULT_RESAMPLES = 1999


@dataclass(frozen=True)
class Correlation:
    """One row of the comparison table."""

    layout: str
    tally: str
    measure: str
    n: int
    spearman_rho: float
    spearman_low: float
    spearman_high: float
    spearman_p: float
    kendall_tau: float
    kendall_low: float
    kendall_high: float
    kendall_p: float

    def as_dict(self) -> dict:
        return asdict(self)


def _spearman_batch(x, y, axis=-1):
    rx = stats.rankdata(x, axis=axis)
    ry = stats.rankdata(y, axis=axis)
    rx = rx - rx.mean(axis=axis, keepdims=True)
    ry = ry - ry.mean(axis=axis, keepdims=True)
    denominator = np.sqrt((rx * rx).sum(axis=axis) * (ry * ry).sum(axis=axis))
    with np.errstate(invalid="ignore", divide="ignore"):
        return (rx * ry).sum(axis=axis) / denominator


@kernel
def _kendall_rows(x, y):
    out = np.empty(x.shape[0])
    n = x.shape[1]
    for b in range(x.shape[0]):
        concordance = 0.0
        x_pairs = 0.0
        y_pairs = 0.0
        for i in range(n):
            for j in range(i + 1, n):
                dx = np.sign(x[b, i] - x[b, j])
                dy = np.sign(y[b, i] - y[b, j])
                concordance += dx * dy
                x_pairs += dx * dx
                y_pairs += dy * dy
        denominator = np.sqrt(x_pairs * y_pairs)
        out[b] = concordance / denominator if denominator > 0 else np.nan
    return out


def _kendall_batch(x, y, axis=-1):
    x = np.moveaxis(np.asarray(x, dtype=np.float64), axis, -1)
    y = np.moveaxis(np.asarray(y, dtype=np.float64), axis, -1)
    shape = x.shape[:-1]
    x2 = np.ascontiguousarray(x.reshape(-1, x.shape[-1]))
    y2 = np.ascontiguousarray(np.broadcast_to(y, x.shape).reshape(-1, x.shape[-1]))
    return _kendall_rows(x2, y2).reshape(shape)


def spearman_rho(x, y) -> float:
    """Spearman's rho from ``scipy.stats.spearmanr``."""
    return float(stats.spearmanr(x, y).statistic)


def kendall_tau(x, y) -> float:
    """Kendall's tau-b from ``scipy.stats.kendalltau``."""
    return float(stats.kendalltau(x, y).statistic)


def correlate(x, y, *, seed: int = 0, purpose=(), n_resamples: int = DEFAULT_RESAMPLES) -> dict:
    """Spearman and Kendall estimates, 95% bootstrap intervals and permutation p-values for one pair.

    Returns NaN entries when either variable is constant (no correlation is defined).

    Examples
    --------
    >>> result = correlate([1, 2, 3, 4, 5, 6], [2, 1, 4, 3, 6, 5], n_resamples=199)
    >>> round(result["spearman_rho"], 4), round(result["kendall_tau"], 4)
    (0.8286, 0.6)
    """
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    out = {"n": int(x.size)}
    constant = x.size < 3 or np.ptp(x) == 0 or np.ptp(y) == 0
    for name, point, batch in (("spearman", spearman_rho, _spearman_batch), ("kendall", kendall_tau, _kendall_batch)):
        key = "rho" if name == "spearman" else "tau"
        if constant:
            out.update({f"{name}_{key}": math.nan, f"{name}_low": math.nan, f"{name}_high": math.nan,
                        f"{name}_p": math.nan})
            continue
        out[f"{name}_{key}"] = point(x, y)
        chunk = None
        with warnings.catch_warnings():
            # A resample in which one variable is constant has no correlation (NaN); handled below.
            warnings.simplefilter("ignore", stats.DegenerateDataWarning)
            interval = stats.bootstrap((x, y), batch, paired=True, vectorized=True, n_resamples=n_resamples,
                                       method="percentile", batch=chunk,
                                       rng=rng_for(seed, "bootstrap", name, *purpose))
        low, high = percentile_interval(interval.bootstrap_distribution)
        test = stats.permutation_test((x, y), batch, permutation_type="pairings", vectorized=True,
                                      n_resamples=n_resamples, batch=chunk,
                                      rng=rng_for(seed, "permutation", name, *purpose))
        out.update({f"{name}_low": float(low), f"{name}_high": float(high), f"{name}_p": float(test.pvalue)})
    return out


def percentile_interval(distribution, confidence: float = 0.95, usable: float = 0.9) -> tuple:
    """The percentile interval of a bootstrap distribution, over the resamples where the statistic exists.

    Resamples that draw a constant variable have no rank correlation. When at least ``usable`` of them
    have one, the interval is taken over those (the same percentiles scipy's percentile method takes);
    otherwise there is too little variation to resample and the interval is NaN (shown as n/a).
    """
    finite = np.asarray(distribution, dtype=float)
    finite = finite[np.isfinite(finite)]
    if finite.size < usable * np.asarray(distribution).size or finite.size == 0:
        return math.nan, math.nan
    tail = (1 - confidence) / 2 * 100
    low, high = np.percentile(finite, [tail, 100 - tail])
    return float(low), float(high)


def measure_columns(rows: list) -> list:
    """Measure columns present in ``rows`` (their names start with ``m_``)."""
    return sorted({key for row in rows for key in row if key.startswith(MEASURE_PREFIX)})


def dedupe(rows: list, family) -> tuple:
    """Rows reduced by the family's ``dedupe`` (one per equivalence class), with a sentence saying what was done."""
    reducer = getattr(family, "dedupe", None)
    if reducer is None:
        return rows, f"all {len(rows)} rows"
    return reducer(rows)


def compare(rows: list, *, family=None, layouts=None, measures=None, tallies=TALLY_COLUMNS, seed: int = 0,
            n_resamples: int = DEFAULT_RESAMPLES, use_all_rows: bool = False) -> tuple:
    """The comparison table: one :class:`Correlation` per (layout, tally, measure).

    Returns ``(correlations, note)``; ``note`` says which rows were used.
    """
    layouts = layouts or list(dict.fromkeys(row["layout"] for row in rows))
    measures = measures if measures is not None else measure_columns(rows)
    table = []
    note = ""
    for layout in layouts:
        subset = [row for row in rows if row["layout"] == layout]
        if not use_all_rows:
            subset, note = dedupe(subset, family)
        else:
            note = f"all {len(subset)} rows (no reduction to class representatives)"
        for tally in tallies:
            for measure in measures:
                pairs = [(row[tally], row[measure]) for row in subset
                         if _is_number(row.get(tally)) and _is_number(row.get(measure))]
                x = [pair[0] for pair in pairs]
                y = [pair[1] for pair in pairs]
                result = correlate(x, y, seed=seed, purpose=(layout, tally, measure), n_resamples=n_resamples)
                table.append(Correlation(layout=layout, tally=tally, measure=measure, **result))
    return table, note


def _is_number(value) -> bool:
    return isinstance(value, (int, float, np.integer, np.floating)) and not isinstance(value, bool) \
        and math.isfinite(float(value))


def to_markdown(table: list, columns=None) -> str:
    """A Markdown table of correlation rows (numbers to 3 decimals, p-values to 4)."""
    columns = columns or ["layout", "tally", "measure", "n", "spearman_rho", "spearman_low", "spearman_high",
                          "spearman_p", "kendall_tau", "kendall_low", "kendall_high", "kendall_p"]
    lines = ["| " + " | ".join(columns) + " |", "|" + "|".join("---" for _ in columns) + "|"]
    for row in table:
        values = row.as_dict() if hasattr(row, "as_dict") else row
        cells = []
        for column in columns:
            value = values[column]
            if isinstance(value, float):
                cells.append("n/a" if math.isnan(value) else (f"{value:.4f}" if column.endswith("_p") else f"{value:.3f}"))
            else:
                cells.append(str(value))
        lines.append("| " + " | ".join(cells) + " |")
    return "\n".join(lines) + "\n"
