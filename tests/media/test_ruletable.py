"""Binary rule tables of radius 1..3: agreement with the elementary CA on every rule, the bit-sliced
kernel against its slow twin, hand-checked radius-2 rules, input checks, the conformance suite and
the family's survey expansion.

Reference values come from /work/shared/reference-values.md; each assertion names its source.
"""

import re

import numpy as np
import pytest

from media import registry
from media.conformance import parametrize_with_checks
from media.eca import ElementaryCA
from media.errors import MediumInputError
from media.interface import evolve_by_steps
from media.ruletable import RuleTableCA, RuleTableFamily, rule_from_function, rule_masks, rule_space, rule_table
from media.ruletable.kernels import BLOCK
from probe.seeding import rng_for

BOUNDARIES = ("periodic", "fixed")

# new x(i) = x(i-2): with index sum_j x(i+j) 2^(2-j), x(i-2) is bit 4 (value 16), so the rule has bit n
# set for n = 16..31: sum of 2^n over n = 16..31 = 2^32 - 2^16 = 4294901760.
COPY_TWO_LEFT = 2**32 - 2**16
# new x(i) = x(i+2): x(i+2) is bit 0, so every odd n: 2 + 8 + ... + 2^31 = 0xAAAAAAAA = 2863311530.
COPY_TWO_RIGHT = 0xAAAAAAAA


def random_rule(rng, radius):
    space = rule_space(radius)
    return int.from_bytes(rng.bytes(space.bit_length() // 8 + 8), "little") % space


# --------------------------------------------------------------------------------------
# Numbering
# --------------------------------------------------------------------------------------


def test_rule_spaces():
    assert rule_space(1) == 256  # Wolfram 1983: 2^8 elementary rules
    assert rule_space(2) == 2**32 and rule_space(3) == 2**128  # 2^(2^(2r+1)), computed


def test_radius_1_index_is_4l_2c_r():
    # Wolfram 1983 (Rev. Mod. Phys. 55:601): the output for (l, c, r) is bit 4l + 2c + r.
    assert rule_table(30, 1) == [0, 1, 1, 1, 1, 0, 0, 0]  # Wolfram 1983
    assert rule_from_function(lambda cells: cells[0], 1) == 240  # new = left: bits 4..7
    assert rule_from_function(lambda cells: cells[2], 1) == 170  # new = right: odd bits
    assert rule_from_function(lambda cells: cells[0] ^ cells[1] ^ cells[2], 1) == 150


def test_hand_derived_radius_2_numbers():
    assert rule_from_function(lambda cells: cells[0], 2) == COPY_TWO_LEFT == 4294901760
    assert rule_from_function(lambda cells: cells[4], 2) == COPY_TWO_RIGHT == 2863311530


@pytest.mark.parametrize("rule", range(256))
def test_radius_1_equals_the_elementary_ca(rule):
    rng = np.random.default_rng(rule)
    for boundary in BOUNDARIES:
        for width in (1, 2, 3, 9):
            initial = rng.integers(0, 2, size=(130, width), dtype=np.uint8)
            ours, theirs = RuleTableCA(rule, 1, width, boundary), ElementaryCA(rule, width, boundary)
            assert np.array_equal(ours.step(initial), theirs.step(initial)), (rule, boundary, width)
            watch = np.arange(width)
            assert np.array_equal(ours.evolve(initial, 10, watch=watch), theirs.evolve(initial, 10, watch=watch)), (
                rule, boundary, width)


# Each case: rule, boundary, one row, the next row worked out by hand.
HAND_CASES = [
    (COPY_TWO_LEFT, "periodic", [1, 0, 0, 0, 1, 1, 0], [1, 0, 1, 0, 0, 0, 1]),  # x5, x6 wrap to the front
    (COPY_TWO_LEFT, "fixed", [1, 0, 0, 0, 1, 1, 0], [0, 0, 1, 0, 0, 0, 1]),  # zeros enter on the left
    (COPY_TWO_RIGHT, "periodic", [1, 0, 0, 0, 1, 1, 0], [0, 0, 1, 1, 0, 1, 0]),  # x0, x1 wrap to the back
    (COPY_TWO_RIGHT, "fixed", [1, 0, 0, 0, 1, 1, 0], [0, 0, 1, 1, 0, 0, 0]),
    (COPY_TWO_LEFT, "periodic", [1], [1]),  # on a ring of one, x(i-2) is the cell itself
    (COPY_TWO_LEFT, "fixed", [1], [0]),
    (COPY_TWO_LEFT, "periodic", [0, 1, 0], [1, 0, 0]),  # i - 2 = i + 1 mod 3
    (1, "fixed", [0, 0, 0, 0, 0], [1, 1, 1, 1, 1]),  # rule 1: on only for the all-zero neighbourhood
    (1, "periodic", [0, 0, 1, 0, 0], [0, 0, 0, 0, 0]),  # every cell of a ring of 5 sees the 1
    (1, "fixed", [0, 0, 0, 0, 0, 0, 1], [1, 1, 1, 1, 0, 0, 0]),  # cells 4..6 see it
]


@pytest.mark.parametrize(("rule", "boundary", "row", "expected"), HAND_CASES)
def test_radius_2_by_hand(rule, boundary, row, expected):
    ca = RuleTableCA(rule, radius=2, width=len(row), boundary=boundary)
    states = np.array([row], dtype=np.uint8)
    assert ca.step(states).tolist() == [expected]
    assert ca.evolve(states, 1, watch=np.arange(len(row)), watch_from=1)[0, 0].tolist() == expected


def test_copy_two_left_shifts_by_two_every_step():
    ca = RuleTableCA(COPY_TWO_LEFT, radius=2, width=11)
    start = np.random.default_rng(3).integers(0, 2, size=(70, 11), dtype=np.uint8)
    history = ca.evolve(start, 6, watch=np.arange(11))
    for t in range(7):
        assert np.array_equal(history[:, t], np.roll(start, 2 * t, axis=1))


# --------------------------------------------------------------------------------------
# Bit-sliced evolve against its slow twin (evolve_by_steps over the NumPy lookup step)
# --------------------------------------------------------------------------------------


def _compare(ca, batch, steps, rng, *, clamp, watch_from):
    width = ca.n_sites
    initial = rng.integers(0, 2, size=(batch, width), dtype=np.uint8)
    watch = rng.permutation(width)[: max(1, width - 1)]
    kwargs = {"watch": watch, "watch_from": watch_from}
    if clamp:
        sites = np.sort(rng.choice(width, size=max(1, width // 3), replace=False))
        kwargs["clamp_sites"] = sites
        kwargs["clamp_values"] = rng.integers(0, 2, size=(batch, sites.size), dtype=np.uint8)
    fast = ca.evolve(initial, steps, **kwargs)
    slow = evolve_by_steps(ca, initial, steps, **kwargs)
    assert fast.dtype == np.uint8
    assert fast.shape == slow.shape == (batch, steps - watch_from + 1, watch.size)
    assert np.array_equal(fast, slow), (ca, batch, clamp, watch_from)
    if clamp:
        first = max(1, watch_from) - watch_from
        for column, site in enumerate(watch):
            where = np.flatnonzero(kwargs["clamp_sites"] == site)
            if where.size:
                assert (fast[:, first:, column] == kwargs["clamp_values"][:, where[0], None]).all()


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("batch", [1, 63, 65, 130])
@pytest.mark.parametrize("radius", [2, 3])
def test_evolve_matches_step_loop(radius, batch, boundary):
    rng = np.random.default_rng(1000 * radius + batch + (boundary == "fixed"))
    rules = [0, rule_space(radius) - 1, 1, COPY_TWO_LEFT % rule_space(radius),
             *(random_rule(rng, radius) for _ in range(8))]
    for index, rule in enumerate(rules):
        width = (1, 2, 3, 4, 5, 7, 8, 16)[index % 8]
        ca = RuleTableCA(rule, radius, width, boundary)
        _compare(ca, batch, 7, rng, clamp=False, watch_from=0)
        _compare(ca, batch, 7, rng, clamp=True, watch_from=3)
        _compare(ca, batch, 4, rng, clamp=True, watch_from=4)


@pytest.mark.parametrize("radius", [1, 2, 3])
def test_evolve_matches_step_loop_across_word_blocks(radius):
    # The kernel takes BLOCK words (64 * BLOCK runs) at a time; cross a block edge and end mid-word.
    rng = np.random.default_rng(radius)
    batch = 64 * BLOCK + 64 + 5
    for boundary in BOUNDARIES:
        ca = RuleTableCA(random_rule(rng, radius), radius, 9, boundary)
        _compare(ca, batch, 5, rng, clamp=True, watch_from=1)


def test_masks_are_all_ones_or_all_zeros():
    masks = rule_masks(COPY_TWO_RIGHT, 2)
    assert masks.dtype == np.uint64 and masks.shape == (32,)
    assert masks.tolist() == [(2**64 - 1) * (n % 2) for n in range(32)]


def test_zero_steps_and_untouched_input():
    ca = RuleTableCA(COPY_TWO_LEFT, 2, 6)
    initial = np.random.default_rng(7).integers(0, 2, size=(65, 6), dtype=np.uint8)
    before = initial.copy()
    out = ca.evolve(initial, 0, watch=[5, 0, 2])
    assert out.shape == (65, 1, 3) and np.array_equal(out[:, 0], initial[:, [5, 0, 2]])
    ca.evolve(initial, 4, watch=np.arange(6))
    assert np.array_equal(initial, before)


def test_reach_is_sound_and_reaches_the_cone_edge():
    # Parity of the 2r+1 cells is additive over GF(2); the edge terms of (1 + x + ... + x^2r)^t are 1,
    # so a flip reaches distance exactly r * t (computed).
    for radius in (2, 3):
        parity = rule_from_function(lambda cells: sum(cells) % 2, radius)
        for boundary in BOUNDARIES:
            ca = RuleTableCA(parity, radius, 21, boundary)
            states = np.random.default_rng(radius).integers(0, 2, size=(8, 21), dtype=np.uint8)
            for steps in range(4):
                flipped = states.copy()
                flipped[:, 10] ^= 1
                a = ca.evolve(states, steps, watch=np.arange(21), watch_from=steps)[:, 0]
                b = ca.evolve(flipped, steps, watch=np.arange(21), watch_from=steps)[:, 0]
                changed, mask = (a != b).any(axis=0), ca.reach([10], steps)
                assert not (changed & ~mask).any()
                assert changed[10 - radius * steps] and changed[10 + radius * steps]
    assert np.flatnonzero(RuleTableCA(0, 3, 11, "fixed").reach([0], 1)).tolist() == [0, 1, 2, 3]
    assert np.flatnonzero(RuleTableCA(0, 3, 11, "periodic").reach([0], 1)).tolist() == [0, 1, 2, 3, 8, 9, 10]


# --------------------------------------------------------------------------------------
# Bad input
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(("kwargs", "message"), [
    ({"rule": 2**32}, "rule must be an integer 0..4294967295 for radius=2, got 4294967296"),
    ({"rule": 256, "radius": 1}, "rule must be an integer 0..255 for radius=1, got 256"),
    ({"rule": 2**128, "radius": 3}, "rule must be an integer 0..2^128-1 for radius=3, got "),
    ({"rule": -1}, "got -1"),
    ({"rule": 1.0}, "got 1.0"),
    ({"rule": False}, "got False"),
    ({"rule": 0, "radius": 0}, "radius must be an integer 1..3, got 0"),
    ({"rule": 0, "radius": 4}, "radius must be an integer 1..3, got 4"),
    ({"rule": 0, "width": -3}, "width must be an integer >= 1, got -3"),
    ({"rule": 0, "boundary": "reflecting"}, "boundary must be one of periodic, fixed, got 'reflecting'"),
])
def test_bad_input_is_refused_in_one_line(kwargs, message):
    with pytest.raises(MediumInputError, match=re.escape(message)) as caught:
        RuleTableCA(**kwargs)
    assert "\n" not in str(caught.value)


def test_large_rules_and_digit_strings_are_accepted():
    assert RuleTableCA(2**128 - 1, radius=3).rule == 2**128 - 1
    assert RuleTableCA(str(COPY_TWO_LEFT)).describe() == {"rule": COPY_TWO_LEFT, "radius": 2, "width": 21,
                                                          "boundary": "periodic"}


def test_non_binary_states_are_refused():
    bad = np.array([[0, 2, 0, 0]], dtype=np.uint8)
    with pytest.raises(MediumInputError, match="initial states must lie in 0..1, got 2"):
        RuleTableCA(30, 1, 4).evolve(bad, 1, watch=[0])
    with pytest.raises(MediumInputError, match="states must lie in 0..1, got 2"):
        RuleTableCA(30, 1, 4).step(bad)


# --------------------------------------------------------------------------------------
# Conformance suite
# --------------------------------------------------------------------------------------

CONFORMANCE_MEDIA = [
    RuleTableCA(110, 1, 21),
    RuleTableCA(30, 1, 5, "fixed"),
    RuleTableCA(COPY_TWO_LEFT, 2, 9),
    RuleTableCA(3_141_592_653, 2, 21, "fixed"),
    RuleTableCA(2_718_281_828, 2, 1),
    RuleTableCA(2**127 + 12345, 3, 13),
    RuleTableCA(2**128 // 3, 3, 4, "fixed"),
]


@parametrize_with_checks(CONFORMANCE_MEDIA)
def test_conforms(medium, check):
    check(medium)


# --------------------------------------------------------------------------------------
# Registry and family
# --------------------------------------------------------------------------------------


def test_registered_and_builds():
    family = registry.family("ruletable")
    assert isinstance(family, RuleTableFamily) and family.axis_key == "rule"
    medium = registry.build("ruletable", rule=COPY_TWO_LEFT, width=9)
    assert isinstance(medium, RuleTableCA) and medium.radius == 2 and medium.n_sites == 9
    assert registry.build("ruletable", **medium.describe()).describe() == medium.describe()
    with pytest.raises(MediumInputError, match="missing parameter 'rule'"):
        registry.build("ruletable", radius=1)


def test_expand_all_lists_and_ranges():
    family = RuleTableFamily()
    params = family.expand({"radius": 1}, seed=0)
    assert params == [{"rule": rule, "radius": 1, "width": 21, "boundary": "periodic"} for rule in range(256)]
    assert [p["rule"] for p in family.expand({"rules": "0-3,4294901760"}, seed=0)] == [0, 1, 2, 3, COPY_TWO_LEFT]
    assert [p["rule"] for p in family.expand({"rules": [30, 30, 110], "radius": 1}, seed=0)] == [30, 110]
    for params in family.expand({"rules": [str(2**128 - 1), 5], "radius": 3, "width": 7}, seed=0):
        assert registry.build("ruletable", **params).describe() == params


def test_expand_refuses_what_it_cannot_do():
    family = RuleTableFamily()
    with pytest.raises(MediumInputError, match=r"4294967296 rules is more than the 65536 .*sample"):
        family.expand({}, seed=0)  # "all" for radius 2
    with pytest.raises(MediumInputError, match=r"70000 rules is more than the 65536"):
        family.expand({"rules": "0-69999"}, seed=0)
    with pytest.raises(MediumInputError, match=r"256 is not one of the rules 0..255 \(radius 1 has 256 rules\)"):
        family.expand({"rules": "250-256", "radius": 1}, seed=0)
    with pytest.raises(MediumInputError, match="either rules or sample"):
        family.expand({"rules": "1,2", "sample": 3}, seed=0)
    with pytest.raises(MediumInputError, match=r"sample must be a count 1..65536 \(a survey lists at most"):
        family.expand({"sample": 0}, seed=0)
    with pytest.raises(MediumInputError, match=r"unknown key 'rule'; did you mean 'rules'\?"):
        family.expand({"rule": 3}, seed=0)


@pytest.mark.parametrize("radius", [1, 2, 3])
def test_expand_sample(radius):
    family = RuleTableFamily()
    table = {"sample": 20, "radius": radius}
    first = [p["rule"] for p in family.expand(table, seed=11)]
    assert first == [p["rule"] for p in family.expand(table, seed=11)]  # reproducible
    assert len(set(first)) == 20 and first == sorted(first)  # distinct
    assert all(0 <= rule < rule_space(radius) for rule in first)
    assert first != [p["rule"] for p in family.expand(table, seed=12)]  # another seed, another sample
    if radius == 2:
        # The documented generator: SeedSequence([seed, crc32(b"rules")]), as probe.seeding.rng_for.
        expected = rng_for(11, "rules").choice(2**32, size=20, replace=False)
        assert first == sorted(int(rule) for rule in expected)
        assert max(first) > 2**31  # drawn from the whole 2^32 space
    assert min(first) < rule_space(radius) // 2 < max(first)  # drawn from the whole space
