"""Boolean networks with synchronous update: the medium, our TOML file format and random N-K networks.

File format (ours)::

    [network]
    name = "..."                    # optional
    description = "..."             # optional

    [[node]]
    name = "A"
    update = "B and not C"          # an expression (see expressions.py), or:

    [[node]]
    name = "B"
    inputs = ["A", "C"]
    table = "0111"                  # outputs for input rows 00, 01, 10, 11 (first input most significant), or:

    [[node]]
    name = "C"
    weights = { A = 1, B = -2 }     # threshold rule: on if sum > threshold, off if below,
    threshold = 0                   # and on a tie either keep the state ("keep") or switch off ("off")
    tie = "keep"

A node's state is bit ``i`` of a state number when the node is the ``i``-th
listed (first node least significant), as everywhere in the project.
"""

from __future__ import annotations


import numpy as np


from media import bitslice
from media.boolnet.expressions import MAX_INPUTS, input_rows, names_in, parse, truth_table
from media.boolnet.kernels import _evolve_words, _settle_words
from media.errors import MediumInputError, read_toml_file, require
from media.family import unknown_key_message
from media.interface import Medium, downstream

ALL_ONES = np.uint64(0xFFFFFFFFFFFFFFFF)
NODE_KEYS = ("name", "update", "inputs", "table", "weights", "threshold", "tie")
TIES = ("keep", "off")


class BooleanNetwork(Medium):
    """A synchronous Boolean network: each node's next state is a truth table over its inputs.

    Parameters
    ----------
    names
        Node names, one per node (sites are nodes).
    inputs
        For each node, the indices of its inputs (first input most significant in its table).
    tables
        For each node, ``2 ** len(inputs)`` outputs (0/1).
    description
        Free text kept with the network.

    Examples
    --------
    Kauffman's 1969 three-node example, A = B and C, B = A or C, C = A or B:

    >>> net = BooleanNetwork.from_expressions({"A": "B and C", "B": "A or C", "C": "A or B"})
    >>> import numpy as np
    >>> net.step(np.array([[0, 0, 1]], dtype=np.uint8)).tolist()
    [[0, 1, 0]]
    """

    kind = "boolnet"
    n_states = 2

    def __init__(self, names, inputs, tables, description: str = "", source: str = "", params: dict | None = None):
        names = [str(name) for name in names]
        require(len(names) >= 1, "network: needs at least one node")
        seen = set()
        for name in names:
            require(name not in seen, f"network: node {name!r} is defined twice; each node once")
            seen.add(name)
        require(len(inputs) == len(names) and len(tables) == len(names),
                "network: need one input list and one table per node")
        self.names = names
        self.n_sites = len(names)
        self.inputs = [np.asarray(row, dtype=np.int64).reshape(-1) for row in inputs]
        self.tables = [np.asarray(table, dtype=np.uint8).reshape(-1) for table in tables]
        for name, row, table in zip(names, self.inputs, self.tables):
            require(row.size <= MAX_INPUTS, f"node {name!r}: {row.size} inputs is more than {MAX_INPUTS}")
            require(((row >= 0) & (row < self.n_sites)).all(), f"node {name!r}: input index out of range")
            require(table.size == 2**row.size, f"node {name!r}: table needs {2**row.size} outputs, got {table.size}")
            require(((table == 0) | (table == 1)).all(), f"node {name!r}: table outputs must be 0 or 1")
        self.description = description
        self.source = source
        self.params = dict(params or {})
        self._input_ptr = np.zeros(self.n_sites + 1, dtype=np.int64)
        self._input_ptr[1:] = np.cumsum([row.size for row in self.inputs])
        self._inputs = np.concatenate(self.inputs).astype(np.int64) if self._input_ptr[-1] else np.zeros(0, np.int64)
        self._table_ptr = np.zeros(self.n_sites + 1, dtype=np.int64)
        self._table_ptr[1:] = np.cumsum([table.size for table in self.tables])
        self._masks = np.where(np.concatenate(self.tables) == 1, ALL_ONES, np.uint64(0)).astype(np.uint64)
        self._max_inputs = max(row.size for row in self.inputs)

    # -- construction -------------------------------------------------------------------------------

    @classmethod
    def from_expressions(cls, expressions: dict, description: str = "") -> "BooleanNetwork":
        """A network from ``{name: expression}`` (in node order)."""
        nodes = [{"name": name, "update": text} for name, text in expressions.items()]
        return cls.from_nodes(nodes, description=description)

    @classmethod
    def from_nodes(cls, nodes: list, description: str = "", where: str = "network", source: str = "") -> "BooleanNetwork":
        """A network from node tables as in the file format (a list of dicts)."""
        names = []
        for number, node in enumerate(nodes, start=1):
            require(isinstance(node, dict), f"{where}: node {number} must be a table")
            for key in node:
                if key not in NODE_KEYS:
                    raise MediumInputError(unknown_key_message(f"{where}: node {node.get('name', number)!r}", key,
                                                               NODE_KEYS))
            name = node.get("name")
            require(isinstance(name, str) and name, f"{where}: node {number} needs a name")
            if name in names:
                raise MediumInputError(f"{where}: node {name!r} is defined twice (nodes {names.index(name) + 1} "
                                       f"and {number}); each node once")
            names.append(name)
        known = set(names)
        inputs, tables = [], []
        for node in nodes:
            name = node["name"]
            kinds = [key for key in ("update", "table", "weights") if key in node]
            require(len(kinds) == 1, f"{where}: node {name!r} needs exactly one of update, table or weights")
            if kinds[0] == "update":
                text = node["update"]
                require(isinstance(text, str), f"{where}: node {name!r}: update must be a string expression")
                tree = parse(text, where=f"{where}: node {name!r}: update {text!r}", known=known)
                used = names_in(tree)
                table = truth_table(tree, used, where=f"{where}: node {name!r}")
            elif kinds[0] == "table":
                used = node.get("inputs", [])
                require(isinstance(used, list), f"{where}: node {name!r}: inputs must be a list of node names")
                for item in used:
                    require(item in known, f"{where}: node {name!r}: undefined node {item!r} in inputs")
                text = str(node["table"]).replace(" ", "")
                require(len(text) == 2 ** len(used) and set(text) <= {"0", "1"},
                        f"{where}: node {name!r}: table {node['table']!r} needs {2 ** len(used)} digits 0/1, "
                        f"one per input row")
                table = np.array([int(ch) for ch in text], dtype=np.uint8)
            else:
                used, table = _threshold_table(node, known, where)
            inputs.append([names.index(item) for item in used])
            tables.append(table)
        return cls(names, inputs, tables, description=description, source=source)

    @classmethod
    def from_toml(cls, path) -> "BooleanNetwork":
        """Read a network file (format in the module docstring)."""
        data, where = read_toml_file(path)
        for key in data:
            if key not in ("network", "node"):
                raise MediumInputError(unknown_key_message(where, key, ("network", "node")))
        header = data.get("network", {})
        nodes = data.get("node", [])
        require(isinstance(nodes, list) and nodes, f"{where}: no [[node]] tables")
        network = cls.from_nodes(nodes, description=str(header.get("description", "")), where=where,
                                 source=str(path))
        network.params = {"network": str(path)}
        return network

    # -- the Medium interface -------------------------------------------------------------------------

    def describe(self):
        if self.params:
            return dict(self.params)
        return {"nodes": self.n_sites}

    def site_names(self):
        return list(self.names)

    def step(self, states):
        states = np.asarray(states, dtype=np.uint8)
        out = np.empty_like(states)
        for node, (row, table) in enumerate(zip(self.inputs, self.tables)):
            index = np.zeros(states.shape[0], dtype=np.int64)
            for source in row:
                index = 2 * index + states[:, source]
            out[:, node] = table[index]
        return out

    def transition_table(self):
        """Every node's truth table, concatenated in node order, and the quiescent state: ``(outputs, 0)``.

        An optional capability read by ``probe.measures.langton_lambda``. Langton's lambda over
        this table is the fraction of 1s among all table entries, that is the mean table bias
        with each node weighted by its table size ``2**K`` (the plain mean bias over nodes when
        every node has the same number of inputs).
        """
        return np.concatenate(self.tables).astype(np.uint8), 0

    def boolean_functions(self):
        """``[(inputs, table), ...]``, one per node: input indices (first input most significant
        in the table) and the ``2**len(inputs)`` outputs. An optional capability read by
        ``probe.measures.mean_sensitivity``; the arrays are copies.
        """
        return [(row.copy(), table.copy()) for row, table in zip(self.inputs, self.tables)]

    def reach(self, sites, steps):
        """The sites themselves and every node downstream of them by a path of 1..``steps`` edges."""
        readers = [set() for _ in range(self.n_sites)]
        for node, row in enumerate(self.inputs):
            for source in row.tolist():
                readers[source].add(node)
        return downstream(readers, sites, steps)

    def evolve(self, initial, steps, *, watch, watch_from=0, clamp_sites=None, clamp_values=None):
        def run(words, steps, clamp_sites, clamp_words, watch, watch_from, out):
            _evolve_words(words, steps, self._input_ptr, self._inputs, self._table_ptr, self._masks,
                          self._max_inputs, clamp_sites, clamp_words, watch, watch_from, out)

        return bitslice.evolve_packed(self, initial, steps, watch=watch, watch_from=watch_from,
                                      clamp_sites=clamp_sites, clamp_values=clamp_values, run=run)

    def settle(self, initial, *, watch, max_steps, clamp_sites=None, clamp_values=None):
        batch, words, max_steps, watch, _, clamp_sites, clamp_words = bitslice.packed_arguments(
            self, initial, max_steps, watch, 0, clamp_sites, clamp_values)
        valid = bitslice.pack(np.ones((batch, 1), dtype=np.uint8))[0]
        meet, varies, met = _settle_words(words, max_steps, self._input_ptr, self._inputs, self._table_ptr,
                                          self._masks, self._max_inputs, clamp_sites, clamp_words, watch, valid)
        pattern = np.ascontiguousarray(bitslice.unpack(meet[watch], batch).T)
        constant = bitslice.unpack((met & ~varies)[None, :], batch)[0].astype(bool)
        return pattern, constant


def _threshold_table(node, known, where):
    name = node["name"]
    weights = node.get("weights")
    require(isinstance(weights, dict) and weights, f"{where}: node {name!r}: weights must be a table like {{ A = 1 }}")
    for item, weight in weights.items():
        require(item in known, f"{where}: node {name!r}: undefined node {item!r} in weights")
        require(isinstance(weight, (int, float)) and not isinstance(weight, bool),
                f"{where}: node {name!r}: weight of {item!r} must be a number, got {weight!r}")
    threshold = node.get("threshold", 0)
    require(isinstance(threshold, (int, float)) and not isinstance(threshold, bool),
            f"{where}: node {name!r}: threshold must be a number, got {threshold!r}")
    tie = node.get("tie", "keep")
    require(tie in TIES, f"{where}: node {name!r}: tie must be one of {', '.join(TIES)}, got {tie!r}")
    used = list(weights)
    if tie == "keep" and name not in used:
        used.append(name)  # keeping the state on a tie makes the node read itself
    rows = input_rows(len(used)).astype(np.float64)
    vector = np.array([float(weights.get(item, 0.0)) for item in used])
    total = rows @ vector
    table = (total > threshold).astype(np.uint8)
    if tie == "keep":
        ties = np.isclose(total, threshold)
        table[ties] = rows[ties, used.index(name)].astype(np.uint8)
    return used, table


def random_network(nodes: int, inputs: int, bias: float = 0.5, seed: int = 0) -> BooleanNetwork:
    """A random N-K network (Kauffman 1969): each node reads ``inputs`` distinct nodes chosen uniformly
    (itself allowed), and each table entry is 1 with probability ``bias``.

    The generator is ``numpy.random.default_rng(seed)``; the same (nodes,
    inputs, bias, seed) always gives the same network.
    """
    require(not isinstance(nodes, bool) and isinstance(nodes, (int, np.integer)) and nodes >= 1,
            f"nodes: N must be a whole number >= 1, got {nodes!r}")
    require(not isinstance(inputs, bool) and isinstance(inputs, (int, np.integer)) and inputs >= 0,
            f"inputs: K must be a whole number >= 0, got {inputs!r}")
    require(inputs <= nodes, f"inputs: K = {inputs} is more than N = {nodes} nodes; allowed 0 <= K <= N")
    require(inputs <= MAX_INPUTS, f"inputs: K = {inputs} is more than the {MAX_INPUTS} allowed")
    require(isinstance(bias, (int, float)) and not isinstance(bias, bool) and 0.0 <= bias <= 1.0,
            f"bias: p = {bias!r} must lie in [0, 1]")
    rng = np.random.default_rng(int(seed))
    wiring = [np.sort(rng.choice(nodes, size=inputs, replace=False)) for _ in range(nodes)]
    tables = [(rng.random(2**inputs) < bias).astype(np.uint8) for _ in range(nodes)]
    names = [f"n{i}" for i in range(nodes)]
    return BooleanNetwork(names, wiring, tables, params={"nodes": int(nodes), "inputs": int(inputs),
                                                        "bias": float(bias), "network_seed": int(seed)})
