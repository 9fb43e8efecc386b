"""Reaction networks under closure: hand-worked closures, the bit-sliced kernels against a set-based
twin and against the interface's step loops, reach, and the conformance suite.

Closure (Dittrich & Speroni di Fenizio 2007, Bull. Math. Biol. 69:1199, Def. "closed"): a set of
species is closed when every reaction whose reactants are all in it has its products in it too;
the closure of a set is the smallest closed set containing it. The medium reaches it by rounds of
synchronous firing (media/reactions/network.py).

Slow twins (DEVELOPERS.md, "Kernels and their twins"): ``set_closure`` below (pure Python sets,
reactions applied one at a time until nothing changes), ``synchronous_rounds`` (Python sets, one
synchronous round at a time), and ``media.interface.evolve_by_steps`` / ``settle_by_steps`` over the
NumPy ``ReactionNetwork.step``.
"""

from __future__ import annotations

import itertools
from pathlib import Path

import numpy as np
import pytest

from media.conformance import parametrize_with_checks
from media.interface import evolve_by_steps, settle_by_steps
from media.reactions import Reaction, ReactionNetwork, possible_reactions, random_reaction_network

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "configs" / "networks" / "vesk-brine.toml"
BATCHES = (1, 63, 64, 65, 200)


# --------------------------------------------------------------------------- slow twins (pure Python sets)

def reaction_sets(net):
    """``[(reactant names, product names), ...]`` read from the network's public reactions."""
    return [(set(r.reactants), set(r.products)) for r in net.reactions]


def set_closure(reactions, present) -> set:
    """The closure by definition: apply any enabled reaction until none adds anything."""
    closed = set(present)
    grew = True
    while grew:
        grew = False
        for reactants, products in reactions:
            if reactants <= closed and not products <= closed:
                closed |= products
                grew = True
    return closed


def synchronous_rounds(reactions, present, clamp=None) -> list:
    """States (sets) after rounds 0, 1, ... until a round changes nothing; ``clamp`` maps name -> 0/1."""
    clamp = clamp or {}
    states = [set(present)]
    while True:
        current = states[-1]
        following = set(current)
        for reactants, products in reactions:
            if reactants <= current:
                following |= products
        for name, value in clamp.items():
            (following.add if value else following.discard)(name)
        if following == current:
            return states
        states.append(following)


def as_states(net, sets) -> np.ndarray:
    names = net.site_names()
    return np.array([[1 if name in chosen else 0 for name in names] for chosen in sets], dtype=np.uint8).reshape(
        len(sets), len(names))


def as_set(net, row) -> set:
    return {name for name, on in zip(net.site_names(), row) if on}


def general_network(n: int, m: int, seed: int) -> ReactionNetwork:
    """A random network with any stoichiometry: 0-3 reactant species (0 = an inflow), 1-3 products,
    coefficients 1-3, and catalysts (a reactant also among the products) - what the file format allows."""
    rng = np.random.default_rng(seed)
    names = [f"sp{i}" for i in range(n)]
    reactions = []
    for _ in range(m):
        k = int(rng.choice([0, 1, 2, 2, 3])) if n >= 3 else int(rng.integers(0, min(n, 2) + 1))
        reactants = {names[i]: int(rng.integers(1, 4)) for i in rng.choice(n, size=min(k, n), replace=False)}
        products = {names[i]: int(rng.integers(1, 4)) for i in rng.choice(n, size=int(rng.integers(1, min(3, n) + 1)),
                                                                            replace=False)}
        if reactants and rng.random() < 0.2:
            catalyst = next(iter(reactants))
            products[catalyst] = reactants[catalyst]
        reactions.append(Reaction(reactants, products))
    return ReactionNetwork(names, reactions)


def random_starts(rng, batch, n, density):
    return (rng.random((batch, n)) < density).astype(np.uint8)


# --------------------------------------------------------------------------- hand-worked closures

def test_catalysed_chain_by_hand():
    # a + e -> b + e, b -> c (e a catalyst).
    # From {a, e}: round 1 fires the first reaction (a, e present) -> {a, b, e}; round 2 fires b -> c
    # -> {a, b, c, e}; round 3 adds nothing. From {a}: nothing fires (e absent). From {b}: {b, c}.
    net = ReactionNetwork.from_equations(["a", "b", "c", "e"], ["a + e -> b + e", "b -> c"])
    assert net.closure(["a", "e"]) == ["a", "b", "c", "e"]
    assert net.closure(["a"]) == ["a"]
    assert net.closure(["b"]) == ["b", "c"]
    rows = net.evolve(as_states(net, [{"a", "e"}]), 3, watch=np.arange(4))[0]
    assert rows.tolist() == [[1, 0, 0, 1], [1, 1, 0, 1], [1, 1, 1, 1], [1, 1, 1, 1]]


def test_a_reaction_needs_all_its_reactants():
    # a + b -> c: from {a} nothing fires, from {b} nothing, from {a, b} c appears.
    net = ReactionNetwork.from_equations(["a", "b", "c"], ["a + b -> c"])
    assert net.closure(["a"]) == ["a"]
    assert net.closure(["b"]) == ["b"]
    assert net.closure(["a", "b"]) == ["a", "b", "c"]


def test_stoichiometry_does_not_change_the_closure():
    # 2 a -> b fires when a is present at all: a closure asks for presence only (module docstring),
    # so it behaves exactly like a -> b.
    two = ReactionNetwork.from_equations(["a", "b"], ["2 a -> 3 b"])
    one = ReactionNetwork.from_equations(["a", "b"], ["a -> b"])
    assert two.closure(["a"]) == one.closure(["a"]) == ["a", "b"]
    states = np.array([[0, 0], [1, 0], [0, 1], [1, 1]], dtype=np.uint8)
    np.testing.assert_array_equal(two.step(states), one.step(states))


def test_inflow_fires_in_every_round():
    # -> a (an inflow), a + b -> c. From {}: round 1 gives {a}. From {b}: round 1 {a, b}, round 2 {a, b, c}.
    net = ReactionNetwork.from_equations(["a", "b", "c"], ["-> a", "a + b -> c"])
    assert net.closure([]) == ["a"]
    rows = net.evolve(as_states(net, [{"b"}]), 3, watch=np.arange(3))[0]
    assert rows.tolist() == [[0, 1, 0], [1, 1, 0], [1, 1, 1], [1, 1, 1]]


def test_one_round_is_synchronous():
    # a -> b, b -> c, c -> d, listed in that order: applying them one after another within a round would
    # give {a, b, c, d} after one step; synchronous firing (decided on the state before the round) gives
    # {a, b} after round 1, {a, b, c} after round 2 and {a, b, c, d} after round 3.
    net = ReactionNetwork.from_equations(["a", "b", "c", "d"], ["a -> b", "b -> c", "c -> d"])
    start = as_states(net, [{"a"}])
    expected = [[1, 0, 0, 0], [1, 1, 0, 0], [1, 1, 1, 0], [1, 1, 1, 1], [1, 1, 1, 1]]
    assert net.evolve(start, 4, watch=np.arange(4))[0].tolist() == expected
    assert evolve_by_steps(net, start, 4, watch=np.arange(4))[0].tolist() == expected
    # Three rounds to the closure: settle reports it with max_steps >= 3 and not with 2.
    pattern, constant = net.settle(start, watch=np.arange(4), max_steps=3)
    assert pattern.tolist() == [[1, 1, 1, 1]] and constant.tolist() == [True]
    assert net.settle(start, watch=np.arange(4), max_steps=2)[1].tolist() == [False]


def test_autocatalytic_set_by_hand():
    # a + b -> 2 b (b catalyses its own production from a), b -> c, a + c -> d.
    # From {a, b}: round 1 fires a + b -> 2 b (nothing new) and b -> c -> {a, b, c}; round 2 fires
    # a + c -> d -> {a, b, c, d}. From {a}: nothing. From {b, c}: only b -> c: {b, c}.
    net = ReactionNetwork.from_equations(["a", "b", "c", "d"], ["a + b -> 2 b", "b -> c", "a + c -> d"])
    assert net.closure(["a", "b"]) == ["a", "b", "c", "d"]
    assert net.closure(["a"]) == ["a"]
    assert net.closure(["b", "c"]) == ["b", "c"]


def test_clamping_absent_blocks_production_and_clamping_present_changes_nothing():
    # a -> b -> c. Clamped to 0, b never appears, so c is never made: {a} stays {a} (not a closure of
    # the network any more). Clamping a species to 1 that is present anyway changes nothing: closure
    # only adds species, so seeded and clamped agree on present species.
    net = ReactionNetwork.from_equations(["a", "b", "c"], ["a -> b", "b -> c"])
    start = as_states(net, [{"a"}])
    pattern, _ = net.settle(start, watch=np.arange(3), max_steps=10, clamp_sites=[1], clamp_values=[[0]])
    assert pattern.tolist() == [[1, 0, 0]]
    clamped, _ = net.settle(start, watch=np.arange(3), max_steps=10, clamp_sites=[0], clamp_values=[[1]])
    seeded, _ = net.settle(start, watch=np.arange(3), max_steps=10)
    assert clamped.tolist() == seeded.tolist() == [[1, 1, 1]]


def test_demo_file_closures_by_hand():
    # configs/networks/vesk-brine.toml. In an orrite pool kiv goes kiv -> kivex (round 1) -> velu (round 2);
    # in a selvane pool kiv + selvane -> umbrin (round 1) and selvane -> quell (round 1); quell alone makes
    # selvane in round 1, so a quell pool ends where a selvane pool does.
    net = ReactionNetwork.from_toml(DEMO)
    assert set(net.closure(["kiv", "orrite"])) == {"kiv", "orrite", "kivex", "velu"}
    assert set(net.closure(["kiv", "selvane"])) == {"kiv", "selvane", "quell", "umbrin"}
    assert set(net.closure(["drasm", "quell"])) == {"drasm", "quell", "selvane", "brel", "velu"}
    # Orrite and selvane together make both pigments, and then murk (round 3 for kiv).
    assert set(net.closure(["kiv", "orrite", "selvane"])) == {"kiv", "orrite", "selvane", "quell", "kivex", "velu",
                                                              "umbrin", "murk"}


# --------------------------------------------------------------------------- properties of a closure

@pytest.mark.parametrize("seed", range(6))
def test_closure_is_extensive_idempotent_and_monotone(seed):
    # The three axioms of a closure operator (extensive: X <= cl X; idempotent: cl cl X = cl X;
    # monotone: X <= Y implies cl X <= cl Y), checked on the bit-sliced settle.
    rng = np.random.default_rng(seed)
    net = general_network(30, 45, seed)
    starts = random_starts(rng, 100, 30, 0.15)
    watch = np.arange(30)
    closed, constant = net.settle(starts, watch=watch, max_steps=64)
    assert constant.all()
    assert (closed >= starts).all()
    again, _ = net.settle(closed, watch=watch, max_steps=64)
    np.testing.assert_array_equal(again, closed)
    bigger = starts | random_starts(rng, 100, 30, 0.1)
    assert (net.settle(bigger, watch=watch, max_steps=64)[0] >= closed).all()


# --------------------------------------------------------------------------- bit-sliced closure vs sets

CLOSURE_CASES = ([("random", n, ratio, 100 * n + i) for i, (n, ratio) in enumerate(
                     itertools.product((3, 5, 10, 40, 100, 200, 300), (0.5, 1.0, 1.5, 3.0)))]
                 + [("general", n, ratio, 7 * n) for n in (1, 2, 4, 12, 60, 150, 300) for ratio in (0.8, 2.0)])


def build_case(kind, n, ratio, seed):
    if kind == "random":
        return random_reaction_network(n, min(int(round(n * ratio)), possible_reactions(n)), seed)
    return general_network(n, max(1, int(round(n * ratio))), seed)


@pytest.mark.parametrize(("kind", "n", "ratio", "seed"), CLOSURE_CASES,
                         ids=[f"{k}-n{n}-r{r}" for k, n, r, _ in CLOSURE_CASES])
def test_bit_sliced_closure_matches_set_closure(kind, n, ratio, seed):
    net = build_case(kind, n, ratio, seed)
    reactions = reaction_sets(net)
    rng = np.random.default_rng(seed)
    # Sparse and dense starts, over more than one 64-run word and not a multiple of it.
    starts = np.concatenate([random_starts(rng, 70, n, 0.02), random_starts(rng, 60, n, 0.1),
                             random_starts(rng, 20, n, 0.4)])
    closed, constant = net.settle(starts, watch=np.arange(n), max_steps=n + 1)
    assert constant.all()  # the closure is always reached within n rounds
    for row, start in enumerate(starts):
        expected = set_closure(reactions, as_set(net, start))
        assert as_set(net, closed[row]) == expected, (row, sorted(as_set(net, start)))
    # Round count: the fixed point comes after exactly T synchronous rounds; settle says "reached"
    # with max_steps = T (or 1 when T = 0) and not with one round fewer.
    rounds = np.array([len(synchronous_rounds(reactions, as_set(net, start))) - 1 for start in starts])
    enough = np.maximum(rounds, 1)
    for bound in np.unique(enough)[:6]:
        _, within = net.settle(starts, watch=np.arange(min(n, 3)), max_steps=int(bound))
        np.testing.assert_array_equal(within, enough <= bound)


def test_settle_pattern_watches_the_requested_species_in_order():
    net = random_reaction_network(50, 75, seed=11)
    rng = np.random.default_rng(11)
    starts = random_starts(rng, 130, 50, 0.1)
    watch = np.array([7, 3, 3, 49, 0])
    full, _ = net.settle(starts, watch=np.arange(50), max_steps=60)
    part, _ = net.settle(starts, watch=watch, max_steps=60)
    np.testing.assert_array_equal(part, full[:, watch])


def test_many_blocks_of_words():
    # 64 words (4096 runs) make a kernel block; 4096 + 70 runs cross into a second block.
    net = random_reaction_network(120, 180, seed=4)
    reactions = reaction_sets(net)
    rng = np.random.default_rng(4)
    starts = random_starts(rng, 4096 + 70, 120, 0.05)
    closed, constant = net.settle(starts, watch=np.arange(120), max_steps=200)
    assert constant.all()
    for row in list(range(0, 4166, 97)) + [4095, 4096, 4165]:
        assert as_set(net, closed[row]) == set_closure(reactions, as_set(net, starts[row]))
    fast = net.evolve(starts, 6, watch=np.arange(120), watch_from=3)
    slow = evolve_by_steps(net, starts, 6, watch=np.arange(120), watch_from=3)
    np.testing.assert_array_equal(fast, slow)


# --------------------------------------------------------------------------- evolve and settle vs the step loops

TWIN_CASES = [(kind, n, 1.5, 31 * n) for kind in ("random", "general") for n in (3, 8, 33, 90, 260)]


@pytest.mark.parametrize(("kind", "n", "ratio", "seed"), TWIN_CASES, ids=[f"{k}-n{n}" for k, n, _, _ in TWIN_CASES])
def test_evolve_matches_evolve_by_steps(kind, n, ratio, seed):
    net = build_case(kind, n, ratio, seed)
    rng = np.random.default_rng(seed)
    for batch in BATCHES:
        initial = random_starts(rng, batch, n, 0.1)
        for steps in (0, 1, 5, min(n + 2, 30)):
            fast = net.evolve(initial, steps, watch=np.arange(n))
            slow = evolve_by_steps(net, initial, steps, watch=np.arange(n))
            assert fast.shape == (batch, steps + 1, n)
            np.testing.assert_array_equal(fast, slow)
        # A shuffled watch subset, a late watch_from, and clamps to 0 and 1 on a random subset
        # (initial values need not agree with the clamp).
        watch = rng.permutation(n)[: max(1, n // 2)]
        clamp = np.sort(rng.choice(n, size=int(rng.integers(0, n + 1)), replace=False))
        values = random_starts(rng, batch, clamp.size, 0.5)
        fast = net.evolve(initial, 9, watch=watch, watch_from=4, clamp_sites=clamp, clamp_values=values)
        slow = evolve_by_steps(net, initial, 9, watch=watch, watch_from=4, clamp_sites=clamp, clamp_values=values)
        np.testing.assert_array_equal(fast, slow)


@pytest.mark.parametrize(("kind", "n", "ratio", "seed"), TWIN_CASES, ids=[f"{k}-n{n}" for k, n, _, _ in TWIN_CASES])
def test_settle_matches_settle_by_steps(kind, n, ratio, seed):
    net = build_case(kind, n, ratio, seed)
    rng = np.random.default_rng(seed + 1)
    for batch in BATCHES:
        initial = random_starts(rng, batch, n, 0.08)
        clamp = np.sort(rng.choice(n, size=int(rng.integers(0, n // 2 + 1)), replace=False))
        values = random_starts(rng, batch, clamp.size, 0.5)
        watch = rng.permutation(n)[: max(1, n // 3)]
        for max_steps in (0, 1, 2, 4, 3 * n):
            for clamp_sites, clamp_values in ((None, None), (clamp, values)):
                fast_pattern, fast_constant = net.settle(initial, watch=watch, max_steps=max_steps,
                                                         clamp_sites=clamp_sites, clamp_values=clamp_values)
                slow_pattern, slow_constant = settle_by_steps(net, initial, watch=watch, max_steps=max_steps,
                                                              clamp_sites=clamp_sites, clamp_values=clamp_values)
                np.testing.assert_array_equal(fast_constant, slow_constant)
                np.testing.assert_array_equal(fast_pattern[slow_constant], slow_pattern[slow_constant])
        # With enough rounds every run is reached, clamps or not.
        assert net.settle(initial, watch=watch, max_steps=n + 2, clamp_sites=clamp, clamp_values=values)[1].all()


def test_settle_with_clamps_matches_synchronous_set_rounds():
    # Clamps are forced after every round: a species clamped to 0 that is present at the start still
    # enables reactions in round 1 (its absence begins after the round), as in evolve_by_steps.
    net = ReactionNetwork.from_equations(["a", "b", "c"], ["a -> b", "b -> c"])
    start = as_states(net, [{"a"}])
    pattern, _ = net.settle(start, watch=np.arange(3), max_steps=10, clamp_sites=[0], clamp_values=[[0]])
    # Round 1: a -> b fires, then a is cleared: {b}; round 2: b -> c: {b, c}; round 3: no change.
    assert pattern.tolist() == [[0, 1, 1]]
    expected = synchronous_rounds(reaction_sets(net), {"a"}, clamp={"a": 0})[-1]
    assert as_set(net, pattern[0]) == expected == {"b", "c"}


def test_clamped_present_species_equal_seeded_ones_on_random_networks():
    # Closure only adds species, so clamping the present species to 1 changes no closure (module docstring).
    net = random_reaction_network(80, 120, seed=9)
    rng = np.random.default_rng(9)
    starts = random_starts(rng, 150, 80, 0.1)
    clamp = np.arange(0, 80, 2)
    values = starts[:, clamp].copy()
    held = values.copy()
    held[:] = 1
    seeded, _ = net.settle(starts, watch=np.arange(80), max_steps=100)
    # Clamp only the sites that are present: where a value is 0 the clamp would force an absence,
    # so those rows are compared separately below.
    present_only = (values == 1).all(axis=1)
    clamped, _ = net.settle(starts, watch=np.arange(80), max_steps=100, clamp_sites=clamp, clamp_values=values)
    np.testing.assert_array_equal(clamped[present_only], seeded[present_only])
    # And with every clamped site forced present from the start, clamping equals seeding them.
    starts_on = starts.copy()
    starts_on[:, clamp] = 1
    clamped_on, _ = net.settle(starts_on, watch=np.arange(80), max_steps=100, clamp_sites=clamp, clamp_values=held)
    seeded_on, _ = net.settle(starts_on, watch=np.arange(80), max_steps=100)
    np.testing.assert_array_equal(clamped_on, seeded_on)
    # Forcing absences does change closures (or this test could not tell the two apart).
    assert not np.array_equal(clamped, seeded)


# --------------------------------------------------------------------------- reach

def test_reach_follows_reactions_downstream_by_hand():
    # a + e -> b + e, b -> c, d -> a. From a: round 1 reaches b (a is a reactant of the first reaction)
    # and e (a product of it, catalyst included); round 2 reaches c. Nothing flows back to d.
    net = ReactionNetwork.from_equations(["a", "b", "c", "d", "e"], ["a + e -> b + e", "b -> c", "d -> a"])
    names = np.array(net.site_names())
    assert names[net.reach([0], 0)].tolist() == ["a"]
    assert names[net.reach([0], 1)].tolist() == ["a", "b", "e"]
    assert names[net.reach([0], 2)].tolist() == ["a", "b", "c", "e"]
    assert names[net.reach([3], 5)].tolist() == ["a", "b", "c", "d", "e"]
    assert names[net.reach([2], 5)].tolist() == ["c"]


def test_reach_is_sound_for_every_state_and_flip():
    # Exhaustively on a small network with an inflow and a catalyst: flipping any species (present ->
    # absent or absent -> present) at t = 0 changes, at t = steps, only species inside its reach.
    net = ReactionNetwork.from_equations(["a", "b", "c", "d", "e", "f"],
                                         ["a + b -> c", "c + e -> d + e", "-> f", "f + d -> a", "2 e -> b"])
    states = np.array(list(itertools.product((0, 1), repeat=6)), dtype=np.uint8)
    for steps in range(0, 5):
        base = net.evolve(states, steps, watch=np.arange(6), watch_from=steps)[:, 0, :]
        for site in range(6):
            flipped = states.copy()
            flipped[:, site] ^= 1
            after = net.evolve(flipped, steps, watch=np.arange(6), watch_from=steps)[:, 0, :]
            changed = (after != base).any(axis=0)
            assert not (changed & ~net.reach([site], steps)).any(), (steps, site)


def test_reach_is_tight_on_a_chain():
    # a -> b -> c: flipping a on from {} changes b after one round and c after two, so reach cannot be smaller.
    net = ReactionNetwork.from_equations(["a", "b", "c"], ["a -> b", "b -> c"])
    off = np.zeros((1, 3), dtype=np.uint8)
    on = np.array([[1, 0, 0]], dtype=np.uint8)
    for steps, expected in ((1, [True, True, False]), (2, [True, True, True])):
        changed = (net.evolve(on, steps, watch=np.arange(3), watch_from=steps)
                   != net.evolve(off, steps, watch=np.arange(3), watch_from=steps))[0, 0]
        assert changed.tolist() == expected == net.reach([0], steps).tolist()


# --------------------------------------------------------------------------- the conformance suite

def conformance_media():
    return [
        ReactionNetwork.from_equations(["a", "b", "c", "e"], ["a + e -> b + e", "b -> c"]),
        ReactionNetwork.from_equations(["a"], ["-> a"]),
        ReactionNetwork.from_toml(DEMO),
        general_network(20, 40, 5),
        random_reaction_network(7, 10, seed=1, sign_species=2, meaning_species=2, context_species=2),
        random_reaction_network(120, 200, seed=2),
    ]


@parametrize_with_checks(conformance_media())
def test_conforms(medium, check):
    check(medium)


def test_a_broken_reach_would_be_caught():
    # The conformance check of reach must be able to fail on this medium: a reach that forgets the
    # products is caught.
    from media.conformance import MediumConformanceError, check_reach_is_sound

    class Forgetful(ReactionNetwork):
        def reach(self, sites, steps):
            mask = np.zeros(self.n_sites, dtype=bool)
            mask[np.asarray(sites)] = True
            return mask

    net = ReactionNetwork.from_toml(DEMO)
    with pytest.raises(MediumConformanceError, match="outside its reach"):
        check_reach_is_sound(Forgetful(net.species, net.reactions))
