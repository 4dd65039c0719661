"""Tests of sim.physics.layouts: channel stacks, annular, ring-of-tubes and helical thrusters."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from sim.physics import layouts as ly
from sim.physics.errors import ModelRangeError
from sim.physics.seawater import water_state
from sim.physics.thruster import DuctThruster, operating_point

WATER = water_state(35.0, 15.0)
SIG = WATER.sigma_s_m


def channel(**kw):
    base = dict(gap_m=0.05, height_m=0.1, length_m=0.5, n_channels=1, b_tesla=2.0, roughness_m=1e-5)
    base.update(kw)
    return DuctThruster(**base)


def energy_ok(p):
    # conservation of energy (REFERENCES.md): V·I = electrode + Joule + flow work;
    # flow work = T·V0 + wake + friction.
    assert p.electrical_power_w == pytest.approx(
        p.electrode_loss_w + p.joule_loss_w + p.flow_work_w, rel=1e-9
    )


# ------------------------------------------------------------------ channel stack


def test_stack_identity_per_channel_unchanged_area_times_n():
    # REFERENCES.md (common practice): splitting one channel into N equal parallel channels of
    # the same length and field: field and resistance per channel unchanged, total area ×N,
    # inlet velocity ÷N at the same flow.
    ch = channel()
    for n in (2, 5):
        d = ly.stack_as_duct(ly.ChannelStack(ch, n))
        assert d.b_tesla == ch.b_tesla
        assert d.electrolyte_resistance_ohm(SIG) == ch.electrolyte_resistance_ohm(SIG)
        assert d.total_area_m2 == pytest.approx(n * ch.total_area_m2)
        # same volume flow through both: run each at the current that gives the flow, compare
        p1 = operating_point(ch, WATER, 1.0, current_a=200.0)
        pn = ly.layout_operating_point(ly.ChannelStack(ch, n), WATER, 1.0, current_a=200.0 * n)
        # every channel identical to the single one: flow ×N, velocity the same; so at the single
        # channel's flow the stack's velocity is that velocity ÷ N
        assert pn.volume_flow_m3_s == pytest.approx(n * p1.volume_flow_m3_s, rel=1e-9)
        assert pn.duct_velocity_m_s == pytest.approx(p1.duct_velocity_m_s, rel=1e-9)
        assert p1.volume_flow_m3_s / d.total_area_m2 == pytest.approx(
            p1.duct_velocity_m_s / n, rel=1e-12
        )


def test_stack_same_current_spreads_force_lower_velocity_higher_froude():
    # Same total current: Lorentz force I·B·gap is the same (J×B over the volume); spread over N
    # times the area the jet is slower, so momentum (Froude) efficiency rises and Joule loss
    # falls as R/N (Way 1968; momentum theory).
    ch = channel()
    p1 = operating_point(ch, WATER, 2.0, current_a=400.0)
    p4 = ly.layout_operating_point(ly.ChannelStack(ch, 4), WATER, 2.0, current_a=400.0)
    f1 = p1.flow_work_w / p1.duct_velocity_m_s  # flow work = Δp·A·u = F·u
    f4 = p4.flow_work_w / p4.duct_velocity_m_s
    assert f1 == pytest.approx(400.0 * 2.0 * 0.05, rel=1e-9)
    assert f4 == pytest.approx(f1, rel=1e-9)
    assert p4.duct_velocity_m_s < p1.duct_velocity_m_s
    assert p4.eta_froude > p1.eta_froude
    energy_ok(p4)


def test_stack_series_equals_parallel_at_n_times_voltage():
    # Identity: N identical channels in series at N·V carry the same per-channel state as in
    # parallel at V; terminal power is the same, current ÷N.
    ch = channel()
    par = ly.layout_operating_point(ly.ChannelStack(ch, 3), WATER, 1.5, voltage_v=15.0)
    ser = ly.layout_operating_point(ly.ChannelStack(ch, 3, "series"), WATER, 1.5, voltage_v=45.0)
    assert ser.thrust_n == pytest.approx(par.thrust_n, rel=1e-9)
    assert ser.current_a == pytest.approx(par.current_a / 3, rel=1e-9)
    assert ser.electrical_power_w == pytest.approx(par.electrical_power_w, rel=1e-9)
    back = ly.layout_operating_point(
        ly.ChannelStack(ch, 3, "series"), WATER, 1.5, current_a=ser.current_a
    )
    assert back.voltage_v == pytest.approx(45.0, rel=1e-6)


def test_stack_rejects_bad_input():
    with pytest.raises(ModelRangeError, match="n_stack"):
        ly.ChannelStack(channel(), 0)
    with pytest.raises(ModelRangeError, match="wiring"):
        ly.ChannelStack(channel(), 2, "star")


# ------------------------------------------------------------------ annular thruster


@pytest.mark.parametrize("profile", ["toroidal", "uniform"])
def test_annular_force_and_resistance_by_quadrature(profile):
    # Independent quadrature (scipy.integrate.quad) of ∫J×B dV with J_r = I/(2πrL) and of the
    # resistance ∫dr/(σ2πrL); the duct solver's flow work per unit velocity must equal F.
    r1, r2, ell, bm = 0.2, 0.3, 0.6, 1.5
    th = ly.AnnularThruster(r1, r2, ell, bm, field_profile=profile)
    rm = 0.5 * (r1 + r2)

    def b(r):
        return bm * rm / r if profile == "toroidal" else bm

    f_per_a = quad(lambda r: 1.0 / (2 * math.pi * r * ell) * b(r) * 2 * math.pi * r * ell, r1, r2)[
        0
    ]
    res = quad(lambda r: 1.0 / (SIG * 2 * math.pi * r * ell), r1, r2)[0]
    assert th.force_per_ampere_n_a() == pytest.approx(f_per_a, rel=1e-10)
    assert th.electrolyte_resistance_ohm(SIG) == pytest.approx(res, rel=1e-10)
    d = ly.annular_as_duct(th)
    assert d.electrolyte_resistance_ohm(SIG) == pytest.approx(res, rel=1e-12)
    assert d.total_area_m2 == pytest.approx(math.pi * (r2**2 - r1**2), rel=1e-12)
    assert d.hydraulic_diameter_m == pytest.approx(2 * (r2 - r1))  # 4A/P of an annulus
    p = ly.layout_operating_point(th, WATER, 2.0, current_a=1000.0)
    u = p.volume_flow_m3_s / d.total_area_m2
    assert p.flow_work_w == pytest.approx(1000.0 * f_per_a * u, rel=1e-9)
    energy_ok(p)
    # no field, no speed: V = I·R + V_d (Ohm's law; 5 % for the Joule warming of σ)
    p0 = ly.layout_operating_point(
        ly.AnnularThruster(r1, r2, ell, 0.0, field_profile=profile), WATER, 0.0, current_a=100.0
    )
    assert float(p0.voltage_v) == pytest.approx(100.0 * res + 2.0, rel=0.05)


def test_annular_large_radius_tends_to_straight_duct():
    # Limiting case: mean radius ≫ gap → straight duct of gap r2 − r1, height 2πr_m, same field;
    # the difference falls at least as fast as gap/radius (tolerance 3·g/r_m).
    g, ell, b = 0.04, 0.5, 2.0
    errs = []
    for rm in (0.2, 1.0, 5.0, 25.0):
        th = ly.AnnularThruster(rm - g / 2, rm + g / 2, ell, b, roughness_m=1e-5)
        duct = DuctThruster(g, 2 * math.pi * rm, ell, 1, b, 1e-5)
        v = 30.0
        pa = ly.layout_operating_point(th, WATER, 2.0, voltage_v=v)
        pd = operating_point(duct, WATER, 2.0, voltage_v=v)
        err = abs(float(pa.thrust_n) / float(pd.thrust_n) - 1.0)
        assert err < 3.0 * g / rm
        errs.append(err)
    assert errs[-1] < errs[0]


def test_ring_of_tubes():
    # Ring of N tubes in a 1/r field: same as N straight channels in the radial-mean field
    # B_R·R·ln(r2/r1)/g (exact mean of 1/r); uniform field: B_R itself; N tubes carry N× the
    # current of one tube at the same voltage.
    rt = ly.RingOfTubes(6, 0.3, 0.06, 0.08, 0.4, 2.0)
    d = ly.ring_of_tubes_as_duct(rt)
    mean_b = quad(lambda r: 2.0 * 0.3 / r, 0.27, 0.33)[0] / 0.06
    assert d.b_tesla == pytest.approx(mean_b, rel=1e-12)
    assert d.n_channels == 6
    one = ly.layout_operating_point(
        ly.RingOfTubes(1, 0.3, 0.06, 0.08, 0.4, 2.0), WATER, 1.0, voltage_v=12.0
    )
    six = ly.layout_operating_point(rt, WATER, 1.0, voltage_v=12.0)
    assert six.current_a == pytest.approx(6 * one.current_a, rel=1e-9)
    uni = ly.ring_of_tubes_as_duct(ly.RingOfTubes(6, 0.3, 0.06, 0.08, 0.4, 2.0, "uniform"))
    assert uni.b_tesla == 2.0


# ------------------------------------------------------------------ helical thruster


def test_helical_force_along_passages_and_energy():
    # Force along the passages per ampere is B_z cos φ (r2 − r1) (quadrature of J_r B_z cos φ
    # over the annulus); energy identity holds with the swirl loss inside friction.
    th = ly.HelicalThruster(0.1, 0.16, 0.5, 3.0, 35.0)
    phi = math.radians(35.0)
    f_per_a = quad(
        lambda r: 1.0 / (2 * math.pi * r * 0.5) * 3.0 * math.cos(phi) * 2 * math.pi * r * 0.5,
        0.1,
        0.16,
    )[0]
    p = ly.layout_operating_point(th, WATER, 1.5, current_a=800.0)
    d = ly.helical_as_duct(th)
    w = p.volume_flow_m3_s / d.total_area_m2
    assert p.flow_work_w == pytest.approx(800.0 * f_per_a * w, rel=1e-9)
    assert d.total_area_m2 == pytest.approx(math.pi * (0.16**2 - 0.1**2) * math.sin(phi))
    energy_ok(p)
    assert p.flow_work_w == pytest.approx(
        p.useful_power_w + p.wake_loss_w + p.friction_loss_w, rel=1e-9
    )
    swirl = ly.helical_swirl_loss_w(th, p)
    assert 0 < swirl < p.friction_loss_w
    # the swirl loss is ½ṁ(1 − η)(w cos φ)²
    assert swirl == pytest.approx(0.5 * p.mass_flow_kg_s * 0.4 * (w * math.cos(phi)) ** 2)


def test_helical_limits():
    # φ = 90°: passages parallel to the field, no force: the same as no field at all.
    axial = ly.layout_operating_point(
        ly.HelicalThruster(0.1, 0.16, 0.5, 3.0, 90.0), WATER, 1.5, voltage_v=20.0
    )
    nofield = ly.layout_operating_point(
        ly.HelicalThruster(0.1, 0.16, 0.5, 0.0, 90.0), WATER, 1.5, voltage_v=20.0
    )
    assert axial.thrust_n == pytest.approx(nofield.thrust_n, rel=1e-9, abs=1e-9)
    assert abs(axial.flow_work_w) < 1e-9 * abs(axial.electrical_power_w)
    # φ → 0: no axial through-flow, thrust vanishes
    t = [
        float(
            ly.layout_operating_point(
                ly.HelicalThruster(0.1, 0.16, 0.5, 3.0, a), WATER, 0.0, voltage_v=20.0
            ).thrust_n
        )
        for a in (0.5, 5.0, 30.0)
    ]
    assert 0 < t[0] < 0.2 * t[2]
    # a better stator gives more thrust; full recovery loses no swirl
    lo = ly.layout_operating_point(
        ly.HelicalThruster(0.1, 0.16, 0.5, 3.0, 30.0, stator_recovery=0.0),
        WATER,
        1.0,
        voltage_v=20.0,
    )
    hi_th = ly.HelicalThruster(0.1, 0.16, 0.5, 3.0, 30.0, stator_recovery=1.0)
    hi = ly.layout_operating_point(hi_th, WATER, 1.0, voltage_v=20.0)
    assert hi.thrust_n > lo.thrust_n
    assert float(ly.helical_swirl_loss_w(hi_th, hi)) == 0.0


def test_layout_rejects_bad_geometry():
    with pytest.raises(ModelRangeError, match="outer_radius_m"):
        ly.AnnularThruster(0.3, 0.2, 0.5, 1.0)
    with pytest.raises(ModelRangeError, match="helix_angle_deg"):
        ly.HelicalThruster(0.1, 0.2, 0.5, 1.0, 0.0)
    with pytest.raises(ModelRangeError, match="layout"):
        ly.layout_operating_point("duct", WATER, 1.0, voltage_v=1.0)
    assert np.isfinite(
        float(ly.layout_operating_point(channel(), WATER, 1.0, voltage_v=5.0).thrust_n)
    )
