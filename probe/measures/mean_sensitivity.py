"""Mean average sensitivity of a Boolean network's node functions.

Shmulevich & Kauffman 2004 (PRL 93:048701): the average sensitivity of a
Boolean function ``f`` of ``K`` inputs is the mean, over all ``2^K`` input
rows ``x``, of the number of inputs ``i`` whose flip changes the output,
``f(x) != f(x xor e_i)``. AND and OR of two inputs give 1, XOR of two gives
2. For random functions with bias ``p`` its expectation is ``2p(1-p)K``, the
annealed Derrida value; 1 marks the critical regime.
"""

from __future__ import annotations

import numpy as np

from probe.measures.registry import MeasureUnavailable, require_capability

NAME = "mean_sensitivity"


def average_sensitivity(table, n_inputs: int) -> float:
    """Average sensitivity of one truth table over ``n_inputs`` inputs (first input most significant).

    Examples
    --------
    >>> average_sensitivity([0, 0, 0, 1], 2)  # AND
    1.0
    >>> average_sensitivity([0, 1, 1, 0], 2)  # XOR
    2.0
    """
    table = np.asarray(table, dtype=np.uint8).reshape(-1)
    if table.size != 2 ** int(n_inputs):
        raise MeasureUnavailable(f"measure {NAME!r}: a table over {n_inputs} inputs needs {2 ** int(n_inputs)} "
                                 f"outputs, got {table.size}")
    rows = np.arange(table.size)
    changes = 0
    for bit in range(int(n_inputs)):  # input i is bit (K-1-i) of the row; every bit is some input
        changes += np.count_nonzero(table != table[rows ^ (1 << bit)])
    return float(changes / table.size)


def mean_sensitivity(medium, *, seed: int = 0) -> float:
    """Mean over nodes of each node function's average sensitivity (inputs per row; no units).

    Needs the ``boolean_functions()`` capability. A node without inputs has
    sensitivity 0. Exact (every input row of every table); ``seed`` is
    accepted for the uniform signature and not used.

    Examples
    --------
    >>> from media.boolnet import BooleanNetwork
    >>> net = BooleanNetwork.from_expressions({"A": "A and B", "B": "A xor B"})
    >>> mean_sensitivity(net)  # (1 + 2) / 2
    1.5
    """
    require_capability(medium, "boolean_functions", NAME)
    functions = medium.boolean_functions()
    return float(np.mean([average_sensitivity(table, np.asarray(inputs).size) for inputs, table in functions]))
