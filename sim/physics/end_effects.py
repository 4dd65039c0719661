r"""End effects of a DC-conduction MHD channel: current fringing beyond the electrodes.

Geometry: a straight channel of gap a (between the electrode walls) continues upstream and
downstream of the active length L with the same insulating section; the electrodes and the
magnetic field both cover exactly the active length, and the field drops to zero at its ends
(sharp-edge idealisation). Part of the current bulges out of the ends of the active region
("fringing"), raising the current drawn at a given voltage.

Result (exact in the two-dimensional channel plane, derived here)
-----------------------------------------------------------------
The potential φ satisfies Laplace's equation with φ fixed on the electrodes and ∂φ/∂n = 0 on
the insulating walls. The motional field u×B of a plug flow is uniform across the gap and has
no divergence, so it does not change φ. Then:

* the map w = exp(πz/a) turns the channel into the upper half-plane and the two electrodes
  into coplanar strips on its boundary, (−p, −1/p) and (1/p, p) with p = exp(πL/(2a)). Their
  conductance per unit electrode height is the coplanar-strip result σ·K(k′)/(2K(k)),
  k = 1/p² = exp(−πL/a), k′ = √(1 − k²), K the complete elliptic integral of the first kind.
  Without fringing it would be σL/a, so the fringing adds a leakage conductance per channel

      G_end = σ h Λ,   Λ(L/a) = K(k′)/(2K(k)) − L/a  →  2 ln 2/π ≈ 0.4413  (L ≫ a),

  i.e. each end acts like an extra (ln 2/π)·a ≈ 0.22a of electrode length.
* the Lorentz force B h ∬_field J_y dx dy = σ B h ∫_{−L/2}^{L/2} [φ(x,0) − φ(x,a) − uBa] dx
  = σ B h L (V_w − uBa) is exactly the value without fringing, because the electrodes cover
  the field region and fix φ there.

So the fringing current I_end = G_end·V_w (V_w = voltage across the water) adds no thrust:
thrust per ampere falls by the factor I_core/(I_core + I_end); at u = 0 this is the
:func:`thrust_per_ampere_factor` (L/a)/(L/a + Λ) → 1 for a long channel.

The fringing current's Joule heat (V_w·I_end) and gas are released at the channel ends.

References
----------
Coplanar-strip conductance K(k′)/K(k) by conformal mapping: Gupta, K. C., Garg, R., Bahl, I. &
Bhartia, P. (1996). Microstrip Lines and Slotlines, 2nd ed., Artech House, ch. 7 (from memory;
the formula is the standard Schwarz–Christoffel result and is checked in the tests against a
finite-difference solution of the same Laplace problem).

Sutton, G. W., Hurwitz, H. & Poritsky, H. (1961). Electrical and pressure losses in a
magnetohydrodynamic channel due to end current loops. Transactions of the AIEE, Part I 80(6),
687–695 (the end-loop loss mechanism in MHD channels; attribution from memory).

Abramowitz, M. & Stegun, I. A. (1964). Handbook of Mathematical Functions, §17.6 (K by the
arithmetic–geometric mean, K(k) = π/(2·AGM(1, k′))).
"""

from __future__ import annotations

import math

from sim.physics.errors import ModelRangeError

END_LEAKAGE_LONG = 2.0 * math.log(2.0) / math.pi
"""Λ of a long channel, 2 ln 2/π [-] (both ends together)."""

_MODEL = "channel end effects"
_ASYMPTOTIC_FROM = 8.0  # L/a beyond which Λ equals its limit to better than 1e-15


def _agm(a: float, b: float) -> float:
    for _ in range(64):
        if abs(a - b) <= 1e-16 * a:
            break
        a, b = 0.5 * (a + b), math.sqrt(a * b)
    return a


def end_leakage_factor(length_m: float, gap_m: float) -> float:
    """Fringing conductance of both channel ends, Λ = G_end/(σh) [-].

    Parameters
    ----------
    length_m : float
        Length of the electrodes and of the field region [m].
    gap_m : float
        Electrode spacing (channel width along E) [m].

    Returns
    -------
    float
        Λ = K(k′)/(2K(k)) − L/a with k = exp(−πL/a); → 2 ln 2/π for L ≫ a [-].

    Notes
    -----
    K(k′)/K(k) = AGM(1, k′)/AGM(1, k) (Abramowitz & Stegun 17.6).
    Derivation in the module docstring.

    References
    ----------
    Gupta et al. (1996), coplanar strips (from memory); Abramowitz & Stegun (1964) §17.6.
    """
    lg, a = float(length_m), float(gap_m)
    if not (math.isfinite(lg) and lg > 0.0):
        raise ModelRangeError("length_m", lg, "finite and > 0 m", _MODEL)
    if not (math.isfinite(a) and a > 0.0):
        raise ModelRangeError("gap_m", a, "finite and > 0 m", _MODEL)
    ratio = lg / a
    if ratio >= _ASYMPTOTIC_FROM:
        return END_LEAKAGE_LONG
    k = math.exp(-math.pi * ratio)
    kp = math.sqrt(1.0 - k * k)
    # K(k') / K(k) = AGM(1, k') / AGM(1, k)
    return 0.5 * _agm(1.0, kp) / _agm(1.0, k) - ratio


def thrust_per_ampere_factor(length_m: float, gap_m: float) -> float:
    """Thrust per ampere with end fringing over that without, at zero flow [-].

    Parameters
    ----------
    length_m : float
        Length of the electrodes and of the field region [m].
    gap_m : float
        Electrode spacing [m].

    Returns
    -------
    float
        (L/a)/(L/a + Λ), in (0, 1); → 1 for a long channel [-].

    Notes
    -----
    The Lorentz force is unchanged by fringing while the current rises by G_end·V_w (module
    docstring). With flow the factor is I_core/(I_core + I_end) at the operating point.

    References
    ----------
    See the module docstring.
    """
    ratio = float(length_m) / float(gap_m)
    return ratio / (ratio + end_leakage_factor(length_m, gap_m))
