"""Survey configurations in TOML.

A configuration has three kinds of table::

    [survey]            # name (run folder name), seed, max_runs
    [medium]            # kind = "eca", plus the family's survey keys (rules, width, ...)
    [[layout]]          # one or more; keys as in probe.layout.Layout
    [measures]          # optional: names = [...], medium = {overrides}, medium_by_measure = {name = {...}},
                        # options = {name = {option = value}}

Unknown keys are refused with the nearest valid key named. The config hash
(``config_hash``) is the SHA-256 of the canonical JSON of the parsed
configuration, so comments and key order do not change it.
"""

from __future__ import annotations

import hashlib
import json
import sys
from dataclasses import dataclass, field
from pathlib import Path

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from media.family import unknown_key_message
from probe.errors import ConfigError
from probe.evaluate import DEFAULT_MAX_RUNS
from probe.layout import Layout

SECTIONS = ("survey", "medium", "layout", "measures")
MEASURE_KEYS = ("names", "medium", "medium_by_measure", "options")
SURVEY_KEYS = ("name", "seed", "max_runs")


@dataclass
class SurveyConfig:
    """A parsed survey: what to probe, how, and under which seed.

    Examples
    --------
    >>> config = SurveyConfig.from_dict({
    ...     "survey": {"name": "demo", "seed": 3},
    ...     "medium": {"kind": "eca", "rules": "30,110", "width": 15},
    ...     "layout": [{"name": "a", "signs": "7", "contexts": "4-6,8-10", "readout": "7", "window": "3:3"}],
    ... })
    >>> config.medium["rules"], config.layouts[0].window
    ('30,110', (3, 3))
    """

    name: str
    medium_kind: str
    medium: dict
    layouts: list
    seed: int = 0
    max_runs: int = DEFAULT_MAX_RUNS
    measures: dict = field(default_factory=dict)
    source_text: str | None = field(default=None, compare=False)
    base_dir: Path | None = field(default=None, compare=False)

    @classmethod
    def from_dict(cls, data: dict, source_text: str | None = None) -> "SurveyConfig":
        for key in data:
            if key not in SECTIONS:
                raise ConfigError(unknown_key_message("config", key, SECTIONS).replace("unknown key", "unknown table"))
        survey = data.get("survey", {})
        if not isinstance(survey, dict):
            raise ConfigError("config: [survey] must be a table")
        for key in survey:
            if key not in SURVEY_KEYS:
                raise ConfigError(unknown_key_message("[survey]", key, SURVEY_KEYS))
        name = survey.get("name", "survey")
        if not isinstance(name, str) or not name or any(ch in name for ch in "/\\") or name.startswith("."):
            raise ConfigError(f"[survey] name: {name!r} must be a plain folder name (letters, digits, - and _)")
        seed = survey.get("seed", 0)
        if not isinstance(seed, int) or isinstance(seed, bool) or seed < 0:
            raise ConfigError(f"[survey] seed: {seed!r} must be a whole number >= 0")
        max_runs = survey.get("max_runs", DEFAULT_MAX_RUNS)
        if not isinstance(max_runs, int) or isinstance(max_runs, bool) or max_runs < 1:
            raise ConfigError(f"[survey] max_runs: {max_runs!r} must be a whole number >= 1")

        medium = data.get("medium", {})
        if not isinstance(medium, dict):
            raise ConfigError('config: [medium] must be a table, e.g. [medium] kind = "eca"')
        medium = dict(medium)
        if "kind" not in medium:
            raise ConfigError("[medium]: missing key 'kind' (e.g. kind = \"eca\"; `cprobe media` lists the kinds)")
        kind = medium.pop("kind")

        tables = data.get("layout", [])
        if isinstance(tables, dict):
            tables = [tables]
        if not isinstance(tables, list) or not all(isinstance(table, dict) for table in tables):
            raise ConfigError("config: layouts must be [[layout]] tables")
        if not tables:
            raise ConfigError("config: no [[layout]] table; give at least one")
        layouts = []
        for number, table in enumerate(tables, start=1):
            table = dict(table)
            table.setdefault("name", f"layout{number}")
            layouts.append(Layout.from_dict(table, where=f"[[layout]] {table['name']!r}"))
        names = [layout.name for layout in layouts]
        repeated = sorted({n for n in names if names.count(n) > 1})
        if repeated:
            raise ConfigError(f"[[layout]] name: {repeated[0]!r} is used twice; each layout needs its own name")
        measures = data.get("measures", {})
        if not isinstance(measures, dict):
            raise ConfigError("config: [measures] must be a table with names = [...]")
        for key in measures:
            if key not in MEASURE_KEYS:
                raise ConfigError(unknown_key_message("[measures]", key, MEASURE_KEYS))
        names = measures.get("names", [])
        if not isinstance(names, list) or not all(isinstance(item, str) for item in names):
            raise ConfigError(f"[measures] names: {names!r} must be a list of measure names (`cprobe measures` lists them)")
        for key in ("medium", "medium_by_measure", "options"):
            if not isinstance(measures.get(key, {}), dict):
                raise ConfigError(f"[measures] {key}: must be a table")
        return cls(name=name, medium_kind=kind, medium=medium, layouts=layouts, seed=seed, max_runs=max_runs,
                   measures=dict(measures), source_text=source_text)

    def to_dict(self) -> dict:
        """The canonical plain form (the inverse of :meth:`from_dict`)."""
        return {
            "survey": {"name": self.name, "seed": self.seed, "max_runs": self.max_runs},
            "medium": {"kind": self.medium_kind, **self.medium},
            "layout": [layout.to_dict() for layout in self.layouts],
            **({"measures": self.measures} if self.measures else {}),
        }

    @property
    def config_hash(self) -> str:
        canonical = json.dumps(self.to_dict(), sort_keys=True, separators=(",", ":"))
        return hashlib.sha256(canonical.encode()).hexdigest()


def parse_config_text(text: str, origin: str = "config") -> SurveyConfig:
    """Parse TOML text into a :class:`SurveyConfig`, with one-line errors naming ``origin``."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise ConfigError(f"{origin}: malformed TOML: {error}") from None
    return SurveyConfig.from_dict(data, source_text=text)


def load_config(path) -> SurveyConfig:
    """Read a survey configuration from a TOML file."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ConfigError(f"config: no such file {str(path)!r}") from None
    except UnicodeDecodeError:
        raise ConfigError(f"{path}: malformed TOML: not UTF-8 text") from None
    config = parse_config_text(text, origin=str(path))
    config.base_dir = path.resolve().parent
    return config


def dumps_toml(data: dict) -> str:
    """Write the plain form of a configuration as TOML (tables, arrays of tables, scalars, lists, inline tables)."""
    lines = []
    for section, body in data.items():
        tables = body if isinstance(body, list) else [body]
        for table in tables:
            if lines:
                lines.append("")
            lines.append(f"[[{section}]]" if isinstance(body, list) else f"[{section}]")
            for key, value in table.items():
                lines.append(f"{key} = {_toml_value(value)}")
    return "\n".join(lines) + "\n"


def _toml_value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return repr(value)
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=False).replace("\x7f", "\\u007f")
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_toml_value(item) for item in value) + "]"
    if isinstance(value, dict):
        return "{ " + ", ".join(f"{json.dumps(str(k))} = {_toml_value(v)}" for k, v in value.items()) + " }"
    raise ConfigError(f"config: cannot write {value!r} as TOML")
