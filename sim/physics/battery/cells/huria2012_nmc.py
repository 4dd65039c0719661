"""NMC/graphite pouch cell, 27.63 A·h, one RC pair, table at 20 °C.

Source
------
OCV, R0, R1, C1 at seven state-of-charge points and the capacity, at 20 °C: Huria, T.,
Ceraolo, M., Gazzarri, J. & Jackey, R. (2012). High fidelity electrical model with thermal
dependence for characterization and simulation of high power lithium battery cells. 2012 IEEE
International Electric Vehicle Conference (IEVC), Greenville SC. doi:10.1109/IEVC.2012.6183271
(attribution and DOI from memory; the table values as listed in the project's reference sheet).

Not in that table: v_max 4.2 V and 1C continuous charge (common practice for NMC/graphite cells
charged constant-current/constant-voltage; enforced by the drive's charge fold-back); from
memory: v_min 3.0 V, 3C continuous discharge, mass 0.65 kg, c_p 1000 J/(kg K), coulombic
efficiency 0.999, E_a 20 kJ/mol, entropic coefficient neglected.
"""

from __future__ import annotations

from sim.physics.battery.parameters import DEFAULT_ACTIVATION_ENERGY_J_MOL, CellParameters

NMC_POUCH_HURIA2012 = CellParameters(
    name="NMC pouch cell, 20 °C (Huria et al. 2012)",
    source=(
        "OCV, R0, R1, C1 and capacity at 20 °C: Huria, Ceraolo, Gazzarri & Jackey (2012), "
        "IEEE IEVC, doi:10.1109/IEVC.2012.6183271 (attribution from memory). "
        "Not in that table, from memory: v_min 3.0 V / v_max 4.2 V (usual NMC window), "
        "continuous limits 3C discharge / 1C charge, mass 0.65 kg, c_p 1000 J/(kg K), "
        "coulombic efficiency 0.999, E_a 20 kJ/mol, entropic coefficient neglected."
    ),
    chemistry="NMC/graphite",
    capacity_ah=27.63,
    soc_points=(0.0, 0.1, 0.25, 0.5, 0.75, 0.9, 1.0),
    ocv_v=(3.51, 3.56, 3.64, 3.71, 3.93, 4.08, 4.19),
    r0_ohm=(8.5e-3, 8.5e-3, 8.7e-3, 8.2e-3, 8.3e-3, 8.5e-3, 8.5e-3),
    r1_ohm=(2.9e-3, 2.4e-3, 2.6e-3, 1.6e-3, 2.3e-3, 1.8e-3, 1.7e-3),
    c1_f=(12447.0, 18872.0, 40764.0, 18721.0, 33630.0, 18360.0, 23394.0),
    v_min=3.0,
    v_max=4.2,
    max_discharge_current_a=3.0 * 27.63,
    max_charge_current_a=27.63,
    mass_kg=0.65,
    cp_j_kg_k=1000.0,
    coulombic_efficiency=0.999,
    activation_energy_j_mol=DEFAULT_ACTIVATION_ENERGY_J_MOL,
    t_ref_c=20.0,
    entropic_coefficient_v_k=0.0,
)
"""NMC/graphite pouch cell, 27.63 A·h, one RC pair, table at 20 °C (Huria et al. 2012)."""
