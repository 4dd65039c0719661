"""The study file format (a design study over a scenario and its vessel), as pydantic models.

A study file names a base scenario, the inputs to vary (any dotted key of the vessel or scenario
file, as ``brinebolt versus --set`` takes them), how to sample them, the outputs wanted, the
constraints, and optionally an optimisation, uncertain inputs and a sensitivity analysis::

    [study]
    title = "Glasswort: thruster and pack for range at 1.1 kn"
    scenario = "glasswort-hold.toml"        # relative to this file
    outputs = ["distance_m", "duration_s", "total_mass_kg"]

    [[vary]]
    key = "thruster.pylon.gap"
    min = 30
    max = 80
    unit = "mm"

    [[constraint]]
    output = "peak_duct_temperature_rise_k"
    max = 2.0

Numbers of a ``[[vary]]`` range get their ``unit`` appended ("30 mm") before they are set in
the vessel or scenario data, so every value is read by the files' own unit rules. Constraint
bounds are plain numbers in the output's own unit (:data:`OUTPUT_UNITS`).
"""

from __future__ import annotations

import math
from typing import Any, Literal

from pydantic import Field, model_validator
from pydantic_core import PydanticCustomError

from sim.engine.summary import SUMMARY_UNITS
from sim.io.schema import _Strict, number, quantity

__all__ = [
    "DERIVED_OUTPUTS",
    "OBJECTIVES",
    "OUTPUT_UNITS",
    "ConstraintSpec",
    "MassSpec",
    "OptimiseSpec",
    "SamplingSpec",
    "SensitivitySpec",
    "StudyFile",
    "StudyInfo",
    "UncertainSpec",
    "UncertaintySpec",
    "VarySpec",
]

DERIVED_OUTPUTS: dict[str, tuple[str, str]] = {
    "range_m": ("m", "distance flown (= distance_m)"),
    "endurance_s": ("s", "time flown (= duration_s)"),
    "h2_mol_per_h": ("mol/h", "hydrogen made per hour flown"),
    "cl2_mol_per_h": ("mol/h", "chlorine made per hour flown"),
    "gas_mol_per_h": ("mol/h", "all gas (H2 + Cl2 + O2) made per hour flown"),
    "magnet_margin_k": (
        "K",
        "lowest of the magnet grades' working limits minus the peak magnet temperature",
    ),
    "parts_mass_kg": ("kg", "mass of the modelled parts (magnets, ducts, pack) [mass model]"),
    "delta_mass_kg": ("kg", "change of the parts' mass from the base design [mass model]"),
    "total_mass_kg": ("kg", "vessel mass as flown [mass model]"),
    "magnet_mass_kg": ("kg", "magnets, yokes or cryostats of all units [mass model]"),
    "pack_mass_kg": ("kg", "battery pack [mass model]"),
    "trim_margin_kg": ("kg", "ballast (or draft allowance) left; < 0 out of trim [mass model]"),
    "in_trim": ("1", "1 when the hull carries the variant as intended [mass model]"),
}
"""Outputs worked out beside the run summary: name -> (unit, what)."""

OUTPUT_UNITS: dict[str, str] = {
    **{k: v for k, v in SUMMARY_UNITS.items() if k != "ending_reason"},
    **{k: u for k, (u, _) in DERIVED_OUTPUTS.items()},
}
"""Every output a study can ask for (summary figures and derived ones) -> unit."""

OBJECTIVES: dict[str, tuple[str, str]] = {
    "range": ("distance_m", "max"),
    "endurance": ("duration_s", "max"),
    "energy_per_distance": ("energy_per_distance_j_m", "min"),
}
"""Named objectives -> (output, sense)."""

Scalar = int | float | str | bool


def _output_name(value: Any) -> str:
    if value not in OUTPUT_UNITS:
        raise PydanticCustomError(
            "bb_value",
            "unknown output; allowed: {allowed}",
            {"allowed": ", ".join(OUTPUT_UNITS)},
        )
    return value


def _bad(message: str, **ctx) -> PydanticCustomError:
    return PydanticCustomError("bb_value", message, ctx)


class StudyInfo(_Strict):
    """[study]: what is studied and where the results go."""

    title: str = ""
    """Title shown on tables and figures.

    Default: the scenario's name."""
    scenario: str = Field(min_length=1)
    """The base scenario file, relative to the study file."""
    vessel: str | None = None
    """A vessel file flown instead of the one the scenario names, relative to the study file.

    Default: the scenario's vessel."""
    seed: number(ge=0, le=2**32 - 1, integer=True) = 0
    """Seed of every random draw (sampling, optimisation, Monte Carlo, sensitivity): the same
    seed gives the same variants and results."""
    outputs: list[str] = [  # noqa: RUF012 (pydantic copies defaults)
        "distance_m",
        "duration_s",
        "energy_per_distance_j_m",
        "peak_thruster_current_a",
        "peak_duct_temperature_rise_k",
        "h2_mol_per_h",
        "total_mass_kg",
    ]
    """Outputs stored for every variant (summary figures of a run, or derived ones: range_m,
    endurance_s, h2_mol_per_h, cl2_mol_per_h, gas_mol_per_h, magnet_margin_k, and the mass
    model's parts_mass_kg, delta_mass_kg, total_mass_kg, magnet_mass_kg, pack_mass_kg,
    trim_margin_kg, in_trim). Outputs named by constraints and objectives are stored too."""
    set: dict[str, Any] = {}  # noqa: RUF012 (pydantic copies defaults)
    """Fixed settings applied to every variant before the varied ones, as dotted keys of the
    vessel or scenario file ("leg.hold.speed" = "1.1 kn")."""
    sample: quantity("time", gt=0, optional=True) = None
    """Sampling interval of each run, overriding the scenario's output.sample (a coarser one
    makes a study faster; the summary does not depend on it).

    Default: the scenario's."""

    @model_validator(mode="after")
    def _known_outputs(self):
        bad = [o for o in self.outputs if o not in OUTPUT_UNITS]
        if bad:
            raise _bad(
                "unknown output {bad}; allowed: {allowed}",
                bad=", ".join(map(repr, bad)),
                allowed=", ".join(OUTPUT_UNITS),
            )
        return self


class VarySpec(_Strict):
    """[[vary]]: one input varied over a list of values or a range."""

    key: str = Field(min_length=1)
    """Dotted key of the vessel file (thruster.pylon.gap, battery.parallel) or of the scenario
    file (water.salinity, leg.hold.speed): lists by position or by an entry's name."""
    label: str = ""
    """Short name in tables and figures.

    Default: the last part of the key."""
    values: list[Scalar] | None = None
    """The values, each as the file would hold it ("40 mm", 4). Give values, or min and max."""
    min: number(optional=True) = None
    """Lower end of the range (a plain number; unit appended)."""
    max: number(optional=True) = None
    """Upper end of the range (a plain number; unit appended)."""
    unit: str = ""
    """Unit appended to the numbers of the range ("mm", "T"); empty for plain numbers."""
    integer: bool = False
    """The range holds whole numbers only (channels, cells in parallel)."""
    steps: number(ge=2, le=1000, integer=True) = 3
    """Points of a grid over the range (method grid)."""
    log: bool = False
    """Sample the range evenly in its logarithm (min > 0)."""

    @model_validator(mode="after")
    def _values_or_range(self):
        has_range = self.min is not None or self.max is not None
        if self.values is not None and has_range:
            raise _bad("give either values or min and max, not both; allowed: one of them")
        if self.values is None:
            if self.min is None or self.max is None:
                raise _bad("needs values = [...] or both min and max; allowed: one of them")
            if not self.max > self.min:
                raise _bad(
                    "max {hi} is not above min {lo}; allowed: min < max", hi=self.max, lo=self.min
                )
            if self.log and self.min <= 0:
                raise _bad("log = true needs min > 0; allowed: a positive min")
        elif not self.values:
            raise _bad("values is empty; allowed: at least one value")
        return self

    @property
    def name(self) -> str:
        return self.label or self.key.split(".")[-1]

    @property
    def is_range(self) -> bool:
        return self.values is None


class SamplingSpec(_Strict):
    """[sampling]: how the variants are drawn from the [[vary]] inputs."""

    method: Literal["grid", "random", "lhs", "sobol"] = "grid"
    """grid: every combination (lists and `steps` points of each range); random: independent
    uniform draws; lhs: Latin hypercube; sobol: scrambled Sobol sequence (scipy.stats.qmc)."""
    count: number(ge=1, le=1_000_000, integer=True) = 32
    """Variants drawn by random, lhs and sobol (sobol works best with a power of two)."""


class ConstraintSpec(_Strict):
    """[[constraint]]: an output that must stay within bounds for a variant to be acceptable."""

    output: str
    """The output constrained (see study.outputs for the names)."""
    min: number(optional=True) = None
    """Smallest acceptable value, in the output's unit."""
    max: number(optional=True) = None
    """Largest acceptable value, in the output's unit."""
    label: str = ""
    """Name in tables and figures.

    Default: the output and its bounds."""

    @model_validator(mode="after")
    def _check(self):
        _output_name(self.output)
        if self.min is None and self.max is None:
            raise _bad("needs min, max or both; allowed: e.g. max = 2.0")
        if self.min is not None and self.max is not None and not self.max >= self.min:
            raise _bad("max {hi} is below min {lo}; allowed: min ≤ max", hi=self.max, lo=self.min)
        return self

    @property
    def name(self) -> str:
        if self.label:
            return self.label
        lo = "" if self.min is None else f"{self.min:g} ≤ "
        hi = "" if self.max is None else f" ≤ {self.max:g}"
        return f"{lo}{self.output}{hi}"


class OptimiseSpec(_Strict):
    """[optimise]: the best variant for one objective (differential evolution over the [[vary]]
    inputs) and a front of several (NSGA-II)."""

    objective: str = "range"
    """range (distance flown, most), endurance (time flown, most), energy_per_distance (least),
    or any output name with `sense`."""
    sense: Literal["max", "min"] | None = None
    """max or min, for an objective given by output name.

    Default: that of the named objective."""
    population: number(ge=4, le=1000, integer=True) = 16
    """Candidates per generation (differential evolution's population; NSGA-II's too)."""
    generations: number(ge=1, le=1000, integer=True) = 8
    """Generations (differential evolution's maxiter; NSGA-II's too)."""
    front: dict[str, Literal["max", "min"]] = {}  # noqa: RUF012 (pydantic copies defaults)
    """Objectives of the multi-objective front, output name -> max or min, e.g.
    { distance_m = "max", total_mass_kg = "min", h2_mol_per_h = "min" }; empty for none."""

    @model_validator(mode="after")
    def _check(self):
        if self.objective in OBJECTIVES:
            if self.sense is not None and self.sense != OBJECTIVES[self.objective][1]:
                raise _bad(
                    "objective {o} is always {s}; allowed: leave sense out",
                    o=self.objective,
                    s=OBJECTIVES[self.objective][1],
                )
        else:
            if self.objective not in OUTPUT_UNITS:
                raise _bad(
                    "unknown objective {o!r}; allowed: {a}",
                    o=self.objective,
                    a=", ".join([*OBJECTIVES, *OUTPUT_UNITS]),
                )
            if self.sense is None:
                raise _bad("an objective given by output name needs sense = 'max' or 'min'")
        for k in self.front:
            _output_name(k)
        if len(self.front) == 1:
            raise _bad("a front needs at least two objectives; allowed: two or more, or none")
        return self

    @property
    def target(self) -> tuple[str, str]:
        """(output, sense) of the objective."""
        if self.objective in OBJECTIVES:
            return OBJECTIVES[self.objective]
        return self.objective, str(self.sense)


class UncertainSpec(_Strict):
    """[[uncertain]]: an input known only as a distribution."""

    key: str = Field(min_length=1)
    """Dotted key of the vessel or scenario file, as for [[vary]]."""
    label: str = ""
    """Short name in tables and figures.

    Default: the last part of the key."""
    distribution: Literal["normal", "uniform", "triangular", "lognormal"]
    """normal (mean, sd), uniform (low, high), triangular (low, mode, high) or lognormal (median,
    sd of the logarithm as `sd`)."""
    mean: number(optional=True) = None
    """Mean of a normal distribution."""
    median: number(optional=True) = None
    """Median of a lognormal distribution (> 0)."""
    sd: number(gt=0, optional=True) = None
    """Standard deviation (normal), or of the natural logarithm (lognormal)."""
    low: number(optional=True) = None
    """Lower end (uniform, triangular)."""
    mode: number(optional=True) = None
    """Most likely value (triangular)."""
    high: number(optional=True) = None
    """Upper end (uniform, triangular)."""
    relative: bool = False
    """The draws are factors on the base value of the key (e.g. mean 1, sd 0.02 for a field
    known to ±2 %); otherwise they are values, with `unit` appended."""
    unit: str = ""
    """Unit appended to drawn values (not with relative)."""

    @model_validator(mode="after")
    def _check(self):
        need = {
            "normal": ("mean", "sd"),
            "uniform": ("low", "high"),
            "triangular": ("low", "mode", "high"),
            "lognormal": ("median", "sd"),
        }[self.distribution]
        missing = [k for k in need if getattr(self, k) is None]
        if missing:
            raise _bad(
                "a {d} distribution needs {n}; missing: {m}",
                d=self.distribution,
                n=", ".join(need),
                m=", ".join(missing),
            )
        extra = [
            k
            for k in ("mean", "median", "sd", "low", "mode", "high")
            if k not in need and getattr(self, k) is not None
        ]
        if extra:
            raise _bad(
                "{e} not used by a {d} distribution; allowed: {n}",
                e=", ".join(extra),
                d=self.distribution,
                n=", ".join(need),
            )
        if self.distribution in ("uniform", "triangular") and not self.high > self.low:
            raise _bad("high must be above low; allowed: low < high")
        if self.distribution == "triangular" and not (self.low <= self.mode <= self.high):
            raise _bad("mode must lie between low and high")
        if self.distribution == "lognormal" and not self.median > 0:
            raise _bad("median must be > 0 for a lognormal distribution")
        if self.relative and self.unit:
            raise _bad("relative draws are factors; allowed: leave unit out")
        return self

    @property
    def name(self) -> str:
        return self.label or self.key.split(".")[-1]


class UncertaintySpec(_Strict):
    """[uncertainty]: Monte Carlo over the [[uncertain]] inputs."""

    count: number(ge=2, le=100_000, integer=True) = 32
    """Draws (each one run, at each speed)."""
    design: Literal["base", "optimum"] = "base"
    """Which design to fly: the base vessel with study.set, or the optimum found by [optimise]."""
    speeds: list[quantity("speed", gt=0)] = []  # noqa: RUF012 (pydantic copies defaults)
    """Held speeds for the range curve with its bands; each draw is flown at each speed.

    Default: none (the scenario as it is)."""
    speed_key: str = "leg.0.speed"
    """The scenario key the speeds are set at."""


class SensitivitySpec(_Strict):
    """[sensitivity]: global sensitivity indices of an output to the [[uncertain]] inputs, and a
    one-at-a-time tornado."""

    method: Literal["morris", "sobol"] = "morris"
    """morris (elementary effects, cheap: count × (inputs + 1) runs) or sobol (Saltelli
    sampling, count × (2·inputs + 2) runs) with SALib."""
    count: number(ge=2, le=100_000, integer=True) = 8
    """Morris trajectories, or the Sobol base sample size (a power of two)."""
    output: str = "distance_m"
    """The output analysed."""
    levels: number(ge=2, le=16, integer=True) = 4
    """Grid levels of the Morris method."""

    @model_validator(mode="after")
    def _check(self):
        _output_name(self.output)
        return self


class MassSpec(_Strict):
    """[mass]: the mass and volume model, so that variants carry what they are fitted with."""

    magnets: Literal["yoke", "blocks"] = "yoke"
    """How permanent magnets are sized for a given field: 'yoke' (blocks in an iron yoke, the
    magnetic-circuit load line) or 'blocks' (iron-free facing blocks, closed-form field). A
    thruster with magnet_blocks uses their own size."""
    grade: str = "N42"
    """NdFeB grade for thrusters that name none."""
    packaging_factor: number(ge=1, le=3) = 1.3
    """Pack mass over the cells' mass (housing, busbars, management)."""
    trim_ballast: quantity("mass", ge=0) = 0.0
    """Submerged body: ballast the base design carries and can shed; a variant whose net weight
    grows by more is out of trim."""
    max_draft_change: quantity("length", gt=0, optional=True) = None
    """Displacement hull: largest change of draft accepted.

    Default: no limit."""
    duct_wall: quantity("length", gt=0) = 3e-3
    """Thickness of the insulating duct walls (GRP)."""
    electrode_plate: quantity("length", gt=0) = 1e-3
    """Thickness of the electrode plates (titanium)."""


class StudyFile(_Strict):
    """A study file: the base scenario, the inputs varied and what is asked of them."""

    study: StudyInfo
    """The base scenario, outputs and fixed settings."""
    vary: list[VarySpec] = []  # noqa: RUF012 (pydantic copies defaults)
    """Inputs varied (none: the base design only)."""
    sampling: SamplingSpec = SamplingSpec()
    """How variants are drawn from the varied inputs."""
    constraint: list[ConstraintSpec] = []  # noqa: RUF012 (pydantic copies defaults)
    """Constraints on outputs."""
    optimise: OptimiseSpec | None = None
    """An optimisation over the varied inputs (optional)."""
    uncertain: list[UncertainSpec] = []  # noqa: RUF012 (pydantic copies defaults)
    """Uncertain inputs (for [uncertainty] and [sensitivity])."""
    uncertainty: UncertaintySpec | None = None
    """Monte Carlo over the uncertain inputs (optional)."""
    sensitivity: SensitivitySpec | None = None
    """Sensitivity of an output to the uncertain inputs (optional)."""
    mass: MassSpec | None = None
    """The mass model (optional: without it the vessel's mass is as written)."""

    @model_validator(mode="after")
    def _check(self):
        keys = [v.key for v in self.vary]
        dup = sorted({k for k in keys if keys.count(k) > 1})
        if dup:
            raise _bad("vary key {k} given twice; allowed: each key once", k=", ".join(dup))
        if (self.uncertainty or self.sensitivity) and not self.uncertain:
            raise _bad(
                "[uncertainty] and [sensitivity] need at least one [[uncertain]] input; "
                "allowed: add [[uncertain]] tables"
            )
        if self.optimise is not None and not self.vary:
            raise _bad("[optimise] needs at least one [[vary]] input to search over")
        if self.sampling.method == "grid":
            n = math.prod(len(v.values) if v.values is not None else v.steps for v in self.vary)
            if n > 1_000_000:
                raise _bad("the grid has {n} variants; allowed: at most 1000000", n=n)
        return self
