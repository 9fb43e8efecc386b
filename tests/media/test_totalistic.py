"""Totalistic automata: Wolfram's code numbering, agreement with the elementary CA, the fast kernel
against its slow twin, input checks, the conformance suite and the family's survey expansion.

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
from media.ruletable import RuleTableCA, rule_from_function
from media.totalistic import (TotalisticCA, TotalisticFamily, binary_rule_number, code_from_table, code_space,
                              code_table, table_length)
from probe.layout import Layout
from probe.seeding import rng_for
from probe.tally import tally

BOUNDARIES = ("periodic", "fixed")

# reference-values.md (computed): k=2, r=1 codes 0..15 are these elementary rules; code 10 = rule 150.
ECA_OF_CODE = [0, 1, 22, 23, 104, 105, 126, 127, 128, 129, 150, 151, 232, 233, 254, 255]


def random_code(rng, states, radius):
    """A uniform code of any size (codes pass int64 for large k and r)."""
    space = code_space(states, radius)
    return int.from_bytes(rng.bytes(space.bit_length() // 8 + 8), "little") % space


# --------------------------------------------------------------------------------------
# Numbering
# --------------------------------------------------------------------------------------


def test_code_space_sizes():
    # A New Kind of Science p. 60 and note p. 886, via reference-values.md: 16, 64 and 2187 codes.
    assert code_space(2, 1) == 16
    assert code_space(2, 2) == 64
    assert code_space(3, 1) == 2187
    assert table_length(8, 3) == 7 * 7 + 1 and code_space(8, 3) == 8**50  # past int64: a Python int


def test_codes_0_to_15_are_the_listed_elementary_rules():
    assert [binary_rule_number(code) for code in range(16)] == ECA_OF_CODE  # reference-values.md (computed)
    assert binary_rule_number(10) == 150  # reference-values.md: code 10 = rule 150


def test_code_digits_are_the_outputs_by_sum():
    # Code = sum_s f(s) k^s (A New Kind of Science p. 60): digit s in base k is f(s).
    assert code_table(10, 2, 1) == [0, 1, 0, 1]  # 10 = 2 + 8: sums 1 and 3 turn a cell on
    assert code_table(2186, 3, 1) == [2] * 7
    for code in (0, 1, 588, 1635, 2186):
        assert code_from_table(code_table(code, 3, 1), 3) == code
    big = 8**50 - 12345
    assert code_from_table(code_table(big, 8, 3), 8) == big


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("code", range(16))
def test_same_trajectories_as_the_elementary_rule(code, boundary):
    rule = ECA_OF_CODE[code]  # reference-values.md (computed)
    rng = np.random.default_rng(code)
    for width in (1, 2, 5, 21):
        initial = rng.integers(0, 2, size=(130, width), dtype=np.uint8)
        ours, theirs = TotalisticCA(code, 2, 1, width, boundary), ElementaryCA(rule, width, boundary)
        assert np.array_equal(ours.step(initial), theirs.step(initial)), (code, width)
        watch = np.arange(width)
        assert np.array_equal(ours.evolve(initial, 12, watch=watch), theirs.evolve(initial, 12, watch=watch))


@pytest.mark.parametrize("code", range(16))
def test_same_tallies_as_the_elementary_rule(code):
    layout = Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8")
    ours = tally(TotalisticCA(code, width=21), layout)
    theirs = tally(ElementaryCA(ECA_OF_CODE[code], width=21), layout)  # reference-values.md (computed)
    assert ours == theirs
    assert ours.contexts == 4096


def test_tallies_are_not_all_trivial():
    # The comparison above would pass for two media that both found nothing: codes 4 and 13 find codes.
    layout = Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8")
    assert tally(TotalisticCA(4), layout).code_instances > 0
    assert tally(TotalisticCA(13), layout).code_instances > 0


def test_three_state_sum_mod_3_by_hand():
    # f(s) = s mod 3 for k = 3, r = 1: code = 1*3 + 2*9 + 0*27 + 1*81 + 2*243 + 0*729 = 588. From a
    # single 1, row t is the coefficients of (1 + x + x^2)^t mod 3 (computed by polynomial products).
    assert code_from_table([s % 3 for s in range(7)], 3) == 588
    width, steps = 31, 12
    start = np.zeros((1, width), dtype=np.uint8)
    start[0, width // 2] = 1
    history = TotalisticCA(588, states=3, radius=1, width=width).evolve(start, steps, watch=np.arange(width))[0]
    poly = np.array([1])
    for t in range(steps + 1):
        expected = np.zeros(width, dtype=np.int64)
        expected[width // 2 - t : width // 2 + t + 1] = poly % 3
        assert history[t].tolist() == expected.tolist(), t
        poly = np.convolve(poly, [1, 1, 1])
    assert history[2, width // 2 - 2 : width // 2 + 3].tolist() == [1, 2, 0, 2, 1]  # 1 2 3 2 1 mod 3


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("radius", [1, 2, 3])
def test_two_state_codes_match_the_rule_table_medium(radius, boundary):
    # A two-state totalistic code is the rule table whose bit n is f(popcount(n)); e.g. parity of the
    # 2r+1 cells is f(s) = s mod 2, the code with every odd digit set.
    parity = code_from_table([s % 2 for s in range(2 * radius + 2)], 2)
    assert binary_rule_number(parity, radius) == rule_from_function(lambda cells: sum(cells) % 2, radius)
    rng = np.random.default_rng(radius)
    initial = rng.integers(0, 2, size=(100, 11), dtype=np.uint8)
    for code in (parity, *(random_code(rng, 2, radius) for _ in range(5))):
        ours = TotalisticCA(code, 2, radius, 11, boundary)
        theirs = RuleTableCA(binary_rule_number(code, radius), radius, 11, boundary)
        assert np.array_equal(ours.evolve(initial, 9, watch=range(11)), theirs.evolve(initial, 9, watch=range(11)))


# --------------------------------------------------------------------------------------
# Fast evolve against its slow twin (evolve_by_steps over the NumPy step)
# --------------------------------------------------------------------------------------


def _compare(ca, batch, steps, rng, *, clamp, watch_from):
    width, k = ca.n_sites, ca.n_states
    initial = rng.integers(0, k, size=(batch, width), dtype=np.uint8)
    watch = rng.permutation(width)[: max(1, width - 1)]
    kwargs = {"watch": watch, "watch_from": watch_from}
    if clamp:
        sites = np.sort(rng.choice(width, size=max(1, width // 3), replace=False))
        kwargs["clamp_sites"] = sites
        kwargs["clamp_values"] = rng.integers(0, k, size=(batch, sites.size), dtype=np.uint8)
    fast = ca.evolve(initial, steps, **kwargs)
    slow = evolve_by_steps(ca, initial, steps, **kwargs)
    assert fast.dtype == np.uint8
    assert fast.shape == slow.shape == (batch, steps - watch_from + 1, watch.size)
    assert np.array_equal(fast, slow), (ca, batch, clamp, watch_from)
    if clamp:  # clamped, watched sites hold their values at every time t >= 1
        first = max(1, watch_from) - watch_from
        for column, site in enumerate(watch):
            where = np.flatnonzero(kwargs["clamp_sites"] == site)
            if where.size:
                assert (fast[:, first:, column] == kwargs["clamp_values"][:, where[0], None]).all()


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("radius", [1, 2, 3])
@pytest.mark.parametrize("states", [2, 3, 4])
def test_evolve_matches_step_loop(states, radius, boundary):
    rng = np.random.default_rng(100 * states + 10 * radius + (boundary == "fixed"))
    space = code_space(states, radius)
    codes = [0, space - 1, *(random_code(rng, states, radius) for _ in range(10))]
    for index, code in enumerate(codes):
        width = (1, 2, 3, 4, 7, 8, 13)[index % 7]
        batch = (1, 5, 64, 70, 129)[index % 5]
        ca = TotalisticCA(code, states, radius, width, boundary)
        _compare(ca, batch, 8, rng, clamp=False, watch_from=0)
        _compare(ca, batch, 8, rng, clamp=True, watch_from=3)
        _compare(ca, batch, 5, rng, clamp=True, watch_from=5)


def test_evolve_matches_step_loop_for_eight_states():
    rng = np.random.default_rng(8)
    for radius in (1, 3):
        ca = TotalisticCA(random_code(rng, 8, radius), 8, radius, 9, "fixed")
        _compare(ca, 33, 7, rng, clamp=True, watch_from=2)


def test_zero_steps_and_untouched_input():
    ca = TotalisticCA(1635, states=3, width=6)
    initial = np.random.default_rng(7).integers(0, 3, size=(65, 6), dtype=np.uint8)
    before = initial.copy()
    out = ca.evolve(initial, 0, watch=[5, 0, 2])
    assert out.shape == (65, 1, 3) and np.array_equal(out[:, 0], initial[:, [5, 0, 2]])
    ca.evolve(initial, 4, watch=np.arange(6))
    assert np.array_equal(initial, before)


def test_reach_by_hand_and_tight_for_an_additive_code():
    assert np.flatnonzero(TotalisticCA(0, 2, 2, 9, "fixed").reach([0], 1)).tolist() == [0, 1, 2]
    assert np.flatnonzero(TotalisticCA(0, 2, 2, 9, "periodic").reach([0], 1)).tolist() == [0, 1, 2, 7, 8]
    assert np.flatnonzero(TotalisticCA(0, 3, 3, 15, "fixed").reach([7], 2)).tolist() == list(range(1, 14))
    # Sum mod 3 is additive: a flip by +1 spreads as (1 + x + ... + x^2r)^t mod 3, whose end terms
    # are 1, so it changes the cells at distance exactly r * t (computed) and none beyond.
    for radius in (1, 2):
        code = code_from_table([s % 3 for s in range(table_length(3, radius))], 3)
        for boundary in BOUNDARIES:
            ca = TotalisticCA(code, 3, radius, 13, boundary)
            states = np.random.default_rng(radius).integers(0, 3, size=(8, 13), dtype=np.uint8)
            for steps in range(4):
                flipped = states.copy()
                flipped[:, 6] = (flipped[:, 6] + 1) % 3
                a = ca.evolve(states, steps, watch=np.arange(13), watch_from=steps)[:, 0]
                b = ca.evolve(flipped, steps, watch=np.arange(13), watch_from=steps)[:, 0]
                changed, mask = (a != b).any(axis=0), ca.reach([6], steps)
                assert not (changed & ~mask).any(), (radius, boundary, steps)
                assert changed[6 - radius * steps] and changed[6 + radius * steps], (radius, boundary, steps)


# --------------------------------------------------------------------------------------
# Bad input: one line naming the field, the value and what is allowed
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(("kwargs", "message"), [
    ({"code": 16}, "code must be an integer 0..15 for states=2, radius=1, got 16"),
    ({"code": 2187, "states": 3}, "code must be an integer 0..2186 for states=3, radius=1, got 2187"),
    ({"code": 64, "radius": 2}, "code must be an integer 0..63 for states=2, radius=2, got 64"),
    ({"code": 8**50, "states": 8, "radius": 3}, "code must be an integer 0..8^50-1 for states=8, radius=3, got "),
    ({"code": -1}, "code must be an integer 0..15 for states=2, radius=1, got -1"),
    ({"code": 1.0}, "got 1.0"),
    ({"code": True}, "got True"),
    ({"code": "ten"}, "got 'ten'"),
    ({"code": "\u00b2"}, "got '\u00b2'"),  # a superscript two: str.isdigit() is true, int() refuses it
    ({"code": 0, "states": 1}, "states must be an integer 2..8, got 1"),
    ({"code": 0, "states": 9}, "states must be an integer 2..8, got 9"),
    ({"code": 0, "radius": 0}, "radius must be an integer 1..3, got 0"),
    ({"code": 0, "radius": 4}, "radius must be an integer 1..3, got 4"),
    ({"code": 0, "width": 0}, "width must be an integer >= 1, got 0"),
    ({"code": 0, "boundary": "open"}, "boundary must be one of periodic, fixed, got 'open'"),
])
def test_bad_input_is_refused_in_one_line(kwargs, message):
    with pytest.raises(MediumInputError, match=re.escape(message)) as caught:
        TotalisticCA(**kwargs)
    assert "\n" not in str(caught.value)


def test_large_codes_and_digit_strings_are_accepted():
    assert TotalisticCA(8**50 - 1, states=8, radius=3).code == 8**50 - 1
    assert TotalisticCA("10").code == 10  # TOML cannot hold codes past int64; a digit string can
    assert TotalisticCA(np.int64(15)).describe() == {"code": 15, "states": 2, "radius": 1, "width": 21,
                                                     "boundary": "periodic"}


def test_states_outside_the_alphabet_are_refused():
    ca = TotalisticCA(1635, states=3, width=5)
    bad = np.array([[0, 1, 3, 0, 0]], dtype=np.uint8)
    with pytest.raises(MediumInputError, match="initial states must lie in 0..2, got 3"):
        ca.evolve(bad, 2, watch=[0])
    with pytest.raises(MediumInputError, match="states must lie in 0..2, got 3"):
        ca.step(bad)


# --------------------------------------------------------------------------------------
# Conformance suite
# --------------------------------------------------------------------------------------

CONFORMANCE_MEDIA = [
    TotalisticCA(10, 2, 1, 21),
    TotalisticCA(4, 2, 1, 1, "fixed"),
    TotalisticCA(1635, 3, 1, 9, "fixed"),
    TotalisticCA(123456, 3, 2, 5),
    TotalisticCA(777777, 4, 1, 7),
    TotalisticCA(4**22 - 98765, 4, 3, 4, "fixed"),
    TotalisticCA(4**22 // 3, 4, 3, 12),
    TotalisticCA(3**20, 8, 2, 6),
]


@parametrize_with_checks(CONFORMANCE_MEDIA)
def test_conforms(medium, check):
    check(medium)


# --------------------------------------------------------------------------------------
# Registry and family
# --------------------------------------------------------------------------------------


def test_registered_and_builds():
    family = registry.family("totalistic")
    assert isinstance(family, TotalisticFamily) and family.axis_key == "code"
    medium = registry.build("totalistic", code=1635, states=3, width=9)
    assert isinstance(medium, TotalisticCA) and medium.n_states == 3 and medium.n_sites == 9
    assert registry.build("totalistic", **medium.describe()).describe() == medium.describe()
    with pytest.raises(MediumInputError, match="missing parameter 'code'"):
        registry.build("totalistic", states=3)
    with pytest.raises(MediumInputError, match=r"unknown key 'state'; did you mean 'states'\?"):
        registry.build("totalistic", code=3, state=3)


def test_expand_all_lists_and_ranges():
    family = TotalisticFamily()
    shared = {"states": 2, "radius": 1, "width": 21, "boundary": "periodic"}
    assert family.expand({}, seed=0) == [{"code": code, **shared} for code in range(16)]
    assert len(family.expand({"codes": "all", "radius": 2}, seed=0)) == 64  # reference-values.md: 64 codes
    assert [p["code"] for p in family.expand({"codes": "all", "states": 3}, seed=0)] == list(range(2187))
    assert [p["code"] for p in family.expand({"codes": "0-3, 10,2", "width": 9}, seed=0)] == [0, 1, 2, 3, 10]
    assert family.expand({"codes": [12, 3, 12], "boundary": "fixed"}, seed=0) == [
        {"code": 12, **shared, "boundary": "fixed"}, {"code": 3, **shared, "boundary": "fixed"}]
    assert [p["code"] for p in family.expand({"codes": 7}, seed=0)] == [7]
    big = str(8**50 - 1)
    assert [p["code"] for p in family.expand({"codes": [big], "states": 8, "radius": 3}, seed=0)] == [8**50 - 1]
    for params in family.expand({"codes": "1630-1635", "states": 3, "width": 7}, seed=0):
        assert registry.build("totalistic", **params).describe() == params


def test_expand_refuses_what_it_cannot_do():
    family = TotalisticFamily()
    with pytest.raises(MediumInputError, match=r"177147 codes is more than the 65536 .*sample"):
        family.expand({"codes": "all", "states": 3, "radius": 2}, seed=0)
    with pytest.raises(MediumInputError, match=r"16 is not one of the codes 0..15"):
        family.expand({"codes": "10-16"}, seed=0)
    with pytest.raises(MediumInputError, match="range '9-3' runs backwards"):
        family.expand({"codes": "9-3"}, seed=0)
    with pytest.raises(MediumInputError, match="cannot read 'x'"):
        family.expand({"codes": "1,x"}, seed=0)
    with pytest.raises(MediumInputError, match="either codes or sample"):
        family.expand({"codes": "all", "sample": 3}, seed=0)
    with pytest.raises(MediumInputError, match=r"sample must be a count 1..16 \(there are only 16 codes\), got 17"):
        family.expand({"sample": 17}, seed=0)
    with pytest.raises(MediumInputError, match="states must be an integer 2..8, got 10"):
        family.expand({"states": 10}, seed=0)
    with pytest.raises(MediumInputError, match="width must be an integer >= 1, got 0"):
        family.expand({"width": 0}, seed=0)
    with pytest.raises(MediumInputError, match=r"unknown key 'code'; did you mean 'codes'\?"):
        family.expand({"code": 3}, seed=0)


@pytest.mark.parametrize(("states", "radius"), [(2, 1), (3, 2), (4, 3), (8, 3)])
def test_expand_sample(states, radius):
    family = TotalisticFamily()
    space = code_space(states, radius)
    table = {"sample": 12, "states": states, "radius": radius}
    first = [p["code"] for p in family.expand(table, seed=5)]
    assert first == [p["code"] for p in family.expand(table, seed=5)]  # reproducible
    assert len(set(first)) == 12 and first == sorted(first)  # distinct, in order
    assert all(0 <= code < space for code in first)
    assert first != [p["code"] for p in family.expand(table, seed=6)]  # another seed, another sample
    assert min(first) < space // 2 < max(first)  # drawn from the whole space, not one end of it


def test_sample_follows_the_project_seed_convention():
    # The documented generator is SeedSequence([seed, crc32(b"codes")]), the same as probe.seeding.rng_for.
    codes = [p["code"] for p in TotalisticFamily().expand({"sample": 50, "states": 3}, seed=9)]
    assert codes == sorted(int(c) for c in rng_for(9, "codes").choice(2187, size=50, replace=False))
    whole = [p["code"] for p in TotalisticFamily().expand({"sample": 16}, seed=1)]
    assert whole == list(range(16))  # a sample of the whole space is the whole space
