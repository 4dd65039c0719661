"""Heat generated in the pack (Bernardi balance) and the lumped pack temperature.

References
----------
.. [1] Bernardi, D., Pawlikowski, E. & Newman, J. (1985). A general energy balance for battery
   systems. Journal of The Electrochemical Society 132(1), 5–12. doi:10.1149/1.2113792
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.battery.circuit import Pack, _lerp, _v_list
from sim.physics.battery.parameters import _MODEL_ECM, _SCALAR, KELVIN_OFFSET
from sim.physics.errors import ModelRangeError

__all__ = ["battery_temperature_rate_k_s", "busbar_loss_w", "heat_generation_w"]


def busbar_loss_w(pack: Pack, current_a: ArrayLike) -> float | np.ndarray:
    """Joule loss of the pack's extra series resistance (busbars, fuses, contactors).

    Parameters
    ----------
    pack : Pack
        The pack.
    current_a : float or array
        Pack current [A] (either sign).

    Returns
    -------
    float or ndarray
        I²·R_extra [W], ≥ 0.

    Notes
    -----
    This heat is released in the busbars and contactors, outside the cells: it belongs to the
    pack's energy balance (OCV energy = terminal energy + cell heat + busbar loss, the
    reversible heat aside) but not to the cells' thermal state, so the engine passes
    ``include_busbars=False`` to :func:`heat_generation_w` for the cell temperature.

    References
    ----------
    Joule's law; Bernardi, Pawlikowski & Newman (1985) for the cells' own balance.
    """
    rx = pack.extra_series_resistance_ohm
    if isinstance(current_a, _SCALAR):
        return current_a * current_a * rx
    i = np.asarray(current_a, dtype=float)
    return i * i * rx


def heat_generation_w(
    pack: Pack,
    current_a: ArrayLike,
    soc: ArrayLike,
    temp_c: ArrayLike,
    v_rc: object,
    include_busbars: bool = True,
) -> float | np.ndarray:
    """Heat generated in the pack.

    Parameters
    ----------
    pack : Pack
        The pack.
    current_a : float or array
        Pack current [A], positive on discharge.
    soc : float or array
        State of charge [-].
    temp_c : float or array
        Cell temperature [°C].
    v_rc : float or sequence
        Pack voltage of each RC pair V_k [V].
    include_busbars : bool
        Add the Joule heat I²·R_extra of the busbar resistance (default). Set false for the heat
        that warms the cells only.

    Returns
    -------
    float or ndarray
        Heat generation rate [W] (may be negative when reversible cooling dominates).

    Notes
    -----
    Q = I²·R0_cells(T) [+ I²·R_extra] + Σ V_k²/R_k(T) − I·T·∂OCV/∂T, with T in kelvin and
    ∂OCV/∂T = n_s·(cell entropic coefficient). The first two terms are the irreversible heat
    I·(OCV − V_term) of the Bernardi balance; the last is the reversible (entropic) heat, which
    cools a discharging cell whose OCV rises with temperature.

    References
    ----------
    Bernardi, Pawlikowski & Newman (1985), J. Electrochem. Soc. 132(1), 5–12.
    """
    vs = _v_list(pack, v_rc)
    rx = pack.extra_series_resistance_ohm if include_busbars else 0.0
    if isinstance(soc, _SCALAR) and isinstance(temp_c, _SCALAR) and isinstance(current_a, _SCALAR):
        j, w = pack._seg(soc)
        f = pack._arrhenius(temp_c)
        q = current_a * current_a * (_lerp(pack._r0_l, j, w) * f + rx)
        for (rs, _cs), vk in zip(pack._rc_l, vs, strict=True):
            q += vk * vk / (_lerp(rs, j, w) * f)
        if pack._dudt != 0.0:
            q -= current_a * (temp_c + KELVIN_OFFSET) * pack._dudt
        return q
    i = np.asarray(current_a, dtype=float)
    t = np.asarray(temp_c, dtype=float)
    s = pack._soc_a(soc)
    f = pack._arrhenius_a(t)
    xs = pack.cell._soc_arr
    q = i * i * (np.interp(s, xs, pack._r0_a) * f + rx)
    for (rs, _cs), vk in zip(pack._rc_a, vs, strict=True):
        vk = np.asarray(vk, dtype=float)
        q = q + vk * vk / (np.interp(s, xs, rs) * f)
    if pack._dudt != 0.0:
        q = q - i * (t + KELVIN_OFFSET) * pack._dudt
    return q


def battery_temperature_rate_k_s(
    pack: Pack, heat_w: ArrayLike, temp_c: ArrayLike, ambient_c: ArrayLike, ua_w_k: ArrayLike
) -> float | np.ndarray:
    """Rate of change of the lumped pack temperature.

    Parameters
    ----------
    pack : Pack
        The pack.
    heat_w : float or array
        Heat generated in the cells [W].
    temp_c : float or array
        Pack (cell) temperature [°C].
    ambient_c : float or array
        Temperature of the surroundings or coolant [°C].
    ua_w_k : float or array
        Overall heat-transfer conductance from the cells to the surroundings [W/K], ≥ 0.

    Returns
    -------
    float or ndarray
        dT/dt [K/s].

    Notes
    -----
    (n_cells·m·c_p)·dT/dt = Q − UA·(T − T_amb): one lumped thermal node, uniform temperature.

    References
    ----------
    Bernardi, Pawlikowski & Newman (1985) (lumped energy balance).
    """
    if isinstance(ua_w_k, _SCALAR):
        if ua_w_k < 0.0:
            raise ModelRangeError("ua_w_k", ua_w_k, "≥ 0 W/K", _MODEL_ECM)
    elif np.any(np.asarray(ua_w_k) < 0.0):
        raise ModelRangeError("ua_w_k", ua_w_k, "≥ 0 W/K", _MODEL_ECM)
    if (
        isinstance(heat_w, _SCALAR)
        and isinstance(temp_c, _SCALAR)
        and isinstance(ambient_c, _SCALAR)
    ):
        return (heat_w - ua_w_k * (temp_c - ambient_c)) / pack.thermal_mass_j_k
    q = np.asarray(heat_w, dtype=float)
    dt = np.asarray(temp_c, dtype=float) - np.asarray(ambient_c, dtype=float)
    return (q - np.asarray(ua_w_k, dtype=float) * dt) / pack.thermal_mass_j_k
