"""Speed of the core, as ratios against a baseline measured in the same run.

    python benchmarks/bench_core.py

(1) hy.normal_depth over 1,000,000 trapezoids (arrays of flow, slope and n)
    against one vectorised evaluation of Manning's equation on the same arrays;
    goal <= 15x.
(2) one scalar hy.normal_depth call against a bare scipy.optimize.brentq on
    the same residual; goal <= 1.0x.
Each figure is the best of several repeats, so that other load on the machine
weighs as little as possible.
"""

from __future__ import annotations

import math
import timeit

import numpy as np
from scipy.optimize import brentq

import hydraulics as hy


def best(fn, number, repeat=7):
    return min(timeit.repeat(fn, number=number, repeat=repeat)) / number


def vector_ratio(size=1_000_000):
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

    base = best(manning_once, 1, repeat=5)
    solve = best(lambda: hy.normal_depth(section, q, s, n), 1, repeat=5)
    return solve, base


def scalar_ratio():
    b, z, q, s, n = 1.2, 3.0, 1.7, 0.004, 0.03
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    k = 2 * math.sqrt(1 + z * z)
    sqrt_s = math.sqrt(s)

    def residual(y):
        a = (b + z * y) * y
        return a * (a / (b + k * y)) ** (2 / 3) * sqrt_s / n - q

    y_ref = brentq(residual, 1e-9, 100.0, xtol=1e-14)
    assert abs(hy.normal_depth(section, q, s, n) - y_ref) < 1e-9
    base = best(lambda: brentq(residual, 1e-9, 100.0, xtol=1e-14), 2000)
    ours = best(lambda: hy.normal_depth(section, q, s, n), 2000)
    return ours, base


def main():
    solve, base = vector_ratio()
    print(f"(1) 1,000,000 trapezoids: normal_depth {solve * 1e3:.0f} ms, one Manning evaluation "
          f"{base * 1e3:.1f} ms -> ratio {solve / base:.1f}x (goal <= 15x)")
    ours, base = scalar_ratio()
    print(f"(2) one scalar call: normal_depth {ours * 1e6:.1f} us, bare brentq {base * 1e6:.1f} us "
          f"-> ratio {ours / base:.2f}x (goal <= 1.0x)")


if __name__ == "__main__":
    main()
