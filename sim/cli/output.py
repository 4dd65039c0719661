"""Where and how a command's tables go: ``--format text|csv|json`` and ``--output FILE``.

Every table-printing command builds :class:`sim.analysis.tables.DataTable` objects and hands them
to :class:`TableOutput`:

* ``text`` (default): the tables as the terminal shows them (:func:`sim.cli.core.print_table`,
  folded to the width, never cut), on stdout or in ``--output``;
* ``csv``: the raw values at full precision, a header row naming each column with its unit in
  brackets (``speed [kn]``); with several tables, each block starts with a line
  ``# NAME: TITLE`` and blocks are separated by an empty line;
* ``json``: ``{"format": "brinebolt-tables", "version": 1, "command": ..., "tables": [...]}``,
  each table with ``name``, ``title``, ``columns`` (``key``, ``name``, ``unit``, ``kind``) and
  ``rows`` (objects keyed by the column keys). NaN or a missing value is ``null``; an unlimited
  value (e.g. the endurance at zero power) is the string ``"inf"``.

Key–value tables (a run summary, the state of a log) have the columns ``quantity``, ``value``
and ``unit``, the unit given per row. Texts in CSV have control characters written as escapes
(``\\x1b``); JSON escapes them itself. With csv or json on stdout, notes, progress and cautions
go to stderr so that stdout holds the data only.
"""

from __future__ import annotations

import csv
import io
import json
import math
import sys
from pathlib import Path

from sim.cli.core import OutputError, console, print_table, visible

FORMATS = ("text", "csv", "json")
"""The values of ``--format``."""

__all__ = ["FORMATS", "TableOutput", "add_format", "to_csv", "to_json"]


def add_format(p) -> None:
    """``--format text|csv|json`` and ``--output FILE``."""
    p.add_argument(
        "--format",
        choices=FORMATS,
        default="text",
        help="tables as text (default), csv or json (full-precision numbers with their units)",
    )
    p.add_argument(
        "--output",
        metavar="FILE",
        help="write the tables to FILE (replaced if it exists) instead of stdout",
    )


def _raw(x: object):
    if x is None:
        return None
    if isinstance(x, bool):
        return x
    if isinstance(x, int):
        return x
    if isinstance(x, float):
        if math.isnan(x):
            return None
        if math.isinf(x):
            return "inf" if x > 0 else "-inf"
        return x
    try:  # numpy scalars
        return _raw(float(x))  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return str(x)


def _table_dict(t) -> dict:
    keys = [c.key for c in t.columns]
    return {
        "name": t.name,
        "title": t.title,
        "columns": [
            {"key": c.key, "name": c.name, "unit": c.unit, "kind": c.kind} for c in t.columns
        ],
        "rows": [dict(zip(keys, (_raw(v) for v in r), strict=True)) for r in t.rows],
    }


def to_json(tables, command: str) -> str:
    """The tables as one JSON document (see the module notes)."""
    doc = {
        "format": "brinebolt-tables",
        "version": 1,
        "command": command,
        "tables": [_table_dict(t) for t in tables],
    }
    return json.dumps(doc, ensure_ascii=False, indent=1, allow_nan=False) + "\n"


def _csv_cell(x: object) -> str:
    v = _raw(x)
    if v is None:
        return ""
    if isinstance(v, float):
        return repr(v)
    return visible(v, keep_newlines=False)


def to_csv(tables) -> str:
    """The tables as CSV (see the module notes)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    several = len(tables) > 1
    for k, t in enumerate(tables):
        if several:
            if k:
                buf.write("\n")
            buf.write(f"# {t.name}: {visible(t.title, keep_newlines=False)}\n")
        w.writerow([c.key for c in t.columns])
        for r in t.rows:
            w.writerow([_csv_cell(v) for v in r])
    return buf.getvalue()


class TableOutput:
    """The tables of one command in the chosen ``--format``, to stdout or ``--output``.

    ``messages`` is the console for everything else (progress, notes, cautions): stdout, or
    stderr when csv/json go to stdout."""

    def __init__(self, args, command: str) -> None:
        self.format = getattr(args, "format", "text") or "text"
        self.path = getattr(args, "output", None)
        self.command = command
        data_on_stdout = self.format != "text" and self.path is None
        self.messages = console(stderr=data_on_stdout)
        self._tables: list = []
        if self.path is not None:
            self._check_path(Path(self.path))

    @staticmethod
    def _check_path(path: Path) -> None:
        if path.is_dir():
            raise OutputError(f"option --output = {str(path)!r} is a folder; give a file name")
        if not path.parent.is_dir():
            raise OutputError(
                f"option --output = {str(path)!r}: the folder {str(path.parent)!r} does not exist"
            )

    def table(self, t) -> None:
        """Show ``t`` now (text on the terminal) or keep it for :meth:`close`."""
        if self.format == "text" and self.path is None:
            print_table(self.messages, t)
        else:
            self._tables.append(t)

    def close(self) -> None:
        """Write the kept tables (csv/json, or text to ``--output``)."""
        if self.format == "text" and self.path is None:
            return
        if self.format == "json":
            text = to_json(self._tables, self.command)
        elif self.format == "csv":
            text = to_csv(self._tables)
        else:
            buf = io.StringIO()
            con = console(file=buf)
            for t in self._tables:
                print_table(con, t)
            text = buf.getvalue()
        if self.path is None:
            sys.stdout.write(text)
            sys.stdout.flush()
            return
        try:
            Path(self.path).write_text(text, encoding="utf-8")
        except OSError as exc:
            raise OutputError(f"option --output = {self.path!r}: cannot write it: {exc}") from None
        self.messages.print(f"tables written to {visible(self.path)!s}", markup=False)
