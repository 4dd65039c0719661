"""Tests of the equivalent-circuit battery pack model (sim.physics.battery).

Three kinds of check, each with its source beside it: published values (Huria et al. 2012 cell
table, Peukert 1897), identities (circuit theory, conservation of charge and energy, Bernardi
et al. 1985 heat balance), and limiting cases (ideal source, zero power, power maximum, series and
parallel scaling), plus hypothesis properties where monotonicity is expected.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
import scipy.constants
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad, solve_ivp, trapezoid

from sim.physics import battery as bt
from sim.physics.errors import ModelRangeError

NMC = bt.NMC_POUCH_HURIA2012
LFP = bt.LFP_PRISMATIC_REPRESENTATIVE

# Huria, Ceraolo, Gazzarri & Jackey (2012), IEEE IEVC, 20 °C table as listed in
# /work/shared/REFERENCES.md (attribution from memory); the full spot-value table is in
# tests/test_cell_sets.py.
HURIA_SOC = (0.0, 0.1, 0.25, 0.5, 0.75, 0.9, 1.0)
HURIA_OCV = (3.51, 3.56, 3.64, 3.71, 3.93, 4.08, 4.19)


def single(cell: bt.CellParameters = NMC, **kw) -> bt.Pack:
    return bt.Pack(cell, 1, 1, **kw)


# ------------------------------------------------------------------------------------------------
# Published values
# ------------------------------------------------------------------------------------------------


def test_huria_capacity_and_linear_interpolation_between_points():
    # Huria et al. (2012): 27.63 A·h. Between breakpoints the OCV is the straight line through
    # the neighbouring table values (linear interpolation, by construction of the model).
    pack = single()
    assert pack.capacity_ah == 27.63
    assert bt.ocv_v(pack, 0.375) == pytest.approx(0.5 * (3.64 + 3.71), rel=1e-12)


@pytest.mark.parametrize(("k", "hours"), [(1.2, 8.706), (1.1, 9.330), (1.05, 9.659)])
def test_peukert_published_values(k, hours):
    # Peukert (1897); values in REFERENCES.md: C 100 A·h, H 20 h, I 10 A.
    assert bt.peukert_runtime_h(100.0, 20.0, 10.0, k) == pytest.approx(hours, abs=6e-4)


def test_peukert_rated_current_and_vector():
    # Peukert (1897): at the rated current C/H the runtime is H whatever k.
    t = bt.peukert_runtime_h(100.0, 20.0, 5.0, np.array([1.0, 1.1, 1.3]))
    np.testing.assert_allclose(t, 20.0, rtol=1e-14)
    # k = 1 is the ideal coulomb counter: t = C/I
    assert bt.peukert_runtime_h(100.0, 20.0, 10.0, 1.0) == pytest.approx(10.0, rel=1e-14)
    with pytest.raises(ModelRangeError, match="current_a"):
        bt.peukert_runtime_h(100.0, 20.0, 0.0, 1.1)
    with pytest.raises(ModelRangeError, match="k"):
        bt.peukert_runtime_h(100.0, 20.0, 10.0, 0.9)


def test_arrhenius_factor_matches_formula_with_scipy_gas_constant():
    # Arrhenius (1889); gas constant from scipy.constants (CODATA 2018).
    pack = single()
    ea = NMC.activation_energy_j_mol
    for t_c in (-20.0, 0.0, 20.0, 45.0):
        expect = math.exp(ea / scipy.constants.R * (1.0 / (t_c + 273.15) - 1.0 / 293.15))
        assert bt.resistance_temperature_factor(pack, t_c) == pytest.approx(expect, rel=1e-9)
        assert bt.r0_ohm(pack, 0.5, t_c) == pytest.approx(8.2e-3 * expect, rel=1e-9)
    assert bt.resistance_temperature_factor(pack, 20.0) == 1.0
    f = bt.resistance_temperature_factor(pack, np.array([0.0, 20.0, 40.0]))
    assert f[1] == pytest.approx(1.0, rel=1e-14)
    assert f[0] > f[1] > f[2]


def test_named_sets_and_sources():
    # Conventions: each set names its source; LFP set is labelled as from memory.
    assert bt.CELL_SETS["nmc_pouch_huria2012"] is NMC
    assert bt.CELL_SETS["lfp_prismatic_representative"] is LFP
    assert "Huria" in NMC.source and "from memory" in NMC.source
    assert "from memory" in LFP.source and "from memory" in LFP.name
    assert NMC.n_rc == 1 and LFP.n_rc == 2


def test_lfp_set_is_plausible_loose():
    # From memory (loose): LFP/graphite nominal voltage ≈ 3.2–3.3 V, cell specific energy of
    # large prismatic LFP cells ≈ 140–190 W·h/kg, voltage window 2.5–3.65 V (common practice).
    assert 3.15 < LFP.nominal_voltage_v < 3.35
    assert 140.0 < LFP.energy_wh / LFP.mass_kg < 190.0
    assert LFP.v_min == 2.5 and LFP.v_max == 3.65


# ------------------------------------------------------------------------------------------------
# Identities
# ------------------------------------------------------------------------------------------------


def test_energy_wh_is_integral_of_ocv_over_charge():
    # Definition E = ∫OCV dQ, computed independently with scipy (trapezoid on the table and
    # adaptive quadrature of the interpolant).
    cell_e = trapezoid(HURIA_OCV, HURIA_SOC) * 27.63
    assert NMC.energy_wh == pytest.approx(cell_e, rel=1e-12)
    q, _ = quad(lambda s: np.interp(s, HURIA_SOC, HURIA_OCV), 0.0, 1.0, points=HURIA_SOC[1:-1])
    assert NMC.energy_wh == pytest.approx(q * 27.63, rel=1e-9)
    pack = bt.Pack(NMC, 96, 3)
    assert pack.energy_wh == pytest.approx(96 * 3 * cell_e, rel=1e-12)


@pytest.mark.parametrize(("ns", "np_"), [(1, 1), (3, 2)])
def test_one_rc_constant_current_closed_form(ns, np_):
    # Circuit theory: V1(t) = I·R1·(1 − exp(−t/(R1·C1))) for a step of constant current from
    # rest; matched by integrating drc_dt with scipy's solve_ivp (SOC held at 0.5).
    pack = bt.Pack(NMC, ns, np_)
    i = 2.0 * 27.63 * np_
    r1 = 1.6e-3 * ns / np_
    c1 = 18721.0 * np_ / ns
    sol = solve_ivp(
        lambda t, y: bt.drc_dt(pack, 0.5, 20.0, i, y),
        (0.0, 200.0),
        [0.0],
        rtol=1e-11,
        atol=1e-14,
        dense_output=True,
    )
    t = np.linspace(1.0, 200.0, 50)
    exact = i * r1 * (1.0 - np.exp(-t / (r1 * c1)))
    np.testing.assert_allclose(sol.sol(t)[0], exact, rtol=1e-6)


def test_two_rc_pairs_are_independent_first_order_lags():
    # Circuit theory: each RC pair of the 2-RC cell follows its own exponential.
    pack = bt.Pack(LFP, 4, 2)
    i = 150.0
    (r1, c1), (r2, c2) = bt.rc_params(pack, 0.5, 25.0)
    sol = solve_ivp(
        lambda t, y: bt.drc_dt(pack, 0.5, 25.0, i, y),
        (0.0, 900.0),
        [0.0, 0.0],
        rtol=1e-11,
        atol=1e-14,
        dense_output=True,
    )
    t = np.linspace(5.0, 900.0, 40)
    np.testing.assert_allclose(sol.sol(t)[0], i * r1 * (1 - np.exp(-t / (r1 * c1))), rtol=1e-6)
    np.testing.assert_allclose(sol.sol(t)[1], i * r2 * (1 - np.exp(-t / (r2 * c2))), rtol=1e-6)


def _discharge(pack: bt.Pack, current: float, t_end: float, soc0: float, temp_c: float):
    """Integrate SOC, RC voltages and the energy ledgers at constant current and temperature."""
    n = pack.n_rc

    def rhs(_t, y):
        soc, v = y[0], tuple(y[1 : 1 + n])
        op = bt.solve_terminal_for_current(pack, soc, sum(v), temp_c, current)
        return [
            bt.dsoc_dt(pack, current),
            *bt.drc_dt(pack, soc, temp_c, current, v),
            op.terminal_v * current,  # ∫V_term·I dt
            bt.heat_generation_w(pack, current, soc, temp_c, v),  # ∫Q dt
            bt.ocv_v(pack, soc) * current,  # ∫OCV·I dt
            sum(
                vk * dv * ck
                for vk, dv, (_r, ck) in zip(  # ∫ΣV·C·dV/dt dt
                    v,
                    bt.drc_dt(pack, soc, temp_c, current, v),
                    bt.rc_params(pack, soc, temp_c),
                    strict=True,
                )
            ),
            current,  # ∫I dt
        ]

    y0 = [soc0, *([0.0] * n), 0.0, 0.0, 0.0, 0.0, 0.0]
    return solve_ivp(rhs, (0.0, t_end), y0, method="DOP853", rtol=1e-11, atol=1e-9)


def test_energy_balance_constant_capacitance_exact():
    # Conservation of energy: ∫OCV·I dt = ∫V_term·I dt + ∫Q dt + Σ ½·C_k·V_k(t_end)², exact for
    # SOC-independent capacitances (the LFP set), with two RC pairs and busbar resistance.
    pack = bt.Pack(LFP, 8, 2, extra_series_resistance_ohm=2e-3)
    sol = _discharge(pack, 150.0, 1800.0, 0.9, 25.0)
    y = sol.y[:, -1]
    v1, v2 = y[1], y[2]
    (_r1, c1), (_r2, c2) = bt.rc_params(pack, y[0], 25.0)
    stored = 0.5 * c1 * v1**2 + 0.5 * c2 * v2**2
    e_term, e_heat, e_ocv, e_cap = y[3], y[4], y[5], y[6]
    assert e_term + e_heat + stored == pytest.approx(e_ocv, rel=1e-9)
    assert e_cap == pytest.approx(stored, rel=1e-7)


def test_energy_balance_huria_discharge():
    # Conservation of energy over a 1C discharge of the Huria cell (SOC-dependent R1, C1):
    # ∫OCV·I dt = ∫V_term·I dt + ∫Q dt + ∫Σ V_k·C_k·dV_k/dt dt, the last term being the power
    # taken up by the RC capacitances (V_k·(I − V_k/R_k)). It is small: the simple balance
    # ∫V_term·I dt + ∫Q dt = ∫OCV·I dt holds to 5e-4 here.
    pack = bt.Pack(NMC, 2, 1)
    sol = _discharge(pack, 27.63, 3300.0, 1.0, 20.0)
    e_term, e_heat, e_ocv, e_cap = sol.y[-5:-1, -1]
    assert e_term + e_heat + e_cap == pytest.approx(e_ocv, rel=1e-9)
    assert e_term + e_heat == pytest.approx(e_ocv, rel=5e-4)
    assert e_term < e_ocv  # losses are positive


def test_charge_conservation_discharge_and_charge():
    # Coulomb counting: ∫I dt = ΔSOC·Q on discharge; on charge the stored charge is η_c·∫|I| dt.
    pack = bt.Pack(NMC, 2, 3)
    sol = _discharge(pack, 40.0, 3000.0, 0.95, 20.0)
    dsoc = sol.y[0, 0] - sol.y[0, -1]
    assert sol.y[-1, -1] == pytest.approx(dsoc * pack.capacity_ah * 3600.0, rel=1e-9)
    sol = _discharge(pack, -40.0, 3000.0, 0.05, 20.0)
    dsoc = sol.y[0, -1] - sol.y[0, 0]
    assert NMC.coulombic_efficiency * -sol.y[-1, -1] == pytest.approx(
        dsoc * pack.capacity_ah * 3600.0, rel=1e-9
    )


def test_dsoc_dt_values():
    # Coulomb counting: 1C empties the pack in one hour; charge scaled by η_c.
    pack = bt.Pack(NMC, 10, 2)
    assert bt.dsoc_dt(pack, 2 * 27.63) == pytest.approx(-1.0 / 3600.0, rel=1e-12)
    assert bt.dsoc_dt(pack, -2 * 27.63) == pytest.approx(0.999 / 3600.0, rel=1e-12)
    assert bt.dsoc_dt(pack, 0.0) == 0.0
    np.testing.assert_allclose(
        bt.dsoc_dt(pack, np.array([2 * 27.63, -2 * 27.63])),
        [-1 / 3600.0, 0.999 / 3600.0],
        rtol=1e-12,
    )


@pytest.mark.parametrize("power", [5e3, 15e3, -20e3, 1e-3])
def test_power_solve_delivers_demanded_power(power):
    # Definition P = I·V_term: the solved current times the terminal voltage is the demand.
    pack = bt.Pack(NMC, 30, 2, extra_series_resistance_ohm=5e-3)
    op = bt.solve_current_for_power(pack, 0.6, 0.8, 10.0, power)
    assert op.feasible
    assert op.current_a * op.terminal_v == pytest.approx(power, rel=1e-12)
    assert op.power_w == pytest.approx(power, rel=1e-12)
    assert (op.current_a > 0) == (power > 0)
    # round trip through the current-driven solve
    back = bt.solve_terminal_for_current(pack, 0.6, 0.8, 10.0, op.current_a)
    assert back.terminal_v == pytest.approx(op.terminal_v, rel=1e-13)
    assert back.cell_v == pytest.approx(op.cell_v, rel=1e-13)


def test_power_solve_vector_matches_scalar():
    # The array path and the scalar path implement the same algebra.
    pack = bt.Pack(LFP, 16, 2, extra_series_resistance_ohm=1e-3)
    soc = np.array([0.02, 0.3, 0.5, 0.97, 0.5, 0.5])
    power = np.array([5e3, 20e3, -10e3, 0.0, 1e7, 30e3])
    op = bt.solve_current_for_power(pack, soc, 0.1, 5.0, power)
    for k in range(len(soc)):
        one = bt.solve_current_for_power(pack, float(soc[k]), 0.1, 5.0, float(power[k]))
        assert op.current_a[k] == pytest.approx(one.current_a, rel=1e-13)
        assert op.terminal_v[k] == pytest.approx(one.terminal_v, rel=1e-13)
        assert op.cell_v[k] == pytest.approx(one.cell_v, rel=1e-13)
        assert op.max_power_w[k] == pytest.approx(one.max_power_w, rel=1e-13)
        assert bool(op.feasible[k]) == one.feasible
        assert bool(op.within_limits[k]) == one.within_limits
        assert op.reason[k] == one.reason
    np.testing.assert_allclose(
        op.current_a[op.feasible] * op.terminal_v[op.feasible], power[op.feasible], rtol=1e-12
    )


def test_heat_is_sum_of_joule_terms():
    # Bernardi et al. (1985) irreversible heat for the circuit: I²R0 + Σ V_k²/R_k, which equals
    # I·(OCV − V_term) in the steady state V_k = I·R_k.
    pack = bt.Pack(LFP, 4, 1, extra_series_resistance_ohm=1e-3)
    i, soc, t = 80.0, 0.5, 25.0
    pairs = bt.rc_params(pack, soc, t)
    v = tuple(i * r for r, _c in pairs)
    q = bt.heat_generation_w(pack, i, soc, t, v)
    op = bt.solve_terminal_for_current(pack, soc, sum(v), t, i)
    assert q == pytest.approx(i * (bt.ocv_v(pack, soc) - op.terminal_v), rel=1e-12)
    q_cells = bt.heat_generation_w(pack, i, soc, t, v, include_busbars=False)
    assert q - q_cells == pytest.approx(i * i * 1e-3, rel=1e-9)
    qa = bt.heat_generation_w(
        pack, np.array([i, -i]), soc, t, (np.array([v[0], v[0]]), np.array([v[1], v[1]]))
    )
    assert qa[0] == pytest.approx(q, rel=1e-13)


def test_reversible_heat_sign_bernardi():
    # Bernardi et al. (1985): reversible heat −I·T·∂U/∂T; with ∂U/∂T > 0 a discharging cell
    # absorbs heat and a charging cell releases it.
    cell = replace(NMC, entropic_coefficient_v_k=1e-4)
    pack = bt.Pack(cell, 10, 1)
    base = bt.Pack(NMC, 10, 1)
    for i in (30.0, -30.0):
        dq = bt.heat_generation_w(pack, i, 0.5, 25.0, 0.0) - bt.heat_generation_w(
            base, i, 0.5, 25.0, 0.0
        )
        assert dq == pytest.approx(-i * 298.15 * 10 * 1e-4, rel=1e-12)


def test_lumped_thermal_energy_balance():
    # Energy conservation of one thermal node: adiabatic, ∫Q dt = n·m·c_p·ΔT; with cooling the
    # steady state is T_amb + Q/UA.
    pack = bt.Pack(NMC, 10, 2)
    cth = 20 * 0.65 * 1000.0
    assert pack.thermal_mass_j_k == pytest.approx(cth, rel=1e-12)
    assert bt.battery_temperature_rate_k_s(pack, 130.0, 25.0, 25.0, 0.0) == pytest.approx(
        130.0 / cth, rel=1e-12
    )
    assert bt.battery_temperature_rate_k_s(pack, 50.0, 30.0, 20.0, 5.0) == pytest.approx(
        0.0, abs=1e-15
    )
    sol = solve_ivp(
        lambda t, y: [bt.battery_temperature_rate_k_s(pack, 40.0, y[0], 15.0, 2.0)],
        (0.0, 2e5),
        [15.0],
        rtol=1e-10,
        atol=1e-10,
    )
    assert sol.y[0, -1] == pytest.approx(15.0 + 40.0 / 2.0, rel=1e-6)
    with pytest.raises(ModelRangeError, match="ua_w_k"):
        bt.battery_temperature_rate_k_s(pack, 1.0, 20.0, 20.0, -1.0)


# ------------------------------------------------------------------------------------------------
# Limiting cases
# ------------------------------------------------------------------------------------------------


def test_ideal_source_current_is_power_over_emf():
    # Limiting case R0 → 0: P = I·E, so I = P/E exactly.
    ideal = replace(NMC, r0_ohm=(0.0,) * 7)
    pack = bt.Pack(ideal, 50, 1)
    e = bt.ocv_v(pack, 0.4) - 0.3
    for p in (1e4, -7.5e3, 123.456):
        op = bt.solve_current_for_power(pack, 0.4, 0.3, 20.0, p)
        assert op.current_a == p / e
        assert op.max_power_w == math.inf
    opv = bt.solve_current_for_power(pack, 0.4, 0.3, 20.0, np.array([1e4, -7.5e3]))
    np.testing.assert_array_equal(opv.current_a, np.array([1e4, -7.5e3]) / e)
    assert np.all(np.isinf(opv.max_power_w))


def test_zero_power_zero_current():
    # Limiting case: no demand draws no current and the terminals show E = OCV − ΣV_k.
    pack = bt.Pack(LFP, 12, 3)
    op = bt.solve_current_for_power(pack, 0.5, 0.05, 25.0, 0.0)
    assert op.current_a == 0.0
    assert op.terminal_v == pytest.approx(bt.ocv_v(pack, 0.5) - 0.05, rel=1e-15)
    opv = bt.solve_current_for_power(pack, np.array([0.1, 0.9]), 0.0, 25.0, 0.0)
    np.testing.assert_array_equal(opv.current_a, [0.0, 0.0])


def test_power_maximum_and_infeasible_demand():
    # Maximum power transfer: P_max = E²/(4R0) at I = E/(2R0), V = E/2; above it no real root.
    pack = bt.Pack(NMC, 10, 1, extra_series_resistance_ohm=0.01)
    e = bt.ocv_v(pack, 0.5) - 0.2
    r = bt.r0_ohm(pack, 0.5, 20.0)
    pmax = e * e / (4 * r)
    at = bt.solve_current_for_power(pack, 0.5, 0.2, 20.0, pmax)
    assert at.feasible
    assert at.current_a == pytest.approx(e / (2 * r), rel=1e-6)
    over = bt.solve_current_for_power(pack, 0.5, 0.2, 20.0, 1.01 * pmax)
    assert not over.feasible and not over.within_limits
    assert over.reason == "demanded power exceeds what the pack can deliver"
    assert over.max_power_w == pytest.approx(pmax, rel=1e-12)
    assert over.current_a == pytest.approx(e / (2 * r), rel=1e-12)
    assert over.terminal_v == pytest.approx(e / 2, rel=1e-12)
    vec = bt.solve_current_for_power(pack, 0.5, 0.2, 20.0, np.array([0.5, 1.01]) * pmax)
    assert list(vec.feasible) == [True, False]
    assert vec.reason[1] == "demanded power exceeds what the pack can deliver"


def test_limit_flags_on_feasible_points():
    # Cell voltage window and continuous current limits are reported on feasible points.
    pack = bt.Pack(NMC, 10, 1)
    e = bt.ocv_v(pack, 0.1)
    r = bt.r0_ohm(pack, 0.1, 20.0)
    # 0.9·P_max is feasible but pulls each cell far below 3.0 V
    op = bt.solve_current_for_power(pack, 0.1, 0.0, 20.0, 0.9 * e * e / (4 * r))
    assert op.feasible and not op.within_limits and op.reason == "cell voltage below v_min"
    assert op.cell_v < NMC.v_min
    # charging hard near full lifts the cell above 4.2 V
    op = bt.solve_current_for_power(pack, 1.0, 0.0, 20.0, -10 * 4.2 * 10.0)
    assert op.feasible and op.reason == "cell voltage above v_max"
    # 100 A at 90 % SOC: voltage fine, but above the 3C (82.89 A) continuous limit
    op = bt.solve_terminal_for_current(pack, 0.9, 0.0, 20.0, 100.0)
    assert op.cell_v > NMC.v_min and op.reason == "discharge current above the continuous limit"
    op = bt.solve_terminal_for_current(pack, 0.5, 0.0, 20.0, -30.0)
    assert op.reason == "charge current above the continuous limit"
    op = bt.solve_terminal_for_current(pack, 0.5, 0.0, 20.0, 20.0)
    assert op.within_limits and op.reason == "ok"


def _flat_cell(r0_ohm: float, v_min: float = 3.0, imax: float = 1e6) -> bt.CellParameters:
    """A cell with flat OCV 3.7 V, constant R0, no temperature dependence (E_a = 0)."""
    return replace(
        NMC,
        name="flat test cell",
        soc_points=(0.0, 1.0),
        ocv_v=(3.7, 3.7),
        r0_ohm=(r0_ohm, r0_ohm),
        r1_ohm=(1e-3, 1e-3),
        c1_f=(1e4, 1e4),
        v_min=v_min,
        max_discharge_current_a=imax,
        activation_energy_j_mol=0.0,
    )


@pytest.mark.parametrize(("margin", "rx"), [(0.0, 0.0), (0.1, 0.0), (0.0, 0.02), (0.05, 0.01)])
def test_pack_power_limit_closed_form_flat_ocv_pure_r0(margin, rx):
    # Circuit theory, flat OCV and a pure ohmic cell: I = (E − n_s·floor)/R_cells with
    # floor = v_min + margin, P = I·(E − I·R), R = R_cells + R_busbar.
    pack = bt.Pack(_flat_cell(10e-3), 10, 2, extra_series_resistance_ohm=rx)
    e, r_cells = 37.0, 10 * 10e-3 / 2
    i = (e - 10 * (3.0 + margin)) / r_cells
    expect = i * (e - i * (r_cells + rx))
    got = bt.pack_power_limit_w(pack, 0.5, 0.0, 25.0, undervoltage_margin_v=margin)
    assert got == pytest.approx(expect, rel=1e-12)
    if rx == 0.0:  # then P = I·n_s·floor (the cells sit exactly on the floor)
        assert got == pytest.approx(i * 10 * (3.0 + margin), rel=1e-12)
    # at that power the power solve lands the cell on the floor (circuit theory)
    op = bt.solve_current_for_power(pack, 0.5, 0.0, 25.0, got)
    assert op.cell_v == pytest.approx(3.0 + margin, rel=1e-10)


def test_pack_power_limit_current_and_power_maximum_bounds():
    # Circuit theory: current rating binding gives P = I_max·(E − I_max·R); with the floor out
    # of reach the power maximum E²/(4R) at I = E/(2R) binds (matched load).
    pack = bt.Pack(_flat_cell(10e-3, imax=20.0), 10, 2)
    r = 10 * 10e-3 / 2
    assert bt.pack_power_limit_w(pack, 0.5, 0.0, 25.0) == pytest.approx(
        40.0 * (37.0 - 40.0 * r), rel=1e-12
    )
    low = bt.Pack(_flat_cell(10e-3, v_min=0.5), 10, 2)
    assert bt.pack_power_limit_w(low, 0.5, 0.0, 25.0) == pytest.approx(37.0**2 / (4 * r), rel=1e-12)


def test_pack_power_limit_limiting_cases():
    # Limiting case, margin 0 and no busbars: the former physics definition I_lim = (E −
    # n_s·v_min)/R0, P = I_lim·n_s·v_min on the Huria et al. (2012) cell (table in
    # REFERENCES.md); the old name is the same function.
    assert bt.max_power_at_min_voltage_w is bt.pack_power_limit_w
    pack = bt.Pack(NMC, 12, 2)
    e = 12 * 3.56  # OCV at SOC 0.1, Huria et al. (2012)
    r = 12 * 8.5e-3 / 2  # R0 at SOC 0.1, 20 °C, Huria et al. (2012)
    i_lim = (e - 12 * 3.0) / r
    assert i_lim < pack.max_discharge_current_a
    assert bt.pack_power_limit_w(pack, 0.1, 0.0, 20.0) == pytest.approx(i_lim * 12 * 3.0, rel=1e-12)
    # current-limited at high SOC (3C continuous rating of the set)
    e9, r9 = 12 * 4.08, 12 * 8.5e-3 / 2
    imax = pack.max_discharge_current_a
    assert bt.pack_power_limit_w(pack, 0.9, 0.0, 20.0) == pytest.approx(
        imax * (e9 - imax * r9), rel=1e-12
    )
    # polarisation or margin already below the floor: nothing available
    assert bt.pack_power_limit_w(pack, 0.0, 20.0, 20.0) == 0.0
    assert bt.pack_power_limit_w(pack, 0.0, 0.0, 20.0, undervoltage_margin_v=0.6) == 0.0
    # zero cell resistance: the voltage limit never binds above the floor, allows nothing below
    ideal = bt.Pack(_flat_cell(0.0, imax=50.0), 10, 1, extra_series_resistance_ohm=0.1)
    assert bt.pack_power_limit_w(ideal, 0.5, 0.0, 25.0) == pytest.approx(50 * (37 - 50 * 0.1))
    assert bt.pack_power_limit_w(ideal, 0.5, 8.0, 25.0) == 0.0
    with pytest.raises(ModelRangeError, match="undervoltage_margin_v"):
        bt.pack_power_limit_w(pack, 0.5, 0.0, 20.0, undervoltage_margin_v=-0.1)


@pytest.mark.parametrize("rx", [0.0, 0.01])
def test_pack_power_limit_scalar_array_parity(rx):
    # The scalar fast path and the numpy path are the same function (parity over a grid that
    # covers voltage-, current- and zero-limited points, two temperatures and a margin).
    pack = bt.Pack(NMC, 12, 2, extra_series_resistance_ohm=rx)
    soc = np.linspace(-0.05, 1.05, 23)
    v_rc = np.linspace(8.0, 0.0, 23)
    for temp in (-10.0, 35.0):
        for margin in (0.0, 0.05):
            vec = bt.pack_power_limit_w(pack, soc, v_rc, temp, undervoltage_margin_v=margin)
            assert isinstance(vec, np.ndarray) and vec.shape == soc.shape
            for s, v, p in zip(soc, v_rc, vec, strict=True):
                one = bt.pack_power_limit_w(
                    pack, float(s), float(v), temp, undervoltage_margin_v=margin
                )
                assert isinstance(one, float)
                assert one == pytest.approx(p, rel=1e-12, abs=1e-9)
    assert np.any(vec == 0.0) and np.any(vec > 0.0)


def test_series_parallel_scaling():
    # Series/parallel connection of identical cells (Plett 2015, ch. 2): doubling n_s doubles
    # voltage and resistance; doubling n_p halves resistance, doubles capacity and currents.
    a = bt.Pack(NMC, 10, 1)
    b = bt.Pack(NMC, 20, 1)
    c = bt.Pack(NMC, 10, 2)
    assert bt.ocv_v(b, 0.37) == pytest.approx(2 * bt.ocv_v(a, 0.37), rel=1e-14)
    assert bt.r0_ohm(b, 0.37, 5.0) == pytest.approx(2 * bt.r0_ohm(a, 0.37, 5.0), rel=1e-14)
    assert bt.r0_ohm(c, 0.37, 5.0) == pytest.approx(0.5 * bt.r0_ohm(a, 0.37, 5.0), rel=1e-14)
    assert c.capacity_ah == 2 * a.capacity_ah and b.capacity_ah == a.capacity_ah
    assert c.max_discharge_current_a == 2 * a.max_discharge_current_a
    assert b.v_min == 2 * a.v_min and b.energy_wh == pytest.approx(2 * a.energy_wh)
    assert b.nominal_voltage_v == pytest.approx(2 * a.nominal_voltage_v, rel=1e-14)
    assert c.r0_ref_ohm == pytest.approx(bt.r0_ohm(c, 0.5, 20.0), rel=1e-14)
    ((ra, ca),) = bt.rc_params(a, 0.37, 5.0)
    ((rc, cc),) = bt.rc_params(c, 0.37, 5.0)
    assert rc * cc == pytest.approx(ra * ca, rel=1e-14)  # time constant unchanged
    # the same power per cell gives the same cell operating point
    oa = bt.solve_current_for_power(a, 0.6, 0.0, 20.0, 2000.0)
    ob = bt.solve_current_for_power(b, 0.6, 0.0, 20.0, 4000.0)
    oc = bt.solve_current_for_power(c, 0.6, 0.0, 20.0, 4000.0)
    assert ob.cell_v == pytest.approx(oa.cell_v, rel=1e-12)
    assert oc.cell_v == pytest.approx(oa.cell_v, rel=1e-12)
    assert oc.current_a == pytest.approx(2 * oa.current_a, rel=1e-12)


def test_table_held_flat_beyond_ends_within_margin():
    # Model range: SOC may overshoot 0…1 by up to 0.05 (held flat); beyond that it is refused.
    pack = single()
    assert bt.ocv_v(pack, -0.01) == pytest.approx(3.51)
    assert bt.ocv_v(pack, 1.02) == pytest.approx(4.19)
    with pytest.raises(ModelRangeError, match="state of charge"):
        bt.ocv_v(pack, 1.2)
    with pytest.raises(ModelRangeError, match="state of charge"):
        bt.ocv_v(pack, np.array([0.5, -0.3]))
    with pytest.raises(ModelRangeError, match="temperature"):
        bt.r0_ohm(pack, 0.5, 95.0)
    with pytest.raises(ModelRangeError, match="temperature"):
        bt.solve_current_for_power(pack, 0.5, 0.0, np.array([20.0, -60.0]), 10.0)


@pytest.mark.parametrize(
    ("changes", "field"),
    [
        ({"soc_points": (0.0, 0.5, 0.4, 0.6, 0.7, 0.9, 1.0)}, "soc_points"),
        ({"soc_points": (0.1, 0.2, 0.25, 0.5, 0.75, 0.9, 1.0)}, "soc_points"),
        ({"ocv_v": (3.5, 3.6)}, "ocv_v"),
        ({"ocv_v": (3.51, 3.56, 3.64, 3.71, 3.6, 4.08, 4.19)}, "ocv_v"),
        ({"r0_ohm": (-1e-3,) * 7}, "r0_ohm"),
        ({"r1_ohm": (0.0,) * 7}, "r1_ohm"),
        ({"c1_f": (0.0,) * 7}, "c1_f"),
        ({"r2_ohm": (1e-3,) * 7}, "r2_ohm"),
        ({"v_min": 4.3}, "v_min"),
        ({"capacity_ah": 0.0}, "capacity_ah"),
        ({"coulombic_efficiency": 1.2}, "coulombic_efficiency"),
        ({"mass_kg": -1.0}, "mass_kg"),
        ({"activation_energy_j_mol": -5.0}, "activation_energy_j_mol"),
        ({"max_charge_current_a": 0.0}, "max_charge_current_a"),
    ],
)
def test_cell_validation_names_field(changes, field):
    # Conventions: out-of-range input raises ModelRangeError naming the quantity and value.
    with pytest.raises(ModelRangeError) as info:
        replace(NMC, **changes)
    assert info.value.quantity.startswith(field)
    assert "outside the valid range" in str(info.value)


@pytest.mark.parametrize(
    ("kw", "field"),
    [
        ({"n_series": 0}, "n_series"),
        ({"n_parallel": 1.5}, "n_parallel"),
        ({"extra_series_resistance_ohm": -0.1}, "extra_series_resistance_ohm"),
    ],
)
def test_pack_validation_names_field(kw, field):
    args = {"cell": NMC, "n_series": 2, "n_parallel": 2} | kw
    with pytest.raises(ModelRangeError) as info:
        bt.Pack(**args)
    assert info.value.quantity == field


def test_objects_are_frozen_and_hashable():
    pack = bt.Pack(NMC, 2, 2)
    with pytest.raises(AttributeError):
        pack.n_series = 3  # type: ignore[misc]
    assert hash(pack) == hash(bt.Pack(NMC, 2, 2))
    assert not NMC._soc_arr.flags.writeable


# ------------------------------------------------------------------------------------------------
# Properties (hypothesis)
# ------------------------------------------------------------------------------------------------

_PACKS = [bt.Pack(NMC, 20, 2, extra_series_resistance_ohm=3e-3), bt.Pack(LFP, 16, 1)]


@settings(max_examples=150, deadline=None)
@given(
    which=st.integers(0, 1),
    soc=st.floats(0.0, 1.0),
    temp_c=st.floats(-20.0, 60.0),
    v_rc_frac=st.floats(0.0, 0.02),
    fracs=st.lists(st.floats(-1.0, 0.999), min_size=2, max_size=20),
)
def test_current_rises_and_voltage_falls_with_power(which, soc, temp_c, v_rc_frac, fracs):
    # On the feasible (small-current) branch dI/dP = 1/(E − 2·I·R0) > 0 and
    # dV/dP = −R0·dI/dP < 0: more demanded power means more current and a lower terminal voltage.
    pack = _PACKS[which]
    v_rc = v_rc_frac * bt.ocv_v(pack, soc)
    pmax = bt.solve_current_for_power(pack, soc, v_rc, temp_c, 0.0).max_power_w
    power = np.unique(np.round(fracs, 6)) * pmax  # distinct demands, at least 1e-6·P_max apart
    op = bt.solve_current_for_power(pack, soc, v_rc, temp_c, power)
    assert np.all(op.feasible)
    assert np.all(np.diff(op.current_a) > 0.0)
    assert np.all(np.diff(op.terminal_v) < 0.0)
    np.testing.assert_allclose(op.current_a * op.terminal_v, power, rtol=1e-9, atol=1e-9 * pmax)


@settings(max_examples=100, deadline=None)
@given(soc=st.floats(0.0, 1.0), t1=st.floats(-30.0, 70.0), t2=st.floats(-30.0, 70.0))
def test_resistance_falls_with_temperature(soc, t1, t2):
    # Arrhenius (1889): with E_a > 0 resistance decreases monotonically with temperature.
    pack = _PACKS[1]
    lo, hi = sorted((t1, t2))
    assert bt.r0_ohm(pack, soc, hi) <= bt.r0_ohm(pack, soc, lo)
    for (rh, _), (rl, _) in zip(
        bt.rc_params(pack, soc, hi), bt.rc_params(pack, soc, lo), strict=True
    ):
        assert rh <= rl
