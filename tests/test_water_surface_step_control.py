"""The step control of the water surface (hydraulics.water_surface) against a fine-step reference.

The profile is the standard step method's; the step control decides how finely each stretch is cut. Its
accuracy is measured here on a run like the one of ``benchmarks/bench_run.py`` (the case the control was tuned
for): a trapezoidal ditch with a design point every 10 m, the flow rising at every point, grades from 0.2 % to
3 %, grass (good sod, the shipped catalogue) with its n at the energy slope of the profile (HEC-15's
n = Cn (gamma R S)^-0.4, Kilgore and Cotton, HEC-15, 3rd ed., 2005, Chapter 4, with S the energy slope as
HEC-22 (2009) Eq. 5-12 allows). The numbers are invented.

The reference is the same method with steps of at most 1 m and a tolerance a thousand times tighter than the
default (the steps' own error then lies far below the differences measured). The control before the error
estimate (each step compared with its two halves, halved again while they differ by more than the tolerance,
the whole step kept when its whole change of depth was within the tolerance) is written out below and put in the
module's place for one run, so that both are measured on the same case in the same test: the control of the
module must be at least as close to the reference, at the design points, in its largest and in its mean
relative error of depth. The subcritical pass's steps solved many at once on arrays (STEPS_ON_ARRAYS, the default)
must in turn be as close as the steps taken one at a time with the error estimate (the largest error within a
millionth of it: the two share their worst point), and closer in the mean; the steps one at a time, the halving and
the reference are all taken with that path off.

The error estimate itself is checked against the error it estimates: one step of an M1 curve against the same
step cut into a thousand pieces, within 5 % (the estimate is the leading term of the trapezoidal rule's error;
it comes within about 1 % on these steps).
"""

import math

import numpy as np
import pytest

import hydraulics as hy
import hydraulics.water_surface as wsm
from hydraulics.linings import load_catalogue
from hydraulics.linings.roughness import EnergySlopeN
from hydraulics.water_surface import water_surface

SECTION = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)


def benchmark_like_run(length=3000.0, spacing=10.0, seed=7):
    """Distance, bed, n per point and flow per point of an invented run: six grades drawn from 0.2 % to 3 %,
    flow from 0.05 m^3/s rising at every point to about 2 m^3/s."""
    rng = np.random.default_rng(seed)
    x = np.arange(0.0, length + spacing / 2, spacing)
    breaks = np.linspace(0.0, length, 7)
    grades = rng.uniform(0.002, 0.03, 6)
    bed = 100.0 - np.interp(x, breaks, np.r_[0.0, np.cumsum(grades * np.diff(breaks))])
    flow = 0.05 + np.cumsum(rng.uniform(0.0, 2.0 * 2.0 / x.size, x.size))
    grass = load_catalogue().get("grass_good_sod").roughness()
    n = [EnergySlopeN(grass, SECTION, float(q)) for q in flow]
    return x, bed, n, flow


def halving_advance(props, known, x0, z0, x1, z1, upstream, tol, new=None, from_props=None, hint=None):
    """The step control before the error estimate: the whole step against its two halves (``hint`` unused)."""
    length = abs(x1 - x0)
    full = new if new is not None else wsm._solve_step(props, z1, known, z0, length, upstream, from_props)
    if length == 0.0 or (full.status != wsm._OK and known.status != wsm._OK):
        return full
    if full.status == wsm._OK and known.status == wsm._OK and abs(full.y - known.y) <= tol * full.y:
        return full
    xm, zm = 0.5 * (x0 + x1), 0.5 * (z0 + z1)
    a = wsm._solve_step(props, zm, known, z0, 0.5 * length, upstream)
    if a.status != wsm._OK:
        return wsm._State(props.yc, a.status) if a.status == wsm._CRIT else wsm._State(math.nan, wsm._TOP)
    b = wsm._solve_step(props, z1, a, zm, 0.5 * length, upstream)
    if b.status != wsm._OK:
        return b if b.status == wsm._CRIT else wsm._State(math.nan, wsm._TOP)
    if (full.status == wsm._OK and abs(full.y - b.y) <= tol * b.y) or 0.5 * length < wsm.MIN_STEP:
        return b
    a = halving_advance(props, known, x0, z0, xm, zm, upstream, tol, a)
    if a.status != wsm._OK:
        return wsm._State(props.yc, a.status) if a.status == wsm._CRIT else wsm._State(math.nan, wsm._TOP)
    return halving_advance(props, a, xm, zm, x1, z1, upstream, tol)


def relative_errors(depth, reference):
    err = np.abs(depth - reference) / reference
    return float(err.max()), float(err.mean())


def test_the_step_control_is_as_close_to_a_fine_step_reference_as_halving(monkeypatch):
    x, bed, n, flow = benchmark_like_run()
    on_arrays = water_surface(x, bed, SECTION, n, flow).depth
    monkeypatch.setattr(wsm, "STEPS_ON_ARRAYS", False)
    reference = water_surface(x, bed, SECTION, n, flow, max_step=1.0, step_tolerance=1e-7).depth
    estimated = water_surface(x, bed, SECTION, n, flow).depth
    monkeypatch.setattr(wsm, "_advance", halving_advance)
    halved = water_surface(x, bed, SECTION, n, flow).depth
    assert np.all(np.isfinite(reference))
    worst, mean = relative_errors(estimated, reference)
    worst_before, mean_before = relative_errors(halved, reference)
    assert 1e-6 < worst_before < 1e-3   # the case does test the control: both have errors to compare
    assert worst <= worst_before
    assert mean <= mean_before
    # the steps solved many at once on arrays: as close as the steps taken one at a time
    worst_arrays, mean_arrays = relative_errors(on_arrays, reference)
    assert worst_arrays <= worst * (1 + 1e-6)
    assert mean_arrays <= mean


@pytest.mark.parametrize("length,above", [(20.0, 0.3), (50.0, 0.3), (50.0, 0.05), (200.0, 0.3)])
def test_the_error_estimate_follows_the_error_of_a_step(length, above):
    """One step upstream on an M1 curve (a mild grade of 0.05 %, 0.4 m^3/s, n 0.015) from a depth ``above`` [m]
    normal depth: the estimate against the difference between the step and the same step in 1000 pieces."""
    slope, q, n, pieces = 0.0005, 0.4, 0.015, 1000
    props = wsm._point_props(*wsm._inputs([0.0, length], [10.0 + length * slope, 10.0], SECTION, n, q))[0]
    known = wsm._state(props, props.yn + above, wsm._OK)
    step = wsm._solve_step(props, 10.0 + length * slope, known, 10.0, length, True)
    fine, piece = known, length / pieces
    for i in range(pieces):
        fine = wsm._solve_step(props, 10.0 + (i + 1) * piece * slope, fine, 10.0 + i * piece * slope, piece, True)
    error = abs(step.y - fine.y)
    assert error > 1e-7   # the step has an error to estimate
    assert wsm._step_error(props, known, step, length, True) == pytest.approx(error, rel=0.05)
