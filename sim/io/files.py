"""Read vessel and scenario files, validate them and report every problem at once.

A problem names the file, the key path, the value found and what is allowed. Nothing here prints:
the CLI formats :class:`InputError` for people; notebooks can inspect ``.problems``.
"""

from __future__ import annotations

import difflib
import json
import os
import re
import stat
import tomllib
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, get_args

from pydantic import BaseModel, ValidationError

from sim.engine.spec import MissionSpec, VesselSpec, Water
from sim.io import budget
from sim.io.checks import (
    raw_scenario_problems,
    raw_vessel_problems,
    scenario_problems,
    scenario_warnings,
    vessel_problems,
    vessel_warnings,
)
from sim.io.feasibility import feasibility_problems
from sim.io.problems import MISSING, InputError, Problem
from sim.io.schema import Conditions, ScenarioFile, VesselFile
from sim.io.seam import mission_spec, vessel_spec, water
from sim.io.study_schema import StudyFile

__all__ = [
    "CHECKERS",
    "FILE_KINDS",
    "InputError",
    "LoadedScenario",
    "LoadedVessel",
    "Problem",
    "check_file",
    "file_kind",
    "kind_of",
    "load_scenario",
    "load_study_file",
    "load_vessel",
    "max_file_bytes",
    "read_bytes_capped",
    "read_toml",
]

MAX_BASE_DEPTH = 8

MAX_FILE_BYTES_ENV = "BRINEBOLT_MAX_FILE_BYTES"
"""Environment variable that raises (or lowers) :data:`MAX_FILE_BYTES`, in bytes."""

MAX_FILE_BYTES = 1024 * 1024
"""Input files larger than this (1 MiB) are refused: a vessel or scenario file is a few kB. The
environment variable ``BRINEBOLT_MAX_FILE_BYTES`` (a number of bytes) sets another cap."""

MAX_NESTING = 32
"""Deepest nesting of tables and arrays accepted in an input file (the formats need four)."""

_INT64 = (-(2**63), 2**63 - 1)

FILE_KINDS: dict[str, tuple[str, ...]] = {
    "variants": ("variant",),
    "scenario": (
        "scenario",
        "leg",
        "water",
        "start",
        "limits",
        "output",
        "solver",
        "trigger",
        "schedule",
    ),
    "vessel": ("vessel", "hull", "thruster", "battery", "drive", "hotel", "extends"),
    "study": (
        "study",
        "vary",
        "sampling",
        "constraint",
        "optimise",
        "uncertain",
        "uncertainty",
        "sensitivity",
        "mass",
    ),
}
"""The kinds of input file and the top-level keys that mark each (its tables). A file is of the
kind whose marks it carries most of; the first listed wins a tie (a variants file also has a
``scenario`` key, but only it has ``[[variant]]``). A new kind (e.g. a study file) slots in by
adding its marks here and a checker where files are checked."""

KIND_USE: dict[str, str] = {
    "vessel": "give it to `brinebolt check`, or name it in a scenario file with "
    "[scenario] vessel = ...",
    "scenario": "fly it with `brinebolt run`",
    "variants": "fly it with `brinebolt versus`",
    "study": "run it with `brinebolt study`",
}
"""What each kind of file is for (in messages that refuse a file of the wrong kind)."""


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


def max_file_bytes() -> int:
    """The size cap of input files [bytes]: :data:`MAX_FILE_BYTES`, or the value of the
    environment variable ``BRINEBOLT_MAX_FILE_BYTES`` when it holds a positive whole number."""
    text = os.environ.get(MAX_FILE_BYTES_ENV, "").strip()
    if text.isdigit() and int(text) > 0:
        return int(text)
    return MAX_FILE_BYTES


def _size_text(n: int) -> str:
    return f"{n / 1024**2:.3g} MiB" if n >= 1024**2 else f"{n} bytes"


def read_bytes_capped(path: str | Path, file: str | None = None) -> bytes:
    """The bytes of an input file, refusing what is not a regular file (a folder, a named pipe,
    a device such as /dev/zero) and anything larger than :func:`max_file_bytes`.

    At most the cap plus one byte is ever read, so a file that grows while it is read (or lies
    about its size) cannot exhaust memory. ``file`` is the name problems show (default the path).

    Raises
    ------
    InputError
        Naming the file, what is wrong and what is allowed.
    """
    path = Path(path)
    src = str(path) if file is None else file
    cap = max_file_bytes()

    def fail(message: str) -> InputError:
        return InputError([Problem(src, "", MISSING, message)])

    try:
        st = path.stat()
        if stat.S_ISDIR(st.st_mode):
            raise fail("is a folder, not a file; allowed: a TOML file")
        if not stat.S_ISREG(st.st_mode):
            what = (
                "a named pipe (FIFO)"
                if stat.S_ISFIFO(st.st_mode)
                else "a device"
                if stat.S_ISCHR(st.st_mode) or stat.S_ISBLK(st.st_mode)
                else "a socket"
                if stat.S_ISSOCK(st.st_mode)
                else "not a regular file"
            )
            raise fail(
                f"is {what}, which brinebolt does not read (it could block or never end); "
                "allowed: a regular TOML file on disk"
            )
        too_big = (
            f"too large for an input file; allowed: at most {_size_text(cap)} (set the "
            f"environment variable {MAX_FILE_BYTES_ENV} to a number of bytes to raise the cap)"
        )
        if st.st_size > cap:
            raise fail(f"is {_size_text(st.st_size)}, {too_big}")
        # O_NONBLOCK: should the path have been swapped for a pipe since stat(), open() and
        # read() return at once instead of waiting for a writer
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        with os.fdopen(fd, "rb") as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                raise fail("is not a regular file; allowed: a regular TOML file on disk")
            raw = fh.read(cap + 1)
    except InputError:
        raise
    except FileNotFoundError:
        raise fail("file not found") from None
    except PermissionError:
        raise fail("cannot read the file: permission denied") from None
    except (OSError, ValueError) as exc:
        raise fail(f"cannot read the file: {exc}") from None
    if len(raw) > cap:
        raise fail(f"is more than {_size_text(cap)}, {too_big}")
    return raw


def _deep_or_huge(data: Any) -> tuple[str, Any, str] | None:
    """The first key path whose value is nested too deeply or is an integer beyond 64 bits, with
    the value and the message; None when there is none. Iterative: no recursion limit."""
    stack: list[tuple[Any, str, int]] = [(data, "", 0)]
    while stack:
        node, key, depth = stack.pop()
        if depth > MAX_NESTING:
            return (
                key,
                MISSING,
                f"tables and arrays nested more than {MAX_NESTING} deep; allowed: the shallow "
                "tables of the file format",
            )
        if isinstance(node, dict):
            for k, v in node.items():
                stack.append((v, f"{key}.{k}" if key else str(k), depth + 1))
        elif isinstance(node, list):
            for i, v in enumerate(node):
                stack.append((v, f"{key}[{i}]", depth + 1))
        elif isinstance(node, int) and not isinstance(node, bool):
            if not _INT64[0] <= node <= _INT64[1]:
                digits = len(str(abs(node)))
                return (
                    key,
                    f"<a {digits}-digit integer>",
                    "integer too large; allowed: a whole number between -2^63 and 2^63-1 "
                    "(TOML integers are 64-bit)",
                )
    return None


def read_toml(path: str | Path, file: str | None = None) -> tuple[dict, str]:
    """Read an input file as TOML: the parsed data and the text.

    Refuses non-regular files and files above :func:`max_file_bytes`, accepts a UTF-8
    byte-order mark, and turns every way the text can be bad (not UTF-8, not TOML, nested too
    deeply, integers beyond 64 bits) into an :class:`InputError` naming the file and the place.
    ``file`` is the name problems show (default the path).
    """
    path = Path(path)
    src = str(path) if file is None else file

    def fail(message: str, key: str = "", value: Any = MISSING) -> InputError:
        return InputError([Problem(src, key, value, message)])

    raw = read_bytes_capped(path, src)
    if raw.startswith(b"\xef\xbb\xbf"):
        raw = raw[3:]  # a UTF-8 byte-order mark (some Windows editors write one)
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
    except RecursionError:
        raise fail(
            "not valid TOML for brinebolt: arrays or inline tables nested too deeply to read; "
            f"allowed: at most {MAX_NESTING} levels"
        ) from None
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
    bad = _deep_or_huge(data)
    if bad is not None:
        raise fail(bad[2], bad[0], bad[1])
    return data, text


_read_toml = read_toml


def kind_of(data: Any) -> str | None:
    """The kind of input file (a key of :data:`FILE_KINDS`) parsed TOML data looks like, told
    apart by its top-level keys; None when it carries the marks of none."""
    if not isinstance(data, dict):
        return None
    best, score = None, 0
    for kind, marks in FILE_KINDS.items():
        n = sum(1 for m in marks if m in data)
        if n > score:
            best, score = kind, n
    return best


def file_kind(path: str | Path) -> str | None:
    """The kind of an input file: ``"vessel"``, ``"scenario"``, ``"variants"`` (the keys of
    :data:`FILE_KINDS`) or None when its top-level tables mark none of them.

    Raises
    ------
    InputError
        When the file cannot be read as TOML (see :func:`read_toml`).
    """
    return kind_of(read_toml(path)[0])


def _wrong_kind(kind: str | None, want: str) -> str:
    """Why a file of ``kind`` is not the ``want`` kind of file (no word of its contents)."""
    if kind is None:
        return f"is not a {want} file (it has none of the tables of one)"
    return f"is a {kind} file, not a {want} file"


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
        kind = err["type"]
        if kind == "bb_value" and (err.get("ctx") or {}).get("key"):
            loc = (*loc, *err["ctx"]["key"].split("."))  # a check across keys names its key
        key, value = _key_path(loc, data)
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


def _read_named(path: Path, by: tuple[str, str, Any], want: str) -> tuple[dict, str]:
    """Read a file that another file names (``by`` = that file, its key and the value there).

    Problems reading it say which file and key point at it; a readable file of another kind is
    refused at the pointing key, naming the path only: its contents are never shown (the path
    may lead to any file on the disk, e.g. one holding a password)."""
    src, key, value = by
    try:
        data, text = read_toml(path)
    except InputError as exc:
        raise InputError(
            [
                Problem(p.file, p.key, p.value, f"{p.message} (this file is named by {src}: {key})")
                for p in exc.problems
            ]
        ) from None
    kind = kind_of(data)
    if kind != want:
        raise InputError(
            [
                Problem(
                    src,
                    key,
                    value,
                    f"{path} {_wrong_kind(kind, want)}; allowed: the path of a {want} file",
                )
            ]
        )
    return data, text


def _load_vessel_data(
    path: Path, chain: tuple[Path, ...] = (), by: tuple[str, str, Any] | None = None
) -> tuple[dict, str]:
    """Read a vessel file, following ``extends = "other.toml"`` (deep merge, arrays replaced).

    ``chain`` holds the resolved paths of the files that extend this one; ``by`` names the file
    and key that point at this one (a scenario's ``scenario.vessel`` or a vessel's ``extends``),
    if any."""
    chain = (*chain, path.resolve())
    if by is None:
        data, text = read_toml(path)
        kind = kind_of(data)
        if kind not in ("vessel", None):
            raise InputError(
                [
                    Problem(
                        str(path),
                        "",
                        MISSING,
                        f"{_wrong_kind(kind, 'vessel')}; a vessel file is needed here (one with "
                        f"[vessel], [hull], [[thruster]], [battery] and [drive]); {path.name} is "
                        f"for: {KIND_USE[kind]}",
                    )
                ]
            )
    else:
        data, text = _read_named(path, by, "vessel")
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
    base_data, base_text = _load_vessel_data(base_path, chain, (str(path), "extends", base_name))
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


def load_vessel(
    path: str | Path, overrides: dict | None = None, *, named_by: tuple[str, str, Any] | None = None
) -> LoadedVessel:
    """Read and validate a vessel file (following ``extends``); raise InputError listing all
    problems.

    ``named_by`` = (file, key, value) of the file that names this one (a scenario's
    ``scenario.vessel``): a missing, unreadable or wrong-kind file is then reported there."""
    path = Path(path)
    data, text = _load_vessel_data(path, by=named_by)
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
    data, text = read_toml(path)
    kind = kind_of(data)
    if kind == "vessel":
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    MISSING,
                    "is a vessel file; this command takes a scenario file that names it with "
                    f'[scenario] vessel = "{path.name}"',
                )
            ]
        )
    if kind not in ("scenario", None):
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    MISSING,
                    f"{_wrong_kind(kind, 'scenario')}; {KIND_USE[kind]}",
                )
            ]
        )
    problems: list[Problem] = []
    spec = None
    try:
        spec = ScenarioFile.model_validate(data)
    except ValidationError as exc:
        problems.extend(_problems_from(exc, ScenarioFile, data, str(path)))
    problems.extend(raw_scenario_problems(data, str(path)))
    vessel = None
    vfile = vessel_path
    named_by = None
    if vfile is None:
        info = data.get("scenario")
        name = info.get("vessel") if isinstance(info, dict) else None
        if isinstance(name, str) and name:
            vfile = path.parent / name
            named_by = (str(path), "scenario.vessel", name)
            if not _exists(Path(vfile)):
                problems.append(
                    Problem(
                        str(path), "scenario.vessel", name, f"file not found (looked for {vfile})"
                    )
                )
                vfile = None
    if vfile is not None:
        try:
            vessel = load_vessel(vfile, vessel_overrides, named_by=named_by)
        except InputError as exc:
            problems.extend(exc.problems)
    if spec is not None and not problems:
        problems.extend(scenario_problems(spec, vessel.spec if vessel else None, data, str(path)))
    if spec is not None:
        problems.extend(budget.scenario_problems(spec, data, str(path)))
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
        water=water(spec.water, spec.route, spec.tide),
        warnings=problems + scenario_warnings(spec, vessel.spec, str(path), data),
    )


def _check_scenario(path: Path) -> list[Problem]:
    loaded = load_scenario(path)
    return (
        loaded.warnings
        + loaded.vessel.warnings
        + feasibility_problems(loaded.spec, loaded.vessel.spec, str(path), read_toml(path)[0])
    )


def _check_vessel(path: Path) -> list[Problem]:
    return load_vessel(path).warnings


def load_study_file(path: str | Path) -> tuple[StudyFile, Path, Path | None]:
    """Read and validate a study file (:mod:`sim.io.study_schema`): the validated file, the
    path of its scenario and of its vessel (None: the scenario's). Raises InputError listing
    every problem, the files it names included."""
    path = Path(path)
    data, _text = read_toml(path)
    kind = kind_of(data)
    if kind != "study":
        raise InputError([Problem(str(path), "", MISSING, f"{_wrong_kind(kind, 'study')}")])
    try:
        spec = StudyFile.model_validate(data)
    except ValidationError as exc:
        raise InputError(_problems_from(exc, StudyFile, data, str(path))) from None
    problems = []
    scenario = path.parent / spec.study.scenario
    vessel = None if spec.study.vessel is None else path.parent / spec.study.vessel
    for key, value, p in (
        ("study.scenario", spec.study.scenario, scenario),
        ("study.vessel", spec.study.vessel, vessel),
    ):
        if p is not None and not _exists(p):
            problems.append(Problem(str(path), key, value, f"file not found (looked for {p})"))
    if problems:
        raise InputError(problems)
    return spec, scenario, vessel


def _check_study(path: Path) -> list[Problem]:
    _spec, scenario, vessel = load_study_file(path)
    loaded = load_scenario(scenario, vessel_path=vessel)
    return loaded.warnings + loaded.vessel.warnings


CHECKERS: dict[str, Callable[[Path], list[Problem]]] = {
    "vessel": _check_vessel,
    "scenario": _check_scenario,
    "study": _check_study,
}
"""How :func:`check_file` checks each kind of file it knows by itself: a function of the path
that returns the warnings and raises InputError on errors. Kinds that live in higher layers
(variants files, :mod:`sim.analysis.variants`) are checked by functions the caller passes."""


def check_file(
    path: str | Path, checkers: dict[str, Callable[[Path], list[Problem]]] | None = None
) -> tuple[str, list[Problem]]:
    """Validate an input file as the kind it is (:func:`file_kind`: vessel, scenario, ...).

    A scenario is also flown in steady state leg by leg (:mod:`sim.io.feasibility`): legs whose
    held speed, power or current the vessel cannot reach come back as warnings.

    Parameters
    ----------
    path : path
        The file.
    checkers : dict, optional
        Checkers of further kinds (kind -> function of the path returning the warnings), added
        to :data:`CHECKERS`; the command line passes the variants-file checker.

    Returns
    -------
    tuple
        The kind and the warnings (a scenario's include those of its vessel).

    Raises
    ------
    InputError
        On errors, and for a file of no known kind or of a kind without a checker.
    """
    path = Path(path)
    data, _ = read_toml(path)
    kind = kind_of(data)
    table = {**CHECKERS, **(checkers or {})}
    if kind is None:
        names = ", ".join(f"a {k} file" for k in FILE_KINDS)
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    MISSING,
                    "neither a vessel file (with [vessel]) nor a scenario file (with [scenario]) "
                    f"nor any other kind brinebolt reads; allowed: {names}",
                )
            ]
        )
    if kind not in table:
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    MISSING,
                    f"is a {kind} file, which this function cannot check by itself; "
                    f"{KIND_USE.get(kind, '')}, or check it with `brinebolt check`",
                )
            ]
        )
    return kind, table[kind](path)
