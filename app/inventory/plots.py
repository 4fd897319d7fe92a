"""An inventory's summary plot and map, drawn with matplotlib's Agg canvas (no display needed).

The drawing front end of ``ditchwright batch --plot``: it draws what :mod:`app.inventory.reporting` gathered
(the counts per verdict, the shear ratios, the reaches' lines) with each verdict in the words of the one
vocabulary (:mod:`app.verdicts`); the Qt-free layer itself loads no plotting library (tests/test_layering.py).
Each file is replaced in one step, like every file the program writes.
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np
from matplotlib import rc_context
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from hydraulics import many_reaches as mr

from ..files import write_atomic
from ..verdicts import Verdict
from .reading import InventoryError
from .reporting import PLOT_FORMATS, ReachLines

__all__ = ["VERDICT_COLOURS", "plot_summary", "plot_map"]

#: One colour a verdict, in the summary plot and the map.
VERDICT_COLOURS = {"stable": "#3a7d44", "unstable": "#c0392b", "non-erodible": "#5d6d7e",
                   "hydraulics-only": "#95a5a6", "not-checked": "#b7950b", "no-solution": "#8e44ad",
                   "invalid": "#34495e"}




def plot_summary(result: mr.BatchResult, path, title: str = "Ditch inventory") -> None:
    """Save a two-panel summary figure: reaches per verdict, and the distribution of shear ratio.

    The format follows the suffix of ``path`` (PNG, PDF or SVG); the file
    is replaced in one step. Uses matplotlib's Agg canvas, so no display is
    needed.
    """
    path = Path(path)
    if path.suffix.lower() not in PLOT_FORMATS:
        raise InventoryError(f"plot {path}: the name must end in {', '.join(PLOT_FORMATS)}")
    fig = Figure(figsize=(10, 4.2), layout="constrained")
    FigureCanvasAgg(fig)
    ax1, ax2 = fig.subplots(1, 2, width_ratios=(1.1, 1))
    counts = result.counts()
    colours = VERDICT_COLOURS
    labels = list(counts)
    bars = ax1.barh([Verdict.from_token(v).words for v in labels[::-1]], [counts[v] for v in labels[::-1]],
                    color=[colours[v] for v in labels[::-1]])
    ax1.bar_label(bars, labels=[f"{counts[v]:,}" for v in labels[::-1]], padding=3)
    ax1.set_xlabel("reaches")
    ax1.xaxis.get_major_locator().set_params(integer=True)
    ax1.set_title(f"Reaches by verdict ({len(result):,} in all)")
    ax1.margins(x=0.15)
    ratio = result.shear_ratio
    ratio = ratio[~np.isnan(ratio)]
    finite = ratio[np.isfinite(ratio) & (ratio > 0)]
    if finite.size:
        # Ratios span decades (a riprap ditch on a flat grade to bare soil on a steep one): log bins.
        lo, hi = min(float(finite.min()), 0.5), max(float(finite.max()), 2.0)
        bins = np.geomspace(lo, hi * 1.0001, 41)
        ax2.hist(finite, bins=bins, color="#2e86c1")
        ax2.set_xscale("log")
        ax2.axvline(1.0, color="#c0392b", linestyle="--", label="design shear = permissible")
        ax2.legend(loc="upper right")
        held = ratio.size - finite.size
        ax2.set_ylabel("reaches")
    else:
        message = ("no reach has a permissible shear\nto compare its design shear with" if not ratio.size else
                   f"{ratio.size:,} reaches with stone that\ncannot rest on its side slopes")
        ax2.text(0.5, 0.5, message, transform=ax2.transAxes, ha="center", va="center")
        ax2.set_yticks([])
    ax2.set_xlabel("design / permissible shear (1 / safety factor)")
    held = ratio.size - finite.size if finite.size else 0
    ax2.set_title("Distribution of shear ratio" + (f"\n({held:,} not shown: stone cannot rest on the sides)"
                                                   if held else ""), fontsize=None if not held else 10)
    fig.suptitle(title)
    image = io.BytesIO()
    fig.savefig(image, format=path.suffix[1:].lower())
    write_atomic(path, image.getvalue())   # like every file written: the old plot stays whole if this one fails


def plot_map(lines: ReachLines, counts: dict, path, title: str = "Ditch inventory") -> None:
    """Save a map of the reaches, each drawn in its verdict's colour, with a legend in words (the reaches and
    their length for each verdict). The format follows the suffix of ``path`` (PNG, PDF or SVG); the file is
    replaced in one step; matplotlib's Agg canvas, no display needed."""
    path = Path(path)
    if path.suffix.lower() not in PLOT_FORMATS:
        raise InventoryError(f"map {path}: the name must end in {', '.join(PLOT_FORMATS)}")
    fig = Figure(figsize=(10, 7), layout="constrained")
    FigureCanvasAgg(fig)
    ax = fig.subplots()
    coords = np.concatenate(lines.coords) if lines.coords else np.zeros((0, 2), dtype=np.float32)
    verdicts = np.concatenate(lines.verdicts) if lines.verdicts else np.zeros(0, dtype=np.int8)
    counts_of_points = np.concatenate([np.diff(s) for s in lines.starts]) if lines.starts else np.zeros(0, int)
    owner = np.repeat(np.arange(len(verdicts)), counts_of_points)     # each point's line
    unit = lines.units.label("length")
    for code, verdict in enumerate(mr.VERDICTS):
        if not counts.get(verdict):
            continue
        # One path a verdict, its lines separated by a blank point: light however many reaches there are.
        chosen = np.flatnonzero(verdicts[owner] == code)
        points = coords[chosen].astype(float)
        points = np.insert(points, np.flatnonzero(np.diff(owner[chosen])) + 1, np.nan, axis=0)
        label = f"{Verdict.from_token(verdict).words}: {counts[verdict]:,} reach{'es' if counts[verdict] != 1 else ''}"
        if lines.measured:
            label += f", {lines.lengths[verdict]:,.0f} {unit}"
        ax.plot(points[:, 0], points[:, 1], color=VERDICT_COLOURS[verdict], linewidth=1.6, label=label)
    if lines.layer.projected:
        ax.set_aspect("equal", adjustable="datalim")
    ax.ticklabel_format(useOffset=False, style="plain")
    x0, y0 = lines.origin if lines.origin is not None else (0.0, 0.0)
    axis_unit = f" ({lines.layer.unit_name})" if lines.layer.unit_name else ""
    ax.set_xlabel(f"easting - {x0:,.0f}{axis_unit}" if lines.layer.projected else f"x - {x0:g}{axis_unit}")
    ax.set_ylabel(f"northing - {y0:,.0f}{axis_unit}" if lines.layer.projected else f"y - {y0:g}{axis_unit}")
    ax.legend(loc="upper left", bbox_to_anchor=(1.0, 1.0), title="Verdict")
    ax.set_title(f"Reaches by verdict (layer {lines.layer.name!r}, {lines.layer.crs or 'no coordinate system'})")
    fig.suptitle(title)
    image = io.BytesIO()
    with rc_context({"agg.path.chunksize": 20_000}):   # Agg draws a path of a million segments in pieces
        fig.savefig(image, format=path.suffix[1:].lower())
    write_atomic(path, image.getvalue())
