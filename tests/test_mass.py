"""Tests of sim.physics.mass: magnet sizing against magpylib, the stored field energy, the
load line, Archimedes and the tonnes-per-centimetre immersion of a wall-sided hull."""

from __future__ import annotations

import math

import magpylib as magpy
import numpy as np
import pytest

from sim.physics import mass as pm
from sim.physics.errors import ModelRangeError

MU0 = 4e-7 * math.pi  # close enough to CODATA 2018 (1.25663706212e-6) for these checks


def test_iron_free_blocks_give_the_field_asked_for_by_magpylib():
    # magpylib (Ortner & Coliado Bandeira 2020, SoftwareX 11, 100466), computed here: the mean
    # B_z over the channel between the two sized blocks is the field asked for.
    br, gap, h, ell, want = 1.3, 0.04, 0.03, 0.2, 0.5
    m = pm.blocks_magnet_mass(want, br, gap, h, ell, 1)
    bw, bl, t = m.width_m, ell + (m.width_m - gap), m.thickness_m
    blocks = [
        magpy.magnet.Cuboid(polarization=(0, 0, br), dimension=(bw, bl, t), position=(0, 0, z))
        for z in (-(h / 2 + t / 2), h / 2 + t / 2)
    ]
    g = np.linspace(-0.45, 0.45, 7)
    x, y, z = np.meshgrid(g * gap, g * ell, g * h, indexing="ij")
    obs = np.column_stack([x.ravel(), y.ravel(), z.ravel()])
    mean = magpy.getB(blocks, obs, sumup=True)[:, 2].mean()
    assert mean == pytest.approx(want, rel=0.02)  # 7-point midpoint mean vs Gauss mean
    # volume of two blocks and the data-sheet density (7.4–7.6 g/cm³, common practice)
    assert m.magnet_kg == pytest.approx(2 * bw * bl * t * 7500.0, rel=1e-12)
    assert 7400.0 <= pm.NDFEB_DENSITY_KG_M3 <= 7600.0


def test_iron_free_blocks_refuse_a_field_they_cannot_give():
    # limit: facing semi-infinite blocks give at most Br in the gap (Furlani 2001, §4.4)
    with pytest.raises(ModelRangeError, match="iron-free"):
        pm.blocks_magnet_mass(1.3, 1.3, 0.05, 0.05, 0.8, 1)


def test_yoke_magnets_follow_the_load_line():
    # magnetic circuit with ideal iron, recoil permeability 1 (Furlani 2001, ch. 3): two
    # magnets of thickness t in series with a gap h give B = Br·2t/(2t + h); with 2t = h the
    # gap sees Br/2.
    m = pm.yoke_magnet_mass(0.65, 1.3, 0.05, 0.04, 0.5, 1, leakage_factor=1.0)
    assert 2 * m.thickness_m == pytest.approx(0.04, rel=1e-12)
    # more leakage, more magnet; no grade gives a field above Br/k_l
    assert pm.yoke_magnet_mass(0.65, 1.3, 0.05, 0.04, 0.5, 1).thickness_m > m.thickness_m
    with pytest.raises(ModelRangeError):
        pm.yoke_magnet_mass(1.2, 1.3, 0.05, 0.04, 0.5, 1, leakage_factor=1.2)


def test_superconducting_magnet_stores_the_field_energy():
    # energy density of a magnetic field B²/(2μ0) (any electromagnetism text; common
    # practice): 1 T over 1 m³ stores 397.9 kJ.
    m = pm.superconducting_magnet_mass(1.0, 1.0, 1.0, 1.0, field_volume_factor=1.0)
    assert m.stored_energy_j == pytest.approx(1.0 / (2 * MU0), rel=1e-6)
    assert m.stored_energy_j == pytest.approx(397.9e3, rel=1e-3)
    # virial theorem (Moon 1982): structure mass grows in proportion to stored energy, B²
    m2 = pm.superconducting_magnet_mass(2.0, 1.0, 1.0, 1.0, field_volume_factor=1.0)
    assert m2.structure_kg == pytest.approx(4 * m.structure_kg, rel=1e-12)
    assert m2.cryostat_kg == m.cryostat_kg  # the cryostat follows the size, not the field


def test_submerged_trim_obeys_archimedes():
    # Archimedes' principle: a part as dense as the water outside the hull changes nothing.
    rho = 1025.0
    t = pm.submerged_body_trim(165.0, 10.25, 0.01, 5.0, rho)
    assert t.in_trim and t.margin_kg == pytest.approx(5.0) and t.mass_kg == pytest.approx(175.25)
    # inside the hull (no outboard volume) 6 kg more than 5 kg of ballast: out of trim, sinks
    out = pm.submerged_body_trim(165.0, 6.0, 0.0, 5.0, rho)
    assert not out.in_trim and out.margin_kg == pytest.approx(-1.0)
    # lighter: it takes on ballast and stays neutral at its displaced mass
    light = pm.submerged_body_trim(165.0, -20.0, 0.0, 5.0, rho)
    assert light.in_trim and light.mass_kg == pytest.approx(165.0)


def test_displacement_hull_sinks_by_the_tonnes_per_centimetre():
    # a wall-sided box (C_B = C_WP = 1): extra mass Δm sinks it by Δm / (ρ·A_WP), the
    # "tonnes per centimetre immersion" TPC = ρ·A_WP/100 of naval architecture (common practice)
    rho, length, beam, draft = 1025.0, 10.0, 3.0, 0.5
    vol = length * beam * draft
    t = pm.displacement_hull_trim(rho * vol, 1025.0 * 3.0 * 0.01 * 10.0, draft, vol, rho)
    assert t.draft_m - draft == pytest.approx(0.01, rel=1e-9)
    assert t.displaced_volume_m3 == pytest.approx(vol + 0.3, rel=1e-12)
    assert not pm.displacement_hull_trim(rho * vol, 3075.0, draft, vol, rho, 0.005).in_trim


def test_duct_and_pack_mass_limits():
    # zero-thickness walls and plates weigh nothing; mass grows linearly with channels
    assert (
        pm.duct_mass(0.05, 0.05, 0.8, 1, wall_thickness_m=0, electrode_thickness_m=0).mass_kg == 0
    )
    one, three = pm.duct_mass(0.05, 0.05, 0.8, 1), pm.duct_mass(0.05, 0.05, 0.8, 3)
    assert three.mass_kg == pytest.approx(3 * one.mass_kg)
    # pack over cells within the 1.2–1.5 of small packs (common practice)
    assert 1.2 <= pm.PACK_PACKAGING_FACTOR <= 1.5
    with pytest.raises(ModelRangeError):
        pm.pack_mass_kg(14, 6, 0.5, packaging_factor=0.9)
