"""The ``cprobe`` command line: help, the scripted tally call, one-line input errors with
exit status 2, the witness PNG, and run folders that refuse a different config untouched.

Contract: design.md section 6 ("Bad input gets one clear line that names the field and
the allowed range, and exit status 2 from the CLI; nothing already written is damaged";
"an enumeration over a size limit is refused with the size and a pointer to sampling";
"a different config is refused with a message") and probe/cli.py's docstring.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from click.testing import CliRunner

from probe import api
from probe.cli import cli
from probe.errors import LayoutError

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
COMMANDS = ("tally", "survey", "witness", "media")
TALLY_KEYS = ("code_instances", "codes", "coding_contexts", "coding_fraction", "contexts", "context_space",
              "distinct_mappings", "undefined_fraction", "co_information_bits", "seed")

# The call a script makes (README / issue wording); it must keep working exactly like this.
SCRIPTED = ["tally", "--medium", "eca", "--rule", "110", "--width", "21", "--signs", "10,11",
            "--contexts", "4-9,12-17", "--readout", "10,11", "--window", "4:8", "--json"]
# The same layout without --json, as a base that single options are changed on.
BASE = ["tally", "--rule", "110", "--width", "21", "--signs", "10,11", "--contexts", "4-9,12-17",
        "--readout", "10,11", "--window", "4:8"]

# Width 15, rule 110: the API finds codes at window 6:6 (590 instances) and none for rule 0.
WITNESS_LAYOUT = ["--width", "15", "--signs", "7,8", "--contexts", "4-6,9-11", "--readout", "7,8",
                  "--window", "6:6"]

TINY_CONFIG = """\
# a tiny survey: three rules, two readouts
[survey]
name = "tiny"
seed = 0

[medium]
kind = "eca"
rules = "30,90,110"
width = 11

[[layout]]
name = "one-step"
signs = "5"
contexts = "3,4,6,7"
readout = "5"
window = "2:2"

[[layout]]
name = "persist"
signs = "5"
contexts = "3,4,6,7"
readout = "5"
window = "1:2"
"""


def make_runner() -> CliRunner:
    """Separate stdout and stderr on every click version (``mix_stderr`` was removed in 8.2)."""
    try:
        return CliRunner(mix_stderr=False)
    except TypeError:
        return CliRunner()


def run(*args):
    return make_runner().invoke(cli, [str(a) for a in args])


def with_option(base, option, value):
    """``base`` with ``option`` set to ``value`` (replaced if present, appended if not)."""
    args = list(base)
    if option in args:
        args[args.index(option) + 1] = value
    else:
        args += [option, value]
    return args


def assert_one_error_line(result, *fragments):
    """Exit status 2, nothing on stdout, exactly one stderr line ``error: ...`` containing every fragment."""
    assert result.exit_code == 2, (result.exit_code, result.stdout, result.stderr, result.exception)
    assert result.stdout == ""
    lines = result.stderr.strip("\n").splitlines()
    assert len(lines) == 1, lines
    line = lines[0]
    assert line.startswith("error:"), line
    for fragment in fragments:
        assert fragment in line, (fragment, line)
    return line


def snapshot(folder: Path) -> dict:
    """Every file under ``folder`` (hidden ones too) with its bytes and modification time."""
    return {str(path.relative_to(folder)): (path.read_bytes(), path.stat().st_mtime_ns)
            for path in sorted(folder.rglob("*")) if path.is_file()}


def write_config(folder: Path, text: str, name: str = "config.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


# ---------------------------------------------------------------------------------- help


def test_top_level_help_lists_every_command():
    result = run("--help")
    assert result.exit_code == 0, result.output
    for command in sorted(set(COMMANDS) | set(cli.commands)):
        assert command in result.stdout


def test_every_command_is_covered_by_the_help_test():
    assert set(COMMANDS) <= set(cli.commands)


@pytest.mark.parametrize("flag", ["--help", "-h"])
@pytest.mark.parametrize("command", sorted(set(COMMANDS) | set(cli.commands)))
def test_command_help_has_an_example(command, flag):
    result = run(command, flag)
    assert result.exit_code == 0, result.output
    assert any(line.strip().startswith("Example") for line in result.stdout.splitlines()), result.stdout
    # The example shows the command itself being called.
    assert f"cprobe {command}" in result.stdout


def test_media_lists_eca():
    result = run("media")
    assert result.exit_code == 0, result.output
    assert any(line.startswith("eca:") for line in result.stdout.splitlines()), result.stdout
    assert "rule" in result.stdout


# ---------------------------------------------------------------------------------- tally


def test_scripted_tally_call_prints_one_json_object_matching_the_api():
    result = run(*SCRIPTED)
    assert result.exit_code == 0, (result.output, result.exception)
    lines = [line for line in result.stdout.splitlines() if line.strip()]
    assert len(lines) == 1, result.stdout
    record = json.loads(lines[0])
    assert isinstance(record, dict)
    missing = [key for key in TALLY_KEYS if key not in record]
    assert not missing, missing
    assert record["contexts"] == 4096
    assert record["context_space"] == 4096
    assert record["seed"] == 0

    medium = api.build_medium("eca", rule=110, width=21)
    layout = api.Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8")
    expected = api.tally(medium, layout, seed=0).as_dict()
    for key, value in expected.items():
        assert record[key] == value, (key, record[key], value)


def test_tally_json_follows_the_seed_and_the_layout():
    # A sampled, seeded run: the seed is echoed and the numbers are the API's for that seed.
    args = with_option(with_option(SCRIPTED, "--seed", "5"), "--sample", "64")
    result = run(*args)
    assert result.exit_code == 0, result.output
    record = json.loads(result.stdout)
    assert record["seed"] == 5
    assert record["contexts"] == 64 and record["context_space"] == 4096
    medium = api.build_medium("eca", rule=110, width=21)
    layout = api.Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8",
                        context_sample=64, name="cli")
    expected = api.tally(medium, layout, seed=5).as_dict()
    assert {key: record[key] for key in expected} == expected


def test_tally_without_json_prints_the_columns():
    result = run(*BASE)
    assert result.exit_code == 0, result.output
    for key in ("code_instances", "co_information_bits", "contexts"):
        assert key in result.stdout
    assert "4,096" in result.stdout


# ---------------------------------------------------------------------------------- input errors


@pytest.mark.parametrize("option, value, fragments", [
    ("--rule", "300", ("rule", "300", "0..255")),
    ("--rule", "-1", ("rule", "-1", "0..255")),
    ("--signs", "40", ("signs", "40", "0..20")),
    ("--window", "8:4", ("window", "t0", "t1")),
    ("--width", "0", ("width", "0")),
], ids=["rule-300", "rule-negative", "site-out-of-range", "window-backwards", "width-zero"])
def test_bad_tally_input_is_one_error_line_and_status_2(option, value, fragments):
    assert_one_error_line(run(*with_option(BASE, option, value)), *fragments)


def test_overlapping_sign_and_context_sites_are_refused():
    args = with_option(with_option(BASE, "--signs", "5"), "--contexts", "5")
    assert_one_error_line(run(*args), "5", "signs", "contexts")


def test_enumeration_over_the_size_limit_states_the_size_and_points_to_sampling():
    line = assert_one_error_line(run(*with_option(SCRIPTED, "--max-runs", "100")), "100")
    # 4 signs x 4096 contexts.
    assert "16384" in line.replace(",", "")
    assert "context_sample" in line or "--sample" in line


def test_witness_shares_the_error_handling():
    assert_one_error_line(run("witness", *WITNESS_LAYOUT, "--rule", "256"), "rule", "256")


def test_fewer_than_two_signs_is_refused_by_the_api():
    medium = api.build_medium("eca", rule=110, width=21)
    layout = api.Layout(signs="10", contexts="4-9", readout="10", window="1:1", sign_patterns=[[0]])
    with pytest.raises(LayoutError, match="sign"):
        layout.resolve(medium)
    with pytest.raises(LayoutError, match="two signs"):
        api.tally(medium, layout)


@pytest.mark.skipif("--sign-patterns" not in {opt for param in cli.commands["tally"].params for opt in param.opts},
                    reason="this cprobe has no --sign-patterns option")
def test_fewer_than_two_signs_is_refused_by_the_cli():
    assert_one_error_line(run(*with_option(BASE, "--sign-patterns", "10")), "sign_patterns", "two signs")


@pytest.mark.parametrize("edit, fragments", [
    (lambda text: text.replace('window = "2:2"', 'window = "2:2"\nsign_patterns = [[1]]', 1),
     ("sign_patterns", "two signs")),
    (lambda text: text.replace('window = "2:2"', 'window = "2:5"\nsteps = 3', 1),
     ("window", "2:5", "3")),
    (lambda text: text.replace("width = 11", "widht = 11"),
     ("'widht'", "'width'")),
    (lambda text: text.replace('window = "1:2"', 'windw = "1:2"'),
     ("'windw'", "'window'")),
    (lambda text: text + "\n[extras]\nnote = 1\n",
     ("'extras'", "table")),
    (lambda text: text.replace('kind = "eca"', 'kind = "eca'),
     ("malformed TOML",)),
    (lambda text: text.replace('seed = 0', 'seed = 0\nsed = 1'),
     ("'sed'", "'seed'")),
], ids=["one-sign", "window-outside-run", "medium-key", "layout-key", "unknown-table", "malformed-toml",
        "survey-key"])
def test_bad_config_is_one_error_line_and_writes_nothing(tmp_path, edit, fragments):
    bad = edit(TINY_CONFIG)
    assert bad != TINY_CONFIG
    path = write_config(tmp_path, bad, "bad.toml")
    out = tmp_path / "run"
    assert_one_error_line(run("survey", path, "--out", out, "--quiet"), *fragments)
    assert not out.exists()


def test_missing_config_file_is_one_error_line(tmp_path):
    assert_one_error_line(run("survey", tmp_path / "nowhere.toml", "--out", tmp_path / "run"), "nowhere.toml")


# ---------------------------------------------------------------------------------- witness


def test_witness_writes_a_png_for_a_layout_with_codes(tmp_path):
    medium = api.build_medium("eca", rule=110, width=15)
    layout = api.Layout(signs="7,8", contexts="4-6,9-11", readout="7,8", window="6:6")
    assert api.tally(medium, layout).code_instances > 0  # precondition found with the API

    out = tmp_path / "witness-110.png"
    result = run("witness", "--rule", "110", *WITNESS_LAYOUT, "--out", out)
    assert result.exit_code == 0, (result.output, result.exception)
    assert out.read_bytes()[:8] == PNG_SIGNATURE
    assert str(out) in result.stdout


def test_witness_without_codes_exits_1_with_a_message_and_draws_nothing(tmp_path):
    medium = api.build_medium("eca", rule=0, width=15)
    layout = api.Layout(signs="7,8", contexts="4-6,9-11", readout="7,8", window="6:6")
    assert api.tally(medium, layout).code_instances == 0

    out = tmp_path / "witness-0.png"
    result = run("witness", "--rule", "0", *WITNESS_LAYOUT, "--out", out)
    assert result.exit_code == 1, (result.output, result.exception)
    assert "no code" in result.stderr
    assert not out.exists()


# ---------------------------------------------------------------------------------- survey and run folders


def test_survey_writes_a_run_folder(tmp_path):
    config = write_config(tmp_path, TINY_CONFIG)
    out = tmp_path / "run"
    result = run("survey", config, "--out", out)
    assert result.exit_code == 0, (result.output, result.exception)
    for name in ("results.csv", "manifest.json", "config.toml", "capacity.png"):
        assert (out / name).is_file(), name
    assert (out / "capacity.png").read_bytes()[:8] == PNG_SIGNATURE
    assert (out / "config.toml").read_text(encoding="utf-8") == TINY_CONFIG
    lines = (out / "results.csv").read_text(encoding="utf-8").splitlines()
    assert len(lines) == 1 + 3 * 2  # header, then 3 rules x 2 layouts
    manifest = json.loads((out / "manifest.json").read_text(encoding="utf-8"))
    assert manifest["config_hash"] == api.parse_config_text(TINY_CONFIG).config_hash
    assert manifest["status"] == "complete"
    assert "results.csv" in result.stdout
    assert not [path.name for path in out.iterdir() if path.name.endswith(".part")]


def test_rerunning_the_same_config_into_the_same_folder_succeeds(tmp_path):
    config = write_config(tmp_path, TINY_CONFIG)
    out = tmp_path / "run"
    first = run("survey", config, "--out", out, "--quiet")
    assert first.exit_code == 0, first.output
    rows_before = (out / "results.csv").read_text().splitlines()
    second = run("survey", config, "--out", out, "--quiet")
    assert second.exit_code == 0, (second.output, second.exception)
    rows_after = (out / "results.csv").read_text().splitlines()
    assert len(rows_after) == len(rows_before)
    # A comment does not change the config hash, so it is the same run too.
    commented = write_config(tmp_path, "# rerun with a note\n" + TINY_CONFIG, "commented.toml")
    third = run("survey", commented, "--out", out, "--quiet")
    assert third.exit_code == 0, (third.output, third.exception)


@pytest.mark.parametrize("edit", [
    lambda text: text.replace("seed = 0", "seed = 1"),
    lambda text: text.replace('rules = "30,90,110"', 'rules = "30,90"'),
], ids=["other-seed", "other-rules"])
def test_a_different_config_is_refused_and_the_folder_left_untouched(tmp_path, edit):
    config = write_config(tmp_path, TINY_CONFIG)
    out = tmp_path / "run"
    assert run("survey", config, "--out", out, "--quiet").exit_code == 0
    before = snapshot(out)
    assert set(before) >= {"results.csv", "manifest.json", "config.toml", "capacity.png"}

    other = write_config(tmp_path, edit(TINY_CONFIG), "other.toml")
    assert api.parse_config_text(other.read_text()).config_hash != api.parse_config_text(TINY_CONFIG).config_hash
    line = assert_one_error_line(run("survey", other, "--out", out, "--quiet"), "different config")
    assert str(out) in line
    assert snapshot(out) == before


def test_a_non_empty_folder_without_manifest_is_refused_and_left_untouched(tmp_path):
    config = write_config(tmp_path, TINY_CONFIG)
    out = tmp_path / "run"
    out.mkdir()
    (out / "notes.txt").write_text("someone else's work\n")
    (out / "results.csv").write_text("not ours\n")
    before = snapshot(out)
    assert_one_error_line(run("survey", config, "--out", out, "--quiet"), "manifest")
    assert snapshot(out) == before


def test_an_out_path_that_is_a_file_is_refused_and_left_untouched(tmp_path):
    config = write_config(tmp_path, TINY_CONFIG)
    out = tmp_path / "run"
    out.write_text("a file\n")
    result = run("survey", config, "--out", out, "--quiet")
    assert result.exit_code == 2, result.output
    assert "--out" in result.stderr
    assert out.read_text() == "a file\n"


# Option values click itself rejects (type checks, missing options) are input errors too.
CLICK_USAGE_ERRORS = [
    (["tally", *with_option(BASE, "--density", "abc")[1:]], ("--density", "abc")),
    (["tally", "--rule", "110", "--contexts", "4-9", "--readout", "10"], ("--signs",)),
    (["survey", "x.toml", "--out", "{file}"], ("--out",)),
]


@pytest.mark.parametrize("args, fragments", CLICK_USAGE_ERRORS, ids=["density-not-float", "missing-signs",
                                                                      "out-is-a-file"])
def test_click_usage_errors_are_one_error_line_too(tmp_path, args, fragments):
    target = tmp_path / "a-file"
    target.write_text("x\n")
    assert_one_error_line(run(*[str(a).replace("{file}", str(target)) for a in args]), *fragments)
