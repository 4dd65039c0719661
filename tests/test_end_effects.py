"""Tests of sim.physics.end_effects: current fringing at the ends of an MHD channel."""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from scipy.special import ellipk, ellipkm1

from sim.physics import end_effects as ee
from sim.physics.errors import ModelRangeError


def _fd_channel(l_over_a: float, n: int, ext: float = 4.0) -> tuple[float, float]:
    """Independent finite-volume solution of the 2-D channel: electrodes φ = 1 (y = 0) and
    φ = 0 (y = a = 1) over |x| < L/2, insulating walls elsewhere, σ = 1. Returns the current per
    unit height and the integral of J_y over the field region |x| < L/2."""
    h = 1.0 / n
    nx, ny = round((l_over_a + 2.0 * ext) / h), n
    xc = -(l_over_a / 2.0 + ext) + h * (np.arange(nx) + 0.5)
    el = np.abs(xc) < l_over_a / 2.0
    idx = np.arange(nx * ny).reshape(nx, ny)
    diag = np.zeros((nx, ny))
    rows, cols = [], []
    for di, dj in ((1, 0), (-1, 0), (0, 1), (0, -1)):
        src = idx[max(0, -di) : nx - max(0, di), max(0, -dj) : ny - max(0, dj)]
        dst = idx[max(0, di) : nx + min(0, di), max(0, dj) : ny + min(0, dj)]
        rows.append(src.ravel())
        cols.append(dst.ravel())
        diag[max(0, -di) : nx - max(0, di), max(0, -dj) : ny - max(0, dj)] += 1.0
    b = np.zeros((nx, ny))
    diag[el, 0] += 2.0
    b[el, 0] += 2.0
    diag[el, ny - 1] += 2.0
    r = np.concatenate([*rows, idx.ravel()])
    c = np.concatenate([*cols, idx.ravel()])
    v = np.concatenate([-np.ones(sum(x.size for x in rows)), diag.ravel()])
    a_mat = sp.csr_matrix((v, (r, c)), shape=(nx * ny, nx * ny))
    phi = spla.spsolve(a_mat, b.ravel()).reshape(nx, ny)
    current = float(np.sum(2.0 * (1.0 - phi[el, 0])))
    flux = np.zeros((nx, ny + 1))
    flux[:, 1:ny] = phi[:, :-1] - phi[:, 1:]
    flux[el, 0] = 2.0 * (1.0 - phi[el, 0])
    flux[el, ny] = 2.0 * phi[el, ny - 1]
    force = float((0.5 * (flux[:, :-1] + flux[:, 1:])).sum(axis=1)[el].sum() * h)
    return current, force


@pytest.mark.parametrize("l_over_a", [0.5, 1.0, 2.0])
def test_conductance_against_finite_volume_solution(l_over_a):
    # Independent numerical solution of the same Laplace problem (finite volumes, Richardson
    # extrapolation over h = a/20 and a/40; the electrode-edge singularity makes the error O(h)):
    # conductance per unit height G/(σh) = L/a + Λ to 0.1 %; and the integral of J_y over the
    # field region equals σ·V·L (per unit height) — the Lorentz force is not changed by fringing.
    i20, _ = _fd_channel(l_over_a, 20)
    i40, f40 = _fd_channel(l_over_a, 40)
    expected = l_over_a + ee.end_leakage_factor(l_over_a, 1.0)
    assert 2.0 * i40 - i20 == pytest.approx(expected, rel=1e-3)
    assert f40 == pytest.approx(l_over_a, rel=1e-9)
    # the fringing is real: without it the FV conductance would be L/a
    assert i40 > l_over_a * 1.2


@pytest.mark.parametrize("l_over_a", [0.05, 0.3, 1.0, 3.0, 7.9, 8.1, 20.0])
def test_against_scipy_elliptic_integrals(l_over_a):
    # Λ = K(k')/(2K(k)) − L/a with k² = exp(−2πL/a) (coplanar strips, Gupta et al. 1996, from
    # memory), K from scipy.special (an independent implementation of K)
    m = math.exp(-2.0 * math.pi * l_over_a)
    ref = ellipkm1(m) / (2.0 * ellipk(m)) - l_over_a
    assert ee.end_leakage_factor(l_over_a, 1.0) == pytest.approx(ref, rel=1e-11, abs=1e-12)


def test_long_channel_limits():
    # long channel: Λ → 2 ln 2/π (each end ≈ 0.22 gap of extra electrode), factor → 1
    assert ee.END_LEAKAGE_LONG == pytest.approx(0.441271200305303, rel=1e-14)
    assert ee.end_leakage_factor(5.0, 1.0) == pytest.approx(ee.END_LEAKAGE_LONG, rel=1e-12)
    for ratio in (10.0, 100.0, 1e4):
        f = ee.thrust_per_ampere_factor(ratio, 1.0)
        assert 1.0 - f == pytest.approx(ee.END_LEAKAGE_LONG / (ratio + ee.END_LEAKAGE_LONG))
    assert ee.thrust_per_ampere_factor(1e6, 1.0) == pytest.approx(1.0, abs=1e-6)
    # short electrodes lose most of their current to the ends
    assert ee.thrust_per_ampere_factor(0.1, 1.0) < 0.25


def test_scale_invariance():
    # Laplace problem: only L/a matters
    assert ee.end_leakage_factor(0.3, 0.2) == pytest.approx(ee.end_leakage_factor(1.5, 1.0))


def test_errors():
    with pytest.raises(ModelRangeError, match="gap_m"):
        ee.end_leakage_factor(1.0, 0.0)
    with pytest.raises(ModelRangeError, match="length_m"):
        ee.end_leakage_factor(-1.0, 1.0)
