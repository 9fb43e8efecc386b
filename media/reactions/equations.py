"""Reaction equations as text: ``"2 a + b -> c + b"``.

A side is a sum of terms ``[coefficient] species`` joined by ``+``; the
coefficient is a whole number >= 1 (default 1), and a species written twice
adds up (``a + a`` is ``2 a``). The left side may be empty (``"-> a"``, or
``"∅ -> a"``): an inflow, which fires in every round. The right side may not
be empty: a reaction that produces nothing cannot change a closure, and is
refused as a likely typing error.

Species names start with a letter or ``_`` and go on with letters, digits and
``_`` (so that a name is never read as a site index or a range in a layout).

Examples
--------
>>> parse_equation("2 a + b -> c + b")
({'a': 2, 'b': 1}, {'c': 1, 'b': 1})
>>> parse_equation("-> a")
({}, {'a': 1})
>>> equation_text({'a': 2, 'b': 1}, {'c': 1})
'2 a + b -> c'
"""

from __future__ import annotations

import re

from media.errors import MediumInputError

ARROW = "->"
EMPTY_SIDE = ("", "∅")
NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")
TERM = re.compile(r"(?:(\d+)\s*)?([^\s\d]\S*)\Z")


def valid_name(name) -> bool:
    """True for a usable species name: a letter or ``_``, then letters, digits or ``_``."""
    return isinstance(name, str) and NAME.match(name) is not None


def parse_side(text: str, where: str) -> dict:
    """``"2 a + b"`` -> ``{"a": 2, "b": 1}``; an empty side (or ``∅``) -> ``{}``."""
    text = text.strip()
    if text in EMPTY_SIDE:
        return {}
    counts: dict = {}
    for term in text.split("+"):
        term = term.strip()
        match = TERM.match(term)
        if not term or match is None:
            raise MediumInputError(f"{where}: cannot read term {term!r}; write terms like '2 a' joined by ' + '")
        coefficient = int(match.group(1)) if match.group(1) is not None else 1
        name = match.group(2)
        if coefficient < 1:
            raise MediumInputError(f"{where}: coefficient {coefficient} of {name!r} must be a whole number >= 1")
        if not valid_name(name):
            raise MediumInputError(f"{where}: {name!r} is not a species name (a letter or _, then letters, "
                                   f"digits or _)")
        counts[name] = counts.get(name, 0) + coefficient
    return counts


def parse_equation(text, where: str = "reaction") -> tuple:
    """``"2 a + b -> c"`` -> ``(reactants, products)`` as ``{species: coefficient}`` dicts."""
    if not isinstance(text, str):
        raise MediumInputError(f"{where}: an equation must be a string like 'a + b -> c', got {text!r}")
    if text.count(ARROW) != 1:
        raise MediumInputError(f"{where}: needs exactly one '->' between reactants and products, "
                               f"like 'a + b -> c'")
    left, right = text.split(ARROW)
    return parse_side(left, where), parse_side(right, where)


def side_text(counts: dict) -> str:
    return " + ".join(name if count == 1 else f"{count} {name}" for name, count in counts.items())


def equation_text(reactants: dict, products: dict) -> str:
    """The canonical text of a reaction: ``"2 a + b -> c"`` (an inflow reads ``"-> c"``)."""
    return " ".join(part for part in (side_text(reactants), ARROW, side_text(products)) if part)
