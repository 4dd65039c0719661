"""LFP/graphite 100 A·h prismatic cell, two RC pairs, 25 °C: representative values.

Source
------
Representative values, from memory (no published table was at hand to copy); use for design
studies only, with loose tolerances. The OCV curve has the LFP/graphite shape (steep below 10 %
SOC, plateau near 3.3 V, rise above 95 %); R0 ≈ 0.7 mΩ and a fast RC (τ ≈ 15 s) plus a slow RC
(τ ≈ 400 s) are of the size reported for large-format 100 A·h LFP cells; v_min 2.5 V / v_max
3.65 V (v_max is the usual LFP charge voltage, common practice), 1C discharge / 0.5C charge
continuous, 2.0 kg, c_p 1100 J/(kg K), coulombic efficiency
0.999, E_a 20 kJ/mol.
"""

from __future__ import annotations

from sim.physics.battery.parameters import DEFAULT_ACTIVATION_ENERGY_J_MOL, CellParameters

LFP_PRISMATIC_REPRESENTATIVE = CellParameters(
    name="LFP prismatic cell, 100 Ah, 25 °C (representative values, from memory)",
    source=(
        "Representative LFP values, from memory (no published table was at hand to copy): "
        "the OCV curve has the LFP/graphite shape (steep below 10 % SOC, plateau near 3.3 V, "
        "rise above 95 %); R0 ≈ 0.7 mΩ and a fast RC (τ ≈ 15 s) plus a slow RC (τ ≈ 400 s) "
        "are of the size reported for large-format 100 A·h LFP cells; v_min 2.5 V / v_max "
        "3.65 V, 1C discharge / 0.5C charge continuous, 2.0 kg, c_p 1100 J/(kg K), coulombic "
        "efficiency 0.999, E_a 20 kJ/mol. Use for design studies only, with loose tolerances."
    ),
    chemistry="LFP/graphite",
    capacity_ah=100.0,
    soc_points=(0.0, 0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95, 1.0),
    ocv_v=(2.95, 3.17, 3.21, 3.25, 3.275, 3.29, 3.295, 3.30, 3.315, 3.33, 3.335, 3.345, 3.40),
    r0_ohm=(
        1.2e-3,
        0.9e-3,
        0.8e-3,
        0.75e-3,
        0.72e-3,
        0.70e-3,
        0.70e-3,
        0.70e-3,
        0.70e-3,
        0.70e-3,
        0.71e-3,
        0.72e-3,
        0.74e-3,
    ),
    r1_ohm=(
        1.0e-3,
        0.7e-3,
        0.6e-3,
        0.5e-3,
        0.45e-3,
        0.45e-3,
        0.45e-3,
        0.45e-3,
        0.45e-3,
        0.45e-3,
        0.5e-3,
        0.5e-3,
        0.55e-3,
    ),
    c1_f=(3.0e4,) * 13,
    r2_ohm=(
        1.0e-3,
        0.6e-3,
        0.5e-3,
        0.4e-3,
        0.4e-3,
        0.4e-3,
        0.4e-3,
        0.4e-3,
        0.4e-3,
        0.4e-3,
        0.45e-3,
        0.5e-3,
        0.6e-3,
    ),
    c2_f=(1.0e6,) * 13,
    v_min=2.5,
    v_max=3.65,
    max_discharge_current_a=100.0,
    max_charge_current_a=50.0,
    mass_kg=2.0,
    cp_j_kg_k=1100.0,
    coulombic_efficiency=0.999,
    activation_energy_j_mol=DEFAULT_ACTIVATION_ENERGY_J_MOL,
    t_ref_c=25.0,
    entropic_coefficient_v_k=0.0,
)
"""LFP/graphite 100 A·h prismatic cell, two RC pairs, 25 °C: representative values, from memory."""
