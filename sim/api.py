"""The Python face of brinebolt: everything the command line does, as documented calls.

>>> from sim import api
>>> outcome = api.run_scenario("scenarios/glasswort-survey.toml", out="outputs/demo.h5")
>>> outcome.result.summary["distance_m"]                     # doctest: +SKIP
>>> log = api.read_log(outcome.log_path); df = log.to_dataframe()  # doctest: +SKIP
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from sim.engine.mission import RunObserver, RunResult
from sim.engine.plant import build_plant
from sim.engine.spec import Water
from sim.engine.steady import SteadyPoint, steady_at_speed
from sim.flight import fly, plant_for
from sim.io.files import InputError, LoadedScenario, check_file, load_scenario, load_vessel
from sim.io.log import incomplete_path_for, read_log

if TYPE_CHECKING:  # imported on first use by __getattr__ below (start-up time)
    from sim.analysis.study import LoadedStudy, StudyResult, load_study, run_study
    from sim.analysis.study.figures import study_figures

__all__ = [
    "InputError",
    "LoadedStudy",
    "RunOutcome",
    "StudyResult",
    "build_plant",
    "check_file",
    "default_log_path",
    "free_log_path",
    "load_scenario",
    "load_study",
    "load_vessel",
    "operating_table",
    "plant_for",
    "read_log",
    "read_study_table",
    "run_scenario",
    "run_study",
    "study_figures",
]


@dataclass(frozen=True)
class RunOutcome:
    result: RunResult
    log_path: Path | None
    scenario: LoadedScenario


def default_log_path(scenario: LoadedScenario, out_dir: str | Path = "outputs") -> Path:
    """``outputs/<scenario file stem>.h5``."""
    return Path(out_dir) / f"{scenario.path.stem}.h5"


def free_log_path(path: str | Path) -> Path:
    """``path`` if neither it nor its in-progress file (``*.incomplete.h5``) exists, else the
    first free ``<stem>-2.h5``, ``<stem>-3.h5``, ... beside it."""
    path = Path(path)
    candidate, n = path, 1
    while candidate.exists() or incomplete_path_for(candidate).exists():
        n += 1
        candidate = path.with_name(f"{path.stem}-{n}{path.suffix}")
    return candidate


def run_scenario(
    scenario: str | Path | LoadedScenario,
    *,
    out: str | Path | None = None,
    write_log: bool = True,
    force: bool = False,
    sample_s: float | None = None,
    observer: RunObserver | None = None,
    created_utc: str | None = None,
) -> RunOutcome:
    """Fly a scenario and (by default) write its HDF5 log.

    Parameters
    ----------
    scenario : path or LoadedScenario
    out : path, optional
        Log file; default ``outputs/<scenario stem>.h5``, or when that exists (and ``force`` is
        not given) the first free ``outputs/<scenario stem>-2.h5``, ``-3.h5``, ...
    force : bool
        Replace an existing log. Without it an existing ``out`` raises
        :class:`~sim.io.log.LogExistsError`.
    sample_s : float, optional
        Sampling interval [s] overriding the scenario's ``output.sample``.
    observer : RunObserver, optional
        Receives samples, events, legs and progress (e.g. a progress bar).
    created_utc : str, optional
        Fix the creation-time attribute (for reproducibility checks).

    Raises
    ------
    InputError
        When a file is invalid (every problem listed).
    SolverFailure
        When the run fails numerically; it names the time, leg and state, and its attribute
        ``partial_log`` is the path of the incomplete log kept on disk (None without a log).
    KeyboardInterrupt
        Passed on after the incomplete log was written (attribute ``partial_log`` as above).
    """
    loaded = scenario if isinstance(scenario, LoadedScenario) else load_scenario(scenario)
    log_path = None
    if write_log:
        if out is not None:
            log_path = Path(out)
        else:
            log_path = default_log_path(loaded)
            if not force:
                log_path = free_log_path(log_path)
    flight = fly(
        loaded,
        log_path=log_path,
        overwrite=force,
        sample_s=sample_s,
        observer=observer,
        created_utc=created_utc,
    )
    return RunOutcome(result=flight.result, log_path=flight.log_path, scenario=loaded)


def operating_table(
    vessel: str | Path,
    speeds_m_s,
    *,
    salinity: float = 35.0,
    temperature_c: float = 15.0,
    depth_m: float = 0.0,
    soc: float = 1.0,
) -> list[SteadyPoint]:
    """Steady operating points of a vessel file over a list of speeds through water."""
    v = load_vessel(vessel)
    plant = build_plant(
        v.vessel_spec, Water(salinity=salinity, temperature_c=temperature_c, depth_m=depth_m)
    )
    out = []
    for s in speeds_m_s:
        out.append(steady_at_speed(plant, float(s), soc=soc))
    return out


def read_study_table(path: str | Path) -> list[dict]:
    """The rows of a study's results table (one dict of columns per variant; see
    :mod:`sim.analysis.study.store` for the layout, which pandas and xarray read directly)."""
    from sim.analysis.study import read_table  # lazy: scipy.stats/pymoo cost ≈1 s at start-up

    return read_table(path)


_STUDY_NAMES = {
    "LoadedStudy": "sim.analysis.study",
    "StudyResult": "sim.analysis.study",
    "load_study": "sim.analysis.study",
    "run_study": "sim.analysis.study",
    "study_figures": "sim.analysis.study.figures",
}


def __getattr__(name: str):
    """run_study(path, out=..., jobs=..., cluster=..., csv=...) -> StudyResult, load_study(path)
    and study_figures(result) -> {name: Figure}, re-exported from :mod:`sim.analysis.study` on
    first use, so that ``import sim.api`` (every run) does not pay for SciPy's statistics and
    the optimisers."""
    if name in _STUDY_NAMES:
        import importlib

        return getattr(importlib.import_module(_STUDY_NAMES[name]), name)
    raise AttributeError(f"module 'sim.api' has no attribute {name!r}")
