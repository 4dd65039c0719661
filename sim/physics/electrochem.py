"""Electrochemistry at the thruster electrodes: Faraday's law of gas production, the reversible
cell voltage of seawater electrolysis, and the voltage lost at a pair of electrodes.

References
----------
Faraday constant: CODATA 2018 recommended value, F = 96485.33212 C/mol
(Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).

Standard electrode potentials: Bard, A. J., Parsons, R. & Jordan, J. (eds.) (1985). Standard
Potentials in Aqueous Solution. IUPAC / Marcel Dekker, New York.

Galvanic series in flowing seawater: ASTM G82, Standard Guide for Development and Use of a
Galvanic Series for Predicting Galvanic Corrosion Performance, ASTM International (its figure
reproduces the seawater series of LaQue, F. L. (1975), Marine Corrosion: Causes and Prevention,
Wiley, New York; attribution from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sim.physics.errors import ModelRangeError

FARADAY_C_MOL = 96485.33212
"""Faraday constant [C/mol] (CODATA 2018)."""


def gas_rates_mol_s(current_a, chlorine_fraction: float = 1.0):
    """Gas evolved at the electrodes by a direct current in seawater (Faraday's law).

    Parameters
    ----------
    current_a : float or array
        Current through the electrolyte [A]. The sign is ignored: gas forms whichever way the
        current flows.
    chlorine_fraction : float
        Fraction of the anodic charge that evolves chlorine (2Cl⁻ → Cl₂ + 2e⁻) [-]; the rest
        evolves oxygen (2H₂O → O₂ + 4H⁺ + 4e⁻). At the cathode all charge evolves hydrogen
        (2H₂O + 2e⁻ → H₂ + 2OH⁻). Default 1.0 (all chlorine, the worst case for toxicity).

    Returns
    -------
    tuple of (h2, cl2, o2)
        Molar production rates [mol/s].

    Notes
    -----
    ṅ_H2 = |I|/(2F); ṅ_Cl2 = f_Cl·|I|/(2F); ṅ_O2 = (1 − f_Cl)·|I|/(4F).

    References
    ----------
    Faraday's law of electrolysis; F from CODATA 2018.
    """
    if not 0.0 <= chlorine_fraction <= 1.0:
        raise ValueError(f"chlorine_fraction = {chlorine_fraction!r} must lie in [0, 1]")
    i = np.abs(np.asarray(current_a, dtype=float))
    h2 = i / (2.0 * FARADAY_C_MOL)
    cl2 = chlorine_fraction * h2
    o2 = (1.0 - chlorine_fraction) * i / (4.0 * FARADAY_C_MOL)
    return h2, cl2, o2


# --------------------------------------------------------------------------------------------
# reversible (thermodynamic) cell voltage
# --------------------------------------------------------------------------------------------

E0_CL2_CL_V = 1.358
"""Standard potential of Cl₂ + 2e⁻ ⇌ 2Cl⁻ [V vs SHE] at 25 °C (Bard, Parsons & Jordan 1985)."""

E0_O2_H2O_V = 1.229
"""Standard potential of O₂ + 4H⁺ + 4e⁻ ⇌ 2H₂O [V vs SHE] at 25 °C (Bard, Parsons & Jordan 1985)."""

NERNST_SLOPE_V_PER_PH = 0.05916
"""(RT/F)·ln 10 at 25 °C [V per pH unit]."""

PH_RANGE: tuple[float, float] = (0.0, 14.0)
"""Allowed pH [-] for the reversible-voltage model."""

SEAWATER_PH = 8.1
"""Typical surface-ocean pH [-] (common practice)."""


def _check_ph(ph: float, model: str) -> float:
    ph_f = float(ph)
    if not (np.isfinite(ph_f) and PH_RANGE[0] <= ph_f <= PH_RANGE[1]):
        raise ModelRangeError("pH", ph_f, f"{PH_RANGE[0]:g} ≤ pH ≤ {PH_RANGE[1]:g}", model)
    return ph_f


def reversible_cell_voltage_v(ph: float = SEAWATER_PH, chlorine: bool = True) -> float:
    """Minimum (reversible) voltage to electrolyse seawater, at 25 °C and unit gas activities.

    Parameters
    ----------
    ph : float
        pH of the water at the electrodes [-], 0…14. Default 8.1 (surface seawater).
    chlorine : bool
        True: anode evolves chlorine (2Cl⁻ → Cl₂ + 2e⁻). False: anode evolves oxygen
        (2H₂O → O₂ + 4H⁺ + 4e⁻). The cathode always evolves hydrogen (2H₂O + 2e⁻ → H₂ + 2OH⁻).

    Returns
    -------
    float
        Reversible cell voltage E_anode − E_cathode [V].

    Notes
    -----
    Nernst potentials vs SHE (activities of Cl⁻, Cl₂, O₂ and H₂ taken as one):

        E(Cl₂/Cl⁻) = 1.358
        E(O₂/H₂O)  = 1.229 − 0.05916 pH
        E(H⁺/H₂)   = 0 − 0.05916 pH

    Chlorine route: U = 1.358 + 0.05916 pH (1.837 V at pH 8.1); oxygen route: U = 1.229 V at
    any pH (both half-reactions shift equally). The chloride activity of seawater (about 0.4,
    from memory) would raise the chlorine value by about 25 mV; it is neglected, as is
    temperature.

    References
    ----------
    .. [1] Bard, A. J., Parsons, R. & Jordan, J. (eds.) (1985). Standard Potentials in Aqueous
       Solution. IUPAC / Marcel Dekker, New York.
    """
    ph_f = _check_ph(ph, "reversible cell voltage")
    e_cathode = -NERNST_SLOPE_V_PER_PH * ph_f
    e_anode = E0_CL2_CL_V if chlorine else E0_O2_H2O_V - NERNST_SLOPE_V_PER_PH * ph_f
    return e_anode - e_cathode


# --------------------------------------------------------------------------------------------
# electrode materials and pairs
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ElectrodeMaterial:
    """An electrode material and its rest potential in flowing seawater.

    Attributes
    ----------
    name : str
        Key of the material in :data:`ELECTRODE_MATERIALS`.
    rest_potential_v_sce : float
        Free-corrosion (rest) potential in flowing seawater [V vs saturated calomel electrode].
    source : str
        Where the value comes from.
    """

    name: str
    rest_potential_v_sce: float
    source: str


_GALVANIC = "galvanic series in flowing seawater (ASTM G82 lineage), midpoint of {lo}…{hi} V vs SCE"


def _material(name: str, lo: float, hi: float, note: str = "") -> ElectrodeMaterial:
    src = _GALVANIC.format(lo=f"{lo:+.2f}", hi=f"{hi:+.2f}") + note
    return ElectrodeMaterial(name, round(0.5 * (lo + hi), 4), src)


ELECTRODE_MATERIALS: dict[str, ElectrodeMaterial] = {
    m.name: m
    for m in (
        _material("graphite", 0.20, 0.30),
        _material("platinum", 0.18, 0.26),
        _material(
            "platinised_titanium", 0.18, 0.26, "; platinum value (the wetted surface is platinum)"
        ),
        _material("stainless_316_passive", -0.10, 0.00),
        _material("copper", -0.37, -0.30),
        _material("mild_steel", -0.72, -0.60),
        _material("aluminium_alloy", -1.00, -0.76),
        _material("zinc", -1.03, -0.98),
        _material("magnesium", -1.63, -1.60),
    )
}
"""Electrode materials by name, rest potentials [V vs SCE] from the seawater galvanic series."""


def _lookup(name: str, role: str) -> ElectrodeMaterial:
    try:
        return ELECTRODE_MATERIALS[name]
    except (KeyError, TypeError):
        allowed = "one of " + ", ".join(sorted(ELECTRODE_MATERIALS))
        raise ModelRangeError(f"{role} material", name, allowed, "electrode materials") from None


def galvanic_offset_v(anode: str, cathode: str) -> float:
    """Galvanic offset of a dissimilar electrode pair, E_rest(anode) − E_rest(cathode) [V].

    Parameters
    ----------
    anode, cathode : str
        Names in :data:`ELECTRODE_MATERIALS`.

    Returns
    -------
    float
        Offset [V]. "Anode" is the electrode at the higher potential when the applied voltage
        is positive. Positive when that electrode is the more noble metal: the pair's own
        galvanic EMF then opposes a positive applied voltage (and aids a negative one). Negative
        when it is the less noble metal (it corrodes sacrificially and helps drive a positive
        current). Its sign does not flip with the current, unlike `electrode_drop_v`.

    Raises
    ------
    ModelRangeError
        If a name is not a known material (the message lists the allowed names).

    References
    ----------
    .. [1] ASTM G82, Standard Guide for Development and Use of a Galvanic Series for Predicting
       Galvanic Corrosion Performance. ASTM International.
    """
    e_a = _lookup(anode, "anode").rest_potential_v_sce
    e_c = _lookup(cathode, "cathode").rest_potential_v_sce
    return e_a - e_c


@dataclass(frozen=True)
class ElectrodePair:
    """The two electrodes of a thruster duct and the electrolysis they drive.

    Attributes
    ----------
    anode : str
        Anode material, a key of :data:`ELECTRODE_MATERIALS`.
    cathode : str
        Cathode material, a key of :data:`ELECTRODE_MATERIALS`.
    overpotential_v : float
        Sum of anodic and cathodic activation and concentration overpotentials [V], ≥ 0.
        Default 0.5 V (from memory: practical electrodes need several hundred mV above the
        reversible voltage; not confirmed for a particular material or current density).
    chlorine_fraction : float
        Fraction of the anodic charge that evolves chlorine [-], 0…1 (rest evolves oxygen).
    ph : float
        pH at the electrodes [-], 0…14. Default 8.1.
    """

    anode: str = "platinised_titanium"
    cathode: str = "platinised_titanium"
    overpotential_v: float = 0.5
    chlorine_fraction: float = 1.0
    ph: float = SEAWATER_PH

    def __post_init__(self) -> None:
        _lookup(self.anode, "anode")
        _lookup(self.cathode, "cathode")
        model = "electrode pair"
        eta = float(self.overpotential_v)
        if not (np.isfinite(eta) and eta >= 0.0):
            raise ModelRangeError("overpotential_v", eta, "0 ≤ overpotential_v [V]", model)
        f = float(self.chlorine_fraction)
        if not (np.isfinite(f) and 0.0 <= f <= 1.0):
            raise ModelRangeError("chlorine_fraction", f, "0 ≤ chlorine_fraction ≤ 1", model)
        _check_ph(self.ph, model)

    @property
    def galvanic_offset_v(self) -> float:
        """E_rest(anode) − E_rest(cathode) [V]; see :func:`galvanic_offset_v`."""
        return galvanic_offset_v(self.anode, self.cathode)

    def electrode_drop_v(self) -> float:
        """Voltage lost at the electrodes whichever way the current flows [V]; see
        :func:`electrode_drop_v` (the galvanic offset is separate: `galvanic_offset_v`)."""
        return electrode_drop_v(self)


def electrode_drop_v(pair: ElectrodePair) -> float:
    """Voltage the electrode reactions take, whichever way the current flows.

    Parameters
    ----------
    pair : ElectrodePair
        Electrode materials, overpotential, chlorine fraction and pH.

    Returns
    -------
    float
        Electrode drop [V], ≥ 0: the part of the applied voltage that does no work on the flow
        and opposes the current in either direction. It does NOT include the galvanic offset
        of a dissimilar pair, which has a fixed sign (see below).

    Notes
    -----
    ΔV_el = f U_Cl + (1 − f) U_O + η,

    with U_Cl, U_O from :func:`reversible_cell_voltage_v`, f the chlorine fraction and η the
    overpotential. The charge-weighted mean of U_Cl and U_O makes ΔV_el·I equal the reversible
    work rate of the gas mix that Faraday's law (:func:`gas_rates_mol_s`) assigns to the current.

    A dissimilar pair adds its galvanic offset ΔE = E_rest,anode − E_rest,cathode
    (:func:`galvanic_offset_v`, about 0.6 V for aluminium against copper, common practice) as a
    fixed EMF: the voltage across the water is V − ΔE − sign(I)·ΔV_el, so the offset opposes
    the current one way and aids it the other (`DuctThruster.galvanic_offset_v`). Lumping it
    into ΔV_el, which flips with the current, would make it oppose both ways (a bug fixed in
    0.1: this function used to add it). The offset is a bookkeeping approximation: once gas
    evolves, real electrode potentials are set by the reactions, and a reactive anode
    (aluminium, zinc, magnesium) dissolves instead of evolving gas.

    References
    ----------
    .. [1] Bard, Parsons & Jordan (1985). Standard Potentials in Aqueous Solution. IUPAC.
    .. [2] ASTM G82, Galvanic series guide. ASTM International.
    """
    f = pair.chlorine_fraction
    u_rev = f * reversible_cell_voltage_v(pair.ph, chlorine=True) + (
        1.0 - f
    ) * reversible_cell_voltage_v(pair.ph, chlorine=False)
    return u_rev + pair.overpotential_v


DEFAULT_ELECTRODES = ElectrodePair()
"""Platinised titanium on both sides (no galvanic offset), 0.5 V overpotential, all chlorine."""
