"""Named cell parameter sets, one module per set with its source in the module docstring, and
the registry :data:`CELL_SETS` by key (the key is what scenario files name).

References
----------
See each module: :mod:`.huria2012_nmc` (Huria et al. 2012), :mod:`.chen2006_polymer` (Chen &
Rincón-Mora 2006), :mod:`.lfp_representative` (representative values, from memory).
"""

from __future__ import annotations

from sim.physics.battery.cells.chen2006_polymer import LIPO_POUCH_CHEN2006
from sim.physics.battery.cells.huria2012_nmc import NMC_POUCH_HURIA2012
from sim.physics.battery.cells.lfp_representative import LFP_PRISMATIC_REPRESENTATIVE
from sim.physics.battery.parameters import CellParameters

__all__ = [
    "CELL_SETS",
    "LFP_PRISMATIC_REPRESENTATIVE",
    "LIPO_POUCH_CHEN2006",
    "NMC_POUCH_HURIA2012",
]

CELL_SETS: dict[str, CellParameters] = {
    "nmc_pouch_huria2012": NMC_POUCH_HURIA2012,
    "lfp_prismatic_representative": LFP_PRISMATIC_REPRESENTATIVE,
    "lipo_pouch_chen2006": LIPO_POUCH_CHEN2006,
}
"""Named cell parameter sets by key."""
