"""Tests of sim.physics.seawater against published values, gsw, identities and limits."""

from __future__ import annotations

import dataclasses
import re

import gsw
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.physics import seawater as sw
from sim.physics.errors import ModelRangeError

IPTS68_PER_ITS90 = 1.00024  # t68 = 1.00024 t90 (Fofonoff & Millard 1983, UNESCO 44)


def sp_for_absolute_salinity(sa_g_kg: float) -> float:
    """Practical salinity whose Absolute Salinity at the module's default position is sa_g_kg."""
    return float(gsw.SP_from_SA(sa_g_kg, 0.0, sw.DEFAULT_LONGITUDE_DEG, sw.DEFAULT_LATITUDE_DEG))


# ---------------------------------------------------------------- published values: conductivity


def test_pss78_defining_conductivity():
    # PSS-78 definition: C(35, 15 °C IPTS-68, 0) = 42.914 mS/cm (Culkin & Smith 1980;
    # Fofonoff & Millard 1983, UNESCO Tech. Pap. Mar. Sci. 44). 15 °C IPTS-68 = 15/1.00024 ITS-90.
    sigma = sw.conductivity_s_m(35.0, 15.0 / IPTS68_PER_ITS90, 0.0)
    assert sigma == pytest.approx(4.2914, abs=5e-6)


def test_gsw_documentation_check_value():
    # GSW documentation check value: C_from_SP(34.86, 10, 100) = 37.99819884763376 mS/cm.
    assert sw.conductivity_s_m(34.86, 10.0, 100.0) == pytest.approx(3.799819884763376, rel=1e-12)


@pytest.mark.parametrize(
    ("r", "t68", "p", "sp"),
    [
        # Check values of the PSS-78 algorithm: Fofonoff & Millard (1983), UNESCO 44, table of
        # R → S: R 1.2, 20 °C, 2000 dbar → 37.245628; R 0.65, 5 °C, 1500 dbar → 27.995347.
        (1.2, 20.0, 2000.0, 37.245628),
        (0.65, 5.0, 1500.0, 27.995347),
    ],
)
def test_unesco44_conductivity_ratio_check_values(r, t68, p, sp):
    sigma = sw.conductivity_s_m(sp, t68 / IPTS68_PER_ITS90, p)
    assert sigma / 4.2914 == pytest.approx(r, abs=1e-6)


@pytest.mark.parametrize(
    ("sp", "t", "c_ms_cm"),
    [
        (35.0, 15.0, 42.91754),  # computed with gsw 3.6.23 (REFERENCES.md)
        (35.0, 25.0, 53.071032),  # computed with gsw 3.6.23 (REFERENCES.md)
        (35.0, 20.0, 47.918044),  # computed with gsw 3.6.23 (REFERENCES.md)
        (5.0, 10.0, 6.365947),  # computed with gsw 3.6.23 (REFERENCES.md)
    ],
)
def test_conductivity_table_values(sp, t, c_ms_cm):
    assert sw.conductivity_s_m(sp, t) == pytest.approx(c_ms_cm / 10.0, rel=2e-7)


def test_conductivity_temperature_coefficient():
    # PSS-78 at SP 35: about 2.3 %/K at 15 °C and 2.0 %/K at 25 °C (REFERENCES.md, computed
    # from PSS-78).
    w15, w25 = sw.water_state(35.0, 15.0), sw.water_state(35.0, 25.0)
    assert w15.dsigma_dt_s_m_k / w15.sigma_s_m == pytest.approx(0.023, abs=0.001)
    assert w25.dsigma_dt_s_m_k / w25.sigma_s_m == pytest.approx(0.020, abs=0.001)


# ------------------------------------------------------- published values: density, cp, viscosity


def test_density_and_specific_heat():
    # gsw 3.6.23: rho_t_exact(35.1656, 15, 0) = 1025.9765 kg/m³; cp_t_exact → 3993.08 J/(kg·K)
    # (REFERENCES.md). SA = SA_from_SP(35, 0, 0 °E, 0 °N) = 35.1656 g/kg.
    assert sw.density_kg_m3(35.0, 15.0) == pytest.approx(1025.9765, abs=1e-3)
    assert sw.specific_heat_j_kg_k(35.0, 15.0) == pytest.approx(3993.08, abs=0.01)


@pytest.mark.parametrize(
    ("sa", "t", "mu"),
    [
        # Sharqawy, Lienhard & Zubair (2010), Desalination and Water Treatment 16:354–380,
        # eqs. 22–23 (values in REFERENCES.md); correlation accuracy ±1.5 %.
        (35.0, 20.0, 1.07661e-3),
        (35.0, 25.0, 9.5881e-4),
        (35.0, 15.0, 1.21985e-3),
        (5.0, 10.0, 1.31753e-3),
    ],
)
def test_viscosity_sharqawy_values(sa, t, mu):
    assert sw.viscosity_pa_s(sp_for_absolute_salinity(sa), t) == pytest.approx(mu, rel=1e-4)


def test_pure_water_viscosity_matches_iapws():
    # IAPWS value 1.001596e-3 Pa·s at 20 °C, 1 atm (REFERENCES.md, iapws 1.5.5); Sharqawy eq. 22
    # is a fit to IAPWS data, so agreement within its ±1.5 % (actually ≈0.02 %).
    assert sw.viscosity_pa_s(0.0, 20.0) == pytest.approx(1.001596e-3, rel=1e-3)


# ------------------------------------------------------------------------------------ identities


def test_water_state_bundles_the_functions():
    # identity: the record holds exactly what the separate functions return, ν = μ/ρ.
    w = sw.water_state(33.0, 12.0, 50.0)
    assert w.sigma_s_m == sw.conductivity_s_m(33.0, 12.0, 50.0)
    assert w.rho_kg_m3 == sw.density_kg_m3(33.0, 12.0, 50.0)
    assert w.cp_j_kg_k == sw.specific_heat_j_kg_k(33.0, 12.0, 50.0)
    assert w.mu_pa_s == sw.viscosity_pa_s(33.0, 12.0)
    assert w.nu_m2_s == pytest.approx(w.mu_pa_s / w.rho_kg_m3, rel=1e-15)
    assert [f.name for f in dataclasses.fields(sw.WaterState)] == [
        "sp",
        "t_c",
        "p_dbar",
        "sigma_s_m",
        "dsigma_dt_s_m_k",
        "rho_kg_m3",
        "cp_j_kg_k",
        "mu_pa_s",
    ]


def test_conductivity_round_trip_through_gsw_inverse():
    # identity: PSS-78 forward and inverse (gsw.SP_from_C) agree.
    sp = np.array([0.5, 2.0, 10.0, 35.0, 41.0])
    sigma = np.asarray(sw.conductivity_s_m(sp, 18.0, 300.0))
    assert gsw.SP_from_C(sigma * 10.0, 18.0, 300.0) == pytest.approx(sp, abs=1e-9)


def test_dsigma_dt_is_the_slope():
    # identity: dσ/dt agrees with a secant of the conductivity function itself.
    w = sw.water_state(30.0, 10.0)
    secant = (sw.conductivity_s_m(30.0, 10.5) - sw.conductivity_s_m(30.0, 9.5)) / 1.0
    assert w.dsigma_dt_s_m_k == pytest.approx(secant, rel=1e-4)


def test_duct_conductivity_equals_pss78_inside_range_and_is_smooth_at_40():
    w = sw.water_state(35.0, 15.0, 10.0)
    t = np.linspace(-2.0, 40.0, 43)
    assert sw.conductivity_at_temperature_s_m(w, t) == pytest.approx(
        sw.conductivity_s_m(35.0, t, 10.0), rel=1e-14
    )
    assert sw.conductivity_at_temperature_s_m(w, w.t_c) == pytest.approx(w.sigma_s_m, rel=1e-14)
    # continuity of value and slope at 40 °C (model construction, documented in Notes)
    below, at, above = (sw.conductivity_at_temperature_s_m(w, x) for x in (39.9, 40.0, 40.1))
    assert above - at == pytest.approx(at - below, rel=1e-3)
    # beyond 40 °C the extrapolation is linear: equal steps give equal increments
    s60, s80, s95 = (sw.conductivity_at_temperature_s_m(w, x) for x in (60.0, 80.0, 95.0))
    assert (s80 - s60) / 20.0 == pytest.approx((s95 - s80) / 15.0, rel=1e-12)


def test_vectorised_shapes_and_scalar_floats():
    grid_sp, grid_t = np.meshgrid(np.linspace(0, 42, 7), np.linspace(-2, 40, 5))
    for f in (sw.conductivity_s_m, sw.density_kg_m3, sw.specific_heat_j_kg_k):
        assert np.shape(f(grid_sp, grid_t)) == (5, 7)
    assert np.shape(sw.viscosity_pa_s(grid_sp, grid_t)) == (5, 7)
    assert isinstance(sw.conductivity_s_m(35.0, 10.0), float)
    assert isinstance(sw.viscosity_pa_s(35.0, 10.0), float)


# -------------------------------------------------------------------------------- limiting cases


def test_fresh_water_conductivity_small_but_positive():
    # Hill et al. (1986) extension used by gsw below SP 2: SP → 0 gives a tiny positive σ
    # (pure water itself conducts ≈5.5e-6 S/m at 25 °C, common practice).
    sigma = sw.conductivity_s_m(0.0, 20.0)
    assert 0.0 < sigma < 1e-3
    assert sw.conductivity_s_m(0.01, 20.0) > sigma


def test_fresh_water_density_and_viscosity():
    # pure water at 4 °C is near its density maximum ≈ 999.97 kg/m³ (common practice).
    assert sw.density_kg_m3(0.0, 4.0) == pytest.approx(999.97, abs=0.01)
    assert sw.density_kg_m3(0.0, 4.0) > sw.density_kg_m3(0.0, 8.0)
    assert sw.density_kg_m3(0.0, 4.0) > sw.density_kg_m3(0.0, 0.0)


def test_ranges_are_exported():
    assert sw.SALINITY_RANGE == (0.0, 42.0)
    assert sw.TEMPERATURE_RANGE_C == (-2.0, 40.0)
    assert sw.PRESSURE_RANGE_DBAR == (0.0, 11000.0)


# ----------------------------------------------------------------------------------------- errors


@pytest.mark.parametrize(
    ("args", "fragment"),
    [
        ((42.5, 10.0, 0.0), "42.5"),
        ((-0.1, 10.0, 0.0), "-0.1"),
        ((35.0, 41.0, 0.0), "41.0"),
        ((35.0, -2.5, 0.0), "-2.5"),
        ((35.0, 10.0, 11001.0), "11001.0"),
        ((35.0, 10.0, -1.0), "-1.0"),
        ((float("nan"), 10.0, 0.0), "nan"),
        ((35.0, float("inf"), 0.0), "inf"),
    ],
)
def test_out_of_range_raises_with_value(args, fragment):
    for f in (sw.conductivity_s_m, sw.density_kg_m3, sw.specific_heat_j_kg_k, sw.water_state):
        with pytest.raises(ModelRangeError, match=re.escape(fragment)):
            f(*args)


def test_viscosity_and_duct_errors():
    with pytest.raises(ModelRangeError, match=re.escape("45")):
        sw.viscosity_pa_s(45.0, 10.0)
    with pytest.raises(ModelRangeError, match=re.escape("50")):
        sw.viscosity_pa_s(35.0, np.array([10.0, 50.0]))
    w = sw.water_state(35.0, 15.0)
    with pytest.raises(ModelRangeError, match=re.escape("96")):
        sw.conductivity_at_temperature_s_m(w, np.array([20.0, 96.0]))
    with pytest.raises(ModelRangeError, match=re.escape("-3")):
        sw.conductivity_at_temperature_s_m(w, -3.0)
    assert issubclass(ModelRangeError, ValueError)


# ------------------------------------------------------------------------ property-based checks


@settings(max_examples=60, deadline=None)
@given(
    sp=st.floats(0.0, 41.0),
    dsp=st.floats(0.05, 1.0),
    t=st.floats(-2.0, 39.0),
    dt=st.floats(0.05, 1.0),
    p=st.floats(0.0, 11000.0),
)
def test_conductivity_rises_with_temperature_and_salinity(sp, dsp, t, dt, p):
    # PSS-78 (and the Hill et al. 1986 extension) are monotonic in SP and t (UNESCO 44).
    base = sw.conductivity_s_m(sp, t, p)
    assert sw.conductivity_s_m(sp + dsp, t, p) > base
    assert sw.conductivity_s_m(sp, t + dt, p) > base


@settings(max_examples=40, deadline=None)
@given(sp=st.floats(0.0, 42.0), t1=st.floats(-2.0, 95.0), t2=st.floats(-2.0, 95.0))
def test_duct_conductivity_rises_with_temperature(sp, t1, t2):
    w = sw.water_state(sp, 20.0)
    lo, hi = sorted((t1, t2))
    if hi - lo > 1e-6:
        assert sw.conductivity_at_temperature_s_m(w, hi) > sw.conductivity_at_temperature_s_m(w, lo)
