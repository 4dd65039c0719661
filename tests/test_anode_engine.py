"""Sacrificial anodes in the engine: one charge accumulator per design, the anode-mass channel,
the summary key, the automatic stop, and no anodic gas."""

from __future__ import annotations

import numpy as np
import pytest
from engine_helpers import VESSELS, write_scenario

from sim import api
from sim.physics import electrodes
from sim.physics.electrochem import FARADAY_C_MOL

TWO_DESIGNS = """
extends = "{base}"

[[thruster]]
name = "port"
units = 1
gap = "50 mm"
pole_height = "50 mm"
active_length = "0.8 m"
channels = 3
field = "0.75 T"
anode = "aluminium_zinc_indium"
cathode = "copper"
anode_mass = "{m_port}"

[[thruster]]
name = "keel"
units = 2
gap = "40 mm"
pole_height = "50 mm"
active_length = "0.6 m"
channels = 2
field = "0.75 T"
anode = "zinc"
cathode = "copper"
anode_mass = "{m_keel}"
"""


def _run(tmp_path, legs, m_port="2 kg", m_keel="3 kg"):
    v = tmp_path / "two.toml"
    base = (VESSELS / "glasswort-drone.toml").as_posix()
    v.write_text(TWO_DESIGNS.format(base=base, m_port=m_port, m_keel=m_keel))
    scen = write_scenario(tmp_path, legs, vessel="x.toml", output='sample = "2 s"')
    scen.write_text(scen.read_text().replace((VESSELS / "x.toml").as_posix(), v.name))
    return api.run_scenario(scen, write_log=False).result


def _charge_per_unit(out, k, units):
    t = out.series["time_s"]
    amps = np.abs(out.series["thruster_current_a"][:, k]) / units
    return float(np.sum(0.5 * (amps[1:] + amps[:-1]) * np.diff(t)))


def test_each_design_consumes_its_own_anode_by_faraday(tmp_path):
    legs = '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { duration = "10 min" }'
    out = _run(tmp_path, legs)
    left = out.series["anode_mass_left_kg"]
    assert left.shape[1] == 2
    # Faraday's law with the design (practical) capacity of DNV-RP-B401 (2017) Table 10-6:
    # Al–Zn–In 2000 A·h/kg, zinc 780 A·h/kg (both in sim.physics.electrodes, checked there)
    q_port = _charge_per_unit(out, 0, 1)
    q_keel = _charge_per_unit(out, 1, 2)
    # parallel channels: each unit's anodes pass the unit current
    assert 2.0 - left[-1, 0] == pytest.approx(q_port / 3600 / 2000, rel=2e-3)
    assert 3.0 - left[-1, 1] == pytest.approx(q_keel / 3600 / 780, rel=2e-3)
    assert out.summary["anode_mass_left_kg"] == pytest.approx(min(left[-1]), rel=1e-12)
    # Faraday totals: n_H2 = ∫I dt/(2F) over all units (z = 2 for hydrogen)
    q_all = q_port + 2 * q_keel
    assert out.summary["h2_total_mol"] == pytest.approx(q_all / (2 * FARADAY_C_MOL), rel=2e-3)
    # a dissolving anode evolves no gas: no chlorine and no oxygen (common practice)
    assert out.summary["cl2_total_mol"] == 0.0 and out.summary["o2_total_mol"] == 0.0


def test_the_run_stops_when_the_first_anode_is_spent(tmp_path):
    legs = '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { duration = "2 h" }'
    out = _run(tmp_path, legs, m_port="20 g", m_keel="3 kg")
    assert out.ending_reason == "sacrificial anode spent"
    left = out.series["anode_mass_left_kg"][-1]
    # utilisation 0.85 (DNV-RP-B401, from memory): 15 % of the port anode is left, exactly
    assert left[0] == pytest.approx(0.15 * 0.02, rel=1e-6)
    assert left[1] > 2.9
    q = _charge_per_unit(out, 0, 1)
    assert electrodes.consumed_mass_kg(q, "aluminium_zinc_indium") == pytest.approx(
        0.85 * 0.02, rel=5e-3
    )


def test_no_anode_channel_without_a_tracked_anode(tmp_path):
    legs = '[[leg]]\nname = "run"\nvoltage = "20 V"\nuntil = { duration = "1 min" }'
    out = api.run_scenario(write_scenario(tmp_path, legs), write_log=False).result
    assert "anode_mass_left_kg" not in out.series
    assert "anode_mass_left_kg" not in out.summary
