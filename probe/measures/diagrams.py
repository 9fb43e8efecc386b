"""Seeded random states and space-time diagrams, shared by the measures that run a medium.

Initial conditions are uniform: every site independently takes each of the
``n_states`` states with equal probability, drawn from the measure's own
generator ``rng_for(seed, "measure", <name>)``. Diagrams are taken on the
medium as built (its ``n_sites``, boundary and wiring), never on a resized copy.
"""

from __future__ import annotations

import numpy as np


def random_states(medium, count: int, rng: np.random.Generator) -> np.ndarray:
    """``(count, n_sites)`` uint8 states, each site uniform over ``0 .. n_states-1``."""
    return rng.integers(0, int(medium.n_states), size=(count, medium.n_sites), dtype=np.uint8)


def space_time(medium, initial: np.ndarray, steps: int, transient: int = 0) -> np.ndarray:
    """``(batch, steps, n_sites)`` uint8: every site at times ``transient .. transient + steps - 1``.

    Row ``t`` of a diagram is the whole state at time ``transient + t``; with
    ``transient = 0`` the first row is the initial state itself.
    """
    return medium.evolve(initial, transient + steps - 1, watch=np.arange(medium.n_sites), watch_from=transient)


def flip_one_site(states: np.ndarray, n_states: int, rng: np.random.Generator) -> np.ndarray:
    """A copy of ``states`` with one uniformly chosen site per row changed to another state.

    Binary media flip the site; with ``k > 2`` states the new value is uniform
    over the ``k - 1`` other states.
    """
    batch = states.shape[0]
    sites = rng.integers(0, states.shape[1], size=batch)
    shift = rng.integers(1, int(n_states), size=batch)
    flipped = states.copy()
    rows = np.arange(batch)
    flipped[rows, sites] = (flipped[rows, sites].astype(np.int64) + shift) % int(n_states)
    return flipped


def packed(diagram: np.ndarray, n_states: int) -> bytes:
    """The bytes a compressor sees for one ``(steps, n_sites)`` diagram, rows in time order.

    Binary media: 8 cells per byte with ``np.packbits`` along each row (first
    cell in the most significant bit; a row whose width is not a multiple of 8
    is padded with zero bits to whole bytes). ``k > 2``: one byte per cell.
    """
    diagram = np.ascontiguousarray(diagram, dtype=np.uint8)
    if int(n_states) == 2:
        return np.packbits(diagram, axis=-1).tobytes()
    return diagram.tobytes()
