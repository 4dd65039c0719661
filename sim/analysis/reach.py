"""Range and endurance: how long a pack lasts at a steady demand, and how far the craft gets.

The names live in three modules, one concern each, and are re-exported here:

* :mod:`sim.analysis.endurance` — :func:`pack_endurance` (the pack circuit integrated at a
  constant power to cut-off) and :func:`stored_energy_j`;
* :mod:`sim.analysis.range_curves` — :func:`range_at_speed`, :func:`range_curve` and
  :func:`default_speed_grid` (steady speed–power–range–endurance curves);
* :mod:`sim.analysis.log_range` — :func:`range_from_log`, :func:`check_log_capacity`,
  :class:`LogMismatchError` and :func:`plant_from_log` (what a run log says about the range
  left).
"""

from __future__ import annotations

from sim.analysis.endurance import (
    CUT_NONE,
    CUT_POWER,
    CUT_SOC,
    CUT_TEMP,
    CUT_TIME,
    DEFAULT_MAX_TIME_S,
    DEFAULT_TEMP_MAX_C,
    PackEndurance,
    pack_endurance,
    stored_energy_j,
)
from sim.analysis.log_range import (
    LegUse,
    LogMismatchError,
    LogRange,
    Remaining,
    check_log_capacity,
    plant_from_log,
    range_from_log,
)
from sim.analysis.range_curves import (
    RangeCurve,
    RangePoint,
    default_speed_grid,
    range_at_speed,
    range_curve,
    range_speed_grid,
)

__all__ = [
    "CUT_NONE",
    "CUT_POWER",
    "CUT_SOC",
    "CUT_TEMP",
    "CUT_TIME",
    "DEFAULT_MAX_TIME_S",
    "DEFAULT_TEMP_MAX_C",
    "LegUse",
    "LogMismatchError",
    "LogRange",
    "PackEndurance",
    "RangeCurve",
    "RangePoint",
    "Remaining",
    "check_log_capacity",
    "default_speed_grid",
    "pack_endurance",
    "plant_from_log",
    "range_at_speed",
    "range_curve",
    "range_from_log",
    "range_speed_grid",
    "stored_energy_j",
]
