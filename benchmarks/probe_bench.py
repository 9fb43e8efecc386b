"""Benchmark of the probe workload: many runs of one elementary rule, bit-sliced.

Everything is measured in this one process, so the ratios compare like with
like on whatever machine runs it:

* our kernel (``media.eca.kernels._evolve_words``) on one thread and on all cores,
  for general rules and for rule 90;
* a plain NumPy lookup-table loop on the same workload (uint8 states, one
  table lookup per cell per step);
* a ceiling kernel: rule 90 as a single XOR per word, in the same memory
  layout and with the same blocking;
* the default survey end to end, split into evaluate, tally and write.

The last line is ``ratio_vs_numpy=<x> ceiling_fraction=<y> tally_share=<z> core_scaling=<w>``:
the slowest general rule single-threaded over NumPy, that rule over the
ceiling (both single-threaded), the tally's share of the survey time, and the
all-cores over one-thread speed of the slowest general rule.
Run it with ``make bench``.
"""

from __future__ import annotations

import argparse
import tempfile
import time

import numpy as np
from numba import prange

from media import bitslice
from media.eca.kernels import _evolve_words, block_words_for, rule_masks
from media.jit import kernel, parallel_kernel, set_threads

GENERAL_RULES = (30, 45, 54, 110)  # chaotic and complex rules, none of them linear


@kernel
def _xor_block(current, steps):
    n_sites = current.shape[0]
    nxt = np.empty_like(current)
    for _ in range(steps):
        for i in range(n_sites):
            left = current[i - 1] if i > 0 else current[n_sites - 1]
            right = current[i + 1] if i < n_sites - 1 else current[0]
            row = nxt[i]
            for w in range(row.shape[0]):
                row[w] = left[w] ^ right[w]
        current, nxt = nxt, current
    return current


@parallel_kernel
def _xor_ceiling(words, steps, block_words):
    n_words = words.shape[1]
    n_blocks = (n_words + block_words - 1) // block_words
    for block in prange(n_blocks):
        start = block * block_words
        stop = min(n_words, start + block_words)
        words[:, start:stop] = _xor_block(np.ascontiguousarray(words[:, start:stop]), steps)


def best_time(function, repeats: int) -> float:
    function()  # warm-up: compilation and caches
    best = float("inf")
    for _ in range(repeats):
        started = time.perf_counter()
        function()
        best = min(best, time.perf_counter() - started)
    return best


def kernel_rate(rule: int, words: np.ndarray, steps: int, repeats: int) -> float:
    masks = rule_masks(rule)
    empty = np.zeros(0, dtype=np.int64)
    clamps = np.zeros((0, words.shape[1]), dtype=np.uint64)
    out = np.empty((1, 0, words.shape[1]), dtype=np.uint64)
    block = block_words_for(words.shape[0])
    seconds = best_time(lambda: _evolve_words(words, steps, masks, True, empty, clamps, empty, steps, out, block),
                        repeats)
    return words.shape[0] * words.shape[1] * 64 * steps / seconds


def ceiling_rate(words: np.ndarray, steps: int, repeats: int) -> float:
    block = block_words_for(words.shape[0])
    seconds = best_time(lambda: _xor_ceiling(words.copy(), steps, block), repeats)
    return words.shape[0] * words.shape[1] * 64 * steps / seconds


def numpy_rate(rule: int, states: np.ndarray, steps: int, repeats: int) -> float:
    table = np.array([(rule >> index) & 1 for index in range(8)], dtype=np.uint8)

    def run():
        x = states
        for _ in range(steps):
            x = table[4 * np.roll(x, 1, axis=1) + 2 * x + np.roll(x, -1, axis=1)]
        return x

    return states.size * steps / best_time(run, repeats)


def survey_split(config_path: str) -> dict:
    from probe.survey import run_survey

    with tempfile.TemporaryDirectory() as folder:
        return run_survey(config_path, folder, progress=False, figure=True).timings


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sites", type=int, default=64)
    parser.add_argument("--runs", type=int, default=2**20, help="runs in the batch (multiple of 64)")
    parser.add_argument("--steps", type=int, default=200)
    parser.add_argument("--numpy-steps", type=int, default=4, help="steps timed for the slow NumPy baseline")
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--config", default="configs/eca-survey.toml")
    args = parser.parse_args(argv)

    rng = np.random.default_rng(0)
    states = rng.integers(0, 2, size=(args.runs, args.sites), dtype=np.uint8)
    words = bitslice.pack(states)
    giga = 1e9
    print(f"workload: {args.runs:,} runs x {args.sites} sites (ring), {words.shape[1]} words per site; "
          f"rates in cell updates per second (best of {args.repeats})")

    cores = set_threads(None)
    set_threads(1)
    single = {rule: kernel_rate(rule, words, args.steps, args.repeats) for rule in (*GENERAL_RULES, 90)}
    ceiling = ceiling_rate(words, args.steps, args.repeats)
    set_threads(cores)
    multi = {rule: kernel_rate(rule, words, args.steps, args.repeats) for rule in (*GENERAL_RULES, 90)}
    ceiling_all = ceiling_rate(words, args.steps, args.repeats)
    baseline = numpy_rate(110, states, args.numpy_steps, max(1, args.repeats // 2))

    print(f"{'kernel':<28}{'1 thread':>14}{f'{cores} threads':>14}")
    for rule in (*GENERAL_RULES, 90):
        print(f"{f'our kernel, rule {rule}':<28}{single[rule] / giga:>12.2f} G{multi[rule] / giga:>12.2f} G")
    print(f"{'ceiling: rule 90 as one XOR':<28}{ceiling / giga:>12.2f} G{ceiling_all / giga:>12.2f} G")
    print(f"{'NumPy lookup table, rule 110':<28}{baseline / giga:>12.3f} G")

    slowest = min(GENERAL_RULES, key=lambda rule: single[rule])
    ratio_vs_numpy = single[slowest] / baseline
    ceiling_fraction = single[slowest] / ceiling
    core_scaling = multi[slowest] / single[slowest]

    timings = survey_split(args.config)
    total = timings["total"]
    parts = ("evaluate", "tally", "measure", "write")
    other = max(0.0, total - sum(timings.get(part, 0.0) for part in parts))
    print(f"default survey ({args.config}): total {total:.2f} s = "
          + " + ".join(f"{part} {timings.get(part, 0.0):.2f} s" for part in parts) + f" (+ other {other:.2f} s)")
    tally_share = timings["tally"] / total
    print(f"slowest general rule: {slowest}")
    print(f"ratio_vs_numpy={ratio_vs_numpy:.1f} ceiling_fraction={ceiling_fraction:.3f} "
          f"tally_share={tally_share:.3f} core_scaling={core_scaling:.2f}")


if __name__ == "__main__":
    main()
