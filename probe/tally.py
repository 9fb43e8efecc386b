"""The order-2 code tally and the other columns of one result row.

A code (Goerlich & Dittrich 2013, PLoS ONE 8:e54694; the cellular-automaton
version in Biosystems 164:177-185, 2018) is two distinct signs ``s1, s2``, two
contexts ``c, c'`` and two distinct defined meanings ``m1 != m2`` with
``f_c(s1)=m1, f_c(s2)=m2`` and ``f_c'(s1)=m2, f_c'(s2)=m1``. For a sign pair,
with ``n(a, b)`` the number of contexts mapping the pair to ``(a, b)``, its
instances number ``sum over a<b of n(a, b) * n(b, a)``; the semantic capacity
``code_instances`` sums that over sign pairs.

Counting uses a dense ``K x K`` table when there are few distinct meanings
and sorting otherwise; both run in numba and both are checked against a
brute-force enumeration of context pairs in the tests.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

import numpy as np

from media.jit import kernel
from probe.estimate import estimate_from_sample
from probe.information import co_information_bits
from probe.evaluate import DEFAULT_MAX_RUNS, UNDEFINED, MeaningTable, evaluate

DENSE_LIMIT = 1024  # distinct meanings up to which the K x K table is used

COLUMNS = ("code_instances", "codes", "coding_contexts", "coding_fraction", "contexts", "context_space",
           "distinct_mappings", "undefined_fraction", "co_information_bits", "signs",
           "code_instances_estimate", "code_instances_low", "code_instances_high",
           "coding_fraction_low", "coding_fraction_high")


@dataclass(frozen=True)
class Tallies:
    """The columns of design.md section 2 for one medium instance and one layout."""

    code_instances: int
    codes: int
    coding_contexts: int
    coding_fraction: float
    contexts: int
    context_space: int
    distinct_mappings: int
    undefined_fraction: float
    co_information_bits: float
    signs: int
    code_instances_estimate: float = 0.0
    code_instances_low: float = 0.0
    code_instances_high: float = 0.0
    coding_fraction_low: float = 0.0
    coding_fraction_high: float = 0.0

    def as_dict(self) -> dict:
        return asdict(self)


@kernel
def _order2_dense(meanings, n_meanings):
    n_contexts, n_signs = meanings.shape
    counts = np.zeros((n_meanings, n_meanings), dtype=np.int64)
    participation = np.zeros(n_contexts, dtype=np.int64)
    instances = 0
    codes = 0
    for s1 in range(n_signs):
        for s2 in range(s1 + 1, n_signs):
            for c in range(n_contexts):
                a = meanings[c, s1]
                b = meanings[c, s2]
                if a >= 0 and b >= 0 and a != b:
                    counts[a, b] += 1
            for c in range(n_contexts):
                a = meanings[c, s1]
                b = meanings[c, s2]
                if a >= 0 and b >= 0 and a != b:
                    participation[c] += counts[b, a]
            # Add each meaning pair once, at its first context, and clear the table for the next sign pair.
            for c in range(n_contexts):
                a = meanings[c, s1]
                b = meanings[c, s2]
                if a >= 0 and b >= 0 and a != b:
                    product = counts[a, b] * counts[b, a]
                    if product > 0:
                        instances += product
                        codes += 1
                    counts[a, b] = 0
                    counts[b, a] = 0
    return instances, codes, participation


@kernel
def _order2_sorted(meanings, n_meanings):
    n_contexts, n_signs = meanings.shape
    keys = np.empty(n_contexts, dtype=np.int64)
    where = np.empty(n_contexts, dtype=np.int64)
    participation = np.zeros(n_contexts, dtype=np.int64)
    instances = 0
    codes = 0
    for s1 in range(n_signs):
        for s2 in range(s1 + 1, n_signs):
            n = 0
            for c in range(n_contexts):
                a = meanings[c, s1]
                b = meanings[c, s2]
                if a >= 0 and b >= 0 and a != b:
                    low = min(a, b)
                    high = max(a, b)
                    keys[n] = (low * n_meanings + high) * 2 + (1 if a > b else 0)
                    where[n] = c
                    n += 1
            order = np.argsort(keys[:n])
            i = 0
            while i < n:
                pair = keys[order[i]] >> 1
                j = i
                forward = 0
                backward = 0
                while j < n and (keys[order[j]] >> 1) == pair:
                    if keys[order[j]] & 1:
                        backward += 1
                    else:
                        forward += 1
                    j += 1
                if forward > 0 and backward > 0:
                    instances += forward * backward
                    codes += 1
                    for q in range(i, j):
                        participation[where[order[q]]] += forward if keys[order[q]] & 1 else backward
                i = j
    return instances, codes, participation


def dense_meanings(meanings: np.ndarray):
    """Renumber defined meanings ``0..K-1`` in increasing order (undefined stays -1); return the table and ``K``.

    Meaning numbers below ``2^22`` (every readout of up to 22 binary sites)
    are renumbered through a lookup table in linear time; others by sorting.
    """
    meanings = np.asarray(meanings)
    if not np.issubdtype(meanings.dtype, np.integer):
        meanings = meanings.astype(np.int64)
    if meanings.size and meanings.min() >= UNDEFINED and meanings.max() < 2**22:
        present = np.zeros(int(meanings.max()) + 2, dtype=bool)  # slot 0 stands for undefined
        shifted = meanings.astype(np.int32, copy=False) + 1
        present[shifted.ravel()] = True
        present[0] = False
        n_meanings = int(np.count_nonzero(present))
        small = np.int16 if n_meanings < 2**15 - 1 else np.int32  # a big table stays small
        numbers = (np.cumsum(present, dtype=np.int64) - 1).astype(small)
        numbers[0] = UNDEFINED
        return numbers[shifted], n_meanings
    meanings = meanings.astype(np.int64, copy=False)
    values, inverse = np.unique(meanings, return_inverse=True)
    inverse = inverse.reshape(meanings.shape).astype(np.int64)
    if values.size and values[0] == UNDEFINED:
        inverse -= 1
        return inverse, int(values.size - 1)
    return inverse, int(values.size)


def order2_participation(meanings: np.ndarray, method: str = "auto", renumbered=None):
    """``(code_instances, codes, participation)``: ``participation[c]`` is the number of code
    instances context ``c`` takes part in (summed over sign pairs).

    ``method`` is ``"dense"``, ``"sorted"`` or ``"auto"`` (dense up to
    ``DENSE_LIMIT`` distinct meanings). ``renumbered`` is the result of
    :func:`dense_meanings` when the caller already has it.
    """
    dense, n_meanings = renumbered if renumbered is not None else dense_meanings(meanings)
    if n_meanings < 2 or dense.shape[1] < 2:
        return 0, 0, np.zeros(dense.shape[0], dtype=np.int64)
    if method == "dense" or (method == "auto" and n_meanings <= DENSE_LIMIT):
        instances, codes, participation = _order2_dense(dense, n_meanings)
    else:
        instances, codes, participation = _order2_sorted(dense, n_meanings)
    return int(instances), int(codes), participation


def order2_counts(meanings: np.ndarray, method: str = "auto", renumbered=None):
    """``(code_instances, codes, coding_mask)`` of a ``(contexts, signs)`` meaning table."""
    instances, codes, participation = order2_participation(meanings, method, renumbered)
    return instances, codes, participation > 0


def count_distinct_rows(meanings: np.ndarray, renumbered=None) -> int:
    """Number of distinct rows (distinct mappings ``f_c``) of a meaning table.

    Rows become exact mixed-radix integers when they fit in 62 bits, which is
    far faster than sorting whole rows; otherwise rows are compared directly.
    """
    if meanings.shape[0] == 0:
        return 0
    dense, n_meanings = renumbered if renumbered is not None else dense_meanings(meanings)
    radix = n_meanings + 1  # +1 for undefined
    if meanings.shape[1] * np.log2(max(radix, 2)) <= 62:
        keys = np.zeros(meanings.shape[0], dtype=np.int64)
        for column in range(meanings.shape[1] - 1, -1, -1):  # one column at a time keeps memory at one key array
            keys *= radix
            keys += dense[:, column]
            keys += 1
        return int(np.unique(keys).size)
    return int(np.unique(meanings, axis=0).shape[0])


def tally_meanings(meanings: np.ndarray, context_space: int | None = None) -> Tallies:
    """All tallies of a ``(contexts, signs)`` meaning table (-1 marks an undefined meaning).

    Examples
    --------
    Two signs, two contexts; the second context swaps the meanings:

    >>> tally_meanings(np.array([[0, 1], [1, 0]])).code_instances
    1
    """
    meanings = np.asarray(meanings, dtype=np.int64)
    n_contexts, n_signs = meanings.shape
    renumbered = dense_meanings(meanings)
    instances, codes, participation = order2_participation(meanings, renumbered=renumbered)
    coding_contexts = int(np.count_nonzero(participation))
    space = int(n_contexts if context_space is None else context_space)
    estimates = estimate_from_sample(instances, participation, n_contexts, space) if n_contexts else None
    return Tallies(
        code_instances=instances,
        codes=codes,
        coding_contexts=coding_contexts,
        coding_fraction=coding_contexts / n_contexts if n_contexts else 0.0,
        contexts=n_contexts,
        context_space=space,
        distinct_mappings=count_distinct_rows(meanings, renumbered),
        undefined_fraction=float(np.mean(meanings == UNDEFINED)) if meanings.size else 0.0,
        co_information_bits=co_information_bits(meanings, renumbered),
        signs=n_signs,
        **(estimates.as_dict() if estimates is not None else {}),
    )


def tally_table(table: MeaningTable) -> Tallies:
    """Tallies of an evaluated :class:`~probe.evaluate.MeaningTable`."""
    return tally_meanings(table.meanings, table.resolved.context_space)


def tally(medium, layout, *, seed: int = 0, max_runs: int = DEFAULT_MAX_RUNS) -> Tallies:
    """Evaluate ``layout`` on ``medium`` and tally it: the one-call entry point.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> from probe.layout import Layout
    >>> layout = Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8")
    >>> result = tally(ElementaryCA(rule=110, width=21), layout)
    >>> result.contexts, result.signs
    (4096, 4)
    """
    return tally_table(evaluate(medium, layout, seed=seed, max_runs=max_runs))
