"""Aged cells (sim.physics.battery.ageing): capacity fade and resistance growth as the two
state-of-health figures (Plett 2015, ch. 2; common practice)."""

from __future__ import annotations

import pytest

from sim.physics import battery as bat
from sim.physics.errors import ModelRangeError

FRESH = bat.CELL_SETS["nmc_pouch_huria2012"]


def test_new_cells_are_the_fresh_parameter_set():
    # limiting case: no ageing
    assert bat.aged_cell(FRESH) is FRESH


def test_capacity_and_energy_scale_with_the_capacity_retained():
    aged = bat.aged_cell(FRESH, capacity_retained=0.8)
    # the Huria et al. (2012) cell is rated 27.63 A·h (REFERENCES.md); 80 % state of health
    assert aged.capacity_ah == pytest.approx(0.8 * 27.63, rel=1e-3)
    # identity: ∫OCV dQ over the same OCV curve scales with the charge
    assert aged.energy_wh == pytest.approx(0.8 * FRESH.energy_wh, rel=1e-12)
    pack_new = bat.Pack(cell=FRESH, n_series=10, n_parallel=4)
    pack_old = bat.Pack(cell=aged, n_series=10, n_parallel=4)
    assert pack_old.capacity_ah == pytest.approx(0.8 * pack_new.capacity_ah, rel=1e-12)


def test_resistance_growth_keeps_the_rc_time_constants():
    aged = bat.aged_cell(FRESH, resistance_growth=2.0)  # a common end-of-life criterion
    for r_new, r_old in zip(FRESH.r0_ohm, aged.r0_ohm, strict=True):
        assert r_old == pytest.approx(2.0 * r_new, rel=1e-12)
    for r, c, r2, c2 in zip(FRESH.r1_ohm, FRESH.c1_f, aged.r1_ohm, aged.c1_f, strict=True):
        assert r2 * c2 == pytest.approx(r * c, rel=1e-12)


def test_an_aged_pack_sags_more_under_the_same_current():
    new = bat.Pack(cell=FRESH, n_series=10, n_parallel=4)
    old = bat.Pack(cell=bat.aged_cell(FRESH, resistance_growth=1.5), n_series=10, n_parallel=4)
    v_new = float(bat.solve_terminal_for_current(new, 0.5, 0.0, 25.0, 100.0).terminal_v)
    v_old = float(bat.solve_terminal_for_current(old, 0.5, 0.0, 25.0, 100.0).terminal_v)
    ocv = float(bat.ocv_v(new, 0.5))
    # identity: the ohmic drop grows by the same factor (no RC voltage at this instant)
    assert (ocv - v_old) == pytest.approx(1.5 * (ocv - v_new), rel=1e-9)


@pytest.mark.parametrize(("cap", "res"), [(0.2, 1.0), (1.1, 1.0), (1.0, 0.9), (1.0, 6.0)])
def test_ageing_outside_its_range_is_refused(cap, res):
    with pytest.raises(ModelRangeError):
        bat.aged_cell(FRESH, capacity_retained=cap, resistance_growth=res)
