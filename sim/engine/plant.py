"""The plant: every physical part of one vessel in one body of water, ready for the integrator.

:func:`build_plant` turns validated file specs (plain SI floats) into physics objects once, so the
ODE right-hand side only does arithmetic.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sim.io.schema import (
    DisplacementHull,
    SubmergedHull,
    TableHull,
    ThrusterSpec,
    VesselFile,
    WaterSpec,
)
from sim.physics import battery as bat
from sim.physics import electrochem, hull, magnets
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

    @property
    def total_mass_kg(self) -> float:
        """Rigid-body plus surge added mass [kg]."""
        return self.mass_kg + self.added_mass_kg

    @property
    def n_units(self) -> int:
        return sum(t.units for t in self.thrusters)


def water_from_spec(spec: WaterSpec) -> WaterState:
    """Water properties at the vessel's depth (TEOS-10 via :mod:`sim.physics.seawater`)."""
    return water_state(spec.salinity, spec.temperature, spec.depth * DBAR_PER_M)


def _hull_model(spec, vessel_mass_kg: float, rho: float):
    if isinstance(spec, SubmergedHull):
        return hull.SubmergedBody(
            length_m=spec.length,
            diameter_m=spec.diameter,
            given_wetted_area_m2=spec.wetted_area,
            roughness_allowance=spec.roughness_allowance,
        )
    if isinstance(spec, DisplacementHull):
        return hull.DisplacementHull(
            length_wl_m=spec.waterline_length,
            beam_m=spec.beam,
            draft_m=spec.draft,
            displaced_volume_m3=spec.displaced_volume,
            block_coefficient=spec.block_coefficient,
            prismatic_coefficient=spec.prismatic_coefficient,
            midship_coefficient=spec.midship_coefficient,
            waterplane_coefficient=spec.waterplane_coefficient,
            lcb_percent=spec.lcb_percent,
            transom_area_m2=spec.transom_area,
            bulb_area_m2=spec.bulb_area,
            bulb_centre_height_m=spec.bulb_centre_height,
            stern_coefficient=spec.stern_shape,
            given_wetted_area_m2=spec.wetted_area,
            given_form_factor=spec.form_factor,
            given_correlation_allowance=spec.roughness_allowance,
        )
    if isinstance(spec, TableHull):
        return hull.TabulatedResistance(
            speeds_m_s=tuple(spec.speeds),
            resistances_n=tuple(spec.resistances),
            wetted_area_m2=spec.wetted_area,
        )
    raise TypeError(f"unknown hull spec {type(spec).__name__}")


def _added_mass(vf: VesselFile, rho: float) -> float:
    how, value = vf.vessel.added_mass
    if how == "mass":
        return value
    if how == "fraction":
        return value * vf.vessel.mass
    if isinstance(vf.hull, SubmergedHull):
        k1 = hull.prolate_spheroid_surge_added_mass_coefficient(vf.hull.length, vf.hull.diameter)
        return k1 * vf.vessel.mass  # neutrally buoyant: displaced mass = vessel mass
    return 0.05 * vf.vessel.mass  # surface ship surge added mass ≈ 5 % (common practice)


def _thruster_unit(spec: ThrusterSpec) -> ThrusterUnit:
    pair = electrochem.ElectrodePair(
        anode=spec.anode,
        cathode=spec.cathode,
        overpotential_v=spec.overpotential,
        chlorine_fraction=spec.chlorine_fraction,
    )
    drop = electrochem.electrode_drop_v(pair)
    duct = DuctThruster(
        gap_m=spec.gap,
        height_m=spec.pole_height,
        length_m=spec.active_length,
        n_channels=spec.channels,
        b_tesla=spec.field,
        roughness_m=spec.wall_roughness,
        k_inlet=spec.inlet_loss,
        k_nozzle=spec.nozzle_loss,
        nozzle_area_ratio=spec.nozzle_area_ratio,
        jet_model=spec.jet,
        electrode_drop_v=drop,
        chlorine_fraction=spec.chlorine_fraction,
    )
    alpha, tmax = 0.0, math.inf
    if spec.magnet == "permanent":
        alpha = magnets.ALPHA_BR_NDFEB_PER_K
        if spec.magnet_grade:
            grade = magnets.NDFEB_GRADES[spec.magnet_grade.upper()]
            alpha = grade.alpha_br_per_k
            tmax = grade.max_working_temp_c
    return ThrusterUnit(
        name=spec.name,
        duct=duct,
        units=spec.units,
        magnet_kind=spec.magnet,
        b_ref_tesla=spec.field,
        alpha_br_per_k=alpha,
        t_ref_c=spec.field_reference_temperature,
        magnet_max_c=tmax,
        magnet_heat_capacity_j_k=spec.magnet_heat_capacity,
        magnet_conductance_w_k=spec.magnet_conductance,
    )


def housing_appendages(vf: VesselFile):
    """Thruster housings as appendages (external drag)."""
    out = []
    for t in vf.thruster:
        if t.housing_wetted_area > 0:
            out.append(
                hull.Appendage(
                    wetted_area_m2=t.housing_wetted_area * t.units,
                    reference_length_m=t.housing_length or t.active_length,
                    form_factor=t.housing_form_factor,
                    label=f"{t.name} housing",
                )
            )
    return tuple(out)


def build_plant(vf: VesselFile, water_spec: WaterSpec) -> Plant:
    """Build the plant from a validated vessel file and the scenario's water."""
    water = water_from_spec(water_spec)
    model = _hull_model(vf.hull, vf.vessel.mass, water.rho_kg_m3)
    apps = housing_appendages(vf)
    if apps:
        model = hull.with_appendages(model, apps)
    cell = bat.CELL_SETS[vf.battery.cell]
    pack = bat.Pack(
        cell=cell,
        n_series=vf.battery.series,
        n_parallel=vf.battery.parallel,
        extra_series_resistance_ohm=vf.battery.extra_resistance,
    )
    return Plant(
        name=vf.vessel.name,
        water=water,
        water_current_m_s=water_spec.current,
        resistance=model,
        mass_kg=vf.vessel.mass,
        added_mass_kg=_added_mass(vf, water.rho_kg_m3),
        thrusters=tuple(_thruster_unit(t) for t in vf.thruster),
        pack=pack,
        battery_ua_w_k=vf.battery.conductance_to_water,
        drive_efficiency=vf.drive.efficiency,
        drive_max_current_a=vf.drive.max_current,
        drive_max_voltage_v=vf.drive.max_voltage,
        undervoltage_margin_v=vf.drive.undervoltage_margin,
        hotel_w=vf.hotel.power,
        cryocooler_w=vf.hotel.cryocooler,
    )
