"""A Life-like automaton on a torus, written against cprobe's Medium interface (version 2).

Sites are the cells of a ``rows x cols`` grid numbered row-major (site
``r * cols + c`` is row ``r``, column ``c``); the top row neighbours the
bottom row and the left column the right one. Each cell is 0 (dead) or 1
(alive) and sees its eight Moore neighbours. A dead cell with a neighbour
count in the rule's birth set becomes alive; a live cell with a count in the
survival set stays alive; every other cell is dead at the next step.

Only ``step``, ``describe`` and ``reach`` are written here. ``evolve`` and
``settle`` are the interface's defaults, which loop over ``step``.
"""

from __future__ import annotations

import numpy as np

from media.errors import MediumInputError
from media.interface import Medium
from toruslife.rule import NEIGHBOURS, format_rule, parse_rule

MIN_SIDE = 3  # below 3 a cell's eight neighbours are not eight distinct cells


def check_side(value, field: str) -> int:
    """A grid side as an int >= 3 (ints or digit strings), or a one-line :class:`MediumInputError`."""
    text = str(value).strip()
    if isinstance(value, bool) or not isinstance(value, (int, np.integer, str)) or not text.isdigit() \
            or int(text) < MIN_SIDE:
        raise MediumInputError(f"{field}: {value!r} is not allowed; give a whole number >= {MIN_SIDE}, so that "
                               f"the 8 neighbours of a cell are 8 different cells of the torus")
    return int(text)


class TorusLife(Medium):
    """A Life-like (outer-totalistic, binary, Moore neighbourhood) automaton on a ``rows x cols`` torus.

    Parameters
    ----------
    rule
        Birth and survival counts in B/S notation, e.g. ``"B3/S23"`` (Conway's Life).
    rows, cols
        Grid size, each at least 3. Sites are numbered row-major.

    Examples
    --------
    A blinker on a 5 x 5 torus turns from a row into a column:

    >>> import numpy as np
    >>> life = TorusLife("B3/S23", rows=5, cols=5)
    >>> start = np.zeros((1, 25), dtype=np.uint8)
    >>> start[0, [11, 12, 13]] = 1
    >>> np.flatnonzero(life.step(start)[0]).tolist()
    [7, 12, 17]
    >>> life.describe()
    {'rule': 'B3/S23', 'rows': 5, 'cols': 5}
    """

    kind = "torus-life"
    n_states = 2

    def __init__(self, rule="B3/S23", rows=16, cols=16):
        self.birth, self.survival = parse_rule(rule, "rule")
        self.rule = format_rule(self.birth, self.survival)
        self.rows = check_side(rows, "rows")
        self.cols = check_side(cols, "cols")
        self.n_sites = self.rows * self.cols
        # next[state, live neighbours]: the outer-totalistic table, 2 x 9 entries.
        self._next = np.zeros((2, NEIGHBOURS + 1), dtype=np.uint8)
        self._next[0, list(self.birth)] = 1
        self._next[1, list(self.survival)] = 1

    def describe(self):
        return {"rule": self.rule, "rows": self.rows, "cols": self.cols}

    def step(self, states):
        states = np.asarray(states)
        if states.ndim != 2 or states.shape[1] != self.n_sites:
            raise MediumInputError(f"states: shape {states.shape} is not allowed; give (batch, {self.n_sites})")
        if states.size and (states.min() < 0 or states.max() > 1):
            raise MediumInputError(f"states: values must be 0 or 1, got {int(states.max())}")
        grid = states.astype(np.uint8, copy=False).reshape(-1, self.rows, self.cols)
        # Sum each cell's column of three, then three such columns side by side, then drop the cell itself.
        column = grid + np.roll(grid, 1, axis=1) + np.roll(grid, -1, axis=1)
        block = column + np.roll(column, 1, axis=2) + np.roll(column, -1, axis=2)
        live_neighbours = block - grid
        return self._next[grid, live_neighbours].reshape(states.shape[0], self.n_sites)

    def reach(self, sites, steps):
        """Cells within Chebyshev distance ``steps`` of any of ``sites``, measured around the torus.

        >>> life = TorusLife(rows=5, cols=6)
        >>> life.reach([0], 1).reshape(5, 6).astype(int).tolist()[:2]
        [[1, 1, 0, 0, 0, 1], [1, 1, 0, 0, 0, 1]]
        """
        row_of, col_of = np.divmod(np.arange(self.n_sites), self.cols)
        mask = np.zeros(self.n_sites, dtype=bool)
        for site in np.asarray(sites, dtype=np.int64).reshape(-1):
            rows_apart = np.abs(row_of - site // self.cols)
            cols_apart = np.abs(col_of - site % self.cols)
            rows_apart = np.minimum(rows_apart, self.rows - rows_apart)
            cols_apart = np.minimum(cols_apart, self.cols - cols_apart)
            mask |= np.maximum(rows_apart, cols_apart) <= steps
        return mask

    def transition_table(self):
        """Every 3 x 3 neighbourhood's next centre state, and the quiescent state: ``(outputs, 0)``.

        ``outputs`` has 512 entries. Entry ``i`` is for the block whose cells,
        read row by row from the north-west corner to the south-east one, are
        the binary digits of ``i``, most significant first (so the centre is
        the digit worth 16). This is the outer-totalistic table of 2 x 9
        entries written out per neighbourhood, the form Langton's lambda
        counts (Langton 1990, Physica D 42:12). An optional capability.

        >>> outputs, quiescent = TorusLife("B3/S23").transition_table()
        >>> int(outputs.sum()), outputs.size, quiescent
        (140, 512, 0)
        """
        blocks = np.arange(512)
        cells = (blocks[:, None] >> np.arange(8, -1, -1)) & 1
        centre = cells[:, 4]
        live_neighbours = cells.sum(axis=1) - centre
        return self._next[centre, live_neighbours].copy(), 0
