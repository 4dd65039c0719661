"""Fault tests of the HDF5 run log (sim/io/log.py), from the fault campaign of issue 10.

1. A full disk / file-size limit stops the writer with one LogWriteError; the last good snapshot
   stays a valid, marked ``*.incomplete.h5``; no HDF5 error flood, no crash.
2. maybe_flush() flushes by wall-clock time (first samples at once).
3. One writer per output path: a lock file; LogBusyError for a second writer; stale locks.
4. read_log() names the file, the dataset and the damage; zero samples are readable and
   RunLog.require_samples() refuses them.
5. A symbolic link at the output path is refused like a file and never followed.
"""

from __future__ import annotations

import errno
import gc
import json
import os
import pickle
import socket
import subprocess
import sys
import textwrap
import time
from collections.abc import Callable
from pathlib import Path

import h5py
import numpy as np
import pytest

import sim.io.log as log_mod
from sim.io.log import (
    LogBusyError,
    LogClosedError,
    LogExistsError,
    LogFormatError,
    LogWriteError,
    RunLogWriter,
    incomplete_path_for,
    lock_path_for,
    read_log,
)

REPO = Path(__file__).resolve().parents[1]
PROVENANCE = {
    "scenario_path": "scenarios/demo.toml",
    "scenario_text": "[mission]\n",
    "vessel_path": "vessels/demo.toml",
    "vessel_text": "[hull]\n",
    "solver": "{}",
}
SPECS = {
    "speed_m_s": ("m/s", "speed through water", None, "f8"),
    "thrust_n": ("N", "thrust of each thruster", ["port", "stbd"], "f8"),
    "leg": ("1", "index of the current leg", None, "i4"),
}


def _writer(path: Path, **kwargs: object) -> RunLogWriter:
    kwargs.setdefault("provenance", PROVENANCE)
    kwargs.setdefault("channel_specs", SPECS)
    kwargs.setdefault("created_utc", "2025-01-01T00:00:00+00:00")
    return RunLogWriter(path, **kwargs)  # type: ignore[arg-type]


def _samples(t: np.ndarray) -> dict[str, np.ndarray]:
    return {
        "time_s": t,
        "speed_m_s": np.sin(t),
        "thrust_n": np.column_stack([t, -t]),
        "leg": np.zeros(t.size, dtype=np.int32),
    }


def _names(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


# --------------------------------------------------------------------------------------------
# 1. Write failures
# --------------------------------------------------------------------------------------------

FSIZE_CHILD = textwrap.dedent(
    """
    import json, resource, signal, sys
    import numpy as np
    from sim.io.log import LogWriteError, RunLogWriter

    path, limit, mode = sys.argv[1], int(sys.argv[2]), sys.argv[3]
    signal.signal(signal.SIGXFSZ, signal.SIG_IGN)  # writes past the limit fail with EFBIG
    resource.setrlimit(resource.RLIMIT_FSIZE, (limit, limit))
    w = RunLogWriter(
        path,
        provenance={"scenario_path": "s", "scenario_text": "", "vessel_path": "v",
                    "vessel_text": "", "solver": "{}"},
        channel_specs={"speed_m_s": ("m/s", "speed", None, "f8")},
    )
    rng = np.random.default_rng(1)  # random values hardly compress: the file grows fast
    t0 = 0.0
    try:
        for k in range(10_000):
            t = t0 + 0.01 * np.arange(1, 2001)
            w.append({"time_s": t, "speed_m_s": rng.random(t.size)})
            w.add_event(float(t[-1]), "tick", 0, f"batch {k}")
            t0 = float(t[-1])
            w.flush()
    except LogWriteError as exc:
        if mode == "raise":
            raise
        print(json.dumps({
            "message": str(exc), "errno": exc.errno, "filename": exc.filename,
            "kept": str(exc.kept), "marked": exc.marked, "state": w.state,
            "on_disk": w.n_samples_on_disk, "abort": str(w.abort("after the failure")),
        }))
        sys.exit(3)
    sys.exit("the file-size limit was never reached")
    """
)


def _run_fsize_child(path: Path, mode: str) -> subprocess.CompletedProcess[str]:
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(REPO), os.environ.get("PYTHONPATH", "")]),
    }
    return subprocess.run(
        [sys.executable, "-c", FSIZE_CHILD, str(path), "300000", mode],
        capture_output=True,
        text=True,
        env=env,
        timeout=120,
    )


@pytest.mark.skipif(
    os.name != "posix" or not hasattr(__import__("signal"), "SIGXFSZ"),
    reason="RLIMIT_FSIZE and SIGXFSZ are POSIX",
)
def test_file_size_limit_stops_writer_with_one_clean_error(tmp_path: Path) -> None:
    # Regression test for issue 10 finding 1: a full disk gave tens of HDF5 tracebacks, then a
    # segfault (exit 139), and left the last snapshot unmarked.
    path = tmp_path / "run.h5"
    proc = _run_fsize_child(path, "catch")
    assert proc.returncode == 3, (proc.returncode, proc.stderr)
    assert proc.stderr == ""  # no HDF5 error stack, no "Exception ignored", nothing
    info = json.loads(proc.stdout)
    incomplete = incomplete_path_for(path)
    assert info["errno"] == errno.EFBIG
    assert info["filename"] == str(incomplete) + ".tmp"
    assert info["kept"] == str(incomplete) and info["marked"] is True
    assert info["state"] == "failed" and info["abort"] == str(incomplete)
    assert str(incomplete) + ".tmp" in info["message"]
    assert os.strerror(errno.EFBIG) in info["message"]
    assert (
        f"kept, marked incomplete with the write failure as its ending reason: {incomplete}"
        in (info["message"])
    )
    assert _names(tmp_path) == ["run.incomplete.h5"]  # no .tmp, lock released
    log = read_log(incomplete)
    assert not log.complete
    assert log.ending_reason.startswith(f"write failed: writing {incomplete}.tmp: File too large")
    assert log.n_samples == info["on_disk"] > 0
    assert np.all(np.diff(log.series["time_s"]) > 0)
    assert len(log.events) == log.n_samples // 2000  # events of the kept batches only


@pytest.mark.skipif(
    os.name != "posix" or not hasattr(__import__("signal"), "SIGXFSZ"),
    reason="RLIMIT_FSIZE and SIGXFSZ are POSIX",
)
def test_file_size_limit_uncaught_gives_one_traceback_and_no_crash(tmp_path: Path) -> None:
    proc = _run_fsize_child(tmp_path / "run.h5", "raise")
    assert proc.returncode == 1  # an ordinary uncaught exception, not 139 (SIGSEGV)
    assert "HDF5" not in proc.stderr and "Exception ignored" not in proc.stderr
    assert "Segmentation" not in proc.stderr
    last = proc.stderr.strip().splitlines()[-1]
    assert last.startswith("sim.io.log.LogWriteError: cannot write the run log")
    assert read_log(incomplete_path_for(tmp_path / "run.h5")).n_samples > 0


class _Disk:
    """Replace sim.io.log._write_file. The n-th write (n = 1, 2...) to ``path`` fails when
    ``fails(path, n)`` is true: half the bytes reach the file, then ENOSPC, like a full disk."""

    def __init__(self, monkeypatch: pytest.MonkeyPatch, fails: Callable[[Path, int], bool]):
        self.fails, self.calls, self.real = fails, 0, log_mod._write_file
        monkeypatch.setattr(log_mod, "_write_file", self)

    def __call__(self, path: Path, data: bytes) -> None:
        self.calls += 1
        if not self.fails(path, self.calls):
            self.real(path, data)
            return
        path.write_bytes(data[: len(data) // 2])
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC), str(path))


def test_full_disk_during_flush_when_marking_fails_too(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    w.append(_samples(np.arange(10.0)))
    w.flush()
    _Disk(monkeypatch, lambda _path, _n: True)  # every write fails, marking too
    w.append(_samples(np.arange(10.0, 20.0)))
    with pytest.raises(LogWriteError) as info:
        w.flush()
    exc = info.value
    assert isinstance(exc, OSError) and exc.errno == errno.ENOSPC
    assert exc.kept == exc.partial_log == w.incomplete_path and not exc.marked
    assert "No space left on device" in (exc.mark_error or "")
    text = str(exc)
    assert str(w.incomplete_path) + ".tmp" in text and "ENOSPC" in text
    assert "marking it failed too" in text and "ending_reason is empty" in text
    assert "Free some disk space" in text
    assert _names(tmp_path) == ["run.incomplete.h5"]  # both .tmp removed, lock released
    log = read_log(w.incomplete_path)  # the last good snapshot, intact and unmarked
    assert log.n_samples == 10 and log.ending_reason == ""
    # The writer stopped: it refuses more data, abort() only returns the kept snapshot.
    assert w.state == "failed"
    with pytest.raises(LogClosedError, match="write failure"):
        w.append(_samples(np.array([30.0])))
    assert w.abort("interrupted") == w.incomplete_path
    assert read_log(w.incomplete_path).ending_reason == ""
    # The error survives pickling (e.g. from a worker process) with its message.
    again = pickle.loads(pickle.dumps(exc))
    assert str(again) == text and again.errno == errno.ENOSPC and again.kept == exc.kept


def test_full_disk_during_close_keeps_and_marks_incomplete(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    w.append(_samples(np.arange(5.0)))
    w.flush()
    w.append(_samples(np.arange(5.0, 8.0)))
    # Only the final log fails to write; the marking rewrite of the incomplete log works.
    _Disk(monkeypatch, lambda p, _n: not p.name.endswith(".incomplete.h5.tmp"))
    with pytest.raises(LogWriteError) as info:
        w.close("mission complete")
    assert info.value.filename == str(path) + ".tmp" and info.value.marked
    assert not path.exists()
    assert _names(tmp_path) == ["run.incomplete.h5"]
    log = read_log(w.incomplete_path)
    assert not log.complete and log.n_samples == 5
    assert log.ending_reason.startswith(f"write failed: writing {path}.tmp: No space left")
    assert log.ending_reason.endswith("3 later sample(s) were not saved")


def test_full_disk_in_abort_marks_the_previous_snapshot(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    w = _writer(tmp_path / "run.h5")
    w.append(_samples(np.arange(4.0)))
    w.flush()
    w.append(_samples(np.arange(4.0, 9.0)))
    _Disk(monkeypatch, lambda _path, n: n == 1)  # the abort fails, the marking rewrite works
    with pytest.raises(LogWriteError) as info:
        w.abort("interrupted: KeyboardInterrupt")
    assert info.value.marked
    log = read_log(w.incomplete_path)
    assert log.n_samples == 4 and "5 later sample(s) were not saved" in log.ending_reason
    assert not lock_path_for(w.path).exists()


def test_first_snapshot_failure_leaves_nothing(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    _Disk(monkeypatch, lambda _path, _n: True)
    with pytest.raises(LogWriteError, match="No snapshot of this run was kept") as info:
        _writer(tmp_path / "run.h5")
    assert info.value.kept is None and info.value.partial_log is None
    assert _names(tmp_path) == []  # no incomplete log, no .tmp, no lock


def test_hdf5_error_while_building_a_snapshot_is_caught(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    w = _writer(tmp_path / "run.h5")
    w.append(_samples(np.arange(6.0)))
    w.flush()
    open_before = h5py.h5f.get_obj_count(h5py.h5f.OBJ_ALL, h5py.h5f.OBJ_ALL)
    real = log_mod._create_group

    def broken(parent: h5py.Group, name: str) -> h5py.Group:
        if name == "summary":
            raise RuntimeError("synthetic HDF5 failure")
        return real(parent, name)

    monkeypatch.setattr(log_mod, "_create_group", broken)
    w.append(_samples(np.arange(6.0, 9.0)))
    with pytest.raises(LogWriteError, match="RuntimeError: synthetic HDF5 failure") as info:
        w.flush()
    assert info.value.errno is None
    assert not info.value.marked  # the marking rewrite hits the same failure
    # Every HDF5 object of the failed in-memory files was closed.
    assert h5py.h5f.get_obj_count(h5py.h5f.OBJ_ALL, h5py.h5f.OBJ_ALL) == open_before
    assert _names(tmp_path) == ["run.incomplete.h5"]
    assert read_log(w.incomplete_path).n_samples == 6


def test_unwritable_folder_is_a_write_error(tmp_path: Path) -> None:
    with pytest.raises(LogWriteError, match="creating the lock file") as info:
        _writer(tmp_path / "no" / "such" / "folder" / "run.h5")
    assert info.value.errno == errno.ENOENT


# --------------------------------------------------------------------------------------------
# 2. Wall-clock flushing
# --------------------------------------------------------------------------------------------


class _Clock:
    def __init__(self) -> None:
        self.now = 1000.0

    def __call__(self) -> float:
        return self.now


def _on_disk(w: RunLogWriter) -> int:
    with h5py.File(w.incomplete_path, "r") as f:
        return int(f["series/time_s"].shape[0])


def test_maybe_flush_by_wall_clock(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # Regression test for issue 10 finding 2: a long run killed after 9 s kept zero samples.
    clock = _Clock()
    monkeypatch.setattr(log_mod, "_monotonic", clock)
    w = _writer(tmp_path / "run.h5", flush_interval_s=2.0)
    assert w.flush_interval_s == 2.0
    assert not w.maybe_flush()  # nothing new since the snapshot taken at construction
    w.add_event(0.0, "start", -1, "")
    assert not w.maybe_flush()  # within the interval and still no samples
    w.append(_samples(np.array([0.0, 0.5])))
    assert w.maybe_flush() and _on_disk(w) == 2  # the first samples go to disk at once
    w.append(_samples(np.array([1.0])))
    clock.now += 1.9
    assert not w.maybe_flush() and _on_disk(w) == 2
    clock.now += 0.2  # 2.1 s after the last flush
    assert w.maybe_flush() and _on_disk(w) == 3
    assert w.n_samples_on_disk == 3
    clock.now += 5.0
    assert not w.maybe_flush()  # time passed but nothing new
    w.add_leg(
        index=0,
        name="a",
        t_start_s=0.0,
        t_end_s=1.0,
        distance_m=1.0,
        energy_j=1.0,
        mean_speed_m_s=1.0,
        ending="done",
    )
    assert w.maybe_flush()  # a new leg counts as new content
    w.close("done")
    with pytest.raises(LogClosedError):
        w.maybe_flush()


def test_maybe_flush_backs_off_when_flushing_is_slow(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    clock = _Clock()
    monkeypatch.setattr(log_mod, "_monotonic", clock)
    real = log_mod._write_file

    def slow(path: Path, data: bytes) -> None:
        clock.now += 3.0  # this disk takes 3 s per snapshot
        real(path, data)

    w = _writer(tmp_path / "run.h5", flush_interval_s=2.0)
    monkeypatch.setattr(log_mod, "_write_file", slow)
    w.append(_samples(np.array([0.0])))
    assert w.maybe_flush()
    w.append(_samples(np.array([1.0])))
    clock.now += 11.0  # more than the interval, less than 4 x 3 s
    assert not w.maybe_flush()
    clock.now += 1.5
    assert w.maybe_flush()
    w.close("done")


def test_zero_interval_flushes_every_call_and_bad_intervals_are_refused(
    tmp_path: Path,
) -> None:
    w = _writer(tmp_path / "run.h5", flush_interval_s=0.0)
    for k in range(3):
        w.append(_samples(np.array([float(k)])))
        assert w.maybe_flush() and _on_disk(w) == k + 1
    w.close("done")
    for bad in (-1.0, float("nan"), float("inf")):
        with pytest.raises(ValueError, match="flush_interval_s"):
            _writer(tmp_path / "bad.h5", flush_interval_s=bad)
    assert _names(tmp_path) == ["run.h5"]


# --------------------------------------------------------------------------------------------
# 3. One writer per output path
# --------------------------------------------------------------------------------------------


def test_second_writer_on_same_path_is_busy(tmp_path: Path) -> None:
    # Regression test for issue 10 finding 3: two runs on one path collided on the .tmp file.
    path = tmp_path / "run.h5"
    first = _writer(path)
    first.append(_samples(np.arange(3.0)))
    first.flush()
    lock = lock_path_for(path)
    assert first.lock_path == lock == tmp_path / "run.h5.lock"
    held = json.loads(lock.read_text())
    assert held["pid"] == os.getpid() and held["host"] == socket.gethostname()
    for overwrite in (False, True):  # --force does not take a live writer's lock either
        with pytest.raises(LogBusyError) as info:
            _writer(path, overwrite=overwrite)
        exc = info.value
        assert isinstance(exc, LogExistsError) and isinstance(exc, FileExistsError)
        assert exc.path == path and exc.pid == os.getpid() and exc.lock_path == lock
        assert str(path) in str(exc) and f"pid {os.getpid()}" in str(exc)
    # The first writer was not disturbed.
    first.append(_samples(np.arange(3.0, 5.0)))
    first.close("done")
    assert read_log(path).n_samples == 5
    assert not lock.exists()  # released on close
    second = _writer(path, overwrite=True)
    second.abort("stopped")
    assert not lock.exists()  # released on abort


def test_stale_lock_of_a_dead_process_is_taken_over(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()  # reaped: its pid no longer runs
    lock = lock_path_for(path)
    lock.write_text(json.dumps({"pid": dead.pid, "host": socket.gethostname(), "token": "old"}))
    w = _writer(path)
    assert len(w.notes) == 1
    assert "stale lock" in w.notes[0] and f"pid {dead.pid}" in w.notes[0]
    assert json.loads(lock.read_text())["pid"] == os.getpid()
    w.close("done")
    assert _names(tmp_path) == ["run.h5"]


def test_locks_that_cannot_be_checked_are_respected(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    lock = lock_path_for(path)
    lock.write_text(json.dumps({"pid": 4242, "host": "some-other-host", "token": "t"}))
    with pytest.raises(LogBusyError, match="pid 4242 on host 'some-other-host'") as info:
        _writer(path)
    assert info.value.host == "some-other-host"
    lock.write_text("")  # a writer between creating its lock and writing its pid
    with pytest.raises(LogBusyError, match="cannot be read") as info:
        _writer(path)
    assert info.value.pid is None
    old = time.time() - 3600.0
    os.utime(lock, (old, old))  # unreadable and an hour old: a writer died there
    w = _writer(path)
    assert "unreadable lock file" in w.notes[0]
    w.close("done")
    assert _names(tmp_path) == ["run.h5"]


def test_lock_released_when_refused_or_dropped(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    path.write_bytes(b"an earlier result")
    with pytest.raises(LogExistsError):
        _writer(path)
    assert _names(tmp_path) == ["run.h5"]  # the refusal left no lock behind
    other = tmp_path / "other.h5"
    w = _writer(other)
    assert lock_path_for(other).exists()
    del w
    gc.collect()
    assert not lock_path_for(other).exists()  # a writer dropped without close() lets go
    assert incomplete_path_for(other).exists()  # ...and its incomplete log stays


def test_lock_name_is_refused_as_a_log_name(tmp_path: Path) -> None:
    with pytest.raises(ValueError, match=r"\.lock"):
        _writer(tmp_path / "run.h5.lock")


# --------------------------------------------------------------------------------------------
# 4. Damaged and early logs
# --------------------------------------------------------------------------------------------


def _good_log(path: Path, n: int = 8) -> Path:
    w = _writer(path)
    w.append(_samples(np.arange(float(n))))
    w.add_event(1.0, "start", 0, "go")
    w.add_leg(
        index=0,
        name="a",
        t_start_s=0.0,
        t_end_s=2.0,
        distance_m=3.0,
        energy_j=4.0,
        mean_speed_m_s=1.5,
        ending="done",
    )
    w.set_summary({"distance_m": 3.0}, {"distance_m": "m"})
    return w.close("done")


def _damaged(tmp_path: Path, edit: Callable[[h5py.File], object]) -> Path:
    path = _good_log(tmp_path / "damaged.h5")
    with h5py.File(path, "r+") as f:
        edit(f)
    return path


def _replace(f: h5py.File, name: str, data: object, **kwargs: object) -> None:
    del f[name]
    f.create_dataset(name, data=data, **kwargs)


def _events_with_text_leg() -> np.dtype:
    s = h5py.string_dtype()
    return np.dtype([("time_s", "<f8"), ("kind", s), ("leg", s), ("message", s)])


def _set_value(name: str, index: object, value: float) -> Callable[[h5py.File], None]:
    def edit(f: h5py.File) -> None:
        f[name][index] = value

    return edit


def _set_field(name: str, field: str, value: float) -> Callable[[h5py.File], None]:
    def edit(f: h5py.File) -> None:
        rows = f[name][()]
        rows[field][0] = value
        f[name][...] = rows

    return edit


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        # a missing dataset or group
        (lambda f: f.__delitem__("series/time_s"), "dataset /series/time_s is missing"),
        (lambda f: f.__delitem__("events"), "dataset /events is missing"),
        (lambda f: f.__delitem__("legs"), "dataset /legs is missing"),
        (lambda f: f.__delitem__("series"), "group /series is missing"),
        (lambda f: f.__delitem__("summary"), "group /summary is missing"),
        # text where numbers belong
        (
            lambda f: _replace(f, "series/time_s", [str(x) for x in range(8)]),
            "dataset /series/time_s holds text, expected numbers",
        ),
        # wrong-typed events
        (lambda f: _replace(f, "events", np.arange(3.0)), "dataset /events is not a table"),
        (
            lambda f: _replace(
                f,
                "events",
                np.array([(1.0, "start", "zero", "go")], dtype=_events_with_text_leg()),
            ),
            "dataset /events field 'leg' holds text, expected integer",
        ),
        (
            lambda f: _replace(
                f, "events", np.array([(1.0, 0)], dtype=[("time_s", "<f8"), ("leg", "<i4")])
            ),
            "dataset /events has no field 'kind'",
        ),
        # NaN or infinity in a series, in a table, in the summary
        (_set_value("series/speed_m_s", 3, np.nan), "dataset /series/speed_m_s sample 3 is nan"),
        (
            _set_value("series/thrust_n", (2, 1), np.inf),
            "dataset /series/thrust_n sample 2 column 'stbd' is inf",
        ),
        (_set_field("legs", "energy_j", np.nan), "dataset /legs row 0 field 'energy_j' is nan"),
        (
            lambda f: f["summary"].attrs.__setitem__("distance_m", np.nan),
            "attribute /summary 'distance_m' is nan",
        ),
        # other damage
        (_set_value("series/time_s", 5, 1.0), "/series/time_s decreases at sample 5"),
        (
            lambda f: _replace(f, "series/speed_m_s", np.zeros(5)),
            "dataset /series/speed_m_s has 5 samples, /series/time_s has 8",
        ),
        (
            lambda f: f["summary"].attrs.__setitem__("units", "{oops"),
            "attribute /summary 'units' is not JSON text",
        ),
        (
            lambda f: f["series/thrust_n"].attrs.__delitem__("columns"),
            "dataset /series/thrust_n has 2 dimensions but no 'columns' attribute",
        ),
    ],
    ids=[
        "no-time_s",
        "no-events",
        "no-legs",
        "no-series",
        "no-summary",
        "text-in-time_s",
        "events-not-a-table",
        "events-text-leg",
        "events-missing-field",
        "nan-in-series",
        "inf-in-thruster-column",
        "nan-in-legs",
        "nan-in-summary",
        "time-backwards",
        "unequal-lengths",
        "bad-units-json",
        "no-columns-attr",
    ],
)
def test_damaged_log_names_file_dataset_and_damage(
    tmp_path: Path, edit: Callable[[h5py.File], object], message: str
) -> None:
    # Regression test for issue 10 finding 4: readers exited 1 (internal error) on these.
    path = _damaged(tmp_path, edit)
    with pytest.raises(LogFormatError) as info:
        read_log(path)
    text = str(info.value)
    assert text.startswith(f"{path}: damaged run log: ")
    assert message in text


def test_log_with_zero_samples_reads_but_require_samples_refuses(tmp_path: Path) -> None:
    # What a kill in the first second leaves: the empty snapshot taken at construction.
    path = tmp_path / "run.h5"
    w = _writer(path)
    w.add_event(0.0, "start", -1, "run started")
    w.flush()
    log = read_log(w.incomplete_path)
    assert log.n_samples == 0 and not log.complete
    assert log.series["thrust_n"].shape == (0, 2)
    with pytest.raises(LogFormatError) as info:
        log.require_samples()
    assert str(info.value) == (
        f"{w.incomplete_path}: the log holds no samples yet (the run was stopped in its first "
        "second?)"
    )
    w.append(_samples(np.array([0.0])))
    w.flush()
    one = read_log(w.incomplete_path)
    assert one.require_samples() is one
    with pytest.raises(LogFormatError, match="only 1 sample"):
        one.require_samples(2)
    w.abort("test over")


def test_reader_still_reads_good_logs_unchanged(tmp_path: Path) -> None:
    log = read_log(_good_log(tmp_path / "good.h5"))
    assert log.n_samples == 8 and log.complete
    assert log.events == [{"time_s": 1.0, "kind": "start", "leg": 0, "message": "go"}]
    assert log.summary == {"distance_m": 3.0} and log.summary_units == {"distance_m": "m"}


# --------------------------------------------------------------------------------------------
# 5. Symbolic links
# --------------------------------------------------------------------------------------------

posix_links = pytest.mark.skipif(os.name != "posix", reason="symbolic links need POSIX here")


@posix_links
def test_symlink_at_output_path_is_refused_like_a_file(tmp_path: Path) -> None:
    target = tmp_path / "elsewhere.h5"
    target.write_bytes(b"somebody's data")
    link = tmp_path / "run.h5"
    link.symlink_to(target)
    with pytest.raises(LogExistsError, match="symbolic link"):
        _writer(link)
    dangling = tmp_path / "dangling.h5"
    dangling.symlink_to(tmp_path / "nowhere.h5")
    with pytest.raises(LogExistsError, match="symbolic link"):
        _writer(dangling)
    assert not (tmp_path / "nowhere.h5").exists()
    incomplete_link = tmp_path / "other.incomplete.h5"
    incomplete_link.symlink_to(target)
    with pytest.raises(LogExistsError, match="interrupted run's log"):
        _writer(tmp_path / "other.h5")
    assert target.read_bytes() == b"somebody's data"
    assert sorted(_names(tmp_path)) == [
        "dangling.h5",
        "elsewhere.h5",
        "other.incomplete.h5",
        "run.h5",
    ]  # no lock left behind


@posix_links
def test_overwrite_replaces_the_link_not_its_target(tmp_path: Path) -> None:
    target = tmp_path / "elsewhere.h5"
    target.write_bytes(b"somebody's data")
    link = tmp_path / "run.h5"
    link.symlink_to(target)
    w = _writer(link, overwrite=True)
    w.append(_samples(np.arange(3.0)))
    w.close("done")
    assert not link.is_symlink() and read_log(link).complete
    assert target.read_bytes() == b"somebody's data"


@posix_links
def test_links_planted_at_temporary_names_are_not_followed(tmp_path: Path) -> None:
    victim = tmp_path / "victim.txt"
    victim.write_bytes(b"keep me")
    path = tmp_path / "run.h5"
    w = _writer(path)
    for tmp in (Path(f"{w.incomplete_path}.tmp"), Path(f"{path}.tmp")):
        tmp.symlink_to(victim)
    w.append(_samples(np.arange(3.0)))
    w.flush()
    w.close("done")
    assert victim.read_bytes() == b"keep me"
    assert _names(tmp_path) == ["run.h5", "victim.txt"]
