"""Complexity measures of a medium: one function per measure, one uniform signature.

Every measure is ``<name>(medium, *, seed=0, **options) -> float`` in the
module ``probe/measures/<name>.py``; its result column is ``m_<name>``.
``MEASURES`` lists them by name, and :func:`compute_measure` is the checked
entry point: it refuses an unknown name (suggesting the nearest), an
unknown option, and a medium without the capability the measure needs,
each with :class:`MeasureUnavailable` or :class:`MeasureOptionError` (both
``ProbeInputError``, so ``ValueError``). Every random choice draws from
``probe.seeding.rng_for(seed, "measure", <name>)``.

Examples
--------
>>> from media.eca import ElementaryCA
>>> compute_measure("langton_lambda", ElementaryCA(rule=30))
0.5
>>> MEASURES["langton_lambda"].column
'm_langton_lambda'
"""

from __future__ import annotations

from media.family import unknown_key_message
from probe.measures.attractor_count import attractor_count
from probe.measures.block_entropy import block_entropy
from probe.measures.cycle_length import cycle_length
from probe.measures.damage_spreading import damage_spreading
from probe.measures.derrida_value import derrida_value
from probe.measures.langton_lambda import langton_lambda
from probe.measures.lz76_complexity import lz76_complexity, lz76_normalised, lz76_phrases
from probe.measures.lzma_ratio import lzma_ratio
from probe.measures.mean_attractor_length import mean_attractor_length
from probe.measures.mean_sensitivity import average_sensitivity, mean_sensitivity
from probe.measures.registry import COLUMN_PREFIX, MeasureOptionError, MeasureSpec, MeasureUnavailable
from probe.measures.transient_length import transient_length
from probe.measures.zlib_ratio import zlib_ratio


def _spec(function, summary, requires=()):
    name = function.__name__
    return MeasureSpec(name=name, column=COLUMN_PREFIX + name, function=function, summary=summary,
                       requires=tuple(requires))


MEASURES = {spec.name: spec for spec in (
    _spec(langton_lambda,
          "Langton's lambda: fraction of transition-table entries whose output is not the quiescent state 0 "
          "(no units; Boolean networks: mean table bias); exact, no initial conditions",
          requires=("transition_table",)),
    _spec(zlib_ratio,
          "zlib (level 9) compressed / packed size (ratio) of space-time diagrams: n_sites x 256 rows after a "
          "transient of 0 (first row = the start); binary 8 cells per byte, else 1 byte per cell; mean over 8 "
          "uniform random starts"),
    _spec(lzma_ratio,
          "lzma (xz, preset 9) compressed / packed size (ratio) of space-time diagrams: n_sites x 256 rows after a "
          "transient of 0 (first row = the start); binary 8 cells per byte, else 1 byte per cell; mean over 8 "
          "uniform random starts"),
    _spec(lz76_complexity,
          "normalised LZ76 complexity c(n) log_b(n) / n (b = n_states, no units) of space-time diagrams read row "
          "by row: n_sites x 256 rows after a transient of 0; mean over 8 uniform random starts"),
    _spec(block_entropy,
          "Shannon entropy of length-4 row blocks / 4: bits per cell (log base 2, rows read as rings); 256 rows "
          "after a transient of 32, pooled over 8 uniform random starts"),
    _spec(damage_spreading,
          "fraction of sites that differ 32 updates after a one-site change (0..1), mean over 64 uniform "
          "random starts"),
    _spec(derrida_value,
          "sites that differ one update after a one-site change (Derrida value for Boolean networks), "
          "mean over 1024 uniform random starts"),
    _spec(transient_length,
          "updates until the attractor is reached (steps), mean over 64 uniform random starts; media of at "
          "most 2^24 states"),
    _spec(cycle_length,
          "period of the attractor reached (steps), mean over 64 uniform random starts (basin-weighted); "
          "media of at most 2^24 states"),
    _spec(mean_sensitivity,
          "average sensitivity of node functions, mean over nodes (inputs per row; 2p(1-p)K for random "
          "tables); exact", requires=("boolean_functions",)),
    _spec(attractor_count,
          "number of attractors (count) by exhaustive enumeration; media of at most 2^20 states"),
    _spec(mean_attractor_length,
          "mean attractor length (steps), every attractor once, by exhaustive enumeration; media of at most "
          "2^20 states"),
)}


def compute_measure(name: str, medium, seed: int = 0, **options) -> float:
    """The measure ``name`` of ``medium`` under ``seed``: checked name, options and capabilities.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> compute_measure("lamda", ElementaryCA(rule=30))
    Traceback (most recent call last):
    ...
    probe.measures.registry.MeasureUnavailable: measure: unknown key 'lamda'; did you mean ...
    """
    spec = MEASURES.get(name)
    if spec is None:
        raise MeasureUnavailable(unknown_key_message("measure", str(name), MEASURES))
    return spec.compute(medium, seed=seed, **options)


__all__ = ["MEASURES", "MeasureOptionError", "MeasureSpec", "MeasureUnavailable", "attractor_count",
           "average_sensitivity", "block_entropy", "compute_measure", "cycle_length", "damage_spreading",
           "derrida_value", "langton_lambda", "lz76_complexity", "lz76_normalised", "lz76_phrases", "lzma_ratio",
           "mean_attractor_length", "mean_sensitivity", "transient_length", "zlib_ratio"]
