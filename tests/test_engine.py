"""The time-domain engine: energy balance, steady state, convergence, event timing, logs."""

from __future__ import annotations

import itertools

import h5py
import numpy as np
import pytest
from engine_helpers import write_scenario

from sim import api
from sim.engine.mission import RunObserver, channel_specs
from sim.engine.model import I_SOC, I_V, I_XG, Control
from sim.engine.steady import steady_at_speed, steady_speed_for


def _balance(outcome) -> tuple[float, float]:
    """Pack energy out vs the sum of every loss + hull work + kinetic energy (conservation of
    energy over the run)."""
    r = outcome.result
    t = r.totals
    plant = api.plant_for(outcome.scenario)
    v0 = outcome.scenario.spec.start.speed
    ke = 0.5 * plant.total_mass_kg * (r.final_state[I_V] ** 2 - v0**2)
    parts = (
        t["energy_joule_j"]
        + t["energy_electrode_j"]
        + t["energy_friction_j"]
        + t["energy_wake_j"]
        + t["energy_drive_loss_j"]
        + t["energy_hotel_j"]
        + t["energy_hull_j"]
        + ke
    )
    return t["energy_pack_terminal_j"], parts


def test_energy_balance_over_a_whole_mission(tmp_path):
    # Conservation of energy: pack terminal energy = Σ losses + ∫R·V dt + ΔKE. Issue bound 0.5 %;
    # the accumulators are integrated with the state, so it holds far tighter.
    legs = """
[[leg]]
name = "a"
voltage = "20 V"
until = { distance = "300 m" }
[[leg]]
name = "b"
speed = "1 kn"
until = { duration = "10 min" }
[[leg]]
name = "c"
voltage = "0 V"
until = { speed_below = "0.1 m/s" }
"""
    # a check of the model's conservation, not of the default integrator: second-order TR-BDF2
    # holds the accumulated energies to its absolute tolerance (1e-3 J) per step, about 0.03 J
    # here (1e-5 of the thrust work); fifth-order RK45 at rtol 1e-7 holds it to 1e-6
    path = write_scenario(tmp_path, legs, solver='method = "RK45"')
    out = api.run_scenario(path, write_log=False)
    assert out.result.ending_reason == "mission complete"
    pack, parts = _balance(out)
    assert pack > 1e5
    assert abs(pack - parts) / pack < 1e-6
    # thrust work = hull work + kinetic energy (Newton's second law integrated)
    t = out.result.totals
    plant = api.plant_for(out.scenario)
    ke = 0.5 * plant.total_mass_kg * out.result.final_state[I_V] ** 2
    assert t["energy_useful_j"] == pytest.approx(t["energy_hull_j"] + ke, rel=1e-5, abs=1e-3)
    # chemical energy drawn = terminal energy + battery losses: OCV energy exceeds terminal energy
    assert t["energy_pack_ocv_j"] > t["energy_pack_terminal_j"]


def test_long_constant_voltage_leg_reaches_the_steady_speed(tmp_path):
    legs = """
[[leg]]
name = "steady"
voltage = "12 V"
until = { duration = "40 min" }
"""
    path = write_scenario(tmp_path, legs, output='sample = "60 s"')
    out = api.run_scenario(path, write_log=False)
    plant = api.plant_for(out.scenario)
    soc_end = float(out.result.final_state[I_SOC])
    v_steady = steady_speed_for(
        plant, Control(mode="voltage", setpoint=12.0, hotel_w=plant.hotel_w), soc=soc_end
    )
    v_end = float(out.result.final_state[I_V])
    assert v_end == pytest.approx(v_steady, rel=5e-3)
    # and the steady point at that speed needs the same voltage (the two solvers agree)
    point = steady_at_speed(plant, v_steady, soc=soc_end)
    assert point.thruster_voltage_v == pytest.approx(12.0, rel=1e-6)


def test_halving_tolerances_changes_little(tmp_path):
    legs = """
[[leg]]
name = "go"
voltage = "18 V"
until = { distance = "400 m" }
[[leg]]
name = "hold"
speed = "1.2 kn"
until = { duration = "5 min" }
"""
    res = []
    for rtol in (1e-6, 5e-7, 2.5e-7):
        p = write_scenario(tmp_path, legs, name=f"c{rtol}.toml", solver=f"rtol = {rtol}")
        r = api.run_scenario(p, write_log=False).result
        res.append(
            (r.summary["distance_m"], r.summary["duration_s"], r.totals["energy_pack_terminal_j"])
        )
    d = [abs(a[0] - b[0]) for a, b in itertools.pairwise(res)]
    tt = [abs(a[1] - b[1]) for a, b in itertools.pairwise(res)]
    ee = [abs(a[2] - b[2]) / a[2] for a, b in itertools.pairwise(res)]
    # stated bound: halving rtol moves distance by < 1 mm, end time by < 10 ms, energy < 1e-5
    assert max(d) < 1e-3
    assert max(tt) < 1e-2
    assert max(ee) < 1e-5


def test_end_conditions_fire_at_the_root_not_at_a_sample(tmp_path):
    legs = """
[[leg]]
name = "to-mark"
voltage = "16 V"
until = { distance = "123.456 m" }
[[leg]]
name = "timed"
voltage = "16 V"
until = { duration = "77.7 s" }
[[leg]]
name = "drain"
voltage = "30 V"
until = { soc_below = 0.85 }
"""
    path = write_scenario(tmp_path, legs, output='sample = "60 s"')
    r = api.run_scenario(path, write_log=False).result
    legs_out = r.legs
    assert legs_out[0]["distance_m"] == pytest.approx(123.456, abs=1e-6)
    assert legs_out[1]["t_end_s"] - legs_out[1]["t_start_s"] == pytest.approx(77.7, abs=1e-9)
    soc_end = r.series["state_of_charge"][-1]
    assert soc_end == pytest.approx(0.85, abs=1e-9)
    # event instants are sample rows even though the grid is 60 s
    assert np.any(np.isclose(r.series["time_s"], legs_out[0]["t_end_s"], rtol=0, atol=1e-12))


def test_trigger_jumps_to_a_leg_once(tmp_path):
    legs = """
[[leg]]
name = "out"
voltage = "30 V"
until = { duration = "2 h" }
[[leg]]
name = "home"
voltage = "10 V"
until = { duration = "60 s" }
"""
    extra = """
[[trigger]]
name = "low"
when = { soc_below = 0.88 }
then = "goto"
leg = "home"
"""
    r = api.run_scenario(write_scenario(tmp_path, legs, extra=extra), write_log=False).result
    kinds = [e["kind"] for e in r.events]
    assert kinds.count("trigger") == 1
    trig = next(e for e in r.events if e["kind"] == "trigger")
    i = int(np.searchsorted(r.series["time_s"], trig["time_s"]))
    assert r.series["state_of_charge"][i] == pytest.approx(0.88, abs=1e-9)
    assert [leg["name"] for leg in r.legs] == ["out", "home"]
    assert r.ending_reason == "mission complete"


def test_stop_condition_ends_the_run_with_its_reason(tmp_path):
    legs = """
[[leg]]
name = "flat-out"
voltage = "30 V"
until = { duration = "3 h" }
"""
    path = write_scenario(tmp_path, legs, limits='time = "3 h"\nstate_of_charge_min = 0.85')
    r = api.run_scenario(path, write_log=False).result
    assert r.ending_kind == "limit"
    assert "pack empty" in r.ending_reason
    assert float(r.final_state[I_SOC]) == pytest.approx(0.85, abs=1e-9)


def test_scheduled_event_is_never_stepped_over(tmp_path):
    legs = """
[[leg]]
name = "cruise"
voltage = "14 V"
until = { duration = "20 min" }
"""
    extra = """
[[schedule]]
at = "437 s"
hotel = "500 W"
"""
    path = write_scenario(tmp_path, legs, extra=extra, output='sample = "1 s"')
    r = api.run_scenario(path, write_log=False).result
    t = r.series["time_s"]
    hotel = r.series["hotel_power_w"]
    assert hotel[t < 437.0].max() == pytest.approx(45.0)
    assert hotel[t > 437.0].min() == pytest.approx(500.0)
    ev = next(e for e in r.events if e["kind"] == "schedule")
    assert ev["time_s"] == pytest.approx(437.0, abs=1e-9)


def test_speed_hold_settles_on_target(tmp_path):
    legs = """
[[leg]]
name = "hold"
speed = "1.3 kn"
until = { duration = "15 min" }
"""
    r = api.run_scenario(write_scenario(tmp_path, legs), write_log=False).result
    v = r.series["speed_through_water_m_s"]
    assert v[-1] == pytest.approx(1.3 * 1852 / 3600, rel=1e-3)


def test_log_round_trip_has_every_channel_with_units(tmp_path):
    legs = """
[[leg]]
name = "a"
voltage = "15 V"
until = { duration = "3 min" }
"""
    out = api.run_scenario(write_scenario(tmp_path, legs), out=tmp_path / "log.h5")
    plant = api.plant_for(out.scenario)
    with h5py.File(out.log_path, "r") as f:
        assert bool(f.attrs["complete"]) is True
        assert "scenario_text" in f.attrs and "vessel_text" in f.attrs
        for name, (units, _desc, _n, _dt) in channel_specs(plant).items():
            ds = f["series"][name]
            assert ds.attrs["units"] == units
            assert np.all(np.isfinite(ds[...]))
    log = api.read_log(out.log_path)
    assert log.summary["distance_m"] == pytest.approx(out.result.summary["distance_m"])
    np.testing.assert_array_equal(log.series["time_s"], out.result.series["time_s"])
    assert len(log.legs) == 1 and log.events


def test_interrupted_run_leaves_a_readable_incomplete_log(tmp_path):
    legs = """
[[leg]]
name = "a"
voltage = "15 V"
until = { duration = "30 min" }
"""

    class Interrupt(RunObserver):
        def progress(self, time_s, limit, wall):
            if time_s > 600:
                raise KeyboardInterrupt

    path = write_scenario(tmp_path, legs)
    with pytest.raises(KeyboardInterrupt):
        api.run_scenario(path, out=tmp_path / "cut.h5", observer=Interrupt())
    assert not (tmp_path / "cut.h5").exists()
    part = tmp_path / "cut.incomplete.h5"
    with h5py.File(part, "r") as f:
        assert bool(f.attrs["complete"]) is False
        assert "interrupted" in f.attrs["ending_reason"]


def test_same_inputs_give_identical_logs(tmp_path):
    legs = """
[[leg]]
name = "a"
speed = "1 kn"
until = { duration = "4 min" }
"""
    path = write_scenario(tmp_path, legs)
    a = api.run_scenario(path, out=tmp_path / "a.h5", created_utc="2026-01-01T00:00:00+00:00")
    b = api.run_scenario(path, out=tmp_path / "b.h5", created_utc="2026-01-01T00:00:00+00:00")
    assert a.log_path.read_bytes() == b.log_path.read_bytes()


def test_water_current_changes_ground_speed_not_water_speed(tmp_path):
    legs = """
[[leg]]
name = "a"
voltage = "15 V"
until = { duration = "5 min" }
"""
    w = 'salinity = 35.0\ntemperature = "15 degC"\ncurrent = "0.5 m/s"'
    r = api.run_scenario(write_scenario(tmp_path, legs, water=w), write_log=False).result
    s = r.series
    np.testing.assert_allclose(s["speed_over_ground_m_s"] - s["speed_through_water_m_s"], 0.5)
    assert r.final_state[I_XG] > 0


def _last(r, name):
    return (
        float(np.ravel(r.series[name][-1:])[0])
        if r.series[name].ndim == 1
        else float(np.max(r.series[name][-1]))
    )


@pytest.mark.parametrize(
    "cond,start,channel,pick",
    [
        ("speed_above", "state_of_charge = 0.9", "speed_through_water_m_s", 0.5),
        ("speed_below", 'state_of_charge = 0.9\nspeed = "1.5 m/s"', "speed_through_water_m_s", 0.5),
        ("battery_temperature_above", "state_of_charge = 0.9", "battery_temperature_c", 0.5),
        (
            "magnet_temperature_above",
            'state_of_charge = 0.9\nmagnet_temperature = "5 degC"',
            "magnet_temperature_c",
            0.5,
        ),
        (
            "duct_temperature_rise_above",
            'state_of_charge = 0.9\nspeed = "1.5 m/s"',
            "duct_temperature_rise_k",
            0.5,
        ),
        ("cell_voltage_below", "state_of_charge = 0.9", "cell_voltage_v", 0.5),
        ("time_after", "state_of_charge = 0.9", "time_s", 0.37),
        ("total_distance_above", "state_of_charge = 0.9", "distance_m", 0.61),
    ],
)
def test_each_condition_is_root_found(tmp_path, cond, start, channel, pick):
    """A first run records the channel over a 10-minute leg; a threshold between its start and
    end values is then set as the end condition: the leg must end exactly on it."""
    probe = """
[[leg]]
name = "probe"
voltage = "20 V"
until = { duration = "10 min" }
"""
    units = {
        "speed_above": "m/s",
        "speed_below": "m/s",
        "battery_temperature_above": "degC",
        "magnet_temperature_above": "degC",
        "duct_temperature_rise_above": "K",
        "cell_voltage_below": "V",
        "time_after": "s",
        "total_distance_above": "m",
    }
    r0 = api.run_scenario(
        write_scenario(tmp_path, probe, name="p.toml", start=start, output='sample = "5 s"'),
        write_log=False,
    ).result
    series = r0.series[channel]
    series = series.max(axis=1) if series.ndim == 2 else series
    # skip the first sample: algebraic channels jump when the command is applied at t = 0
    a, b = float(series[1]), float(series[-1])
    thr = a + pick * (b - a)
    legs = f"""
[[leg]]
name = "to-threshold"
voltage = "20 V"
until = {{ duration = "10 min", {cond} = "{thr!r} {units[cond]}" }}
"""
    r = api.run_scenario(
        write_scenario(tmp_path, legs, name="c.toml", start=start, output='sample = "60 s"'),
        write_log=False,
    ).result
    assert r.legs[0]["ending"].startswith(cond.replace("_", " "))
    end = r.series[channel][-1]
    end = float(np.max(end)) if np.ndim(end) else float(end)
    assert end == pytest.approx(thr, rel=1e-7, abs=1e-7)


def test_derate_hotel_and_stop_triggers(tmp_path):
    legs = """
[[leg]]
name = "run"
voltage = "20 V"
until = { duration = "30 min" }
"""
    extra = """
[[trigger]]
name = "ease-off"
when = { time_after = "5 min" }
then = "derate"
factor = 0.5
[[trigger]]
name = "lights-off"
when = { time_after = "6 min" }
then = "hotel"
hotel = "10 W"
[[trigger]]
name = "halt"
when = { time_after = "8 min" }
then = "stop"
"""
    r = api.run_scenario(
        write_scenario(tmp_path, legs, extra=extra, output='sample = "30 s"'), write_log=False
    ).result
    s = r.series
    t = s["time_s"]
    v = s["thruster_voltage_v"][:, 0]
    assert v[(t > 0) & (t < 300)] == pytest.approx(20.0)
    assert v[t > 300] == pytest.approx(10.0)
    assert s["hotel_power_w"][t > 360] == pytest.approx(10.0)
    assert r.ending_kind == "limit" and "halt" in r.ending_reason
    assert r.summary["duration_s"] == pytest.approx(480.0, abs=1e-9)
