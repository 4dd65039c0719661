"""The key reference docs/FILE_KEYS.md: generated from the schema, complete, and right about the
keys users asked for (issue 10: the 60 °C battery limit, speed_gain, speed_reset_time and the
per-unit or total meaning of power legs and of the steady table's columns).

These are documentation tests: they check the reference against the code that reads the files
(schema, loaders, CLI, engine), not physics.
"""

from __future__ import annotations

import ast
import difflib
import inspect
import re
import subprocess
import sys
import tomllib
from pathlib import Path

import numpy as np
import pytest
from pydantic import BaseModel

from sim.io import keyref, schema
from sim.io.files import InputError

ROOT = Path(__file__).resolve().parent.parent
DOC = ROOT / "docs" / "FILE_KEYS.md"


def _all_keys() -> dict[str, keyref.KeyInfo]:
    out = {}
    for model in (schema.VesselFile, schema.ScenarioFile):
        sections, _ = keyref.file_sections(model, "Top level")
        for sec in sections:
            for k in sec.keys:
                out[k.path] = k
    return out


KEYS = _all_keys()


# ------------------------------------------------------------------ (a) the committed file


def test_committed_reference_equals_the_generated_text():
    fix = f"regenerate it with: {keyref.REGENERATE_COMMAND}"
    assert DOC.is_file(), f"docs/FILE_KEYS.md is missing; {fix}"
    committed = DOC.read_text(encoding="utf-8")
    generated = keyref.render_markdown()
    if committed != generated:
        diff = "\n".join(
            list(
                difflib.unified_diff(
                    committed.splitlines(),
                    generated.splitlines(),
                    "docs/FILE_KEYS.md (committed)",
                    "generated from sim/io/schema.py",
                    lineterm="",
                )
            )[:40]
        )
        pytest.fail(f"docs/FILE_KEYS.md is out of date with the file schema; {fix}\n{diff}")


def test_the_module_command_prints_the_reference():
    out = subprocess.run(
        [sys.executable, "-m", "sim.io.keyref"],
        cwd=ROOT,
        capture_output=True,
        check=True,
        env={"PYTHONPATH": str(ROOT), "PATH": "", "LANG": "C"},
    )
    assert out.stdout.decode("utf-8") == keyref.render_markdown()


# ------------------------------------------------------------------ (b) everything documented


def test_every_key_of_every_model_has_a_description():
    missing = keyref.undocumented_keys()
    assert not missing, (
        "keys without a description (add a docstring under the field in sim/io/schema.py): "
        + ", ".join(missing)
    )


def test_every_optional_key_says_what_happens_when_left_out():
    missing = keyref.optional_keys_without_default_text()
    assert not missing, (
        "optional keys (default None) without a 'Default: ...' paragraph in their description "
        "in sim/io/schema.py: " + ", ".join(missing)
    )


def test_every_table_has_an_introduction():
    for model in (schema.VesselFile, schema.ScenarioFile):
        sections, _ = keyref.file_sections(model, "Top level")
        bare = [s.heading for s in sections if not s.intro]
        assert not bare, f"tables without a class docstring in sim/io/schema.py: {bare}"


class _Probe(BaseModel):
    documented: float = 1.0
    """Says what it is.

    Default: one."""
    bare: float = 2.0


def test_the_description_reader_tells_documented_from_bare_fields():
    assert keyref.field_description(_Probe, "documented").startswith("Says what it is.")
    assert keyref.field_description(_Probe, "bare") == ""


def test_every_model_and_field_of_the_schema_is_in_the_reference():
    # pydantic's own JSON schema lists the models and their fields independently of the walker
    for model in (schema.VesselFile, schema.ScenarioFile):
        js = model.model_json_schema()
        sections, _ = keyref.file_sections(model, "Top level")
        documented = [{k.path.rsplit(".", 1)[-1] for k in s.keys} for s in sections]
        for name, sub in [(model.__name__, js), *js.get("$defs", {}).items()]:
            fields = set(sub.get("properties", {}))
            assert any(fields <= d for d in documented), f"{name}: {fields} not all documented"


def test_every_key_of_the_bundled_files_is_in_the_reference():
    def paths(data, prefix=""):
        for k, v in data.items():
            p = f"{prefix}{k}"
            if isinstance(v, dict) and p not in ("variant[].set",):
                yield p
                yield from paths(v, p + ".")
            elif isinstance(v, list) and v and all(isinstance(x, dict) for x in v):
                yield p
                for x in v:
                    yield from paths(x, p + "[].")
            else:
                yield p

    variants = {k.path for k in keyref.VARIANTS_KEYS}
    for f in sorted((ROOT / "vessels").glob("*.toml")) + sorted(
        (ROOT / "scenarios").glob("*.toml")
    ):
        known = variants if f.name.startswith("variants-") else set(KEYS)
        found = set(paths(tomllib.loads(f.read_text(encoding="utf-8"))))
        assert found <= known, f"{f.name}: keys missing from the reference: {found - known}"


# ------------------------------------------------------------------ (c) the keys users asked for


def test_battery_temperature_limit_60_degc_is_documented():
    k = KEYS["limits.battery_temperature_max"]
    assert (k.unit, k.default) == ("°C", "60 °C")
    assert "stops" in k.meaning and "battery temperature" in k.meaning
    assert "| `limits.battery_temperature_max` | °C | 60 °C |" in keyref.render_markdown()


def test_speed_hold_gains_are_documented():
    k = KEYS["leg[].speed_gain"]
    assert k.unit == "V/(m/s)"
    assert "pole placement" in k.default and "2 s and 600 s" in k.default
    assert "proportional gain" in k.meaning and "Speed legs only" in k.meaning
    k = KEYS["leg[].speed_reset_time"]
    assert k.unit == "s"
    assert "2τ when speed_gain is given" in k.default
    assert "integral" in k.meaning
    text = keyref.render_markdown()
    assert "| `leg[].speed_gain` | V/(m/s) |" in text
    assert "| `leg[].speed_reset_time` | s |" in text


def test_per_unit_and_total_meanings_are_documented():
    power = KEYS["leg[].power"]
    assert power.unit == "W" and "exactly one of" in power.default
    assert "total electrical power into all thruster units" in power.meaning
    assert "not per unit" in power.meaning
    assert "per unit, not a sum" in KEYS["leg[].voltage"].meaning
    assert "total thruster current" in KEYS["leg[].current"].meaning
    assert KEYS["drive.max_current"].meaning.startswith("Per thruster unit")
    assert KEYS["drive.undervoltage_margin"].meaning.startswith("Per cell")
    columns = dict(keyref.STEADY_COLUMNS)
    assert "what a `power` leg holds" in columns["thruster kW"]
    assert "Total" in columns["current A"] and "not a sum" in columns["volts V"]


def test_power_and_current_legs_hold_totals_and_voltage_legs_a_per_unit_value(tmp_path):
    """What the reference says about the commands, checked on a run of the two-unit drone."""
    from sim import api
    from sim.io.files import load_scenario

    vessel = tomllib.loads((ROOT / "vessels" / "glasswort-drone.toml").read_text("utf-8"))
    units = sum(t.get("units", 1) for t in vessel["thruster"])
    assert units == 2  # the check below needs several units to tell total from per unit
    sc = tmp_path / "commands.toml"
    sc.write_text(
        f"""
[scenario]
name = "commands"
vessel = "{(ROOT / "vessels" / "glasswort-drone.toml").as_posix()}"
[water]
temperature = "14 degC"
[output]
sample = "5 s"
[[leg]]
name = "power"
power = "400 W"
until = {{ duration = "20 s" }}
[[leg]]
name = "current"
current = "120 A"
until = {{ duration = "20 s" }}
[[leg]]
name = "voltage"
voltage = "12 V"
until = {{ duration = "20 s" }}
""",
        encoding="utf-8",
    )
    r = api.run_scenario(load_scenario(sc), write_log=False, force=True).result
    s = r.series
    leg = s["leg_index"]
    inside = (s["time_s"] % 20.0) > 1.0  # skip the instants where legs change
    assert np.allclose(s["thruster_power_w"][(leg == 0) & inside], 400.0, rtol=1e-6)
    total_a = np.sum(s["thruster_current_a"], axis=1)
    assert np.allclose(total_a[(leg == 1) & inside], 120.0, rtol=1e-6)
    assert np.allclose(s["thruster_voltage_v"][(leg == 2) & inside], 12.0, rtol=1e-9)


# ------------------------------------------------------------------ the hand-written tables


def test_variants_keys_are_the_ones_the_reader_accepts(tmp_path):
    from sim.analysis.variants import read_variants_file

    f = tmp_path / "variants-x.toml"
    f.write_text('bogus = 1\n[[variant]]\nlabel = "a"\nbogus = 2\n', encoding="utf-8")
    with pytest.raises(InputError) as exc:
        read_variants_file(f)
    allowed = []
    for p in exc.value.problems:
        if p.message.startswith("unknown key"):
            m = re.search(r"allowed: (.*)$", p.message)
            allowed.append([a.strip().strip("[]") for a in m.group(1).split(",")])
    top, inner = allowed
    assert {k.path for k in keyref.VARIANTS_KEYS} == set(top) | {f"variant[].{a}" for a in inner}


def test_steady_columns_are_the_ones_the_command_prints():
    from sim.cli import steady

    tree = ast.parse(inspect.getsource(steady.cmd_steady))

    def default(e):  # the nautical default of `"speed m/s" if metric else "speed kn"`
        return ast.literal_eval(e.orelse if isinstance(e, ast.IfExp) else e)

    cols = next(
        [default(e) for e in node.value.elts]
        for node in ast.walk(tree)
        if isinstance(node, ast.Assign)
        and any(isinstance(t, ast.Name) and t.id == "cols" for t in node.targets)
    )
    assert [c for c, _ in keyref.STEADY_COLUMNS] == cols
