"""The sampling grid of a run's log and the cost of a zero-speed hold (issue 10 fault campaign).

Every point k·sample of the grid from 0 to the end of the run is logged exactly once, whatever
ends the integration segments (leg ends, triggers, scheduled changes, progress chunks); the
instants of events are logged as well."""

from __future__ import annotations

from pathlib import Path

import numpy as np
from engine_helpers import write_scenario

from sim import api

ROOT = Path(__file__).resolve().parent.parent


def _grid_report(time_s: np.ndarray, sample_s: float) -> tuple[list[int], list[int]]:
    """(missing grid indices, duplicated grid indices) of a logged time series."""
    k = np.rint(time_s / sample_s)
    on = np.abs(time_s - k * sample_s) <= 1e-9 * np.maximum(1.0, time_s)
    ks = k[on].astype(int)
    n_end = int(np.floor(time_s[-1] / sample_s + 1e-9))
    missing = sorted(set(range(n_end + 1)) - set(ks.tolist()))
    uniq, counts = np.unique(ks, return_counts=True)
    return missing, uniq[counts > 1].tolist()


def _check_series(time_s: np.ndarray, sample_s: float) -> None:
    missing, dup = _grid_report(time_s, sample_s)
    assert missing == [] and dup == []
    assert np.all(np.diff(time_s) > 0)  # one row per instant, in order


def test_bundled_survey_logs_every_grid_point_once():
    # The survey has a schedule at 30 min and legs that end between grid points; its log once
    # missed t = 1800 s and 2880 s.
    out = api.run_scenario(ROOT / "scenarios" / "glasswort-survey.toml", write_log=False)
    t = out.result.series["time_s"]
    _check_series(t, 5.0)
    assert {1800.0, 2880.0} <= set(t.tolist())
    # the leg ends (between grid points) are logged too
    for leg in out.result.legs:
        assert leg["t_end_s"] in set(t.tolist())


def test_long_run_with_a_schedule_every_half_hour(tmp_path):
    # 2 h at 1 s with a hotel change every 1800 s: 7201 grid points, none missing or repeated.
    schedule = "\n".join(
        f'[[schedule]]\nat = "{k * 1800} s"\nhotel = "{40 + 5 * k} W"' for k in range(1, 5)
    )
    legs = """
[[leg]]
name = "cruise"
voltage = "8 V"
until = { distance = "100 km" }
"""
    p = write_scenario(
        tmp_path, legs, extra=schedule, output='sample = "1 s"', limits='time = "2 h"'
    )
    out = api.run_scenario(p, write_log=False)
    t = out.result.series["time_s"]
    _check_series(t, 1.0)
    assert t.size == 7201 and t[-1] == 7200.0
    assert [e["kind"] for e in out.result.events].count("schedule") == 3  # 7200 s never acts


def test_a_sample_interval_that_is_not_a_binary_fraction(tmp_path):
    # 0.3 s is not exact in binary: grid points are still neither lost nor repeated.
    legs = """
[[leg]]
name = "a"
voltage = "20 V"
until = { duration = "7.1 s" }

[[leg]]
name = "b"
voltage = "10 V"
until = { duration = "5 s" }
"""
    p = write_scenario(
        tmp_path,
        legs,
        output='sample = "0.3 s"',
        extra=('[[schedule]]\nat = "3.3 s"\nhotel = "50 W"'),
    )
    t = api.run_scenario(p, write_log=False).result.series["time_s"]
    _check_series(t, 0.3)


_DRIVE_THEN = """
[[leg]]
name = "drive"
voltage = "28 V"
until = {{ duration = "5 min" }}

[[leg]]
name = "hold"
{command}
until = {{ duration = "15 min" }}
"""


def test_zero_speed_hold_is_thrust_off_and_cheap(tmp_path):
    # A held speed of zero after a driven leg once chattered between ±max voltage (903,326
    # right-hand-side evaluations, then a battery-temperature stop). Now the drive is off.
    p = write_scenario(
        tmp_path, _DRIVE_THEN.format(command='speed = "0 kn"'), output='sample = "1 s"'
    )
    r = api.run_scenario(p, write_log=False).result
    assert r.ending_reason == "mission complete"
    assert r.rhs_calls < 3000
    hold = r.series["leg_index"] == 1
    v = r.series["speed_through_water_m_s"][hold]
    # Limiting case (no thrust): hull resistance only decelerates, so the speed falls
    # monotonically towards rest and never reverses (common practice).
    assert np.all(np.diff(v) <= 0.0) and v.min() >= 0.0 and v[-1] < 0.25 * v[0]
    assert np.all(r.series["thruster_current_a"][hold] == 0.0)
    start = next(e for e in r.events if e["kind"] == "leg start" and e["leg"] == 1)
    assert "thrust off" in start["message"]
    # the same as commanding zero current
    q = write_scenario(
        tmp_path,
        _DRIVE_THEN.format(command='current = "0 A"'),
        name="q.toml",
        output='sample = "1 s"',
    )
    r0 = api.run_scenario(q, write_log=False).result
    np.testing.assert_allclose(r.series["distance_m"], r0.series["distance_m"], rtol=1e-12)
