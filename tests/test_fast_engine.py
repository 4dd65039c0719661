"""The step-by-step stiff integrator (sim.engine.integrator) against closed-form solutions, and
the mission driven by it (events, sample grid, no restarts at flush points)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from engine_helpers import write_scenario

from sim import api
from sim.engine.integrator import TRBDF2, StepDense


def _run(stepper: TRBDF2) -> list[StepDense]:
    pieces = []
    while stepper.t < stepper.t_bound:
        stepper.step()
        pieces.append(stepper.dense)
    return pieces


def test_stiff_linear_problem_matches_its_closed_form():
    # Prothero–Robinson problem y' = λ(y − cos t) − sin t, y(0) = 1: the exact solution is cos t
    # for any λ (Prothero & Robinson 1974, Math. Comp. 28, 145–162); λ = −1e4 is stiff. A second
    # component integrates y (a quadrature): exact value sin t.
    lam = -1.0e4

    def fun(t, y):
        return np.array([lam * (y[0] - math.cos(t)) - math.sin(t), y[0]])

    st = TRBDF2(
        fun,
        0.0,
        np.array([1.0, 0.0]),
        10.0,
        rtol=1e-6,
        atol=np.array([1e-8, 1e-8]),
        max_step=1.0,
        dynamic=[0],
    )
    pieces = _run(st)
    assert st.t == 10.0
    assert st.y[0] == pytest.approx(math.cos(10.0), abs=1e-5)
    assert st.y[1] == pytest.approx(math.sin(10.0), abs=1e-4)
    # a stiff method needs no step near 1/|λ|: an explicit one would need |hλ| ≲ 3, > 3e4 steps
    assert st.n_steps < 2000
    # the dense output between the step ends (cubic Hermite)
    p = pieces[len(pieces) // 2]
    tm = 0.5 * (p.t0 + p.t1)
    assert p(tm)[0] == pytest.approx(math.cos(tm), abs=1e-4)
    assert p(np.array([p.t0, p.t1])).shape == (2, 2)


def test_exponential_decay_and_growth_to_tolerance():
    # y' = −y and y' = +0.1 y (exact e^−t, e^0.1t; common practice)
    def fun(t, y):
        return np.array([-y[0], 0.1 * y[1]])

    st = TRBDF2(
        fun,
        0.0,
        np.array([1.0, 1.0]),
        5.0,
        rtol=1e-8,
        atol=np.full(2, 1e-12),
        max_step=10.0,
        dynamic=[0, 1],
    )
    _run(st)
    assert st.y[0] == pytest.approx(math.exp(-5.0), rel=1e-5)
    assert st.y[1] == pytest.approx(math.exp(0.5), rel=1e-6)


def test_mission_event_and_grid_with_the_stepper(tmp_path):
    # a coast-down leg ended by a speed event: TR-BDF2 locates it where Radau at rtol 1e-10
    # does (scipy.integrate.Radau as the reference, Hairer & Wanner 1996), within a sample.
    legs = """
[[leg]]
name = "run"
voltage = "12 V"
until = { duration = "10 min" }
[[leg]]
name = "coast"
current = "0 A"
until = { speed_below = "0.2 kn" }
"""
    times = {}
    for method, rtol in (("TR-BDF2", "1e-5"), ("Radau", "1e-10")):
        p = write_scenario(
            tmp_path,
            legs,
            name=f"{method}.toml",
            output='sample = "1 s"',
            solver=f'method = "{method}"\nrtol = {rtol}\nmax_step = "10 s"',
        )
        res = api.run_scenario(p, write_log=False).result
        times[method] = [e["time_s"] for e in res.events if e["kind"] == "leg end"]
        t = res.series["time_s"]
        k = np.rint(t / 1.0)
        on = np.abs(t - k) < 1e-9
        assert np.unique(k[on]).size == on.sum() == int(t[-1]) + 1  # every grid point once
    assert len(times["TR-BDF2"]) == len(times["Radau"]) == 2
    for a, b in zip(times["TR-BDF2"], times["Radau"], strict=True):
        assert a == pytest.approx(b, abs=1.0)
