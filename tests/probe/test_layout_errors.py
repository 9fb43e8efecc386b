"""Bad layouts get one clear line that names the field and the value (design.md section 6).

Each case builds and resolves a layout against a 13-cell elementary CA and
checks the exception class, that the message is a single line, and that it
names the field and the offending value. Light-cone reports follow the
definition of an elementary rule's neighbourhood (radius 1: a site can reach
at most t sites either way in t steps; Wolfram 1983, Rev. Mod. Phys. 55:601).
"""

import numpy as np
import pytest

from media.eca import ElementaryCA
from probe.errors import EnumerationTooLarge, LayoutError, ProbeInputError
from probe.evaluate import check_size, evaluate, light_cone_report
from probe.layout import Layout
from probe.tally import tally

WIDTH = 13
GOOD = dict(signs="5,7", contexts="3,4,8,9", readout="6", window="2:2", name="probe")


def medium():
    return ElementaryCA(rule=110, width=WIDTH)


def raised(error_class, **changes):
    """Build and resolve GOOD with ``changes``; return the message of the expected exception."""
    with pytest.raises(error_class) as info:
        Layout(**{**GOOD, **changes}).resolve(medium(), 0)
    message = str(info.value)
    assert "\n" not in message and message.strip() == message and message, repr(message)
    assert isinstance(info.value, ValueError)  # the CLI catches input errors as ValueError (probe/errors.py)
    return message


def test_the_good_layout_resolves():
    # Guard: every case below changes one thing in a layout that is valid as it stands.
    resolved = Layout(**GOOD).resolve(medium(), 0)
    assert resolved.n_signs == 4 and resolved.n_contexts == 16 and resolved.runs == 64


@pytest.mark.parametrize("changes, words", [
    # sign and context sites overlap at site 5
    (dict(contexts="3,4,5,8"), ["5", "signs", "contexts", "disjoint"]),
    # a site out of range for 13 cells, in each site field
    (dict(signs="5,13"), ["signs", "13", "0..12"]),
    (dict(contexts="3,4,8,40"), ["contexts", "40", "0..12"]),
    (dict(readout="6,99"), ["readout", "99", "0..12"]),
    # a site listed twice
    (dict(signs="5,7,5"), ["signs", "5", "twice"]),
    (dict(contexts=[3, 4, 4, 8]), ["contexts", "4", "twice"]),
    (dict(readout="6,2,6"), ["readout", "6", "twice"]),
    # fewer than two signs: an explicit alphabet of one pattern
    (dict(signs="5", sign_patterns=[[1]]), ["sign_patterns", "1", "two signs"]),
    (dict(sign_patterns=["10"]), ["sign_patterns", "1", "two signs"]),
    # clamped sign or context sites read out
    (dict(readout="6,7", clamp_signs=True), ["7", "signs", "readout", "clamped"]),
    (dict(readout="4,6", clamp_contexts=True), ["4", "contexts", "readout", "clamped"]),
    # context_sample larger than the 2^4 = 16 contexts there are
    (dict(context_sample=40), ["context_sample", "40", "16"]),
    # a background pattern of the wrong length
    (dict(background="01101"), ["background", "13", "5"]),
    (dict(background=[0, 1] * 7), ["background", "13", "14"]),
])
def test_bad_layouts_raise_layout_error_naming_field_and_value(changes, words):
    message = raised(LayoutError, **changes)
    for word in words:
        assert word in message, (word, message)
    assert "'probe'" in message  # the layout is named too


@pytest.mark.parametrize("window, words", [
    ("4:2", ["window", "t1 = 2", "t0 = 4"]),       # t1 < t0
    ((5, 3), ["window", "t1 = 3", "t0 = 5"]),
    ("-1:2", ["window", "t0 = -1", "t0 >= 0"]),    # negative t0
    ((-2, 2), ["window", "t0 = -2"]),
])
def test_bad_windows(window, words):
    message = raised(LayoutError, window=window)
    for word in words:
        assert word in message, (word, message)


def test_window_outside_the_run():
    # steps = 3 but the window ends at 5.
    message = raised(LayoutError, window="2:5", steps=3)
    for word in ("window", "2:5", "3 steps", "t1 <= 3"):
        assert word in message, (word, message)
    # The same window inside a long enough run is fine.
    Layout(**{**GOOD, "window": "2:5", "steps": 5}).resolve(medium(), 0)


def test_overlapping_readout_is_allowed_when_seeded_not_clamped():
    # The example reads out at the (seeded) sign sites: allowed; only clamped inputs are refused.
    resolved = Layout(**{**GOOD, "readout": "5,7,6"}).resolve(medium(), 0)
    assert resolved.readout_sites.tolist() == [5, 7, 6]
    Layout(**{**GOOD, "readout": "4,6", "clamp_signs": True}).resolve(medium(), 0)


def test_errors_share_the_probe_input_base():
    # The CLI turns ProbeInputError (and MediumInputError) into exit status 2.
    assert issubclass(LayoutError, ProbeInputError) and issubclass(EnumerationTooLarge, ProbeInputError)


# ----------------------------------------------------------------- enumeration size

def test_enumeration_over_max_runs_is_refused_with_size_and_pointer_to_sampling():
    layout = Layout(**GOOD)  # 4 signs x 16 contexts = 64 runs
    for call in (lambda: evaluate(medium(), layout, max_runs=63), lambda: tally(medium(), layout, max_runs=63),
                 lambda: check_size(layout.resolve(medium(), 0), 63)):
        with pytest.raises(EnumerationTooLarge) as info:
            call()
        message = str(info.value)
        assert "\n" not in message
        for word in ("4 signs", "16 contexts", "64 runs", "63", "context_sample", "'probe'"):
            assert word in message, (word, message)
    # At the limit it runs; a sample within the limit runs too.
    assert evaluate(medium(), layout, max_runs=64).meanings.shape == (16, 4)
    sampled = Layout(**{**GOOD, "context_sample": 8})
    assert evaluate(medium(), sampled, max_runs=63).meanings.shape == (8, 4)


def test_suggested_context_sample_is_accepted():
    # The message proposes a context_sample; following that advice must give a layout that runs.
    wide = dict(GOOD, contexts="0-4,8-12")  # 4 signs x 1024 contexts
    with pytest.raises(EnumerationTooLarge) as info:
        evaluate(medium(), Layout(**wide), max_runs=2000)
    suggested = int(str(info.value).split("context_sample = ")[1].split()[0])
    assert evaluate(medium(), Layout(**wide, context_sample=suggested), max_runs=2000).n_contexts == suggested


# ----------------------------------------------------------------- light cone

def test_light_cone_flags_readout_the_signs_cannot_reach():
    # Signs at 2; contexts at 9 and 11; readout at 10; t1 = 2. Distance from 2 to 10 is 8 on the ring of 13
    # (the other way round it is 5), more than 2 steps: signs cannot reach; contexts (distance 1) can.
    m = medium()
    resolved = Layout(signs="2", contexts="9,11", readout="10", window="1:2", name="far").resolve(m, 0)
    messages = light_cone_report(m, resolved)
    assert len(messages) == 1
    assert "readout site 10" in messages[0] and "signs" in messages[0] and "contexts" not in messages[0]
    assert "t1 = 2" in messages[0] and "'far'" in messages[0]
    # And indeed the meaning cannot depend on the sign: every context maps all signs alike.
    table = evaluate(m, resolved).meanings
    assert (table == table[:, :1]).all()


def test_light_cone_flags_both_when_neither_reaches():
    m = medium()
    resolved = Layout(signs="0", contexts="1", readout="6", window="2:2").resolve(m, 0)
    (message,) = light_cone_report(m, resolved)
    assert "readout site 6" in message and "signs and contexts" in message


def test_light_cone_counts_the_ring_and_the_fixed_row_differently():
    # Sign at 0, readout at 12, t1 = 1: neighbours on the ring (distance 1), 12 apart on a fixed row.
    layout = Layout(signs="0", contexts="11", readout="12", window="1:1")
    ring, row = ElementaryCA(90, WIDTH, "periodic"), ElementaryCA(90, WIDTH, "fixed")
    assert light_cone_report(ring, layout.resolve(ring, 0)) == []
    (message,) = light_cone_report(row, layout.resolve(row, 0))
    assert "readout site 12" in message and "signs" in message


def test_light_cone_is_silent_for_a_good_layout():
    m = medium()
    assert light_cone_report(m, Layout(**GOOD).resolve(m, 0)) == []
    # Exactly at the edge of the cone: distance 2 in 2 steps is reachable.
    edge = Layout(signs="4", contexts="8", readout="6", window="2:2")
    assert light_cone_report(m, edge.resolve(m, 0)) == []
    # One step short is not.
    short = Layout(signs="4", contexts="8", readout="6", window="1:1")
    assert len(light_cone_report(m, short.resolve(m, 0))) == 1


def test_light_cone_report_matches_actual_dependence_for_all_rules():
    # Wherever the report says the signs cannot reach the readout, no rule's meaning depends on the sign.
    layout = Layout(signs="1,2", contexts="7,8", readout="9,4", window="2:2")
    m0 = ElementaryCA(0, WIDTH, "fixed")
    messages = light_cone_report(m0, layout.resolve(m0, 0))
    # Site 9 is 7 from the nearest sign (and 1 from context 8); site 4 is 3 from the nearest context (2 from sign 2).
    assert len(messages) == 2
    assert "readout site 9" in messages[0] and "the signs by" in messages[0]
    assert "readout site 4" in messages[1] and "the contexts by" in messages[1]
    for rule in range(256):
        table = evaluate(ElementaryCA(rule, WIDTH, "fixed"), Layout(signs="1,2", contexts="7,8", readout="9",
                                                                    window="2:2")).meanings
        assert (table == table[:, :1]).all(), rule
    assert np.any([len(set(evaluate(ElementaryCA(rule, WIDTH, "fixed"), layout).meanings[0].tolist())) > 1
                   for rule in (30, 90, 110)])  # site 4 does depend on the signs for some rule
