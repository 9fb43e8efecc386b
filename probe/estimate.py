"""Estimates with confidence intervals when contexts are sampled.

A survey may evaluate a seeded sample of ``n`` of the ``N`` contexts
(``context_sample``), drawn uniformly without replacement.

* **code_instances.** An instance is an unordered pair of contexts (for one
  sign pair) that swap the mapping, so the sample count ``X_s`` is a
  U-statistic of order 2: each of the ``N(N-1)/2`` context pairs is in the
  sample with probability ``n(n-1)/(N(N-1))``. The unbiased estimate of the
  full-space count is ``X_s * N(N-1) / (n(n-1))``. Its standard error comes
  from the delete-one jackknife over sampled contexts: leaving context ``i``
  out removes the ``d_i`` instances it takes part in, giving
  ``(X_s - d_i) * N(N-1) / ((n-1)(n-2))``; the jackknife variance is
  ``(n-1)/n * sum((theta_i - mean)^2)`` (Efron & Stein 1981, Ann. Stat.
  9:586, for U-statistics). The interval is the normal one,
  ``estimate -/+ z * se``, with its lower end raised to the observed
  count ``X_s`` (the full space holds at least the sampled instances).
* **coding_fraction.** The share of sampled contexts that take part in an
  instance within the sample; its interval is the Wilson score interval from
  ``scipy.stats.binomtest(...).proportion_ci``. Sampling without replacement
  makes the binomial interval conservative. The estimate assumes that the
  partners of a coding context are represented in the sample (mapping
  classes that are not vanishingly rare); when they are not, it is a lower
  bound.

With every context evaluated (``n == N``) both intervals collapse to the
exact value.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

import numpy as np
from scipy import stats

CONFIDENCE = 0.95


@dataclass(frozen=True)
class SampleEstimates:
    """Full-space estimates and 95% intervals for code_instances and coding_fraction."""

    code_instances_estimate: float
    code_instances_low: float
    code_instances_high: float
    coding_fraction_low: float
    coding_fraction_high: float

    def as_dict(self) -> dict:
        return asdict(self)


def estimate_from_sample(instances: int, participation: np.ndarray, contexts: int, context_space: int,
                         confidence: float = CONFIDENCE) -> SampleEstimates:
    """Estimates for the full context space from a sample of ``contexts`` of ``context_space`` contexts.

    ``participation[i]`` is the number of instances sampled context ``i`` takes part in.

    Examples
    --------
    Every context evaluated: the intervals are the exact values.

    >>> estimate_from_sample(6, np.array([3, 3, 2, 2, 2]), 5, 5).code_instances_high
    6.0
    """
    n = int(contexts)
    big = int(context_space)
    participation = np.asarray(participation, dtype=np.float64)
    coding = int(np.count_nonzero(participation))
    if n >= big:
        fraction = coding / n if n else 0.0
        return SampleEstimates(float(instances), float(instances), float(instances), fraction, fraction)
    scale = big * (big - 1) / (n * (n - 1))
    estimate = instances * scale
    if n > 2:
        leave_one_out = (instances - participation) * (big * (big - 1) / ((n - 1) * (n - 2)))
        variance = (n - 1) / n * float(np.sum((leave_one_out - leave_one_out.mean()) ** 2))
    else:
        variance = float("inf")
    z = float(stats.norm.ppf(0.5 + confidence / 2))
    spread = z * np.sqrt(variance)
    low = max(float(instances), estimate - spread)
    high = estimate + spread
    interval = stats.binomtest(coding, n).proportion_ci(confidence_level=confidence, method="wilson")
    return SampleEstimates(float(estimate), float(low), float(high), float(interval.low), float(interval.high))
