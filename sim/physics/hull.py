"""Calm-water hull resistance and surge added mass for the time-domain engine.

Every resistance model is a frozen dataclass with the same small interface:

* ``resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)`` – total calm-water resistance [N], vectorised
  over speed, odd in speed (``R(-V) = -R(V)``: the force always opposes the motion) and zero at
  ``V = 0``;
* ``breakdown(speed_m_s, rho_kg_m3, nu_m2_s)`` – the same force split into a
  :class:`ResistanceBreakdown`;
* ``wetted_area_m2`` – wetted surface [m²] (``None`` when a model does not know it).

Models
------
:class:`DisplacementHull`
    Holtrop & Mennen (1982) regression with the Holtrop (1984) revision as an option.
:class:`SubmergedBody`
    Deeply submerged streamlined body of revolution (no free-surface waves), Hoerner (1965).
:class:`TabulatedResistance`
    A measured resistance curve, shape-preserving (PCHIP) interpolation, ``V²`` extrapolation.
:class:`Appendage` and :class:`CompositeResistance`
    Appendage drag (thruster housing, strut) added to any model with :func:`with_appendages`.

The models are evaluated at every right-hand-side call of the ODE solver, so everything that does
not depend on speed, density or viscosity is computed once, when the object is built.

Low speed
---------
The ITTC-1957 line is singular at ``Re = 100``. The resistance models therefore evaluate it with
the Reynolds number clamped from below at :data:`REYNOLDS_NUMBER_FLOOR` (1e3). Below the floor the
friction coefficient is constant and every component goes to zero at least as fast as ``V²``, so
the force is continuous through ``V = 0``, where the engine starts and reverses. The public
function :func:`ittc1957_cf` does not clamp: it raises for ``Re ≤ 100``.

References
----------
.. [1] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
   (ITTC-1957 model-ship correlation line.)
.. [2] ITTC (1978). Report of the Performance Committee, Proceedings of the 15th International
   Towing Tank Conference, The Hague. (ITTC-1978 performance prediction method, roughness
   allowance.)
.. [3] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
   International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
.. [4] Holtrop, J. (1984). A statistical re-analysis of resistance and propulsion data.
   International Shipbuilding Progress 31(363), 272–276. doi:10.3233/ISP-1984-3136302
.. [5] Hoerner, S. F. (1965). Fluid-Dynamic Drag. Published by the author, Midland Park, NJ.
   Chapter 6 (streamlined bodies).
.. [6] Fritsch, F. N. & Carlson, R. E. (1980). Monotone piecewise cubic interpolation. SIAM Journal
   on Numerical Analysis 17(2), 238–246. doi:10.1137/0717021
.. [7] Lamb, H. (1932). Hydrodynamics, 6th ed. Cambridge University Press. §373.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass, field, replace
from typing import Any, Protocol, runtime_checkable

import numpy as np
from numpy.typing import ArrayLike
from scipy.interpolate import PchipInterpolator

from sim.physics.errors import ModelRangeError

__all__ = [
    "HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS",
    "HOLTROP_MENNEN_RANGES",
    "ITTC_STANDARD_ROUGHNESS_M",
    "REYNOLDS_NUMBER_FLOOR",
    "STANDARD_GRAVITY_M_S2",
    "SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION",
    "Appendage",
    "CompositeResistance",
    "DisplacementHull",
    "ResistanceBreakdown",
    "ResistanceModel",
    "SubmergedBody",
    "TabulatedResistance",
    "effective_power_w",
    "froude_number",
    "ittc1957_cf",
    "prolate_spheroid_surge_added_mass_coefficient",
    "reynolds_number",
    "roughness_allowance_ittc1978",
    "surge_added_mass_kg",
    "with_appendages",
]

STANDARD_GRAVITY_M_S2: float = 9.80665
"""Standard acceleration of gravity g_n [m/s²] (3rd CGPM, 1901)."""

REYNOLDS_NUMBER_FLOOR: float = 1.0e3
"""Lower clamp [-] on the Reynolds number inside the resistance models (see module Notes)."""

ITTC_STANDARD_ROUGHNESS_M: float = 150.0e-6
"""Standard hull roughness k_s [m] of the ITTC-1978 method (150 µm)."""

SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION: tuple[float, float] = (0.05, 0.10)
"""Typical surge added mass of a surface ship as a fraction of its mass [-] (common practice)."""

HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS: dict[str, tuple[float, float]] = {
    "rudder behind skeg": (1.5, 2.0),
    "rudder behind stern": (1.3, 1.5),
    "twin-screw balance rudders": (2.8, 2.8),
    "shaft brackets": (3.0, 3.0),
    "skeg": (1.5, 2.0),
    "strut bossings": (3.0, 3.0),
    "hull bossings": (2.0, 2.0),
    "shafts": (2.0, 4.0),
    "stabilizer fins": (2.8, 2.8),
    "dome": (2.7, 2.7),
    "bilge keels": (1.4, 1.4),
}
"""Approximate appendage form factors (1+k2) [-] as (low, high), from the table in Holtrop &
Mennen (1982), ISP 29(335):166–170."""

_FN_FLOOR = 1.0e-2  # below this Froude number the wave terms are exactly zero (they are < 1e-40)
_SPHERE_SERIES_E = 1.0e-2  # eccentricity below which Lamb's alpha0 is summed as a series


# --------------------------------------------------------------------------------------------
# Dimensionless groups and friction lines
# --------------------------------------------------------------------------------------------


def _finish(value: Any, scalar: bool) -> Any:
    """Return a Python float for scalar input, the array otherwise."""
    return float(value) if scalar else value


def reynolds_number(speed_m_s: ArrayLike, length_m: float, nu_m2_s: float) -> float | np.ndarray:
    """Reynolds number based on a length.

    Parameters
    ----------
    speed_m_s : float or array
        Speed through the water [m/s]; the sign is ignored.
    length_m : float
        Reference length [m] (waterline length for a hull, body length, appendage chord).
    nu_m2_s : float
        Kinematic viscosity of the water [m²/s].

    Returns
    -------
    float or ndarray
        Re = |V| L / ν [-].

    Notes
    -----
    Re = |V| L / ν.

    References
    ----------
    Reynolds, O. (1883). An experimental investigation of the circumstances which determine
    whether the motion of water shall be direct or sinuous. Phil. Trans. R. Soc. 174, 935–982.
    doi:10.1098/rstl.1883.0029
    """
    if not length_m > 0.0:
        raise ModelRangeError("length_m", length_m, "> 0 m", "Reynolds number")
    if not nu_m2_s > 0.0:
        raise ModelRangeError("nu_m2_s", nu_m2_s, "> 0 m²/s", "Reynolds number")
    v = np.asarray(speed_m_s, dtype=float)
    return _finish(np.abs(v) * (length_m / nu_m2_s), v.ndim == 0)


def froude_number(
    speed_m_s: ArrayLike, length_m: float, g_m_s2: float = STANDARD_GRAVITY_M_S2
) -> float | np.ndarray:
    """Length Froude number.

    Parameters
    ----------
    speed_m_s : float or array
        Speed [m/s]; the sign is ignored.
    length_m : float
        Waterline length [m].
    g_m_s2 : float
        Acceleration of gravity [m/s²], default standard gravity.

    Returns
    -------
    float or ndarray
        Fn = |V| / sqrt(g L) [-].

    Notes
    -----
    Fn = |V| / √(g L).

    References
    ----------
    Froude, W. (1872). Experiments on the surface-friction experienced by a plane moving through
    water. Report of the British Association for the Advancement of Science, 42, 118–124.
    """
    if not length_m > 0.0:
        raise ModelRangeError("length_m", length_m, "> 0 m", "Froude number")
    v = np.asarray(speed_m_s, dtype=float)
    return _finish(np.abs(v) / math.sqrt(g_m_s2 * length_m), v.ndim == 0)


def ittc1957_cf(re: ArrayLike) -> float | np.ndarray:
    """Frictional resistance coefficient from the ITTC-1957 model-ship correlation line.

    Parameters
    ----------
    re : float or array
        Reynolds number based on length [-]; must exceed 100 everywhere.

    Returns
    -------
    float or ndarray
        C_F [-].

    Raises
    ------
    ModelRangeError
        If any Re ≤ 100 (the line is singular at Re = 100) or is not finite.

    Notes
    -----
    C_F = 0.075 / (log10 Re − 2)².

    The resistance models in this module clamp Re at :data:`REYNOLDS_NUMBER_FLOOR` instead of
    raising, so that resistance goes smoothly to zero with speed.

    References
    ----------
    ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
    """
    r = np.asarray(re, dtype=float)
    bad = ~np.isfinite(r) | (r <= 100.0)
    if np.any(bad):
        value = float(r[bad].flat[0]) if r.ndim else float(r)
        raise ModelRangeError("Reynolds number", value, "finite and > 100", "ITTC-1957 line")
    return _finish(0.075 / (np.log10(r) - 2.0) ** 2, r.ndim == 0)


def _cf_clamped(re: np.ndarray) -> np.ndarray:
    """ITTC-1957 C_F with Re clamped at the floor (no checks; used inside the models)."""
    return 0.075 / (np.log10(np.maximum(re, REYNOLDS_NUMBER_FLOOR)) - 2.0) ** 2


def roughness_allowance_ittc1978(
    ks_m: float = ITTC_STANDARD_ROUGHNESS_M, length_m: float = 1.0
) -> float:
    """Roughness allowance ΔC_F of the ITTC-1978 performance prediction method.

    Parameters
    ----------
    ks_m : float
        Equivalent sand roughness of the hull surface [m]; ITTC standard 150e-6 m.
    length_m : float
        Waterline length [m].

    Returns
    -------
    float
        ΔC_F [-] (may be negative for very long, very smooth hulls, as in the source).

    Notes
    -----
    ΔC_F = [105 (k_s/L)^(1/3) − 0.64] · 10⁻³. The formula was fitted to ships; for small craft
    and models it gives large values and should be used with judgement.

    References
    ----------
    ITTC (1978). Report of the Performance Committee, Proceedings of the 15th ITTC, The Hague.
    """
    if not ks_m >= 0.0:
        raise ModelRangeError("ks_m", ks_m, ">= 0 m", "ITTC-1978 roughness allowance")
    if not length_m > 0.0:
        raise ModelRangeError("length_m", length_m, "> 0 m", "ITTC-1978 roughness allowance")
    return (105.0 * (ks_m / length_m) ** (1.0 / 3.0) - 0.64) * 1.0e-3


# --------------------------------------------------------------------------------------------
# Common interface
# --------------------------------------------------------------------------------------------


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


# --------------------------------------------------------------------------------------------
# Holtrop & Mennen displacement hull
# --------------------------------------------------------------------------------------------

_HM = "Holtrop & Mennen"

HOLTROP_MENNEN_RANGES: dict[str, tuple[float, float]] = {
    "prismatic coefficient Cp": (0.55, 0.85),
    "length/beam L/B": (3.9, 9.5),
    "beam/draft B/T": (2.1, 4.0),
}
"""Envelope [-] of the hull data behind the Holtrop & Mennen regression (union of the ranges per
ship type tabulated with the method, Holtrop & Mennen 1982; values from memory)."""

_MAX_FROUDE = {"1982": 0.45, "1984": 1.0}


@dataclass(frozen=True)
class _HMCoefficients:
    """Speed-independent intermediate quantities of the Holtrop & Mennen method."""

    cb: float
    cp: float
    lr_m: float
    c12_or_c14: float
    c13: float
    ie_deg: float
    c1: float
    c2: float
    c3: float
    c5: float
    c7: float
    c15: float
    c16: float
    c17: float
    m1: float
    m3: float
    lam: float
    pb: float
    bulb_head_m2_s2: float
    bulb_coef_m3_s2: float
    transom_speed_m_s: float
    sqrt_gl_m_s: float
    wave_base_m4_s2: float
    rwa04_per_rho: float
    rwb055_per_rho: float
    ca: float


@dataclass(frozen=True)
class DisplacementHull:
    """Displacement hull resistance by the Holtrop & Mennen (1982) regression.

    Parameters
    ----------
    length_wl_m : float
        Length on the waterline L [m].
    beam_m : float
        Moulded breadth B [m].
    draft_m : float
        Mean moulded draught T [m].
    displaced_volume_m3 : float
        Moulded displaced volume ∇ [m³].
    midship_coefficient : float
        Midship section coefficient C_M [-], 0.5–1.
    waterplane_coefficient : float
        Waterplane area coefficient C_WP [-], 0.4–1.
    lcb_percent : float
        Longitudinal centre of buoyancy forward of 0.5 L, as a percentage of L [%] (negative aft),
        −10 to +10.
    block_coefficient : float or None
        C_B [-] on the waterline length; default ∇/(L B T). If given it must agree with that to
        within 1 %.
    prismatic_coefficient : float or None
        C_P [-]; default C_B / C_M. If given it must agree with that to within 1 %.
    draft_forward_m : float or None
        Moulded draught at the forward perpendicular T_F [m]; default ``draft_m``.
    bulb_area_m2 : float
        Transverse area of the bulbous bow where the still-water surface meets the stem A_BT [m²].
    bulb_centre_height_m : float
        Height of the centroid of A_BT above the keel line h_B [m] (at most 0.6 T_F).
    transom_area_m2 : float
        Immersed transom area at rest A_T [m²].
    stern_coefficient : float
        Afterbody form C_stern [-]: −25 pram with gondola, −10 V-shaped sections, 0 normal
        sections, +10 U-shaped sections with Hogner stern.
    appendage_area_m2 : float
        Wetted area of the appendages S_APP [m²] (hull appendages counted by the method).
    appendage_form_factor : float
        Equivalent (1+k2) [-] of those appendages (see
        :data:`HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS`).
    given_half_entrance_angle_deg : float or None
        Half angle of entrance of the waterline i_E [deg]; default the regression formula.
    given_wetted_area_m2 : float or None
        Wetted area of the bare hull S [m²]; default the Holtrop & Mennen formula.
    given_form_factor : float or None
        Form factor (1+k1) [-] (e.g. from a Prohaska plot); default the regression formula.
    given_correlation_allowance : float or None
        Model-ship correlation allowance C_A [-]; replaces the whole regression value including
        the roughness term.
    hull_roughness_m : float
        Hull roughness k_s [m]. Above the standard 150 µm the correlation allowance is increased
        by the Holtrop (1984) term; at or below it nothing is changed.
    revision : {"1982", "1984"}
        ``"1982"``: form factor and wave resistance of Holtrop & Mennen (1982), as in its worked
        example. ``"1984"``: form factor and wave resistance of Holtrop (1984), which adds a
        high-speed formulation (Fn > 0.55, interpolated for 0.4 < Fn < 0.55).
    check_ranges : bool
        When True (default) the hull proportions must lie in :data:`HOLTROP_MENNEN_RANGES`;
        set False only to extrapolate knowingly (e.g. small craft). Checks that keep the
        formulas defined are always made.

    Notes
    -----
    R_total = R_F (1+k1) + R_APP + R_W + R_B + R_TR + R_A, with

    * R_F = ½ρV²S C_F, C_F from the ITTC-1957 line at Re = VL/ν;
    * R_APP = ½ρV² S_APP (1+k2) C_F (the ship's C_F);
    * (1982) 1+k1 = c13 {0.93 + c12 (B/L_R)^0.92497 (0.95 − C_P)^−0.521448
      (1 − C_P + 0.0225 lcb)^0.6906}, c13 = 1 + 0.003 C_stern,
      c12 = (T/L)^0.2228446 for T/L > 0.05, 48.20 (T/L − 0.02)^2.078 + 0.479948 for
      0.02 < T/L ≤ 0.05, 0.479948 below;
    * (1984) 1+k1 = 0.93 + 0.487118 c14 (B/L)^1.06806 (T/L)^0.46106 (L/L_R)^0.121563
      (L³/∇)^0.36486 (1 − C_P)^−0.604247, c14 = 1 + 0.011 C_stern;
    * L_R = L [1 − C_P + 0.06 C_P lcb / (4 C_P − 1)];
    * S = L (2T + B) √C_M (0.4530 + 0.4425 C_B − 0.2862 C_M − 0.003467 B/T + 0.3696 C_WP)
      + 2.38 A_BT / C_B;
    * R_W = c1 c2 c5 ∇ ρ g exp{m1 Fn^d + m2 cos(λ Fn⁻²)}, d = −0.9, with c1 = 2223105
      c7^3.78613 (T/B)^1.07961 (90 − i_E)^−1.37565, c2 = exp(−1.89 √c3), c3 = 0.56 A_BT^1.5 /
      {B T (0.31 √A_BT + T_F − h_B)}, c5 = 1 − 0.8 A_T/(B T C_M), m1 = 0.0140407 L/T − 1.75254
      ∇^(1/3)/L − 4.79323 B/L − c16, m2 = c15 C_P² exp(−0.1 Fn⁻²) (1984: m4 = 0.4 c15
      exp(−0.034 Fn^−3.29)), λ = 1.446 C_P − 0.03 L/B (L/B < 12) or 1.446 C_P − 0.36;
      (1984, Fn > 0.55) c1 → c17 = 6919.3 C_M^−1.3346 (∇/L³)^2.00977 (L/B − 2)^1.40692 and
      m1 → m3 = −7.2035 (B/L)^0.326869 (T/B)^0.605375;
    * i_E = 1 + 89 exp{−(L/B)^0.80856 (1 − C_WP)^0.30484 (1 − C_P − 0.0225 lcb)^0.6367
      (L_R/B)^0.34574 (100∇/L³)^0.16302} [deg];
    * R_B = 0.11 exp(−3 P_B⁻²) Fn_i³ A_BT^1.5 ρ g / (1 + Fn_i²), P_B = 0.56 √A_BT/(T_F − 1.5 h_B),
      Fn_i = V / √{g (T_F − h_B − 0.25 √A_BT) + 0.15 V²};
    * R_TR = ½ρV² A_T c6, c6 = 0.2 (1 − 0.2 Fn_T) for Fn_T < 5, else 0,
      Fn_T = V / √{2 g A_T / (B + B C_WP)};
    * R_A = ½ρV² S C_A, C_A = 0.006 (L + 100)^−0.16 − 0.00205 + 0.003 √(L/7.5) C_B⁴ c2
      (0.04 − c4), c4 = min(T_F/L, 0.04); for k_s > 150 µm plus (0.105 k_s^(1/3) − 0.005579)
      / L^(1/3) (Holtrop 1984, k_s and L in metres).

    Speed range: the regression was fitted up to Fn ≈ 0.45 (1982; about 1.0 with the 1984
    revision, from memory), see :attr:`max_froude_number`. Faster speeds are *not* rejected at
    run time, because an ODE solver may probe them transiently: the same formulas are evaluated
    (the wave term then tends to a constant, so the total grows roughly as V²). Callers that plan
    a speed should use :meth:`check_speed`. At Fn < 0.01 the wave and bulb terms are below 1e-40
    of the displacement weight and are set to exactly zero; the viscous terms go as V².

    References
    ----------
    .. [1] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
       International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
    .. [2] Holtrop, J. (1984). A statistical re-analysis of resistance and propulsion data.
       International Shipbuilding Progress 31(363), 272–276. doi:10.3233/ISP-1984-3136302
    .. [3] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
    """

    length_wl_m: float
    beam_m: float
    draft_m: float
    displaced_volume_m3: float
    midship_coefficient: float
    waterplane_coefficient: float
    lcb_percent: float = 0.0
    block_coefficient: float | None = None
    prismatic_coefficient: float | None = None
    draft_forward_m: float | None = None
    bulb_area_m2: float = 0.0
    bulb_centre_height_m: float = 0.0
    transom_area_m2: float = 0.0
    stern_coefficient: float = 0.0
    appendage_area_m2: float = 0.0
    appendage_form_factor: float = 1.5
    given_half_entrance_angle_deg: float | None = None
    given_wetted_area_m2: float | None = None
    given_form_factor: float | None = None
    given_correlation_allowance: float | None = None
    hull_roughness_m: float = ITTC_STANDARD_ROUGHNESS_M
    revision: str = "1982"
    check_ranges: bool = True

    wetted_area_m2: float = field(init=False, repr=False, compare=False)
    """Wetted area of the bare hull S [m²] (given or from the regression)."""
    form_factor: float = field(init=False, repr=False, compare=False)
    """Form factor (1+k1) [-] (given or from the regression)."""
    half_entrance_angle_deg: float = field(init=False, repr=False, compare=False)
    """Half angle of entrance i_E [deg] (given or from the regression)."""
    correlation_allowance: float = field(init=False, repr=False, compare=False)
    """Model-ship correlation allowance C_A [-] (given or from the regression)."""
    _k: _HMCoefficients = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        L, B, T = self.length_wl_m, self.beam_m, self.draft_m
        vol = self.displaced_volume_m3
        cm, cwp = self.midship_coefficient, self.waterplane_coefficient
        lcb = self.lcb_percent
        for name in ("length_wl_m", "beam_m", "draft_m", "displaced_volume_m3"):
            _positive(name, getattr(self, name), _HM)
        _within("midship_coefficient", cm, 0.5, 1.0, _HM)
        _within("waterplane_coefficient", cwp, 0.4, 1.0, _HM)
        _within("lcb_percent", lcb, -10.0, 10.0, _HM, " % of L")
        _within("stern_coefficient", self.stern_coefficient, -25.0, 10.0, _HM)
        if self.revision not in _MAX_FROUDE:
            raise ModelRangeError("revision", self.revision, "'1982' or '1984'", _HM)

        cb = vol / (L * B * T)
        if self.block_coefficient is not None:
            if not abs(self.block_coefficient / cb - 1.0) <= 0.01:
                raise ModelRangeError(
                    "block_coefficient",
                    self.block_coefficient,
                    f"within 1 % of volume/(L B T) = {cb:.4f}",
                    _HM,
                )
            cb = float(self.block_coefficient)
        _within("block coefficient Cb", cb, 0.2, 0.99, _HM)
        cp = cb / cm
        if self.prismatic_coefficient is not None:
            if not abs(self.prismatic_coefficient / cp - 1.0) <= 0.01:
                raise ModelRangeError(
                    "prismatic_coefficient",
                    self.prismatic_coefficient,
                    f"within 1 % of Cb/Cm = {cp:.4f}",
                    _HM,
                )
            cp = float(self.prismatic_coefficient)
        if self.check_ranges:
            for (name, (lo, hi)), value in zip(
                HOLTROP_MENNEN_RANGES.items(), (cp, L / B, B / T), strict=True
            ):
                _within(name, value, lo, hi, _HM + " regression data")
        # domain of the formulas (always checked)
        _within("prismatic coefficient Cp", cp, 0.3, 0.94, _HM)
        tf = T if self.draft_forward_m is None else self.draft_forward_m
        _positive("draft_forward_m", tf, _HM)
        abt, hb, at = self.bulb_area_m2, self.bulb_centre_height_m, self.transom_area_m2
        _within("bulb_area_m2", abt, 0.0, 0.5 * B * T * cm, _HM, " m² (≤ half the midship area)")
        _within("transom_area_m2", at, 0.0, B * T * cm, _HM, " m² (≤ midship area)")
        if abt > 0.0:
            _within("bulb_centre_height_m", hb, 0.0, 0.6 * tf, _HM, " m (0.6 T_F)")
            if not tf - hb - 0.25 * math.sqrt(abt) > 0.0:
                raise ModelRangeError(
                    "bulb immersion T_F − h_B − 0.25√A_BT",
                    tf - hb - 0.25 * math.sqrt(abt),
                    "> 0 m",
                    _HM,
                )
        if not self.appendage_area_m2 >= 0.0:
            raise ModelRangeError("appendage_area_m2", self.appendage_area_m2, ">= 0 m²", _HM)
        _within("appendage_form_factor", self.appendage_form_factor, 1.0, 5.0, _HM)
        if not self.hull_roughness_m >= 0.0:
            raise ModelRangeError("hull_roughness_m", self.hull_roughness_m, ">= 0 m", _HM)

        g = STANDARD_GRAVITY_M_S2
        # length of run
        lr = L * (1.0 - cp + 0.06 * cp * lcb / (4.0 * cp - 1.0))
        if not lr > 0.0:
            raise ModelRangeError("length of run L_R", lr, "> 0 m", _HM)
        # wetted area
        if self.given_wetted_area_m2 is None:
            s = (
                L
                * (2.0 * T + B)
                * math.sqrt(cm)
                * (0.4530 + 0.4425 * cb - 0.2862 * cm - 0.003467 * B / T + 0.3696 * cwp)
                + 2.38 * abt / cb
            )
        else:
            _positive("given_wetted_area_m2", self.given_wetted_area_m2, _HM)
            s = float(self.given_wetted_area_m2)
        # form factor
        if self.revision == "1982":
            t_l = T / L
            if t_l > 0.05:
                c12 = t_l**0.2228446
            elif t_l > 0.02:
                c12 = 48.20 * (t_l - 0.02) ** 2.078 + 0.479948
            else:
                c12 = 0.479948
            c13 = 1.0 + 0.003 * self.stern_coefficient
            base = 1.0 - cp + 0.0225 * lcb
            if not base > 0.0:
                raise ModelRangeError("1 − Cp + 0.0225 lcb", base, "> 0", _HM)
            k1 = c13 * (0.93 + c12 * (B / lr) ** 0.92497 * (0.95 - cp) ** -0.521448 * base**0.6906)
        else:
            c12 = 1.0 + 0.011 * self.stern_coefficient  # c14 of the 1984 paper
            c13 = 1.0
            k1 = (
                0.93
                + 0.487118
                * c12
                * (B / L) ** 1.06806
                * (T / L) ** 0.46106
                * (L / lr) ** 0.121563
                * (L**3 / vol) ** 0.36486
                * (1.0 - cp) ** -0.604247
            )
        if self.given_form_factor is not None:
            _within("given_form_factor", self.given_form_factor, 1.0, 2.0, _HM)
            k1 = float(self.given_form_factor)
        # half angle of entrance
        if self.given_half_entrance_angle_deg is None:
            run = 1.0 - cp - 0.0225 * lcb
            if not run > 0.0:
                raise ModelRangeError("1 − Cp − 0.0225 lcb", run, "> 0", _HM)
            ie = 1.0 + 89.0 * math.exp(
                -((L / B) ** 0.80856)
                * (1.0 - cwp) ** 0.30484
                * run**0.6367
                * (lr / B) ** 0.34574
                * (100.0 * vol / L**3) ** 0.16302
            )
        else:
            ie = float(self.given_half_entrance_angle_deg)
            _within("given_half_entrance_angle_deg", ie, 1.0, 89.0, _HM, " deg")
        # wave resistance coefficients
        b_l = B / L
        if b_l < 0.11:
            c7 = 0.229577 * b_l ** (1.0 / 3.0)
        elif b_l < 0.25:
            c7 = b_l
        else:
            c7 = 0.5 - 0.0625 * L / B
        c1 = 2223105.0 * c7**3.78613 * (T / B) ** 1.07961 * (90.0 - ie) ** -1.37565
        c3 = 0.56 * abt**1.5 / (B * T * (0.31 * math.sqrt(abt) + tf - hb)) if abt > 0 else 0.0
        c2 = math.exp(-1.89 * math.sqrt(c3))
        c5 = 1.0 - 0.8 * at / (B * T * cm)
        if cp < 0.80:
            c16 = 8.07981 * cp - 13.8673 * cp**2 + 6.984388 * cp**3
        else:
            c16 = 1.73014 - 0.7067 * cp
        m1 = 0.0140407 * L / T - 1.75254 * vol ** (1.0 / 3.0) / L - 4.79323 * B / L - c16
        slender = L**3 / vol
        if slender < 512.0:
            c15 = -1.69385
        elif slender < 1726.91:
            c15 = -1.69385 + (L / vol ** (1.0 / 3.0) - 8.0) / 2.36
        else:
            c15 = 0.0
        lam = 1.446 * cp - 0.03 * L / B if L / B < 12.0 else 1.446 * cp - 0.36
        if self.revision == "1984":
            if not L / B > 2.0:
                raise ModelRangeError("length/beam L/B", L / B, "> 2", _HM + " 1984")
            c17 = 6919.3 * cm**-1.3346 * (vol / L**3) ** 2.00977 * (L / B - 2.0) ** 1.40692
            m3 = -7.2035 * b_l**0.326869 * (T / B) ** 0.605375
        else:
            c17 = m3 = 0.0
        wave_base = c2 * c5 * vol * g  # times rho at run time
        # bulb
        if abt > 0.0:
            pb = 0.56 * math.sqrt(abt) / (tf - 1.5 * hb)
            bulb_head = g * (tf - hb - 0.25 * math.sqrt(abt))
            bulb_coef = 0.11 * math.exp(-3.0 * pb**-2) * abt**1.5 * g
        else:
            pb = bulb_head = bulb_coef = 0.0
        # transom
        transom_speed = math.sqrt(2.0 * g * at / (B + B * cwp)) if at > 0.0 else 0.0
        # correlation allowance
        if self.given_correlation_allowance is None:
            c4 = min(tf / L, 0.04)
            ca = (
                0.006 * (L + 100.0) ** -0.16
                - 0.00205
                + 0.003 * math.sqrt(L / 7.5) * cb**4 * c2 * (0.04 - c4)
            )
            ks = self.hull_roughness_m
            if ks > ITTC_STANDARD_ROUGHNESS_M:
                ca += (0.105 * ks ** (1.0 / 3.0) - 0.005579) / L ** (1.0 / 3.0)
        else:
            ca = float(self.given_correlation_allowance)
            _within("given_correlation_allowance", ca, -0.002, 0.005, _HM)

        sqrt_gl = math.sqrt(g * L)
        k = _HMCoefficients(
            cb=cb,
            cp=cp,
            lr_m=lr,
            c12_or_c14=c12,
            c13=c13,
            ie_deg=ie,
            c1=c1,
            c2=c2,
            c3=c3,
            c5=c5,
            c7=c7,
            c15=c15,
            c16=c16,
            c17=c17,
            m1=m1,
            m3=m3,
            lam=lam,
            pb=pb,
            bulb_head_m2_s2=bulb_head,
            bulb_coef_m3_s2=bulb_coef,
            transom_speed_m_s=transom_speed,
            sqrt_gl_m_s=sqrt_gl,
            wave_base_m4_s2=wave_base,
            rwa04_per_rho=0.0,
            rwb055_per_rho=0.0,
            ca=ca,
        )
        object.__setattr__(self, "_k", k)
        if self.revision == "1984":
            rwa04 = float(self._wave_a_1984(np.asarray(0.4)))
            rwb055 = float(self._wave_b_1984(np.asarray(0.55)))
            k = replace(k, rwa04_per_rho=rwa04, rwb055_per_rho=rwb055)
            object.__setattr__(self, "_k", k)
        object.__setattr__(self, "wetted_area_m2", float(s))
        object.__setattr__(self, "form_factor", float(k1))
        object.__setattr__(self, "half_entrance_angle_deg", float(ie))
        object.__setattr__(self, "correlation_allowance", float(ca))

    # ---- properties -------------------------------------------------------------------------

    @property
    def max_froude_number(self) -> float:
        """Highest Froude number [-] of the data behind the chosen revision (see class Notes)."""
        return _MAX_FROUDE[self.revision]

    @property
    def max_speed_m_s(self) -> float:
        """Speed [m/s] at :attr:`max_froude_number`."""
        return self.max_froude_number * self._k.sqrt_gl_m_s

    @property
    def coefficients(self) -> dict[str, float]:
        """Speed-independent intermediate values of the method [-] (lengths in m, angle in deg),
        named as in the papers: Cb, Cp, L_R, c12 (1982) or c14 (1984), c13, iE, c1, c2, c3, c5,
        c7, c15, c16, c17, m1, m3, lambda, PB, CA, S, 1+k1."""
        k = self._k
        return {
            "Cb": k.cb,
            "Cp": k.cp,
            "L_R": k.lr_m,
            ("c12" if self.revision == "1982" else "c14"): k.c12_or_c14,
            "c13": k.c13,
            "iE": k.ie_deg,
            "c1": k.c1,
            "c2": k.c2,
            "c3": k.c3,
            "c5": k.c5,
            "c7": k.c7,
            "c15": k.c15,
            "c16": k.c16,
            "c17": k.c17,
            "m1": k.m1,
            "m3": k.m3,
            "lambda": k.lam,
            "PB": k.pb,
            "CA": k.ca,
            "S": self.wetted_area_m2,
            "1+k1": self.form_factor,
        }

    def check_speed(self, speed_m_s: ArrayLike) -> None:
        """Raise :class:`ModelRangeError` if any |speed| exceeds :attr:`max_speed_m_s`.

        Parameters
        ----------
        speed_m_s : float or array
            Planned speed(s) [m/s].
        """
        fn = np.abs(np.asarray(speed_m_s, dtype=float)) / self._k.sqrt_gl_m_s
        if np.any(fn > self.max_froude_number):
            raise ModelRangeError(
                "Froude number",
                float(np.max(fn)),
                f"<= {self.max_froude_number}",
                f"{_HM} {self.revision}",
            )

    # ---- wave terms -------------------------------------------------------------------------

    def _m4(self, fn: np.ndarray) -> np.ndarray:
        return self._k.c15 * 0.4 * np.exp(-0.034 * fn**-3.29)

    def _wave_a_1984(self, fn: np.ndarray) -> np.ndarray:
        k = self._k
        return (
            k.c1
            * k.wave_base_m4_s2
            * np.exp(k.m1 * fn**-0.9 + self._m4(fn) * np.cos(k.lam * fn**-2))
        )

    def _wave_b_1984(self, fn: np.ndarray) -> np.ndarray:
        k = self._k
        return (
            k.c17
            * k.wave_base_m4_s2
            * np.exp(k.m3 * fn**-0.9 + self._m4(fn) * np.cos(k.lam * fn**-2))
        )

    def _wave_per_rho(self, fn: np.ndarray) -> np.ndarray:
        """Wave resistance divided by density [N·m³/kg] at Froude numbers fn ≥ 0."""
        k = self._k
        f = np.maximum(fn, _FN_FLOOR)
        if self.revision == "1982":
            m2 = k.c15 * k.cp**2 * np.exp(-0.1 * f**-2)
            rw = k.c1 * k.wave_base_m4_s2 * np.exp(k.m1 * f**-0.9 + m2 * np.cos(k.lam * f**-2))
        else:
            mid = k.rwa04_per_rho + (f - 0.4) / 0.15 * (k.rwb055_per_rho - k.rwa04_per_rho)
            rw = np.where(
                f <= 0.4, self._wave_a_1984(f), np.where(f >= 0.55, self._wave_b_1984(f), mid)
            )
        return np.where(fn < _FN_FLOOR, 0.0, rw)

    # ---- interface --------------------------------------------------------------------------

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Resistance components at the given speed(s).

        Parameters
        ----------
        speed_m_s : float or array
            Speed through the water [m/s]; negative means astern (force changes sign).
        rho_kg_m3 : float
            Water density [kg/m³].
        nu_m2_s : float
            Kinematic viscosity [m²/s].

        Returns
        -------
        ResistanceBreakdown
            friction = R_F, form = k1·R_F, wave = R_W, transom = R_TR, bulb = R_B,
            appendage = R_APP, correlation = R_A [N]; total is their sum.
        """
        _check_fluid(rho_kg_m3, nu_m2_s)
        k = self._k
        v = np.asarray(speed_m_s, dtype=float)
        va = np.abs(v)
        sign = np.sign(v)
        q = 0.5 * rho_kg_m3 * va * va  # dynamic pressure [Pa]
        cf = _cf_clamped(va * (self.length_wl_m / nu_m2_s))
        rf = q * self.wetted_area_m2 * cf
        rapp = q * self.appendage_area_m2 * self.appendage_form_factor * cf
        rw = rho_kg_m3 * self._wave_per_rho(va / k.sqrt_gl_m_s)
        if k.bulb_coef_m3_s2 > 0.0:
            fni = va / np.sqrt(k.bulb_head_m2_s2 + 0.15 * va * va)
            rb = rho_kg_m3 * k.bulb_coef_m3_s2 * fni**3 / (1.0 + fni * fni)
        else:
            rb = 0.0 * va
        if k.transom_speed_m_s > 0.0:
            fnt = va / k.transom_speed_m_s
            c6 = np.where(fnt < 5.0, 0.2 * (1.0 - 0.2 * fnt), 0.0)
            rtr = q * self.transom_area_m2 * c6
        else:
            rtr = 0.0 * va
        ra = q * self.wetted_area_m2 * k.ca
        return _breakdown(
            v.ndim == 0,
            friction=sign * rf,
            form=sign * (self.form_factor - 1.0) * rf,
            wave=sign * rw,
            transom=sign * rtr,
            bulb=sign * rb,
            appendage=sign * rapp,
            correlation=sign * ra,
        )

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Total calm-water resistance [N] (see :meth:`breakdown` for the parameters).

        A Python/numpy float speed takes a scalar path (plain ``math``, several times faster
        than the array path, for the ODE right-hand side); it gives the same numbers.
        """
        if isinstance(speed_m_s, float | int):
            _check_fluid(rho_kg_m3, nu_m2_s)
            return self._total_scalar(float(speed_m_s), rho_kg_m3, nu_m2_s)
        return self.breakdown(speed_m_s, rho_kg_m3, nu_m2_s).total

    def _wave_per_rho_scalar(self, fn: float) -> float:
        k = self._k
        if fn < _FN_FLOOR:
            return 0.0
        if self.revision == "1982":
            m2 = k.c15 * k.cp * k.cp * math.exp(-0.1 / (fn * fn))
            return (
                k.c1
                * k.wave_base_m4_s2
                * math.exp(k.m1 * fn**-0.9 + m2 * math.cos(k.lam / (fn * fn)))
            )
        if 0.4 < fn < 0.55:
            return k.rwa04_per_rho + (fn - 0.4) / 0.15 * (k.rwb055_per_rho - k.rwa04_per_rho)
        m4 = k.c15 * 0.4 * math.exp(-0.034 * fn**-3.29)
        c, m = (k.c1, k.m1) if fn <= 0.4 else (k.c17, k.m3)
        return c * k.wave_base_m4_s2 * math.exp(m * fn**-0.9 + m4 * math.cos(k.lam / (fn * fn)))

    def _total_scalar(self, v: float, rho: float, nu: float) -> float:
        """Total resistance [N] for one speed, plain-float arithmetic (same formulas)."""
        va = abs(v)
        if va == 0.0:
            return 0.0
        k = self._k
        q = 0.5 * rho * va * va
        re = max(va * self.length_wl_m / nu, REYNOLDS_NUMBER_FLOOR)
        cf = 0.075 / (math.log10(re) - 2.0) ** 2
        total = (
            q
            * cf
            * (
                self.wetted_area_m2 * self.form_factor
                + self.appendage_area_m2 * self.appendage_form_factor
            )
        )
        total += q * self.wetted_area_m2 * k.ca
        total += rho * self._wave_per_rho_scalar(va / k.sqrt_gl_m_s)
        if k.bulb_coef_m3_s2 > 0.0:
            fni = va / math.sqrt(k.bulb_head_m2_s2 + 0.15 * va * va)
            total += rho * k.bulb_coef_m3_s2 * fni**3 / (1.0 + fni * fni)
        if k.transom_speed_m_s > 0.0:
            fnt = va / k.transom_speed_m_s
            if fnt < 5.0:
                total += q * self.transom_area_m2 * 0.2 * (1.0 - 0.2 * fnt)
        return math.copysign(total, v)


# --------------------------------------------------------------------------------------------
# Submerged body of revolution
# --------------------------------------------------------------------------------------------

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
            re = max(abs(v) * self.length_m / nu_m2_s, REYNOLDS_NUMBER_FLOOR)
            cd = 0.075 / (math.log10(re) - 2.0) ** 2 * self.form_factor + self.roughness_allowance
            return 0.5 * rho_kg_m3 * v * abs(v) * self.wetted_area_m2 * cd
        return self.breakdown(speed_m_s, rho_kg_m3, nu_m2_s).total


# --------------------------------------------------------------------------------------------
# Tabulated (measured) resistance
# --------------------------------------------------------------------------------------------

_TABLE = "tabulated resistance"


@dataclass(frozen=True)
class TabulatedResistance:
    """Measured resistance curve with shape-preserving interpolation.

    Parameters
    ----------
    speeds_m_s : sequence of float
        Speeds [m/s], strictly increasing, ≥ 0, at least 2 points. A point (0, 0) is added when
        the table does not start at zero speed.
    resistances_n : sequence of float
        Resistance at those speeds [N], ≥ 0; zero at zero speed.
    reference_density_kg_m3 : float or None
        Density [kg/m³] of the water the curve was measured or predicted in. If given, the
        resistance is scaled by ρ/ρ_ref (all components of a given hull at a given speed are
        proportional to ρ); if None the table is used as is. Viscosity is ignored.
    wetted_area_m2 : float or None
        Wetted area [m²] if known (informational).

    Notes
    -----
    Between table points: monotone piecewise-cubic Hermite interpolation (PCHIP, Fritsch &
    Carlson 1980, ``scipy.interpolate.PchipInterpolator``): it passes exactly through the points
    and adds no wiggles (it is monotone wherever the data are). Beyond the last point
    (V_max, R_max): R = R_max (V/V_max)², continuous at V_max (see :attr:`extrapolation_law`).
    Astern: R(−V) = −R(V). The whole curve is reported as ``unresolved`` in
    :meth:`breakdown`.

    References
    ----------
    .. [1] Fritsch, F. N. & Carlson, R. E. (1980). Monotone piecewise cubic interpolation.
       SIAM Journal on Numerical Analysis 17(2), 238–246. doi:10.1137/0717021
    """

    speeds_m_s: tuple[float, ...]
    resistances_n: tuple[float, ...]
    reference_density_kg_m3: float | None = None
    wetted_area_m2: float | None = None

    _interp: PchipInterpolator = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        v = np.asarray(self.speeds_m_s, dtype=float).ravel()
        r = np.asarray(self.resistances_n, dtype=float).ravel()
        if v.size != r.size:
            raise ModelRangeError(
                "number of resistances", r.size, f"equal to number of speeds ({v.size})", _TABLE
            )
        if v.size < 2:
            raise ModelRangeError("number of table points", v.size, ">= 2", _TABLE)
        if not (np.all(np.isfinite(v)) and np.all(np.isfinite(r))):
            raise ModelRangeError("table values", "non-finite", "finite numbers", _TABLE)
        if np.any(np.diff(v) <= 0.0):
            raise ModelRangeError("speeds_m_s", tuple(v), "strictly increasing", _TABLE)
        if v[0] < 0.0:
            raise ModelRangeError("speeds_m_s[0]", float(v[0]), ">= 0 m/s", _TABLE)
        if np.any(r < 0.0):
            raise ModelRangeError("resistances_n", float(r.min()), "all >= 0 N", _TABLE)
        if v[0] == 0.0 and r[0] != 0.0:
            raise ModelRangeError("resistance at zero speed", float(r[0]), "0 N", _TABLE)
        if self.reference_density_kg_m3 is not None:
            _positive("reference_density_kg_m3", self.reference_density_kg_m3, _TABLE)
        if self.wetted_area_m2 is not None:
            _positive("wetted_area_m2", self.wetted_area_m2, _TABLE)
        if v[0] > 0.0:
            v = np.concatenate(([0.0], v))
            r = np.concatenate(([0.0], r))
        if v.size < 3 and r[-1] == 0.0:
            raise ModelRangeError("resistances_n", tuple(r), "not all zero", _TABLE)
        object.__setattr__(self, "speeds_m_s", tuple(float(x) for x in v))
        object.__setattr__(self, "resistances_n", tuple(float(x) for x in r))
        object.__setattr__(self, "_interp", PchipInterpolator(v, r, extrapolate=False))

    @property
    def max_speed_m_s(self) -> float:
        """Last tabulated speed V_max [m/s]; beyond it the V² law applies."""
        return self.speeds_m_s[-1]

    @property
    def extrapolation_law(self) -> str:
        """The law used beyond the table (text)."""
        return (
            f"R = R_max (V/V_max)^2 for |V| > V_max = {self.max_speed_m_s:g} m/s "
            f"(R_max = {self.resistances_n[-1]:g} N); continuous at V_max"
        )

    def breakdown(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> ResistanceBreakdown:
        """Resistance at the given speed(s), all of it ``unresolved`` [N].

        Parameters
        ----------
        speed_m_s : float or array
            Speed [m/s]; negative means astern.
        rho_kg_m3 : float
            Water density [kg/m³] (used only with ``reference_density_kg_m3``).
        nu_m2_s : float
            Kinematic viscosity [m²/s] (not used).

        Returns
        -------
        ResistanceBreakdown
            ``unresolved`` = ``total`` = R [N]; other components zero.
        """
        _check_fluid(rho_kg_m3, nu_m2_s)
        v = np.asarray(speed_m_s, dtype=float)
        va = np.abs(v)
        vmax, rmax = self.speeds_m_s[-1], self.resistances_n[-1]
        inside = self._interp(np.minimum(va, vmax))
        r = np.where(va <= vmax, inside, rmax * (va / vmax) ** 2)
        if self.reference_density_kg_m3 is not None:
            r = r * (rho_kg_m3 / self.reference_density_kg_m3)
        return _breakdown(v.ndim == 0, unresolved=np.sign(v) * r)

    def resistance_n(
        self, speed_m_s: ArrayLike, rho_kg_m3: float, nu_m2_s: float
    ) -> float | np.ndarray:
        """Resistance [N] (see :meth:`breakdown` for the parameters)."""
        return self.breakdown(speed_m_s, rho_kg_m3, nu_m2_s).total


# --------------------------------------------------------------------------------------------
# Appendages and composition
# --------------------------------------------------------------------------------------------

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
            re = max(abs(v) * self.reference_length_m / nu_m2_s, REYNOLDS_NUMBER_FLOOR)
            cf = 0.075 / (math.log10(re) - 2.0) ** 2
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


# --------------------------------------------------------------------------------------------
# Added mass in surge
# --------------------------------------------------------------------------------------------


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
