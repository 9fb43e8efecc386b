"""Code witnesses: one code instance, found in a meaning table and replayed for drawing."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from media.attractors import attractor_from
from probe.evaluate import MeaningTable, UNDEFINED, clamped_sites, evaluate, initial_states
from probe.layout import patterns_from_numbers


@dataclass(frozen=True)
class CodeWitness:
    """Signs ``s1 < s2`` and contexts ``c, c2`` (indices into the meaning table) with
    ``f_c(s1)=m1, f_c(s2)=m2, f_c2(s1)=m2, f_c2(s2)=m1`` and ``m1 != m2``."""

    sign_pair: tuple
    context_pair: tuple
    meaning_pair: tuple


def find_witness(table: MeaningTable):
    """The first code instance in sign-pair then context order, or ``None`` if there is none.

    Examples
    --------
    >>> from probe.layout import Layout
    >>> from media.eca import ElementaryCA
    >>> table = evaluate(ElementaryCA(150, 9), Layout(signs="4", contexts="3,5", readout="4", window="1:1"))
    >>> find_witness(table)
    CodeWitness(sign_pair=(0, 1), context_pair=(0, 1), meaning_pair=(0, 1))
    """
    meanings = table.meanings
    for s1 in range(meanings.shape[1]):
        for s2 in range(s1 + 1, meanings.shape[1]):
            a, b = meanings[:, s1], meanings[:, s2]
            valid = (a != UNDEFINED) & (b != UNDEFINED) & (a != b)
            first_context = {}
            for c in np.flatnonzero(valid).tolist():
                first_context.setdefault((int(a[c]), int(b[c])), c)
            for (m1, m2), c in sorted(first_context.items(), key=lambda item: item[1]):
                partner = first_context.get((m2, m1))
                if partner is not None:
                    first, second = sorted((c, partner))
                    return CodeWitness((s1, s2), (first, second),
                                       (int(meanings[first, s1]), int(meanings[first, s2])))
    return None


def witness_diagrams(medium, table: MeaningTable, witness: CodeWitness, extra_steps: int = 2):
    """Full space-time rasters ``[[c s1, c s2], [c2 s1, c2 s2]]`` of the witness's four runs."""
    resolved = table.resolved
    layout = resolved.layout
    if layout.on_attractor:
        steps = settling_horizon(medium, resolved, witness, layout.run_steps) + extra_steps
    else:
        steps = layout.window[1] + extra_steps
    diagrams = []
    for context in witness.context_pair:
        states = initial_states(resolved, context, context + 1, medium.n_sites)[list(witness.sign_pair)]
        clamp_sites = clamped_sites(resolved)
        runs = medium.evolve(states, steps, watch=np.arange(medium.n_sites), clamp_sites=clamp_sites,
                             clamp_values=states[:, clamp_sites])
        diagrams.append([runs[0], runs[1]])
    return diagrams


def settling_horizon(medium, resolved, witness, max_steps: int) -> int:
    """Updates until every run of the witness has been once around its attractor (at most ``max_steps``)."""
    clamp_sites = clamped_sites(resolved)
    horizon = 1
    for context in witness.context_pair:
        states = initial_states(resolved, context, context + 1, medium.n_sites)[list(witness.sign_pair)]
        for state in states:
            try:
                transient, cycle = attractor_from(medium, state, max_steps=max_steps, clamp_sites=clamp_sites,
                                                  clamp_values=state[clamp_sites])
            except ValueError:
                return max_steps
            horizon = max(horizon, transient + len(cycle))
    return min(horizon, max_steps)


def pattern_text(pattern) -> str:
    return "".join(str(int(v)) for v in pattern)


def meaning_text(resolved, meaning: int, site_names=None) -> str:
    """A meaning number as the readout pattern it stands for (or the one-hot site)."""
    if resolved.layout.meanings == "one-hot":
        k = resolved.n_states
        position, value = divmod(meaning, k - 1)
        site = int(resolved.readout_sites[position])
        label = site_names[site] if site_names is not None else f"site {site}"
        return f"{label} on" if k == 2 else f"{label} = {value + 1}"
    return pattern_text(patterns_from_numbers(np.array([meaning]), resolved.n_states, resolved.readout_sites.size)[0])


def draw_witness(medium, layout, path, *, seed: int = 0, max_runs=None, title: str | None = None):
    """Find one code instance of ``layout`` on ``medium`` and draw it; return ``(witness, path)``.

    ``witness`` is ``None`` (and nothing is drawn) when the layout carries no code.
    """
    from probe.figures import plot_witness

    kwargs = {} if max_runs is None else {"max_runs": max_runs}
    table = evaluate(medium, layout, seed=seed, **kwargs)
    witness = find_witness(table)
    if witness is None:
        return None, None
    resolved = table.resolved
    diagrams = witness_diagrams(medium, table, witness)
    labels = []
    for row, context in enumerate(witness.context_pair):
        context_pattern = pattern_text(resolved.context_patterns(context, context + 1)[0])
        line = []
        for column, sign in enumerate(witness.sign_pair):
            meaning = table.meanings[context, sign]
            line.append(f"sign {pattern_text(resolved.sign_patterns[sign])} | context {context_pattern}\n"
                        f"meaning {meaning_text(resolved, int(meaning), medium.site_names())}")
        labels.append(line)
    sites = {"signs": resolved.sign_sites, "contexts": resolved.context_sites, "readout": resolved.readout_sites}
    heading = title or (f"code witness: {medium!r}, layout {resolved.layout.name!r}\n"
                        f"patterns list their sites in layout order; the meaning swaps with the context")
    plot_witness(diagrams, path, sites=sites, labels=labels,
                 window=None if resolved.layout.on_attractor else resolved.layout.window,
                 site_names=medium.site_names(), n_states=resolved.n_states, title=heading)
    return witness, path
