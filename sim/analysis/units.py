"""Output units of the analysis tables and figures: nautical (kn, nmi) or metric (m/s, km).

Everything inside :mod:`sim.analysis` is SI; an :class:`OutputUnits` converts at the very edge,
when a number is printed or plotted.
"""

from __future__ import annotations

from dataclasses import dataclass

from sim.physics.constants import KNOT_M_S, NAUTICAL_MILE_M

__all__ = ["METRIC", "NAUTICAL", "UNIT_SYSTEMS", "OutputUnits", "output_units"]


@dataclass(frozen=True)
class OutputUnits:
    """How speeds and distances are shown.

    Attributes
    ----------
    name : str
        ``"nautical"`` or ``"metric"``.
    speed_label : str
        Unit text of speeds (``"kn"`` or ``"m/s"``).
    speed_per_m_s : float
        Shown speed per 1 m/s [label/(m/s)].
    distance_label : str
        Unit text of distances (``"nmi"`` or ``"km"``).
    metres_per_distance : float
        Metres in one shown distance unit [m].
    """

    name: str
    speed_label: str
    speed_per_m_s: float
    distance_label: str
    metres_per_distance: float

    def speed(self, speed_m_s):
        """Speed [m/s] → shown unit (works on arrays)."""
        return speed_m_s * self.speed_per_m_s

    def distance(self, distance_m):
        """Distance [m] → shown unit (works on arrays)."""
        return distance_m / self.metres_per_distance

    def energy_per_distance(self, j_per_m):
        """Energy per distance [J/m] → Wh per shown distance unit (works on arrays)."""
        return j_per_m * self.metres_per_distance / 3600.0

    @property
    def energy_per_distance_label(self) -> str:
        return f"Wh/{self.distance_label}"


NAUTICAL = OutputUnits("nautical", "kn", 1.0 / KNOT_M_S, "nmi", NAUTICAL_MILE_M)
METRIC = OutputUnits("metric", "m/s", 1.0, "km", 1000.0)
UNIT_SYSTEMS = {"nautical": NAUTICAL, "metric": METRIC}


def output_units(name: str | OutputUnits) -> OutputUnits:
    """The unit system called ``name`` (``"nautical"`` or ``"metric"``)."""
    if isinstance(name, OutputUnits):
        return name
    try:
        return UNIT_SYSTEMS[name]
    except KeyError:
        raise ValueError(
            f"unknown unit system {name!r}; allowed: {', '.join(UNIT_SYSTEMS)}"
        ) from None
