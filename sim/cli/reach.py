"""``brinebolt reach``: the range left according to a run log, finished or partial
(:func:`sim.analysis.reach.range_from_log`)."""

from __future__ import annotations

from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, esc
from sim.cli.output import TableOutput, add_format


def register(sub) -> None:
    """Add ``reach`` to the subparsers."""
    r = sub.add_parser(
        "reach",
        help="range left according to a run log (finished or partial)",
        description="Distance covered, energy per distance by leg, and the range left at the "
        "last driving leg's consumption and at the best-range speed, integrating the pack to "
        "its cut-off (voltage sag included).",
    )
    r.add_argument("log", metavar="LOG", help="run log (*.h5 or *.incomplete.h5)")
    r.add_argument(
        "--reserve",
        type=float,
        metavar="SOC",
        help="also give the range down to this state of charge, e.g. 0.2",
    )
    r.add_argument("--no-best", action="store_true", help="skip the best-range speed search")
    options.add_units(r)
    add_format(r)
    r.set_defaults(func=cmd_reach)


def cmd_reach(args) -> int:
    from sim.analysis.reach import LogMismatchError, range_from_log
    from sim.analysis.tables import leg_data, log_range_data

    out = TableOutput(args, "reach")
    con = out.messages
    reserve = options.soc(args.reserve, "--reserve")
    log = options.read_log(args.log, min_samples=2)
    try:
        lr = range_from_log(log, reserve_soc=reserve, best_speed=not args.no_best)
    except LogMismatchError as exc:
        raise OptionError(str(exc)) from None
    state, left = log_range_data(lr, args.units, title=lr.scenario_name or str(lr.log_path))
    out.table(state)
    out.table(leg_data(lr.legs, args.units, title="energy by leg"))
    out.table(left)
    out.close()
    if lr.verdict:
        con.print(f"[bold]{esc(lr.verdict)}[/]")
    for n in lr.notes:
        con.print(f"[yellow]note[/] {esc(n)}")
    return EXIT_OK
