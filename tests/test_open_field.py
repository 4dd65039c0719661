"""Tests of sim.physics.open_field: the 2-D periodic open-field array."""

from __future__ import annotations

import math
from dataclasses import replace

import magpylib as magpy
import numpy as np
import pytest

from sim.physics import open_field as of
from sim.physics.errors import ModelRangeError
from sim.physics.seawater import water_state

WATER = water_state(35.0, 15.0)
ARR = of.OpenFieldArray(
    pitch_m=0.05,
    electrode_width_m=0.02,
    n_electrodes=20,
    array_length_m=1.0,
    br_t=1.3,
    magnet_width_m=0.04,
    magnet_thickness_m=0.02,
    magnet_depth_m=0.005,
)


def test_magnet_field_against_magpylib():
    # magpylib Cuboid: 61 long strips (10 m along x) alternating ±z, top faces 5 mm below the
    # wetted surface, centred half a pitch from the electrodes; field near the middle of the
    # array agrees with the periodic series (finite array and length: 1e-3 of the peak).
    p, w, t, d = ARR.pitch_m, ARR.magnet_width_m, ARR.magnet_thickness_m, ARR.magnet_depth_m
    strips = [
        magpy.magnet.Cuboid(
            polarization=(0, 0, 1.3 * (-1) ** i),
            dimension=(10.0, w, t),
            position=(0.0, ARR.offset_m + i * p, -d - t / 2),
        )
        for i in range(-30, 31)
    ]
    y = np.linspace(-0.05, 0.05, 7)
    z = np.array([0.001, 0.005, 0.01, 0.02, 0.04, 0.03, 0.015])
    ref = magpy.getB(strips, np.column_stack([np.zeros(7), y, z]), sumup=True)
    _, _, by, bz = of.fields_at(ARR, 0.0, y, z)
    peak = np.max(np.abs(ref))
    assert bz == pytest.approx(ref[:, 2], abs=1e-3 * peak)
    assert by == pytest.approx(ref[:, 1], abs=1e-3 * peak)


def test_current_field_is_potential_flow_and_carries_the_current():
    # Conservation of charge: the current leaving the anode faces through z = 0 over one period
    # equals the anode current per period; ∇·J = 0 in the water (finite differences).
    i = 100.0
    y = np.linspace(-ARR.pitch_m / 2, ARR.pitch_m / 2, 4001)
    _, jz0, _, _ = of.fields_at(ARR, i, y, 0.0, n_harmonics=2000)
    per_anode = np.trapezoid(jz0, y) * ARR.array_length_m
    assert per_anode == pytest.approx(i / (ARR.n_electrodes / 2), rel=2e-3)
    h, y0, z0 = 1e-6, 0.013, 0.01
    jy_p, _, _, _ = of.fields_at(ARR, i, y0 + h, z0)
    jy_m, _, _, _ = of.fields_at(ARR, i, y0 - h, z0)
    _, jz_p, _, _ = of.fields_at(ARR, i, y0, z0 + h)
    _, jz_m, _, _ = of.fields_at(ARR, i, y0, z0 - h)
    div = (jy_p - jy_m) / (2 * h) + (jz_p - jz_m) / (2 * h)
    k1 = math.pi / ARR.pitch_m  # each derivative is of order k1·|J|
    assert abs(div) < 1e-4 * k1 * math.hypot(jy_p, jz_p)


def test_quadrature_converges_to_series():
    # 2-D numerical quadrature of (J×B)_x over one period and z converges to the closed form.
    exact = of.force_per_area_pa(ARR, 100.0, n_harmonics=50)
    errs = [
        abs(
            of.force_per_area_pa(ARR, 100.0, method="quadrature", n_harmonics=50, n_y=ny, n_z=nz)
            / exact
            - 1
        )
        for ny, nz in ((16, 8), (64, 32), (128, 64))
    ]
    assert errs[0] > errs[1] > errs[2]
    assert errs[2] < 1e-9


def test_force_zero_field_scales_with_i_b_and_decays_with_gap():
    assert of.force_per_area_pa(replace(ARR, br_t=0.0), 100.0) == 0.0  # no field, no force
    f = of.force_per_area_pa(ARR, 100.0)
    assert of.force_per_area_pa(ARR, 300.0) == pytest.approx(3 * f, rel=1e-12)  # ∝ I
    assert of.force_per_area_pa(replace(ARR, br_t=0.65), 100.0) == pytest.approx(f / 2, rel=1e-12)
    gaps = [of.force_per_area_pa(replace(ARR, magnet_depth_m=d), 100.0) for d in (0.0, 0.01, 0.03)]
    assert gaps[0] > gaps[1] > gaps[2] > 0
    # fundamental dominates far out: decay e^{−k1 d} per unit depth (charge model)
    far = [of.force_per_area_pa(replace(ARR, magnet_depth_m=d), 100.0) for d in (0.05, 0.06)]
    assert far[1] / far[0] == pytest.approx(math.exp(-math.pi / ARR.pitch_m * 0.01), rel=1e-3)
    # magnets over the electrodes (no offset): J and B turn together, no net force
    assert abs(of.force_per_area_pa(replace(ARR, magnet_offset_m=0.0), 100.0)) < 1e-12 * f


def test_operating_point_energy_and_limits():
    p = of.open_field_operating_point(ARR, WATER, 3.0, voltage_v=20.0)
    # conservation of energy: V·I = electrode + Joule + Lorentz work F·V0 (reciprocity)
    assert p.electrical_power_w == pytest.approx(
        p.electrode_loss_w + p.joule_loss_w + p.flow_work_w, rel=1e-12
    )
    assert 0 < p.thrust_n < p.lorentz_force_n
    # inverse: current control at the same current gives the same voltage
    q = of.open_field_operating_point(ARR, WATER, 3.0, current_a=p.current_a)
    assert q.voltage_v == pytest.approx(20.0, rel=1e-12)
    # no boundary-layer friction share: thrust is the Lorentz force
    r = of.open_field_operating_point(
        replace(ARR, bl_friction_share=0.0), WATER, 3.0, voltage_v=20.0
    )
    assert r.thrust_n == pytest.approx(r.lorentz_force_n)
    # inside the dead band no current flows
    z = of.open_field_operating_point(ARR, WATER, 3.0, voltage_v=1.0)
    assert z.current_a == 0.0 and z.thrust_n == 0.0
    # saltier water, lower resistance (Ohm's law: R ∝ 1/σ)
    fresh = water_state(5.0, 15.0)
    assert of.resistance_ohm(ARR, fresh.sigma_s_m) / of.resistance_ohm(ARR, WATER.sigma_s_m) == (
        pytest.approx(WATER.sigma_s_m / fresh.sigma_s_m, rel=1e-12)
    )


def test_bad_arrays():
    with pytest.raises(ModelRangeError, match="electrode_width_m"):
        replace(ARR, electrode_width_m=0.06)
    with pytest.raises(ModelRangeError, match="n_electrodes"):
        replace(ARR, n_electrodes=1)
    with pytest.raises(ModelRangeError, match="command"):
        of.open_field_operating_point(ARR, WATER, 1.0)
