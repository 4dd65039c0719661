"""Algebraic solves of the pack circuit at one instant: the current for a demanded power, the
terminal voltage for an imposed current, and the greatest power within the cell limits.

Every function takes scalars (plain-float fast path, for the ODE right-hand side) or arrays
(numpy path, for sweeps); both paths sit side by side in the same function.

References
----------
.. [1] Plett, G. L. (2015). Battery Management Systems, Volume I: Battery Modeling. Artech House,
   Boston. Chapter 2 (equivalent-circuit cell models).
.. [2] Press, W. H., Teukolsky, S. A., Vetterling, W. T. & Flannery, B. P. (2007). Numerical
   Recipes, 3rd ed., Cambridge University Press, §5.6 (quadratic roots without cancellation).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.battery.circuit import Pack, _state_array, _state_scalar
from sim.physics.battery.parameters import _SCALAR
from sim.physics.errors import ModelRangeError

__all__ = [
    "REASON_INFEASIBLE",
    "REASON_I_CHARGE",
    "REASON_I_DISCHARGE",
    "REASON_NO_EMF",
    "REASON_OK",
    "REASON_V_MAX",
    "REASON_V_MIN",
    "PackOperatingPoint",
    "max_power_at_min_voltage_w",
    "pack_charge_limit_w",
    "pack_power_limit_w",
    "solve_current_for_power",
    "solve_terminal_for_current",
]

REASON_OK = "ok"
REASON_INFEASIBLE = "demanded power exceeds what the pack can deliver"
REASON_NO_EMF = "no driving voltage: open-circuit voltage minus polarisation is not positive"
REASON_V_MIN = "cell voltage below v_min"
REASON_V_MAX = "cell voltage above v_max"
REASON_I_DISCHARGE = "discharge current above the continuous limit"
REASON_I_CHARGE = "charge current above the continuous limit"


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
    if (
        isinstance(soc, _SCALAR)
        and isinstance(v_rc_total, _SCALAR)
        and isinstance(temp_c, _SCALAR)
        and isinstance(power_w, _SCALAR)
    ):
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
    if (
        isinstance(soc, _SCALAR)
        and isinstance(v_rc_total, _SCALAR)
        and isinstance(temp_c, _SCALAR)
        and isinstance(current_a, _SCALAR)
    ):
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


def pack_power_limit_w(
    pack: Pack,
    soc: ArrayLike,
    v_rc_total: ArrayLike,
    temp_c: ArrayLike,
    *,
    undervoltage_margin_v: float = 0.0,
) -> float | np.ndarray:
    """Greatest discharge power at the pack terminals that keeps every cell at or above its
    minimum voltage plus a margin and the pack current within its rating (vectorised).

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
    undervoltage_margin_v : float
        Margin above the cell minimum voltage that a drive keeps [V per cell], ≥ 0; the cell
        floor is v_min + margin.

    Returns
    -------
    float or ndarray
        Available discharge power at the pack terminals [W], ≥ 0 (0 when the cells are already
        at or below the floor).

    Raises
    ------
    ModelRangeError
        If the margin is negative or not a number, or SOC or temperature is out of range.

    Notes
    -----
    With E = OCV − Σ V_k, R0_cells the cell-string resistance at temperature and
    R = R0_cells + R_extra (busbars), the cell voltage falls linearly with the pack current,
    v_cell(I) = (E − I·R0_cells)/n_s. The current is the smallest of
    I_v = (v_cell(0) − v_floor)/(R0_cells/n_s), the continuous discharge rating I_max and the
    power-maximum current E/(2R) (beyond which the power falls); P = I·(E − I·R). Without busbar
    resistance and with the voltage limit binding, P = I_v·n_s·v_floor.

    The scalar path recovers R0_cells/n_s and R as the drops between the terminal evaluations
    at 0 A and at 1 A, in exactly the floating-point operations the engine used before this
    function existed, so that its logs are unchanged; the array path does the same
    element-wise. With R0_cells = 0 the cell voltage does not depend on the current: the
    voltage limit then either never binds (cells above the floor) or allows nothing.

    References
    ----------
    Plett (2015), Battery Management Systems Vol. I, ch. 2 (equivalent circuit); the same bound
    underlies the HPPC available-power figure (common practice).
    """
    if not undervoltage_margin_v >= 0.0:
        raise ModelRangeError(
            "undervoltage_margin_v", undervoltage_margin_v, "≥ 0 V", "pack power limit"
        )
    rx = pack.extra_series_resistance_ohm
    inv_ns = pack._inv_ns
    floor = pack.cell.v_min + undervoltage_margin_v
    if isinstance(soc, _SCALAR) and isinstance(v_rc_total, _SCALAR) and isinstance(temp_c, _SCALAR):
        ocv, r_cells = _state_scalar(pack, soc, temp_c)
        e = ocv - v_rc_total  # terminal voltage at 0 A
        cell0 = e * inv_ns  # cell voltage at 0 A
        cell_drop = cell0 - (e - r_cells) * inv_ns  # cell volts lost per pack ampere
        r_total = e - (e - (r_cells + rx))  # pack ohms incl. busbars
        if cell_drop > 0:
            i_lim = (cell0 - floor) / cell_drop
        else:
            i_lim = 0.0 if cell0 <= floor else math.inf
        i_lim = min(i_lim, pack.max_discharge_current_a)
        if r_total > 0:
            i_lim = min(i_lim, e / (2.0 * r_total))  # beyond the power maximum power falls
        if i_lim <= 0:
            return 0.0
        return i_lim * (e - i_lim * r_total)

    ocv, r_cells = _state_array(pack, soc, temp_c)
    e = ocv - np.asarray(v_rc_total, dtype=float)
    e, r_cells = np.broadcast_arrays(e, r_cells)
    cell0 = e * inv_ns
    cell_drop = cell0 - (e - r_cells) * inv_ns
    r_total = e - (e - (r_cells + rx))
    with np.errstate(divide="ignore", invalid="ignore"):
        i_v = np.where(
            cell_drop > 0, (cell0 - floor) / cell_drop, np.where(cell0 <= floor, 0.0, np.inf)
        )
        i_p = np.where(r_total > 0, e / (2.0 * r_total), np.inf)
    i_lim = np.minimum(np.minimum(i_v, pack.max_discharge_current_a), i_p)
    return np.where(i_lim > 0, i_lim * (e - i_lim * r_total), 0.0)


def pack_charge_limit_w(
    pack: Pack,
    soc: float,
    v_rc_total: float,
    temp_c: float,
    *,
    overvoltage_margin_v: float = 0.0,
) -> float:
    """Greatest charge power the pack accepts at its terminals while every cell stays at or below
    its maximum voltage less a margin and the charge current within its rating (scalar).

    Parameters
    ----------
    pack : Pack
        The pack.
    soc : float
        State of charge [-].
    v_rc_total : float
        Sum of the pack RC-pair voltages Σ V_k [V] (negative after charging).
    temp_c : float
        Cell temperature [°C].
    overvoltage_margin_v : float
        Margin below the cell maximum voltage that a drive keeps [V per cell], ≥ 0; the cell
        ceiling is v_max − margin.

    Returns
    -------
    float
        Charge power the pack terminals may absorb [W], ≥ 0 (0 when the cells are already at
        or above the ceiling).

    Raises
    ------
    ModelRangeError
        If the margin is negative or not a number, or SOC or temperature is out of range.

    Notes
    -----
    The mirror of :func:`pack_power_limit_w`. With E = OCV − Σ V_k, R0_cells the cell-string
    resistance at temperature, R = R0_cells + R_extra and the charge current c = −I > 0, the
    cell voltage rises linearly, v_cell = (E + c·R0_cells)/n_s. The charge current is the
    smaller of c_v = (n_s·v_ceiling − E)/R0_cells and the continuous charge rating; the
    terminal power absorbed is P = c·(E + c·R) (the busbar drop adds to what the charger must
    supply). With R0_cells = 0 only the current rating binds (cells below the ceiling) or
    nothing may be charged (at or above it).

    References
    ----------
    Plett (2015), Battery Management Systems Vol. I, ch. 2 (equivalent circuit); constant-
    current/constant-voltage charging to the cell's maximum voltage is common practice.
    """
    if not overvoltage_margin_v >= 0.0:
        raise ModelRangeError(
            "overvoltage_margin_v", overvoltage_margin_v, "≥ 0 V", "pack charge limit"
        )
    ocv, r_cells = _state_scalar(pack, float(soc), float(temp_c))
    e = ocv - float(v_rc_total)
    ceiling = (pack.cell.v_max - overvoltage_margin_v) * pack.n_series
    if e >= ceiling:
        return 0.0
    c = math.inf if r_cells <= 0.0 else (ceiling - e) / r_cells
    c = min(c, pack.max_charge_current_a)
    return c * (e + c * (r_cells + pack.extra_series_resistance_ohm))


max_power_at_min_voltage_w = pack_power_limit_w
"""Former name of :func:`pack_power_limit_w` (margin 0): the same function."""
