"""Figures: the survey summary and the code witness.

Both are drawn with matplotlib's Agg backend into PNG files and know nothing
of any particular medium: a family tells which result columns hold class
labels (``class_column`` colours, ``marker_column`` marker shapes) and which
parameter is the x axis (``axis_key``); a medium may name its sites.
"""

from __future__ import annotations

from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import matplotlib.ticker  # noqa: E402,F401
import numpy as np  # noqa: E402
from matplotlib.patches import Rectangle  # noqa: E402

PALETTE = ("#4c72b0", "#55a868", "#c44e52", "#8172b2", "#ccb974", "#64b5cd", "#8c8c8c", "#dd8452")
MARKERS = ("o", "s", "^", "D", "v", "P", "X", "*")
SITE_COLOURS = {"signs": "#c44e52", "contexts": "#4c72b0", "readout": "#55a868"}


def _category_styles(values, styles):
    ordered = sorted({v for v in values if v is not None}, key=lambda v: (str(type(v)), v))
    return {value: styles[i % len(styles)] for i, value in enumerate(ordered)}


def plot_capacity(rows: list, path, *, family=None, layouts=None, title: str = "survey") -> Path:
    """Semantic capacity per medium instance on a log scale, one panel per layout.

    Zero capacity sits on the linear stretch at the bottom of a symmetric-log
    axis, so instances without codes stay visible. Points are coloured by the
    family's ``class_column`` and shaped by its ``marker_column`` when present.
    """
    path = Path(path)
    layouts = layouts or sorted({row["layout"] for row in rows})
    axis_key = getattr(family, "axis_key", None)
    class_column = getattr(family, "class_column", None)
    marker_column = getattr(family, "marker_column", None)
    colours = _category_styles([row.get(class_column) for row in rows], PALETTE) if class_column else {}
    markers = _category_styles([row.get(marker_column) for row in rows], MARKERS) if marker_column else {}

    fig, axes = plt.subplots(len(layouts), 1, figsize=(12, 2.9 * len(layouts) + 0.8), squeeze=False, sharex=True)
    for ax, layout in zip(axes[:, 0], layouts):
        subset = [row for row in rows if row["layout"] == layout]
        x = np.array([row[axis_key] if axis_key else i for i, row in enumerate(subset)], dtype=float)
        y = np.array([row["code_instances"] for row in subset], dtype=float)
        groups = {}
        for i, row in enumerate(subset):
            key = (row.get(class_column) if class_column else None, row.get(marker_column) if marker_column else None)
            groups.setdefault(key, []).append(i)
        for (colour_key, marker_key), members in sorted(groups.items(), key=lambda item: str(item[0])):
            ax.scatter(x[members], y[members], s=22, color=colours.get(colour_key, PALETTE[0]),
                       marker=markers.get(marker_key, "o"), edgecolor="black", linewidth=0.3, zorder=3)
        ax.vlines(x, 0, y, color="#bbbbbb", linewidth=0.6, zorder=1)
        ax.set_yscale("symlog", linthresh=1.0)
        ax.set_ylim(bottom=-0.3)
        ax.set_ylabel("code instances")
        with_codes = int(np.count_nonzero(y))
        ax.set_title(f"layout {layout!r}: {with_codes} of {len(subset)} instances carry codes; "
                     f"max {int(y.max()) if y.size else 0:,}", fontsize=10, loc="left")
        ax.grid(axis="y", alpha=0.3)
    axes[-1, 0].set_xlabel(axis_key or "instance")
    first = [row for row in rows if row["layout"] == layouts[0]]
    if not axis_key and first:
        # No numeric parameter to place instances by: number them and, when few, name them.
        axes[-1, 0].xaxis.set_major_locator(matplotlib.ticker.MaxNLocator(integer=True))
        axes[-1, 0].set_xlim(-0.6, len(first) - 0.4)
        if family is not None and len(first) <= 30:
            axes[-1, 0].set_xticks(range(len(first)))
            axes[-1, 0].set_xticklabels([_short_label(family, row) for row in first], rotation=30, ha="right",
                                        fontsize=7)

    handles = []
    for value, colour in colours.items():
        handles.append(plt.Line2D([], [], linestyle="", marker="o", color=colour, markeredgecolor="black",
                                  label=f"{class_column.replace('_', ' ')} {value}"))
    for value, marker in markers.items():
        handles.append(plt.Line2D([], [], linestyle="", marker=marker, color="#999999", markeredgecolor="black",
                                  label=f"{value}"))
    if handles:
        fig.legend(handles=handles, loc="upper right", ncol=min(len(handles), 5), fontsize=8, frameon=False)
    source = getattr(family, "class_source", "")
    fig.suptitle(f"{title}: semantic capacity (order-2 code instances)", x=0.01, ha="left", fontsize=12)
    if source:
        fig.text(0.01, 0.005, source, fontsize=7, color="#555555")
    fig.tight_layout(rect=(0, 0.02, 1, 0.93))
    fig.savefig(path, dpi=110)
    plt.close(fig)
    return path


def plot_witness(diagrams, path, *, sites: dict, window, labels, site_names=None, n_states: int = 2,
                 title: str = "") -> Path:
    """Four space-time rasters (two signs x two contexts) of one code instance.

    ``diagrams[i][j]`` is the ``(times, sites)`` raster of sign ``j`` under
    context ``i``; ``sites`` maps ``signs``/``contexts``/``readout`` to index
    arrays; ``window`` is ``(t0, t1)`` (``None`` for an attractor readout); ``labels[i][j]`` titles each panel.
    """
    path = Path(path)
    times, n_sites = diagrams[0][0].shape
    width = min(16.0, 2.5 + 0.32 * n_sites * 2)
    height = min(16.0, 2.6 + 0.32 * (times + 3) * 2)
    fig, axes = plt.subplots(2, 2, figsize=(width, height), squeeze=False)
    cmap = plt.get_cmap("Greys", n_states)
    # Inputs are marked above t = 0, where they are written; the readout below the last row.
    rows = {"signs": -1.0, "contexts": -1.0, "readout": times - 0.05}
    shapes = {"signs": "v", "contexts": "v", "readout": "^"}
    for i in range(2):
        for j in range(2):
            ax = axes[i, j]
            ax.imshow(diagrams[i][j], cmap=cmap, vmin=0, vmax=n_states - 1, interpolation="nearest", aspect="equal")
            if window is not None:
                t0, t1 = window
                for site in np.asarray(sites["readout"]):
                    ax.add_patch(Rectangle((site - 0.5, t0 - 0.5), 1, t1 - t0 + 1, facecolor=SITE_COLOURS["readout"],
                                           alpha=0.35, edgecolor=SITE_COLOURS["readout"], linewidth=1.2, zorder=3))
                ax.axhspan(t0 - 0.5, t1 + 0.5, color="#f0c419", alpha=0.15, zorder=2)
            for kind in ("signs", "contexts", "readout"):
                marks = np.asarray(sites[kind])
                ax.scatter(marks, np.full(marks.shape, rows[kind]), marker=shapes[kind], s=30,
                           color=SITE_COLOURS[kind], clip_on=False, zorder=4)
            ax.set_ylim(times + 0.4, -1.6)
            ax.set_xlim(-0.5, n_sites - 0.5)
            ax.set_title(labels[i][j], fontsize=9)
            ax.set_ylabel("time")
            ticks = matplotlib.ticker.MaxNLocator(integer=True).tick_values(0, times - 1)
            ax.set_yticks([int(t) for t in ticks if 0 <= t <= times - 1])
            if site_names is not None and n_sites <= 40:
                ax.set_xticks(range(n_sites))
                ax.set_xticklabels(site_names, rotation=90, fontsize=7)
            else:
                ax.xaxis.set_major_locator(matplotlib.ticker.MaxNLocator(integer=True))
                if i == 1:
                    ax.set_xlabel("site")
    handles = [plt.Line2D([], [], linestyle="", marker=shapes[kind], color=colour, label=f"{kind.rstrip('s')} sites")
               for kind, colour in SITE_COLOURS.items()]
    if window is not None:
        handles.append(Rectangle((0, 0), 1, 1, color="#f0c419", alpha=0.3,
                                 label=f"readout window {window[0]}:{window[1]}"))
    else:
        handles.append(plt.Line2D([], [], linestyle="", label="readout: on the attractor"))
    fig.legend(handles=handles, loc="lower center", ncol=4, fontsize=8, frameon=False)
    fig.suptitle(title, fontsize=10)
    fig.tight_layout(rect=(0, 0.05, 1, 0.95), h_pad=2.0 if site_names is None else 6.0)  # room for rotated names
    fig.savefig(path, dpi=110)
    plt.close(fig)
    return path


def _class_colour_map(rows, family):
    class_column = getattr(family, "class_column", None)
    colours = _category_styles([row.get(class_column) for row in rows], PALETTE) if class_column else {}
    return class_column, colours


def _label_key(family):
    return getattr(family, "axis_key", None)


def plot_capacity_vs_measures(rows: list, path, *, measures: list, family=None, layout: str = "",
                              tally: str = "code_instances") -> Path:
    """Semantic capacity against each measure: one panel per measure, points labelled and coloured by class."""
    path = Path(path)
    class_column, colours = _class_colour_map(rows, family)
    label_key = _label_key(family)
    columns = min(3, max(1, len(measures)))
    lines = (len(measures) + columns - 1) // columns
    fig, axes = plt.subplots(lines, columns, figsize=(5.2 * columns, 4.0 * lines), squeeze=False)
    for ax, measure in zip(axes.flat, measures):
        points = [row for row in rows if _finite(row.get(measure)) and _finite(row.get(tally))]
        for row in points:
            ax.scatter(row[measure], row[tally], s=20, color=colours.get(row.get(class_column), PALETTE[0]),
                       edgecolor="black", linewidth=0.3, zorder=3)
            if label_key:
                ax.annotate(str(row[label_key]), (row[measure], row[tally]), fontsize=5.5, alpha=0.75,
                            xytext=(2, 2), textcoords="offset points")
        ax.set_yscale("symlog", linthresh=1.0)
        values = np.array([float(row[measure]) for row in points]) if points else np.zeros(1)
        if values.min() >= 0 and values.max() > 100 * max(1.0, float(np.median(values))):
            ax.set_xscale("symlog", linthresh=1.0)  # transient and cycle lengths span orders of magnitude
        ax.set_xlabel(measure)
        ax.set_ylabel(tally.replace("_", " "))
        ax.grid(alpha=0.3)
    for ax in list(axes.flat)[len(measures):]:
        ax.axis("off")
    handles = [plt.Line2D([], [], linestyle="", marker="o", color=colour, markeredgecolor="black",
                          label=f"{class_column.replace('_', ' ')} {value}") for value, colour in colours.items()]
    if handles:
        fig.legend(handles=handles, loc="upper right", ncol=len(handles), fontsize=8, frameon=False)
    fig.suptitle(f"{tally.replace('_', ' ')} against each measure, layout {layout!r}", x=0.01, ha="left")
    fig.tight_layout(rect=(0, 0, 1, 0.95))
    fig.savefig(path, dpi=100)
    plt.close(fig)
    return path


def plot_capacity_by_class(rows: list, path, *, family=None, layouts=None, tally: str = "code_instances") -> Path:
    """Box plots of semantic capacity per published class, one panel per layout."""
    path = Path(path)
    class_column, colours = _class_colour_map(rows, family)
    layouts = layouts or list(dict.fromkeys(row["layout"] for row in rows))
    fig, axes = plt.subplots(1, len(layouts), figsize=(4.5 * len(layouts) + 1, 4.2), squeeze=False)
    classes = list(colours)
    for ax, layout in zip(axes[0], layouts):
        groups = [[row[tally] for row in rows if row["layout"] == layout and row.get(class_column) == value]
                  for value in classes]
        values = [np.log10(1 + np.asarray(group, dtype=float)) for group in groups]
        parts = ax.boxplot(values, patch_artist=True, showfliers=True)
        for patch, value in zip(parts["boxes"], classes):
            patch.set_facecolor(colours[value])
            patch.set_alpha(0.7)
        for i, group in enumerate(values, start=1):
            jitter = np.random.default_rng(i).uniform(-0.12, 0.12, size=len(group))
            ax.scatter(i + jitter, group, s=8, color="black", alpha=0.5, zorder=3)
        ax.set_xticks(range(1, len(classes) + 1))
        ax.set_xticklabels([f"{value}\n(n={len(group)})" for value, group in zip(classes, groups)], fontsize=8)
        ax.set_title(f"layout {layout!r}", fontsize=10)
        ax.set_ylabel(f"log10(1 + {tally})")
        ax.set_xlabel(class_column.replace("_", " ") if class_column else "")
        ax.grid(axis="y", alpha=0.3)
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)
    return path


def plot_tally_heatmap(rows: list, path, *, family=None, layouts=None,
                       tallies=("code_instances", "codes", "coding_fraction", "distinct_mappings",
                                "undefined_fraction", "co_information_bits")) -> Path:
    """Heatmap of each tally (columns) under each layout (column blocks) for every instance (rows).

    Each tally is scaled from its minimum (0) to its maximum (1) across all
    instances and layouts so that columns with different units share one
    colour scale; counts are scaled on ``log10(1 + value)``.
    """
    path = Path(path)
    layouts = layouts or list(dict.fromkeys(row["layout"] for row in rows))
    label_key = _label_key(family)
    # Survey rows come instance by instance, so the k-th row of every layout is the same instance.
    by_layout = [[row for row in rows if row["layout"] == layout] for layout in layouts]
    n_instances = min(len(group) for group in by_layout)
    matrix = np.full((n_instances, len(tallies) * len(layouts)), np.nan)
    for block, group in enumerate(by_layout):
        for i, row in enumerate(group[:n_instances]):
            for j, tally in enumerate(tallies):
                matrix[i, block * len(tallies) + j] = float(row[tally])
    for j in range(len(tallies)):
        columns = [layout * len(tallies) + j for layout in range(len(layouts))]
        block = matrix[:, columns]
        if tallies[j] in ("code_instances", "codes", "distinct_mappings", "coding_contexts"):
            block = np.log10(1 + block)
        low, high = np.nanmin(block), np.nanmax(block)
        matrix[:, columns] = (block - low) / (high - low) if high > low else 0.0
    height = min(40.0, 2.5 + 0.09 * n_instances)
    fig, ax = plt.subplots(figsize=(1.2 + 0.5 * matrix.shape[1], height))
    image = ax.imshow(matrix, aspect="auto", cmap="viridis", interpolation="nearest")
    ax.set_xticks(range(matrix.shape[1]))
    ax.set_xticklabels([f"{layout}: {tally}" for layout in layouts for tally in tallies], rotation=90, fontsize=7)
    if label_key:
        labels = [row.get(label_key, i) for i, row in enumerate(by_layout[0][:n_instances])]
        step = max(1, len(labels) // 60)
        ax.set_yticks(range(0, len(labels), step))
        ax.set_yticklabels([str(labels[i]) for i in range(0, len(labels), step)], fontsize=6)
        ax.set_ylabel(label_key)
    for boundary in range(1, len(layouts)):
        ax.axvline(boundary * len(tallies) - 0.5, color="white", linewidth=2)
    fig.colorbar(image, ax=ax, fraction=0.04, label="scaled within each tally (0 = lowest, 1 = highest)")
    ax.set_title("tallies across layouts", fontsize=10)
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)
    return path


def plot_tally_against(rows, path, *, x, group=None, tallies=("code_instances", "undefined_fraction",
                                                              "distinct_mappings"), layout=None, title=""):
    """Tallies against a numeric result column ``x``, one line per value of ``group``, for one layout.

    Medium-independent (it reads result columns only). The first panel is the share of rows with at
    least one code instance; then one panel per tally with the mean over the rows at each ``x`` and
    +-1 standard error, every row drawn as a faint point. Ensembles use it for capacity against a
    parameter (m/n for random reaction networks, K for random Boolean networks).
    """
    rows = [row for row in rows if layout is None or row["layout"] == layout]
    groups = sorted({row[group] for row in rows}, key=float) if group else [None]
    panels = ["share with codes", *tallies]
    fig, axes = plt.subplots(1, len(panels), figsize=(4.2 * len(panels), 3.6), squeeze=False)
    for number, value in enumerate(groups):
        members = [row for row in rows if group is None or row[group] == value]
        xs = sorted({float(row[x]) for row in members})
        at = {v: [row for row in members if float(row[x]) == v] for v in xs}
        colour = f"C{number % 10}"
        label = f"{group} {value}" if group else None
        share = [np.mean([float(r["code_instances"]) > 0 for r in at[v]]) for v in xs]
        axes[0, 0].plot(xs, share, marker="o", color=colour, label=label)
        for ax, tally in zip(axes[0, 1:], tallies):
            values = [np.array([float(r[tally]) for r in at[v]]) for v in xs]
            means = [v.mean() for v in values]
            errors = [v.std(ddof=1) / np.sqrt(v.size) if v.size > 1 else 0.0 for v in values]
            ax.errorbar(xs, means, yerr=errors, marker="o", color=colour, capsize=2, label=label)
            for v, points in zip(xs, values):
                ax.scatter(np.full(points.size, v), points, s=6, color=colour, alpha=0.15, linewidths=0)
    for ax, name in zip(axes[0], panels):
        ax.set_xlabel(x)
        ax.set_title(name.replace("_", " "), fontsize=10)
        ax.grid(alpha=0.3)
        if name in ("code_instances", "codes", "coding_contexts"):
            ax.set_yscale("symlog", linthresh=1.0)
    highest = max((max(line.get_ydata(), default=0.0) for line in axes[0, 0].lines), default=0.0)
    axes[0, 0].set_ylim(-0.002, max(0.05, 1.1 * highest))  # codes are rare: do not squash them under 1.0
    if group:
        axes[0, 0].legend(fontsize=8)
    fig.suptitle(title or f"tallies against {x}", x=0.01, ha="left", fontsize=10)
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)
    return Path(path)


def _short_label(family, row) -> str:
    """A family's label for a result row, with file paths cut to their file name."""
    try:
        label = str(family.instance_label(row))
    except (KeyError, TypeError):
        return ""
    return label.rsplit("/", 1)[-1]


def _finite(value) -> bool:
    try:
        return np.isfinite(float(value))
    except (TypeError, ValueError):
        return False
