"""Checks on input files that need more than one value: names that must exist, legs that can
never end, and physically suspicious (legal) designs that deserve a warning.
"""

from __future__ import annotations

import difflib
import itertools
import math

from sim.io.files import Problem
from sim.io.schema import ScenarioFile, VesselFile


def _choice(file: str, key: str, value: str, known, what: str) -> Problem:
    names = sorted(known)
    close = difflib.get_close_matches(value, names, n=1, cutoff=0.5)
    hint = f"did you mean '{close[0]}'? " if close else ""
    return Problem(file, key, value, f"unknown {what}; {hint}allowed: {', '.join(names)}")


def vessel_problems(spec: VesselFile, data: dict, file: str) -> list[Problem]:
    """Errors in a vessel file that single-key validation cannot see."""
    from sim.physics import battery, electrochem, magnets

    out: list[Problem] = []
    if spec.battery.cell not in battery.CELL_SETS:
        out.append(
            _choice(
                file, "battery.cell", spec.battery.cell, battery.CELL_SETS, "cell parameter set"
            )
        )
    seen: set[str] = set()
    for i, t in enumerate(spec.thruster):
        key = f"thruster[{i}]"
        if t.name in seen:
            out.append(
                Problem(
                    file,
                    f"{key}.name",
                    t.name,
                    "duplicate thruster name; allowed: a name used once",
                )
            )
        seen.add(t.name)
        for side in ("anode", "cathode"):
            v = getattr(t, side)
            if v not in electrochem.ELECTRODE_MATERIALS:
                out.append(
                    _choice(
                        file,
                        f"{key}.{side}",
                        v,
                        electrochem.ELECTRODE_MATERIALS,
                        "electrode material",
                    )
                )
        if t.magnet_grade is not None:
            if t.magnet != "permanent":
                out.append(
                    Problem(
                        file,
                        f"{key}.magnet_grade",
                        t.magnet_grade,
                        f"a grade applies to permanent magnets only (magnet = "
                        f"{t.magnet!r}); allowed: leave it out",
                    )
                )
            elif t.magnet_grade.upper() not in magnets.NDFEB_GRADES:
                out.append(
                    _choice(
                        file,
                        f"{key}.magnet_grade",
                        t.magnet_grade,
                        magnets.NDFEB_GRADES,
                        "magnet grade",
                    )
                )
    hull = spec.hull
    if getattr(hull, "model", "") == "table":
        sp = list(hull.speeds)
        if any(b <= a for a, b in itertools.pairwise(sp)):
            out.append(
                Problem(
                    file,
                    "hull.speeds",
                    data.get("hull", {}).get("speeds"),
                    "speeds must increase strictly; allowed: an ascending list",
                )
            )
    if not out:
        out.extend(_build_check(spec, file))
    return out


def _build_check(spec: VesselFile, file: str) -> list[Problem]:
    """Let the physics models check what they own (e.g. the Holtrop–Mennen validity ranges)."""
    from sim.engine.plant import _hull_model, _thruster_unit
    from sim.physics.errors import ModelRangeError

    out = []
    try:
        _hull_model(spec.hull, spec.vessel.mass, 1025.0)
    except ModelRangeError as exc:
        out.append(Problem(file, "hull", exc.value, str(exc)))
    for i, t in enumerate(spec.thruster):
        try:
            _thruster_unit(t)
        except ModelRangeError as exc:
            out.append(Problem(file, f"thruster[{i}]", exc.value, str(exc)))
    return out


def vessel_warnings(spec: VesselFile, file: str) -> list[Problem]:
    """Physically suspicious but legal choices."""
    from sim.physics import battery, magnets

    out = []
    for i, t in enumerate(spec.thruster):
        key = f"thruster[{i}]"
        if t.magnet == "permanent":
            br = 1.48
            if t.magnet_grade and t.magnet_grade.upper() in magnets.NDFEB_GRADES:
                br = magnets.NDFEB_GRADES[t.magnet_grade.upper()].br_tesla
            if t.field > br:
                out.append(
                    Problem(
                        file,
                        f"{key}.field",
                        t.field,
                        f"a permanent-magnet circuit rarely gives a gap field above "
                        f"its remanence ({br:g} T); check the design",
                        "warning",
                    )
                )
        if t.gap > 4 * t.pole_height:
            out.append(
                Problem(
                    file,
                    f"{key}.gap",
                    t.gap,
                    f"electrode gap is {t.gap / t.pole_height:.1f}× the pole height; "
                    "a real magnet rarely fills such a wide, flat gap",
                    "warning",
                )
            )
    cell = battery.CELL_SETS.get(spec.battery.cell)
    if cell is not None:
        pack_imax = cell.max_discharge_current_a * spec.battery.parallel
        units = sum(t.units for t in spec.thruster)
        demand = spec.drive.max_current * spec.drive.max_voltage * units / spec.drive.efficiency
        v_pack = float(cell.ocv_v[-1]) * spec.battery.series
        if demand / max(v_pack, 1e-9) > pack_imax:
            out.append(
                Problem(
                    file,
                    "drive.max_current",
                    spec.drive.max_current,
                    f"at full drive the pack would carry about "
                    f"{demand / v_pack:.0f} A, above its rating of {pack_imax:.0f} A",
                    "warning",
                )
            )
    return out


def scenario_problems(
    spec: ScenarioFile, vessel: VesselFile, data: dict, file: str
) -> list[Problem]:
    out = []
    names: dict[str, int] = {}
    for i, leg in enumerate(spec.leg):
        if leg.name in names:
            out.append(
                Problem(
                    file,
                    f"leg[{i}].name",
                    leg.name,
                    "duplicate leg name; allowed: a name used once",
                )
            )
        names.setdefault(leg.name, i)
        u = leg.until
        if (
            leg.speed is not None
            and u.speed_above is not None
            and u.speed_above > leg.speed
            and len(u.given()) == 1
        ):
            out.append(
                Problem(
                    file,
                    f"leg[{i}].until.speed_above",
                    u.speed_above,
                    f"the leg holds {leg.speed:g} m/s and can never exceed "
                    f"{u.speed_above:g} m/s; allowed: a speed below the target or "
                    "another end condition",
                )
            )
        if (
            leg.voltage is not None
            and leg.voltage == 0
            and u.distance is not None
            and len(u.given()) == 1
            and vessel is not None
            and spec.water.current <= 0
        ):
            out.append(
                Problem(
                    file,
                    f"leg[{i}].until.distance",
                    u.distance,
                    "with zero voltage and no following current the vessel can "
                    "never cover this distance; allowed: add a duration",
                )
            )
        if leg.voltage is not None and abs(leg.voltage) > vessel.drive.max_voltage:
            out.append(
                Problem(
                    file,
                    f"leg[{i}].voltage",
                    leg.voltage,
                    f"above the drive's maximum voltage; allowed: ≤ {vessel.drive.max_voltage:g} V",
                )
            )
    for i, trig in enumerate(spec.trigger):
        if trig.then == "goto" and trig.leg not in names:
            out.append(_choice(file, f"trigger[{i}].leg", trig.leg, names, "leg name"))
    tl = spec.limits.time
    for i, s in enumerate(spec.schedule):
        if s.at > tl:
            out.append(
                Problem(
                    file,
                    f"schedule[{i}].at",
                    s.at,
                    f"after the time limit; allowed: ≤ {tl:g} s",
                    "warning",
                )
            )
    return out


def scenario_warnings(spec: ScenarioFile, vessel: VesselFile, file: str) -> list[Problem]:
    """Warnings that need the built plant (e.g. boiling water at bollard)."""
    from sim.engine.plant import build_plant
    from sim.physics.thruster import operating_point

    out = []
    try:
        plant = build_plant(vessel, spec.water)
    except Exception:  # errors are reported by the checks above
        return out
    vmax = plant.drive_max_voltage_v
    for u in plant.thrusters:
        op = operating_point(u.duct, plant.water, 0.0, voltage_v=vmax)
        i_unit = float(op.current_a)
        if i_unit > plant.drive_max_current_a:
            op = operating_point(u.duct, plant.water, 0.0, current_a=plant.drive_max_current_a)
        rise = float(op.outlet_temperature_rise_k)
        if plant.water.t_c + rise >= 100.0 or bool(op.boiling_risk):
            out.append(
                Problem(
                    file,
                    "water.temperature",
                    spec.water.temperature,
                    f"thruster {u.name!r} at full drive and zero speed would heat its "
                    f"duct water by {rise:.0f} K: boiling risk",
                    "warning",
                )
            )
    if not math.isfinite(plant.water.sigma_s_m) or plant.water.sigma_s_m < 0.5:
        out.append(
            Problem(
                file,
                "water.salinity",
                spec.water.salinity,
                f"conductivity only {plant.water.sigma_s_m:.3f} S/m: an MHD thruster "
                "gives little thrust in such fresh water",
                "warning",
            )
        )
    return out
