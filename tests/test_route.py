"""Tests of sim.physics.route: water along the route and the tidal current."""

from __future__ import annotations

import math

import gsw
import numpy as np
import pytest

from sim.physics import route as rt
from sim.physics.errors import ModelRangeError
from sim.physics.thruster import DuctThruster, operating_point

ESTUARY = rt.RouteWater(
    axis="distance",
    stations=(0.0, 5000.0, 20000.0),
    sp=(5.0, 20.0, 35.0),
    t_c=(10.0, 12.0, 15.0),
    current_m_s=(-0.5, -0.2, 0.0),
)


def test_water_at_stations_matches_gsw():
    # REFERENCES.md (computed with gsw 3.6.23): C(5, 10 °C, 0) = 6.365947 mS/cm; at the sea end
    # C(35, 15 °C, 0) = gsw.C_from_SP(35, 15, 0) = 42.91754 mS/cm.
    assert rt.water_at(ESTUARY, 0.0).sigma_s_m == pytest.approx(0.6365947, rel=1e-6)
    assert rt.water_at(ESTUARY, 20000.0).sigma_s_m == pytest.approx(4.291754, rel=1e-6)
    mid = rt.water_at(ESTUARY, 2500.0)  # halfway between the first two stations
    assert mid.sp == pytest.approx(12.5) and mid.t_c == pytest.approx(11.0)
    assert mid.sigma_s_m == pytest.approx(0.1 * float(gsw.C_from_SP(12.5, 11.0, 0.0)), rel=1e-6)


def test_clamped_and_linear():
    # Held at the end values beyond the table; linear between stations.
    assert rt.water_at(ESTUARY, -100.0).sp == 5.0
    assert rt.water_at(ESTUARY, 1e6).sp == 35.0
    sp, temp, cur = rt.route_values(ESTUARY, np.array([0.0, 12500.0, 30000.0]))
    assert sp == pytest.approx([5.0, 27.5, 35.0])
    assert temp == pytest.approx([10.0, 13.5, 15.0])
    assert cur == pytest.approx([-0.5, -0.1, 0.0])


def test_conductivity_rises_with_salinity_along_route():
    x = np.linspace(0.0, 20000.0, 21)
    sigma = [rt.water_at(ESTUARY, xi).sigma_s_m for xi in x]
    assert np.all(np.diff(sigma) > 0.0)


def test_thrust_rises_as_water_gets_saltier():
    # A fixed duct at a fixed voltage and speed: more conductive water carries more current
    # (J = σ(E − uB)) and so more thrust (Way 1968).
    duct = DuctThruster(0.05, 0.1, 0.5, 2, 2.0, 1e-5)
    thrust, current = [], []
    for x in np.linspace(0.0, 20000.0, 9):
        p = operating_point(duct, rt.water_at(ESTUARY, x), 1.5, voltage_v=24.0)
        thrust.append(float(p.thrust_n))
        current.append(float(p.current_a))
    assert np.all(np.diff(thrust) > 0.0) and np.all(np.diff(current) > 0.0)
    assert thrust[-1] > 3.0 * thrust[0]


def test_tide_m2():
    # Doodson (1921): M2 angular speed 28.9841042 °/h, period 12.4206 h.
    assert rt.M2_PERIOD_S / 3600.0 == pytest.approx(12.4206, abs=1e-4)
    tide = rt.TidalCurrent(amplitude_m_s=1.2, phase_rad=math.pi / 3, mean_m_s=0.1)
    t_peak = (math.pi / 3) / (2 * math.pi) * rt.M2_PERIOD_S
    assert rt.tidal_current_m_s(tide, t_peak) == pytest.approx(1.3)
    assert rt.tidal_current_m_s(tide, t_peak + rt.M2_PERIOD_S / 2) == pytest.approx(-1.1)
    # turns: zero crossings a quarter period from the peak (mean removed); periodic; mean over
    # a period is the residual current
    t = np.linspace(0.0, rt.M2_PERIOD_S, 10001)
    u = rt.tidal_current_m_s(tide, t)
    assert np.trapezoid(u, t) / rt.M2_PERIOD_S == pytest.approx(0.1, abs=1e-6)
    assert rt.tidal_current_m_s(tide, 1000.0) == pytest.approx(
        rt.tidal_current_m_s(tide, 1000.0 + rt.M2_PERIOD_S)
    )
    tot = rt.current_along_track_m_s(ESTUARY, 5000.0, t_peak, tide)
    assert tot == pytest.approx(-0.2 + 1.3)
    assert rt.current_along_track_m_s(None, 0.0, 0.0) == 0.0


def test_time_axis_route():
    r = rt.RouteWater("time", (0.0, 3600.0), (30.0, 35.0), (15.0, 15.0))
    assert rt.water_at(r, 1800.0).sp == pytest.approx(32.5)
    assert rt.current_along_track_m_s(r, 1e9, 1800.0) == 0.0


def test_bad_tables():
    with pytest.raises(ModelRangeError, match="strictly increasing"):
        rt.RouteWater("distance", (0.0, 0.0), (5.0, 35.0), (10.0, 10.0))
    with pytest.raises(ModelRangeError, match="one per station"):
        rt.RouteWater("distance", (0.0, 1.0), (5.0,), (10.0, 10.0))
    with pytest.raises(ModelRangeError):
        rt.RouteWater("distance", (0.0, 1.0), (5.0, 50.0), (10.0, 10.0))
    with pytest.raises(ModelRangeError, match="axis"):
        rt.RouteWater("depth", (0.0,), (5.0,), (10.0,))
