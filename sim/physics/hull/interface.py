"""The interface every calm-water resistance model shares, and small input checks.

A resistance model is a frozen dataclass with ``resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)``
[N] (vectorised over speed, odd in speed, zero at rest), ``breakdown(...)`` (a
:class:`ResistanceBreakdown` of forces [N]) and ``wetted_area_m2`` [m²] (or None).

References
----------
.. [1] ITTC (1978). Report of the Performance Committee, Proceedings of the 15th International
   Towing Tank Conference, The Hague (resistance components, effective power).
.. [2] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
   International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Protocol, runtime_checkable

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

__all__ = ["ResistanceBreakdown", "ResistanceModel", "effective_power_w"]


def _finish(value: Any, scalar: bool) -> Any:
    """Return a Python float for scalar input, the array otherwise."""
    return float(value) if scalar else value


@dataclass(frozen=True)
class ResistanceBreakdown:
    """Calm-water resistance split into components. Every field is a force [N] (float for a
    scalar speed, ndarray for an array of speeds), signed like the speed; ``total`` is their sum.
    """

    friction: Any
    """Frictional resistance of the equivalent flat plate, ITTC-1957 line [N]."""
    form: Any
    """Viscous pressure (form) resistance, k·R_F [N]."""
    wave: Any
    """Wave-making and wave-breaking resistance [N]."""
    transom: Any
    """Additional pressure resistance of an immersed transom [N]."""
    bulb: Any
    """Additional pressure resistance of a bulbous bow near the surface [N]."""
    appendage: Any
    """Appendage resistance [N]."""
    correlation: Any
    """Model-ship correlation / roughness allowance resistance [N]."""
    unresolved: Any
    """Resistance not split into components (measured curves) [N]."""
    total: Any
    """Total calm-water resistance [N]."""

    def __add__(self, other: ResistanceBreakdown) -> ResistanceBreakdown:
        """Component-wise sum of two breakdowns (resistance of parts in parallel) [N]."""
        return ResistanceBreakdown(
            *(getattr(self, name) + getattr(other, name) for name in _BREAKDOWN_FIELDS)
        )


_BREAKDOWN_FIELDS = (
    "friction",
    "form",
    "wave",
    "transom",
    "bulb",
    "appendage",
    "correlation",
    "unresolved",
    "total",
)


def _breakdown(scalar: bool, **parts: Any) -> ResistanceBreakdown:
    """Build a breakdown: missing parts are zero, total is the sum of the parts."""
    values = {}
    template = next(iter(parts.values()))
    zero = np.zeros_like(np.asarray(template, dtype=float))
    for name in _BREAKDOWN_FIELDS[:-1]:
        values[name] = np.asarray(parts.get(name, zero), dtype=float)
    total = sum(values.values(), start=np.zeros_like(zero))
    values["total"] = total
    return ResistanceBreakdown(**{k: _finish(v, scalar) for k, v in values.items()})


@runtime_checkable
class ResistanceModel(Protocol):
    """What the engine needs from a resistance model (see the module docstring)."""

    @property
    def wetted_area_m2(self) -> float | None:
        """Wetted surface [m²], or None when unknown."""
        ...

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Total calm-water resistance [N], odd in speed."""
        ...

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Resistance components [N]."""
        ...


def _check_fluid(rho_kg_m3: float, nu_m2_s: float) -> None:
    if not rho_kg_m3 > 0.0:
        raise ModelRangeError("rho_kg_m3", rho_kg_m3, "> 0 kg/m³", "hull resistance")
    if not nu_m2_s > 0.0:
        raise ModelRangeError("nu_m2_s", nu_m2_s, "> 0 m²/s", "hull resistance")


def _positive(name: str, value: float, model: str) -> None:
    try:
        ok = math.isfinite(float(value)) and float(value) > 0.0
    except (TypeError, ValueError):
        ok = False
    if not ok:
        raise ModelRangeError(name, value, "finite and > 0", model)


def _within(name: str, value: float, low: float, high: float, model: str, unit: str = "") -> None:
    if not (math.isfinite(value) and low <= value <= high):
        raise ModelRangeError(name, value, f"[{low:g}, {high:g}]{unit}", model)


def effective_power_w(
    model: ResistanceModel, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
) -> float | np.ndarray:
    """Effective (towing) power P_E [W].

    Parameters
    ----------
    model : ResistanceModel
        Any resistance model of this module.
    speed_m_s : float or array
        Speed [m/s].
    rho_kg_m3 : float
        Water density [kg/m³].
    nu_m2_s : float
        Kinematic viscosity [m²/s].

    Returns
    -------
    float or ndarray
        P_E = R V [W] (≥ 0 for either direction, since R is odd in V).

    Notes
    -----
    P_E = R(V) · V.

    References
    ----------
    ITTC (1978). Report of the Performance Committee, 15th ITTC (definition of effective power).
    """
    v = np.asarray(speed_m_s, dtype=float)
    return _finish(np.asarray(model.resistance_n(v, rho_kg_m3, nu_m2_s)) * v, v.ndim == 0)
