"""End conditions and triggers as event objects (sim/engine/conditions.py): the sign of each
condition's value and its direction on simple states, its message text, and that the scenario
schema and the condition classes name the same keys."""

from __future__ import annotations

import pytest
from engine_helpers import VESSELS, write_scenario

from sim import api
from sim.engine import conditions as cd
from sim.engine.model import I_SOC, I_TB, I_V, I_XG, Control, VesselModel, initial_state
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.io.problems import InputError
from sim.io.schema import Conditions


@pytest.fixture(scope="module")
def model() -> VesselModel:
    vessel = api.load_vessel(VESSELS / "glasswort-drone.toml").vessel_spec
    return VesselModel(build_plant(vessel, Water(salinity=35.0, temperature_c=15.0)))


def _state(model: VesselModel):
    """1 m/s through water, 500 m over ground, SOC 0.6, battery 20 °C, magnets 30 °C."""
    y = initial_state(model.plant, 0.6, 1.0, 20.0, 30.0)
    y[I_XG] = 500.0
    return y


def _check(cond: cd.Condition, model, y, *, holds: bool, t: float = 100.0, leg_x0_m=0.0):
    value = cond(t, y, model, leg_x0_m)
    assert cond.holds(t, y, model, leg_x0_m) is holds
    # a condition holds exactly when its value is on the far side of zero in its direction
    assert (value * cond.direction >= 0) is holds


def test_every_file_condition_has_a_class_and_every_class_a_file_key():
    # One class plus one schema field per condition: the two lists must name the same keys.
    assert set(cd.CONDITIONS) == set(Conditions.model_fields)
    for key, cls in cd.CONDITIONS.items():
        assert cls.key == key and cls.terminal is True


def test_direction_follows_the_wording_of_the_key():
    # '..._below' is met by falling through the threshold; '..._above', '..._after' and
    # 'distance' by rising through it (solve_ivp's event direction convention).
    # 'return_to_start' is met by the track position falling back to zero.
    for key, cls in cd.CONDITIONS.items():
        falling = key.endswith("_below") or key == "return_to_start"
        assert cls.direction == (-1 if falling else 1), key
    assert cd.PackHeadroomExhausted.direction == -1
    assert cd.MagnetGradeLimit.direction == 1


def test_distance_conditions(model):
    y = _state(model)  # 500 m over ground in all; the leg began at 200 m
    _check(cd.Distance(250.0), model, y, holds=True, leg_x0_m=200.0)  # 300 m in this leg
    _check(cd.Distance(400.0), model, y, holds=False, leg_x0_m=200.0)
    _check(cd.TotalDistanceAbove(400.0), model, y, holds=True, leg_x0_m=200.0)
    _check(cd.TotalDistanceAbove(600.0), model, y, holds=False, leg_x0_m=200.0)


def test_speed_soc_battery_and_time_conditions(model):
    y = _state(model)
    assert y[I_V] == 1.0 and y[I_SOC] == 0.6 and y[I_TB] == 20.0
    _check(cd.SpeedAbove(0.5), model, y, holds=True)
    _check(cd.SpeedAbove(1.5), model, y, holds=False)
    _check(cd.SpeedBelow(1.5), model, y, holds=True)
    _check(cd.SpeedBelow(0.5), model, y, holds=False)
    _check(cd.SocBelow(0.7), model, y, holds=True)
    _check(cd.SocBelow(0.5), model, y, holds=False)
    _check(cd.BatteryTemperatureAbove(15.0), model, y, holds=True)
    _check(cd.BatteryTemperatureAbove(45.0), model, y, holds=False)
    _check(cd.TimeAfter(60.0), model, y, holds=True, t=100.0)
    _check(cd.TimeAfter(120.0), model, y, holds=False, t=100.0)


def test_cell_voltage_and_pack_headroom_at_rest(model):
    # A lithium-ion cell at rest sits between about 3 and 4.2 V (common practice): far above
    # 1 V, far below 10 V. With no command the drive draws only the hotel load, so the pack has
    # headroom left.
    model.control = Control(mode="voltage", setpoint=0.0)
    y = _state(model)
    _check(cd.CellVoltageBelow(10.0), model, y, holds=True)
    _check(cd.CellVoltageBelow(1.0), model, y, holds=False)
    _check(cd.PackHeadroomExhausted(), model, y, holds=False)


def test_duct_temperature_rise_needs_current(model):
    # Limiting case: with no current there is no Joule or electrode heat, only the friction of
    # the ram-driven through-flow (about 5e-5 K at 1 m/s here); with current the water leaves
    # far warmer (steady-flow energy balance, J²/σ > 0).
    y = _state(model)
    model.control = Control(mode="voltage", setpoint=0.0)
    _check(cd.DuctTemperatureRiseAbove(1e-3), model, y, holds=False)
    assert model.evaluate(0.0, y).duct_joule_rise_k == [0.0]
    model.control = Control(mode="voltage", setpoint=20.0)
    _check(cd.DuctTemperatureRiseAbove(1e-3), model, y, holds=True)
    model.control = Control(mode="voltage", setpoint=0.0)


def test_magnet_conditions(model):
    # The Glasswort magnets are grade N42SH: maximum working temperature 150 °C (grade suffix
    # SH, magnet makers' tables, common practice; /work/shared/REFERENCES.md).
    y = _state(model)  # magnets at 30 °C
    _check(cd.MagnetTemperatureAbove(25.0), model, y, holds=True)
    _check(cd.MagnetTemperatureAbove(40.0), model, y, holds=False)
    _check(cd.MagnetGradeLimit(), model, y, holds=False)
    lay = model.lay
    y[lay.i_mag : lay.i_mag + lay.n_thr] = 155.0
    _check(cd.MagnetGradeLimit(), model, y, holds=True)


def test_messages_name_the_key_threshold_and_unit():
    # These texts appear in the logs' event messages ("leg 'x' ended: distance 600 m").
    assert cd.Distance(600.0).describe() == "distance 600 m"
    assert cd.SocBelow(0.45).describe() == "soc below 0.45"
    assert cd.SpeedBelow(0.05).describe() == "speed below 0.05 m/s"
    assert cd.BatteryTemperatureAbove(45.0).describe() == "battery temperature above 45 °C"
    assert cd.TimeAfter(1800.0).describe() == "time after 1800 s"


def test_conditions_are_frozen_values():
    assert cd.SocBelow(0.45) == cd.SocBelow(0.45) != cd.SpeedBelow(0.45)
    with pytest.raises(AttributeError):
        cd.SocBelow(0.45).threshold = 0.5


def test_duration_counts_from_the_start_of_the_leg(model):
    y = _state(model)
    # the leg began at t = 40 s: at t = 100 s it has lasted 60 s
    assert cd.Duration(50.0).holds(100.0, y, model, 0.0, 40.0)
    assert not cd.Duration(70.0).holds(100.0, y, model, 0.0, 40.0)
    assert cd.Duration(50.0)(100.0, y, model, 0.0, 40.0) == pytest.approx(10.0)


def test_return_to_start_is_the_track_position_back_at_zero(model):
    y = _state(model)  # 500 m out along the track
    cond = cd.ReturnToStart()
    _check(cond, model, y, holds=False, leg_x0_m=300.0)
    y[I_XG] = -0.5  # half a metre behind the start point
    _check(cond, model, y, holds=True, leg_x0_m=300.0)
    y[I_XG] = 0.0
    _check(cond, model, y, holds=True)
    assert cond.describe() == "return to start"


def test_messages_echo_the_files_own_text():
    # The user's text is shown; the arithmetic keeps the SI value.
    cond = cd.SpeedBelow(0.5 * 1852.0 / 3600.0, shown="0.5 kn")
    assert cond.describe() == "speed below 0.5 kn"
    assert cond == cd.SpeedBelow(0.5 * 1852.0 / 3600.0)  # the text does not change the value
    assert cd.Distance(1852.0, shown="1 nmi").describe() == "distance 1 nmi"


def test_the_seam_carries_the_text_of_each_threshold(tmp_path):
    legs = """
[[leg]]
name = "a"
voltage = "20 V"
until = { speed_below = "0.5 kn", distance = "1.2 km", duration = "75 min" }

[[trigger]]
name = "t"
when = { soc_below = 0.30, return_to_start = true }
then = "stop"
"""
    ms = api.load_scenario(write_scenario(tmp_path, legs)).mission_spec
    until = {c.key: c for c in ms.legs[0].until}
    # 1 kn = 1852 m per hour (international nautical mile, definition)
    assert until["speed_below"].threshold == pytest.approx(0.5 * 1852.0 / 3600.0, rel=1e-12)
    assert until["speed_below"].describe() == "speed below 0.5 kn"
    assert until["distance"].describe() == "distance 1.2 km"
    assert until["duration"].describe() == "duration 75 min"
    assert ms.legs[0].duration_s == 4500.0
    when = {c.key: c for c in ms.triggers[0].when}
    assert when["soc_below"].describe() == "soc below 0.3"
    assert isinstance(when["return_to_start"], cd.ReturnToStart)
    assert when["return_to_start"].threshold == 0.0


def test_return_to_start_false_is_not_a_condition(tmp_path):
    legs = """
[[leg]]
name = "a"
voltage = "20 V"
until = { return_to_start = false }
"""
    with pytest.raises(InputError, match="no end condition"):
        api.load_scenario(write_scenario(tmp_path, legs))
