"""Tables of the analysis results, in the user's units.

Every table is a :class:`DataTable`: typed columns (name, unit, kind) over rows of RAW values
(floats at full precision in the column's unit, texts, None for "no value").
``DataTable.text()`` gives the plain ``(header, rows)`` text that the command line prints with
rich and the run report writes as HTML, with one number format per column (fixed decimals
chosen from the column's largest value, never an exponent); :mod:`sim.cli.output` writes the
raw values as CSV or JSON. The older functions (``summary_table``, ``leg_table``...) return
the ``(header, rows)`` text.

Efficiencies are shown in percent everywhere, with the names of ``docs/efficiencies.md``:
η electrical = flow work/(V·I), η hydraulic = T·V0/flow work, η overall = T·V0/(V·I).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

from sim.analysis.units import METRIC, NAUTICAL, OutputUnits, output_units
from sim.engine.summary import NOT_FINISHED, summarise, upgrade_summary
from sim.safety import CL2_MOLAR_MASS_G, H2_MOLAR_VOLUME_L, gas_per_hour

__all__ = [
    "Column",
    "DataTable",
    "Table",
    "comparison_data",
    "comparison_table",
    "fmt_duration",
    "fmt_power",
    "leg_data",
    "leg_table",
    "log_range_data",
    "log_range_table",
    "range_curve_data",
    "range_curve_table",
    "run_leg_data",
    "steady_data",
    "summary_data",
    "summary_from_series",
    "summary_table",
]

Table = tuple[list[str], list[list[str]]]
"""(column headers, rows of cell texts)."""

KINDS = ("number", "text", "name", "duration", "count")
"""Column kinds: ``number`` (a float in ``unit``, fixed decimals per column), ``count`` (a whole
number), ``duration`` (seconds, shown as ``2 h 05 min``), ``name`` (a user's name: never
wrapped) and ``text`` (words that may wrap, e.g. a note)."""


@dataclass(frozen=True)
class Column:
    """One column of a :class:`DataTable`.

    Attributes
    ----------
    name : str
        What the column holds, without its unit (e.g. ``"pack power"``).
    unit : str
        Unit of the raw values (``"kn"``, ``"W"``, ``"%"``, ``"s"``); "" for none.
    kind : str
        One of :data:`KINDS`.
    decimals : int or None
        Decimals shown; None chooses them from the column's largest value (4 significant
        digits on it, 0 to 6 decimals).
    scale : float
        Shown value per raw value (e.g. 1e-3 to show a column of watts in kW).
    shown_unit : str or None
        Unit of the shown values when ``scale`` is not 1 (default ``unit``).
    """

    name: str
    unit: str = ""
    kind: str = "number"
    decimals: int | None = None
    scale: float = 1.0
    shown_unit: str | None = None

    @property
    def header(self) -> str:
        """Column header of the text table: the name and the shown unit."""
        unit = "" if self.kind == "duration" else (self.shown_unit or self.unit)
        return f"{self.name} {unit}".strip()

    @property
    def key(self) -> str:
        """Column name with the raw unit, as machine output names it (``"speed [kn]"``)."""
        return f"{self.name} [{self.unit}]" if self.unit else self.name


def _decimals(values: Sequence[float], sig: int = 4) -> int:
    finite = [abs(v) for v in values if v is not None and math.isfinite(v)]
    top = max(finite, default=0.0)
    if top == 0.0:
        return 0
    return max(0, min(6, sig - 1 - math.floor(math.log10(top))))


def _is_number(x: object) -> bool:
    return isinstance(x, int | float) and not isinstance(x, bool)


@dataclass(frozen=True)
class DataTable:
    """A table of raw values with typed columns; see the module notes.

    Attributes
    ----------
    name : str
        Short machine name (``"legs"``, ``"steady"``).
    title : str
        Title shown above the table.
    columns : tuple of Column
    rows : tuple of tuples
        Raw values, one per column: float/int in the column's unit, str, or None.
    shown, shown_header : tuples of str, optional
        Display text (rows, header) overriding the formatted raw values: key–value tables
        whose rows are different quantities show ``(quantity, value with unit)``.
    """

    name: str
    title: str
    columns: tuple[Column, ...]
    rows: tuple[tuple, ...]
    shown: tuple[tuple[str, ...], ...] | None = field(default=None)
    shown_header: tuple[str, ...] | None = field(default=None)

    def __post_init__(self) -> None:
        for r in self.rows:
            if len(r) != len(self.columns):
                raise ValueError(
                    f"table {self.name!r}: a row of {len(r)} values for {len(self.columns)} columns"
                )

    @property
    def header(self) -> list[str]:
        """Headers of the text table."""
        if self.shown_header is not None:
            return list(self.shown_header)
        return [c.header for c in self.columns]

    @property
    def text_kinds(self) -> list[str]:
        """Kind of each column of the text table (``shown`` tables: a name, then text)."""
        if self.shown_header is not None:
            return ["name"] + ["text"] * (len(self.shown_header) - 1)
        return [c.kind for c in self.columns]

    def text_rows(self) -> list[list[str]]:
        """The cells as shown: one fixed number format per column."""
        if self.shown is not None:
            return [list(r) for r in self.shown]
        fmts = []
        for i, c in enumerate(self.columns):
            if c.kind == "number" and c.decimals is None:
                vals = [float(r[i]) * c.scale for r in self.rows if _is_number(r[i])]
                fmts.append(_decimals(vals))
            else:
                fmts.append(c.decimals)
        return [
            [_cell(v, c, d) for v, c, d in zip(r, self.columns, fmts, strict=True)]
            for r in self.rows
        ]

    def text(self) -> Table:
        """``(header, rows)`` as text."""
        return self.header, self.text_rows()


def _cell(v: object, c: Column, decimals: int | None) -> str:
    if v is None:
        return "—"
    if not _is_number(v):
        return str(v)
    x = float(v)
    if math.isnan(x):
        return "—"
    if math.isinf(x):
        return "unlimited" if x > 0 else "−unlimited"
    if c.kind == "duration":
        return fmt_duration(x)
    if c.kind == "count":
        return f"{x:.0f}"
    text = f"{x * c.scale:.{0 if decimals is None else decimals}f}"
    # a value that rounds to zero prints as 0, never "-0.00" (e.g. an end SOC a hair below 0)
    return text[1:] if text.startswith("-") and not any(ch in "123456789" for ch in text) else text


def fmt_duration(seconds: float) -> str:
    """``"2 h 05 min"``, ``"12.4 min"`` or ``"38 s"``."""
    if not math.isfinite(seconds):
        return "unlimited"
    if seconds >= 3600.0:
        h, rem = divmod(round(seconds / 60.0), 60)
        return f"{h} h {rem:02d} min"
    if seconds >= 60.0:
        return f"{seconds / 60.0:.1f} min"
    return f"{seconds:.0f} s"


def _other(u: OutputUnits) -> OutputUnits:
    return METRIC if u.name == "nautical" else NAUTICAL


def fmt_power(w: float) -> str:
    """``"3.25 kW"``, ``"137 W"`` (MW above 1 MW); ``"—"`` for NaN."""
    if not math.isfinite(w):
        return "—"
    if abs(w) >= 1e6:
        return f"{w / 1e6:.3g} MW"
    return f"{w / 1e3:.3g} kW" if abs(w) >= 1e3 else f"{w:.3g} W"


def _f(x) -> float | None:
    """A raw float, None for a missing value."""
    return None if x is None else float(x)


def _kv(name: str, title: str, rows: list[tuple[str, object, str, str]]) -> DataTable:
    """A (quantity, value, unit) table whose text shows ``rows[i][3]`` as the value."""
    return DataTable(
        name=name,
        title=title,
        columns=(Column("quantity", kind="name"), Column("value"), Column("unit", kind="text")),
        rows=tuple((q, v, unit) for q, v, unit, _ in rows),
        shown=tuple((q, text) for q, _, _, text in rows),
        shown_header=("quantity", "value"),
    )


def _both(x_m: float, u: OutputUnits, fn: str, label: str, decimals: int) -> str:
    o = _other(u)
    a = getattr(u, fn)(x_m)
    b = getattr(o, fn)(x_m)
    return f"{a:.{decimals}f} {getattr(u, label)} ({b:.{decimals}f} {getattr(o, label)})"


def summary_from_series(series: dict, ending_reason: str = "") -> dict:
    """The summary of a log without a stored one (a partial log), worked out from its samples
    by the engine's own :func:`sim.engine.summary.summarise`."""
    return summarise(series, ending_reason=ending_reason or NOT_FINISHED)


def summary_data(
    summary: dict, units: str | OutputUnits = "nautical", title: str = ""
) -> DataTable:
    """(quantity, value, unit) rows of a run summary; distances and speeds in ``units`` (the
    text adds the other system in brackets)."""
    u = output_units(units)
    s = upgrade_summary(summary)  # an old log's summary has the old efficiency keys
    dist = float(s["distance_m"])
    dur = float(s["duration_s"])
    v = float(s["mean_speed_over_ground_m_s"])
    e_j = float(s["energy_out_j"])
    epd = float(s.get("energy_per_distance_j_m", e_j / dist if dist > 0 else math.nan))
    h2_l = float(s["h2_total_mol"]) * H2_MOLAR_VOLUME_L
    cl2_g = float(s["cl2_total_mol"]) * CL2_MOLAR_MASS_G
    pct = {k: 100 * float(s[k]) for k in ("mean_eta_overall", "best_eta_overall")}
    soc = 100 * float(s["end_state_of_charge"])
    duct = float(s["peak_duct_temperature_rise_k"])
    batt = float(s["peak_battery_temperature_c"])
    mag = float(s["peak_magnet_temperature_c"])
    i_pack = float(s["peak_pack_current_a"])
    i_thr = float(s["peak_thruster_current_a"])
    epd_u = u.energy_per_distance(epd) if dist > 0 else None
    rows = [
        (
            "distance over ground",
            u.distance(dist),
            u.distance_label,
            _both(dist, u, "distance", "distance_label", 3),
        ),
        ("duration", dur, "s", f"{fmt_duration(dur)} ({dur:.0f} s)"),
        (
            "mean speed over ground",
            u.speed(v),
            u.speed_label,
            _both(v, u, "speed", "speed_label", 3),
        ),
        ("energy from the pack", e_j / 3600.0, "Wh", f"{e_j / 3600.0:.1f} Wh"),
        (
            "energy per distance",
            epd_u,
            u.energy_per_distance_label,
            f"{epd_u:.1f} {u.energy_per_distance_label} "
            f"({_other(u).energy_per_distance(epd):.1f} {_other(u).energy_per_distance_label})"
            if epd_u is not None
            else "—",
        ),
        (
            "mean overall efficiency",
            pct["mean_eta_overall"],
            "%",
            f"{pct['mean_eta_overall']:.3f} %",
        ),
        (
            "best overall efficiency",
            pct["best_eta_overall"],
            "%",
            f"{pct['best_eta_overall']:.3f} %",
        ),
        ("end state of charge", soc, "%", f"{soc:.1f} %"),
        ("peak duct temperature rise", duct, "K", f"{duct:.3f} K"),
        ("peak battery temperature", batt, "°C", f"{batt:.1f} °C"),
        ("peak magnet temperature", mag, "°C", f"{mag:.1f} °C"),
        ("peak pack current", i_pack, "A", f"{i_pack:.0f} A"),
        ("peak thruster current (all units)", i_thr, "A", f"{i_thr:.0f} A"),
        ("hydrogen evolved", h2_l, "L", f"{h2_l:.1f} L at 25 °C"),
        ("chlorine evolved", cl2_g, "g", f"{cl2_g:.1f} g"),
        ("ended by", str(s.get("ending_reason", "")), "", str(s.get("ending_reason", ""))),
    ]
    return _kv("summary", title or "summary", rows)


def summary_table(summary: dict, units: str | OutputUnits = "nautical") -> Table:
    """(quantity, value) text rows of a run summary (:func:`summary_data`)."""
    return summary_data(summary, units).text()


def leg_data(
    legs: Sequence, units: str | OutputUnits = "nautical", title: str = "legs"
) -> DataTable:
    """One row per leg: start and end time, distance, energy, energy per distance, mean speed
    over ground, what ended it.

    ``legs`` are :class:`sim.analysis.log_range.LegUse` records or the log's leg dicts."""
    u = output_units(units)
    cols = (
        Column("leg", kind="name"),
        Column("start", "s", kind="duration"),
        Column("end", "s", kind="duration"),
        Column("distance", u.distance_label),
        Column("energy", "Wh"),
        Column("energy per distance", u.energy_per_distance_label),
        Column("mean speed", u.speed_label),
        Column("ended by", kind="text"),
    )
    rows = []
    for leg in legs:
        g = leg if isinstance(leg, dict) else leg.__dict__
        dist, e = float(g["distance_m"]), float(g["energy_j"])
        t0, t1 = float(g["t_start_s"]), float(g["t_end_s"])
        dur = t1 - t0
        v = g.get("mean_speed_m_s")
        v = float(v) if v is not None else (dist / dur if dur > 0 else None)
        rows.append(
            (
                str(g["name"]),
                t0,
                t1,
                u.distance(dist),
                e / 3600.0,
                u.energy_per_distance(e / dist) if dist > 0 else None,
                u.speed(v) if v is not None and dur > 0 else None,
                str(g["ending"]),
            )
        )
    return DataTable("legs", title, cols, tuple(rows))


def leg_table(legs: Sequence, units: str | OutputUnits = "nautical") -> Table:
    """Text of :func:`leg_data`."""
    return leg_data(legs, units).text()


run_leg_data = leg_data
"""The leg table of a finished run (the run's leg dicts); the same as :func:`leg_data`."""


def steady_data(
    points: Sequence, units: str | OutputUnits = "nautical", title: str = ""
) -> DataTable:
    """The steady operating points: ``points`` are ``(speed_m_s, SteadyPoint or None)``.

    Efficiencies in percent, named as in ``docs/efficiencies.md``: η electrical = flow
    work/(V·I) (the steady point's ``electrical_efficiency``), η hydraulic = T·V0/flow work
    (its ``propulsive_efficiency``), η overall = T·V0/(V·I)."""
    u = output_units(units)
    o = _other(u)
    cols = (
        Column("speed", u.speed_label, decimals=2 if u.name == "nautical" else 3),
        Column("speed", o.speed_label, decimals=2 if o.name == "nautical" else 3),
        Column("thrust", "N"),
        Column("voltage", "V"),
        Column("current", "A"),
        Column("thruster power", "W", scale=1e-3, shown_unit="kW"),
        Column("pack power", "W", scale=1e-3, shown_unit="kW"),
        Column("η electrical", "%"),
        Column("η hydraulic", "%"),
        Column("η overall", "%"),
        Column("duct ΔT", "K"),
        Column("H₂", "L/h"),
        Column("Cl₂", "g/h"),
        Column("note", kind="text"),
    )
    rows = []
    for v, p in points:
        if p is None:
            rows.append((u.speed(v), o.speed(v), *([None] * 11), "out of reach"))
            continue
        h2_l_h, cl2_g_h = gas_per_hour(p.h2_mol_s, p.cl2_mol_s)
        rows.append(
            (
                u.speed(v),
                o.speed(v),
                p.thrust_n,
                p.thruster_voltage_v,
                p.thruster_current_a,
                p.thruster_power_w,
                p.pack_power_w,
                100 * p.electrical_efficiency,
                100 * p.propulsive_efficiency,
                100 * p.overall_efficiency,
                p.duct_rise_k,
                h2_l_h,
                cl2_g_h,
                "" if p.feasible else "pack short",
            )
        )
    return DataTable("steady", title or "steady operating points", cols, tuple(rows))


def comparison_data(
    comparison, units: str | OutputUnits = "nautical", title: str = ""
) -> DataTable:
    """The ranked table of a :class:`~sim.analysis.variants.Comparison`, best first."""
    u = output_units(units)
    cols = (
        Column("rank", kind="count"),
        Column("variant", kind="name"),
        Column("distance", u.distance_label),
        Column("duration", "s", kind="duration"),
        Column("mean speed", u.speed_label),
        Column("energy per distance", "Wh/nmi"),
        Column("energy per distance", "Wh/km"),
        Column("η overall", "%"),
        Column("peak duct ΔT", "K"),
        Column("H₂", "L"),
        Column("Cl₂", "g"),
        Column("end SOC", "%"),
        Column("ended by", kind="text"),
    )
    rows = []
    for rank, r in enumerate(comparison.ranked, start=1):
        if not r.ok:
            rows.append((rank, r.label, *([None] * 10), f"failed: {r.error}"))
            continue
        s = r.summary
        epd = float(s["energy_per_distance_j_m"])
        rows.append(
            (
                rank,
                r.label,
                u.distance(float(s["distance_m"])),
                float(s["duration_s"]),
                u.speed(float(s["mean_speed_over_ground_m_s"])),
                NAUTICAL.energy_per_distance(epd),
                METRIC.energy_per_distance(epd),
                100 * float(s["mean_eta_overall"]),
                float(s["peak_duct_temperature_rise_k"]),
                float(s["h2_total_mol"]) * H2_MOLAR_VOLUME_L,
                float(s["cl2_total_mol"]) * CL2_MOLAR_MASS_G,
                100 * float(s["end_state_of_charge"]),
                r.outcome
                if comparison.is_comparable(r)
                else f"{r.outcome} (not comparable: another mission flown)",
            )
        )
    return DataTable("ranked", title or "ranked", cols, tuple(rows))


def comparison_table(comparison, units: str | OutputUnits = "nautical") -> Table:
    """Text of :func:`comparison_data`."""
    return comparison_data(comparison, units).text()


def _remaining_row(name: str, rem, u: OutputUnits) -> tuple:
    if rem is None:
        return (name, None, None, None, None, None, "not worked out (see the notes)")
    e = rem.endurance
    return (
        name,
        u.speed(rem.ground_speed_m_s),
        rem.power_w,
        e.energy_j / 3600.0,
        e.time_s,
        u.distance(rem.range_m),
        e.cutoff,
    )


def log_range_data(
    lr, units: str | OutputUnits = "nautical", title: str = ""
) -> tuple[DataTable, DataTable]:
    """(state table, range-left table) of a :class:`~sim.analysis.log_range.LogRange`."""
    u = output_units(units)
    t = title or str(lr.log_path)
    partial = "" if lr.complete else " (partial: run not finished)"
    stored = lr.stored_energy_j / 3600.0
    state = [
        ("log", f"{lr.log_path}{partial}", "", f"{lr.log_path}{partial}"),
        (
            "distance covered",
            u.distance(lr.distance_m),
            u.distance_label,
            f"{u.distance(lr.distance_m):.3f} {u.distance_label}",
        ),
        ("time", lr.duration_s, "s", fmt_duration(lr.duration_s)),
        ("energy used", lr.energy_out_j / 3600.0, "Wh", f"{lr.energy_out_j / 3600.0:.1f} Wh"),
        ("state of charge now", 100 * lr.end_soc, "%", f"{100 * lr.end_soc:.1f} %"),
        ("cut-off state of charge", 100 * lr.soc_min, "%", f"{100 * lr.soc_min:.1f} %"),
        ("cell voltage now", lr.end_cell_v, "V", f"{lr.end_cell_v:.3f} V"),
        ("battery temperature now", lr.end_battery_c, "°C", f"{lr.end_battery_c:.1f} °C"),
        ("energy stored above the cut-off SOC (no sag)", stored, "Wh", f"{stored:.1f} Wh"),
    ]
    if lr.at_last_leg is not None:
        total = u.distance(lr.total_range_m)
        state.append(
            (
                "range in all at the last leg's consumption",
                total,
                u.distance_label,
                f"{total:.3f} {u.distance_label}" if math.isfinite(total) else "unlimited",
            )
        )
    cols = (
        Column("running on at", kind="name"),
        Column("speed over ground", u.speed_label),
        Column("pack power", "W"),
        Column("usable energy", "Wh"),
        Column("endurance", "s", kind="duration"),
        Column("range left", u.distance_label),
        Column("cut-off", kind="text"),
    )
    rows = []
    if lr.at_last_leg is not None:
        rows.append(
            _remaining_row(
                f"last driving leg ({lr.at_last_leg.basis.split(' ', 3)[-1]})", lr.at_last_leg, u
            )
        )
    if lr.at_best_speed is not None:
        rows.append(_remaining_row("best-range speed", lr.at_best_speed, u))
    if lr.reserve_soc is not None:
        tag = f"to reserve SOC {100 * lr.reserve_soc:.0f} %"
        if lr.reserve_at_last_leg is not None:
            rows.append(_remaining_row(f"last driving leg, {tag}", lr.reserve_at_last_leg, u))
        if lr.reserve_at_best_speed is not None:
            rows.append(_remaining_row(f"best-range speed, {tag}", lr.reserve_at_best_speed, u))
    return (
        _kv("state", f"{t}: where the run stands", state),
        DataTable(
            "range_left",
            "range left (the pack integrated to cut-off at each demand)",
            cols,
            tuple(rows),
        ),
    )


def log_range_table(lr, units: str | OutputUnits = "nautical") -> tuple[Table, Table]:
    """Text of :func:`log_range_data`."""
    a, b = log_range_data(lr, units)
    return a.text(), b.text()


def range_curve_data(
    curve, units: str | OutputUnits = "nautical", *, every: int = 1, title: str = ""
) -> DataTable:
    """Speed, pack power, η overall, endurance, range and energy per distance of a RangeCurve."""
    u = output_units(units)
    cols = (
        Column("speed", u.speed_label),
        Column("pack power", "W"),
        Column("η overall", "%"),
        Column("endurance", "s", kind="duration"),
        Column("range", u.distance_label),
        Column("energy per distance", u.energy_per_distance_label),
        Column("cut-off / note", kind="text"),
    )
    rows = []
    for i, p in enumerate(curve.points):
        if i % every and i != len(curve.points) - 1:
            continue
        if not p.feasible:
            rows.append((u.speed(p.speed_m_s), None, None, None, None, None, p.reason))
            continue
        sp, e = p.steady, p.endurance
        rows.append(
            (
                u.speed(p.speed_m_s),
                sp.pack_power_w,
                100 * sp.overall_efficiency,
                e.time_s,
                u.distance(p.range_m),
                u.energy_per_distance(sp.pack_power_w / p.ground_speed_m_s),
                e.cutoff.split(" (")[0],
            )
        )
    return DataTable("range_curve", title or "range curve", cols, tuple(rows))


def range_curve_table(curve, units: str | OutputUnits = "nautical", *, every: int = 1) -> Table:
    """Text of :func:`range_curve_data`."""
    return range_curve_data(curve, units, every=every).text()
