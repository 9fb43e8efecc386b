"""Executors agree: serial, local processes and a two-worker Dask LocalCluster give identical rows
(issue 5, "Executors"); a missing Dask says how to install it."""

from __future__ import annotations

import builtins

import pytest

from probe.config import parse_config_text
from probe.errors import ProbeInputError
from probe.executors import TaskSpec, run_tasks
from probe.survey import run_survey

CONFIG = """\
[survey]
name = "executors"
seed = 9

[medium]
kind = "eca"
rules = "20-35"
width = 15

[[layout]]
name = "one"
signs = "7"
contexts = "3-6,8-11"
readout = "7"
window = "4:4"

[[layout]]
name = "random-background"
signs = "7,8"
contexts = "3-6,9-12"
readout = "7,8"
window = "4:5"
background = "random"
"""


def rows(tmp_path, executor, **kwargs):
    return run_survey(parse_config_text(CONFIG), tmp_path / executor, progress=False, figure=False,
                      executor=executor, **kwargs).rows


def test_serial_processes_and_dask_agree(tmp_path):
    pytest.importorskip("dask.distributed")
    serial = rows(tmp_path, "serial")
    assert len(serial) == 32 and any(row["code_instances"] > 0 for row in serial)
    assert rows(tmp_path, "processes", workers=2) == serial
    assert rows(tmp_path, "dask", workers=2) == serial  # a two-worker LocalCluster


def test_dask_scheduler_address(tmp_path):
    distributed = pytest.importorskip("dask.distributed")
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, dashboard_address=None) as cluster:
        by_address = rows(tmp_path, "dask", address=cluster.scheduler_address)
    assert by_address == rows(tmp_path, "serial")


def test_missing_dask_says_how_to_install(monkeypatch):
    real_import = builtins.__import__

    def no_dask(name, *args, **kwargs):
        if name.startswith("dask"):
            raise ImportError("no dask here")
        return real_import(name, *args, **kwargs)

    monkeypatch.setattr(builtins, "__import__", no_dask)
    spec = TaskSpec(0, "eca", {"rule": 30, "width": 9, "boundary": "periodic"},
                    {"signs": [4], "contexts": [3, 5], "readout": [4], "window": "1:1", "name": "a"}, 0, 1000, {})
    with pytest.raises(ProbeInputError, match=r"pip install 'dask\[distributed\]'"):
        list(run_tasks([spec], executor="dask"))


def test_unknown_executor_is_refused():
    with pytest.raises(ProbeInputError, match="executor: 'threads' is not one of serial, processes, dask"):
        list(run_tasks([object()], executor="threads"))
