"""Steady operating points of a whole vessel: thrust equals resistance, magnets in thermal
equilibrium with the duct water.

Used for the operating-point table, the speed hold's feed-forward and the range curves.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sim.engine.model import Control, Snapshot, VesselModel, initial_state
from sim.engine.plant import Plant
from sim.physics.roots import brent_root as brentq

__all__ = ["SteadyError", "SteadyPoint", "steady_at_speed", "steady_speed_for"]


class SteadyError(ValueError):
    """No steady operating point exists for the request (e.g. the drive cannot reach it)."""


@dataclass(frozen=True)
class SteadyPoint:
    """A steady operating point of the vessel (sums over all thruster units)."""

    speed_m_s: float
    thruster_voltage_v: float
    thrust_n: float
    resistance_n: float
    thruster_current_a: float
    thruster_power_w: float
    pack_power_w: float
    pack_current_a: float
    useful_power_w: float
    flow_work_w: float
    joule_loss_w: float
    electrode_loss_w: float
    friction_loss_w: float
    wake_loss_w: float
    drive_loss_w: float
    hotel_w: float
    eta_electrical: float
    """Flow work / thruster electrical power (docs/efficiencies.md) [-]."""
    eta_hydraulic: float
    """Thrust power (effective thrust × speed) / flow work [-]."""
    eta_overall: float
    """Thrust power / thruster electrical power [-]."""
    duct_rise_k: float
    """Largest bulk outlet temperature rise over the thruster designs (Joule, friction and
    electrode heat) [K]."""
    h2_mol_s: float
    cl2_mol_s: float
    field_t: tuple[float, ...]
    feasible: bool
    """The pack can deliver the demanded power at the given state of charge."""
    hull_in_range: bool = True
    """The speed lies within the hull model's data (False past Holtrop–Mennen's Froude number
    0.45: the resistance is extrapolated)."""
    charge_folded: bool = False
    """The drive folds back regenerated power to the pack's charge limit."""

    @property
    def electrical_efficiency(self) -> float:
        """Old name of `eta_electrical` [-]; kept as an alias."""
        return self.eta_electrical

    @property
    def propulsive_efficiency(self) -> float:
        """Old name of `eta_hydraulic` (thrust power / flow work) [-]; kept as an alias."""
        return self.eta_hydraulic

    @property
    def overall_efficiency(self) -> float:
        """Old name of `eta_overall` [-]; kept as an alias."""
        return self.eta_overall


def _state(model: VesselModel, speed: float, soc: float, magnet_c: list[float]):
    p = model.plant
    y = initial_state(p, soc, speed, p.water.t_c, p.water.t_c)
    y[model.lay.i_mag : model.lay.i_mag + model.lay.n_thr] = magnet_c
    return y


def _eval(model: VesselModel, speed: float, volts: float, soc: float, magnet_c):
    model.control = Control(mode="voltage", setpoint=volts, hotel_w=model.control.hotel_w)
    return model.evaluate(0.0, _state(model, speed, soc, magnet_c))


def _net(model, speed, volts, soc, magnet_c) -> float:
    s = _eval(model, speed, volts, soc, magnet_c)
    return s.total_thrust_n - s.resistance_n


def _with_magnet_equilibrium(model: VesselModel, solve, soc: float):
    """Solve, set the magnets to the duct mean temperature, solve again (converges in a few
    passes: the field changes by ~0.1 %/K)."""
    t_w = model.plant.water.t_c
    mags = [t_w] * model.lay.n_thr
    result = None
    for _ in range(8):
        result, snap = solve(mags)
        new = [t_w + 0.5 * r for r in snap.duct_rise_k]
        if max(abs(a - b) for a, b in zip(new, mags, strict=True)) < 1e-6:
            break
        mags = new
    return result, snap, mags


def steady_at_speed(
    plant: Plant, speed_m_s: float, *, soc: float = 1.0, hotel_w: float | None = None
) -> SteadyPoint:
    """The steady point at a given speed through water: the thruster voltage that makes
    thrust equal resistance. Raises SteadyError when the drive's voltage range cannot."""
    model = VesselModel(plant)
    model.control.hotel_w = plant.hotel_w if hotel_w is None else hotel_w
    vmax = plant.drive_max_voltage_v

    def solve(mags):
        if speed_m_s == 0.0:
            return 0.0, _eval(model, 0.0, 0.0, soc, mags)
        if _net(model, speed_m_s, vmax, soc, mags) < 0:
            raise SteadyError(
                f"{speed_m_s:.3f} m/s needs more thrust than the thrusters give at the drive's "
                f"maximum voltage {vmax:g} V, its current limit or the pack's power limit"
            )
        v = brentq(
            lambda v: _net(model, speed_m_s, v, soc, mags),
            0.0,
            vmax,
            xtol=1e-10,
            rtol=1e-13,
            maxiter=200,
        )
        return v, _eval(model, speed_m_s, v, soc, mags)

    (volts), snap, _mags = _with_magnet_equilibrium(model, solve, soc)
    return _point(model, speed_m_s, volts, snap)


def steady_speed_for(plant: Plant, control: Control, *, soc: float = 1.0) -> float:
    """Steady speed through water under a fixed command (voltage, current or power) [m/s]."""
    model = VesselModel(plant)
    model.control = control

    def net(speed, mags):
        y = _state(model, speed, soc, mags)
        s = model.evaluate(0.0, y)
        return s.total_thrust_n - s.resistance_n, s

    def solve(mags):
        f0, s0 = net(0.0, mags)
        if f0 <= 0:
            return 0.0, s0
        hi = 0.5
        while net(hi, mags)[0] > 0:
            hi *= 2.0
            if hi > 200:
                raise SteadyError("no steady speed below 200 m/s")
        v = brentq(lambda x: net(x, mags)[0], 0.0, hi, xtol=1e-12, rtol=1e-13, maxiter=200)
        return v, net(v, mags)[1]

    v, _, _ = _with_magnet_equilibrium(model, solve, soc)
    return v


def _safe(a: float, b: float) -> float:
    return a / b if b > 0 and math.isfinite(a / b) else 0.0


def _point(model: VesselModel, speed: float, volts: float, s: Snapshot) -> SteadyPoint:
    useful = s.total_thrust_n * speed
    return SteadyPoint(
        speed_m_s=speed,
        thruster_voltage_v=float(np.mean(s.voltage_v)) if s.voltage_v else volts,
        thrust_n=s.total_thrust_n,
        resistance_n=s.resistance_n,
        thruster_current_a=sum(s.current_a),
        thruster_power_w=s.thr_power_w,
        pack_power_w=s.pack_power_w,
        pack_current_a=s.pack_current_a,
        useful_power_w=useful,
        flow_work_w=s.flow_work_w,
        joule_loss_w=s.joule_w,
        electrode_loss_w=s.electrode_w,
        friction_loss_w=s.friction_w,
        wake_loss_w=s.wake_w,
        drive_loss_w=s.drive_loss_w,
        hotel_w=s.hotel_w,
        eta_electrical=_safe(s.flow_work_w, s.thr_power_w),
        eta_hydraulic=_safe(useful, s.flow_work_w),
        eta_overall=_safe(useful, s.thr_power_w),
        duct_rise_k=max(s.duct_rise_k) if s.duct_rise_k else 0.0,
        h2_mol_s=s.h2,
        cl2_mol_s=s.cl2,
        field_t=tuple(s.field_t),
        feasible=s.feasible,
        hull_in_range=abs(speed) <= model.plant.hull_max_speed_m_s,
        charge_folded=s.charge_folded,
    )
