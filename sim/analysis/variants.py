"""Fly one scenario with several vessel variants, in parallel, and rank them.

A variant is a vessel file plus settings applied to its data before validation, each a dotted
key and a value in the vessel file's own notation::

    thruster.0.gap = "80 mm"        # first [[thruster]] by position
    thruster.pylon.field = "1.2 T"  # or by its name
    battery.parallel = 4

Variants come from the command line (``--vessel FILE`` and ``--set KEY=V1,V2,...``; several
``--set`` make a grid) or from a variants file of our own format::

    title = "Glasswort: three electrode gaps"
    scenario = "glasswort-survey.toml"          # relative to this file (optional)

    [[variant]]
    label = "gap 50 mm (as drawn)"

    [[variant]]
    label = "gap 80 mm"
    vessel = "../vessels/glasswort-drone.toml"  # optional; default the scenario's vessel
    set = { "thruster.pylon.gap" = "80 mm" }

Name variants files ``variants-*.toml`` when they sit among the scenarios: the bundled-scenario
tests and the benchmark skip those names.

Every variant is loaded and validated before anything is flown, so a mistake in any of them is
reported at once (:class:`~sim.io.files.InputError`) and nothing runs.
"""

from __future__ import annotations

import copy
import itertools
import json
import math
import multiprocessing
import os
import re
import signal
import threading
import time
import unicodedata
from collections.abc import Callable, Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed, wait
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from sim.engine.mission import RunObserver
from sim.flight import fly
from sim.io import budget
from sim.io.files import (
    InputError,
    LoadedScenario,
    Problem,
    _load_vessel_data,
    load_scenario,
    read_toml,
)
from sim.io.problems import MISSING

__all__ = [
    "RANK_CHOICES",
    "RANK_KEYS",
    "Comparison",
    "PreparedVariants",
    "Variant",
    "VariantRun",
    "VariantsInterrupted",
    "apply_settings",
    "comparable_runs",
    "compare_variants",
    "file_stems",
    "fly_variants",
    "parse_setting",
    "parse_value",
    "prepare_variants",
    "rank_runs",
    "read_variants_file",
    "render_toml",
    "variant_vessel_data",
    "variants_from_options",
]

OVERLAY_CHANNELS = (
    "time_s",
    "distance_m",
    "speed_through_water_m_s",
    "speed_over_ground_m_s",
    "pack_power_w",
    "thruster_power_w",
    "state_of_charge",
    "cell_voltage_v",
)
"""Series kept from each variant's run (for the overlay plots)."""


# ------------------------------------------------------------------ variants


@dataclass(frozen=True)
class Variant:
    """One vessel variant: a vessel file and the settings applied to it.

    Attributes
    ----------
    label : short name shown in tables and legends
    vessel_path : the vessel file (None: the scenario's vessel)
    settings : (dotted key, value) pairs applied in order
    origin : where the settings were given (named in error messages and warnings)
    """

    label: str
    vessel_path: Path | None = None
    settings: tuple[tuple[str, object], ...] = ()
    origin: str = ""
    """Where the settings were given, for messages: ``"option --set"`` or ``"FILE:
    variant[i].set"`` ("" when unknown)."""


def parse_value(text: str) -> object:
    """A value from the command line: an integer, a number, true/false, or text (a quantity
    with its unit such as ``80 mm``, or a name)."""
    t = text.strip()
    if re.fullmatch(r"[-+]?\d+", t):
        return int(t)
    try:
        return float(t)
    except ValueError:
        pass
    if t in ("true", "false"):
        return t == "true"
    if len(t) >= 2 and t[0] == t[-1] and t[0] in "\"'":
        return t[1:-1]
    return t


def parse_setting(text: str) -> tuple[str, list[object]]:
    """``"thruster.0.gap=50 mm,80 mm"`` → ``("thruster.0.gap", ["50 mm", "80 mm"])``.

    Raises
    ------
    ValueError
        When there is no ``=``, no key or no value.
    """
    key, sep, values = text.partition("=")
    key = key.strip()
    if not sep or not key or not values.strip():
        raise ValueError(
            f"--set {text!r}: allowed: KEY=VALUE[,VALUE...], e.g. thruster.0.gap=50mm,80mm"
        )
    vals = [parse_value(v) for v in values.split(",") if v.strip()]
    if not vals:
        raise ValueError(f"--set {text!r}: no value after '='")
    return key, vals


def _slot(node, part: str, key: str, source: str):
    """The container and index/key that ``part`` names inside ``node``."""
    if isinstance(node, list):
        if re.fullmatch(r"\d+", part):
            k = int(part)
            if k >= len(node):
                raise InputError(
                    [
                        Problem(
                            source,
                            key,
                            part,
                            f"index {k} is past the end; allowed: 0 to {len(node) - 1}",
                        )
                    ]
                )
            return k
        names = [e.get("name") for e in node if isinstance(e, dict)]
        if part in names:
            return names.index(part)
        raise InputError(
            [
                Problem(
                    source,
                    key,
                    part,
                    "no entry of that name; allowed: an index 0 to "
                    f"{len(node) - 1} or one of {', '.join(map(str, names))}",
                )
            ]
        )
    if isinstance(node, dict):
        return part
    raise InputError(
        [
            Problem(
                source,
                key,
                part,
                "goes inside a single value; allowed: a key path that ends at a "
                "value, e.g. thruster.0.gap",
            )
        ]
    )


def apply_settings(data: dict, settings: Sequence[tuple[str, object]], source: str) -> dict:
    """A deep copy of vessel data with each dotted-key setting applied (lists are indexed by
    position or by an entry's ``name``). Validation of the result is left to the loader."""
    out = copy.deepcopy(data)
    problems: list[Problem] = []
    for key, value in settings:
        parts = [p for p in key.split(".") if p]
        if not parts:
            problems.append(
                Problem(source, key, value, "empty key; allowed: e.g. battery.parallel")
            )
            continue
        try:
            node = out
            for part in parts[:-1]:
                k = _slot(node, part, key, source)
                if isinstance(node, dict) and k not in node:
                    node[k] = {}
                node = node[k]
            k = _slot(node, parts[-1], key, source)
            node[k] = value
        except InputError as exc:
            problems.extend(exc.problems)
    if problems:
        raise InputError(problems)
    return out


def variant_vessel_data(path: str | Path) -> dict:
    """The data of a vessel file with its ``extends`` chain merged (as the loader sees it)."""
    data, _text = _load_vessel_data(Path(path))  # the loader's own merge of 'extends'
    return data


def _short(value: object) -> str:
    return f"{value:g}" if isinstance(value, float) else str(value)


def variants_from_options(
    vessels: Sequence[str | Path] = (), sets: Sequence[str] = ()
) -> list[Variant]:
    """Variants from ``--vessel`` files and ``--set`` grids.

    Each vessel (or the scenario's vessel when none is given) is combined with every point of
    the grid spanned by the ``--set`` options (their Cartesian product, first option slowest).
    """
    axes = [parse_setting(s) for s in sets]
    bases: list[Path | None] = [Path(v) for v in vessels] or [None]
    grid = list(itertools.product(*[[(k, v) for v in vals] for k, vals in axes])) or [()]
    out = []
    for base in bases:
        for point in grid:
            parts = [f"{k.split('.')[-1]} {_short(v)}" for k, v in point]
            if base is not None and (len(bases) > 1 or not parts):
                parts.insert(0, base.stem)
            out.append(
                Variant(", ".join(parts) or "as given", base, tuple(point), origin="option --set")
            )
    return out


@dataclass(frozen=True)
class VariantsFile:
    """A variants file: its title, the scenario it names (if any) and its variants."""

    path: Path
    title: str
    scenario: Path | None
    variants: list[Variant]


def read_variants_file(path: str | Path) -> VariantsFile:
    """Read a variants file (format in the module docstring); every problem is listed at once.

    Raises
    ------
    InputError
    """
    path = Path(path)
    src = str(path)
    data = read_toml(path)[0]  # size cap, no pipes or devices, every TOML fault an InputError
    problems: list[Problem] = []
    for k in data:
        if k not in ("title", "scenario", "variant"):
            problems.append(
                Problem(src, k, data[k], "unknown key; allowed: title, scenario, [[variant]]")
            )
    title = data.get("title", "")
    if not isinstance(title, str):
        problems.append(Problem(src, "title", title, "wrong type; allowed: text in quotes"))
        title = ""
    scenario = data.get("scenario")
    sc_path = None
    if scenario is not None:
        if not isinstance(scenario, str) or not scenario:
            problems.append(Problem(src, "scenario", scenario, "allowed: a scenario file path"))
        else:
            sc_path = path.parent / scenario
            if not sc_path.exists():
                problems.append(
                    Problem(src, "scenario", scenario, f"file not found (looked for {sc_path})")
                )
    raw = data.get("variant", [])
    if not isinstance(raw, list) or not raw:
        problems.append(Problem(src, "variant", raw, "allowed: one or more [[variant]] tables"))
        raw = []
    variants, labels = [], set()
    for i, v in enumerate(raw):
        where = f"variant[{i}]"
        if not isinstance(v, dict):
            problems.append(Problem(src, where, v, "wrong type; allowed: a [[variant]] table"))
            continue
        for k in v:
            if k not in ("label", "vessel", "set"):
                problems.append(
                    Problem(src, f"{where}.{k}", v[k], "unknown key; allowed: label, vessel, set")
                )
        label = v.get("label")
        if not isinstance(label, str) or not label.strip():
            problems.append(
                Problem(src, f"{where}.label", label, "required; allowed: non-empty text in quotes")
            )
            label = f"variant {i + 1}"
        if label in labels:
            problems.append(
                Problem(
                    src, f"{where}.label", label, "used twice; allowed: a label unique in the file"
                )
            )
        labels.add(label)
        vessel = v.get("vessel")
        vpath = None
        if vessel is not None:
            if not isinstance(vessel, str):
                problems.append(
                    Problem(src, f"{where}.vessel", vessel, "allowed: a vessel file path in quotes")
                )
            else:
                vpath = path.parent / vessel
                if not vpath.exists():
                    problems.append(
                        Problem(
                            src, f"{where}.vessel", vessel, f"file not found (looked for {vpath})"
                        )
                    )
        sets = v.get("set", {})
        if not isinstance(sets, dict):
            problems.append(
                Problem(src, f"{where}.set", sets, 'allowed: a table of "dotted.key" = value')
            )
            sets = {}
        variants.append(Variant(label, vpath, tuple(_flatten(sets)), origin=f"{src}: {where}.set"))
    if problems:
        raise InputError(problems)
    return VariantsFile(path, title, sc_path, variants)


def _flatten(d: dict, prefix: str = ""):
    """Settings from a (possibly nested) TOML table: {"a.b": 1} and {a = {b = 1}} alike."""
    for k, v in d.items():
        key = f"{prefix}.{k}" if prefix else str(k)
        if isinstance(v, dict):
            yield from _flatten(v, key)
        else:
            yield key, v


# ------------------------------------------------------------------ TOML output


def _toml_value(v: object) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v, ensure_ascii=False)
    if isinstance(v, list | tuple):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_toml_key(k)} = {_toml_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(f"cannot write {type(v).__name__} as TOML")


def _toml_key(k: str) -> str:
    return k if re.fullmatch(r"[A-Za-z0-9_-]+", k) else json.dumps(k, ensure_ascii=False)


def render_toml(data: dict, header: str = "") -> str:
    """TOML text of plain data (tables, arrays of tables, strings, numbers, booleans, lists).

    ``tomllib.loads(render_toml(d)) == d`` for such data.
    """
    lines = [f"# {h}" if h else "#" for h in header.splitlines()] if header else []

    def table(prefix: str, d: dict) -> None:
        scalars = {k: v for k, v in d.items() if not _is_table(v) and not _is_table_list(v)}
        for k, v in scalars.items():
            lines.append(f"{_toml_key(k)} = {_toml_value(v)}")
        for k, v in d.items():
            name = f"{prefix}.{_toml_key(k)}" if prefix else _toml_key(k)
            if _is_table(v):
                lines.extend(["", f"[{name}]"])
                table(name, v)
            elif _is_table_list(v):
                for item in v:
                    lines.extend(["", f"[[{name}]]"])
                    table(name, item)

    table("", data)
    return "\n".join(lines).lstrip("\n") + "\n"


def _is_table(v) -> bool:
    return isinstance(v, dict)


def _is_table_list(v) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


# ------------------------------------------------------------------ flying the variants


@dataclass(frozen=True)
class VariantRun:
    """What one variant's run produced (or why it failed).

    Attributes
    ----------
    index : position of the variant in the input
    label : the variant's label
    settings : the settings applied
    vessel_path : the vessel file flown (a written variant file when logs are kept)
    ok : the run finished (completed or stopped by a limit); False on a failure
    error : the failure message ("" when ok)
    summary : the run summary (keys of :data:`sim.engine.summary.SUMMARY_UNITS`)
    legs, events : the run's leg records and events
    ending_reason, ending_kind : why and how the run ended
    series : the channels of :data:`OVERLAY_CHANNELS` (1-D arrays, SI)
    wall_time_s : wall-clock time of the run [s]
    log_path : the HDF5 log written (None when none); for an interrupted run the partial
        (``*.incomplete.h5``) log kept
    planned_legs : the scenario's legs in order (names)
    cut_short : ``(leg name, what ended it, time [s])`` of every leg flown that did not end by
        its own end condition (a trigger, a stop or a limit)
    interrupted : the run was stopped by an interrupt (Ctrl-C) before it finished
    """

    index: int
    label: str
    settings: tuple[tuple[str, object], ...]
    vessel_path: str
    ok: bool
    error: str = ""
    summary: dict = field(default_factory=dict)
    legs: list = field(default_factory=list)
    events: list = field(default_factory=list)
    ending_reason: str = ""
    ending_kind: str = ""
    series: dict = field(default_factory=dict)
    wall_time_s: float = 0.0
    log_path: str | None = None
    planned_legs: tuple[str, ...] = ()
    cut_short: tuple[tuple[str, str, float], ...] = ()
    interrupted: bool = False

    def value(self, key: str) -> float:
        """A summary number (NaN when the run failed)."""
        return float(self.summary.get(key, math.nan)) if self.ok else math.nan

    @property
    def flown_legs(self) -> tuple[str, ...]:
        """Names of the legs flown, in order (a leg entered twice is named twice)."""
        return tuple(str(rec["name"]) for rec in self.legs)

    @property
    def skipped_legs(self) -> tuple[str, ...]:
        """Planned legs never entered (a trigger jumped over them or the run stopped first)."""
        flown = set(self.flown_legs)
        return tuple(n for n in self.planned_legs if n not in flown)

    @property
    def as_planned(self) -> bool:
        """The run completed the mission, flying every planned leg in order, each to its own
        end condition."""
        if not self.ok or self.ending_kind != "complete" or self.cut_short:
            return False
        return not self.planned_legs or self.flown_legs == self.planned_legs

    @property
    def signature(self) -> tuple:
        """What the run flew: the legs in order, each with how it ended (own end condition or
        what cut it short), and how the run ended. Runs with equal signatures are comparable."""
        cut = {(name, round(t, 6)) for name, _by, t in self.cut_short}
        legs = tuple(
            (str(rec["name"]), (str(rec["name"]), round(float(rec["t_end_s"]), 6)) not in cut)
            for rec in self.legs
        )
        return (legs, self.ending_kind)

    @property
    def outcome(self) -> str:
        """How the run ended in words, naming every leg cut short and by what, e.g.
        ``"mission complete; leg 'survey' cut short by trigger 'low-charge-return' at 41 min"``."""
        if not self.ok:
            return "interrupted" if self.interrupted else f"failed: {self.error}"
        parts = [self.ending_reason]
        for name, by, t in self.cut_short:
            if by == self.ending_reason:
                parts.append(f"leg {name!r} cut short at {t / 60:.1f} min")
            else:
                parts.append(f"leg {name!r} cut short by {by} at {t / 60:.1f} min")
        skipped = self.skipped_legs
        if skipped:
            parts.append("not flown: " + ", ".join(repr(n) for n in skipped))
        return "; ".join(parts)


@dataclass(frozen=True)
class Comparison:
    """The runs of all variants of one scenario, and their ranking.

    Attributes
    ----------
    scenario_name, scenario_path : the scenario flown
    title : title of the comparison
    runs : one VariantRun per variant, in input order
    order : indices into ``runs``, best first: the comparable runs ranked, then the others
        (ranked by the same measure), then the failed ones
    rank_basis : how they were ranked, in words
    comparable : indices of the runs ranked against each other (same legs flown, each to the
        same kind of end; see :func:`rank_runs`)
    warnings : ``(variant label, Problem)`` of every variant's load-time warnings
    """

    scenario_name: str
    scenario_path: Path
    title: str
    runs: tuple[VariantRun, ...]
    order: tuple[int, ...]
    rank_basis: str
    comparable: tuple[int, ...] = ()
    warnings: tuple[tuple[str, Problem], ...] = ()

    @property
    def ranked(self) -> list[VariantRun]:
        return [self.runs[i] for i in self.order]

    def is_comparable(self, run: VariantRun) -> bool:
        """Whether ``run`` is ranked among the comparable missions."""
        return run.index in self.comparable


RANK_KEYS: dict[str, tuple[str, int, str]] = {
    "distance": ("distance_m", -1, "greatest distance first"),
    "energy": ("energy_per_distance_j_m", 1, "least energy per distance first"),
    "duration": ("duration_s", -1, "longest duration first"),
    "endurance": ("duration_s", -1, "longest endurance (time under way) first"),
    "end-soc": ("end_state_of_charge", -1, "highest end state of charge first"),
    "efficiency": ("mean_eta_overall", -1, "highest mean overall efficiency first"),
    "speed": ("mean_speed_over_ground_m_s", -1, "highest mean speed first"),
}
"""Ranking choices: name -> (summary key, sign (−1 larger is better), description)."""

RANK_CHOICES = ("auto", *RANK_KEYS)
"""Values of ``rank_by`` (and of ``versus --rank-by``)."""


def comparable_runs(runs: Sequence[VariantRun]) -> tuple[int, ...]:
    """Indices of the runs that can be ranked against each other: those that flew the mission
    as planned (every leg in order, each to its own end condition,
    :attr:`VariantRun.as_planned`). When none did, every finished run (no run is then
    comparable in that sense; :func:`rank_runs` says so). Failed runs never are."""
    ok = [r for r in runs if r.ok]
    planned = tuple(r.index for r in ok if r.as_planned)
    return planned or tuple(r.index for r in ok)


def rank_runs(runs: Sequence[VariantRun], by: str = "auto") -> tuple[tuple[int, ...], str]:
    """Order runs best first: the comparable runs (:func:`comparable_runs`) ranked by ``by``,
    then the other finished runs by the same measure, then failed runs in input order.

    ``by = "auto"``: when the comparable runs completed the mission as planned, least energy per
    distance first (they all flew the same mission); otherwise greatest distance first.
    """
    if by != "auto" and by not in RANK_KEYS:
        raise ValueError(f"unknown ranking {by!r}; allowed: {', '.join(RANK_CHOICES)}")
    ok = [r for r in runs if r.ok]
    comp = set(comparable_runs(runs))
    planned = bool(ok) and all(r.as_planned for r in ok if r.index in comp)
    auto = by == "auto"
    if auto:
        by = "energy" if planned else "distance"
    key, sign, text = RANK_KEYS[by]

    def order_key(r: VariantRun):
        v = r.value(key)
        return (math.isnan(v), sign * v if not math.isnan(v) else 0.0, r.index)

    first = sorted((r for r in ok if r.index in comp), key=order_key)
    others = sorted((r for r in ok if r.index not in comp), key=order_key)
    bad = [r for r in runs if not r.ok]
    if others:
        basis = (
            f"{len(first)} of {len(ok)} flew the mission as planned, ranked among them: {text}; "
            f"{len(others)} not comparable (legs cut short or not flown) listed below them"
        )
    elif planned:
        basis = f"all completed the mission: {text}" if auto else text
    else:
        basis = f"none flew the mission as planned (see how each ended): {text}"
    return tuple(r.index for r in first + others + bad), basis


# ------------------------------------------------------------------ file names

_RESERVED_STEMS = frozenset(
    ["con", "prn", "aux", "nul"] + [f"com{i}" for i in range(10)] + [f"lpt{i}" for i in range(10)]
)
"""Names no file may carry on Windows (whatever its extension)."""

MAX_STEM = 60
"""Longest file-name stem made from a label (characters)."""


def _slug(label: str) -> str:
    """A safe file-name stem from a label: ASCII letters, digits, '_' and '-' only (no path
    separators, dots or spaces), at most :data:`MAX_STEM` characters, never a reserved name."""
    s = unicodedata.normalize("NFKD", str(label)).encode("ascii", "ignore").decode("ascii")
    s = re.sub(r"[^A-Za-z0-9_-]+", "-", s).strip("-_")[:MAX_STEM].strip("-_")
    if not s:
        return "variant"
    if s.lower() in _RESERVED_STEMS:
        s = f"variant-{s}"
    return s


def file_stems(labels: Sequence[str]) -> list[str]:
    """One safe, distinct file-name stem per label (:func:`_slug`; a numeric suffix ``-2``,
    ``-3``... on a clash, compared without regard to case, as on case-insensitive disks)."""
    used: set[str] = set()
    out = []
    for label in labels:
        base = _slug(label)
        stem, n = base, 2
        while stem.lower() in used:
            stem = f"{base}-{n}"
            n += 1
        used.add(stem.lower())
        out.append(stem)
    return out


# ------------------------------------------------------------------ preparing the variants


@dataclass(frozen=True)
class _Task:
    index: int
    label: str
    settings: tuple
    scenario_path: str
    vessel_path: str
    overrides: dict | None
    log_path: str | None
    sample_s: float | None


@dataclass(frozen=True)
class PreparedVariants:
    """Every variant loaded and validated, ready to fly (:func:`prepare_variants`).

    Attributes
    ----------
    scenario_path, scenario_name : the scenario
    labels : the variants' labels, in input order
    warnings : ``(variant label, Problem)``: each variant's load-time warnings (those of its
        vessel and of the scenario with it), settings named as the user gave them
    log_paths : the log each variant will write (``None`` entries when no logs are kept)
    vessel_files : the vessel file written for each variant (empty when no logs are kept)
    """

    scenario_path: Path
    scenario_name: str
    labels: tuple[str, ...]
    warnings: tuple[tuple[str, Problem], ...]
    log_paths: tuple[str | None, ...]
    vessel_files: tuple[str, ...]
    tasks: tuple[_Task, ...]


def _load(task: _Task) -> LoadedScenario:
    return load_scenario(
        task.scenario_path, vessel_overrides=task.overrides, vessel_path=task.vessel_path
    )


def _resolved_key(data: dict, key: str) -> str | None:
    """A dotted setting key as the validator names it (``thruster.pylon.gap`` →
    ``thruster[0].gap``); None when it does not lead anywhere."""
    node: object = data
    out = ""
    for part in (p for p in key.split(".") if p):
        if isinstance(node, list):
            try:
                k = _slot(node, part, key, "")
            except InputError:
                return None
            out += f"[{k}]"
            node = node[k]
        elif isinstance(node, dict):
            out += f".{part}" if out else part
            node = node.get(part, {})
        else:
            return None
    return out or None


def _as_setting_problem(
    p: Problem, v: Variant, key: str, value: object, name_variant: bool = True
) -> Problem:
    """``p`` (found in the variant's vessel data) restated against the setting that caused it:
    the option (``option --set KEY=VALUE``) or the variants file key, and (``name_variant``)
    the variant."""
    msg = f"{p.message} (variant {v.label!r})" if name_variant else p.message
    origin = v.origin or f"variant {v.label!r}: set"
    if origin.startswith("option "):
        return Problem(f"{origin} {key}={_short(value)}", "", MISSING, msg, p.severity)
    file, _, where = origin.rpartition(": ")
    return Problem(file or origin, f"{where}.{_toml_key(key)}", value, msg, p.severity)


def _restate(
    problems: Sequence[Problem], v: Variant, data: dict, name_variant: bool = True
) -> list[Problem]:
    """Problems of a variant's data, those caused by one of its settings named by the setting
    (the last setting of a key wins, as when applied)."""
    by_key: dict[str, tuple[str, object]] = {}
    for key, value in v.settings:
        by_key[key] = (key, value)
        r = _resolved_key(data, key)
        if r is not None:
            by_key[r] = (key, value)
    out = []
    for p in problems:
        hit = by_key.get(p.key)
        out.append(_as_setting_problem(p, v, *hit, name_variant) if hit else p)
    return out


def prepare_variants(
    scenario: str | Path,
    variants: Sequence[Variant],
    *,
    logs_dir: str | Path | None = None,
    sample_s: float | None = None,
) -> PreparedVariants:
    """Load and validate every variant (nothing flies), and, when ``logs_dir`` is given, write
    each variant's full vessel file there.

    Each variant is checked as ``brinebolt check`` checks a scenario: the same errors and the
    same warnings (e.g. a permanent magnet asked for a field above its remanence). A problem
    caused by a setting names the setting (``option --set KEY=VALUE`` or the variants file's
    ``variant[i].set`` key) and the variant, not only the vessel file.

    File names in ``logs_dir`` come from the labels made safe and distinct
    (:func:`file_stems`), so two variants never share a file.

    Raises
    ------
    InputError
        Any variant's vessel or the scenario is invalid (all problems of all variants).
    """
    scenario = Path(scenario)
    labels = [v.label for v in variants]
    if not variants:
        raise InputError([Problem(str(scenario), "", "", "no variants to compare")])
    dupes = sorted({x for x in labels if labels.count(x) > 1})
    if dupes:
        raise InputError(
            [Problem("variants", "label", d, "used twice; allowed: unique labels") for d in dupes]
        )
    problems: list[Problem] = []
    warnings: list[tuple[str, Problem]] = []
    ready: list[tuple[Variant, Path, dict]] = []
    base = None
    scenario_name = ""
    for v in variants:
        try:
            if v.vessel_path is None:
                if base is None:
                    base = load_scenario(scenario)
                vpath = base.vessel.path
            else:
                vpath = Path(v.vessel_path)
            raw = variant_vessel_data(vpath)
        except InputError as exc:
            problems.extend(exc.problems)
            continue
        try:
            data = apply_settings(raw, v.settings, str(vpath))
            loaded = load_scenario(scenario, vessel_overrides=data, vessel_path=vpath)
            budget.check_scenario(loaded, sample_s)  # the interval asked for, held to the limits
        except InputError as exc:
            problems.extend(_restate(exc.problems, v, raw))
            continue
        scenario_name = loaded.spec.scenario.name
        for w in _restate(loaded.warnings + loaded.vessel.warnings, v, raw, False):
            warnings.append((v.label, w))
        ready.append((v, vpath, data))
    if problems:  # a fault of the shared scenario is said once, not once per variant
        raise InputError(list(dict.fromkeys(problems)))

    stems = file_stems(labels)
    tasks, log_paths, vessel_files = [], [], []
    if logs_dir is not None:
        logs_dir = Path(logs_dir)
        logs_dir.mkdir(parents=True, exist_ok=True)
    for i, ((v, vpath, data), stem) in enumerate(zip(ready, stems, strict=True)):
        if logs_dir is None:
            task = _Task(i, v.label, v.settings, str(scenario), str(vpath), data, None, sample_s)
        else:
            vfile = logs_dir / f"{stem}.vessel.toml"
            header = (
                f"Vessel variant {v.label!r} written by brinebolt versus from "
                f"{vpath}\nsettings: "
                + (", ".join(f"{k} = {val!r}" for k, val in v.settings) or "none")
            )
            vfile.write_text(render_toml(data, header), encoding="utf-8")
            log = str(logs_dir / f"{stem}.h5")
            vessel_files.append(str(vfile))
            task = _Task(i, v.label, v.settings, str(scenario), str(vfile), None, log, sample_s)
        tasks.append(task)
        log_paths.append(task.log_path)
    named = [p.lower() for p in (*vessel_files, *(x for x in log_paths if x))]
    if len(set(named)) != len(named):  # file_stems guarantees it; never fly the wrong vessel
        raise RuntimeError(f"two variants would share a file: {named}")
    return PreparedVariants(
        scenario_path=scenario,
        scenario_name=scenario_name,
        labels=tuple(labels),
        warnings=tuple(warnings),
        log_paths=tuple(log_paths),
        vessel_files=tuple(vessel_files),
        tasks=tuple(tasks),
    )


# ------------------------------------------------------------------ flying


class VariantsInterrupted(KeyboardInterrupt):
    """Flying the variants was interrupted (Ctrl-C). Nothing more is flown.

    Attributes
    ----------
    runs : the runs that finished before the interrupt, and the interrupted ones
        (``interrupted = True``)
    partial_logs : the ``*.incomplete.h5`` logs kept of the interrupted runs
    finished_logs : the logs of the runs that finished before the interrupt
    """

    def __init__(self, runs: Sequence[VariantRun]) -> None:
        self.runs = tuple(runs)
        self.partial_logs = tuple(r.log_path for r in runs if r.interrupted and r.log_path)
        self.finished_logs = tuple(r.log_path for r in runs if r.ok and r.log_path)
        self.partial_log = self.partial_logs[0] if len(self.partial_logs) == 1 else None
        super().__init__("interrupted")


_STOP = None
"""In a worker process: the event the parent sets to stop the flights (see :func:`_init`)."""


def _init_worker(stop) -> None:
    """Initializer of the worker processes: Ctrl-C goes to the parent only (the terminal sends
    SIGINT to the whole process group); the parent stops the workers through ``stop``."""
    global _STOP
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    if hasattr(signal, "pthread_sigmask"):
        signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})
    _STOP = stop


class _StopWatch(RunObserver):
    """Ends a flight with KeyboardInterrupt (so the log is kept, marked incomplete) once the
    parent process asks the workers to stop."""

    def __init__(self, stop) -> None:
        self.stop = stop

    def _check(self) -> None:
        if self.stop.is_set():
            raise KeyboardInterrupt

    def samples(self, rows):
        self._check()

    def progress(self, time_s, time_limit_s, wall_s):
        self._check()


def _cut_short(loaded: LoadedScenario, legs: Sequence[dict]) -> tuple:
    """``(leg, what ended it, time [s])`` of every leg record not ended by its own condition."""
    own: dict[str, set[str]] = {}
    for leg in loaded.mission_spec.legs:
        texts = {c.describe() for c in leg.until}
        if leg.duration_s is not None:
            texts.add(f"duration {leg.duration_s:g} s")
        own[leg.name] = texts
    return tuple(
        (str(rec["name"]), str(rec["ending"]), float(rec["t_end_s"]))
        for rec in legs
        if str(rec["ending"]) not in own.get(str(rec["name"]), set())
    )


def _fly(task: _Task) -> VariantRun:
    """Fly one variant (runs in a worker process; must stay a module-level function).

    In a worker, an interrupt asked for by the parent ends the flight and returns a run marked
    ``interrupted`` with its partial log; in this process (``jobs = 1``) KeyboardInterrupt is
    passed on with the partial log as its ``partial_log``."""
    t0 = time.perf_counter()
    common = {
        "index": task.index,
        "label": task.label,
        "settings": task.settings,
        "vessel_path": task.vessel_path,
    }
    planned: tuple[str, ...] = ()
    if _STOP is not None and _STOP.is_set():  # queued before the interrupt: do not start
        return VariantRun(ok=False, error="interrupted", interrupted=True, **common)
    try:
        loaded = _load(task)
        planned = tuple(leg.name for leg in loaded.mission_spec.legs)
        observer = _StopWatch(_STOP) if _STOP is not None else None
        out = fly(
            loaded,
            log_path=task.log_path,
            overwrite=True,
            sample_s=task.sample_s,
            observer=observer,
        )
    except KeyboardInterrupt as exc:
        if _STOP is None:
            raise
        partial = getattr(exc, "partial_log", None)
        return VariantRun(
            ok=False,
            error="interrupted",
            interrupted=True,
            log_path=str(partial) if partial is not None else None,
            planned_legs=planned,
            wall_time_s=time.perf_counter() - t0,
            **common,
        )
    except Exception as exc:  # one failing variant must not sink the comparison
        return VariantRun(
            ok=False,
            error=f"{type(exc).__name__}: {exc}",
            planned_legs=planned,
            wall_time_s=time.perf_counter() - t0,
            **common,
        )
    r = out.result
    series = {k: np.asarray(r.series[k], dtype=float) for k in OVERLAY_CHANNELS}
    legs = list(r.legs)
    return VariantRun(
        ok=True,
        summary=dict(r.summary),
        legs=legs,
        events=list(r.events),
        ending_reason=r.ending_reason,
        ending_kind=r.ending_kind,
        series=series,
        wall_time_s=time.perf_counter() - t0,
        log_path=str(out.log_path) if out.log_path is not None else None,
        planned_legs=planned,
        cut_short=_cut_short(loaded, legs),
        **common,
    )


STOP_WAIT_S = 30.0
"""After Ctrl-C, how long the workers get to close their logs before they are terminated [s]."""


def _fly_in_pool(
    tasks: Sequence[_Task],
    n_jobs: int,
    progress: Callable[[VariantRun], None] | None,
) -> list[VariantRun | None]:
    """Fly the tasks on ``n_jobs`` worker processes. On KeyboardInterrupt in this process the
    pending tasks are cancelled, the running flights told to stop (their logs are kept, marked
    incomplete) and :class:`VariantsInterrupted` is raised."""
    ctx = multiprocessing.get_context()
    stop = ctx.Event()
    results: list[VariantRun | None] = [None] * len(tasks)
    # Block SIGINT while the workers start, so that none of them can take a Ctrl-C before its
    # initializer ignores it (the blocked mask is inherited); a Ctrl-C meanwhile is delivered
    # here once unblocked.
    can_mask = hasattr(signal, "pthread_sigmask") and (
        threading.current_thread() is threading.main_thread()
    )
    if can_mask:
        signal.pthread_sigmask(signal.SIG_BLOCK, {signal.SIGINT})
    pool = ProcessPoolExecutor(
        max_workers=n_jobs, mp_context=ctx, initializer=_init_worker, initargs=(stop,)
    )
    futures = {}
    try:
        try:
            futures = {pool.submit(_fly, t): t.index for t in tasks}
        finally:
            if can_mask:
                signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})
        for fut in as_completed(futures):
            run = fut.result()
            results[futures[fut]] = run
            if progress:
                progress(run)
    except KeyboardInterrupt:
        old = signal.signal(signal.SIGINT, signal.SIG_IGN)  # a second Ctrl-C: still clean
        try:
            stop.set()
            for fut in futures:
                fut.cancel()
            done, _ = wait(futures, timeout=STOP_WAIT_S)
            for fut in done:
                if not fut.cancelled() and fut.exception() is None:
                    results[futures[fut]] = fut.result()
            if len(done) < len(futures):
                for proc in list(getattr(pool, "_processes", {}).values()):
                    proc.terminate()
            pool.shutdown(wait=True, cancel_futures=True)
        finally:
            signal.signal(signal.SIGINT, old)
        raise VariantsInterrupted([r for r in results if r is not None]) from None
    finally:
        pool.shutdown(wait=True, cancel_futures=True)
    return results


def fly_variants(
    prepared: PreparedVariants,
    *,
    jobs: int | None = None,
    rank_by: str = "auto",
    title: str = "",
    progress: Callable[[VariantRun], None] | None = None,
) -> Comparison:
    """Fly prepared variants (:func:`prepare_variants`), in parallel, and rank the runs.

    Parameters
    ----------
    prepared : PreparedVariants
    jobs : int, optional
        Worker processes; default one per core, at most one per variant. 1 flies them in this
        process, one after the other.
    rank_by : str
        ``"auto"`` or a key of :data:`RANK_KEYS` (see :func:`rank_runs`).
    title : str
        Title of the comparison (default the scenario's name).
    progress : callable, optional
        Called with each VariantRun as it finishes (in the calling process).

    Raises
    ------
    VariantsInterrupted
        On Ctrl-C (a KeyboardInterrupt): the worker processes ignore SIGINT; this process
        cancels what has not started, stops the running flights (their logs are kept, marked
        incomplete) and raises it naming the partial logs.
    """
    if rank_by != "auto" and rank_by not in RANK_KEYS:
        raise ValueError(f"unknown ranking {rank_by!r}; allowed: {', '.join(RANK_CHOICES)}")
    tasks = prepared.tasks
    n_jobs = jobs if jobs is not None else (os.cpu_count() or 1)
    n_jobs = max(1, min(int(n_jobs), len(tasks)))
    results: list[VariantRun | None] = [None] * len(tasks)
    if n_jobs == 1:
        for t in tasks:
            try:
                results[t.index] = _fly(t)
            except KeyboardInterrupt as exc:
                partial = getattr(exc, "partial_log", None)
                cut = VariantRun(
                    index=t.index,
                    label=t.label,
                    settings=t.settings,
                    vessel_path=t.vessel_path,
                    ok=False,
                    error="interrupted",
                    interrupted=True,
                    log_path=str(partial) if partial is not None else None,
                )
                done = [r for r in results if r is not None]
                raise VariantsInterrupted([*done, cut]) from None
            if progress:
                progress(results[t.index])
    else:
        results = _fly_in_pool(tasks, n_jobs, progress)
    runs = tuple(r for r in results if r is not None)
    order, basis = rank_runs(runs, rank_by)
    return Comparison(
        scenario_name=prepared.scenario_name,
        scenario_path=prepared.scenario_path,
        title=title or prepared.scenario_name,
        runs=runs,
        order=order,
        rank_basis=basis,
        comparable=comparable_runs(runs),
        warnings=prepared.warnings,
    )


def compare_variants(
    scenario: str | Path,
    variants: Sequence[Variant],
    *,
    jobs: int | None = None,
    logs_dir: str | Path | None = None,
    sample_s: float | None = None,
    rank_by: str = "auto",
    title: str = "",
    progress: Callable[[VariantRun], None] | None = None,
) -> Comparison:
    """Fly a scenario once per variant, in parallel on the local cores, and rank the runs
    (:func:`prepare_variants` then :func:`fly_variants`).

    Parameters
    ----------
    scenario : path
        Scenario file.
    variants : sequence of Variant
        The variants (labels must be unique).
    jobs : int, optional
        Worker processes; default one per core, at most one per variant. 1 flies them in this
        process, one after the other.
    logs_dir : path, optional
        Write each variant's vessel file (``<stem>.vessel.toml``, the variant's full data) and
        HDF5 log (``<stem>.h5``, replaced if present) there, so the log's provenance holds the
        vessel actually flown; the stems are the labels made safe and distinct
        (:func:`file_stems`).
    sample_s : float, optional
        Sampling interval [s] overriding the scenario's.
    rank_by : str
        ``"auto"`` or a key of :data:`RANK_KEYS` (see :func:`rank_runs`).
    title : str
        Title of the comparison (default the scenario's name).
    progress : callable, optional
        Called with each VariantRun as it finishes (in the calling process).

    Returns
    -------
    Comparison
        ``runs`` in input order whatever order the workers finish in.

    Raises
    ------
    InputError
        Any variant's vessel or the scenario is invalid (all problems, nothing flown).
    VariantsInterrupted
        On Ctrl-C (see :func:`fly_variants`).
    """
    prepared = prepare_variants(scenario, variants, logs_dir=logs_dir, sample_s=sample_s)
    return fly_variants(prepared, jobs=jobs, rank_by=rank_by, title=title, progress=progress)
