"""Small Li-ion polymer cell, 0.85 A·h, two RC pairs, from the closed-form functions of SOC.

Source
------
Chen, M. & Rincón-Mora, G. A. (2006). An accurate electrical battery model capable of predicting
runtime and I-V performance. IEEE Transactions on Energy Conversion 21(2), 504–511.
doi:10.1109/TEC.2006.874229. Its fitted functions of SOC for the open-circuit voltage, the series
resistance and two RC pairs are used as published, sampled on a grid that is dense near empty
(SOC step 1e-4 below 0.02) so that the engine's linear interpolation follows the closed forms
within 0.05 mV of OCV and 0.1 % of each resistance (a 17-point table missed the OCV by up to
22 mV near empty); the capacitances are held at their SOC 0.02 values below that, where the
fits turn negative.

Not in that model: v_max 4.2 V and 1C continuous charge (common practice for LiCoO2-type cells
charged constant-current/constant-voltage; the paper gives no limits; enforced by the drive's
charge fold-back); from memory: v_min 3.0 V, 2C discharge continuous, mass 0.018 kg,
c_p 1000 J/(kg K), coulombic efficiency 0.999, E_a 20 kJ/mol.
"""

from __future__ import annotations

import math

from sim.physics.battery.parameters import DEFAULT_ACTIVATION_ENERGY_J_MOL, CellParameters


def _chen2006_tables(soc: tuple[float, ...]) -> dict[str, tuple[float, ...]]:
    """Tables of the Chen & Rincón-Mora (2006) closed-form cell functions at the given SOCs.

    V_oc = −1.031·e^(−35·SOC) + 3.685 + 0.2156·SOC − 0.1178·SOC² + 0.3201·SOC³ [V];
    R_series = 0.1562·e^(−24.37·SOC) + 0.07446; R_ts = 0.3208·e^(−29.14·SOC) + 0.04669;
    C_ts = −752.9·e^(−13.51·SOC) + 703.6; R_tl = 6.603·e^(−155.2·SOC) + 0.04984;
    C_tl = −6056·e^(−27.12·SOC) + 4475 [Ω, F]. The published capacitance fits turn negative
    below SOC ≈ 0.012 (outside the range they were fitted on), so they are evaluated at
    max(SOC, 0.02).
    """
    e = math.exp
    cap = tuple(max(x, 0.02) for x in soc)
    return {
        "ocv_v": tuple(
            -1.031 * e(-35.0 * x) + 3.685 + 0.2156 * x - 0.1178 * x**2 + 0.3201 * x**3 for x in soc
        ),
        "r0_ohm": tuple(0.1562 * e(-24.37 * x) + 0.07446 for x in soc),
        "r1_ohm": tuple(0.3208 * e(-29.14 * x) + 0.04669 for x in soc),
        "c1_f": tuple(-752.9 * e(-13.51 * x) + 703.6 for x in cap),
        "r2_ohm": tuple(6.603 * e(-155.2 * x) + 0.04984 for x in soc),
        "c2_f": tuple(-6056.0 * e(-27.12 * x) + 4475.0 for x in cap),
    }


CHEN2006_MAX_INTERPOLATION_ERROR_V = 5e-5
"""Largest gap between the table's linear interpolation and the published OCV function [V]
(checked by the tests on a fine grid)."""


def _chen2006_grid() -> tuple[float, ...]:
    """SOC breakpoints dense enough that linear interpolation follows the closed forms.

    The fits have terms e^(−35·SOC) (OCV) and e^(−155.2·SOC) (R_tl), so the spacing grows with
    SOC: linear interpolation errs by at most h²/8·|f''|, which keeps the OCV within
    :data:`CHEN2006_MAX_INTERPOLATION_ERROR_V` and every resistance within 0.1 % of its
    function."""
    pts = [0.0]
    for lo, hi, step in ((0.0, 0.02, 1e-4), (0.02, 0.1, 5e-4), (0.1, 0.3, 2e-3), (0.3, 1.0, 1e-2)):
        n = round((hi - lo) / step)
        pts += [lo + (hi - lo) * k / n for k in range(1, n + 1)]
    return tuple(pts)


_CHEN2006_SOC = _chen2006_grid()

LIPO_POUCH_CHEN2006 = CellParameters(
    name="Li-ion polymer cell, 850 mAh (Chen & Rincón-Mora 2006)",
    source=(
        "OCV, series resistance and two RC pairs as functions of SOC: Chen & Rincón-Mora "
        "(2006), An accurate electrical battery model capable of predicting runtime and I-V "
        "performance, IEEE Trans. Energy Conversion 21(2):504-511, doi:10.1109/TEC.2006.874229 "
        "(coefficients as published; sampled densely enough that interpolation follows them "
        "within 0.05 mV, capacitances held at their SOC 0.02 values below that). Not in that "
        "model, from "
        "memory: v_min 3.0 V / v_max 4.2 V, 2C discharge / 1C charge continuous, mass 0.018 kg, "
        "c_p 1000 J/(kg K), coulombic efficiency 0.999, E_a 20 kJ/mol."
    ),
    chemistry="LiCoO2-type polymer/graphite",
    capacity_ah=0.85,
    soc_points=_CHEN2006_SOC,
    **_chen2006_tables(_CHEN2006_SOC),
    v_min=3.0,
    v_max=4.2,
    max_discharge_current_a=2.0 * 0.85,
    max_charge_current_a=0.85,
    mass_kg=0.018,
    cp_j_kg_k=1000.0,
    coulombic_efficiency=0.999,
    activation_energy_j_mol=DEFAULT_ACTIVATION_ENERGY_J_MOL,
    t_ref_c=25.0,
    entropic_coefficient_v_k=0.0,
)
"""Small Li-ion polymer cell, 0.85 A·h, two RC pairs, from the closed-form functions of
Chen & Rincón-Mora (2006)."""
