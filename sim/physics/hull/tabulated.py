"""A measured calm-water resistance curve: shape-preserving (PCHIP) interpolation between the
points and a ``V²`` law beyond the last one.

References
----------
.. [1] Fritsch, F. N. & Carlson, R. E. (1980). Monotone piecewise cubic interpolation. SIAM Journal
   on Numerical Analysis 17(2), 238–246. doi:10.1137/0717021
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np
from numpy.typing import ArrayLike

if TYPE_CHECKING:
    from scipy.interpolate import PchipInterpolator

from sim.physics.errors import ModelRangeError
from sim.physics.hull.interface import ResistanceBreakdown, _breakdown, _check_fluid, _positive

__all__ = ["TabulatedResistance"]

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
        from scipy.interpolate import PchipInterpolator  # ≈0.3 s to import: only when used

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
