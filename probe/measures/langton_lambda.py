"""Langton's lambda: the fraction of transition-table entries that do not lead to the quiescent state.

Langton 1990 (Physica D 42:12): for a rule table with quiescent state ``q``,
``lambda = (entries with output != q) / (all entries)``. Elementary rule 30
gives 0.5 and rule 110 gives 0.625 (quiescent 0). For a Boolean network the
medium's table is every node's truth table concatenated, so lambda is the
mean table bias (see ``BooleanNetwork.transition_table``).
"""

from __future__ import annotations

import numpy as np

from probe.measures.registry import MeasureUnavailable, medium_label, require_capability

NAME = "langton_lambda"


def langton_lambda(medium, *, seed: int = 0) -> float:
    """Langton's lambda of ``medium``'s transition table (a fraction in [0, 1], no units).

    Needs the ``transition_table()`` capability. Deterministic: ``seed`` is
    accepted for the uniform signature and not used.

    Examples
    --------
    >>> from media.eca import ElementaryCA
    >>> langton_lambda(ElementaryCA(rule=110))
    0.625
    """
    require_capability(medium, "transition_table", NAME)
    outputs, quiescent = medium.transition_table()
    outputs = np.asarray(outputs).reshape(-1)
    if outputs.size == 0:
        raise MeasureUnavailable(f"measure {NAME!r}: {medium_label(medium)} has an empty transition table")
    return float(np.count_nonzero(outputs != int(quiescent)) / outputs.size)
