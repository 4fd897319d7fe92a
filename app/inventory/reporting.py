"""What an inventory's results come to: the rows in trouble, a summary for the terminal, the summary plot.

The summary counts the reaches per verdict and per warning, gives the
extremes of the shear ratio and of the bed shear, and adds the notes about
groups of reaches (:attr:`hydraulics.many_reaches.BatchResult.messages`) and about
the file itself (repeated or missing ids, blank lines, cells written with an
apostrophe). The plot shows the same counts and the spread of the shear ratio.
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from hydraulics import many_reaches as mr
from hydraulics import provenance
from hydraulics.linings import hec15

from ..files import write_atomic
from ..verdicts import Verdict
from .reading import Inventory, InventoryError
from .writing import written_rows

#: Notes about groups of reaches shown in the summary (all are in BatchResult.messages).
MAX_MESSAGES = 12


def problem_rows(inventory: Inventory, result: mr.BatchResult):
    """[(line, id, verdict, reason)] for every reach that is invalid or has no solution, in file order."""
    bad = [i for i, v in enumerate(result.verdict.tolist()) if v in ("invalid", "no-solution")]
    return [(int(inventory.lines[i]), inventory.id_at(i), result.verdict[i], result.reason[i]) for i in bad]


def summary(inventory: Inventory, result: mr.BatchResult, seconds: float | None = None) -> str:
    """A few lines for the terminal: counts per verdict, warnings, extremes."""
    counts = result.counts()
    size = len(inventory)
    units = inventory.units
    out = [f"{size:,} reach{'es' if size != 1 else ''} in {inventory.source} ({units.name} units)"
           + (f", checked in {seconds:.2f} s" if seconds is not None else "")]
    width = max(len(v) for v in mr.VERDICTS)
    for verdict in mr.VERDICTS:
        out.append(f"  {verdict:<{width}}  {counts[verdict]:>9,}")
    flagged = [f"{int(result.flags[k].sum()):,} {label}" for k, label in mr.WARNINGS.items() if result.flags[k].any()]
    if flagged:
        out.append("  warnings: " + ", ".join(flagged) + " (see the reason column)")
    ratio = result.shear_ratio
    checked = ~np.isnan(ratio)
    if checked.any():
        held = checked & np.isfinite(ratio)
        text = (f"  shear ratio (design / permissible where highest, 1 / safety factor) of "
                f"{int(checked.sum()):,} reaches:")
        if held.any():
            worst = int(np.argmax(np.where(held, ratio, -np.inf)))
            text += (f" median {np.median(ratio[checked]):.2f}, above 1 on {int((ratio[checked] > 1).sum()):,}, "
                     f"largest finite {ratio[worst]:.2f} (line {inventory.lines[worst]}, "
                     f"id {inventory.id_at(worst)!r})")
        if (checked & ~held).any():
            text += f"; {int((checked & ~held).sum()):,} with stone that cannot rest on its side slopes"
        out.append(text)
    else:
        out.append("  no reach has a permissible shear to compare its design shear with")
    shear = result.bed_shear
    if np.isfinite(shear).any():
        worst = int(np.nanargmax(shear))
        out.append(f"  largest bed shear {units.from_si('shear', float(shear[worst])):.3g} {units.label('shear')} "
                   f"(line {inventory.lines[worst]}, id {inventory.id_at(worst)!r})")
    for message in result.messages[:MAX_MESSAGES]:
        out.append(f"  note: {message}")
    if len(result.messages) > MAX_MESSAGES:
        out.append(f"  note: ... and {len(result.messages) - MAX_MESSAGES} more notes of this kind")
    if np.isfinite(result.normal_depth).any():
        fb = units.from_si("length", hec15.MIN_FREEBOARD)
        out.append(f"  freeboard: not checked (an inventory has no ditch depth); each open ditch needs at least "
                   f"its normal depth plus {fb:.2g} {units.label('length')} ({provenance.cite('freeboard')}; local "
                   "codes govern), and where the flow is supercritical at least twice its normal depth "
                   f"(waves, {provenance.cite('supercritical_waves')})")
    out.append("  results assist design: a licensed engineer checks them against local codes")
    duplicated = inventory.duplicate_ids()
    if duplicated:
        out.append(f"  note: {len(duplicated):,} id{'s' if len(duplicated) > 1 else ''} appear more than once "
                   f"(first: {duplicated[0]!r}); every row is still checked")
    blank_ids = inventory.blank_id_count()
    if blank_ids:
        out.append(f"  note: {blank_ids:,} row{'s have' if blank_ids > 1 else ' has'} no id; "
                   "they are still checked and named by line number")
    if inventory.blank_lines:
        out.append(f"  note: {len(inventory.blank_lines):,} blank line{'s' if len(inventory.blank_lines) > 1 else ''} "
                   f"skipped (line {', '.join(map(str, inventory.blank_lines[:5]))}"
                   f"{', ...' if len(inventory.blank_lines) > 5 else ''})")
    guarded = written_rows(inventory)[2]
    if guarded:
        out.append(f"  note: {guarded:,} text cell{'s' if guarded > 1 else ''} starting with =, +, -, @, a tab or a "
                   f"carriage return {'were' if guarded > 1 else 'was'} written to the results with a leading "
                   "apostrophe (') so that a spreadsheet shows the text instead of running it as a formula; "
                   "numbers such as -1.5 are written as they are")
    return "\n".join(out)



PLOT_FORMATS = (".png", ".pdf", ".svg")


def plot_summary(result: mr.BatchResult, path, title: str = "Ditch inventory") -> None:
    """Save a two-panel summary figure: reaches per verdict, and the distribution of shear ratio.

    The format follows the suffix of ``path`` (PNG, PDF or SVG); the file
    is replaced in one step. Uses matplotlib's Agg canvas, so no display is
    needed.
    """
    path = Path(path)
    if path.suffix.lower() not in PLOT_FORMATS:
        raise InventoryError(f"plot {path}: the name must end in {', '.join(PLOT_FORMATS)}")
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(10, 4.2), layout="constrained")
    FigureCanvasAgg(fig)
    ax1, ax2 = fig.subplots(1, 2, width_ratios=(1.1, 1))
    counts = result.counts()
    colours = {"stable": "#3a7d44", "unstable": "#c0392b", "non-erodible": "#5d6d7e", "hydraulics-only": "#95a5a6",
               "not-checked": "#b7950b",
               "no-solution": "#8e44ad", "invalid": "#34495e"}
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
