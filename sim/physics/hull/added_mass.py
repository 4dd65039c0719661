"""Added mass in surge: Lamb's coefficient of a prolate spheroid, and the added mass itself.

References
----------
.. [1] Lamb, H. (1932). Hydrodynamics, 6th ed. Cambridge University Press. §373.
"""

from __future__ import annotations

import math

from sim.physics.errors import ModelRangeError
from sim.physics.hull.interface import _positive, _within

__all__ = [
    "SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION",
    "prolate_spheroid_surge_added_mass_coefficient",
    "surge_added_mass_kg",
]

SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION: tuple[float, float] = (0.05, 0.10)
"""Typical surge added mass of a surface ship as a fraction of its mass [-] (common practice)."""

_SPHERE_SERIES_E = 1.0e-2  # eccentricity below which Lamb's alpha0 is summed as a series


def prolate_spheroid_surge_added_mass_coefficient(length_m: float, diameter_m: float) -> float:
    """Longitudinal (surge) added-mass coefficient k1 of a prolate spheroid in ideal fluid.

    Parameters
    ----------
    length_m : float
        Length of the spheroid (major axis) [m].
    diameter_m : float
        Diameter (minor axis) [m]; at most the length.

    Returns
    -------
    float
        k1 = added mass / displaced mass [-]; 0.5 for a sphere, → 0 for a slender body.

    Notes
    -----
    With eccentricity e = √(1 − (d/l)²):
    α0 = 2(1 − e²)/e³ · (½ ln((1 + e)/(1 − e)) − e), k1 = α0 / (2 − α0).
    For e < 0.01 the bracket is summed as its series e³/3 + e⁵/5 + e⁷/7 + … to avoid
    cancellation, which gives the sphere limit α0 = 2/3, k1 = 1/2.

    References
    ----------
    Lamb, H. (1932). Hydrodynamics, 6th ed., Cambridge University Press, §373.
    """
    _positive("length_m", length_m, "spheroid added mass")
    _positive("diameter_m", diameter_m, "spheroid added mass")
    ratio = diameter_m / length_m
    if ratio > 1.0:
        raise ModelRangeError("diameter/length", ratio, "<= 1 (prolate)", "spheroid added mass")
    e2 = 1.0 - ratio * ratio
    e = math.sqrt(e2)
    if e < _SPHERE_SERIES_E:
        series = 1.0 / 3.0 + e2 / 5.0 + e2 * e2 / 7.0 + e2**3 / 9.0
        alpha0 = 2.0 * (1.0 - e2) * series
    else:
        alpha0 = 2.0 * (1.0 - e2) / e**3 * (math.atanh(e) - e)
    return alpha0 / (2.0 - alpha0)


def surge_added_mass_kg(displaced_volume_m3: float, rho_kg_m3: float, coefficient: float) -> float:
    """Added mass in surge [kg].

    Parameters
    ----------
    displaced_volume_m3 : float
        Displaced volume ∇ [m³].
    rho_kg_m3 : float
        Water density [kg/m³].
    coefficient : float
        Added-mass coefficient k1 [-]: from
        :func:`prolate_spheroid_surge_added_mass_coefficient` for a submerged body, or for a
        surface ship a fraction of about 0.05–0.10 (common practice,
        :data:`SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION`).

    Returns
    -------
    float
        m_a = k1 ρ ∇ [kg].

    Notes
    -----
    m_a = k1 ρ ∇; the vessel then accelerates as (m + m_a) dV/dt = T − R.

    References
    ----------
    Lamb, H. (1932). Hydrodynamics, 6th ed., Cambridge University Press, §373.
    """
    _positive("displaced_volume_m3", displaced_volume_m3, "surge added mass")
    _positive("rho_kg_m3", rho_kg_m3, "surge added mass")
    _within("coefficient", coefficient, 0.0, 1.0, "surge added mass")
    return coefficient * rho_kg_m3 * displaced_volume_m3
