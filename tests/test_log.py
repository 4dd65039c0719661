"""Tests of the HDF5 run log (sim/io/log.py): round trips, refusals, crash safety, determinism.

The committed fixture ``tests/data/log_v1_small.h5`` was written by :func:`write_v1_fixture`
(run ``python tests/test_log.py --write-fixture`` from the repository root). Do not regenerate
it when the format changes: it is the record of what version 1 files look like, and the reader
must keep reading it.
"""

from __future__ import annotations

import itertools
import json
import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import h5py
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.io.log import (
    FORMAT_NAME,
    FORMAT_VERSION,
    ChannelSpec,
    LogClosedError,
    LogDataError,
    LogExistsError,
    LogFormatError,
    RunLogWriter,
    incomplete_path_for,
    read_log,
)

REPO = Path(__file__).resolve().parents[1]
FIXTURE = Path(__file__).with_name("data") / "log_v1_small.h5"
CREATED = "2025-01-01T00:00:00+00:00"
THRUSTERS = ["port", "stbd"]

PROVENANCE = {
    "scenario_path": "scenarios/harbour_loop.toml",
    "scenario_text": '[mission]\nname = "harbour loop"\n',
    "vessel_path": "vessels/test_skiff.toml",
    "vessel_text": '[hull]\nlength = "4.2 m"\n',
    "solver": json.dumps({"method": "RK45", "rtol": 1e-6, "max_step_s": 0.5}),
    "seed": 7,
    "sample_period_s": 0.5,
}

SPECS = {
    "speed_m_s": ("m/s", "speed through water", None, "f8"),
    "thrust_n": ("N", "thrust of each thruster", 2, "f8"),
    "leg": ("1", "index of the current leg", None, "i4"),
    "soc": ChannelSpec("1", "battery state of charge"),
}


def _samples(t: np.ndarray) -> dict[str, np.ndarray]:
    """Some smooth, deterministic data for every channel of SPECS."""
    return {
        "time_s": t,
        "speed_m_s": 1.5 * np.tanh(t / 10.0),
        "thrust_n": np.column_stack([40.0 + 0.1 * t, 41.0 - 0.05 * t]),
        "leg": (t // 20.0).astype(np.int32),
        "soc": 1.0 - 1e-4 * t,
    }


def _writer(path: Path, **kwargs: object) -> RunLogWriter:
    kwargs.setdefault("provenance", PROVENANCE)
    kwargs.setdefault("channel_specs", SPECS)
    kwargs.setdefault("columns", THRUSTERS)
    kwargs.setdefault("created_utc", CREATED)
    return RunLogWriter(path, **kwargs)  # type: ignore[arg-type]


def _fill(w: RunLogWriter, t: np.ndarray, pieces: int = 3) -> None:
    for part in np.array_split(t, pieces):
        w.append(_samples(part))
    w.add_event(0.0, "start", -1, "run started")
    w.add_event(20.0, "leg_start", 1, "leg 1 — to the buoy")
    w.add_leg(
        index=0,
        name="out",
        t_start_s=0.0,
        t_end_s=20.0,
        distance_m=25.5,
        energy_j=1.2e5,
        mean_speed_m_s=1.275,
        ending="waypoint reached",
    )
    w.set_summary(
        {"distance_m": 25.5, "duration_s": 20.0, "end_soc": 0.998, "ending_reason": "done"},
        {"distance_m": "m", "duration_s": "s", "end_soc": "1"},
    )


# --------------------------------------------------------------------------------------------
# Fixture of format version 1 (files outlive versions)
# --------------------------------------------------------------------------------------------

FIXTURE_T = np.arange(0.0, 3.0, 0.5)


def write_v1_fixture(path: Path) -> None:
    """Write the small committed version-1 fixture (only when creating it the first time)."""
    w = _writer(path, tool_version="0.1.0")
    _fill(w, FIXTURE_T)
    w.close("mission complete")


def test_reads_committed_v1_fixture() -> None:
    log = read_log(FIXTURE)
    assert log.format_version == 1
    assert log.complete is True
    assert log.ending_reason == "mission complete"
    assert log.attrs["format"] == "brinebolt-run-log"
    assert log.attrs["created_utc"] == CREATED
    assert log.attrs["seed"] == 7
    assert json.loads(log.attrs["solver"])["method"] == "RK45"  # type: ignore[arg-type]
    expected = _samples(FIXTURE_T)
    assert set(log.series) == set(expected)
    for name, values in expected.items():
        np.testing.assert_array_equal(log.series[name], values)
    assert log.series["leg"].dtype == np.int32
    assert log.columns == {"thrust_n": THRUSTERS}
    assert log.units["thrust_n"] == "N"
    assert log.events[1]["message"] == "leg 1 — to the buoy"
    assert log.legs[0]["ending"] == "waypoint reached"
    assert log.summary["end_soc"] == 0.998
    assert log.summary_units["distance_m"] == "m"
    # Plain h5py sees the documented layout.
    with h5py.File(FIXTURE, "r") as f:
        assert f.attrs["format_version"] == 1
        assert f["series/time_s"].attrs["units"] == "s"
        assert list(f["series/thrust_n"].attrs["columns"]) == THRUSTERS
        assert f["series/time_s"].compression == "gzip"
        assert f["series/time_s"].shuffle


def _layout(path: Path) -> dict[str, object]:
    """Everything of a file's format: each object's kind, dtype, shape, storage and attributes."""
    items: dict[str, object] = {}
    with h5py.File(path, "r") as f:

        def attrs(obj: h5py.HLObject) -> list[tuple[str, str, str]]:
            return sorted(
                (
                    k,
                    str(
                        obj.attrs[k].dtype if hasattr(obj.attrs[k], "dtype") else type(obj.attrs[k])
                    ),
                    repr(obj.attrs[k]),
                )
                for k in obj.attrs
            )

        items["/"] = attrs(f)

        def visit(name: str, obj: h5py.HLObject) -> None:
            if isinstance(obj, h5py.Dataset):
                items[name] = (
                    str(obj.dtype),
                    obj.shape,
                    obj.chunks,
                    obj.maxshape,
                    obj.compression,
                    obj.compression_opts,
                    obj.shuffle,
                    attrs(obj),
                )
            else:
                items[name] = ("group", attrs(obj))

        f.visititems(visit)
        items["superblock"] = f.id.get_create_plist().get_version()
    return items


def test_writer_still_writes_format_v1_like_the_fixture(tmp_path: Path) -> None:
    # The writer's internals changed (snapshots built in memory, issue 10); the files must not.
    path = tmp_path / "again.h5"
    write_v1_fixture(path)
    assert _layout(path) == _layout(FIXTURE)


# --------------------------------------------------------------------------------------------
# Round trips
# --------------------------------------------------------------------------------------------


def test_round_trip_all_channel_kinds(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    t = np.arange(0.0, 50.0, 0.25)
    for part in np.array_split(t, 4):
        w.append(_samples(part))
    # One more sample given in single-sample form: scalars and one row per thruster.
    w.append({"time_s": 50.0, "speed_m_s": 1.4, "thrust_n": [44.0, 38.0], "leg": 2, "soc": 0.99})
    assert w.n_samples == t.size + 1
    w.close("mission complete")

    log = read_log(path)
    expected = _samples(t)
    for name in expected:
        np.testing.assert_array_equal(log.series[name][:-1], expected[name])
    np.testing.assert_array_equal(log.series["thrust_n"][-1], [44.0, 38.0])
    assert log.series["time_s"].dtype == np.float64
    assert log.series["thrust_n"].shape == (t.size + 1, 2)
    assert log.series["leg"].dtype == np.int32
    assert log.units == {"time_s": "s", "speed_m_s": "m/s", "thrust_n": "N", "leg": "1", "soc": "1"}
    assert log.descriptions["soc"] == "battery state of charge"
    assert log.descriptions["time_s"]  # added automatically, with a description
    assert log.columns == {"thrust_n": THRUSTERS}
    assert next(iter(log.series)) == "time_s"


def test_events_legs_summary_and_provenance_round_trip(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    big_text = "# long scenario\n" + "x = 1\n" * 40_000  # 240 kB: beyond a 64 kB header message
    w = _writer(path, provenance={**PROVENANCE, "scenario_text": big_text})
    _fill(w, np.arange(0.0, 30.0, 0.5))
    w.add_event(25.0, "note", 1, "")
    w.set_summary(
        {"distance_m": 25.5, "legs_done": 1, "stopped": False, "ending_reason": "low SOC"},
        {"distance_m": "m"},
    )
    w.close("stop condition: soc < 0.2")

    log = read_log(path)
    assert log.attrs["scenario_text"] == big_text
    assert log.attrs["sample_period_s"] == 0.5
    assert log.ending_reason == "stop condition: soc < 0.2"
    assert log.events == [
        {"time_s": 0.0, "kind": "start", "leg": -1, "message": "run started"},
        {"time_s": 20.0, "kind": "leg_start", "leg": 1, "message": "leg 1 — to the buoy"},
        {"time_s": 25.0, "kind": "note", "leg": 1, "message": ""},
    ]
    assert log.legs == [
        {
            "index": 0,
            "name": "out",
            "t_start_s": 0.0,
            "t_end_s": 20.0,
            "distance_m": 25.5,
            "energy_j": 1.2e5,
            "mean_speed_m_s": 1.275,
            "ending": "waypoint reached",
        }
    ]
    assert log.summary == {
        "distance_m": 25.5,
        "legs_done": 1,
        "stopped": False,
        "ending_reason": "low SOC",
    }
    assert log.summary_units == {"distance_m": "m"}


def test_empty_log_round_trips(tmp_path: Path) -> None:
    w = _writer(tmp_path / "run.h5")
    w.close("no samples")
    log = read_log(tmp_path / "run.h5")
    assert log.series["time_s"].shape == (0,)
    assert log.series["thrust_n"].shape == (0, 2)
    assert log.events == [] and log.legs == [] and log.summary == {}


@settings(max_examples=25, deadline=None)
@given(
    n=st.integers(min_value=0, max_value=300),
    cuts=st.lists(st.integers(min_value=0, max_value=300), max_size=5),
    values=st.floats(min_value=-1e300, max_value=1e300, allow_nan=False),
)
def test_any_split_of_finite_data_round_trips(
    tmp_path_factory: pytest.TempPathFactory, n: int, cuts: list[int], values: float
) -> None:
    path = tmp_path_factory.mktemp("prop") / "run.h5"
    t = np.arange(n, dtype=float)
    data = _samples(t)
    data["speed_m_s"] = np.full(n, values)
    w = _writer(path)
    bounds = sorted({0, n, *(min(c, n) for c in cuts)})
    for a, b in itertools.pairwise(bounds):
        w.append({k: v[a:b] for k, v in data.items()})
    w.close("done")
    log = read_log(path)
    for name, v in data.items():
        np.testing.assert_array_equal(log.series[name], v)


def test_appended_arrays_are_copied_and_buffers_grow(tmp_path: Path) -> None:
    # The writer keeps growing buffers: many small appends (past several capacity doublings)
    # read back exactly, and changing the caller's arrays after append() changes nothing.
    path = tmp_path / "run.h5"
    t = np.arange(5000, dtype=float)
    w = _writer(path, flush_interval_s=0.0)
    for part in np.array_split(t, 37):
        block = _samples(part.copy())
        w.append(block)
        w.maybe_flush()
        for v in block.values():
            v[...] = 0
    w.close("done")
    log = read_log(path)
    for name, v in _samples(t).items():
        np.testing.assert_array_equal(log.series[name], v)


def test_to_dataframe_splits_thruster_columns(tmp_path: Path) -> None:
    pytest.importorskip("pandas")
    w = _writer(tmp_path / "run.h5")
    t = np.arange(0.0, 5.0, 1.0)
    w.append(_samples(t))
    w.close("done")
    df = read_log(tmp_path / "run.h5").to_dataframe()
    assert list(df.columns) == [
        "time_s",
        "leg",
        "soc",
        "speed_m_s",
        "thrust_n[port]",
        "thrust_n[stbd]",
    ]
    np.testing.assert_array_equal(df["thrust_n[stbd]"].to_numpy(), 41.0 - 0.05 * t)
    assert df.attrs["units"]["thrust_n[port]"] == "N"


# --------------------------------------------------------------------------------------------
# Refusals
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize("bad", [np.nan, np.inf, -np.inf])
def test_non_finite_sample_rejected_naming_channel(tmp_path: Path, bad: float) -> None:
    w = _writer(tmp_path / "run.h5")
    w.append(_samples(np.arange(5.0)))
    data = _samples(np.arange(5.0, 10.0))
    data["speed_m_s"][3] = bad
    with pytest.raises(LogDataError, match="speed_m_s") as info:
        w.append(data)
    assert (info.value.channel, info.value.index) == ("speed_m_s", 8)  # 5 earlier + row 3
    np.testing.assert_equal(info.value.value, bad)
    assert w.n_samples == 5  # nothing of the failed call is kept

    data = _samples(np.arange(5.0, 10.0))
    data["thrust_n"][1, 1] = bad
    with pytest.raises(LogDataError, match=r"thrust_n.*stbd") as info:
        w.append(data)
    assert (info.value.channel, info.value.column, info.value.index) == ("thrust_n", "stbd", 6)


def test_non_finite_event_leg_summary_rejected(tmp_path: Path) -> None:
    w = _writer(tmp_path / "run.h5")
    with pytest.raises(LogDataError, match="events/time_s"):
        w.add_event(float("nan"), "start", 0, "")
    with pytest.raises(LogDataError, match="legs/energy_j"):
        w.add_leg(
            index=0,
            name="a",
            t_start_s=0.0,
            t_end_s=1.0,
            distance_m=1.0,
            energy_j=float("inf"),
            mean_speed_m_s=1.0,
            ending="x",
        )
    with pytest.raises(LogDataError, match="summary/end_soc"):
        w.set_summary({"end_soc": float("nan")})
    with pytest.raises(LogDataError, match="provenance/gain"):
        _writer(tmp_path / "other.h5", provenance={**PROVENANCE, "gain": float("inf")})


def test_time_going_backwards_and_fractional_int_rejected(tmp_path: Path) -> None:
    w = _writer(tmp_path / "run.h5")
    w.append(_samples(np.arange(5.0)))
    with pytest.raises(LogDataError, match=r"time_s.*earlier"):
        w.append(_samples(np.array([4.0, 3.5])))
    data = _samples(np.array([5.0, 6.0]))
    data["leg"] = np.array([0.0, 0.5])
    with pytest.raises(LogDataError, match=r"leg.*whole number"):
        w.append(data)
    with pytest.raises(ValueError, match="missing channel"):
        w.append({"time_s": [7.0]})
    with pytest.raises(ValueError, match="unknown log channel"):
        w.append({**_samples(np.array([7.0])), "rpm": [1.0]})


def test_bad_specs_and_provenance_rejected(tmp_path: Path) -> None:
    with pytest.raises(ValueError, match="missing"):
        _writer(tmp_path / "a.h5", provenance={"scenario_path": "x"})
    with pytest.raises(ValueError, match="JSON"):
        _writer(tmp_path / "b.h5", provenance={**PROVENANCE, "solver": "RK45"})
    with pytest.raises(ValueError, match="dtype"):
        _writer(tmp_path / "c.h5", channel_specs={"rpm": ("1/min", "shaft speed", None, "i8")})
    with pytest.raises(ValueError, match="column names"):
        _writer(tmp_path / "d.h5", columns=None)
    with pytest.raises(ValueError, match="reserved"):
        _writer(tmp_path / "e.h5", provenance={**PROVENANCE, "complete": True})
    assert not list(tmp_path.iterdir())  # nothing written for a refused writer


def test_existing_log_not_overwritten_without_overwrite(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    path.write_bytes(b"an earlier result")
    with pytest.raises(LogExistsError, match="--force") as info:
        _writer(path)
    assert isinstance(info.value, FileExistsError)
    assert path.read_bytes() == b"an earlier result"
    assert not incomplete_path_for(path).exists()

    w = _writer(path, overwrite=True)
    w.append(_samples(np.arange(3.0)))
    w.flush()
    assert path.read_bytes() == b"an earlier result"  # replaced only when the run completes
    w.close("done")
    assert read_log(path).complete


def test_leftover_incomplete_log_not_overwritten(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    _writer(path).abort("interrupted: test")
    with pytest.raises(LogExistsError, match="interrupted"):
        _writer(path)
    assert read_log(incomplete_path_for(path)).ending_reason == "interrupted: test"
    _writer(path, overwrite=True).close("done")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["run.h5"]


def test_read_rejects_foreign_and_newer_files(tmp_path: Path) -> None:
    not_hdf5 = tmp_path / "notes.h5"
    not_hdf5.write_text("hello")
    with pytest.raises(LogFormatError, match="not a readable HDF5"):
        read_log(not_hdf5)
    foreign = tmp_path / "foreign.h5"
    with h5py.File(foreign, "w") as f:
        f.attrs["title"] = "someone else's data"
    with pytest.raises(LogFormatError, match="not a brinebolt run log"):
        read_log(foreign)
    newer = tmp_path / "newer.h5"
    _writer(newer).close("done")
    with h5py.File(newer, "r+") as f:
        f.attrs["format_version"] = FORMAT_VERSION + 1
    with pytest.raises(LogFormatError, match=r"version 2.*Upgrade"):
        read_log(newer)
    with pytest.raises(FileNotFoundError):
        read_log(tmp_path / "missing.h5")


# --------------------------------------------------------------------------------------------
# Crash safety: flush, close, abort
# --------------------------------------------------------------------------------------------


def test_flush_leaves_valid_incomplete_file(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    assert w.incomplete_path == tmp_path / "run.incomplete.h5"
    assert w.incomplete_path.exists()  # claimed at construction
    w.append(_samples(np.arange(10.0)))
    w.add_event(1.0, "start", 0, "go")
    w.flush()
    # No .tmp left; the lock file is held while the writer is open.
    assert sorted(p.name for p in tmp_path.iterdir()) == ["run.h5.lock", "run.incomplete.h5"]
    with h5py.File(w.incomplete_path, "r") as f:  # plain h5py, no brinebolt
        assert f.attrs["format"] == FORMAT_NAME
        assert not f.attrs["complete"]
        assert f.attrs["ending_reason"] == ""
        np.testing.assert_array_equal(f["series/time_s"][()], np.arange(10.0))
        assert f["events"].shape == (1,)
    w.append(_samples(np.arange(10.0, 15.0)))
    w.flush()
    log = read_log(w.incomplete_path)
    assert not log.complete and log.series["time_s"].size == 15
    with pytest.raises(FileNotFoundError, match="incomplete"):
        read_log(path)


def test_close_renames_and_removes_incomplete(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    _fill(w, np.arange(0.0, 30.0))
    w.flush()
    assert w.close("mission complete") == path
    assert sorted(p.name for p in tmp_path.iterdir()) == ["run.h5"]
    with h5py.File(path, "r") as f:
        assert f.attrs["complete"]
        assert f.attrs["ending_reason"] == "mission complete"
    with pytest.raises(LogClosedError):
        w.append(_samples(np.array([99.0])))
    w.abort("too late")  # no effect after close
    assert read_log(path).complete


def test_abort_keeps_incomplete(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    w = _writer(path)
    w.append(_samples(np.arange(4.0)))
    w.append(_samples(np.arange(4.0, 6.0)))  # not flushed yet: abort writes it too
    assert w.abort("interrupted: KeyboardInterrupt") == incomplete_path_for(path)
    assert not path.exists()
    log = read_log(incomplete_path_for(path))
    assert not log.complete
    assert log.ending_reason == "interrupted: KeyboardInterrupt"
    assert log.series["time_s"].size == 6


@pytest.mark.parametrize(
    ("exc", "reason"),
    [(KeyboardInterrupt, "interrupted: KeyboardInterrupt"), (ZeroDivisionError, "error: Zero")],
)
def test_context_manager_aborts_on_exception(
    tmp_path: Path, exc: type[BaseException], reason: str
) -> None:
    path = tmp_path / "run.h5"
    with pytest.raises(exc), _writer(path) as w:
        w.append(_samples(np.arange(3.0)))
        raise exc()
    log = read_log(incomplete_path_for(path))
    assert not log.complete and log.ending_reason.startswith(reason)
    assert log.series["time_s"].size == 3


def test_context_manager_without_close_is_not_complete(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    with _writer(path) as w:
        w.append(_samples(np.arange(3.0)))
    assert not path.exists()
    assert not read_log(incomplete_path_for(path)).complete
    with _writer(tmp_path / "ok.h5") as w:
        w.close("done")
    assert read_log(tmp_path / "ok.h5").complete


KILL_CHILD = textwrap.dedent(
    """
    import sys
    import numpy as np
    from sim.io.log import RunLogWriter

    w = RunLogWriter(
        sys.argv[1],
        provenance={"scenario_path": "s", "scenario_text": "", "vessel_path": "v",
                    "vessel_text": "", "solver": "{}"},
        channel_specs={"speed_m_s": ("m/s", "speed", None, "f8"),
                       "thrust_n": ("N", "thrust", ["port", "stbd"], "f8"),
                       "leg": ("1", "leg index", None, "i4")},
    )
    t0 = 0.0
    k = 0
    while True:
        t = t0 + 0.01 * np.arange(1, 2001)
        w.append({"time_s": t, "speed_m_s": np.sin(t), "thrust_n": np.column_stack([t, -t]),
                  "leg": np.full(t.size, k % 5)})
        w.add_event(float(t[-1]), "tick", k % 5, f"flush {k}")
        t0 = float(t[-1])
        w.flush()
        if k == 0:
            print("flushed", flush=True)
        k += 1
    """
)


@pytest.mark.skipif(os.name != "posix", reason="SIGKILL is POSIX")
def test_kill_9_leaves_valid_incomplete_log(tmp_path: Path) -> None:
    path = tmp_path / "run.h5"
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(REPO), os.environ.get("PYTHONPATH", "")]),
    }
    with subprocess.Popen(
        [sys.executable, "-c", KILL_CHILD, str(path)],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
        env=env,
    ) as proc:
        first = proc.stdout.readline() if proc.stdout else ""
        if first.strip() != "flushed":
            proc.kill()
            _, err = proc.communicate()
            pytest.fail(f"child did not start: {err}")
        time.sleep(1.0)  # the child flushes back to back: the kill lands at a random point
        os.kill(proc.pid, signal.SIGKILL)
        proc.communicate()
    assert proc.returncode == -signal.SIGKILL

    incomplete = incomplete_path_for(path)
    assert not path.exists()
    with h5py.File(incomplete, "r") as f:
        assert not f.attrs["complete"]
        assert f.attrs["ending_reason"] == ""
        t = f["series/time_s"][()]
        assert t.size >= 4000  # more than the first flush: the loop was running
        assert np.all(np.diff(t) > 0)
        for name in ("speed_m_s", "thrust_n", "leg"):
            assert f["series"][name].shape[0] == t.size
        assert f["events"].shape[0] == t.size // 2000
    assert read_log(incomplete).series["thrust_n"].shape == (t.size, 2)


# --------------------------------------------------------------------------------------------
# Determinism
# --------------------------------------------------------------------------------------------


def test_same_content_gives_identical_bytes(tmp_path: Path) -> None:
    t = np.arange(0.0, 60.0, 0.1)
    a, b = tmp_path / "a.h5", tmp_path / "b.h5"
    wa = _writer(a)
    _fill(wa, t, pieces=1)
    wa.close("done")
    # Other append pieces, other order of the spec dict, extra flushes: same bytes.
    wb = _writer(b, channel_specs=dict(reversed(list(SPECS.items()))))
    wb.flush()
    _fill(wb, t, pieces=7)
    wb.flush()
    wb.close("done")
    assert a.read_bytes() == b.read_bytes()

    # No object carries an HDF5 timestamp (they would differ between runs).
    with h5py.File(a, "r") as f:
        objects = [f]
        f.visititems(lambda _name, obj: objects.append(obj))
        for obj in objects:
            info = h5py.h5o.get_info(obj.id)
            assert (info.atime, info.mtime, info.ctime, info.btime) == (0, 0, 0, 0), obj.name


if __name__ == "__main__":
    if sys.argv[1:] == ["--write-fixture"]:
        if FIXTURE.exists():
            sys.exit(f"{FIXTURE} exists; it records format version 1 and is not regenerated")
        FIXTURE.parent.mkdir(parents=True, exist_ok=True)
        write_v1_fixture(FIXTURE)
        print(f"wrote {FIXTURE}")
    else:
        sys.exit("usage: python tests/test_log.py --write-fixture")
