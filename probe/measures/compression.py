"""The shared body of ``zlib_ratio`` and ``lzma_ratio``: compressed over packed size, averaged over starts."""

from __future__ import annotations

import numpy as np

from probe.measures.diagrams import packed, random_states, space_time
from probe.measures.registry import whole_number
from probe.seeding import rng_for


def compression_ratio(name, compress, medium, *, seed, steps, starts, transient) -> float:
    """Mean of ``len(compress(packed diagram)) / len(packed diagram)`` over ``starts`` seeded random starts."""
    steps = whole_number(steps, "steps", name)
    starts = whole_number(starts, "starts", name)
    transient = whole_number(transient, "transient", name, minimum=0)
    rng = rng_for(seed, "measure", name)
    diagrams = space_time(medium, random_states(medium, starts, rng), steps, transient)
    ratios = []
    for diagram in diagrams:
        raw = packed(diagram, medium.n_states)
        ratios.append(len(compress(raw)) / len(raw))
    return float(np.mean(ratios))
