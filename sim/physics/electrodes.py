r"""Electrode kinetics and sacrificial anodes for seawater thrusters.

Extends (does not replace) :mod:`sim.physics.electrochem`: its table of rest potentials in the
galvanic series stays the source of galvanic offsets; this module adds, per material, the
reaction it carries, the reversible potential, Tafel slope and exchange current density of that
reaction, and a wear (consumption) rate; a Butler–Volmer overpotential; and sacrificial anodes
(aluminium or zinc alloy) that dissolve instead of evolving chlorine, consumed by Faraday's law.

Potentials are on the standard hydrogen scale (SHE) unless named otherwise. Reference
electrodes (common practice): SCE = +0.241 V vs SHE; Ag/AgCl in seawater ≈ +0.25 V vs SHE.

Kinetic data are order-of-magnitude values from the electrocatalysis literature, recalled from
memory (Trasatti 1972 volcano plot for hydrogen evolution; Trasatti 2000 for chlorine on oxide
anodes) and marked so; use them with a loose tolerance (a factor of ten in i0).

References
----------
.. [1] Bard, A. J. & Faulkner, L. R. (2001). Electrochemical Methods, 2nd ed. Wiley, ch. 3
   (Butler–Volmer and Tafel equations).
.. [2] Trasatti, S. (1972). Work function, electronegativity, and electrochemical behaviour of
   metals III. Electrolytic hydrogen evolution in acid solutions. J. Electroanal. Chem. 39,
   163–184. doi:10.1016/S0022-0728(72)80485-6 (exchange current densities; from memory).
.. [3] Trasatti, S. (2000). Electrocatalysis: understanding the success of DSA®. Electrochimica
   Acta 45, 2377–2385. doi:10.1016/S0013-4686(00)00338-8 (chlorine on RuO₂; from memory).
.. [4] DNV (2017). DNV-RP-B401 Cathodic protection design, Table 10-6: design electrochemical
   capacity of Al–Zn–In anodes 2000 A·h/kg and zinc anodes 780 A·h/kg in seawater, closed-circuit
   potentials −1.05 V and −1.03 V vs Ag/AgCl/seawater; anode utilisation factors (values as
   commonly quoted, from memory).
.. [5] Faraday's law; CODATA 2018 F; IUPAC standard atomic weights (Al 26.9815385, Zn 65.38).
.. [6] ASTM G82 galvanic series in seawater, via :mod:`sim.physics.electrochem`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.electrochem import (
    E0_CL2_CL_V,
    E0_O2_H2O_V,
    ELECTRODE_MATERIALS,
    FARADAY_C_MOL,
    NERNST_SLOPE_V_PER_PH,
    SEAWATER_PH,
)
from sim.physics.errors import ModelRangeError

__all__ = [
    "AG_AGCL_SEAWATER_V_SHE",
    "ELECTRODE_KINETICS",
    "SACRIFICIAL_ANODES",
    "SCE_V_SHE",
    "ElectrodeKinetics",
    "SacrificialAnode",
    "anode_mass_left_kg",
    "anode_spent",
    "butler_volmer_current_density_a_m2",
    "butler_volmer_overpotential_v",
    "consumed_mass_kg",
    "electrode_pair_drop_v",
    "reversible_potential_v_she",
    "sacrificial_gas_rates_mol_s",
    "sacrificial_pair_drop_v",
    "time_to_spent_s",
]

SCE_V_SHE = 0.241
"""Saturated calomel electrode potential vs SHE at 25 °C [V] (common practice)."""

AG_AGCL_SEAWATER_V_SHE = 0.25
"""Ag/AgCl reference in seawater vs SHE [V] (common practice, ≈0.25 V)."""

SECONDS_PER_YEAR = 365.25 * 86400.0
"""Julian year [s]."""

_MODEL = "electrode kinetics"


@dataclass(frozen=True)
class ElectrodeKinetics:
    """An electrode material and the reaction it carries in a thruster.

    Attributes
    ----------
    name : str
        Key in :data:`ELECTRODE_KINETICS`.
    role : str
        "anode" or "cathode".
    reaction : str
        "chlorine" (2Cl⁻ → Cl₂ + 2e⁻), "oxygen" or "hydrogen" (2H₂O + 2e⁻ → H₂ + 2OH⁻).
    tafel_slope_v_per_decade : float
        Tafel slope b [V/decade].
    exchange_current_density_a_m2 : float
        i0 [A/m²].
    wear_kg_per_a_year : float
        Consumption of the electrode [kg/(A·year)] (0: not consumed).
    galvanic_key : str
        Key of the material in :data:`sim.physics.electrochem.ELECTRODE_MATERIALS`.
    source : str
    """

    name: str
    role: str
    reaction: str
    tafel_slope_v_per_decade: float
    exchange_current_density_a_m2: float
    wear_kg_per_a_year: float
    galvanic_key: str
    source: str

    @property
    def rest_potential_v_sce(self) -> float:
        """Rest potential in flowing seawater [V vs SCE] (galvanic series, electrochem)."""
        return ELECTRODE_MATERIALS[self.galvanic_key].rest_potential_v_sce


_FM = "from memory, loose (factor 10 in i0)"
ELECTRODE_KINETICS: dict[str, ElectrodeKinetics] = {
    k.name: k
    for k in (
        ElectrodeKinetics(
            "mmo_titanium_anode",
            "anode",
            "chlorine",
            0.04,
            10.0,
            5e-6,
            "platinised_titanium",
            f"RuO₂–IrO₂ on titanium (DSA), Cl₂: b ≈ 40 mV/dec, i0 ≈ 1 mA/cm² (Trasatti 2000, "
            f"{_FM}); wear a few mg/(A·year) (cathodic-protection practice, from memory); rest "
            "potential taken as the platinum value",
        ),
        ElectrodeKinetics(
            "platinised_titanium_anode",
            "anode",
            "chlorine",
            0.06,
            1.0,
            8e-6,
            "platinised_titanium",
            f"Pt on Ti, Cl₂: b ≈ 60 mV/dec, i0 ≈ 0.1 mA/cm² ({_FM}); Pt loss ≈ 8 mg/(A·year) "
            "(cathodic-protection practice, from memory)",
        ),
        ElectrodeKinetics(
            "graphite_anode",
            "anode",
            "chlorine",
            0.12,
            0.1,
            0.25,
            "graphite",
            f"graphite, Cl₂: b ≈ 120 mV/dec, i0 ≈ 0.01 mA/cm² ({_FM}); consumption ≈ 0.25 "
            "kg/(A·year) in seawater (cathodic-protection practice, from memory)",
        ),
        ElectrodeKinetics(
            "platinised_titanium_cathode",
            "cathode",
            "hydrogen",
            0.12,
            1.0,
            0.0,
            "platinised_titanium",
            f"Pt, H₂ in neutral water: b ≈ 120 mV/dec, i0 ≈ 0.1 mA/cm² ({_FM}; Trasatti 1972 "
            "gives ≈1 mA/cm² in acid)",
        ),
        ElectrodeKinetics(
            "stainless_316_cathode",
            "cathode",
            "hydrogen",
            0.12,
            1e-2,
            0.0,
            "stainless_316_passive",
            f"316 stainless, H₂: b ≈ 120 mV/dec, i0 ≈ 1 µA/cm² ({_FM}; Trasatti 1972: Fe, Ni)",
        ),
        ElectrodeKinetics(
            "copper_cathode",
            "cathode",
            "hydrogen",
            0.12,
            1e-3,
            0.0,
            "copper",
            f"copper, H₂: b ≈ 120 mV/dec, i0 ≈ 0.1 µA/cm² ({_FM}; Trasatti 1972)",
        ),
        ElectrodeKinetics(
            "mild_steel_cathode",
            "cathode",
            "hydrogen",
            0.12,
            1e-2,
            0.0,
            "mild_steel",
            f"mild steel, H₂: b ≈ 120 mV/dec, i0 ≈ 1 µA/cm² ({_FM}; Trasatti 1972: Fe)",
        ),
    )
}
"""Electrode materials with their reaction kinetics (extends electrochem.ELECTRODE_MATERIALS)."""


def reversible_potential_v_she(reaction: str, ph: float = SEAWATER_PH) -> float:
    """Reversible potential of an electrode reaction [V vs SHE], 25 °C, unit activities.

    Parameters
    ----------
    reaction : str
        "chlorine", "oxygen" or "hydrogen".
    ph : float
        pH [-].

    Returns
    -------
    float
        1.358; 1.229 − 0.05916 pH; −0.05916 pH [V].

    References
    ----------
    Bard, Parsons & Jordan (1985), via :mod:`sim.physics.electrochem`.
    """
    if reaction == "chlorine":
        return E0_CL2_CL_V
    if reaction == "oxygen":
        return E0_O2_H2O_V - NERNST_SLOPE_V_PER_PH * float(ph)
    if reaction == "hydrogen":
        return -NERNST_SLOPE_V_PER_PH * float(ph)
    raise ModelRangeError("reaction", reaction, '"chlorine", "oxygen" or "hydrogen"', _MODEL)


def _check_kinetics(i0: float, b: float) -> tuple[float, float]:
    i0 = float(i0)
    b = float(b)
    if not (math.isfinite(i0) and i0 > 0.0):
        raise ModelRangeError("exchange_current_density_a_m2", i0, "> 0 A/m²", _MODEL)
    if not (math.isfinite(b) and b > 0.0):
        raise ModelRangeError("tafel_slope_v_per_decade", b, "> 0 V/decade", _MODEL)
    return i0, b


def butler_volmer_overpotential_v(
    current_density_a_m2: ArrayLike,
    exchange_current_density_a_m2: float,
    tafel_slope_v_per_decade: float,
) -> float | np.ndarray:
    """Activation overpotential from the symmetric Butler–Volmer equation.

    Parameters
    ----------
    current_density_a_m2 : float or array
        Current density through the electrode face [A/m²] (sign kept).
    exchange_current_density_a_m2 : float
        i0 [A/m²].
    tafel_slope_v_per_decade : float
        b [V/decade] of the Tafel branch.

    Returns
    -------
    float or ndarray
        η [V], same sign as the current.

    Notes
    -----
    i = i0 [exp(α f η) − exp(−α f η)] = 2 i0 sinh(η ln10 / b), with b = ln10/(α f), f = F/RT,
    so η = (b/ln10) asinh(i/(2 i0)). Limits: Tafel η → b log10(i/i0) for i ≫ i0; linear
    η → b i/(2 i0 ln10) for i ≪ i0.

    References
    ----------
    Bard & Faulkner (2001), §3.4.
    """
    i0, b = _check_kinetics(exchange_current_density_a_m2, tafel_slope_v_per_decade)
    eta = b / math.log(10.0) * np.arcsinh(np.asarray(current_density_a_m2, dtype=float) / (2 * i0))
    return float(eta) if eta.ndim == 0 else eta


def butler_volmer_current_density_a_m2(
    overpotential_v: ArrayLike,
    exchange_current_density_a_m2: float,
    tafel_slope_v_per_decade: float,
) -> float | np.ndarray:
    """Current density from the symmetric Butler–Volmer equation, 2 i0 sinh(η ln10/b) [A/m²].

    Parameters
    ----------
    overpotential_v : float or array
        η [V].
    exchange_current_density_a_m2, tafel_slope_v_per_decade : float
        i0 [A/m²], b [V/decade].

    Returns
    -------
    float or ndarray
        i [A/m²].

    References
    ----------
    Bard & Faulkner (2001), §3.4.
    """
    i0, b = _check_kinetics(exchange_current_density_a_m2, tafel_slope_v_per_decade)
    i = 2.0 * i0 * np.sinh(np.asarray(overpotential_v, dtype=float) * math.log(10.0) / b)
    return float(i) if i.ndim == 0 else i


def _kin(name: str | ElectrodeKinetics, role: str) -> ElectrodeKinetics:
    if isinstance(name, ElectrodeKinetics):
        k = name
    else:
        try:
            k = ELECTRODE_KINETICS[name]
        except (KeyError, TypeError):
            allowed = ", ".join(n for n, v in ELECTRODE_KINETICS.items() if v.role == role)
            raise ModelRangeError(role, name, "one of " + allowed, _MODEL) from None
    if k.role != role:
        raise ModelRangeError(role, k.name, f"a material with role {role!r}", _MODEL)
    return k


def electrode_pair_drop_v(
    anode: str | ElectrodeKinetics,
    cathode: str | ElectrodeKinetics,
    anode_current_density_a_m2: ArrayLike,
    cathode_current_density_a_m2: ArrayLike,
    ph: float = SEAWATER_PH,
) -> float | np.ndarray:
    """Voltage taken by the electrode reactions of a gas-evolving pair [V].

    Parameters
    ----------
    anode, cathode : str or ElectrodeKinetics
        Keys of :data:`ELECTRODE_KINETICS` with roles anode and cathode.
    anode_current_density_a_m2, cathode_current_density_a_m2 : float or array
        Magnitudes of the current densities on each face [A/m²], ≥ 0.
    ph : float
        pH [-].

    Returns
    -------
    float or ndarray
        ΔV = E_rev,a − E_rev,c + η_a(i_a) + |η_c(i_c)| [V]; to use as the duct's
        ``electrode_drop_v`` at the operating current density.

    Notes
    -----
    At i → 0 this is the reversible cell voltage of :func:`sim.physics.electrochem.
    reversible_cell_voltage_v` (1.837 V for chlorine at pH 8.1).

    References
    ----------
    Bard & Faulkner (2001); Bard, Parsons & Jordan (1985).
    """
    a = _kin(anode, "anode")
    c = _kin(cathode, "cathode")
    ia = np.abs(np.asarray(anode_current_density_a_m2, dtype=float))
    ic = np.abs(np.asarray(cathode_current_density_a_m2, dtype=float))
    e_rev = reversible_potential_v_she(a.reaction, ph) - reversible_potential_v_she(c.reaction, ph)
    eta_a = butler_volmer_overpotential_v(
        ia, a.exchange_current_density_a_m2, a.tafel_slope_v_per_decade
    )
    eta_c = butler_volmer_overpotential_v(
        ic, c.exchange_current_density_a_m2, c.tafel_slope_v_per_decade
    )
    out = e_rev + np.asarray(eta_a) + np.asarray(eta_c)
    return float(out) if out.ndim == 0 else out


# --------------------------------------------------------------------------------------------
# sacrificial anodes
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SacrificialAnode:
    """A sacrificial anode alloy that dissolves instead of evolving chlorine.

    Attributes
    ----------
    name : str
    valence : int
        Electrons per dissolved atom z (Al 3, Zn 2).
    molar_mass_kg_mol : float
        Molar mass of the main metal [kg/mol].
    practical_capacity_ah_kg : float
        Design electrochemical capacity [A·h/kg] (includes self-corrosion).
    closed_circuit_v_ag_agcl : float
        Working potential [V vs Ag/AgCl/seawater].
    source : str
    """

    name: str
    valence: int
    molar_mass_kg_mol: float
    practical_capacity_ah_kg: float
    closed_circuit_v_ag_agcl: float
    source: str

    @property
    def theoretical_capacity_ah_kg(self) -> float:
        """Faraday capacity zF/M [A·h/kg]."""
        return self.valence * FARADAY_C_MOL / self.molar_mass_kg_mol / 3600.0

    @property
    def potential_v_she(self) -> float:
        """Working potential [V vs SHE]."""
        return self.closed_circuit_v_ag_agcl + AG_AGCL_SEAWATER_V_SHE


SACRIFICIAL_ANODES: dict[str, SacrificialAnode] = {
    "aluminium_zinc_indium": SacrificialAnode(
        "aluminium_zinc_indium",
        3,
        26.9815385e-3,
        2000.0,
        -1.05,
        "DNV-RP-B401 (2017) Table 10-6: Al–Zn–In, 2000 A·h/kg, −1.05 V vs Ag/AgCl in seawater "
        "(as commonly quoted, from memory); theoretical Al 2980 A·h/kg (0.3355 g/A·h)",
    ),
    "zinc": SacrificialAnode(
        "zinc",
        2,
        65.38e-3,
        780.0,
        -1.03,
        "DNV-RP-B401 (2017) Table 10-6: zinc, 780 A·h/kg, −1.03 V vs Ag/AgCl in seawater "
        "(as commonly quoted, from memory); theoretical 820 A·h/kg (1.22 g/A·h)",
    ),
}
"""Sacrificial anode alloys by name."""


def _anode(a: str | SacrificialAnode) -> SacrificialAnode:
    if isinstance(a, SacrificialAnode):
        return a
    try:
        return SACRIFICIAL_ANODES[a]
    except (KeyError, TypeError):
        allowed = "one of " + ", ".join(SACRIFICIAL_ANODES)
        raise ModelRangeError("sacrificial anode", a, allowed, "sacrificial anodes") from None


def consumed_mass_kg(
    charge_c: ArrayLike, anode: str | SacrificialAnode, *, basis: str = "practical"
) -> float | np.ndarray:
    """Anode metal consumed by a passed charge (Faraday's law).

    Parameters
    ----------
    charge_c : float or array
        Anodic charge ∫|I| dt [C], ≥ 0.
    anode : str or SacrificialAnode
    basis : str
        "theoretical" (m = Q M/(zF), Al 0.3355 g/A·h) or "practical" (design capacity,
        Al–Zn–In 2000 A·h/kg ⇒ 0.5 g/A·h; includes self-corrosion). Default practical.

    Returns
    -------
    float or ndarray
        Mass [kg].

    References
    ----------
    Faraday's law; DNV-RP-B401 (2017) (practical capacity).
    """
    a = _anode(anode)
    q = np.asarray(charge_c, dtype=float)
    if np.any(~np.isfinite(q)) or np.any(q < 0.0):
        raise ModelRangeError("charge_c", charge_c, "finite and ≥ 0 C", "sacrificial anodes")
    if basis == "theoretical":
        m = q * a.molar_mass_kg_mol / (a.valence * FARADAY_C_MOL)
    elif basis == "practical":
        m = q / 3600.0 / a.practical_capacity_ah_kg
    else:
        raise ModelRangeError("basis", basis, '"theoretical" or "practical"', "sacrificial anodes")
    return float(m) if m.ndim == 0 else m


def anode_mass_left_kg(
    initial_mass_kg: float,
    charge_c: ArrayLike,
    anode: str | SacrificialAnode,
    *,
    basis: str = "practical",
) -> float | np.ndarray:
    """Anode mass left after a charge has passed (never below zero) [kg].

    Parameters
    ----------
    initial_mass_kg : float
        Net anode mass when new [kg].
    charge_c : float or array
        Charge passed so far [C].
    anode : str or SacrificialAnode
    basis : str
        See :func:`consumed_mass_kg`.

    Returns
    -------
    float or ndarray
        max(m0 − m(Q), 0) [kg].

    References
    ----------
    Faraday's law.
    """
    m0 = float(initial_mass_kg)
    if not (math.isfinite(m0) and m0 > 0.0):
        raise ModelRangeError("initial_mass_kg", m0, "> 0 kg", "sacrificial anodes")
    left = np.maximum(m0 - np.asarray(consumed_mass_kg(charge_c, anode, basis=basis)), 0.0)
    return float(left) if left.ndim == 0 else left


def anode_spent(
    mass_left_kg: ArrayLike, initial_mass_kg: float, utilisation: float = 0.85
) -> bool | np.ndarray:
    """Whether an anode is spent: its usable share has been consumed.

    Parameters
    ----------
    mass_left_kg : float or array
        Mass left [kg].
    initial_mass_kg : float
        Mass when new [kg].
    utilisation : float
        Usable fraction of the mass, 0 < u ≤ 1; default 0.85 (DNV-RP-B401 utilisation factor
        of long flush-mounted anodes, from memory; stand-off anodes 0.90).

    Returns
    -------
    bool or ndarray
        mass_left ≤ (1 − u)·m0 (an event for the mission: the anode can no longer carry the
        current reliably).

    References
    ----------
    DNV-RP-B401 (2017), anode utilisation factor (from memory).
    """
    u = float(utilisation)
    if not (0.0 < u <= 1.0):
        raise ModelRangeError("utilisation", u, "0 < u ≤ 1", "sacrificial anodes")
    out = np.asarray(mass_left_kg, dtype=float) <= (1.0 - u) * float(initial_mass_kg)
    return bool(out) if out.ndim == 0 else out


def time_to_spent_s(
    initial_mass_kg: float,
    current_a: float,
    anode: str | SacrificialAnode,
    *,
    utilisation: float = 0.85,
    basis: str = "practical",
) -> float:
    """Time until an anode is spent at a constant current [s] (inf at zero current).

    Parameters
    ----------
    initial_mass_kg : float
        Mass when new [kg].
    current_a : float
        Anodic current [A].
    anode : str or SacrificialAnode
    utilisation, basis
        See :func:`anode_spent` and :func:`consumed_mass_kg`.

    Returns
    -------
    float
        t = u·m0/(dm/dQ·|I|) [s].

    References
    ----------
    Faraday's law; DNV-RP-B401 (2017).
    """
    i = abs(float(current_a))
    if i == 0.0:
        return math.inf
    per_c = float(consumed_mass_kg(1.0, anode, basis=basis))
    return float(utilisation) * float(initial_mass_kg) / (per_c * i)


def sacrificial_pair_drop_v(
    anode: str | SacrificialAnode,
    cathode: str | ElectrodeKinetics,
    cathode_current_density_a_m2: ArrayLike,
    ph: float = SEAWATER_PH,
) -> float | np.ndarray:
    """Voltage taken by a sacrificial anode against a hydrogen-evolving cathode [V].

    Parameters
    ----------
    anode : str or SacrificialAnode
    cathode : str or ElectrodeKinetics
        A cathode of :data:`ELECTRODE_KINETICS`.
    cathode_current_density_a_m2 : float or array
        |i| on the cathode face [A/m²].
    ph : float
        pH [-].

    Returns
    -------
    float or ndarray
        ΔV = E_anode − E_rev,H₂ + |η_c| [V]. Negative at small currents: the pair is a
        galvanic cell and helps drive the current (the dissolving metal supplies the energy).

    Notes
    -----
    The anode works at its closed-circuit potential (its own polarisation is small and taken
    into that value); no chlorine and no oxygen form (:func:`sacrificial_gas_rates_mol_s`).
    Used for a thruster only in the direction that makes the sacrificial electrode the anode.

    References
    ----------
    DNV-RP-B401 (2017) (closed-circuit potentials); Bard & Faulkner (2001).
    """
    a = _anode(anode)
    c = _kin(cathode, "cathode")
    ic = np.abs(np.asarray(cathode_current_density_a_m2, dtype=float))
    eta_c = butler_volmer_overpotential_v(
        ic, c.exchange_current_density_a_m2, c.tafel_slope_v_per_decade
    )
    out = a.potential_v_she - reversible_potential_v_she("hydrogen", ph) + np.asarray(eta_c)
    return float(out) if out.ndim == 0 else out


def sacrificial_gas_rates_mol_s(current_a: ArrayLike):
    """Gas of a sacrificial-anode pair: hydrogen at the cathode only.

    Parameters
    ----------
    current_a : float or array
        Current [A] (sign ignored).

    Returns
    -------
    tuple of (h2, cl2, o2)
        [mol/s]: |I|/(2F), 0, 0.

    References
    ----------
    Faraday's law.
    """
    i = np.abs(np.asarray(current_a, dtype=float))
    h2 = i / (2.0 * FARADAY_C_MOL)
    return h2, np.zeros_like(h2), np.zeros_like(h2)
