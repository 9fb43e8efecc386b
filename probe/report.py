"""Reports: ``report.md`` for a run folder, with tables, figures and a plain-language reading.

The report is rebuilt from the files in the run folder alone (config,
manifest, results), so it can be written again at any time, for example
after measures were added to the run.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np

from media import registry
from probe import runfolder
from probe.compare import DEFAULT_RESAMPLES, compare, measure_columns, to_markdown
from probe.errors import ProbeInputError

CAUTION = (
    "**Caution.** Semantic capacity counts context-switched sign-to-meaning swaps *under the layout and readout "
    "chosen here*: which sites carry signs and contexts, where and when meaning is read, the background and the "
    "boundary. Another layout can rank the same media differently. A high count is a property of a deterministic "
    "dynamical system under one probing scheme; it is not evidence of life, of meaning in a biological or "
    "semiotic sense, or of anything being about anything."
)


def _read_run(folder: Path):
    folder = Path(folder)
    manifest_path = folder / runfolder.MANIFEST
    if not manifest_path.exists() or not (folder / runfolder.RESULTS).exists():
        raise ProbeInputError(f"run folder: {folder} has no {runfolder.MANIFEST} and {runfolder.RESULTS}; "
                              f"run `cprobe survey CONFIG --out {folder}` first")
    try:
        manifest = json.loads(manifest_path.read_text())
    except json.JSONDecodeError:
        raise ProbeInputError(f"run folder: {manifest_path} is not a readable manifest") from None
    rows = runfolder.read_results(folder)
    config_text = (folder / runfolder.CONFIG).read_text() if (folder / runfolder.CONFIG).exists() else ""
    return manifest, rows, config_text


def _fmt(value, digits=3):
    if isinstance(value, float):
        if math.isnan(value):
            return "n/a"
        return f"{value:.{digits}f}"
    return f"{value:,}" if isinstance(value, int) else str(value)


def capacity_summary(rows: list, layouts: list, family) -> str:
    """A Markdown table: per layout, how many instances carry codes, median and max capacity, top instances."""
    label = getattr(family, "instance_label", lambda params: "")
    axis_key = getattr(family, "axis_key", None)
    lines = ["| layout | instances | with codes | median capacity | max capacity | highest |",
             "|---|---|---|---|---|---|"]
    for layout in layouts:
        subset = [row for row in rows if row["layout"] == layout]
        values = np.array([row["code_instances"] for row in subset], dtype=float)
        top = sorted(subset, key=lambda row: -row["code_instances"])[:5]
        names = ", ".join(f"{row[axis_key]}" if axis_key else label(row) for row in top if row["code_instances"] > 0)
        lines.append(f"| {layout} | {len(subset)} | {int(np.count_nonzero(values))} | {np.median(values):,.0f} | "
                     f"{values.max():,.0f} | {names or '-'} |")
    return "\n".join(lines) + "\n"


def class_summary(rows: list, layouts: list, family) -> str:
    """Median capacity and share of instances with codes per published class, per layout."""
    column = getattr(family, "class_column", None)
    if not column or not rows or column not in rows[0]:
        return ""
    classes = sorted({row[column] for row in rows}, key=str)
    lines = ["| layout | " + " | ".join(f"{column} {value}" for value in classes) + " |",
             "|---|" + "---|" * len(classes)]
    for layout in layouts:
        cells = []
        for value in classes:
            group = [row["code_instances"] for row in rows if row["layout"] == layout and row[column] == value]
            share = np.mean(np.asarray(group) > 0) if group else 0.0
            cells.append(f"median {np.median(group):,.0f}; {share:.0%} with codes (n={len(group)})")
        lines.append(f"| {layout} | " + " | ".join(cells) + " |")
    return "\n".join(lines) + "\n"


def reading(correlations: list, note: str, layouts: list) -> str:
    """The plain-language paragraph on what the comparison shows and how sure it is."""
    if not correlations:
        return ("No measures were computed for this run, so the report cannot say how semantic capacity relates "
                "to complexity. Add some with `cprobe measure RUN --add NAME,...` and write the report again.")
    headline = [row for row in correlations if row.tally == "code_instances" and not math.isnan(row.spearman_p)]
    tests = len(headline)
    threshold = 0.05 / max(1, tests)
    sentences = [f"Correlations use {note}. The headline question, semantic capacity against each measure, "
                 f"took {tests} Spearman tests; with a Bonferroni correction over them a p-value below "
                 f"{threshold:.1e} is needed for one to stand on its own. The other tallies in comparison.csv "
                 f"are exploratory and uncorrected."]
    for layout in layouts:
        main = [row for row in correlations if row.layout == layout and row.tally == "code_instances"
                and not math.isnan(row.spearman_rho)]
        if not main:
            sentences.append(f"Under layout '{layout}' semantic capacity does not vary, so no correlation is defined.")
            continue
        best = max(main, key=lambda row: abs(row.spearman_rho))
        direction = "rises" if best.spearman_rho > 0 else "falls"
        no_interval = math.isnan(best.spearman_low)
        excludes = best.spearman_low > 0 or best.spearman_high < 0
        survives = best.spearman_p < threshold
        strength = ("strong" if abs(best.spearman_rho) >= 0.6 else "moderate" if abs(best.spearman_rho) >= 0.3
                    else "weak")
        certainty = ("no bootstrap interval could be computed (too few instances with codes to resample), so "
                     "its precision is unknown" if no_interval else
                     "its 95% interval excludes zero" if excludes else "its 95% interval includes zero, so even "
                     "the sign is uncertain")
        smallest_p = 1.0 / (DEFAULT_RESAMPLES + 1)
        p_text = f"p = {best.spearman_p:.4f}" if best.spearman_p > smallest_p else f"p <= {smallest_p:.4f}"
        sentences.append(
            f"Under layout '{layout}', semantic capacity {direction} most clearly with {best.measure} "
            f"(Spearman rho = {best.spearman_rho:.2f}, "
            f"{'no interval' if no_interval else f'95% CI {best.spearman_low:.2f} to {best.spearman_high:.2f}'}, "
            f"{p_text}, Kendall tau = {best.kendall_tau:.2f}, n = {best.n}): a {strength} monotone association; "
            f"{certainty}, and it {'survives' if survives else 'does not survive'} the correction.")
        weak = [row.measure for row in main if row.spearman_low <= 0 <= row.spearman_high]
        if weak:
            sentences.append(f"For {', '.join(weak)} the interval includes zero: no clear association.")
    sentences.append("A rank correlation says the two orderings agree, not that one causes the other, and it "
                     "depends on which instances were surveyed.")
    return " ".join(sentences)


def write_report(folder, *, seed: int | None = None, n_resamples: int = DEFAULT_RESAMPLES,
                 use_all_rows: bool = False) -> Path:
    """Write ``report.md``, the comparison tables and the figures into run folder ``folder``; return the report path.

    Examples
    --------
    >>> import tempfile
    >>> from probe.config import SurveyConfig
    >>> from probe.survey import run_survey
    >>> folder = tempfile.mkdtemp()
    >>> config = SurveyConfig.from_dict({"survey": {"name": "doc"}, "medium": {"kind": "eca", "rules": "30,90,150"},
    ...     "layout": [{"name": "a", "signs": "10", "contexts": "8,9,11,12", "readout": "10", "window": "2:2"}]})
    >>> _ = run_survey(config, folder, progress=False)
    >>> write_report(folder).name
    'report.md'
    """
    from probe.figures import (plot_capacity_by_class, plot_capacity_vs_measures, plot_tally_against,
                               plot_tally_heatmap)

    folder = Path(folder)
    manifest, rows, config_text = _read_run(folder)
    family = registry.family(manifest["medium"])
    seed = manifest.get("seed", 0) if seed is None else seed
    layouts = list(dict.fromkeys(row["layout"] for row in rows))
    measures = measure_columns(rows)

    correlations, note = ([], "")
    if measures:
        correlations, note = compare(rows, family=family, layouts=layouts, measures=measures, seed=seed,
                                     n_resamples=n_resamples, use_all_rows=use_all_rows)
        csv_rows = [row.as_dict() for row in correlations]
        columns = list(csv_rows[0]) if csv_rows else []
        runfolder.write_atomic(folder / "comparison.csv", runfolder.rows_to_csv(csv_rows, columns))
        runfolder.write_atomic(folder / "comparison.md", f"Rows used: {note}.\n\n" + to_markdown(correlations))

    figures = {}
    if getattr(family, "class_column", None) and rows and family.class_column in rows[0]:
        figures["by class"] = plot_capacity_by_class(rows, folder / "capacity_by_class.png", family=family,
                                                     layouts=layouts)
    trend_key = getattr(family, "trend_key", None)
    if trend_key and rows and trend_key in rows[0]:
        for layout in layouts:
            figures[f"trend {layout}"] = plot_tally_against(
                rows, folder / f"trend_{_slug(layout)}.png", x=trend_key, group=getattr(family, "trend_group", None),
                layout=layout, title=f"layout {layout!r}: tallies against {trend_key}")
    figures["heatmap"] = plot_tally_heatmap(rows, folder / "tallies_heatmap.png", family=family, layouts=layouts)
    for layout in layouts if measures else []:
        subset = [row for row in rows if row["layout"] == layout]
        if not use_all_rows:
            subset, _ = (family.dedupe(subset) if hasattr(family, "dedupe") else (subset, ""))
        figures[f"measures {layout}"] = plot_capacity_vs_measures(
            subset, folder / f"measures_{_slug(layout)}.png", measures=measures, family=family, layout=layout)

    lines = [f"# Report: {manifest.get('survey', folder.name)}", ""]
    lines += [f"- medium: `{manifest['medium']}`, {manifest.get('tasks', len(rows))} tasks "
              f"({len(rows) // max(1, len(layouts))} instances x {len(layouts)} layouts)",
              f"- seed: {seed}; config hash `{manifest.get('config_hash', '')[:16]}`; written {manifest.get('created', '')}",
              "- versions: " + ", ".join(f"{k} {v}" for k, v in manifest.get("packages", {}).items() if v), ""]
    lines += [CAUTION, ""]
    lines += ["## Configuration", "", "```toml", config_text.strip(), "```", ""]
    lines += ["## Semantic capacity", "", capacity_summary(rows, layouts, family), "",
              "![semantic capacity per instance](capacity.png)", ""]
    summary = class_summary(rows, layouts, family)
    if summary:
        source = getattr(family, "class_source", "")
        lines += ["## By published class", "", summary, "", f"Class labels: {source}." if source else "", "",
                  "![capacity by class](capacity_by_class.png)", ""]
    if trend_key and rows and trend_key in rows[0]:
        lines += [f"## Tallies against {trend_key}", ""]
        lines += [f"![tallies against {trend_key}, {layout}](trend_{_slug(layout)}.png)" for layout in layouts]
        lines += [""]
    lines += ["## Tallies across layouts", "", "![tallies across layouts](tallies_heatmap.png)", ""]
    lines += ["## Semantic capacity and complexity", ""]
    if correlations:
        lines += [f"Rows used: {note}. Full table: `comparison.csv` / `comparison.md` (every tally against every "
                  f"measure; 95% percentile-bootstrap intervals and two-sided permutation p-values from "
                  f"scipy.stats, {n_resamples} resamples, seed {seed}).", ""]
        lines += [to_markdown([row for row in correlations if row.tally == "code_instances"]), ""]
        for layout in layouts:
            lines += [f"![capacity against measures, {layout}](measures_{_slug(layout)}.png)", ""]
    lines += ["## What the numbers show", "", reading(correlations, note, layouts), ""]
    report = folder / "report.md"
    runfolder.write_atomic(report, "\n".join(lines))
    return report


def _slug(text: str) -> str:
    return "".join(ch if ch.isalnum() or ch in "-_" else "-" for ch in text)
