"""``brinebolt range-curve``: steady speed–power–range–endurance curves of a vessel file in one or
more waters (:func:`sim.analysis.reach.range_curve`, and a figure)."""

from __future__ import annotations

import dataclasses
from pathlib import Path

from sim.analysis.units import output_units
from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, print_cautions
from sim.cli.output import TableOutput, add_format
from sim.io import budget

DEFAULT_SOC_MIN = 0.1
"""Cut-off state of charge of ``range-curve`` when none is given: a 10 % reserve."""

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
        " (default: a geometric grid from about a quarter of the best-range speed up to the top "
        "speed)",
    )
    c.add_argument("--points", type=int, default=24, help="speeds in the default grid (24)")
    c.add_argument("--at", metavar="SPEED", help='also give the range at this speed, e.g. "1 kn"')
    c.add_argument("--soc", type=float, default=1.0, help="starting state of charge (1.0)")
    c.add_argument(
        "--soc-min",
        type=float,
        default=DEFAULT_SOC_MIN,
        help=f"cut-off state of charge (default {DEFAULT_SOC_MIN}: a 10 %% reserve)",
    )
    options.add_water(c, repeat=True, default_help="; ".join(DEFAULT_WATERS))
    c.add_argument(
        "--current",
        metavar="SPEED",
        help='along-track water current, e.g. "-0.3 kn" against the vessel',
    )
    options.add_units(c)
    options.add_plots(c, "range")
    add_format(c)
    c.set_defaults(func=cmd_range_curve)


def cmd_range_curve(args) -> int:
    from sim.analysis.reach import range_at_speed, range_curve
    from sim.analysis.tables import Column, DataTable, range_curve_data
    from sim.engine.plant import build_plant

    out = TableOutput(args, "range-curve")
    con = out.messages
    u = output_units(args.units)
    speeds = options.speeds(args.speeds, "--speeds")
    at = options.speed(args.at, "--at") if args.at else None
    if at is not None and not at > 0:
        raise OptionError(f'option --at = {args.at!r}: allowed: a positive speed, e.g. "1 kn"')
    soc = options.soc(args.soc, "--soc")
    soc_min = options.soc(args.soc_min, "--soc-min")
    if soc_min >= soc:
        raise OptionError(
            f"option --soc-min = {soc_min} must be below --soc = {soc}; allowed: a cut-off "
            "state of charge below the starting one"
        )
    if args.points < 3:
        raise OptionError(f"option --points = {args.points}: allowed: 3 or more")
    if why := budget.grid_problem("range-curve --points", args.points):
        raise OptionError(why)
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
    out.table(
        range_curve_data(
            ref,
            u,
            title=f"{ref.vessel}: steady range from SOC {100 * soc:.0f} % to "
            f"{100 * soc_min:.0f} % in water of {ref.label} (σ = {ref.conductivity_s_m:.3f} S/m)",
        )
    )
    at_text = f"{args.at.strip()}" if at else ""
    cols = [
        Column("water", kind="name"),
        Column("σ", "S/m"),
        Column("best range at", u.speed_label),
        Column("range", u.distance_label),
        Column("endurance there", "s", kind="duration"),
        Column("best endurance at", u.speed_label),
        Column("endurance", "s", kind="duration"),
    ]
    if at:
        cols += [
            Column(f"range at {at_text}", u.distance_label),
            Column(f"endurance at {at_text}", "s", kind="duration"),
            Column(f"note at {at_text}", kind="text"),
        ]
    rows = []
    for c, ap in zip(curves, at_points, strict=True):
        b, e = c.best_range, c.best_endurance
        row = [c.label, c.conductivity_s_m]
        row += [u.speed(b.speed_m_s), u.distance(b.range_m), b.endurance_s] if b else [None] * 3
        row += [u.speed(e.speed_m_s), e.endurance_s] if e else [None] * 2
        if at:
            row += (
                [u.distance(ap.range_m), ap.endurance_s, ""]
                if ap.feasible
                else [None, None, f"cannot hold {at_text}: {ap.reason}"]
            )
        rows.append(tuple(row))
    out.table(
        DataTable(
            "waters",
            "how the water shifts them (fresher or colder water conducts less: more Joule loss, "
            "shorter range)",
            tuple(cols),
            tuple(rows),
        )
    )
    out.close()
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
