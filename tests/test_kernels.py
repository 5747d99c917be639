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


@pytest.mark.parametrize("m", [0, 1, 6, 91, 803])           # one block (tails of 0-3 rows); threaded blocks
@pytest.mark.parametrize("z_g", [None, -1.5])
def test_wake_sum_once_per_pair_matches_the_full_sum(z_g, m):
    # the wake on itself through one core, each pair once (the kernel is antisymmetric): against the
    # full NumPy sum (a vortex on itself adds nothing but, with the ground, its own image)
    from unsteady.vortex.kernels import wake_self_velocity
    rng = np.random.default_rng(6)
    wx, wz, wg = rng.normal(size=(3, m))
    u, w = np.empty(m), np.empty(m)
    wake_self_velocity(wx, wz, wg, 0.07, u, w, ground=z_g)
    one = np.full((1, 1), 0.07 ** 4)
    zero = np.zeros(m, np.int64)
    ut, wt = twin_grouped(wx, wz, zero, wx, wz, wg, zero, one, one, z_g)
    for got, want in ((u, ut), (w, wt)):
        assert np.allclose(got, want, rtol=1e-10, atol=1e-12 * (np.abs(want).max() if m else 1.0))


def test_wake_blocks_cover_the_tiles_with_about_equal_pairs():
    # the threaded wake sum's fixed blocks: every tile of four rows once, pair counts about equal
    from unsteady.vortex.kernels import WAKE_BLOCKS, _tile_blocks
    m = 1001
    e = _tile_blocks(m, WAKE_BLOCKS)
    assert e[0] == 0 and e[-1] == m // 4 and np.all(np.diff(e) > 0)
    pairs = np.array([sum(4 * (m - 4 * t) - 10 for t in range(a, b)) for a, b in zip(e[:-1], e[1:])])
    assert np.abs(pairs - pairs.mean()).max() <= 4 * m


@pytest.mark.parametrize("m", [203, 1001])                  # one block; threaded blocks
@pytest.mark.parametrize("z_g", [None, -1.5])
def test_wake_sum_once_per_pair_has_the_same_bits_wherever_the_arrays_sit(z_g, m):
    # the same numbers at eight offsets in memory give the same bits (fast math regroups a sum by
    # where the compiled loop's alignment peel starts; the kernel aligns its copies first)
    from unsteady.vortex.kernels import wake_self_velocity
    base = np.random.default_rng(7).normal(size=(3, m))
    got = []
    for off in range(8):
        buf = np.zeros(3 * (m + 16))
        xs = [buf[k * (m + 16) + off:k * (m + 16) + off + m] for k in range(3)]
        for k in range(3):
            xs[k][:] = base[k]
        u, w = np.empty(m), np.empty(m)
        wake_self_velocity(*xs, 0.01, u, w, ground=z_g)
        got.append(np.concatenate((u, w)))
    assert all(np.array_equal(got[0], g) for g in got[1:])
