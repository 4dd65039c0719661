"""Rebuild what a run was flown with from the provenance stored in its log.

A log keeps the text of the scenario file and of the vessel file (``scenario_text``,
``vessel_text``) beside their paths; :func:`plant_from_provenance` turns them back into the
engine's plant and the run's limits, through the same validation and seam as a file on disk.
"""

from __future__ import annotations

import tomllib
from typing import TYPE_CHECKING

from pydantic import ValidationError

from sim.engine.plant import Plant, build_plant
from sim.engine.spec import LimitsSpec
from sim.io.files import load_vessel, validate_vessel_data
from sim.io.problems import InputError, Problem
from sim.io.schema import LimitsSpec as LimitsTable
from sim.io.schema import WaterSpec
from sim.io.seam import limits_spec, vessel_spec, water

if TYPE_CHECKING:  # annotation only: reading a log needs h5py, this module does not
    from sim.io.log import RunLog

__all__ = ["plant_from_provenance"]


def plant_from_provenance(log: RunLog) -> tuple[Plant, LimitsSpec, list[str]]:
    """Rebuild the plant and the limits a run was flown with, from the log's provenance.

    The vessel comes from the ``vessel_text`` attribute when it is a whole vessel file, else
    (a file that ``extends`` another) from ``vessel_path`` on disk, which is noted. Water and
    limits come from ``scenario_text``.

    Parameters
    ----------
    log : RunLog
        A log read with :func:`sim.io.log.read_log` (only ``attrs`` and ``path`` are used).

    Returns
    -------
    (plant, limits, notes)
        The plant, the run's limits (engine spec, SI) and notes on how they were rebuilt.

    Raises
    ------
    InputError
        When the stored texts are not valid files.
    """
    notes: list[str] = []
    a = log.attrs
    where = str(log.path)
    try:
        sc = tomllib.loads(str(a.get("scenario_text", "")))
    except tomllib.TOMLDecodeError as exc:
        raise InputError([Problem(where, "scenario_text", "…", f"not valid TOML: {exc}")]) from None
    vpath = str(a.get("vessel_path", ""))
    vdata = None
    try:
        vdata = tomllib.loads(str(a.get("vessel_text", "")))
    except tomllib.TOMLDecodeError:
        vdata = None
    if vdata is not None and "extends" not in vdata and "vessel" in vdata:
        vessel = vessel_spec(validate_vessel_data(vdata, f"{where} (vessel_text)"))
    else:
        vessel = load_vessel(vpath).vessel_spec
        notes.append(
            f"vessel rebuilt from {vpath} as it is on disk now (the log holds an 'extends' chain)"
        )
    try:
        ws = WaterSpec.model_validate(sc.get("water", {}))
        limits = LimitsTable.model_validate(sc.get("limits", {}))
    except ValidationError as exc:
        raise InputError(
            [Problem(where, "scenario_text", "…", f"invalid water/limits: {exc}")]
        ) from None
    return build_plant(vessel, water(ws)), limits_spec(limits), notes
