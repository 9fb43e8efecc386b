"""What every measure shares: the spec the registry lists, the refusal, and option checks.

A measure is one function ``<name>(medium, *, seed=0, **options) -> float``
in a module of the same name. It reaches the medium only through the Medium
interface plus optional *capabilities*: methods a medium may define and the
measure checks for with ``hasattr`` (see ``CAPABILITIES``). A measure that
does not apply to a medium refuses with :class:`MeasureUnavailable` (one
line naming the measure, what it needs and the medium); it never returns
NaN for "not applicable".
"""

from __future__ import annotations

import inspect
import numbers
from dataclasses import dataclass
from typing import Callable

from media.family import unknown_key_message
from probe.errors import ProbeInputError

COLUMN_PREFIX = "m_"

# capability -> what a refusal says the measure needs
CAPABILITIES = {
    "transition_table": "a transition table (transition_table(): the output of every neighbourhood configuration)",
    "boolean_functions": "the Boolean function of every node (boolean_functions(): inputs and truth table per node)",
}


class MeasureUnavailable(ProbeInputError):
    """A measure that this medium cannot provide (an unknown name, a missing capability, a medium too large)."""


class MeasureOptionError(ProbeInputError):
    """An unknown option of a measure, or an option value outside its range."""


def medium_label(medium) -> str:
    """``medium kind 'eca' (ElementaryCA, 64 sites)``: how refusals name the medium."""
    kind = getattr(medium, "kind", type(medium).__name__)
    return f"medium kind {kind!r} ({type(medium).__name__}, {medium.n_sites} sites)"


def require_capability(medium, capability: str, measure: str) -> None:
    """Raise :class:`MeasureUnavailable` unless ``medium`` has the method ``capability``."""
    if not callable(getattr(medium, capability, None)):
        raise MeasureUnavailable(f"measure {measure!r} needs {CAPABILITIES[capability]}; "
                                 f"{medium_label(medium)} does not provide one")


def whole_number(value, option: str, measure: str, minimum: int = 1, maximum: int | None = None) -> int:
    """``value`` as an int in ``minimum..maximum``, or :class:`MeasureOptionError` naming the option."""
    allowed = f">= {minimum}" if maximum is None else f"in {minimum}..{maximum}"
    if isinstance(value, bool) or not isinstance(value, numbers.Integral) \
            or value < minimum or (maximum is not None and value > maximum):
        raise MeasureOptionError(f"measure {measure!r}: option {option} = {value!r} must be a whole number {allowed}")
    return int(value)


@dataclass(frozen=True)
class MeasureSpec:
    """One registered measure.

    ``name`` is the key in ``MEASURES`` and the function's name; ``column`` the
    result column (always ``m_`` + name); ``summary`` one line stating the
    quantity, units, log base, normalisation and initial conditions;
    ``requires`` the capabilities the medium must provide.
    """

    name: str
    column: str
    function: Callable
    summary: str
    requires: tuple = ()

    def __post_init__(self):
        if not self.column.startswith(COLUMN_PREFIX):  # pragma: no cover - a programming error
            raise ValueError(f"measure {self.name!r}: column {self.column!r} must start with {COLUMN_PREFIX!r}")
        for capability in self.requires:
            if capability not in CAPABILITIES:  # pragma: no cover - a programming error
                raise ValueError(f"measure {self.name!r}: unknown capability {capability!r}")

    @property
    def options(self) -> dict:
        """The measure's options (keyword arguments other than ``seed``) and their defaults."""
        parameters = inspect.signature(self.function).parameters.values()
        return {p.name: p.default for p in parameters if p.kind is p.KEYWORD_ONLY and p.name != "seed"}

    def compute(self, medium, seed: int = 0, **options) -> float:
        """Check the options and the medium's capabilities, then compute the measure."""
        allowed = self.options
        for key in options:
            if key not in allowed:
                if not allowed:
                    raise MeasureOptionError(f"measure {self.name!r} takes no options, got {key!r}")
                raise MeasureOptionError(unknown_key_message(f"measure {self.name!r} options", key, allowed))
        for capability in self.requires:
            require_capability(medium, capability, self.name)
        return float(self.function(medium, seed=seed, **options))
