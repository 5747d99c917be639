"""The numba Biot-Savart kernels against a plain-NumPy twin (the oracle)."""

import math

import numpy as np
import pytest

from unsteady.vortex.kernels import induced_velocity, normal_influence, velocity


def twin_velocity(xt, zt, xs, zs, gamma, r_c):
    """Plain-NumPy regularised point-vortex sum (Vatistas et al. 1991, n = 2)."""
    dx = xt[:, None] - xs[None, :]
    dz = zt[:, None] - zs[None, :]
    r2 = dx * dx + dz * dz
    f = gamma[None, :] / (2 * np.pi * np.sqrt(r2 * r2 + r_c ** 4))
    return (-f * dz).sum(axis=1), (f * dx).sum(axis=1)


@pytest.mark.parametrize("r_c", [0.0, 1e-3, 0.05])
@pytest.mark.parametrize("n_src", [300, 5000])      # one-thread and threaded kernels
def test_induced_velocity_matches_numpy_twin(r_c, n_src):
    rng = np.random.default_rng(1)
    xs, zs, g = rng.normal(size=(3, n_src))
    xt, zt = rng.normal(size=(2, 257)) + 0.01
    u = np.empty(257)
    w = np.empty(257)
    induced_velocity(xt, zt, xs, zs, g, r_c, u, w)
    ut, wt = twin_velocity(xt, zt, xs, zs, g, r_c)
    assert np.allclose(u, ut, rtol=1e-12, atol=1e-12 * np.abs(ut).max())
    assert np.allclose(w, wt, rtol=1e-12, atol=1e-12 * np.abs(wt).max())


def test_single_vortex_is_counter_clockwise_with_biot_savart_speed():
    # A counter-clockwise vortex of strength G at the origin: speed G / (2 pi r),
    # directed counter-clockwise (common practice: point vortex, Saffman 1992 ch. 1)
    G, r = 2.5, 0.7
    u, w = velocity(np.array([r, 0.0]), np.array([0.0, r]), [0.0], [0.0], [G])
    assert u[0] == pytest.approx(0.0, abs=1e-15) and w[0] == pytest.approx(G / (2 * math.pi * r), rel=1e-14)
    assert u[1] == pytest.approx(-G / (2 * math.pi * r), rel=1e-14) and w[1] == pytest.approx(0.0, abs=1e-15)


def test_vatistas_core_profile():
    # u_theta = G r / (2 pi sqrt(r_c^4 + r^4)) (Vatistas, Kozel & Mih 1991, n = 2)
    G, r_c = 1.0, 0.1
    r = np.array([0.01, 0.05, 0.1, 0.3, 1.0])
    u, w = velocity(r, np.zeros_like(r), [0.0], [0.0], [G], r_c)
    assert np.allclose(w, G * r / (2 * np.pi * np.sqrt(r_c ** 4 + r ** 4)), rtol=1e-13)
    # self-induction of a regularised vortex is zero
    u0, w0 = velocity([0.0], [0.0], [0.0], [0.0], [G], r_c)
    assert u0[0] == 0.0 and w0[0] == 0.0


def test_normal_influence_matches_velocity_dot_normal():
    rng = np.random.default_rng(2)
    xt, zt = rng.normal(size=(2, 20))
    th = rng.uniform(0, 2 * np.pi, 20)
    nx, nz = np.cos(th), np.sin(th)
    xs, zs = rng.normal(size=(2, 15)) + 3.0
    a = np.empty((20, 15))
    normal_influence(xt, zt, nx, nz, xs, zs, 0.0, a)
    for j in range(15):
        e = np.zeros(15)
        e[j] = 1.0
        u, w = twin_velocity(xt, zt, xs, zs, e, 0.0)
        assert np.allclose(a[:, j], u * nx + w * nz, rtol=1e-12, atol=1e-14)


# -- several elements: a core per (target group, source group), vortex.elements.CrossCores ----------------

def twin_grouped(xt, zt, gt, xs, zs, gamma, gs, core4, core4_img, z_g=None):
    """Plain-NumPy sum with the core looked up per pair (Vatistas et al. 1991, n = 2), images optional."""
    dx = xt[:, None] - xs[None, :]
    dz = zt[:, None] - zs[None, :]
    r2 = dx * dx + dz * dz
    f = gamma[None, :] / (2 * np.pi * np.sqrt(r2 * r2 + core4[gt[:, None], gs[None, :]]))
    u, w = (-f * dz).sum(axis=1), (f * dx).sum(axis=1)
    if z_g is not None:
        dzi = zt[:, None] - (2 * z_g - zs[None, :])
        r2 = dx * dx + dzi * dzi
        f = -gamma[None, :] / (2 * np.pi * np.sqrt(r2 * r2 + core4_img[gt[:, None], gs[None, :]]))
        u, w = u + (-f * dzi).sum(axis=1), w + (f * dx).sum(axis=1)
    return u, w


def _groups(rng, n_t, n_s):
    core4 = rng.uniform(0.0, 0.1, size=(2, 4)) ** 4
    core4_img = rng.uniform(0.0, 0.1, size=(2, 4)) ** 4
    return (rng.integers(0, 2, n_t).astype(np.int64), rng.integers(0, 4, n_s).astype(np.int64),
            core4, core4_img)


@pytest.mark.parametrize("z_g", [None, -1.5])
def test_grouped_velocity_matches_numpy_twin(z_g):
    from unsteady.vortex.kernels import induced_velocity_grouped
    rng = np.random.default_rng(5)
    xt, zt = rng.normal(size=(2, 40))
    xs, zs, g = rng.normal(size=(3, 70))
    gt, gs, c4, c4i = _groups(rng, 40, 70)
    u, w = np.empty(40), np.empty(40)
    induced_velocity_grouped(xt, zt, gt, xs, zs, g, gs, c4, c4i, z_g is not None, z_g or 0.0, u, w)
    ut, wt = twin_grouped(xt, zt, gt, xs, zs, g, gs, c4, c4i, z_g)
    assert np.allclose(u, ut, rtol=1e-11, atol=1e-12 * np.abs(ut).max())
    assert np.allclose(w, wt, rtol=1e-11, atol=1e-12 * np.abs(wt).max())


@pytest.mark.parametrize("z_g", [None, -1.5])
def test_grouped_normal_influence_is_velocity_dot_normal(z_g):
    from unsteady.vortex.kernels import normal_influence_grouped
    rng = np.random.default_rng(7)
    xt, zt = rng.normal(size=(2, 20))
    th = rng.uniform(0, 2 * np.pi, 20)
    nx, nz = np.cos(th), np.sin(th)
    xs, zs = rng.normal(size=(2, 6))
    gt, gs, c4, c4i = _groups(rng, 20, 6)
    a = np.empty((20, 6))
    normal_influence_grouped(xt, zt, nx, nz, gt, xs, zs, gs, c4, c4i, z_g is not None, z_g or 0.0, a)
    for j in range(6):
        u, w = twin_grouped(xt, zt, gt, xs[j:j + 1], zs[j:j + 1], np.ones(1), gs[j:j + 1], c4, c4i, z_g)
        assert np.allclose(a[:, j], u * nx + w * nz, rtol=1e-11, atol=1e-13)
