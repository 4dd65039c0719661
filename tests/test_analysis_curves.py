"""Thruster performance curves (sim/analysis/curves.py)."""

from __future__ import annotations

import numpy as np
import pytest
from engine_helpers import VESSELS

from sim import api
from sim.analysis import curves as cv
from sim.engine.model import Control
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.engine.steady import steady_speed_for


@pytest.fixture(scope="module")
def plant():
    v = api.load_vessel(VESSELS / "glasswort-drone.toml")
    return build_plant(v.vessel_spec, Water(salinity=35.0, temperature_c=15.0))


def test_overall_efficiency_is_electrical_times_propulsive(plant):
    # Definitions (Way 1968, J. Hydronautics 2(2)): η_e = Δp·Q/(V·I), η_p = T·V0/(Δp·Q), so
    # η_overall = T·V0/(V·I) = η_e·η_p exactly.
    sc = cv.speed_curves(plant, np.linspace(0.1, 1.0, 6))
    ok = np.isfinite(sc.overall_efficiency)
    assert ok.all()
    assert np.allclose(
        sc.overall_efficiency, sc.electrical_efficiency * sc.propulsive_efficiency, rtol=1e-9
    )
    # power bookkeeping: pack = thrusters / drive efficiency + hotel (drive model definition)
    assert np.allclose(
        sc.pack_power_w, sc.thruster_power_w / plant.drive_efficiency + plant.hotel_w, rtol=1e-9
    )


def test_thrust_falls_with_flow_at_fixed_voltage_and_curves_meet_the_operating_line(plant):
    # Way (1968): J = σ(E − uB), so at a fixed voltage a faster duct flow (more back-EMF uB)
    # carries less current and gives less thrust. Newton's second law at steady speed: where a
    # voltage's curve is flown at the vessel's steady speed for that voltage, the unit's thrust
    # equals its share of the hull resistance.
    volts = np.array([10.0, 20.0, 30.0])
    fam = cv.thrust_flow_family(
        plant, "pylon", voltages_v=volts, speeds_m_s=np.linspace(0.0, 1.5, 31)
    )
    for i in range(len(volts)):
        t = fam.thrust_n[i][np.isfinite(fam.thrust_n[i])]
        q = fam.flow_m3_s[i][np.isfinite(fam.thrust_n[i])]
        assert np.all(np.diff(t) < 0) and np.all(np.diff(q) > 0)
    v = steady_speed_for(plant, Control(mode="voltage", setpoint=20.0, hotel_w=plant.hotel_w))
    fam2 = cv.thrust_flow_family(plant, 0, voltages_v=[20.0], speeds_m_s=[v])
    w = plant.water
    share = plant.resistance.resistance_n(v, w.rho_kg_m3, w.nu_m2_s) / plant.n_units
    # magnets at the water temperature here, at the duct-mean temperature in the steady solve
    # (a few mK warmer): 1e-4
    assert fam2.thrust_n[0, 0] == pytest.approx(share, rel=1e-4)


def test_efficiency_map_reproduces_the_design_and_rises_with_field(plant):
    # At the design point the map gives the steady point's efficiency (same equations); at a
    # fixed gap a stronger field needs less current for the same Lorentz force I·B·gap, so
    # Joule loss falls and overall efficiency rises (Way 1968, η_e = uB/E).
    d = plant.thrusters[0]
    m = cv.efficiency_map(
        plant,
        speed_m_s=0.5,
        gaps_m=[d.duct.gap_m, 2 * d.duct.gap_m],
        fields_t=[0.375, 0.75, 1.5, 3.0],
    )
    assert m.overall_efficiency.shape == (4, 2)
    assert np.all(np.diff(m.overall_efficiency, axis=0) > 0)
    design = cv.efficiency_map(
        plant, speed_m_s=0.5, gaps_m=[d.duct.gap_m], fields_t=[m.design_field_t]
    )
    assert design.overall_efficiency[0, 0] == pytest.approx(m.design_efficiency, rel=1e-4)
    # Momentum theory bound (issue 9: "thrust ≤ I·B·gap" was wrong, the ducted bollard thrust is
    # twice the Lorentz force): with the jet at ambient pressure ½ρ(u_j² − V0²) ≤ Δp_L, so
    # T = ρ r A u_j(u_j − V0) ≤ 2 r Δp_L A = 2 r I·B·gap (r = nozzle area ratio)
    r = d.duct.nozzle_area_ratio if d.duct.jet_model == "ducted" else 1.0
    lorentz = m.current_a * m.fields_t[:, None] * m.gaps_m[None, :]
    assert np.all(m.thrust_n <= 2.0 * r * lorentz * 1.0001)


def test_thruster_is_found_by_name_or_index(plant):
    assert cv.thruster_index(plant, "pylon") == 0
    assert cv.thruster_index(plant, "0") == 0
    with pytest.raises(ValueError, match="allowed: pylon"):
        cv.thruster_index(plant, "port")
    with pytest.raises(ValueError, match="out of range"):
        cv.thruster_index(plant, 3)
