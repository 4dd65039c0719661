"""Performance curves of a vessel's MHD thrusters.

* :func:`thrust_flow_family` — thrust against volume flow of one thruster unit for a family of
  electrode voltages (each curve traced by the inflow speed), with the vessel's steady operating
  line (thrust = the unit's share of the hull resistance) across them;
* :func:`speed_curves` — overall, electrical and propulsive efficiency, current and power of the
  whole vessel at steady speeds (thrust = resistance);
* :func:`efficiency_map` — overall efficiency of one unit over electrode gap (duct width) ×
  field at a given speed, each point delivering the thrust the unit gives at that speed now.

All use :func:`sim.physics.thruster.operating_point`, vectorised over speed and command.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from sim.analysis.range_curves import default_speed_grid
from sim.engine.model import VesselModel
from sim.engine.plant import Plant
from sim.engine.steady import SteadyError, steady_at_speed
from sim.physics.errors import ModelRangeError
from sim.physics.thruster import operating_point

__all__ = [
    "BUILDABLE_FIELD_T",
    "EfficiencyMap",
    "SpeedCurves",
    "ThrustFlowFamily",
    "buildable_field",
    "efficiency_map",
    "speed_curves",
    "thrust_flow_family",
    "thruster_index",
]


def thruster_index(plant: Plant, which: int | str = 0) -> int:
    """Index of a thruster design by position or name.

    Raises
    ------
    ValueError
        No such thruster.
    """
    names = [u.name for u in plant.thrusters]
    if isinstance(which, str) and not which.isdigit():
        if which in names:
            return names.index(which)
        raise ValueError(
            f"no thruster named {which!r}; allowed: {', '.join(names)} "
            f"or an index 0 to {len(names) - 1}"
        )
    k = int(which)
    if not 0 <= k < len(names):
        raise ValueError(f"thruster index {k} out of range; allowed: 0 to {len(names) - 1}")
    return k


def _steady_or_none(plant: Plant, v: float):
    try:
        return steady_at_speed(plant, float(v))
    except (SteadyError, ModelRangeError):
        return None


# ------------------------------------------------------------------ thrust vs flow


@dataclass(frozen=True)
class ThrustFlowFamily:
    """Thrust–flow curves of one thruster unit at fixed voltages.

    Attributes
    ----------
    thruster : thruster design name
    voltages_v : electrode voltages of the curves [V], shape (n,)
    speed_m_s : inflow (vessel) speeds tracing each curve [m/s], shape (m,)
    flow_m3_s : volume flow through all channels of one unit [m³/s], shape (n, m)
    thrust_n : net thrust of one unit [N], shape (n, m); NaN where the thrust is negative
    current_a : current of one unit [A], shape (n, m)
    line_speed_m_s, line_flow_m3_s, line_thrust_n : the vessel's steady operating line (the
        unit's thrust when thrust = resistance) at feasible speeds [m/s], [m³/s], [N]
    line_voltage_v : thruster voltage along the operating line [V]
    """

    thruster: str
    voltages_v: np.ndarray
    speed_m_s: np.ndarray
    flow_m3_s: np.ndarray
    thrust_n: np.ndarray
    current_a: np.ndarray
    line_speed_m_s: np.ndarray
    line_flow_m3_s: np.ndarray
    line_thrust_n: np.ndarray
    line_voltage_v: np.ndarray


def thrust_flow_family(
    plant: Plant,
    thruster: int | str = 0,
    *,
    voltages_v=None,
    speeds_m_s=None,
) -> ThrustFlowFamily:
    """Thrust against volume flow of one unit for a family of voltages.

    Parameters
    ----------
    plant : Plant
    thruster : int or str
        Thruster design (index or name).
    voltages_v : array, optional
        Electrode voltages [V]; default ¼, ½, ¾ and all of the drive's maximum voltage.
    speeds_m_s : array, optional
        Inflow speeds [m/s]; default 0 to 1.5 × the top steady speed.

    Returns
    -------
    ThrustFlowFamily

    Notes
    -----
    At a fixed voltage a faster inflow raises the duct flow and the back-EMF uB, so thrust falls
    as the flow rises: a pump-like characteristic. Where a curve crosses the operating line the
    vessel runs steadily at that voltage. Field with the magnets at the water temperature.
    """
    k = thruster_index(plant, thruster)
    unit = plant.thrusters[k]
    vmax = plant.drive_max_voltage_v
    volts = np.asarray(
        voltages_v if voltages_v is not None else vmax * np.array([0.25, 0.5, 0.75, 1.0]),
        dtype=float,
    )
    line_v, line_q, line_t, line_u = [], [], [], []
    if speeds_m_s is None:
        grid = default_speed_grid(plant, 16)
        speeds = np.linspace(0.0, 1.5 * grid[-1], 61)
    else:
        speeds = np.asarray(speeds_m_s, dtype=float)
        grid = speeds[speeds > 0]
    for v in grid:
        sp = _steady_or_none(plant, v)
        if sp is None:
            continue
        duct = dataclasses.replace(unit.duct, b_tesla=sp.field_t[k])
        op = operating_point(duct, plant.water, float(v), voltage_v=sp.thruster_voltage_v)
        line_v.append(float(v))
        line_q.append(float(op.volume_flow_m3_s))
        line_t.append(float(op.thrust_n))
        line_u.append(float(sp.thruster_voltage_v))
    b_water = VesselModel(plant).field_t(k, plant.water.t_c)
    duct = dataclasses.replace(unit.duct, b_tesla=b_water)
    op = operating_point(duct, plant.water, speeds[None, :], voltage_v=volts[:, None])
    thrust = np.where(op.thrust_n >= 0.0, op.thrust_n, np.nan)
    return ThrustFlowFamily(
        thruster=unit.name,
        voltages_v=volts,
        speed_m_s=speeds,
        flow_m3_s=np.asarray(op.volume_flow_m3_s),
        thrust_n=thrust,
        current_a=np.asarray(op.current_a),
        line_speed_m_s=np.array(line_v),
        line_flow_m3_s=np.array(line_q),
        line_thrust_n=np.array(line_t),
        line_voltage_v=np.array(line_u),
    )


# ------------------------------------------------------------------ steady curves vs speed


@dataclass(frozen=True)
class SpeedCurves:
    """Steady operating points of the whole vessel over speed (NaN where not reachable).

    Attributes
    ----------
    speed_m_s : speed through water [m/s]
    overall_efficiency : thrust power / thruster electrical power [-]
    electrical_efficiency : flow work / thruster electrical power [-]
    propulsive_efficiency : thrust power / flow work [-]
    current_a : total thruster current [A]
    voltage_v : thruster electrode voltage [V]
    thruster_power_w : electrical power into all thrusters [W]
    pack_power_w : pack terminal power (drive losses and hotel included) [W]
    useful_power_w : thrust × speed [W]
    """

    speed_m_s: np.ndarray
    overall_efficiency: np.ndarray
    electrical_efficiency: np.ndarray
    propulsive_efficiency: np.ndarray
    current_a: np.ndarray
    voltage_v: np.ndarray
    thruster_power_w: np.ndarray
    pack_power_w: np.ndarray
    useful_power_w: np.ndarray


def speed_curves(plant: Plant, speeds_m_s=None) -> SpeedCurves:
    """Efficiencies, current and power of the vessel at steady speeds (thrust = resistance).

    Parameters
    ----------
    plant : Plant
    speeds_m_s : array, optional
        Speeds through water [m/s]; default :func:`sim.analysis.range_curves.default_speed_grid`.

    Returns
    -------
    SpeedCurves

    Notes
    -----
    η_overall = η_electrical · η_propulsive = (Δp·Q / V·I) · (T·V₀ / Δp·Q) (Way 1968; momentum
    theory for η_p).
    """
    if speeds_m_s is None:
        speeds_m_s = default_speed_grid(plant, 24)
    speeds = np.asarray(speeds_m_s, dtype=float)
    cols = {
        k: np.full(speeds.shape, np.nan)
        for k in (
            "overall_efficiency",
            "electrical_efficiency",
            "propulsive_efficiency",
            "current_a",
            "voltage_v",
            "thruster_power_w",
            "pack_power_w",
            "useful_power_w",
        )
    }
    for i, v in enumerate(speeds):
        sp = _steady_or_none(plant, v)
        if sp is None:
            continue
        cols["overall_efficiency"][i] = sp.overall_efficiency
        cols["electrical_efficiency"][i] = sp.electrical_efficiency
        cols["propulsive_efficiency"][i] = sp.propulsive_efficiency
        cols["current_a"][i] = sp.thruster_current_a
        cols["voltage_v"][i] = sp.thruster_voltage_v
        cols["thruster_power_w"][i] = sp.thruster_power_w
        cols["pack_power_w"][i] = sp.pack_power_w
        cols["useful_power_w"][i] = sp.useful_power_w
    return SpeedCurves(speed_m_s=speeds, **cols)


# ------------------------------------------------------------------ efficiency map

BUILDABLE_FIELD_T: dict[str, tuple[float, str]] = {
    "permanent": (
        1.2,
        "permanent magnets: the gap field is limited by the remanence of NdFeB (about "
        "1.2-1.45 T); about 1.0-1.2 T is what a practical gap gets (common practice)",
    ),
    "electromagnet": (
        2.0,
        "iron-cored electromagnet: the iron saturates near 2 T (common practice, from memory)",
    ),
}
"""Largest mean gap field [T] a magnet technology can practically give, and why. A
superconducting magnet's limit is the vessel's own field (what its coil is designed for)."""


def buildable_field(magnet_kind: str, design_field_t: float) -> tuple[float, str]:
    """The largest mean gap field [T] buildable with a magnet technology, and the reason.

    Parameters
    ----------
    magnet_kind : 'permanent', 'electromagnet' or 'superconducting'
    design_field_t : the vessel's field [T] (the limit of a superconducting magnet)
    """
    if magnet_kind in BUILDABLE_FIELD_T:
        return BUILDABLE_FIELD_T[magnet_kind]
    return (
        float(design_field_t),
        f"{magnet_kind} magnet: the field its coil is designed for (the vessel's field)",
    )


@dataclass(frozen=True)
class EfficiencyMap:
    """Overall efficiency of one thruster unit over electrode gap × field, at one speed and the
    thrust the unit must give there.

    Attributes
    ----------
    thruster : thruster design name
    speed_m_s : inflow (vessel) speed [m/s]
    thrust_n : thrust each point delivers (the unit's share at steady ``speed_m_s``) [N]
    gaps_m : electrode gaps (duct widths, along E) [m], shape (nx,)
    fields_t : mean gap fields [T], shape (ny,)
    overall_efficiency : T·V₀ / (V·I) [-], shape (ny, nx); NaN where the thrust is not reached
    voltage_v, current_a : electrode voltage [V] and current [A] of one unit, shape (ny, nx)
    design_gap_m, design_field_t, design_efficiency : the design as drawn [m], [T], [-]
    drive_max_voltage_v : the drive's maximum voltage [V] (points above it need another drive)
    magnet_kind : 'permanent', 'electromagnet' or 'superconducting'
    field_limit_t, field_limit_note : the largest buildable field of that technology [T] and why
        (:func:`buildable_field`); points above it cannot be built with this kind of magnet
    """

    thruster: str
    speed_m_s: float
    thrust_n: float
    gaps_m: np.ndarray
    fields_t: np.ndarray
    overall_efficiency: np.ndarray
    voltage_v: np.ndarray
    current_a: np.ndarray
    design_gap_m: float
    design_field_t: float
    design_efficiency: float
    drive_max_voltage_v: float
    magnet_kind: str = "permanent"
    field_limit_t: float = math.inf
    field_limit_note: str = ""

    def best(self, *, buildable: bool = False, within_drive: bool = False):
        """``(iy, ix)`` of the most efficient point, or None; ``buildable`` keeps to fields at or
        below :attr:`field_limit_t`, ``within_drive`` to voltages the drive can give."""
        z = np.array(self.overall_efficiency, dtype=float)
        if buildable:
            z[self.fields_t > self.field_limit_t * (1 + 1e-9), :] = np.nan
        if within_drive:
            z[~(self.voltage_v <= self.drive_max_voltage_v)] = np.nan
        if not np.isfinite(z).any():
            return None
        iy, ix = np.unravel_index(np.nanargmax(z), z.shape)
        return int(iy), int(ix)

    def at_edge(self, iy: int, ix: int) -> bool:
        """Whether grid point ``(iy, ix)`` lies on the map's edge (its optimum may lie beyond)."""
        return iy in (0, self.fields_t.size - 1) or ix in (0, self.gaps_m.size - 1)


def _at_thrust(duct, water, speed: float, thrust_n: float):
    """(efficiency, voltage, current) of a duct delivering ``thrust_n`` at ``speed``: current
    sweep (vectorised), bracket, refined sweep, linear interpolation in thrust."""
    ideal = thrust_n / max(duct.b_tesla * duct.gap_m, 1e-12)  # Lorentz force I·B·gap
    lo, hi = 0.2 * ideal, 500.0 * ideal
    for _ in range(2):
        cur = np.geomspace(lo, hi, 40)
        op = operating_point(duct, water, speed, current_a=cur)
        t = np.asarray(op.thrust_n)
        above = np.flatnonzero(t >= thrust_n)
        if not above.size:
            return np.nan, np.nan, np.nan
        j = int(above[0])
        if j == 0:
            if lo < 1e-9:
                break
            lo, hi = lo / 100.0, lo
            continue
        lo, hi = cur[j - 1], cur[j]
        break
    cur = np.linspace(lo, hi, 16)
    op = operating_point(duct, water, speed, current_a=cur)
    t = np.asarray(op.thrust_n)
    i = float(np.interp(thrust_n, t, cur))
    p = float(np.interp(thrust_n, t, np.asarray(op.electrical_power_w)))
    u = float(np.interp(thrust_n, t, np.asarray(op.voltage_v)))
    eff = thrust_n * speed / p if p > 0 else np.nan
    return eff, u, i


def efficiency_map(
    plant: Plant,
    thruster: int | str = 0,
    *,
    speed_m_s: float,
    gaps_m=None,
    fields_t=None,
    n: int = 30,
) -> EfficiencyMap:
    """Overall efficiency over electrode gap (duct width) × field at one speed.

    Parameters
    ----------
    plant : Plant
    thruster : int or str
        Thruster design (index or name).
    speed_m_s : float
        Vessel speed through water [m/s] (> 0).
    gaps_m, fields_t : array, optional
        Grid axes [m], [T]; default ¼ to 4 × the design gap and ¼ to 4 × the design field
        (fields capped at 30 T), ``n`` points each, geometric.
    n : int
        Points per axis of the default grid.

    Returns
    -------
    EfficiencyMap

    Notes
    -----
    Pole height, length, channel count and losses stay as designed; each point carries the
    thrust the design gives at steady ``speed_m_s`` (so the hull would run at that speed with
    every unit of this design changed alike). The Lorentz force of a channel is I·B·gap, so a
    wider gap or stronger field needs less current for the same thrust; η_e = uB/E rises with
    field (Way 1968).
    """
    k = thruster_index(plant, thruster)
    unit = plant.thrusters[k]
    v = float(speed_m_s)
    if not v > 0:
        raise ValueError("efficiency map: speed must be > 0 m/s")
    sp = steady_at_speed(plant, v)
    duct0 = dataclasses.replace(unit.duct, b_tesla=sp.field_t[k])
    op0 = operating_point(duct0, plant.water, v, voltage_v=sp.thruster_voltage_v)
    thrust = float(op0.thrust_n)
    gaps = np.asarray(
        gaps_m if gaps_m is not None else np.geomspace(unit.duct.gap_m / 4, unit.duct.gap_m * 4, n),
        dtype=float,
    )
    fields = np.asarray(
        fields_t
        if fields_t is not None
        else np.geomspace(sp.field_t[k] / 4, min(sp.field_t[k] * 4, 30.0), n),
        dtype=float,
    )
    limit, note = buildable_field(unit.magnet_kind, float(unit.b_ref_tesla))
    eff = np.full((fields.size, gaps.size), np.nan)
    volt = np.full_like(eff, np.nan)
    cur = np.full_like(eff, np.nan)
    for iy, b in enumerate(fields):
        for ix, g in enumerate(gaps):
            try:
                duct = dataclasses.replace(unit.duct, gap_m=float(g), b_tesla=float(b))
                eff[iy, ix], volt[iy, ix], cur[iy, ix] = _at_thrust(duct, plant.water, v, thrust)
            except ModelRangeError:
                continue
    return EfficiencyMap(
        thruster=unit.name,
        speed_m_s=v,
        thrust_n=thrust,
        gaps_m=gaps,
        fields_t=fields,
        overall_efficiency=eff,
        voltage_v=volt,
        current_a=cur,
        design_gap_m=unit.duct.gap_m,
        design_field_t=float(sp.field_t[k]),
        design_efficiency=float(op0.overall_efficiency),
        drive_max_voltage_v=plant.drive_max_voltage_v,
        magnet_kind=unit.magnet_kind,
        field_limit_t=limit,
        field_limit_note=note,
    )
