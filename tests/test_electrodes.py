"""Tests of sim.physics.electrodes: kinetics data, Butler–Volmer, sacrificial anodes."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from sim.physics import electrochem as ec
from sim.physics import electrodes as el
from sim.physics.errors import ModelRangeError

R_J_MOL_K = 8.314462618  # CODATA 2018


def test_theoretical_and_practical_consumption():
    # Faraday's law with IUPAC atomic weights: Al (z = 3) 0.3355 g/A·h theoretical; DNV-RP-B401
    # design capacity of Al–Zn–In 2000 A·h/kg ⇒ 0.5 g/A·h practical; zinc (z = 2) 1.22 g/A·h
    # theoretical, 780 A·h/kg ⇒ 1.282 g/A·h practical.
    ah = 3600.0
    assert el.consumed_mass_kg(ah, "aluminium_zinc_indium", basis="theoretical") * 1e3 == (
        pytest.approx(0.3355, abs=2e-4)
    )
    assert el.consumed_mass_kg(ah, "aluminium_zinc_indium") * 1e3 == pytest.approx(0.5)
    assert el.consumed_mass_kg(ah, "zinc", basis="theoretical") * 1e3 == pytest.approx(
        1.2195, abs=1e-3
    )
    assert el.consumed_mass_kg(ah, "zinc") * 1e3 == pytest.approx(1.2821, abs=1e-3)
    # the practical capacity is below the theoretical one (self-corrosion)
    for a in el.SACRIFICIAL_ANODES.values():
        assert a.practical_capacity_ah_kg < a.theoretical_capacity_ah_kg


def test_faraday_total_equals_charge_integral():
    # Faraday: Σ of the mass consumed step by step over a varying current equals
    # ∫I dt · M/(zF), the integral taken independently (scipy quad).
    def current(t):
        return 200.0 + 150.0 * np.sin(t / 300.0) ** 2

    t_end = 7200.0
    q_ref = quad(current, 0.0, t_end, limit=200)[0]
    m_ref = q_ref * 26.9815385e-3 / (3 * 96485.33212)
    t = np.linspace(0.0, t_end, 20001)
    i = current(t)
    dq = 0.5 * (i[1:] + i[:-1]) * np.diff(t)
    m = 10.0
    for step in dq:
        m = el.anode_mass_left_kg(m, step, "aluminium_zinc_indium", basis="theoretical")
    assert 10.0 - m == pytest.approx(m_ref, rel=1e-7)


def test_anode_spent_and_time():
    # Identity: at the time to spent (constant current) the mass left is exactly (1 − u)·m0.
    t = el.time_to_spent_s(5.0, 100.0, "zinc", utilisation=0.85)
    left = el.anode_mass_left_kg(5.0, 100.0 * t, "zinc")
    assert left == pytest.approx(0.15 * 5.0, rel=1e-12)
    assert el.anode_spent(left * (1 - 1e-12), 5.0)
    assert not el.anode_spent(left * 1.01, 5.0)
    assert el.time_to_spent_s(5.0, 0.0, "zinc") == math.inf
    assert el.anode_mass_left_kg(1.0, 1e12, "zinc") == 0.0


def test_butler_volmer_identities_and_limits():
    # Bard & Faulkner (2001) §3.4: symmetric Butler–Volmer; Tafel branch at i ≫ i0; linear
    # branch with charge-transfer resistance RT/(F i0 (α_a + α_c)) at i ≪ i0.
    i0, b = 1.0, 0.12
    i = np.array([1e-3, 0.1, 10.0, 1e3, 1e4])
    eta = el.butler_volmer_overpotential_v(i, i0, b)
    assert el.butler_volmer_current_density_a_m2(eta, i0, b) == pytest.approx(i, rel=1e-12)
    assert el.butler_volmer_overpotential_v(1e4, i0, b) == pytest.approx(b * 4, abs=1e-6)
    alpha = math.log(10) * R_J_MOL_K * 298.15 / (b * ec.FARADAY_C_MOL)  # from b = ln10·RT/(αF)
    r_ct = R_J_MOL_K * 298.15 / (ec.FARADAY_C_MOL * i0 * 2 * alpha)
    assert el.butler_volmer_overpotential_v(1e-4, i0, b) == pytest.approx(r_ct * 1e-4, rel=1e-6)
    assert el.butler_volmer_overpotential_v(-5.0, i0, b) == -el.butler_volmer_overpotential_v(
        5.0, i0, b
    )


@settings(max_examples=50, deadline=None)
@given(st.floats(1e-3, 1e5), st.floats(1e-3, 1e5))
def test_overpotential_rises_with_current(i1, i2):
    lo, hi = sorted((i1, i2))
    assert el.butler_volmer_overpotential_v(lo, 0.1, 0.06) <= el.butler_volmer_overpotential_v(
        hi, 0.1, 0.06
    )


def test_pair_drop_tends_to_reversible_voltage():
    # At zero current the drop is the reversible cell voltage of electrochem (standard
    # potentials, Bard, Parsons & Jordan 1985): 1.837 V for Cl₂/H₂ at pH 8.1; at 1 kA/m² it is
    # several hundred mV more (REFERENCES.md, "practical electrode drop", from memory).
    d0 = el.electrode_pair_drop_v("mmo_titanium_anode", "stainless_316_cathode", 0.0, 0.0)
    assert d0 == pytest.approx(ec.reversible_cell_voltage_v(8.1, chlorine=True), abs=1e-12)
    d1 = el.electrode_pair_drop_v("mmo_titanium_anode", "stainless_316_cathode", 1e3, 1e3)
    assert 0.2 < d1 - d0 < 1.0


def test_galvanic_data_consistent_with_electrochem_and_series():
    # The kinetics table extends electrochem's galvanic table; DNV-RP-B401 potentials: zinc
    # −1.03 V vs Ag/AgCl ≈ −1.02 V vs SCE lies in the seawater galvanic series range for zinc
    # (−0.98…−1.03 V vs SCE, REFERENCES.md).
    for k in el.ELECTRODE_KINETICS.values():
        assert k.galvanic_key in ec.ELECTRODE_MATERIALS
        assert math.isfinite(k.rest_potential_v_sce)
    zn = el.SACRIFICIAL_ANODES["zinc"]
    assert -1.03 <= zn.potential_v_she - el.SCE_V_SHE <= -0.98


def test_sacrificial_anode_lower_drop_no_chlorine():
    # A dissolving aluminium anode takes less voltage than chlorine evolution (REFERENCES.md:
    # dissimilar Al/Cu pair adds roughly 0.6 V of drive, common practice) and makes no Cl₂.
    cl = el.electrode_pair_drop_v("mmo_titanium_anode", "copper_cathode", 500.0, 500.0)
    al = el.sacrificial_pair_drop_v("aluminium_zinc_indium", "copper_cathode", 500.0)
    assert al < cl - 1.5
    assert el.sacrificial_pair_drop_v("aluminium_zinc_indium", "copper_cathode", 0.0) < 0.0
    h2, cl2, o2 = el.sacrificial_gas_rates_mol_s(10.0)
    assert h2 == pytest.approx(ec.gas_rates_mol_s(10.0)[0])
    assert cl2 == 0.0 and o2 == 0.0


def test_bad_names():
    with pytest.raises(ModelRangeError, match="anode"):
        el.electrode_pair_drop_v("copper_cathode", "copper_cathode", 1.0, 1.0)
    with pytest.raises(ModelRangeError, match="sacrificial anode"):
        el.consumed_mass_kg(1.0, "magnesium")
    with pytest.raises(ModelRangeError, match="basis"):
        el.consumed_mass_kg(1.0, "zinc", basis="nominal")
