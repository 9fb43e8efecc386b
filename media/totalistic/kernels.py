"""Numba kernel for totalistic automata.

States are held site-major, ``(padded sites, batch)`` uint8, so the inner
loops run over the batch, contiguous. Each cell's neighbourhood sum is
slid along the row: ``sum(i) = sum(i-1) + x(i+r) - x(i-1-r)``, two
operations per cell whatever the radius, then looked up in the code's table.
Sums are kept in uint8: an intermediate may wrap, the final sum (at most
``7 * 7 = 49``) is exact.

The padded layout is the one of :mod:`media.lattice`: entry ``p`` holds cell
``p - r``; ``source[p]`` names the cell a padding entry copies after each
step, or ``-1`` for a fixed zero.
"""

import numpy as np

from media.jit import kernel
from media.lattice import _refresh_padding


@kernel
def _step_sites(current, nxt, table, radius, total):
    n_padded, batch = current.shape
    width = n_padded - 2 * radius
    for b in range(batch):
        total[b] = 0
    for p in range(2 * radius + 1):
        row = current[p]
        for b in range(batch):
            total[b] += row[b]
    out = nxt[radius]
    for b in range(batch):
        out[b] = table[total[b]]
    for i in range(1, width):
        enter = current[i + 2 * radius]
        leave = current[i - 1]
        out = nxt[radius + i]
        # Two loops: the first vectorises; the table lookup (a gather) does not.
        for b in range(batch):
            total[b] = total[b] + enter[b] - leave[b]  # uint8 wraps, but every true sum is <= 7 * 7 = 49
        for b in range(batch):
            out[b] = table[total[b]]


@kernel
def _evolve_sites(sites, steps, table, radius, source, clamp_sites, clamp_values, watch, watch_from, out):
    """``sites``: ``(width, batch)``; ``clamp_values``: ``(len(clamp_sites), batch)``;
    ``out``: ``(steps - watch_from + 1, len(watch), batch)``."""
    width, batch = sites.shape
    current = np.zeros((width + 2 * radius, batch), dtype=np.uint8)
    nxt = np.zeros_like(current)
    current[radius : radius + width, :] = sites
    _refresh_padding(current, source, radius)
    total = np.zeros(batch, dtype=np.uint8)
    if watch_from == 0:
        for j in range(watch.shape[0]):
            out[0, j, :] = current[radius + watch[j]]
    for t in range(1, steps + 1):
        _step_sites(current, nxt, table, radius, total)
        for j in range(clamp_sites.shape[0]):
            nxt[radius + clamp_sites[j], :] = clamp_values[j]
        _refresh_padding(nxt, source, radius)
        current, nxt = nxt, current
        if t >= watch_from:
            for j in range(watch.shape[0]):
                out[t - watch_from, j, :] = current[radius + watch[j]]
