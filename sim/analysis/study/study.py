"""Design studies: read a study file, fly its sweep, optimise, run the Monte Carlo and the
sensitivity analysis, and gather what they found (no printing, no figures here).

>>> from sim.analysis.study import run_study
>>> res = run_study("scenarios/studies/glasswort-range.study.toml")  # doctest: +SKIP
>>> res.optimum.settings, res.front[:3], res.bands                  # doctest: +SKIP
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from scipy import stats
from scipy.optimize import differential_evolution

from sim.analysis.study.design import (
    draw_variants,
    format_number,
    is_vessel_key,
    scale_value,
    value_at,
)
from sim.analysis.study.evaluate import _scenario_data, _vessel_data, load_variant, vessel_path_of
from sim.analysis.study.runner import StudyRunner
from sim.analysis.study.store import StudyStore, read_table, write_csv
from sim.analysis.variants import apply_settings
from sim.io.files import load_study_file
from sim.io.problems import InputError, Problem
from sim.io.study_schema import OUTPUT_UNITS, StudyFile, UncertainSpec, VarySpec

__all__ = [
    "Band",
    "LoadedStudy",
    "Optimum",
    "StudyResult",
    "TornadoBar",
    "active_constraints",
    "default_out",
    "design_settings",
    "load_study",
    "run_study",
]


@dataclass(frozen=True)
class LoadedStudy:
    """A validated study: the file, its scenario and vessel paths, and its base settings with
    every key checked against the files."""

    path: Path
    spec: StudyFile
    scenario_path: Path
    vessel_path: Path | None
    text: str

    @property
    def title(self) -> str:
        return self.spec.study.title

    @property
    def base_settings(self) -> tuple[tuple[str, object], ...]:
        return tuple(self.spec.study.set.items())

    @property
    def constraint_columns(self) -> list[str]:
        return [f"meets:{c.name}" for c in self.spec.constraint]

    @property
    def outputs(self) -> list[str]:
        """Every output stored: those asked for, and those constraints and objectives need."""
        s = self.spec
        names = list(s.study.outputs)
        names += [c.output for c in s.constraint]
        if s.optimise:
            names += [s.optimise.target[0], *s.optimise.front]
        if s.sensitivity:
            names.append(s.sensitivity.output)
        if s.uncertainty:
            names += ["distance_m", "duration_s"]
        if s.mass:
            names += ["total_mass_kg", "trim_margin_kg", "in_trim"]
        return list(dict.fromkeys(names))

    @property
    def input_keys(self) -> list[str]:
        s = self.spec
        keys = [k for k, _ in self.base_settings] + [v.key for v in s.vary]
        keys += [u.key for u in s.uncertain]
        if s.uncertainty and s.uncertainty.speeds:
            keys.append(s.uncertainty.speed_key)
        return list(dict.fromkeys(keys))


def _base_value(data: dict, key: str, file: str, where: str):
    """The value at a dotted key of file data (for relative draws)."""
    node = data
    for part in key.split("."):
        if isinstance(node, list):
            names = [e.get("name") for e in node if isinstance(e, dict)]
            idx = int(part) if part.isdigit() else (names.index(part) if part in names else None)
            if idx is None or idx >= len(node):
                node = None
                break
            node = node[idx]
        elif isinstance(node, dict) and part in node:
            node = node[part]
        else:
            node = None
            break
    if node is None:
        raise InputError(
            [
                Problem(
                    file,
                    where,
                    key,
                    "relative draws need the key to have a value in the base files",
                )
            ]
        )
    return node


def load_study(path: str | Path) -> LoadedStudy:
    """Read and validate a study file and check every key it sets against the base vessel and
    scenario (each at its range ends), so that a mistake is reported before anything flies.

    Raises
    ------
    InputError
        Naming the study file, the key (``vary[1].key``), the value and what is allowed.
    """
    path = Path(path)
    spec, scenario, vessel = load_study_file(path)
    text = path.read_text(encoding="utf-8")
    study = LoadedStudy(path, spec, scenario, vessel, text)
    src = str(path)
    problems: list[Problem] = []
    try:
        load_variant(str(scenario), None if vessel is None else str(vessel), study.base_settings)
    except InputError as exc:
        problems += [
            Problem(src, f"study.set ({p.key})", p.value, f"{p.message} (in {p.file})")
            for p in exc.problems
        ]
    if problems:
        raise InputError(problems)

    def probe(where: str, settings) -> None:
        try:
            load_variant(
                str(scenario),
                None if vessel is None else str(vessel),
                (*study.base_settings, *settings),
            )
        except InputError as exc:
            problems.extend(
                Problem(src, where, p.value, f"{p.message} (at {p.key} of {p.file})")
                for p in exc.problems
            )
        except Exception as exc:  # a model refusing the value
            problems.append(Problem(src, where, "", f"{type(exc).__name__}: {exc}"))

    for i, v in enumerate(spec.vary):
        ends = (
            [v.values[0], v.values[-1]]
            if v.values is not None
            else [value_at(v, 0), value_at(v, 1)]
        )
        for x in dict.fromkeys(map(str, ends)):
            val = next(e for e in ends if str(e) == x)
            probe(f"vary[{i}] ({v.key} = {val!r})", [(v.key, val)])
    for i, u in enumerate(spec.uncertain):
        lo, hi = _quantiles(u, 0.1), _quantiles(u, 0.9)
        for q in (lo, hi):
            try:
                val = _uncertain_value(study, u, q)
            except InputError as exc:
                problems.extend(exc.problems)
                break
            probe(f"uncertain[{i}] ({u.key} = {val!r})", [(u.key, val)])
    if spec.uncertainty and spec.uncertainty.speeds:
        key = spec.uncertainty.speed_key
        probe(
            f"uncertainty.speed_key ({key})",
            [(key, f"{spec.uncertainty.speeds[0]:.10g} m/s")],
        )
    if problems:
        raise InputError(problems)
    return study


# ------------------------------------------------------------------ distributions


def _dist(u: UncertainSpec):
    if u.distribution == "normal":
        return stats.norm(loc=u.mean, scale=u.sd)
    if u.distribution == "uniform":
        return stats.uniform(loc=u.low, scale=u.high - u.low)
    if u.distribution == "triangular":
        return stats.triang(c=(u.mode - u.low) / (u.high - u.low), loc=u.low, scale=u.high - u.low)
    return stats.lognorm(s=u.sd, scale=u.median)


def _quantiles(u: UncertainSpec, q):
    return _dist(u).ppf(q)


def _uncertain_value(study: LoadedStudy, u: UncertainSpec, x: float) -> object:
    if not u.relative:
        return format_number(float(x), u.unit)
    if is_vessel_key(u.key):
        vpath = vessel_path_of(
            str(study.scenario_path), None if study.vessel_path is None else str(study.vessel_path)
        )
        data = apply_settings(_vessel_data(vpath), [], vpath)
        file = vpath
    else:
        data = _scenario_data(str(study.scenario_path))
        file = str(study.scenario_path)
    base = dict(study.base_settings).get(u.key)
    if base is None:
        base = _base_value(data, u.key, file, u.key)
    return scale_value(base, float(x))


# ------------------------------------------------------------------ results


@dataclass(frozen=True)
class Optimum:
    """The best variant for the objective.

    Attributes
    ----------
    objective : output optimised, and max or min
    settings : the varied inputs at the optimum (key, value)
    row : its row (outputs, verdicts)
    value : the objective's value
    active : constraints within 2 % of their bound (and trim, when the margin is within 2 %
        of the vessel's mass)
    evaluations : variants flown or found by the optimiser
    converged : the optimiser's own verdict, and its message
    """

    objective: tuple[str, str]
    settings: tuple[tuple[str, object], ...]
    row: dict
    value: float
    active: list[str]
    evaluations: int
    converged: bool
    message: str


@dataclass(frozen=True)
class Band:
    """P10/P50/P90 of range and endurance over the Monte Carlo draws, at one speed.

    Attributes
    ----------
    speed_m_s : held speed [m/s] (NaN: the scenario as written)
    range_m : (P10, P50, P90) distance [m]
    endurance_s : (P10, P50, P90) time [s]
    n_ok, n : draws that flew, and all draws
    """

    speed_m_s: float
    range_m: tuple[float, float, float]
    endurance_s: tuple[float, float, float]
    n_ok: int
    n: int


@dataclass(frozen=True)
class TornadoBar:
    """The output with one uncertain input at its P10 and at its P90, the others at P50."""

    name: str
    low_value: object
    high_value: object
    output_low: float
    output_high: float

    @property
    def swing(self) -> float:
        return abs(self.output_high - self.output_low)


@dataclass
class StudyResult:
    """What a study found. ``rows`` are the results table's rows (flat columns)."""

    study: LoadedStudy
    out_path: Path
    sweep: list[dict] = field(default_factory=list)
    optimum: Optimum | None = None
    front: list[dict] = field(default_factory=list)
    front_objectives: dict[str, str] = field(default_factory=dict)
    bands: list[Band] = field(default_factory=list)
    uncertainty_rows: list[dict] = field(default_factory=list)
    sensitivity: dict | None = None
    tornado: list[TornadoBar] = field(default_factory=list)
    tornado_base: float = math.nan
    flown: int = 0
    csv_path: Path | None = None
    timing: dict[str, float] = field(default_factory=dict)
    """Seconds summed over the variants flown: ``load_s`` (reading and checking a variant, the
    mass model included), ``fly_s`` (the mission) in the workers, ``write_s`` (keeping the
    rows) in this process."""

    @property
    def rows(self) -> list[dict]:
        return read_table(self.out_path)

    def feasible(self, rows: Sequence[dict] | None = None) -> list[dict]:
        return [r for r in (self.sweep if rows is None else rows) if r and r.get("feasible")]


# ------------------------------------------------------------------ stages


def _out(row: dict | None, name: str) -> float:
    if not row or not row.get("ok"):
        return math.nan
    return float(row.get("outputs", {}).get(name, math.nan))


def _sign(sense: str) -> float:
    return -1.0 if sense == "max" else 1.0


def _decoder(vary: Sequence[VarySpec]):
    """Bounds, integrality and the decoder x -> settings of the optimisers' search space: a list
    is searched by its index, an integer range by whole numbers, a range continuously."""
    bounds, integrality = [], []
    for v in vary:
        if v.values is not None:
            bounds.append((0.0, float(len(v.values) - 1)))
            integrality.append(True)
        elif v.log:
            bounds.append((math.log(v.min), math.log(v.max)))
            integrality.append(False)
        else:
            bounds.append((float(v.min), float(v.max)))
            integrality.append(bool(v.integer))

    def decode(x) -> tuple[tuple[str, object], ...]:
        out = []
        for v, xi in zip(vary, x, strict=True):
            if v.values is not None:
                out.append((v.key, v.values[round(min(max(xi, 0), len(v.values) - 1))]))
            else:
                val = math.exp(xi) if v.log else float(xi)
                val = min(max(val, v.min), v.max)
                out.append((v.key, format_number(val, v.unit, v.integer)))
        return tuple(out)

    return bounds, integrality, decode


def _violation(row: dict | None, study: LoadedStudy) -> float:
    """Sum of the constraints' relative violations (0 when feasible; large when failed)."""
    if not row or not row.get("ok"):
        return 1e6
    total = 0.0
    outs = row["outputs"]
    for c in study.spec.constraint:
        x = outs.get(c.output, math.nan)
        if math.isnan(x):
            total += 1.0
            continue
        if c.max is not None and x > c.max:
            total += (x - c.max) / max(abs(c.max), 1e-9)
        if c.min is not None and x < c.min:
            total += (c.min - x) / max(abs(c.min), 1e-9)
    if outs.get("in_trim", 1.0) != 1.0:
        total += -outs.get("trim_margin_kg", -1.0) / max(outs.get("total_mass_kg", 1.0), 1.0)
    return total


def active_constraints(row: dict, study: LoadedStudy, tol: float = 0.02) -> list[str]:
    """Constraints of a feasible row within ``tol`` (relative) of their bound."""
    out = []
    outs = row.get("outputs", {})
    for c in study.spec.constraint:
        x = outs.get(c.output, math.nan)
        for bound in (c.min, c.max):
            if bound is not None and abs(x - bound) <= tol * max(abs(bound), 1e-9):
                out.append(c.name)
    m = outs.get("trim_margin_kg")
    if m is not None and not math.isnan(m) and 0 <= m <= tol * outs.get("total_mass_kg", 0.0):
        out.append("trim (ballast left ≈ 0)")
    return out


def optimise(study: LoadedStudy, runner: StudyRunner, seed: int) -> Optimum:
    """Differential evolution (scipy) over the varied inputs for the objective, constraints as
    a penalty; every candidate is a variant of the table."""
    opt = study.spec.optimise
    name, sense = opt.target
    bounds, integrality, decode = _decoder(study.spec.vary)
    base = study.base_settings

    def settings_of(x):
        return (*base, *decode(x))

    def objective(x) -> float:
        row = runner.store.get(runner.job(settings_of(x)).variant_id)
        pen = _violation(row, study)
        val = _out(row, name)
        if pen > 0 or math.isnan(val):
            return 1e12 * (1.0 + pen)
        return _sign(sense) * val

    def mapper(func, xs):
        xs = [np.asarray(x) for x in xs]
        runner.run([settings_of(x) for x in xs], "optimise")
        return [func(x) for x in xs]

    res = differential_evolution(
        objective,
        bounds,
        integrality=integrality,
        popsize=max(1, math.ceil(opt.population / max(len(bounds), 1))),
        maxiter=opt.generations,
        seed=seed,
        workers=mapper,
        updating="deferred",
        polish=False,
        tol=1e-6,
    )
    best_settings = settings_of(res.x)
    row = runner.run([best_settings], "optimise")[0]
    # the best feasible variant the optimiser saw (DE's x is one of them)
    return Optimum(
        objective=(name, sense),
        settings=decode(res.x),
        row=row,
        value=_out(row, name),
        active=active_constraints(row, study) if row and row.get("feasible") else [],
        evaluations=int(res.nfev),
        converged=bool(res.success) and bool(row and row.get("feasible")),
        message=str(res.message)
        if row and row.get("feasible")
        else ("no variant met every constraint: " + str(res.message)),
    )


def pareto_front(study: LoadedStudy, runner: StudyRunner, seed: int) -> list[dict]:
    """NSGA-II (pymoo) over the varied inputs for the front objectives, constraints as
    inequality constraints; returns the rows of the non-dominated feasible variants among all
    the designs flown (sweep, optimiser and NSGA-II)."""
    from pymoo.algorithms.moo.nsga2 import NSGA2
    from pymoo.core.problem import Problem as MooProblem
    from pymoo.optimize import minimize

    opt = study.spec.optimise
    objectives = list(opt.front.items())
    bounds, _integrality, decode = _decoder(study.spec.vary)
    base = study.base_settings
    lo = np.array([b[0] for b in bounds])
    hi = np.array([b[1] for b in bounds])

    class _Front(MooProblem):
        def __init__(self):
            super().__init__(n_var=len(bounds), n_obj=len(objectives), n_ieq_constr=1, xl=lo, xu=hi)

        def _evaluate(self, X, out, *args, **kwargs):
            rows = runner.run([(*base, *decode(x)) for x in X], "front")
            F = np.array(
                [[_sign(s) * _out(r, n) for n, s in objectives] for r in rows], dtype=float
            )
            F[~np.isfinite(F)] = 1e12
            out["F"] = F
            out["G"] = np.array([[_violation(r, study)] for r in rows])

    res = minimize(
        _Front(),
        NSGA2(pop_size=opt.population),
        ("n_gen", opt.generations),
        seed=seed,
        verbose=False,
    )
    if res.X is None:
        return []
    X = np.atleast_2d(res.X)
    runner.run([(*base, *decode(x)) for x in X], "front")
    # the front of every design flown (sweep, optimiser and NSGA-II alike), not only NSGA-II's
    pool = [
        r
        for r in runner.store.rows.values()
        if r.get("feasible") and r.get("stage") in ("sweep", "optimise", "front")
    ]
    F = np.array([[_sign(s) * _out(r, n) for n, s in objectives] for r in pool], dtype=float)
    front = [
        r
        for i, r in enumerate(pool)
        if np.all(np.isfinite(F[i]))
        and not np.any(np.all(F <= F[i], axis=1) & np.any(F < F[i], axis=1))
    ]
    front.sort(key=lambda r: _sign(objectives[0][1]) * _out(r, objectives[0][0]))
    return front


def design_settings(study: LoadedStudy, optimum: Optimum | None) -> tuple:
    """The design the uncertainty and sensitivity stages fly: the base (with study.set), or
    the optimum when [uncertainty] design = "optimum" and one was found."""
    unc = study.spec.uncertainty
    if unc is not None and unc.design == "optimum" and optimum is not None:
        return (*study.base_settings, *optimum.settings)
    return study.base_settings


def _draws(study: LoadedStudy, u01: np.ndarray) -> list[tuple]:
    """Settings of uncertain inputs at points of the unit cube (through each distribution's
    quantile function, kept within P0.5–P99.5 so that no draw is unbounded)."""
    u01 = np.clip(u01, 0.005, 0.995)
    out = []
    for row in u01:
        out.append(
            tuple(
                (u.key, _uncertain_value(study, u, float(_quantiles(u, q))))
                for u, q in zip(study.spec.uncertain, row, strict=True)
            )
        )
    return out


def monte_carlo(study: LoadedStudy, runner: StudyRunner, design: tuple, seed: int):
    """Monte Carlo over the uncertain inputs (plain random draws, seeded) at each speed; the
    bands are P10/P50/P90 of range and endurance over the draws that flew."""
    unc = study.spec.uncertainty
    rng = np.random.default_rng(seed)
    draws = _draws(study, rng.random((unc.count, len(study.spec.uncertain))))
    speeds = list(unc.speeds) or [math.nan]
    bands, all_rows = [], []
    for v in speeds:
        speed_set = () if math.isnan(v) else ((unc.speed_key, f"{v:.10g} m/s"),)
        rows = runner.run([(*design, *speed_set, *d) for d in draws], "uncertainty")
        all_rows += rows
        rng_vals = np.array([_out(r, "distance_m") for r in rows])
        end_vals = np.array([_out(r, "duration_s") for r in rows])
        ok = np.isfinite(rng_vals)

        def pct(a):
            a = a[np.isfinite(a)]
            if a.size == 0:
                return (math.nan,) * 3
            return tuple(float(x) for x in np.percentile(a, [10, 50, 90]))

        bands.append(Band(float(v), pct(rng_vals), pct(end_vals), int(ok.sum()), len(rows)))
    return bands, all_rows


def sensitivity(study: LoadedStudy, runner: StudyRunner, design: tuple, seed: int) -> dict:
    """Global sensitivity indices with SALib (Morris mu*, sigma or Sobol S1, ST) of an output to
    the uncertain inputs, sampled in their quantile space."""
    from SALib.analyze import morris as morris_analyze
    from SALib.analyze import sobol as sobol_analyze
    from SALib.sample import morris as morris_sample
    from SALib.sample import sobol as sobol_sample

    sens = study.spec.sensitivity
    names = [u.name for u in study.spec.uncertain]
    problem = {"num_vars": len(names), "names": names, "bounds": [[0.0, 1.0]] * len(names)}
    if sens.method == "morris":
        X = morris_sample.sample(problem, sens.count, num_levels=sens.levels, seed=seed)
    else:
        X = sobol_sample.sample(problem, sens.count, calc_second_order=False, seed=seed)
    rows = runner.run([(*design, *d) for d in _draws(study, X)], "sensitivity")
    Y = np.array([_out(r, sens.output) for r in rows])
    failed = int(np.sum(~np.isfinite(Y)))
    if failed == len(Y):
        return {"method": sens.method, "output": sens.output, "names": names, "failed": failed}
    Y = np.where(np.isfinite(Y), Y, np.nanmean(Y))
    if sens.method == "morris":
        si = morris_analyze.analyze(problem, X, Y, num_levels=sens.levels, seed=seed)
        idx = {"mu_star": list(map(float, si["mu_star"])), "sigma": list(map(float, si["sigma"]))}
    else:
        si = sobol_analyze.analyze(problem, Y, calc_second_order=False, seed=seed)
        idx = {"S1": list(map(float, si["S1"])), "ST": list(map(float, si["ST"]))}
    return {"method": sens.method, "output": sens.output, "names": names, "failed": failed, **idx}


def tornado(study: LoadedStudy, runner: StudyRunner, design: tuple, output: str):
    """One at a time: each uncertain input at its P10 and P90, the others at their P50."""
    us = study.spec.uncertain
    med = [(u.key, _uncertain_value(study, u, float(_quantiles(u, 0.5)))) for u in us]
    batch = [(*design, *med)]
    ends = []
    for i, u in enumerate(us):
        lo = _uncertain_value(study, u, float(_quantiles(u, 0.1)))
        hi = _uncertain_value(study, u, float(_quantiles(u, 0.9)))
        ends.append((lo, hi))
        for val in (lo, hi):
            s = list(med)
            s[i] = (u.key, val)
            batch.append((*design, *s))
    rows = runner.run(batch, "tornado")
    base = _out(rows[0], output)
    bars = [
        TornadoBar(u.name, lo, hi, _out(rows[1 + 2 * i], output), _out(rows[2 + 2 * i], output))
        for i, (u, (lo, hi)) in enumerate(zip(us, ends, strict=True))
    ]
    bars.sort(key=lambda b: -b.swing if math.isfinite(b.swing) else 0.0)
    return base, bars


# ------------------------------------------------------------------ the whole study


def default_out(study: LoadedStudy, out_dir: str | Path = "outputs") -> Path:
    """``outputs/<study file stem>.h5``."""
    stem = study.path.name.removesuffix(".toml").removesuffix(".study")
    return Path(out_dir) / f"{stem}.h5"


def run_study(
    study: str | Path | LoadedStudy,
    *,
    out: str | Path | None = None,
    resume: bool = True,
    jobs: int | None = None,
    cluster=None,
    stages: Sequence[str] = ("sweep", "optimise", "front", "uncertainty", "sensitivity"),
    csv: str | Path | None = None,
    progress: Callable[[str, int, int, dict], None] | None = None,
) -> StudyResult:
    """Run a study file: its sweep, optimum and front, Monte Carlo bands and sensitivity.

    Parameters
    ----------
    study : path or LoadedStudy
    out : path, optional
        The results file (HDF5); default ``outputs/<study stem>.h5``.
    resume : bool
        Keep the variants already in ``out`` (and its journal) and fly only the others; False
        starts afresh.
    jobs : int, optional
        Local worker processes (default one per core; 1 flies in this process).
    cluster : str or distributed.Client, optional
        A Dask scheduler address (or client) to fly the variants on instead.
    stages : sequence of str
        Which stages to run (each only if the file asks for it).
    csv : path, optional
        Also write the table as CSV there.
    progress : callable, optional
        Called with (stage, done, total, row) as each variant finishes.

    Returns
    -------
    StudyResult

    Raises
    ------
    InputError
        When the study file or a file it names is invalid (nothing flies).
    """
    st = study if isinstance(study, LoadedStudy) else load_study(study)
    spec = st.spec
    out_path = Path(out) if out is not None else default_out(st)
    columns = {
        "inputs": [(k, "") for k in st.input_keys],
        "outputs": [(n, OUTPUT_UNITS.get(n, "")) for n in st.outputs],
        "constraints": [
            (col, c.name) for col, c in zip(st.constraint_columns, spec.constraint, strict=True)
        ],
    }
    meta = {"title": st.title, "study_path": str(st.path), "study_text": st.text}
    store = StudyStore(out_path, columns, meta, resume=resume)
    result = StudyResult(st, out_path)
    stage_name = ["sweep"]

    def report(done, total, row):
        if progress:
            progress(stage_name[0], done, total, row)

    seed = int(spec.study.seed)
    runner = StudyRunner(
        st.scenario_path,
        st.vessel_path,
        store,
        spec.constraint,
        st.constraint_columns,
        mass=None if spec.mass is None else spec.mass.model_dump(),
        sample_s=spec.study.sample,
        jobs=jobs,
        cluster=cluster,
        progress=report,
    )
    try:
        with runner:
            if "sweep" in stages and spec.vary:
                stage_name[0] = "sweep"
                batch = draw_variants(spec.vary, spec.sampling.method, spec.sampling.count, seed)
                result.sweep = runner.run([(*st.base_settings, *b) for b in batch], "sweep")
            if "optimise" in stages and spec.optimise is not None:
                stage_name[0] = "optimise"
                result.optimum = optimise(st, runner, seed)
            if "front" in stages and spec.optimise is not None and spec.optimise.front:
                stage_name[0] = "front"
                result.front = pareto_front(st, runner, seed)
                result.front_objectives = dict(spec.optimise.front)
            design = design_settings(st, result.optimum)
            if "uncertainty" in stages and spec.uncertainty is not None:
                stage_name[0] = "uncertainty"
                result.bands, result.uncertainty_rows = monte_carlo(st, runner, design, seed)
            if "sensitivity" in stages and spec.sensitivity is not None:
                stage_name[0] = "sensitivity"
                result.sensitivity = sensitivity(st, runner, design, seed)
                result.tornado_base, result.tornado = tornado(
                    st, runner, design, spec.sensitivity.output
                )
        result.flown = runner.flown
        result.timing = dict(runner.timing)
    except BaseException:
        store.abandon()
        raise
    store.close()
    if csv is not None:
        result.csv_path = write_csv(csv, read_table(out_path))
    return result
