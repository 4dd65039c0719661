"""The ``brinebolt`` command under bad input and faults: exit codes, messages without tracebacks,
``--debug``, output that is never overwritten without ``--force``, free default names,
reproducible logs, numerical failures that keep the partial log, and the safety flags.

Every run here is a few simulated minutes on the bundled Glasswort drone (or a small variant),
so each takes well under a second.
"""

from __future__ import annotations

import json
import math
import os
import subprocess
import sys
from pathlib import Path

import h5py
import numpy as np
import pytest

from sim.cli import main
from sim.engine import model as model_mod
from sim.engine.model import I_XG
from sim.safety import HIGH_CURRENT_A, STRONG_FIELD_T

ROOT = Path(__file__).resolve().parent.parent
GLASSWORT = (ROOT / "vessels" / "glasswort-drone.toml").as_posix()

SHORT = """
[scenario]
name = "short cli test"
vessel = "{vessel}"

[water]
salinity = 35
temperature = "15 degC"

[output]
sample = "20 s"

[limits]
time = "1 h"

[[leg]]
name = "dash"
voltage = "20 V"
until = {{ duration = "3 min" }}

[[leg]]
name = "coast"
{coast}
until = {{ duration = "1 min" }}
"""

SMALL_VESSEL = """
[vessel]
name = "Low-current test drone"
mass = "60 kg"

[hull]
model = "submerged-body"
length = "1.5 m"
diameter = "0.2 m"

[[thruster]]
name = "duct"
gap = "30 mm"
pole_height = "30 mm"
active_length = "0.4 m"
field = "{field}"
magnet = "permanent"

[battery]
cell = "nmc_pouch_huria2012"
series = 14
parallel = 2

[drive]
max_current = "{amps}"
max_voltage = "30 V"
"""


def scenario(tmp_path: Path, *, vessel: str = GLASSWORT, coast='voltage = "0 V"', name="s.toml"):
    p = tmp_path / name
    p.write_text(SHORT.format(vessel=vessel, coast=coast), encoding="utf-8")
    return p


def small_vessel(tmp_path: Path, field="0.3 T", amps="30 A") -> str:
    p = tmp_path / "small.toml"
    p.write_text(SMALL_VESSEL.format(field=field, amps=amps), encoding="utf-8")
    return p.as_posix()


def run(capsys, *argv) -> tuple[int, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out + err


def _no_traceback(text: str) -> None:
    assert "Traceback" not in text


# ------------------------------------------------------------------ user errors, no traceback


def test_missing_file(capsys, tmp_path):
    for cmd in ("run", "check", "steady"):
        code, text = run(capsys, cmd, str(tmp_path / "nope.toml"))
        assert code == 2, cmd
        assert "nope.toml: file not found" in text
        _no_traceback(text)


def test_folder_instead_of_file(capsys, tmp_path):
    code, text = run(capsys, "check", str(tmp_path))
    assert code == 2
    assert "is a folder, not a file" in text
    _no_traceback(text)


def test_invalid_utf8(capsys, tmp_path):
    p = tmp_path / "latin1.toml"
    p.write_bytes('[vessel]\nname = "Sm\xf8rrebr\xf8d"\n'.encode("latin-1"))
    code, text = run(capsys, "check", str(p))
    assert code == 2
    assert "latin1.toml: line 2: not UTF-8 text (byte 0xf8" in text
    _no_traceback(text)


def test_unreadable_file(capsys, tmp_path, monkeypatch):
    p = tmp_path / "locked.toml"
    p.write_text("[vessel]\n", encoding="utf-8")
    real = os.open

    def refuse(path, *args, **kw):  # a permission problem, whoever runs (root reads anything)
        if Path(path).name == "locked.toml":
            raise PermissionError(13, "Permission denied", str(path))
        return real(path, *args, **kw)

    monkeypatch.setattr(os, "open", refuse)
    code, text = run(capsys, "run", str(p))
    assert code == 2
    assert "locked.toml: cannot read the file: permission denied" in text
    _no_traceback(text)


@pytest.mark.parametrize(
    ("option", "value", "phrase"),
    [
        ("--sample", "3 kg", "is not a time"),
        ("--sample", "0 s", "not positive"),
        ("--sample", "fast", "does not start with a number"),
        ("--sample", "nan s", "not a finite number"),
        ("--enclosed-volume", "10 m", "is not a volume"),
        ("--enclosed-volume", "-1 m^3", "not positive"),
    ],
)
def test_bad_option_values(capsys, tmp_path, monkeypatch, option, value, phrase):
    monkeypatch.chdir(tmp_path)
    code, text = run(capsys, "run", str(scenario(tmp_path)), option, value)
    assert code == 2
    assert f"option {option} = {value!r}" in text and phrase in text
    _no_traceback(text)
    assert not (tmp_path / "outputs").exists()  # nothing was run


def test_out_must_be_a_file_name(capsys, tmp_path):
    s = str(scenario(tmp_path))
    code, text = run(capsys, "run", s, "--out", str(tmp_path))
    assert code == 2 and "is a folder" in text
    code, text = run(capsys, "run", s, "--out", str(tmp_path / "x.incomplete.h5"))
    assert code == 2 and "in-progress logs" in text
    _no_traceback(text)


def test_unknown_command_and_missing_argument_exit_2(capsys):
    assert run(capsys, "fly")[0] == 2
    assert run(capsys, "run")[0] == 2
    assert run(capsys, "--version")[0] == 0


def test_steady_option_out_of_range_is_a_user_error(capsys):
    code, text = run(capsys, "steady", GLASSWORT, "--salinity", "60")
    assert code == 2 and "salinity" in text and "≤ 42" in text
    _no_traceback(text)


def test_debug_shows_the_traceback(capsys, tmp_path):
    code, text = run(capsys, "run", str(tmp_path / "nope.toml"))
    assert code == 2
    _no_traceback(text)
    code, text = run(capsys, "--debug", "run", str(tmp_path / "nope.toml"))
    assert code == 2
    assert "Traceback" in text and "InputError" in text


def test_a_bug_exits_1_and_says_so(capsys, tmp_path, monkeypatch):
    from sim import api

    def broken(*a, **k):
        raise TypeError("synthetic bug")

    monkeypatch.setattr(api, "run_scenario", broken)
    code, text = run(capsys, "run", str(scenario(tmp_path)), "--out", str(tmp_path / "a.h5"))
    assert code == 1
    assert "internal error" in text and "synthetic bug" in text and "--debug" in text
    _no_traceback(text)
    code, text = run(capsys, "--debug", "run", str(scenario(tmp_path)), "--out", "b.h5")
    assert code == 1 and "Traceback" in text


# ------------------------------------------------------------------ outputs


def test_existing_output_is_never_overwritten_without_force(capsys, tmp_path):
    s, out = str(scenario(tmp_path)), tmp_path / "log.h5"
    assert run(capsys, "run", s, "--out", str(out), "--quiet")[0] == 0
    before = out.read_bytes()
    code, text = run(capsys, "run", s, "--out", str(out), "--quiet")
    assert code == 2
    assert "already exists" in text and "--force" in text
    _no_traceback(text)
    assert out.read_bytes() == before
    code, _ = run(capsys, "run", s, "--out", str(out), "--quiet", "--force")
    assert code == 0
    with h5py.File(out, "r") as f:
        assert bool(f.attrs["complete"])


def test_left_over_incomplete_log_is_not_overwritten_either(capsys, tmp_path):
    s, out = str(scenario(tmp_path)), tmp_path / "log.h5"
    (tmp_path / "log.incomplete.h5").write_bytes(b"an interrupted run's data")
    code, text = run(capsys, "run", s, "--out", str(out))
    assert code == 2 and "log.incomplete.h5 already exists" in text
    assert (tmp_path / "log.incomplete.h5").read_bytes() == b"an interrupted run's data"


def test_default_output_takes_the_next_free_name(capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    s = str(scenario(tmp_path, name="trial.toml"))
    names = []
    for _ in range(3):
        code, text = run(capsys, "run", s, "--quiet")
        assert code == 0, text
        names.append(sorted(p.name for p in (tmp_path / "outputs").iterdir()))
    assert names[-1] == ["trial-2.h5", "trial-3.h5", "trial.h5"]
    assert "log written to outputs/trial-3.h5" in text
    # --force without --out replaces the default name instead
    assert run(capsys, "run", s, "--quiet", "--force")[0] == 0
    assert len(list((tmp_path / "outputs").iterdir())) == 3


def _everything(path: Path) -> dict:
    """Every dataset (as bytes with dtype and shape) and every attribute of an HDF5 file."""
    items: dict = {}

    def visit(name, obj):
        for k, v in obj.attrs.items():
            items[f"{name}@{k}"] = repr(v)
        if isinstance(obj, h5py.Dataset):
            data = np.asarray(obj[()])
            if data.dtype.hasobject:  # tables with text fields: compare the values
                items[name] = (str(obj.dtype), obj.shape, repr(data.tolist()))
            else:  # numbers: compare bit for bit
                items[name] = (str(obj.dtype), obj.shape, data.tobytes())

    with h5py.File(path, "r") as f:
        for k, v in f.attrs.items():
            items[f"/@{k}"] = repr(v)
        f.visititems(visit)
    return items


def test_same_inputs_give_identical_logs_except_creation_time(capsys, tmp_path):
    s = str(scenario(tmp_path))
    a, b = tmp_path / "a.h5", tmp_path / "b.h5"
    assert run(capsys, "run", s, "--out", str(a), "--quiet")[0] == 0
    assert run(capsys, "run", s, "--out", str(b), "--quiet")[0] == 0
    ea, eb = _everything(a), _everything(b)
    assert "/@created_utc" in ea and "/@created_utc" in eb
    del ea["/@created_utc"], eb["/@created_utc"]
    assert ea.keys() == eb.keys()
    assert len(ea) > 50  # the series, their attributes, events, legs, summary
    differ = [k for k in ea if ea[k] != eb[k]]
    assert differ == []


# ------------------------------------------------------------------ numerical failures


def _patch_model(monkeypatch, fault: str, after_m: float = 120.0):
    """Make the model fail once the vessel has covered ``after_m`` metres."""
    real = model_mod.VesselModel._evaluate

    def faulty(self, y):
        s = real(self, y)
        if float(y[I_XG]) > after_m:
            if fault == "raise":
                raise ArithmeticError("synthetic failure inside the model")
            s.thrust_n = [math.nan] * len(s.thrust_n)
            s.total_thrust_n = math.nan
        return s

    monkeypatch.setattr(model_mod.VesselModel, "_evaluate", faulty)


def _finite_log(path: Path) -> tuple[h5py.File, int]:
    f = h5py.File(path, "r")
    n = len(f["series/time_s"])
    for name, ds in f["series"].items():
        assert len(ds) == n, name
        if ds.dtype.kind == "f":
            assert np.isfinite(ds[()]).all(), name
    assert np.all(np.diff(f["series/time_s"][()]) > 0)
    return f, n


@pytest.mark.parametrize("fault", ["raise", "nan"])
def test_failure_mid_run_reports_where_and_keeps_the_partial_log(
    capsys, tmp_path, monkeypatch, fault
):
    _patch_model(monkeypatch, fault)
    out = tmp_path / "fail.h5"
    code, text = run(capsys, "run", str(scenario(tmp_path)), "--out", str(out), "--quiet")
    assert code == 4, text
    _no_traceback(text)
    assert "numerical failure" in text
    assert "in leg 'dash'" in text and "at t = " in text
    assert "speed_m_s = " in text and "distance_m = " in text and "soc = " in text
    assert ("synthetic failure" in text) if fault == "raise" else ("non-finite" in text)
    partial = tmp_path / "fail.incomplete.h5"
    assert "partial log is kept" in text and str(partial) in text
    assert not out.exists()
    f, n = _finite_log(partial)  # NaN never reaches the log
    with f:
        assert not bool(f.attrs["complete"])
        assert f.attrs["ending_reason"].startswith("failed: SolverFailure")
        assert n >= 2  # the samples up to the failure are kept
        assert f["series/distance_m"][-1] <= 120.0 + 1e-9


def test_zero_field_zero_start_speed_and_zero_current_leg_run_clean(capsys, tmp_path):
    # limiting cases: no field (no Lorentz force, so u·B = 0 and no thrust), a start at rest and
    # a leg with zero current must give finite numbers everywhere (no 0/0 efficiencies)
    vessel = small_vessel(tmp_path, field="0 T")
    s = scenario(tmp_path, vessel=vessel, coast='current = "0 A"')
    out = tmp_path / "zero.h5"
    code, text = run(capsys, "run", str(s), "--out", str(out), "--quiet")
    assert code == 0, text
    f, n = _finite_log(out)
    with f:
        assert n > 5
        assert np.all(f["series/thrust_n"][()] == 0.0)
        assert np.all(f["series/speed_through_water_m_s"][()] == 0.0)
        assert np.all(f["series/eta_overall"][()] == 0.0)
        assert np.all(f["series/thruster_current_a"][()] >= 0.0)
    assert "warning" in text and "zero field" in text


def test_speed_hold_at_zero_field_fails_cleanly_or_saturates(capsys, tmp_path):
    # the speed hold's gain is thrust per volt, which is zero without a field
    vessel = small_vessel(tmp_path, field="0 T")
    s = scenario(tmp_path, vessel=vessel, coast='speed = "1 kn"')
    code, text = run(capsys, "run", str(s), "--out", str(tmp_path / "hold.h5"), "--quiet")
    assert code in (0, 3, 4), text
    _no_traceback(text)


# ------------------------------------------------------------------ safety output


def test_run_flags_gas_current_and_field(capsys, tmp_path):
    s = str(scenario(tmp_path))
    code, text = run(
        capsys, "run", s, "--out", str(tmp_path / "a.h5"), "--enclosed-volume", "1 m^3"
    )
    assert code == 0, text
    flat = " ".join(text.split())  # the summary wraps at the terminal width
    assert "Gas produced:" in flat
    assert "CAUTION: released into a closed, well-mixed 1 m³ space" in flat
    assert "the amounts made, not concentrations reached" in flat
    assert "NIOSH REL 0.5 ppm" in flat
    assert "CAUTION high DC current: up to" in flat and f"above {HIGH_CURRENT_A:g} A" in flat
    assert "CAUTION strong magnetic field: 0.75 T" in flat and "implants" in flat
    assert "local codes and licensed practice" in flat


def test_huge_enclosed_volume_drops_the_gas_flag(capsys, tmp_path):
    s = str(scenario(tmp_path))
    code, text = run(
        capsys, "run", s, "--out", str(tmp_path / "a.h5"), "--enclosed-volume", "1e9 m^3"
    )
    assert code == 0
    flat = " ".join(text.split())
    assert "Gas produced:" in flat and "well-mixed" not in flat


def test_small_low_field_craft_gets_no_current_or_field_flag(capsys, tmp_path):
    s = str(scenario(tmp_path, vessel=small_vessel(tmp_path, field="0.3 T", amps="30 A")))
    code, text = run(capsys, "run", s, "--out", str(tmp_path / "a.h5"))
    assert code == 0, text
    flat = " ".join(text.split())
    assert 0.3 < STRONG_FIELD_T
    assert "CAUTION high DC current" not in flat and "CAUTION strong magnetic field" not in flat
    # the general reminders stay
    assert "High DC currents in water can injure or kill" in flat
    assert "local codes and licensed practice" in flat


def test_superconducting_craft_is_warned_about_quench(capsys, tmp_path):
    from sim.cli.run import safety_flags

    class Outcome:  # only what safety_flags reads
        pass

    from sim.io.files import load_scenario

    o = Outcome()
    o.scenario = load_scenario(ROOT / "scenarios" / "halite-coastal-trial.toml")
    o.result = type("R", (), {"summary": {"peak_thruster_current_a": 9000.0}})()
    text = " ".join(safety_flags(o, 10.0))
    assert "8 T" in text and "quench" in text and "9,000 A" in text


# ------------------------------------------------------------------ --units and --water


def _cells(text: str, label: str) -> list[str]:
    """The cells of the first table row of ``text`` that starts with ``label``."""
    for line in text.splitlines():
        cells = [c.strip() for c in line.strip("│┃ ").split("│")]
        if cells and cells[0] == label:
            return cells
    raise AssertionError(f"no row {label!r} in:\n{text}")


def test_run_units_metric_and_nautical(capsys, tmp_path):
    s = str(scenario(tmp_path))
    code, nautical = run(capsys, "run", s, "--out", str(tmp_path / "n.h5"), "--quiet")
    assert code == 0, nautical
    code, metric = run(
        capsys, "run", s, "--out", str(tmp_path / "m.h5"), "--quiet", "--units", "metric"
    )
    assert code == 0, metric
    assert "distance nmi" in nautical and "mean speed kn" in nautical
    assert "distance km" in metric and "mean speed m/s" in metric
    assert "distance nmi" not in metric and "mean speed kn" not in metric
    # 1 nmi = 1852 m and 1 kn = 1852 m per hour (international definitions, 1929)
    nmi = float(_cells(nautical, "dash")[3])
    km = float(_cells(metric, "dash")[3])
    assert km == pytest.approx(nmi * 1.852, abs=2e-3)
    # the mean speed, from the full-precision JSON output
    speeds = {}
    for units in ("nautical", "metric"):
        code = main(
            [
                "run",
                s,
                "--out",
                str(tmp_path / f"j{units}.h5"),
                "--quiet",
                "--units",
                units,
                "--format",
                "json",
            ]
        )
        assert code == 0
        doc = json.loads(capsys.readouterr().out)
        legs = next(t for t in doc["tables"] if t["name"] == "legs")
        key = next(c["key"] for c in legs["columns"] if c["name"] == "mean speed")
        speeds[units] = legs["rows"][0][key]
    assert speeds["metric"] == pytest.approx(speeds["nautical"] * 1852 / 3600, rel=1e-12)
    # the summary gives the chosen system first and the other in brackets
    dist_n = _cells(nautical, "distance over ground")[1]
    dist_m = _cells(metric, "distance over ground")[1]
    assert dist_n.endswith("km)") and " nmi (" in dist_n
    assert dist_m.endswith("nmi)") and " km (" in dist_m


def test_steady_units_metric(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "250")  # the steady table is wide
    code, nautical = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn,2 kn")
    assert code == 0, nautical
    code, metric = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn,2 kn", "--units", "metric")
    assert code == 0, metric
    # 1 kn = 1852/3600 m/s = 0.514 m/s (international definition)
    assert _cells(nautical, "1.00")[1] == "0.514"
    assert _cells(metric, "0.514")[1] == "1.00"
    assert _cells(metric, "1.029")[1] == "2.00"
    # the operating point itself does not depend on how its speed is shown
    assert _cells(nautical, "1.00")[2:] == _cells(metric, "0.514")[2:]


def _sigma(text: str) -> float:
    return float(text.split("σ = ")[1].split(" S/m")[0])


def test_steady_takes_water(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "250")
    import gsw

    for sp, t_c in ((35, 15), (10, 15), (35, 5)):
        code, text = run(
            capsys, "steady", GLASSWORT, "--speeds", "1 kn", "--water", f"{sp},{t_c} degC"
        )
        assert code == 0, text
        assert f"SP {sp:g}, {t_c:g} °C" in text
        # TEOS-10 / PSS-78 conductivity from gsw (mS/cm → S/m), at the surface
        assert _sigma(text) == pytest.approx(gsw.C_from_SP(sp, t_c, 0.0) / 10, abs=2e-3)
    code, text = run(capsys, "steady", GLASSWORT, "--water", "35")
    assert code == 2 and "option --water = '35'" in text and "SALINITY,TEMPERATURE" in text
    _no_traceback(text)


def test_steady_deprecated_salinity_temperature_still_work(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "250")
    code, new = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn", "--water", "30,10 degC")
    assert code == 0
    code, old = run(
        capsys,
        "steady",
        GLASSWORT,
        "--speeds",
        "1 kn",
        "--salinity",
        "30",
        "--temperature",
        "10 degC",
    )
    assert code == 0, old
    assert "deprecated" in old and "--water" in old
    assert _sigma(old) == _sigma(new)
    assert _cells(old, "1.00") == _cells(new, "1.00")
    code, text = run(capsys, "steady", GLASSWORT, "--water", "30,10 degC", "--salinity", "30")
    assert code == 2 and "cannot be combined" in text
    code, text = run(capsys, "steady", GLASSWORT, "--temperature", "3 kg")
    assert code == 2 and "option --temperature = '3 kg'" in text and "not a temperature" in text
    _no_traceback(text)


# ------------------------------------------------------------------ start-up and entry points


def test_importing_the_cli_leaves_heavy_libraries_unloaded():
    # `brinebolt --help` must start fast: the command modules import their heavy libraries
    # inside the command functions only
    probe = (
        "import sys, contextlib, io\n"
        "import sim.cli\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        "    assert sim.cli.main(['--help']) == 0\n"
        "heavy = ('matplotlib', 'scipy', 'h5py', 'pydantic', 'pint', 'rich')\n"
        "print(' '.join(sorted(m for m in sys.modules if m.split('.')[0] in heavy)))\n"
    )
    out = subprocess.run(
        [sys.executable, "-c", probe],
        cwd=ROOT,
        env={**os.environ, "PYTHONPATH": str(ROOT)},
        capture_output=True,
        text=True,
        check=True,
    )
    assert out.stdout.strip() == ""


def test_python_dash_m_reports_option_errors_as_user_errors(tmp_path):
    # regression: under `python -m sim.cli` the old single-module CLI was imported twice, so an
    # analysis command's option error was another class and came out as "internal error" (1)
    out = subprocess.run(
        [sys.executable, "-m", "sim.cli", "range-curve", GLASSWORT, "--water", "60,15 degC"],
        cwd=tmp_path,
        env={**os.environ, "PYTHONPATH": str(ROOT), "COLUMNS": "200"},
        capture_output=True,
        text=True,
    )
    assert out.returncode == 2, out.stdout + out.stderr
    assert "option --water = '60,15 degC'" in out.stderr and "internal error" not in out.stderr


def test_readme_documents_the_exit_codes_and_output_naming():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    for code in ("| 0 |", "| 1 |", "| 2 |", "| 3 |", "| 4 |", "| 5 |", "| 130 |", "| 143 |"):
        assert code in readme
    assert "-2.h5" in readme and "--force" in readme and "--enclosed-volume" in readme
    assert "--format text|csv|json" in readme and "--output FILE" in readme
    assert "--soc-min 0.1" in readme


@pytest.fixture(autouse=True)
def _wide_terminal(monkeypatch):
    # rich wraps at the terminal width; a fixed width keeps the assertions stable
    monkeypatch.setenv("COLUMNS", "100")
