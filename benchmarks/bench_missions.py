"""The engine against the obvious implementation, side by side (run:
``python3 benchmarks/bench_missions.py``).

Prints figures; nothing here is a test, and figures depend on the machine. For each case: the
engine's wall time (best of 3 after a warm-up run, plant built outside the timing), its
right-hand-side evaluations, the reference's wall time (:mod:`reference_engine`: LSODA at
rtol 1e-6 with brentq inside the right-hand side, same physics, same sample grid evaluated),
wall time per simulated hour for both, the speed-up factor, and the agreement in distance,
energy drawn at the pack terminals and end state of charge. Then the peak resident memory of a
24-hour mission at 1 s samples, measured in a child process.

Targets (issue 11, fast engine): engine ≥ 50× faster per simulated hour than the reference;
the 10-hour hold ≤ 20 ms; each bundled mission ≤ 10 ms; peak RSS of the 24-hour mission
≤ 200 MB; agreement within 0.1 %.
"""

from __future__ import annotations

import argparse
import dataclasses
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(HERE))

from reference_engine import run_reference  # noqa: E402

from sim import api  # noqa: E402
from sim.engine.mission import MissionRunner  # noqa: E402
from sim.engine.model import VesselModel  # noqa: E402

HOLD = """
[scenario]
name = "bench: {hours} hours at a held speed"
vessel = "{vessel}"
[water]
salinity = 35.0
temperature = "15 degC"
[start]
state_of_charge = 1.0
[output]
sample = "{sample}"
[limits]
time = "{limit} h"
[[leg]]
name = "hold"
speed = "{speed}"
until = {{ duration = "{hours} h" }}
"""

TARGET_SPEEDUP = 50.0
TARGET_AGREE = 1e-3
TARGET_RSS_MB = 200.0
RSS_CASE = {"vessel": "glasswort-drone.toml", "speed": "0.5 kn", "hours": 24, "sample": "1 s"}


def hold_file(folder: Path, vessel: str, speed: str, hours: int, sample: str) -> Path:
    p = folder / f"hold-{Path(vessel).stem}-{hours}h.toml"
    p.write_text(
        HOLD.format(
            vessel=(ROOT / "vessels" / vessel).as_posix(),
            speed=speed,
            hours=hours,
            limit=hours + 1,
            sample=sample,
        )
    )
    return p


def best_of(fn, n: int = 3):
    fn()  # warm-up
    best, out = float("inf"), None
    for _ in range(n):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def rel(a: float, b: float) -> float:
    return abs(b - a) / max(abs(a), 1e-300)


def run_case(
    label: str, path: Path, target_s: float | None, n: int, method=None, rtol=None
) -> dict:
    loaded = api.load_scenario(path)
    plant = api.plant_for(loaded)
    spec = loaded.mission_spec
    if method or rtol:
        solver = dataclasses.replace(
            spec.solver, method=method or spec.solver.method, rtol=rtol or spec.solver.rtol
        )
        spec = dataclasses.replace(spec, solver=solver)
    t_eng, res = best_of(lambda: MissionRunner(plant, spec).run(), n)
    t_ref, ref = best_of(lambda: run_reference(plant, spec, sample_s=spec.sample_s), n)
    s = res.summary
    hours = float(s["duration_s"]) / 3600.0
    agree = {
        "distance": rel(float(s["distance_m"]), ref.distance_m),
        "energy": rel(float(s["energy_out_j"]), ref.energy_j),
        "end SOC": rel(float(s["end_state_of_charge"]), ref.end_soc),
    }
    return {
        "label": label,
        "hours": hours,
        "t_eng": t_eng,
        "rhs_eng": res.rhs_calls,
        "t_ref": t_ref,
        "rhs_ref": ref.rhs_calls,
        "steps_ref": ref.steps,
        "agree": agree,
        "target_s": target_s,
        "ending": res.ending_reason,
    }


def rss_child(write_log: bool) -> None:
    """Child process: fly the 24-hour mission at 1 s samples, print the peak RSS [MiB]."""
    base = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    with tempfile.TemporaryDirectory() as d:
        p = hold_file(Path(d), **RSS_CASE)
        loaded = api.load_scenario(p)
        if write_log:
            out = api.run_scenario(loaded, out=Path(d) / "log.h5")
        else:
            out = api.run_scenario(loaded, write_log=False)
        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
        r = out.result
        print(
            f"{peak:.1f} {base:.1f} {len(r.series['time_s'])} {r.summary['duration_s']:.0f} "
            f"{r.ending_reason.replace(' ', '_')}"
        )


def time_shares(path: Path) -> dict:
    """One more engine run of a case with the model's algebra timed (its physics: thrusters,
    pack, hull, thermal) against the rest (integrator, right-hand-side assembly, conditions,
    sample rows, summary): the rest bounds what a faster physics alone can give."""
    loaded = api.load_scenario(path)
    plant = api.plant_for(loaded)
    spec = loaded.mission_spec
    MissionRunner(plant, spec).run()
    spent = [0.0, 0]
    inner = VesselModel._evaluate

    def timed(self, y):
        t0 = time.perf_counter()
        try:
            return inner(self, y)
        finally:
            spent[0] += time.perf_counter() - t0
            spent[1] += 1

    VesselModel._evaluate = timed
    try:
        t0 = time.perf_counter()
        MissionRunner(plant, spec).run()
        total = time.perf_counter() - t0
    finally:
        VesselModel._evaluate = inner
    return {"total": total, "physics": spent[0], "evaluations": spent[1]}


def mark(ok: bool) -> str:
    return "ok " if ok else "MISS"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rss-child", choices=("log", "nolog"), help=argparse.SUPPRESS)
    ap.add_argument("-n", type=int, default=3, help="timed repeats after the warm-up (best of)")
    ap.add_argument("--method", help="the engine's [solver] method (default: each file's)")
    ap.add_argument("--rtol", type=float, help="the engine's rtol (default: each file's)")
    ap.add_argument("--no-rss", action="store_true", help="skip the memory measurement")
    ap.add_argument(
        "--rss-only", action="store_true", help="only the memory measurement (no timing cases)"
    )
    args = ap.parse_args()
    if args.rss_child:
        rss_child(args.rss_child == "log")
        return
    if not args.rss_only:
        timing(args)
    for how in () if args.no_rss else ("log", "nolog"):
        rss_line(how)


def timing(args: argparse.Namespace) -> None:
    """Run the timing cases against the reference and print the table and the targets."""
    with tempfile.TemporaryDirectory() as d:
        folder = Path(d)
        cases = [
            (
                "10-h hold, Glasswort 0.8 kn",
                hold_file(folder, "glasswort-drone.toml", "0.8 kn", 10, "60 s"),
                0.020,
            ),
            (
                "10-h hold, Halite 5 kn",
                hold_file(folder, "halite-concept.toml", "5 kn", 10, "60 s"),
                0.020,
            ),
            ("glasswort-survey.toml", ROOT / "scenarios" / "glasswort-survey.toml", 0.010),
            ("halite-coastal-trial.toml", ROOT / "scenarios" / "halite-coastal-trial.toml", 0.010),
        ]
        rows = [
            run_case(label, path, target, args.n, args.method, args.rtol)
            for label, path, target in cases
        ]
        shares = [time_shares(path) for _, path, _ in cases]
    print("brinebolt engine vs the obvious implementation (LSODA rtol 1e-6 + brentq in the RHS)")
    print(f"best of {args.n} after a warm-up; wall seconds; per simulated hour in ms\n")
    head = (
        f"{'case':30s} {'sim h':>6s} {'engine s':>9s} {'eng rhs':>8s} {'ref s':>8s} "
        f"{'ref rhs':>8s} {'eng ms/h':>9s} {'ref ms/h':>9s} {'speed-up':>9s}"
    )
    print(head)
    print("-" * len(head))
    for r in rows:
        print(
            f"{r['label']:30s} {r['hours']:6.2f} {r['t_eng']:9.4f} {r['rhs_eng']:8d} "
            f"{r['t_ref']:8.4f} {r['rhs_ref']:8d} {1e3 * r['t_eng'] / r['hours']:9.2f} "
            f"{1e3 * r['t_ref'] / r['hours']:9.2f} {r['t_ref'] / r['t_eng']:8.2f}x"
        )
    print("\nagreement (|engine − reference| / |engine|) and targets")
    for r in rows:
        worst = max(r["agree"].values())
        parts = "  ".join(f"{k} {v:.1e}" for k, v in r["agree"].items())
        speed = r["t_ref"] / r["t_eng"]
        print(f"  {r['label']:30s} {parts}   [{mark(worst <= TARGET_AGREE)} ≤ 1e-3]")
        print(
            f"  {'':30s} speed-up {speed:7.2f}x  [{mark(speed >= TARGET_SPEEDUP)} ≥ "
            f"{TARGET_SPEEDUP:g}x]   engine {1e3 * r['t_eng']:8.1f} ms  "
            f"[{mark(r['t_eng'] <= r['target_s'])} ≤ {1e3 * r['target_s']:g} ms]"
        )
    print(
        "\nwhere the engine's time goes (one more run each; the model's algebra timed, so the "
        "timer's own cost is in it)"
    )
    for r, sh in zip(rows, shares, strict=True):
        rest = sh["total"] - sh["physics"]
        print(
            f"  {r['label']:30s} physics {1e3 * sh['physics']:6.1f} ms "
            f"({100 * sh['physics'] / sh['total']:3.0f} %, {sh['evaluations']} evaluations, "
            f"{1e6 * sh['physics'] / max(sh['evaluations'], 1):5.1f} µs each)   the rest "
            f"{1e3 * rest:6.1f} ms: with the physics free the engine would still take "
            f"{1e3 * rest:.0f} ms"
        )


def rss_line(how: str) -> None:
    """Measure the 24-hour mission's peak RSS in a child process (``how``: log / nolog)."""
    proc = subprocess.run(
        [sys.executable, str(Path(__file__).resolve()), "--rss-child", how],
        capture_output=True,
        text=True,
        check=True,
    )
    peak, base, n_rows, dur, ending = proc.stdout.split()
    what = "HDF5 log written" if how == "log" else "no log"
    print(
        f"\npeak RSS, {RSS_CASE['hours']}-h hold of the Glasswort at {RSS_CASE['speed']}, "
        f"{RSS_CASE['sample']} samples, {what} ({n_rows} rows, {float(dur) / 3600:.1f} h, "
        f"{ending.replace('_', ' ')}): {float(peak):.0f} MiB (after imports "
        f"{float(base):.0f} MiB)  [{mark(float(peak) <= TARGET_RSS_MB)} ≤ {TARGET_RSS_MB:g} MB]"
    )


if __name__ == "__main__":
    main()
