"""Conformance suite for the Medium interface.

Each ``check_<rule>`` function tests one stated rule of
:mod:`media.interface` on small seeded batches and raises
``MediumConformanceError`` naming what broke. Run them all on your medium::

    from media.conformance import check_medium
    check_medium(MyMedium(...))

or, in pytest, one test case per (medium, check)::

    from media.conformance import parametrize_with_checks

    @parametrize_with_checks([MyMedium(...), MyMedium(...)])
    def test_conforms(medium, check):
        check(medium)
"""

from __future__ import annotations

import numpy as np

from media.interface import INTERFACE_VERSION, evolve_by_steps

BATCH = 70  # more than one 64-run word, and not a multiple of it
STEPS = 6


class MediumConformanceError(AssertionError):
    """A medium broke a rule of the interface."""


def _fail(medium, message):
    raise MediumConformanceError(f"{medium!r}: {message}")


def _random_states(medium, batch=BATCH, seed=0):
    rng = np.random.default_rng(seed)
    return rng.integers(0, medium.n_states, size=(batch, medium.n_sites), dtype=np.uint8)


def check_declares_interface(medium):
    """``interface_version``, ``n_sites`` >= 1 and ``n_states`` >= 2 are declared."""
    if getattr(medium, "interface_version", None) != INTERFACE_VERSION:
        _fail(medium, f"interface_version must be {INTERFACE_VERSION}")
    if not isinstance(medium.n_sites, (int, np.integer)) or medium.n_sites < 1:
        _fail(medium, f"n_sites must be a positive int, got {medium.n_sites!r}")
    if not isinstance(medium.n_states, (int, np.integer)) or not 2 <= medium.n_states <= 255:
        _fail(medium, f"n_states must be an int in 2..255, got {medium.n_states!r}")


def check_describe(medium):
    """``describe()`` returns a flat dict of plain values."""
    description = medium.describe()
    if not isinstance(description, dict):
        _fail(medium, "describe() must return a dict")
    for key, value in description.items():
        if not isinstance(key, str) or not isinstance(value, (str, int, float, bool)):
            _fail(medium, f"describe() entry {key!r}: {value!r} is not a plain str/int/float/bool")


def check_step_shape_and_range(medium):
    """``step`` keeps shape, returns uint8 and stays within ``0..n_states-1``."""
    states = _random_states(medium)
    out = medium.step(states)
    if not isinstance(out, np.ndarray) or out.shape != states.shape:
        _fail(medium, f"step returned shape {getattr(out, 'shape', None)}, expected {states.shape}")
    if out.dtype != np.uint8:
        _fail(medium, f"step returned dtype {out.dtype}, expected uint8")
    if out.size and out.max() >= medium.n_states:
        _fail(medium, f"step produced state {out.max()} >= n_states {medium.n_states}")


def check_step_leaves_input(medium):
    """``step`` does not modify its input."""
    states = _random_states(medium, seed=1)
    before = states.copy()
    medium.step(states)
    if not np.array_equal(states, before):
        _fail(medium, "step modified its input array")


def check_step_deterministic(medium):
    """The same states give the same next states."""
    states = _random_states(medium, seed=2)
    if not np.array_equal(medium.step(states), medium.step(states.copy())):
        _fail(medium, "step is not deterministic")


def check_rows_independent(medium):
    """Each row evolves alone: stepping a batch equals stepping its rows one by one."""
    states = _random_states(medium, batch=9, seed=3)
    together = medium.step(states)
    for row in range(states.shape[0]):
        alone = medium.step(states[row : row + 1])
        if not np.array_equal(alone[0], together[row]):
            _fail(medium, f"row {row} evolves differently inside a batch than alone")


def check_evolve_matches_steps(medium):
    """``evolve`` equals repeated ``step`` on every watched site and time."""
    states = _random_states(medium, seed=4)
    watch = np.arange(medium.n_sites)
    fast = medium.evolve(states, STEPS, watch=watch)
    slow = evolve_by_steps(medium, states, STEPS, watch=watch)
    if fast.shape != slow.shape or not np.array_equal(fast, slow):
        _fail(medium, "evolve disagrees with repeated step")


def check_evolve_window_and_watch(medium):
    """``evolve`` honours ``watch_from`` and a subset of watched sites, in the order given."""
    states = _random_states(medium, seed=5)
    watch = np.arange(medium.n_sites)[::-1][: max(1, medium.n_sites // 2)]
    fast = medium.evolve(states, STEPS, watch=watch, watch_from=STEPS - 2)
    full = evolve_by_steps(medium, states, STEPS, watch=np.arange(medium.n_sites))
    expected = full[:, STEPS - 2 :, :][:, :, watch]
    if fast.shape != expected.shape or not np.array_equal(fast, expected):
        _fail(medium, "evolve with watch_from and a watch subset disagrees with repeated step")


def check_evolve_clamp(medium):
    """Clamped sites hold their values after every step, and ``evolve`` agrees with ``step`` under clamps."""
    states = _random_states(medium, seed=6)
    clamp = np.arange(0, medium.n_sites, 3)
    values = _random_states(medium, seed=7)[:, clamp]
    states[:, clamp] = values
    watch = np.arange(medium.n_sites)
    fast = medium.evolve(states, STEPS, watch=watch, clamp_sites=clamp, clamp_values=values)
    slow = evolve_by_steps(medium, states, STEPS, watch=watch, clamp_sites=clamp, clamp_values=values)
    if not np.array_equal(fast, slow):
        _fail(medium, "evolve with clamped sites disagrees with repeated step")
    if not np.array_equal(fast[:, :, clamp], np.repeat(values[:, None, :], STEPS + 1, axis=1)):
        _fail(medium, "clamped sites did not keep their values")


def check_settle_matches_steps(medium):
    """``settle`` agrees with Floyd's cycle finding over ``step``, with and without clamps."""
    from media.interface import settle_by_steps

    states = _random_states(medium, seed=9)
    watch = np.arange(min(3, medium.n_sites))
    for clamp in (np.zeros(0, dtype=np.int64), np.arange(0, medium.n_sites, 4)):
        values = states[:, clamp]
        fast_pattern, fast_constant = medium.settle(states, watch=watch, max_steps=64, clamp_sites=clamp,
                                                    clamp_values=values)
        slow_pattern, slow_constant = settle_by_steps(medium, states, watch=watch, max_steps=64, clamp_sites=clamp,
                                                      clamp_values=values)
        if not np.array_equal(np.asarray(fast_constant, dtype=bool), slow_constant):
            _fail(medium, "settle disagrees with step on which runs have a constant readout")
        if not np.array_equal(np.asarray(fast_pattern)[slow_constant], slow_pattern[slow_constant]):
            _fail(medium, "settle disagrees with step on the attractor's readout pattern")


def check_reach_is_sound(medium):
    """Flipping a site never changes a site outside its declared reach."""
    states = _random_states(medium, batch=16, seed=8)
    for site in range(min(medium.n_sites, 8)):
        mask = np.asarray(medium.reach([site], STEPS), dtype=bool)
        if mask.shape != (medium.n_sites,):
            _fail(medium, f"reach returned shape {mask.shape}, expected ({medium.n_sites},)")
        flipped = states.copy()
        flipped[:, site] = (flipped[:, site] + 1) % medium.n_states
        a = medium.evolve(states, STEPS, watch=np.arange(medium.n_sites), watch_from=STEPS)[:, 0, :]
        b = medium.evolve(flipped, STEPS, watch=np.arange(medium.n_sites), watch_from=STEPS)[:, 0, :]
        changed = (a != b).any(axis=0)
        if (changed & ~mask).any():
            _fail(medium, f"site {site} influenced sites {np.flatnonzero(changed & ~mask).tolist()} outside its reach")


def check_resolve_sites(medium):
    """``resolve_sites`` maps every index (and every name, if any) to its index."""
    indices = medium.resolve_sites(list(range(medium.n_sites)))
    if not np.array_equal(np.asarray(indices), np.arange(medium.n_sites)):
        _fail(medium, "resolve_sites does not map indices to themselves")
    names = medium.site_names()
    if names is not None:
        if len(names) != medium.n_sites or len(set(names)) != len(names):
            _fail(medium, "site_names must give one distinct name per site")
        if not np.array_equal(np.asarray(medium.resolve_sites(names)), np.arange(medium.n_sites)):
            _fail(medium, "resolve_sites does not map names to their indices")


CHECKS = (
    check_declares_interface,
    check_describe,
    check_step_shape_and_range,
    check_step_leaves_input,
    check_step_deterministic,
    check_rows_independent,
    check_evolve_matches_steps,
    check_evolve_window_and_watch,
    check_evolve_clamp,
    check_settle_matches_steps,
    check_reach_is_sound,
    check_resolve_sites,
)


def check_medium(medium) -> None:
    """Run every check on ``medium``; raise ``MediumConformanceError`` at the first failure."""
    for check in CHECKS:
        check(medium)


def parametrize_with_checks(media):
    """A pytest decorator with one case per (medium, check), ids like ``ElementaryCA(rule=30...)-check_step...``."""
    import pytest

    cases = [(medium, check) for medium in media for check in CHECKS]
    ids = [f"{medium!r}-{check.__name__}" for medium, check in cases]
    return pytest.mark.parametrize(("medium", "check"), cases, ids=ids)
