r"""Magnetic field from hardware: permanent-magnet assemblies, electromagnet coils, coil losses,
superconducting-coil cryogenics and the channel-mean field that drives the thrust.

The thrust of a channel with uniform current density J along x in a field B(x, y, z) is
F = ∫ J × B dV; for J uniform across the gap its axial part is J·∫B_z dV = J·V·⟨B_z⟩, so the
field that enters the duct model is the volume mean of the field component along the pole axis
(:func:`channel_mean_field_t`). Non-uniformity lowers ⟨B_z⟩ below the centre value.

Layout of a rectangular channel (as in :mod:`sim.physics.magnet_gap`): centred at the origin,
x across it (the electrode gap), y along the flow, z along the field (pole axis).

Permanent magnets
-----------------
Without iron the field is the superposition of uniformly magnetised blocks (charge model,
:mod:`sim.physics.magnet_gap`), exact for recoil permeability 1 and checked against magpylib.
With a steel return yoke (back plates behind each block joined by a frame) a magnetic-circuit
estimate is used (stated in :func:`yoke_gap_field_t`).

Electromagnets
--------------
Filamentary Biot–Savart fields: straight segments (closed form of Hanson & Hirshman 2002),
circular loops (elliptic integrals, Simpson et al. 2001), racetrack coils as polylines with
many-sided ends, finite solenoids (on-axis closed form; off-axis by loop superposition) and
toroidal windings (B = μ0NI/(2πr), Ampère's law). A winding of N turns carrying I is one
filament carrying N·I (the ampere-turns); the spread of a real winding is neglected, which is
good to a few per cent at distances larger than the winding cross-section.

References
----------
.. [1] Furlani, E. P. (2001). Permanent Magnet and Electromechanical Devices. Academic Press,
   San Diego. (Charge model; magnetic circuits with leakage, ch. 3.)
.. [2] Parker, R. J. (1990). Advances in Permanent Magnetism. Wiley, New York. (Load line and
   leakage coefficient of a magnetic circuit; attribution from memory.)
.. [3] Ortner, M. & Coliado Bandeira, L. G. (2020). Magpylib: A free Python package for magnetic
   field computation. SoftwareX 11, 100466. doi:10.1016/j.softx.2020.100466 (cross-checks).
.. [4] Hanson, J. D. & Hirshman, S. P. (2002). Compact expressions for the Biot–Savart fields of
   a filamentary segment. Physics of Plasmas 9(10), 4410–4412. doi:10.1063/1.1507589
.. [5] Simpson, J. C., Lane, J. E., Immer, C. D. & Youngquist, R. C. (2001). Simple analytic
   expressions for the magnetic field of a circular current loop. NASA Technical Memorandum
   NASA/TM-2013-217919 (KSC, first issued 2001).
.. [6] Wilson, M. N. (1983). Superconducting Magnets. Clarendon Press, Oxford. (Load line and
   critical surface of NbTi, current-lead heat load; values from memory.)
.. [7] Moon, F. C. (1982). The virial theorem and scaling laws for superconducting magnet
   systems. Journal of Applied Physics 53(12), 9112–9121. doi:10.1063/1.330423
.. [8] ter Brake, H. J. M. & Wiegerinck, G. F. M. (2002). Low-power cryocooler survey.
   Cryogenics 42(11), 705–718. doi:10.1016/S0011-2275(02)00142-5 (efficiency as a fraction of
   Carnot; value used from memory).
.. [9] IEC 60028 (1925) International standard of resistance for copper (annealed copper,
   1/58 Ω·mm²/m at 20 °C, temperature coefficient 0.00393 /K).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError
from sim.physics.magnet_gap import facing_blocks_field_z_t
from sim.physics.magnets import MagnetGrade, remanence_t

__all__ = [
    "CONDUCTORS",
    "MU0",
    "NBTI_4K2",
    "Conductor",
    "CryoLoad",
    "LoadLineMargin",
    "MagnetPairField",
    "NbTiCritical",
    "channel_mean_field_t",
    "circular_loop_field_t",
    "coil_joule_w",
    "coil_pair_mean_field_t",
    "coil_resistance_ohm",
    "cold_mass_virial_kg",
    "conductor_resistivity_ohm_m",
    "cryocooler_input_power_w",
    "facing_pair_field",
    "load_line_margin",
    "nbti_critical_current_density_a_m2",
    "polyline_field_t",
    "racetrack_vertices_m",
    "segment_field_t",
    "solenoid_field_t",
    "solenoid_on_axis_field_t",
    "stored_energy_j",
    "superconducting_cryo_load",
    "toroidal_field_t",
    "yoke_gap_field_t",
    "yoke_leakage_coefficient",
]

MU0 = 1.25663706212e-6
"""Vacuum permeability [H/m] (CODATA 2018)."""

NDFEB_RECOIL_PERMEABILITY = 1.05
"""Relative recoil permeability of sintered NdFeB [-] (common practice: 1.03…1.10)."""

_MODEL = "field from hardware"


def _pos(name: str, v: float, model: str = _MODEL) -> float:
    v = float(v)
    if not (math.isfinite(v) and v > 0.0):
        raise ModelRangeError(name, v, "finite and > 0", model)
    return v


def _nonneg(name: str, v: float, model: str = _MODEL) -> float:
    v = float(v)
    if not (math.isfinite(v) and v >= 0.0):
        raise ModelRangeError(name, v, "finite and ≥ 0", model)
    return v


# --------------------------------------------------------------------------------------------
# channel mean (volume-averaged J·B for uniform J)
# --------------------------------------------------------------------------------------------


def channel_mean_field_t(
    field_z: Callable[[np.ndarray, np.ndarray, np.ndarray], np.ndarray],
    channel_width_m: float,
    channel_length_m: float,
    channel_height_m: float,
    *,
    n_points: int = 12,
) -> float:
    """Volume mean of the field component along the pole axis over a rectangular channel.

    Parameters
    ----------
    field_z : callable
        ``field_z(x, y, z)`` → B_z [T] at arrays of points [m], channel centred at the origin.
    channel_width_m, channel_length_m, channel_height_m : float
        Channel size along x (electrode gap), y (flow) and z (pole gap) [m].
    n_points : int
        Gauss–Legendre points per axis, 2…64 (default 12).

    Returns
    -------
    float
        ⟨B_z⟩ [T], the field that makes J·⟨B_z⟩·V the axial Lorentz force for a current density
        J uniform across the gap.

    Notes
    -----
    ⟨B_z⟩ = (1/V) ∫ B_z dV by tensor Gauss–Legendre quadrature. With J = J x̂ uniform the
    force along the channel is |F_y| = J ∫ B_z dV = J·V·⟨B_z⟩; the B_x and B_y components give
    forces across the channel that the walls take, and no thrust.

    References
    ----------
    Gauss–Legendre quadrature (Abramowitz & Stegun 1964, §25.4.29).
    """
    w = _pos("channel_width_m", channel_width_m)
    ell = _pos("channel_length_m", channel_length_m)
    h = _pos("channel_height_m", channel_height_m)
    if not (isinstance(n_points, int) and 2 <= n_points <= 64):
        raise ModelRangeError("n_points", n_points, "an integer 2…64", _MODEL)
    nodes, weights = np.polynomial.legendre.leggauss(n_points)
    x, y, z = np.meshgrid(0.5 * w * nodes, 0.5 * ell * nodes, 0.5 * h * nodes, indexing="ij")
    wt = weights[:, None, None] * weights[None, :, None] * weights[None, None, :]
    return float(np.sum(wt * np.asarray(field_z(x, y, z))) / 8.0)


# --------------------------------------------------------------------------------------------
# permanent-magnet assemblies
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class MagnetPairField:
    """Field of two facing magnet blocks (or rows of abutting blocks) across a channel.

    Attributes
    ----------
    br_t : float
        Remanence at the magnet temperature [T].
    mean_b_t : float
        Volume mean of B_z over the channel [T] (the field the duct model uses).
    centre_b_t : float
        B_z at the channel centre [T].
    uniformity : float
        mean_b_t / centre_b_t [-] (≤ 1 for blocks at least as wide as the channel).
    yoke : bool
        Whether a steel return yoke was assumed (magnetic-circuit estimate).
    """

    br_t: float
    mean_b_t: float
    centre_b_t: float
    uniformity: float
    yoke: bool


def yoke_leakage_coefficient(face_width_m: float, face_length_m: float, gap_m: float) -> float:
    """Leakage (fringing) coefficient of a magnet pair on steel back plates.

    Parameters
    ----------
    face_width_m, face_length_m : float
        Pole-face size of each magnet [m].
    gap_m : float
        Distance between the pole faces [m].

    Returns
    -------
    float
        σ = (a + g/2)(b + g/2)/(ab) ≥ 1 [-]: total magnet flux over the flux through the
        pole-face area.

    Notes
    -----
    A fringing rule of common practice: the gap flux spreads over the pole face widened by a
    fraction of the gap. The half-gap widening used here was chosen against a magpylib model of
    the same blocks between two infinitely permeable back plates (method of images, an infinite
    periodic stack of blocks): within ±15 % for gaps up to the smaller face side (tests).

    References
    ----------
    Furlani (2001), ch. 3 (magnetic circuits with leakage); Parker (1990) (leakage
    coefficient; from memory); Ortner & Coliado Bandeira (2020) (the check).
    """
    a = _pos("face_width_m", face_width_m)
    b = _pos("face_length_m", face_length_m)
    g = _pos("gap_m", gap_m)
    return (a + 0.5 * g) * (b + 0.5 * g) / (a * b)


def yoke_gap_field_t(
    br_t: ArrayLike,
    magnet_thickness_m: float,
    gap_m: float,
    *,
    leakage: float = 1.0,
    mu_recoil: float = NDFEB_RECOIL_PERMEABILITY,
) -> float | np.ndarray:
    """Gap field of two facing magnets on a steel return yoke (magnetic-circuit estimate).

    Parameters
    ----------
    br_t : float or array
        Remanence [T].
    magnet_thickness_m : float
        Thickness of EACH of the two magnets along the magnetisation [m].
    gap_m : float
        Pole gap [m].
    leakage : float
        Leakage coefficient σ ≥ 1 [-] (:func:`yoke_leakage_coefficient`); 1 = no leakage.
    mu_recoil : float
        Relative recoil permeability of the magnet [-]; default 1.05 (NdFeB, common practice).

    Returns
    -------
    float or ndarray
        Mean gap flux density over the pole face [T].

    Notes
    -----
    Ampère's law round the circuit (ideal, unsaturated steel): H_m·2t + H_g·g = 0; flux
    Φ = B_m A_m = σ B_g A_g with A_g = A_m; recoil line B_m = Br + μ0 μ_r H_m. Hence

        B_g = Br / (σ + μ_r g/(2t)),

    which for σ = 1 is the textbook B_g = Br·t_m/(t_m + μ_r g) with t_m = 2t the total magnet
    length. It assumes unsaturated steel (B in the yoke below about 1.5 T) and pole faces at
    least as large as the gap; it is an estimate (±15 % against an image model, see
    :func:`yoke_leakage_coefficient`).

    References
    ----------
    Furlani (2001), ch. 3; Parker (1990) (load line of a magnetic circuit; from memory).
    """
    t = _pos("magnet_thickness_m", magnet_thickness_m)
    g = _pos("gap_m", gap_m)
    sig = float(leakage)
    if not (math.isfinite(sig) and sig >= 1.0):
        raise ModelRangeError("leakage", sig, "finite and ≥ 1", _MODEL)
    mu = _pos("mu_recoil", mu_recoil)
    b = np.asarray(br_t, dtype=float) / (sig + mu * g / (2.0 * t))
    return float(b) if b.ndim == 0 else b


def facing_pair_field(
    grade: MagnetGrade | str,
    block_width_m: float,
    block_length_m: float,
    block_thickness_m: float,
    gap_m: float,
    channel_width_m: float,
    channel_length_m: float,
    *,
    magnet_temp_c: float = 20.0,
    n_across: int = 1,
    n_along: int = 1,
    yoke: bool = False,
    mu_recoil: float = NDFEB_RECOIL_PERMEABILITY,
    n_points: int = 12,
) -> MagnetPairField:
    """Field over a channel between two facing rows of magnet blocks, with or without a yoke.

    Parameters
    ----------
    grade : MagnetGrade or str
        Magnet grade (:data:`sim.physics.magnets.NDFEB_GRADES` key).
    block_width_m, block_length_m, block_thickness_m : float
        Size of one block across the channel (x), along the flow (y), along the field (z) [m].
    gap_m : float
        Pole gap, the channel height between the pole faces [m].
    channel_width_m, channel_length_m : float
        Electrode gap and active length of the channel [m].
    magnet_temp_c : float
        Magnet temperature [°C]; Br falls with the grade's reversible coefficient and the grade's
        maximum working temperature is enforced (:func:`sim.physics.magnets.remanence_t`).
    n_across, n_along : int
        Blocks abutting across and along the channel on each side (≥ 1). Abutting blocks of the
        same magnetisation are one larger block (superposition), so the row is modelled as a
        block of n_across·width × n_along·length.
    yoke : bool
        False: no iron, exact superposition (charge model, recoil permeability 1). True: steel
        return yoke, magnetic-circuit estimate :func:`yoke_gap_field_t` with the leakage of
        :func:`yoke_leakage_coefficient`; the channel profile is taken from the no-yoke shape
        (mean/centre ratio), scaled to the circuit value at the centre.
    mu_recoil : float
        Recoil permeability for the yoke estimate [-].
    n_points : int
        Gauss–Legendre points per axis for the channel mean.

    Returns
    -------
    MagnetPairField

    Notes
    -----
    No yoke: ⟨B_z⟩ from :func:`sim.physics.magnet_gap.facing_blocks_field_z_t` averaged by
    :func:`channel_mean_field_t`. Yoke: B_c = Br/(σ + μ_r g/(2t)) is the pole-face mean; the
    channel mean is B_c·(⟨B⟩/B̄_face) of the no-yoke field, B̄_face its pole-face mean, so that
    a channel narrower than the blocks sees more than the face mean, as without iron.

    References
    ----------
    Furlani (2001) §4.4 and ch. 3; Ortner & Coliado Bandeira (2020) (checks).
    """
    for name, n in (("n_across", n_across), ("n_along", n_along)):
        if not (isinstance(n, int) and n >= 1):
            raise ModelRangeError(name, n, "an integer ≥ 1", _MODEL)
    a = _pos("block_width_m", block_width_m) * n_across
    b = _pos("block_length_m", block_length_m) * n_along
    t = _pos("block_thickness_m", block_thickness_m)
    g = _pos("gap_m", gap_m)
    br = float(remanence_t(grade, magnet_temp_c))

    def bz(x, y, z):
        return facing_blocks_field_z_t(br, a, b, t, g, x, y, z + 0.5 * g)

    mean = channel_mean_field_t(bz, channel_width_m, channel_length_m, g, n_points=n_points)
    centre = float(bz(0.0, 0.0, 0.0))
    if yoke:
        face = channel_mean_field_t(bz, a, b, g, n_points=n_points)
        b_circ = float(
            yoke_gap_field_t(
                br, t, g, leakage=yoke_leakage_coefficient(a, b, g), mu_recoil=mu_recoil
            )
        )
        scale = b_circ / face
        mean, centre = mean * scale, centre * scale
    return MagnetPairField(br, mean, centre, mean / centre, bool(yoke))


# --------------------------------------------------------------------------------------------
# filamentary currents
# --------------------------------------------------------------------------------------------


def segment_field_t(
    current_a: float, start_m: ArrayLike, end_m: ArrayLike, points_m: ArrayLike
) -> np.ndarray:
    """Field of straight current filaments (Biot–Savart, closed form).

    Parameters
    ----------
    current_a : float
        Current [A] (ampere-turns for a winding), flowing from start to end.
    start_m, end_m : array (..., 3)
        Segment end points [m]; several segments broadcast against each other.
    points_m : array (M, 3)
        Field points [m].

    Returns
    -------
    ndarray (M, 3)
        B [T] summed over the segments. Points on a segment's line give 0 for that segment.

    Notes
    -----
    With r1 = P − A, r2 = P − B (Hanson & Hirshman 2002, eq. 10):

        B = (μ0 I/4π) (r1 × r2)(|r1| + |r2|) / (|r1||r2|(|r1||r2| + r1·r2)).

    References
    ----------
    Hanson & Hirshman (2002), Phys. Plasmas 9, 4410. doi:10.1063/1.1507589
    """
    a = np.atleast_2d(np.asarray(start_m, dtype=float)).reshape(-1, 3)
    b = np.atleast_2d(np.asarray(end_m, dtype=float)).reshape(-1, 3)
    p = np.atleast_2d(np.asarray(points_m, dtype=float)).reshape(-1, 3)
    r1 = p[:, None, :] - a[None, :, :]
    r2 = p[:, None, :] - b[None, :, :]
    n1 = np.linalg.norm(r1, axis=-1)
    n2 = np.linalg.norm(r2, axis=-1)
    den = n1 * n2 * (n1 * n2 + np.sum(r1 * r2, axis=-1))
    cross = np.cross(r1, r2)
    scale = np.divide(n1 + n2, den, out=np.zeros_like(den), where=den > 1e-30 * (n1 + n2) ** 4)
    return MU0 * float(current_a) / (4.0 * np.pi) * np.sum(cross * scale[..., None], axis=1)


def polyline_field_t(current_a: float, vertices_m: ArrayLike, points_m: ArrayLike) -> np.ndarray:
    """Field of a current along a polyline (closed if the last vertex equals the first).

    Parameters
    ----------
    current_a : float
        Current or ampere-turns [A].
    vertices_m : array (K, 3)
        Vertices in the order the current runs [m].
    points_m : array (M, 3)
        Field points [m].

    Returns
    -------
    ndarray (M, 3)
        B [T].

    References
    ----------
    Hanson & Hirshman (2002); see :func:`segment_field_t`.
    """
    v = np.asarray(vertices_m, dtype=float).reshape(-1, 3)
    return segment_field_t(current_a, v[:-1], v[1:], points_m)


def racetrack_vertices_m(
    straight_length_m: float,
    end_radius_m: float,
    z_m: float = 0.0,
    *,
    n_arc: int = 64,
) -> np.ndarray:
    """Vertices of a racetrack loop in the plane z = z_m, long axis along y, counter-clockwise.

    Parameters
    ----------
    straight_length_m : float
        Length of each straight side (along y) [m], ≥ 0 (0 gives a circle).
    end_radius_m : float
        Radius of the two semicircular ends [m] (half the coil's width across x).
    z_m : float
        Height of the loop plane [m].
    n_arc : int
        Straight pieces per semicircle (≥ 4; the field error falls as 1/n_arc²).

    Returns
    -------
    ndarray (2·n_arc + 3, 3)
        Closed polyline [m]; current along it gives B_z > 0 inside for I > 0.

    References
    ----------
    Geometry (common practice for racetrack and saddle-free dipole windings).
    """
    s = 0.5 * _nonneg("straight_length_m", straight_length_m)
    r = _pos("end_radius_m", end_radius_m)
    if not (isinstance(n_arc, int) and n_arc >= 4):
        raise ModelRangeError("n_arc", n_arc, "an integer ≥ 4", _MODEL)
    # counter-clockwise seen from +z: top arc from (r, s) to (−r, s), left side down, bottom
    # arc from (−r, −s) to (r, −s), right side up (the closing segment)
    th_top = np.linspace(0.0, np.pi, n_arc + 1)
    th_bot = np.linspace(np.pi, 2.0 * np.pi, n_arc + 1)
    top = np.column_stack([r * np.cos(th_top), s + r * np.sin(th_top)])
    bot = np.column_stack([r * np.cos(th_bot), -s + r * np.sin(th_bot)])
    xy = np.vstack([top, bot, top[:1]])
    return np.column_stack([xy, np.full(len(xy), float(z_m))])


def coil_pair_mean_field_t(
    ampere_turns_a: float,
    straight_length_m: float,
    end_radius_m: float,
    separation_m: float,
    channel_width_m: float,
    channel_length_m: float,
    channel_height_m: float,
    *,
    n_arc: int = 48,
    n_points: int = 8,
) -> float:
    """Channel-mean field of a pair of racetrack coils above and below a channel.

    Parameters
    ----------
    ampere_turns_a : float
        N·I of each coil [A] (same sense in both: their fields add in the channel).
    straight_length_m, end_radius_m : float
        Racetrack shape (:func:`racetrack_vertices_m`) [m].
    separation_m : float
        Distance between the two coil planes [m], > channel height.
    channel_width_m, channel_length_m, channel_height_m : float
        Channel box centred between the coils [m].
    n_arc, n_points : int
        Arc discretisation and Gauss points per axis.

    Returns
    -------
    float
        ⟨B_z⟩ over the channel [T].

    Notes
    -----
    Filamentary coils at z = ±separation/2 (a flat "racetrack pair"; a saddle pair round a
    round bore is the same idea bent onto a cylinder). Biot–Savart by segments.

    References
    ----------
    Hanson & Hirshman (2002); Gauss–Legendre quadrature.
    """
    sep = _pos("separation_m", separation_m)
    if not sep > float(channel_height_m):
        raise ModelRangeError("separation_m", sep, "> channel_height_m (coils outside)", _MODEL)
    lo = racetrack_vertices_m(straight_length_m, end_radius_m, -0.5 * sep, n_arc=n_arc)
    hi = racetrack_vertices_m(straight_length_m, end_radius_m, 0.5 * sep, n_arc=n_arc)

    def bz(x, y, z):
        pts = np.column_stack([np.ravel(x), np.ravel(y), np.ravel(z)])
        b = polyline_field_t(ampere_turns_a, lo, pts) + polyline_field_t(ampere_turns_a, hi, pts)
        return b[:, 2].reshape(np.shape(x))

    return channel_mean_field_t(
        bz, channel_width_m, channel_length_m, channel_height_m, n_points=n_points
    )


def circular_loop_field_t(
    current_a: float, radius_m: float, rho_m: ArrayLike, z_m: ArrayLike
) -> tuple[np.ndarray, np.ndarray]:
    """Field of a circular current loop in the plane z = 0, centred on the axis.

    Parameters
    ----------
    current_a : float
        Current or ampere-turns [A], counter-clockwise seen from +z.
    radius_m : float
        Loop radius [m].
    rho_m, z_m : float or array
        Cylindrical coordinates of the field point [m].

    Returns
    -------
    (b_rho, b_z) : ndarrays
        Radial and axial flux density [T].

    Notes
    -----
    With α² = a² + r² − 2aρ, β² = a² + r² + 2aρ, r² = ρ² + z², k² = 1 − α²/β², C = μ0I/π:

        B_ρ = C z /(2α²βρ) [(a² + r²)E(k²) − α²K(k²)]
        B_z = C /(2α²β) [(a² − r²)E(k²) + α²K(k²)],

    K, E complete elliptic integrals of parameter k². On the axis B_z = μ0Ia²/(2(a² + z²)^{3/2}).

    References
    ----------
    Simpson et al. (2001), NASA/TM-2013-217919.
    """
    a = _pos("radius_m", radius_m)
    rho, z = np.broadcast_arrays(np.asarray(rho_m, dtype=float), np.asarray(z_m, dtype=float))
    rho = np.abs(rho)
    r2 = rho * rho + z * z
    alpha2 = a * a + r2 - 2.0 * a * rho
    beta2 = a * a + r2 + 2.0 * a * rho
    beta = np.sqrt(beta2)
    m = 1.0 - np.divide(alpha2, beta2, out=np.zeros_like(beta2), where=beta2 > 0)
    from scipy.special import ellipe, ellipk  # ≈0.2 s to import: only for coil loops

    kk, ee = ellipk(m), ellipe(m)
    c = MU0 * float(current_a) / np.pi
    with np.errstate(divide="ignore", invalid="ignore"):
        bz = c / (2.0 * alpha2 * beta) * ((a * a - r2) * ee + alpha2 * kk)
        brho = c * z / (2.0 * alpha2 * beta * rho) * ((a * a + r2) * ee - alpha2 * kk)
    brho = np.where(rho < 1e-12 * a, 0.0, brho)
    return brho, bz


def solenoid_on_axis_field_t(
    ampere_turns_a: float, radius_m: float, length_m: float, z_m: ArrayLike
) -> float | np.ndarray:
    """Axial field on the axis of a finite thin solenoid (current sheet).

    Parameters
    ----------
    ampere_turns_a : float
        Total ampere-turns N·I [A].
    radius_m, length_m : float
        Winding radius and length [m].
    z_m : float or array
        Axial position from the solenoid centre [m].

    Returns
    -------
    float or ndarray
        B_z [T].

    Notes
    -----
    B(z) = (μ0 N I/(2L)) [(z + L/2)/√((z + L/2)² + R²) − (z − L/2)/√((z − L/2)² + R²)];
    long-solenoid limit μ0 N I/L at the centre, half of it at the ends.

    References
    ----------
    Ampère's law / Biot–Savart integrated over a current sheet (textbook, e.g. Jackson,
    Classical Electrodynamics, 3rd ed., problem 5.3).
    """
    r = _pos("radius_m", radius_m)
    ell = _pos("length_m", length_m)
    z = np.asarray(z_m, dtype=float)
    zp, zm = z + 0.5 * ell, z - 0.5 * ell
    b = MU0 * float(ampere_turns_a) / (2.0 * ell) * (zp / np.hypot(zp, r) - zm / np.hypot(zm, r))
    return float(b) if b.ndim == 0 else b


def solenoid_field_t(
    ampere_turns_a: float,
    radius_m: float,
    length_m: float,
    rho_m: ArrayLike,
    z_m: ArrayLike,
    *,
    n_loops: int = 64,
) -> tuple[np.ndarray, np.ndarray]:
    """Field of a finite thin solenoid anywhere not on the winding (loop superposition).

    Parameters
    ----------
    ampere_turns_a, radius_m, length_m : float
        As in :func:`solenoid_on_axis_field_t`.
    rho_m, z_m : float or array
        Field point (cylindrical, from the solenoid centre) [m].
    n_loops : int
        Gauss–Legendre loops along the length (the current sheet integral), 4…512.

    Returns
    -------
    (b_rho, b_z) : ndarrays [T]

    Notes
    -----
    B = Σ w_i (NI/2) B_loop(ρ, z − z_i), z_i Gauss–Legendre nodes on [−L/2, L/2]. Accurate
    away from the winding (|ρ − R| larger than a few L/n_loops).

    References
    ----------
    Simpson et al. (2001) (loop field); Gauss–Legendre quadrature.
    """
    ell = _pos("length_m", length_m)
    if not (isinstance(n_loops, int) and 4 <= n_loops <= 512):
        raise ModelRangeError("n_loops", n_loops, "an integer 4…512", _MODEL)
    nodes, w = np.polynomial.legendre.leggauss(n_loops)
    rho, z = np.broadcast_arrays(np.asarray(rho_m, dtype=float), np.asarray(z_m, dtype=float))
    br = np.zeros(rho.shape)
    bz = np.zeros(rho.shape)
    for zi, wi in zip(0.5 * ell * nodes, w, strict=True):
        r_i, z_i = circular_loop_field_t(0.5 * wi * float(ampere_turns_a), radius_m, rho, z - zi)
        br += r_i
        bz += z_i
    return br, bz


def toroidal_field_t(ampere_turns_a: float, r_m: ArrayLike) -> float | np.ndarray:
    """Azimuthal field inside a toroidal winding (annular thrusters).

    Parameters
    ----------
    ampere_turns_a : float
        Total ampere-turns N·I linking the torus [A].
    r_m : float or array
        Distance from the torus axis, inside the winding [m].

    Returns
    -------
    float or ndarray
        B_θ = μ0 N I/(2π r) [T].

    References
    ----------
    Ampère's law (textbook).
    """
    r = np.asarray(r_m, dtype=float)
    if np.any(~np.isfinite(r)) or np.any(r <= 0.0):
        raise ModelRangeError("r_m", r_m, "finite and > 0 m", _MODEL)
    b = MU0 * float(ampere_turns_a) / (2.0 * np.pi * r)
    return float(b) if b.ndim == 0 else b


# --------------------------------------------------------------------------------------------
# resistive coils
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Conductor:
    """A winding conductor.

    Attributes
    ----------
    name : str
    resistivity_20c_ohm_m : float
        Resistivity at 20 °C [Ω·m].
    alpha_per_k : float
        Temperature coefficient of resistivity at 20 °C [1/K].
    source : str
    """

    name: str
    resistivity_20c_ohm_m: float
    alpha_per_k: float
    source: str


CONDUCTORS: dict[str, Conductor] = {
    "copper": Conductor(
        "copper", 1.0 / 58.0e6, 0.00393, "IEC 60028 annealed copper standard (100 % IACS)"
    ),
    "aluminium": Conductor(
        "aluminium", 1.0 / 35.38e6, 0.00403, "EC-grade aluminium, 61 % IACS (from memory)"
    ),
}
"""Winding conductors by name."""


def conductor_resistivity_ohm_m(conductor: str | Conductor, t_c: ArrayLike) -> float | np.ndarray:
    """Resistivity of a winding conductor at temperature, linear law.

    Parameters
    ----------
    conductor : str or Conductor
        A key of :data:`CONDUCTORS` or a conductor.
    t_c : float or array
        Conductor temperature [°C], −50…250.

    Returns
    -------
    float or ndarray
        ρ(T) = ρ20 [1 + α (T − 20)] [Ω·m].

    References
    ----------
    IEC 60028 (copper: 1/58 Ω·mm²/m, α = 0.00393 /K).
    """
    if isinstance(conductor, str):
        if conductor not in CONDUCTORS:
            raise ModelRangeError("conductor", conductor, "one of " + ", ".join(CONDUCTORS))
        conductor = CONDUCTORS[conductor]
    t = np.asarray(t_c, dtype=float)
    if np.any(~np.isfinite(t)) or np.any(t < -50.0) or np.any(t > 250.0):
        raise ModelRangeError("t_c", t_c, "−50 … 250 °C", "conductor resistivity")
    rho = conductor.resistivity_20c_ohm_m * (1.0 + conductor.alpha_per_k * (t - 20.0))
    return float(rho) if rho.ndim == 0 else rho


def coil_resistance_ohm(
    n_turns: int,
    mean_turn_length_m: float,
    wire_area_m2: float,
    *,
    conductor: str | Conductor = "copper",
    t_c: float = 20.0,
) -> float:
    """DC resistance of a coil winding.

    Parameters
    ----------
    n_turns : int
        Number of turns (≥ 1).
    mean_turn_length_m : float
        Length of one mean turn [m].
    wire_area_m2 : float
        Conductor cross-section [m²].
    conductor : str or Conductor
        Default copper.
    t_c : float
        Winding temperature [°C].

    Returns
    -------
    float
        R = ρ(T) N ℓ_turn / A_wire [Ω].

    References
    ----------
    Ohm's law; IEC 60028.
    """
    if not (isinstance(n_turns, int | np.integer) and n_turns >= 1):
        raise ModelRangeError("n_turns", n_turns, "an integer ≥ 1", "coil resistance")
    ell = _pos("mean_turn_length_m", mean_turn_length_m, "coil resistance")
    a = _pos("wire_area_m2", wire_area_m2, "coil resistance")
    return float(conductor_resistivity_ohm_m(conductor, t_c)) * int(n_turns) * ell / a


def coil_joule_w(current_a: ArrayLike, resistance_ohm: float) -> float | np.ndarray:
    """Joule heat of a resistive coil, I²R [W] (to add to the pack load and the heat budget).

    Parameters
    ----------
    current_a : float or array
        Coil current [A].
    resistance_ohm : float
        Winding resistance [Ω].

    Returns
    -------
    float or ndarray
        P = I²R [W].

    References
    ----------
    Joule's law.
    """
    r = _nonneg("resistance_ohm", resistance_ohm, "coil heat")
    p = np.asarray(current_a, dtype=float) ** 2 * r
    return float(p) if p.ndim == 0 else p


# --------------------------------------------------------------------------------------------
# superconducting coils
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class NbTiCritical:
    """Linear critical-current line of NbTi at a fixed temperature.

    Attributes
    ----------
    jc_ref_a_m2 : float
        Critical current density of the superconductor at ``b_ref_t`` [A/m²].
    b_ref_t : float
        Field of the reference value [T].
    bc2_t : float
        Upper critical field at the temperature [T] (Jc = 0 there).
    source : str
    """

    jc_ref_a_m2: float
    b_ref_t: float
    bc2_t: float
    source: str


NBTI_4K2 = NbTiCritical(
    3.0e9,
    5.0,
    10.5,
    "NbTi at 4.2 K: Jc ≈ 3000 A/mm² at 5 T, Bc2 ≈ 10.5 T, roughly linear in B "
    "(common practice; Wilson 1983, from memory)",
)
"""NbTi filaments at 4.2 K (linear Jc(B))."""


def nbti_critical_current_density_a_m2(
    b_t: ArrayLike, line: NbTiCritical = NBTI_4K2
) -> float | np.ndarray:
    """Critical current density of NbTi on a linear line, zero at and above Bc2.

    Parameters
    ----------
    b_t : float or array
        Peak field on the conductor [T], ≥ 0.
    line : NbTiCritical
        Default :data:`NBTI_4K2`.

    Returns
    -------
    float or ndarray
        Jc = Jc_ref (Bc2 − B)/(Bc2 − B_ref), clipped at 0 [A/m²].

    References
    ----------
    Wilson (1983), Superconducting Magnets, ch. 1 (NbTi critical surface; linear in B at fixed
    temperature over 3–9 T; from memory).
    """
    b = np.asarray(b_t, dtype=float)
    if np.any(~np.isfinite(b)) or np.any(b < 0.0):
        raise ModelRangeError("b_t", b_t, "finite and ≥ 0 T", "NbTi critical current")
    jc = line.jc_ref_a_m2 * np.clip(line.bc2_t - b, 0.0, None) / (line.bc2_t - line.b_ref_t)
    return float(jc) if jc.ndim == 0 else jc


@dataclass(frozen=True)
class LoadLineMargin:
    """Where a superconducting coil sits on its load line.

    Attributes
    ----------
    critical_current_a : float
        Current at which the load line meets the critical line [A].
    peak_field_at_critical_t : float
        Peak field on the conductor at that current [T].
    load_fraction : float
        I_op / I_c [-] (1 = quench).
    margin_ok : bool
        load_fraction ≤ the design limit given.
    """

    critical_current_a: float
    peak_field_at_critical_t: float
    load_fraction: float
    margin_ok: bool


def load_line_margin(
    operating_current_a: float,
    peak_field_per_ampere_t_a: float,
    superconductor_area_m2: float,
    *,
    line: NbTiCritical = NBTI_4K2,
    max_fraction: float = 0.8,
) -> LoadLineMargin:
    """Quench margin of a superconducting coil: its load line against the critical line.

    Parameters
    ----------
    operating_current_a : float
        Conductor current [A] (≥ 0).
    peak_field_per_ampere_t_a : float
        Peak field on the winding per ampere of conductor current [T/A] (the load line slope,
        from the coil geometry).
    superconductor_area_m2 : float
        Superconductor cross-section of the conductor (without copper) [m²].
    line : NbTiCritical
        Critical line; default NbTi at 4.2 K.
    max_fraction : float
        Highest allowed I_op/I_c [-]; default 0.8 (common practice: about 80 % of the load
        line, more margin for conduction-cooled coils).

    Returns
    -------
    LoadLineMargin

    Notes
    -----
    The peak field rises with the current along the load line B = k I. With
    Jc(B) = Jc_ref (Bc2 − B)/(Bc2 − B_ref) the intersection I = A·Jc(kI) gives

        I_c = A·s·Bc2 / (1 + A·s·k),   s = Jc_ref/(Bc2 − B_ref).

    References
    ----------
    Wilson (1983), Superconducting Magnets, ch. 5 (load line; from memory).
    """
    i_op = _nonneg("operating_current_a", operating_current_a, "load line")
    k = _pos("peak_field_per_ampere_t_a", peak_field_per_ampere_t_a, "load line")
    a = _pos("superconductor_area_m2", superconductor_area_m2, "load line")
    s = line.jc_ref_a_m2 / (line.bc2_t - line.b_ref_t)
    i_c = a * s * line.bc2_t / (1.0 + a * s * k)
    frac = i_op / i_c
    return LoadLineMargin(i_c, k * i_c, frac, frac <= float(max_fraction))


def stored_energy_j(b_t: float, field_volume_m3: float) -> float:
    """Magnetic energy of a field of mean flux density B in a volume, B²V/(2μ0) [J].

    Parameters
    ----------
    b_t : float
        Mean flux density [T] (an RMS value over the volume is more accurate).
    field_volume_m3 : float
        Volume the field fills [m³].

    Returns
    -------
    float
        E [J].

    References
    ----------
    Magnetic energy density B²/(2μ0) (textbook).
    """
    return float(b_t) ** 2 * _nonneg("field_volume_m3", field_volume_m3) / (2.0 * MU0)


def cold_mass_virial_kg(
    stored_energy_j_: float,
    *,
    structure_density_kg_m3: float = 8000.0,
    allowable_stress_pa: float = 200e6,
) -> float:
    """Least mass of structure that holds a magnet's forces (virial theorem).

    Parameters
    ----------
    stored_energy_j_ : float
        Magnetic stored energy [J].
    structure_density_kg_m3 : float
        Density of the structure [kg/m³]; default 8000 (stainless steel).
    allowable_stress_pa : float
        Working stress [Pa]; default 200 MPa (from memory: a usual design stress of stainless
        steel at 4 K).

    Returns
    -------
    float
        M ≥ ρ E/σ [kg] (tension-only structure; real magnets are several times heavier).

    References
    ----------
    Moon (1982), J. Appl. Phys. 53, 9112 (virial theorem: M_min = ρE/σ for structures in
    tension).
    """
    e = _nonneg("stored_energy_j", stored_energy_j_, "virial mass")
    rho = _pos("structure_density_kg_m3", structure_density_kg_m3, "virial mass")
    sig = _pos("allowable_stress_pa", allowable_stress_pa, "virial mass")
    return rho * e / sig


@dataclass(frozen=True)
class CryoLoad:
    """Heat load at the cold stage of a superconducting magnet and the cooler's input power.

    Attributes
    ----------
    cold_mass_kg : float
        Cold mass (structure and winding) [kg].
    static_load_w : float
        Radiation and support conduction at the cold stage [W].
    lead_load_w : float
        Current-lead load at the cold stage [W] (0 for a persistent coil).
    cold_load_w : float
        static + lead [W].
    input_power_w : float
        Electrical input of the cryocooler [W] (to add to the pack load).
    """

    cold_mass_kg: float
    static_load_w: float
    lead_load_w: float
    cold_load_w: float
    input_power_w: float


def cryocooler_input_power_w(
    cold_load_w: ArrayLike,
    *,
    t_cold_k: float = 4.2,
    t_warm_k: float = 300.0,
    fraction_of_carnot: float = 0.015,
) -> float | np.ndarray:
    """Electrical input of a cryocooler that lifts a cold load to room temperature.

    Parameters
    ----------
    cold_load_w : float or array
        Heat removed at the cold stage [W].
    t_cold_k, t_warm_k : float
        Cold and warm temperatures [K].
    fraction_of_carnot : float
        Efficiency relative to Carnot [-], 0 < x ≤ 1; default 0.015 (from memory: small 4 K
        Gifford–McMahon coolers reach 1–2 % of Carnot, ter Brake & Wiegerinck 2002).

    Returns
    -------
    float or ndarray
        P = Q (T_w/T_c − 1)/x [W].

    References
    ----------
    Carnot; ter Brake & Wiegerinck (2002), Cryogenics 42, 705 (survey; value from memory).
    """
    tc = _pos("t_cold_k", t_cold_k, "cryocooler")
    tw = _pos("t_warm_k", t_warm_k, "cryocooler")
    if not tw > tc:
        raise ModelRangeError("t_warm_k", tw, f"> t_cold_k = {tc} K", "cryocooler")
    x = float(fraction_of_carnot)
    if not (math.isfinite(x) and 0.0 < x <= 1.0):
        raise ModelRangeError("fraction_of_carnot", x, "0 < x ≤ 1", "cryocooler")
    q = np.asarray(cold_load_w, dtype=float)
    if np.any(~np.isfinite(q)) or np.any(q < 0.0):
        raise ModelRangeError("cold_load_w", cold_load_w, "finite and ≥ 0 W", "cryocooler")
    p = q * (tw / tc - 1.0) / x
    return float(p) if p.ndim == 0 else p


def superconducting_cryo_load(
    b_t: float,
    field_volume_m3: float,
    *,
    lead_current_a: float = 0.0,
    static_load_w_per_kg23: float = 0.02,
    lead_load_w_per_a: float = 1.0e-3,
    cold_mass_factor: float = 5.0,
    t_cold_k: float = 4.2,
    fraction_of_carnot: float = 0.015,
) -> CryoLoad:
    """Cryocooler load of a superconducting magnet, scaled with its cold mass and field.

    Parameters
    ----------
    b_t : float
        Mean field in the magnet bore [T].
    field_volume_m3 : float
        Volume the field fills [m³].
    lead_current_a : float
        Current in the leads [A]; 0 for a persistent coil.
    static_load_w_per_kg23 : float
        Static cold-stage load per (kg)^(2/3) of cold mass [W/kg^(2/3)]; default 0.02 (from
        memory, order of magnitude: about 0.1 W for 100 kg with a radiation shield and
        multilayer insulation). Loose: ±factor 3.
    lead_load_w_per_a : float
        Cold-stage load of a pair of current leads per ampere [W/A]; default 1e-3 (from memory:
        optimised vapour-cooled copper leads ≈ 1 mW/A each, Wilson 1983).
    cold_mass_factor : float
        Cold mass over the virial minimum [-]; default 5 (from memory).
    t_cold_k, fraction_of_carnot : float
        Cooler data (:func:`cryocooler_input_power_w`).

    Returns
    -------
    CryoLoad

    Notes
    -----
    M = f·ρE/σ with E = B²V/(2μ0) (virial theorem, Moon 1982), so the cold mass grows with B²V;
    static load ∝ M^(2/3) (surface of the cold mass), lead load ∝ I; P = Q(T_w/T_c − 1)/x.
    The whole chain is an order-of-magnitude estimate (state it in any result).

    References
    ----------
    Moon (1982); Wilson (1983); ter Brake & Wiegerinck (2002) (from memory).
    """
    e = stored_energy_j(b_t, field_volume_m3)
    m = _pos("cold_mass_factor", cold_mass_factor, "cryo load") * cold_mass_virial_kg(e)
    q_static = _nonneg("static_load_w_per_kg23", static_load_w_per_kg23, "cryo load") * m ** (
        2.0 / 3.0
    )
    q_lead = _nonneg("lead_load_w_per_a", lead_load_w_per_a, "cryo load") * abs(
        float(lead_current_a)
    )
    q = q_static + q_lead
    p = float(cryocooler_input_power_w(q, t_cold_k=t_cold_k, fraction_of_carnot=fraction_of_carnot))
    return CryoLoad(m, q_static, q_lead, q, p)
