"""Executors: where the tasks of a survey run.

* ``serial``: in this process, one task after another.
* ``processes``: a pool of local worker processes (``concurrent.futures``;
  started with ``spawn`` so no numba thread state is forked).
* ``dask``: a ``dask.distributed`` cluster: a ``LocalCluster`` by default,
  or the scheduler at ``address``. Dask is an optional extra.

Every executor runs the same picklable :func:`execute_task` on the same
:class:`TaskSpec`, so all three give identical result rows; results arrive
in completion order and the caller stores them by task number.
"""

from __future__ import annotations

import os
import time
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass
from multiprocessing import get_context

from probe.errors import ProbeInputError

EXECUTORS = ("serial", "processes", "dask")
DASK_HINT = ("the dask executor needs the optional dask extra; install it with "
             "`.venv/bin/pip install 'dask[distributed]'` (or `pip install 'cprobe[dask]'`)")


@dataclass(frozen=True)
class TaskSpec:
    """Everything a worker needs to run one (medium instance, layout) task, as plain values."""

    index: int
    kind: str
    params: dict
    layout: dict
    seed: int
    max_runs: int
    measures: dict


_MEASURERS = {}


def execute_task(spec: TaskSpec, prepared=None) -> tuple:
    """Run one task: build the medium and layout, evaluate, tally, measure; return ``(index, row, timings)``.

    ``prepared`` is ``(medium, resolved_layout, measurer)`` when the caller already built them (the serial
    executor reuses the plan's), so nothing is built twice in one process.
    """
    from media import registry
    from probe.evaluate import evaluate
    from probe.layout import Layout
    from probe.tally import tally_table

    family = registry.family(spec.kind)
    if prepared is not None:
        medium, layout, measurer = prepared
    else:
        medium, layout, measurer = registry.build(spec.kind, **spec.params), Layout(**spec.layout), None
    started = time.perf_counter()
    table = evaluate(medium, layout, seed=spec.seed, max_runs=spec.max_runs)
    evaluated = time.perf_counter()
    tallies = tally_table(table)
    tallied = time.perf_counter()
    measured = {}
    if measurer is not None:
        measured = measurer(spec.params)
    elif spec.measures.get("names"):
        from probe.measuring import InstanceMeasurer

        key = (spec.kind, repr(sorted(spec.measures.items())), spec.seed)
        if key not in _MEASURERS:
            _MEASURERS[key] = InstanceMeasurer(spec.kind, spec.measures, spec.seed)
        measured = _MEASURERS[key](spec.params)
    done = time.perf_counter()
    name = table.resolved.layout.name
    row = {"medium": spec.kind, **spec.params, **family.annotate(spec.params), "layout": name,
           "seed": spec.seed, **tallies.as_dict(), **measured, "runs": table.resolved.runs}
    timings = {"evaluate": evaluated - started, "tally": tallied - evaluated, "measure": done - tallied}
    return spec.index, row, timings


def run_tasks(specs: list, *, executor: str = "serial", workers: int | None = None, address: str | None = None,
              prepared: dict | None = None):
    """Yield ``(index, row, timings)`` for every spec, in completion order.

    ``prepared`` maps task numbers to already built ``(medium, resolved_layout, measurer)``; only the
    serial executor, which runs in this process, uses it.
    """
    if executor not in EXECUTORS:
        raise ProbeInputError(f"executor: {executor!r} is not one of {', '.join(EXECUTORS)}")
    if workers is not None and workers < 1:
        raise ProbeInputError(f"workers: {workers!r} must be a whole number >= 1")
    if not specs:
        return
    if executor == "serial":
        for spec in specs:
            yield execute_task(spec, (prepared or {}).get(spec.index))
    elif executor == "processes":
        count = workers or os.cpu_count() or 1
        with ProcessPoolExecutor(max_workers=count, mp_context=get_context("spawn")) as pool:
            futures = [pool.submit(execute_task, spec) for spec in specs]
            for future in as_completed(futures):
                yield future.result()
    else:
        yield from _run_dask(specs, workers, address)


def _run_dask(specs, workers, address):
    try:
        from dask.distributed import Client, LocalCluster
        from dask.distributed import as_completed as dask_completed
    except ImportError:
        raise ProbeInputError(DASK_HINT) from None
    cluster = None
    if address is None:
        cluster = LocalCluster(n_workers=workers or os.cpu_count() or 1, threads_per_worker=1, processes=True,
                               dashboard_address=None)
        client = Client(cluster)
    else:
        client = Client(address)
    try:
        futures = client.map(execute_task, specs, pure=False)
        for future in dask_completed(futures):
            yield future.result()
    finally:
        client.close()
        if cluster is not None:
            cluster.close()
