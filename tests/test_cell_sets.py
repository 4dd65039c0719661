"""Spot values of each named cell parameter set against its source (one table per set).

Each row is (SOC, cell temperature) -> OCV [V], R0 [Ω], R1 [Ω], C1 [F] as the model returns them
for a single cell (1s1p pack). The source of every table is named in the comment above it.
"""

from __future__ import annotations

import importlib

import pytest

from sim.physics import battery as bat
from sim.physics.battery.cells import CELL_SETS


def _one_cell(cell: bat.CellParameters) -> bat.Pack:
    return bat.Pack(cell, 1, 1)


def _check(cell, soc, temp_c, ocv, r0, r1, c1, rel) -> None:
    pack = _one_cell(cell)
    assert bat.ocv_v(pack, soc) == pytest.approx(ocv, rel=rel)
    assert bat.r0_ohm(pack, soc, temp_c) == pytest.approx(r0, rel=rel)
    (r1_got, c1_got), *_ = bat.rc_params(pack, soc, temp_c)
    assert r1_got == pytest.approx(r1, rel=rel)
    assert c1_got == pytest.approx(c1, rel=rel)


# Huria, Ceraolo, Gazzarri & Jackey (2012), IEEE IEVC, doi:10.1109/IEVC.2012.6183271: 1-RC table
# of an NMC pouch cell at 20 °C, values as listed in /work/shared/REFERENCES.md (attribution from
# memory). The model holds them exactly at the table temperature (Arrhenius factor 1).
HURIA2012_20C = [
    # soc, temp_c, OCV [V], R0 [Ω], R1 [Ω], C1 [F]
    (0.0, 20.0, 3.51, 8.5e-3, 2.9e-3, 12447.0),
    (0.1, 20.0, 3.56, 8.5e-3, 2.4e-3, 18872.0),
    (0.25, 20.0, 3.64, 8.7e-3, 2.6e-3, 40764.0),
    (0.5, 20.0, 3.71, 8.2e-3, 1.6e-3, 18721.0),
    (0.75, 20.0, 3.93, 8.3e-3, 2.3e-3, 33630.0),
    (0.9, 20.0, 4.08, 8.5e-3, 1.8e-3, 18360.0),
    (1.0, 20.0, 4.19, 8.5e-3, 1.7e-3, 23394.0),
]


@pytest.mark.parametrize(("soc", "temp_c", "ocv", "r0", "r1", "c1"), HURIA2012_20C)
def test_huria2012_nmc_spot_values(soc, temp_c, ocv, r0, r1, c1) -> None:
    _check(bat.NMC_POUCH_HURIA2012, soc, temp_c, ocv, r0, r1, c1, rel=1e-12)


def test_huria2012_capacity() -> None:
    # Huria et al. (2012): 27.63 A·h (REFERENCES.md).
    assert bat.NMC_POUCH_HURIA2012.capacity_ah == 27.63


# Chen & Rincón-Mora (2006), IEEE Trans. Energy Conversion 21(2):504-511,
# doi:10.1109/TEC.2006.874229: the published closed-form functions of SOC (V_oc, R_series,
# R_transient_S, C_transient_S) evaluated at table points, printed to 5 significant figures
# (computed from the published coefficients), at the 25 °C reference temperature.
CHEN2006_25C = [
    # soc, temp_c, OCV [V], R0 [Ω], R1 [Ω], C1 [F]
    (0.02, 25.0, 3.1773, 0.1704, 0.2258, 128.97),
    (0.1, 25.0, 3.6746, 0.088115, 0.064096, 508.61),
    (0.5, 25.0, 3.8034, 0.074461, 0.04669, 702.72),
    (1.0, 25.0, 4.1029, 0.07446, 0.04669, 703.6),
]


@pytest.mark.parametrize(("soc", "temp_c", "ocv", "r0", "r1", "c1"), CHEN2006_25C)
def test_chen2006_polymer_spot_values(soc, temp_c, ocv, r0, r1, c1) -> None:
    # 5 significant figures: relative tolerance 1e-4.
    _check(bat.LIPO_POUCH_CHEN2006, soc, temp_c, ocv, r0, r1, c1, rel=1e-4)


@pytest.mark.parametrize(
    ("soc", "r2", "c2"), [(0.02, 0.34611, 954.34), (0.1, 0.049841, 4072.9), (0.5, 0.04984, 4475.0)]
)
def test_chen2006_second_rc_pair(soc, r2, c2) -> None:
    # Chen & Rincón-Mora (2006): R_transient_L, C_transient_L fits (5 significant figures).
    _, (r2_got, c2_got) = bat.rc_params(_one_cell(bat.LIPO_POUCH_CHEN2006), soc, 25.0)
    assert r2_got == pytest.approx(r2, rel=1e-4)
    assert c2_got == pytest.approx(c2, rel=1e-4)


# LFP/graphite large prismatic cell: representative values, from memory (no published table was
# at hand), so only loose bands: OCV plateau 3.25–3.35 V between 20 % and 90 % SOC, about 3.4 V
# full and below 3.0 V empty; R0 of a 100 A·h cell 0.5–1.0 mΩ at mid SOC and 25 °C.
LFP_FROM_MEMORY_25C = [
    # soc, temp_c, OCV [V], R0 [Ω], R1 [Ω], C1 [F]; loose (from memory)
    (0.5, 25.0, 3.30, 0.7e-3, 0.45e-3, 3.0e4),
    (0.9, 25.0, 3.33, 0.7e-3, 0.5e-3, 3.0e4),
]


@pytest.mark.parametrize(("soc", "temp_c", "ocv", "r0", "r1", "c1"), LFP_FROM_MEMORY_25C)
def test_lfp_representative_spot_values_loose(soc, temp_c, ocv, r0, r1, c1) -> None:
    cell = bat.LFP_PRISMATIC_REPRESENTATIVE
    pack = _one_cell(cell)
    assert bat.ocv_v(pack, soc) == pytest.approx(ocv, rel=0.03)  # from memory, loose
    assert bat.r0_ohm(pack, soc, temp_c) == pytest.approx(r0, rel=0.3)  # from memory, loose
    (r1_got, c1_got), _ = bat.rc_params(pack, soc, temp_c)
    assert r1_got == pytest.approx(r1, rel=0.3)  # from memory, loose
    assert c1_got == pytest.approx(c1, rel=0.3)  # from memory, loose
    assert "from memory" in cell.name and "from memory" in cell.source


# ------------------------------------------------------------------------------------------------
# Registry
# ------------------------------------------------------------------------------------------------

_MODULES = {
    "nmc_pouch_huria2012": ("huria2012_nmc", "NMC_POUCH_HURIA2012", "Huria"),
    "lipo_pouch_chen2006": ("chen2006_polymer", "LIPO_POUCH_CHEN2006", "Rincón-Mora"),
    "lfp_prismatic_representative": (
        "lfp_representative",
        "LFP_PRISMATIC_REPRESENTATIVE",
        "from memory",
    ),
}


@pytest.mark.parametrize("key", sorted(_MODULES))
def test_each_set_is_a_module_naming_its_source(key) -> None:
    # Project convention (PyBaMM-style parameter sets): one module per set, source in its
    # docstring and in the set's `source` field.
    module_name, attr, source_word = _MODULES[key]
    module = importlib.import_module(f"sim.physics.battery.cells.{module_name}")
    assert CELL_SETS[key] is getattr(module, attr) is getattr(bat, attr)
    assert "Source" in module.__doc__ and source_word in module.__doc__
    assert source_word in CELL_SETS[key].source


def test_registry_holds_exactly_the_modules() -> None:
    assert set(CELL_SETS) == set(_MODULES)
    assert bat.CELL_SETS is CELL_SETS
