"""Fuzzing the file readers: whatever a vessel or scenario file holds, loading it either succeeds
or raises the tool's own InputError (with printable problems), never anything else.

Files are written with the small TOML writer below (inline tables only, which TOML reads into
the same data as [table] headers), so the structures and values are random but the syntax is
valid; a separate test throws random text at the TOML reader itself.
"""

from __future__ import annotations

import math
import tomllib
import typing
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from pydantic import BaseModel

from sim.io.files import InputError, check_file, load_scenario, load_vessel
from sim.io.schema import ScenarioFile, VesselFile

ROOT = Path(__file__).resolve().parent.parent
GOOD_VESSEL = ROOT / "vessels" / "glasswort-drone.toml"
GOOD_SCENARIO = ROOT / "scenarios" / "glasswort-survey.toml"

FUZZ = settings(
    max_examples=150,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)

# ------------------------------------------------------------------ a tiny TOML writer


def _toml_string(text: str) -> str:
    out = []
    for ch in text:
        if ch == "\\":
            out.append("\\\\")
        elif ch == '"':
            out.append('\\"')
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04x}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def toml_value(value: object) -> str:
    """A value as TOML text (tables inline)."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, str):
        return _toml_string(value)
    if isinstance(value, list):
        return "[" + ", ".join(toml_value(v) for v in value) + "]"
    if isinstance(value, dict):
        items = (f"{_toml_string(k)} = {toml_value(v)}" for k, v in value.items())
        return "{" + ", ".join(items) + "}"
    raise TypeError(type(value))


def dumps(data: dict) -> str:
    return "".join(f"{_toml_string(k)} = {toml_value(v)}\n" for k, v in data.items())


def test_the_writer_round_trips():
    data = {
        "a": [1, 2.5, 'x"\\\n\x01é', True, {"b": float("inf"), "c": []}],
        "d": {"e": {"f": -3}},
    }
    back = tomllib.loads(dumps(data))
    assert back == data
    assert math.isnan(tomllib.loads(dumps({"n": float("nan")}))["n"])


# ------------------------------------------------------------------ strategies


def _key_names(model: type[BaseModel], out: set[str]) -> set[str]:
    for name, f in model.model_fields.items():
        out.add(name)
        stack = [f.annotation]
        while stack:
            a = stack.pop()
            if isinstance(a, type) and issubclass(a, BaseModel):
                if a.__name__ not in out:
                    out.add(a.__name__)
                    _key_names(a, out)
            else:
                stack.extend(typing.get_args(a))
    return out


KEYS = sorted(
    k
    for k in _key_names(VesselFile, set()) | _key_names(ScenarioFile, set())
    if k.islower() or "_" in k
)
UNITS = [
    "m",
    "mm",
    "km",
    "nmi",
    "kn",
    "m/s",
    "kg",
    "t",
    "s",
    "min",
    "h",
    "N",
    "kN",
    "W",
    "kW",
    "V",
    "mV",
    "A",
    "kA",
    "ohm",
    "mohm",
    "A*h",
    "kWh",
    "T",
    "mT",
    "degC",
    "K",
    "degF",
    "delta_degC",
    "m^2",
    "m^3",
    "L",
    "W/K",
    "kJ/K",
    "V/(m/s)",
    "dbar",
    "",
    "%",
    "kg/m",
    "blorb",
    "m**",
    "((",
]
NAMES = [
    "pylon",
    "go",
    "return",
    "survey",
    "nmc_pouch_huria2012",
    "graphite",
    "N42SH",
    "permanent",
    "superconducting",
    "submerged-body",
    "displacement",
    "table",
    "ducted",
    "disk",
    "goto",
    "stop",
    "derate",
    "hotel",
    "auto",
]

_ALPHABET = "abcdefghijklmnopqrstuvwxyz_-.0123456789 []{}=\"'\\/#,*^()%\n\t\x00\x7féµ°Ω€\u2028"
_text = st.text(alphabet=_ALPHABET, max_size=12)
_numbers = st.one_of(
    st.integers(min_value=-(2**63), max_value=2**63 - 1),
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0, 1, -1, 0.5, 1e-300, 1e308, -0.0]),
)
_quantities = st.builds(
    lambda n, u, sep: f"{n}{sep}{u}",
    st.one_of(_numbers, st.sampled_from(["nan", "inf", "-inf", "1,5", ".5", "1e400", "", "x"])),
    st.sampled_from(UNITS),
    st.sampled_from([" ", "", "  "]),
)
_scalars = st.one_of(_numbers, st.booleans(), _text, _quantities, st.sampled_from(NAMES))
_keys = st.one_of(st.sampled_from(KEYS), _text)


def _extend(children):
    return st.one_of(
        st.lists(children, max_size=3),
        st.dictionaries(_keys, children, max_size=4),
    )


values = st.recursive(_scalars, _extend, max_leaves=6)
tables = st.dictionaries(_keys, values, max_size=6)


def _document(top_keys: list[str]):
    """A top-level dict with some of the file's real tables, filled at random."""
    return st.dictionaries(
        st.one_of(st.sampled_from(top_keys), _text),
        st.one_of(tables, st.lists(tables, max_size=2), values),
        max_size=5,
    )


VESSEL_TOP = [*VesselFile.model_fields, "extends"]
SCENARIO_TOP = list(ScenarioFile.model_fields)


@pytest.fixture(scope="module")
def fuzz_dir(tmp_path_factory) -> Path:
    return tmp_path_factory.mktemp("fuzz")


def _loads_or_input_error(load, path: Path) -> None:
    try:
        load(path)
    except InputError as exc:
        assert exc.problems
        for p in exc.problems:
            assert isinstance(p.file, str) and isinstance(p.key, str) and p.message
            str(p)  # every problem can be shown


# ------------------------------------------------------------------ random documents


@FUZZ
@given(doc=_document(VESSEL_TOP))
def test_random_vessel_files_raise_only_input_error(fuzz_dir, doc):
    path = fuzz_dir / "vessel.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_vessel, path)


@FUZZ
@given(doc=_document(SCENARIO_TOP), vessel=st.one_of(st.just(str(GOOD_VESSEL)), _text, values))
def test_random_scenario_files_raise_only_input_error(fuzz_dir, doc, vessel):
    info = doc.get("scenario")
    if isinstance(info, dict):
        info["vessel"] = vessel
    path = fuzz_dir / "scenario.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_scenario, path)


# ------------------------------------------------------------------ mutated good files


def _paths(node, prefix=()):
    """Every path to a value inside parsed TOML data."""
    yield prefix
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, (*prefix, k))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _paths(v, (*prefix, i))


def _mutate(data: dict, draw) -> dict:
    import copy

    data = copy.deepcopy(data)
    for _ in range(draw(st.integers(1, 4))):
        paths = [p for p in _paths(data) if p]
        if not paths:
            break
        path = draw(st.sampled_from(paths))
        parent = data
        for part in path[:-1]:
            parent = parent[part]
        last = path[-1]
        action = draw(st.sampled_from(["replace", "delete", "add"]))
        if action == "delete":
            del parent[last]
        elif action == "add" and isinstance(parent, dict):
            parent[draw(_keys)] = draw(values)
        else:
            parent[last] = draw(values)
    return data


_magnitudes = st.one_of(
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False),
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0.0, 1e-9, 1e-3, 0.5, 1.0, 2.0, 100.0, 1e5, 1e12]),
)


def _perturb(data: dict, draw) -> dict:
    """Keep the file's shape and units but change a few magnitudes to anything at all: legal
    extremes reach the physics models, which must answer with range errors, not crashes."""
    import copy
    import re

    data = copy.deepcopy(data)
    leaves = [
        p
        for p in _paths(data)
        if p and isinstance(_at(data, p), int | float | str) and not isinstance(_at(data, p), bool)
    ]
    for path in draw(st.lists(st.sampled_from(leaves), min_size=1, max_size=3, unique=True)):
        old = _at(data, path)
        x = draw(_magnitudes)
        if isinstance(old, str):
            m = re.match(r"^\s*[-+]?[\d.]+(?:[eE][-+]?\d+)?\s*(.*)$", old)
            if not m:
                continue
            new = f"{x!r} {m.group(1)}"
        elif isinstance(old, int):
            new = int(x) if math.isfinite(x) else x
        else:
            new = x
        parent = _at(data, path[:-1])
        parent[path[-1]] = new
    return data


def _at(data, path):
    node = data
    for part in path:
        node = node[part]
    return node


VESSEL_DATA = tomllib.loads(GOOD_VESSEL.read_text(encoding="utf-8"))
SCENARIO_DATA = tomllib.loads(GOOD_SCENARIO.read_text(encoding="utf-8"))
SCENARIO_DATA["scenario"]["vessel"] = str(GOOD_VESSEL)


@FUZZ
@given(data=st.data())
def test_mutated_vessel_files_raise_only_input_error(fuzz_dir, data):
    doc = _mutate(VESSEL_DATA, data.draw)
    path = fuzz_dir / "mutated-vessel.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_vessel, path)


@FUZZ
@given(data=st.data())
def test_mutated_scenario_files_raise_only_input_error(fuzz_dir, data):
    doc = _mutate(SCENARIO_DATA, data.draw)
    path = fuzz_dir / "mutated-scenario.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_scenario, path)


# ------------------------------------------------------------------ raw text


_fragments = st.sampled_from(
    [
        "[vessel]",
        "[[thruster]]",
        "[[leg]]",
        "[scenario]",
        "name = ",
        '"',
        "'''",
        "=",
        "\n",
        "{",
        "}",
        "[",
        "]",
        ",",
        'mass = "3 kg"',
        "extends = ",
        "#",
        "\\",
        "nan",
        "1e999",
    ]
)


@settings(max_examples=100, deadline=None)
@given(parts=st.lists(st.one_of(_fragments, _text), max_size=30))
def test_random_text_raises_only_input_error(fuzz_dir, parts):
    path = fuzz_dir / "text.toml"
    path.write_text("".join(parts), encoding="utf-8")
    _loads_or_input_error(check_file, path)


@settings(max_examples=50, deadline=None)
@given(blob=st.binary(max_size=200))
def test_random_bytes_raise_only_input_error(fuzz_dir, blob):
    path = fuzz_dir / "bytes.toml"
    path.write_bytes(blob)
    _loads_or_input_error(check_file, path)


@FUZZ
@given(data=st.data())
def test_extreme_magnitudes_in_good_vessels_raise_only_input_error(fuzz_dir, data):
    doc = _perturb(VESSEL_DATA, data.draw)
    path = fuzz_dir / "perturbed-vessel.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_vessel, path)


@FUZZ
@given(data=st.data())
def test_extreme_magnitudes_in_good_scenarios_raise_only_input_error(fuzz_dir, data):
    doc = _perturb(SCENARIO_DATA, data.draw)
    path = fuzz_dir / "perturbed-scenario.toml"
    path.write_text(dumps(doc), encoding="utf-8")
    _loads_or_input_error(load_scenario, path)


@settings(max_examples=40, deadline=None)
@given(
    depth=st.integers(min_value=1, max_value=3000),
    big=st.integers(min_value=2**63, max_value=10**500) | st.integers(max_value=-(2**63) - 1),
    bom=st.booleans(),
)
def test_hostile_nesting_huge_integers_and_bom_raise_only_input_error(fuzz_dir, depth, big, bom):
    # issue 10: deep nesting (RecursionError), integers beyond 64 bits (OverflowError) and a
    # byte-order mark once ended in internal errors
    text = GOOD_VESSEL.read_text(encoding="utf-8")
    path = fuzz_dir / "hostile.toml"
    nested = "[" * depth + "]" * depth
    path.write_bytes(
        (b"\xef\xbb\xbf" if bom else b"")
        + (text + f"\n[extra]\nnested = {nested}\nbig = {big}\n").encode("utf-8")
    )
    _loads_or_input_error(check_file, path)
    path.write_bytes((b"\xef\xbb\xbf" if bom else b"") + text.encode("utf-8"))
    check_file(path)  # the byte-order mark alone is accepted
