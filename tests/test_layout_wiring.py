"""Thruster layouts, field from hardware and sacrificial anodes as chosen in vessel files
(issue 13): the plant builds them, the engine flies them unchanged."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from engine_helpers import SCENARIOS, VESSELS, write_scenario

from sim import api
from sim.cli import main
from sim.engine import plant as pl
from sim.engine.plant import build_plant, thruster_unit
from sim.engine.spec import CoilSpec, MagnetBlocksSpec, ThrusterSpec, Water
from sim.engine.summary import anode_mass_left_kg
from sim.io.files import InputError, load_vessel
from sim.physics import electrodes, fields, layouts
from sim.physics.electrochem import FARADAY_C_MOL
from sim.physics.seawater import water_state
from sim.physics.thruster import operating_point, prepare_scalar, scalar_point

WATER = Water(salinity=35.0, temperature_c=15.0)
STATE = water_state(35.0, 15.0, 0.0)
MU0 = fields.MU0  # CODATA 2018 μ0


def _spec(**kw) -> ThrusterSpec:
    base = dict(name="t", gap_m=0.05, pole_height_m=0.05, active_length_m=0.8, field_t=0.75)
    base.update(kw)
    return ThrusterSpec(**base)


# ------------------------------------------------------------------ field from hardware


def test_yoke_blocks_use_the_facing_pair_estimate_and_exceed_the_ironless_field():
    blocks = MagnetBlocksSpec(0.06, 0.8, 0.03, "N42SH")
    s0 = _spec(field_t=None, magnet_blocks=blocks)
    s1 = _spec(field_t=None, magnet_blocks=dataclasses.replace(blocks, yoke=True))
    b0, b1 = thruster_unit(s0).b_ref_tesla, thruster_unit(s1).b_ref_tesla
    want = fields.facing_pair_field("N42SH", 0.06, 0.8, 0.03, 0.05, 0.05, 0.8, yoke=True)
    assert b1 == pytest.approx(want.mean_b_t, rel=1e-12)
    # a steel return path raises the gap field (Furlani 2001, magnetic circuits), never above Br
    assert b0 < b1 < 1.3


def test_yoke_blocks_within_the_stated_tolerance_of_magpylib_images():
    magpy = pytest.importorskip("magpylib")
    # flat infinitely permeable back plates = image stack of the blocks (method of images,
    # Furlani 2001 §4.4); magpylib 6 Cuboid (Ortner & Coliado Bandeira 2020); the yoke key's
    # docstring states 15 %
    a, b, t, g, br = 0.06, 0.8, 0.03, 0.05, 1.3
    period = g + 2 * t
    mags = [
        magpy.magnet.Cuboid(
            polarization=(0, 0, br),
            dimension=(a, b, 2 * t),
            position=(0, 0, -(g / 2 + t) + k * period),
        )
        for k in range(-30, 31)
    ]
    x, w = np.polynomial.legendre.leggauss(6)
    X, Y, Z = np.meshgrid(0.025 * x, 0.4 * x, 0.025 * x, indexing="ij")
    W = (w[:, None, None] * w[None, :, None] * w[None, None, :]).ravel() / 8
    pts = np.column_stack([X.ravel(), Y.ravel(), Z.ravel()])
    ref = float(np.sum(magpy.getB(mags, pts, sumup=True)[:, 2] * W))
    got = fields.facing_pair_field(
        "N42SH", a, b, t, g, 0.05, 0.8, yoke=True, mu_recoil=1.0
    ).mean_b_t * (br / fields.facing_pair_field("N42SH", a, b, t, g, 0.05, 0.8).br_t)
    assert got == pytest.approx(ref, rel=0.15)


def test_racetrack_pair_field_against_magpylib():
    magpy = pytest.importorskip("magpylib")
    coil = CoilSpec("racetrack-pair", 40e3, "copper", 0.8, 0.06, 0.12, current_a=100.0,
                    resistance_ohm=0.1)  # fmt: skip
    s = _spec(field_t=None, coil=coil, magnet="electromagnet")
    got = pl.coil_field_t(coil, s)
    # magpylib 6 Polyline (Ortner & Coliado Bandeira 2020), same vertices, box mean by 6³ Gauss
    srcs = [
        magpy.current.Polyline(current=40e3, vertices=fields.racetrack_vertices_m(0.8, 0.06, z))
        for z in (-0.06, 0.06)
    ]
    x, w = np.polynomial.legendre.leggauss(6)
    X, Y, Z = np.meshgrid(0.025 * x, 0.4 * x, 0.025 * x, indexing="ij")
    W = (w[:, None, None] * w[None, :, None] * w[None, None, :]).ravel() / 8
    pts = np.column_stack([X.ravel(), Y.ravel(), Z.ravel()])
    ref = float(np.sum(magpy.getB(srcs, pts, sumup=True)[:, 2] * W))
    assert got == pytest.approx(ref, rel=2e-3)
    assert got > 0.1


def _on_axis_mean(ni, radius, length, half):
    # B = μ0NI/(2L)·[(L/2+z)/√(R²+(L/2+z)²) + (L/2−z)/√(R²+(L/2−z)²)] on the axis of a finite
    # thin solenoid (textbook, e.g. Griffiths; from memory), averaged over −half…half
    z = np.linspace(-half, half, 401)
    lp, lm = length / 2 + z, length / 2 - z
    return float(
        np.mean(MU0 * ni / (2 * length) * (lp / np.hypot(radius, lp) + lm / np.hypot(radius, lm)))
    )


def test_solenoid_annulus_mean_against_the_on_axis_formula_and_the_long_limit():
    ni = 1e5
    # long solenoid (L/R = 10) near its axis: ≈ μ0 N I / L (Ampère's law) and the on-axis value
    b = pl.solenoid_annulus_mean_field_t(ni, 0.2, 2.0, 0.02, 0.05, 0.5)
    assert b == pytest.approx(MU0 * ni / 2.0, rel=0.025)  # the ends lower it ≈ 2 %
    assert b == pytest.approx(_on_axis_mean(ni, 0.2, 2.0, 0.25), rel=2e-3)
    # short solenoid, thin annulus right at the axis
    b = pl.solenoid_annulus_mean_field_t(ni, 0.2, 0.3, 1e-4, 2e-3, 0.02)
    assert b == pytest.approx(_on_axis_mean(ni, 0.2, 0.3, 0.01), rel=1e-3)


def test_current_loop_on_axis_analytic():
    # B_z = μ0 I R² / (2 (R² + z²)^{3/2}) on the axis of a circular loop (textbook)
    _, bz = fields.circular_loop_field_t(1000.0, 0.1, 0.0, 0.05)
    assert float(bz) == pytest.approx(MU0 * 1000 * 0.01 / (2 * (0.0125) ** 1.5), rel=1e-9)


def test_toroid_field_is_amperes_law_at_the_mean_radius_and_coil_loads():
    coil = CoilSpec("toroid", 2.4e5, "copper", current_a=200.0, resistance_ohm=0.05)
    s = _spec(layout="annular", gap_m=None, pole_height_m=None, field_t=None, coil=coil,
              magnet="electromagnet", inner_radius_m=0.04, outer_radius_m=0.09)  # fmt: skip
    u = thruster_unit(s)
    # B = μ0 N I / (2π r) (Ampère's law); duct field is that times r_m ln(r2/r1)/gap_e
    b_m = MU0 * 2.4e5 / (2 * math.pi * 0.065)
    eq = layouts.annular_as_duct(layouts.AnnularThruster(0.04, 0.09, 0.8, b_m))
    assert u.duct.b_tesla == pytest.approx(eq.b_tesla, rel=1e-12)
    assert u.coil_power_w == pytest.approx(200.0**2 * 0.05)  # I²R (Joule)
    vessel = load_vessel(VESSELS / "glasswort-drone.toml").vessel_spec
    v2 = dataclasses.replace(vessel, thrusters=(dataclasses.replace(s, units=2),))
    plant = build_plant(v2, WATER)
    assert plant.coil_power_w == pytest.approx(2 * 2000.0)
    assert plant.cryocooler_w == pytest.approx(vessel.cryocooler_w + 4000.0)


def test_superconducting_coil_adds_the_cryocooler_input():
    coil = CoilSpec("solenoid", 1e6, "nbti", radius_m=0.15, length_m=1.2, current_a=300.0,
                    superconductor_area_m2=2e-7, peak_field_t=4.0)  # fmt: skip
    s = _spec(layout="helical", gap_m=None, pole_height_m=None, field_t=None, coil=coil,
              magnet="superconducting", inner_radius_m=0.04, outer_radius_m=0.1,
              pitch_angle_deg=30.0)  # fmt: skip
    b = pl.hardware_field_t(s)
    assert b == pytest.approx(MU0 * 1e6 / 1.2, rel=0.1)  # long-solenoid value, ends lower it
    load = fields.superconducting_cryo_load(b, math.pi * 0.15**2 * 1.2, lead_current_a=300.0)
    assert thruster_unit(s).coil_power_w == pytest.approx(load.input_power_w, rel=1e-12)
    m = pl.coil_margin(coil)
    assert 0 < m.load_fraction < 1


# ------------------------------------------------------------------ layouts


def test_stack_is_a_duct_with_that_many_channels():
    # REFERENCES.md: N equal parallel channels: per-channel field and resistance unchanged,
    # area ×N, velocity ÷N at the same flow (common practice)
    a = thruster_unit(_spec(layout="stack", stack_count=6, active_length_m=0.4)).duct
    b = thruster_unit(_spec(channels=6, active_length_m=0.4)).duct
    assert a == b and a.n_channels == 6
    pa = operating_point(a, STATE, 0.5, voltage_v=20.0)
    one = operating_point(dataclasses.replace(a, n_channels=1), STATE, 0.5, voltage_v=20.0)
    assert float(pa.current_a) == pytest.approx(6 * float(one.current_a), rel=1e-9)


def test_large_radius_annular_behaves_like_a_straight_duct_of_the_same_gap():
    # limiting case (Way 1968): ln(r2/r1) → g/r_m; duct of gap g, height 2π r_m, field B_m
    g, rm = 0.05, 200.0
    ann = _spec(layout="annular", gap_m=None, pole_height_m=None, inner_radius_m=rm - g / 2,
                outer_radius_m=rm + g / 2)  # fmt: skip
    duct = _spec(gap_m=g, pole_height_m=2 * math.pi * rm, wall_roughness_m=0.0)
    ua = thruster_unit(dataclasses.replace(ann, wall_roughness_m=0.0)).duct
    ud = thruster_unit(duct).duct
    for v in (0.0, 1.0):
        pa = operating_point(ua, STATE, v, voltage_v=15.0)
        pd = operating_point(ud, STATE, v, voltage_v=15.0)
        assert float(pa.thrust_n) == pytest.approx(float(pd.thrust_n), rel=2e-3)
        assert float(pa.current_a) == pytest.approx(float(pd.current_a), rel=2e-3)


def test_engine_scalar_path_runs_the_equivalent_duct_like_the_layout_solver():
    # the model's scalar solver must read the layout's own hydraulic diameter (EquivalentDuct)
    th = layouts.HelicalThruster(0.04, 0.1, 0.6, 1.5, 35.0)
    s = _spec(layout="helical", gap_m=None, pole_height_m=None, inner_radius_m=0.04,
              outer_radius_m=0.1, active_length_m=0.6, field_t=1.5, pitch_angle_deg=35.0,
              wall_roughness_m=0.0)  # fmt: skip
    duct = thruster_unit(s).duct
    ref = layouts.layout_operating_point(
        dataclasses.replace(
            th,
            electrode_drop_v=duct.electrode_drop_v,
            galvanic_offset_v=duct.galvanic_offset_v,
            k_inlet=duct.k_inlet,
            k_nozzle=0.02,
        ),
        STATE,
        1.0,
        voltage_v=30.0,
    )
    got = scalar_point(prepare_scalar(duct, STATE), 1.0, voltage_v=30.0)
    assert got.thrust_n == pytest.approx(float(ref.thrust_n), rel=1e-6)
    assert got.friction_loss_w == pytest.approx(float(ref.friction_loss_w), rel=1e-6)


def test_layouts_variants_file_flies(capsys):
    code = main(["versus", str(SCENARIOS / "variants-glasswort-layouts.toml"), "--no-plots",
                 "--jobs", "1"])  # fmt: skip
    out = capsys.readouterr().out
    assert code == 0
    for label in (
        "three channels",
        "one straight duct",
        "channel stack",
        "annular thruster",
        "open-field (ductless)",
    ):
        assert label in out


# ------------------------------------------------------------------ sacrificial anodes

SACRIFICIAL = """
extends = "{base}"

[[thruster]]
name = "pylon"
units = 2
gap = "50 mm"
pole_height = "50 mm"
active_length = "0.8 m"
channels = 3
field = "0.75 T"
anode = "aluminium_zinc_indium"
cathode = "copper"
anode_mass = "{mass}"
"""


def _sacrificial_vessel(tmp_path, mass="2 kg"):
    p = tmp_path / "sac.toml"
    p.write_text(SACRIFICIAL.format(base=(VESSELS / "glasswort-drone.toml").as_posix(), mass=mass))
    return p.name


def test_sacrificial_pair_drop_and_no_chlorine(tmp_path):
    _sacrificial_vessel(tmp_path)
    v = load_vessel(tmp_path / "sac.toml")
    u = build_plant(v.vessel_spec, WATER).thrusters[0]
    # ΔV = E_anode − E_H2 + |η_c| (DNV-RP-B401 closed-circuit potential, Bard & Faulkner)
    i_c = 300.0 / 3 / (0.05 * 0.8)
    want = electrodes.sacrificial_pair_drop_v("aluminium_zinc_indium", "copper_cathode", i_c)
    assert u.duct.galvanic_offset_v + u.duct.electrode_drop_v == pytest.approx(want, rel=1e-12)
    assert u.duct.chlorine_fraction == 0.0 and u.duct.galvanic_offset_v < 0
    assert u.sacrificial_anode == "aluminium_zinc_indium" and u.anode_mass_kg == 2.0


def test_faraday_anode_consumption_over_a_short_mission(tmp_path):
    vessel = _sacrificial_vessel(tmp_path)
    legs = '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { duration = "10 min" }'
    scen = write_scenario(tmp_path, legs, vessel=vessel, output='sample = "2 s"')
    scen.write_text(scen.read_text().replace((VESSELS / vessel).as_posix(), vessel))
    out = api.run_scenario(scen, write_log=False).result
    t = out.series["time_s"]
    amps = out.series["thruster_current_a"][:, 0]
    q_int = float(np.sum(0.5 * (amps[1:] + amps[:-1]) * np.diff(t)))  # ∫I dt, all units
    h2 = out.summary["h2_total_mol"]
    # Faraday: each coulomb through a cathode makes 1/(2F) mol H2; the anodes pass the same charge
    assert 2 * FARADAY_C_MOL * h2 == pytest.approx(q_int, rel=2e-3)
    # Al dissolved per unit = ∫I dt/(zF)·M on the theoretical basis (Faraday's law, z = 3)
    m_theory = q_int / 2 / (3 * FARADAY_C_MOL) * 26.9815385e-3
    assert electrodes.consumed_mass_kg(q_int / 2, "aluminium_zinc_indium", basis="theoretical") == (
        pytest.approx(m_theory, rel=1e-12)
    )
    # the summary helper uses the design capacity: 2000 A·h/kg (DNV-RP-B401)
    left = anode_mass_left_kg(h2, units=2, anode="aluminium_zinc_indium", anode_mass_kg=2.0)
    assert 2.0 - left == pytest.approx(q_int / 2 / 3600 / 2000, rel=2e-3)
    assert out.summary["cl2_total_mol"] == 0.0


def test_anode_spent_ends_the_mission_when_the_usable_mass_is_gone(tmp_path):
    vessel = _sacrificial_vessel(tmp_path, mass="20 g")
    legs = (
        '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { duration = "2 h" }\n'
        '[[trigger]]\nname = "anode"\nwhen = { anode_spent = true }\nthen = "stop"'
    )
    scen = write_scenario(tmp_path, legs, vessel=vessel)
    scen.write_text(scen.read_text().replace((VESSELS / vessel).as_posix(), vessel))
    out = api.run_scenario(scen, write_log=False).result
    h2 = out.summary["h2_total_mol"]
    left = anode_mass_left_kg(h2, units=2, anode="aluminium_zinc_indium", anode_mass_kg=0.02)
    # spent: (1 − utilisation)·m0 left, utilisation 0.85 (DNV-RP-B401, from memory)
    assert left == pytest.approx(0.15 * 0.02, rel=1e-3)
    assert out.summary["duration_s"] < 7200


def test_anode_spent_without_anode_mass_is_refused(tmp_path):
    legs = '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { anode_spent = true }'
    scen = write_scenario(tmp_path, legs)
    with pytest.raises(InputError) as exc:
        api.load_scenario(scen)
    assert "anode_spent" in str(exc.value) and "no sacrificial anode" in str(exc.value)


SOLENOID = {
    "kind": "solenoid",
    "ampere_turns": "1 MA",
    "radius": "1 m",
    "length": "1 m",
    "current": "10 A",
    "resistance": "1 ohm",
}


@pytest.mark.parametrize(
    ("change", "key", "phrase"),
    [
        ({"layout": "annular"}, "inner_radius", "needs 'inner_radius'"),
        ({"stack_count": 3}, "stack_count", "applies to layout stack only"),
        ({"anode": "zinc", "cathode": "graphite"}, "cathode", "no hydrogen-evolution kinetics"),
        ({"anode_mass": "1 kg"}, "anode_mass", "applies to sacrificial anodes"),
        (
            {
                "field": None,
                "coil": {
                    "kind": "solenoid",
                    "ampere_turns": "1 MA",
                    "radius": "1 m",
                    "length": "1 m",
                    "current": "10 A",
                    "resistance": "1 ohm",
                },
                "magnet": "electromagnet",
            },
            "coil.kind",
            "allowed: kind = 'racetrack-pair'",
        ),
    ],
)
def test_layout_and_anode_errors_name_the_key(tmp_path, change, key, phrase):
    import tomllib

    data = tomllib.loads((VESSELS / "glasswort-drone.toml").read_text())
    for k, v in change.items():
        if v is None:
            data["thruster"][0].pop(k)
        else:
            data["thruster"][0][k] = v
    from sim.analysis.variants import render_toml

    p = tmp_path / "v.toml"
    p.write_text(render_toml(data))
    with pytest.raises(InputError) as exc:
        load_vessel(p)
    probs = exc.value.problems
    assert any(pr.key == f"thruster[0].{key}" and phrase in pr.message for pr in probs), probs


def test_nbti_coil_over_the_critical_line_is_an_error_and_near_it_a_warning(tmp_path):
    coil = CoilSpec("racetrack-pair", 4e5, "nbti", 0.8, 0.06, 0.12, current_a=500.0,
                    superconductor_area_m2=1e-7, peak_field_t=5.0)  # fmt: skip
    m = pl.coil_margin(coil)
    # I_c = A s Bc2 / (1 + A s k), s = Jc_ref/(Bc2 − B_ref) (Wilson 1983 load line, from memory)
    s_ = 3e9 / (10.5 - 5.0)
    i_c = 1e-7 * s_ * 10.5 / (1 + 1e-7 * s_ * 5.0 / 500.0)
    assert m.critical_current_a == pytest.approx(i_c, rel=1e-12)
    assert m.load_fraction > 1
