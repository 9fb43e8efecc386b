"""A three-state test medium: a ring where each cell becomes the sum of its two neighbours mod 3.

It has no capabilities beyond the Medium interface and uses the default
(step-looping) ``evolve``, so it stands for a plugin medium with k > 2.
"""

from __future__ import annotations

import numpy as np

from media.interface import Medium


class SumModThree(Medium):
    kind = "sum-mod-3"
    n_states = 3

    def __init__(self, width=8):
        self.width = width
        self.n_sites = width

    def describe(self):
        return {"width": self.width}

    def step(self, states):
        states = np.asarray(states, dtype=np.uint8)
        return ((np.roll(states, 1, axis=1).astype(np.int64) + np.roll(states, -1, axis=1)) % 3).astype(np.uint8)
