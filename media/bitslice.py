"""Bit-sliced batches: one uint64 word holds the same site of 64 runs.

A batch of ``B`` binary states of ``N`` sites, shape ``(B, N)``, becomes a
``(N, ceil(B / 64))`` uint64 array. The run axis is the innermost and
contiguous one, so a loop over words is a straight vector loop (the
performance design in DEVELOPERS.md). Bit ``j`` of word ``w`` is run
``64 * w + j``; padding runs are zero.
"""

import numpy as np

from media.jit import kernel


def words_for(batch: int) -> int:
    """Number of 64-run words needed for ``batch`` runs."""
    return (batch + 63) // 64


@kernel
def _pack(states, words):
    batch, sites = states.shape
    accumulator = np.zeros(sites, dtype=np.uint64)
    for word in range(words.shape[1]):
        accumulator[:] = 0
        first = word * 64
        for bit in range(min(64, batch - first)):
            row = states[first + bit]
            shift = np.uint64(bit)
            for site in range(sites):
                accumulator[site] |= np.uint64(row[site] != 0) << shift
        for site in range(sites):
            words[site, word] = accumulator[site]


def pack(states: np.ndarray) -> np.ndarray:
    """Pack ``(batch, sites)`` 0/1 uint8 states into ``(sites, words)`` uint64 (any non-zero counts as 1)."""
    states = np.ascontiguousarray(states, dtype=np.uint8)
    words = np.zeros((states.shape[1], words_for(states.shape[0])), dtype=np.uint64)
    _pack(states, words)
    return words


def unpack(words: np.ndarray, batch: int) -> np.ndarray:
    """Inverse of :func:`pack` on the last axis: ``(..., words)`` -> ``(..., batch)``."""
    as_bytes = np.ascontiguousarray(words).astype("<u8", copy=False).view(np.uint8)
    bits = np.unpackbits(as_bytes, axis=-1, bitorder="little")
    return bits[..., :batch]
