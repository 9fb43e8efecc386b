"""Random reaction networks (media/reactions/generators.py) and the two registry families.

The rule under test: n species, m reactions a + b -> c with a, b, c distinct, drawn uniformly
without replacement from the C(n, 2) * (n - 2) possible ones, seeded; species named by group
(s0.., m0.., c0.., then x0..) through a seeded permutation from a separate stream.
"""

from __future__ import annotations

import math
from collections import Counter
from pathlib import Path

import pytest
from scipy import stats

from media import registry
from media.errors import MediumInputError
from media.reactions import (RandomReactionFamily, ReactionFileFamily, network_seed, possible_reactions,
                             random_reaction_network, reactions_for)

ROOT = Path(__file__).resolve().parents[3]


def triples(net):
    """Reactions as (frozenset of reactant names, product name)."""
    return [(frozenset(r.reactants), next(iter(r.products))) for r in net.reactions]


def test_shape_of_every_reaction():
    net = random_reaction_network(40, 90, seed=5)
    assert net.n_sites == 40 and len(net.reactions) == 90
    for reaction in net.reactions:
        assert len(reaction.reactants) == 2 and list(reaction.reactants.values()) == [1, 1]
        assert len(reaction.products) == 1 and list(reaction.products.values()) == [1]
        assert not set(reaction.products) & set(reaction.reactants)  # the product is neither reactant
    assert len(set(triples(net))) == 90  # drawn without replacement


def test_possible_reactions_count():
    # C(n, 2) pairs of reactants times (n - 2) products: n = 3 -> 3, n = 4 -> 12, n = 6 -> 60 (computed).
    assert [possible_reactions(n) for n in (3, 4, 6)] == [3, 12, 60]
    # Drawing them all gives every one exactly once, which checks the unranking is a bijection.
    net = random_reaction_network(6, 60, seed=0)
    assert len(set(triples(net))) == 60


def test_seeded_and_reproducible():
    one = random_reaction_network(30, 45, seed=12)
    assert one.equations == random_reaction_network(30, 45, seed=12).equations
    assert one.site_names() == random_reaction_network(30, 45, seed=12).site_names()
    assert one.equations != random_reaction_network(30, 45, seed=13).equations


def test_reactions_are_drawn_uniformly():
    # One reaction per network over 6000 seeds, n = 5: 10 reactant pairs x 3 products = 30 possible
    # reactions, each expected 200 times. A chi-square goodness-of-fit test (scipy.stats.chisquare)
    # against the uniform distribution; the seeds are fixed, so the p-value is too (computed: > 0.01).
    counts = Counter()
    for seed in range(6000):
        counts[triples(random_reaction_network(5, 1, seed=seed))[0]] += 1
    assert len(counts) == 30
    assert stats.chisquare(list(counts.values())).pvalue > 0.01


def test_species_groups_are_named_in_site_order():
    net = random_reaction_network(10, 12, seed=3, sign_species=2, meaning_species=3, context_species=4)
    assert net.site_names() == ["s0", "s1", "m0", "m1", "m2", "c0", "c1", "c2", "c3", "x0"]
    assert net.describe() == {"species": 10, "reactions": 12, "network_seed": 3, "sign_species": 2,
                              "meaning_species": 3, "context_species": 4}


def test_groups_are_a_seeded_choice_and_growing_a_group_keeps_earlier_names():
    # Same network (same seed), contexts 2 -> 4: s0, s1, m0, m1, c0, c1 stay the same species; the
    # first two x species of the smaller naming become c2, c3, and x(k + 2) becomes x(k).
    small = random_reaction_network(12, 20, seed=8, sign_species=2, meaning_species=2, context_species=2)
    large = random_reaction_network(12, 20, seed=8, sign_species=2, meaning_species=2, context_species=4)
    rename = {f"x{k}": (f"c{k + 2}" if k < 2 else f"x{k - 2}") for k in range(6)}
    renamed = sorted((frozenset(rename.get(a, a) for a in reactants), rename.get(p, p))
                     for reactants, p in triples(small))
    assert renamed == sorted(triples(large))


def test_group_choice_is_uniform_over_species():
    # With n = 4 and one reaction, the product is one of the 4 species, and the seeded permutation that
    # names s0 is independent of the reactions, so s0 is the product in 1/4 of the networks: 1000 of
    # 4000 expected, binomial standard deviation sqrt(4000 * 1/4 * 3/4) = 27 (computed). A naming that
    # followed the reactions (say, s0 = the first product) would be caught.
    hits = sum(next(iter(random_reaction_network(4, 1, seed=s, sign_species=1).reactions[0].products)) == "s0"
               for s in range(4000))
    assert abs(hits - 1000) < 4 * math.sqrt(4000 * 0.25 * 0.75)


@pytest.mark.parametrize(("args", "kwargs", "fragment"), [
    ((2, 0), {}, "species: must be a whole number >= 3, got 2"),
    ((5, 31), {}, "reactions: 31 is more than the 30 distinct reactions"),
    ((5, -1), {}, "reactions: must be a whole number >= 0"),
    ((5, 3), {"sign_species": 2, "meaning_species": 2, "context_species": 2},
     "sign_species + meaning_species + context_species = 6 is more than the 5"),
    ((5.0, 3), {}, "species: must be a whole number"),
])
def test_random_network_refuses_bad_parameters(args, kwargs, fragment):
    with pytest.raises(MediumInputError) as caught:
        random_reaction_network(*args, **kwargs)
    assert fragment in str(caught.value) and "\n" not in str(caught.value)


def test_reactions_for_rounds_half_up():
    assert [reactions_for(10, r) for r in (0.25, 0.5, 1.25, 1.35)] == [3, 5, 13, 14]
    assert reactions_for(16, 0.75) == 12


# --------------------------------------------------------------------------- families

def test_both_families_are_registered():
    families = registry.available()
    assert isinstance(families["reactions"], ReactionFileFamily)
    assert isinstance(families["random-reactions"], RandomReactionFamily)


def test_random_family_expands_the_grid_with_a_seed_per_row():
    rows = RandomReactionFamily().expand({"species": [12, 16], "ratio": [0.5, 1, 2], "replicates": 3,
                                          "sign_species": 3, "meaning_species": 3, "context_species": 4}, seed=7)
    assert len(rows) == 2 * 3 * 3
    assert {(r["species"], r["ratio"], r["replicate"]) for r in rows} == {
        (n, float(q), k) for n in (12, 16) for q in (0.5, 1, 2) for k in range(3)}
    assert len({r["network_seed"] for r in rows}) == len(rows)
    for row in rows:
        assert row["network_seed"] == network_seed(7, row["species"], row["ratio"], row["replicate"])
        assert (row["sign_species"], row["meaning_species"], row["context_species"]) == (3, 3, 4)
    # Another run seed, other networks.
    assert rows[0]["network_seed"] != RandomReactionFamily().expand({"species": 12, "ratio": 0.5}, seed=8)[0][
        "network_seed"]


def test_random_family_rebuilds_the_same_network_from_a_row():
    family = RandomReactionFamily()
    row = family.expand({"species": 20, "ratio": 1.5, "replicates": 2}, seed=0)[1]
    built = registry.build("random-reactions", **row)
    again = registry.build("random-reactions", **row)
    assert built.equations == again.equations and len(built.reactions) == 30
    assert built.describe() == row
    assert family.annotate(row) == {"reactions": 30}
    direct = random_reaction_network(20, 30, row["network_seed"], sign_species=2, meaning_species=2, context_species=4)
    assert direct.equations == built.equations


@pytest.mark.parametrize(("table", "fragment"), [
    ({"ratio": 1}, "missing key 'species'"),
    ({"species": [2]}, "n = 2 is too few"),
    ({"species": 8, "context_species": 8}, "fewer than sign_species + meaning_species + context_species = 12"),
    ({"species": 5, "ratio": 7, "sign_species": 1, "meaning_species": 1, "context_species": 1},
     "35 reactions is more than the 30 distinct ones"),
    ({"species": 10, "ratio": "high"}, "'high' is not a number"),
    ({"species": 10, "replicates": 0}, "replicates: 0 must be a whole number >= 1"),
    ({"species": 10, "ratios": [1]}, "unknown key 'ratios'; did you mean 'ratio'?"),
])
def test_random_family_refuses_a_bad_grid(table, fragment):
    with pytest.raises(MediumInputError) as caught:
        RandomReactionFamily().expand(table, seed=0)
    assert fragment in str(caught.value)


def test_file_family_builds_and_expands():
    path = str(ROOT / "configs" / "networks" / "vesk-brine.toml")
    medium = registry.build("reactions", network=path)
    assert medium.describe() == {"network": path}
    assert ReactionFileFamily().expand({"network": [path, path]}, seed=0) == [{"network": path}] * 2
    with pytest.raises(MediumInputError, match="missing parameter 'network'"):
        registry.build("reactions")
