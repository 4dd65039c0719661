"""What every command shares: exit codes, the option error, console helpers and the mapping of
errors to messages and exit codes.

rich and the error classes of the lower layers are imported inside the functions that need them,
so that ``brinebolt --help`` starts without them.
"""

from __future__ import annotations

import errno
import os
import sys
import unicodedata
from collections.abc import Iterable

from sim.physics.errors import ModelRangeError
from sim.safety import CAUTIONS

EXIT_OK, EXIT_INPUT, EXIT_LIMIT, EXIT_NUMERIC, EXIT_INTERRUPT = 0, 2, 3, 4, 130
EXIT_BUG = 1
EXIT_WRITE = 5
"""Output could not be written (a full disk while writing the log, an ``--output`` file that
cannot be written); the partial log is kept."""
EXIT_TERMINATED = 143
"""Ended by SIGTERM (128 + 15, as a shell reports a process killed by it); the partial log is
kept and marked."""


class OptionError(Exception):
    """A command-line option value is wrong; the message names the option, the value and what is
    allowed. Exit code 2."""


class OutputError(OSError):
    """An output file asked for on the command line (``--output``) cannot be written. Exit
    code 5."""


class Terminated(KeyboardInterrupt):
    """SIGTERM arrived: the command ends as after Ctrl-C (final flush, partial log kept and
    marked), with ``ending_reason`` as the log's ending reason and exit code 143."""

    ending_reason = "terminated (SIGTERM)"

    def __str__(self) -> str:
        return self.ending_reason


# ---------------------------------------------------------------------------- console


def console(stderr: bool = False, *, wide_when_piped: bool = False, file=None):
    """A rich console without automatic highlighting or emoji codes.

    Its width is the terminal's (``COLUMNS``, or 80 when piped); tables that do not fit are
    folded into several (:func:`print_table`), so no width loses a number.
    ``wide_when_piped`` is kept for old callers and does nothing any more. ``file`` writes to
    that file instead of stdout/stderr."""
    from rich.console import Console

    del wide_when_piped
    if file is not None:
        con = Console(file=file, highlight=False, emoji=False)
    else:
        con = Console(stderr=stderr, highlight=False, emoji=False)
    con.on_broken_pipe = _pipe_closed  # rich would exit 1; a closed pipe is no error
    return con


def quiet_stdout() -> None:
    """Point stdout at the null device: the reader of a pipe has gone (``| head``), so what is
    left to print (and Python's flush at exit) goes nowhere instead of failing again."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError, AttributeError):  # no real file (a test's capture)
        pass


def _pipe_closed() -> None:
    quiet_stdout()
    raise BrokenPipeError(errno.EPIPE, "the reader of the output pipe has gone")


_BIDI = {chr(c) for c in (*range(0x202A, 0x202F), *range(0x2066, 0x206A))}


def visible(text: object, *, keep_newlines: bool = True) -> str:
    """``str(text)`` with control characters (C0, DEL, C1, bidirectional overrides) written as
    ``\\x1b``-style escapes, so a name can neither drive the terminal nor hide itself.
    Newlines and tabs stay unless ``keep_newlines`` is False."""
    out = []
    for ch in str(text):
        if keep_newlines and ch in "\n\t":
            out.append(ch)
        elif unicodedata.category(ch) == "Cc" or ch in _BIDI:
            out.append(repr(ch)[1:-1] if ord(ch) < 0x100 else f"\\u{ord(ch):04x}")
        else:
            out.append(ch)
    return "".join(out)


def esc(text: object) -> str:
    """``text`` made safe to print with rich: control characters made visible
    (:func:`visible`) and rich markup escaped (names, file names, messages and values the user
    gave)."""
    from rich.markup import escape

    return escape(visible(text))


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
    """Print a table: a :class:`sim.analysis.tables.DataTable` or a plain ``(header, rows)``.

    Texts are escaped (:func:`esc`). Numbers, names and headers are never wrapped or cut: when
    the table is wider than the console it is folded into several tables, each repeating the
    first column; only free text (a note column) may wrap at its words. For a plain table the
    columns in ``left`` and the last one are left-aligned, the others right-aligned."""
    from rich.cells import cell_len
    from rich.table import Table

    if hasattr(table, "text_kinds"):  # a DataTable
        title = title or table.title
        kinds = table.text_kinds
        head, rows = table.text()
    else:
        head, rows = table
        kinds = [
            "name" if i in left else "text" if i == len(head) - 1 else "number"
            for i in range(len(head))
        ]
    n = len(head)
    head = [visible(h, keep_newlines=False) for h in head]
    rows = [[visible(c, keep_newlines=False) for c in r] for r in rows]
    need = [max([cell_len(head[i])] + [cell_len(r[i]) for r in rows]) for i in range(n)]
    wraps = [kinds[i] == "text" and i > 0 for i in range(n)]
    least = [
        min(
            need[i],
            max(
                20,
                max([cell_len(head[i])] + [cell_len(w) for r in rows for w in r[i].split()] or [1]),
            ),
        )
        if wraps[i]
        else need[i]
        for i in range(n)
    ]
    width = max(int(con.width), 20)
    groups: list[list[int]] = []
    cur = [0]
    used = 1 + least[0] + 3
    for i in range(1, n):
        w = least[i] + 3  # one padding each side and a border
        if used + w > width and len(cur) > 1:
            groups.append(cur)
            cur, used = [0], 1 + least[0] + 3
        cur.append(i)
        used += w
    groups.append(cur)
    for g, cols in enumerate(groups):
        part = title if g == 0 else f"{title} (continued)" if title else ""
        t = Table(title=esc(part) if part else None, title_justify="left")
        for i in cols:
            t.add_column(
                esc(head[i]),
                justify="left" if kinds[i] in ("name", "text") else "right",
                no_wrap=not wraps[i],
                min_width=None if wraps[i] else need[i],
                overflow="fold",
            )
        for r in rows:
            t.add_row(*(esc(r[i]) for i in cols))
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
    from sim.io.log import LogBusyError, LogDataError, LogExistsError, LogWriteError

    def say(text: str) -> None:
        err.print(text, soft_wrap=True)

    if isinstance(exc, LogBusyError):
        say(f"[bold red]error[/] the log is busy: {esc(exc)}")
        say("Nothing was run.")
        return EXIT_INPUT
    if isinstance(exc, LogWriteError):  # full disk...: its message names the kept snapshot
        say(f"[bold red]output could not be written[/] {esc(exc)}")
        return EXIT_WRITE
    if isinstance(exc, OutputError):
        say(f"[bold red]output could not be written[/] {esc(exc)}")
        return EXIT_WRITE
    if isinstance(exc, Terminated):
        say("[bold red]terminated[/] (SIGTERM)")
        say(_partial_log_text(exc))
        return EXIT_TERMINATED

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
    if getattr(exc, "log_marked", True) is False:
        return (
            f"The partial log is kept: [bold]{esc(path)}[/] (valid, but it could not be marked "
            "with why the run ended)."
        )
    return (
        f"The partial log is kept, marked incomplete: [bold]{esc(path)}[/] "
        "(open it with brinebolt's reader or plain h5py)."
    )
