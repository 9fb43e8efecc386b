"""Mean average sensitivity of Boolean node functions (Shmulevich & Kauffman 2004, PRL 93:048701)."""

from __future__ import annotations

import numpy as np
import pytest

from media.boolnet import BooleanNetwork, random_network
from media.eca import ElementaryCA
from naive_measures import naive_average_sensitivity
from probe.measures import MeasureUnavailable, average_sensitivity, compute_measure, mean_sensitivity


@pytest.mark.parametrize(("table", "inputs", "expected"), [
    ([0, 0, 0, 1], 2, 1.0),  # AND of two: each input matters only when the other is 1 (computed by hand)
    ([0, 1, 1, 1], 2, 1.0),  # OR of two: each input matters only when the other is 0
    ([0, 1, 1, 0], 2, 2.0),  # XOR of two: every flip changes the output
    ([0, 0, 1, 1], 2, 1.0),  # copy of the first input: only it matters
    ([0, 1, 1, 0, 1, 0, 0, 1], 3, 3.0),  # XOR of three
    ([0, 0, 0, 1, 0, 1, 1, 1], 3, 1.5),  # majority of three: 6 sensitive rows x 2 inputs / 8 (computed by hand)
    ([1], 0, 0.0),  # a constant node
])
def test_hand_computed_tables(table, inputs, expected):
    assert average_sensitivity(table, inputs) == expected
    assert naive_average_sensitivity(table, inputs) == expected


def test_agrees_with_naive_twin_on_random_tables():
    rng = np.random.default_rng(2004)
    for inputs in range(0, 7):
        for _ in range(10):
            table = rng.integers(0, 2, size=2**inputs).tolist()
            assert average_sensitivity(table, inputs) == pytest.approx(naive_average_sensitivity(table, inputs))


def test_network_is_mean_over_nodes():
    # computed: AND (1) and XOR (2) nodes
    net = BooleanNetwork.from_expressions({"A": "A and B", "B": "A xor B"})
    assert mean_sensitivity(net) == 1.5


@pytest.mark.parametrize(("k", "p"), [(1, 0.5), (2, 0.5), (3, 0.5), (4, 0.5), (4, 0.25)])
def test_random_networks_near_annealed_value(k, p):
    # Shmulevich & Kauffman 2004: for random tables with bias p the expected average sensitivity
    # is 2p(1-p)K. Tolerance: node functions are i.i.d. draws, so the mean over all nodes of the
    # networks has standard error sd/sqrt(nodes); we allow 4 standard errors.
    nets = [random_network(300, k, p, seed=40 + m) for m in range(4)]
    values = np.array([average_sensitivity(table, k) for net in nets for table in net.tables])
    standard_error = values.std(ddof=1) / np.sqrt(values.size)
    expected = 2 * p * (1 - p) * k
    assert 0 < standard_error < 0.05
    assert abs(values.mean() - expected) <= 4 * standard_error
    assert np.mean([mean_sensitivity(net) for net in nets]) == pytest.approx(values.mean())


def test_elementary_ca_is_refused():
    with pytest.raises(MeasureUnavailable) as caught:
        compute_measure("mean_sensitivity", ElementaryCA(rule=110, width=64))
    message = str(caught.value)
    assert "\n" not in message
    assert "'mean_sensitivity' needs the Boolean function of every node" in message and "'eca'" in message
