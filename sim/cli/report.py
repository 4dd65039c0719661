"""``brinebolt report``: the one-page run report of a log as self-contained HTML
(:func:`sim.analysis.report.write_report`)."""

from __future__ import annotations

from sim.cli import options
from sim.cli.core import EXIT_OK, console, esc


def register(sub) -> None:
    """Add ``report`` to the subparsers."""
    p = sub.add_parser(
        "report",
        help="one-page run report of a log as self-contained HTML",
        description="Summary, legs, range left, figures, events, provenance and safety "
        "cautions of a run log in one HTML file with the figures embedded.",
    )
    p.add_argument("log", metavar="LOG", help="run log (*.h5 or *.incomplete.h5)")
    options.add_out(p, "HTML file (default: beside the log, <name>.report.html)")
    p.add_argument(
        "--reserve",
        type=float,
        metavar="SOC",
        help="also give the range down to this state of charge",
    )
    p.add_argument("--no-range", action="store_true", help="leave out the range estimate")
    options.add_units(p)
    p.set_defaults(func=cmd_report)


def cmd_report(args) -> int:
    from sim.analysis.report import write_report

    con = console(wide_when_piped=True)
    log = options.read_log(args.log)
    out = write_report(
        log,
        args.out,
        units=args.units,
        reserve_soc=options.soc(args.reserve, "--reserve"),
        range_estimate=not args.no_range,
    )
    con.print(f"report written to [bold]{esc(out)}[/] (self-contained HTML)")
    return EXIT_OK
