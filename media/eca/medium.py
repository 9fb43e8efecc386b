"""The elementary cellular automaton medium."""

import numpy as np

from media import bitslice
from media.eca.kernels import _evolve_words, _evolve_words_serial, block_words_for, rule_masks
from media.eca.rules import check_rule, rule_table
from media.errors import require
from media.interface import Medium

BOUNDARIES = ("periodic", "fixed")


class ElementaryCA(Medium):
    """A ring (``boundary="periodic"``) or a row with zero cells beyond both ends
    (``boundary="fixed"``) of ``width`` binary cells updated by Wolfram rule ``rule``.

    Examples
    --------
    >>> import numpy as np
    >>> ca = ElementaryCA(rule=90, width=7)
    >>> start = np.zeros((1, 7), dtype=np.uint8); start[0, 3] = 1
    >>> ca.step(start).tolist()
    [[0, 0, 1, 0, 1, 0, 0]]
    """

    kind = "eca"
    n_states = 2

    def __init__(self, rule, width=21, boundary="periodic"):
        self.rule = check_rule(rule)
        require(not isinstance(width, bool) and str(width).isascii() and str(width).isdigit() and int(width) >= 1,
                f"width must be a positive integer, got {width!r}")
        self.width = int(width)
        require(boundary in BOUNDARIES, f"boundary must be one of {', '.join(BOUNDARIES)}, got {boundary!r}")
        self.boundary = boundary
        self.n_sites = self.width
        self._table = np.array(rule_table(self.rule), dtype=np.uint8)
        self._masks = rule_masks(self.rule)

    def describe(self):
        return {"rule": self.rule, "width": self.width, "boundary": self.boundary}

    def step(self, states):
        states = np.asarray(states, dtype=np.uint8)
        if self.boundary == "periodic":
            left, right = np.roll(states, 1, axis=1), np.roll(states, -1, axis=1)
        else:
            left = np.zeros_like(states)
            right = np.zeros_like(states)
            left[:, 1:] = states[:, :-1]
            right[:, :-1] = states[:, 1:]
        return self._table[4 * left + 2 * states + right]

    def transition_table(self):
        """The rule table and the quiescent state: ``(outputs, 0)``.

        ``outputs`` holds the 8 new states, indexed by ``4*left + 2*centre + right``
        (Wolfram 1983); an optional capability read by ``probe.measures.langton_lambda``.

        >>> ElementaryCA(rule=110).transition_table()[0].tolist()
        [0, 1, 1, 1, 0, 1, 1, 0]
        """
        return self._table.copy(), 0

    def reach(self, sites, steps):
        mask = np.zeros(self.width, dtype=bool)
        positions = np.arange(self.width)
        for site in np.asarray(sites, dtype=np.int64).reshape(-1):
            distance = np.abs(positions - site)
            if self.boundary == "periodic":
                distance = np.minimum(distance, self.width - distance)
            mask |= distance <= steps
        return mask

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        block = block_words_for(self.n_sites)

        def run(words, steps, clamp_sites, clamp_words, watch, watch_from, out):
            # Threads only pay off with several blocks; a survey's small batches run on one.
            kernel = _evolve_words if words.shape[1] >= 4 * block else _evolve_words_serial
            kernel(words, steps, self._masks, self.boundary == "periodic", clamp_sites, clamp_words, watch,
                   watch_from, out, block)

        return bitslice.evolve_packed(self, initial, steps, watch=watch, watch_from=watch_from,
                                      clamp_sites=clamp_sites, clamp_values=clamp_values, run=run)
