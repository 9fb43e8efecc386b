"""Wolfram's totalistic codes.

A totalistic rule with ``k`` states and radius ``r`` gives a cell the new
state ``f(s)``, where ``s`` is the sum of the ``2r + 1`` states in its
neighbourhood, ``s = 0 .. (k-1)(2r+1)``. Its code is
``sum over s of f(s) * k^s`` (Wolfram, A New Kind of Science, 2002, p. 60
and the note on p. 886): digit ``s`` of the code in base ``k`` is ``f(s)``.
For ``k = 2, r = 1`` the 16 codes are the elementary rules whose output
depends only on ``l + c + r``; code 10 is rule 150.

Codes grow past int64 quickly (``k = 8, r = 3`` has ``8^50`` of them), so
they are Python ints.
"""

from __future__ import annotations

from media.numbersets import check_whole_number

MIN_STATES, MAX_STATES = 2, 8
MIN_RADIUS, MAX_RADIUS = 1, 3


def check_states(states) -> int:
    return check_whole_number(states, "states", MIN_STATES, MAX_STATES)


def check_radius(radius) -> int:
    return check_whole_number(radius, "radius", MIN_RADIUS, MAX_RADIUS)


def table_length(states: int, radius: int) -> int:
    """Number of neighbourhood sums, ``(k-1)(2r+1) + 1``: the digits of a code.

    >>> table_length(2, 1), table_length(3, 1), table_length(8, 3)
    (4, 7, 50)
    """
    return (states - 1) * (2 * radius + 1) + 1


def code_space(states: int, radius: int) -> int:
    """Number of codes, ``k^((k-1)(2r+1)+1)``.

    >>> code_space(2, 1), code_space(2, 2), code_space(3, 1)
    (16, 64, 2187)
    """
    return states ** table_length(states, radius)


def check_code(code, states: int, radius: int) -> int:
    """``code`` as an int, or a one-line error naming the allowed range for these ``states`` and ``radius``."""
    return check_whole_number(code, "code", 0, code_space(states, radius) - 1,
                              f" for states={states}, radius={radius}", base=states)


def code_table(code: int, states: int, radius: int) -> list:
    """``f(s)`` for ``s = 0 .. (k-1)(2r+1)``: the base-``k`` digits of ``code``, least significant first.

    >>> code_table(10, 2, 1)  # 10 = 0b1010: sums 1 and 3 give 1 (rule 150, the XOR of three cells)
    [0, 1, 0, 1]
    """
    digits = []
    for _ in range(table_length(states, radius)):
        code, digit = divmod(code, states)
        digits.append(digit)
    return digits


def code_from_table(table, states: int) -> int:
    """Inverse of :func:`code_table`: ``sum of table[s] * k^s``.

    >>> code_from_table([0, 1, 2, 0, 1, 2, 0], 3)  # new state = sum mod 3, for k = 3, r = 1
    588
    """
    return sum(int(value) * states**index for index, value in enumerate(table))


def binary_rule_number(code: int, radius: int = 1) -> int:
    """The rule-table number of a two-state totalistic code (bit ``n`` is ``f(popcount(n))``).

    For ``radius = 1`` this is the elementary (Wolfram 1983) rule number.

    >>> [binary_rule_number(code) for code in (0, 1, 10, 15)]
    [0, 1, 150, 255]
    """
    table = code_table(code, 2, radius)
    return sum(table[bin(index).count("1")] << index for index in range(2 ** (2 * radius + 1)))
