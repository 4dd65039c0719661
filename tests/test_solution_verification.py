"""Solution verification of the step-by-step TR-BDF2 integrator (issue 11).

Each case is flown twice on the same plant: with the default solver (TR-BDF2 at rtol 1e-5, what
a scenario without a [solver] table runs), and with scipy's Radau IIA (order 5, an independent
general-purpose stiff integrator: Hairer & Wanner 1996, Solving ODEs II, §IV.8;
scipy.integrate.Radau) at rtol 1e-10 with a 10 s maximum step, taken as the exact solution.
Targets (issue 11): distance, energy drawn at the pack terminals and end state of charge within
0.05 %; the same events in the same order, each within one sample interval.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

import pytest
from engine_helpers import write_scenario

from sim import api
from sim.engine.mission import MissionRunner
from sim.engine.spec import DEFAULT_METHOD, default_rtol

ROOT = Path(__file__).resolve().parent.parent
REL = 5e-4  # 0.05 % (issue 11)

TEN_HOUR_HOLD = """
[[leg]]
name = "hold"
speed = "0.8 kn"
until = { duration = "10 h" }
"""


def _fly(path: Path, method: str, rtol: float, max_step_s: float):
    loaded = api.load_scenario(path)
    plant = api.plant_for(loaded)
    spec = loaded.mission_spec
    solver = dataclasses.replace(spec.solver, method=method, rtol=rtol, max_step_s=max_step_s)
    spec = dataclasses.replace(spec, solver=solver)
    return MissionRunner(plant, spec).run(), spec.sample_s


def _verify(path: Path) -> None:
    fast, sample_s = _fly(path, DEFAULT_METHOD, default_rtol(DEFAULT_METHOD), 600.0)
    exact, _ = _fly(path, "Radau", 1e-10, 10.0)
    for key in ("distance_m", "energy_out_j", "end_state_of_charge"):
        a, b = float(exact.summary[key]), float(fast.summary[key])
        assert b == pytest.approx(a, rel=REL), key
    assert [e["kind"] for e in fast.events] == [e["kind"] for e in exact.events]
    for ef, ee in zip(fast.events, exact.events, strict=True):
        assert abs(ef["time_s"] - ee["time_s"]) <= sample_s, (ef, ee)
    assert fast.ending_reason == exact.ending_reason


def test_a_scenario_without_solver_table_runs_the_verified_method():
    spec = api.load_scenario(ROOT / "scenarios" / "glasswort-survey.toml").mission_spec
    assert (spec.solver.method, spec.solver.rtol) == ("TR-BDF2", 1e-5)


@pytest.mark.parametrize("name", ["glasswort-survey.toml", "halite-coastal-trial.toml"])
def test_bundled_mission_matches_a_tight_radau_solution(name):
    _verify(ROOT / "scenarios" / name)


def test_ten_hour_hold_matches_a_tight_radau_solution(tmp_path):
    p = write_scenario(
        tmp_path,
        TEN_HOUR_HOLD,
        start="state_of_charge = 1.0",
        output='sample = "60 s"',
        limits='time = "11 h"',
    )
    _verify(p)
