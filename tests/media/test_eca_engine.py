"""The elementary CA engine: published single-seed patterns, fast path against slow path,
boundaries and the light cone.

Reference values come from /work/shared/reference-values.md; each assertion names its
source (an OEIS id, or "computed" where that file says so).
"""

import numpy as np
import pytest

from media.eca import BOUNDARIES, ElementaryCA
from media.interface import evolve_by_steps

# --------------------------------------------------------------------------------------
# Single 1 on a zero background
# --------------------------------------------------------------------------------------

A051023_RULE30_CENTRE = "1101110011000101100100111010111001110101"  # OEIS A051023, first 40 terms
A110240_RULE30_ROWS = [1, 7, 25, 111, 401, 1783, 6409, 28479, 102849, 456263, 1641433, 7287855]  # OEIS A110240
A070952_RULE30_ON = [1, 3, 3, 6, 4, 9, 5, 12, 7, 12, 11, 14, 12, 19, 13, 22, 15, 19, 20, 24]  # OEIS A070952
RULE90_ROWS = [1, 5, 17, 85, 257, 1285, 4369, 21845, 65537, 327685]  # computed (reference-values.md)

STEPS = 40
WIDTH = 2 * STEPS + 3  # wide enough that the pattern never meets itself round the ring
CENTRE = WIDTH // 2


def _single_seed():
    start = np.zeros((1, WIDTH), dtype=np.uint8)
    start[0, CENTRE] = 1
    return start


def _history_fast(rule, boundary):
    """Space-time diagram (STEPS + 1, WIDTH) through the bit-sliced ``evolve``."""
    ca = ElementaryCA(rule, WIDTH, boundary)
    return ca.evolve(_single_seed(), STEPS, watch=np.arange(WIDTH))[0]


def _history_slow(rule, boundary):
    """Space-time diagram (STEPS + 1, WIDTH) through a plain loop over the numpy ``step``."""
    ca = ElementaryCA(rule, WIDTH, boundary)
    rows = [_single_seed()]
    for _ in range(STEPS):
        rows.append(ca.step(rows[-1]))
    return np.concatenate(rows, axis=0)


HISTORIES = {"evolve": _history_fast, "step": _history_slow}


def _row_as_number(history, t):
    """Row ``t`` read as a binary number over its live part, sites centre-t .. centre+t."""
    return int("".join(str(int(bit)) for bit in history[t, CENTRE - t : CENTRE + t + 1]), 2)


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("path", sorted(HISTORIES))
def test_rule30_centre_column(path, boundary):
    history = HISTORIES[path](30, boundary)
    centre = "".join(str(int(bit)) for bit in history[:40, CENTRE])
    assert centre == A051023_RULE30_CENTRE  # OEIS A051023


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("path", sorted(HISTORIES))
def test_rule30_rows_as_binary_numbers(path, boundary):
    history = HISTORIES[path](30, boundary)
    rows = [_row_as_number(history, t) for t in range(len(A110240_RULE30_ROWS))]
    assert rows == A110240_RULE30_ROWS  # OEIS A110240


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("path", sorted(HISTORIES))
def test_rule30_on_cells_per_row(path, boundary):
    history = HISTORIES[path](30, boundary)
    on_cells = history[: len(A070952_RULE30_ON)].sum(axis=1).tolist()
    assert on_cells == A070952_RULE30_ON  # OEIS A070952


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("path", sorted(HISTORIES))
def test_rule90_rows_as_binary_numbers(path, boundary):
    history = HISTORIES[path](90, boundary)
    rows = [_row_as_number(history, t) for t in range(len(RULE90_ROWS))]
    assert rows == RULE90_ROWS  # computed (reference-values.md; not OEIS A001317, which is rule 60)


@pytest.mark.parametrize("path", sorted(HISTORIES))
def test_single_seed_stays_inside_its_light_cone(path):
    # Outside |i - centre| <= t everything is still zero: the window read above is the whole row.
    history = HISTORIES[path](30, "periodic")
    distance = np.abs(np.arange(WIDTH) - CENTRE)
    for t in range(STEPS + 1):
        assert not history[t, distance > t].any(), t


# --------------------------------------------------------------------------------------
# Rule numbering through the medium itself
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize("rule", [30, 90, 110, 1, 184, 255])
def test_centre_cell_follows_bit_4l_2c_r(rule):
    # Wolfram 1983: the new centre of (l, c, r) is bit 4l + 2c + r of the rule number. A width-3
    # row with a fixed zero boundary shows each neighbourhood to the middle cell exactly.
    ca = ElementaryCA(rule, 3, "fixed")
    states = np.array([[l, c, r] for l in (0, 1) for c in (0, 1) for r in (0, 1)], dtype=np.uint8)
    expected = [(rule >> (4 * l + 2 * c + r)) & 1 for l, c, r in states.tolist()]
    assert ca.step(states)[:, 1].tolist() == expected
    assert ca.evolve(states, 1, watch=[1], watch_from=1)[:, 0, 0].tolist() == expected


# --------------------------------------------------------------------------------------
# Fast path (bit-sliced evolve) against its slow twin (evolve_by_steps over step)
# --------------------------------------------------------------------------------------

WIDTHS = (1, 2, 3, 4, 7, 16)
BATCHES = (1, 63, 64, 65, 130)


def _compare(rule, boundary, width, batch, steps, rng, *, clamp, watch_from):
    ca = ElementaryCA(rule, width, boundary)
    initial = rng.integers(0, 2, size=(batch, width), dtype=np.uint8)
    watch = rng.permutation(width)[: max(1, width - 1)] if width > 1 else np.array([0])
    kwargs = {"watch": watch, "watch_from": watch_from}
    if clamp:
        sites = np.sort(rng.choice(width, size=max(1, width // 3), replace=False))
        kwargs["clamp_sites"] = sites
        kwargs["clamp_values"] = rng.integers(0, 2, size=(batch, sites.size), dtype=np.uint8)
    fast = ca.evolve(initial, steps, **kwargs)
    slow = evolve_by_steps(ca, initial, steps, **kwargs)
    assert fast.dtype == np.uint8
    assert fast.shape == slow.shape == (batch, steps - watch_from + 1, watch.size)
    assert np.array_equal(fast, slow), (
        f"rule {rule}, {boundary}, width {width}, batch {batch}, clamp {clamp}, watch_from {watch_from}")
    if clamp:  # clamped, watched sites hold their clamp value at every time t >= 1
        first = max(1, watch_from) - watch_from  # output index of the first time t >= 1
        for column, site in enumerate(watch):
            where = np.flatnonzero(kwargs["clamp_sites"] == site)
            if where.size:
                value = kwargs["clamp_values"][:, where[0]]
                assert (fast[:, first:, column] == value[:, None]).all()


@pytest.mark.parametrize("rule", range(256))
def test_evolve_matches_step_loop_on_every_rule(rule):
    rng = np.random.default_rng(rule)
    for boundary in BOUNDARIES:
        for index, width in enumerate(WIDTHS):
            batch = BATCHES[(rule + index) % len(BATCHES)]  # every batch size meets every width over the rules
            _compare(rule, boundary, width, batch, 7, rng, clamp=False, watch_from=0)
            _compare(rule, boundary, width, batch, 7, rng, clamp=True, watch_from=3)


@pytest.mark.parametrize("rule", [0, 1, 30, 90, 110, 127, 150, 255])
def test_evolve_matches_step_loop_on_every_batch_size(rule):
    # Odd rules turn all-zero padding runs on; those must never leak into real runs.
    rng = np.random.default_rng(1000 + rule)
    for boundary in BOUNDARIES:
        for width in (1, 2, 3, 9):
            for batch in BATCHES:
                for clamp in (False, True):
                    for watch_from in (0, 1, 5):
                        _compare(rule, boundary, width, batch, 5, rng, clamp=clamp, watch_from=watch_from)


def test_evolve_with_zero_steps_returns_the_initial_watch():
    ca = ElementaryCA(30, 6)
    initial = np.random.default_rng(7).integers(0, 2, size=(65, 6), dtype=np.uint8)
    out = ca.evolve(initial, 0, watch=[5, 0, 2])
    assert out.shape == (65, 1, 3)
    assert np.array_equal(out[:, 0, :], initial[:, [5, 0, 2]])


def test_evolve_leaves_its_input_alone():
    ca = ElementaryCA(110, 9)
    initial = np.random.default_rng(8).integers(0, 2, size=(70, 9), dtype=np.uint8)
    before = initial.copy()
    ca.evolve(initial, 4, watch=np.arange(9))
    assert np.array_equal(initial, before)


# --------------------------------------------------------------------------------------
# Boundaries, hand-checked
# --------------------------------------------------------------------------------------

# Each case: rule, boundary, one row, the next row worked out by hand from the rule's bits.
HAND_CASES = [
    # rule 240: new = left neighbour (a right shift).
    (240, "fixed", [1, 0, 1, 1], [0, 1, 0, 1]),  # a zero enters on the left, the last 1 falls off
    (240, "periodic", [1, 0, 1, 1], [1, 1, 0, 1]),  # the last 1 wraps to the front
    (240, "fixed", [1, 0, 0, 0], [0, 1, 0, 0]),  # zero, not a mirror image of site 0, beyond the end
    # rule 170: new = right neighbour (a left shift).
    (170, "fixed", [1, 0, 1, 1], [0, 1, 1, 0]),
    (170, "periodic", [1, 0, 1, 1], [0, 1, 1, 1]),
    # rule 1: new = 1 only for neighbourhood 000.
    (1, "fixed", [1, 0, 0], [0, 0, 1]),  # site 2 sees (0, 0, beyond = 0) -> 1
    (1, "periodic", [1, 0, 0], [0, 0, 0]),  # site 2 sees (0, 0, site 0 = 1) -> 0
    (1, "fixed", [0, 0, 0], [1, 1, 1]),
    # width 1: fixed sees (0, c, 0), periodic sees (c, c, c).
    (4, "fixed", [1], [1]),  # 010 is bit 2 of rule 4: on
    (4, "periodic", [1], [0]),  # 111 is bit 7 of rule 4: off
    (128, "fixed", [1], [0]),
    (128, "periodic", [1], [1]),
    # width 2 on a ring: both neighbours of a cell are the other cell.
    (2, "periodic", [0, 1], [0, 0]),  # site 0 sees (1, 0, 1) = 5 -> off; site 1 sees (0, 1, 0) = 2 -> off
    (2, "fixed", [0, 1], [1, 0]),  # site 0 sees (0, 0, 1) = 1 -> on; site 1 sees (0, 1, 0) -> off
    (32, "periodic", [0, 1], [1, 0]),  # site 0 sees 101 = bit 5 -> on
    (32, "fixed", [0, 1], [0, 0]),
]


@pytest.mark.parametrize(("rule", "boundary", "row", "expected"), HAND_CASES)
def test_boundary_by_hand(rule, boundary, row, expected):
    ca = ElementaryCA(rule, len(row), boundary)
    states = np.array([row], dtype=np.uint8)
    assert ca.step(states).tolist() == [expected]
    assert ca.evolve(states, 1, watch=np.arange(len(row)), watch_from=1)[0, 0].tolist() == expected


def test_periodic_and_fixed_differ_only_at_the_ends():
    rng = np.random.default_rng(11)
    states = rng.integers(0, 2, size=(200, 12), dtype=np.uint8)
    for rule in (30, 110, 1, 254):
        ring = ElementaryCA(rule, 12, "periodic").step(states)
        row = ElementaryCA(rule, 12, "fixed").step(states)
        assert np.array_equal(ring[:, 1:-1], row[:, 1:-1])
        assert not np.array_equal(ring, row)  # 200 random rows always include a difference at an end


# --------------------------------------------------------------------------------------
# reach(): the light cone
# --------------------------------------------------------------------------------------


def test_reach_by_hand():
    assert np.flatnonzero(ElementaryCA(30, 9, "periodic").reach([0], 2)).tolist() == [0, 1, 2, 7, 8]
    assert np.flatnonzero(ElementaryCA(30, 9, "fixed").reach([0], 2)).tolist() == [0, 1, 2]
    assert np.flatnonzero(ElementaryCA(30, 9, "fixed").reach([4], 0)).tolist() == [4]
    assert np.flatnonzero(ElementaryCA(30, 9, "fixed").reach([1, 7], 1)).tolist() == [0, 1, 2, 6, 7, 8]
    assert ElementaryCA(30, 9, "periodic").reach([3], 4).all()
    assert np.flatnonzero(ElementaryCA(30, 9, "fixed").reach([3], 4)).tolist() == [0, 1, 2, 3, 4, 5, 6, 7]


def _influence(rule, boundary, width, site, steps, states):
    """Sites whose state at ``steps`` changes, in some row of ``states``, when ``site`` is flipped."""
    ca = ElementaryCA(rule, width, boundary)
    flipped = states.copy()
    flipped[:, site] ^= 1
    a = ca.evolve(states, steps, watch=np.arange(width), watch_from=steps)[:, 0, :]
    b = ca.evolve(flipped, steps, watch=np.arange(width), watch_from=steps)[:, 0, :]
    return (a != b).any(axis=0)


@pytest.mark.parametrize("boundary", BOUNDARIES)
@pytest.mark.parametrize("width", [1, 2, 5, 11])
def test_reach_is_sound_and_tight(boundary, width):
    # Sound: no rule lets a flip travel further than reach says. Tight: rule 30 and its mirror
    # image 86 (one-sided permutive, chaotic) carry a flip to every site reach names.
    states = np.random.default_rng(width).integers(0, 2, size=(128, width), dtype=np.uint8)
    for steps in range(0, width + 2):
        for site in range(width):
            mask = ElementaryCA(0, width, boundary).reach([site], steps)
            assert mask.shape == (width,) and mask.dtype == bool
            seen = np.zeros(width, dtype=bool)
            for rule in (30, 86, 90, 110, 150, 45):
                changed = _influence(rule, boundary, width, site, steps, states)
                assert not (changed & ~mask).any(), (rule, site, steps)
                seen |= changed
            assert np.array_equal(seen, mask), (site, steps, seen, mask)
