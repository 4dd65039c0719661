"""Equivalent-circuit battery pack model for the time-domain engine.

Each cell is a Thevenin circuit: an open-circuit voltage source OCV(SOC) in series with an ohmic
resistance R0(SOC, T) and one or two parallel RC pairs (R_k(SOC, T) ∥ C_k(SOC)). A pack is
``n_series`` strings of identical cells, each position holding ``n_parallel`` cells in parallel,
plus an optional lumped series resistance for busbars, fuses and contactors. Cell-to-cell spread
is not modelled: every cell carries the current ``I / n_parallel`` and sees the same SOC and
temperature.

Sign convention: the pack current ``current_a`` is positive on discharge and negative on charge;
the pack power ``power_w`` at the terminals is positive when the pack delivers power.

Model equations (pack level, ``E = OCV − Σ V_k``)::

    V_term     = OCV(SOC) − Σ V_k − I·R0(SOC, T)
    dSOC/dt    = −I / (3600·Q)                     (I > 0, discharge)
               = −η_c·I / (3600·Q)                 (I < 0, charge; η_c coulombic efficiency)
    dV_k/dt    = I/C_k − V_k/(R_k·C_k)
    Q_heat     = I²·R0 + Σ V_k²/R_k − I·T·∂OCV/∂T
    m·c_p·dT/dt = Q_heat − UA·(T − T_amb)

Resistances follow an Arrhenius law in absolute temperature about the table's reference
temperature, ``R(T) = R(T_ref)·exp(E_a/R_gas·(1/T − 1/T_ref))``; capacitances and the OCV table are
taken as temperature-independent (the entropic coefficient ∂OCV/∂T only enters the heat balance).

Series/parallel scaling from cell to pack: voltages and resistances ×n_s, resistances ÷n_p,
capacitances ×n_p/n_s (so every RC time constant is unchanged), capacity and currents ×n_p.

Speed: these functions sit inside the ODE right-hand side. All tables are converted at
construction into numpy arrays (array path, ``np.interp``) and Python lists (scalar path, one
bisection shared by every tabulated quantity). Scalar inputs take the scalar path and return
Python floats; arrays broadcast together and return arrays.

Modules: :mod:`.parameters` (CellParameters, ranges), :mod:`.cells` (one module per named
parameter set, registry :data:`CELL_SETS`), :mod:`.circuit` (Pack, OCV/R lookups, dSOC/dt and
dV_k/dt), :mod:`.solvers` (power and current solves, :func:`pack_power_limit_w`),
:mod:`.thermal` (heat generation, lumped temperature), :mod:`.peukert` (Peukert's law).

Valid ranges (checked; outside them :class:`~sim.physics.errors.ModelRangeError` is raised):
state of charge −0.05 ≤ SOC ≤ 1.05 (the tables are held flat beyond 0 and 1, so an integrator
overshooting an end-of-discharge event slightly does not fail), cell temperature
−40 ≤ T ≤ 80 °C.

References
----------
.. [1] Huria, T., Ceraolo, M., Gazzarri, J. & Jackey, R. (2012). High fidelity electrical model
   with thermal dependence for characterization and simulation of high power lithium battery
   cells. 2012 IEEE International Electric Vehicle Conference (IEVC), Greenville SC.
   doi:10.1109/IEVC.2012.6183271 (attribution and DOI from memory).
.. [2] Plett, G. L. (2015). Battery Management Systems, Volume I: Battery Modeling. Artech House,
   Boston. Chapter 2 (equivalent-circuit cell models).
.. [3] Bernardi, D., Pawlikowski, E. & Newman, J. (1985). A general energy balance for battery
   systems. Journal of The Electrochemical Society 132(1), 5–12. doi:10.1149/1.2113792
.. [4] Peukert, W. (1897). Über die Abhängigkeit der Kapazität von der Entladestromstärke bei
   Bleiakkumulatoren. Elektrotechnische Zeitschrift 18, 287–288.
.. [5] Arrhenius, S. (1889). Über die Reaktionsgeschwindigkeit bei der Inversion von Rohrzucker
   durch Säuren. Zeitschrift für physikalische Chemie 4, 226–248.
.. [6] Tiesinga, E., Mohr, P. J., Newell, D. B. & Taylor, B. N. (2021). CODATA recommended values
   of the fundamental physical constants: 2018. Reviews of Modern Physics 93, 025010 (molar gas
   constant).
"""

from sim.physics.battery.ageing import aged_cell
from sim.physics.battery.cells import (
    CELL_SETS,
    LFP_PRISMATIC_REPRESENTATIVE,
    LIPO_POUCH_CHEN2006,
    NMC_POUCH_HURIA2012,
)
from sim.physics.battery.circuit import (
    Pack,
    drc_dt,
    dsoc_dt,
    ocv_v,
    r0_ohm,
    rc_params,
    resistance_temperature_factor,
)
from sim.physics.battery.parameters import (
    DEFAULT_ACTIVATION_ENERGY_J_MOL,
    GAS_CONSTANT_J_MOL_K,
    KELVIN_OFFSET,
    SOC_RANGE,
    TEMPERATURE_RANGE_C,
    CellParameters,
)
from sim.physics.battery.peukert import peukert_runtime_h
from sim.physics.battery.solvers import (
    REASON_I_CHARGE,
    REASON_I_DISCHARGE,
    REASON_INFEASIBLE,
    REASON_NO_EMF,
    REASON_OK,
    REASON_V_MAX,
    REASON_V_MIN,
    PackOperatingPoint,
    max_power_at_min_voltage_w,
    pack_charge_limit_w,
    pack_power_limit_w,
    solve_current_for_power,
    solve_terminal_for_current,
)
from sim.physics.battery.thermal import (
    battery_temperature_rate_k_s,
    busbar_loss_w,
    heat_generation_w,
)

__all__ = [
    "CELL_SETS",
    "DEFAULT_ACTIVATION_ENERGY_J_MOL",
    "GAS_CONSTANT_J_MOL_K",
    "KELVIN_OFFSET",
    "LFP_PRISMATIC_REPRESENTATIVE",
    "LIPO_POUCH_CHEN2006",
    "NMC_POUCH_HURIA2012",
    "REASON_INFEASIBLE",
    "REASON_I_CHARGE",
    "REASON_I_DISCHARGE",
    "REASON_NO_EMF",
    "REASON_OK",
    "REASON_V_MAX",
    "REASON_V_MIN",
    "SOC_RANGE",
    "TEMPERATURE_RANGE_C",
    "CellParameters",
    "Pack",
    "PackOperatingPoint",
    "aged_cell",
    "battery_temperature_rate_k_s",
    "busbar_loss_w",
    "drc_dt",
    "dsoc_dt",
    "heat_generation_w",
    "max_power_at_min_voltage_w",
    "ocv_v",
    "pack_charge_limit_w",
    "pack_power_limit_w",
    "peukert_runtime_h",
    "r0_ohm",
    "rc_params",
    "resistance_temperature_factor",
    "solve_current_for_power",
    "solve_terminal_for_current",
]
