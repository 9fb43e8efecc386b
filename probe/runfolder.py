"""Run folders: the config as run, a manifest, the result rows and the figures.

A folder belongs to one configuration, identified by its config hash in
``manifest.json``. Writing into a folder that holds another configuration
(or files that are not a run folder's) is refused before anything is
written. Every file is written to a temporary name and renamed into place,
so an interrupted write never leaves a half file behind.
"""

from __future__ import annotations

import csv
import io
import json
import os
import platform
import sys
import tempfile
from datetime import datetime, timezone
from importlib import metadata
from pathlib import Path

from probe.errors import RunFolderConflict

MANIFEST = "manifest.json"
CONFIG = "config.toml"
RESULTS = "results.csv"
PACKAGES = ("cprobe", "numpy", "numba", "llvmlite", "scipy", "matplotlib", "click", "tqdm")


def claim(folder: Path, config_hash: str) -> Path:
    """Make sure ``folder`` is free for, or already holds, the run with ``config_hash``.

    Raises :class:`RunFolderConflict` (and touches nothing) if it holds another run.
    """
    folder = Path(folder)
    if folder.exists() and not folder.is_dir():
        raise RunFolderConflict(f"run folder: {folder} exists and is not a folder; choose another --out")
    manifest = folder / MANIFEST
    if manifest.exists():
        try:
            held = json.loads(manifest.read_text()).get("config_hash")
        except (json.JSONDecodeError, UnicodeDecodeError, AttributeError):
            raise RunFolderConflict(f"run folder: {manifest} is not a readable manifest; "
                                    f"choose another --out or remove the folder") from None
        if held != config_hash:
            raise RunFolderConflict(
                f"run folder: {folder} holds a run of a different config (hash {str(held)[:12]}, this one "
                f"{config_hash[:12]}); left untouched. Choose another --out or a new [survey] name")
    elif folder.exists() and any(folder.iterdir()):
        raise RunFolderConflict(f"run folder: {folder} is not empty and has no {MANIFEST}; left untouched. "
                                f"Choose another --out")
    folder.mkdir(parents=True, exist_ok=True)
    return folder


def write_atomic(path: Path, data) -> None:
    """Write ``data`` (str or bytes) to ``path`` through a temporary file and a rename."""
    path = Path(path)
    mode = "wb" if isinstance(data, bytes) else "w"
    handle, temporary = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".part")
    try:
        with os.fdopen(handle, mode, **({} if mode == "wb" else {"encoding": "utf-8", "newline": ""})) as out:
            out.write(data)
        os.replace(temporary, path)
    except BaseException:
        if os.path.exists(temporary):
            os.unlink(temporary)
        raise


def rows_to_csv(rows: list, columns: list) -> str:
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=columns, extrasaction="ignore", lineterminator="\n")
    writer.writeheader()
    for row in rows:
        writer.writerow(row)
    return buffer.getvalue()


def read_results(folder) -> list:
    """Result rows of a run folder as dicts, numbers converted back from text."""
    with open(Path(folder) / RESULTS, newline="", encoding="utf-8") as handle:
        return [{key: number_or_text(value) for key, value in row.items()} for row in csv.DictReader(handle)]


def number_or_text(text):
    """``"3"`` -> 3, ``"0.5"`` -> 0.5, anything else unchanged (CSV cells and KEY=VALUE options)."""
    for convert in (int, float):
        try:
            return convert(text)
        except ValueError:
            pass
    return text


def package_versions() -> dict:
    versions = {}
    for name in PACKAGES:
        try:
            versions[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            versions[name] = None
    return versions


def manifest(config, timings: dict, tasks: int, extra: dict | None = None) -> dict:
    return {
        "tool": "cprobe",
        "config_hash": config.config_hash,
        "seed": config.seed,
        "survey": config.name,
        "medium": config.medium_kind,
        "tasks": tasks,
        "created": datetime.now(timezone.utc).isoformat(timespec="seconds"),
        "python": sys.version.split()[0],
        "platform": platform.platform(),
        "packages": package_versions(),
        "timings_seconds": timings,
        **(extra or {}),
    }
