"""Friction in straight rectangular ducts: hydraulic diameter, Darcy friction factor, losses.

The thruster channels are straight rectangular ducts. This module gives the Darcy friction
factor for fully developed flow in them over the whole Reynolds-number range, vectorised over
numpy arrays:

* laminar, Re < 2300: f = C(α)/Re with the Shah & London (1978) polynomial for C(α) of a
  rectangle with aspect ratio α = short side / long side (C = 96 for parallel plates, α → 0;
  C = 56.91 for a square, α = 1);
* turbulent, Re > 4000: the Colebrook (1939) equation with the hydraulic diameter
  D_h = 4A/P as the length scale, solved by Newton's method on 1/√f from the explicit
  Swamee & Jain (1976) estimate (converged to 1e-12 relative);
* transition, 2300 ≤ Re ≤ 4000: a blend of the two curves with a weight that is linear in Re,
  f = (1 − t) f_lam(Re) + t f_Colebrook(Re), t = (Re − 2300)/1700. The blend is continuous at
  both ends; it is a modelling choice (the real flow is intermittent there), not a correlation.

Using D_h in Colebrook for a rectangle is the usual practice; it over-predicts f of flat ducts
by up to about 10 % (Jones 1976), well inside the ±15 % accuracy of the Moody chart itself.

Because f → ∞ as Re → 0, the functions that a flow solver needs at zero flow work with the
product f·Re, which stays finite (it equals C(α) in laminar flow).

References
----------
Colebrook, C. F. (1939). Turbulent flow in pipes, with particular reference to the transition
region between the smooth and rough pipe laws. Journal of the Institution of Civil Engineers
11(4), 133–156. doi:10.1680/ijoti.1939.13150.

Swamee, P. K., & Jain, A. K. (1976). Explicit equations for pipe-flow problems. Journal of the
Hydraulics Division, ASCE 102(5), 657–664.

Shah, R. K., & London, A. L. (1978). Laminar Flow Forced Convection in Ducts. Advances in Heat
Transfer, Supplement 1. Academic Press, New York. (Rectangular ducts, fully developed f·Re.)

Jones, O. C. (1976). An improvement in the calculation of turbulent friction in rectangular
ducts. Journal of Fluids Engineering 98(2), 173–180. doi:10.1115/1.3448250.

White, F. M. (2011). Fluid Mechanics, 7th ed., McGraw-Hill, ch. 6 (Moody chart, ±15 %).
"""

from __future__ import annotations

import math

import numpy as np

from sim.physics.errors import ModelRangeError

RE_LAMINAR_MAX = 2300.0
"""Upper Reynolds number of the purely laminar branch [-]."""

RE_TURBULENT_MIN = 4000.0
"""Lower Reynolds number of the purely turbulent (Colebrook) branch [-]."""

REL_ROUGHNESS_MAX = 0.1
"""Largest relative roughness ε/D_h accepted [-] (Moody chart goes to 0.05)."""

_SHAH_LONDON = (1.0, -1.3553, 1.9467, -1.7012, 0.9564, -0.2537)
_LN10 = math.log(10.0)
_COLEBROOK_TOL = 1e-12


def hydraulic_diameter_m(width_m, height_m):
    """Hydraulic diameter of a rectangular duct.

    Parameters
    ----------
    width_m : float or array
        One side of the cross-section [m].
    height_m : float or array
        The other side [m].

    Returns
    -------
    float or ndarray
        D_h [m].

    Notes
    -----
    D_h = 4A/P = 4wh/(2(w + h)) = 2wh/(w + h). A square of side a gives D_h = a; very flat ducts
    (h ≪ w) give D_h → 2h.

    References
    ----------
    Definition of the hydraulic diameter, e.g. White, F. M. (2011). Fluid Mechanics, 7th ed.,
    McGraw-Hill, §6.8.
    """
    w = np.asarray(width_m, dtype=float)
    h = np.asarray(height_m, dtype=float)
    if np.any(w <= 0.0) or np.any(h <= 0.0):
        raise ModelRangeError("duct side", (width_m, height_m), "> 0 m", "hydraulic diameter")
    d = 2.0 * w * h / (w + h)
    return float(d) if d.ndim == 0 else d


def laminar_fre(aspect_ratio):
    """Laminar Darcy f·Re of a rectangular duct (Shah & London polynomial).

    Parameters
    ----------
    aspect_ratio : float or array
        α = short side / long side, 0 ≤ α ≤ 1 [-].

    Returns
    -------
    float or ndarray
        C = f·Re [-] (Darcy friction factor times Reynolds number on D_h).

    Notes
    -----
    C = 96 (1 − 1.3553α + 1.9467α² − 1.7012α³ + 0.9564α⁴ − 0.2537α⁵); α = 0 gives the
    parallel-plate value 96, α = 1 the square duct 56.92 (exact 56.908). The polynomial is
    within 0.1 % of the exact series solution.

    References
    ----------
    Shah, R. K., & London, A. L. (1978). Laminar Flow Forced Convection in Ducts. Advances in
    Heat Transfer, Suppl. 1, Academic Press.
    """
    a = np.asarray(aspect_ratio, dtype=float)
    if np.any(a < 0.0) or np.any(a > 1.0):
        raise ModelRangeError("aspect_ratio", aspect_ratio, "0 ≤ short/long ≤ 1", "Shah & London")
    c = _SHAH_LONDON
    poly = c[0] + a * (c[1] + a * (c[2] + a * (c[3] + a * (c[4] + a * c[5]))))
    out = 96.0 * poly
    return float(out) if out.ndim == 0 else out


def _colebrook_x(re, rel_roughness):
    """1/√f from Colebrook by Newton's method (arrays, re > 0). Returns (x, h) with
    h = (2/ln10)·b/(a + b·x), b = 2.51/Re, a = ε/(3.7 D), so that d ln f / d ln Re = −2h/(1+h)."""
    a = rel_roughness / 3.7
    b = 2.51 / re
    # Swamee & Jain (1976) start: f = 0.25 / log10(ε/3.7D + 5.74/Re^0.9)²
    x = -2.0 * np.log10(a + 5.74 * re**-0.9)
    for _ in range(30):
        arg = a + b * x
        fx = x + 2.0 * np.log10(arg)
        dfx = 1.0 + (2.0 / _LN10) * b / arg
        dx = fx / dfx
        x = x - dx
        if np.all(np.abs(dx) <= _COLEBROOK_TOL * np.abs(x)):
            break
    else:  # pragma: no cover - Newton on this convex function converges in < 6 steps
        raise ModelRangeError("Colebrook iteration", "not converged", "1e-12 in 30 steps")
    h = (2.0 / _LN10) * b / (a + b * x)
    return x, h


def _check_inputs(re, rel_roughness, aspect_ratio):
    re = np.asarray(re, dtype=float)
    eps = np.asarray(rel_roughness, dtype=float)
    alpha = np.asarray(aspect_ratio, dtype=float)
    if np.any(~np.isfinite(re)) or np.any(re < 0.0):
        raise ModelRangeError("Reynolds number", "negative or non-finite", "0 ≤ Re < ∞", "duct")
    if np.any(eps < 0.0) or np.any(eps > REL_ROUGHNESS_MAX):
        raise ModelRangeError(
            "relative roughness", rel_roughness, f"0 ≤ ε/D_h ≤ {REL_ROUGHNESS_MAX}", "Colebrook"
        )
    if np.any(alpha < 0.0) or np.any(alpha > 1.0):
        raise ModelRangeError("aspect_ratio", aspect_ratio, "0 ≤ short/long ≤ 1", "Shah & London")
    return np.broadcast_arrays(re, eps, alpha)


def friction_terms(re, rel_roughness, aspect_ratio):
    """Darcy f·Re, f and the log-slope d ln f / d ln Re, finite at Re = 0.

    For solvers: writing f(Re) ≈ f_n[(1 + m) + (−m) Re_n/Re] around Re_n matches value and slope
    there, so the friction pressure drop splits into a quadratic part ∝ (1 + m) f_n u² and a
    linear part ∝ (−m) (f·Re)_n |u|; in laminar flow (m = −1) this split is exact.

    Parameters
    ----------
    re : float or array
        Reynolds number on the hydraulic diameter, ≥ 0 [-].
    rel_roughness : float or array
        ε/D_h [-].
    aspect_ratio : float or array
        Short side / long side [-].

    Returns
    -------
    fre : ndarray
        f·Re [-], finite everywhere (= C(α) for Re < 2300).
    f_quadratic : ndarray
        (1 + m)·f [-]: the part of f that scales with u²; 0 in laminar flow (finite at Re = 0).
    m : ndarray
        d ln f / d ln Re [-]: −1 laminar, about −0.25 … 0 turbulent, positive in the blend.

    Notes
    -----
    See the module docstring for the branches and the transition blend.

    References
    ----------
    Colebrook (1939); Swamee & Jain (1976); Shah & London (1978) — see the module docstring.
    """
    re, eps, alpha = _check_inputs(re, rel_roughness, aspect_ratio)
    shape = re.shape
    re, eps, alpha = (np.array(v, dtype=float).reshape(-1) for v in (re, eps, alpha))
    c_lam = np.asarray(laminar_fre(alpha), dtype=float)
    fre = c_lam.copy()
    fq = np.zeros_like(re)
    m = -np.ones_like(re)
    turb = re >= RE_LAMINAR_MAX
    if np.any(turb):
        rt = re[turb]
        x, h = _colebrook_x(rt, eps[turb])
        f_t = 1.0 / (x * x)
        m_t = -2.0 * h / (1.0 + h)
        c_t = c_lam[turb]
        t = np.clip((rt - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX), 0.0, 1.0)
        f_l = c_t / rt
        f = (1.0 - t) * f_l + t * f_t
        blend = t < 1.0
        # slope of the blend: d f / d ln Re = (1−t)(−f_l) + t f_t m_t + Re (f_t − f_l)/ΔRe
        dfdln = (1.0 - t) * (-f_l) + t * f_t * m_t
        dfdln = dfdln + np.where(blend, rt * (f_t - f_l) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX), 0.0)
        mm = dfdln / f
        fre[turb] = f * rt
        fq[turb] = (1.0 + mm) * f
        m[turb] = mm
    return fre.reshape(shape), fq.reshape(shape), m.reshape(shape)


def darcy_friction_factor(re, rel_roughness, aspect_ratio=1.0):
    """Darcy friction factor of fully developed flow in a rectangular duct.

    Parameters
    ----------
    re : float or array
        Reynolds number ρ|u|D_h/μ, ≥ 0 [-].
    rel_roughness : float or array
        Wall roughness over hydraulic diameter ε/D_h, 0 … 0.1 [-] (used for Re > 2300).
    aspect_ratio : float or array
        Short side / long side, 0 … 1 [-] (used for Re < 4000). Default 1 (square).

    Returns
    -------
    float or ndarray
        Darcy f [-]; +inf at Re = 0 (laminar f = C/Re; use `friction_terms` or
        `friction_pressure_drop_pa`, which stay finite there).

    Notes
    -----
    Laminar (Re < 2300): f = C(α)/Re, C from `laminar_fre`.
    Turbulent (Re > 4000): 1/√f = −2 log10(ε/(3.7 D_h) + 2.51/(Re √f)) (Colebrook), solved by
    Newton's method on x = 1/√f from the Swamee–Jain value.
    Transition: f = (1 − t) f_lam + t f_Colebrook with t = (Re − 2300)/1700.

    References
    ----------
    Colebrook, C. F. (1939), J. Inst. Civil Eng. 11(4):133–156, doi:10.1680/ijoti.1939.13150.
    Swamee, P. K., & Jain, A. K. (1976), J. Hydraulics Div. ASCE 102(5):657–664.
    Shah, R. K., & London, A. L. (1978). Laminar Flow Forced Convection in Ducts, Academic Press.
    """
    fre, _, _ = friction_terms(re, rel_roughness, aspect_ratio)
    re_a = np.broadcast_to(np.asarray(re, dtype=float), fre.shape)
    f = np.divide(fre, re_a, out=np.full(fre.shape, np.inf), where=re_a > 0.0)
    return float(f) if f.ndim == 0 else f


def friction_loss_coefficient(
    velocity_m_s,
    length_m,
    hydraulic_diameter_m,
    rho_kg_m3,
    mu_pa_s,
    rel_roughness,
    aspect_ratio=1.0,
):
    """Wall-friction loss coefficient K_f = f·L/D_h of a straight duct.

    Parameters
    ----------
    velocity_m_s : float or array
        Mean velocity in the duct [m/s] (sign ignored).
    length_m : float
        Duct length [m].
    hydraulic_diameter_m : float
        D_h [m].
    rho_kg_m3 : float
        Density [kg/m³].
    mu_pa_s : float
        Dynamic viscosity [Pa·s].
    rel_roughness : float
        ε/D_h [-].
    aspect_ratio : float
        Short side / long side [-].

    Returns
    -------
    float or ndarray
        K_f [-], so that the pressure drop is K_f·½ρu². At u = 0 the coefficient is unbounded
        (laminar f = C/Re) and +inf is returned without a warning; the pressure drop itself is
        finite and zero there — use `friction_pressure_drop_pa` when u may vanish.

    Notes
    -----
    K_f = f(Re)·L/D_h with Re = ρ|u|D_h/μ.

    References
    ----------
    Darcy–Weisbach equation; f from `darcy_friction_factor` (Colebrook 1939; Shah & London 1978).
    """
    re = rho_kg_m3 * np.abs(np.asarray(velocity_m_s, dtype=float)) * hydraulic_diameter_m / mu_pa_s
    f = np.asarray(darcy_friction_factor(re, rel_roughness, aspect_ratio))
    k = f * (length_m / hydraulic_diameter_m)
    return float(k) if k.ndim == 0 else k


def friction_pressure_drop_pa(
    velocity_m_s,
    length_m,
    hydraulic_diameter_m,
    rho_kg_m3,
    mu_pa_s,
    rel_roughness,
    aspect_ratio=1.0,
):
    """Wall-friction pressure drop of a straight duct, finite at zero flow.

    Parameters
    ----------
    velocity_m_s : float or array
        Mean velocity in the duct [m/s]; the drop has the sign of the velocity.
    length_m, hydraulic_diameter_m, rho_kg_m3, mu_pa_s, rel_roughness, aspect_ratio
        As in `friction_loss_coefficient` [m, m, kg/m³, Pa·s, -, -].

    Returns
    -------
    float or ndarray
        Δp_f [Pa], opposing the flow; 0 at u = 0.

    Notes
    -----
    Δp_f = f·(L/D_h)·½ρu|u| = (f·Re)·μ·L·u/(2 D_h²), the second form being finite as Re → 0
    (Hagen–Poiseuille-type linear law in laminar flow).

    References
    ----------
    Darcy–Weisbach equation; f from `darcy_friction_factor`.
    """
    u = np.asarray(velocity_m_s, dtype=float)
    re = rho_kg_m3 * np.abs(u) * hydraulic_diameter_m / mu_pa_s
    fre, _, _ = friction_terms(re, rel_roughness, aspect_ratio)
    dp = fre * mu_pa_s * length_m * u / (2.0 * hydraulic_diameter_m**2)
    return float(dp) if dp.ndim == 0 else dp


_C_LAM: dict[float, float] = {}
"""Laminar f·Re of `friction_terms_scalar` by aspect ratio (Shah & London polynomial) [-]."""
_TWO_LN10 = 2.0 / _LN10
"""2/ln 10, the derivative factor of the Colebrook iteration [-]."""


def friction_terms_scalar(re: float, rel_roughness: float, aspect_ratio: float):
    """Scalar twin of `friction_terms` in pure Python (fast path for ODE right-hand sides).

    Parameters
    ----------
    re : float
        Reynolds number ≥ 0 [-].
    rel_roughness : float
        ε/D_h [-].
    aspect_ratio : float
        Short side / long side [-].

    Returns
    -------
    tuple of float
        (f·Re, (1 + m)·f, m) as in `friction_terms`.

    Notes
    -----
    Same equations as `friction_terms`; inputs are assumed already validated.

    References
    ----------
    Colebrook (1939); Swamee & Jain (1976); Shah & London (1978).
    """
    a = aspect_ratio
    c_lam = _C_LAM.get(a)
    if c_lam is None:
        c = _SHAH_LONDON
        c_lam = 96.0 * (c[0] + a * (c[1] + a * (c[2] + a * (c[3] + a * (c[4] + a * c[5])))))
        _C_LAM[a] = c_lam
    if re < RE_LAMINAR_MAX:
        return c_lam, 0.0, -1.0
    ea = rel_roughness / 3.7
    b = 2.51 / re
    x = -2.0 * math.log10(ea + 5.74 * re**-0.9)
    # loop invariants as locals (the products are formed as in the expressions they replace:
    # 2/ln10·b/arg = (2/ln10·b)/arg, so the iterates are the same floats)
    log10, tol, tb = math.log10, _COLEBROOK_TOL, _TWO_LN10 * b
    for _ in range(30):
        arg = ea + b * x
        dx = (x + 2.0 * log10(arg)) / (1.0 + tb / arg)
        x -= dx
        if abs(dx) <= tol * abs(x):
            break
    h = tb / (ea + b * x)
    f_t = 1.0 / (x * x)
    m_t = -2.0 * h / (1.0 + h)
    if re >= RE_TURBULENT_MIN:
        return f_t * re, (1.0 + m_t) * f_t, m_t
    t = (re - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX)
    f_l = c_lam / re
    f = (1.0 - t) * f_l + t * f_t
    dfdln = (
        (1.0 - t) * (-f_l) + t * f_t * m_t + re * (f_t - f_l) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX)
    )
    m = dfdln / f
    return f * re, (1.0 + m) * f, m
