"""``brinebolt versus``: fly one scenario with several vessel variants in parallel and rank them
(:func:`sim.analysis.variants.compare_variants`, and an overlay figure)."""

from __future__ import annotations

import os
from pathlib import Path

from sim.cli import options
from sim.cli.core import (
    EXIT_INTERRUPT,
    EXIT_NUMERIC,
    EXIT_OK,
    OptionError,
    console,
    esc,
    print_cautions,
)
from sim.cli.output import TableOutput, add_format
from sim.safety import gas_caution

RANK_CHOICES = (
    "auto",
    "distance",
    "energy",
    "duration",
    "endurance",
    "end-soc",
    "efficiency",
    "speed",
)
"""``--rank-by`` values (:data:`sim.analysis.variants.RANK_CHOICES`; kept here so that
``brinebolt --help`` imports no numpy)."""


def register(sub) -> None:
    """Add ``versus`` to the subparsers."""
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
        choices=RANK_CHOICES,
        help="measure to rank by, among the comparable variants (those that flew the same "
        "legs, each to its own end condition; the others are listed below them, marked): "
        "distance, energy (per distance), duration or endurance (time under way), end-soc "
        "(end state of charge), efficiency (mean overall), speed (mean); auto: least energy "
        "per distance when they completed the mission as planned, else greatest distance",
    )
    v.add_argument(
        "--logs", metavar="DIR", help="also write each variant's HDF5 log and vessel file to DIR"
    )
    v.add_argument("--sample", help='sampling interval, e.g. "10 s" (default: the scenario\'s)')
    options.add_units(v)
    options.add_plots(v, "overlay")
    add_format(v)
    v.set_defaults(func=cmd_versus)


def cmd_versus(args) -> int:
    from sim.analysis import variants as va
    from sim.analysis.tables import comparison_data
    from sim.io import budget
    from sim.io.files import read_toml
    from sim.io.problems import InputError

    out = TableOutput(args, "versus")
    con = out.messages
    path = Path(args.file)
    try:
        data = read_toml(path)[0]  # size cap; no named pipes or devices (they would hang)
    except InputError:
        data = {}  # the loader below reports what is wrong with it
    title = ""
    if "variant" in data:
        if args.vessel or args.set:
            raise OptionError(
                "--vessel/--set cannot be combined with a variants file; put the "
                "variants in the file"
            )
        vf = va.read_variants_file(path)
        if vf.scenario is None:
            raise OptionError(
                f'variants file {path}: it names no scenario; add scenario = "file.toml"'
            )
        scenario, variants, title = vf.scenario, vf.variants, vf.title
        stem = path.stem
    else:
        if not (args.vessel or args.set):
            raise OptionError(
                "nothing to compare: give --vessel FILE (twice or more), "
                "--set KEY=V1,V2,... or a variants file"
            )
        try:
            variants = va.variants_from_options(args.vessel, args.set)
        except ValueError as exc:
            raise OptionError(str(exc)) from None
        scenario, stem = path, f"{path.stem}-versus"
    if why := budget.grid_problem("versus --set", len(variants)):
        raise OptionError(why)
    if args.jobs is not None and args.jobs < 1:
        raise OptionError(f"option --jobs = {args.jobs}: allowed: 1 or more")
    sample = options.parse_time(args.sample, "--sample")

    # every variant is loaded and checked (errors and warnings, as `check` does) before
    # anything flies; an InputError ends the command here
    prepared = va.prepare_variants(scenario, variants, logs_dir=args.logs, sample_s=sample)
    _print_warnings(con, prepared.warnings, len(variants))

    def done(run) -> None:
        what = esc(run.outcome) if run.ok else f"[red]failed[/]: {esc(run.error)}"
        con.print(
            f"  flown  {esc(run.label)} — {what} [dim]({run.wall_time_s:.1f} s)[/]", soft_wrap=True
        )

    cores = args.jobs or min(os.cpu_count() or 1, len(variants))
    con.print(f"flying {len(variants)} variant(s) of {esc(scenario)} on {cores} core(s)…")
    try:
        comp = va.fly_variants(
            prepared, jobs=args.jobs, rank_by=args.rank_by, title=title, progress=done
        )
    except va.VariantsInterrupted as exc:
        _print_interrupted(console(stderr=True), exc)
        return EXIT_INTERRUPT
    out.table(comparison_data(comp, args.units, title=f"{comp.title} — ranked ({comp.rank_basis})"))
    out.close()
    _print_comparability(con, comp)
    flown = [r for r in comp.runs if r.ok]
    if flown:
        most = max(flown, key=lambda r: r.value("cl2_total_mol"))
        con.print(f"[dim]most gas: {esc(most.label)}[/]")
        con.print(f"[dim]{esc(gas_caution(most.summary))}[/]")
    print_cautions(con)
    if args.logs:
        con.print(f"logs and variant vessel files in [bold]{esc(args.logs)}[/]:")
        for label, log in zip(prepared.labels, prepared.log_paths, strict=True):
            con.print(f"  {esc(label)}: {esc(Path(log).name)}", soft_wrap=True)
    if not args.no_plots and any(r.ok for r in comp.runs):
        from sim.analysis.plots import overlay_figure

        options.save_figure(
            overlay_figure(comp, args.units), Path(args.plots) / stem, args.pdf, con
        )
    return EXIT_OK if all(r.ok for r in comp.runs) else EXIT_NUMERIC


def _print_warnings(con, warnings, n_variants: int) -> None:
    """Load-time warnings labelled by variant; a warning every variant has is printed once."""
    if not warnings:
        return
    texts: dict[str, list[str]] = {}
    for label, p in warnings:
        texts.setdefault(str(p), [])
        if label not in texts[str(p)]:
            texts[str(p)].append(label)
    for text, labels in texts.items():
        who = "every variant" if len(labels) == n_variants > 1 else ", ".join(labels)
        con.print(f"[yellow]warning[/] {esc(f'[{who}]')} {esc(text)}", soft_wrap=True)


def _print_comparability(con, comp) -> None:
    """Which variants were ranked against each other, and how the others ended (legs cut short
    and by what, legs not flown)."""
    others = [r for r in comp.ranked if r.ok and not comp.is_comparable(r)]
    cut = [r for r in comp.ranked if r.ok and comp.is_comparable(r) and r.cut_short]
    for r in cut:
        con.print(f"[dim]{esc(r.label)}: {esc(r.outcome)}[/]", soft_wrap=True)
    if not others:
        return
    rank = {r.index: k for k, r in enumerate(comp.ranked, start=1)}
    con.print(
        f"[bold yellow]not comparable[/] (ranked below the {len(comp.comparable)} that flew "
        "the same legs, each to its own end): ",
        soft_wrap=True,
    )
    for r in others:
        con.print(f"  {rank[r.index]}. {esc(r.label)}: {esc(r.outcome)}", soft_wrap=True)


def _print_interrupted(err, exc) -> None:
    """One clear message after Ctrl-C: what finished, and every partial log kept."""
    err.print("[bold red]interrupted[/]: nothing more is flown.", soft_wrap=True)
    if exc.finished_logs:
        err.print(
            "Logs of the variants that finished: "
            + ", ".join(f"[bold]{esc(p)}[/]" for p in exc.finished_logs),
            soft_wrap=True,
        )
    if exc.partial_logs:
        err.print(
            "Partial logs kept, marked incomplete (open them with `brinebolt reach` or "
            "`brinebolt report`, or plain h5py): "
            + ", ".join(f"[bold]{esc(p)}[/]" for p in exc.partial_logs),
            soft_wrap=True,
        )
    elif not exc.finished_logs:
        err.print("No logs were being written (use --logs DIR to keep them).", soft_wrap=True)
