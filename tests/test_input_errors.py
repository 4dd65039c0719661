"""Bad input: the malformed-file corpus (tests/data/bad), warnings for suspicious but legal
designs, and the unit reader's edge cases.

Every corpus file goes through ``brinebolt check`` (``sim.cli.main``); the table of expected
problems is ``tests/data/bad/expected.toml``. A file must give exit code 2, name itself, and
report each expected problem on one line with its key path, the value as written and a phrase of
the message, with no traceback and with every problem of the file in the same run.
"""

from __future__ import annotations

import tomllib
from collections import defaultdict
from pathlib import Path

import pytest

from sim.cli import main
from sim.io.files import InputError, check_file, load_scenario, load_vessel
from sim.io.units import UnitParseError, to_si

BAD = Path(__file__).resolve().parent / "data" / "bad"
VESSELS = Path(__file__).resolve().parent.parent / "vessels"
EXPECTED = tomllib.loads((BAD / "expected.toml").read_text(encoding="utf-8"))["case"]
BY_FILE: dict[str, list[dict]] = defaultdict(list)
for _case in EXPECTED:
    BY_FILE[_case["file"]].append(_case)


def _check(capsys, *files) -> tuple[int, str]:
    code = main(["check", *[str(f) for f in files]])
    out, err = capsys.readouterr()
    return code, out + err


# ------------------------------------------------------------------ the corpus


def test_corpus_is_large_and_every_file_has_expectations():
    files = {p.name for p in BAD.glob("*.toml")} - {"expected.toml"}
    assert len(files) >= 40
    assert files == set(BY_FILE), "corpus files and expected.toml must list the same files"
    # it covers the error classes the issue names (and more)
    classes = {c["class"] for c in EXPECTED}
    for needed in (
        "missing unit",
        "wrong dimension",
        "unknown key",
        "missing key",
        "wrong type",
        "NaN",
        "inf",
        "negative length",
        "salinity out of the models' range",
        "temperature out of the models' range",
        "empty mission",
        "leg without end condition",
        "leg that can never end",
        "trigger naming a missing leg",
        "circular extends",
        "unknown cell set",
        "unknown electrode",
        "unknown magnet grade",
        "bad TOML syntax",
        "duplicate name",
        "unknown hull model",
        "mismatched table lengths",
        "non-monotone table",
        "wrong value in a list",
    ):
        assert needed in classes, needed


@pytest.mark.parametrize("name", sorted(BY_FILE))
def test_each_bad_file_is_reported_clearly(name, capsys):
    code, text = _check(capsys, BAD / name)
    assert code == 2, text
    assert "Traceback" not in text
    assert name in text  # the checked file is named (also when the problem is in its vessel)
    errors = [line for line in text.splitlines() if line.startswith("error")]
    cases = BY_FILE[name]
    # all problems of the file at once: exactly the expected ones, in a single run
    assert len(errors) == len(cases), "\n".join(errors)
    for case in cases:
        where = case.get("in", name)
        key = case["key"]
        heads = [f"{where}: {key} = ", f"{where}: {key}: "] if key else [f"{where}: "]
        lines = [ln for ln in errors if any(h in ln for h in heads)]
        assert lines, f"no error line for {where}: {key!r} in\n" + "\n".join(errors)
        line = (
            lines[0]
            if len(lines) == 1
            else next((ln for ln in lines if case["phrase"] in ln), lines[0])
        )
        assert case["phrase"] in line, line
        if "value" in case:
            value_part = line.split(" = ", 1)[1] if " = " in line else ""
            assert case["value"] in value_part, line


@pytest.mark.parametrize("name", sorted(BY_FILE))
def test_the_python_api_raises_only_input_error(name):
    with pytest.raises(InputError) as info:
        check_file(BAD / name)
    problems = info.value.problems
    assert problems and all(p.severity == "error" for p in problems)
    assert all(p.message for p in problems)


def test_several_files_in_one_check_are_all_reported(capsys):
    good = VESSELS / "glasswort-drone.toml"
    code, text = _check(
        capsys, BAD / "vessel-missing-unit.toml", good, BAD / "scenario-nan-duration.toml"
    )
    assert code == 2
    assert "vessel-missing-unit.toml: vessel.mass = 165" in text
    assert "scenario-nan-duration.toml: leg[0].until.duration = 'nan min'" in text
    assert f"ok      {good}" in text


def test_problems_carry_file_key_value_and_allowed():
    with pytest.raises(InputError) as info:
        load_vessel(BAD / "vessel-multi-error.toml")
    by_key = {p.key: p for p in info.value.problems}
    p = by_key["vessel.mass"]
    assert p.file.endswith("vessel-multi-error.toml")
    assert p.value == 165
    assert "allowed:" in p.message
    assert by_key["thruster[0].gap"].value == "-5 mm"  # the value as written, not in SI


def test_scenario_and_its_vessel_problems_come_together():
    with pytest.raises(InputError) as info:
        load_scenario(BAD / "scenario-multi-error.toml")
    files = {Path(p.file).name for p in info.value.problems}
    assert files == {"scenario-multi-error.toml", "vessel-unknown-cell.toml"}


# ------------------------------------------------------------------ warnings (legal designs)

VESSEL = """
[vessel]
name = "Warning test drone"
mass = "150 kg"

[hull]
model = "submerged-body"
length = "2.4 m"
diameter = "0.3 m"

[[thruster]]
name = "pylon"
units = 2
gap = "{gap}"
pole_height = "{pole}"
active_length = "{length}"
field = "{field}"
magnet = "permanent"
magnet_grade = "N42SH"

[battery]
cell = "nmc_pouch_huria2012"
series = 14
parallel = {parallel}

[drive]
max_current = "{amps}"
max_voltage = "{volts}"
"""

SCENARIO = """
[scenario]
name = "warning test"
vessel = "v.toml"

[water]
salinity = {salinity}
temperature = "15 degC"

[limits]
time = "2 h"

{legs}
"""

LEG = """
[[leg]]
name = "go"
voltage = "10 V"
until = { duration = "10 min" }
"""


def _vessel(tmp_path, **kw) -> Path:
    values = dict(
        gap="50 mm",
        pole="50 mm",
        length="0.8 m",
        field="0.75 T",
        parallel=6,
        amps="60 A",
        volts="30 V",
    )
    values.update(kw)
    p = tmp_path / "v.toml"
    p.write_text(VESSEL.format(**values), encoding="utf-8")
    return p


def _scenario(tmp_path, salinity=35, legs=LEG, **vessel) -> Path:
    _vessel(tmp_path, **vessel)
    p = tmp_path / "s.toml"
    p.write_text(SCENARIO.format(salinity=salinity, legs=legs), encoding="utf-8")
    return p


def _warnings(capsys, path) -> list[str]:
    code, text = _check(capsys, path)
    assert code == 0, text
    assert "Traceback" not in text
    return [line for line in text.splitlines() if line.startswith("warning")]


def test_plain_design_has_no_warning(tmp_path, capsys):
    assert _warnings(capsys, _scenario(tmp_path)) == []


def test_field_above_magnet_remanence_warns(tmp_path, capsys):
    # N42SH remanence is about 1.3 T (grade tables, common practice): a 1.6 T gap field from
    # permanent magnets alone is suspicious.
    (w,) = _warnings(capsys, _vessel(tmp_path, field="1.6 T"))
    assert "thruster[0].field = '1.6 T'" in w and "remanence" in w


def test_gap_much_wider_than_pole_warns(tmp_path, capsys):
    (w,) = _warnings(capsys, _vessel(tmp_path, gap="300 mm"))
    assert "thruster[0].gap = '300 mm'" in w and "6.0× the pole height" in w


def test_pack_that_cannot_supply_the_drive_current_warns(tmp_path, capsys):
    (w,) = _warnings(capsys, _vessel(tmp_path, parallel=1, amps="400 A", volts="40 V"))
    assert "drive.max_current = '400 A'" in w and "above its rating" in w


def test_boiling_at_bollard_warns(tmp_path, capsys):
    # a narrow, long duct at high voltage: the Joule heat of the bollard flow boils the water
    warns = _warnings(
        capsys,
        _scenario(
            tmp_path,
            gap="10 mm",
            pole="10 mm",
            length="1 m",
            field="0.2 T",
            amps="2 kA",
            volts="150 V",
        ),
    )
    assert any("water.temperature = '15 degC'" in w and "boiling" in w for w in warns), warns


def test_very_fresh_water_warns(tmp_path, capsys):
    # PSS-78: SP 0.5 at 15 °C conducts about 0.05 S/m, two orders below seawater
    (w,) = _warnings(capsys, _scenario(tmp_path, salinity=0.5))
    assert "water.salinity = 0.5" in w and "fresh water" in w


def test_zero_field_is_legal_but_warned(tmp_path, capsys):
    (w,) = _warnings(capsys, _vessel(tmp_path, field="0 T"))
    assert "thruster[0].field = '0 T'" in w and "no thrust" in w


def test_leg_that_only_a_trigger_can_end_warns(tmp_path, capsys):
    legs = """
[[leg]]
name = "drift"
voltage = "0 V"
until = { distance = "2 km" }

[[leg]]
name = "home"
voltage = "10 V"
until = { duration = "5 min" }

[[trigger]]
name = "flat"
when = { soc_below = 0.5 }
then = "goto"
leg = "home"
"""
    (w,) = _warnings(capsys, _scenario(tmp_path, legs=legs))
    assert "leg[0].until.distance = '2 km'" in w and "only a trigger (flat)" in w


def test_schedule_after_the_time_limit_warns(tmp_path, capsys):
    legs = LEG + '\n[[schedule]]\nat = "3 h"\nhotel = "20 W"\n'
    (w,) = _warnings(capsys, _scenario(tmp_path, legs=legs))
    assert "schedule[0].at = '3 h'" in w and "never acts" in w


def test_a_following_current_lets_a_drifting_leg_end(tmp_path, capsys):
    legs = '[[leg]]\nname = "drift"\ncurrent = "0 A"\nuntil = { distance = "200 m" }\n'
    p = _scenario(tmp_path, legs=legs)
    p.write_text(
        p.read_text().replace(
            'temperature = "15 degC"', 'temperature = "15 degC"\ncurrent = "0.3 kn"'
        ),
        encoding="utf-8",
    )
    assert _warnings(capsys, p) == []


# ------------------------------------------------------------------ units at the edge


@pytest.mark.parametrize(
    ("text", "kind", "si"),
    [
        ("3 kn", "speed", 3 * 1852 / 3600),  # knot = 1852 m/h (international nautical mile)
        ("60 mm", "length", 0.06),
        ("285 K", "temperature", 11.85),  # ITS-90: 0 °C = 273.15 K
        ("54 degF", "temperature", 12.222222222222221),  # °C = (°F − 32)·5/9
        ("10 degC", "temperature_difference", 10.0),  # a rise in °C is a rise in K
        ("18 degF", "temperature_difference", 10.0),  # 1 °F step = 5/9 K
        ("10 delta_degC", "temperature_difference", 10.0),
        ("0", "length", 0.0),  # zero needs no unit
    ],
)
def test_units_convert_to_si(text, kind, si):
    assert to_si(text, kind) == pytest.approx(si, rel=1e-12)


@pytest.mark.parametrize(
    ("value", "kind", "phrase"),
    [
        ("3 kg", "speed", "is not a speed"),
        (3, "speed", "has no unit"),
        ("3", "speed", "has no unit"),
        ("nan m", "length", "not a finite number"),
        ("-inf m", "length", "not a finite number"),
        (float("nan"), "length", "not a finite number"),
        ("1e400 m", "length", "not a finite"),
        ("2,5 m", "length", "decimal comma"),
        ("3 2 kn", "speed", "cannot read unit"),
        ("10 delta_degC", "temperature", "temperature difference"),
        ("0", "temperature", "has no unit"),  # 0 °C and 0 K differ: a temperature needs a unit
        (True, "length", "true/false"),
        ([1, 2], "length", "got a list"),
        ({"a": 1}, "length", "got a table"),
        ("m", "length", "does not start with a number"),
        ("5 m/0", "length", "cannot read unit"),
        ("5 (m", "length", "cannot read unit"),
        ("5 \x00", "length", "cannot read unit"),
    ],
)
def test_unit_errors_say_why_and_what_is_allowed(value, kind, phrase):
    with pytest.raises(UnitParseError) as info:
        to_si(value, kind)
    assert phrase in str(info.value)
    assert "allowed:" in str(info.value)
