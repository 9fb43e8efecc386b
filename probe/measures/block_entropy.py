"""Entropy density of rows: Shannon entropy of length-L blocks divided by L, in bits per cell.

The plug-in (maximum-likelihood) estimate ``H_L = -sum p(b) log2 p(b)`` over
the blocks ``b`` of ``L`` consecutive cells, pooled over every row of every
diagram, divided by ``L``. ``H_L / L`` bounds the entropy density of the
rows from above and approaches it as ``L`` grows (Grassberger 1986,
Int. J. Theor. Phys. 25:907). A frozen or uniform row gives 0; independent
uniform cells give ``log2(n_states)`` bits per cell.
"""

from __future__ import annotations

import math

import numpy as np

from probe.measures.diagrams import random_states, space_time
from probe.measures.registry import MeasureOptionError, MeasureUnavailable, medium_label, whole_number
from probe.seeding import rng_for

NAME = "block_entropy"
MAX_BLOCK_CODES = 2**62  # block codes are int64


def block_codes(rows: np.ndarray, block: int, n_states: int) -> np.ndarray:
    """The number of every length-``block`` block of every row, the row read as a ring.

    Block ``(x_i, ..., x_{i+L-1})`` (indices mod the row length) becomes
    ``sum_j x_{i+j} k^(L-1-j)``; one code per row and start position ``i``.
    """
    rows = np.asarray(rows, dtype=np.int64)
    codes = np.zeros(rows.shape, dtype=np.int64)
    for offset in range(block):
        codes = codes * int(n_states) + np.roll(rows, -offset, axis=-1)
    return codes.reshape(-1)


def entropy_bits(codes: np.ndarray) -> float:
    """Plug-in Shannon entropy, log base 2, of the empirical distribution of ``codes``."""
    _, counts = np.unique(codes, return_counts=True)
    p = counts / counts.sum()
    return float(max(0.0, -(p * np.log2(p)).sum()))


def block_entropy(medium, *, seed: int = 0, block: int = 4, steps: int = 256, starts: int = 8,
                  transient: int = 32) -> float:
    """Entropy of length-``block`` row blocks divided by ``block``: bits per cell (log base 2).

    ``starts`` initial states, uniform over the states at every site, from
    ``rng_for(seed, "measure", "block_entropy")``; ``transient`` steps are
    discarded and the rows at times ``transient .. transient + steps - 1`` of
    every start are pooled. Each row is read as a ring (blocks wrap around
    from the last site to the first), giving ``n_sites`` blocks per row. For
    a medium whose sites are not a row (a Boolean network) the blocks follow
    node order, which is a convention, not a geometry. At most
    ``log2(n_states)``; 0 for a medium that freezes into one uniform state.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> block_entropy(ElementaryCA(rule=0, width=32), steps=8)
    0.0
    """
    block = whole_number(block, "block", NAME, minimum=1)
    if block > medium.n_sites:
        raise MeasureUnavailable(f"measure {NAME!r}: blocks of {block} sites need a medium of at least {block} "
                                 f"sites; {medium_label(medium)} is smaller (choose a shorter block)")
    steps = whole_number(steps, "steps", NAME)
    starts = whole_number(starts, "starts", NAME)
    transient = whole_number(transient, "transient", NAME, minimum=0)
    if block * math.log2(int(medium.n_states)) > math.log2(MAX_BLOCK_CODES):
        raise MeasureOptionError(f"measure {NAME!r}: option block = {block} gives {medium.n_states}^{block} block "
                                 f"values, more than 2^62; use a shorter block")
    rng = rng_for(seed, "measure", NAME)
    diagrams = space_time(medium, random_states(medium, starts, rng), steps, transient)
    return entropy_bits(block_codes(diagrams, block, int(medium.n_states))) / block
