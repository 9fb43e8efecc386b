"""The Medium interface (version 2; version 1 had no ``settle``).

A *medium* is a deterministic system of ``n_sites`` sites, each in a state
``0 .. n_states-1``, with a one-step update ``x(t+1) = F(x(t))``. The probe
only ever talks to a medium through the members below, and a medium knows
nothing of signs, contexts or meanings: it evolves batches of states.

Required members
----------------
``n_sites`` (int), ``n_states`` (int >= 2)
``step(states)``
    ``states`` is a ``(batch, n_sites)`` uint8 array; return a new array of
    the same shape and dtype holding one update of every row. Rows are
    independent runs; the input is not modified.
``describe()``
    A flat dict of JSON-friendly parameters that rebuild this instance.

Members with a default (override them for speed or meaning)
-----------------------------------------------------------
``evolve(initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None)``
    Run every row of ``initial`` for ``steps`` updates and return the states
    of the ``watch`` sites at times ``watch_from .. steps`` as a uint8 array
    of shape ``(batch, steps - watch_from + 1, len(watch))``. Sites in
    ``clamp_sites`` are forced to ``clamp_values`` (shape
    ``(batch, len(clamp_sites))``) after every update. The default loops over
    ``step``; fast media override it, and the conformance suite checks that
    the override agrees with the loop.
``site_names()``
    A list of names, one per site, or ``None`` for plain lattices.
``resolve_sites(sites)``
    Turn indices (or names, where the medium has them) into an int array.
``reach(sites, steps)``
    A boolean mask of the sites whose state at time ``steps`` can depend on
    the state of ``sites`` at time 0 (the light cone). The default answers
    "all sites", which is always safe.

``settle(initial, *, watch, max_steps, clamp_sites=None, clamp_values=None)``
    Run every row to its attractor (fixed point or cycle; clamps applied after
    every update) and return ``(pattern, constant)``: the watched sites in one
    state of the attractor, ``(batch, len(watch))`` uint8, and a ``(batch,)``
    bool that is True when the watched sites are constant around the whole
    attractor and the attractor was reached within ``max_steps`` updates.
    The default uses Floyd's cycle finding over ``step``.

``interface_version`` names the version of this contract a medium was
written against; the probe refuses a medium written for another version.
"""

from __future__ import annotations

import numpy as np

from media.errors import MediumInputError, require

INTERFACE_VERSION = 2
# Version history: 1 = step/evolve/reach/site names; 2 adds settle (attractor readout).


class Medium:
    """Base class for media: implements the defaults of the interface.

    Subclasses set ``n_sites`` and ``n_states`` and implement ``step`` and
    ``describe``. Duck typing is enough: a class that provides the required
    members works without inheriting from this one, but then it must provide
    the defaulted members too.
    """

    interface_version = INTERFACE_VERSION
    kind = "medium"
    n_sites: int
    n_states: int = 2

    def step(self, states: np.ndarray) -> np.ndarray:  # pragma: no cover - abstract
        raise NotImplementedError

    def describe(self) -> dict:  # pragma: no cover - abstract
        raise NotImplementedError

    def site_names(self):
        return None

    def resolve_sites(self, sites) -> np.ndarray:
        return resolve_sites(self, sites)

    def reach(self, sites, steps: int) -> np.ndarray:
        return np.ones(self.n_sites, dtype=bool)

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        return evolve_by_steps(
            self, initial, steps, watch=watch, watch_from=watch_from,
            clamp_sites=clamp_sites, clamp_values=clamp_values,
        )

    def settle(self, initial, *, watch, max_steps, clamp_sites=None, clamp_values=None):
        return settle_by_steps(self, initial, watch=watch, max_steps=max_steps,
                               clamp_sites=clamp_sites, clamp_values=clamp_values)

    def __repr__(self):
        params = ", ".join(f"{k}={v!r}" for k, v in self.describe().items())
        return f"{type(self).__name__}({params})"


def resolve_sites(medium, sites) -> np.ndarray:
    """Indices for ``sites`` given as ints or, where the medium names its sites, names."""
    names = medium.site_names()
    out = []
    for site in sites:
        if isinstance(site, str) and not site.lstrip("-").isdigit():
            require(names is not None, f"site {site!r} is a name, but this medium numbers its sites 0..{medium.n_sites - 1}")
            if site not in names:
                raise MediumInputError(f"unknown site name {site!r}; known: {', '.join(names)}")
            out.append(names.index(site))
        else:
            index = int(site)
            require(0 <= index < medium.n_sites,
                    f"site {index} is out of range: allowed 0..{medium.n_sites - 1}")
            out.append(index)
    return np.asarray(out, dtype=np.int64)


def check_evolve_arguments(medium, initial, steps, watch, watch_from, clamp_sites, clamp_values):
    """Validate and normalise ``evolve`` arguments; shared by every implementation."""
    initial = np.ascontiguousarray(initial, dtype=np.uint8)
    require(initial.ndim == 2 and initial.shape[1] == medium.n_sites,
            f"initial states must have shape (batch, {medium.n_sites}), got {initial.shape}")
    steps = int(steps)
    watch_from = int(watch_from)
    require(0 <= watch_from <= steps, f"watch_from must lie in 0..steps ({steps}), got {watch_from}")
    n_sites = medium.n_sites
    # Kernels index with these without bounds checks, so they are checked here, once.
    require(initial.size == 0 or int(initial.max()) < medium.n_states,
            f"initial states must lie in 0..{medium.n_states - 1}, got {int(initial.max()) if initial.size else 0}")
    watch = np.asarray(watch, dtype=np.int64).reshape(-1)
    require(((watch >= 0) & (watch < n_sites)).all(), f"watch sites must lie in 0..{n_sites - 1}, got {watch.tolist()}")
    if clamp_sites is None or len(clamp_sites) == 0:
        clamp_sites = np.zeros(0, dtype=np.int64)
        clamp_values = np.zeros((initial.shape[0], 0), dtype=np.uint8)
    else:
        clamp_sites = np.asarray(clamp_sites, dtype=np.int64).reshape(-1)
        require(((clamp_sites >= 0) & (clamp_sites < n_sites)).all(),
                f"clamp_sites must lie in 0..{n_sites - 1}, got {clamp_sites.tolist()}")
        clamp_values = np.ascontiguousarray(clamp_values, dtype=np.uint8)
        require(clamp_values.size == 0 or int(clamp_values.max()) < medium.n_states,
                f"clamp_values must lie in 0..{medium.n_states - 1}")
        require(clamp_values.shape == (initial.shape[0], clamp_sites.size),
                f"clamp_values must have shape {(initial.shape[0], clamp_sites.size)}, got {clamp_values.shape}")
    return initial, steps, watch, watch_from, clamp_sites, clamp_values


def evolve_by_steps(medium, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
    """The reference ``evolve``: call ``step`` repeatedly and record the watched sites."""
    initial, steps, watch, watch_from, clamp_sites, clamp_values = check_evolve_arguments(
        medium, initial, steps, watch, watch_from, clamp_sites, clamp_values)
    out = np.empty((initial.shape[0], steps - watch_from + 1, watch.size), dtype=np.uint8)
    states = initial.copy()
    if watch_from == 0:
        out[:, 0, :] = states[:, watch]
    for t in range(1, steps + 1):
        states = medium.step(states)
        if clamp_sites.size:
            states[:, clamp_sites] = clamp_values
        if t >= watch_from:
            out[:, t - watch_from, :] = states[:, watch]
    return out


def settle_by_steps(medium, initial, *, watch, max_steps, clamp_sites=None, clamp_values=None):
    """The reference ``settle``: Floyd's cycle finding with ``step``, then one walk around each cycle."""
    initial, max_steps, watch, _, clamp_sites, clamp_values = check_evolve_arguments(
        medium, initial, max_steps, watch, 0, clamp_sites, clamp_values)

    def advance(states):
        states = medium.step(states)
        if clamp_sites.size:
            states[:, clamp_sites] = clamp_values
        return states

    tortoise, hare, meet = initial.copy(), initial.copy(), initial.copy()
    met = np.zeros(initial.shape[0], dtype=bool)
    for _ in range(max_steps):
        tortoise = advance(tortoise)
        hare = advance(advance(hare))
        fresh = ~met & (tortoise == hare).all(axis=1)
        meet[fresh] = tortoise[fresh]
        met |= fresh
        if met.all():
            break
    walker = meet.copy()
    returned = ~met
    varies = np.zeros_like(met)
    for _ in range(max_steps):
        if returned.all():
            break
        walker = advance(walker)
        active = ~returned
        varies |= active & (walker[:, watch] != meet[:, watch]).any(axis=1)
        returned |= active & (walker == meet).all(axis=1)
    return np.ascontiguousarray(meet[:, watch]), met & ~varies


def downstream(readers, sites, steps) -> np.ndarray:
    """The light cone of a graph medium: ``sites`` and every site reached from them by 1..``steps`` edges.

    ``readers[i]`` holds the sites whose update reads site ``i``.
    """
    mask = np.zeros(len(readers), dtype=bool)
    frontier = set(np.asarray(sites, dtype=np.int64).reshape(-1).tolist())
    mask[list(frontier)] = True
    for _ in range(int(steps)):
        frontier = {reader for node in frontier for reader in readers[node] if not mask[reader]}
        if not frontier:
            break
        mask[list(frontier)] = True
    return mask
