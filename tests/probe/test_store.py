"""The run store: resume after SIGKILL to identical rows; foreign or corrupt stores refused untouched.

Contract: issue 5, "A resumable run store" (SQLite in WAL mode, one transaction per row; a killed
survey resumes to rows identical to an uninterrupted run; a corrupt or foreign store is refused with a
message and left untouched)."""

from __future__ import annotations

import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

from probe.config import parse_config_text
from probe.errors import RunFolderConflict
from probe.runfolder import read_results
from probe.store import STORE, RunStore
from probe.survey import run_survey

CONFIG = """\
[survey]
name = "resume"
seed = 4

[medium]
kind = "eca"
rules = "all"
width = 17

[[layout]]
name = "slow"
signs = "7,8,9"
contexts = "1-6,10-15"
readout = "8,9"
window = "6:7"
"""


def cprobe(*args, **kwargs):
    command = [str(Path(sys.executable).parent / "cprobe"), *args]
    return subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, **kwargs)


def stored_tasks(path: Path) -> int:
    if not path.exists():
        return 0
    try:
        connection = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
        try:
            return connection.execute("SELECT count(*) FROM results").fetchone()[0]
        finally:
            connection.close()
    except sqlite3.DatabaseError:
        return 0


def test_killed_survey_resumes_to_identical_rows(tmp_path):
    config = tmp_path / "resume.toml"
    config.write_text(CONFIG)
    reference = run_survey(parse_config_text(CONFIG), tmp_path / "reference", progress=False, figure=False).rows

    folder = tmp_path / "killed"
    process = cprobe("survey", str(config), "--out", str(folder), "--quiet")
    deadline = time.monotonic() + 120
    while stored_tasks(folder / STORE) < 20 and time.monotonic() < deadline and process.poll() is None:
        time.sleep(0.05)
    assert process.poll() is None, "the survey finished before it could be killed; make it longer"
    os.kill(process.pid, signal.SIGKILL)
    process.wait()
    partial = stored_tasks(folder / STORE)
    assert 20 <= partial < 256, partial
    assert not (folder / "results.csv").exists()

    rerun = cprobe("survey", str(config), "--out", str(folder), "--quiet")
    assert rerun.wait(timeout=300) == 0, rerun.stderr.read().decode()
    assert read_results(folder) == read_results(tmp_path / "reference")
    assert len(reference) == 256


def test_resume_skips_finished_tasks(tmp_path):
    text = CONFIG.replace('rules = "all"', 'rules = "0-9"')
    first = run_survey(parse_config_text(text), tmp_path / "run", progress=False, figure=False)
    store = RunStore(tmp_path / "run" / STORE, parse_config_text(text).config_hash)
    # Mark a finished row so that recomputation would be visible.
    marked = dict(first.rows[3], code_instances=-12345)
    store.replace_row(3, marked)
    store.close()
    again = run_survey(parse_config_text(text), tmp_path / "run", progress=False, figure=False)
    assert again.rows[3]["code_instances"] == -12345  # taken from the store, not recomputed
    assert again.rows[:3] == first.rows[:3]


@pytest.mark.parametrize("kind", ["garbage", "foreign", "other-config"])
def test_bad_store_is_refused_and_untouched(tmp_path, kind):
    folder = tmp_path / "run"
    text = CONFIG.replace('rules = "all"', 'rules = "0-3"')
    if kind == "other-config":
        run_survey(parse_config_text(text.replace("seed = 4", "seed = 5")), tmp_path / "elsewhere",
                   progress=False, figure=False)
        folder.mkdir()
        (folder / STORE).write_bytes((tmp_path / "elsewhere" / STORE).read_bytes())
        # The manifest is missing here, so only the store says which config it holds.
        (folder / "manifest.json").write_text(
            (tmp_path / "elsewhere" / "manifest.json").read_text().replace(
                parse_config_text(text.replace("seed = 4", "seed = 5")).config_hash,
                parse_config_text(text).config_hash))
    else:
        folder.mkdir()
        if kind == "garbage":
            (folder / STORE).write_bytes(b"this is not a database, just bytes" * 40)
        else:
            connection = sqlite3.connect(folder / STORE)
            connection.execute("CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT)")
            connection.execute("INSERT INTO meta VALUES ('tool', 'another-program')")
            connection.execute("CREATE TABLE results (task INTEGER)")
            connection.commit()
            connection.close()
        (folder / "manifest.json").write_text(
            '{"config_hash": "%s"}' % parse_config_text(text).config_hash)
    before = {path.name: path.read_bytes() for path in folder.iterdir()}
    with pytest.raises(RunFolderConflict) as info:
        run_survey(parse_config_text(text), folder, progress=False, figure=False)
    assert "left untouched" in str(info.value) and "\n" not in str(info.value)
    assert {path.name: path.read_bytes() for path in folder.iterdir()} == before


def test_store_is_in_wal_mode_with_one_row_per_task(tmp_path):
    text = CONFIG.replace('rules = "all"', 'rules = "0-4"')
    run_survey(parse_config_text(text), tmp_path / "run", progress=False, figure=False)
    connection = sqlite3.connect(tmp_path / "run" / STORE)
    assert connection.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    assert connection.execute("SELECT count(*) FROM results").fetchone()[0] == 5
    connection.close()


def test_parquet_export_matches_the_csv(tmp_path):
    pyarrow_parquet = pytest.importorskip("pyarrow.parquet")
    text = CONFIG.replace('rules = "all"', 'rules = "0-7"')
    run_survey(parse_config_text(text), tmp_path / "run", progress=False, figure=False)
    table = pyarrow_parquet.read_table(tmp_path / "run" / "results.parquet").to_pylist()
    assert table == read_results(tmp_path / "run")
