"""Fly a mission: legs, triggers, scheduled changes and stop conditions over one clock.

The continuous dynamics are integrated by :func:`scipy.integrate.solve_ivp` between discrete
events; state events (leg ends, triggers, stop conditions) are terminal events located by the
integrator's root finder on its dense output. Discrete events that are known in advance (scheduled
hotel-load changes) live on a :mod:`simpy` environment, whose clock is the run's clock: every
integration segment ends no later than the environment's next scheduled event.

Nothing here writes files or prints: observers receive samples, events and leg summaries
(:class:`RunObserver`).
"""

from __future__ import annotations

import math
import operator
import time as _time
from collections.abc import Mapping
from dataclasses import dataclass, field

import numpy as np
import simpy

from sim.engine.conditions import (
    AnodeSpent,
    BatteryTemperatureAbove,
    CellVoltageBelow,
    Condition,
    DuctTemperatureRiseAbove,
    Duration,
    MagnetGradeLimit,
    MagnetTemperatureAbove,
    PackHeadroomExhausted,
    SocBelow,
)
from sim.engine.integrator import METHOD as STEPPER_METHOD
from sim.engine.integrator import TRBDF2, IntegratorFailure, all_finite
from sim.engine.model import (
    ACC_NAMES,
    I_RC1,
    I_RC2,
    I_SOC,
    I_TB,
    I_V,
    I_XG,
    I_XW,
    Control,
    VesselModel,
    initial_state,
)
from sim.engine.plant import Plant, anode_spent_charge_c
from sim.engine.spec import LegSpec, MissionSpec, TriggerSpec
from sim.engine.steady import SteadyError, steady_at_speed
from sim.engine.summary import SUMMARY_UNITS, summarise
from sim.physics import battery as bat
from sim.physics.constants import KNOT_M_S
from sim.physics.gas import mean_void_fraction, outlet_void_fraction
from sim.physics.roots import brent_root

__all__ = [
    "SUMMARY_UNITS",  # re-exported from sim.engine.summary
    "MissionRunner",
    "RunObserver",
    "RunResult",
    "SolverFailure",
]


class SolverFailure(RuntimeError):
    """The integrator failed or the model had no solution; carries where it happened."""

    def __init__(self, message: str, t: float, leg: str, state: dict) -> None:
        self.t, self.leg, self.state = t, leg, state
        super().__init__(
            f"{message} at t = {t:.3f} s in leg {leg!r}; state: "
            + ", ".join(f"{k} = {v:.6g}" for k, v in state.items())
        )


# ------------------------------------------------------------------ outputs


def channel_specs(plant: Plant) -> dict[str, tuple[str, str, int | None, str]]:
    """name -> (units, description, columns (None for 1-D), dtype) of every logged series."""
    n = len(plant.thrusters)
    f = "float64"
    return {
        "time_s": ("s", "mission time", None, f),
        "leg_index": ("1", "index of the active leg (0-based)", None, "int32"),
        "speed_through_water_m_s": ("m/s", "vessel speed relative to the water", None, f),
        "speed_over_ground_m_s": (
            "m/s",
            "speed through water plus the along-track current",
            None,
            f,
        ),
        "distance_m": ("m", "distance over ground along the track", None, f),
        "distance_through_water_m": ("m", "distance travelled relative to the water", None, f),
        "thrust_n": ("N", "thrust of each thruster design (all its units)", n, f),
        "thruster_current_a": ("A", "current of each thruster design (all its units)", n, f),
        "thruster_voltage_v": ("V", "electrode voltage of each thruster design", n, f),
        "field_t": ("T", "mean gap field of each thruster design", n, f),
        "duct_temperature_rise_k": (
            "K",
            "bulk outlet minus inlet water temperature, each design: (Joule + friction + "
            "electrode overpotential heat) / (mass flow × c_p)",
            n,
            f,
        ),
        "duct_joule_rise_k": ("K", "the Joule-heat part of duct_temperature_rise_k", n, f),
        "magnet_temperature_c": ("degC", "lumped magnet temperature of each design", n, f),
        "effective_thrust_n": (
            "N",
            "thrust felt by the hull, Σ T·(1 − thrust deduction), all designs",
            None,
            f,
        ),
        "end_current_a": (
            "A",
            "current fringing beyond the channel ends, each design (0 without end effects)",
            n,
            f,
        ),
        "void_fraction_mean": ("1", "mean electrolysis-gas void fraction, each design", n, f),
        "void_fraction_outlet": ("1", "electrolysis-gas void fraction at the outlet", n, f),
        "hull_resistance_n": ("N", "calm-water resistance incl. thruster housings", None, f),
        "thruster_power_w": ("W", "electrical power into all thrusters (V·I)", None, f),
        "pack_power_w": ("W", "power drawn from the battery pack terminals", None, f),
        "pack_current_a": ("A", "battery pack current (discharge positive)", None, f),
        "pack_voltage_v": ("V", "battery pack terminal voltage", None, f),
        "cell_voltage_v": ("V", "terminal voltage per cell", None, f),
        "state_of_charge": ("1", "battery state of charge", None, f),
        "battery_temperature_c": ("degC", "lumped battery temperature", None, f),
        "battery_heat_w": ("W", "heat generated in the cells (busbar loss excluded)", None, f),
        "busbar_loss_w": ("W", "I²·R of the pack's busbars, fuses and contactors", None, f),
        "pack_charge_limit_w": (
            "W",
            "greatest charge power the pack accepts (cell maximum voltage less the drive's "
            "margin, charge-current rating)",
            None,
            f,
        ),
        "charge_folded": (
            "1",
            "1 while the drive folds back regenerated power to the pack's charge limit",
            None,
            "int32",
        ),
        "joule_loss_w": ("W", "ohmic heating of the water in the ducts (J²/σ)", None, f),
        "electrode_loss_w": (
            "W",
            "electrode drop × current (decomposition, overpotential, galvanic offset)",
            None,
            f,
        ),
        "electrode_heat_w": (
            "W",
            "overpotential × current: the part of the electrode loss released as heat at the "
            "electrode surfaces",
            None,
            f,
        ),
        "friction_loss_w": ("W", "duct friction and inlet/nozzle losses", None, f),
        "wake_loss_w": ("W", "kinetic energy left in the jet (momentum theory)", None, f),
        "drive_loss_w": ("W", "power-electronics loss", None, f),
        "hotel_power_w": ("W", "hotel and cryocooler loads", None, f),
        "useful_power_w": ("W", "effective thrust × speed through water", None, f),
        "hull_interaction_power_w": (
            "W",
            "Σ T·V·(1 − w) − effective thrust × V: wake and thrust-deduction share",
            None,
            f,
        ),
        "eta_electrical": ("1", "flow work / thruster electrical power (V·I)", None, f),
        "eta_hydraulic": ("1", "thrust power / flow work", None, f),
        "eta_overall": ("1", "thrust power / thruster electrical power (V·I)", None, f),
        "h2_rate_mol_s": ("mol/s", "hydrogen evolved at the cathodes (Faraday)", None, f),
        "cl2_rate_mol_s": ("mol/s", "chlorine evolved at the anodes (Faraday)", None, f),
        "h2_total_mol": ("mol", "hydrogen evolved since the start", None, f),
        "cl2_total_mol": ("mol", "chlorine evolved since the start", None, f),
        "energy_out_j": ("J", "energy drawn from the pack terminals since the start", None, f),
        "drive_saturated": (
            "1",
            "1 while the drive clamps the command at its current or voltage limit, else 0",
            None,
            "int32",
        ),
        "power_folded": (
            "1",
            "1 while the drive folds back to the pack's power limit, else 0",
            None,
            "int32",
        ),
        "speed_short_m_s": (
            "m/s",
            "held speed minus speed through water while the speed hold is at a drive or pack "
            "limit (0 otherwise)",
            None,
            f,
        ),
        **_anode_channel(plant),
        **_water_channels(plant),
    }


def _water_channels(plant: Plant) -> dict:
    """The water channels, only when the water or its current changes along the route or with
    time (a run in one body of water keeps its channels)."""
    if not plant.water_varies:
        return {}
    f = "float64"
    return {
        "salinity": ("1", "practical salinity SP (PSS-78) at the vessel", None, f),
        "water_temperature_c": ("degC", "in-situ water temperature at the vessel", None, f),
        "conductivity_s_m": ("S/m", "electrical conductivity of the water at the vessel", None, f),
        "water_current_m_s": (
            "m/s",
            "water current along the track at the vessel (+ with the vessel): steady, route and "
            "tide",
            None,
            f,
        ),
    }


def _anode_channel(plant: Plant) -> dict:
    """The anode channel, only when a design tracks its sacrificial anode mass (so the logs of
    other vessels keep their channels)."""
    if not any(u.anode_mass_kg is not None for u in plant.thrusters):
        return {}
    return {
        "anode_mass_left_kg": (
            "kg",
            "sacrificial anode metal left on one unit of each design, m0 − Q/capacity with Q the "
            "charge through that unit's anodes (design capacity; NaN for a design without a "
            "tracked sacrificial anode)",
            len(plant.thrusters),
            "float64",
        )
    }


MAY_BE_NAN = ("anode_mass_left_kg",)
"""Channels whose NaN is a value (not tracked), not a model failure."""


def anode_mass_left(plant: Plant, lay, ys: np.ndarray) -> np.ndarray:
    """Anode metal left on one unit of each design [kg] at the states ``ys`` (shape (state
    size, n)): m0 − m_per_C·Q, never below 0, with the design's own charge accumulator
    (:func:`sim.physics.electrodes.consumed_mass_kg` is linear in the charge); NaN for a design
    without a tracked anode. Shape (n, designs)."""
    out = np.full((ys.shape[1], len(plant.thrusters)), np.nan)
    for k, i in lay.i_anode.items():
        u = plant.thrusters[k]
        usable = u.anode_utilisation * u.anode_mass_kg
        per_c = usable / anode_spent_charge_c(u)
        out[:, k] = np.maximum(u.anode_mass_kg - per_c * ys[i], 0.0)
    return out


def _ratio(a: float, b: float) -> float:
    return a / b if b > 1e-12 else 0.0


_SCALAR_FIELDS = (
    "total_thrust_n",
    "resistance_n",
    "thr_power_w",
    "pack_power_w",
    "pack_current_a",
    "pack_voltage_v",
    "cell_voltage_v",
    "pack_heat_w",
    "busbar_w",
    "joule_w",
    "electrode_w",
    "electrode_heat_w",
    "friction_w",
    "wake_w",
    "drive_loss_w",
    "hotel_w",
    "interaction_w",
    "flow_work_w",
    "h2",
    "cl2",
)
_LIST_FIELDS = ("thrust_n", "current_a", "voltage_v", "field_t", "duct_rise_k", "duct_joule_rise_k")
# the snapshot's fields as one tuple each (one C-level call per sample instead of a getattr loop)
_scalar_fields_of = operator.attrgetter(*_SCALAR_FIELDS)
_list_fields_of = operator.attrgetter(*_LIST_FIELDS)
INT_CHANNELS = ("leg_index", "charge_folded", "drive_saturated", "power_folded")
"""Sample channels that hold whole numbers (int64 columns); every other channel is float64."""


def sample_block(model: VesselModel, ts: np.ndarray, ys: np.ndarray, leg_index: int) -> dict:
    """The logged channels at the times ``ts`` [s] (shape (n,)) with the states ``ys`` (shape
    (state size, n)), under the model's current control: channel name -> numpy column (shape
    (n,), or (n, thruster designs) for per-design channels). Each point is evaluated once; no
    per-sample dictionaries are built."""
    p, lay = model.plant, model.lay
    n, nthr = len(ts), lay.n_thr
    ys = np.asarray(ys, dtype=float).reshape(lay.size, n)
    c = model.control
    # the values are gathered in lists, row by row, and made arrays once per block (numpy's
    # item assignment costs more than the list; the values are the same floats)
    sc, per_design, flags, wat, chg, short = [], [], [], [], [], []
    for j, t in enumerate(np.asarray(ts, dtype=float).tolist()):
        y = ys[:, j]
        s = model.evaluate(t, y)
        x = y.tolist()
        speed = x[I_V]
        sc.append(_scalar_fields_of(s))
        per_design.append((*_list_fields_of(s), *model.end_current_and_gas_load(s, speed)))
        chg.append(model.pack_charge_limit_w(x[I_SOC], x[I_RC1] + x[I_RC2], x[I_TB]))
        flags.append((int(s.charge_folded), int(bool(s.saturated) and not s.folded), int(s.folded)))
        short.append(_speed_short(model, speed, s) if c.mode == "speed" else 0.0)
        w = s.water
        wat.append((w.sp, w.t_c, w.sigma_s_m, s.current_m_s))
    sc = np.array(sc, dtype=float).reshape(n, len(_SCALAR_FIELDS))
    # per design: the snapshot's lists, the end current, the mean and outlet void fractions
    li = np.empty((len(_LIST_FIELDS) + 3, n, nthr))
    li[: len(_LIST_FIELDS) + 2] = (
        np.array(per_design, dtype=float).reshape(n, len(_LIST_FIELDS) + 2, nthr).transpose(1, 0, 2)
    )
    flags = np.array(flags, dtype=np.int64).reshape(n, 3)
    wat = np.array(wat, dtype=float).reshape(n, 4)
    chg = np.array(chg, dtype=float)
    short = np.array(short, dtype=float)
    # the mean and outlet void fractions of the whole block at once, from the gas load a
    load = li[len(_LIST_FIELDS) + 1].copy()
    for k in range(nthr):
        slip = model.gas_slip(k)
        li[len(_LIST_FIELDS) + 1, :, k] = mean_void_fraction(load[:, k], slip)
        li[len(_LIST_FIELDS) + 2, :, k] = outlet_void_fraction(load[:, k], slip)
    col = dict(zip(_SCALAR_FIELDS, sc.T, strict=True))
    per = dict(zip(_LIST_FIELDS, li, strict=False))
    speed = ys[I_V].copy()
    useful = col["total_thrust_n"] * speed
    return {
        "time_s": np.array(ts, dtype=float),
        "leg_index": np.full(n, leg_index, dtype=np.int64),
        "speed_through_water_m_s": speed,
        "speed_over_ground_m_s": speed + wat[:, 3]
        if p.water_varies
        else speed + p.water_current_m_s,
        "distance_m": ys[I_XG].copy(),
        "distance_through_water_m": ys[I_XW].copy(),
        "thrust_n": per["thrust_n"],
        "thruster_current_a": per["current_a"],
        "thruster_voltage_v": per["voltage_v"],
        "field_t": per["field_t"],
        "duct_temperature_rise_k": per["duct_rise_k"],
        "duct_joule_rise_k": per["duct_joule_rise_k"],
        "magnet_temperature_c": ys[lay.i_mag : lay.i_mag + nthr].T.copy(),
        "effective_thrust_n": col["total_thrust_n"],
        "end_current_a": li[len(_LIST_FIELDS)],
        "void_fraction_mean": li[len(_LIST_FIELDS) + 1],
        "void_fraction_outlet": li[len(_LIST_FIELDS) + 2],
        "hull_resistance_n": col["resistance_n"],
        "thruster_power_w": col["thr_power_w"],
        "pack_power_w": col["pack_power_w"],
        "pack_current_a": col["pack_current_a"],
        "pack_voltage_v": col["pack_voltage_v"],
        "cell_voltage_v": col["cell_voltage_v"],
        "state_of_charge": ys[I_SOC].copy(),
        "battery_temperature_c": ys[I_TB].copy(),
        "battery_heat_w": col["pack_heat_w"],
        "busbar_loss_w": col["busbar_w"],
        "pack_charge_limit_w": chg,
        "charge_folded": flags[:, 0],
        "joule_loss_w": col["joule_w"],
        "electrode_loss_w": col["electrode_w"],
        "electrode_heat_w": col["electrode_heat_w"],
        "friction_loss_w": col["friction_w"],
        "wake_loss_w": col["wake_w"],
        "drive_loss_w": col["drive_loss_w"],
        "hotel_power_w": col["hotel_w"],
        "useful_power_w": useful,
        "hull_interaction_power_w": col["interaction_w"],
        "eta_electrical": _ratios(col["flow_work_w"], col["thr_power_w"]),
        "eta_hydraulic": _ratios(useful, col["flow_work_w"]),
        "eta_overall": _ratios(useful, col["thr_power_w"]),
        "h2_rate_mol_s": col["h2"],
        "cl2_rate_mol_s": col["cl2"],
        "h2_total_mol": ys[lay.acc["h2_mol"]].copy(),
        "cl2_total_mol": ys[lay.acc["cl2_mol"]].copy(),
        "energy_out_j": ys[lay.acc["energy_pack_terminal_j"]].copy(),
        "drive_saturated": flags[:, 1],
        "power_folded": flags[:, 2],
        "speed_short_m_s": short,
        **(
            {"anode_mass_left_kg": anode_mass_left(p, lay, ys)}
            if any(u.anode_mass_kg is not None for u in p.thrusters)
            else {}
        ),
        **(
            {
                "salinity": wat[:, 0].copy(),
                "water_temperature_c": wat[:, 1].copy(),
                "conductivity_s_m": wat[:, 2].copy(),
                "water_current_m_s": wat[:, 3].copy(),
            }
            if p.water_varies
            else {}
        ),
    }


def _ratios(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """a / b where b > 1e-12, else 0 (elementwise; as :func:`_ratio`)."""
    ok = b > 1e-12
    return np.where(ok, a / np.where(ok, b, 1.0), 0.0)


def sample_row(model: VesselModel, t: float, y: np.ndarray, leg_index: int) -> dict:
    """The logged channels at one instant as a dict of plain values (one row of
    :func:`sample_block`)."""
    block = sample_block(model, np.array([t]), np.asarray(y, dtype=float)[:, None], leg_index)
    return {k: (v[0].tolist() if v.ndim > 1 else v[0].item()) for k, v in block.items()}


CHARGE_FOLD_START = "charge fold-back"
"""Event kind: the drive starts folding back regenerated power (pack charge limit)."""
CHARGE_FOLD_END = "charge fold-back end"
"""Event kind: the drive stops folding back regenerated power."""
HULL_RANGE = "hull model range"
"""Event kind (once per run): the speed passed the hull model's data range."""


def sample_events(plant: Plant, prev: dict | None, row: dict, seen: set) -> list[tuple[str, str]]:
    """Events read off consecutive samples: the charge fold-back starting and ending, and (once
    per run, remembered in ``seen``) the speed passing the hull model's Froude-number range.
    Returns (kind, message) pairs."""
    out = []
    was = bool(prev["charge_folded"]) if prev is not None else False
    now = bool(row["charge_folded"])
    if now and not was:
        out.append(
            (
                CHARGE_FOLD_START,
                "the drive folds back regenerated power: the cells would pass their maximum "
                f"voltage or charge-current rating (pack accepts {row['pack_charge_limit_w']:.4g}"
                " W)",
            )
        )
    elif was and not now:
        out.append((CHARGE_FOLD_END, "regenerated power no longer folded back"))
    v = abs(row["speed_through_water_m_s"])
    if HULL_RANGE not in seen and v > plant.hull_max_speed_m_s:
        seen.add(HULL_RANGE)
        out.append(
            (
                HULL_RANGE,
                f"speed {v:.3f} m/s is past Froude number {plant.hull_max_froude:g} "
                f"({plant.hull_max_speed_m_s:.3f} m/s), the end of the hull model's data: "
                "resistance is extrapolated",
            )
        )
    return out


def _speed_short(model: VesselModel, speed: float, s) -> float:
    """How far a speed hold falls short of its target [m/s] while the drive cannot give more
    (saturated or folded back); 0 when the leg holds no speed or the drive has margin left."""
    c = model.control
    if c.mode != "speed" or not s.saturated:
        return 0.0
    return max(0.0, c.target - speed)


SPEED_SHORT_TOLERANCE = 0.02
"""A speed hold counts as not held when its shortfall at a drive or pack limit exceeds this
fraction of the target (and at least :data:`SPEED_SHORT_MIN_M_S`) (project choice)."""
SPEED_SHORT_MIN_M_S = 0.01
"""Smallest shortfall counted as a speed not held [m/s] (project choice)."""
LIMIT_DWELL_S = 30.0
"""A saturation, fold-back or speed shortfall (and its end) is reported as an event once it has
lasted this long on the logged samples [s], so a drive hovering at a limit does not flood the
event list (project choice)."""
_HUGE_PAGE_BYTES = 1 << 22  # numpy asks for huge pages for arrays this large (see _Columns)
_FLUSH_ROWS = 8192  # rows after which the observer gets them, whatever the wall clock says


class _Episode:
    """A flag on the sample rows, debounced: it changes state (and reports it) only once the new
    state has lasted :data:`LIMIT_DWELL_S`."""

    def __init__(self) -> None:
        self.on = False
        self.since: float | None = None

    def update(self, t: float, raw: bool) -> bool:
        """Feed one sample; True when the reported state changes at this sample."""
        if raw == self.on:
            self.since = None
            return False
        if self.since is None:
            self.since = t
        if t - self.since >= LIMIT_DWELL_S:
            self.on, self.since = raw, None
            return True
        return False


class _Row(Mapping):
    """One sample of a column block, read as a mapping (plain values; lists per design, to be
    read, not changed).

    The rows of one short block may share ``lists``: each column read is then converted to a
    list once for the whole block (numpy's per-item ``.item()`` costs more than the read).
    Without it (a row of the long run columns), each read converts one item."""

    __slots__ = ("cols", "j", "lists")

    def __init__(
        self, cols: dict[str, np.ndarray], j: int, lists: dict[str, list] | None = None
    ) -> None:
        self.cols, self.j, self.lists = cols, j, lists

    def __getitem__(self, key: str):
        if self.lists is None:
            v = self.cols[key][self.j]
            return v.tolist() if isinstance(v, np.ndarray) else v.item()
        col = self.lists.get(key)
        if col is None:
            col = self.lists[key] = self.cols[key].tolist()
        return col[self.j]

    def __iter__(self):
        return iter(self.cols)

    def __len__(self) -> int:
        return len(self.cols)


class _Columns:
    """The logged samples kept for the run's result, as preallocated numpy columns (a row of
    dicts costs about 40× the memory: benchmarks/PROFILE.md §5.4).

    The columns are allocated once for ``capacity`` rows (the rows the run is expected to
    log): pages of a fresh allocation that are never written cost no resident memory, so an
    early end wastes nothing, while growing by copying holds the old and the new columns at
    once. The reservation stays below numpy's huge-page threshold (4 MiB a column, above which
    even the first row would make 2 MiB resident under transparent huge pages); a run logging
    more rows grows the columns by doubling.
    """

    def __init__(self, capacity: int = 64) -> None:
        self.n = 0
        self.capacity = max(1, int(capacity))
        self.cols: dict[str, np.ndarray] = {}

    def extend(self, block: dict[str, np.ndarray]) -> None:
        """Append a block of samples (channel -> column, as :func:`sample_block`)."""
        m = len(block["time_s"])
        if not self.cols:
            widest = max(v[:1].nbytes for v in block.values()) or 1
            cap = max(min(self.capacity, (_HUGE_PAGE_BYTES - 1) // widest), m)
            self.cols = {k: np.empty((cap, *v.shape[1:]), dtype=v.dtype) for k, v in block.items()}
        n = self.n
        cap = len(self.cols["time_s"])
        if n + m > cap:
            cap = max(2 * cap, n + m)
            for k, a in self.cols.items():
                b = np.empty((cap, *a.shape[1:]), dtype=a.dtype)
                b[:n] = a[:n]
                self.cols[k] = b
        for k, v in block.items():
            self.cols[k][n : n + m] = v
        self.n = n + m

    @property
    def last(self) -> _Row | None:
        """The last sample, or None before the first."""
        return _Row(self.cols, self.n - 1) if self.n else None

    @property
    def last_time(self) -> float | None:
        return float(self.cols["time_s"][self.n - 1]) if self.n else None

    def rows(self, start: int) -> dict[str, np.ndarray]:
        """Copies of the rows from ``start`` on (channel -> column)."""
        return {k: a[start : self.n].copy() for k, a in self.cols.items()}

    def take_series(self) -> dict[str, np.ndarray]:
        """Hand the columns over, cut to the rows logged, and empty this store.

        Each column is shrunk in place (``realloc``: the unused capacity is given back without
        copying the samples); a column something else still refers to is copied instead.
        """
        cols, n = self.cols, self.n
        self.cols, self.n = {}, 0
        out: dict[str, np.ndarray] = {}
        for k in list(cols):
            a = cols.pop(k)
            try:
                a.resize((n, *a.shape[1:]), refcheck=True)
            except ValueError:  # referenced elsewhere (or a view): copy, never touch it
                a = a[:n].copy()
            out[k] = a
        return out


# ------------------------------------------------------------------ observers and results


class RunObserver:
    """Receives what a run produces. Subclass and override what you need."""

    def samples(self, columns: dict[str, np.ndarray]) -> None:
        """A block of logged samples: channel name -> numpy column along time (shape (n,), or
        (n, thruster designs) for per-design channels). The arrays are the observer's to keep."""

    def event(self, time_s: float, kind: str, leg: int, message: str) -> None: ...

    def leg(self, record: dict) -> None: ...

    def progress(self, time_s: float, time_limit_s: float, wall_s: float) -> None: ...


@dataclass
class RunResult:
    """Everything a run produced, in memory."""

    series: dict[str, np.ndarray]
    events: list[dict]
    legs: list[dict]
    summary: dict[str, float | str]
    ending_reason: str
    ending_kind: str
    """'complete', 'limit' (stopped early by a stop condition or trigger) or 'failure'."""
    final_state: np.ndarray
    totals: dict[str, float]
    """Accumulated energies [J], charge [C] and gas [mol] at the end (ACC_NAMES)."""
    wall_time_s: float
    rhs_calls: int


@dataclass(frozen=True)
class _Armed:
    """A condition watched during a segment, and what its event means."""

    kind: str  # 'leg', 'trigger', 'stop'
    cond: Condition
    owner: int  # leg index / trigger index / -1
    label: str


@dataclass
class _Mission:
    leg_index: int = 0
    leg_t0: float = 0.0
    leg_x0: float = 0.0
    leg_energy0: float = 0.0
    leg_samples: list = field(default_factory=list)
    derate: float = 1.0
    base_hotel_w: float = 0.0
    fired: set = field(default_factory=set)
    ending: str = ""
    ending_kind: str = ""


class MissionRunner:
    """Flies one scenario on one plant. ``run()`` returns a :class:`RunResult`."""

    def __init__(
        self,
        plant: Plant,
        mission: MissionSpec,
        *,
        sample_s: float | None = None,
        observer: RunObserver | None = None,
        chunk_wall_s: float = 2.0,
        method: str | None = None,
    ) -> None:
        self.plant = plant
        self.mission = mission
        self.model = VesselModel(plant)
        self.sample_s = float(sample_s or mission.sample_s)
        self.obs = observer or RunObserver()
        self.method = method or mission.solver.method
        self.rtol = mission.solver.rtol
        self.max_step = mission.solver.max_step_s
        self.time_limit = mission.limits.time_s
        self.legs: list[LegSpec] = list(mission.legs)
        self.triggers: list[TriggerSpec] = list(mission.triggers)
        self.leg_names = {leg.name: i for i, leg in enumerate(self.legs)}
        self._events: list[dict] = []
        self._legs_out: list[dict] = []
        # the samples are kept for the whole run: reserve the rows it is expected to log (the
        # sample grid up to the time limit, plus some for event instants; capped, see _Columns)
        grid = self.time_limit / self.sample_s if self.sample_s > 0 else 0.0
        expected = int(min(grid, 1 << 30)) + 1
        self._rows = _Columns(expected + expected // 16 + 64)
        self._flushed = 0  # rows already handed to the observer
        self._seen: set = set()  # once-per-run sample events already emitted
        self._episodes = {k: _Episode() for k in ("drive", "fold", "speed")}
        self._finite_keys: tuple[str, ...] | None = None
        self._episode_leg = 0
        self.chunk_wall_s = chunk_wall_s
        self._h_hint: float | None = None  # first step of the next stepper segment [s]
        self._wall0 = self._last_flush = 0.0
        lay = self.model.lay
        self.atol = np.full(lay.size, 1e-6)
        self.atol[I_XG] = self.atol[I_XW] = 1e-4
        self.atol[I_SOC] = 1e-10
        # an RC pair's voltage adds to the pack's terminal voltage, so an error δ in it moves the
        # current drawn for a power by δ/V: hold it to the relative tolerance of the pack
        # voltage (OCV at half charge). A fixed 1e-7 V was about four decades tighter than rtol
        # and set the step of most steps of a long hold (benchmarks/PROFILE.md §7).
        self.atol[I_RC1] = self.atol[I_RC2] = self.rtol * float(bat.ocv_v(plant.pack, 0.5))
        # the speed hold's integral term adds to the command voltage: hold it to the relative
        # tolerance of the drive's voltage range (a fixed 1e-6 V was far tighter where the
        # feed-forward carries the command and the integral stays near 0)
        self.atol[lay.i_pi] = self.rtol * plant.drive_max_voltage_v
        for k in range(lay.i_acc, lay.size):
            self.atol[k] = 1e-3
        self.atol[lay.acc["h2_mol"]] = self.atol[lay.acc["cl2_mol"]] = 1e-9
        self.atol[lay.acc["o2_mol"]] = 1e-9
        self.atol[lay.acc["charge_c"]] = 1e-4
        for i in lay.i_anode.values():
            self.atol[i] = 1e-4

    # ------------------------------------------------------------------ conditions
    def _value(self, c: _Armed, t: float, y: np.ndarray) -> float:
        """Signed distance of a condition from its threshold."""
        return c.cond(t, y, self.model, self.m.leg_x0, self.m.leg_t0)

    def _holds(self, c: _Armed, t: float, y: np.ndarray) -> bool:
        return c.cond.holds(t, y, self.model, self.m.leg_x0, self.m.leg_t0)

    def _stop_conditions(self) -> list[_Armed]:
        lim = self.mission.limits
        cell = self.plant.pack.cell
        out = [
            _Armed(
                "stop",
                SocBelow(lim.state_of_charge_min),
                -1,
                "pack empty (state of charge at its minimum)",
            ),
            _Armed("stop", CellVoltageBelow(cell.v_min), -1, "cell under-voltage"),
            _Armed(
                "stop", PackHeadroomExhausted(), -1, "the pack cannot deliver the demanded power"
            ),
            _Armed(
                "stop",
                BatteryTemperatureAbove(lim.battery_temperature_max_c),
                -1,
                "battery temperature limit",
            ),
        ]
        if lim.magnet_temperature_max_c is not None:
            out.append(
                _Armed(
                    "stop",
                    MagnetTemperatureAbove(lim.magnet_temperature_max_c),
                    -1,
                    "magnet temperature limit",
                )
            )
        elif any(math.isfinite(u.magnet_max_c) for u in self.plant.thrusters):
            out.append(
                _Armed("stop", MagnetGradeLimit(), -1, "magnet temperature limit (grade maximum)")
            )
        if self.model.lay.i_anode:
            out.append(_Armed("stop", AnodeSpent(), -1, "sacrificial anode spent"))
        if lim.duct_temperature_rise_max_k is not None:
            out.append(
                _Armed(
                    "stop",
                    DuctTemperatureRiseAbove(lim.duct_temperature_rise_max_k),
                    -1,
                    "duct temperature-rise limit",
                )
            )
        return out

    def _active_conditions(self) -> list[_Armed]:
        m = self.m
        leg = self.legs[m.leg_index]
        # a leg's duration ends it at a known time (the segment horizon), not a located event
        conds = [
            _Armed("leg", c, m.leg_index, leg.name)
            for c in leg.until
            if not isinstance(c, Duration)
        ]
        for i, trig in enumerate(self.triggers):
            if i not in m.fired:
                conds += [_Armed("trigger", c, i, trig.name) for c in trig.when]
        return conds + self._stops

    # ------------------------------------------------------------------ legs
    def _start_leg(self, index: int, t: float, y: np.ndarray) -> np.ndarray:
        m = self.m
        m.leg_index, m.leg_t0 = index, t
        m.leg_x0 = float(y[I_XG])
        m.leg_energy0 = float(y[self.model.lay.acc["energy_pack_terminal_j"]])
        m.leg_samples = []
        leg = self.legs[index]
        c = Control(
            mode=leg.mode,
            setpoint=leg.setpoint,
            derate=m.derate,
            hotel_w=leg.hotel_w if leg.hotel_w is not None else m.base_hotel_w,
        )
        y = y.copy()
        note = ""
        if c.mode == "speed" and c.target == 0.0:
            # A held speed of zero is thrust off: zero electrode current (the command sits in
            # the electrodes' dead band) and the vessel coasts to rest. A PI loop about zero
            # speed would have to cross the dead band at every sign change of the error, and
            # its linearised gain there is zero: it chattered between ±max voltage.
            c = Control(mode="current", setpoint=0.0, derate=m.derate, hotel_w=c.hotel_w)
            note = " (thrust off: coasting to rest)"
        elif c.mode == "speed":
            self._tune_speed_hold(c, leg, y, t)
            y[self.model.lay.i_pi] = 0.0
        self.model.control = c
        self.model.invalidate()
        self._emit(t, "leg start", index, f"leg {leg.name!r}: {_describe(leg, m.derate)}{note}")
        return y

    def _tune_speed_hold(self, c: Control, leg: LegSpec, y: np.ndarray, t: float = 0.0) -> None:
        """Feed-forward from the steady solution at the target speed; PI gains by pole placement
        on the linearised surge equation (critically damped, closed-loop time constant half the
        open-loop one, at least 2 s), unless the leg gives them. The gains are taken in the
        water at the leg's start (time ``t``, the state's distance); the feed-forward in the
        plant's reference water (with a route: its start), which the integral term corrects."""
        p = self.plant
        target = c.target
        soc = float(y[I_SOC])
        try:
            ff = steady_at_speed(p, target, soc=soc, hotel_w=c.hotel_w).thruster_voltage_v
        except SteadyError:
            ff = p.drive_max_voltage_v
        c.feedforward_v = ff
        probe = VesselModel(p)
        probe.control = Control(mode="voltage", setpoint=ff, hotel_w=c.hotel_w)
        yy = y.copy()
        dv = max(1e-3, 1e-3 * target)
        yy[I_V] = target + dv
        hi = probe.evaluate(t, yy)
        yy[I_V] = max(target - dv, 0.0)
        lo = probe.evaluate(t, yy)
        damping = (
            (hi.resistance_n - hi.total_thrust_n) - (lo.resistance_n - lo.total_thrust_n)
        ) / (target + dv - max(target - dv, 0.0))
        yy[I_V] = target
        probe.control = Control(mode="voltage", setpoint=ff * 1.01 + 1e-3, hotel_w=c.hotel_w)
        up = probe.evaluate(t, yy)
        probe.control = Control(mode="voltage", setpoint=ff, hotel_w=c.hotel_w)
        mid = probe.evaluate(t, yy)
        gain = (up.total_thrust_n - mid.total_thrust_n) / (ff * 0.01 + 1e-3)
        if gain <= 1e-9 and ff > 0.0:
            # The thrust does not respond to the command at the feed-forward point: the drive is
            # at its current limit there (a speed it cannot reach) or the command sits in the
            # electrodes' dead band. The local slope (zero) would give an unbounded gain and a
            # loop that chatters once the target becomes reachable (e.g. after a derate); use
            # the mean slope of thrust against command from zero to the feed-forward instead.
            probe.control = Control(mode="voltage", setpoint=0.0, hotel_w=c.hotel_w)
            zero = probe.evaluate(t, yy)
            gain = (mid.total_thrust_n - zero.total_thrust_n) / ff
        mass = p.total_mass_kg
        damping = max(damping, 1e-6)
        gain = max(gain, 1e-9)
        tau_cl = min(max(0.5 * mass / damping, 2.0), 600.0)
        omega = 1.0 / tau_cl
        if leg.speed_gain_v_per_m_s is not None:
            c.kp_v_per_m_s = leg.speed_gain_v_per_m_s
            ti = leg.speed_reset_time_s if leg.speed_reset_time_s is not None else 2.0 * tau_cl
            c.ki_v_per_m = leg.speed_gain_v_per_m_s / ti
        else:
            c.kp_v_per_m_s = max(0.0, (2.0 * mass * omega - damping) / gain)
            c.ki_v_per_m = mass * omega**2 / gain
            if leg.speed_reset_time_s is not None:
                c.ki_v_per_m = c.kp_v_per_m_s / leg.speed_reset_time_s

    def _end_leg(self, t: float, y: np.ndarray, ending: str) -> None:
        m = self.m
        leg = self.legs[m.leg_index]
        dur = t - m.leg_t0
        dist = float(y[I_XG]) - m.leg_x0
        energy = float(y[self.model.lay.acc["energy_pack_terminal_j"]]) - m.leg_energy0
        rec = {
            "index": m.leg_index,
            "name": leg.name,
            "t_start_s": m.leg_t0,
            "t_end_s": t,
            "distance_m": dist,
            "energy_j": energy,
            "mean_speed_m_s": dist / dur if dur > 0 else 0.0,
            "ending": ending,
        }
        self._legs_out.append(rec)
        self.obs.leg(rec)

    def _emit(self, t: float, kind: str, leg: int, message: str) -> None:
        ev = {"time_s": t, "kind": kind, "leg": leg, "message": message}
        self._events.append(ev)
        self.obs.event(t, kind, leg, message)

    # ------------------------------------------------------------------ integration
    def _record(self, t: float, y: np.ndarray) -> None:
        self._record_block(np.array([t]), np.asarray(y, dtype=float)[:, None])

    def _record_block(self, ts: np.ndarray, ys: np.ndarray) -> None:
        """Log the samples at the times ``ts`` [s] (increasing) with the states ``ys`` (shape
        (state size, n)): one row per instant (the first, before an event acts, is kept)."""
        last = self._rows.last_time
        if last is not None and ts[0] == last:
            ts, ys = ts[1:], ys[:, 1:]
        if not len(ts):
            return
        self._last_ty = (float(ts[0]), ys[:, 0])
        block = sample_block(self.model, ts, ys, self.m.leg_index)
        if self._finite_keys is None:  # the channels that must be finite (the same each block)
            self._finite_keys = tuple(
                k for k, v in block.items() if v.dtype.kind == "f" and k not in MAY_BE_NAN
            )
        # one test over all of them (a test per channel costs more than the values); on a
        # failure, the channel loop finds the first bad value
        if not np.isfinite(np.concatenate([block[k] for k in self._finite_keys], axis=None)).all():
            for k in self._finite_keys:
                v = block[k]
                if not np.isfinite(v).all():
                    bad = np.flatnonzero(~np.isfinite(v.reshape(len(ts), -1)).all(axis=1))[0]
                    raise SolverFailure(
                        f"non-finite value of {k} ({v[bad].tolist()})",
                        float(ts[bad]),
                        self.legs[self.m.leg_index].name,
                        self._state_dict(ys[:, bad]),
                    )
        prev = self._rows.last
        lists: dict[str, list] = {}  # the block's columns as lists, shared by its rows
        for j in range(len(ts)):
            row = _Row(block, j, lists)
            for kind, message in sample_events(self.plant, prev, row, self._seen):
                self._emit(float(ts[j]), kind, self.m.leg_index, message)
            self._watch_limits(row)
            prev = row
        self._rows.extend(block)

    def _watch_limits(self, row: dict) -> None:
        """Events when the drive starts or stops saturating, folding back, or falling short of a
        held speed (debounced on the samples: :class:`_Episode`)."""
        t, leg = row["time_s"], row["leg_index"]
        ep = self._episodes
        if leg != self._episode_leg:  # a new leg asks for a new speed: start afresh
            self._episode_leg = leg
            ep["speed"] = _Episode()
        if ep["drive"].update(t, bool(row["drive_saturated"])):
            if ep["drive"].on:
                self._emit(t, "saturation", leg, f"drive at its {self._which_limit(row)}")
            else:
                self._emit(t, "saturation", leg, "drive back within its current and voltage limits")
        if ep["fold"].update(t, bool(row["power_folded"])):
            if ep["fold"].on:
                self._emit(
                    t,
                    "saturation",
                    leg,
                    "power folded back: the pack limits the drive to "
                    f"{row['pack_power_w'] / 1000:.3g} kW from the pack",
                )
            else:
                self._emit(t, "saturation", leg, "power fold-back ended")
        c = self.model.control
        short = row["speed_short_m_s"]
        target = c.target if c.mode == "speed" else 0.0
        tol = max(SPEED_SHORT_TOLERANCE * target, SPEED_SHORT_MIN_M_S)
        if ep["speed"].update(t, short > tol):
            v = row["speed_through_water_m_s"]
            held = "not held" if ep["speed"].on else "held again"
            self._emit(
                t,
                "saturation",
                leg,
                f"speed {held}: {v / KNOT_M_S:.2f} kn of {target / KNOT_M_S:.2f} kn asked "
                f"({v:.3g} of {target:.3g} m/s)",
            )

    def _which_limit(self, row: dict) -> str:
        p = self.plant
        imax = p.drive_max_current_a
        for i, u in zip(row["thruster_current_a"], p.thrusters, strict=True):
            if abs(i) / u.units >= imax * (1.0 - 1e-6):
                return f"current limit ({imax:g} A per unit)"
        return f"voltage limit ({p.drive_max_voltage_v:g} V)"

    def _state_dict(self, y: np.ndarray) -> dict:
        lay = self.model.lay
        out = {
            "speed_m_s": float(y[I_V]),
            "distance_m": float(y[I_XG]),
            "soc": float(y[I_SOC]),
            "battery_c": float(y[I_TB]),
        }
        for k, u in enumerate(self.plant.thrusters):
            out[f"magnet_c[{u.name}]"] = float(y[lay.i_mag + k])
        return out

    def _state_names(self) -> list[str]:
        lay = self.model.lay
        names = ["speed", "distance over ground", "distance through water", "state of charge"]
        names += ["RC voltage 1", "RC voltage 2", "battery temperature"]
        names += [f"magnet temperature of {u.name!r}" for u in self.plant.thrusters]
        names += ["speed-hold integral", *ACC_NAMES]
        names += [f"anode charge of {self.plant.thrusters[k].name!r}" for k in lay.i_anode]
        return names[: lay.size]

    def _checked_rhs(self, t, y):
        """The model's right-hand side; remembers where it is, so a failure can say so; refuses
        NaN/inf."""
        self._last_ty = (t, y)
        dy = self.model.rhs(t, y)
        if not all_finite(dy):
            bad = ", ".join(self._state_names()[k] for k in np.flatnonzero(~np.isfinite(dy)))
            raise SolverFailure(
                f"non-finite derivative of {bad}",
                t,
                self.legs[self.m.leg_index].name,
                self._state_dict(y),
            )
        return dy

    def _dynamic_indices(self) -> list[int]:
        """State components the derivatives depend on under the active control (the rest are
        quadratures: distances, accumulators, a magnet whose field does not depend on its
        temperature, an unused RC pair or speed-hold integral)."""
        lay, p = self.model.lay, self.plant
        idx = [I_V, I_SOC, I_RC1]
        if p.pack.n_rc > 1:
            idx.append(I_RC2)
        idx.append(I_TB)
        if p.route is not None and p.route.axis == "distance":
            idx.append(I_XG)  # the water, and so the thrust, depends on the distance run
        idx += [lay.i_mag + k for k, u in enumerate(p.thrusters) if u.alpha_br_per_k != 0.0]
        if self.model.control.mode == "speed":
            idx.append(lay.i_pi)
        return idx

    def _segment(self, t0: float, t1: float, y0: np.ndarray, conds: list[_Armed]):
        """Integrate from t0 towards t1; stop at the first condition that fires."""
        if self.method == STEPPER_METHOD:
            return self._segment_stepper(t0, t1, y0, conds)
        return self._segment_solve_ivp(t0, t1, y0, conds)

    def _segment_stepper(self, t0: float, t1: float, y0: np.ndarray, conds: list[_Armed]):
        """Integrate from t0 towards t1 step by step (:class:`~sim.engine.integrator.TRBDF2`);
        after each step, check the conditions' signs at its end, locate the first one that
        fired on the step's dense output (Brent), record the step's grid points, and flush the
        samples by wall clock (without cutting the integration)."""
        try:
            st = TRBDF2(
                self._checked_rhs,
                t0,
                y0,
                t1,
                rtol=self.rtol,
                atol=self.atol,
                max_step=self.max_step,
                dynamic=self._dynamic_indices(),
                first_step=1.0,
            )
            g_prev = [self._value(c, t0, y0) for c in conds]
            while st.t < t1:
                t_a = st.t
                st.step()
                dense = st.dense
                t_b, y_b = st.t, st.y
                fired, t_e = None, math.inf
                g_new = [self._value(c, t_b, y_b) for c in conds]
                for c, ga, gb in zip(conds, g_prev, g_new, strict=True):
                    d = c.cond.direction
                    up, down = ga <= 0.0 <= gb, ga >= 0.0 >= gb
                    if (d > 0 and up) or (d < 0 and down) or (d == 0 and (up or down)):
                        root = t_b if gb == 0.0 else self._locate(c, t_a, t_b, dense)
                        if root < t_e:
                            t_e, fired = root, c
                if fired is not None:
                    y_e = y_b.copy() if t_e == t_b else dense(t_e)
                    self._record_grid(t_a, t_e, y_e, dense)
                    self._h_hint = st.h
                    return t_e, y_e, fired, None
                self._record_grid(t_a, t_b, y_b, dense)
                g_prev = g_new
                wall = _time.perf_counter()
                if wall - self._last_flush > self.chunk_wall_s:
                    self.obs.progress(t_b, self.time_limit, wall - self._wall0)
                self._flush_if_due(wall)
        except SolverFailure:
            raise
        except IntegratorFailure as exc:
            t_bad, y_bad = self._last_ty
            raise SolverFailure(
                f"integrator failure ({exc})",
                float(t_bad),
                self.legs[self.m.leg_index].name,
                self._state_dict(y_bad),
            ) from exc
        except Exception as exc:  # the model raised inside the integrator
            t_bad, y_bad = self._last_ty
            raise SolverFailure(
                f"model failure ({type(exc).__name__}: {exc})",
                float(t_bad),
                self.legs[self.m.leg_index].name,
                self._state_dict(y_bad),
            ) from exc
        self._h_hint = st.h
        return st.t, st.y.copy(), None, None

    def _locate(self, c: _Armed, t_a: float, t_b: float, dense) -> float:
        """Time at which a condition crosses zero inside one step (Brent on the dense output)."""

        def g(t: float) -> float:
            return self._value(c, t, dense(t))

        ga, gb = g(t_a), g(t_b)
        if ga == 0.0:
            return t_a
        if ga * gb > 0.0:  # the interpolant disagrees with the step ends: take the end
            return t_b
        return brent_root(g, t_a, t_b, xtol=4 * np.finfo(float).eps, rtol=4 * np.finfo(float).eps)

    def _segment_solve_ivp(self, t0: float, t1: float, y0: np.ndarray, conds: list[_Armed]):
        """Integrate from t0 towards t1 with :func:`scipy.integrate.solve_ivp`; stop at the
        first condition that fires."""
        from scipy.integrate import solve_ivp  # ≈0.3 s to import: only when a run integrates

        model = self.model

        def make(c: _Armed):
            def g(t, y):
                return self._value(c, t, y)

            g.terminal = c.cond.terminal
            g.direction = c.cond.direction
            return g

        def rhs(t, y):  # remembers where it is, so a failure can say so; refuses NaN/inf
            self._last_ty = (t, y)
            dy = model.rhs(t, y)
            if not np.isfinite(dy).all():
                bad = ", ".join(self._state_names()[k] for k in np.flatnonzero(~np.isfinite(dy)))
                raise SolverFailure(
                    f"non-finite derivative of {bad}",
                    t,
                    self.legs[self.m.leg_index].name,
                    self._state_dict(y),
                )
            return dy

        events = [make(c) for c in conds]
        try:
            sol = solve_ivp(
                rhs,
                (t0, t1),
                y0,
                method=self.method,
                events=events,
                dense_output=True,
                rtol=self.rtol,
                atol=self.atol,
                max_step=self.max_step,
            )
        except SolverFailure:
            raise
        except Exception as exc:  # the model raised inside the integrator
            t_bad, y_bad = self._last_ty
            raise SolverFailure(
                f"model failure ({type(exc).__name__}: {exc})",
                float(t_bad),
                self.legs[self.m.leg_index].name,
                self._state_dict(y_bad),
            ) from exc
        if sol.status == -1:
            raise SolverFailure(
                f"integrator failure ({sol.message})",
                float(sol.t[-1]),
                self.legs[self.m.leg_index].name,
                self._state_dict(sol.y[:, -1]),
            )
        fired = None
        t_end, y_end = float(sol.t[-1]), sol.y[:, -1].copy()
        if sol.status == 1:
            best = math.inf
            for c, te, ye in zip(conds, sol.t_events, sol.y_events, strict=True):
                if len(te) and te[0] < best:
                    best, fired = float(te[0]), c
                    t_end, y_end = float(te[0]), ye[0].copy()
        self._record_grid(t0, t_end, y_end, sol)
        return t_end, y_end, fired, sol

    def _record_grid(self, t0: float, t_end: float, y_end: np.ndarray, sol) -> None:
        """Record every point k·sample_s of the global grid not yet written, up to and including
        the segment end: each grid point is written exactly once, whatever ends the segments
        (leg ends, events, scheduled changes, chunk boundaries). A grid point at the segment end
        itself takes the segment's end state (before any event there acts)."""
        k0 = self._next_k
        k1 = math.floor(t_end / self.sample_s)
        if k1 < k0:
            return
        ts = np.arange(k0, k1 + 1) * self.sample_s
        ts = ts[ts <= t_end]  # floor() of a rounded quotient may overshoot by one point
        if not ts.size:
            return
        self._next_k = k0 + ts.size
        inside = ts[(ts >= t0) & (ts < t_end)]
        ys = sol.sol(inside) if inside.size else np.empty((y_end.size, 0))
        if ts[-1] == t_end:
            inside = np.append(inside, t_end)
            ys = np.concatenate((ys, np.asarray(y_end, dtype=float)[:, None]), axis=1)
        if inside.size:
            self._record_block(inside, ys)

    # ------------------------------------------------------------------ the mission process
    def _process(self, env: simpy.Environment, y: np.ndarray):
        m = self.m
        t = 0.0
        y = self._start_leg(0, t, y)
        self._record(t, y)
        self._next_k = 1  # the next grid point to write (k·sample_s)
        wall0 = _time.perf_counter()
        self._wall0 = self._last_flush = wall0
        # solve_ivp: segments of at most a fiftieth of the run for progress and flushes; the
        # step-by-step integrator flushes by wall clock inside a segment and is not restarted
        chunk = self.time_limit / 50.0 if self.method != STEPPER_METHOD else math.inf
        while True:
            leg = self.legs[m.leg_index]
            conds = self._active_conditions()
            fired = next((c for c in conds if self._holds(c, t, y)), None)
            if fired is None:
                nxt = env.peek()
                if nxt <= env.now:  # a scheduled event is due now: let it act first
                    yield env.timeout(0)
                    continue
                leg_end = m.leg_t0 + leg.duration_s if leg.duration_s is not None else math.inf
                horizon = min(self.time_limit, leg_end, nxt, t + chunk)
                t, y, fired, _ = self._segment(t, horizon, y, conds)
                yield env.timeout(max(0.0, t - env.now))
                wall = _time.perf_counter()
                self.obs.progress(t, self.time_limit, wall - wall0)
                self._flush_if_due(wall)
                if fired is None:
                    if t >= self.time_limit:
                        self._record(t, y)
                        self._emit(t, "stop", m.leg_index, "time limit")
                        self._finish(t, y, "time limit", "limit")
                        return
                    if t >= leg_end:
                        self._record(t, y)
                        y = self._next_leg(t, y, _duration_text(leg))
                        if m.ending:
                            return
                    continue  # a chunk boundary or a scheduled event: its grid point is written
            self._record(t, y)
            y = self._handle(fired, t, y)
            if m.ending:
                return

    def _handle(self, c: _Armed, t: float, y: np.ndarray) -> np.ndarray:
        m = self.m
        if c.kind == "stop":
            self._emit(t, "stop", m.leg_index, c.label)
            self._finish(t, y, c.label, "limit")
            return y
        if c.kind == "leg":
            return self._next_leg(t, y, c.cond.describe())
        trig = self.triggers[c.owner]
        m.fired.add(c.owner)
        self._emit(
            t,
            "trigger",
            m.leg_index,
            f"trigger {trig.name!r} ({c.cond.describe()}): {trig.then}",
        )
        if trig.then == "stop":
            self._finish(t, y, f"stopped by trigger {trig.name!r}", "limit")
            return y
        if trig.then == "goto":
            self._end_leg(t, y, f"trigger {trig.name!r}")
            self._flush_rows()
            return self._start_leg(self.leg_names[trig.leg], t, y)
        if trig.then == "derate":
            m.derate *= trig.factor
            self.model.control.derate = m.derate
        elif trig.then == "hotel":
            m.base_hotel_w = trig.hotel_w
            if self.legs[m.leg_index].hotel_w is None:
                self.model.control.hotel_w = trig.hotel_w
        self.model.invalidate()
        return y

    def _next_leg(self, t: float, y: np.ndarray, why: str) -> np.ndarray:
        m = self.m
        self._end_leg(t, y, why)
        self._emit(t, "leg end", m.leg_index, f"leg {self.legs[m.leg_index].name!r} ended: {why}")
        self._flush_rows()
        if m.leg_index + 1 >= len(self.legs):
            self._finish(t, y, "mission complete", "complete")
            return y
        return self._start_leg(m.leg_index + 1, t, y)

    def _flush_if_due(self, wall: float) -> None:
        """Hand the waiting rows to the observer when ``chunk_wall_s`` of wall time [s] has
        passed since the last hand-over, or when ``_FLUSH_ROWS`` rows are waiting (a bounded
        batch: each row is copied out once)."""
        if wall - self._last_flush > self.chunk_wall_s:
            self._flush_rows()
            self._last_flush = wall
        elif self._rows.n - self._flushed >= _FLUSH_ROWS:
            self._flush_rows()

    def _flush_rows(self) -> None:
        """Hand the rows logged since the last call to the observer (as new arrays)."""
        if self._rows.n > self._flushed:
            cols = self._rows.rows(self._flushed)
            self._flushed = self._rows.n
            self.obs.samples(cols)

    def _finish(self, t: float, y: np.ndarray, reason: str, kind: str) -> None:
        m = self.m
        if (
            not self._legs_out
            or self._legs_out[-1]["index"] != m.leg_index
            or self._legs_out[-1]["t_end_s"] != t
        ):
            if kind != "complete":
                self._end_leg(t, y, reason)
        m.ending, m.ending_kind = reason, kind
        self._final_t, self._final_y = t, y
        self._emit(t, "end", m.leg_index, reason)
        self._flush_rows()

    def _scheduled(self, env: simpy.Environment, at: float, hotel_w: float):
        yield env.timeout(at)
        m = self.m
        m.base_hotel_w = hotel_w
        if self.legs[m.leg_index].hotel_w is None:
            self.model.control.hotel_w = hotel_w
            self.model.invalidate()
        self._emit(env.now, "schedule", m.leg_index, f"hotel load set to {hotel_w:g} W")

    # ------------------------------------------------------------------ entry point
    def run(self) -> RunResult:
        ms, p = self.mission, self.plant
        wall0 = _time.perf_counter()
        self.m = _Mission(base_hotel_w=p.hotel_w)
        self._stops = self._stop_conditions()
        st = ms.start
        t_w = p.water.t_c
        y0 = initial_state(
            p,
            st.state_of_charge,
            st.speed_m_s,
            st.battery_temperature_c if st.battery_temperature_c is not None else t_w,
            st.magnet_temperature_c if st.magnet_temperature_c is not None else t_w,
        )
        env = simpy.Environment()
        for s in sorted(ms.schedule, key=lambda s: s.at_s):
            if s.at_s < self.time_limit:
                env.process(self._scheduled(env, s.at_s, s.hotel_w))
        proc = env.process(self._process(env, y0))
        self._last_ty = (0.0, y0)
        try:
            env.run(until=proc)
        except BaseException as exc:
            try:  # hand the samples recorded so far to the observers (the partial log)
                self._flush_rows()
            except Exception:
                pass
            if isinstance(exc, SolverFailure) or not isinstance(
                exc, ArithmeticError | ValueError | RuntimeError
            ):
                raise
            t_bad, y_bad = self._last_ty
            raise SolverFailure(
                f"model failure ({type(exc).__name__}: {exc})",
                float(t_bad),
                self.legs[self.m.leg_index].name,
                self._state_dict(y_bad),
            ) from exc
        return self._result(_time.perf_counter() - wall0)

    def _result(self, wall: float) -> RunResult:
        series = self._rows.take_series()
        y = self._final_y
        lay = self.model.lay
        totals = {name: float(y[lay.acc[name]]) for name in ACC_NAMES}
        m = self.m
        summary = summarise(series, ending_reason=m.ending, totals=totals)
        return RunResult(
            series=series,
            events=list(self._events),
            legs=list(self._legs_out),
            summary=summary,
            ending_reason=m.ending,
            ending_kind=m.ending_kind,
            final_state=y,
            totals=totals,
            wall_time_s=wall,
            rhs_calls=self.model.n_rhs,
        )


def _duration_text(leg: LegSpec) -> str:
    """'duration 75 min': the leg's duration as its file wrote it, when the spec carries it."""
    for c in leg.until:
        if isinstance(c, Duration) and c.threshold == leg.duration_s:
            return c.describe()
    return f"duration {leg.duration_s:g} s"


def _describe(leg: LegSpec, derate: float) -> str:
    unit = {"voltage": "V", "current": "A", "power": "W", "speed": "m/s"}[leg.mode]
    d = f" × derate {derate:g}" if derate != 1.0 else ""
    return f"hold {leg.mode} {leg.setpoint:g} {unit}{d}"
