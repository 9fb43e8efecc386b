"""Attractors of a deterministic medium: from one start, or all of them with basin sizes.

Exhaustive enumeration evaluates the successor of every one of the ``k^N``
states (in one bit-sliced batch for Boolean networks) and then walks the
functional graph once: each state is visited a constant number of times.
States are numbered with node ``i`` as digit ``i`` (first node least
significant), as everywhere in the project.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from media.errors import require
from media.jit import kernel

MAX_EXHAUSTIVE_STATES = 2**24


@dataclass(frozen=True)
class Attractor:
    """A cycle of states (length 1 = fixed point), starting from its smallest state number, and its basin size."""

    states: tuple
    basin: int

    @property
    def length(self) -> int:
        return len(self.states)


def state_numbers(states: np.ndarray, k: int = 2) -> np.ndarray:
    powers = k ** np.arange(states.shape[1], dtype=np.int64)
    return states.astype(np.int64) @ powers


def states_of(numbers, n_sites: int, k: int = 2) -> np.ndarray:
    numbers = np.asarray(numbers, dtype=np.int64)
    powers = k ** np.arange(n_sites, dtype=np.int64)
    return ((numbers[:, None] // powers[None, :]) % k).astype(np.uint8)


def successors(medium) -> np.ndarray:
    """The successor number of every state number."""
    k = int(medium.n_states)
    total = k ** medium.n_sites
    require(total <= MAX_EXHAUSTIVE_STATES,
            f"attractors: {medium.n_sites} nodes give {total:,} states, more than the {MAX_EXHAUSTIVE_STATES:,} "
            f"that exhaustive enumeration allows; follow single starts with attractor_from instead")
    out = np.empty(total, dtype=np.int64)
    chunk = max(1, 2**22 // medium.n_sites)
    for start in range(0, total, chunk):
        numbers = np.arange(start, min(total, start + chunk), dtype=np.int64)
        states = states_of(numbers, medium.n_sites, k)
        following = medium.evolve(states, 1, watch=np.arange(medium.n_sites), watch_from=1)[:, 0, :]
        out[start : start + numbers.size] = state_numbers(following, k)
    return out


@kernel
def _label_functional_graph(successor):
    """Attractor label of every state; cycle states get their label, others inherit it."""
    n = successor.shape[0]
    label = np.full(n, -1, dtype=np.int64)
    on_path = np.full(n, -1, dtype=np.int64)
    path = np.empty(n, dtype=np.int64)
    cycle_start = np.empty(0, dtype=np.int64)
    starts = []
    attractors = 0
    for origin in range(n):
        if label[origin] >= 0:
            continue
        length = 0
        state = origin
        while label[state] < 0 and on_path[state] < 0:
            on_path[state] = length
            path[length] = state
            length += 1
            state = successor[state]
        if label[state] >= 0:
            found = label[state]
        else:
            found = attractors
            attractors += 1
            starts.append(state)
        for i in range(length):
            label[path[i]] = found
            on_path[path[i]] = -1
    cycle_start = np.array(starts, dtype=np.int64) if starts else cycle_start
    return label, cycle_start


def attractors(medium) -> list:
    """Every attractor with its basin size, by exhaustive enumeration (small media only).

    Examples
    --------
    >>> from media.boolnet import BooleanNetwork
    >>> net = BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"})
    >>> [(a.states, a.basin) for a in attractors(net)]
    [((0,), 1), ((2, 4), 2), ((7,), 5)]
    """
    successor = successors(medium)
    label, starts = _label_functional_graph(successor)
    basins = np.bincount(label, minlength=starts.size)
    found = []
    for index, start in enumerate(starts.tolist()):
        cycle = [start]
        state = int(successor[start])
        while state != start:
            cycle.append(state)
            state = int(successor[state])
        pivot = cycle.index(min(cycle))
        found.append(Attractor(states=tuple(cycle[pivot:] + cycle[:pivot]), basin=int(basins[index])))
    return sorted(found, key=lambda attractor: attractor.states)


def attractor_from(medium, state, max_steps: int = 100_000, clamp_sites=None, clamp_values=None) -> tuple:
    """``(transient length, cycle of state numbers)`` reached from one start state.

    ``clamp_sites`` (optional) are forced to ``clamp_values`` after every step, as in ``evolve``.
    State numbers are exact Python integers, so media of any size are followed correctly.
    """
    current = np.asarray(state, dtype=np.uint8).reshape(1, -1)
    clamp_sites = np.zeros(0, dtype=np.int64) if clamp_sites is None else np.asarray(clamp_sites, dtype=np.int64)
    clamp_values = np.asarray(clamp_values if clamp_values is not None else [], dtype=np.uint8).reshape(-1)
    k = int(medium.n_states)
    seen = {}
    for t in range(max_steps + 1):
        number = sum(int(value) * k**site for site, value in enumerate(current[0])) if current.shape[1] > 62 \
            else int(state_numbers(current, k)[0])
        if number in seen:
            first = seen[number]
            order = sorted(seen, key=seen.get)
            return first, tuple(order[first:])
        seen[number] = t
        current = medium.step(current)
        if clamp_sites.size:
            current = current.copy()
            current[0, clamp_sites] = clamp_values
    raise ValueError(f"attractor_from: no attractor within max_steps = {max_steps}")
