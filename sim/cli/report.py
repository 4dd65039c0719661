"""``brinebolt report``: the one-page run report of a log as self-contained HTML
(:func:`sim.analysis.report.write_report`)."""

from __future__ import annotations

from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, console, esc


def register(sub) -> None:
    """Add ``report`` to the subparsers."""
    p = sub.add_parser(
        "report",
        help="one-page run report of a log as self-contained HTML",
        description="Summary, legs, range left, figures, events, provenance and safety "
        "cautions of a run log in one HTML file with the figures embedded.",
    )
    p.add_argument("log", metavar="LOG", help="run log (*.h5 or *.incomplete.h5)")
    options.add_out(
        p,
        "HTML file (default: beside the log, <name>.report.html, or the first free "
        "<name>.report-2.html...); an existing file is replaced only with --force",
    )
    options.add_force(p, "replace an existing report (--out or the default)")
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
    from sim.analysis.report import ReportExistsError, check_report_out, write_report

    con = console(wide_when_piped=True)
    try:
        if args.out is not None:  # refuse before any work, as `run --out` does
            check_report_out(args.out, args.force)
        log = options.read_log(args.log)
        out = write_report(
            log,
            args.out,
            units=args.units,
            reserve_soc=options.soc(args.reserve, "--reserve"),
            range_estimate=not args.no_range,
            force=args.force,
        )
    except ReportExistsError as exc:
        raise OptionError(
            f"option --out: {exc}. Use --force to replace it, or choose another --out "
            "(without --out, brinebolt picks a free name beside the log)"
        ) from None
    con.print(f"report written to [bold]{esc(out)}[/] (self-contained HTML)")
    return EXIT_OK
