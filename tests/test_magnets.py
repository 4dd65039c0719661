"""Tests of sim.physics.magnets against magpylib, grade tables, identities and limits."""

from __future__ import annotations

import re

import magpylib as magpy
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.physics import magnets as mg
from sim.physics.errors import ModelRangeError

A, B, L, GAP, BR = 0.05, 0.05, 0.025, 0.02, 1.3  # the REFERENCES.md block pair [m, T]


def magpylib_block(br, a, b, length, centre_z):
    """A block magnetised along +z with its centre on the z axis (magpylib 6: SI units)."""
    return magpy.magnet.Cuboid(
        polarization=(0.0, 0.0, br), dimension=(a, b, length), position=(0.0, 0.0, centre_z)
    )


# ---------------------------------------------------------------------- reference library / tables


def test_pair_centre_field_published_value():
    # magpylib 6.3.0 (Cuboid, polarization), REFERENCES.md: two 50×50×25 mm blocks, Br 1.3 T,
    # 20 mm gap → 0.574954 T at the centre.
    assert mg.facing_pair_gap_field_t(BR, A, B, L, GAP) == pytest.approx(0.574954, abs=1e-6)


def test_pair_field_against_magpylib_live():
    # magpylib (Ortner & Coliado Bandeira 2020, SoftwareX 11, 100466), computed here.
    lower = magpylib_block(BR, A, B, L, -(GAP / 2 + L / 2))
    upper = magpylib_block(BR, A, B, L, +(GAP / 2 + L / 2))
    z_from_lower_face = np.linspace(0.0, GAP, 9)
    obs = np.column_stack([np.zeros(9), np.zeros(9), z_from_lower_face - GAP / 2])
    ref = magpy.getB([lower, upper], obs, sumup=True)[:, 2]
    ours = mg.facing_pair_gap_field_t(BR, A, B, L, GAP, z_from_lower_face)
    assert ours == pytest.approx(ref, rel=1e-9)


@pytest.mark.parametrize(("a", "b", "length"), [(0.05, 0.05, 0.025), (0.1, 0.02, 0.01)])
def test_single_block_against_magpylib_live(a, b, length):
    # magpylib Cuboid, computed here; block with its +z face at z = 0.
    block = magpylib_block(1.2, a, b, length, -length / 2)
    z = np.array([0.0, 1e-3, 5e-3, 0.02, 0.1, 0.5])
    obs = np.column_stack([np.zeros_like(z), np.zeros_like(z), z])
    ref = block.getB(obs)[:, 2]
    assert mg.cuboid_on_axis_field_t(1.2, a, b, length, z) == pytest.approx(ref, rel=1e-8)


def test_grade_table():
    # NdFeB grade tables of magnet makers (REFERENCES.md, common practice): N35 1.17–1.22 T,
    # N42 1.28–1.32 T, N52 1.42–1.48 T; suffix N/M/H/SH/UH/EH → 80/100/120/150/180/200 °C;
    # reversible coefficient −0.12 %/K.
    br_range = {"N35": (1.17, 1.22), "N42": (1.28, 1.32), "N52": (1.42, 1.48)}
    t_max = {"": 80.0, "M": 100.0, "H": 120.0, "SH": 150.0, "UH": 180.0, "EH": 200.0}
    assert len(mg.NDFEB_GRADES) == 18
    for base, (lo, hi) in br_range.items():
        for suffix, limit in t_max.items():
            g = mg.NDFEB_GRADES[base + suffix]
            assert g.name == base + suffix
            assert lo <= g.br_tesla <= hi
            assert g.max_working_temp_c == limit
            assert g.alpha_br_per_k == -0.0012
            assert "common practice" in g.source


def test_reversible_derating_value():
    # −0.12 %/K (grade tables, common practice): 100 K above 20 °C → −12 %.
    assert mg.field_derating_factor(120.0) == pytest.approx(0.88, rel=1e-12)
    assert mg.remanence_t("N42", 80.0) == pytest.approx(1.30 * (1 - 0.0012 * 60), rel=1e-12)


# ---------------------------------------------------------------------------------- identities


def test_pair_is_superposition_and_symmetric():
    # superposition (linear magnetostatics): pair field = sum of the two single-block fields;
    # centre = 2 × one block at gap/2; symmetric about the centre.
    z = np.linspace(0.0, GAP, 11)
    single = mg.cuboid_on_axis_field_t
    pair = mg.facing_pair_gap_field_t(BR, A, B, L, GAP, z)
    assert pair == pytest.approx(single(BR, A, B, L, z) + single(BR, A, B, L, GAP - z))
    assert mg.facing_pair_gap_field_t(BR, A, B, L, GAP) == 2 * single(BR, A, B, L, GAP / 2)
    assert pair == pytest.approx(pair[::-1], rel=1e-12)


def test_field_scales_with_remanence_and_derating():
    # identity: B is linear in Br, so the derated field = factor × field at 20 °C.
    g = mg.NDFEB_GRADES["N52SH"]
    b20 = mg.facing_pair_gap_field_t(g.br_tesla, A, B, L, GAP)
    b90 = mg.facing_pair_gap_field_t(mg.remanence_t(g, 90.0), A, B, L, GAP)
    assert b90 == pytest.approx(b20 * mg.field_derating_factor(90.0), rel=1e-12)


def test_stacking_blocks():
    # superposition along the magnetisation: a block of thickness 2L equals two blocks of L
    # stacked (the shared internal faces cancel).
    z = np.array([0.0, 0.004, 0.03])
    near = mg.cuboid_on_axis_field_t(BR, A, B, L, z)
    far = mg.cuboid_on_axis_field_t(BR, A, B, L, z + L)
    assert mg.cuboid_on_axis_field_t(BR, A, B, 2 * L, z) == pytest.approx(near + far, rel=1e-12)


# ------------------------------------------------------------------------------- limiting cases


def test_remanence_at_reference_temperature_is_nominal():
    for g in mg.NDFEB_GRADES.values():
        assert mg.remanence_t(g, 20.0) == g.br_tesla
    assert mg.field_derating_factor(20.0) == 1.0


def test_zero_remanence_zero_field():
    assert mg.cuboid_on_axis_field_t(0.0, A, B, L, 0.01) == 0.0
    assert mg.facing_pair_gap_field_t(0.0, A, B, L, GAP) == 0.0


def test_face_of_semi_infinite_block_is_half_br():
    # charge model: a wide, very long block has B = Br/2 at its face (common practice).
    assert mg.cuboid_on_axis_field_t(BR, 1e3, 1e3, 1e7, 0.0) == pytest.approx(BR / 2, rel=1e-3)


def test_wide_thin_slab_has_no_external_field():
    # an infinite uniformly magnetised slab has no field outside it (charge sheets cancel).
    assert abs(mg.cuboid_on_axis_field_t(BR, 1e4, 1e4, 0.01, 0.05)) < 1e-5


def test_closed_gap_between_huge_blocks_gives_br():
    # two semi-infinite blocks touching: the field in a vanishing gap tends to Br.
    assert mg.facing_pair_gap_field_t(BR, 1e3, 1e3, 1e7, 1e-6) == pytest.approx(BR, rel=1e-3)


def test_far_field_is_a_dipole():
    # far away the block is a dipole of moment Br·V/μ0: B = Br·a·b·L/(2π z_c³), z_c from centre.
    z_c = 5.0
    far = mg.cuboid_on_axis_field_t(BR, A, B, L, z_c - L / 2)
    assert far == pytest.approx(BR * A * B * L / (2 * np.pi * z_c**3), rel=1e-4)


def test_vectorised():
    assert np.shape(mg.remanence_t("N35", np.linspace(-40, 80, 7))) == (7,)
    assert np.shape(mg.field_derating_factor(np.zeros((3, 2)))) == (3, 2)
    assert isinstance(mg.cuboid_on_axis_field_t(BR, A, B, L, 0.01), float)


# ---------------------------------------------------------------------------------------- errors


def test_above_max_working_temperature_raises():
    with pytest.raises(ModelRangeError, match=re.escape("81.0")) as info:
        mg.remanence_t("N42", np.array([20.0, 81.0]))
    assert "80" in str(info.value)
    mg.remanence_t("N42EH", 199.0)  # within the EH limit
    with pytest.raises(ModelRangeError, match=re.escape("-50.0")):
        mg.remanence_t("N42", -50.0)
    with pytest.raises(ModelRangeError, match=re.escape("nan")):
        mg.remanence_t("N42", float("nan"))


def test_unknown_grade_and_bad_geometry_raise():
    with pytest.raises(ModelRangeError, match=re.escape("N99")) as info:
        mg.remanence_t("N99", 20.0)
    assert "N52SH" in str(info.value)
    with pytest.raises(ModelRangeError, match=re.escape("-0.001")):
        mg.cuboid_on_axis_field_t(BR, A, B, L, -0.001)
    with pytest.raises(ModelRangeError, match=re.escape("thickness_m")):
        mg.cuboid_on_axis_field_t(BR, A, B, 0.0, 0.01)
    with pytest.raises(ModelRangeError, match=re.escape("0.03")):
        mg.facing_pair_gap_field_t(BR, A, B, L, GAP, 0.03)
    with pytest.raises(ModelRangeError, match=re.escape("gap_m")):
        mg.facing_pair_gap_field_t(BR, A, B, L, -0.02)
    with pytest.raises(ModelRangeError, match=re.escape("1000")):
        mg.field_derating_factor(1000.0)


# ------------------------------------------------------------------------------ property-based


@settings(max_examples=50, deadline=None)
@given(
    z1=st.floats(0.0, 1.0),
    z2=st.floats(0.0, 1.0),
    a=st.floats(0.005, 0.2),
    length=st.floats(0.002, 0.1),
)
def test_on_axis_field_falls_with_distance(z1, z2, a, length):
    lo, hi = sorted((z1, z2))
    if hi - lo > 1e-9:
        b_lo = mg.cuboid_on_axis_field_t(BR, a, a, length, lo)
        b_hi = mg.cuboid_on_axis_field_t(BR, a, a, length, hi)
        assert b_hi < b_lo


@settings(max_examples=50, deadline=None)
@given(t1=st.floats(-40.0, 150.0), t2=st.floats(-40.0, 150.0))
def test_remanence_falls_with_temperature(t1, t2):
    lo, hi = sorted((t1, t2))
    if hi - lo > 1e-6:
        assert mg.remanence_t("N42SH", hi) < mg.remanence_t("N42SH", lo)
