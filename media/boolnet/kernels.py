"""Bit-sliced numba kernels for Boolean networks (64 runs per uint64 word).

Every node's update is a truth table over its inputs, compiled once into
all-ones/all-zeros masks, and applied as a multiplexer tree over the inputs
(last input first). Words are processed in blocks so the tree's scratch rows
stay in cache whatever the batch size.
"""

import numpy as np

from media.jit import kernel

BLOCK_WORDS = 64


@kernel
def _step_words(current, nxt, input_ptr, inputs, table_ptr, masks, scratch):
    n_nodes, n_words = current.shape
    for start in range(0, n_words, BLOCK_WORDS):
        stop = min(n_words, start + BLOCK_WORDS)
        for node in range(n_nodes):
            first_input = input_ptr[node]
            n_inputs = input_ptr[node + 1] - first_input
            table = table_ptr[node]
            if n_inputs == 0:
                for w in range(start, stop):
                    nxt[node, w] = masks[table]
                continue
            # Level 1: pair table entries on the last input.
            last = inputs[first_input + n_inputs - 1]
            half = 1 << (n_inputs - 1)
            for m in range(half):
                low = masks[table + 2 * m]
                high = masks[table + 2 * m + 1]
                for w in range(start, stop):
                    x = current[last, w]
                    scratch[m, w - start] = (low & ~x) | (high & x)
            # Further levels: fold on the remaining inputs, last to first.
            for level in range(n_inputs - 2, -1, -1):
                source = inputs[first_input + level]
                half >>= 1
                for m in range(half):
                    for w in range(start, stop):
                        x = current[source, w]
                        scratch[m, w - start] = (scratch[2 * m, w - start] & ~x) | (scratch[2 * m + 1, w - start] & x)
            for w in range(start, stop):
                nxt[node, w] = scratch[0, w - start]


@kernel
def _evolve_words(words, steps, input_ptr, inputs, table_ptr, masks, max_inputs, clamp_sites, clamp_words,
                  watch, watch_from, out):
    current = words.copy()
    nxt = np.empty_like(current)
    scratch = np.empty((max(1, 1 << max(0, max_inputs - 1)), BLOCK_WORDS), dtype=np.uint64)
    if watch_from == 0:
        for j in range(watch.shape[0]):
            out[0, j, :] = current[watch[j]]
    for t in range(1, steps + 1):
        _step_words(current, nxt, input_ptr, inputs, table_ptr, masks, scratch)
        for j in range(clamp_sites.shape[0]):
            nxt[clamp_sites[j], :] = clamp_words[j]
        current, nxt = nxt, current
        if t >= watch_from:
            for j in range(watch.shape[0]):
                out[t - watch_from, j, :] = current[watch[j]]


@kernel
def _settle_words(words, max_steps, input_ptr, inputs, table_ptr, masks, max_inputs, clamp_sites, clamp_words,
                  watch, valid):
    """Floyd's cycle finding on 64 runs per word.

    Returns the meeting state (a state on each run's attractor), a mask of runs
    whose watched sites vary around the attractor, and a mask of runs that
    reached their attractor within ``max_steps``.
    """
    n_nodes, n_words = words.shape
    scratch = np.empty((max(1, 1 << max(0, max_inputs - 1)), BLOCK_WORDS), dtype=np.uint64)
    tortoise = words.copy()
    hare = words.copy()
    spare = np.empty_like(words)
    meet = words.copy()
    met = np.zeros(n_words, dtype=np.uint64)
    for _ in range(max_steps):
        _step_words(tortoise, spare, input_ptr, inputs, table_ptr, masks, scratch)
        for j in range(clamp_sites.shape[0]):
            spare[clamp_sites[j], :] = clamp_words[j]
        tortoise, spare = spare, tortoise
        for _twice in range(2):
            _step_words(hare, spare, input_ptr, inputs, table_ptr, masks, scratch)
            for j in range(clamp_sites.shape[0]):
                spare[clamp_sites[j], :] = clamp_words[j]
            hare, spare = spare, hare
        remaining = np.uint64(0)
        for w in range(n_words):
            differ = np.uint64(0)
            for node in range(n_nodes):
                differ |= tortoise[node, w] ^ hare[node, w]
            fresh = ~differ & ~met[w] & valid[w]
            if fresh:
                for node in range(n_nodes):
                    meet[node, w] = (meet[node, w] & ~fresh) | (tortoise[node, w] & fresh)
                met[w] |= fresh
            remaining |= valid[w] & ~met[w]
        if remaining == 0:
            break
    # Walk once around each cycle from the meeting state, noting any change on the watched sites.
    walker = meet.copy()
    returned = ~met & valid  # runs that never met are not walked
    varies = np.zeros(n_words, dtype=np.uint64)
    for _ in range(max_steps):
        _step_words(walker, spare, input_ptr, inputs, table_ptr, masks, scratch)
        for j in range(clamp_sites.shape[0]):
            spare[clamp_sites[j], :] = clamp_words[j]
        walker, spare = spare, walker
        remaining = np.uint64(0)
        for w in range(n_words):
            active = ~returned[w] & valid[w]
            changed = np.uint64(0)
            for j in range(watch.shape[0]):
                changed |= walker[watch[j], w] ^ meet[watch[j], w]
            varies[w] |= changed & active
            back = ~np.uint64(0)
            for node in range(n_nodes):
                back &= ~(walker[node, w] ^ meet[node, w])
            returned[w] |= back & active
            remaining |= valid[w] & ~returned[w]
        if remaining == 0:
            break
    return meet, varies, met
