"""Fly one variant of a study: apply its settings to the vessel and scenario data, let the mass
model set the vessel's mass (and a displacement hull's draft), fly it and turn the run into the
study's outputs. Runs in worker processes (or on Dask workers): everything here is a
module-level function of plain, picklable data.
"""

from __future__ import annotations

import copy
import dataclasses
import json
import math
import os
import tempfile
import time
import traceback
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from sim.analysis.study.design import is_vessel_key
from sim.analysis.variants import apply_settings, render_toml, variant_vessel_data
from sim.engine.plant import water_properties
from sim.engine.spec import DisplacementHullSpec, SubmergedHullSpec, VesselSpec
from sim.flight import fly
from sim.io.checks import scenario_problems
from sim.io.files import (
    LoadedScenario,
    LoadedVessel,
    load_scenario,
    read_toml,
    validate_vessel_data,
)
from sim.io.seam import vessel_spec
from sim.physics import mass as pm
from sim.physics.battery import CELL_SETS
from sim.physics.magnets import NDFEB_GRADES

__all__ = [
    "TIMING_KEY",
    "Job",
    "PartsMass",
    "derived_outputs",
    "evaluate",
    "parts_mass",
    "quick_load",
    "split_settings",
]


TIMING_KEY = "_timing"
"""Key of a row, as :func:`evaluate` returns it, holding the seconds spent loading (``load_s``,
the mass model included) and flying (``fly_s``); the runner removes it before keeping the row."""


@dataclass(frozen=True)
class Job:
    """One variant to fly (plain data, picklable).

    Attributes
    ----------
    variant_id : identity hash of the settings
    scenario_path : base scenario file
    vessel_path : vessel file flown instead of the scenario's (None: the scenario's)
    settings : (dotted key, value) pairs, vessel and scenario keys alike, applied in order
    sample_s : sampling interval [s] overriding the scenario's (None: the scenario's)
    mass : the study's [mass] table as a dict (None: no mass model)
    """

    variant_id: str
    scenario_path: str
    vessel_path: str | None
    settings: tuple[tuple[str, object], ...]
    sample_s: float | None = None
    mass: dict | None = None


def split_settings(settings):
    """(vessel settings, scenario settings) of a variant, by the first part of each key."""
    v = tuple((k, x) for k, x in settings if is_vessel_key(k))
    s = tuple((k, x) for k, x in settings if not is_vessel_key(k))
    return v, s


def _stamp(path: str) -> tuple[int, int]:
    """(mtime in ns, size in bytes) of a file, so that a cached copy of an edited file is not
    used (0, 0 when it cannot be read: the loader then reports the problem)."""
    try:
        st = os.stat(path)
    except OSError:
        return (0, 0)
    return (st.st_mtime_ns, st.st_size)


@lru_cache(maxsize=8)
def _vessel_data_at(path: str, stamp: tuple[int, int]) -> dict:
    return variant_vessel_data(path)


@lru_cache(maxsize=8)
def _scenario_data_at(path: str, stamp: tuple[int, int]) -> dict:
    return read_toml(Path(path))[0]


def _vessel_data(path: str) -> dict:
    """The vessel file's data (``extends`` merged), read once per process while it is unchanged
    (callers copy before changing it: :func:`~sim.analysis.variants.apply_settings` does)."""
    return _vessel_data_at(path, _stamp(path))


def _scenario_data(path: str) -> dict:
    """The scenario file's data, read once per process while it is unchanged (do not change)."""
    return _scenario_data_at(path, _stamp(path))


def vessel_path_of(scenario_path: str, vessel_path: str | None) -> str:
    """The vessel file a variant starts from."""
    if vessel_path is not None:
        return str(vessel_path)
    data = _scenario_data(str(scenario_path))
    return str(Path(scenario_path).parent / data["scenario"]["vessel"])


def load_variant(
    scenario_path: str, vessel_path: str | None, settings, extra_vessel: tuple = ()
) -> LoadedScenario:
    """The variant as a validated scenario with its vessel (InputError on a bad value)."""
    vpath = vessel_path_of(scenario_path, vessel_path)
    vset, sset = split_settings(settings)
    vdata = apply_settings(_vessel_data(vpath), (*vset, *extra_vessel), f"variant ({vpath})")
    if not sset:
        return load_scenario(scenario_path, vessel_overrides=vdata, vessel_path=vpath)
    sdata = apply_settings(_scenario_data(str(scenario_path)), sset, f"variant ({scenario_path})")
    sdata = copy.deepcopy(sdata)
    sdata.setdefault("scenario", {})["vessel"] = str(Path(vpath).resolve())
    with tempfile.TemporaryDirectory(prefix="brinebolt-study-") as tmp:
        p = Path(tmp) / Path(scenario_path).name
        p.write_text(render_toml(sdata), encoding="utf-8")
        return load_scenario(p, vessel_overrides=vdata, vessel_path=vpath)


# ------------------------------------------------------------------ the quick load
#
# A study flies hundreds of variants of one scenario and one vessel. :func:`load_variant` reads
# and checks both files for each (and the mass model loads each variant twice). The quick load
# below reads the scenario once per process and per distinct set of scenario settings (with the
# base vessel: the scenario's own checks), and for each variant only applies the settings to the
# parsed vessel data, validates the vessel and runs the checks that pair the scenario with that
# vessel. Warnings are not worked out (a study keeps none). Anything it cannot do exactly like
# load_variant (a base that does not load, a variant that fails a check) is left to
# load_variant, so every error a variant's row holds is the one the full load gives.

_LEGACY_LOAD = False
"""True: every variant is loaded by :func:`load_variant` (the runner before the quick load; the
tests compare the two)."""


@dataclass(frozen=True)
class _ScenarioParts:
    """What every variant of a scenario (with given scenario settings) shares."""

    loaded: LoadedScenario
    data: dict
    file: str
    rho_kg_m3: float


_PARTS: dict[tuple, _ScenarioParts | None] = {}
_PARTS_MAX = 32


def _scenario_parts(scenario_path: str, vpath: str, sset: tuple) -> _ScenarioParts | None:
    """The scenario with its settings, loaded (and checked) with the base vessel; None when
    that load fails."""
    try:
        if not sset:
            loaded = load_scenario(scenario_path, vessel_path=vpath)
            data, file = read_toml(Path(scenario_path))[0], str(Path(scenario_path))
        else:
            sdata = apply_settings(
                _scenario_data(scenario_path), sset, f"variant ({scenario_path})"
            )
            sdata = copy.deepcopy(sdata)
            sdata.setdefault("scenario", {})["vessel"] = str(Path(vpath).resolve())
            with tempfile.TemporaryDirectory(prefix="brinebolt-study-") as tmp:
                p = Path(tmp) / Path(scenario_path).name
                p.write_text(render_toml(sdata), encoding="utf-8")
                loaded = load_scenario(p, vessel_path=vpath)
                data, file = read_toml(p)[0], str(p)
    except Exception:  # the full load reports it, variant by variant
        return None
    return _ScenarioParts(loaded, data, file, water_properties(loaded.water).rho_kg_m3)


def _parts_for(scenario_path: str, vpath: str, sset: tuple) -> _ScenarioParts | None:
    """:func:`_scenario_parts`, kept per process by file paths, their stamps and the settings."""
    try:
        # the settings as text: values may be tables (e.g. a leg's until); types stay distinct
        text = json.dumps([[k, v] for k, v in sset], sort_keys=True)
    except (TypeError, ValueError):
        return None
    key = (scenario_path, _stamp(scenario_path), vpath, _stamp(vpath), text)
    if key not in _PARTS:
        if len(_PARTS) >= _PARTS_MAX:
            _PARTS.clear()
        _PARTS[key] = _scenario_parts(scenario_path, vpath, sset)
    return _PARTS[key]


def quick_load(
    scenario_path: str, vessel_path: str | None, settings, extra_vessel: tuple = ()
) -> LoadedScenario:
    """The variant as :func:`load_variant` gives it, for flying (no warnings, no file texts),
    reading no file once the first variant has been loaded; falls back to load_variant (and
    its errors) whenever it cannot give the same."""
    if _LEGACY_LOAD:
        return load_variant(scenario_path, vessel_path, settings, extra_vessel)
    try:
        vpath = vessel_path_of(scenario_path, vessel_path)
        vset, sset = split_settings(settings)
        parts = _parts_for(str(scenario_path), vpath, sset)
        if parts is not None:
            vdata = apply_settings(
                _vessel_data(vpath), (*vset, *extra_vessel), f"variant ({vpath})"
            )
            vfile = validate_vessel_data(vdata, str(Path(vpath)))
            problems = scenario_problems(parts.loaded.spec, vfile, parts.data, parts.file)
            if not any(p.severity == "error" for p in problems):
                vessel = LoadedVessel(Path(vpath), "", vfile, vessel_spec(vfile))
                return dataclasses.replace(parts.loaded, vessel=vessel, text="", warnings=[])
    except Exception:  # the full load below raises the error the row records
        pass
    return load_variant(scenario_path, vessel_path, settings, extra_vessel)


def _rho(scenario_path: str, vessel_path: str | None, settings, loaded) -> float:
    """Density of the variant's water [kg/m³] (worked out once per scenario settings)."""
    if not _LEGACY_LOAD:
        try:
            vpath = vessel_path_of(scenario_path, vessel_path)
            parts = _parts_for(str(scenario_path), vpath, split_settings(settings)[1])
            if parts is not None and parts.loaded.water == loaded.water:
                return parts.rho_kg_m3
        except Exception:  # worked out below
            pass
    return water_properties(loaded.water).rho_kg_m3


# ------------------------------------------------------------------ mass model


@dataclass(frozen=True)
class PartsMass:
    """Mass of the parts the mass model sizes.

    Attributes
    ----------
    magnets_kg : magnets with yokes (permanent) or cryostats (superconducting), all units [kg]
    ducts_kg : duct walls and electrodes, all units [kg]
    pack_kg : battery pack [kg]
    outboard_volume_m3 : solid volume of the thrusters (outside the pressure hull) [m³]
    cryocooler_w : electrical input of the cryocoolers of superconducting magnets [W]
    """

    magnets_kg: float
    ducts_kg: float
    pack_kg: float
    outboard_volume_m3: float
    cryocooler_w: float

    @property
    def total_kg(self) -> float:
        return self.magnets_kg + self.ducts_kg + self.pack_kg


def parts_mass(vessel: VesselSpec, mass: dict) -> PartsMass:
    """The parts' mass of a vessel (engine spec, SI) under the study's [mass] settings."""
    magnets = ducts = volume = cryo = 0.0
    for th in vessel.thrusters:
        n = th.units
        d = pm.duct_mass(
            th.gap_m,
            th.pole_height_m,
            th.active_length_m,
            th.channels,
            wall_thickness_m=mass["duct_wall"],
            electrode_thickness_m=mass["electrode_plate"],
        )
        ducts += n * d.mass_kg
        volume += n * d.volume_m3
        mb = th.magnet_blocks
        if th.magnet == "permanent" and mb is not None:
            v = 2.0 * th.channels * mb.width_m * mb.length_m * mb.thickness_m
            magnets += n * v * pm.NDFEB_DENSITY_KG_M3
            volume += n * v
        elif th.magnet == "permanent" and th.field_t:
            grade = NDFEB_GRADES[(th.magnet_grade or mass["grade"]).upper()]
            size = pm.yoke_magnet_mass if mass["magnets"] == "yoke" else pm.blocks_magnet_mass
            m = size(
                th.field_t,
                grade.br_tesla,
                th.gap_m,
                th.pole_height_m,
                th.active_length_m,
                th.channels,
            )
            magnets += n * m.mass_kg
            volume += n * m.volume_m3
        elif th.magnet == "superconducting" and th.field_t:
            m = pm.superconducting_magnet_mass(
                th.field_t, th.channels * th.gap_m, th.pole_height_m, th.active_length_m
            )
            magnets += n * m.mass_kg
            volume += n * m.volume_m3
            cryo += n * m.cryocooler_power_w
    b = vessel.battery
    pack = pm.pack_mass_kg(
        b.series, b.parallel, CELL_SETS[b.cell].mass_kg, mass["packaging_factor"]
    )
    return PartsMass(magnets, ducts, pack, volume, cryo)


@lru_cache(maxsize=8)
def _base_parts(
    scenario_path: str, vessel_path: str | None, mass_items: tuple, stamps: tuple = ()
) -> PartsMass:
    """Parts of the vessel file as written (the design whose mass the file gives); ``stamps``
    (of both files) only key the cache, so that an edited file is read again."""
    loaded = load_variant(scenario_path, vessel_path, ())
    return parts_mass(loaded.vessel.vessel_spec, dict(mass_items))


def apply_mass_model(job: Job, loaded: LoadedScenario) -> tuple[LoadedScenario, dict]:
    """Reload the variant with the mass the model gives it; returns it and the mass outputs."""
    mass = job.mass or {}
    vpath = vessel_path_of(job.scenario_path, job.vessel_path)
    stamps = (_stamp(str(job.scenario_path)), _stamp(vpath))
    base = _base_parts(job.scenario_path, job.vessel_path, tuple(sorted(mass.items())), stamps)
    spec = loaded.vessel.vessel_spec
    parts = parts_mass(spec, mass)
    delta = parts.total_kg - base.total_kg
    rho = _rho(job.scenario_path, job.vessel_path, job.settings, loaded)
    hull = spec.hull
    extra: tuple = ()
    # the vessel mass written in the variant's own file (a setting of vessel.mass wins)
    m0 = spec.mass_kg
    if isinstance(hull, SubmergedHullSpec):
        trim = pm.submerged_body_trim(
            m0,
            delta,
            parts.outboard_volume_m3 - base.outboard_volume_m3,
            mass["trim_ballast"],
            rho,
        )
    elif isinstance(hull, DisplacementHullSpec):
        limit = mass.get("max_draft_change")
        trim = pm.displacement_hull_trim(
            m0,
            delta,
            hull.draft_m,
            hull.displaced_volume_m3,
            rho,
            math.inf if limit is None else limit,
        )
        if trim.in_trim:
            extra = (
                ("hull.draft", f"{trim.draft_m:.10g} m"),
                ("hull.displaced_volume", f"{trim.displaced_volume_m3:.10g} m^3"),
            )
    else:  # a tabulated hull: resistance does not follow the mass
        trim = pm.Trim(m0 + delta, math.nan, math.nan, math.nan, True)
    extra = (("vessel.mass", f"{trim.mass_kg:.10g} kg"), *extra)
    out = {
        "parts_mass_kg": parts.total_kg,
        "delta_mass_kg": delta,
        "total_mass_kg": trim.mass_kg,
        "magnet_mass_kg": parts.magnets_kg,
        "pack_mass_kg": parts.pack_kg,
        "trim_margin_kg": trim.margin_kg,
        "in_trim": 1.0 if trim.in_trim else 0.0,
    }
    return quick_load(job.scenario_path, job.vessel_path, job.settings, extra), out


# ------------------------------------------------------------------ outputs


def derived_outputs(summary: dict, vessel: VesselSpec) -> dict:
    """Outputs worked out from a run summary (see :data:`sim.io.study_schema.DERIVED_OUTPUTS`)."""
    hours = summary.get("duration_s", math.nan) / 3600.0
    per_h = (lambda x: x / hours) if hours > 0 else (lambda x: math.nan)
    h2 = summary.get("h2_total_mol", math.nan)
    cl2 = summary.get("cl2_total_mol", math.nan)
    o2 = summary.get("o2_total_mol", math.nan)
    limits = []
    for th in vessel.thrusters:
        grade = th.magnet_grade or (th.magnet_blocks.grade if th.magnet_blocks else None)
        if th.magnet == "permanent" and grade:
            limits.append(NDFEB_GRADES[grade.upper()].max_working_temp_c)
    peak = summary.get("peak_magnet_temperature_c", math.nan)
    return {
        "range_m": summary.get("distance_m", math.nan),
        "endurance_s": summary.get("duration_s", math.nan),
        "h2_mol_per_h": per_h(h2),
        "cl2_mol_per_h": per_h(cl2),
        "gas_mol_per_h": per_h(h2 + cl2 + o2),
        "magnet_margin_k": (min(limits) - peak) if limits else math.nan,
    }


def evaluate(job: Job) -> dict:
    """Fly one variant and return its row: ``variant_id``, ``ok``, ``error``,
    ``ending_reason``, ``ending_kind``, ``wall_time_s`` and ``outputs`` (every summary figure
    and derived output, floats). A failure of any kind is caught and returned as a row with
    its error (never raised), so one bad variant cannot end a study."""
    t0 = time.perf_counter()
    t_load = t_fly = math.nan
    row = {
        "variant_id": job.variant_id,
        "ok": False,
        "error": "",
        "ending_reason": "",
        "ending_kind": "",
        "outputs": {},
    }
    try:
        loaded = quick_load(job.scenario_path, job.vessel_path, job.settings)
        mass_out: dict = {}
        if job.mass is not None:
            loaded, mass_out = apply_mass_model(job, loaded)
        t_load = time.perf_counter()
        result = fly(loaded, sample_s=job.sample_s).result
        t_fly = time.perf_counter()
        summary = {k: v for k, v in result.summary.items() if k != "ending_reason"}
        outputs = {k: float(v) for k, v in summary.items()}
        outputs.update(derived_outputs(summary, loaded.vessel.vessel_spec))
        outputs.update(mass_out)
        row.update(
            ok=True,
            ending_reason=str(result.ending_reason),
            ending_kind=str(result.ending_kind),
            outputs=outputs,
        )
    except KeyboardInterrupt:
        raise
    except Exception as exc:  # a failed variant is a row with its error
        text = str(exc)
        problems = getattr(exc, "problems", None)
        if problems:
            text = "; ".join(f"{p.key} = {p.value!r}: {p.message}" for p in problems)
        row["error"] = f"{type(exc).__name__}: {text}" or "".join(
            traceback.format_exception_only(exc)
        )
    t1 = time.perf_counter()
    row["wall_time_s"] = t1 - t0
    # where the time went (the runner takes it off the row: it is not part of the table)
    row[TIMING_KEY] = {
        "load_s": (t1 if math.isnan(t_load) else t_load) - t0,
        "fly_s": 0.0 if math.isnan(t_fly) else t_fly - t_load,
    }
    return row
