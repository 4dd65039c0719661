"""``brinebolt steady``: the steady operating points of a vessel over a list of speeds."""

from __future__ import annotations

from sim.analysis.units import output_units
from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, console, esc, print_cautions
from sim.cli.output import TableOutput, add_format

DEFAULT_SPEEDS = "0.5 kn,1 kn,1.5 kn,2 kn,2.5 kn,3 kn"


def register(sub) -> None:
    """Add ``steady`` to the subparsers."""
    s = sub.add_parser("steady", help="steady operating-point table of a vessel over speeds")
    s.add_argument("vessel", help="vessel file (TOML)")
    s.add_argument(
        "--speeds",
        default=DEFAULT_SPEEDS,
        help='comma-separated speeds through water, e.g. "1 kn,2 kn,1.5 m/s"',
    )
    options.add_water(s)
    s.add_argument(
        "--salinity",
        type=float,
        default=None,
        help="deprecated, use --water: practical salinity (PSS-78; default 35)",
    )
    s.add_argument(
        "--temperature",
        default=None,
        help='deprecated, use --water: water temperature, e.g. "12 degC" (default 15 degC)',
    )
    options.add_units(s)
    add_format(s)
    s.set_defaults(func=cmd_steady)


def _water_spec(args, err):
    """The water of ``--water``, or of the deprecated ``--salinity``/``--temperature``."""
    if args.salinity is None and args.temperature is None:
        return options.water(args.water or options.DEFAULT_WATER)
    if args.water is not None:
        raise OptionError(
            "option --water cannot be combined with --salinity/--temperature; allowed: "
            '--water alone, e.g. --water "35,15 degC"'
        )
    from pydantic import ValidationError

    from sim.io.schema import WaterSpec
    from sim.io.seam import water as to_water

    err.print(
        "[yellow]note[/] --salinity and --temperature are deprecated; use --water "
        '"SALINITY,TEMPERATURE", e.g. --water "35,15 degC"',
        soft_wrap=True,
    )
    given = {
        "salinity": 35.0 if args.salinity is None else args.salinity,
        "temperature": args.temperature or "15 degC",
    }
    try:
        return to_water(WaterSpec(**given))
    except ValidationError as exc:
        e = exc.errors()[0]
        key = str(e["loc"][0]) if e["loc"] else "salinity"
        raise OptionError(f"option --{key} = {given.get(key)!r}: {e['msg']}") from None


def cmd_steady(args) -> int:
    from sim.analysis.tables import steady_data
    from sim.engine.plant import build_plant
    from sim.engine.steady import SteadyError, steady_at_speed

    out = TableOutput(args, "steady")
    con = out.messages
    u = output_units(args.units)
    speeds = [options.speed(s, "--speeds") for s in args.speeds.split(",") if s.strip()]
    if not speeds or any(not v > 0 for v in speeds):
        raise OptionError(
            f'option --speeds = {args.speeds!r}: allowed: positive speeds, e.g. "1 kn,2 kn"'
        )
    water = _water_spec(args, console(stderr=True))
    vessel = options.load_vessel(args.vessel, con)
    plant = build_plant(vessel.vessel_spec, water)
    w = plant.water
    points, notes = [], []
    for v, given in zip(
        speeds, [s.strip() for s in args.speeds.split(",") if s.strip()], strict=True
    ):
        try:
            points.append((v, steady_at_speed(plant, v)))
        except SteadyError as exc:
            points.append((v, None))
            notes.append(f"--speeds {given!r} ({u.speed(v):.3g} {u.speed_label}): {exc}")
    out.table(
        steady_data(
            points,
            u,
            title=f"{vessel.spec.vessel.name}: steady operating points in water of "
            f"SP {w.sp:g}, {w.t_c:g} °C (σ = {w.sigma_s_m:.3f} S/m)",
        )
    )
    out.close()
    for n in notes:
        con.print(f"[yellow]note[/] {esc(n)}")
    print_cautions(con)
    return EXIT_OK
