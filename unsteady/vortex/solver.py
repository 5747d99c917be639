"""The time-marching discrete-vortex model of a thin airfoil (lumped vortices).

The airfoil's camber line is cut into ``N`` straight elements, each carrying a
lumped vortex at its quarter point with the no-penetration condition enforced
at its three-quarter point (J. Katz & A. Plotkin, *Low-Speed Aerodynamics*,
2nd ed., 2001, sections 11.1 and 13.8).  Every step one vortex is shed from
the trailing edge with the strength that keeps the total circulation of body
and wake constant (Kelvin's theorem), placed a fraction of the trailing
edge's last-step travel behind it (common practice: 0.2-0.3).  The wake then
moves with the local velocity (free wake, second-order Adams-Bashforth) or
with the freestream (frozen wake).

Frames: the computation runs in a frame that follows the aircraft's mean
flight, so the air streams past at ``+U`` along x; z is up.  The pitch axis
(pivot) sits at x = 0 and at height ``h(t)``.  A body point with body
coordinates (xi, zeta) (xi aft of the pivot along the chord, zeta up, both at
zero pitch) lies at::

    x = xi cos(alpha) + zeta sin(alpha)
    z = h - xi sin(alpha) + zeta cos(alpha)

with ``alpha`` nose-up.  Its velocity is ``(alpha_dot (z - h), h_dot -
alpha_dot x)``.  Circulation is counter-clockwise positive, so a lifting
airfoil in a stream towards +x carries negative bound circulation.

The airfoil is rigid, so its own influence matrix is built and factored once;
per step only the newly shed vortex's influence (one column) changes, and the
bordered system (no-penetration + Kelvin) is solved by the Schur complement
of that one column.  The time loop is written as a sequence of stages
(place bodies, shed, solve, loads, convect) over lists of bodies and
shedding sites so that a leading-edge site, more bodies, a ground image or
thick panels can be added as further stages.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field

import numpy as np

from ..inputs.sections import camber_elements
from .kernels import induced_velocity, normal_influence
from .loads import LoadHistory


class SolverDiverged(RuntimeError):
    """The state became non-finite; carries the step and time."""

    def __init__(self, step: int, t: float, cause: str):
        super().__init__(f"the solution became non-finite at step {step} (t = {t:.6g} s): {cause}")
        self.step = step
        self.t = t
        self.cause = cause


@dataclass(frozen=True)
class Body:
    """A rigid camber line in body coordinates (metres, relative to the pivot).

    Attributes are arrays over the N elements: vortex points ``xi_v, zeta_v``
    (quarter of each element), collocation points ``xi_c, zeta_c`` (three
    quarters), unit normals ``n_xi, n_zeta`` (upper side), unit tangents
    ``t_xi, t_zeta`` (towards the trailing edge), lengths ``ds`` and the
    element start nodes ``xi_0, zeta_0``; ``xi_te, zeta_te`` is the trailing
    edge.  ``xi_ref, zeta_ref`` is the quarter-chord point (moment reference).
    ``nc_xi, nc_zeta`` are the unit normals of the camber line itself at the
    collocation points (the no-penetration condition uses these: with the
    chord of a curved element instead, the error is first order in the
    element length).
    """

    xi_v: np.ndarray
    zeta_v: np.ndarray
    xi_c: np.ndarray
    zeta_c: np.ndarray
    n_xi: np.ndarray
    n_zeta: np.ndarray
    t_xi: np.ndarray
    t_zeta: np.ndarray
    ds: np.ndarray
    xi_0: np.ndarray
    zeta_0: np.ndarray
    xi_te: float
    zeta_te: float
    xi_ref: float
    zeta_ref: float
    chord: float
    nc_xi: np.ndarray = None
    nc_zeta: np.ndarray = None

    @classmethod
    def from_section(cls, section, n, chord, pivot, x_nodes=None):
        """Build from a camber-line section (``camber(x)``, ``slope(x)``).

        Nodes at cosine spacing (or ``x_nodes``, chord fractions); vortex and
        collocation points sit on the camber line at a quarter and three
        quarters of each element's chordwise extent, and the collocation
        normals follow the exact camber slope there.
        """
        if x_nodes is None:
            x_nodes = 0.5 * (1.0 - np.cos(np.pi * np.arange(n + 1) / n))
        xn = np.asarray(x_nodes, float)
        zn = np.asarray(section.camber(xn), float)
        body = cls.from_nodes(xn, zn, chord, pivot)
        dx = np.diff(xn)
        xv = xn[:-1] + 0.25 * dx
        xc = xn[:-1] + 0.75 * dx
        slope_c = np.asarray(section.slope(xc), float)
        norm = np.sqrt(1.0 + slope_c ** 2)
        z_ref = float(section.camber(np.array([0.25]))[0]) * chord
        return dataclasses.replace(
            body,
            xi_v=(xv - pivot) * chord, zeta_v=np.asarray(section.camber(xv), float) * chord,
            xi_c=(xc - pivot) * chord, zeta_c=np.asarray(section.camber(xc), float) * chord,
            nc_xi=-slope_c / norm, nc_zeta=1.0 / norm, zeta_ref=z_ref)

    def __post_init__(self):
        if self.nc_xi is None:
            object.__setattr__(self, "nc_xi", self.n_xi)
            object.__setattr__(self, "nc_zeta", self.n_zeta)

    @classmethod
    def from_nodes(cls, x_nodes, z_nodes, chord, pivot):
        """Build from camber-line nodes in chord fractions (LE first).

        The chord line runs from (0, 0) to (1, 0); ``pivot`` is the fraction
        of chord aft of the leading edge about which the body pitches.
        """
        x = (np.asarray(x_nodes, float) - pivot) * chord
        z = np.asarray(z_nodes, float) * chord
        dx = np.diff(x)
        dz = np.diff(z)
        ds = np.hypot(dx, dz)
        t_xi, t_zeta = dx / ds, dz / ds
        n_xi, n_zeta = -t_zeta, t_xi
        z_ref = float(np.interp(0.25, np.asarray(x_nodes, float), np.asarray(z_nodes, float))) * chord
        return cls(
            xi_v=x[:-1] + 0.25 * dx, zeta_v=z[:-1] + 0.25 * dz,
            xi_c=x[:-1] + 0.75 * dx, zeta_c=z[:-1] + 0.75 * dz,
            n_xi=n_xi, n_zeta=n_zeta, t_xi=t_xi, t_zeta=t_zeta, ds=ds,
            xi_0=x[:-1], zeta_0=z[:-1],
            xi_te=float(x[-1]), zeta_te=float(z[-1]),
            xi_ref=(0.25 - pivot) * chord, zeta_ref=z_ref, chord=float(chord),
        )

    @property
    def n(self) -> int:
        return self.xi_v.shape[0]


def to_inertial(xi, zeta, alpha, h):
    """Body coordinates -> computation frame (x, z) at pitch alpha, height h."""
    ca, sa = math.cos(alpha), math.sin(alpha)
    return xi * ca + zeta * sa, h - xi * sa + zeta * ca


def rotate(v_xi, v_zeta, alpha):
    """Rotate a body-frame vector into the computation frame."""
    ca, sa = math.cos(alpha), math.sin(alpha)
    return v_xi * ca + v_zeta * sa, -v_xi * sa + v_zeta * ca


@dataclass
class StepState:
    """What observers see after each step (views; copy what you keep)."""

    n: int
    t: float
    alpha: float
    alpha_dot: float
    h: float
    h_dot: float
    gamma_bound: np.ndarray
    x_wake: np.ndarray
    z_wake: np.ndarray
    gamma_wake: np.ndarray
    x_body: np.ndarray
    z_body: np.ndarray
    loads: dict
    dcp: np.ndarray
    extra: dict = field(default_factory=dict)


class VortexSolver:
    """March the discrete-vortex model in time.

    Parameters
    ----------
    body : Body
        The rigid camber line.
    motion : object
        ``state(t) -> (alpha, alpha_dot, h, h_dot)`` (radians, m) and
        ``after_step(t, dt, loads)`` (free-heave models integrate there;
        prescribed motion does nothing).
    speed, density : float
        Mean flight speed U (m/s) and air density rho (kg/m^3).
    dt : float
        Time step (s).
    steps : int
        Number of steps after the initial one (the history has steps + 1 rows).
    wake : {"free", "frozen"}
    start : {"steady", "impulsive"}
        "steady" begins from the settled flow at the initial attitude and
        rates, with the starting vortex already at infinity; "impulsive"
        starts from rest with no circulation (the classical sudden start).
    gust : object, optional
        ``velocity(x, z, t) -> (u, w)``: the air's own velocity (m/s) at
        points of the computation frame, added to the freestream.
    shed_offset : float
        Where the newest vortex goes, as a fraction of the trailing edge's
        travel relative to the air in the last step (common practice 0.2-0.3).
    core_radius : float
        Vatistas core radius r_c (m) of the wake vortices as they act on each
        other (default: one shed-vortex spacing, U dt; common practice).
    body_core_radius : float
        Core radius with which wake and bound vortices act on each other
        (default 0.1 U dt: small, so that the newest vortex's pull on the
        trailing edge is not smeared; common practice).
    far_wake : float or None
        Distance behind the trailing edge, in chords, beyond which the wake
        is coarsened: the oldest vortices are merged, one chord of wake at a
        time, into single far-wake vortices (same total circulation, at the
        circulation centroid, or the |Gamma|-weighted one when the signs
        mix) that drift with the air at U and still act on the airfoil, but
        no longer on the free wake or each other.  This bounds the cost per
        step of long runs.  None keeps the whole wake free.
    t0 : float
        Time of the first row (s).
    """

    def __init__(self, body, motion, *, speed, density, dt, steps, wake="free",
                 start="steady", gust=None, shed_offset=0.3, core_radius=None,
                 body_core_radius=None, far_wake=None, t0=0.0):
        self.body = body
        self.motion = motion
        self.U = float(speed)
        self.rho = float(density)
        self.dt = float(dt)
        self.steps = int(steps)
        self.free_wake = wake == "free"
        self.start = start
        self.gust = gust
        self.shed_offset = float(shed_offset)
        r_wake, r_body = default_core_radii(body.chord, speed, dt)
        self.r_c = float(core_radius if core_radius is not None else r_wake)
        self.r_b = float(body_core_radius if body_core_radius is not None else r_body)
        self.t0 = float(t0)
        self.far_wake = None if far_wake is None else float(far_wake) * body.chord
        N = body.n
        # Influence matrix of the bound vortices on the collocation points in
        # body coordinates (invariant under rigid motion): factor once.
        a = np.empty((N, N))
        normal_influence(body.xi_c, body.zeta_c, body.nc_xi, body.nc_zeta,
                         body.xi_v, body.zeta_v, 0.0, a)
        self.A_inv = np.linalg.inv(a)
        # c = A^-T 1 gives the bound-circulation sum of A^-1 rhs as c . rhs.
        self.c_sum = self.A_inv.sum(axis=0)

    # ------------------------------------------------------------------
    def run(self, observers=()):
        """Run all steps, calling ``observer.on_step(state)`` after each.

        Observers may also define ``on_start(solver)`` and ``on_end(solver)``.
        Raises :class:`SolverDiverged` (after ``on_end``) when the state
        stops being finite.
        """
        body, U, dt = self.body, self.U, self.dt
        N = body.n
        cap = N + self.steps + 2
        # Sources: bound vortices first, then the wake, contiguous so that
        # one kernel call sees all of them as a view.
        src_x = np.zeros(cap)
        src_z = np.zeros(cap)
        src_g = np.zeros(cap)
        vel_u = np.zeros(cap)          # wake velocities this step
        vel_w = np.zeros(cap)
        prev_u = np.zeros(cap)         # wake velocities last step (AB2)
        prev_w = np.zeros(cap)
        bu = np.zeros(cap)             # bound-vortex part of the wake velocities
        bw = np.zeros(cap)
        targ_x = np.empty(2 * N)
        targ_z = np.empty(2 * N)
        tu = np.empty(2 * N)
        tw = np.empty(2 * N)
        m = 0                          # wake vortices
        loads = LoadHistory(body, U, self.rho, dt)
        gamma_prev_sum = 0.0
        te_prev = None
        gamma_start = 0.0              # starting vortex at infinity (steady start)
        far_cap = 16
        far_x = np.zeros(far_cap)      # far-wake lumps (see far_wake)
        far_z = np.zeros(far_cap)
        far_g = np.zeros(far_cap)
        nf = 0
        lump_n = max(1, int(round(body.chord / (U * dt))))
        fu = np.empty(2 * N)
        fw = np.empty(2 * N)
        for obs in observers:
            if hasattr(obs, "on_start"):
                obs.on_start(self)
        try:
            for n in range(self.steps + 1):
                t = self.t0 + n * dt
                alpha, alpha_dot, h, h_dot = self.motion.state(t)
                # -- place the body
                xv, zv = to_inertial(body.xi_v, body.zeta_v, alpha, h)
                xc, zc = to_inertial(body.xi_c, body.zeta_c, alpha, h)
                nx, nz = rotate(body.nc_xi, body.nc_zeta, alpha)
                x_te, z_te = to_inertial(body.xi_te, body.zeta_te, alpha, h)
                # -- velocities of air (freestream, gust, existing wake) at the
                #    collocation and vortex points
                targ_x[:N] = xc
                targ_x[N:] = xv
                targ_z[:N] = zc
                targ_z[N:] = zv
                if m > 0:
                    induced_velocity(targ_x, targ_z, src_x[N:N + m], src_z[N:N + m],
                                     src_g[N:N + m], self.r_b, tu, tw)
                else:
                    tu[:] = 0.0
                    tw[:] = 0.0
                if nf > 0:
                    induced_velocity(targ_x, targ_z, far_x[:nf], far_z[:nf], far_g[:nf], self.r_c, fu, fw)
                    tu += fu
                    tw += fw
                tu += U
                if self.gust is not None:
                    gu, gw = self.gust.velocity(targ_x, targ_z, t)
                    tu += gu
                    tw += gw
                # body velocity at collocation points
                ub_c = alpha_dot * (zc - h)
                wb_c = h_dot - alpha_dot * xc
                rhs = -((tu[:N] - ub_c) * nx + (tw[:N] - wb_c) * nz)
                # -- shed and solve
                gamma_s = None
                if n == 0 and self.start == "steady":
                    gamma_b = self.A_inv @ rhs
                    gamma_start = -float(gamma_b.sum())
                elif n == 0:
                    # impulsive start: the first row is the instant before the
                    # motion begins, with no circulation anywhere
                    gamma_b = np.zeros(N)
                else:
                    # previous trailing-edge point carried by the air for dt
                    ua, wa = U, 0.0
                    if self.gust is not None:
                        gu, gw = self.gust.velocity(np.array([te_prev[0]]), np.array([te_prev[1]]), t - dt)
                        ua += float(gu[0])
                        wa += float(gw[0])
                    x_s = x_te + self.shed_offset * (te_prev[0] + ua * dt - x_te)
                    z_s = z_te + self.shed_offset * (te_prev[1] + wa * dt - z_te)
                    a_s = np.empty((N, 1))
                    normal_influence(xc, zc, nx, nz, np.array([x_s]), np.array([z_s]), self.r_b, a_s)
                    a_s = a_s[:, 0]
                    gamma_s = (gamma_prev_sum - self.c_sum @ rhs) / (1.0 - self.c_sum @ a_s)
                    gamma_b = self.A_inv @ (rhs - a_s * gamma_s)
                    src_x[N + m] = x_s
                    src_z[N + m] = z_s
                    src_g[N + m] = gamma_s
                    m += 1
                gamma_prev_sum = float(gamma_b.sum())
                te_prev = (x_te, z_te)
                src_x[:N] = xv
                src_z[:N] = zv
                src_g[:N] = gamma_b
                # -- loads: air velocity at the vortex points relative to the body,
                #    including the newest vortex
                uv = tu[N:].copy()
                wv = tw[N:].copy()
                if gamma_s is not None:
                    du, dw = _point_vortex(xv, zv, x_s, z_s, gamma_s, self.r_b)
                    uv += du
                    wv += dw
                uv -= alpha_dot * (zv - h)
                wv -= h_dot - alpha_dot * xv
                row = loads.add(n, t, alpha, h, gamma_b, uv, wv,
                                src_x[:N + m], src_z[:N + m], src_g[:N + m],
                                gamma_start + float(far_g[:nf].sum()))
                row["gamma_wake_m2_s"] += float(far_g[:nf].sum())
                if not (np.isfinite(gamma_b).all() and math.isfinite(row["cl"])):
                    raise SolverDiverged(n, t, _likely_cause(self, gamma_b, m))
                state = StepState(n=n, t=t, alpha=alpha, alpha_dot=alpha_dot, h=h, h_dot=h_dot,
                                  gamma_bound=gamma_b, x_wake=src_x[N:N + m], z_wake=src_z[N:N + m],
                                  gamma_wake=src_g[N:N + m], x_body=xv, z_body=zv,
                                  loads=row, dcp=loads.dcp_last,
                                  extra={"gamma_start": gamma_start, "gamma_far": float(far_g[:nf].sum()),
                                         "x_te": x_te, "z_te": z_te})
                for obs in observers:
                    obs.on_step(state)
                self.motion.after_step(t, dt, row)
                if n == self.steps:
                    break
                # -- convect the wake from t to t + dt
                if m > 0:
                    wx = src_x[N:N + m]
                    wz = src_z[N:N + m]
                    if self.free_wake:
                        induced_velocity(wx, wz, src_x[N:N + m], src_z[N:N + m], src_g[N:N + m],
                                         self.r_c, vel_u[:m], vel_w[:m])
                        induced_velocity(wx, wz, src_x[:N], src_z[:N], src_g[:N],
                                         self.r_b, bu[:m], bw[:m])
                        vel_u[:m] += bu[:m] + U
                        vel_w[:m] += bw[:m]
                    else:
                        vel_u[:m] = U
                        vel_w[:m] = 0.0
                    if self.gust is not None and self.free_wake:
                        gu, gw = self.gust.velocity(wx, wz, t)
                        vel_u[:m] += gu
                        vel_w[:m] += gw
                    if not np.isfinite(vel_u[:m]).all() or not np.isfinite(vel_w[:m]).all():
                        raise SolverDiverged(n, t, _likely_cause(self, gamma_b, m))
                    # Adams-Bashforth 2; the newest vortex takes an Euler step
                    prev_u[m - 1] = vel_u[m - 1]
                    prev_w[m - 1] = vel_w[m - 1]
                    if self.free_wake:
                        wx += dt * (1.5 * vel_u[:m] - 0.5 * prev_u[:m])
                        wz += dt * (1.5 * vel_w[:m] - 0.5 * prev_w[:m])
                    else:
                        wx += dt * vel_u[:m]
                    prev_u[:m] = vel_u[:m]
                    prev_w[:m] = vel_w[:m]
                    # -- far wake: merge the oldest chord of wake once all of it
                    #    lies beyond far_wake into one lump drifting at U
                    if nf > 0:
                        far_x[:nf] += U * dt
                    if self.far_wake is not None and m > lump_n + 1 and src_x[N + lump_n - 1] > x_te + self.far_wake:
                        k = lump_n
                        gone = slice(N, N + k)
                        gx, gz, gg = src_x[gone].copy(), src_z[gone].copy(), src_g[gone].copy()
                        loads.retire(gx, gz, gg)
                        G = float(gg.sum())
                        wgt = gg if abs(G) > 0.5 * np.abs(gg).sum() else np.abs(gg)
                        if nf == far_cap:
                            far_cap *= 2
                            far_x, far_z, far_g = (np.resize(a, far_cap) for a in (far_x, far_z, far_g))
                        far_x[nf] = (wgt * gx).sum() / wgt.sum() if wgt.sum() != 0 else gx.mean()
                        far_z[nf] = (wgt * gz).sum() / wgt.sum() if wgt.sum() != 0 else gz.mean()
                        far_g[nf] = G
                        nf += 1
                        keep = slice(N + k, N + m)
                        for arr in (src_x, src_z, src_g):
                            arr[N:N + m - k] = arr[keep].copy()
                        for arr in (prev_u, prev_w):
                            arr[:m - k] = arr[k:m].copy()
                        m -= k
        finally:
            for obs in observers:
                if hasattr(obs, "on_end"):
                    obs.on_end(self)


def _point_vortex(x, z, xs, zs, gamma, r_c):
    dx = x - xs
    dz = z - zs
    r2 = dx * dx + dz * dz
    f = gamma / (2.0 * math.pi * np.sqrt(r2 * r2 + r_c ** 4))
    return -f * dz, f * dx


def _likely_cause(solver, gamma_b, m):
    if not np.isfinite(gamma_b).all():
        return ("the bound circulation is not finite; most often a wake vortex landed on a "
                "collocation point: try a larger run.dt or a smaller pitch rate")
    return ("the wake velocities are not finite; most often vortices came too close: "
            "try a smaller run.dt or the frozen wake")


def default_core_radii(chord, speed, dt):
    """Vatistas core radii (m) of wake-on-wake and wake-on-body interactions.

    Common practice: a core comparable to the spacing of the shed vortices
    (U dt) keeps the rolled-up sheet smooth; the body sees the wake through a
    ten times smaller core so that the newest vortex, 0.3 U dt behind the
    trailing edge, acts on the trailing-edge collocation points almost as a
    point vortex.  Both are floored at 1e-5 chord.
    """
    return max(speed * dt, 1e-5 * chord), max(0.1 * speed * dt, 1e-5 * chord)


def build_body(sc) -> Body:
    """The rigid camber line of the scenario, in metres about the pivot."""
    p = camber_elements(sc.section, sc.elements)
    return Body.from_section(sc.section, sc.elements, sc.chord, sc.pivot, x_nodes=p.x_nodes)
