"""A small stiff integrator for the vessel model: TR-BDF2 with quadratures, driven step by step.

The mission (:mod:`sim.engine.mission`) drives it one step at a time, so that it can check its
conditions at step ends, locate events on the dense output, record the sample grid and flush the
log by wall clock without restarting the integration (a restart throws away the step size and the
Jacobian; benchmarks/PROFILE.md measured that restarts triple the evaluations).

Method
------
TR-BDF2 written as a singly diagonally implicit Runge–Kutta method with an explicit first stage
(ESDIRK; Hosea & Shampine 1996): a trapezoidal stage to t + γh, then a BDF2 stage to t + h, with
γ = 2 − √2 so that both implicit stages share the diagonal coefficient d = γ/2. The method is
second order, L-stable and stiffly accurate (the step's result is the last stage, so the last
derivative is the next step's first). The embedded third-order weights of Hosea & Shampine give
the error estimate, filtered through (I − h·d·J)⁻¹ for the stiff components (Shampine's
filter). Dense output: the cubic Hermite interpolant through both step ends and their
derivatives (third order).

The state splits into *dynamic* components, which the derivatives depend on (the Newton system:
speed, state of charge, RC voltages, temperatures, the speed-hold integral), and *quadratures*
(distances and accumulated energies), which the derivatives do not depend on: they are summed
with the same stage derivatives and stay out of the Newton system and the Jacobian. The
Jacobian of the dynamic block is taken by forward differences and kept while Newton converges
well (a W-type reuse); it is refreshed when Newton converges slowly or fails.

References
----------
Hosea, M. E. & Shampine, L. F. (1996). Analysis and implementation of TR-BDF2. Applied
Numerical Mathematics 20, 21–37, doi:10.1016/0168-9274(95)00115-8.
Hairer, E. & Wanner, G. (1996). Solving Ordinary Differential Equations II, 2nd ed., Springer,
§IV.8 (step-size control, Newton iteration of implicit Runge–Kutta methods).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["METHOD", "TRBDF2", "IntegratorFailure", "StepDense", "all_finite"]

METHOD = "TR-BDF2"
"""The name of this method in a scenario's ``[solver] method``."""

_SQ2 = math.sqrt(2.0)
GAMMA = 2.0 - _SQ2
"""Fraction of the step reached by the trapezoidal stage [-]."""
D = GAMMA / 2.0
"""Diagonal coefficient of both implicit stages [-] (= 1 − √2/2)."""
W = _SQ2 / 4.0
"""Weight of the first two stage derivatives in the BDF2 stage (and the step) [-]."""
# embedded third-order weights (Hosea & Shampine 1996): b̂ = ((1 − w)/3, (3w + 1)/3, d/3)
_E1 = W - (1.0 - W) / 3.0
_E2 = W - (3.0 * W + 1.0) / 3.0
_E3 = D - D / 3.0

SAFETY = 0.9
MIN_FACTOR = 0.2
MAX_FACTOR = 5.0
NEWTON_MAX = 6
NEWTON_TOL = 0.03
"""Newton stops when its estimated remaining error is below this fraction of the tolerance."""
EPS = np.finfo(float).eps


def _rms(x: np.ndarray) -> float:
    """Root mean square of a 1-D array, √(Σx²/n), with the same floating-point operations as
    ``math.sqrt(np.mean(x**2))`` (numpy's pairwise sum, then one division by n) but without
    np.mean's Python-level dispatch, which costs more than the sum on a vector this short."""
    return math.sqrt(float(np.add.reduce(x * x)) / x.size)


def all_finite(v: np.ndarray) -> bool:
    """True when every item of a short 1-D array is finite: ``np.isfinite(v).all()`` in half
    its time at the length of a vessel's state vector."""
    return all(map(math.isfinite, v.tolist()))


class IntegratorFailure(RuntimeError):
    """The step size fell below what the time resolution allows."""


class StepDense:
    """Cubic Hermite interpolant of one step, callable with a time or an array of times
    (returns an array of shape (n,) or (n, len(t)), like scipy's dense output)."""

    __slots__ = ("f0", "f1", "h", "t0", "t1", "y0", "y1")

    def __init__(self, t0, t1, y0, y1, f0, f1) -> None:
        self.t0, self.t1, self.h = t0, t1, t1 - t0
        self.y0, self.y1, self.f0, self.f1 = y0, y1, f0, f1

    @property
    def sol(self) -> StepDense:
        """The interpolant itself (as ``solve_ivp(...).sol``)."""
        return self

    def __call__(self, t):
        if isinstance(t, float | int):
            # a single time: the basis in Python floats (numpy's 0-d arithmetic costs about a
            # microsecond an operation; the operations, and so the values, are the same)
            s = (float(t) - self.t0) / self.h
        else:
            s = (np.asarray(t, dtype=float) - self.t0) / self.h
        s2 = s * s
        s3 = s2 * s
        h00 = 2.0 * s3 - 3.0 * s2 + 1.0
        h10 = s3 - 2.0 * s2 + s
        h01 = -2.0 * s3 + 3.0 * s2
        h11 = s3 - s2
        h = self.h
        if np.ndim(s) == 0:
            return h00 * self.y0 + h10 * h * self.f0 + h01 * self.y1 + h11 * h * self.f1
        return (
            np.outer(self.y0, h00)
            + np.outer(h * self.f0, h10)
            + np.outer(self.y1, h01)
            + np.outer(h * self.f1, h11)
        )


class TRBDF2:
    """Step-by-step TR-BDF2 integration of ``fun(t, y) -> dy/dt`` from (t0, y0) towards t_bound.

    Parameters
    ----------
    fun : callable
        Right-hand side; returns a new array.
    t0 : float
        Start time [s].
    y0 : numpy.ndarray
        Start state.
    t_bound : float
        The integration does not step past this time [s].
    rtol : float
        Relative tolerance [-].
    atol : numpy.ndarray
        Absolute tolerance per component (units of the state).
    max_step : float
        Largest step [s].
    dynamic : sequence of int
        Indices of the components the derivatives depend on; the others are quadratures.
    first_step : float, optional
        First step to try [s] (default 1 s).

    After each :meth:`step`, ``t``, ``y`` and ``f`` are the new end point and :attr:`dense`
    the interpolant of the step just taken.
    """

    def __init__(
        self,
        fun,
        t0: float,
        y0: np.ndarray,
        t_bound: float,
        *,
        rtol: float,
        atol: np.ndarray,
        max_step: float,
        dynamic,
        first_step: float | None = None,
    ) -> None:
        self.fun = fun
        self.t = float(t0)
        self.y = np.array(y0, dtype=float)
        self.t_bound = float(t_bound)
        self.rtol = float(rtol)
        self.atol = np.asarray(atol, dtype=float)
        self.max_step = float(max_step)
        self.dyn = np.asarray(dynamic, dtype=np.intp)
        n = self.y.size
        quad = np.ones(n, dtype=bool)
        quad[self.dyn] = False
        self.quad = np.flatnonzero(quad)
        self.f = fun(self.t, self.y)
        self.n_fun = 1
        self.n_jac = 0
        self.n_steps = 0
        self.n_rejected = 0
        self.h = min(first_step if first_step is not None else 1.0, self.max_step)
        self.J: np.ndarray | None = None
        self.rate = 0.5  # Newton contraction rate, carried over between solves
        self.jac_fresh = False
        self._minv: np.ndarray | None = None
        self._minv_h = math.nan
        self.dense: StepDense | None = None

    # ---------------------------------------------------------------- helpers
    def _jacobian(self) -> None:
        """Forward-difference Jacobian of the dynamic block at (t, y)."""
        y, f0, dyn = self.y, self.f, self.dyn
        m = dyn.size
        J = np.empty((m, m))
        for col, j in enumerate(dyn):
            yj = y[j]
            delta = math.sqrt(EPS) * max(abs(yj), 1.0)
            yp = y.copy()
            yp[j] = yj + delta
            J[:, col] = (self.fun(self.t, yp)[dyn] - f0[dyn]) / delta
        self.n_fun += m
        self.n_jac += 1
        self.J = J
        self.jac_fresh = True
        self._minv_h = math.nan
        self.rate = 0.5

    def _iteration_matrix(self, h: float) -> np.ndarray:
        if h != self._minv_h:
            m = self.dyn.size
            self._minv = np.linalg.inv(np.eye(m) - (h * D) * self.J)
            self._minv_h = h
        return self._minv

    def _newton(self, t: float, base: np.ndarray, h: float, guess: np.ndarray, scale: np.ndarray):
        """Solve Y = base + h·d·f(t, Y) for the dynamic components (quadratures of Y are taken
        from base; f does not depend on them). Returns (Y, f(Y)) or None when Newton fails."""
        dyn = self.dyn
        minv = self._iteration_matrix(h)
        y = base.copy()
        y[dyn] = guess[dyn]
        sc = scale[dyn]
        base_dyn = base[dyn]  # the same in every iteration
        hd = h * D
        prev = None
        rate = self.rate
        for _ in range(NEWTON_MAX):
            fy = self.fun(t, y)
            self.n_fun += 1
            if not all_finite(fy):
                return None
            g = y[dyn] - base_dyn - hd * fy[dyn]
            dz = minv @ g
            norm = _rms(dz / sc)
            if prev is not None:
                rate = norm / prev if prev > 0.0 else 0.0
                if rate >= 1.0:
                    return None
            if norm < NEWTON_TOL:
                # converged: the last correction is within the tolerance; keep the evaluated
                # pair (Y, f(Y)) and do not spend an evaluation on the corrected point
                self.rate = rate
                return y, fy
            y[dyn] -= dz
            prev = norm
        return None

    # ---------------------------------------------------------------- one step
    def step(self) -> None:
        """Take one accepted step (possibly after rejected tries) towards t_bound."""
        t, y, f = self.t, self.y, self.f
        dyn, quad = self.dyn, self.quad
        if self.J is None:
            self._jacobian()
        h_min = 16.0 * EPS * max(abs(t), 1.0)
        while True:
            h = min(self.h, self.max_step, self.t_bound - t)
            if h < h_min:
                raise IntegratorFailure(f"step size {h:.3g} s below the time resolution")
            last = h >= self.t_bound - t
            scale = self.atol + self.rtol * np.abs(y)
            # trapezoidal stage to t + γh
            base2 = y + (h * D) * f
            prev = self.dense  # the last step's interpolant, extrapolated, predicts the stages
            if prev is not None and prev.t1 == t and h <= 2.0 * prev.h:
                guess2, guess3 = prev(t + GAMMA * h), prev(t + h)
            else:
                guess2, guess3 = y + (GAMMA * h) * f, None
            res2 = self._newton(t + GAMMA * h, base2, h, guess2, scale)
            res3 = None
            if res2 is not None:
                _, f2 = res2
                base3 = y + (h * W) * (f + f2)
                if guess3 is None:
                    guess3 = base3 + (h * D) * f2
                res3 = self._newton(t + h, base3, h, guess3, scale)
            if res3 is None:  # Newton failed: fresher Jacobian, else a shorter step
                if not self.jac_fresh:
                    self._jacobian()
                else:
                    self.h = 0.25 * h
                continue
            y3, f3 = res3
            y_new = y3
            y_new[quad] = y[quad] + h * (W * (f[quad] + f2[quad]) + D * f3[quad])
            err = h * (_E1 * f + _E2 * f2 + _E3 * f3)
            err[dyn] = self._iteration_matrix(h) @ err[dyn]  # Shampine's filter
            sc = self.atol + self.rtol * np.maximum(np.abs(y), np.abs(y_new))
            e = _rms(err / sc)
            if not math.isfinite(e):
                self.h = 0.25 * h
                continue
            if e > 1.0:
                self.n_rejected += 1
                self.h = h * max(MIN_FACTOR, SAFETY * e ** (-1.0 / 3.0))
                continue
            factor = MAX_FACTOR if e == 0.0 else min(MAX_FACTOR, SAFETY * e ** (-1.0 / 3.0))
            t_new = self.t_bound if last else t + h
            self.dense = StepDense(t, t_new, y, y_new, f, f3)
            self.t, self.y, self.f = t_new, y_new, f3
            if not last or factor < 1.0:  # a step cut short by t_bound says little about h
                self.h = h * factor if (factor > 1.2 or factor < 1.0) else h
            self.jac_fresh = False
            self.n_steps += 1
            return
