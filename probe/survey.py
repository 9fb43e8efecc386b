"""Surveys: tally every medium instance of a family under every layout, into a run folder.

Data flow: config -> plan (instances x layouts) -> per task: evaluate, tally,
one result row -> ``results.csv`` -> summary figure. The manifest records
versions, the seed, the config hash and the time spent evaluating, tallying
and writing.
"""

from __future__ import annotations

import json
import sys
import time
from dataclasses import dataclass, field
from pathlib import Path

from tqdm import tqdm

from media import registry
from probe import runfolder
from probe.config import SurveyConfig, dumps_toml, load_config
from probe.evaluate import check_size, evaluate, light_cone_report
from probe.tally import COLUMNS, tally_table

DEFAULT_OUTPUT_ROOT = Path("outputs")


@dataclass
class Task:
    """One (medium instance, layout) pair of a plan."""

    params: dict
    medium: object
    resolved: object

    @property
    def work(self) -> int:
        """Cell updates this task needs: runs x sites x steps."""
        return self.resolved.runs * self.medium.n_sites * self.resolved.layout.run_steps


@dataclass
class Plan:
    """Every task of a survey, checked before anything runs."""

    config: SurveyConfig
    family: object
    tasks: list
    warnings: list = field(default_factory=list)
    measurer: object = None

    @property
    def instances(self) -> list:
        return list({tuple(sorted(task.params.items())): task.params for task in self.tasks}.values())

    @property
    def runs(self) -> int:
        return sum(task.resolved.runs for task in self.tasks)

    @property
    def work(self) -> int:
        return sum(task.work for task in self.tasks)

    def describe(self) -> str:
        instances = len(self.tasks) // max(1, len(self.config.layouts))
        return (f"plan: {instances} {self.config.medium_kind} instances x {len(self.config.layouts)} layouts = "
                f"{len(self.tasks)} tasks, {self.runs:,} runs, {self.work:,} cell updates (seed {self.config.seed})")


@dataclass
class SurveyResult:
    """What a survey produced: its rows and where they were written."""

    rows: list
    folder: Path | None
    figure: Path | None
    timings: dict


def plan_survey(config: SurveyConfig) -> Plan:
    """Expand the config into tasks, checking every layout and size limit before anything runs."""
    family = registry.family(config.medium_kind)
    tasks, warnings = [], []
    for params in family.expand(resolve_paths(family, config), config.seed):
        medium = registry.build(config.medium_kind, **params)
        for layout in config.layouts:
            resolved = layout.resolve(medium, config.seed)
            check_size(resolved, config.max_runs)
            if len(tasks) < len(config.layouts):  # geometry is shared, so the first instance speaks for all
                label = family.instance_label(params)
                warnings.extend(f"{label}: {line}" for line in light_cone_report(medium, resolved))
            tasks.append(Task(params=params, medium=medium, resolved=resolved))
    measurer = None
    if config.measures.get("names"):
        from probe.measuring import InstanceMeasurer

        measurer = InstanceMeasurer(config.medium_kind, config.measures, config.seed)
        if tasks:
            measurer(tasks[0].params)  # refuses a measure the medium cannot provide before anything runs
    return Plan(config=config, family=family, tasks=tasks, warnings=warnings, measurer=measurer)


def resolve_paths(family, config: SurveyConfig) -> dict:
    """The ``[medium]`` table with the family's file keys (``path_keys``) read relative to the config file."""
    table = dict(config.medium)
    if config.base_dir is None:
        return table
    for key in getattr(family, "path_keys", ()):
        if key not in table:
            continue
        values = table[key] if isinstance(table[key], list) else [table[key]]
        resolved = []
        for value in values:
            candidate = Path(config.base_dir) / str(value)
            if not Path(str(value)).is_absolute() and candidate.exists():
                value = _display_path(candidate)
            resolved.append(value)
        table[key] = resolved if isinstance(table[key], list) else resolved[0]
    return table


def _display_path(path: Path) -> str:
    try:
        return str(path.resolve().relative_to(Path.cwd().resolve()))
    except ValueError:
        return str(path.resolve())


def result_columns(plan: Plan) -> list:
    params = list(plan.tasks[0].params) if plan.tasks else []
    notes = list(plan.family.annotate(plan.tasks[0].params)) if plan.tasks else []
    measures = plan.measurer.columns if plan.measurer is not None else []
    return ["medium", *params, *notes, "layout", "seed", *COLUMNS, *measures, "runs", "seconds"]


def run_plan(plan: Plan, *, progress: bool = True) -> tuple:
    """Evaluate and tally every task; return the rows and the time spent on each part."""
    rows = []
    timings = {"evaluate": 0.0, "tally": 0.0, "measure": 0.0}
    show = progress and sys.stderr.isatty()
    bar = tqdm(total=len(plan.tasks), unit="task", disable=not show, desc=plan.config.name, leave=False)
    for task in plan.tasks:
        started = time.perf_counter()
        table = evaluate(task.medium, task.resolved, seed=plan.config.seed, max_runs=plan.config.max_runs)
        evaluated = time.perf_counter()
        tallies = tally_table(table)
        tallied = time.perf_counter()
        measured = plan.measurer(task.params) if plan.measurer is not None else {}
        timings["evaluate"] += evaluated - started
        timings["tally"] += tallied - evaluated
        timings["measure"] += time.perf_counter() - tallied
        rows.append({
            "medium": plan.config.medium_kind, **task.params, **plan.family.annotate(task.params),
            "layout": task.resolved.layout.name, "seed": plan.config.seed, **tallies.as_dict(), **measured,
            "runs": task.resolved.runs, "seconds": round(tallied - started, 6),
        })
        bar.update(1)
    bar.close()
    return rows, timings


def run_survey(config, out=None, *, progress: bool = True, figure: bool = True, echo=None) -> SurveyResult:
    """Run a survey into a run folder and draw its summary figure.

    Parameters
    ----------
    config
        A :class:`~probe.config.SurveyConfig`, or a path to a TOML file.
    out
        The run folder (default ``outputs/<survey name>``). A folder that
        holds another config is refused and left untouched.
    progress
        Show a progress bar on a terminal.
    figure
        Draw ``capacity.png``.
    echo
        Callable for status lines (default: silent).

    Examples
    --------
    >>> import tempfile
    >>> config = SurveyConfig.from_dict({
    ...     "survey": {"name": "doc"}, "medium": {"kind": "eca", "rules": "90,150", "width": 9},
    ...     "layout": [{"name": "a", "signs": "4", "contexts": "2,3,5,6", "readout": "4", "window": "2:2"}]})
    >>> result = run_survey(config, tempfile.mkdtemp(), progress=False, figure=False)
    >>> [(row["rule"], row["code_instances"]) for row in result.rows]
    [(90, 0), (150, 64)]
    """
    echo = echo or (lambda line: None)
    if not isinstance(config, SurveyConfig):
        config = load_config(config)
    plan = plan_survey(config)
    folder = Path(out) if out is not None else DEFAULT_OUTPUT_ROOT / config.name
    runfolder.claim(folder, config.config_hash)
    config_text = config.source_text if config.source_text is not None else dumps_toml(config.to_dict())
    runfolder.write_atomic(folder / runfolder.CONFIG, config_text)
    # The manifest goes first, so an interrupted run still marks the folder as this config's.
    runfolder.write_atomic(folder / runfolder.MANIFEST, json.dumps(
        runfolder.manifest(config, {}, len(plan.tasks), {"status": "running", "plan": plan.describe()}), indent=2))
    echo(plan.describe())
    for warning in plan.warnings:
        echo(f"warning: {warning}")

    started = time.perf_counter()
    rows, timings = run_plan(plan, progress=progress)

    write_started = time.perf_counter()
    runfolder.write_atomic(folder / runfolder.RESULTS, runfolder.rows_to_csv(rows, result_columns(plan)))
    figure_path = None
    if figure:
        from probe.figures import plot_capacity

        figure_path = plot_capacity(rows, folder / "capacity.png", family=plan.family,
                                    layouts=[layout.name for layout in config.layouts], title=config.name)
    timings["write"] = time.perf_counter() - write_started
    timings["total"] = time.perf_counter() - started
    timings = {key: round(value, 4) for key, value in timings.items()}
    manifest = runfolder.manifest(config, timings, len(plan.tasks), {
        "status": "complete", "plan": plan.describe(), "layouts": [layout.name for layout in config.layouts],
        "instances": plan.instances})
    runfolder.write_atomic(folder / runfolder.MANIFEST, json.dumps(manifest, indent=2) + "\n")
    echo(f"done: {len(plan.tasks)} tasks in {timings['total']:.1f} s -> {folder}")
    return SurveyResult(rows=rows, folder=folder, figure=figure_path, timings=timings)


def add_measures(folder, names: list, *, medium: dict | None = None, echo=None) -> Path:
    """Compute measures for every instance of an existing run and add their ``m_`` columns to ``results.csv``.

    The run's own seed is used. ``medium`` overrides instance parameters for
    these measures (e.g. ``{"width": 128}``). The manifest records what was
    added; the config and its hash stay as run.
    """
    from probe.measuring import InstanceMeasurer

    echo = echo or (lambda line: None)
    folder = Path(folder)
    manifest_path = folder / runfolder.MANIFEST
    if not manifest_path.exists() or not (folder / runfolder.RESULTS).exists():
        raise runfolder.RunFolderConflict(f"run folder: {folder} has no finished run; run `cprobe survey` first")
    manifest = json.loads(manifest_path.read_text())
    if manifest.get("status") != "complete" or "instances" not in manifest:
        raise runfolder.RunFolderConflict(f"run folder: {folder} holds no complete run with its instances listed; "
                                          f"rerun the survey into it first")
    rows = runfolder.read_results(folder)
    layouts = manifest["layouts"]
    instances = manifest["instances"]
    if len(rows) != len(instances) * len(layouts):
        raise runfolder.RunFolderConflict(f"run folder: {folder}: results.csv has {len(rows)} rows, the manifest "
                                          f"lists {len(instances)} instances x {len(layouts)} layouts")
    measurer = InstanceMeasurer(manifest["medium"], {"names": list(names), "medium": dict(medium or {})},
                                manifest.get("seed", 0))
    started = time.perf_counter()
    for index, params in enumerate(instances):
        values = measurer(params)
        for row in rows[index * len(layouts):(index + 1) * len(layouts)]:
            row.update(values)
    columns = list(rows[0])
    runfolder.write_atomic(folder / runfolder.RESULTS, runfolder.rows_to_csv(rows, columns))
    manifest.setdefault("measures_added", []).append(
        {"names": list(names), "medium": dict(medium or {}), "seconds": round(time.perf_counter() - started, 3)})
    runfolder.write_atomic(manifest_path, json.dumps(manifest, indent=2) + "\n")
    echo(f"added {', '.join(measurer.columns)} to {len(instances)} instances in {folder / runfolder.RESULTS}")
    return folder / runfolder.RESULTS
