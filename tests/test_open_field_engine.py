"""The open-field (ductless) thruster in the engine: dispatch from the vessel file, the same log
channels, energy and Faraday balances, the boundary-layer friction counted against the thrust,
and the water along the route."""

from __future__ import annotations

import math

import numpy as np
import pytest
from engine_helpers import VESSELS, write_scenario

from sim import api
from sim.engine.model import Control, VesselModel
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.engine.steady import steady_at_speed, steady_speed_for
from sim.io.files import InputError, load_vessel
from sim.physics.electrochem import FARADAY_C_MOL
from sim.physics.seawater import water_state

OPEN = VESSELS / "glasswort-open-field.toml"
WATER = Water(salinity=33.5, temperature_c=14.0, depth_m=4.0)


def _trap(y, t):
    return float(np.sum(0.5 * (y[1:] + y[:-1]) * np.diff(t)))


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("of")
    legs = (
        '[[leg]]\nname = "v"\nvoltage = "20 V"\nuntil = { duration = "10 min" }\n'
        '[[leg]]\nname = "i"\ncurrent = "400 A"\nuntil = { duration = "5 min" }\n'
        '[[leg]]\nname = "p"\npower = "3 kW"\nuntil = { duration = "5 min" }\n'
        '[[leg]]\nname = "s"\nspeed = "1.6 kn"\nuntil = { duration = "10 min" }'
    )
    scen = write_scenario(tmp, legs, vessel="glasswort-open-field.toml", output='sample = "5 s"')
    return api.run_scenario(scen, write_log=False).result


def test_open_field_flies_every_command(run):
    s = run.series
    assert run.ending_reason == "mission complete"
    leg = s["leg_index"]
    i = s["thruster_current_a"][:, 0]
    # current leg: 400 A shared by the two arrays; power leg: 3 kW into the arrays
    assert i[leg == 1][-1] == pytest.approx(400.0, rel=1e-9)
    assert s["thruster_power_w"][leg == 2][-1] == pytest.approx(3000.0, rel=1e-6)
    v = s["speed_through_water_m_s"][leg == 3][-1]
    assert v == pytest.approx(1.6 * 0.514444, rel=0.02)
    # no duct: no duct heating, no channel ends, no gas in a channel
    assert np.all(s["duct_temperature_rise_k"] == 0.0) and np.all(s["void_fraction_outlet"] == 0)


def test_open_field_energy_and_faraday_balances(run):
    s = run.series
    # energy conservation (common practice): V·I = Joule + electrode + Lorentz work F·V0
    parts = (
        s["joule_loss_w"]
        + s["electrode_loss_w"]
        + s["thrust_n"][:, 0] * s["speed_through_water_m_s"]
    )
    np.testing.assert_allclose(s["thruster_power_w"], parts, rtol=1e-9, atol=1e-6)
    assert np.all(s["friction_loss_w"] == 0.0) and np.all(s["wake_loss_w"] == 0.0)
    # Faraday's law: n_H2 = ∫I dt/(2F)
    q = _trap(np.abs(s["thruster_current_a"][:, 0]), s["time_s"])
    assert run.summary["h2_total_mol"] == pytest.approx(q / (2 * FARADAY_C_MOL), rel=2e-3)


def test_boundary_layer_friction_is_counted_against_the_thrust(run):
    s = run.series
    j = len(s["time_s"]) // 3
    f = s["thrust_n"][j, 0]
    v0 = s["speed_through_water_m_s"][j]
    w = water_state(35.0, 15.0, 0.0)
    # ΔD = κ F (1 − exp(−2 k1 δ)), δ = 0.37 x Re_x^(−1/5) (turbulent flat plate, Schlichting &
    # Gersten 2017), κ = 0.5, k1 = π/pitch, x = 1.3 m (the vessel file)
    x, k1 = 1.3, math.pi / 0.08
    delta = 0.37 * x * (v0 * x / w.nu_m2_s) ** -0.2
    dd = 0.5 * f * (1 - math.exp(-2 * k1 * delta))
    assert s["effective_thrust_n"][j] == pytest.approx(f - dd, rel=1e-9)
    assert s["hull_interaction_power_w"][j] == pytest.approx(dd * v0, rel=1e-9)
    # η_hydraulic = (F − ΔD)/F, η_electrical = F·V0/(V·I)
    assert s["eta_hydraulic"][j] == pytest.approx((f - dd) / f, rel=1e-9)
    assert s["eta_electrical"][j] == pytest.approx(f * v0 / s["thruster_power_w"][j], rel=1e-9)


def test_open_field_steady_and_reciprocity():
    p = build_plant(load_vessel(OPEN).vessel_spec, WATER)
    sp = steady_speed_for(p, Control(mode="voltage", setpoint=20.0))
    pt = steady_at_speed(p, sp)
    assert pt.thrust_n == pytest.approx(pt.resistance_n, rel=1e-6)
    # reciprocity: the open-circuit (dead-band edge) voltage grows by (F/I)·V0 with speed
    u = p.thrusters[0]
    m = VesselModel(p)
    a = m._point(0, 0.0, u.b_ref_tesla, amps=100.0)
    b = m._point(0, 2.0, u.b_ref_tesla, amps=100.0)
    assert b.voltage_v - a.voltage_v == pytest.approx(a.thrust_n / 100.0 * 2.0, rel=1e-12)


def test_open_field_thrust_rises_with_salinity_on_a_route(tmp_path):
    route = (
        '[route]\ndistance = ["0 m", "600 m"]\nsalinity = [5, 35]\n'
        'temperature = ["15 degC", "15 degC"]'
    )
    legs = '[[leg]]\nname = "run"\nvoltage = "14 V"\nuntil = { distance = "600 m" }'
    scen = write_scenario(tmp_path, legs, vessel="glasswort-open-field.toml", extra=route)
    s = api.run_scenario(scen, write_log=False).result.series
    late = s["time_s"] > 300
    assert np.all(np.diff(s["thruster_current_a"][late, 0]) > 0)
    # the resistance of the water falls as 1/σ (Ohm's law): at the same speed the current would
    # scale with σ; here the thrust at SP 35 is well above that at SP 10
    i10 = np.argmax(s["salinity"] > 10)
    assert s["thrust_n"][-1, 0] > 1.8 * s["thrust_n"][i10, 0]


def test_open_field_bad_files(tmp_path):
    base = OPEN.read_text()
    bad = base.replace('electrode_width = "20 mm"', 'electrode_width = "90 mm"')
    p = tmp_path / "v.toml"
    p.write_text(
        bad.replace(
            'extends = "glasswort-drone.toml"',
            f'extends = "{VESSELS.as_posix()}/glasswort-drone.toml"',
        )
    )
    with pytest.raises(InputError) as exc:
        load_vessel(p)
    assert "electrode_width" in str(exc.value) and "strip_pitch" in str(exc.value)
    p.write_text(
        p.read_text().replace(
            'electrode_width = "90 mm"', 'electrode_width = "20 mm"\ngap = "5 cm"'
        )
    )
    with pytest.raises(InputError) as exc:
        load_vessel(p)
    assert "gap" in str(exc.value)
