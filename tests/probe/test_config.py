"""Survey configurations: parsing, the canonical round trip, the config hash, and the
configs shipped in configs/.

Contract: probe/config.py (the hash is the SHA-256 of the canonical parsed form, so
comments and key order do not change it; unknown keys name the nearest valid key),
design.md sections 4 and 6 (a run folder is identified by its config; readout sites
outside the light cone are reported).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from media import registry
from probe.config import SurveyConfig, dumps_toml, load_config, parse_config_text
from probe.errors import INPUT_ERRORS, ConfigError
from probe.evaluate import light_cone_report
from probe.layout import Layout
from probe.survey import plan_survey

ROOT = Path(__file__).resolve().parents[2]
SHIPPED = sorted((ROOT / "configs").glob("*.toml"))
DEFAULT_CONFIG = ROOT / "configs" / "eca-survey.toml"

TEXT = """\
# two rules, two layouts
[survey]
name = "demo"
seed = 7
max_runs = 100000

[medium]
kind = "eca"
rules = "30,110"
width = 15
boundary = "fixed"

[[layout]]
name = "one-step"
signs = "7"
contexts = "4-6,8-10"
readout = "7"
window = "3:3"

[[layout]]
name = "persist"
signs = "6,7"
contexts = [3, 4, 9, 10]
readout = "6-7"
window = "2:4"
background = "random"
background_density = 0.25
clamp_contexts = true
sign_patterns = [[1, 0], [0, 1]]
context_sample = 8
meanings = "one-hot"
steps = 6
"""

# The same configuration: keys and tables reordered, other comments, other spellings of the same sites.
REORDERED = """\
[medium]
width = 15  # cells
boundary = "fixed"
rules = "30,110"
kind = "eca"

[[layout]]
window = "3:3"
readout = [7]
contexts = "4,5,6,8-10"
signs = "7"
name = "one-step"

[[layout]]
steps = 6
meanings = "one-hot"
context_sample = 8
sign_patterns = [[1, 0], [0, 1]]
clamp_contexts = true
background_density = 0.25
background = "random"
window = [2, 4]
readout = "6,7"
contexts = "3-4,9-10"
signs = [6, 7]
name = "persist"

# survey last
[survey]
max_runs = 100000
seed = 7
name = "demo"
"""


def test_parse_from_text():
    config = parse_config_text(TEXT)
    assert config.name == "demo"
    assert config.seed == 7
    assert config.max_runs == 100000
    assert config.medium_kind == "eca"
    assert config.medium == {"rules": "30,110", "width": 15, "boundary": "fixed"}
    assert [layout.name for layout in config.layouts] == ["one-step", "persist"]
    one, persist = config.layouts
    assert one.signs == (7,) and one.contexts == (4, 5, 6, 8, 9, 10) and one.readout == (7,)
    assert one.window == (3, 3)
    assert persist.contexts == (3, 4, 9, 10) and persist.readout == (6, 7)
    assert persist.window == (2, 4)
    assert persist.background == "random" and persist.background_density == 0.25
    assert persist.clamp_contexts is True and persist.clamp_signs is False
    assert persist.sign_patterns == ((1, 0), (0, 1))
    assert persist.context_sample == 8 and persist.meanings == "one-hot" and persist.steps == 6
    assert config.source_text == TEXT


def test_defaults_fill_in():
    config = parse_config_text('[medium]\nkind = "eca"\n[[layout]]\nsigns = "3"\ncontexts = "1,2"\nreadout = "3"\n')
    assert config.name == "survey" and config.seed == 0
    assert config.layouts[0].name == "layout1"
    assert config.layouts[0].window == (1, 1)


def test_round_trip_keeps_the_config_and_its_hash():
    config = parse_config_text(TEXT)
    text = dumps_toml(config.to_dict())
    again = parse_config_text(text)
    assert again.config_hash == config.config_hash
    assert again == config
    assert again.to_dict() == config.to_dict()
    # And once more: the written form is a fixed point.
    assert dumps_toml(again.to_dict()) == text


def test_round_trip_of_a_config_built_from_objects():
    config = SurveyConfig(name="objects", medium_kind="eca", medium={"rules": [30, 90], "width": 11},
                          layouts=[Layout(signs="5", contexts="3,4,6,7", readout="5", window="2:2", name="a",
                                          background="00000100000")], seed=3)
    again = parse_config_text(dumps_toml(config.to_dict()))
    assert again.config_hash == config.config_hash
    assert again.layouts[0].background == "00000100000"


def test_hash_ignores_comments_key_order_and_site_spelling():
    assert parse_config_text(REORDERED).config_hash == parse_config_text(TEXT).config_hash
    assert parse_config_text("# note\n\n" + TEXT + "\n# end\n").config_hash == parse_config_text(TEXT).config_hash


@pytest.mark.parametrize("old, new", [
    ("seed = 7", "seed = 8"),
    ('rules = "30,110"', 'rules = "30,111"'),
    ('window = "3:3"', 'window = "3:4"'),
    ("background_density = 0.25", "background_density = 0.5"),
    ('name = "demo"', 'name = "demo2"'),
], ids=["seed", "rules", "window", "density", "name"])
def test_hash_changes_with_what_is_run(old, new):
    assert old in TEXT
    changed = TEXT.replace(old, new, 1)
    assert parse_config_text(changed).config_hash != parse_config_text(TEXT).config_hash


def test_hash_is_a_sha256_hex_digest():
    digest = parse_config_text(TEXT).config_hash
    assert len(digest) == 64 and int(digest, 16) >= 0


def test_load_config_reads_a_file(tmp_path):
    path = tmp_path / "demo.toml"
    path.write_text(TEXT, encoding="utf-8")
    assert load_config(path).config_hash == parse_config_text(TEXT).config_hash


@pytest.mark.parametrize("text, fragments", [
    (TEXT.replace('window = "3:3"', 'windw = "3:3"'), ("'windw'", "'window'")),
    (TEXT.replace("seed = 7", "sead = 7"), ("'sead'", "'seed'")),
    (TEXT + "\n[medum]\nkind = 1\n", ("'medum'", "'medium'")),
    (TEXT.replace('kind = "eca"\n', ""), ("kind",)),
    (TEXT.replace('name = "persist"', 'name = "one-step"'), ("'one-step'", "twice")),
    (TEXT.replace("seed = 7", "seed = -1"), ("seed", "-1")),
    (TEXT.replace('name = "demo"', 'name = "../up"'), ("name", "../up")),
    (TEXT.replace("[survey]", "[survey\n"), ("malformed TOML",)),
    ('[medium]\nkind = "eca"\n', ("layout",)),
], ids=["layout-key", "survey-key", "table", "no-kind", "repeated-layout-name", "negative-seed",
        "name-with-slash", "malformed", "no-layout"])
def test_bad_configs_raise_one_line_naming_the_problem(text, fragments):
    with pytest.raises(ConfigError) as caught:
        parse_config_text(text)
    message = str(caught.value)
    assert "\n" not in message
    for fragment in fragments:
        assert fragment in message, (fragment, message)


def test_unknown_medium_key_is_named_when_planning():
    config = parse_config_text(TEXT.replace("width = 15", "widht = 15"))
    with pytest.raises(INPUT_ERRORS) as caught:
        plan_survey(config)
    assert "'widht'" in str(caught.value) and "'width'" in str(caught.value)


# Config values of the wrong type should be one-line input errors like every other bad value.
WRONG_TYPES = [
    TEXT.replace("background_density = 0.25", 'background_density = "dense"'),
    "layout = 5\n" + TEXT[:TEXT.index("[[layout]]")],
    "medium = 5\n" + TEXT[TEXT.index("[[layout]]"):],
    TEXT.replace("clamp_contexts = true", 'clamp_contexts = "no"'),
]


@pytest.mark.parametrize("text", WRONG_TYPES, ids=["density-string", "layout-not-table", "medium-not-table",
                                                   "clamp-string"])
def test_wrong_typed_values_are_input_errors(text):
    with pytest.raises(INPUT_ERRORS):
        plan_survey(parse_config_text(text))


# ---------------------------------------------------------------------------------- shipped configs


def test_there_are_shipped_configs():
    assert DEFAULT_CONFIG in SHIPPED


@pytest.mark.parametrize("path", SHIPPED, ids=[path.name for path in SHIPPED])
def test_every_shipped_config_loads_and_plans(path):
    config = load_config(path)
    plan = plan_survey(config)
    # Every medium instance under every layout, in that order.
    assert len(plan.tasks) > 0 and len(plan.tasks) % len(config.layouts) == 0
    assert [task.resolved.layout.name for task in plan.tasks[:len(config.layouts)]] == \
        [layout.name for layout in config.layouts]
    assert plan.runs > 0 and plan.work > 0
    assert config.config_hash == parse_config_text(dumps_toml(config.to_dict())).config_hash


def test_default_config_has_a_one_step_and_a_persistence_readout():
    config = load_config(DEFAULT_CONFIG)
    windows = [layout.window for layout in config.layouts]
    assert len(config.layouts) >= 2
    assert any(t0 == t1 for t0, t1 in windows), windows
    assert any(t1 > t0 for t0, t1 in windows), windows


def test_default_config_reads_out_inside_the_light_cone():
    config = load_config(DEFAULT_CONFIG)
    plan = plan_survey(config)
    assert plan.warnings == []
    assert len(plan.tasks) == 88 * len(config.layouts)  # rules = "classes": the 88 minimal representatives
    for task in plan.tasks:
        assert light_cone_report(task.medium, task.resolved) == [], (task.params, task.resolved.layout.name)


def test_light_cone_report_flags_a_readout_out_of_reach():
    # Negative control for the check above: on a 21-cell ring, site 0 is 9 cells from the nearest
    # context site (9) and 10 from the sign site (10), so nothing reaches it by t1 = 3.
    medium = registry.build("eca", rule=110, width=21)
    layout = Layout(signs="10", contexts="9,11", readout="0", window="3:3", name="far")
    report = light_cone_report(medium, layout.resolve(medium))
    assert len(report) == 1 and "readout site 0" in report[0]
