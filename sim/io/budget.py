"""How much work an input asks for, estimated before any of it starts.

A scenario file can ask for more than a machine can give: a 1 ns sample over 24 h is 86 million
million log rows, a 1 ns ``max_step`` as many integrator steps, tens of thousands of triggers are
watched at every step. The loaders refuse such a file up front (an :class:`InputError`, exit
code 2) with the figure, the limit and how to lift it, instead of running out of memory or
running for days. The command line uses the same limits for the sizes of its own grids
(:func:`grid_problem`: ``range-curve --points``, ``thruster-curves --grid``, ``versus --set``).

The limits and how to lift them
-------------------------------
=================  ============================  =====================================
figure             default limit                 raised by the environment variable
=================  ============================  =====================================
logged samples     200 000 (24 h at 0.5 s)        ``BRINEBOLT_MAX_SAMPLES``
integrator steps   2 000 000 (24 h at 0.05 s)     ``BRINEBOLT_MAX_STEPS``
legs               1 000                          ``BRINEBOLT_MAX_LEGS``
triggers           200                            ``BRINEBOLT_MAX_TRIGGERS``
schedule entries   1 000                          ``BRINEBOLT_MAX_SCHEDULE``
grid points        see :data:`GRID_LIMITS`        ``BRINEBOLT_MAX_GRID``
=================  ============================  =====================================

A scenario that means it sets ``[solver] allow_large = true``: every scenario limit above is then
lifted for that file (the run may need much memory and time). An environment variable holds a
positive whole number and replaces the default for every file and command.

The estimates are lower bounds of the work: samples = (longest mission time) ÷ sample interval,
integrator steps ≥ (longest mission time) ÷ max_step. The longest mission time is
``limits.time``, or the sum of the leg durations when every leg ends by a duration and no trigger
jumps back. The limits are project choices: a logged row costs a few kB in memory before the log
is written, and a right-hand-side evaluation of the coupled model takes some tens of µs.
"""

from __future__ import annotations

import math
import os
from dataclasses import dataclass
from typing import Any

from sim.io.problems import MISSING, InputError, Problem

__all__ = [
    "ALLOW_KEY",
    "GRID_LIMITS",
    "LIMITS",
    "Limit",
    "check_scenario",
    "grid_limit",
    "grid_problem",
    "limit_value",
    "mission_time_bound_s",
    "scenario_problems",
]

ALLOW_KEY = "solver.allow_large"
"""The scenario key that lifts the scenario limits for that file."""


@dataclass(frozen=True)
class Limit:
    """One limit on the work an input may ask for."""

    name: str
    """What is counted, in words (for messages)."""
    default: int
    """The limit when the environment does not set one."""
    env: str
    """Environment variable that sets another limit (a positive whole number)."""


LIMITS: dict[str, Limit] = {
    "samples": Limit("logged samples", 200_000, "BRINEBOLT_MAX_SAMPLES"),
    "steps": Limit("integrator steps", 2_000_000, "BRINEBOLT_MAX_STEPS"),
    "legs": Limit("legs", 1_000, "BRINEBOLT_MAX_LEGS"),
    "triggers": Limit("triggers", 200, "BRINEBOLT_MAX_TRIGGERS"),
    "schedule": Limit("schedule entries", 1_000, "BRINEBOLT_MAX_SCHEDULE"),
}
"""The limits on a scenario's work, by key."""

GRID_ENV = "BRINEBOLT_MAX_GRID"
"""Environment variable that sets the limit of every command-line grid at once."""

GRID_LIMITS: dict[str, int] = {
    "range-curve --points": 2_000,
    "thruster-curves --grid": 1_000_000,
    "versus --set": 256,
}
"""Largest grid each command-line option may ask for (project choices): a range-curve point is a
steady solve (some ms), a thruster-curves grid point a vectorised operating point (µs), a versus
variant a whole run."""


def limit_value(key: str) -> int:
    """The limit in force for ``key`` of :data:`LIMITS` (the environment's when it sets one)."""
    lim = LIMITS[key]
    return _env_int(lim.env, lim.default)


def _env_int(name: str, default: int) -> int:
    text = os.environ.get(name, "").strip().replace("_", "")
    if text.isdigit() and int(text) > 0:
        return int(text)
    return default


def _count(x: float) -> str:
    if not math.isfinite(x):
        return "unbounded"
    return f"{x:,.0f}" if x < 1e9 else f"{x:.3g}"


def _time(seconds: float) -> str:
    if seconds >= 3600:
        return f"{seconds / 3600:g} h"
    if seconds >= 60:
        return f"{seconds / 60:g} min"
    return f"{seconds:g} s"


def mission_time_bound_s(spec: Any) -> float:
    """The longest a mission can last [s]: ``limits.time``, or less when every leg ends by a
    duration and no trigger jumps (a goto can fly a leg again).

    ``spec`` is a validated scenario (:class:`sim.io.schema.ScenarioFile`)."""
    bound = float(spec.limits.time)
    durations = [leg.until.duration for leg in spec.leg]
    if all(d is not None for d in durations) and not any(t.then == "goto" for t in spec.trigger):
        bound = min(bound, float(sum(durations)))
    return bound


def scenario_problems(
    spec: Any, data: dict | None, file: str, *, sample_s: float | None = None
) -> list[Problem]:
    """The scenario's work limits it would exceed, as errors (none with ``allow_large``).

    Parameters
    ----------
    spec : sim.io.schema.ScenarioFile
        The validated scenario.
    data : dict or None
        Its parsed TOML (to show values as written).
    file : str
        The file name the problems show.
    sample_s : float, optional
        A sampling interval [s] that replaces the file's (``run --sample``); the problem then
        names the option instead of ``output.sample``.
    """
    if getattr(spec.solver, "allow_large", False):
        return []
    out: list[Problem] = []
    lift = (
        "set [solver] allow_large = true in the scenario to run it anyway (it may need much "
        "memory and time)"
    )

    def raw(key: str, fallback: Any) -> Any:
        node: Any = data
        for part in key.split("."):
            if not isinstance(node, dict) or part not in node:
                return fallback
            node = node[part]
        return node

    def over(key: str, figure: float, where: str, value: Any, how: str) -> None:
        lim = LIMITS[key]
        cap = limit_value(key)
        if figure > cap:
            out.append(
                Problem(
                    file,
                    where,
                    value,
                    f"asks for {_count(figure)} {lim.name} ({how}); allowed: at most "
                    f"{cap:,} {lim.name}; {lift}, or raise the limit with the environment "
                    f"variable {lim.env}",
                )
            )

    t_end = mission_time_bound_s(spec)
    sample = float(spec.output.sample) if sample_s is None else float(sample_s)
    if sample_s is None:
        where, value = "output.sample", raw("output.sample", sample)
    else:
        where, value = "--sample", f"{sample:g} s"
    over("samples", t_end / sample, where, value, f"{_time(t_end)} ÷ {sample:g} s")
    max_step = float(spec.solver.max_step)
    over(
        "steps",
        t_end / max_step,
        "solver.max_step",
        raw("solver.max_step", max_step),
        f"at least {_time(t_end)} ÷ {max_step:g} s",
    )
    over("legs", len(spec.leg), "leg", MISSING, "one per [[leg]]")
    over("triggers", len(spec.trigger), "trigger", MISSING, "one per [[trigger]]")
    over("schedule", len(spec.schedule), "schedule", MISSING, "one per [[schedule]]")
    return out


def check_scenario(loaded: Any, sample_s: float | None = None) -> None:
    """Raise :class:`InputError` when a loaded scenario, flown with ``sample_s`` instead of its
    own sampling interval, would exceed a work limit (for ``run --sample``, ``versus --sample``;
    the loaders already check the file's own interval).

    ``loaded`` is a :class:`sim.io.files.LoadedScenario`."""
    if sample_s is None:
        return
    problems = scenario_problems(loaded.spec, None, str(loaded.path), sample_s=sample_s)
    if problems:
        raise InputError(problems)


def grid_limit(option: str) -> int:
    """The largest grid ``option`` (a key of :data:`GRID_LIMITS`) may ask for."""
    return _env_int(GRID_ENV, GRID_LIMITS[option])


def grid_problem(option: str, points: float, how: str = "") -> str | None:
    """Why a grid of ``points`` points is refused for a command-line ``option`` (a key of
    :data:`GRID_LIMITS`), or None when it is within the limit.

    ``how`` says how the number came about (e.g. ``"3 gaps × 4 fields"``)."""
    cap = grid_limit(option)
    if points <= cap:
        return None
    shown = f" ({how})" if how else ""
    return (
        f"{option} asks for {_count(points)} points{shown}; allowed: at most {cap:,}; raise the "
        f"limit with the environment variable {GRID_ENV}"
    )
