"""Compressibility of space-time diagrams under lzma (LZMA2 in the xz container, preset 9).

Same diagrams, packing and random starts as ``zlib_ratio``; a stronger
compressor with a larger fixed overhead (the xz header and footer, about
60 bytes), so highly regular diagrams have a larger floor than under zlib.
"""

from __future__ import annotations

import lzma

from probe.measures.compression import compression_ratio

NAME = "lzma_ratio"


def _lzma(data: bytes) -> bytes:
    return lzma.compress(data, preset=9)


def lzma_ratio(medium, *, seed: int = 0, steps: int = 256, starts: int = 8, transient: int = 0) -> float:
    """Mean ``len(lzma.compress(diagram, preset=9)) / len(diagram)`` over seeded random starts.

    Initial conditions, diagram and packing exactly as in
    :func:`probe.measures.zlib_ratio.zlib_ratio`, with the generator
    ``rng_for(seed, "measure", "lzma_ratio")``: ``starts`` (8) uniform random
    states, rows at times ``transient .. transient + steps - 1`` (0 .. 255),
    binary cells 8 per byte, ``k > 2`` one byte per cell, raw size = packed size.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> lzma_ratio(ElementaryCA(rule=0, width=128)) < lzma_ratio(ElementaryCA(rule=30, width=128))
    True
    """
    return compression_ratio(NAME, _lzma, medium, seed=seed, steps=steps, starts=starts, transient=transient)
