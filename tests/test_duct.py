"""Tests of sim.physics.duct: hydraulic diameter, Darcy friction factor, friction losses."""

from __future__ import annotations

import math

import fluids
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.physics.duct import (
    darcy_friction_factor,
    friction_loss_coefficient,
    friction_pressure_drop_pa,
    friction_terms,
    friction_terms_scalar,
    hydraulic_diameter_m,
    laminar_fre,
)
from sim.physics.errors import ModelRangeError


def _exact_rect_fre(alpha: float) -> float:
    """Darcy f·Re of a rectangle from the exact Fourier-series solution of laminar flow.

    Q = (4ba³/3μ)(−dp/dx)[1 − (192a/π⁵b) Σ_{i odd} tanh(iπb/2a)/i⁵] for half-sides a ≤ b
    (White, F. M. (2006). Viscous Fluid Flow, 3rd ed., McGraw-Hill, eq. 3-48).
    """
    a, b = alpha, 1.0
    i = np.arange(1, 4001, 2, dtype=float)
    series = np.sum(np.tanh(i * math.pi * b / (2.0 * a)) / i**5)
    q_mu_per_dpdx = 4.0 * b * a**3 / 3.0 * (1.0 - 192.0 * a / (math.pi**5 * b) * series)
    u_mean = q_mu_per_dpdx / (4.0 * a * b)
    d_h = 4.0 * a * b / (a + b)
    return 2.0 * d_h**2 / u_mean


# ---------------------------------------------------------------- published / library values


@pytest.mark.parametrize(
    ("re", "eps", "f_ref"),
    [
        # fluids 1.3.1 friction_factor(Re, eD, Method='Colebrook'), /work/shared/REFERENCES.md
        (4e3, 0.0, 0.039907),
        (1e5, 0.0, 0.017990),
        (1e6, 0.0, 0.011645),
        # fluids docstring Colebrook(1E5, 1E-4) and computed values, REFERENCES.md
        (1e5, 1e-4, 0.018514),
        (1e5, 1e-3, 0.022175),
        (1e5, 1e-2, 0.038504),
        (1e7, 1e-4, 0.012166),
    ],
)
def test_colebrook_reference_values(re, eps, f_ref):
    # Colebrook (1939) values as tabulated in REFERENCES.md (6 significant digits)
    assert darcy_friction_factor(re, eps) == pytest.approx(f_ref, rel=3e-5)


def test_colebrook_matches_fluids_live():
    # fluids.friction_factor(Method='Colebrook') solves Colebrook (1939) exactly (Lambert W)
    for re in np.geomspace(4e3, 1e8, 15):
        for eps in (0.0, 1e-6, 1e-4, 1e-3, 1e-2, 5e-2):
            ref = fluids.friction_factor(Re=float(re), eD=eps, Method="Colebrook")
            assert darcy_friction_factor(re, eps) == pytest.approx(ref, rel=1e-10)


def test_laminar_parallel_plates_limit_96_over_re():
    # α → 0: parallel plates, f = 96/Re (Shah & London 1978; plane Poiseuille flow)
    for re in (1.0, 100.0, 1000.0, 2000.0):
        assert darcy_friction_factor(re, 0.0, 0.0) == pytest.approx(96.0 / re, rel=1e-12)


def test_laminar_square_duct_56_91_over_re():
    # square duct: Darcy f·Re = 56.91 (Shah & London 1978 table, Fanning f·Re = 14.227)
    assert darcy_friction_factor(1000.0, 0.0, 1.0) * 1000.0 == pytest.approx(56.91, rel=3e-4)


@pytest.mark.parametrize(
    ("alpha", "fre_fanning"),
    # Shah & London (1978), fully developed rectangular ducts, Fanning f·Re table values
    [(1.0, 14.227), (0.5, 15.548), (0.25, 18.233), (0.125, 20.585), (0.0, 24.000)],
)
def test_laminar_shah_london_table(alpha, fre_fanning):
    # the polynomial fit is quoted as accurate to about 0.05 %; allow 0.1 %
    assert laminar_fre(alpha) == pytest.approx(4.0 * fre_fanning, rel=1e-3)


def test_laminar_polynomial_against_exact_series():
    # exact series solution (White 2006, Viscous Fluid Flow, eq. 3-48) over the aspect range
    for alpha in np.linspace(0.02, 1.0, 25):
        assert laminar_fre(alpha) == pytest.approx(_exact_rect_fre(alpha), rel=1e-3)


def test_laminar_circular_pipe_value_is_not_the_rectangle():
    # Hagen–Poiseuille f = 64/Re (REFERENCES.md, Re 1000 → 0.064) via fluids, for contrast:
    # every rectangle lies between the square (56.9) and parallel plates (96), not at 64 for α→0
    assert fluids.friction.friction_laminar(1000.0) == pytest.approx(0.064, rel=1e-12)
    fres = laminar_fre(np.linspace(0.0, 1.0, 51))
    assert np.all(np.diff(fres) < 0.0)
    assert fres[0] == pytest.approx(96.0) and fres[-1] == pytest.approx(56.91, rel=3e-4)


def test_hydraulic_diameter_definition():
    # D_h = 4A/P (definition; fluids has no function for it — REFERENCES.md)
    w, h = 0.3, 0.05
    assert hydraulic_diameter_m(w, h) == pytest.approx(4.0 * w * h / (2.0 * (w + h)), rel=1e-15)
    assert hydraulic_diameter_m(0.2, 0.2) == pytest.approx(0.2, rel=1e-15)  # square: side
    assert hydraulic_diameter_m(1e6, 0.01) == pytest.approx(0.02, rel=1e-6)  # plates: 2h
    arr = hydraulic_diameter_m(np.array([0.1, 0.2]), 0.1)
    assert arr.shape == (2,)


# ---------------------------------------------------------------- identities and limits


def test_transition_blend_is_continuous_and_linear_weighted():
    # documented blend: f = (1 − t) f_lam + t f_Colebrook, t = (Re − 2300)/1700 (modelling choice)
    for edge in (2300.0, 4000.0):
        lo = darcy_friction_factor(edge * (1 - 1e-9), 1e-4, 0.5)
        hi = darcy_friction_factor(edge * (1 + 1e-9), 1e-4, 0.5)
        assert lo == pytest.approx(hi, rel=1e-6)
    re = 3000.0
    t = (re - 2300.0) / 1700.0
    f_lam = laminar_fre(0.5) / re
    f_col = fluids.friction_factor(Re=re, eD=1e-4, Method="Colebrook")
    assert darcy_friction_factor(re, 1e-4, 0.5) == pytest.approx(
        (1 - t) * f_lam + t * f_col, rel=1e-10
    )


def test_zero_reynolds_is_finite_where_it_matters():
    # f·Re stays finite as Re → 0 (laminar law); the pressure drop vanishes at u = 0
    fre, fq, m = friction_terms(np.array([0.0, 10.0]), 0.0, 1.0)
    assert np.all(np.isfinite(fre)) and fre[0] == pytest.approx(laminar_fre(1.0))
    assert fq[0] == 0.0 and m[0] == -1.0
    assert darcy_friction_factor(0.0, 0.0) == math.inf
    assert friction_pressure_drop_pa(0.0, 1.0, 0.1, 1025.0, 1.2e-3, 0.0) == 0.0
    assert friction_loss_coefficient(0.0, 1.0, 0.1, 1025.0, 1.2e-3, 0.0) == math.inf


def test_pressure_drop_equals_darcy_weisbach():
    # Darcy–Weisbach: Δp = K_f ½ρu|u|, K_f = f L/D_h, sign follows the flow
    rho, mu, d, length = 1025.98, 1.22e-3, 0.08, 2.0
    for u in (1e-4, 0.02, 0.5, 3.0, -3.0):
        k_f = friction_loss_coefficient(u, length, d, rho, mu, 1e-4, 0.6)
        re = rho * abs(u) * d / mu
        assert k_f == pytest.approx(darcy_friction_factor(re, 1e-4, 0.6) * length / d, rel=1e-12)
        dp = friction_pressure_drop_pa(u, length, d, rho, mu, 1e-4, 0.6)
        assert dp == pytest.approx(k_f * 0.5 * rho * u * abs(u), rel=1e-12)


def test_laminar_pressure_drop_linear_in_velocity():
    # Hagen–Poiseuille-type law: laminar Δp ∝ u
    args = (1.0, 0.01, 1025.0, 1.2e-3, 0.0, 1.0)
    a = friction_pressure_drop_pa(0.01, *args)
    b = friction_pressure_drop_pa(0.02, *args)
    assert b == pytest.approx(2.0 * a, rel=1e-12)


def test_log_slope_matches_numerical_derivative():
    # internal consistency of d ln f / d ln Re used by the thruster solver
    for re in (500.0, 2500.0, 3500.0, 5e3, 1e5, 1e7):
        _, _, m = friction_terms(re, 1e-4, 0.7)
        h = 1e-6
        f1 = darcy_friction_factor(re * (1 + h), 1e-4, 0.7)
        f0 = darcy_friction_factor(re * (1 - h), 1e-4, 0.7)
        num = (math.log(f1) - math.log(f0)) / (math.log(1 + h) - math.log(1 - h))
        assert float(m) == pytest.approx(num, rel=1e-5, abs=1e-8)


@settings(max_examples=60, deadline=None)
@given(
    re=st.floats(0.0, 1e8),
    eps=st.sampled_from([0.0, 1e-5, 1e-3, 3e-2]),
    alpha=st.floats(0.0, 1.0),
)
def test_scalar_twin_matches_vector(re, eps, alpha):
    vec = [float(x) for x in friction_terms(re, eps, alpha)]
    sca = friction_terms_scalar(re, eps, alpha)
    assert sca == pytest.approx(vec, rel=1e-12, abs=1e-15)


@settings(max_examples=60, deadline=None)
@given(re=st.floats(10.0, 1e8), eps=st.floats(0.0, 0.05))
def test_pressure_drop_grows_with_velocity(re, eps):
    # f·Re·u grows with u on every branch (a unique duct-flow solution rests on this)
    f1 = darcy_friction_factor(re, eps, 0.5) * re**2
    f2 = darcy_friction_factor(re * 1.01, eps, 0.5) * (re * 1.01) ** 2
    assert f2 > f1


def test_out_of_range_inputs_raise():
    with pytest.raises(ModelRangeError):
        darcy_friction_factor(-1.0, 0.0)
    with pytest.raises(ModelRangeError):
        darcy_friction_factor(1e5, 0.2)
    with pytest.raises(ModelRangeError):
        darcy_friction_factor(1e5, 0.0, 1.5)
    with pytest.raises(ModelRangeError):
        hydraulic_diameter_m(0.0, 1.0)
