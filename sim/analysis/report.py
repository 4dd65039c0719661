"""A one-page run report: a self-contained HTML file (figures embedded as base64 PNG).

It holds the run summary, the legs, the range left, the figures, the events, the provenance
(scenario and vessel names, paths and an excerpt of each file's text, as stored in the log) and
the safety cautions. It needs nothing but the log and opens in any browser, offline.
"""

from __future__ import annotations

import base64
import errno
import html
import io
import json
import os
import tempfile
from pathlib import Path

from sim import __version__
from sim.analysis import plots
from sim.analysis.log_range import range_from_log
from sim.analysis.tables import (
    Table,
    leg_table,
    log_range_table,
    summary_from_series,
    summary_table,
)
from sim.analysis.units import OutputUnits, output_units
from sim.io.log import RunLog, read_log
from sim.safety import CAUTIONS, gas_caution

__all__ = [
    "ReportExistsError",
    "check_report_out",
    "default_report_path",
    "report_html",
    "write_report",
]

EXCERPT_LINES = 40
"""Lines of each input file shown in the provenance section."""

MAX_EVENTS = 60
"""Events listed in full; the rest are counted."""

_CSS = """
body { font: 13px/1.35 system-ui, -apple-system, "Segoe UI", sans-serif; color: #111;
       max-width: 1180px; margin: 1.2em auto; padding: 0 1em; }
h1 { font-size: 1.45em; margin: 0 0 .15em; }
h2 { font-size: 1.1em; border-bottom: 2px solid #222; margin: 1.1em 0 .4em; }
.sub { color: #444; margin-bottom: .6em; }
.grid { display: grid; grid-template-columns: 1fr 1fr; gap: 1em 2em; }
table { border-collapse: collapse; width: 100%; font-size: .95em; }
th, td { border-bottom: 1px solid #ccc; padding: 2px 6px; text-align: right; vertical-align: top; }
th { background: #eee; }
td:first-child, th:first-child { text-align: left; }
td.text { text-align: left; }
figure { margin: .6em 0; }
figcaption { color: #444; font-size: .9em; }
img { width: 100%; max-width: 100%; height: auto; border: 1px solid #ddd; }
pre { background: #f6f6f6; border: 1px solid #ddd; padding: .5em; font-size: .85em;
      max-height: 22em; overflow: auto; white-space: pre-wrap; }
.caution { border: 2px solid #000; padding: .5em .8em; background: #fafafa; }
.caution li { margin: .2em 0; }
.note { color: #444; font-style: italic; }
@page { size: A4; margin: 12mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10px; }
  .grid { display: block; }
  h2, p.label { break-after: avoid; page-break-after: avoid; }
  figure, img, table, tr, .caution, pre { break-inside: avoid; page-break-inside: avoid; }
  thead { display: table-header-group; }
  figure { break-before: auto; }
  img { max-width: 100%; height: auto; max-height: 240mm; object-fit: contain; }
  pre { max-height: none; overflow: visible; }
}
"""
"""Screen and print styles. Printed (A4, for design reviews): one column, no figure, table row
or caution box split across pages, table headers repeated."""


def _e(text: object) -> str:
    return html.escape(str(text))


def _table_html(table: Table, *, text_cols: tuple[int, ...] = ()) -> str:
    head, rows = table
    out = ["<table><thead><tr>", *(f"<th>{_e(h)}</th>" for h in head), "</tr></thead><tbody>"]
    for r in rows:
        out.append("<tr>")
        for i, c in enumerate(r):
            cls = ' class="text"' if i in text_cols or i == len(r) - 1 else ""
            out.append(f"<td{cls}>{_e(c)}</td>")
        out.append("</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _png(fig) -> str:
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=110)
    return "data:image/png;base64," + base64.b64encode(buf.getvalue()).decode("ascii")


def _excerpt(text: str, n: int = EXCERPT_LINES) -> str:
    lines = str(text).splitlines()
    more = len(lines) - n
    return "\n".join(lines[:n]) + (f"\n… ({more} more lines)" if more > 0 else "")


def report_html(
    log: str | Path | RunLog,
    *,
    units: str | OutputUnits = "nautical",
    reserve_soc: float | None = None,
    range_estimate: bool = True,
) -> str:
    """The HTML text of the run report of a log (finished or partial).

    Parameters
    ----------
    log : path or RunLog
    units : output unit system
    reserve_soc : float, optional
        Also estimate the range down to this state of charge [-].
    range_estimate : bool
        Include the range left (:func:`sim.analysis.reach.range_from_log`; about a second).
    """
    u = output_units(units)
    if not isinstance(log, RunLog):
        log = read_log(log)
    a = log.attrs
    s = log.series
    summary = dict(log.summary) if log.summary else summary_from_series(s, log.ending_reason)
    scen = str(a.get("scenario_name", "")) or Path(str(a.get("scenario_path", "run"))).stem
    vessel = str(a.get("vessel_name", ""))
    title = f"{scen} — run report"
    state = (
        "complete"
        if log.complete
        else "PARTIAL (the run did not finish; figures to the last sample)"
    )

    range_html = ""
    if range_estimate:
        try:
            lr = range_from_log(log, reserve_soc=reserve_soc)
            st, left = log_range_table(lr, u)
            notes = "".join(f'<p class="note">{_e(n)}</p>' for n in lr.notes)
            range_html = (
                f"<h2>Range left</h2>{_table_html(left)}"
                f"<div style='margin-top:.5em'>{_table_html(st)}</div>{notes}"
                '<p class="note">Integrates the pack circuit at each demand to the '
                "cut-off (minimum SOC, or the cell-voltage floor / current rating at "
                "that power), so voltage sag is included.</p>"
            )
            legs = lr.legs
        except Exception as exc:  # the report must still come out
            range_html = (
                f"<h2>Range left</h2><p class='note'>not estimated: "
                f"{_e(type(exc).__name__)}: {_e(exc)}</p>"
            )
            legs = log.legs
    else:
        legs = log.legs

    columns = log.columns.get("duct_temperature_rise_k", [])
    fig1 = plots.run_figure(s, u, title=f"{scen}: run overview", legs=log.legs, columns=columns)
    fig2 = plots.power_breakdown_figure(
        s, title=f"{scen}: where the pack power goes", legs=log.legs
    )
    img1, img2 = _png(fig1), _png(fig2)

    events = log.events
    ev_rows = [
        [f"{float(ev['time_s']) / 60:.2f}", str(ev["kind"]), str(ev["leg"]), str(ev["message"])]
        for ev in events[:MAX_EVENTS]
    ]
    ev_more = (
        f"<p class='note'>… {len(events) - MAX_EVENTS} more events in the log</p>"
        if len(events) > MAX_EVENTS
        else ""
    )
    try:
        solver = json.dumps(json.loads(str(a.get("solver", "{}"))), sort_keys=True)
    except json.JSONDecodeError:
        solver = str(a.get("solver", ""))
    prov_rows = [
        ["scenario", f"{scen} ({a.get('scenario_path', '')})"],
        ["vessel", f"{vessel} ({a.get('vessel_path', '')})"],
        ["log", f"{log.path} (format v{log.format_version}, {state})"],
        ["written by", f"brinebolt {a.get('tool_version', '?')} at {a.get('created_utc', '?')}"],
        ["report by", f"brinebolt {__version__}"],
        ["solver", solver],
    ]
    cautions = [gas_caution(summary), *CAUTIONS]
    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{_e(title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{_e(title)}</h1>",
        f"<div class='sub'>{_e(vessel)} · {_e(state)} · ended by: "
        f"{_e(summary.get('ending_reason', ''))} · units: {_e(u.speed_label)}, "
        f"{_e(u.distance_label)}</div>",
        "<div class='grid'><div><h2>Summary</h2>",
        _table_html(summary_table(summary, u)),
        "</div><div><h2>Legs</h2>",
        _table_html(leg_table(legs, u), text_cols=(0,)),
        range_html,
        "</div></div>",
        "<h2>Run</h2><figure>",
        f"<img alt='run overview: speed, distance, power, state of charge, cell "
        f"voltage, duct temperature rise against time' src='{img1}'>",
        "<figcaption>Run overview; dotted verticals mark leg changes.</figcaption></figure>",
        f"<figure><img alt='pack power by destination against time' src='{img2}'>",
        "<figcaption>Where the pack power goes.</figcaption></figure>",
        "<h2>Safety</h2><div class='caution'><ul>",
        *(f"<li>{_e(c)}</li>" for c in cautions),
        "</ul></div>",
        "<div class='grid'><div><h2>Events</h2>",
        _table_html((["t min", "kind", "leg", "message"], ev_rows), text_cols=(1,)),
        ev_more,
        "</div><div><h2>Provenance</h2>",
        _table_html((["item", "value"], prov_rows)),
        f"<p class='label'><b>scenario file</b> (first {EXCERPT_LINES} lines)</p>",
        f"<pre>{_e(_excerpt(a.get('scenario_text', '')))}</pre>",
        f"<p class='label'><b>vessel file</b> (first {EXCERPT_LINES} lines)</p>",
        f"<pre>{_e(_excerpt(a.get('vessel_text', '')))}</pre>",
        "</div></div></body></html>",
    ]
    return "\n".join(parts)


class ReportExistsError(FileExistsError):
    """The report's output path is taken (a file, a folder or a symbolic link, even a dangling
    one) and replacing it was not asked for."""


def default_report_path(log_path: str | Path, force: bool = False) -> Path:
    """Beside the log, ``<log stem>.report.html``; when that is taken and ``force`` is not
    given, the first free ``<log stem>.report-2.html``, ``-3``... (as ``run`` names its logs)."""
    log_path = Path(log_path)
    stem = log_path.name
    for suffix in (".incomplete.h5", ".h5"):
        if stem.endswith(suffix):
            stem = stem[: -len(suffix)]
            break
    out = log_path.with_name(f"{stem}.report.html")
    n = 2
    while not force and os.path.lexists(out):
        out = log_path.with_name(f"{stem}.report-{n}.html")
        n += 1
    return out


def check_report_out(out: str | Path, force: bool = False) -> Path:
    """Refuse an output path that is a folder, or that exists (a symbolic link counts, even a
    dangling one) without ``force``: the rules of ``run --out``.

    Raises
    ------
    ReportExistsError
    """
    out = Path(out)
    if out.is_dir() and not out.is_symlink():
        raise ReportExistsError(f"{out} is a folder; allowed: a file path, e.g. run.html")
    if not force and os.path.lexists(out):
        what = "a symbolic link" if out.is_symlink() else "a file"
        raise ReportExistsError(f"{out} already exists ({what}); nothing was written")
    return out


def _write_atomic(out: Path, data: bytes, force: bool) -> None:
    """Write ``data`` to a temporary file beside ``out``, then put it in place in one step:
    ``os.replace`` with ``force`` (a symbolic link at ``out`` is replaced, never written
    through), else a hard link that fails if ``out`` appeared meanwhile. Readers see the old
    file or the whole new one, never a part."""
    fd, tmp = tempfile.mkstemp(dir=out.parent, prefix=f".{out.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
            f.flush()
            os.fsync(f.fileno())
        os.chmod(tmp, 0o666 & ~_umask())
        if force:
            os.replace(tmp, out)
            return
        try:
            os.link(tmp, out)
        except FileExistsError:
            raise ReportExistsError(f"{out} already exists; nothing was written") from None
        except OSError as exc:  # a file system without hard links
            if exc.errno not in (errno.EPERM, errno.ENOTSUP, errno.EOPNOTSUPP, errno.EXDEV):
                raise
            check_report_out(out, force=False)
            os.replace(tmp, out)
    finally:
        if os.path.lexists(tmp):
            os.unlink(tmp)


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def write_report(
    log: str | Path | RunLog,
    out: str | Path | None = None,
    *,
    units: str | OutputUnits = "nautical",
    reserve_soc: float | None = None,
    range_estimate: bool = True,
    force: bool = False,
) -> Path:
    """Write the run report of a log as one self-contained HTML file.

    The rules of ``run --out``: an existing ``out`` (a symbolic link counts, even a dangling
    one) is refused unless ``force``; the file is written to a temporary file beside it and
    moved into place in one step, so a reader never sees half a report and a symbolic link at
    ``out`` is replaced, not written through.

    Parameters
    ----------
    log : path or RunLog
    out : path, optional
        Default: beside the log, ``<log stem>.report.html`` (or the first free
        ``<log stem>.report-2.html``... when that exists and ``force`` is not given).
    units, reserve_soc, range_estimate
        As in :func:`report_html`.
    force : bool
        Replace an existing file at ``out``.

    Returns
    -------
    Path
        The file written.

    Raises
    ------
    ReportExistsError
        ``out`` exists and ``force`` is not given, or ``out`` is a folder.
    """
    if not isinstance(log, RunLog):
        log = read_log(log)
    out = default_report_path(log.path, force) if out is None else Path(out)
    check_report_out(out, force)
    out.parent.mkdir(parents=True, exist_ok=True)
    text = report_html(log, units=units, reserve_soc=reserve_soc, range_estimate=range_estimate)
    _write_atomic(out, text.encode("utf-8"), force)
    return out
