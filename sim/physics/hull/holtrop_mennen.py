"""Displacement hull resistance by the Holtrop & Mennen (1982) regression, with the Holtrop
(1984) revision as an option.

The method is split in two: :func:`holtrop_mennen_coefficients`, a pure function of the hull
that computes every speed-independent quantity once (a frozen
:class:`HoltropMennenCoefficients`), and :class:`DisplacementHull`, the resistance model that
evaluates the speed-dependent terms from them at every right-hand-side call of the ODE solver.
The wave-resistance functions of the coefficients are module functions; each vectorised form
has its plain-float scalar twin next to it.

References
----------
.. [1] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
   International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
.. [2] Holtrop, J. (1984). A statistical re-analysis of resistance and propulsion data.
   International Shipbuilding Progress 31(363), 272–276. doi:10.3233/ISP-1984-3136302
.. [3] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
.. [4] ITTC (1978). Report of the Performance Committee, Proceedings of the 15th ITTC, The Hague.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields, replace

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError
from sim.physics.hull.friction import (
    ITTC_STANDARD_ROUGHNESS_M,
    STANDARD_GRAVITY_M_S2,
    _cf_clamped,
    _cf_clamped_scalar,
)
from sim.physics.hull.interface import (
    ResistanceBreakdown,
    _breakdown,
    _check_fluid,
    _positive,
    _within,
)

__all__ = [
    "HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS",
    "HOLTROP_MENNEN_RANGES",
    "DisplacementHull",
    "HoltropMennenCoefficients",
    "holtrop_mennen_coefficients",
]

_HM = "Holtrop & Mennen"

HOLTROP_MENNEN_RANGES: dict[str, tuple[float, float]] = {
    "prismatic coefficient Cp": (0.55, 0.85),
    "length/beam L/B": (3.9, 9.5),
    "beam/draft B/T": (2.1, 4.0),
}
"""Envelope [-] of the hull data behind the Holtrop & Mennen regression (union of the ranges per
ship type tabulated with the method, Holtrop & Mennen 1982; values from memory)."""

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

_MAX_FROUDE = {"1982": 0.45, "1984": 1.0}
_FN_FLOOR = 1.0e-2  # below this Froude number the wave terms are exactly zero (they are < 1e-40)


# --------------------------------------------------------------------------------------------
# Speed-independent coefficients (a pure function of the hull)
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class HoltropMennenCoefficients:
    """Speed-independent quantities of the Holtrop & Mennen method for one hull.

    Names follow the papers (Holtrop & Mennen 1982; Holtrop 1984). Dimensionless unless a unit
    is given.
    """

    revision: str
    """Revision of the form-factor and wave formulas, ``"1982"`` or ``"1984"``."""
    cb: float
    """Block coefficient C_B [-]."""
    cp: float
    """Prismatic coefficient C_P [-]."""
    lr_m: float
    """Length of run L_R [m]."""
    c12_or_c14: float
    """c12 of the 1982 form factor, or c14 of the 1984 one [-]."""
    c13: float
    """c13 of the 1982 form factor (1 for the 1984 revision) [-]."""
    ie_deg: float
    """Half angle of entrance i_E [deg] (given or from the regression)."""
    c1: float
    """Wave coefficient c1 [-]."""
    c2: float
    """Bulb coefficient c2 [-]."""
    c3: float
    """Bulb coefficient c3 [-]."""
    c5: float
    """Transom coefficient c5 [-]."""
    c7: float
    """Beam coefficient c7 [-]."""
    c15: float
    """Slenderness coefficient c15 [-]."""
    c16: float
    """Prismatic coefficient term c16 [-]."""
    c17: float
    """High-speed wave coefficient c17 of the 1984 revision (0 for 1982) [-]."""
    m1: float
    """Wave exponent coefficient m1 [-]."""
    m3: float
    """High-speed wave exponent coefficient m3 of the 1984 revision (0 for 1982) [-]."""
    lam: float
    """Wave coefficient λ [-]."""
    pb: float
    """Bulb emergence measure P_B [-] (0 without a bulb)."""
    bulb_head_m2_s2: float
    """g (T_F − h_B − 0.25 √A_BT) [m²/s²], the bulb immersion Froude number's head term."""
    bulb_coef_m3_s2: float
    """0.11 exp(−3 P_B⁻²) A_BT^1.5 g [m⁴/s²], so that R_B = ρ·this·Fn_i³/(1 + Fn_i²)."""
    transom_speed_m_s: float
    """√(2 g A_T / (B + B C_WP)) [m/s], the transom Froude number's reference speed."""
    sqrt_gl_m_s: float
    """√(g L) [m/s], the length Froude number's reference speed."""
    wave_base_m4_s2: float
    """c2 c5 ∇ g [m⁴/s²]: wave resistance divided by ρ c1 exp(...)."""
    rwa04_per_rho: float
    """1984 low-speed wave resistance at Fn 0.40, divided by ρ [N·m³/kg] (0 for 1982)."""
    rwb055_per_rho: float
    """1984 high-speed wave resistance at Fn 0.55, divided by ρ [N·m³/kg] (0 for 1982)."""
    ca: float
    """Model-ship correlation allowance C_A [-] (given or from the regression)."""
    wetted_area_m2: float
    """Wetted area of the bare hull S [m²] (given or from the regression)."""
    form_factor: float
    """Form factor (1+k1) [-] (given or from the regression)."""


def holtrop_mennen_coefficients(
    length_wl_m: float,
    beam_m: float,
    draft_m: float,
    displaced_volume_m3: float,
    midship_coefficient: float,
    waterplane_coefficient: float,
    lcb_percent: float = 0.0,
    block_coefficient: float | None = None,
    prismatic_coefficient: float | None = None,
    draft_forward_m: float | None = None,
    bulb_area_m2: float = 0.0,
    bulb_centre_height_m: float = 0.0,
    transom_area_m2: float = 0.0,
    stern_coefficient: float = 0.0,
    appendage_area_m2: float = 0.0,
    appendage_form_factor: float = 1.5,
    given_half_entrance_angle_deg: float | None = None,
    given_wetted_area_m2: float | None = None,
    given_form_factor: float | None = None,
    given_correlation_allowance: float | None = None,
    hull_roughness_m: float = ITTC_STANDARD_ROUGHNESS_M,
    revision: str = "1982",
    check_ranges: bool = True,
) -> HoltropMennenCoefficients:
    """Speed-independent coefficients of the Holtrop & Mennen method for one hull.

    Parameters
    ----------
    length_wl_m, beam_m, draft_m : float
        Waterline length L, moulded breadth B, mean moulded draught T [m].
    displaced_volume_m3 : float
        Moulded displaced volume ∇ [m³].
    midship_coefficient, waterplane_coefficient : float
        C_M (0.5–1) and C_WP (0.4–1) [-].
    lcb_percent : float
        Longitudinal centre of buoyancy forward of 0.5 L [% of L], −10 to +10.
    block_coefficient, prismatic_coefficient : float or None
        C_B and C_P [-]; default ∇/(L B T) and C_B/C_M (a given value must agree within 1 %).
    draft_forward_m : float or None
        Draught at the forward perpendicular T_F [m]; default ``draft_m``.
    bulb_area_m2, bulb_centre_height_m : float
        Bulb transverse area A_BT [m²] and the height of its centroid h_B [m].
    transom_area_m2 : float
        Immersed transom area A_T [m²].
    stern_coefficient : float
        C_stern [-], −25 to +10.
    appendage_area_m2, appendage_form_factor : float
        S_APP [m²] and its (1+k2) [-], 1–5 (checked here; used by the resistance model).
    given_half_entrance_angle_deg, given_wetted_area_m2, given_form_factor,
    given_correlation_allowance : float or None
        Override i_E [deg], S [m²], (1+k1) [-] and C_A [-] instead of the regression values.
    hull_roughness_m : float
        Hull roughness k_s [m]; above 150 µm C_A gets the Holtrop (1984) term.
    revision : {"1982", "1984"}
        Form factor and wave formulas of Holtrop & Mennen (1982) or Holtrop (1984).
    check_ranges : bool
        Require the proportions to lie in :data:`HOLTROP_MENNEN_RANGES`.

    Returns
    -------
    HoltropMennenCoefficients
        Every speed-independent quantity of the method, named as in the papers.

    Raises
    ------
    ModelRangeError
        If an input lies outside the range of the data or of the formulas.

    Notes
    -----
    The formulas (L_R, S, 1+k1, i_E, c1…c17, m1, m3, λ, P_B, C_A) are listed in the Notes of
    :class:`DisplacementHull`; the parameters are its fields, with the same names and units.

    References
    ----------
    .. [1] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
       International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
    .. [2] Holtrop, J. (1984). A statistical re-analysis of resistance and propulsion data.
       International Shipbuilding Progress 31(363), 272–276. doi:10.3233/ISP-1984-3136302
    """
    L, B, T = length_wl_m, beam_m, draft_m
    vol = displaced_volume_m3
    cm, cwp = midship_coefficient, waterplane_coefficient
    lcb = lcb_percent
    for name, value in (
        ("length_wl_m", L),
        ("beam_m", B),
        ("draft_m", T),
        ("displaced_volume_m3", vol),
    ):
        _positive(name, value, _HM)
    _within("midship_coefficient", cm, 0.5, 1.0, _HM)
    _within("waterplane_coefficient", cwp, 0.4, 1.0, _HM)
    _within("lcb_percent", lcb, -10.0, 10.0, _HM, " % of L")
    _within("stern_coefficient", stern_coefficient, -25.0, 10.0, _HM)
    if revision not in _MAX_FROUDE:
        raise ModelRangeError("revision", revision, "'1982' or '1984'", _HM)

    cb = vol / (L * B * T)
    if block_coefficient is not None:
        if not abs(block_coefficient / cb - 1.0) <= 0.01:
            raise ModelRangeError(
                "block_coefficient",
                block_coefficient,
                f"within 1 % of volume/(L B T) = {cb:.4f}",
                _HM,
            )
        cb = float(block_coefficient)
    _within("block coefficient Cb", cb, 0.2, 0.99, _HM)
    cp = cb / cm
    if prismatic_coefficient is not None:
        if not abs(prismatic_coefficient / cp - 1.0) <= 0.01:
            raise ModelRangeError(
                "prismatic_coefficient",
                prismatic_coefficient,
                f"within 1 % of Cb/Cm = {cp:.4f}",
                _HM,
            )
        cp = float(prismatic_coefficient)
    if check_ranges:
        for (name, (lo, hi)), value in zip(
            HOLTROP_MENNEN_RANGES.items(), (cp, L / B, B / T), strict=True
        ):
            _within(name, value, lo, hi, _HM + " regression data")
    # domain of the formulas (always checked)
    _within("prismatic coefficient Cp", cp, 0.3, 0.94, _HM)
    tf = T if draft_forward_m is None else draft_forward_m
    _positive("draft_forward_m", tf, _HM)
    abt, hb, at = bulb_area_m2, bulb_centre_height_m, transom_area_m2
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
    if not appendage_area_m2 >= 0.0:
        raise ModelRangeError("appendage_area_m2", appendage_area_m2, ">= 0 m²", _HM)
    _within("appendage_form_factor", appendage_form_factor, 1.0, 5.0, _HM)
    if not hull_roughness_m >= 0.0:
        raise ModelRangeError("hull_roughness_m", hull_roughness_m, ">= 0 m", _HM)

    g = STANDARD_GRAVITY_M_S2
    # length of run
    lr = L * (1.0 - cp + 0.06 * cp * lcb / (4.0 * cp - 1.0))
    if not lr > 0.0:
        raise ModelRangeError("length of run L_R", lr, "> 0 m", _HM)
    # wetted area
    if given_wetted_area_m2 is None:
        s = (
            L
            * (2.0 * T + B)
            * math.sqrt(cm)
            * (0.4530 + 0.4425 * cb - 0.2862 * cm - 0.003467 * B / T + 0.3696 * cwp)
            + 2.38 * abt / cb
        )
    else:
        _positive("given_wetted_area_m2", given_wetted_area_m2, _HM)
        s = float(given_wetted_area_m2)
    # form factor
    if revision == "1982":
        t_l = T / L
        if t_l > 0.05:
            c12 = t_l**0.2228446
        elif t_l > 0.02:
            c12 = 48.20 * (t_l - 0.02) ** 2.078 + 0.479948
        else:
            c12 = 0.479948
        c13 = 1.0 + 0.003 * stern_coefficient
        base = 1.0 - cp + 0.0225 * lcb
        if not base > 0.0:
            raise ModelRangeError("1 − Cp + 0.0225 lcb", base, "> 0", _HM)
        k1 = c13 * (0.93 + c12 * (B / lr) ** 0.92497 * (0.95 - cp) ** -0.521448 * base**0.6906)
    else:
        c12 = 1.0 + 0.011 * stern_coefficient  # c14 of the 1984 paper
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
    if given_form_factor is not None:
        _within("given_form_factor", given_form_factor, 1.0, 2.0, _HM)
        k1 = float(given_form_factor)
    # half angle of entrance
    if given_half_entrance_angle_deg is None:
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
        ie = float(given_half_entrance_angle_deg)
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
    if revision == "1984":
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
    if given_correlation_allowance is None:
        c4 = min(tf / L, 0.04)
        ca = (
            0.006 * (L + 100.0) ** -0.16
            - 0.00205
            + 0.003 * math.sqrt(L / 7.5) * cb**4 * c2 * (0.04 - c4)
        )
        ks = hull_roughness_m
        if ks > ITTC_STANDARD_ROUGHNESS_M:
            ca += (0.105 * ks ** (1.0 / 3.0) - 0.005579) / L ** (1.0 / 3.0)
    else:
        ca = float(given_correlation_allowance)
        _within("given_correlation_allowance", ca, -0.002, 0.005, _HM)

    k = HoltropMennenCoefficients(
        revision=revision,
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
        sqrt_gl_m_s=math.sqrt(g * L),
        wave_base_m4_s2=wave_base,
        rwa04_per_rho=0.0,
        rwb055_per_rho=0.0,
        ca=ca,
        wetted_area_m2=float(s),
        form_factor=float(k1),
    )
    if revision == "1984":
        k = replace(
            k,
            rwa04_per_rho=float(_wave_a_1984(k, np.asarray(0.4))),
            rwb055_per_rho=float(_wave_b_1984(k, np.asarray(0.55))),
        )
    return k


# --------------------------------------------------------------------------------------------
# Wave resistance (vectorised forms and their scalar twins)
# --------------------------------------------------------------------------------------------


def _m4(k: HoltropMennenCoefficients, fn: np.ndarray) -> np.ndarray:
    """m4 = 0.4 c15 exp(−0.034 Fn^−3.29) of Holtrop (1984) [-]."""
    return k.c15 * 0.4 * np.exp(-0.034 * fn**-3.29)


def _wave_a_1984(k: HoltropMennenCoefficients, fn: np.ndarray) -> np.ndarray:
    """Holtrop (1984) low-speed wave resistance divided by density [N·m³/kg]."""
    return k.c1 * k.wave_base_m4_s2 * np.exp(k.m1 * fn**-0.9 + _m4(k, fn) * np.cos(k.lam * fn**-2))


def _wave_b_1984(k: HoltropMennenCoefficients, fn: np.ndarray) -> np.ndarray:
    """Holtrop (1984) high-speed wave resistance divided by density [N·m³/kg]."""
    return k.c17 * k.wave_base_m4_s2 * np.exp(k.m3 * fn**-0.9 + _m4(k, fn) * np.cos(k.lam * fn**-2))


def _wave_per_rho(k: HoltropMennenCoefficients, fn: np.ndarray) -> np.ndarray:
    """Wave resistance divided by density [N·m³/kg] at Froude numbers fn ≥ 0."""
    f = np.maximum(fn, _FN_FLOOR)
    if k.revision == "1982":
        m2 = k.c15 * k.cp**2 * np.exp(-0.1 * f**-2)
        rw = k.c1 * k.wave_base_m4_s2 * np.exp(k.m1 * f**-0.9 + m2 * np.cos(k.lam * f**-2))
    else:
        mid = k.rwa04_per_rho + (f - 0.4) / 0.15 * (k.rwb055_per_rho - k.rwa04_per_rho)
        rw = np.where(f <= 0.4, _wave_a_1984(k, f), np.where(f >= 0.55, _wave_b_1984(k, f), mid))
    return np.where(fn < _FN_FLOOR, 0.0, rw)


def _wave_per_rho_scalar(k: HoltropMennenCoefficients, fn: float) -> float:
    """Scalar twin of :func:`_wave_per_rho` for one plain float Fn ≥ 0 [N·m³/kg]."""
    if fn < _FN_FLOOR:
        return 0.0
    if k.revision == "1982":
        m2 = k.c15 * k.cp * k.cp * math.exp(-0.1 / (fn * fn))
        return (
            k.c1 * k.wave_base_m4_s2 * math.exp(k.m1 * fn**-0.9 + m2 * math.cos(k.lam / (fn * fn)))
        )
    if 0.4 < fn < 0.55:
        return k.rwa04_per_rho + (fn - 0.4) / 0.15 * (k.rwb055_per_rho - k.rwa04_per_rho)
    m4 = k.c15 * 0.4 * math.exp(-0.034 * fn**-3.29)
    c, m = (k.c1, k.m1) if fn <= 0.4 else (k.c17, k.m3)
    return c * k.wave_base_m4_s2 * math.exp(m * fn**-0.9 + m4 * math.cos(k.lam / (fn * fn)))


# --------------------------------------------------------------------------------------------
# The resistance model
# --------------------------------------------------------------------------------------------


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
    _k: HoltropMennenCoefficients = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        init = {f.name: getattr(self, f.name) for f in fields(self) if f.init}
        k = holtrop_mennen_coefficients(**init)
        object.__setattr__(self, "_k", k)
        object.__setattr__(self, "wetted_area_m2", k.wetted_area_m2)
        object.__setattr__(self, "form_factor", k.form_factor)
        object.__setattr__(self, "half_entrance_angle_deg", float(k.ie_deg))
        object.__setattr__(self, "correlation_allowance", float(k.ca))

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
        rw = rho_kg_m3 * _wave_per_rho(k, va / k.sqrt_gl_m_s)
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

    def _total_scalar(self, v: float, rho: float, nu: float) -> float:
        """Total resistance [N] for one speed, plain-float arithmetic (same formulas)."""
        va = abs(v)
        if va == 0.0:
            return 0.0
        k = self._k
        q = 0.5 * rho * va * va
        cf = _cf_clamped_scalar(va * self.length_wl_m / nu)
        total = (
            q
            * cf
            * (
                self.wetted_area_m2 * self.form_factor
                + self.appendage_area_m2 * self.appendage_form_factor
            )
        )
        total += q * self.wetted_area_m2 * k.ca
        total += rho * _wave_per_rho_scalar(k, va / k.sqrt_gl_m_s)
        if k.bulb_coef_m3_s2 > 0.0:
            fni = va / math.sqrt(k.bulb_head_m2_s2 + 0.15 * va * va)
            total += rho * k.bulb_coef_m3_s2 * fni**3 / (1.0 + fni * fni)
        if k.transom_speed_m_s > 0.0:
            fnt = va / k.transom_speed_m_s
            if fnt < 5.0:
                total += q * self.transom_area_m2 * 0.2 * (1.0 - 0.2 * fnt)
        return math.copysign(total, v)
