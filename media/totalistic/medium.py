"""The one-dimensional totalistic automaton medium."""

import numpy as np

from media import lattice
from media.interface import Medium, check_evolve_arguments
from media.totalistic.codes import check_code, check_radius, check_states, code_table
from media.totalistic.kernels import _evolve_sites


class TotalisticCA(Medium):
    """``width`` cells of ``states`` states on a ring (``boundary="periodic"``) or a row with zero
    cells beyond both ends (``boundary="fixed"``); each cell's new state is digit ``s`` (base
    ``states``) of the Wolfram totalistic ``code``, where ``s`` sums the ``2 * radius + 1`` cells
    around it (A New Kind of Science, p. 60 and note p. 886).

    ``step`` is a NumPy lookup (the slow twin); ``evolve`` runs a numba kernel.

    Examples
    --------
    Code 588 with three states is ``new = (left + centre + right) mod 3``:

    >>> ca = TotalisticCA(588, states=3, width=7)
    >>> start = np.zeros((1, 7), dtype=np.uint8); start[0, 3] = 1
    >>> ca.evolve(start, 2, watch=range(7))[0].tolist()
    [[0, 0, 0, 1, 0, 0, 0], [0, 0, 1, 1, 1, 0, 0], [0, 1, 2, 0, 2, 1, 0]]
    """

    kind = "totalistic"

    def __init__(self, code, states=2, radius=1, width=21, boundary="periodic"):
        self.n_states = self.states = check_states(states)
        self.radius = check_radius(radius)
        self.code = check_code(code, self.states, self.radius)
        self.n_sites = self.width = lattice.check_width(width)
        self.boundary = lattice.check_boundary(boundary)
        self._table = np.array(code_table(self.code, self.states, self.radius), dtype=np.uint8)
        self._source = lattice.padded_rows(self.width, self.radius, self.boundary)

    def describe(self):
        return {"code": self.code, "states": self.states, "radius": self.radius, "width": self.width,
                "boundary": self.boundary}

    def step(self, states):
        states = np.asarray(states, dtype=np.uint8)
        lattice.check_state_values(states, self.states)
        sums = lattice.neighbours(states, self.radius, self.boundary).sum(axis=0, dtype=np.int64)
        return self._table[sums]

    def reach(self, sites, steps):
        return lattice.reach(self.width, self.radius, self.boundary, sites, steps)

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        initial, steps, watch, watch_from, clamp_sites, clamp_values = check_evolve_arguments(
            self, initial, steps, watch, watch_from, clamp_sites, clamp_values)
        batch = initial.shape[0]
        out = np.empty((steps - watch_from + 1, watch.size, batch), dtype=np.uint8)
        _evolve_sites(np.ascontiguousarray(initial.T), steps, self._table, self.radius, self._source,
                      clamp_sites, np.ascontiguousarray(clamp_values.T), watch, watch_from, out)
        return np.ascontiguousarray(out.transpose(2, 0, 1))
