"""The run summary (sim/engine/summary.py): one function for finished runs and partial logs."""

from __future__ import annotations

import pytest
from engine_helpers import ROOT, VESSELS, write_scenario

from sim import api
from sim.analysis.tables import summary_from_series
from sim.analysis.variants import apply_settings, render_toml, variant_vessel_data
from sim.engine.mission import RunObserver
from sim.engine.summary import NOT_FINISHED, SUMMARY_UNITS, summarise
from sim.io.log import read_log

LEGS = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "6 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "6 min" }
"""


def test_finished_bundled_run_summary_is_recomputed_exactly_from_its_log(tmp_path):
    # The runner's summary and the one worked out again from the log's series (with the
    # runner's accumulated totals) come from the same function: equal to the last bit.
    out = api.run_scenario(ROOT / "scenarios" / "glasswort-survey.toml", out=tmp_path / "g.h5")
    log = read_log(out.log_path)
    again = summarise(log.series, ending_reason=log.ending_reason, totals=out.result.totals)
    assert again == out.result.summary
    assert list(again) == list(SUMMARY_UNITS)
    assert log.summary == out.result.summary


def _vessel_with_oxygen(tmp_path) -> str:
    data = variant_vessel_data(VESSELS / "glasswort-drone.toml")
    data = apply_settings(data, [("thruster.0.chlorine_fraction", 0.6)], "test")
    path = tmp_path / "oxygen.toml"
    path.write_text(render_toml(data), encoding="utf-8")
    return str(path)


def test_summary_from_series_alone_agrees_with_the_accumulated_totals(tmp_path):
    # Without the runner's totals (a log that lacks its summary) the energies come from the
    # sampled powers and oxygen from hydrogen and chlorine. Checks:
    # - Faraday's law: H2 = |I|/2F at the cathode, Cl2 = f·|I|/2F and O2 = (1 − f)·|I|/4F at
    #   the anode, so O2 = (H2 − Cl2)/2 exactly in law; the integrator's tolerances only.
    # - energy conservation: V·I into the thrusters = Joule + electrode + friction + wake +
    #   useful (common practice for a DC MHD duct), so the sampled mean efficiency tends to
    #   the accumulated one as the sample interval shrinks (first order: the one-row-per-
    #   instant rule puts a jump at each leg change).
    vessel = _vessel_with_oxygen(tmp_path)
    errors = []
    for sample in ("1 s", "0.2 s"):
        path = write_scenario(tmp_path, LEGS, output=f'sample = "{sample}"')
        text = path.read_text(encoding="utf-8")
        path.write_text(text.replace((VESSELS / "glasswort-drone.toml").as_posix(), vessel))
        res = api.run_scenario(path, write_log=False).result
        full = res.summary
        assert full["o2_total_mol"] > 0
        alone = summarise(res.series, ending_reason=res.ending_reason)
        assert alone["o2_total_mol"] == pytest.approx(full["o2_total_mol"], rel=1e-6)
        for key in ("distance_m", "duration_s", "energy_out_j", "h2_total_mol", "cl2_total_mol"):
            assert alone[key] == full[key], key  # the last sample is the end state
        errors.append(abs(alone["mean_eta_overall"] / full["mean_eta_overall"] - 1))
    assert errors[0] < 1e-2 and errors[1] < 0.4 * errors[0]


def test_partial_log_summary_has_the_keys_of_a_finished_one(tmp_path):
    class Interrupt(RunObserver):
        def progress(self, time_s, limit, wall):
            if time_s > 300:
                raise KeyboardInterrupt

    path = write_scenario(tmp_path, LEGS)
    finished = api.run_scenario(path, out=tmp_path / "whole.h5").result.summary
    with pytest.raises(KeyboardInterrupt):
        api.run_scenario(path, out=tmp_path / "cut.h5", observer=Interrupt())
    log = read_log(tmp_path / "cut.incomplete.h5")
    assert not log.complete and not log.summary
    part = summary_from_series(log.series, log.ending_reason)
    assert list(part) == list(finished) == list(SUMMARY_UNITS)
    assert part["ending_reason"].startswith("interrupted")
    assert 0 < part["distance_m"] < finished["distance_m"]
    assert summary_from_series(log.series)["ending_reason"] == NOT_FINISHED
