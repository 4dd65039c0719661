"""Range and endurance: how long a pack lasts at a steady demand, and how far the craft gets.

Three questions are answered here, all by integrating the pack's equivalent circuit (state of
charge, RC voltages and lumped battery temperature, :mod:`sim.physics.battery`) at a constant
terminal power until a cut-off, so voltage sag at the demanded power is accounted for, not
just stored energy ÷ power:

* :func:`pack_endurance` — time and energy to cut-off at a constant pack power;
* :func:`range_curve` / :func:`range_at_speed` — steady speed–power–range–endurance curves of a
  vessel (thrust = resistance at each speed, :func:`sim.engine.steady.steady_at_speed`), with the
  best-range and best-endurance speeds;
* :func:`range_from_log` — what a finished or partial run log says about the range left.

The cut-off is the first of: the state of charge reaches its minimum, or the pack can no longer
deliver the demanded power within its limits
(:meth:`sim.engine.model.VesselModel.pack_power_limit_w`: cells at their minimum voltage plus the
drive's under-voltage margin, the pack current rating, the circuit's power maximum). That is the
moment the drive would start to fold back in a time-domain run, so the speed could no longer be
held.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import minimize_scalar

from sim.engine.model import Control, VesselModel
from sim.engine.plant import Plant
from sim.engine.spec import LimitsSpec
from sim.engine.steady import SteadyError, SteadyPoint, steady_at_speed, steady_speed_for
from sim.io.log import RunLog, read_log
from sim.io.provenance import plant_from_provenance
from sim.physics import battery as bat
from sim.physics.errors import ModelRangeError

__all__ = [
    "CUT_POWER",
    "CUT_SOC",
    "CUT_TEMP",
    "CUT_TIME",
    "LegUse",
    "LogMismatchError",
    "LogRange",
    "PackEndurance",
    "RangeCurve",
    "RangePoint",
    "Remaining",
    "check_log_capacity",
    "default_speed_grid",
    "pack_endurance",
    "plant_from_log",
    "range_at_speed",
    "range_curve",
    "range_from_log",
    "stored_energy_j",
]

CUT_SOC = "state of charge at its minimum"
CUT_POWER = "pack power limit (cell voltage floor, current rating or power maximum)"
CUT_TEMP = "battery temperature limit"
CUT_TIME = "time cap reached"
CUT_NONE = "no discharge (the demand is zero or negative)"

DEFAULT_TEMP_MAX_C = 60.0
"""Battery temperature cut-off [°C] when none is given (the scenario files' default limit)."""

DEFAULT_MAX_TIME_S = 1.0e7
"""Longest endurance integrated [s] (about 116 days); longer is reported as the cap."""


# ------------------------------------------------------------------ pack endurance


@dataclass(frozen=True)
class PackEndurance:
    """How long a pack delivers a constant terminal power, from a given state, to cut-off.

    Attributes
    ----------
    power_w : demanded pack terminal power [W]
    time_s : endurance to cut-off [s] (inf when nothing is drawn)
    energy_j : terminal energy delivered, power × time [J]
    charge_c : charge delivered [C]
    start_soc, end_soc : state of charge at the start and at cut-off [-]
    end_cell_v : cell terminal voltage at the demanded power at cut-off [V]
    end_temp_c : battery temperature at cut-off [°C]
    cutoff : what ended the discharge (one of the ``CUT_*`` texts)
    """

    power_w: float
    time_s: float
    energy_j: float
    charge_c: float
    start_soc: float
    end_soc: float
    end_cell_v: float
    end_temp_c: float
    cutoff: str


def _rc_tuple(pack: bat.Pack, v_rc) -> tuple[float, ...]:
    if v_rc is None:
        return (0.0,) * pack.n_rc
    if np.isscalar(v_rc):
        return (float(v_rc),) + (0.0,) * (pack.n_rc - 1)
    vals = tuple(float(v) for v in v_rc)[: pack.n_rc]
    return vals + (0.0,) * (pack.n_rc - len(vals))


def pack_endurance(
    plant: Plant,
    power_w: float,
    *,
    soc: float,
    v_rc=None,
    temp_c: float | None = None,
    soc_min: float = 0.0,
    temp_max_c: float = DEFAULT_TEMP_MAX_C,
    max_time_s: float = DEFAULT_MAX_TIME_S,
) -> PackEndurance:
    """Endurance of the plant's pack at a constant terminal power, integrated to cut-off.

    Parameters
    ----------
    plant : Plant
        Supplies the pack, the drive's under-voltage margin, the battery's thermal conductance
        and the water temperature.
    power_w : float
        Demanded pack terminal power [W] (propulsion through the drive plus hotel loads).
    soc : float
        Starting state of charge [-].
    v_rc : float or sequence, optional
        Starting RC-pair voltages [V] (one per pair; a float is the first pair). Default 0 (a
        rested pack).
    temp_c : float, optional
        Starting battery temperature [°C]; default the water temperature.
    soc_min : float
        Cut-off state of charge [-].
    temp_max_c : float
        Battery temperature cut-off [°C] (a scenario's ``limits.battery_temperature_max``).
    max_time_s : float
        Longest time integrated [s].

    Returns
    -------
    PackEndurance

    Notes
    -----
    Integrates dSOC/dt = −I/(3600 Q), dV_k/dt = I/C_k − V_k/(R_k C_k) and the lumped thermal
    balance m c_p dT/dt = Q_heat − UA (T − T_water), with I solving I (OCV − ΣV_k − I R0) = P at
    every instant (:func:`sim.physics.battery.solve_current_for_power`). It stops when SOC
    reaches ``soc_min``, P exceeds :meth:`VesselModel.pack_power_limit_w` or the battery
    reaches ``temp_max_c``. With R0 = R_k = 0
    this reduces to t = 3600 Q ∫ OCV dSOC / P, the stored energy over the power.

    References
    ----------
    Plett, G. L. (2015). Battery Management Systems, Vol. I: Battery Modeling, ch. 2. Artech
    House (equivalent circuit); Bernardi, Pawlikowski & Newman (1985), J. Electrochem. Soc.
    132(1), 5–12 (heat balance).
    """
    pack = plant.pack
    n_rc = pack.n_rc
    rc0 = _rc_tuple(pack, v_rc)
    t0 = plant.water.t_c if temp_c is None else float(temp_c)
    p = float(power_w)
    soc = float(soc)
    model = VesselModel(plant)

    def cell_v(s, rc, temp):
        return float(bat.solve_current_for_power(pack, s, sum(rc), temp, p).cell_v)

    def result(time_s, s, rc, temp, cutoff, charge):
        return PackEndurance(
            power_w=p,
            time_s=time_s,
            energy_j=p * time_s if math.isfinite(time_s) else math.inf,
            charge_c=charge,
            start_soc=soc,
            end_soc=s,
            end_cell_v=cell_v(s, rc, temp),
            end_temp_c=temp,
            cutoff=cutoff,
        )

    if p <= 0.0:
        return result(math.inf, soc, rc0, t0, CUT_NONE, 0.0)
    if soc <= soc_min:
        return result(0.0, soc, rc0, t0, CUT_SOC, 0.0)
    if t0 >= temp_max_c:
        return result(0.0, soc, rc0, t0, CUT_TEMP, 0.0)
    if p > model.pack_power_limit_w(soc, sum(rc0), t0):
        return result(0.0, soc, rc0, t0, CUT_POWER, 0.0)

    t_water, ua = plant.water.t_c, plant.battery_ua_w_k

    def rhs(_t, y):
        s, temp = float(y[0]), float(y[-2])
        rc = tuple(float(v) for v in y[1 : 1 + n_rc])
        i = float(bat.solve_current_for_power(pack, s, sum(rc), temp, p).current_a)
        d_rc = bat.drc_dt(pack, s, temp, i, rc)
        heat = float(bat.heat_generation_w(pack, i, s, temp, rc))
        d_t = float(bat.battery_temperature_rate_k_s(pack, heat, temp, t_water, ua))
        return [float(bat.dsoc_dt(pack, i)), *(float(v) for v in d_rc), d_t, i]

    def soc_event(_t, y):
        return float(y[0]) - soc_min

    def power_event(_t, y):
        rc = y[1 : 1 + n_rc]
        return model.pack_power_limit_w(float(y[0]), float(np.sum(rc)), float(y[-2])) - p

    def temp_event(_t, y):
        return temp_max_c - float(y[-2])

    for ev in (soc_event, power_event, temp_event):
        ev.terminal, ev.direction = True, -1
    y0 = np.array([soc, *rc0, t0, 0.0])
    atol = np.array([1e-12, *([1e-9] * n_rc), 1e-8, 1e-6])
    sol = solve_ivp(
        rhs,
        (0.0, max_time_s),
        y0,
        method="LSODA",
        events=[soc_event, power_event, temp_event],
        rtol=1e-9,
        atol=atol,
    )
    if sol.status == -1:
        raise RuntimeError(f"pack endurance integration failed: {sol.message}")
    cutoff, t_end, y_end = CUT_TIME, float(sol.t[-1]), sol.y[:, -1]
    best = math.inf
    names = (CUT_SOC, CUT_POWER, CUT_TEMP)
    for name, te, ye in zip(names, sol.t_events, sol.y_events, strict=True):
        if len(te) and te[0] < best:
            best, cutoff, t_end, y_end = float(te[0]), name, float(te[0]), ye[0]
    rc_end = tuple(float(v) for v in y_end[1 : 1 + n_rc])
    return result(t_end, float(y_end[0]), rc_end, float(y_end[-2]), cutoff, float(y_end[-1]))


def stored_energy_j(pack: bat.Pack, soc_from: float, soc_to: float) -> float:
    """Open-circuit energy stored between two states of charge, 3600 Q ∫ OCV dSOC [J].

    Exact for the piecewise-linear OCV table (trapezoids between the table's breakpoints).
    """
    if soc_to >= soc_from:
        return 0.0
    xs = np.array(pack.cell.soc_points)
    inner = xs[(xs > soc_to) & (xs < soc_from)]
    s = np.concatenate([[soc_to], inner, [soc_from]])
    v = np.asarray(bat.ocv_v(pack, s))
    return float(3600.0 * pack.capacity_ah * np.sum(0.5 * (v[1:] + v[:-1]) * np.diff(s)))


# ------------------------------------------------------------------ steady range curves


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
        Speeds through water [m/s]; default :func:`default_speed_grid` with ``points`` speeds.
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
        speeds_m_s = default_speed_grid(plant, points, soc=soc)
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


# ------------------------------------------------------------------ range from a run log


@dataclass(frozen=True)
class LegUse:
    """Consumption of one leg of a logged run.

    Attributes
    ----------
    index, name : leg index in the scenario and its name
    t_start_s, t_end_s : start and end time [s]
    distance_m : distance over ground [m]
    energy_j : pack terminal energy [J]
    mean_speed_m_s : mean speed over ground [m/s]
    mean_pack_power_w : mean pack terminal power [W]
    mean_thruster_power_w : mean electrical power into the thrusters [W]
    ending : what ended the leg ("running" when the log stops inside it)
    """

    index: int
    name: str
    t_start_s: float
    t_end_s: float
    distance_m: float
    energy_j: float
    mean_speed_m_s: float
    mean_pack_power_w: float
    mean_thruster_power_w: float
    ending: str

    @property
    def duration_s(self) -> float:
        return self.t_end_s - self.t_start_s

    @property
    def energy_per_distance_j_m(self) -> float:
        """Pack energy per distance over ground [J/m] (NaN when no distance was made)."""
        return self.energy_j / self.distance_m if self.distance_m > 0 else math.nan


@dataclass(frozen=True)
class Remaining:
    """What is left when running on at one steady demand.

    Attributes
    ----------
    basis : what the demand is (e.g. the last driving leg, or the best-range speed)
    ground_speed_m_s : speed over ground while running on [m/s]
    power_w : pack terminal power [W]
    soc_floor : state of charge at which the pack is taken as empty [-]
    endurance : the pack discharge to cut-off
    range_m : distance over ground still available [m]
    """

    basis: str
    ground_speed_m_s: float
    power_w: float
    soc_floor: float
    endurance: PackEndurance
    range_m: float


@dataclass(frozen=True)
class LogRange:
    """Range estimate from a run log (finished or partial).

    Attributes
    ----------
    log_path : the log read
    complete : the log holds a whole run
    ending_reason : why the run ended ("" for a partial log)
    scenario_name, vessel_name : provenance names
    distance_m, duration_s, energy_out_j : covered so far [m], [s], [J]
    legs : consumption by leg (a final "running" leg when the log stops inside one)
    end_soc, end_cell_v, end_battery_c : state at the last sample [-], [V], [°C]
    end_rc_v : RC-pair voltages at the last sample, inferred from the logged cell voltage [V]
    soc_min : the scenario's cut-off state of charge [-]
    stored_energy_j : open-circuit energy between the last state and the cut-off SOC [J]
    at_last_leg : running on at the last driving leg's mean power and speed
    at_best_speed : running on at the best-range speed from the last state
    reserve_soc : the reserve asked for (None when not asked)
    reserve_at_last_leg, reserve_at_best_speed : as above, down to the reserve SOC
    notes : caveats (how the vessel was rebuilt, why a figure is missing)
    """

    log_path: Path
    complete: bool
    ending_reason: str
    scenario_name: str
    vessel_name: str
    distance_m: float
    duration_s: float
    energy_out_j: float
    legs: tuple[LegUse, ...]
    end_soc: float
    end_cell_v: float
    end_battery_c: float
    end_rc_v: tuple[float, ...]
    soc_min: float
    stored_energy_j: float
    at_last_leg: Remaining | None
    at_best_speed: Remaining | None
    reserve_soc: float | None = None
    reserve_at_last_leg: Remaining | None = None
    reserve_at_best_speed: Remaining | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)

    @property
    def total_range_m(self) -> float:
        """Distance covered plus the range left at the last leg's consumption [m]."""
        extra = self.at_last_leg.range_m if self.at_last_leg is not None else 0.0
        return self.distance_m + extra


def plant_from_log(log: RunLog) -> tuple[Plant, LimitsSpec, list[str]]:
    """Rebuild the plant and the limits a run was flown with, from the log's provenance
    (:func:`sim.io.provenance.plant_from_provenance`).

    Returns
    -------
    (plant, limits, notes)
    """
    return plant_from_provenance(log)


class LogMismatchError(ValueError):
    """The vessel in a log's provenance is not the one that was flown (e.g. it was changed by
    overrides in Python and the log kept the file's text)."""


def check_log_capacity(log: RunLog, plant: Plant, tolerance: float = 0.1) -> None:
    """Check the rebuilt pack against the log: the charge drawn (∫I dt over the samples) over
    the fall in state of charge must match the pack capacity (coulomb counting, Plett 2015).

    Raises
    ------
    LogMismatchError
        When they differ by more than ``tolerance`` (a different number of cells in parallel,
        say).
    """
    s = log.series
    t, i, soc = s["time_s"], s["pack_current_a"], s["state_of_charge"]
    d_soc = float(soc[0] - soc[-1])
    if abs(d_soc) < 0.02 or t.size < 3:
        return
    charge_ah = float(np.sum(0.5 * (i[1:] + i[:-1]) * np.diff(t))) / 3600.0
    implied = charge_ah / d_soc
    cap = plant.pack.capacity_ah
    if not abs(implied / cap - 1.0) <= tolerance:
        raise LogMismatchError(
            f"{log.path}: the run drew {charge_ah:.3g} A·h for a fall of {100 * d_soc:.3g} % "
            f"in state of charge, a pack of about {implied:.3g} A·h, but the vessel in the "
            f"log's provenance has {cap:.3g} A·h; the log does not hold the vessel flown (was "
            "it changed in Python? `brinebolt versus --logs` writes the variant's file)"
        )


def _window_mean(t: np.ndarray, y: np.ndarray, t0: float, t1: float) -> float:
    if t1 <= t0:
        return float(np.interp(t0, t, y))
    inside = t[(t > t0) & (t < t1)]
    tt = np.concatenate([[t0], inside, [t1]])
    yy = np.interp(tt, t, y)
    return float(np.sum(0.5 * (yy[1:] + yy[:-1]) * np.diff(tt)) / (t1 - t0))


def _leg_power(s: dict, idx: int, t0: float, t1: float) -> float:
    """Mean thruster power of a leg from its own samples (a sample at a leg change belongs to
    the leg that ended there); the time-window mean when the leg has under two samples."""
    t = s["time_s"]
    m = (s["leg_index"] == idx) & (t >= t0) & (t <= t1)
    if np.count_nonzero(m) >= 2:
        tt, yy = t[m], s["thruster_power_w"][m]
        if tt[-1] > tt[0]:
            return float(np.sum(0.5 * (yy[1:] + yy[:-1]) * np.diff(tt)) / (tt[-1] - tt[0]))
    return _window_mean(t, s["thruster_power_w"], t0, t1)


def _leg_uses(log: RunLog) -> list[LegUse]:
    s = log.series
    t = s["time_s"]
    x = s["distance_m"]
    e = s["energy_out_j"]
    out = []
    for row in log.legs:
        t0, t1 = float(row["t_start_s"]), float(row["t_end_s"])
        dur = t1 - t0
        out.append(
            LegUse(
                index=int(row["index"]),
                name=str(row["name"]),
                t_start_s=t0,
                t_end_s=t1,
                distance_m=float(row["distance_m"]),
                energy_j=float(row["energy_j"]),
                mean_speed_m_s=float(row["distance_m"]) / dur if dur > 0 else 0.0,
                mean_pack_power_w=float(row["energy_j"]) / dur if dur > 0 else 0.0,
                mean_thruster_power_w=_leg_power(s, int(row["index"]), t0, t1),
                ending=str(row["ending"]),
            )
        )
    t_last = float(t[-1])
    t0 = out[-1].t_end_s if out else float(t[0])
    if t_last > t0 + 1e-9:  # the log stops inside a leg
        idx = int(s["leg_index"][-1])
        name = next((str(r["name"]) for r in log.legs if int(r["index"]) == idx), None)
        if name is None:
            name = _leg_name_from_events(log, idx)
        dx = float(x[-1] - np.interp(t0, t, x))
        de = float(e[-1] - np.interp(t0, t, e))
        dur = t_last - t0
        out.append(
            LegUse(
                idx,
                name,
                t0,
                t_last,
                dx,
                de,
                dx / dur,
                de / dur,
                _leg_power(s, idx, t0, t_last),
                "running",
            )
        )
    return out


def _leg_name_from_events(log: RunLog, idx: int) -> str:
    for ev in reversed(log.events):
        if ev.get("kind") == "leg start" and int(ev.get("leg", -1)) == idx:
            msg = str(ev.get("message", ""))
            if msg.startswith("leg '") and "'" in msg[5:]:
                return msg[5 : msg.index("'", 5)]
    return f"leg {idx}"


def _infer_rc(pack: bat.Pack, soc: float, temp_c: float, current_a: float, cell_v: float):
    """RC-pair voltages from the logged cell voltage: ΣV_k = OCV − n_s·V_cell − I·R0_cells,
    shared between pairs in proportion to their resistances (their steady shares)."""
    ocv = float(bat.ocv_v(pack, soc))
    r_cells = float(bat.r0_ohm(pack, soc, temp_c)) - pack.extra_series_resistance_ohm
    total = ocv - pack.n_series * cell_v - current_a * r_cells
    rs = [r for r, _c in bat.rc_params(pack, soc, temp_c)]
    return tuple(total * r / sum(rs) for r in rs)


def range_from_log(
    log: str | Path | RunLog,
    *,
    reserve_soc: float | None = None,
    speeds_m_s=None,
    best_speed: bool = True,
) -> LogRange:
    """Range left according to a run log, finished or partial.

    Parameters
    ----------
    log : path or RunLog
        A run log (``*.h5`` or ``*.incomplete.h5``).
    reserve_soc : float, optional
        Also report the range down to this state of charge (kept in reserve) [-].
    speeds_m_s : array, optional
        Speed grid for the best-range search [m/s]; default :func:`default_speed_grid`.
    best_speed : bool
        Search the best-range speed from the last state (False skips it; it costs a second or
        two).

    Returns
    -------
    LogRange

    Raises
    ------
    LogMismatchError
        The log's vessel is not the one flown (:func:`check_log_capacity`).

    Notes
    -----
    The state at the last sample (SOC, battery temperature; the RC voltages inferred from the
    logged cell voltage and current) is integrated on with :func:`pack_endurance` at the mean
    pack power of the last leg that drove the thrusters, to the scenario's cut-off SOC or the
    pack's power limit; the range is that time × the leg's mean speed over ground. The
    best-range speed is searched with :func:`range_curve` from the same state and the last
    hotel load.
    """
    if not isinstance(log, RunLog):
        log = read_log(log)
    s = log.series
    plant, limits, notes = plant_from_log(log)
    check_log_capacity(log, plant)
    soc_min = float(limits.state_of_charge_min)
    temp_max = float(limits.battery_temperature_max_c)
    legs = _leg_uses(log)
    soc = float(s["state_of_charge"][-1])
    temp = float(s["battery_temperature_c"][-1])
    cell_v = float(s["cell_voltage_v"][-1])
    rc = _infer_rc(plant.pack, soc, temp, float(s["pack_current_a"][-1]), cell_v)
    hotel = max(0.0, float(s["hotel_power_w"][-1]) - plant.cryocooler_w)

    peak = max((leg.mean_thruster_power_w for leg in legs), default=0.0)
    driving = [
        leg
        for leg in legs
        if leg.duration_s > 0
        and leg.distance_m > 0
        and leg.mean_thruster_power_w > 1e-3 * peak
        and peak > 0
    ]
    basis = driving[-1] if driving else None
    if basis is None:
        notes.append("no leg drove the thrusters: no range at the last leg's consumption")

    def run_on(leg: LegUse, floor: float) -> Remaining:
        end = pack_endurance(
            plant,
            leg.mean_pack_power_w,
            soc=soc,
            v_rc=rc,
            temp_c=temp,
            soc_min=floor,
            temp_max_c=temp_max,
        )
        rng = end.time_s * leg.mean_speed_m_s if math.isfinite(end.time_s) else math.inf
        return Remaining(
            f"last driving leg {leg.name!r}",
            leg.mean_speed_m_s,
            leg.mean_pack_power_w,
            floor,
            end,
            rng,
        )

    def best_on(floor: float) -> Remaining | None:
        try:
            curve = range_curve(
                plant,
                speeds_m_s,
                soc=soc,
                soc_min=floor,
                v_rc=rc,
                temp_c=temp,
                hotel_w=hotel,
                temp_max_c=temp_max,
                points=16,
            )
        except (SteadyError, ModelRangeError) as exc:
            notes.append(f"no best-range speed: {exc}")
            return None
        b = curve.best_range
        if b is None:
            notes.append("no speed can be held from the last state: no best-range speed")
            return None
        return Remaining(
            "best-range speed",
            b.ground_speed_m_s,
            b.steady.pack_power_w,
            floor,
            b.endurance,
            b.range_m,
        )

    at_last = run_on(basis, soc_min) if basis else None
    at_best = best_on(soc_min) if best_speed else None
    if not best_speed:
        notes.append("best-range speed not searched")
    r_last = r_best = None
    if reserve_soc is not None:
        floor = max(float(reserve_soc), soc_min)
        r_last = run_on(basis, floor) if basis else None
        r_best = best_on(floor) if best_speed else None
    return LogRange(
        log_path=Path(log.path),
        complete=log.complete,
        ending_reason=log.ending_reason,
        scenario_name=str(log.attrs.get("scenario_name", "")),
        vessel_name=str(log.attrs.get("vessel_name", plant.name)),
        distance_m=float(s["distance_m"][-1]),
        duration_s=float(s["time_s"][-1]),
        energy_out_j=float(s["energy_out_j"][-1]),
        legs=tuple(legs),
        end_soc=soc,
        end_cell_v=cell_v,
        end_battery_c=temp,
        end_rc_v=tuple(rc),
        soc_min=soc_min,
        stored_energy_j=stored_energy_j(plant.pack, soc, soc_min),
        at_last_leg=at_last,
        at_best_speed=at_best,
        reserve_soc=reserve_soc,
        reserve_at_last_leg=r_last,
        reserve_at_best_speed=r_best,
        notes=tuple(notes),
    )
