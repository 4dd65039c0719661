"""Mission legs and triggers end to end: an out-and-back mission ending at its start point, a
trigger on the time in the leg, and event messages that echo the file's own values."""

from __future__ import annotations

import numpy as np
import pytest
from engine_helpers import write_scenario

from sim import api


def test_out_and_back_ends_at_the_start_point(tmp_path):
    # Out 150 m ahead, then astern (reversed electrode voltage) until back at the start. The
    # track position is the integral of the speed over ground; the event is root-found, so the
    # run ends at the start point to the integrator's tolerance.
    legs = """
[[leg]]
name = "out"
voltage = "20 V"
until = { distance = "150 m" }

[[leg]]
name = "back"
voltage = "-20 V"
until = { return_to_start = true }
"""
    r = api.run_scenario(write_scenario(tmp_path, legs), write_log=False).result
    assert r.ending_reason == "mission complete"
    assert [leg["name"] for leg in r.legs] == ["out", "back"]
    back = r.legs[1]
    assert back["ending"] == "return to start"
    assert back["distance_m"] == pytest.approx(-150.0, abs=1e-3)
    assert r.series["distance_m"][-1] == pytest.approx(0.0, abs=1e-3)
    # it went out at least 150 m (it overshoots while the reversed thrust brakes it)
    assert r.series["distance_m"].max() >= 150.0
    assert r.series["speed_through_water_m_s"][-1] < 0.0  # it arrived going astern
    ends = [e for e in r.events if e["kind"] == "leg end"]
    assert ends[-1]["message"] == "leg 'back' ended: return to start"


def test_return_to_start_with_a_head_current(tmp_path):
    # Thrust off in a head current: the vessel drifts back over ground to where it started.
    legs = """
[[leg]]
name = "out"
voltage = "20 V"
until = { distance = "60 m" }

[[leg]]
name = "drift"
current = "0 A"
until = { return_to_start = true }
"""
    p = write_scenario(
        tmp_path, legs, water='salinity = 35.0\ntemperature = "15 degC"\ncurrent = "-0.5 kn"'
    )
    r = api.run_scenario(p, write_log=False).result
    assert r.legs[-1]["ending"] == "return to start"
    assert r.series["distance_m"][-1] == pytest.approx(0.0, abs=1e-3)


def test_a_trigger_on_duration_fires_that_long_into_a_leg(tmp_path):
    # duration in a trigger counts from the start of the leg being flown (like distance).
    legs = """
[[leg]]
name = "first"
voltage = "20 V"
until = { duration = "100 s" }

[[leg]]
name = "second"
voltage = "15 V"
until = { duration = "10 min" }

[[trigger]]
name = "enough"
when = { duration = "4 min" }
then = "stop"
"""
    r = api.run_scenario(write_scenario(tmp_path, legs), write_log=False).result
    fired = [e for e in r.events if e["kind"] == "trigger"]
    assert len(fired) == 1 and fired[0]["leg"] == 1
    assert fired[0]["time_s"] == pytest.approx(100.0 + 240.0, abs=1e-6)
    assert fired[0]["message"] == "trigger 'enough' (duration 4 min): stop"
    assert r.ending_kind == "limit"


def test_event_messages_echo_the_files_units(tmp_path):
    legs = """
[[leg]]
name = "run"
voltage = "20 V"
until = { duration = "3 min" }

[[leg]]
name = "coast"
current = "0 A"
until = { speed_below = "0.5 kn" }
"""
    r = api.run_scenario(write_scenario(tmp_path, legs), write_log=False).result
    texts = [e["message"] for e in r.events if e["kind"] == "leg end"]
    assert texts == ["leg 'run' ended: duration 3 min", "leg 'coast' ended: speed below 0.5 kn"]
    # the arithmetic is SI: 0.5 kn = 0.5 × 1852 m / 3600 s (international knot, definition)
    assert r.series["speed_through_water_m_s"][-1] == pytest.approx(0.5 * 1852 / 3600, rel=1e-6)
    assert np.all(np.diff(r.series["time_s"]) > 0)
