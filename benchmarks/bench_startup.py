"""Start-up and whole-command wall times (run: python3 benchmarks/bench_startup.py [-n N]).

Prints the best of N runs (default 5) of each command as a user types it, beside its target;
nothing here is a test. Targets (issue 11, idle 2-core machine): ``brinebolt --help`` ≤ 0.3 s,
``brinebolt check FILE`` ≤ 0.4 s, the README's demo run ≤ 0.8 s in total.

The commands run as an installed program runs them: compiled bytecode may be cached
(``PYTHONDONTWRITEBYTECODE`` is dropped from their environment and one untimed warm-up run
writes the caches); without that every start recompiles the package (≈ 0.07 s more).

To see where the time goes: ``python3 -X importtime -m sim.cli check FILE 2>imports.txt`` and
``python3 -m cProfile -s cumulative -m sim.cli run scenarios/glasswort-survey.toml``.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent

TARGETS_S = {"help": 0.3, "check": 0.4, "run": 0.8}
"""Wall-time targets [s] of issue 11 (an idle 2-core machine)."""


def _env() -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPATH"] = str(ROOT)  # this tree's sim, not an installed one
    return env


def best_of(cmd: list[str], n: int = 5) -> float:
    """Best wall time [s] of ``n`` runs of ``cmd`` after one untimed warm-up run."""
    best = float("inf")
    for i in range(n + 1):
        t0 = time.perf_counter()
        proc = subprocess.run(
            cmd, cwd=ROOT, env=_env(), capture_output=True, text=True, check=False
        )
        dt = time.perf_counter() - t0
        if proc.returncode not in (0, 3):
            raise SystemExit(f"{' '.join(cmd)} failed ({proc.returncode}):\n{proc.stderr}")
        if i > 0:
            best = min(best, dt)
    return best


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("-n", type=int, default=5, help="timed runs per command (best is shown)")
    n = ap.parse_args().n
    py = sys.executable
    cli = [py, "-m", "sim.cli"]
    with tempfile.TemporaryDirectory() as d:
        demo = str(Path(d) / "demo.h5")
        rows = [
            ("python3 -c pass (the interpreter alone)", [py, "-c", "pass"], None),
            ("brinebolt --help", [*cli, "--help"], "help"),
            (
                "brinebolt check vessels/glasswort-drone.toml",
                [*cli, "check", "vessels/glasswort-drone.toml"],
                "check",
            ),
            (
                "brinebolt check scenarios/glasswort-survey.toml",
                [*cli, "check", "scenarios/glasswort-survey.toml"],
                "check",
            ),
            (
                "brinebolt run scenarios/glasswort-survey.toml",
                [*cli, "run", "scenarios/glasswort-survey.toml", "--out", demo, "--force"],
                "run",
            ),
        ]
        load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
        print(f"best of {n} runs; {os.cpu_count()} CPUs, load average {load:.2f} at the start")
        print(f"{'command':<52} {'best [s]':>9} {'target [s]':>11}")
        for label, cmd, key in rows:
            t = best_of(cmd, n)
            if key is None:
                print(f"{label:<52} {t:9.3f} {'':>11}")
                continue
            target = TARGETS_S[key]
            flag = "  met" if t <= target else "  OVER TARGET"
            print(f"{label:<52} {t:9.3f} {target:11.1f}{flag}")


if __name__ == "__main__":
    main()
