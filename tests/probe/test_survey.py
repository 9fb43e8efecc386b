"""Surveys: one result row per (medium instance, layout), equal to the one-call API, with
the seed, config hash, versions and timings recorded; reproducible under a seed.

Contract: design.md section 2 (the tally columns), section 4 (a run folder holds the
config as run, a manifest with versions, seeds, config hash and timings, and the result
rows); Wolfram classes from media/eca/classes.py (Martinez 2013 table), with rule 137
the complement of 110 (Wolfram 2002, p. 57) and so in its class.
"""

from __future__ import annotations

import json

import pytest

from media.eca import complement
from probe import api, runfolder
from probe.config import parse_config_text
from probe.errors import EnumerationTooLarge, RunFolderConflict
from probe.survey import plan_survey, run_survey

DESIGN_COLUMNS = ("code_instances", "codes", "coding_contexts", "coding_fraction", "contexts", "context_space",
                  "distinct_mappings", "undefined_fraction", "co_information_bits")
ROW_KEYS = ("medium", "rule", "width", "layout", "seed", "wolfram_class", *DESIGN_COLUMNS, "runs")


def tiny_text(seed=0, rules="30,90,110", background=None):
    extra = f'background = "{background}"\n' if background else ""
    return f"""\
[survey]
name = "tiny"
seed = {seed}

[medium]
kind = "eca"
rules = "{rules}"
width = 13

[[layout]]
name = "one-step"
signs = "6"
contexts = "4,5,7,8"
readout = "6"
window = "2:2"
{extra}
[[layout]]
name = "pair"
signs = "6,7"
contexts = "3-5,8-10"
readout = "6,7"
window = "1:3"
{extra}"""


def survey(tmp_path, text, folder="run", **kwargs):
    kwargs.setdefault("figure", False)
    return run_survey(parse_config_text(text), tmp_path / folder, progress=False, **kwargs)


def without_seconds(rows):
    return [{key: value for key, value in row.items() if key != "seconds"} for row in rows]


@pytest.fixture(scope="module")
def tiny(tmp_path_factory):
    folder = tmp_path_factory.mktemp("tiny")
    config = parse_config_text(tiny_text(seed=4))
    return config, run_survey(config, folder / "run", progress=False, figure=False)


def test_one_row_per_rule_and_layout(tiny):
    config, result = tiny
    pairs = [(row["rule"], row["layout"]) for row in result.rows]
    assert pairs == [(rule, layout) for rule in (30, 90, 110) for layout in ("one-step", "pair")]


def test_rows_have_the_design_columns(tiny):
    _, result = tiny
    for row in result.rows:
        missing = [key for key in ROW_KEYS if key not in row]
        assert not missing, missing
    header = (result.folder / runfolder.RESULTS).read_text(encoding="utf-8").splitlines()[0].split(",")
    assert [key for key in ROW_KEYS if key not in header] == []


def test_seed_is_in_every_row_and_in_the_manifest(tiny):
    config, result = tiny
    assert all(row["seed"] == 4 for row in result.rows)
    assert all(row["seed"] == 4 for row in runfolder.read_results(result.folder))
    manifest = json.loads((result.folder / runfolder.MANIFEST).read_text(encoding="utf-8"))
    assert manifest["seed"] == 4
    assert manifest["config_hash"] == config.config_hash
    assert manifest["status"] == "complete"
    assert manifest["tasks"] == len(result.rows)
    for package in ("cprobe", "numpy", "numba", "click"):
        assert manifest["packages"].get(package), package
    timings = manifest["timings_seconds"]
    for part in ("evaluate", "tally", "write", "total"):
        assert isinstance(timings[part], (int, float)) and timings[part] >= 0, part
    assert timings == result.timings


def test_csv_rows_equal_the_returned_rows(tiny):
    _, result = tiny
    assert runfolder.read_results(result.folder) == result.rows


def test_config_as_run_is_kept(tiny):
    config, result = tiny
    assert (result.folder / runfolder.CONFIG).read_text(encoding="utf-8") == config.source_text


def test_rows_equal_the_api_tally(tiny):
    config, result = tiny
    layouts = {layout.name: layout for layout in config.layouts}
    for row in result.rows:
        medium = api.build_medium("eca", rule=row["rule"], width=row["width"], boundary=row["boundary"])
        expected = api.tally(medium, layouts[row["layout"]], seed=config.seed).as_dict()
        assert {key: row[key] for key in expected} == expected, (row["rule"], row["layout"])
        assert row["runs"] == expected["signs"] * expected["contexts"]


def test_the_survey_finds_codes_where_there_are_some(tiny):
    # Guards the comparison above against a survey of nothing but zeros.
    _, result = tiny
    assert any(row["code_instances"] > 0 for row in result.rows)


def test_class_labels(tmp_path):
    assert complement(110) == 137
    result = survey(tmp_path, tiny_text(rules="110,30,137"))
    classes = {row["rule"]: row["wolfram_class"] for row in result.rows}
    assert classes == {110: 4, 30: 3, 137: 4}
    representative = {row["rule"]: row["class_representative"] for row in result.rows}
    assert representative[137] == 110


def test_same_config_twice_gives_the_same_rows(tmp_path):
    first = survey(tmp_path, tiny_text(seed=2), "first")
    second = survey(tmp_path, tiny_text(seed=2), "second")
    assert without_seconds(first.rows) == without_seconds(second.rows)
    again = survey(tmp_path, tiny_text(seed=2), "first")  # resumed into its own folder
    assert without_seconds(again.rows) == without_seconds(first.rows)
    # Timings live in the store and the manifest, not in the rows, so reruns give identical rows.
    assert "seconds" not in first.rows[0]
    assert first.rows == second.rows


def test_random_background_is_reproducible_under_its_seed(tmp_path):
    text = tiny_text(seed=11, background="random")
    first = survey(tmp_path, text, "a")
    second = survey(tmp_path, text, "b")
    assert without_seconds(first.rows) == without_seconds(second.rows)

    other = survey(tmp_path, tiny_text(seed=12, background="random"), "c")
    assert {row["seed"] for row in other.rows} == {12}
    assert {row["seed"] for row in first.rows} == {11}
    assert json.loads((other.folder / runfolder.MANIFEST).read_text())["seed"] == 12

    # The seed reaches the background: the two seeds draw different backgrounds.
    medium = api.build_medium("eca", rule=30, width=13)
    layouts = [parse_config_text(tiny_text(seed=s, background="random")).layouts[0] for s in (11, 12)]
    backgrounds = [layout.resolve(medium, seed).background.tolist() for layout, seed in zip(layouts, (11, 12))]
    assert backgrounds[0] != backgrounds[1]
    # And the rows are the API's for that seed.
    config = parse_config_text(text)
    row = next(r for r in first.rows if r["rule"] == 30 and r["layout"] == "one-step")
    expected = api.tally(medium, config.layouts[0], seed=11).as_dict()
    assert {key: row[key] for key in expected} == expected


def test_sampled_contexts_follow_the_seed(tmp_path):
    text = tiny_text(seed=5).replace('window = "1:3"', 'window = "1:3"\ncontext_sample = 20')
    first = survey(tmp_path, text, "a")
    second = survey(tmp_path, text, "b")
    assert without_seconds(first.rows) == without_seconds(second.rows)
    sampled = [row for row in first.rows if row["layout"] == "pair"]
    assert all(row["contexts"] == 20 and row["context_space"] == 64 for row in sampled)


def test_plan_states_the_work_before_running():
    config = parse_config_text(tiny_text())
    plan = plan_survey(config)
    assert len(plan.tasks) == 6
    # one-step: 2 signs x 16 contexts; pair: 4 signs x 64 contexts; per rule.
    assert plan.runs == 3 * (2 * 16 + 4 * 64)
    assert plan.work == 3 * (2 * 16 * 13 * 2 + 4 * 64 * 13 * 3)
    assert "6 tasks" in plan.describe()


def test_a_survey_over_the_size_limit_is_refused_before_writing(tmp_path):
    text = tiny_text().replace("seed = 0", "seed = 0\nmax_runs = 100")
    with pytest.raises(EnumerationTooLarge) as caught:
        survey(tmp_path, text)
    assert "256" in str(caught.value) and "context_sample" in str(caught.value)
    assert not (tmp_path / "run").exists()


def test_a_different_config_is_refused_by_the_api_and_the_folder_untouched(tmp_path):
    result = survey(tmp_path, tiny_text(seed=1), figure=True)
    assert (result.folder / "capacity.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    before = {path.name: (path.read_bytes(), path.stat().st_mtime_ns) for path in result.folder.iterdir()}
    with pytest.raises(RunFolderConflict, match="different config"):
        survey(tmp_path, tiny_text(seed=2))
    after = {path.name: (path.read_bytes(), path.stat().st_mtime_ns) for path in result.folder.iterdir()}
    assert after == before


def test_a_file_in_place_of_the_run_folder_is_refused(tmp_path):
    (tmp_path / "run").write_text("a file\n")
    with pytest.raises(RunFolderConflict, match="not a folder"):
        survey(tmp_path, tiny_text())
    assert (tmp_path / "run").read_text() == "a file\n"


def test_a_manifest_that_is_not_json_is_refused(tmp_path):
    folder = tmp_path / "run"
    folder.mkdir()
    (folder / runfolder.MANIFEST).write_text("{not json")
    with pytest.raises(RunFolderConflict, match="manifest"):
        survey(tmp_path, tiny_text())
    assert (folder / runfolder.MANIFEST).read_text() == "{not json"
