"""Code witnesses: ``find_witness`` returns an instance of the published code definition
or ``None``, and on real rules the instance holds when the four runs are replayed by hand.

Contract: design.md section 2, "Code (order 2)": distinct signs s1, s2, contexts c, c'
and distinct defined meanings m1 != m2 with f_c(s1)=m1, f_c(s2)=m2, f_c'(s1)=m2,
f_c'(s2)=m1 (Goerlich & Dittrich 2013, PLoS ONE 8:e54694; Biosystems 164:177-185, 2018).
The replay below uses only ``medium.step`` and the pattern numbering of probe/layout.py
(digit j of a pattern number, least significant first, goes on the j-th listed site).
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest

from media.eca import ElementaryCA
from probe.evaluate import MeaningTable, evaluate
from probe.layout import Layout
from probe.tally import tally_meanings
from probe.witness import CodeWitness, draw_witness, find_witness

UNDEFINED = -1
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def table_of(rows) -> MeaningTable:
    """A meaning table from rows of meanings (rows are contexts, columns signs); no medium needed."""
    return MeaningTable(meanings=np.array(rows, dtype=np.int64), resolved=None)


def has_code(meanings) -> bool:
    """Brute force over the definition: any sign pair, context pair and meaning swap."""
    meanings = np.asarray(meanings)
    n_contexts, n_signs = meanings.shape
    for s1, s2 in itertools.combinations(range(n_signs), 2):
        for c, c2 in itertools.combinations(range(n_contexts), 2):
            m1, m2 = int(meanings[c, s1]), int(meanings[c, s2])
            if UNDEFINED in (m1, m2) or m1 == m2:
                continue
            if meanings[c2, s1] == m2 and meanings[c2, s2] == m1:
                return True
    return False


def assert_is_code(meanings, witness: CodeWitness):
    """The four meanings named by ``witness`` satisfy the definition."""
    (s1, s2), (c, c2), (m1, m2) = witness.sign_pair, witness.context_pair, witness.meaning_pair
    n_contexts, n_signs = np.asarray(meanings).shape
    assert 0 <= s1 < s2 < n_signs
    assert 0 <= c < c2 < n_contexts
    assert m1 != m2 and UNDEFINED not in (m1, m2)
    assert (meanings[c][s1], meanings[c][s2]) == (m1, m2)
    assert (meanings[c2][s1], meanings[c2][s2]) == (m2, m1)


# ---------------------------------------------------------------------------------- hand-made tables


@pytest.mark.parametrize("rows", [
    [[0, 1], [0, 1]],                    # the same mapping in both contexts
    [[0, 0], [1, 1]],                    # context-dependent, but never two distinct meanings
    [[0, 1], [1, UNDEFINED]],            # the swap is missing a meaning
    [[UNDEFINED, UNDEFINED], [UNDEFINED, UNDEFINED]],
    [[0, 1], [1, 2], [2, 0]],            # three contexts, no reversed pair
    [[0, 1, 2]],                         # a single context
    [[0], [1], [2]],                     # a single sign
], ids=["constant", "no-distinct", "undefined", "all-undefined", "rotation", "one-context", "one-sign"])
def test_no_code_gives_none(rows):
    assert not has_code(rows)
    assert find_witness(table_of(rows)) is None


@pytest.mark.parametrize("rows, expected", [
    ([[0, 1], [1, 0]], CodeWitness((0, 1), (0, 1), (0, 1))),
    ([[1, 0], [0, 1]], CodeWitness((0, 1), (0, 1), (1, 0))),
    # The swap sits on signs 1 and 2, in contexts 0 and 2, with meanings 5 and 3.
    ([[9, 5, 3], [9, 5, 5], [UNDEFINED, 3, 5]], CodeWitness((1, 2), (0, 2), (5, 3))),
], ids=["swap", "swap-reversed", "signs-1-2"])
def test_hand_made_code_is_found(rows, expected):
    assert has_code(rows)
    found = find_witness(table_of(rows))
    assert found == expected
    assert_is_code(rows, found)


def test_random_tables_agree_with_brute_force():
    rng = np.random.default_rng(20240611)
    found_some = 0
    for _ in range(400):
        n_contexts, n_signs = int(rng.integers(1, 7)), int(rng.integers(1, 5))
        meanings = rng.integers(-1, 3, size=(n_contexts, n_signs))
        witness = find_witness(table_of(meanings))
        assert (witness is not None) == has_code(meanings), meanings
        assert (witness is not None) == (n_signs >= 2 and tally_meanings(meanings).code_instances > 0)
        if witness is not None:
            found_some += 1
            assert_is_code(meanings.tolist(), witness)
    assert 50 < found_some < 350  # both outcomes were exercised


# ---------------------------------------------------------------------------------- real rules


def digits(number: int, n: int) -> list:
    return [(number >> j) & 1 for j in range(n)]


def replay_meaning(medium, layout: Layout, sign_pattern, context_number: int):
    """The meaning of one run, computed with ``medium.step`` alone: the readout pattern number at t0,
    or UNDEFINED when it changes within the window."""
    signs, contexts, readout = list(layout.signs), list(layout.contexts), list(layout.readout)
    context_pattern = digits(context_number, len(contexts))
    state = np.zeros((1, medium.n_sites), dtype=np.uint8)
    for site, value in zip(signs, sign_pattern):
        state[0, site] = value
    for site, value in zip(contexts, context_pattern):
        state[0, site] = value
    clamped = []
    if layout.clamp_signs:
        clamped += list(zip(signs, sign_pattern))
    if layout.clamp_contexts:
        clamped += list(zip(contexts, context_pattern))
    t0, t1 = layout.window
    seen = [tuple(int(state[0, r]) for r in readout)] if t0 == 0 else []
    for t in range(1, t1 + 1):
        state = np.array(medium.step(state), dtype=np.uint8)
        for site, value in clamped:
            state[0, site] = value
        if t >= t0:
            seen.append(tuple(int(state[0, r]) for r in readout))
    if any(pattern != seen[0] for pattern in seen):
        return UNDEFINED
    return sum(value << j for j, value in enumerate(seen[0]))


CASES = [
    (110, "7,8", "4-6,9-11", "7,8", "6:6", {}),
    (30, "7,8", "4-6,9-11", "7,8", "2:2", {}),
    (150, "7", "5,6,8,9", "7", "1:1", {}),
    (110, "7,8", "4-6,9-11", "7,8", "2:3", {}),  # a persistence window: 8 instances
    (110, "7,8", "4-6,9-11", "7,8", "3:3", {"clamp_contexts": True}),
    (30, "6,7", "3-5,8-10", "6,7,8", "2:2", {"sign_patterns": [[0, 0], [1, 0], [1, 1]], "context_sample": 40}),
]


@pytest.mark.parametrize("rule, signs, contexts, readout, window, extra", CASES,
                         ids=[f"rule{c[0]}-{c[4]}{'-' + '-'.join(c[5]) if c[5] else ''}" for c in CASES])
def test_witness_on_a_real_rule_holds_when_replayed_by_hand(rule, signs, contexts, readout, window, extra):
    medium = ElementaryCA(rule=rule, width=15)
    layout = Layout(signs=signs, contexts=contexts, readout=readout, window=window, **extra)
    table = evaluate(medium, layout, seed=3)
    witness = find_witness(table)
    assert witness is not None, "this case was chosen because it carries codes"
    (s1, s2), (c, c2), (m1, m2) = witness.sign_pair, witness.context_pair, witness.meaning_pair

    if layout.sign_patterns is None:
        sign_patterns = [digits(s, len(layout.signs)) for s in range(2 ** len(layout.signs))]
    else:
        sign_patterns = [list(p) for p in layout.sign_patterns]
    # Which context patterns were sampled is seeded randomness by definition, so it comes from the table.
    context_numbers = [table.resolved.context_number(i) for i in (c, c2)]

    f = {(ci, si): replay_meaning(medium, layout, sign_patterns[si], number)
         for ci, number in zip((c, c2), context_numbers) for si in (s1, s2)}
    assert m1 != m2 and UNDEFINED not in (m1, m2)
    assert (f[c, s1], f[c, s2]) == (m1, m2)
    assert (f[c2, s1], f[c2, s2]) == (m2, m1)
    assert s1 != s2 and c != c2


@pytest.mark.parametrize("rule", [0, 204, 255])
def test_rules_without_codes_have_no_witness(rule):
    # Rule 0 and 255 erase everything, rule 204 is the identity: the readout never depends on the context.
    medium = ElementaryCA(rule=rule, width=15)
    layout = Layout(signs="7,8", contexts="4-6,9-11", readout="7,8", window="6:6")
    table = evaluate(medium, layout)
    assert tally_meanings(table.meanings).code_instances == 0
    assert find_witness(table) is None


def test_draw_witness_without_a_code_returns_none_and_draws_nothing(tmp_path):
    out = tmp_path / "none.png"
    medium = ElementaryCA(rule=0, width=15)
    layout = Layout(signs="7,8", contexts="4-6,9-11", readout="7,8", window="6:6")
    assert draw_witness(medium, layout, out) == (None, None)
    assert not out.exists()


def test_draw_witness_with_a_code_draws_a_png(tmp_path):
    out = tmp_path / "w.png"
    medium = ElementaryCA(rule=110, width=15)
    layout = Layout(signs="7,8", contexts="4-6,9-11", readout="7,8", window="6:6")
    witness, path = draw_witness(medium, layout, out)
    assert witness == find_witness(evaluate(medium, layout))
    assert path == out
    assert out.read_bytes()[:8] == PNG_SIGNATURE
