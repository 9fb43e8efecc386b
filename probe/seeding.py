"""The one randomness convention.

Every run has one integer ``seed`` (default 0), recorded in every output.
Every random choice draws from ``rng_for(seed, purpose...)``: a generator
seeded by ``numpy.random.SeedSequence([seed, crc32(purpose)...])``. The
purposes are fixed strings such as ``("background", layout_name)`` or
``("contexts", layout_name)``, so each choice is reproducible on its own and
does not shift when another choice is added or removed.
"""

import zlib

import numpy as np


def rng_for(seed: int, *purpose) -> np.random.Generator:
    """A generator for one named purpose under run seed ``seed``."""
    words = [int(seed) & 0xFFFFFFFFFFFFFFFF]
    words.extend(zlib.crc32(str(part).encode()) for part in purpose)
    return np.random.default_rng(np.random.SeedSequence(words))
