"""The ``brinebolt`` parser and entry point: one subparser per command module, and the mapping of
every error to a message and an exit code (:func:`sim.cli.core.report_error`)."""

from __future__ import annotations

import argparse
import traceback

from sim import __version__
from sim.cli import check, range_curve, reach, report, run, steady, thruster_curves, versus
from sim.cli.core import EXIT_INPUT, console, report_error

COMMANDS = (run, check, steady, versus, reach, range_curve, thruster_curves, report)
"""The command modules, in the order ``brinebolt --help`` lists them; each has ``register(sub)``
and a ``cmd_<name>(args)`` that returns the exit code."""


def build_parser() -> argparse.ArgumentParser:
    """The ``brinebolt`` argument parser with every command registered."""
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
    for command in COMMANDS:
        command.register(sub)
    return ap


def main(argv: list[str] | None = None) -> int:
    """Run the command line and return the exit code (see :mod:`sim.cli`)."""
    ap = build_parser()
    try:
        args = ap.parse_args(argv)
    except SystemExit as exc:  # argparse printed usage (code 2) or --help/--version (code 0)
        return exc.code if isinstance(exc.code, int) else EXIT_INPUT
    try:
        return int(args.func(args))
    except (KeyboardInterrupt, Exception) as exc:
        err = console(stderr=True)
        code = report_error(exc, err)
        if args.debug:
            err.file.flush()
            traceback.print_exception(exc)
        return code
