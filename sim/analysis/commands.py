"""CLI commands of the analysis package (registered by :func:`sim.cli.build_parser`).

Each command parses its options, calls one documented function of :mod:`sim.analysis` and
prints with rich:

=================  ===========================================================================
``versus``         :func:`sim.analysis.variants.compare_variants` (+ overlay figure)
``reach``          :func:`sim.analysis.reach.range_from_log`
``range-curve``    :func:`sim.analysis.reach.range_curve` in one or more waters (+ figure)
``thruster-curves`` :mod:`sim.analysis.curves` (thrust–flow, speed curves, efficiency map)
``report``         :func:`sim.analysis.report.write_report`
=================  ===========================================================================
"""

from __future__ import annotations

import dataclasses
import math
import os
import sys
import tomllib
from pathlib import Path

from sim.analysis.units import UNIT_SYSTEMS

DEFAULT_WATERS = ("35,15 degC", "10,15 degC", "35,5 degC")
"""Waters of ``range-curve`` when none is given: open sea, brackish, cold sea."""


def _cli():
    import sim.cli as cli

    return cli


def _console():
    from rich.console import Console

    # piped output gets a wide page so the tables keep their columns
    return Console(highlight=False, width=None if sys.stdout.isatty() else 180)


def _fail(message: str):
    return _cli()._OptionError(message)


def _esc(text: object) -> str:
    from rich.markup import escape

    return escape(str(text))


def _print_table(console, table, title: str = "", left: tuple[int, ...] = (0,)) -> None:
    from rich.table import Table

    head, rows = table
    t = Table(title=title or None, title_justify="left")
    for i, h in enumerate(head):
        t.add_column(h, justify="left" if i in left or i == len(head) - 1 else "right")
    for r in rows:
        t.add_row(*(_esc(c) for c in r))
    console.print(t)


def _cautions(console, summary: dict | None = None) -> None:
    from sim.io.present import gas_caution

    if summary is not None:
        console.print(f"[dim]{_esc(gas_caution(summary))}[/]")
    for c in _cli().CAUTIONS:
        console.print(f"[dim]! {_esc(c)}[/]")


def _speed(text: str, what: str) -> float:
    from sim.io.units import UnitParseError, to_si

    try:
        return to_si(text.strip(), "speed")
    except UnitParseError as exc:
        raise _fail(f"option {what} = {text!r}: {exc}") from None


def _speeds(text: str | None, what: str):
    if text is None:
        return None
    vals = [_speed(s, what) for s in text.split(",") if s.strip()]
    if not vals or any(v <= 0 for v in vals):
        raise _fail(f'option {what} = {text!r}: allowed: positive speeds, e.g. "0.5 kn,1 kn"')
    return sorted(vals)


def _quantities(text: str | None, kind: str, what: str, example: str):
    from sim.io.units import UnitParseError, to_si

    if text is None:
        return None
    try:
        vals = [to_si(s.strip(), kind) for s in text.split(",") if s.strip()]
    except UnitParseError as exc:
        raise _fail(f"option {what} = {text!r}: {exc}") from None
    if not vals or any(not v > 0 for v in vals):
        raise _fail(f"option {what} = {text!r}: allowed: positive values, e.g. {example}")
    return vals


def _soc(value: float | None, what: str) -> float | None:
    if value is not None and not 0.0 <= value <= 1.0:
        raise _fail(f"option {what} = {value}: allowed: a state of charge from 0 to 1")
    return value


def _water(text: str):
    """``"35,15 degC"`` → the engine's Water (salinity, temperature), checked as a file's
    ``[water]`` table is."""
    from pydantic import ValidationError

    from sim.io.schema import WaterSpec
    from sim.io.seam import water

    sal, sep, temp = text.partition(",")
    try:
        if not sep:
            raise ValueError
        return water(WaterSpec(salinity=float(sal), temperature=temp.strip()))
    except (ValueError, ValidationError) as exc:
        detail = f" ({exc.errors()[0]['msg']})" if isinstance(exc, ValidationError) else ""
        raise _fail(
            f'option --water = {text!r}{detail}: allowed: "SALINITY,TEMPERATURE" with salinity '
            'on the PSS-78 scale (0 to 42) and a temperature with its unit, e.g. "35,15 degC"'
        ) from None


def _load_vessel(path: str, console):
    from sim import api

    vessel = api.load_vessel(path)
    _cli()._print_problems(vessel.warnings, console)
    return vessel


def _read_log(path: str):
    from sim.io.log import LogFormatError, read_log

    try:
        return read_log(path)
    except (FileNotFoundError, LogFormatError) as exc:
        raise _fail(f"LOG {path!r}: {exc}") from None


def _save(fig, stem: Path, pdf: bool, console) -> None:
    from sim.analysis.plots import save_figure

    paths = save_figure(fig, stem, pdf=pdf)
    console.print("figure: " + ", ".join(f"[bold]{_esc(p)}[/]" for p in paths))


def _add_units(p) -> None:
    p.add_argument(
        "--units",
        choices=sorted(UNIT_SYSTEMS),
        default="nautical",
        help="speeds and distances in knots & nautical miles (nautical, default) "
        "or m/s & km (metric)",
    )


def _add_plots(p, what: str) -> None:
    p.add_argument(
        "--plots",
        metavar="DIR",
        default="outputs",
        help=f"folder for the {what} figure(s) (default outputs)",
    )
    p.add_argument("--no-plots", action="store_true", help="write no figures")
    p.add_argument("--pdf", action="store_true", help="write each figure as PDF too")


# ---------------------------------------------------------------------------- versus


def cmd_versus(args) -> int:
    from sim.analysis import variants as va

    console = _console()
    cli = _cli()
    path = Path(args.file)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError):
        data = {}  # the loader below reports what is wrong with it
    title = ""
    if "variant" in data:
        if args.vessel or args.set:
            raise _fail(
                "--vessel/--set cannot be combined with a variants file; put the "
                "variants in the file"
            )
        vf = va.read_variants_file(path)
        if vf.scenario is None:
            raise _fail(f'variants file {path}: it names no scenario; add scenario = "file.toml"')
        scenario, variants, title = vf.scenario, vf.variants, vf.title
        stem = path.stem
    else:
        if not (args.vessel or args.set):
            raise _fail(
                "nothing to compare: give --vessel FILE (twice or more), "
                "--set KEY=V1,V2,... or a variants file"
            )
        try:
            variants = va.variants_from_options(args.vessel, args.set)
        except ValueError as exc:
            raise _fail(str(exc)) from None
        scenario, stem = path, f"{path.stem}-versus"
    if args.jobs is not None and args.jobs < 1:
        raise _fail(f"option --jobs = {args.jobs}: allowed: 1 or more")
    sample = cli._parse_time(args.sample, "--sample")

    def done(run) -> None:
        what = _esc(run.ending_reason) if run.ok else f"[red]failed[/]: {_esc(run.error)}"
        console.print(f"  flown  {_esc(run.label)} — {what} [dim]({run.wall_time_s:.1f} s)[/]")

    cores = args.jobs or min(os.cpu_count() or 1, len(variants))
    console.print(f"flying {len(variants)} variant(s) of {_esc(scenario)} on {cores} core(s)…")
    comp = va.compare_variants(
        scenario,
        variants,
        jobs=args.jobs,
        logs_dir=args.logs,
        sample_s=sample,
        rank_by=args.rank_by,
        title=title,
        progress=done,
    )
    from sim.analysis.tables import comparison_table

    _print_table(
        console,
        comparison_table(comp, args.units),
        f"{comp.title} — ranked ({comp.rank_basis})",
        left=(1,),
    )
    flown = [r for r in comp.runs if r.ok]
    if flown:
        most = max(flown, key=lambda r: r.value("cl2_total_mol"))
        console.print(f"[dim]most gas: {_esc(most.label)}[/]")
        _cautions(console, most.summary)
    else:
        _cautions(console)
    if args.logs:
        console.print(f"logs and variant vessel files in [bold]{_esc(args.logs)}[/]")
    if not args.no_plots and any(r.ok for r in comp.runs):
        from sim.analysis.plots import overlay_figure

        _save(overlay_figure(comp, args.units), Path(args.plots) / stem, args.pdf, console)
    return cli.EXIT_OK if all(r.ok for r in comp.runs) else cli.EXIT_NUMERIC


# ---------------------------------------------------------------------------- reach


def cmd_reach(args) -> int:
    from sim.analysis.reach import LogMismatchError, range_from_log
    from sim.analysis.tables import leg_table, log_range_table

    console = _console()
    log = _read_log(args.log)
    try:
        lr = range_from_log(
            log, reserve_soc=_soc(args.reserve, "--reserve"), best_speed=not args.no_best
        )
    except LogMismatchError as exc:
        raise _fail(str(exc)) from None
    state, left = log_range_table(lr, args.units)
    title = lr.scenario_name or str(lr.log_path)
    _print_table(console, state, f"{title}: where the run stands")
    _print_table(console, leg_table(lr.legs, args.units), "energy by leg")
    _print_table(console, left, "range left (the pack integrated to cut-off at each demand)")
    for n in lr.notes:
        console.print(f"[yellow]note[/] {_esc(n)}")
    return _cli().EXIT_OK


# ---------------------------------------------------------------------------- range-curve


def cmd_range_curve(args) -> int:
    from sim.analysis.reach import range_at_speed, range_curve
    from sim.analysis.tables import fmt_duration, range_curve_table
    from sim.analysis.units import output_units
    from sim.engine.plant import build_plant

    console = _console()
    u = output_units(args.units)
    speeds = _speeds(args.speeds, "--speeds")
    at = _speed(args.at, "--at") if args.at else None
    soc = _soc(args.soc, "--soc")
    soc_min = _soc(args.soc_min, "--soc-min")
    if soc_min >= soc:
        raise _fail(f"option --soc-min = {soc_min} must be below --soc = {soc}")
    if args.points < 3:
        raise _fail(f"option --points = {args.points}: allowed: 3 or more")
    current = _speed(args.current, "--current") if args.current else 0.0
    waters = [_water(w) for w in (args.water or DEFAULT_WATERS)]
    vessel = _load_vessel(args.vessel, console)
    curves, at_points = [], []
    for w in waters:
        if current:
            w = dataclasses.replace(w, current_m_s=current)
        plant = build_plant(vessel.vessel_spec, w)
        c = range_curve(plant, speeds, soc=soc, soc_min=soc_min, points=args.points)
        curves.append(c)
        at_points.append(range_at_speed(plant, at, soc=soc, soc_min=soc_min) if at else None)
    ref = curves[0]
    _print_table(
        console,
        range_curve_table(ref, u),
        f"{ref.vessel}: steady range from SOC {100 * soc:.0f} % to {100 * soc_min:.0f} %"
        f" in water of {ref.label} (σ = {ref.conductivity_s_m:.3f} S/m)",
    )
    head = [
        "water",
        "σ S/m",
        f"best range at {u.speed_label}",
        f"range {u.distance_label}",
        "endurance there",
        f"best endurance at {u.speed_label}",
        "endurance",
    ]
    if at:
        head += [f"range at {u.speed(at):.3g} {u.speed_label}", "endurance there"]
    rows = []
    for c, ap in zip(curves, at_points, strict=True):
        b, e = c.best_range, c.best_endurance
        row = [c.label, f"{c.conductivity_s_m:.3f}"]
        row += (
            [
                f"{u.speed(b.speed_m_s):.3g}",
                f"{u.distance(b.range_m):.3f}",
                fmt_duration(b.endurance_s),
            ]
            if b
            else ["—"] * 3
        )
        row += [f"{u.speed(e.speed_m_s):.3g}", fmt_duration(e.endurance_s)] if e else ["—"] * 2
        if at:
            row += (
                [f"{u.distance(ap.range_m):.3f}", fmt_duration(ap.endurance_s)]
                if ap.feasible
                else ["cannot hold it", ap.reason[:50]]
            )
        rows.append(row)
    _print_table(
        console,
        (head, rows),
        "how the water shifts them (fresher or colder water "
        "conducts less: more Joule loss, shorter range)",
    )
    console.print(
        "[dim]Range integrates the pack to its cut-off at each speed's steady pack "
        "power (voltage sag included). The best endurance is at the slowest speed "
        "of the grid when power rises with speed.[/]"
    )
    if not args.no_plots:
        from sim.analysis.plots import range_figure

        stem = Path(args.plots) / f"{Path(args.vessel).stem}-range"
        _save(range_figure(curves, u, at_speed_m_s=at), stem, args.pdf, console)
    _cautions(console)
    return _cli().EXIT_OK


# ---------------------------------------------------------------------------- thruster-curves


def cmd_thruster_curves(args) -> int:
    from sim.analysis import curves as cv
    from sim.analysis.reach import default_speed_grid
    from sim.analysis.tables import fmt_power as _power
    from sim.analysis.units import output_units
    from sim.engine.plant import build_plant

    console = _console()
    u = output_units(args.units)
    vessel = _load_vessel(args.vessel, console)
    plant = build_plant(vessel.vessel_spec, _water(args.water))
    try:
        k = cv.thruster_index(plant, args.thruster)
    except ValueError as exc:
        raise _fail(f"option --thruster: {exc}") from None
    name = plant.thrusters[k].name
    volts = _quantities(args.voltages, "voltage", "--voltages", '"10 V,20 V,40 V"')
    gaps = _quantities(args.gaps, "length", "--gaps", '"20 mm,200 mm"')
    fields = _quantities(args.fields, "field", "--fields", '"0.2 T,3 T"')
    for opt, vals in (("--gaps", gaps), ("--fields", fields)):
        if vals is not None and len(vals) != 2:
            raise _fail(f"option {opt}: allowed: two values, the smallest and the largest")
    if args.grid < 3:
        raise _fail(f"option --grid = {args.grid}: allowed: 3 or more")
    grid = default_speed_grid(plant, 24)
    speed = _speed(args.speed, "--speed") if args.speed else 0.6 * grid[-1]
    fam = cv.thrust_flow_family(plant, k, voltages_v=volts)
    sc = cv.speed_curves(plant, grid)
    import numpy as np

    n = args.grid
    emap = cv.efficiency_map(
        plant,
        k,
        speed_m_s=speed,
        gaps_m=np.geomspace(min(gaps), max(gaps), n) if gaps else None,
        fields_t=np.geomspace(min(fields), max(fields), n) if fields else None,
        n=n,
    )
    rows = []
    for i in range(0, len(sc.speed_m_s), 3):
        rows.append(
            [
                f"{u.speed(sc.speed_m_s[i]):.3g}",
                *(
                    f"{100 * x:.3g}" if math.isfinite(x) else "—"
                    for x in (
                        sc.overall_efficiency[i],
                        sc.electrical_efficiency[i],
                        sc.propulsive_efficiency[i],
                    )
                ),
                f"{sc.current_a[i]:.4g}",
                f"{sc.voltage_v[i]:.3g}",
                _power(sc.thruster_power_w[i]),
                _power(sc.pack_power_w[i]),
            ]
        )
    head = [
        f"speed {u.speed_label}",
        "η overall %",
        "η electrical %",
        "η propulsive %",
        "current A",
        "voltage V",
        "thrusters",
        "pack",
    ]
    _print_table(
        console,
        (head, rows),
        f"{plant.name}: steady performance (water SP {plant.water.sp:g}, {plant.water.t_c:g} °C)",
    )
    z = emap.overall_efficiency
    if np.isfinite(z).any():
        iy, ix = np.unravel_index(np.nanargmax(z), z.shape)
        within = np.where(emap.voltage_v <= emap.drive_max_voltage_v, z, np.nan)
        map_rows = [
            [
                "design",
                f"{1000 * emap.design_gap_m:.3g}",
                f"{emap.design_field_t:.3g}",
                f"{100 * emap.design_efficiency:.4g}",
                "",
            ],
            [
                "best on the map",
                f"{1000 * emap.gaps_m[ix]:.3g}",
                f"{emap.fields_t[iy]:.3g}",
                f"{100 * z[iy, ix]:.4g}",
                f"needs {emap.voltage_v[iy, ix]:.3g} V, {emap.current_a[iy, ix]:.4g} A",
            ],
        ]
        if np.isfinite(within).any():
            jy, jx = np.unravel_index(np.nanargmax(within), z.shape)
            map_rows.append(
                [
                    "best within the drive's voltage",
                    f"{1000 * emap.gaps_m[jx]:.3g}",
                    f"{emap.fields_t[jy]:.3g}",
                    f"{100 * within[jy, jx]:.4g}",
                    f"{emap.voltage_v[jy, jx]:.3g} V, {emap.current_a[jy, jx]:.4g} A",
                ]
            )
        _print_table(
            console,
            (["point", "gap mm", "field T", "η overall %", "note"], map_rows),
            f"thruster {name!r} at {u.speed(speed):.3g} {u.speed_label}, "
            f"{emap.thrust_n:.3g} N per unit",
        )
    if not args.no_plots:
        from sim.analysis import plots

        stem = Path(args.plots) / f"{Path(args.vessel).stem}-{name}"
        _save(
            plots.thrust_flow_figure(fam),
            stem.with_name(stem.name + "-thrust-flow"),
            args.pdf,
            console,
        )
        _save(
            plots.speed_curves_figure(sc, u, title=f"{plant.name}: steady performance"),
            stem.with_name(stem.name + "-speed"),
            args.pdf,
            console,
        )
        _save(
            plots.efficiency_map_figure(emap, u),
            stem.with_name(stem.name + "-map"),
            args.pdf,
            console,
        )
    _cautions(console)
    return _cli().EXIT_OK


# ---------------------------------------------------------------------------- report


def cmd_report(args) -> int:
    from sim.analysis.report import write_report

    console = _console()
    log = _read_log(args.log)
    out = write_report(
        log,
        args.out,
        units=args.units,
        reserve_soc=_soc(args.reserve, "--reserve"),
        range_estimate=not args.no_range,
    )
    console.print(f"report written to [bold]{_esc(out)}[/] (self-contained HTML)")
    return _cli().EXIT_OK


# ---------------------------------------------------------------------------- registration


def register(sub) -> None:
    """Add the analysis subcommands to the ``brinebolt`` parser's subparsers."""
    v = sub.add_parser(
        "versus",
        help="fly one scenario with several vessel variants in parallel and rank them",
        description="Fly one scenario with several vessel variants (vessel files and/or "
        "settings of one vessel) on the local cores, print a ranked table and write an overlay "
        "figure. FILE is a scenario file (use --vessel/--set) or a variants file.",
    )
    v.add_argument("file", metavar="FILE", help="scenario file, or a variants file")
    v.add_argument(
        "--vessel",
        action="append",
        default=[],
        metavar="VESSEL",
        help="a vessel file to fly (repeat for each variant)",
    )
    v.add_argument(
        "--set",
        action="append",
        default=[],
        metavar="KEY=V1,V2",
        help="vary a vessel key, e.g. thruster.0.gap=50mm,80mm,120mm or "
        'thruster.pylon.field="0.5 T","1 T"; several --set make a grid',
    )
    v.add_argument(
        "--jobs", type=int, default=None, help="worker processes (default: one per core)"
    )
    v.add_argument(
        "--rank-by",
        default="auto",
        choices=["auto", "distance", "energy", "duration", "efficiency", "speed"],
        help="auto: least energy per distance when all complete the mission, "
        "else greatest distance",
    )
    v.add_argument(
        "--logs", metavar="DIR", help="also write each variant's HDF5 log and vessel file to DIR"
    )
    v.add_argument("--sample", help='sampling interval, e.g. "10 s" (default: the scenario\'s)')
    _add_units(v)
    _add_plots(v, "overlay")
    v.set_defaults(func=cmd_versus)

    r = sub.add_parser(
        "reach",
        help="range left according to a run log (finished or partial)",
        description="Distance covered, energy per distance by leg, and the range left at the "
        "last driving leg's consumption and at the best-range speed, integrating the pack to "
        "its cut-off (voltage sag included).",
    )
    r.add_argument("log", metavar="LOG", help="run log (*.h5 or *.incomplete.h5)")
    r.add_argument(
        "--reserve",
        type=float,
        metavar="SOC",
        help="also give the range down to this state of charge, e.g. 0.2",
    )
    r.add_argument("--no-best", action="store_true", help="skip the best-range speed search")
    _add_units(r)
    r.set_defaults(func=cmd_reach)

    c = sub.add_parser(
        "range-curve",
        help="steady speed–power–range–endurance curves of a vessel file",
        description="Steady pack power, range and endurance over a speed grid (the pack "
        "integrated to cut-off at each speed), the best-range and best-endurance speeds, and "
        "how water salinity and temperature shift them.",
    )
    c.add_argument("vessel", metavar="VESSEL", help="vessel file (TOML)")
    c.add_argument(
        "--speeds",
        help='comma-separated speeds through water, e.g. "0.2 kn,0.5 kn"'
        " (default: a geometric grid up to the top speed)",
    )
    c.add_argument("--points", type=int, default=24, help="speeds in the default grid (24)")
    c.add_argument("--at", metavar="SPEED", help='also give the range at this speed, e.g. "1 kn"')
    c.add_argument("--soc", type=float, default=1.0, help="starting state of charge (1.0)")
    c.add_argument("--soc-min", type=float, default=0.0, help="cut-off state of charge (0.0)")
    c.add_argument(
        "--water",
        action="append",
        metavar="SAL,TEMP",
        help='water as "SALINITY,TEMPERATURE", e.g. "35,15 degC"; repeat to compare '
        f"(default: {'; '.join(DEFAULT_WATERS)})",
    )
    c.add_argument(
        "--current",
        metavar="SPEED",
        help='along-track water current, e.g. "-0.3 kn" against the vessel',
    )
    _add_units(c)
    _add_plots(c, "range")
    c.set_defaults(func=cmd_range_curve)

    t = sub.add_parser(
        "thruster-curves",
        help="thrust–flow curves, efficiency/current/power against speed, efficiency map",
        description="Performance curves of one thruster design of a vessel file: thrust "
        "against volume flow for a family of voltages, steady efficiencies, current and power "
        "against speed, and a map of overall efficiency over electrode gap × field.",
    )
    t.add_argument("vessel", metavar="VESSEL", help="vessel file (TOML)")
    t.add_argument("--thruster", default="0", help="thruster design by name or index (0)")
    t.add_argument(
        "--speed", help='speed of the efficiency map, e.g. "1 kn" (default: 60 %% of the top speed)'
    )
    t.add_argument(
        "--voltages",
        help='voltages of the thrust–flow family, e.g. "10 V,20 V,40 V"'
        " (default: ¼ to all of the drive's maximum)",
    )
    t.add_argument("--gaps", help='map gap range, e.g. "20 mm,200 mm" (default ¼–4 × design)')
    t.add_argument("--fields", help='map field range, e.g. "0.2 T,3 T" (default ¼–4 × design)')
    t.add_argument("--grid", type=int, default=30, help="map points per axis (30)")
    t.add_argument(
        "--water",
        default="35,15 degC",
        help='water as "SALINITY,TEMPERATURE" (default "35,15 degC")',
    )
    _add_units(t)
    _add_plots(t, "thruster")
    t.set_defaults(func=cmd_thruster_curves)

    p = sub.add_parser(
        "report",
        help="one-page run report of a log as self-contained HTML",
        description="Summary, legs, range left, figures, events, provenance and safety "
        "cautions of a run log in one HTML file with the figures embedded.",
    )
    p.add_argument("log", metavar="LOG", help="run log (*.h5 or *.incomplete.h5)")
    p.add_argument("--out", help="HTML file (default: beside the log, <name>.report.html)")
    p.add_argument(
        "--reserve",
        type=float,
        metavar="SOC",
        help="also give the range down to this state of charge",
    )
    p.add_argument("--no-range", action="store_true", help="leave out the range estimate")
    _add_units(p)
    p.set_defaults(func=cmd_report)
