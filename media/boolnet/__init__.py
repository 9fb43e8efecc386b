"""Boolean networks: our TOML format, random N-K networks, bit-sliced evolution and attractors."""



from media.attractors import Attractor, attractor_from, attractors
from media.boolnet.network import BooleanNetwork, random_network
from media.errors import require
from media.family import FileFamily, MediumFamily, Parameter, REQUIRED, ensemble_seed, grid_values


class NetworkFileFamily(FileFamily):
    """Registry entry ``boolnet``: one Boolean network read from a TOML file."""

    name = "boolnet"
    summary = "a Boolean network from a TOML file (expressions, truth tables or threshold rules), synchronous"
    reader = staticmethod(BooleanNetwork.from_toml)


def network_seed(seed: int, nodes: int, inputs: int, bias: float, replicate: int) -> int:
    """The seed of one ensemble member, derived from the run seed and its grid point."""
    return ensemble_seed(seed, "rbn", nodes, inputs, round(float(bias) * 1_000_000), replicate)


_grid = grid_values


class RandomNetworkFamily(MediumFamily):
    """Registry entry ``rbn``: random N-K Boolean networks (Kauffman 1969), one per grid point and replicate."""

    name = "rbn"
    summary = "random N-K Boolean networks: N nodes, K inputs each, table bias p, seeded"
    parameters = {
        "nodes": Parameter(REQUIRED, "N, the number of nodes"),
        "inputs": Parameter(2, "K, the inputs of every node"),
        "bias": Parameter(0.5, "p, the chance that a table entry is 1"),
        "network_seed": Parameter(0, "seed of this network's wiring and tables"),
        "replicate": Parameter(0, "replicate number (a label; the seed decides the network)"),
    }
    survey_parameters = {
        "nodes": Parameter(REQUIRED, "N, or a list of N"),
        "inputs": Parameter(2, "K, or a list of K"),
        "bias": Parameter(0.5, "p, or a list of p"),
        "replicates": Parameter(1, "networks drawn per grid point"),
    }
    class_column = "inputs"
    trend_key = "inputs"
    trend_group = "nodes"

    def build(self, **params):
        full = self.with_defaults(params)
        network = random_network(int(full["nodes"]), int(full["inputs"]), float(full["bias"]),
                                 int(full["network_seed"]))
        network.params["replicate"] = int(full["replicate"])
        return network

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        require("nodes" in table, "[medium]: missing key 'nodes' (N, or a list of N)")
        nodes = _grid(table["nodes"], "nodes", int)
        inputs = _grid(table.get("inputs", 2), "inputs", int)
        biases = _grid(table.get("bias", 0.5), "bias", (int, float))
        replicates = table.get("replicates", 1)
        require(isinstance(replicates, int) and not isinstance(replicates, bool) and replicates >= 1,
                f"[medium] replicates: {replicates!r} must be a whole number >= 1")
        out = []
        for n in nodes:
            for k in inputs:
                require(0 <= k <= n, f"[medium] inputs: K = {k} is more than N = {n} nodes; allowed 0 <= K <= N")
                for p in biases:
                    require(0.0 <= float(p) <= 1.0, f"[medium] bias: p = {p!r} must lie in [0, 1]")
                    for r in range(replicates):
                        out.append({"nodes": n, "inputs": k, "bias": float(p),
                                    "network_seed": network_seed(seed, n, k, p, r), "replicate": r})
        return out

    def instance_label(self, params):
        return f"N={params['nodes']} K={params['inputs']} p={params['bias']} #{params['replicate']}"


__all__ = ["Attractor", "BooleanNetwork", "NetworkFileFamily", "RandomNetworkFamily", "attractor_from",
           "attractors", "network_seed", "random_network"]
