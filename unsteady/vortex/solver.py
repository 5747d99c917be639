"""The time-marching discrete-vortex model: one time step as stages over bodies and shedding sites."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .elements import CrossCores, CrossingGuard, ElementImpulseLoads, combine_loads
from .bodies import Body, BodyPoints, RigidCamber, as_body_models, build_body, rotate, to_inertial
from .kernels import induced_velocity, normal_influence, normal_influence_ground
from .loads import LoadHistory
from .sites import LeadingEdgeSite, SheddingSite, TrailingEdgeSite
from .system import BodySystem, solve_bordered
from .wake import FarWake, VortexStore

__all__ = ["Body", "BodyPoints", "GroundContact", "LeadingEdgeSite", "RigidCamber", "SheddingSite",
           "SolverDiverged", "StepState",
           "TrailingEdgeSite", "VortexSolver", "build_body", "default_core_radii", "rotate",
           "solve_bordered", "to_inertial"]


#: core of the vortices of soft-core sites (leading edge) against the bodies, in mean element lengths c/N
SOFT_CORE_ELEMENTS = 2.0


class SolverDiverged(RuntimeError):
    """The state became non-finite; carries the step and time."""

    def __init__(self, step: int, t: float, cause: str):
        super().__init__(f"the solution became non-finite at step {step} (t = {t:.6g} s): {cause}")
        self.step = step
        self.t = t
        self.cause = cause


class GroundContact(SolverDiverged):
    """A body would touch the ground (``[ground]``): the run stops there, the steps before it kept."""

    def __init__(self, step: int, t: float, gap: float):
        RuntimeError.__init__(self, f"the airfoil would touch the ground at step {step} (t = {t:.6g} s): "
                                    f"its lowest point is {gap:.3g} m from it")
        self.step = step
        self.t = t
        self.cause = "ground contact"


@dataclass
class StepState:
    """What observers see after each step (views; copy what you keep).

    ``wake_site`` is the index (into the solver's ``sites``) of the site that
    shed each wake vortex (``extra["leading_edge_sites"]``: the indices of
    the leading-edge sites); ``far_x, far_z, far_gamma, far_site`` are the
    far-wake lumps; ``body_loads`` holds one loads dict per body (``loads``
    is the first body's).
    """

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
    wake_site: np.ndarray = None
    far_x: np.ndarray = None
    far_z: np.ndarray = None
    far_gamma: np.ndarray = None
    far_site: np.ndarray = None
    body_loads: list = None


class Step:
    """The working record of one time step, filled in by the stages in turn.

    ``n, t`` and the motion ``alpha, alpha_dot, h, h_dot`` (place); the
    placed collocation points ``xc, zc``, their normals ``nx, nz`` and the
    vortex points ``xv, zv`` of all bodies in body order, and ``tx, tz``
    (collocation points, then vortex points) (place); the air's velocity
    ``u_air, w_air`` at ``tx, tz`` (air velocities); ``proposals`` (shed);
    ``gamma`` of the bound vortices and each proposal's strength (solve);
    ``loads``, one dict per body, and ``far_total`` (loads).
    """

    def __init__(self, n, t):
        self.n, self.t = n, t


class Proposal:
    """A vortex a site sheds this step: its site, position (m), border column and, once solved, strength."""

    __slots__ = ("site", "x", "z", "column", "gamma")

    def __init__(self, site, x, z, column):
        self.site, self.x, self.z, self.column, self.gamma = site, x, z, column, None


class VortexSolver:
    """March the discrete-vortex model in time.

    The camber line of each body is cut into straight elements, each carrying
    a lumped vortex at its quarter point with the no-penetration condition
    enforced at its three-quarter point (J. Katz & A. Plotkin, *Low-Speed
    Aerodynamics*, 2nd ed., 2001, secs. 11.1 and 13.8).  Each step every
    shedding site may shed one vortex; the strengths follow from the
    no-penetration rows of all bodies bordered by one row per new vortex
    (Kelvin's theorem for each body, or a site's own criterion).  The wake
    moves with the local velocity (free wake, Adams-Bashforth 2) or with the
    freestream (frozen wake).  Frames and sign conventions: see
    :func:`~unsteady.vortex.bodies.to_inertial`; circulation is
    counter-clockwise positive, so a lifting airfoil in a stream towards +x
    carries negative bound circulation.

    **The time step.**  :meth:`run` owns the loop, the observers and the
    divergence handling; each step calls the stage methods named in
    ``STAGES``, in this order, on one :class:`Step` record:

    1. ``_place``: the motion's ``state(t)``; the body matrix refactored if a
       body moved in the body frame; the bodies' points placed in the
       computation frame; each site located.
    2. ``_air_velocities``: freestream, gust, wake and far-wake lumps at the
       collocation and vortex points of every body; the no-penetration
       right-hand side ``rhs``.
    3. ``_shed``: each site that sheds this step proposes its vortex; the
       vortex's influence on all collocation points is its border column.
    4. ``_solve``: the bordered system (no-penetration rows + one row per new
       vortex), solved exactly by :func:`solve_bordered` against the
       factored body matrix; the new vortices join the wake; every site
       commits.
    5. ``_loads``: each body's loads (:class:`~unsteady.vortex.loads.LoadHistory`),
       its leading-edge suction parameter ``lesp``
       (:meth:`~unsteady.vortex.system.BodySystem.suction_row`) and each
       site's ``report()`` (a leading-edge site: ``gamma_lev``).
    6. ``_observe``: observers' ``on_step(state)``, then the motion's
       ``after_step(t, dt, loads)`` (free heave integrates there).
    7. ``_convect``: the wake from t to t + dt (free: Adams-Bashforth 2;
       frozen: at U).
    8. ``_far_wake``: lumps drift at U; per site, the oldest chord of its
       wake beyond ``far_wake`` merges into one lump.

    The last step stops after stage 6.  A new stage is one more method and
    one more name in ``STAGES``.

    **A shedding site** (:class:`~unsteady.vortex.sites.SheddingSite`) provides:

    1. ``body``: the index of its body; ``kelvin``: True if its row is
       Kelvin's theorem for that body.  Each body has exactly one Kelvin site,
       and it sheds every step after the first.
    2. ``bind(solver, index)`` at the start of a run; ``index`` is what its
       vortices carry in ``wake_site``.
    3. ``locate(step)``: its position ``x, z`` now (the far wake measures its
       wake's distance from there).
    4. ``sheds(step)``: whether it sheds this step (a suction criterion such
       as LESP decides here; a site that does not shed adds no row).  Sites
       are asked in list order and ``step.proposals`` already holds the
       earlier sites' proposals, so a criterion site placed after its body's
       Kelvin site can make a trial :func:`solve_bordered` without itself.
    5. ``propose(step)``: where its new vortex goes.
    6. ``border_row(step, proposals)``: ``(c A^-1, d, e)``, its row over the
       bound circulations already reduced by the inverse body matrix (use
       ``solver.system.kelvin_row(body)`` or ``solver.system.reduce(c)``,
       both kept consistent with refactorizations), its coefficients of the
       new strengths in ``proposals`` order, and its right-hand side.  Kelvin:
       ``c`` sums the body's bound vortices, ``d`` is 1 for the new vortices
       of sites on the body, ``e`` is ``solver.bound_sum[body]`` (last step).
    7. ``commit(step)``: after the solve, what the next step needs.
    8. ``report()``: entries for its body's loads row (default none).
    9. ``leading_edge``: True if it sheds from its body's leading edge; its
       ``shed_total`` (circulation shed so far) is then the potential jump
       at the leading edge in the pressure route
       (:mod:`~unsteady.vortex.loads`).  ``soft_core``: True if its
       vortices meet the bodies through the soft core (:meth:`_soften`) and
       are kept on their side of the camber line (:meth:`_keep_sides`).

    :class:`~unsteady.vortex.sites.LeadingEdgeSite` is such a criterion site
    (LESP, Ramesh et al. 2014): it follows its body's trailing-edge site and
    sheds only while the trial solve's ``|LESP|`` passes its critical value.

    With k sites shedding, the border is k x k and costs k^2 + k dot products
    of length N per step; the body matrix is never refactored for it.

    **A body model** (:class:`~unsteady.vortex.bodies.RigidCamber`) provides:

    1. ``n``: its number of bound vortices (one collocation point each).
    2. ``points(t)``: a :class:`~unsteady.vortex.bodies.BodyPoints` of vortex
       points, collocation points and collocation normals in the assembly's
       body frame (all bodies share the pivot and move as one under
       ``motion``).
    3. ``changed(t)``: True when its points moved in the body frame since
       the last factorization (a hinged flap when its deflection changed);
       the matrix of all bodies is then rebuilt and refactored, and only
       then.  A body whose points move must also give their velocity,
       ``surface_velocity`` (below).
    4. ``trailing_edge(t)`` for its trailing-edge site; ``geometry``: the
       :class:`~unsteady.vortex.bodies.Body` its loads are computed on (a
       new object when its points moved: the loads then take its normals).
    5. Optionally (a thick section, :mod:`~unsteady.vortex.panels`):
       ``influence_matrix()``, its own diagonal block of the body matrix (with
       other bodies the blocks between them are the point-vortex kernel's), and ``load_history(U, rho, dt)``, its own loads
       object, whose ``add_step(solver, step, slice)`` returns the loads dict;
       with a ground also ``ground_matrix(step, z_ground)``, its block with its images.

    Several bodies run through every stage (one matrix, one Kelvin row each,
    one wake with site indices, every body's bound vortices in every other's
    loads); ``loads`` (what observers and the motion see) combines them on
    the first body's chord, with ``cl_<i>``, ``cd_<i>``, ``cm_<i>`` per body
    (:func:`~unsteady.vortex.elements.combine_loads`; its impulse columns,
    the first body's, count every vortex); ``body_loads`` lists each body's
    own row on its own chord.

    **A ground** (``ground``, :class:`~unsteady.vortex.ground.Ground`): the
    kernels' image option (:mod:`~unsteady.vortex.kernels`: each source
    mirrored about the ground with opposite circulation) in every sum of the
    wake, the far wake, the sites' columns and the matrix; the bodies' own
    images make the matrix depend on the attitude and height, so with a
    ground it is built on the placed points and refactored whenever alpha,
    h or a body's points change; the loads add the bound vortices' images
    at the vortex points.  ``_place`` measures the clearance and stops the
    run with :class:`GroundContact` before a body would touch.  The vortex
    impulse of the real vortices is no longer the force on the body (the
    ground carries a share), so the impulse columns are NaN.

    **A body that moves in its own frame** (a hinged flap,
    :class:`~unsteady.vortex.flap.HingedFlapCamber`) adds
    ``surface_velocity(t, alpha, h) -> (u_c, w_c, u_v, w_v)`` (or None while
    still), its points' own velocity at the collocation and vortex points,
    which the boundary condition and the loads subtract like the rigid
    motion's; a ``hinge`` attribute gives its loads the hinge moment ``ch``,
    and ``deflection(t)`` the history's ``flap_deg``.

    Parameters
    ----------
    body : Body, body model, or a sequence of them
        The rigid camber line (or several, in one body frame).
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
        Where a trailing-edge vortex goes, as a fraction of the trailing
        edge's travel relative to the air in the last step (common practice
        0.2-0.3).
    core_radius : float
        Vatistas core radius r_c (m) of the wake vortices as they act on each
        other (default: one shed-vortex spacing, U dt; common practice).
    body_core_radius : float
        Core radius with which wake and bound vortices act on each other
        (default 0.1 U dt: small, so that the newest vortex's pull on the
        trailing edge is not smeared; common practice).
    far_wake : float or None
        Distance behind a site, in chords of the first body, beyond which its
        wake is coarsened: its oldest vortices are merged, one chord of wake
        at a time, into single far-wake lumps (same total circulation, at the
        circulation centroid, or the |Gamma|-weighted one when the signs mix)
        that drift with the air at U and still act on the bodies, but no
        longer on the free wake or each other.  This bounds the cost per step
        of long runs.  None keeps the whole wake free.
    t0 : float
        Time of the first row (s).
    sites : sequence of SheddingSite, optional
        Default: one :class:`~unsteady.vortex.sites.TrailingEdgeSite` per body.
    ground : Ground, optional
        A flat fixed ground (see above); None: free air.
    cross_core : bool
        With several bodies, a wake vortex meets every body but its own,
        both ways, through a core of that body's element spacing
        (:class:`~unsteady.vortex.elements.CrossCores`), and the wake's sum
        on itself takes each pair once; False (for comparison only): every
        wake meets every body through ``body_core_radius``.  No effect on a
        single body.
    """

    STAGES = ("_place", "_air_velocities", "_shed", "_solve", "_loads", "_observe",
              "_convect", "_far_wake")
    #: stages of the last step (it reports and stops)
    LAST_STAGES = STAGES[:STAGES.index("_observe") + 1]

    def __init__(self, body, motion, *, speed, density, dt, steps, wake="free",
                 start="steady", gust=None, shed_offset=0.3, core_radius=None,
                 body_core_radius=None, far_wake=None, t0=0.0, sites=None, ground=None, cross_core=True):
        self.models = as_body_models(body)
        self.body = self.models[0].geometry
        self.motion = motion
        self.U = float(speed)
        self.rho = float(density)
        self.dt = float(dt)
        self.steps = int(steps)
        self.free_wake = wake == "free"
        self.start = start
        self.gust = gust
        self.shed_offset = float(shed_offset)
        r_wake, r_body = default_core_radii(self.body.chord, speed, dt)
        self.r_c = float(core_radius if core_radius is not None else r_wake)
        self.r_b = float(body_core_radius if body_core_radius is not None else r_body)
        self.t0 = float(t0)
        self.far_wake = None if far_wake is None else float(far_wake) * self.body.chord
        self.sites = list(sites) if sites is not None else [
            TrailingEdgeSite(i, self.shed_offset) for i in range(len(self.models))]
        _check_sites(self.sites, len(self.models))
        # the bodies' influence matrix in the body frame (invariant under the
        # assembly's rigid motion): factored once, refactored only when a body
        # reports that it moved in that frame
        self.system = BodySystem(self.models, self.t0)
        self.ground = ground
        self.z_g = None if ground is None else float(ground.z)
        #: several bodies: wake vortices kept from stepping through a camber line (vortex.elements)
        self.guard = CrossingGuard([m.geometry for m in self.models]) if len(self.models) > 1 else None
        self.cross_core = bool(cross_core)

    # ------------------------------------------------------------------
    def run(self, observers=()):
        """Run all steps, calling ``observer.on_step(state)`` after each.

        Observers may also define ``on_start(solver)`` and ``on_end(solver)``.
        Raises :class:`SolverDiverged` (after ``on_end``) when the state
        stops being finite.
        """
        self._begin(observers)
        stages = [getattr(self, name) for name in self.STAGES]
        last = stages[:len(self.LAST_STAGES)]
        for obs in self.observers:
            if hasattr(obs, "on_start"):
                obs.on_start(self)
        try:
            for n in range(self.steps + 1):
                step = Step(n, self.t0 + n * self.dt)
                for stage in (stages if n < self.steps else last):
                    stage(step)
        finally:
            for obs in self.observers:
                if hasattr(obs, "on_end"):
                    obs.on_end(self)

    def _begin(self, observers):
        """Fresh run state: vortex store, far wake, load histories, bound sites."""
        self.observers = list(observers)
        N = self.system.n
        self.store = VortexStore(N, len(self.sites) * (self.steps + 1) + 2, single_site=len(self.sites) == 1)
        self.far = FarWake()
        self.load_histories = [m.load_history(self.U, self.rho, self.dt) if hasattr(m, "load_history")
                               else LoadHistory(m.geometry, self.U, self.rho, self.dt, hinge=getattr(m, "hinge", None))
                               for m in self.models]
        self.bound_sum = [0.0] * len(self.models)     # each body's bound circulation, last step
        self.gamma_start = 0.0                        # starting vortex at infinity (steady start)
        self.lump_n = max(1, int(round(self.body.chord / (self.U * self.dt))))
        self._tu, self._tw = np.empty(2 * N), np.empty(2 * N)
        self._fu, self._fw = np.empty(2 * N), np.empty(2 * N)
        for i, site in enumerate(self.sites):
            site.bind(self, i)
        self._phi_le = _LeadingEdgeJump(self.sites)
        self._le_sites = tuple(i for i, site in enumerate(self.sites) if site.leading_edge)
        #: several elements with surface panels among them: each element's own impulse (vortex.elements)
        self._split = (ElementImpulseLoads(self) if len(self.models) > 1
                       and any(hasattr(m, "influence_matrix") for m in self.models) else None)
        self._soft_cache = (None, None)      # (clock, wake size) -> soft indices
        self._nodes = {}                      # body -> its camber-line nodes (xi, zeta), m (_camber_frame)
        #: core (m) through which soft-site vortices and the bodies meet (see _soften)
        self.r_soft = max(self.r_c, SOFT_CORE_ELEMENTS * self.body.chord / self.models[0].n)
        #: sites whose vortices meet the bodies through the wake's core (see _soften)
        self.soft_sites = tuple(i for i, site in enumerate(self.sites) if site.soft_core)
        #: several bodies: each wake meets the other bodies through their cross core (vortex.elements)
        #: (not with surface panels among them: their per-element impulse, ElementImpulseLoads, and
        #: their tests take the wake through r_b on every element)
        self.cross = (CrossCores([m.geometry for m in self.models], [site.body for site in self.sites],
                                 self.r_c, self.r_b, self.r_soft)
                      if len(self.models) > 1 and self.cross_core and self._split is None else None)

    # -- stages ---------------------------------------------------------
    def _place(self, s):
        """Stage 1: motion state, refactor if a body moved, bodies placed, sites located."""
        s.alpha, s.alpha_dot, s.h, s.h_dot = self.motion.state(s.t)
        if self.ground is None:
            self.system.refactor_if_changed(s.t)
        else:
            moved = any([m.changed(s.t) for m in self.models])
        placed = []
        for model in self.models:
            p = model.points(s.t)
            placed.append(to_inertial(p.xi_c, p.zeta_c, s.alpha, s.h)
                          + to_inertial(p.xi_v, p.zeta_v, s.alpha, s.h)
                          + rotate(p.n_xi, p.n_zeta, s.alpha))
        columns = placed[0] if len(placed) == 1 else [np.concatenate(c) for c in zip(*placed)]
        s.xc, s.zc, s.xv, s.zv, s.nx, s.nz = columns
        s.tx = np.concatenate((s.xc, s.xv))       # the targets of stage 2
        s.tz = np.concatenate((s.zc, s.zv))
        s.own = _own_velocities(self.models, s)
        if self.ground is not None:
            s.clearance = self.ground.clearance(self.models, s)
            self.system.refactor_placed(s, self.z_g, moved)
        for site in self.sites:
            site.locate(s)

    def _air_velocities(self, s):
        """Stage 2: freestream, gust, wake and far-wake lumps at the placed points."""
        tu, tw = self._tu, self._tw
        if self.store.m > 0:
            soft = self._soft_indices() if self.soft_sites else None
            if self.cross is not None:            # several bodies: each wake's own core per body
                st = self.store
                self.cross.on_points(s.tx, s.tz, self.cross.target_group, *st.wake(),
                                     self.cross.wake_groups(st.site[:st.m], soft), self.z_g, tu, tw)
            elif soft is None or soft.size == 0:
                induced_velocity(s.tx, s.tz, *self.store.wake(), self.r_b, tu, tw, ground=self.z_g)
            else:
                self._soften(s.tx, s.tz, tu, tw, soft)
        else:
            tu[:] = 0.0
            tw[:] = 0.0
        if self.far.n > 0:
            induced_velocity(s.tx, s.tz, *self.far.views(), self.r_c, self._fu, self._fw, ground=self.z_g)
            tu += self._fu
            tw += self._fw
        tu += self.U
        if self.gust is not None:
            gu, gw = self.gust.velocity(s.tx, s.tz, s.t)
            tu += gu
            tw += gw
        s.u_air, s.w_air = tu, tw
        N = self.system.n
        ub_c = s.alpha_dot * (s.zc - s.h)          # body velocity at the collocation points
        wb_c = s.h_dot - s.alpha_dot * s.xc
        if s.own is not None:                      # a body's own motion in its frame (a moving flap)
            ub_c = ub_c + s.own[0]
            wb_c = wb_c + s.own[1]
        # right-hand side of the no-penetration rows (the shed stage's trial solves use it)
        s.rhs = -((s.u_air[:N] - ub_c) * s.nx + (s.w_air[:N] - wb_c) * s.nz)

    def _soft_indices(self):
        """Wake indices of the vortices that meet the bodies through the soft core.

        Those of soft-core sites (the leading edge) and, once a leading edge
        has shed, the other sites' vortices older than the steps the air
        takes to travel one soft core, ``r_soft / (U dt)`` (at least 2): in
        separated flow a leading-edge vortex passing the trailing edge wraps
        the young trailing-edge vortices back over the body, where they meet
        the lumped bound vortices as the leading edge's do.  Measured on
        scenarios/perching-lev.toml: with only the leading edge's vortices
        soft, or also the others older than half a chord of travel, cl jumped
        by up to 23 from one step to the next in bursts; with these, the
        second difference of cl stays under 0.12 (steps of U dt = c/69).  The newest
        trailing-edge vortices keep the small core, which the Kutta condition
        needs; before the onset nothing changes, to the bit.
        """
        key = (self.store.clock, self.store.m)
        if self._soft_cache[0] == key:
            return self._soft_cache[1]
        shed = any(getattr(site, "onset", None) is not None for site in self.sites if site.soft_core)
        if not shed:
            idx = self.store.of_sites(self.soft_sites)
        else:
            others = tuple(i for i in range(len(self.sites)) if i not in self.soft_sites)
            age = max(2, int(math.ceil(self.r_soft / (self.U * self.dt))))
            idx = self.store.of_sites(self.soft_sites, others, self.store.clock - age)
        self._soft_cache = (key, idx)
        return idx

    def _soften(self, xt, zt, u, w, idx):
        """The wake's velocity at body points (in place): soft vortices ``idx`` through ``r_soft``, the rest through ``r_b``.

        The wake acts on the bodies through the small core ``r_b``; a vortex
        that travels along the surface (a leading-edge vortex) acts through
        ``r_soft`` = max(r_c, 2 c / N) instead, about the spacing of the bound
        vortices at mid-chord (pi c / (2N) for cosine spacing), so that
        passing close over the lumped bound vortices it does not pick out
        each of them (common practice: a core no smaller than the spacing of
        the vortices it passes).  Tied to the elements, not to the step:
        with a core of U dt the leading-edge loads rippled by half their
        value at 320 steps per chord, and with 2 c / N halving the step moved
        the 45-degree pitch-up's lift by 1.2 % rms of its peak
        (tests/validation/test_leading_edge.py).  The bound vortices carry
        soft-site vortices with the same core (``VortexStore.velocities``).
        With a ground each vortex's image acts through the vortex's own core.
        """
        wx, wz, wg = self.store.wake()
        hard = np.ones(wx.size, bool)
        hard[idx] = False
        induced_velocity(xt, zt, wx[hard], wz[hard], wg[hard], self.r_b, u, w, ground=self.z_g)
        du, dw = np.empty_like(xt), np.empty_like(xt)
        induced_velocity(xt, zt, wx[idx], wz[idx], wg[idx], self.r_soft, du, dw, ground=self.z_g)
        u += du
        w += dw

    def _shed(self, s):
        """Stage 3: each shedding site proposes its vortex and border column."""
        s.proposals = []
        for site in self.sites:
            if site.sheds(s):
                x, z = site.propose(s)
                col = np.empty((self.system.n, 1))
                r_core = self.r_soft if site.index in self.soft_sites else self.r_b
                if self.cross is not None:        # several bodies: each body's own core
                    col[:, 0] = self.cross.column(s.xc, s.zc, s.nx, s.nz, x, z,
                                                  self.cross.site_group(site.index, site.index in self.soft_sites),
                                                  self.z_g)
                elif self.z_g is None:
                    normal_influence(s.xc, s.zc, s.nx, s.nz, np.array([x]), np.array([z]), r_core, col)
                else:
                    normal_influence_ground(s.xc, s.zc, s.nx, s.nz, np.array([x]), np.array([z]),
                                            r_core, self.z_g, col)
                s.proposals.append(Proposal(site, x, z, col[:, 0]))

    def _solve(self, s):
        """Stage 4: the bordered system; new vortices join the wake; sites commit."""
        N = self.system.n
        rhs = s.rhs
        props = s.proposals
        if s.n == 0 and self.start != "steady":
            # impulsive start: the first row is the instant before the motion
            # begins, with no circulation anywhere
            s.gamma = np.zeros(N)
        else:
            rows = [p.site.border_row(s, props) for p in props]
            s.gamma, strengths = solve_bordered(self.system.a_inv, [r[0] for r in rows],
                                                [p.column for p in props], [r[1] for r in rows],
                                                rhs, [r[2] for r in rows])
            if s.n == 0:
                self.gamma_start = -float(s.gamma.sum())
            for p, g in zip(props, strengths):
                p.gamma = g
        self.bound_sum = [float(s.gamma[sl].sum()) for sl in self.system.slices]
        s.lesp = [float(self.system.suction_row(b, self.U)[0] @ s.gamma) for b in range(len(self.models))]
        self.store.set_bound(s.xv, s.zv, s.gamma)
        for p in props:
            self.store.shed(p.x, p.z, p.gamma, p.site.index)
        for site in self.sites:
            site.commit(s)

    def _loads(self, s):
        """Stage 5: each body's loads from the air's velocity relative to it."""
        N = self.system.n
        uv = s.u_air[N:].copy()                    # at the vortex points, with the new vortices
        wv = s.w_air[N:].copy()
        for p in s.proposals:
            if self.cross is not None:            # several bodies: each body's own core, and the image
                du, dw = np.empty(N), np.empty(N)
                self.cross.on_points(s.xv, s.zv, self.cross.bound_group, np.array([p.x]), np.array([p.z]),
                                     np.array([p.gamma]),
                                     self.cross.site_group(p.site.index, p.site.index in self.soft_sites),
                                     self.z_g, du, dw)
                uv += du
                wv += dw
                continue
            r_p = self.r_soft if p.site.index in self.soft_sites else self.r_b
            du, dw = _point_vortex(s.xv, s.zv, p.x, p.z, p.gamma, r_p)
            uv += du
            wv += dw
            if self.z_g is not None:              # and its ground image
                du, dw = _point_vortex(s.xv, s.zv, p.x, 2.0 * self.z_g - p.z, -p.gamma, r_p)
                uv += du
                wv += dw
        if len(self.system.slices) > 1:           # every other body's bound vortices
            for sl in self.system.slices:
                others = np.ones(N, dtype=bool)
                others[sl] = False
                iu, iw = np.empty(sl.stop - sl.start), np.empty(sl.stop - sl.start)
                induced_velocity(s.xv[sl], s.zv[sl], s.xv[others], s.zv[others], s.gamma[others],
                                 0.0, iu, iw)
                uv[sl] += iu
                wv[sl] += iw
        if self.z_g is not None:                  # the bound vortices' own images
            iu, iw = np.empty(N), np.empty(N)
            induced_velocity(s.xv, s.zv, s.xv, s.zv, s.gamma, 0.0, iu, iw, ground=self.z_g,
                             images_only=True)
            uv += iu
            wv += iw
        uv -= s.alpha_dot * (s.zv - s.h)
        wv -= s.h_dot - s.alpha_dot * s.xv
        if s.own is not None:
            uv -= s.own[2]
            wv -= s.own[3]
        xs, zs, gs = self.store.sources()
        s.far_total = far = self.far.total()
        s.loads = []
        for b, (hist, sl, model) in enumerate(zip(self.load_histories, self.system.slices, self.models)):
            if hasattr(hist, "add_step"):          # a body with its own loads (surface panels)
                row = hist.add_step(self, s, sl)
            else:
                if hist.body is not model.geometry:   # a deflected flap: new normals and arms
                    hist.reshape(model.geometry)
                row = hist.add(s.n, s.t, s.alpha, s.h, s.gamma[sl], uv[sl], wv[sl], xs, zs, gs,
                               self.gamma_start + far, phi_le=self._phi_le.get(b))
            row["gamma_wake_m2_s"] += far
            if self.z_g is not None:              # the ground carries a share of the impulse
                row["cl_impulse"] = row["cd_impulse"] = row["cm_impulse"] = math.nan
            row["lesp"] = s.lesp[len(s.loads)]
            s.loads.append(row)
        for site in self.sites:
            s.loads[site.body].update(site.report())
        s.total = (s.loads[0] if len(s.loads) == 1 else      # several bodies: the assembly's (vortex.elements)
                   combine_loads(s.loads, [m.geometry for m in self.models], s.alpha, s.h))
        if self._split is not None:
            self._split_impulse(s)
        if not (np.isfinite(s.gamma).all() and all(math.isfinite(r["cl"]) for r in s.loads)):
            raise SolverDiverged(s.n, s.t, _likely_cause(s.gamma))

    def _split_impulse(self, s):
        """Several elements with surface panels: ``cl_impulse_<i>``, ``cd_impulse_<i>`` (each element's
        own impulse, :class:`~unsteady.vortex.elements.ElementImpulseLoads`) and the enclosed air of every
        further panel body in the assembly's impulse columns."""
        q_c = 0.5 * self.rho * self.U ** 2 * self.body.chord
        for i, (cl_i, cd_i) in enumerate(self._split.add(self, s), start=1):
            bad = self.z_g is not None        # the ground carries a share of the impulse
            s.total[f"cl_impulse_{i}"] = math.nan if bad else cl_i
            s.total[f"cd_impulse_{i}"] = math.nan if bad else cd_i
            inner = getattr(self.load_histories[i - 1], "inner_force", None)
            if i > 1 and inner is not None and not bad:
                s.total["cl_impulse"] += inner[1] / q_c
                s.total["cd_impulse"] += inner[0] / q_c

    def _observe(self, s):
        """Stage 6: the observers see the step; the motion takes the loads."""
        st, far, te = self.store, self.far, self.sites[0]
        wx, wz, wg = st.wake()
        extra = {"gamma_start": self.gamma_start, "gamma_far": s.far_total, "x_te": te.x, "z_te": te.z,
                 "leading_edge_sites": self._le_sites}
        if hasattr(self.models[0], "deflection"):
            extra["flap_deg"] = math.degrees(self.models[0].deflection(s.t))
        for i, m in enumerate(self.models[1:], start=2):    # a further element's own flap
            if hasattr(m, "deflection"):
                extra[f"flap_deg_{i}"] = math.degrees(m.deflection(s.t))
        if self.ground is not None:
            extra["ground_clearance_m"] = s.clearance
        state = StepState(n=s.n, t=s.t, alpha=s.alpha, alpha_dot=s.alpha_dot, h=s.h, h_dot=s.h_dot,
                          gamma_bound=s.gamma, x_wake=wx, z_wake=wz, gamma_wake=wg,
                          x_body=s.xv, z_body=s.zv, loads=s.total,
                          dcp=self.load_histories[0].dcp_last,
                          extra=extra,
                          wake_site=st.site[:st.m], far_x=far.x[:far.n], far_z=far.z[:far.n],
                          far_gamma=far.g[:far.n], far_site=far.site[:far.n], body_loads=s.loads)
        for obs in self.observers:
            obs.on_step(state)
        self.motion.after_step(s.t, self.dt, s.total)

    def _convect(self, s):
        """Stage 7: the wake from t to t + dt (free: Adams-Bashforth 2; frozen: at U)."""
        st = self.store
        if st.m == 0:
            return
        if self.free_wake and self.cross is not None:     # several bodies (vortex.elements)
            u, w = self.cross.wake_velocities(st, self.U, self.r_c, self.gust, s.t,
                                              self._soft_indices() if self.soft_sites else None, self.z_g)
        elif self.free_wake:
            u, w = st.velocities(self.U, self.r_c, self.r_b, self.gust, s.t,
                                 self._soft_indices() if self.soft_sites else None, self.r_soft,
                                 ground=self.z_g)
        else:
            u, w = st.frozen_velocities(self.U)
        if not np.isfinite(u).all() or not np.isfinite(w).all():
            raise SolverDiverged(s.n, s.t, _likely_cause(s.gamma))
        keep = self._sides_before(s) if self.soft_sites and self.free_wake else None
        # further bodies whose own leading edge has shed: their soft vortices kept by the same rule
        more = ([(b, self._sides_before(s, b)) for b in self._shed_further()]
                if self.soft_sites and self.free_wake and len(self.models) > 1 else ())
        guard = None
        if self.guard is not None and self.free_wake:        # several bodies (vortex.elements)
            guard = self.guard.before(*st.wake()[:2], s.alpha, s.h)
        st.convect(u, w, self.dt, self.free_wake)
        if keep is not None:
            self._keep_sides(s, *keep)
        for b, k in more:
            if k is not None:
                self._keep_sides(s, *k, body=b)
        if guard is not None:
            alpha, _, h, _ = self.motion.state(s.t + self.dt)
            self.guard.after(*st.wake()[:2], alpha, h, guard)

    def _shed_further(self):
        """The further bodies (index >= 1) with a leading-edge site that has shed, in order."""
        return sorted({site.body for site in self.sites
                       if site.leading_edge and site.body > 0 and getattr(site, "onset", None) is not None})

    def _sides_before(self, s, body=0):
        """Soft vortices over a body's chord (the first's by default): indices and side of its camber line."""
        idx = self._soft_indices()
        if idx.size == 0:
            return None
        wx, wz, _ = self.store.wake()
        if body == 0:
            # only those within a chord of the pitch axis can reach the camber line in one step
            reach = abs(self.body.xi_0[0]) + abs(self.body.xi_te) + self.body.chord
            near = idx[np.abs(wx[idx]) + np.abs(wz[idx] - s.h) < reach]
        else:
            # a further element: those within its chord of its camber line
            g = self._camber(body)
            xi, dz = self._camber_frame(wx[idx], wz[idx], s.alpha, s.h, body)
            near = idx[(xi > g.xi_0[0] - g.chord) & (xi < g.xi_te + g.chord) & (np.abs(dz) < g.chord)]
        if near.size == 0:
            return None
        xi, dz = self._camber_frame(wx[near], wz[near], s.alpha, s.h, body)
        return near, np.sign(dz)

    def _keep_sides(self, s, idx, side, body=0):
        """Mirror back the soft vortices (:meth:`_soft_indices`) that crossed a camber line in this step.

        The no-penetration condition holds only at the collocation points, so
        a vortex carried close along the surface (a leading-edge vortex) can
        step through the camber line; such a vortex is put back on the side
        it came from, mirrored about the camber line (common practice of
        discrete-vortex methods for separated flow: a vortex that enters the
        body is returned to the flow).  The first body's camber line always
        (while soft vortices exist); a further body's once its own leading
        edge has shed (before, several elements' crossing guard alone, so a
        critical value never reached changes nothing).
        """
        alpha, _, h, _ = self.motion.state(s.t + self.dt)
        wx, wz, _ = self.store.wake()
        xi, dz = self._camber_frame(wx[idx], wz[idx], alpha, h, body)
        b = self._camber(body)
        over = (xi > b.xi_0[0]) & (xi < b.xi_te)
        crossed = over & (np.sign(dz) != side) & (side != 0)
        if not crossed.any():
            return
        j = idx[crossed]
        ca, sa = math.cos(alpha), math.sin(alpha)
        # move along the body normal (zeta) by -2 dz: the mirror image about the camber line
        shift = -2.0 * dz[crossed]
        wx[j] += shift * sa
        wz[j] += shift * ca

    def _camber(self, body):
        """The camber line the soft vortices are kept off: the first body's as built, a further one's."""
        return self.body if body == 0 else self.models[body].geometry

    def _camber_frame(self, x, z, alpha, h, body=0):
        """Body-frame xi (m) of points and their height above a body's (the first's) camber line (m)."""
        ca, sa = math.cos(alpha), math.sin(alpha)
        dx, dzz = x, z - h
        xi = dx * ca - dzz * sa
        zeta = dx * sa + dzz * ca
        nodes = self._nodes.get(body)
        if nodes is None:
            b = self._camber(body)
            nodes = self._nodes[body] = (np.append(b.xi_0, b.xi_te), np.append(b.zeta_0, b.zeta_te))
        return xi, zeta - np.interp(xi, *nodes)

    def _far_wake(self, s):
        """Stage 8: lumps drift at U; each site's oldest chord of wake beyond far_wake merges."""
        self.far.drift(self.U * self.dt)
        if self.far_wake is None:
            return
        k = self.lump_n
        for site in self.sites:
            idx, x_young = self.store.oldest(site.index, k)
            if idx is not None and x_young > site.x + self.far_wake:
                gx, gz, gg = self.store.remove(idx)
                for hist in self.load_histories:
                    hist.retire(gx, gz, gg)
                if self._split is not None:
                    self._split.retire(site.index, gx, gz, gg, self.U, self.dt)
                self.far.add(gx, gz, gg, site.index)


class _LeadingEdgeJump:
    """Per body, the circulation its leading-edge sites have shed so far (None for a body without)."""

    def __init__(self, sites):
        self.sites = [s for s in sites if s.leading_edge]

    def get(self, body):
        own = [s for s in self.sites if s.body == body]
        return sum(s.shed_total for s in own) if own else None


def _check_sites(sites, n_bodies):
    for site in sites:
        if not 0 <= site.body < n_bodies:
            raise ValueError(f"a shedding site names body {site.body}; there are {n_bodies} bodies")
    for b in range(n_bodies):
        kelvin = sum(1 for site in sites if site.body == b and site.kelvin)
        if kelvin != 1:
            raise ValueError(f"body {b} has {kelvin} Kelvin sites; each body needs exactly one "
                             "(its trailing edge), whose row keeps the body's circulation")


def _own_velocities(models, s):
    """The bodies' own velocities in their frame (``surface_velocity``), concatenated; None if none moves."""
    parts = [m.surface_velocity(s.t, s.alpha, s.h) if hasattr(m, "surface_velocity") else None
             for m in models]
    if all(p is None for p in parts):
        return None
    return tuple(np.concatenate([p[i] if p is not None else np.zeros(m.n) for p, m in zip(parts, models)])
                 for i in range(4))


def _point_vortex(x, z, xs, zs, gamma, r_c):
    dx = x - xs
    dz = z - zs
    r2 = dx * dx + dz * dz
    f = gamma / (2.0 * math.pi * np.sqrt(r2 * r2 + r_c ** 4))
    return -f * dz, f * dx


def _likely_cause(gamma_b):
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
