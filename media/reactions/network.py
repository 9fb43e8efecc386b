"""Reaction networks under closure: the medium and our TOML file format.

Chemical organisation theory (Dittrich & Speroni di Fenizio 2007, "Chemical
organisation theory", Bull. Math. Biol. 69:1199-1231) studies which sets of
species a reaction network can sustain. Its first notion is the *closure* of
a set of species: add the products of every reaction whose reactants are all
present, again and again, until nothing new appears. This medium makes that
iteration its update.

Semantics
---------
Sites are species (``site_names()`` are the species names); a site's state is
1 when the species is present, 0 when absent. One step is one round of
firing: every reaction whose reactants are all present *before the round*
adds its products; present species stay present. The set of present species
only grows, so every run reaches a fixed point, the closure of its start, in
at most ``n_species`` rounds; ``settle`` always finds it and the probe's
attractor readout reads the closure. Clamped species (``clamp_sites``) are
forced after every round as for every medium: clamping a species to 1 is
the same as seeding it (it would stay present anyway), clamping it to 0
keeps it absent even where a reaction would produce it, which is no longer
a closure of the network itself.

Stoichiometry is kept for the record (``describe``, ``equations``) but does
not enter the dynamics: a closure asks only which species are present, so
``2 a + b -> c`` fires whenever ``a`` and ``b`` are present. A catalyst is
written on both sides (``a + e -> b + e``) and, under closure, behaves as a
plain reactant. An inflow has no reactants (``-> a``) and fires in every round.

File format (ours)
------------------
::

    [network]
    name = "..."                          # optional
    description = "..."                   # optional
    species = ["a", "b", "c", "e"]        # every species once, in site order
    reactions = [                         # equations (see media.reactions.equations)
        "2 a + b -> c",
        "a + e -> b + e",                 # e is a catalyst: on both sides
        "-> a",                           # an inflow
    ]

    [[reaction]]                          # optional longer form, after the equations above
    name = "r7"                           # optional label
    equation = "b + c -> a"               # or reactants = ... and products = ...:
    # reactants = ["b", "c"]              #   a list (repeat a name for stoichiometry)
    # products = { a = 1 }                #   or a table of coefficients

Reactions are numbered from 1 in that order (the ``reactions`` list, then
the ``[[reaction]]`` tables), and error messages name them by number and
equation. Refused, each with one line: malformed TOML, unknown keys, a
species listed twice, a name that is not a species name, an undefined
species in a reaction, a reaction with no products, a bad coefficient.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


from media import bitslice
from media.errors import MediumInputError, read_toml_file, require
from media.family import unknown_key_message
from media.interface import Medium, downstream
from media.reactions.equations import equation_text, parse_equation, valid_name
from media.reactions.kernels import _evolve_words, _settle_words

FILE_KEYS = ("network", "reaction")
NETWORK_KEYS = ("name", "description", "species", "reactions")
REACTION_KEYS = ("name", "equation", "reactants", "products", "note")
LISTED = 12  # species named in an "undefined species" message before "..."


@dataclass(frozen=True)
class Reaction:
    """One reaction: ``{species: coefficient}`` on each side, and an optional label."""

    reactants: dict
    products: dict
    name: str = ""

    @property
    def equation(self) -> str:
        return equation_text(self.reactants, self.products)


class ReactionNetwork(Medium):
    """A reaction network whose update is one round of firing; its fixed points are closures.

    Parameters
    ----------
    species
        Species names, one per site, each once.
    reactions
        :class:`Reaction` objects (or ``(reactants, products)`` pairs of ``{name: coefficient}``
        dicts) over those names.
    description
        Free text kept with the network.

    See Dittrich & Speroni di Fenizio 2007 (Bull. Math. Biol. 69:1199) for closure and the
    module docstring for the semantics and the file format.

    Examples
    --------
    A catalysed chain: ``a + e -> b + e``, ``b -> c``. From {a, e} the closure is reached in two rounds.

    >>> net = ReactionNetwork.from_equations(["a", "b", "c", "e"], ["a + e -> b + e", "b -> c"])
    >>> net.closure(["a", "e"])
    ['a', 'b', 'c', 'e']
    >>> import numpy as np
    >>> net.step(np.array([[1, 0, 0, 1]], dtype=np.uint8)).tolist()
    [[1, 1, 0, 1]]
    """

    kind = "reactions"
    n_states = 2
    dynamics = "closure"  # the update only adds species; its fixed points are closures

    def __init__(self, species, reactions, description: str = "", source: str = "", params: dict | None = None,
                 where: str = "network"):
        species = list(species)
        require(len(species) >= 1, f"{where}: no species; list them in [network] species = [...]")
        first_seen: dict = {}
        for position, name in enumerate(species, start=1):
            require(valid_name(name), f"{where}: species {position} {name!r} is not a species name "
                                      f"(a letter or _, then letters, digits or _)")
            if name in first_seen:
                raise MediumInputError(f"{where}: species {name!r} is listed twice (positions {first_seen[name]} "
                                       f"and {position}); list each species once")
            first_seen[name] = position
        self.species = species
        self.n_sites = len(species)
        self.reactions = []
        for number, reaction in enumerate(reactions, start=1):
            if not isinstance(reaction, Reaction):
                reactants, products = reaction
                reaction = Reaction(dict(reactants), dict(products))
            label = f"{where}: reaction {number} {reaction.equation!r}"
            require(reaction.products, f"{label}: no products; a reaction must produce at least one species")
            for side in (reaction.reactants, reaction.products):
                for name, count in side.items():
                    if name not in first_seen:
                        known = ", ".join(species[:LISTED]) + (", ..." if len(species) > LISTED else "")
                        raise MediumInputError(f"{label}: undefined species {name!r}; declared species: {known}")
                    require(isinstance(count, (int, np.integer)) and not isinstance(count, bool) and count >= 1,
                            f"{label}: coefficient {count!r} of {name!r} must be a whole number >= 1")
            self.reactions.append(reaction)
        self.description = description
        self.source = source
        self.params = dict(params or {})
        index = {name: i for i, name in enumerate(species)}
        # Presence only: each species once per side, in the order first written.
        self._reactant_lists = [np.array([index[name] for name in r.reactants], dtype=np.int64) for r in self.reactions]
        self._product_lists = [np.array([index[name] for name in r.products], dtype=np.int64) for r in self.reactions]
        self._reactant_ptr, self._reactants = _flatten(self._reactant_lists)
        self._product_ptr, self._products = _flatten(self._product_lists)

    # -- construction -------------------------------------------------------------------------------

    @classmethod
    def from_equations(cls, species, equations, description: str = "", where: str = "network") -> "ReactionNetwork":
        """A network from species names and equation strings like ``"2 a + b -> c"``."""
        reactions = []
        for number, text in enumerate(equations, start=1):
            reactants, products = parse_equation(text, where=f"{where}: reaction {number} {text!r}")
            reactions.append(Reaction(reactants, products))
        return cls(species, reactions, description=description, where=where)

    @classmethod
    def from_toml(cls, path) -> "ReactionNetwork":
        """Read a network file (format in the module docstring)."""
        data, where = read_toml_file(path)
        network = cls.from_dict(data, where=where, source=str(path))
        network.params = {"network": str(path)}
        return network

    @classmethod
    def from_dict(cls, data: dict, where: str = "network", source: str = "") -> "ReactionNetwork":
        """A network from the parsed file (a dict with ``network`` and optional ``reaction`` tables)."""
        for key in data:
            if key not in FILE_KEYS:
                raise MediumInputError(unknown_key_message(where, key, FILE_KEYS))
        header = data.get("network")
        require(isinstance(header, dict), f"{where}: no [network] table; it lists the species and reactions")
        for key in header:
            if key not in NETWORK_KEYS:
                raise MediumInputError(unknown_key_message(f"{where}: [network]", key, NETWORK_KEYS))
        species = header.get("species")
        require(isinstance(species, list) and species,
                f"{where}: [network] species must be a non-empty list of names, like species = [\"a\", \"b\"]")
        equations = header.get("reactions", [])
        require(isinstance(equations, list), f"{where}: [network] reactions must be a list of equations, "
                                             f"like reactions = [\"a + b -> c\"]")
        tables = data.get("reaction", [])
        require(isinstance(tables, list) and all(isinstance(t, dict) for t in tables),
                f"{where}: reactions in long form are [[reaction]] tables")
        reactions = []
        for number, text in enumerate(equations, start=1):
            reactants, products = parse_equation(text, where=f"{where}: reaction {number} {text!r}")
            reactions.append(Reaction(reactants, products))
        for number, table in enumerate(tables, start=len(equations) + 1):
            reactions.append(_reaction_from_table(table, f"{where}: reaction {number}"))
        return cls(species, reactions, description=str(header.get("description", "")), source=source, where=where)

    # -- the Medium interface -------------------------------------------------------------------------

    def describe(self):
        if self.params:
            return dict(self.params)
        return {"species": self.n_sites, "reactions": len(self.reactions)}

    def site_names(self):
        return list(self.species)

    @property
    def equations(self) -> list:
        """Every reaction as canonical equation text, in order."""
        return [reaction.equation for reaction in self.reactions]

    def step(self, states):
        """One round of firing in NumPy (the slow twin of the bit-sliced kernels)."""
        states = np.asarray(states, dtype=np.uint8)
        out = states.copy()
        for reactants, products in zip(self._reactant_lists, self._product_lists):
            fires = states[:, reactants].all(axis=1)  # an inflow (no reactants) always fires
            out[:, products] |= fires[:, None].astype(np.uint8)
        return out

    def reach(self, sites, steps):
        """The species themselves and every species downstream of them by 1..``steps`` reactions.

        Sound for either flip: a present species enables the reactions it is a reactant of, and an
        absent one disables them, so in both cases only their products (and, round by round, the
        products of reactions those products take part in) can change. An inflow has no reactants
        and depends on nothing. Clamped species are not taken into account (like every medium's
        ``reach``, this answers for the unclamped update).
        """
        readers = [set() for _ in range(self.n_sites)]
        for reactants, products in zip(self._reactant_lists, self._product_lists):
            for source in reactants.tolist():
                readers[source].update(products.tolist())
        return downstream(readers, sites, steps)

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        def run(words, steps, clamp_sites, clamp_words, watch, watch_from, out):
            _evolve_words(words, steps, self._reactant_ptr, self._reactants, self._product_ptr, self._products,
                          clamp_sites, clamp_words, watch, watch_from, out)

        return bitslice.evolve_packed(self, initial, steps, watch=watch, watch_from=watch_from,
                                      clamp_sites=clamp_sites, clamp_values=clamp_values, run=run)

    def settle(self, initial, *, watch, max_steps, clamp_sites=None, clamp_values=None):
        """The closure of every run (bit-sliced), and whether it was reached within ``max_steps`` rounds."""
        batch, words, max_steps, watch, _, clamp_sites, clamp_words = bitslice.packed_arguments(
            self, initial, max_steps, watch, 0, clamp_sites, clamp_values)
        pattern = np.empty((watch.size, words.shape[1]), dtype=np.uint64)
        met = np.empty(words.shape[1], dtype=np.uint64)
        _settle_words(words, max_steps, self._reactant_ptr, self._reactants, self._product_ptr, self._products,
                      clamp_sites, clamp_words, watch, pattern, met)
        constant = bitslice.unpack(met[None, :], batch)[0].astype(bool)
        return np.ascontiguousarray(bitslice.unpack(pattern, batch).T), constant

    # -- conveniences ---------------------------------------------------------------------------------

    def closure(self, present) -> list:
        """The closure of a set of species (names or indices), as names in site order."""
        start = np.zeros((1, self.n_sites), dtype=np.uint8)
        start[0, self.resolve_sites(list(present))] = 1
        pattern, _ = self.settle(start, watch=np.arange(self.n_sites), max_steps=self.n_sites + 1)
        return [name for name, on in zip(self.species, pattern[0]) if on]


def _flatten(lists):
    pointer = np.zeros(len(lists) + 1, dtype=np.int64)
    pointer[1:] = np.cumsum([len(item) for item in lists])
    flat = np.concatenate(lists).astype(np.int64) if pointer[-1] else np.zeros(0, dtype=np.int64)
    return pointer, flat


def _side_from_value(value, side: str, where: str) -> dict:
    """A reactant or product side given as a list of names (repeats add up) or a ``{name: count}`` table."""
    counts: dict = {}
    if isinstance(value, list):
        for name in value:
            require(isinstance(name, str), f"{where}: {side} must list species names, got {name!r}")
            counts[name] = counts.get(name, 0) + 1
    elif isinstance(value, dict):
        for name, count in value.items():
            require(isinstance(count, int) and not isinstance(count, bool) and count >= 1,
                    f"{where}: coefficient {count!r} of {name!r} in {side} must be a whole number >= 1")
            counts[name] = count
    else:
        raise MediumInputError(f"{where}: {side} must be a list of names or a table like {{ a = 2 }}, got {value!r}")
    for name in counts:
        require(valid_name(name), f"{where}: {name!r} in {side} is not a species name (a letter or _, then letters, "
                                  f"digits or _)")
    return counts


def _reaction_from_table(table: dict, where: str) -> Reaction:
    for key in table:
        if key not in REACTION_KEYS:
            raise MediumInputError(unknown_key_message(where, key, REACTION_KEYS))
    name = table.get("name", "")
    require(isinstance(name, str), f"{where}: name must be text, got {name!r}")
    if name:
        where = f"{where} ({name})"
    if "equation" in table:
        require("reactants" not in table and "products" not in table,
                f"{where}: give either equation or reactants and products, not both")
        reactants, products = parse_equation(table["equation"], where=f"{where} {table['equation']!r}")
    else:
        require("products" in table, f"{where}: needs an equation, or reactants and products; no products given, "
                                     f"and a reaction must produce at least one species")
        reactants = _side_from_value(table.get("reactants", []), "reactants", where)
        products = _side_from_value(table["products"], "products", where)
    return Reaction(reactants, products, name=name)
