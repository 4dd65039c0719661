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
import os
import re
import time
import tomllib
from collections.abc import Callable, Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from sim.flight import fly
from sim.io.files import InputError, LoadedScenario, Problem, _load_vessel_data, load_scenario

__all__ = [
    "Comparison",
    "Variant",
    "VariantRun",
    "apply_settings",
    "compare_variants",
    "parse_setting",
    "parse_value",
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
    """

    label: str
    vessel_path: Path | None = None
    settings: tuple[tuple[str, object], ...] = ()


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
            out.append(Variant(", ".join(parts) or "as given", base, tuple(point)))
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
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise InputError([Problem(src, "", "", "file not found")]) from None
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError) as exc:
        raise InputError([Problem(src, "", "", f"cannot read it as TOML: {exc}")]) from None
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
        variants.append(Variant(label, vpath, tuple(_flatten(sets))))
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
    log_path : the HDF5 log written (None when none)
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

    def value(self, key: str) -> float:
        """A summary number (NaN when the run failed)."""
        return float(self.summary.get(key, math.nan)) if self.ok else math.nan


@dataclass(frozen=True)
class Comparison:
    """The runs of all variants of one scenario, and their ranking.

    Attributes
    ----------
    scenario_name, scenario_path : the scenario flown
    title : title of the comparison
    runs : one VariantRun per variant, in input order
    order : indices into ``runs``, best first
    rank_basis : how they were ranked, in words
    """

    scenario_name: str
    scenario_path: Path
    title: str
    runs: tuple[VariantRun, ...]
    order: tuple[int, ...]
    rank_basis: str

    @property
    def ranked(self) -> list[VariantRun]:
        return [self.runs[i] for i in self.order]


RANK_KEYS: dict[str, tuple[str, int, str]] = {
    "distance": ("distance_m", -1, "greatest distance first"),
    "energy": ("energy_per_distance_j_m", 1, "least energy per distance first"),
    "duration": ("duration_s", -1, "longest duration first"),
    "efficiency": ("mean_eta_overall", -1, "highest mean overall efficiency first"),
    "speed": ("mean_speed_over_ground_m_s", -1, "highest mean speed first"),
}
"""Ranking choices: name -> (summary key, sign (−1 larger is better), description)."""


def rank_runs(runs: Sequence[VariantRun], by: str = "auto") -> tuple[tuple[int, ...], str]:
    """Order runs best first. Failed runs come last, in input order.

    ``by = "auto"``: when every run that finished completed the mission, least energy per
    distance first (they all flew the same mission); otherwise greatest distance first.
    """
    ok = [r for r in runs if r.ok]
    if by == "auto":
        by = "energy" if ok and all(r.ending_kind == "complete" for r in ok) else "distance"
        prefix = (
            "all completed the mission: " if by == "energy" else "not all completed the mission: "
        )
    else:
        prefix = ""
    if by not in RANK_KEYS:
        raise ValueError(f"unknown ranking {by!r}; allowed: auto, {', '.join(RANK_KEYS)}")
    key, sign, text = RANK_KEYS[by]
    good = sorted(ok, key=lambda r: (sign * r.value(key), r.index))
    bad = [r for r in runs if not r.ok]
    return tuple(r.index for r in good + bad), prefix + text


def _slug(label: str) -> str:
    s = re.sub(r"[^A-Za-z0-9._-]+", "-", label).strip("-.")
    return s or "variant"


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


def _load(task: _Task) -> LoadedScenario:
    return load_scenario(
        task.scenario_path, vessel_overrides=task.overrides, vessel_path=task.vessel_path
    )


def _fly(task: _Task) -> VariantRun:
    """Fly one variant (runs in a worker process; must stay a module-level function)."""
    t0 = time.perf_counter()
    common = {
        "index": task.index,
        "label": task.label,
        "settings": task.settings,
        "vessel_path": task.vessel_path,
    }
    try:
        loaded = _load(task)
        out = fly(loaded, log_path=task.log_path, overwrite=True, sample_s=task.sample_s)
    except KeyboardInterrupt:
        raise
    except Exception as exc:  # one failing variant must not sink the comparison
        return VariantRun(
            ok=False,
            error=f"{type(exc).__name__}: {exc}",
            wall_time_s=time.perf_counter() - t0,
            **common,
        )
    r = out.result
    series = {k: np.asarray(r.series[k], dtype=float) for k in OVERLAY_CHANNELS}
    return VariantRun(
        ok=True,
        summary=dict(r.summary),
        legs=list(r.legs),
        events=list(r.events),
        ending_reason=r.ending_reason,
        ending_kind=r.ending_kind,
        series=series,
        wall_time_s=time.perf_counter() - t0,
        log_path=str(out.log_path) if out.log_path is not None else None,
        **common,
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
    """Fly a scenario once per variant, in parallel on the local cores, and rank the runs.

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
        Write each variant's vessel file (``<label>.vessel.toml``, the variant's full data) and
        HDF5 log (``<label>.h5``, replaced if present) there, so the log's provenance holds the
        vessel actually flown.
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
    """
    scenario = Path(scenario)
    labels = [v.label for v in variants]
    dupes = sorted({x for x in labels if labels.count(x) > 1})
    if not variants:
        raise InputError([Problem(str(scenario), "", "", "no variants to compare")])
    if dupes:
        raise InputError(
            [Problem("variants", "label", d, "used twice; allowed: unique labels") for d in dupes]
        )
    problems: list[Problem] = []
    tasks: list[_Task] = []
    base = None
    scenario_name = ""
    if logs_dir is not None:
        logs_dir = Path(logs_dir)
        logs_dir.mkdir(parents=True, exist_ok=True)
    for i, v in enumerate(variants):
        try:
            if v.vessel_path is None:
                if base is None:
                    base = load_scenario(scenario)
                vpath = base.vessel.path
            else:
                vpath = Path(v.vessel_path)
            data = variant_vessel_data(vpath)
            data = apply_settings(data, v.settings, f"{v.label} ({vpath})")
            task = _Task(i, v.label, v.settings, str(scenario), str(vpath), data, None, sample_s)
            loaded = _load(task)  # validate now: every problem before anything flies
            scenario_name = loaded.spec.scenario.name
            if logs_dir is not None:
                vfile = logs_dir / f"{_slug(v.label)}.vessel.toml"
                header = (
                    f"Vessel variant {v.label!r} written by brinebolt versus from "
                    f"{vpath}\nsettings: "
                    + (", ".join(f"{k} = {val!r}" for k, val in v.settings) or "none")
                )
                vfile.write_text(render_toml(data, header), encoding="utf-8")
                task = _Task(
                    i,
                    v.label,
                    v.settings,
                    str(scenario),
                    str(vfile),
                    None,
                    str(logs_dir / f"{_slug(v.label)}.h5"),
                    sample_s,
                )
            tasks.append(task)
        except InputError as exc:
            problems.extend(exc.problems)
    if problems:
        raise InputError(problems)

    n_jobs = jobs if jobs is not None else (os.cpu_count() or 1)
    n_jobs = max(1, min(int(n_jobs), len(tasks)))
    results: list[VariantRun | None] = [None] * len(tasks)
    if n_jobs == 1:
        for t in tasks:
            results[t.index] = _fly(t)
            if progress:
                progress(results[t.index])
    else:
        with ProcessPoolExecutor(max_workers=n_jobs) as pool:
            futures = {pool.submit(_fly, t): t.index for t in tasks}
            for fut in as_completed(futures):
                run = fut.result()
                results[futures[fut]] = run
                if progress:
                    progress(run)
    runs = tuple(r for r in results if r is not None)
    order, basis = rank_runs(runs, rank_by)
    return Comparison(
        scenario_name=scenario_name,
        scenario_path=scenario,
        title=title or scenario_name,
        runs=runs,
        order=order,
        rank_basis=basis,
    )
