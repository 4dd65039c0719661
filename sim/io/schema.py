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
    PrivateAttr,
    Strict,
    ValidationError,
    model_validator,
)
from pydantic_core import PydanticCustomError

from sim.io.units import KINDS, UnitParseError, to_si
from sim.physics.battery import CELL_SETS
from sim.physics.electrochem import ELECTRODE_MATERIALS
from sim.physics.electrodes import ELECTRODE_KINETICS, SACRIFICIAL_ANODES
from sim.physics.magnets import NDFEB_GRADES


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
    return CELL_SETS


def _electrodes():
    return ELECTRODE_MATERIALS


def _grades():
    return NDFEB_GRADES


def _anodes():
    return set(ELECTRODE_MATERIALS) | set(SACRIFICIAL_ANODES)


Electrode = known_name("electrode material", _electrodes)
Anode = known_name("anode material", _anodes)

SACRIFICIAL_CATHODES = {
    k.galvanic_key: k.name for k in ELECTRODE_KINETICS.values() if k.role == "cathode"
}
"""Cathode material (file name) -> its kinetics entry, for the cathodes a sacrificial anode may
work against (their hydrogen-evolution overpotential sets the electrode drop)."""

LAYOUTS = ("duct", "stack", "annular", "ring-of-tubes", "helical", "open-field")
"""Thruster layouts a vessel file may choose (thruster.layout)."""

COIL_FOR_LAYOUT = {
    "duct": "racetrack-pair",
    "stack": "racetrack-pair",
    "annular": "toroid",
    "ring-of-tubes": "toroid",
    "helical": "solenoid",
}
"""The coil kind that gives each layout its field (along the poles, azimuthal, axial)."""


_LAYOUT_NEEDS = {
    "duct": ("gap", "pole_height"),
    "stack": ("gap", "pole_height", "stack_count"),
    "annular": ("inner_radius", "outer_radius"),
    "ring-of-tubes": ("gap", "pole_height", "ring_radius", "tube_count"),
    "helical": ("inner_radius", "outer_radius", "pitch_angle"),
    "open-field": (
        "strip_pitch",
        "electrode_width",
        "strips",
        "magnet_width",
        "magnet_thickness",
        "array_position",
    ),
}
"""Keys each thruster layout requires."""


def _bad(message: str, key: str = "", **ctx):
    """A check across keys, blamed on ``key`` (dotted, inside the table checked)."""
    return PydanticCustomError("bb_value", message, {**ctx, "key": key})


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)


Length = quantity("length", gt=0, le=1e4)
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
    if kg > 2e9:
        raise PydanticCustomError(
            "bb_value",
            "{v:g} kg is out of range; allowed: {allowed}, at most 2e9 kg",
            {"v": kg, "allowed": allowed},
        )
    return ("mass", kg)


class VesselInfo(_Strict):
    """[vessel]: what the vessel is and how heavy it is."""

    name: str = Field(min_length=1)
    """Name of the vessel, shown in table and figure titles and stored in the log."""
    description: str = ""
    """Free text for people; the simulation does not use it."""
    mass: quantity("mass", gt=0, le=1e9)
    """Mass of the vessel as it sails (everything on board). With added_mass it sets the inertia in
    surge: (mass + added mass)·dV/dt = thrust − resistance. A submerged-body hull is taken as
    neutrally buoyant, so this is also its displaced mass. At most 10⁶ t (the largest ships
    ever built displaced under 7·10⁵ t)."""
    added_mass: Annotated[tuple[str, float], BeforeValidator(_added_mass)] = ("auto", 0.0)
    """Surge added mass: 'auto' (submerged-body hull: Lamb's prolate-spheroid coefficient from
    length and diameter, times mass; other hulls: 5 % of mass), a mass with its unit, or a plain
    number read as a fraction of mass."""


class SubmergedHull(_Strict):
    """Hull model "submerged-body": a deeply submerged streamlined body of revolution. Resistance is
    skin friction (ITTC-1957 line) times Hoerner's form factor plus roughness_allowance, on the
    wetted area; no wave resistance (the body is assumed deep enough not to feel the surface)."""

    model: Literal["submerged-body"]
    """Selects this hull model: "submerged-body"."""
    length: Length
    """Overall body length l; also the length of the Reynolds number."""
    diameter: Length
    """Largest diameter d; the fineness ratio length/diameter must lie between 2 and 30."""
    wetted_area: quantity("area", gt=0, optional=True) = None
    """Wetted area S of the body.

    Default: the surface of the prolate spheroid of the same length and diameter (a few per cent low
    for a body with a parallel middle part)."""
    roughness_allowance: number(ge=-1e-3, le=5e-3) = 0.0
    """Roughness allowance ΔC_F added to the drag coefficient (not multiplied by the form factor,
    ITTC-1978 practice); 0 is a hydraulically smooth body."""


class DisplacementHull(_Strict):
    """Hull model "displacement": a surface ship by the Holtrop & Mennen (1982) regression (friction
    with form factor, wave, bulb, transom and correlation-allowance terms). `brinebolt check`
    rejects proportions outside the ranges of the regression."""

    model: Literal["displacement"]
    """Selects this hull model: "displacement"."""
    waterline_length: Length
    """Length on the waterline L."""
    beam: Length
    """Moulded breadth B."""
    draft: Length
    """Mean moulded draught T (also used as the draught at the forward perpendicular)."""
    displaced_volume: quantity("volume", gt=0)
    """Moulded displaced volume ∇."""
    block_coefficient: number(gt=0.3, le=1)
    """Block coefficient C_B = ∇/(L·B·T); must agree with displaced_volume and the main dimensions
    to within 1 %."""
    prismatic_coefficient: number(gt=0.4, le=1)
    """Prismatic coefficient C_P = C_B/C_M; must agree with block_coefficient and
    midship_coefficient to within 1 %."""
    midship_coefficient: number(gt=0.5, le=1)
    """Midship section coefficient C_M."""
    waterplane_coefficient: number(gt=0.4, le=1)
    """Waterplane area coefficient C_WP."""
    lcb_percent: number(ge=-10, le=10) = 0.0
    """Longitudinal centre of buoyancy forward of midships (0.5 L), in per cent of L; negative is
    aft."""
    transom_area: quantity("area", ge=0) = 0.0
    """Immersed transom area at rest A_T; 0: no transom drag."""
    bulb_area: quantity("area", ge=0) = 0.0
    """Transverse area of the bulbous bow where the still-water surface meets the stem A_BT; 0: no
    bulb."""
    bulb_centre_height: quantity("length", ge=0) = 0.0
    """Height of the centroid of bulb_area above the keel line h_B (at most 0.6 × draft)."""
    stern_shape: number(ge=-25, le=10) = 0.0
    """Afterbody form coefficient C_stern: −25 pram with gondola, −10 V-shaped sections, 0 normal
    sections, +10 U-shaped sections with Hogner stern."""
    wetted_area: quantity("area", gt=0, optional=True) = None
    """Wetted area S of the bare hull.

    Default: the Holtrop & Mennen formula."""
    form_factor: number(ge=1, le=2, optional=True) = None
    """Form factor (1 + k1), e.g. from a Prohaska plot.

    Default: the regression formula."""
    roughness_allowance: number(ge=-1e-3, le=5e-3, optional=True) = None
    """Model-ship correlation allowance C_A; when given it replaces the regression's whole C_A
    (roughness term included).

    Default: the regression formula."""
    outside_range: Literal["refuse", "warn"] = "refuse"
    """What to do when the hull's proportions (prismatic coefficient, length/beam, beam/draft) lie
    outside the hull data behind the Holtrop & Mennen regression: "refuse" the file, or "warn" and
    run with the regression extrapolated (small craft such as a 7 m work-boat often lie outside;
    their resistance is then a rough estimate; a measured curve as hull model "table" is better).

    Default: the file is refused (an extrapolated regression can be far off, so running anyway
    must be chosen in the file)."""


class TableHull(_Strict):
    """Hull model "table": a calm-water resistance curve given point by point (model tests or
    another prediction), interpolated by monotone cubic (PCHIP); beyond the last point R grows as
    V²; going astern R(−V) = −R(V). The table is used as given whatever the water density."""

    model: Literal["table"]
    """Selects this hull model: "table"."""
    speeds: list[quantity("speed", ge=0)] = Field(min_length=2)
    """Speeds through water of the table points, strictly increasing. A point (0, 0) is added when
    the table does not start at zero speed."""
    resistances: list[quantity("force", ge=0)] = Field(min_length=2)
    """Calm-water resistance at each of the speeds (as many entries as speeds); 0 at zero speed."""
    wetted_area: quantity("area", gt=0, optional=True) = None
    """Wetted area, for information only (the resistance comes from the table).

    Default: not given."""

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


def _no_brackets(name: str) -> str:
    if "[" in name or "]" in name:
        raise PydanticCustomError(
            "name_brackets",
            "a thruster name cannot hold '[' or ']' (the log's per-thruster columns are "
            "written thrust_n[NAME]); allowed: letters, digits, spaces and other signs",
        )
    return name


class MagnetBlocks(_Strict):
    """thruster.magnet_blocks: two facing NdFeB blocks per channel, one on each pole wall, centred
    on the channel, magnetised along the field. Their mean field over the channel volume (closed-
    form field of uniformly magnetised blocks, no iron) replaces `field`."""

    width: Length
    """Block size across the channel (along the electrode gap). Blocks not much wider than the
    gap give a field that falls towards the electrodes."""
    length: Length
    """Block size along the flow. Blocks shorter than active_length give a field that falls
    towards the channel ends."""
    thickness: Length
    """Block size along the magnetisation (the field)."""
    grade: known_name("magnet grade", _grades, upper=True)
    """NdFeB grade such as 'N42SH' (case ignored): its nominal remanence at 20 °C sets the field,
    its temperature coefficient and maximum working temperature act as for magnet_grade."""
    yoke: Annotated[bool, Strict()] = False
    """true: the blocks sit on steel back plates joined by a return frame (a yoke). The field is
    then a magnetic-circuit estimate, B = Br/(σ + μ_r·g/(2t)) with the leakage σ of the pole
    faces (Furlani 2001), spread over the channel like the field without iron; stated to be
    within about 15 % of a finite-element or magpylib-with-iron result for gaps up to the
    block width. false: no iron, the blocks' exact superposition field (checked against
    magpylib).

    Default: no yoke."""


class Coil(_Strict):
    """thruster.coil: an electromagnet that gives the thruster its field instead of `field`. The
    field is the volume mean over the channel (or annulus) of the filamentary coil field
    (Biot–Savart; :mod:`sim.physics.fields`). Resistive coils (copper, aluminium) add their
    I²R to the pack as a constant load; a superconducting coil (nbti) adds its cryocooler input
    power (an order-of-magnitude estimate from its cold mass and field) and is checked against
    the NbTi critical line (quench margin). Both loads go into the same constant load as
    hotel.cryocooler."""

    kind: Literal["racetrack-pair", "solenoid", "toroid"]
    """'racetrack-pair': two flat racetrack coils above and below a rectangular channel (layouts
    duct and stack); 'toroid': a toroidal winding round an annulus, B = μ0·N·I/(2π·r) (layouts
    annular and ring-of-tubes); 'solenoid': a finite solenoid round the annulus, axial field
    (layout helical)."""
    ampere_turns: quantity("current", gt=0, le=1e8)
    """N·I of each coil (a racetrack pair: of each of its two coils; a toroid: the total linking
    the torus)."""
    conductor: Literal["copper", "aluminium", "nbti"] = "copper"
    """Winding conductor: 'copper' or 'aluminium' (resistive: needs magnet = 'electromagnet',
    current and one of resistance or voltage) or 'nbti' (superconducting at 4.2 K: needs
    magnet = 'superconducting', current, superconductor_area and peak_field).

    Default: copper."""
    straight_length: quantity("length", gt=0, le=100, optional=True) = None
    """Racetrack pair: length of the straight sides, along the flow.

    Default: none (required by kind = 'racetrack-pair')."""
    end_radius: quantity("length", gt=0, le=100, optional=True) = None
    """Racetrack pair: radius of the semicircular ends; the coil is twice this wide across the
    channel.

    Default: none (required by kind = 'racetrack-pair')."""
    separation: quantity("length", gt=0, le=100, optional=True) = None
    """Racetrack pair: distance between the planes of the two coils; more than the channel's
    pole_height (the coils lie outside the channel).

    Default: none (required by kind = 'racetrack-pair')."""
    radius: quantity("length", gt=0, le=100, optional=True) = None
    """Solenoid: winding radius; more than the annulus outer_radius.

    Default: none (required by kind = 'solenoid')."""
    length: quantity("length", gt=0, le=100, optional=True) = None
    """Solenoid: winding length along the axis.

    Default: none (required by kind = 'solenoid')."""
    current: quantity("current", gt=0, le=1e6, optional=True) = None
    """Conductor current (resistive: with resistance or voltage it gives the coil's I²R;
    superconducting: the operating point on the load line and the current-lead heat load).

    Default: none (required)."""
    resistance: quantity("resistance", gt=0, optional=True) = None
    """Resistive coils: resistance of the whole winding of one unit (all its coils in series) at
    its working temperature; the load is current² × resistance.

    Default: none (give resistance or voltage)."""
    voltage: quantity("voltage", gt=0, optional=True) = None
    """Resistive coils: voltage across the whole winding of one unit; the load is voltage ×
    current.

    Default: none (give resistance or voltage)."""
    superconductor_area: quantity("area", gt=0, optional=True) = None
    """NbTi: superconductor cross-section of the conductor, without its copper.

    Default: none (required by conductor = 'nbti')."""
    peak_field: quantity("field", gt=0, le=30, optional=True) = None
    """NbTi: highest field on the winding at the operating current; with the current it sets the
    load line B = k·I, whose crossing with the critical line gives the quench current.

    Default: none (required by conductor = 'nbti')."""
    persistent: Annotated[bool, Strict()] = False
    """NbTi: true when the coil runs in persistent mode (no current-lead heat load).

    Default: the leads carry the current."""

    @model_validator(mode="after")
    def _needs(self):
        need = {
            "racetrack-pair": ("straight_length", "end_radius", "separation"),
            "solenoid": ("radius", "length"),
            "toroid": (),
        }[self.kind]
        if self.conductor == "nbti":
            need += ("current", "superconductor_area", "peak_field")
        else:
            need += ("current",)
        for k in need:
            if getattr(self, k) is None:
                raise _bad(
                    "a {kind} coil of {cond} needs '{k}'; allowed: give {k}",
                    k,
                    kind=self.kind,
                    cond=self.conductor,
                    k=k,
                )
        if self.conductor != "nbti" and (self.resistance is None) == (self.voltage is None):
            raise _bad(
                "a resistive coil needs exactly one of resistance and voltage (its I²R or V·I "
                "is a load on the pack); allowed: one of them",
                "resistance",
            )
        if self.conductor == "nbti":
            for k in ("resistance", "voltage"):
                if getattr(self, k) is not None:
                    raise _bad(
                        "a superconducting coil has no resistance; allowed: leave {k} out",
                        k,
                        k=k,
                    )
        return self


class ThrusterSpec(_Strict):
    """[[thruster]]: one thruster design; `units` identical copies of it are fitted. Lengths and
    areas here are of one channel or one unit."""

    name: Annotated[str, Field(min_length=1), AfterValidator(_no_brackets)]
    """Name of the design, unique in the file; names it in logs, tables and variant settings
    (thruster.NAME.gap). It cannot hold '[' or ']' (the log's per-thruster columns are
    written thrust_n[NAME])."""
    units: number(ge=1, le=64, integer=True) = 1
    """Number of identical units of this design. Each unit has its own converter (drive.max_current
    is per unit) and gets the same electrode voltage; thrust, current, power, losses, gas and
    housing drag are the one-unit values times units."""
    layout: Literal["duct", "stack", "annular", "ring-of-tubes", "helical", "open-field"] = "duct"
    """Thruster layout (:mod:`sim.physics.layouts`); each is built into an equivalent straight
    duct with the same resistance, force per ampere, back EMF, flow area and volume (its own
    hydraulic diameter for friction), so every result and log channel is as for a duct; the
    logged field of an annular, ring or helical layout is that equivalent duct's field.
    'duct': straight rectangular channels (gap, pole_height, channels). 'stack': stack_count
    short channels side by side sharing one magnet array (gap and pole_height of one channel);
    the same as a duct with that many channels, named for the design. 'annular': radial current
    between ring electrodes at inner_radius and outer_radius, azimuthal field (field_profile),
    axial flow through the annulus (Way 1968). 'ring-of-tubes': tube_count rectangular tubes
    (gap along the radius, pole_height along the field) on a ring of ring_radius in an
    azimuthal field. 'helical': a solenoid's axial field, radial current, helical passages at
    pitch_angle and a stator that recovers stator_recovery of the swirl energy. 'open-field':
    no duct; strips of electrodes and magnets on the hull (strip_pitch, electrode_width,
    strips, magnet_width, magnet_thickness, magnet_depth, active_length along the flow) drive
    current and field into the water outside (Way 1968): force per ampere and resistance from
    a 2-D periodic model, back EMF by reciprocity, no duct friction, the accelerated boundary
    layer's extra hull friction counted against the thrust (:mod:`sim.physics.open_field`
    states the assumptions); `field` is then the magnets' remanence (or give magnet_grade).

    Default: a straight duct (as before this key existed)."""
    gap: quantity("length", gt=0, le=1e4, optional=True) = None
    """Electrode spacing of one channel: the channel width along the electric field (layouts
    duct, stack, ring-of-tubes: along the radius).

    Default: none (required by layouts duct, stack and ring-of-tubes)."""
    pole_height: quantity("length", gt=0, le=1e4, optional=True) = None
    """Height of one channel between the magnet poles, along the magnetic field; the flow area of a
    channel is gap × pole_height.

    Default: none (required by layouts duct, stack and ring-of-tubes)."""
    active_length: Length
    """Length of one channel over which electrodes and field act (where the Lorentz force pushes the
    water); for annular and helical layouts the axial length of the electrodes."""
    stack_count: number(ge=1, le=256, integer=True, optional=True) = None
    """Layout stack: number of short channels side by side, sharing one magnet array; the flow
    area is stack_count × gap × pole_height and, at the same flow, the duct velocity falls by
    the count (momentum efficiency up, electrical efficiency per channel unchanged). Wired as
    channel_wiring says.

    Default: none (required by layout stack)."""
    inner_radius: quantity("length", gt=0, le=100, optional=True) = None
    """Layouts annular and helical: radius of the inner ring electrode (the annulus inner wall).

    Default: none (required by layouts annular and helical)."""
    outer_radius: quantity("length", gt=0, le=100, optional=True) = None
    """Layouts annular and helical: radius of the outer ring electrode; more than inner_radius.

    Default: none (required by layouts annular and helical)."""
    ring_radius: quantity("length", gt=0, le=100, optional=True) = None
    """Layout ring-of-tubes: radius of the tube centres; more than half the gap.

    Default: none (required by layout ring-of-tubes)."""
    tube_count: number(ge=1, le=256, integer=True, optional=True) = None
    """Layout ring-of-tubes: number of tubes round the ring, electrically in parallel.

    Default: none (required by layout ring-of-tubes)."""
    field_profile: Literal["toroidal", "uniform"] = "toroidal"
    """Layouts annular and ring-of-tubes: how the azimuthal field varies with radius.
    'toroidal': B ∝ 1/r (a toroidal winding, or a ring of magnets that approximates one);
    'uniform': constant. `field` is its value at the mean radius (annular) or ring radius.

    Default: toroidal."""
    pitch_angle: number(gt=0, le=90, optional=True) = None
    """Layout helical: angle between the helical passages and the azimuthal direction, in
    degrees (90: axial passages, which give no force in an axial field).

    Default: none (required by layout helical)."""
    vanes: number(ge=1, le=256, integer=True) = 8
    """Layout helical: number of helical vanes (passages), for their hydraulic diameter.

    Default: 8."""
    stator_recovery: number(ge=0, le=1) = 0.6
    """Layout helical: share of the swirl kinetic energy the stator behind the passages returns
    to the axial jet; the rest is lost (reported inside the friction loss). Half to three
    quarters is usual for stator vanes (Carlton 2012; from memory).

    Default: 0.6."""
    strip_pitch: quantity("length", gt=0, le=10, optional=True) = None
    """Layout open-field: centre distance between neighbouring electrode strips, the same as
    between neighbouring magnet strips (their polarities alternate, so the pattern repeats every
    two pitches); field and current decay into the water over about pitch/π.

    Default: none (required by layout open-field)."""
    electrode_width: quantity("length", gt=0, le=10, optional=True) = None
    """Layout open-field: width of each electrode strip, flush with the hull (≤ strip_pitch).

    Default: none (required by layout open-field)."""
    strips: number(ge=2, le=10000, integer=True, optional=True) = None
    """Layout open-field: number of electrode strips of one unit, alternately anode and cathode;
    the array covers strips × strip_pitch across the flow and active_length along it.

    Default: none (required by layout open-field)."""
    magnet_width: quantity("length", gt=0, le=10, optional=True) = None
    """Layout open-field: width of each magnet strip (≤ strip_pitch), magnetised normal to the
    hull, alternately in and out.

    Default: none (required by layout open-field)."""
    magnet_thickness: quantity("length", gt=0, le=10, optional=True) = None
    """Layout open-field: thickness of the magnet strips along their magnetisation.

    Default: none (required by layout open-field)."""
    magnet_depth: quantity("length", ge=0, le=10) = 0.0
    """Layout open-field: distance from the magnets' faces to the wetted surface (the hull
    plating and any coating over them).

    Default: 0 m."""
    magnet_offset: quantity("length", ge=0, le=10, optional=True) = None
    """Layout open-field: offset of the magnet strips from the electrode strips across the flow;
    half the pitch gives the largest force, zero none.

    Default: half the strip_pitch."""
    array_position: quantity("length", gt=0, le=1e4, optional=True) = None
    """Layout open-field: distance from the bow to the middle of the array along the hull; sets
    the boundary-layer thickness there.

    Default: none (required by layout open-field)."""
    friction_share: number(ge=0, le=1) = 0.5
    """Layout open-field: share of the Lorentz force acting inside the hull's boundary layer that
    goes to the hull as extra skin friction (a model assumption, not from a source; 0 switches
    the effect off).

    Default: 0.5."""
    channels: number(ge=1, le=256, integer=True) = 1
    """Identical channels in one unit, side by side in the flow; electrically as channel_wiring
    says."""
    channel_wiring: Literal["parallel", "series"] = "parallel"
    """How the channels of one unit are connected. 'parallel': the unit voltage is the channel
    voltage and the channel currents add. 'series': the unit voltage is channels × the channel
    voltage and the unit current is the channel current. Power, thrust, losses and gas are the
    same; the drive's max_voltage and max_current apply to the unit values."""
    field: quantity("field", ge=0, le=30, optional=True) = None
    """Mean magnetic flux density in the gap, at field_reference_temperature (layouts annular and
    ring-of-tubes: the azimuthal field at the mean or ring radius; helical: the axial field;
    open-field: the remanence of the magnet strips, the grade's when left out).
    Zero is legal (a thruster without a magnet only heats the water); it draws a warning. Give
    exactly one of field, magnet_blocks and coil.

    Default: none (then magnet_blocks or coil is required)."""
    magnet_blocks: MagnetBlocks | None = None
    """Permanent-magnet blocks on the pole walls whose volume-mean field over the channel is used
    instead of a given field (see the magnet_blocks table). Needs magnet = 'permanent'.

    Default: none (the given field is used)."""
    coil: Coil | None = None
    """An electromagnet (see the coil table) whose volume-mean field over the channel or annulus
    is used instead of a given field. Needs magnet = 'electromagnet' (copper, aluminium) or
    'superconducting' (nbti).

    Default: none."""
    magnet: Literal["permanent", "superconducting", "electromagnet"] = "permanent"
    """Kind of magnet. 'permanent' (NdFeB): the field follows the magnet temperature (−0.12 %/K, or
    the coefficient of magnet_grade). 'superconducting' or 'electromagnet': constant field. With
    a coil table the coil's I²R or cryocooler power is added to the constant load; with a given
    field no magnet power is modelled: give it as hotel.cryocooler."""
    magnet_grade: known_name("magnet grade", _grades, upper=True) | None = None
    """Permanent magnets only: NdFeB grade such as 'N42SH' (case ignored). Sets the field's
    temperature coefficient and the grade's maximum working temperature, which stops the run when a
    magnet exceeds it (unless limits.magnet_temperature_max is given).

    Default: no grade (−0.12 %/K, no grade temperature limit)."""
    field_reference_temperature: quantity("temperature", ge=-50, le=100) = 20.0
    """Magnet temperature at which `field` holds; a permanent-magnet field is scaled by 1 +
    α·(T_magnet − this). No effect on other magnets."""
    anode: Anode = "graphite"
    """Anode material. With the cathode it sets the galvanic offset (rest potential of the anode
    minus that of the cathode in flowing seawater), which adds to the electrode voltage drop.
    'aluminium_zinc_indium' and 'zinc' are sacrificial anodes: they dissolve instead of evolving
    chlorine (no chlorine, no oxygen), the pair works as a galvanic cell, E_anode − E_H₂ (about
    −0.32 V for Al–Zn–In, which helps the current) plus the cathode's hydrogen overpotential at
    the drive's max_current (Butler–Volmer), and the metal is consumed by Faraday's law
    (DNV-RP-B401 design capacity: 2000 A·h/kg Al–Zn–In, 780 A·h/kg zinc). With a sacrificial
    anode the cathode must be one with hydrogen kinetics data (copper, mild_steel,
    platinised_titanium, stainless_316_passive), overpotential and chlorine_fraction are not
    used, and the logged oxygen is an upper bound (the duct model still counts the anode charge
    as oxygen)."""
    anode_mass: quantity("mass", gt=0, le=1e5, optional=True) = None
    """Sacrificial anodes only: metal mass of all the anodes of one unit when new. The scenario
    condition anode_spent (in a leg's until or a trigger's when) watches it.

    Default: not tracked."""
    anode_utilisation: number(gt=0, le=1) = 0.85
    """Sacrificial anodes only: usable share of anode_mass; the anode is spent when this share has
    dissolved (DNV-RP-B401 utilisation factor of long flush-mounted anodes, from memory).

    Default: 0.85."""
    cathode: Electrode = "graphite"
    """Cathode material (see anode)."""
    overpotential: quantity("voltage", ge=0, le=5) = 0.5
    """Sum of the anodic and cathodic overpotentials. The electrode drop (reversible electrolysis
    voltage + overpotential + galvanic offset) is the part of each unit's voltage that does no work
    on the water."""
    chlorine_fraction: Fraction = 1.0
    """Fraction of the anodic charge that evolves chlorine (the rest evolves oxygen); sets the gas
    rates (Faraday's law) and the reversible voltage in the electrode drop. 1 is the worst case for
    toxicity."""
    wall_roughness: quantity("length", ge=0) = 1e-5
    """Equivalent sand roughness of the channel walls for duct friction (Colebrook); 0 is
    hydraulically smooth; at most 0.1 of the channel's hydraulic diameter."""
    inlet_loss: number(ge=0, le=5) = 0.5
    """Inlet loss coefficient on the channel's dynamic head (0.5: sharp-edged inlet)."""
    nozzle_loss: number(ge=0, le=5) = 0.02
    """Nozzle loss coefficient on the jet's dynamic head."""
    nozzle_area_ratio: number(gt=0.1, le=1.5) = 1.0
    """Exit area / channel area; below 1 the nozzle contracts and the jet leaves faster than the
    channel flow."""
    jet: Literal["ducted", "disk"] = "ducted"
    """Jet model: 'ducted' for intake and exit flush with the hull (jet at ambient pressure); 'disk'
    for a short open duct in the free stream (actuator-disk momentum theory). Use 'ducted' for crash
    stops."""
    housing_wetted_area: quantity("area", ge=0) = 0.0
    """Outside wetted area of the housing of one unit; added to the hull resistance as an appendage
    (times units, form-factor method). 0: no housing drag."""
    housing_length: quantity("length", gt=0, optional=True) = None
    """Length of one housing along the flow, for its Reynolds number.

    Default: active_length."""
    housing_form_factor: number(ge=1, le=3) = 1.5
    """Form factor (1 + k2) of the housing drag."""
    magnet_heat_capacity: quantity("heat_capacity", gt=0) = 5000.0
    """Heat capacity of the magnet of one unit (one lumped temperature per design). The magnet
    temperature relaxes toward the mean duct water temperature with the time constant
    magnet_heat_capacity / magnet_conductance."""
    magnet_conductance: quantity("thermal_conductance", gt=0) = 5.0
    """Thermal conductance between the magnet of one unit and the water in its duct (mean of the
    inlet and outlet temperatures)."""
    wake_fraction: number(ge=-0.3, lt=1) = 0.0
    """Taylor wake fraction w: the intakes see the inflow speed V·(1 − w) instead of the vessel
    speed V, which lowers their ram pressure and the thrust power T·V·(1 − w). Published values
    for propellers behind the hull: single-screw displacement hulls about 0.2–0.35, twin-screw
    0.05–0.2, submerged bodies of revolution with a stern propeller 0.2–0.4 (Harvald 1983,
    Resistance and Propulsion of Ships; from memory). Intakes on pylons out of the boundary
    layer, or flush intakes far forward, see little wake.

    Default: intakes in the free stream (as before this key existed)."""
    thrust_deduction: number(ge=-0.3, lt=1) = 0.0
    """Thrust deduction fraction t: the suction of the intakes on the hull raises its
    resistance, so the hull feels the thrust T·(1 − t). Published values behind a hull: about
    0.6–0.9 × the wake fraction for single-screw ships (Harvald 1983; from memory).

    Default: no interaction (as before this key existed)."""
    gas_model: Literal["none", "bruggeman", "maxwell"] = "none"
    """Lower the conductivity of the water by the electrolysis gas it carries along the channel:
    'bruggeman' σ/σ0 = (1 − ε)^1.5 (Bruggeman 1935), 'maxwell' 2(1 − ε)/(2 + ε) (Maxwell 1873),
    solved jointly with the current. The void fractions are logged whatever the choice.

    Default: σ unchanged."""
    gas_slip_ratio: number(gt=0, le=20) = 1.0
    """Velocity of the bubbles / velocity of the water along the channel (1: homogeneous flow);
    above 1 the gas leaves faster and the void fraction is lower."""
    end_effects: bool = False
    """Add the current that fringes beyond the two ends of the active length: it draws current
    and heats the water but gives no thrust."""

    @model_validator(mode="wrap")
    @classmethod
    def _missing_for_layout(cls, data: Any, handler):
        """When other keys are wrong too, report the keys the layout needs as missing in the
        same pass (the check after validation does not run then)."""
        try:
            return handler(data)
        except ValidationError as exc:
            lay = data.get("layout", "duct") if isinstance(data, dict) else None
            need = _LAYOUT_NEEDS.get(lay, ()) if isinstance(lay, str) else ()
            extra = [k for k in need if k not in data]
            have = {tuple(e["loc"]) for e in exc.errors()}
            extra = [k for k in extra if (k,) not in have]
            if not extra:
                raise
            errs = [
                {
                    "type": PydanticCustomError(e["type"], e["msg"])
                    if e["type"].startswith("bb_") or e["type"] == "name_brackets"
                    else e["type"],
                    "loc": e["loc"],
                    "input": e["input"],
                    **({"ctx": e["ctx"]} if "ctx" in e and not e["type"].startswith("bb_") else {}),
                }
                for e in exc.errors()
            ]
            errs += [{"type": "missing", "loc": (k,), "input": data} for k in extra]
            raise ValidationError.from_exception_data(exc.title, errs) from None

    @model_validator(mode="after")
    def _layout_keys(self):
        lay = self.layout
        need = _LAYOUT_NEEDS[lay]
        for k in need:
            if getattr(self, k) is None:
                raise _bad(
                    "layout '{lay}' needs '{k}'; allowed: give {k} (layout {lay} uses {need})",
                    k,
                    lay=lay,
                    k=k,
                    need=", ".join(need),
                )
        only = {
            "gap": ("duct", "stack", "ring-of-tubes"),
            "pole_height": ("duct", "stack", "ring-of-tubes"),
            "stack_count": ("stack",),
            "inner_radius": ("annular", "helical"),
            "outer_radius": ("annular", "helical"),
            "ring_radius": ("ring-of-tubes",),
            "tube_count": ("ring-of-tubes",),
            "pitch_angle": ("helical",),
            "strip_pitch": ("open-field",),
            "electrode_width": ("open-field",),
            "strips": ("open-field",),
            "magnet_width": ("open-field",),
            "magnet_thickness": ("open-field",),
            "magnet_offset": ("open-field",),
            "array_position": ("open-field",),
        }
        given = self.model_fields_set
        extra = {
            "field_profile": ("annular", "ring-of-tubes"),
            "vanes": ("helical",),
            "stator_recovery": ("helical",),
            "magnet_depth": ("open-field",),
            "friction_share": ("open-field",),
        }
        for k, lays in {**only, **extra}.items():
            if lay not in lays and (getattr(self, k) is not None if k in only else k in given):
                raise _bad(
                    "'{k}' applies to layout {lays} only, but layout = '{lay}'; allowed: leave "
                    "{k} out",
                    k,
                    k=k,
                    lays=" or ".join(lays),
                    lay=lay,
                )
        if self.channels != 1 and lay != "duct":
            raise _bad(
                "channels applies to layout duct; layout '{lay}' counts its channels with "
                "{what}; allowed: leave channels out",
                "channels",
                lay=lay,
                what={"stack": "stack_count", "ring-of-tubes": "tube_count"}.get(lay, "nothing"),
            )
        if lay in ("annular", "helical") and not self.outer_radius > self.inner_radius:
            raise _bad(
                "outer_radius must be more than inner_radius ({r1:g} m); allowed: > {r1:g} m",
                "outer_radius",
                r1=self.inner_radius,
            )
        if lay == "open-field":
            for k in ("electrode_width", "magnet_width", "magnet_offset"):
                v = getattr(self, k)
                if v is not None and v > self.strip_pitch:
                    raise _bad(
                        "{k} ({v:g} m) is more than strip_pitch ({p:g} m); allowed: ≤ strip_pitch",
                        k,
                        k=k,
                        v=v,
                        p=self.strip_pitch,
                    )
            for k in ("channel_wiring", "wake_fraction", "thrust_deduction", "nozzle_area_ratio"):
                if k in given:
                    raise _bad(
                        "{k} does not apply to layout open-field (no duct, no channels; the "
                        "friction_share sets its deduction); allowed: leave {k} out",
                        k,
                        k=k,
                    )
        if lay == "helical" and "nozzle_area_ratio" in given:
            raise _bad(
                "layout helical sets its own jet from the stator recovery; allowed: leave "
                "nozzle_area_ratio out",
                "nozzle_area_ratio",
            )
        return self

    @model_validator(mode="after")
    def _sacrificial(self):
        sac = self.anode in SACRIFICIAL_ANODES
        if sac and self.cathode not in SACRIFICIAL_CATHODES:
            raise _bad(
                "cathode '{c}' has no hydrogen-evolution kinetics data to pair with the "
                "sacrificial anode '{a}'; allowed: {allowed}",
                "cathode",
                c=self.cathode,
                a=self.anode,
                allowed=", ".join(sorted(SACRIFICIAL_CATHODES)),
            )
        for k in ("anode_mass", "anode_utilisation"):
            if not sac and k in self.model_fields_set:
                raise _bad(
                    "{k} applies to sacrificial anodes, but anode = '{a}'; allowed: anode = "
                    "{allowed}, or leave {k} out",
                    k,
                    k=k,
                    a=self.anode,
                    allowed=" or ".join(f"'{n}'" for n in SACRIFICIAL_ANODES),
                )
        return self

    @model_validator(mode="after")
    def _field_or_blocks(self):
        if self.layout == "open-field":
            if self.magnet_blocks is not None or self.coil is not None:
                raise _bad(
                    "layout open-field takes its magnets as strips; allowed: field (the strips' "
                    "remanence) or magnet_grade, not magnet_blocks or coil",
                    "magnet_blocks" if self.magnet_blocks is not None else "coil",
                )
            if self.field is None and self.magnet_grade is None:
                raise _bad(
                    "layout open-field needs the magnet strips' remanence; allowed: field = "
                    "'1.3 T' (remanence) or magnet_grade = 'N42SH'",
                    "field",
                )
            if self.magnet != "permanent":
                raise _bad(
                    "layout open-field models permanent-magnet strips, but magnet = '{m}'; "
                    "allowed: magnet = 'permanent'",
                    "magnet",
                    m=self.magnet,
                )
            return self
        n_given = sum(x is not None for x in (self.field, self.magnet_blocks, self.coil))
        if n_given != 1:
            raise PydanticCustomError(
                "bb_value",
                "give exactly one of field, magnet_blocks and coil; allowed: a field such as "
                "'0.75 T', a magnet_blocks table or a coil table",
                {},
            )
        if self.magnet_blocks is not None and self.layout not in ("duct", "stack"):
            raise _bad(
                "magnet_blocks face a rectangular channel, but layout = '{lay}'; allowed: "
                "layout duct or stack, or a field or coil",
                "magnet_blocks",
                lay=self.layout,
            )
        if self.coil is not None:
            want = COIL_FOR_LAYOUT[self.layout]
            if self.coil.kind != want:
                raise _bad(
                    "a {kind} coil does not give layout '{lay}' its field; allowed: kind = "
                    "'{want}'",
                    "coil.kind",
                    kind=self.coil.kind,
                    lay=self.layout,
                    want=want,
                )
            if self.coil.kind == "toroid" and self.field_profile != "toroidal":
                raise _bad(
                    "a toroid coil gives a field that falls as 1/r; allowed: field_profile = "
                    "'toroidal' (or leave it out)",
                    "field_profile",
                )
            magnet = "superconducting" if self.coil.conductor == "nbti" else "electromagnet"
            if self.magnet != magnet:
                raise _bad(
                    "a coil of {cond} needs magnet = '{m}', but magnet = '{have}'; allowed: "
                    "magnet = '{m}'",
                    "magnet",
                    cond=self.coil.conductor,
                    m=magnet,
                    have=self.magnet,
                )
        if self.magnet_blocks is not None and self.magnet != "permanent":
            raise PydanticCustomError(
                "bb_value",
                "magnet_blocks are permanent magnets, but magnet = '{m}'; allowed: magnet = "
                "'permanent' or a given field",
                {"m": self.magnet},
            )
        return self

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
    """[battery]: the pack of identical cells (equivalent-circuit cell model)."""

    cell: known_name("cell parameter set", _cell_sets)
    """Cell parameter set: open-circuit voltage, resistances, RC pairs, voltage and current limits,
    thermal mass."""
    series: number(ge=1, le=2000, integer=True)
    """Cells in series; pack voltage = series × cell voltage."""
    parallel: number(ge=1, le=2000, integer=True)
    """Cells in parallel at each series position; pack capacity and current rating = parallel ×
    those of one cell."""
    extra_resistance: quantity("resistance", ge=0) = 0.0
    """Resistance of busbars, fuses and contactors in series with the whole pack (not per cell);
    temperature-independent."""
    conductance_to_water: quantity("thermal_conductance", gt=0) = 5.0
    """Overall heat-transfer conductance UA from the cells to the surrounding water; the lumped pack
    temperature T follows (heat − UA·(T − T_water)) / thermal mass."""
    capacity_retained: number(ge=0.3, le=1.0) = 1.0
    """State of health: capacity of the aged cells over that of new ones (0.8 = 80 %).

    Default: 1, new cells. End of life is commonly taken at 0.7–0.8 (common practice)."""
    resistance_growth: number(ge=1.0, le=5.0) = 1.0
    """Internal resistance of the aged cells over that of new ones (R0 and the RC resistances;
    the RC time constants are kept).

    Default: 1, new cells. End of life is commonly taken at 2 (common practice)."""


class DriveSpec(_Strict):
    """[drive]: the power electronics between the pack and the thrusters, one converter per thruster
    unit."""

    efficiency: number(gt=0.3, le=1) = 0.95
    """Converter efficiency: while driving, the pack supplies thruster power / efficiency; power fed
    back by the thrusters reaches the pack times efficiency. Hotel loads bypass it."""
    max_current: quantity("current", gt=0)
    """Per thruster unit (each unit has its own converter), not the total: a unit whose current
    would exceed it is held at it."""
    max_voltage: quantity("voltage", gt=0)
    """Largest electrode voltage (either sign) the converters apply, the same for every unit.
    Voltage legs must stay within it; power, current and speed commands are capped at it."""
    undervoltage_margin: quantity("voltage", ge=0, le=1) = 0.05
    """Per cell: the drive folds back its power to keep every cell this far above the cell set's
    minimum voltage."""
    overvoltage_margin: quantity("voltage", ge=0, le=1) = 0.05
    """Per cell: when the thrusters regenerate (braking) and the pack would charge, the drive
    folds back the power it feeds back to keep every cell this far below the cell set's maximum
    voltage, and the charge current within the cell set's rating.

    Default: the same margin as undervoltage_margin (common practice)."""


class HotelSpec(_Strict):
    """[hotel]: electrical loads other than propulsion, drawn straight from the pack."""

    power: quantity("power", ge=0) = 0.0
    """Base hotel load (navigation, sensors, computers) from the start. A leg's own hotel replaces
    it during that leg; scheduled changes and hotel triggers replace it from then on."""
    cryocooler: quantity("power", ge=0) = 0.0
    """Constant load always drawn on top of the hotel load (e.g. the cryocooler of superconducting
    magnets); leg, schedule and trigger hotel values do not change it."""


class VesselFile(_Strict):
    """A vessel file: the craft, its hull, thrusters, battery, drive and loads."""

    vessel: VesselInfo
    """Name and mass of the vessel."""
    hull: Hull
    """Hull resistance model; its key `model` selects one of the hull models."""
    thruster: list[ThrusterSpec] = Field(min_length=1)
    """One [[thruster]] table per thruster design (at least one)."""
    battery: BatterySpec
    """The battery pack."""
    drive: DriveSpec
    """The power electronics."""
    hotel: HotelSpec = HotelSpec()
    """Loads other than propulsion (optional: none)."""


# --------------------------------------------------------------------------- scenario file


class ScenarioInfo(_Strict):
    """[scenario]: what the scenario is and which vessel flies it."""

    name: str = Field(min_length=1)
    """Name of the scenario, shown in the run title and stored in the log."""
    description: str = ""
    """Free text for people; the simulation does not use it."""
    vessel: str = Field(min_length=1)
    """Path of the vessel file, relative to the scenario file (`brinebolt versus` can fly other
    vessels instead)."""


class WaterSpec(_Strict):
    """[water]: the body of water (properties from PSS-78 and TEOS-10 at the vessel's depth)."""

    salinity: number(ge=0, le=42) = 35.0
    """Practical salinity SP (PSS-78); with temperature and depth it sets the conductivity, density,
    viscosity and heat capacity of the water. A conductivity below 0.5 S/m draws a warning."""
    temperature: quantity("temperature", ge=-2, le=40)
    """In-situ water temperature; also the temperature the battery and the magnets exchange heat
    with, and their start temperature unless [start] gives one."""
    depth: quantity("length", ge=0, le=11000) = 0.0
    """Depth of the vessel; sets the pressure for the water properties (about 1.006 dbar per metre).
    It does not change the hull resistance."""
    current: quantity("speed", ge=-10, le=10) = 0.0
    """Steady water current along the track, positive when it flows with the vessel: speed over
    ground = speed through water + current. Distances (leg distance, total_distance_above) are over
    ground; speeds (speed legs, speed conditions) are through the water."""


class RouteTable(_Strict):
    """[route]: the water along the route, as a table of stations (optional). Between stations
    the values are interpolated linearly; before the first and after the last they are held.
    The route's salinity and temperature replace those of [water] (which then only give the
    depth and a steady current); its current adds to [water]'s current and the [tide]."""

    distance: list[quantity("length", ge=0, le=1e7)] | None = None
    """Stations by distance over ground from the start, strictly increasing, e.g.
    ["0 km", "2 km", "6 km"].

    Default: none (give distance or time)."""
    time: list[quantity("time", ge=0, le=1e8)] | None = None
    """Stations by mission time, strictly increasing, e.g. ["0 h", "3 h"].

    Default: none (give distance or time)."""
    salinity: list[number(ge=0, le=42)] = Field(min_length=1)
    """Practical salinity SP (PSS-78) at each station; with the temperature it sets the
    conductivity, density and viscosity the thrusters and the hull meet there."""
    temperature: list[quantity("temperature", ge=-2, le=40)] = Field(min_length=1)
    """In-situ water temperature at each station; also what the battery and the magnets exchange
    heat with there."""
    current: list[quantity("speed", ge=-10, le=10)] | None = None
    """Current along the track at each station, positive with the vessel (speed over ground =
    speed through water + current).

    Default: no current from the route."""

    @model_validator(mode="after")
    def _stations(self):
        if (self.distance is None) == (self.time is None):
            raise _bad(
                "give the stations either by distance or by time; allowed: distance = [...] "
                "or time = [...], not both",
                "distance",
            )
        axis = "distance" if self.distance is not None else "time"
        at = self.distance if self.distance is not None else self.time
        if not at:
            raise _bad("{axis} has no stations; allowed: one or more", axis, axis=axis)
        bad = [i for i in range(1, len(at)) if not at[i] > at[i - 1]]
        if bad:
            raise _bad(
                "{axis} must increase strictly, but entry {i} is not above the one before it; "
                "allowed: an ascending list",
                axis,
                axis=axis,
                i=bad[0],
            )
        for k in ("salinity", "temperature", "current"):
            v = getattr(self, k)
            if v is not None and len(v) != len(at):
                raise _bad(
                    "{k} has {a} entries but {axis} has {b}; allowed: one entry per station",
                    k,
                    k=k,
                    a=len(v),
                    axis=axis,
                    b=len(at),
                )
        return self


class TideTable(_Strict):
    """[tide]: a tidal current along the track that turns with time (optional):
    u = mean + amplitude·cos(2π(t − peak_time)/period), positive with the vessel."""

    amplitude: quantity("speed", ge=0, le=10)
    """Amplitude of the tidal current."""
    period: quantity("time", gt=0, le=1e7) = 44714.16439359889
    """Period of the tide.

    Default: 12.42 h, the principal lunar semidiurnal tide M2 (Doodson 1921)."""
    peak_time: quantity("time", ge=-1e7, le=1e7) = 0.0
    """Mission time at which the tidal current runs strongest with the vessel (+amplitude); it
    turns against the vessel a quarter period later. Negative: before the start.

    Default: 0 s (the run starts at that peak)."""
    mean: quantity("speed", ge=-10, le=10) = 0.0
    """Residual (mean) current added to the tide.

    Default: 0 m/s."""


class StartSpec(_Strict):
    """[start]: the state at time zero."""

    state_of_charge: Fraction = 1.0
    """Battery state of charge at the start (0 to 1); must be above limits.state_of_charge_min."""
    speed: quantity("speed", ge=-5, le=40) = 0.0
    """Speed through water at the start (negative: going astern)."""
    battery_temperature: quantity("temperature", ge=-30, le=80, optional=True) = None
    """Lumped battery temperature at the start.

    Default: the water temperature."""
    magnet_temperature: quantity("temperature", ge=-30, le=200, optional=True) = None
    """Magnet temperature of every thruster design at the start.

    Default: the water temperature."""


class OutputSpec(_Strict):
    """[output]: what the log keeps."""

    sample: quantity("time", gt=0) = 10.0
    """Interval of the logged samples, on a fixed grid from time zero; the instants of leg ends and
    events are logged as well. `brinebolt run --sample` overrides it."""


class SolverSpec(_Strict):
    """[solver]: settings of the ODE integrator (brinebolt's TR-BDF2 or a solve_ivp method)."""

    rtol: number(ge=1e-12, le=1e-2, optional=True) = None
    """Relative tolerance of the integrator; the absolute tolerances are fixed per state variable,
    except the RC pairs' voltages, held to rtol × the pack's open-circuit voltage at half charge,
    and the speed hold's integral term, held to rtol × the drive's maximum voltage.

    Default: 1e-5 with TR-BDF2 (verified within 0.05 % of a Radau solution at 1e-10), 1e-7 with
    the solve_ivp methods."""
    max_step: quantity("time", gt=0) = 600.0
    """Largest step the integrator may take."""
    method: Literal["RK45", "DOP853", "LSODA", "Radau", "BDF", "TR-BDF2"] = "TR-BDF2"
    """Integration method: brinebolt's own TR-BDF2 (a stiff, L-stable second-order method driven
    step by step, not restarted at progress or flush points; `sim.engine.integrator`), or a
    scipy.integrate.solve_ivp method: explicit Runge–Kutta (RK45, DOP853), LSODA (switches to a
    stiff method), Radau or BDF (these serve to verify TR-BDF2 at a tight rtol).

    Default: TR-BDF2 (the speed hold and the cells' RC pair make the model stiff; explicit
    methods are held to steps of about 20 s by stability, not accuracy)."""
    allow_large: Annotated[bool, Strict()] = False
    """Run the scenario even when it asks for more work than brinebolt's limits (logged samples,
    integrator steps, legs, triggers, schedule entries; see `sim.io.budget`), which are there to
    refuse a file that would run out of memory or run for days. The limits can also be raised
    for every file with environment variables (BRINEBOLT_MAX_SAMPLES, BRINEBOLT_MAX_STEPS,
    BRINEBOLT_MAX_LEGS, BRINEBOLT_MAX_TRIGGERS, BRINEBOLT_MAX_SCHEDULE).

    Default: a file over a limit is refused before anything runs."""


class LimitsSpec(_Strict):
    """[limits]: stop conditions watched during the whole run; the run ends early (a 'limit' ending,
    exit code 3) when one is reached. Whatever this table says, the run also stops when a cell falls
    to the minimum voltage of its cell set or the pack cannot deliver the demanded power."""

    time: quantity("time", gt=0) = 86400.0
    """Longest mission time; the run stops with 'time limit' when it is reached."""
    state_of_charge_min: Fraction = 0.0
    """The run stops ('pack empty') when the state of charge falls to this value."""
    battery_temperature_max: quantity("temperature", ge=0, le=120) = 60.0
    """The run stops ('battery temperature limit') when the lumped battery temperature rises to this
    value."""
    magnet_temperature_max: quantity("temperature", ge=0, le=250, optional=True) = None
    """The run stops ('magnet temperature limit') when the magnet of any thruster design rises to
    this temperature.

    Default: the maximum working temperature of each thruster's magnet_grade (permanent magnets with
    a grade); no magnet limit otherwise."""
    duct_temperature_rise_max: quantity("temperature_difference", gt=0, optional=True) = None
    """The run stops ('duct temperature-rise limit') when the largest duct outlet-minus-inlet water
    temperature rise of the thruster designs reaches this value.

    Default: no limit."""


class Conditions(_Strict):
    """Conditions on the state; a set of them holds when ANY holds. As a leg's `until` the leg ends,
    as a trigger's `when` the trigger fires. A condition that already holds when it is first watched
    acts at once."""

    duration: quantity("time", gt=0, optional=True) = None
    """Time since the current leg started. In a trigger's `when`, too, it counts from the start of
    whichever leg is being flown (like distance), so the trigger fires in the first leg that lasts
    this long; use time_after for a time since the start of the run.

    Default: not watched."""
    distance: quantity("distance", gt=0, optional=True) = None
    """Distance over ground since the current leg started.

    Default: not watched."""
    speed_above: quantity("speed", optional=True) = None
    """Speed through water at or above this.

    Default: not watched."""
    speed_below: quantity("speed", optional=True) = None
    """Speed through water at or below this.

    Default: not watched."""
    soc_below: number(ge=0, le=1, optional=True) = None
    """Battery state of charge (0 to 1) at or below this.

    Default: not watched."""
    cell_voltage_below: quantity("voltage", gt=0, optional=True) = None
    """Terminal voltage of a cell, under load, at or below this.

    Default: not watched."""
    duct_temperature_rise_above: quantity("temperature_difference", gt=0, optional=True) = None
    """Largest duct outlet-minus-inlet water temperature rise of the thruster designs at or above
    this.

    Default: not watched."""
    battery_temperature_above: quantity("temperature", optional=True) = None
    """Lumped battery temperature at or above this.

    Default: not watched."""
    magnet_temperature_above: quantity("temperature", optional=True) = None
    """Magnet temperature of any thruster design at or above this.

    Default: not watched."""
    time_after: quantity("time", ge=0, optional=True) = None
    """Mission time (from the start of the run) at or after this.

    Default: not watched."""
    total_distance_above: quantity("distance", gt=0, optional=True) = None
    """Distance over ground since the start of the run at or above this.

    Default: not watched."""
    return_to_start: bool | None = None
    """true: the vessel is back at its start point. The model is one-dimensional along the track:
    the position is the signed distance over ground since the start of the run (astern legs and a
    head current bring it back down), and the condition holds when that position falls to zero or
    below, i.e. when the vessel is back at (or behind) where the run began. It acts at once in a
    leg that starts there, so give it to a leg flown after one that went out. false: not watched.

    Default: not watched."""

    anode_spent: bool | None = None
    """true: a sacrificial anode of the vessel is spent, i.e. the usable share (thruster
    anode_utilisation) of its anode_mass has dissolved. The charge comes from the hydrogen the
    cathodes made (Q = 2F·n_H₂, the same charge passed the anodes) and the mass from the anode's
    design capacity (Faraday's law, DNV-RP-B401); charge passed going astern is counted too (an
    upper bound). With several thruster designs the whole charge is charged to each design's
    units (an upper bound: the run ends no later than the first anode is spent). The vessel
    needs a thruster with anode_mass. false: not watched.

    Default: not watched."""

    _shown: dict[str, str] = PrivateAttr(default_factory=dict)

    @model_validator(mode="wrap")
    @classmethod
    def _keep_text(cls, data: Any, handler):
        """Keep each threshold as the file wrote it ("0.5 kn"), for messages."""
        model = handler(data)
        if isinstance(data, dict):
            model._shown = {
                k: (v.strip() if isinstance(v, str) else f"{v:g}")
                for k, v in data.items()
                if isinstance(v, str | int | float) and not isinstance(v, bool)
            }
        return model

    def given(self) -> dict[str, float]:
        """The conditions set: key -> SI value (true for return_to_start)."""
        return {k: v for k, v in self.model_dump().items() if v is not None and v is not False}

    def shown(self, key: str) -> str:
        """A threshold as the file wrote it (e.g. "0.5 kn"); "" when not known."""
        return self._shown.get(key, "")


class LegSpec(_Strict):
    """[[leg]]: one step of the mission, flown in file order (a goto trigger can jump). Exactly one
    of voltage, current, power and speed is the leg's command; `until` says when it ends. After the
    last leg the mission is complete."""

    name: str = Field(min_length=1)
    """Name of the leg, unique in the file; goto triggers name it, and events, tables and the log
    show it."""
    voltage: quantity("voltage", ge=-1e4, le=1e4, optional=True) = None
    """Command: hold this electrode voltage on every thruster unit; each unit's converter applies
    it, so it is per unit, not a sum. Negative reverses the thrust. A unit that would draw more than
    drive.max_current is held at that current. Must stay within ±drive.max_voltage.

    Default: not set (exactly one of voltage, current, power, speed per leg)."""
    current: quantity("current", ge=-1e5, le=1e5, optional=True) = None
    """Command: hold this total thruster current, the sum over all units of all designs; each unit
    carries current ÷ (number of units), within drive.max_current and drive.max_voltage. Negative
    reverses the thrust.

    Default: not set (exactly one of voltage, current, power, speed per leg)."""
    power: quantity("power", ge=0, le=1e9, optional=True) = None
    """Command: hold this total electrical power into all thruster units together (V·I at the
    electrodes summed over every unit of every design), not per unit. The drive sets one electrode
    voltage for all units to reach it, at most drive.max_voltage. The pack supplies it ÷
    drive.efficiency plus the hotel loads, so compare it with the 'thruster power kW' column of
    `brinebolt steady`, not with 'pack power kW'.

    Default: not set (exactly one of voltage, current, power, speed per leg)."""
    speed: quantity("speed", ge=0, le=40, optional=True) = None
    """Command: hold this speed through water (not over ground) with a PI loop on the electrode
    voltage of all units, with feed-forward from the steady solution at the target speed (see
    speed_gain and speed_reset_time). A derate trigger lowers the target speed.

    Default: not set (exactly one of voltage, current, power, speed per leg)."""
    until: Conditions
    """End conditions (an inline table, e.g. until = { distance = "600 m" }); the leg ends when any
    holds. At least one is required."""
    hotel: quantity("power", ge=0, optional=True) = None
    """Hotel load during this leg, replacing the base load (hotel.power, or the last scheduled or
    trigger value) until the leg ends; hotel.cryocooler is added on top.

    Default: the base hotel load."""
    speed_gain: quantity("gain_per_speed", gt=0, optional=True) = None
    """Speed legs only (ignored by other legs): proportional gain of the speed hold, volts of
    electrode command (the same on every unit) per m/s of speed error. When given without
    speed_reset_time, the reset time is 2τ (τ as below).

    Default: from the plant, by pole placement on the linearised surge equation at the target speed:
    critically damped, closed-loop time constant τ half the open-loop one (mass / damping), kept
    between 2 s and 600 s."""
    speed_reset_time: quantity("time", gt=0, optional=True) = None
    """Speed legs only (ignored by other legs): integral (reset) time of the speed hold; the
    integral gain is speed_gain ÷ speed_reset_time [V per m]. Given alone, it divides the plant's
    proportional gain.

    Default: from the plant (pole placement, see speed_gain); 2τ when speed_gain is given."""

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
    """[[trigger]]: a rule watched during every leg: when any condition of `when` holds, the action
    `then` happens. Each trigger acts at most once per run."""

    name: str = Field(min_length=1)
    """Name of the trigger, unique in the file; events show it."""
    when: Conditions
    """Conditions (an inline table, e.g. when = { soc_below = 0.45 }); the trigger fires when any
    holds. At least one is required."""
    then: Literal["goto", "derate", "stop", "hotel"]
    """Action. 'goto': end the current leg and continue with the leg named by `leg`. 'derate':
    multiply the command of the current and every later leg by `factor` (speed legs: the target
    speed; repeated derates multiply). 'stop': end the run (a 'limit' ending). 'hotel': set the base
    hotel load to `hotel` (a leg with its own hotel keeps that until the leg ends)."""
    leg: str | None = None
    """With then = 'goto': the name of the leg to continue with; it must exist.

    Default: not set (required by then = 'goto')."""
    factor: number(gt=0, le=1, optional=True) = None
    """With then = 'derate': the factor on the command.

    Default: not set (required by then = 'derate')."""
    hotel: quantity("power", ge=0, optional=True) = None
    """With then = 'hotel': the new base hotel load.

    Default: not set (required by then = 'hotel')."""

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
    """[[schedule]]: a change of the base hotel load at a given mission time."""

    at: quantity("time", ge=0)
    """Mission time of the change; entries at or after limits.time never act."""
    hotel: quantity("power", ge=0)
    """The new base hotel load (a leg with its own hotel keeps that until the leg ends);
    hotel.cryocooler is added on top."""


class ScenarioFile(_Strict):
    """A scenario file: the water, the start, the limits and the mission."""

    scenario: ScenarioInfo
    """Name of the scenario and the vessel that flies it."""
    water: WaterSpec
    """The body of water."""
    route: RouteTable | None = None
    """Salinity, temperature and current along the route.

    Default: none ([water] everywhere)."""
    tide: TideTable | None = None
    """A tidal current that turns with time.

    Default: none (no tide)."""
    start: StartSpec = StartSpec()
    """The state at time zero (optional: all defaults)."""
    output: OutputSpec = OutputSpec()
    """What the log keeps (optional)."""
    solver: SolverSpec = SolverSpec()
    """Integrator settings (optional)."""
    limits: LimitsSpec = LimitsSpec()
    """Stop conditions for the whole run (optional: all defaults)."""
    leg: list[LegSpec] = Field(min_length=1)
    """The mission: one [[leg]] per step, flown in order (at least one)."""
    trigger: list[TriggerSpec] = []
    """Rules that change the mission when a condition holds (optional)."""
    schedule: list[ScheduleSpec] = []
    """Hotel-load changes at given mission times (optional)."""
