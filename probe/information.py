"""Co-information of sign, context and meaning.

``co_information_bits = I(S;M) - I(S;M|C)`` (Bell 2003, "The co-information
lattice", ICA 2003), log base 2, with S and C independent and uniform over
the evaluated signs and contexts, ``M = f(S, C)`` and an undefined meaning a
symbol of its own. Sign convention as in ``dit.multivariate.coinformation``:
XOR of two fair bits gives -1; negative means synergy.

Because M is a function of (S, C): ``I(S;M|C) = H(M|C)`` and
``I(S;M) = H(M) - H(M|S)``, so the value is ``H(M) - H(M|S) - H(M|C)``.
"""

import numpy as np

from media.jit import kernel


@kernel
def _entropy_bits(counts, total):
    h = 0.0
    for value in counts:
        if value > 0:
            p = value / total
            h -= p * np.log2(p)
    return h


@kernel
def _conditional_entropies(symbols, n_symbols, offset):
    n_contexts, n_signs = symbols.shape
    counts = np.zeros(n_symbols, dtype=np.int64)
    for c in range(n_contexts):
        for s in range(n_signs):
            counts[symbols[c, s] + offset] += 1
    joint = _entropy_bits(counts, n_contexts * n_signs)
    given_sign = 0.0
    for s in range(n_signs):
        counts[:] = 0
        for c in range(n_contexts):
            counts[symbols[c, s] + offset] += 1
        given_sign += _entropy_bits(counts, n_contexts)
    counts[:] = 0
    given_context = 0.0
    for c in range(n_contexts):
        for s in range(n_signs):
            counts[symbols[c, s] + offset] += 1
        # Sum over the symbols of this row only (each once, cleared as it is used): O(signs), not O(symbols).
        for s in range(n_signs):
            symbol = symbols[c, s] + offset
            if counts[symbol] > 0:
                p = counts[symbol] / n_signs
                given_context -= p * np.log2(p)
                counts[symbol] = 0
    return joint, given_sign / n_signs, given_context / n_contexts


def co_information_bits(meanings: np.ndarray, renumbered=None) -> float:
    """``I(S;M) - I(S;M|C)`` in bits for a ``(contexts, signs)`` meaning table.

    Examples
    --------
    XOR of sign and context bit:

    >>> co_information_bits(np.array([[0, 1], [1, 0]]))
    -1.0

    ``renumbered`` is ``(dense, K)`` from ``probe.tally.dense_meanings`` when
    the caller has it: defined meanings ``0..K-1`` and -1 for undefined.
    """
    meanings = np.asarray(meanings, dtype=np.int64)
    if meanings.size == 0:
        return 0.0
    if renumbered is not None:
        symbols, n_meanings = renumbered
        offset = 1  # undefined (-1) becomes symbol 0
        n_symbols = n_meanings + 1
    else:
        _, symbols = np.unique(meanings, return_inverse=True)
        symbols = symbols.reshape(meanings.shape).astype(np.int64)
        n_symbols = int(symbols.max()) + 1
        offset = 0
    joint, given_sign, given_context = _conditional_entropies(symbols, n_symbols, offset)
    return float(joint - given_sign - given_context)
