"""Attractors of Boolean networks: a published example, a naive twin, and the size limit.

State numbering (media/attractors.py, media/boolnet/network.py): node ``i`` is
bit ``i`` of a state number, the first listed node least significant.
"""

from __future__ import annotations

import numpy as np
import pytest

from media.attractors import MAX_EXHAUSTIVE_STATES, attractor_from, attractors
from media.boolnet import BooleanNetwork, random_network
from media.errors import MediumInputError

KAUFFMAN = {"A": "B and C", "B": "A or C", "C": "A or B"}


def kauffman_network() -> BooleanNetwork:
    return BooleanNetwork.from_expressions(KAUFFMAN)


# --------------------------------------------------------------------------- naive twin

def naive_successors(network: BooleanNetwork) -> list:
    """Successor of every state number, in plain Python from the network's wiring and tables.

    Shares nothing with ``media.attractors.successors`` or the bit-sliced kernels:
    node j's next value is ``table_j[row]`` with ``row`` the binary number of its
    inputs, first input most significant (network.py docstring).
    """
    n = network.n_sites
    inputs = [[int(i) for i in row] for row in network.inputs]
    tables = [[int(v) for v in table] for table in network.tables]
    out = []
    for number in range(2**n):
        bits = [(number >> i) & 1 for i in range(n)]
        following = 0
        for node in range(n):
            row = 0
            for source in inputs[node]:
                row = 2 * row + bits[source]
            following |= tables[node][row] << node
        out.append(following)
    return out


def naive_attractors(successor: list) -> tuple:
    """Follow every state with a dict until it repeats: its cycle (rotated to its smallest state)
    and its transient length. Returns ``({cycle: basin}, {state: (transient, cycle)})``."""
    basins, reached = {}, {}
    for origin in range(len(successor)):
        seen = {}
        state, t = origin, 0
        while state not in seen:
            seen[state] = t
            state = successor[state]
            t += 1
        order = sorted(seen, key=seen.get)
        cycle = order[seen[state]:]
        pivot = cycle.index(min(cycle))
        cycle = tuple(cycle[pivot:] + cycle[:pivot])
        basins[cycle] = basins.get(cycle, 0) + 1
        reached[origin] = (seen[state], cycle)
    return basins, reached


def random_cases():
    """(N, K, seed) over N 1..10, K 0..min(4, N), two seeds each."""
    cases = []
    for n in range(1, 11):
        for k in range(0, min(4, n) + 1):
            for seed in (n * 100 + k, n * 100 + k + 50):
                cases.append((n, k, seed))
    return cases


# --------------------------------------------------------------------------- Kauffman 1969

def test_kauffman_1969_three_node_attractors():
    # Kauffman 1969 (J. Theor. Biol. 22:437), via ../shared/reference-values.md: A = B and C,
    # B = A or C, C = A or B has the fixed point 000 (basin 1), the two-cycle 001 <-> 010
    # (basin 2) and the fixed point 111 (basin 5). The reference writes states as the
    # strings "ABC" (A first). Our state numbers put node i on bit i (A = bit 0, least
    # significant), so "001" (A=0, B=0, C=1) is 4, "010" (B=1) is 2, "000" is 0, "111" is 7.
    # Cycles are listed from their smallest state number: the two-cycle is (2, 4).
    found = [(a.states, a.basin) for a in attractors(kauffman_network())]
    assert found == [((0,), 1), ((2, 4), 2), ((7,), 5)]


def test_kauffman_two_cycle_in_node_order():
    # The same two-cycle written as node values (A, B, C): 001 -> 010 -> 001 (computed by hand
    # from the three rules), checked with step so the state numbering above cannot hide a swap.
    net = kauffman_network()
    assert net.step(np.array([[0, 0, 1]], dtype=np.uint8)).tolist() == [[0, 1, 0]]
    assert net.step(np.array([[0, 1, 0]], dtype=np.uint8)).tolist() == [[0, 0, 1]]
    # attractor_from a basin-of-111 state (A=1, B=0, C=0 is number 1): 100 -> 011 -> 111.
    transient, cycle = attractor_from(net, [1, 0, 0])
    assert (transient, cycle) == (2, (7,))


# --------------------------------------------------------------------------- naive agreement

@pytest.mark.parametrize(("n", "k", "seed"), random_cases())
def test_exhaustive_attractors_match_naive_twin(n, k, seed):
    net = random_network(n, k, 0.5, seed)
    successor = naive_successors(net)
    basins, _ = naive_attractors(successor)
    found = attractors(net)
    assert {a.states: a.basin for a in found} == basins
    assert sum(a.basin for a in found) == 2**n
    # Each listed cycle is a real cycle in listed order (state -> successor -> ...).
    for a in found:
        for i, state in enumerate(a.states):
            assert successor[state] == a.states[(i + 1) % a.length]


@pytest.mark.parametrize(("n", "k", "seed"), [case for case in random_cases() if case[0] >= 3][::3])
def test_attractor_from_matches_naive_twin(n, k, seed):
    net = random_network(n, k, 0.5, seed)
    successor = naive_successors(net)
    _, reached = naive_attractors(successor)
    rng = np.random.default_rng(seed)
    for number in rng.choice(2**n, size=min(2**n, 12), replace=False).tolist():
        state = [(number >> i) & 1 for i in range(n)]
        transient, cycle = attractor_from(net, state)
        expected_transient, expected_cycle = reached[number]
        assert transient == expected_transient
        assert set(cycle) == set(expected_cycle)
        # attractor_from lists the cycle in the order it is visited, from the first cycle state reached.
        for i, s in enumerate(cycle):
            assert successor[s] == cycle[(i + 1) % len(cycle)]


def test_attractor_from_gives_up_after_max_steps():
    # A 2-cycle with a transient of 0 needs 2 steps to repeat; max_steps = 1 is too few.
    net = BooleanNetwork.from_expressions({"A": "not A"})
    assert attractor_from(net, [0]) == (0, (0, 1))
    with pytest.raises(ValueError, match="max_steps = 1"):
        attractor_from(net, [0], max_steps=1)


# --------------------------------------------------------------------------- size limit

def test_too_many_states_is_refused_with_the_size():
    n = 25  # 2**25 states, over MAX_EXHAUSTIVE_STATES = 2**24
    assert 2**n > MAX_EXHAUSTIVE_STATES
    with pytest.raises(MediumInputError) as caught:
        attractors(random_network(n, 2, 0.5, 0))
    message = str(caught.value)
    assert "25 nodes" in message
    assert f"{2**n:,}" in message  # 33,554,432 states
    assert f"{MAX_EXHAUSTIVE_STATES:,}" in message
    assert "\n" not in message
