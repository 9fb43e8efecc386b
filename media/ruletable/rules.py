"""Binary rule tables of radius ``r`` and their numbering.

A cell's neighbourhood ``x(i-r) .. x(i+r)`` has index
``sum over j = -r..r of x(i+j) * 2^(r-j)``: the leftmost neighbour is the most
significant bit. The new state is bit ``index`` of the rule number, so a
radius-``r`` rule is a number ``0 .. 2^(2^(2r+1)) - 1``. For ``r = 1`` the
index is ``4l + 2c + r`` and the rule number is Wolfram's elementary rule
number (Wolfram 1983, Rev. Mod. Phys. 55:601). Radius 3 has ``2^128``
rules, so rule numbers are Python ints.
"""

from __future__ import annotations

import numpy as np

from media.numbersets import check_whole_number

MIN_RADIUS, MAX_RADIUS = 1, 3
ALL_ONES = np.uint64(0xFFFFFFFFFFFFFFFF)


def check_radius(radius) -> int:
    return check_whole_number(radius, "radius", MIN_RADIUS, MAX_RADIUS)


def neighbourhoods(radius: int) -> int:
    """Number of neighbourhoods, ``2^(2r+1)``: the bits of a rule number.

    >>> [neighbourhoods(r) for r in (1, 2, 3)]
    [8, 32, 128]
    """
    return 2 ** (2 * radius + 1)


def rule_space(radius: int) -> int:
    """Number of rules, ``2^(2^(2r+1))``.

    >>> rule_space(1), rule_space(2), rule_space(3) == 2**128
    (256, 4294967296, True)
    """
    return 2 ** neighbourhoods(radius)


def check_rule(rule, radius: int) -> int:
    """``rule`` as an int, or a one-line error naming the allowed range for this ``radius``."""
    return check_whole_number(rule, "rule", 0, rule_space(radius) - 1, f" for radius={radius}")


def rule_table(rule: int, radius: int) -> list:
    """The ``2^(2r+1)`` outputs of ``rule``, indexed by the neighbourhood index.

    >>> rule_table(30, 1)
    [0, 1, 1, 1, 1, 0, 0, 0]
    """
    return [(rule >> index) & 1 for index in range(neighbourhoods(radius))]


def rule_from_function(function, radius: int) -> int:
    """The rule number of ``function(cells)``, where ``cells[j + r]`` is neighbour ``x(i+j)``.

    >>> rule_from_function(lambda cells: cells[0] ^ cells[1] ^ cells[2], 1)  # XOR of three: rule 150
    150
    """
    rule = 0
    span = 2 * radius + 1
    for index in range(neighbourhoods(radius)):
        cells = [(index >> (span - 1 - position)) & 1 for position in range(span)]
        rule |= (int(function(cells)) & 1) << index
    return rule


def rule_masks(rule: int, radius: int) -> np.ndarray:
    """One uint64 mask per neighbourhood: all ones where bit ``index`` of ``rule`` is set."""
    return np.array([ALL_ONES if bit else 0 for bit in rule_table(rule, radius)], dtype=np.uint64)
