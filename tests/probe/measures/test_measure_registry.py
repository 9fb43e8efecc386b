"""The measure registry: the contract the survey and CLI code against."""

from __future__ import annotations

import inspect
import math
import re

import pytest

import probe.measures as measures
from media.boolnet import BooleanNetwork, random_network
from media.eca import ElementaryCA
from probe.errors import ProbeInputError
from probe.measures import MEASURES, MeasureOptionError, MeasureSpec, MeasureUnavailable, compute_measure
from ternary_medium import SumModThree

# the options that keep every measure quick on the small media below
QUICK = {"zlib_ratio": {"steps": 16, "starts": 2}, "lzma_ratio": {"steps": 16, "starts": 2},
         "lz76_complexity": {"steps": 16, "starts": 2}, "block_entropy": {"steps": 8, "starts": 2},
         "damage_spreading": {"starts": 8}, "derrida_value": {"starts": 8},
         "transient_length": {"starts": 4}, "cycle_length": {"starts": 4}}
RANDOM = set(QUICK)  # the measures that draw random starts


def test_every_spec_follows_the_contract():
    assert len(MEASURES) == 12
    for name, spec in MEASURES.items():
        assert isinstance(spec, MeasureSpec)
        assert spec.name == name == spec.function.__name__
        assert spec.column == "m_" + name
        module = inspect.getmodule(spec.function)
        assert module.__name__ == f"probe.measures.{name}"  # one module per measure, named after it
        signature = inspect.signature(spec.function)
        first, *rest = signature.parameters.values()
        assert first.name == "medium"
        assert all(p.kind is p.KEYWORD_ONLY for p in rest)
        assert signature.parameters["seed"].default == 0
        assert spec.summary and "\n" not in spec.summary
        assert set(spec.options) == {p.name for p in rest} - {"seed"}
        for option, default in spec.options.items():  # the one-line summary states every default
            assert re.search(rf"\b{default}\b", spec.summary), (name, option)
        with pytest.raises(AttributeError):
            spec.name = "other"  # frozen


def test_requirements():
    assert MEASURES["langton_lambda"].requires == ("transition_table",)
    assert MEASURES["mean_sensitivity"].requires == ("boolean_functions",)
    others = [spec for name, spec in MEASURES.items() if name not in ("langton_lambda", "mean_sensitivity")]
    assert all(not spec.requires for spec in others)


@pytest.mark.parametrize("name", sorted(MEASURES))
def test_every_measure_gives_a_finite_float_or_refuses(name):
    media = [ElementaryCA(rule=110, width=10), BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C",
                                                                                "C": "A or B"}),
             SumModThree(width=6)]
    for medium in media:
        try:
            value = compute_measure(name, medium, seed=3, **QUICK.get(name, {}))
        except MeasureUnavailable as refusal:
            assert "\n" not in str(refusal) and repr(name) in str(refusal)
            continue
        assert isinstance(value, float) and math.isfinite(value)
        assert compute_measure(name, medium, seed=3, **QUICK.get(name, {})) == value  # reproducible


@pytest.mark.parametrize("name", sorted(RANDOM))
def test_random_measures_change_with_the_seed_somewhere(name):
    # rule 110 on 24 cells: compressible and long-lived, so the diagrams differ in how well they compress
    medium = ElementaryCA(rule=110, width=24)
    options = {**QUICK[name], "steps": 64} if "steps" in QUICK[name] else QUICK[name]
    values = {compute_measure(name, medium, seed=seed, **options) for seed in range(4)}
    assert len(values) > 1


def test_unknown_name_suggests_the_nearest():
    with pytest.raises(MeasureUnavailable) as caught:
        compute_measure("lambda", ElementaryCA(rule=30))
    message = str(caught.value)
    assert "did you mean 'langton_lambda'?" in message and "\n" not in message
    with pytest.raises(MeasureUnavailable, match="did you mean 'zlib_ratio'"):
        compute_measure("zlib-ratio", ElementaryCA(rule=30))


def test_unknown_or_bad_options_are_refused():
    with pytest.raises(MeasureOptionError, match="did you mean 'steps'"):
        compute_measure("zlib_ratio", ElementaryCA(rule=30), step=10)
    with pytest.raises(MeasureOptionError, match="takes no options"):
        compute_measure("langton_lambda", ElementaryCA(rule=30), steps=10)
    with pytest.raises(MeasureOptionError, match="starts = 0 must be a whole number >= 1"):
        compute_measure("damage_spreading", ElementaryCA(rule=30), starts=0)
    with pytest.raises(MeasureOptionError, match="steps"):
        compute_measure("lz76_complexity", ElementaryCA(rule=30), steps=2.5)


def test_missing_capability_is_one_clear_line():
    # the brief's example: lambda of a medium without a table; mean sensitivity of an ECA
    class NoTable(SumModThree):
        kind = "notable"

    with pytest.raises(MeasureUnavailable) as caught:
        compute_measure("langton_lambda", NoTable(width=5))
    assert str(caught.value) == (
        "measure 'langton_lambda' needs a transition table (transition_table(): the output of every neighbourhood "
        "configuration); medium kind 'notable' (NoTable, 5 sites) does not provide one")
    with pytest.raises(MeasureUnavailable, match="medium kind 'eca'"):
        compute_measure("mean_sensitivity", ElementaryCA(rule=30, width=16))


def test_refusals_are_value_errors_for_the_cli():
    assert issubclass(MeasureUnavailable, ProbeInputError) and issubclass(MeasureUnavailable, ValueError)
    assert issubclass(MeasureOptionError, ProbeInputError)


def test_capabilities_of_the_built_in_media():
    net = random_network(6, 2, 0.5, seed=1)
    outputs, quiescent = net.transition_table()
    assert quiescent == 0 and outputs.dtype.name == "uint8" and outputs.size == 6 * 4
    functions = net.boolean_functions()
    assert [f[0].tolist() for f in functions] == [row.tolist() for row in net.inputs]
    functions[0][1][:] = 1 - functions[0][1]  # copies: the network is not changed through them
    assert net.boolean_functions()[0][1].tolist() == net.tables[0].tolist()
    assert ElementaryCA(rule=30).transition_table()[0].tolist() == [0, 1, 1, 1, 1, 0, 0, 0]  # Wolfram 1983 bits
    assert not hasattr(ElementaryCA(rule=30), "boolean_functions")


def test_public_names():
    for name in measures.__all__:
        assert hasattr(measures, name)
