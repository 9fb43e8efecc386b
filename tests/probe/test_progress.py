"""Progress on long runs: a bar (tasks, rate, ETA) on a terminal, silence when output is not a terminal or
under --quiet, and a closing summary line with the task count and time (issue 5, "Progress")."""

from __future__ import annotations

import io
import sys

from click.testing import CliRunner

from probe.cli import cli
from probe.config import parse_config_text
from probe.survey import run_survey

CONFIG = """\
[survey]
name = "progress"
[medium]
kind = "eca"
rules = "0-5"
width = 11
[[layout]]
name = "a"
signs = "5"
contexts = "3,4,6,7"
readout = "5"
window = "2:2"
"""


def test_summary_line_and_no_bar_when_not_a_terminal(tmp_path):
    config = tmp_path / "c.toml"
    config.write_text(CONFIG)
    result = CliRunner().invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run")])
    assert result.exit_code == 0, result.output
    assert "done: 6 tasks (6 run now, 0 resumed) in" in result.stderr
    assert "\r" not in result.stderr and "it/s" not in result.stderr and "task/s" not in result.stderr


def test_quiet_prints_nothing(tmp_path):
    config = tmp_path / "c.toml"
    config.write_text(CONFIG)
    result = CliRunner().invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run"), "--quiet"])
    assert result.exit_code == 0
    assert result.stderr == "" and result.stdout == ""


def test_bar_on_a_terminal(tmp_path, monkeypatch):
    class Terminal(io.StringIO):
        def isatty(self):
            return True

    screen = Terminal()
    monkeypatch.setattr(sys, "stderr", screen)
    run_survey(parse_config_text(CONFIG), tmp_path / "run", progress=True, figure=False)
    shown = screen.getvalue()
    assert "6/6" in shown and "task/s" in shown  # count and rate; tqdm shows the ETA in the same bar


def test_resume_is_reported(tmp_path):
    config = tmp_path / "c.toml"
    config.write_text(CONFIG)
    runner = CliRunner()
    runner.invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run"), "--quiet"])
    again = runner.invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run")])
    assert "resuming: 6 of 6 tasks already done" in again.stderr
    assert "done: 6 tasks (0 run now, 6 resumed)" in again.stderr
