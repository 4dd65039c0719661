"""Start-up and whole-command wall times (run: python3 benchmarks/bench_startup.py).

Prints the best of several runs of each command as a user types it; nothing here is a test.
Targets (idle 2-core machine): ``brinebolt --help`` ≤ 0.3 s, ``brinebolt check FILE`` ≤ 0.4 s,
the README's demo run ≤ 0.8 s.
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def best_of(cmd: list[str], n: int = 5) -> float:
    best = float("inf")
    for _ in range(n):
        t0 = time.perf_counter()
        proc = subprocess.run(cmd, cwd=ROOT, capture_output=True, text=True, check=False)
        dt = time.perf_counter() - t0
        if proc.returncode not in (0, 3):
            raise SystemExit(f"{' '.join(cmd)} failed ({proc.returncode}):\n{proc.stderr}")
        best = min(best, dt)
    return best


def main() -> None:
    py = sys.executable
    with tempfile.TemporaryDirectory() as d:
        rows = [
            ("brinebolt --help", [py, "-m", "sim.cli", "--help"], 0.3),
            (
                "brinebolt check vessels/glasswort-drone.toml",
                [py, "-m", "sim.cli", "check", "vessels/glasswort-drone.toml"],
                0.4,
            ),
            (
                "brinebolt run scenarios/glasswort-survey.toml",
                [
                    py,
                    "-m",
                    "sim.cli",
                    "run",
                    "scenarios/glasswort-survey.toml",
                    "--out",
                    str(Path(d) / "demo.h5"),
                    "--force",
                ],
                0.8,
            ),
        ]
        print(f"{'command':<52} {'best [s]':>9} {'target [s]':>11}")
        for label, cmd, target in rows:
            t = best_of(cmd)
            flag = "" if t <= target else "  (over target)"
            print(f"{label:<52} {t:9.3f} {target:11.1f}{flag}")


if __name__ == "__main__":
    main()
