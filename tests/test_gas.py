"""Tests of sim.physics.gas: electrolysis gas volume, void fraction, mixture conductivity."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from sim.physics import gas
from sim.physics.errors import ModelRangeError

L_PER_M3 = 1e3
S_PER_H = 3600.0


# --------------------------------------------------------------------------- published values


def test_gas_volume_per_ampere_hour_against_faraday():
    # Faraday's law (REFERENCES.md): 0.456 L/h of H₂ per ampere at 25 °C, 1 atm; Cl₂ the same
    # moles (all-chlorine anode), O₂ half the moles (all-oxygen anode).
    h2_l_h = 0.456
    both_cl = gas.gas_volume_flow_m3_s(1.0, chlorine_fraction=1.0) * L_PER_M3 * S_PER_H
    both_o = gas.gas_volume_flow_m3_s(1.0, chlorine_fraction=0.0) * L_PER_M3 * S_PER_H
    assert both_cl == pytest.approx(2.0 * h2_l_h, abs=0.002)
    assert both_o == pytest.approx(1.5 * h2_l_h, abs=0.002)
    # ideal gas: volume ∝ T/p (Boyle–Charles); 10 m of seawater ≈ one more atmosphere
    deep = gas.gas_volume_flow_m3_s(1.0, 1.0, pressure_pa=2.0 * gas.ATM_PA)
    assert deep == pytest.approx(0.5 * gas.gas_volume_flow_m3_s(1.0, 1.0), rel=1e-14)


def test_bruggeman_and_maxwell_formulas():
    # Bruggeman (1935): σ/σ0 = (1 − ε)^1.5; Maxwell (1873, §314): 2(1 − ε)/(2 + ε)
    # ε = 0.1: 0.9^1.5 = 0.853815; 1.8/2.1 = 0.857143 (values computed from the formulas)
    assert gas.conductivity_ratio(0.1, "bruggeman") == pytest.approx(0.853815, abs=1e-6)
    assert gas.conductivity_ratio(0.1, "maxwell") == pytest.approx(0.857143, abs=1e-6)
    assert gas.conductivity_ratio(0.3, "bruggeman") == pytest.approx(0.585662, abs=1e-6)
    assert gas.conductivity_ratio(0.3, "maxwell") == pytest.approx(0.608696, abs=1e-6)


@pytest.mark.parametrize("model", ["bruggeman", "maxwell"])
def test_dilute_limit(model):
    # both → 1 − 1.5ε for small ε (Maxwell 1873; Bruggeman 1935), error O(ε²)
    for eps in (1e-3, 1e-4, 1e-6):
        assert float(gas.conductivity_ratio(eps, model)) == pytest.approx(
            1.0 - 1.5 * eps, abs=2.0 * eps * eps
        )


def test_maxwell_is_above_bruggeman():
    # Maxwell's formula is the Hashin–Shtrikman upper bound for insulating spheres (Hashin &
    # Shtrikman 1962, J. Appl. Phys. 33:3125); Bruggeman's effective medium lies below it
    eps = np.linspace(0.01, 0.99, 99)
    assert np.all(gas.conductivity_ratio(eps, "maxwell") > gas.conductivity_ratio(eps, "bruggeman"))


# ---------------------------------------------------------------------------------- identities


@pytest.mark.parametrize("model", ["bruggeman", "maxwell"])
@pytest.mark.parametrize("slip", [1.0, 1.3, 3.0])
@pytest.mark.parametrize("a", [1e-6, 1e-3, 0.05, 0.4, 2.0, 30.0])
def test_closed_form_means_against_quadrature(model, slip, a):
    # the closed forms integrate the profile ε(t) = a t/(a t + S) along the channel: check them
    # against adaptive quadrature (scipy.integrate.quad) of the same profile
    def eps(t):
        return a * t / (a * t + slip)

    ref_f = quad(lambda t: float(gas.conductivity_ratio(eps(t), model)), 0.0, 1.0)[0]
    ref_e = quad(eps, 0.0, 1.0, epsabs=1e-15)[0]
    assert float(gas.mean_conductivity_ratio(a, model, slip)) == pytest.approx(ref_f, rel=1e-10)
    assert float(gas.mean_void_fraction(a, slip)) == pytest.approx(ref_e, rel=1e-8, abs=1e-15)
    assert float(gas.outlet_void_fraction(a, slip)) == pytest.approx(eps(1.0), rel=1e-14)
    assert gas.mean_conductivity_ratio_scalar(a, model, slip) == pytest.approx(
        float(gas.mean_conductivity_ratio(a, model, slip)), rel=1e-15
    )


def test_homogeneous_void_fraction_is_volume_flow_fraction():
    # no slip: ε = Q_g/(Q_g + Q_w) at the outlet (homogeneous flow, definition)
    d = gas.duct_gas(100.0, 2e-3, model="maxwell")
    q_g = float(d.gas_flow_m3_s)
    assert float(d.outlet_void_fraction) == pytest.approx(q_g / (q_g + 2e-3), rel=1e-14)
    assert float(d.gas_to_water) == pytest.approx(q_g / 2e-3, rel=1e-14)
    # slip S > 1: the gas moves faster, so it occupies less of the channel
    s = gas.duct_gas(100.0, 2e-3, model="maxwell", slip_ratio=1.2)
    assert float(s.outlet_void_fraction) < float(d.outlet_void_fraction)
    assert float(s.conductivity_ratio) > float(d.conductivity_ratio)


# ------------------------------------------------------------------------------ limiting cases


def test_zero_current_changes_nothing():
    d = gas.duct_gas(0.0, 1e-3)
    assert float(d.conductivity_ratio) == 1.0 and float(d.mean_void_fraction) == 0.0
    assert float(gas.duct_gas(0.0, 0.0).conductivity_ratio) == 1.0


def test_stagnant_water_fills_with_gas():
    d = gas.duct_gas(10.0, 0.0)
    assert float(d.outlet_void_fraction) == 1.0 and float(d.mean_void_fraction) == 1.0
    assert float(d.conductivity_ratio) == 0.0


def test_model_none_is_unity():
    assert float(gas.mean_conductivity_ratio(5.0, "none")) == 1.0


def test_errors_name_the_value():
    with pytest.raises(ModelRangeError, match="foam"):
        gas.conductivity_ratio(0.1, "foam")
    with pytest.raises(ModelRangeError, match=r"1\.5"):
        gas.conductivity_ratio(1.5)
    with pytest.raises(ModelRangeError, match="slip_ratio"):
        gas.mean_conductivity_ratio(0.1, "maxwell", 0.0)
    with pytest.raises(ModelRangeError, match="pressure_pa"):
        gas.gas_volume_flow_m3_s(1.0, pressure_pa=-1.0)


# --------------------------------------------------------------------------- property-based


@settings(max_examples=60, deadline=None)
@given(
    a1=st.floats(0.0, 1e3),
    a2=st.floats(0.0, 1e3),
    model=st.sampled_from(["bruggeman", "maxwell"]),
)
def test_more_gas_less_conductivity(a1, a2, model):
    lo, hi = sorted((a1, a2))
    f_lo = float(gas.mean_conductivity_ratio(lo, model))
    f_hi = float(gas.mean_conductivity_ratio(hi, model))
    assert 0.0 <= f_hi <= f_lo * (1.0 + 1e-14) <= 1.0 + 1e-14
    assert math.isfinite(f_hi)
