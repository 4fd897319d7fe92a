"""The water surface's fast path against a straightforward reference evaluation of the same profile.

The fast path (hydraulics.water_surface with n given as a lining model at a fixed slope,
hydraulics.linings.roughness.FixedSlopeN, as runs give it) takes a grass lining's n in closed form, n = k R^e,
with its derivative in Newton's step, solves critical and normal depth of many stretches in one array call, and
starts each step's Newton iteration from the known state. Both take their steps one at a time here
(STEPS_ON_ARRAYS off), so that they take the same steps. The reference gives the same n as plain functions of the
depth (``lambda y: model.manning_n(section, y, slope)``, a constant as a function too): n evaluated by the model
at every trial depth, and every normal and critical depth solved one at a time. Both are the standard step method
with the same step control, so they must give the same profile up to the solver's own tolerances: each step's
energy balance is met to HEAD_TOLERANCE (1e-10 m of head) by both, from different first trials. The test allows
AGREEMENT = 1e-6 of depth at every design point and computation node, a hundredth of the step tolerance (1e-4, the
relative error of depth the step control works to); the two differ by about 3e-9 on these cases. The grass relation is
HEC-15's n = Cn (gamma R S)^-0.4 (Kilgore and Cotton, HEC-15, 3rd ed., 2005, Chapter 4), compared here with the
model's own evaluation.

Grass is also taken at the energy slope of the profile (hydraulics.linings.roughness.EnergySlopeN, n in closed
form), against the reference's fixed point of the same relation solved at every trial depth.

The cases are dense (a design point every 5 m, the flow rising at every point, so that every stretch ends in a
change of flow) and take grass, stone (riprap D50 0.15 m) and concrete from the shipped catalogue through an M1
curve (a high water level at the outfall of a mild grade), an M2 curve (a free overfall at the end of a mild
grade) and an S2 curve (a mild grade breaking to a steep one of 10 %, where the flow passes through critical depth). The
numbers are invented.
"""

import math

import numpy as np
import pytest

import hydraulics as hy
from hydraulics.linings import load_catalogue
from hydraulics.linings.roughness import EnergySlopeN, FixedSlopeN, VegetationRoughness
import hydraulics.water_surface as wsm
from hydraulics.water_surface import water_surface

STEP_TOLERANCE = 1e-4
AGREEMENT = 1e-6
SECTION = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
SPACING = 5.0


def layout(case):
    """Distance, bed and expected profile types of an invented run for ``case``."""
    if case == "S2":   # 300 m at 0.2 % then 200 m at 10 %
        x = np.arange(0.0, 500.0 + SPACING / 2, SPACING)
        bed = np.where(x <= 300.0, 20.0 - 0.002 * x, 20.0 - 0.6 - 0.10 * (x - 300.0))
    else:              # 500 m at 0.3 %
        x = np.arange(0.0, 500.0 + SPACING / 2, SPACING)
        bed = 20.0 - 0.003 * x
    return x, bed


def n_at_energy_slope(model, section, y, q):
    """Grass n at depth ``y`` with the boundary shear at the energy slope of ``q`` itself, straightforwardly: the
    fixed point n = Cn (gamma R S_f(n))^-0.4 with S_f = (Q n / (A R^(2/3)))^2, iterated from n = 0.05 as the
    geometric mean of n and the relation's n at S_f(n) (which contracts ln n by 0.1 a step) until n settles."""
    area, radius = section.area(y), section.area(y) / section.wetted_perimeter(y)
    n = 0.05
    for _ in range(200):
        sf = (q * n / (area * radius ** (2 / 3))) ** 2
        n, last = math.sqrt(n * float(model.manning_n(section, y, sf))), n
        if abs(n - last) <= 1e-15 * n:
            return n
    raise AssertionError("the fixed point did not settle")


def roughness(lining, slopes, flows, plain):
    """Per point: the fast path's n (FixedSlopeN, EnergySlopeN, a number) or the reference's plain function of the
    depth."""
    cat = load_catalogue()
    model = {"grass": cat.get("grass_good_sod").roughness(), "grass at the energy slope":
             cat.get("grass_good_sod").roughness(), "stone": cat.get("riprap").roughness(0.15),
             "concrete": cat.get("concrete").roughness()}[lining]
    out, made = [], {}
    for s, q in zip(slopes, flows):
        s = float(q) if lining == "grass at the energy slope" else float(s)
        if s not in made:
            if isinstance(model, float):
                made[s] = (lambda y, v=model: v) if plain else model
            elif lining == "grass at the energy slope":
                made[s] = (lambda y, m=model, q=s: n_at_energy_slope(m, SECTION, y, q)) if plain else \
                    EnergySlopeN(model, SECTION, s)
            elif plain:
                made[s] = lambda y, m=model, sl=s: float(m.manning_n(SECTION, y, sl))
            else:
                made[s] = FixedSlopeN(model, SECTION, s)
        out.append(made[s])
    return out


def profile(case, lining, plain):
    x, bed = layout(case)
    grade = np.append((bed[:-1] - bed[1:]) / np.diff(x), (bed[-2] - bed[-1]) / (x[-1] - x[-2]))
    flow = np.linspace(0.3, 0.9, x.size)   # inflow at every point
    n = roughness(lining, grade, flow, plain)
    kwargs = {"M1": {"outfall_level": bed[-1] + 1.4}, "M2": {"outfall": "critical"}, "S2": {}}[case]
    return water_surface(x, bed, SECTION, n, flow, step_tolerance=STEP_TOLERANCE, **kwargs)


@pytest.mark.parametrize("lining", ["grass", "grass at the energy slope", "stone", "concrete"])
@pytest.mark.parametrize("case", ["M1", "M2", "S2"])
def test_the_fast_path_gives_the_reference_profile(monkeypatch, case, lining):
    # steps one at a time in both, so that both take the same steps (the steps solved many at once on arrays cut
    # them otherwise: tests/test_water_surface_arrays.py holds that path to this one)
    monkeypatch.setattr(wsm, "STEPS_ON_ARRAYS", False)
    fast, ref = profile(case, lining, plain=False), profile(case, lining, plain=True)
    assert case in fast.profile_type   # the case makes the curve it is named for
    assert fast.profile_type == ref.profile_type
    np.testing.assert_allclose(fast.depth, ref.depth, rtol=AGREEMENT, atol=0)
    np.testing.assert_allclose(fast.detail_depth, ref.detail_depth, rtol=AGREEMENT, atol=0)
    np.testing.assert_allclose(fast.normal_depth, ref.normal_depth, rtol=1e-9)
    np.testing.assert_allclose(fast.critical_depth, ref.critical_depth, rtol=1e-9)
    assert [j.as_dict() for j in fast.jumps] == pytest.approx([j.as_dict() for j in ref.jumps], rel=AGREEMENT)


def test_grass_n_in_closed_form_is_the_models_n():
    """n = k R^e at a fixed slope against HEC-15's n = Cn (gamma R S)^-0.4 as the model evaluates it, and
    n = k R^e (A R^(2/3))^f at the energy slope against the fixed point of the same relation."""
    grass = load_catalogue().get("grass_good_sod").roughness()
    assert isinstance(grass, VegetationRoughness)
    depths = np.geomspace(0.02, 3.0, 200)
    radius = SECTION.area(depths) / SECTION.wetted_perimeter(depths)
    for slope in (0.0005, 0.01, 0.08):
        k, e, f = FixedSlopeN(grass, SECTION, slope).closed_form
        assert f == 0.0
        np.testing.assert_allclose(k * radius ** e, grass.manning_n(SECTION, depths, slope), rtol=1e-13)
    for q in (0.05, 0.8, 6.0):
        n = EnergySlopeN(grass, SECTION, q)
        reference = [n_at_energy_slope(grass, SECTION, y, q) for y in depths]
        np.testing.assert_allclose([n(y) for y in depths], reference, rtol=1e-12)
        k, e, f = n.closed_form
        np.testing.assert_allclose(k * radius ** e * (SECTION.area(depths) * radius ** (2 / 3)) ** f, reference,
                                   rtol=1e-12)


def test_grass_takes_the_fast_path_and_a_plain_function_does_not():
    """The closed form is used only for the section it was made for: a test of the fast path must run it."""
    from hydraulics.water_surface import _inputs, _point_props

    x, bed = layout("M2")
    grass = load_catalogue().get("grass_good_sod").roughness()
    for n, closed in ((FixedSlopeN(grass, SECTION, 0.003), True),
                      (FixedSlopeN(grass, hy.Trapezoid(bottom_width=0.6, side_slope=3.0), 0.003), False),
                      (lambda y: float(grass.manning_n(SECTION, y, 0.003)), False)):
        props = _point_props(*_inputs(x, bed, SECTION, n, 0.5))
        assert (props[0].npow is not None) == closed


def test_grass_at_the_energy_slope_must_meet_its_points_flow():
    from hydraulics.errors import InputError

    x, bed = layout("M2")
    grass = load_catalogue().get("grass_good_sod").roughness()
    with pytest.raises(InputError, match=r"n\[0\].*made for a flow of 0\.4"):
        water_surface(x, bed, SECTION, EnergySlopeN(grass, SECTION, 0.4), 0.5)
