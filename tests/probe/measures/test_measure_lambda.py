"""Langton's lambda against reference-values.md (Langton 1990, Physica D 42:12)."""

from __future__ import annotations

from itertools import product

import numpy as np
import pytest

from media.boolnet import BooleanNetwork, random_network
from media.eca import ElementaryCA
from media.interface import Medium
from probe.measures import MeasureUnavailable, compute_measure, langton_lambda


class LifeOnATorus(Medium):
    """Conway's Life on a small torus, read through its 512-entry outer-totalistic table.

    Table index: the 3x3 neighbourhood read row by row, top-left most significant; the
    centre is bit 4. Output 1 for a birth (centre off, exactly 3 of 8 on) or survival
    (centre on, 2 or 3 of 8 on).
    """

    kind = "life-test"
    n_states = 2

    def __init__(self, side=5):
        self.side = side
        self.n_sites = side * side
        table = []
        for index in range(512):
            bits = [(index >> (8 - j)) & 1 for j in range(9)]
            centre, others = bits[4], sum(bits) - bits[4]
            table.append(int(others == 3 or (centre == 1 and others == 2)))
        self.table = np.array(table, dtype=np.uint8)

    def describe(self):
        return {"side": self.side}

    def transition_table(self):
        return self.table.copy(), 0

    def step(self, states):
        grid = np.asarray(states, dtype=np.uint8).reshape(-1, self.side, self.side)
        index = np.zeros(grid.shape, dtype=np.int64)
        for dy, dx in product((-1, 0, 1), repeat=2):  # row by row from the top left
            index = 2 * index + np.roll(grid, (-dy, -dx), axis=(1, 2))
        return self.table[index].reshape(states.shape)


@pytest.mark.parametrize(("rule", "expected"), [
    (30, 0.5),     # Langton 1990 via reference-values.md: rule 30 -> 0.5
    (110, 0.625),  # Langton 1990 via reference-values.md: rule 110 -> 0.625
    (0, 0.0),      # computed: no entry leaves the quiescent state
    (255, 1.0),    # computed: every entry does
    (232, 0.5),    # computed: majority has four 1s in eight entries
])
def test_elementary_rules(rule, expected):
    assert langton_lambda(ElementaryCA(rule=rule)) == expected
    assert compute_measure("langton_lambda", ElementaryCA(rule=rule, width=9)) == expected


def test_every_elementary_rule_is_its_bit_count_over_eight():
    # computed: the rule number's 1 bits are the table's non-quiescent entries
    for rule in range(256):
        assert langton_lambda(ElementaryCA(rule=rule)) == bin(rule).count("1") / 8


def test_game_of_life():
    # Langton 1990 via reference-values.md: Conway's Life, 512 entries -> 140/512
    life = LifeOnATorus()
    glider = np.zeros((1, 25), dtype=np.uint8)
    glider[0, [1, 7, 10, 11, 12]] = 1
    assert life.step(glider).sum() == 5  # the test medium is Life: a glider keeps its five cells
    assert langton_lambda(life) == 140 / 512


def test_boolean_network_is_mean_table_bias():
    # computed: Kauffman 1969 network, tables AND 0001, OR 0111, OR 0111 -> 7 ones of 12
    net = BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"})
    assert langton_lambda(net) == 7 / 12
    random = random_network(50, 3, bias=0.25, seed=11)
    assert langton_lambda(random) == pytest.approx(np.mean([t.mean() for t in random.tables]), abs=1e-12)


def test_medium_without_a_table_is_refused():
    class Plain(Medium):
        kind = "plain"
        n_sites = 4

        def step(self, states):
            return states.copy()

        def describe(self):
            return {}

    with pytest.raises(MeasureUnavailable) as caught:
        compute_measure("langton_lambda", Plain())
    message = str(caught.value)
    assert "\n" not in message
    assert "'langton_lambda' needs a transition table" in message and "'plain'" in message
    with pytest.raises(MeasureUnavailable):
        langton_lambda(Plain())  # the function itself refuses too, not only compute_measure
