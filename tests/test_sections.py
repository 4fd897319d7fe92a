"""Section geometry against closed forms and independent numerical integration."""

import math

import numpy as np
import pytest
from scipy.integrate import quad

import hydraulics as hy


def test_trapezoid_closed_form():
    # Chow (1959), Table 2-1: A = (b + z y) y, P = b + 2 y sqrt(1 + z^2), T = b + 2 z y.
    s = hy.Trapezoid(bottom_width=2.0, side_slope=1.5)
    y = 0.8
    assert s.area(y) == pytest.approx((2 + 1.5 * y) * y, rel=1e-15)
    assert s.wetted_perimeter(y) == pytest.approx(2 + 2 * y * math.sqrt(1 + 1.5 ** 2), rel=1e-15)
    assert s.top_width(y) == pytest.approx(2 + 3 * y, rel=1e-15)
    assert s.hydraulic_depth(y) == pytest.approx(s.area(y) / s.top_width(y))


def test_unequal_side_slopes_average():
    s = hy.Trapezoid(bottom_width=1.0, left_slope=2.0, right_slope=4.0)
    y = 0.5
    assert s.area(y) == pytest.approx(1.0 * y + 0.5 * (2 + 4) * y * y)
    assert s.wetted_perimeter(y) == pytest.approx(1 + y * (math.sqrt(5) + math.sqrt(17)))


def test_triangle_and_rectangle_are_limits_of_trapezoid():
    y = np.array([0.1, 0.5, 2.0])
    np.testing.assert_allclose(hy.Triangle(side_slope=3).area(y), hy.Trapezoid(bottom_width=0, side_slope=3).area(y))
    np.testing.assert_allclose(hy.Rectangle(bottom_width=2).wetted_perimeter(y), 2 + 2 * y)


def test_circle_half_and_full():
    d = 1.2
    c = hy.Circle(diameter=d)
    assert c.area(d / 2) == pytest.approx(math.pi * d * d / 8, rel=1e-14)
    assert c.wetted_perimeter(d / 2) == pytest.approx(math.pi * d / 2, rel=1e-14)
    assert c.top_width(d / 2) == pytest.approx(d, rel=1e-14)
    assert c.area(d) == pytest.approx(math.pi * d * d / 4, rel=1e-14)
    assert c.hydraulic_radius(d) == pytest.approx(d / 4, rel=1e-14)


def test_parabola_exact_arc_length_matches_quadrature():
    p = hy.Parabola(top_width=3.0, at_depth=0.6)
    k = 0.6 / 1.5 ** 2
    for y in (0.05, 0.6, 2.0):
        a = math.sqrt(y / k)
        perim = quad(lambda x: math.sqrt(1 + (2 * k * x) ** 2), -a, a, epsabs=1e-13)[0]
        assert p.wetted_perimeter(y) == pytest.approx(perim, rel=1e-12)
        assert p.area(y) == pytest.approx(quad(lambda x: y - k * x * x, -a, a)[0], rel=1e-12)
    assert p.top_width(0.6) == pytest.approx(3.0)


def test_irregular_reproduces_a_trapezoid():
    # A surveyed trapezoid b = 2, z = 2, banks 1.5 m high.
    ir = hy.Irregular([0, 3, 5, 8], [1.5, 0, 0, 1.5], n=0.03)
    tr = hy.Trapezoid(bottom_width=2, side_slope=2)
    for y in (0.2, 0.9, 1.5):
        assert ir.area(y) == pytest.approx(tr.area(y), rel=1e-13)
        assert ir.wetted_perimeter(y) == pytest.approx(tr.wetted_perimeter(y), rel=1e-13)
        assert ir.top_width(y) == pytest.approx(tr.top_width(y), rel=1e-13)
    assert ir.full_depth == 1.5


def test_irregular_composite_n_horton_einstein():
    # Chow (1959) Eq. 6-17 by hand: bed (n = 0.015, 2 m) and two sides (n = 0.035).
    ir = hy.Irregular([0, 2, 4, 6], [1.0, 0, 0, 1.0], n=[0.035, 0.015, 0.035])
    y = 0.5
    side = math.hypot(1.0, 0.5)  # wet length of each side at half the bank height
    expected = ((2 * side * 0.035 ** 1.5 + 2 * 0.015 ** 1.5) / (2 * side + 2)) ** (2 / 3)
    assert ir.composite_n(y) == pytest.approx(expected, rel=1e-13)


def test_derivatives_match_finite_differences():
    for s in (hy.Trapezoid(bottom_width=1, left_slope=1, right_slope=3), hy.Parabola(top_width=2, at_depth=0.5),
              hy.Circle(diameter=1.0), hy.Irregular([0, 1, 2, 4], [1.0, 0.2, 0, 1.2], n=0.03)):
        y, h = 0.37, 1e-6
        g = s.properties(y)
        dp = (s.wetted_perimeter(y + h) - s.wetted_perimeter(y - h)) / (2 * h)
        dt = (s.top_width(y + h) - s.top_width(y - h)) / (2 * h)
        da = (s.area(y + h) - s.area(y - h)) / (2 * h)
        assert float(np.broadcast_to(g.dP_dy, ())) == pytest.approx(dp, rel=1e-6)
        assert float(np.broadcast_to(g.dT_dy, ())) == pytest.approx(dt, rel=1e-5, abs=1e-8)
        assert g.top_width == pytest.approx(da, rel=1e-7)  # dA/dy = T


@pytest.mark.parametrize("make, field", [
    (lambda: hy.Trapezoid(bottom_width=-1, side_slope=2), "bottom_width"),
    (lambda: hy.Trapezoid(bottom_width=1, side_slope=-2), "side_slope"),
    (lambda: hy.Trapezoid(bottom_width=0, side_slope=0), "bottom_width"),
    (lambda: hy.Trapezoid(bottom_width=1), "side_slope"),
    (lambda: hy.Trapezoid(bottom_width=1, left_slope=2), "right_slope"),
    (lambda: hy.Triangle(side_slope=0), "side_slope"),
    (lambda: hy.Rectangle(bottom_width=0), "bottom_width"),
    (lambda: hy.Rectangle(bottom_width=float("nan")), "bottom_width"),
    (lambda: hy.Parabola(top_width=2, at_depth=0), "at_depth"),
    (lambda: hy.Circle(diameter=-0.3), "diameter"),
    (lambda: hy.Circle(diameter="wide"), "diameter"),
    (lambda: hy.Irregular([0, 1], [1, 0], n=0.03), "stations"),
    (lambda: hy.Irregular([0, 2, 1], [1, 0, 1], n=0.03), "stations"),
    (lambda: hy.Irregular([0, 1, 2], [0, 0, 1], n=0.03), "elevations"),
    (lambda: hy.Irregular([0, 1, 2], [1, 0, 1], n=[0.03]*3), "n"),
])
def test_impossible_geometry_is_refused_naming_the_field(make, field):
    with pytest.raises(hy.InputError) as err:
        make()
    assert err.value.field == field


def test_depth_beyond_pipe_crown_refused():
    with pytest.raises(hy.InputError, match="full depth"):
        hy.Circle(diameter=1.0).area(1.2)


def test_depth_beyond_the_crown_of_pipe_arrays_is_refused_naming_the_depth():
    with pytest.raises(hy.InputError, match="full depth 0.7 m, got 1 m"):
        hy.Circle(diameter=np.array([0.6, 0.7])).area(1.0)


def test_round_trip_to_dict():
    for s in (hy.Trapezoid(bottom_width=1, left_slope=2, right_slope=3), hy.Triangle(side_slope=4),
              hy.Rectangle(bottom_width=2), hy.Parabola(top_width=3, at_depth=0.5), hy.Circle(diameter=0.6),
              hy.Irregular([0, 1, 2], [1, 0, 1], n=0.03)):
        again = hy.section_from_dict(s.to_dict())
        assert type(again) is type(s) and again.area(0.3) == pytest.approx(s.area(0.3))


def test_a_section_of_some_elements_has_their_geometry():
    """Section.take: the elements taken keep their own dimensions (compared with one section per element)."""
    b, z1, z2 = np.array([0.5, 1.0, 2.0, 0.0]), np.array([1.0, 2.0, 3.0, 1.5]), np.array([2.0, 2.0, 0.5, 1.5])
    section = hy.Trapezoid(bottom_width=b, left_slope=z1, right_slope=z2)
    part = section.take(np.array([3, 1]))
    y = np.array([0.4, 0.7])
    got = part.properties(y)
    for k, i in enumerate([3, 1]):
        one = hy.Trapezoid(bottom_width=b[i], left_slope=z1[i], right_slope=z2[i]).properties(y[k])
        assert got.area[k] == pytest.approx(one.area, rel=1e-15)
        assert got.wetted_perimeter[k] == pytest.approx(one.wetted_perimeter, rel=1e-15)
    pipes = hy.Circle(diameter=np.array([0.6, 0.9, 1.2])).take(slice(1, None))
    np.testing.assert_array_equal(pipes.diameter, [0.9, 1.2])
    assert hy.Trapezoid(bottom_width=1.0, side_slope=2.0).take([0]).bottom_width == 1.0  # numbers stay numbers


def test_a_survey_whose_lowest_point_is_the_foot_of_a_slot_with_no_width_is_refused():
    """Points one above another at one station, down to the lowest point and up again (an invented survey): no
    water stands in such a slot and no depth below its top has any area, so Manning's equation and critical depth
    have nothing to work on (a ditch run ended in a math domain error; found by a random search over LandXML
    files). A slot with vertical walls and a width is a section like any other."""
    with pytest.raises(hy.InputError, match=r"lowest point \(point 3, at 0 m\) lies at the foot of a slot"):
        hy.Irregular([-5, 0, 0, 0, 5], [1070, 1069, 1066, 1069, 1070], 0.03)
    walls = hy.Irregular([0, 0, 0.4, 0.4], [1, 0, 0, 1], 0.03)
    assert walls.full_depth == 1.0 and float(walls.properties(0.5).area) == pytest.approx(0.2, rel=1e-12)
