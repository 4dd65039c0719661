"""Seawater properties for the thruster and hull models: conductivity, density, heat capacity,
viscosity.

Conductivity follows the Practical Salinity Scale 1978 (PSS-78) as implemented in the Gibbs
SeaWater (GSW) toolbox, density and heat capacity follow TEOS-10 (also through ``gsw``), and
viscosity follows the correlation of Sharqawy, Lienhard & Zubair (2010). All functions take
practical salinity ``sp`` [-], in-situ temperature ``t_c`` [°C, ITS-90] and sea pressure
``p_dbar`` [dbar] and return SI values. They accept scalars or numpy arrays (broadcast together);
scalar inputs give a Python ``float``.

Valid ranges (checked; outside them :class:`~sim.physics.errors.ModelRangeError` is raised):

* practical salinity 0 ≤ SP ≤ 42 (fresh river water to the hypersaline limit of PSS-78; below
  SP = 2 gsw uses the Hill et al. (1986) extension of PSS-78),
* temperature −2 ≤ t ≤ 40 °C,
* sea pressure 0 ≤ p ≤ 11000 dbar.

Absolute Salinity is needed by TEOS-10 and by the viscosity correlation. It is obtained with
``gsw.SA_from_SP`` at the fixed position 0° E, 0° N (open tropical Atlantic), where the Absolute
Salinity anomaly is small (about 6e-4 g/kg at the surface). Water of unusual composition (Baltic,
estuaries, lagoons) is therefore treated as standard seawater diluted or concentrated with pure
water; the resulting density error is of order 1e-3 kg/m³, far below what the vessel models need.

References
----------
.. [1] Fofonoff, N. P. & Millard, R. C. (1983). Algorithms for computation of fundamental
   properties of seawater. Unesco Technical Papers in Marine Science 44. UNESCO, Paris.
.. [2] Culkin, F. & Smith, N. D. (1980). Determination of the concentration of potassium chloride
   solution having the same electrical conductivity, at 15 °C and infinite frequency, as standard
   seawater of salinity 35.0000 ‰ (chlorinity 19.37394 ‰). IEEE Journal of Oceanic Engineering
   5(1), 22–23. doi:10.1109/JOE.1980.1145443
.. [3] Hill, K. D., Dauphinee, T. M. & Woods, D. J. (1986). The extension of the Practical
   Salinity Scale 1978 to low salinities. IEEE Journal of Oceanic Engineering 11(1), 109–112.
   doi:10.1109/JOE.1986.1145154
.. [4] IOC, SCOR & IAPSO (2010). The international thermodynamic equation of seawater – 2010:
   Calculation and use of thermodynamic properties. Intergovernmental Oceanographic Commission,
   Manuals and Guides No. 56, UNESCO.
.. [5] McDougall, T. J. & Barker, P. M. (2011). Getting started with TEOS-10 and the Gibbs Seawater
   (GSW) Oceanographic Toolbox. SCOR/IAPSO WG127, ISBN 978-0-646-55621-5.
.. [6] Sharqawy, M. H., Lienhard V, J. H. & Zubair, S. M. (2010). Thermophysical properties of
   seawater: a review of existing correlations and data. Desalination and Water Treatment 16,
   354–380. doi:10.5004/dwt.2010.1079
"""

from __future__ import annotations

from dataclasses import dataclass

import gsw
import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

SALINITY_RANGE: tuple[float, float] = (0.0, 42.0)
"""Allowed practical salinity SP [-] (PSS-78 with the Hill et al. 1986 low-salinity extension)."""

TEMPERATURE_RANGE_C: tuple[float, float] = (-2.0, 40.0)
"""Allowed in-situ temperature [°C] for the property functions."""

PRESSURE_RANGE_DBAR: tuple[float, float] = (0.0, 11000.0)
"""Allowed sea pressure [dbar] (absolute pressure minus one standard atmosphere)."""

DUCT_TEMPERATURE_RANGE_C: tuple[float, float] = (-2.0, 95.0)
"""Allowed temperature [°C] for :func:`conductivity_at_temperature_s_m` (heated duct water)."""

DEFAULT_LONGITUDE_DEG: float = 0.0
"""Longitude [°E] at which Absolute Salinity is taken from practical salinity."""

DEFAULT_LATITUDE_DEG: float = 0.0
"""Latitude [°N] at which Absolute Salinity is taken from practical salinity."""

_MS_CM_TO_S_M = 0.1  # 1 mS/cm = 0.1 S/m
_DT_DIFF_K = 0.05  # step of the finite differences in temperature [K]
_EXTRAPOLATION_START_C = TEMPERATURE_RANGE_C[1]

_PSS78 = "PSS-78 conductivity (gsw)"
_TEOS10 = "TEOS-10 (gsw)"
_SHARQAWY = "Sharqawy et al. (2010) seawater viscosity"


@dataclass(frozen=True)
class WaterState:
    """Properties of the water a vessel moves through, all SI.

    Attributes
    ----------
    sp : practical salinity [-] (PSS-78)
    t_c : in-situ temperature [°C] (ITS-90)
    p_dbar : sea pressure [dbar]
    sigma_s_m : electrical conductivity [S/m]
    dsigma_dt_s_m_k : temperature derivative of conductivity at this state [S/(m·K)]
    rho_kg_m3 : in-situ density [kg/m³]
    cp_j_kg_k : isobaric specific heat capacity [J/(kg·K)]
    mu_pa_s : dynamic viscosity [Pa·s]
    """

    sp: float
    t_c: float
    p_dbar: float
    sigma_s_m: float
    dsigma_dt_s_m_k: float
    rho_kg_m3: float
    cp_j_kg_k: float
    mu_pa_s: float

    @property
    def nu_m2_s(self) -> float:
        """Kinematic viscosity [m²/s]."""
        return self.mu_pa_s / self.rho_kg_m3


# --------------------------------------------------------------------------------------------
# input checks and output shaping
# --------------------------------------------------------------------------------------------


def _checked(
    quantity: str, value: ArrayLike, bounds: tuple[float, float], unit: str, model: str
) -> np.ndarray:
    """Return ``value`` as a float array, or raise ModelRangeError naming the first bad entry."""
    a = np.asarray(value, dtype=float)
    lo, hi = bounds
    bad = ~np.isfinite(a) | (a < lo) | (a > hi)
    if np.any(bad):
        offending = float(a[bad].flat[0]) if a.ndim else float(a)
        unit_txt = f" {unit}" if unit else ""
        raise ModelRangeError(quantity, offending, f"{lo:g} ≤ {quantity} ≤ {hi:g}{unit_txt}", model)
    return a


def _check_state(
    sp: ArrayLike, t_c: ArrayLike, p_dbar: ArrayLike, model: str
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    return (
        _checked("practical salinity SP", sp, SALINITY_RANGE, "", model),
        _checked("temperature t_c", t_c, TEMPERATURE_RANGE_C, "°C", model),
        _checked("sea pressure p_dbar", p_dbar, PRESSURE_RANGE_DBAR, "dbar", model),
    )


def _out(x: np.ndarray) -> float | np.ndarray:
    """A 0-d result becomes a Python float; arrays are returned as they are."""
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x


def _absolute_salinity_g_kg(sp: np.ndarray, p_dbar: np.ndarray) -> np.ndarray:
    """Absolute Salinity [g/kg] at the default position (see the module docstring)."""
    sa = gsw.SA_from_SP(sp, p_dbar, DEFAULT_LONGITUDE_DEG, DEFAULT_LATITUDE_DEG)
    # Guard against a round-off negative value at SP = 0.
    return np.maximum(np.asarray(sa, dtype=float), 0.0)


def _sigma_unchecked(sp: ArrayLike, t_c: ArrayLike, p_dbar: ArrayLike) -> np.ndarray:
    """PSS-78 conductivity [S/m] without range checks (used for finite differences)."""
    return np.asarray(gsw.C_from_SP(sp, t_c, p_dbar), dtype=float) * _MS_CM_TO_S_M


# --------------------------------------------------------------------------------------------
# public property functions
# --------------------------------------------------------------------------------------------


def conductivity_s_m(sp: ArrayLike, t_c: ArrayLike, p_dbar: ArrayLike = 0.0) -> float | np.ndarray:
    """Electrical conductivity of seawater from practical salinity (PSS-78).

    Parameters
    ----------
    sp : float or array
        Practical salinity SP [-], 0 ≤ SP ≤ 42.
    t_c : float or array
        In-situ temperature [°C] (ITS-90), −2 ≤ t ≤ 40.
    p_dbar : float or array
        Sea pressure [dbar], 0 ≤ p ≤ 11000. Default 0 (surface).

    Returns
    -------
    float or ndarray
        Conductivity σ [S/m].

    Raises
    ------
    ModelRangeError
        If an input is non-finite or outside its valid range.

    Notes
    -----
    σ = C/10 with C [mS/cm] the inverse of the PSS-78 salinity equation, C = R·C(35, 15 °C, 0) with
    C(35, 15 °C (IPTS-68), 0) = 42.914 mS/cm [2]_, solved for R by ``gsw.C_from_SP`` [5]_. Below
    SP = 2 gsw uses the Hill et al. (1986) extension [3]_, made continuous with PSS-78 at SP = 2.
    PSS-78 itself was fitted for −2…35 °C (from memory); 35–40 °C is a mild extrapolation of its
    polynomial.

    References
    ----------
    .. [1] Fofonoff & Millard (1983), Unesco Tech. Pap. Mar. Sci. 44.
    .. [2] Culkin & Smith (1980), IEEE J. Oceanic Eng. 5(1), 22–23. doi:10.1109/JOE.1980.1145443
    .. [3] Hill, Dauphinee & Woods (1986), IEEE J. Oceanic Eng. 11(1), 109–112.
       doi:10.1109/JOE.1986.1145154
    .. [4] IOC, SCOR & IAPSO (2010), TEOS-10 manual, IOC Manuals and Guides 56.
    .. [5] McDougall & Barker (2011), Getting started with TEOS-10 and the GSW toolbox.
    """
    sp_a, t_a, p_a = _check_state(sp, t_c, p_dbar, _PSS78)
    return _out(_sigma_unchecked(sp_a, t_a, p_a))


def density_kg_m3(sp: ArrayLike, t_c: ArrayLike, p_dbar: ArrayLike = 0.0) -> float | np.ndarray:
    """In-situ density of seawater (TEOS-10).

    Parameters
    ----------
    sp : float or array
        Practical salinity SP [-], 0 ≤ SP ≤ 42.
    t_c : float or array
        In-situ temperature [°C] (ITS-90), −2 ≤ t ≤ 40.
    p_dbar : float or array
        Sea pressure [dbar], 0 ≤ p ≤ 11000. Default 0.

    Returns
    -------
    float or ndarray
        Density ρ [kg/m³].

    Notes
    -----
    ρ = 1/(∂g/∂p) from the TEOS-10 Gibbs function g(SA, t, p) [1]_ (``gsw.rho_t_exact``), with
    Absolute Salinity SA = ``gsw.SA_from_SP(SP, p, 0° E, 0° N)`` (standard-composition assumption,
    see the module docstring). Freezing is not checked: fresh water below 0 °C is treated as
    supercooled liquid.

    References
    ----------
    .. [1] IOC, SCOR & IAPSO (2010). The international thermodynamic equation of seawater – 2010.
       IOC Manuals and Guides No. 56, UNESCO.
    .. [2] McDougall & Barker (2011). Getting started with TEOS-10 and the GSW Oceanographic
       Toolbox. SCOR/IAPSO WG127.
    """
    sp_a, t_a, p_a = _check_state(sp, t_c, p_dbar, _TEOS10)
    sa = _absolute_salinity_g_kg(sp_a, p_a)
    return _out(gsw.rho_t_exact(sa, t_a, p_a))


def specific_heat_j_kg_k(
    sp: ArrayLike, t_c: ArrayLike, p_dbar: ArrayLike = 0.0
) -> float | np.ndarray:
    """Isobaric specific heat capacity of seawater (TEOS-10).

    Parameters
    ----------
    sp : float or array
        Practical salinity SP [-], 0 ≤ SP ≤ 42.
    t_c : float or array
        In-situ temperature [°C] (ITS-90), −2 ≤ t ≤ 40.
    p_dbar : float or array
        Sea pressure [dbar], 0 ≤ p ≤ 11000. Default 0.

    Returns
    -------
    float or ndarray
        c_p [J/(kg·K)].

    Notes
    -----
    c_p = −T ∂²g/∂T² from the TEOS-10 Gibbs function [1]_ (``gsw.cp_t_exact``), with SA from SP
    at 0° E, 0° N as in :func:`density_kg_m3`.

    References
    ----------
    .. [1] IOC, SCOR & IAPSO (2010). The international thermodynamic equation of seawater – 2010.
       IOC Manuals and Guides No. 56, UNESCO.
    """
    sp_a, t_a, p_a = _check_state(sp, t_c, p_dbar, _TEOS10)
    sa = _absolute_salinity_g_kg(sp_a, p_a)
    return _out(gsw.cp_t_exact(sa, t_a, p_a))


def viscosity_pa_s(sp: ArrayLike, t_c: ArrayLike) -> float | np.ndarray:
    """Dynamic viscosity of seawater at atmospheric pressure (Sharqawy et al. 2010).

    Parameters
    ----------
    sp : float or array
        Practical salinity SP [-], 0 ≤ SP ≤ 42.
    t_c : float or array
        Temperature [°C], −2 ≤ t ≤ 40.

    Returns
    -------
    float or ndarray
        Dynamic viscosity μ [Pa·s].

    Notes
    -----
    Pure water, eq. 22 of [1]_ (fitted to IAPWS data, 0–180 °C):

        μ_w = 4.2844e-5 + [0.157 (t + 64.993)² − 91.296]⁻¹      [Pa·s, t in °C]

    Seawater, eq. 23 of [1]_ (0–180 °C, 0–0.15 kg/kg, ±1.5 %):

        μ_sw = μ_w (1 + A S + B S²),
        A = 1.541 + 1.998e-2 t − 9.52e-5 t²,
        B = 7.974 − 7.561e-2 t + 4.724e-4 t²,

    with S = SA/1000 [kg/kg], SA from SP at 0° E, 0° N (module docstring). The pressure effect
    (a few tenths of a per cent per 100 bar) is ignored. Between −2 and 0 °C the correlation is
    used slightly outside its fitted range.

    References
    ----------
    .. [1] Sharqawy, M. H., Lienhard V, J. H. & Zubair, S. M. (2010). Thermophysical properties of
       seawater: a review of existing correlations and data. Desalination and Water Treatment 16,
       354–380. doi:10.5004/dwt.2010.1079
    """
    sp_a = _checked("practical salinity SP", sp, SALINITY_RANGE, "", _SHARQAWY)
    t = _checked("temperature t_c", t_c, TEMPERATURE_RANGE_C, "°C", _SHARQAWY)
    s_kg_kg = _absolute_salinity_g_kg(sp_a, np.zeros_like(sp_a)) / 1000.0
    mu_w = 4.2844e-5 + 1.0 / (0.157 * (t + 64.993) ** 2 - 91.296)
    a = 1.541 + 1.998e-2 * t - 9.52e-5 * t**2
    b = 7.974 - 7.561e-2 * t + 4.724e-4 * t**2
    return _out(mu_w * (1.0 + a * s_kg_kg + b * s_kg_kg**2))


def water_state(sp: float, t_c: float, p_dbar: float = 0.0) -> WaterState:
    """All properties of one water state, bundled for the vessel and thruster models.

    Parameters
    ----------
    sp : float
        Practical salinity SP [-], 0 ≤ SP ≤ 42.
    t_c : float
        In-situ temperature [°C] (ITS-90), −2 ≤ t ≤ 40.
    p_dbar : float
        Sea pressure [dbar], 0 ≤ p ≤ 11000. Default 0.

    Returns
    -------
    WaterState
        Conductivity [S/m], its temperature derivative [S/(m·K)], density [kg/m³], specific heat
        [J/(kg·K)] and viscosity [Pa·s] at (sp, t_c, p_dbar).

    Notes
    -----
    dσ/dt is the central difference [σ(t + h) − σ(t − h)]/(2h), h = 0.05 K, of the PSS-78
    conductivity ([1]_ through gsw); at the ends of the temperature range the PSS-78 polynomial is
    evaluated 0.05 K beyond it, which is harmless for this smooth polynomial.

    References
    ----------
    .. [1] Fofonoff & Millard (1983), Unesco Tech. Pap. Mar. Sci. 44.
    .. [2] IOC, SCOR & IAPSO (2010), TEOS-10 manual, IOC Manuals and Guides 56.
    .. [3] Sharqawy, Lienhard & Zubair (2010), Desalination and Water Treatment 16, 354–380.
       doi:10.5004/dwt.2010.1079
    """
    sp_f, t_f, p_f = (float(v) for v in _check_state(sp, t_c, p_dbar, "water_state"))
    h = _DT_DIFF_K
    dsigma_dt = float(
        (_sigma_unchecked(sp_f, t_f + h, p_f) - _sigma_unchecked(sp_f, t_f - h, p_f)) / (2.0 * h)
    )
    return WaterState(
        sp=sp_f,
        t_c=t_f,
        p_dbar=p_f,
        sigma_s_m=float(conductivity_s_m(sp_f, t_f, p_f)),
        dsigma_dt_s_m_k=dsigma_dt,
        rho_kg_m3=float(density_kg_m3(sp_f, t_f, p_f)),
        cp_j_kg_k=float(specific_heat_j_kg_k(sp_f, t_f, p_f)),
        mu_pa_s=float(viscosity_pa_s(sp_f, t_f)),
    )


def conductivity_at_temperature_s_m(state: WaterState, t_c: ArrayLike) -> float | np.ndarray:
    """Conductivity of the water of ``state`` after heating (or cooling) to ``t_c``.

    Used for the Joule-heated water inside a thruster duct: salinity and pressure are those of
    ``state``, only the temperature changes.

    Parameters
    ----------
    state : WaterState
        The incoming water (its ``sp`` and ``p_dbar`` are used).
    t_c : float or array
        Water temperature [°C], −2 ≤ t ≤ 95.

    Returns
    -------
    float or ndarray
        Conductivity σ [S/m].

    Raises
    ------
    ModelRangeError
        If ``t_c`` is non-finite or outside −2…95 °C.

    Notes
    -----
    For −2 ≤ t ≤ 40 °C this is PSS-78 through gsw, exactly as :func:`conductivity_s_m`.
    Above 40 °C PSS-78 has no validity, so the conductivity is **extrapolated linearly** from its
    40 °C value with the slope at 40 °C:

        σ(t) = σ(40 °C) + (dσ/dt)|₄₀ (t − 40),   40 < t ≤ 95 °C,

    with (dσ/dt)|₄₀ from the three-point backward difference
    [3σ(40) − 4σ(40 − h) + σ(40 − 2h)]/(2h), h = 0.05 K, which stays inside −2…40 °C. The
    extrapolation is continuous in value and slope at 40 °C. It is a model assumption, not a fit
    to data: the relative temperature coefficient of strong-electrolyte conductivity keeps
    decreasing with temperature, so treat results far above 40 °C as an estimate whose accuracy
    has not been checked against data.

    References
    ----------
    .. [1] Fofonoff & Millard (1983), Unesco Tech. Pap. Mar. Sci. 44.
    .. [2] McDougall & Barker (2011), Getting started with TEOS-10 and the GSW toolbox.
    """
    model = "duct-water conductivity (PSS-78, linear above 40 °C)"
    t = _checked("temperature t_c", t_c, DUCT_TEMPERATURE_RANGE_C, "°C", model)
    sp_f = float(_checked("practical salinity SP", state.sp, SALINITY_RANGE, "", model))
    p_f = float(_checked("sea pressure p_dbar", state.p_dbar, PRESSURE_RANGE_DBAR, "dbar", model))
    t_hi = _EXTRAPOLATION_START_C
    h = _DT_DIFF_K
    s0, s1, s2 = (float(_sigma_unchecked(sp_f, t_hi - k * h, p_f)) for k in (0, 1, 2))
    slope = (3.0 * s0 - 4.0 * s1 + s2) / (2.0 * h)
    inside = _sigma_unchecked(sp_f, np.minimum(t, t_hi), p_f)
    sigma = np.where(t <= t_hi, inside, s0 + slope * (t - t_hi))
    return _out(sigma)
