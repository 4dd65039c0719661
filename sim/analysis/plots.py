"""Figures of runs, comparisons, range curves and thruster curves (matplotlib, headless).

Every function returns a :class:`matplotlib.figure.Figure` on an Agg canvas, built without
pyplot (so no GUI backend and no global state); :func:`save_figure` writes PNG and, on request,
PDF. Figures are titled, every axis is labelled with its unit, and series differ by line style
and marker as well as colour so they stay readable when printed in greyscale. Each line carries
a label, so tests (and notebooks) can find the data behind a plot with ``ax.get_lines()``.

Text that comes from the user (vessel, scenario, thruster, leg and variant names, titles) is
passed through :func:`plain`, so a ``$`` or a backslash in a name is shown as typed and never
parsed as mathtext; the figures are built with ``text.usetex`` off whatever the local
matplotlib settings say.
"""

from __future__ import annotations

import functools
from collections.abc import Sequence
from pathlib import Path

import matplotlib as mpl
import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import BoundaryNorm
from matplotlib.figure import Figure
from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

from sim.analysis.units import OutputUnits, output_units

__all__ = [
    "STYLES",
    "efficiency_map_figure",
    "overlay_figure",
    "plain",
    "power_breakdown_figure",
    "range_figure",
    "run_figure",
    "save_figure",
    "speed_curves_figure",
    "style",
    "thrust_flow_figure",
]

STYLES: tuple[tuple[str, object, str], ...] = (
    ("#000000", "-", "o"),
    ("#0072B2", "--", "s"),
    ("#D55E00", ":", "^"),
    ("#009E73", "-.", "D"),
    ("#CC79A7", (0, (5, 1, 1, 1, 1, 1)), "v"),
    ("#E69F00", (0, (1, 1)), "P"),
    ("#56B4E9", (0, (8, 2)), "X"),
    ("#666666", (0, (3, 1, 1, 1)), "*"),
    ("#882255", (0, (10, 3)), "h"),
    ("#117733", (0, (6, 2, 1, 2)), "<"),
    ("#999933", (0, (2, 3)), ">"),
    ("#332288", (0, (8, 2, 2, 2, 2, 2)), "p"),
)
"""(colour, line style, marker) cycle of 12, each distinct from the others by colour, dash
pattern and marker: the Okabe–Ito colours, then four of Tol's muted colours, so lines are told
apart in greyscale. Beyond 12 series :func:`style` combines the three cycles so that no two of
the first 12 × 11 series look alike."""

HATCHES = ("", "//", "..", "xx", "\\\\", "oo", "++", "--")


def style(i: int, n_points: int = 0) -> dict:
    """Line keyword arguments of the i-th series (markers every ~1/10 of the points).

    The first ``len(STYLES)`` (12) series differ from each other in colour, dash pattern and
    marker; after that the marker cycle is shifted, so series ``i`` and ``i + 12`` still differ
    by marker (and dash pattern)."""
    n = len(STYLES)
    k, lap = i % n, i // n
    colour = STYLES[k][0]
    ls = STYLES[(k + lap) % n][1]
    marker = STYLES[(k + 2 * lap) % n][2]
    every = max(1, n_points // 10) if n_points else 1
    return {
        "color": colour,
        "linestyle": ls,
        "marker": marker,
        "markevery": every,
        "markersize": 5,
        "linewidth": 1.5,
        "markerfacecolor": "white",
    }


def plain(text: object) -> str:
    """``text`` as matplotlib must show it verbatim: every ``$`` escaped, so mathtext never
    parses user text (``$\\frac{$`` in a name would otherwise crash the drawing). Backslashes
    only mean something inside ``$...$``, so they need no escape once no ``$`` is left."""
    return str(text).replace("$", r"\$")


def _figure(build):
    """Build a figure with LaTeX text rendering off (a local ``text.usetex = True`` would hand
    user text to LaTeX)."""

    @functools.wraps(build)
    def wrapper(*args, **kwargs):
        with mpl.rc_context({"text.usetex": False}):
            return build(*args, **kwargs)

    return wrapper


def _legend(ax, **kw):
    """A legend that keeps out of the data's way: the best place, on a mostly opaque frame."""
    kw.setdefault("fontsize", 8)
    kw.setdefault("loc", "best")
    kw.setdefault("framealpha", 0.85)
    return ax.legend(**kw)


ROBUST_PERCENTILE = 99.0
"""Percentile of the samples that sets the top of a clipped axis (:func:`_clip_spikes`)."""


def _clip_spikes(ax, ys: Sequence[np.ndarray], unit: str) -> float | None:
    """Keep a short spike (e.g. the start-up power) from flattening the lines: when the largest
    value is over 1.5 × the :data:`ROBUST_PERCENTILE` percentile of all samples, the y-range
    is clipped a little above that percentile and a note on the axes gives the peak. Returns the
    peak clipped (None when nothing was clipped)."""
    finite = [np.asarray(y, dtype=float)[np.isfinite(y)] for y in ys]
    finite = [y for y in finite if y.size]
    if not finite:
        return None
    allv = np.concatenate(finite)
    peak = float(np.max(allv))
    lo = float(np.min(allv))
    top = float(np.percentile(allv, ROBUST_PERCENTILE))
    if not (peak > 0 and top > 0 and peak > 1.5 * top):
        return None
    span = top - min(lo, 0.0)
    ax.set_ylim(bottom=min(lo, 0.0) - 0.05 * span, top=top + 0.15 * span)
    ax.text(
        0.99,
        0.97,
        f"y-range clipped at the {ROBUST_PERCENTILE:g}th percentile: peaks up to "
        f"{peak:.3g} {unit} (start-up) run off the top",
        transform=ax.transAxes,
        ha="right",
        va="top",
        fontsize=7,
        style="italic",
        bbox={"facecolor": "white", "edgecolor": "0.6", "alpha": 0.85, "pad": 2},
    )
    return peak


def save_figure(fig: Figure, stem: str | Path, *, pdf: bool = False, dpi: int = 130) -> list[Path]:
    """Write ``<stem>.png`` (and ``<stem>.pdf`` when asked); returns the paths written."""
    stem = Path(stem)
    stem.parent.mkdir(parents=True, exist_ok=True)
    out = [stem.with_suffix(".png")]
    fig.savefig(out[0], dpi=dpi)
    if pdf:
        out.append(stem.with_suffix(".pdf"))
        fig.savefig(out[1])
    return out


def _time_axis(t_max_s: float) -> tuple[float, str]:
    """(divisor, label) for a time axis: minutes up to 3 h, hours beyond."""
    return (60.0, "time [min]") if t_max_s <= 3 * 3600 else (3600.0, "time [h]")


def _power_axis(p_max_w: float) -> tuple[float, str]:
    """(divisor, unit) for powers: W below 2 kW, kW below 2 MW, MW beyond."""
    p = abs(p_max_w)
    if p < 2e3:
        return 1.0, "W"
    if p < 2e6:
        return 1e3, "kW"
    return 1e6, "MW"


def _plain_log(ax, which: str = "y") -> None:
    """Log scale with plain numbers (1, 2, 5, 10, 20…) instead of powers of ten."""
    axis = ax.yaxis if which == "y" else ax.xaxis
    (ax.set_yscale if which == "y" else ax.set_xscale)("log")
    axis.set_major_locator(LogLocator(base=10.0, subs=(1.0, 2.0, 5.0)))
    axis.set_major_formatter(FuncFormatter(lambda v, _pos: f"{v:g}"))
    axis.set_minor_formatter(NullFormatter())


def _new(rows: int, cols: int, title: str, size=(11.0, 8.0)) -> tuple[Figure, np.ndarray]:
    fig = Figure(figsize=size, layout="constrained")
    FigureCanvasAgg(fig)  # headless: the Agg canvas, never a GUI backend
    axes = np.atleast_1d(fig.subplots(rows, cols, squeeze=False))
    fig.suptitle(plain(title), fontsize=12, fontweight="bold")
    for ax in axes.flat:
        ax.grid(True, color="0.85", linewidth=0.6)
    return fig, axes


# ------------------------------------------------------------------ comparisons


@_figure
def overlay_figure(comparison, units: str | OutputUnits = "nautical") -> Figure:
    """Speed, pack power and state of charge of every variant, against time and distance.

    A short start-up power spike does not flatten the lines: the power axes are clipped at a
    robust percentile, with a note giving the peak (:func:`_clip_spikes`). The legend sits
    below the panels, off the data.

    Parameters
    ----------
    comparison : sim.analysis.variants.Comparison
    units : output unit system
    """
    u = output_units(units)
    runs = [r for r in comparison.ranked if r.ok]
    t_max = max((float(r.series["time_s"][-1]) for r in runs), default=1.0)
    p_max = max((float(np.max(r.series["pack_power_w"])) for r in runs), default=1.0)
    tdiv, tlabel = _time_axis(t_max)
    pdiv, punit = _power_axis(p_max)
    fig, axes = _new(3, 2, f"{comparison.title}: variants compared", size=(11.5, 9.0))
    rows = (
        ("speed_over_ground_m_s", f"speed over ground [{u.speed_label}]", u.speed, "speed"),
        ("pack_power_w", f"pack power [{punit}]", lambda p: p / pdiv, "pack power"),
        ("state_of_charge", "state of charge [%]", lambda s: 100.0 * s, "state of charge"),
    )
    for i, (key, ylabel, conv, name) in enumerate(rows):
        ys = []
        for j, r in enumerate(runs):
            s = r.series
            y = conv(np.asarray(s[key]))
            ys.append(y)
            kw = style(j, len(y))
            label = plain(r.label)
            axes[i, 0].plot(np.asarray(s["time_s"]) / tdiv, y, label=label, **kw)
            axes[i, 1].plot(u.distance(np.asarray(s["distance_m"])), y, label=label, **kw)
        if key == "pack_power_w":
            for ax in axes[i]:
                _clip_spikes(ax, ys, punit)
        axes[i, 0].set_ylabel(ylabel)
        axes[i, 1].set_ylabel(ylabel)
        axes[i, 0].set_title(f"{name} against time", fontsize=10)
        axes[i, 1].set_title(f"{name} against distance", fontsize=10)
        axes[i, 0].set_xlabel(tlabel)
        axes[i, 1].set_xlabel(f"distance over ground [{u.distance_label}]")
    if runs:
        handles, labels = axes[0, 0].get_legend_handles_labels()
        fig.legend(
            handles,
            labels,
            loc="outside lower center",
            ncols=min(len(labels), 4),
            fontsize=8,
            title="variant (ranked best first)",
            title_fontsize=8,
        )
    return fig


# ------------------------------------------------------------------ one run


def _leg_lines(ax, legs, tdiv: float, *, names: bool = False) -> None:
    """Dotted verticals where legs change; with ``names`` each leg's name is written at its
    start, along the line at the top of the axes."""
    for k, leg in enumerate(legs):
        x = float(leg["t_start_s"]) / tdiv
        if k:
            ax.axvline(x, color="0.6", linestyle=":", linewidth=0.8)
        if names:
            ax.text(
                x,
                0.98,
                " " + plain(leg["name"]),
                transform=ax.get_xaxis_transform(),
                rotation=90,
                ha="left",
                va="top",
                fontsize=7,
                color="0.3",
                clip_on=True,
            )


@_figure
def run_figure(
    series: dict,
    units: str | OutputUnits = "nautical",
    *,
    title: str = "",
    legs: Sequence[dict] = (),
    columns: Sequence[str] = (),
) -> Figure:
    """Overview of one run: speeds, distance, powers, state of charge, cell voltage and duct
    temperature rise against time (dotted verticals mark leg changes; the top panels name the
    legs).

    Parameters
    ----------
    series : dict of arrays
        The run's channels (``RunLog.series`` or ``RunResult.series``), SI.
    units : output unit system
    title : figure title
    legs : leg records (for the leg-change marks)
    columns : thruster design names (per-thruster channels)
    """
    u = output_units(units)
    t = np.asarray(series["time_s"], dtype=float)
    tdiv, tlabel = _time_axis(float(t[-1]) if t.size else 1.0)
    tt = t / tdiv
    n = t.size
    fig, axes = _new(3, 2, title or "run overview", size=(11.5, 9.0))
    ax = axes[0, 0]
    ax.plot(tt, u.speed(series["speed_through_water_m_s"]), label="through water", **style(0, n))
    ax.plot(tt, u.speed(series["speed_over_ground_m_s"]), label="over ground", **style(1, n))
    ax.set(title="speed", xlabel=tlabel, ylabel=f"speed [{u.speed_label}]")
    _legend(ax)
    ax = axes[0, 1]
    ax.plot(
        tt,
        u.distance(np.asarray(series["distance_m"])),
        label="distance over ground",
        **style(0, n),
    )
    ax.set(title="distance", xlabel=tlabel, ylabel=f"distance [{u.distance_label}]")
    ax = axes[1, 0]
    pdiv, punit = _power_axis(float(np.max(np.abs(series["pack_power_w"]))) if n else 1.0)
    ys = []
    for i, (key, name) in enumerate(
        (
            ("pack_power_w", "pack terminals"),
            ("thruster_power_w", "into thrusters"),
            ("useful_power_w", "thrust × speed"),
        )
    ):
        ys.append(np.asarray(series[key]) / pdiv)
        ax.plot(tt, ys[-1], label=name, **style(i, n))
    ax.set(title="power", xlabel=tlabel, ylabel=f"power [{punit}]")
    _clip_spikes(ax, ys, punit)
    _legend(ax)
    ax = axes[1, 1]
    ax.plot(
        tt, 100.0 * np.asarray(series["state_of_charge"]), label="state of charge", **style(0, n)
    )
    ax.set(title="state of charge", xlabel=tlabel, ylabel="state of charge [%]")
    ax = axes[2, 0]
    ax.plot(tt, series["cell_voltage_v"], label="cell voltage", **style(0, n))
    ax.set(title="cell terminal voltage", xlabel=tlabel, ylabel="cell voltage [V]")
    ax = axes[2, 1]
    rise = np.asarray(series["duct_temperature_rise_k"], dtype=float)
    rise = rise.reshape(n, -1)
    names = list(columns) or [f"thruster {k}" for k in range(rise.shape[1])]
    for k in range(rise.shape[1]):
        ax.plot(
            tt,
            rise[:, k],
            label=plain(names[k]) if k < len(names) else f"thruster {k}",
            **style(k, n),
        )
    ax.set(title="duct outlet temperature rise", xlabel=tlabel, ylabel="temperature rise [K]")
    _legend(ax)
    for a in axes.flat:
        _leg_lines(a, legs, tdiv, names=a in (axes[0, 0], axes[0, 1]))
    return fig


BREAKDOWN = (
    ("useful_power_w", "thrust × speed"),
    ("wake_loss_w", "jet (wake) loss"),
    ("friction_loss_w", "duct friction"),
    ("joule_loss_w", "Joule heating"),
    ("electrode_loss_w", "electrode drop"),
    ("drive_loss_w", "drive loss"),
    ("hotel_power_w", "hotel loads"),
)
"""Where the pack power goes: their sum is the pack terminal power."""


@_figure
def power_breakdown_figure(series: dict, *, title: str = "", legs: Sequence[dict] = ()) -> Figure:
    """Stacked areas of where the pack power goes (hatched for greyscale), against time.

    The stack adds up to the pack terminal power (drawn as a black line on top); dotted
    verticals mark leg changes, each leg named.
    """
    t = np.asarray(series["time_s"], dtype=float)
    tdiv, tlabel = _time_axis(float(t[-1]) if t.size else 1.0)
    pdiv, punit = _power_axis(float(np.max(np.abs(series["pack_power_w"]))) if t.size else 1.0)
    fig, axes = _new(1, 1, title or "where the pack power goes", size=(11.0, 4.2))
    ax = axes[0, 0]
    ys = [np.clip(np.asarray(series[k], dtype=float), 0.0, None) / pdiv for k, _ in BREAKDOWN]
    polys = ax.stackplot(
        t / tdiv,
        *ys,
        labels=[n for _, n in BREAKDOWN],
        colors=[STYLES[i % len(STYLES)][0] for i in range(len(ys))],
        alpha=0.55,
        edgecolor="black",
        linewidth=0.3,
    )
    for p, h in zip(polys, HATCHES, strict=False):
        p.set_hatch(h)
    ax.plot(
        t / tdiv,
        np.asarray(series["pack_power_w"]) / pdiv,
        color="black",
        linewidth=1.2,
        label="pack terminals",
    )
    ax.set(xlabel=tlabel, ylabel=f"power [{punit}]", title="pack power by destination")
    _clip_spikes(ax, [np.asarray(series["pack_power_w"]) / pdiv], punit)
    _leg_lines(ax, legs, tdiv, names=True)
    ax.legend(fontsize=8, loc="upper left", bbox_to_anchor=(1.0, 1.0))
    return fig


# ------------------------------------------------------------------ range curves


@_figure
def range_figure(
    curves: Sequence,
    units: str | OutputUnits = "nautical",
    *,
    at_speed_m_s: float | None = None,
    title: str = "",
) -> Figure:
    """Pack power, range, endurance and energy per distance against speed, one line per water.

    Best-range speeds are marked with a filled star; ``at_speed_m_s`` draws a dotted vertical.
    """
    u = output_units(units)
    name = curves[0].vessel if curves else ""
    fig, axes = _new(2, 2, title or f"{name}: steady range and endurance", size=(11.5, 8.0))
    # (the title goes through plain() in _new)
    pmax = max(
        (float(np.nanmax(c.pack_power_w)) for c in curves if np.isfinite(c.pack_power_w).any()),
        default=1.0,
    )
    pdiv, punit = _power_axis(pmax)
    for i, c in enumerate(curves):
        v = u.speed(c.speed_m_s)
        kw = style(i, len(v))
        lab = plain(c.label)
        axes[0, 0].plot(v, c.pack_power_w / pdiv, label=lab, **kw)
        axes[0, 1].plot(v, u.distance(c.range_m), label=lab, **kw)
        axes[1, 0].plot(v, c.endurance_s / 3600.0, label=lab, **kw)
        axes[1, 1].plot(v, u.energy_per_distance(c.energy_per_distance_j_m), label=lab, **kw)
        b = c.best_range
        if b is not None:
            axes[0, 1].plot(
                [u.speed(b.speed_m_s)],
                [u.distance(b.range_m)],
                linestyle="none",
                marker="*",
                markersize=13,
                color=kw["color"],
                markeredgecolor="black",
                label=f"best range, {lab}",
            )
    axes[0, 0].set(title="pack power at steady speed", ylabel=f"pack power [{punit}]")
    axes[0, 1].set(title="range to cut-off", ylabel=f"range [{u.distance_label}]")
    axes[1, 0].set(title="endurance to cut-off", ylabel="endurance [h]")
    axes[1, 1].set(title="energy per distance", ylabel=f"energy [{u.energy_per_distance_label}]")
    for ax in (axes[0, 0], axes[1, 0], axes[1, 1]):
        _plain_log(ax)
    for ax in axes.flat:
        ax.set_xlabel(f"speed through water [{u.speed_label}]")
        if at_speed_m_s is not None:
            ax.axvline(u.speed(at_speed_m_s), color="0.3", linestyle=":", linewidth=1.0)
    _legend(axes[0, 1])
    return fig


# ------------------------------------------------------------------ thruster curves


@_figure
def thrust_flow_figure(family) -> Figure:
    """Thrust against volume flow of one unit, one curve per voltage, and the operating line."""
    fig, axes = _new(
        1, 1, f"thruster '{family.thruster}': thrust against flow, per unit", size=(8.5, 6.0)
    )
    ax = axes[0, 0]
    q_div, q_unit = (1e-3, "L/s") if np.nanmax(np.abs(family.flow_m3_s)) < 1.0 else (1.0, "m³/s")
    for i, v in enumerate(family.voltages_v):
        ax.plot(
            family.flow_m3_s[i] / q_div,
            family.thrust_n[i],
            label=f"{v:g} V",
            **style(i, family.flow_m3_s.shape[1]),
        )
    if family.line_flow_m3_s.size:
        ax.plot(
            family.line_flow_m3_s / q_div,
            family.line_thrust_n,
            color="0.4",
            linewidth=2.5,
            linestyle="-",
            label="steady operating line (thrust = resistance)",
        )
    ax.set(
        xlabel=f"volume flow through the unit [{q_unit}]",
        ylabel="thrust of one unit [N]",
        title="each voltage curve is traced by the inflow speed",
    )
    ax.set_ylim(bottom=0.0)
    _legend(ax, title="electrode voltage")
    return fig


@_figure
def speed_curves_figure(
    curves, units: str | OutputUnits = "nautical", *, title: str = ""
) -> Figure:
    """Efficiencies, current and power of the vessel against steady speed."""
    u = output_units(units)
    v = u.speed(curves.speed_m_s)
    n = len(v)
    fig, axes = _new(1, 3, title or "steady performance against speed", size=(13.0, 4.6))
    ax = axes[0, 0]
    for i, (arr, name) in enumerate(
        (
            (curves.overall_efficiency, "overall"),
            (curves.electrical_efficiency, "electrical"),
            (curves.propulsive_efficiency, "propulsive"),
        )
    ):
        ax.plot(v, 100.0 * arr, label=name, **style(i, n))
    ax.set(title="efficiencies", ylabel="efficiency [%]")
    _plain_log(ax)
    _legend(ax)
    ax = axes[0, 1]
    ax.plot(v, curves.current_a, label="total thruster current", **style(0, n))
    ax.set(title="thruster current", ylabel="current [A]")
    ax = axes[0, 2]
    pdiv, punit = _power_axis(
        float(np.nanmax(curves.pack_power_w)) if np.isfinite(curves.pack_power_w).any() else 1.0
    )
    for i, (arr, name) in enumerate(
        (
            (curves.pack_power_w, "pack terminals"),
            (curves.thruster_power_w, "into thrusters"),
            (curves.useful_power_w, "thrust × speed"),
        )
    ):
        ax.plot(v, arr / pdiv, label=name, **style(i, n))
    ax.set(title="power", ylabel=f"power [{punit}]")
    _plain_log(ax)
    _legend(ax)
    for ax in axes.flat:
        ax.set_xlabel(f"speed through water [{u.speed_label}]")
    return fig


MAP_BANDS = 10
"""Filled bands of the efficiency map: each holds about the same share of the map's points."""


def map_levels(z: np.ndarray, design: float, bands: int = MAP_BANDS) -> np.ndarray:
    """Contour levels [same unit as ``z``] of an efficiency map: quantiles of the finite values
    (bands of about equal area, so the design's band says where it stands among the
    alternatives rather than sitting in one wide low band), with the design's own value added
    as a level."""
    finite = np.asarray(z, dtype=float)[np.isfinite(z)]
    if finite.size < 2 or np.ptp(finite) <= 0:
        return np.array([])
    q = np.quantile(finite, np.linspace(0.0, 1.0, bands + 1))
    if np.isfinite(design) and finite.min() < design < finite.max():
        q = np.append(q, design)
    levels = np.unique(q)
    keep = [levels[0]]
    for v in levels[1:]:  # drop levels too close to draw apart
        if v - keep[-1] > 1e-6 * max(abs(v), 1e-12):
            keep.append(v)
    return np.asarray(keep)


@_figure
def efficiency_map_figure(emap, units: str | OutputUnits = "nautical") -> Figure:
    """Overall efficiency over electrode gap × field (grey filled contours of about equal area
    with labelled lines, the design's efficiency as a bold line); the design is a white star,
    the best point on the map and the best buildable point are marked (a best point on the
    map's edge says so: the optimum lies beyond), the drive's voltage limit is a dashed line,
    and fields above what the magnet technology can build are hatched above a dash-dot line
    (:func:`sim.analysis.curves.buildable_field`)."""
    u = output_units(units)
    fig, axes = _new(
        1,
        1,
        f"thruster '{emap.thruster}': overall efficiency at "
        f"{u.speed(emap.speed_m_s):.3g} {u.speed_label}, "
        f"{emap.thrust_n:.3g} N per unit",
        size=(8.5, 7.2),
    )
    ax = axes[0, 0]
    g = emap.gaps_m * 1000.0
    z = 100.0 * emap.overall_efficiency
    design = 100.0 * emap.design_efficiency
    levels = map_levels(z, design)
    if levels.size >= 2:
        norm = BoundaryNorm(levels, ncolors=256)  # one distinct grey per band, not per value
        cf = ax.contourf(g, emap.fields_t, z, levels=levels, cmap="Greys", norm=norm)
        cs = ax.contour(g, emap.fields_t, z, levels=levels, colors="black", linewidths=0.5)
        ax.clabel(cs, fmt="%.3g %%", fontsize=7)
        fig.colorbar(cf, ax=ax, label="overall efficiency [%]")
        if levels[0] < design < levels[-1]:
            ax.contour(g, emap.fields_t, z, levels=[design], colors="black", linewidths=2.0)
            ax.plot([], [], color="black", linewidth=2.0, label=f"design efficiency {design:.3g} %")
    if np.isfinite(emap.voltage_v).any() and np.nanmax(emap.voltage_v) > emap.drive_max_voltage_v:
        ax.contour(
            g,
            emap.fields_t,
            emap.voltage_v,
            levels=[emap.drive_max_voltage_v],
            colors="black",
            linestyles="--",
            linewidths=1.5,
        )
        ax.plot(
            [], [], "k--", label=f"drive maximum {emap.drive_max_voltage_v:g} V (needs more beyond)"
        )
    limit = float(emap.field_limit_t)
    fmax = float(np.max(emap.fields_t))
    if np.isfinite(limit) and limit < fmax:
        ax.axhspan(limit, fmax, facecolor="none", edgecolor="0.35", hatch="//", linewidth=0.0)
        ax.axhline(limit, color="black", linestyle="-.", linewidth=1.5)
        ax.plot(
            [],
            [],
            "k-.",
            label=f"buildable field limit, {emap.magnet_kind} magnet: {limit:g} T "
            "(hatched above: not buildable)",
        )
    # the map's edge: the grid's outline (a best point on it is no optimum)
    f0, f1 = float(emap.fields_t[0]), float(emap.fields_t[-1])
    ax.plot(
        [g[0], g[-1], g[-1], g[0], g[0]],
        [f0, f0, f1, f1, f0],
        color="0.2",
        linewidth=2.5,
        label=f"edge of the map ({g[0]:.3g}-{g[-1]:.3g} mm, {f0:.3g}-{f1:.3g} T)",
        clip_on=False,
    )
    for which, marker, name in (
        (emap.best(), "X", "best on the map"),
        (emap.best(buildable=True), "P", "best buildable"),
    ):
        if which is None:
            continue
        iy, ix = which
        edge = " — at the map's edge" if emap.at_edge(iy, ix) else ""
        ax.plot(
            [g[ix]],
            [emap.fields_t[iy]],
            linestyle="none",
            marker=marker,
            markersize=11,
            color="white",
            markeredgecolor="black",
            clip_on=False,
            label=f"{name}: {g[ix]:.3g} mm, {emap.fields_t[iy]:.3g} T, "
            f"{emap.overall_efficiency[iy, ix] * 100:.3g} %{edge}",
        )
    ax.plot(
        [emap.design_gap_m * 1000.0],
        [emap.design_field_t],
        linestyle="none",
        marker="*",
        markersize=15,
        color="white",
        markeredgecolor="black",
        label=f"design ({design:.3g} %)",
    )
    ax.set(
        xlabel="electrode gap (duct width) [mm]",
        ylabel="mean gap field [T]",
        title="same thrust at every point; grey bands of about equal map area",
    )
    _plain_log(ax, "x")
    _plain_log(ax, "y")
    fig.legend(loc="outside lower center", ncols=2, fontsize=7, framealpha=0.9)
    return fig
