"""One-step damage spreading in random N-K Boolean networks against the annealed approximation.

Derrida & Pomeau 1986 (Europhys. Lett. 1:45), via ../shared/reference-values.md: in a random
network with in-degree K and bias p, flipping one node spreads in one step to ``2p(1-p)K``
nodes on average (critical at 1, so K = 2 for p = 1/2).

Why this is the exact ensemble mean, not only an approximation, for one step: node j reads
the flipped node i with probability K/N (K distinct inputs out of N), so N*K/N = K nodes read
i on average; for each of them the flip moves the table lookup to another row, and two rows of
a random table differ with probability 2p(1-p). Nodes that do not read i keep their output.
So E[d(F(x), F(x'))] = 2p(1-p)K over networks, states x and flipped nodes.

Tolerance: the estimate is the mean over M networks of each network's mean over its S
states (each with its own random flipped node). Networks are independent draws, so the
per-network means are i.i.d. and the standard error of their mean is sd / sqrt(M), with sd the
sample standard deviation of the per-network means (this includes the between-network spread
in how many nodes read a given node, which states within one network do not average out).
We allow 4 standard errors: a correct implementation fails with probability about 6e-5 for a
fresh seed, and the seeds here are fixed.
"""

from __future__ import annotations

import numpy as np
import pytest

from media.boolnet import random_network

N = 200
NETWORKS = 200
STATES = 64
SE_ALLOWED = 4.0


def measured_spread(k: int, p: float, seed: int) -> tuple:
    """Mean one-step Hamming distance and its standard error, from per-network means."""
    rng = np.random.default_rng(seed)
    per_network = np.empty(NETWORKS)
    rows = np.arange(STATES)
    for m in range(NETWORKS):
        net = random_network(N, k, p, seed=int(rng.integers(2**31)))
        x = rng.integers(0, 2, size=(STATES, N), dtype=np.uint8)
        flipped = x.copy()
        node = rng.integers(0, N, size=STATES)
        flipped[rows, node] ^= 1
        # One batch of 2 * STATES runs through the bit-sliced evolve; F(x) and F(x') at t = 1.
        after = net.evolve(np.concatenate([x, flipped]), 1, watch=np.arange(N), watch_from=1)[:, 0, :]
        distance = (after[:STATES] != after[STATES:]).sum(axis=1)
        per_network[m] = distance.mean()
    mean = per_network.mean()
    standard_error = per_network.std(ddof=1) / np.sqrt(NETWORKS)
    return mean, standard_error


CASES = [(1, 0.5), (2, 0.5), (3, 0.5), (4, 0.5), (4, 0.25)]
_measured = {}


def spread(k, p):
    if (k, p) not in _measured:
        _measured[(k, p)] = measured_spread(k, p, seed=1986 + 10 * k + int(100 * p))
    return _measured[(k, p)]


@pytest.mark.parametrize(("k", "p"), CASES)
def test_one_step_damage_matches_annealed_approximation(k, p):
    mean, standard_error = spread(k, p)
    expected = 2 * p * (1 - p) * k  # Derrida & Pomeau 1986
    tolerance = SE_ALLOWED * standard_error
    assert 0 < standard_error < 0.05  # the sample is large enough for the check to mean something
    assert abs(mean - expected) <= tolerance, (f"K={k}, p={p}: measured {mean:.4f} +- {standard_error:.4f}, "
                                               f"annealed approximation {expected:.4f}")


@pytest.mark.parametrize(("k", "p", "wrong"), [
    (4, 0.5, 0.5 * 0.5 * 4),  # p(1-p)K: the factor 2 dropped
    (4, 0.5, 4.0),            # K: every reader of the flipped node changes
    (2, 0.5, 2.0),            # K at the critical point
    (4, 0.25, 0.25 * 4),      # pK: equal to 2p(1-p)K at p = 1/2, so only p != 1/2 tells them apart
])
def test_a_wrong_formula_is_rejected(k, p, wrong):
    # "Far": more than five times the tolerance used above (20 standard errors).
    mean, standard_error = spread(k, p)
    assert abs(mean - wrong) > 5 * SE_ALLOWED * standard_error, (mean, standard_error, wrong)
