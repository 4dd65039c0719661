"""Crash safety of a real ``brinebolt run`` process: killed with SIGKILL (kill -9) or interrupted
with SIGINT (Ctrl-C) mid-run, it leaves ``<stem>.incomplete.h5``, a valid HDF5 file that plain
h5py reads, marked incomplete, with every channel as long as ``time_s`` and time increasing.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import h5py
import numpy as np
import pytest

ROOT = Path(__file__).resolve().parent.parent
GLASSWORT = (ROOT / "vessels" / "glasswort-drone.toml").as_posix()

pytestmark = pytest.mark.skipif(os.name != "posix", reason="POSIX signals")

# Three short legs end (and so flush the log) within a fraction of a second; the fourth would
# take minutes of wall time at a 1 s sample, so the process is surely still running when hit.
LONG = f"""
[scenario]
name = "long kill test"
vessel = "{GLASSWORT}"

[water]
salinity = 35
temperature = "15 degC"

[output]
sample = "1 s"

[limits]
time = "300 h"

[solver]
allow_large = true   # a million samples on purpose: the run must still be going when killed

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


def _start(tmp_path: Path) -> tuple[subprocess.Popen, Path, Path]:
    scenario = tmp_path / "long.toml"
    scenario.write_text(LONG, encoding="utf-8")
    out = tmp_path / "long.h5"
    proc = subprocess.Popen(
        [sys.executable, "-m", "sim.cli", "run", str(scenario), "--out", str(out), "--quiet"],
        cwd=tmp_path,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    return proc, out, tmp_path / "long.incomplete.h5"


def _wait_for_samples(
    proc: subprocess.Popen, incomplete: Path, n_min: int = 3, legs_min: int = 0
) -> int:
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


def _check_incomplete(path: Path, n_seen: int) -> h5py.File:
    f = h5py.File(path, "r")  # plain h5py, no brinebolt code
    assert f.attrs["format"] == "brinebolt-run-log"
    assert not bool(f.attrs["complete"])
    t = f["series/time_s"][()]
    assert len(t) >= n_seen
    assert np.all(np.diff(t) > 0)
    for name, ds in f["series"].items():
        assert ds.shape[0] == len(t), name
        if ds.dtype.kind == "f":
            assert np.isfinite(ds[()]).all(), name
    return f


def test_kill_9_leaves_a_readable_incomplete_log(tmp_path):
    proc, out, incomplete = _start(tmp_path)
    # the log flushes by wall clock (every 2 s): wait until a snapshot shows the long leg begun,
    # so the kill lands mid-run
    n_seen = _wait_for_samples(proc, incomplete, legs_min=3)
    proc.send_signal(signal.SIGKILL)
    proc.communicate(timeout=30)
    assert proc.returncode == -signal.SIGKILL
    assert not out.exists()
    with _check_incomplete(incomplete, n_seen) as f:
        assert f.attrs["ending_reason"] == ""  # it never got to say why: it was killed
        assert len(f["legs"]) >= 3


def test_ctrl_c_exits_130_and_keeps_the_incomplete_log(tmp_path):
    proc, out, incomplete = _start(tmp_path)
    n_seen = _wait_for_samples(proc, incomplete)
    proc.send_signal(signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=60)
    assert proc.returncode == 130, stderr
    assert "interrupted" in stderr and "partial log is kept" in stderr
    assert "Traceback" not in stdout + stderr
    assert not out.exists()
    with _check_incomplete(incomplete, n_seen) as f:
        assert f.attrs["ending_reason"].startswith("interrupted: KeyboardInterrupt")
