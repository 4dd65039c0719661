"""Peukert's law, a reference for constant-current runtime (not used by the circuit model).

References
----------
.. [1] Peukert, W. (1897). Über die Abhängigkeit der Kapazität von der Entladestromstärke bei
   Bleiakkumulatoren. Elektrotechnische Zeitschrift 18, 287–288.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

__all__ = ["peukert_runtime_h"]


def peukert_runtime_h(
    capacity_ah: ArrayLike, rated_hours: ArrayLike, current_a: ArrayLike, k: ArrayLike
) -> float | np.ndarray:
    """Runtime at constant current from Peukert's law.

    Parameters
    ----------
    capacity_ah : float or array
        Rated capacity C at the rated discharge time [A·h], > 0.
    rated_hours : float or array
        Rated discharge time H [h], > 0.
    current_a : float or array
        Constant discharge current I [A], > 0.
    k : float or array
        Peukert exponent [-], ≥ 1 (lead-acid 1.1–1.3, lithium-ion about 1.02–1.05).

    Returns
    -------
    float or ndarray
        Runtime t [h].

    Notes
    -----
    t = H·(C/(I·H))^k; at the rated current I = C/H, t = H for every k.

    References
    ----------
    Peukert (1897), Elektrotechnische Zeitschrift 18, 287–288.
    """
    c = np.asarray(capacity_ah, dtype=float)
    h = np.asarray(rated_hours, dtype=float)
    i = np.asarray(current_a, dtype=float)
    kk = np.asarray(k, dtype=float)
    for name, arr, allowed in (
        ("capacity_ah", c, "> 0 A·h"),
        ("rated_hours", h, "> 0 h"),
        ("current_a", i, "> 0 A"),
    ):
        if np.any(~(arr > 0.0)):
            raise ModelRangeError(name, arr.tolist(), allowed, "Peukert's law")
    if np.any(~(kk >= 1.0)):
        raise ModelRangeError("k", kk.tolist(), "≥ 1", "Peukert's law")
    t = h * (c / (i * h)) ** kk
    return float(t) if t.ndim == 0 else t
