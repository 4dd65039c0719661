"""Range and endurance (sim/analysis/reach.py): closed forms, agreement with the time-domain
engine, range from logs, and the water's effect."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from engine_helpers import VESSELS, scenario_text
from scipy.integrate import quad

from sim import api
from sim.analysis import reach
from sim.analysis.variants import apply_settings, render_toml, variant_vessel_data
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.io.files import load_scenario
from sim.physics import battery as bat


def _plant(water=None, **battery):
    v = api.load_vessel(VESSELS / "glasswort-drone.toml")
    spec = v.vessel_spec
    if battery:
        spec = dataclasses.replace(spec, battery=dataclasses.replace(spec.battery, **battery))
    return build_plant(spec, water or Water(salinity=35.0, temperature_c=15.0))


def _small_vessel(tmp_path, *settings) -> str:
    """The Glasswort drone with a one-string pack (and any further settings), as a file, so
    runs are short and the log's provenance holds the vessel actually flown."""
    data = variant_vessel_data(VESSELS / "glasswort-drone.toml")
    data = apply_settings(data, [("battery.parallel", 1), *settings], "test")
    path = tmp_path / "small.toml"
    path.write_text(render_toml(data), encoding="utf-8")
    return str(path)


def _ideal_cell(ocv, r0=0.0):
    """A cell with (almost) no resistance: R0 as given, a negligible RC pair."""
    soc = (0.0, 0.25, 0.5, 0.75, 1.0)
    return bat.CellParameters(
        name="ideal test cell",
        source="test",
        chemistry="test",
        capacity_ah=10.0,
        soc_points=soc,
        ocv_v=ocv,
        r0_ohm=(r0,) * 5,
        r1_ohm=(1e-9,) * 5,
        c1_f=(1e9,) * 5,
        v_min=2.0,
        v_max=4.5,
        max_discharge_current_a=1e4,
        max_charge_current_a=1e4,
        mass_kg=1.0,
        cp_j_kg_k=1000.0,
        activation_energy_j_mol=0.0,  # R independent of T
    )


# ------------------------------------------------------------------ closed forms


def test_lossless_pack_at_constant_power_lasts_stored_energy_over_power():
    # Energy conservation for an ideal source (Plett 2015, ch. 2: with R0 = R1 = 0 the terminal
    # voltage is the OCV, so P·dt = OCV·I·dt = 3600·Q·OCV·dSOC): t = 3600 Q ∫OCV dSOC / P.
    # ∫OCV dSOC is taken independently with scipy quad of the interpolated table.
    ocv = (3.0, 3.5, 3.7, 3.9, 4.1)
    cell = _ideal_cell(ocv)
    plant = dataclasses.replace(_plant(), pack=bat.Pack(cell, 14, 2))
    power = 1234.5
    integral, _ = quad(
        lambda s: np.interp(s, cell.soc_points, ocv), 0.1, 0.9, points=[0.25, 0.5, 0.75]
    )
    usable_j = 3600.0 * 2 * 10.0 * 14 * integral
    end = reach.pack_endurance(plant, power, soc=0.9, soc_min=0.1)
    assert end.cutoff == reach.CUT_SOC
    assert end.time_s == pytest.approx(usable_j / power, rel=1e-7)
    assert reach.stored_energy_j(plant.pack, 0.9, 0.1) == pytest.approx(usable_j, rel=1e-12)
    # with zero demand nothing is drawn: unlimited endurance
    assert math.isinf(reach.pack_endurance(plant, 0.0, soc=0.9).time_s)


def test_flat_ocv_with_resistance_gives_the_quadratic_current():
    # Circuit theory: constant P from E through R gives R·I² − E·I + P = 0, I = (E − √(E² −
    # 4RP))/(2R), constant while E is; then t = 3600·Q·ΔSOC/I. The sag makes it shorter than
    # the lossless E·3600·Q·ΔSOC/P.
    cell = _ideal_cell((3.7,) * 5, r0=0.02)
    pack = bat.Pack(cell, 10, 1)
    plant = dataclasses.replace(_plant(), pack=pack, undervoltage_margin_v=0.0)
    e, r, p = 37.0, 0.2, 400.0
    i = (e - math.sqrt(e * e - 4 * r * p)) / (2 * r)
    end = reach.pack_endurance(plant, p, soc=0.8, soc_min=0.2, temp_c=20.0)
    assert end.time_s == pytest.approx(3600 * 10.0 * 0.6 / i, rel=1e-6)
    assert end.time_s < 3600 * 10.0 * 0.6 * e / p


def test_power_limit_cuts_off_before_the_soc_minimum():
    # Circuit theory: at constant P the current rises as the OCV falls, and the discharge ends
    # where the cell voltage OCV − I·R0 reaches v_min plus the drive's margin (the engine's
    # fold-back point), here before the SOC minimum: 4 W from one cell of 0.3 Ω.
    cell = _ideal_cell((2.5, 3.0, 3.5, 3.8, 4.0), r0=0.3)
    pack = bat.Pack(cell, 1, 1)
    plant = dataclasses.replace(_plant(), pack=pack, undervoltage_margin_v=0.05)
    end = reach.pack_endurance(plant, 4.0, soc=1.0, soc_min=0.0, temp_c=25.0)
    assert end.cutoff == reach.CUT_POWER
    assert 0.0 < end.end_soc < 0.25
    assert end.end_cell_v == pytest.approx(2.05, abs=1e-6)


# ------------------------------------------------------------------ against the engine

HOLD = """
[[leg]]
name = "hold"
speed = "{v} m/s"
until = {{ {until} }}
"""


def _hold(
    tmp_path, vessel, v, *, soc0, soc_min, until='duration = "200 h"', extra="", name="hold.toml"
):
    path = tmp_path / name
    path.write_text(
        scenario_text(
            HOLD.format(v=v, until=until),
            vessel=vessel,
            extra=extra,
            start=f'state_of_charge = {soc0}\nspeed = "{v} m/s"',
            limits=f'time = "200 h"\nstate_of_charge_min = {soc_min}',
            output='sample = "600 s"',
        ),
        encoding="utf-8",
    )
    return load_scenario(path)


def test_steady_range_curve_matches_time_domain_runs_and_peak(tmp_path):
    # Cross-check of two independent paths: the steady curve (thrust = resistance, pack
    # integrated alone) against the full time-domain engine holding each speed from the same
    # start state to the same cut-off (PyBaMM-style agreement of a reduced and a fuller model in
    # their common limit). Issue bound 1 %.
    vessel = _small_vessel(tmp_path)
    first = _hold(tmp_path, vessel, 0.1, soc0=0.25, soc_min=0.05)
    plant = api.plant_for(first)
    curve = reach.range_curve(plant, soc=0.25, soc_min=0.05, points=16)
    best = curve.best_range
    assert best is not None and best.feasible
    flown = {}
    for f in (0.7, 1.0, 1.3):
        v = best.speed_m_s * f
        steady = reach.range_at_speed(plant, v, soc=0.25, soc_min=0.05)
        run = api.run_scenario(
            _hold(tmp_path, vessel, v, soc0=0.25, soc_min=0.05), write_log=False
        ).result
        assert run.ending_reason.startswith("pack empty")
        assert steady.range_m == pytest.approx(run.summary["distance_m"], rel=0.01)
        assert steady.endurance_s == pytest.approx(run.summary["duration_s"], rel=0.01)
        flown[f] = run.summary["distance_m"]
    # the best-range speed of the curve is where the time-domain range peaks
    assert flown[1.0] > flown[0.7] and flown[1.0] > flown[1.3]
    # and the refined optimum is no worse than any grid point
    assert best.range_m >= np.nanmax(curve.range_m) * (1 - 1e-9)


SAG = ("battery.conductance_to_water", "500 W/K")  # battery held near water temperature


def test_range_from_a_log_equals_the_distance_flown_to_cut_off(tmp_path):
    # A speed hold at about 2C: the cell-voltage floor ends it at SOC ≈ 0.33, long before the
    # SOC minimum. Issue bound 0.5 %: (a) the log of the whole run has no range left; (b) a log
    # stopped part way predicts the distance the whole run flew. Stored energy ÷ power (no sag)
    # would overestimate the range by far.
    vessel = _small_vessel(tmp_path, SAG)
    cut = 'cell_voltage_below = "3.05001 V"'  # v_min 3.0 V + the drive's 0.05 V margin
    full = api.run_scenario(
        _hold(tmp_path, vessel, 0.6, soc0=0.8, soc_min=0.02, until=cut, name="full.toml"),
        out=tmp_path / "full.h5",
    )
    stop = '[[trigger]]\nname = "part-way"\nwhen = { soc_below = 0.7 }\nthen = "stop"\n'
    part = api.run_scenario(
        _hold(
            tmp_path, vessel, 0.6, soc0=0.8, soc_min=0.02, until=cut, extra=stop, name="part.toml"
        ),
        out=tmp_path / "part.h5",
    )
    flown = full.result.summary["distance_m"]
    assert full.result.summary["end_state_of_charge"] > 0.2  # the voltage floor ended it
    assert part.result.summary["distance_m"] < 0.3 * flown
    r_full = reach.range_from_log(full.log_path, best_speed=False)
    assert r_full.total_range_m == pytest.approx(flown, rel=0.005)
    assert r_full.at_last_leg.range_m < 0.005 * flown
    r_part = reach.range_from_log(part.log_path, best_speed=False)
    assert not r_part.ending_reason.startswith("mission")
    assert r_part.total_range_m == pytest.approx(flown, rel=0.005)
    assert r_part.at_last_leg.endurance.cutoff == reach.CUT_POWER
    naive = (
        r_part.distance_m
        + r_part.stored_energy_j / r_part.at_last_leg.power_w * r_part.at_last_leg.ground_speed_m_s
    )
    assert naive > 1.5 * flown
    # reserve: stopping at a higher SOC leaves less range
    r_res = reach.range_from_log(part.log_path, reserve_soc=0.5, best_speed=False)
    assert 0 < r_res.reserve_at_last_leg.range_m < r_res.at_last_leg.range_m


def test_range_from_a_partial_log_finds_the_best_speed(tmp_path):
    # From the end state of a partial log the best-range speed is searched and beats the last
    # leg's (fast) speed on range (the curve peaks at low speed for this craft).
    vessel = _small_vessel(tmp_path)
    stop = '[[trigger]]\nname = "early"\nwhen = { time_after = "5 min" }\nthen = "stop"\n'
    out = api.run_scenario(
        _hold(tmp_path, vessel, 0.5, soc0=0.5, soc_min=0.1, extra=stop), out=tmp_path / "early.h5"
    )
    r = reach.range_from_log(out.log_path, speeds_m_s=np.geomspace(0.05, 0.6, 10))
    assert r.at_best_speed is not None
    assert r.at_best_speed.range_m > r.at_last_leg.range_m
    assert r.legs[-1].name == "hold"
    assert r.end_soc == pytest.approx(out.result.summary["end_state_of_charge"])


def test_fresher_water_gives_a_shorter_best_range():
    # PSS-78 / TEOS-10 (gsw): conductivity falls with salinity, so the same thrust costs more
    # Joule loss (J²/σ) and the range shrinks (the "fresher water, shorter range").
    ranges = []
    for sp in (35.0, 20.0, 8.0):
        plant = _plant(Water(salinity=sp, temperature_c=15.0))
        c = reach.range_curve(plant, np.geomspace(0.08, 0.4, 7), soc=0.3, soc_min=0.1, refine=False)
        ranges.append(c.best_range.range_m)
    assert ranges[0] > ranges[1] > ranges[2]


def test_reach_re_exports_the_three_concern_modules():
    # Issue 8 split reach.py by concern; old imports (`from sim.analysis.reach import ...`)
    # must keep giving the very same objects.
    from sim.analysis import endurance, log_range, range_curves

    homes = {}
    for mod in (endurance, log_range, range_curves):
        homes.update({name: getattr(mod, name) for name in mod.__all__})
    assert set(reach.__all__) == set(homes)
    for name in reach.__all__:
        assert getattr(reach, name) is homes[name], name
