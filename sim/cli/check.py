"""``brinebolt check``: validate input files, each as the kind it is (vessel, scenario, variants),
and list every problem."""

from __future__ import annotations

from sim.cli.core import EXIT_INPUT, EXIT_OK, console, esc, print_problems


def register(sub) -> None:
    """Add ``check`` to the subparsers."""
    c = sub.add_parser(
        "check",
        help="validate vessel, scenario or variants files; list every problem",
        description="Validate each file as the kind it is, told apart by its top-level tables: "
        "a vessel file, a scenario file (with its vessel, and every leg flown in steady state "
        "to warn of speeds, powers or currents the craft cannot reach) or a variants file "
        "(with its scenario and every variant's vessel).",
    )
    c.add_argument("files", nargs="+")
    c.set_defaults(func=cmd_check)


def check_variants(path) -> list:
    """Check a variants file: the file itself, the scenario it names and every variant's vessel
    with its settings applied (as ``versus`` would fly them). Returns the warnings; raises
    InputError listing every problem."""
    from sim.analysis import variants as va
    from sim.io.files import InputError, Problem, load_scenario
    from sim.io.problems import MISSING

    vf = va.read_variants_file(path)
    if vf.scenario is None:
        raise InputError(
            [
                Problem(
                    str(path),
                    "scenario",
                    MISSING,
                    "a variants file checked on its own must name its scenario; allowed: "
                    'scenario = "some-scenario.toml" (or give the scenario to `brinebolt versus`)',
                )
            ]
        )
    base = load_scenario(vf.scenario)
    warnings = list(base.warnings + base.vessel.warnings)
    problems = []
    for v in vf.variants:
        vpath = base.vessel.path if v.vessel_path is None else v.vessel_path
        try:
            data = va.apply_settings(
                va.variant_vessel_data(vpath), v.settings, f"{v.label} ({vpath})"
            )
            load_scenario(vf.scenario, vessel_overrides=data, vessel_path=vpath)
        except InputError as exc:
            problems.extend(exc.problems)
    if problems:
        raise InputError(problems)
    return warnings


def cmd_check(args) -> int:
    from sim.io.files import InputError, check_file

    con = console()
    status = EXIT_OK
    for f in args.files:
        try:
            kind, warnings = check_file(f, {"variants": check_variants})
        except InputError as exc:
            print_problems(exc.problems, con)
            con.print(
                f"[bold red]failed[/]  {esc(f)}: {len(exc.problems)} problem(s)", soft_wrap=True
            )
            status = EXIT_INPUT
            continue
        print_problems(warnings, con)
        con.print(
            f"[green]ok[/]      {esc(f)} is a valid {kind} file"
            + (f" ({len(warnings)} warning(s))" if warnings else ""),
            soft_wrap=True,
        )
    return status
