"""Normalised Lempel-Ziv (LZ76) complexity of space-time diagrams.

Phrase counting as in Lempel & Ziv 1976 with the algorithm of Kaspar &
Schuster 1987 (Phys. Rev. A 36:842): the sequence is cut, left to right,
into the fewest phrases such that each phrase but the last is the shortest
piece that cannot be copied from earlier (overlapping) text; ``c(n)`` counts
the phrases, the last one included even when it is incomplete.
"0001101001000101" parses as 0.001.10.100.1000.101, c = 6. The normalised
complexity is ``c(n) * log_b(n) / n`` with ``b`` the alphabet size; it is
near 1 for long uniform random sequences and near 0 for regular ones.
"""

from __future__ import annotations

import math

import numpy as np

from media.jit import kernel
from probe.measures.diagrams import random_states, space_time
from probe.measures.registry import MeasureOptionError, whole_number
from probe.seeding import rng_for

NAME = "lz76_complexity"


@kernel
def _lz76_phrases(symbols):
    """Kaspar & Schuster's phrase count over an int64 array."""
    n = symbols.shape[0]
    if n < 2:
        return n
    phrases = 1
    prefix = 1  # length of the text already parsed
    start = 0  # where the copy being tried starts in the parsed text
    length = 1  # length of the current match
    longest = 1  # longest match found for this phrase
    while True:
        if symbols[start + length - 1] == symbols[prefix + length - 1]:
            length += 1
            if prefix + length > n:
                phrases += 1  # the text ends inside a copy: an incomplete last phrase
                break
        else:
            if length > longest:
                longest = length
            start += 1
            if start == prefix:  # no copy is longer: the phrase ends with one new symbol
                phrases += 1
                prefix += longest
                if prefix + 1 > n:
                    break
                start = 0
                length = 1
                longest = 1
            else:
                length = 1
    return phrases


def _symbols(sequence) -> np.ndarray:
    if isinstance(sequence, str):
        return np.fromiter(map(ord, sequence), dtype=np.int64, count=len(sequence))
    return np.ascontiguousarray(np.asarray(sequence).reshape(-1), dtype=np.int64)


def lz76_phrases(sequence) -> int:
    """The LZ76 phrase count ``c(n)`` of a string or a 1-D sequence of integers.

    Examples
    --------
    >>> lz76_phrases("0001101001000101")  # Kaspar & Schuster 1987
    6
    >>> lz76_phrases([1, 0, 1, 0, 1, 0, 1, 0, 1, 0])  # 1.0.10 (antropy's documented example)
    3
    """
    return int(_lz76_phrases(_symbols(sequence)))


def lz76_normalised(sequence, alphabet_size: int) -> float:
    """``c(n) * log_b(n) / n`` with ``b = alphabet_size``; 0.0 for sequences shorter than 2.

    Examples
    --------
    >>> lz76_normalised("1001111011000010", 2)  # antropy's documented example
    1.5
    """
    if isinstance(alphabet_size, bool) or not isinstance(alphabet_size, (int, np.integer)) or alphabet_size < 2:
        raise MeasureOptionError(f"lz76_normalised: alphabet_size = {alphabet_size!r} must be a whole number >= 2")
    symbols = _symbols(sequence)
    n = symbols.size
    if n < 2:
        return 0.0
    # c / (n / log_b n), in this order, reproduces antropy's published values to the last bit
    return float(_lz76_phrases(symbols) / (n / math.log(n, int(alphabet_size))))


def lz76_complexity(medium, *, seed: int = 0, steps: int = 256, starts: int = 8, transient: int = 0) -> float:
    """Mean normalised LZ76 complexity of space-time diagrams from seeded random starts.

    ``starts`` initial states, uniform over the states at every site, from
    ``rng_for(seed, "measure", "lz76_complexity")``; each diagram is the
    medium as built at times ``transient .. transient + steps - 1`` (default
    256 rows from the random initial row), read row after row into one
    sequence of ``n = steps * n_sites`` symbols and normalised by
    ``c(n) * log_b(n) / n`` with ``b = n_states``. No units; about 1 for a
    random diagram, near 0 for a frozen one.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> frozen = lz76_complexity(ElementaryCA(rule=0, width=32), steps=32)
    >>> chaotic = lz76_complexity(ElementaryCA(rule=30, width=32), steps=32)
    >>> frozen < 0.2 < chaotic
    True
    """
    steps = whole_number(steps, "steps", NAME)
    starts = whole_number(starts, "starts", NAME)
    transient = whole_number(transient, "transient", NAME, minimum=0)
    rng = rng_for(seed, "measure", NAME)
    diagrams = space_time(medium, random_states(medium, starts, rng), steps, transient)
    return float(np.mean([lz76_normalised(diagram.reshape(-1), int(medium.n_states)) for diagram in diagrams]))
