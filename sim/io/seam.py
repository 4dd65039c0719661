"""The one seam between the files and the engine: validated file models
(:mod:`sim.io.schema`) become the engine's plain SI specs (:mod:`sim.engine.spec`).

The schema has already turned every value with a unit into an SI float, so this module only
renames and regroups; it never converts units and never checks values. Loaded files carry the
results (:class:`sim.io.files.LoadedVessel.vessel_spec`,
:class:`sim.io.files.LoadedScenario.mission_spec` and ``.water``), so most code never calls it.
"""

from __future__ import annotations

from functools import lru_cache

from sim.engine import spec
from sim.engine.conditions import CONDITIONS, Condition
from sim.engine.plant import Plant, build_plant
from sim.io import schema

__all__ = [
    "coil_spec",
    "conditions",
    "hull_spec",
    "limits_spec",
    "mission_spec",
    "plant_of",
    "route_spec",
    "thruster_spec",
    "vessel_spec",
    "water",
]


def water(
    ws: schema.WaterSpec,
    route: schema.RouteTable | None = None,
    tide: schema.TideTable | None = None,
) -> spec.Water:
    """A scenario's ``[water]`` table (with its ``[route]`` and ``[tide]``) as the engine's
    :class:`~sim.engine.spec.Water`."""
    return spec.Water(
        salinity=ws.salinity,
        temperature_c=ws.temperature,
        depth_m=ws.depth,
        current_m_s=ws.current,
        route=None if route is None else route_spec(route),
        tide=None
        if tide is None
        else spec.TideSpec(
            amplitude_m_s=tide.amplitude,
            period_s=tide.period,
            peak_time_s=tide.peak_time,
            mean_m_s=tide.mean,
        ),
    )


def route_spec(r: schema.RouteTable) -> spec.RouteSpec:
    """A scenario's ``[route]`` table as the engine's :class:`~sim.engine.spec.RouteSpec`."""
    axis = "distance" if r.distance is not None else "time"
    return spec.RouteSpec(
        axis=axis,
        stations=tuple(r.distance if r.distance is not None else r.time),
        salinity=tuple(r.salinity),
        temperature_c=tuple(r.temperature),
        current_m_s=tuple(r.current) if r.current is not None else (),
    )


def hull_spec(h: schema.SubmergedHull | schema.DisplacementHull | schema.TableHull):
    """A vessel's ``[hull]`` table as one of the engine's hull specs."""
    if isinstance(h, schema.SubmergedHull):
        return spec.SubmergedHullSpec(
            length_m=h.length,
            diameter_m=h.diameter,
            wetted_area_m2=h.wetted_area,
            roughness_allowance=h.roughness_allowance,
        )
    if isinstance(h, schema.DisplacementHull):
        return spec.DisplacementHullSpec(
            waterline_length_m=h.waterline_length,
            beam_m=h.beam,
            draft_m=h.draft,
            displaced_volume_m3=h.displaced_volume,
            block_coefficient=h.block_coefficient,
            prismatic_coefficient=h.prismatic_coefficient,
            midship_coefficient=h.midship_coefficient,
            waterplane_coefficient=h.waterplane_coefficient,
            lcb_percent=h.lcb_percent,
            transom_area_m2=h.transom_area,
            bulb_area_m2=h.bulb_area,
            bulb_centre_height_m=h.bulb_centre_height,
            stern_shape=h.stern_shape,
            wetted_area_m2=h.wetted_area,
            form_factor=h.form_factor,
            roughness_allowance=h.roughness_allowance,
            check_ranges=h.outside_range == "refuse",
        )
    if isinstance(h, schema.TableHull):
        return spec.TableHullSpec(
            speeds_m_s=tuple(h.speeds),
            resistances_n=tuple(h.resistances),
            wetted_area_m2=h.wetted_area,
        )
    raise TypeError(f"unknown hull table {type(h).__name__}")


def thruster_spec(t: schema.ThrusterSpec) -> spec.ThrusterSpec:
    """One ``[[thruster]]`` table as the engine's :class:`~sim.engine.spec.ThrusterSpec`."""
    return spec.ThrusterSpec(
        name=t.name,
        units=t.units,
        gap_m=t.gap,
        pole_height_m=t.pole_height,
        active_length_m=t.active_length,
        channels=t.channels,
        field_t=t.field,
        magnet=t.magnet,
        magnet_grade=t.magnet_grade,
        field_reference_temperature_c=t.field_reference_temperature,
        anode=t.anode,
        cathode=t.cathode,
        overpotential_v=t.overpotential,
        chlorine_fraction=t.chlorine_fraction,
        wall_roughness_m=t.wall_roughness,
        inlet_loss=t.inlet_loss,
        nozzle_loss=t.nozzle_loss,
        nozzle_area_ratio=t.nozzle_area_ratio,
        jet=t.jet,
        housing_wetted_area_m2=t.housing_wetted_area,
        housing_length_m=t.housing_length,
        housing_form_factor=t.housing_form_factor,
        magnet_heat_capacity_j_k=t.magnet_heat_capacity,
        magnet_conductance_w_k=t.magnet_conductance,
        channel_wiring=t.channel_wiring,
        wake_fraction=t.wake_fraction,
        thrust_deduction=t.thrust_deduction,
        gas_model=t.gas_model,
        gas_slip_ratio=t.gas_slip_ratio,
        end_effects=t.end_effects,
        magnet_blocks=None
        if t.magnet_blocks is None
        else spec.MagnetBlocksSpec(
            width_m=t.magnet_blocks.width,
            length_m=t.magnet_blocks.length,
            thickness_m=t.magnet_blocks.thickness,
            grade=t.magnet_blocks.grade,
            yoke=t.magnet_blocks.yoke,
        ),
        coil=None if t.coil is None else coil_spec(t.coil),
        layout=t.layout,
        stack_count=t.stack_count or 1,
        inner_radius_m=t.inner_radius,
        outer_radius_m=t.outer_radius,
        ring_radius_m=t.ring_radius,
        tube_count=t.tube_count or 1,
        field_profile=t.field_profile,
        pitch_angle_deg=45.0 if t.pitch_angle is None else t.pitch_angle,
        vanes=t.vanes,
        stator_recovery=t.stator_recovery,
        anode_mass_kg=t.anode_mass,
        anode_utilisation=t.anode_utilisation,
        strip_pitch_m=t.strip_pitch,
        electrode_width_m=t.electrode_width,
        strips=t.strips or 2,
        magnet_width_m=t.magnet_width,
        magnet_thickness_m=t.magnet_thickness,
        magnet_depth_m=t.magnet_depth,
        magnet_offset_m=t.magnet_offset,
        array_position_m=t.array_position,
        friction_share=t.friction_share,
    )


def coil_spec(c: schema.Coil) -> spec.CoilSpec:
    """A thruster's ``coil`` table as the engine's :class:`~sim.engine.spec.CoilSpec`."""
    return spec.CoilSpec(
        kind=c.kind,
        ampere_turns_a=c.ampere_turns,
        conductor=c.conductor,
        straight_length_m=c.straight_length,
        end_radius_m=c.end_radius,
        separation_m=c.separation,
        radius_m=c.radius,
        length_m=c.length,
        current_a=c.current,
        resistance_ohm=c.resistance,
        voltage_v=c.voltage,
        superconductor_area_m2=c.superconductor_area,
        peak_field_t=c.peak_field,
        persistent=c.persistent,
    )


def vessel_spec(vf: schema.VesselFile) -> spec.VesselSpec:
    """A validated vessel file as the engine's :class:`~sim.engine.spec.VesselSpec`."""
    rule, value = vf.vessel.added_mass
    b, d = vf.battery, vf.drive
    return spec.VesselSpec(
        name=vf.vessel.name,
        mass_kg=vf.vessel.mass,
        hull=hull_spec(vf.hull),
        thrusters=tuple(thruster_spec(t) for t in vf.thruster),
        battery=spec.BatterySpec(
            cell=b.cell,
            series=b.series,
            parallel=b.parallel,
            extra_resistance_ohm=b.extra_resistance,
            conductance_to_water_w_k=b.conductance_to_water,
            capacity_retained=b.capacity_retained,
            resistance_growth=b.resistance_growth,
        ),
        drive=spec.DriveSpec(
            max_current_a=d.max_current,
            max_voltage_v=d.max_voltage,
            efficiency=d.efficiency,
            undervoltage_margin_v=d.undervoltage_margin,
            overvoltage_margin_v=d.overvoltage_margin,
        ),
        added_mass_rule=rule,
        added_mass_value=value,
        hotel_w=vf.hotel.power,
        cryocooler_w=vf.hotel.cryocooler,
    )


def conditions(c: schema.Conditions) -> tuple[Condition, ...]:
    """The conditions a table gives, in the order of the schema's fields, as event objects, each
    carrying its threshold as the file wrote it (``shown``, for messages).

    A leg's ``duration`` is also given as ``LegSpec.duration_s``: the engine ends the leg at that
    known time rather than locating an event, and uses the condition only for its message. A flag
    condition (``return_to_start = true``) has the class's own threshold."""
    out = []
    for key, value in c.given().items():
        cls = CONDITIONS[key]
        if isinstance(value, bool):
            out.append(cls(shown=c.shown(key)))
        else:
            out.append(cls(float(value), shown=c.shown(key)))
    return tuple(out)


def _leg(leg: schema.LegSpec) -> spec.LegSpec:
    return spec.LegSpec(
        name=leg.name,
        mode=leg.mode,
        setpoint=leg.setpoint,
        until=conditions(leg.until),
        duration_s=leg.until.duration,
        hotel_w=leg.hotel,
        speed_gain_v_per_m_s=leg.speed_gain,
        speed_reset_time_s=leg.speed_reset_time,
    )


def _trigger(trig: schema.TriggerSpec) -> spec.TriggerSpec:
    return spec.TriggerSpec(
        name=trig.name,
        when=conditions(trig.when),
        then=trig.then,
        leg=trig.leg,
        factor=trig.factor,
        hotel_w=trig.hotel,
    )


def limits_spec(lim: schema.LimitsSpec) -> spec.LimitsSpec:
    """A scenario's ``[limits]`` table as the engine's :class:`~sim.engine.spec.LimitsSpec`."""
    return spec.LimitsSpec(
        time_s=lim.time,
        state_of_charge_min=lim.state_of_charge_min,
        battery_temperature_max_c=lim.battery_temperature_max,
        magnet_temperature_max_c=lim.magnet_temperature_max,
        duct_temperature_rise_max_k=lim.duct_temperature_rise_max,
    )


def mission_spec(sf: schema.ScenarioFile) -> spec.MissionSpec:
    """A validated scenario file as the engine's :class:`~sim.engine.spec.MissionSpec` (its
    water is :func:`water`; its vessel file is read separately)."""
    st, sv = sf.start, sf.solver
    return spec.MissionSpec(
        name=sf.scenario.name,
        legs=tuple(_leg(leg) for leg in sf.leg),
        triggers=tuple(_trigger(t) for t in sf.trigger),
        schedule=tuple(spec.ScheduleSpec(at_s=s.at, hotel_w=s.hotel) for s in sf.schedule),
        start=spec.StartSpec(
            state_of_charge=st.state_of_charge,
            speed_m_s=st.speed,
            battery_temperature_c=st.battery_temperature,
            magnet_temperature_c=st.magnet_temperature,
        ),
        limits=limits_spec(sf.limits),
        sample_s=sf.output.sample,
        solver=spec.SolverSpec(
            rtol=sv.rtol if sv.rtol is not None else spec.default_rtol(sv.method),
            max_step_s=sv.max_step,
            method=sv.method,
        ),
    )


def plant_of(vessel: spec.VesselSpec, water: spec.Water) -> Plant:
    """:func:`sim.engine.plant.build_plant`, once per vessel and water.

    The load-time checks (:func:`sim.io.checks.scenario_warnings`) and the steady checks of
    ``brinebolt check`` (:mod:`sim.io.feasibility`) share the one plant (a plant is frozen;
    models keep their own caches). A plant that cannot be built raises each time."""
    try:
        hash((vessel, water))
    except TypeError:  # a spec that cannot be a cache key: build it afresh
        return build_plant(vessel, water)
    return _plant_of(vessel, water)


@lru_cache(maxsize=8)
def _plant_of(vessel: spec.VesselSpec, water: spec.Water) -> Plant:
    return build_plant(vessel, water)
