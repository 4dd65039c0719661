"""Saturation during a run: the drive clamped at its current or voltage limit, power fold-back
and a held speed the craft cannot reach are log channels, debounced events and summary times."""

from __future__ import annotations

import numpy as np
import pytest
from engine_helpers import SCENARIOS, write_scenario

from sim import api
from sim.engine.mission import LIMIT_DWELL_S, channel_specs
from sim.engine.steady import SteadyError, steady_at_speed
from sim.physics.constants import KNOT_M_S

_LEGS = """
[[leg]]
name = "dash"
speed = "3 kn"
until = { duration = "6 min" }

[[leg]]
name = "easy"
speed = "0.8 kn"
until = { duration = "5 min" }

[[trigger]]
name = "ease-off"
when = { duration = "4 min" }
then = "derate"
factor = 0.5
"""


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    p = write_scenario(tmp_path_factory.mktemp("sat"), _LEGS, output='sample = "2 s"')
    return api.run_scenario(p, write_log=False)


def test_glasswort_cannot_hold_three_knots(run):
    # The drone's steady solution at 3 kn needs more than its drive gives.
    plant = api.plant_for(run.scenario)
    with pytest.raises(SteadyError, match="needs more thrust"):
        steady_at_speed(plant, 3.0 * KNOT_M_S, soc=0.9, hotel_w=plant.hotel_w)
    r = run.result
    s = r.series
    dash = s["leg_index"] == 0
    before = dash & (s["time_s"] < 240.0)
    assert s["drive_saturated"][before][-10:].all()
    assert s["speed_short_m_s"][before][-1] > 0.5 * KNOT_M_S
    # the shortfall is the target minus the speed while the hold is at its limit
    np.testing.assert_allclose(
        s["speed_short_m_s"][before][-1],
        3.0 * KNOT_M_S - s["speed_through_water_m_s"][before][-1],
        rtol=1e-12,
    )


def test_one_event_when_it_starts_and_one_when_it_recovers(run):
    ev = [e for e in run.result.events if e["kind"] == "saturation"]
    texts = [e["message"] for e in ev]
    not_held = [t for t in texts if t.startswith("speed not held")]
    assert len(not_held) == 1 and "of 3.00 kn asked" in not_held[0]
    # the derate at 4 min asks 1.5 kn, which the drone can hold: the hold recovers once
    again = [e for e in ev if e["message"].startswith("speed held again")]
    assert len(again) == 1 and "of 1.50 kn asked" in again[0]["message"]
    assert again[0]["time_s"] >= 240.0 + LIMIT_DWELL_S
    drive = [t for t in texts if t.startswith("drive")]
    assert drive[0].startswith("drive at its current limit") and len(drive) == 2
    assert drive[1] == "drive back within its current and voltage limits"
    assert len(ev) == 4  # no event per step
    # the start is reported once the shortfall has lasted the dwell time, not before
    assert ev[0]["time_s"] == pytest.approx(LIMIT_DWELL_S, abs=2.0)


def test_summary_counts_the_time_at_a_limit(run):
    summ = run.result.summary
    # at the current limit from the start until shortly after the derate at 240 s
    assert 240.0 <= summ["time_drive_saturated_s"] <= 300.0
    assert summ["time_speed_short_s"] == pytest.approx(summ["time_drive_saturated_s"], abs=5.0)
    assert summ["time_power_folded_s"] == 0.0
    assert summ["drive_limit_episodes"] == 1.0


def test_a_hold_tuned_at_the_current_limit_does_not_chatter_after_a_derate(run):
    # The 3 kn hold was tuned where the thrust does not respond to the command (current
    # limit): its gain was unbounded and, once the derate made the target reachable, the loop
    # chattered (1.48 million right-hand-side evaluations for an 11-minute mission).
    assert run.result.rhs_calls < 20000


def test_channels_are_declared_as_integers_and_a_speed():
    plant = api.plant_for(api.load_scenario(SCENARIOS / "glasswort-survey.toml"))
    spec = channel_specs(plant)
    assert spec["drive_saturated"][3] == spec["power_folded"][3] == "int32"
    assert spec["speed_short_m_s"][0] == "m/s"
