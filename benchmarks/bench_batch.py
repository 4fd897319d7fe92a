"""Speed of `ditchwright batch`: 100,000 reaches end to end against the scalar API one reach at a time.

    python benchmarks/bench_batch.py [--reaches 100000] [--sample N]

The inventory is invented (random but reproducible): open ditches (trapezoid,
V-ditch, rectangle) and pipes with US customary inputs, a few named linings,
a few pipes too small for their flow and a few malformed rows. Lined reaches
(riprap, grass) give an n half the time and otherwise take the lining's own,
depth-dependent n from the catalogue (a coupled solve); riprap rows give their
D50, 0.5 ft (a stone row without one is refused).

(1) batch: read the CSV, check every reach, write the results CSV, timed as
    the command does it (app.inventory.check_file, block by block; parsing
    and unit conversion included).
(2) scalar: the same reaches one by one with the scalar API (section class,
    hy.max_flow for pipes, the lining's roughness, hy.analyse), computing
    only: no reading or writing. For a lined reach this is less than the batch
    works out (no permissible shear, no safety factor).
    With --sample N only N reaches spread over the file are timed and the time
    is scaled to the whole file (the script says so).
(2+) mixed inventory only: as (2), and each lined reach also through the
    lining's shear check, hydraulics.shear_checks.shear_checks (the function the
    batch and check_lining use), so every reach gets the quantities the batch
    writes for it: the like-for-like figure for a lined inventory.
(3) with --with-io: the same as (2) with reading and writing by the csv module.
(4) mixed inventory only: as (2), but each lined reach through the scalar
    lining check, hydraulics.stability.check_lining, which also sizes the
    stone and works out freeboard (more than the batch writes), on a sample.
Ratio = (2) / (1) (and (2+) / (1) for the mixed inventory); goal >= 50x. Two
inventories are timed: a mixed one and one where every reach gives its own n
(no lining roughness to solve with, nothing but the hydraulics to compute: its
ratio is like-for-like as it stands). The two sides are timed in interleaved
rounds (--rounds): each round times the batch (best of --repeat runs) and
then a share of the reaches one by one, so that both meet the machine in the
same state; the ratio printed is the median over the rounds, with its range.
The absolute times depend on the machine and are indicative only. The batch uses
pyarrow's CSV reader, which parses with several threads, and formats the
numbers of one chunk of reaches in a worker thread while the next chunk is
computed; the scalar loops run on one thread. The ratio is also printed in
processor time, which counts the work of every thread of the batch: the
share of the speed that is not owed to the second core.
"""

from __future__ import annotations

import argparse
import csv
import math
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # this checkout's code, not an installed copy

import hydraulics as hy
from app import inventory as ai
from hydraulics import units as hu
from hydraulics.linings import load_catalogue
from hydraulics.shear_checks import shear_checks
from hydraulics.stability import check_lining

#: The D50 of the invented riprap rows [ft].
D50_FT = "0.5"
HEADER = ["id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining", "d50",
          "n", "road", "surveyed"]


def make_inventory(path: Path, size: int, seed: int = 11, lined: bool = True) -> None:
    """Write an invented inventory of ``size`` reaches (US units) to ``path``; ``lined``: some name a lining."""
    rng = np.random.default_rng(seed)
    kind = rng.choice(["trapezoid", "triangle", "rectangle", "circle"], size=size, p=[0.55, 0.2, 0.1, 0.15])
    b = np.round(rng.uniform(1.0, 8.0, size), 1)
    z1 = rng.choice([1.5, 2.0, 3.0, 4.0], size)
    z2 = rng.choice([1.5, 2.0, 3.0, 4.0, 6.0], size)
    d = rng.choice([1.0, 1.25, 1.5, 2.0, 2.5, 3.0, 4.0], size)
    slope = np.round(10 ** rng.uniform(-3.5, -1.2, size), 5)
    flow = np.round(10 ** rng.uniform(-0.5, 2.3, size), 2)
    n = rng.choice([0.013, 0.015, 0.022, 0.03, 0.035, 0.045], size)
    lining = rng.choice(["", "", "", "", "", "", "", "", "riprap", "grass_good_sod"], size)
    if not lined:
        lining[:] = ""
    own_n = rng.random(size) < 0.5  # half the lined reaches give an n, the others take the lining's own
    pipe = kind == "circle"
    flow[pipe] = np.round(flow[pipe] * 0.15, 2) + 0.01  # pipes mostly carry their flow, some do not
    with open(path, "w", newline="") as fh:
        fh.write(",".join(HEADER) + "\n")
        for i in range(size):
            k = kind[i]
            row = [f"R{i:06d}", k,
                   f"{b[i]:g}" if k in ("trapezoid", "rectangle") else "",
                   f"{z1[i]:g}" if k in ("trapezoid", "triangle") else "",
                   f"{z2[i]:g}" if k in ("trapezoid", "triangle") else "",
                   f"{d[i]:g}" if k == "circle" else "",
                   f"{slope[i]:g}", f"{flow[i]:g}", lining[i], D50_FT if lining[i] == "riprap" else "",
                   f"{n[i]:g}" if not lining[i] or own_n[i] or k == "circle" else "",
                   f"SR-{i % 97}", "2024-05"]
            if i % 1000 == 999:
                row[7] = "-1"  # a malformed row now and then
            fh.write(",".join(row) + "\n")


def best(fn, repeat, cpu=None):
    """The best wall time of ``repeat`` runs of ``fn``; with a list ``cpu``, its processor time
    (every thread of the process) is appended to it."""
    times = []
    for _ in range(repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        fn()
        times.append((time.perf_counter() - t0, time.process_time() - c0))
    wall, used = min(times)
    if cpu is not None:
        cpu.append(used)
    return wall


def batch_end_to_end(src: Path, dst: Path):
    """What `ditchwright batch` does between reading its options and printing its summary (block by block)."""
    return ai.check_file(src, dst, "us", catalogue=_CATALOGUE)


_CATALOGUE = load_catalogue()


def _scalar_row(row, us, stability=False, shear=False):
    """One reach through the scalar API, as a caller without the batch would write it.

    With ``stability`` a lined reach goes through hydraulics.stability.check_lining (the
    scalar lining check); its ``analysis`` is returned so that both modes compare alike.
    With ``shear`` a lined reach also gets hydraulics.shear_checks.shear_checks on its
    normal depth (permissible shear, safety factor): what the batch writes for it.
    """
    length = lambda v: us.to_si("length", float(v))  # noqa: E731
    try:
        q, s = us.to_si("flow", float(row["flow"])), float(row["slope"])
        d50 = length(row["d50"]) if row["d50"] else None
        n = float(row["n"]) if row["n"] else _CATALOGUE.get(row["lining"]).roughness(d50)
        kind = row["shape"]
        if kind == "trapezoid":
            sec = hy.Trapezoid(bottom_width=length(row["bottom_width"]), left_slope=float(row["left_slope"]),
                               right_slope=float(row["right_slope"]))
        elif kind == "triangle":
            sec = hy.Triangle(left_slope=float(row["left_slope"]), right_slope=float(row["right_slope"]))
        elif kind == "rectangle":
            sec = hy.Rectangle(bottom_width=length(row["bottom_width"]))
        else:
            sec = hy.Circle(diameter=length(row["diameter"]))
            if q > hy.max_flow(sec, s, n):
                return None
        if stability and row["lining"]:
            return check_lining(sec, q, s, _CATALOGUE.get(row["lining"]), n=float(row["n"]) if row["n"] else None,
                                d50=d50).analysis
        res = hy.analyse(sec, q, s, n)
        if shear and row["lining"]:
            lining = _CATALOGUE.get(row["lining"])
            sides = sec.side_slopes
            shear_checks(lining, float(res.normal_depth), s, float(res.manning_n),
                         d50=d50,
                         left_slope=None if sides is None else float(sides[0]),
                         right_slope=None if sides is None else float(sides[1]))
        return res
    except (hy.HydraulicsError, ValueError):
        return None


def scalar_rows(rows, stability=False, shear=False):
    us = hu.system("us")
    return [_scalar_row(r, us, stability, shear) for r in rows]


def scalar_with_io(src: Path, dst: Path):
    us = hu.system("us")
    with open(src, newline="") as fh:
        rows = list(csv.DictReader(fh))
    with open(dst, "w", newline="") as fh:
        w = csv.writer(fh)
        w.writerow(list(rows[0]) + list(ai.RESULT_COLUMNS[:5]))
        for r in rows:
            res = _scalar_row(r, us)
            vals = [] if res is None else [
                us.from_si("length", res.normal_depth), us.from_si("length", res.critical_depth),
                us.from_si("velocity", res.velocity), res.froude, us.from_si("shear", res.bed_shear)]
            w.writerow(list(r.values()) + [f"{v:.5g}" for v in vals])


def run(size, lined, sample, repeat, with_io, scalar_repeat=1, rounds=3):
    """Timings for one invented inventory; returns a dict of figures.

    The machine's speed drifts over a run of a minute or more (other work on
    it), so the two sides are timed in ``rounds`` interleaved rounds: each
    round times the batch (best of ``repeat``) and then one share of the
    reaches one by one (every ``rounds``-th reach, scaled to the whole file).
    Each round gives a ratio under the same conditions; the median is
    reported, with the lowest and highest.
    """
    with tempfile.TemporaryDirectory() as tmp:
        src, dst = Path(tmp) / "inventory.csv", Path(tmp) / "results.csv"
        make_inventory(src, size, lined=lined)
        batch_end_to_end(src, dst)
        # the results per reach, to compare below
        result = ai.evaluate(ai.read_inventory(src, "us"), catalogue=_CATALOGUE)
        with open(src, newline="") as fh:
            rows = list(csv.DictReader(fh))
        if sample and sample < len(rows):
            pick = np.linspace(0, len(rows) - 1, sample).astype(int)
            timed = [rows[i] for i in pick]
            how = f"{len(timed):,} reaches timed one by one, scaled to {len(rows):,}"
        else:
            timed = rows
            how = f"all {len(rows):,} reaches one by one"
        batch, scalar, shear, batch_cpu, scalar_cpu = [], [], [], [], []
        for r in range(rounds):
            share = timed[r::rounds]
            scale = len(rows) / len(share)
            batch.append(best(lambda: batch_end_to_end(src, dst), repeat, batch_cpu))
            scalar.append(best(lambda: scalar_rows(share), scalar_repeat, scalar_cpu) * scale)
            scalar_cpu[-1] *= scale
            if lined:
                shear.append(best(lambda: scalar_rows(share, shear=True), scalar_repeat) * scale)
        t_stab = math.nan
        if lined:  # the scalar lining check is slow: always a sample, scaled
            pick = np.linspace(0, len(rows) - 1, min(len(rows), sample or 5000)).astype(int)
            picked = [rows[i] for i in pick]
            t_stab = best(lambda: scalar_rows(picked, stability=True), 1) * len(rows) / len(picked)
        # The scalar results agree with the batch on the reaches both computed.
        check = np.linspace(0, len(rows) - 1, 2000).astype(int)
        ref = scalar_rows([rows[i] for i in check])
        got = result.normal_depth[check]
        worst = max((abs(r.normal_depth - g) / r.normal_depth for r, g in zip(ref, got) if r is not None), default=0)
        assert worst < 1e-9, worst
        t_io = best(lambda: scalar_with_io(src, dst), 1) if with_io else math.nan
    ratios = [s / b for s, b in zip(scalar, batch)]
    cpu_ratios = [s / b for s, b in zip(scalar_cpu, batch_cpu)]
    shear_ratios = [s / b for s, b in zip(shear, batch)]
    return {"batch": min(batch), "scalar": float(np.median(scalar)), "shear": float(np.median(shear)) if lined else math.nan,
            "ratio": ratios, "cpu_ratio": cpu_ratios, "shear_ratio": shear_ratios, "how": how, "io": t_io, "stab": t_stab,
            "counts": result.counts()}


def _spread(ratios):
    return (f"{np.median(ratios):.1f}x" + (f" (rounds {min(ratios):.1f}x to {max(ratios):.1f}x)" if len(ratios) > 1 else ""))


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--reaches", type=int, default=100_000)
    p.add_argument("--sample", type=int, default=0, help="time only this many reaches one by one and scale")
    p.add_argument("--repeat", type=int, default=3, help="batch runs per round, the best is taken")
    p.add_argument("--scalar-repeat", type=int, default=1, help="scalar loops per round, the best is taken")
    p.add_argument("--rounds", type=int, default=3, help="interleaved rounds of batch and scalar timing")
    p.add_argument("--with-io", action="store_true", help="also time the scalar loop with csv reading and writing")
    args = p.parse_args(argv)
    for label, lined in (("mixed: 20 % lined, half of them with the lining's own n", True),
                         ("every reach with its own Manning's n", False)):
        f = run(args.reaches, lined, args.sample, args.repeat, args.with_io, args.scalar_repeat, args.rounds)
        print(f"{args.reaches:,} invented reaches, {label}")
        print(f"  verdicts {f['counts']}")
        print(f"  (1) batch, read + check + write:    {f['batch']:8.3f} s (best)")
        print(f"  (2) scalar API, compute only:       {f['scalar']:8.3f} s  ({f['how']}; median of the rounds)")
        if not math.isnan(f["io"]):
            print(f"  (3) scalar API with csv read/write: {f['io']:8.3f} s  -> (3)/(1) {f['io'] / f['batch']:.1f}x")
        if f["shear_ratio"]:
            print(f"  (2+) scalar API with the shear check of each lined reach: {f['shear']:8.3f} s "
                  f"-> (2+)/(1) {_spread(f['shear_ratio'])} (like-for-like)")
        print(f"  ratio (2)/(1): {_spread(f['ratio'])} (goal >= 50x)")
        print(f"  the same in processor time (every thread of the batch counted): {_spread(f['cpu_ratio'])}")
        if not math.isnan(f["stab"]):
            print(f"  (4) scalar API with check_lining for lined reaches:  {f['stab']:8.3f} s (sampled, scaled) "
                  f"-> (4)/(1) {f['stab'] / f['batch']:.1f}x")
    print("absolute times are indicative: they depend on the machine and its load")


if __name__ == "__main__":
    main()
