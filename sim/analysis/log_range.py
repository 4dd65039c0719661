"""What a run log (finished or partial) says about the range left.

The vessel and limits a run was flown with are rebuilt from the log's provenance
(:func:`plant_from_log`) and checked against the log by coulomb counting
(:func:`check_log_capacity`); the state at the last sample is then discharged on at the last
driving leg's consumption and at the best-range speed (:func:`range_from_log`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from sim.analysis.endurance import PackEndurance, pack_endurance, stored_energy_j
from sim.analysis.range_curves import range_curve
from sim.engine.plant import Plant
from sim.engine.spec import LimitsSpec
from sim.engine.steady import SteadyError
from sim.io.log import RunLog, read_log
from sim.io.provenance import plant_from_provenance
from sim.physics import battery as bat
from sim.physics.errors import ModelRangeError

__all__ = [
    "LegUse",
    "LogMismatchError",
    "LogRange",
    "Remaining",
    "check_log_capacity",
    "plant_from_log",
    "range_from_log",
]


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
    verdict : one sentence when no range is left (the pack at or below its cut-off, or unable
        to deliver any demand from the last state), else ""; the range rows then are None or
        all zero, never a speed with a range beside "no range"
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
    verdict: str = ""

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
        Speed grid for the best-range search [m/s]; default
        :func:`sim.analysis.range_curves.default_speed_grid`.
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
    logged cell voltage and current) is integrated on with
    :func:`~sim.analysis.endurance.pack_endurance` at the mean pack power of the last leg that
    drove the thrusters, to the scenario's cut-off SOC or the pack's power limit; the range
    is that time × the leg's mean speed over ground. The best-range speed is searched with
    :func:`~sim.analysis.range_curves.range_curve` from the same state and the last hotel load.
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

    verdict = ""
    at_last = at_best = r_last = r_best = None
    if soc <= soc_min:
        verdict = (
            f"No range left: the state of charge ({100 * soc:.1f} %) is at or below the "
            f"cut-off ({100 * soc_min:.1f} %)."
        )
    else:
        at_last = run_on(basis, soc_min) if basis else None
        at_best = best_on(soc_min) if best_speed else None
        if not best_speed:
            notes.append("best-range speed not searched")
        if reserve_soc is not None:
            floor = max(float(reserve_soc), soc_min)
            r_last = run_on(basis, floor) if basis else None
            r_best = best_on(floor) if best_speed else None
        got = [r for r in (at_last, at_best) if r is not None]
        if got and all(not r.range_m > 0 for r in got):
            why = "; ".join(sorted({r.endurance.cutoff for r in got}))
            verdict = f"No range left from the last state: the pack is at its cut-off ({why})."
            at_best = None  # a best speed with no range is no best speed
            notes = [n for n in notes if "best-range speed" not in n]
        elif best_speed and at_best is None and basis is None:
            verdict = "No range left: no speed can be held from the last state."
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
        verdict=verdict,
    )
