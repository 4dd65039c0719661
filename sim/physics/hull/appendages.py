"""Appendage drag by the form-factor method, and the sum of several resistance models acting on
one vessel (hull plus thruster housings, struts, fins).

References
----------
.. [1] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
   International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
.. [2] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError
from sim.physics.hull.friction import _cf_clamped, _cf_clamped_scalar
from sim.physics.hull.interface import (
    ResistanceBreakdown,
    ResistanceModel,
    _breakdown,
    _check_fluid,
    _positive,
    _within,
)

__all__ = ["Appendage", "CompositeResistance", "with_appendages"]

_APP = "appendage"


@dataclass(frozen=True)
class Appendage:
    """Drag of an appendage (thruster housing, strut, fin) by the form-factor method.

    Parameters
    ----------
    wetted_area_m2 : float
        Wetted area of the appendage S_app [m²].
    reference_length_m : float
        Length along the flow used for its Reynolds number (chord, housing length) [m].
    form_factor : float
        (1+k2) [-], between 1 and 5; Holtrop & Mennen (1982) give 1.3–4.0 for common appendages
        (see :data:`HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS`: e.g. 1.5–2.0 skeg, 2.0 hull bossings,
        3.0 strut bossings and shaft brackets).
    label : str
        Name used in reports.

    Notes
    -----
    R = ½ρV² S_app C_F(Re_L) (1+k2), Re_L = V L_ref/ν, C_F from the ITTC-1957 line. Unlike
    Holtrop & Mennen, who use the ship's C_F for all appendages, each appendage here uses its
    own length, which is the usual practice for separate components (it gives a larger,
    more realistic C_F for short parts).

    References
    ----------
    .. [1] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
       International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
    .. [2] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
    """

    wetted_area_m2: float
    reference_length_m: float
    form_factor: float
    label: str = "appendage"

    def __post_init__(self) -> None:
        _positive("wetted_area_m2", self.wetted_area_m2, _APP)
        _positive("reference_length_m", self.reference_length_m, _APP)
        _within("form_factor", self.form_factor, 1.0, 5.0, _APP)

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Appendage drag [N], all in the ``appendage`` component.

        Parameters
        ----------
        speed_m_s : float or array
            Speed [m/s]; negative means astern.
        rho_kg_m3 : float
            Water density [kg/m³].
        nu_m2_s : float
            Kinematic viscosity [m²/s].

        Returns
        -------
        ResistanceBreakdown
            ``appendage`` = ``total`` [N].
        """
        _check_fluid(rho_kg_m3, nu_m2_s)
        v = np.asarray(speed_m_s, dtype=float)
        cf = _cf_clamped(np.abs(v) * (self.reference_length_m / nu_m2_s))
        r = 0.5 * rho_kg_m3 * v * np.abs(v) * self.wetted_area_m2 * cf * self.form_factor
        return _breakdown(v.ndim == 0, appendage=r)

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Appendage drag [N] (see :meth:`breakdown` for the parameters)."""
        if isinstance(speed_m_s, float | int):
            _check_fluid(rho_kg_m3, nu_m2_s)
            v = float(speed_m_s)
            cf = _cf_clamped_scalar(abs(v) * self.reference_length_m / nu_m2_s)
            return 0.5 * rho_kg_m3 * v * abs(v) * self.wetted_area_m2 * cf * self.form_factor
        return self.breakdown(speed_m_s, rho_kg_m3, nu_m2_s).total


@dataclass(frozen=True)
class CompositeResistance:
    """Sum of resistance models acting on one vessel (hull plus appendages).

    Parameters
    ----------
    parts : tuple of ResistanceModel
        The models; their forces add.

    Notes
    -----
    R = Σ R_i; each component of the breakdown is the sum of that component over the parts.
    Interaction between parts (e.g. an appendage in the hull boundary layer) is not modelled.

    References
    ----------
    Superposition of resistance components as in Holtrop & Mennen (1982), ISP 29(335):166–170.
    """

    parts: tuple[Any, ...]

    def __post_init__(self) -> None:
        parts = tuple(self.parts)
        if not parts:
            raise ModelRangeError("number of parts", 0, ">= 1", "composite resistance")
        for p in parts:
            if not isinstance(p, ResistanceModel):
                raise TypeError(f"{p!r} does not provide the resistance-model interface")
        object.__setattr__(self, "parts", parts)

    @property
    def wetted_area_m2(self) -> float | None:
        """Sum of the parts' wetted areas [m²]; None if any part does not know its area."""
        areas = [p.wetted_area_m2 for p in self.parts]
        return None if any(a is None for a in areas) else float(sum(areas))

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Component-wise sum of the parts' breakdowns [N] (parameters as for the parts)."""
        result = self.parts[0].breakdown(speed_m_s, rho_kg_m3, nu_m2_s)
        for p in self.parts[1:]:
            result = result + p.breakdown(speed_m_s, rho_kg_m3, nu_m2_s)
        return result

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Total resistance [N], the sum over the parts."""
        total = self.parts[0].resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)
        for p in self.parts[1:]:
            total = total + p.resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)
        return total


def with_appendages(
    model: ResistanceModel, appendages: Appendage | Iterable[Appendage]
) -> CompositeResistance:
    """Add appendage drag (e.g. thruster housings) to any resistance model.

    Parameters
    ----------
    model : ResistanceModel
        Hull model (a :class:`CompositeResistance` is flattened).
    appendages : Appendage or iterable of Appendage
        The appendages to add.

    Returns
    -------
    CompositeResistance
        Model whose resistance is the hull's plus the appendages'.

    Notes
    -----
    R = R_hull + Σ R_app,i.

    References
    ----------
    Holtrop, J. & Mennen, G. G. J. (1982). ISP 29(335):166–170 (appendage term).
    """
    extra = (appendages,) if isinstance(appendages, Appendage) else tuple(appendages)
    base = model.parts if isinstance(model, CompositeResistance) else (model,)
    return CompositeResistance((*base, *extra))
