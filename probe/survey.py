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
from probe.errors import ConfigError
from probe.executors import TaskSpec, run_tasks
from probe.store import STORE, RunStore, check_store
from probe.evaluate import check_size, light_cone_report
from probe.tally import COLUMNS

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
    reserved = set(COLUMNS) | {"medium", "layout", "seed", "runs"}
    for params in ([tasks[0].params] if tasks else []):
        clash = sorted(reserved & (set(params) | set(family.annotate(params))))
        if clash:
            raise ConfigError(f"[medium]: family {config.medium_kind!r} names an instance parameter {clash[0]!r}, "
                              f"which is also a result column; rename it in the family")
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
    return ["medium", *params, *notes, "layout", "seed", *COLUMNS, *measures, "runs"]


def task_specs(plan: Plan) -> list:
    """The picklable form of every task, numbered in plan order."""
    config = plan.config
    return [TaskSpec(index=index, kind=config.medium_kind, params=dict(task.params),
                     layout=task.resolved.layout.to_dict(), seed=config.seed, max_runs=config.max_runs,
                     measures=dict(config.measures))
            for index, task in enumerate(plan.tasks)]


def run_plan(plan: Plan, *, progress: bool = True, executor: str = "serial", workers: int | None = None,
             address: str | None = None, store: RunStore | None = None) -> tuple:
    """Run every task not yet in ``store``; return all rows in plan order and the time spent on each part."""
    specs = task_specs(plan)
    done = store.finished() if store is not None else set()
    pending = [spec for spec in specs if spec.index not in done]
    timings = {"evaluate": 0.0, "tally": 0.0, "measure": 0.0}
    show = progress and sys.stderr.isatty()
    bar = tqdm(total=len(specs), initial=len(specs) - len(pending), unit="task", disable=not show,
               desc=plan.config.name, leave=True, dynamic_ncols=True)
    collected = {}
    prepared = {index: (task.medium, task.resolved, plan.measurer) for index, task in enumerate(plan.tasks)}
    for index, row, spent in run_tasks(pending, executor=executor, workers=workers, address=address,
                                       prepared=prepared):
        if store is not None:
            store.add(index, row, spent)
        collected[index] = row
        for key in timings:
            timings[key] += spent[key]
        bar.update(1)
    bar.close()
    rows = store.rows() if store is not None else [collected[index] for index in sorted(collected)]
    return rows, timings


def export_rows(folder: Path, rows: list, columns: list) -> list:
    """Write ``results.csv`` (and ``results.parquet`` when pyarrow is installed) atomically; return the paths."""
    written = [folder / runfolder.RESULTS]
    runfolder.write_atomic(written[0], runfolder.rows_to_csv(rows, columns))
    try:
        import pyarrow
        import pyarrow.parquet
    except ImportError:
        return written
    import io

    buffer = io.BytesIO()
    table = pyarrow.Table.from_pylist([{key: row.get(key) for key in columns} for row in rows])
    pyarrow.parquet.write_table(table, buffer)
    written.append(folder / "results.parquet")
    runfolder.write_atomic(written[-1], buffer.getvalue())
    return written


def run_survey(config, out=None, *, progress: bool = True, figure: bool = True, echo=None,
               executor: str = "serial", workers: int | None = None, address: str | None = None) -> SurveyResult:
    """Run a survey into a run folder and draw its summary figure.

    Parameters
    ----------
    config
        A :class:`~probe.config.SurveyConfig`, or a path to a TOML file.
    out
        The run folder (default ``outputs/<survey name>``). A folder that
        holds another config is refused and left untouched; one that holds
        this config is resumed: finished tasks are kept and skipped.
    progress
        Show a progress bar on a terminal.
    figure
        Draw ``capacity.png``.
    echo
        Callable for status lines (default: silent).
    executor, workers, address
        Where tasks run: ``"serial"``, ``"processes"`` (``workers`` local
        processes) or ``"dask"`` (a LocalCluster of ``workers``, or the
        scheduler at ``address``). All give identical rows.

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
    check_store(folder / STORE, config.config_hash)  # before anything is written into the folder
    config_text = config.source_text if config.source_text is not None else dumps_toml(config.to_dict())
    runfolder.write_atomic(folder / runfolder.CONFIG, config_text)
    # The manifest goes first, so an interrupted run still marks the folder as this config's.
    layouts = [layout.name for layout in config.layouts]
    extra = {"plan": plan.describe(), "layouts": layouts, "instances": plan.instances, "executor": executor}
    runfolder.write_atomic(folder / runfolder.MANIFEST, json.dumps(
        runfolder.manifest(config, {}, len(plan.tasks), {"status": "running", **extra}), indent=2))
    store = RunStore(folder / STORE, config.config_hash)
    try:
        resumed = len(store.finished())
        echo(plan.describe())
        if resumed:
            echo(f"resuming: {resumed} of {len(plan.tasks)} tasks already done in {folder / STORE}")
        for warning in plan.warnings:
            echo(f"warning: {warning}")
        started = time.perf_counter()
        rows, timings = run_plan(plan, progress=progress, executor=executor, workers=workers, address=address,
                                 store=store)
    finally:
        store.close()

    write_started = time.perf_counter()
    export_rows(folder, rows, result_columns(plan))
    figure_path = None
    if figure:
        from probe.figures import plot_capacity

        figure_path = plot_capacity(rows, folder / "capacity.png", family=plan.family, layouts=layouts,
                                    title=config.name)
    timings["write"] = time.perf_counter() - write_started
    timings["total"] = time.perf_counter() - started
    timings = {key: round(value, 4) for key, value in timings.items()}
    manifest = runfolder.manifest(config, timings, len(plan.tasks), {"status": "complete", **extra,
                                                                      "resumed_tasks": resumed})
    runfolder.write_atomic(folder / runfolder.MANIFEST, json.dumps(manifest, indent=2) + "\n")
    echo(f"done: {len(plan.tasks)} tasks ({len(plan.tasks) - resumed} run now, {resumed} resumed) in "
         f"{timings['total']:.1f} s with the {executor} executor -> {folder}")
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
    if (folder / STORE).exists():  # keep the store in step, so a resumed rerun exports the new columns too
        store = RunStore(folder / STORE, manifest["config_hash"])
        try:
            for index, row in enumerate(rows):
                store.replace_row(index, row)
        finally:
            store.close()
    export_rows(folder, rows, columns)
    manifest.setdefault("measures_added", []).append(
        {"names": list(names), "medium": dict(medium or {}), "seconds": round(time.perf_counter() - started, 3)})
    runfolder.write_atomic(manifest_path, json.dumps(manifest, indent=2) + "\n")
    echo(f"added {', '.join(measurer.columns)} to {len(instances)} instances in {folder / runfolder.RESULTS}")
    return folder / runfolder.RESULTS
