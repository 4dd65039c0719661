"""Figures, run report and the analysis commands, headless: the data behind each plot, its axes
and labels are checked, not pixels."""

from __future__ import annotations

import base64
import html

import numpy as np
import pytest
from engine_helpers import VESSELS, write_scenario
from matplotlib.figure import Figure

from sim import api
from sim.analysis import curves as cv
from sim.analysis import plots, reach
from sim.analysis import variants as va
from sim.analysis.report import report_html, write_report
from sim.analysis.units import METRIC, NAUTICAL
from sim.cli import main
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.io.log import read_log
from sim.safety import CAUTIONS

LEGS = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "3 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "3 min" }

[[leg]]
name = "glide"
voltage = "0 V"
until = { speed_below = "0.2 m/s" }
"""


@pytest.fixture(scope="module")
def run_log(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("run")
    out = api.run_scenario(write_scenario(tmp, LEGS, output='sample = "5 s"'), out=tmp / "run.h5")
    return read_log(out.log_path)


@pytest.fixture(scope="module")
def comparison(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("cmp")
    scen = write_scenario(tmp, LEGS)
    return va.compare_variants(
        scen, va.variants_from_options([], ["thruster.0.field=0.6T,1T"]), jobs=1, title="two fields"
    )


@pytest.fixture(scope="module")
def plant():
    v = api.load_vessel(VESSELS / "glasswort-drone.toml")
    return build_plant(v.vessel_spec, Water(salinity=35.0, temperature_c=15.0))


def _labels(ax) -> list[str]:
    return [line.get_label() for line in ax.get_lines()]


def _line(ax, label):
    return next(line for line in ax.get_lines() if line.get_label() == label)


def test_unit_systems():
    # 1 kn = 1852 m / 3600 s and 1 nmi = 1852 m (international definitions, 1929).
    assert NAUTICAL.speed(1852.0 / 3600.0) == pytest.approx(1.0)
    assert NAUTICAL.distance(1852.0) == pytest.approx(1.0)
    assert METRIC.distance(1000.0) == 1.0 and METRIC.speed(2.0) == 2.0
    assert NAUTICAL.energy_per_distance(3600.0 / 1852.0) == pytest.approx(1.0)  # 1 Wh/nmi


def test_overlay_figure_holds_every_variant_against_time_and_distance(comparison):
    fig = plots.overlay_figure(comparison, "nautical")
    assert isinstance(fig, Figure) and fig.canvas.__class__.__name__ == "FigureCanvasAgg"
    axes = fig.axes
    assert len(axes) == 6
    assert fig.get_suptitle() == "two fields: variants compared"
    assert [a.get_ylabel() for a in axes] == [
        "speed over ground [kn]",
        "speed over ground [kn]",
        "pack power [kW]",
        "pack power [kW]",
        "state of charge [%]",
        "state of charge [%]",
    ]
    assert {a.get_xlabel() for a in axes[0::2]} == {"time [min]"}
    assert {a.get_xlabel() for a in axes[1::2]} == {"distance over ground [nmi]"}
    labels = [r.label for r in comparison.ranked]
    for a in axes:
        assert _labels(a) == labels
    r = comparison.runs[0]
    speed = _line(axes[0], r.label)
    assert np.allclose(speed.get_xdata(), r.series["time_s"] / 60.0)
    assert np.allclose(speed.get_ydata(), r.series["speed_over_ground_m_s"] * 3600 / 1852)
    soc = _line(axes[5], r.label)
    assert np.allclose(soc.get_xdata(), r.series["distance_m"] / 1852.0)
    assert np.allclose(soc.get_ydata(), 100 * r.series["state_of_charge"])
    # greyscale: the variants differ in line style and marker, not only colour
    lines = axes[0].get_lines()
    assert lines[0].get_linestyle() != lines[1].get_linestyle()
    assert lines[0].get_marker() != lines[1].get_marker()


def test_run_and_breakdown_figures_show_the_logged_series(run_log):
    s = run_log.series
    fig = plots.run_figure(
        s,
        "metric",
        title="t",
        legs=run_log.legs,
        columns=run_log.columns["duct_temperature_rise_k"],
    )
    ax = fig.axes
    assert [a.get_title() for a in ax] == [
        "speed",
        "distance",
        "power",
        "state of charge",
        "cell terminal voltage",
        "duct outlet temperature rise",
    ]
    assert ax[0].get_ylabel() == "speed [m/s]" and ax[1].get_ylabel() == "distance [km]"
    assert np.allclose(_line(ax[0], "through water").get_ydata(), s["speed_through_water_m_s"])
    assert np.allclose(_line(ax[1], "distance over ground").get_ydata(), s["distance_m"] / 1e3)
    assert _labels(ax[2])[:3] == ["pack terminals", "into thrusters", "thrust × speed"]
    assert np.allclose(_line(ax[4], "cell voltage").get_ydata(), s["cell_voltage_v"])
    assert _labels(ax[5])[0] == "pylon"
    fig2 = plots.power_breakdown_figure(s)
    a = fig2.axes[0]
    assert a.get_ylabel().startswith("power [") and a.get_xlabel() == "time [min]"
    # energy conservation of the drive model: where no term is negative (the thrusters drive;
    # a coasting duct drags, making thrust × speed negative) the stack is the pack power
    parts = np.array([s[k] for k, _ in plots.BREAKDOWN])
    driving = np.all(parts >= 0, axis=0)
    assert driving.sum() > 10
    assert np.allclose(parts.sum(axis=0)[driving], s["pack_power_w"][driving], rtol=1e-6)
    assert len(a.collections) == len(plots.BREAKDOWN)


def test_range_and_thruster_figures(plant, tmp_path):
    curve = reach.range_curve(plant, np.geomspace(0.08, 0.8, 6), soc=0.5, soc_min=0.1, refine=False)
    fig = plots.range_figure([curve], "nautical", at_speed_m_s=0.3)
    ax = fig.axes
    assert [a.get_title() for a in ax] == [
        "pack power at steady speed",
        "range to cut-off",
        "endurance to cut-off",
        "energy per distance",
    ]
    assert {a.get_xlabel() for a in ax} == {"speed through water [kn]"}
    assert ax[1].get_ylabel() == "range [nmi]" and ax[2].get_ylabel() == "endurance [h]"
    line = _line(ax[1], curve.label)
    assert np.allclose(line.get_ydata(), curve.range_m / 1852.0)
    assert f"best range, {curve.label}" in _labels(ax[1])

    fam = cv.thrust_flow_family(plant, voltages_v=[10.0, 40.0], speeds_m_s=np.linspace(0, 1.2, 7))
    f2 = plots.thrust_flow_figure(fam)
    a = f2.axes[0]
    assert _labels(a) == ["10 V", "40 V", "steady operating line (thrust = resistance)"]
    assert a.get_xlabel() == "volume flow through the unit [L/s]"
    assert a.get_ylabel() == "thrust of one unit [N]"
    assert np.allclose(_line(a, "40 V").get_xdata(), fam.flow_m3_s[1] * 1e3)

    sc = cv.speed_curves(plant, [0.2, 0.5, 0.8])
    f3 = plots.speed_curves_figure(sc, "metric")
    assert _labels(f3.axes[0]) == ["overall", "electrical", "propulsive"]
    assert np.allclose(_line(f3.axes[0], "overall").get_ydata(), 100 * sc.overall_efficiency)
    assert f3.axes[1].get_ylabel() == "current [A]"

    m = cv.efficiency_map(plant, speed_m_s=0.5, n=5)
    f4 = plots.efficiency_map_figure(m)
    a = f4.axes[0]
    assert a.get_xlabel() == "electrode gap (duct width) [mm]"
    assert a.get_ylabel() == "mean gap field [T]"
    assert f4.axes[1].get_ylabel() == "overall efficiency [%]"  # the colour bar
    star = _line(a, f"design ({100 * m.design_efficiency:.3g} %)")
    assert star.get_xdata()[0] == pytest.approx(1000 * m.design_gap_m)

    paths = plots.save_figure(f4, tmp_path / "map", pdf=True)
    assert paths[0].read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert paths[1].read_bytes()[:5] == b"%PDF-"


def test_report_is_self_contained_with_tables_figures_provenance_and_cautions(run_log, tmp_path):
    text = report_html(run_log, units="metric")
    assert text.startswith("<!DOCTYPE html>")
    for section in ("Summary", "Legs", "Range left", "Run", "Safety", "Events", "Provenance"):
        assert f"<h2>{section}</h2>" in text
    for leg in ("dash", "slow", "glide"):
        assert f'<td class="text">{leg}</td>' in text or f"<td>{leg}</td>" in text
    assert "distance km" in text and "Wh/km" in text
    imgs = text.split("src='data:image/png;base64,")[1:]
    assert len(imgs) == 2
    assert base64.b64decode(imgs[0].split("'")[0])[:4] == b"\x89PNG"
    assert "http://" not in text and "https://" not in text  # nothing to fetch
    for c in CAUTIONS:
        assert html.escape(c) in text
    assert "Gas produced:" in text
    assert html.escape('name = "test"') in text  # scenario file excerpt from the log
    assert "Glasswort survey drone" in text  # vessel name from the provenance
    out = write_report(run_log, tmp_path / "r.html")
    assert out.read_text(encoding="utf-8").count("<img") == 2


def test_report_of_a_partial_log(tmp_path):
    stop = '[[trigger]]\nname = "cut"\nwhen = { time_after = "4 min" }\nthen = "stop"\n'
    out = api.run_scenario(write_scenario(tmp_path, LEGS, extra=stop), out=tmp_path / "p.h5")
    log = read_log(out.log_path)
    text = report_html(log, range_estimate=False)
    assert "stopped by trigger" in text and "Range left" not in text


def test_analysis_commands_run_and_exit_zero(run_log, tmp_path, capsys):
    log = str(run_log.path)
    assert main(["reach", log, "--reserve", "0.6", "--units", "metric", "--no-best"]) == 0
    out = capsys.readouterr().out
    for text in (
        "where the run stands",
        "energy by leg",
        "range left",
        "last driving leg",
        "reserve SOC 60 %",
        "slow",
    ):
        assert text in out
    assert main(["report", log, "--out", str(tmp_path / "rep.html"), "--no-range"]) == 0
    assert (tmp_path / "rep.html").exists()
    vessel = str(VESSELS / "glasswort-drone.toml")
    assert (
        main(
            [
                "range-curve",
                vessel,
                "--speeds",
                "0.1 kn,0.3 kn,1 kn",
                "--soc",
                "0.4",
                "--at",
                "0.5 kn",
                "--water",
                "35,15 degC",
                "--water",
                "10,15 degC",
                "--plots",
                str(tmp_path),
                "--pdf",
            ]
        )
        == 0
    )
    out = capsys.readouterr().out
    assert "SP 10, 15 °C" in out and "range at 0.5 kn" in out
    assert (tmp_path / "glasswort-drone-range.pdf").exists()
    assert (
        main(
            [
                "thruster-curves",
                vessel,
                "--grid",
                "4",
                "--speed",
                "1 kn",
                "--voltages",
                "10 V,30 V",
                "--plots",
                str(tmp_path),
            ]
        )
        == 0
    )
    for suffix in ("thrust-flow", "speed", "map"):
        assert (tmp_path / f"glasswort-drone-pylon-{suffix}.png").exists()
    # bad options are user errors (exit 2), not tracebacks
    assert main(["reach", str(tmp_path / "missing.h5")]) == 2
    assert main(["range-curve", vessel, "--water", "salty"]) == 2
    assert main(["thruster-curves", vessel, "--thruster", "port"]) == 2
    assert main(["report", log, "--reserve", "2"]) == 2
