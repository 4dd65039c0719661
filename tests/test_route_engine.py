"""Water along the route in the engine: salinity, temperature and current from a [route] table,
a tide that turns with time, and what they do to thrust, current and distance over ground."""

from __future__ import annotations

import math

import numpy as np
import pytest
from engine_helpers import SCENARIOS, write_scenario

from sim import api
from sim.io.files import InputError
from sim.physics.electrochem import FARADAY_C_MOL

ESTUARY = SCENARIOS / "glasswort-estuary.toml"


@pytest.fixture(scope="module")
def estuary():
    return api.run_scenario(ESTUARY, write_log=False).result


def _trap(y, t):
    return float(np.sum(0.5 * (y[1:] + y[:-1]) * np.diff(t)))


def test_estuary_thrust_and_current_rise_with_conductivity(estuary):
    s = estuary.series
    leg0 = s["leg_index"] == 0
    sal, sig = s["salinity"][leg0], s["conductivity_s_m"][leg0]
    amps = s["thruster_current_a"][leg0, 0]
    thrust = s["thrust_n"][leg0, 0]
    # the water freshens to SP 5 at the mouth and reaches 34 offshore
    assert sal[0] == pytest.approx(5.0) and sal[-1] == pytest.approx(34.0)
    # conductivity as TEOS-10 / PSS-78 gives it (gsw, a reference library: mS/cm -> S/m)
    gsw = pytest.importorskip("gsw")
    p_dbar = 3.0 / 0.9945
    want = gsw.C_from_SP(sal, s["water_temperature_c"][leg0], p_dbar) / 10.0
    np.testing.assert_allclose(sig, want, rtol=1e-6)
    # at a held voltage the current follows the conductivity (Ohm's law, common practice):
    # past the start-up (first 15 min) and before the last station (4 km) both rise together,
    # sample by sample
    late = (s["time_s"][leg0] > 900.0) & (s["distance_m"][leg0] < 4000.0)
    assert np.all(np.diff(sig[late]) > 0) and np.all(np.diff(amps[late]) > 0)
    # from SP ≈ 9 to SP 34 the conductivity triples and the thrust more than doubles
    i9 = np.argmax(sal > 9.0)
    assert sig[-1] / sig[i9] > 2.9
    assert thrust[-1] / thrust[i9] > 2.0
    assert amps[-1] / amps[i9] > 2.5


def test_estuary_faraday_totals(estuary):
    s = estuary.series
    q = _trap(s["thruster_current_a"][:, 0], s["time_s"])
    # Faraday's law: n = Q/(zF), z = 2 for H2 and for Cl2 (all anode charge to chlorine here)
    assert estuary.summary["h2_total_mol"] == pytest.approx(q / (2 * FARADAY_C_MOL), rel=2e-3)
    assert estuary.summary["cl2_total_mol"] == pytest.approx(q / (2 * FARADAY_C_MOL), rel=2e-3)


def test_estuary_speed_over_ground_adds_the_currents(estuary):
    s = estuary.series
    np.testing.assert_allclose(
        s["speed_over_ground_m_s"],
        s["speed_through_water_m_s"] + s["water_current_m_s"],
        rtol=0,
        atol=1e-12,
    )
    # distance over ground = ∫ speed over ground dt (trapezoid on 10 s samples)
    assert estuary.summary["distance_m"] == pytest.approx(
        _trap(s["speed_over_ground_m_s"], s["time_s"]), rel=2e-3
    )
    assert s["water_current_m_s"][0] > 0 > s["water_current_m_s"][-1]  # the tide has turned


TIDE = """
[tide]
amplitude = "0.3 m/s"
period = "2 h"
peak_time = "-20 min"
mean = "0.05 m/s"
"""


def test_a_turning_tide_carries_a_drifting_vessel(tmp_path):
    legs = '[[leg]]\nname = "drift"\ncurrent = "0 A"\nuntil = { duration = "2 h" }'
    scen = write_scenario(tmp_path, legs, extra=TIDE, limits='time = "3 h"')
    out = api.run_scenario(scen, write_log=False).result
    s = out.series
    t = s["time_s"]
    assert np.max(np.abs(s["speed_through_water_m_s"])) < 1e-9  # no thrust, at rest in the water
    # x(t) = ∫ (ū + A cos(2π(τ − t_p)/T)) dτ = ū t + A T/(2π) [sin(2π(t − t_p)/T) + sin(2π t_p/T)]
    # (the harmonic tide, Doodson 1921; the integral by hand)
    a, period, tp, mean = 0.3, 7200.0, -1200.0, 0.05
    w = 2 * math.pi / period
    want = mean * t + a / w * (np.sin(w * (t - tp)) - np.sin(w * (0 - tp)))
    # within 0.2 % of the tidal excursion A·T/(2π) ≈ 340 m: the default tolerance of the
    # integrator (the distance is a quadrature of the stages)
    np.testing.assert_allclose(s["distance_m"], want, rtol=0, atol=0.7)
    # it turns: the vessel is carried out, then back
    d = np.diff(s["distance_m"])
    assert np.any(d > 0) and np.any(d < 0)


def test_route_by_time_and_bad_tables(tmp_path):
    route = (
        '[route]\ntime = ["0 h", "1 h"]\nsalinity = [10, 30]\ntemperature = ["15 degC", "15 degC"]'
    )
    legs = '[[leg]]\nname = "run"\nvoltage = "14 V"\nuntil = { duration = "1 h" }'
    out = api.run_scenario(write_scenario(tmp_path, legs, extra=route), write_log=False).result
    s = out.series
    np.testing.assert_allclose(s["salinity"], 10 + 20 * s["time_s"] / 3600.0, rtol=1e-12)
    bad = route.replace("[10, 30]", "[10]")
    with pytest.raises(InputError) as exc:
        api.load_scenario(write_scenario(tmp_path, legs, extra=bad))
    assert "route.salinity" in str(exc.value) and "one entry per station" in str(exc.value)
    both = route + '\ndistance = ["0 km", "1 km"]'
    with pytest.raises(InputError) as exc:
        api.load_scenario(write_scenario(tmp_path, legs, extra=both))
    assert "either by distance or by time" in str(exc.value)


def test_a_speed_hold_holds_through_freshening_water(tmp_path):
    route = (
        '[route]\ndistance = ["0 m", "2 km"]\nsalinity = [34, 6]\n'
        'temperature = ["14 degC", "18 degC"]'
    )
    legs = '[[leg]]\nname = "hold"\nspeed = "1 kn"\nuntil = { distance = "2.5 km" }'
    out = api.run_scenario(write_scenario(tmp_path, legs, extra=route), write_log=False).result
    s = out.series
    late = s["time_s"] > 600
    v = s["speed_through_water_m_s"][late]
    # the PI hold keeps 1 kn (0.5144 m/s, common practice) while the conductivity falls about
    # fivefold: the voltage rises to make up for it
    assert np.max(np.abs(v - 0.514444)) < 0.02 * 0.514444
    assert s["conductivity_s_m"][-1] < 0.3 * s["conductivity_s_m"][0]
    volts = s["thruster_voltage_v"][late, 0]
    assert volts[-1] > 1.5 * volts[0]
