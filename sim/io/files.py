"""Read vessel and scenario files, validate them and report every problem at once.

A problem names the file, the key path, the value found and what is allowed. Nothing here prints:
the CLI formats :class:`InputError` for people; notebooks can inspect ``.problems``.
"""

from __future__ import annotations

import difflib
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from sim.io.schema import ScenarioFile, VesselFile

__all__ = [
    "InputError",
    "LoadedScenario",
    "LoadedVessel",
    "Problem",
    "load_scenario",
    "load_vessel",
]

MAX_BASE_DEPTH = 8


@dataclass(frozen=True)
class Problem:
    """One thing wrong in an input file."""

    file: str
    key: str
    value: Any
    message: str
    severity: str = "error"  # or "warning"

    def __str__(self) -> str:
        where = f"{self.file}: {self.key}" if self.key else self.file
        shown = "" if self.value is _MISSING else f" = {_show(self.value)}"
        return f"{where}{shown}: {self.message}"


class _Missing:
    def __repr__(self) -> str:
        return "<missing>"


_MISSING = _Missing()


def _show(value: Any) -> str:
    text = repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


class InputError(Exception):
    """One or more problems in input files (a user error, not a bug)."""

    def __init__(self, problems: list[Problem]) -> None:
        self.problems = problems
        lines = [str(p) for p in problems]
        super().__init__(f"{len(problems)} problem(s) in the input:\n  " + "\n  ".join(lines))


@dataclass(frozen=True)
class LoadedVessel:
    path: Path
    text: str
    """The file's text (and that of every base file it extends, in order)."""
    spec: VesselFile
    warnings: list[Problem] = field(default_factory=list)


@dataclass(frozen=True)
class LoadedScenario:
    path: Path
    text: str
    spec: ScenarioFile
    vessel: LoadedVessel
    warnings: list[Problem] = field(default_factory=list)


# --------------------------------------------------------------------------- helpers


def _read_toml(path: Path) -> tuple[dict, str]:
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError([Problem(str(path), "", _MISSING, "file not found")]) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(
            [Problem(str(path), "", _MISSING, f"cannot read the file: {exc}")]
        ) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    _MISSING,
                    f"not valid TOML: {exc}; allowed: TOML syntax "
                    "(key = value, [table], [[array-of-tables]])",
                )
            ]
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
            node = node[item] if isinstance(node, list) and item < len(node) else _MISSING
            continue
        if isinstance(node, dict) and item in node:
            parts.append(("." if parts else "") + str(item))
            node = node[item]
        elif isinstance(node, dict) and node.get("model") == item:
            continue  # discriminator tag
        else:
            parts.append(("." if parts else "") + str(item))
            node = _MISSING
    return "".join(parts), node


def _fields_at(model: type[BaseModel], loc: tuple, data: Any) -> list[str]:
    """Field names of the model that holds the key at ``loc`` (for 'did you mean')."""
    from typing import get_args

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
    del get_args
    return []


def _model_in(annotation: Any, node: Any) -> type[BaseModel] | None:
    from typing import get_args

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


def _problems_from(exc: ValidationError, model: type[BaseModel], data: dict, file: str):
    problems = []
    for err in exc.errors():
        loc = tuple(err["loc"])
        key, value = _key_path(loc, data)
        kind = err["type"]
        if kind == "extra_forbidden":
            names = _fields_at(model, loc, data)
            close = difflib.get_close_matches(str(loc[-1]), names, n=1, cutoff=0.6)
            hint = f"; did you mean '{close[0]}'?" if close else ""
            msg = (
                f"unknown key{hint} allowed keys here: {', '.join(names)}"
                if names
                else "unknown key"
            )
            if hint:
                msg = f"unknown key{hint} (allowed keys here: {', '.join(names)})"
            problems.append(Problem(file, key, value, msg))
        elif kind == "missing":
            problems.append(Problem(file, key, _MISSING, "required key is missing"))
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
                    file, key + ".model", _MISSING, "required key is missing; it selects the model"
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
        elif kind == "too_short":
            problems.append(
                Problem(
                    file,
                    key,
                    value,
                    "is empty or too short; allowed: "
                    f"at least {err.get('ctx', {}).get('min_length', 1)} "
                    "entries",
                )
            )
        elif kind == "string_too_short":
            problems.append(Problem(file, key, value, "is empty; allowed: non-empty text"))
        else:
            problems.append(Problem(file, key, value, err["msg"]))
    return problems


def _merge(base: dict, over: dict) -> dict:
    out = dict(base)
    for k, v in over.items():
        if isinstance(v, dict) and isinstance(out.get(k), dict):
            out[k] = _merge(out[k], v)
        else:
            out[k] = v
    return out


def _load_vessel_data(path: Path, chain: tuple[Path, ...] = ()) -> tuple[dict, str]:
    """Read a vessel file, following ``extends = "other.toml"`` (deep merge, arrays replaced)."""
    resolved = path.resolve()
    if resolved in chain:
        cycle = " -> ".join(str(p) for p in (*chain, resolved))
        raise InputError(
            [
                Problem(
                    str(path),
                    "extends",
                    str(path),
                    f"circular vessel reference ({cycle}); allowed: a chain of "
                    "files that ends in a file without 'extends'",
                )
            ]
        )
    if len(chain) >= MAX_BASE_DEPTH:
        raise InputError(
            [
                Problem(
                    str(path), "extends", str(path), f"more than {MAX_BASE_DEPTH} nested 'extends'"
                )
            ]
        )
    data, text = _read_toml(path)
    base_name = data.pop("extends", None)
    if base_name is None:
        return data, text
    if not isinstance(base_name, str):
        raise InputError(
            [
                Problem(
                    str(path),
                    "extends",
                    base_name,
                    "wrong type; allowed: the path of a vessel file in quotes",
                )
            ]
        )
    base_path = path.parent / base_name
    if not base_path.exists():
        raise InputError(
            [Problem(str(path), "extends", base_name, f"file not found (looked for {base_path})")]
        )
    base_data, base_text = _load_vessel_data(base_path, (*chain, resolved))
    merged = _merge(base_data, data)
    return merged, base_text + f"\n# ---- {path.name} (extends {base_name}) ----\n" + text


def validate_vessel_data(data: dict, file: str) -> VesselFile:
    """Validate already-parsed vessel data (e.g. with command-line overrides applied)."""
    try:
        spec = VesselFile.model_validate(data)
    except ValidationError as exc:
        raise InputError(_problems_from(exc, VesselFile, data, file)) from None
    problems = _cross_check_vessel(spec, data, file)
    errors = [p for p in problems if p.severity == "error"]
    if errors:
        raise InputError(errors)
    return spec


def load_vessel(path: str | Path, overrides: dict | None = None) -> LoadedVessel:
    """Read and validate a vessel file (following ``extends``); raise InputError listing all
    problems."""
    path = Path(path)
    data, text = _load_vessel_data(path)
    if overrides:
        data = _merge(data, overrides)
    spec = validate_vessel_data(data, str(path))
    from sim.io.checks import vessel_warnings

    return LoadedVessel(path=path, text=text, spec=spec, warnings=vessel_warnings(spec, str(path)))


def _cross_check_vessel(spec: VesselFile, data: dict, file: str) -> list[Problem]:
    from sim.io.checks import vessel_problems

    return vessel_problems(spec, data, file)


def load_scenario(
    path: str | Path, vessel_overrides: dict | None = None, vessel_path: str | Path | None = None
) -> LoadedScenario:
    """Read and validate a scenario file and the vessel file it names.

    ``vessel_path`` replaces the vessel the scenario names (for comparing variants);
    ``vessel_overrides`` is deep-merged into the vessel data before validation.
    """
    path = Path(path)
    data, text = _read_toml(path)
    problems: list[Problem] = []
    spec = None
    try:
        spec = ScenarioFile.model_validate(data)
    except ValidationError as exc:
        problems.extend(_problems_from(exc, ScenarioFile, data, str(path)))
    vessel = None
    vfile = vessel_path
    if vfile is None:
        name = (
            (data.get("scenario") or {}).get("vessel")
            if isinstance(data.get("scenario"), dict)
            else None
        )
        if isinstance(name, str) and name:
            vfile = path.parent / name
            if not Path(vfile).exists():
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
    if spec is not None and vessel is not None:
        from sim.io.checks import scenario_problems

        problems.extend(scenario_problems(spec, vessel.spec, data, str(path)))
    errors = [p for p in problems if p.severity == "error"]
    if errors:
        raise InputError(errors)
    assert spec is not None and vessel is not None
    from sim.io.checks import scenario_warnings

    return LoadedScenario(
        path=path,
        text=text,
        spec=spec,
        vessel=vessel,
        warnings=scenario_warnings(spec, vessel.spec, str(path)),
    )


def check_file(path: str | Path) -> tuple[str, list[Problem]]:
    """Validate a vessel or a scenario file (told apart by its top-level tables).

    Returns the kind ('vessel' or 'scenario') and the warnings; raises InputError on errors.
    """
    path = Path(path)
    data, _ = _read_toml(path)
    if "scenario" in data or "leg" in data:
        return "scenario", load_scenario(path).warnings + load_scenario(path).vessel.warnings
    if "vessel" in data or "hull" in data or "extends" in data:
        return "vessel", load_vessel(path).warnings
    raise InputError(
        [
            Problem(
                str(path),
                "",
                _MISSING,
                "neither a vessel file (with [vessel]) nor a scenario file (with "
                "[scenario]); allowed: one of the two",
            )
        ]
    )
