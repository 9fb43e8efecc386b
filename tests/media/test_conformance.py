"""The conformance suite: the elementary CA passes it, broken media fail the matching check,
and a minimal medium that relies on every default passes it."""

import numpy as np
import pytest

from media.conformance import (CHECKS, MediumConformanceError, check_declares_interface, check_describe,
                               check_evolve_clamp, check_evolve_matches_steps, check_evolve_window_and_watch,
                               check_medium, check_reach_is_sound, check_rows_independent,
                               check_step_deterministic, check_step_leaves_input, check_step_shape_and_range,
                               parametrize_with_checks)
from media.eca import ElementaryCA
from media.interface import Medium

ECA_MEDIA = [
    ElementaryCA(rule, width, boundary)
    for rule in (30, 110, 1, 90)
    for boundary in ("periodic", "fixed")
    for width in (1, 5, 21)
]


@parametrize_with_checks(ECA_MEDIA)
def test_elementary_ca_conforms(medium, check):
    check(medium)


# --------------------------------------------------------------------------------------
# A loopback medium that uses only the base-class defaults (evolve, resolve_sites, site_names)
# --------------------------------------------------------------------------------------


class ShiftRight(Medium):
    """Three states; every site takes the state of its left neighbour on a ring."""

    n_states = 3

    def __init__(self, n_sites, exact_reach=True):
        self.n_sites = n_sites
        self.exact_reach = exact_reach

    def step(self, states):
        return np.roll(np.asarray(states, dtype=np.uint8), 1, axis=1)

    def describe(self):
        return {"n_sites": self.n_sites, "exact_reach": self.exact_reach}

    def reach(self, sites, steps):
        if not self.exact_reach:
            return super().reach(sites, steps)
        mask = np.zeros(self.n_sites, dtype=bool)
        mask[(np.asarray(sites, dtype=np.int64) + steps) % self.n_sites] = True
        return mask


@parametrize_with_checks([ShiftRight(1), ShiftRight(7), ShiftRight(10, exact_reach=False)])
def test_loopback_medium_conforms(medium, check):
    check(medium)


def test_loopback_medium_really_shifts():
    medium = ShiftRight(4)
    start = np.array([[2, 0, 1, 0]], dtype=np.uint8)
    out = medium.evolve(start, 2, watch=[0, 1, 2, 3])
    assert out[0].tolist() == [[2, 0, 1, 0], [0, 2, 0, 1], [1, 0, 2, 0]]


def test_parametrize_with_checks_makes_one_case_per_medium_and_check():
    mark = parametrize_with_checks([ShiftRight(3), ElementaryCA(30, 5)]).mark
    names, cases = mark.args
    assert names == ("medium", "check")
    assert len(cases) == 2 * len(CHECKS)
    assert {check for _, check in cases} == set(CHECKS)
    ids = mark.kwargs["ids"]
    assert len(set(ids)) == len(ids)
    assert "ElementaryCA(rule=30, width=5, boundary='periodic')-check_evolve_clamp" in ids


# --------------------------------------------------------------------------------------
# Deliberately broken media: each must be caught by the check for the rule it breaks
# --------------------------------------------------------------------------------------


class MutatesInput(ElementaryCA):
    def step(self, states):
        out = super().step(states)
        states[:, 0] ^= 1  # scribbles on the caller's array
        return out


class EvolveDisagrees(ElementaryCA):
    def evolve(self, initial, steps, **kwargs):
        out = super().evolve(initial, steps, **kwargs).copy()
        out[:, -1, 0] ^= 1  # wrong in one watched site at the last time
        return out


class ReturnsInt64(ElementaryCA):
    def step(self, states):
        return super().step(states).astype(np.int64)


class IgnoresClamps(ElementaryCA):
    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        return super().evolve(initial, steps, watch=watch, watch_from=watch_from)


class ClampsOnlyInOutput(ElementaryCA):
    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        # Runs free, then paints the clamp values over the record: clamps "hold", dynamics are wrong.
        out = super().evolve(initial, steps, watch=watch, watch_from=watch_from).copy()
        for column, site in enumerate(watch):
            where = np.flatnonzero(np.asarray(clamp_sites) == site)
            if where.size:
                out[:, max(1, watch_from) - watch_from :, column] = clamp_values[:, where[0], None]
        return out


class ReachTooSmall(ElementaryCA):
    def reach(self, sites, steps):
        mask = np.zeros(self.width, dtype=bool)
        mask[np.asarray(sites, dtype=np.int64)] = True  # claims a flip never leaves its site
        return mask


class Nondeterministic(ElementaryCA):
    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self._rng = np.random.default_rng(0)

    def step(self, states):
        out = super().step(states)
        out[:, 0] = self._rng.integers(0, 2, size=out.shape[0], dtype=np.uint8)
        return out


class RowsCoupled(ElementaryCA):
    def step(self, states):
        out = super().step(states)
        out[:, 0] = out[0, 0]  # every run copies the first run's site 0
        return out


class WrongWindow(ElementaryCA):
    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        out = super().evolve(initial, steps, watch=watch, watch_from=0,
                             clamp_sites=clamp_sites, clamp_values=clamp_values)
        return out[:, : steps - watch_from + 1]  # ignores watch_from: returns the first times instead


class OutOfRange(ElementaryCA):
    def step(self, states):
        return super().step(states) * 2  # states 0 and 2 for a two-state medium


class BadDescribe(ElementaryCA):
    def describe(self):
        return {"rule": self.rule, "table": [0, 1]}


class WrongVersion(ElementaryCA):
    interface_version = 0


BROKEN = [
    (MutatesInput, check_step_leaves_input, "modified its input"),
    (EvolveDisagrees, check_evolve_matches_steps, "evolve disagrees"),
    (ReturnsInt64, check_step_shape_and_range, "dtype int64"),
    (IgnoresClamps, check_evolve_clamp, "clamped"),
    (ClampsOnlyInOutput, check_evolve_clamp, "evolve with clamped sites disagrees"),
    (ReachTooSmall, check_reach_is_sound, "outside its reach"),
    (Nondeterministic, check_step_deterministic, "not deterministic"),
    (RowsCoupled, check_rows_independent, "evolves differently"),
    (WrongWindow, check_evolve_window_and_watch, "watch_from"),
    (OutOfRange, check_step_shape_and_range, ">= n_states"),
    (BadDescribe, check_describe, "table"),
    (WrongVersion, check_declares_interface, "interface_version"),
]


@pytest.mark.parametrize(("broken", "check", "message"), BROKEN, ids=[cls.__name__ for cls, _, _ in BROKEN])
def test_check_catches_broken_medium(broken, check, message):
    check(ElementaryCA(30, 21))  # the unbroken parent passes this very check
    with pytest.raises(MediumConformanceError, match=message):
        check(broken(30, 21))


@pytest.mark.parametrize("broken", [cls for cls, _, _ in BROKEN], ids=[cls.__name__ for cls, _, _ in BROKEN])
def test_check_medium_rejects_broken_medium(broken):
    with pytest.raises(MediumConformanceError):
        check_medium(broken(30, 21))


def test_check_medium_accepts_good_media():
    check_medium(ElementaryCA(54, 8, "fixed"))
    check_medium(ShiftRight(5))


def test_conformance_error_names_the_medium():
    with pytest.raises(MediumConformanceError, match=r"ReturnsInt64\(rule=30, width=21"):
        check_step_shape_and_range(ReturnsInt64(30, 21))
