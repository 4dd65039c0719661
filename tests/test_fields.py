"""Tests of sim.physics.fields: magnet assemblies, coils, coil losses and superconducting coils,
against magpylib, analytic fields, identities and limits."""

from __future__ import annotations

import magpylib as magpy
import numpy as np
import pytest

from sim.physics import fields as fl
from sim.physics.errors import ModelRangeError
from sim.physics.magnets import remanence_t


def gauss_box(w, ell, h, n=8):
    x, wx = np.polynomial.legendre.leggauss(n)
    X, Y, Z = np.meshgrid(0.5 * w * x, 0.5 * ell * x, 0.5 * h * x, indexing="ij")
    W = wx[:, None, None] * wx[None, :, None] * wx[None, None, :] / 8.0
    return np.column_stack([X.ravel(), Y.ravel(), Z.ravel()]), W.ravel()


def magpy_pair(br, a, b, t, g, n_images=0):
    """Two facing blocks about z = 0; with n_images > 0, the image stack of two infinitely
    permeable back plates (flat steel yoke): blocks of thickness 2t repeating every g + 2t."""
    if n_images == 0:
        return [
            magpy.magnet.Cuboid(polarization=(0, 0, br), dimension=(a, b, t), position=(0, 0, z))
            for z in (-(g + t) / 2, (g + t) / 2)
        ]
    period = g + 2 * t
    return [
        magpy.magnet.Cuboid(
            polarization=(0, 0, br),
            dimension=(a, b, 2 * t),
            position=(0, 0, -(g / 2 + t) + k * period),
        )
        for k in range(-n_images, n_images + 1)
    ]


# ------------------------------------------------------------------ permanent magnets


def test_pair_no_yoke_channel_mean_against_magpylib():
    # magpylib 6.3 Cuboid (Ortner & Coliado Bandeira 2020): channel mean of the same quadrature
    # points computed with magpylib; N42 at 20 °C, two 60×100×20 mm blocks, 25 mm gap, 40×80 mm
    # channel. Exact superposition: agreement to 1e-9.
    res = fl.facing_pair_field("N42", 0.06, 0.1, 0.02, 0.025, 0.04, 0.08, n_points=8)
    pts, w = gauss_box(0.04, 0.08, 0.025)
    ref = float(
        np.sum(w * magpy.getB(magpy_pair(1.30, 0.06, 0.1, 0.02, 0.025), pts, sumup=True)[:, 2])
    )
    assert res.br_t == pytest.approx(1.30)
    assert res.mean_b_t == pytest.approx(ref, rel=1e-9)
    cen = magpy.getB(magpy_pair(1.30, 0.06, 0.1, 0.02, 0.025), (0, 0, 0), sumup=True)[2]
    assert res.centre_b_t == pytest.approx(cen, rel=1e-9)
    assert res.uniformity < 1.0


def test_pair_published_centre_value_reuses_blocks():
    # REFERENCES.md (magpylib 6.3.0): 50×50×25 mm blocks, Br 1.3 T, 20 mm gap → 0.574954 T.
    # N42 midpoint Br is 1.30 T at 20 °C.
    res = fl.facing_pair_field("N42", 0.05, 0.05, 0.025, 0.02, 0.01, 0.01)
    assert res.centre_b_t == pytest.approx(0.574954, abs=1e-6)


def test_rows_of_abutting_blocks_equal_one_block():
    # Superposition identity: n_along abutting blocks = one block n times as long (magpylib).
    res = fl.facing_pair_field("N42", 0.05, 0.05, 0.02, 0.02, 0.03, 0.1, n_along=3, n_points=8)
    blocks = []
    for y in (-0.05, 0.0, 0.05):
        for z in (-0.02, 0.02):
            blocks.append(
                magpy.magnet.Cuboid(
                    polarization=(0, 0, 1.3), dimension=(0.05, 0.05, 0.02), position=(0, y, z)
                )
            )
    pts, w = gauss_box(0.03, 0.1, 0.02)
    ref = float(np.sum(w * magpy.getB(blocks, pts, sumup=True)[:, 2]))
    assert res.mean_b_t == pytest.approx(ref, rel=1e-6)


@pytest.mark.parametrize(
    ("a", "b", "t", "g"),
    [
        (0.05, 0.05, 0.025, 0.02),
        (0.1, 0.2, 0.02, 0.02),
        (0.05, 0.1, 0.01, 0.03),
        (0.2, 0.4, 0.03, 0.02),
    ],
)
def test_yoke_estimate_within_15_percent_of_image_model(a, b, t, g):
    # magpylib has no iron: infinitely permeable flat back plates are modelled by the method of
    # images (an infinite stack of blocks of thickness 2t with period g + 2t, all magnetised the
    # same way), truncated at ±40 images. The circuit estimate with the stated leakage rule is
    # within ±15 % of the image model's pole-face mean (stated tolerance), and the image model
    # itself lies between the no-iron field and the ideal circuit (σ = 1): iron only adds field.
    br = 1.3
    pts, w = gauss_box(a, b, g)
    img = float(np.sum(w * magpy.getB(magpy_pair(br, a, b, t, g, 40), pts, sumup=True)[:, 2]))
    bare = float(np.sum(w * magpy.getB(magpy_pair(br, a, b, t, g), pts, sumup=True)[:, 2]))
    sig = fl.yoke_leakage_coefficient(a, b, g)
    est = fl.yoke_gap_field_t(br, t, g, leakage=sig, mu_recoil=1.0)
    ideal = fl.yoke_gap_field_t(br, t, g, mu_recoil=1.0)
    assert est == pytest.approx(img, rel=0.15)
    assert bare < img < ideal


def test_yoke_limits():
    # Limits of the circuit law B = Br/(σ + μ_r g/(2t)): zero gap → Br (σ = 1); thick magnets
    # → Br/σ; textbook form Br·t_m/(t_m + μ_r g) with t_m = 2t (Furlani 2001, ch. 3).
    assert fl.yoke_gap_field_t(1.3, 0.02, 1e-12, mu_recoil=1.0) == pytest.approx(1.3)
    assert fl.yoke_gap_field_t(1.3, 1e6, 0.02, leakage=1.2) == pytest.approx(1.3 / 1.2)
    assert fl.yoke_gap_field_t(1.2, 0.01, 0.03, mu_recoil=1.05) == pytest.approx(
        1.2 * 0.02 / (0.02 + 1.05 * 0.03)
    )
    assert fl.yoke_leakage_coefficient(0.05, 0.05, 1e-9) == pytest.approx(1.0)


def test_yoke_raises_field_and_temperature_lowers_it():
    # Iron adds field (image model above); Br falls by −0.12 %/K (grade tables, common practice).
    bare = fl.facing_pair_field("N42SH", 0.06, 0.1, 0.02, 0.025, 0.04, 0.08)
    yoke = fl.facing_pair_field("N42SH", 0.06, 0.1, 0.02, 0.025, 0.04, 0.08, yoke=True)
    hot = fl.facing_pair_field("N42SH", 0.06, 0.1, 0.02, 0.025, 0.04, 0.08, magnet_temp_c=80.0)
    assert yoke.mean_b_t > bare.mean_b_t and yoke.yoke
    assert hot.mean_b_t / bare.mean_b_t == pytest.approx(1 - 0.0012 * 60, rel=1e-9)
    assert hot.br_t == pytest.approx(float(remanence_t("N42SH", 80.0)))
    with pytest.raises(ModelRangeError, match="magnet temperature"):
        fl.facing_pair_field("N42", 0.06, 0.1, 0.02, 0.025, 0.04, 0.08, magnet_temp_c=95.0)


# ------------------------------------------------------------------ coils


def test_circular_loop_against_magpylib_and_axis_formula():
    # magpylib Circle (current source) off axis; on the axis μ0 I a²/(2(a² + z²)^{3/2}).
    loop = magpy.current.Circle(current=250.0, diameter=0.3)
    rho = np.array([0.0, 0.05, 0.1, 0.2, 0.3])
    z = np.array([0.0, 0.02, -0.1, 0.15, 0.4])
    ref = loop.getB(np.column_stack([rho, np.zeros(5), z]))
    br, bz = fl.circular_loop_field_t(250.0, 0.15, rho, z)
    assert bz == pytest.approx(ref[:, 2], rel=1e-8)
    assert br == pytest.approx(ref[:, 0], rel=1e-8, abs=1e-15)
    axis = fl.MU0 * 250.0 * 0.15**2 / (2 * (0.15**2 + z**2) ** 1.5)
    assert fl.circular_loop_field_t(250.0, 0.15, 0.0, z)[1] == pytest.approx(axis, rel=1e-12)


def test_polyline_racetrack_against_magpylib():
    # magpylib Polyline of the same vertices (same filament): identical Biot–Savart sums.
    v = fl.racetrack_vertices_m(0.4, 0.1, 0.05, n_arc=16)
    pts = np.array([[0, 0, 0], [0.03, 0.1, -0.02], [0.2, 0.3, 0.1], [0.0, 0.0, 0.5]])
    ref = magpy.current.Polyline(current=1000.0, vertices=v).getB(pts)
    assert fl.polyline_field_t(1000.0, v, pts) == pytest.approx(ref, rel=1e-9, abs=1e-15)


def test_racetrack_with_no_straights_is_a_circle():
    # Limit: a racetrack with zero straight length is a circular loop (polygon error ∝ 1/n²).
    v = fl.racetrack_vertices_m(0.0, 0.2, n_arc=200)
    b = fl.polyline_field_t(100.0, v, [[0, 0, 0.05]])[0, 2]
    assert b == pytest.approx(fl.circular_loop_field_t(100.0, 0.2, 0.0, 0.05)[1], rel=1e-4)


def test_solenoid_axis_closed_form_and_limits():
    # Finite solenoid on axis (textbook current-sheet integral); long-solenoid limit μ0 N I/L
    # at the centre and half of it at an end; loop superposition agrees on axis and inside.
    ni, r, ell = 5.0e4, 0.1, 2.0
    assert fl.solenoid_on_axis_field_t(ni, r, 200.0, 0.0) == pytest.approx(
        fl.MU0 * ni / 200.0, rel=1e-6
    )
    assert fl.solenoid_on_axis_field_t(ni, 0.001, ell, ell / 2) == pytest.approx(
        0.5 * fl.MU0 * ni / ell, rel=1e-3
    )
    z = np.array([0.0, 0.4, 1.0, 1.5])
    _, bz = fl.solenoid_field_t(ni, r, ell, 0.0, z, n_loops=256)
    assert bz == pytest.approx(fl.solenoid_on_axis_field_t(ni, r, ell, z), rel=1e-6)
    # inside, off axis, far from the ends: uniform field μ0 N I/L (within 1 %)
    _, bz_in = fl.solenoid_field_t(ni, r, ell, 0.06, 0.0, n_loops=256)
    assert bz_in == pytest.approx(fl.MU0 * ni / ell, rel=0.01)


def test_solenoid_against_magpylib_circles():
    # magpylib: the same solenoid as 400 Circle loops evenly spaced.
    ni, r, ell, n = 2.0e4, 0.08, 0.3, 400
    loops = [
        magpy.current.Circle(current=ni / n, diameter=2 * r, position=(0, 0, z))
        for z in np.linspace(-ell / 2 + ell / (2 * n), ell / 2 - ell / (2 * n), n)
    ]
    pts = np.array([[0.0, 0, 0.0], [0.04, 0, 0.05], [0.12, 0, 0.1], [0.0, 0, 0.3]])
    ref = magpy.getB(loops, pts, sumup=True)
    br, bz = fl.solenoid_field_t(ni, r, ell, pts[:, 0], pts[:, 2], n_loops=128)
    assert bz == pytest.approx(ref[:, 2], rel=2e-4)
    assert br == pytest.approx(ref[:, 0], rel=2e-3, abs=1e-7)


def test_coil_pair_mean_field():
    # Two coaxial loops in Helmholtz spacing give 0.7155 μ0 N I/R at the centre (textbook,
    # (4/5)^{3/2}); a racetrack pair with no straights and a tiny channel reproduces it.
    ni, r = 1.0e4, 0.2
    b = fl.coil_pair_mean_field_t(ni, 0.0, r, r, 1e-4, 1e-4, 1e-4, n_arc=256, n_points=2)
    assert b == pytest.approx((0.8) ** 1.5 * fl.MU0 * ni / r, rel=1e-4)
    # a channel wider and longer than the coils' flat middle sees a lower mean (the field falls
    # off beyond the windings), and B ∝ NI
    b_big = fl.coil_pair_mean_field_t(ni, 0.5, 0.1, 0.1, 0.18, 0.6, 0.02)
    b_small = fl.coil_pair_mean_field_t(ni, 0.5, 0.1, 0.1, 0.02, 0.1, 0.02)
    assert 0 < b_big < b_small
    assert fl.coil_pair_mean_field_t(2 * ni, 0.5, 0.1, 0.1, 0.18, 0.6, 0.02) == pytest.approx(
        2 * b_big, rel=1e-12
    )


def test_toroidal_field():
    # Ampère's law: μ0 N I/(2π r); 1000 turns × 100 A at 0.2 m → 0.1 T.
    assert fl.toroidal_field_t(1.0e5, 0.2) == pytest.approx(0.1, rel=1e-9)
    with pytest.raises(ModelRangeError):
        fl.toroidal_field_t(1.0, 0.0)


def test_coil_resistance_and_heat():
    # IEC 60028: annealed copper 1/58 Ω·mm²/m at 20 °C; 1000 turns × 1 m of 1 mm² → 17.24 Ω.
    r = fl.coil_resistance_ohm(1000, 1.0, 1e-6)
    assert r == pytest.approx(17.241, abs=1e-3)
    # common practice: R2/R1 = (234.5 + T2)/(234.5 + T1) for copper (α20 = 1/254.5)
    r80 = fl.coil_resistance_ohm(1000, 1.0, 1e-6, t_c=80.0)
    assert r80 / r == pytest.approx((234.5 + 80) / (234.5 + 20), rel=1e-3)
    assert fl.coil_joule_w(10.0, r) == pytest.approx(100 * r)
    assert fl.coil_joule_w(0.0, r) == 0.0


# ------------------------------------------------------------------ superconducting coils


def test_nbti_critical_line():
    # NbTi at 4.2 K: about 3000 A/mm² at 5 T, zero at Bc2 ≈ 10.5 T (common practice; Wilson
    # 1983, from memory).
    assert fl.nbti_critical_current_density_a_m2(5.0) == pytest.approx(3.0e9)
    assert fl.nbti_critical_current_density_a_m2(10.5) == 0.0
    assert fl.nbti_critical_current_density_a_m2(12.0) == 0.0


def test_load_line_intersection():
    # Identity: at I_c the load line (B = kI) meets the critical line (I = A·Jc(B)).
    k, a = 5.0e-3, 1.0e-6  # 5 mT/A, 1 mm² NbTi
    m = fl.load_line_margin(800.0, k, a)
    jc = fl.nbti_critical_current_density_a_m2(m.peak_field_at_critical_t)
    assert m.critical_current_a == pytest.approx(a * jc, rel=1e-12)
    assert m.peak_field_at_critical_t == pytest.approx(k * m.critical_current_a)
    assert m.load_fraction == pytest.approx(800.0 / m.critical_current_a)
    assert fl.load_line_margin(0.85 * m.critical_current_a, k, a).margin_ok is False
    assert fl.load_line_margin(0.5 * m.critical_current_a, k, a).margin_ok is True


def test_cryocooler_power():
    # Carnot: lifting 1 W from 4.2 K to 300 K needs at least 70.4 W.
    assert fl.cryocooler_input_power_w(1.0, fraction_of_carnot=1.0) == pytest.approx(
        70.43, abs=0.01
    )
    # from memory (loose, ±50 %): a 1.5 W at 4.2 K Gifford–McMahon cooler draws about 7 kW.
    assert fl.cryocooler_input_power_w(1.5) == pytest.approx(7.0e3, rel=0.5)


def test_cryo_load_scales_with_field_and_mass():
    # Virial theorem (Moon 1982): M = f ρE/σ ∝ B²V; static load ∝ M^{2/3} ∝ B^{4/3}.
    lo = fl.superconducting_cryo_load(2.0, 0.1)
    hi = fl.superconducting_cryo_load(4.0, 0.1)
    assert hi.cold_mass_kg / lo.cold_mass_kg == pytest.approx(4.0)
    assert hi.static_load_w / lo.static_load_w == pytest.approx(4.0 ** (2 / 3))
    e = fl.stored_energy_j(2.0, 0.1)
    assert e == pytest.approx(4.0 * 0.1 / (2 * fl.MU0))
    assert lo.cold_mass_kg == pytest.approx(5 * 8000 * e / 200e6)
    leads = fl.superconducting_cryo_load(2.0, 0.1, lead_current_a=500.0)
    assert leads.lead_load_w == pytest.approx(0.5)
    assert leads.input_power_w > lo.input_power_w
    assert fl.superconducting_cryo_load(0.0, 0.1).input_power_w == 0.0
