"""The one geometry of the drawn cross-section (app.section_geometry), which the window and the sheet both draw.

The areas are checked against the section geometry of a trapezoid and a circle, A = (b + z y) y and
A = D^2/8 (theta - sin theta) (Chow, Open-Channel Hydraulics, 1959, Table 2-1), in the user's units.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import hydraulics as hy
from app.section_geometry import section_geometry
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


def test_window_draws_the_one_geometry():
    pytest.importorskip("PySide6")
    from app import channel_display as display
    from app import project as pj
    from app.context import Context
    from app.gui.plots import section_drawing

    ch = pj.load(pj.demo_path()).channel("Outfall swale")
    ev = display.evaluate(ch, Context.load(units="us"))
    g = section_drawing(ev, US, ev.lining.layer_thickness)
    geo = section_geometry(ev.section, ev.result.normal_depth, ev.result.critical_depth, ev.total_depth, US,
                           ev.lining.layer_thickness)
    assert np.array_equal(g.ground[0][1:-1], geo.boundary[0]) and g.top == geo.total_depth
    assert np.array_equal(g.lining[0], np.concatenate([geo.boundary[0], geo.outer[0][::-1]]))
