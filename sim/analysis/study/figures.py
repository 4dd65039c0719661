"""Figures of a study (matplotlib on an Agg canvas, like :mod:`sim.analysis.plots`): the
response map over two inputs with the constraints shaded, the Pareto front, the uncertainty
bands on the range curve and the tornado chart. Titled, every axis with its unit, and readable
in greyscale (hatching and markers, not colour alone, carry the meaning). Lines and
collections carry labels so tests can find the data behind them.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
from matplotlib.figure import Figure
from matplotlib.patches import Rectangle

from sim.analysis.plots import _new, style
from sim.analysis.study.design import number_of
from sim.analysis.study.store import read_table
from sim.analysis.study.study import Band, StudyResult, TornadoBar
from sim.io.study_schema import OUTPUT_UNITS

__all__ = ["bands_figure", "front_figure", "response_map_figure", "study_figures", "tornado_figure"]

_SCALE = {"m": (1e-3, "km"), "s": (1 / 3600, "h"), "J/m": (1e-3, "kJ/m")}


def _scaled(name: str) -> tuple[float, str]:
    unit = OUTPUT_UNITS.get(name, "")
    k, u = _SCALE.get(unit, (1.0, unit))
    return k, f"{name} [{u}]" if u and u != "1" else name


def _out(row, name):
    if not row or not row.get("ok"):
        return math.nan
    return float(row["outputs"].get(name, math.nan))


def _input(row, key):
    return dict((k, v) for k, v in row.get("inputs", [])).get(key)


def response_map_figure(
    rows: Sequence[dict], x_key: str, y_key: str, output: str, sense: str = "max", title: str = ""
) -> Figure:
    """Best value of an output over two inputs (the other inputs at their best), cells with no
    feasible variant hatched.

    Each cell is one pair of values of the two inputs; its shade is the best feasible value of
    ``output`` among the variants with that pair (every other input free), its number printed
    in it; a hatched grey cell had variants, but none met every constraint (or stayed in trim).
    """
    xs = sorted({str(_input(r, x_key)) for r in rows}, key=lambda s: (number_of(s), s))
    ys = sorted({str(_input(r, y_key)) for r in rows}, key=lambda s: (number_of(s), s))
    k, label = _scaled(output)
    best = np.full((len(ys), len(xs)), np.nan)
    seen = np.zeros_like(best, dtype=bool)
    for r in rows:
        i, j = ys.index(str(_input(r, y_key))), xs.index(str(_input(r, x_key)))
        seen[i, j] = True
        v = _out(r, output)
        if r.get("feasible") and math.isfinite(v):
            v *= k
            if math.isnan(best[i, j]) or (v > best[i, j] if sense == "max" else v < best[i, j]):
                best[i, j] = v
    fig, axes = _new(1, 1, title or f"Best {output} over {x_key} × {y_key}", size=(8.5, 6.5))
    ax = axes[0, 0]
    ax.grid(False)
    mesh = ax.pcolormesh(
        np.arange(len(xs) + 1) - 0.5,
        np.arange(len(ys) + 1) - 0.5,
        np.ma.masked_invalid(best),
        cmap="Greys_r" if sense == "max" else "Greys",
        shading="flat",
        label=f"best feasible {output}",
    )
    fig.colorbar(mesh, ax=ax, label=f"best feasible {label}")
    bad = seen & np.isnan(best)
    for n, (i, j) in enumerate(zip(*np.nonzero(bad), strict=True)):
        ax.add_patch(_rect(j - 0.5, i - 0.5, "///", "no feasible variant" if n == 0 else None))
    for i in range(len(ys)):
        for j in range(len(xs)):
            if math.isfinite(best[i, j]):
                ax.text(
                    j,
                    i,
                    f"{best[i, j]:.3g}",
                    ha="center",
                    va="center",
                    fontsize=8,
                    color="black",
                    backgroundcolor="white",
                )
    ax.set_xticks(range(len(xs)), xs, rotation=30)
    ax.set_yticks(range(len(ys)), ys)
    ax.set_xlabel(x_key)
    ax.set_ylabel(y_key)
    if bad.any():
        ax.legend(loc="upper left", bbox_to_anchor=(0, -0.15), fontsize=8)
    fig.best = best  # the data behind the map (rows: y values, columns: x values)
    fig.xs, fig.ys = xs, ys
    return fig


def _rect(x, y, hatch, label):
    return Rectangle((x, y), 1, 1, facecolor="0.85", edgecolor="0.3", hatch=hatch, label=label)


def front_figure(
    rows: Sequence[dict], front: Sequence[dict], objectives: dict[str, str], title: str = ""
) -> Figure:
    """The Pareto front of the first two objectives (a third, if any, as the marker labels),
    over every feasible variant flown (grey) and the infeasible ones (crosses)."""
    names = list(objectives)
    a, b = names[0], names[1]
    ka, la = _scaled(a)
    kb, lb = _scaled(b)
    fig, axes = _new(1, 1, title or f"Pareto front: {a} against {b}", size=(8.5, 6.5))
    ax = axes[0, 0]
    feas = [r for r in rows if r and r.get("feasible")]
    infeas = [r for r in rows if r and r.get("ok") and not r.get("feasible")]
    ax.plot(
        [_out(r, a) * ka for r in infeas],
        [_out(r, b) * kb for r in infeas],
        "x",
        color="0.6",
        label="fails a constraint or trim",
    )
    ax.plot(
        [_out(r, a) * ka for r in feas],
        [_out(r, b) * kb for r in feas],
        "o",
        color="0.5",
        markerfacecolor="none",
        label="feasible variants",
    )
    pts = sorted(front, key=lambda r: _out(r, a))
    st = style(0)
    ax.plot(
        [_out(r, a) * ka for r in pts],
        [_out(r, b) * kb for r in pts],
        label="Pareto front",
        **{**st, "markerfacecolor": "black", "markevery": 1},
    )
    if len(names) > 2:
        kc, lc = _scaled(names[2])
        for r in pts:
            ax.annotate(
                f"{_out(r, names[2]) * kc:.3g}",
                (_out(r, a) * ka, _out(r, b) * kb),
                textcoords="offset points",
                xytext=(4, 4),
                fontsize=7,
            )
        ax.set_title(f"labels: {lc}", fontsize=9)
    ax.set_xlabel(f"{la} ({objectives[a]})")
    ax.set_ylabel(f"{lb} ({objectives[b]})")
    ax.legend(fontsize=8)
    return fig


def bands_figure(bands: Sequence[Band], title: str = "") -> Figure:
    """Range (and endurance) against held speed: the median (P50) with its P10–P90 band over
    the Monte Carlo draws of the uncertain inputs."""
    b = [x for x in bands if math.isfinite(x.speed_m_s)] or list(bands)
    v = np.array([x.speed_m_s for x in b]) / (1852.0 / 3600.0)
    if not np.all(np.isfinite(v)):
        v = np.arange(len(b), dtype=float)
    fig, axes = _new(1, 2, title or "Range and endurance with their uncertainty", size=(11, 4.8))
    for ax, attr, k, unit in (
        (axes[0, 0], "range_m", 1e-3, "range [km]"),
        (axes[0, 1], "endurance_s", 1 / 3600, "endurance [h]"),
    ):
        p = np.array([getattr(x, attr) for x in b]) * k
        ax.fill_between(
            v, p[:, 0], p[:, 2], color="0.8", hatch="..", edgecolor="0.55", label="P10–P90"
        )
        ax.plot(v, p[:, 1], label="P50 (median)", **style(0))
        ax.plot(v, p[:, 0], label="P10", **{**style(1), "color": "0.35"})
        ax.plot(v, p[:, 2], label="P90", **{**style(2), "color": "0.35"})
        ax.set_xlabel("held speed [kn]")
        ax.set_ylabel(unit)
        ax.legend(fontsize=8)
    return fig


def tornado_figure(bars: Sequence[TornadoBar], base: float, output: str, title: str = "") -> Figure:
    """One-at-a-time swings of an output: each uncertain input at its P10 (hatched bar) and P90
    (plain bar), the others at their medians; widest swing on top."""
    k, label = _scaled(output)
    fig, axes = _new(
        1,
        1,
        title or f"What moves {output} most (P10 ↔ P90, one at a time)",
        size=(8.5, 1.2 + 0.6 * max(len(bars), 1) + 2),
    )
    ax = axes[0, 0]
    ys = np.arange(len(bars))[::-1]
    b0 = base * k
    lo = np.array([x.output_low * k - b0 for x in bars])
    hi = np.array([x.output_high * k - b0 for x in bars])
    ax.barh(ys, lo, left=b0, color="0.75", edgecolor="black", hatch="//", label="input at P10")
    ax.barh(ys, hi, left=b0, color="0.35", edgecolor="black", label="input at P90")
    ax.axvline(b0, color="black", linewidth=1, label="all inputs at P50")
    ax.set_yticks(ys, [f"{x.name}\n{x.low_value} … {x.high_value}" for x in bars], fontsize=8)
    ax.set_xlabel(label)
    ax.legend(fontsize=8, loc="lower right")
    return fig


def study_figures(result: StudyResult) -> dict[str, Figure]:
    """Every figure the study's results allow, by file stem suffix."""
    st = result.study
    spec = st.spec
    figs: dict[str, Figure] = {}
    title = st.title or st.path.stem
    objective = spec.optimise.target if spec.optimise else ("distance_m", "max")
    all_rows = [r for r in read_rows(result) if r]
    if len(spec.vary) >= 2 and result.sweep:
        figs["map"] = response_map_figure(
            result.sweep,
            spec.vary[0].key,
            spec.vary[1].key,
            objective[0],
            objective[1],
            title=f"{title}\nbest {objective[0]} over {spec.vary[0].name} × {spec.vary[1].name}",
        )
    if result.front and len(result.front_objectives) >= 2:
        figs["front"] = front_figure(
            all_rows, result.front, result.front_objectives, title=f"{title}: Pareto front"
        )
    if result.bands:
        figs["bands"] = bands_figure(result.bands, title=f"{title}: uncertainty bands")
    if result.tornado:
        figs["tornado"] = tornado_figure(
            result.tornado, result.tornado_base, spec.sensitivity.output, title=f"{title}: tornado"
        )
    return figs


def read_rows(result: StudyResult) -> list[dict]:
    """The study's stored rows (as the study keeps them)."""
    return read_table(result.out_path, raw=True)
