"""Tables of the analysis results as plain (header, rows) text, in the user's units.

The command line prints them with rich, the run report writes them as HTML; both get the same
words and numbers from here.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from sim.analysis.units import METRIC, NAUTICAL, OutputUnits, output_units
from sim.engine.summary import NOT_FINISHED, summarise, upgrade_summary
from sim.safety import CL2_MOLAR_MASS_G, H2_MOLAR_VOLUME_L

__all__ = [
    "Table",
    "comparison_table",
    "fmt_duration",
    "fmt_power",
    "leg_table",
    "log_range_table",
    "range_curve_table",
    "summary_from_series",
    "summary_table",
]

Table = tuple[list[str], list[list[str]]]
"""(column headers, rows of cell texts)."""


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


def _num(x: float, fmt: str = ".3g") -> str:
    return "—" if x is None or not math.isfinite(float(x)) else format(float(x), fmt)


def _other(u: OutputUnits) -> OutputUnits:
    return METRIC if u.name == "nautical" else NAUTICAL


def _dist(x_m: float, u: OutputUnits) -> str:
    return f"{u.distance(x_m):.3f} {u.distance_label}"


def _speed(v: float, u: OutputUnits) -> str:
    return f"{u.speed(v):.3g} {u.speed_label}"


def _epd(j_m: float, u: OutputUnits) -> str:
    return f"{_num(u.energy_per_distance(j_m), '.4g')} {u.energy_per_distance_label}"


def _energy(j: float) -> str:
    if not math.isfinite(j):
        return "unlimited"
    return f"{j / 3.6e6:.3f} kWh" if abs(j) >= 3.6e6 else f"{j / 3600.0:.1f} Wh"


def fmt_power(w: float) -> str:
    """``"3.25 kW"``, ``"137 W"`` (MW above 1 MW); ``"—"`` for NaN."""
    if not math.isfinite(w):
        return "—"
    if abs(w) >= 1e6:
        return f"{w / 1e6:.3g} MW"
    return f"{w / 1e3:.3g} kW" if abs(w) >= 1e3 else f"{w:.3g} W"


_power = fmt_power


def summary_from_series(series: dict, ending_reason: str = "") -> dict:
    """The summary of a log without a stored one (a partial log), worked out from its samples
    by the engine's own :func:`sim.engine.summary.summarise`."""
    return summarise(series, ending_reason=ending_reason or NOT_FINISHED)


def summary_table(summary: dict, units: str | OutputUnits = "nautical") -> Table:
    """(quantity, value) rows of a run summary; distances and speeds in ``units``, with the
    other system in brackets."""
    u = output_units(units)
    o = _other(u)
    s = upgrade_summary(summary)  # an old log's summary has the old efficiency keys
    dist = float(s["distance_m"])
    v = float(s["mean_speed_over_ground_m_s"])
    epd = float(s.get("energy_per_distance_j_m", 0.0))
    rows = [
        ["distance over ground", f"{_dist(dist, u)} ({_dist(dist, o)})"],
        ["duration", fmt_duration(float(s["duration_s"]))],
        ["mean speed over ground", f"{_speed(v, u)} ({_speed(v, o)})"],
        ["energy from the pack", _energy(float(s["energy_out_j"]))],
        ["energy per distance", f"{_epd(epd, u)} ({_epd(epd, o)})" if dist > 0 else "—"],
        ["mean overall efficiency", f"{100 * float(s['mean_eta_overall']):.3g} %"],
        ["best overall efficiency", f"{100 * float(s['best_eta_overall']):.3g} %"],
        ["end state of charge", f"{100 * float(s['end_state_of_charge']):.1f} %"],
        ["peak duct temperature rise", f"{float(s['peak_duct_temperature_rise_k']):.3g} K"],
        ["peak battery temperature", f"{float(s['peak_battery_temperature_c']):.1f} °C"],
        ["peak magnet temperature", f"{float(s['peak_magnet_temperature_c']):.1f} °C"],
        ["peak pack current", f"{float(s['peak_pack_current_a']):.0f} A"],
        ["peak thruster current (all units)", f"{float(s['peak_thruster_current_a']):.0f} A"],
        ["hydrogen evolved", f"{float(s['h2_total_mol']) * H2_MOLAR_VOLUME_L:.1f} L at 25 °C"],
        ["chlorine evolved", f"{float(s['cl2_total_mol']) * CL2_MOLAR_MASS_G:.1f} g"],
        ["ended by", str(s.get("ending_reason", ""))],
    ]
    return ["quantity", "value"], rows


def leg_table(legs: Sequence, units: str | OutputUnits = "nautical") -> Table:
    """One row per leg: times, distance, energy, energy per distance, mean speed, ending.

    ``legs`` are :class:`sim.analysis.log_range.LegUse` records or the log's leg dicts."""
    u = output_units(units)
    head = [
        "leg",
        "start",
        "end",
        f"distance {u.distance_label}",
        "energy Wh",
        u.energy_per_distance_label,
        f"mean {u.speed_label}",
        "ended by",
    ]
    rows = []
    for leg in legs:
        g = leg if isinstance(leg, dict) else leg.__dict__
        dist, e = float(g["distance_m"]), float(g["energy_j"])
        dur = float(g["t_end_s"]) - float(g["t_start_s"])
        rows.append(
            [
                str(g["name"]),
                fmt_duration(float(g["t_start_s"])) if g["t_start_s"] else "0 s",
                fmt_duration(float(g["t_end_s"])),
                f"{u.distance(dist):.3f}",
                f"{e / 3600.0:.1f}",
                _num(u.energy_per_distance(e / dist), ".4g") if dist > 0 else "—",
                f"{u.speed(dist / dur):.2f}" if dur > 0 else "—",
                str(g["ending"]),
            ]
        )
    return head, rows


RANK_HEAD = (
    "rank",
    "variant",
    "distance",
    "duration",
    "mean speed",
    "Wh/nmi",
    "Wh/km",
    "η overall",
    "peak duct ΔT",
    "H₂",
    "Cl₂",
    "end SOC",
    "ended by",
)


def comparison_table(comparison, units: str | OutputUnits = "nautical") -> Table:
    """The ranked table of a :class:`~sim.analysis.variants.Comparison`, best first."""
    u = output_units(units)
    head = list(RANK_HEAD)
    head[2] = f"distance {u.distance_label}"
    head[4] = f"mean {u.speed_label}"
    head[7], head[8], head[9], head[10], head[11] = (
        "η overall %",
        "peak duct ΔT K",
        "H₂ L",
        "Cl₂ g",
        "end SOC %",
    )
    rows = []
    for rank, r in enumerate(comparison.ranked, start=1):
        if not r.ok:
            rows.append([str(rank), r.label] + ["—"] * 10 + [f"failed: {r.error}"])
            continue
        s = r.summary
        epd = float(s["energy_per_distance_j_m"])
        rows.append(
            [
                str(rank),
                r.label,
                f"{u.distance(float(s['distance_m'])):.3f}",
                fmt_duration(float(s["duration_s"])),
                f"{u.speed(float(s['mean_speed_over_ground_m_s'])):.3f}",
                _num(NAUTICAL.energy_per_distance(epd), ".4g"),
                _num(METRIC.energy_per_distance(epd), ".4g"),
                f"{100 * float(s['mean_eta_overall']):.4f}",
                f"{float(s['peak_duct_temperature_rise_k']):.3f}",
                f"{float(s['h2_total_mol']) * H2_MOLAR_VOLUME_L:.1f}",
                f"{float(s['cl2_total_mol']) * CL2_MOLAR_MASS_G:.1f}",
                f"{100 * float(s['end_state_of_charge']):.1f}",
                r.ending_reason,
            ]
        )
    return head, rows


def _remaining_row(name: str, rem, u: OutputUnits) -> list[str]:
    if rem is None:
        return [name, "—", "—", "—", "—", "—", "not worked out (see the notes)"]
    e = rem.endurance
    return [
        name,
        _speed(rem.ground_speed_m_s, u),
        _power(rem.power_w),
        _energy(e.energy_j),
        fmt_duration(e.time_s),
        f"{u.distance(rem.range_m):.3f} {u.distance_label}"
        if math.isfinite(rem.range_m)
        else "unlimited",
        e.cutoff,
    ]


def log_range_table(lr, units: str | OutputUnits = "nautical") -> tuple[Table, Table]:
    """(state table, range-left table) of a :class:`~sim.analysis.log_range.LogRange`."""
    u = output_units(units)
    state = [
        ["log", f"{lr.log_path}" + ("" if lr.complete else " (partial: run not finished)")],
        ["distance covered", _dist(lr.distance_m, u)],
        ["time", fmt_duration(lr.duration_s)],
        ["energy used", _energy(lr.energy_out_j)],
        ["state of charge now / cut-off", f"{100 * lr.end_soc:.1f} % / {100 * lr.soc_min:.1f} %"],
        ["cell voltage now", f"{lr.end_cell_v:.3f} V"],
        ["battery temperature now", f"{lr.end_battery_c:.1f} °C"],
        ["energy stored above the cut-off SOC (no sag)", _energy(lr.stored_energy_j)],
    ]
    if lr.at_last_leg is not None:
        state.append(["range in all at the last leg's consumption", _dist(lr.total_range_m, u)])
    head = [
        "running on at",
        "speed over ground",
        "pack power",
        "usable energy",
        "endurance",
        "range left",
        "cut-off",
    ]
    rows = [
        _remaining_row(
            f"last driving leg ({lr.at_last_leg.basis.split(' ', 3)[-1]})"
            if lr.at_last_leg
            else "last driving leg",
            lr.at_last_leg,
            u,
        ),
        _remaining_row("best-range speed", lr.at_best_speed, u),
    ]
    if lr.reserve_soc is not None:
        tag = f"to reserve SOC {100 * lr.reserve_soc:.0f} %"
        rows.append(_remaining_row(f"last driving leg, {tag}", lr.reserve_at_last_leg, u))
        rows.append(_remaining_row(f"best-range speed, {tag}", lr.reserve_at_best_speed, u))
    return (["quantity", "value"], state), (head, rows)


def range_curve_table(curve, units: str | OutputUnits = "nautical", *, every: int = 1) -> Table:
    """Speed, pack power, endurance, range and energy per distance of a RangeCurve."""
    u = output_units(units)
    head = [
        f"speed {u.speed_label}",
        "pack power",
        "η overall %",
        "endurance",
        f"range {u.distance_label}",
        u.energy_per_distance_label,
        "cut-off / note",
    ]
    rows = []
    for i, p in enumerate(curve.points):
        if i % every and i != len(curve.points) - 1:
            continue
        if not p.feasible:
            rows.append([f"{u.speed(p.speed_m_s):.3g}", "—", "—", "—", "—", "—", p.reason[:60]])
            continue
        sp, e = p.steady, p.endurance
        rows.append(
            [
                f"{u.speed(p.speed_m_s):.3g}",
                _power(sp.pack_power_w),
                f"{100 * sp.overall_efficiency:.3g}",
                fmt_duration(e.time_s),
                f"{u.distance(p.range_m):.3f}",
                _num(u.energy_per_distance(sp.pack_power_w / p.ground_speed_m_s), ".4g"),
                e.cutoff.split(" (")[0],
            ]
        )
    return head, rows
