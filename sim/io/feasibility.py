"""Can the craft fly what the mission asks? Steady checks of every leg before a run.

``brinebolt check`` flies the steady model (:mod:`sim.engine.steady`) over every leg at the
scenario's water and start state of charge, within the drive's limits (maximum electrode voltage,
per-unit current limit) and the pack's power limit (the cell floor plus the drive's under-voltage
margin, :func:`sim.physics.battery.pack_power_limit_w`, as the engine folds back). A leg whose
held speed, power or current cannot be met even in steady state gets a warning with the figure
the craft can reach: the run itself would still go (the drive saturates or folds back), but not
as the file says.

The check is steady: it leaves out acceleration, the battery's sag and warming during the run,
and the magnets' warming beyond the duct water; a leg found feasible at the start may still fold
back later in the run.
"""

from __future__ import annotations

from sim.engine.model import Control, VesselModel, initial_state
from sim.engine.steady import SteadyError, steady_at_speed, steady_speed_for
from sim.io.problems import MISSING, Problem
from sim.io.schema import LegSpec, ScenarioFile, VesselFile
from sim.io.seam import plant_of, vessel_spec, water
from sim.physics.constants import KNOT_M_S
from sim.physics.errors import ModelRangeError

__all__ = ["feasibility_problems"]

_SHORT = 1e-3
"""Relative shortfall of a reached power or current below which a leg counts as met."""


def _shown(data: dict | None, key: str, fallback: object) -> object:
    node: object = data
    for part in key.replace("]", "").replace("[", ".").split("."):
        if isinstance(node, dict) and part in node:
            node = node[part]
        elif isinstance(node, list) and part.isdigit() and int(part) < len(node):
            node = node[int(part)]
        else:
            return fallback
    return node


def _snapshot(plant, control: Control, speed_m_s: float, soc: float):
    model = VesselModel(plant)
    model.control = control
    t_w = plant.water.t_c
    return model.evaluate(0.0, initial_state(plant, soc, speed_m_s, t_w, t_w))


def _limits_text(plant) -> str:
    return (
        f"drive {plant.drive_max_voltage_v:g} V and {plant.drive_max_current_a:g} A per unit, "
        "pack power limit"
    )


def _leg_warning(plant, leg: LegSpec, hotel_w: float, soc: float) -> str | None:
    """Why the leg's command cannot be met in steady state, with the reachable figure; None
    when it can."""
    where = f"in this water at the start charge ({soc:.0%}), within the {_limits_text(plant)}"
    vmax = plant.drive_max_voltage_v
    if leg.mode == "speed":
        try:
            point = steady_at_speed(plant, leg.speed, soc=soc, hotel_w=hotel_w)
            if point.feasible:
                return None
        except SteadyError:
            pass
        top = steady_speed_for(plant, Control("voltage", vmax, hotel_w=hotel_w), soc=soc)
        return (
            f"leg {leg.name!r} holds {leg.speed / KNOT_M_S:.2f} kn, but the craft reaches at most "
            f"{top / KNOT_M_S:.2f} kn ({top:.2f} m/s) {where}; the speed hold will saturate"
        )
    if leg.mode in ("power", "current") and leg.setpoint > 0:
        control = Control(leg.mode, leg.setpoint, hotel_w=hotel_w)
        speed = steady_speed_for(plant, control, soc=soc)
        snap = _snapshot(plant, control, speed, soc)
        if leg.mode == "power":
            got, unit, scale = snap.thr_power_w, "kW", 1e-3
        else:
            got, unit, scale = sum(snap.current_a), "A", 1.0
        if got >= leg.setpoint * (1.0 - _SHORT) and snap.feasible:
            return None
        return (
            f"leg {leg.name!r} asks for {leg.setpoint * scale:.4g} {unit} of {leg.mode}, but the "
            f"drive delivers at most {got * scale:.4g} {unit} (at {speed / KNOT_M_S:.2f} kn) "
            f"{where}"
        )
    return None


def feasibility_problems(
    spec: ScenarioFile, vessel: VesselFile, file: str, data: dict | None = None
) -> list[Problem]:
    """Warnings for the legs whose held speed, power or current the vessel cannot meet in
    steady state at the scenario's water and start state of charge.

    Parameters
    ----------
    spec : ScenarioFile
        The validated scenario.
    vessel : VesselFile
        Its validated vessel.
    file : str
        The scenario's file name (the problems name it).
    data : dict, optional
        The scenario's parsed TOML (to show the values as written).

    Returns
    -------
    list of Problem
        Warnings, one per leg that cannot be met (none when the models cannot be built: the
        loaders report that).
    """
    try:
        plant = plant_of(vessel_spec(vessel), water(spec.water, spec.route, spec.tide))
    except (ModelRangeError, ValueError, ArithmeticError):
        return []
    soc = spec.start.state_of_charge
    out = []
    for i, leg in enumerate(spec.leg):
        hotel = vessel.hotel.power if leg.hotel is None else leg.hotel
        key = f"leg[{i}].{leg.mode}"
        try:
            why = _leg_warning(plant, leg, hotel, soc)
        except (SteadyError, ModelRangeError, ValueError, ArithmeticError) as exc:
            why = f"leg {leg.name!r} could not be checked in steady state ({exc})"
        if why:
            out.append(Problem(file, key, _shown(data, key, MISSING), why, "warning"))
    return out
