"""The BooleanNetwork medium: bit-sliced kernels against their slow twins, hand-checked steps,
the conformance suite, random N-K networks and the ``rbn`` family.

Slow twins (DEVELOPERS.md, "Kernels and their twins"): ``media.interface.evolve_by_steps``
loops the NumPy ``step``; ``media.interface.settle_by_steps`` is Floyd's cycle finding over it.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from media.boolnet import BooleanNetwork, RandomNetworkFamily, network_seed, random_network
from media.conformance import parametrize_with_checks
from media.errors import MediumInputError
from media.interface import evolve_by_steps, settle_by_steps

ROOT = Path(__file__).resolve().parents[3]
TIDEPOOL = ROOT / "configs" / "networks" / "tidepool-alga.toml"
BATCHES = (1, 63, 64, 65, 200)


def kauffman():
    # Kauffman 1969 (J. Theor. Biol. 22:437): A = B and C, B = A or C, C = A or B.
    return BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"})


def random_states(rng, batch, n):
    return rng.integers(0, 2, size=(batch, n), dtype=np.uint8)


def kernel_cases():
    """(N, K, seed) over N 1..40 and K 0..5 (K <= N)."""
    cases = []
    for n in (1, 2, 3, 5, 8, 13, 21, 33, 40):
        for k in range(0, min(5, n) + 1):
            cases.append((n, k, 1000 * n + k))
    return cases


# --------------------------------------------------------------------------- evolve and its twin

@pytest.mark.parametrize(("n", "k", "seed"), kernel_cases())
def test_evolve_matches_evolve_by_steps(n, k, seed):
    net = random_network(n, k, 0.5, seed)
    rng = np.random.default_rng(seed)
    steps = 7
    for batch in BATCHES:
        initial = random_states(rng, batch, n)
        watch = np.arange(n)
        fast = net.evolve(initial, steps, watch=watch)
        slow = evolve_by_steps(net, initial, steps, watch=watch)
        assert fast.shape == (batch, steps + 1, n)
        np.testing.assert_array_equal(fast, slow)
        # A shuffled watch subset, a late watch_from, and clamps on a random subset.
        watch = rng.permutation(n)[: max(1, n // 2)]
        clamp = np.sort(rng.choice(n, size=rng.integers(0, n + 1), replace=False))
        values = random_states(rng, batch, clamp.size)
        start = initial.copy()
        start[:, clamp] = values
        for watch_from in (0, 3, steps):
            fast = net.evolve(start, steps, watch=watch, watch_from=watch_from, clamp_sites=clamp,
                              clamp_values=values)
            slow = evolve_by_steps(net, start, steps, watch=watch, watch_from=watch_from, clamp_sites=clamp,
                                   clamp_values=values)
            assert fast.shape == (batch, steps - watch_from + 1, watch.size)
            np.testing.assert_array_equal(fast, slow, err_msg=f"batch {batch}, watch_from {watch_from}")


def test_evolve_with_zero_steps_returns_the_start():
    net = random_network(9, 3, 0.5, 4)
    initial = random_states(np.random.default_rng(0), 65, 9)
    out = net.evolve(initial, 0, watch=[8, 0])
    np.testing.assert_array_equal(out[:, 0, :], initial[:, [8, 0]])


def test_evolve_many_words_and_wide_tables():
    # More than one block of 64 words (4200 runs = 66 words) and a node with 8 inputs.
    n = 12
    net = random_network(n, 8, 0.5, 11)
    initial = random_states(np.random.default_rng(1), 4200, n)
    np.testing.assert_array_equal(net.evolve(initial, 3, watch=np.arange(n)),
                                  evolve_by_steps(net, initial, 3, watch=np.arange(n)))


# --------------------------------------------------------------------------- settle and its twin

def assert_settle_agrees(net, initial, watch, max_steps, clamp=None, values=None):
    fast_pattern, fast_constant = net.settle(initial, watch=watch, max_steps=max_steps, clamp_sites=clamp,
                                             clamp_values=values)
    slow_pattern, slow_constant = settle_by_steps(net, initial, watch=watch, max_steps=max_steps,
                                                  clamp_sites=clamp, clamp_values=values)
    assert fast_constant.dtype == bool and fast_constant.shape == (initial.shape[0],)
    np.testing.assert_array_equal(fast_constant, slow_constant)
    np.testing.assert_array_equal(fast_pattern[slow_constant], slow_pattern[slow_constant])
    return fast_pattern, fast_constant


@pytest.mark.parametrize(("n", "k", "seed"), [case for case in kernel_cases() if case[1] >= 1])
def test_settle_matches_settle_by_steps(n, k, seed):
    net = random_network(n, k, 0.5, seed)
    rng = np.random.default_rng(seed + 1)
    # Chaotic large-K networks have cycles far longer than any bound we can afford in the slow
    # twin; a smaller bound keeps them quick (their runs then read as not constant in both).
    max_steps = 256 if n * k <= 64 else 48
    for batch in (1, 65, 200):
        initial = random_states(rng, batch, n)
        watch = rng.permutation(n)[: rng.integers(1, min(n, 4) + 1)]
        assert_settle_agrees(net, initial, watch, max_steps)
        clamp = np.sort(rng.choice(n, size=rng.integers(1, n + 1), replace=False))
        values = random_states(rng, batch, clamp.size)
        start = initial.copy()
        start[:, clamp] = values
        assert_settle_agrees(net, start, watch, max_steps, clamp, values)
        # A bound too small to find most attractors: both must say "not constant" alike.
        assert_settle_agrees(net, initial, watch, 2)


def test_settle_hand_made_cycle_and_fixed_point():
    # A = not A is a 2-cycle; B = B or A goes on once A is on and stays on (a fixed point in B).
    net = BooleanNetwork.from_expressions({"A": "not A", "B": "B or A"})
    initial = np.array([[0, 0], [1, 0], [0, 1], [1, 1]], dtype=np.uint8)
    # Readout A: varies around every attractor -> never constant.
    _, constant = assert_settle_agrees(net, initial, [0], 64)
    assert constant.tolist() == [False] * 4
    # Readout B: on the attractor B = 1 always -> constant, pattern 1.
    pattern, constant = assert_settle_agrees(net, initial, [1], 64)
    assert constant.tolist() == [True] * 4
    assert pattern[:, 0].tolist() == [1, 1, 1, 1]
    # Both: varies.
    _, constant = assert_settle_agrees(net, initial, [1, 0], 64)
    assert constant.tolist() == [False] * 4
    # Clamping A at 0 removes the cycle. Clamps act after every update, not at t = 0, so a start
    # with A = 1 still turns B on at t = 1; from A = 0, B keeps its start value.
    pattern, constant = assert_settle_agrees(net, initial, [1, 0], 64, clamp=[0],
                                             values=np.zeros((4, 1), dtype=np.uint8))
    assert constant.tolist() == [True] * 4
    assert pattern.tolist() == [[0, 0], [1, 0], [1, 0], [1, 0]]


def test_settle_mixed_batch_of_cycles_and_fixed_points():
    # Kauffman's network: 000 and 111 are fixed points, 001 <-> 010 a two-cycle (A, B, C order).
    # Readout C is constant on the fixed points and varies on the cycle (C = 1, 0, 1, ...).
    net = kauffman()
    states = np.array([[a, b, c] for c in (0, 1) for b in (0, 1) for a in (0, 1)] * 20, dtype=np.uint8)
    pattern, constant = assert_settle_agrees(net, states, [2], 64)
    # Basins (test_attractors.py): state numbers 0 -> 000; 2, 4 -> the cycle; the rest -> 111.
    numbers = states.astype(int) @ np.array([1, 2, 4])
    on_cycle = np.isin(numbers, [2, 4])
    assert constant.tolist() == (~on_cycle).tolist()
    assert pattern[~on_cycle, 0].tolist() == np.where(numbers[~on_cycle] == 0, 0, 1).tolist()


def test_settle_needs_enough_steps():
    # A chain that turns on one node per step reaches its fixed point (all on) only at t = 10:
    # with max_steps = 3 the attractor is not reached, so the readout is not called constant.
    expressions = {"n0": "1", **{f"n{i}": f"n{i - 1}" for i in range(1, 11)}}
    net = BooleanNetwork.from_expressions(expressions)
    initial = np.zeros((3, 11), dtype=np.uint8)
    _, constant = assert_settle_agrees(net, initial, [10], 3)
    assert constant.tolist() == [False] * 3
    pattern, constant = assert_settle_agrees(net, initial, [10], 64)
    assert constant.tolist() == [True] * 3 and pattern[:, 0].tolist() == [1, 1, 1]


# --------------------------------------------------------------------------- step by hand

def test_step_of_a_truth_table_network_by_hand():
    # Tables list outputs for input rows 00, 01, 10, 11 with the FIRST input most significant.
    net = BooleanNetwork.from_nodes([
        {"name": "A", "inputs": ["B", "C"], "table": "0001"},  # B and C
        {"name": "B", "inputs": ["A"], "table": "10"},         # not A
        {"name": "C", "inputs": [], "table": "1"},             # always on
        {"name": "D", "inputs": ["C", "A"], "table": "0100"},  # row 01 = (C=0, A=1): C off and A on
    ])
    # (A, B, C, D) -> next, worked by hand.
    hand = {
        (0, 0, 0, 0): (0, 1, 1, 0),
        (1, 0, 0, 0): (0, 0, 1, 1),  # D: C=0, A=1 -> row 01 -> 1
        (0, 1, 1, 1): (1, 1, 1, 0),  # A: B=1, C=1; D: C=1, A=0 -> row 10 -> 0
        (1, 1, 1, 0): (1, 0, 1, 0),  # D: row 11 -> 0
        (1, 1, 0, 1): (0, 0, 1, 1),
        (0, 0, 1, 1): (0, 1, 1, 0),
    }
    states = np.array(list(hand), dtype=np.uint8)
    before = states.copy()
    assert net.step(states).tolist() == [list(v) for v in hand.values()]
    np.testing.assert_array_equal(states, before)  # input untouched
    assert net.evolve(states, 1, watch=np.arange(4), watch_from=1)[:, 0, :].tolist() == \
        [list(v) for v in hand.values()]


def test_kauffman_step_by_hand():
    net = kauffman()
    # (A, B, C) -> (B and C, A or C, A or B)
    hand = {(0, 0, 0): (0, 0, 0), (1, 0, 0): (0, 1, 1), (0, 1, 1): (1, 1, 1), (1, 1, 0): (0, 1, 1),
            (0, 0, 1): (0, 1, 0), (0, 1, 0): (0, 0, 1), (1, 0, 1): (0, 1, 1), (1, 1, 1): (1, 1, 1)}
    states = np.array(list(hand), dtype=np.uint8)
    assert net.step(states).tolist() == [list(v) for v in hand.values()]


# --------------------------------------------------------------------------- conformance suite

CONFORMANCE_MEDIA = [
    kauffman(),
    BooleanNetwork.from_toml(TIDEPOOL),
    random_network(1, 1, 0.5, 1),
    random_network(7, 0, 0.5, 2),
    random_network(12, 2, 0.5, 3),
    random_network(20, 3, 0.3, 4),
    random_network(40, 5, 0.5, 5),
]


@parametrize_with_checks(CONFORMANCE_MEDIA)
def test_conforms(medium, check):
    check(medium)


# --------------------------------------------------------------------------- random networks

@pytest.mark.parametrize(("args", "fragment"), [
    ((3, 4, 0.5), "K = 4 is more than N = 3"),
    ((5, 6, 0.5), "allowed 0 <= K <= N"),
    ((5, 2, -0.1), "p = -0.1 must lie in [0, 1]"),
    ((5, 2, 1.5), "p = 1.5 must lie in [0, 1]"),
    ((-3, 1, 0.5), "N must be a whole number >= 1, got -3"),
    ((0, 0, 0.5), "N must be a whole number >= 1, got 0"),
    ((5, -1, 0.5), "K must be a whole number >= 0, got -1"),
])
def test_random_network_refuses_bad_parameters(args, fragment):
    with pytest.raises(MediumInputError) as caught:
        random_network(*args, seed=0)
    assert fragment in str(caught.value)
    assert "\n" not in str(caught.value)


def wiring_and_tables(net):
    return [row.tolist() for row in net.inputs], [table.tolist() for table in net.tables]


def test_random_network_is_reproducible_and_seeded():
    a = random_network(30, 3, 0.5, 17)
    b = random_network(30, 3, 0.5, 17)
    c = random_network(30, 3, 0.5, 18)
    assert wiring_and_tables(a) == wiring_and_tables(b)
    assert wiring_and_tables(a) != wiring_and_tables(c)
    assert a.describe() == {"nodes": 30, "inputs": 3, "bias": 0.5, "network_seed": 17}


def test_random_network_shape():
    net = random_network(50, 4, 0.5, 1)
    for row, table in zip(net.inputs, net.tables):
        assert row.size == 4 and len(set(row.tolist())) == 4  # K distinct inputs
        assert table.size == 16
    # bias 0 and 1 give constant tables
    assert all(t.sum() == 0 for t in random_network(10, 2, 0.0, 1).tables)
    assert all(t.sum() == 4 for t in random_network(10, 2, 1.0, 1).tables)


def test_rbn_family_expands_the_full_grid_with_distinct_seeds():
    family = RandomNetworkFamily()
    table = {"nodes": [6, 9], "inputs": [1, 2, 3], "bias": [0.5, 0.25], "replicates": 3}
    rows = family.expand(table, seed=5)
    assert len(rows) == 2 * 3 * 2 * 3
    grid = {(r["nodes"], r["inputs"], r["bias"], r["replicate"]) for r in rows}
    assert grid == {(n, k, p, r) for n in (6, 9) for k in (1, 2, 3) for p in (0.5, 0.25) for r in range(3)}
    seeds = [r["network_seed"] for r in rows]
    assert len(set(seeds)) == len(seeds)
    for r in rows:
        assert r["network_seed"] == network_seed(5, r["nodes"], r["inputs"], r["bias"], r["replicate"])
    # Another run seed gives other networks.
    assert {r["network_seed"] for r in family.expand(table, seed=6)}.isdisjoint(seeds)


def test_rbn_family_rebuilds_the_same_network_from_a_row():
    family = RandomNetworkFamily()
    rows = family.expand({"nodes": [10], "inputs": [2, 3], "replicates": 2}, seed=0)
    built = [family.build(**row) for row in rows]
    for row, net in zip(rows, built):
        again = family.build(**row)
        assert wiring_and_tables(again) == wiring_and_tables(net)
        direct = random_network(row["nodes"], row["inputs"], row["bias"], row["network_seed"])
        assert wiring_and_tables(direct) == wiring_and_tables(net)
        # describe() holds everything needed to rebuild it.
        assert wiring_and_tables(family.build(**net.describe())) == wiring_and_tables(net)
    # Different rows are different networks.
    assert len({str(wiring_and_tables(net)) for net in built}) == len(built)


def test_rbn_family_refuses_bad_grid():
    family = RandomNetworkFamily()
    with pytest.raises(MediumInputError, match="K = 5 is more than N = 4"):
        family.expand({"nodes": [4], "inputs": [5]}, seed=0)
    with pytest.raises(MediumInputError, match=r"p = 1.5 must lie in \[0, 1\]"):
        family.expand({"nodes": [4], "bias": 1.5}, seed=0)
    with pytest.raises(MediumInputError, match="did you mean 'replicates'"):
        family.expand({"nodes": [4], "replicate": 2}, seed=0)
