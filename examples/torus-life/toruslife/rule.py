"""Life-like rules in B/S notation: read, check and write them.

A rule ``B<birth>/S<survival>`` lists the numbers of live Moore neighbours
(0-8) at which a dead cell is born and a live cell survives; every other cell
is dead at the next step. Conway's Life is ``B3/S23``. Letters may be lower
case and digits in any order; the canonical form is upper case with sorted
digits.
"""

from __future__ import annotations

import re

from media.errors import MediumInputError

NEIGHBOURS = 8  # Moore neighbourhood
ALLOWED = 'allowed: "B" and birth counts, "/", "S" and survival counts, each count 0-8 at most once, e.g. "B3/S23"'
_BS = re.compile(r"B(?P<birth>[0-9]*)/S(?P<survival>[0-9]*)", re.IGNORECASE)
_OLD_SB = re.compile(r"(?P<survival>[0-9]*)/(?P<birth>[0-9]*)")


def parse_rule(text, field: str = "rule") -> tuple:
    """``(birth, survival)`` as sorted tuples of neighbour counts, or a one-line :class:`MediumInputError`.

    Examples
    --------
    >>> parse_rule("B3/S23")
    ((3,), (2, 3))
    >>> parse_rule("b36/s32")
    ((3, 6), (2, 3))
    >>> parse_rule("B9/S23")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    media.errors.MediumInputError: rule: 'B9/S23' has birth count 9, but a site has 0-8 live neighbours; allowed: ...
    """
    if not isinstance(text, str):
        raise MediumInputError(f"{field}: {text!r} is not a rule in B/S notation; {ALLOWED}")
    stripped = text.strip()
    match = _BS.fullmatch(stripped)
    if match is None:
        old = _OLD_SB.fullmatch(stripped)
        hint = f' (the survival/birth form "{stripped}" is written "B{old["birth"]}/S{old["survival"]}")' if old else ""
        raise MediumInputError(f"{field}: {text!r} is not in B/S notation; {ALLOWED}{hint}")
    parts = []
    for part in ("birth", "survival"):
        counts = [int(digit) for digit in match[part]]
        for count in counts:
            if count > NEIGHBOURS:
                raise MediumInputError(f"{field}: {text!r} has {part} count {count}, but a site has "
                                       f"0-{NEIGHBOURS} live neighbours; {ALLOWED}")
        repeated = sorted({count for count in counts if counts.count(count) > 1})
        if repeated:
            raise MediumInputError(f"{field}: {text!r} repeats {part} count {repeated[0]}; {ALLOWED}")
        parts.append(tuple(sorted(counts)))
    return tuple(parts)


def format_rule(birth, survival) -> str:
    """The canonical text of a rule.

    >>> format_rule((6, 3), (3, 2))
    'B36/S23'
    >>> format_rule((), ())
    'B/S'
    """
    return "B" + "".join(str(n) for n in sorted(birth)) + "/S" + "".join(str(n) for n in sorted(survival))


def canonical_rule(text, field: str = "rule") -> str:
    """``text`` checked and written canonically: ``"s32/b3"`` is refused, ``"b3/s32"`` becomes ``"B3/S23"``.

    >>> canonical_rule(" b3/s32 ")
    'B3/S23'
    """
    return format_rule(*parse_rule(text, field))
