"""Bit-sliced batches: one uint64 word holds the same site of 64 runs.

A batch of ``B`` binary states of ``N`` sites, shape ``(B, N)``, becomes a
``(N, ceil(B / 64))`` uint64 array. The run axis is the innermost and
contiguous one, so a loop over words is a straight vector loop (the
performance design in DEVELOPERS.md). Bit ``j`` of word ``w`` is run
``64 * w + j``; padding runs are zero.
"""

import numpy as np


def words_for(batch: int) -> int:
    """Number of 64-run words needed for ``batch`` runs."""
    return (batch + 63) // 64


def pack(states: np.ndarray) -> np.ndarray:
    """Pack ``(batch, sites)`` 0/1 uint8 states into ``(sites, words)`` uint64."""
    batch, sites = states.shape
    n_words = words_for(batch)
    packed = np.packbits(states.T.astype(bool), axis=1, bitorder="little")
    padded = np.zeros((sites, n_words * 8), dtype=np.uint8)
    padded[:, : packed.shape[1]] = packed
    return padded.view("<u8").astype(np.uint64, copy=False)


def unpack(words: np.ndarray, batch: int) -> np.ndarray:
    """Inverse of :func:`pack` on the last axis: ``(..., words)`` -> ``(..., batch)``."""
    as_bytes = np.ascontiguousarray(words).astype("<u8", copy=False).view(np.uint8)
    bits = np.unpackbits(as_bytes, axis=-1, bitorder="little")
    return bits[..., :batch]
