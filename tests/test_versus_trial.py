"""`brinebolt versus` after the field trial of issue 10: warnings per variant, option-named
errors, safe and distinct file names, legs cut short and comparable ranking, Ctrl-C."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
import tomllib

import pytest
from engine_helpers import ROOT, write_scenario

from sim.analysis import variants as va
from sim.cli import main
from sim.cli.versus import RANK_CHOICES
from sim.io.files import InputError
from sim.io.log import read_log

SHORT = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "3 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "3 min" }
"""

TRIGGERED = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "3 min" }

[[leg]]
name = "survey"
speed = "0.8 kn"
until = { duration = "3 min" }

[[leg]]
name = "home"
speed = "0.6 kn"
until = { duration = "2 min" }

[[trigger]]
name = "fast-return"
when = { speed_above = "1.2 kn" }
then = "goto"
leg = "home"
"""


# ------------------------------------------------------------------ 1. checks per variant


def test_every_variant_gets_the_warnings_of_check_labelled_by_variant(tmp_path, capsys):
    # Regression (issue 10): a permanent magnet asked for 4 T flew without the remanence
    # warning that `check` gives. NdFeB remanence tops out near 1.4-1.5 T (common practice).
    scen = write_scenario(tmp_path, SHORT)
    args = ["versus", str(scen), "--set", "thruster.pylon.field=0.5 T,4 T", "--jobs", "1"]
    code = main([*args, "--no-plots"])
    out = capsys.readouterr().out
    assert code == 0
    warn = [line for line in out.splitlines() if "remanence" in line]
    assert len(warn) == 1, out
    assert "[field 4 T]" in warn[0] and "--set thruster.pylon.field=4 T" in warn[0]
    assert out.index("remanence") < out.index("flying 2 variant")


def test_a_bad_set_value_names_the_option_and_value_before_anything_flies(tmp_path, capsys):
    scen = write_scenario(tmp_path, SHORT)
    code = main(["versus", str(scen), "--set", "thruster.pylon.gap=-5 mm,80 mm", "--no-plots"])
    cap = capsys.readouterr()
    assert code == 2
    assert "flying" not in cap.out
    assert "option --set thruster.pylon.gap=-5 mm" in cap.err
    assert "variant 'gap -5 mm'" in cap.err and "nothing was run" in cap.err
    assert "glasswort-drone.toml" not in cap.err  # the file is not to blame


def test_variants_file_setting_errors_name_the_file_and_its_key(tmp_path):
    scen = write_scenario(tmp_path, SHORT)
    vf = tmp_path / "variants-x.toml"
    vf.write_text(
        f'scenario = "{scen.name}"\n[[variant]]\nlabel = "bad"\n'
        'set = { "thruster.0.gap" = "-1 mm" }\n',
        encoding="utf-8",
    )
    v = va.read_variants_file(vf)
    with pytest.raises(InputError) as err:
        va.prepare_variants(v.scenario, v.variants)
    (p,) = err.value.problems
    assert p.file == str(vf) and p.key == 'variant[0].set."thruster.0.gap"' and p.value == "-1 mm"


# ------------------------------------------------------------------ 2. file names


def test_file_stems_are_safe_and_distinct():
    stems = va.file_stems(
        ["gap 80 mm", "gap/80/mm", "GAP 80 MM", "../../etc/passwd", "CON", "", "a.incomplete"]
    )
    assert stems[:3] == ["gap-80-mm", "gap-80-mm-2", "GAP-80-MM-3"]
    assert len({s.lower() for s in stems}) == len(stems)
    for s in stems:
        assert s and "/" not in s and "\\" not in s and "." not in s and s.lower() != "con"


def test_labels_that_clash_as_file_names_never_share_a_log(tmp_path):
    # Regression (issue 10): "gap 80 mm" and "gap/80/mm" both became gap-80-mm, so both rows
    # showed the second variant's run.
    scen = write_scenario(tmp_path, SHORT)
    vs = [
        va.Variant("gap 80 mm", settings=(("thruster.0.gap", "80 mm"),)),
        va.Variant("gap/80/mm", settings=(("thruster.0.gap", "120 mm"),)),
    ]
    comp = va.compare_variants(scen, vs, jobs=2, logs_dir=tmp_path / "logs")
    a, b = comp.runs
    assert a.log_path != b.log_path
    assert a.summary != b.summary
    for run, gap in ((a, "80 mm"), (b, "120 mm")):
        log = read_log(run.log_path)
        assert tomllib.loads(log.attrs["vessel_text"])["thruster"][0]["gap"] == gap
        assert log.summary["distance_m"] == pytest.approx(run.summary["distance_m"])
    assert sorted(p.name for p in (tmp_path / "logs").iterdir()) == [
        "gap-80-mm-2.h5",
        "gap-80-mm-2.vessel.toml",
        "gap-80-mm.h5",
        "gap-80-mm.vessel.toml",
    ]


# ------------------------------------------------------------------ 3. cut legs and ranking


def test_a_run_cut_short_by_a_trigger_is_not_ranked_with_whole_missions(tmp_path, capsys):
    scen = write_scenario(tmp_path, TRIGGERED)
    args = ["versus", str(scen), "--set", "thruster.0.field=0.3 T,1 T", "--jobs", "1"]
    code = main([*args, "--no-plots", "--rank-by", "distance"])
    out = capsys.readouterr().out
    assert code == 0
    assert "1 of 2 flew the mission as planned" in out
    assert "not comparable" in out
    assert "leg 'dash' cut short by trigger 'fast-return'" in out
    assert "not flown: 'survey'" in out


def _run(i, *, distance, soc, legs, kind="complete", cut=()):
    recs = [{"name": n, "t_end_s": 60.0 * (k + 1), "ending": "x"} for k, n in enumerate(legs)]
    return va.VariantRun(
        index=i,
        label=f"v{i}",
        settings=(),
        vessel_path="",
        ok=True,
        summary={
            "distance_m": distance,
            "energy_per_distance_j_m": 1000.0 / distance,
            "duration_s": 60.0 * len(legs),
            "end_state_of_charge": soc,
            "mean_eta_overall": 0.01,
            "mean_speed_over_ground_m_s": 1.0,
        },
        legs=recs,
        ending_reason="mission complete" if kind == "complete" else "time limit",
        ending_kind=kind,
        planned_legs=("a", "b"),
        cut_short=cut,
    )


def test_rank_by_measures_rank_comparable_runs_first():
    runs = [
        _run(0, distance=900.0, soc=0.5, legs=("a", "b")),
        _run(1, distance=5000.0, soc=0.9, legs=("a", "b"), cut=(("a", "trigger 't'", 60.0),)),
        _run(2, distance=1000.0, soc=0.4, legs=("a", "b")),
        _run(3, distance=2000.0, soc=0.2, legs=("a",), kind="limit"),
    ]
    assert va.comparable_runs(runs) == (0, 2)
    assert va.rank_runs(runs, "distance")[0] == (2, 0, 1, 3)
    assert va.rank_runs(runs, "end-soc")[0] == (0, 2, 1, 3)
    order, basis = va.rank_runs(runs, "auto")
    assert order == (2, 0, 1, 3) and "least energy per distance" in basis
    assert "2 of 4 flew the mission as planned" in basis
    assert runs[1].outcome == "mission complete; leg 'a' cut short by trigger 't' at 1.0 min"
    assert runs[3].outcome == "time limit; not flown: 'b'"
    # none as planned: all finished runs ranked together, and the basis says so
    order, basis = va.rank_runs([runs[1], runs[3]], "auto")
    assert order == (1, 3) and basis.startswith("none flew the mission as planned")


def test_rank_choices_of_the_command_are_those_of_the_analysis():
    assert RANK_CHOICES == va.RANK_CHOICES


# ------------------------------------------------------------------ 4. Ctrl-C


@pytest.mark.skipif(os.name != "posix", reason="process groups and SIGINT are POSIX")
def test_ctrl_c_during_parallel_versus_stops_cleanly_and_names_the_partial_logs(tmp_path):
    # Regression (issue 10): Ctrl-C printed worker tracebacks and "No log was being written".
    # A terminal sends SIGINT to the whole foreground process group: so does this test.
    scen = write_scenario(
        tmp_path,
        '[[leg]]\nname = "cruise"\nspeed = "0.3 kn"\nuntil = { duration = "30 h" }\n',
        limits='time = "40 h"',
        output='sample = "1 s"',
    )
    logs = tmp_path / "logs"
    env = {**os.environ, "PYTHONPATH": str(ROOT), "COLUMNS": "200"}
    cmd = [sys.executable, "-m", "sim.cli", "versus", str(scen), "--jobs", "2", "--no-plots"]
    cmd += ["--set", "thruster.0.gap=50 mm,80 mm", "--logs", str(logs)]
    proc = subprocess.Popen(
        cmd,
        cwd=tmp_path,
        env=env,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
        start_new_session=True,
    )
    try:
        deadline = time.monotonic() + 60.0
        while len(list(logs.glob("*.incomplete.h5"))) < 2 and time.monotonic() < deadline:
            assert proc.poll() is None, proc.communicate()
            time.sleep(0.1)
        time.sleep(0.5)  # both flights under way
        os.killpg(proc.pid, signal.SIGINT)
        out, err = proc.communicate(timeout=60)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
    text = out + err
    assert proc.returncode == 130, text
    assert "Traceback" not in text and "KeyboardInterrupt" not in text, text
    assert "No log" not in text
    assert text.count("interrupted") == 1, text
    kept = sorted(logs.glob("*.incomplete.h5"))
    assert [p.name for p in kept] == ["gap-50-mm.incomplete.h5", "gap-80-mm.incomplete.h5"]
    for p in kept:
        assert str(p) in " ".join(err.split()), err
        log = read_log(p)
        assert not log.complete and log.series["time_s"].size > 1


def test_versus_refuses_pipes_huge_grids_and_huge_sampling_before_flying(tmp_path, capsys):
    """Field-trial findings: `versus` reading a named pipe hung, a 10⁴-variant --set grid and a
    tiny --sample exhausted memory. Each is refused with exit 2 and one clear message."""
    root = ROOT
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    assert main(["versus", str(fifo), "--set", "thruster.0.gap=5 cm,6 cm"]) == 2
    err = capsys.readouterr().err
    assert "named pipe" in err and err.count("named pipe") == 1  # said once, not per variant

    scen = str(root / "scenarios" / "glasswort-survey.toml")
    gaps = ",".join(f"{g} mm" for g in range(30, 330))
    assert main(["versus", scen, "--set", f"thruster.0.gap={gaps}"]) == 2
    err = capsys.readouterr().err
    assert "versus --set asks for 300 points" in err and "BRINEBOLT_MAX_GRID" in err

    assert main(["versus", scen, "--set", "thruster.0.gap=5 cm,6 cm", "--sample", "1 ms"]) == 2
    err = capsys.readouterr().err
    assert "logged samples" in err and err.count("logged samples (3 h") == 1
