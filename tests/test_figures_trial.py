"""Figures and the report after the field trial of issue 10: user text never parsed as
mathtext, start-up spikes clipped, twelve distinct line styles, legends off the data, leg
names, the efficiency map's edge and buildable-field limit, and the report's file rules.
The data behind each figure is checked (lines, texts), not pixels."""

from __future__ import annotations

import io
import os
from pathlib import Path

import numpy as np
import pytest
from engine_helpers import VESSELS, write_scenario
from matplotlib import cbook
from matplotlib.colors import to_hex

from sim import api
from sim.analysis import curves as cv
from sim.analysis import plots
from sim.analysis import variants as va
from sim.analysis.report import ReportExistsError, report_html, write_report
from sim.cli import main
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.io.log import read_log

HOSTILE = ["$\\frac{$", "a\\b $x$", "$", "50% _^{}", "<b>&amp;</b>"]

LEGS = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "3 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "3 min" }
"""


def _draw(fig) -> None:
    fig.savefig(io.BytesIO(), format="png", dpi=40)  # draws every text: mathtext would raise


def _texts(fig) -> list[str]:
    return [t.get_text() for t in fig.findobj(lambda a: hasattr(a, "get_text"))]


def _run(i, label, *, spike=False):
    t = np.arange(0.0, 3600.0, 5.0)
    power = np.full_like(t, 200.0 + 10 * i)
    if spike:
        power[:2] = 5000.0  # the start-up power spike
    series = {
        "time_s": t,
        "distance_m": 0.5 * t,
        "speed_through_water_m_s": np.full_like(t, 0.5),
        "speed_over_ground_m_s": np.full_like(t, 0.5),
        "pack_power_w": power,
        "thruster_power_w": 0.9 * power,
        "state_of_charge": 0.9 - t / 36000.0,
        "cell_voltage_v": np.full_like(t, 3.7),
    }
    return va.VariantRun(
        index=i,
        label=label,
        settings=(),
        vessel_path="",
        ok=True,
        summary={"distance_m": 1800.0, "energy_per_distance_j_m": 400.0},
        ending_reason="mission complete",
        ending_kind="complete",
        series=series,
    )


def _comparison(labels, spike=False, title="t"):
    runs = tuple(_run(i, lab, spike=spike) for i, lab in enumerate(labels))
    order, basis = va.rank_runs(runs, "distance")
    return va.Comparison("s", "s.toml", title, runs, order, basis, tuple(range(len(runs))))


@pytest.fixture(scope="module")
def plant():
    v = api.load_vessel(VESSELS / "glasswort-drone.toml")
    return build_plant(v.vessel_spec, Water(salinity=35.0, temperature_c=15.0))


# ------------------------------------------------------------------ 5. user text


def test_hostile_names_are_shown_verbatim_in_the_overlay():
    # Regression (issue 10): `$\frac{$` in a name crashed matplotlib's mathtext parser.
    fig = plots.overlay_figure(_comparison(HOSTILE, title="$\\frac{$ trial"))
    _draw(fig)
    (legend,) = fig.legends
    shown = [t.get_text() for t in legend.get_texts()]
    assert len(shown) == len(HOSTILE)
    for text in shown:
        assert not cbook.is_math_text(text)  # never handed to mathtext
    assert sorted(t.replace("\\$", "$") for t in shown) == sorted(HOSTILE)
    assert plots.plain("$\\frac{$") == "\\$\\frac{\\$"


def test_report_and_run_figure_survive_hostile_scenario_names(tmp_path, monkeypatch):
    scen = write_scenario(tmp_path, LEGS, output='sample = "10 s"')
    scen.write_text(
        scen.read_text(encoding="utf-8").replace('name = "test"', 'name = "$\\\\frac{$ <i>x</i>"'),
        encoding="utf-8",
    )
    log = read_log(api.run_scenario(scen, out=tmp_path / "h.h5").log_path)
    assert log.attrs["scenario_name"] == "$\\frac{$ <i>x</i>"
    text = report_html(log, range_estimate=False)
    assert "&lt;i&gt;x&lt;/i&gt;" in text and "<i>x</i>" not in text
    assert main(["report", str(log.path), "--no-range", "--out", str(tmp_path / "h.html")]) == 0


def test_figures_ignore_a_local_usetex_setting():
    import matplotlib as mpl

    with mpl.rc_context({"text.usetex": True}):
        fig = plots.overlay_figure(_comparison(["a $b$"]))
    assert not any(t.get_usetex() for t in fig.findobj(lambda a: hasattr(a, "get_usetex")))


# ------------------------------------------------------------------ 7. figures


def test_twelve_series_differ_in_colour_dash_and_marker():
    styles = [plots.style(i) for i in range(12)]
    for key in ("color", "linestyle", "marker"):
        values = [str(to_hex(s[key])) if key == "color" else str(s[key]) for s in styles]
        assert len(set(values)) == 12, key
    more = {(s["color"], str(s["linestyle"]), s["marker"]) for s in map(plots.style, range(24))}
    assert len(more) == 24
    assert plots.style(0)["marker"] != plots.style(12)["marker"]


def test_start_up_spike_is_clipped_with_a_note_and_the_legend_is_off_the_axes():
    comp = _comparison(["a", "b"], spike=True)
    fig = plots.overlay_figure(comp)
    power_axes = [a for a in fig.axes if a.get_title().startswith("pack power")]
    assert len(power_axes) == 2
    for ax in power_axes:
        assert ax.get_ylabel() == "pack power [kW]"
        _lo, hi = ax.get_ylim()
        assert 0.21 < hi < 1.0  # the mission's ~0.2 kW lines set the axis, not the 5 kW spike
        (note,) = [t.get_text() for t in ax.texts]
        assert "clipped" in note and "5 kW" in note
        # the data themselves are not cut
        assert max(np.max(line.get_ydata()) for line in ax.get_lines()) == 5.0
    assert all(a.get_legend() is None for a in fig.axes)
    assert [t.get_text() for t in fig.legends[0].get_texts()] == [r.label for r in comp.ranked]
    flat = plots.overlay_figure(_comparison(["a", "b"], spike=False))
    assert not any(a.texts for a in flat.axes)


def test_run_figures_name_the_legs(tmp_path):
    scen = write_scenario(tmp_path, LEGS, output='sample = "10 s"')
    log = read_log(api.run_scenario(scen, out=tmp_path / "r.h5").log_path)
    fig = plots.run_figure(log.series, legs=log.legs)
    top = fig.axes[0]
    assert [t.get_text().strip() for t in top.texts if t.get_rotation() == 90] == ["dash", "slow"]
    xs = [line.get_xdata()[0] for line in top.get_lines() if line.get_linestyle() == ":"]
    assert xs == pytest.approx([3.0])  # the leg change at 3 min
    fig2 = plots.power_breakdown_figure(log.series, legs=log.legs)
    assert [t.get_text().strip() for t in fig2.axes[0].texts if t.get_rotation() == 90] == [
        "dash",
        "slow",
    ]
    for ax in fig.axes:
        leg = ax.get_legend()
        assert leg is None or leg.get_frame().get_alpha() == pytest.approx(0.85)


def test_efficiency_map_marks_its_edge_and_the_buildable_field(plant):
    m = cv.efficiency_map(plant, speed_m_s=0.6, n=9)
    # Sintered NdFeB remanence tops out near 1.4-1.5 T; a permanent-magnet circuit puts about
    # 1.0-1.2 T across a practical gap (common practice).
    assert m.magnet_kind == "permanent" and 1.0 <= m.field_limit_t <= 1.2
    assert "common practice" in m.field_limit_note
    best = m.best()
    assert best is not None and m.at_edge(*best)  # more field always helps: the map's corner
    iy, ix = m.best(buildable=True)
    assert m.fields_t[iy] <= m.field_limit_t
    assert m.overall_efficiency[iy, ix] <= m.overall_efficiency[best]

    fig = plots.efficiency_map_figure(m)
    ax = fig.axes[0]
    labels = [line.get_label() for line in ax.get_lines()]
    limit = next(line for line in ax.get_lines() if line.get_linestyle() == "-.")
    assert np.allclose(limit.get_ydata(), m.field_limit_t)
    assert any(lab.startswith("buildable field limit, permanent magnet: 1.2 T") for lab in labels)
    edge = next(line for line in ax.get_lines() if line.get_label().startswith("edge of the map"))
    assert min(edge.get_xdata()) == pytest.approx(1000 * m.gaps_m[0])
    assert max(edge.get_ydata()) == pytest.approx(m.fields_t[-1])
    best_label = next(lab for lab in labels if lab.startswith("best on the map"))
    assert best_label.endswith("at the map's edge")
    assert any(lab.startswith("best buildable") for lab in labels)
    legend_texts = [t.get_text() for t in fig.legends[0].get_texts()]
    assert any(t.startswith("design (") for t in legend_texts)
    # the design's band means something: bands of equal area, the design's value a level
    levels = plots.map_levels(100 * m.overall_efficiency, 100 * m.design_efficiency)
    assert 100 * m.design_efficiency == pytest.approx(
        levels[np.argmin(abs(levels - 100 * m.design_efficiency))]
    )
    below = np.mean(m.overall_efficiency[np.isfinite(m.overall_efficiency)] < m.design_efficiency)
    k = int(np.searchsorted(levels, 100 * m.design_efficiency))
    assert k >= 2 and abs(k / (len(levels) - 1) - below) < 0.2
    _draw(fig)


def test_superconducting_limit_is_the_vessels_field():
    # A superconducting coil is built for its design field (the vessel's field).
    assert cv.buildable_field("superconducting", 5.0)[0] == 5.0
    assert cv.buildable_field("permanent", 5.0)[0] == 1.2


# ------------------------------------------------------------------ 6. report files


@pytest.fixture(scope="module")
def small_log(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("rep")
    scen = write_scenario(tmp, LEGS, output='sample = "10 s"')
    return read_log(api.run_scenario(scen, out=tmp / "r.h5").log_path)


def test_report_refuses_an_existing_file_or_link_without_force(small_log, tmp_path, capsys):
    log = str(small_log.path)
    out = tmp_path / "r.html"
    out.write_text("old", encoding="utf-8")
    assert main(["report", log, "--no-range", "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert "already exists" in err and "--force" in err
    assert out.read_text(encoding="utf-8") == "old"

    target = tmp_path / "elsewhere.txt"
    target.write_text("keep me", encoding="utf-8")
    link = tmp_path / "link.html"
    link.symlink_to(target)
    dangling = tmp_path / "dangling.html"
    dangling.symlink_to(tmp_path / "missing")
    for p in (link, dangling):
        assert main(["report", log, "--no-range", "--out", str(p)]) == 2
        assert p.is_symlink()
    # with --force the link itself is replaced: the report is a new file, the target untouched
    assert main(["report", log, "--no-range", "--out", str(link), "--force"]) == 0
    assert not link.is_symlink() and link.read_text(encoding="utf-8").startswith("<!DOCTYPE")
    assert target.read_text(encoding="utf-8") == "keep me"


def test_report_is_written_atomically_and_the_default_name_is_never_reused(small_log, tmp_path):
    out = tmp_path / "a.html"
    out.write_text("old", encoding="utf-8")
    ino = os.stat(out).st_ino
    with open(out, encoding="utf-8") as reader:  # a reader holding the old file keeps it whole
        write_report(small_log, out, range_estimate=False, force=True)
        assert reader.read() == "old"
    assert os.stat(out).st_ino != ino  # a new file moved into place, not rewritten in place
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.html"]  # no temporary left
    with pytest.raises(ReportExistsError):
        write_report(small_log, out, range_estimate=False)
    with pytest.raises(ReportExistsError, match="folder"):
        write_report(small_log, tmp_path, range_estimate=False, force=True)
    first = write_report(small_log, range_estimate=False, force=True)
    second = write_report(small_log, range_estimate=False)
    assert first.name == "r.report.html" and second.name == "r.report-2.html"
    second.unlink()


def test_thruster_curves_table_names_the_buildable_best_and_the_maps_edge(capsys):
    """Field-trial finding: the map's 'best' point sat in its corner at an unbuildable field;
    the table now also gives the best point at a buildable field and says when a best point
    lies on the map's edge."""
    import os

    from sim.cli import main

    here = os.getcwd()
    os.chdir(Path(__file__).resolve().parents[1])
    try:
        assert (
            main(
                [
                    "thruster-curves",
                    "vessels/glasswort-drone.toml",
                    "--no-plots",
                    "--format",
                    "json",
                ]
            )
            == 0
        )
    finally:
        os.chdir(here)
    import json

    doc = json.loads(capsys.readouterr().out)
    rows = {r["point"]: r for t in doc["tables"] if t["name"] == "map" for r in t["rows"]}
    assert {"design", "best on the map", "best buildable"} <= set(rows)
    assert rows["best buildable"]["field [T]"] <= 1.2 + 1e-9  # permanent magnets: common practice
    assert "edge" in rows["best on the map"]["note"]


def test_thruster_curves_of_an_open_field_array_give_its_own_performance_only(capsys, tmp_path):
    """An open-field array has no duct flow and no electrode gap: the duct figures (thrust–flow
    family, gap × field map) are not drawn from a placeholder duct; its steady performance is."""
    here = os.getcwd()
    os.chdir(Path(__file__).resolve().parents[1])
    try:
        code = main(
            ["thruster-curves", "vessels/glasswort-open-field.toml", "--plots", str(tmp_path)]
        )
    finally:
        os.chdir(here)
    out = capsys.readouterr()
    assert code == 0
    assert "open-field array" in out.out + out.err
    names = sorted(p.name for p in tmp_path.iterdir())
    assert names and all(n.endswith("-speed.png") for n in names)
