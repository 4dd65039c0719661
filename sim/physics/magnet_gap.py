"""Mean field of two facing permanent-magnet blocks over a rectangular channel between them.

Where the magnet blocks are not much wider than the channel, the field across a wide gap is not
uniform: it falls towards the electrode walls and towards the ends of the blocks. The thrust of a
duct depends on the field averaged over the active volume, which this module computes from the
closed-form field of uniformly magnetised rectangular blocks (charge model).

Layout: the channel is centred at the origin, x across it (the electrode gap, along E), y along
the flow (the active length), z along the field (the pole height). One block sits on each pole
wall, its pole face flush with the wall, centred on the channel; both are magnetised along +z
(north face looking at south face), so their fields add in the gap.

References
----------
.. [1] Furlani, E. P. (2001). Permanent Magnet and Electromechanical Devices: Materials,
   Analysis, and Applications. Academic Press, San Diego. §4.4 (field of a rectangular block,
   charge model).
.. [2] Ortner, M. & Coliado Bandeira, L. G. (2020). Magpylib: A free Python package for magnetic
   field computation. SoftwareX 11, 100466. doi:10.1016/j.softx.2020.100466 (numerical
   cross-check in the tests).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

__all__ = ["block_field_z_t", "facing_blocks_field_z_t", "facing_blocks_mean_field_t"]

_MODEL = "magnet blocks beside a channel"


def _positive(name: str, v: float) -> float:
    v = float(v)
    if not (np.isfinite(v) and v > 0.0):
        raise ModelRangeError(name, v, "finite and > 0 m", _MODEL)
    return v


def block_field_z_t(
    br_t: float,
    width_m: float,
    length_m: float,
    thickness_m: float,
    x_m: ArrayLike,
    y_m: ArrayLike,
    z_m: ArrayLike,
) -> np.ndarray:
    """Field component along the magnetisation of one block centred at the origin.

    Parameters
    ----------
    br_t : float
        Remanence (polarisation) of the block, along +z [T].
    width_m, length_m, thickness_m : float
        Block size along x, y and z [m].
    x_m, y_m, z_m : float or array
        Field point [m], outside the block (points on its faces' edges are singular).

    Returns
    -------
    ndarray
        B_z [T].

    Notes
    -----
    The block's pole faces z = ±c carry magnetic charge ±Br/μ0; integrating the Coulomb field
    of a uniformly charged rectangle gives, with faces x ∈ [−a, a], y ∈ [−b, b],

        B_z = (Br/4π) Σ_{k,m,n ∈ {0,1}} (−1)^{k+m+n} atan2((x − x_m)(y − y_n), (z − z_k)·r),

    x_0 = −a, x_1 = a (same for y, z), r the distance to the corner. On the axis this reduces
    to the on-axis formula of :func:`sim.physics.magnets.cuboid_on_axis_field_t`.

    References
    ----------
    Furlani (2001), §4.4; Ortner & Coliado Bandeira (2020) (cross-check).
    """
    a = 0.5 * _positive("width_m", width_m)
    b = 0.5 * _positive("length_m", length_m)
    c = 0.5 * _positive("thickness_m", thickness_m)
    x, y, z = np.broadcast_arrays(
        np.asarray(x_m, dtype=float), np.asarray(y_m, dtype=float), np.asarray(z_m, dtype=float)
    )
    total = np.zeros(x.shape)
    for k, zk in enumerate((-c, c)):
        for m, xm in enumerate((-a, a)):
            for n, yn in enumerate((-b, b)):
                dx, dy, dz = x - xm, y - yn, z - zk
                r = np.sqrt(dx * dx + dy * dy + dz * dz)
                sign = -1.0 if (k + m + n) % 2 else 1.0
                total += sign * np.arctan2(dx * dy, dz * r)
    return -float(br_t) / (4.0 * np.pi) * total


def facing_blocks_field_z_t(
    br_t: float,
    width_m: float,
    length_m: float,
    thickness_m: float,
    gap_m: float,
    x_m: ArrayLike,
    y_m: ArrayLike,
    z_m: ArrayLike,
) -> np.ndarray:
    """Field along z between two identical blocks facing each other across a gap.

    Parameters
    ----------
    br_t : float
        Remanence of each block [T].
    width_m, length_m, thickness_m : float
        Size of each block along x, y and z [m].
    gap_m : float
        Distance between the two pole faces [m] (the channel's pole height).
    x_m, y_m, z_m : float or array
        Field point [m]; z from the lower pole face, 0 < z < gap.

    Returns
    -------
    ndarray
        B_z [T].

    Notes
    -----
    Superposition of :func:`block_field_z_t` for blocks centred at z = −t/2 and z = gap + t/2.

    References
    ----------
    Furlani (2001), §4.4.
    """
    t = _positive("thickness_m", thickness_m)
    g = _positive("gap_m", gap_m)
    z = np.asarray(z_m, dtype=float)
    lower = block_field_z_t(br_t, width_m, length_m, t, x_m, y_m, z + 0.5 * t)
    upper = block_field_z_t(br_t, width_m, length_m, t, x_m, y_m, z - g - 0.5 * t)
    return lower + upper


def facing_blocks_mean_field_t(
    br_t: float,
    width_m: float,
    length_m: float,
    thickness_m: float,
    gap_m: float,
    channel_width_m: float,
    channel_length_m: float,
    *,
    n_points: int = 12,
) -> float:
    """Mean of B_z over the channel volume between two facing blocks.

    Parameters
    ----------
    br_t : float
        Remanence of each block [T].
    width_m, length_m, thickness_m : float
        Size of each block: across the channel (x), along the flow (y), along the field (z) [m].
    gap_m : float
        Pole height of the channel, the distance between the pole faces [m].
    channel_width_m : float
        Electrode gap of the channel (x) [m].
    channel_length_m : float
        Active length of the channel (y) [m].
    n_points : int
        Gauss–Legendre points per axis (default 12; the field is smooth inside the channel).

    Returns
    -------
    float
        Volume-mean B_z [T].

    Notes
    -----
    ⟨B⟩ = (1/V) ∫∫∫ B_z dV over |x| ≤ w/2, |y| ≤ L/2, 0 ≤ z ≤ gap, by tensor Gauss–Legendre
    quadrature (the nodes avoid the faces' edges, where the integrand is singular but
    integrable). Limit: blocks much wider and longer than the gap and much thicker than they
    are wide give ⟨B⟩ → Br (each semi-infinite block gives Br/2 at its face); equal width and
    thickness give only about 0.87 Br.

    References
    ----------
    Furlani (2001), §4.4; Gauss–Legendre quadrature (Abramowitz & Stegun 1964, §25.4.29).
    """
    w = _positive("channel_width_m", channel_width_m)
    ell = _positive("channel_length_m", channel_length_m)
    g = _positive("gap_m", gap_m)
    if not (isinstance(n_points, int) and 2 <= n_points <= 64):
        raise ModelRangeError("n_points", n_points, "an integer 2…64", _MODEL)
    nodes, weights = np.polynomial.legendre.leggauss(n_points)
    xs, ys, zs = 0.5 * w * nodes, 0.5 * ell * nodes, 0.5 * g * (nodes + 1.0)
    x, y, z = np.meshgrid(xs, ys, zs, indexing="ij")
    wt = weights[:, None, None] * weights[None, :, None] * weights[None, None, :]
    bz = facing_blocks_field_z_t(br_t, width_m, length_m, thickness_m, g, x, y, z)
    return float(np.sum(wt * bz) / 8.0)
