"""The ``brinebolt`` command.

Exit codes
----------
0  the mission was completed (or the command succeeded)
2  bad input: a file, key, value or option is wrong (every problem is listed)
3  the mission ended early because a limit or trigger stopped it
4  numerical failure (the solver or a model found no solution); the partial log is kept
130 interrupted (Ctrl-C); the partial log is kept
"""

from __future__ import annotations

import argparse
import sys
import traceback

EXIT_OK, EXIT_INPUT, EXIT_LIMIT, EXIT_NUMERIC, EXIT_INTERRUPT = 0, 2, 3, 4, 130

CAUTIONS = (
    "Electrolysis of seawater releases hydrogen (flammable 4–75 % in air) and chlorine (toxic; "
    "NIOSH REL 0.5 ppm ceiling, IDLH 10 ppm): ventilate, never enclose the outlet gas.",
    "High DC currents in water can injure or kill: keep people out of the water near energised "
    "electrodes and isolate before handling.",
    "Strong magnetic fields attract tools and affect pacemakers and implants.",
    "This tool is an engineering estimate. Follow local codes and licensed practice for any "
    "real craft.",
)


def _console(stderr: bool = False):
    from rich.console import Console

    return Console(stderr=stderr, highlight=False)


def _print_problems(problems, console) -> None:
    errors = [p for p in problems if p.severity == "error"]
    warns = [p for p in problems if p.severity != "error"]
    for p in errors:
        console.print(f"[bold red]error[/]   {_esc(str(p))}")
    for p in warns:
        console.print(f"[yellow]warning[/] {_esc(str(p))}")


def _esc(text: str) -> str:
    from rich.markup import escape

    return escape(text)


def _parse_time(text: str | None, what: str) -> float | None:
    if text is None:
        return None
    from sim.io.units import UnitParseError, to_si

    try:
        value = to_si(text, "time")
    except UnitParseError as exc:
        raise _OptionError(f"option {what} = {text!r}: {exc}") from None
    if value <= 0:
        raise _OptionError(f'option {what} = {text!r}: allowed: a positive time, e.g. "5 s"')
    return value


class _OptionError(Exception):
    pass


# ---------------------------------------------------------------------------- commands


def cmd_run(args) -> int:
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from sim import api
    from sim.engine.mission import RunObserver

    console = _console()
    sample = _parse_time(args.sample, "--sample")
    loaded = api.load_scenario(args.scenario)
    _print_problems(loaded.warnings + loaded.vessel.warnings, console)

    class Bar(RunObserver):
        def __init__(self, progress, task):
            self.p, self.task = progress, task

        def progress(self, time_s, limit, wall):
            self.p.update(self.task, completed=min(time_s, limit))

        def event(self, time_s, kind, leg, message):
            if kind in ("trigger", "stop", "schedule") and not args.quiet:
                self.p.console.print(f"  t = {time_s / 60:7.2f} min  {kind:8s} {_esc(message)}")

    with Progress(
        TextColumn("[bold]{task.description}"),
        BarColumn(),
        TextColumn("{task.percentage:>5.1f}% of time limit"),
        TimeElapsedColumn(),
        console=console,
        transient=True,
        disable=args.quiet,
    ) as progress:
        task = progress.add_task(
            f"flying {loaded.spec.scenario.name}", total=loaded.spec.limits.time
        )
        outcome = api.run_scenario(
            loaded, out=args.out, force=args.force, sample_s=sample, observer=Bar(progress, task)
        )
    _print_summary(outcome, console)
    return EXIT_OK if outcome.result.ending_kind == "complete" else EXIT_LIMIT


def _print_summary(outcome, console) -> None:
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
    from sim.io.present import gas_caution

    console.print(f"[dim]{_esc(gas_caution(r.summary))}[/]")
    for c in CAUTIONS:
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
            status = EXIT_INPUT
            continue
        _print_problems(warnings, console)
        console.print(
            f"[green]ok[/]      {_esc(f)} is a valid {kind} file"
            + (f" ({len(warnings)} warning(s))" if warnings else "")
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
    from sim.engine.steady import steady_at_speed
    from sim.io.schema import WaterSpec

    plant = build_plant(vessel.spec, WaterSpec(salinity=args.salinity, temperature=f"{temp} degC"))
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
        "4 numerical failure, 130 interrupted.",
    )
    ap.add_argument("--version", action="version", version=f"brinebolt {__version__}")
    ap.add_argument("--debug", action="store_true", help="show Python tracebacks on errors")
    sub = ap.add_subparsers(dest="command", required=True, metavar="COMMAND")

    r = sub.add_parser("run", help="fly a scenario file and write an HDF5 log")
    r.add_argument("scenario", help="scenario file (TOML)")
    r.add_argument("--out", help="log file (default outputs/<scenario>.h5)")
    r.add_argument("--sample", help='sampling interval, e.g. "1 s" (default from the scenario)')
    r.add_argument("--force", action="store_true", help="replace an existing log")
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
    ap = build_parser()
    args = ap.parse_args(argv)
    from sim.engine.mission import SolverFailure
    from sim.io.files import InputError
    from sim.io.log import LogExistsError
    from sim.physics.errors import ModelRangeError

    err = _console(stderr=True)
    try:
        return int(args.func(args))
    except InputError as exc:
        _print_problems(exc.problems, err)
        err.print(f"[bold red]{len(exc.problems)} problem(s); nothing was run.[/]")
        code = EXIT_INPUT
    except (_OptionError, LogExistsError) as exc:
        err.print(f"[bold red]error[/] {_esc(str(exc))}")
        code = EXIT_INPUT
    except ModelRangeError as exc:
        err.print(f"[bold red]error[/] a model input is out of range: {_esc(str(exc))}")
        code = EXIT_INPUT
    except SolverFailure as exc:
        err.print(f"[bold red]numerical failure[/] {_esc(str(exc))}; the partial log is kept.")
        code = EXIT_NUMERIC
    except KeyboardInterrupt:
        err.print("[bold red]interrupted[/]; the partial log is kept (marked incomplete).")
        code = EXIT_INTERRUPT
    if args.debug:
        traceback.print_exc()
    return code


if __name__ == "__main__":
    sys.exit(main())


