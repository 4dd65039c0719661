"""The coupled vessel model: a flat state vector, the algebraic drive solution and the ODE
right-hand side.

State vector (all SI, temperatures in °C)::

    0  speed through water V [m/s]          8+n  ...
    1  distance over ground [m]             magnet temperature of each thruster design [°C]
    2  distance through water [m]          then, in order:
    3  state of charge [-]                   speed-hold integral term [V]
    4  RC voltage 1 [V]                      accumulated quantities (ACC_NAMES)
                                             charge through one unit's sacrificial
                                             anodes, per design that tracks one [C]
    5  RC voltage 2 [V]
    6  battery temperature [°C]

Dynamics (1-DOF surge): (m + m_a)·dV/dt = ΣT(V, command) − R(V). A water current (steady, from
the route table, tidal) changes speed over ground, not speed through water.

Water along the route: with a route table the water (σ, ρ, ν, c_p, temperature) is a function of
the distance over ground (state 1) or of time, interpolated linearly between stations; the model
recomputes it at every evaluation (so the right-hand side is continuous in the state and time)
and re-prepares the thrusters' constants for it, keeping the last few water states in a small
cache keyed on the exact interpolated salinity and temperature. Thrust, current, duct heat, hull
resistance and the heat exchange of battery and magnets all use the local water.

The algebraic part is solved in closed form where the physics allows (per-unit current control,
pack current for a power demand); the fixed-power mode and the speed hold's saturation use a
bracketed root (Brent) that cannot fail silently.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from sim.engine.plant import Plant
from sim.physics import battery as bat
from sim.physics.duct_heat import duct_heat_terms
from sim.physics.gas import mean_void_fraction, outlet_void_fraction
from sim.physics.open_field import hull_friction_change_n, open_field_point, prepare_open_field
from sim.physics.roots import brent_root as brentq
from sim.physics.route import route_values, tidal_current_m_s
from sim.physics.seawater import water_state
from sim.physics.thruster import U_FLOOR_M_S, ScalarPoint, prepare_scalar, scalar_point

I_V, I_XG, I_XW, I_SOC, I_RC1, I_RC2, I_TB = range(7)
N_FIXED = 7

ACC_NAMES = (
    "energy_pack_terminal_j",  # ∫ V_term·I_pack dt
    "energy_pack_ocv_j",  # ∫ OCV·I_pack dt (chemical energy drawn)
    "energy_joule_j",
    "energy_electrode_j",
    "energy_friction_j",
    "energy_wake_j",
    "energy_drive_loss_j",
    "energy_hotel_j",
    "energy_useful_j",  # ∫ ΣT·V dt
    "energy_hull_j",  # ∫ R·V dt
    "charge_c",  # ∫ I_pack dt
    "h2_mol",
    "cl2_mol",
    "o2_mol",
    "energy_busbar_j",  # ∫ I²·R_extra dt (busbar heat, outside the cells)
    "energy_hull_interaction_j",  # ∫ (Σ T·V_A − T_eff·V) dt (wake and thrust deduction)
)


@dataclasses.dataclass
class Control:
    """What the drive is asked to do during a leg (mutable only between integration segments)."""

    mode: str  # 'voltage' | 'current' | 'power' | 'speed'
    setpoint: float
    derate: float = 1.0
    hotel_w: float = 0.0
    feedforward_v: float = 0.0
    kp_v_per_m_s: float = 0.0
    ki_v_per_m: float = 0.0

    @property
    def target(self) -> float:
        """The setpoint after derating (speed holds derate the target speed)."""
        return self.setpoint * self.derate


class Layout:
    """Indices of the state vector for a plant."""

    def __init__(self, plant: Plant) -> None:
        self.n_thr = len(plant.thrusters)
        self.i_mag = N_FIXED
        self.i_pi = N_FIXED + self.n_thr
        self.i_acc = self.i_pi + 1
        self.acc = {name: self.i_acc + k for k, name in enumerate(ACC_NAMES)}
        self.size = self.i_acc + len(ACC_NAMES)
        # per design with a tracked sacrificial anode: ∫|I_anodes| dt of one unit [C]
        # (only then: a plant without one keeps its state vector, and its logs, unchanged)
        self.i_anode: dict[int, int] = {}
        for k, u in enumerate(plant.thrusters):
            if u.sacrificial_anode is not None and u.anode_mass_kg is not None:
                self.i_anode[k] = self.size
                self.size += 1


def initial_state(
    plant: Plant, soc: float, speed_m_s: float, battery_c: float, magnet_c: float
) -> np.ndarray:
    lay = Layout(plant)
    y = np.zeros(lay.size)
    y[I_V] = speed_m_s
    y[I_SOC] = soc
    y[I_TB] = battery_c
    y[lay.i_mag : lay.i_mag + lay.n_thr] = magnet_c
    return y


class Snapshot:
    """The algebraic solution at one instant (plain floats; per-thruster lists)."""

    __slots__ = (
        "busbar_w",
        "cell_voltage_v",
        "charge_folded",
        "cl2",
        "command_v",
        "current_a",
        "current_m_s",
        "drc1",
        "drc2",
        "drive_loss_w",
        "duct_joule_rise_k",
        "duct_rise_k",
        "electrode_heat_w",
        "electrode_w",
        "feasible",
        "field_t",
        "flow_work_w",
        "folded",
        "friction_w",
        "h2",
        "hotel_w",
        "interaction_w",
        "joule_w",
        "o2",
        "ocv_v",
        "ops",
        "pack_current_a",
        "pack_headroom_w",
        "pack_heat_w",
        "pack_power_w",
        "pack_voltage_v",
        "resistance_n",
        "saturated",
        "thr_power_w",
        "thrust_n",
        "total_thrust_n",
        "voltage_v",
        "wake_w",
        "water",
    )


class VesselModel:
    """Right-hand side and algebraic outputs for one plant; holds the current Control.

    The object is the single place where run-time state outside the state vector lives.
    """

    def __init__(self, plant: Plant) -> None:
        self.plant = plant
        self.lay = Layout(plant)
        self._cache_key: tuple | None = None
        self._cache: Snapshot | None = None
        self._control = Control(mode="voltage", setpoint=0.0, hotel_w=plant.hotel_w)
        self._consts = self._prepare(plant.water)
        self._key_zero = bytes(8 * (I_SOC - I_XG))
        self.n_rhs = 0
        self._water_cache: dict[tuple[float, float], tuple] = {}
        self._water_key: tuple[float, float] | None = None
        self._t_eval = 0.0  # time of the evaluation under way (the water may depend on it)
        # per-design constants, gathered once (attribute look-ups on every call cost as much
        # as the arithmetic): units per design; the magnets' state indices, thermal
        # conductances [W/K] and heat capacities [J/K]; the designs with a tracked anode
        lay, units = self.lay, plant.thrusters
        self._i_acc = lay.i_acc
        self._water_varies = plant.water_varies
        self._mass_kg = plant.total_mass_kg
        self._units = tuple(u.units for u in units)
        self._magnet_i = tuple(range(lay.i_mag, lay.i_mag + lay.n_thr))
        self._magnet_g = tuple(u.magnet_conductance_w_k for u in units)
        self._magnet_c = tuple(u.magnet_heat_capacity_j_k for u in units)
        self._anodes = tuple((k, units[k].series_factor) for k in lay.i_anode)
        # rhs lists the derivatives in state order: the anode charges follow the accumulators
        assert list(lay.i_anode.values()) == list(range(lay.i_acc + len(ACC_NAMES), lay.size))

    WATER_CACHE_SIZE = 64
    """Water states (and thruster constants) kept for a route [-]."""

    def _prepare(self, water) -> list:
        """The thrusters' constants for one water state (a duct's or an open-field array's)."""
        return [
            prepare_scalar(u.duct, water)
            if u.open_field is None
            else prepare_open_field(u.open_field, water)
            for u in self.plant.thrusters
        ]

    def local_water(self, t: float, y: np.ndarray):
        """The water at the vessel and the current along the track: (WaterState, current
        [m/s], practical salinity [-], temperature [°C]); sets the thrusters' constants for that
        water. Without a route or tide: the plant's water and steady current."""
        p = self.plant
        cur = p.water_current_m_s
        if p.tide is not None:
            cur += float(tidal_current_m_s(p.tide, t))
        r = p.route
        if r is None:
            return p.water, cur, p.water.sp, p.water.t_c
        pos = float(y[I_XG]) if r.axis == "distance" else t
        sp, tc, rc = route_values(r, pos)
        sp, tc = float(sp), float(tc)
        cur += float(rc)
        key = (sp, tc)
        if key != self._water_key:
            hit = self._water_cache.get(key)
            if hit is None:
                ws = water_state(sp, tc, r.p_dbar)
                hit = (ws, self._prepare(ws))
                if len(self._water_cache) >= self.WATER_CACHE_SIZE:
                    self._water_cache.pop(next(iter(self._water_cache)))
                self._water_cache[key] = hit
            self._water, self._consts = hit
            self._water_key = key
        return self._water, cur, sp, tc

    @property
    def control(self) -> Control:
        """The active command. Assigning a new one clears the cached algebraic solution; after
        changing a field of it in place, call :meth:`invalidate`."""
        return self._control

    @control.setter
    def control(self, value: Control) -> None:
        self._control = value
        self._cache_key = None

    def invalidate(self) -> None:
        """Forget the cached algebraic solution (the command changed in place)."""
        self._cache_key = None

    # ------------------------------------------------------------------ thrusters
    def field_t(self, k: int, magnet_c: float) -> float:
        u = self.plant.thrusters[k]
        if u.alpha_br_per_k == 0.0:
            return u.b_ref_tesla
        return u.b_ref_tesla * (1.0 + u.alpha_br_per_k * (magnet_c - u.t_ref_c))

    def _point(self, k: int, speed: float, b: float, volts=None, amps=None):
        """Operating point of one unit of thruster design k (plain floats) at the vessel's
        speed through water: the intakes see V·(1 − w); with the channels in series the unit
        voltage is N × the channel voltage and the unit current the channel current (the
        physics solves the parallel equivalent, which has the same power, thrust, losses and
        gas)."""
        kc = self._consts[k]
        u = self.plant.thrusters[k]
        if u.wake_fraction != 0.0:
            speed = speed * (1.0 - u.wake_fraction)
        if u.open_field is not None:
            return self._open_field_point(kc, u, speed, b, volts, amps)
        kc.b = b
        n = u.series_factor
        if u.sacrificial_anode is not None:
            op = self._point_n(kc, u, speed, volts, amps, n)
            # the anode metal dissolves instead of evolving gas: no O2 (nor Cl2) at the anode;
            # the cathode's hydrogen stays
            return op._replace(o2_mol_s=0.0, cl2_mol_s=0.0)
        return self._point_n(kc, u, speed, volts, amps, n)

    @staticmethod
    def _open_field_point(kc, u, speed, b, volts, amps):
        """One open-field array as a :class:`~sim.physics.thruster.ScalarPoint`.

        Ductless, so: thrust = the Lorentz force F on the water (the hull feels F − ΔD: the
        friction increase ΔD of the accelerated boundary layer is counted like a thrust
        deduction, see :meth:`_evaluate`); duct velocity = the ship speed (the water passes the
        array at V0: induced velocity neglected); flow work = F·V0, the Lorentz work on the
        passing water; no duct friction, no jet (wake) loss within the model; no duct heating
        (the Joule heat goes into the open sea)."""
        d = u.duct
        op = open_field_point(
            kc,
            speed,
            voltage_v=volts,
            current_a=amps,
            field_scale=b / u.b_ref_tesla if u.b_ref_tesla != 0.0 else 0.0,
            electrode_drop_v=d.electrode_drop_v,
            galvanic_offset_v=d.galvanic_offset_v,
            chlorine_fraction=d.chlorine_fraction,
            anodic_gas=u.sacrificial_anode is None,
        )
        return ScalarPoint(
            op.lorentz_force_n,
            op.current_a,
            op.voltage_v,
            speed,
            op.electrical_power_w,
            op.joule_loss_w,
            op.electrode_loss_w,
            0.0,
            0.0,
            op.flow_work_w,
            0.0,
            op.h2_mol_s,
            op.cl2_mol_s,
            op.o2_mol_s,
        )

    @staticmethod
    def _point_n(kc, u, speed, volts, amps, n):
        if n == 1:
            return scalar_point(
                kc,
                speed,
                voltage_v=volts,
                current_a=amps,
                chlorine_fraction=u.duct.chlorine_fraction,
            )
        op = scalar_point(
            kc,
            speed,
            voltage_v=None if volts is None else volts / n,
            current_a=None if amps is None else amps * n,
            chlorine_fraction=u.duct.chlorine_fraction,
        )
        return op._replace(voltage_v=op.voltage_v * n, current_a=op.current_a / n)

    def _unit_op(self, k: int, speed: float, volts: float, b: float):
        """Operating point of one unit of thruster k at a commanded voltage, with the unit's
        converter current limit applied (the converter then regulates current)."""
        op = self._point(k, speed, b, volts=volts)
        imax = self.plant.drive_max_current_a
        if abs(op.current_a) > imax:
            return self._point(k, speed, b, amps=math.copysign(imax, volts)), True
        return op, False

    def _all_units(self, speed: float, volts: float, fields: list[float]):
        ops, sat = [], False
        for k in range(len(self.plant.thrusters)):
            op, s = self._unit_op(k, speed, volts, fields[k])
            ops.append(op)
            sat = sat or s
        return ops, sat

    def _voltage_for_power(
        self, power_w: float, speed: float, fields: list[float], sign: float = 1.0
    ) -> tuple[float, bool]:
        """Thruster voltage (of the given sign) at which all thrusters together take
        ``power_w`` [W]; the drive's maximum voltage when they cannot. Returns (volts,
        saturated). Electrical power rises monotonically with |V| beyond the electrode drop,
        so a bracketed root (Brent) always exists on [0, V_max]."""
        vmax = self.plant.drive_max_voltage_v
        if power_w <= 0.0:
            return 0.0, False

        def excess(v: float) -> float:
            return self._power_of(self._ops_for("voltage", sign * v, speed, fields)[0]) - power_w

        if excess(vmax) <= 0.0:
            return sign * vmax, True
        v = brentq(excess, 0.0, vmax, xtol=1e-9, rtol=1e-12, maxiter=200)
        return sign * v, False

    # ------------------------------------------------------------------ algebra
    def evaluate(self, t: float, y: np.ndarray) -> Snapshot:
        # the algebra reads only the dynamic states (not t, the distances or the accumulators),
        # unless the water changes along the route or with time
        key = y[: self._i_acc].tobytes()
        if self._water_varies:
            key += np.float64(t).tobytes()
        elif key[8 * I_XG : 8 * I_SOC] != self._key_zero:
            key = key[: 8 * I_XG] + self._key_zero + key[8 * I_SOC :]
        if key == self._cache_key:
            return self._cache
        self._t_eval = t
        s = self._evaluate(y)
        self._cache_key, self._cache = key, s
        return s

    def _ops_for(self, mode: str, value: float, speed: float, fields: list[float]):
        """Operating points of one unit of each design for a voltage or a total current,
        within the converters' voltage range and per-unit current limit."""
        p = self.plant
        vmax = p.drive_max_voltage_v
        if mode == "voltage":
            sat = abs(value) > vmax
            ops, s2 = self._all_units(speed, max(-vmax, min(vmax, value)), fields)
            return ops, sat or s2
        per_unit = value / p.n_units  # current: shared equally, each unit under its own limit
        imax = p.drive_max_current_a
        sat = False
        if abs(per_unit) > imax:
            per_unit, sat = math.copysign(imax, per_unit), True
        ops = []
        for k in range(len(p.thrusters)):
            op = self._point(k, speed, fields[k], amps=per_unit)
            if abs(op.voltage_v) > vmax:
                op = self._point(k, speed, fields[k], volts=math.copysign(vmax, per_unit))
                sat = True
            ops.append(op)
        return ops, sat

    def _power_of(self, ops) -> float:
        """Electrical power of all units of all designs [W] (ops: one unit of each design)."""
        return sum(float(op.electrical_power_w) * m for op, m in zip(ops, self._units, strict=True))

    def pack_power_limit_w(self, soc: float, v_rc: float, temp_c: float) -> float:
        """Greatest pack power the drive may draw [W]: the cells stay at or above their minimum
        voltage plus the drive's under-voltage margin, and the pack current within its rating.

        Delegates to :func:`sim.physics.battery.pack_power_limit_w`.
        """
        return bat.pack_power_limit_w(
            self.plant.pack,
            soc,
            v_rc,
            temp_c,
            undervoltage_margin_v=self.plant.undervoltage_margin_v,
        )

    def pack_charge_limit_w(self, soc: float, v_rc: float, temp_c: float) -> float:
        """Greatest charge power the pack terminals may absorb [W]: the cells stay at or below
        their maximum voltage less the drive's over-voltage margin, and the charge current
        within its rating. Delegates to :func:`sim.physics.battery.pack_charge_limit_w`."""
        return bat.pack_charge_limit_w(
            self.plant.pack,
            soc,
            v_rc,
            temp_c,
            overvoltage_margin_v=self.plant.overvoltage_margin_v,
        )

    def _fold_regen(self, ops, target_w: float, speed: float, fields: list[float]):
        """Operating points with every unit's regenerated current scaled back by a common
        factor until all thrusters together feed back no more than ``-target_w`` [W]
        (target_w ≤ 0). The electrical power of a generating unit runs from its value at the
        full current to 0 at zero current and crosses any level in between once (beyond the
        power maximum it first grows, then falls), so the bracketed root is unique."""
        cur = [float(op.current_a) for op in ops]

        def at(lam: float):
            return [
                self._point(k, speed, fields[k], amps=(1.0 - lam) * cur[k]) for k in range(len(cur))
            ]

        def excess(lam: float) -> float:
            return self._power_of(at(lam)) - target_w

        if excess(0.0) >= 0.0:
            return ops
        lam = brentq(excess, 0.0, 1.0, xtol=1e-12, rtol=1e-12, maxiter=200)
        return at(lam)

    def duct_extras(self, s: Snapshot, speed: float) -> dict[str, list[float]]:
        """Per design: the fringing current at the channel ends [A] (all units), and the mean
        and outlet void fractions of the electrolysis gas [-], from a snapshot's operating
        points (the same closed forms as :func:`sim.physics.thruster.operating_point`).

        Notes
        -----
        See :meth:`end_current_and_gas_load`; the void fractions follow from the gas load by
        :func:`sim.physics.gas.mean_void_fraction` and
        :func:`~sim.physics.gas.outlet_void_fraction`.
        """
        end, load = self.end_current_and_gas_load(s, speed)
        vmean, vout = [], []
        for k, a in enumerate(load):
            slip = self.gas_slip(k)
            vmean.append(float(mean_void_fraction(a, slip)))
            vout.append(float(outlet_void_fraction(a, slip)))
        return {"end_current_a": end, "void_mean": vmean, "void_outlet": vout}

    def gas_slip(self, k: int) -> float:
        """Slip ratio of the gas in the channels of design k [-] (1 for an open-field array,
        whose gas load is always 0)."""
        return 1.0 if self.plant.thrusters[k].open_field is not None else self._consts[k].slip

    def end_current_and_gas_load(self, s: Snapshot, speed: float) -> tuple[list, list]:
        """Per design: the fringing current at the channel ends [A] (all units) and the gas
        load a = Q_gas/Q_water at the channel outlet [-] (0 for an open-field array: no channel
        ends, no duct for gas to fill).

        Notes
        -----
        With V_w = V − V_g − sign(I)·V_d across the water of one channel and the parallel
        equivalent current I = N·h·σ·(L·(E − uB) + Λ·V_w), E = V_w/gap, the end current is
        I_end = I·Λ·V_w/(L·(E − uB) + Λ·V_w); the gas of the core current I − I_end gives
        a = v_C·|I_core|/(N·A·max(|u|, u_floor)) (`sim.physics.gas`).
        """
        end, load = [], []
        for k, (op, u) in enumerate(zip(s.ops, self.plant.thrusters, strict=True)):
            if u.open_field is not None:
                end.append(0.0)
                load.append(0.0)
                continue
            kc = self._consts[k]
            n = u.series_factor
            i_par = float(op.current_a) * n
            v_par = float(op.voltage_v) / n
            i_end = 0.0
            if i_par != 0.0 and kc.lam != 0.0:
                vw = v_par - u.duct.galvanic_offset_v - math.copysign(kc.vd, i_par)
                ub = float(op.duct_velocity_m_s) * s.field_t[k]
                den = kc.length * (vw / kc.gap - ub) + kc.lam * vw
                i_end = i_par * kc.lam * vw / den if den != 0.0 else 0.0
            ue = max(abs(float(op.duct_velocity_m_s)), U_FLOOR_M_S)
            end.append(i_end * u.units / n)
            load.append(kc.vpc * abs(i_par - i_end) / (kc.n * kc.area * ue))
        return end, load

    def _evaluate(self, y: np.ndarray) -> Snapshot:
        p, c, lay = self.plant, self.control, self.lay
        w, current_m_s, _, _ = self.local_water(self._t_eval, y)
        x = y.tolist()  # the state as Python floats: one conversion, not one per item read
        speed = x[I_V]
        fields = [self.field_t(k, x[lay.i_mag + k]) for k in range(lay.n_thr)]
        vmax = p.drive_max_voltage_v
        saturated = False
        mode, value = c.mode, c.target
        if mode == "speed":
            cmd = c.feedforward_v + c.kp_v_per_m_s * (c.target - speed) + x[lay.i_pi]
            if cmd > vmax or cmd < -vmax:
                saturated = True
                cmd = max(-vmax, min(vmax, cmd))
            mode, value = "voltage", cmd
        elif mode == "power":
            mode, value, saturated = "voltage", *self._voltage_for_power(c.target, speed, fields)
        ops, sat = self._ops_for(mode, value, speed, fields)
        saturated = saturated or sat

        # the drive folds back when the pack cannot supply the demand within its limits
        eta = p.drive_efficiency
        soc, temp = x[I_SOC], x[I_TB]
        v_rc = x[I_RC1] + x[I_RC2]
        hotel = c.hotel_w + p.cryocooler_w
        thr = self._power_of(ops)
        folded = False
        if thr > 0:
            p_lim = self.pack_power_limit_w(soc, v_rc, temp)
            if thr / eta + hotel > p_lim:
                allowed = max(0.0, (p_lim - hotel) * eta)
                sign = 1.0 if (ops and float(ops[0].voltage_v) >= 0) else -1.0
                v_fold, _ = self._voltage_for_power(allowed, speed, fields, sign)
                ops, _ = self._ops_for("voltage", v_fold, speed, fields)
                saturated = folded = True
        # regeneration: the drive folds back what it feeds the pack when the cells would pass
        # their maximum voltage or their charge-current rating
        charge_folded = False
        if thr < 0 and thr * eta + hotel < 0:
            p_chg = self.pack_charge_limit_w(soc, v_rc, temp)
            if -(thr * eta + hotel) > p_chg:
                ops = self._fold_regen(ops, -(p_chg + hotel) / eta, speed, fields)
                saturated = charge_folded = True

        s = Snapshot()
        s.command_v = ops[0].voltage_v if ops else 0.0
        s.saturated = saturated
        s.field_t = fields
        s.ops = ops
        # per-design values and sums over all units, in one pass over the thruster designs
        thrust, current, volts, rise, jrise = [], [], [], [], []
        joule = electrode = friction = wake = flow = h2 = cl2 = o2 = thr = 0.0
        eff = gross_power = el_heat = 0.0
        for k, (op, u) in enumerate(zip(ops, p.thrusters, strict=True)):
            m = u.units
            thrust.append(op.thrust_n * m)
            current.append(op.current_a * m)
            volts.append(op.voltage_v)
            if u.open_field is not None:
                # the hull feels F − ΔD (the boundary-layer friction increase, a deduction)
                d_drag = hull_friction_change_n(self._consts[k], op.thrust_n, speed)
                rise.append(0.0)
                jrise.append(0.0)
                el_heat += u.overpotential_v * abs(op.current_a) * m
                joule += op.joule_loss_w * m
                electrode += op.electrode_loss_w * m
                flow += op.flow_work_w * m
                h2 += op.h2_mol_s * m
                cl2 += op.cl2_mol_s * m
                o2 += op.o2_mol_s * m
                thr += op.electrical_power_w * m
                eff += (op.thrust_n - math.copysign(d_drag, op.thrust_n)) * m
                gross_power += op.thrust_n * m * speed
                continue
            electrode_heat_w, _, rise_k, _ = duct_heat_terms(
                max(op.joule_loss_w, 0.0),
                max(op.friction_loss_w, 0.0),
                u.overpotential_v,
                op.current_a * u.series_factor,
                op.duct_velocity_m_s,
                u.duct.total_area_m2,
                w.rho_kg_m3,
                w.cp_j_kg_k,
            )
            rise.append(rise_k)
            jrise.append(op.outlet_temperature_rise_k)
            el_heat += electrode_heat_w * m
            joule += op.joule_loss_w * m
            electrode += op.electrode_loss_w * m
            friction += op.friction_loss_w * m
            wake += op.wake_loss_w * m
            flow += op.flow_work_w * m
            h2 += op.h2_mol_s * m
            cl2 += op.cl2_mol_s * m
            o2 += op.o2_mol_s * m
            thr += op.electrical_power_w * m
            if u.thrust_deduction != 0.0:
                eff += op.thrust_n * m * (1.0 - u.thrust_deduction)
            else:
                eff += op.thrust_n * m
            gross_power += op.thrust_n * m * speed * (1.0 - u.wake_fraction)
        s.thrust_n, s.current_a, s.voltage_v, s.duct_rise_k = thrust, current, volts, rise
        s.duct_joule_rise_k, s.electrode_heat_w = jrise, el_heat
        s.joule_w, s.electrode_w, s.friction_w, s.wake_w = joule, electrode, friction, wake
        s.flow_work_w, s.h2, s.cl2, s.o2, s.thr_power_w = flow, h2, cl2, o2, thr
        s.total_thrust_n = eff
        s.interaction_w = gross_power - eff * speed
        s.folded = folded
        s.charge_folded = charge_folded
        bus = s.thr_power_w / eta if s.thr_power_w >= 0 else s.thr_power_w * eta
        s.drive_loss_w = bus - s.thr_power_w
        s.hotel_w = hotel
        s.pack_power_w = bus + s.hotel_w
        pk = p.pack
        op = bat.solve_current_for_power(pk, soc, v_rc, temp, s.pack_power_w)
        s.feasible = bool(op.feasible)
        s.pack_headroom_w = float(op.max_power_w) - s.pack_power_w
        s.pack_current_a = float(op.current_a)
        s.pack_voltage_v = float(op.terminal_v)
        s.cell_voltage_v = float(op.cell_v)
        s.ocv_v = float(bat.ocv_v(pk, soc))
        rc = (x[I_RC1], x[I_RC2])[: pk.n_rc]
        # the cells' heat only: the busbar loss I²·R_extra warms the busbars, not the cells
        s.pack_heat_w = float(
            bat.heat_generation_w(pk, s.pack_current_a, soc, temp, rc, include_busbars=False)
        )
        s.busbar_w = float(bat.busbar_loss_w(pk, s.pack_current_a))
        d = bat.drc_dt(pk, soc, temp, s.pack_current_a, rc)
        s.drc1 = float(d[0])
        s.drc2 = float(d[1]) if pk.n_rc > 1 else 0.0
        s.water, s.current_m_s = w, current_m_s
        s.resistance_n = float(p.resistance.resistance_n(speed, w.rho_kg_m3, w.nu_m2_s))
        return s

    # ------------------------------------------------------------------ derivatives
    def rhs(self, t: float, y: np.ndarray) -> np.ndarray:
        self.n_rhs += 1
        s = self.evaluate(t, y)
        p, c = self.plant, self.control
        x = y.tolist()  # the state as Python floats (as in _evaluate)
        speed = x[I_V]
        t_water = s.water.t_c
        # the derivatives in state order, gathered in a list and made an array once (cheaper
        # than filling a zeroed array item by item; the values are the same floats)
        dy = [
            (s.total_thrust_n - s.resistance_n) / self._mass_kg,
            speed + s.current_m_s,
            speed,
            bat.dsoc_dt(p.pack, s.pack_current_a),
            s.drc1,
            s.drc2,
            bat.battery_temperature_rate_k_s(
                p.pack, s.pack_heat_w, x[I_TB], t_water, p.battery_ua_w_k
            ),
        ]
        for i, g_w_k, c_j_k, rise_k in zip(
            self._magnet_i, self._magnet_g, self._magnet_c, s.duct_rise_k, strict=True
        ):
            duct_mean_c = t_water + 0.5 * rise_k
            dy.append(g_w_k * (duct_mean_c - x[i]) / c_j_k)
        pi_rate = 0.0
        if c.mode == "speed":
            err = c.target - speed
            winding = s.saturated and (
                (err > 0 and s.command_v > 0) or (err < 0 and s.command_v < 0)
            )
            # regenerated power folded back: the drive cannot brake harder, so do not wind up
            winding = winding or (s.charge_folded and err < 0)
            pi_rate = 0.0 if winding else c.ki_v_per_m * err
        dy.append(pi_rate)
        dy += (  # the accumulated quantities, in ACC_NAMES order
            s.pack_voltage_v * s.pack_current_a,  # energy_pack_terminal_j
            s.ocv_v * s.pack_current_a,  # energy_pack_ocv_j
            s.joule_w,  # energy_joule_j
            s.electrode_w,  # energy_electrode_j
            s.friction_w,  # energy_friction_j
            s.wake_w,  # energy_wake_j
            s.drive_loss_w,  # energy_drive_loss_j
            s.hotel_w,  # energy_hotel_j
            s.total_thrust_n * speed,  # energy_useful_j
            s.resistance_n * speed,  # energy_hull_j
            s.pack_current_a,  # charge_c
            s.h2,  # h2_mol
            s.cl2,  # cl2_mol
            s.o2,  # o2_mol
            s.busbar_w,  # energy_busbar_j
            s.interaction_w,  # energy_hull_interaction_j
        )
        for k, series_factor in self._anodes:
            # every channel's anode of a unit passes the parallel-equivalent current
            dy.append(abs(float(s.ops[k].current_a)) * series_factor)
        return np.array(dy)
