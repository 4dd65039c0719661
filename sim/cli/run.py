"""``brinebolt run``: fly a scenario file with a progress bar, print the summary, the legs and the
safety cautions, and write the HDF5 log."""

from __future__ import annotations

import signal
import sys

from sim.analysis.units import OutputUnits, output_units
from sim.cli import options
from sim.cli.core import EXIT_LIMIT, EXIT_OK, console, esc, print_problems
from sim.physics.constants import KNOT_M_S, NAUTICAL_MILE_M
from sim.safety import (
    CAUTION_CURRENT,
    CAUTION_FIELD,
    CAUTIONS,
    CL2_MOLAR_MASS_G,
    DEFAULT_ENCLOSED_M3,
    H2_MOLAR_VOLUME_L,
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
    r.set_defaults(func=cmd_run)


def cmd_run(args) -> int:
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from sim import api
    from sim.engine.mission import RunObserver

    con = console()
    sample = options.parse_time(args.sample, "--sample")
    volume = options.parse_positive(args.enclosed_volume, "--enclosed-volume", "volume", '"10 m^3"')
    options.check_log_out(args.out, args.force)
    loaded = api.load_scenario(args.scenario)
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
            f"flying {loaded.spec.scenario.name}", total=loaded.spec.limits.time
        )
        outcome = api.run_scenario(
            loaded, out=args.out, force=args.force, sample_s=sample, observer=Bar(progress, task)
        )
    print_summary(outcome, con, enclosed_volume_m3=volume or DEFAULT_ENCLOSED_M3, units=args.units)
    return EXIT_OK if outcome.result.ending_kind == "complete" else EXIT_LIMIT


class CtrlC:
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
        try:
            self._old = signal.signal(signal.SIGINT, self._handler)
        except ValueError:  # not the main thread: leave signals alone
            self._old = None
            return self
        self._old_hook, sys.unraisablehook = sys.unraisablehook, self._unraisable
        return self

    def __exit__(self, *exc) -> None:
        if self._old is not None:
            signal.signal(signal.SIGINT, self._old)
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


def _both(metric_text: str, nautical_text: str, metric: bool) -> str:
    """The text in the chosen system first, the other in brackets."""
    if metric:
        return f"{metric_text}  ({nautical_text})"
    return f"{nautical_text}  ({metric_text})"


def summary_rows(summary: dict, units: str | OutputUnits = "nautical") -> list[tuple[str, str]]:
    """(label, value) rows of a run summary for the terminal: distances, speeds and energy per
    distance in ``units``, with the other system in brackets."""
    metric = output_units(units).name == "metric"
    s = summary
    dist = float(s["distance_m"])
    dur = float(s["duration_s"])
    e = float(s["energy_out_j"])
    v = float(s["mean_speed_over_ground_m_s"])
    rows = [
        (
            "distance over ground",
            _both(f"{dist / 1000:.3f} km", f"{dist / NAUTICAL_MILE_M:.3f} nmi", metric),
        ),
        ("duration", f"{dur / 60:.1f} min  ({dur / 3600:.2f} h)"),
        (
            "mean speed over ground",
            _both(f"{v:.3f} m/s", f"{v / KNOT_M_S:.2f} kn", metric),
        ),
        ("energy from the pack", f"{e / 3.6e6:.3f} kWh"),
        (
            "energy per distance",
            _both(
                f"{e / 3.6e3 / (dist / 1000):.1f} Wh/km",
                f"{e / 3.6e3 / (dist / NAUTICAL_MILE_M):.1f} Wh/nmi",
                metric,
            )
            if dist > 0
            else "—",
        ),
        ("mean overall efficiency", f"{100 * float(s['mean_eta_overall']):.3f} %"),
        ("best overall efficiency", f"{100 * float(s['best_eta_overall']):.3f} %"),
        ("end state of charge", f"{100 * float(s['end_state_of_charge']):.1f} %"),
        ("peak duct temperature rise", f"{float(s['peak_duct_temperature_rise_k']):.2f} K"),
        ("peak battery temperature", f"{float(s['peak_battery_temperature_c']):.1f} °C"),
        ("peak magnet temperature", f"{float(s['peak_magnet_temperature_c']):.1f} °C"),
        ("peak pack current", f"{float(s['peak_pack_current_a']):.0f} A"),
        ("peak thruster current (all units)", f"{float(s['peak_thruster_current_a']):.0f} A"),
        ("hydrogen evolved", f"{float(s['h2_total_mol']) * H2_MOLAR_VOLUME_L:.1f} L at 25 °C"),
        ("chlorine evolved", f"{float(s['cl2_total_mol']) * CL2_MOLAR_MASS_G:.1f} g"),
        ("ended by", str(s["ending_reason"])),
    ]
    return rows


def print_summary(
    outcome,
    con,
    enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3,
    units: str | OutputUnits = "nautical",
) -> None:
    """The summary table, the leg table, the safety flags and cautions, and where the log is."""
    from rich.table import Table

    metric = output_units(units).name == "metric"
    r = outcome.result
    t = Table(
        title=f"{esc(outcome.scenario.spec.scenario.name)} — {esc(r.ending_reason)}",
        show_header=False,
        title_justify="left",
    )
    t.add_column("quantity")
    t.add_column("value", justify="right")
    for k, v in summary_rows(r.summary, units):
        t.add_row(k, esc(v))
    con.print(t)
    legs = Table(title="legs", title_justify="left")
    dist_col, speed_col = ("distance km", "mean m/s") if metric else ("distance nmi", "mean kn")
    for col in ("leg", "start min", "end min", dist_col, "energy Wh", speed_col, "ended by"):
        legs.add_column(col, justify="left" if col in ("leg", "ended by") else "right")
    for leg in r.legs:
        d, v = leg["distance_m"], leg["mean_speed_m_s"]
        legs.add_row(
            esc(leg["name"]),
            f"{leg['t_start_s'] / 60:.1f}",
            f"{leg['t_end_s'] / 60:.1f}",
            f"{d / 1000:.3f}" if metric else f"{d / NAUTICAL_MILE_M:.3f}",
            f"{leg['energy_j'] / 3600:.1f}",
            f"{v:.3f}" if metric else f"{v / KNOT_M_S:.2f}",
            esc(leg["ending"]),
        )
    con.print(legs)
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
