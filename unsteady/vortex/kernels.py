"""Numba Biot-Savart kernels: the only hot loops of the vortex model.

Every kernel sums the velocity induced by 2-D point vortices with
counter-clockwise-positive circulation ``gamma`` at ``(xs, zs)`` on target
points ``(xt, zt)``.  The singular point vortex,

    u = -gamma (z - zs) / (2 pi r^2),   w = gamma (x - xs) / (2 pi r^2),

is regularised with the Vatistas core of order n = 2 (G. H. Vatistas,
V. Kozel & W. C. Mih, Exp. Fluids 11, 1991, eq. 4 with n = 2):

    u_theta = gamma r / (2 pi sqrt(r_c^4 + r^4)),

which tends to the point vortex for r >> r_c and to solid-body rotation in
the core.  With ``r_c = 0`` the singular kernel is returned (the caller must
then keep targets off the sources).

A plain-NumPy twin of each kernel lives in ``tests/test_kernels.py`` as the
oracle.
"""

import math
import os

# Threads of the OpenMP layer that wait by spinning stall every parallel region
# for a whole time slice whenever another process holds a core; waiting
# passively costs microseconds on an idle machine and saves milliseconds on a
# busy one.  Must be set before numba starts its thread pool.
os.environ.setdefault("OMP_WAIT_POLICY", "PASSIVE")

import numpy as np  # noqa: E402
from numba import njit, prange  # noqa: E402

TWO_PI = 2.0 * math.pi


# Below this many target-source pairs one thread is used: waking the thread
# pool costs more than it saves on small sums, and far more when the cores are
# busy with other work (a parallel region waits for its slowest thread).
PARALLEL_PAIRS = 250_000


def induced_velocity(xt, zt, xs, zs, gamma, r_c, u, w, ground=None, images_only=False):
    """Velocity induced at targets by regularised point vortices (in place).

    Parameters
    ----------
    xt, zt : float64 arrays (m)
        Target points.
    xs, zs, gamma : float64 arrays (m, m, m^2/s)
        Source vortices, counter-clockwise positive.
    r_c : float
        Vatistas core radius (m); 0 gives the singular point vortex.
    u, w : float64 arrays, len(xt)
        Output, overwritten with the induced velocity (m/s).
    ground : float, optional
        Height z_g (m) of a flat ground: every source then has its image at
        (xs, 2 z_g - zs) with circulation -gamma (method of images, L. M.
        Milne-Thomson, *Theoretical Hydrodynamics*, 5th ed., 1968, sec. 13.6),
        summed in the same loop.
    images_only : bool
        With ``ground``, the images alone (a body's own images on itself).

    Large sums go to the threaded kernel, small ones to the one-thread twin
    (the same arithmetic), so short steps do not pay for waking the threads.
    """
    if ground is not None:
        real = not images_only
        if xt.shape[0] * xs.shape[0] * 2 >= PARALLEL_PAIRS:
            _induced_ground_threads(xt, zt, xs, zs, gamma, r_c, float(ground), real, u, w)
        else:
            _induced_ground_rows(xt, zt, xs, zs, gamma, r_c, float(ground), real, u, w, 0, xt.shape[0])
        return
    if xt.shape[0] * xs.shape[0] >= PARALLEL_PAIRS:
        _induced_velocity_threads(xt, zt, xs, zs, gamma, r_c, u, w)
    else:
        _induced_velocity_one(xt, zt, xs, zs, gamma, r_c, u, w)


@njit(fastmath=True, cache=True, error_model="numpy")
def _induced_rows(xt, zt, xs, zs, gamma, r_c, u, w, i0, i1):
    """The Biot-Savart sum for targets i0 <= i < i1 (one thread)."""
    ns = xs.shape[0]
    r_c4 = r_c * r_c * r_c * r_c
    inv_2pi = 1.0 / TWO_PI
    for i in range(i0, i1):
        x_i = xt[i]
        z_i = zt[i]
        su = 0.0
        sw = 0.0
        for j in range(ns):
            dx = x_i - xs[j]
            dz = z_i - zs[j]
            r2 = dx * dx + dz * dz
            f = gamma[j] / math.sqrt(r2 * r2 + r_c4)
            su -= f * dz
            sw += f * dx
        u[i] = su * inv_2pi
        w[i] = sw * inv_2pi


@njit(parallel=True, cache=True, error_model="numpy")
def _induced_velocity_threads(xt, zt, xs, zs, gamma, r_c, u, w):
    nt = xt.shape[0]
    blocks = min(nt, 64)
    for k in prange(blocks):
        _induced_rows(xt, zt, xs, zs, gamma, r_c, u, w, k * nt // blocks, (k + 1) * nt // blocks)


@njit(cache=True, error_model="numpy")
def _induced_velocity_one(xt, zt, xs, zs, gamma, r_c, u, w):
    _induced_rows(xt, zt, xs, zs, gamma, r_c, u, w, 0, xt.shape[0])


@njit(fastmath=True, cache=True, error_model="numpy")
def normal_influence(xt, zt, nx, nz, xs, zs, r_c, a):
    """Influence coefficients: normal velocity at target i per unit gamma at j.

    ``a[i, j] = (u_ij, w_ij) . (nx_i, nz_i)`` for a unit counter-clockwise
    vortex at source j (same kernel as :func:`induced_velocity`).
    """
    nt = xt.shape[0]
    ns = xs.shape[0]
    r_c4 = r_c * r_c * r_c * r_c
    inv_2pi = 1.0 / TWO_PI
    for i in range(nt):
        for j in range(ns):
            dx = xt[i] - xs[j]
            dz = zt[i] - zs[j]
            r2 = dx * dx + dz * dz
            f = inv_2pi / math.sqrt(r2 * r2 + r_c4)
            a[i, j] = f * (-dz * nx[i] + dx * nz[i])


@njit(fastmath=True, cache=True, error_model="numpy")
def _induced_ground_rows(xt, zt, xs, zs, gamma, r_c, z_g, real, u, w, i0, i1):
    """The Biot-Savart sum with each source's ground image (targets i0 <= i < i1)."""
    ns = xs.shape[0]
    r_c4 = r_c * r_c * r_c * r_c
    inv_2pi = 1.0 / TWO_PI
    for i in range(i0, i1):
        x_i = xt[i]
        z_i = zt[i]
        su = 0.0
        sw = 0.0
        for j in range(ns):
            dx = x_i - xs[j]
            if real:
                dz = z_i - zs[j]
                r2 = dx * dx + dz * dz
                f = gamma[j] / math.sqrt(r2 * r2 + r_c4)
                su -= f * dz
                sw += f * dx
            dz = z_i - (2.0 * z_g - zs[j])
            r2 = dx * dx + dz * dz
            f = -gamma[j] / math.sqrt(r2 * r2 + r_c4)
            su -= f * dz
            sw += f * dx
        u[i] = su * inv_2pi
        w[i] = sw * inv_2pi


@njit(parallel=True, cache=True, error_model="numpy")
def _induced_ground_threads(xt, zt, xs, zs, gamma, r_c, z_g, real, u, w):
    nt = xt.shape[0]
    blocks = min(nt, 64)
    for k in prange(blocks):
        _induced_ground_rows(xt, zt, xs, zs, gamma, r_c, z_g, real, u, w,
                             k * nt // blocks, (k + 1) * nt // blocks)


@njit(fastmath=True, cache=True, error_model="numpy")
def normal_influence_ground(xt, zt, nx, nz, xs, zs, r_c, z_g, a):
    """:func:`normal_influence` with each source's ground image (at 2 z_g - zs, circulation -1)."""
    nt = xt.shape[0]
    ns = xs.shape[0]
    r_c4 = r_c * r_c * r_c * r_c
    inv_2pi = 1.0 / TWO_PI
    for i in range(nt):
        for j in range(ns):
            dx = xt[i] - xs[j]
            dz = zt[i] - zs[j]
            r2 = dx * dx + dz * dz
            f = inv_2pi / math.sqrt(r2 * r2 + r_c4)
            dzi = zt[i] - (2.0 * z_g - zs[j])
            r2i = dx * dx + dzi * dzi
            fi = inv_2pi / math.sqrt(r2i * r2i + r_c4)
            a[i, j] = f * (-dz * nx[i] + dx * nz[i]) - fi * (-dzi * nx[i] + dx * nz[i])


def velocity(xt, zt, xs, zs, gamma, r_c=0.0):
    """Convenience wrapper of :func:`induced_velocity` returning new arrays."""
    xt = np.ascontiguousarray(xt, dtype=np.float64)
    zt = np.ascontiguousarray(zt, dtype=np.float64)
    u = np.empty_like(xt)
    w = np.empty_like(xt)
    induced_velocity(xt, zt,
                     np.ascontiguousarray(xs, dtype=np.float64),
                     np.ascontiguousarray(zs, dtype=np.float64),
                     np.ascontiguousarray(gamma, dtype=np.float64),
                     float(r_c), u, w)
    return u, w


# ---------------------------------------------------------------------------
# Pictures (unsteady.fields): stream function of the same regularised vortices.
@njit(parallel=True, fastmath=True, cache=True, error_model="numpy")
def induced_stream_function(xt, zt, xs, zs, gamma, r_c, psi):
    """Stream function of regularised point vortices at targets (in place).

    With ``u = d psi / dz`` and ``w = -d psi / dx``, the Vatistas n = 2 vortex
    of :func:`induced_velocity` has

        psi = -gamma / (4 pi) ln((r^2 + sqrt(r^4 + r_c^4)) / 2),

    the integral of u_theta = gamma r / (2 pi sqrt(r_c^4 + r^4)) (G. H.
    Vatistas, V. Kozel & W. C. Mih, Exp. Fluids 11, 1991, n = 2); it tends to
    the point vortex's -gamma ln(r) / (2 pi) for r >> r_c (and equals it for
    r_c = 0, where targets must stay off the sources).  Contours of psi are
    the streamlines.

    Parameters
    ----------
    xt, zt : float64 arrays (m)
        Target points.
    xs, zs, gamma : float64 arrays (m, m, m^2/s)
        Source vortices, counter-clockwise positive.
    r_c : float
        Vatistas core radius (m).
    psi : float64 array, len(xt)
        Output, overwritten (m^2/s).
    """
    nt = xt.shape[0]
    ns = xs.shape[0]
    r_c4 = r_c * r_c * r_c * r_c
    k = -1.0 / (2.0 * TWO_PI)
    for i in prange(nt):
        s = 0.0
        for j in range(ns):
            dx = xt[i] - xs[j]
            dz = zt[i] - zs[j]
            r2 = dx * dx + dz * dz
            s += gamma[j] * math.log(0.5 * (r2 + math.sqrt(r2 * r2 + r_c4)))
        psi[i] = k * s


# ---------------------------------------------------------------------------
# Several elements (vortex.elements): a core per pair of groups.
#
# Each target and each source carries a group (the element a point belongs to,
# or the element that shed a wake vortex); ``core4[gt, gs]`` is the fourth
# power of the Vatistas core through which a source of group gs acts on a
# target of group gt, ``core4_img[gt, gs]`` that of its ground image.  The
# kernel is the one of :func:`induced_velocity`; only the core is looked up.
@njit(fastmath=True, cache=True, error_model="numpy")
def induced_velocity_grouped(xt, zt, gt, xs, zs, gamma, gs, core4, core4_img, ground, z_g, u, w):
    """Velocity induced at targets by sources with a core per (target group, source group) (in place).

    ``ground``: also each source's image at (xs, 2 z_g - zs), circulation
    -gamma, through ``core4_img`` (method of images, Milne-Thomson 1968,
    sec. 13.6).  u, w are overwritten (m/s).
    """
    nt = xt.shape[0]
    ns = xs.shape[0]
    inv_2pi = 1.0 / TWO_PI
    for i in range(nt):
        x_i = xt[i]
        z_i = zt[i]
        g_i = gt[i]
        su = 0.0
        sw = 0.0
        for j in range(ns):
            dx = x_i - xs[j]
            dz = z_i - zs[j]
            r2 = dx * dx + dz * dz
            f = gamma[j] / math.sqrt(r2 * r2 + core4[g_i, gs[j]])
            su -= f * dz
            sw += f * dx
            if ground:
                dz = z_i - (2.0 * z_g - zs[j])
                r2 = dx * dx + dz * dz
                f = -gamma[j] / math.sqrt(r2 * r2 + core4_img[g_i, gs[j]])
                su -= f * dz
                sw += f * dx
        u[i] = su * inv_2pi
        w[i] = sw * inv_2pi


@njit(fastmath=True, cache=True, error_model="numpy")
def normal_influence_grouped(xt, zt, nx, nz, gt, xs, zs, gs, core4, core4_img, ground, z_g, a):
    """:func:`normal_influence` with a core per (target group, source group) and, with ``ground``,
    each source's image (circulation -1) through ``core4_img``."""
    nt = xt.shape[0]
    ns = xs.shape[0]
    inv_2pi = 1.0 / TWO_PI
    for i in range(nt):
        for j in range(ns):
            dx = xt[i] - xs[j]
            dz = zt[i] - zs[j]
            r2 = dx * dx + dz * dz
            f = inv_2pi / math.sqrt(r2 * r2 + core4[gt[i], gs[j]])
            v = f * (-dz * nx[i] + dx * nz[i])
            if ground:
                dzi = zt[i] - (2.0 * z_g - zs[j])
                r2i = dx * dx + dzi * dzi
                fi = inv_2pi / math.sqrt(r2i * r2i + core4_img[gt[i], gs[j]])
                v -= fi * (-dzi * nx[i] + dx * nz[i])
            a[i, j] = v
