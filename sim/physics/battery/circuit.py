"""The pack circuit: a :class:`Pack` of identical Thevenin cells, OCV and resistance lookups
(scalar fast path and numpy path side by side), and the state derivatives of charge and RC
voltages.

Series/parallel scaling from cell to pack: voltages and resistances ×n_s, resistances ÷n_p,
capacitances ×n_p/n_s (so every RC time constant is unchanged), capacity and currents ×n_p.

References
----------
.. [1] Plett, G. L. (2015). Battery Management Systems, Volume I: Battery Modeling. Artech House,
   Boston. Chapter 2 (equivalent-circuit cell models).
.. [2] Arrhenius, S. (1889). Über die Reaktionsgeschwindigkeit bei der Inversion von Rohrzucker
   durch Säuren. Zeitschrift für physikalische Chemie 4, 226–248.
"""

from __future__ import annotations

import math
from bisect import bisect_right
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.battery.parameters import (
    _MODEL_ECM,
    _MODEL_PACK,
    _SCALAR,
    GAS_CONSTANT_J_MOL_K,
    KELVIN_OFFSET,
    SOC_RANGE,
    TEMPERATURE_RANGE_C,
    CellParameters,
    _check_soc_array,
    _check_soc_scalar,
    _check_temp_array,
    _check_temp_scalar,
    _readonly,
)
from sim.physics.errors import ModelRangeError

__all__ = [
    "Pack",
    "drc_dt",
    "dsoc_dt",
    "ocv_v",
    "r0_ohm",
    "rc_params",
    "resistance_temperature_factor",
]


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
    # the last (SOC, segment) and (temperature, Arrhenius factor) of the scalar path: one state
    # asks for them four or five times (current, power limit, heat, RC rates); each entry is a
    # tuple replaced whole, so a reader never sees a key with another key's value
    _memo: list = field(init=False, repr=False, compare=False)

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
        s(self, "_memo", [(math.nan, None), (math.nan, None)])

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
        hit = self._memo[0]
        if hit[0] == soc:
            return hit[1]
        if not SOC_RANGE[0] <= soc <= SOC_RANGE[1]:
            _check_soc_scalar(soc)
        xs = self.cell._soc_list
        if soc <= 0.0:
            out = 0, 0.0
        elif soc >= 1.0:
            out = len(xs) - 2, 1.0
        else:
            j = bisect_right(xs, soc) - 1
            out = j, (soc - xs[j]) * self.cell._inv_dsoc[j]
        self._memo[0] = (soc, out)
        return out

    def _arrhenius(self, temp_c: float) -> float:
        hit = self._memo[1]
        if hit[0] == temp_c:
            return hit[1]
        if not TEMPERATURE_RANGE_C[0] <= temp_c <= TEMPERATURE_RANGE_C[1]:
            _check_temp_scalar(temp_c)
        if self._k_ea == 0.0:
            f = 1.0
        else:
            f = math.exp(self._k_ea * (1.0 / (temp_c + KELVIN_OFFSET) - self._inv_tref))
        self._memo[1] = (temp_c, f)
        return f

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
    if isinstance(temp_c, _SCALAR):
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
    if isinstance(soc, _SCALAR):
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
    if isinstance(soc, _SCALAR) and isinstance(temp_c, _SCALAR):
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
    if isinstance(soc, _SCALAR) and isinstance(temp_c, _SCALAR):
        j, w = pack._seg(soc)
        f = pack._arrhenius(temp_c)
        return tuple((_lerp(rs, j, w) * f, _lerp(cs, j, w)) for rs, cs in pack._rc_l)
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(np.asarray(temp_c, dtype=float))
    xs = pack.cell._soc_arr
    return tuple((np.interp(s, xs, rs) * f, np.interp(s, xs, cs)) for rs, cs in pack._rc_a)


def _state_scalar(pack: Pack, soc: float, temp_c: float) -> tuple[float, float]:
    """(OCV [V], cell-string R0 [Ω] without busbars) for scalar inputs."""
    j, w = pack._seg(soc)
    return _lerp(pack._ocv_l, j, w), _lerp(pack._r0_l, j, w) * pack._arrhenius(temp_c)


def _state_array(pack: Pack, soc: ArrayLike, temp_c: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(np.asarray(temp_c, dtype=float))
    xs = pack.cell._soc_arr
    return np.interp(s, xs, pack._ocv_a), np.interp(s, xs, pack._r0_a) * f


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
    if isinstance(current_a, _SCALAR):
        if current_a >= 0.0:
            return -current_a * pack._inv_3600q
        return -pack._eta_c * current_a * pack._inv_3600q
    i = np.asarray(current_a, dtype=float)
    return -np.where(i >= 0.0, i, pack._eta_c * i) * pack._inv_3600q


def _v_list(pack: Pack, v_rc: object) -> Sequence:
    if isinstance(v_rc, _SCALAR):
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
    if isinstance(soc, _SCALAR) and isinstance(temp_c, _SCALAR) and isinstance(current_a, _SCALAR):
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
