r"""Open-field (ductless) MHD thruster: electrodes and magnets on the hull, force in the sea.

A published concept: Way (1968) discussed an external-field submarine whose field and current
act in the water round the hull, and Convert & Thibault (1995) studied arrays of electrodes and
magnets on a flat wall. This module gives a 2-D periodic model of such an array; the user
describes the arrays in general terms (pitch, strip widths, count, magnet strength, depth of the
magnets below the wetted surface), not one fixed arrangement.

Model and assumptions (stated plainly)
--------------------------------------
* Flat hull, water in z > 0; x along the flow (pointing astern), y across it. Both arrays are
  strips running along x, of length ``array_length_m``, repeating across y with the SAME pitch
  p (period λ = 2p: neighbouring strips alternate in polarity). The arrays are treated as
  infinitely periodic in y (edge strips are not special) and uniform along x (no end effects).
* Electrodes: strips of width w_e flush with the hull, alternately anode and cathode, each
  anode feeding the same current, spread UNIFORMLY over its face (a prescribed-current
  electrode; a real equipotential electrode crowds current to its edges and has a somewhat
  lower resistance). The current in the water is the potential flow from that boundary
  condition (σ uniform): J = Σ_n j_n e^{−k_n z}(sin k_n y, cos k_n y), k_n = nπ/p, n odd,
  j_n = (4J0/(nπ)) sin(nπ w_e/(2p)).
* Magnets: strips of width w_m and thickness t, magnetised ±z alternately, their top faces a
  depth d below the wetted surface (hull plating, the "gap"), centred a distance
  ``magnet_offset_m`` from the electrode centres across y. Field above (charge model, exact
  for recoil permeability 1): B = Σ_n b_n e^{−k_n z}(sin k_n(y − y0), cos k_n(y − y0)),
  b_n = (2Br/(nπ)) sin(nπ w_m/(2p)) (1 − e^{−k_n t}) e^{−k_n d}.
* J and B both turn with y and z and are not everywhere at right angles. The axial force
  density is (J×B)_x = J_y B_z − J_z B_y; averaged over a period only equal harmonics survive,
  so per unit hull area f = Σ_n j_n b_n sin(k_n y0)/(2k_n): largest at a quarter-period offset
  (y0 = p/2), zero when magnets sit over the electrodes. Both decay like e^{−k z}, the force
  like e^{−2kz}. :func:`force_per_area_pa` evaluates this series or integrates numerically
  over one period and z (the check in the tests).
* Joule loss per unit area Σ_n j_n²/(2σk_n); the resistance follows from I²R. The back EMF
  follows from reciprocity (the model is linear): V_emf = (F/I)·V0, so that
  V·I = electrode loss + I²R + F·V0 exactly.
* The water moves past the hull at the ship speed V0 through the whole active layer (the
  boundary-layer profile and the induced velocity are neglected for the back EMF; the induced
  velocity ratio Δu/V0 = F/(ρV0²W/(2k1)) is reported so the user can see when it is not small).
* No duct friction. The accelerated layer changes the hull's friction. MODEL (an assumption,
  not from a source): a share κ of the Lorentz force that acts inside the turbulent boundary
  layer, thickness δ = 0.37x·Re_x^(−1/5) at the array's middle (flat plate, 1/7-power law,
  common practice), goes to the wall as extra shear drag: ΔD = κ F (1 − e^{−2k1δ}). Default
  κ = 0.5; set it to 0 to switch the effect off.

References
----------
.. [1] Way, S. (1968). Electromagnetic propulsion for cargo submarines. Journal of Hydronautics
   2(2), 49–57. doi:10.2514/3.62773
.. [2] Convert, D. & Thibault, J.-P. (1995). Propulsion magnétohydrodynamique en eau de mer
   (external-field arrays on a wall); cited as a published concept, values not used
   (attribution from memory).
.. [3] Furlani, E. P. (2001). Permanent Magnet and Electromechanical Devices. Academic Press
   (field of periodic magnet arrays, charge model).
.. [4] Schlichting, H. & Gersten, K. (2017). Boundary-Layer Theory, 9th ed., Springer
   (turbulent flat-plate thickness δ = 0.37x Re_x^(−1/5)).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sim.physics.electrochem import gas_rates_mol_s
from sim.physics.errors import ModelRangeError
from sim.physics.seawater import WaterState

__all__ = [
    "OpenFieldArray",
    "OpenFieldConstants",
    "OpenFieldPoint",
    "fields_at",
    "force_per_area_pa",
    "hull_friction_change_n",
    "open_field_operating_point",
    "open_field_point",
    "prepare_open_field",
    "resistance_ohm",
    "surface_field_t",
]

_MODEL = "open-field thruster"


def _pos(name: str, v: float) -> float:
    v = float(v)
    if not (math.isfinite(v) and v > 0.0):
        raise ModelRangeError(name, v, "finite and > 0", _MODEL)
    return v


@dataclass(frozen=True)
class OpenFieldArray:
    """Electrode and magnet arrays on a flat hull (general terms).

    Attributes
    ----------
    pitch_m : float
        Centre distance between neighbouring electrode strips, = that of the magnet strips [m].
    electrode_width_m : float
        Width of each electrode strip (≤ pitch) [m].
    n_electrodes : int
        Number of electrode strips (≥ 2; half anodes); the array spans n·pitch across.
    array_length_m : float
        Length of the strips along the flow [m].
    br_t : float
        Remanence of the magnet strips [T] (≥ 0).
    magnet_width_m : float
        Width of each magnet strip (≤ pitch) [m].
    magnet_thickness_m : float
        Thickness of the magnet strips [m].
    magnet_depth_m : float
        Distance from the magnets' top faces to the wetted surface (hull plating) [m], ≥ 0.
    magnet_offset_m : float
        Offset of the magnet strip centres from the electrode centres across the flow [m];
        default: half the pitch (a quarter period, largest force).
    position_from_bow_m : float
        Distance from the bow to the middle of the array, for the boundary layer [m].
    bl_friction_share : float
        κ of the boundary-layer friction model (module docstring), 0…1; default 0.5.
    """

    pitch_m: float
    electrode_width_m: float
    n_electrodes: int
    array_length_m: float
    br_t: float
    magnet_width_m: float
    magnet_thickness_m: float
    magnet_depth_m: float
    magnet_offset_m: float | None = None
    position_from_bow_m: float = 5.0
    bl_friction_share: float = 0.5

    def __post_init__(self) -> None:
        p = _pos("pitch_m", self.pitch_m)
        for name in ("electrode_width_m", "magnet_width_m"):
            if not (0.0 < float(getattr(self, name)) <= p):
                raise ModelRangeError(name, getattr(self, name), f"0 < w ≤ pitch_m = {p}", _MODEL)
        if not (isinstance(self.n_electrodes, int | np.integer) and self.n_electrodes >= 2):
            raise ModelRangeError("n_electrodes", self.n_electrodes, "an integer ≥ 2", _MODEL)
        _pos("array_length_m", self.array_length_m)
        _pos("magnet_thickness_m", self.magnet_thickness_m)
        _pos("position_from_bow_m", self.position_from_bow_m)
        if not (math.isfinite(self.br_t) and self.br_t >= 0.0):
            raise ModelRangeError("br_t", self.br_t, "finite and ≥ 0 T", _MODEL)
        if not (math.isfinite(self.magnet_depth_m) and self.magnet_depth_m >= 0.0):
            raise ModelRangeError("magnet_depth_m", self.magnet_depth_m, "≥ 0 m", _MODEL)
        if not (0.0 <= self.bl_friction_share <= 1.0):
            raise ModelRangeError("bl_friction_share", self.bl_friction_share, "0 … 1", _MODEL)

    @property
    def offset_m(self) -> float:
        """Magnet offset used [m] (half the pitch unless given)."""
        return 0.5 * self.pitch_m if self.magnet_offset_m is None else float(self.magnet_offset_m)

    @property
    def span_m(self) -> float:
        """Width of the array across the flow, n·pitch [m]."""
        return self.n_electrodes * self.pitch_m

    @property
    def area_m2(self) -> float:
        """Hull area covered by the array [m²]."""
        return self.span_m * self.array_length_m

    def anode_current_density_a_m2(self, current_a: float) -> float:
        """Current density on each anode face for a total supply current [A/m²]."""
        n_anodes = 0.5 * self.n_electrodes
        return float(current_a) / (n_anodes * self.electrode_width_m * self.array_length_m)


def _harmonics(arr: OpenFieldArray, n_harmonics: int):
    if not (isinstance(n_harmonics, int) and 1 <= n_harmonics <= 2000):
        raise ModelRangeError("n_harmonics", n_harmonics, "an integer 1…2000", _MODEL)
    n = 2.0 * np.arange(n_harmonics) + 1.0
    p = arr.pitch_m
    k = n * np.pi / p
    j_shape = 4.0 / (n * np.pi) * np.sin(n * np.pi * arr.electrode_width_m / (2.0 * p))
    b = (
        2.0
        * arr.br_t
        / (n * np.pi)
        * np.sin(n * np.pi * arr.magnet_width_m / (2.0 * p))
        * (1.0 - np.exp(-k * arr.magnet_thickness_m))
        * np.exp(-k * arr.magnet_depth_m)
    )
    return k, j_shape, b


def fields_at(
    arr: OpenFieldArray, current_a: float, y_m, z_m, *, n_harmonics: int = 200
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Current density and magnetic field in the water above the arrays.

    Parameters
    ----------
    arr : OpenFieldArray
    current_a : float
        Total supply current [A].
    y_m, z_m : float or array
        Position across the flow from an anode centre, and height above the hull [m], z ≥ 0.
    n_harmonics : int
        Odd harmonics kept.

    Returns
    -------
    (j_y, j_z, b_y, b_z) : ndarrays
        [A/m²] and [T].

    References
    ----------
    Potential flow of current and charge-model field (module docstring); Furlani (2001).
    """
    k, js, b = _harmonics(arr, n_harmonics)
    j0 = arr.anode_current_density_a_m2(current_a)
    y = np.asarray(y_m, dtype=float)[..., None]
    z = np.asarray(z_m, dtype=float)[..., None]
    if np.any(z < 0.0):
        raise ModelRangeError("z_m", "negative", "z ≥ 0 (water side)", _MODEL)
    ez = np.exp(-k * z)
    jy = np.sum(j0 * js * ez * np.sin(k * y), axis=-1)
    jz = np.sum(j0 * js * ez * np.cos(k * y), axis=-1)
    yy = y - arr.offset_m
    by = np.sum(b * ez * np.sin(k * yy), axis=-1)
    bz = np.sum(b * ez * np.cos(k * yy), axis=-1)
    return jy, jz, by, bz


def force_per_area_pa(
    arr: OpenFieldArray,
    current_a: float,
    *,
    method: str = "series",
    n_harmonics: int = 200,
    n_y: int = 64,
    n_z: int = 48,
) -> float:
    """Axial Lorentz force on the water per unit hull area, ∫(J×B)_x dz averaged over y [Pa].

    Parameters
    ----------
    arr : OpenFieldArray
    current_a : float
        Total supply current [A].
    method : str
        "series" (closed form per harmonic) or "quadrature" (numerical: trapezoid rule over one
        period in y, spectrally accurate for periodic integrands, and Gauss–Laguerre in z
        scaled to the decay of the fundamental).
    n_harmonics, n_y, n_z : int
        Harmonics kept; quadrature points.

    Returns
    -------
    float
        f [N/m²] (> 0: force on the water astern, thrust ahead).

    Notes
    -----
    f = Σ_n j_n b_n sin(k_n y0)/(2k_n) (series); the quadrature evaluates
    (1/λ)∫₀^λ∫₀^∞ (J_y B_z − J_z B_y) dz dy from :func:`fields_at`.

    References
    ----------
    Module docstring; Abramowitz & Stegun (1964) §25.4.45 (Gauss–Laguerre).
    """
    if method == "series":
        k, js, b = _harmonics(arr, n_harmonics)
        j0 = arr.anode_current_density_a_m2(current_a)
        return float(np.sum(j0 * js * b * np.sin(k * arr.offset_m) / (2.0 * k)))
    if method != "quadrature":
        raise ModelRangeError("method", method, '"series" or "quadrature"', _MODEL)
    lam = 2.0 * arr.pitch_m
    k1 = math.pi / arr.pitch_m
    y = np.arange(n_y) * lam / n_y
    s, w = np.polynomial.laguerre.laggauss(n_z)
    z = s / (2.0 * k1)
    yy, zz = np.meshgrid(y, z, indexing="ij")
    jy, jz, by, bz = fields_at(arr, current_a, yy, zz, n_harmonics=n_harmonics)
    fx = jy * bz - jz * by
    return float(np.mean(np.sum(fx * (w * np.exp(s))[None, :], axis=1)) / (2.0 * k1))


def resistance_ohm(arr: OpenFieldArray, sigma_s_m: float, *, n_harmonics: int = 2000) -> float:
    """Resistance of the water between the anodes and cathodes [Ω].

    Parameters
    ----------
    arr : OpenFieldArray
    sigma_s_m : float
        Conductivity [S/m].
    n_harmonics : int
        Harmonics kept (the series converges like 1/n²; 2000 gives about 1e-4 relative).

    Returns
    -------
    float
        R = P_Joule/I² with P_Joule = A Σ_n j_n²/(2σk_n) [Ω].

    References
    ----------
    Module docstring (prescribed uniform current on the electrodes).
    """
    sig = _pos("sigma_s_m", sigma_s_m)
    k, js, _ = _harmonics(arr, n_harmonics)
    j0 = arr.anode_current_density_a_m2(1.0)
    return float(arr.area_m2 * np.sum((j0 * js) ** 2 / (2.0 * sig * k)))


@dataclass(frozen=True)
class OpenFieldPoint:
    """Steady operating point of an open-field array (names as in ThrusterOperatingPoint).

    Attributes
    ----------
    thrust_n : float
        Net thrust: Lorentz force less the boundary-layer friction increase [N].
    lorentz_force_n : float
        f·A [N].
    hull_friction_change_n : float
        ΔD of the boundary-layer model [N] (≥ 0).
    current_a, voltage_v : float
        Supply current [A] and voltage [V].
    back_emf_v : float
        (F/I)·V0 [V].
    resistance_ohm : float
        Water resistance [Ω].
    electrical_power_w, joule_loss_w, electrode_loss_w : float
        V·I, I²R, V_d|I| + V_g I [W].
    flow_work_w : float
        F·V0, the Lorentz work on the passing water [W].
    useful_power_w : float
        thrust·V0 [W].
    eta_electrical, eta_overall : float
        flow work/(V·I), thrust·V0/(V·I) [-] (0 unless both positive).
    induced_velocity_ratio : float
        Δu/V0 = F/(ρ V0² W/(2k1)) [-] (inf at V0 = 0): the model assumes it is small.
    h2_mol_s, cl2_mol_s, o2_mol_s : float
        Gas evolution [mol/s].
    """

    thrust_n: float
    lorentz_force_n: float
    hull_friction_change_n: float
    current_a: float
    voltage_v: float
    back_emf_v: float
    resistance_ohm: float
    electrical_power_w: float
    joule_loss_w: float
    electrode_loss_w: float
    flow_work_w: float
    useful_power_w: float
    eta_electrical: float
    eta_overall: float
    induced_velocity_ratio: float
    h2_mol_s: float
    cl2_mol_s: float
    o2_mol_s: float


def open_field_operating_point(
    arr: OpenFieldArray,
    water: WaterState,
    speed_m_s: float,
    *,
    voltage_v: float | None = None,
    current_a: float | None = None,
    electrode_drop_v: float = 2.0,
    galvanic_offset_v: float = 0.0,
    chlorine_fraction: float = 1.0,
) -> OpenFieldPoint:
    """Operating point of an open-field array under voltage or current control.

    Parameters
    ----------
    arr : OpenFieldArray
    water : WaterState
        Water at the hull.
    speed_m_s : float
        Ship speed V0 ≥ 0 [m/s].
    voltage_v, current_a : float, optional
        Exactly one of supply voltage [V] and current [A].
    electrode_drop_v, galvanic_offset_v, chlorine_fraction : float
        As in :class:`sim.physics.thruster.DuctThruster`.

    Returns
    -------
    OpenFieldPoint

    Notes
    -----
    V = I R + c V0 + V_g + sign(I) V_d with c = F/I (reciprocity), no current inside the dead
    band |V − V_g − cV0| ≤ V_d. ΔD = κ F (1 − e^{−2k1δ}), δ = 0.37 x Re_x^(−1/5).

    References
    ----------
    Way (1968); Schlichting & Gersten (2017); module docstring.
    """
    if (voltage_v is None) == (current_a is None):
        raise ModelRangeError("command", (voltage_v, current_a), "exactly one of voltage/current")
    v0 = float(speed_m_s)
    if not (math.isfinite(v0) and v0 >= 0.0):
        raise ModelRangeError("speed_m_s", v0, "finite and ≥ 0 m/s", _MODEL)
    return open_field_point(
        prepare_open_field(arr, water),
        v0,
        voltage_v=voltage_v,
        current_a=current_a,
        electrode_drop_v=electrode_drop_v,
        galvanic_offset_v=galvanic_offset_v,
        chlorine_fraction=chlorine_fraction,
    )


@dataclass(frozen=True)
class OpenFieldConstants:
    """What an operating point of an open-field array needs, computed once per array and water
    (:func:`prepare_open_field`).

    Attributes
    ----------
    resistance_ohm : float
        Water resistance between the electrodes [Ω] (:func:`resistance_ohm`).
    force_per_ampere_n_a : float
        Lorentz force per ampere at the array's remanence, c = f(1 A)·A [N/A].
    k1_per_m : float
        Wavenumber of the fundamental, π/pitch [1/m].
    span_m : float
        Width of the array across the flow [m].
    position_from_bow_m : float
        Bow to the middle of the array [m].
    bl_friction_share : float
        κ of the boundary-layer friction model [-].
    rho_kg_m3, nu_m2_s : float
        Density [kg/m³] and kinematic viscosity [m²/s] of the water.
    """

    resistance_ohm: float
    force_per_ampere_n_a: float
    k1_per_m: float
    span_m: float
    position_from_bow_m: float
    bl_friction_share: float
    rho_kg_m3: float
    nu_m2_s: float


def prepare_open_field(arr: OpenFieldArray, water: WaterState) -> OpenFieldConstants:
    """The constants of :func:`open_field_point` for one array in one water.

    Parameters
    ----------
    arr : OpenFieldArray
    water : WaterState

    Returns
    -------
    OpenFieldConstants

    References
    ----------
    Module docstring (resistance series and force series).
    """
    return OpenFieldConstants(
        resistance_ohm=resistance_ohm(arr, water.sigma_s_m),
        force_per_ampere_n_a=force_per_area_pa(arr, 1.0) * arr.area_m2,
        k1_per_m=math.pi / arr.pitch_m,
        span_m=arr.span_m,
        position_from_bow_m=arr.position_from_bow_m,
        bl_friction_share=arr.bl_friction_share,
        rho_kg_m3=water.rho_kg_m3,
        nu_m2_s=water.nu_m2_s,
    )


def surface_field_t(arr: OpenFieldArray) -> float:
    """Amplitude of the fundamental of B at the wetted surface [T] (the field the water meets,
    a single number for logs): b_1 = (2Br/π) sin(π w_m/(2p)) (1 − e^{−k1 t}) e^{−k1 d}.

    Parameters
    ----------
    arr : OpenFieldArray

    Returns
    -------
    float
        [T]

    References
    ----------
    Furlani (2001), charge model of a periodic array (module docstring).
    """
    return float(_harmonics(arr, 1)[2][0])


def hull_friction_change_n(c: OpenFieldConstants, force_n: float, speed_m_s: float) -> float:
    """Extra hull friction drag from the layer the array accelerates [N] (≥ 0).

    Parameters
    ----------
    c : OpenFieldConstants
    force_n : float
        Lorentz force on the water [N].
    speed_m_s : float
        Ship speed through the water [m/s] (its magnitude sets the boundary layer).

    Returns
    -------
    float
        ΔD = κ|F|(1 − e^{−2k1δ}), δ = 0.37x Re_x^(−1/5) (|F|·κ at zero speed).

    References
    ----------
    Schlichting & Gersten (2017) (turbulent flat plate); the share κ is a model assumption
    (module docstring).
    """
    v0 = abs(float(speed_m_s))
    if force_n == 0.0:
        return 0.0
    if v0 > 0.0:
        x = c.position_from_bow_m
        delta = 0.37 * x * (v0 * x / c.nu_m2_s) ** -0.2
        return c.bl_friction_share * abs(force_n) * (1.0 - math.exp(-2.0 * c.k1_per_m * delta))
    return c.bl_friction_share * abs(force_n)


def open_field_point(
    c: OpenFieldConstants,
    speed_m_s: float,
    *,
    voltage_v: float | None = None,
    current_a: float | None = None,
    field_scale: float = 1.0,
    electrode_drop_v: float = 2.0,
    galvanic_offset_v: float = 0.0,
    chlorine_fraction: float = 1.0,
    anodic_gas: bool = True,
) -> OpenFieldPoint:
    """Operating point of an open-field array from its constants (the fast path of
    :func:`open_field_operating_point`; the ship may also move astern, V0 < 0).

    Parameters
    ----------
    c : OpenFieldConstants
    speed_m_s : float
        Ship speed through the water V0 [m/s] (negative astern).
    voltage_v, current_a : float, optional
        Exactly one of supply voltage [V] and current [A].
    field_scale : float
        Field over the field at the array's remanence [-] (magnet temperature); the force per
        ampere scales with it, the resistance does not.
    electrode_drop_v, galvanic_offset_v, chlorine_fraction : float
        As in :class:`sim.physics.thruster.DuctThruster`.
    anodic_gas : bool
        False for a sacrificial anode (it dissolves: no O2 or Cl2; H2 at the cathode stays).

    Returns
    -------
    OpenFieldPoint

    Notes
    -----
    V = I R + c V0 + V_g + sign(I) V_d, no current inside the dead band |V − V_g − cV0| ≤ V_d;
    V·I = electrode loss + I²R + F·V0 exactly.

    References
    ----------
    Way (1968); module docstring.
    """
    v0 = float(speed_m_s)
    vd = float(electrode_drop_v)
    vg = float(galvanic_offset_v)
    r = c.resistance_ohm
    cf = c.force_per_ampere_n_a * float(field_scale)
    if current_a is not None:
        i = float(current_a)
        v = i * r + cf * v0 + vg + (math.copysign(vd, i) if i != 0.0 else 0.0)
    else:
        v = float(voltage_v)
        net = v - vg - cf * v0
        i = math.copysign(max(abs(net) - vd, 0.0), net) / r
    force = cf * i
    av = abs(v0)
    if av > 0.0:
        ratio = abs(force) / (c.rho_kg_m3 * av * av * c.span_m / (2.0 * c.k1_per_m))
    else:
        ratio = math.inf if force != 0.0 else 0.0
    d_drag = hull_friction_change_n(c, force, v0)
    thrust = force - math.copysign(d_drag, force) if force != 0.0 else 0.0
    p_el = v * i
    joule = i * i * r
    electrode = vd * abs(i) + vg * i
    flow = force * v0
    useful = thrust * v0
    h2, cl2, o2 = gas_rates_mol_s(i, chlorine_fraction)
    if not anodic_gas:
        cl2 = o2 = 0.0
    return OpenFieldPoint(
        thrust_n=thrust,
        lorentz_force_n=force,
        hull_friction_change_n=d_drag,
        current_a=i,
        voltage_v=v,
        back_emf_v=cf * v0,
        resistance_ohm=r,
        electrical_power_w=p_el,
        joule_loss_w=joule,
        electrode_loss_w=electrode,
        flow_work_w=flow,
        useful_power_w=useful,
        eta_electrical=flow / p_el if flow > 0.0 and p_el > 0.0 else 0.0,
        eta_overall=useful / p_el if useful > 0.0 and p_el > 0.0 else 0.0,
        induced_velocity_ratio=ratio,
        h2_mol_s=float(h2),
        cl2_mol_s=float(cl2),
        o2_mol_s=float(o2),
    )
