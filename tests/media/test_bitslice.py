"""Bit-sliced packing: one uint64 word holds the same site of 64 runs."""

import numpy as np
import pytest

from media.bitslice import pack, unpack, words_for

BATCHES = (1, 63, 64, 65, 200)


@pytest.mark.parametrize("batch", BATCHES)
@pytest.mark.parametrize("sites", [1, 3, 17])
def test_round_trip(batch, sites):
    states = np.random.default_rng(batch * 31 + sites).integers(0, 2, size=(batch, sites), dtype=np.uint8)
    words = pack(states)
    assert words.dtype == np.uint64
    assert words.shape == (sites, words_for(batch)) == (sites, -(-batch // 64))
    back = unpack(words, batch)
    assert back.shape == (sites, batch)
    assert np.array_equal(back.T, states)


@pytest.mark.parametrize("batch", BATCHES)
def test_bit_j_of_word_w_is_run_64w_plus_j(batch):
    sites = 3
    for run in sorted({r for r in (0, 1, 62, 63, 64, batch // 2, batch - 2, batch - 1) if 0 <= r < batch}):
        for site in range(sites):
            states = np.zeros((batch, sites), dtype=np.uint8)
            states[run, site] = 1
            words = pack(states)
            expected = np.zeros_like(words)
            expected[site, run // 64] = np.uint64(1) << np.uint64(run % 64)
            assert np.array_equal(words, expected), (batch, run, site)


def test_word_values_by_hand():
    states = np.zeros((130, 2), dtype=np.uint8)
    states[[0, 2, 63], 0] = 1  # word 0 of site 0: bits 0, 2, 63
    states[[64, 129], 1] = 1  # site 1: bit 0 of word 1, bit 1 of word 2
    words = pack(states)
    assert words[0].tolist() == [(1 << 0) | (1 << 2) | (1 << 63), 0, 0]
    assert words[1].tolist() == [0, 1, 2]


@pytest.mark.parametrize("batch", BATCHES)
def test_padding_runs_are_zero(batch):
    words = pack(np.ones((batch, 2), dtype=np.uint8))
    used = batch % 64 or 64
    assert words[:, :-1].tolist() == [[2**64 - 1] * (words.shape[1] - 1)] * 2
    assert words[:, -1].tolist() == [2**used - 1] * 2


def test_unpack_works_on_the_last_axis_of_any_shape():
    rng = np.random.default_rng(5)
    batch = 70
    runs = rng.integers(0, 2, size=(4, 3, batch), dtype=np.uint8)  # (time, site, run)
    words = np.stack([pack(runs[t].T) for t in range(4)])  # (time, site, words)
    assert words.shape == (4, 3, 2)
    assert np.array_equal(unpack(words, batch), runs)
