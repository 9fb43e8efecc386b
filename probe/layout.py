"""Layouts: where signs and contexts are written, where meanings are read, and when.

A :class:`Layout` is medium-independent text and numbers; :meth:`Layout.resolve`
checks it against one medium and returns a :class:`ResolvedLayout` of plain
arrays that the evaluator uses.

Pattern numbering: pattern number ``p`` over sites ``[s0, s1, ...]`` puts
digit ``j`` of ``p`` in base ``k`` (least significant first) on site ``sj``.
So over two binary sites, pattern 1 is ``s0=1, s1=0``.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field, fields

import numpy as np

from media.errors import MediumInputError
from media.family import unknown_key_message
from probe.errors import ConfigError, LayoutError
from probe.seeding import rng_for
from probe.sites import ATTRACTOR, parse_sites, parse_window

MEANING_KINDS = ("pattern", "one-hot")
DEFAULT_SETTLE_STEPS = 1024
BACKGROUND_WORDS = ("zeros", "random")


@dataclass(frozen=True)
class Layout:
    """Sign, context and readout sites, the background and the readout window.

    Parameters
    ----------
    signs, contexts, readout
        Sites as a list or text like ``"4-9,12"`` (names for media that name sites).
    window
        ``(t0, t1)`` or ``"t0:t1"``: the meaning is the readout pattern at ``t0``
        if it is the same at every step up to ``t1``, else undefined. Or
        ``"attractor"``: the readout pattern if it is constant around the
        attractor the run reaches within ``steps`` updates, else undefined.
    name
        A label for result rows and figures.
    background
        ``"zeros"``, ``"random"`` (seeded, density ``background_density``), or an
        explicit pattern over all sites (``"0110..."`` or a list).
    clamp_signs, clamp_contexts
        Force those sites to their pattern after every step instead of seeding them.
    sign_patterns
        An explicit sign alphabet: a list of patterns over the sign sites (default: all).
    context_sample
        Evaluate a seeded sample of this many contexts instead of all of them.
    meanings
        ``"pattern"`` (every readout pattern is a meaning) or ``"one-hot"``
        (only patterns with exactly one site on count; the rest read as undefined).
    distinct_contexts
        Count contexts with the same closure once (``window = "attractor"`` on a medium whose
        ``dynamics`` is ``"closure"``): contexts whose context-only run, with every sign site
        absent, settles to the same state are one context, represented by the first in context
        order. Under closure ``cl(c + s) = cl(cl(c) + s)``, so merged contexts have the same
        mapping. Not with ``context_sample`` or ``clamp_signs``. Default: every context counts.
    steps
        Length of the run (default: the window end); the window must lie inside it.
        For ``window = "attractor"``, the most updates spent looking for the
        attractor (default 1024).

    Examples
    --------
    >>> Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8").window
    (4, 8)
    """

    signs: tuple
    contexts: tuple
    readout: tuple
    window: tuple = (1, 1)
    name: str = "layout"
    background: object = "zeros"
    background_density: float = 0.5
    clamp_signs: bool = False
    clamp_contexts: bool = False
    sign_patterns: tuple | None = None
    context_sample: int | None = None
    meanings: str = "pattern"
    steps: int | None = None
    distinct_contexts: bool | None = None  # None = False, and keeps older config hashes unchanged

    def __post_init__(self):
        for name in ("signs", "contexts", "readout"):
            object.__setattr__(self, name, tuple(parse_sites(getattr(self, name), self._field(name))))
        object.__setattr__(self, "window", parse_window(self.window, self._field("window")))
        if isinstance(self.background, list):
            object.__setattr__(self, "background", tuple(self.background))
        if self.sign_patterns is not None:
            object.__setattr__(self, "sign_patterns", tuple(tuple(_pattern_values(p, self._field("sign_patterns")))
                                                           for p in self.sign_patterns))
        if self.meanings not in MEANING_KINDS:
            raise LayoutError(f"{self._field('meanings')}: {self.meanings!r} is not one of {', '.join(MEANING_KINDS)}")
        if self.steps is not None and (isinstance(self.steps, bool) or not isinstance(self.steps, int) or self.steps < 0):
            raise LayoutError(f"{self._field('steps')}: {self.steps!r} must be a whole number >= 0")
        if self.steps is not None and not self.on_attractor and self.window[1] > self.steps:
            raise LayoutError(f"{self._field('window')}: {self.window[0]}:{self.window[1]} lies outside the run of "
                              f"{self.steps} steps; allowed 0 <= t0 <= t1 <= {self.steps}")
        for name in ("clamp_signs", "clamp_contexts"):
            if not isinstance(getattr(self, name), bool):
                raise LayoutError(f"{self._field(name)}: {getattr(self, name)!r} must be true or false")
        density = self.background_density
        if isinstance(density, bool) or not isinstance(density, (int, float)) or not 0.0 <= float(density) <= 1.0:
            raise LayoutError(f"{self._field('background_density')}: {self.background_density!r} must lie in [0, 1]")
        if self.distinct_contexts is not None:
            if not isinstance(self.distinct_contexts, bool):
                raise LayoutError(f"{self._field('distinct_contexts')}: {self.distinct_contexts!r} must be true or false")
            if self.distinct_contexts and not self.on_attractor:
                raise LayoutError(f"{self._field('distinct_contexts')}: merges contexts by the state they settle to, "
                                  f"so it needs window = 'attractor', not {self.window_text}")
            if self.distinct_contexts and self.context_sample is not None:
                raise LayoutError(f"{self._field('distinct_contexts')}: cannot be combined with context_sample; "
                                  f"merge all contexts or sample them")
            if self.distinct_contexts and self.clamp_signs:
                raise LayoutError(f"{self._field('distinct_contexts')}: cannot be combined with clamp_signs (a sign "
                                  f"held absent breaks cl(c + s) = cl(cl(c) + s)); seed the signs")
        if self.context_sample is not None and (not isinstance(self.context_sample, int) or self.context_sample < 2):
            raise LayoutError(f"{self._field('context_sample')}: {self.context_sample!r} must be a whole number >= 2")

    def _field(self, name):
        return f"layout {self.name!r}: {name}"

    @property
    def on_attractor(self) -> bool:
        return self.window == ATTRACTOR

    @property
    def run_steps(self) -> int:
        """Updates a run needs: the window end, ``steps`` if given, or the attractor search bound."""
        if self.steps is not None:
            return self.steps
        return DEFAULT_SETTLE_STEPS if self.on_attractor else self.window[1]

    @property
    def window_text(self) -> str:
        return ATTRACTOR if self.on_attractor else f"{self.window[0]}:{self.window[1]}"

    @classmethod
    def from_dict(cls, table: dict, where: str = "layout") -> "Layout":
        """Build from a config table, naming unknown keys and the nearest valid one."""
        allowed = [f.name for f in fields(cls)]
        for key in table:
            if key not in allowed:
                raise ConfigError(unknown_key_message(where, key, allowed))
        for key in ("signs", "contexts", "readout"):
            if key not in table:
                raise ConfigError(f"{where}: missing key {key!r} (sites like '4-9,12')")
        return cls(**table)

    def to_dict(self) -> dict:
        """Plain values for TOML and JSON: the inverse of :meth:`from_dict`."""
        out = {}
        for key, value in asdict(self).items():
            if value is None:
                continue
            if key == "window":
                value = self.window_text
            elif isinstance(value, tuple):
                value = [list(v) if isinstance(v, tuple) else v for v in value]
            out[key] = value
        return out

    def resolve(self, medium, seed: int = 0) -> "ResolvedLayout":
        """Check this layout against ``medium`` and return plain arrays; raise ``LayoutError`` if it does not fit."""
        k = int(medium.n_states)
        sites = {}
        for name in ("signs", "contexts", "readout"):
            try:
                sites[name] = np.asarray(medium.resolve_sites(list(getattr(self, name))), dtype=np.int64)
            except MediumInputError as error:
                raise LayoutError(f"{self._field(name)}: {error}") from None
            seen, repeated = set(), set()
            for site in sites[name].tolist():
                (repeated if site in seen else seen).add(site)
            if repeated:
                raise LayoutError(f"{self._field(name)}: site {sorted(repeated)[0]} is listed twice; each site once")
        # Signs and contexts are both written at t = 0, so they must not share a site. The readout
        # may reuse a seeded site (read what grew there later) but not a clamped one, which only echoes its input.
        clamped = {"signs": self.clamp_signs, "contexts": self.clamp_contexts}
        for first, second in (("signs", "contexts"), ("signs", "readout"), ("contexts", "readout")):
            if second == "readout" and not clamped[first]:
                continue
            shared = sorted(set(sites[first].tolist()) & set(sites[second].tolist()))
            if shared:
                why = ("sign and context sites must be disjoint" if second == "contexts"
                       else f"clamped {first} cannot be read out; unclamp them or move the readout")
                raise LayoutError(f"layout {self.name!r}: site {shared[0]} is in both {first} and {second}; {why}")
        # Under closure a written species stays present, so a readout on a sign or context species would
        # only echo its input (as a clamped one does): such media need three disjoint lists.
        if getattr(medium, "dynamics", None) == "closure":
            for first in ("signs", "contexts"):
                shared = sorted(set(sites[first].tolist()) & set(sites["readout"].tolist()))
                if shared:
                    raise LayoutError(f"layout {self.name!r}: site {shared[0]} is in both {first} and readout; "
                                      f"under closure a written species stays present, so sign, context and "
                                      f"readout sites must be disjoint")
        elif self.distinct_contexts:
            raise LayoutError(f"{self._field('distinct_contexts')}: needs a medium whose update is a closure "
                              f"(dynamics = 'closure'); {type(medium).__name__} is not one")
        if sites["signs"].size == 0:
            raise LayoutError(f"{self._field('signs')}: no sign sites; a code needs at least two signs")
        if sites["readout"].size == 0:
            raise LayoutError(f"{self._field('readout')}: no readout sites; give at least one")
        if sites["contexts"].size == 0:
            raise LayoutError(f"{self._field('contexts')}: no context sites; a code needs at least two contexts")
        if k ** sites["readout"].size > 2**62:
            raise LayoutError(f"{self._field('readout')}: {sites['readout'].size} sites of {k} states give more "
                              f"than 2^62 patterns; use fewer readout sites")

        if self.sign_patterns is None:
            n_signs = k ** sites["signs"].size
            if n_signs > 2**24:
                raise LayoutError(f"{self._field('signs')}: {sites['signs'].size} sites give {n_signs} sign "
                                  f"patterns; use fewer sign sites or list sign_patterns")
            sign_patterns = patterns_from_numbers(np.arange(n_signs, dtype=np.int64), k, sites["signs"].size)
        else:
            sign_patterns = np.array(self.sign_patterns, dtype=np.int64)
            if len(sign_patterns) < 2:
                raise LayoutError(f"{self._field('sign_patterns')}: {len(sign_patterns)} sign given; "
                                  f"a code needs at least two signs")
            if sign_patterns.ndim != 2 or sign_patterns.shape[1] != sites["signs"].size:
                raise LayoutError(f"{self._field('sign_patterns')}: each pattern needs {sites['signs'].size} values, "
                                  f"one per sign site")
            if sign_patterns.min() < 0 or sign_patterns.max() >= k:
                raise LayoutError(f"{self._field('sign_patterns')}: values must lie in 0..{k - 1}")
            if len({tuple(p) for p in sign_patterns.tolist()}) != len(sign_patterns):
                raise LayoutError(f"{self._field('sign_patterns')}: a pattern is listed twice; signs must be distinct")
            sign_patterns = sign_patterns.astype(np.uint8)
        if len(sign_patterns) < 2:
            raise LayoutError(f"{self._field('sign_patterns')}: {len(sign_patterns)} sign given; "
                              f"a code needs at least two signs")

        context_space = k ** sites["contexts"].size
        if context_space > 2**62:
            raise LayoutError(f"{self._field('contexts')}: {sites['contexts'].size} sites of {k} states give more "
                              f"than 2^62 contexts; use fewer context sites")
        if self.context_sample is None:
            context_numbers = None
        else:
            if self.context_sample > context_space:
                raise LayoutError(f"{self._field('context_sample')}: {self.context_sample} is more than the "
                                  f"{context_space} contexts there are; drop context_sample to enumerate them all")
            context_numbers = sample_numbers(context_space, self.context_sample, rng_for(seed, "contexts", self.name))

        background = self._background(medium.n_sites, k, seed)
        return ResolvedLayout(
            layout=self, n_states=k, sign_sites=sites["signs"], context_sites=sites["contexts"],
            readout_sites=sites["readout"], sign_patterns=sign_patterns, context_space=context_space,
            context_numbers=context_numbers, background=background,
        )

    def _background(self, n_sites, k, seed):
        if isinstance(self.background, str) and self.background in BACKGROUND_WORDS:
            if self.background == "zeros":
                return np.zeros(n_sites, dtype=np.uint8)
            rng = rng_for(seed, "background", self.name)
            if k == 2:
                return (rng.random(n_sites) < float(self.background_density)).astype(np.uint8)
            return rng.integers(0, k, size=n_sites, dtype=np.uint8)
        values = np.array(_pattern_values(self.background, self._field("background")), dtype=np.int64)
        if values.shape != (n_sites,):
            raise LayoutError(f"{self._field('background')}: a pattern needs {n_sites} values, one per site, "
                              f"got {values.size}; or use 'zeros' or 'random'")
        if values.min() < 0 or values.max() >= k:
            raise LayoutError(f"{self._field('background')}: values must lie in 0..{k - 1}")
        return values.astype(np.uint8)


def _pattern_values(pattern, field_name):
    if isinstance(pattern, str):
        if not pattern.isdigit():
            raise LayoutError(f"{field_name}: cannot read pattern {pattern!r}; write digits like '0110' "
                              f"or use 'zeros' / 'random'")
        return [int(ch) for ch in pattern]
    try:
        return [int(value) for value in pattern]
    except (TypeError, ValueError):
        raise LayoutError(f"{field_name}: cannot read pattern {pattern!r}; write digits like '0110'") from None


def patterns_from_numbers(numbers: np.ndarray, k: int, n_sites: int) -> np.ndarray:
    """Pattern number -> ``(len(numbers), n_sites)`` digits in base ``k``, least significant first."""
    numbers = np.asarray(numbers, dtype=np.int64)
    if k == 2:  # shifts instead of divisions: this runs for every chunk of every evaluation
        return ((numbers[:, None] >> np.arange(n_sites, dtype=np.int64)[None, :]) & 1).astype(np.uint8)
    powers = k ** np.arange(n_sites, dtype=np.int64)
    return ((numbers[:, None] // powers[None, :]) % k).astype(np.uint8)


def sample_numbers(space: int, count: int, rng) -> np.ndarray:
    """``count`` distinct numbers from ``0..space-1``, sorted, drawn from ``rng``."""
    if space <= 2**40:
        return np.sort(rng.choice(space, size=count, replace=False)).astype(np.int64)
    chosen = np.unique(rng.integers(0, space, size=count, dtype=np.int64))
    while chosen.size < count:
        extra = rng.integers(0, space, size=count - chosen.size, dtype=np.int64)
        chosen = np.unique(np.concatenate([chosen, extra]))
    return chosen


@dataclass
class ResolvedLayout:
    """A layout checked against one medium: plain arrays for the evaluator."""

    layout: Layout
    n_states: int
    sign_sites: np.ndarray
    context_sites: np.ndarray
    readout_sites: np.ndarray
    sign_patterns: np.ndarray
    context_space: int
    context_numbers: np.ndarray | None
    background: np.ndarray
    extra: dict = field(default_factory=dict)

    @property
    def n_signs(self) -> int:
        return len(self.sign_patterns)

    @property
    def n_contexts(self) -> int:
        return self.context_space if self.context_numbers is None else len(self.context_numbers)

    @property
    def runs(self) -> int:
        return self.n_signs * self.n_contexts

    def context_patterns(self, start: int, stop: int) -> np.ndarray:
        """Patterns of evaluated contexts ``start .. stop-1`` (in evaluation order)."""
        if self.context_numbers is None:
            numbers = np.arange(start, stop, dtype=np.int64)
        else:
            numbers = self.context_numbers[start:stop]
        return patterns_from_numbers(numbers, self.n_states, self.context_sites.size)

    def context_number(self, index: int) -> int:
        """The pattern number of the ``index``-th evaluated context."""
        return index if self.context_numbers is None else int(self.context_numbers[index])
