"""Deeply submerged streamlined body of revolution (AUV-like): skin friction plus form drag.

References
----------
.. [1] Hoerner, S. F. (1965). Fluid-Dynamic Drag. Published by the author, Midland Park, NJ.
   Chapter 6 (streamlined bodies).
.. [2] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.hull.friction import _cf_clamped, _cf_clamped_scalar
from sim.physics.hull.interface import (
    ResistanceBreakdown,
    _breakdown,
    _check_fluid,
    _finish,
    _positive,
    _within,
)

__all__ = ["SubmergedBody"]

_HOERNER = "Hoerner streamlined body"


def _prolate_spheroid_area_m2(length_m: float, diameter_m: float) -> float:
    """Surface area of a prolate spheroid of the given length and maximum diameter [m²]."""
    a, b = 0.5 * length_m, 0.5 * diameter_m
    if a <= b * (1.0 + 1e-12):
        return 4.0 * math.pi * b * b
    e = math.sqrt(1.0 - (b / a) ** 2)
    return 2.0 * math.pi * b * b * (1.0 + a / (b * e) * math.asin(e))


@dataclass(frozen=True)
class SubmergedBody:
    """Deeply submerged streamlined body of revolution (AUV-like): skin friction plus form drag.

    Parameters
    ----------
    length_m : float
        Body length l [m].
    diameter_m : float
        Maximum diameter d [m]; fineness l/d between 2 and 30.
    given_wetted_area_m2 : float or None
        Wetted area [m²]; default the surface of the prolate spheroid of the same l and d.
    roughness_allowance : float
        ΔC_F [-] added to the drag coefficient, not multiplied by the form factor (ITTC-1978
        practice); e.g. :func:`roughness_allowance_ittc1978`. Default 0 (smooth).

    Notes
    -----
    C_D = C_F [1 + 1.5 (d/l)^1.5 + 7 (d/l)³] + ΔC_F on the wetted area S, with C_F from the
    ITTC-1957 line at Re = V l/ν; R = ½ρV² S C_D. There is no wave resistance: the body is
    assumed deep (below about half a length, common practice) so the free surface is not felt.
    The ITTC line is a turbulent line: at Re below about 5e5 a smooth body may run partly
    laminar and have less drag than this.

    The default wetted area is the exact surface of a prolate spheroid,
    S = 2πb² [1 + a/(b e) arcsin e], a = l/2, b = d/2, e = √(1 − b²/a²): a fair stand-in for a
    streamlined body of the same length and diameter (real bodies with a parallel middle body
    have a few per cent more; give the area when it is known).

    References
    ----------
    .. [1] Hoerner, S. F. (1965). Fluid-Dynamic Drag, ch. 6, streamlined bodies (wetted-area form
       of the drag formula; the frontal-area form C_F [3 l/d + 4.5 (d/l)^0.5 + 21 (d/l)²] is
       the same relation).
    .. [2] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
    """

    length_m: float
    diameter_m: float
    given_wetted_area_m2: float | None = None
    roughness_allowance: float = 0.0

    wetted_area_m2: float = field(init=False, repr=False, compare=False)
    """Wetted area S [m²] (given or spheroid surface)."""
    form_factor: float = field(init=False, repr=False, compare=False)
    """Hoerner's factor 1 + 1.5 (d/l)^1.5 + 7 (d/l)³ [-]."""

    def __post_init__(self) -> None:
        _positive("length_m", self.length_m, _HOERNER)
        _positive("diameter_m", self.diameter_m, _HOERNER)
        _within("fineness ratio l/d", self.length_m / self.diameter_m, 2.0, 30.0, _HOERNER)
        _within("roughness_allowance", self.roughness_allowance, -1e-3, 5e-3, _HOERNER)
        if self.given_wetted_area_m2 is None:
            s = _prolate_spheroid_area_m2(self.length_m, self.diameter_m)
        else:
            _positive("given_wetted_area_m2", self.given_wetted_area_m2, _HOERNER)
            s = float(self.given_wetted_area_m2)
        r = self.diameter_m / self.length_m
        object.__setattr__(self, "wetted_area_m2", s)
        object.__setattr__(self, "form_factor", 1.0 + 1.5 * r**1.5 + 7.0 * r**3)

    def drag_coefficient(self, speed_m_s: ArrayLike, nu_m2_s: float) -> float | np.ndarray:
        """Drag coefficient on the wetted area C_D [-] (see class Notes).

        Parameters
        ----------
        speed_m_s : float or array
            Speed [m/s]; the sign is ignored.
        nu_m2_s : float
            Kinematic viscosity [m²/s].

        Returns
        -------
        float or ndarray
            C_D = C_F (1 + 1.5 (d/l)^1.5 + 7 (d/l)³) + ΔC_F [-].
        """
        v = np.asarray(speed_m_s, dtype=float)
        cf = _cf_clamped(np.abs(v) * (self.length_m / nu_m2_s))
        return _finish(cf * self.form_factor + self.roughness_allowance, v.ndim == 0)

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Drag components [N]: friction ½ρV²S C_F, form (factor − 1)·friction, correlation
        ½ρV²S ΔC_F; wave, transom, bulb and appendage are zero.

        Parameters
        ----------
        speed_m_s : float or array
            Speed through the water [m/s]; negative means astern.
        rho_kg_m3 : float
            Water density [kg/m³].
        nu_m2_s : float
            Kinematic viscosity [m²/s].

        Returns
        -------
        ResistanceBreakdown
            Components [N].
        """
        _check_fluid(rho_kg_m3, nu_m2_s)
        v = np.asarray(speed_m_s, dtype=float)
        qs = 0.5 * rho_kg_m3 * v * np.abs(v) * self.wetted_area_m2  # signed ½ρV|V|S [N]
        rf = qs * _cf_clamped(np.abs(v) * (self.length_m / nu_m2_s))
        return _breakdown(
            v.ndim == 0,
            friction=rf,
            form=(self.form_factor - 1.0) * rf,
            correlation=qs * self.roughness_allowance,
        )

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Total drag [N] (see :meth:`breakdown` for the parameters)."""
        if isinstance(speed_m_s, float | int):
            _check_fluid(rho_kg_m3, nu_m2_s)
            v = float(speed_m_s)
            cf = _cf_clamped_scalar(abs(v) * self.length_m / nu_m2_s)
            cd = cf * self.form_factor + self.roughness_allowance
            return 0.5 * rho_kg_m3 * v * abs(v) * self.wetted_area_m2 * cd
        return self.breakdown(speed_m_s, rho_kg_m3, nu_m2_s).total
