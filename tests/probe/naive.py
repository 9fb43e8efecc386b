"""Slow, obvious twins of the probe, written straight from design.md section 2.

No numba, no vectorised tricks, no code shared with ``probe.tally`` or
``probe.information``: plain Python loops over the published definition
(Goerlich & Dittrich 2013, PLoS ONE 8:e54694; Biosystems 164:177-185, 2018)
so the fast engine has something independent to agree with.

``naive_meanings`` uses only ``medium.step`` (the NumPy path of the medium,
not its bit-sliced ``evolve``). It takes from ``Layout.resolve`` only what is
seeded randomness by definition (a ``random`` background and a sampled context
list); site lists, sign and context patterns, clamping, persistence and the
one-hot rule are rebuilt here by hand.
"""

from __future__ import annotations

import math
from collections import defaultdict

import numpy as np

UNDEFINED = -1


# --------------------------------------------------------------------------- tallies

def brute_force_tally(meanings) -> dict:
    """Every unordered context pair and every sign pair s1 < s2, checked against the definition.

    An instance is {s1, s2} with {c, c'} such that f_c(s1)=m1, f_c(s2)=m2,
    f_c'(s1)=m2, f_c'(s2)=m1, m1 != m2, neither undefined (design.md section 2).
    """
    table = [[int(v) for v in row] for row in np.asarray(meanings).tolist()]
    n_contexts = len(table)
    n_signs = len(table[0]) if n_contexts else 0
    instances = 0
    codes = set()
    coding = set()
    for c in range(n_contexts):
        for c2 in range(c + 1, n_contexts):  # unordered context pair {c, c2}
            for s1 in range(n_signs):
                for s2 in range(s1 + 1, n_signs):
                    m1, m2 = table[c][s1], table[c][s2]
                    if m1 == UNDEFINED or m2 == UNDEFINED or m1 == m2:
                        continue
                    if table[c2][s1] == m2 and table[c2][s2] == m1:
                        instances += 1
                        codes.add((s1, s2, frozenset((m1, m2))))
                        coding.add(c)
                        coding.add(c2)
    cells = n_contexts * n_signs
    undefined = sum(1 for row in table for v in row if v == UNDEFINED)
    return {
        "code_instances": instances,
        "codes": len(codes),
        "coding_contexts": len(coding),
        "coding_set": coding,
        "distinct_mappings": len({tuple(row) for row in table}),
        "undefined_fraction": undefined / cells if cells else 0.0,
    }


# --------------------------------------------------------------------------- co-information

def naive_co_information(meanings) -> float:
    """I(S;M) - I(S;M|C) in bits from explicit probability dicts.

    S uniform over the columns, C uniform over the rows, independent;
    M = f(S, C) with undefined (-1) a symbol of its own.
    """
    table = [[int(v) for v in row] for row in np.asarray(meanings).tolist()]
    n_contexts, n_signs = len(table), len(table[0])
    p_scm = defaultdict(float)
    for c in range(n_contexts):
        for s in range(n_signs):
            p_scm[(s, c, table[c][s])] += 1.0 / (n_contexts * n_signs)
    p_s, p_c, p_m = defaultdict(float), defaultdict(float), defaultdict(float)
    p_sm, p_sc, p_cm = defaultdict(float), defaultdict(float), defaultdict(float)
    for (s, c, m), p in p_scm.items():
        p_s[s] += p
        p_c[c] += p
        p_m[m] += p
        p_sm[(s, m)] += p
        p_sc[(s, c)] += p
        p_cm[(c, m)] += p
    i_sm = sum(p * math.log2(p / (p_s[s] * p_m[m])) for (s, m), p in p_sm.items() if p > 0)
    i_sm_given_c = sum(p * math.log2(p_c[c] * p / (p_sc[(s, c)] * p_cm[(c, m)]))
                       for (s, c, m), p in p_scm.items() if p > 0)
    return i_sm - i_sm_given_c


# --------------------------------------------------------------------------- meanings

def _digits(number: int, k: int, n: int) -> list:
    """Pattern number -> digits, least significant first (digit j goes on the j-th listed site)."""
    out = []
    for _ in range(n):
        out.append(number % k)
        number //= k
    return out


def naive_meanings(medium, layout, seed: int = 0) -> np.ndarray:
    """The (contexts, signs) meaning table, one run at a time, from ``medium.step``.

    Meaning numbering follows the source: a pattern meaning is the readout
    pattern number (base k, first readout site least significant); a one-hot
    meaning is ``position * (k - 1) + value - 1`` of the single nonzero
    readout site (``probe.evaluate.read_meanings``), -1 when undefined.
    """
    k = int(medium.n_states)
    n = int(medium.n_sites)
    signs = [int(x) for x in layout.signs]
    contexts = [int(x) for x in layout.contexts]
    readout = [int(x) for x in layout.readout]
    t0, t1 = layout.window

    if layout.sign_patterns is None:
        sign_patterns = [_digits(p, k, len(signs)) for p in range(k ** len(signs))]
    else:
        sign_patterns = [list(p) for p in layout.sign_patterns]

    resolved = None
    if layout.context_sample is None:
        context_numbers = list(range(k ** len(contexts)))
    else:
        resolved = layout.resolve(medium, seed)
        context_numbers = [int(x) for x in resolved.context_numbers]

    if isinstance(layout.background, str) and layout.background == "zeros":
        background = [0] * n
    elif isinstance(layout.background, str) and layout.background == "random":
        resolved = resolved or layout.resolve(medium, seed)
        background = [int(x) for x in resolved.background]
    else:
        background = [int(ch) for ch in layout.background]

    table = np.full((len(context_numbers), len(sign_patterns)), UNDEFINED, dtype=np.int64)
    for ci, number in enumerate(context_numbers):
        context_pattern = _digits(number, k, len(contexts))
        for si, sign_pattern in enumerate(sign_patterns):
            state = list(background)
            for site, value in zip(signs, sign_pattern):
                state[site] = value
            for site, value in zip(contexts, context_pattern):
                state[site] = value
            clamped = []
            if layout.clamp_signs:
                clamped += list(zip(signs, sign_pattern))
            if layout.clamp_contexts:
                clamped += list(zip(contexts, context_pattern))
            x = np.array([state], dtype=np.uint8)
            seen = []
            if t0 == 0:
                seen.append([int(x[0, r]) for r in readout])
            for t in range(1, t1 + 1):
                x = medium.step(x).copy()
                for site, value in clamped:
                    x[0, site] = value
                if t >= t0:
                    seen.append([int(x[0, r]) for r in readout])
            first = seen[0]
            if any(pattern != first for pattern in seen):
                continue  # did not persist over the window: undefined
            if layout.meanings == "one-hot":
                on = [j for j, v in enumerate(first) if v != 0]
                if len(on) != 1:
                    continue  # not exactly one site on: undefined
                table[ci, si] = on[0] * (k - 1) + first[on[0]] - 1
            else:
                table[ci, si] = sum(v * k ** j for j, v in enumerate(first))
    return table
