"""Shallow flow in pipes and nearly vertical trapezoid walls: the geometry keeps its digits.

Found by the inventory check: a 4-ft pipe carrying 3 % of its capacity made the
normal-depth iteration step to a tiny depth, where theta - sin(theta) cancelled
to zero and its logarithm failed.
"""

import math

import numpy as np
import pytest
from scipy.integrate import quad

import hydraulics as hy


def segment_area_by_quadrature(diameter, depth):
    """Flow area of a part-full circle as the integral of the chord width over depth (scipy quad).

    The chord at height z above the invert is 2 sqrt(r^2 - (r - z)^2) = 2 sqrt(z (D - z)), written
    in the second form so that it keeps its digits near the invert.
    """
    width = lambda z: 2 * math.sqrt(max(0.0, z * (diameter - z)))  # noqa: E731
    return quad(width, 0.0, depth, epsabs=0.0, epsrel=1e-13, limit=200)[0]


@pytest.mark.parametrize("fraction", [1e-8, 1e-6, 1e-4, 1e-3, 0.01, 0.1, 0.3, 0.5, 0.813, 0.938, 1.0])
def test_circle_area_matches_quadrature_at_every_depth(fraction):
    d = 1.2192
    y = fraction * d
    expected = segment_area_by_quadrature(d, y)
    assert hy.Circle(diameter=d).area(y) == pytest.approx(expected, rel=1e-9)
    vec = hy.Circle(diameter=np.array([d, d])).area(np.array([y, y]))
    np.testing.assert_allclose(vec, expected, rtol=1e-9)


def test_shallow_pipe_flow_solves_scalar_and_vector():
    # 4-ft pipe, 1.61 ft^3/s on 0.131 %, n = 0.013 (an invented inventory row that used to fail).
    c = hy.Circle(diameter=1.2192)
    q, s, n = 0.04559012301312001, 0.00131, 0.013
    y = hy.normal_depth(c, q, s, n)
    assert 0 < y < 0.5 * 1.2192
    assert hy.flow_at_depth(c, y, s, n) == pytest.approx(q, rel=1e-10)
    yv = hy.normal_depth(hy.Circle(diameter=np.full(3, 1.2192)), np.full(3, q), s, n)
    np.testing.assert_allclose(yv, y, rtol=1e-10)


def test_trapezoid_with_the_smallest_positive_side_slope():
    t = hy.Trapezoid(bottom_width=1.0, left_slope=0.0, right_slope=5e-324)
    y = hy.normal_depth(t, 1.0, 0.125, 0.0625)
    r = hy.Rectangle(bottom_width=1.0)
    assert y == pytest.approx(hy.normal_depth(r, 1.0, 0.125, 0.0625), rel=1e-12)


def test_circle_geometry_keeps_its_digits_from_invert_to_crown():
    # Every depth, as one array and one at a time, against independent forms: the top width is the chord
    # 2 sqrt(y (D - y)) and the area the integral of the chord width over depth (scipy quad); the wetted
    # perimeter D theta / 2 with theta = 2 arccos(1 - 2y/D) (Chow 1959, Table 2-1) away from the crown.
    d = 0.9
    eta = np.concatenate([np.geomspace(1e-9, 0.5, 40), 1 - np.geomspace(0.5, 1e-9, 40)[1:], [1.0]])
    y = eta * d
    many = hy.Circle(diameter=np.full(eta.size, d))
    area, perim, top = many.area(y), many.wetted_perimeter(y), many.top_width(y)
    one = hy.Circle(diameter=d)
    for i, yi in enumerate(y):
        chord = 2 * math.sqrt(yi * (d - yi))
        assert top[i] == pytest.approx(chord, rel=1e-14, abs=1e-300)
        assert one.top_width(yi) == pytest.approx(chord, rel=1e-14, abs=1e-300)
        expected = segment_area_by_quadrature(d, yi)
        assert area[i] == pytest.approx(expected, rel=1e-9)
        assert one.area(yi) == pytest.approx(area[i], rel=1e-12)  # numpy's and libm's arcsin may differ by an ulp
        assert one.wetted_perimeter(yi) == pytest.approx(perim[i], rel=1e-15)
        if eta[i] < 0.99:
            assert perim[i] == pytest.approx(d * math.acos(1 - 2 * eta[i]), rel=1e-12)


@pytest.mark.parametrize("fraction", [1e-7, 1e-4, 0.02, 0.3, 0.7, 0.93])
def test_pipe_depths_converge_in_a_few_steps_from_the_table_start(fraction):
    # The start comes from a table of the dimensionless section factors; Newton then needs at most four
    # evaluations to the tolerance (it needed about nine from the old half-full estimate).
    d, s, n = 1.05, 0.004, 0.013
    c = hy.Circle(diameter=d)
    q = hy.flow_at_depth(c, fraction * d, s, n)
    sol = hy.solvers.solve_normal_depth(c, q, s, n)
    assert sol.depth == pytest.approx(fraction * d, rel=1e-9)
    assert sol.iterations <= 4
    crit = hy.solvers.solve_critical_depth(c, q)
    assert crit.iterations <= 4
    vec = hy.solvers.solve_critical_depth(hy.Circle(diameter=np.full(2, d)), np.full(2, q))
    np.testing.assert_allclose(vec.depth, crit.depth, rtol=1e-12)
