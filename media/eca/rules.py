"""Elementary cellular automaton rules in Wolfram's numbering.

Wolfram 1983 (Rev. Mod. Phys. 55:601): the new state of a cell whose
neighbourhood is (left, centre, right) is bit ``4*left + 2*centre + right``
of the rule number. Reflection and complement follow A New Kind of Science
(Wolfram 2002, p. 57); under both, the 256 rules fall into 88 classes.
"""

import numbers
from functools import lru_cache

from media.errors import require

RULE_COUNT = 256


def check_rule(rule) -> int:
    """Return ``rule`` as an int, or raise if it is not a Wolfram number 0..255."""
    text = str(rule).strip()
    require(not isinstance(rule, (bool, float)) and text.isascii() and text.isdigit() and int(text) < RULE_COUNT,
            f"rule must be an integer 0..255, got {rule!r}")
    return int(text)


def rule_table(rule: int) -> list:
    """The 8 outputs of ``rule``, indexed by ``4*left + 2*centre + right``."""
    return [(rule >> index) & 1 for index in range(8)]


def reflect(rule: int) -> int:
    """The left-right mirror image: ``f'(l, c, r) = f(r, c, l)``."""
    out = 0
    for left in (0, 1):
        for centre in (0, 1):
            for right in (0, 1):
                bit = (rule >> (4 * right + 2 * centre + left)) & 1
                out |= bit << (4 * left + 2 * centre + right)
    return out


def complement(rule: int) -> int:
    """The 0/1-exchanged rule: ``f'(x) = 1 - f(not x)``."""
    out = 0
    for index in range(8):
        bit = 1 - ((rule >> (7 - index)) & 1)
        out |= bit << index
    return out


def equivalents(rule: int) -> tuple:
    """The distinct rules equivalent to ``rule`` under reflection and complement, sorted."""
    return tuple(sorted({rule, reflect(rule), complement(rule), reflect(complement(rule))}))


def representative(rule: int) -> int:
    """The smallest rule number of ``rule``'s equivalence class."""
    return equivalents(rule)[0]


@lru_cache(maxsize=None)
def representatives() -> tuple:
    """The 88 minimal representatives, sorted."""
    return tuple(sorted({representative(rule) for rule in range(RULE_COUNT)}))


def parse_rule_set(spec) -> list:
    """Expand a rule set: ``"all"``, ``"classes"`` (88 representatives), a list, or ``"0-15,30"``."""
    if isinstance(spec, str):
        text = spec.strip().lower()
        if text == "all":
            return list(range(RULE_COUNT))
        if text == "classes":
            return list(representatives())
        rules = []
        for part in text.split(","):
            part = part.strip()
            require(part != "", f"rules: empty item in {spec!r}; use 'all', 'classes', a list or ranges like '0-15,30'")
            if "-" in part:
                low, _, high = part.partition("-")
                require(low.strip().isdigit() and high.strip().isdigit(),
                        f"rules: cannot read {part!r}; use 'all', 'classes', a list or ranges like '0-15,30'")
                low, high = check_rule(int(low)), check_rule(int(high))
                require(low <= high, f"rules: range {part!r} runs backwards")
                rules.extend(range(low, high + 1))
            else:
                require(part.isdigit(), f"rules: cannot read {part!r}; use 'all', 'classes', a list or ranges like '0-15,30'")
                rules.append(check_rule(int(part)))
    elif isinstance(spec, numbers.Integral) and not isinstance(spec, bool):
        rules = [check_rule(spec)]
    else:
        require(isinstance(spec, (list, tuple)), f"rules must be 'all', 'classes', a list or a range string, got {spec!r}")
        rules = [check_rule(rule) for rule in spec]
    seen = set()
    return [rule for rule in rules if not (rule in seen or seen.add(rule))]
