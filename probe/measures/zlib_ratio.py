"""Compressibility of space-time diagrams under zlib (DEFLATE, level 9).

Zenil 2010 (Complex Systems 19:1) orders elementary rules by the compressed
size of their space-time diagrams from random initial conditions: chaotic
rules (30, 45) compress worst, then complex (110), then periodic (4, 108),
then the null rule 0.
"""

from __future__ import annotations

import zlib

from probe.measures.compression import compression_ratio

NAME = "zlib_ratio"


def _zlib(data: bytes) -> bytes:
    return zlib.compress(data, 9)


def zlib_ratio(medium, *, seed: int = 0, steps: int = 256, starts: int = 8, transient: int = 0) -> float:
    """Mean ``len(zlib.compress(diagram, 9)) / len(diagram)`` over seeded random starts.

    Each of ``starts`` initial states is uniform over the states at every
    site, drawn from ``rng_for(seed, "measure", "zlib_ratio")``. The diagram
    is the whole medium as built (``n_sites`` cells wide, its own boundary)
    at times ``transient .. transient + steps - 1`` (default: 256 rows starting
    with the random initial row; no transient discarded), packed row after
    row: binary media 8 cells per byte with ``np.packbits`` along the row
    (rows padded to whole bytes), ``k > 2`` one byte per cell. The raw size is
    the packed size, so 1.0 means "no saving"; values can exceed 1 slightly
    on incompressible data (the zlib header and block overhead).

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> zlib_ratio(ElementaryCA(rule=0, width=128)) < zlib_ratio(ElementaryCA(rule=30, width=128))
    True
    """
    return compression_ratio(NAME, _zlib, medium, seed=seed, steps=steps, starts=starts, transient=transient)
