"""Compressibility of space-time diagrams under zlib and lzma.

Source for the ordering: Zenil 2010 (Complex Systems 19:1), qualitative, via
../shared/reference-values.md: from random initial conditions, class 3
(30, 45) > class 4 (110) > class 2 (4, 108) > class 1 (0).
"""

from __future__ import annotations

import lzma
import zlib

import numpy as np
import pytest

from media.eca import ElementaryCA
from naive_measures import naive_compression_ratio, naive_pack
from probe.measures import compute_measure, lzma_ratio, zlib_ratio
from probe.measures.diagrams import packed
from ternary_medium import SumModThree

MEASURES = {"zlib_ratio": zlib_ratio, "lzma_ratio": lzma_ratio}
COMPRESSORS = {"zlib_ratio": lambda data: zlib.compress(data, 9),
               "lzma_ratio": lambda data: lzma.compress(data, preset=9)}


@pytest.mark.parametrize("name", MEASURES)
@pytest.mark.parametrize("seed", [0, 1])
def test_zenil_ordering_from_random_starts(name, seed):
    # Zenil 2010, qualitative: 30 and 45 above 110, 110 above 4 and 108, those above 0
    ratio = {rule: MEASURES[name](ElementaryCA(rule=rule, width=128), seed=seed) for rule in (0, 4, 108, 110, 30, 45)}
    assert min(ratio[30], ratio[45]) > ratio[110]
    assert ratio[110] > max(ratio[4], ratio[108])
    assert min(ratio[4], ratio[108]) > ratio[0]
    assert ratio[30] > 0.95  # computed: a random-looking diagram hardly compresses


@pytest.mark.parametrize("name", MEASURES)
def test_agrees_with_naive_packing_and_stepping(name):
    # computed: hand-packed bits (first cell in the top bit, rows padded) of step-by-step diagrams
    medium = ElementaryCA(rule=110, width=13)  # 13 cells: two bytes per row, three pad bits
    expected = naive_compression_ratio(medium, name, COMPRESSORS[name], seed=4, steps=40, starts=3, transient=5)
    assert MEASURES[name](medium, seed=4, steps=40, starts=3, transient=5) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("name", MEASURES)
def test_three_state_medium_packs_one_byte_per_cell(name):
    # computed: k = 3 cells are stored one per byte
    medium = SumModThree(width=10)
    expected = naive_compression_ratio(medium, name, COMPRESSORS[name], seed=2, steps=30, starts=2, transient=0)
    assert MEASURES[name](medium, seed=2, steps=30, starts=2) == pytest.approx(expected, rel=1e-12)


def test_packing():
    # computed: binary rows 8 cells per byte, first cell most significant, padded per row
    rows = np.array([[1, 0, 0, 0, 0, 0, 0, 1, 1], [0, 1, 0, 0, 0, 0, 0, 0, 0]], dtype=np.uint8)
    assert packed(rows, 2) == bytes([0b10000001, 0b10000000, 0b01000000, 0])
    assert packed(rows, 2) == naive_pack(rows.tolist(), 2)
    assert packed(np.array([[2, 0, 1]], dtype=np.uint8), 3) == bytes([2, 0, 1])


@pytest.mark.parametrize("name", MEASURES)
def test_reproducible_for_a_seed_and_different_across_seeds(name):
    medium = ElementaryCA(rule=110, width=64)
    first = compute_measure(name, medium, seed=9, steps=64)
    assert compute_measure(name, medium, seed=9, steps=64) == first
    assert compute_measure(name, medium, seed=10, steps=64) != first
