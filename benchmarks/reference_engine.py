"""The obvious implementation of brinebolt's vessel dynamics, for benchmarking the engine.

Nothing here is used by the simulator. It is what one would write first: one
:func:`scipy.integrate.solve_ivp` call per leg with LSODA (rtol 1e-6), and inside the
right-hand side scalar root finders (:func:`scipy.optimize.brentq`) for everything that is
implicit — the duct velocity of each thruster at a given voltage or current, the voltage that
gives a demanded thruster power, and the pack current that delivers a demanded terminal power.

It is built from the same physics as the engine, not from a second model: the plant
(:func:`sim.engine.plant.build_plant`: seawater state, hull resistance model with housings,
added mass, duct thrusters, pack), the duct friction correlation
(:func:`sim.physics.duct.friction_terms_scalar`), the battery circuit, solver and thermal
functions of :mod:`sim.physics.battery`, and the equations of the duct thruster written out as
a residual (the energy equation of the duct, module docstring of :mod:`sim.physics.thruster`:
½ρk u² + wall friction − q = J·B·L, J = σ(E − uB), σ at the mean duct temperature). The
drive (per-unit current limit, maximum voltage, fold-back at the pack power limit) and the
speed hold (feed-forward plus PI, anti-windup, pole-placement gains) follow
:mod:`sim.engine.model` and :mod:`sim.engine.mission` as written today. From the physics
review (issue 9) it takes what the bundled runs feel: the magnets see the bulk duct temperature
rise (Joule + friction + overpotential heat, :func:`sim.physics.duct_heat.duct_heat`) and the
cells heat without the busbar loss. It leaves out what they do not use: wake fraction and
thrust deduction (0 on both vessels), charge fold-back (no regeneration), series channel wiring.

Scope: ducted jets without electrolysis gas or end effects (both bundled vessels), legs in
voltage, current, power or speed mode; leg ends by distance, duration, speed and state of
charge; triggers (goto, derate, hotel, stop) on those conditions; scheduled hotel changes;
the state-of-charge and time stop conditions. Anything else raises NotImplementedError.

State vector: speed through water [m/s], distance over ground [m], state of charge [-], two RC
voltages [V], battery temperature [°C], one magnet temperature per thruster design [°C], the
speed-hold integral [V], energy drawn at the pack terminals [J].
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from sim.engine.plant import Plant, ThrusterUnit
from sim.engine.spec import MissionSpec
from sim.physics import battery as bat
from sim.physics.duct import friction_terms_scalar
from sim.physics.duct_heat import duct_heat
from sim.physics.seawater import WaterState

BOILING_C = 100.0  # the conductivity's temperature rise is capped at boiling (thruster module)
U_FLOOR_M_S = 1e-3  # velocity floor of the Joule temperature rise (thruster module)
XTOL, RTOL_ROOT = 1e-13, 1e-12  # brentq tolerances on the duct velocity [m/s], [-]

V, X, SOC, RC1, RC2, TB = range(6)


@dataclass
class UnitPoint:
    """Operating point of ONE thruster unit (plain floats, SI)."""

    thrust_n: float
    current_a: float
    voltage_v: float
    power_w: float
    rise_k: float


class RefThruster:
    """One thruster design: duct velocity by brentq on the duct energy equation."""

    def __init__(self, unit: ThrusterUnit, w: WaterState) -> None:
        d = unit.duct
        if d.jet_model != "ducted" or d.gas_model != "none" or d.end_effects:
            raise NotImplementedError("reference: ducted jet, no gas, no end effects only")
        self.unit = unit
        self.gap, self.h, self.length, self.n = d.gap_m, d.height_m, d.length_m, d.n_channels
        self.area = d.area_per_channel_m2
        self.d_h, self.alpha, self.eps = d.hydraulic_diameter_m, d.aspect_ratio, d.rel_roughness
        self.k_in, self.k_noz, self.r = d.k_inlet, d.k_nozzle, d.nozzle_area_ratio
        self.vd, self.vg, self.wall = d.electrode_drop_v, d.galvanic_offset_v, d.wall_friction
        self.rho, self.mu, self.cp = w.rho_kg_m3, w.mu_pa_s, w.cp_j_kg_k
        self.sig_in, self.beta = w.sigma_s_m, w.dsigma_dt_s_m_k
        self.sig_cap = self.sig_in + self.beta * max(BOILING_C - w.t_c, 0.0) / 2.0

    # -- hydraulics ----------------------------------------------------------------------
    def required_dp(self, v0: float, u: float) -> float:
        """Lorentz pressure rise that sustains duct velocity u at vessel speed v0 ≥ 0 [Pa]."""
        au = abs(u)
        wall = 0.0
        if self.wall:
            fre = friction_terms_scalar(self.rho * au * self.d_h / self.mu, self.eps, self.alpha)[0]
            wall = fre * self.mu * self.length * au / (2.0 * self.d_h * self.d_h)
        q = 0.5 * self.rho * v0 * v0
        r2 = self.r * self.r
        if u >= 0.0:
            return 0.5 * self.rho * (1.0 / r2 + self.k_in + self.k_noz / r2) * u * u + wall - q
        return -(q + 0.5 * self.rho * (1.0 + self.k_in + self.k_noz) * u * u + wall)

    def sigma_voltage(self, e: float, u: float, b: float) -> float:
        """Conductivity at the mean duct temperature, voltage control [S/m]."""
        if self.beta == 0.0:
            return self.sig_in
        y = e - u * b
        g = self.beta * y * y * self.length / (2.0 * self.rho * self.cp * max(abs(u), U_FLOOR_M_S))
        return self.sig_in / (1.0 - g) if g < 1.0 - self.sig_in / self.sig_cap else self.sig_cap

    def sigma_current(self, j: float, u: float) -> float:
        """Conductivity at the mean duct temperature, current control [S/m]."""
        if self.beta == 0.0:
            return self.sig_in
        k2 = self.beta * j * j * self.length / (2.0 * self.rho * self.cp * max(abs(u), U_FLOOR_M_S))
        return min(0.5 * (self.sig_in + math.sqrt(self.sig_in**2 + 4.0 * k2)), self.sig_cap)

    @staticmethod
    def _root(f, v0: float) -> float:
        """Root of a residual increasing in u (bracket grown outwards, then brentq)."""
        lo, hi = -(v0 + 1.0), v0 + 1.0
        while f(lo) > 0.0:
            lo *= 2.0
        while f(hi) < 0.0:
            hi *= 2.0
        return brentq(f, lo, hi, xtol=XTOL, rtol=RTOL_ROOT, maxiter=200)

    def _point(self, sv, v0, u, j, sig, e, volts) -> UnitPoint:
        q_flow = self.n * self.area * u
        mdot = self.rho * q_flow
        thrust = mdot * (u / self.r - v0) if u >= 0.0 else mdot * (abs(u) + v0)
        current = j * self.n * self.h * self.length
        # the magnet sees the bulk duct temperature rise: Joule + friction + overpotential heat
        # (physics review, sim.physics.duct_heat), not the Joule rise alone
        joule = j * j / sig * (self.n * self.area * self.length)
        wall = 0.0
        if self.wall:
            re = self.rho * abs(u) * self.d_h / self.mu
            fre = friction_terms_scalar(re, self.eps, self.alpha)
            wall = fre[0] * self.mu * self.length * abs(u) / (2.0 * self.d_h * self.d_h)
        k_minor = self.k_in + self.k_noz / (self.r * self.r) if u >= 0.0 else self.k_in + self.k_noz
        friction = (0.5 * self.rho * u * u * k_minor + wall) * abs(q_flow)
        rise = duct_heat(
            max(joule, 0.0),
            max(friction, 0.0),
            self.unit.overpotential_v,
            current,
            u,
            self.n * self.area,
            self.rho,
            self.cp,
        ).rise_k
        return UnitPoint(sv * thrust, sv * current, sv * volts, volts * current, rise)

    def at_voltage(self, speed: float, volts: float, b: float) -> UnitPoint:
        sv = -1.0 if speed < 0.0 else 1.0
        v0, volts = abs(speed), sv * volts
        vg = sv * self.vg
        u_pass = self._root(lambda u: self.required_dp(v0, u), v0)  # flow with no current
        net = volts - vg - u_pass * b * self.gap
        s = 1.0 if net > self.vd else (-1.0 if net < -self.vd else 0.0)
        if s == 0.0:  # inside the electrode dead band: no current
            return self._point(sv, v0, u_pass, 0.0, self.sig_in, u_pass * b, volts)
        e = (volts - vg - s * self.vd) / self.gap
        bl = b * self.length

        def resid(u):
            return self.required_dp(v0, u) - self.sigma_voltage(e, u, b) * (e - u * b) * bl

        u = self._root(resid, v0)
        sig = self.sigma_voltage(e, u, b)
        return self._point(sv, v0, u, sig * (e - u * b), sig, e, volts)

    def at_current(self, speed: float, amps: float, b: float) -> UnitPoint:
        sv = -1.0 if speed < 0.0 else 1.0
        v0, amps = abs(speed), sv * amps
        j = amps / (self.n * self.h * self.length)
        dpl = j * b * self.length
        u = self._root(lambda u: self.required_dp(v0, u) - dpl, v0)
        sig = self.sigma_current(j, u)
        e = j / sig + u * b
        if j != 0.0:
            volts = e * self.gap + sv * self.vg + math.copysign(self.vd, amps)
        else:
            volts = u * b * self.gap + sv * self.vg
        return self._point(sv, v0, u, j, sig, e, volts)


@dataclass
class RefControl:
    mode: str
    target: float
    hotel_w: float
    ff_v: float = 0.0
    kp: float = 0.0
    ki: float = 0.0


@dataclass
class RefResult:
    t_s: float
    y: np.ndarray
    distance_m: float
    energy_j: float
    end_soc: float
    rhs_calls: int
    steps: int
    events: list = field(default_factory=list)
    rows: list = field(default_factory=list)


class ReferenceModel:
    """Right-hand side of the vessel ODE with root finders inside."""

    def __init__(self, plant: Plant) -> None:
        self.p = plant
        self.thr = [RefThruster(u, plant.water) for u in plant.thrusters]
        self.nt = len(self.thr)
        self.i_mag = 6
        self.i_pi = 6 + self.nt
        self.i_e = self.i_pi + 1
        self.size = self.i_e + 1
        self.ctl = RefControl("voltage", 0.0, plant.hotel_w)
        self.n_rhs = 0

    def fields(self, y) -> list[float]:
        out = []
        for k, u in enumerate(self.p.thrusters):
            out.append(u.b_ref_tesla * (1.0 + u.alpha_br_per_k * (y[self.i_mag + k] - u.t_ref_c)))
        return out

    # -- drive ---------------------------------------------------------------------------
    def _unit_v(self, k, speed, volts, b) -> tuple[UnitPoint, bool]:
        op = self.thr[k].at_voltage(speed, volts, b)
        imax = self.p.drive_max_current_a
        if abs(op.current_a) > imax:
            return self.thr[k].at_current(speed, math.copysign(imax, volts), b), True
        return op, False

    def ops(self, mode, value, speed, fields) -> tuple[list[UnitPoint], bool]:
        p = self.p
        vmax = p.drive_max_voltage_v
        if mode == "voltage":
            sat = abs(value) > vmax
            value = max(-vmax, min(vmax, value))
            out = []
            for k in range(self.nt):
                op, s = self._unit_v(k, speed, value, fields[k])
                out.append(op)
                sat = sat or s
            return out, sat
        per_unit, sat = value / p.n_units, False
        if abs(per_unit) > p.drive_max_current_a:
            per_unit, sat = math.copysign(p.drive_max_current_a, per_unit), True
        out = []
        for k in range(self.nt):
            op = self.thr[k].at_current(speed, per_unit, fields[k])
            if abs(op.voltage_v) > vmax:
                op = self.thr[k].at_voltage(speed, math.copysign(vmax, per_unit), fields[k])
                sat = True
            out.append(op)
        return out, sat

    def power(self, ops) -> float:
        return sum(op.power_w * u.units for op, u in zip(ops, self.p.thrusters, strict=True))

    def voltage_for_power(self, power_w, speed, fields, sign=1.0) -> float:
        vmax = self.p.drive_max_voltage_v
        if power_w <= 0.0:
            return 0.0

        def excess(v):
            return self.power(self.ops("voltage", sign * v, speed, fields)[0]) - power_w

        if excess(vmax) <= 0.0:
            return sign * vmax
        return sign * brentq(excess, 0.0, vmax, xtol=1e-9, rtol=1e-12, maxiter=200)

    def pack_current(self, soc, v_rc, temp, power_w) -> float:
        """Pack current for a terminal power: brentq on I·(E − I·R0) = P [A]."""
        pk = self.p.pack
        e = bat.ocv_v(pk, soc) - v_rc
        r = bat.r0_ohm(pk, soc, temp)
        i_peak = e / (2.0 * r)
        if power_w < 0.0 or power_w > i_peak * (e - i_peak * r):
            raise NotImplementedError(f"reference: pack power {power_w:g} W outside [0, max]")
        if power_w == 0.0:
            return 0.0
        return brentq(lambda i: i * (e - i * r) - power_w, 0.0, i_peak, xtol=1e-12, rtol=1e-13)

    def algebra(self, y) -> dict:
        p, c = self.p, self.ctl
        speed = float(y[V])
        fields = self.fields(y)
        vmax = p.drive_max_voltage_v
        sat = False
        mode, value = c.mode, c.target
        if mode == "speed":
            cmd = c.ff_v + c.kp * (c.target - speed) + float(y[self.i_pi])
            if abs(cmd) > vmax:
                sat, cmd = True, max(-vmax, min(vmax, cmd))
            mode, value = "voltage", cmd
        elif mode == "power":
            mode, value = "voltage", self.voltage_for_power(c.target, speed, fields)
            sat = value >= vmax
        ops, s2 = self.ops(mode, value, speed, fields)
        sat = sat or s2
        soc, temp = float(y[SOC]), float(y[TB])
        v_rc = float(y[RC1]) + float(y[RC2])
        hotel = c.hotel_w + p.cryocooler_w
        thr = self.power(ops)
        eta = p.drive_efficiency
        if thr > 0.0:  # fold-back at the pack power limit
            p_lim = bat.pack_power_limit_w(
                p.pack, soc, v_rc, temp, undervoltage_margin_v=p.undervoltage_margin_v
            )
            if thr / eta + hotel > p_lim:
                sign = 1.0 if ops[0].voltage_v >= 0.0 else -1.0
                v = self.voltage_for_power(max(0.0, (p_lim - hotel) * eta), speed, fields, sign)
                ops, _ = self.ops("voltage", v, speed, fields)
                thr, sat = self.power(ops), True
        bus = thr / eta if thr >= 0.0 else thr * eta
        p_pack = bus + hotel
        i_pack = self.pack_current(soc, v_rc, temp, p_pack)
        return {
            "ops": ops,
            "sat": sat,
            "cmd": ops[0].voltage_v,
            "thrust": sum(op.thrust_n * u.units for op, u in zip(ops, p.thrusters, strict=True)),
            "i_pack": i_pack,
            "p_pack": p_pack,
        }

    def rhs(self, t, y) -> np.ndarray:
        self.n_rhs += 1
        p, c = self.p, self.ctl
        a = self.algebra(y)
        speed, soc, temp = float(y[V]), float(y[SOC]), float(y[TB])
        w = p.water
        pk = p.pack
        i = a["i_pack"]
        rc = (float(y[RC1]), float(y[RC2]))[: pk.n_rc]
        dy = np.zeros(self.size)
        drag = p.resistance.resistance_n(speed, w.rho_kg_m3, w.nu_m2_s)
        dy[V] = (a["thrust"] - drag) / p.total_mass_kg
        dy[X] = speed + p.water_current_m_s
        dy[SOC] = bat.dsoc_dt(pk, i)
        d = bat.drc_dt(pk, soc, temp, i, rc)
        dy[RC1] = d[0]
        dy[RC2] = d[1] if pk.n_rc > 1 else 0.0
        # the cells' heat only: the busbar loss warms the busbars (physics review)
        heat = bat.heat_generation_w(pk, i, soc, temp, rc, include_busbars=False)
        dy[TB] = bat.battery_temperature_rate_k_s(pk, heat, temp, w.t_c, p.battery_ua_w_k)
        for k, (u, op) in enumerate(zip(p.thrusters, a["ops"], strict=True)):
            dy[self.i_mag + k] = (
                u.magnet_conductance_w_k
                * (w.t_c + 0.5 * op.rise_k - y[self.i_mag + k])
                / u.magnet_heat_capacity_j_k
            )
        if c.mode == "speed":
            err = c.target - speed
            wind = a["sat"] and ((err > 0 and a["cmd"] > 0) or (err < 0 and a["cmd"] < 0))
            dy[self.i_pi] = 0.0 if wind else c.ki * err
        dy[self.i_e] = a["p_pack"]  # terminal power = V_term·I by construction of the solve
        return dy

    # -- speed hold ------------------------------------------------------------------------
    def tune(self, y, leg) -> None:
        """Feed-forward (steady voltage at the target speed) and PI gains by pole placement,
        as the engine tunes a speed hold (critically damped, τ = m/(2·damping) in [2, 600] s)."""
        p, c = self.p, self.ctl
        target, vmax = c.target, p.drive_max_voltage_v
        fields = self.fields(y)
        drag = p.resistance.resistance_n
        w = p.water

        def net(v, speed):
            ops, _ = self.ops("voltage", v, speed, fields)
            thrust = sum(op.thrust_n * u.units for op, u in zip(ops, p.thrusters, strict=True))
            return thrust - drag(speed, w.rho_kg_m3, w.nu_m2_s)

        if target == 0.0:
            ff = 0.0
        elif net(vmax, target) < 0.0:
            ff = vmax
        else:
            ff = brentq(lambda v: net(v, target), 0.0, vmax, xtol=1e-10, rtol=1e-13)
        c.ff_v = ff
        dv = max(1e-3, 1e-3 * target)
        lo_v = max(target - dv, 0.0)
        damping = (-net(ff, target + dv) + net(ff, lo_v)) / (target + dv - lo_v)
        gain = (net(ff * 1.01 + 1e-3, target) - net(ff, target)) / (ff * 0.01 + 1e-3)
        mass = p.total_mass_kg
        damping, gain = max(damping, 1e-6), max(gain, 1e-9)
        tau = min(max(0.5 * mass / damping, 2.0), 600.0)
        om = 1.0 / tau
        if leg.speed_gain_v_per_m_s is not None:
            c.kp = leg.speed_gain_v_per_m_s
            ti = leg.speed_reset_time_s if leg.speed_reset_time_s is not None else 2.0 * tau
            c.ki = c.kp / ti
        else:
            c.kp = max(0.0, (2.0 * mass * om - damping) / gain)
            c.ki = mass * om * om / gain
            if leg.speed_reset_time_s is not None:
                c.ki = c.kp / leg.speed_reset_time_s


def _condition_fn(cond, model: ReferenceModel, leg_x0: list[float]):
    """Event function (signed distance from the threshold) for a condition object."""
    key, thr = cond.key, cond.threshold
    if key == "distance":
        return lambda t, y: y[X] - leg_x0[0] - thr
    if key == "total_distance_above":
        return lambda t, y: y[X] - thr
    if key in ("speed_below", "speed_above"):
        return lambda t, y: y[V] - thr
    if key == "soc_below":
        return lambda t, y: y[SOC] - thr
    if key == "time_after":
        return lambda t, y: t - thr
    if key == "duration":  # in a trigger: time since the start of the active leg
        return lambda t, y: t - leg_x0[1] - thr
    raise NotImplementedError(f"reference: condition {key!r}")


def run_reference(
    plant: Plant,
    mission: MissionSpec,
    *,
    method: str = "LSODA",
    rtol: float = 1e-6,
    sample_s: float | None = None,
    chunk_s: float = math.inf,
) -> RefResult:
    """Fly a mission with the obvious implementation. Returns the end state and counts.

    With ``sample_s`` [s] the algebraic outputs (thrust, pack power and current) are also
    evaluated on the sample grid from the dense output, as the engine does for its log (kept
    in ``RefResult.rows``), so that wall times compare like with like. ``chunk_s`` [s] ends
    every solve_ivp call after at most that long (to measure what restarts cost)."""
    m = ReferenceModel(plant)
    st = mission.start
    y = np.zeros(m.size)
    y[V], y[SOC] = st.speed_m_s, st.state_of_charge
    y[TB] = st.battery_temperature_c if st.battery_temperature_c is not None else plant.water.t_c
    mag0 = st.magnet_temperature_c if st.magnet_temperature_c is not None else plant.water.t_c
    y[m.i_mag : m.i_mag + m.nt] = mag0
    atol = np.full(m.size, 1e-6)
    atol[X], atol[SOC], atol[RC1], atol[RC2], atol[m.i_e] = 1e-4, 1e-10, 1e-7, 1e-7, 1e-3
    legs = list(mission.legs)
    names = {leg.name: i for i, leg in enumerate(legs)}
    schedule = sorted((s.at_s, s.hotel_w) for s in mission.schedule)
    t, t_lim = 0.0, mission.limits.time_s
    derate, base_hotel = 1.0, plant.hotel_w
    fired: set[int] = set()
    events: list = []
    rows: list = []
    steps = 0
    leg_x0 = [0.0, 0.0]  # distance and time at the start of the active leg
    stop_soc = mission.limits.state_of_charge_min

    def start_leg(i: int, y: np.ndarray) -> tuple[int, float]:
        leg = legs[i]
        m.ctl = RefControl(
            leg.mode, leg.setpoint * derate, leg.hotel_w if leg.hotel_w is not None else base_hotel
        )
        if leg.mode == "speed":
            m.tune(y, leg)
            y[m.i_pi] = 0.0
        leg_x0[0] = float(y[X])
        leg_x0[1] = t
        events.append((t, "leg start", leg.name))
        return i, t

    li, leg_t0 = start_leg(0, y)
    while True:
        leg = legs[li]
        # a leg's duration ends it at a known time (the horizon), as in the engine
        armed = [("leg", c, li) for c in leg.until if c.key != "duration"]
        armed += [
            ("trigger", c, k)
            for k, tr in enumerate(mission.triggers)
            if k not in fired
            for c in tr.when
        ]
        fns = []
        for kind, c, owner in armed:
            g = _condition_fn(c, m, leg_x0)
            g.terminal, g.direction = True, c.direction
            fns.append((kind, c, owner, g))

        def soc_stop(t, y):
            return y[SOC] - stop_soc

        soc_stop.terminal, soc_stop.direction = True, -1
        now = next(
            (f for f in fns if (f[3](t, y) >= 0 if f[1].direction > 0 else f[3](t, y) <= 0)), None
        )
        hit = None
        if now is not None:
            hit = now
        else:
            leg_end = leg_t0 + leg.duration_s if leg.duration_s is not None else math.inf
            nxt = schedule[0][0] if schedule else math.inf
            horizon = min(t_lim, leg_end, nxt, t + chunk_s)
            sol = solve_ivp(
                m.rhs,
                (t, horizon),
                y,
                method=method,
                rtol=rtol,
                atol=atol,
                events=[f[3] for f in fns] + [soc_stop],
                dense_output=sample_s is not None,
            )
            if sol.status == -1:
                raise RuntimeError(f"reference integrator failed: {sol.message}")
            steps += len(sol.t) - 1
            t0, t, y = t, float(sol.t[-1]), sol.y[:, -1].copy()
            if sol.status == 1:
                best, idx = math.inf, None
                for k, te in enumerate(sol.t_events):
                    if len(te) and te[0] < best:
                        best, idx = float(te[0]), k
                t, y = best, sol.y_events[idx][0].copy()
            if sample_s is not None:  # the algebraic outputs on the sample grid, as a log has
                ts = np.arange(math.floor(t0 / sample_s) + 1, math.ceil(t / sample_s)) * sample_s
                for tk, yk in zip(ts, sol.sol(ts).T, strict=True):
                    a = m.algebra(yk)
                    rows.append((tk, yk[V], yk[X], yk[SOC], a["thrust"], a["p_pack"], a["i_pack"]))
            if sol.status == 1:
                if idx == len(fns):
                    events.append((t, "stop", "pack empty"))
                    break
                hit = fns[idx]
            else:
                if schedule and t >= schedule[0][0]:
                    base_hotel = schedule.pop(0)[1]
                    if leg.hotel_w is None:
                        m.ctl.hotel_w = base_hotel
                    events.append((t, "schedule", base_hotel))
                if t >= t_lim:
                    events.append((t, "stop", "time limit"))
                    break
                if t >= leg_end:
                    events.append((t, "leg end", leg.name))
                    if li + 1 >= len(legs):
                        break
                    li, leg_t0 = start_leg(li + 1, y)
                continue
        kind, c, owner, _ = hit
        if kind == "leg":
            events.append((t, "leg end", leg.name))
            if li + 1 >= len(legs):
                break
            li, leg_t0 = start_leg(li + 1, y)
            continue
        tr = mission.triggers[owner]
        fired.add(owner)
        events.append((t, "trigger", tr.name))
        if tr.then == "stop":
            break
        if tr.then == "goto":
            li, leg_t0 = start_leg(names[tr.leg], y)
        elif tr.then == "derate":
            derate *= tr.factor
            m.ctl.target = legs[li].setpoint * derate
        elif tr.then == "hotel":
            base_hotel = tr.hotel_w
            if legs[li].hotel_w is None:
                m.ctl.hotel_w = base_hotel
        else:
            raise NotImplementedError(f"reference: trigger action {tr.then!r}")
    return RefResult(
        t_s=t,
        y=y,
        distance_m=float(y[X]),
        energy_j=float(y[m.i_e]),
        end_soc=float(y[SOC]),
        rhs_calls=m.n_rhs,
        steps=steps,
        events=events,
        rows=rows,
    )
