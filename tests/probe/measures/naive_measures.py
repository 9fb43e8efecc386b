"""Slow, obvious twins of the measures, written from the published definitions.

No numba and no code shared with ``probe.measures`` beyond the seeded draws
(``rng_for(seed, "measure", <name>)`` in the documented order: initial
states, then the changed site, then the shift of its value), which are what
"seeded random initial conditions" means. Diagrams come from looping
``medium.step``, not from the medium's fast ``evolve``.
"""

from __future__ import annotations

import math
from collections import Counter

import numpy as np

from probe.seeding import rng_for


# --------------------------------------------------------------------------- LZ76

def naive_lz76_phrases(sequence) -> int:
    """Lempel & Ziv 1976 by the definition: each phrase is the shortest piece starting where the last
    one ended that does not occur in the text before its own last symbol (copies may overlap);
    an incomplete last phrase counts."""
    text = tuple(sequence)
    n = len(text)
    position = 0
    phrases = 0
    while position < n:
        length = 1
        while position + length <= n and _occurs(text[position:position + length], text[:position + length - 1]):
            length += 1
        phrases += 1
        position += length
    return phrases


def _occurs(piece, text) -> bool:
    size = len(piece)
    return any(text[i:i + size] == piece for i in range(len(text) - size + 1))


def naive_lz76_normalised(sequence, base: int) -> float:
    n = len(sequence)
    return naive_lz76_phrases(sequence) * math.log(n) / math.log(base) / n


# --------------------------------------------------------------------------- diagrams

def seeded_states(medium, name: str, seed: int, starts: int):
    """The documented draws: states, then (for damage measures) the sites and value shifts."""
    rng = rng_for(seed, "measure", name)
    states = rng.integers(0, medium.n_states, size=(starts, medium.n_sites), dtype=np.uint8)
    return states, rng


def stepped_diagram(medium, state, first: int, rows: int) -> list:
    """Rows at times ``first .. first + rows - 1`` of one start, by repeated ``step``."""
    current = np.asarray(state, dtype=np.uint8).reshape(1, -1)
    out = []
    for time in range(first + rows):
        if time >= first:
            out.append([int(v) for v in current[0]])
        current = medium.step(current)
    return out


def naive_pack(rows: list, k: int) -> bytes:
    """Binary: 8 cells per byte, first cell in the top bit, each row padded with 0 bits; else 1 byte/cell."""
    out = bytearray()
    for row in rows:
        if k == 2:
            for start in range(0, len(row), 8):
                bits = row[start:start + 8] + [0] * (8 - len(row[start:start + 8]))
                out.append(sum(bit << (7 - j) for j, bit in enumerate(bits)))
        else:
            out.extend(row)
    return bytes(out)


def naive_compression_ratio(medium, name, compress, seed, steps, starts, transient) -> float:
    states, _ = seeded_states(medium, name, seed, starts)
    ratios = []
    for state in states:
        raw = naive_pack(stepped_diagram(medium, state, transient, steps), medium.n_states)
        ratios.append(len(compress(raw)) / len(raw))
    return sum(ratios) / len(ratios)


def naive_block_entropy(medium, seed, block, steps, starts, transient) -> float:
    states, _ = seeded_states(medium, "block_entropy", seed, starts)
    counts = Counter()
    for state in states:
        for row in stepped_diagram(medium, state, transient, steps):
            n = len(row)
            for i in range(n):
                counts[tuple(row[(i + j) % n] for j in range(block))] += 1
    total = sum(counts.values())
    return -sum(c / total * math.log2(c / total) for c in counts.values()) / block


def naive_distances(medium, name, seed, starts, steps) -> list:
    """Hamming distance after ``steps`` between each start and its one-site-changed copy."""
    states, rng = seeded_states(medium, name, seed, starts)
    sites = rng.integers(0, medium.n_sites, size=starts)
    shifts = rng.integers(1, medium.n_states, size=starts)
    out = []
    for state, site, shift in zip(states, sites, shifts):
        changed = state.copy()
        changed[site] = (int(changed[site]) + int(shift)) % medium.n_states
        assert changed[site] != state[site]
        a = stepped_diagram(medium, state, steps, 1)[0]
        b = stepped_diagram(medium, changed, steps, 1)[0]
        out.append(sum(x != y for x, y in zip(a, b)))
    return out


# --------------------------------------------------------------------------- Boolean functions

def naive_average_sensitivity(table, n_inputs: int) -> float:
    """Shmulevich & Kauffman 2004: mean over rows of the inputs whose flip changes the output.
    Rows are written out as bit tuples, first input most significant."""
    rows = [tuple((row >> (n_inputs - 1 - i)) & 1 for i in range(n_inputs)) for row in range(2 ** n_inputs)]
    index = {bits: row for row, bits in enumerate(rows)}
    total = 0
    for bits in rows:
        for i in range(n_inputs):
            flipped = list(bits)
            flipped[i] ^= 1
            total += table[index[bits]] != table[index[tuple(flipped)]]
    return total / len(rows)
