"""``brinebolt run``: fly a scenario file with a progress bar, print the summary, the legs and the
safety cautions, and write the HDF5 log."""

from __future__ import annotations

import signal
import sys

from sim.analysis.units import OutputUnits
from sim.cli import options
from sim.cli.core import EXIT_LIMIT, EXIT_OK, Terminated, esc, print_problems, print_table
from sim.cli.output import TableOutput, add_format
from sim.io import budget
from sim.safety import (
    CAUTION_CURRENT,
    CAUTION_FIELD,
    CAUTIONS,
    DEFAULT_ENCLOSED_M3,
    run_flags,
)


def register(sub) -> None:
    """Add ``run`` to the subparsers."""
    r = sub.add_parser("run", help="fly a scenario file and write an HDF5 log")
    r.add_argument("scenario", help="scenario file (TOML)")
    options.add_out(
        r,
        "log file (default outputs/<scenario>.h5, or the first free <scenario>-2.h5, "
        "-3.h5, ... when that exists)",
    )
    r.add_argument("--sample", help='sampling interval, e.g. "1 s" (default from the scenario)')
    options.add_force(r, "replace an existing log (--out or the default)")
    r.add_argument(
        "--enclosed-volume",
        metavar="VOLUME",
        help='air volume for the electrolysis-gas caution, e.g. "10 m^3" (default 10 m^3)',
    )
    r.add_argument("--quiet", action="store_true", help="no progress bar or event lines")
    options.add_units(r)
    add_format(r)
    r.set_defaults(func=cmd_run)


def cmd_run(args) -> int:
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from sim import api
    from sim.engine.mission import RunObserver

    out = TableOutput(args, "run")
    con = out.messages
    sample = options.parse_time(args.sample, "--sample")
    volume = options.parse_positive(args.enclosed_volume, "--enclosed-volume", "volume", '"10 m^3"')
    options.check_log_out(args.out, args.force)
    loaded = api.load_scenario(args.scenario)
    budget.check_scenario(loaded, sample)  # --sample is held to the work limits too
    print_problems(loaded.warnings + loaded.vessel.warnings, con)

    class Bar(RunObserver):
        def __init__(self, progress, task):
            self.p, self.task = progress, task

        def progress(self, time_s, limit, wall):
            ctrl_c.check()
            self.p.update(self.task, completed=min(time_s, limit))

        def event(self, time_s, kind, leg, message):
            if kind in ("trigger", "stop", "schedule") and not args.quiet:
                self.p.console.print(f"  t = {time_s / 60:7.2f} min  {kind:8s} {esc(message)}")

    ctrl_c = CtrlC()
    with (
        ctrl_c,
        Progress(
            TextColumn("[bold]{task.description}"),
            BarColumn(),
            TextColumn("{task.percentage:>5.1f}% of time limit"),
            TimeElapsedColumn(),
            console=con,
            transient=True,
            disable=args.quiet,
        ) as progress,
    ):
        task = progress.add_task(
            f"flying {esc(loaded.spec.scenario.name)}", total=loaded.spec.limits.time
        )
        outcome = api.run_scenario(
            loaded, out=args.out, force=args.force, sample_s=sample, observer=Bar(progress, task)
        )
    print_summary(
        outcome, con, enclosed_volume_m3=volume or DEFAULT_ENCLOSED_M3, units=args.units, out=out
    )
    return EXIT_OK if outcome.result.ending_kind == "complete" else EXIT_LIMIT


class CtrlC:
    """Ctrl-C (SIGINT) and SIGTERM that cannot get lost.

    Python raises KeyboardInterrupt wherever the main thread happens to be; when that is a
    finaliser or weakref callback (h5py and numpy objects are freed all the time), the exception
    is printed as "ignored" and the run would go on. This handler raises it as usual and also
    remembers it, and the progress observer raises it again between integration segments.
    SIGTERM ends the run the same way with :class:`~sim.cli.core.Terminated` (ending reason
    "terminated (SIGTERM)", exit code 143)."""

    def __init__(self) -> None:
        self.hit: type[KeyboardInterrupt] | None = None
        self._old: dict = {}
        self._old_hook = None

    def _handler(self, signum, frame):
        self.hit = Terminated if signum == signal.SIGTERM else KeyboardInterrupt
        raise self.hit

    def check(self) -> None:
        if self.hit is not None:
            raise self.hit

    def _unraisable(self, info) -> None:
        if isinstance(info.exc_value, KeyboardInterrupt):
            # swallowed by a finaliser: raised again at the next check
            self.hit = self.hit or type(info.exc_value)
            return
        self._old_hook(info)

    def __enter__(self):
        try:
            for sig in (signal.SIGINT, signal.SIGTERM):
                self._old[sig] = signal.signal(sig, self._handler)
        except ValueError:  # not the main thread: leave signals alone
            return self
        self._old_hook, sys.unraisablehook = sys.unraisablehook, self._unraisable
        return self

    def __exit__(self, *exc) -> None:
        for sig, old in self._old.items():
            signal.signal(sig, old)
        if self._old_hook is not None:
            sys.unraisablehook = self._old_hook


def safety_flags(outcome, enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3) -> list[str]:
    """The caution lines a run's outcome calls for (:func:`sim.safety.run_flags` with the
    thruster fields of the vessel flown)."""
    thrusters = outcome.scenario.vessel.spec.thruster
    return run_flags(
        outcome.result.summary,
        [
            t.field if t.field is not None else float(outcome.result.series["field_t"][:, k].max())
            for k, t in enumerate(thrusters)
        ],
        superconducting=any(t.magnet == "superconducting" for t in thrusters),
        enclosed_volume_m3=enclosed_volume_m3,
    )


def print_summary(
    outcome,
    con,
    enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3,
    units: str | OutputUnits = "nautical",
    out: TableOutput | None = None,
) -> None:
    """The summary table, the leg table, the safety flags and cautions, and where the log is.

    The tables go to ``out`` (``--format``/``--output``) when given, else to ``con``."""
    from sim.analysis.tables import leg_data, summary_data

    r = outcome.result
    tables = (
        summary_data(
            r.summary,
            units,
            title=f"{outcome.scenario.spec.scenario.name} — {r.ending_reason}",
        ),
        leg_data(r.legs, units),
    )
    for t in tables:
        if out is None:
            print_table(con, t)
        else:
            out.table(t)
    if out is not None:
        out.close()
    flags = safety_flags(outcome, enclosed_volume_m3)
    for line in flags:
        style = "bold yellow" if "CAUTION" in line else "dim"
        con.print(f"[{style}]! {esc(line)}[/]")
    flagged = " ".join(flags)
    for c in CAUTIONS:  # the general reminders not already given with numbers above
        if (c is CAUTION_CURRENT and "high DC current" in flagged) or (
            c is CAUTION_FIELD and "strong magnetic field" in flagged
        ):
            continue
        con.print(f"[dim]! {esc(c)}[/]")
    if outcome.log_path is not None:
        con.print(
            f"log written to [bold]{esc(outcome.log_path)}[/] (wall time {r.wall_time_s:.2f} s)"
        )
