"""Cell parameters of the equivalent-circuit model, the accepted ranges and the input checks.

A :class:`CellParameters` is a cell tabulated over state of charge: open-circuit voltage, ohmic
resistance and one or two RC pairs, plus limits, mass and heat capacity. The named parameter sets
live one per module in :mod:`sim.physics.battery.cells`.

References
----------
.. [1] Plett, G. L. (2015). Battery Management Systems, Volume I: Battery Modeling. Artech House,
   Boston. Chapter 2 (equivalent-circuit cell models).
.. [2] Arrhenius, S. (1889). Über die Reaktionsgeschwindigkeit bei der Inversion von Rohrzucker
   durch Säuren. Zeitschrift für physikalische Chemie 4, 226–248.
.. [3] Tiesinga, E., Mohr, P. J., Newell, D. B. & Taylor, B. N. (2021). CODATA recommended values
   of the fundamental physical constants: 2018. Reviews of Modern Physics 93, 025010 (molar gas
   constant).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from itertools import pairwise

import numpy as np

from sim.physics.errors import ModelRangeError

__all__ = [
    "DEFAULT_ACTIVATION_ENERGY_J_MOL",
    "GAS_CONSTANT_J_MOL_K",
    "KELVIN_OFFSET",
    "SOC_RANGE",
    "TEMPERATURE_RANGE_C",
    "CellParameters",
]

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

_MODEL_CELL = "battery cell parameters"
_MODEL_PACK = "battery pack"
_MODEL_ECM = "battery equivalent circuit"


_SCALAR = (float, int)
"""The types of the scalar fast path: Python and numpy floats, Python ints (tested with
``isinstance(x, _SCALAR)`` in line: the functions test their inputs on every call)."""


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
