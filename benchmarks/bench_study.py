"""How fast a design study flies survey-drone variants: variants per second on the local pool.

Flies N variants of the Glasswort drone holding 1.1 kn (scenarios/studies/glasswort-hold.toml,
full mission to the pack's floor, mass model on) drawn by Latin hypercube over gap, pole height,
channels and cells in parallel, into a fresh results table, and prints variants/s. The issue's
target after the fast engine: 1,000 variants in ≤ 30 s on 2 cores.

    python3 benchmarks/bench_study.py [N] [--jobs J] [--cluster ADDRESS] [--full-load]

It also prints where a variant's time goes (loading it, flying it, keeping its row) and the
projection for 1,000 variants; ``--full-load`` loads every variant from its files as the
runner did before issue 12 (for before/after figures).
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
    from sim.analysis.study import evaluate, run_study

    ap = argparse.ArgumentParser()
    ap.add_argument("n", nargs="?", type=int, default=200)
    ap.add_argument("--jobs", type=int, default=None)
    ap.add_argument("--cluster", default=None)
    ap.add_argument(
        "--full-load",
        action="store_true",
        help="load every variant from its files, as the runner did before issue 12",
    )
    a = ap.parse_args()
    evaluate._LEGACY_LOAD = a.full_load  # forked workers inherit it
    scenario = (ROOT / "scenarios" / "studies" / "glasswort-hold.toml").as_posix()
    first: list[float] = []

    def progress(stage, done, total, row):
        if not first:
            first.append(time.perf_counter())

    with tempfile.TemporaryDirectory() as tmp:
        p = Path(tmp) / "bench.study.toml"
        p.write_text(STUDY.format(scenario=scenario, n=a.n), encoding="utf-8")
        t0 = time.perf_counter()
        res = run_study(
            p,
            out=Path(tmp) / "bench.h5",
            resume=False,
            jobs=a.jobs,
            cluster=a.cluster,
            progress=progress,
        )
        wall = time.perf_counter() - t0
    workers = a.jobs or os.cpu_count() or 1
    where = a.cluster or f"local pool, {workers} process(es)"
    n = max(res.flown, 1)
    rate = res.flown / wall
    how = "full load of each variant (before issue 12)" if a.full_load else "quick load"
    print(f"{res.flown} survey-drone variants in {wall:.1f} s on {where}, {how}:")
    print(f"{rate:.1f} variants/s")
    tm = res.timing
    print(
        "per variant: load {:.1f} ms, fly {:.1f} ms (in a worker), write {:.2f} ms (in the "
        "parent); wall per variant per worker {:.1f} ms".format(
            1e3 * tm.get("load_s", 0.0) / n,
            1e3 * tm.get("fly_s", 0.0) / n,
            1e3 * tm.get("write_s", 0.0) / n,
            1e3 * wall * (1 if a.cluster else workers) / n,
        )
    )
    start = (first[0] - t0) if first else 0.0
    steady = (wall - start) / max(n - 1, 1)
    print(
        f"1,000 variants would take about {1000 / rate:.0f} s at this rate; "
        f"{start + 999 * steady:.0f} s counting the start ({start:.1f} s to the first row) once "
        "(target after the fast engine: 30 s)"
    )


if __name__ == "__main__":
    main()
