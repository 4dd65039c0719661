"""Pack endurance: how long a pack delivers a constant terminal power before a cut-off.

The pack's equivalent circuit (state of charge, RC voltages and lumped battery temperature,
:mod:`sim.physics.battery`) is integrated at a constant terminal power until the first of: the
state of charge reaches its minimum, the pack can no longer deliver the demanded power within its
limits (:func:`sim.physics.battery.pack_power_limit_w`, the engine's own limit: cells at their
minimum voltage plus the drive's under-voltage margin, the pack current rating, the circuit's
power maximum), or the battery reaches its temperature limit. So voltage sag at the demanded
power is accounted for, not just stored energy ÷ power (:func:`stored_energy_j`). That power
limit is the moment the drive would start to fold back in a time-domain run, so the speed could
no longer be held.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.integrate import solve_ivp

from sim.engine.plant import Plant
from sim.physics import battery as bat

__all__ = [
    "CUT_NONE",
    "CUT_POWER",
    "CUT_SOC",
    "CUT_TEMP",
    "CUT_TIME",
    "DEFAULT_MAX_TIME_S",
    "DEFAULT_TEMP_MAX_C",
    "PackEndurance",
    "pack_endurance",
    "stored_energy_j",
]

CUT_SOC = "state of charge at its minimum"
CUT_POWER = "pack power limit (cell voltage floor, current rating or power maximum)"
CUT_TEMP = "battery temperature limit"
CUT_TIME = "time cap reached"
CUT_NONE = "no discharge (the demand is zero or negative)"

DEFAULT_TEMP_MAX_C = 60.0
"""Battery temperature cut-off [°C] when none is given (the scenario files' default limit)."""

DEFAULT_MAX_TIME_S = 1.0e7
"""Longest endurance integrated [s] (about 116 days); longer is reported as the cap."""


@dataclass(frozen=True)
class PackEndurance:
    """How long a pack delivers a constant terminal power, from a given state, to cut-off.

    Attributes
    ----------
    power_w : demanded pack terminal power [W]
    time_s : endurance to cut-off [s] (inf when nothing is drawn)
    energy_j : terminal energy delivered, power × time [J]
    charge_c : charge delivered [C]
    start_soc, end_soc : state of charge at the start and at cut-off [-]
    end_cell_v : cell terminal voltage at the demanded power at cut-off [V]
    end_temp_c : battery temperature at cut-off [°C]
    cutoff : what ended the discharge (one of the ``CUT_*`` texts)
    """

    power_w: float
    time_s: float
    energy_j: float
    charge_c: float
    start_soc: float
    end_soc: float
    end_cell_v: float
    end_temp_c: float
    cutoff: str


def _rc_tuple(pack: bat.Pack, v_rc) -> tuple[float, ...]:
    if v_rc is None:
        return (0.0,) * pack.n_rc
    if np.isscalar(v_rc):
        return (float(v_rc),) + (0.0,) * (pack.n_rc - 1)
    vals = tuple(float(v) for v in v_rc)[: pack.n_rc]
    return vals + (0.0,) * (pack.n_rc - len(vals))


def _power_limit_w(plant: Plant, soc: float, v_rc: float, temp_c: float) -> float:
    """Greatest pack terminal power the drive may draw [W] at state of charge ``soc`` [-], summed
    RC voltage ``v_rc`` [V] and battery temperature ``temp_c`` [°C]."""
    return bat.pack_power_limit_w(
        plant.pack, soc, v_rc, temp_c, undervoltage_margin_v=plant.undervoltage_margin_v
    )


def pack_endurance(
    plant: Plant,
    power_w: float,
    *,
    soc: float,
    v_rc=None,
    temp_c: float | None = None,
    soc_min: float = 0.0,
    temp_max_c: float = DEFAULT_TEMP_MAX_C,
    max_time_s: float = DEFAULT_MAX_TIME_S,
) -> PackEndurance:
    """Endurance of the plant's pack at a constant terminal power, integrated to cut-off.

    Parameters
    ----------
    plant : Plant
        Supplies the pack, the drive's under-voltage margin, the battery's thermal conductance
        and the water temperature.
    power_w : float
        Demanded pack terminal power [W] (propulsion through the drive plus hotel loads).
    soc : float
        Starting state of charge [-].
    v_rc : float or sequence, optional
        Starting RC-pair voltages [V] (one per pair; a float is the first pair). Default 0 (a
        rested pack).
    temp_c : float, optional
        Starting battery temperature [°C]; default the water temperature.
    soc_min : float
        Cut-off state of charge [-].
    temp_max_c : float
        Battery temperature cut-off [°C] (a scenario's ``limits.battery_temperature_max``).
    max_time_s : float
        Longest time integrated [s].

    Returns
    -------
    PackEndurance

    Notes
    -----
    Integrates dSOC/dt = −I/(3600 Q), dV_k/dt = I/C_k − V_k/(R_k C_k) and the lumped thermal
    balance m c_p dT/dt = Q_heat − UA (T − T_water), with I solving I (OCV − ΣV_k − I R0) = P at
    every instant (:func:`sim.physics.battery.solve_current_for_power`). It stops when SOC
    reaches ``soc_min``, P exceeds :func:`~sim.physics.battery.pack_power_limit_w` or the battery
    reaches ``temp_max_c``. With R0 = R_k = 0
    this reduces to t = 3600 Q ∫ OCV dSOC / P, the stored energy over the power.

    References
    ----------
    Plett, G. L. (2015). Battery Management Systems, Vol. I: Battery Modeling, ch. 2. Artech
    House (equivalent circuit); Bernardi, Pawlikowski & Newman (1985), J. Electrochem. Soc.
    132(1), 5–12 (heat balance).
    """
    pack = plant.pack
    n_rc = pack.n_rc
    rc0 = _rc_tuple(pack, v_rc)
    t0 = plant.water.t_c if temp_c is None else float(temp_c)
    p = float(power_w)
    soc = float(soc)

    def cell_v(s, rc, temp):
        return float(bat.solve_current_for_power(pack, s, sum(rc), temp, p).cell_v)

    def result(time_s, s, rc, temp, cutoff, charge):
        return PackEndurance(
            power_w=p,
            time_s=time_s,
            energy_j=p * time_s if math.isfinite(time_s) else math.inf,
            charge_c=charge,
            start_soc=soc,
            end_soc=s,
            end_cell_v=cell_v(s, rc, temp),
            end_temp_c=temp,
            cutoff=cutoff,
        )

    if p <= 0.0:
        return result(math.inf, soc, rc0, t0, CUT_NONE, 0.0)
    if soc <= soc_min:
        return result(0.0, soc, rc0, t0, CUT_SOC, 0.0)
    if t0 >= temp_max_c:
        return result(0.0, soc, rc0, t0, CUT_TEMP, 0.0)
    if p > _power_limit_w(plant, soc, sum(rc0), t0):
        return result(0.0, soc, rc0, t0, CUT_POWER, 0.0)

    t_water, ua = plant.water.t_c, plant.battery_ua_w_k

    def rhs(_t, y):
        s, temp = float(y[0]), float(y[-2])
        rc = tuple(float(v) for v in y[1 : 1 + n_rc])
        i = float(bat.solve_current_for_power(pack, s, sum(rc), temp, p).current_a)
        d_rc = bat.drc_dt(pack, s, temp, i, rc)
        heat = float(bat.heat_generation_w(pack, i, s, temp, rc))
        d_t = float(bat.battery_temperature_rate_k_s(pack, heat, temp, t_water, ua))
        return [float(bat.dsoc_dt(pack, i)), *(float(v) for v in d_rc), d_t, i]

    def soc_event(_t, y):
        return float(y[0]) - soc_min

    def power_event(_t, y):
        rc = y[1 : 1 + n_rc]
        return _power_limit_w(plant, float(y[0]), float(np.sum(rc)), float(y[-2])) - p

    def temp_event(_t, y):
        return temp_max_c - float(y[-2])

    for ev in (soc_event, power_event, temp_event):
        ev.terminal, ev.direction = True, -1
    y0 = np.array([soc, *rc0, t0, 0.0])
    atol = np.array([1e-12, *([1e-9] * n_rc), 1e-8, 1e-6])
    sol = solve_ivp(
        rhs,
        (0.0, max_time_s),
        y0,
        method="LSODA",
        events=[soc_event, power_event, temp_event],
        rtol=1e-9,
        atol=atol,
    )
    if sol.status == -1:
        raise RuntimeError(f"pack endurance integration failed: {sol.message}")
    cutoff, t_end, y_end = CUT_TIME, float(sol.t[-1]), sol.y[:, -1]
    best = math.inf
    names = (CUT_SOC, CUT_POWER, CUT_TEMP)
    for name, te, ye in zip(names, sol.t_events, sol.y_events, strict=True):
        if len(te) and te[0] < best:
            best, cutoff, t_end, y_end = float(te[0]), name, float(te[0]), ye[0]
    rc_end = tuple(float(v) for v in y_end[1 : 1 + n_rc])
    return result(t_end, float(y_end[0]), rc_end, float(y_end[-2]), cutoff, float(y_end[-1]))


def stored_energy_j(pack: bat.Pack, soc_from: float, soc_to: float) -> float:
    """Open-circuit energy stored between two states of charge, 3600 Q ∫ OCV dSOC [J].

    Exact for the piecewise-linear OCV table (trapezoids between the table's breakpoints).
    """
    if soc_to >= soc_from:
        return 0.0
    xs = np.array(pack.cell.soc_points)
    inner = xs[(xs > soc_to) & (xs < soc_from)]
    s = np.concatenate([[soc_to], inner, [soc_from]])
    v = np.asarray(bat.ocv_v(pack, s))
    return float(3600.0 * pack.capacity_ah * np.sum(0.5 * (v[1:] + v[:-1]) * np.diff(s)))
