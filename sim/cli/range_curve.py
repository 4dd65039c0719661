"""``brinebolt range-curve``: steady speed–power–range–endurance curves of a vessel file in one or
more waters (:func:`sim.analysis.reach.range_curve`, and a figure)."""

from __future__ import annotations

import dataclasses
from pathlib import Path

from sim.analysis.units import output_units
from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, console, print_cautions, print_table

DEFAULT_WATERS = ("35,15 degC", "10,15 degC", "35,5 degC")
"""Waters of ``range-curve`` when none is given: open sea, brackish, cold sea."""


def register(sub) -> None:
    """Add ``range-curve`` to the subparsers."""
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
    options.add_water(c, repeat=True, default_help="; ".join(DEFAULT_WATERS))
    c.add_argument(
        "--current",
        metavar="SPEED",
        help='along-track water current, e.g. "-0.3 kn" against the vessel',
    )
    options.add_units(c)
    options.add_plots(c, "range")
    c.set_defaults(func=cmd_range_curve)


def cmd_range_curve(args) -> int:
    from sim.analysis.reach import range_at_speed, range_curve
    from sim.analysis.tables import fmt_duration, range_curve_table
    from sim.engine.plant import build_plant

    con = console(wide_when_piped=True)
    u = output_units(args.units)
    speeds = options.speeds(args.speeds, "--speeds")
    at = options.speed(args.at, "--at") if args.at else None
    soc = options.soc(args.soc, "--soc")
    soc_min = options.soc(args.soc_min, "--soc-min")
    if soc_min >= soc:
        raise OptionError(f"option --soc-min = {soc_min} must be below --soc = {soc}")
    if args.points < 3:
        raise OptionError(f"option --points = {args.points}: allowed: 3 or more")
    current = options.speed(args.current, "--current") if args.current else 0.0
    waters = [options.water(w) for w in (args.water or DEFAULT_WATERS)]
    vessel = options.load_vessel(args.vessel, con)
    curves, at_points = [], []
    for w in waters:
        if current:
            w = dataclasses.replace(w, current_m_s=current)
        plant = build_plant(vessel.vessel_spec, w)
        c = range_curve(plant, speeds, soc=soc, soc_min=soc_min, points=args.points)
        curves.append(c)
        at_points.append(range_at_speed(plant, at, soc=soc, soc_min=soc_min) if at else None)
    ref = curves[0]
    print_table(
        con,
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
    print_table(
        con,
        (head, rows),
        "how the water shifts them (fresher or colder water "
        "conducts less: more Joule loss, shorter range)",
    )
    con.print(
        "[dim]Range integrates the pack to its cut-off at each speed's steady pack "
        "power (voltage sag included). The best endurance is at the slowest speed "
        "of the grid when power rises with speed.[/]"
    )
    if not args.no_plots:
        from sim.analysis.plots import range_figure

        stem = Path(args.plots) / f"{Path(args.vessel).stem}-range"
        options.save_figure(range_figure(curves, u, at_speed_m_s=at), stem, args.pdf, con)
    print_cautions(con)
    return EXIT_OK
