"""Elementary rule numbering, symmetries, equivalence classes, class tables and rule-set parsing.

Reference values come from /work/shared/reference-values.md; each assertion names its source.
"""

import re
from collections import Counter

import numpy as np
import pytest

from media.eca import (complement, equivalents, li_packard_class, parse_rule_set, reflect,
                       representative, representatives, rule_table, wolfram_class)
from media.eca.rules import check_rule
from media.errors import MediumInputError

ALL_RULES = range(256)


# --------------------------------------------------------------------------------------
# Numbering
# --------------------------------------------------------------------------------------


def test_rule_table_bit_convention():
    # Wolfram 1983 (Rev. Mod. Phys. 55:601): output for (l, c, r) is bit 4l + 2c + r.
    # Rule 30 = 0b00011110: 100, 011, 010, 001 -> 1 (Wolfram's icon 111..000 reads 00011110).
    assert rule_table(30) == [0, 1, 1, 1, 1, 0, 0, 0]  # Wolfram 1983
    # Rule 110 = 0b01101110: 110, 101, 011, 010, 001 -> 1.
    assert rule_table(110) == [0, 1, 1, 1, 0, 1, 1, 0]  # Wolfram 1983
    assert rule_table(16) == [0, 0, 0, 0, 1, 0, 0, 0]  # only l=1, c=0, r=0 (index 4) is on
    assert rule_table(1) == [1, 0, 0, 0, 0, 0, 0, 0]


def test_rule_table_rebuilds_the_rule_number():
    for rule in ALL_RULES:
        table = rule_table(rule)
        assert len(table) == 8 and set(table) <= {0, 1}
        assert sum(bit << index for index, bit in enumerate(table)) == rule


def test_check_rule():
    assert check_rule(30) == 30
    assert check_rule("110") == 110
    assert check_rule(np.int64(255)) == 255
    for bad in (256, -1, 1.0, True, "x", None):
        with pytest.raises(MediumInputError, match=re.escape(repr(bad))):
            check_rule(bad)


# --------------------------------------------------------------------------------------
# Reflection and complement
# --------------------------------------------------------------------------------------


def test_reflection_and_complement_examples():
    assert reflect(110) == 124  # reference-values.md (A New Kind of Science p. 57)
    assert complement(110) == 137  # reference-values.md
    assert reflect(complement(110)) == 193  # reference-values.md
    assert reflect(30) == 86  # reference-values.md
    assert complement(30) == 135  # reference-values.md
    assert reflect(complement(30)) == 149  # reference-values.md
    assert equivalents(110) == (110, 124, 137, 193)
    assert equivalents(30) == (30, 86, 135, 149)
    assert representative(193) == 110 and representative(149) == 30


def test_reflection_and_complement_follow_their_definitions():
    # reflect: f'(l, c, r) = f(r, c, l); complement: f'(x) = 1 - f(not x).
    for rule in ALL_RULES:
        table, mirrored, swapped = rule_table(rule), rule_table(reflect(rule)), rule_table(complement(rule))
        for l in (0, 1):
            for c in (0, 1):
                for r in (0, 1):
                    assert mirrored[4 * l + 2 * c + r] == table[4 * r + 2 * c + l]
                    assert swapped[4 * l + 2 * c + r] == 1 - table[4 * (1 - l) + 2 * (1 - c) + (1 - r)]


def test_involutions_that_commute():
    for rule in ALL_RULES:
        assert reflect(reflect(rule)) == rule
        assert complement(complement(rule)) == rule
        assert reflect(complement(rule)) == complement(reflect(rule))


def test_symmetric_rule_counts():
    assert sum(reflect(rule) == rule for rule in ALL_RULES) == 64  # A New Kind of Science p. 57; computed
    assert sum(complement(rule) == rule for rule in ALL_RULES) == 16  # A New Kind of Science p. 57; computed


def test_88_classes():
    reps = representatives()
    assert len(reps) == 88  # A New Kind of Science p. 57; computed
    assert list(reps) == sorted(reps)
    classes = {}
    for rule in ALL_RULES:
        classes.setdefault(representative(rule), set()).add(rule)
    assert sorted(classes) == list(reps)
    for rep, members in classes.items():
        assert rep == min(members)
        assert tuple(sorted(members)) == equivalents(rep)
        for member in members:
            assert equivalents(member) == equivalents(rep)
    # computed: 8 rules fixed by both symmetries, 36 pairs, 44 quadruples (8 + 72 + 176 = 256)
    assert Counter(len(members) for members in classes.values()) == {1: 8, 2: 36, 4: 44}
    # computed, Burnside: (256 + 64 + 16 + 16) / 4 = 88, with 16 rules fixed by reflect o complement
    assert sum(reflect(complement(rule)) == rule for rule in ALL_RULES) == 16


def _reverse_bits(rule):
    return int(f"{rule:08b}"[::-1], 2)


def test_bit_reversal_is_not_the_reflection():
    # Pitfall (reference-values.md): reversing the rule number's bits is f'(x) = f(7 - x),
    # i.e. complementing the inputs, not mirroring them; with the complement it gives 72 classes.
    assert _reverse_bits(110) == 118 and reflect(110) == 124
    assert sum(_reverse_bits(rule) != reflect(rule) for rule in ALL_RULES) > 0
    wrong = {min(r, _reverse_bits(r), complement(r), _reverse_bits(complement(r))) for r in ALL_RULES}
    assert len(wrong) == 72  # reference-values.md: the pitfall gives 72 classes
    assert len(representatives()) != len(wrong)


# --------------------------------------------------------------------------------------
# Published class tables
# --------------------------------------------------------------------------------------

# Martinez 2013, J. Cellular Automata, arXiv:1306.5577 (recall, via reference-values.md).
WOLFRAM_1 = {0, 8, 32, 40, 128, 136, 160, 168}
WOLFRAM_3 = {18, 22, 30, 45, 60, 90, 105, 122, 126, 146, 150}
WOLFRAM_4 = {41, 54, 106, 110}

# Li & Packard 1990, Complex Systems 4:281, Table 2 (recall, via reference-values.md).
LI_PACKARD = {
    "null": [0, 8, 32, 40, 128, 136, 160, 168],
    "fixed point": [2, 4, 10, 12, 13, 24, 34, 36, 42, 44, 46, 56, 57, 58, 72, 76, 77, 78, 104, 130, 132,
                    138, 140, 152, 162, 164, 170, 172, 184, 200, 204, 232],
    "periodic": [1, 3, 5, 6, 7, 9, 11, 14, 15, 19, 23, 25, 27, 28, 29, 33, 35, 37, 38, 41, 43, 50, 51, 74,
                 108, 131, 133, 134, 142, 156, 178],
    "locally chaotic": [26, 73, 154],
    "chaotic": [18, 22, 30, 45, 54, 60, 90, 105, 106, 129, 137, 146, 150, 161],
}


def test_wolfram_class_table():
    reps = representatives()
    by_class = {label: {rep for rep in reps if wolfram_class(rep) == label} for label in (1, 2, 3, 4)}
    assert by_class[1] == WOLFRAM_1  # Martinez 2013 (recall)
    assert by_class[3] == WOLFRAM_3  # Martinez 2013 (recall)
    assert by_class[4] == WOLFRAM_4  # Martinez 2013 (recall)
    assert len(by_class[2]) == 65  # Martinez 2013 (recall): every other representative
    assert {len(v) for v in by_class.values()} == {8, 65, 11, 4}
    assert wolfram_class(124) == 4 and wolfram_class(137) == 4 and wolfram_class(193) == 4  # via rule 110
    assert wolfram_class(86) == 3 and wolfram_class(4) == 2 and wolfram_class(255) == 1


def test_li_packard_table_covers_every_class_once():
    mapped = {label: [representative(rule) for rule in rules] for label, rules in LI_PACKARD.items()}
    assert {label: len(set(reps)) for label, reps in mapped.items()} == {
        "null": 8, "fixed point": 32, "periodic": 31, "locally chaotic": 3, "chaotic": 14,
    }  # Li & Packard 1990, Complex Systems 4:281, Table 2 (recall)
    everything = [rep for reps in mapped.values() for rep in reps]
    assert len(everything) == len(set(everything)) == 88  # no class listed twice
    assert set(everything) == set(representatives())
    # The non-minimal entries of the table land on the classes reference-values.md names.
    assert [representative(r) for r in (131, 133, 129, 137, 161)] == [62, 94, 126, 110, 122]


def test_li_packard_labels():
    for label, rules in LI_PACKARD.items():
        for rule in rules:
            assert li_packard_class(rule) == label, rule  # Li & Packard 1990, Table 2 (recall)
    assert li_packard_class(62) == "periodic"  # listed as 131
    assert li_packard_class(110) == "chaotic"  # listed as 137
    assert Counter(li_packard_class(rep) for rep in representatives()) == {
        "null": 8, "fixed point": 32, "periodic": 31, "locally chaotic": 3, "chaotic": 14}


def test_labels_are_invariant_under_reflection_and_complement():
    for rule in ALL_RULES:
        for other in (reflect(rule), complement(rule), reflect(complement(rule))):
            assert wolfram_class(other) == wolfram_class(rule)
            assert li_packard_class(other) == li_packard_class(rule)


# --------------------------------------------------------------------------------------
# parse_rule_set
# --------------------------------------------------------------------------------------


def test_parse_rule_set_keywords():
    assert parse_rule_set("all") == list(range(256))
    assert parse_rule_set(" ALL ") == list(range(256))
    assert parse_rule_set("classes") == list(representatives())
    assert len(parse_rule_set("classes")) == 88


def test_parse_rule_set_ranges_and_lists():
    assert parse_rule_set("0-15,30") == list(range(16)) + [30]
    assert parse_rule_set("110") == [110]
    assert parse_rule_set(" 30 , 90-92 ") == [30, 90, 91, 92]
    assert parse_rule_set("5-5") == [5]
    assert parse_rule_set("30,0-31") == [30] + [r for r in range(32) if r != 30]  # first occurrence kept
    assert parse_rule_set([110, 30, 110]) == [110, 30]
    assert parse_rule_set((0, 255)) == [0, 255]
    assert parse_rule_set(["54", 41]) == [54, 41]
    assert parse_rule_set(90) == [90]


@pytest.mark.parametrize(("spec", "named"), [
    (300, "300"),
    (-1, "-1"),
    ("5-2", "5-2"),
    ("abc", "abc"),
    (1.5, "1.5"),
    (True, "True"),
    ("0-300", "300"),
    ([1, 256], "256"),
    ("1,,2", "1,,2"),
    (None, "None"),
    ("3,x7", "x7"),
])
def test_parse_rule_set_rejects_bad_input(spec, named):
    with pytest.raises(MediumInputError, match=re.escape(named)):
        parse_rule_set(spec)
