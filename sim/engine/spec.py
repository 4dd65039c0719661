"""The engine's own inputs: plain, frozen dataclasses of SI floats (temperatures in °C).

The engine (plant, model, mission, steady) is built from these and nothing else; it never sees
the file schema and never imports the io layer. The io layer's seam (``seam.py``) is the one
place that turns validated vessel and scenario files into them. Code that has no file (a
notebook, a sweep, the ``steady`` command) builds them directly, e.g.
``Water(salinity=35.0, temperature_c=15.0)``.

Names carry their unit where it is ambiguous (``gap_m``, ``field_t``); plain ratios and counts
have none.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # annotations only: conditions need the model, which needs these specs
    from sim.engine.conditions import Condition

__all__ = [
    "DEFAULT_METHOD",
    "BatterySpec",
    "CoilSpec",
    "DisplacementHullSpec",
    "DriveSpec",
    "HullSpec",
    "LegSpec",
    "LimitsSpec",
    "MagnetBlocksSpec",
    "MissionSpec",
    "RouteSpec",
    "ScheduleSpec",
    "SolverSpec",
    "StartSpec",
    "SubmergedHullSpec",
    "TableHullSpec",
    "ThrusterSpec",
    "TideSpec",
    "TriggerSpec",
    "VesselSpec",
    "Water",
    "default_rtol",
]

# --------------------------------------------------------------------------- water


@dataclass(frozen=True)
class RouteSpec:
    """Salinity, temperature and (optionally) a current at stations along the route; linear in
    between, held at the end values beyond (:mod:`sim.physics.route`)."""

    axis: str
    """'distance' (stations in metres over ground from the start) or 'time' (seconds)."""
    stations: tuple[float, ...]
    """Station positions, strictly increasing [m or s]."""
    salinity: tuple[float, ...]
    """Practical salinity SP at the stations [-]."""
    temperature_c: tuple[float, ...]
    """In-situ temperature at the stations [°C]."""
    current_m_s: tuple[float, ...] = ()
    """Current along the track at the stations [m/s] (+ with the vessel); () for none."""


@dataclass(frozen=True)
class TideSpec:
    """A tidal current along the track that turns with time: u = mean + A·cos(2π(t − t_peak)/T)."""

    amplitude_m_s: float
    """Amplitude A [m/s] (≥ 0)."""
    period_s: float = 44714.16439359889
    """Period T [s]; default the M2 tide, 12.4206 h (Doodson 1921;
    :data:`sim.physics.route.M2_PERIOD_S`)."""
    peak_time_s: float = 0.0
    """Mission time at which the current runs at +A (with the vessel) [s]."""
    mean_m_s: float = 0.0
    """Residual current [m/s]."""


@dataclass(frozen=True)
class Water:
    """The body of water the vessel moves in."""

    salinity: float
    """Practical salinity SP [-] (PSS-78), 0 to 42."""
    temperature_c: float
    """In-situ temperature [°C], −2 to 40."""
    depth_m: float = 0.0
    """Depth of the vessel below the surface [m] (sets the sea pressure)."""
    current_m_s: float = 0.0
    """Steady water current along the track [m/s], positive when it flows with the vessel."""
    route: RouteSpec | None = None
    """Water along the route: its salinity and temperature replace ``salinity`` and
    ``temperature_c`` (the values at the route's start are the plant's reference water); its
    current adds to ``current_m_s``."""
    tide: TideSpec | None = None
    """A tidal current (adds to the others)."""


# --------------------------------------------------------------------------- vessel


@dataclass(frozen=True)
class SubmergedHullSpec:
    """A submerged body of revolution (friction plus form drag)."""

    length_m: float
    diameter_m: float
    wetted_area_m2: float | None = None
    """Given wetted area [m²]; None: from the spheroid's shape."""
    roughness_allowance: float = 0.0
    """Roughness allowance ΔC_F [-]."""


@dataclass(frozen=True)
class DisplacementHullSpec:
    """A surface displacement hull (Holtrop–Mennen inputs)."""

    waterline_length_m: float
    beam_m: float
    draft_m: float
    displaced_volume_m3: float
    block_coefficient: float
    prismatic_coefficient: float
    midship_coefficient: float
    waterplane_coefficient: float
    lcb_percent: float = 0.0
    """Longitudinal centre of buoyancy, forward of midships [% of waterline length]."""
    transom_area_m2: float = 0.0
    bulb_area_m2: float = 0.0
    bulb_centre_height_m: float = 0.0
    stern_shape: float = 0.0
    """Stern shape coefficient C_stern [-]."""
    wetted_area_m2: float | None = None
    form_factor: float | None = None
    """Given form factor 1 + k [-]; None: from the hull's shape."""
    roughness_allowance: float | None = None
    """Given correlation allowance [-]; None: from the hull's length."""
    check_ranges: bool = True
    """Refuse proportions outside the regression's hull data (False: extrapolate)."""


@dataclass(frozen=True)
class TableHullSpec:
    """Calm-water resistance from a table of (speed, resistance) points."""

    speeds_m_s: tuple[float, ...]
    resistances_n: tuple[float, ...]
    wetted_area_m2: float | None = None


HullSpec = SubmergedHullSpec | DisplacementHullSpec | TableHullSpec
"""One of the hull models (told apart by type)."""


@dataclass(frozen=True)
class MagnetBlocksSpec:
    """Two facing permanent-magnet blocks per channel, one on each pole wall, centred on it;
    their volume-mean field over the channel replaces a given field."""

    width_m: float
    """Block size across the channel (along the electrode gap) [m]."""
    length_m: float
    """Block size along the flow [m]."""
    thickness_m: float
    """Block size along the magnetisation (the field) [m]."""
    grade: str
    """NdFeB grade, e.g. 'N42SH' (any case); its nominal remanence at 20 °C is used."""
    yoke: bool = False
    """True: the blocks sit on a steel return yoke (magnetic-circuit estimate,
    :func:`sim.physics.fields.facing_pair_field`); False: no iron (exact superposition)."""


@dataclass(frozen=True)
class CoilSpec:
    """An electromagnet whose field over the channel (or annulus) replaces a given field.

    One winding per thruster unit; ``ampere_turns_a`` is N·I of each coil of it (a racetrack
    pair has two coils carrying the same ampere-turns)."""

    kind: str
    """'racetrack-pair' (two flat coils above and below a rectangular channel), 'solenoid'
    (axial field, helical layout) or 'toroid' (azimuthal field, annular and ring-of-tubes
    layouts)."""
    ampere_turns_a: float
    """N·I of each coil [A]."""
    conductor: str = "copper"
    """'copper', 'aluminium' (resistive) or 'nbti' (superconducting at 4.2 K)."""
    straight_length_m: float | None = None
    """Racetrack pair: length of the straight sides, along the flow [m]."""
    end_radius_m: float | None = None
    """Racetrack pair: radius of the semicircular ends [m] (the coil is 2 × this wide)."""
    separation_m: float | None = None
    """Racetrack pair: distance between the two coil planes [m] (> the channel height)."""
    radius_m: float | None = None
    """Solenoid: winding radius [m] (> the annulus outer radius)."""
    length_m: float | None = None
    """Solenoid: winding length [m]."""
    current_a: float | None = None
    """Conductor current [A] (resistive: for I²R; superconducting: load line and leads)."""
    resistance_ohm: float | None = None
    """Resistive: resistance of the whole winding of one unit [Ω]; None: from voltage_v."""
    voltage_v: float | None = None
    """Resistive: voltage across the whole winding of one unit [V]; None: from resistance_ohm."""
    superconductor_area_m2: float | None = None
    """NbTi: superconductor cross-section of the conductor, without copper [m²]."""
    peak_field_t: float | None = None
    """NbTi: peak field on the winding at current_a [T] (sets the load line)."""
    persistent: bool = False
    """NbTi: True when the coil runs in persistent mode (no current-lead heat load)."""


@dataclass(frozen=True)
class ThrusterSpec:
    """One thruster design and how many identical units of it are fitted."""

    name: str
    gap_m: float | None
    """Electrode gap [m] (duct, stack and ring-of-tubes layouts; None otherwise)."""
    pole_height_m: float | None
    """Distance between the magnet poles [m] (duct, stack and ring-of-tubes layouts)."""
    active_length_m: float
    """Length of the electrodes along the flow [m]."""
    field_t: float | None
    """Mean gap field at field_reference_temperature_c [T] (annular and ring-of-tubes layouts:
    the azimuthal field at the mean or ring radius; helical: the axial field); None: from
    magnet_blocks or coil."""
    units: int = 1
    channels: int = 1
    magnet: str = "permanent"
    """'permanent', 'superconducting' or 'electromagnet'."""
    magnet_grade: str | None = None
    """NdFeB grade of a permanent magnet, e.g. 'N42SH' (any case)."""
    field_reference_temperature_c: float = 20.0
    anode: str = "graphite"
    cathode: str = "graphite"
    overpotential_v: float = 0.5
    chlorine_fraction: float = 1.0
    """Share of the anode charge that makes chlorine [-]."""
    wall_roughness_m: float = 1e-5
    inlet_loss: float = 0.5
    """Inlet loss coefficient K [-]."""
    nozzle_loss: float = 0.02
    """Nozzle loss coefficient K [-]."""
    nozzle_area_ratio: float = 1.0
    jet: str = "ducted"
    """'ducted' or 'disk'."""
    housing_wetted_area_m2: float = 0.0
    """Wetted area of one unit's housing [m²] (external drag)."""
    housing_length_m: float | None = None
    """Reference length of the housing [m]; None: the active length."""
    housing_form_factor: float = 1.5
    magnet_heat_capacity_j_k: float = 5000.0
    magnet_conductance_w_k: float = 5.0
    """Thermal conductance from the magnet to the duct water [W/K]."""
    channel_wiring: str = "parallel"
    """'parallel' (unit voltage = channel voltage, currents add) or 'series' (unit voltage =
    channels × channel voltage, unit current = channel current)."""
    wake_fraction: float = 0.0
    """Taylor wake fraction w [-]: the intakes see the inflow speed V·(1 − w)."""
    thrust_deduction: float = 0.0
    """Thrust deduction fraction t [-]: the hull feels the thrust T·(1 − t)."""
    gas_model: str = "none"
    """Conductivity lowered by electrolysis gas: 'none', 'bruggeman' or 'maxwell'."""
    gas_slip_ratio: float = 1.0
    """Gas/water velocity ratio of the bubbles [-]."""
    end_effects: bool = False
    """Add the fringing current beyond the ends of the active length."""
    magnet_blocks: MagnetBlocksSpec | None = None
    """Magnet blocks whose mean field over the channel sets the field (field_t None)."""
    coil: CoilSpec | None = None
    """Electromagnet whose mean field sets the field (field_t None)."""
    layout: str = "duct"
    """'duct' (straight rectangular channels), 'stack' (stack_count short channels sharing one
    magnet array), 'annular', 'ring-of-tubes' or 'helical' (:mod:`sim.physics.layouts`), or
    'open-field' (electrode and magnet strips on the hull, :mod:`sim.physics.open_field`)."""
    stack_count: int = 1
    """Stack: number of channels side by side (the stack's n_channels)."""
    inner_radius_m: float | None = None
    """Annular and helical: radius of the inner ring electrode [m]."""
    outer_radius_m: float | None = None
    """Annular and helical: radius of the outer ring electrode [m]."""
    ring_radius_m: float | None = None
    """Ring of tubes: radius of the tube centres [m]."""
    tube_count: int = 1
    """Ring of tubes: number of tubes round the ring."""
    field_profile: str = "toroidal"
    """Annular and ring-of-tubes: 'toroidal' (B ∝ 1/r) or 'uniform' azimuthal field."""
    pitch_angle_deg: float = 45.0
    """Helical: angle between the passages and the azimuthal direction [°], 0 < φ ≤ 90."""
    vanes: int = 8
    """Helical: number of helical vanes (passages)."""
    stator_recovery: float = 0.6
    """Helical: share of the swirl kinetic energy the stator returns to the jet [-]."""
    anode_mass_kg: float | None = None
    """Sacrificial anodes: metal mass of all anodes of one unit when new [kg]; None: not
    tracked."""
    anode_utilisation: float = 0.85
    """Sacrificial anodes: usable share of anode_mass_kg before the anode counts as spent [-]."""
    strip_pitch_m: float | None = None
    """Open field: centre distance of neighbouring electrode strips, = that of the magnet
    strips [m] (:class:`sim.physics.open_field.OpenFieldArray`). For this layout field_t is the
    magnets' remanence (None: the magnet grade's)."""
    electrode_width_m: float | None = None
    """Open field: width of each electrode strip [m]."""
    strips: int = 2
    """Open field: number of electrode strips (half anodes, half cathodes)."""
    magnet_width_m: float | None = None
    """Open field: width of each magnet strip [m]."""
    magnet_thickness_m: float | None = None
    """Open field: thickness of the magnet strips along their magnetisation [m]."""
    magnet_depth_m: float = 0.0
    """Open field: magnets' top faces below the wetted surface (hull plating) [m]."""
    magnet_offset_m: float | None = None
    """Open field: magnet strip centres from the electrode centres, across the flow [m]; None:
    half the pitch."""
    array_position_m: float | None = None
    """Open field: bow to the middle of the array, along the hull [m] (boundary layer)."""
    friction_share: float = 0.5
    """Open field: share κ of the Lorentz force inside the boundary layer that goes to the hull
    as extra friction [-] (a model assumption)."""


@dataclass(frozen=True)
class BatterySpec:
    """The battery pack."""

    cell: str
    """Name of a cell parameter set in :data:`sim.physics.battery.CELL_SETS`."""
    series: int
    parallel: int
    extra_resistance_ohm: float = 0.0
    """Busbar and contact resistance in series with the pack [Ω]."""
    conductance_to_water_w_k: float = 5.0
    """Thermal conductance from the pack to the water [W/K]."""
    capacity_retained: float = 1.0
    """Aged capacity over new capacity [-] (1: new cells)."""
    resistance_growth: float = 1.0
    """Aged resistance over new resistance [-] (1: new cells)."""


@dataclass(frozen=True)
class DriveSpec:
    """The power electronics between the pack and the thrusters."""

    max_current_a: float
    """Per thruster unit (each unit has its own converter) [A]."""
    max_voltage_v: float
    efficiency: float = 0.95
    undervoltage_margin_v: float = 0.05
    """Per cell: the drive folds back to keep cells this far above their minimum voltage [V]."""
    overvoltage_margin_v: float = 0.05
    """Per cell: the drive folds back regenerated power to keep cells this far below their
    maximum voltage [V]."""


@dataclass(frozen=True)
class VesselSpec:
    """A whole vessel."""

    name: str
    mass_kg: float
    hull: HullSpec
    thrusters: tuple[ThrusterSpec, ...]
    battery: BatterySpec
    drive: DriveSpec
    added_mass_rule: str = "auto"
    """'auto' (Lamb's prolate spheroid for a submerged body, 5 % of the mass otherwise),
    'mass' (added_mass_value in kg) or 'fraction' (added_mass_value × mass_kg)."""
    added_mass_value: float = 0.0
    hotel_w: float = 0.0
    cryocooler_w: float = 0.0


# --------------------------------------------------------------------------- mission


@dataclass(frozen=True)
class LegSpec:
    """One leg: a command held until the first of its end conditions holds."""

    name: str
    mode: str
    """'voltage', 'current', 'power' or 'speed'."""
    setpoint: float
    """The command in SI units of its mode: V, A (all units together), W, m/s."""
    until: tuple[Condition, ...] = ()
    """End conditions (any one ends the leg), in the order the file gives them."""
    duration_s: float | None = None
    """Leg duration [s] (ends the leg at a known time, so it is not a located event)."""
    hotel_w: float | None = None
    """Hotel load during this leg [W]; None: the mission's current hotel load."""
    speed_gain_v_per_m_s: float | None = None
    """Proportional gain of the speed hold [V/(m/s)]; None: tuned from the plant."""
    speed_reset_time_s: float | None = None
    """Integral time of the speed hold [s]; None: tuned from the plant."""


@dataclass(frozen=True)
class TriggerSpec:
    """An action taken once, the first time any of its conditions holds."""

    name: str
    when: tuple[Condition, ...]
    then: str
    """'goto' (leg), 'derate' (factor), 'stop' or 'hotel' (hotel_w)."""
    leg: str | None = None
    factor: float | None = None
    hotel_w: float | None = None


@dataclass(frozen=True)
class ScheduleSpec:
    """A hotel-load change at a known mission time."""

    at_s: float
    hotel_w: float


@dataclass(frozen=True)
class StartSpec:
    """The state at the start of the run."""

    state_of_charge: float = 1.0
    speed_m_s: float = 0.0
    battery_temperature_c: float | None = None
    """None: the water temperature."""
    magnet_temperature_c: float | None = None
    """None: the water temperature."""


@dataclass(frozen=True)
class LimitsSpec:
    """Stop conditions of the whole run."""

    time_s: float = 86400.0
    state_of_charge_min: float = 0.0
    battery_temperature_max_c: float = 60.0
    magnet_temperature_max_c: float | None = None
    """None: each permanent magnet's grade maximum, where its grade is known."""
    duct_temperature_rise_max_k: float | None = None


DEFAULT_METHOD = "TR-BDF2"
"""The integration method of a scenario that names none (:mod:`sim.engine.integrator`)."""


def default_rtol(method: str) -> float:
    """Relative tolerance of a method when the scenario gives none [-]: 1e-5 for TR-BDF2
    (tests/test_solution_verification.py: within 0.05 % of Radau at 1e-10), 1e-7 for the
    solve_ivp methods."""
    return 1e-5 if method == DEFAULT_METHOD else 1e-7


@dataclass(frozen=True)
class SolverSpec:
    """Settings of the integrator: brinebolt's TR-BDF2 or a :func:`scipy.integrate.solve_ivp`
    method."""

    rtol: float = 1e-5
    max_step_s: float = 600.0
    method: str = DEFAULT_METHOD


@dataclass(frozen=True)
class MissionSpec:
    """Everything a run needs besides the plant."""

    name: str
    legs: tuple[LegSpec, ...]
    triggers: tuple[TriggerSpec, ...] = ()
    schedule: tuple[ScheduleSpec, ...] = ()
    start: StartSpec = StartSpec()
    limits: LimitsSpec = LimitsSpec()
    sample_s: float = 10.0
    """Interval of the logged samples [s]."""
    solver: SolverSpec = SolverSpec()
