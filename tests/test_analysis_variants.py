"""Variant comparison (sim/analysis/variants.py) and the `brinebolt versus` command."""

from __future__ import annotations

import os
import subprocess
import sys
import tomllib

import pytest
from engine_helpers import ROOT, VESSELS, write_scenario

from sim.analysis import variants as va
from sim.cli import main
from sim.io.files import InputError
from sim.io.log import read_log

SHORT = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "4 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "4 min" }
"""


def test_values_and_settings_are_parsed():
    assert va.parse_value("4") == 4
    assert va.parse_value("0.08") == 0.08
    assert va.parse_value("80 mm") == "80 mm"
    assert va.parse_value('"N42SH"') == "N42SH"
    assert va.parse_value("true") is True
    assert va.parse_setting("thruster.0.gap=50mm, 80 mm") == ("thruster.0.gap", ["50mm", "80 mm"])
    for bad in ("thruster.0.gap", "=1", "battery.parallel= , "):
        with pytest.raises(ValueError, match=r"allowed|no value"):
            va.parse_setting(bad)


def test_settings_reach_thrusters_by_index_or_name_and_all_problems_are_listed():
    data = va.variant_vessel_data(VESSELS / "glasswort-drone.toml")
    out = va.apply_settings(
        data,
        [
            ("thruster.0.gap", "80 mm"),
            ("thruster.pylon.field", "1 T"),
            ("drive.undervoltage_margin", "0.1 V"),
        ],
        "t",
    )
    assert out["thruster"][0]["gap"] == "80 mm" and out["thruster"][0]["field"] == "1 T"
    assert out["drive"]["undervoltage_margin"] == "0.1 V"
    assert data["thruster"][0]["gap"] == "50 mm"  # the input is not touched
    with pytest.raises(InputError) as err:
        va.apply_settings(
            data, [("thruster.port.gap", 1), ("thruster.4.gap", 1), ("vessel.name.x", 1)], "t"
        )
    assert len(err.value.problems) == 3
    text = str(err.value)
    assert "pylon" in text and "past the end" in text and "single value" in text


@pytest.mark.parametrize("name", ["glasswort-drone.toml", "halite-concept.toml"])
def test_rendered_toml_reads_back_to_the_same_data(name):
    # TOML v1.0.0 specification: a document written from tables, arrays of tables, strings,
    # numbers and booleans parses (stdlib tomllib) to the same data.
    data = va.variant_vessel_data(VESSELS / name)
    assert tomllib.loads(va.render_toml(data, "a header\nof two lines")) == data


def test_grid_of_settings_and_vessels():
    vs = va.variants_from_options([], ["thruster.0.gap=50mm,80mm", "battery.parallel=4,6"])
    assert [v.label for v in vs] == [
        "gap 50mm, parallel 4",
        "gap 50mm, parallel 6",
        "gap 80mm, parallel 4",
        "gap 80mm, parallel 6",
    ]
    vs = va.variants_from_options([VESSELS / "glasswort-drone.toml", "other.toml"])
    assert [v.label for v in vs] == ["glasswort-drone", "other"]


def test_bundled_variants_file_is_valid_and_bad_files_list_every_problem(tmp_path):
    vf = va.read_variants_file(ROOT / "scenarios" / "variants-glasswort-gaps.toml")
    assert vf.scenario.name == "glasswort-survey.toml"
    assert [v.settings for v in vf.variants] == [
        (),
        (("thruster.pylon.gap", "80 mm"),),
        (("thruster.pylon.gap", "120 mm"),),
    ]
    bad = tmp_path / "bad.toml"
    bad.write_text(
        'scenario = "nowhere.toml"\ncolour = 1\n[[variant]]\nlabel = "a"\n'
        'set = 3\n[[variant]]\nlabel = "a"\nvessel = "missing.toml"\nwhat = 1\n',
        encoding="utf-8",
    )
    with pytest.raises(InputError) as err:
        va.read_variants_file(bad)
    keys = sorted(p.key for p in err.value.problems)
    assert keys == [
        "colour",
        "scenario",
        "variant[0].set",
        "variant[1].label",
        "variant[1].vessel",
        "variant[1].what",
    ]


def test_variants_fly_through_sim_flight_not_the_python_face():
    # Layering (issue 8): the analysis sits below sim.api; variants fly with sim.flight.
    code = (
        "import sys, sim.analysis.variants; "
        "print('sim.flight' in sys.modules, 'sim.api' in sys.modules)"
    )
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    out = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, env=env, capture_output=True, text=True, check=True
    )
    assert out.stdout.split() == ["True", "False"]


def test_invalid_variant_is_reported_before_anything_flies(tmp_path):
    scen = write_scenario(tmp_path, SHORT)
    bad = [
        va.Variant("ok"),
        va.Variant("neg", settings=(("thruster.0.gap", "-5 mm"),)),
        va.Variant("typo", settings=(("battery.paralel", 2),)),
    ]
    with pytest.raises(InputError) as err:
        va.compare_variants(scen, bad, jobs=1)
    # each problem names the setting that caused it and its variant (issue 10)
    text = [str(p) for p in err.value.problems]
    assert any("thruster.0.gap" in t and "neg" in t and "out of range" in t for t in text)
    assert any("battery.paralel" in t and "typo" in t and "unknown key" in t for t in text)


def test_parallel_runs_keep_input_order_and_match_serial_runs(tmp_path):
    # Determinism: the same variants flown on two worker processes and in this process give
    # identical summaries, in input order, whatever order the workers finish in.
    scen = write_scenario(tmp_path, SHORT)
    vs = va.variants_from_options([], ["thruster.0.gap=120mm,50mm,80mm"])
    par = va.compare_variants(scen, vs, jobs=2)
    ser = va.compare_variants(scen, vs, jobs=1)
    assert all(r.ok for r in par.runs + ser.runs)
    assert [r.label for r in par.runs] == ["gap 120mm", "gap 50mm", "gap 80mm"]
    assert [r.summary for r in par.runs] == [r.summary for r in ser.runs]
    assert par.order == ser.order
    assert par.rank_basis.startswith("all completed the mission: least energy")
    e = [r.value("energy_per_distance_j_m") for r in par.ranked]
    assert e == sorted(e)
    by_distance, basis = va.rank_runs(par.runs, "distance")
    d = [par.runs[i].value("distance_m") for i in by_distance]
    assert d == sorted(d, reverse=True) and basis == "greatest distance first"


def test_versus_command_prints_the_ranked_table_and_writes_figure_and_logs(tmp_path, capsys):
    scen = write_scenario(tmp_path, SHORT)
    code = main(
        [
            "versus",
            str(scen),
            "--set",
            "thruster.pylon.gap=50mm,80mm",
            "--jobs",
            "2",
            "--plots",
            str(tmp_path / "fig"),
            "--pdf",
            "--logs",
            str(tmp_path / "logs"),
            "--units",
            "metric",
        ]
    )
    out = capsys.readouterr().out
    assert code == 0
    for text in (
        "gap 50mm",
        "gap 80mm",
        "distance km",
        "Wh/nmi",
        "Wh/km",
        "η overall %",
        "peak duct ΔT K",
        "H₂ L",
        "Cl₂ g",
        "ended by",
        "mission complete",
    ):
        assert text in out
    assert (tmp_path / "fig" / "s-versus.png").stat().st_size > 10_000
    assert (tmp_path / "fig" / "s-versus.pdf").exists()
    # each variant's log holds the vessel actually flown
    log = read_log(tmp_path / "logs" / "gap-80mm.h5")
    assert tomllib.loads(log.attrs["vessel_text"])["thruster"][0]["gap"] == "80mm"


def test_versus_command_refuses_nothing_to_compare(tmp_path, capsys):
    scen = write_scenario(tmp_path, SHORT)
    assert main(["versus", str(scen)]) == 2
    assert "nothing to compare" in capsys.readouterr().err
    assert main(["versus", str(scen), "--set", "thruster.0.gap"]) == 2
