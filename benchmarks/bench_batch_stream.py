"""Memory and speed of `ditchwright batch` on large inventories, against a bare pyarrow read + write of the same file.

    python benchmarks/bench_batch_stream.py [--reaches 250000 1000000] [--rounds 3]

The inventory is invented (random but reproducible), a mixed one: 60 % of the reaches give their own Manning's n,
25 % are riprap in 50 stone sizes (their D50 given, n from the stone), 15 % are concrete; open ditches and pipes,
US customary units, one malformed row in a thousand (with --own-n: every reach gives its own n). Each round runs, in fresh processes one after the other:

(1) `ditchwright batch INVENTORY -o RESULTS --no-progress` (app.main.main, in the process; its imports excluded);
(2) the bare baseline: pyarrow.csv.read_csv of the same file, then pyarrow.csv.write_csv of the table read.

For each, the wall time of the work and the process's peak resident memory (getrusage ru_maxrss, which counts the
interpreter and its imports as well); for the batch also its processor time (user and system, all threads), which
says how many of the machine's cores it keeps busy. Printed: per size, the median over the rounds of the time ratio
(1)/(2) with its range, and the peak memory of each (median and range). Goals (issue 15): 1 million reaches at most 4x the bare
read + write, and memory that does not grow with the rows (at most 600 MB for 5 million reaches). The absolute
times depend on the machine and its load and are indicative only.
"""

from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
HEADER = ["id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining", "d50",
          "n", "road"]

BATCH = """
import json, resource, sys, time
from app.cli.heap import share_one_heap
share_one_heap()  # as `ditchwright batch` asks at its start, before the imports below
from app.main import main
import app.cli.inventory_command, app.inventory, pyarrow.csv  # imports outside the timing
src, dst = sys.argv[1:3]
before = resource.getrusage(resource.RUSAGE_SELF)
t = time.perf_counter()
status = main(["batch", src, "-o", dst, "--no-progress"])
seconds = time.perf_counter() - t
after = resource.getrusage(resource.RUSAGE_SELF)
cpu = after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime   # every thread's processor time
print(json.dumps({"seconds": seconds, "rss": after.ru_maxrss, "cpu": cpu, "status": status}))
"""

BARE = """
import json, resource, sys, time
import pyarrow.csv as pacsv
src, dst = sys.argv[1:3]
t = time.perf_counter()
pacsv.write_csv(pacsv.read_csv(src), dst)
print(json.dumps({"seconds": time.perf_counter() - t, "rss": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss}))
"""


def make_inventory(path: Path, size: int, seed: int = 15, own_n: bool = False) -> None:
    """Write the invented mixed inventory of ``size`` reaches (US units) to ``path``, in blocks of rows;
    ``own_n``: every reach gives its own n instead (no lining)."""
    rng = np.random.default_rng(seed)
    stones = np.round(np.linspace(0.25, 2.0, 50), 3)   # 50 stone sizes D50 [ft], invented
    with open(path, "w", newline="") as fh:
        fh.write(",".join(HEADER) + "\n")
        for start in range(0, size, 100_000):
            m = min(100_000, size - start)
            kind = rng.choice(np.array(["trapezoid", "triangle", "rectangle", "circle"]), m, p=[0.55, 0.2, 0.1, 0.15])
            use = rng.choice(np.array(["own", "riprap", "concrete"]), m, p=[0.60, 0.25, 0.15])
            use[kind == "circle"] = "own"
            if own_n:
                use[:] = "own"
            b = np.round(rng.uniform(1, 8, m), 1)
            z1, z2 = rng.choice([2.0, 3.0, 4.0], m), rng.choice([2.0, 3.0, 4.0, 6.0], m)
            d = rng.choice([1.0, 1.5, 2.0, 3.0], m)
            slope = np.round(10 ** rng.uniform(-3.5, -1.3, m), 5)
            flow = np.round(10 ** rng.uniform(-0.5, 2.3, m), 2)
            flow[kind == "circle"] = np.round(flow[kind == "circle"] * 0.15, 2) + 0.01
            n = rng.choice([0.013, 0.022, 0.03, 0.035, 0.045], m)
            d50 = rng.choice(stones, m)
            lines = []
            for i in range(m):
                k, u = kind[i], use[i]
                row = [f"R{start + i:07d}", k,
                       f"{b[i]:g}" if k in ("trapezoid", "rectangle") else "",
                       f"{z1[i]:g}" if k in ("trapezoid", "triangle") else "",
                       f"{z2[i]:g}" if k in ("trapezoid", "triangle") else "",
                       f"{d[i]:g}" if k == "circle" else "",
                       f"{slope[i]:g}", "-1" if (start + i) % 1000 == 999 else f"{flow[i]:g}",
                       "" if u == "own" else u, f"{d50[i]:g}" if u == "riprap" else "",
                       f"{n[i]:g}" if u == "own" else ("0.015" if u == "concrete" else ""), f"SR-{i % 97}"]
                lines.append(",".join(row))
            fh.write("\n".join(lines) + "\n")


def child(code: str, src: Path, dst: Path) -> dict:
    out = subprocess.run([sys.executable, "-c", code, str(src), str(dst)], capture_output=True, text=True,
                         env={"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin"}, check=False)
    if not out.stdout.strip():
        raise SystemExit(f"the child failed: {out.stderr[-2000:]}")
    return json.loads(out.stdout.strip().splitlines()[-1])


def _spread(values, fmt="{:.1f}", unit="x"):
    return (fmt.format(np.median(values)) + unit
            + (f" (rounds {fmt.format(min(values))}{unit} to {fmt.format(max(values))}{unit})" if len(values) > 1
               else ""))


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--reaches", type=int, nargs="+", default=[250_000, 1_000_000])
    p.add_argument("--rounds", type=int, default=3)
    p.add_argument("--own-n", action="store_true", help="every reach gives its own n (no lining): the core's "
                                                          "hydraulics only")
    args = p.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        for size in args.reaches:
            src, dst, bare = Path(tmp) / "inventory.csv", Path(tmp) / "results.csv", Path(tmp) / "bare.csv"
            make_inventory(src, size, own_n=args.own_n)
            runs, bases = [], []
            for _ in range(args.rounds):
                runs.append(child(BATCH, src, dst))
                bases.append(child(BARE, src, bare))
            ratios = [r["seconds"] / b["seconds"] for r, b in zip(runs, bases)]
            mb = lambda rows: [r["rss"] / 1024 for r in rows]  # noqa: E731  (Linux: ru_maxrss in KiB)
            what = "every reach with its own n" if args.own_n else "60 % own n, 25 % riprap in 50 sizes, 15 % concrete"
            print(f"{size:,} invented reaches ({what}), "
                  f"{src.stat().st_size / 2**20:.0f} MiB")
            print(f"  batch end to end: {np.median([r['seconds'] for r in runs]):.2f} s, "
                  f"{size / np.median([r['seconds'] for r in runs]):,.0f} rows a second; bare pyarrow read + write: "
                  f"{np.median([b['seconds'] for b in bases]):.2f} s (medians)")
            print(f"  ratio batch / bare: {_spread(ratios)} (goal <= 4x at 1,000,000)")
            print(f"  processor time of the batch (all its threads): "
                  f"{_spread([r['cpu'] for r in runs], '{:.2f}', ' s')}, "
                  f"{_spread([r['cpu'] / r['seconds'] for r in runs], '{:.2f}', ' cores')} busy on average")
            print(f"  peak resident memory: batch {_spread(mb(runs), '{:.0f}', ' MB')}, "
                  f"bare {_spread(mb(bases), '{:.0f}', ' MB')} (goal: flat in the rows, <= 600 MB at 5,000,000)")
    print("absolute times are indicative: they depend on the machine and its load")


if __name__ == "__main__":
    main()
