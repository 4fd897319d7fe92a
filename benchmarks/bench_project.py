"""Opening a large project file, as a ratio against parsing the same text with the standard json module alone.

    python benchmarks/bench_project.py [--channels 40000] [--rounds 5]

The project is the demo's first channel repeated (an invented file of the largest size the program opens,
32 MiB). Each round times both sides back to back; the median ratio is printed with its range over the rounds.
"""

from __future__ import annotations

import argparse
import json
import statistics
import time

from app import project as pj


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--channels", type=int, default=40000)
    parser.add_argument("--rounds", type=int, default=5)
    args = parser.parse_args()
    project = pj.load(pj.demo_path())
    project.channels = project.channels[:1] * args.channels
    project.runs = []
    text = pj.dumps(project)
    pj.loads(text)   # warm: the compiled schema, the imports
    ratios, seconds = [], []
    for _ in range(args.rounds):
        t0 = time.perf_counter()
        json.loads(text)
        t1 = time.perf_counter()
        pj.loads(text)
        t2 = time.perf_counter()
        ratios.append((t2 - t1) / (t1 - t0))
        seconds.append(t2 - t1)
    print(f"{args.channels} channels, {len(text) / 1e6:.1f} MB: opening the project takes "
          f"{statistics.median(ratios):.1f}x json.loads of the same text (rounds {min(ratios):.1f}x to "
          f"{max(ratios):.1f}x; about {statistics.median(seconds):.1f} s here)")


if __name__ == "__main__":
    main()
