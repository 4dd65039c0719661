"""Read vessel and scenario files, validate them and report every problem at once.

A problem names the file, the key path, the value found and what is allowed. Nothing here prints:
the CLI formats :class:`InputError` for people; notebooks can inspect ``.problems``.
"""

from __future__ import annotations

import difflib
import json
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, get_args

from pydantic import BaseModel, ValidationError

from sim.engine.spec import MissionSpec, VesselSpec, Water
from sim.io.checks import (
    raw_scenario_problems,
    raw_vessel_problems,
    scenario_problems,
    scenario_warnings,
    vessel_problems,
    vessel_warnings,
)
from sim.io.problems import MISSING, InputError, Problem
from sim.io.schema import Conditions, ScenarioFile, VesselFile
from sim.io.seam import mission_spec, vessel_spec, water

__all__ = [
    "InputError",
    "LoadedScenario",
    "LoadedVessel",
    "Problem",
    "load_scenario",
    "load_vessel",
]

MAX_BASE_DEPTH = 8
MAX_FILE_BYTES = 4 * 1024 * 1024
"""Input files larger than this are refused (a vessel or scenario file is a few kB)."""


@dataclass(frozen=True)
class LoadedVessel:
    path: Path
    text: str
    """The file's text (and that of every base file it extends, in order)."""
    spec: VesselFile
    """The validated file, as written (key names and values in SI)."""
    vessel_spec: VesselSpec
    """The same vessel as the engine takes it (:func:`sim.io.seam.vessel_spec`)."""
    warnings: list[Problem] = field(default_factory=list)


@dataclass(frozen=True)
class LoadedScenario:
    path: Path
    text: str
    spec: ScenarioFile
    """The validated file, as written (key names and values in SI)."""
    vessel: LoadedVessel
    mission_spec: MissionSpec
    """The mission as the engine takes it (:func:`sim.io.seam.mission_spec`)."""
    water: Water
    """The scenario's water as the engine takes it (:func:`sim.io.seam.water`)."""
    warnings: list[Problem] = field(default_factory=list)


# --------------------------------------------------------------------------- helpers


def _exists(path: Path) -> bool:
    """Like Path.exists, but False for names the OS cannot even look up (NUL bytes, too long)."""
    try:
        return path.exists()
    except (OSError, ValueError):
        return False


def _read_toml(path: Path) -> tuple[dict, str]:
    def fail(message: str, key: str = "") -> InputError:
        return InputError([Problem(str(path), key, MISSING, message)])

    try:
        if path.is_dir():
            raise fail("is a folder, not a file; allowed: a TOML file")
        if path.exists() and not path.is_file():
            raise fail("is not a regular file; allowed: a TOML file")
        if path.exists() and path.stat().st_size > MAX_FILE_BYTES:
            raise fail(
                f"is {path.stat().st_size / 1e6:.1f} MB, too large for a vessel or scenario "
                f"file; allowed: at most {MAX_FILE_BYTES / 1e6:.0f} MB"
            )
        raw = path.read_bytes()
    except InputError:
        raise
    except FileNotFoundError:
        raise fail("file not found") from None
    except PermissionError:
        raise fail("cannot read the file: permission denied") from None
    except (OSError, ValueError) as exc:
        raise fail(f"cannot read the file: {exc}") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        col = exc.start - (raw.rfind(b"\n", 0, exc.start) + 1) + 1
        raise fail(
            f"not UTF-8 text (byte 0x{raw[exc.start]:02x} at column {col}); allowed: a TOML "
            "file saved as UTF-8",
            f"line {line}",
        ) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"\s*\(at line (\d+), column (\d+)\)", msg)
        key = where = ""
        if m:
            key, where = f"line {m.group(1)}", f" at column {m.group(2)}"
            msg = msg[: m.start()] + msg[m.end() :]
        elif "end of document" in msg:
            key = "end of file"
        if msg.startswith("Cannot overwrite a value") or "twice" in msg:
            msg = f"a key or table is defined twice ({msg})"
        msg += where
        raise fail(
            f"not valid TOML: {msg}; allowed: TOML syntax (key = value, [table], "
            "[[array-of-tables]], text in quotes)",
            key,
        ) from None
    return data, text


def _key_path(loc: tuple, data: Any) -> tuple[str, Any]:
    """Turn a pydantic error location into 'leg[2].until.distance' and the value found there.

    Discriminator tags that pydantic inserts (e.g. the hull model name) are skipped.
    """
    parts: list[str] = []
    node = data
    for item in loc:
        if isinstance(item, int):
            parts.append(f"[{item}]")
            node = node[item] if isinstance(node, list) and item < len(node) else MISSING
            continue
        if isinstance(node, dict) and item in node:
            parts.append(("." if parts else "") + str(item))
            node = node[item]
        elif isinstance(node, dict) and node.get("model") == item:
            continue  # discriminator tag
        else:
            parts.append(("." if parts else "") + str(item))
            node = MISSING
    return "".join(parts), node


def _fields_at(model: type[BaseModel], loc: tuple, data: Any) -> list[str]:
    """Field names of the model that holds the key at ``loc`` (for 'did you mean')."""
    current: Any = model
    node = data
    for item in loc[:-1]:
        if isinstance(item, int):
            node = node[item] if isinstance(node, list) and item < len(node) else None
            continue
        if not (isinstance(current, type) and issubclass(current, BaseModel)):
            return []
        if item not in current.model_fields:
            continue
        ann = current.model_fields[item].annotation
        node = node.get(item) if isinstance(node, dict) else None
        current = _model_in(ann, node)
        if current is None:
            return []
    if isinstance(current, type) and issubclass(current, BaseModel):
        return list(current.model_fields)
    return []


def _model_in(annotation: Any, node: Any) -> type[BaseModel] | None:
    stack = [annotation]
    found: list[type[BaseModel]] = []
    while stack:
        a = stack.pop()
        if isinstance(a, type) and issubclass(a, BaseModel):
            found.append(a)
        else:
            stack.extend(get_args(a))
    if not found:
        return None
    if len(found) > 1 and isinstance(node, dict) and "model" in node:
        for m in found:
            f = m.model_fields.get("model")
            if f is not None and node["model"] in get_args(f.annotation):
                return m
    return found[0]


def _condition_table(loc: tuple) -> bool:
    """True for the location of a leg's `until` or a trigger's `when` table."""
    return len(loc) == 3 and (loc[0], loc[2]) in (("leg", "until"), ("trigger", "when"))


def _problems_from(exc: ValidationError, model: type[BaseModel], data: dict, file: str):
    problems = []
    for err in exc.errors():
        loc = tuple(err["loc"])
        key, value = _key_path(loc, data)
        kind = err["type"]
        if kind == "bb_value" and isinstance(value, dict):
            value = MISSING  # a check of a whole table: its message names what is wrong
        if kind == "extra_forbidden":
            names = _fields_at(model, loc, data)
            if model is VesselFile and len(loc) == 1:
                names = [*names, "extends"]
            close = difflib.get_close_matches(str(loc[-1]), names, n=1, cutoff=0.6)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            allowed = f"; allowed keys here: {', '.join(names)}" if names else ""
            problems.append(Problem(file, key, value, f"unknown key{hint}{allowed}"))
        elif kind == "missing" and model is ScenarioFile and loc == ("leg",):
            problems.append(Problem(file, key, MISSING, _EMPTY_MISSION))
        elif kind == "missing" and model is ScenarioFile and _condition_table(loc):
            what = "end condition" if loc[-1] == "until" else "condition"
            problems.append(
                Problem(
                    file,
                    key,
                    MISSING,
                    f"required key is missing; allowed: an inline table with at least one "
                    f"{what} of {', '.join(Conditions.model_fields)}",
                )
            )
        elif kind == "missing":
            problems.append(Problem(file, key, MISSING, "required key is missing"))
        elif kind == "union_tag_invalid":
            ctx = err.get("ctx", {})
            problems.append(
                Problem(
                    file,
                    key + ".model",
                    ctx.get("tag"),
                    f"unknown model; allowed: {ctx.get('expected_tags')}",
                )
            )
        elif kind == "union_tag_not_found":
            problems.append(
                Problem(
                    file, key + ".model", MISSING, "required key is missing; it selects the model"
                )
            )
        elif kind == "literal_error":
            ctx = err.get("ctx", {})
            problems.append(
                Problem(
                    file, key, value, f"not an accepted choice; allowed: {ctx.get('expected', '')}"
                )
            )
        elif kind in ("list_type", "dict_type", "model_type", "model_attributes_type"):
            want = "a list" if kind == "list_type" else "a table"
            problems.append(Problem(file, key, value, f"wrong type; allowed: {want}"))
        elif kind in ("string_type",):
            problems.append(Problem(file, key, value, "wrong type; allowed: text in quotes"))
        elif kind == "too_short" and model is ScenarioFile and loc == ("leg",):
            problems.append(Problem(file, key, value, _EMPTY_MISSION))
        elif kind == "too_short":
            ctx = err.get("ctx", {})
            problems.append(
                Problem(
                    file,
                    key,
                    value,
                    f"has {ctx.get('actual_length', 0)} entries; allowed: at least "
                    f"{ctx.get('min_length', 1)}",
                )
            )
        elif kind == "string_too_short":
            problems.append(Problem(file, key, value, "is empty; allowed: non-empty text"))
        else:
            problems.append(Problem(file, key, value, err["msg"]))
    return problems


_EMPTY_MISSION = (
    "empty mission: the file has no [[leg]]; allowed: at least one [[leg]] with one command "
    "(voltage, current, power or speed) and an 'until' table"
)


def _merge(base: dict, over: dict) -> dict:
    out = dict(base)
    for k, v in over.items():
        if isinstance(v, dict) and isinstance(out.get(k), dict):
            out[k] = _merge(out[k], v)
        else:
            out[k] = v
    return out


def _load_vessel_data(path: Path, chain: tuple[Path, ...] = ()) -> tuple[dict, str]:
    """Read a vessel file, following ``extends = "other.toml"`` (deep merge, arrays replaced).

    ``chain`` holds the resolved paths of the files that extend this one."""
    chain = (*chain, path.resolve())
    data, text = _read_toml(path)
    base_name = data.pop("extends", None)
    if base_name is None:
        return data, text

    def fail(message: str) -> InputError:
        return InputError([Problem(str(path), "extends", base_name, message)])

    if not isinstance(base_name, str) or not base_name.strip():
        raise fail("wrong type; allowed: the path of a vessel file in quotes")
    base_path = path.parent / base_name
    if not _exists(base_path):
        raise fail(f"file not found (looked for {base_path})")
    if base_path.resolve() in chain:
        names = " -> ".join(p.name for p in (*chain, base_path.resolve()))
        raise fail(
            f"circular vessel reference ({names}); allowed: a chain of files that ends in a "
            "file without 'extends'"
        )
    if len(chain) > MAX_BASE_DEPTH:
        raise fail(f"more than {MAX_BASE_DEPTH} nested 'extends'; allowed: a shorter chain")
    base_data, base_text = _load_vessel_data(base_path, chain)
    merged = _merge(base_data, data)
    return merged, base_text + f"\n# ---- {path.name} (extends {base_name}) ----\n" + text


def validate_vessel_data(data: dict, file: str) -> VesselFile:
    """Validate already-parsed vessel data (e.g. with command-line overrides applied); raise
    InputError listing every error."""
    return _validate_vessel(data, file)[0]


def _validate_vessel(data: dict, file: str) -> tuple[VesselFile, list[Problem]]:
    """The validated vessel and the warnings of the cross-checks; InputError on any error."""
    problems: list[Problem] = []
    spec = None
    try:
        spec = VesselFile.model_validate(data)
    except ValidationError as exc:
        problems.extend(_problems_from(exc, VesselFile, data, file))
    problems.extend(raw_vessel_problems(data, file))
    if spec is not None and not problems:
        problems.extend(vessel_problems(spec, data, file))
    errors = [p for p in problems if p.severity == "error"]
    if errors:
        raise InputError(errors)
    assert spec is not None
    return spec, problems


def load_vessel(path: str | Path, overrides: dict | None = None) -> LoadedVessel:
    """Read and validate a vessel file (following ``extends``); raise InputError listing all
    problems."""
    path = Path(path)
    data, text = _load_vessel_data(path)
    if overrides:
        data = _merge(data, overrides)
        # the log's provenance must describe the vessel actually flown
        text += (
            "\n# ---- overrides applied on top of the file above (JSON, deep-merged) ----\n# "
            + json.dumps(overrides, sort_keys=True, default=str)
            + "\n"
        )
    spec, warnings = _validate_vessel(data, str(path))
    return LoadedVessel(
        path=path,
        text=text,
        spec=spec,
        vessel_spec=vessel_spec(spec),
        warnings=warnings + vessel_warnings(spec, str(path), data),
    )


def load_scenario(
    path: str | Path, vessel_overrides: dict | None = None, vessel_path: str | Path | None = None
) -> LoadedScenario:
    """Read and validate a scenario file and the vessel file it names.

    ``vessel_path`` replaces the vessel the scenario names (for comparing variants);
    ``vessel_overrides`` is deep-merged into the vessel data before validation. Every problem
    of both files is collected before InputError is raised.
    """
    path = Path(path)
    data, text = _read_toml(path)
    problems: list[Problem] = []
    spec = None
    try:
        spec = ScenarioFile.model_validate(data)
    except ValidationError as exc:
        problems.extend(_problems_from(exc, ScenarioFile, data, str(path)))
    problems.extend(raw_scenario_problems(data, str(path)))
    vessel = None
    vfile = vessel_path
    if vfile is None:
        info = data.get("scenario")
        name = info.get("vessel") if isinstance(info, dict) else None
        if isinstance(name, str) and name:
            vfile = path.parent / name
            if not _exists(Path(vfile)):
                problems.append(
                    Problem(
                        str(path), "scenario.vessel", name, f"file not found (looked for {vfile})"
                    )
                )
                vfile = None
    if vfile is not None:
        try:
            vessel = load_vessel(vfile, vessel_overrides)
        except InputError as exc:
            problems.extend(exc.problems)
    if spec is not None and not problems:
        problems.extend(scenario_problems(spec, vessel.spec if vessel else None, data, str(path)))
    errors = [p for p in problems if p.severity == "error"]
    if errors:
        raise InputError(errors)
    assert spec is not None and vessel is not None
    return LoadedScenario(
        path=path,
        text=text,
        spec=spec,
        vessel=vessel,
        mission_spec=mission_spec(spec),
        water=water(spec.water),
        warnings=problems + scenario_warnings(spec, vessel.spec, str(path), data),
    )


def check_file(path: str | Path) -> tuple[str, list[Problem]]:
    """Validate a vessel or a scenario file (told apart by its top-level tables).

    Returns the kind ('vessel' or 'scenario') and the warnings (a scenario's include those of
    its vessel); raises InputError on errors.
    """
    path = Path(path)
    data, _ = _read_toml(path)
    if "scenario" in data or "leg" in data:
        loaded = load_scenario(path)
        return "scenario", loaded.warnings + loaded.vessel.warnings
    if "vessel" in data or "hull" in data or "extends" in data:
        return "vessel", load_vessel(path).warnings
    raise InputError(
        [
            Problem(
                str(path),
                "",
                MISSING,
                "neither a vessel file (with [vessel]) nor a scenario file (with "
                "[scenario]); allowed: one of the two",
            )
        ]
    )
