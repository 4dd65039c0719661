"""The plant: every physical part of one vessel in one body of water, ready for the integrator.

:func:`build_plant` turns the engine's specs (:mod:`sim.engine.spec`, plain SI floats) into
physics objects once, so the ODE right-hand side only does arithmetic.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sim.engine.spec import (
    DisplacementHullSpec,
    HullSpec,
    SubmergedHullSpec,
    TableHullSpec,
    ThrusterSpec,
    VesselSpec,
    Water,
)
from sim.physics import battery as bat
from sim.physics import electrochem, hull, magnet_gap, magnets
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
    overvoltage_margin_v: float = 0.05
    """The drive folds back regenerated power to keep every cell this far below its maximum
    voltage [V]."""
    hull_max_speed_m_s: float = math.inf
    """Speed at the upper Froude number of the hull model's data [m/s] (inf: no such bound)."""
    hull_max_froude: float = math.inf
    """That Froude number [-]."""

    @property
    def total_mass_kg(self) -> float:
        """Rigid-body plus surge added mass [kg]."""
        return self.mass_kg + self.added_mass_kg

    @property
    def n_units(self) -> int:
        return sum(t.units for t in self.thrusters)


def water_properties(water: Water) -> WaterState:
    """Water properties at the vessel's depth (TEOS-10 via :mod:`sim.physics.seawater`)."""
    return water_state(water.salinity, water.temperature_c, water.depth_m * DBAR_PER_M)


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


def thruster_unit(spec: ThrusterSpec) -> ThrusterUnit:
    """The physics of one thruster design (duct, electrodes, magnet).

    Raises :class:`~sim.physics.errors.ModelRangeError` when the duct model rejects it."""
    pair = electrochem.ElectrodePair(
        anode=spec.anode,
        cathode=spec.cathode,
        overpotential_v=spec.overpotential_v,
        chlorine_fraction=spec.chlorine_fraction,
    )
    drop = electrochem.electrode_drop_v(pair)
    b_ref = spec.field_t if spec.magnet_blocks is None else block_field_t(spec)
    duct = DuctThruster(
        gap_m=spec.gap_m,
        height_m=spec.pole_height_m,
        length_m=spec.active_length_m,
        n_channels=spec.channels,
        b_tesla=b_ref,
        roughness_m=spec.wall_roughness_m,
        k_inlet=spec.inlet_loss,
        k_nozzle=spec.nozzle_loss,
        nozzle_area_ratio=spec.nozzle_area_ratio,
        jet_model=spec.jet,
        electrode_drop_v=drop,
        chlorine_fraction=spec.chlorine_fraction,
        galvanic_offset_v=pair.galvanic_offset_v,
        gas_model=spec.gas_model,
        gas_slip_ratio=spec.gas_slip_ratio,
        end_effects=spec.end_effects,
    )
    alpha, tmax = 0.0, math.inf
    if spec.magnet == "permanent":
        alpha = magnets.ALPHA_BR_NDFEB_PER_K
        grade_name = spec.magnet_grade or (spec.magnet_blocks and spec.magnet_blocks.grade)
        if grade_name:
            grade = magnets.NDFEB_GRADES[grade_name.upper()]
            alpha = grade.alpha_br_per_k
            tmax = grade.max_working_temp_c
    return ThrusterUnit(
        name=spec.name,
        duct=duct,
        units=spec.units,
        magnet_kind=spec.magnet,
        b_ref_tesla=b_ref,
        alpha_br_per_k=alpha,
        t_ref_c=(
            spec.field_reference_temperature_c if spec.magnet_blocks is None else magnets.T_REF_C
        ),
        magnet_max_c=tmax,
        magnet_heat_capacity_j_k=spec.magnet_heat_capacity_j_k,
        magnet_conductance_w_k=spec.magnet_conductance_w_k,
        channel_wiring=spec.channel_wiring,
        wake_fraction=spec.wake_fraction,
        thrust_deduction=spec.thrust_deduction,
        overpotential_v=spec.overpotential_v,
    )


def block_field_t(spec: ThrusterSpec) -> float:
    """Volume-mean gap field of a thruster's magnet blocks over one channel at 20 °C [T]
    (:func:`sim.physics.magnet_gap.facing_blocks_mean_field_t`, the grade's nominal
    remanence)."""
    mb = spec.magnet_blocks
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
        cell=bat.CELL_SETS[b.cell],
        n_series=b.series,
        n_parallel=b.parallel,
        extra_series_resistance_ohm=b.extra_resistance_ohm,
    )
    d = vessel.drive
    return Plant(
        name=vessel.name,
        water=state,
        water_current_m_s=water.current_m_s,
        resistance=model,
        mass_kg=vessel.mass_kg,
        added_mass_kg=_added_mass(vessel),
        thrusters=tuple(thruster_unit(t) for t in vessel.thrusters),
        pack=pack,
        battery_ua_w_k=b.conductance_to_water_w_k,
        drive_efficiency=d.efficiency,
        drive_max_current_a=d.max_current_a,
        drive_max_voltage_v=d.max_voltage_v,
        undervoltage_margin_v=d.undervoltage_margin_v,
        hotel_w=vessel.hotel_w,
        cryocooler_w=vessel.cryocooler_w,
        overvoltage_margin_v=d.overvoltage_margin_v,
        hull_max_speed_m_s=vmax_hull,
        hull_max_froude=fn_max,
    )
