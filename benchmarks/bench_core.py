"""Speed of the core, as ratios against a baseline measured in the same run.

    python benchmarks/bench_core.py [--rounds 15]

(1) hy.normal_depth over 1,000,000 trapezoids (arrays of flow, slope and n)
    against one vectorised evaluation of Manning's equation on the same arrays;
    goal <= 5x.
(2) one scalar hy.normal_depth call against a bare scipy.optimize.brentq on
    the same residual and a sensible bracket; goal <= 0.5x.
The solve and its baseline are timed in alternating rounds (a shared machine drifts from minute to minute);
the median ratio is printed with its range over the rounds.
"""

from __future__ import annotations

import argparse
import math
import statistics
import time

import numpy as np
from scipy.optimize import brentq

import hydraulics as hy


def _once(fn, number=1) -> float:
    start = time.perf_counter()
    for _ in range(number):
        fn()
    return (time.perf_counter() - start) / number


def _rounds(solve, base, rounds, number=1):
    solve(), base()  # warm caches and lazy imports
    ratios, solve_t, base_t = [], [], []
    for _ in range(rounds):
        b = _once(base, number)
        s = _once(solve, number)
        ratios.append(s / b)
        solve_t.append(s)
        base_t.append(b)
    return ratios, statistics.median(solve_t), statistics.median(base_t)


def vector_case(size=1_000_000):
    rng = np.random.default_rng(7)
    q = rng.uniform(0.05, 20.0, size)
    s = rng.uniform(1e-4, 0.05, size)
    n = rng.uniform(0.012, 0.06, size)
    b, z = 1.2, 3.0
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    y = hy.normal_depth(section, q, s, n)
    k = 2 * math.sqrt(1 + z * z)

    def manning_once():
        a = (b + z * y) * y
        return a * (a / (b + k * y)) ** (2 / 3) * np.sqrt(s) / n

    assert np.allclose(manning_once(), q, rtol=1e-9)
    return (lambda: hy.normal_depth(section, q, s, n)), manning_once


def scalar_case():
    b, z, q, s, n = 1.2, 3.0, 1.7, 0.004, 0.03
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    k = 2 * math.sqrt(1 + z * z)
    sqrt_s = math.sqrt(s)

    def residual(y):
        a = (b + z * y) * y
        return a * (a / (b + k * y)) ** (2 / 3) * sqrt_s / n - q

    y_ref = brentq(residual, 1e-9, 100.0, xtol=1e-14)
    assert abs(hy.normal_depth(section, q, s, n) - y_ref) < 1e-9
    return (lambda: hy.normal_depth(section, q, s, n)), (lambda: brentq(residual, 1e-9, 100.0, xtol=1e-14))


def _line(label, ratios, solve, base, unit, scale, goal):
    return (f"{label}: {statistics.median(ratios):.2f}x (rounds {min(ratios):.2f}x to {max(ratios):.2f}x; "
            f"about {solve * scale:.1f} {unit} against {base * scale:.1f} {unit}; goal <= {goal}x)")


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=15)
    args = parser.parse_args()
    ratios, solve, base = _rounds(*vector_case(), args.rounds)
    print(_line("(1) normal depth of 1,000,000 trapezoids / one Manning evaluation", ratios, solve, base,
                "ms", 1e3, 5))
    ratios, solve, base = _rounds(*scalar_case(), args.rounds, number=500)
    print(_line("(2) one scalar normal depth / a bare brentq", ratios, solve, base, "us", 1e6, 0.5))


if __name__ == "__main__":
    main()
