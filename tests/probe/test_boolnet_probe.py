"""The probe on Boolean networks: node names in layouts, the tide-pool demo end to end through
the CLI (survey, tally, witness, attractors), an rbn survey whose rows rebuild, and the
attractor readout against a naive per-run twin.

Contract: design.md section 2 (attractor readout: "the pattern of R if it is constant over the
attractor reached, else undefined"; layouts name sites "by indices (lattices) or node names
(networks)"), section 6 (one-line errors, exit status 2) and probe/cli.py.
"""

from __future__ import annotations

import csv
import itertools
import json
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from media.attractors import attractor_from, states_of
from media.boolnet import BooleanNetwork, network_seed, random_network
from media.interface import Medium
from probe import api
from probe.cli import cli
from probe.errors import LayoutError
from probe.evaluate import UNDEFINED, evaluate

ROOT = Path(__file__).resolve().parents[2]
TIDEPOOL_NETWORK = ROOT / "configs" / "networks" / "tidepool-alga.toml"
TIDEPOOL_CONFIG = ROOT / "configs" / "tidepool-codes.toml"
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
TALLY_COLUMNS = ("code_instances", "codes", "coding_contexts", "coding_fraction", "contexts", "context_space",
                 "distinct_mappings", "undefined_fraction", "co_information_bits", "signs")

# The 'settled' layout of configs/tidepool-codes.toml as command-line options.
SETTLED = ["--signs", "lumA,salB", "--sign-patterns", "10,01", "--contexts", "ebbR,floC", "--clamp-contexts",
           "--readout", "spoK,matZ", "--meanings", "one-hot", "--window", "attractor"]


def make_runner() -> CliRunner:
    """Separate stdout and stderr on every click version (``mix_stderr`` was removed in 8.2)."""
    try:
        return CliRunner(mix_stderr=False)
    except TypeError:
        return CliRunner()


def run(*args):
    result = make_runner().invoke(cli, [str(a) for a in args])
    return result


def ok(*args):
    result = run(*args)
    assert result.exit_code == 0, (result.exit_code, result.output, result.exception)
    return result


def read_rows(path: Path) -> list:
    with open(path, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def tidepool():
    return BooleanNetwork.from_toml(TIDEPOOL_NETWORK)


# --------------------------------------------------------------------------- node names in layouts

def test_layout_names_and_indices_resolve_alike():
    net = tidepool()
    # Node order in the file: lumA salB ebbR floC swiX spoK matZ memM pigQ.
    by_name = api.Layout(signs="lumA,salB", contexts="ebbR,floC", readout="spoK,matZ", window="attractor",
                         clamp_contexts=True).resolve(net)
    by_index = api.Layout(signs="0,1", contexts="2-3", readout="5,6", window="attractor",
                          clamp_contexts=True).resolve(net)
    mixed = api.Layout(signs=["lumA", 1], contexts="ebbR,3", readout="spoK,6", window="attractor",
                       clamp_contexts=True).resolve(net)
    for resolved in (by_name, by_index, mixed):
        assert resolved.sign_sites.tolist() == [0, 1]
        assert resolved.context_sites.tolist() == [2, 3]
        assert resolved.readout_sites.tolist() == [5, 6]
    np.testing.assert_array_equal(evaluate(net, by_name).meanings, evaluate(net, by_index).meanings)
    # Order is kept as given: readout "matZ,spoK" reads matZ first.
    swapped = api.Layout(signs="lumA,salB", contexts="ebbR,floC", readout="matZ,spoK").resolve(net)
    assert swapped.readout_sites.tolist() == [6, 5]


@pytest.mark.parametrize("field", ["signs", "contexts", "readout"])
def test_unknown_node_name_is_refused_naming_it_and_the_known_nodes(field):
    sites = {"signs": "lumA,salB", "contexts": "ebbR,floC", "readout": "spoK,matZ"}
    sites[field] = sites[field].split(",")[0] + ",salX"
    with pytest.raises(LayoutError) as caught:
        api.Layout(window="attractor", **sites).resolve(tidepool())
    message = str(caught.value)
    assert "'salX'" in message
    assert field in message
    assert "known: lumA, salB, ebbR, floC, swiX, spoK, matZ, memM, pigQ" in message
    assert "\n" not in message


def test_unknown_node_name_on_the_command_line_exits_2():
    result = run("tally", "--medium", "boolnet", "--network", TIDEPOOL_NETWORK, "--signs", "lumA,salX",
                 "--contexts", "ebbR,floC", "--readout", "spoK", "--window", "attractor")
    assert result.exit_code == 2
    assert result.stderr.startswith("error: ") and "'salX'" in result.stderr and "known: lumA" in result.stderr


# --------------------------------------------------------------------------- the tide-pool demo

# Hand derivation of code_instances = 3 for the 'settled' layout (configs/networks/tidepool-alga.toml):
# swiX is on when 2*ebbR - floC > 1, and a tie (= 1) switches it off, so with the tide regulators
# clamped, swiX settles on only in context (ebbR, floC) = (1, 0); in (0, 0), (0, 1) and (1, 1) it is off.
# spoK = (lumA and swiX) or (salB and not swiX), matZ = (salB and swiX) or (lumA and not swiX), so:
#   context (1, 0):        sign lumA -> spoK, sign salB -> matZ
#   the other 3 contexts:  sign lumA -> matZ, sign salB -> spoK
# Both are fixed points, every meaning is one-hot and defined. One sign pair {lumA, salB};
# n(spoK, matZ) = 1 context and n(matZ, spoK) = 3 contexts, so instances = 1 * 3 = 3 (design.md section 2),
# with one code, all 4 contexts coding, and 2 distinct mappings.
TIDEPOOL_SETTLED = {"code_instances": 3, "codes": 1, "coding_contexts": 4, "contexts": 4, "distinct_mappings": 2,
                    "undefined_fraction": 0.0, "signs": 2}


def test_tidepool_survey_and_tally_agree(tmp_path):
    out = tmp_path / "tidepool"
    ok("survey", TIDEPOOL_CONFIG, "--out", out, "--quiet")
    rows = {row["layout"]: row for row in read_rows(out / "results.csv")}
    settled = rows["settled"]
    assert settled["medium"] == "boolnet"
    for key, value in TIDEPOOL_SETTLED.items():
        assert float(settled[key]) == value, key
    assert (out / "manifest.json").exists()

    result = ok("tally", "--medium", "boolnet", "--network", TIDEPOOL_NETWORK, *SETTLED, "--json")
    record = json.loads(result.stdout)
    for key in TALLY_COLUMNS:
        assert record[key] == pytest.approx(float(settled[key])), key
    assert record["code_instances"] == 3


def test_tidepool_meaning_table_by_hand():
    layout = api.Layout(signs="lumA,salB", sign_patterns=[[1, 0], [0, 1]], contexts="ebbR,floC",
                        clamp_contexts=True, readout="spoK,matZ", meanings="one-hot", window="attractor")
    table = evaluate(tidepool(), layout)
    # Contexts in pattern order: number = ebbR + 2 floC, so (ebbR, floC) = 00, 10, 01, 11.
    # One-hot meanings: 0 = spoK on, 1 = matZ on. Signs: lumA, salB.
    assert table.meanings.tolist() == [[1, 0], [0, 1], [1, 0], [1, 0]]


def test_tidepool_witness_png(tmp_path):
    out = tmp_path / "tidepool.png"
    result = ok("witness", "--medium", "boolnet", "--network", TIDEPOOL_NETWORK, *SETTLED, "--out", out)
    assert out.read_bytes()[:8] == PNG_SIGNATURE
    assert str(out) in result.stdout


def test_tidepool_attractors_json():
    data = json.loads(ok("attractors", TIDEPOOL_NETWORK, "--json").stdout)
    assert data["nodes"] == ["lumA", "salB", "ebbR", "floC", "swiX", "spoK", "matZ", "memM", "pigQ"]
    assert sum(item["basin"] for item in data["attractors"]) == 2**9
    for item in data["attractors"]:
        assert item["length"] == len(item["states"]) and all(len(s) == 9 for s in item["states"])
    # The sensors and tide regulators hold their values, so the 16 patterns over them are 16
    # separate invariant sets; each holds at least one attractor, all fixed points here.
    assert {s[:4] for item in data["attractors"] for s in item["states"]} == \
        {"".join(bits) for bits in itertools.product("01", repeat=4)}
    # The fixed point with lumA on at ebb: 1 0 1 0 | swiX 1, spoK 1, matZ 0, memM 1, pigQ 1.
    assert any(item["states"] == ["101011011"] for item in data["attractors"])


def test_random_network_attractors_on_the_command_line():
    data = json.loads(ok("attractors", "--nodes", 8, "--inputs", 2, "--network-seed", 3, "--json").stdout)
    assert len(data["nodes"]) == 8
    assert sum(item["basin"] for item in data["attractors"]) == 2**8
    expected = api.attractors(random_network(8, 2, 0.5, 3))
    assert [item["basin"] for item in data["attractors"]] == [a.basin for a in expected]
    text = ok("attractors", "--nodes", 8, "--inputs", 2, "--network-seed", 3).stdout
    assert f"{len(expected)} attractors over 256 states" in text


def test_attractors_needs_exactly_one_source():
    assert run("attractors").exit_code == 2
    assert run("attractors", TIDEPOOL_NETWORK, "--nodes", 4).exit_code == 2


# --------------------------------------------------------------------------- an rbn survey that rebuilds

RBN_CONFIG = """\
[survey]
name = "rbn-small"
seed = 0

[medium]
kind = "rbn"
nodes = [8, 10]
inputs = [1, 2]
replicates = 2

[[layout]]
name = "settled"
signs = "0,1"
contexts = "2-5"
readout = "6,7"
window = "attractor"
"""
RBN_LAYOUT = ["--signs", "0,1", "--contexts", "2-5", "--readout", "6,7", "--window", "attractor"]


def test_rbn_survey_rows_rebuild_from_their_network_seed(tmp_path):
    config = tmp_path / "rbn.toml"
    config.write_text(RBN_CONFIG, encoding="utf-8")
    ok("survey", config, "--out", tmp_path / "run", "--quiet")
    rows = read_rows(tmp_path / "run" / "results.csv")
    # One row per network: 2 N x 2 K x 2 replicates, one layout.
    assert len(rows) == 8
    grid = sorted((int(r["nodes"]), int(r["inputs"]), int(r["replicate"])) for r in rows)
    assert grid == sorted(itertools.product((8, 10), (1, 2), (0, 1)))
    seeds = [int(r["network_seed"]) for r in rows]
    assert len(set(seeds)) == 8
    for row in rows:
        assert int(row["network_seed"]) == network_seed(0, int(row["nodes"]), int(row["inputs"]),
                                                        float(row["bias"]), int(row["replicate"]))
    # The rows differ, so rebuilding the wrong network would show.
    assert len({tuple(row[key] for key in TALLY_COLUMNS) for row in rows}) > 1
    for row in rows:
        result = ok("tally", "--medium", "rbn", "--param", f"nodes={row['nodes']}", "--param",
                    f"inputs={row['inputs']}", "--param", f"bias={row['bias']}", "--param",
                    f"network_seed={row['network_seed']}", *RBN_LAYOUT, "--json")
        record = json.loads(result.stdout)
        assert record["network_seed"] == int(row["network_seed"])
        for key in TALLY_COLUMNS:
            assert record[key] == pytest.approx(float(row[key])), (row, key)


# --------------------------------------------------------------------------- attractor readout, naively

class Clamped(Medium):
    """A medium with some sites forced to fixed values after every step (one run at a time)."""

    def __init__(self, medium, sites, values):
        self.medium, self.sites, self.values = medium, list(sites), list(values)
        self.n_sites, self.n_states = medium.n_sites, medium.n_states

    def step(self, states):
        out = self.medium.step(states).copy()
        for site, value in zip(self.sites, self.values):
            out[:, site] = value
        return out

    def describe(self):
        return {}


def naive_attractor_meanings(medium, layout) -> np.ndarray:
    """``meanings[c, s]`` one run at a time: follow the run to its attractor with ``attractor_from``
    (clamps applied after each step), read the readout sites on every state of the cycle, and keep
    the pattern only if it is the same on all of them (design.md section 2). Zeros background,
    integer sites, all contexts; pattern numbers and one-hot numbers as in naive.naive_meanings."""
    n = medium.n_sites
    signs, contexts, readout = (list(map(int, getattr(layout, f))) for f in ("signs", "contexts", "readout"))
    digits = lambda number, count: [(number >> j) & 1 for j in range(count)]  # noqa: E731
    sign_patterns = ([list(p) for p in layout.sign_patterns] if layout.sign_patterns is not None
                     else [digits(p, len(signs)) for p in range(2 ** len(signs))])
    table = np.full((2 ** len(contexts), len(sign_patterns)), UNDEFINED, dtype=np.int64)
    for c in range(2 ** len(contexts)):
        context_pattern = digits(c, len(contexts))
        for s, sign_pattern in enumerate(sign_patterns):
            state = [0] * n
            for site, value in zip(signs + contexts, list(sign_pattern) + context_pattern):
                state[site] = value
            clamped_sites, clamped_values = [], []
            if layout.clamp_signs:
                clamped_sites += signs
                clamped_values += list(sign_pattern)
            if layout.clamp_contexts:
                clamped_sites += contexts
                clamped_values += context_pattern
            _, cycle = attractor_from(Clamped(medium, clamped_sites, clamped_values), state, max_steps=2**n + 1)
            seen = {tuple(int(v) for v in states_of([number], n)[0][readout]) for number in cycle}
            if len(seen) != 1:
                continue
            (pattern,) = seen
            if layout.meanings == "one-hot":
                on = [j for j, v in enumerate(pattern) if v]
                if len(on) == 1:
                    table[c, s] = on[0]
            else:
                table[c, s] = sum(v << j for j, v in enumerate(pattern))
    return table


def random_attractor_layouts(count: int, seed: int):
    rng = np.random.default_rng(seed)
    cases = []
    for i in itertools.count():
        if len(cases) == count:
            break
        n = int(rng.integers(6, 11))
        k = int(rng.integers(1, 4))
        net = random_network(n, k, float(rng.choice([0.5, 0.5, 0.3])), int(rng.integers(2**31)))
        order = rng.permutation(n).tolist()
        n_signs = int(rng.integers(1, 3))
        n_contexts = int(rng.integers(1, 4))
        signs, contexts = order[:n_signs], order[n_signs:n_signs + n_contexts]
        clamp_signs, clamp_contexts = bool(rng.integers(2)), bool(rng.integers(2))
        # The readout may reuse seeded (not clamped) sign or context sites.
        allowed = order[n_signs + n_contexts:] + ([] if clamp_signs else signs) + ([] if clamp_contexts else contexts)
        readout = [int(x) for x in rng.choice(allowed, size=min(len(allowed), int(rng.integers(1, 4))),
                                                 replace=False)]
        meanings = "one-hot" if i % 3 == 0 else "pattern"
        sign_patterns = None
        if n_signs == 2 and i % 4 == 1:
            sign_patterns = [[1, 0], [0, 1], [1, 1]]
        layout = api.Layout(signs=signs, contexts=contexts, readout=readout, window="attractor",
                            clamp_signs=clamp_signs, clamp_contexts=clamp_contexts, meanings=meanings,
                            sign_patterns=sign_patterns, name=f"random-{i}")
        # Most random layouts read one meaning everywhere; after the first ten, keep only cases whose
        # table holds at least two defined meanings, so a wrong pattern or constancy test would show.
        if len(cases) >= 10:
            table = naive_attractor_meanings(net, layout)
            if len(np.unique(table[table != UNDEFINED])) < 2:
                continue
        cases.append((net, layout))
    return cases


ATTRACTOR_CASES = random_attractor_layouts(50, seed=2024)


@pytest.mark.parametrize(("net", "layout"), ATTRACTOR_CASES, ids=[layout.name for _, layout in ATTRACTOR_CASES])
def test_attractor_readout_matches_naive_twin(net, layout):
    fast = evaluate(net, layout).meanings
    slow = naive_attractor_meanings(net, layout)
    np.testing.assert_array_equal(fast, slow)


def test_naive_attractor_cases_cover_the_options():
    # The random cases above exercise clamped and seeded signs and contexts, both meaning kinds,
    # explicit sign lists, and tables with both defined and undefined meanings.
    layouts = [layout for _, layout in ATTRACTOR_CASES]
    assert {layout.clamp_contexts for layout in layouts} == {True, False}
    assert {layout.clamp_signs for layout in layouts} == {True, False}
    assert {layout.meanings for layout in layouts} == {"pattern", "one-hot"}
    assert any(layout.sign_patterns is not None for layout in layouts)
    tables = [naive_attractor_meanings(net, layout) for net, layout in ATTRACTOR_CASES]
    assert sum(bool((t == UNDEFINED).any() and (t != UNDEFINED).any()) for t in tables) >= 10
    assert sum(len(np.unique(t[t != UNDEFINED])) >= 3 for t in tables) >= 5
    assert any(api.tally_meanings(t).code_instances > 0 for t in tables)
    assert any(layout.meanings == "one-hot" for _, layout in ATTRACTOR_CASES[10:])


def test_attractor_readout_of_a_hand_made_oscillator():
    # S is the sign, C the context (clamped), O = not O oscillates when C is on and holds 0 otherwise:
    # O' = C and not O. R = S copies the sign once. Readout O is constant (0) only in context 0;
    # readout R is constant (= sign) in every context, including context 1, where the attractor
    # is a two-cycle in O: constancy is asked of the readout only, not of the whole state.
    net = BooleanNetwork.from_expressions({"S": "S", "C": "C", "O": "C and not O", "R": "S"})
    oscillator = api.Layout(signs="S", contexts="C", clamp_contexts=True, readout="O", window="attractor")
    assert evaluate(net, oscillator).meanings.tolist() == [[0, 0], [UNDEFINED, UNDEFINED]]
    copy = api.Layout(signs="S", contexts="C", clamp_contexts=True, readout="R", window="attractor")
    assert evaluate(net, copy).meanings.tolist() == [[0, 1], [0, 1]]
    for layout in (oscillator, copy):
        np.testing.assert_array_equal(evaluate(net, layout).meanings, naive_attractor_meanings(
            net, api.Layout(signs=[0], contexts=[1], clamp_contexts=True,
                            readout=[2] if layout is oscillator else [3], window="attractor")))


def test_witness_drawing_reaches_the_attractor_under_clamps():
    # C is 0 on its own (C = 0) but clamped on as a context; n1..n8 fill with ones one step at a time only
    # while C is held on, so readout R = S xor n8 settles at t = 9 under the clamp. Unclamped, C drops to 0
    # and everything is quiet by t = 2, which is the horizon the witness drawing currently uses.
    from probe.witness import find_witness, witness_diagrams

    expressions = {"S": "S", "C": "0", "n1": "C", **{f"n{i}": f"n{i - 1} and C" for i in range(2, 9)},
                   "R": "S xor n8"}
    net = BooleanNetwork.from_expressions(expressions)
    layout = api.Layout(signs="S", contexts="C", clamp_contexts=True, readout="R", window="attractor")
    table = evaluate(net, layout)
    assert table.meanings.tolist() == [[0, 1], [1, 0]]  # context C=1 swaps the meanings: a code
    witness = find_witness(table)
    diagrams = witness_diagrams(net, table, witness)
    r = net.site_names().index("R")
    for row, context in enumerate(witness.context_pair):
        for column, sign in enumerate(witness.sign_pair):
            # The last drawn step shows the meaning the run is labelled with.
            assert diagrams[row][column][-1, r] == table.meanings[context, sign]
