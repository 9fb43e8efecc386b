"""Helpers shared by one-dimensional lattice media of radius ``r``.

A row of ``width`` cells is either a ring (``"periodic"``) or a row with
cells fixed at zero beyond both ends (``"fixed"``). Cell ``i`` sees the
``2r + 1`` cells ``i - r .. i + r``; on a ring narrower than the
neighbourhood a cell may be seen more than once.

Kernels use a *padded* row of ``width + 2r`` entries: entry ``p`` holds cell
``p - r``, and the ``r`` entries at each end hold zeros (fixed) or the cells
they wrap to, ``(p - r) mod width`` (periodic). Cell ``i``'s neighbourhood is
then entries ``i .. i + 2r``.
"""

from __future__ import annotations

import numpy as np

from media.errors import require
from media.jit import kernel
from media.numbersets import as_whole_number

BOUNDARIES = ("periodic", "fixed")


def check_width(width) -> int:
    number = as_whole_number(width)
    require(number is not None and number >= 1, f"width must be an integer >= 1, got {width!r}")
    return number


def check_boundary(boundary) -> str:
    require(isinstance(boundary, str) and boundary in BOUNDARIES,
            f"boundary must be one of {', '.join(BOUNDARIES)}, got {boundary!r}")
    return boundary


def check_state_values(states: np.ndarray, n_states: int, what: str = "states") -> None:
    """Refuse values ``>= n_states``, which a lookup ``step`` would misread or index past its table with."""
    top = int(states.max()) if states.size else 0
    require(top < n_states, f"{what} must lie in 0..{n_states - 1}, got {top}")


def neighbours(states: np.ndarray, radius: int, boundary: str) -> np.ndarray:
    """``(2r + 1, batch, width)``: entry ``[r + j, b, i]`` is the state of cell ``i + j`` of row ``b``.

    >>> neighbours(np.array([[1, 2, 3]], dtype=np.uint8), 1, "fixed")[:, 0].tolist()
    [[0, 1, 2], [1, 2, 3], [2, 3, 0]]
    >>> neighbours(np.array([[1, 2, 3]], dtype=np.uint8), 1, "periodic")[:, 0].tolist()
    [[3, 1, 2], [1, 2, 3], [2, 3, 1]]
    """
    batch, width = states.shape
    if boundary == "periodic":
        return np.stack([np.roll(states, -offset, axis=1) for offset in range(-radius, radius + 1)])
    padded = np.zeros((batch, width + 2 * radius), dtype=states.dtype)
    padded[:, radius : radius + width] = states
    return np.stack([padded[:, radius + offset : radius + offset + width] for offset in range(-radius, radius + 1)])


def padded_rows(width: int, radius: int, boundary: str) -> np.ndarray:
    """Cell held by each padded entry ``0 .. width + 2r - 1``; ``-1`` for a fixed zero.

    >>> padded_rows(3, 2, "periodic").tolist(), padded_rows(3, 2, "fixed").tolist()
    ([1, 2, 0, 1, 2, 0, 1], [-1, -1, 0, 1, 2, -1, -1])
    """
    cells = np.arange(-radius, width + radius)
    if boundary == "periodic":
        return cells % width
    return np.where((cells >= 0) & (cells < width), cells, -1)


def reach(width: int, radius: int, boundary: str, sites, steps: int) -> np.ndarray:
    """Cells within ring (or row) distance ``radius * steps`` of any of ``sites``.

    >>> np.flatnonzero(reach(9, 2, "fixed", [0], 1)).tolist()
    [0, 1, 2]
    >>> np.flatnonzero(reach(9, 2, "periodic", [0], 1)).tolist()
    [0, 1, 2, 7, 8]
    """
    mask = np.zeros(width, dtype=bool)
    positions = np.arange(width)
    for site in np.asarray(sites, dtype=np.int64).reshape(-1):
        distance = np.abs(positions - site)
        if boundary == "periodic":
            distance = np.minimum(distance, width - distance)
        mask |= distance <= radius * int(steps)
    return mask


@kernel
def _refresh_padding(rows, source, radius):
    """Copy the wrapped (or zero) cells into the ``radius`` padding rows at both ends of a padded row block.

    ``source[p]`` is the real row that padding row ``p`` mirrors, or -1 where it stays zero (fixed boundary).
    """
    n_padded = rows.shape[0]
    for p in range(n_padded):
        if (p < radius or p >= n_padded - radius) and source[p] >= 0:
            rows[p, :] = rows[radius + source[p], :]
