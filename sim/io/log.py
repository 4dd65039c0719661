"""HDF5 run log: a crash-safe writer and a reader for format ``brinebolt-run-log`` version 1.

The log knows nothing about the engine: the engine hands it plain numpy arrays, numbers, strings
and dicts. Any HDF5 tool (plain h5py, h5dump, HDFView) can read the files; brinebolt is not needed.

File layout (format version 1)
------------------------------
Root attributes
    ``format`` = ``"brinebolt-run-log"``, ``format_version`` = 1 (integer), ``tool_version``,
    ``created_utc`` (ISO-8601), ``complete`` (bool: True only in a log whose run ended normally
    or at a stop condition and was written in full), ``ending_reason`` (``""`` while running),
    the provenance strings ``scenario_path``, ``scenario_text``, ``vessel_path``,
    ``vessel_text``, ``solver`` (JSON text) and any further str/int/float provenance items.
``/series``
    One dataset per channel, chunked, gzip level 4 with the shuffle filter. A scalar channel is
    a 1-D dataset of n_samples; a per-thruster channel is 2-D (n_samples x n_thrusters) with an
    attribute ``columns`` (array of variable-length strings: the thruster names). Every dataset
    has the attributes ``units`` and ``description``. Values are float64, or int32 for integer
    channels (e.g. the leg index). ``time_s`` is always present and never decreases.
``/events``
    Compound table ``(time_s f8, kind str, leg i4, message str)``; ``leg`` is -1 outside a leg.
``/legs``
    Compound table ``(index i4, name str, t_start_s f8, t_end_s f8, distance_m f8, energy_j f8,
    mean_speed_m_s f8, ending str)``.
``/summary``
    Group whose attributes are the caller's summary values, plus ``units``: JSON text mapping
    each key to its unit.

No NaN or infinity is ever written: every float handed to the writer is checked on the way in
and a bad value raises :class:`LogDataError` naming the channel and the first bad sample.

Crash safety
------------
While a run is going, the log lives beside the final path as ``<stem>.incomplete.h5``. Each
:meth:`RunLogWriter.flush` writes a whole new HDF5 file holding everything so far to
``<stem>.incomplete.h5.tmp``, fsyncs it and renames it over the incomplete file with
:func:`os.replace` (atomic). A kill at any moment therefore leaves the previous snapshot intact:
the incomplete file is always a valid HDF5 file with ``complete = False``. At most a stray
``.tmp`` file is left behind, which the next writer for the same path deletes.
:meth:`RunLogWriter.close` writes the final snapshot (``complete = True``) to
``<name>.tmp``, renames it onto the final path and then deletes the incomplete file.

The cost of this design is that each flush rewrites the whole log, so flush at a modest rate
(every few seconds of wall time, or every few thousand samples), not after every step.

Output is deterministic: equal content gives byte-identical files, apart from ``created_utc``
(which the caller may fix). Object timestamps are switched off and objects are written in a fixed
(sorted) order, with file-format bounds pinned to ("earliest", "v108").
"""

from __future__ import annotations

import json
import math
import os
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field, replace
from datetime import UTC, datetime
from pathlib import Path
from types import TracebackType
from typing import Any

import h5py
import numpy as np

from sim import __version__ as _TOOL_VERSION

__all__ = [
    "EVENT_DTYPE",
    "FORMAT_NAME",
    "FORMAT_VERSION",
    "LEG_DTYPE",
    "REQUIRED_PROVENANCE",
    "ChannelSpec",
    "LogClosedError",
    "LogDataError",
    "LogExistsError",
    "LogFormatError",
    "RunLog",
    "RunLogWriter",
    "incomplete_path_for",
    "read_log",
]

FORMAT_NAME = "brinebolt-run-log"
FORMAT_VERSION = 1

REQUIRED_PROVENANCE = ("scenario_path", "scenario_text", "vessel_path", "vessel_text", "solver")
_RESERVED_ROOT_ATTRS = frozenset(
    {"format", "format_version", "tool_version", "created_utc", "complete", "ending_reason"}
)

_STR = h5py.string_dtype()  # variable-length UTF-8
EVENT_DTYPE = np.dtype([("time_s", "<f8"), ("kind", _STR), ("leg", "<i4"), ("message", _STR)])
LEG_DTYPE = np.dtype(
    [
        ("index", "<i4"),
        ("name", _STR),
        ("t_start_s", "<f8"),
        ("t_end_s", "<f8"),
        ("distance_m", "<f8"),
        ("energy_j", "<f8"),
        ("mean_speed_m_s", "<f8"),
        ("ending", _STR),
    ]
)

_INCOMPLETE_SUFFIX = ".incomplete.h5"
_TMP_SUFFIX = ".tmp"
_NAME_RE = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")
_F8 = np.dtype("<f8")
_I4 = np.dtype("<i4")
_CHUNK_BYTES = 64 * 1024  # target uncompressed chunk size of a series dataset
_TABLE_CHUNK_ROWS = 256
_GZIP_LEVEL = 4


# --------------------------------------------------------------------------------------------
# Errors
# --------------------------------------------------------------------------------------------


class LogExistsError(FileExistsError):
    """The output log (or an interrupted run's incomplete log) is already on disk."""


class LogDataError(ValueError):
    """A value handed to the log cannot be written (NaN, infinity, time running backwards...).

    Attributes
    ----------
    channel : str
        Channel (or ``"events/<field>"``, ``"legs/<field>"``, ``"summary/<key>"``...) at fault.
    index : int or None
        Sample index in the whole run (the row in ``/series/<channel>``), or the table row;
        None for a single value.
    value : object
        The first bad value.
    column : str or None
        Thruster (column) name for a per-thruster channel.
    """

    def __init__(
        self,
        channel: str,
        index: int | None,
        value: object,
        *,
        column: str | None = None,
        problem: str = "is not finite",
    ) -> None:
        self.channel = channel
        self.index = index
        self.value = value
        self.column = column
        where = f"log channel {channel!r}"
        if column is not None:
            where += f" column {column!r}"
        if index is not None:
            where += f" sample {index}"
        super().__init__(
            f"{where}: value {value!r} {problem}; the run log refuses it (fix it upstream)"
        )


class LogFormatError(ValueError):
    """A file is not a brinebolt run log, is damaged, or was written by a newer format version."""


class LogClosedError(RuntimeError):
    """The writer was already closed or aborted."""


# --------------------------------------------------------------------------------------------
# Channel specifications
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ChannelSpec:
    """How one series channel is stored.

    Attributes
    ----------
    units : str
        Unit text written to the dataset's ``units`` attribute (e.g. ``"m/s"``, ``"1"``).
    description : str
        One-line description (dataset attribute ``description``).
    columns : tuple of str or None
        Column (thruster) names of a per-thruster 2-D channel; None for a scalar 1-D channel.
    dtype : numpy.dtype
        float64 or int32.
    """

    units: str
    description: str
    columns: tuple[str, ...] | None = None
    dtype: np.dtype = _F8

    @property
    def ncols(self) -> int | None:
        """Number of columns of a 2-D channel, None for a 1-D channel."""
        return None if self.columns is None else len(self.columns)


def _make_spec(
    name: str, value: ChannelSpec | Sequence[Any], default_columns: tuple[str, ...] | None
) -> ChannelSpec:
    if not isinstance(name, str) or not _NAME_RE.match(name):
        raise ValueError(
            f"channel name {name!r} is not allowed: use letters, digits and '_', "
            "not starting with a digit"
        )
    if isinstance(value, ChannelSpec):
        spec = value
    else:
        if isinstance(value, str) or len(value) != 4:
            raise ValueError(
                f"channel {name!r}: spec must be a ChannelSpec or a tuple "
                f"(units, description, ncols or column names or None, dtype), got {value!r}"
            )
        units, description, ncols, dtype = value
        columns: tuple[str, ...] | None
        if ncols is None:
            columns = None
        elif isinstance(ncols, int | np.integer) and not isinstance(ncols, bool):
            if default_columns is None:
                raise ValueError(
                    f"channel {name!r} has {int(ncols)} columns but no column names: pass "
                    "columns=[thruster names] to RunLogWriter or give the names in the spec"
                )
            if len(default_columns) != int(ncols):
                raise ValueError(
                    f"channel {name!r} has {int(ncols)} columns but columns= names "
                    f"{len(default_columns)}: {list(default_columns)}"
                )
            columns = default_columns
        elif isinstance(ncols, Sequence) and not isinstance(ncols, str):
            columns = tuple(ncols)
        else:
            raise ValueError(
                f"channel {name!r}: third spec item must be None, an int or column names, "
                f"got {ncols!r}"
            )
        spec = ChannelSpec(str(units), str(description), columns, np.dtype(dtype))
    if not isinstance(spec.units, str) or not isinstance(spec.description, str):
        raise ValueError(f"channel {name!r}: units and description must be str")
    if np.dtype(spec.dtype) not in (_F8, _I4):
        raise ValueError(
            f"channel {name!r}: dtype {np.dtype(spec.dtype)} is not supported; "
            "use float64 (or int32 for integer channels such as a leg index)"
        )
    if spec.columns is not None:
        _check_columns(name, spec.columns)
    return replace(
        spec,
        columns=None if spec.columns is None else tuple(spec.columns),
        dtype=np.dtype(spec.dtype).newbyteorder("<"),
    )


def _check_columns(name: str, columns: Sequence[str]) -> None:
    if len(columns) == 0:
        raise ValueError(f"channel {name!r}: a per-thruster channel needs at least one column")
    for c in columns:
        if not isinstance(c, str) or not c or "[" in c or "]" in c:
            raise ValueError(
                f"channel {name!r}: column name {c!r} must be a non-empty str without '[' or ']'"
            )
    if len(set(columns)) != len(columns):
        raise ValueError(f"channel {name!r}: column names repeat: {list(columns)}")


# --------------------------------------------------------------------------------------------
# Value checks
# --------------------------------------------------------------------------------------------


def _check_float(where: str, value: object, index: int | None = None) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float | np.integer | np.floating):
        raise TypeError(f"{where}: expected a number, got {type(value).__name__} {value!r}")
    x = float(value)
    if not math.isfinite(x):
        raise LogDataError(where, index, x)
    return x


def _check_int(where: str, value: object) -> int:
    if isinstance(value, bool) or not isinstance(value, int | np.integer):
        raise TypeError(f"{where}: expected an int, got {type(value).__name__} {value!r}")
    i = int(value)
    if not -(2**31) <= i < 2**31:
        raise LogDataError(where, None, i, problem="does not fit in int32")
    return i


def _check_str(where: str, value: object) -> str:
    if not isinstance(value, str):
        raise TypeError(f"{where}: expected a str, got {type(value).__name__} {value!r}")
    return value


def _first_bad(bad: np.ndarray) -> tuple[int, int | None]:
    """Row (and column for 2-D) of the first True in a boolean mask."""
    rows = bad.reshape(bad.shape[0], -1).any(axis=1)
    row = int(np.argmax(rows))
    col = int(np.argmax(bad[row])) if bad.ndim == 2 else None
    return row, col


def _coerce_channel(name: str, spec: ChannelSpec, value: object, offset: int) -> np.ndarray:
    """Return a private, checked (n, [ncols]) array of the channel's dtype."""
    arr = np.asarray(value)
    want_ndim = 1 if spec.columns is None else 2
    if arr.ndim == want_ndim - 1:  # a single sample
        arr = arr[np.newaxis, ...]
    if arr.ndim != want_ndim or (spec.columns is not None and arr.shape[1] != len(spec.columns)):
        shape = "(n,)" if spec.columns is None else f"(n, {len(spec.columns)})"
        raise ValueError(f"channel {name!r}: expected an array of shape {shape}, got {arr.shape}")
    kind = arr.dtype.kind
    if kind not in "biuf":
        raise TypeError(f"channel {name!r}: expected numbers, got dtype {arr.dtype}")

    def column(col: int | None) -> str | None:
        return None if col is None or spec.columns is None else spec.columns[col]

    if kind == "f":
        bad = ~np.isfinite(arr)
        if bad.any():
            row, col = _first_bad(bad)
            idx = (row,) if col is None else (row, col)
            raise LogDataError(name, offset + row, float(arr[idx]), column=column(col))
    if spec.dtype == _F8:
        return np.array(arr, dtype=_F8, copy=True)
    # int32 channel
    if kind == "f":
        bad = arr != np.round(arr)
        problem = "is not a whole number (int32 channel)"
        if not bad.any():
            bad = (arr < -(2**31)) | (arr >= 2**31)
            problem = "does not fit in int32"
    elif kind in "iu":
        bad = (arr < -(2**31)) | (arr >= 2**31)
        problem = "does not fit in int32"
    else:
        bad = np.zeros(arr.shape, dtype=bool)
        problem = ""
    if bad.any():
        row, col = _first_bad(bad)
        idx = (row,) if col is None else (row, col)
        raise LogDataError(name, offset + row, arr[idx].item(), column=column(col), problem=problem)
    return np.array(arr, dtype=_I4, copy=True)


def _attr_value(where: str, value: object) -> str | int | float | bool:
    """Check a scalar attribute value (str, int, float or bool; floats finite)."""
    if isinstance(value, str | bool | np.bool_):
        return value if isinstance(value, str) else bool(value)
    if isinstance(value, int | np.integer):
        return int(value)
    if isinstance(value, float | np.floating):
        return _check_float(where, value)
    if isinstance(value, os.PathLike):
        return os.fspath(value)
    raise TypeError(
        f"{where}: attribute values must be str, int, float or bool, got "
        f"{type(value).__name__} {value!r}"
    )


# --------------------------------------------------------------------------------------------
# Paths and low-level file helpers
# --------------------------------------------------------------------------------------------


def incomplete_path_for(final_path: str | os.PathLike[str]) -> Path:
    """Path of the in-progress log for ``final_path``: ``<stem>.incomplete.h5`` beside it."""
    final = Path(final_path)
    return final.with_name(final.stem + _INCOMPLETE_SUFFIX)


def _fsync_path(path: Path) -> None:
    fd = os.open(path, os.O_RDWR | getattr(os, "O_BINARY", 0))
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _fsync_dir(directory: Path) -> None:
    """Make a rename durable (POSIX); Windows cannot open a directory, so skip there."""
    if os.name == "nt":
        return
    fd = os.open(directory, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _create_h5(path: Path) -> h5py.File:
    """Create (truncate) an HDF5 file with object timestamps off and format bounds pinned."""
    fapl = h5py.h5p.create(h5py.h5p.FILE_ACCESS)
    fapl.set_fclose_degree(h5py.h5f.CLOSE_STRONG)
    fapl.set_libver_bounds(h5py.h5f.LIBVER_EARLIEST, h5py.h5f.LIBVER_V18)
    if hasattr(fapl, "set_file_locking"):  # nobody else opens our temporary file
        fapl.set_file_locking(False, True)
    fcpl = h5py.h5p.create(h5py.h5p.FILE_CREATE)
    fcpl.set_obj_track_times(False)
    fid = h5py.h5f.create(os.fsencode(path), h5py.h5f.ACC_TRUNC, fapl=fapl, fcpl=fcpl)
    return h5py.File(fid)


def _create_group(parent: h5py.Group, name: str) -> h5py.Group:
    gcpl = h5py.h5p.create(h5py.h5p.GROUP_CREATE)
    gcpl.set_obj_track_times(False)
    return h5py.Group(h5py.h5g.create(parent.id, name.encode(), gcpl=gcpl))


def _set_attrs(obj: h5py.HLObject, attrs: Mapping[str, object]) -> None:
    for key in sorted(attrs):
        value = attrs[key]
        if isinstance(value, bool):
            obj.attrs[key] = np.bool_(value)
        elif isinstance(value, str):
            obj.attrs.create(key, value, dtype=_STR)
        elif isinstance(value, int):
            obj.attrs[key] = np.int64(value)
        else:
            obj.attrs[key] = np.float64(value)


# --------------------------------------------------------------------------------------------
# Writer
# --------------------------------------------------------------------------------------------


class RunLogWriter:
    """Collect a run's series, events, legs and summary and keep them on disk crash-safely.

    Parameters
    ----------
    final_path : path-like
        Where the finished log goes (conventionally ``*.h5``). The in-progress file is
        ``<stem>.incomplete.h5`` in the same folder (see :func:`incomplete_path_for`).
    overwrite : bool
        Replace an existing log at ``final_path`` (and a left-over incomplete log). Without it
        either one raises :class:`LogExistsError`. An existing final log is only replaced when
        :meth:`close` succeeds, so a run that dies keeps the old log.
    provenance : mapping
        Must hold ``scenario_path``, ``scenario_text``, ``vessel_path``, ``vessel_text`` (str or
        path-like) and ``solver`` (JSON text, or a mapping that is dumped to JSON). Further
        items may be str, int, float or bool; all become root attributes.
    channel_specs : mapping
        Channel name -> :class:`ChannelSpec` or tuple ``(units, description, ncols, dtype)``
        where ``ncols`` is None (scalar channel), an int (per-thruster channel named by
        ``columns``) or a sequence of column names; ``dtype`` is float64 or int32. ``time_s``
        is added (units ``s``) if missing.
    columns : sequence of str, optional
        Thruster names used by per-thruster channels whose spec gives only a column count.
    created_utc : str, optional
        Creation time text; default the current UTC time in ISO-8601. Fix it to get
        byte-identical files from identical content.
    tool_version : str, optional
        Version text to record; default the running brinebolt version.

    Notes
    -----
    Construction already writes an empty incomplete log, so an unwritable folder fails at once.
    The writer is not thread-safe. Used as a context manager it aborts (keeping the incomplete
    log) when the block raises, and also when the block ends without :meth:`close`, because only
    the caller knows why and whether the run ended.
    """

    def __init__(
        self,
        final_path: str | os.PathLike[str],
        *,
        overwrite: bool = False,
        provenance: Mapping[str, object],
        channel_specs: Mapping[str, ChannelSpec | Sequence[Any]],
        columns: Sequence[str] | None = None,
        created_utc: str | None = None,
        tool_version: str | None = None,
    ) -> None:
        final = Path(final_path)
        if final.name.endswith(_INCOMPLETE_SUFFIX) or final.name.endswith(_TMP_SUFFIX):
            raise ValueError(
                f"{final}: the final log name must not end in {_INCOMPLETE_SUFFIX!r} or "
                f"{_TMP_SUFFIX!r}; those names are used for the in-progress files"
            )
        self._final = final
        self._incomplete = incomplete_path_for(final)
        self._final_tmp = final.with_name(final.name + _TMP_SUFFIX)
        self._incomplete_tmp = self._incomplete.with_name(self._incomplete.name + _TMP_SUFFIX)
        self._overwrite = bool(overwrite)

        # --- channels
        default_columns = None
        if columns is not None:
            default_columns = tuple(columns)
            _check_columns("columns=", default_columns)
        specs = {
            name: _make_spec(name, value, default_columns) for name, value in channel_specs.items()
        }
        if "time_s" not in specs:
            specs["time_s"] = ChannelSpec("s", "simulation time since the start of the run")
        elif specs["time_s"].columns is not None or specs["time_s"].dtype != _F8:
            raise ValueError("channel 'time_s' must be a 1-D float64 channel")
        # time_s first, then by name: the write order (and so the bytes) do not depend on the
        # order of the caller's dict.
        self._order = ["time_s", *sorted(n for n in specs if n != "time_s")]
        self._specs = specs

        # --- root attributes
        root: dict[str, object] = {}
        missing = [k for k in REQUIRED_PROVENANCE if k not in provenance]
        if missing:
            raise ValueError(
                f"provenance is missing {missing}; it needs {list(REQUIRED_PROVENANCE)}"
            )
        for key, value in provenance.items():
            if not isinstance(key, str) or not key or "/" in key:
                raise ValueError(f"provenance key {key!r} must be a non-empty str without '/'")
            if key in _RESERVED_ROOT_ATTRS:
                raise ValueError(f"provenance key {key!r} is reserved by the log format")
            where = f"provenance/{key}"
            if key == "solver":
                if isinstance(value, Mapping):
                    value = json.dumps(value, sort_keys=True, ensure_ascii=False)
                try:
                    json.loads(_check_str(where, value))
                except json.JSONDecodeError as exc:
                    raise ValueError(f"provenance 'solver' is not valid JSON text: {exc}") from exc
            elif key in REQUIRED_PROVENANCE:
                value = os.fspath(value) if isinstance(value, os.PathLike) else value
                _check_str(where, value)
            root[key] = _attr_value(where, value)
        root["format"] = FORMAT_NAME
        root["format_version"] = FORMAT_VERSION
        root["tool_version"] = _check_str(
            "tool_version", _TOOL_VERSION if tool_version is None else tool_version
        )
        if created_utc is None:
            created_utc = datetime.now(UTC).isoformat(timespec="seconds")
        root["created_utc"] = _check_str("created_utc", created_utc)
        self._root = root

        # --- buffers
        self._chunks: dict[str, list[np.ndarray]] = {name: [] for name in self._order}
        self._n = 0
        self._last_time = -math.inf
        self._events: list[tuple[float, str, int, str]] = []
        self._legs: list[tuple[int, str, float, float, float, float, float, str]] = []
        self._summary: dict[str, str | int | float | bool] = {}
        self._summary_units: dict[str, str] = {}
        self._state = "open"

        # --- claim the output name
        for path, what in ((final, "a run log"), (self._incomplete, "an interrupted run's log")):
            if path.exists() and not self._overwrite:
                raise LogExistsError(
                    f"{path} already exists ({what}); refusing to overwrite it. Choose another "
                    "output path, move the file away, or use --force (overwrite=True) to "
                    "replace it."
                )
        for stale in (self._incomplete_tmp, self._final_tmp):
            stale.unlink(missing_ok=True)  # half-written leftovers of a killed writer
        self.flush()

    # ---------------------------------------------------------------- properties
    @property
    def path(self) -> Path:
        """Final path of the log."""
        return self._final

    @property
    def incomplete_path(self) -> Path:
        """Path of the in-progress log (``<stem>.incomplete.h5``)."""
        return self._incomplete

    @property
    def n_samples(self) -> int:
        """Number of samples appended so far."""
        return self._n

    @property
    def channel_specs(self) -> dict[str, ChannelSpec]:
        """Normalised channel specifications (``time_s`` first)."""
        return {name: self._specs[name] for name in self._order}

    # ---------------------------------------------------------------- collecting
    def _check_open(self) -> None:
        if self._state != "open":
            raise LogClosedError(f"run log {self._final} is already {self._state}")

    def append(self, samples: Mapping[str, object]) -> None:
        """Add samples to every channel.

        Parameters
        ----------
        samples : mapping
            Channel name -> array along the time axis: shape (n,) for a scalar channel,
            (n, n_columns) for a per-thruster channel; a scalar / a single row counts as one
            sample. Every channel must be given, all with the same n. The arrays are copied.

        Raises
        ------
        LogDataError
            A float is NaN or infinite, ``time_s`` decreases, or an int32 channel gets a value
            that is not a whole number in range. Nothing of the call is kept then.
        """
        self._check_open()
        unknown = sorted(set(samples) - set(self._specs))
        if unknown:
            raise ValueError(f"unknown log channel(s) {unknown}; known: {self._order}")
        missing = [name for name in self._order if name not in samples]
        if missing:
            raise ValueError(f"append() is missing channel(s) {missing}")
        arrays = {
            name: _coerce_channel(name, self._specs[name], samples[name], self._n)
            for name in self._order
        }
        n = arrays["time_s"].shape[0]
        for name, arr in arrays.items():
            if arr.shape[0] != n:
                raise ValueError(
                    f"append(): channel {name!r} has {arr.shape[0]} samples but time_s has {n}"
                )
        t = arrays["time_s"]
        if n:
            prev = np.concatenate(([self._last_time], t[:-1]))
            back = t < prev
            if back.any():
                row = int(np.argmax(back))
                raise LogDataError(
                    "time_s",
                    self._n + row,
                    float(t[row]),
                    problem=f"is earlier than the sample before it ({float(prev[row])!r} s)",
                )
            self._last_time = float(t[-1])
        for name, arr in arrays.items():
            self._chunks[name].append(arr)
        self._n += n

    def add_event(self, time_s: float, kind: str, leg: int, message: str) -> None:
        """Record an event: time [s], kind (short tag), leg index (-1 outside a leg), message."""
        self._check_open()
        row = len(self._events)
        self._events.append(
            (
                _check_float("events/time_s", time_s, row),
                _check_str("events/kind", kind),
                _check_int("events/leg", leg),
                _check_str("events/message", message),
            )
        )

    def add_leg(
        self,
        *,
        index: int,
        name: str,
        t_start_s: float,
        t_end_s: float,
        distance_m: float,
        energy_j: float,
        mean_speed_m_s: float,
        ending: str,
    ) -> None:
        """Record a finished leg: times [s], distance [m], energy [J], mean speed [m/s], ending."""
        self._check_open()
        row = len(self._legs)
        self._legs.append(
            (
                _check_int("legs/index", index),
                _check_str("legs/name", name),
                _check_float("legs/t_start_s", t_start_s, row),
                _check_float("legs/t_end_s", t_end_s, row),
                _check_float("legs/distance_m", distance_m, row),
                _check_float("legs/energy_j", energy_j, row),
                _check_float("legs/mean_speed_m_s", mean_speed_m_s, row),
                _check_str("legs/ending", ending),
            )
        )

    def set_summary(
        self, values: Mapping[str, object], units: Mapping[str, str] | None = None
    ) -> None:
        """Set (replace) the run summary: key -> str/int/float/bool, and key -> unit text.

        Every key of ``units`` must be a key of ``values``; ``"units"`` itself is reserved.
        """
        self._check_open()
        checked: dict[str, str | int | float | bool] = {}
        for key, value in values.items():
            if not isinstance(key, str) or not key or "/" in key or key == "units":
                raise ValueError(f"summary key {key!r} is not allowed")
            checked[key] = _attr_value(f"summary/{key}", value)
        units = dict(units or {})
        stray = sorted(set(units) - set(checked))
        if stray:
            raise ValueError(f"summary units given for keys without a value: {stray}")
        for key, unit in units.items():
            _check_str(f"summary units of {key!r}", unit)
        self._summary = checked
        self._summary_units = units

    # ---------------------------------------------------------------- writing
    def _series(self, name: str) -> np.ndarray:
        chunks = self._chunks[name]
        if len(chunks) > 1:  # consolidate so later flushes do not concatenate again
            chunks[:] = [np.concatenate(chunks, axis=0)]
        if chunks:
            return chunks[0]
        spec = self._specs[name]
        shape = (0,) if spec.columns is None else (0, len(spec.columns))
        return np.empty(shape, dtype=spec.dtype)

    def _write_snapshot(self, path: Path, *, complete: bool, ending_reason: str) -> None:
        path.unlink(missing_ok=True)  # never reuse a half-written file (nor its inode)
        with _create_h5(path) as f:
            _set_attrs(f, {**self._root, "complete": complete, "ending_reason": ending_reason})
            series = _create_group(f, "series")
            for name in self._order:
                spec = self._specs[name]
                data = self._series(name)
                if spec.columns is None:
                    chunks: tuple[int, ...] = (_CHUNK_BYTES // spec.dtype.itemsize,)
                    maxshape: tuple[int | None, ...] = (None,)
                else:
                    ncols = len(spec.columns)
                    rows = max(1, _CHUNK_BYTES // (spec.dtype.itemsize * ncols))
                    chunks, maxshape = (rows, ncols), (None, ncols)
                ds = series.create_dataset(
                    name,
                    data=data,
                    dtype=spec.dtype,
                    chunks=chunks,
                    maxshape=maxshape,
                    compression="gzip",
                    compression_opts=_GZIP_LEVEL,
                    shuffle=True,
                    track_times=False,
                )
                if spec.columns is not None:
                    ds.attrs.create("columns", np.array(spec.columns, dtype=_STR), dtype=_STR)
                _set_attrs(ds, {"description": spec.description, "units": spec.units})
            for table, rows, dtype in (
                ("events", self._events, EVENT_DTYPE),
                ("legs", self._legs, LEG_DTYPE),
            ):
                f.create_dataset(
                    table,
                    data=np.array(rows, dtype=dtype),
                    chunks=(_TABLE_CHUNK_ROWS,),
                    maxshape=(None,),
                    compression="gzip",
                    compression_opts=_GZIP_LEVEL,
                    shuffle=True,
                    track_times=False,
                )
            summary = _create_group(f, "summary")
            _set_attrs(
                summary,
                {
                    **self._summary,
                    "units": json.dumps(self._summary_units, sort_keys=True, ensure_ascii=False),
                },
            )
        _fsync_path(path)

    def flush(self) -> None:
        """Write everything so far as a whole new incomplete log (``complete = False``).

        The snapshot goes to ``<stem>.incomplete.h5.tmp``, is fsynced and then renamed over
        ``<stem>.incomplete.h5``, so the incomplete log on disk is always a valid HDF5 file.
        """
        self._check_open()
        self._replace_incomplete("")

    def _replace_incomplete(self, ending_reason: str) -> None:
        self._write_snapshot(self._incomplete_tmp, complete=False, ending_reason=ending_reason)
        os.replace(self._incomplete_tmp, self._incomplete)
        _fsync_dir(self._incomplete.parent)

    def close(self, ending_reason: str) -> Path:
        """Finish the run: write the complete log to the final path and delete the incomplete one.

        Parameters
        ----------
        ending_reason : str
            Why the run ended (non-empty), e.g. ``"mission complete"`` or a stop condition.

        Returns
        -------
        pathlib.Path
            The final path.

        Raises
        ------
        LogExistsError
            The final path appeared meanwhile and ``overwrite`` is False (the writer stays open,
            so :meth:`abort` can still keep the data in the incomplete log).
        """
        self._check_open()
        if not isinstance(ending_reason, str) or not ending_reason.strip():
            raise ValueError("close() needs a non-empty ending_reason")
        if self._final.exists() and not self._overwrite:
            raise LogExistsError(
                f"{self._final} was created by someone else during the run; refusing to "
                "overwrite it (use --force / overwrite=True). The run's data is still in the "
                "writer: abort() keeps it in the incomplete log."
            )
        self._write_snapshot(self._final_tmp, complete=True, ending_reason=ending_reason)
        os.replace(self._final_tmp, self._final)
        self._incomplete.unlink(missing_ok=True)
        _fsync_dir(self._final.parent)
        self._state = "closed"
        return self._final

    def abort(self, reason: str) -> Path:
        """Stop without completing: flush with ``complete = False`` and ``ending_reason = reason``.

        The incomplete log stays on disk for inspection. Does nothing if already closed or
        aborted. Returns the incomplete log's path.
        """
        if self._state != "open":
            return self._incomplete
        if not isinstance(reason, str) or not reason.strip():
            raise ValueError("abort() needs a non-empty reason")
        self._replace_incomplete(reason)  # on failure the writer stays open: abort can be retried
        self._state = "aborted"
        return self._incomplete

    def __enter__(self) -> RunLogWriter:
        return self

    def __exit__(
        self,
        exc_type: type[BaseException] | None,
        exc: BaseException | None,
        tb: TracebackType | None,
    ) -> None:
        if self._state != "open":
            return
        if exc_type is None:
            self.abort("writer left without close()")
        elif issubclass(exc_type, KeyboardInterrupt | SystemExit):
            self.abort(f"interrupted: {exc_type.__name__}")
        else:
            text = f"error: {exc_type.__name__}: {exc}"
            self.abort(text if len(text) <= 500 else text[:497] + "...")


# --------------------------------------------------------------------------------------------
# Reader
# --------------------------------------------------------------------------------------------


def _py(value: object) -> object:
    """HDF5 attribute value -> plain Python value."""
    if isinstance(value, bytes):
        return value.decode("utf-8")
    if isinstance(value, np.bool_):
        return bool(value)
    if isinstance(value, np.integer):
        return int(value)
    if isinstance(value, np.floating):
        return float(value)
    if isinstance(value, np.ndarray):
        return [_py(v) for v in value.tolist()]
    return value


def _table(ds: h5py.Dataset) -> list[dict[str, object]]:
    data = ds[()]
    names = data.dtype.names or ()
    return [{name: _py(row[name]) for name in names} for row in data]


@dataclass
class RunLog:
    """Everything in one run log, as plain Python and numpy objects.

    Attributes
    ----------
    path : pathlib.Path
        File read.
    format_version : int
        Format version of the file.
    complete : bool
        True only for a run that ended (normally or at a stop condition) and was written in full.
    attrs : dict
        All root attributes (provenance included).
    series : dict of str -> numpy.ndarray
        Channel -> samples; 1-D, or 2-D (n_samples x n_columns) for per-thruster channels.
    units, descriptions : dict of str -> str
        Channel -> unit text / description.
    columns : dict of str -> list of str
        Per-thruster channel -> column (thruster) names.
    events, legs : list of dict
        Rows of ``/events`` and ``/legs``.
    summary : dict
        Summary values; ``summary_units`` maps keys to unit text.
    """

    path: Path
    format_version: int
    complete: bool
    attrs: dict[str, object]
    series: dict[str, np.ndarray]
    units: dict[str, str]
    descriptions: dict[str, str]
    columns: dict[str, list[str]] = field(default_factory=dict)
    events: list[dict[str, object]] = field(default_factory=list)
    legs: list[dict[str, object]] = field(default_factory=list)
    summary: dict[str, object] = field(default_factory=dict)
    summary_units: dict[str, str] = field(default_factory=dict)

    @property
    def ending_reason(self) -> str:
        """Why the run ended (``""`` if the writer never got to say)."""
        return str(self.attrs.get("ending_reason", ""))

    def to_dataframe(self) -> Any:
        """Series as a pandas DataFrame (needs pandas).

        Scalar channels become one column each; a per-thruster channel ``thrust_n`` becomes
        ``thrust_n[port]``, ``thrust_n[stbd]``... Column units are in ``df.attrs["units"]``.
        """
        try:
            import pandas as pd
        except ImportError as exc:  # pragma: no cover - depends on the environment
            raise ImportError(
                "RunLog.to_dataframe() needs pandas: pip install pandas "
                "(or install brinebolt with its 'test' extra)"
            ) from exc
        data: dict[str, np.ndarray] = {}
        units: dict[str, str] = {}
        for name, values in self.series.items():
            if values.ndim == 1:
                data[name] = values
                units[name] = self.units.get(name, "")
            else:
                for j, col in enumerate(self.columns[name]):
                    key = f"{name}[{col}]"
                    data[key] = values[:, j]
                    units[key] = self.units.get(name, "")
        df = pd.DataFrame(data)
        df.attrs["units"] = units
        return df


def read_log(path: str | os.PathLike[str]) -> RunLog:
    """Read a run log (finished or ``.incomplete.h5``).

    Raises
    ------
    FileNotFoundError
        No such file (the message points at an incomplete log if one exists).
    LogFormatError
        Not an HDF5 file, not a brinebolt run log, damaged, or a newer format version.
    """
    p = Path(path)
    if not p.exists():
        hint = ""
        if not p.name.endswith(_INCOMPLETE_SUFFIX) and incomplete_path_for(p).exists():
            hint = f"; the run did not finish: its incomplete log is {incomplete_path_for(p)}"
        raise FileNotFoundError(f"no run log at {p}{hint}")
    try:
        f = h5py.File(p, "r")
    except OSError as exc:
        raise LogFormatError(f"{p} is not a readable HDF5 file: {exc}") from exc
    with f:
        fmt = _py(f.attrs.get("format"))
        if fmt != FORMAT_NAME:
            raise LogFormatError(
                f"{p} is not a brinebolt run log: root attribute 'format' is {fmt!r}, "
                f"expected {FORMAT_NAME!r}"
            )
        version = _py(f.attrs.get("format_version"))
        if not isinstance(version, int) or version < 1:
            raise LogFormatError(f"{p}: bad run-log format_version {version!r}")
        if version > FORMAT_VERSION:
            raise LogFormatError(
                f"{p} uses run-log format version {version} (written by brinebolt "
                f"{_py(f.attrs.get('tool_version'))}); this brinebolt ({_TOOL_VERSION}) reads "
                f"versions up to {FORMAT_VERSION}. Upgrade brinebolt to read it."
            )
        try:
            attrs = {key: _py(f.attrs[key]) for key in f.attrs}
            series: dict[str, np.ndarray] = {}
            units: dict[str, str] = {}
            descriptions: dict[str, str] = {}
            columns: dict[str, list[str]] = {}
            group = f["series"]
            names = sorted(group)
            if "time_s" not in names:
                raise LogFormatError(f"{p}: /series has no time_s")
            for name in ["time_s", *(n for n in names if n != "time_s")]:
                ds = group[name]
                values = ds[()]
                if values.ndim == 2:
                    cols = [str(c) for c in _py(ds.attrs["columns"])]
                    if len(cols) != values.shape[1]:
                        raise LogFormatError(
                            f"{p}: /series/{name} has {values.shape[1]} columns but "
                            f"{len(cols)} column names"
                        )
                    columns[name] = cols
                elif values.ndim != 1:
                    raise LogFormatError(f"{p}: /series/{name} has {values.ndim} dimensions")
                if values.shape[0] != group["time_s"].shape[0]:
                    raise LogFormatError(
                        f"{p}: /series/{name} has {values.shape[0]} samples, time_s has "
                        f"{group['time_s'].shape[0]}"
                    )
                series[name] = values
                units[name] = str(_py(ds.attrs.get("units", "")))
                descriptions[name] = str(_py(ds.attrs.get("description", "")))
            events = _table(f["events"])
            legs = _table(f["legs"])
            summary = {key: _py(f["summary"].attrs[key]) for key in f["summary"].attrs}
            summary_units = json.loads(str(summary.pop("units", "{}")))
        except (KeyError, OSError, ValueError) as exc:
            if isinstance(exc, LogFormatError):
                raise
            raise LogFormatError(f"{p}: damaged run log ({type(exc).__name__}: {exc})") from exc
    return RunLog(
        path=p,
        format_version=version,
        complete=bool(attrs.get("complete", False)),
        attrs=attrs,
        series=series,
        units=units,
        descriptions=descriptions,
        columns=columns,
        events=events,
        legs=legs,
        summary=summary,
        summary_units=summary_units,
    )
