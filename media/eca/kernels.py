"""Bit-sliced numba kernels for elementary rules.

The rule is compiled once into eight all-ones/all-zeros masks, one per
neighbourhood, and applied as a three-level multiplexer on 64 runs at a time:
the same instructions serve every rule, and the word loop vectorises.
"""

import numpy as np

from numba import prange

from media.jit import kernel, parallel_kernel

ALL_ONES = np.uint64(0xFFFFFFFFFFFFFFFF)


def rule_masks(rule: int) -> np.ndarray:
    """Eight uint64 masks: all ones where bit ``index`` of ``rule`` is set."""
    return np.array([ALL_ONES if (rule >> index) & 1 else 0 for index in range(8)], dtype=np.uint64)


@kernel
def _apply_rule_row(out, left, centre, right, masks):
    m0, m1, m2, m3 = masks[0], masks[1], masks[2], masks[3]
    m4, m5, m6, m7 = masks[4], masks[5], masks[6], masks[7]
    for w in range(out.shape[0]):
        l = left[w]
        c = centre[w]
        r = right[w]
        nr = ~r
        a0 = (m0 & nr) | (m1 & r)
        a1 = (m2 & nr) | (m3 & r)
        a2 = (m4 & nr) | (m5 & r)
        a3 = (m6 & nr) | (m7 & r)
        nc = ~c
        b0 = (a0 & nc) | (a1 & c)
        b1 = (a2 & nc) | (a3 & c)
        out[w] = (b0 & ~l) | (b1 & l)


@kernel
def _step_words(current, nxt, masks, periodic, zero_row):
    n_sites = current.shape[0]
    if n_sites == 1:
        edge = current[0] if periodic else zero_row
        _apply_rule_row(nxt[0], edge, current[0], edge, masks)
        return
    for i in range(1, n_sites - 1):
        _apply_rule_row(nxt[i], current[i - 1], current[i], current[i + 1], masks)
    if periodic:
        _apply_rule_row(nxt[0], current[n_sites - 1], current[0], current[1], masks)
        _apply_rule_row(nxt[n_sites - 1], current[n_sites - 2], current[n_sites - 1], current[0], masks)
    else:
        _apply_rule_row(nxt[0], zero_row, current[0], current[1], masks)
        _apply_rule_row(nxt[n_sites - 1], current[n_sites - 2], current[n_sites - 1], zero_row, masks)


@kernel
def _evolve_block(current, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out):
    """Evolve one contiguous block of words through every step; ``current`` is overwritten."""
    nxt = np.empty_like(current)
    zero_row = np.zeros(current.shape[1], dtype=np.uint64)
    if watch_from == 0:
        for j in range(watch.shape[0]):
            out[0, j, :] = current[watch[j]]
    for t in range(1, steps + 1):
        _step_words(current, nxt, masks, periodic, zero_row)
        for j in range(clamp_sites.shape[0]):
            nxt[clamp_sites[j], :] = clamp_words[j]
        current, nxt = nxt, current
        if t >= watch_from:
            for j in range(watch.shape[0]):
                out[t - watch_from, j, :] = current[watch[j]]


@kernel
def _evolve_one_block(words, block, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out,
                      block_words):
    start = block * block_words
    stop = min(words.shape[1], start + block_words)
    current = np.ascontiguousarray(words[:, start:stop])
    block_clamps = np.ascontiguousarray(clamp_words[:, start:stop])
    block_out = np.empty((out.shape[0], out.shape[1], stop - start), dtype=np.uint64)
    _evolve_block(current, steps, masks, periodic, clamp_sites, block_clamps, watch, watch_from, block_out)
    out[:, :, start:stop] = block_out


@kernel
def _evolve_words_serial(words, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out,
                         block_words):
    for block in range((words.shape[1] + block_words - 1) // block_words):
        _evolve_one_block(words, block, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out,
                          block_words)


@parallel_kernel
def _evolve_words(words, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out, block_words):
    """Runs are independent, so blocks of words go through all steps on their own (one block per thread
    at a time, each small enough to stay in cache)."""
    for block in prange((words.shape[1] + block_words - 1) // block_words):
        _evolve_one_block(words, block, steps, masks, periodic, clamp_sites, clamp_words, watch, watch_from, out,
                          block_words)


def block_words_for(n_sites: int) -> int:
    """Words per block so that two state arrays of a block fit in about 256 KiB of cache."""
    return int(max(4, min(1024, (256 * 1024) // (16 * max(1, n_sites)))))
