r"""Electrolysis gas in a thruster duct: gas volume flow, void fraction and conductivity.

The electrodes of a seawater MHD duct evolve hydrogen at the cathode and chlorine (or oxygen)
at the anode at the rate Faraday's law sets. Carried along by the water, the bubbles take up
part of the channel and, being insulators, lower the conductivity of the mixture between the
electrodes. This module gives that reduction as pure functions.

Model
-----
* Gas volume flow (ideal gas at the duct's absolute pressure p and temperature T):

      Q_g = (ṅ_H2 + ṅ_Cl2 + ṅ_O2)·R·T/p,   ṅ from :func:`sim.physics.electrochem.gas_rates_mol_s`.

  All evolved gas is taken to stay as bubbles in the active length (an upper bound: chlorine
  partly dissolves and hydrolyses in seawater).
* The gas is produced evenly along the active length L and carried downstream, so the gas
  flow through a cross-section at x is Q_g·x/L. With the slip ratio S = u_gas/u_water, the
  local void fraction is (definition of S, mass conservation of each phase)

      ε(x) = a t/(a t + S),   t = x/L,   a = Q_g/Q_w,

  where Q_w is the water volume flow. S = 1 is homogeneous flow (no slip), the default: the
  small electrolysis bubbles travel with the water along a duct at metres per second; the
  drift-flux correlation of Zuber & Findlay (1965) gives S slightly above 1 for bubbly flow
  (distribution parameter C0 ≈ 1.2 in pipes, from memory), which lowers ε.
  Bubbles are taken to be spread evenly across the gap (no electrode bubble layers).
* Conductivity of the bubbly mixture, σ/σ0 = f(ε), with

      Bruggeman (1935):  f = (1 − ε)^{3/2}
      Maxwell (1873):    f = 2(1 − ε)/(2 + ε)

  both → 1 − 1.5ε as ε → 0.
* The slices of the channel along x are electrically in parallel between the same
  electrodes, so the channel's conductance uses the length-mean of f. Closed forms
  (integrating the profile above over t from 0 to 1):

      Bruggeman: ⟨f⟩ = 2S/((a + S)(1 + √(S/(a + S))))
      Maxwell:   ⟨f⟩ = ln(1 + x)/x,  x = 3a/(2S)
      mean void: ⟨ε⟩ = 1 − ln(1 + y)/y,  y = a/S;   outlet void ε(L) = a/(a + S)

References
----------
Bruggeman, D. A. G. (1935). Berechnung verschiedener physikalischer Konstanten von heterogenen
Substanzen. I. Annalen der Physik 416(7), 636–664. doi:10.1002/andp.19354160705.

Maxwell, J. C. (1873). A Treatise on Electricity and Magnetism, vol. 1, Clarendon Press,
Oxford, §314 (conductivity of a medium with dispersed spheres).

Zuber, N., & Findlay, J. A. (1965). Average volumetric concentration in two-phase flow
systems. Journal of Heat Transfer 87(4), 453–468. doi:10.1115/1.3689137.

Faraday's law of electrolysis; F from CODATA 2018; R = 8.314462618 J/(mol·K) (CODATA 2018).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sim.physics.electrochem import gas_rates_mol_s
from sim.physics.errors import ModelRangeError

R_GAS_J_MOL_K = 8.314462618
"""Molar gas constant [J/(mol·K)] (CODATA 2018)."""

ATM_PA = 101325.0
"""Standard atmosphere [Pa]."""

KELVIN_OFFSET = 273.15
"""0 °C in kelvin [K]."""

GAS_MODELS = ("none", "bruggeman", "maxwell")
"""Names of the conductivity models accepted by :func:`conductivity_ratio`."""

_MODEL = "electrolysis gas"
_SMALL = 1e-4  # below this argument the series forms replace the closed forms


def gas_volume_flow_m3_s(
    current_a,
    chlorine_fraction: float = 1.0,
    pressure_pa: float = ATM_PA,
    temperature_c: float = 25.0,
):
    """Volume flow of electrolysis gas (cathode H₂ plus anode Cl₂/O₂) as an ideal gas.

    Parameters
    ----------
    current_a : float or array
        Current through the electrolyte [A] (sign ignored).
    chlorine_fraction : float
        Fraction of the anodic charge evolving Cl₂ (chlorine current efficiency) [-]; the
        rest evolves O₂. Default 1.0.
    pressure_pa : float
        Absolute pressure in the duct [Pa]. Default 101325 Pa.
    temperature_c : float
        Gas temperature [°C]. Default 25 °C.

    Returns
    -------
    float or ndarray
        Gas volume flow [m³/s].

    Notes
    -----
    Q_g = (ṅ_H2 + ṅ_Cl2 + ṅ_O2) R T/p with ṅ_H2 = |I|/(2F), ṅ_Cl2 = f|I|/(2F),
    ṅ_O2 = (1 − f)|I|/(4F) (Faraday's law).

    References
    ----------
    Faraday's law; ideal gas law; CODATA 2018 F and R.
    """
    p = float(pressure_pa)
    t_k = float(temperature_c) + KELVIN_OFFSET
    if not (math.isfinite(p) and p > 0.0):
        raise ModelRangeError("pressure_pa", p, "> 0 Pa", _MODEL)
    if not (math.isfinite(t_k) and t_k > 0.0):
        raise ModelRangeError("temperature_c", temperature_c, "> −273.15 °C", _MODEL)
    h2, cl2, o2 = gas_rates_mol_s(current_a, chlorine_fraction)
    return (h2 + cl2 + o2) * R_GAS_J_MOL_K * t_k / p


def gas_volume_per_coulomb_m3_c(
    chlorine_fraction: float = 1.0, pressure_pa: float = ATM_PA, temperature_c: float = 25.0
) -> float:
    """Gas volume evolved per coulomb of charge [m³/C]; see :func:`gas_volume_flow_m3_s`."""
    return float(gas_volume_flow_m3_s(1.0, chlorine_fraction, pressure_pa, temperature_c))


def _check_model(model: str) -> None:
    if model not in GAS_MODELS:
        raise ModelRangeError("gas_model", model, " or ".join(f'"{m}"' for m in GAS_MODELS), _MODEL)


def _check_slip(slip_ratio: float) -> None:
    if not (math.isfinite(slip_ratio) and slip_ratio > 0.0):
        raise ModelRangeError("slip_ratio", slip_ratio, "finite and > 0", _MODEL)


def conductivity_ratio(void_fraction, model: str = "bruggeman"):
    """Conductivity of a bubbly liquid relative to the liquid, σ/σ0, at a void fraction ε.

    Parameters
    ----------
    void_fraction : float or array
        Gas volume fraction ε, 0…1 [-].
    model : str
        "bruggeman" (σ/σ0 = (1 − ε)^1.5), "maxwell" (2(1 − ε)/(2 + ε)) or "none" (1).

    Returns
    -------
    float or ndarray
        σ/σ0 [-].

    References
    ----------
    Bruggeman (1935), Annalen der Physik 416(7):636–664; Maxwell (1873), Treatise §314.
    """
    _check_model(model)
    eps = np.asarray(void_fraction, dtype=float)
    if np.any(~np.isfinite(eps)) or np.any(eps < 0.0) or np.any(eps > 1.0):
        raise ModelRangeError("void_fraction", void_fraction, "0 ≤ ε ≤ 1", _MODEL)
    if model == "bruggeman":
        return (1.0 - eps) ** 1.5
    if model == "maxwell":
        return 2.0 * (1.0 - eps) / (2.0 + eps)
    return np.ones_like(eps)


def mean_conductivity_ratio(gas_to_water, model: str = "bruggeman", slip_ratio: float = 1.0):
    """Length-mean σ/σ0 of a channel whose gas grows linearly from inlet to outlet.

    Parameters
    ----------
    gas_to_water : float or array
        a = Q_g/Q_w, outlet gas volume flow over water volume flow, ≥ 0 [-] (inf allowed:
        stagnant water, the channel fills with gas).
    model : str
        "bruggeman", "maxwell" or "none".
    slip_ratio : float
        S = u_gas/u_water > 0 [-]. Default 1 (homogeneous flow).

    Returns
    -------
    float or ndarray
        ⟨σ/σ0⟩ over the length [-].

    Notes
    -----
    ε(t) = a t/(a t + S); Bruggeman ⟨f⟩ = 2S/((a + S)(1 + √(S/(a + S)))); Maxwell
    ⟨f⟩ = ln(1 + x)/x with x = 3a/(2S) (module docstring).

    References
    ----------
    Bruggeman (1935); Maxwell (1873); see the module docstring.
    """
    _check_model(model)
    _check_slip(slip_ratio)
    a = np.asarray(gas_to_water, dtype=float)
    if np.any(np.isnan(a)) or np.any(a < 0.0):
        raise ModelRangeError("gas_to_water", gas_to_water, "≥ 0", _MODEL)
    s = float(slip_ratio)
    if model == "none":
        return np.ones_like(a)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if model == "bruggeman":
            out = 2.0 * s / ((a + s) * (1.0 + np.sqrt(s / (a + s))))
            return np.where(np.isinf(a), 0.0, out)
        x = 1.5 * a / s
        big = np.where(x > _SMALL, x, 1.0)
        series = 1.0 - x / 2.0 + x * x / 3.0 - x**3 / 4.0
        out = np.where(x > _SMALL, np.log1p(big) / big, series)
        return np.where(np.isinf(a), 0.0, out)


def mean_void_fraction(gas_to_water, slip_ratio: float = 1.0):
    """Length-mean void fraction ⟨ε⟩ = 1 − ln(1 + y)/y, y = a/S [-] (module docstring)."""
    _check_slip(slip_ratio)
    y = np.asarray(gas_to_water, dtype=float) / float(slip_ratio)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        big = np.where(y > _SMALL, y, 1.0)
        series = y / 2.0 - y * y / 3.0 + y**3 / 4.0
        out = np.where(y > _SMALL, 1.0 - np.log1p(big) / big, series)
        return np.where(np.isinf(y), 1.0, out)


def outlet_void_fraction(gas_to_water, slip_ratio: float = 1.0):
    """Void fraction at the channel outlet, ε(L) = a/(a + S) [-] (module docstring)."""
    _check_slip(slip_ratio)
    a = np.asarray(gas_to_water, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.where(np.isinf(a), 1.0, a / (a + float(slip_ratio)))


@dataclass(frozen=True)
class DuctGas:
    """Electrolysis gas in a duct (numpy arrays broadcast over the inputs).

    Attributes
    ----------
    gas_flow_m3_s : gas volume flow leaving the active length [m³/s]
    gas_to_water : a = Q_g/Q_w at the outlet [-]
    mean_void_fraction : ⟨ε⟩ over the active length [-]
    outlet_void_fraction : ε at the outlet [-]
    conductivity_ratio : length-mean σ/σ0 of the mixture [-]
    """

    gas_flow_m3_s: np.ndarray
    gas_to_water: np.ndarray
    mean_void_fraction: np.ndarray
    outlet_void_fraction: np.ndarray
    conductivity_ratio: np.ndarray


def duct_gas(
    current_a,
    water_flow_m3_s,
    *,
    model: str = "bruggeman",
    slip_ratio: float = 1.0,
    chlorine_fraction: float = 1.0,
    pressure_pa: float = ATM_PA,
    temperature_c: float = 25.0,
) -> DuctGas:
    """Void fraction and conductivity reduction of the gas a duct current evolves.

    Parameters
    ----------
    current_a : float or array
        Current through the channel(s) [A].
    water_flow_m3_s : float or array
        Water volume flow through the same channel(s) [m³/s] (sign ignored; 0 gives a
        channel full of gas).
    model : str
        "bruggeman", "maxwell" or "none".
    slip_ratio : float
        S = u_gas/u_water [-]. Default 1 (homogeneous).
    chlorine_fraction : float
        Chlorine current efficiency at the anode [-].
    pressure_pa : float
        Absolute duct pressure [Pa].
    temperature_c : float
        Gas temperature [°C].

    Returns
    -------
    DuctGas

    References
    ----------
    Faraday's law; Bruggeman (1935); Maxwell (1873); see the module docstring.
    """
    q_g = gas_volume_flow_m3_s(current_a, chlorine_fraction, pressure_pa, temperature_c)
    q_w = np.abs(np.asarray(water_flow_m3_s, dtype=float))
    q_g, q_w = np.broadcast_arrays(np.asarray(q_g, dtype=float), q_w)
    with np.errstate(divide="ignore", invalid="ignore"):
        a = np.where(q_g == 0.0, 0.0, np.where(q_w > 0.0, q_g / np.where(q_w > 0, q_w, 1), np.inf))
    return DuctGas(
        gas_flow_m3_s=q_g,
        gas_to_water=a,
        mean_void_fraction=mean_void_fraction(a, slip_ratio),
        outlet_void_fraction=outlet_void_fraction(a, slip_ratio),
        conductivity_ratio=mean_conductivity_ratio(a, model, slip_ratio),
    )


def mean_conductivity_ratio_scalar(gas_to_water: float, model: str, slip_ratio: float) -> float:
    """Pure-Python :func:`mean_conductivity_ratio` for one point (no checks; fast path) [-]."""
    a = gas_to_water
    if model == "none" or a == 0.0:
        return 1.0
    if math.isinf(a):
        return 0.0
    s = slip_ratio
    if model == "bruggeman":
        return 2.0 * s / ((a + s) * (1.0 + math.sqrt(s / (a + s))))
    x = 1.5 * a / s
    if x > _SMALL:
        return math.log1p(x) / x
    return 1.0 - x / 2.0 + x * x / 3.0 - x**3 / 4.0
