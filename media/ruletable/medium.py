"""The binary rule-table medium of radius r."""

import numpy as np

from media import bitslice, lattice
from media.interface import Medium
from media.ruletable.kernels import _evolve_words
from media.ruletable.rules import check_radius, check_rule, rule_masks, rule_table


class RuleTableCA(Medium):
    """``width`` binary cells on a ring (``boundary="periodic"``) or a row with zero cells beyond
    both ends (``boundary="fixed"``); a cell's new state is bit ``sum over j of x(i+j) * 2^(r-j)``
    (``j = -r..r``, leftmost neighbour most significant) of ``rule``. With ``radius=1`` this is
    Wolfram's elementary numbering (index ``4l + 2c + r``).

    ``step`` is a NumPy lookup (the slow twin); ``evolve`` runs the bit-sliced kernel.

    Examples
    --------
    Rule ``2^32 - 2^16`` of radius 2 copies the cell two to the left (bit 4 of the index is ``x(i-2)``):

    >>> ca = RuleTableCA(2**32 - 2**16, radius=2, width=6)
    >>> ca.step(np.array([[1, 1, 0, 0, 0, 0]], dtype=np.uint8)).tolist()
    [[0, 0, 1, 1, 0, 0]]
    """

    kind = "ruletable"
    n_states = 2

    def __init__(self, rule, radius=2, width=21, boundary="periodic"):
        self.radius = check_radius(radius)
        self.rule = check_rule(rule, self.radius)
        self.n_sites = self.width = lattice.check_width(width)
        self.boundary = lattice.check_boundary(boundary)
        self._table = np.array(rule_table(self.rule, self.radius), dtype=np.uint8)
        self._weights = 2 ** np.arange(2 * self.radius, -1, -1, dtype=np.int64)  # offsets -r..r
        self._masks = rule_masks(self.rule, self.radius)
        self._source = lattice.padded_rows(self.width, self.radius, self.boundary)

    def describe(self):
        return {"rule": self.rule, "radius": self.radius, "width": self.width, "boundary": self.boundary}

    def step(self, states):
        states = np.asarray(states, dtype=np.uint8)
        lattice.check_state_values(states, 2)
        cells = lattice.neighbours(states, self.radius, self.boundary).astype(np.int64)
        index = np.tensordot(self._weights, cells, axes=1)
        return self._table[index]

    def reach(self, sites, steps):
        return lattice.reach(self.width, self.radius, self.boundary, sites, steps)

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        def run(words, steps, clamp_sites, clamp_words, watch, watch_from, out):
            _evolve_words(words, steps, self._masks, self.radius, self._source, clamp_sites, clamp_words, watch,
                          watch_from, out)

        return bitslice.evolve_packed(self, initial, steps, watch=watch, watch_from=watch_from,
                                      clamp_sites=clamp_sites, clamp_values=clamp_values, run=run)
