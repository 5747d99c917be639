"""Several elements in one flow (``[[airfoil]]``): placing each in the assembly's frame, combining their loads.

The first element is the reference: its chord scales every coefficient,
its pivot is the pitch axis and its quarter chord the moment reference.
Each further element is a camber line of its own chord, turned nose-up by
its ``incidence`` about its leading edge and set with that leading edge at
``position`` = (x, z) from the first's leading edge, in the first's chord
axes at zero pitch (x aft, z up).  All move as one rigid assembly; each
sheds its own wake from its own trailing edge (one Kelvin row per element,
:class:`~unsteady.vortex.solver.VortexSolver`).

Combining the loads (common practice: forces add, moments transfer by
their arms).  With q = rho U^2 / 2, c_r the reference chord and element
i's own coefficients on its own chord c_i, about its own quarter chord::

    cl_i = cl_i,own c_i / c_r        cd_i = cd_i,own c_i / c_r
    M_R,i = M_P,i - (z_R - h) F_x,i + x_R F_z,i      (nose-up, about R)
    cm_i = M_R,i / (q c_r^2)

where P is the common pitch axis (0, h) and R the reference quarter chord
placed in the computation frame.  ``cl``, ``cd``, ``cm`` and ``cm_pivot``
are the sums.  The impulse columns of the total are the first body's: the
vortex impulse there already counts every bound and wake vortex, so it is
the force on the whole assembly.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from .bodies import Body, rotate, to_inertial

__all__ = ["build_elements", "combine_loads", "place_element"]


def place_element(body: Body, incidence: float, position, ref_pivot_m: float) -> Body:
    """A body built about its own leading edge (pivot 0), turned nose-up by ``incidence`` (rad)
    about that leading edge and moved to ``position`` (m) from the reference leading edge;
    ``ref_pivot_m`` is the reference pivot's distance aft of the reference leading edge (m)."""
    x0, z0 = float(position[0]) - ref_pivot_m, float(position[1])

    def pt(xi, zeta):
        x, z = to_inertial(np.asarray(xi, float), np.asarray(zeta, float), incidence, 0.0)
        return x + x0, z + z0

    def vec(a, b):
        return rotate(np.asarray(a, float), np.asarray(b, float), incidence)

    xv, zv = pt(body.xi_v, body.zeta_v)
    xc, zc = pt(body.xi_c, body.zeta_c)
    x0n, z0n = pt(body.xi_0, body.zeta_0)
    xte, zte = pt(body.xi_te, body.zeta_te)
    xr, zr = pt(body.xi_ref, body.zeta_ref)
    n_xi, n_zeta = vec(body.n_xi, body.n_zeta)
    t_xi, t_zeta = vec(body.t_xi, body.t_zeta)
    nc_xi, nc_zeta = vec(body.nc_xi, body.nc_zeta)
    return dataclasses.replace(
        body, xi_v=xv, zeta_v=zv, xi_c=xc, zeta_c=zc, n_xi=n_xi, n_zeta=n_zeta, t_xi=t_xi, t_zeta=t_zeta,
        xi_0=x0n, zeta_0=z0n, xi_te=float(xte), zeta_te=float(zte), xi_ref=float(xr), zeta_ref=float(zr),
        nc_xi=nc_xi, nc_zeta=nc_zeta)


def combine_loads(rows, bodies, alpha, h):
    """The assembly's loads row from one row per body (module docstring): the totals on the
    first body's chord plus ``cl_<i>``, ``cd_<i>``, ``cm_<i>`` (i = 1, 2, ...), each body's
    ``lesp_<i>`` and, for a body that may shed from its leading edge, ``gamma_lev_<i>`` (then
    ``gamma_lev`` is their sum; ``lesp`` stays the first body's)."""
    ref = bodies[0]
    c_r = ref.chord
    x_r, z_r = to_inertial(ref.xi_ref, ref.zeta_ref, alpha, h)
    out = dict(rows[0])
    cl = cd = cm = cmp = 0.0
    bound = 0.0
    for i, (row, b) in enumerate(zip(rows, bodies), start=1):
        s = b.chord / c_r
        cl_i, cd_i = row["cl"] * s, row["cd"] * s
        cmp_i = row["cm_pivot"] * s * s
        # about R: M_R = M_P - (z_R - h) Fx + x_R Fz, all over q c_r^2
        cm_i = cmp_i - (z_r - h) / c_r * cd_i + x_r / c_r * cl_i
        out[f"cl_{i}"], out[f"cd_{i}"], out[f"cm_{i}"] = cl_i, cd_i, cm_i
        cl, cd, cm, cmp = cl + cl_i, cd + cd_i, cm + cm_i, cmp + cmp_i
        bound += row["gamma_bound_m2_s"]
    out["gamma_wake_m2_s"] = rows[0]["gamma_wake_m2_s"] + rows[0]["gamma_bound_m2_s"] - bound
    out.update(cl=cl, cd=cd, cm=cm, cm_pivot=cmp, gamma_bound_m2_s=bound)
    # each element's suction parameter and leading-edge circulation; lesp stays the first's, gamma_lev
    # sums the elements that may shed
    lev = None
    for i, row in enumerate(rows, start=1):
        if "lesp" in row:
            out[f"lesp_{i}"] = row["lesp"]
        if "gamma_lev" in row:
            out[f"gamma_lev_{i}"] = row["gamma_lev"]
            lev = row["gamma_lev"] if lev is None else lev + row["gamma_lev"]
    if lev is not None:
        out["gamma_lev"] = lev
    return out


def build_elements(sc, tail_turn=0.0):
    """The placed camber lines of a ``[[airfoil]]`` scenario, first element first (each a Body in the
    assembly's frame, metres about the pitch axis, ``sc.pivot``; a further element with ``thick``: a
    :class:`~unsteady.vortex.panels.SurfacePanels` body model instead); ``tail_turn`` (rad, nose-up) is
    added to the last element's incidence (the trim of an all-moving tail, dynamics.pitch)."""
    from ..inputs.sections import camber_elements, section_from_shape
    from .bodies import build_body
    first = build_body(sc)
    bodies = [first]
    p_ref = sc.pivot * sc.chord
    more = sc.data["airfoil"]["_more"]
    for k, el in enumerate(more):
        sec = section_from_shape(el["shape"], sc.base_dir)
        turn = tail_turn if k == len(more) - 1 else 0.0
        if el.get("thick"):                      # surface panels (vortex.panels), placed as the camber lines
            from .panels import SurfaceGeometry, SurfacePanels
            bodies.append(SurfacePanels(SurfaceGeometry.placed(
                sec, el["elements"], el["chord"], math.radians(el["incidence"]) + turn, el["position"], p_ref)))
            continue
        nodes = camber_elements(sec, el["elements"]).x_nodes
        b = Body.from_section(sec, el["elements"], el["chord"], 0.0, x_nodes=nodes)
        bodies.append(place_element(b, math.radians(el["incidence"]) + turn, el["position"], p_ref))
    return bodies


class CrossingGuard:
    """Keeps wake vortices from stepping through a camber line of several elements.

    The no-penetration condition holds only at the collocation points, so a
    vortex of one element's wake carried onto another element (the wing's
    wake meeting the tail) can step through its camber line in one step;
    such a vortex is put back on the side it came from, mirrored about that
    camber line (common practice of discrete-vortex methods: a vortex that
    enters a body is returned to the flow; the same rule as the leading-edge
    vortices' over the first element, ``VortexSolver._keep_sides``).  Only
    vortices that crossed are moved, so a run in which none crosses is
    unchanged to the bit.
    """

    def __init__(self, bodies):
        self.frames = []
        for b in bodies:
            if hasattr(b, "mean_line"):              # surface panels: their mean line
                xi, zeta = b.mean_line()
            else:
                xi, zeta = np.append(b.xi_0, b.xi_te), np.append(b.zeta_0, b.zeta_te)
            dx, dz = xi[-1] - xi[0], zeta[-1] - zeta[0]
            L = math.hypot(dx, dz)
            tx, tz = dx / L, dz / L                  # the element's chord direction, body frame
            s = (xi - xi[0]) * tx + (zeta - zeta[0]) * tz
            d = -(xi - xi[0]) * tz + (zeta - zeta[0]) * tx
            self.frames.append((xi[0], zeta[0], tx, tz, L, s, d))

    def _local(self, frame, x, z, alpha, h):
        x0, z0, tx, tz, L, s_n, d_n = frame
        ca, sa = math.cos(alpha), math.sin(alpha)
        xi = x * ca - (z - h) * sa
        zeta = x * sa + (z - h) * ca
        s = (xi - x0) * tx + (zeta - z0) * tz
        d = -(xi - x0) * tz + (zeta - z0) * tx
        return s, d - np.interp(s, s_n, d_n)

    def before(self, x, z, alpha, h):
        """Per element: indices of the wake vortices within a chord of it and their sides."""
        out = []
        for f in self.frames:
            s, dd = self._local(f, x, z, alpha, h)
            near = np.nonzero((s > -f[4]) & (s < 2.0 * f[4]) & (np.abs(dd) < f[4]))[0]
            out.append((near, np.sign(dd[near])))
        return out

    def after(self, x, z, alpha, h, sides):
        """Mirror back (in place) the vortices that crossed an element's camber line this step."""
        ca, sa = math.cos(alpha), math.sin(alpha)
        for f, (idx, side) in zip(self.frames, sides):
            if idx.size == 0:
                continue
            idx = idx[idx < x.size]
            side = side[:idx.size]
            s, dd = self._local(f, x[idx], z[idx], alpha, h)
            crossed = (s > 0.0) & (s < f[4]) & (np.sign(dd) != side) & (side != 0)
            if not crossed.any():
                continue
            j = idx[crossed]
            shift = -2.0 * dd[crossed]               # along the element's normal, body frame
            nxi, nzeta = -f[3], f[2]
            x[j] += shift * (nxi * ca + nzeta * sa)
            z[j] += shift * (-nxi * sa + nzeta * ca)


class ElementImpulse:
    """Each element's force by the impulse route (several elements with surface panels among them).

    For one element A among others B (J. C. Wu, AIAA J. 19, 1981; P. G.
    Saffman, *Vortex Dynamics*, 1992, sec. 3.2; with the Kutta-Joukowski force
    between point vortices, equal and opposite for each pair, so that the
    elements' forces add up to the assembly's)::

        F_A = -rho d/dt sum_{a in A} Gamma_a (z_a, -x_a) + rho sum_{a in A} Gamma_a (w_B, -u_B)(r_a)

    over A's own vortices: its bound vortices, the vortices its own sites
    shed (free wake; the far-wake lumps and its share of the starting
    vortex of a steady start, minus its bound circulation at the first row,
    at rest in the air), in the frame of the air at rest, with (u_B, w_B)
    the velocity B's vortices induce at A's through the cores with which
    they move each other (bound on bound none, as in the loads; bound and
    wake r_b; wake on wake r_c), so that for A's free vortices the pull
    cancels the part of their drift B causes (they are force-free).  The
    far-wake lumps drift at U and move nothing but the bodies: B's lumps
    pull on A's bound vortices only, and A's lumps get no pull (the
    assembly's impulse columns leave the lumps' forces out alike).  A
    surface-panel element adds the momentum rate of the air its outline
    encloses (:class:`~unsteady.vortex.panels.SurfaceLoads`).
    """

    def __init__(self, solver):
        self.sites = [[site.index for site in solver.sites if site.body == b]
                      for b in range(len(solver.models))]
        self.site_body = {site.index: site.body for site in solver.sites}
        self.body_of_site = np.array([site.body for site in solver.sites], dtype=int)   # by site index
        self.hist = [[] for _ in solver.models]
        self.start = [0.0] * len(solver.models)

    def retire(self, site, xs, zs, gs, U, dt):
        """A site's vortices left for the far wake (as :meth:`~unsteady.vortex.loads.LoadHistory.retire`)."""
        from .loads import retire_impulse
        b = self.site_body[site]
        self.hist[b] = retire_impulse(self.hist[b], U, dt, xs, zs, gs)

    def add(self, solver, s):
        """``(cl, cd)`` of each element by its impulse, on the first element's chord, in body order."""
        from .loads import impulse_loads
        if s.n == 0 and solver.start == "steady":
            self.start = [-float(s.gamma[sl].sum()) for sl in solver.system.slices]
        st, far = solver.store, solver.far
        wx, wz, wg = st.wake()
        wsite = st.site[:st.m]
        fsite = far.site[:far.n]
        fg = far.g[:far.n]
        k = len(solver.models)
        wake_of = [self.body_of_site[wsite] == b for b in range(k)]
        q_c = 0.5 * solver.rho * solver.U ** 2 * solver.models[0].geometry.chord
        rho = solver.rho
        forces = []
        for b, sl in enumerate(solver.system.slices):
            wm = wake_of[b]
            xs = np.concatenate((s.xv[sl], wx[wm]))
            zs = np.concatenate((s.zv[sl], wz[wm]))
            gs = np.concatenate((s.gamma[sl], wg[wm]))
            far_b = float(fg[np.isin(fsite, self.sites[b])].sum())
            Fx, Fz, _, self.hist[b] = impulse_loads(self.hist[b], s.t, 0.0, 0.0, xs, zs, gs,
                                                    self.start[b] + far_b, solver.U, solver.rho, solver.dt)
            if far.n:                            # the other elements' far-wake lumps pull on its bound vortices
                fo = ~np.isin(fsite, self.sites[b])
                fx_, fz_ = _pull(s.xv[sl], s.zv[sl], s.gamma[sl], far.x[:far.n][fo], far.z[:far.n][fo], fg[fo],
                                 solver.r_c)
                Fx, Fz = Fx + rho * fx_, Fz + rho * fz_
            forces.append([Fx, Fz])
        # the pull between two elements' vortices, once per pair of sets (equal and opposite), through the
        # cores with which they move each other: bound-bound none (the loads' own), bound-wake r_b, wake-wake r_c
        sls = solver.system.slices
        for b in range(k):
            for j in range(b + 1, k):
                parts = ((s.xv[sls[b]], s.zv[sls[b]], s.gamma[sls[b]], s.xv[sls[j]], s.zv[sls[j]], s.gamma[sls[j]], 0.0),
                         (s.xv[sls[b]], s.zv[sls[b]], s.gamma[sls[b]], wx[wake_of[j]], wz[wake_of[j]], wg[wake_of[j]],
                          solver.r_b),
                         (wx[wake_of[b]], wz[wake_of[b]], wg[wake_of[b]], s.xv[sls[j]], s.zv[sls[j]], s.gamma[sls[j]],
                          solver.r_b),
                         (wx[wake_of[b]], wz[wake_of[b]], wg[wake_of[b]], wx[wake_of[j]], wz[wake_of[j]], wg[wake_of[j]],
                          solver.r_c))
                for xa, za, ga, xb, zb, gb, r in parts:
                    if xa.shape[0] == 0 or xb.shape[0] == 0:
                        continue
                    fx_, fz_ = _pull(xa, za, ga, xb, zb, gb, r)
                    forces[b][0] += rho * fx_
                    forces[b][1] += rho * fz_
                    forces[j][0] -= rho * fx_
                    forces[j][1] -= rho * fz_
        out = []
        for b in range(k):
            Fx, Fz = forces[b]
            inner = getattr(solver.load_histories[b], "inner_force", None)
            if inner is not None:
                Fx, Fz = Fx + inner[0], Fz + inner[1]
            out.append((Fz / q_c, Fx / q_c))
        return out


def _pull(xa, za, ga, xb, zb, gb, r_c):
    """``sum_a Gamma_a (w_b, -u_b)(r_a)`` (per unit density): the Kutta-Joukowski pull of vortices b on vortices a."""
    from .kernels import induced_velocity
    u, w = np.empty(xa.shape[0]), np.empty(xa.shape[0])
    induced_velocity(np.ascontiguousarray(xa), np.ascontiguousarray(za), np.ascontiguousarray(xb),
                     np.ascontiguousarray(zb), np.ascontiguousarray(gb), r_c, u, w)
    return float((ga * w).sum()), -float((ga * u).sum())
