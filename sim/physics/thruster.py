r"""Seawater DC-conduction MHD duct thruster: steady operating point from voltage or current.

Geometry and sign convention
----------------------------
Each of ``n_channels`` identical straight rectangular channels has its electrodes on the two
walls a distance ``gap_m`` apart (the electric field E runs across this gap, the channel
width), the magnet poles on the other two walls (the field B runs along ``height_m``), and an
active length ``length_m`` over which both electrodes and field act. x points from the bow
inlet to the stern exit. With B > 0 a positive voltage V drives a current density J > 0 whose
Lorentz body force J×B pushes the water astern (+x): the vessel is pushed ahead, thrust T > 0.
u > 0 is water flowing bow inlet → stern exit; V0 > 0 is the vessel moving ahead.

Assumptions (all common practice for seawater MHD): the magnetic Reynolds number μ0σuL ≪ 1
(1e-5 to 1e-4 for metre-scale ducts), so the flow does not change B; B, E and J are uniform
over the active volume (no Hall effect, since the Hall parameter of seawater is ≪ 1); current
fringing beyond the ends of the active length is left out unless ``end_effects`` is set (see
"End effects" below); fully developed duct friction over the whole length; incompressible flow;
electrolysis gas does not change σ unless ``gas_model`` is set (see "Electrolysis gas").

Electrical side (Way 1968)
--------------------------
Ohm's law in the moving water: J = σ(E − uB). The electrode reactions need a decomposition
voltage plus overpotentials, lumped as V_d ≥ 0, which opposes the current whichever way it
flows. A dissimilar electrode pair adds its galvanic offset V_g (rest potential of the
electrode that is positive at V > 0 minus that of the other), a fixed EMF whose sign does not
follow the current. The voltage across the water of one channel is then V − V_g − sign(J)·V_d,
so

    E = (V − V_g − sign(J) V_d)/gap,     J = σ (E − uB),

and no current flows while the net driving voltage stays inside the dead band,
|V − V_g − uB·gap| ≤ V_d. (At u = 0 and V_g = 0 this is the familiar |V| ≤ V_d: no current
below decomposition. The dead band is placed on V − uB·gap rather than on V alone, so that
shorted electrodes in a ram flow do not draw a generator current below V_d, and so that voltage
control and current control are exact inverses.) With V_g > 0 a voltage +V drives less current
than −V does: the band is centred on V_g. Current I = N·J·h·L; Lorentz pressure rise over the
active length Δp_L = J·B·L. Load factor K = E/(uB); Lorentz efficiency η_L = uB/E = 1/K, the
fraction of the power E·J delivered to the water that becomes flow work (Way uses n = uB/E).
All efficiencies are defined once in `ThrusterOperatingPoint` and in docs/efficiencies.md.

With c = σB²L [Pa·s/m] and P = σBLE [Pa]: Δp_L = P − c·u.

Hydraulic side, ducted jet (``jet_model="ducted"``)
---------------------------------------------------
For intakes and exits flush with the hull, the jet leaving at ambient pressure. Energy along
the captured streamtube in the vessel frame (free stream V0, dynamic head q = ½ρV0², full ram
recovery less the inlet loss):

    q + Δp_L = ½ρ u_j² + ½ρ k_l u²,     u_j = u/r,  r = A_exit/A_duct,
    k_l = K_in + f(Re)·L/D_h + K_nozzle/r²,   k = 1/r² + k_l,

so ½ρk u² + c u − (P + q) = 0 and, in the cancellation-free form,

    u = 2(P + q) / (c + √(c² + 2ρk(P + q)))          for P + q > 0

(c → 0 and B = 0 give the ram-driven through-flow u = V0/√k). Thrust is the momentum flux
balance of waterjet practice, T = ṁ(u_j − V0), ṁ = ρ N A u.

Reverse through-flow, P + q < 0: the Lorentz push drives water forward, out through the bow
opening, drawing it in at the stern opening with no ram recovery (the captured stream arrives
moving aft and must be turned), jet area = duct area. At zero flow the bow opening sees the
stagnation pressure p_amb + q (the premise of the forward case), and an outflow must overcome
it, so with w = −u > 0 and k_rev = 1 + K_in + f L/D_h + K_nozzle:

    −(P + q) = ½ρ k_rev w² + c w,   w = 2(−P − q)/(c + √(c² + 2ρ k_rev (−P − q))),
    T = −ṁ_abs (w + V0)   (the captured free stream is reversed).

The two branches meet continuously at P = −q, where the Lorentz push exactly holds back the ram
pressure and u = 0, T = 0 (a continuous thrust curve matters for ODE integrators). This is a
deliberate choice over an "exit at static pressure" reverse branch, which would leave the flow
direction ambiguous for −q < P < 0 and make thrust jump.

Thrust T = ρAu(u/r − V0) is not monotonic in the command while braking at speed: it is most
negative at u = rV0/2 and returns to zero as the braked through-flow (and with it the ram drag
ṁV0) vanishes at u = 0, before the reverse branch takes over.

Hydraulic side, actuator disk (``jet_model="disk"``)
----------------------------------------------------
For a short open duct in the free stream, the jet keeps accelerating behind the duct
(Rankine–Froude momentum theory): u = (V0 + u_j)/2, the total-pressure rise
Δp_L − ½ρk_l u² = ½ρ(u_j² − V0²) and T = [½ρ(u_j² − V0²)]·A_total = ṁ(u_j − V0). Eliminating
u_j = 2u − V0:

    ½ρ(4 + k_l) u² + (c − 2ρV0) u − P = 0,

with the root u ≥ V0/2 (u_j ≥ 0). When momentum theory has no such root (strong braking,
P below the value giving u_j = 0, the windmill-brake state where it fails), the ducted relations
above are used instead; duct velocity and thrust jump there, and in a narrow band of commands
around the switch voltage control and current control can land on different branches (the
round trip V → I → V is exact only away from it). Use "ducted" for crash stops in time-domain
runs.

An open duct in the free stream has no nozzle: the jet contracts freely behind it. The disk
model therefore ignores ``nozzle_area_ratio`` altogether, for the jet (u_j = 2u − V0) and for
the nozzle loss (K_nozzle on the duct dynamic head, r = 1), including in the ducted fallback.
(Until 0.1 the loss was scaled by 1/r² while the jet ignored r.)

Friction iteration
------------------
f depends on u through Re = ρ|u|D_h/μ. Each step linearises f around the previous velocity,
f ≈ f_n[(1 + m) + (−m)Re_n/Re] with m = d ln f/d ln Re, which keeps the closed forms above (the
(1 + m) part joins k, the rest adds ½ρ(L/D_h)(−m)f_n|u_n| to c). It is exact in laminar flow
and Newton-like otherwise; the fixed point is iterated to 1e-10 relative on u (at most 30 steps,
ModelRangeError otherwise — never a silent result).

Vessel going astern (V0 < 0)
----------------------------
The mirror problem is solved (signs of V0, V or I, u, T flipped): the stern opening becomes the
ram intake. Nozzle asymmetry (r, K_nozzle on the original exit) is ignored then.

Current control
---------------
Given I, J = I/(N h L) and Δp_L = JBL are known, so u follows from the same equations with
c = 0, P = Δp_L; then E = J/σ + uB and V = E·gap + sign(J)·V_d (V = uB·gap at I = 0).

Joule heating
-------------
The water warms through the active length by ΔT = J²L/(σρc_p u) (Joule power per volume J²/σ
over the residence time L/u). As u → 0 this is evaluated with u_floor = 1e-3 m/s, a documented
finite bound (the true zero-flow rise is unbounded). With ``thermal_feedback`` the conductivity
is taken at the mean duct temperature, σ = σ_in + (dσ/dT)·ΔT/2, solved jointly with J and u:
in voltage mode σ = σ_in/(1 − G), G = (dσ/dT)(E − uB)²L/(2ρc_p u) (inside the iteration); in
current mode σ² − σ_in σ − (dσ/dT)J²L/(2ρc_p u) = 0. The linear σ(T) is not extrapolated past
boiling: the rise used for σ is capped at 100 °C − T_in, and ``boiling_risk`` flags
T_in + ΔT ≥ 100 °C (1 atm boiling point; conservative at depth).

Electrolysis gas (``gas_model`` "bruggeman" or "maxwell")
--------------------------------------------------------
The gas of the current (Faraday's law, at the duct's absolute pressure p_atm + sea pressure and
the inlet temperature) accumulates linearly along the channel; its length-mean conductivity
ratio ⟨f⟩(a), a = Q_gas/Q_water, is given in `sim.physics.gas` (slip ratio
``gas_slip_ratio``, default 1: homogeneous). The mixture conductivity σ_m = σ_w·⟨f⟩ enters J,
the current and the Joule heat (J²/σ_m). In voltage mode it is solved jointly with u and the
Joule feedback: σ_m = σ_w(σ_m)·⟨f⟩(κσ_m), κ = v_C|E − uB|L/(gap·u_e), by bisection on
[0, σ_cap] inside each fixed-point step (v_C gas volume per coulomb, u_e = max(|u|, u_floor));
in current mode J is known and σ_m = ½(⟨f⟩σ_in + √(⟨f⟩²σ_in² + 4⟨f⟩k₂)),
k₂ = (dσ/dT)J²L/(2ρc_p u_e), capped at ⟨f⟩σ_cap. The void fractions are reported in any case.
With gas the delivered Lorentz pressure may rise with u at low flow (more flow, less gas); the
bisection fallback then finds one of the roots.

End effects (``end_effects``)
-----------------------------
The current that fringes beyond the ends of the active length adds a leakage current
I_end = N·σ·h·Λ·(E·gap), Λ(L/gap) → 2 ln 2/π (`sim.physics.end_effects`), which gives no
thrust: the Lorentz force on the fringed current distribution equals the uniform value exactly
when electrodes and field cover the same length. I = I_core + I_end; its Joule heat V_w·I_end is
counted in the Joule loss. In current mode the total current fixes J through
I/(Nh) = (L + Λ·gap)J + Λ·gap·σuB, solved by bisection on u. The end-loop current that
circulates at zero electrode current (inside the dead band) is neglected.

Energy identity
---------------
With V = E·gap + V_g + sign(I)V_d and E·J = J²/σ + uBJ:

    V·I = (V_d|I| + V_g·I) + (J²/σ)·Vol + V_w·I_end + Δp_L·Q,   Vol = N A L, Q = N A u,

i.e. electrical power = electrode loss (negative galvanic part when the pair aids the current)
+ Joule loss (core plus end fringing) + flow work. Multiplying the ducted energy
equation by Q: flow work = ½ṁ(u_j² − V0²) + Δp_loss·Q, and ½ṁ(u_j² − V0²) =
ṁ(u_j − V0)V0 + ½ṁ(u_j − V0)², so

    flow work = T·V0 + wake loss + friction (inlet, wall and nozzle losses),

with wake loss = ½ṁ(u_j − V0)² (the kinetic energy left in the water in the earth frame) for
forward ducted and disk flow. In reverse flow the same bookkeeping (wake = flow work − T·V0 −
friction) gives ½ṁ(w + V0)² + ṁV0²: the earth-frame kinetic energy of the forward jet plus the
loss of reversing the captured stream (its ram head is destroyed at the stern intake and the jet
is pushed out against the stagnation pressure at the bow). The efficiency chain is
η_overall = η_electrical·η_hydraulic with η_electrical = flow work/(V·I)
(= (1 − V_d/V)·η_L without galvanic offset and end effects) and
η_hydraulic = T·V0/flow work = η_duct·η_froude, η_duct = (flow work − friction)/flow work,
η_froude = T·V0/(T·V0 + wake) = 2V0/(V0 + u_j).

References
----------
Way, S. (1968). Electromagnetic propulsion for cargo submarines. Journal of Hydronautics 2(2).
doi:10.2514/3.62773.

Rankine, W. J. M. (1865). On the mechanical principles of the action of propellers.
Transactions of the Institution of Naval Architects 6, 13–39. Froude, R. E. (1889). On the part
played in propulsion by differences of fluid pressure. Trans. INA 30, 390–405.

Crane Co. (2009). Flow of Fluids Through Valves, Fittings and Pipe, Technical Paper 410
(sharp inlet K = 0.5); Idelchik, I. E. (1986). Handbook of Hydraulic Resistance, 2nd ed.,
Hemisphere.

Mitchell, D. L., & Gubser, D. U. (1988). Magnetohydrodynamic ship propulsion with
superconducting magnets. Journal of Superconductivity 1(4), 349–364. doi:10.1007/BF00618593.

Electrolysis gas: Bruggeman (1935), Maxwell (1873); end fringing: conformal mapping of the
channel (coplanar strips); see `sim.physics.gas` and `sim.physics.end_effects`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from sim.physics.duct import (
    REL_ROUGHNESS_MAX,
    friction_terms,
    friction_terms_scalar,
)
from sim.physics.electrochem import FARADAY_C_MOL, gas_rates_mol_s
from sim.physics.end_effects import end_leakage_factor
from sim.physics.errors import ModelRangeError
from sim.physics.gas import (
    ATM_PA,
    GAS_MODELS,
    gas_volume_per_coulomb_m3_c,
    mean_conductivity_ratio,
    mean_conductivity_ratio_scalar,
    mean_void_fraction,
    outlet_void_fraction,
)
from sim.physics.seawater import WaterState

U_FLOOR_M_S = 1e-3
"""Velocity floor [m/s] used only in the Joule temperature rise ΔT = J²L/(σρc_p u)."""

BOILING_C = 100.0
"""Boiling point used for the boiling-risk flag and the conductivity cap [°C] (1 atm)."""

REL_TOL = 1e-10
"""Relative convergence tolerance on the duct velocity [-]."""

ABS_TOL_M_S = 1e-13
"""Absolute convergence floor on the duct velocity [m/s]."""

FP_ITER = 12
"""Closed-form fixed-point steps before a point is handed to the bisection fallback."""

RESID_TOL = 1e-9
"""Relative tolerance of the energy-equation residual accepted from the fixed point."""

MAX_BISECT = 200
"""Iteration cap of the bisection fallback (ModelRangeError beyond it)."""

_MODEL = "MHD duct thruster"


@dataclass(frozen=True)
class DuctThruster:
    """Geometry, field and loss data of an MHD duct thruster (all SI).

    Attributes
    ----------
    gap_m : electrode spacing, along E (the channel width) [m]
    height_m : pole height, along B [m]
    length_m : active length, over which electrodes and field act [m]
    n_channels : number of identical parallel channels (electrically in parallel) [-]
    b_tesla : mean magnetic flux density in the gap, ≥ 0 [T]
    roughness_m : equivalent sand roughness of the walls [m] (0 = hydraulically smooth)
    k_inlet : inlet loss coefficient on the duct dynamic head [-]; default 0.5, sharp-edged
        inlet (Crane TP-410; Idelchik 1986; fluids ``entrance_sharp(method="Crane")``)
    k_nozzle : nozzle loss coefficient on the jet dynamic head [-]; default 0.02 (from memory,
        a smooth contraction)
    nozzle_area_ratio : r = A_exit/A_duct, 0 < r ≤ 1.5 (r < 1 contracts) [-]; default 1. Used
        by the "ducted" jet model only: the "disk" model has no nozzle (the jet contracts
        freely behind the duct), so it ignores r both for the jet and for the nozzle loss
    jet_model : "ducted" (intake and exit flush with the hull, jet at ambient pressure) or
        "disk" (short open duct in the free stream, Rankine–Froude actuator disk)
    electrode_drop_v : decomposition voltage + overpotentials [V], ≥ 0, taken whichever way the
        current flows; default 2.0 (reversible Cl₂/H₂ cell ≈1.85 V at pH 8.1 from standard
        potentials, plus a few hundred mV overpotential, from memory). Not the galvanic offset
    chlorine_fraction : fraction of anodic charge evolving Cl₂ (rest O₂) [-]; default 1.0
    wall_friction : include Darcy wall friction (False gives the frictionless limit); default True
    galvanic_offset_v : E_rest(electrode positive at V > 0) − E_rest(other electrode) [V] of a
        dissimilar pair (`sim.physics.electrochem.galvanic_offset_v`); a fixed EMF that opposes
        a positive voltage and aids a negative one. Default 0 (identical electrodes)
    gas_model : conductivity reduction by electrolysis gas, "none" (default, σ unchanged),
        "bruggeman" or "maxwell" (`sim.physics.gas`), solved jointly with the current
    gas_slip_ratio : gas/water velocity ratio S of the bubbles along the duct [-]; default 1
        (homogeneous flow)
    end_effects : add the fringing current at the two ends of the active length
        (`sim.physics.end_effects`), which draws current but gives no thrust; default False
    """

    gap_m: float
    height_m: float
    length_m: float
    n_channels: int
    b_tesla: float
    roughness_m: float
    k_inlet: float = 0.5
    k_nozzle: float = 0.02
    nozzle_area_ratio: float = 1.0
    jet_model: str = "ducted"
    electrode_drop_v: float = 2.0
    chlorine_fraction: float = 1.0
    wall_friction: bool = True
    galvanic_offset_v: float = 0.0
    gas_model: str = "none"
    gas_slip_ratio: float = 1.0
    end_effects: bool = False

    def __post_init__(self) -> None:
        for name in ("gap_m", "height_m", "length_m"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v > 0.0):
                raise ModelRangeError(name, v, "finite and > 0 m", _MODEL)
        if not (isinstance(self.n_channels, int | np.integer) and self.n_channels >= 1):
            raise ModelRangeError("n_channels", self.n_channels, "integer ≥ 1", _MODEL)
        if not (math.isfinite(self.b_tesla) and self.b_tesla >= 0.0):
            raise ModelRangeError("b_tesla", self.b_tesla, "finite and ≥ 0 T", _MODEL)
        if not (math.isfinite(self.roughness_m) and self.roughness_m >= 0.0):
            raise ModelRangeError("roughness_m", self.roughness_m, "≥ 0 m", _MODEL)
        if self.roughness_m / self.hydraulic_diameter_m > REL_ROUGHNESS_MAX:
            raise ModelRangeError(
                "roughness_m / D_h",
                self.roughness_m / self.hydraulic_diameter_m,
                f"≤ {REL_ROUGHNESS_MAX}",
                _MODEL,
            )
        for name in ("k_inlet", "k_nozzle", "electrode_drop_v"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v >= 0.0):
                raise ModelRangeError(name, v, "finite and ≥ 0", _MODEL)
        if not (0.0 < self.nozzle_area_ratio <= 1.5):
            raise ModelRangeError(
                "nozzle_area_ratio", self.nozzle_area_ratio, "0 < r ≤ 1.5", _MODEL
            )
        if self.jet_model not in ("ducted", "disk"):
            raise ModelRangeError("jet_model", self.jet_model, '"ducted" or "disk"', _MODEL)
        if not (0.0 <= self.chlorine_fraction <= 1.0):
            raise ModelRangeError("chlorine_fraction", self.chlorine_fraction, "[0, 1]", _MODEL)
        if not math.isfinite(self.galvanic_offset_v):
            raise ModelRangeError("galvanic_offset_v", self.galvanic_offset_v, "finite", _MODEL)
        if self.gas_model not in GAS_MODELS:
            allowed = " or ".join(f'"{m}"' for m in GAS_MODELS)
            raise ModelRangeError("gas_model", self.gas_model, allowed, _MODEL)
        if not (math.isfinite(self.gas_slip_ratio) and self.gas_slip_ratio > 0.0):
            raise ModelRangeError("gas_slip_ratio", self.gas_slip_ratio, "finite and > 0", _MODEL)

    @property
    def area_per_channel_m2(self) -> float:
        """Flow cross-section of one channel, gap × height [m²]."""
        return self.gap_m * self.height_m

    @property
    def total_area_m2(self) -> float:
        """Flow cross-section of all channels [m²]."""
        return self.n_channels * self.gap_m * self.height_m

    @property
    def hydraulic_diameter_m(self) -> float:
        """Hydraulic diameter of one channel, 4A/P = 2wh/(w + h) [m]."""
        return 2.0 * self.gap_m * self.height_m / (self.gap_m + self.height_m)

    @property
    def aspect_ratio(self) -> float:
        """Short side / long side of a channel [-]."""
        return min(self.gap_m, self.height_m) / max(self.gap_m, self.height_m)

    @property
    def rel_roughness(self) -> float:
        """Relative roughness ε/D_h [-]."""
        return self.roughness_m / self.hydraulic_diameter_m

    @property
    def electrode_area_per_channel_m2(self) -> float:
        """Area of one electrode, height × length [m²]."""
        return self.height_m * self.length_m

    @property
    def wetted_area_per_channel_m2(self) -> float:
        """Wall area of one channel over the active length, perimeter × length [m²]."""
        return 2.0 * (self.gap_m + self.height_m) * self.length_m

    @property
    def fluid_volume_m3(self) -> float:
        """Water volume in the active region of all channels [m³]."""
        return self.total_area_m2 * self.length_m

    def electrolyte_resistance_ohm(self, sigma_s_m: float) -> float:
        """Resistance of the water between the electrodes of one channel, gap/(σ h L) [Ω].

        Parameters
        ----------
        sigma_s_m : float
            Conductivity [S/m].

        Returns
        -------
        float
            R [Ω].

        Notes
        -----
        R = gap/(σ·h·L) for a uniform field between plane electrodes.

        References
        ----------
        Ohm's law for a uniform conductor.
        """
        return self.gap_m / (sigma_s_m * self.height_m * self.length_m)


@dataclass(frozen=True)
class ThrusterOperatingPoint:
    """Steady operating point of a duct thruster (numpy arrays broadcast over the inputs).

    Signs follow the module convention (x from bow inlet to stern exit, thrust > 0 ahead).

    Attributes
    ----------
    duct_velocity_m_s : mean water velocity in the channels [m/s]
    jet_velocity_m_s : jet velocity relative to the vessel [m/s] (far-wake value for "disk")
    mass_flow_kg_s : mass flow through all channels, signed [kg/s]
    volume_flow_m3_s : volume flow through all channels, signed [m³/s]
    thrust_n : net thrust on the vessel [N]
    current_a : total current [A]
    voltage_v : electrode voltage [V]
    electric_field_v_m : electric field in the water [V/m]
    current_density_a_m2 : current density [A/m²]
    electrical_power_w : V·I [W]
    joule_loss_w : (J²/σ)·volume [W]
    electrode_loss_w : V_d·|I| [W]
    friction_loss_w : inlet, wall-friction and nozzle losses [W]
    wake_loss_w : flow work − T·V0 − friction [W]
    flow_work_w : Δp_L·Q [W]
    useful_power_w : T·V0 [W]
    load_factor : K = E/(uB) [-] (0 where uB = 0) (Way 1968)
    eta_lorentz : η_L = uB/E = 1/K [-] (0 where E = 0): the share of the power E·J delivered to
        the water of the active volume that becomes flow work (Way's n)
    eta_electrical : η_el = flow work/(V·I) [-] (0 unless both > 0): electrical input to flow
        work, after electrode, galvanic, Joule and end-fringing losses
    eta_duct : η_d = (flow work − duct losses)/flow work [-] (0 where flow work ≤ 0; negative
        when the ram pressure does part of the work); duct losses = inlet, wall and nozzle
    eta_froude : η_F = T·V0/(flow work − duct losses) [-] (0 unless both > 0); equals the Froude
        efficiency 2V0/(V0 + u_j) in forward ducted and actuator-disk flow
    eta_hydraulic : η_h = T·V0/flow work = η_d·η_F [-] (0 unless both > 0)
    eta_overall : η_o = T·V0/(V·I) = η_el·η_h [-] (0 unless both > 0)
    outlet_temperature_rise_k : Joule temperature rise through the duct [K]
    sigma_mean_s_m : conductivity of the active volume at the mean duct temperature, lowered by
        gas when ``gas_model`` is set [S/m]
    reynolds_number : ρ|u|D_h/μ [-]
    h2_mol_s, cl2_mol_s, o2_mol_s : gas evolution rates of the total current [mol/s]
    boiling_risk : T_in + ΔT ≥ 100 °C [bool]
    end_current_a : fringing current at the channel ends, included in ``current_a`` [A] (0
        unless ``end_effects``)
    gas_void_fraction_mean : length-mean void fraction of the electrolysis gas [-] (reported
        whatever ``gas_model``; homogeneous unless a slip ratio is set)
    gas_void_fraction_outlet : void fraction at the outlet of the active length [-]
    gas_conductivity_ratio : length-mean σ_mixture/σ_water [-] (1 when ``gas_model`` = "none")

    Old names kept as read-only aliases (to be removed once callers have moved):
    ``electrical_efficiency`` = ``eta_lorentz`` (uB/E, not flow work/V·I),
    ``hydraulic_efficiency`` = ``eta_duct`` (not ``eta_hydraulic``),
    ``propulsive_efficiency`` = ``eta_froude``, ``overall_efficiency`` = ``eta_overall``.
    See docs/efficiencies.md.
    """

    duct_velocity_m_s: np.ndarray
    jet_velocity_m_s: np.ndarray
    mass_flow_kg_s: np.ndarray
    volume_flow_m3_s: np.ndarray
    thrust_n: np.ndarray
    current_a: np.ndarray
    voltage_v: np.ndarray
    electric_field_v_m: np.ndarray
    current_density_a_m2: np.ndarray
    electrical_power_w: np.ndarray
    joule_loss_w: np.ndarray
    electrode_loss_w: np.ndarray
    friction_loss_w: np.ndarray
    wake_loss_w: np.ndarray
    flow_work_w: np.ndarray
    useful_power_w: np.ndarray
    load_factor: np.ndarray
    eta_lorentz: np.ndarray
    eta_electrical: np.ndarray
    eta_duct: np.ndarray
    eta_froude: np.ndarray
    eta_hydraulic: np.ndarray
    eta_overall: np.ndarray
    outlet_temperature_rise_k: np.ndarray
    sigma_mean_s_m: np.ndarray
    reynolds_number: np.ndarray
    h2_mol_s: np.ndarray
    cl2_mol_s: np.ndarray
    o2_mol_s: np.ndarray
    boiling_risk: np.ndarray
    end_current_a: np.ndarray
    gas_void_fraction_mean: np.ndarray
    gas_void_fraction_outlet: np.ndarray
    gas_conductivity_ratio: np.ndarray

    @property
    def electrical_efficiency(self) -> np.ndarray:
        """Old name of `eta_lorentz` (uB/E) [-]; kept as an alias."""
        return self.eta_lorentz

    @property
    def hydraulic_efficiency(self) -> np.ndarray:
        """Old name of `eta_duct` ((flow work − duct losses)/flow work) [-]; kept as an alias."""
        return self.eta_duct

    @property
    def propulsive_efficiency(self) -> np.ndarray:
        """Old name of `eta_froude` [-]; kept as an alias."""
        return self.eta_froude

    @property
    def overall_efficiency(self) -> np.ndarray:
        """Old name of `eta_overall` (T·V0/(V·I)) [-]; kept as an alias."""
        return self.eta_overall


# --------------------------------------------------------------------------------------------
# helpers
# --------------------------------------------------------------------------------------------


def _safe_div(num, den):
    num, den = np.broadcast_arrays(np.asarray(num, dtype=float), np.asarray(den, dtype=float))
    return np.divide(num, den, out=np.zeros(num.shape), where=den != 0.0)


def _check_water(water: WaterState) -> None:
    checks = (
        ("sigma_s_m", water.sigma_s_m, water.sigma_s_m > 0.0, "> 0 S/m"),
        ("rho_kg_m3", water.rho_kg_m3, water.rho_kg_m3 > 0.0, "> 0 kg/m³"),
        ("cp_j_kg_k", water.cp_j_kg_k, water.cp_j_kg_k > 0.0, "> 0 J/(kg·K)"),
        ("mu_pa_s", water.mu_pa_s, water.mu_pa_s > 0.0, "> 0 Pa·s"),
        ("dsigma_dt_s_m_k", water.dsigma_dt_s_m_k, water.dsigma_dt_s_m_k >= 0.0, "≥ 0 S/(m·K)"),
        ("t_c", water.t_c, water.t_c < BOILING_C, f"< {BOILING_C} °C"),
    )
    for name, value, ok, allowed in checks:
        if not (ok and math.isfinite(value)):
            raise ModelRangeError(f"water.{name}", value, allowed, _MODEL)


class _Consts:
    """Per-call constants of thruster and water (avoids recomputing properties)."""

    __slots__ = (
        "alpha",
        "area",
        "b",
        "beta",
        "cf0",
        "cp",
        "d_h",
        "dh2",
        "disk",
        "dt_cap",
        "eps",
        "f_cl",
        "fre_last",
        "g_cap",
        "gap",
        "gas",
        "h",
        "half_rho",
        "inv_r2",
        "k_in",
        "k_in1",
        "k_noz",
        "k_noz_r2",
        "l_dh",
        "lam",
        "length",
        "memo",
        "mu",
        "n",
        "r",
        "r2",
        "rho",
        "sig_cap",
        "sig_in",
        "slip",
        "two_rho",
        "two_rho_cp",
        "vd",
        "vg",
        "vpc",
        "wall",
    )

    def __init__(self, th: DuctThruster, w: WaterState) -> None:
        self.gap = th.gap_m
        self.h = th.height_m
        self.length = th.length_m
        self.n = th.n_channels
        self.area = th.area_per_channel_m2
        self.d_h = th.hydraulic_diameter_m
        self.alpha = th.aspect_ratio
        self.eps = th.rel_roughness
        self.b = th.b_tesla
        self.k_in = th.k_inlet
        self.k_noz = th.k_nozzle
        self.disk = th.jet_model == "disk"
        # the actuator disk has no nozzle: r is ignored for its jet and its nozzle loss alike
        self.r = 1.0 if self.disk else th.nozzle_area_ratio
        self.vd = th.electrode_drop_v
        self.vg = th.galvanic_offset_v
        self.f_cl = th.chlorine_fraction
        self.gas = th.gas_model
        self.slip = th.gas_slip_ratio
        # gas volume per coulomb at the duct's absolute pressure and inlet temperature [m³/C]
        self.vpc = gas_volume_per_coulomb_m3_c(
            th.chlorine_fraction, ATM_PA + max(w.p_dbar, 0.0) * 1e4, w.t_c
        )
        self.lam = end_leakage_factor(th.length_m, th.gap_m) if th.end_effects else 0.0
        self.wall = th.wall_friction
        self.rho = w.rho_kg_m3
        self.mu = w.mu_pa_s
        self.cp = w.cp_j_kg_k
        self.sig_in = w.sigma_s_m
        self.beta = w.dsigma_dt_s_m_k
        self.dt_cap = max(BOILING_C - w.t_c, 0.0)
        self.sig_cap = self.sig_in + self.beta * self.dt_cap / 2.0
        # results of `_iterate_scalar` by (V0, command, thermal, B): the ODE solvers evaluate
        # the same state more than once (and the dead-band flow repeats), so a repeat costs a
        # dict look-up; the values are the same floats as a fresh solve
        self.memo: dict = {}
        # (Re, f·Re) of the last wall-friction residual: the operating point's losses are
        # taken at the converged velocity, where the solve's last residual already put them
        self.fre_last = (math.nan, 0.0)
        # products that `_step_scalar` needs on every call, formed in the same order as there
        # (so the results are the same floats)
        self.l_dh = self.length / self.d_h
        self.cf0 = 0.5 * self.mu * self.length
        self.dh2 = self.d_h * self.d_h
        self.r2 = self.r * self.r
        self.inv_r2 = 1.0 / self.r2
        self.k_noz_r2 = self.k_noz / self.r2
        self.k_in1 = 1.0 + self.k_in
        self.half_rho = 0.5 * self.rho
        self.two_rho = 2.0 * self.rho
        # of the thermal conductivity rise in the scalar path: 2ρc_p, and the heating parameter
        # g = β·(E − uB)²·L/(2ρc_p·u) at which σ reaches its cap (σ_in/(1 − g) = σ_cap)
        self.two_rho_cp = self.two_rho * self.cp
        self.g_cap = 1.0 - self.sig_in / self.sig_cap


# --------------------------------------------------------------------------------------------
# vectorised core (works in the mirrored frame, V0 ≥ 0)
# --------------------------------------------------------------------------------------------


def _friction_lin(k: _Consts, u, wall: bool = True):
    """Linearised friction about u: (quadratic K part, linear coefficient [Pa·s/m], fRe)."""
    if not (wall and k.wall):
        z = np.zeros_like(u)
        return z, z, z
    re = k.rho * np.abs(u) * k.d_h / k.mu
    fre, fq, m = friction_terms(re, k.eps, k.alpha)
    lod = k.length / k.d_h
    return lod * fq, 0.5 * k.mu * k.length * (-m) * fre / k.d_h**2, fre


def _hydraulic_step(k: _Consts, v0, p, c_em, u_prev, wall: bool = True):
    """One closed-form solve of the duct energy equation with friction linearised at u_prev.

    Returns (u, disk_mask)."""
    kfq, cf, _ = _friction_lin(k, u_prev, wall)
    r2 = k.r * k.r
    kl = k.k_in + kfq + k.k_noz / r2
    kk_fwd = 1.0 / r2 + kl
    kk_rev = 1.0 + k.k_in + kfq + k.k_noz
    c = c_em + cf
    q = 0.5 * k.rho * v0 * v0
    drive = p + q
    d = np.abs(drive)
    kk = np.where(drive >= 0.0, kk_fwd, kk_rev)
    den = c + np.sqrt(c * c + 2.0 * k.rho * kk * d)
    u = np.sign(drive) * _safe_div(2.0 * d, den)
    if not k.disk:
        return u, np.zeros(np.shape(u), dtype=bool)
    a = 0.5 * k.rho * (4.0 + kl)
    bq = c - 2.0 * k.rho * v0
    p_min = a * v0 * v0 / 4.0 + bq * v0 / 2.0
    valid = p >= p_min
    sq = np.sqrt(np.maximum(bq * bq + 4.0 * a * p, 0.0))
    u_disk = np.where(bq >= 0.0, _safe_div(2.0 * p, bq + sq), _safe_div(sq - bq, 2.0 * a))
    return np.where(valid, u_disk, u), valid


GAS_BISECT = 80
"""Iteration cap of the bisection for the gas-laden conductivity (voltage control)."""


def _sigma_voltage(k: _Consts, e_s, u, thermal: bool):
    """Mean-duct conductivity for a given field and velocity (voltage control)."""
    if k.gas != "none":
        return _sigma_voltage_gas(k, e_s, u, thermal)
    if not thermal or k.beta == 0.0:
        return np.full(np.shape(u), k.sig_in)
    ue = np.maximum(np.abs(u), U_FLOOR_M_S)
    y = e_s - u * k.b
    g = k.beta * y * y * k.length / (2.0 * k.rho * k.cp * ue)
    g_cap = 1.0 - k.sig_in / k.sig_cap
    return np.where(g < g_cap, k.sig_in / np.maximum(1.0 - g, 1e-300), k.sig_cap)


def _sigma_voltage_gas(k: _Consts, e_s, u, thermal: bool):
    """Mixture conductivity σ_m with electrolysis gas (and Joule heating), voltage control.

    Root of σ_m = σ_w(σ_m)·⟨f⟩(κσ_m) on [0, σ_cap] by bisection, where the water conductivity
    is σ_w = min(σ_in + Gσ_m, σ_cap) (Joule heat J²/σ_m with J = σ_m(E − uB)) and the outlet
    gas-to-water ratio is a = κσ_m, κ = v_C|E − uB|L/(gap·u_e) (v_C gas volume per coulomb)."""
    ue = np.maximum(np.abs(u), U_FLOOR_M_S)
    y = e_s - u * k.b
    kappa = k.vpc * np.abs(y) * k.length / (k.gap * ue)
    if thermal and k.beta != 0.0:
        g = k.beta * y * y * k.length / (2.0 * k.rho * k.cp * ue)
        hi = np.full(np.shape(ue), k.sig_cap)
    else:
        g = np.zeros(np.shape(ue))
        hi = np.full(np.shape(ue), k.sig_in)
    lo = np.zeros(np.shape(ue))
    for _ in range(GAS_BISECT):
        mid = 0.5 * (lo + hi)
        sw = np.minimum(k.sig_in + g * mid, k.sig_cap)
        neg = mid - sw * mean_conductivity_ratio(kappa * mid, k.gas, k.slip) <= 0.0
        lo = np.where(neg, mid, lo)
        hi = np.where(neg, hi, mid)
        if np.all(hi - lo <= 1e-15 * hi):
            break
    return 0.5 * (lo + hi)


def _sigma_current(k: _Consts, j, u, thermal: bool):
    """Mean-duct conductivity for a given current density and velocity (current control)."""
    if k.gas != "none":
        # σ_m = f·σ_w, σ_w = σ_in + k2/σ_m  ⇒  σ_m² − fσ_in σ_m − f k2 = 0 (capped at f·σ_cap)
        ue = np.maximum(np.abs(u), U_FLOOR_M_S)
        f = mean_conductivity_ratio(k.vpc * np.abs(j) * k.length / (k.gap * ue), k.gas, k.slip)
        if not thermal or k.beta == 0.0:
            return f * k.sig_in
        k2 = k.beta * j * j * k.length / (2.0 * k.rho * k.cp * ue)
        s = 0.5 * (f * k.sig_in + np.sqrt(f * f * k.sig_in * k.sig_in + 4.0 * f * k2))
        return np.minimum(s, f * k.sig_cap)
    if not thermal or k.beta == 0.0:
        return np.full(np.shape(u), k.sig_in)
    ue = np.maximum(np.abs(u), U_FLOOR_M_S)
    k2 = k.beta * j * j * k.length / (2.0 * k.rho * k.cp * ue)
    s = 0.5 * (k.sig_in + np.sqrt(k.sig_in * k.sig_in + 4.0 * k2))
    return np.minimum(s, k.sig_cap)


def _required_dp(k: _Consts, v0, u, disk_branch):
    """Lorentz pressure rise needed to sustain the duct velocity u (exact friction) [Pa].

    Monotonic increasing in u on each branch; the ducted branch is continuous through u = 0."""
    au = np.abs(u)
    if k.wall:
        re = k.rho * au * k.d_h / k.mu
        fre, _, _ = friction_terms(re, k.eps, k.alpha)
        wall = fre * k.mu * k.length * au / (2.0 * k.d_h**2)
    else:
        wall = np.zeros_like(au)
    r2 = k.r * k.r
    q = 0.5 * k.rho * v0 * v0
    fwd = 0.5 * k.rho * (1.0 / r2 + k.k_in + k.k_noz / r2) * u * u + wall - q
    rev = -(q + 0.5 * k.rho * (1.0 + k.k_in + k.k_noz) * u * u + wall)
    duct = np.where(u >= 0.0, fwd, rev)
    if not k.disk:
        return duct
    disk = 0.5 * k.rho * (4.0 + k.k_in + k.k_noz / r2) * u * u + wall - 2.0 * k.rho * v0 * u
    return np.where(disk_branch, disk, duct)


def _delivered_dp(k: _Consts, u, e_s, dpl, thermal):
    """Lorentz pressure rise J·B·L delivered at duct velocity u (non-increasing in u) [Pa]."""
    if e_s is None:
        return dpl
    sig = _sigma_voltage(k, e_s, u, thermal)
    return sig * (e_s - u * k.b) * k.b * k.length


def _residual_ok(k: _Consts, v0, u, disk, e_s, dpl, thermal):
    """True where the duct energy equation holds to RESID_TOL of its largest term."""
    req = _required_dp(k, v0, u, disk)
    dlv = _delivered_dp(k, u, e_s, dpl, thermal)
    scale = np.abs(dlv) + 0.5 * k.rho * (v0 * v0 + u * u) + 1e-300
    return np.abs(req - dlv) <= RESID_TOL * scale


def _bracket_solve(k: _Consts, v0, e_s, dpl, thermal, u_guess):
    """Bisection on the monotonic energy residual (fallback where the fixed point stalls)."""

    def resid(u, br):
        return _required_dp(k, v0, u, br) - _delivered_dp(k, u, e_s, dpl, thermal)

    return _bisect_u(k, v0, resid, u_guess)


def _bisect_u(k: _Consts, v0, resid, u_guess):
    """Bisection on u of a residual resid(u, disk_branch) increasing in u on each branch."""
    br = np.zeros(v0.shape, dtype=bool)
    if k.disk:
        br = resid(0.5 * v0, np.ones_like(br)) <= 0.0
    span = np.abs(u_guess) + v0 + 1.0
    lo = np.where(br, 0.5 * v0, -span)
    hi = np.where(br, 0.5 * v0 + span, span)
    for _ in range(200):
        bad_lo = resid(lo, br) > 0.0
        bad_hi = resid(hi, br) < 0.0
        if not (np.any(bad_lo) or np.any(bad_hi)):
            break
        lo = np.where(bad_lo, 2.0 * lo, lo)  # only non-disk points can have R(lo) > 0
        hi = np.where(bad_hi, 2.0 * hi, hi)
    for _ in range(MAX_BISECT):
        mid = 0.5 * (lo + hi)
        neg = resid(mid, br) <= 0.0
        lo = np.where(neg, mid, lo)
        hi = np.where(neg, hi, mid)
        if np.all(hi - lo <= REL_TOL * np.abs(0.5 * (lo + hi)) + ABS_TOL_M_S):
            break
    else:
        raise ModelRangeError(
            "duct-flow bisection",
            f"{v0.size} point(s) unconverged",
            f"convergence to {REL_TOL} relative within {MAX_BISECT} steps",
            _MODEL,
        )
    return 0.5 * (lo + hi), br


def _iterate(k: _Consts, v0, *, e_s=None, dpl=None, thermal=True):
    """Joint fixed point on u (friction) and σ (voltage mode). Returns (u, σ, disk_mask).

    Closed-form steps with friction linearised at the previous iterate (active-set
    compaction); points not converged after FP_ITER steps are finished by bisection on the
    monotonic energy residual, which cannot fail to bracket the unique root."""
    voltage_mode = e_s is not None
    shape = np.shape(v0)
    sig0 = np.full(shape, k.sig_in)
    if voltage_mode:
        p = sig0 * k.b * k.length * e_s
        c_em = sig0 * k.b * k.b * k.length
    else:
        p = dpl
        c_em = np.zeros(shape)
    # frictionless start (inlet and nozzle losses kept)
    u, disk = _hydraulic_step(k, v0, p, c_em, np.zeros(shape), wall=False)
    act = np.arange(v0.size)
    for _ in range(FP_ITER):
        v0a = v0[act]
        ua = u[act]
        if voltage_mode:
            ea = e_s[act]
            sa = _sigma_voltage(k, ea, ua, thermal)
            pa = sa * k.b * k.length * ea
            ca = sa * k.b * k.b * k.length
        else:
            pa = dpl[act]
            ca = np.zeros(act.size)
        un, da = _hydraulic_step(k, v0a, pa, ca, ua)
        conv = np.abs(un - ua) <= REL_TOL * np.abs(un) + ABS_TOL_M_S
        u[act] = un
        disk[act] = da
        act = act[~conv]
        if act.size == 0:
            break
    # a small step is not proof of a root when convergence is slow: check the energy residual
    done = np.ones(v0.size, dtype=bool)
    done[act] = False
    chk = np.flatnonzero(done)
    if chk.size:
        bad = ~_residual_ok(
            k,
            v0[chk],
            u[chk],
            disk[chk],
            None if e_s is None else e_s[chk],
            None if dpl is None else dpl[chk],
            thermal,
        )
        act = np.union1d(act, chk[bad])
    if act.size:
        ub, db = _bracket_solve(
            k,
            v0[act],
            None if e_s is None else e_s[act],
            None if dpl is None else dpl[act],
            thermal,
            u[act],
        )
        u[act] = ub
        disk[act] = db
    sig = _sigma_voltage(k, e_s, u, thermal) if voltage_mode else sig0
    return u, sig, disk


def operating_point(
    thruster: DuctThruster,
    water: WaterState,
    speed_m_s,
    *,
    voltage_v=None,
    current_a=None,
    thermal_feedback: bool = True,
) -> ThrusterOperatingPoint:
    """Steady operating point of an MHD duct thruster under voltage or current control.

    Parameters
    ----------
    thruster : DuctThruster
        Geometry, field and loss data.
    water : WaterState
        Inlet water state (σ, dσ/dT, ρ, c_p, μ, T).
    speed_m_s : float or array
        Vessel speed through the water V0 [m/s] (> 0 ahead, < 0 astern).
    voltage_v : float or array, optional
        Electrode voltage [V] (> 0 drives thrust ahead). Exactly one of voltage/current.
    current_a : float or array, optional
        Total current of all channels [A].
    thermal_feedback : bool
        Evaluate σ at the mean duct temperature (Joule heating), solved jointly. Default True.

    Returns
    -------
    ThrusterOperatingPoint
        All quantities, broadcast over speed and command.

    Raises
    ------
    ModelRangeError
        Bad inputs, or the joint iteration did not converge.

    Notes
    -----
    J = σ(E − uB), E = (V − sign(J)V_d)/gap; duct energy equation
    ½ρk u² + c u − (P + q) = 0 (ducted) or ½ρ(4 + k_l)u² + (c − 2ρV0)u − P = 0 (disk);
    T = ṁ(u_j − V0). Derivations, regimes and the energy identity are in the module docstring.

    References
    ----------
    Way, S. (1968). Electromagnetic propulsion for cargo submarines. J. Hydronautics 2(2).
    doi:10.2514/3.62773. Rankine (1865); Froude (1889) (momentum theory).
    """
    if (voltage_v is None) == (current_a is None):
        raise ModelRangeError("command", (voltage_v, current_a), "exactly one of voltage/current")
    _check_water(water)
    k = _Consts(thruster, water)
    cmd = voltage_v if voltage_v is not None else current_a
    v0_in, cmd = np.broadcast_arrays(
        np.asarray(speed_m_s, dtype=float), np.asarray(cmd, dtype=float)
    )
    if not (np.all(np.isfinite(v0_in)) and np.all(np.isfinite(cmd))):
        raise ModelRangeError("speed/command", "non-finite value", "finite numbers", _MODEL)
    shape = v0_in.shape
    v0_in = v0_in.reshape(-1)
    cmd = cmd.reshape(-1)
    sv = np.where(v0_in < 0.0, -1.0, 1.0)  # mirror for astern
    v0 = np.abs(v0_in)
    cmd = sv * cmd
    n_area_l = k.n * k.h * k.length

    vg = sv * k.vg  # the galvanic EMF flips with the voltage in the mirrored problem
    if voltage_v is not None:
        volt = cmd
        # flow with J = 0 decides the sign of the current (g(J) is monotonic)
        u_pass, _, disk = _iterate(k, v0, dpl=np.zeros_like(v0), thermal=False)
        net = volt - vg - _open_circuit_emf(k, u_pass)
        s = np.where(net > k.vd, 1.0, np.where(net < -k.vd, -1.0, 0.0))
        u = u_pass.copy()
        sig = np.full_like(v0, k.sig_in)
        e_field = u_pass * k.b
        on = np.flatnonzero(s != 0.0)
        if on.size:
            e_s = (volt[on] - vg[on] - s[on] * k.vd) / k.gap
            u_on, sig_on, disk_on = _iterate(k, v0[on], e_s=e_s, thermal=thermal_feedback)
            u[on] = u_on
            sig[on] = sig_on
            disk[on] = disk_on
            e_field[on] = e_s
        j = sig * (e_field - u * k.b)
        j = np.where(s == 0.0, 0.0, j)
        i_end = np.where(s == 0.0, 0.0, _end_current(k, sig, e_field))
    else:
        current = cmd
        if k.lam == 0.0:
            j = current / n_area_l
            u, _, disk = _iterate(k, v0, dpl=j * k.b * k.length, thermal=False)
            sig = _sigma_current(k, j, u, thermal_feedback)
        else:
            u, disk, j, sig = _solve_current_end(k, v0, current, thermal_feedback)
        e_field = j / sig + u * k.b
        i_end = np.where(current != 0.0, _end_current(k, sig, e_field), 0.0)
        volt = np.where(
            j != 0.0,
            e_field * k.gap + vg + np.sign(current) * k.vd,
            _open_circuit_emf(k, u) + vg,
        )

    return _assemble(k, thruster, water, v0, sv, u, sig, j, e_field, volt, disk, shape, i_end)


def _open_circuit_emf(k: _Consts, u):
    """Water voltage at zero electrode current, uB·gap (× L/(L + Λ·gap) with end fringing) [V].

    With end effects the core current that balances the fringing current at zero electrode
    current is neglected for the flow (it is small at the edge of the dead band)."""
    if k.lam == 0.0:
        return u * k.b * k.gap
    return u * k.b * k.gap * k.length / (k.length + k.lam * k.gap)


def _end_current(k: _Consts, sig, e_field):
    """Fringing current of all channels' ends, N·σ·h·Λ·(E·gap) [A] (zero without end effects)."""
    if k.lam == 0.0:
        return np.zeros(np.shape(e_field))
    return k.n * sig * k.h * k.lam * e_field * k.gap


def _solve_current_end(k: _Consts, v0, current, thermal):
    """Current control with end fringing: the core current density J is unknown.

    The total current per unit height and channel, I/(N h) = (L + Λ·gap)J + Λ·gap·σ·uB, rises
    monotonically with the duct velocity u, J being the Lorentz pressure needed for u over BL;
    bisection on u. Returns (u, disk_mask, J, σ)."""
    i_t = current / (k.n * k.h)
    lg = k.length + k.lam * k.gap
    if k.b == 0.0:
        j = i_t / lg
        u, _, disk = _iterate(k, v0, dpl=np.zeros_like(v0), thermal=False)
        return u, disk, j, _sigma_current(k, j, u, thermal)
    bl = k.b * k.length

    def resid(u, br):
        jj = _required_dp(k, v0, u, br) / bl
        return lg * jj + k.lam * k.gap * _sigma_current(k, jj, u, thermal) * u * k.b - i_t

    u0, _, disk0 = _iterate(k, v0, dpl=i_t / lg * bl, thermal=False)
    u, disk = _bisect_u(k, v0, resid, u0)
    # two finite-difference Newton steps polish u from the bisection tolerance to rounding
    for _ in range(2):
        du = np.maximum(np.abs(u) * 1e-7, 1e-9)
        r0 = resid(u, disk)
        den = resid(u + du, disk) - r0
        step = np.where(den != 0.0, r0 * du / np.where(den != 0.0, den, 1.0), 0.0)
        u = u - np.clip(step, -du, du)
    # J from the current balance (exact in the command) rather than from the force balance
    j = _required_dp(k, v0, u, disk) / bl
    j = (i_t - k.lam * k.gap * _sigma_current(k, j, u, thermal) * u * k.b) / lg
    # zero electrode current: the end loops are neglected, as in the voltage-mode dead band
    off = i_t == 0.0
    u, disk, j = np.where(off, u0, u), np.where(off, disk0, disk), np.where(off, 0.0, j)
    return u, disk, j, _sigma_current(k, j, u, thermal)


def _assemble(k, thruster, water, v0, sv, u, sig, j, e_field, volt, disk, shape, i_end):
    area_tot = k.n * k.area
    rho = k.rho
    q_flow = area_tot * u
    mdot = rho * q_flow
    fwd = u >= 0.0
    u_jet = np.where(disk, 2.0 * u - v0, np.where(fwd, u / k.r, u))
    thrust = np.where(fwd, mdot * (u_jet - v0), mdot * (np.abs(u_jet) + v0))
    i_core = j * k.n * k.h * k.length
    current = i_core + i_end
    vol = area_tot * k.length
    p_el = volt * current
    joule = j * j / sig * vol + e_field * k.gap * i_end
    electrode = k.vd * np.abs(current) + sv * k.vg * current
    flow_work = j * k.b * k.length * q_flow
    # losses at the converged velocity (finite form of wall friction)
    if k.wall:
        re = rho * np.abs(u) * k.d_h / k.mu
        fre, _, _ = friction_terms(re, k.eps, k.alpha)
    else:
        re = rho * np.abs(u) * k.d_h / k.mu
        fre = np.zeros_like(u)
    dp_wall = fre * k.mu * k.length * np.abs(u) / (2.0 * k.d_h**2)
    k_minor = np.where(fwd, k.k_in + k.k_noz / k.r**2, k.k_in + k.k_noz)
    dp_loss = 0.5 * rho * u * u * k_minor + dp_wall
    friction = dp_loss * np.abs(q_flow)
    useful = thrust * v0
    wake = flow_work - useful - friction
    ub = u * k.b
    load = _safe_div(e_field, ub)
    eta_e = _safe_div(ub, e_field)
    eta_h = np.where(flow_work > 0.0, _safe_div(flow_work - friction, flow_work), 0.0)
    froude_den = flow_work - friction
    eta_p = np.where((useful > 0.0) & (froude_den > 0.0), _safe_div(useful, froude_den), 0.0)
    eta_o = np.where((useful > 0.0) & (p_el > 0.0), _safe_div(useful, p_el), 0.0)
    eta_el = np.where((flow_work > 0.0) & (p_el > 0.0), _safe_div(flow_work, p_el), 0.0)
    eta_hyd = np.where((useful > 0.0) & (flow_work > 0.0), _safe_div(useful, flow_work), 0.0)
    ue = np.maximum(np.abs(u), U_FLOOR_M_S)
    d_t = j * j * k.length / (sig * rho * k.cp * ue)
    h2, cl2, o2 = gas_rates_mol_s(current, thruster.chlorine_fraction)
    boiling = water.t_c + d_t >= BOILING_C
    # electrolysis gas of the core current in the active length (module docstring)
    a_gas = k.vpc * np.abs(i_core) / (area_tot * ue)
    void_mean = mean_void_fraction(a_gas, k.slip)
    void_out = outlet_void_fraction(a_gas, k.slip)
    f_gas = mean_conductivity_ratio(a_gas, k.gas, k.slip)

    def out(a, flip=False):
        a = np.asarray(a)
        if flip:
            a = sv * a
        return a.reshape(shape)

    return ThrusterOperatingPoint(
        duct_velocity_m_s=out(u, True),
        jet_velocity_m_s=out(u_jet, True),
        mass_flow_kg_s=out(mdot, True),
        volume_flow_m3_s=out(q_flow, True),
        thrust_n=out(thrust, True),
        current_a=out(current, True),
        voltage_v=out(volt, True),
        electric_field_v_m=out(e_field, True),
        current_density_a_m2=out(j, True),
        electrical_power_w=out(p_el),
        joule_loss_w=out(joule),
        electrode_loss_w=out(electrode),
        friction_loss_w=out(friction),
        wake_loss_w=out(wake),
        flow_work_w=out(flow_work),
        useful_power_w=out(useful),
        load_factor=out(load),
        eta_lorentz=out(eta_e),
        eta_electrical=out(eta_el),
        eta_duct=out(eta_h),
        eta_froude=out(eta_p),
        eta_hydraulic=out(eta_hyd),
        eta_overall=out(eta_o),
        outlet_temperature_rise_k=out(d_t),
        sigma_mean_s_m=out(sig),
        reynolds_number=out(re),
        h2_mol_s=out(h2),
        cl2_mol_s=out(cl2),
        o2_mol_s=out(o2),
        boiling_risk=out(boiling),
        end_current_a=out(i_end, True),
        gas_void_fraction_mean=out(void_mean),
        gas_void_fraction_outlet=out(void_out),
        gas_conductivity_ratio=out(f_gas),
    )


# --------------------------------------------------------------------------------------------
# scalar fast path (pure Python, same equations) for ODE right-hand sides
# --------------------------------------------------------------------------------------------


def _step_scalar(k: _Consts, v0: float, p: float, c_em: float, u_prev: float, wall: bool):
    if wall and k.wall:
        re = k.rho * abs(u_prev) * k.d_h / k.mu
        fre, fq, m = friction_terms_scalar(re, k.eps, k.alpha)
        kfq = k.l_dh * fq
        cf = k.cf0 * (-m) * fre / k.dh2
    else:
        kfq = cf = 0.0
    kl = k.k_in + kfq + k.k_noz_r2
    c = c_em + cf
    drive = p + k.half_rho * v0 * v0
    if drive >= 0.0:
        kk = k.inv_r2 + kl
        sgn = 1.0
    else:
        kk = k.k_in1 + kfq + k.k_noz
        sgn = -1.0
    d = abs(drive)
    den = c + math.sqrt(c * c + k.two_rho * kk * d)
    u = sgn * 2.0 * d / den if den != 0.0 else 0.0
    if k.disk:
        a = k.half_rho * (4.0 + kl)
        bq = c - k.two_rho * v0
        if p >= a * v0 * v0 / 4.0 + bq * v0 / 2.0:
            sq = math.sqrt(max(bq * bq + 4.0 * a * p, 0.0))
            if bq >= 0.0:
                u = 2.0 * p / (bq + sq) if bq + sq != 0.0 else 0.0
            else:
                u = (sq - bq) / (2.0 * a)
            return u, True
    return u, False


def _sigma_voltage_scalar(k: _Consts, e_s: float, u: float, thermal: bool) -> float:
    if k.gas != "none":
        return _sigma_voltage_gas_scalar(k, e_s, u, thermal)
    if not thermal or k.beta == 0.0:
        return k.sig_in
    y = e_s - u * k.b
    g = k.beta * y * y * k.length / (k.two_rho_cp * max(abs(u), U_FLOOR_M_S))
    return k.sig_in / (1.0 - g) if g < k.g_cap else k.sig_cap


def _sigma_voltage_gas_scalar(k: _Consts, e_s: float, u: float, thermal: bool) -> float:
    """Scalar twin of `_sigma_voltage_gas` (same bisection, same bounds)."""
    ue = max(abs(u), U_FLOOR_M_S)
    y = e_s - u * k.b
    kappa = k.vpc * abs(y) * k.length / (k.gap * ue)
    if thermal and k.beta != 0.0:
        g = k.beta * y * y * k.length / (k.two_rho_cp * ue)
        hi = k.sig_cap
    else:
        g = 0.0
        hi = k.sig_in
    lo = 0.0
    for _ in range(GAS_BISECT):
        mid = 0.5 * (lo + hi)
        sw = min(k.sig_in + g * mid, k.sig_cap)
        if mid - sw * mean_conductivity_ratio_scalar(kappa * mid, k.gas, k.slip) <= 0.0:
            lo = mid
        else:
            hi = mid
        if hi - lo <= 1e-15 * hi:
            break
    return 0.5 * (lo + hi)


def _sigma_current_scalar(k: _Consts, j: float, u: float, thermal: bool) -> float:
    """Scalar twin of `_sigma_current`."""
    ue = max(abs(u), U_FLOOR_M_S)
    if k.gas != "none":
        f = mean_conductivity_ratio_scalar(k.vpc * abs(j) * k.length / (k.gap * ue), k.gas, k.slip)
        if not thermal or k.beta == 0.0:
            return f * k.sig_in
        k2 = k.beta * j * j * k.length / (k.two_rho_cp * ue)
        sg = 0.5 * (f * k.sig_in + math.sqrt(f * f * k.sig_in * k.sig_in + 4.0 * f * k2))
        return min(sg, f * k.sig_cap)
    if thermal and k.beta != 0.0:
        k2 = k.beta * j * j * k.length / (k.two_rho_cp * ue)
        return min(0.5 * (k.sig_in + math.sqrt(k.sig_in * k.sig_in + 4.0 * k2)), k.sig_cap)
    return k.sig_in


def _required_dp_scalar(k: _Consts, v0: float, u: float, br: bool) -> float:
    """Scalar twin of `_required_dp` [Pa]."""
    return _resid_scalar(k, v0, u, br, None, 0.0, False)


def _resid_scalar(k: _Consts, v0: float, u: float, br: bool, e_s, dpl: float, thermal: bool):
    au = abs(u)
    if k.wall:
        re = k.rho * au * k.d_h / k.mu
        fre = friction_terms_scalar(re, k.eps, k.alpha)[0]
        k.fre_last = (re, fre)
        wall = fre * k.mu * k.length * au / (2.0 * k.d_h * k.d_h)
    else:
        wall = 0.0
    r2 = k.r * k.r
    q = 0.5 * k.rho * v0 * v0
    if br:
        req = 0.5 * k.rho * (4.0 + k.k_in + k.k_noz / r2) * u * u + wall - 2.0 * k.rho * v0 * u
    elif u >= 0.0:
        req = 0.5 * k.rho * (1.0 / r2 + k.k_in + k.k_noz / r2) * u * u + wall - q
    else:
        req = -(q + 0.5 * k.rho * (1.0 + k.k_in + k.k_noz) * u * u + wall)
    if e_s is None:
        return req - dpl
    sig = _sigma_voltage_scalar(k, e_s, u, thermal)
    return req - sig * (e_s - u * k.b) * k.b * k.length


def _bracket_scalar(k: _Consts, v0: float, e_s, dpl: float, thermal: bool, u_guess: float):
    def resid(u, br):
        return _resid_scalar(k, v0, u, br, e_s, dpl, thermal)

    return _bisect_u_scalar(k, v0, resid, u_guess)


def _bisect_u_scalar(k: _Consts, v0: float, resid, u_guess: float):
    """Scalar twin of `_bisect_u`."""
    br = k.disk and resid(0.5 * v0, True) <= 0.0
    span = abs(u_guess) + v0 + 1.0
    lo, hi = (0.5 * v0, 0.5 * v0 + span) if br else (-span, span)
    for _ in range(200):
        if resid(lo, br) > 0.0:
            lo *= 2.0
        elif resid(hi, br) < 0.0:
            hi *= 2.0
        else:
            break
    for _ in range(MAX_BISECT):
        mid = 0.5 * (lo + hi)
        if resid(mid, br) <= 0.0:
            lo = mid
        else:
            hi = mid
        if hi - lo <= REL_TOL * abs(0.5 * (lo + hi)) + ABS_TOL_M_S:
            return 0.5 * (lo + hi), br
    raise ModelRangeError(
        "duct-flow bisection",
        f"unconverged at V0 = {v0!r} m/s",
        f"convergence to {REL_TOL} relative within {MAX_BISECT} steps",
        _MODEL,
    )


_MEMO_MAX = 4096
"""Entries kept in a `_Consts` memo before it is cleared (bounds memory on long runs)."""


def _iterate_scalar(k: _Consts, v0: float, e_s: float | None, dpl: float, thermal: bool):
    key = (v0, e_s, dpl, thermal, k.b)
    memo = k.memo
    hit = memo.get(key)
    if hit is not None:
        return hit
    if len(memo) >= _MEMO_MAX:
        memo.clear()
    out = memo[key] = _iterate_scalar_solve(k, v0, e_s, dpl, thermal)
    return out


def _iterate_scalar_solve(k: _Consts, v0: float, e_s: float | None, dpl: float, thermal: bool):
    voltage_mode = e_s is not None
    sig = k.sig_in
    if voltage_mode:
        p = sig * k.b * k.length * e_s
        c_em = sig * k.b * k.b * k.length
    else:
        p, c_em = dpl, 0.0
    u, disk = _step_scalar(k, v0, p, c_em, 0.0, False)
    for _ in range(FP_ITER):
        if voltage_mode:
            sig = _sigma_voltage_scalar(k, e_s, u, thermal)
            p = sig * k.b * k.length * e_s
            c_em = sig * k.b * k.b * k.length
        u_new, disk = _step_scalar(k, v0, p, c_em, u, True)
        done = abs(u_new - u) <= REL_TOL * abs(u_new) + ABS_TOL_M_S
        u = u_new
        if done:
            break
    else:
        done = False
    if done:
        res = _resid_scalar(k, v0, u, disk, e_s, dpl, thermal)
        dlv = (
            dpl
            if e_s is None
            else (_sigma_voltage_scalar(k, e_s, u, thermal) * (e_s - u * k.b) * k.b * k.length)
        )
        done = abs(res) <= RESID_TOL * (abs(dlv) + 0.5 * k.rho * (v0 * v0 + u * u) + 1e-300)
    if not done:
        u, disk = _bracket_scalar(k, v0, e_s, dpl, thermal, u)
    if voltage_mode:
        sig = _sigma_voltage_scalar(k, e_s, u, thermal)
    return u, sig, disk


def thrust_and_current(
    thruster: DuctThruster,
    water: WaterState,
    speed_m_s: float,
    voltage_v: float,
    *,
    thermal_feedback: bool = True,
) -> tuple[float, float, float]:
    """Thrust, current and duct velocity for one voltage and speed (fast scalar path).

    Parameters
    ----------
    thruster : DuctThruster
        Geometry, field and loss data.
    water : WaterState
        Inlet water state.
    speed_m_s : float
        Vessel speed V0 [m/s].
    voltage_v : float
        Electrode voltage [V].
    thermal_feedback : bool
        As in `operating_point`. Default True.

    Returns
    -------
    tuple of float
        (thrust [N], total current [A], duct velocity [m/s]).

    Notes
    -----
    Pure-Python version of `operating_point` (voltage control) with the same equations and
    tolerances, for ODE right-hand sides; the test suite holds the two against each other.

    References
    ----------
    Way, S. (1968). J. Hydronautics 2(2), doi:10.2514/3.62773; see the module docstring.
    """
    _check_water(water)
    v0 = float(speed_m_s)
    volt = float(voltage_v)
    if not (math.isfinite(v0) and math.isfinite(volt)):
        raise ModelRangeError("speed/voltage", (v0, volt), "finite numbers", _MODEL)
    p = scalar_point(
        _Consts(thruster, water),
        v0,
        voltage_v=volt,
        thermal_feedback=thermal_feedback,
        chlorine_fraction=thruster.chlorine_fraction,
    )
    return p.thrust_n, p.current_a, p.duct_velocity_m_s


# --------------------------------------------------------------------------------------------
# full scalar operating point for ODE right-hand sides
# --------------------------------------------------------------------------------------------


def _open_circuit_emf_scalar(k: _Consts, u: float) -> float:
    """Scalar twin of `_open_circuit_emf` [V]."""
    if k.lam == 0.0:
        return u * k.b * k.gap
    return u * k.b * k.gap * k.length / (k.length + k.lam * k.gap)


def _solve_current_end_scalar(k: _Consts, v0: float, current: float, thermal: bool):
    """Scalar twin of `_solve_current_end`: (u, disk, J, σ)."""
    i_t = current / (k.n * k.h)
    lg = k.length + k.lam * k.gap
    if k.b == 0.0:
        j = i_t / lg
        u, _, disk = _iterate_scalar(k, v0, None, 0.0, False)
        return u, disk, j, _sigma_current_scalar(k, j, u, thermal)
    bl = k.b * k.length

    def resid(u, br):
        jj = _required_dp_scalar(k, v0, u, br) / bl
        return lg * jj + k.lam * k.gap * _sigma_current_scalar(k, jj, u, thermal) * u * k.b - i_t

    u0, _, disk0 = _iterate_scalar(k, v0, None, i_t / lg * bl, False)
    if i_t == 0.0:  # zero electrode current: end loops neglected, as in the dead band
        return u0, disk0, 0.0, _sigma_current_scalar(k, 0.0, u0, thermal)
    u, disk = _bisect_u_scalar(k, v0, resid, u0)
    for _ in range(2):  # as in `_solve_current_end`
        du = max(abs(u) * 1e-7, 1e-9)
        r0 = resid(u, disk)
        den = resid(u + du, disk) - r0
        step = r0 * du / den if den != 0.0 else 0.0
        u = u - min(max(step, -du), du)
    j = _required_dp_scalar(k, v0, u, disk) / bl
    j = (i_t - k.lam * k.gap * _sigma_current_scalar(k, j, u, thermal) * u * k.b) / lg
    return u, disk, j, _sigma_current_scalar(k, j, u, thermal)


class ScalarPoint(NamedTuple):
    """A thruster operating point as plain floats (the fields of `ThrusterOperatingPoint`
    that a time-domain model needs). Units as there: N, A, V, m/s, W, K, mol/s."""

    thrust_n: float
    current_a: float
    voltage_v: float
    duct_velocity_m_s: float
    electrical_power_w: float
    joule_loss_w: float
    electrode_loss_w: float
    friction_loss_w: float
    wake_loss_w: float
    flow_work_w: float
    outlet_temperature_rise_k: float
    h2_mol_s: float
    cl2_mol_s: float
    o2_mol_s: float


def prepare_scalar(thruster: DuctThruster, water: WaterState) -> _Consts:
    """Precompute the constants of `scalar_point` once per thruster and water state.

    The returned object's field ``b`` [T] may be changed between calls (e.g. a magnet's
    temperature derating); nothing else may."""
    _check_water(water)
    return _Consts(thruster, water)


def scalar_point(
    k: _Consts,
    speed_m_s: float,
    *,
    voltage_v: float | None = None,
    current_a: float | None = None,
    thermal_feedback: bool = True,
    chlorine_fraction: float = 1.0,
) -> ScalarPoint:
    """Operating point for one speed and one command, in pure Python (fast scalar path).

    Parameters
    ----------
    k : constants from `prepare_scalar`
    speed_m_s : float
        Vessel speed V0 [m/s].
    voltage_v, current_a : float
        Exactly one: electrode voltage [V] or total current of all channels [A].
    thermal_feedback : bool
        As in `operating_point`.
    chlorine_fraction : float
        Fraction of the anodic charge that evolves chlorine [-] (Faraday's law).

    Returns
    -------
    ScalarPoint

    Notes
    -----
    Same equations and tolerances as `operating_point` (which the test suite holds it to);
    the losses are assembled exactly as there, so V·I = electrode + Joule + flow work and
    flow work = T·V0 + wake + friction hold to rounding.
    """
    v0 = float(speed_m_s)
    sv = -1.0 if v0 < 0.0 else 1.0
    v0 = abs(v0)
    n_area_l = k.n * k.h * k.length
    vg = sv * k.vg
    i_end = 0.0
    if voltage_v is not None:
        volt = sv * float(voltage_v)
        # The no-current (dead-band) flow u_pass only decides the sign of the electrode current
        # when the command lies within reach of its open-circuit emf. Without current the duct
        # is passive: its energy equation gives 0 ≤ u_pass ≤ r·V0 (ducted, r the nozzle area
        # ratio) or ≤ V0 (disk), so |emf| ≤ max(1, r)·V0·|B|·gap. Beyond that bound the sign is
        # known and the solve is skipped (the result is the same: the driven solve below sets
        # u and the jet branch).
        emf_max = max(1.0, k.r) * v0 * abs(k.b) * k.gap * (1.0 + 1e-9) + 1e-12
        if abs(volt - vg) - k.vd > emf_max:
            s = 1.0 if volt - vg > 0.0 else -1.0
        else:
            u_pass, _, disk = _iterate_scalar(k, v0, None, 0.0, False)
            net = volt - vg - _open_circuit_emf_scalar(k, u_pass)
            s = 1.0 if net > k.vd else (-1.0 if net < -k.vd else 0.0)
        if s == 0.0:
            u, sig, j, e_field = u_pass, k.sig_in, 0.0, u_pass * k.b
        else:
            e_field = (volt - vg - s * k.vd) / k.gap
            u, sig, disk = _iterate_scalar(k, v0, e_field, 0.0, thermal_feedback)
            j = sig * (e_field - u * k.b)
            if k.lam != 0.0:
                i_end = k.n * sig * k.h * k.lam * e_field * k.gap
    else:
        cur = sv * float(current_a)
        if k.lam == 0.0:
            j = cur / n_area_l
            u, _, disk = _iterate_scalar(k, v0, None, j * k.b * k.length, False)
            sig = _sigma_current_scalar(k, j, u, thermal_feedback)
        else:
            u, disk, j, sig = _solve_current_end_scalar(k, v0, cur, thermal_feedback)
        e_field = j / sig + u * k.b
        if k.lam != 0.0 and cur != 0.0:
            i_end = k.n * sig * k.h * k.lam * e_field * k.gap
        if j != 0.0:
            volt = e_field * k.gap + vg + math.copysign(k.vd, cur)
        else:
            volt = _open_circuit_emf_scalar(k, u) + vg
    # assemble (as `_assemble`)
    rho = k.rho
    q_flow = k.n * k.area * u
    mdot = rho * q_flow
    fwd = u >= 0.0
    u_jet = 2.0 * u - v0 if disk else (u / k.r if fwd else u)
    thrust = mdot * (u_jet - v0) if fwd else mdot * (abs(u_jet) + v0)
    i_core = j * n_area_l
    current = i_core + i_end
    p_el = volt * current
    joule = j * j / sig * (k.n * k.area * k.length) + e_field * k.gap * i_end
    electrode = k.vd * abs(current) + vg * current
    flow_work = j * k.b * k.length * q_flow
    if k.wall:
        re = rho * abs(u) * k.d_h / k.mu
        last = k.fre_last
        fre = last[1] if re == last[0] else friction_terms_scalar(re, k.eps, k.alpha)[0]
    else:
        fre = 0.0
    dp_wall = fre * k.mu * k.length * abs(u) / (2.0 * k.d_h * k.d_h)
    k_minor = k.k_in + k.k_noz / (k.r * k.r) if fwd else k.k_in + k.k_noz
    friction = (0.5 * rho * u * u * k_minor + dp_wall) * abs(q_flow)
    wake = flow_work - thrust * v0 - friction
    d_t = j * j * k.length / (sig * rho * k.cp * max(abs(u), U_FLOOR_M_S))
    ai = abs(current)
    h2 = ai / (2.0 * FARADAY_C_MOL)
    return ScalarPoint(
        sv * thrust,
        sv * current,
        sv * volt,
        sv * u,
        p_el,
        joule,
        electrode,
        friction,
        wake,
        flow_work,
        d_t,
        h2,
        chlorine_fraction * h2,
        (1.0 - chlorine_fraction) * ai / (4.0 * FARADAY_C_MOL),
    )
