"""Dimensionless groups and skin friction: Reynolds and Froude numbers, the ITTC-1957
model-ship correlation line and the ITTC-1978 roughness allowance.

Low speed
---------
The ITTC-1957 line is singular at ``Re = 100``. The resistance models therefore evaluate it with
the Reynolds number clamped from below at :data:`REYNOLDS_NUMBER_FLOOR` (1e3), through
``_cf_clamped`` (arrays) and its scalar twin ``_cf_clamped_scalar`` (plain floats, for the ODE
right-hand side). Below the floor the friction coefficient is constant and every component goes
to zero at least as fast as ``V²``. The public function :func:`ittc1957_cf` does not clamp: it
raises for ``Re ≤ 100``.

References
----------
.. [1] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
   (ITTC-1957 model-ship correlation line.)
.. [2] ITTC (1978). Report of the Performance Committee, Proceedings of the 15th International
   Towing Tank Conference, The Hague. (ITTC-1978 performance prediction method, roughness
   allowance.)
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError
from sim.physics.hull.interface import _finish

__all__ = [
    "ITTC_STANDARD_ROUGHNESS_M",
    "REYNOLDS_NUMBER_FLOOR",
    "STANDARD_GRAVITY_M_S2",
    "froude_number",
    "ittc1957_cf",
    "reynolds_number",
    "roughness_allowance_ittc1978",
]

STANDARD_GRAVITY_M_S2: float = 9.80665
"""Standard acceleration of gravity g_n [m/s²] (3rd CGPM, 1901)."""

REYNOLDS_NUMBER_FLOOR: float = 1.0e3
"""Lower clamp [-] on the Reynolds number inside the resistance models (see module Notes)."""

ITTC_STANDARD_ROUGHNESS_M: float = 150.0e-6
"""Standard hull roughness k_s [m] of the ITTC-1978 method (150 µm)."""


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


def _cf_clamped_scalar(re: float) -> float:
    """Scalar twin of :func:`_cf_clamped` for one plain float Re [-] (``math``, no numpy)."""
    return 0.075 / (math.log10(max(re, REYNOLDS_NUMBER_FLOOR)) - 2.0) ** 2


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
