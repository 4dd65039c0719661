"""``brinebolt thruster-curves``: performance curves of one thruster design of a vessel file
(:mod:`sim.analysis.curves`: thrust–flow family, steady curves against speed, efficiency map)."""

from __future__ import annotations

import math
from pathlib import Path

from sim.analysis.units import output_units
from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, console, print_cautions, print_table


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
    t.set_defaults(func=cmd_thruster_curves)


def cmd_thruster_curves(args) -> int:
    import numpy as np

    from sim.analysis import curves as cv
    from sim.analysis.reach import default_speed_grid
    from sim.analysis.tables import fmt_power as _power
    from sim.engine.plant import build_plant

    con = console(wide_when_piped=True)
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
    grid = default_speed_grid(plant, 24)
    speed = options.speed(args.speed, "--speed") if args.speed else 0.6 * grid[-1]
    fam = cv.thrust_flow_family(plant, k, voltages_v=volts)
    sc = cv.speed_curves(plant, grid)
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
    print_table(
        con,
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
        print_table(
            con,
            (["point", "gap mm", "field T", "η overall %", "note"], map_rows),
            f"thruster {name!r} at {u.speed(speed):.3g} {u.speed_label}, "
            f"{emap.thrust_n:.3g} N per unit",
        )
    if not args.no_plots:
        from sim.analysis import plots

        stem = Path(args.plots) / f"{Path(args.vessel).stem}-{name}"
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
        options.save_figure(
            plots.efficiency_map_figure(emap, u),
            stem.with_name(stem.name + "-map"),
            args.pdf,
            con,
        )
    print_cautions(con)
    return EXIT_OK
