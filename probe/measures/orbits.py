"""Orbits of small media, shared by the transient, cycle and attractor measures.

State-space limits: following single starts (``transient_length``,
``cycle_length``) needs ``n_states ** n_sites <= 2**24`` (24 binary sites);
exhaustive enumeration (``attractor_count``, ``mean_attractor_length``)
needs ``n_states ** n_sites <= 2**20``. Larger media are refused with
:class:`~probe.measures.registry.MeasureUnavailable`, never sampled silently.

States are numbered as in ``media.attractors`` (site ``i`` is digit ``i``,
base ``n_states``). All starts advance together through ``medium.evolve``
(one bit-sliced batch for binary media) in chunks of steps:

1. Brent's cycle finding (Brent 1980, BIT 20:176) on each start's stream of
   state numbers gives its cycle length ``lambda`` (``_brent_scan``);
2. a second pass takes each start's state at time ``lambda``;
3. a third pass runs the starts and those states side by side: the first
   time they agree is the transient ``mu``.

Memory stays at one chunk; no table of seen states is kept. This computes
what ``media.attractors.attractor_from`` computes one ``step`` and one dict
entry at a time; that function is the slow twin in the tests.
"""

from __future__ import annotations

import math

import numpy as np

from media.attractors import attractors, state_numbers
from media.jit import kernel
from probe.measures.diagrams import random_states
from probe.measures.registry import MeasureUnavailable, medium_label, whole_number
from probe.seeding import rng_for

MAX_FOLLOWED_STATES = 2**24
MAX_ENUMERATED_STATES = 2**20
FIRST_CHUNK = 64  # steps per evolve call, doubled after every call up to LAST_CHUNK
LAST_CHUNK = 2**13


def _largest_width(limit: int, n_states: int) -> int:
    return int(math.floor(math.log(limit, n_states) + 1e-9))


@kernel
def _brent_scan(numbers, tortoise, power, lam, cycle):
    """Advance Brent's cycle finding over state numbers at the next ``numbers.shape[1]`` times.

    Per row: ``tortoise`` is the state number last saved, ``lam`` the distance
    from it to the state at the first column, ``power`` the distance at which
    the tortoise moves on. A row whose ``cycle`` is already > 0 is skipped; a
    row that meets its tortoise gets ``cycle = lam``.
    """
    for row in range(numbers.shape[0]):
        if cycle[row] > 0:
            continue
        for i in range(numbers.shape[1]):
            state = numbers[row, i]
            if state == tortoise[row]:
                cycle[row] = lam[row]
                break
            if power[row] == lam[row]:
                tortoise[row] = state
                power[row] *= 2
                lam[row] = 0
            lam[row] += 1


def _chunks():
    chunk = FIRST_CHUNK
    while True:
        yield chunk
        chunk = min(2 * chunk, LAST_CHUNK)


def _numbers(run: np.ndarray, k: int) -> np.ndarray:
    """State numbers of a ``(batch, times, n_sites)`` run, shape ``(batch, times)``."""
    return state_numbers(run.reshape(-1, run.shape[-1]), k).reshape(run.shape[:2])


def cycle_lengths(medium, initial: np.ndarray) -> np.ndarray:
    """The period of the attractor reached from each row of ``initial`` (Brent's algorithm, batched)."""
    k = int(medium.n_states)
    everything = np.arange(medium.n_sites)
    batch = initial.shape[0]
    tortoise = _numbers(initial[:, None, :], k)[:, 0].copy()
    power = np.ones(batch, dtype=np.int64)
    lam = np.ones(batch, dtype=np.int64)
    cycle = np.zeros(batch, dtype=np.int64)
    current = initial
    for chunk in _chunks():
        active = np.flatnonzero(cycle == 0)
        if active.size == 0:
            return cycle
        run = medium.evolve(current[active], chunk, watch=everything, watch_from=1)
        found = cycle[active]
        sub_tortoise, sub_power, sub_lam = tortoise[active], power[active], lam[active]
        _brent_scan(_numbers(run, k), sub_tortoise, sub_power, sub_lam, found)
        tortoise[active], power[active], lam[active], cycle[active] = sub_tortoise, sub_power, sub_lam, found
        current = current.copy()
        current[active] = run[:, -1]


def states_at(medium, initial: np.ndarray, times: np.ndarray) -> np.ndarray:
    """Row ``j`` of ``initial`` advanced ``times[j]`` steps."""
    everything = np.arange(medium.n_sites)
    out = initial.copy()
    current, time = initial, 0
    for chunk in _chunks():
        pending = np.flatnonzero(times > time)
        if pending.size == 0:
            return out
        run = medium.evolve(current[pending], chunk, watch=everything, watch_from=1)  # times time+1 ..
        due = times[pending] <= time + chunk
        out[pending[due]] = run[np.flatnonzero(due), times[pending[due]] - time - 1]
        current = current.copy()
        current[pending] = run[:, -1]
        time += chunk


def transients(medium, initial: np.ndarray, cycles: np.ndarray) -> np.ndarray:
    """The first time each row's state equals its state ``cycles[j]`` steps later: the transient."""
    k = int(medium.n_states)
    everything = np.arange(medium.n_sites)
    batch = initial.shape[0]
    current = np.concatenate([initial, states_at(medium, initial, cycles)])
    numbers = _numbers(current[:, None, :], k)[:, 0]
    transient = np.where(numbers[:batch] == numbers[batch:], 0, -1).astype(np.int64)
    time = 0
    for chunk in _chunks():
        active = np.flatnonzero(transient < 0)
        if active.size == 0:
            return transient
        rows = np.concatenate([active, active + batch])
        run = medium.evolve(current[rows], chunk, watch=everything, watch_from=1)  # times time+1 ..
        numbers = _numbers(run, k)
        equal = numbers[: active.size] == numbers[active.size :]
        met = equal.any(axis=1)
        transient[active[met]] = time + 1 + equal[met].argmax(axis=1)
        current = current.copy()
        current[rows] = run[:, -1]
        time += chunk


def orbit_lengths(name: str, medium, seed: int, starts: int) -> tuple:
    """``(transients, cycle lengths)`` as int arrays, one per seeded random start."""
    starts = whole_number(starts, "starts", name)
    k = int(medium.n_states)
    if k ** medium.n_sites > MAX_FOLLOWED_STATES:
        raise MeasureUnavailable(
            f"measure {name!r}: transient and cycle lengths are measured on small rings: build the medium with "
            f"width <= {_largest_width(MAX_FOLLOWED_STATES, k)} ({k} states per site); {medium_label(medium)} "
            f"is too large")
    rng = rng_for(seed, "measure", name)
    initial = random_states(medium, starts, rng)
    cycles = cycle_lengths(medium, initial)
    return transients(medium, initial, cycles), cycles


def all_attractors(name: str, medium) -> list:
    """Every attractor of ``medium`` by exhaustive enumeration, or a refusal above ``2**20`` states."""
    k = int(medium.n_states)
    if k ** medium.n_sites > MAX_ENUMERATED_STATES:
        raise MeasureUnavailable(
            f"measure {name!r} enumerates all {k}^{medium.n_sites} states, more than the "
            f"{MAX_ENUMERATED_STATES:,} allowed: build the medium with at most "
            f"{_largest_width(MAX_ENUMERATED_STATES, k)} sites ({medium_label(medium)})")
    return attractors(medium)
