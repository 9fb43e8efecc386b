"""The probe on reaction networks under closure: the tally against a brute-force twin, the invented
Vesk brine demo end to end through the CLI (tally, survey, witness), the random ensemble survey and
its rebuildable rows, layout refusals, and a figure of capacity against m/n.

Contract: design.md section 2 (codes, one-hot meanings, attractor readout), issue 6 (signs and
meanings are single species, contexts are subsets of a list of context species, the readout is the
closure), section 6 (one-line errors, exit status 2, enumerations over the limit refused with the size).
Closure: Dittrich & Speroni di Fenizio 2007, Bull. Math. Biol. 69:1199.
"""

from __future__ import annotations

import csv
import itertools
import json
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from media.attractors import attractors
from media.errors import MediumInputError
from media.reactions import Reaction, ReactionNetwork, random_reaction_network, reactions_for
from naive import brute_force_tally
from probe import api
from probe.cli import cli
from probe.errors import EnumerationTooLarge, LayoutError
from probe.evaluate import UNDEFINED, evaluate
from probe.witness import find_witness, witness_diagrams

ROOT = Path(__file__).resolve().parents[2]
DEMO_NETWORK = ROOT / "configs" / "networks" / "vesk-brine.toml"
DEMO_CONFIG = ROOT / "configs" / "vesk-brine-codes.toml"
ENSEMBLE_CONFIG = ROOT / "configs" / "reactions-ensemble.toml"
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
TALLY_KEYS = ("code_instances", "codes", "coding_contexts", "contexts", "context_space", "distinct_mappings",
              "undefined_fraction", "co_information_bits", "signs")

# The 'closure' layout of configs/vesk-brine-codes.toml as command-line options.
DEMO_LAYOUT = ["--signs", "kiv,drasm,tazz", "--sign-patterns", "100,010,001", "--contexts", "orrite,selvane,quell",
               "--readout", "velu,umbrin", "--meanings", "one-hot", "--window", "attractor"]


def make_runner() -> CliRunner:
    try:
        return CliRunner(mix_stderr=False)
    except TypeError:
        return CliRunner()


def run(*args):
    return make_runner().invoke(cli, [str(a) for a in args])


def ok(*args):
    result = run(*args)
    assert result.exit_code == 0, (result.exit_code, result.output, result.exception)
    return result


def read_rows(path: Path) -> list:
    with open(path, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def one_hot(n: int) -> list:
    return [[1 if i == j else 0 for j in range(n)] for i in range(n)]


def demo_layout(**changes):
    table = dict(signs="kiv,drasm,tazz", sign_patterns=one_hot(3), contexts="orrite,selvane,quell",
                 readout="velu,umbrin", meanings="one-hot", window="attractor", name="closure")
    table.update(changes)
    return api.Layout(**table)


# --------------------------------------------------------------------------- the brute-force twin

def set_closure(reactions, present) -> set:
    """The closure by definition, with Python sets: apply enabled reactions until nothing is added."""
    closed = set(present)
    grew = True
    while grew:
        grew = False
        for reactants, products in reactions:
            if reactants <= closed and not products <= closed:
                closed |= products
                grew = True
    return closed


def twin_meanings(net, signs, contexts, meanings) -> np.ndarray:
    """``table[c, s]`` straight from issue 6, one run at a time: context number ``c`` puts context species
    ``j`` present when bit ``j`` of ``c`` is set (DEVELOPERS.md pattern numbering); sign ``s`` is the
    single sign species ``signs[s]``; the meaning is the position of the one meaning species in the
    closure, or undefined (-1) when there is none or more than one. No probe code is used."""
    reactions = [(set(r.reactants), set(r.products)) for r in net.reactions]
    table = np.full((2 ** len(contexts), len(signs)), UNDEFINED, dtype=np.int64)
    for c in range(2 ** len(contexts)):
        present = {name for j, name in enumerate(contexts) if (c >> j) & 1}
        for s, sign in enumerate(signs):
            closed = set_closure(reactions, present | {sign})
            found = [position for position, name in enumerate(meanings) if name in closed]
            if len(found) == 1:
                table[c, s] = found[0]
    return table


def planted(n, ratio, seed, n_signs, n_meanings, n_contexts, codes):
    """A random network with ``codes`` planted code motifs s + c -> m (the Vesk pattern: signs i, j swap
    meanings a, b between contexts k, l), so that the tally has codes to agree on."""
    base = random_reaction_network(n, min(reactions_for(n, ratio), n * (n - 1) * (n - 2) // 2), seed,
                                   sign_species=n_signs, meaning_species=n_meanings, context_species=n_contexts)
    rng = np.random.default_rng(seed)
    extra = []
    context_pairs = rng.permutation(n_contexts)[: 2 * codes].reshape(codes, 2)  # each motif its own contexts
    for k, l in context_pairs.tolist():
        i, j = rng.choice(n_signs, 2, replace=False)
        a, b = rng.choice(n_meanings, 2, replace=False)
        for sign, context, meaning in ((i, k, a), (j, k, b), (i, l, b), (j, l, a)):
            extra.append(Reaction({f"s{sign}": 1, f"c{context}": 1}, {f"m{meaning}": 1}))
    return ReactionNetwork(base.species, base.reactions + extra)


def twin_cases():
    rng = np.random.default_rng(606)
    cases = []
    for i in range(36):
        n_signs, n_meanings, n_contexts = (int(x) for x in rng.integers(2, [5, 5, 7]))
        n = int(rng.integers(n_signs + n_meanings + n_contexts, 41))
        ratio = float(rng.choice([0.5, 1.0, 1.5, 2.0, 3.0]))
        seed = int(rng.integers(2**31))
        if i % 3 == 2:
            net = random_reaction_network(n, reactions_for(n, ratio), seed, sign_species=n_signs,
                                          meaning_species=n_meanings, context_species=n_contexts)
        else:
            net = planted(n, ratio / 3, seed, n_signs, n_meanings, n_contexts, codes=min(1 + i % 3, n_contexts // 2))
        cases.append((f"case{i}-n{n}-r{ratio}", net, [f"s{k}" for k in range(n_signs)],
                      [f"c{k}" for k in range(n_contexts)], [f"m{k}" for k in range(n_meanings)]))
    return cases


TWIN_CASES = twin_cases()


@pytest.mark.parametrize(("label", "net", "signs", "contexts", "meanings"), TWIN_CASES,
                         ids=[case[0] for case in TWIN_CASES])
def test_tally_agrees_with_the_brute_force_twin(label, net, signs, contexts, meanings):
    layout = api.Layout(signs=signs, sign_patterns=one_hot(len(signs)), contexts=contexts, readout=meanings,
                        meanings="one-hot", window="attractor", name=label)
    table = evaluate(net, layout)
    expected = twin_meanings(net, signs, contexts, meanings)
    np.testing.assert_array_equal(table.meanings, expected)
    # The counts from the definition (design.md section 2): every unordered context pair and sign pair.
    brute = brute_force_tally(expected)
    got = api.tally(net, layout)
    for key in ("code_instances", "codes", "coding_contexts", "distinct_mappings"):
        assert getattr(got, key) == brute[key], key
    assert got.undefined_fraction == pytest.approx(brute["undefined_fraction"])
    assert got.contexts == 2 ** len(contexts) and got.signs == len(signs)


def test_twin_cases_carry_codes_and_undefined_meanings():
    # The comparison above can only catch a wrong count where there are codes to count.
    briefs = [brute_force_tally(twin_meanings(net, s, c, m)) for _, net, s, c, m in TWIN_CASES]
    assert sum(b["code_instances"] > 0 for b in briefs) >= 15
    assert sum(b["codes"] >= 2 for b in briefs) >= 4
    assert sum(0 < b["undefined_fraction"] < 1 for b in briefs) >= 25


def test_stoichiometry_inflows_and_catalysts_through_the_probe():
    # 2 s0 + c0 -> m0 fires on presence alone; an inflow (-> x0) and a catalysed step x0 + s1 -> m1 + x0
    # give m1 for s1 in every context; c1 + s0 -> m1 and c1 + s1 -> m0 (with m0 + m1 -> w, harmless).
    net = ReactionNetwork.from_equations(
        ["s0", "s1", "c0", "c1", "m0", "m1", "x0", "w"],
        ["2 s0 + c0 -> 3 m0", "-> x0", "x0 + s1 -> m1 + x0", "c1 + s0 -> m1", "c1 + s1 -> m0", "m0 + m1 -> w"])
    layout = api.Layout(signs="s0,s1", sign_patterns=one_hot(2), contexts="c0,c1", readout="m0,m1",
                        meanings="one-hot", window="attractor")
    # Contexts (c0, c1) = 00, 10, 01, 11. s0: -, m0, m1, both; s1: m1 always, plus m0 under c1.
    assert evaluate(net, layout).meanings.tolist() == [[-1, 1], [0, 1], [1, -1], [-1, -1]]
    np.testing.assert_array_equal(evaluate(net, layout).meanings,
                                  twin_meanings(net, ["s0", "s1"], ["c0", "c1"], ["m0", "m1"]))
    assert api.tally(net, layout).code_instances == 0  # (m0, m1) in 10, but (m1, m0) nowhere


# --------------------------------------------------------------------------- the Vesk brine demo

# Hand derivation for configs/networks/vesk-brine.toml, 'closure' layout (seeded contexts):
# contexts are numbered orrite + 2 selvane + 4 quell. Selvane and quell make each other, so
# contexts 2, 4, 6 all close to {selvane, quell}; 3, 5, 7 to {orrite, selvane, quell}.
#   0 {}:                 kiv -> nothing, drasm -> nothing          tazz -> velu (tazz -> velu)
#   1 {orrite}:           kiv -> kivex -> velu; 2 drasm + orrite -> drasmex -> umbrin
#   2, 4, 6 {selvane..}:  kiv + selvane -> umbrin; drasm + selvane -> brel, brel + selvane -> velu
#   3, 5, 7 {orrite, selvane..}: both pigments for kiv and drasm -> undefined
# Meanings: velu = 0, umbrin = 1. Sign pair (kiv, drasm): n(velu, umbrin) = 1 (context 1),
# n(umbrin, velu) = 3 (contexts 2, 4, 6): 1 * 3 = 3 instances (design.md section 2), one code,
# 4 coding contexts. Tazz reads velu everywhere, so its pairs carry none. Mappings: rows
# (-,-,velu), (velu,umbrin,velu), (umbrin,velu,velu): 3 distinct. Undefined: 8 of 24 runs.
DEMO_TABLE = [[-1, -1, 0], [0, 1, 0], [1, 0, 0], [-1, -1, 0], [1, 0, 0], [-1, -1, 0], [1, 0, 0], [-1, -1, 0]]
DEMO_CLOSURE = {"code_instances": 3, "codes": 1, "coding_contexts": 4, "contexts": 8, "distinct_mappings": 3,
                "undefined_fraction": 8 / 24, "signs": 3}
# 'clamped' layout: absent minerals are held absent too. Context 4 {quell}: selvane can no longer
# form, so kiv and drasm make nothing (undefined); context 5 {orrite, quell}: no selvane, so it acts
# as an orrite pool (velu, umbrin). n(velu, umbrin) = 2 (1, 5), n(umbrin, velu) = 2 (2, 6): 4 instances.
DEMO_CLAMPED_TABLE = [[-1, -1, 0], [0, 1, 0], [1, 0, 0], [-1, -1, 0], [-1, -1, 0], [0, 1, 0], [1, 0, 0],
                      [-1, -1, 0]]


def demo():
    return ReactionNetwork.from_toml(DEMO_NETWORK)


def test_demo_meaning_tables_by_hand():
    assert evaluate(demo(), demo_layout()).meanings.tolist() == DEMO_TABLE
    assert evaluate(demo(), demo_layout(clamp_contexts=True)).meanings.tolist() == DEMO_CLAMPED_TABLE
    result = api.tally(demo(), demo_layout())
    for key, value in DEMO_CLOSURE.items():
        assert getattr(result, key) == pytest.approx(value), key
    assert api.tally(demo(), demo_layout(clamp_contexts=True)).code_instances == 4


def test_demo_survey_and_tally_agree(tmp_path):
    out = tmp_path / "vesk"
    ok("survey", DEMO_CONFIG, "--out", out, "--quiet")
    rows = {row["layout"]: row for row in read_rows(out / "results.csv")}
    assert set(rows) == {"closure", "clamped"}
    assert rows["closure"]["medium"] == "reactions"
    for key, value in DEMO_CLOSURE.items():
        assert float(rows["closure"][key]) == pytest.approx(value), key
    assert int(rows["clamped"]["code_instances"]) == 4
    assert (out / "capacity.png").read_bytes()[:8] == PNG_SIGNATURE

    record = json.loads(ok("tally", "--medium", "reactions", "--network", DEMO_NETWORK, *DEMO_LAYOUT,
                           "--json").stdout)
    assert record["network"] == str(DEMO_NETWORK)
    for key in TALLY_KEYS:
        assert record[key] == pytest.approx(float(rows["closure"][key])), key


def test_demo_witness_png(tmp_path):
    out = tmp_path / "vesk.png"
    result = ok("witness", "--medium", "reactions", "--network", DEMO_NETWORK, *DEMO_LAYOUT, "--out", out)
    assert out.read_bytes()[:8] == PNG_SIGNATURE
    # First instance in sign-pair then context order: kiv and drasm under orrite (1) and selvane (2).
    assert "signs (0, 1), contexts (1, 2), meanings (0, 1)" in result.stdout


def test_demo_witness_raster_is_species_by_round():
    # The witness draws the four runs as species-by-round rasters; read them back by hand.
    net = demo()
    table = evaluate(net, demo_layout())
    witness = find_witness(table)
    diagrams = witness_diagrams(net, table, witness)
    names = net.site_names()
    column = {name: names.index(name) for name in names}
    kiv_orrite = diagrams[0][0]  # context 1 {orrite}, sign kiv
    assert kiv_orrite.shape[1] == 12
    present = [{name for name in names if kiv_orrite[t, column[name]]} for t in range(3)]
    # Round 0: what was written; round 1: kivex (kiv + orrite); round 2: velu (kivex -> velu).
    assert present == [{"kiv", "orrite"}, {"kiv", "orrite", "kivex"}, {"kiv", "orrite", "kivex", "velu"}]
    drasm_selvane = diagrams[1][1]  # context 2 {selvane}, sign drasm
    assert drasm_selvane[1, column["brel"]] == 1 and drasm_selvane[1, column["velu"]] == 0
    assert drasm_selvane[-1, column["velu"]] == 1 and drasm_selvane[-1, column["umbrin"]] == 0
    # The raster runs on until every run has settled: its last two rounds are equal.
    for row in diagrams:
        for raster in row:
            assert (raster[-1] == raster[-2]).all()


def test_demo_on_the_command_line_names_unknown_species():
    result = run("tally", "--medium", "reactions", "--network", DEMO_NETWORK, "--signs", "kiv,zorp",
                 "--contexts", "orrite", "--readout", "velu", "--window", "attractor")
    assert result.exit_code == 2
    assert "'zorp'" in result.stderr and "known: kiv, drasm, tazz" in result.stderr


# --------------------------------------------------------------------------- layouts that do not fit

def test_a_species_named_twice_in_a_list_is_refused():
    with pytest.raises(LayoutError, match="signs: site 0 is listed twice"):
        demo_layout(signs="kiv,drasm,kiv").resolve(demo())
    with pytest.raises(LayoutError, match="contexts: site 4 is listed twice"):
        demo_layout(contexts="orrite,selvane,selvane").resolve(demo())


def test_a_species_in_signs_and_contexts_is_refused():
    with pytest.raises(LayoutError, match="site 3 is in both signs and contexts; sign and context sites must be"):
        demo_layout(signs="kiv,orrite", sign_patterns=one_hot(2)).resolve(demo())
    result = run("tally", "--medium", "reactions", "--network", DEMO_NETWORK, "--signs", "kiv,orrite",
                 "--sign-patterns", "10,01", "--contexts", "orrite,selvane", "--readout", "velu,umbrin",
                 "--meanings", "one-hot", "--window", "attractor")
    assert result.exit_code == 2 and "in both signs and contexts" in result.stderr


def test_a_species_in_readout_and_signs_or_contexts_is_refused():
    # A seeded species stays present under closure, so reading it back only echoes the input, as a
    # clamped site does; issue 6 asks for disjoint sign, meaning and context lists.
    with pytest.raises(LayoutError, match="site 0 is in both signs and readout"):
        demo_layout(readout="kiv,velu").resolve(demo())
    with pytest.raises(LayoutError, match="site 4 is in both contexts and readout"):
        demo_layout(readout="velu,selvane").resolve(demo())


def test_too_large_to_enumerate_states_its_size():
    # 40 context species: 2^40 = 1,099,511,627,776 contexts times 2 signs.
    net = random_reaction_network(60, 60, seed=1, sign_species=2, meaning_species=2, context_species=40)
    layout = api.Layout(signs="s0,s1", sign_patterns=one_hot(2), contexts=[f"c{i}" for i in range(40)],
                        readout="m0,m1", meanings="one-hot", window="attractor", name="huge")
    with pytest.raises(EnumerationTooLarge) as caught:
        evaluate(net, layout)
    assert "2 signs x 1099511627776 contexts = 2199023255552 runs is over the limit" in str(caught.value)
    result = run("tally", "--medium", "random-reactions", "--param", "species=60", "--param", "ratio=1",
                 "--param", "network_seed=1", "--param", "context_species=40", "--signs", "s0,s1",
                 "--sign-patterns", "10,01", "--contexts", ",".join(f"c{i}" for i in range(40)),
                 "--readout", "m0,m1", "--meanings", "one-hot", "--window", "attractor")
    assert result.exit_code == 2
    assert "1099511627776 contexts" in result.stderr and "context_sample" in result.stderr


def test_exhaustive_attractors_of_a_large_network_are_refused_with_the_state_count():
    # The only exhaustive enumeration a medium offers is media.attractors over all 2^n states.
    net = random_reaction_network(30, 30, seed=2)
    with pytest.raises(MediumInputError, match="30 nodes give 1,073,741,824 states"):
        attractors(net)
    # A small network enumerates: under closure every attractor is a fixed point (a closed set).
    small = ReactionNetwork.from_equations(["a", "b", "c"], ["a -> b", "b + c -> a"])
    found = attractors(small)
    assert all(item.length == 1 for item in found) and sum(item.basin for item in found) == 8
    # Closed sets of a -> b, b + c -> a (by hand): {}, {b}, {c}, {a, b}, {a, b, c}; as state numbers
    # (a = bit 0, b = bit 1, c = bit 2): 0, 2, 4, 3, 7.
    assert sorted(item.states[0] for item in found) == [0, 2, 3, 4, 7]


# --------------------------------------------------------------------------- contexts with the same closure

def twin_distinct_contexts(net, contexts) -> list:
    """Context numbers kept when contexts with the same closure (of the context species alone) count once:
    the first of each group, in context order."""
    reactions = [(set(r.reactants), set(r.products)) for r in net.reactions]
    seen, kept = set(), []
    for c in range(2 ** len(contexts)):
        closed = frozenset(set_closure(reactions, {name for j, name in enumerate(contexts) if (c >> j) & 1}))
        if closed not in seen:
            seen.add(closed)
            kept.append(c)
    return kept


def test_contexts_with_the_same_closure_have_the_same_mapping():
    # Why merging is exact under closure: cl(c + s) = cl(cl(c) + s), so contexts with the same closure
    # give the same meaning for every sign (checked on the demo and on planted random networks).
    for net, contexts, layout in [(demo(), ["orrite", "selvane", "quell"], demo_layout())] + [
            (net, c, api.Layout(signs=s, sign_patterns=one_hot(len(s)), contexts=c, readout=m, meanings="one-hot",
                                window="attractor")) for _, net, s, c, m in TWIN_CASES[:12]]:
        table = evaluate(net, layout).meanings
        reactions = [(set(r.reactants), set(r.products)) for r in net.reactions]
        groups = {}
        for c in range(2 ** len(contexts)):
            closed = frozenset(set_closure(reactions, {name for j, name in enumerate(contexts) if (c >> j) & 1}))
            groups.setdefault(closed, []).append(c)
        for members in groups.values():
            for c in members[1:]:
                np.testing.assert_array_equal(table[c], table[members[0]])
    assert twin_distinct_contexts(demo(), ["orrite", "selvane", "quell"]) == [0, 1, 2, 3]


def test_contexts_with_the_same_closure_counted_once():
    # Demo: contexts 2, 4, 6 close to {selvane, quell} and 3, 5, 7 to {orrite, selvane, quell}, so
    # 4 distinct contexts remain: 0, 1, 2, 3. Instances: n(velu, umbrin) = 1 (1), n(umbrin, velu) = 1 (2),
    # so 1 instance, 2 coding contexts. The merged contexts are the context set now, so context_space
    # is 4 too (and the sampling estimates collapse to the exact count).
    layout = demo_layout(distinct_contexts=True)
    table = evaluate(demo(), layout)
    assert table.resolved.context_numbers.tolist() == [0, 1, 2, 3]
    result = api.tally(demo(), layout)
    assert (result.contexts, result.context_space, result.code_instances, result.coding_contexts) == (4, 4, 1, 2)
    assert result.code_instances_estimate == 1
    # Merging needs the attractor readout and a closure medium.
    with pytest.raises(LayoutError, match="needs window = 'attractor'"):
        demo_layout(distinct_contexts=True, window="3:3")
    from media.eca import ElementaryCA
    with pytest.raises(LayoutError, match="needs a medium whose update is a closure"):
        api.Layout(signs="4", contexts="3,5", readout="6", window="attractor", distinct_contexts=True).resolve(
            ElementaryCA(rule=90, width=9))
    # Random planted networks: the kept contexts are the twin's, and the tally is the brute force on
    # the twin's table restricted to them.
    for label, net, signs, contexts, meanings in TWIN_CASES[:12]:
        layout = api.Layout(signs=signs, sign_patterns=one_hot(len(signs)), contexts=contexts, readout=meanings,
                            meanings="one-hot", window="attractor", distinct_contexts=True, name=label)
        kept = twin_distinct_contexts(net, contexts)
        table = evaluate(net, layout)
        assert table.resolved.context_numbers.tolist() == kept
        expected = twin_meanings(net, signs, contexts, meanings)[kept]
        np.testing.assert_array_equal(table.meanings, expected)
        assert api.tally(net, layout).code_instances == brute_force_tally(expected)["code_instances"]


# --------------------------------------------------------------------------- the random ensemble

def small_ensemble_text() -> str:
    """The shipped ensemble config with 2 replicates and 3 ratios, so the test stays quick."""
    text = ENSEMBLE_CONFIG.read_text(encoding="utf-8")
    assert "replicates = 40" in text and "ratio = [0.5, 0.75, 1.0, 1.25, 1.5, 2.0, 3.0]" in text
    return (text.replace("replicates = 40", "replicates = 2")
                .replace("ratio = [0.5, 0.75, 1.0, 1.25, 1.5, 2.0, 3.0]", "ratio = [0.5, 1.5, 3.0]")
                .replace('name = "reactions-ensemble"', 'name = "reactions-small"'))


def test_shipped_ensemble_plans_every_network():
    # Every one of the 3 x 7 x 40 networks takes the one layout (names by the generator's group rule).
    plan = api.plan_survey(api.load_config(ENSEMBLE_CONFIG))
    assert len(plan.tasks) == 3 * 7 * 40
    assert {task.resolved.runs for task in plan.tasks} == {4 * 256}
    assert len({task.params["network_seed"] for task in plan.tasks}) == len(plan.tasks)


def test_ensemble_rows_rebuild_from_their_network_seed(tmp_path):
    config = tmp_path / "ensemble.toml"
    config.write_text(small_ensemble_text(), encoding="utf-8")
    ok("survey", config, "--out", tmp_path / "run", "--quiet")
    with open(tmp_path / "run" / "results.csv", newline="", encoding="utf-8") as handle:
        header = next(csv.reader(handle))
    assert len(header) == len(set(header)), "a medium parameter shadows a result column"
    rows = read_rows(tmp_path / "run" / "results.csv")
    assert len(rows) == 3 * 3 * 2
    assert sorted((int(r["species"]), float(r["ratio"]), int(r["replicate"])) for r in rows) == sorted(
        itertools.product((16, 24, 32), (0.5, 1.5, 3.0), (0, 1)))
    for row in rows:
        assert int(row["reactions"]) == reactions_for(int(row["species"]), float(row["ratio"]))
        assert int(row["contexts"]) == 256 and int(row["signs"]) == 4
    # The rows differ, so rebuilding the wrong network would show.
    assert len({(row["distinct_mappings"], row["undefined_fraction"]) for row in rows}) > 3
    layout = ["--signs", "s0,s1,s2,s3", "--sign-patterns", "1000,0100,0010,0001", "--contexts",
              "c0,c1,c2,c3,c4,c5,c6,c7", "--readout", "m0,m1,m2,m3", "--meanings", "one-hot", "--window", "attractor"]
    for row in rows[::2]:
        params = [f"{key}={row[key]}" for key in ("species", "ratio", "network_seed", "replicate", "sign_species",
                                                  "meaning_species", "context_species")]
        record = json.loads(ok("tally", "--medium", "random-reactions",
                               *itertools.chain.from_iterable(("--param", p) for p in params),
                               *layout, "--json").stdout)
        for key in TALLY_KEYS:
            assert record[key] == pytest.approx(float(row[key])), (row, key)


# --------------------------------------------------------------------------- capacity against m/n

def test_capacity_against_ratio_figure(tmp_path):
    config = tmp_path / "ensemble.toml"
    config.write_text(small_ensemble_text(), encoding="utf-8")
    ok("survey", config, "--out", tmp_path / "run", "--quiet")
    rows = read_rows(tmp_path / "run" / "results.csv")
    from probe.figures import plot_tally_against

    path = plot_tally_against(rows, tmp_path / "capacity-vs-ratio.png", x="ratio", group="species",
                              layout="closure", title="random reaction networks: semantic capacity against m/n")
    data = path.read_bytes()
    assert data[:8] == PNG_SIGNATURE
    width, height = int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    assert (width, height) == (1680, 360)  # 4 panels of 4.2 x 3.6 inches at 100 dpi
