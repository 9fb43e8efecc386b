"""The order-2 code tally, the evaluator and co-information against independent references.

References: the published code definition (Goerlich & Dittrich 2013, PLoS ONE
8:e54694; Biosystems 164:177-185, 2018) as restated in design.md section 2,
implemented by brute force in ``naive.py``; hand derivations in the comments
below; co-information from ``dit.multivariate.coinformation`` and Bell 2003
(reference-values.md, "Information theory"); ECA reflection and complement
from Wolfram, A New Kind of Science (2002), p. 57 (reference-values.md).
"""

import importlib

import dit
import numpy as np
import pytest
from dit.multivariate import coinformation

from media.eca import ElementaryCA, complement, reflect
from naive import brute_force_tally, naive_co_information, naive_meanings
from probe.evaluate import evaluate
from probe.information import co_information_bits
from probe.layout import Layout
from probe.tally import order2_counts, tally, tally_meanings

INT_COLUMNS = ("code_instances", "codes", "coding_contexts", "distinct_mappings")


def random_meaning_table(rng, values=None, undefined_share=None):
    n_contexts = int(rng.integers(1, 13))
    n_signs = int(rng.integers(2, 7))
    if values is None:
        values = rng.choice([0, 1, 2, 3, 7, 2**40 + 5], size=int(rng.integers(1, 5)), replace=False)
    table = rng.choice(values, size=(n_contexts, n_signs))
    share = rng.uniform(0, 0.5) if undefined_share is None else undefined_share
    table[rng.random(table.shape) < share] = -1
    return table.astype(np.int64)


def assert_matches_brute_force(table, expected=None):
    expected = brute_force_tally(table) if expected is None else expected
    for method in ("dense", "sorted", "auto"):
        instances, codes, coding = order2_counts(table, method=method)
        assert (instances, codes) == (expected["code_instances"], expected["codes"]), (method, table.tolist())
        assert set(np.flatnonzero(coding).tolist()) == expected["coding_set"], (method, table.tolist())
    result = tally_meanings(table)
    for column in INT_COLUMNS:
        assert getattr(result, column) == expected[column], (column, table.tolist())
    assert result.undefined_fraction == pytest.approx(expected["undefined_fraction"], abs=1e-15)
    assert result.coding_fraction == pytest.approx(expected["coding_contexts"] / table.shape[0], abs=1e-15)
    assert (result.contexts, result.signs) == table.shape


# ----------------------------------------------------------------- order-2 counting vs brute force

def test_order2_methods_agree_with_brute_force_on_random_tables():
    rng = np.random.default_rng(20240601)
    nonzero = 0
    for _ in range(400):
        table = random_meaning_table(rng)
        expected = brute_force_tally(table)
        nonzero += expected["code_instances"] > 0
        assert_matches_brute_force(table, expected)
    assert nonzero > 100  # the sample really exercises codes, not only empty tables


def test_order2_sorted_path_above_dense_limit_agrees_with_brute_force():
    # More than DENSE_LIMIT (1024) distinct meanings, so "auto" takes the sorting kernel;
    # two swaps are planted by hand so the count is not trivially zero.
    rng = np.random.default_rng(7)
    table = rng.permutation(36 * 36).reshape(36, 36).astype(np.int64) * 3 + 10
    table[4, 2], table[4, 9] = 5000, 6000
    table[20, 2], table[20, 9] = 6000, 5000
    table[30, 2], table[30, 9] = 6000, 5000
    table[11, 0], table[11, 1] = -1, 5000
    expected = brute_force_tally(table)
    # Hand count: sign pair (2, 9) maps to (5000, 6000) in context 4 and (6000, 5000) in 20 and 30:
    # n(5000,6000) * n(6000,5000) = 1 * 2 = 2 instances, one code, contexts {4, 20, 30}.
    assert (expected["code_instances"], expected["codes"], expected["coding_set"]) == (2, 1, {4, 20, 30})
    assert_matches_brute_force(table, expected)


@pytest.mark.parametrize("n_signs, values", [
    (5, [0, 1, -1]),             # rows fit the mixed-radix integer key
    (70, [0, 1, -1]),            # 70 * log2(3) > 62 bits: the row-comparison fallback
    (23, [0, 1, 2, 3, 5, -1]),   # radix 6 (5 meanings + undefined): 23 * log2(6) = 59.5 bits, integer keys
    (24, [0, 1, 2, 3, 5, -1]),   # 24 * log2(6) = 62.04 bits: just over, the fallback
    (4, [2**40, 7, -1, 3]),      # large pattern numbers
])
def test_distinct_mappings_on_tables_with_repeated_rows(n_signs, values):
    rng = np.random.default_rng(n_signs)
    base = rng.choice(values, size=(6, n_signs))
    base[0, :len(values)] = values  # every value occurs, so the radix is exactly len(values)
    table = base[rng.integers(0, 6, size=25)]  # 25 contexts drawn from 6 rows: many repeats
    table[3] = table[4]
    table[5, -1] = -1 if table[5, -1] != -1 else values[0]  # a row that differs only in the last sign
    expected = len({tuple(row) for row in table.tolist()})
    assert tally_meanings(table).distinct_mappings == expected == brute_force_tally(table)["distinct_mappings"]


def test_degenerate_tables():
    for table in (np.full((4, 3), -1), np.zeros((5, 4), dtype=np.int64), np.array([[0], [1]]),
                  np.array([[0, 1]])):
        table = np.asarray(table, dtype=np.int64)
        instances, codes, coding = order2_counts(table)
        assert (instances, codes, int(coding.sum())) == (0, 0, 0)
        assert brute_force_tally(table)["code_instances"] == 0


def test_hand_worked_meaning_table():
    # Rows are contexts c0..c4, columns signs s0, s1, s2; -1 is undefined.
    table = np.array([
        [0, 1, 2],    # c0
        [1, 0, 2],    # c1
        [1, 0, -1],   # c2
        [2, 2, 0],    # c3
        [0, 0, 1],    # c4
    ])
    # Sign pair (s0, s1): c0 -> (0,1); c1 -> (1,0); c2 -> (1,0); c3 -> (2,2) equal, skipped;
    #   c4 -> (0,0) equal, skipped. n(0,1)=1, n(1,0)=2: 1*2 = 2 instances ({c0,c1}, {c0,c2}); code {0,1}.
    # Sign pair (s0, s2): c0 -> (0,2); c1 -> (1,2); c2 has s2 undefined, skipped; c3 -> (2,0); c4 -> (0,1).
    #   n(0,2)*n(2,0) = 1*1 = 1 ({c0,c3}); (1,2) has no (2,1); (0,1) has no (1,0). 1 instance, code {0,2}.
    # Sign pair (s1, s2): c0 -> (1,2); c1 -> (0,2); c2 skipped; c3 -> (2,0); c4 -> (0,1).
    #   n(0,2)*n(2,0) = 1*1 = 1 ({c1,c3}); (1,2) and (0,1) have no reverse. 1 instance, code {0,2}.
    # Total: 4 instances; 3 codes ((s0,s1),{0,1}), ((s0,s2),{0,2}), ((s1,s2),{0,2});
    # coding contexts {c0, c1, c2, c3}: 4 of 5 (c4 never swaps); 1 undefined run of 15;
    # every row differs, so 5 distinct mappings.
    expected = {"code_instances": 4, "codes": 3, "coding_contexts": 4, "coding_set": {0, 1, 2, 3},
                "distinct_mappings": 5, "undefined_fraction": 1 / 15}
    assert {key: brute_force_tally(table)[key] for key in expected} == expected  # the twin agrees with the hand
    assert_matches_brute_force(table, expected)
    assert tally_meanings(table).coding_fraction == pytest.approx(4 / 5)


def test_hand_worked_rule_150_one_readout_site():
    # Rule 150 (Wolfram 1983 numbering: 150 = 0b10010110, new cell = l XOR c XOR r), ring of 7 cells,
    # zero background. Sign site 3 (value s), context sites [2, 4]: context number p puts digit 0 on
    # site 2 (call it a) and digit 1 on site 4 (b), so contexts 0,1,2,3 are (a,b) = (0,0),(1,0),(0,1),(1,1).
    # Readout site 3 at t = 1 (window 1:1): x3(1) = x2 ^ x3 ^ x4 = a ^ s ^ b.
    #   context 0: f(0)=0, f(1)=1      context 1: f(0)=1, f(1)=0
    #   context 2: f(0)=1, f(1)=0      context 3: f(0)=0, f(1)=1
    # Only sign pair (0, 1): n(0,1) = 2 (contexts 0, 3), n(1,0) = 2 (contexts 1, 2): 2*2 = 4 instances,
    # one code (meanings {0,1}), all 4 contexts code. M = S xor A xor B with uniform S, C = (A, B):
    # I(S;M) = 0, I(S;M|C) = 1 bit, so co-information = -1 (Bell 2003 sign convention).
    medium = ElementaryCA(rule=150, width=7)
    layout = Layout(signs=[3], contexts=[2, 4], readout=[3], window="1:1")
    assert evaluate(medium, layout).meanings.tolist() == [[0, 1], [1, 0], [1, 0], [0, 1]]
    result = tally(medium, layout)
    assert (result.code_instances, result.codes, result.coding_contexts) == (4, 1, 4)
    assert result.co_information_bits == pytest.approx(-1.0, abs=1e-12)
    assert result.distinct_mappings == 2 and result.undefined_fraction == 0.0


def test_hand_worked_rule_150_two_readout_sites():
    # Same ring, sign and contexts as above; readout sites [2, 3] at t = 1, meaning = x2 + 2*x3
    # (first readout site least significant).
    #   x2(1) = x1 ^ x2 ^ x3 = 0 ^ a ^ s        x3(1) = a ^ s ^ b
    #   context 0 (a=0,b=0): s=0 -> x2=0,x3=0 -> 0;  s=1 -> x2=1,x3=1 -> 3
    #   context 1 (a=1,b=0): s=0 -> 1,1 -> 3;        s=1 -> 0,0 -> 0
    #   context 2 (a=0,b=1): s=0 -> 0,1 -> 2;        s=1 -> 1,0 -> 1
    #   context 3 (a=1,b=1): s=0 -> 1,0 -> 1;        s=1 -> 0,1 -> 2
    # Sign pair (0,1): (0,3),(3,0),(2,1),(1,2): n(0,3)*n(3,0) = 1 and n(1,2)*n(2,1) = 1, so 2 instances
    # and 2 codes ({0,3} and {1,2}); {0,2}-type cross pairs are not swaps. All 4 contexts code.
    # Contexts 1 and 2 differ, which pins the little-endian context numbering.
    medium = ElementaryCA(rule=150, width=7)
    layout = Layout(signs=[3], contexts=[2, 4], readout=[2, 3], window="1:1")
    assert evaluate(medium, layout).meanings.tolist() == [[0, 3], [3, 0], [2, 1], [1, 2]]
    result = tally(medium, layout)
    assert (result.code_instances, result.codes, result.coding_contexts) == (2, 2, 4)


def test_hand_worked_rule_150_persistence_window():
    # Rule 150 on a ring of 7, sign site 3 (s), context sites [2, 5] (a on 2, b on 5), readout site 3,
    # window 1:2: the meaning is x3(1) if x3(2) equals it, else undefined.
    #   t=1: x2 = x1^x2^x3 = a^s;  x3 = x2^x3^x4 = a^s;  x4 = x3^x4^x5 = s^b
    #   t=2: x3 = x2(1)^x3(1)^x4(1) = (a^s)^(a^s)^(s^b) = s^b
    # Persistent iff a^s == s^b iff a == b. Contexts (a,b) = (0,0),(1,0),(0,1),(1,1):
    #   context 0: f(0)=0, f(1)=1;  contexts 1, 2: both undefined;  context 3: f(0)=1, f(1)=0.
    # 1 instance ({0,3}), 1 code, 2 coding contexts, undefined fraction 4/8.
    medium = ElementaryCA(rule=150, width=7)
    layout = Layout(signs=[3], contexts=[2, 5], readout=[3], window="1:2")
    assert evaluate(medium, layout).meanings.tolist() == [[0, 1], [-1, -1], [-1, -1], [1, 0]]
    result = tally(medium, layout)
    assert (result.code_instances, result.codes, result.coding_contexts) == (1, 1, 2)
    assert result.undefined_fraction == 0.5
    assert result.coding_fraction == 0.5


# ----------------------------------------------------------------- evaluate vs the naive engine

# Li & Packard 1990 "chaotic" rules and relatives (reference-values.md): half the cases use one, because
# a random rule with a random layout rarely carries a code at all and the comparison would then be thin.
CHAOTIC = [18, 22, 26, 30, 45, 54, 60, 73, 90, 105, 106, 110, 122, 126, 129, 137, 146, 150, 154, 161]


def random_layout_case(index):
    rng = np.random.default_rng([314159, index])
    rule = int(rng.integers(0, 256)) if index % 2 else int(rng.choice(CHAOTIC))
    width = int(rng.integers(9, 14))
    boundary = ["periodic", "fixed"][int(rng.integers(0, 2))]
    t0 = 0 if index % 10 == 4 else int(rng.integers(1, 4))
    t1 = t0 if rng.random() < 0.7 else t0 + int(rng.integers(1, 3))
    n_sign, n_context, n_readout = int(rng.integers(1, 4)), int(rng.integers(2, 5)), int(rng.integers(1, 4))
    # Sites cluster around a readout centre, one sign and one context next to it on opposite sides, so the
    # readout usually lies in both light cones; lists come out unsorted, so numbering must follow list order.
    centre = int(rng.integers(0, width))
    side = int(rng.choice([-1, 1]))
    reach = max(2, min(t0, 3))
    others = [o for o in rng.permutation(np.arange(-reach, reach + 1)).tolist() if o not in (0, side, -side)]
    sign_offsets = [side] + others[:n_sign - 1]
    context_offsets = [-side] + others[n_sign - 1:n_sign + n_context - 2]
    signs = [(centre + o) % width for o in rng.permutation(sign_offsets).tolist()]
    contexts = [(centre + o) % width for o in rng.permutation(context_offsets).tolist()]
    rest = [(centre + o) % width for o in others[n_sign + n_context - 2:]]
    rest += [s for s in rng.permutation(width).tolist() if s not in signs + contexts + rest + [centre]][:1]
    clamp_signs, clamp_contexts = bool(rng.integers(0, 2)), bool(rng.integers(0, 2))
    pool = rest
    if index % 4 == 3:  # sometimes read out at seeded (unclamped) sign or context sites, which is allowed
        pool = pool + ([] if clamp_signs else signs) + ([] if clamp_contexts else contexts)
    meanings = "one-hot" if index % 3 == 1 else "pattern"
    if meanings == "one-hot":
        n_readout = max(2, n_readout)  # one readout site gives one one-hot meaning at most: no code possible
    readout = [centre] + [int(x) for x in rng.choice(pool, size=min(n_readout - 1, len(pool)), replace=False)]
    sign_patterns = None
    if index % 5 == 2 and n_sign >= 2:  # an explicit one-hot sign alphabet
        sign_patterns = [[1 if j == i else 0 for j in range(n_sign)] for i in range(n_sign)]
    background_kind = index % 3
    if background_kind == 0:
        background = "zeros"
    elif background_kind == 1:
        background = "random"
    else:
        background = "".join(str(int(v)) for v in rng.integers(0, 2, size=width))
    context_space = 2 ** len(contexts)
    context_sample = None
    if index % 7 == 5 and context_space >= 4:
        context_sample = int(rng.integers(2, context_space + 1))
    layout = Layout(signs=signs, contexts=contexts, readout=readout, window=(t0, t1), name=f"case{index}",
                    background=background, background_density=float(rng.uniform(0.2, 0.8)),
                    clamp_signs=clamp_signs, clamp_contexts=clamp_contexts, sign_patterns=sign_patterns,
                    context_sample=context_sample, meanings=meanings)
    return ElementaryCA(rule=rule, width=width, boundary=boundary), layout, int(rng.integers(0, 1000))


@pytest.mark.parametrize("index", range(60))
def test_evaluate_and_tally_agree_with_naive_engine(index):
    medium, layout, seed = random_layout_case(index)
    expected_table = naive_meanings(medium, layout, seed)
    table = evaluate(medium, layout, seed=seed)
    np.testing.assert_array_equal(table.meanings, expected_table, err_msg=f"{medium!r} {layout!r}")
    expected = brute_force_tally(expected_table)
    result = tally(medium, layout, seed=seed)
    for column in INT_COLUMNS:
        assert getattr(result, column) == expected[column], column
    assert result.undefined_fraction == pytest.approx(expected["undefined_fraction"], abs=1e-15)
    assert result.co_information_bits == pytest.approx(naive_co_information(expected_table), abs=1e-9)
    assert result.contexts == expected_table.shape[0]
    assert result.context_space == 2 ** len(layout.contexts)


def test_random_layout_cases_cover_the_features():
    # Guard for the parametrised test above: the generator must really produce each feature.
    cases = [random_layout_case(i) for i in range(60)]
    layouts = [layout for _, layout, _ in cases]
    assert any(l.clamp_signs for l in layouts) and any(l.clamp_contexts for l in layouts)
    assert any(l.meanings == "one-hot" for l in layouts) and any(l.sign_patterns for l in layouts)
    assert any(l.context_sample for l in layouts)
    assert any(l.window[0] < l.window[1] for l in layouts) and any(l.window[0] == 0 for l in layouts)
    assert any(set(l.readout) & (set(l.signs) | set(l.contexts)) for l in layouts)
    assert {m.boundary for m, _, _ in cases} == {"periodic", "fixed"}
    assert len({m.rule for m, _, _ in cases}) >= 40
    tallies = [brute_force_tally(naive_meanings(m, l, s)) for m, l, s in cases]
    assert sum(t["code_instances"] > 0 for t in tallies) >= 8  # codes are rare in random layouts
    assert sum(0 < t["undefined_fraction"] < 1 for t in tallies) >= 10


def test_evaluate_in_one_context_chunks_matches_naive(monkeypatch):
    # Force one context per chunk, so the chunk loop and its offsets are exercised.
    # (probe/__init__ re-exports the function evaluate, which hides the submodule attribute.)
    monkeypatch.setattr(importlib.import_module("probe.evaluate"), "CHUNK_CELLS", 1)
    medium = ElementaryCA(rule=110, width=13)
    layout = Layout(signs="6,7", contexts="2-5,9", readout="7,8", window="2:3", background="random")
    np.testing.assert_array_equal(evaluate(medium, layout, seed=3).meanings, naive_meanings(medium, layout, 3))


# ----------------------------------------------------------------- co-information

def dit_coinformation(table):
    table = np.asarray(table)
    n_contexts, n_signs = table.shape
    outcomes = [(s, c, int(table[c, s])) for c in range(n_contexts) for s in range(n_signs)]
    return coinformation(dit.Distribution(outcomes, [1.0 / len(outcomes)] * len(outcomes)))


@pytest.mark.parametrize("name, table, value", [
    # Rows: context bit C; columns: sign bit S. Reference: Bell 2003 and dit (reference-values.md).
    ("xor", [[0, 1], [1, 0]], -1.0),
    ("and", [[0, 0], [0, 1]], -0.18872187554086706),
    ("copy sign", [[0, 1], [0, 1]], 0.0),
])
def test_co_information_reference_values(name, table, value):
    table = np.array(table)
    assert co_information_bits(table) == pytest.approx(value, abs=1e-12)
    assert dit_coinformation(table) == pytest.approx(value, abs=1e-12)
    assert naive_co_information(table) == pytest.approx(value, abs=1e-12)


def test_co_information_agrees_with_dit_on_random_tables():
    rng = np.random.default_rng(99)
    for _ in range(40):
        table = random_meaning_table(rng, values=np.array([0, 1, 2, 5]), undefined_share=0.2)
        expected = dit_coinformation(table)
        assert co_information_bits(table) == pytest.approx(expected, abs=1e-9), table.tolist()
        assert naive_co_information(table) == pytest.approx(expected, abs=1e-9), table.tolist()
        assert tally_meanings(table).co_information_bits == pytest.approx(expected, abs=1e-9)


# ----------------------------------------------------------------- symmetry over all 256 rules

WIDTH = 13
SYM_LAYOUTS = [
    dict(signs=[5, 7], contexts=[3, 4, 8, 9], readout=[6, 2], window="2:2"),
    dict(signs=[7, 5], contexts=[9, 3, 4, 8], readout=[6, 10], window="2:3", clamp_contexts=True),
]
RANDOM_BACKGROUND = "".join(str(v) for v in np.random.default_rng(5).integers(0, 2, size=WIDTH))


def mirror(sites):
    return [WIDTH - 1 - site for site in sites]  # keep list order, so pattern digits follow their sites


def assert_same_tallies(a, b, where):
    for column in INT_COLUMNS + ("contexts", "signs"):
        assert getattr(a, column) == getattr(b, column), (where, column)
    for column in ("undefined_fraction", "co_information_bits", "coding_fraction"):
        assert getattr(a, column) == pytest.approx(getattr(b, column), abs=1e-12), (where, column)


@pytest.mark.parametrize("boundary", ["periodic", "fixed"])
def test_reflection_symmetry_for_every_rule(boundary):
    # Reflection f'(l,c,r) = f(r,c,l) (NKS p. 57) with every site i -> width-1-i maps each run onto its
    # mirror image, on a ring and on a zero-bounded row alike, so the meaning tables are identical.
    checked = 0
    for rule in range(256):
        medium, mirrored_medium = ElementaryCA(rule, WIDTH, boundary), ElementaryCA(reflect(rule), WIDTH, boundary)
        for spec in SYM_LAYOUTS:
            for background in ("zeros", RANDOM_BACKGROUND):
                layout = Layout(background=background, **spec)
                mirrored = Layout(**{**spec, "signs": mirror(spec["signs"]), "contexts": mirror(spec["contexts"]),
                                     "readout": mirror(spec["readout"])},
                                  background=background if background == "zeros" else background[::-1])
                table = evaluate(medium, layout).meanings
                mirrored_table = evaluate(mirrored_medium, mirrored).meanings
                np.testing.assert_array_equal(table, mirrored_table, err_msg=f"rule {rule} {spec} {background}")
                assert_same_tallies(tally_meanings(table), tally_meanings(mirrored_table), (rule, background))
                checked += 1
    assert checked == 256 * len(SYM_LAYOUTS) * 2


def test_complement_symmetry_for_every_rule():
    # Complement f'(x) = 1 - f(not x) (NKS p. 57) maps the run from x onto the run from not-x. With the
    # background complemented too, sign pattern p and context pattern q of the original correspond to
    # patterns (2^n - 1) - p and (2^m - 1) - q, and meaning m to (2^r - 1) - m (undefined stays undefined;
    # clamped values are complemented consistently). So the complemented table is the original with both
    # axes reversed and meanings complemented, and every tally is unchanged. Ring only: a fixed boundary
    # is zero outside the row, and its complement would be a different medium.
    checked = 0
    for rule in range(256):
        medium, other = ElementaryCA(rule, WIDTH), ElementaryCA(complement(rule), WIDTH)
        for spec in SYM_LAYOUTS:
            for background in ("zeros", RANDOM_BACKGROUND):
                flipped = "1" * WIDTH if background == "zeros" else "".join("10"[int(ch)] for ch in background)
                table = evaluate(medium, Layout(background=background, **spec)).meanings
                other_table = evaluate(other, Layout(background=flipped, **spec)).meanings
                top = 2 ** len(spec["readout"]) - 1
                expected = np.where(table == -1, -1, top - table)[::-1, ::-1]
                np.testing.assert_array_equal(other_table, expected, err_msg=f"rule {rule} {spec} {background}")
                assert_same_tallies(tally_meanings(table), tally_meanings(other_table), (rule, background))
                checked += 1
    assert checked == 256 * len(SYM_LAYOUTS) * 2


def test_symmetry_layouts_are_not_vacuous():
    # The symmetry tests would pass trivially if the layouts never produced codes; they do for many rules
    # (74 and 14 of 256 when this was written), and some runs are undefined under the 2:3 window.
    with_codes = [sum(tally(ElementaryCA(rule, WIDTH), Layout(**spec)).code_instances > 0 for rule in range(256))
                  for spec in SYM_LAYOUTS]
    assert with_codes[0] > 50 and with_codes[1] > 10
    assert tally(ElementaryCA(30, WIDTH), Layout(**SYM_LAYOUTS[1])).undefined_fraction > 0
