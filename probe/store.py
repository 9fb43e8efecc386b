"""The run store: one SQLite file per run folder, one transaction per finished task.

``runs.sqlite`` holds a ``meta`` table (tool, schema version, config hash)
and a ``results`` table (task number, the result row as JSON, its timings).
It runs in WAL mode, and every row is committed on its own, so a run killed
at any moment keeps every finished task and a rerun of the same config into
the same folder does only what is missing. A store that is not ours, is
corrupt, or belongs to another config is refused and left untouched: a copy
of it is checked before anything writes to it.
"""

from __future__ import annotations

import json
import shutil
import sqlite3
import tempfile
from pathlib import Path

from probe.errors import RunFolderConflict

STORE = "runs.sqlite"
TOOL = "cprobe"
SCHEMA = "1"


def check_store(path: Path, config_hash: str) -> None:
    """Raise :class:`RunFolderConflict` unless ``path`` is absent or a store of this tool and config."""
    path = Path(path)
    if not path.exists():
        return
    # Inspect a copy: opening the store itself, even read-only, could create -shm files or replay its WAL.
    with tempfile.TemporaryDirectory() as scratch:
        for suffix in ("", "-wal"):
            if Path(f"{path}{suffix}").exists():
                shutil.copyfile(f"{path}{suffix}", Path(scratch) / f"{STORE}{suffix}")
        try:
            connection = sqlite3.connect(Path(scratch) / STORE)
            try:
                meta = dict(connection.execute("SELECT key, value FROM meta").fetchall())
                connection.execute("SELECT count(*) FROM results").fetchone()
            finally:
                connection.close()
        except sqlite3.DatabaseError as error:
            raise RunFolderConflict(f"run store: {path} is not a readable {TOOL} store ({error}); left untouched. "
                                    f"Choose another --out") from None
    if meta.get("tool") != TOOL or meta.get("schema") != SCHEMA:
        raise RunFolderConflict(f"run store: {path} belongs to another program or schema "
                                f"(tool {meta.get('tool')!r}, schema {meta.get('schema')!r}); left untouched")
    if meta.get("config_hash") != config_hash:
        raise RunFolderConflict(f"run store: {path} holds results of another config (hash "
                                f"{str(meta.get('config_hash'))[:12]}); left untouched. Choose another --out")


class RunStore:
    """Finished tasks of one run, keyed by task number."""

    def __init__(self, path, config_hash: str):
        self.path = Path(path)
        check_store(self.path, config_hash)
        self.connection = sqlite3.connect(self.path, isolation_level=None)
        self.connection.execute("PRAGMA journal_mode=WAL")
        self.connection.execute("PRAGMA synchronous=NORMAL")
        self.connection.execute("CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL)")
        self.connection.execute("CREATE TABLE IF NOT EXISTS results (task INTEGER PRIMARY KEY, row TEXT NOT NULL, "
                                "evaluate REAL, tally REAL, measure REAL)")
        with self.connection:
            self.connection.execute("BEGIN")
            for key, value in (("tool", TOOL), ("schema", SCHEMA), ("config_hash", config_hash)):
                self.connection.execute("INSERT OR IGNORE INTO meta VALUES (?, ?)", (key, value))

    def finished(self) -> set:
        return {task for (task,) in self.connection.execute("SELECT task FROM results")}

    def add(self, task: int, row: dict, timings: dict) -> None:
        """Commit one finished task (one transaction)."""
        with self.connection:
            self.connection.execute("BEGIN")
            self.connection.execute("INSERT OR REPLACE INTO results VALUES (?, ?, ?, ?, ?)",
                                    (task, json.dumps(row), timings.get("evaluate", 0.0), timings.get("tally", 0.0),
                                     timings.get("measure", 0.0)))

    def replace_row(self, task: int, row: dict) -> None:
        """Replace the row of a finished task (e.g. after measures were added), keeping its timings."""
        with self.connection:
            self.connection.execute("BEGIN")
            self.connection.execute("UPDATE results SET row = ? WHERE task = ?", (json.dumps(row), task))

    def rows(self) -> list:
        """Every stored row, in task order."""
        return [json.loads(text) for (text,) in self.connection.execute("SELECT row FROM results ORDER BY task")]

    def timings(self) -> dict:
        evaluate, tally, measure = self.connection.execute(
            "SELECT coalesce(sum(evaluate), 0), coalesce(sum(tally), 0), coalesce(sum(measure), 0) FROM results"
        ).fetchone()
        return {"evaluate": evaluate, "tally": tally, "measure": measure}

    def close(self) -> None:
        self.connection.close()
