"""The Chen & Rincón-Mora (2006) cell set reproduces the paper's closed-form functions."""

from __future__ import annotations

import math

import numpy as np
import pytest

from sim.physics import battery as bat

CELL = bat.LIPO_POUCH_CHEN2006


def voc(x):
    # Chen & Rincón-Mora (2006), IEEE Trans. Energy Conversion 21(2):504-511, OCV fit
    return -1.031 * math.exp(-35 * x) + 3.685 + 0.2156 * x - 0.1178 * x**2 + 0.3201 * x**3


@pytest.mark.parametrize("soc", [0.1, 0.2, 0.5, 0.8, 1.0])
def test_table_points_equal_the_published_functions(soc):
    pack = bat.Pack(cell=CELL, n_series=1, n_parallel=1)
    assert bat.ocv_v(pack, soc) == pytest.approx(voc(soc), rel=1e-12)
    # series resistance R = 0.1562·e^(−24.37·SOC) + 0.07446 (same source), at 25 °C reference
    r0 = 0.1562 * math.exp(-24.37 * soc) + 0.07446
    assert bat.r0_ohm(pack, soc, 25.0) == pytest.approx(r0, rel=1e-12)
    (r1, c1), (r2, c2) = bat.rc_params(pack, soc, 25.0)
    assert r1 == pytest.approx(0.3208 * math.exp(-29.14 * soc) + 0.04669, rel=1e-12)
    assert c1 == pytest.approx(-752.9 * math.exp(-13.51 * soc) + 703.6, rel=1e-12)
    assert r2 == pytest.approx(6.603 * math.exp(-155.2 * soc) + 0.04984, rel=1e-12)
    assert c2 == pytest.approx(-6056 * math.exp(-27.12 * soc) + 4475, rel=1e-12)


def test_full_and_empty_voltages():
    # V_oc(1) = 4.1029 V and V_oc(0) = 2.654 V from the published fit (computed)
    assert CELL.ocv_v[-1] == pytest.approx(4.1029, abs=1e-4)
    assert CELL.ocv_v[0] == pytest.approx(2.654, abs=1e-4)
    # energy: ∫OCV dQ over 0.85 A·h lies between 0.85·3.6 and 0.85·3.9 W·h (plateau 3.7–3.9 V)
    assert 0.85 * 3.6 < CELL.energy_wh < 0.85 * 3.9


def test_two_time_constants_are_seconds_and_minutes():
    # the paper's two RC pairs: transient time constants of order 30 s and 200+ s at mid SOC
    pack = bat.Pack(cell=CELL, n_series=1, n_parallel=1)
    (r1, c1), (r2, c2) = bat.rc_params(pack, 0.5, 25.0)
    assert 10 < r1 * c1 < 60
    assert 100 < r2 * c2 < 400


def test_pack_scaling_keeps_time_constants():
    # circuit theory: series × parallel scaling leaves every R·C unchanged
    one = bat.Pack(cell=CELL, n_series=1, n_parallel=1)
    big = bat.Pack(cell=CELL, n_series=12, n_parallel=30)
    for (r, c), (rb, cb) in zip(
        bat.rc_params(one, 0.4, 25.0), bat.rc_params(big, 0.4, 25.0), strict=True
    ):
        assert r * c == pytest.approx(rb * cb, rel=1e-12)
    assert np.isclose(bat.ocv_v(big, 0.4), 12 * bat.ocv_v(one, 0.4))
