"""The rating curve (depth against flow by Manning's equation), as vector graphics.

matplotlib draws it and saves SVG with ``svg.fonttype = none`` so that the
text stays text; svglib turns the SVG into a reportlab Drawing, with the
sheet's one embedded font (see :mod:`app.sheet.fonts`).
"""

from __future__ import annotations

import io
import math

import numpy as np

import hydraulics as hy
from hydraulics.linings.roughness import SWITCH_NOTE, relation_switch_depth

from .fonts import SVG_FAMILY, register

POINTS = 60


def rating_table(section, slope, roughness, top_depth):
    """Depths [m] from near zero to ``top_depth`` and the normal flow and critical flow at each [m^3/s]."""
    depth = np.linspace(top_depth / POINTS, top_depth, POINTS)
    flow = np.array([hy.flow_at_depth(section, float(y), slope, roughness) for y in depth])
    geo = section.properties(depth)
    critical = np.sqrt(hy.G * geo.area ** 3 / np.maximum(geo.top_width, 1e-12))
    return depth, flow, critical


def rating_drawing(sheet, width: float, height: float):
    """A reportlab Drawing of the rating curve, ``width`` x ``height`` [pt]."""
    register()
    import matplotlib
    from matplotlib.figure import Figure  # no pyplot: leaves the window's backend alone
    from svglib.svglib import svg2rlg

    from .content import pretty_unit

    units = sheet.units
    design = sheet.design
    section, slope = design.section, design.channel.slope
    full = section.full_depth
    total = design.total_depth
    top = total if full is None else min(total, 0.999 * full)
    roughness = sheet.roughness
    depth, flow, critical = rating_table(section, slope, roughness, top)
    L = units.from_si("length", 1.0)
    Q = units.from_si("flow", 1.0)
    lu, qu = pretty_unit(units.label("length")), pretty_unit(units.label("flow"))
    yn = float(design.analysis.normal_depth)
    fmt = sheet.format  # the results' rounding (app.results.PANEL_FIELDS)

    rc = {"svg.fonttype": "none", "font.family": SVG_FAMILY, "font.size": 6.5, "axes.linewidth": 0.5,
          "xtick.major.width": 0.4, "ytick.major.width": 0.4, "lines.linewidth": 1.0, "svg.hashsalt": "ditchwright"}
    with matplotlib.rc_context(rc):
        fig = Figure(figsize=(width / 72, height / 72))
        # margins in points, so that the tick labels and the title keep clear at any height
        m_left, m_right, m_bottom, m_top = 34.0, 6.0, 23.0, 12.0
        ax = fig.add_axes((m_left / width, m_bottom / height, 1 - (m_left + m_right) / width,
                           1 - (m_bottom + m_top) / height))
        ax.plot(flow * Q, depth * L, color="#1f4e9c", label="normal depth (Manning)")
        ax.plot(critical * Q, depth * L, color="#b22222", linestyle="--", linewidth=0.8, label="critical depth")
        q_design = design.flow * Q
        ax.plot([q_design], [yn * L], marker="o", markersize=3.5, color="black", linestyle="none",
                label=f"design: Q {fmt.value(design.flow, 'flow')}, yn {fmt.value(yn, 'normal_depth')}")
        ax.axhline(total * L, color="0.35", linewidth=0.6, linestyle="-.",
                   label=f"total depth {fmt.value(total, 'total_depth')}")
        ax.axvline(q_design, color="0.6", linewidth=0.4, linestyle=":")
        switch = relation_switch_depth(roughness, section)
        if switch is not None and switch <= top:
            ax.axhline(switch * L, color="0.2", linewidth=0.5, linestyle=(0, (1, 2)), label=SWITCH_NOTE)
        # the x range follows the normal-flow curve; the critical curve may run off to the right
        ax.set_xlim(0, max(flow.max() * Q, q_design) * 1.08)
        ax.set_ylim(0, max(total, top) * L * 1.08)
        ax.set_xlabel(f"Flow Q ({qu})")
        ax.set_ylabel(f"Depth y ({lu})")
        ax.grid(True, linewidth=0.3, color="0.85")
        if isinstance(roughness, float):
            n_words = f"n = {fmt.value(roughness, 'manning_n')}"
        elif roughness is None:
            n_words = "composite n of the survey"
        else:
            n_words = "n varies with depth (lining)"
        ax.set_title(f"Rating curve, uniform flow: S = {slope:g}, {n_words}", fontsize=6.5)
        ax.legend(loc="best", fontsize=5.8, frameon=True, framealpha=0.9, edgecolor="0.7")
        buf = io.StringIO()
        fig.savefig(buf, format="svg")
    drawing = svg2rlg(io.BytesIO(buf.getvalue().encode("utf-8")))
    # svglib keeps the figure size in pt; scale to the exact box
    sx, sy = width / drawing.width, height / drawing.height
    if not (math.isclose(sx, 1, rel_tol=1e-3) and math.isclose(sy, 1, rel_tol=1e-3)):
        drawing.scale(sx, sy)
        drawing.width, drawing.height = width, height
    return drawing
