"""The vessel and scenario file formats, as pydantic models.

Every dimensional value is read through :func:`sim.io.units.to_si` and stored as a plain SI float
(temperatures in °C). Unknown keys are errors. The models here only check what a single value can
tell (type, unit, range); checks that need several values or other files live in
:mod:`sim.io.files`.
"""

import difflib
import math
from collections.abc import Callable, Iterable
from typing import Annotated, Any, Literal

from pydantic import (
    AfterValidator,
    BaseModel,
    BeforeValidator,
    ConfigDict,
    Field,
    model_validator,
)
from pydantic_core import PydanticCustomError

from sim.io.units import KINDS, UnitParseError, to_si


def _fmt(x: float, unit: str) -> str:
    return f"{x:g} {unit}".strip()


def quantity(
    kind: str,
    *,
    gt: float | None = None,
    ge: float | None = None,
    lt: float | None = None,
    le: float | None = None,
    optional: bool = False,
):
    """An annotated float field read from a value with a unit, with an optional allowed range.

    With ``optional=True`` the key may be left out (its value is then None)."""
    unit = KINDS[kind].si_unit.replace("**", "^")
    if unit == "degC":
        unit = "°C"

    def parse(value: Any) -> float | None:
        if optional and value is None:
            return None
        try:
            x = to_si(value, kind)
        except UnitParseError as exc:
            raise PydanticCustomError(
                "bb_value",
                "{reason}; allowed: {allowed}",
                {"reason": exc.reason, "allowed": exc.allowed},
            ) from None
        _check_range(x, unit, gt, ge, lt, le)
        return x

    return Annotated[float | None if optional else float, BeforeValidator(parse)]


def number(*, gt=None, ge=None, lt=None, le=None, integer: bool = False, optional: bool = False):
    """An annotated plain number (no unit) with an optional allowed range."""

    def parse(value: Any) -> float | None:
        if optional and value is None:
            return None
        if isinstance(value, bool) or not isinstance(value, int | float):
            hint = ""
            if isinstance(value, str):
                hint = " (this key takes a plain number without a unit)"
            raise PydanticCustomError(
                "bb_value",
                "expected a number{hint}; allowed: {allowed}",
                {"hint": hint, "allowed": _range_text("", gt, ge, lt, le) or "a number"},
            )
        if not math.isfinite(value):
            raise PydanticCustomError(
                "bb_value",
                "{v} is not a finite number; allowed: {allowed}",
                {"v": value, "allowed": _range_text("", gt, ge, lt, le) or "a number"},
            )
        if integer and (float(value) != int(value)):
            raise PydanticCustomError(
                "bb_value",
                "expected a whole number; allowed: {allowed}",
                {"allowed": _range_text("", gt, ge, lt, le) or "a whole number"},
            )
        _check_range(float(value), "", gt, ge, lt, le)
        return int(value) if integer else float(value)

    base = int if integer else float
    return Annotated[base | None if optional else base, BeforeValidator(parse)]


def _range_text(unit, gt, ge, lt, le) -> str:
    parts = []
    if gt is not None:
        parts.append(f"> {_fmt(gt, unit)}")
    if ge is not None:
        parts.append(f"≥ {_fmt(ge, unit)}")
    if lt is not None:
        parts.append(f"< {_fmt(lt, unit)}")
    if le is not None:
        parts.append(f"≤ {_fmt(le, unit)}")
    return " and ".join(parts)


def _check_range(x, unit, gt, ge, lt, le):
    bad = (
        (gt is not None and not x > gt)
        or (ge is not None and not x >= ge)
        or (lt is not None and not x < lt)
        or (le is not None and not x <= le)
    )
    if bad:
        raise PydanticCustomError(
            "bb_value",
            "{v} is out of range; allowed: {allowed}",
            {"v": _fmt(x, unit), "allowed": _range_text(unit, gt, ge, lt, le)},
        )


def known_name(what: str, names: Callable[[], Iterable[str]], *, upper: bool = False):
    """An annotated text field that must be one of ``names()`` (with a 'did you mean' hint).

    ``names`` is called when a value is checked, so the physics modules that own the lists
    are imported only then. With ``upper=True`` the comparison ignores case."""

    def check(value: str) -> str:
        known = sorted(names())
        probe = value.upper() if upper else value
        if probe in known:
            return value
        close = difflib.get_close_matches(probe, known, n=1, cutoff=0.5)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        raise PydanticCustomError(
            "bb_value",
            "unknown {what}{hint}; allowed: {allowed}",
            {"what": what, "hint": hint, "allowed": ", ".join(known)},
        )

    return Annotated[str, AfterValidator(check)]


def _cell_sets():
    from sim.physics.battery import CELL_SETS

    return CELL_SETS


def _electrodes():
    from sim.physics.electrochem import ELECTRODE_MATERIALS

    return ELECTRODE_MATERIALS


def _grades():
    from sim.physics.magnets import NDFEB_GRADES

    return NDFEB_GRADES


Electrode = known_name("electrode material", _electrodes)


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


Length = quantity("length", gt=0)
Fraction = number(ge=0, le=1)

# --------------------------------------------------------------------------- vessel file


def _added_mass(value: Any) -> tuple[str, float]:
    """'auto', a mass with its unit, or a plain fraction of the vessel mass (0 to 2)."""
    if isinstance(value, tuple):
        return value
    allowed = "'auto', a mass such as \"12 kg\", or a fraction of the vessel mass from 0 to 2"
    if value == "auto":
        return ("auto", 0.0)
    if isinstance(value, int | float) and not isinstance(value, bool):
        if math.isfinite(value) and 0 <= value <= 2:
            return ("fraction", float(value))
        raise PydanticCustomError(
            "bb_value", "{v} is out of range; allowed: {allowed}", {"v": value, "allowed": allowed}
        )
    try:
        kg = to_si(value, "mass")
    except UnitParseError as exc:
        raise PydanticCustomError(
            "bb_value", "{reason}; allowed: {allowed}", {"reason": exc.reason, "allowed": allowed}
        ) from None
    if kg < 0:
        raise PydanticCustomError(
            "bb_value", "{v} kg is negative; allowed: {allowed}", {"v": kg, "allowed": allowed}
        )
    return ("mass", kg)


class VesselInfo(_Strict):
    name: str = Field(min_length=1)
    description: str = ""
    mass: quantity("mass", gt=0)
    added_mass: Annotated[tuple[str, float], BeforeValidator(_added_mass)] = ("auto", 0.0)
    """'auto' (Lamb's prolate spheroid for a submerged body, 5 % of mass for other hulls),
    a mass, or a fraction of the vessel mass."""


class SubmergedHull(_Strict):
    model: Literal["submerged-body"]
    length: Length
    diameter: Length
    wetted_area: quantity("area", gt=0, optional=True) = None
    roughness_allowance: number(ge=-1e-3, le=5e-3) = 0.0


class DisplacementHull(_Strict):
    model: Literal["displacement"]
    waterline_length: Length
    beam: Length
    draft: Length
    displaced_volume: quantity("volume", gt=0)
    block_coefficient: number(gt=0.3, le=1)
    prismatic_coefficient: number(gt=0.4, le=1)
    midship_coefficient: number(gt=0.5, le=1)
    waterplane_coefficient: number(gt=0.4, le=1)
    lcb_percent: number(ge=-10, le=10) = 0.0
    transom_area: quantity("area", ge=0) = 0.0
    bulb_area: quantity("area", ge=0) = 0.0
    bulb_centre_height: quantity("length", ge=0) = 0.0
    stern_shape: number(ge=-25, le=10) = 0.0
    wetted_area: quantity("area", gt=0, optional=True) = None
    form_factor: number(ge=1, le=2, optional=True) = None
    roughness_allowance: number(ge=-1e-3, le=5e-3, optional=True) = None


class TableHull(_Strict):
    model: Literal["table"]
    speeds: list[quantity("speed", ge=0)] = Field(min_length=2)
    resistances: list[quantity("force", ge=0)] = Field(min_length=2)
    wetted_area: quantity("area", gt=0, optional=True) = None

    @model_validator(mode="after")
    def _same_length(self):
        if len(self.speeds) != len(self.resistances):
            raise PydanticCustomError(
                "bb_value",
                "speeds has {a} entries but resistances has {b}; allowed: two lists "
                "of the same length",
                {"a": len(self.speeds), "b": len(self.resistances)},
            )
        bad = [i for i in range(1, len(self.speeds)) if not self.speeds[i] > self.speeds[i - 1]]
        if bad:
            raise PydanticCustomError(
                "bb_value",
                "speeds must increase strictly, but entry {i} ({v} m/s) is not above the one "
                "before it; allowed: an ascending list of speeds",
                {"i": bad[0], "v": f"{self.speeds[bad[0]]:g}"},
            )
        return self


Hull = Annotated[SubmergedHull | DisplacementHull | TableHull, Field(discriminator="model")]


class ThrusterSpec(_Strict):
    name: str = Field(min_length=1)
    units: number(ge=1, le=64, integer=True) = 1
    gap: Length
    pole_height: Length
    active_length: Length
    channels: number(ge=1, le=256, integer=True) = 1
    field: quantity("field", ge=0, le=30)
    """Zero is legal (a thruster without a magnet only heats the water); it draws a warning."""
    magnet: Literal["permanent", "superconducting", "electromagnet"] = "permanent"
    magnet_grade: known_name("magnet grade", _grades, upper=True) | None = None
    """Permanent magnets: grade such as 'N42SH' (sets field temperature derating and the maximum
    working temperature)."""
    field_reference_temperature: quantity("temperature", ge=-50, le=100) = 20.0
    anode: Electrode = "graphite"
    cathode: Electrode = "graphite"
    overpotential: quantity("voltage", ge=0, le=5) = 0.5
    chlorine_fraction: Fraction = 1.0
    wall_roughness: quantity("length", ge=0) = 1e-5
    inlet_loss: number(ge=0, le=5) = 0.5
    nozzle_loss: number(ge=0, le=5) = 0.02
    nozzle_area_ratio: number(gt=0.1, le=1.5) = 1.0
    jet: Literal["ducted", "disk"] = "ducted"
    housing_wetted_area: quantity("area", ge=0) = 0.0
    housing_length: quantity("length", gt=0, optional=True) = None
    housing_form_factor: number(ge=1, le=3) = 1.5
    magnet_heat_capacity: quantity("heat_capacity", gt=0) = 5000.0
    magnet_conductance: quantity("thermal_conductance", gt=0) = 5.0

    @model_validator(mode="after")
    def _grade_needs_permanent(self):
        if self.magnet_grade is not None and self.magnet != "permanent":
            raise PydanticCustomError(
                "bb_value",
                "magnet_grade = '{g}' applies to permanent magnets only, but magnet = '{m}'; "
                "allowed: leave magnet_grade out",
                {"g": self.magnet_grade, "m": self.magnet},
            )
        return self


class BatterySpec(_Strict):
    cell: known_name("cell parameter set", _cell_sets)
    series: number(ge=1, le=2000, integer=True)
    parallel: number(ge=1, le=2000, integer=True)
    extra_resistance: quantity("resistance", ge=0) = 0.0
    conductance_to_water: quantity("thermal_conductance", gt=0) = 5.0


class DriveSpec(_Strict):
    efficiency: number(gt=0.3, le=1) = 0.95
    max_current: quantity("current", gt=0)
    """Per thruster unit: each unit has its own converter."""
    max_voltage: quantity("voltage", gt=0)
    undervoltage_margin: quantity("voltage", ge=0, le=1) = 0.05
    """Per cell: the drive folds back to keep cells this far above their minimum voltage."""


class HotelSpec(_Strict):
    power: quantity("power", ge=0) = 0.0
    cryocooler: quantity("power", ge=0) = 0.0


class VesselFile(_Strict):
    vessel: VesselInfo
    hull: Hull
    thruster: list[ThrusterSpec] = Field(min_length=1)
    battery: BatterySpec
    drive: DriveSpec
    hotel: HotelSpec = HotelSpec()


# --------------------------------------------------------------------------- scenario file


class ScenarioInfo(_Strict):
    name: str = Field(min_length=1)
    description: str = ""
    vessel: str = Field(min_length=1)
    """Path of the vessel file, relative to the scenario file."""


class WaterSpec(_Strict):
    salinity: number(ge=0, le=42) = 35.0
    temperature: quantity("temperature", ge=-2, le=40)
    depth: quantity("length", ge=0, le=11000) = 0.0
    current: quantity("speed", ge=-10, le=10) = 0.0
    """Steady water current along the track [m/s], positive when it flows with the vessel."""


class StartSpec(_Strict):
    state_of_charge: Fraction = 1.0
    speed: quantity("speed", ge=-5, le=40) = 0.0
    battery_temperature: quantity("temperature", ge=-30, le=80, optional=True) = None
    magnet_temperature: quantity("temperature", ge=-30, le=200, optional=True) = None


class OutputSpec(_Strict):
    sample: quantity("time", gt=0) = 10.0


class SolverSpec(_Strict):
    rtol: number(ge=1e-12, le=1e-2) = 1e-7
    max_step: quantity("time", gt=0) = 600.0
    method: Literal["RK45", "DOP853", "LSODA", "Radau", "BDF"] = "RK45"
    """scipy.integrate.solve_ivp method: explicit Runge–Kutta (RK45, DOP853) for most missions,
    LSODA (switches to a stiff method) for long steady legs with a fast speed hold, Radau or BDF
    for stiff plants."""


class LimitsSpec(_Strict):
    time: quantity("time", gt=0) = 86400.0
    state_of_charge_min: Fraction = 0.0
    battery_temperature_max: quantity("temperature", ge=0, le=120) = 60.0
    magnet_temperature_max: quantity("temperature", ge=0, le=250, optional=True) = None
    duct_temperature_rise_max: quantity("temperature_difference", gt=0, optional=True) = None


class Conditions(_Strict):
    """Conditions on the state; a set of them holds when ANY holds."""

    duration: quantity("time", gt=0, optional=True) = None
    distance: quantity("distance", gt=0, optional=True) = None
    speed_above: quantity("speed", optional=True) = None
    speed_below: quantity("speed", optional=True) = None
    soc_below: number(ge=0, le=1, optional=True) = None
    cell_voltage_below: quantity("voltage", gt=0, optional=True) = None
    duct_temperature_rise_above: quantity("temperature_difference", gt=0, optional=True) = None
    battery_temperature_above: quantity("temperature", optional=True) = None
    magnet_temperature_above: quantity("temperature", optional=True) = None
    time_after: quantity("time", ge=0, optional=True) = None
    """Mission time (from the start of the run)."""
    total_distance_above: quantity("distance", gt=0, optional=True) = None

    def given(self) -> dict[str, float]:
        return {k: v for k, v in self.model_dump().items() if v is not None}


class LegSpec(_Strict):
    name: str = Field(min_length=1)
    voltage: quantity("voltage", ge=-1e4, le=1e4, optional=True) = None
    current: quantity("current", ge=-1e5, le=1e5, optional=True) = None
    power: quantity("power", ge=0, le=1e9, optional=True) = None
    speed: quantity("speed", ge=0, le=40, optional=True) = None
    until: Conditions
    hotel: quantity("power", ge=0, optional=True) = None
    speed_gain: quantity("gain_per_speed", gt=0, optional=True) = None
    """Proportional gain of the speed hold [V per m/s]; default from the plant."""
    speed_reset_time: quantity("time", gt=0, optional=True) = None
    """Integral time of the speed hold [s]; default from the plant."""

    @model_validator(mode="after")
    def _one_command(self):
        given = [
            k for k in ("voltage", "current", "power", "speed") if getattr(self, k) is not None
        ]
        if len(given) != 1:
            raise PydanticCustomError(
                "bb_value",
                "leg '{name}' sets {n} commands ({given}); allowed: exactly one of voltage, "
                "current, power, speed",
                {"name": self.name, "n": len(given), "given": ", ".join(given) or "none"},
            )
        if not self.until.given():
            raise PydanticCustomError(
                "bb_value",
                "leg '{name}' has no end condition; allowed: at least one of {allowed}",
                {"name": self.name, "allowed": ", ".join(Conditions.model_fields)},
            )
        return self

    @property
    def mode(self) -> str:
        for k in ("voltage", "current", "power", "speed"):
            if getattr(self, k) is not None:
                return k
        raise AssertionError("validated leg without a command")

    @property
    def setpoint(self) -> float:
        return float(getattr(self, self.mode))


class TriggerSpec(_Strict):
    name: str = Field(min_length=1)
    when: Conditions
    then: Literal["goto", "derate", "stop", "hotel"]
    leg: str | None = None
    factor: number(gt=0, le=1, optional=True) = None
    hotel: quantity("power", ge=0, optional=True) = None

    @model_validator(mode="after")
    def _action_args(self):
        need = {"goto": "leg", "derate": "factor", "hotel": "hotel"}.get(self.then)
        if need and getattr(self, need) is None:
            raise PydanticCustomError(
                "bb_value",
                "trigger '{name}' does '{then}' but has no '{need}'; allowed: "
                "then = 'goto' with leg, 'derate' with factor, 'hotel' with hotel, or 'stop'",
                {"name": self.name, "then": self.then, "need": need},
            )
        if not self.when.given():
            raise PydanticCustomError(
                "bb_value",
                "trigger '{name}' has no condition in 'when'; allowed: at least one of {allowed}",
                {"name": self.name, "allowed": ", ".join(Conditions.model_fields)},
            )
        return self


class ScheduleSpec(_Strict):
    at: quantity("time", ge=0)
    hotel: quantity("power", ge=0)


class ScenarioFile(_Strict):
    scenario: ScenarioInfo
    water: WaterSpec
    start: StartSpec = StartSpec()
    output: OutputSpec = OutputSpec()
    solver: SolverSpec = SolverSpec()
    limits: LimitsSpec = LimitsSpec()
    leg: list[LegSpec] = Field(min_length=1)
    trigger: list[TriggerSpec] = []
    schedule: list[ScheduleSpec] = []
