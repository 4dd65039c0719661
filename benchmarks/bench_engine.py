"""Speed figures for the engine and the thruster model (run: python3 benchmarks/bench_engine.py).

Prints wall times; nothing here is a test. Figures depend on the machine.
"""

from __future__ import annotations

import resource
import sys
import tempfile
import time
import tracemalloc
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from sim import api  # noqa: E402
from sim.physics.seawater import water_state  # noqa: E402
from sim.physics.thruster import (  # noqa: E402
    DuctThruster,
    operating_point,
    prepare_scalar,
    scalar_point,
)

TEN_HOURS = """
[scenario]
name = "bench: ten hours at a held speed"
vessel = "{vessel}"
[water]
salinity = 35.0
temperature = "15 degC"
[start]
state_of_charge = 1.0
[output]
sample = "60 s"
[limits]
time = "11 h"
[[leg]]
name = "hold"
speed = "{speed}"
until = {{ duration = "10 h" }}
"""


def best_of(fn, n=3):
    times = []
    for _ in range(n):
        t = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t)
    return min(times), out


def main() -> None:
    print("brinebolt engine benchmark (best of 3, wall seconds)")
    for path in sorted((ROOT / "scenarios").glob("*.toml")):
        if path.name.startswith("variants"):
            continue
        loaded = api.load_scenario(path)
        wall, out = best_of(lambda loaded=loaded: api.run_scenario(loaded, write_log=False))
        r = out.result
        print(
            f"  {path.name:32s} {wall:7.3f} s  simulated {r.summary['duration_s'] / 3600:5.2f} h"
            f"  rhs calls {r.rhs_calls:6d}  {1e6 * r.wall_time_s / max(r.rhs_calls, 1):6.1f}"
            f" µs/call (incl. events and sampling)"
        )
    with tempfile.TemporaryDirectory() as d:
        for vessel, speed in (("halite-concept.toml", "5 kn"), ("glasswort-drone.toml", "0.8 kn")):
            p = Path(d) / f"ten-{vessel}"
            p.write_text(
                TEN_HOURS.format(vessel=(ROOT / "vessels" / vessel).as_posix(), speed=speed)
            )
            loaded = api.load_scenario(p)
            wall, out = best_of(lambda loaded=loaded: api.run_scenario(loaded, write_log=False))
            print(
                f"  10-hour speed hold, {vessel:22s} {wall:7.3f} s  "
                f"(ended: {out.result.ending_reason}; rhs calls {out.result.rhs_calls})"
            )
            wall, out = best_of(
                lambda loaded=loaded, d=d: api.run_scenario(
                    loaded, out=Path(d) / f"log-{time.perf_counter_ns()}.h5"
                )
            )
            print(f"     same with the HDF5 log written: {wall:7.3f} s")
    tracemalloc.start()
    api.run_scenario(
        api.load_scenario(ROOT / "scenarios" / "halite-coastal-trial.toml"), write_log=False
    )
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    print(
        f"  memory: Python allocations peak {peak / 2**20:.1f} MiB during the Halite trial; "
        f"process peak RSS {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f} MiB"
    )
    w = water_state(35.0, 15.0)
    th = DuctThruster(
        gap_m=0.1, height_m=0.1, length_m=1.0, n_channels=2, b_tesla=5.0, roughness_m=2e-5
    )
    k = prepare_scalar(th, w)
    n = 20000
    t = time.perf_counter()
    for i in range(n):
        scalar_point(k, 2.0 + 1e-6 * i, voltage_v=60.0)
    print(
        f"  thruster scalar_point (voltage control): {1e6 * (time.perf_counter() - t) / n:6.1f}"
        " µs/call"
    )
    speeds = np.linspace(0.0, 10.0, 316)
    volts = np.linspace(0.0, 300.0, 317)
    vv, ss = np.meshgrid(volts, speeds)
    wall, _ = best_of(lambda: operating_point(th, w, ss, voltage_v=vv))
    print(f"  thruster operating_point on a {ss.size:,}-point grid: {wall:6.3f} s")


if __name__ == "__main__":
    main()
