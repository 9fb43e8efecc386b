"""Bit-sliced numba kernel for binary rule tables of radius ``r``.

The same layout as :mod:`media.eca.kernels`: ``(sites, words)`` uint64, one
word holding one site of 64 runs, runs innermost and contiguous. The rule is
compiled once (:func:`media.ruletable.rules.rule_masks`) into ``2^(2r+1)``
all-ones/all-zeros masks and applied as a multiplexer tree over the
``2r + 1`` neighbours: level 0 picks between masks ``2m`` and ``2m+1`` by the
rightmost neighbour (the least significant bit of the neighbourhood index),
level ``l`` by neighbour ``x(i + r - l)``, and the last level by the leftmost
neighbour. Levels 0 and 1 run as one pass (they read only masks and two
neighbour rows), which halves the rows written. Every level loops over whole
rows of words, so each inner loop is a straight vector loop; words are taken
``BLOCK`` at a time so the level rows stay in cache. The same instructions
serve every rule.

Rows are padded as in :mod:`media.lattice`: entry ``p`` holds cell ``p - r``,
and ``source[p]`` names the cell a padding entry copies after each step
(``-1``: a fixed zero).
"""

import numpy as np

from media.jit import kernel
from media.lattice import _refresh_padding

BLOCK = 128  # words per block (8192 runs): radius 3's widest level then takes 32 KiB


@kernel
def _first_levels(levels, masks, x0, x1, start, n):
    """Levels 0 and 1 in one pass: ``levels[m]`` picks among masks ``4m .. 4m+3`` by ``x1`` (high) and ``x0`` (low)."""
    for m in range(masks.shape[0] // 4):
        m0 = masks[4 * m]
        m1 = masks[4 * m + 1]
        m2 = masks[4 * m + 2]
        m3 = masks[4 * m + 3]
        row = levels[m]
        for w in range(n):
            v0 = x0[start + w]
            v1 = x1[start + w]
            low = (m0 & ~v0) | (m1 & v0)
            high = (m2 & ~v0) | (m3 & v0)
            row[w] = (low & ~v1) | (high & v1)


@kernel
def _mux_row(out, out_start, low, high, x, start, n):
    """``out[out_start + w]`` is ``low[w]`` where ``x[start + w]`` is 0 and ``high[w]`` where it is 1."""
    for w in range(n):
        v = x[start + w]
        out[out_start + w] = (low[w] & ~v) | (high[w] & v)


@kernel
def _step_words(current, nxt, masks, radius, levels, spare):
    n_padded, n_words = current.shape
    width = n_padded - 2 * radius
    span = 2 * radius + 1
    for start in range(0, n_words, BLOCK):
        n = min(BLOCK, n_words - start)
        for i in range(width):
            # Neighbour x(i + j) is padded row i + r + j; level l uses j = r - l, padded row i + 2r - l.
            _first_levels(levels, masks, current[i + 2 * radius], current[i + 2 * radius - 1], start, n)
            src = levels
            dst = spare
            half = masks.shape[0] // 4
            for level in range(2, span - 1):
                x = current[i + 2 * radius - level]
                half //= 2
                for m in range(half):
                    _mux_row(dst[m], 0, src[2 * m], src[2 * m + 1], x, start, n)
                src, dst = dst, src
            _mux_row(nxt[i + radius], start, src[0], src[1], current[i], start, n)


@kernel
def _evolve_words(words, steps, masks, radius, source, clamp_sites, clamp_words, watch, watch_from, out):
    """``words``: ``(width, n_words)``; ``clamp_words``: ``(len(clamp_sites), n_words)``;
    ``out``: ``(steps - watch_from + 1, len(watch), n_words)``."""
    width, n_words = words.shape
    current = np.zeros((width + 2 * radius, n_words), dtype=np.uint64)
    nxt = np.zeros_like(current)
    current[radius : radius + width, :] = words
    _refresh_padding(current, source, radius)
    levels = np.empty((masks.shape[0] // 4, BLOCK), dtype=np.uint64)
    spare = np.empty((max(1, masks.shape[0] // 8), BLOCK), dtype=np.uint64)
    if watch_from == 0:
        for j in range(watch.shape[0]):
            out[0, j, :] = current[radius + watch[j]]
    for t in range(1, steps + 1):
        _step_words(current, nxt, masks, radius, levels, spare)
        for j in range(clamp_sites.shape[0]):
            nxt[radius + clamp_sites[j], :] = clamp_words[j]
        _refresh_padding(nxt, source, radius)
        current, nxt = nxt, current
        if t >= watch_from:
            for j in range(watch.shape[0]):
                out[t - watch_from, j, :] = current[radius + watch[j]]
