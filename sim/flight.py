"""Fly a loaded scenario with observers and its HDF5 log.

The layer between the files and the engine below (:mod:`sim.io`, :mod:`sim.engine`) and their
users above: the Python face (:func:`sim.api.run_scenario`) and the analysis
(:mod:`sim.analysis.variants`). It builds the plant, runs the mission, streams the samples,
events and legs into a :class:`~sim.io.log.RunLogWriter` with the run's provenance, writes the
summary, and on a failure or an interrupt keeps the incomplete log and says where it is.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from pathlib import Path

from sim.engine.mission import MissionRunner, RunObserver, RunResult, channel_specs
from sim.engine.plant import Plant, build_plant
from sim.engine.summary import OPTIONAL_SUMMARY_UNITS, SUMMARY_UNITS
from sim.io.files import LoadedScenario
from sim.io.log import LogWriteError, RunLogWriter

__all__ = ["Flight", "fly", "plant_for"]


@dataclass(frozen=True)
class Flight:
    """What flying a scenario produced.

    Attributes
    ----------
    result : the run, in memory
    log_path : the finished HDF5 log (None when no log was written)
    """

    result: RunResult
    log_path: Path | None


class _LogObserver(RunObserver):
    """Writes what the run produces to the log, then hands it on to the caller's observer."""

    def __init__(self, writer: RunLogWriter, inner: RunObserver | None) -> None:
        self.w, self.inner = writer, inner or RunObserver()

    def samples(self, columns):
        self.w.append(columns)
        self.w.maybe_flush()
        self.inner.samples(columns)

    def event(self, time_s, kind, leg, message):
        self.w.add_event(time_s, kind, leg, message)
        self.inner.event(time_s, kind, leg, message)

    def leg(self, record):
        self.w.add_leg(**record)
        self.inner.leg(record)

    def progress(self, time_s, time_limit_s, wall_s):
        self.inner.progress(time_s, time_limit_s, wall_s)


def plant_for(scenario: LoadedScenario) -> Plant:
    """The plant of a loaded scenario: its vessel in its water."""
    return build_plant(scenario.vessel.vessel_spec, scenario.water)


def _provenance(loaded: LoadedScenario, runner: MissionRunner) -> dict[str, str]:
    """The log's provenance attributes: both input files (path and text), the solver settings
    and the names."""
    return {
        "scenario_path": str(loaded.path),
        "scenario_text": loaded.text,
        "vessel_path": str(loaded.vessel.path),
        "vessel_text": loaded.vessel.text,
        "solver": json.dumps(
            {
                "method": runner.method,
                "rtol": runner.rtol,
                "max_step_s": runner.max_step,
                "sample_s": runner.sample_s,
            },
            sort_keys=True,
        ),
        "scenario_name": loaded.spec.scenario.name,
        "vessel_name": loaded.vessel.spec.vessel.name,
    }


def fly(
    loaded: LoadedScenario,
    *,
    log_path: str | Path | None = None,
    overwrite: bool = False,
    sample_s: float | None = None,
    observer: RunObserver | None = None,
    created_utc: str | None = None,
) -> Flight:
    """Fly a loaded scenario and, when ``log_path`` is given, write its HDF5 log there.

    Parameters
    ----------
    loaded : LoadedScenario
        A validated scenario with its vessel (:func:`sim.io.files.load_scenario`).
    log_path : path, optional
        The log file (its folder is created); None writes no log.
    overwrite : bool
        Replace an existing log; without it an existing one raises
        :class:`~sim.io.log.LogExistsError`.
    sample_s : float, optional
        Sampling interval [s] overriding the scenario's ``output.sample``.
    observer : RunObserver, optional
        Receives samples, events, legs and progress (after the log has them).
    created_utc : str, optional
        Fix the log's creation-time attribute (for reproducibility checks).

    Returns
    -------
    Flight

    Raises
    ------
    SolverFailure
        When the run fails numerically; its attribute ``partial_log`` is the path of the
        incomplete log kept on disk (None without a log).
    KeyboardInterrupt
        Passed on after the incomplete log was written (attribute ``partial_log`` as above).
    """
    plant = plant_for(loaded)
    runner = MissionRunner(plant, loaded.mission_spec, sample_s=sample_s, observer=None)
    writer = None
    if log_path is not None:
        log_path = Path(log_path)
        log_path.parent.mkdir(parents=True, exist_ok=True)
        writer = RunLogWriter(
            log_path,
            overwrite=overwrite,
            channel_specs=channel_specs(plant),
            columns=[u.name for u in plant.thrusters],
            created_utc=created_utc,
            provenance=_provenance(loaded, runner),
        )
        runner.obs = _LogObserver(writer, observer)
    elif observer is not None:
        runner.obs = observer
    try:
        result = runner.run()
        if writer is not None:
            units = {**SUMMARY_UNITS, **OPTIONAL_SUMMARY_UNITS}
            writer.set_summary(
                result.summary, {k: v for k, v in units.items() if v and k in result.summary}
            )
            log_path = writer.close(result.ending_reason)
    except BaseException as exc:
        if writer is not None and not isinstance(exc, LogWriteError):
            # a write failure already kept (and marked if it could) the last good snapshot
            why = "interrupted" if isinstance(exc, KeyboardInterrupt) else "failed"
            given = getattr(exc, "ending_reason", None)  # e.g. "terminated (SIGTERM)"
            text = (
                given if isinstance(given, str) and given else f"{why}: {type(exc).__name__}: {exc}"
            )
            try:
                exc.partial_log = writer.abort(text if len(text) <= 2000 else text[:1997] + "...")
            except LogWriteError as exc2:  # the original error matters more
                exc.partial_log = exc2.kept
                exc.log_marked = exc2.marked
            except Exception:
                exc.partial_log = writer.incomplete_path
                exc.log_marked = False
        raise
    return Flight(result=result, log_path=log_path)
