"""LZ76 phrase counting and the normalised LZ76 complexity of space-time diagrams.

Sources: Kaspar & Schuster 1987 (Phys. Rev. A 36:842) for the classic parse of
"0001101001000101"; antropy's documented ``lziv_complexity`` examples (via
../shared/reference-values.md), and antropy itself as a test-only reference
on random sequences (it counts LZ76 phrases; packages counting LZ78 phrases
would give 8 for "1001111011000010" and must not be used).
"""

from __future__ import annotations

import numpy as np
import pytest

from media.eca import ElementaryCA
from naive_measures import naive_lz76_normalised, naive_lz76_phrases, seeded_states, stepped_diagram
from probe.measures import MeasureOptionError, lz76_complexity, lz76_normalised, lz76_phrases

antropy = pytest.importorskip("antropy")


# --------------------------------------------------------------------------- worked examples

def test_classic_parse_has_six_phrases():
    # Kaspar & Schuster 1987: 0.001.10.100.1000.101
    assert lz76_phrases("0001101001000101") == 6
    assert naive_lz76_phrases("0001101001000101") == 6


def test_antropy_documented_examples_exactly():
    # antropy lziv_complexity docstring (reference-values.md): 6 phrases, normalised 1.5
    assert lz76_phrases("1001111011000010") == 6
    assert lz76_normalised("1001111011000010", 2) == 1.5
    # antropy docstring: normalised 1.3597696150205727 (five phrases: 0.1.1110.0001.1001)
    assert lz76_normalised("01111000011001", 2) == 1.3597696150205727
    assert lz76_phrases("01111000011001") == 5
    # antropy docstring: 1.0.10
    assert lz76_phrases([1, 0, 1, 0, 1, 0, 1, 0, 1, 0]) == 3
    # antropy docstring: 26 distinct letters are 26 phrases
    assert lz76_phrases("ABCDEFGHIJKLMNOPQRSTUVWXYZ") == 26


def test_short_and_constant_sequences():
    # computed: by the definition, every new symbol opens a phrase; a constant run is 0.000...
    assert lz76_phrases("") == 0
    assert lz76_phrases("1") == 1
    assert lz76_phrases("11") == 2
    assert lz76_phrases("1" * 1000) == 2
    assert lz76_normalised("1", 2) == 0.0


def test_lz78_count_is_not_what_we_compute():
    # reference-values.md pitfall: LZ78 gives 8 for this string, LZ76 gives 6
    assert lz76_phrases("1001111011000010") != 8


# --------------------------------------------------------------------------- kernel against twins

@pytest.mark.parametrize("k", [2, 3, 5])
def test_kernel_agrees_with_naive_definition(k):
    rng = np.random.default_rng(76 + k)
    for length in [1, 2, 3, 7, 20, 63, 150]:
        for _ in range(5):
            sequence = rng.integers(0, k, size=length).tolist()
            assert lz76_phrases(sequence) == naive_lz76_phrases(sequence), sequence
    # structured sequences too: periodic and with long repeats
    for sequence in ([0, 1] * 40, [0, 0, 1] * 30 + [1], [1] * 5 + [0] * 50 + [1] * 5):
        assert lz76_phrases(sequence) == naive_lz76_phrases(sequence)


@pytest.mark.parametrize("k", [2, 4])
def test_kernel_agrees_with_antropy_on_random_sequences(k):
    # antropy.lziv_complexity: a test-only reference implementation of LZ76 phrase counting
    rng = np.random.default_rng(2024 + k)
    for length in [10, 100, 1000, 5000]:
        sequence = rng.integers(0, k, size=length)
        assert lz76_phrases(sequence) == antropy.lziv_complexity(sequence)
    binary = rng.integers(0, 2, size=3000)
    # antropy normalises with b = number of distinct symbols present, 2 here, as we do with b = n_states
    assert lz76_normalised(binary, 2) == pytest.approx(antropy.lziv_complexity(binary, normalize=True), rel=1e-12)


def test_normalised_uses_log_base_of_the_alphabet():
    # computed: c log_b(n) / n
    sequence = [0, 1, 2, 2, 1, 0, 0, 2, 1, 1, 2, 0]
    assert lz76_normalised(sequence, 3) == pytest.approx(naive_lz76_normalised(sequence, 3), rel=1e-12)
    with pytest.raises(MeasureOptionError, match="alphabet_size"):
        lz76_normalised(sequence, 1)


# --------------------------------------------------------------------------- the measure

def test_measure_matches_naive_diagrams():
    # computed: the same seeded starts, diagrams by repeated step, row after row, normalised base 2
    medium = ElementaryCA(rule=110, width=24)
    value = lz76_complexity(medium, seed=3, steps=20, starts=3, transient=2)
    states, _ = seeded_states(medium, "lz76_complexity", 3, 3)
    expected = np.mean([naive_lz76_normalised([v for row in stepped_diagram(medium, s, 2, 20) for v in row], 2)
                        for s in states])
    assert value == pytest.approx(expected, rel=1e-12)


def test_measure_orders_chaotic_above_complex_above_frozen():
    # Zenil 2010 (Complex Systems 19:1), qualitative: random-looking 30 above 110 above null 0
    values = {rule: lz76_complexity(ElementaryCA(rule=rule, width=64), steps=64) for rule in (0, 110, 30)}
    assert values[30] > values[110] > values[0]
    assert 0.9 < values[30] < 1.1  # computed: a random binary sequence normalises to about 1
    assert values[0] < 0.1


def test_measure_is_reproducible_and_depends_on_the_seed():
    medium = ElementaryCA(rule=110, width=32)
    first = lz76_complexity(medium, seed=5, steps=32, starts=2)
    assert lz76_complexity(medium, seed=5, steps=32, starts=2) == first
    assert lz76_complexity(medium, seed=6, steps=32, starts=2) != first
