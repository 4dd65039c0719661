"""End conditions of legs, trigger conditions and the run's stop conditions, as event objects.

A condition is a small frozen object holding its threshold. Called as
``cond(t, y, model, leg_x0_m, leg_t0_s)`` it returns a signed distance from the threshold; the
event is that value crossing zero in the condition's :attr:`~Condition.direction` (+1: rising
through zero, −1: falling), so the object is what :func:`scipy.integrate.solve_ivp` takes as an
event function (with ``terminal`` and ``direction`` attributes). :meth:`Condition.holds` tells
whether the condition already holds at a state.

Each class names the scenario-file key it answers to (:attr:`Condition.key`, also used in
messages such as ``"soc below 0.45"``) and the unit of its threshold. Adding a condition is one
class here and one field with the same name in the scenario schema's ``Conditions`` table (io
layer); the class registers itself in :data:`CONDITIONS` by its key.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import ClassVar

import numpy as np

from sim.engine.model import I_SOC, I_TB, I_V, I_XG, VesselModel
from sim.engine.plant import anode_spent_charge_c

__all__ = [
    "CONDITIONS",
    "AnodeSpent",
    "BatteryTemperatureAbove",
    "CellVoltageBelow",
    "Condition",
    "Distance",
    "DuctTemperatureRiseAbove",
    "Duration",
    "MagnetGradeLimit",
    "MagnetTemperatureAbove",
    "PackHeadroomExhausted",
    "ReturnToStart",
    "SocBelow",
    "SpeedAbove",
    "SpeedBelow",
    "TimeAfter",
    "TotalDistanceAbove",
]

CONDITIONS: dict[str, type[Condition]] = {}
"""Scenario-file key -> condition class, for every condition a file may give."""


@dataclass(frozen=True)
class Condition:
    """A condition on the state: ``self(t, y, model, leg_x0_m)`` is a signed distance from the
    threshold, and the condition holds once it has crossed zero in :attr:`direction`.

    Parameters of a call
    --------------------
    t : float
        Mission time [s].
    y : numpy.ndarray
        State vector (layout in :mod:`sim.engine.model`).
    model : VesselModel
        The vessel model (its algebraic solution and plant).
    leg_x0_m : float
        Distance over ground at the start of the active leg [m].
    leg_t0_s : float, optional
        Mission time at the start of the active leg [s] (default 0).
    """

    threshold: float
    """In the SI unit :attr:`unit` (temperatures in °C)."""
    shown: str = field(default="", compare=False)
    """The threshold as the user wrote it ("0.5 kn"), for messages; "" to show the SI value.
    Only messages use it: the arithmetic uses :attr:`threshold`."""

    key: ClassVar[str] = ""
    """Scenario-file key; with ``_`` as spaces it also names the condition in messages."""
    direction: ClassVar[int] = 1
    """+1: the event is a rise through zero; −1: a fall through zero."""
    unit: ClassVar[str] = ""
    """Unit of the threshold in messages ('' for a plain number)."""
    terminal: ClassVar[bool] = True
    """The integration stops at the event (solve_ivp's attribute)."""

    def __init_subclass__(cls, register: bool = True, **kw) -> None:
        super().__init_subclass__(**kw)
        if register and "key" in cls.__dict__:
            CONDITIONS[cls.key] = cls

    def __call__(
        self,
        t: float,
        y: np.ndarray,
        model: VesselModel,
        leg_x0_m: float,
        leg_t0_s: float = 0.0,
    ) -> float:
        raise NotImplementedError

    def holds(
        self,
        t: float,
        y: np.ndarray,
        model: VesselModel,
        leg_x0_m: float,
        leg_t0_s: float = 0.0,
    ) -> bool:
        """True when the condition holds at (t, y) (its value is on or past zero)."""
        v = self(t, y, model, leg_x0_m, leg_t0_s)
        return v >= 0 if self.direction > 0 else v <= 0

    def describe(self) -> str:
        """'distance 600 m', 'speed below 0.5 kn' (the file's own text when known: see
        :attr:`shown`), 'soc below 0.45'..."""
        value = self.shown or f"{self.threshold:g} {self.unit}".rstrip()
        return f"{self.key.replace('_', ' ')} {value}"


class Distance(Condition):
    """Distance over ground covered in the active leg reaches the threshold [m]."""

    key, direction, unit = "distance", 1, "m"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_XG]) - leg_x0_m - self.threshold


class Duration(Condition):
    """Time since the start of the active leg reaches the threshold [s].

    As a leg's end condition the engine ends the leg at this known time without locating an
    event; in a trigger it counts from the start of whichever leg is flown (like
    :class:`Distance`)."""

    key, direction, unit = "duration", 1, "s"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return t - leg_t0_s - self.threshold


@dataclass(frozen=True)
class ReturnToStart(Condition):
    """The vessel is back at its start point: the along-track position (the signed distance over
    ground since the start of the run [m]) falls to the threshold (0: the start point).

    The model is one-dimensional along the track, so "back at the start" is the position coming
    back to zero, by going astern or drifting with a head current."""

    threshold: float = 0.0
    key, direction, unit = "return_to_start", -1, "m"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_XG]) - self.threshold

    def describe(self) -> str:
        return "return to start" if self.threshold == 0.0 else super().describe()


class TotalDistanceAbove(Condition):
    """Distance over ground since the start of the run rises above the threshold [m]."""

    key, direction, unit = "total_distance_above", 1, "m"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_XG]) - self.threshold


class SpeedAbove(Condition):
    """Speed through water rises above the threshold [m/s]."""

    key, direction, unit = "speed_above", 1, "m/s"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_V]) - self.threshold


class SpeedBelow(Condition):
    """Speed through water falls below the threshold [m/s]."""

    key, direction, unit = "speed_below", -1, "m/s"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_V]) - self.threshold


class SocBelow(Condition):
    """State of charge falls below the threshold [-]."""

    key, direction, unit = "soc_below", -1, ""

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_SOC]) - self.threshold


class CellVoltageBelow(Condition):
    """Terminal voltage per cell falls below the threshold [V]."""

    key, direction, unit = "cell_voltage_below", -1, "V"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return model.evaluate(t, y).cell_voltage_v - self.threshold


class DuctTemperatureRiseAbove(Condition):
    """The largest duct outlet temperature rise of the thruster designs rises above the
    threshold [K]."""

    key, direction, unit = "duct_temperature_rise_above", 1, "K"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return max(model.evaluate(t, y).duct_rise_k) - self.threshold


class BatteryTemperatureAbove(Condition):
    """Battery temperature rises above the threshold [°C]."""

    key, direction, unit = "battery_temperature_above", 1, "°C"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return float(y[I_TB]) - self.threshold


class MagnetTemperatureAbove(Condition):
    """Any thruster design's magnet temperature rises above the threshold [°C]."""

    key, direction, unit = "magnet_temperature_above", 1, "°C"

    def _limits_c(self, model: VesselModel) -> list[float]:
        return [self.threshold] * len(model.plant.thrusters)

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        lay = model.lay
        return max(
            float(v) - lim
            for v, lim in zip(
                y[lay.i_mag : lay.i_mag + lay.n_thr], self._limits_c(model), strict=True
            )
        )


@dataclass(frozen=True)
class MagnetGradeLimit(MagnetTemperatureAbove, register=False):
    """Any magnet rises above the maximum working temperature of its own grade [°C] (a stop
    condition; designs without a known grade have an infinite limit)."""

    threshold: float = math.inf

    def _limits_c(self, model: VesselModel) -> list[float]:
        return [u.magnet_max_c for u in model.plant.thrusters]


@dataclass(frozen=True)
class PackHeadroomExhausted(Condition, register=False):
    """The pack can no longer deliver the demanded power: its power headroom [W] falls to zero
    (a stop condition)."""

    threshold: float = 0.0
    key, direction, unit = "pack_headroom", -1, "W"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return model.evaluate(t, y).pack_headroom_w


class TimeAfter(Condition):
    """Mission time (from the start of the run) passes the threshold [s]."""

    key, direction, unit = "time_after", 1, "s"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        return t - self.threshold


@dataclass(frozen=True)
class AnodeSpent(Condition):
    """A sacrificial anode is spent: the charge through one unit's anodes [C] reaches the charge
    that dissolves the usable share of its mass (a flag condition: ``anode_spent = true``).

    Each design with an anode mass has its own accumulator in the state vector,
    Q_k = ∫ |I_k| dt of one unit (all its channels' anodes; charge passed going astern counts as
    well: an upper bound), so the condition is exact with several designs. The value is the
    largest (Q_k − Q_spent,k) over those designs [C]; −1 when no design has one (never holds).

    References
    ----------
    Faraday's law; DNV-RP-B401 (2017) design capacity (:mod:`sim.physics.electrodes`).
    """

    threshold: float = 0.0
    key, direction, unit = "anode_spent", 1, "C"

    def __call__(self, t, y, model, leg_x0_m, leg_t0_s=0.0):
        units = model.plant.thrusters
        left = [float(y[i]) - anode_spent_charge_c(units[k]) for k, i in model.lay.i_anode.items()]
        return (max(left) if left else -1.0) - self.threshold

    def describe(self) -> str:
        return "anode spent" if self.threshold == 0.0 else super().describe()
