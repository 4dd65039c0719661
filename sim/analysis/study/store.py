"""The results table of a study: one row per variant, kept on disk as the variants finish.

Layout of the HDF5 file (plain h5py datasets, readable without brinebolt)::

    /                       attrs: format = "brinebolt-study", format_version, title,
                                   study_path, study_text, created_utc
    /variants/              one group: the table
        variant             dimension scale: 0 … n−1 (netCDF-4 style, so xarray's h5netcdf
                            engine reads the group as a Dataset over "variant")
        <column>            one 1-D dataset per column, attached to "variant"; attrs: unit,
                            kind (id, stage, input, output, constraint, status), text
    /variants attrs:        columns (the column order)

Columns: ``variant_id`` (hash of the inputs), ``stage`` (sweep, optimise, front, uncertainty,
sensitivity, tornado: where the variant was first asked for), one column per input (the dotted
key; the number when every value has one, with the unit in its attrs, else the text), ``ok``
(1 flew, 0 failed), ``error``, ``ending_reason``, ``ending_kind``, one column per output (float,
NaN where a run failed), ``meets:<constraint>`` (1 met, 0 not, NaN unknown) per constraint,
``feasible`` (ok, in trim and every constraint met) and ``wall_time_s``. Booleans are stored as
0/1 integers and text as UTF-8 strings.

In pandas::

    import h5py, pandas as pd
    with h5py.File("study.h5") as f:
        g = f["variants"]
        df = pd.DataFrame({c: g[c].asstr()[()] if g[c].dtype.kind == "O" else g[c][()]
                           for c in g.attrs["columns"]})

In xarray (with the h5netcdf engine): ``xr.open_dataset("study.h5", group="variants",
engine="h5netcdf")``.

Crash safety: each finished row is appended as soon as it reaches this process to a journal
beside the file (``<name>.journal``, one JSON line; rows that arrive together share one write,
flushed and synced), and the HDF5 file is rewritten from time to time as a snapshot (written to
``<name>.tmp`` and renamed over the old one, so the file on disk is always whole; spaced so that
rewriting a big table costs at most about 2 % of the time). A resumed study reads both and flies
only the variants missing.
"""

from __future__ import annotations

import csv
import json
import math
import os
import re
import time
from collections.abc import Iterable, Sequence
from datetime import UTC, datetime
from pathlib import Path

import h5py
import numpy as np

from sim.analysis.study.design import number_of

__all__ = [
    "FORMAT",
    "FORMAT_VERSION",
    "StudyStore",
    "read_table",
    "table_columns",
    "write_csv",
    "write_table",
]

FORMAT = "brinebolt-study"
FORMAT_VERSION = 1


def _journal_path(path: Path) -> Path:
    return path.with_name(path.name + ".journal")


class StudyStore:
    """Rows of a study, by variant id, kept in memory, in a journal and in the HDF5 file.

    Parameters
    ----------
    path : path
        The HDF5 file (its folder is created).
    columns : dict
        Column layout: ``inputs`` (list of keys with their units: [(key, unit)]), ``outputs``
        ([(name, unit)]), ``constraints`` ([(column, text)]).
    meta : dict
        Root attributes (title, study_path, study_text).
    resume : bool
        Keep the rows already on disk (the file and its journal); otherwise start afresh.
    snapshot_s : float
        Least time between two rewrites of the HDF5 file [s] (the journal holds every row at
        once whatever this is); never less than 50 times the last rewrite took, so that
        rewriting a big table stays a small part of the study's time.
    """

    def __init__(
        self,
        path: str | Path,
        columns: dict,
        meta: dict,
        *,
        resume: bool = True,
        snapshot_s: float = 2.0,
    ) -> None:
        self.path = Path(path)
        self.path.parent.mkdir(parents=True, exist_ok=True)
        self.columns = columns
        self.meta = meta
        self.rows: dict[str, dict] = {}
        self.snapshot_s = snapshot_s
        self._last = 0.0
        self._wait = snapshot_s
        self._dirty = False
        journal = _journal_path(self.path)
        if resume:
            if self.path.exists():
                for row in read_table(self.path, raw=True):
                    self.rows[row["variant_id"]] = row
            if journal.exists():
                for line in journal.read_text(encoding="utf-8").splitlines():
                    try:
                        row = json.loads(line)
                    except json.JSONDecodeError:
                        continue  # a line torn by a crash: that variant is flown again
                    if isinstance(row, dict) and "variant_id" in row:
                        self.rows[row["variant_id"]] = row
                        # the file may lack this row (killed before its snapshot): rewrite the
                        # file at the close even when the resumed run flies nothing new
                        self._dirty = True
        else:
            for p in (self.path, journal):
                if p.exists():
                    p.unlink()
        self._journal = open(journal, "a", encoding="utf-8")

    def __contains__(self, variant_id: str) -> bool:
        return variant_id in self.rows

    def get(self, variant_id: str) -> dict | None:
        return self.rows.get(variant_id)

    def add(self, row: dict) -> None:
        """Keep a finished row: in memory, in the journal at once, in the file soon."""
        self.add_many([row])

    def add_many(self, rows: Sequence[dict]) -> None:
        """Keep finished rows: in memory, in the journal at once (one write and one sync for
        them all), in the file soon."""
        if not rows:
            return
        lines = []
        for row in rows:
            self.rows[row["variant_id"]] = row
            lines.append(json.dumps(row, ensure_ascii=False, default=_json_default) + "\n")
        self._journal.write("".join(lines))
        self._journal.flush()
        os.fsync(self._journal.fileno())
        self._dirty = True
        if time.monotonic() - self._last >= self._wait:
            self.snapshot()

    def snapshot(self) -> None:
        """Rewrite the HDF5 file from the rows (tmp file + atomic rename)."""
        t0 = time.monotonic()
        tmp = self.path.with_name(self.path.name + ".tmp")
        write_table(tmp, list(self.rows.values()), self.columns, self.meta)
        os.replace(tmp, self.path)
        now = time.monotonic()
        self._wait = max(self.snapshot_s, 50.0 * (now - t0))
        self._last = now
        self._dirty = False

    def close(self) -> None:
        """Write the final snapshot and drop the journal (the file now holds every row)."""
        if self._dirty or not self.path.exists():
            self.snapshot()
        self._journal.close()
        _journal_path(self.path).unlink(missing_ok=True)

    def abandon(self) -> None:
        """Close without the final clean-up (after an interrupt): the journal stays."""
        try:
            if self._dirty:
                self.snapshot()
        finally:
            self._journal.close()


def _json_default(x):
    if isinstance(x, np.generic):
        return x.item()
    raise TypeError(f"cannot store {type(x).__name__}")


def _flat(row: dict, columns: dict) -> dict:
    out = {"variant_id": row["variant_id"], "stage": row.get("stage", "")}
    inputs = dict(row.get("inputs", []))
    for key, _unit in columns["inputs"]:
        out[key] = inputs.get(key, "")
    for k in ("ok", "error", "ending_reason", "ending_kind"):
        out[k] = row.get(k, "")
    outs = row.get("outputs", {})
    for name, _unit in columns["outputs"]:
        out[name] = outs.get(name, math.nan)
    verdicts = row.get("verdicts", {})
    for col, _text in columns["constraints"]:
        out[col] = verdicts.get(col, math.nan)
    out["feasible"] = row.get("feasible", 0)
    out["wall_time_s"] = row.get("wall_time_s", math.nan)
    return out


def table_columns(columns: dict) -> list[tuple[str, str, str, str]]:
    """(name, kind, unit, text) of every column in order."""
    cols = [("variant_id", "id", "", "hash of the variant's inputs")]
    cols.append(("stage", "stage", "", "where the variant was first asked for"))
    cols += [(k, "input", u, "input (dotted key)") for k, u in columns["inputs"]]
    cols += [
        ("ok", "status", "1", "1 the run finished, 0 it failed"),
        ("error", "status", "", "why the variant failed"),
        ("ending_reason", "status", "", "why the run ended"),
        ("ending_kind", "status", "", "complete, limit, ..."),
    ]
    cols += [(n, "output", u, "output") for n, u in columns["outputs"]]
    cols += [(c, "constraint", "1", t) for c, t in columns["constraints"]]
    cols += [
        ("feasible", "status", "1", "flew, in trim and meets every constraint"),
        ("wall_time_s", "status", "s", "wall-clock time of the variant"),
    ]
    return cols


def _input_column(values: list) -> tuple[np.ndarray, bool]:
    """A numeric column when every value is a number (or a number with one unit)."""
    nums = []
    for v in values:
        if v == "" or v is None:
            nums.append(math.nan)
            continue
        if isinstance(v, bool):
            return np.array([str(x) for x in values], dtype=object), False
        if isinstance(v, str) and not _is_quantity(v):
            return np.array([str(x) for x in values], dtype=object), False
        nums.append(number_of(v))
    return np.array(nums, dtype=float), True


def _is_quantity(text: str) -> bool:
    return re.match(r"\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?(\s|$)", text) is not None


def write_table(path: Path, rows: Sequence[dict], columns: dict, meta: dict) -> None:
    """Write the rows as the documented HDF5 layout."""
    flat = [_flat(r, columns) for r in rows]
    cols = table_columns(columns)
    str_dt = h5py.string_dtype("utf-8")
    with h5py.File(path, "w") as f:
        f.attrs["format"] = FORMAT
        f.attrs["format_version"] = FORMAT_VERSION
        f.attrs["created_utc"] = datetime.now(UTC).isoformat(timespec="seconds")
        for k, v in meta.items():
            f.attrs[k] = v
        g = f.create_group("variants")
        g.attrs["columns"] = np.array([c[0] for c in cols], dtype=object).astype(str_dt)
        dim = g.create_dataset("variant", data=np.arange(len(flat), dtype=np.int64))
        dim.make_scale("variant")
        for name, kind, unit, text in cols:
            values = [r[name] for r in flat]
            if kind == "input":
                arr, numeric = _input_column(values)
                if numeric and not unit:
                    unit = _unit_of(values)
            elif kind in ("output", "constraint") or name == "wall_time_s":
                arr = np.array(
                    [math.nan if v in ("", None) else float(v) for v in values], dtype=float
                )
            elif name in ("ok", "feasible"):
                arr = np.array([1 if v is True or v == 1 else 0 for v in values], dtype=np.int8)
            else:
                arr = np.array([str(v) for v in values], dtype=object)
            if arr.dtype == object:
                ds = g.create_dataset(name, data=arr.astype(str_dt), dtype=str_dt)
            else:
                ds = g.create_dataset(name, data=arr)
            ds.attrs["kind"] = kind
            ds.attrs["unit"] = unit
            ds.attrs["text"] = text
            ds.dims[0].attach_scale(dim)
        # rows as JSON too, so a resumed study gets back the exact inputs and outputs
        g.create_dataset(
            "_rows",
            data=np.array(
                [json.dumps(r, ensure_ascii=False, default=_json_default) for r in rows],
                dtype=object,
            ).astype(str_dt),
            dtype=str_dt,
        ).dims[0].attach_scale(dim)


def _unit_of(values: list) -> str:
    for v in values:
        if isinstance(v, str) and " " in v.strip():
            return v.strip().split(None, 1)[1]
    return ""


def read_table(path: str | Path, *, raw: bool = False) -> list[dict]:
    """The rows of a study file: as stored (``raw=True``: the study's own row dicts) or as flat
    column dicts."""
    with h5py.File(path, "r") as f:
        if f.attrs.get("format") != FORMAT:
            raise ValueError(f"{path} is not a brinebolt study results file")
        g = f["variants"]
        if raw:
            return [json.loads(s) for s in g["_rows"].asstr()[()]]
        names = [str(c) for c in g.attrs["columns"]]
        data = {c: (g[c].asstr()[()] if g[c].dtype.kind == "O" else g[c][()]) for c in names}
    n = len(data[names[0]]) if names else 0
    return [{c: _py(data[c][i]) for c in names} for i in range(n)]


def _py(x):
    return x.item() if isinstance(x, np.generic) else x


def write_csv(path: str | Path, rows: Iterable[dict]) -> Path:
    """Write flat rows (:func:`read_table`) as CSV (UTF-8, a header line)."""
    rows = list(rows)
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    with open(path, "w", newline="", encoding="utf-8") as fh:
        if not rows:
            return path
        w = csv.DictWriter(fh, fieldnames=list(rows[0]))
        w.writeheader()
        for r in rows:
            w.writerow(
                {k: ("" if isinstance(v, float) and math.isnan(v) else v) for k, v in r.items()}
            )
    return path
