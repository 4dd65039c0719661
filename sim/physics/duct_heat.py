"""Where the heat of an MHD duct goes: the bulk outlet temperature rise by energy balance, and
which part of it enters the water at a wall.

Three dissipations heat the water passing through a duct thruster:

* Joule heat J²/σ, released in the bulk of the water between the electrodes;
* electrode overpotential heat η·|I|, released in the reaction layers at the electrode
  surfaces (the reversible part of the electrode drop goes into the chemical energy of the
  evolved gas and is not heat; the entropic term of the reactions is neglected);
* friction dissipation (inlet, wall friction, nozzle), released in the boundary layers at the
  channel walls and in the mixing behind the inlet.

Once mixed, all of it is carried away by the through-flow, so the bulk (mixed-mean) outlet
temperature rise follows from the steady-flow energy balance

    ΔT_bulk = (P_Joule + P_friction + P_electrode) / (ṁ·c_p).

References
----------
.. [1] Bejan, A. (2013). Convection Heat Transfer, 4th ed. Wiley, ch. 3 (mixed-mean temperature
   and the steady-flow energy balance of a duct).
.. [2] Bard, A. J. & Faulkner, L. R. (2001). Electrochemical Methods, 2nd ed. Wiley, ch. 3
   (overpotential as irreversible loss at the electrode surface).
"""

from __future__ import annotations

from dataclasses import dataclass

from sim.physics.errors import ModelRangeError

__all__ = ["U_FLOOR_M_S", "DuctHeat", "duct_heat", "duct_heat_terms"]

U_FLOOR_M_S = 1e-3
"""Velocity floor [m/s] of the mass flow in the temperature rise (the zero-flow rise is
unbounded), the same as :data:`sim.physics.thruster.U_FLOOR_M_S`."""

_MODEL = "duct heat balance"


@dataclass(frozen=True)
class DuctHeat:
    """Heat released in one duct thruster and the bulk outlet temperature rise.

    Attributes
    ----------
    joule_w : Joule heat in the bulk of the water [W]
    friction_w : friction dissipation at the walls, inlet and nozzle [W]
    electrode_w : overpotential heat at the electrode surfaces [W]
    wall_w : heat released at a wall, electrode_w + friction_w [W]
    total_w : joule_w + friction_w + electrode_w [W]
    rise_k : bulk outlet temperature rise (mixed mean) [K]
    joule_rise_k : the part of rise_k due to Joule heat alone [K]
    """

    joule_w: float
    friction_w: float
    electrode_w: float
    wall_w: float
    total_w: float
    rise_k: float
    joule_rise_k: float


def duct_heat(
    joule_w: float,
    friction_w: float,
    overpotential_v: float,
    current_a: float,
    duct_velocity_m_s: float,
    flow_area_m2: float,
    rho_kg_m3: float,
    cp_j_kg_k: float,
) -> DuctHeat:
    """Heat released in a duct thruster and its bulk outlet temperature rise.

    Parameters
    ----------
    joule_w : float
        Joule heat of the water in the active volume, J²/σ·volume (+ end fringing) [W], ≥ 0.
    friction_w : float
        Inlet, wall-friction and nozzle losses [W], ≥ 0.
    overpotential_v : float
        Sum of the anodic and cathodic overpotentials [V], ≥ 0.
    current_a : float
        Current through the water (either sign) [A].
    duct_velocity_m_s : float
        Mean water velocity in the channels (either sign) [m/s].
    flow_area_m2 : float
        Flow cross-section of all channels [m²], > 0.
    rho_kg_m3, cp_j_kg_k : float
        Density [kg/m³] and specific heat [J/(kg·K)] of the water, > 0.

    Returns
    -------
    DuctHeat

    Notes
    -----
    P_electrode = η·|I|; ṁ = ρ·A·max(|u|, u_floor); ΔT = (P_J + P_f + P_e)/(ṁ c_p). With only
    Joule heat this is the classic ΔT = J²L/(σρc_p u) (the volume A·L cancels).

    References
    ----------
    Bejan (2013), Convection Heat Transfer, ch. 3 (steady-flow energy balance); Bard & Faulkner
    (2001), Electrochemical Methods, ch. 3 (overpotential).
    """
    electrode, total, rise, joule_rise = duct_heat_terms(
        joule_w,
        friction_w,
        overpotential_v,
        current_a,
        duct_velocity_m_s,
        flow_area_m2,
        rho_kg_m3,
        cp_j_kg_k,
    )
    return DuctHeat(
        joule_w=joule_w,
        friction_w=friction_w,
        electrode_w=electrode,
        wall_w=electrode + friction_w,
        total_w=total,
        rise_k=rise,
        joule_rise_k=joule_rise,
    )


def duct_heat_terms(
    joule_w: float,
    friction_w: float,
    overpotential_v: float,
    current_a: float,
    duct_velocity_m_s: float,
    flow_area_m2: float,
    rho_kg_m3: float,
    cp_j_kg_k: float,
) -> tuple[float, float, float, float]:
    """The terms of :func:`duct_heat` as plain floats (the fast path of ODE right-hand sides,
    which need no :class:`DuctHeat` object: building one costs more than the arithmetic).

    Parameters
    ----------
    joule_w, friction_w, overpotential_v, current_a, duct_velocity_m_s, flow_area_m2, rho_kg_m3,
    cp_j_kg_k : float
        As in :func:`duct_heat` [W, W, V, A, m/s, m², kg/m³, J/(kg·K)].

    Returns
    -------
    tuple of float
        (electrode heat [W], total heat [W], bulk outlet temperature rise [K], the part of the
        rise due to Joule heat alone [K]).

    Notes
    -----
    See :func:`duct_heat`.

    References
    ----------
    Bejan (2013), Convection Heat Transfer, ch. 3 (steady-flow energy balance); Bard & Faulkner
    (2001), Electrochemical Methods, ch. 3 (overpotential).
    """
    if not (
        joule_w >= 0.0
        and friction_w >= 0.0
        and overpotential_v >= 0.0
        and flow_area_m2 > 0.0
        and rho_kg_m3 > 0.0
        and cp_j_kg_k > 0.0
    ):  # one test on the way of every right-hand side; the loops below name the bad input
        for name, v in (
            ("joule_w", joule_w),
            ("friction_w", friction_w),
            ("overpotential_v", overpotential_v),
        ):
            if not v >= 0.0:
                raise ModelRangeError(name, v, "≥ 0", _MODEL)
        for name, v in (
            ("flow_area_m2", flow_area_m2),
            ("rho_kg_m3", rho_kg_m3),
            ("cp", cp_j_kg_k),
        ):
            if not v > 0.0:
                raise ModelRangeError(name, v, "> 0", _MODEL)
    electrode = overpotential_v * abs(current_a)
    total = joule_w + friction_w + electrode
    mcp = rho_kg_m3 * flow_area_m2 * max(abs(duct_velocity_m_s), U_FLOOR_M_S) * cp_j_kg_k
    return electrode, total, total / mcp, joule_w / mcp
