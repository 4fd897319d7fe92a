"""The one geometry of the drawn cross-section (app.section_geometry), which the window, the sheet and the DXF
drawing all draw.

The areas are checked against the section geometry of a trapezoid and a circle, A = (b + z y) y and
A = D^2/8 (theta - sin theta) (Chow, Open-Channel Hydraulics, 1959, Table 2-1), in the user's units.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

import hydraulics as hy
from app.section_geometry import SectionGeometry, design_geometry, section_geometry
from hydraulics.units import SI, US

FOOT = 0.3048


def shoelace(x, z) -> float:
    return 0.5 * abs(float(np.dot(x, np.roll(z, -1)) - np.dot(z, np.roll(x, -1))))


def test_trapezoid_in_feet():
    b, zs, yn, yc, total, t = 0.6, 3.0, 0.3, 0.2, 0.5, 0.1   # [m], invented
    geo = section_geometry(hy.Trapezoid(b, zs), yn, yc, total, US, t)
    ft = lambda v: v / FOOT  # noqa: E731
    assert geo.length_unit == "ft" and geo.normal_depth == pytest.approx(ft(yn), rel=1e-12)
    (px, pz), = geo.water
    assert shoelace(px, pz) == pytest.approx((ft(b) + zs * ft(yn)) * ft(yn), rel=1e-12)      # Chow Table 2-1
    assert geo.surface[1] - geo.surface[0] == pytest.approx(ft(b) + 2 * zs * ft(yn), rel=1e-12)
    assert geo.critical[1] - geo.critical[0] == pytest.approx(ft(b) + 2 * zs * ft(yc), rel=1e-12)
    assert geo.dimensions["top_width"] == pytest.approx(ft(b) + 2 * zs * ft(total), rel=1e-12)
    assert geo.dimensions["freeboard"] == pytest.approx(ft(total - yn), rel=1e-12)
    assert geo.dimensions["bottom_width"] == pytest.approx(ft(b), rel=1e-12)
    assert geo.thickness == pytest.approx(ft(t), rel=1e-12)
    # the outer face lies one thickness from each bank, and an open section's is carried to the ground
    xo, zo = geo.outer
    step = np.array([xo[-1], zo[-1]]) - np.array([geo.boundary[0][-1], geo.boundary[1][-1]])
    assert math.hypot(*step) == pytest.approx(ft(t), rel=1e-12)
    assert float(np.dot(step, [zs, 1.0])) == pytest.approx(0.0, abs=1e-12) and step[0] > 0   # square to the bank, out
    assert geo.outer_to_ground[1][0] == geo.outer_to_ground[1][-1] == pytest.approx(geo.top, rel=1e-12)
    assert geo.slope_points[2] == pytest.approx(geo.top / 2) and geo.side_slopes == (zs, zs)


def test_pipe_ring_from_the_crown_closed():
    d, yn = 0.75, 0.3
    geo = section_geometry(hy.Circle(d), yn, 0.25, 0.9, SI)
    x, z = geo.boundary
    assert (x[0], z[0]) == (x[-1], z[-1]) and z[0] == pytest.approx(d) and geo.top == pytest.approx(d)
    theta = 2 * math.acos(1 - 2 * yn / d)
    (px, pz), = geo.water
    assert shoelace(px, pz) == pytest.approx(d ** 2 / 8 * (theta - math.sin(theta)), rel=2e-3)   # 144-gon
    assert geo.top_edges == pytest.approx((-d / 2, d / 2), abs=1e-9) and geo.bottom_width is None


def _same(a, b) -> bool:
    """Two geometries hold the same points and values, exactly."""
    if isinstance(a, SectionGeometry):
        return all(_same(getattr(a, f.name), getattr(b, f.name)) for f in dataclasses.fields(a))
    if isinstance(a, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, (list, tuple)):
        return type(a) is type(b) and len(a) == len(b) and all(_same(u, v) for u, v in zip(a, b))
    if isinstance(a, np.ndarray):
        return isinstance(b, np.ndarray) and np.array_equal(a, b)
    return a == b


def _recorded(monkeypatch, module, name):
    """Record every geometry that ``module`` obtains through its ``name`` (section_geometry or design_geometry)."""
    seen, make = [], getattr(module, name)

    def record(*args, **kwargs):
        seen.append(make(*args, **kwargs))
        return seen[-1]
    monkeypatch.setattr(module, name, record)
    return seen


@pytest.mark.parametrize("name", ["Outfall swale", "Surveyed outfall channel", "Farm crossing pipe"])
@pytest.mark.parametrize("units", [US, SI], ids=["us", "si"])
def test_window_sheet_and_dxf_draw_the_same_points(monkeypatch, name, units):
    """The demo's riprap swale (a lining band to scale), survey and pipe, in a US and an SI project: the window's
    picture, the sheet's drawing and the DXF drawing are made from one geometry, equal point for point, and each
    draws its points."""
    pytest.importorskip("PySide6")
    from reportlab.graphics.shapes import Polygon, PolyLine

    from app import channel_display as display
    from app import project as pj
    from app.context import Context
    from app.drawings import make_drawings
    from app.drawings import section as dxf_section
    from app.evaluate import evaluate_channel
    from app.gui import plots
    from app.sheet import section_drawing as sheet_drawing
    from app.sheet.content import channel_sheet

    project = pj.Project.from_dict({**pj.load(pj.demo_path()).to_dict(), "units": units.key})
    ch = project.channel(name)
    context = Context.load(units=units.key)
    geo = design_geometry(evaluate_channel(ch, context.catalogue), units)

    window = _recorded(monkeypatch, plots, "section_geometry")
    ev = display.evaluate(ch, context)
    g = plots.section_drawing(ev, units, None if ev.lining is None else ev.lining.layer_thickness)
    sheet = _recorded(monkeypatch, sheet_drawing, "design_geometry")
    drawing, _ = sheet_drawing.section_drawing(channel_sheet(project, ch, context.catalogue), 500, 300)
    cad = _recorded(monkeypatch, dxf_section, "design_geometry")
    (dxf,) = make_drawings(project, channels=[name], catalogue=context.catalogue)
    assert len(window) == len(sheet) == len(cad) == 1
    for made in (window[0], sheet[0], cad[0]):
        assert _same(made, geo)

    # the window: its ground line is the boundary between the berms, its lining band the geometry's
    if not geo.closed:
        assert np.array_equal(g.ground[0][1:-1], geo.boundary[0]) and np.array_equal(g.ground[1][1:-1], geo.boundary[1])
    assert _same(g.lining, geo.lining_band)
    # the DXF: its outline and lining band are the geometry's points, in the drawing's units
    msp = dxf.document.modelspace()
    (outline,) = [e for e in msp.query("LWPOLYLINE") if e.dxf.layer == "DITCH-OUTLINE"]
    pts = np.array([p[:2] for p in outline.get_points()])
    assert np.allclose(pts, np.column_stack(geo.ditch), rtol=0, atol=1e-12)
    bands = [e for e in msp.query("LWPOLYLINE") if e.dxf.layer == "LINING"]
    assert len(bands) == (geo.lining_band is not None)
    for band in bands:
        assert np.allclose([p[:2] for p in band.get_points()], np.column_stack(geo.lining_band), rtol=0, atol=1e-12)
    # the sheet: its boundary (heavy line, or the lining band's polygon) is the geometry's at one scale
    shapes, todo = [], [drawing]
    while todo:
        node = todo.pop()
        todo.extend(getattr(node, "contents", []))
        shapes.append(node)
    if geo.lining_band is not None:
        want = np.column_stack(geo.lining_band)
        drawn = [s for s in shapes if isinstance(s, Polygon) and len(s.points) == 2 * len(want)]
    else:
        want = np.column_stack(geo.boundary)
        drawn = [s for s in shapes if isinstance(s, PolyLine) and len(s.points) == 2 * len(want)]
    assert len(drawn) == 1
    paper_pts = np.array(drawn[0].points).reshape(-1, 2)
    scale = (paper_pts[:, 0].max() - paper_pts[:, 0].min()) / (want[:, 0].max() - want[:, 0].min())
    assert np.allclose(paper_pts, want * scale + (paper_pts[0] - want[0] * scale), rtol=0, atol=1e-9)
