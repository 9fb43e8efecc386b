"""Measures in runs and the report (issue 4): measure columns with the m_ prefix, refusals instead of
NaN columns, `cprobe measure` on a finished run, and `cprobe report` writing report.md with its tables,
figures, caution and reading."""

from __future__ import annotations

import csv
import json
import math

import pytest
from click.testing import CliRunner

from probe.cli import cli
from probe.config import parse_config_text
from probe.measures import MeasureUnavailable
from probe.runfolder import read_results
from probe.survey import plan_survey, run_survey

BASE = """\
[survey]
name = "report"
seed = 2

[medium]
kind = "eca"
rules = "{rules}"
width = 15

[[layout]]
name = "a"
signs = "7,8"
contexts = "3-6,9-12"
readout = "7,8"
window = "4:4"
"""

MEASURES = """
[measures]
names = ["langton_lambda", "zlib_ratio", "derrida_value"]
medium = {{ width = 32 }}

[measures.options]
zlib_ratio = {{ steps = 64, starts = 2 }}
"""


def config_text(rules="0-40", measures=True):
    return BASE.format(rules=rules) + (MEASURES.format() if measures else "")


def test_measure_columns_are_prefixed_and_seeded(tmp_path):
    rows = run_survey(parse_config_text(config_text()), tmp_path / "run", progress=False, figure=False).rows
    assert {"m_langton_lambda", "m_zlib_ratio", "m_derrida_value"} <= set(rows[0])
    by_rule = {row["rule"]: row for row in rows}
    assert by_rule[30]["m_langton_lambda"] == 0.5  # reference-values.md: Langton 1990, rule 30 -> 0.5
    assert all(not math.isnan(row["m_zlib_ratio"]) for row in rows)
    again = run_survey(parse_config_text(config_text()), tmp_path / "again", progress=False, figure=False).rows
    assert again == rows


@pytest.mark.parametrize("names, fragment", [
    ('["mean_sensitivity"]', "needs the Boolean function of every node"),
    ('["lambda"]', "did you mean 'langton_lambda'"),
])
def test_unavailable_measure_is_refused_before_running(tmp_path, names, fragment):
    text = BASE.format(rules="0-3") + f"\n[measures]\nnames = {names}\n"
    with pytest.raises(MeasureUnavailable, match=fragment):
        plan_survey(parse_config_text(text))
    config = tmp_path / "c.toml"
    config.write_text(text)
    result = CliRunner().invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run")])
    assert result.exit_code == 2
    assert result.stderr.count("\n") == 1 and result.stderr.startswith("error:")
    assert not (tmp_path / "run").exists()  # refused before anything was written


def test_measure_command_adds_columns_and_report_uses_them(tmp_path):
    config = tmp_path / "c.toml"
    config.write_text(config_text(rules="classes", measures=False))
    runner = CliRunner()
    assert runner.invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run"), "--quiet"]).exit_code == 0
    before = read_results(tmp_path / "run")
    added = runner.invoke(cli, ["measure", str(tmp_path / "run"), "--add", "langton_lambda,block_entropy",
                                "--set", "width=32"])
    assert added.exit_code == 0, added.output
    after = read_results(tmp_path / "run")
    assert len(after) == len(before) == 88
    assert all(set(row) - set(old) == {"m_langton_lambda", "m_block_entropy"} for row, old in zip(after, before))
    manifest = json.loads((tmp_path / "run" / "manifest.json").read_text())
    assert manifest["measures_added"][0]["names"] == ["langton_lambda", "block_entropy"]

    report = runner.invoke(cli, ["report", str(tmp_path / "run"), "--resamples", "199"])
    assert report.exit_code == 0, report.output
    text = (tmp_path / "run" / "report.md").read_text()
    for fragment in ("## Configuration", "## Semantic capacity", "## By published class",
                     "## Semantic capacity and complexity", "## What the numbers show", "not evidence of life",
                     "88 rows, one per equivalence class", "m_langton_lambda", "Spearman rho ="):
        assert fragment in text, fragment
    for figure in ("capacity_by_class.png", "tallies_heatmap.png", "measures_a.png"):
        assert (tmp_path / "run" / figure).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
        assert f"({figure})" in text
    with open(tmp_path / "run" / "comparison.csv") as handle:
        table = list(csv.DictReader(handle))
    assert {row["measure"] for row in table} == {"m_block_entropy", "m_langton_lambda"}
    assert all(row["n"] == "88" for row in table)


def test_report_without_measures_says_how_to_add_them(tmp_path):
    run_survey(parse_config_text(config_text(rules="0-20", measures=False)), tmp_path / "run", progress=False)
    result = CliRunner().invoke(cli, ["report", str(tmp_path / "run")])
    assert result.exit_code == 0
    assert "cprobe measure RUN --add" in (tmp_path / "run" / "report.md").read_text()


def test_report_on_a_folder_without_a_run_is_one_line_exit_2(tmp_path):
    result = CliRunner().invoke(cli, ["report", str(tmp_path)])
    assert result.exit_code == 2 and result.stderr.startswith("error:") and "cprobe survey" in result.stderr
