"""The plant: every physical part of one vessel in one body of water, ready for the integrator.

:func:`build_plant` turns the engine's specs (:mod:`sim.engine.spec`, plain SI floats) into
physics objects once, so the ODE right-hand side only does arithmetic.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sim.engine.spec import (
    CoilSpec,
    DisplacementHullSpec,
    HullSpec,
    SubmergedHullSpec,
    TableHullSpec,
    ThrusterSpec,
    VesselSpec,
    Water,
)
from sim.physics import battery as bat
from sim.physics import electrochem, electrodes, fields, hull, layouts, magnet_gap, magnets
from sim.physics.errors import ModelRangeError
from sim.physics.open_field import OpenFieldArray, surface_field_t
from sim.physics.route import RouteWater, TidalCurrent
from sim.physics.seawater import WaterState, water_state
from sim.physics.thruster import DuctThruster

DBAR_PER_M = 1.0 / 0.9945
"""Sea pressure per metre of depth [dbar/m], near-surface hydrostatic approximation
(ρ g ≈ 1.0055e4 Pa/m; common practice)."""


@dataclass(frozen=True)
class ThrusterUnit:
    """One thruster design on the vessel and how many identical units of it are fitted."""

    name: str
    duct: DuctThruster
    units: int
    magnet_kind: str
    """'permanent', 'superconducting' or 'electromagnet'."""
    b_ref_tesla: float
    """Mean gap field at the reference temperature [T]."""
    alpha_br_per_k: float
    """Reversible temperature coefficient of the field [1/K] (0 unless permanent)."""
    t_ref_c: float
    """Reference temperature of b_ref_tesla [°C]."""
    magnet_max_c: float
    """Maximum working temperature of the magnet [°C] (inf when not limited)."""
    magnet_heat_capacity_j_k: float
    magnet_conductance_w_k: float
    channel_wiring: str = "parallel"
    """'parallel' or 'series': how the channels of one unit are connected."""
    wake_fraction: float = 0.0
    """Taylor wake fraction w [-]: the intakes see V·(1 − w)."""
    thrust_deduction: float = 0.0
    """Thrust deduction fraction t [-]: the hull feels T·(1 − t)."""
    overpotential_v: float = 0.0
    """Overpotential part of the electrode drop [V] (heat at the electrode surfaces)."""
    layout: str = "duct"
    """Layout the equivalent duct stands for ('duct', 'stack', 'annular', 'ring-of-tubes',
    'helical'); ``duct`` is always the solver's (equivalent) straight duct."""
    coil_power_w: float = 0.0
    """Constant electrical load of one unit's magnet [W]: a resistive coil's I²R or a
    superconducting coil's cryocooler input (0 for permanent magnets and given fields)."""
    sacrificial_anode: str | None = None
    """Key of :data:`sim.physics.electrodes.SACRIFICIAL_ANODES`; None: gas-evolving anode."""
    anode_mass_kg: float | None = None
    """Sacrificial anode metal of one unit when new [kg]; None: not tracked."""
    anode_utilisation: float = 0.85
    """Usable share of anode_mass_kg before the anode counts as spent [-]."""
    open_field: OpenFieldArray | None = None
    """Layout 'open-field': the electrode and magnet arrays on the hull (the model solves them
    with :mod:`sim.physics.open_field`); :attr:`duct` then only carries the electrode terms
    (drop, galvanic offset, chlorine fraction), and :attr:`b_ref_tesla` is the fundamental of
    the field at the wetted surface (:func:`sim.physics.open_field.surface_field_t`)."""

    @property
    def series_factor(self) -> int:
        """Unit voltage / channel voltage = channel current / unit current [-]: the number of
        channels in series, 1 in parallel."""
        return self.duct.n_channels if self.channel_wiring == "series" else 1


@dataclass(frozen=True)
class Plant:
    """A vessel in a body of water, all SI (temperatures in °C)."""

    name: str
    water: WaterState
    water_current_m_s: float
    resistance: object
    """Hull model with ``resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)`` (thruster housings
    included)."""
    mass_kg: float
    added_mass_kg: float
    thrusters: tuple[ThrusterUnit, ...]
    pack: object
    battery_ua_w_k: float
    drive_efficiency: float
    drive_max_current_a: float
    """Per thruster unit [A]."""
    drive_max_voltage_v: float
    undervoltage_margin_v: float
    """The drive folds back its power to keep every cell this far above its minimum voltage
    [V]."""
    hotel_w: float
    cryocooler_w: float
    """Constant load always drawn on top of the hotel load [W]: the vessel's hotel.cryocooler
    plus :attr:`coil_power_w` (so the model needs no separate term for coils)."""
    overvoltage_margin_v: float = 0.05
    """The drive folds back regenerated power to keep every cell this far below its maximum
    voltage [V]."""
    hull_max_speed_m_s: float = math.inf
    """Speed at the upper Froude number of the hull model's data [m/s] (inf: no such bound)."""
    hull_max_froude: float = math.inf
    """That Froude number [-]."""
    coil_power_w: float = 0.0
    """Part of :attr:`cryocooler_w` drawn by thruster coils [W]: Σ units × (resistive I²R or
    superconducting cryocooler input) of every design."""
    route: RouteWater | None = None
    """Water along the route (None: :attr:`water` everywhere); :attr:`water` is then the water
    at the route's start."""
    tide: TidalCurrent | None = None
    """Tidal current along the track (None: none)."""

    @property
    def water_varies(self) -> bool:
        """True when the water or its current changes along the route or with time."""
        return self.route is not None or self.tide is not None

    @property
    def total_mass_kg(self) -> float:
        """Rigid-body plus surge added mass [kg]."""
        return self.mass_kg + self.added_mass_kg

    @property
    def n_units(self) -> int:
        return sum(t.units for t in self.thrusters)


def water_properties(water: Water) -> WaterState:
    """Water properties at the vessel's depth (TEOS-10 via :mod:`sim.physics.seawater`); with a
    route, those at its start."""
    if water.route is not None:
        r = water.route
        return water_state(r.salinity[0], r.temperature_c[0], water.depth_m * DBAR_PER_M)
    return water_state(water.salinity, water.temperature_c, water.depth_m * DBAR_PER_M)


def route_water(water: Water) -> RouteWater | None:
    """The route table of a body of water as :class:`sim.physics.route.RouteWater` (None
    without one)."""
    r = water.route
    if r is None:
        return None
    return RouteWater(
        axis=r.axis,
        stations=tuple(r.stations),
        sp=tuple(r.salinity),
        t_c=tuple(r.temperature_c),
        current_m_s=tuple(r.current_m_s),
        p_dbar=water.depth_m * DBAR_PER_M,
    )


def tidal_current(water: Water) -> TidalCurrent | None:
    """The tide of a body of water as :class:`sim.physics.route.TidalCurrent` (None without
    one): the peak with the vessel at t_peak is the phase φ = 2π·t_peak/T."""
    td = water.tide
    if td is None:
        return None
    return TidalCurrent(
        amplitude_m_s=td.amplitude_m_s,
        phase_rad=2.0 * math.pi * td.peak_time_s / td.period_s,
        mean_m_s=td.mean_m_s,
        period_s=td.period_s,
    )


def hull_model(spec: HullSpec):
    """The calm-water resistance model of a hull (without thruster housings).

    Raises :class:`~sim.physics.errors.ModelRangeError` when the hull lies outside its model's
    validity range."""
    if isinstance(spec, SubmergedHullSpec):
        return hull.SubmergedBody(
            length_m=spec.length_m,
            diameter_m=spec.diameter_m,
            given_wetted_area_m2=spec.wetted_area_m2,
            roughness_allowance=spec.roughness_allowance,
        )
    if isinstance(spec, DisplacementHullSpec):
        return hull.DisplacementHull(
            length_wl_m=spec.waterline_length_m,
            beam_m=spec.beam_m,
            draft_m=spec.draft_m,
            displaced_volume_m3=spec.displaced_volume_m3,
            block_coefficient=spec.block_coefficient,
            prismatic_coefficient=spec.prismatic_coefficient,
            midship_coefficient=spec.midship_coefficient,
            waterplane_coefficient=spec.waterplane_coefficient,
            lcb_percent=spec.lcb_percent,
            transom_area_m2=spec.transom_area_m2,
            bulb_area_m2=spec.bulb_area_m2,
            bulb_centre_height_m=spec.bulb_centre_height_m,
            stern_coefficient=spec.stern_shape,
            given_wetted_area_m2=spec.wetted_area_m2,
            given_form_factor=spec.form_factor,
            given_correlation_allowance=spec.roughness_allowance,
            check_ranges=spec.check_ranges,
        )
    if isinstance(spec, TableHullSpec):
        return hull.TabulatedResistance(
            speeds_m_s=tuple(spec.speeds_m_s),
            resistances_n=tuple(spec.resistances_n),
            wetted_area_m2=spec.wetted_area_m2,
        )
    raise TypeError(f"unknown hull spec {type(spec).__name__}")


def _added_mass(vessel: VesselSpec) -> float:
    how, value = vessel.added_mass_rule, vessel.added_mass_value
    if how == "mass":
        return value
    if how == "fraction":
        return value * vessel.mass_kg
    if isinstance(vessel.hull, SubmergedHullSpec):
        k1 = hull.prolate_spheroid_surge_added_mass_coefficient(
            vessel.hull.length_m, vessel.hull.diameter_m
        )
        return k1 * vessel.mass_kg  # neutrally buoyant: displaced mass = vessel mass
    return 0.05 * vessel.mass_kg  # surface ship surge added mass ≈ 5 % (common practice)


DESIGN_CURRENT_DENSITY_A_M2 = 1000.0
"""Cathode current density [A/m²] at which a sacrificial pair's hydrogen overpotential is taken
when the drive's current is not known (:func:`thruster_unit` without ``design_current_a``)."""

_CATHODE_KINETICS = {
    k.galvanic_key: k.name for k in electrodes.ELECTRODE_KINETICS.values() if k.role == "cathode"
}


def thruster_unit(spec: ThrusterSpec, design_current_a: float | None = None) -> ThrusterUnit:
    """The physics of one thruster design (duct or layout, electrodes, magnet, coil load).

    Parameters
    ----------
    spec : ThrusterSpec
    design_current_a : float, optional
        Current of one unit at which a sacrificial pair's cathode overpotential is taken [A]
        (the drive's max_current; None: :data:`DESIGN_CURRENT_DENSITY_A_M2` on the cathode).

    Raises :class:`~sim.physics.errors.ModelRangeError` when the duct or layout model rejects
    it."""
    drop, offset, f_cl, eta = _electrode_terms(spec, design_current_a)
    arr = open_field_array(spec) if spec.layout == "open-field" else None
    b_hw = surface_field_t(arr) if arr is not None else hardware_field_t(spec)
    opts = dict(
        roughness_m=spec.wall_roughness_m,
        k_inlet=spec.inlet_loss,
        k_nozzle=spec.nozzle_loss,
        nozzle_area_ratio=spec.nozzle_area_ratio,
        jet_model=spec.jet,
        electrode_drop_v=drop,
        chlorine_fraction=f_cl,
        galvanic_offset_v=offset,
        gas_model=spec.gas_model,
        gas_slip_ratio=spec.gas_slip_ratio,
        end_effects=spec.end_effects,
    )
    if arr is not None:  # a stand-in that carries the electrode terms (not used for the flow)
        duct = DuctThruster(
            gap_m=arr.pitch_m,
            height_m=arr.electrode_width_m,
            length_m=arr.array_length_m,
            n_channels=1,
            b_tesla=b_hw,
            **opts,
        )
    else:
        duct = layout_duct(spec, b_hw, opts)
    alpha, tmax = 0.0, math.inf
    if spec.magnet == "permanent":
        alpha = magnets.ALPHA_BR_NDFEB_PER_K
        grade_name = spec.magnet_grade or (spec.magnet_blocks and spec.magnet_blocks.grade)
        if grade_name:
            grade = magnets.NDFEB_GRADES[grade_name.upper()]
            alpha = grade.alpha_br_per_k
            tmax = grade.max_working_temp_c
    sacrificial = spec.anode if spec.anode in electrodes.SACRIFICIAL_ANODES else None
    return ThrusterUnit(
        name=spec.name,
        duct=duct,
        units=spec.units,
        magnet_kind=spec.magnet,
        b_ref_tesla=duct.b_tesla,
        alpha_br_per_k=alpha,
        t_ref_c=(
            spec.field_reference_temperature_c if spec.field_t is not None else magnets.T_REF_C
        ),
        magnet_max_c=tmax,
        magnet_heat_capacity_j_k=spec.magnet_heat_capacity_j_k,
        magnet_conductance_w_k=spec.magnet_conductance_w_k,
        channel_wiring=spec.channel_wiring,
        wake_fraction=spec.wake_fraction,
        thrust_deduction=spec.thrust_deduction,
        overpotential_v=eta,
        layout=spec.layout,
        coil_power_w=0.0 if spec.coil is None else coil_power_w(spec.coil, b_hw, spec),
        sacrificial_anode=sacrificial,
        anode_mass_kg=spec.anode_mass_kg if sacrificial else None,
        anode_utilisation=spec.anode_utilisation,
        open_field=arr,
    )


def open_field_array(spec: ThrusterSpec) -> OpenFieldArray:
    """The arrays of an open-field thruster design (:class:`sim.physics.open_field.
    OpenFieldArray`): strips of active_length along the flow; the magnets' remanence is the
    given field (at its reference temperature) or the NdFeB grade's nominal remanence at 20 °C.

    Raises :class:`~sim.physics.errors.ModelRangeError` when the arrays are not valid."""
    if spec.field_t is not None:
        br = spec.field_t
    elif spec.magnet_grade:
        br = magnets.NDFEB_GRADES[spec.magnet_grade.upper()].br_tesla
    else:
        raise ModelRangeError("field", None, "a remanence or a magnet_grade", "open-field")
    return OpenFieldArray(
        pitch_m=spec.strip_pitch_m,
        electrode_width_m=spec.electrode_width_m,
        n_electrodes=int(spec.strips),
        array_length_m=spec.active_length_m,
        br_t=br,
        magnet_width_m=spec.magnet_width_m,
        magnet_thickness_m=spec.magnet_thickness_m,
        magnet_depth_m=spec.magnet_depth_m,
        magnet_offset_m=spec.magnet_offset_m,
        position_from_bow_m=spec.array_position_m,
        bl_friction_share=spec.friction_share,
    )


def _electrode_terms(spec: ThrusterSpec, design_current_a: float | None):
    """(electrode drop [V], galvanic offset [V], chlorine fraction, overpotential [V]).

    A sacrificial anode works against a hydrogen-evolving cathode as a galvanic cell
    (:func:`sim.physics.electrodes.sacrificial_pair_drop_v`): its zero-current part
    E_anode − E_H₂ is the fixed-sign galvanic offset, the cathode's Butler–Volmer overpotential at
    the design current density the drop that opposes the current either way; no chlorine."""
    if spec.anode not in electrodes.SACRIFICIAL_ANODES:
        pair = electrochem.ElectrodePair(
            anode=spec.anode,
            cathode=spec.cathode,
            overpotential_v=spec.overpotential_v,
            chlorine_fraction=spec.chlorine_fraction,
        )
        return (
            electrochem.electrode_drop_v(pair),
            pair.galvanic_offset_v,
            spec.chlorine_fraction,
            spec.overpotential_v,
        )
    cathode = _CATHODE_KINETICS.get(spec.cathode)
    if cathode is None:
        from_ = ", ".join(sorted(_CATHODE_KINETICS))
        raise ModelRangeError("cathode", spec.cathode, f"one of {from_}", "sacrificial anodes")
    if design_current_a is None:
        i_c = DESIGN_CURRENT_DENSITY_A_M2
    else:
        n_par = 1 if spec.channel_wiring == "series" else _channel_count(spec)
        i_c = abs(design_current_a) / n_par / cathode_area_per_channel_m2(spec)
    offset = electrodes.sacrificial_pair_drop_v(spec.anode, cathode, 0.0)
    total = electrodes.sacrificial_pair_drop_v(spec.anode, cathode, i_c)
    eta = max(total - offset, 0.0)
    return eta, offset, 0.0, eta


def _channel_count(spec: ThrusterSpec) -> int:
    """Channels (stack) or tubes (ring) of one unit that share its current in parallel."""
    return {"stack": spec.stack_count, "ring-of-tubes": spec.tube_count}.get(
        spec.layout, spec.channels if spec.layout == "duct" else 1
    )


def cathode_area_per_channel_m2(spec: ThrusterSpec) -> float:
    """Face area of one channel's cathode [m²]: pole_height × active_length for rectangular
    channels; the inner ring electrode 2π·r1·L for annular and helical layouts (the smaller one,
    so its current density is the higher)."""
    if spec.layout in ("annular", "helical"):
        return 2.0 * math.pi * spec.inner_radius_m * spec.active_length_m
    if spec.layout == "open-field":  # all cathode strips of the array
        return 0.5 * spec.strips * spec.electrode_width_m * spec.active_length_m
    return spec.pole_height_m * spec.active_length_m


def layout_duct(spec: ThrusterSpec, b_tesla: float, opts: dict) -> DuctThruster:
    """The straight duct (or :class:`~sim.physics.layouts.EquivalentDuct`) the solver runs for a
    thruster design of any layout, with field ``b_tesla`` from :func:`hardware_field_t`.

    Parameters
    ----------
    spec : ThrusterSpec
    b_tesla : float
        Field at the reference temperature [T] (layout's own meaning: gap field, azimuthal
        field at the mean or ring radius, axial field).
    opts : dict
        Loss and electrode options of :class:`DuctThruster`
        (:data:`sim.physics.layouts.DUCT_OPTION_NAMES`).

    Returns
    -------
    DuctThruster
        Exact equivalent (resistance, force per ampere, back EMF, area, volume; own hydraulic
        diameter), see :mod:`sim.physics.layouts`.
    """
    lay = spec.layout
    if lay == "duct":
        return DuctThruster(
            gap_m=spec.gap_m,
            height_m=spec.pole_height_m,
            length_m=spec.active_length_m,
            n_channels=spec.channels,
            b_tesla=b_tesla,
            **opts,
        )
    if lay == "stack":
        one = DuctThruster(
            gap_m=spec.gap_m,
            height_m=spec.pole_height_m,
            length_m=spec.active_length_m,
            n_channels=1,
            b_tesla=b_tesla,
            **opts,
        )
        return layouts.stack_as_duct(
            layouts.ChannelStack(one, int(spec.stack_count), spec.channel_wiring)
        )
    if lay == "annular":
        return layouts.annular_as_duct(
            layouts.AnnularThruster(
                inner_radius_m=spec.inner_radius_m,
                outer_radius_m=spec.outer_radius_m,
                length_m=spec.active_length_m,
                b_tesla=b_tesla,
                field_profile=spec.field_profile,
                **opts,
            )
        )
    if lay == "ring-of-tubes":
        return layouts.ring_of_tubes_as_duct(
            layouts.RingOfTubes(
                n_tubes=int(spec.tube_count),
                ring_radius_m=spec.ring_radius_m,
                radial_gap_m=spec.gap_m,
                height_m=spec.pole_height_m,
                length_m=spec.active_length_m,
                b_tesla=b_tesla,
                field_profile=spec.field_profile,
                **opts,
            )
        )
    if lay == "helical":
        helical_opts = {k: v for k, v in opts.items() if k != "nozzle_area_ratio"}
        return layouts.helical_as_duct(
            layouts.HelicalThruster(
                inner_radius_m=spec.inner_radius_m,
                outer_radius_m=spec.outer_radius_m,
                axial_length_m=spec.active_length_m,
                b_axial_tesla=b_tesla,
                helix_angle_deg=spec.pitch_angle_deg,
                n_vanes=int(spec.vanes),
                stator_recovery=spec.stator_recovery,
                **helical_opts,
            )
        )
    raise ModelRangeError("layout", lay, "duct, stack, annular, ring-of-tubes or helical")


def hardware_field_t(spec: ThrusterSpec) -> float:
    """The field a thruster design's magnet gives at the reference temperature [T].

    A given field as it is; magnet blocks by :func:`block_field_t`; a coil by
    :func:`coil_field_t`. For annular and ring-of-tubes layouts the azimuthal field at the mean
    (ring) radius, for a helical layout the mean axial field over the annulus."""
    if spec.field_t is not None:
        return spec.field_t
    if spec.magnet_blocks is not None:
        return block_field_t(spec)
    return coil_field_t(spec.coil, spec)


def _coil_width_m(spec: ThrusterSpec) -> float:
    """Width across the channels that one coil pair spans [m] (all channels of the unit)."""
    n = spec.stack_count if spec.layout == "stack" else spec.channels
    return spec.gap_m * n


def coil_field_t(coil: CoilSpec, spec: ThrusterSpec) -> float:
    """Mean field of a thruster's coil over its channel or annulus [T].

    racetrack-pair: ⟨B_z⟩ over the box active_length × pole_height × (gap × channels) between the
    coils (:func:`sim.physics.fields.coil_pair_mean_field_t`); toroid: μ0·N·I/(2π·r) at the mean
    radius (annular) or ring radius (:func:`sim.physics.fields.toroidal_field_t`); solenoid:
    ⟨B_z⟩ over the annulus r1…r2 and the active length, area-weighted
    (:func:`sim.physics.fields.solenoid_field_t`, Gauss–Legendre)."""
    if coil.kind == "racetrack-pair":
        return fields.coil_pair_mean_field_t(
            coil.ampere_turns_a,
            coil.straight_length_m,
            coil.end_radius_m,
            coil.separation_m,
            _coil_width_m(spec),
            spec.active_length_m,
            spec.pole_height_m,
        )
    if coil.kind == "toroid":
        r = (
            spec.ring_radius_m
            if spec.layout == "ring-of-tubes"
            else 0.5 * (spec.inner_radius_m + spec.outer_radius_m)
        )
        return float(fields.toroidal_field_t(coil.ampere_turns_a, r))
    if coil.kind == "solenoid":
        return solenoid_annulus_mean_field_t(
            coil.ampere_turns_a,
            coil.radius_m,
            coil.length_m,
            spec.inner_radius_m,
            spec.outer_radius_m,
            spec.active_length_m,
        )
    raise ModelRangeError("coil.kind", coil.kind, "racetrack-pair, solenoid or toroid")


def solenoid_annulus_mean_field_t(
    ampere_turns_a: float,
    radius_m: float,
    length_m: float,
    inner_radius_m: float,
    outer_radius_m: float,
    axial_length_m: float,
    n_points: int = 8,
) -> float:
    """Area- and length-mean axial field of a finite solenoid over an annulus inside it [T].

    ⟨B_z⟩ = ∫∫ B_z(ρ, z) ρ dρ dz / (½(r2² − r1²)·L), Gauss–Legendre in ρ and z, the annulus
    centred on the solenoid (:func:`sim.physics.fields.solenoid_field_t`).

    Raises :class:`~sim.physics.errors.ModelRangeError` when the winding does not enclose the
    annulus."""
    if not radius_m > outer_radius_m:
        raise ModelRangeError(
            "coil.radius", radius_m, f"> outer_radius = {outer_radius_m:g} m", "solenoid"
        )
    x, w = np.polynomial.legendre.leggauss(n_points)
    r1, r2, half = inner_radius_m, outer_radius_m, 0.5 * axial_length_m
    rho = 0.5 * (r2 - r1) * x + 0.5 * (r1 + r2)
    z = half * x
    rr, zz = np.meshgrid(rho, z, indexing="ij")
    _, bz = fields.solenoid_field_t(ampere_turns_a, radius_m, length_m, rr, zz)
    wts = np.outer(w * rho, w)
    return float(np.sum(wts * bz) / np.sum(wts))


def coil_bore_volume_m3(coil: CoilSpec, spec: ThrusterSpec) -> float:
    """Volume the coil's field fills [m³], for its stored energy and cold mass: the box between a
    racetrack pair, the solenoid bore, or the annulus (ring) a toroid links."""
    if coil.kind == "racetrack-pair":
        return (
            (coil.straight_length_m + 2.0 * coil.end_radius_m)
            * 2.0
            * coil.end_radius_m
            * coil.separation_m
        )
    if coil.kind == "solenoid":
        return math.pi * coil.radius_m**2 * coil.length_m
    if spec.layout == "ring-of-tubes":
        return 2.0 * math.pi * spec.ring_radius_m * spec.gap_m * spec.active_length_m
    return math.pi * (spec.outer_radius_m**2 - spec.inner_radius_m**2) * spec.active_length_m


def coil_power_w(coil: CoilSpec, b_t: float, spec: ThrusterSpec) -> float:
    """Constant electrical load of one unit's coil [W].

    Resistive: I²R (:func:`sim.physics.fields.coil_joule_w`) or V·I. NbTi: the cryocooler input
    of :func:`sim.physics.fields.superconducting_cryo_load` at the coil's field and bore volume
    (an order-of-magnitude estimate; leads carry the current unless persistent)."""
    if coil.conductor == "nbti":
        load = fields.superconducting_cryo_load(
            b_t,
            coil_bore_volume_m3(coil, spec),
            lead_current_a=0.0 if coil.persistent else coil.current_a,
        )
        return float(load.input_power_w)
    if coil.resistance_ohm is not None:
        return float(fields.coil_joule_w(coil.current_a, coil.resistance_ohm))
    return coil.voltage_v * coil.current_a


def coil_margin(coil: CoilSpec) -> fields.LoadLineMargin | None:
    """Where a superconducting coil sits on its load line (None for resistive coils).

    Load line B = (peak_field / current)·I against the NbTi critical line at 4.2 K
    (:func:`sim.physics.fields.load_line_margin`, design limit 80 % of the critical current)."""
    if coil.conductor != "nbti":
        return None
    return fields.load_line_margin(
        coil.current_a, coil.peak_field_t / coil.current_a, coil.superconductor_area_m2
    )


def block_field_t(spec: ThrusterSpec) -> float:
    """Volume-mean gap field of a thruster's magnet blocks over one channel at 20 °C [T].

    No yoke: :func:`sim.physics.magnet_gap.facing_blocks_mean_field_t` (exact superposition);
    yoke: :func:`sim.physics.fields.facing_pair_field` (magnetic-circuit estimate); the grade's
    nominal remanence either way."""
    mb = spec.magnet_blocks
    if mb.yoke:
        return fields.facing_pair_field(
            mb.grade.upper(),
            mb.width_m,
            mb.length_m,
            mb.thickness_m,
            spec.pole_height_m,
            spec.gap_m,
            spec.active_length_m,
            magnet_temp_c=magnets.T_REF_C,
            yoke=True,
        ).mean_b_t
    grade = magnets.NDFEB_GRADES[mb.grade.upper()]
    return magnet_gap.facing_blocks_mean_field_t(
        grade.br_tesla,
        mb.width_m,
        mb.length_m,
        mb.thickness_m,
        spec.pole_height_m,
        spec.gap_m,
        spec.active_length_m,
    )


def anode_spent_charge_c(unit: ThrusterUnit) -> float:
    """Charge through one unit's sacrificial anodes at which they are spent [C] (inf when not
    tracked): the usable mass anode_utilisation × anode_mass_kg at the anode's design capacity
    (:func:`sim.physics.electrodes.consumed_mass_kg`, practical basis, is linear in charge)."""
    if unit.sacrificial_anode is None or unit.anode_mass_kg is None:
        return math.inf
    per_c = electrodes.consumed_mass_kg(1.0, unit.sacrificial_anode)
    return unit.anode_utilisation * unit.anode_mass_kg / per_c


def housing_appendages(vessel: VesselSpec):
    """Thruster housings as appendages (external drag)."""
    out = []
    for t in vessel.thrusters:
        if t.housing_wetted_area_m2 > 0:
            out.append(
                hull.Appendage(
                    wetted_area_m2=t.housing_wetted_area_m2 * t.units,
                    reference_length_m=t.housing_length_m or t.active_length_m,
                    form_factor=t.housing_form_factor,
                    label=f"{t.name} housing",
                )
            )
    return tuple(out)


def build_plant(vessel: VesselSpec, water: Water) -> Plant:
    """Build the plant of a vessel in a body of water."""
    state = water_properties(water)
    model = hull_model(vessel.hull)
    vmax_hull = float(getattr(model, "max_speed_m_s", math.inf))
    fn_max = float(getattr(model, "max_froude_number", math.inf))
    apps = housing_appendages(vessel)
    if apps:
        model = hull.with_appendages(model, apps)
    b = vessel.battery
    pack = bat.Pack(
        cell=bat.aged_cell(
            bat.CELL_SETS[b.cell],
            capacity_retained=b.capacity_retained,
            resistance_growth=b.resistance_growth,
        ),
        n_series=b.series,
        n_parallel=b.parallel,
        extra_series_resistance_ohm=b.extra_resistance_ohm,
    )
    d = vessel.drive
    units = tuple(thruster_unit(t, d.max_current_a) for t in vessel.thrusters)
    coil_w = sum(u.coil_power_w * u.units for u in units)
    return Plant(
        name=vessel.name,
        water=state,
        water_current_m_s=water.current_m_s,
        resistance=model,
        mass_kg=vessel.mass_kg,
        added_mass_kg=_added_mass(vessel),
        thrusters=units,
        pack=pack,
        battery_ua_w_k=b.conductance_to_water_w_k,
        drive_efficiency=d.efficiency,
        drive_max_current_a=d.max_current_a,
        drive_max_voltage_v=d.max_voltage_v,
        undervoltage_margin_v=d.undervoltage_margin_v,
        hotel_w=vessel.hotel_w,
        cryocooler_w=vessel.cryocooler_w + coil_w,
        overvoltage_margin_v=d.overvoltage_margin_v,
        hull_max_speed_m_s=vmax_hull,
        hull_max_froude=fn_max,
        coil_power_w=coil_w,
        route=route_water(water),
        tide=tidal_current(water),
    )
