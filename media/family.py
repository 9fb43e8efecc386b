"""Medium families: how a kind of medium is built from parameters and expanded for surveys.

A family is what the registry lists under a name (``eca``). It turns a flat
parameter dict (from a config table or command-line options) into a
:class:`~media.interface.Medium`, and it expands a survey's ``[medium]``
table into the parameter dicts of every instance to probe. It may also
attach published labels to an instance (``annotate``) and name the label
the summary figure colours by (``class_column``).
"""

from __future__ import annotations

import difflib
import zlib
from dataclasses import dataclass

import numpy as np

from media.errors import MediumInputError


@dataclass(frozen=True)
class Parameter:
    """One parameter of a family: its default (``REQUIRED`` if none) and a help line."""

    default: object
    help: str


REQUIRED = object()


def unknown_key_message(where: str, key: str, allowed) -> str:
    """One line naming an unknown key, the nearest allowed key and the full list."""
    allowed = sorted(allowed)
    close = difflib.get_close_matches(key, allowed, n=1, cutoff=0.5)
    hint = f"; did you mean {close[0]!r}?" if close else ""
    return f"{where}: unknown key {key!r}{hint} (allowed: {', '.join(allowed)})"


class MediumFamily:
    """Base class for families. Subclasses set ``name``, ``summary``, ``parameters``,
    ``survey_parameters`` and implement ``build`` and ``expand``."""

    name = "family"
    summary = ""
    parameters: dict = {}
    survey_parameters: dict = {}
    class_column = None

    def check_keys(self, params: dict, where: str, allowed) -> None:
        for key in params:
            if key not in allowed:
                raise MediumInputError(unknown_key_message(where, key, allowed))

    def with_defaults(self, params: dict, where: str = "medium") -> dict:
        """``params`` checked against ``parameters``, with defaults filled in."""
        self.check_keys(params, where, self.parameters)
        full = {}
        for key, spec in self.parameters.items():
            if key in params:
                full[key] = params[key]
            elif spec.default is REQUIRED:
                raise MediumInputError(f"{where}: missing parameter {key!r} ({spec.help})")
            else:
                full[key] = spec.default
        return full

    def build(self, **params):  # pragma: no cover - abstract
        raise NotImplementedError

    def expand(self, table: dict, seed: int) -> list:  # pragma: no cover - abstract
        raise NotImplementedError

    def annotate(self, params: dict) -> dict:
        return {}

    def instance_label(self, params: dict) -> str:
        return ", ".join(f"{key}={value}" for key, value in params.items())


class FileFamily(MediumFamily):
    """A family whose instances are read from files: ``network = "path"`` (or a list of paths in a survey).

    Subclasses set ``name``, ``summary`` and ``reader`` (a callable from a path to a medium).
    Relative paths in a survey config are read relative to the config file (``path_keys``).
    """

    parameters = {"network": Parameter(REQUIRED, "path of the network file")}
    survey_parameters = {"network": Parameter(REQUIRED, "path of the network file, or a list of paths")}
    path_keys = ("network",)

    @staticmethod
    def reader(path):  # pragma: no cover - abstract
        raise NotImplementedError

    def build(self, **params):
        return self.reader(self.with_defaults(params)["network"])

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        if "network" not in table:
            raise MediumInputError("[medium]: missing key 'network' (path of a network file, or a list of paths)")
        paths = table["network"] if isinstance(table["network"], list) else [table["network"]]
        return [{"network": str(path)} for path in paths]

    def instance_label(self, params):
        return str(params["network"])


def ensemble_seed(seed: int, purpose: str, *grid_point: int) -> int:
    """The seed of one ensemble member: ``SeedSequence([seed, crc32(purpose), *grid_point])``'s first word.

    Ensembles record it per row, so any member can be rebuilt from its row alone.
    """
    words = [int(seed), zlib.crc32(purpose.encode()), *(int(value) for value in grid_point)]
    return int(np.random.SeedSequence(words).generate_state(1, dtype=np.uint32)[0])


def grid_values(value, name: str, kind) -> list:
    """A survey grid axis: one value or a list, each of ``kind``; one-line errors name the key."""
    values = value if isinstance(value, list) else [value]
    if not values:
        raise MediumInputError(f"[medium] {name}: give at least one value")
    for item in values:
        if not isinstance(item, kind) or isinstance(item, bool):
            raise MediumInputError(f"[medium] {name}: {item!r} is not a {'whole number' if kind is int else 'number'}")
    return values
