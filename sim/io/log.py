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

Memory
------
The writer keeps each channel the way the file stores it: as soon as a chunk of a series
dataset is full, its samples are shuffled and deflated once and only those bytes are kept (what
HDF5's own shuffle and gzip filters write for that chunk: the same filter mask and shuffled
payload, in a deflate stream that any zlib inflates; with the zlib HDF5 itself uses, the very
same bytes); the samples of the last, partial chunk stay raw. A snapshot creates each dataset
with the same chunk shape and filters, writes the kept chunks unchanged with HDF5's direct
chunk write and the partial chunk normally. So the writer holds about the compressed size of
the run (plus one raw chunk per channel) and compresses no sample twice.

Crash safety
------------
While a run is going, the log lives beside the final path as ``<stem>.incomplete.h5``. Each
:meth:`RunLogWriter.flush` builds a whole new HDF5 file holding everything so far in memory
(HDF5's core driver, no disk access by HDF5 at all), writes its bytes to
``<stem>.incomplete.h5.tmp`` with plain OS calls, fsyncs it and renames it over the incomplete
file with :func:`os.replace` (atomic). A kill at any moment therefore leaves the previous
snapshot intact: the incomplete file is always a valid HDF5 file with ``complete = False``. At
most a stray ``.tmp`` file is left behind, which the next writer for the same path deletes.
:meth:`RunLogWriter.close` writes the final snapshot (``complete = True``) to
``<name>.tmp``, renames it onto the final path and then deletes the incomplete file.

Write failures (full disk, file-size limit, I/O error)
    A failed snapshot write removes its ``.tmp`` file and stops the writer with one
    :class:`LogWriteError` (an :class:`OSError`) naming the file, the OS error and the last good
    snapshot kept on disk. The writer then tries to mark that snapshot: it rewrites it (again via
    ``.tmp`` and an atomic rename, so a failure cannot damage it) with ``ending_reason`` saying
    that writing failed; the exception says whether marking worked. HDF5 only ever writes to
    memory, so a full disk cannot leave HDF5 objects half-closed (no error flood, no crash).

One writer per output path
    A writer holds the lock file ``<name>.lock`` (for example ``run.h5.lock``, created with
    ``O_CREAT | O_EXCL``, holding the writer's pid and host name as JSON) from construction to
    :meth:`~RunLogWriter.close` / :meth:`~RunLogWriter.abort` (or a write failure, or garbage
    collection of the writer). A second writer for the same path gets :class:`LogBusyError`.
    A lock left by a killed process (same host, pid no longer running) is taken over, and the
    take-over is recorded in :attr:`RunLogWriter.notes`.

Symbolic links
    An existing symbolic link at the final or incomplete path counts as an existing file (even a
    dangling one): it is refused without ``overwrite=True``. With it, :func:`os.replace` replaces
    the link itself, never the file it points to. Temporary files are created with
    ``O_EXCL | O_NOFOLLOW`` after removing whatever was at their name.

The cost of this design is that each flush rewrites the whole log file (copying the compressed
chunks), so flush at a modest rate.
:meth:`RunLogWriter.maybe_flush` does that by wall-clock time: call it after every batch of
samples and it flushes at once when the first samples arrive, then whenever
``flush_interval_s`` (default 2 s, monotonic clock) has passed since the last flush, and never
sooner than four times the duration of the last flush after it (so rewriting a large log takes
at most about a fifth of the wall time); ``flush_interval_s = 0`` flushes at every call.

Output is deterministic: equal content gives byte-identical files, apart from ``created_utc``
(which the caller may fix). Object timestamps are switched off and objects are written in a fixed
(sorted) order, with file-format bounds pinned to ("earliest", "v108").

Reading
-------
:func:`read_log` checks what it reads and raises :class:`LogFormatError` naming the file, the
dataset or attribute and what is wrong: a missing group or dataset, text where numbers belong,
a table with missing or wrongly typed fields, NaN or infinity anywhere, ``time_s`` running
backwards, series of unequal length. A log with zero samples (a run stopped in its first
moments) reads fine as a :class:`RunLog` with ``n_samples == 0``; code that needs samples calls
:meth:`RunLog.require_samples`.
"""

from __future__ import annotations

import errno
import json
import math
import os
import re
import socket
import time
import weakref
import zlib
from collections.abc import Callable, Mapping, Sequence
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
    "LogBusyError",
    "LogClosedError",
    "LogDataError",
    "LogExistsError",
    "LogFormatError",
    "LogWriteError",
    "RunLog",
    "RunLogWriter",
    "incomplete_path_for",
    "lock_path_for",
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
_LOCK_SUFFIX = ".lock"
_LOCK_GRACE_S = 10.0  # an unreadable lock file younger than this may be a writer mid-creation
_FLUSH_COST_FACTOR = 4.0  # maybe_flush waits at least this many times the last flush's duration
_CORE_BLOCK_BYTES = 4 * 1024 * 1024  # growth step of the in-memory HDF5 image
_monotonic: Callable[[], float] = time.monotonic  # wall clock of maybe_flush (tests replace it)
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


class LogBusyError(LogExistsError):
    """Another writer holds the output path's lock file: two runs must not write one log.

    Attributes
    ----------
    path : pathlib.Path
        The final log path asked for.
    lock_path : pathlib.Path
        The lock file (``<name>.lock``).
    pid : int or None
        Process id recorded in the lock (None when the lock file cannot be read).
    host : str or None
        Host name recorded in the lock.
    """

    def __init__(
        self, path: Path, lock_path: Path, pid: int | None, host: str | None, detail: str
    ) -> None:
        self.path = path
        self.lock_path = lock_path
        self.pid = pid
        self.host = host
        super().__init__(
            f"{path} is being written by another run ({detail}); its lock file is {lock_path}. "
            "Choose another output path or wait for that run to end; --force (overwrite=True) "
            "does not take a lock from a running writer. If no such run is going on, delete "
            "the lock file."
        )

    def __reduce__(self) -> tuple[Any, ...]:
        return _rebuild_error, (type(self), self.args, _os_error_state(self))


class LogWriteError(OSError):
    """Writing the run log failed (disk full, file-size limit, I/O error...); the writer stopped.

    The message names the file being written, the OS error, and the last good snapshot kept on
    disk, and says whether it could be marked (its ``ending_reason`` set to a write-failure
    note).

    Attributes
    ----------
    errno, strerror, filename
        As for :class:`OSError`: the error number (None for a non-OS error while building the
        snapshot), its text, and the file being written.
    path : pathlib.Path
        The file being written when the error happened (a ``.tmp`` file or the lock file).
    kept : pathlib.Path or None
        The last good snapshot left on disk (the ``*.incomplete.h5`` file), None if this writer
        never wrote one.
    partial_log : pathlib.Path or None
        Same as ``kept`` (the name the command line uses for the partial log of a failed run).
    marked : bool
        True if ``kept`` was rewritten with an ``ending_reason`` telling of the failure.
    mark_error : str or None
        Why marking failed (None if it worked or was not tried).
    """

    def __init__(
        self,
        path: Path,
        cause: BaseException,
        *,
        doing: str,
        kept: Path | None = None,
        kept_what: str = "",
        marked: bool = False,
        mark_error: str | None = None,
    ) -> None:
        code, text = _error_parts(cause)
        super().__init__(code, text, str(path))
        self.path = path
        self.kept = kept
        self.partial_log = kept
        self.marked = marked
        self.mark_error = mark_error
        name = errno.errorcode.get(code, "") if isinstance(code, int) else ""
        msg = f"cannot write the run log: {doing} {path} failed: {text}"
        msg += f" ({name})" if name else ""
        msg += "; the log writer stopped."
        if code in (errno.ENOSPC, getattr(errno, "EDQUOT", errno.ENOSPC)):
            msg += " Free some disk space (or write to another folder) and run again."
        elif code == errno.EFBIG:
            msg += (
                " The file system or a file-size limit (ulimit -f) does not allow a larger "
                "file; write to another folder, lift the limit or log a shorter run."
            )
        if kept is None:
            msg += " No snapshot of this run was kept."
        elif marked:
            msg += (
                f" The last good snapshot is kept, marked incomplete with the write failure "
                f"as its ending reason: {kept}{kept_what}."
            )
        else:
            msg += (
                f" The last good snapshot is kept: {kept}{kept_what}; it is a valid incomplete "
                f"log, but marking it failed too ({mark_error}), so its ending_reason is empty."
            )
        self._message = msg

    def __str__(self) -> str:
        return self._message

    def __reduce__(self) -> tuple[Any, ...]:
        return _rebuild_error, (type(self), self.args, _os_error_state(self))


def _os_error_state(exc: OSError) -> dict[str, object]:
    state = dict(exc.__dict__)
    for key in ("errno", "strerror", "filename"):
        if getattr(exc, key) is not None:
            state[key] = getattr(exc, key)
    return state


def _rebuild_error(
    cls: type[BaseException], args: tuple[object, ...], state: dict[str, object]
) -> BaseException:
    """Unpickle an error whose __init__ takes other arguments than its ``args``."""
    exc = cls.__new__(cls, *args)
    exc.args = args
    for key, value in state.items():
        setattr(exc, key, value)
    return exc


def _error_parts(exc: BaseException) -> tuple[int | None, str]:
    """(errno, text) of an exception raised while building or writing a snapshot."""
    if isinstance(exc, OSError) and exc.errno is not None:
        return exc.errno, exc.strerror or os.strerror(exc.errno)
    if isinstance(exc, MemoryError):
        return errno.ENOMEM, f"out of memory while building the HDF5 snapshot ({exc})"
    return None, f"{type(exc).__name__}: {exc}"


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


def _chunk_shape(spec: ChannelSpec) -> tuple[int, ...]:
    """Chunk shape of a series dataset: about ``_CHUNK_BYTES`` of samples, all columns."""
    if spec.columns is None:
        return (_CHUNK_BYTES // spec.dtype.itemsize,)
    ncols = len(spec.columns)
    return (max(1, _CHUNK_BYTES // (spec.dtype.itemsize * ncols)), ncols)


def _shuffle_deflate(block: np.ndarray, level: int) -> bytes:
    """One whole chunk as HDF5 stores it with the shuffle and deflate (gzip) filters.

    The shuffle filter regroups the bytes of the chunk's elements (row-major, all columns) by
    byte position: every element's byte 0, then every byte 1...; deflate is zlib's
    ``compress2`` at ``level`` (zlib format, the same call HDF5 makes).
    """
    size = block.dtype.itemsize
    shuffled = np.ascontiguousarray(block).reshape(-1).view(np.uint8).reshape(-1, size).T
    return zlib.compress(shuffled.tobytes(), level)


def _inflate_unshuffle(data: bytes, dtype: np.dtype, shape: tuple[int, ...]) -> np.ndarray:
    """Inverse of :func:`_shuffle_deflate`: the chunk's samples as an array of ``shape``."""
    raw = np.frombuffer(zlib.decompress(data), dtype=np.uint8).reshape(dtype.itemsize, -1)
    return np.ascontiguousarray(raw.T).view(dtype).reshape(shape)


class _ChannelStore:
    """The samples of one series channel so far, kept the way the log file stores them.

    Every whole chunk (shape :func:`_chunk_shape`) is shuffled and deflated once, as soon as it
    is full, and kept as the bytes HDF5 would write for it; only the samples of the last,
    partial chunk are kept raw (one chunk-sized buffer). A snapshot writes the kept bytes with
    HDF5's direct chunk write, so the memory held is about the compressed size of the run and
    no sample is compressed twice.
    """

    __slots__ = ("chunks", "dtype", "n_tail", "rows", "shape", "tail")

    def __init__(self, spec: ChannelSpec) -> None:
        self.shape = _chunk_shape(spec)
        self.rows = self.shape[0]
        self.dtype = spec.dtype
        self.chunks: list[bytes] = []
        self.tail = np.empty(self.shape, dtype=spec.dtype)
        self.n_tail = 0

    @property
    def n(self) -> int:
        """Number of samples held."""
        return len(self.chunks) * self.rows + self.n_tail

    def extend(self, arr: np.ndarray) -> None:
        """Append samples (already checked and of the channel's dtype and column count)."""
        done, m = 0, arr.shape[0]
        while done < m:
            take = min(self.rows - self.n_tail, m - done)
            self.tail[self.n_tail : self.n_tail + take] = arr[done : done + take]
            self.n_tail += take
            done += take
            if self.n_tail == self.rows:
                self.chunks.append(_shuffle_deflate(self.tail, _GZIP_LEVEL))
                self.n_tail = 0

    def partial(self, n: int) -> np.ndarray:
        """The samples after the last whole chunk among the first ``n`` (a view or a copy)."""
        k, rem = divmod(n, self.rows)
        if k < len(self.chunks):  # that chunk was completed (and compressed) since
            return _inflate_unshuffle(self.chunks[k], self.dtype, self.shape)[:rem]
        return self.tail[:rem]

    def values(self, n: int) -> np.ndarray:
        """The first ``n`` samples as one new array (decompressing the whole chunks)."""
        k = n // self.rows
        parts = [_inflate_unshuffle(c, self.dtype, self.shape) for c in self.chunks[:k]]
        return np.concatenate([*parts, self.partial(n)])

    def write(self, group: h5py.Group, name: str, n: int) -> h5py.Dataset:
        """Create dataset ``name`` in ``group`` holding the first ``n`` samples."""
        ds = group.create_dataset(
            name,
            shape=(n, *self.shape[1:]),
            dtype=self.dtype,
            chunks=self.shape,
            maxshape=(None, *self.shape[1:]),
            compression="gzip",
            compression_opts=_GZIP_LEVEL,
            shuffle=True,
            track_times=False,
        )
        k = n // self.rows
        zeros = (0,) * (len(self.shape) - 1)
        for i, data in enumerate(self.chunks[:k]):
            ds.id.write_direct_chunk((i * self.rows, *zeros), data)
        if n > k * self.rows:
            ds[k * self.rows : n] = self.partial(n)
        return ds


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
    """Return a checked (n, [ncols]) array of the channel's dtype (a view of ``value`` when no
    conversion is needed: the caller copies it into the channel's store)."""
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
        return np.asarray(arr, dtype=_F8)
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
    return np.asarray(arr, dtype=_I4)


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


def lock_path_for(final_path: str | os.PathLike[str]) -> Path:
    """Path of the lock file a writer holds for ``final_path``: ``<name>.lock`` beside it."""
    final = Path(final_path)
    return final.with_name(final.name + _LOCK_SUFFIX)


_O_BINARY = getattr(os, "O_BINARY", 0)
_O_NOFOLLOW = getattr(os, "O_NOFOLLOW", 0)
_O_CLOEXEC = getattr(os, "O_CLOEXEC", 0)


def _write_file(path: Path, data: bytes) -> None:
    """Write ``data`` to a new file ``path`` and fsync it; on error remove the partial file.

    Whatever was at ``path`` (a stale temporary file, a symbolic link) is removed first, and the
    file is created with ``O_EXCL | O_NOFOLLOW``: a link planted at the name is never followed.
    """
    path.unlink(missing_ok=True)  # never reuse a half-written file (nor its inode, nor a link)
    fd = os.open(
        path, os.O_WRONLY | os.O_CREAT | os.O_EXCL | _O_NOFOLLOW | _O_CLOEXEC | _O_BINARY, 0o666
    )
    try:
        try:
            view = memoryview(data)
            while view:
                view = view[os.write(fd, view) :]
            os.fsync(fd)
        finally:
            os.close(fd)
    except BaseException:
        _remove_quietly(path)
        raise


def _remove_quietly(path: Path) -> None:
    try:
        path.unlink(missing_ok=True)
    except OSError:
        pass  # nothing more can be done; the next writer for this path removes stale files


def _fsync_dir(directory: Path) -> None:
    """Make a rename durable (POSIX); Windows cannot open a directory, so skip there."""
    if os.name == "nt":
        return
    fd = os.open(directory, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _create_h5_in_memory(name: Path) -> h5py.File:
    """Create an HDF5 file in memory only (core driver, no backing store).

    Object timestamps are off and the file-format bounds pinned, so its image
    (``f.id.get_file_image()``) is byte for byte what the same writes give on disk.
    """
    fapl = h5py.h5p.create(h5py.h5p.FILE_ACCESS)
    fapl.set_fclose_degree(h5py.h5f.CLOSE_STRONG)
    fapl.set_libver_bounds(h5py.h5f.LIBVER_EARLIEST, h5py.h5f.LIBVER_V18)
    fapl.set_fapl_core(_CORE_BLOCK_BYTES, False)
    fcpl = h5py.h5p.create(h5py.h5p.FILE_CREATE)
    fcpl.set_obj_track_times(False)
    fid = h5py.h5f.create(os.fsencode(name), h5py.h5f.ACC_TRUNC, fapl=fapl, fcpl=fcpl)
    return h5py.File(fid)


# ---- lock file


def _pid_alive(pid: int) -> bool:
    """True if process ``pid`` exists on this host (or if that cannot be told)."""
    if pid <= 0:
        return False
    if os.name != "posix":  # os.kill(pid, 0) would signal the process on Windows
        return True  # cannot tell cheaply: never take such a lock over
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:  # EPERM: it exists but belongs to someone else
        return True
    return True


def _read_lock(lock: Path) -> tuple[bytes, dict[str, Any] | None]:
    """Raw bytes of a lock file and its parsed content (None if unreadable or not ours)."""
    try:
        fd = os.open(lock, os.O_RDONLY | _O_NOFOLLOW | _O_CLOEXEC | _O_BINARY)
    except OSError:
        return b"", None
    try:
        raw = os.read(fd, 4096)
    except OSError:
        raw = b""
    finally:
        os.close(fd)
    try:
        info = json.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, ValueError):
        return raw, None
    if not (
        isinstance(info, dict)
        and isinstance(info.get("pid"), int)
        and isinstance(info.get("host"), str)
    ):
        return raw, None
    return raw, info


def _acquire_lock(final: Path, lock: Path, token: str) -> list[str]:
    """Create the lock file for ``final``; return notes (a stale lock taken over).

    Raises
    ------
    LogBusyError
        A live writer (or one that cannot be checked) holds the lock.
    OSError
        The lock file cannot be created (no such folder, no permission, disk full...).
    """
    host = socket.gethostname()
    me = {
        "pid": os.getpid(),
        "host": host,
        "token": token,
        "since_utc": datetime.now(UTC).isoformat(timespec="seconds"),
    }
    notes: list[str] = []
    for _attempt in range(5):
        try:
            fd = os.open(
                lock, os.O_WRONLY | os.O_CREAT | os.O_EXCL | _O_NOFOLLOW | _O_CLOEXEC, 0o644
            )
        except FileExistsError:
            raw, info = _read_lock(lock)
            if info is None:
                try:
                    age = time.time() - lock.lstat().st_mtime
                except FileNotFoundError:
                    continue  # released meanwhile: try again
                if age < _LOCK_GRACE_S:
                    raise LogBusyError(
                        final, lock, None, None, "its lock file cannot be read yet"
                    ) from None
                why = f"unreadable lock file {age:.0f} s old"
            else:
                pid, where = info["pid"], info["host"]
                if where != host:
                    raise LogBusyError(
                        final, lock, pid, where, f"pid {pid} on host {where!r}"
                    ) from None
                if pid == os.getpid() or _pid_alive(pid):
                    raise LogBusyError(final, lock, pid, where, f"pid {pid}") from None
                why = f"pid {pid} on this host is no longer running"
            # Stale: remove it unless someone replaced it since we read it.
            if _read_lock(lock)[0] == raw:
                try:
                    lock.unlink()
                except FileNotFoundError:
                    pass
                notes.append(f"took over the stale lock {lock} ({why})")
            continue
        try:
            os.write(fd, json.dumps(me, sort_keys=True).encode("utf-8") + b"\n")
        except BaseException:
            os.close(fd)
            _remove_quietly(lock)
            raise
        os.close(fd)
        return notes
    raise LogBusyError(final, lock, None, None, "its lock file keeps changing")


def _release_lock(lock: Path, token: str, owner_pid: int) -> None:
    """Delete the lock file if it is still the one holding ``token``.

    Does nothing in another process than the owner (a forked child ending must not release
    its parent's lock).
    """
    if os.getpid() != owner_pid:
        return
    _raw, info = _read_lock(lock)
    if info is not None and info.get("token") == token:
        _remove_quietly(lock)


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


@dataclass(frozen=True)
class _Snapshot:
    """How much of the writer's content a snapshot holds (counts, and the summary then)."""

    n: int
    n_events: int
    n_legs: int
    summary: Mapping[str, str | int | float | bool]
    summary_units: Mapping[str, str]
    t_end_s: float | None  # time of the last sample [s] (None without samples)


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
    flush_interval_s : float
        Wall-clock interval [s] of :meth:`maybe_flush` (default 2 s; 0 flushes at every call).

    Raises
    ------
    LogExistsError
        The final or incomplete path exists (a symbolic link there counts, even a dangling one)
        and ``overwrite`` is False.
    LogBusyError
        Another writer holds the lock file ``<name>.lock`` (see :func:`lock_path_for`).
    LogWriteError
        The lock file or the first (empty) snapshot cannot be written.

    Notes
    -----
    Construction takes the lock and already writes an empty incomplete log, so an unwritable
    folder fails at once. A write failure in :meth:`flush`, :meth:`maybe_flush`, :meth:`close`
    or :meth:`abort` raises :class:`LogWriteError` and stops the writer (state ``"failed"``):
    the last good snapshot stays on disk, marked if possible, and the lock is released; later
    :meth:`abort` calls return the kept snapshot's path and do nothing else.
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
        flush_interval_s: float = 2.0,
    ) -> None:
        final = Path(final_path)
        if final.name.endswith((_INCOMPLETE_SUFFIX, _TMP_SUFFIX, _LOCK_SUFFIX)):
            raise ValueError(
                f"{final}: the final log name must not end in {_INCOMPLETE_SUFFIX!r}, "
                f"{_TMP_SUFFIX!r} or {_LOCK_SUFFIX!r}; those names are used for the in-progress "
                "and lock files"
            )
        if (
            isinstance(flush_interval_s, bool)
            or not isinstance(flush_interval_s, int | float | np.integer | np.floating)
            or not 0.0 <= float(flush_interval_s) < math.inf
        ):
            raise ValueError(
                f"flush_interval_s must be a finite number of seconds >= 0, got "
                f"{flush_interval_s!r}"
            )
        self._flush_interval_s = float(flush_interval_s)
        self._final = final
        self._incomplete = incomplete_path_for(final)
        self._final_tmp = final.with_name(final.name + _TMP_SUFFIX)
        self._incomplete_tmp = self._incomplete.with_name(self._incomplete.name + _TMP_SUFFIX)
        self._lock = lock_path_for(final)
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

        # --- samples: whole chunks compressed as they fill, the last partial chunk raw
        self._store = {name: _ChannelStore(specs[name]) for name in self._order}
        self._n = 0
        self._last_time = -math.inf
        self._events: list[tuple[float, str, int, str]] = []
        self._legs: list[tuple[int, str, float, float, float, float, float, str]] = []
        self._summary: dict[str, str | int | float | bool] = {}
        self._summary_units: dict[str, str] = {}
        self._state = "open"
        self._dirty = False  # something was added since the last snapshot
        self._good: _Snapshot | None = None  # what the incomplete log on disk holds
        self._next_flush = -math.inf  # monotonic time before which maybe_flush waits
        self._failure: LogWriteError | None = None
        self.notes: list[str] = []
        """Things the caller may want to tell the user (e.g. a stale lock taken over)."""

        # --- claim the output name: lock first, then look for existing files
        token = os.urandom(8).hex()
        try:
            self.notes += _acquire_lock(final, self._lock, token)
        except LogBusyError:
            raise
        except OSError as exc:
            raise LogWriteError(self._lock, exc, doing="creating the lock file") from exc
        self._unlock = weakref.finalize(self, _release_lock, self._lock, token, os.getpid())
        try:
            for path, what in (
                (final, "a run log"),
                (self._incomplete, "an interrupted run's log"),
            ):
                if os.path.lexists(path) and not self._overwrite:
                    link = " (a symbolic link)" if path.is_symlink() else ""
                    raise LogExistsError(
                        f"{path} already exists{link} ({what}); refusing to overwrite it. Choose "
                        "another output path, move the file away, or use --force "
                        "(overwrite=True) to replace it."
                    )
            for stale in (self._incomplete_tmp, self._final_tmp):
                try:
                    stale.unlink(missing_ok=True)  # half-written leftovers of a killed writer
                except OSError as exc:
                    raise LogWriteError(stale, exc, doing="removing the stale file") from exc
            self.flush()
        except BaseException:
            self._unlock()
            raise

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
    def lock_path(self) -> Path:
        """Path of the lock file this writer holds while open (``<name>.lock``)."""
        return self._lock

    @property
    def state(self) -> str:
        """``"open"``, ``"closed"``, ``"aborted"`` or ``"failed"`` (after a write failure)."""
        return self._state

    @property
    def flush_interval_s(self) -> float:
        """Wall-clock interval [s] of :meth:`maybe_flush`."""
        return self._flush_interval_s

    @property
    def n_samples(self) -> int:
        """Number of samples appended so far."""
        return self._n

    @property
    def n_samples_on_disk(self) -> int:
        """Number of samples in the incomplete log on disk (the last good snapshot)."""
        return 0 if self._good is None else self._good.n

    @property
    def channel_specs(self) -> dict[str, ChannelSpec]:
        """Normalised channel specifications (``time_s`` first)."""
        return {name: self._specs[name] for name in self._order}

    # ---------------------------------------------------------------- collecting
    def _check_open(self) -> None:
        if self._state == "failed":
            raise LogClosedError(
                f"run log {self._final} stopped after a write failure: {self._failure}"
            )
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
        end = self._n + n
        for name, arr in arrays.items():
            self._store[name].extend(arr)
        self._n = end
        self._dirty = self._dirty or n > 0

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
        self._dirty = True

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
        self._dirty = True

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
        self._dirty = True

    # ---------------------------------------------------------------- writing
    def _series(self, name: str) -> np.ndarray:
        """The samples of one channel so far, as a new array (decompressed; for tests and
        inspection: the writer itself never needs them whole)."""
        return self._store[name].values(self._n)

    def _now(self) -> _Snapshot:
        return _Snapshot(
            self._n,
            len(self._events),
            len(self._legs),
            self._summary,
            self._summary_units,
            self._last_time if self._n else None,
        )

    def _image(self, label: Path, *, complete: bool, ending_reason: str, upto: _Snapshot) -> bytes:
        """Bytes of a whole log holding the first ``upto`` samples, events and legs.

        The file is built in memory (no disk access); every HDF5 object is closed before this
        returns or raises.
        """
        f = _create_h5_in_memory(label)
        try:
            _set_attrs(f, {**self._root, "complete": complete, "ending_reason": ending_reason})
            series = _create_group(f, "series")
            for name in self._order:
                spec = self._specs[name]
                ds = self._store[name].write(series, name, upto.n)
                if spec.columns is not None:
                    ds.attrs.create("columns", np.array(spec.columns, dtype=_STR), dtype=_STR)
                _set_attrs(ds, {"description": spec.description, "units": spec.units})
            for table, rows, dtype in (
                ("events", self._events[: upto.n_events], EVENT_DTYPE),
                ("legs", self._legs[: upto.n_legs], LEG_DTYPE),
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
                    **upto.summary,
                    "units": json.dumps(upto.summary_units, sort_keys=True, ensure_ascii=False),
                },
            )
            f.flush()
            return f.id.get_file_image()
        finally:
            f.close()

    def _write_snapshot(
        self, dest: Path, tmp: Path, *, complete: bool, ending_reason: str, upto: _Snapshot
    ) -> None:
        """Build a snapshot, write it to ``tmp``, fsync and rename it onto ``dest``.

        On any error ``tmp`` is gone and ``dest`` is untouched; the error is re-raised. The
        caller makes the rename durable with :func:`_fsync_dir`.
        """
        try:
            image = self._image(tmp, complete=complete, ending_reason=ending_reason, upto=upto)
            _write_file(tmp, image)
            os.replace(tmp, dest)
        except BaseException:
            _remove_quietly(tmp)
            raise

    def _fail(self, path: Path, exc: BaseException, doing: str) -> LogWriteError:
        """Stop after a write failure: mark the last good snapshot if possible, release the lock.

        Returns the :class:`LogWriteError` to raise.
        """
        self._state = "failed"
        kept, kept_what, marked, mark_error = None, "", False, None
        good = self._good
        if good is not None:
            kept = self._incomplete
            t_end = good.t_end_s
            kept_what = f" ({good.n} samples" + (f", up to t = {t_end:g} s)" if good.n else ")")
            code, text = _error_parts(exc)
            name = errno.errorcode.get(code, "") if isinstance(code, int) else ""
            lost = self._n - good.n
            reason = (
                f"write failed: {doing} {path}: {text}{f' ({name})' if name else ''}; "
                f"{lost} later sample(s) were not saved"
            )
            try:
                self._write_snapshot(
                    self._incomplete,
                    self._incomplete_tmp,
                    complete=False,
                    ending_reason=reason[:2000],
                    upto=good,
                )
                _fsync_dir(self._incomplete.parent)
                marked = True
            except Exception as exc2:  # the first error is the one to report
                code2, text2 = _error_parts(exc2)
                name2 = errno.errorcode.get(code2, "") if isinstance(code2, int) else ""
                mark_error = text2 + (f" ({name2})" if name2 else "")
        self._unlock()
        self._failure = LogWriteError(
            path,
            exc,
            doing=doing,
            kept=kept,
            kept_what=kept_what,
            marked=marked,
            mark_error=mark_error,
        )
        return self._failure

    def _replace_incomplete(self, ending_reason: str) -> None:
        upto = self._now()
        started = _monotonic()
        try:
            self._write_snapshot(
                self._incomplete,
                self._incomplete_tmp,
                complete=False,
                ending_reason=ending_reason,
                upto=upto,
            )
        except Exception as exc:
            raise self._fail(self._incomplete_tmp, exc, "writing") from exc
        self._good = upto
        self._dirty = False
        try:
            _fsync_dir(self._incomplete.parent)
        except OSError as exc:
            raise self._fail(self._incomplete.parent, exc, "syncing the folder") from exc
        done = _monotonic()
        wait = self._flush_interval_s
        if wait > 0:  # back off when flushing is slow; an interval of 0 means every call
            wait = max(wait, _FLUSH_COST_FACTOR * (done - started))
        self._next_flush = done + wait

    def flush(self) -> None:
        """Write everything so far as a whole new incomplete log (``complete = False``).

        The snapshot goes to ``<stem>.incomplete.h5.tmp``, is fsynced and then renamed over
        ``<stem>.incomplete.h5``, so the incomplete log on disk is always a valid HDF5 file.

        Raises
        ------
        LogWriteError
            The snapshot could not be written; the writer stopped (see the class notes).
        """
        self._check_open()
        self._replace_incomplete("")

    def maybe_flush(self) -> bool:
        """Flush if it is time to by the wall clock; call it after every batch of samples.

        Flushes (see :meth:`flush`) when something was added since the last flush and either
        the incomplete log on disk holds no samples yet while the writer has some (the first
        samples are saved at once), or ``flush_interval_s`` has passed on the monotonic clock
        since the last flush ended. A flush that took ``d`` seconds postpones the next one to
        at least ``4 d`` later, so that rewriting a large log never takes most of the run
        (except with ``flush_interval_s = 0``, which flushes at every call with new content).

        Returns
        -------
        bool
            True if it flushed.

        Raises
        ------
        LogWriteError
            The snapshot could not be written; the writer stopped.
        """
        self._check_open()
        if not self._dirty:
            return False
        first = self._n > 0 and (self._good is None or self._good.n == 0)
        if not first and _monotonic() < self._next_flush:
            return False
        self._replace_incomplete("")
        return True

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
        LogWriteError
            The complete log could not be written; the writer stopped, the last good
            incomplete snapshot is kept (and marked if possible).
        """
        self._check_open()
        if not isinstance(ending_reason, str) or not ending_reason.strip():
            raise ValueError("close() needs a non-empty ending_reason")
        if os.path.lexists(self._final) and not self._overwrite:
            raise LogExistsError(
                f"{self._final} was created by someone else during the run; refusing to "
                "overwrite it (use --force / overwrite=True). The run's data is still in the "
                "writer: abort() keeps it in the incomplete log."
            )
        try:
            self._write_snapshot(
                self._final,
                self._final_tmp,
                complete=True,
                ending_reason=ending_reason,
                upto=self._now(),
            )
        except Exception as exc:
            raise self._fail(self._final_tmp, exc, "writing") from exc
        # The complete log is in place: what follows cannot lose data any more.
        try:
            self._incomplete.unlink(missing_ok=True)
            _fsync_dir(self._final.parent)
        except OSError as exc:
            self.notes.append(f"after writing {self._final}: {exc}")
        self._state = "closed"
        self._unlock()
        return self._final

    def abort(self, reason: str) -> Path:
        """Stop without completing: flush with ``complete = False`` and ``ending_reason = reason``.

        The incomplete log stays on disk for inspection. Does nothing if already closed,
        aborted or stopped by a write failure. Returns the incomplete log's path.

        Raises
        ------
        LogWriteError
            The snapshot could not be written; the writer stopped, the previous snapshot is
            kept (and marked if possible).
        """
        if self._state != "open":
            return self._incomplete
        if not isinstance(reason, str) or not reason.strip():
            raise ValueError("abort() needs a non-empty reason")
        self._replace_incomplete(reason)
        self._state = "aborted"
        self._unlock()
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


def _is_text(dtype: np.dtype) -> bool:
    return dtype.kind in "SU" or h5py.check_string_dtype(dtype) is not None


def _field_kind_ok(want: np.dtype, got: np.dtype) -> bool:
    if want.kind == "f":
        return got.kind in "fiu"
    if want.kind == "i":
        return got.kind in "iu"
    return _is_text(got)


def _describe_kind(dtype: np.dtype) -> str:
    if _is_text(dtype):
        return "text"
    return {"f": "float", "i": "integer", "u": "integer", "b": "bool"}.get(dtype.kind, str(dtype))


class _Damage(Exception):
    """Internal: what is wrong with the object being read (read_log adds file and place)."""


def _table(ds: h5py.Dataset, want: np.dtype) -> list[dict[str, object]]:
    """Rows of a compound table, after checking its fields' kinds and float values."""
    names = ds.dtype.names
    if names is None:
        raise _Damage(
            f"is not a table (dtype {_describe_kind(ds.dtype)}); expected the fields "
            + ", ".join(f"{n} ({_describe_kind(want[n])})" for n in want.names or ())
        )
    for field_name in want.names or ():
        if field_name not in names:
            raise _Damage(f"has no field {field_name!r} (fields: {list(names)})")
        got = ds.dtype[field_name]
        if not _field_kind_ok(want[field_name], got):
            raise _Damage(
                f"field {field_name!r} holds {_describe_kind(got)}, expected "
                f"{_describe_kind(want[field_name])}"
            )
    if ds.ndim != 1:
        raise _Damage(f"has {ds.ndim} dimensions, expected a 1-D table")
    data = ds[()]
    for field_name in want.names or ():
        if want[field_name].kind == "f":
            values = np.asarray(data[field_name], dtype=float)
            bad = ~np.isfinite(values)
            if bad.any():
                row = int(np.argmax(bad))
                raise _Damage(
                    f"row {row} field {field_name!r} is {float(values[row])!r}; a run log never "
                    "holds NaN or infinity"
                )
    return [{name: _py(row[name]) for name in names} for row in data]


def _check_series_dtype(dtype: np.dtype) -> None:
    """A /series dataset must hold numbers (checked on the stored type, before reading)."""
    if _is_text(dtype):
        raise _Damage("holds text, expected numbers (float64 or int32)")
    if dtype.kind not in "fiu":
        raise _Damage(f"holds {_describe_kind(dtype)}, expected numbers (float64 or int32)")


def _check_series(name: str, values: np.ndarray, cols: Sequence[str] | None) -> None:
    """Check one /series dataset's values: finite, and time_s never decreasing."""
    if values.dtype.kind == "f":
        bad = ~np.isfinite(values)
        if bad.any():
            row, col = _first_bad(bad)
            idx = (row,) if col is None else (row, col)
            where = f"sample {row}"
            if col is not None:
                where += f" column {cols[col]!r}" if cols and col < len(cols) else f" column {col}"
            raise _Damage(
                f"{where} is {float(values[idx])!r}; a run log never holds NaN or infinity"
            )
    if name == "time_s" and values.size > 1:
        back = np.diff(values) < 0
        if back.any():
            row = int(np.argmax(back)) + 1
            raise _Damage(
                f"decreases at sample {row} ({values[row - 1]!r} s -> {values[row]!r} s); "
                "time never runs backwards in a run log"
            )


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

    @property
    def n_samples(self) -> int:
        """Number of samples (0 for a run stopped before its first flush of samples)."""
        return int(self.series["time_s"].shape[0])

    def require_samples(self, n_min: int = 1) -> RunLog:
        """Return this log if it holds at least ``n_min`` samples, else raise.

        :func:`read_log` reads a log with zero samples (a run stopped in its first moments),
        so code that needs samples (plots, leg tables, interpolation...) calls this first,
        e.g. ``log = read_log(path).require_samples(2)``.

        Raises
        ------
        LogFormatError
            Fewer than ``n_min`` samples, with a message naming the file.
        """
        n = self.n_samples
        if n == 0 and n_min >= 1:
            raise LogFormatError(
                f"{self.path}: the log holds no samples yet (the run was stopped in its first "
                "second?)"
            )
        if n < n_min:
            raise LogFormatError(
                f"{self.path}: the log holds only {n} sample(s); at least {n_min} are needed "
                "here (the run was stopped very early?)"
            )
        return self

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
        Not an HDF5 file, not a brinebolt run log, damaged (the message names the group,
        dataset or attribute and what is wrong), or a newer format version. A log with zero
        samples is not an error here: see :meth:`RunLog.require_samples`.
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
        where = "/"
        what = "attribute"
        try:
            attrs = {key: _py(f.attrs[key]) for key in f.attrs}
            series: dict[str, np.ndarray] = {}
            units: dict[str, str] = {}
            descriptions: dict[str, str] = {}
            columns: dict[str, list[str]] = {}
            for what, where in (
                ("group", "/series"),
                ("dataset", "/events"),
                ("dataset", "/legs"),
                ("group", "/summary"),
            ):
                kind = h5py.Group if what == "group" else h5py.Dataset
                obj = f.get(where, getlink=False)
                if obj is None:
                    raise _Damage("is missing")
                if not isinstance(obj, kind):
                    raise _Damage(f"is a {type(obj).__name__.lower()}, expected a {what}")
            group = f["series"]
            names = sorted(group)
            what, where = "dataset", "/series/time_s"
            if "time_s" not in names:
                raise _Damage("is missing")
            n = None
            for name in ["time_s", *(x for x in names if x != "time_s")]:
                what, where = "dataset", f"/series/{name}"
                ds = group[name]
                if not isinstance(ds, h5py.Dataset):
                    raise _Damage(f"is a {type(ds).__name__.lower()}, expected a dataset")
                if ds.ndim == 2:
                    if "columns" not in ds.attrs:
                        raise _Damage("has 2 dimensions but no 'columns' attribute")
                    cols = [str(c) for c in _py(ds.attrs["columns"])]  # type: ignore[union-attr]
                    if len(cols) != ds.shape[1]:
                        raise _Damage(f"has {ds.shape[1]} columns but {len(cols)} column names")
                    columns[name] = cols
                elif ds.ndim != 1:
                    raise _Damage(f"has {ds.ndim} dimensions, expected 1 (or 2 per thruster)")
                _check_series_dtype(ds.dtype)
                if n is None:
                    n = ds.shape[0]
                elif ds.shape[0] != n:
                    raise _Damage(f"has {ds.shape[0]} samples, /series/time_s has {n}")
                values = ds[()]
                _check_series(name, values, columns.get(name))
                series[name] = values
                units[name] = str(_py(ds.attrs.get("units", "")))
                descriptions[name] = str(_py(ds.attrs.get("description", "")))
            what, where = "dataset", "/events"
            events = _table(f["events"], EVENT_DTYPE)
            where = "/legs"
            legs = _table(f["legs"], LEG_DTYPE)
            what, where = "group", "/summary"
            summary = {key: _py(f["summary"].attrs[key]) for key in f["summary"].attrs}
            for key, value in summary.items():
                if isinstance(value, float) and not math.isfinite(value):
                    what, where = "attribute", f"/summary {key!r}"
                    raise _Damage(f"is {value!r}; a run log never holds NaN or infinity")
            what, where = "attribute", "/summary 'units'"
            try:
                summary_units = json.loads(str(summary.pop("units", "{}")))
            except json.JSONDecodeError as exc:
                raise _Damage(f"is not JSON text ({exc})") from None
            if not isinstance(summary_units, dict) or not all(
                isinstance(v, str) for v in summary_units.values()
            ):
                raise _Damage("must map summary keys to unit text")
        except _Damage as exc:
            raise LogFormatError(f"{p}: damaged run log: {what} {where} {exc}") from None
        except (KeyError, OSError, ValueError, TypeError, RuntimeError) as exc:
            raise LogFormatError(
                f"{p}: damaged run log: cannot read {what} {where} ({type(exc).__name__}: {exc})"
            ) from exc
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
