"""Crash safety of a real ``brinebolt run`` process: killed with SIGKILL (kill -9) or interrupted
with SIGINT (Ctrl-C) mid-run, it leaves ``<stem>.incomplete.h5``, a valid HDF5 file that plain
h5py reads, marked incomplete, with every channel as long as ``time_s`` and time increasing.
"""

from __future__ import annotations

import os
import signal
from pathlib import Path

import h5py
import numpy as np
import pytest
from engine_helpers import start_long_run, wait_for_samples

pytestmark = pytest.mark.skipif(os.name != "posix", reason="POSIX signals")


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
    proc, out, incomplete = start_long_run(tmp_path)
    # the log flushes by wall clock (every 2 s): wait until a snapshot shows the long leg begun,
    # so the kill lands mid-run
    n_seen = wait_for_samples(proc, incomplete, legs_min=3)
    proc.send_signal(signal.SIGKILL)
    proc.communicate(timeout=30)
    assert proc.returncode == -signal.SIGKILL
    assert not out.exists()
    with _check_incomplete(incomplete, n_seen) as f:
        assert f.attrs["ending_reason"] == ""  # it never got to say why: it was killed
        assert len(f["legs"]) >= 3


def test_ctrl_c_exits_130_and_keeps_the_incomplete_log(tmp_path):
    proc, out, incomplete = start_long_run(tmp_path)
    n_seen = wait_for_samples(proc, incomplete)
    proc.send_signal(signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=60)
    assert proc.returncode == 130, stderr
    assert "interrupted" in stderr and "partial log is kept" in stderr
    assert "Traceback" not in stdout + stderr
    assert not out.exists()
    with _check_incomplete(incomplete, n_seen) as f:
        assert f.attrs["ending_reason"].startswith("interrupted: KeyboardInterrupt")
