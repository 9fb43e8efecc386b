"""Reaction networks under closure (chemical organisation theory: Dittrich & Speroni di Fenizio 2007,
Bull. Math. Biol. 69:1199): our TOML format, random ``a + b -> c`` networks, a bit-sliced closure.

Two registry entries: ``reactions`` reads one network from a file, ``random-reactions`` draws
networks of ``species`` species and ``ratio * species`` reactions for ensembles. See
``media/reactions/network.py`` for the semantics and the file format, ``generators.py`` for the
random rule and its species names.

Probing a reaction network (nothing here is special to the probe; these are layout choices)
-------------------------------------------------------------------------------------------
* Signs are single species from a list: ``signs = "a,b,c"`` with one-hot ``sign_patterns``
  (``[[1,0,0],[0,1,0],[0,0,1]]``; ``--sign-patterns 100,010,001``).
* Meanings are single species from a list: ``readout = "x,y"`` with ``meanings = "one-hot"``;
  the meaning is the one readout species present in the closure, and none or several read as
  undefined.
* Contexts are subsets of a list of context species: the default context set, every pattern
  over the context sites.
* ``window = "attractor"`` reads the closure (``settle`` always reaches it).
* Contexts and signs are *seeded* (the default). Closure only adds species, so seeding and
  clamping agree for present species; clamping would also hold *absent* context species absent
  even where a reaction makes them, which is no longer the closure of the network.
* The sign, meaning and context lists should be disjoint: a seeded species stays present, so a
  readout species that is also a sign or context only echoes its input.
* Counting: by default every context pattern counts, also when several have the same closure
  (``cl(c) = cl(c')``, for instance when one context species makes another). That is the
  published measure over the context set as given, it does not depend on the chemistry under
  test, and it keeps counts comparable across media and with sampled contexts. Contexts with
  the same closure have the same mapping (``cl(c + s) = cl(cl(c) + s)``), so counting them once
  is exact and gives the chemist's count of distinct situations; that is a probe option
  (``distinct_contexts``), asked for explicitly.
"""



from media.errors import require
from media.family import FileFamily, MediumFamily, Parameter, REQUIRED, ensemble_seed, grid_values
from media.reactions.equations import equation_text, parse_equation
from media.reactions.generators import (group_names, possible_reactions, random_reaction_network,
                                        reactions_for)
from media.reactions.network import Reaction, ReactionNetwork


class ReactionFileFamily(FileFamily):
    """Registry entry ``reactions``: one reaction network read from a TOML file."""

    name = "reactions"
    summary = "a reaction network from a TOML file; one step = one round of firing, settling at the closure"
    reader = staticmethod(ReactionNetwork.from_toml)


def network_seed(seed: int, species: int, ratio: float, replicate: int) -> int:
    """The seed of one ensemble member, derived from the run seed and its grid point (not its groups)."""
    return ensemble_seed(seed, "random-reactions", species, round(float(ratio) * 1_000_000), replicate)


_grid = grid_values


def _number(value, name):
    require(isinstance(value, (int, float)) and not isinstance(value, bool) and value >= 0,
            f"{name}: must be a number >= 0, got {value!r}")
    return float(value)


GROUP_KEYS = ("sign_species", "meaning_species", "context_species")


class RandomReactionFamily(MediumFamily):
    """Registry entry ``random-reactions``: random networks of ``a + b -> c`` reactions, one per grid point and
    replicate, with species named by group (``s0..``, ``m0..``, ``c0..``, then ``x0..``) so one layout fits all."""

    name = "random-reactions"
    summary = ("random reaction networks: n species, m = ratio*n reactions a + b -> c drawn uniformly, seeded; "
               "species named s0.., m0.., c0.. for layouts, x0.. for the rest")
    parameters = {
        "species": Parameter(REQUIRED, "n, the number of species"),
        "ratio": Parameter(1.0, "m/n, reactions per species (m = n * ratio rounded half up)"),
        "network_seed": Parameter(0, "seed of this network's reactions and species names"),
        "replicate": Parameter(0, "replicate number (a label; the seed decides the network)"),
        "sign_species": Parameter(2, "how many species are named s0, s1, ... (for sign lists)"),
        "meaning_species": Parameter(2, "how many species are named m0, m1, ... (for meaning lists)"),
        "context_species": Parameter(4, "how many species are named c0, c1, ... (for context lists)"),
    }
    survey_parameters = {
        "species": Parameter(REQUIRED, "n, or a list of n"),
        "ratio": Parameter(1.0, "m/n, or a list of m/n"),
        "replicates": Parameter(1, "networks drawn per grid point"),
        "sign_species": parameters["sign_species"],
        "meaning_species": parameters["meaning_species"],
        "context_species": parameters["context_species"],
    }
    class_column = "species"
    axis_key = "ratio"
    trend_key = "ratio"
    trend_group = "species"

    def build(self, **params):
        full = self.with_defaults(params)
        species = full["species"]
        require(not isinstance(species, bool) and isinstance(species, int) and species >= 3,
                f"species: n must be a whole number >= 3, got {species!r}")
        ratio = _number(full["ratio"], "ratio")
        for key in ("network_seed", "replicate"):
            require(not isinstance(full[key], bool) and isinstance(full[key], int) and full[key] >= 0,
                    f"{key}: must be a whole number >= 0, got {full[key]!r}")
        record = {"species": species, "ratio": ratio, "network_seed": full["network_seed"],
                  "replicate": full["replicate"], **{key: full[key] for key in GROUP_KEYS}}
        return random_reaction_network(species, reactions_for(species, ratio), full["network_seed"],
                                       params=record, **{key: full[key] for key in GROUP_KEYS})

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        require("species" in table, "[medium]: missing key 'species' (n, or a list of n)")
        species = _grid(table["species"], "species", int)
        ratios = _grid(table.get("ratio", 1.0), "ratio", (int, float))
        replicates = table.get("replicates", 1)
        require(isinstance(replicates, int) and not isinstance(replicates, bool) and replicates >= 1,
                f"[medium] replicates: {replicates!r} must be a whole number >= 1")
        groups = {}
        for key in GROUP_KEYS:
            value = table.get(key, self.parameters[key].default)
            require(isinstance(value, int) and not isinstance(value, bool) and value >= 0,
                    f"[medium] {key}: {value!r} must be a whole number >= 0")
            groups[key] = value
        out = []
        for n in species:
            require(n >= 3, f"[medium] species: n = {n} is too few; reactions a + b -> c need n >= 3")
            require(sum(groups.values()) <= n, f"[medium] species: n = {n} is fewer than sign_species + "
                                               f"meaning_species + context_species = {sum(groups.values())}")
            for ratio in ratios:
                require(float(ratio) >= 0, f"[medium] ratio: {ratio!r} must be >= 0")
                m = reactions_for(n, ratio)
                require(m <= possible_reactions(n), f"[medium] ratio: {ratio} x {n} species = {m} reactions is "
                                                    f"more than the {possible_reactions(n):,} distinct ones")
                for r in range(replicates):
                    out.append({"species": n, "ratio": float(ratio),
                                "network_seed": network_seed(seed, n, ratio, r), "replicate": r, **groups})
        return out

    def annotate(self, params):
        return {"reactions": reactions_for(int(params["species"]), float(params["ratio"]))}

    def instance_label(self, params):
        return f"n={params['species']} m/n={params['ratio']} #{params['replicate']}"


__all__ = ["Reaction", "ReactionFileFamily", "ReactionNetwork", "RandomReactionFamily", "equation_text",
           "group_names", "network_seed", "parse_equation", "possible_reactions", "random_reaction_network",
           "reactions_for"]
