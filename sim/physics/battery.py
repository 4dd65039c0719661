"""Equivalent-circuit battery pack model for the time-domain engine.

Each cell is a Thevenin circuit: an open-circuit voltage source OCV(SOC) in series with an ohmic
resistance R0(SOC, T) and one or two parallel RC pairs (R_k(SOC, T) ∥ C_k(SOC)). A pack is
``n_series`` strings of identical cells, each position holding ``n_parallel`` cells in parallel,
plus an optional lumped series resistance for busbars, fuses and contactors. Cell-to-cell spread
is not modelled: every cell carries the current ``I / n_parallel`` and sees the same SOC and
temperature.

Sign convention: the pack current ``current_a`` is positive on discharge and negative on charge;
the pack power ``power_w`` at the terminals is positive when the pack delivers power.

Model equations (pack level, ``E = OCV − Σ V_k``)::

    V_term     = OCV(SOC) − Σ V_k − I·R0(SOC, T)
    dSOC/dt    = −I / (3600·Q)                     (I > 0, discharge)
               = −η_c·I / (3600·Q)                 (I < 0, charge; η_c coulombic efficiency)
    dV_k/dt    = I/C_k − V_k/(R_k·C_k)
    Q_heat     = I²·R0 + Σ V_k²/R_k − I·T·∂OCV/∂T
    m·c_p·dT/dt = Q_heat − UA·(T − T_amb)

Resistances follow an Arrhenius law in absolute temperature about the table's reference
temperature, ``R(T) = R(T_ref)·exp(E_a/R_gas·(1/T − 1/T_ref))``; capacitances and the OCV table are
taken as temperature-independent (the entropic coefficient ∂OCV/∂T only enters the heat balance).

Series/parallel scaling from cell to pack: voltages and resistances ×n_s, resistances ÷n_p,
capacitances ×n_p/n_s (so every RC time constant is unchanged), capacity and currents ×n_p.

Speed: these functions sit inside the ODE right-hand side. All tables are converted at
construction into numpy arrays (array path, ``np.interp``) and Python lists (scalar path, one
bisection shared by every tabulated quantity). Scalar inputs take the scalar path and return
Python floats; arrays broadcast together and return arrays.

Valid ranges (checked; outside them :class:`~sim.physics.errors.ModelRangeError` is raised):
state of charge −0.05 ≤ SOC ≤ 1.05 (the tables are held flat beyond 0 and 1, so an integrator
overshooting an end-of-discharge event slightly does not fail), cell temperature
−40 ≤ T ≤ 80 °C.

References
----------
.. [1] Huria, T., Ceraolo, M., Gazzarri, J. & Jackey, R. (2012). High fidelity electrical model
   with thermal dependence for characterization and simulation of high power lithium battery
   cells. 2012 IEEE International Electric Vehicle Conference (IEVC), Greenville SC.
   doi:10.1109/IEVC.2012.6183271 (attribution and DOI from memory).
.. [2] Plett, G. L. (2015). Battery Management Systems, Volume I: Battery Modeling. Artech House,
   Boston. Chapter 2 (equivalent-circuit cell models).
.. [3] Bernardi, D., Pawlikowski, E. & Newman, J. (1985). A general energy balance for battery
   systems. Journal of The Electrochemical Society 132(1), 5–12. doi:10.1149/1.2113792
.. [4] Peukert, W. (1897). Über die Abhängigkeit der Kapazität von der Entladestromstärke bei
   Bleiakkumulatoren. Elektrotechnische Zeitschrift 18, 287–288.
.. [5] Arrhenius, S. (1889). Über die Reaktionsgeschwindigkeit bei der Inversion von Rohrzucker
   durch Säuren. Zeitschrift für physikalische Chemie 4, 226–248.
.. [6] Tiesinga, E., Mohr, P. J., Newell, D. B. & Taylor, B. N. (2021). CODATA recommended values
   of the fundamental physical constants: 2018. Reviews of Modern Physics 93, 025010 (molar gas
   constant).
"""

from __future__ import annotations

import math
from bisect import bisect_right
from collections.abc import Sequence
from dataclasses import dataclass, field
from itertools import pairwise

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

GAS_CONSTANT_J_MOL_K = 8.314462618
"""Molar gas constant [J/(mol·K)] (CODATA 2018, exact)."""

KELVIN_OFFSET = 273.15
"""0 °C in kelvin [K]."""

SOC_RANGE: tuple[float, float] = (-0.05, 1.05)
"""Accepted state of charge [-]; the tables are held flat outside 0…1."""

TEMPERATURE_RANGE_C: tuple[float, float] = (-40.0, 80.0)
"""Accepted cell temperature [°C] for the Arrhenius resistance law."""

DEFAULT_ACTIVATION_ENERGY_J_MOL = 20_000.0
"""Default activation energy of the cell resistances [J/mol].

From memory, not confirmed: ohmic and charge-transfer resistances of lithium-ion cells are
commonly fitted with activation energies of roughly 15–50 kJ/mol; 20 kJ/mol is a mild choice that
roughly doubles the resistance from 25 °C down to 0 °C (factor
exp(20000/8.314·(1/273.15 − 1/298.15)) = 2.09).
"""

REASON_OK = "ok"
REASON_INFEASIBLE = "demanded power exceeds what the pack can deliver"
REASON_NO_EMF = "no driving voltage: open-circuit voltage minus polarisation is not positive"
REASON_V_MIN = "cell voltage below v_min"
REASON_V_MAX = "cell voltage above v_max"
REASON_I_DISCHARGE = "discharge current above the continuous limit"
REASON_I_CHARGE = "charge current above the continuous limit"

_MODEL_CELL = "battery cell parameters"
_MODEL_PACK = "battery pack"
_MODEL_ECM = "battery equivalent circuit"


# --------------------------------------------------------------------------------------------
# Small helpers
# --------------------------------------------------------------------------------------------


def _is_scalar(x: object) -> bool:
    """True for Python/numpy floats and Python ints (the scalar fast path)."""
    return isinstance(x, (float, int))


def _check_soc_scalar(soc: float) -> None:
    if not SOC_RANGE[0] <= soc <= SOC_RANGE[1]:
        raise ModelRangeError(
            "state of charge", soc, f"{SOC_RANGE[0]} ≤ SOC ≤ {SOC_RANGE[1]}", _MODEL_ECM
        )


def _check_soc_array(soc: np.ndarray) -> None:
    if soc.size and (np.min(soc) < SOC_RANGE[0] or np.max(soc) > SOC_RANGE[1]):
        bad = soc[(soc < SOC_RANGE[0]) | (soc > SOC_RANGE[1])]
        raise ModelRangeError(
            "state of charge",
            float(bad.flat[0]),
            f"{SOC_RANGE[0]} ≤ SOC ≤ {SOC_RANGE[1]}",
            _MODEL_ECM,
        )


def _check_temp_scalar(temp_c: float) -> None:
    if not TEMPERATURE_RANGE_C[0] <= temp_c <= TEMPERATURE_RANGE_C[1]:
        raise ModelRangeError(
            "cell temperature [°C]",
            temp_c,
            f"{TEMPERATURE_RANGE_C[0]} ≤ T ≤ {TEMPERATURE_RANGE_C[1]} °C",
            _MODEL_ECM,
        )


def _check_temp_array(temp_c: np.ndarray) -> None:
    lo, hi = TEMPERATURE_RANGE_C
    if temp_c.size and (np.min(temp_c) < lo or np.max(temp_c) > hi):
        bad = temp_c[(temp_c < lo) | (temp_c > hi)]
        raise ModelRangeError(
            "cell temperature [°C]", float(bad.flat[0]), f"{lo} ≤ T ≤ {hi} °C", _MODEL_ECM
        )


def _as_tuple(name: str, values: object) -> tuple[float, ...]:
    try:
        out = tuple(float(v) for v in values)  # type: ignore[union-attr]
    except TypeError as exc:
        raise ModelRangeError(name, values, "a sequence of numbers", _MODEL_CELL) from exc
    if not all(math.isfinite(v) for v in out):
        raise ModelRangeError(name, out, "finite numbers", _MODEL_CELL)
    return out


def _readonly(values: Sequence[float]) -> np.ndarray:
    arr = np.array(values, dtype=float)
    arr.flags.writeable = False
    return arr


# --------------------------------------------------------------------------------------------
# Cell parameters
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class CellParameters:
    """Equivalent-circuit parameters of one cell, tabulated over state of charge.

    Parameters
    ----------
    name : str
        Descriptive name (chemistry, format, table temperature, source); no product names.
    source : str
        Citation of the parameter values, with "from memory" where not confirmed.
    chemistry : str
        Cell chemistry, e.g. ``"NMC/graphite"`` or ``"LFP/graphite"``.
    capacity_ah : float
        Rated capacity Q [A·h] between SOC 0 and 1.
    soc_points : sequence of float
        State-of-charge breakpoints [-], strictly ascending from 0 to 1.
    ocv_v : sequence of float
        Open-circuit voltage at the breakpoints [V], non-decreasing, positive.
    r0_ohm : sequence of float
        Ohmic (instantaneous) resistance at the breakpoints, at ``t_ref_c`` [Ω], ≥ 0.
    r1_ohm, c1_f : sequence of float
        First RC pair: resistance [Ω] (> 0, at ``t_ref_c``) and capacitance [F] (> 0).
    v_min, v_max : float
        Lower and upper cell terminal-voltage limits [V].
    max_discharge_current_a, max_charge_current_a : float
        Continuous current limits of one cell [A], both given as positive numbers.
    mass_kg : float
        Cell mass [kg].
    cp_j_kg_k : float
        Cell mean specific heat capacity [J/(kg·K)].
    r2_ohm, c2_f : sequence of float or None
        Optional second RC pair [Ω], [F]; give both or neither.
    coulombic_efficiency : float
        Fraction of the charging charge that is stored, 0 < η_c ≤ 1 [-]; discharge uses 1.
    activation_energy_j_mol : float
        Arrhenius activation energy E_a of all resistances [J/mol], ≥ 0.
    t_ref_c : float
        Temperature at which the resistance tables hold [°C].
    entropic_coefficient_v_k : float
        ∂OCV/∂T of the cell [V/K], used only for the reversible heat; may be 0.

    Notes
    -----
    Resistances at temperature T [K]: R(SOC, T) = R(SOC, T_ref)·exp(E_a/R_gas·(1/T − 1/T_ref)).
    The derived attributes (numpy arrays and Python lists) are built once here so that the
    per-call path of the model functions is only a table lookup.

    References
    ----------
    Plett (2015), Battery Management Systems Vol. I, ch. 2; Arrhenius (1889).
    """

    name: str
    source: str
    chemistry: str
    capacity_ah: float
    soc_points: Sequence[float]
    ocv_v: Sequence[float]
    r0_ohm: Sequence[float]
    r1_ohm: Sequence[float]
    c1_f: Sequence[float]
    v_min: float
    v_max: float
    max_discharge_current_a: float
    max_charge_current_a: float
    mass_kg: float
    cp_j_kg_k: float
    r2_ohm: Sequence[float] | None = None
    c2_f: Sequence[float] | None = None
    coulombic_efficiency: float = 1.0
    activation_energy_j_mol: float = DEFAULT_ACTIVATION_ENERGY_J_MOL
    t_ref_c: float = 25.0
    entropic_coefficient_v_k: float = 0.0

    n_rc: int = field(init=False, repr=False, compare=False)
    """Number of RC pairs (1 or 2)."""
    energy_wh: float = field(init=False, repr=False, compare=False)
    """Nominal energy ∫OCV dQ from SOC 0 to 1 [W·h] (exact for the linear interpolation)."""
    _soc_list: list = field(init=False, repr=False, compare=False)
    _inv_dsoc: list = field(init=False, repr=False, compare=False)
    _soc_arr: np.ndarray = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        def bad(quantity: str, value: object, allowed: str) -> ModelRangeError:
            return ModelRangeError(quantity, value, allowed, f"{_MODEL_CELL} '{self.name}'")

        soc = _as_tuple("soc_points", self.soc_points)
        if len(soc) < 2:
            raise bad("soc_points", soc, "at least two breakpoints")
        if soc[0] != 0.0 or soc[-1] != 1.0:
            raise bad("soc_points", soc, "first breakpoint 0 and last breakpoint 1")
        if any(b <= a for a, b in pairwise(soc)):
            raise bad("soc_points", soc, "strictly ascending")
        object.__setattr__(self, "soc_points", soc)

        def table(fname: str, lower: float, strict: bool) -> tuple[float, ...]:
            vals = _as_tuple(fname, getattr(self, fname))
            if len(vals) != len(soc):
                raise bad(f"{fname} (length)", len(vals), f"{len(soc)} values, one per soc point")
            for v in vals:
                if (strict and v <= lower) or (not strict and v < lower):
                    rel = ">" if strict else "≥"
                    raise bad(fname, v, f"every value {rel} {lower}")
            object.__setattr__(self, fname, vals)
            return vals

        ocv = table("ocv_v", 0.0, True)
        if any(b < a for a, b in pairwise(ocv)):
            raise bad("ocv_v", ocv, "non-decreasing with state of charge")
        table("r0_ohm", 0.0, False)
        table("r1_ohm", 0.0, True)
        table("c1_f", 0.0, True)
        if (self.r2_ohm is None) != (self.c2_f is None):
            raise bad("r2_ohm/c2_f", (self.r2_ohm, self.c2_f), "both given or both None")
        n_rc = 1
        if self.r2_ohm is not None:
            table("r2_ohm", 0.0, True)
            table("c2_f", 0.0, True)
            n_rc = 2

        def positive(fname: str) -> None:
            v = getattr(self, fname)
            if not (isinstance(v, (int, float)) and math.isfinite(v) and v > 0):
                raise bad(fname, v, "> 0 and finite")

        for fname in (
            "capacity_ah",
            "v_min",
            "v_max",
            "max_discharge_current_a",
            "max_charge_current_a",
            "mass_kg",
            "cp_j_kg_k",
        ):
            positive(fname)
        if self.v_min >= self.v_max:
            raise bad("v_min", self.v_min, f"< v_max = {self.v_max} V")
        if not 0.0 < self.coulombic_efficiency <= 1.0:
            raise bad("coulombic_efficiency", self.coulombic_efficiency, "0 < η ≤ 1")
        ea = self.activation_energy_j_mol
        if not (math.isfinite(ea) and 0.0 <= ea <= 200_000.0):
            raise bad("activation_energy_j_mol", ea, "0 ≤ E_a ≤ 200000 J/mol")
        lo, hi = TEMPERATURE_RANGE_C
        if not lo <= self.t_ref_c <= hi:
            raise bad("t_ref_c", self.t_ref_c, f"{lo} ≤ T_ref ≤ {hi} °C")
        if not (
            math.isfinite(self.entropic_coefficient_v_k)
            and abs(self.entropic_coefficient_v_k) <= 5e-3
        ):
            raise bad(
                "entropic_coefficient_v_k", self.entropic_coefficient_v_k, "|∂OCV/∂T| ≤ 5e-3 V/K"
            )

        energy = 0.0
        for k in range(len(soc) - 1):
            energy += 0.5 * (ocv[k] + ocv[k + 1]) * (soc[k + 1] - soc[k])
        object.__setattr__(self, "n_rc", n_rc)
        object.__setattr__(self, "energy_wh", energy * self.capacity_ah)
        object.__setattr__(self, "_soc_list", list(soc))
        object.__setattr__(self, "_inv_dsoc", [1.0 / (b - a) for a, b in pairwise(soc)])
        object.__setattr__(self, "_soc_arr", _readonly(soc))

    @property
    def nominal_voltage_v(self) -> float:
        """Capacity-averaged open-circuit voltage energy_wh / capacity_ah [V]."""
        return self.energy_wh / self.capacity_ah


# --------------------------------------------------------------------------------------------
# Named parameter sets
# --------------------------------------------------------------------------------------------

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


_CHEN2006_SOC = (
    0.0,
    0.01,
    0.02,
    0.04,
    0.06,
    0.08,
    0.1,
    0.15,
    0.2,
    0.3,
    0.4,
    0.5,
    0.6,
    0.7,
    0.8,
    0.9,
    1.0,
)

LIPO_POUCH_CHEN2006 = CellParameters(
    name="Li-ion polymer cell, 850 mAh (Chen & Rincón-Mora 2006)",
    source=(
        "OCV, series resistance and two RC pairs as functions of SOC: Chen & Rincón-Mora "
        "(2006), An accurate electrical battery model capable of predicting runtime and I-V "
        "performance, IEEE Trans. Energy Conversion 21(2):504-511, doi:10.1109/TEC.2006.874229 "
        "(coefficients as published; tabulated here at 17 SOC points, capacitances held at "
        "their SOC 0.02 values below that). Not in that model, from "
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

CELL_SETS: dict[str, CellParameters] = {
    "nmc_pouch_huria2012": NMC_POUCH_HURIA2012,
    "lfp_prismatic_representative": LFP_PRISMATIC_REPRESENTATIVE,
    "lipo_pouch_chen2006": LIPO_POUCH_CHEN2006,
}
"""Named cell parameter sets by key."""


# --------------------------------------------------------------------------------------------
# Pack
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class Pack:
    """A pack of identical cells, ``n_series`` in series of ``n_parallel`` in parallel.

    Parameters
    ----------
    cell : CellParameters
        The cell.
    n_series : int
        Cells in series (≥ 1) [-].
    n_parallel : int
        Cells in parallel at each series position (≥ 1) [-].
    extra_series_resistance_ohm : float
        Lumped busbar, fuse and contactor resistance in series with the cells [Ω], ≥ 0;
        temperature-independent.

    Attributes
    ----------
    capacity_ah : float
        Pack capacity n_p·Q_cell [A·h].
    energy_wh : float
        Nominal energy ∫OCV dQ = n_s·n_p·E_cell [W·h].
    n_cells : int
        n_s·n_p [-].
    v_min, v_max : float
        Pack voltage window n_s·v_min, n_s·v_max [V] (cell limits; the busbar drop is extra).
    max_discharge_current_a, max_charge_current_a : float
        Continuous pack current limits n_p·I_cell [A] (positive numbers).
    mass_kg : float
        Cell mass n_cells·m_cell [kg] (structure not included).
    thermal_mass_j_k : float
        Lumped heat capacity n_cells·m_cell·c_p [J/K].
    n_rc : int
        Number of RC pairs.
    nominal_voltage_v : float
        Capacity-averaged open-circuit voltage [V].
    r0_ref_ohm : float
        Ohmic resistance at SOC 0.5 and the table temperature, busbars included [Ω].

    Notes
    -----
    Scaling: OCV_pack = n_s·OCV_cell; R_pack = (n_s/n_p)·R_cell; C_pack = (n_p/n_s)·C_cell.

    References
    ----------
    Plett (2015), Battery Management Systems Vol. I, ch. 2 (pack of identical cells).
    """

    cell: CellParameters
    n_series: int
    n_parallel: int
    extra_series_resistance_ohm: float = 0.0

    capacity_ah: float = field(init=False, repr=False, compare=False)
    energy_wh: float = field(init=False, repr=False, compare=False)
    n_cells: int = field(init=False, repr=False, compare=False)
    v_min: float = field(init=False, repr=False, compare=False)
    v_max: float = field(init=False, repr=False, compare=False)
    max_discharge_current_a: float = field(init=False, repr=False, compare=False)
    max_charge_current_a: float = field(init=False, repr=False, compare=False)
    mass_kg: float = field(init=False, repr=False, compare=False)
    thermal_mass_j_k: float = field(init=False, repr=False, compare=False)
    n_rc: int = field(init=False, repr=False, compare=False)
    # precomputed tables (pack level): Python lists for the scalar path, arrays for the vector path
    _ocv_l: list = field(init=False, repr=False, compare=False)
    _r0_l: list = field(init=False, repr=False, compare=False)
    _rc_l: tuple = field(init=False, repr=False, compare=False)
    _ocv_a: np.ndarray = field(init=False, repr=False, compare=False)
    _r0_a: np.ndarray = field(init=False, repr=False, compare=False)
    _rc_a: tuple = field(init=False, repr=False, compare=False)
    _k_ea: float = field(init=False, repr=False, compare=False)
    _inv_tref: float = field(init=False, repr=False, compare=False)
    _inv_3600q: float = field(init=False, repr=False, compare=False)
    _eta_c: float = field(init=False, repr=False, compare=False)
    _dudt: float = field(init=False, repr=False, compare=False)
    _inv_ns: float = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        if not isinstance(self.cell, CellParameters):
            raise ModelRangeError("cell", self.cell, "a CellParameters instance", _MODEL_PACK)
        for fname in ("n_series", "n_parallel"):
            v = getattr(self, fname)
            if isinstance(v, bool) or not isinstance(v, (int, np.integer)) or v < 1:
                raise ModelRangeError(fname, v, "an integer ≥ 1", _MODEL_PACK)
            object.__setattr__(self, fname, int(v))
        rx = self.extra_series_resistance_ohm
        if not (isinstance(rx, (int, float)) and math.isfinite(rx) and rx >= 0.0):
            raise ModelRangeError(
                "extra_series_resistance_ohm", rx, "≥ 0 Ω and finite", _MODEL_PACK
            )
        object.__setattr__(self, "extra_series_resistance_ohm", float(rx))

        c = self.cell
        ns, np_ = self.n_series, self.n_parallel
        kr = ns / np_
        kc = np_ / ns
        s = object.__setattr__
        s(self, "capacity_ah", c.capacity_ah * np_)
        s(self, "energy_wh", c.energy_wh * ns * np_)
        s(self, "n_cells", ns * np_)
        s(self, "v_min", c.v_min * ns)
        s(self, "v_max", c.v_max * ns)
        s(self, "max_discharge_current_a", c.max_discharge_current_a * np_)
        s(self, "max_charge_current_a", c.max_charge_current_a * np_)
        s(self, "mass_kg", c.mass_kg * ns * np_)
        s(self, "thermal_mass_j_k", c.mass_kg * c.cp_j_kg_k * ns * np_)
        s(self, "n_rc", c.n_rc)

        ocv = [v * ns for v in c.ocv_v]
        r0 = [v * kr for v in c.r0_ohm]
        pairs = [(c.r1_ohm, c.c1_f)]
        if c.n_rc == 2:
            pairs.append((c.r2_ohm, c.c2_f))
        rc_l = tuple(([r * kr for r in rs], [cc * kc for cc in cs]) for rs, cs in pairs)
        s(self, "_ocv_l", ocv)
        s(self, "_r0_l", r0)
        s(self, "_rc_l", rc_l)
        s(self, "_ocv_a", _readonly(ocv))
        s(self, "_r0_a", _readonly(r0))
        s(self, "_rc_a", tuple((_readonly(rs), _readonly(cs)) for rs, cs in rc_l))
        s(self, "_k_ea", c.activation_energy_j_mol / GAS_CONSTANT_J_MOL_K)
        s(self, "_inv_tref", 1.0 / (c.t_ref_c + KELVIN_OFFSET))
        s(self, "_inv_3600q", 1.0 / (3600.0 * self.capacity_ah))
        s(self, "_eta_c", c.coulombic_efficiency)
        s(self, "_dudt", c.entropic_coefficient_v_k * ns)
        s(self, "_inv_ns", 1.0 / ns)

    @property
    def nominal_voltage_v(self) -> float:
        """Capacity-averaged pack open-circuit voltage energy_wh / capacity_ah [V]."""
        return self.energy_wh / self.capacity_ah

    @property
    def r0_ref_ohm(self) -> float:
        """Pack ohmic resistance at SOC 0.5 and the table temperature, busbars included [Ω]."""
        j, w = self._seg(0.5)
        return _lerp(self._r0_l, j, w) + self.extra_series_resistance_ohm

    # -- internal lookups ---------------------------------------------------------------------

    def _seg(self, soc: float) -> tuple[int, float]:
        """Segment index and weight for a scalar SOC (checked, held flat outside 0…1)."""
        if not SOC_RANGE[0] <= soc <= SOC_RANGE[1]:
            _check_soc_scalar(soc)
        xs = self.cell._soc_list
        if soc <= 0.0:
            return 0, 0.0
        if soc >= 1.0:
            return len(xs) - 2, 1.0
        j = bisect_right(xs, soc) - 1
        return j, (soc - xs[j]) * self.cell._inv_dsoc[j]

    def _arrhenius(self, temp_c: float) -> float:
        if not TEMPERATURE_RANGE_C[0] <= temp_c <= TEMPERATURE_RANGE_C[1]:
            _check_temp_scalar(temp_c)
        if self._k_ea == 0.0:
            return 1.0
        return math.exp(self._k_ea * (1.0 / (temp_c + KELVIN_OFFSET) - self._inv_tref))

    def _arrhenius_a(self, temp_c: np.ndarray) -> np.ndarray:
        _check_temp_array(temp_c)
        return np.exp(self._k_ea * (1.0 / (temp_c + KELVIN_OFFSET) - self._inv_tref))

    def _soc_a(self, soc: ArrayLike) -> np.ndarray:
        a = np.asarray(soc, dtype=float)
        _check_soc_array(a)
        return a


def _lerp(ys: list, j: int, w: float) -> float:
    y0 = ys[j]
    return y0 + w * (ys[j + 1] - y0)


# --------------------------------------------------------------------------------------------
# Pack-level circuit elements
# --------------------------------------------------------------------------------------------


def resistance_temperature_factor(pack: Pack, temp_c: ArrayLike) -> float | np.ndarray:
    """Arrhenius factor applied to every cell resistance.

    Parameters
    ----------
    pack : Pack
        The pack (its cell carries E_a and T_ref).
    temp_c : float or array
        Cell temperature [°C].

    Returns
    -------
    float or ndarray
        R(T)/R(T_ref) [-].

    Notes
    -----
    f = exp(E_a/R_gas·(1/T − 1/T_ref)), T and T_ref in kelvin; f = 1 at T_ref and f > 1 colder.

    References
    ----------
    Arrhenius (1889); R_gas from CODATA 2018.
    """
    if _is_scalar(temp_c):
        return pack._arrhenius(float(temp_c))
    return pack._arrhenius_a(np.asarray(temp_c, dtype=float))


def ocv_v(pack: Pack, soc: ArrayLike) -> float | np.ndarray:
    """Pack open-circuit voltage.

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].

    Returns
    -------
    float or ndarray
        OCV = n_s·OCV_cell(SOC) [V], linear interpolation in the cell table.

    References
    ----------
    Plett (2015), ch. 2.
    """
    if _is_scalar(soc):
        j, w = pack._seg(soc)
        return _lerp(pack._ocv_l, j, w)
    return np.interp(pack._soc_a(soc), pack.cell._soc_arr, pack._ocv_a)


def r0_ohm(pack: Pack, soc: ArrayLike, temp_c: ArrayLike) -> float | np.ndarray:
    """Pack ohmic resistance, cells plus the extra series resistance.

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    temp_c : float or array
        Cell temperature [°C].

    Returns
    -------
    float or ndarray
        R0 = (n_s/n_p)·R0_cell(SOC)·f(T) + R_extra [Ω].

    Notes
    -----
    f(T) = exp(E_a/R_gas·(1/T − 1/T_ref)); the busbar resistance R_extra is not scaled.

    References
    ----------
    Plett (2015), ch. 2; Arrhenius (1889).
    """
    if _is_scalar(soc) and _is_scalar(temp_c):
        j, w = pack._seg(soc)
        return _lerp(pack._r0_l, j, w) * pack._arrhenius(temp_c) + pack.extra_series_resistance_ohm
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(np.asarray(temp_c, dtype=float))
    return np.interp(s, pack.cell._soc_arr, pack._r0_a) * f + pack.extra_series_resistance_ohm


def rc_params(pack: Pack, soc: ArrayLike, temp_c: ArrayLike) -> tuple:
    """Pack-level RC pairs.

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    temp_c : float or array
        Cell temperature [°C].

    Returns
    -------
    tuple of (r_ohm, c_f)
        One ``(R_k [Ω], C_k [F])`` pair per RC element: R_k = (n_s/n_p)·R_k,cell(SOC)·f(T),
        C_k = (n_p/n_s)·C_k,cell(SOC).

    Notes
    -----
    The time constant R_k·C_k of the pack equals that of the cell (at the same temperature).

    References
    ----------
    Plett (2015), ch. 2; Arrhenius (1889).
    """
    if _is_scalar(soc) and _is_scalar(temp_c):
        j, w = pack._seg(soc)
        f = pack._arrhenius(temp_c)
        return tuple((_lerp(rs, j, w) * f, _lerp(cs, j, w)) for rs, cs in pack._rc_l)
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(np.asarray(temp_c, dtype=float))
    xs = pack.cell._soc_arr
    return tuple((np.interp(s, xs, rs) * f, np.interp(s, xs, cs)) for rs, cs in pack._rc_a)


# --------------------------------------------------------------------------------------------
# Algebraic solves
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class PackOperatingPoint:
    """Operating point of the pack at one instant (fields are floats or arrays alike).

    Attributes
    ----------
    current_a : float or ndarray
        Pack current [A], positive on discharge. For an infeasible power demand, the current of
        the power maximum E/(2R0).
    terminal_v : float or ndarray
        Pack terminal voltage, after the busbar resistance [V].
    cell_v : float or ndarray
        Terminal voltage of one cell [V].
    power_w : float or ndarray
        Power delivered at the pack terminals, current_a·terminal_v [W].
    feasible : bool or ndarray of bool
        The circuit can deliver the demanded power (a real root exists).
    within_limits : bool or ndarray of bool
        Feasible and no cell voltage or current limit is violated.
    max_power_w : float or ndarray
        Greatest power the circuit can deliver at this state, E²/(4R0) (matched load, cell
        limits ignored) [W]; infinite for R0 = 0.
    reason : str or ndarray of str
        ``"ok"`` or why the point is infeasible or outside the limits (first violated in the
        order: infeasible, voltage, current).
    """

    current_a: float | np.ndarray
    terminal_v: float | np.ndarray
    cell_v: float | np.ndarray
    power_w: float | np.ndarray
    feasible: bool | np.ndarray
    within_limits: bool | np.ndarray
    max_power_w: float | np.ndarray
    reason: str | np.ndarray


def _limit_reason_scalar(pack: Pack, current: float, cell_v: float) -> str:
    cell = pack.cell
    if cell_v < cell.v_min:
        return REASON_V_MIN
    if cell_v > cell.v_max:
        return REASON_V_MAX
    if current > pack.max_discharge_current_a:
        return REASON_I_DISCHARGE
    if -current > pack.max_charge_current_a:
        return REASON_I_CHARGE
    return REASON_OK


def _limit_reason_array(
    pack: Pack, feasible: np.ndarray, no_emf: np.ndarray, current: np.ndarray, cell_v: np.ndarray
) -> np.ndarray:
    cell = pack.cell
    conds = [
        no_emf,
        ~feasible,
        cell_v < cell.v_min,
        cell_v > cell.v_max,
        current > pack.max_discharge_current_a,
        -current > pack.max_charge_current_a,
    ]
    choices = [
        REASON_NO_EMF,
        REASON_INFEASIBLE,
        REASON_V_MIN,
        REASON_V_MAX,
        REASON_I_DISCHARGE,
        REASON_I_CHARGE,
    ]
    return np.select(conds, choices, default=REASON_OK)


def _state_scalar(pack: Pack, soc: float, temp_c: float) -> tuple[float, float]:
    """(OCV [V], cell-string R0 [Ω] without busbars) for scalar inputs."""
    j, w = pack._seg(soc)
    return _lerp(pack._ocv_l, j, w), _lerp(pack._r0_l, j, w) * pack._arrhenius(temp_c)


def _state_array(pack: Pack, soc: ArrayLike, temp_c: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(np.asarray(temp_c, dtype=float))
    xs = pack.cell._soc_arr
    return np.interp(s, xs, pack._ocv_a), np.interp(s, xs, pack._r0_a) * f


def solve_current_for_power(
    pack: Pack, soc: ArrayLike, v_rc_total: ArrayLike, temp_c: ArrayLike, power_w: ArrayLike
) -> PackOperatingPoint:
    """Current that delivers a demanded terminal power (vectorised over all inputs).

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    v_rc_total : float or array
        Sum of the pack RC-pair voltages Σ V_k [V] (positive after discharging).
    temp_c : float or array
        Cell temperature [°C].
    power_w : float or array
        Demanded power at the pack terminals [W]; positive discharges, negative charges.

    Returns
    -------
    PackOperatingPoint
        Current, voltages, feasibility, the power maximum and a reason string.

    Notes
    -----
    With E = OCV − Σ V_k and R = R0 (cells at temperature plus busbars), P = I·(E − I·R) gives
    R·I² − E·I + P = 0. The physical root is the smaller-current one,
    I = (E − √(E² − 4RP))/(2R), evaluated in the cancellation-free form
    I = 2P/(E + √(E² − 4RP)), which also holds for R = 0 (I = P/E) and for charging (P < 0).
    If E² < 4RP the demand exceeds the power maximum E²/(4R) reached at I = E/(2R); the point
    is then reported at that maximum with ``feasible`` false. Feasible points are further checked
    against the cell voltage window (cell voltage = (E − I·R_cells)/n_s) and the continuous
    current limits.

    References
    ----------
    Plett (2015), ch. 2 (equivalent circuit); the quadratic in the cancellation-free form is
    standard numerical practice (Press et al. 2007, Numerical Recipes, 3rd ed., §5.6).
    """
    rx = pack.extra_series_resistance_ohm
    if _is_scalar(soc) and _is_scalar(v_rc_total) and _is_scalar(temp_c) and _is_scalar(power_w):
        ocv, r_cells = _state_scalar(pack, soc, temp_c)
        e = ocv - v_rc_total
        r = r_cells + rx
        if e <= 0.0:
            return PackOperatingPoint(
                0.0, e, (e) * pack._inv_ns, 0.0, power_w == 0.0, False, 0.0, REASON_NO_EMF
            )
        p = float(power_w)
        max_p = e * e / (4.0 * r) if r > 0.0 else math.inf
        disc = e * e - 4.0 * r * p
        if disc < 0.0:
            i = e / (2.0 * r)
            v = e - i * r
            return PackOperatingPoint(
                i,
                v,
                (e - i * r_cells) * pack._inv_ns,
                i * v,
                False,
                False,
                max_p,
                REASON_INFEASIBLE,
            )
        i = 2.0 * p / (e + math.sqrt(disc))
        v = e - i * r
        cell_v = (e - i * r_cells) * pack._inv_ns
        reason = _limit_reason_scalar(pack, i, cell_v)
        return PackOperatingPoint(i, v, cell_v, i * v, True, reason == REASON_OK, max_p, reason)

    ocv, r_cells = _state_array(pack, soc, temp_c)
    e = ocv - np.asarray(v_rc_total, dtype=float)
    p = np.asarray(power_w, dtype=float)
    e, r_cells, p = np.broadcast_arrays(e, r_cells, p)
    r = r_cells + rx
    no_emf = e <= 0.0
    disc = e * e - 4.0 * r * p
    feasible = (disc >= 0.0) & ~no_emf
    with np.errstate(divide="ignore", invalid="ignore"):
        i_root = np.where(p == 0.0, 0.0, 2.0 * p / (e + np.sqrt(np.maximum(disc, 0.0))))
        i_peak = e / (2.0 * r)
        max_p = np.where(r > 0.0, e * e / (4.0 * r), np.inf)
    current = np.where(feasible, i_root, np.where(no_emf, 0.0, i_peak))
    max_p = np.where(no_emf, 0.0, max_p)
    v = e - current * r
    cell_v = (e - current * r_cells) * pack._inv_ns
    reason = _limit_reason_array(pack, feasible, no_emf, current, cell_v)
    return PackOperatingPoint(
        current,
        v,
        cell_v,
        current * v,
        feasible | (no_emf & (p == 0.0)),
        reason == REASON_OK,
        max_p,
        reason,
    )


def solve_terminal_for_current(
    pack: Pack, soc: ArrayLike, v_rc_total: ArrayLike, temp_c: ArrayLike, current_a: ArrayLike
) -> PackOperatingPoint:
    """Terminal voltage and power for an imposed pack current (vectorised).

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    v_rc_total : float or array
        Sum of the pack RC-pair voltages Σ V_k [V].
    temp_c : float or array
        Cell temperature [°C].
    current_a : float or array
        Pack current [A], positive on discharge.

    Returns
    -------
    PackOperatingPoint
        ``feasible`` is always true (any current can be imposed on the circuit); the limits are
        checked as in :func:`solve_current_for_power`.

    Notes
    -----
    V_term = OCV − Σ V_k − I·(R0_cells(T) + R_extra); cell voltage = (OCV − Σ V_k − I·R0_cells)/n_s.

    References
    ----------
    Plett (2015), ch. 2.
    """
    rx = pack.extra_series_resistance_ohm
    if _is_scalar(soc) and _is_scalar(v_rc_total) and _is_scalar(temp_c) and _is_scalar(current_a):
        ocv, r_cells = _state_scalar(pack, soc, temp_c)
        e = ocv - v_rc_total
        r = r_cells + rx
        i = float(current_a)
        v = e - i * r
        cell_v = (e - i * r_cells) * pack._inv_ns
        max_p = (e * e / (4.0 * r) if r > 0.0 else math.inf) if e > 0.0 else 0.0
        reason = _limit_reason_scalar(pack, i, cell_v)
        return PackOperatingPoint(i, v, cell_v, i * v, True, reason == REASON_OK, max_p, reason)

    ocv, r_cells = _state_array(pack, soc, temp_c)
    e = ocv - np.asarray(v_rc_total, dtype=float)
    i = np.asarray(current_a, dtype=float)
    e, r_cells, i = np.broadcast_arrays(e, r_cells, i)
    r = r_cells + rx
    v = e - i * r
    cell_v = (e - i * r_cells) * pack._inv_ns
    with np.errstate(divide="ignore", invalid="ignore"):
        max_p = np.where(e <= 0.0, 0.0, np.where(r > 0.0, e * e / (4.0 * r), np.inf))
    ones = np.ones(e.shape, dtype=bool)
    reason = _limit_reason_array(pack, ones, ~ones, i, cell_v)
    return PackOperatingPoint(i.copy(), v, cell_v, i * v, ones, reason == REASON_OK, max_p, reason)


def max_power_at_min_voltage_w(
    pack: Pack, soc: ArrayLike, v_rc_total: ArrayLike, temp_c: ArrayLike
) -> float | np.ndarray:
    """Greatest terminal power before a cell reaches v_min or a current limit (vectorised).

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    v_rc_total : float or array
        Sum of the pack RC-pair voltages Σ V_k [V].
    temp_c : float or array
        Cell temperature [°C].

    Returns
    -------
    float or ndarray
        Available discharge power at the pack terminals [W], ≥ 0.

    Notes
    -----
    I_lim = (E − n_s·v_min)/R0_cells, limited further by the continuous discharge current and by
    the power-maximum current E/(2R0); P = I·(E − I·R0). Without busbar resistance and with the
    voltage limit binding, P = I_lim·n_s·v_min.

    References
    ----------
    Plett (2015), ch. 2; the same bound underlies the HPPC available-power figure (common
    practice).
    """
    rx = pack.extra_series_resistance_ohm
    if _is_scalar(soc) and _is_scalar(v_rc_total) and _is_scalar(temp_c):
        ocv, r_cells = _state_scalar(pack, soc, temp_c)
        e = ocv - v_rc_total
        r = r_cells + rx
        head = e - pack.v_min
        if head <= 0.0:
            return 0.0
        i = pack.max_discharge_current_a
        if r_cells > 0.0:
            i = min(i, head / r_cells)
        if r > 0.0:
            i = min(i, e / (2.0 * r))
        return i * (e - i * r)

    ocv, r_cells = _state_array(pack, soc, temp_c)
    e = ocv - np.asarray(v_rc_total, dtype=float)
    e, r_cells = np.broadcast_arrays(e, r_cells)
    r = r_cells + rx
    head = e - pack.v_min
    with np.errstate(divide="ignore", invalid="ignore"):
        i_v = np.where(r_cells > 0.0, head / r_cells, np.inf)
        i_p = np.where(r > 0.0, e / (2.0 * r), np.inf)
    i = np.minimum(np.minimum(i_v, i_p), pack.max_discharge_current_a)
    i = np.where(head > 0.0, i, 0.0)
    return i * (e - i * r)


# --------------------------------------------------------------------------------------------
# State derivatives
# --------------------------------------------------------------------------------------------


def dsoc_dt(pack: Pack, current_a: ArrayLike) -> float | np.ndarray:
    """Rate of change of the state of charge.

    Parameters
    ----------
    pack : Pack
        The pack.
    current_a : float or array
        Pack current [A], positive on discharge.

    Returns
    -------
    float or ndarray
        dSOC/dt [1/s].

    Notes
    -----
    dSOC/dt = −I/(3600·Q) on discharge and −η_c·I/(3600·Q) on charge (I < 0), Q in A·h.

    References
    ----------
    Plett (2015), ch. 2 (coulomb counting with coulombic efficiency).
    """
    if _is_scalar(current_a):
        if current_a >= 0.0:
            return -current_a * pack._inv_3600q
        return -pack._eta_c * current_a * pack._inv_3600q
    i = np.asarray(current_a, dtype=float)
    return -np.where(i >= 0.0, i, pack._eta_c * i) * pack._inv_3600q


def _v_list(pack: Pack, v_rc: object) -> Sequence:
    if _is_scalar(v_rc):
        if pack.n_rc != 1:
            raise ModelRangeError(
                "v_rc", v_rc, f"a sequence of {pack.n_rc} RC voltages", _MODEL_ECM
            )
        return (v_rc,)
    if len(v_rc) != pack.n_rc:  # type: ignore[arg-type]
        raise ModelRangeError(
            "v_rc (length)",
            len(v_rc),  # type: ignore[arg-type]
            f"{pack.n_rc} RC voltages",
            _MODEL_ECM,
        )
    return v_rc  # type: ignore[return-value]


def drc_dt(
    pack: Pack, soc: ArrayLike, temp_c: ArrayLike, current_a: ArrayLike, v_rc: object
) -> tuple:
    """Rates of change of the RC-pair voltages.

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float or array
        State of charge [-].
    temp_c : float or array
        Cell temperature [°C].
    current_a : float or array
        Pack current [A], positive on discharge.
    v_rc : float or sequence
        Pack voltage of each RC pair V_k [V] (a bare float is accepted for one pair); the items
        may be arrays.

    Returns
    -------
    tuple
        dV_k/dt [V/s], one item per RC pair.

    Notes
    -----
    dV_k/dt = I/C_k − V_k/(R_k·C_k). For constant I, R_k, C_k from V_k(0) = 0:
    V_k(t) = I·R_k·(1 − exp(−t/(R_k·C_k))).

    References
    ----------
    Plett (2015), ch. 2.
    """
    vs = _v_list(pack, v_rc)
    if _is_scalar(soc) and _is_scalar(temp_c) and _is_scalar(current_a):
        j, w = pack._seg(soc)
        f = pack._arrhenius(temp_c)
        out = []
        for (rs, cs), vk in zip(pack._rc_l, vs, strict=True):
            rk = _lerp(rs, j, w) * f
            out.append((current_a - vk / rk) / _lerp(cs, j, w))
        return tuple(out)
    pairs = rc_params(pack, soc, temp_c)
    i = np.asarray(current_a, dtype=float)
    return tuple(
        (i - np.asarray(vk, dtype=float) / rk) / ck for (rk, ck), vk in zip(pairs, vs, strict=True)
    )


def heat_generation_w(
    pack: Pack,
    current_a: ArrayLike,
    soc: ArrayLike,
    temp_c: ArrayLike,
    v_rc: object,
    include_busbars: bool = True,
) -> float | np.ndarray:
    """Heat generated in the pack.

    Parameters
    ----------
    pack : Pack
        The pack.
    current_a : float or array
        Pack current [A], positive on discharge.
    soc : float or array
        State of charge [-].
    temp_c : float or array
        Cell temperature [°C].
    v_rc : float or sequence
        Pack voltage of each RC pair V_k [V].
    include_busbars : bool
        Add the Joule heat I²·R_extra of the busbar resistance (default). Set false for the heat
        that warms the cells only.

    Returns
    -------
    float or ndarray
        Heat generation rate [W] (may be negative when reversible cooling dominates).

    Notes
    -----
    Q = I²·R0_cells(T) [+ I²·R_extra] + Σ V_k²/R_k(T) − I·T·∂OCV/∂T, with T in kelvin and
    ∂OCV/∂T = n_s·(cell entropic coefficient). The first two terms are the irreversible heat
    I·(OCV − V_term) of the Bernardi balance; the last is the reversible (entropic) heat, which
    cools a discharging cell whose OCV rises with temperature.

    References
    ----------
    Bernardi, Pawlikowski & Newman (1985), J. Electrochem. Soc. 132(1), 5–12.
    """
    vs = _v_list(pack, v_rc)
    rx = pack.extra_series_resistance_ohm if include_busbars else 0.0
    if _is_scalar(soc) and _is_scalar(temp_c) and _is_scalar(current_a):
        j, w = pack._seg(soc)
        f = pack._arrhenius(temp_c)
        q = current_a * current_a * (_lerp(pack._r0_l, j, w) * f + rx)
        for (rs, _cs), vk in zip(pack._rc_l, vs, strict=True):
            q += vk * vk / (_lerp(rs, j, w) * f)
        if pack._dudt != 0.0:
            q -= current_a * (temp_c + KELVIN_OFFSET) * pack._dudt
        return q
    i = np.asarray(current_a, dtype=float)
    t = np.asarray(temp_c, dtype=float)
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(t)
    xs = pack.cell._soc_arr
    q = i * i * (np.interp(s, xs, pack._r0_a) * f + rx)
    for (rs, _cs), vk in zip(pack._rc_a, vs, strict=True):
        vk = np.asarray(vk, dtype=float)
        q = q + vk * vk / (np.interp(s, xs, rs) * f)
    if pack._dudt != 0.0:
        q = q - i * (t + KELVIN_OFFSET) * pack._dudt
    return q


def battery_temperature_rate_k_s(
    pack: Pack, heat_w: ArrayLike, temp_c: ArrayLike, ambient_c: ArrayLike, ua_w_k: ArrayLike
) -> float | np.ndarray:
    """Rate of change of the lumped pack temperature.

    Parameters
    ----------
    pack : Pack
        The pack.
    heat_w : float or array
        Heat generated in the cells [W].
    temp_c : float or array
        Pack (cell) temperature [°C].
    ambient_c : float or array
        Temperature of the surroundings or coolant [°C].
    ua_w_k : float or array
        Overall heat-transfer conductance from the cells to the surroundings [W/K], ≥ 0.

    Returns
    -------
    float or ndarray
        dT/dt [K/s].

    Notes
    -----
    (n_cells·m·c_p)·dT/dt = Q − UA·(T − T_amb): one lumped thermal node, uniform temperature.

    References
    ----------
    Bernardi, Pawlikowski & Newman (1985) (lumped energy balance).
    """
    if _is_scalar(ua_w_k):
        if ua_w_k < 0.0:
            raise ModelRangeError("ua_w_k", ua_w_k, "≥ 0 W/K", _MODEL_ECM)
    elif np.any(np.asarray(ua_w_k) < 0.0):
        raise ModelRangeError("ua_w_k", ua_w_k, "≥ 0 W/K", _MODEL_ECM)
    if _is_scalar(heat_w) and _is_scalar(temp_c) and _is_scalar(ambient_c):
        return (heat_w - ua_w_k * (temp_c - ambient_c)) / pack.thermal_mass_j_k
    q = np.asarray(heat_w, dtype=float)
    dt = np.asarray(temp_c, dtype=float) - np.asarray(ambient_c, dtype=float)
    return (q - np.asarray(ua_w_k, dtype=float) * dt) / pack.thermal_mass_j_k


# --------------------------------------------------------------------------------------------
# Reference function
# --------------------------------------------------------------------------------------------


def peukert_runtime_h(
    capacity_ah: ArrayLike, rated_hours: ArrayLike, current_a: ArrayLike, k: ArrayLike
) -> float | np.ndarray:
    """Runtime at constant current from Peukert's law.

    Parameters
    ----------
    capacity_ah : float or array
        Rated capacity C at the rated discharge time [A·h], > 0.
    rated_hours : float or array
        Rated discharge time H [h], > 0.
    current_a : float or array
        Constant discharge current I [A], > 0.
    k : float or array
        Peukert exponent [-], ≥ 1 (lead-acid 1.1–1.3, lithium-ion about 1.02–1.05).

    Returns
    -------
    float or ndarray
        Runtime t [h].

    Notes
    -----
    t = H·(C/(I·H))^k; at the rated current I = C/H, t = H for every k.

    References
    ----------
    Peukert (1897), Elektrotechnische Zeitschrift 18, 287–288.
    """
    c = np.asarray(capacity_ah, dtype=float)
    h = np.asarray(rated_hours, dtype=float)
    i = np.asarray(current_a, dtype=float)
    kk = np.asarray(k, dtype=float)
    for name, arr, allowed in (
        ("capacity_ah", c, "> 0 A·h"),
        ("rated_hours", h, "> 0 h"),
        ("current_a", i, "> 0 A"),
    ):
        if np.any(~(arr > 0.0)):
            raise ModelRangeError(name, arr.tolist(), allowed, "Peukert's law")
    if np.any(~(kk >= 1.0)):
        raise ModelRangeError("k", kk.tolist(), "≥ 1", "Peukert's law")
    t = h * (c / (i * h)) ** kk
    return float(t) if t.ndim == 0 else t
