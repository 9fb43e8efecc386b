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


def packed_arguments(medium, initial, steps, watch, watch_from, clamp_sites, clamp_values):
    """Check ``evolve``/``settle`` arguments and pack states and clamp values into words.

    Returns ``(batch, words, steps, watch, watch_from, clamp_sites, clamp_words)``.
    """
    from media.interface import check_evolve_arguments

    initial, steps, watch, watch_from, clamp_sites, clamp_values = check_evolve_arguments(
        medium, initial, steps, watch, watch_from, clamp_sites, clamp_values)
    words = pack(initial)
    clamp_words = pack(clamp_values) if clamp_sites.size else np.zeros((0, words.shape[1]), np.uint64)
    return initial.shape[0], words, steps, watch, watch_from, clamp_sites, clamp_words


def evolve_packed(medium, initial, steps, *, watch, watch_from, clamp_sites, clamp_values, run):
    """The shared body of a bit-sliced ``evolve``.

    ``run(words, steps, clamp_sites, clamp_words, watch, watch_from, out)`` is the medium's kernel call;
    ``out`` is ``(times, len(watch), words)`` uint64. Returns the interface's ``(batch, times, watch)`` uint8.
    """
    batch, words, steps, watch, watch_from, clamp_sites, clamp_words = packed_arguments(
        medium, initial, steps, watch, watch_from, clamp_sites, clamp_values)
    out = np.empty((steps - watch_from + 1, watch.size, words.shape[1]), dtype=np.uint64)
    run(words, steps, clamp_sites, clamp_words, watch, watch_from, out)
    return np.ascontiguousarray(unpack(out, batch).transpose(2, 0, 1))
