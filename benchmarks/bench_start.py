"""Start-up of the command line, as ratios against starting Python and importing numpy alone.

    python benchmarks/bench_start.py [--rounds 15]

Three commands are started as fresh processes in interleaved rounds, so that each meets the machine in the
same state: ``python -c "import numpy"`` (the baseline), ``ditchwright --version`` and ``ditchwright calc``
on one channel with text output. Bytecode is written to a temporary cache first (an installed program has
its bytecode compiled), so the rounds time the imports, not the compiling. The median ratio is printed with
its range over the rounds.
"""

from __future__ import annotations

import argparse
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

CALC = ["calc", "--shape", "trapezoid", "--bottom-width", "2", "--side-slope", "3", "--slope", "0.01",
        "--flow", "20", "--n", "0.03"]


def _timed(argv, env) -> float:
    t0 = time.perf_counter()
    subprocess.run(argv, env=env, check=True, stdout=subprocess.DEVNULL)
    return time.perf_counter() - t0


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=15)
    args = parser.parse_args()
    cache = tempfile.mkdtemp(prefix="ditchwright-bench-pyc-")
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPYCACHEPREFIX"] = cache
    me = [sys.executable, "-m", "app.main"]
    cases = {"numpy": [sys.executable, "-c", "import numpy"], "--version": me + ["--version"], "calc": me + CALC}
    try:
        for argv in cases.values():   # warm: bytecode written, files in the page cache
            _timed(argv, env)
        times = {name: [] for name in cases}
        for _ in range(args.rounds):
            for name, argv in cases.items():
                times[name].append(_timed(argv, env))
    finally:
        shutil.rmtree(cache, ignore_errors=True)
    base = times["numpy"]
    for name in ("--version", "calc"):
        ratios = [t / b for t, b in zip(times[name], base)]
        print(f"ditchwright {name}: {statistics.median(ratios):.2f}x python -c 'import numpy' (rounds "
              f"{min(ratios):.2f}x to {max(ratios):.2f}x; about {statistics.median(times[name]) * 1000:.0f} ms "
              f"against {statistics.median(base) * 1000:.0f} ms)")


if __name__ == "__main__":
    main()
