"""The example plugin in ``examples/torus-life``, installed as a third-party package and driven through the CLI.

Issue 6, part 1: "The plugin installs, is listed, passes the conformance suite
and is surveyed through the CLI." The package is installed once per module
into a temporary directory (pip, no dependencies, no build isolation) from a
copy of its folder, so a build leaves nothing behind in the work tree. Every
``cprobe`` run is a separate ``python -m probe.cli`` process with that
directory on ``PYTHONPATH``: the plugin reaches the probe only through the
``cprobe.media`` entry-point group, as an outside package would.

Also here: a plugin whose medium was written for another interface version is
refused by ``media.registry.build`` with one clear line (the CLI prints such
lines as ``error: ...`` with exit status 2, as the bad-rule test shows).
"""

from __future__ import annotations

import csv
import json
import os
import shutil
import subprocess
import sys
import textwrap
from importlib.metadata import EntryPoint
from pathlib import Path

import numpy as np
import pytest

from media import registry
from media.errors import MediumInputError
from media.family import MediumFamily, Parameter
from media.interface import INTERFACE_VERSION, Medium

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "torus-life"

# One layout on an 8 x 8 torus (site = 8 * row + col): signs at (3,3) and (3,4), contexts at
# (2,2)..(2,5), (4,2) and (4,3), the meaning read back at the sign sites and required to hold
# from step 2 to step 4. Every context lies within 2 cells of the readout.
LAYOUT = {"signs": "27,28", "contexts": "18-21,34,35", "readout": "27,28", "window": "2:4"}
TORUS = {"rows": 8, "cols": 8}


@pytest.fixture(scope="module")
def plugin_site(tmp_path_factory):
    """A directory holding the installed example package (toruslife plus its dist-info)."""
    root = tmp_path_factory.mktemp("torus-life")
    source = root / "source"
    shutil.copytree(EXAMPLE, source,
                    ignore=shutil.ignore_patterns("build", "*.egg-info", "__pycache__", ".pytest_cache"))
    site = root / "site"
    env = {**os.environ, "PIP_NO_INDEX": "1", "PIP_DISABLE_PIP_VERSION_CHECK": "1"}
    done = subprocess.run(
        [sys.executable, "-m", "pip", "install", "--quiet", "--no-deps", "--no-build-isolation",
         "--target", str(site), str(source)],
        capture_output=True, text=True, env=env, timeout=300)
    if done.returncode != 0:
        pytest.fail("pip could not install examples/torus-life (building it without isolation needs setuptools "
                    ">= 70.1, or an older setuptools plus the wheel package, in the test environment):\n"
                    + done.stderr[-3000:], pytrace=False)
    assert (site / "toruslife" / "__init__.py").exists()
    return site


def plugin_env(*paths) -> dict:
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join([*map(str, paths), *filter(None, [os.environ.get("PYTHONPATH")])])
    env["MPLBACKEND"] = "Agg"
    return env


def run_python(args, *paths, cwd):
    return subprocess.run([sys.executable, *args], capture_output=True, text=True, env=plugin_env(*paths),
                          cwd=cwd, timeout=300)


def cprobe(*args, paths, cwd):
    return run_python(["-m", "probe.cli", *args], *paths, cwd=cwd)


def layout_options(layout=LAYOUT):
    return [item for key, value in layout.items() for item in (f"--{key}", value)]


# --------------------------------------------------------------------------- a slow twin of the whole count

def naive_life_step(cells, rows, cols, birth, survival):
    """Conway-style update of one grid on a torus, written cell by cell."""
    new = []
    for r in range(rows):
        for c in range(cols):
            live = sum(cells[((r + dr) % rows) * cols + (c + dc) % cols]
                       for dr in (-1, 0, 1) for dc in (-1, 0, 1) if dr or dc)
            new.append(int(live in (survival if cells[r * cols + c] else birth)))
    return new


def naive_tallies(birth, survival, rows, cols, signs, contexts, readout, t0, t1) -> dict:
    """The order-2 tallies straight from design.md section 2, one run at a time."""
    meaning = {}
    for c in range(2 ** len(contexts)):
        for s in range(2 ** len(signs)):
            cells = [0] * (rows * cols)
            for j, site in enumerate(signs):
                cells[site] = (s >> j) & 1
            for j, site in enumerate(contexts):
                cells[site] = (c >> j) & 1
            seen = set()
            for t in range(t1 + 1):
                if t >= t0:
                    seen.add(tuple(cells[site] for site in readout))
                cells = naive_life_step(cells, rows, cols, birth, survival)
            meaning[c, s] = seen.pop() if len(seen) == 1 else None  # None: undefined
    n_contexts, n_signs = 2 ** len(contexts), 2 ** len(signs)
    instances, codes, coding = 0, set(), set()
    for c1 in range(n_contexts):
        for c2 in range(c1 + 1, n_contexts):
            for s1 in range(n_signs):
                for s2 in range(s1 + 1, n_signs):
                    m1, m2 = meaning[c1, s1], meaning[c1, s2]
                    if None in (m1, m2) or m1 == m2:
                        continue
                    if meaning[c2, s1] == m2 and meaning[c2, s2] == m1:
                        instances += 1
                        codes.add((s1, s2, frozenset((m1, m2))))
                        coding |= {c1, c2}
    return {
        "code_instances": instances, "codes": len(codes), "coding_contexts": len(coding),
        "contexts": n_contexts, "signs": n_signs,
        "distinct_mappings": len({tuple(meaning[c, s] for s in range(n_signs)) for c in range(n_contexts)}),
        "undefined_fraction": sum(value is None for value in meaning.values()) / len(meaning),
    }


@pytest.fixture(scope="module")
def life_expected():
    # B3/S23 written out by hand here, not parsed by the plugin.
    return naive_tallies({3}, {2, 3}, 8, 8, signs=[27, 28], contexts=[18, 19, 20, 21, 34, 35], readout=[27, 28],
                         t0=2, t1=4)


# --------------------------------------------------------------------------- through the CLI

def test_cprobe_media_lists_the_plugin(plugin_site, tmp_path):
    done = cprobe("media", paths=[plugin_site], cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    header = [number for number, line in enumerate(lines) if line.startswith("torus-life: ")]
    assert len(header) == 1, done.stdout
    listed = lines[header[0]: header[0] + 4]
    assert "Life-like automata" in listed[0]
    assert listed[1].split()[0] == "rule" and listed[1].endswith("(default 'B3/S23')")
    assert listed[2].split()[0] == "rows" and listed[2].endswith("(default 16)")
    assert listed[3].split()[0] == "cols" and listed[3].endswith("(default 16)")
    assert lines[0].startswith("eca: "), "built-in media come first"


def test_cprobe_tally_counts_what_the_slow_twin_counts(plugin_site, tmp_path, life_expected):
    done = cprobe("tally", "--medium", "torus-life", "--param", "rule=B3/S23", "--param", "rows=8",
                  "--param", "cols=8", *layout_options(), "--json", paths=[plugin_site], cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    assert "warning" not in done.stderr, "every readout site lies in the light cone"
    printed = json.loads(done.stdout)
    assert {key: printed[key] for key in ("medium", "rule", "rows", "cols")} == {
        "medium": "torus-life", "rule": "B3/S23", "rows": 8, "cols": 8}
    assert life_expected["code_instances"] > 0 and life_expected["undefined_fraction"] > 0  # a test with teeth
    for key, value in life_expected.items():
        assert printed[key] == pytest.approx(value), key


def test_cprobe_tally_refuses_a_bad_rule_in_one_line(plugin_site, tmp_path):
    done = cprobe("tally", "--medium", "torus-life", "--param", "rule=B3/S29", *layout_options(),
                  paths=[plugin_site], cwd=tmp_path)
    assert done.returncode == 2
    assert done.stderr.strip().splitlines() == [
        "error: rule: 'B3/S29' has survival count 9, but a site has 0-8 live neighbours; allowed: \"B\" and "
        "birth counts, \"/\", \"S\" and survival counts, each count 0-8 at most once, e.g. \"B3/S23\""]


def test_cprobe_survey_writes_results(plugin_site, tmp_path, life_expected):
    config = tmp_path / "torus.toml"
    config.write_text(textwrap.dedent(f"""\
        [survey]
        name = "torus-test"
        seed = 0

        [medium]
        kind = "torus-life"
        rules = ["B3/S23", "b36/s32", "B2/S"]
        rows = 8
        cols = 8

        [[layout]]
        name = "hold"
        signs = "{LAYOUT['signs']}"
        contexts = "{LAYOUT['contexts']}"
        readout = "{LAYOUT['readout']}"
        window = "{LAYOUT['window']}"

        [[layout]]
        name = "one-step"
        signs = "{LAYOUT['signs']}"
        contexts = "{LAYOUT['contexts']}"
        readout = "{LAYOUT['readout']}"
        window = "2:2"
        """))
    done = cprobe("survey", str(config), "--out", str(tmp_path / "run"), "--quiet", paths=[plugin_site],
                  cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    with open(tmp_path / "run" / "results.csv", newline="", encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    assert [(row["rule"], row["layout"]) for row in rows] == [
        ("B3/S23", "hold"), ("B3/S23", "one-step"), ("B36/S23", "hold"), ("B36/S23", "one-step"),
        ("B2/S", "hold"), ("B2/S", "one-step")]
    assert {(row["medium"], row["rows"], row["cols"]) for row in rows} == {("torus-life", "8", "8")}
    life = rows[0]
    for key in ("code_instances", "codes", "coding_contexts", "contexts", "distinct_mappings"):
        assert int(life[key]) == life_expected[key], key
    assert float(life["undefined_fraction"]) == pytest.approx(life_expected["undefined_fraction"])
    manifest = json.loads((tmp_path / "run" / "manifest.json").read_text())
    assert manifest["status"] == "complete" and manifest["medium"] == "torus-life"
    assert (tmp_path / "run" / "capacity.png").stat().st_size > 0


SHIPPED_SURVEY_SCRIPT = """
import json, sys
from probe.config import load_config
from probe.survey import plan_survey, run_plan

plan = plan_survey(load_config(sys.argv[1]))
rows, _ = run_plan(plan, progress=False)
print(json.dumps({"warnings": plan.warnings, "layouts": [layout.name for layout in plan.config.layouts],
                  "rules": plan.config.medium["rules"],
                  "rows": [[row["rule"], row["layout"], row["code_instances"]] for row in rows]}))
"""


def test_the_shipped_survey_config_runs_inside_the_light_cone(plugin_site, tmp_path):
    # The README's survey, run without its figure: every readout site must be reachable from signs and contexts.
    done = run_python(["-c", SHIPPED_SURVEY_SCRIPT, str(EXAMPLE / "survey.toml")], plugin_site, cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    report = json.loads(done.stdout)
    assert report["warnings"] == []
    assert len(report["layouts"]) == 3
    assert [row[:2] for row in report["rows"]] == [[rule, layout] for rule in report["rules"]
                                                    for layout in report["layouts"]]
    assert sum(row[2] > 0 for row in report["rows"]) >= len(report["rows"]) // 2


# --------------------------------------------------------------------------- imported from the install directory

CONFORMANCE_SCRIPT = """
import json, sys
import toruslife
from media import registry
from media.conformance import check_medium
from probe.measures import langton_lambda

family = registry.family("torus-life")
media = [registry.build("torus-life", **params) for params in (
    {}, {"rule": "B36/S23", "rows": 3, "cols": 5}, {"rule": "B0/S8", "rows": 6, "cols": 4},
    {"rule": "B1357/S02468", "rows": 5, "cols": 5})]
for medium in media:
    check_medium(medium)
print(json.dumps({"package": toruslife.__file__, "family": type(family).__module__,
                  "checked": [medium.describe() for medium in media], "lambda": langton_lambda(media[0])}))
"""


def test_plugin_passes_the_conformance_suite_from_its_install_directory(plugin_site, tmp_path):
    done = run_python(["-c", CONFORMANCE_SCRIPT], plugin_site, cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    report = json.loads(done.stdout)
    assert Path(report["package"]).resolve().is_relative_to(plugin_site.resolve())
    assert report["family"] == "toruslife"
    assert report["checked"][0] == {"rule": "B3/S23", "rows": 16, "cols": 16}
    assert len(report["checked"]) == 4
    # Conway's Life: 140 of 512 table entries alive (Langton 1990, Physica D 42:12; reference-values.md).
    assert report["lambda"] == 140 / 512


def test_the_example_packages_own_tests_pass(plugin_site, tmp_path):
    tests = plugin_site.parent / "source" / "tests"
    done = run_python(["-m", "pytest", str(tests), "-p", "no:cacheprovider"], plugin_site, cwd=tmp_path)
    assert done.returncode == 0, done.stdout[-3000:] + done.stderr[-2000:]
    summary = done.stdout.strip().splitlines()[-1]
    assert " passed" in summary and "failed" not in summary and "error" not in summary, summary
    assert int(summary.split(" passed")[0].split()[-1]) >= 48  # 4 media x 12 conformance checks, and more


# --------------------------------------------------------------------------- another interface version

class OldLife(Medium):
    """A medium that declares interface version 1 (before ``settle``)."""

    interface_version = 1
    n_sites = 4

    def step(self, states):
        return np.asarray(states, dtype=np.uint8).copy()

    def describe(self):
        return {}


class OldVersionFamily(MediumFamily):
    name = "old-life"
    summary = "a plugin written for interface version 1"
    parameters = {"size": Parameter(4, "ignored")}

    def build(self, **params):
        self.with_defaults(params)
        return OldLife()


def test_build_refuses_a_plugin_written_for_another_interface_version(monkeypatch):
    # Registered the way an installed package is: an entry point in the cprobe.media group.
    installed = registry.entry_points
    point = EntryPoint(name="old-life", value=f"{__name__}:OldVersionFamily", group=registry.ENTRY_POINT_GROUP)
    monkeypatch.setattr(registry, "entry_points", lambda group: [*installed(group=group), point])
    assert isinstance(registry.family("old-life"), OldVersionFamily)
    with pytest.raises(MediumInputError) as caught:
        registry.build("old-life")
    assert str(caught.value) == (f"medium 'old-life' was written for interface version 1, this probe speaks "
                                 f"version {INTERFACE_VERSION}")
    assert INTERFACE_VERSION != 1

