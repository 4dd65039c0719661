"""What every command shares: exit codes, the option error, console helpers and the mapping of
errors to messages and exit codes.

rich and the error classes of the lower layers are imported inside the functions that need them,
so that ``brinebolt --help`` starts without them.
"""

from __future__ import annotations

import sys
from collections.abc import Iterable

from sim.physics.errors import ModelRangeError
from sim.safety import CAUTIONS

EXIT_OK, EXIT_INPUT, EXIT_LIMIT, EXIT_NUMERIC, EXIT_INTERRUPT = 0, 2, 3, 4, 130
EXIT_BUG = 1


class OptionError(Exception):
    """A command-line option value is wrong; the message names the option, the value and what is
    allowed. Exit code 2."""


# ---------------------------------------------------------------------------- console


def console(stderr: bool = False, *, wide_when_piped: bool = False):
    """A rich console without automatic highlighting.

    ``wide_when_piped`` gives piped output a wide page so that wide tables keep their columns."""
    from rich.console import Console

    if wide_when_piped and not stderr:
        return Console(highlight=False, width=None if sys.stdout.isatty() else 180)
    return Console(stderr=stderr, highlight=False)


def esc(text: object) -> str:
    """``text`` with rich markup escaped (file names, messages and values the user gave)."""
    from rich.markup import escape

    return escape(str(text))


def print_problems(problems: Iterable, con) -> None:
    """One line per problem (never wrapped, so each line names file, key, value and rule)."""
    problems = list(problems)
    errors = [p for p in problems if p.severity == "error"]
    warns = [p for p in problems if p.severity != "error"]
    for p in errors:
        con.print(f"[bold red]error[/]   {esc(p)}", soft_wrap=True)
    for p in warns:
        con.print(f"[yellow]warning[/] {esc(p)}", soft_wrap=True)


def print_table(con, table, title: str = "", left: tuple[int, ...] = (0,)) -> None:
    """Print a plain ``(header, rows)`` table, texts escaped; the columns in ``left`` and the
    last one are left-aligned, the others right-aligned."""
    from rich.table import Table

    head, rows = table
    t = Table(title=esc(title) if title else None, title_justify="left")
    for i, h in enumerate(head):
        t.add_column(h, justify="left" if i in left or i == len(head) - 1 else "right")
    for r in rows:
        t.add_row(*(esc(c) for c in r))
    con.print(t)


def print_cautions(con, lines: Iterable[str] = CAUTIONS) -> None:
    """The general safety reminders (or the given lines), dimmed."""
    for c in lines:
        con.print(f"[dim]! {esc(c)}[/]")


# ---------------------------------------------------------------------------- errors


def report_error(exc: BaseException, err) -> int:
    """Tell the user what went wrong (no traceback) on console ``err`` and return the exit
    code."""
    from pydantic import ValidationError

    from sim.engine.mission import SolverFailure
    from sim.io.files import InputError
    from sim.io.log import LogDataError, LogExistsError

    def say(text: str) -> None:
        err.print(text, soft_wrap=True)

    if isinstance(exc, InputError):
        print_problems(exc.problems, err)
        say(f"[bold red]{len(exc.problems)} problem(s); nothing was run.[/]")
        return EXIT_INPUT
    if isinstance(exc, OptionError | LogExistsError):
        say(f"[bold red]error[/] {esc(exc)}")
        return EXIT_INPUT
    if isinstance(exc, ValidationError):  # an option value handed to a file model
        for e in exc.errors():
            where = ".".join(str(x) for x in e["loc"])
            say(f"[bold red]error[/] option value for {esc(where)}: {esc(e['msg'])}")
        return EXIT_INPUT
    if isinstance(exc, ModelRangeError):
        say(f"[bold red]error[/] a model input is out of range: {esc(exc)}")
        return EXIT_INPUT
    if isinstance(exc, SolverFailure | LogDataError):
        say(f"[bold red]numerical failure[/] {esc(exc)}")
        say(_partial_log_text(exc))
        return EXIT_NUMERIC
    if isinstance(exc, KeyboardInterrupt):
        say("[bold red]interrupted[/]")
        say(_partial_log_text(exc))
        return EXIT_INTERRUPT
    if isinstance(exc, OSError):  # an output folder that cannot be written, a full disk...
        say(f"[bold red]error[/] {esc(exc)}")
        return EXIT_INPUT
    say(
        f"[bold red]internal error[/] {type(exc).__name__}: {esc(exc)}\n"
        "This is a bug in brinebolt, not in your files. Run again with --debug before the "
        "command to see the traceback, and report it."
    )
    return EXIT_BUG


def _partial_log_text(exc: BaseException) -> str:
    path = getattr(exc, "partial_log", None)
    if path is None:
        return "No log was being written."
    return (
        f"The partial log is kept, marked incomplete: [bold]{esc(path)}[/] "
        "(open it with brinebolt's reader or plain h5py)."
    )
