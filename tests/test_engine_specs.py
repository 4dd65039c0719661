"""The engine's own SI specs and the one seam from validated files to them (sim/io/seam.py);
the engine never imports the io layer; a plant rebuilt from a log's provenance is the plant
that was flown."""

from __future__ import annotations

import ast
import tomllib
from pathlib import Path

import pytest
from engine_helpers import ROOT, SCENARIOS, VESSELS, write_scenario

from sim import api
from sim.engine import conditions as cd
from sim.engine import spec
from sim.engine.plant import build_plant
from sim.io import seam
from sim.io.files import load_scenario, load_vessel
from sim.io.provenance import plant_from_provenance
from sim.physics.constants import KNOT_M_S, NAUTICAL_MILE_M

REL = 1e-12  # unit conversions of exact SI prefixes: only round-off may differ


def test_knot_and_nautical_mile_are_exact():
    # International nautical mile = 1852 m, knot = 1852 m per hour: exact by definition
    # (BIPM SI brochure, 9th ed., Table 8).
    assert NAUTICAL_MILE_M == 1852.0
    assert KNOT_M_S * 3600.0 == pytest.approx(1852.0, rel=1e-15)


def test_glasswort_vessel_maps_to_si_specs():
    path = VESSELS / "glasswort-drone.toml"
    raw = tomllib.loads(path.read_text(encoding="utf-8"))
    v = load_vessel(path).vessel_spec
    assert isinstance(v, spec.VesselSpec) and isinstance(v.hull, spec.SubmergedHullSpec)
    # The file's values with their units, converted by SI prefixes (common practice).
    t = raw["thruster"][0]
    assert (t["gap"], t["active_length"], t["wall_roughness"]) == ("50 mm", "0.8 m", "10 um")
    (thr,) = v.thrusters
    assert thr.gap_m == pytest.approx(50e-3, rel=REL)
    assert thr.pole_height_m == pytest.approx(50e-3, rel=REL)
    assert thr.active_length_m == pytest.approx(0.8, rel=REL)
    assert thr.wall_roughness_m == pytest.approx(10e-6, rel=REL)
    assert thr.field_t == pytest.approx(0.75, rel=REL)
    assert thr.magnet_heat_capacity_j_k == pytest.approx(9e3, rel=REL)  # "9 kJ/K"
    assert thr.housing_wetted_area_m2 == pytest.approx(0.55, rel=REL)
    assert (thr.units, thr.channels, thr.magnet_grade) == (2, 3, "N42SH")
    assert v.mass_kg == pytest.approx(165.0, rel=REL)
    assert v.hull.length_m == pytest.approx(2.6, rel=REL)
    assert v.hull.diameter_m == pytest.approx(0.32, rel=REL)
    assert v.added_mass_rule == "auto"
    assert v.battery.extra_resistance_ohm == pytest.approx(6e-3, rel=REL)  # "6 mohm"
    assert (v.battery.series, v.battery.parallel) == (14, 6)
    assert v.drive.max_current_a == pytest.approx(300.0, rel=REL)
    assert v.drive.max_voltage_v == pytest.approx(40.0, rel=REL)
    assert v.hotel_w == pytest.approx(45.0, rel=REL)


def test_glasswort_survey_maps_to_a_mission_spec():
    loaded = load_scenario(SCENARIOS / "glasswort-survey.toml")
    w, ms = loaded.water, loaded.mission_spec
    assert w.salinity == 33.5
    assert w.temperature_c == pytest.approx(14.0, rel=REL)
    assert w.depth_m == pytest.approx(4.0, rel=REL)
    # "-0.1 kn": one knot is 1852/3600 m/s by definition (common practice)
    assert w.current_m_s == pytest.approx(-0.1 * 1852.0 / 3600.0, rel=REL)
    assert ms.name == "Glasswort harbour-mouth survey"
    assert ms.sample_s == pytest.approx(5.0, rel=REL)
    assert ms.limits.time_s == pytest.approx(3 * 3600.0, rel=REL)  # "3 h"
    assert ms.limits.state_of_charge_min == 0.08
    assert ms.start.state_of_charge == 0.95
    out, survey, ret, loiter = ms.legs
    assert ret.until == (cd.Distance(700.0),) and ret.setpoint == pytest.approx(1.3 * KNOT_M_S)
    assert (out.mode, out.setpoint, out.until) == ("voltage", 28.0, (cd.Distance(600.0),))
    assert survey.mode == "speed"
    assert survey.setpoint == pytest.approx(1.1 * 1852.0 / 3600.0, rel=REL)  # "1.1 kn"
    assert survey.duration_s == pytest.approx(75 * 60.0, rel=REL)  # "75 min"
    # the duration is also a condition: its text names it in messages ("duration 75 min")
    assert survey.until == (cd.Duration(4500.0),) and survey.hotel_w == pytest.approx(70.0, rel=REL)
    assert loiter.until == (cd.SpeedBelow(0.05),)
    (trig,) = ms.triggers
    assert (trig.then, trig.leg, trig.when) == ("goto", "return", (cd.SocBelow(0.45),))
    (sched,) = ms.schedule
    assert sched.at_s == pytest.approx(1800.0, rel=REL)  # "30 min"
    assert sched.hotel_w == pytest.approx(55.0, rel=REL)


def test_conditions_keep_the_order_of_the_schema_fields():
    # The first condition that holds wins a tie, so the seam keeps one fixed order.
    from sim.io.schema import Conditions

    c = Conditions(speed_below="0.1 m/s", soc_below=0.3, distance="1 km", duration="1 h")
    assert seam.conditions(c) == (
        cd.Duration(3600.0),
        cd.Distance(1000.0),
        cd.SpeedBelow(0.1),
        cd.SocBelow(0.3),
    )


def test_water_built_directly_matches_the_seam():
    from sim.io.schema import WaterSpec

    ws = WaterSpec(salinity=35.0, temperature="15 degC", depth="10 m", current="0.2 m/s")
    assert seam.water(ws) == spec.Water(35.0, 15.0, depth_m=10.0, current_m_s=0.2)


def _imported_modules(path: Path) -> set[str]:
    """Every module a file imports, at the top, inside functions or under TYPE_CHECKING."""
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names.update(a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
            names.update(f"{node.module}.{a.name}" for a in node.names)
    return names


def test_engine_never_imports_the_io_layer():
    files = sorted((ROOT / "sim" / "engine").glob("*.py"))
    assert files
    for f in files:
        bad = sorted(m for m in _imported_modules(f) if m == "sim.io" or m.startswith("sim.io."))
        assert not bad, f"{f.name} imports {bad}"


def test_checks_do_not_import_the_loaders():
    # files.py imports checks.py; the shared Problem lives in problems.py so the import runs
    # one way only.
    mods = _imported_modules(ROOT / "sim" / "io" / "checks.py")
    assert not any(m.startswith("sim.io.files") for m in mods)


def test_plant_from_provenance_is_the_plant_flown(tmp_path):
    legs = '[[leg]]\nname = "idle"\nvoltage = "0 V"\nuntil = { duration = "1 min" }'
    water = 'salinity = 30.0\ntemperature = "12 degC"\ndepth = "3 m"\ncurrent = "0.1 m/s"'
    path = write_scenario(tmp_path, legs, water=water, limits="state_of_charge_min = 0.2")
    loaded = load_scenario(path)
    log = api.read_log(api.run_scenario(loaded, out=tmp_path / "x.h5").log_path)
    plant, limits, notes = plant_from_provenance(log)
    flown = build_plant(loaded.vessel.vessel_spec, loaded.water)
    assert plant == flown and notes == []
    assert plant.water.t_c == 12.0 and plant.water_current_m_s == 0.1
    assert limits == loaded.mission_spec.limits and limits.state_of_charge_min == 0.2
