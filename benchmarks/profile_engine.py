"""Where the engine's time goes on the 10-hour speed hold (run:
``python3 benchmarks/profile_engine.py``); the figures behind benchmarks/PROFILE.md.

Prints: a cProfile of one run (top functions by cumulative and by own time); RHS evaluations,
steps and wall time per simulated hour for RK45, LSODA and BDF at rtol 1e-5 … 1e-9 with the
end results (so that accuracy can be read beside cost); the eigenvalues (time constants) of
the finite-difference Jacobian of the right-hand side at the steady state of the hold. Nothing
here is a test; figures depend on the machine.
"""

from __future__ import annotations

import cProfile
import dataclasses
import io
import pstats
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(HERE))

from bench_missions import hold_file  # noqa: E402
from reference_engine import run_reference  # noqa: E402

from sim import api  # noqa: E402
from sim.engine.mission import MissionRunner  # noqa: E402
from sim.engine.model import ACC_NAMES  # noqa: E402
from sim.engine.spec import SolverSpec  # noqa: E402


class CountingRunner(MissionRunner):
    """MissionRunner that counts accepted steps per solve_ivp segment (steps = len(sol.t) − 1)."""

    steps = 0

    def _segment(self, t0, t1, y0, conds):
        out = super()._segment(t0, t1, y0, conds)
        self.steps += len(out[3].t) - 1
        return out


def profile(plant, spec) -> None:
    MissionRunner(plant, spec).run()  # warm-up
    pr = cProfile.Profile()
    pr.enable()
    res = MissionRunner(plant, spec).run()
    pr.disable()
    for key in ("cumulative", "tottime"):
        buf = io.StringIO()
        pstats.Stats(pr, stream=buf).strip_dirs().sort_stats(key).print_stats(22)
        text = buf.getvalue()
        start = text.find("   ncalls")
        print(f"--- cProfile, sorted by {key} (rhs calls {res.rhs_calls}) ---")
        print(text[start:].rstrip())
        print()


def sweep(plant, spec) -> None:
    hours = None
    print("--- cost against method and rtol (engine's own atol and max_step 600 s) ---")
    print(
        f"{'method':7s} {'rtol':>6s} {'steps':>7s} {'rhs':>7s} {'rhs/h':>8s} {'rhs/step':>8s}"
        f" {'wall s':>7s} {'distance m':>14s} {'energy J':>16s} {'end SOC':>12s}"
    )
    for method in ("RK45", "LSODA", "BDF"):
        for rtol in (1e-5, 1e-6, 1e-7, 1e-8, 1e-9):
            ms = dataclasses.replace(spec, solver=SolverSpec(rtol=rtol, method=method))
            run = CountingRunner(plant, ms)
            t0 = time.perf_counter()
            res = run.run()
            wall = time.perf_counter() - t0
            s = res.summary
            hours = float(s["duration_s"]) / 3600.0
            print(
                f"{method:7s} {rtol:6.0e} {run.steps:7d} {res.rhs_calls:7d} "
                f"{res.rhs_calls / hours:8.0f} {res.rhs_calls / max(run.steps, 1):8.2f} "
                f"{wall:7.3f} {s['distance_m']:14.6f} {s['energy_out_j']:16.3f} "
                f"{s['end_state_of_charge']:12.9f}"
            )
    print()


def jacobian(plant, spec) -> None:
    run = MissionRunner(plant, spec)
    res = run.run()  # the model keeps the hold's control (feed-forward, gains) afterwards
    model = run.model
    lay = model.lay
    y = res.final_state.copy()
    names = ["speed", "x_ground", "x_water", "SOC", "RC1", "RC2", "T_battery"]
    names += [f"T_magnet[{u.name}]" for u in plant.thrusters] + ["PI integral", *ACC_NAMES]
    keep = [0, 3, 4, 5, 6, *range(lay.i_mag, lay.i_mag + lay.n_thr), lay.i_pi]
    keep = [k for k in keep if not (k == 5 and plant.pack.n_rc < 2)]
    n = len(keep)
    jac = np.zeros((n, n))
    f0 = model.rhs(res.summary["duration_s"], y)
    for c, k in enumerate(keep):
        h = 1e-7 * max(abs(y[k]), 1e-3)
        yp, ym = y.copy(), y.copy()
        yp[k] += h
        ym[k] -= h
        jac[:, c] = (model.rhs(0.0, yp)[keep] - model.rhs(0.0, ym)[keep]) / (2.0 * h)
    lam, vec = np.linalg.eig(jac)
    order = np.argsort(-np.abs(lam))
    print("--- Jacobian at the end of the hold (finite differences, central, h = 1e-7·|y|) ---")
    print(
        f"state: V = {y[0]:.6f} m/s, SOC = {y[3]:.4f}, max |dy/dt| kept = "
        f"{np.max(np.abs(f0[keep])):.3e}"
    )
    print(
        f"control: ff {model.control.feedforward_v:.4f} V, kp {model.control.kp_v_per_m_s:.4g}"
        f" V/(m/s), ki {model.control.ki_v_per_m:.4g} V/m"
    )
    for i in order:
        mode = vec[:, i]
        dom = int(np.argmax(np.abs(mode)))
        tau = -1.0 / lam[i].real if lam[i].real != 0 else float("inf")
        print(
            f"  λ = {lam[i].real:+.4e} {lam[i].imag:+.4e}j 1/s   τ = {tau:12.4g} s   "
            f"dominant state {names[keep[dom]]}"
        )
    print("diagonal entries (own rates):")
    for c, k in enumerate(keep):
        print(f"  ∂f/∂y[{names[k]}] = {jac[c, c]:+.4e}")
    big = np.max(np.abs(lam))
    print(f"RK45 stability bound on the negative real axis |hλ| ≲ 3.3: h ≲ {3.3 / big:.3g} s,")
    print(f"  ≈ {3600 * big / 3.3 * 6:.0f} RHS/h at 6 evaluations per step (FSAL)")
    print()


def reference_sweep(plant, spec) -> None:
    print("--- the reference (same physics, brentq in the RHS) against method and restarts ---")
    chunk = spec.limits.time_s / 50.0  # the engine's progress chunk
    for method, rtol, ch in (
        ("LSODA", 1e-6, float("inf")),
        ("LSODA", 1e-6, chunk),
        ("BDF", 1e-6, float("inf")),
        ("RK45", 1e-6, float("inf")),
    ):
        t0 = time.perf_counter()
        r = run_reference(plant, spec, method=method, rtol=rtol, chunk_s=ch)
        wall = time.perf_counter() - t0
        print(
            f"  {method:6s} rtol {rtol:.0e} chunk {ch:7.0f} s: steps {r.steps:6d} rhs "
            f"{r.rhs_calls:6d}  wall {wall:6.3f} s  end SOC {r.end_soc:.9f}"
        )
    print()


def breakdown(label: str, path: Path) -> None:
    loaded = api.load_scenario(path)
    plant = api.plant_for(loaded)
    spec = loaded.mission_spec
    MissionRunner(plant, spec).run()
    pr = cProfile.Profile()
    pr.enable()
    res = MissionRunner(plant, spec).run()
    pr.disable()
    st = pstats.Stats(pr)
    total = 0.0
    parts = {}
    for (_file, _line, fn), (_cc, _nc, _tt, ct, _callers) in st.stats.items():
        if fn == "run" and _file.endswith("mission.py"):
            total = ct
        if fn == "rhs" and not _file.endswith("model.py"):
            continue  # the runner's wrapper of the same name
        if fn in ("solve_ivp", "sample_row", "_tune_speed_hold", "rhs", "g", "_record", "_result"):
            parts[fn] = parts.get(fn, 0.0) + ct
    print(
        f"  {label:28s} total {total:6.3f} s (under cProfile), rows "
        f"{len(res.series['time_s'])}: "
        + ", ".join(f"{k} {v / total:5.1%}" for k, v in sorted(parts.items()))
    )


def main() -> None:
    d = tempfile.mkdtemp()
    path_keep = hold_file(Path(d), "glasswort-drone.toml", "0.8 kn", 10, "60 s")
    loaded = api.load_scenario(path_keep)
    plant = api.plant_for(loaded)
    spec = loaded.mission_spec
    profile(plant, spec)
    sweep(plant, spec)
    jacobian(plant, spec)
    reference_sweep(plant, spec)
    print("--- share of run time (cumulative, overlapping: rhs is inside solve_ivp; g = events)")
    breakdown("10-h hold, Glasswort", path_keep)
    for name in ("glasswort-survey.toml", "halite-coastal-trial.toml"):
        breakdown(name, ROOT / "scenarios" / name)


if __name__ == "__main__":
    main()
