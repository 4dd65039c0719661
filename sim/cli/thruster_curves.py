"""``brinebolt thruster-curves``: performance curves of one thruster design of a vessel file
(:mod:`sim.analysis.curves`: thrust–flow family, steady curves against speed, efficiency map)."""

from __future__ import annotations

import math
from pathlib import Path

from sim.analysis.units import output_units
from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, esc, print_cautions
from sim.cli.output import TableOutput, add_format
from sim.io import budget


def register(sub) -> None:
    """Add ``thruster-curves`` to the subparsers."""
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
    options.add_water(t)
    options.add_units(t)
    options.add_plots(t, "thruster")
    add_format(t)
    t.set_defaults(func=cmd_thruster_curves)


def cmd_thruster_curves(args) -> int:
    import numpy as np

    from sim.analysis import curves as cv
    from sim.analysis.reach import default_speed_grid
    from sim.analysis.tables import Column, DataTable
    from sim.engine.plant import build_plant

    out = TableOutput(args, "thruster-curves")
    con = out.messages
    u = output_units(args.units)
    vessel = options.load_vessel(args.vessel, con)
    plant = build_plant(vessel.vessel_spec, options.water(args.water or options.DEFAULT_WATER))
    try:
        k = cv.thruster_index(plant, args.thruster)
    except ValueError as exc:
        raise OptionError(f"option --thruster: {exc}") from None
    name = plant.thrusters[k].name
    volts = options.quantities(args.voltages, "voltage", "--voltages", '"10 V,20 V,40 V"')
    gaps = options.quantities(args.gaps, "length", "--gaps", '"20 mm,200 mm"')
    fields = options.quantities(args.fields, "field", "--fields", '"0.2 T,3 T"')
    for opt, vals in (("--gaps", gaps), ("--fields", fields)):
        if vals is not None and len(vals) != 2:
            raise OptionError(f"option {opt}: allowed: two values, the smallest and the largest")
    if args.grid < 3:
        raise OptionError(f"option --grid = {args.grid}: allowed: 3 or more")
    if why := budget.grid_problem(
        "thruster-curves --grid", args.grid**2, f"{args.grid} × {args.grid}"
    ):
        raise OptionError(why)
    grid = default_speed_grid(plant, 24)
    speed = options.speed(args.speed, "--speed") if args.speed else 0.6 * grid[-1]
    # the thrust–flow family and the gap × field map are duct figures: an open-field array has
    # no duct flow and no electrode gap, so for it only the steady performance is given
    ducted = plant.thrusters[k].open_field is None
    fam = cv.thrust_flow_family(plant, k, voltages_v=volts) if ducted else None
    sc = cv.speed_curves(plant, grid)
    n = args.grid
    emap = (
        cv.efficiency_map(
            plant,
            k,
            speed_m_s=speed,
            gaps_m=np.geomspace(min(gaps), max(gaps), n) if gaps else None,
            fields_t=np.geomspace(min(fields), max(fields), n) if fields else None,
            n=n,
        )
        if ducted
        else None
    )
    if not ducted:
        con.print(
            f"note: thruster {esc(repr(name))} is an open-field array: the thrust–flow family and "
            "the gap × field map apply to ducts only; the steady performance below is its own",
            soft_wrap=True,
        )

    def pct(x) -> float:
        return 100 * float(x) if math.isfinite(x) else math.nan

    rows = [
        (
            u.speed(float(sc.speed_m_s[i])),
            pct(sc.overall_efficiency[i]),
            pct(sc.electrical_efficiency[i]),
            pct(sc.propulsive_efficiency[i]),
            float(sc.current_a[i]),
            float(sc.voltage_v[i]),
            float(sc.thruster_power_w[i]),
            float(sc.pack_power_w[i]),
        )
        for i in range(0, len(sc.speed_m_s), 3)
    ]
    out.table(
        DataTable(
            "performance",
            f"{plant.name}: steady performance (water SP {plant.water.sp:g}, "
            f"{plant.water.t_c:g} °C)",
            (
                Column("speed", u.speed_label),
                Column("η overall", "%"),
                Column("η electrical", "%"),
                Column("η hydraulic", "%"),
                Column("current", "A"),
                Column("voltage", "V"),
                Column("thruster power", "W"),
                Column("pack power", "W"),
            ),
            tuple(rows),
        )
    )
    z = emap.overall_efficiency if emap is not None else np.array([np.nan])
    if np.isfinite(z).any():
        map_rows = [
            (
                "design",
                1000 * emap.design_gap_m,
                emap.design_field_t,
                100 * emap.design_efficiency,
                None,
                None,
                "",
            )
        ]
        for label, where in (
            ("best on the map", emap.best()),
            ("best buildable", emap.best(buildable=True)),
            ("best buildable in drive", emap.best(buildable=True, within_drive=True)),
        ):
            if where is None:
                continue
            iy, ix = where
            notes = [f"field ≤ {emap.field_limit_t:g} T"] if "buildable" in label else []
            if "drive" in label:
                notes.append(f"voltage ≤ {emap.drive_max_voltage_v:g} V")
            if emap.at_edge(iy, ix):
                notes.append("at the map's edge: the optimum may lie beyond")
            map_rows.append(
                (
                    label,
                    1000 * float(emap.gaps_m[ix]),
                    float(emap.fields_t[iy]),
                    100 * float(z[iy, ix]),
                    float(emap.voltage_v[iy, ix]),
                    float(emap.current_a[iy, ix]),
                    "; ".join(notes),
                )
            )
        out.table(
            DataTable(
                "map",
                f"thruster {name!r} at {u.speed(speed):.3g} {u.speed_label}, "
                f"{emap.thrust_n:.3g} N per unit",
                (
                    Column("point", kind="name"),
                    Column("gap", "mm"),
                    Column("field", "T"),
                    Column("η overall", "%"),
                    Column("needs voltage", "V"),
                    Column("needs current", "A"),
                    Column("note", kind="text"),
                ),
                tuple(map_rows),
            )
        )
    out.close()
    if not args.no_plots:
        from sim.analysis import plots

        stem = Path(args.plots) / f"{Path(args.vessel).stem}-{name}"
        if fam is not None:
            options.save_figure(
                plots.thrust_flow_figure(fam),
                stem.with_name(stem.name + "-thrust-flow"),
                args.pdf,
                con,
            )
        options.save_figure(
            plots.speed_curves_figure(sc, u, title=f"{plant.name}: steady performance"),
            stem.with_name(stem.name + "-speed"),
            args.pdf,
            con,
        )
        if emap is not None:
            options.save_figure(
                plots.efficiency_map_figure(emap, u),
                stem.with_name(stem.name + "-map"),
                args.pdf,
                con,
            )
    print_cautions(con)
    return EXIT_OK
