"""Several elements in one flow (``[[airfoil]]``): placing each in the assembly's frame, combining their loads.

The first element is the reference: its chord scales every coefficient,
its pivot is the pitch axis and its quarter chord the moment reference.
Each further element is a camber line of its own chord, turned nose-up by
its ``incidence`` about its leading edge and set with that leading edge at
``position`` = (x, z) from the first's leading edge, in the first's chord
axes at zero pitch (x aft, z up).  All move as one rigid assembly; each
sheds its own wake from its own trailing edge (one Kelvin row per element,
:class:`~unsteady.vortex.solver.VortexSolver`).  A further element with
``flap_hinge`` is a hinged-flap camber line
(:class:`~unsteady.vortex.flap.HingedFlapCamber`, a node on its hinge) held
at its ``flap_deflection``; its loads row carries the hinge moment ``ch``,
on its own flap chord, which the combined row gives as ``ch_<i>``.

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

__all__ = ["CrossCores", "ElementImpulse", "build_elements", "combine_loads", "cross_core_radii", "place_element"]


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
        if i > 1 and "ch" in row:                # a further element's own flap (on its own flap chord)
            out[f"ch_{i}"] = row["ch"]
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


def build_elements(sc, tail_turn=0.0, tail_flap=None):
    """The placed camber lines of a ``[[airfoil]]`` scenario, first element first (each a Body in the
    assembly's frame, metres about the pitch axis, ``sc.pivot``); ``tail_turn`` (rad, nose-up) is
    added to the last element's incidence (the trim of an all-moving tail, dynamics.pitch).  A
    further element with ``thick``: a :class:`~unsteady.vortex.panels.SurfacePanels` body model.

    A further element with ``flap_hinge`` is a :class:`~unsteady.vortex.flap.HingedFlapCamber`
    held at its ``flap_deflection`` (deg), the last element's at ``tail_flap`` (rad, trailing edge
    down) instead when given (the trim of a tail's flap, dynamics.pitch)."""
    from ..inputs.sections import camber_elements, hinge_nodes, section_from_shape
    from .bodies import build_body
    from .flap import HeldLaw, HingedFlapCamber
    first = build_body(sc)
    bodies = [first]
    p_ref = sc.pivot * sc.chord
    more = sc.data["airfoil"]["_more"]
    for k, el in enumerate(more):
        sec = section_from_shape(el["shape"], sc.base_dir)
        last = k == len(more) - 1
        turn = tail_turn if last else 0.0
        if el.get("thick"):                      # surface panels (vortex.panels), placed as the camber lines
            from .panels import SurfaceGeometry, SurfacePanels
            bodies.append(SurfacePanels(SurfaceGeometry.placed(
                sec, el["elements"], el["chord"], math.radians(el["incidence"]) + turn, el["position"], p_ref)))
            continue
        if "flap_hinge" in el:
            nodes, j = hinge_nodes(el["elements"], el["flap_hinge"])
            b = Body.from_section(sec, el["elements"], el["chord"], 0.0, x_nodes=nodes)
            placed = place_element(b, math.radians(el["incidence"]) + turn, el["position"], p_ref)
            beta = (tail_flap if last and tail_flap is not None
                    else math.radians(el.get("flap_deflection", 0.0)))
            bodies.append(HingedFlapCamber(placed, j, HeldLaw(beta)))
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

    def offsets(self, x, z, alpha, h):
        """Per element: ``(s, d, L)``, each point's (x, z, m) distance along the element's chord from
        its leading edge and off its camber line (m, the assembly at attitude ``alpha``, pitch axis at
        height ``h``), and the element's chord length L (m)."""
        return [(*self._local(f, x, z, alpha, h), f[4]) for f in self.frames]

    def before(self, x, z, alpha, h):
        """Per element: indices of the wake vortices within a chord of it and their sides."""
        out = []
        for s, dd, L in self.offsets(x, z, alpha, h):
            near = np.nonzero((s > -L) & (s < 2.0 * L) & (np.abs(dd) < L))[0]
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


def cross_core_radii(bodies, r_c):
    """Per element b, the core (m) through which another element's wake meets it: max(r_c, 2 c_b / N_b).

    The usual vortex-blob regularisation (R. Krasny, "Desingularization of
    periodic vortex sheet roll-up", J. Comput. Phys. 65, 1986; J. Katz &
    A. Plotkin, *Low-Speed Aerodynamics*, 2nd ed., 2001, ch. 13; both cited
    from memory):
    a vortex passing close to lumped bound vortices must not resolve them one
    by one, so its core is no smaller than their spacing (about pi c / (2N)
    at mid-chord for cosine spacing, so 2 c / N; common practice), nor than
    the wake's own core ``r_c``.  The same core acts both ways (the wake
    vortex on the element's points, the element's bound vortices on the wake
    vortex), so the mutual forces stay equal and opposite.
    """
    return [max(float(r_c), CROSS_CORE_ELEMENTS * b.chord / b.n) for b in bodies]


#: the cross core in bound-vortex spacings of the element met (see cross_core_radii)
CROSS_CORE_ELEMENTS = 2.0


class ElementImpulse:
    """Observer: each element's lift by the vortex impulse, the independent check of its pressure-route lift.

    Vortex impulse (J. C. Wu, AIAA J. 19, 1981; P. G. Saffman, *Vortex
    Dynamics*, 1992, sec. 3.2): the force on everything is -rho dI/dt over
    all vortices, I = sum Gamma (z, -x) in the frame of the air at rest.  For
    one element A among others B the force is -rho dI_A/dt over A's own
    vortices (bound, shed, far-wake lumps) plus the Kutta-Joukowski force
    rho Gamma_a (w_e, -u_e) of every free A vortex in the velocity the rest
    induces there (B's vortices through the cores the solver uses, and the
    gust); the A-A forces cancel in pairs (equal and opposite) and the shed
    vortices are force-free.  dI/dt: second-order backward differences.  A
    steady start's starting vortices rest at infinity in that frame and add
    nothing.

    ``cores``: ``(r_c, r_b, cross)`` as the solver's (``cross``: per element,
    or None when another element's wake meets it through ``r_b``).
    ``lift[:, b]`` is element b's lift coefficient on ``c_ref`` (as the
    history's ``cl_<i>``), from the third row on (NaN before, and NaN on the
    rows whose difference spans a far-wake merge: a lump sits at its
    vortices' circulation centroid only when their signs agree, so its
    impulse may jump there).
    """

    def __init__(self, bodies, speed, density, dt, cores, gust=None, site_body=None, c_ref=None):
        self.bodies = list(bodies)
        self.U, self.rho, self.dt = float(speed), float(density), float(dt)
        self.r_c, self.r_b, self.cross = cores
        self.gust = gust
        self.site_body = (np.arange(len(self.bodies)) if site_body is None else np.asarray(site_body))
        self.c_ref = float(c_ref if c_ref is not None else self.bodies[0].chord)
        ends = np.cumsum([b.n for b in self.bodies])
        self.slices = [slice(e - b.n, e) for e, b in zip(ends, self.bodies)]
        self.imp = []
        self.kj = []
        self.merged = []
        self._far_n = 0

    def _core(self, target_bound, a, source_bound, b):
        if source_bound and target_bound:
            return 0.0
        if not source_bound and not target_bound:
            return self.r_c
        if self.cross is None:
            return self.r_b
        return self.cross[a] if target_bound else self.cross[b]

    def on_step(self, st):
        from .kernels import velocity
        nb = len(self.bodies)
        x_air = -self.U * st.t
        wake_b = self.site_body[st.wake_site]
        far_b = self.site_body[st.far_site] if st.far_site is not None else np.zeros(0, int)
        groups = []
        for b in range(nb):
            sl, own = self.slices[b], wake_b == b
            groups.append(((st.x_body[sl], st.z_body[sl], st.gamma_bound[sl]),
                           (st.x_wake[own], st.z_wake[own], st.gamma_wake[own])))
        imp, kj = [], []
        for a in range(nb):
            s1x = s1z = 0.0
            for (x, z, g) in groups[a]:
                s1x += float((g * (x + x_air)).sum())
                s1z += float((g * z).sum())
            own_far = far_b == a
            if own_far.any():
                s1x += float((st.far_gamma[own_far] * (st.far_x[own_far] + x_air)).sum())
                s1z += float((st.far_gamma[own_far] * st.far_z[own_far]).sum())
            imp.append((s1x, s1z))
            fx = fz = 0.0
            for ti, (xt, zt, gt) in enumerate(groups[a]):
                if xt.size == 0:
                    continue
                u, w = np.zeros(xt.size), np.zeros(xt.size)
                for b in range(nb):
                    if b == a:
                        continue
                    for si, (xs, zs, gs) in enumerate(groups[b]):
                        if xs.size:
                            du, dw = velocity(xt, zt, xs, zs, gs, self._core(ti == 0, a, si == 0, b))
                            u += du
                            w += dw
                if ti == 0 and st.far_x is not None and (~own_far).any():   # other elements' lumps on bound
                    o = ~own_far
                    du, dw = velocity(xt, zt, st.far_x[o], st.far_z[o], st.far_gamma[o], self.r_c)
                    u += du
                    w += dw
                if self.gust is not None:
                    gu, gw = self.gust.velocity(xt, zt, st.t)
                    u += gu
                    w += gw
                fx += self.rho * float((gt * w).sum())
                fz -= self.rho * float((gt * u).sum())
            kj.append((fx, fz))
        self.imp.append(imp)
        self.kj.append(kj)
        far_n = 0 if st.far_x is None else st.far_x.size
        self.merged.append(far_n > self._far_n)
        self._far_n = far_n

    @property
    def lift(self):
        """Per row and element, the impulse-route lift coefficient on the reference chord."""
        imp = np.array(self.imp)            # (rows, elements, 2): S1x, S1z
        kj = np.array(self.kj)
        q = 0.5 * self.rho * self.U ** 2
        out = np.full(imp.shape[:2], np.nan)
        ds1x = (3.0 * imp[2:, :, 0] - 4.0 * imp[1:-1, :, 0] + imp[:-2, :, 0]) / (2.0 * self.dt)
        fz = self.rho * ds1x + kj[2:, :, 1]
        out[2:] = fz / (q * self.c_ref)
        merged = np.array(self.merged)
        spans = merged[2:] | merged[1:-1]        # a merge between rows n-2 and n
        out[2:][spans] = np.nan
        return out


class CrossCores:
    """Several elements: the core through which each wake vortex and each element meet (both ways).

    A wake vortex meets the element that shed it through the solver's small
    core ``r_b`` (the Kutta condition needs the newest vortex almost a point
    vortex) and every other element b through ``r_x[b]``
    (:func:`cross_core_radii`), on its collocation and vortex points and, the
    same core, in the pull of b's bound vortices on the vortex.  A vortex of
    a soft-core site (``soft``: the leading edge) meets its own element
    through ``r_soft``, the others through max(r_soft, r_x[b]).  Ground
    images are always another element's (a mirrored element in free air is
    the ground, tests/validation/test_ground_elements.py), so they act
    through r_x[b] (max(r_soft, r_x[b]) for soft vortices).

    Groups: element b's points are group b; a wake vortex of element k is
    group k, or ``n + k`` when soft (n elements).  ``core4[b, g]`` and
    ``core4_img[b, g]``: fourth powers of the cores (m^4).  The wake's sum on
    itself (one core ``r_c``) is taken once per pair
    (:func:`~unsteady.vortex.kernels.wake_self_velocity`, on aligned copies so
    that its bits do not depend on where numpy put the arrays).
    """

    def __init__(self, bodies, site_body, r_c, r_b, r_soft):
        n = len(bodies)
        self.n = n
        self.r_x = cross_core_radii(bodies, r_c)
        self.site_body = np.asarray(site_body, dtype=np.int64)
        core = np.empty((n, 2 * n))
        img = np.empty((n, 2 * n))
        for b in range(n):
            for k in range(n):
                core[b, k] = r_b if k == b else self.r_x[b]
                core[b, n + k] = r_soft if k == b else max(r_soft, self.r_x[b])
                img[b, k] = self.r_x[b]
                img[b, n + k] = max(r_soft, self.r_x[b])
        self.core4 = np.ascontiguousarray(core ** 4)
        self.core4_img = np.ascontiguousarray(img ** 4)
        #: the same, indexed [wake group, body] (a body's bound vortices on the wake)
        self.core4_t = np.ascontiguousarray(self.core4.T)
        self.core4_img_t = np.ascontiguousarray(self.core4_img.T)
        self.bound_group = np.repeat(np.arange(n, dtype=np.int64), [b.n for b in bodies])
        self.target_group = np.concatenate((self.bound_group, self.bound_group))   # collocation, vortex points

    def wake_groups(self, wake_site, soft=None):
        """Group of each wake vortex (``wake_site``: the site that shed it; ``soft``: soft indices)."""
        g = self.site_body[wake_site]
        if soft is not None and soft.size:
            g = g.copy()
            g[soft] += self.n
        return g

    def site_group(self, site_index, soft):
        return np.array([self.site_body[site_index] + (self.n if soft else 0)], dtype=np.int64)

    def on_points(self, xt, zt, groups, xs, zs, gs, sgroups, z_g, u, w):
        """Velocity (m/s) of sources at the elements' points (in place)."""
        from .kernels import induced_velocity_grouped
        induced_velocity_grouped(xt, zt, groups, xs, zs, gs, sgroups, self.core4, self.core4_img,
                                 z_g is not None, 0.0 if z_g is None else float(z_g), u, w)

    def column(self, xc, zc, nx, nz, x, z, sgroup, z_g):
        """A new vortex's normal velocity per unit circulation at every collocation point."""
        from .kernels import normal_influence_grouped
        a = np.empty((xc.size, 1))
        normal_influence_grouped(xc, zc, nx, nz, self.bound_group, np.array([x]), np.array([z]), sgroup,
                                 self.core4, self.core4_img, z_g is not None,
                                 0.0 if z_g is None else float(z_g), a)
        return a[:, 0]

    def wake_velocities(self, store, U, r_c, gust, t, soft, z_g):
        """:meth:`~unsteady.vortex.wake.VortexStore.velocities` with these cores: the wake on itself
        through ``r_c``, each pair once (:func:`~unsteady.vortex.kernels.wake_self_velocity`), the
        bound vortices of body b on a wake vortex of group g through ``core4[b, g]``."""
        from .kernels import induced_velocity_grouped, wake_self_velocity
        m, nb = store.m, store.nb
        wx, wz, wg = store.wake()
        u, w = store.vel_u[:m], store.vel_w[:m]
        bu, bw = store.bu[:m], store.bw[:m]
        wake_self_velocity(wx, wz, wg, r_c, u, w, ground=z_g)
        induced_velocity_grouped(wx, wz, self.wake_groups(store.site[:m], soft), store.x[:nb], store.z[:nb],
                                 store.g[:nb], self.bound_group, self.core4_t, self.core4_img_t,
                                 z_g is not None, 0.0 if z_g is None else float(z_g), bu, bw)
        u += bu + U
        w += bw
        if gust is not None:
            gu, gw = gust.velocity(wx, wz, t)
            u += gu
            w += gw
        return u, w


class ElementImpulseLoads:
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
            mine = np.isin(fsite, self.sites[b])   # its own far-wake lumps
            far_b = float(fg[mine].sum())
            Fx, Fz, _, self.hist[b] = impulse_loads(self.hist[b], s.t, 0.0, 0.0, xs, zs, gs,
                                                    self.start[b] + far_b, solver.U, solver.rho, solver.dt)
            if far.n:                            # the other elements' far-wake lumps pull on its bound vortices
                fo = ~mine
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
