"""A bracketed scalar root finder (Brent's method) in plain Python.

The engine's algebraic solves (the speed hold, power mode, fold-back) and the steady checks of
``brinebolt check`` need a bracketed root of a scalar function. Importing any part of SciPy for
that costs about 0.3 s of start-up, more than the whole of ``brinebolt check`` may take, so the
method lives here. It follows the step-by-step arithmetic of SciPy's ``brentq`` (inverse quadratic
extrapolation, secant, bisection, in that order of preference) operation for operation, so both
give the same root to the last bit; ``tests/test_roots.py`` holds it to that.

References
----------
.. [1] Brent, R. P. (1973). Algorithms for Minimization without Derivatives, ch. 4.
   Prentice-Hall, Englewood Cliffs NJ.
.. [2] SciPy ``scipy.optimize.brentq`` (the reference library the results are checked against).
"""

from __future__ import annotations

import math
from collections.abc import Callable

__all__ = ["brent_root"]

_EPS = 2.220446049250313e-16
"""Machine epsilon of a float64 [-]."""


def brent_root(
    f: Callable[[float], float],
    a: float,
    b: float,
    *,
    xtol: float = 2e-12,
    rtol: float = 4 * _EPS,
    maxiter: int = 100,
) -> float:
    """A root of ``f`` in the bracket ``[a, b]`` by Brent's method [1]_.

    Parameters
    ----------
    f : callable
        A continuous scalar function of one float; ``f(a)`` and ``f(b)`` must not have the same
        sign. Its unit is the caller's (only signs and ratios matter).
    a, b : float
        The ends of the bracket, in the unit of ``f``'s argument.
    xtol, rtol : float
        The root ``x0`` is within ``xtol + rtol * |x0|`` of the true root (same unit as ``a``);
        ``xtol > 0`` and ``rtol >= 4 eps``.
    maxiter : int
        Most iterations (function calls beyond the two ends).

    Returns
    -------
    float
        The root, in the unit of ``a`` and ``b``.

    Raises
    ------
    ValueError
        When ``f(a)`` and ``f(b)`` have the same sign, ``f`` returns NaN, or the tolerances are
        out of range.
    RuntimeError
        When ``maxiter`` iterations do not converge.

    Notes
    -----
    Each iteration keeps the bracket ``[xcur, xblk]`` with ``|f(xcur)| <= |f(xblk)|`` and tries
    inverse quadratic extrapolation (or the secant when only two points differ); the step is
    taken when it is shorter than half the previous one and than three quarters of the
    bracket, else the bracket is bisected. No step is shorter than half the tolerance.

    References
    ----------
    .. [1] Brent, R. P. (1973). Algorithms for Minimization without Derivatives, ch. 4.
       Prentice-Hall.
    """
    if xtol <= 0:
        raise ValueError(f"xtol too small ({xtol:g} <= 0)")
    if rtol < _EPS:
        raise ValueError(f"rtol too small ({rtol:g} < {_EPS:g})")
    if maxiter < 0:
        raise ValueError("maxiter must be >= 0")

    def call(x: float) -> float:
        fx = float(f(x))
        if math.isnan(fx):
            raise ValueError(f"The function value at x={x} is NaN; solver cannot continue.")
        return fx

    xpre, xcur = float(a), float(b)
    xblk = fblk = spre = scur = 0.0
    fpre = call(xpre)
    fcur = call(xcur)
    if fpre * fcur > 0:
        raise ValueError("f(a) and f(b) must have different signs")
    if fpre == 0:
        return xpre
    if fcur == 0:
        return xcur
    for _ in range(maxiter):
        if fpre * fcur < 0:
            xblk, fblk = xpre, fpre
            spre = scur = xcur - xpre
        if abs(fblk) < abs(fcur):
            xpre, xcur, xblk = xcur, xblk, xcur
            fpre, fcur, fblk = fcur, fblk, fcur
        delta = (xtol + rtol * abs(xcur)) / 2
        sbis = (xblk - xcur) / 2
        if fcur == 0 or abs(sbis) < delta:
            return xcur
        if abs(spre) > delta and abs(fcur) < abs(fpre):
            if xpre == xblk:  # interpolate (secant)
                stry = -fcur * (xcur - xpre) / (fcur - fpre)
            else:  # extrapolate (inverse quadratic)
                dpre = (fpre - fcur) / (xpre - xcur)
                dblk = (fblk - fcur) / (xblk - xcur)
                stry = -fcur * (fblk * dblk - fpre * dpre) / (dblk * dpre * (fblk - fpre))
            limit = 3 * abs(sbis) - delta
            if abs(spre) < limit:  # the smaller of the two (as C's MIN, also for NaN)
                limit = abs(spre)
            if 2 * abs(stry) < limit:  # a good short step
                spre, scur = scur, stry
            else:  # bisect
                spre = scur = sbis
        else:  # bisect
            spre = scur = sbis
        xpre, fpre = xcur, fcur
        if abs(scur) > delta:
            xcur += scur
        else:
            xcur += delta if sbis > 0 else -delta
        fcur = call(xcur)
    raise RuntimeError(f"Failed to converge after {maxiter} iterations, value is {xcur}")
