"""``cprobe`` on the totalistic and rule-table media: tally from the command line agrees with the API,
surveys run from a config, and a witness is drawn (issue 3: every new medium from config and CLI)."""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner

from probe import api
from probe.cli import cli

LAYOUT = ["--signs", "6", "--contexts", "3-5,7-9", "--readout", "6", "--window", "3:3", "--width", "13"]

CASES = [
    ("totalistic", ["--param", "code=777", "--param", "states=3"], {"code": 777, "states": 3, "width": 13}),
    ("totalistic", ["--param", "code=10"], {"code": 10, "width": 13}),
    ("ruletable", ["--rule", "3735928559", "--param", "radius=2"], {"rule": 3735928559, "radius": 2, "width": 13}),
]


@pytest.mark.parametrize("kind, options, params", CASES, ids=["totalistic-k3", "totalistic-k2", "ruletable-r2"])
def test_cli_tally_matches_the_api(kind, options, params):
    result = CliRunner().invoke(cli, ["tally", "--medium", kind, *options, *LAYOUT, "--json"])
    assert result.exit_code == 0, result.output
    printed = json.loads(result.stdout)
    expected = api.tally(api.build_medium(kind, **params),
                         api.Layout(signs="6", contexts="3-5,7-9", readout="6", window="3:3"))
    for key, value in expected.as_dict().items():
        assert printed[key] == pytest.approx(value), key
    # k = 3 gives 3^6 contexts and 3 signs; k = 2 gives 2^6 and 2.
    k = params.get("states", 2)
    assert (printed["contexts"], printed["signs"]) == (k**6, k)


def test_totalistic_code_10_is_rule_150_through_the_cli():
    # reference-values.md (computed): totalistic k=2, r=1 code 10 is elementary rule 150.
    runner = CliRunner()
    one = json.loads(runner.invoke(cli, ["tally", "--medium", "totalistic", "--param", "code=10", *LAYOUT,
                                         "--json"]).stdout)
    two = json.loads(runner.invoke(cli, ["tally", "--medium", "eca", "--rule", "150", *LAYOUT, "--json"]).stdout)
    for key in ("code_instances", "codes", "coding_contexts", "distinct_mappings", "co_information_bits"):
        assert one[key] == two[key], key


def test_bad_totalistic_code_is_one_line_exit_2():
    result = CliRunner().invoke(cli, ["tally", "--medium", "totalistic", "--param", "code=99999", *LAYOUT])
    assert result.exit_code == 2
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("error:") and "99999" in lines[0]


@pytest.mark.parametrize("medium_table", [
    'kind = "totalistic"\nstates = 3\ncodes = "100-104"\nwidth = 13',
    'kind = "ruletable"\nradius = 2\nsample = 4\nwidth = 13',
], ids=["totalistic", "ruletable"])
def test_survey_from_a_config(tmp_path, medium_table):
    config = tmp_path / "c.toml"
    config.write_text(f"""[survey]\nname = "lattice"\nseed = 5\n\n[medium]\n{medium_table}\n
[[layout]]\nname = "a"\nsigns = "6"\ncontexts = "3-5,7-9"\nreadout = "6"\nwindow = "3:3"\n""")
    result = CliRunner().invoke(cli, ["survey", str(config), "--out", str(tmp_path / "run"), "--quiet"])
    assert result.exit_code == 0, result.output
    from probe.runfolder import read_results

    rows = read_results(tmp_path / "run")
    assert len(rows) == (5 if "totalistic" in medium_table else 4)
    assert all(row["seed"] == 5 for row in rows)
    assert (tmp_path / "run" / "capacity.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_witness_for_a_three_state_rule(tmp_path):
    out = tmp_path / "w.png"
    result = CliRunner().invoke(cli, ["witness", "--medium", "totalistic", "--param", "code=777", "--param",
                                      "states=3", *LAYOUT, "--out", str(out)])
    assert result.exit_code == 0, result.output
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
