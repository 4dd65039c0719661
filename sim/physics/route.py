r"""Water along the route: salinity, temperature and current against distance or time, and a
tidal current that turns with time.

A route table gives practical salinity, temperature and (optionally) a steady current at
stations along an axis, either distance run [m] or elapsed time [s]; between stations the
values are interpolated linearly, beyond the ends they are held at the end values (clamped).
The water state there (σ, ρ, μ, c_p) follows from :func:`sim.physics.seawater.water_state`, so
conductivity, and with it the thrust of a duct at a fixed voltage, rises as a craft leaves a
river mouth (SP ≈ 5) for the open sea (SP ≈ 35).

The tidal current is the principal lunar semidiurnal constituent M2 alone:
u(t) = u_mean + A cos(2π t/T − φ), T = 12.4206 h, with amplitude A and phase φ given; its
direction is given by the sign convention of the caller (here: along the track, + = with the
craft).

References
----------
.. [1] IOC, SCOR & IAPSO (2010). TEOS-10 manual; Fofonoff & Millard (1983) (via
   :mod:`sim.physics.seawater`).
.. [2] Doodson, A. T. (1921). The harmonic development of the tide-generating potential.
   Proceedings of the Royal Society A 100, 305–329 (M2 period 12.4206 h: angular speed
   28.9841042 °/h).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError
from sim.physics.seawater import WaterState, water_state

__all__ = [
    "M2_PERIOD_S",
    "RouteWater",
    "TidalCurrent",
    "current_along_track_m_s",
    "route_values",
    "tidal_current_m_s",
    "water_at",
]

M2_PERIOD_S = 360.0 / 28.9841042 * 3600.0
"""Period of the M2 tide [s] (12.4206 h; Doodson 1921)."""

_MODEL = "route water"


@dataclass(frozen=True)
class RouteWater:
    """Water properties at stations along a route.

    Attributes
    ----------
    axis : str
        "distance" (stations in metres run) or "time" (seconds elapsed).
    stations : tuple of float
        Station positions, strictly increasing [m or s].
    sp : tuple of float
        Practical salinity at the stations [-].
    t_c : tuple of float
        Temperature at the stations [°C].
    current_m_s : tuple of float
        Steady current along the track at the stations [m/s] (+ = with the craft); empty for
        none.
    p_dbar : float
        Sea pressure at the thruster [dbar]; default 0.
    """

    axis: str
    stations: tuple[float, ...]
    sp: tuple[float, ...]
    t_c: tuple[float, ...]
    current_m_s: tuple[float, ...] = ()
    p_dbar: float = 0.0

    def __post_init__(self) -> None:
        if self.axis not in ("distance", "time"):
            raise ModelRangeError("axis", self.axis, '"distance" or "time"', _MODEL)
        s = np.asarray(self.stations, dtype=float)
        if s.ndim != 1 or s.size < 1 or not np.all(np.isfinite(s)):
            raise ModelRangeError("stations", self.stations, "one or more finite values", _MODEL)
        if np.any(np.diff(s) <= 0.0):
            raise ModelRangeError("stations", self.stations, "strictly increasing", _MODEL)
        for name in ("sp", "t_c") + (("current_m_s",) if self.current_m_s else ()):
            v = np.asarray(getattr(self, name), dtype=float)
            if v.shape != s.shape or not np.all(np.isfinite(v)):
                raise ModelRangeError(
                    name, getattr(self, name), f"{s.size} finite values, one per station", _MODEL
                )
        # property ranges are checked once here, at the stations (interpolation stays inside)
        for sp, t in zip(self.sp, self.t_c, strict=True):
            water_state(sp, t, self.p_dbar)


def route_values(route: RouteWater, position: ArrayLike) -> tuple[np.ndarray, ...]:
    """Salinity, temperature and current at positions along the route (linear, clamped).

    Parameters
    ----------
    route : RouteWater
    position : float or array
        Distance run [m] or time [s], as the route's axis.

    Returns
    -------
    (sp, t_c, current_m_s) : ndarrays
        [-], [°C], [m/s] (0 when the route has no current column).

    References
    ----------
    Linear interpolation (numpy.interp), held at the end values outside the table.
    """
    x = np.asarray(position, dtype=float)
    if not np.all(np.isfinite(x)):
        raise ModelRangeError("position", position, "finite", _MODEL)
    s = np.asarray(route.stations, dtype=float)
    sp = np.interp(x, s, np.asarray(route.sp, dtype=float))
    t = np.interp(x, s, np.asarray(route.t_c, dtype=float))
    cur = (
        np.interp(x, s, np.asarray(route.current_m_s, dtype=float))
        if route.current_m_s
        else np.zeros_like(sp)
    )
    return sp, t, cur


def water_at(route: RouteWater, position: float) -> WaterState:
    """The water state at a position (or time) on the route.

    Parameters
    ----------
    route : RouteWater
    position : float
        Distance run [m] or time [s].

    Returns
    -------
    WaterState
        :func:`sim.physics.seawater.water_state` at the interpolated salinity and temperature.

    References
    ----------
    TEOS-10 / PSS-78 via :mod:`sim.physics.seawater`.
    """
    sp, t, _ = route_values(route, float(position))
    return water_state(float(sp), float(t), route.p_dbar)


@dataclass(frozen=True)
class TidalCurrent:
    """An M2 tidal current along the track.

    Attributes
    ----------
    amplitude_m_s : float
        Amplitude A ≥ 0 [m/s].
    phase_rad : float
        Phase φ [rad]: the flood peak (+A) at t = φT/(2π).
    mean_m_s : float
        Residual (mean) current [m/s]; default 0.
    period_s : float
        Period [s]; default M2, 12.4206 h.
    """

    amplitude_m_s: float
    phase_rad: float = 0.0
    mean_m_s: float = 0.0
    period_s: float = M2_PERIOD_S

    def __post_init__(self) -> None:
        if not (math.isfinite(self.amplitude_m_s) and self.amplitude_m_s >= 0.0):
            raise ModelRangeError("amplitude_m_s", self.amplitude_m_s, "≥ 0 m/s", _MODEL)
        if not (math.isfinite(self.period_s) and self.period_s > 0.0):
            raise ModelRangeError("period_s", self.period_s, "> 0 s", _MODEL)
        for name in ("phase_rad", "mean_m_s"):
            if not math.isfinite(getattr(self, name)):
                raise ModelRangeError(name, getattr(self, name), "finite", _MODEL)


def tidal_current_m_s(tide: TidalCurrent, t_s: ArrayLike) -> float | np.ndarray:
    """Tidal current at a time [m/s].

    Parameters
    ----------
    tide : TidalCurrent
    t_s : float or array
        Time [s].

    Returns
    -------
    float or ndarray
        u = u_mean + A cos(2π t/T − φ) [m/s].

    References
    ----------
    Harmonic tide, single constituent (Doodson 1921).
    """
    t = np.asarray(t_s, dtype=float)
    u = tide.mean_m_s + tide.amplitude_m_s * np.cos(
        2.0 * np.pi * t / tide.period_s - tide.phase_rad
    )
    return float(u) if u.ndim == 0 else u


def current_along_track_m_s(
    route: RouteWater | None,
    distance_m: float,
    time_s: float,
    tide: TidalCurrent | None = None,
) -> float:
    """Total current along the track: the route's steady current plus the tide [m/s].

    Parameters
    ----------
    route : RouteWater or None
        Route table (its axis picks distance or time); None for no table.
    distance_m, time_s : float
        Distance run [m] and elapsed time [s].
    tide : TidalCurrent or None

    Returns
    -------
    float
        Current with the craft [m/s] (speed over ground = speed through water + current).

    References
    ----------
    Superposition of the tabulated current and the harmonic tide.
    """
    u = 0.0
    if route is not None:
        pos = distance_m if route.axis == "distance" else time_s
        u += float(route_values(route, pos)[2])
    if tide is not None:
        u += float(tidal_current_m_s(tide, time_s))
    return u
