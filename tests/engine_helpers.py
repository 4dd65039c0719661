"""Small scenario files for engine tests, written next to the bundled vessels."""

from __future__ import annotations

import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
VESSELS = ROOT / "vessels"
SCENARIOS = ROOT / "scenarios"


def scenario_text(
    legs: str,
    *,
    vessel: str = "glasswort-drone.toml",
    water: str = 'salinity = 35.0\ntemperature = "15 degC"',
    limits: str = 'time = "2 h"',
    extra: str = "",
    start: str = "state_of_charge = 0.9",
    output: str = 'sample = "10 s"',
    solver: str = "",
) -> str:
    return f"""
[scenario]
name = "test"
vessel = "{(VESSELS / vessel).as_posix()}"

[water]
{water}

[start]
{start}

[output]
{output}

[solver]
{solver}

[limits]
{limits}

{legs}

{extra}
"""


def write_scenario(tmp_path: Path, legs: str, name: str = "s.toml", **kw) -> Path:
    p = tmp_path / name
    p.write_text(scenario_text(legs, **kw), encoding="utf-8")
    return p


# A run that is surely still going when a test signals it: three short legs end (and so flush the
# log) within a fraction of a second; the fourth would take minutes of wall time at a 1 s sample.
LONG_RUN = f"""
[scenario]
name = "long run for signal tests"
vessel = "{(VESSELS / "glasswort-drone.toml").as_posix()}"

[water]
salinity = 35
temperature = "15 degC"

[output]
sample = "1 s"

[limits]
time = "300 h"

[solver]
allow_large = true   # a million samples on purpose: the run must still be going when hit

[[leg]]
name = "a"
voltage = "12 V"
until = {{ duration = "20 s" }}

[[leg]]
name = "b"
voltage = "8 V"
until = {{ duration = "20 s" }}

[[leg]]
name = "c"
voltage = "6 V"
until = {{ duration = "20 s" }}

[[leg]]
name = "endless"
voltage = "3 V"
until = {{ duration = "300 h" }}
"""


def start_long_run(tmp_path: Path, env: dict | None = None) -> tuple[subprocess.Popen, Path, Path]:
    """Start ``brinebolt run`` on :data:`LONG_RUN` in a child process; (process, log path,
    incomplete log path)."""
    scenario = tmp_path / "long.toml"
    scenario.write_text(LONG_RUN, encoding="utf-8")
    out = tmp_path / "long.h5"
    proc = subprocess.Popen(
        [sys.executable, "-m", "sim.cli", "run", str(scenario), "--out", str(out), "--quiet"],
        cwd=tmp_path,
        env=env,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    return proc, out, tmp_path / "long.incomplete.h5"


def wait_for_samples(
    proc: subprocess.Popen, incomplete: Path, n_min: int = 3, legs_min: int = 0
) -> int:
    """Wait (at most 60 s) until the incomplete log holds ``n_min`` samples and ``legs_min``
    finished legs; the number of samples seen."""
    import h5py

    deadline = time.monotonic() + 60.0
    while time.monotonic() < deadline:
        assert proc.poll() is None, proc.communicate()
        if incomplete.exists():
            try:
                with h5py.File(incomplete, "r") as f:
                    n = len(f["series/time_s"])
                    legs = len(f["legs"]) if "legs" in f else 0
                if n >= n_min and legs >= legs_min:
                    return n
            except (OSError, KeyError):
                pass  # not there yet
        time.sleep(0.05)
    proc.kill()
    raise AssertionError("the run never flushed samples to its incomplete log")
