"""``brinebolt check``: validate vessel and scenario files and list every problem."""

from __future__ import annotations

from sim.cli.core import EXIT_INPUT, EXIT_OK, console, esc, print_problems


def register(sub) -> None:
    """Add ``check`` to the subparsers."""
    c = sub.add_parser("check", help="validate vessel or scenario files; list every problem")
    c.add_argument("files", nargs="+")
    c.set_defaults(func=cmd_check)


def cmd_check(args) -> int:
    from sim.io.files import InputError, check_file

    con = console()
    status = EXIT_OK
    for f in args.files:
        try:
            kind, warnings = check_file(f)
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
