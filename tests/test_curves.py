"""Specific-energy and rating curves against closed-form relations from outside the project."""

import numpy as np
import pytest
from fluids.open_flow import V_Manning

import hydraulics as hy
from hydraulics.curves import rating_curve, specific_energy


@pytest.mark.parametrize("section, ratio", [
    # Minimum specific energy E_min = 3/2 y_c in a rectangle (Chow, Open-Channel Hydraulics, 1959,
    # Sec. 3-2 and 4-2; not verified) and 5/4 y_c in a triangle (same source, critical flow in a
    # triangular channel, y_c = 4/5 E; not verified).
    (hy.Rectangle(bottom_width=2.0), 1.5),
    (hy.Triangle(side_slope=2.0), 1.25),
], ids=["rectangle", "triangle"])
def test_energy_minimum_at_critical_depth(section, ratio):
    q = 1.7
    yc = hy.critical_depth(section, q)
    y = np.linspace(0.3 * yc, 3 * yc, 200001)
    e = specific_energy(section, q, y)
    i = int(np.argmin(e))
    assert y[i] == pytest.approx(yc, rel=1e-4)
    assert e[i] == pytest.approx(ratio * yc, rel=1e-6)


def test_energy_of_one_depth_is_a_float():
    s = hy.Trapezoid(bottom_width=1.0, side_slope=2.0)
    e = specific_energy(s, 0.8, 0.5)
    v = 0.8 / s.area(0.5)
    assert isinstance(e, float)
    assert e == pytest.approx(0.5 + v * v / (2 * 9.80665), rel=1e-12)


def test_rating_curve_matches_fluids_manning_velocity():
    # fluids.open_flow.V_Manning(Rh, S, n) (Caleb Bell, fluids library): V = Rh^(2/3) S^(1/2) / n.
    s = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    depths = np.array([0.1, 0.3, 0.7])
    q = rating_curve(s, 0.004, 0.03, depths)
    for y, qi in zip(depths, q):
        assert qi == pytest.approx(V_Manning(s.hydraulic_radius(float(y)), 0.004, 0.03) * s.area(float(y)),
                                   rel=1e-12)


def test_curves_refuse_bad_input():
    s = hy.Rectangle(bottom_width=1.0)
    with pytest.raises(hy.InputError, match="flow"):
        specific_energy(s, 0.0, 0.5)
    with pytest.raises(hy.InputError, match="depth"):
        rating_curve(s, 0.01, 0.013, [0.2, -0.1])
