"""Reference of every key of the vessel, scenario and variants files, generated from the schema.

The vessel and scenario keys come from the pydantic models of :mod:`sim.io.schema`, walked from
:class:`~sim.io.schema.VesselFile` and :class:`~sim.io.schema.ScenarioFile` through nested
tables, arrays of tables and the hull models: each key's unit, allowed range and accepted names
are read from the validator that checks it, its default from the model, and its meaning from its
description (``Field(description=...)`` or the docstring under the field). A paragraph of that
text starting with ``Default:`` fills the default column (it says what happens when an optional
key is left out). The variants file is read by hand in :mod:`sim.analysis.variants`, so its few
keys are a small table here (:data:`VARIANTS_KEYS`), as are the columns of the ``brinebolt
steady`` table (:data:`STEADY_COLUMNS`); tests compare both with the code.

Regenerate the reference after changing a key::

    python3 -m sim.io.keyref > docs/FILE_KEYS.md
"""

from __future__ import annotations

import ast
import inspect
import math
import re
import sys
import types
import typing
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, Literal, get_args, get_origin

from pydantic import AfterValidator, BaseModel, BeforeValidator
from pydantic_core import PydanticUndefined

from sim.io import schema
from sim.io.files import MAX_BASE_DEPTH
from sim.io.units import KINDS

__all__ = [
    "REGENERATE_COMMAND",
    "STEADY_COLUMNS",
    "VARIANTS_KEYS",
    "KeyInfo",
    "Section",
    "field_description",
    "file_sections",
    "optional_keys_without_default_text",
    "render_markdown",
    "undocumented_keys",
]

REGENERATE_COMMAND = "python3 -m sim.io.keyref > docs/FILE_KEYS.md"
"""The command that writes the committed reference."""

_UNIT_SYMBOLS = {"m**2": "m²", "m**3": "m³", "degC": "°C", "ohm": "Ω", "m**3/s": "m³/s"}
_UNIT_SYMBOLS["A*h"] = "A·h"


@dataclass(frozen=True)
class KeyInfo:
    """One key of a file.

    Attributes
    ----------
    path : dotted key path; ``[]`` marks an array of tables (``thruster[].gap``)
    unit : SI unit the value is converted to, or what kind of value it is (number, text...)
    default : value used when the key is left out ("required" when it must be given)
    allowed : what validation accepts
    meaning : what the key does
    """

    path: str
    unit: str
    default: str
    allowed: str
    meaning: str


@dataclass(frozen=True)
class Section:
    """The keys of one table of a file."""

    heading: str
    intro: str
    keys: tuple[KeyInfo, ...]


# ------------------------------------------------------------------ descriptions


@lru_cache(maxsize=8)
def _docstrings(module_name: str) -> dict[str, tuple[str, dict[str, str]]]:
    """Class name -> (class docstring, {field: docstring under the field}) of a module."""
    try:
        tree = ast.parse(inspect.getsource(sys.modules[module_name]))
    except (KeyError, OSError, TypeError):  # no source to read
        return {}
    out: dict[str, tuple[str, dict[str, str]]] = {}
    for node in tree.body:
        if not isinstance(node, ast.ClassDef):
            continue
        fields: dict[str, str] = {}
        for stmt, nxt in zip(node.body, node.body[1:], strict=False):
            if (
                isinstance(stmt, ast.AnnAssign)
                and isinstance(stmt.target, ast.Name)
                and isinstance(nxt, ast.Expr)
                and isinstance(nxt.value, ast.Constant)
                and isinstance(nxt.value.value, str)
            ):
                fields[stmt.target.id] = inspect.cleandoc(nxt.value.value)
        out[node.name] = (ast.get_docstring(node) or "", fields)
    return out


def field_description(model: type[BaseModel], name: str) -> str:
    """The description of a field: ``Field(description=...)`` or the docstring under it ("" when
    there is none)."""
    info = model.model_fields[name]
    if info.description:
        return inspect.cleandoc(info.description)
    for cls in model.__mro__:
        if cls is BaseModel:
            break
        docs = _docstrings(cls.__module__).get(cls.__name__)
        if docs and name in docs[1]:
            return docs[1][name]
    return ""


def _model_description(model: type[BaseModel]) -> str:
    """The class docstring on one line, without a leading table name such as '[vessel]: '."""
    docs = _docstrings(model.__module__).get(model.__name__)
    text = re.sub(r"^\[\[?[\w.]+\]\]?:\s*", "", _one_line(docs[0])) if docs else ""
    return text[:1].upper() + text[1:]


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _split_default(doc: str) -> tuple[str, str | None]:
    """(meaning, text of the 'Default:' paragraph or None)."""
    meaning, default = [], None
    for para in re.split(r"\n\s*\n", doc.strip()):
        line = _one_line(para)
        if line.startswith("Default:"):
            default = line.removeprefix("Default:").strip().rstrip(".")
        elif line:
            meaning.append(line)
    return " ".join(meaning), default


# ------------------------------------------------------------------ what a field accepts


@dataclass
class _Shape:
    """What a field accepts, as read from its annotation and validators."""

    unit: str = ""
    allowed: list[str] = field(default_factory=list)
    kind: str | None = None
    models: tuple[type[BaseModel], ...] = ()
    array: bool = False
    discriminator: str | None = None


def _closure(fn, where: str, *names: str) -> dict[str, Any]:
    """The variables ``names`` that a validator made by a factory of sim.io.schema closes over
    (its unit kind, range, choices...)."""
    cells = fn.__closure__ or ()
    found = {n: c.cell_contents for n, c in zip(fn.__code__.co_freevars, cells, strict=True)}
    missing = [n for n in names if n not in found]
    if missing:
        raise TypeError(
            f"sim.io.keyref cannot read {', '.join(missing)} from the validator "
            f"{fn.__qualname__} of key {where!r}; update _apply_validator to the new schema"
        )
    return found


def _num(x: float) -> str:
    return f"{x:g}"


def _range_text(unit: str, gt=None, ge=None, lt=None, le=None) -> str:
    u = f" {unit}" if unit else ""
    if ge is not None and le is not None and gt is None and lt is None:
        return f"{_num(ge)} to {_num(le)}{u}"
    parts = []
    for sign, x in (("> ", gt), ("≥ ", ge), ("< ", lt), ("≤ ", le)):
        if x is not None:
            parts.append(f"{sign}{_num(x)}")
    return (", ".join(parts) + u) if parts else ""


def _si_unit(kind: str) -> str:
    unit = KINDS[kind].si_unit
    return _UNIT_SYMBOLS.get(unit, unit)


def _apply_validator(shape: _Shape, fn, where: str) -> None:
    qual = getattr(fn, "__qualname__", "")
    if qual == "quantity.<locals>.parse":
        c = _closure(fn, where, "kind", "gt", "ge", "lt", "le")
        shape.kind = c["kind"]
        shape.unit = _si_unit(c["kind"])
        rng = _range_text(shape.unit, c["gt"], c["ge"], c["lt"], c["le"])
        shape.allowed.append(rng or "any")
    elif qual == "number.<locals>.parse":
        c = _closure(fn, where, "integer", "gt", "ge", "lt", "le")
        shape.unit = "whole number" if c["integer"] else "number"
        rng = _range_text("", c["gt"], c["ge"], c["lt"], c["le"])
        shape.allowed.append(rng or "any number")
    elif qual == "known_name.<locals>.check":
        c = _closure(fn, where, "names", "upper", "what")
        shape.unit = "text"
        names = ", ".join(f"`{n}`" for n in sorted(c["names"]()))
        case = " (case ignored)" if c["upper"] else ""
        article = "an" if c["what"][:1] in "aeiou" else "a"
        shape.allowed.append(f"{article} {c['what']}{case}: {names}")
    elif fn is schema._added_mass:
        shape.kind = "mass"
        shape.unit = "kg, or number"
        shape.allowed.append('`"auto"`, a mass ≥ 0 kg, or a plain fraction of mass from 0 to 2')
    else:
        raise TypeError(
            f"sim.io.keyref cannot describe the validator {qual or fn!r} of key {where!r}; "
            "teach _apply_validator about it"
        )


def _apply_metadata(shape: _Shape, metadata, where: str, *, text: bool) -> None:
    for m in metadata:
        if isinstance(m, BeforeValidator | AfterValidator):
            _apply_validator(shape, m.func, where)
        elif getattr(m, "min_length", None) is not None:
            n = m.min_length
            if shape.array:
                shape.allowed.append(f"at least {n} {'entry' if n == 1 else 'entries'}")
            elif text:
                shape.allowed.append("non-empty text")
        elif getattr(m, "discriminator", None) is not None:
            shape.discriminator = m.discriminator


def _shape(annotation, metadata, where: str) -> _Shape:
    metadata = list(metadata)
    while get_origin(annotation) is typing.Annotated:
        annotation, *extra = get_args(annotation)
        metadata.extend(extra)
    origin = get_origin(annotation)
    if origin in (typing.Union, types.UnionType):
        members = [a for a in get_args(annotation) if a is not type(None)]
        if len(members) == 1:
            return _shape(members[0], metadata, where)
        shape = _Shape(unit="table", models=tuple(members))
        _apply_metadata(shape, metadata, where, text=False)
        return shape
    if origin is list:
        inner = _shape(get_args(annotation)[0], [], where)
        if inner.models:
            shape = _Shape(unit="array of tables", models=inner.models, array=True)
        else:
            shape = _Shape(unit=f"list of {inner.unit}", kind=inner.kind, array=True)
            shape.allowed = [f"each {a}" for a in inner.allowed]
        _apply_metadata(shape, metadata, where, text=False)
        return shape
    if origin is Literal:
        choices = ", ".join(f'`"{v}"`' for v in get_args(annotation))
        shape = _Shape(unit="text", allowed=[f"one of {choices}"])
        _apply_metadata(shape, metadata, where, text=True)
        return shape
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return _Shape(unit="table", models=(annotation,))
    if annotation is bool:
        return _Shape(unit="boolean", allowed=["`true` or `false`"])
    shape = _Shape(unit="text" if annotation is str else "")
    _apply_metadata(shape, metadata, where, text=annotation is str)
    if not shape.unit:
        raise TypeError(f"sim.io.keyref cannot describe the type {annotation!r} of {where!r}")
    return shape


def _quantity_text(x: float, kind: str) -> str:
    unit = _si_unit(kind)
    text = f"{_num(x)} {unit}"
    if kind == "time" and x >= 60:
        for size, name in ((3600.0, "h"), (60.0, "min")):
            if x >= size and math.isclose(x / size, round(x / size)):
                return f"{text} ({round(x / size)} {name})"
    if kind == "length" and 0 < x < 1e-3:
        return f"{text} ({_num(x * 1e6)} µm)"
    if kind == "heat_capacity" and x >= 1000:
        return f"{text} ({_num(x / 1000)} kJ/K)"
    return text


def _default_text(info, shape: _Shape, doc_default: str | None) -> str:
    if info.is_required():
        return "required"
    value = info.get_default(call_default_factory=True)
    if value is PydanticUndefined or value is None:
        return doc_default or "not set"
    if isinstance(value, BaseModel):
        text = "all keys default"
    elif isinstance(value, list | tuple) and not value:
        text = "none"
    elif isinstance(value, tuple) and value and isinstance(value[0], str):  # added_mass
        text = f'`"{value[0]}"`'
    elif isinstance(value, str):
        text = f'`"{value}"`'
    elif isinstance(value, bool):
        text = str(value).lower()
    elif isinstance(value, int | float) and shape.kind:
        text = _quantity_text(float(value), shape.kind)
    elif isinstance(value, int | float):
        text = _num(value)
    else:
        text = str(value)
    return f"{text}; {doc_default}" if doc_default else text


# ------------------------------------------------------------------ walking the models

_Extra = dict[str, tuple[KeyInfo, ...]]


def _discriminator_value(model: type[BaseModel], key: str) -> str:
    args = get_args(model.model_fields[key].annotation)
    return str(args[0]) if args else "?"


def _walk(
    model: type[BaseModel],
    prefix: str,
    heading: str,
    out: list[Section],
    kinds: set[str],
    extra: _Extra,
) -> None:
    rows: list[KeyInfo] = []
    later: list[tuple[type[BaseModel], str, str]] = []
    for name, info in model.model_fields.items():
        path = prefix + name
        shape = _shape(info.annotation, info.metadata, path)
        if info.discriminator and not shape.discriminator:
            shape.discriminator = info.discriminator
        meaning, doc_default = _split_default(field_description(model, name))
        if shape.kind:
            kinds.add(shape.kind)
        allowed = "; ".join(a for a in shape.allowed if a)
        unit = shape.unit
        if shape.models:
            top = not prefix
            if shape.array:
                sub_prefix = f"{path}[]."
                sub_heading = f"`[[{path}]]`" if top else f"`{path}[]` (array of tables)"
            else:
                sub_prefix = f"{path}."
                sub_heading = f"`[{path}]`" if top else f"`{path}` (inline table)"
            if not top and not shape.array:
                unit = "inline table"
            if shape.discriminator:
                key = shape.discriminator
                tags = [_discriminator_value(m, key) for m in shape.models]
                allowed = f"`{key}` = " + ", ".join(f'`"{t}"`' for t in tags)
                for m, tag in zip(shape.models, tags, strict=True):
                    later.append((m, sub_prefix, f'{sub_heading} with `{key} = "{tag}"`'))
            else:
                later.extend((m, sub_prefix, sub_heading) for m in shape.models)
        if shape.models and not allowed:
            allowed = "the keys of its section" if not shape.array else "any number of entries"
        rows.append(
            KeyInfo(
                path=path,
                unit=unit,
                default=_default_text(info, shape, doc_default),
                allowed=allowed or "any text",
                meaning=meaning,
            )
        )
    rows.extend(extra.get(model.__name__, ()))
    out.append(Section(heading, _model_description(model), tuple(rows)))
    for m, sub_prefix, sub_heading in later:
        _walk(m, sub_prefix, sub_heading, out, kinds, extra)


def _vessel_extra() -> _Extra:
    extends = KeyInfo(
        path="extends",
        unit="text (path)",
        default="not set",
        allowed=f"an existing vessel file; at most {MAX_BASE_DEPTH} nested `extends`, no cycles",
        meaning="Path of a base vessel file, relative to this file, whose keys this file starts "
        "from: tables are merged key by key (this file wins); arrays of tables such as "
        "[[thruster]] and lists are replaced whole. Read by the file loader, before validation.",
    )
    return {"VesselFile": (extends,)}


def file_sections(model: type[BaseModel], title: str) -> tuple[list[Section], set[str]]:
    """The sections of one file format (its top level first) and the quantity kinds it uses."""
    out: list[Section] = []
    kinds: set[str] = set()
    extra = _vessel_extra() if model is schema.VesselFile else {}
    _walk(model, "", title, out, kinds, extra)
    return out, kinds


def _all_fields() -> list[tuple[str, type[BaseModel], str]]:
    """(dotted path, model, field name) of every field of both file formats."""
    out = []

    def walk(model: type[BaseModel], prefix: str) -> None:
        for name, info in model.model_fields.items():
            path = prefix + name
            out.append((path, model, name))
            shape = _shape(info.annotation, info.metadata, path)
            for m in shape.models:
                walk(m, f"{path}[]." if shape.array else f"{path}.")

    walk(schema.VesselFile, "")
    walk(schema.ScenarioFile, "")
    return out


def undocumented_keys() -> list[str]:
    """Dotted paths of the vessel and scenario keys without a description (should be none)."""
    return [p for p, m, n in _all_fields() if not _split_default(field_description(m, n))[0]]


def optional_keys_without_default_text() -> list[str]:
    """Keys that may be left out (default None) but do not say what happens then in a
    'Default:' paragraph (should be none)."""
    out = []
    for path, model, name in _all_fields():
        info = model.model_fields[name]
        if not info.is_required() and info.get_default(call_default_factory=True) is None:
            if _split_default(field_description(model, name))[1] is None:
                out.append(path)
    return out


# ------------------------------------------------------------------ the hand-read formats

VARIANTS_KEYS: tuple[KeyInfo, ...] = (
    KeyInfo(
        "title",
        "text",
        "the scenario's name",
        "any text",
        "Title of the comparison, shown above the ranked table and on the figures.",
    ),
    KeyInfo(
        "scenario",
        "text (path)",
        "required by `brinebolt versus`",
        "an existing scenario file",
        "The scenario every variant flies, relative to this file.",
    ),
    KeyInfo(
        "variant",
        "array of tables",
        "required",
        "at least 1 entry",
        "One [[variant]] per vessel variant. Every variant is loaded and validated before any "
        "flies, and all problems are reported together.",
    ),
    KeyInfo(
        "variant[].label",
        "text",
        "required",
        "non-empty text, unique in the file",
        "Name of the variant in tables and legends; with `--logs` also the stem of its written "
        "vessel file and log.",
    ),
    KeyInfo(
        "variant[].vessel",
        "text (path)",
        "the scenario's vessel",
        "an existing vessel file",
        "Vessel file of this variant, relative to this file (its `extends` are followed).",
    ),
    KeyInfo(
        "variant[].set",
        "table",
        "none",
        '`"dotted.key" = value` entries',
        "Settings applied to the vessel data before validation, in order. Each key is a dotted "
        "path into the vessel file (the keys of the vessel file above without `[]`): an array "
        'of tables is indexed by position or by the entry\'s name ("thruster.0.gap", '
        '"thruster.pylon.gap"); each value is written as in the vessel file ("80 mm"). Nested '
        'tables work too: set = { thruster = { pylon = { gap = "80 mm" } } }. The command '
        "line's `--set KEY=V1,V2,...` takes the same keys.",
    ),
)
"""The keys of a variants file, as :func:`sim.analysis.variants.read_variants_file` reads them."""

STEADY_COLUMNS: tuple[tuple[str, str], ...] = (
    ("speed kn", "Speed through water [kn]."),
    ("speed m/s", "Speed through water [m/s]."),
    ("thrust N", "Total thrust of all units (equal to the resistance at a steady point)."),
    (
        "volts V",
        "Electrode voltage of each unit, not a sum (the mean over the designs when there are "
        "several).",
    ),
    ("current A", "Total thruster current, the sum over all units (what a `current` leg holds)."),
    (
        "thruster kW",
        "Total electrical power into all thruster units (what a `power` leg holds).",
    ),
    (
        "pack kW",
        "Power at the pack terminals: thruster power ÷ drive.efficiency + hotel.power + "
        "hotel.cryocooler.",
    ),
    ("η elec", "Electrical efficiency: flow work ÷ thruster electrical power."),
    ("η prop", "Propulsive (Froude) efficiency: thrust × speed ÷ flow work."),
    ("η overall", "Overall efficiency: thrust × speed ÷ thruster electrical power."),
    ("duct ΔT K", "Largest duct outlet-minus-inlet water temperature rise of the designs."),
    ("H₂ L/h", "Hydrogen from all units, litres per hour as an ideal gas at 25 °C and 1 atm."),
    ("Cl₂ g/h", "Chlorine from all units, grams per hour."),
    ("note", '"pack short" when the pack cannot deliver the power at full charge.'),
)
"""The columns of the ``brinebolt steady`` table: per unit or total (whole vessel)."""


# ------------------------------------------------------------------ Markdown

_INTRO = """\
How to read the tables:

- **Key**: the dotted key path. `[]` marks an array of tables: `thruster[].gap` is the `gap` of
  each `[[thruster]]`. Error messages number the entries (`thruster[0].gap`); variant settings
  use `thruster.0.gap` or `thruster.NAME.gap`.
- **Unit**: the SI unit the value is converted to. Write every dimensional value as text with
  its unit (`"3 kn"`, `"50 mm"`, `"14 degC"`); any unit of the same kind is accepted (see
  *Units* below) and a bare `0` needs no unit (except a temperature). *number* keys take a plain
  number without a unit.
- **Default**: what is used when the key is left out; *required* keys must be given.
- **Allowed**: what validation accepts, in the SI unit. `brinebolt check FILE` lists every
  problem of a file, including the checks that need several keys (named in the meanings).
- **Meaning**: what the key does. *Per unit* means one thruster unit; *total* means summed
  over all units of all thruster designs."""


def _cell(text: str) -> str:
    return _one_line(text).replace("|", "\\|")


def _table(rows: list[tuple[str, ...]], header: tuple[str, ...]) -> list[str]:
    lines = ["| " + " | ".join(header) + " |", "|" + "|".join("---" for _ in header) + "|"]
    lines += ["| " + " | ".join(_cell(c) for c in r) + " |" for r in rows]
    return lines


def _section_lines(sec: Section, level: str) -> list[str]:
    lines = [f"{level} {sec.heading}", ""]
    if sec.intro:
        lines += [sec.intro, ""]
    header = ("Key", "Unit", "Default", "Allowed", "Meaning")
    rows = [(f"`{k.path}`", k.unit, k.default, k.allowed, k.meaning) for k in sec.keys]
    return [*lines, *_table(rows, header), ""]


def render_markdown() -> str:
    """The whole reference as Markdown (the text of docs/FILE_KEYS.md)."""
    vessel, kinds_v = file_sections(schema.VesselFile, "Top level")
    scenario, kinds_s = file_sections(schema.ScenarioFile, "Top level")
    kinds = kinds_v | kinds_s
    lines = [
        "# Keys of the vessel, scenario and variants files",
        "",
        f"<!-- Generated from sim/io/schema.py by `{REGENERATE_COMMAND}`; do not edit by hand. -->",
        "",
        _INTRO,
        "",
        "## Units",
        "",
        "Each dimensional key expects one kind of quantity; it is stored in the SI unit shown "
        "(temperatures in °C).",
        "",
    ]
    unit_rows = [
        (k.name.replace("_", " "), _si_unit(k.name), k.examples)
        for k in KINDS.values()
        if k.name in kinds
    ]
    lines += [*_table(unit_rows, ("Kind", "Stored in", "Written, e.g.")), ""]
    for title, sections in (("Vessel file", vessel), ("Scenario file", scenario)):
        lines += [f"## {title}", ""]
        for sec in sections:
            lines += _section_lines(sec, "###")
    lines += [
        "## Variants file",
        "",
        "Read by `brinebolt versus FILE`: one scenario flown with several vessel variants. Name "
        "it `variants-*.toml` when it sits among the scenarios.",
        "",
    ]
    lines += _section_lines(Section("Top level", "", VARIANTS_KEYS), "###")
    lines += [
        "## Per unit or total: the columns of `brinebolt steady`",
        "",
        "The steady operating-point table of a vessel (thrust = resistance) sums over all "
        "thruster units unless a column says otherwise.",
        "",
        *_table(list(STEADY_COLUMNS), ("Column", "Meaning")),
    ]
    return "\n".join(lines).rstrip("\n") + "\n"


def main() -> None:
    """Write the reference to standard output (UTF-8)."""
    sys.stdout.buffer.write(render_markdown().encode("utf-8"))
    sys.stdout.flush()


if __name__ == "__main__":
    main()
