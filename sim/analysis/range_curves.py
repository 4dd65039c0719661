"""Steady range curves: speed, power, endurance and range of a vessel holding a speed.

At each speed through water thrust equals resistance (:func:`sim.engine.steady.steady_at_speed`)
and the pack is discharged at that steady pack power to its cut-off
(:func:`sim.analysis.endurance.pack_endurance`); range is endurance × speed over ground. The
best-range and best-endurance speeds are picked from the curve.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import minimize_scalar

from sim.analysis.endurance import DEFAULT_TEMP_MAX_C, PackEndurance, pack_endurance
from sim.engine.model import Control
from sim.engine.plant import Plant
from sim.engine.steady import SteadyError, SteadyPoint, steady_at_speed, steady_speed_for
from sim.physics.errors import ModelRangeError

__all__ = [
    "RangeCurve",
    "RangePoint",
    "default_speed_grid",
    "range_at_speed",
    "range_curve",
    "range_speed_grid",
]


@dataclass(frozen=True)
class RangePoint:
    """Steady running at one speed through water until the pack's cut-off.

    Attributes
    ----------
    speed_m_s : speed through water [m/s]
    ground_speed_m_s : speed over ground (speed plus the water current) [m/s]
    steady : the steady operating point (None when the speed cannot be held)
    endurance : the pack discharge at the steady pack power (None when not held)
    range_m : distance over ground to cut-off [m] (0 when not held)
    reason : why the speed cannot be held ("" when it can)
    """

    speed_m_s: float
    ground_speed_m_s: float
    steady: SteadyPoint | None
    endurance: PackEndurance | None
    range_m: float
    reason: str = ""

    @property
    def feasible(self) -> bool:
        return self.steady is not None and self.endurance is not None and self.range_m > 0

    @property
    def endurance_s(self) -> float:
        return self.endurance.time_s if self.endurance is not None else 0.0


def range_at_speed(
    plant: Plant,
    speed_m_s: float,
    *,
    soc: float = 1.0,
    soc_min: float = 0.0,
    v_rc=None,
    temp_c: float | None = None,
    hotel_w: float | None = None,
    temp_max_c: float = DEFAULT_TEMP_MAX_C,
) -> RangePoint:
    """Range and endurance when holding one speed through water until cut-off.

    Parameters
    ----------
    plant : Plant
    speed_m_s : float
        Speed through water [m/s].
    soc, soc_min : float
        Starting and cut-off state of charge [-].
    v_rc, temp_c
        Starting RC voltages [V] and battery temperature [°C] (see :func:`pack_endurance`).
    hotel_w : float, optional
        Hotel load [W]; default the vessel's (cryocooler always added).
    temp_max_c : float
        Battery temperature cut-off [°C].

    Returns
    -------
    RangePoint

    Notes
    -----
    P_pack(V) from thrust = resistance (:func:`steady_at_speed`), endurance t(V) from
    :func:`pack_endurance` at that power, range = t(V)·(V + V_current) over ground.
    """
    v = float(speed_m_s)
    ground = v + plant.water_current_m_s
    try:
        sp = steady_at_speed(plant, v, soc=soc, hotel_w=hotel_w)
        end = pack_endurance(
            plant,
            sp.pack_power_w,
            soc=soc,
            v_rc=v_rc,
            temp_c=temp_c,
            soc_min=soc_min,
            temp_max_c=temp_max_c,
        )
    except (SteadyError, ModelRangeError) as exc:
        return RangePoint(v, ground, None, None, 0.0, str(exc))
    if not math.isfinite(end.time_s):
        return RangePoint(v, ground, sp, end, 0.0, "no pack power drawn")
    rng = max(0.0, end.time_s * ground)
    reason = "" if end.time_s > 0 else f"no endurance: {end.cutoff}"
    return RangePoint(v, ground, sp, end, rng, reason)


@dataclass(frozen=True)
class RangeCurve:
    """Steady speed–power–range–endurance curves of one vessel in one body of water.

    Arrays run over ``speed_m_s``; where a speed cannot be held the values are NaN (range 0).

    Attributes
    ----------
    vessel : vessel name
    salinity : practical salinity of the water [-]
    water_temperature_c : water temperature [°C]
    conductivity_s_m : water conductivity [S/m]
    water_current_m_s : along-track current [m/s]
    start_soc, soc_min : starting and cut-off state of charge [-]
    points : one RangePoint per grid speed
    best_range : the speed of greatest range (refined between grid points), or None
    best_endurance : the speed of greatest endurance on the grid, or None
    """

    vessel: str
    salinity: float
    water_temperature_c: float
    conductivity_s_m: float
    water_current_m_s: float
    start_soc: float
    soc_min: float
    points: tuple[RangePoint, ...]
    best_range: RangePoint | None
    best_endurance: RangePoint | None

    def _arr(self, fn) -> np.ndarray:
        return np.array([fn(p) if p.feasible else np.nan for p in self.points], dtype=float)

    @property
    def speed_m_s(self) -> np.ndarray:
        """Speeds through water [m/s]."""
        return np.array([p.speed_m_s for p in self.points])

    @property
    def pack_power_w(self) -> np.ndarray:
        """Steady pack terminal power [W]."""
        return self._arr(lambda p: p.steady.pack_power_w)

    @property
    def thruster_power_w(self) -> np.ndarray:
        """Steady electrical power into all thrusters [W]."""
        return self._arr(lambda p: p.steady.thruster_power_w)

    @property
    def endurance_s(self) -> np.ndarray:
        """Endurance to cut-off [s]."""
        return self._arr(lambda p: p.endurance.time_s)

    @property
    def range_m(self) -> np.ndarray:
        """Distance over ground to cut-off [m]."""
        return self._arr(lambda p: p.range_m)

    @property
    def energy_per_distance_j_m(self) -> np.ndarray:
        """Pack energy per distance over ground [J/m]."""
        return self._arr(lambda p: p.steady.pack_power_w / p.ground_speed_m_s)

    @property
    def overall_efficiency(self) -> np.ndarray:
        """Thrust power / thruster electrical power [-]."""
        return self._arr(lambda p: p.steady.overall_efficiency)

    @property
    def label(self) -> str:
        return f"SP {self.salinity:g}, {self.water_temperature_c:g} °C"


def default_speed_grid(plant: Plant, n: int = 24, *, soc: float = 1.0) -> np.ndarray:
    """Speeds through water [m/s] from 1/40 of the top speed to the top speed, geometric.

    The top speed is the steady speed at the drive's maximum voltage (its current limit and the
    pack's power limit at ``soc`` included). Geometric spacing resolves the low speeds where the
    best range of a low-field MHD craft usually lies.
    """
    top = steady_speed_for(
        plant,
        Control(mode="voltage", setpoint=plant.drive_max_voltage_v, hotel_w=plant.hotel_w),
        soc=soc,
    )
    if not top > 0:
        raise SteadyError("the vessel makes no headway at the drive's maximum voltage")
    return np.geomspace(top / 40.0, top * 0.999, int(n))


def range_speed_grid(plant: Plant, n: int = 24, *, soc: float = 1.0) -> np.ndarray:
    """Speeds through water [m/s] worth a range curve: from about a quarter of the best-range
    speed up to the top speed, geometric.

    The best-range speed is first estimated from the craft's own steady curve (least pack
    energy per distance over ground, P/(V + V_current), on a coarse grid of
    :func:`default_speed_grid`); the grid then starts at 25 % of it (never below 1/40 of the
    top speed), so it does not spend its points on crawling speeds of days of endurance.
    """
    coarse = default_speed_grid(plant, 12, soc=soc)
    top = float(coarse[-1]) / 0.999
    ground = coarse + plant.water_current_m_s
    epd = np.full(coarse.shape, np.inf)
    for i, v in enumerate(coarse):
        if not ground[i] > 0:
            continue
        try:
            sp = steady_at_speed(plant, float(v), soc=soc)
        except (SteadyError, ModelRangeError):
            continue
        if sp.feasible and sp.pack_power_w > 0:
            epd[i] = sp.pack_power_w / ground[i]
    low = top / 40.0
    if np.isfinite(epd).any():
        low = max(low, 0.25 * float(coarse[int(np.argmin(epd))]))
    return np.geomspace(low, top * 0.999, int(n))


def range_curve(
    plant: Plant,
    speeds_m_s=None,
    *,
    soc: float = 1.0,
    soc_min: float = 0.0,
    v_rc=None,
    temp_c: float | None = None,
    hotel_w: float | None = None,
    temp_max_c: float = DEFAULT_TEMP_MAX_C,
    refine: bool = True,
    points: int = 24,
) -> RangeCurve:
    """Steady range and endurance over a grid of speeds, with the best-range speed.

    Parameters
    ----------
    plant : Plant
    speeds_m_s : array, optional
        Speeds through water [m/s]; default :func:`range_speed_grid` with ``points`` speeds
        (from about a quarter of the best-range speed to the top speed).
    soc, soc_min, v_rc, temp_c, hotel_w, temp_max_c
        As in :func:`range_at_speed`.
    refine : bool
        Refine the best-range speed between the grid points (bounded Brent search).

    Returns
    -------
    RangeCurve

    Notes
    -----
    Best range maximises t(V)·(V + V_current); best endurance maximises t(V). For a hull whose
    power rises with speed the best endurance is at the slowest speed of the grid, so choose
    the grid's lowest speed as the slowest speed worth holding (steerage).
    """
    if speeds_m_s is None:
        speeds_m_s = range_speed_grid(plant, points, soc=soc)
    speeds = np.asarray(speeds_m_s, dtype=float)
    kw = {
        "soc": soc,
        "soc_min": soc_min,
        "v_rc": v_rc,
        "temp_c": temp_c,
        "hotel_w": hotel_w,
        "temp_max_c": temp_max_c,
    }
    pts = [range_at_speed(plant, float(v), **kw) for v in speeds]
    ok = [k for k, p in enumerate(pts) if p.feasible]
    best_r = best_e = None
    if ok:
        k = max(ok, key=lambda j: pts[j].range_m)
        best_r = pts[k]
        if refine and len(speeds) > 1:
            lo = speeds[max(k - 1, 0)]
            hi = speeds[min(k + 1, len(speeds) - 1)]
            res = minimize_scalar(
                lambda v: -range_at_speed(plant, float(v), **kw).range_m,
                bounds=(lo, hi),
                method="bounded",
                options={"xatol": 1e-3 * max(hi, 1e-6)},
            )
            cand = range_at_speed(plant, float(res.x), **kw)
            if cand.feasible and cand.range_m > best_r.range_m:
                best_r = cand
        best_e = pts[max(ok, key=lambda j: pts[j].endurance_s)]
    w = plant.water
    return RangeCurve(
        vessel=plant.name,
        salinity=w.sp,
        water_temperature_c=w.t_c,
        conductivity_s_m=w.sigma_s_m,
        water_current_m_s=plant.water_current_m_s,
        start_soc=float(soc),
        soc_min=float(soc_min),
        points=tuple(pts),
        best_range=best_r,
        best_endurance=best_e,
    )
