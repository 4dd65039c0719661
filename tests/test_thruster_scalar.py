"""The pure-Python operating point used inside the ODE agrees with the vectorised one."""

from __future__ import annotations

import numpy as np
import pytest

from sim.physics.seawater import WaterState
from sim.physics.thruster import DuctThruster, operating_point, prepare_scalar, scalar_point

# seawater SP 35, 15 °C, 0 dbar: σ, ρ, c_p from gsw 3.6.23 (REFERENCES.md); μ Sharqawy (2010)
WATER = WaterState(
    sp=35.0,
    t_c=15.0,
    p_dbar=0.0,
    sigma_s_m=4.2918,
    dsigma_dt_s_m_k=0.0965,
    rho_kg_m3=1025.9765,
    cp_j_kg_k=3993.08,
    mu_pa_s=1.21985e-3,
)


@pytest.mark.parametrize("jet", ["ducted", "disk"])
@pytest.mark.parametrize("speed", [-1.0, 0.0, 0.3, 1.0, 3.0])
@pytest.mark.parametrize(
    "mode,cmd",
    [("voltage_v", v) for v in (-30, -1, 0, 1, 3, 10, 40)]
    + [("current_a", i) for i in (-300, 0, 10, 100, 400)],
)
def test_scalar_matches_vectorised(jet, speed, mode, cmd):
    th = DuctThruster(
        gap_m=0.05,
        height_m=0.05,
        length_m=0.8,
        n_channels=3,
        b_tesla=0.75,
        roughness_m=1e-5,
        k_inlet=0.3,
        jet_model=jet,
        electrode_drop_v=2.3,
        nozzle_area_ratio=0.9,
    )
    vec = operating_point(th, WATER, speed, **{mode: cmd})
    sca = scalar_point(prepare_scalar(th, WATER), speed, **{mode: cmd})
    for name in sca._fields:
        assert getattr(sca, name) == pytest.approx(float(getattr(vec, name)), rel=1e-9, abs=1e-9), (
            name
        )


def test_scalar_energy_identities():
    # V·I = electrode + Joule + flow work; flow work = T·V0 + wake + friction (conservation of
    # energy, derived in sim/physics/thruster.py)
    th = DuctThruster(
        gap_m=0.1, height_m=0.1, length_m=1.0, n_channels=2, b_tesla=5.0, roughness_m=2e-5
    )
    k = prepare_scalar(th, WATER)
    for v0 in (0.0, 2.0, 6.0):
        p = scalar_point(k, v0, voltage_v=60.0)
        assert p.electrical_power_w == pytest.approx(
            p.electrode_loss_w + p.joule_loss_w + p.flow_work_w, rel=1e-12
        )
        assert p.flow_work_w == pytest.approx(
            p.thrust_n * v0 + p.wake_loss_w + p.friction_loss_w, rel=1e-12
        )


def test_changing_the_field_in_place_equals_a_new_thruster():
    th = DuctThruster(
        gap_m=0.1, height_m=0.1, length_m=1.0, n_channels=2, b_tesla=5.0, roughness_m=2e-5
    )
    k = prepare_scalar(th, WATER)
    k.b = 4.0
    a = scalar_point(k, 2.0, voltage_v=50.0)
    th4 = DuctThruster(
        gap_m=0.1, height_m=0.1, length_m=1.0, n_channels=2, b_tesla=4.0, roughness_m=2e-5
    )
    b = scalar_point(prepare_scalar(th4, WATER), 2.0, voltage_v=50.0)
    assert a == b


@pytest.mark.parametrize(
    "extra",
    [
        {"gas_model": "bruggeman"},
        {"gas_model": "maxwell", "gas_slip_ratio": 1.3},
        {"end_effects": True},
        {"galvanic_offset_v": 0.545},
        {"galvanic_offset_v": -0.6, "end_effects": True, "gas_model": "bruggeman"},
    ],
)
@pytest.mark.parametrize("jet", ["ducted", "disk"])
@pytest.mark.parametrize("thermal", [False, True])
def test_scalar_matches_vectorised_with_issue9_options(extra, jet, thermal):
    # the scalar twin of every opt-in option (gas, end effects) and of the galvanic offset
    th = DuctThruster(
        gap_m=0.05,
        height_m=0.05,
        length_m=0.8,
        n_channels=3,
        b_tesla=0.75,
        roughness_m=1e-5,
        k_inlet=0.3,
        jet_model=jet,
        electrode_drop_v=2.3,
        nozzle_area_ratio=0.9,
        **extra,
    )
    k = prepare_scalar(th, WATER)
    speeds = np.array([-1.0, 0.0, 0.05, 1.0, 3.0])
    for mode, cmds in (
        ("voltage_v", np.array([-30.0, -3.0, 0.0, 3.0, 10.0, 40.0])),
        ("current_a", np.array([-300.0, 0.0, 10.0, 100.0, 400.0])),
    ):
        v0, c = np.meshgrid(speeds, cmds)
        vec = operating_point(th, WATER, v0, thermal_feedback=thermal, **{mode: c})
        for i in np.ndindex(v0.shape):
            sca = scalar_point(k, float(v0[i]), thermal_feedback=thermal, **{mode: float(c[i])})
            for name in sca._fields:
                assert getattr(sca, name) == pytest.approx(
                    float(getattr(vec, name)[i]), rel=1e-9, abs=1e-9
                ), (name, v0[i], mode, c[i])
