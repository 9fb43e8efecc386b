"""Measures in runs: compute the ``[measures]`` of a survey for each medium instance.

Measures belong to a medium instance, not to a layout, so each is computed
once per instance and its ``m_`` column is copied into every layout's row.
A measure may run on a variant of the instance: ``[measures] medium = {...}``
overrides instance parameters for every measure (e.g. a wider ring for
space-time diagrams) and ``[measures.medium_by_measure] name = {...}`` for one
measure (e.g. a small ring for transient lengths); ``[measures.options]
name = {...}`` sets a measure's options (e.g. fewer starts).
"""

from __future__ import annotations

from media import registry
from media.family import unknown_key_message


def measure_specs(names: list) -> list:
    """The registered specs for ``names``, refusing unknown names with the nearest one."""
    from probe.measures import MEASURES, MeasureUnavailable

    specs = []
    for name in names:
        if name not in MEASURES:
            raise MeasureUnavailable(unknown_key_message("[measures] names", name, MEASURES).replace(
                "unknown key", "unknown measure"))
        specs.append(MEASURES[name])
    return specs


def measure_params(measures: dict, name: str, params: dict) -> dict:
    """Instance parameters for measure ``name``: the instance's, then the overrides."""
    return {**params, **measures.get("medium", {}), **measures.get("medium_by_measure", {}).get(name, {})}


class InstanceMeasurer:
    """Computes and caches the measure columns of each instance of one survey."""

    def __init__(self, kind: str, measures: dict, seed: int):
        self.kind = kind
        self.measures = measures or {}
        self.seed = seed
        self.specs = measure_specs(self.measures.get("names", []))
        for table in ("medium_by_measure", "options"):
            unknown = set(self.measures.get(table, {})) - {spec.name for spec in self.specs}
            if unknown:
                from probe.measures import MeasureUnavailable

                raise MeasureUnavailable(f"[measures.{table}]: {sorted(unknown)[0]!r} is not in names")
        self._cache = {}

    @property
    def columns(self) -> list:
        return [spec.column for spec in self.specs]

    def __call__(self, params: dict) -> dict:
        key = tuple(sorted(params.items()))
        if key not in self._cache:
            values = {}
            media = {}
            for spec in self.specs:
                chosen = measure_params(self.measures, spec.name, params)
                medium_key = tuple(sorted(chosen.items()))
                if medium_key not in media:
                    media[medium_key] = registry.build(self.kind, **chosen)
                options = self.measures.get("options", {}).get(spec.name, {})
                values[spec.column] = spec.compute(media[medium_key], seed=self.seed, **options)
            self._cache[key] = values
        return self._cache[key]
