"""An aged cell: capacity fade and resistance growth applied to a fresh cell's parameters.

Ageing of lithium-ion cells is usually reported as two numbers at a point in life: the capacity
retained (state of health, SOH = Q_aged / Q_new) and the growth of the internal resistance
(R_aged / R_new). End of life for traction and storage packs is commonly taken at 70–80 %
capacity retained or 200 % resistance (common practice). This module does not predict ageing
from cycles or calendar time; it applies a given state of ageing so that a design can be
flown at its end of life, or with uncertain ageing in a study.

References
----------
Plett (2015), Battery Management Systems Vol. I, ch. 2 (capacity and resistance as the two
state-of-health figures); Birkl, Roberts, McTurk, Bruce & Howey (2017), "Degradation
diagnostics for lithium ion cells", J. Power Sources 341:373–386 (capacity fade and resistance
increase as the observable effects of the degradation modes).
"""

from __future__ import annotations

import dataclasses

from sim.physics.battery.parameters import CellParameters
from sim.physics.errors import ModelRangeError

__all__ = ["aged_cell"]


def aged_cell(
    cell: CellParameters, *, capacity_retained: float = 1.0, resistance_growth: float = 1.0
) -> CellParameters:
    """The cell after ageing: capacity × ``capacity_retained``, every resistance (R0 and the RC
    resistances) × ``resistance_growth``.

    Parameters
    ----------
    cell : CellParameters
        The fresh cell.
    capacity_retained : float
        Q_aged / Q_new [-], 0.3 ≤ x ≤ 1 (1: new).
    resistance_growth : float
        R_aged / R_new [-], 1 ≤ x ≤ 5 (1: new).

    Returns
    -------
    CellParameters
        The same cell when both are 1; otherwise a copy with the scaled capacity and
        resistances. The RC capacitances are scaled by 1/``resistance_growth`` so that the RC
        time constants R·C stay those of the fresh cell (a stated simplification: the
        diffusion time constants of aged cells are not generally known), and the open-circuit
        voltage curve against state of charge is kept (SOC is relative to the aged capacity).

    Notes
    -----
    Stored energy scales with the capacity; the current limits stay the rated ones.
    """
    if not 0.3 <= capacity_retained <= 1.0:
        raise ModelRangeError(
            "capacity retained", capacity_retained, "0.3 ≤ capacity retained ≤ 1", "aged_cell"
        )
    if not 1.0 <= resistance_growth <= 5.0:
        raise ModelRangeError(
            "resistance growth", resistance_growth, "1 ≤ resistance growth ≤ 5", "aged_cell"
        )
    if capacity_retained == 1.0 and resistance_growth == 1.0:
        return cell
    g = resistance_growth

    def scale(values, k):
        return None if values is None else tuple(float(v) * k for v in values)

    return dataclasses.replace(
        cell,
        name=f"{cell.name}, aged ({100 * capacity_retained:.0f} % capacity, ×{g:g} resistance)",
        capacity_ah=cell.capacity_ah * capacity_retained,
        r0_ohm=scale(cell.r0_ohm, g),
        r1_ohm=scale(cell.r1_ohm, g),
        c1_f=scale(cell.c1_f, 1.0 / g),
        r2_ohm=scale(cell.r2_ohm, g),
        c2_f=scale(cell.c2_f, 1.0 / g),
    )
