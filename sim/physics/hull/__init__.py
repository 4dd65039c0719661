"""Calm-water hull resistance and surge added mass for the time-domain engine.

Every resistance model is a frozen dataclass with the same small interface:

* ``resistance_n(speed_m_s, rho_kg_m3, nu_m2_s)`` – total calm-water resistance [N], vectorised
  over speed, odd in speed (``R(-V) = -R(V)``: the force always opposes the motion) and zero at
  ``V = 0``;
* ``breakdown(speed_m_s, rho_kg_m3, nu_m2_s)`` – the same force split into a
  :class:`ResistanceBreakdown`;
* ``wetted_area_m2`` – wetted surface [m²] (``None`` when a model does not know it).

Models
------
:class:`DisplacementHull`
    Holtrop & Mennen (1982) regression with the Holtrop (1984) revision as an option.
:class:`SubmergedBody`
    Deeply submerged streamlined body of revolution (no free-surface waves), Hoerner (1965).
:class:`TabulatedResistance`
    A measured resistance curve, shape-preserving (PCHIP) interpolation, ``V²`` extrapolation.
:class:`Appendage` and :class:`CompositeResistance`
    Appendage drag (thruster housing, strut) added to any model with :func:`with_appendages`.

The models are evaluated at every right-hand-side call of the ODE solver, so everything that does
not depend on speed, density or viscosity is computed once, when the object is built.

Modules
-------
``interface``
    :class:`ResistanceBreakdown`, the :class:`ResistanceModel` protocol, :func:`effective_power_w`.
``friction``
    Reynolds and Froude numbers, the ITTC-1957 line, the ITTC-1978 roughness allowance.
``holtrop_mennen``
    :func:`holtrop_mennen_coefficients` (pure) and :class:`DisplacementHull`.
``body_of_revolution``
    :class:`SubmergedBody` (Hoerner).
``tabulated``
    :class:`TabulatedResistance`.
``appendages``
    :class:`Appendage`, :class:`CompositeResistance`, :func:`with_appendages`.
``added_mass``
    Surge added mass (Lamb).

Low speed
---------
The ITTC-1957 line is singular at ``Re = 100``. The resistance models therefore evaluate it with
the Reynolds number clamped from below at :data:`REYNOLDS_NUMBER_FLOOR` (1e3). Below the floor the
friction coefficient is constant and every component goes to zero at least as fast as ``V²``, so
the force is continuous through ``V = 0``, where the engine starts and reverses. The public
function :func:`ittc1957_cf` does not clamp: it raises for ``Re ≤ 100``.

References
----------
.. [1] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid.
   (ITTC-1957 model-ship correlation line.)
.. [2] ITTC (1978). Report of the Performance Committee, Proceedings of the 15th International
   Towing Tank Conference, The Hague. (ITTC-1978 performance prediction method, roughness
   allowance.)
.. [3] Holtrop, J. & Mennen, G. G. J. (1982). An approximate power prediction method.
   International Shipbuilding Progress 29(335), 166–170. doi:10.3233/ISP-1982-2933501
.. [4] Holtrop, J. (1984). A statistical re-analysis of resistance and propulsion data.
   International Shipbuilding Progress 31(363), 272–276. doi:10.3233/ISP-1984-3136302
.. [5] Hoerner, S. F. (1965). Fluid-Dynamic Drag. Published by the author, Midland Park, NJ.
   Chapter 6 (streamlined bodies).
.. [6] Fritsch, F. N. & Carlson, R. E. (1980). Monotone piecewise cubic interpolation. SIAM Journal
   on Numerical Analysis 17(2), 238–246. doi:10.1137/0717021
.. [7] Lamb, H. (1932). Hydrodynamics, 6th ed. Cambridge University Press. §373.
"""

from sim.physics.hull.added_mass import (
    SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION,
    prolate_spheroid_surge_added_mass_coefficient,
    surge_added_mass_kg,
)
from sim.physics.hull.appendages import Appendage, CompositeResistance, with_appendages
from sim.physics.hull.body_of_revolution import SubmergedBody
from sim.physics.hull.friction import (
    ITTC_STANDARD_ROUGHNESS_M,
    REYNOLDS_NUMBER_FLOOR,
    STANDARD_GRAVITY_M_S2,
    froude_number,
    ittc1957_cf,
    reynolds_number,
    roughness_allowance_ittc1978,
)
from sim.physics.hull.holtrop_mennen import (
    HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS,
    HOLTROP_MENNEN_RANGES,
    DisplacementHull,
    HoltropMennenCoefficients,
    holtrop_mennen_coefficients,
)
from sim.physics.hull.interface import ResistanceBreakdown, ResistanceModel, effective_power_w
from sim.physics.hull.tabulated import TabulatedResistance

__all__ = [
    "HOLTROP_MENNEN_APPENDAGE_FORM_FACTORS",
    "HOLTROP_MENNEN_RANGES",
    "ITTC_STANDARD_ROUGHNESS_M",
    "REYNOLDS_NUMBER_FLOOR",
    "STANDARD_GRAVITY_M_S2",
    "SURFACE_SHIP_SURGE_ADDED_MASS_FRACTION",
    "Appendage",
    "CompositeResistance",
    "DisplacementHull",
    "HoltropMennenCoefficients",
    "ResistanceBreakdown",
    "ResistanceModel",
    "SubmergedBody",
    "TabulatedResistance",
    "effective_power_w",
    "froude_number",
    "holtrop_mennen_coefficients",
    "ittc1957_cf",
    "prolate_spheroid_surge_added_mass_coefficient",
    "reynolds_number",
    "roughness_allowance_ittc1978",
    "surge_added_mass_kg",
    "with_appendages",
]
