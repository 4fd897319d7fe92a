"""Speed of a long ditch run, as a ratio against a redraw of its profile measured in the same run.

    python benchmarks/bench_run.py [--rounds 7] [--spacing 10] [--profile]

The run is invented: 10 km of trapezoidal ditch (bottom 1.0 m, side slopes
3:1, 2.0 m deep) on 20 grades of 0.2 to 3 %, 50 sub-areas spread along it
(0.5 to 3 ha each, C 0.2 to 0.8, own times of concentration 5 to 20 min), an
invented power-law IDF table, design points every 10 m (1001 points) and three
candidate linings: good sod, riprap of D50 0.2 m and concrete.

(1) ``hydraulics.ditch_run.solve_run`` on that run: the travel-time iteration
    with its flows, every candidate screened at every point, the cheapest
    schedule and its quantities (what an edit of the run recomputes).
(2) a bare ``canvas.draw()`` (Agg backend) of the run's profile figure,
    1366 x 500 px with fixed margins: invert, ditch top as built, water plus
    freeboard and water surface at the scheduled lining's normal depth, and the
    lining bands (one line per candidate, blank where it is not scheduled;
    together one line's worth of points), each of 1001 points, with axis
    labels and a legend. Nothing changes between draws.

(3) ``hydraulics.run_water_surface.run_water_surface`` on the solved run: the
    water surface by the standard step method at the 1001 design points (steps
    of at most 10 m), its controls and jumps, and the fit of the ditch.

Ratios = (1) / (2), goal <= 1 (a run recomputes within one redraw of its
profile, so editing it stays live), and (3) / (2), goal <= 0.5 (the water
surface adds at most half a redraw). The two are timed in interleaved rounds
(each round: the solve, then the draws, each the mean of enough calls to take
a fifth of a second or more), so that both meet the machine in the same state;
the median ratio is printed with the range over the rounds. Absolute times
depend on the machine and are indicative only. ``--profile`` prints the
cProfile of one solve and of one water surface instead.
"""

from __future__ import annotations

import argparse
import cProfile
import os
import pstats
import statistics
import sys
import time

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))  # this checkout's code

import matplotlib  # noqa: E402

matplotlib.use("Agg")
from matplotlib.backends.backend_agg import FigureCanvasAgg  # noqa: E402
from matplotlib.figure import Figure  # noqa: E402

import hydraulics as hy  # noqa: E402
from hydraulics.ditch_run import Candidate, DitchRun, SectionRange, solve_run  # noqa: E402
from hydraulics.linings import load_catalogue  # noqa: E402
from hydraulics.rainfall import IdfTable  # noqa: E402
from hydraulics.run_inflow import SubArea  # noqa: E402
from hydraulics.run_layout import StationRange  # noqa: E402
from hydraulics.run_water_surface import run_water_surface  # noqa: E402


def invented_run(length=10_000.0, spacing=10.0, areas=50, seed=1) -> DitchRun:
    """The invented run described in the module's text."""
    cat = load_catalogue()
    durations = np.array([300.0, 600.0, 1800.0, 3600.0, 7200.0, 14400.0])
    idf = IdfTable(durations, [10.0], (2.0e-4 * durations ** -0.6)[:, None])      # invented power law
    rng = np.random.default_rng(seed)
    stations = np.linspace(0.0, length, 21)
    z = 100.0 - np.cumsum(np.r_[0.0, rng.uniform(0.002, 0.03, 20) * length / 20])
    step = length / areas
    subs = tuple(SubArea(f"a{k}", rng.uniform(0.5, 3.0) * 1e4, rng.uniform(0.2, 0.8), rng.uniform(300, 1200),
                         StationRange(k * step, (k + 1) * step)) for k in range(areas))
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    candidates = (Candidate(cat.get("grass_good_sod"), None, 7.5), Candidate(cat.get("riprap"), 0.2, 95.0),
                  Candidate(cat.get("concrete"), None, 70.0))
    return DitchRun("invented 10 km run", tuple(zip(stations, z)), length,
                    (SectionRange(StationRange(0.0, length), section, 2.0),), candidates, subs, idf, 10.0,
                    spacing=spacing, min_stretch=30.0)


def profile_figure(result):
    """The run's profile (see the module's text) on an Agg canvas, drawn from the result's arrays; returns
    (figure, canvas)."""
    x, invert = result.layout.x, result.layout.invert
    fig = Figure(figsize=(13.66, 5.0), dpi=100)
    canvas = FigureCanvasAgg(fig)
    ax = fig.add_axes((0.06, 0.11, 0.92, 0.84))
    ax.plot(x, invert, color="0.3", lw=1.2, label="invert")
    ax.plot(x, invert + result.ditch_depth, color="0.6", lw=1.0, ls="--", label="ditch top as built")
    ax.plot(x, invert + result.scheduled("total_depth"), color="tab:orange", lw=0.8, ls=":",
            label="water plus freeboard")
    ax.plot(x, invert + result.scheduled("depth"), color="tab:blue", lw=1.2, label="water surface (normal depth)")
    for k, cand in enumerate(result.run.candidates):
        ax.plot(x, np.where(result.choice == k, invert - 0.3, np.nan), lw=5, solid_capstyle="butt", label=cand.label)
    ax.set_xlabel("distance along the flow (m)")
    ax.set_ylabel("elevation (m)")
    ax.legend(loc="upper right", fontsize=8)
    canvas.draw()
    return fig, canvas


def mean_time(fn, least=0.2):
    """Mean time of ``fn`` over enough calls to take ``least`` seconds (at least one call)."""
    count, start = 0, time.perf_counter()
    while True:
        fn()
        count += 1
        spent = time.perf_counter() - start
        if spent >= least:
            return spent / count


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--rounds", type=int, default=7)
    ap.add_argument("--spacing", type=float, default=10.0)
    ap.add_argument("--profile", action="store_true", help="print the cProfile of one solve and of one water surface, and stop")
    args = ap.parse_args(argv)
    run = invented_run(spacing=args.spacing)
    if args.profile:
        prof = cProfile.Profile()
        prof.enable()
        result = solve_run(run)
        prof.disable()
        pstats.Stats(prof).sort_stats("cumulative").print_stats(30)
        prof = cProfile.Profile()
        prof.enable()
        run_water_surface(result)
        prof.disable()
        pstats.Stats(prof).sort_stats("tottime").print_stats(20)
        return 0
    result = solve_run(run)
    _, canvas = profile_figure(result)
    width, height = canvas.get_width_height()
    solves, draws, surfaces, ratios, surface_ratios = [], [], [], [], []
    for _ in range(args.rounds):
        s = mean_time(lambda: solve_run(run))
        d = mean_time(canvas.draw)
        w = mean_time(lambda: run_water_surface(result))
        solves.append(s)
        draws.append(d)
        surfaces.append(w)
        ratios.append(s / d)
        surface_ratios.append(w / d)
    print(f"run: {len(result.points)} design points, {len(run.sub_areas)} sub-areas, {len(run.candidates)} "
          f"candidates, {result.iterations} travel-time rounds; figure {width}x{height} px")
    print(f"solve_run:          {statistics.median(solves) * 1e3:9.1f} ms (median of {args.rounds} rounds)")
    print(f"bare canvas.draw(): {statistics.median(draws) * 1e3:9.1f} ms")
    print(f"run_water_surface:  {statistics.median(surfaces) * 1e3:9.1f} ms")
    print(f"ratio: {statistics.median(ratios):.2f}x median (rounds {min(ratios):.2f}x to {max(ratios):.2f}x; "
          "goal <= 1)")
    print(f"water surface ratio: {statistics.median(surface_ratios):.2f}x median (rounds {min(surface_ratios):.2f}x "
          f"to {max(surface_ratios):.2f}x; goal <= 0.5)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
