"""The public API: everything the CLI does, callable from a notebook.

Examples
--------
Tally one rule under one layout:

>>> from probe import api
>>> medium = api.build_medium("eca", rule=110, width=21)
>>> layout = api.Layout(signs="10,11", contexts="4-9,12-17", readout="10,11", window="4:8")
>>> api.tally(medium, layout).contexts
4096

Run a survey from objects (or pass a TOML path to ``run_survey``):

>>> import tempfile
>>> config = api.SurveyConfig(name="notebook", medium_kind="eca", medium={"rules": "30,90", "width": 11},
...                           layouts=[api.Layout(signs="5", contexts="3,4,6,7", readout="5", window="2:2")])
>>> rows = api.run_survey(config, tempfile.mkdtemp(), progress=False, figure=False).rows
>>> len(rows)
2
"""

from media.attractors import Attractor, attractor_from, attractors
from media.family import REQUIRED
from media.registry import available as available_media
from media.registry import build as build_medium
from probe.config import SurveyConfig, load_config, parse_config_text
from probe.evaluate import DEFAULT_MAX_RUNS, MeaningTable, evaluate, light_cone_report
from probe.layout import Layout
from probe.compare import DEFAULT_RESAMPLES, compare
from probe.report import write_report
from probe.survey import add_measures, plan_survey, run_survey
from probe.tally import Tallies, tally, tally_meanings
from probe.witness import CodeWitness, draw_witness, find_witness



def available_measures() -> dict:
    """Every registered measure by name (see :mod:`probe.measures`)."""
    from probe.measures import MEASURES

    return dict(MEASURES)


def state_text(number: int, n_sites: int) -> str:
    """A binary state number as digits in site order (first site first)."""
    return "".join(str((int(number) >> i) & 1) for i in range(n_sites))


__all__ = [
    "Attractor", "attractor_from", "attractors", "state_text", "available_measures", "add_measures", "compare",
    "write_report", "DEFAULT_RESAMPLES",
    "CodeWitness", "DEFAULT_MAX_RUNS", "Layout", "MeaningTable", "REQUIRED", "SurveyConfig", "Tallies",
    "available_media", "build_medium", "draw_witness", "evaluate", "find_witness", "light_cone_report",
    "load_config", "parse_config_text", "plan_survey", "run_survey", "tally", "tally_meanings",
]
