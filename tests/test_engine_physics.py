"""Engine physics fixed after the physics review (issue 9): charge fold-back, busbar heat, the
duct heat balance, hull interaction, the opt-in gas and end-effect models, series channels, the
field of magnet blocks, the efficiency names, the Holtrop–Mennen range and the Chen (2006) cell.

Each item is checked against a published value (or common practice), an identity and a limiting
case."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from engine_helpers import VESSELS

from sim import api
from sim.engine.mission import MissionRunner, sample_events
from sim.engine.model import I_TB, Control, VesselModel, initial_state
from sim.engine.plant import build_plant
from sim.engine.spec import LegSpec, MagnetBlocksSpec, MissionSpec, SolverSpec, StartSpec, Water
from sim.engine.steady import steady_at_speed
from sim.engine.summary import summarise, upgrade_summary
from sim.physics import battery as bat
from sim.physics import magnet_gap, magnets
from sim.physics.duct_heat import duct_heat
from sim.physics.thruster import operating_point

WATER = Water(salinity=35.0, temperature_c=15.0)


def _vessel(name: str):
    return api.load_vessel(VESSELS / name).vessel_spec


def _halite(**thruster_changes):
    """The Halite concept craft without hotel or cryocooler load (so that regeneration
    charges the pack), optionally with changed thruster keys."""
    v = dataclasses.replace(_vessel("halite-concept.toml"), hotel_w=0.0, cryocooler_w=0.0)
    if thruster_changes:
        t = dataclasses.replace(v.thrusters[0], **thruster_changes)
        v = dataclasses.replace(v, thrusters=(t,))
    return v


def _glasswort(**thruster_changes):
    v = _vessel("glasswort-drone.toml")
    if thruster_changes:
        t = dataclasses.replace(v.thrusters[0], **thruster_changes)
        v = dataclasses.replace(v, thrusters=(t,))
    return v


def _snap(plant, *, soc=0.6, speed=3.0, mode="voltage", setpoint=2.0, hotel_w=0.0):
    model = VesselModel(plant)
    model.control = Control(mode=mode, setpoint=setpoint, hotel_w=hotel_w)
    y = initial_state(plant, soc, speed, 20.0, 20.0)
    return model, y, model.evaluate(0.0, y)


# ---------------------------------------------------------------- 1. charge limits


def test_charge_limit_of_a_full_nmc_cell_is_zero():
    # NMC/graphite cells charge to 4.2 V (common practice); the drive keeps 0.05 V below it.
    # Limiting case: at SOC 1 the open-circuit voltage 4.19 V (Huria et al. 2012 table) is
    # above the ceiling 4.15 V, so a full pack accepts no charge at all.
    pack = bat.Pack(cell=bat.NMC_POUCH_HURIA2012, n_series=1, n_parallel=1)
    assert bat.NMC_POUCH_HURIA2012.v_max == 4.2
    assert bat.pack_charge_limit_w(pack, 1.0, 0.0, 20.0, overvoltage_margin_v=0.05) == 0.0
    assert bat.pack_charge_limit_w(pack, 1.0, 0.0, 20.0) > 0.0  # 4.19 V < 4.2 V: a little


def test_charge_limit_is_the_boundary_of_the_cell_limits():
    # Identity: charging at exactly the limit power puts the cell at its ceiling (voltage-bound,
    # SOC 0.9: OCV 4.08 V) or at its 1C charge rating of 27.63 A (current-bound, SOC 0.5),
    # Huria et al. (2012) capacity; 1C charge is common practice for NMC.
    pack = bat.Pack(cell=bat.NMC_POUCH_HURIA2012, n_series=14, n_parallel=6)
    lim = bat.pack_charge_limit_w(pack, 0.9, 0.0, 20.0, overvoltage_margin_v=0.05)
    op = bat.solve_current_for_power(pack, 0.9, 0.0, 20.0, -lim)
    assert op.cell_v == pytest.approx(4.15, abs=1e-9)
    assert -op.current_a < 6 * 27.63
    lim = bat.pack_charge_limit_w(pack, 0.5, 0.0, 20.0, overvoltage_margin_v=0.05)
    op = bat.solve_current_for_power(pack, 0.5, 0.0, 20.0, -lim)
    assert op.current_a == pytest.approx(-6 * 27.63, rel=1e-9)
    assert op.cell_v < 4.15


def test_drive_folds_back_regeneration_to_the_charge_limit():
    plant = build_plant(_halite(), WATER)
    # braking at 3 m/s with 2 V across ducts whose EMF uB·gap is about 8 V regenerates
    _, _, free = _snap(plant, soc=0.5)
    assert free.thr_power_w < 0 and free.pack_power_w < 0 and not free.charge_folded
    # limiting case: a full pack accepts nothing, so the drive feeds nothing back
    _, _, full = _snap(plant, soc=0.999)
    assert full.charge_folded and full.pack_power_w == pytest.approx(0.0, abs=1e-6)
    # a pack whose cells may take only 5 mA each: fed back power = the pack's charge limit
    cell = dataclasses.replace(bat.NMC_POUCH_HURIA2012, max_charge_current_a=0.005)
    pack = bat.Pack(cell=cell, n_series=200, n_parallel=40, extra_series_resistance_ohm=0.02)
    small = dataclasses.replace(plant, pack=pack)
    model, _, s = _snap(small, soc=0.5)
    limit = model.pack_charge_limit_w(0.5, 0.0, 20.0)
    assert 0.0 < limit < -free.pack_power_w
    assert s.charge_folded
    assert s.pack_power_w == pytest.approx(-limit, rel=1e-6)
    assert s.pack_current_a == pytest.approx(-40 * 0.005, rel=1e-6)


def test_charge_fold_back_is_logged_and_announced():
    plant = build_plant(_halite(), WATER)
    mission = MissionSpec(
        name="brake",
        legs=(LegSpec(name="brake", mode="voltage", setpoint=2.0, duration_s=20.0),),
        start=StartSpec(state_of_charge=0.999, speed_m_s=3.0),
        sample_s=5.0,
    )
    r = MissionRunner(plant, mission).run()
    assert np.all(r.series["charge_folded"][:-1] == 1)
    assert np.all(r.series["pack_power_w"] >= -1e-6)
    assert [e["kind"] for e in r.events].count("charge fold-back") == 1
    assert r.summary["charge_folded_s"] == pytest.approx(20.0)


# ---------------------------------------------------------------- 2. busbar heat


def test_busbar_loss_is_joule_heat_outside_the_cells():
    # Joule's law: I²R; identity: cell heat + busbar loss = the pack's whole heat
    pack = bat.Pack(cell=bat.NMC_POUCH_HURIA2012, n_series=14, n_parallel=6,
                    extra_series_resistance_ohm=0.006)  # fmt: skip
    assert bat.busbar_loss_w(pack, 100.0) == pytest.approx(60.0, rel=1e-12)
    both = bat.heat_generation_w(pack, 100.0, 0.5, 20.0, 0.3)
    cells = bat.heat_generation_w(pack, 100.0, 0.5, 20.0, 0.3, include_busbars=False)
    assert both - cells == pytest.approx(60.0, rel=1e-12)
    # limiting case: without busbars there is no busbar loss
    bare = dataclasses.replace(pack, extra_series_resistance_ohm=0.0)
    assert bat.busbar_loss_w(bare, 100.0) == 0.0


def test_engine_warms_the_cells_with_cell_heat_only():
    plant = build_plant(_glasswort(), WATER)
    model, y, s = _snap(plant, speed=1.0, setpoint=30.0)
    assert s.busbar_w == pytest.approx(s.pack_current_a**2 * 0.006, rel=1e-12)
    dy = model.rhs(0.0, y)
    # lumped energy balance (Bernardi et al. 1985): m c_p dT/dt = Q_cells − UA (T − T_water)
    q = dy[I_TB] * plant.pack.thermal_mass_j_k + plant.battery_ua_w_k * (20.0 - 15.0)
    cells = bat.heat_generation_w(plant.pack, s.pack_current_a, 0.6, 20.0, 0.0, False)
    assert q == pytest.approx(cells, rel=1e-9)
    assert q < cells + s.busbar_w


# ---------------------------------------------------------------- 3. duct heat


def test_bulk_duct_rise_is_the_energy_balance():
    plant = build_plant(_glasswort(), WATER)
    _, _, s = _snap(plant, speed=1.0, setpoint=30.0)
    u, op = plant.thrusters[0], s.ops[0]
    w = plant.water
    mcp = w.rho_kg_m3 * u.duct.total_area_m2 * abs(op.duct_velocity_m_s) * w.cp_j_kg_k
    heat = op.joule_loss_w + op.friction_loss_w + u.overpotential_v * abs(op.current_a)
    # steady-flow energy balance ΔT = (Joule + friction + electrode) / (ṁ c_p)
    assert s.duct_rise_k[0] == pytest.approx(heat / mcp, rel=1e-12)
    assert s.duct_rise_k[0] > s.duct_joule_rise_k[0]
    # the Joule part alone is the thruster's J²L/(σρc_p u) (REFERENCES.md, energy balance)
    assert op.joule_loss_w / mcp == pytest.approx(s.duct_joule_rise_k[0], rel=1e-9)


def test_duct_heat_published_value_and_limits():
    # 1 kW into 1 kg/s of seawater (c_p 3993.08 J/(kg·K) at SP 35, 15 °C, gsw.cp_t_exact)
    h = duct_heat(600.0, 300.0, 0.5, 200.0, 1.0, 1.0 / 1025.9765, 1025.9765, 3993.08)
    assert h.electrode_w == pytest.approx(100.0)
    assert h.wall_w == pytest.approx(400.0)  # electrode surfaces + friction at the walls
    assert h.rise_k == pytest.approx(1000.0 / 3993.08, rel=1e-12)
    # limiting case: nothing dissipated, no rise
    assert duct_heat(0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1000.0, 4000.0).rise_k == 0.0


# ---------------------------------------------------------------- 4. hull interaction


def test_wake_fraction_lowers_the_inflow_speed_and_thrust_deduction_the_thrust():
    w, t = 0.2, 0.15  # single-screw-like values (Harvald 1983; from memory)
    base = build_plant(_halite(), WATER)
    hull = build_plant(_halite(wake_fraction=w, thrust_deduction=t), WATER)
    _, _, s = _snap(hull, speed=3.0, setpoint=60.0)
    _, _, s0 = _snap(base, speed=3.0 * (1 - w), setpoint=60.0)
    # identity: the thruster works at V_A = V(1 − w) exactly as a free one at that speed
    assert s.thrust_n[0] == pytest.approx(s0.thrust_n[0], rel=1e-12)
    assert s.total_thrust_n == pytest.approx(s.thrust_n[0] * (1 - t), rel=1e-12)
    # hull efficiency η_H = T_eff·V / (T·V_A) = (1 − t)/(1 − w) (Harvald 1983; common practice)
    eta_h = s.total_thrust_n * 3.0 / (s.thrust_n[0] * 3.0 * (1 - w))
    assert eta_h == pytest.approx((1 - t) / (1 - w), rel=1e-12)
    assert s.interaction_w == pytest.approx(s.thrust_n[0] * 3.0 * (t - w), rel=1e-9)
    # limiting case: w = t = 0 is the vessel without hull interaction
    _, _, z = _snap(build_plant(_halite(wake_fraction=0.0, thrust_deduction=0.0), WATER))
    _, _, b = _snap(base)
    assert z.total_thrust_n == b.total_thrust_n and z.interaction_w == pytest.approx(0.0)


def test_energy_balance_with_hull_interaction():
    plant = build_plant(_halite(wake_fraction=0.2, thrust_deduction=0.1), WATER)
    mission = MissionSpec(
        name="run",
        legs=(LegSpec(name="go", mode="voltage", setpoint=80.0, duration_s=300.0),),
        start=StartSpec(state_of_charge=0.8, speed_m_s=1.0),
        # conservation of the model, not of the integrator: tighter than the default rtol
        solver=SolverSpec(rtol=1e-8),
    )
    r = MissionRunner(plant, mission).run()
    t = r.totals
    ke = 0.5 * plant.total_mass_kg * (r.final_state[0] ** 2 - 1.0)
    # conservation: thruster electrical energy = losses + thrust work in the inflow frame;
    # thrust work = T_eff·V work + interaction; T_eff·V work = hull work + ΔKE
    thr = t["energy_pack_terminal_j"] - t["energy_drive_loss_j"] - t["energy_hotel_j"]
    parts = (
        t["energy_joule_j"]
        + t["energy_electrode_j"]
        + t["energy_friction_j"]
        + t["energy_wake_j"]
        + t["energy_useful_j"]
        + t["energy_hull_interaction_j"]
    )
    assert parts == pytest.approx(thr, rel=1e-5)
    assert t["energy_useful_j"] == pytest.approx(t["energy_hull_j"] + ke, rel=1e-5)
    assert r.summary["energy_hull_interaction_j"] < 0  # t < w: the hull gives some back


# ---------------------------------------------------------------- 5. gas and end effects


@pytest.mark.parametrize("gas, ends", [("bruggeman", True), ("maxwell", False), ("none", True)])
def test_gas_and_end_channels_match_the_thruster_model(gas, ends):
    plant = build_plant(_glasswort(gas_model=gas, gas_slip_ratio=1.5, end_effects=ends), WATER)
    model, _, s = _snap(plant, speed=1.0, setpoint=30.0)
    ex = model.duct_extras(s, 1.0)
    u = plant.thrusters[0]
    op = operating_point(u.duct, plant.water, 1.0, voltage_v=30.0)
    # identity with the vectorised thruster model (same physics, independent code path)
    assert ex["end_current_a"][0] == pytest.approx(float(op.end_current_a) * u.units, rel=1e-6)
    assert ex["void_mean"][0] == pytest.approx(float(op.gas_void_fraction_mean), rel=1e-6)
    assert ex["void_outlet"][0] == pytest.approx(float(op.gas_void_fraction_outlet), rel=1e-6)
    # homogeneous flow: the outlet void fraction exceeds the length mean (gas accumulates)
    assert ex["void_outlet"][0] > ex["void_mean"][0] > 0


def test_gas_lowers_the_current_and_defaults_are_unchanged():
    # Bruggeman (1935): σ/σ0 = (1 − ε)^1.5 < 1, so the same voltage drives less current
    _, _, plain = _snap(build_plant(_glasswort(), WATER), speed=1.0, setpoint=30.0)
    bru = build_plant(_glasswort(gas_model="bruggeman"), WATER)
    _, _, gas = _snap(bru, speed=1.0, setpoint=30.0)
    assert gas.current_a[0] < plain.current_a[0]
    # limiting case: the defaults are the model without gas and end effects
    _, _, off = _snap(build_plant(_glasswort(gas_model="none", end_effects=False), WATER),
                      speed=1.0, setpoint=30.0)  # fmt: skip
    assert off.current_a == plain.current_a and off.thrust_n == plain.thrust_n


# ---------------------------------------------------------------- 6. series channels


def test_series_channels_same_power_voltage_times_n_current_over_n():
    # common practice (REFERENCES.md): N channels of the same field and length wired in series
    # take N× the voltage at 1/N of the current, for the same power and thrust
    par = build_plant(_glasswort(), WATER)
    ser = build_plant(_glasswort(channel_wiring="series"), WATER)
    n = par.thrusters[0].duct.n_channels
    _, _, a = _snap(par, speed=1.0, setpoint=12.0)
    _, _, b = _snap(ser, speed=1.0, setpoint=12.0 * n)  # within the drive's 40 V
    assert b.thr_power_w == pytest.approx(a.thr_power_w, rel=1e-12)
    assert b.total_thrust_n == pytest.approx(a.total_thrust_n, rel=1e-12)
    assert b.voltage_v[0] == pytest.approx(n * a.voltage_v[0], rel=1e-12)
    assert b.current_a[0] == pytest.approx(a.current_a[0] / n, rel=1e-12)
    assert b.h2 == pytest.approx(a.h2, rel=1e-12)  # the same charge passes every channel pair
    # limiting case: one channel is the same in both wirings
    one = _glasswort(channels=1)
    _, _, c = _snap(build_plant(one, WATER), speed=1.0, setpoint=20.0)
    one_s = dataclasses.replace(one.thrusters[0], channel_wiring="series")
    _, _, d = _snap(build_plant(dataclasses.replace(one, thrusters=(one_s,)), WATER),
                    speed=1.0, setpoint=20.0)  # fmt: skip
    assert c.thrust_n == d.thrust_n and c.current_a == d.current_a


# ---------------------------------------------------------------- 7. magnet blocks


def test_block_field_matches_the_reference_values():
    # two 50×50×25 mm blocks, Br 1.3 T, facing across 20 mm: 0.574954 T at the centre,
    # 0.551 T at 10 mm and 0.415 T at 20 mm off-axis (magpylib 6.3.0, REFERENCES.md)
    b = magnet_gap.facing_blocks_field_z_t(1.3, 0.05, 0.05, 0.025, 0.02, [0, 0.01, 0.02], 0, 0.01)
    assert b[0] == pytest.approx(0.574954, abs=2e-6)
    assert b[1] == pytest.approx(0.551, abs=1e-3)
    assert b[2] == pytest.approx(0.415, abs=1e-3)


def test_block_field_against_magpylib():
    magpy = pytest.importorskip("magpylib")
    c = magpy.magnet.Cuboid(polarization=(0, 0, 1.2), dimension=(0.06, 0.03, 0.02))
    pts = np.array([[0.013, 0.007, 0.03], [-0.05, 0.02, -0.015], [0.0, 0.0, 0.011]])
    ref = c.getB(pts)[:, 2]  # magpylib, general-purpose reference library
    got = magnet_gap.block_field_z_t(1.2, 0.06, 0.03, 0.02, pts[:, 0], pts[:, 1], pts[:, 2])
    assert np.allclose(got, ref, rtol=1e-9, atol=1e-12)


def test_mean_field_limits_and_plant():
    # limiting case: blocks much wider and longer than the gap and much thicker than wide fill
    # it with Br (each semi-infinite block gives Br/2 at its face; Furlani 2001)
    big = magnet_gap.facing_blocks_mean_field_t(1.3, 40.0, 40.0, 4e4, 0.01, 0.05, 0.5)
    assert big == pytest.approx(1.3, rel=1e-3)
    # the mean over a wide channel lies below the centre value (the field falls off-axis)
    mean = magnet_gap.facing_blocks_mean_field_t(1.3, 0.05, 0.05, 0.025, 0.02, 0.04, 0.04)
    assert mean < 0.574954
    blocks = MagnetBlocksSpec(width_m=0.06, length_m=0.8, thickness_m=0.03, grade="n42sh")
    plant = build_plant(_glasswort(field_t=None, magnet_blocks=blocks), WATER)
    u = plant.thrusters[0]
    br = magnets.NDFEB_GRADES["N42SH"].br_tesla
    want = magnet_gap.facing_blocks_mean_field_t(br, 0.06, 0.8, 0.03, 0.05, 0.05, 0.8)
    assert u.b_ref_tesla == pytest.approx(want, rel=1e-12) and 0.3 < want < br
    assert u.magnet_max_c == 150.0  # grade suffix SH (magnet makers' tables, common practice)


# ---------------------------------------------------------------- 8. efficiency names


def test_efficiency_channels_carry_the_documented_names():
    out = api.run_scenario(VESSELS.parent / "scenarios" / "glasswort-survey.toml",
                           write_log=False)  # fmt: skip
    s = out.result.series
    for name in ("eta_electrical", "eta_hydraulic", "eta_overall"):
        assert name in s
    assert "efficiency_overall" not in s
    drive = s["eta_overall"] > 0
    # docs/efficiencies.md: η_o = η_el·η_h
    assert np.allclose(
        s["eta_overall"][drive], s["eta_electrical"][drive] * s["eta_hydraulic"][drive], rtol=1e-9
    )
    # an old log (old channel names) still gives a summary, and an old summary the new keys
    old = {("efficiency_overall" if k == "eta_overall" else k): v for k, v in s.items()}
    old = {k: v for k, v in old.items() if k not in ("charge_folded", "busbar_loss_w")}
    alone = summarise(old, ending_reason="x")
    assert alone["best_eta_overall"] == out.result.summary["best_eta_overall"]
    assert upgrade_summary({"mean_overall_efficiency": 0.1})["mean_eta_overall"] == 0.1


# ---------------------------------------------------------------- 9. hull range, Chen cell


def test_holtrop_mennen_range_is_flagged_once():
    plant = build_plant(_vessel("halite-concept.toml"), WATER)
    # Holtrop & Mennen (1982) fitted their regression up to Fn = 0.45, Fn = V/√(gL)
    assert plant.hull_max_speed_m_s == pytest.approx(0.45 * math.sqrt(9.80665 * 32.0), rel=1e-3)
    row = {"speed_through_water_m_s": plant.hull_max_speed_m_s * 1.01, "charge_folded": 0}
    seen: set = set()
    assert [k for k, _ in sample_events(plant, None, row, seen)] == ["hull model range"]
    assert sample_events(plant, row, row, seen) == []  # once per run
    slow = dict(row, speed_through_water_m_s=2.0)
    assert sample_events(plant, None, slow, set()) == []
    assert steady_at_speed(plant, 3.0).hull_in_range


def test_chen_cell_follows_the_closed_form_near_empty():
    # Chen & Rincón-Mora (2006), IEEE Trans. Energy Conversion 21(2):504–511:
    # Voc = −1.031·e^(−35·SOC) + 3.685 + 0.2156·SOC − 0.1178·SOC² + 0.3201·SOC³
    pack = bat.Pack(cell=bat.LIPO_POUCH_CHEN2006, n_series=1, n_parallel=1)
    x = np.linspace(0.0, 1.0, 20001)
    voc = -1.031 * np.exp(-35 * x) + 3.685 + 0.2156 * x - 0.1178 * x**2 + 0.3201 * x**3
    assert np.max(np.abs(bat.ocv_v(pack, x) - voc)) < 5e-5  # was 22 mV with 17 points
    rtl = 6.603 * np.exp(-155.2 * x) + 0.04984
    (_, _), (r2, _) = bat.rc_params(pack, x, 25.0)
    assert np.max(np.abs(r2 / rtl - 1.0)) < 1e-3
    # limiting values of the fit: Voc(0) = 2.654 V, Voc(1) = 4.1029 V (computed)
    assert bat.ocv_v(pack, 0.0) == pytest.approx(2.654, abs=1e-4)
    assert bat.ocv_v(pack, 1.0) == pytest.approx(4.1029, abs=1e-4)
