"""``brinebolt study``: run a design study file (sweep, optimum, front, uncertainty bands and
sensitivity) on the local cores or a Dask cluster, resuming an interrupted one
(:func:`sim.analysis.study.run_study`), and print and plot what it found."""

from __future__ import annotations

import math
from pathlib import Path

from sim.cli import options
from sim.cli.core import EXIT_OK, OptionError, console, esc

STAGES = ("sweep", "optimise", "front", "uncertainty", "sensitivity")


def register(sub) -> None:
    """Add ``study`` to the subparsers."""
    s = sub.add_parser(
        "study",
        help="run a design study: sweep, optimise with a mass model, uncertainty, sensitivity",
        description="Run a study file: fly its variants (a grid or random, Latin-hypercube or "
        "Sobol draws of the inputs it varies), find the best design for its objective under its "
        "constraints and the front of several objectives, the P10/P50/P90 bands of range and "
        "endurance over its uncertain inputs and what moves them most. Every variant is kept "
        "in an HDF5 table as it finishes; running the same command again resumes.",
    )
    s.add_argument("file", metavar="STUDY", help="study file (TOML with a [study] table)")
    options.add_out(s, "results table (HDF5; default outputs/<study name>.h5)")
    s.add_argument("--csv", metavar="FILE", help="also write the table as CSV")
    s.add_argument(
        "--fresh", action="store_true", help="start afresh instead of resuming from --out"
    )
    s.add_argument(
        "--jobs", type=int, default=None, help="local worker processes (default: one per core)"
    )
    s.add_argument(
        "--cluster",
        metavar="ADDRESS",
        help="fly on an existing Dask scheduler, e.g. tcp://10.0.0.5:8786 (needs the "
        "'cluster' extra: pip install 'brinebolt[cluster]')",
    )
    s.add_argument(
        "--only",
        metavar="STAGES",
        help=f"comma-separated stages to run (default all the file asks for): {', '.join(STAGES)}",
    )
    options.add_plots(s, "study")
    s.set_defaults(func=cmd_study)


def _stages(text: str | None) -> tuple[str, ...]:
    if not text:
        return STAGES
    got = tuple(t.strip() for t in text.split(",") if t.strip())
    bad = [t for t in got if t not in STAGES]
    if bad or not got:
        raise OptionError(
            f"option --only = {text!r}: unknown stage {', '.join(bad) or '(none)'}; "
            f"allowed: {', '.join(STAGES)}"
        )
    return got


def _fmt(x) -> str:
    if isinstance(x, float):
        return "—" if math.isnan(x) else f"{x:.4g}"
    return str(x)


def cmd_study(args) -> int:
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TimeRemainingColumn

    from sim.analysis.study import load_study, run_study
    from sim.analysis.study.study import default_out

    con = console()
    if args.jobs is not None and args.jobs < 1:
        raise OptionError(f"option --jobs = {args.jobs}: allowed: 1 or more")
    stages = _stages(args.only)
    cluster = args.cluster
    if cluster is not None:
        try:
            import distributed  # noqa: F401
        except ImportError:
            raise OptionError(
                "option --cluster needs Dask distributed; allowed: install the extra "
                "(pip install 'brinebolt[cluster]') or leave --cluster out"
            ) from None
    study = load_study(args.file)
    out = Path(args.out) if args.out else default_out(study)
    con.print(
        f"study [bold]{esc(study.title or study.path.name)}[/] → {esc(out)}"
        + (" (resuming)" if out.exists() and not args.fresh else "")
    )
    with Progress(
        "[progress.description]{task.description}",
        BarColumn(),
        MofNCompleteColumn(),
        TimeRemainingColumn(),
        console=con,
        transient=False,
    ) as bar:
        tasks: dict[str, int] = {}
        totals: dict[str, int] = {}

        def progress(stage, done, total, row):
            if stage not in tasks:
                tasks[stage] = bar.add_task(f"{stage} variants", total=0)
                totals[stage] = 0
            if done == 1:  # a new batch of this stage
                totals[stage] += total
                bar.update(tasks[stage], total=totals[stage])
            bar.advance(tasks[stage])

        result = run_study(
            study,
            out=out,
            resume=not args.fresh,
            jobs=args.jobs,
            cluster=cluster,
            stages=stages,
            csv=args.csv,
            progress=progress,
        )
    _report(result, con)
    if not args.no_plots:
        from sim.analysis.study.figures import study_figures

        stem = out.name.removesuffix(".h5")
        for name, fig in study_figures(result).items():
            options.save_figure(fig, Path(args.plots) / f"{stem}-{name}", args.pdf, con)
    return EXIT_OK


def _report(result, con) -> None:
    from rich.table import Table

    st = result.study
    rows = [r for r in result.sweep if r]
    failed = [r for r in rows if not r.get("ok")]
    feas = [r for r in rows if r.get("feasible")]
    con.print(
        f"flown {result.flown} new variant(s); sweep: {len(rows)} variant(s), "
        f"{len(feas)} feasible, {len(failed)} failed"
    )
    for r in failed[:5]:
        con.print(f"  [red]failed[/] {esc(dict(map(tuple, r['inputs'])))}: {esc(r['error'])}")
    opt = result.optimum
    if opt is not None:
        name, sense = opt.objective
        t = Table(title=f"optimum: {sense} {name}", title_justify="left")
        t.add_column("input")
        t.add_column("value", justify="right")
        for k, v in opt.settings:
            t.add_row(esc(k), esc(_fmt(v)))
        con.print(t)
        if opt.row and opt.row.get("feasible"):
            con.print(f"  {esc(name)} = {_fmt(opt.value)} after {opt.evaluations} evaluation(s)")
            outs = opt.row["outputs"]
            shown = [o for o in st.outputs if o != name][:8]
            con.print("  " + ", ".join(f"{esc(o)} = {_fmt(outs.get(o, math.nan))}" for o in shown))
            con.print(
                "  active constraints: " + (esc(", ".join(opt.active)) if opt.active else "none")
            )
        else:
            con.print(f"  [yellow]{esc(opt.message)}[/]")
    if result.front:
        names = list(result.front_objectives)
        t = Table(title="front (non-dominated feasible variants)", title_justify="left")
        for k, _ in result.front[0]["inputs"]:
            if any(k == v.key for v in st.spec.vary):
                t.add_column(esc(k.split(".")[-1]), justify="right")
        for n in names:
            t.add_column(f"{esc(n)} ({result.front_objectives[n]})", justify="right")
        vary_keys = [v.key for v in st.spec.vary]
        for r in result.front[:15]:
            ins = dict(map(tuple, r["inputs"]))
            t.add_row(
                *[esc(_fmt(ins[k])) for k in vary_keys if k in ins],
                *[_fmt(r["outputs"].get(n, math.nan)) for n in names],
            )
        con.print(t)
    for b in result.bands:
        where = "as written" if math.isnan(b.speed_m_s) else f"{b.speed_m_s / 0.514444:.3g} kn"
        r10, r50, r90 = (x / 1000 for x in b.range_m)
        e10, e50, e90 = (x / 3600 for x in b.endurance_s)
        con.print(
            f"uncertainty at {where}: range P10/P50/P90 = {r10:.3g} / {r50:.3g} / {r90:.3g} km, "
            f"endurance {e10:.3g} / {e50:.3g} / {e90:.3g} h ({b.n_ok} of {b.n} draws flew)"
        )
    s = result.sensitivity
    if s and "names" in s:
        key = "mu_star" if s["method"] == "morris" else "ST"
        if key in s:
            pairs = sorted(zip(s["names"], s[key], strict=True), key=lambda p: -abs(p[1]))
            con.print(
                f"sensitivity of {esc(s['output'])} ({s['method']}, {key}): "
                + ", ".join(f"{esc(n)} {v:.3g}" for n, v in pairs)
            )
    if result.tornado:
        con.print(
            "tornado (P10 → P90): "
            + ", ".join(
                f"{esc(b.name)} {_fmt(b.output_low)} → {_fmt(b.output_high)}"
                for b in result.tornado
            )
        )
    if result.csv_path:
        con.print(f"table as CSV: [bold]{esc(result.csv_path)}[/]")
    con.print(f"results table: [bold]{esc(result.out_path)}[/]")
