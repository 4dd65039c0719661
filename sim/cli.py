"""The ``brinebolt`` command.

Exit codes
----------
0  the mission was completed (or the command succeeded)
2  bad input: a file, key, value or option is wrong (every problem is listed)
3  the mission ended early because a limit or trigger stopped it
4  numerical failure (the solver or a model found no solution); the partial log is kept
1  internal error (a bug in brinebolt; ``--debug`` shows the traceback)
130 interrupted (Ctrl-C); the partial log is kept

No traceback is shown for a user error; ``brinebolt --debug COMMAND ...`` shows it for any error.
"""

from __future__ import annotations

import argparse
import sys
import traceback

EXIT_OK, EXIT_INPUT, EXIT_LIMIT, EXIT_NUMERIC, EXIT_INTERRUPT = 0, 2, 3, 4, 130
EXIT_BUG = 1

HIGH_CURRENT_A = 100.0
"""Peak thruster current [A] above which the run summary flags high DC current in the water
(project choice: far above what a person in the water may meet without harm)."""

STRONG_FIELD_T = 0.5
"""Thruster field [T] at or above which the run summary flags the strong field for people with
implants (project choice; the stray field is far weaker than the gap field, but at such gap
fields it exceeds the 0.5 mT limit commonly applied to pacemaker wearers well outside the
thruster, from memory: ACGIH static-field TLV)."""

CAUTION_GAS = (
    "Electrolysis of seawater releases hydrogen (flammable 4–75 % in air) and chlorine (toxic; "
    "NIOSH REL 0.5 ppm ceiling, IDLH 10 ppm): ventilate, never enclose the outlet gas."
)
CAUTION_CURRENT = (
    "High DC currents in water can injure or kill: keep people out of the water near energised "
    "electrodes and isolate before handling."
)
CAUTION_FIELD = "Strong magnetic fields attract tools and affect pacemakers and implants."
CAUTION_CODES = (
    "This tool is an engineering estimate. Follow local codes and licensed practice for any "
    "real craft."
)
CAUTIONS = (CAUTION_GAS, CAUTION_CURRENT, CAUTION_FIELD, CAUTION_CODES)


def _console(stderr: bool = False):
    from rich.console import Console

    return Console(stderr=stderr, highlight=False)


def _print_problems(problems, console) -> None:
    """One line per problem (never wrapped, so each line names file, key, value and rule)."""
    errors = [p for p in problems if p.severity == "error"]
    warns = [p for p in problems if p.severity != "error"]
    for p in errors:
        console.print(f"[bold red]error[/]   {_esc(str(p))}", soft_wrap=True)
    for p in warns:
        console.print(f"[yellow]warning[/] {_esc(str(p))}", soft_wrap=True)


def _esc(text: str) -> str:
    from rich.markup import escape

    return escape(text)


def _parse_positive(text: str | None, what: str, kind: str, example: str) -> float | None:
    """A positive quantity given on the command line, in SI, or None when not given."""
    if text is None:
        return None
    from sim.io.units import UnitParseError, to_si

    try:
        value = to_si(text, kind)
    except UnitParseError as exc:
        raise _OptionError(f"option {what} = {text!r}: {exc}") from None
    if not value > 0:
        raise _OptionError(
            f"option {what} = {text!r}: not positive; allowed: a positive {kind}, e.g. {example}"
        )
    return value


def _parse_time(text: str | None, what: str) -> float | None:
    return _parse_positive(text, what, "time", '"5 s"')


def _check_out(out: str | None, force: bool) -> None:
    """Refuse an --out that cannot be a log file before anything is run."""
    if out is None:
        return
    from pathlib import Path

    from sim.io.log import incomplete_path_for

    path = Path(out)
    if path.is_dir():
        raise _OptionError(f"option --out = {out!r} is a folder; allowed: a file path, e.g. run.h5")
    if path.name.endswith((".incomplete.h5", ".tmp")):
        raise _OptionError(
            f"option --out = {out!r}: names ending in .incomplete.h5 or .tmp are kept for "
            "in-progress logs; allowed: another name, e.g. run.h5"
        )
    if not force:
        for p in (path, incomplete_path_for(path)):
            if p.exists():
                raise _OptionError(
                    f"{p} already exists; nothing was run. Use --force to replace it, or choose "
                    "another --out (without --out, brinebolt picks a free name in outputs/)"
                )


class _OptionError(Exception):
    pass


# ---------------------------------------------------------------------------- commands


def cmd_run(args) -> int:
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from sim import api
    from sim.engine.mission import RunObserver

    console = _console()
    sample = _parse_time(args.sample, "--sample")
    volume = _parse_positive(args.enclosed_volume, "--enclosed-volume", "volume", '"10 m^3"')
    _check_out(args.out, args.force)
    loaded = api.load_scenario(args.scenario)
    _print_problems(loaded.warnings + loaded.vessel.warnings, console)

    class Bar(RunObserver):
        def __init__(self, progress, task):
            self.p, self.task = progress, task

        def progress(self, time_s, limit, wall):
            ctrl_c.check()
            self.p.update(self.task, completed=min(time_s, limit))

        def event(self, time_s, kind, leg, message):
            if kind in ("trigger", "stop", "schedule") and not args.quiet:
                self.p.console.print(f"  t = {time_s / 60:7.2f} min  {kind:8s} {_esc(message)}")

    ctrl_c = _CtrlC()
    with (
        ctrl_c,
        Progress(
            TextColumn("[bold]{task.description}"),
            BarColumn(),
            TextColumn("{task.percentage:>5.1f}% of time limit"),
            TimeElapsedColumn(),
            console=console,
            transient=True,
            disable=args.quiet,
        ) as progress,
    ):
        task = progress.add_task(
            f"flying {loaded.spec.scenario.name}", total=loaded.spec.limits.time
        )
        outcome = api.run_scenario(
            loaded, out=args.out, force=args.force, sample_s=sample, observer=Bar(progress, task)
        )
    _print_summary(outcome, console, enclosed_volume_m3=volume or DEFAULT_ENCLOSED_M3)
    return EXIT_OK if outcome.result.ending_kind == "complete" else EXIT_LIMIT


class _CtrlC:
    """Ctrl-C that cannot get lost.

    Python raises KeyboardInterrupt wherever the main thread happens to be; when that is a
    finaliser or weakref callback (h5py and numpy objects are freed all the time), the exception
    is printed as "ignored" and the run would go on. This handler raises it as usual and also
    remembers it, and the progress observer raises it again between integration segments."""

    def __init__(self) -> None:
        self.hit = False
        self._old = None
        self._old_hook = None

    def _handler(self, signum, frame):
        self.hit = True
        raise KeyboardInterrupt

    def check(self) -> None:
        if self.hit:
            raise KeyboardInterrupt

    def _unraisable(self, info) -> None:
        if isinstance(info.exc_value, KeyboardInterrupt):
            self.hit = True  # swallowed by a finaliser: raised again at the next check
            return
        self._old_hook(info)

    def __enter__(self):
        import signal

        try:
            self._old = signal.signal(signal.SIGINT, self._handler)
        except ValueError:  # not the main thread: leave signals alone
            self._old = None
            return self
        self._old_hook, sys.unraisablehook = sys.unraisablehook, self._unraisable
        return self

    def __exit__(self, *exc) -> None:
        import signal

        if self._old is not None:
            signal.signal(signal.SIGINT, self._old)
            sys.unraisablehook = self._old_hook


DEFAULT_ENCLOSED_M3 = 10.0
"""Enclosed air volume [m³] for the gas caution when --enclosed-volume is not given."""


def safety_flags(outcome, enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3) -> list[str]:
    """The caution lines a run's results call for: the gas made (and what it would mean in an
    enclosed space of the given volume), high DC current in the water and strong fields."""
    from sim.io.present import gas_caution

    r = outcome.result
    lines = [gas_caution(r.summary, enclosed_volume_m3)]
    amps = float(r.summary.get("peak_thruster_current_a", 0.0))
    if amps > HIGH_CURRENT_A:
        lines.append(
            f"CAUTION high DC current: up to {amps:,.0f} A flowed through the water at the "
            f"electrodes (flagged above {HIGH_CURRENT_A:g} A). Keep people and divers out of the "
            "water near energised electrodes; isolate and lock out before handling."
        )
    fields = [t.field for t in outcome.scenario.vessel.spec.thruster]
    if fields and max(fields) >= STRONG_FIELD_T:
        lines.append(
            f"CAUTION strong magnetic field: {max(fields):g} T in the thruster gaps (flagged at "
            f"{STRONG_FIELD_T:g} T and above). Keep people with pacemakers or other implants "
            "away, and loose steel and tools clear."
            + (
                " Superconducting magnets can quench."
                if any(t.magnet == "superconducting" for t in outcome.scenario.vessel.spec.thruster)
                else ""
            )
        )
    return lines


def _print_summary(outcome, console, enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3) -> None:
    from rich.table import Table

    from sim.io.present import summary_rows

    r = outcome.result
    t = Table(
        title=f"{outcome.scenario.spec.scenario.name} — {r.ending_reason}",
        show_header=False,
        title_justify="left",
    )
    t.add_column("quantity")
    t.add_column("value", justify="right")
    for k, v in summary_rows(r.summary):
        t.add_row(k, v)
    console.print(t)
    legs = Table(title="legs", title_justify="left")
    for col in ("leg", "start min", "end min", "distance km", "energy Wh", "mean kn", "ended by"):
        legs.add_column(col, justify="left" if col in ("leg", "ended by") else "right")
    for leg in r.legs:
        legs.add_row(
            leg["name"],
            f"{leg['t_start_s'] / 60:.1f}",
            f"{leg['t_end_s'] / 60:.1f}",
            f"{leg['distance_m'] / 1000:.3f}",
            f"{leg['energy_j'] / 3600:.1f}",
            f"{leg['mean_speed_m_s'] / 0.514444:.2f}",
            _esc(leg["ending"]),
        )
    console.print(legs)
    flags = safety_flags(outcome, enclosed_volume_m3)
    for line in flags:
        style = "bold yellow" if "CAUTION" in line else "dim"
        console.print(f"[{style}]! {_esc(line)}[/]")
    flagged = " ".join(flags)
    for c in CAUTIONS:  # the general reminders not already given with numbers above
        if (c is CAUTION_CURRENT and "high DC current" in flagged) or (
            c is CAUTION_FIELD and "strong magnetic field" in flagged
        ):
            continue
        console.print(f"[dim]! {_esc(c)}[/]")
    if outcome.log_path is not None:
        console.print(
            f"log written to [bold]{_esc(str(outcome.log_path))}[/] "
            f"(wall time {r.wall_time_s:.2f} s)"
        )


def cmd_check(args) -> int:
    from sim.io.files import InputError, check_file

    console = _console()
    status = EXIT_OK
    for f in args.files:
        try:
            kind, warnings = check_file(f)
        except InputError as exc:
            _print_problems(exc.problems, console)
            console.print(
                f"[bold red]failed[/]  {_esc(f)}: {len(exc.problems)} problem(s)", soft_wrap=True
            )
            status = EXIT_INPUT
            continue
        _print_problems(warnings, console)
        console.print(
            f"[green]ok[/]      {_esc(f)} is a valid {kind} file"
            + (f" ({len(warnings)} warning(s))" if warnings else ""),
            soft_wrap=True,
        )
    return status


def cmd_steady(args) -> int:
    from rich.table import Table

    from sim import api
    from sim.engine.steady import SteadyError
    from sim.io.units import UnitParseError, to_si

    console = _console()
    try:
        speeds = [to_si(s.strip(), "speed") for s in args.speeds.split(",")]
        temp = to_si(args.temperature, "temperature")
    except UnitParseError as exc:
        raise _OptionError(f"option --speeds/--temperature: {exc}") from None
    vessel = api.load_vessel(args.vessel)
    _print_problems(vessel.warnings, console)
    from sim.engine.plant import build_plant
    from sim.engine.spec import Water
    from sim.engine.steady import steady_at_speed

    plant = build_plant(vessel.vessel_spec, Water(salinity=args.salinity, temperature_c=temp))
    w = plant.water
    t = Table(
        title=f"{vessel.spec.vessel.name}: steady operating points in water of "
        f"SP {w.sp:g}, {w.t_c:g} °C (σ = {w.sigma_s_m:.3f} S/m)",
        title_justify="left",
    )
    cols = [
        "speed kn",
        "speed m/s",
        "thrust N",
        "volts V",
        "current A",
        "thruster kW",
        "pack kW",
        "η elec",
        "η prop",
        "η overall",
        "duct ΔT K",
        "H₂ L/h",
        "Cl₂ g/h",
        "note",
    ]
    for c in cols:
        t.add_column(c, justify="right")
    notes: list[str] = []
    for v in speeds:
        try:
            p = steady_at_speed(plant, v)
        except SteadyError as exc:
            t.add_row(f"{v / 0.514444:.2f}", f"{v:.3f}", *(["—"] * 11), "out of reach")
            notes.append(f"{v / 0.514444:.2f} kn: {exc}")
            continue
        h2_l_h = p.h2_mol_s * 3600 * 0.0244654 * 1000  # ideal gas at 25 °C, 1 atm [L/mol]
        cl2_g_h = p.cl2_mol_s * 3600 * 70.906
        t.add_row(
            f"{v / 0.514444:.2f}",
            f"{v:.3f}",
            f"{p.thrust_n:.1f}",
            f"{p.thruster_voltage_v:.2f}",
            f"{p.thruster_current_a:.1f}",
            f"{p.thruster_power_w / 1000:.3f}",
            f"{p.pack_power_w / 1000:.3f}",
            f"{p.electrical_efficiency:.4f}",
            f"{p.propulsive_efficiency:.3f}",
            f"{p.overall_efficiency:.4f}",
            f"{p.duct_rise_k:.3f}",
            f"{h2_l_h:.1f}",
            f"{cl2_g_h:.1f}",
            "" if p.feasible else "pack short",
        )
    console.print(t)
    for n in notes:
        console.print(f"[yellow]note[/] {_esc(n)}")
    for c in CAUTIONS:
        console.print(f"[dim]! {_esc(c)}[/]")
    return EXIT_OK


# ---------------------------------------------------------------------------- entry point


def build_parser() -> argparse.ArgumentParser:
    from sim import __version__

    ap = argparse.ArgumentParser(
        prog="brinebolt",
        description="Time-domain propulsion simulator for seawater MHD-thruster vessels.",
        epilog="Exit codes: 0 done, 2 bad input, 3 mission ended early by a limit, "
        "4 numerical failure (partial log kept), 130 interrupted (partial log kept), "
        "1 internal error.",
    )
    ap.add_argument("--version", action="version", version=f"brinebolt {__version__}")
    ap.add_argument("--debug", action="store_true", help="show Python tracebacks on errors")
    sub = ap.add_subparsers(dest="command", required=True, metavar="COMMAND")

    r = sub.add_parser("run", help="fly a scenario file and write an HDF5 log")
    r.add_argument("scenario", help="scenario file (TOML)")
    r.add_argument(
        "--out",
        help="log file (default outputs/<scenario>.h5, or the first free <scenario>-2.h5, "
        "-3.h5, ... when that exists)",
    )
    r.add_argument("--sample", help='sampling interval, e.g. "1 s" (default from the scenario)')
    r.add_argument(
        "--force", action="store_true", help="replace an existing log (--out or the default)"
    )
    r.add_argument(
        "--enclosed-volume",
        metavar="VOLUME",
        help='air volume for the electrolysis-gas caution, e.g. "10 m^3" (default 10 m^3)',
    )
    r.add_argument("--quiet", action="store_true", help="no progress bar or event lines")
    r.set_defaults(func=cmd_run)

    c = sub.add_parser("check", help="validate vessel or scenario files; list every problem")
    c.add_argument("files", nargs="+")
    c.set_defaults(func=cmd_check)

    s = sub.add_parser("steady", help="steady operating-point table of a vessel over speeds")
    s.add_argument("vessel", help="vessel file (TOML)")
    s.add_argument(
        "--speeds",
        default="0.5 kn,1 kn,1.5 kn,2 kn,2.5 kn,3 kn",
        help='comma-separated speeds through water, e.g. "1 kn,2 kn,1.5 m/s"',
    )
    s.add_argument("--salinity", type=float, default=35.0, help="practical salinity (PSS-78)")
    s.add_argument("--temperature", default="15 degC", help='water temperature, e.g. "12 degC"')
    s.set_defaults(func=cmd_steady)

    from sim.analysis import commands as analysis_commands

    analysis_commands.register(sub)
    return ap


def main(argv: list[str] | None = None) -> int:
    """Run the command line and return the exit code (see the module docstring)."""
    ap = build_parser()
    try:
        args = ap.parse_args(argv)
    except SystemExit as exc:  # argparse printed usage (code 2) or --help/--version (code 0)
        return exc.code if isinstance(exc.code, int) else EXIT_INPUT
    try:
        return int(args.func(args))
    except (KeyboardInterrupt, Exception) as exc:
        err = _console(stderr=True)
        code = _report(exc, err)
        if args.debug:
            err.file.flush()
            traceback.print_exception(exc)
        return code


def _report(exc: BaseException, err) -> int:
    """Tell the user what went wrong (no traceback) and return the exit code."""
    from pydantic import ValidationError

    from sim.engine.mission import SolverFailure
    from sim.io.files import InputError
    from sim.io.log import LogDataError, LogExistsError
    from sim.physics.errors import ModelRangeError

    def say(text: str) -> None:
        err.print(text, soft_wrap=True)

    if isinstance(exc, InputError):
        _print_problems(exc.problems, err)
        say(f"[bold red]{len(exc.problems)} problem(s); nothing was run.[/]")
        return EXIT_INPUT
    if isinstance(exc, _OptionError | LogExistsError):
        say(f"[bold red]error[/] {_esc(str(exc))}")
        return EXIT_INPUT
    if isinstance(exc, ValidationError):  # an option value handed to a file model (--salinity)
        for e in exc.errors():
            where = ".".join(str(x) for x in e["loc"])
            say(f"[bold red]error[/] option value for {_esc(where)}: {_esc(e['msg'])}")
        return EXIT_INPUT
    if isinstance(exc, ModelRangeError):
        say(f"[bold red]error[/] a model input is out of range: {_esc(str(exc))}")
        return EXIT_INPUT
    if isinstance(exc, SolverFailure | LogDataError):
        say(f"[bold red]numerical failure[/] {_esc(str(exc))}")
        say(_partial_log_text(exc))
        return EXIT_NUMERIC
    if isinstance(exc, KeyboardInterrupt):
        say("[bold red]interrupted[/]")
        say(_partial_log_text(exc))
        return EXIT_INTERRUPT
    if isinstance(exc, OSError):  # an output folder that cannot be written, a full disk...
        say(f"[bold red]error[/] {_esc(str(exc))}")
        return EXIT_INPUT
    say(
        f"[bold red]internal error[/] {type(exc).__name__}: {_esc(str(exc))}\n"
        "This is a bug in brinebolt, not in your files. Run again with --debug before the "
        "command to see the traceback, and report it."
    )
    return EXIT_BUG


def _partial_log_text(exc: BaseException) -> str:
    path = getattr(exc, "partial_log", None)
    if path is None:
        return "No log was being written."
    return (
        f"The partial log is kept, marked incomplete: [bold]{_esc(str(path))}[/] "
        "(open it with brinebolt's reader or plain h5py)."
    )


if __name__ == "__main__":
    sys.exit(main())
