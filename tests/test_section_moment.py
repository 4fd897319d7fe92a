"""The first moment of the flow area about the water surface (A y_bar), checked against its definition.

A y_bar is the integral of (y - eta) T(eta) d eta from the invert to the depth y: the area of each strip
T d eta times its depth below the surface. The test integrates that definition numerically (scipy's quad) from
each section's own top width, so the closed forms of hydraulics.sections are checked against an independent
computation. It is the pressure term of the specific force used for hydraulic jumps (hydraulics.water_surface).
"""


import numpy as np
import pytest
from scipy.integrate import quad

import hydraulics as hy

SECTIONS = [
    ("trapezoid", hy.Trapezoid(bottom_width=0.6, left_slope=3.0, right_slope=2.0), [0.01, 0.4, 1.7]),
    ("rectangle", hy.Rectangle(bottom_width=2.0), [0.05, 1.0]),
    ("triangle", hy.Triangle(side_slope=4.0), [0.02, 0.5]),
    ("parabola", hy.Parabola(top_width=3.0, at_depth=0.6), [0.03, 0.6, 1.1]),
    ("circle", hy.Circle(diameter=0.9), [0.001, 0.2, 0.45, 0.8, 0.9]),
    ("surveyed", hy.Irregular(stations=[0, 1.0, 1.5, 2.5, 2.6, 4.0], elevations=[2.0, 1.1, 0.2, 0.0, 0.9, 1.6],
                              n=0.03), [0.1, 0.2, 0.85, 1.5]),
]


def by_definition(section, y):
    value, _ = quad(lambda eta: (y - eta) * section.top_width(max(eta, 1e-12)), 0.0, y,
                    epsabs=0, epsrel=1e-12, limit=200,
                    points=[p for p in getattr(section, "_lo", []) if 0 < p < y] or None)
    return value


@pytest.mark.parametrize("name,section,depths", SECTIONS, ids=[s[0] for s in SECTIONS])
def test_first_moment_is_the_integral_of_strip_area_times_depth_below_the_surface(name, section, depths):
    for y in depths:
        expected = by_definition(section, y)
        assert section.first_moment(y) == pytest.approx(expected, rel=1e-9), (name, y)
        assert section.centroid_depth(y) == pytest.approx(expected / section.area(y), rel=1e-9)


def test_centroid_of_simple_shapes_and_arrays():
    # Rectangle: centroid half-way down; triangle: a third of the depth down; both by their geometry.
    assert hy.Rectangle(bottom_width=3.0).centroid_depth(0.8) == pytest.approx(0.4, rel=1e-14)
    assert hy.Triangle(side_slope=2.0).centroid_depth(0.9) == pytest.approx(0.3, rel=1e-14)
    # A full pipe: the centroid is at the centre, half a diameter below the crown.
    assert hy.Circle(diameter=1.2).centroid_depth(1.2) == pytest.approx(0.6, rel=1e-12)
    ys = np.array([0.1, 0.5, 1.0])
    trap = hy.Trapezoid(bottom_width=1.0, side_slope=2.0)
    assert np.allclose(trap.first_moment(ys), [trap.first_moment(float(v)) for v in ys], rtol=1e-15)
    survey = SECTIONS[-1][1]
    assert np.allclose(survey.first_moment(ys), [survey.first_moment(float(v)) for v in ys], rtol=1e-15)


def test_depth_is_checked():
    with pytest.raises(hy.InputError, match="depth"):
        hy.Trapezoid(bottom_width=1.0, side_slope=2.0).first_moment(-0.1)
    with pytest.raises(hy.InputError, match="full depth"):
        hy.Circle(diameter=0.5).centroid_depth(0.6)
