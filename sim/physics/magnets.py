"""Permanent magnets for small thrusters: NdFeB grades, temperature derating, and the analytic
field of rectangular blocks.

References
----------
.. [1] Furlani, E. P. (2001). Permanent Magnet and Electromechanical Devices: Materials, Analysis,
   and Applications. Academic Press, San Diego. (Charge model of uniformly magnetised blocks.)
.. [2] Ortner, M. & Coliado Bandeira, L. G. (2020). Magpylib: A free Python package for magnetic
   field computation. SoftwareX 11, 100466. doi:10.1016/j.softx.2020.100466 (the tests check the
   closed forms here against it).
.. [3] Grade tables of sintered NdFeB magnet makers (common practice): remanence ranges per grade,
   reversible temperature coefficient of Br about −0.12 %/K, and maximum working temperature by
   grade suffix.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sim.physics.errors import ModelRangeError

T_REF_C = 20.0
"""Temperature at which grade remanences are quoted [°C]."""

ALPHA_BR_NDFEB_PER_K = -0.0012
"""Reversible temperature coefficient of Br for sintered NdFeB [1/K] (common practice)."""

MIN_TEMPERATURE_C = -40.0
"""Lowest temperature [°C] for the linear derating (from memory: the usual data-sheet minimum;
NdFeB changes its easy axis near 135 K, about −138 °C)."""

_GRADE_TABLE = "sintered NdFeB grade tables of magnet makers (common practice)"


@dataclass(frozen=True)
class MagnetGrade:
    """A permanent-magnet grade.

    Attributes
    ----------
    name : str
        Grade name, e.g. ``"N42SH"``.
    br_tesla : float
        Nominal remanence at 20 °C [T].
    max_working_temp_c : float
        Highest temperature without irreversible loss in a typical magnetic circuit [°C].
    source : str
        Where the values come from.
    alpha_br_per_k : float
        Reversible temperature coefficient of Br [1/K]. Default −0.0012 (−0.12 %/K).
    """

    name: str
    br_tesla: float
    max_working_temp_c: float
    source: str
    alpha_br_per_k: float = ALPHA_BR_NDFEB_PER_K


_BR_RANGE_T = {"N35": (1.17, 1.22), "N42": (1.28, 1.32), "N52": (1.42, 1.48)}
_SUFFIX_MAX_C = {"": 80.0, "M": 100.0, "H": 120.0, "SH": 150.0, "UH": 180.0, "EH": 200.0}


def _grades() -> dict[str, MagnetGrade]:
    out: dict[str, MagnetGrade] = {}
    for base, (lo, hi) in _BR_RANGE_T.items():
        for suffix, t_max in _SUFFIX_MAX_C.items():
            name = base + suffix
            src = f"{_GRADE_TABLE}: Br {lo:.2f}…{hi:.2f} T (midpoint), suffix '{suffix or 'N'}'"
            out[name] = MagnetGrade(name, round(0.5 * (lo + hi), 4), t_max, src)
    return out


NDFEB_GRADES: dict[str, MagnetGrade] = _grades()
"""Sintered NdFeB grades N35, N42, N52, each plain (80 °C) and with suffix M, H, SH, UH, EH
(100/120/150/180/200 °C). Br is the midpoint of the grade's range. Not every maker offers every
combination (high-energy grades with high-temperature suffixes are rare) and high-coercivity
variants often have slightly lower Br; the grid is a design aid, not a catalogue."""


def _resolve(grade: MagnetGrade | str) -> MagnetGrade:
    if isinstance(grade, MagnetGrade):
        return grade
    try:
        return NDFEB_GRADES[grade]
    except (KeyError, TypeError):
        allowed = "one of " + ", ".join(NDFEB_GRADES)
        raise ModelRangeError("magnet grade", grade, allowed, "NdFeB grades") from None


def _out(x: np.ndarray) -> float | np.ndarray:
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x


def _first_bad(a: np.ndarray, bad: np.ndarray) -> float:
    return float(a[bad].flat[0]) if a.ndim else float(a)


def field_derating_factor(
    t_c: ArrayLike, alpha_per_k: float = ALPHA_BR_NDFEB_PER_K, t_ref_c: float = T_REF_C
) -> float | np.ndarray:
    """Reversible factor by which a permanent-magnet field changes with magnet temperature.

    Parameters
    ----------
    t_c : float or array
        Magnet temperature [°C].
    alpha_per_k : float
        Reversible temperature coefficient of Br [1/K]. Default −0.0012 (NdFeB).
    t_ref_c : float
        Temperature at which the field is known [°C]. Default 20.

    Returns
    -------
    float or ndarray
        Br(t)/Br(t_ref) [-]; the field of a fixed magnet geometry scales by the same factor.

    Raises
    ------
    ModelRangeError
        If ``t_c`` is non-finite or the factor would not be positive.

    Notes
    -----
    Linear reversible model: k = 1 + α (t − t_ref). It says nothing about irreversible loss; use
    :func:`remanence_t` for a grade's temperature limit.

    References
    ----------
    .. [1] Furlani (2001), Permanent Magnet and Electromechanical Devices. Academic Press.
    .. [2] NdFeB grade tables (common practice): α ≈ −0.12 %/K.
    """
    t = np.asarray(t_c, dtype=float)
    k = 1.0 + float(alpha_per_k) * (t - float(t_ref_c))
    bad = ~np.isfinite(k) | (k <= 0.0)
    if np.any(bad):
        raise ModelRangeError(
            "magnet temperature t_c",
            _first_bad(t, bad),
            "finite, with 1 + alpha_per_k·(t_c − t_ref_c) > 0",
            "linear Br derating",
        )
    return _out(k)


def remanence_t(grade: MagnetGrade | str, t_c: ArrayLike) -> float | np.ndarray:
    """Remanence of a grade at a magnet temperature, reversible linear derating.

    Parameters
    ----------
    grade : MagnetGrade or str
        A grade or a key of :data:`NDFEB_GRADES`.
    t_c : float or array
        Magnet temperature [°C], from −40 °C to the grade's maximum working temperature.

    Returns
    -------
    float or ndarray
        Br(t) [T].

    Raises
    ------
    ModelRangeError
        If the grade is unknown, or ``t_c`` is non-finite, below −40 °C, or above the grade's
        maximum working temperature (where the loss becomes irreversible and the linear model no
        longer applies).

    Notes
    -----
    Br(t) = Br(20 °C) [1 + α (t − 20)].

    References
    ----------
    .. [1] NdFeB grade tables of magnet makers (common practice).
    .. [2] Furlani (2001), Permanent Magnet and Electromechanical Devices. Academic Press.
    """
    g = _resolve(grade)
    t = np.asarray(t_c, dtype=float)
    bad = ~np.isfinite(t) | (t < MIN_TEMPERATURE_C) | (t > g.max_working_temp_c)
    if np.any(bad):
        raise ModelRangeError(
            "magnet temperature t_c",
            _first_bad(t, bad),
            f"{MIN_TEMPERATURE_C:g} ≤ t_c ≤ {g.max_working_temp_c:g} °C for {g.name} "
            "(above: irreversible loss)",
            "NdFeB remanence",
        )
    return _out(g.br_tesla * np.asarray(field_derating_factor(t, g.alpha_br_per_k, T_REF_C)))


def _check_positive(quantity: str, value: float, model: str) -> float:
    v = float(value)
    if not (np.isfinite(v) and v > 0.0):
        raise ModelRangeError(quantity, v, f"0 < {quantity} (finite)", model)
    return v


def cuboid_on_axis_field_t(
    br_t: ArrayLike, a_m: float, b_m: float, thickness_m: float, z_m: ArrayLike
) -> float | np.ndarray:
    """Field on the axis of a rectangular block magnetised through its thickness.

    Parameters
    ----------
    br_t : float or array
        Remanence (polarisation) of the block [T].
    a_m, b_m : float
        Side lengths of the pole face [m].
    thickness_m : float
        Length along the magnetisation [m].
    z_m : float or array
        Distance from the pole face along the axis, outside the block [m], ≥ 0.

    Returns
    -------
    float or ndarray
        Axial flux density B_z [T] (same sign as ``br_t``).

    Raises
    ------
    ModelRangeError
        If a dimension is not positive or ``z_m`` is negative or non-finite.

    Notes
    -----
    Charge (Coulombian) model of a block with ideal, uniform polarisation Br and recoil
    permeability 1:

        B(z) = (Br/π) [ atan(ab / (2z √(4z² + a² + b²)))
                        − atan(ab / (2(z+L) √(4(z+L)² + a² + b²))) ],

    L the thickness. The arctangent is taken as atan2(ab, 2z√…), so B(0) is the face-centre value.
    Limits: far away B → Br·abL/(2π z_c³), the field of a dipole with z_c from the block centre;
    an infinitely wide and long block gives Br/2 at its face.

    References
    ----------
    .. [1] Furlani (2001), Permanent Magnet and Electromechanical Devices. Academic Press.
    .. [2] Ortner & Coliado Bandeira (2020), SoftwareX 11, 100466 (numerical cross-check).
    """
    model = "cuboid magnet on-axis field"
    a = _check_positive("a_m", a_m, model)
    b = _check_positive("b_m", b_m, model)
    length = _check_positive("thickness_m", thickness_m, model)
    z = np.asarray(z_m, dtype=float)
    bad = ~np.isfinite(z) | (z < 0.0)
    if np.any(bad):
        raise ModelRangeError("z_m", _first_bad(z, bad), "0 ≤ z_m (outside the block) [m]", model)
    br = np.asarray(br_t, dtype=float)

    def term(d: np.ndarray) -> np.ndarray:
        return np.arctan2(a * b, 2.0 * d * np.sqrt(4.0 * d * d + a * a + b * b))

    return _out(br / np.pi * (term(z) - term(z + length)))


def facing_pair_gap_field_t(
    br_t: ArrayLike,
    a_m: float,
    b_m: float,
    thickness_m: float,
    gap_m: float,
    z_m: ArrayLike | None = None,
) -> float | np.ndarray:
    """Field on the axis between two identical blocks facing each other with opposite poles.

    Parameters
    ----------
    br_t : float or array
        Remanence of each block [T].
    a_m, b_m : float
        Side lengths of the pole faces [m].
    thickness_m : float
        Thickness of each block along the magnetisation [m].
    gap_m : float
        Distance between the two pole faces [m], > 0.
    z_m : float or array, optional
        Position along the axis measured from one face [m], 0 ≤ z ≤ gap. Default: the centre,
        gap/2.

    Returns
    -------
    float or ndarray
        Axial flux density [T].

    Notes
    -----
    Both blocks are magnetised along the same direction (north face looking at south face), so
    their fields add in the gap (superposition, no iron, recoil permeability 1):

        B(z) = B₁(z) + B₁(gap − z),   B(gap/2) = 2 B₁(gap/2),

    with B₁ from :func:`cuboid_on_axis_field_t`.

    References
    ----------
    .. [1] Furlani (2001), Permanent Magnet and Electromechanical Devices. Academic Press.
    """
    model = "facing magnet pair"
    gap = _check_positive("gap_m", gap_m, model)
    z = np.asarray(0.5 * gap if z_m is None else z_m, dtype=float)
    bad = ~np.isfinite(z) | (z < 0.0) | (z > gap)
    if np.any(bad):
        raise ModelRangeError("z_m", _first_bad(z, bad), f"0 ≤ z_m ≤ gap_m = {gap:g} m", model)
    b1 = np.asarray(cuboid_on_axis_field_t(br_t, a_m, b_m, thickness_m, z))
    b2 = np.asarray(cuboid_on_axis_field_t(br_t, a_m, b_m, thickness_m, gap - z))
    return _out(b1 + b2)
