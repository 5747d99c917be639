"""Thick sections: the whole outline cut into linear-strength vortex panels, a body model of the solver's stages.

**Outline.**  ``N`` straight panels (``[airfoil] elements``, even), half on
each surface, their nodes at the cosine-spaced chord stations of
:func:`~unsteady.inputs.sections.cosine_nodes` (dense at both edges).  A
NACA 4-digit outline follows E. N. Jacobs, K. E. Ward & R. M. Pinkerton,
NACA Report 460 (1933): the half-thickness laid off perpendicular to the
mean line, with the closed-trailing-edge thickness law (x^4 coefficient
-0.1036 instead of the published -0.1015, common practice), so both
surfaces meet at (1, 0).  A coordinates file gives its own surfaces; if
they do not meet, each surface is sheared linearly in x onto the mean of
its two trailing-edge points (common practice), which closes the outline.
The nodes run from the trailing edge along the lower surface, round the
leading edge and back along the upper surface (clockwise), so the outside
lies to the left of each panel.

**Method** (J. Katz & A. Plotkin, *Low-Speed Aerodynamics*, 2nd ed., 2001,
ch. 11, the linear-strength vortex method, and ch. 13 for its time
stepping).  The vortex sheet strength gamma is linear on each panel and
continuous at the nodes (N + 1 values); no flow crosses the panels at their
mid-points (N rows) and the Kutta condition, gamma_0 + gamma_N = 0 (equal
speeds leaving the two trailing-edge panels), closes the system.  For the
solver's stages the unknowns are the node circulations G_k = w_k gamma_k,
w_k the half-lengths of the panels meeting at node k, so that sum G_k is the
body's circulation (Kelvin's row as for a camber line) and the G_k, placed
at the nodes, are the point vortices through which the body acts on its
wake.  The Kutta row is a collocation point with zero normal, so its
right-hand side and the shed vortices' border entries vanish.  The matrix is
built in the body frame and factored once (the body is rigid).

**Loads** (:class:`SurfaceLoads`).  Pressure on the outside of each panel
mid-point from the unsteady Bernoulli equation in the frame of the air at
rest, following a point of the body (Katz & Plotkin, ch. 13)::

    Cp = (|V_b|^2 - |q|^2 - 2 dphi/dt) / U^2

with V_b the point's velocity relative to the undisturbed air (flight,
motion, gust), q the outside velocity relative to the point and phi the
disturbance potential there.  q is tangential and equals the inside
velocity less the sheet strength gamma; the enclosed air is irrotational,
so relative to the body it rests when the body translates and has a fixed
pattern per unit pitch rate, computed once (``inner_rotation``).  (The sum
of the velocities on the surface, principal value - gamma / 2, gives the
same q in the limit but converges only at first order in the panel length
on flat panels: the lift 0.6 % low at 160 panels against 0.05 %.  Where
the outline is thinner than two panel lengths, next to the trailing edge,
the enclosed air is not resolved and the surface sum is blended in, which
keeps a cusped trailing edge right.  A gust that is not a potential flow
over the body is treated like one here.)  phi is the potential of
a chain of constant-strength doublet segments through the nodes, the wake
(newest first) and the far wake, the same vortices as the point vortices
(:func:`~unsteady.vortex.panel_kernels.chain_potential`), so its only cut
runs along the body and the wake.  Forces and moments are the integral of
-Cp n over the panels.  The impulse route is that of the camber line
(:mod:`~unsteady.vortex.loads`, J. C. Wu 1981) plus the rate of change of
the momentum of the air enclosed by the outline, rho d/dt of the closed
integral of phi_inside n ds (Gauss's theorem; phi_inside = phi - mu, the
chain's strength on that panel); the enclosed air's moment is not added,
so ``cm_impulse`` of a pitching thick section is only indicative.

Known limits: the sheet acts on the wake through point vortices at the
nodes (exact far from the body, a few panel lengths of smearing close to
it); with the Kutta condition of equal trailing-edge speeds the pressures
of the two trailing-edge panels differ by 2 dGamma/dt / U^2 in unsteady
flow, a small and local error of vortex-panel methods with a lumped wake.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..inputs.sections import cosine_nodes  # noqa: F401
from .bodies import BodyPoints, rotate
from .kernels import induced_velocity
from .loads import backward_derivative, impulse_loads
from .panel_kernels import (chain_image_potential, chain_potential, chain_segment_angles,
                            panel_image_velocity_matrices, ray_vortex_potential,
                            panel_velocity_matrices)

from ..inputs.thick import DEFAULT_PANELS, MIN_PANELS, MIN_THICKNESS  # noqa: F401  (the limits check applies)
from ..inputs.thick import surface_nodes


#: Wake (chords, newest first) whose potential is summed at every panel mid-point; the older
#: wake's, smooth over the body, at every COARSE-th mid-point and interpolated linearly in between
#: (measured on the benchmark case of tools/bench_thick.py: cl moves by 4e-4 of its peak, Cp by 6e-4;
#: the run is 20 % faster).
NEAR_WAKE_CHORDS = 2
COARSE = 4


def _outline_fields(xi, zeta):
    """Panel fields of a closed outline's nodes ``xi, zeta`` (m, lower trailing edge -> leading edge ->
    upper trailing edge): end points, mid-points, unit tangents and normals, lengths, the nodes'
    half-panel weights and the enclosed area (clockwise: the shoelace sign)."""
    dx, dz = np.diff(xi), np.diff(zeta)
    ds = np.hypot(dx, dz)
    t_xi, t_zeta = dx / ds, dz / ds
    w = np.zeros(len(xi))
    w[:-1] += 0.5 * ds
    w[1:] += 0.5 * ds
    area = 0.5 * float(np.sum(xi[1:] * zeta[:-1] - xi[:-1] * zeta[1:]))
    return dict(xi_n=xi, zeta_n=zeta, xi_c=0.5 * (xi[:-1] + xi[1:]), zeta_c=0.5 * (zeta[:-1] + zeta[1:]),
                t_xi=t_xi, t_zeta=t_zeta, n_xi=-t_zeta, n_zeta=t_xi, ds=ds, w=w, area=area)


@dataclass(frozen=True)
class SurfaceGeometry:
    """The paneled outline in body coordinates (metres about the pivot, zero pitch).

    ``xi_n, zeta_n`` (N + 1 nodes), per panel ``xi_c, zeta_c`` (mid-points),
    ``t_xi, t_zeta`` (unit tangent, node k to k + 1), ``n_xi, n_zeta``
    (unit outward normal), ``ds`` (length); ``w`` the node weights (half the
    lengths of the panels that meet there); the chord fractions
    ``x_surface, z_surface`` of the mid-points; ``xi_ref, zeta_ref`` the
    quarter-chord point on the mean line (moment reference); ``area`` (m^2).
    """

    xi_n: np.ndarray
    zeta_n: np.ndarray
    xi_c: np.ndarray
    zeta_c: np.ndarray
    t_xi: np.ndarray
    t_zeta: np.ndarray
    n_xi: np.ndarray
    n_zeta: np.ndarray
    ds: np.ndarray
    w: np.ndarray
    x_surface: np.ndarray
    z_surface: np.ndarray
    xi_ref: float
    zeta_ref: float
    chord: float
    area: float

    @classmethod
    def from_section(cls, section, n_panels, chord, pivot):
        """Panel the section's outline (see :func:`surface_nodes`)."""
        x, z = surface_nodes(section, n_panels)
        z_ref = float(np.asarray(section.camber(np.array([0.25])), float)[0])
        return cls.from_nodes(x, z, chord, pivot, z_ref)

    @classmethod
    def from_nodes(cls, x, z, chord, pivot, z_ref=0.0):
        """From outline nodes in chord fractions (lower trailing edge -> leading edge -> upper
        trailing edge, first and last the same point); ``z_ref``: height of the moment reference
        at the quarter chord (chord fraction)."""
        x, z = np.asarray(x, float), np.asarray(z, float)
        xi = (x - pivot) * chord
        zeta = z * chord
        xm, zm = 0.5 * (x[:-1] + x[1:]), 0.5 * (z[:-1] + z[1:])
        return cls(**_outline_fields(xi, zeta), x_surface=xm, z_surface=zm, xi_ref=(0.25 - pivot) * chord,
                   zeta_ref=float(z_ref) * chord, chord=float(chord))

    @classmethod
    def placed(cls, section, n_panels, chord, incidence, position, ref_pivot_m):
        """A further element's outline (``[[airfoil]]``, :mod:`~unsteady.vortex.elements`): paneled about
        its own leading edge, turned nose-up by ``incidence`` (rad) about it and moved to ``position``
        (m) from the reference leading edge; ``ref_pivot_m``: the pitch axis's distance aft of the
        reference leading edge (m).  ``x_surface, z_surface`` stay the element's own chord fractions."""
        x, z = surface_nodes(section, n_panels)
        z_q = float(np.asarray(section.camber(np.array([0.25])), float)[0])
        ca, sa = np.cos(incidence), np.sin(incidence)
        x0, z0 = float(position[0]) - ref_pivot_m, float(position[1])

        def place(xf, zf):                        # nose-up turn about the leading edge (bodies.to_inertial)
            return x0 + chord * (xf * ca + zf * sa), z0 + chord * (-xf * sa + zf * ca)

        xi, zeta = place(np.asarray(x, float), np.asarray(z, float))
        xr, zr = place(0.25, z_q)
        return cls(**_outline_fields(xi, zeta), x_surface=0.5 * (x[:-1] + x[1:]), z_surface=0.5 * (z[:-1] + z[1:]),
                   xi_ref=float(xr), zeta_ref=float(zr), chord=float(chord))

    @property
    def n(self) -> int:
        """Number of panels."""
        return self.ds.shape[0]

    def mean_line(self):
        """The mean of the two surfaces' nodes, leading edge to trailing edge (body frame, m): the line
        the crossing guard of several elements (:class:`~unsteady.vortex.elements.CrossingGuard`) uses."""
        half = self.n // 2
        return (0.5 * (self.xi_n[half::-1] + self.xi_n[half:]), 0.5 * (self.zeta_n[half::-1] + self.zeta_n[half:]))


class SurfacePanels:
    """The body model of a thick section (the body rules of :class:`~unsteady.vortex.solver.VortexSolver`).

    ``n`` = panels + 1 unknowns (node circulations); ``points(t)`` gives the
    nodes as vortex points and the panel mid-points plus the Kutta row's
    zero-normal point as collocation points; ``influence_matrix()`` the
    bordered-system block (panel integrals, Kutta row); ``load_history``
    the pressure and impulse loads (:class:`SurfaceLoads`).

    Parameters
    ----------
    geometry : SurfaceGeometry
    """

    #: The leading-edge suction parameter (A0 of thin-airfoil theory) belongs to a camber line's
    #: square-root singularity at its leading edge, which a closed outline does not have: the
    #: ``lesp`` column of a thick section is NaN (and leading-edge shedding is refused by check).
    leading_edge_suction = False

    def __init__(self, geometry):
        self.geometry = g = geometry
        N = g.n
        xi_c = np.append(g.xi_c, g.xi_n[-1])
        zeta_c = np.append(g.zeta_c, g.zeta_n[-1])
        self._points = BodyPoints(g.xi_n, g.zeta_n, xi_c, zeta_c,
                                  np.append(g.n_xi, 0.0), np.append(g.n_zeta, 0.0))
        # velocity at the mid-points per unit node gamma (principal value on a point's own panel)
        mu_u = np.empty((N, N + 1))
        mu_w = np.empty((N, N + 1))
        panel_velocity_matrices(g.xi_c, g.zeta_c, g.xi_n, g.zeta_n, np.arange(N, dtype=np.int64), mu_u, mu_w)
        #: normal and tangential velocity at the mid-points per unit node gamma
        self.normal_gamma = mu_u * g.n_xi[:, None] + mu_w * g.n_zeta[:, None]
        self.tangent_gamma = mu_u * g.t_xi[:, None] + mu_w * g.t_zeta[:, None]
        self.inner_rotation = self._inner_rotation()
        # where the outline is thinner than about two panels (next to a trailing edge, most of a
        # cusped one) the enclosed air is not resolved: there q is the sum of the velocities on
        # the surface, blended in over thicknesses from two panel lengths down to one
        across = np.hypot(g.xi_c - g.xi_c[::-1], g.zeta_c - g.zeta_c[::-1])
        self.resolved = np.clip(across / g.ds - 1.0, 0.0, 1.0)
        self.loads = None

    def _inner_rotation(self):
        """Tangential velocity of the enclosed air relative to the body per unit pitch rate (m/s per rad/s).

        The enclosed air is irrotational: for a translating body it moves with
        the body (zero here), for a pitching one it cannot turn with it.  From
        one solve of the panel system with the rigid rotation alone (inside
        limit: principal value + gamma / 2, less the body's own velocity).
        """
        g = self.geometry
        ub, wb = g.zeta_c, -g.xi_c                    # unit pitch rate about the pivot, zero pitch
        rhs = np.append(ub * g.n_xi + wb * g.n_zeta, 0.0)
        gamma = np.linalg.solve(self.influence_matrix(), rhs) / g.w
        inside = self.tangent_gamma @ gamma + 0.25 * (gamma[:-1] + gamma[1:])
        return inside - (ub * g.t_xi + wb * g.t_zeta)

    @property
    def n(self) -> int:
        """Unknowns: one circulation per node."""
        return self.geometry.n + 1

    def points(self, t):
        """Nodes (vortex points), mid-points and the Kutta point (collocation), normals."""
        return self._points

    def changed(self, t):
        """A rigid outline never moves in the body frame."""
        return False

    def trailing_edge(self, t):
        """The trailing edge (xi, zeta) in the body frame."""
        return float(self.geometry.xi_n[-1]), float(self.geometry.zeta_n[-1])

    def influence_matrix(self):
        """The body block of the bordered system over the node circulations G_k = w_k gamma_k.

        Rows 0..N-1: normal velocity at each mid-point per unit G_k; row N:
        the Kutta condition gamma_0 + gamma_N = 0.
        """
        g = self.geometry
        N = g.n
        a = np.zeros((N + 1, N + 1))
        a[:N] = self.normal_gamma / g.w[None, :]
        a[N, 0] = 1.0 / g.w[0]
        a[N, N] = 1.0 / g.w[N]
        return a

    def ground_matrix(self, step, z_ground):
        """The body block over a flat ground at ``z_ground`` (m), on the placed points of ``step``.

        The panels' own block (:meth:`influence_matrix`, invariant under the
        body's rigid motion) plus, in the no-penetration rows, the normal
        velocity of the panels' ground images (the sheet mirrored about the
        ground with the opposite strength: Milne-Thomson 1968, the method of
        images; :func:`~unsteady.vortex.panel_kernels.panel_image_velocity_matrices`),
        which depends on pitch and height.  The image velocities per unit node
        gamma are kept (``image_velocity``) for the loads of the same placement.
        """
        g = self.geometry
        N = g.n
        iu = np.empty((N, N + 1))
        iw = np.empty((N, N + 1))
        panel_image_velocity_matrices(step.xc[:N], step.zc[:N], step.xv, step.zv, float(z_ground), iu, iw)
        self.image_velocity = (iu, iw)
        a = self.influence_matrix()
        a[:N] += (iu * step.nx[:N, None] + iw * step.nz[:N, None]) / g.w[None, :]
        return a

    def load_history(self, speed, density, dt):
        """A fresh :class:`SurfaceLoads` for a run (kept as ``self.loads``)."""
        self.loads = SurfaceLoads(self, speed, density, dt)
        return self.loads


#: the few latest outlines' segment angles (SurfaceLoads._segment_angles), by their coordinates: an
#: N x N table of N^2 arctangents per column, the same for every solve on one outline
_ANGLES_CACHE = {}


class SurfaceLoads:
    """Loads of a paneled thick section each step: pressure integration and vortex impulse.

    Called by the solver's loads stage through ``add_step(solver, step, sl)``;
    keeps ``cp_last`` (outside Cp at each panel mid-point), ``dcp_last``
    (lower minus upper Cp at the chord stations of the lower surface's
    panels, for the camber-line pictures) and the short histories the time
    derivatives need.
    """

    def __init__(self, model, speed, density, dt):
        self.model = model
        self.body = g = model.geometry
        self.U, self.rho, self.dt = float(speed), float(density), float(dt)
        self.q = 0.5 * self.rho * self.U ** 2
        N = g.n
        self.half = N // 2
        self.phi_hist = []
        self.inner_hist = []
        self.imp_hist = []
        self.cp_last = np.zeros(N)
        self.dcp_last = np.zeros(self.half)
        self._own = np.arange(N, dtype=np.int64)
        self._index = np.arange(N)
        self._coarse = np.unique(np.append(np.arange(0, N, COARSE), N - 1))
        self._none = -np.ones(self._coarse.shape[0], dtype=np.int64)
        self._none_all = -np.ones(N, dtype=np.int64)
        self._angles = self._segment_angles(g)
        self._phi = np.empty(N)

    def _segment_angles(self, g):
        """Potential at the mid-points per unit doublet strength on each of the body's segments
        (the panels), on the outside of a point's own panel: fixed in the body frame, so computed
        once (a deflected flap's new outline: ``chain_segment_angles``, the same numbers)."""
        key = b"".join(np.ascontiguousarray(v, dtype=float).tobytes() for v in (g.xi_c, g.zeta_c, g.xi_n, g.zeta_n))
        hit = _ANGLES_CACHE.get(key)
        if hit is not None:                  # the same outline again (the steady solves of one run)
            return hit
        N = g.n
        angles = np.empty((N, N))
        unit = np.zeros(N)
        col = np.empty(N)
        for j in range(N):
            unit[j] = 1.0
            chain_potential(g.xi_c, g.zeta_c, self._own, g.xi_n, g.zeta_n, unit, 0.0, col)
            angles[:, j] = col
            unit[j] = 0.0
        angles.setflags(write=False)
        if len(_ANGLES_CACHE) >= 8:
            _ANGLES_CACHE.pop(next(iter(_ANGLES_CACHE)))
        _ANGLES_CACHE[key] = angles
        return angles

    def retire(self, xs, zs, gs):
        """Wake vortices left for the far wake: as :meth:`~unsteady.vortex.loads.LoadHistory.retire`."""
        from .loads import retire_impulse
        self.imp_hist = retire_impulse(self.imp_hist, self.U, self.dt, xs, zs, gs)

    def potential(self, s, G, solver):
        """Disturbance potential (m^2/s) on the outside of each panel mid-point, and the chain's
        strength on each panel (the potential's jump across it)."""
        N = self.body.n
        wx, wz, wg = solver.store.wake()
        fx, fz, fg = solver.far.views()
        return self._chain(s.xc[:N], s.zc[:N], np.concatenate((s.xv[:N + 1], wx[::-1], fx[::-1])),
                           np.concatenate((s.zv[:N + 1], wz[::-1], fz[::-1])),
                           np.concatenate((G, wg[::-1], fg[::-1])), wx.shape[0], solver)

    def _chain(self, xt, zt, px, pz, gam, n_wake, solver):
        """The potential at this body's mid-points ``xt, zt`` of its chain: its nodes, then ``n_wake``
        wake vortices (newest first) and the far-wake lumps (``px, pz, gam`` in that order), with the
        ray to x = +infinity; returns (phi, the chain's strength on each panel)."""
        N = self.body.n
        total = -np.cumsum(gam)
        mu = np.ascontiguousarray(total[:-1])
        tail = float(total[-1])
        # the body's own segments: angles fixed in the body frame (self._angles); the newest
        # NEAR_WAKE_CHORDS of wake at every mid-point; the older wake, whose potential is smooth
        # over the body, at every COARSE-th mid-point and interpolated
        phi = self._angles @ mu[:N]
        cut = N + 1 + min(n_wake, NEAR_WAKE_CHORDS * solver.lump_n)
        whole = cut >= px.shape[0] - 1
        end = px.shape[0] if whole else cut + 1
        chain_potential(xt, zt, self._none_all, np.ascontiguousarray(px[N:end]), np.ascontiguousarray(pz[N:end]),
                        np.ascontiguousarray(mu[N:end - 1]), tail if whole else 0.0, self._phi)
        z_g = solver.z_g
        if z_g is not None:                        # the ground: the image of the body's and near wake's chain
            chain_image_potential(xt, zt, px[:end], pz[:end], mu[:end - 1], tail if whole else 0.0, z_g,
                                  self._phi)
        phi += self._phi
        if not whole:
            far = np.empty(self._coarse.shape[0])
            qx, qz, qm = (np.ascontiguousarray(a[cut:]) for a in (px, pz, mu))
            xq, zq = xt[self._coarse], zt[self._coarse]
            chain_potential(xq, zq, self._none, qx, qz, qm, tail, far)
            if z_g is not None:
                chain_image_potential(xq, zq, qx, qz, qm, tail, z_g, far)
            phi += np.interp(self._index, self._coarse, far)
        return phi, mu[:N]

    def _others_velocity(self, solver, s, sl, xc, zc, u, w):
        """Add (in place) the velocity of the other bodies' bound vortices, and with a ground their images,
        at the mid-points (point vortices, as the loads of a camber line take them)."""
        others = np.ones(s.xv.shape[0], dtype=bool)
        others[sl] = False
        du, dw = np.empty_like(xc), np.empty_like(xc)
        induced_velocity(xc, zc, s.xv[others], s.zv[others], s.gamma[others], 0.0, du, dw, ground=solver.z_g)
        u += du
        w += dw

    def potential_several(self, s, G, solver, sl):
        """:meth:`potential` when other bodies share the flow (``[[airfoil]]``).

        This body's chain runs through its nodes and then only its own site's wake (newest first)
        and far-wake lumps, with the ray to x = +infinity, as :meth:`potential` with one body.  The
        other bodies' vortices (bound, free and far wake) each carry a cut of their own, a ray
        pointing away from this body's centroid
        (:func:`~unsteady.vortex.panel_kernels.ray_vortex_potential`): a point outside a convex
        outline and the ray beyond it from a point inside never meet the outline, so the potential
        stays continuous on this body whichever way the other vortices pass it (a chain through
        another element's wake would cross this body where that wake passes over and under it).
        Cuts change the potential only by constants along them: the velocity field is that of the
        same vortices (Milne-Thomson 1968, the complex potential of a vortex).
        """
        N = self.body.n
        o = sl.start
        xt, zt = s.xc[o:o + N], s.zc[o:o + N]
        wx, wz, wg = solver.store.wake()
        fx, fz, fg = solver.far.views()
        b_self = next(b for b, x in enumerate(solver.system.slices) if x == sl)
        own_sites = [site.index for site in solver.sites if site.body == b_self]
        wm = np.isin(solver.store.site[:wx.shape[0]], own_sites)
        fm = np.isin(solver.far.site[:fx.shape[0]], own_sites)
        z_g = solver.z_g
        # this body's chain through its own site's wake, as :meth:`potential`
        phi, mu = self._chain(xt, zt, np.concatenate((s.xv[sl], wx[wm][::-1], fx[fm][::-1])),
                              np.concatenate((s.zv[sl], wz[wm][::-1], fz[fm][::-1])),
                              np.concatenate((G, wg[wm][::-1], fg[fm][::-1])), int(wm.sum()), solver)
        # every other vortex, each with its own cut away from this body
        others = np.ones(s.xv.shape[0], dtype=bool)
        others[sl] = False
        ox = np.concatenate((s.xv[others], wx[~wm], fx[~fm]))
        oz = np.concatenate((s.zv[others], wz[~wm], fz[~fm]))
        og = np.concatenate((s.gamma[others], wg[~wm], fg[~fm]))
        cx, cz = float(np.mean(self.body.xi_n)), float(np.mean(self.body.zeta_n))   # body frame
        ca, sa = np.cos(s.alpha), np.sin(s.alpha)
        ray_vortex_potential(xt, zt, ox, oz, og, cx * ca + cz * sa, s.h - cx * sa + cz * ca,
                             0.0 if z_g is None else z_g, z_g is not None, phi)
        return phi, mu

    def add_step(self, solver, s, sl):
        """This step's loads of the body in slice ``sl`` of the step record ``s`` (a loads dict)."""
        m = self.model
        if self.body is not m.geometry:             # a deflected flap: the new outline
            self.body = m.geometry
            self._angles = np.empty((m.geometry.n, m.geometry.n))
            chain_segment_angles(self.body.xi_c, self.body.zeta_c, self.body.xi_n, self.body.zeta_n,
                                 self._angles)
        g = self.body
        N = g.n
        U, rho, dt, q = self.U, self.rho, self.dt, self.q
        c = g.chord
        G = s.gamma[sl]
        gamma = G / g.w
        o = sl.start                               # this body's place in the step's arrays
        several = len(solver.models) > 1
        xc, zc = s.xc[o:o + N], s.zc[o:o + N]
        ub = s.alpha_dot * (zc - s.h)              # the body's own velocity
        wb = s.h_dot - s.alpha_dot * xc
        nx, nz = rotate(g.n_xi, g.n_zeta, s.alpha)
        # outside = inside - gamma; inside, relative to the body: the enclosed air's own motion
        gamma_mid = 0.5 * (gamma[:-1] + gamma[1:])
        q_t = s.alpha_dot * m.inner_rotation - gamma_mid
        if s.own is not None:                      # a moving flap: its own velocity, its enclosed air's
            ub = ub + s.own[0][o:o + N]
            wb = wb + s.own[1][o:o + N]
            q_t = q_t + m.flap_rate(s.t) * m.inner_flap
        f = m.resolved
        if f.min() < 1.0:                          # too thin to resolve: the velocities on the surface
            u = s.u_air[o:o + N].copy()            # freestream, gust, wake, far wake
            w = s.w_air[o:o + N].copy()
            if several:                            # the other bodies' bound vortices (and images)
                self._others_velocity(solver, s, sl, xc, zc, u, w)
            images = (False,) if solver.z_g is None else (False, True)
            for p in s.proposals:                  # this step's new vortices (and their ground images)
                for image in images:
                    pz, pg = (2.0 * solver.z_g - p.z, -p.gamma) if image else (p.z, p.gamma)
                    dx, dz = xc - p.x, zc - pz
                    r2 = dx * dx + dz * dz
                    k = pg / (2.0 * np.pi * np.sqrt(r2 * r2 + solver.r_b ** 4))
                    u -= k * dz
                    w += k * dx
            tx, tz = rotate(g.t_xi, g.t_zeta, s.alpha)
            q_s = (u - ub) * tx + (w - wb) * tz + m.tangent_gamma @ gamma - 0.5 * gamma_mid
            if solver.z_g is not None:             # the panels' own images
                iu, iw = m.image_velocity
                q_s += (iu @ gamma) * tx + (iw @ gamma) * tz
            q_t = f * q_t + (1.0 - f) * q_s
        ua, wa = U, 0.0                            # the undisturbed air
        if solver.gust is not None:
            gu, gw = solver.gust.velocity(xc, zc, s.t)
            ua, wa = U + gu, gw
        vb2 = (ub - ua) ** 2 + (wb - wa) ** 2
        phi, mu = self.potential(s, G, solver) if not several else self.potential_several(s, G, solver, sl)
        self.phi_hist = (self.phi_hist + [phi])[-3:]
        dphi = backward_derivative(self.phi_hist, dt)
        cp = (vb2 - q_t * q_t - 2.0 * dphi) / (U * U)
        self.cp_last = cp
        lower = cp[:self.half][::-1]
        self.dcp_last = lower - cp[self.half:]
        # pressure integration: f = -Cp q n ds on each panel, at its mid-point
        fx = -cp * q * g.ds * nx
        fz = -cp * q * g.ds * nz
        Fx, Fz = fx.sum(), fz.sum()
        ca, sa = np.cos(s.alpha), np.sin(s.alpha)
        x_ref = g.xi_ref * ca + g.zeta_ref * sa
        z_ref = s.h - g.xi_ref * sa + g.zeta_ref * ca
        M_ref = ((zc - z_ref) * fx - (xc - x_ref) * fz).sum()
        M_piv = ((zc - s.h) * fx - xc * fz).sum()
        # impulse: all vortices, plus the momentum of the enclosed air
        xs, zs, gs = solver.store.sources()
        Fx_i, Fz_i, M_ccw, self.imp_hist = impulse_loads(self.imp_hist, s.t, x_ref, z_ref, xs, zs, gs,
                                                         solver.gamma_start + s.far_total, U, rho, dt)
        inner = phi - mu                           # potential on the inside of each panel
        self.inner_hist = (self.inner_hist + [np.array([(inner * g.ds * nx).sum(),
                                                        (inner * g.ds * nz).sum()])])[-3:]
        d_inner = backward_derivative(self.inner_hist, dt)
        Fx_i += rho * d_inner[0]
        Fz_i += rho * d_inner[1]
        #: the enclosed air's momentum rate (N/m, computation frame): the impulse route's share of the body
        self.inner_force = (rho * float(d_inner[0]), rho * float(d_inner[1]))
        extra = {}
        if getattr(m, "hinge", None) is not None:  # the flap's panels about the hinge, nose-up (trailing edge down)
            xi_h, zeta_h, flap, c_f = m.hinge
            x_h, z_h = xi_h * ca + zeta_h * sa, s.h - xi_h * sa + zeta_h * ca
            extra["ch"] = float(((zc - z_h) * fx - (xc - x_h) * fz)[flap].sum()) / (q * c_f * c_f)
        return {
            "cl": Fz / (q * c), "cd": Fx / (q * c), "cm": M_ref / (q * c * c),
            "cm_pivot": M_piv / (q * c * c),
            "cl_impulse": Fz_i / (q * c), "cd_impulse": Fx_i / (q * c),
            "cm_impulse": -M_ccw / (q * c * c),
            "gamma_bound_m2_s": float(G.sum()),
            "gamma_wake_m2_s": float(gs.sum() - G.sum()),
            **extra,
        }


def build_surface(sc, n_panels=None):
    """The paneled outline of a scenario's section as a :class:`SurfacePanels` body model."""
    n = int(n_panels if n_panels is not None else sc.elements)
    return SurfacePanels(SurfaceGeometry.from_section(sc.section, n, sc.chord, sc.pivot))


__all__ = ["DEFAULT_PANELS", "MIN_PANELS", "MIN_THICKNESS", "SurfaceGeometry", "SurfaceLoads",
           "SurfacePanels", "build_surface", "cosine_nodes", "surface_nodes"]
