"""The field trial of issue 10 on the command line's output: tables complete at 80 columns and
when piped, machine-readable ``--format csv|json`` with units, a closed pipe, efficiencies in
percent, hostile names, SIGTERM, the exit codes of log write failures and busy logs, damaged
logs given to ``reach``, messages that echo the user's value, the emptied-pack verdict of
``reach`` and the ``range-curve`` defaults.
"""

from __future__ import annotations

import csv
import errno
import io
import json
import os
import signal
import subprocess
import sys
from pathlib import Path

import h5py
import numpy as np
import pytest
from engine_helpers import start_long_run, wait_for_samples
from rich.console import Console

from sim.cli import main
from sim.cli.core import EXIT_TERMINATED, EXIT_WRITE, print_table

ROOT = Path(__file__).resolve().parent.parent
GLASSWORT = (ROOT / "vessels" / "glasswort-drone.toml").as_posix()
KNOT_M_S = 1852.0 / 3600.0  # international knot (1929)

SCENARIO = """
[scenario]
name = "{name}"
vessel = "{vessel}"

[water]
salinity = 35
temperature = "15 degC"

[output]
sample = "20 s"

[limits]
time = "1 h"
{limits}

{start}

[[leg]]
name = "{leg}"
voltage = "20 V"
until = {{ duration = "{duration}" }}

[[leg]]
name = "transit-north-to-the-far-buoy"
voltage = "0 V"
until = {{ duration = "1 min" }}
"""


def write_scenario(
    tmp_path: Path,
    *,
    name="output test",
    vessel=GLASSWORT,
    leg="dash",
    duration="3 min",
    start="",
    limits="",
    file="s.toml",
) -> Path:
    p = tmp_path / file
    p.write_text(
        SCENARIO.format(
            name=name, vessel=vessel, leg=leg, duration=duration, start=start, limits=limits
        ),
        encoding="utf-8",
    )
    return p


def run(capsys, *argv) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


@pytest.fixture(autouse=True)
def _narrow_terminal(monkeypatch):
    monkeypatch.setenv("COLUMNS", "80")


def _env() -> dict:
    return {**os.environ, "PYTHONPATH": str(ROOT), "COLUMNS": "80"}


# ------------------------------------------------------------------ 1. complete at 80 columns


def _steady_table():
    from sim.analysis.tables import steady_data
    from sim.engine.plant import build_plant
    from sim.engine.spec import Water
    from sim.engine.steady import steady_at_speed
    from sim.io.files import load_vessel

    del Water
    vessel = load_vessel(GLASSWORT)
    from sim.cli.options import water

    plant = build_plant(vessel.vessel_spec, water("35,15 degC"))
    pts = [(v * KNOT_M_S, steady_at_speed(plant, v * KNOT_M_S)) for v in (0.5, 1.0, 2.0)]
    return steady_data(pts, "nautical", title="a title of a table that is long")


def test_tables_keep_every_number_and_name_at_80_columns():
    table = _steady_table()
    buf = io.StringIO()
    print_table(Console(width=80, file=buf), table)
    text = buf.getvalue()
    assert max(len(line) for line in text.splitlines()) <= 80
    head, rows = table.text()
    for cell in [c for r in rows for c in r] + head:
        assert cell in text, cell  # every number, name and header in full, never "0.00…"
    assert "…" not in text


def test_steady_piped_at_80_columns_shows_every_number(tmp_path):
    out = subprocess.run(
        [sys.executable, "-m", "sim.cli", "steady", GLASSWORT, "--speeds", "0.5 kn,1 kn,2 kn"],
        cwd=tmp_path,
        env=_env(),
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert out.returncode == 0, out.stderr
    assert "…" not in out.stdout
    assert max(len(line) for line in out.stdout.splitlines()) <= 80
    for cell in [c for r in _steady_table().text()[1] for c in r]:
        assert cell in out.stdout, cell


def test_run_leg_names_are_never_cut(capsys, tmp_path):
    s = write_scenario(tmp_path)
    code, out, err = run(capsys, "run", str(s), "--out", str(tmp_path / "a.h5"), "--quiet")
    assert code == 0, err
    assert "transit-north-to-the-far-buoy" in out and "…" not in out


# ------------------------------------------------------------------ 2. csv and json


def test_steady_json_and_csv_parse_back_with_units(capsys, tmp_path):
    code, out, err = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn,2 kn", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)  # stdout holds the data only; cautions went to stderr
    assert "Electrolysis" in err
    t = doc["tables"][0]
    units = {c["key"]: c["unit"] for c in t["columns"]}
    assert units["speed [kn]"] == "kn" and units["η overall [%]"] == "%"
    row = t["rows"][1]
    assert row["speed [kn]"] == pytest.approx(2.0) and row["speed [m/s]"] == pytest.approx(
        2 * KNOT_M_S, rel=1e-12
    )
    # η overall = T·V0/(V·I) (docs/efficiencies.md), in percent: from the row's own thrust,
    # speed and thruster power (V·I)
    eta = 100 * row["thrust [N]"] * row["speed [m/s]"] / row["thruster power [W]"]
    assert row["η overall [%]"] == pytest.approx(eta, rel=1e-6)
    # η overall = η electrical · η hydraulic (docs/efficiencies.md)
    assert row["η overall [%]"] == pytest.approx(
        row["η electrical [%]"] * row["η hydraulic [%]"] / 100, rel=1e-6
    )
    out_file = tmp_path / "steady.csv"
    code, out, err = run(
        capsys,
        "steady",
        GLASSWORT,
        "--speeds",
        "1 kn,2 kn",
        "--format",
        "csv",
        "--output",
        str(out_file),
    )
    assert code == 0, err
    rows = list(csv.DictReader(io.StringIO(out_file.read_text(encoding="utf-8"))))
    assert float(rows[1]["η overall [%]"]) == row["η overall [%]"]  # full precision
    assert float(rows[0]["speed [kn]"]) == 1.0


def test_reach_range_curve_and_thruster_curves_give_json(capsys, tmp_path):
    s = write_scenario(tmp_path)
    log = tmp_path / "a.h5"
    assert main(["run", str(s), "--out", str(log), "--quiet"]) == 0
    capsys.readouterr()
    code, out, err = run(capsys, "reach", str(log), "--no-best", "--format", "json")
    assert code == 0, err
    names = [t["name"] for t in json.loads(out)["tables"]]
    assert names == ["state", "legs", "range_left"]
    code, out, err = run(
        capsys,
        "range-curve",
        GLASSWORT,
        "--speeds",
        "0.3 kn,1 kn",
        "--water",
        "35,15 degC",
        "--no-plots",
        "--format",
        "csv",
    )
    assert code == 0, err
    blocks = out.strip().split("\n\n")
    assert blocks[0].startswith("# range_curve:")
    rows = list(csv.DictReader(io.StringIO(blocks[0].split("\n", 1)[1])))
    assert [float(r["speed [kn]"]) for r in rows] == pytest.approx([0.3, 1.0])
    assert float(rows[0]["range [nmi]"]) > 0
    code, out, err = run(
        capsys,
        "thruster-curves",
        GLASSWORT,
        "--grid",
        "4",
        "--speed",
        "1 kn",
        "--no-plots",
        "--format",
        "json",
    )
    assert code == 0, err
    doc = json.loads(out)
    perf = doc["tables"][0]
    assert {"η electrical [%]", "η hydraulic [%]", "η overall [%]"} <= {
        c["key"] for c in perf["columns"]
    }


def test_run_json_keeps_full_precision_summary(capsys, tmp_path):
    s = write_scenario(tmp_path)
    code, out, err = run(
        capsys, "run", str(s), "--out", str(tmp_path / "a.h5"), "--quiet", "--format", "json"
    )
    assert code == 0, err
    doc = json.loads(out)
    summary = {r["quantity"]: r for r in doc["tables"][0]["rows"]}
    with h5py.File(tmp_path / "a.h5", "r") as f:
        dist_m = float(f["summary"].attrs["distance_m"])
    assert summary["distance over ground"]["unit"] == "nmi"
    assert summary["distance over ground"]["value"] == pytest.approx(dist_m / 1852.0, rel=1e-12)
    assert "Gas produced" in err and "log written to" in err


# ------------------------------------------------------------------ 3. a closed pipe


def test_closed_pipe_exits_0_quietly(tmp_path):
    proc = subprocess.Popen(
        [sys.executable, "-m", "sim.cli", "steady", GLASSWORT],
        cwd=tmp_path,
        env=_env(),
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
    )
    proc.stdout.readline()  # like `| head -1`
    proc.stdout.close()
    err = proc.stderr.read().decode()
    proc.stderr.close()
    assert proc.wait(timeout=120) == 0, err
    assert "Traceback" not in err and "internal error" not in err and "Broken" not in err


# ------------------------------------------------------------------ 6. hostile names

HOSTILE = "evil [/] [bold]x \\u001b[31mred"


def test_hostile_names_are_escaped_and_made_visible(capsys, tmp_path):
    vessel = Path(GLASSWORT).read_text(encoding="utf-8")
    vessel = vessel.replace('name = "Glasswort survey drone"', f'name = "{HOSTILE} vessel"')
    vessel = vessel.replace('name = "pylon"', 'name = "thr \\u001bc :bomb:"')
    (tmp_path / "v.toml").write_text(vessel, encoding="utf-8")
    s = write_scenario(
        tmp_path,
        name=f"{HOSTILE} scenario",
        vessel=(tmp_path / "v.toml").as_posix(),
        leg=f"{HOSTILE} leg",
    )
    code, out, err = run(capsys, "run", str(s), "--out", str(tmp_path / "a.h5"))
    assert code == 0, err
    text = out + err
    assert "\x1b" not in text  # no raw escape reaches the terminal
    assert "\\x1b[31mred" in text  # made visible instead
    assert "[/]" in text and "[bold]" in text  # shown as typed, not as markup
    assert "Gas produced" in text and "local codes" in text  # summary and cautions printed
    code, out, err = run(
        capsys,
        "thruster-curves",
        str(tmp_path / "v.toml"),
        "--grid",
        "3",
        "--no-plots",
        "--speed",
        "1 kn",
    )
    assert code == 0, err
    assert "\x1b" not in out + err
    assert "\\x1bc :bomb:" in out  # the thruster name, visible, no emoji code
    code, out, err = run(capsys, "steady", str(tmp_path / "v.toml"), "--speeds", "1 kn")
    assert code == 0, err
    assert "\x1b" not in out + err and "[/] [bold]x" in out
    # a thruster name with brackets cannot name a log column: a clear input error
    (tmp_path / "w.toml").write_text(
        vessel.replace('name = "thr \\u001bc :bomb:"', 'name = "port [a]"'), encoding="utf-8"
    )
    code, out, err = run(capsys, "check", str(tmp_path / "w.toml"))
    assert code == 2 and "thruster name cannot hold '[' or ']'" in " ".join((out + err).split())


# ------------------------------------------------------------------ 7. SIGTERM


@pytest.mark.skipif(os.name != "posix", reason="POSIX signals")
def test_sigterm_ends_like_ctrl_c_with_exit_143(tmp_path):
    proc, out, incomplete = start_long_run(tmp_path, env=_env())
    wait_for_samples(proc, incomplete)
    proc.send_signal(signal.SIGTERM)
    stdout, stderr = proc.communicate(timeout=60)
    assert proc.returncode == EXIT_TERMINATED == 143, stderr
    assert "terminated" in stderr and "partial log is kept" in stderr
    assert "Traceback" not in stdout + stderr
    assert not out.exists()
    with h5py.File(incomplete, "r") as f:
        assert not bool(f.attrs["complete"])
        assert f.attrs["ending_reason"] == "terminated (SIGTERM)"
        assert np.all(np.diff(f["series/time_s"][()]) > 0)


# ------------------------------------------------------------------ 8. log errors


def test_full_disk_exits_5_and_does_not_claim_a_mark_it_could_not_make(
    capsys, tmp_path, monkeypatch
):
    from sim.io import log as log_mod

    real = log_mod._write_file
    calls = {"n": 0}

    def disk(path, data):
        calls["n"] += 1
        if calls["n"] <= 1:
            return real(path, data)
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC), str(path))

    monkeypatch.setattr(log_mod, "_write_file", disk)
    s = write_scenario(tmp_path)
    code, _, err = run(capsys, "run", str(s), "--out", str(tmp_path / "a.h5"), "--quiet")
    assert code == EXIT_WRITE == 5, err
    flat = " ".join(err.split())
    assert "output could not be written" in flat and "No space left on device" in flat
    assert "kept, marked incomplete" not in flat  # marking failed too (every write fails)
    assert "marking it failed too" in flat and "a.incomplete.h5" in flat
    assert "internal error" not in flat


def test_busy_log_exits_2(capsys, tmp_path):
    from sim.io.log import lock_path_for

    out = tmp_path / "a.h5"
    lock_path_for(out).write_text(json.dumps({"pid": 4242, "host": "another-host", "token": "t"}))
    s = write_scenario(tmp_path)
    code, _, err = run(capsys, "run", str(s), "--out", str(out), "--quiet")
    assert code == 2, err
    flat = " ".join(err.split())
    assert "being written by another run" in flat and "Nothing was run" in flat


def test_reach_refuses_empty_and_damaged_logs_with_exit_2(capsys, tmp_path):
    s = write_scenario(tmp_path)
    log = tmp_path / "a.h5"
    assert main(["run", str(s), "--out", str(log), "--quiet"]) == 0
    capsys.readouterr()
    empty = tmp_path / "empty.h5"
    with h5py.File(log, "r") as src, h5py.File(empty, "w") as dst:
        for k, v in src.attrs.items():
            dst.attrs[k] = v
        for name in src:
            src.copy(name, dst)
        for name, ds in list(dst["series"].items()):
            data = ds[()][:0]
            attrs = dict(ds.attrs)
            del dst["series"][name]
            new = dst["series"].create_dataset(name, data=data, maxshape=(None, *data.shape[1:]))
            for k, v in attrs.items():
                new.attrs[k] = v
    code, _, err = run(capsys, "reach", str(empty))
    assert code == 2, err
    assert "no samples" in err or "sample" in err
    damaged = tmp_path / "damaged.h5"
    damaged.write_bytes(log.read_bytes()[:2000])
    code, _, err = run(capsys, "reach", str(damaged))
    assert code == 2, err
    assert "damaged.h5" in err and "internal error" not in err


# ------------------------------------------------------------------ 9. messages echo the value


def test_messages_echo_the_users_value(capsys):
    code, out, err = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn,9 kn")
    assert code == 0
    assert "--speeds '9 kn'" in " ".join((out + err).split())
    code, _, err = run(capsys, "steady", GLASSWORT, "--speeds", "1 kn,-2 kn")
    assert code == 2 and "option --speeds = '1 kn,-2 kn'" in err
    code, _, err = run(capsys, "range-curve", GLASSWORT, "--at", "3 parsecs", "--no-plots")
    assert code == 2 and "option --at = '3 parsecs'" in err
    code, _, err = run(capsys, "range-curve", GLASSWORT, "--at", "0 kn", "--no-plots")
    assert code == 2 and "option --at = '0 kn'" in err


# ------------------------------------------------------------------ 10. reach and range-curve


def test_reach_on_an_emptied_pack_gives_one_verdict(capsys, tmp_path):
    s = write_scenario(
        tmp_path,
        start="[start]\nstate_of_charge = 0.102",
        limits="state_of_charge_min = 0.1",
        duration="30 min",
    )
    log = tmp_path / "a.h5"
    code = main(["run", str(s), "--out", str(log), "--quiet"])
    assert code == 3  # the pack's cut-off ended the mission early
    capsys.readouterr()
    code, out, err = run(capsys, "reach", str(log))
    assert code == 0, err
    flat = " ".join((out + err).split())
    assert "No range left" in flat
    assert "best-range speed" not in flat  # no best speed beside "no range"
    code, out, _ = run(capsys, "reach", str(log), "--format", "json")
    rows = json.loads(out)["tables"][2]["rows"]
    assert all(r["range left [nmi]"] in (0.0, None) for r in rows)


def test_range_curve_defaults_keep_a_reserve_and_a_sensible_grid(capsys):
    from sim.analysis.range_curves import default_speed_grid, range_speed_grid
    from sim.cli.options import water
    from sim.cli.range_curve import DEFAULT_SOC_MIN
    from sim.engine.plant import build_plant
    from sim.io.files import load_vessel

    assert DEFAULT_SOC_MIN == 0.1
    code, out, err = run(
        capsys,
        "range-curve",
        GLASSWORT,
        "--water",
        "35,15 degC",
        "--no-plots",
        "--points",
        "8",
        "--format",
        "json",
    )
    assert code == 0, err
    doc = json.loads(out)
    assert "to 10 %" in doc["tables"][0]["title"]
    plant = build_plant(load_vessel(GLASSWORT).vessel_spec, water("35,15 degC"))
    grid = range_speed_grid(plant, 8)
    old = default_speed_grid(plant, 8)
    assert grid[-1] == pytest.approx(old[-1])
    assert grid[0] > old[0]  # no crawling speeds of days of endurance
    waters = doc["tables"][1]["rows"][0]
    best = waters["best range at [kn]"]
    assert grid[0] / KNOT_M_S <= best  # the best-range speed lies on the grid
    assert grid[0] / KNOT_M_S >= 0.2 * best


@pytest.mark.parametrize(
    "argv",
    [
        ["range-curve", "vessels/glasswort-drone.toml", "--points", "100000000", "--no-plots"],
        ["thruster-curves", "vessels/glasswort-drone.toml", "--grid", "100000", "--no-plots"],
        ["run", "scenarios/glasswort-survey.toml", "--sample", "1 ms", "--out", "never.h5"],
    ],
)
def test_work_a_command_asks_for_is_bounded_before_anything_runs(argv, capsys, tmp_path):
    """A field-trial finding: `range-curve --points 1e8`, `thruster-curves --grid 1e5` and a
    1 ms sample ran out of memory; they are refused with exit 2 naming the figure and the limit."""
    import os

    from sim.cli import main

    argv = [str(tmp_path / a) if a == "never.h5" else a for a in argv]
    here = os.getcwd()
    os.chdir(Path(__file__).resolve().parents[1])
    try:
        code = main(argv)
    finally:
        os.chdir(here)
    err = capsys.readouterr().err
    assert code == 2
    assert "allowed: at most" in err and "BRINEBOLT_MAX_" in err
    assert not (tmp_path / "never.h5").exists()


def test_a_value_that_rounds_to_zero_never_prints_as_minus_zero():
    """A field-trial finding: an emptied pack showed "end SOC -0.00 %" in the versus table."""
    from sim.analysis.tables import Column, _cell

    assert _cell(-1e-9, Column("end SOC", "%"), 2) == "0.00"
    assert _cell(-0.004, Column("x", "1"), 2) == "0.00"
    assert _cell(-0.006, Column("x", "1"), 2) == "-0.01"
