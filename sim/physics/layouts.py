r"""Thruster layouts beyond one straight duct: channel stacks, annular and helical thrusters.

Each layout is mapped EXACTLY onto an equivalent straight duct (:class:`DuctThruster`) whose
electrical resistance, Lorentz force per ampere, back EMF per unit flow velocity, flow area and
volume equal the layout's; the duct solver
(:func:`sim.physics.thruster.operating_point`) then gives the same :class:`ThrusterOperatingPoint`
as for a straight duct, with Joule heating, electrolysis gas and the energy identity intact.
Only the wall friction uses the layout's own hydraulic diameter (annulus 2(r2 − r1)); that is
done by an adapter subclass, :class:`EquivalentDuct`, which overrides the duct's hydraulic
diameter and friction aspect ratio.

Channel stack
-------------
N identical channels side by side across the electrode gap direction, sharing one magnet array
(wide enough that every channel sees the same mean field). Per-channel field and resistance are
unchanged; total flow area ×N; at the same volume flow the duct velocity ÷N (common practice).
"parallel" wiring: every channel across the supply; "series": bipolar walls between
neighbours, the supply voltage split N ways and the same current through all.

Annular thruster
----------------
Water flows axially through the annulus r1 < r < r2 of active length L. Ring electrodes on the
inner and outer walls drive a radial current I; continuity gives J_r = I/(2πrL). The azimuthal
field is either toroidal, B_θ = B_m r_m/r (a toroidal winding or a ring of magnets that
approximates one), or uniform, B_θ = B_m. The axial Lorentz force ∫J_r B_θ dV is

    toroidal: F = I B_m r_m ln(r2/r1);     uniform: F = I B_m (r2 − r1),

the resistance R = ln(r2/r1)/(2πσL) and the back EMF u ∫B_θ dr (plug flow u). Equivalent duct:
gap_e = √(A ln(r2/r1)/(2π)), height_e = A/gap_e (A = π(r2² − r1²)), B_e = F/(I·gap_e).
Large mean radius: ln(r2/r1) → g/r_m, and everything tends to a straight duct of gap g =
r2 − r1, height 2πr_m and field B_m.

Helical-channel thruster
------------------------
A solenoid gives an axial field B_z in the annulus; the same radial current gives an azimuthal
force density J_r B_z. Helical vanes turn the annulus into passages at an angle φ to the
azimuthal direction (φ = 90°: axial passages). The force along a passage is J_r B_z cos φ, the
passage length L/sin φ and its total cross-section A sin φ; the water leaves the passages with
speed w, of which w sin φ is axial and w cos φ swirl. A stator (straightening vanes) behind the
passages recovers a fraction η_s of the swirl kinetic energy ½ρ(w cos φ)² as axial jet energy
and loses the rest; the jet is then ½u_j² = ½w²(sin²φ + η_s cos²φ). Common practice for stator
vanes behind a rotor is to recover half to three quarters of the swirl energy (from memory);
default η_s = 0.6. In the equivalent duct the jet is represented by the nozzle area ratio
r = 1/√(sin²φ + η_s cos²φ) and the lost swirl by a nozzle loss (1 − η_s)cos²φ on the passage
dynamic head; it is reported inside ``friction_loss_w`` (and alone by
:func:`helical_swirl_loss_w`). Limits: at φ = 90° the passages are axial and parallel to
the field, so the force along them vanishes; as φ → 0 the axial through-flow area A sin φ
vanishes; both give no thrust.

References
----------
.. [1] Way, S. (1968). Electromagnetic propulsion for cargo submarines. Journal of Hydronautics
   2(2), 49–57. doi:10.2514/3.62773 (annular thrusters with a toroidal field).
.. [2] Shah, R. K. & London, A. L. (1978). Laminar Flow Forced Convection in Ducts. Academic
   Press (laminar f·Re of a concentric annulus between 86 and 96 for r1/r2 ≥ 0.05; the parallel
   plate value 96 is used).
.. [3] Colebrook (1939), via :mod:`sim.physics.duct` (turbulent friction on D_h).
.. [4] Carlton, J. (2012). Marine Propellers and Propulsion, 3rd ed., Butterworth-Heinemann
   (stators and pre/post-swirl vanes recover rotational energy; fraction from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields, replace

import numpy as np

from sim.physics.duct import REL_ROUGHNESS_MAX
from sim.physics.errors import ModelRangeError
from sim.physics.seawater import WaterState
from sim.physics.thruster import DuctThruster, ThrusterOperatingPoint, operating_point

__all__ = [
    "DUCT_OPTION_NAMES",
    "AnnularThruster",
    "ChannelStack",
    "EquivalentDuct",
    "HelicalThruster",
    "RingOfTubes",
    "annular_as_duct",
    "helical_as_duct",
    "helical_swirl_loss_w",
    "layout_operating_point",
    "ring_of_tubes_as_duct",
    "stack_as_duct",
]

_MODEL = "thruster layout"

DUCT_OPTION_NAMES: tuple[str, ...] = (
    "roughness_m",
    "k_inlet",
    "k_nozzle",
    "nozzle_area_ratio",
    "jet_model",
    "electrode_drop_v",
    "chlorine_fraction",
    "wall_friction",
    "galvanic_offset_v",
    "gas_model",
    "gas_slip_ratio",
    "end_effects",
)
"""Loss and electrode options of :class:`DuctThruster` that every layout carries unchanged."""


def _pos(name: str, v: float) -> float:
    v = float(v)
    if not (math.isfinite(v) and v > 0.0):
        raise ModelRangeError(name, v, "finite and > 0", _MODEL)
    return v


@dataclass(frozen=True)
class EquivalentDuct(DuctThruster):
    """A :class:`DuctThruster` whose friction uses a given hydraulic diameter and aspect ratio.

    Adapter for layouts whose flow passage is not the duct's gap × height rectangle. All
    inherited fields keep their meaning (SI). Extra attributes:

    Attributes
    ----------
    dh_override_m : float
        Hydraulic diameter for friction and Reynolds number [m].
    aspect_override : float
        Short/long side ratio for the laminar f·Re (0 = parallel plates) [-].
    max_nozzle_ratio : float
        Upper limit on ``nozzle_area_ratio`` [-] (the helical jet needs r > 1.5).

    Notes
    -----
    Hook for the engine (issue 13): :class:`DuctThruster` could carry optional
    ``hydraulic_diameter_override_m`` and ``friction_aspect_ratio`` fields instead; the solver
    reads only the properties overridden here.

    References
    ----------
    Definition of the hydraulic diameter (White 2011, §6.8).
    """

    dh_override_m: float = 0.0
    aspect_override: float = 0.0
    max_nozzle_ratio: float = 1.5

    def __post_init__(self) -> None:
        base = {f.name: getattr(self, f.name) for f in fields(DuctThruster)}
        base.update(roughness_m=0.0, nozzle_area_ratio=1.0)
        DuctThruster(**base)  # every other check of the plain duct
        _pos("dh_override_m", self.dh_override_m)
        if not (0.0 <= self.aspect_override <= 1.0):
            raise ModelRangeError("aspect_override", self.aspect_override, "0 … 1", _MODEL)
        r = float(self.nozzle_area_ratio)
        if not (0.0 < r <= self.max_nozzle_ratio):
            raise ModelRangeError(
                "nozzle_area_ratio", r, f"0 < r ≤ {self.max_nozzle_ratio:g}", _MODEL
            )
        eps = float(self.roughness_m)
        if not (math.isfinite(eps) and 0.0 <= eps <= REL_ROUGHNESS_MAX * self.dh_override_m):
            raise ModelRangeError(
                "roughness_m", eps, f"0 … {REL_ROUGHNESS_MAX} × D_h = {self.dh_override_m} m"
            )

    @property
    def hydraulic_diameter_m(self) -> float:
        """Hydraulic diameter of the layout's passage [m]."""
        return self.dh_override_m

    @property
    def aspect_ratio(self) -> float:
        """Aspect ratio used for the laminar friction [-]."""
        return self.aspect_override


def _options(obj) -> dict:
    return {name: getattr(obj, name) for name in DUCT_OPTION_NAMES}


_DEFAULTS = {f.name: f.default for f in fields(DuctThruster) if f.name in DUCT_OPTION_NAMES}


@dataclass(frozen=True, kw_only=True)
class _WallOptions:
    """Loss and electrode options shared with :class:`DuctThruster` (same meanings and defaults),
    keyword-only so each layout keeps its own positional geometry first."""

    roughness_m: float = 0.0
    k_inlet: float = _DEFAULTS["k_inlet"]
    k_nozzle: float = _DEFAULTS["k_nozzle"]
    jet_model: str = _DEFAULTS["jet_model"]
    electrode_drop_v: float = _DEFAULTS["electrode_drop_v"]
    chlorine_fraction: float = _DEFAULTS["chlorine_fraction"]
    wall_friction: bool = _DEFAULTS["wall_friction"]
    galvanic_offset_v: float = _DEFAULTS["galvanic_offset_v"]
    gas_model: str = _DEFAULTS["gas_model"]
    gas_slip_ratio: float = _DEFAULTS["gas_slip_ratio"]
    end_effects: bool = _DEFAULTS["end_effects"]


@dataclass(frozen=True, kw_only=True)
class _DuctOptions(_WallOptions):
    """:class:`_WallOptions` plus the nozzle area ratio (layouts whose outlet is a plain duct)."""

    nozzle_area_ratio: float = _DEFAULTS["nozzle_area_ratio"]


# --------------------------------------------------------------------------------------------
# channel stack
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ChannelStack:
    """N short channels side by side sharing one magnet array.

    Attributes
    ----------
    channel : DuctThruster
        One channel of the stack (its ``n_channels`` must be 1) with its field, size and losses.
    n_stack : int
        Number of channels (≥ 1).
    wiring : str
        "parallel" (each channel across the full voltage) or "series" (bipolar walls: voltage
        split N ways, the same current through all).
    """

    channel: DuctThruster
    n_stack: int
    wiring: str = "parallel"

    def __post_init__(self) -> None:
        if self.channel.n_channels != 1:
            raise ModelRangeError("channel.n_channels", self.channel.n_channels, "1", _MODEL)
        if not (isinstance(self.n_stack, int | np.integer) and self.n_stack >= 1):
            raise ModelRangeError("n_stack", self.n_stack, "an integer ≥ 1", _MODEL)
        if self.wiring not in ("parallel", "series"):
            raise ModelRangeError("wiring", self.wiring, '"parallel" or "series"', _MODEL)


def stack_as_duct(stack: ChannelStack) -> DuctThruster:
    """The stack as a duct with ``n_channels = N`` (channels electrically in parallel).

    Parameters
    ----------
    stack : ChannelStack

    Returns
    -------
    DuctThruster
        Same channel, ``n_channels`` = N. For series wiring pass V/N (or N·I) to the solver and
        convert back (:func:`layout_operating_point` does this).

    References
    ----------
    Common practice (REFERENCES.md: splitting one channel into N parallel channels).
    """
    return replace(stack.channel, n_channels=int(stack.n_stack))


# --------------------------------------------------------------------------------------------
# annular thruster and ring of tubes
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class AnnularThruster(_DuctOptions):
    """Annular MHD thruster: radial current between ring electrodes, azimuthal field.

    Attributes
    ----------
    inner_radius_m, outer_radius_m : float
        Radii of the inner and outer ring electrodes (the annulus walls) [m].
    length_m : float
        Active axial length [m].
    b_tesla : float
        Azimuthal field at the mean radius (r1 + r2)/2 [T], ≥ 0.
    field_profile : str
        "toroidal" (B_θ ∝ 1/r, a toroidal winding) or "uniform" (B_θ constant).
    roughness_m, k_inlet, …, end_effects
        As in :class:`DuctThruster` (same defaults).
    """

    inner_radius_m: float
    outer_radius_m: float
    length_m: float
    b_tesla: float
    field_profile: str = "toroidal"

    def __post_init__(self) -> None:
        r1 = _pos("inner_radius_m", self.inner_radius_m)
        r2 = _pos("outer_radius_m", self.outer_radius_m)
        if not r2 > r1:
            raise ModelRangeError("outer_radius_m", r2, f"> inner_radius_m = {r1} m", _MODEL)
        _pos("length_m", self.length_m)
        if self.field_profile not in ("toroidal", "uniform"):
            raise ModelRangeError(
                "field_profile", self.field_profile, '"toroidal" or "uniform"', _MODEL
            )

    @property
    def flow_area_m2(self) -> float:
        """Annulus area π(r2² − r1²) [m²]."""
        return math.pi * (self.outer_radius_m**2 - self.inner_radius_m**2)

    @property
    def hydraulic_diameter_m(self) -> float:
        """Annulus hydraulic diameter 4A/P = 2(r2 − r1) [m]."""
        return 2.0 * (self.outer_radius_m - self.inner_radius_m)

    def electrolyte_resistance_ohm(self, sigma_s_m: float) -> float:
        """Resistance between the ring electrodes, ln(r2/r1)/(2πσL) [Ω].

        Parameters
        ----------
        sigma_s_m : float
            Conductivity [S/m].

        Returns
        -------
        float
            R [Ω].

        References
        ----------
        Ohm's law for a cylindrical shell (textbook).
        """
        return math.log(self.outer_radius_m / self.inner_radius_m) / (
            2.0 * math.pi * sigma_s_m * self.length_m
        )

    def force_per_ampere_n_a(self) -> float:
        """Axial Lorentz force per ampere of radial current, ∫J×B dV / I [N/A].

        Returns
        -------
        float
            B_m r_m ln(r2/r1) (toroidal) or B_m (r2 − r1) (uniform) [N/A].

        References
        ----------
        Way (1968); Lorentz force integrated over the annulus.
        """
        r1, r2 = self.inner_radius_m, self.outer_radius_m
        if self.field_profile == "toroidal":
            return self.b_tesla * 0.5 * (r1 + r2) * math.log(r2 / r1)
        return self.b_tesla * (r2 - r1)


def annular_as_duct(th: AnnularThruster) -> EquivalentDuct:
    """Equivalent straight duct of an annular thruster (exact R, force/A, EMF, area, volume).

    Parameters
    ----------
    th : AnnularThruster

    Returns
    -------
    EquivalentDuct
        gap_e = √(A ln(r2/r1)/(2π)), height_e = A/gap_e, B_e = (F/I)/gap_e, friction on
        D_h = 2(r2 − r1) with the parallel-plate laminar f·Re.

    Notes
    -----
    Straight duct: R = gap/(σ h L), F/I = B·gap, EMF/u = B·gap, area gap·h. Equating with the
    annulus gives the values above (module docstring). The duct's ``electric_field_v_m`` and
    ``current_density_a_m2`` are then those of the equivalent duct, not local values.

    References
    ----------
    Way (1968); Shah & London (1978).
    """
    area = th.flow_area_m2
    ln = math.log(th.outer_radius_m / th.inner_radius_m)
    gap_e = math.sqrt(area * ln / (2.0 * math.pi))
    return EquivalentDuct(
        gap_m=gap_e,
        height_m=area / gap_e,
        length_m=th.length_m,
        n_channels=1,
        b_tesla=th.force_per_ampere_n_a() / gap_e,
        dh_override_m=th.hydraulic_diameter_m,
        aspect_override=0.0,
        **_options(th),
    )


@dataclass(frozen=True)
class RingOfTubes(_DuctOptions):
    """Rectangular tubes on a ring in an azimuthal field (a variant of the annular thruster).

    Attributes
    ----------
    n_tubes : int
        Number of tubes round the ring (electrically in parallel).
    ring_radius_m : float
        Radius of the tubes' centres [m].
    radial_gap_m : float
        Electrode gap of each tube, along the radius (current radial) [m].
    height_m : float
        Tube size along the field (azimuthal) [m].
    length_m : float
        Active length (axial) [m].
    b_tesla : float
        Azimuthal field at the ring radius [T].
    field_profile : str
        "toroidal" (B ∝ 1/r, averaged over each tube's radial extent) or "uniform".
    roughness_m, …, end_effects
        As in :class:`DuctThruster`.
    """

    n_tubes: int
    ring_radius_m: float
    radial_gap_m: float
    height_m: float
    length_m: float
    b_tesla: float
    field_profile: str = "toroidal"

    def __post_init__(self) -> None:
        if not 2.0 * _pos("ring_radius_m", self.ring_radius_m) > _pos(
            "radial_gap_m", self.radial_gap_m
        ):
            raise ModelRangeError("radial_gap_m", self.radial_gap_m, "< 2 × ring_radius_m", _MODEL)
        if self.field_profile not in ("toroidal", "uniform"):
            raise ModelRangeError(
                "field_profile", self.field_profile, '"toroidal" or "uniform"', _MODEL
            )


def ring_of_tubes_as_duct(th: RingOfTubes) -> DuctThruster:
    """A ring of tubes as N straight channels in the tube-mean field.

    Parameters
    ----------
    th : RingOfTubes

    Returns
    -------
    DuctThruster
        ``n_channels`` = N, ``b_tesla`` = radial mean of B over a tube:
        B_R R ln(r2/r1)/(r2 − r1) (toroidal) or B_R (uniform), r1,2 = R ∓ gap/2.

    Notes
    -----
    With uniform J across a tube, force and EMF involve ∫B dr over the gap only, so the
    radial mean field is exact for both (the tubes are treated as straight, the curvature of
    the field lines across a tube's height is neglected: height ≪ 2πR/N).

    References
    ----------
    Way (1968).
    """
    r = th.ring_radius_m
    g = th.radial_gap_m
    b = th.b_tesla
    if th.field_profile == "toroidal":
        b = b * r * math.log((r + 0.5 * g) / (r - 0.5 * g)) / g
    return DuctThruster(
        gap_m=g,
        height_m=th.height_m,
        length_m=th.length_m,
        n_channels=int(th.n_tubes),
        b_tesla=b,
        **_options(th),
    )


# --------------------------------------------------------------------------------------------
# helical-channel thruster
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class HelicalThruster(_WallOptions):
    """Helical-channel MHD thruster: solenoid field, radial current, helical passages, stator.

    Attributes
    ----------
    inner_radius_m, outer_radius_m : float
        Annulus radii (the ring electrodes) [m].
    axial_length_m : float
        Active axial length [m].
    b_axial_tesla : float
        Axial field of the solenoid in the annulus [T] (e.g. from
        :func:`sim.physics.fields.solenoid_field_t`).
    helix_angle_deg : float
        Angle between the passages and the azimuthal direction, 0 < φ ≤ 90 [°] (90: axial).
    n_vanes : int
        Number of helical vanes (passages) [-], for the passage hydraulic diameter.
    stator_recovery : float
        Fraction of the swirl kinetic energy the stator returns to the axial jet, 0…1 [-];
        default 0.6 (from memory: half to three quarters for stator vanes).
    roughness_m, …, end_effects
        As in :class:`DuctThruster`.
    """

    inner_radius_m: float
    outer_radius_m: float
    axial_length_m: float
    b_axial_tesla: float
    helix_angle_deg: float
    n_vanes: int = 8
    stator_recovery: float = 0.6

    def __post_init__(self) -> None:
        r1 = _pos("inner_radius_m", self.inner_radius_m)
        if not _pos("outer_radius_m", self.outer_radius_m) > r1:
            raise ModelRangeError("outer_radius_m", self.outer_radius_m, "> inner_radius_m")
        _pos("axial_length_m", self.axial_length_m)
        if not (0.0 < float(self.helix_angle_deg) <= 90.0):
            raise ModelRangeError("helix_angle_deg", self.helix_angle_deg, "0 < φ ≤ 90 °", _MODEL)
        if not (isinstance(self.n_vanes, int | np.integer) and self.n_vanes >= 1):
            raise ModelRangeError("n_vanes", self.n_vanes, "an integer ≥ 1", _MODEL)
        if not (0.0 <= float(self.stator_recovery) <= 1.0):
            raise ModelRangeError("stator_recovery", self.stator_recovery, "0 … 1", _MODEL)
        if self.jet_model != "ducted":
            raise ModelRangeError("jet_model", self.jet_model, '"ducted" (stator and nozzle)')


def helical_as_duct(th: HelicalThruster) -> EquivalentDuct:
    """Equivalent straight duct of a helical-channel thruster.

    Parameters
    ----------
    th : HelicalThruster

    Returns
    -------
    EquivalentDuct
        gap_e = √(A ln(r2/r1)/(2π)), passage area A sin φ, length L/sin φ, field
        B_z cos φ (r2 − r1)/gap_e; nozzle ratio r = 1/√(sin²φ + η_s cos²φ) and nozzle loss
        K = r²(1 − η_s)cos²φ + k_nozzle; friction on the passage hydraulic diameter.

    Notes
    -----
    Resistance ln(r2/r1)/(2πσL) and force per ampere B_z cos φ (r2 − r1) along the passages
    (module docstring). The duct's ``duct_velocity_m_s`` is the passage speed w; the axial
    velocity through the annulus is w sin φ.

    References
    ----------
    Way (1968); Carlton (2012) (stator recovery, from memory).
    """
    phi = math.radians(float(th.helix_angle_deg))
    s, c = math.sin(phi), math.cos(phi)
    r1, r2 = th.inner_radius_m, th.outer_radius_m
    g = r2 - r1
    area = math.pi * (r2**2 - r1**2)
    ln = math.log(r2 / r1)
    gap_e = math.sqrt(area * ln / (2.0 * math.pi))
    eta = float(th.stator_recovery)
    jet2 = s * s + eta * c * c
    if jet2 <= 0.0:
        raise ModelRangeError(
            "stator_recovery", eta, "> 0 when helix_angle_deg is small (no jet)", _MODEL
        )
    r_noz = 1.0 / math.sqrt(jet2)
    passage_w = 2.0 * math.pi * 0.5 * (r1 + r2) * s / int(th.n_vanes)
    dh = 2.0 * g * passage_w / (g + passage_w)
    opts = {k: getattr(th, k) for k in DUCT_OPTION_NAMES if k != "nozzle_area_ratio"}
    opts["k_nozzle"] = r_noz**2 * (1.0 - eta) * c * c + float(th.k_nozzle)
    return EquivalentDuct(
        gap_m=gap_e,
        height_m=area * s / gap_e,
        length_m=th.axial_length_m / s,
        n_channels=1,
        b_tesla=th.b_axial_tesla * c * g / gap_e,
        nozzle_area_ratio=r_noz,
        dh_override_m=dh,
        aspect_override=min(g, passage_w) / max(g, passage_w),
        max_nozzle_ratio=max(1.5, r_noz),
        **opts,
    )


def helical_swirl_loss_w(th: HelicalThruster, point: ThrusterOperatingPoint) -> np.ndarray:
    """Swirl kinetic energy the stator does not recover [W] (inside ``friction_loss_w``).

    Parameters
    ----------
    th : HelicalThruster
    point : ThrusterOperatingPoint
        Result of :func:`layout_operating_point` for ``th``.

    Returns
    -------
    ndarray
        ½ ṁ (1 − η_s)(w cos φ)² for forward flow [W] (0 in reverse flow).

    References
    ----------
    Kinetic energy of the swirl (module docstring).
    """
    c = math.cos(math.radians(float(th.helix_angle_deg)))
    w = np.asarray(point.duct_velocity_m_s)
    mdot = np.asarray(point.mass_flow_kg_s)
    loss = 0.5 * mdot * (1.0 - th.stator_recovery) * (w * c) ** 2
    return np.where(w > 0.0, loss, 0.0)


# --------------------------------------------------------------------------------------------
# one entry point
# --------------------------------------------------------------------------------------------

Layout = ChannelStack | AnnularThruster | RingOfTubes | HelicalThruster | DuctThruster


def layout_operating_point(
    layout: Layout,
    water: WaterState,
    speed_m_s,
    *,
    voltage_v=None,
    current_a=None,
    thermal_feedback: bool = True,
) -> ThrusterOperatingPoint:
    """Steady operating point of any layout, as for a straight duct.

    Parameters
    ----------
    layout : ChannelStack, AnnularThruster, RingOfTubes, HelicalThruster or DuctThruster
    water : WaterState
        Inlet water.
    speed_m_s : float or array
        Vessel speed [m/s].
    voltage_v, current_a : float or array, optional
        Exactly one: supply voltage [V] or total supply current [A].
    thermal_feedback : bool
        As in :func:`sim.physics.thruster.operating_point`.

    Returns
    -------
    ThrusterOperatingPoint
        Supply voltage and current are the layout's terminal values (a series stack reports
        N·V_channel and the string current); geometry-dependent fields (electric field,
        current density, duct velocity) are those of the equivalent duct.

    References
    ----------
    See the module docstring; Way (1968).
    """
    if isinstance(layout, ChannelStack):
        duct = stack_as_duct(layout)
        if layout.wiring == "series":
            n = float(layout.n_stack)
            v = None if voltage_v is None else np.asarray(voltage_v, dtype=float) / n
            i = None if current_a is None else np.asarray(current_a, dtype=float) * n
            p = operating_point(
                duct, water, speed_m_s, voltage_v=v, current_a=i, thermal_feedback=thermal_feedback
            )
            return replace(
                p,
                current_a=p.current_a / n,
                voltage_v=p.voltage_v * n,
                end_current_a=p.end_current_a / n,
            )
    elif isinstance(layout, AnnularThruster):
        duct = annular_as_duct(layout)
    elif isinstance(layout, RingOfTubes):
        duct = ring_of_tubes_as_duct(layout)
    elif isinstance(layout, HelicalThruster):
        duct = helical_as_duct(layout)
    elif isinstance(layout, DuctThruster):
        duct = layout
    else:
        raise ModelRangeError("layout", type(layout).__name__, "a thruster layout", _MODEL)
    return operating_point(
        duct,
        water,
        speed_m_s,
        voltage_v=voltage_v,
        current_a=current_a,
        thermal_feedback=thermal_feedback,
    )
