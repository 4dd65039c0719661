"""How fast a design study flies survey-drone variants: variants per second on the local pool.

Flies N variants of the Glasswort drone holding 1.1 kn (scenarios/studies/glasswort-hold.toml,
full mission to the pack's floor, mass model on) drawn by Latin hypercube over gap, pole height,
channels and cells in parallel, into a fresh results table, and prints variants/s. The issue's
target after the fast engine: 1,000 variants in ≤ 30 s on 2 cores.

    python3 benchmarks/bench_study.py [N] [--jobs J] [--cluster ADDRESS]
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

STUDY = """
[study]
title = "benchmark"
scenario = "{scenario}"
seed = 1
sample = "10 min"

[[vary]]
key = "thruster.pylon.gap"
min = 40
max = 60
unit = "mm"

[[vary]]
key = "thruster.pylon.pole_height"
min = 40
max = 60
unit = "mm"

[[vary]]
key = "thruster.pylon.channels"
min = 2
max = 4
integer = true

[[vary]]
key = "battery.parallel"
min = 5
max = 8
integer = true

[sampling]
method = "lhs"
count = {n}

[mass]
trim_ballast = "25 kg"
"""


def main() -> None:
    from sim.analysis.study import run_study

    ap = argparse.ArgumentParser()
    ap.add_argument("n", nargs="?", type=int, default=200)
    ap.add_argument("--jobs", type=int, default=None)
    ap.add_argument("--cluster", default=None)
    a = ap.parse_args()
    scenario = (ROOT / "scenarios" / "studies" / "glasswort-hold.toml").as_posix()
    with tempfile.TemporaryDirectory() as tmp:
        p = Path(tmp) / "bench.study.toml"
        p.write_text(STUDY.format(scenario=scenario, n=a.n), encoding="utf-8")
        t0 = time.perf_counter()
        res = run_study(p, out=Path(tmp) / "bench.h5", resume=False, jobs=a.jobs, cluster=a.cluster)
        wall = time.perf_counter() - t0
    where = a.cluster or f"local pool, {a.jobs or os.cpu_count()} process(es)"
    rate = res.flown / wall
    print(f"{res.flown} survey-drone variants in {wall:.1f} s on {where}: {rate:.1f} variants/s")
    print(
        f"1,000 variants would take about {1000 / rate:.0f} s (target after the fast engine: 30 s)"
    )


if __name__ == "__main__":
    main()
