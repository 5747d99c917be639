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


# ---------------------------------------------------------------------------
# Several elements: the wake's sum on itself once per pair.
#
# The wake acts on itself through one core r_c, so the kernel is antisymmetric
# between two of its vortices: one square root gives both velocities.  Rows go
# in tiles of four: the inner loop over the later vortices j accumulates the
# four rows' sums and writes the four rows' pull on j to a column buffer
# (stores that do not alias the positions, so the loop vectorizes), then added
# to j.  With the ground, each pair's two images share one distance too.
#: row blocks of the threaded wake sum (fixed, so the sum does not depend on the threads)
WAKE_BLOCKS = 16


#: bytes to which the once-per-pair wake sum aligns its arrays (a cache line; any SIMD width divides it)
ALIGN_BYTES = 64


def _aligned_rows(rows, m):
    """An uninitialised C-contiguous (rows, mp) float64 array, mp >= m padded to whole ALIGN_BYTES,
    so that each row starts on an ALIGN_BYTES boundary (the kernels use its first m columns; a
    [:, :m] view would not be contiguous, and the compiled loops would not vectorize on it)."""
    per = ALIGN_BYTES // 8
    mp = -(-max(m, 1) // per) * per
    buf = np.empty(rows * mp + per)
    k = (-buf.ctypes.data % ALIGN_BYTES) // 8
    return buf[k:k + rows * mp].reshape(rows, mp)


def _aligned(a):
    """A copy of the 1-D float64 array ``a`` starting on an ALIGN_BYTES boundary."""
    out = _aligned_rows(1, a.shape[0])[0, :a.shape[0]]
    out[:] = a
    return out


def wake_self_velocity(wx, wz, wg, r_c, u, w, ground=None):
    """The wake's velocity (m/s) on itself through the core ``r_c`` (in place), each pair once.

    The same sum as ``induced_velocity(wx, wz, wx, wz, wg, r_c, u, w, ground)``
    in another order (round-off apart).  Large sums run on threads over
    ``WAKE_BLOCKS`` fixed blocks of tiles, each into its own buffers, added in
    block order: the same arithmetic on any number of threads.
    """
    m = wx.shape[0]
    blocks = WAKE_BLOCKS if m * m // 2 >= PARALLEL_PAIRS and m >= 8 * WAKE_BLOCKS else 1
    edges = _tile_blocks(m, blocks)
    # every array on a 64-byte boundary (rows too): the compiled loops peel a few iterations to
    # reach an aligned address, and with fast math where they start regroups the sums, so an
    # array's place in memory would otherwise show in the last bits
    wx, wz, wg = _aligned(wx), _aligned(wz), _aligned(wg)
    bu, bw, cu, cw = (_aligned_rows(blocks, m) for _ in range(4))
    g = ground is not None
    z_g = float(ground) if g else 0.0
    if blocks > 1:
        _wake_tiles_threads(wx, wz, wg, r_c, g, z_g, edges, bu, bw, cu, cw)
    else:
        _wake_tiles_block(wx, wz, wg, r_c, g, z_g, 0, edges[1], bu[0], bw[0], cu[0], cw[0])
    _sum_blocks(bu, bw, u, w)


@njit(cache=True)
def _tile_blocks(m, blocks):
    """Tile edges (tiles of four rows) of ``blocks`` blocks with about equal pair counts."""
    nt = m // 4
    edges = np.empty(blocks + 1, dtype=np.int64)
    edges[0] = 0
    total = m * (m - 1) / 2.0
    t = 0
    done = 0.0
    for k in range(1, blocks):
        while t < nt and done < total * k / blocks:
            done += 4.0 * (m - 4 * t) - 10.0     # pairs of rows 4t..4t+3 with later rows
            t += 1
        edges[k] = t
    edges[blocks] = nt
    return edges


@njit(fastmath=True, cache=True, error_model="numpy")
def _tile_free(wx, wz, wg, r_c4, i0, cu, cw):
    """Rows i0..i0+3 against every later vortex j: their four sums, and their pull on j into cu, cw."""
    m = wx.shape[0]
    xa = wx[i0]; xb = wx[i0 + 1]; xc = wx[i0 + 2]; xd = wx[i0 + 3]  # noqa: E702
    za = wz[i0]; zb = wz[i0 + 1]; zc = wz[i0 + 2]; zd = wz[i0 + 3]  # noqa: E702
    ga = wg[i0]; gb = wg[i0 + 1]; gc = wg[i0 + 2]; gd = wg[i0 + 3]  # noqa: E702
    ua = ub = uc = ud = 0.0
    wa = wb = wc = wd = 0.0
    for j in range(i0 + 4, m):
        xj = wx[j]
        zj = wz[j]
        gj = wg[j]
        dx = xa - xj
        dz = za - zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ua -= gj * f * dz
        wa += gj * f * dx
        su = ga * f * dz
        sw = ga * f * dx
        dx = xb - xj
        dz = zb - zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ub -= gj * f * dz
        wb += gj * f * dx
        su += gb * f * dz
        sw += gb * f * dx
        dx = xc - xj
        dz = zc - zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        uc -= gj * f * dz
        wc += gj * f * dx
        su += gc * f * dz
        sw += gc * f * dx
        dx = xd - xj
        dz = zd - zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ud -= gj * f * dz
        wd += gj * f * dx
        su += gd * f * dz
        sw += gd * f * dx
        cu[j] = su
        cw[j] = -sw
    return ua, ub, uc, ud, wa, wb, wc, wd


@njit(fastmath=True, cache=True, error_model="numpy")
def _tile_images(wx, wz, wg, r_c4, z_g, i0, cu, cw):
    """:func:`_tile_free` for the ground images: the image of j on row i and of row i on j share
    dz' = z_i + z_j - 2 z_g (circulations -gamma)."""
    m = wx.shape[0]
    xa = wx[i0]; xb = wx[i0 + 1]; xc = wx[i0 + 2]; xd = wx[i0 + 3]  # noqa: E702
    za = wz[i0] - 2.0 * z_g; zb = wz[i0 + 1] - 2.0 * z_g  # noqa: E702
    zc = wz[i0 + 2] - 2.0 * z_g; zd = wz[i0 + 3] - 2.0 * z_g  # noqa: E702
    ga = wg[i0]; gb = wg[i0 + 1]; gc = wg[i0 + 2]; gd = wg[i0 + 3]  # noqa: E702
    ua = ub = uc = ud = 0.0
    wa = wb = wc = wd = 0.0
    for j in range(i0 + 4, m):
        xj = wx[j]
        zj = wz[j]
        gj = wg[j]
        dx = xa - xj
        dz = za + zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ua += gj * f * dz
        wa -= gj * f * dx
        su = ga * f * dz
        sw = ga * f * dx
        dx = xb - xj
        dz = zb + zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ub += gj * f * dz
        wb -= gj * f * dx
        su += gb * f * dz
        sw += gb * f * dx
        dx = xc - xj
        dz = zc + zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        uc += gj * f * dz
        wc -= gj * f * dx
        su += gc * f * dz
        sw += gc * f * dx
        dx = xd - xj
        dz = zd + zj
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        ud += gj * f * dz
        wd -= gj * f * dx
        su += gd * f * dz
        sw += gd * f * dx
        cu[j] = su
        cw[j] = sw
    return ua, ub, uc, ud, wa, wb, wc, wd


@njit(fastmath=True, cache=True, error_model="numpy")
def _pair(wx, wz, wg, r_c4, ground, z_g, i, j, u, w):
    """One pair (i, j) and, with the ground, its two images, added to both."""
    dx = wx[i] - wx[j]
    dz = wz[i] - wz[j]
    r2 = dx * dx + dz * dz
    f = 1.0 / math.sqrt(r2 * r2 + r_c4)
    u[i] -= wg[j] * f * dz
    w[i] += wg[j] * f * dx
    u[j] += wg[i] * f * dz
    w[j] -= wg[i] * f * dx
    if ground:
        dz = wz[i] + wz[j] - 2.0 * z_g
        r2 = dx * dx + dz * dz
        f = 1.0 / math.sqrt(r2 * r2 + r_c4)
        u[i] += wg[j] * f * dz
        w[i] -= wg[j] * f * dx
        u[j] += wg[i] * f * dz
        w[j] += wg[i] * f * dx


@njit(fastmath=True, cache=True, error_model="numpy")
def _wake_tiles_block(wx, wz, wg, r_c, ground, z_g, t0, t1, u, w, cu, cw):
    """Tiles t0 <= t < t1 (rows 4t..4t+3) into the buffers u, w (zeroed here, scaled by 1/2pi); the
    block holding the last tile also takes the last rows (fewer than four) and, with the ground,
    each vortex's own image."""
    m = wx.shape[0]
    nt = m // 4
    r_c4 = r_c * r_c * r_c * r_c
    for i in range(m):
        u[i] = 0.0
        w[i] = 0.0
    for t in range(t0, t1):
        i0 = 4 * t
        for i in range(i0, i0 + 4):
            for j in range(i + 1, i0 + 4):
                _pair(wx, wz, wg, r_c4, ground, z_g, i, j, u, w)
        r = _tile_free(wx, wz, wg, r_c4, i0, cu, cw)
        for j in range(i0 + 4, m):
            u[j] += cu[j]
            w[j] += cw[j]
        if ground:
            q = _tile_images(wx, wz, wg, r_c4, z_g, i0, cu, cw)
            for j in range(i0 + 4, m):
                u[j] += cu[j]
                w[j] += cw[j]
            for k in range(4):
                u[i0 + k] += q[k]
                w[i0 + k] += q[4 + k]
        for k in range(4):
            u[i0 + k] += r[k]
            w[i0 + k] += r[4 + k]
    if t1 == nt:
        for i in range(4 * nt, m):
            for j in range(i + 1, m):
                _pair(wx, wz, wg, r_c4, ground, z_g, i, j, u, w)
        if ground:
            for i in range(m):
                dz = 2.0 * (wz[i] - z_g)
                u[i] += wg[i] * dz / math.sqrt(dz * dz * dz * dz + r_c4)
    inv_2pi = 1.0 / TWO_PI
    for i in range(m):
        u[i] *= inv_2pi
        w[i] *= inv_2pi


@njit(parallel=True, cache=True, error_model="numpy")
def _wake_tiles_threads(wx, wz, wg, r_c, ground, z_g, edges, bu, bw, cu, cw):
    for k in prange(edges.shape[0] - 1):
        _wake_tiles_block(wx, wz, wg, r_c, ground, z_g, edges[k], edges[k + 1], bu[k], bw[k], cu[k], cw[k])


@njit(cache=True)
def _sum_blocks(bu, bw, u, w):
    """u, w = the blocks' buffers added in block order."""
    m = u.shape[0]
    for i in range(m):
        u[i] = bu[0, i]
        w[i] = bw[0, i]
    for k in range(1, bu.shape[0]):
        for i in range(m):
            u[i] += bu[k, i]
            w[i] += bw[k, i]
