"""The option vocabulary shared by the commands: how each option is declared (``add_*``) and how
its text becomes a checked SI value (the parsers raise :class:`~sim.cli.core.OptionError`, naming
the option, the value and what is allowed).

=====================  =====================================================================
``--units``            nautical (kn, nmi; default) or metric (m/s, km) in printed tables
``--water``            ``"SALINITY,TEMPERATURE"``, e.g. ``"35,15 degC"``
``--plots DIR``        folder of the figures; ``--no-plots``; ``--pdf`` for PDF copies
``--out`` ``--force``  the output file, and leave to replace an existing one
=====================  =====================================================================
"""

from __future__ import annotations

from pathlib import Path

from sim.analysis.units import UNIT_SYSTEMS
from sim.cli.core import OptionError, esc, print_problems

DEFAULT_WATER = "35,15 degC"
"""Water of the commands that take one: open sea, practical salinity 35 at 15 °C."""

# ---------------------------------------------------------------------------- declaring options


def add_units(p) -> None:
    """``--units nautical|metric``."""
    p.add_argument(
        "--units",
        choices=sorted(UNIT_SYSTEMS),
        default="nautical",
        help="speeds and distances in knots & nautical miles (nautical, default) "
        "or m/s & km (metric)",
    )


def add_water(p, *, repeat: bool = False, default_help: str = f'"{DEFAULT_WATER}"') -> None:
    """``--water "SALINITY,TEMPERATURE"`` (repeatable when ``repeat``; then the default is
    ``None`` and the command picks its own)."""
    if repeat:
        p.add_argument(
            "--water",
            action="append",
            metavar="SAL,TEMP",
            help='water as "SALINITY,TEMPERATURE", e.g. "35,15 degC"; repeat to compare '
            f"(default: {default_help})",
        )
    else:
        p.add_argument(
            "--water",
            metavar="SAL,TEMP",
            default=None,
            help=f'water as "SALINITY,TEMPERATURE" (default {default_help})',
        )


def add_plots(p, what: str) -> None:
    """``--plots DIR``, ``--no-plots`` and ``--pdf``."""
    p.add_argument(
        "--plots",
        metavar="DIR",
        default="outputs",
        help=f"folder for the {what} figure(s) (default outputs)",
    )
    p.add_argument("--no-plots", action="store_true", help="write no figures")
    p.add_argument("--pdf", action="store_true", help="write each figure as PDF too")


def add_out(p, help: str) -> None:
    """``--out PATH``."""
    p.add_argument("--out", help=help)


def add_force(p, help: str) -> None:
    """``--force``."""
    p.add_argument("--force", action="store_true", help=help)


# ---------------------------------------------------------------------------- reading values


def parse_positive(text: str | None, what: str, kind: str, example: str) -> float | None:
    """A positive quantity of ``kind`` given as option ``what``, in SI; None when not given."""
    if text is None:
        return None
    from sim.io.units import UnitParseError, to_si

    try:
        value = to_si(text, kind)
    except UnitParseError as exc:
        raise OptionError(f"option {what} = {text!r}: {exc}") from None
    if not value > 0:
        raise OptionError(
            f"option {what} = {text!r}: not positive; allowed: a positive {kind}, e.g. {example}"
        )
    return value


def parse_time(text: str | None, what: str) -> float | None:
    """A positive time [s], e.g. ``"5 s"``; None when not given."""
    return parse_positive(text, what, "time", '"5 s"')


def speed(text: str, what: str) -> float:
    """One speed [m/s] (any sign), e.g. ``"1 kn"``."""
    from sim.io.units import UnitParseError, to_si

    try:
        return to_si(text.strip(), "speed")
    except UnitParseError as exc:
        raise OptionError(f"option {what} = {text!r}: {exc}") from None


def speeds(text: str | None, what: str) -> list[float] | None:
    """Comma-separated positive speeds [m/s], sorted; None when not given."""
    if text is None:
        return None
    vals = [speed(s, what) for s in text.split(",") if s.strip()]
    if not vals or any(v <= 0 for v in vals):
        raise OptionError(f'option {what} = {text!r}: allowed: positive speeds, e.g. "0.5 kn,1 kn"')
    return sorted(vals)


def quantities(text: str | None, kind: str, what: str, example: str) -> list[float] | None:
    """Comma-separated positive quantities of ``kind`` in SI; None when not given."""
    from sim.io.units import UnitParseError, to_si

    if text is None:
        return None
    try:
        vals = [to_si(s.strip(), kind) for s in text.split(",") if s.strip()]
    except UnitParseError as exc:
        raise OptionError(f"option {what} = {text!r}: {exc}") from None
    if not vals or any(not v > 0 for v in vals):
        raise OptionError(f"option {what} = {text!r}: allowed: positive values, e.g. {example}")
    return vals


def soc(value: float | None, what: str) -> float | None:
    """A state of charge from 0 to 1 [-]; None when not given."""
    if value is not None and not 0.0 <= value <= 1.0:
        raise OptionError(f"option {what} = {value}: allowed: a state of charge from 0 to 1")
    return value


def water(text: str, what: str = "--water"):
    """``"35,15 degC"`` → the engine's :class:`sim.engine.spec.Water`, checked as a file's
    ``[water]`` table is."""
    from pydantic import ValidationError

    from sim.io.schema import WaterSpec
    from sim.io.seam import water as to_water

    sal, sep, temp = text.partition(",")
    try:
        if not sep:
            raise ValueError
        return to_water(WaterSpec(salinity=float(sal), temperature=temp.strip()))
    except (ValueError, ValidationError) as exc:
        detail = f" ({exc.errors()[0]['msg']})" if isinstance(exc, ValidationError) else ""
        raise OptionError(
            f'option {what} = {text!r}{detail}: allowed: "SALINITY,TEMPERATURE" with salinity '
            'on the PSS-78 scale (0 to 42) and a temperature with its unit, e.g. "35,15 degC"'
        ) from None


def check_log_out(out: str | None, force: bool) -> None:
    """Refuse an ``--out`` that cannot be a log file, or that exists without ``--force``, before
    anything is run."""
    if out is None:
        return
    from sim.io.log import incomplete_path_for

    path = Path(out)
    if path.is_dir():
        raise OptionError(f"option --out = {out!r} is a folder; allowed: a file path, e.g. run.h5")
    if path.name.endswith((".incomplete.h5", ".tmp")):
        raise OptionError(
            f"option --out = {out!r}: names ending in .incomplete.h5 or .tmp are kept for "
            "in-progress logs; allowed: another name, e.g. run.h5"
        )
    if not force:
        for p in (path, incomplete_path_for(path)):
            if p.exists():
                raise OptionError(
                    f"{p} already exists; nothing was run. Use --force to replace it, or choose "
                    "another --out (without --out, brinebolt picks a free name in outputs/)"
                )


def read_log(path: str, min_samples: int = 1):
    """The run log at ``path`` (argument ``LOG``) as a :class:`sim.io.log.RunLog`, holding at
    least ``min_samples`` samples (:meth:`~sim.io.log.RunLog.require_samples`); a missing,
    damaged or empty log is an :class:`OptionError` (exit code 2) naming the file."""
    from sim.io.log import LogFormatError, read_log

    try:
        return read_log(path).require_samples(min_samples)
    except (OSError, LogFormatError, KeyError, ValueError) as exc:
        raise OptionError(f"LOG {path!r}: cannot use it: {exc}") from None


def load_vessel(path: str, con):
    """The vessel file at ``path`` (argument ``VESSEL``), its warnings printed on ``con``."""
    from sim import api

    vessel = api.load_vessel(path)
    print_problems(vessel.warnings, con)
    return vessel


def save_figure(fig, stem: Path, pdf: bool, con) -> None:
    """Write ``fig`` to ``stem``.png (and .pdf with ``--pdf``) and say where."""
    from sim.analysis.plots import save_figure as save

    paths = save(fig, stem, pdf=pdf)
    con.print("figure: " + ", ".join(f"[bold]{esc(p)}[/]" for p in paths))
