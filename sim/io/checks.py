"""Checks on input files that need more than one value: names that must be unique or exist, legs
that can never end, and physically suspicious (legal) designs that deserve a warning.

Two kinds of check live here:

* ``raw_*`` checks read the parsed TOML data as it is (a dict of whatever the file holds) and
  never assume a type, so they run even when single-key validation found errors: a file's
  duplicate names and dangling references are reported together with its wrong units.
* the other checks take the validated specs (plain SI floats) and run only once a file is valid
  key by key.

Problems show the value as the file wrote it (``"1.1 kn"``), not its SI conversion.
"""

from __future__ import annotations

import dataclasses
import difflib
import math
import re
from typing import Any

from sim.engine.plant import coil_margin, hull_model, thruster_unit
from sim.io.problems import MISSING, Problem
from sim.io.schema import DisplacementHull, LegSpec, ScenarioFile, ThrusterSpec, VesselFile
from sim.io.seam import coil_spec, hull_spec, plant_of, thruster_spec, vessel_spec, water
from sim.physics import battery, magnets
from sim.physics.constants import KNOT_M_S
from sim.physics.electrodes import SACRIFICIAL_ANODES
from sim.physics.errors import ModelRangeError
from sim.physics.hull.holtrop_mennen import HOLTROP_MENNEN_RANGES
from sim.physics.thruster import operating_point

__all__ = [
    "HULL_MODELS",
    "displacement_hull_problems",
    "raw_scenario_problems",
    "raw_value",
    "raw_vessel_problems",
    "scenario_problems",
    "scenario_warnings",
    "vessel_problems",
    "vessel_warnings",
]

GAP_TO_POLE_WARNING_RATIO = 4.0
"""Electrode gap / pole height above which a warning is given: a magnet circuit cannot keep a
uniform field across a wide, flat gap (project choice)."""

FRESH_WATER_SIGMA_S_M = 0.5
"""Conductivity below which the water counts as too fresh for useful MHD thrust [S/m]
(project choice; seawater of SP 35 at 15 °C has about 4.3 S/m, PSS-78)."""

_TOKEN = re.compile(r"([^.\[\]]+)|\[(\d+)\]")


def raw_value(data: Any, key: str) -> Any:
    """The value at a key path such as ``leg[2].until.distance`` in parsed TOML data, or the
    missing marker when the path does not lead anywhere."""
    node = data
    for name, index in _TOKEN.findall(key):
        if name:
            if not isinstance(node, dict) or name not in node:
                return MISSING
            node = node[name]
        else:
            i = int(index)
            if not isinstance(node, list) or i >= len(node):
                return MISSING
            node = node[i]
    return node


def _shown(data: Any, key: str, fallback: Any) -> Any:
    value = raw_value(data, key) if data is not None else MISSING
    return fallback if value is MISSING else value


def _choice(file: str, key: str, value: str, known, what: str) -> Problem:
    names = sorted(known)
    close = difflib.get_close_matches(value, names, n=1, cutoff=0.5)
    hint = f" (did you mean '{close[0]}'?)" if close else ""
    return Problem(
        file, key, value, f"unknown {what}{hint}; allowed: {', '.join(names) or '(none)'}"
    )


def _named(items: Any) -> list[tuple[int, str]]:
    """(index, name) of the entries of a raw array of tables that have a text name."""
    if not isinstance(items, list):
        return []
    return [
        (i, it["name"])
        for i, it in enumerate(items)
        if isinstance(it, dict) and isinstance(it.get("name"), str)
    ]


def _duplicates(file: str, table: str, items: Any, what: str) -> list[Problem]:
    out = []
    first: dict[str, int] = {}
    for i, name in _named(items):
        if name in first:
            out.append(
                Problem(
                    file,
                    f"{table}[{i}].name",
                    name,
                    f"duplicate {what} name (also {table}[{first[name]}]); allowed: each name "
                    "used once",
                )
            )
        first.setdefault(name, i)
    return out


# --------------------------------------------------------------------------- vessel files


def raw_vessel_problems(data: dict, file: str) -> list[Problem]:
    """Errors visible in the raw vessel data whatever else is wrong with it."""
    return _duplicates(file, "thruster", data.get("thruster"), "thruster")


def vessel_problems(spec: VesselFile, data: dict, file: str) -> list[Problem]:
    """Errors in a valid-looking vessel file that only the physics models can see (e.g. the
    Holtrop–Mennen validity ranges, a duct the thruster model rejects)."""
    out = []
    hs = hull_spec(spec.hull)
    if isinstance(spec.hull, DisplacementHull):
        out.extend(displacement_hull_problems(spec.hull, data, file))
        # the regression ranges are checked above; the model checks what else it needs
        hs = dataclasses.replace(hs, check_ranges=False)
    if not any(p.key.endswith("_coefficient") and p.severity == "error" for p in out):
        try:
            hull_model(hs)
        except ModelRangeError as exc:
            p = _range_problem(file, "hull", type(spec.hull).model_fields, exc, data)
            out.append(Problem(p.file, p.key, p.value, p.message + _OTHER_HULLS))
        except (ValueError, ArithmeticError) as exc:
            out.append(Problem(file, "hull", _shown(data, "hull.model", MISSING), str(exc)))
    for i, t in enumerate(spec.thruster):
        try:
            thruster_unit(thruster_spec(t), spec.drive.max_current)
        except ModelRangeError as exc:
            out.append(_range_problem(file, f"thruster[{i}]", type(t).model_fields, exc, data))
        except (ValueError, ArithmeticError) as exc:
            out.append(Problem(file, f"thruster[{i}]", t.name, str(exc)))
        out.extend(coil_margin_problems(t, f"thruster[{i}]", data, file))
    return out


QUENCH_WARNING_FRACTION = 0.8
"""Load-line fraction I/I_c above which a superconducting coil draws a warning (common practice:
run at most about 80 % of the critical current on the load line)."""


def coil_margin_problems(t: ThrusterSpec, key: str, data: dict, file: str) -> list[Problem]:
    """The quench margin of a superconducting coil: an error when its operating point lies on or
    over the NbTi critical line (it would quench), a warning above
    :data:`QUENCH_WARNING_FRACTION` of the critical current."""
    if t.coil is None or t.coil.conductor != "nbti":
        return []
    try:
        m = coil_margin(coil_spec(t.coil))
    except ModelRangeError as exc:
        return [_range_problem(file, f"{key}.coil", type(t.coil).model_fields, exc, data)]
    ckey = f"{key}.coil.current"
    shown = _shown(data, ckey, t.coil.current)
    if m.load_fraction >= 1.0:
        return [
            Problem(
                file,
                ckey,
                shown,
                f"the coil is over the NbTi critical line at 4.2 K: I/I_c = {m.load_fraction:.2f} "
                f"(quench at {m.critical_current_a:.0f} A, peak field "
                f"{m.peak_field_at_critical_t:.2f} T on the load line); allowed: a current below "
                f"{m.critical_current_a:.0f} A, more superconductor_area or a lower peak_field",
            )
        ]
    if m.load_fraction > QUENCH_WARNING_FRACTION:
        return [
            Problem(
                file,
                ckey,
                shown,
                f"small quench margin: the coil runs at {m.load_fraction:.0%} of its critical "
                f"current on the load line ({m.critical_current_a:.0f} A); at most "
                f"{QUENCH_WARNING_FRACTION:.0%} is usual",
                "warning",
            )
        ]
    return []


HULL_MODELS: dict[str, str] = {
    "submerged-body": "a deeply submerged body of revolution",
    "displacement": "a surface ship by the Holtrop & Mennen regression",
    "table": "your own resistance curve, speed by speed, from model tests or another prediction",
}
"""The hull models a vessel file can choose (hull.model) and what each is for."""

_OTHER_HULLS = " (hull models: " + "; ".join(f"'{k}': {v}" for k, v in HULL_MODELS.items()) + ")"

_SHARE_TOLERANCE = 0.01
"""Relative agreement the Holtrop & Mennen model demands of given and derived coefficients."""


def displacement_hull_problems(hull: DisplacementHull, data: dict, file: str) -> list[Problem]:
    """Every disagreement among a displacement hull's coefficients and every proportion outside
    the Holtrop & Mennen regression data, all at once (the model itself stops at the first).

    Coefficient mismatches are errors. Proportions outside the regression data are errors with
    ``outside_range = "refuse"`` (the default) and warnings with ``"warn"``; each names the
    other hull models.
    """
    out: list[Problem] = []
    L, B, T = hull.waterline_length, hull.beam, hull.draft
    cb = hull.displaced_volume / (L * B * T)
    if not abs(hull.block_coefficient / cb - 1.0) <= _SHARE_TOLERANCE:
        out.append(
            Problem(
                file,
                "hull.block_coefficient",
                _shown(data, "hull.block_coefficient", hull.block_coefficient),
                f"disagrees with displaced_volume/(waterline_length·beam·draft) = {cb:.4f}; "
                "allowed: within 1 % of it (or correct the volume or the main dimensions)",
            )
        )
    cp = hull.block_coefficient / hull.midship_coefficient
    if not abs(hull.prismatic_coefficient / cp - 1.0) <= _SHARE_TOLERANCE:
        out.append(
            Problem(
                file,
                "hull.prismatic_coefficient",
                _shown(data, "hull.prismatic_coefficient", hull.prismatic_coefficient),
                f"disagrees with block_coefficient/midship_coefficient = {cp:.4f}; allowed: "
                "within 1 % of it",
            )
        )
    warn = hull.outside_range == "warn"
    figures = {
        "prismatic coefficient Cp": ("hull.prismatic_coefficient", hull.prismatic_coefficient),
        "length/beam L/B": ("hull.beam", L / B),
        "beam/draft B/T": ("hull.draft", B / T),
    }
    for name, (lo, hi) in HOLTROP_MENNEN_RANGES.items():
        key, value = figures[name]
        if lo <= value <= hi:
            continue
        what = (
            f"{name} = {value:.3g} lies outside the Holtrop & Mennen regression data "
            f"[{lo:g}, {hi:g}]"
        )
        if warn:
            out.append(
                Problem(
                    file,
                    key,
                    _shown(data, key, MISSING),
                    f"{what}: the resistance is extrapolated (outside_range = 'warn'), a rough "
                    f"estimate at best{_OTHER_HULLS}",
                    "warning",
                )
            )
        else:
            out.append(
                Problem(
                    file,
                    key,
                    _shown(data, key, MISSING),
                    f"{what}; allowed: proportions within it, or hull.outside_range = 'warn' to "
                    f"run with the regression extrapolated, or another hull model{_OTHER_HULLS}",
                )
            )
    return out


def _range_problem(file: str, table: str, fields, exc, data: dict) -> Problem:
    """A physics model's range error as a problem, at the file key it names when it names one."""
    name = re.sub(r"_(m|m2|m3|kg|s|n|w|v|a|t)$", "", str(exc.quantity))  # model names carry units
    key = f"{table}.{exc.quantity}" if exc.quantity in fields else table
    if key == table and name in fields:
        key = f"{table}.{name}"
    value = raw_value(data, key) if key != table else exc.value
    if value is MISSING:
        value = exc.value
    model = f" ({exc.model})" if exc.model else ""
    return Problem(
        file,
        key,
        value,
        f"{exc.quantity} = {exc.value!r} is outside the valid range{model}; allowed: {exc.allowed}",
    )


def vessel_warnings(spec: VesselFile, file: str, data: dict | None = None) -> list[Problem]:
    """Physically suspicious but legal choices."""
    out = []
    for i, t in enumerate(spec.thruster):
        key = f"thruster[{i}]"
        if t.field is None:  # magnet_blocks: the physics computes the field
            pass
        elif t.field == 0.0:
            out.append(
                Problem(
                    file,
                    f"{key}.field",
                    _shown(data, f"{key}.field", t.field),
                    "zero field: this thruster gives no thrust, it only heats the water and "
                    "makes gas",
                    "warning",
                )
            )
        if t.magnet == "permanent":
            br = max(g.br_tesla for g in magnets.NDFEB_GRADES.values())
            what = "the strongest NdFeB grade"
            if t.magnet_grade and t.magnet_grade.upper() in magnets.NDFEB_GRADES:
                br = magnets.NDFEB_GRADES[t.magnet_grade.upper()].br_tesla
                what = t.magnet_grade.upper()
            if t.field is not None and t.field > br:
                out.append(
                    Problem(
                        file,
                        f"{key}.field",
                        _shown(data, f"{key}.field", t.field),
                        f"a permanent-magnet circuit rarely gives a gap field above the "
                        f"remanence of its magnets ({what}: {br:g} T); check the design",
                        "warning",
                    )
                )
        if t.anode in SACRIFICIAL_ANODES:
            for k in ("overpotential", "chlorine_fraction"):
                if k in t.model_fields_set:
                    out.append(
                        Problem(
                            file,
                            f"{key}.{k}",
                            _shown(data, f"{key}.{k}", getattr(t, k)),
                            f"not used with the sacrificial anode '{t.anode}' (its drop comes "
                            "from the cathode's hydrogen kinetics, and it makes no chlorine)",
                            "warning",
                        )
                    )
        if t.coil is not None and t.coil.conductor != "nbti":
            c = t.coil
            p_w = c.current**2 * c.resistance if c.resistance is not None else c.voltage * c.current
            out.append(
                Problem(
                    file,
                    f"{key}.coil",
                    MISSING,
                    f"the coil of each unit draws {p_w:.4g} W from the pack all the time "
                    f"({p_w * t.units:.4g} W for {t.units} unit(s)), added to the constant load "
                    "(as hotel.cryocooler)",
                    "warning",
                )
            )
        if t.gap is None or t.pole_height is None:
            continue
        if t.gap > GAP_TO_POLE_WARNING_RATIO * t.pole_height:
            out.append(
                Problem(
                    file,
                    f"{key}.gap",
                    _shown(data, f"{key}.gap", t.gap),
                    f"electrode gap is {t.gap / t.pole_height:.1f}× the pole height; "
                    "a real magnet rarely fills such a wide, flat gap with a uniform field",
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
                    _shown(data, "drive.max_current", spec.drive.max_current),
                    f"at full drive and full charge the pack would carry about "
                    f"{demand / v_pack:.0f} A, above its rating of {pack_imax:.0f} A "
                    "(the drive will fold back)",
                    "warning",
                )
            )
    return out


# --------------------------------------------------------------------------- scenario files


def raw_scenario_problems(data: dict, file: str) -> list[Problem]:
    """Errors visible in the raw scenario data whatever else is wrong with it: duplicate leg and
    trigger names, triggers that jump to a leg that does not exist."""
    out = _duplicates(file, "leg", data.get("leg"), "leg")
    out += _duplicates(file, "trigger", data.get("trigger"), "trigger")
    legs = {name for _, name in _named(data.get("leg"))}
    triggers = data.get("trigger")
    if isinstance(triggers, list) and isinstance(data.get("leg"), list):
        for i, trig in enumerate(triggers):
            if not isinstance(trig, dict) or trig.get("then") != "goto":
                continue
            target = trig.get("leg")
            if isinstance(target, str) and target not in legs:
                out.append(_choice(file, f"trigger[{i}].leg", target, legs, "leg name"))
    return out


def _no_forward_thrust(leg: LegSpec) -> bool:
    """True when the leg's command gives no forward thrust (zero or reversed)."""
    return leg.setpoint <= 0.0


def _why_never(leg: LegSpec, water_current: float, derates: bool) -> dict[str, str]:
    """For each end condition of a leg that can never be reached, why not. A leg whose end
    conditions are all in the result can only end by a trigger or the run's time limit."""
    given = leg.until.given()
    why: dict[str, str] = {}
    idle = _no_forward_thrust(leg)
    for name, threshold in given.items():
        if name == "speed_above":
            if idle:
                why[name] = "with no forward thrust the vessel cannot speed up"
            elif leg.speed is not None and leg.speed < threshold:
                why[name] = (
                    f"the leg holds {leg.speed:g} m/s ({leg.speed / KNOT_M_S:.2f} kn), which "
                    f"never rises above {threshold:g} m/s ({threshold / KNOT_M_S:.2f} kn)"
                )
        elif name == "speed_below":
            if leg.speed is not None and leg.speed > threshold and not derates:
                why[name] = (
                    f"the leg holds {leg.speed:g} m/s ({leg.speed / KNOT_M_S:.2f} kn), above "
                    f"{threshold:g} m/s: it can only end at once, if it starts slower"
                )
        elif name in ("distance", "total_distance_above"):
            if idle and water_current <= 0.0:
                why[name] = (
                    "with no forward thrust and no following water current the vessel only "
                    "coasts to a stop"
                )
    return why if len(why) == len(given) else {}


def scenario_problems(
    spec: ScenarioFile, vessel: VesselFile | None, data: dict, file: str
) -> list[Problem]:
    """Errors (and a few warnings) in a scenario that is valid key by key."""
    out = []
    exits = [t.name for t in spec.trigger if t.then in ("goto", "stop")]
    derates = any(t.then == "derate" for t in spec.trigger)
    for i, leg in enumerate(spec.leg):
        why = _why_never(leg, spec.water.current, derates)
        if why:
            key = f"leg[{i}].until" + (f".{next(iter(why))}" if len(why) == 1 else "")
            text = f"leg {leg.name!r} can never end: " + "; ".join(why.values())
            if exits:
                out.append(
                    Problem(
                        file,
                        key,
                        raw_value(data, key),
                        text + f"; only a trigger ({', '.join(exits)}) or the time limit can "
                        "end it",
                        "warning",
                    )
                )
            else:
                out.append(
                    Problem(
                        file,
                        key,
                        raw_value(data, key),
                        text + "; allowed: an end condition the leg can reach (e.g. a duration)",
                    )
                )
        if (
            vessel is not None
            and leg.voltage is not None
            and abs(leg.voltage) > vessel.drive.max_voltage
        ):
            out.append(
                Problem(
                    file,
                    f"leg[{i}].voltage",
                    _shown(data, f"leg[{i}].voltage", leg.voltage),
                    f"above the drive's maximum voltage; allowed: ≤ {vessel.drive.max_voltage:g} V",
                )
            )
    if vessel is not None and not any(t.anode_mass is not None for t in vessel.thruster):
        tables = [(f"leg[{i}].until", leg.until) for i, leg in enumerate(spec.leg)]
        tables += [(f"trigger[{i}].when", trig.when) for i, trig in enumerate(spec.trigger)]
        for key, cond in tables:
            if cond.anode_spent:
                out.append(
                    Problem(
                        file,
                        f"{key}.anode_spent",
                        True,
                        "the vessel has no sacrificial anode with an anode_mass, so no anode "
                        "can be spent; allowed: a thruster with anode = 'aluminium_zinc_indium' "
                        "or 'zinc' and anode_mass, or leave anode_spent out",
                    )
                )
    st, lim = spec.start, spec.limits
    if st.state_of_charge <= lim.state_of_charge_min:
        out.append(
            Problem(
                file,
                "start.state_of_charge",
                _shown(data, "start.state_of_charge", st.state_of_charge),
                f"at or below limits.state_of_charge_min ({lim.state_of_charge_min:g}): the run "
                "would stop at once; allowed: a start above the minimum",
            )
        )
    tl = lim.time
    for i, s in enumerate(spec.schedule):
        if s.at > tl:
            out.append(
                Problem(
                    file,
                    f"schedule[{i}].at",
                    _shown(data, f"schedule[{i}].at", s.at),
                    f"after the time limit ({tl:g} s): it never acts",
                    "warning",
                )
            )
    return out


def scenario_warnings(
    spec: ScenarioFile, vessel: VesselFile, file: str, data: dict | None = None
) -> list[Problem]:
    """Warnings that need the built plant (e.g. boiling water at bollard)."""
    out = []
    try:
        plant = plant_of(vessel_spec(vessel), water(spec.water, spec.route, spec.tide))
    except (ModelRangeError, ValueError, ArithmeticError):  # reported by the checks above
        return out
    for i, leg in enumerate(spec.leg):
        if leg.speed is not None and abs(leg.speed) > plant.hull_max_speed_m_s:
            out.append(
                Problem(
                    file,
                    f"leg[{i}].speed",
                    _shown(data, f"leg[{i}].speed", leg.speed),
                    f"past Froude number {plant.hull_max_froude:g} "
                    f"({plant.hull_max_speed_m_s:.3g} m/s), the end of the data behind the hull "
                    "model (Holtrop & Mennen 1982): its resistance is extrapolated",
                    "warning",
                )
            )
    vmax = plant.drive_max_voltage_v
    for u in plant.thrusters:
        if u.open_field is not None:  # no duct water to boil: the Joule heat goes to the sea
            continue
        try:
            n = u.series_factor  # the physics solves the parallel equivalent of series wiring
            op = operating_point(u.duct, plant.water, 0.0, voltage_v=vmax / n)
            if float(op.current_a) > plant.drive_max_current_a * n:
                op = operating_point(
                    u.duct, plant.water, 0.0, current_a=plant.drive_max_current_a * n
                )
            rise = float(op.outlet_temperature_rise_k)
            boiling = bool(op.boiling_risk)
        except (ModelRangeError, ValueError, ArithmeticError):
            continue  # the run itself reports an operating point without a solution
        if plant.water.t_c + rise >= 100.0 or boiling:
            out.append(
                Problem(
                    file,
                    "water.temperature",
                    _shown(data, "water.temperature", spec.water.temperature),
                    f"thruster {u.name!r} at full drive and zero speed (bollard) would heat its "
                    f"duct water by {rise:.0f} K: boiling risk",
                    "warning",
                )
            )
    sigma = plant.water.sigma_s_m
    if not math.isfinite(sigma) or sigma < FRESH_WATER_SIGMA_S_M:
        out.append(
            Problem(
                file,
                "water.salinity",
                _shown(data, "water.salinity", spec.water.salinity),
                f"conductivity only {sigma:.3f} S/m: an MHD thruster gives little thrust in "
                "such fresh water",
                "warning",
            )
        )
    return out
