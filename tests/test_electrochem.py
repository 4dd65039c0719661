"""Tests of sim.physics.electrochem: Faraday's law, reversible voltages, electrode pairs."""

from __future__ import annotations

import re

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.physics import electrochem as ec
from sim.physics.errors import ModelRangeError

M_CL2_G_MOL = 70.906  # 2 × 35.453 g/mol, IUPAC standard atomic weight of Cl (conventional)
R_J_MOL_K = 8.314462618  # CODATA 2018 molar gas constant
ATM_PA = 101325.0


# --------------------------------------------------------------------------- published values


def test_faraday_constant():
    # CODATA 2018: F = 96485.33212 C/mol (exact since the 2019 SI redefinition).
    assert ec.FARADAY_C_MOL == 96485.33212


def test_gas_per_ampere():
    # Faraday's law (REFERENCES.md): per ampere H₂ 5.18 µmol/s = 0.456 L/h at 25 °C, 1 atm;
    # Cl₂ same moles = 1.32 g/h; O₂ half the moles when all the anode charge makes oxygen.
    h2, cl2, o2 = ec.gas_rates_mol_s(1.0)
    assert h2 == pytest.approx(5.18e-6, abs=0.005e-6)
    assert h2 * 3600.0 * R_J_MOL_K * 298.15 / ATM_PA * 1e3 == pytest.approx(0.456, abs=0.001)
    assert cl2 * M_CL2_G_MOL * 3600.0 == pytest.approx(1.32, abs=0.005)
    assert o2 == 0.0
    _, _, o2_only = ec.gas_rates_mol_s(1.0, chlorine_fraction=0.0)
    assert o2_only == pytest.approx(0.5 * h2, rel=1e-15)


def test_reversible_cell_voltages():
    # Standard potentials (Bard, Parsons & Jordan 1985): Cl₂/Cl⁻ 1.358 V, O₂/H₂O 1.229 − 0.05916 pH,
    # H⁺/H₂ −0.05916 pH. Seawater pH 8.1: ≈1.85 V (Cl₂ + H₂), 1.23 V (O₂ + H₂) (REFERENCES.md).
    assert ec.reversible_cell_voltage_v(8.1, chlorine=True) == pytest.approx(1.837196, abs=1e-6)
    assert ec.reversible_cell_voltage_v(8.1, chlorine=True) == pytest.approx(1.85, abs=0.02)
    assert ec.reversible_cell_voltage_v(8.1, chlorine=False) == pytest.approx(1.229, abs=1e-12)


def test_galvanic_series_values_and_order():
    # Galvanic series in flowing seawater, V vs SCE (REFERENCES.md, ASTM G82 lineage): each
    # stored value lies in the published range, and the order noble → active is preserved.
    ranges = {
        "graphite": (0.20, 0.30),
        "platinum": (0.18, 0.26),
        "platinised_titanium": (0.18, 0.26),
        "stainless_316_passive": (-0.10, 0.00),
        "copper": (-0.37, -0.30),
        "mild_steel": (-0.72, -0.60),
        "aluminium_alloy": (-1.00, -0.76),
        "zinc": (-1.03, -0.98),
        "magnesium": (-1.63, -1.60),
    }
    assert set(ec.ELECTRODE_MATERIALS) == set(ranges)
    for name, (lo, hi) in ranges.items():
        m = ec.ELECTRODE_MATERIALS[name]
        assert m.name == name
        assert lo <= m.rest_potential_v_sce <= hi
        assert "galvanic series" in m.source
    order = [
        "graphite",
        "platinum",
        "stainless_316_passive",
        "copper",
        "mild_steel",
        "aluminium_alloy",
        "zinc",
        "magnesium",
    ]
    e = [ec.ELECTRODE_MATERIALS[n].rest_potential_v_sce for n in order]
    assert e == sorted(e, reverse=True)


def test_aluminium_copper_offset():
    # Dissimilar electrodes, aluminium anode vs copper cathode: roughly 0.6 V (common practice).
    assert abs(ec.galvanic_offset_v("aluminium_alloy", "copper")) == pytest.approx(0.6, abs=0.1)
    # sign: a more noble anode (copper against aluminium) has a positive offset, which opposes a
    # positive applied voltage (galvanic series midpoints −0.335 and −0.88 V vs SCE)
    noble_anode = ec.ElectrodePair("copper", "aluminium_alloy", overpotential_v=0.0)
    same = ec.ElectrodePair("copper", "copper", overpotential_v=0.0)
    assert noble_anode.galvanic_offset_v == pytest.approx(0.545, abs=1e-12)
    # regression (issue 9): the offset is NOT part of the drop that flips with the current
    assert noble_anode.electrode_drop_v() == same.electrode_drop_v()


# ---------------------------------------------------------------------------------- identities


@pytest.mark.parametrize("f_cl", [0.0, 0.3, 1.0])
def test_charge_conservation(f_cl):
    # conservation of charge: cathode electrons 2 ṅ_H2 = anode electrons 2 ṅ_Cl2 + 4 ṅ_O2 = I/F.
    current = np.array([-40.0, 0.5, 3.0, 1200.0])
    h2, cl2, o2 = ec.gas_rates_mol_s(current, chlorine_fraction=f_cl)
    assert 2.0 * h2 == pytest.approx(2.0 * cl2 + 4.0 * o2, rel=1e-14)
    assert 2.0 * h2 * ec.FARADAY_C_MOL == pytest.approx(np.abs(current), rel=1e-14)


def test_energy_of_mixed_route():
    # energy identity: ΔV_rev·I equals the reversible work of the Faraday gas mix,
    # 2F U_Cl ṅ_Cl2 + 4F U_O ṅ_O2 (each mole of Cl₂ takes 2F, each mole of O₂ takes 4F).
    f, current = 0.35, 10.0
    pair = ec.ElectrodePair("graphite", "graphite", overpotential_v=0.0, chlorine_fraction=f)
    _, cl2, o2 = ec.gas_rates_mol_s(current, chlorine_fraction=f)
    u_cl = ec.reversible_cell_voltage_v(pair.ph, chlorine=True)
    u_o = ec.reversible_cell_voltage_v(pair.ph, chlorine=False)
    work = 2 * ec.FARADAY_C_MOL * u_cl * cl2 + 4 * ec.FARADAY_C_MOL * u_o * o2
    assert pair.electrode_drop_v() * current == pytest.approx(work, rel=1e-12)


def test_offset_antisymmetric_and_drop_decomposes():
    # identity: swapping anode and cathode reverses the offset; the drop is the sum of its parts.
    names = list(ec.ELECTRODE_MATERIALS)
    for a in names:
        for c in names:
            assert ec.galvanic_offset_v(a, c) == pytest.approx(-ec.galvanic_offset_v(c, a))
    pair = ec.ElectrodePair("mild_steel", "stainless_316_passive", overpotential_v=0.3, ph=7.0)
    assert ec.electrode_drop_v(pair) == pytest.approx(
        ec.reversible_cell_voltage_v(7.0) + 0.3, rel=1e-14
    )
    assert pair.electrode_drop_v() == ec.electrode_drop_v(pair)


def test_oxygen_route_independent_of_ph():
    # both half-reactions shift by −0.05916 V per pH (Nernst), so their difference does not.
    for ph in (0.0, 4.0, 8.1, 14.0):
        assert ec.reversible_cell_voltage_v(ph, chlorine=False) == pytest.approx(1.229)


# ------------------------------------------------------------------------------ limiting cases


def test_zero_current_zero_gas():
    h2, cl2, o2 = ec.gas_rates_mol_s(0.0)
    assert (h2, cl2, o2) == (0.0, 0.0, 0.0)


def test_no_chlorine_fraction_gives_no_chlorine():
    _, cl2, o2 = ec.gas_rates_mol_s(5.0, chlorine_fraction=0.0)
    assert cl2 == 0.0
    assert o2 > 0.0


def test_default_electrodes_have_no_offset():
    d = ec.DEFAULT_ELECTRODES
    assert d.anode == d.cathode
    assert d.galvanic_offset_v == 0.0
    assert d.overpotential_v == 0.5
    assert d.chlorine_fraction == 1.0
    assert d.ph == 8.1
    # practical drop: reversible voltage plus several hundred mV (from memory, loose)
    assert 1.85 + 0.2 < d.electrode_drop_v() < 1.85 + 0.9


def test_ideal_identical_electrodes_drop_equals_reversible_voltage():
    pair = ec.ElectrodePair("graphite", "graphite", overpotential_v=0.0)
    assert pair.electrode_drop_v() == pytest.approx(ec.reversible_cell_voltage_v())


# -------------------------------------------------------------------------------------- errors


def test_unknown_material_lists_allowed_names():
    with pytest.raises(ModelRangeError, match=re.escape("unobtainium")) as info:
        ec.ElectrodePair("unobtainium", "graphite")
    for name in ec.ELECTRODE_MATERIALS:
        assert name in str(info.value)
    with pytest.raises(ModelRangeError, match=re.escape("cathode")):
        ec.galvanic_offset_v("graphite", "brass")


@pytest.mark.parametrize(
    ("kwargs", "fragment"),
    [
        ({"overpotential_v": -0.1}, "-0.1"),
        ({"chlorine_fraction": 1.5}, "1.5"),
        ({"ph": 15.0}, "15.0"),
        ({"ph": float("nan")}, "nan"),
    ],
)
def test_pair_parameter_errors(kwargs, fragment):
    with pytest.raises(ModelRangeError, match=re.escape(fragment)):
        ec.ElectrodePair(**kwargs)


def test_ph_error_in_reversible_voltage():
    with pytest.raises(ModelRangeError, match=re.escape("-1.0")):
        ec.reversible_cell_voltage_v(-1.0)


# --------------------------------------------------------------------------- property-based


@settings(max_examples=50, deadline=None)
@given(i1=st.floats(0.0, 1e4), i2=st.floats(0.0, 1e4), f=st.floats(0.0, 1.0))
def test_gas_is_linear_in_current(i1, i2, f):
    # Faraday's law: gas production is proportional to charge.
    a = np.array(ec.gas_rates_mol_s(i1, f))
    b = np.array(ec.gas_rates_mol_s(i2, f))
    ab = np.array(ec.gas_rates_mol_s(i1 + i2, f))
    assert ab == pytest.approx(a + b, rel=1e-12, abs=1e-18)


@settings(max_examples=50, deadline=None)
@given(eta1=st.floats(0.0, 2.0), eta2=st.floats(0.0, 2.0), f=st.floats(0.0, 1.0))
def test_drop_rises_with_overpotential(eta1, eta2, f):
    lo, hi = sorted((eta1, eta2))
    d_lo = ec.ElectrodePair(overpotential_v=lo, chlorine_fraction=f).electrode_drop_v()
    d_hi = ec.ElectrodePair(overpotential_v=hi, chlorine_fraction=f).electrode_drop_v()
    assert d_hi - d_lo == pytest.approx(hi - lo, abs=1e-12)
