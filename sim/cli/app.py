"""The ``brinebolt`` parser and entry point: one subparser per command module, and the mapping of
every error to a message and an exit code (:func:`sim.cli.core.report_error`)."""

from __future__ import annotations

import argparse
import errno
import os
import signal
import traceback

from sim import __version__
from sim.cli import (
    check,
    range_curve,
    reach,
    report,
    run,
    steady,
    study,
    thruster_curves,
    versus,
)
from sim.cli.core import EXIT_INPUT, EXIT_OK, Terminated, console, quiet_stdout, report_error

COMMANDS = (run, check, steady, versus, study, reach, range_curve, thruster_curves, report)
"""The command modules, in the order ``brinebolt --help`` lists them; each has ``register(sub)``
and a ``cmd_<name>(args)`` that returns the exit code."""


def build_parser() -> argparse.ArgumentParser:
    """The ``brinebolt`` argument parser with every command registered."""
    ap = argparse.ArgumentParser(
        prog="brinebolt",
        description="Time-domain propulsion simulator for seawater MHD-thruster vessels.",
        epilog="Exit codes: 0 done, 2 bad input, 3 mission ended early by a limit, "
        "4 numerical failure (partial log kept), 5 output could not be written (partial log "
        "kept), 130 interrupted (partial log kept), 143 terminated by SIGTERM (partial log "
        "kept), 1 internal error.",
    )
    ap.add_argument("--version", action="version", version=f"brinebolt {__version__}")
    ap.add_argument("--debug", action="store_true", help="show Python tracebacks on errors")
    sub = ap.add_subparsers(dest="command", required=True, metavar="COMMAND")
    for command in COMMANDS:
        command.register(sub)
    return ap


def _broken_pipe(exc: BaseException) -> bool:
    return isinstance(exc, BrokenPipeError) or (
        isinstance(exc, OSError) and exc.errno == errno.EPIPE
    )


def _on_sigterm(signum, frame):
    if os.getpid() != _MAIN_PID[0]:  # a forked worker: die as SIGTERM asks
        signal.signal(signal.SIGTERM, signal.SIG_DFL)
        os.kill(os.getpid(), signal.SIGTERM)
        return
    raise Terminated


_MAIN_PID = [os.getpid()]


def main(argv: list[str] | None = None) -> int:
    """Run the command line and return the exit code (see :mod:`sim.cli`).

    SIGTERM ends any command like Ctrl-C (exit code 143; ``run`` keeps and marks its partial
    log); a closed output pipe (``brinebolt steady ... | head -1``) ends it quietly with exit
    code 0."""
    ap = build_parser()
    try:
        args = ap.parse_args(argv)
    except SystemExit as exc:  # argparse printed usage (code 2) or --help/--version (code 0)
        return exc.code if isinstance(exc.code, int) else EXIT_INPUT
    old_term = None
    try:
        _MAIN_PID[0] = os.getpid()
        old_term = signal.signal(signal.SIGTERM, _on_sigterm)
    except ValueError:  # not the main thread: leave signals alone
        old_term = None
    try:
        return int(args.func(args))
    except (KeyboardInterrupt, Exception) as exc:
        if _broken_pipe(exc):
            quiet_stdout()
            return EXIT_OK
        err = console(stderr=True)
        try:
            code = report_error(exc, err)
            if args.debug:
                err.file.flush()
                traceback.print_exception(exc)
        except OSError as exc2:  # stderr is gone too
            if not _broken_pipe(exc2):
                raise
            return EXIT_OK if _broken_pipe(exc) else EXIT_INPUT
        return code
    finally:
        if old_term is not None:
            signal.signal(signal.SIGTERM, old_term)
