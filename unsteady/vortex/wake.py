"""The model's point vortices: bound and wake in one contiguous store, and the far-wake lumps."""

from __future__ import annotations

import numpy as np

from .kernels import induced_velocity


class VortexStore:
    """Bound vortices of every body, then the wake in shedding order, in one set of arrays.

    One contiguous block, so that a kernel sees the bound vortices, the wake
    or both as views without copying.  Each wake vortex carries the index of
    the shedding site that shed it (``site``), and the velocity of its last
    convection step (``prev_u, prev_w``, for Adams-Bashforth 2).

    Parameters
    ----------
    n_bound : int
        Bound vortices of all bodies.
    capacity : int
        Most wake vortices the run can hold.
    single_site : bool
        Whether only one site sheds (its vortices are then the whole wake).
    """

    def __init__(self, n_bound, capacity, single_site=True):
        self.nb = nb = int(n_bound)
        self.m = 0                     # wake vortices
        self.new = 0                   # of which shed this step
        self.single_site = single_site
        self.x = np.zeros(nb + capacity)
        self.z = np.zeros(nb + capacity)
        self.g = np.zeros(nb + capacity)
        self.site = np.zeros(capacity, dtype=np.int64)
        self.born = np.zeros(capacity, dtype=np.int64)      # step at which each was shed
        self.clock = -1                                     # steps so far (set_bound counts them)
        self.vel_u, self.vel_w = np.zeros(capacity), np.zeros(capacity)
        self.prev_u, self.prev_w = np.zeros(capacity), np.zeros(capacity)
        self.bu, self.bw = np.zeros(capacity), np.zeros(capacity)

    def set_bound(self, x, z, gamma):
        """This step's bound vortices (positions m, circulations m^2/s)."""
        nb = self.nb
        self.x[:nb] = x
        self.z[:nb] = z
        self.g[:nb] = gamma
        self.new = 0
        self.clock += 1

    def shed(self, x, z, gamma, site):
        """Append one new wake vortex."""
        i = self.nb + self.m
        self.x[i], self.z[i], self.g[i] = x, z, gamma
        self.site[self.m] = site
        self.born[self.m] = self.clock
        self.m += 1
        self.new += 1

    def wake(self):
        """Views ``(x, z, gamma)`` of the wake, oldest first."""
        a, b = self.nb, self.nb + self.m
        return self.x[a:b], self.z[a:b], self.g[a:b]

    def sources(self):
        """Views ``(x, z, gamma)`` of all vortices, bound first."""
        b = self.nb + self.m
        return self.x[:b], self.z[:b], self.g[:b]

    def velocities(self, U, r_c, r_b, gust, t, soft=None, r_soft=None):
        """Velocity (m/s) of the air at the wake vortices: wake, bound vortices, freestream, gust.

        The bound vortices act through the core ``r_b``, on the wake vortices
        ``soft`` (indices) through ``r_soft``.  Returns views of the store's
        buffers.
        """
        m, nb = self.m, self.nb
        wx, wz, wg = self.wake()
        u, w = self.vel_u[:m], self.vel_w[:m]
        induced_velocity(wx, wz, wx, wz, wg, r_c, u, w)
        if soft is None or soft.size == 0:
            induced_velocity(wx, wz, self.x[:nb], self.z[:nb], self.g[:nb], r_b, self.bu[:m], self.bw[:m])
        else:
            hard = np.ones(m, bool)
            hard[soft] = False
            for sel, r in ((hard, r_b), (soft, r_soft)):
                xt, zt = wx[sel], wz[sel]
                su, sw = np.empty(xt.size), np.empty(xt.size)
                induced_velocity(xt, zt, self.x[:nb], self.z[:nb], self.g[:nb], r, su, sw)
                self.bu[:m][sel] = su
                self.bw[:m][sel] = sw
        u += self.bu[:m] + U
        w += self.bw[:m]
        if gust is not None:
            gu, gw = gust.velocity(wx, wz, t)
            u += gu
            w += gw
        return u, w

    def of_sites(self, sites, older_sites=(), before=None):
        """Wake indices of the vortices shed by any of ``sites``, and by any of ``older_sites``
        before step ``before``."""
        site = self.site[:self.m]
        mask = np.zeros(site.shape, bool)
        for k in sites:
            mask |= site == k
        if older_sites and before is not None:
            old = self.born[:self.m] < before
            for k in older_sites:
                mask |= (site == k) & old
        return np.flatnonzero(mask)

    def frozen_velocities(self, U):
        """The wake moving with the freestream U (m/s): views of the store's buffers."""
        m = self.m
        self.vel_u[:m] = U
        self.vel_w[:m] = 0.0
        return self.vel_u[:m], self.vel_w[:m]

    def convect(self, u, w, dt, second_order):
        """Move the wake one step with velocities ``u, w``.

        Adams-Bashforth 2 (``second_order``), the vortices shed this step
        taking an Euler step (E. Hairer, S. P. Norsett & G. Wanner, *Solving
        Ordinary Differential Equations I*, 2nd ed., 1993, sec. III.1);
        otherwise Euler (exact for a wake frozen at U).
        """
        m = self.m
        wx, wz, _ = self.wake()
        new = slice(m - self.new, m)
        self.prev_u[new] = u[new]
        self.prev_w[new] = w[new]
        if second_order:
            wx += dt * (1.5 * u - 0.5 * self.prev_u[:m])
            wz += dt * (1.5 * w - 0.5 * self.prev_w[:m])
        else:
            wx += dt * u
        self.prev_u[:m] = u
        self.prev_w[:m] = w
        self.new = 0

    def oldest(self, site, count):
        """The ``count`` oldest vortices shed by ``site``: their wake indices, or None if it has
        no more than ``count + 1``, and the x (m) of the youngest of them."""
        if self.single_site:
            if self.m <= count + 1:
                return None, 0.0
            return slice(0, count), self.x[self.nb + count - 1]
        own = np.flatnonzero(self.site[:self.m] == site)
        if own.size <= count + 1:
            return None, 0.0
        return own[:count], self.x[self.nb + own[count - 1]]

    def remove(self, idx):
        """Take wake vortices ``idx`` (a slice or indices) out; returns copies of their ``(x, z, gamma)``."""
        m, nb = self.m, self.nb
        keep = np.ones(m, dtype=bool)
        keep[idx] = False
        gone = ~keep
        wx, wz, wg = self.wake()
        out = (wx[gone], wz[gone], wg[gone])
        for arr in (wx, wz, wg, self.site[:m], self.born[:m], self.prev_u[:m], self.prev_w[:m]):
            arr[:keep.sum()] = arr[keep]
        self.m = int(keep.sum())
        return out


class FarWake:
    """Far-wake lumps: merged chords of old wake drifting with the air, each with the site that shed it."""

    def __init__(self, capacity=16):
        self.n = 0
        self.x, self.z, self.g = np.zeros(capacity), np.zeros(capacity), np.zeros(capacity)
        self.site = np.zeros(capacity, dtype=np.int64)
        self.born = np.zeros(capacity, dtype=np.int64)      # step at which each was shed
        self.clock = -1                                     # steps so far (set_bound counts them)

    def views(self):
        """Views ``(x, z, gamma)`` of the lumps."""
        return self.x[:self.n], self.z[:self.n], self.g[:self.n]

    def total(self):
        """Circulation of all lumps (m^2/s)."""
        return float(self.g[:self.n].sum())

    def drift(self, dx):
        """Move every lump by ``dx`` along x (the air's travel in one step)."""
        if self.n > 0:
            self.x[:self.n] += dx

    def add(self, gx, gz, gg, site):
        """Merge vortices into one lump: same circulation, at their circulation centroid.

        When the signs mix so much that the centroid would fly off (|sum| <=
        half of sum |Gamma|), the |Gamma|-weighted centroid is used instead
        (common practice).
        """
        G = float(gg.sum())
        wgt = gg if abs(G) > 0.5 * np.abs(gg).sum() else np.abs(gg)
        if self.n == self.x.shape[0]:
            cap = 2 * self.n
            self.x, self.z, self.g, self.site = (np.resize(a, cap)
                                                 for a in (self.x, self.z, self.g, self.site))
        i = self.n
        self.x[i] = (wgt * gx).sum() / wgt.sum() if wgt.sum() != 0 else gx.mean()
        self.z[i] = (wgt * gz).sum() / wgt.sum() if wgt.sum() != 0 else gz.mean()
        self.g[i] = G
        self.site[i] = site
        self.n += 1
