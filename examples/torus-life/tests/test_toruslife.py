"""Tests of the torus-life plugin: cprobe's conformance suite, a slow twin, known patterns, messages.

Run after installing the package (``pip install -e examples/torus-life``)::

    python -m pytest examples/torus-life/tests
"""

import doctest

import numpy as np
import pytest

import toruslife
import toruslife.medium
import toruslife.rule
from media import registry
from media.conformance import parametrize_with_checks
from media.errors import MediumInputError
from toruslife import TorusLife, TorusLifeFamily

# Square and oblong grids, one wider than the suite's 6 steps can cross (so a light cone that is too small
# shows), the smallest allowed side, a rule with birth on 0 (the empty grid comes alive) and one with births
# and survivals on odd and even counts.
MEDIA = [
    TorusLife("B3/S23", rows=6, cols=9),
    TorusLife("B3/S23", rows=16, cols=15),
    TorusLife("B36/S23", rows=3, cols=3),
    TorusLife("B0/S8", rows=4, cols=5),
    TorusLife("B1357/S02468", rows=7, cols=4),
]


@parametrize_with_checks(MEDIA)
def test_conforms(medium, check):
    check(medium)


def naive_step(cells, birth, survival, rows, cols):
    """One update of one grid, cell by cell, straight from the rule's definition."""
    new = [0] * (rows * cols)
    for r in range(rows):
        for c in range(cols):
            live = sum(cells[((r + dr) % rows) * cols + (c + dc) % cols]
                       for dr in (-1, 0, 1) for dc in (-1, 0, 1) if (dr, dc) != (0, 0))
            alive = cells[r * cols + c] == 1
            new[r * cols + c] = int(live in survival) if alive else int(live in birth)
    return new


@pytest.mark.parametrize("rule", ["B3/S23", "B36/S23", "B0/S8", "B2/S", "B1357/S02468", "B/S012345678"])
def test_step_matches_the_cell_by_cell_twin(rule):
    life = TorusLife(rule, rows=5, cols=7)
    birth, survival = toruslife.parse_rule(rule)
    states = np.random.default_rng(11).integers(0, 2, size=(12, 35), dtype=np.uint8)
    expected = [naive_step(row.tolist(), birth, survival, 5, 7) for row in states]
    assert life.step(states).tolist() == expected


def test_still_life_and_oscillator():
    # Block (still life) and blinker (period 2) under B3/S23: Gardner 1970, Sci. Am. 223(4):120 (recall).
    life = TorusLife("B3/S23", rows=6, cols=6)
    block = np.zeros((1, 36), dtype=np.uint8)
    block[0, [7, 8, 13, 14]] = 1
    assert np.array_equal(life.step(block), block)
    blinker = np.zeros((1, 36), dtype=np.uint8)
    blinker[0, [13, 14, 15]] = 1
    once = life.step(blinker)
    assert np.flatnonzero(once[0]).tolist() == [8, 14, 20]
    assert np.array_equal(life.step(once), blinker)


def test_glider_crosses_the_torus():
    # A glider moves one cell diagonally every 4 steps: Gardner 1970 (recall). On an 8 x 8 torus it is
    # back where it started after 8 * 4 = 32 steps, and shifted by (1, 1) after 4 (computed).
    life = TorusLife("B3/S23", rows=8, cols=8)
    glider = np.zeros((1, 64), dtype=np.uint8)
    for r, c in [(0, 1), (1, 2), (2, 0), (2, 1), (2, 2)]:
        glider[0, r * 8 + c] = 1
    path = life.evolve(glider, 32, watch=np.arange(64))[0]
    shifted = np.roll(glider.reshape(8, 8), (1, 1), axis=(0, 1)).reshape(64)
    assert np.array_equal(path[4], shifted)
    assert np.array_equal(path[32], glider[0])
    assert not any(np.array_equal(path[t], glider[0]) for t in range(1, 32))


def test_langton_lambda_of_life():
    # Life's transition table has 140 of 512 entries alive: Langton 1990, Physica D 42:12
    # (shared/reference-values.md). 56 births (3 of 8 neighbours) + 28 + 56 survivals (2 or 3 of 8).
    outputs, quiescent = TorusLife("B3/S23").transition_table()
    assert quiescent == 0 and outputs.shape == (512,)
    assert int(outputs.sum()) == 140
    # Digits read row by row, NW N NE / W C E / SW S SE: a live centre with live N, W and E survives,
    # a live centre alone dies.
    assert outputs[0b010_111_000] == 1 and outputs[0b000_010_000] == 0


def test_reach_is_a_chebyshev_ball_on_the_torus():
    life = TorusLife(rows=7, cols=7)
    grid = life.reach([0], 2).reshape(7, 7)
    wrapped = [0, 1, 2, 5, 6]
    expected = np.zeros((7, 7), dtype=bool)
    expected[np.ix_(wrapped, wrapped)] = True
    assert np.array_equal(grid, expected)
    assert life.reach([24], 3).all()
    assert np.flatnonzero(life.reach([24], 0)).tolist() == [24]


def test_rule_text_is_read_and_written_canonically():
    assert toruslife.canonical_rule("b63/s32") == "B36/S23"
    assert TorusLife("B/S", rows=3, cols=3).describe() == {"rule": "B/S", "rows": 3, "cols": 3}
    assert toruslife.parse_rule("B3/S23") == ((3,), (2, 3))


@pytest.mark.parametrize(("rule", "message"), [
    ("B9/S23", r"^rule: 'B9/S23' has birth count 9, but a site has 0-8 live neighbours; allowed: "),
    ("B3/S239", r"^rule: 'B3/S239' has survival count 9"),
    ("B33/S23", r"^rule: 'B33/S23' repeats birth count 3; allowed: "),
    ("23/3", r"^rule: '23/3' is not in B/S notation; .* \(the survival/birth form \"23/3\" is written \"B3/S23\"\)$"),
    ("S23/B3", r"^rule: 'S23/B3' is not in B/S notation; allowed: \"B\" and birth counts"),
    ("life", r"^rule: 'life' is not in B/S notation"),
    (3, r"^rule: 3 is not a rule in B/S notation"),
])
def test_bad_rules_get_one_line(rule, message):
    with pytest.raises(MediumInputError, match=message) as caught:
        TorusLife(rule, rows=4, cols=4)
    assert "\n" not in str(caught.value)


@pytest.mark.parametrize("side", [2, 0, -3, "x", 4.0, True])
def test_bad_sides_are_refused(side):
    with pytest.raises(MediumInputError, match=r"^rows: .* is not allowed; give a whole number >= 3"):
        TorusLife(rows=side, cols=4)


def test_step_refuses_bad_states():
    life = TorusLife(rows=3, cols=3)
    with pytest.raises(MediumInputError, match="values must be 0 or 1, got 2"):
        life.step(np.full((1, 9), 2, dtype=np.uint8))
    with pytest.raises(MediumInputError, match=r"give \(batch, 9\)"):
        life.step(np.zeros((1, 8), dtype=np.uint8))


def test_family_builds_and_expands():
    family = TorusLifeFamily()
    assert family.build().describe() == {"rule": "B3/S23", "rows": 16, "cols": 16}
    assert family.expand({"rules": "B3/S23, b2/s", "rows": 5, "cols": 6}, seed=0) == [
        {"rule": "B3/S23", "rows": 5, "cols": 6}, {"rule": "B2/S", "rows": 5, "cols": 6}]
    with pytest.raises(MediumInputError, match=r"unknown key 'rule'; did you mean 'rules'\?"):
        family.expand({"rule": "B3/S23"}, seed=0)
    with pytest.raises(MediumInputError, match="missing key 'rules'"):
        family.expand({"rows": 5}, seed=0)
    with pytest.raises(MediumInputError, match=r"'b3/s32' is B3/S23, which is already listed"):
        family.expand({"rules": ["B3/S23", "b3/s32"]}, seed=0)
    with pytest.raises(MediumInputError, match=r"^\[medium\] rules: 'B3/S2x' is not in B/S notation"):
        family.expand({"rules": ["B3/S2x"]}, seed=0)
    with pytest.raises(MediumInputError, match=r"^\[medium\] cols: 1 is not allowed"):
        family.expand({"rules": ["B3/S23"], "cols": 1}, seed=0)


def test_cprobe_finds_the_installed_plugin():
    # Holds only once the package is installed: the entry point lives in its metadata.
    assert isinstance(registry.family("torus-life"), TorusLifeFamily)
    medium = registry.build("torus-life", rule="B36/S23", rows=5, cols=5)
    assert medium.describe() == {"rule": "B36/S23", "rows": 5, "cols": 5}


@pytest.mark.parametrize("module", [toruslife, toruslife.medium, toruslife.rule], ids=lambda m: m.__name__)
def test_docstring_examples(module):
    result = doctest.testmod(module)
    assert result.attempted > 0 and result.failed == 0
