"""Shedding sites: where a body sheds vortices, and the condition that sets their strength."""

from __future__ import annotations

import math

import numpy as np

from .bodies import rotate, to_inertial
from .system import solve_bordered


class SheddingSite:
    """Base class of a shedding site (the site rules of :class:`~unsteady.vortex.solver.VortexSolver`).

    A site belongs to one body (``body``, its index in the solver's list).
    Each step the solver calls, in this order: ``locate`` (place stage),
    ``sheds`` and, if it sheds, ``propose`` (shed stage), ``border_row``
    (solve stage, only if it sheds), then ``commit`` (solve stage, every
    site, after the solve).  ``x, z`` is the site's current position in the
    computation frame (set by ``locate``); the far-wake stage measures the
    age of the site's wake from there.

    Attributes
    ----------
    kelvin : bool
        True if the site's border row is Kelvin's theorem for its body (each
        body has exactly one such site, and it sheds every step after the first).
    """

    kelvin = False
    #: whether its vortices meet the bodies through the soft core (see ``VortexSolver._soften``)
    soft_core = False
    #: whether it sheds from the leading edge (its ``shed_total`` starts the body's potential jump)
    leading_edge = False

    def __init__(self, body=0):
        self.body = int(body)
        self.x = self.z = float("nan")

    def bind(self, solver, index):
        """Start of a run: the solver, and this site's index (the one its vortices carry)."""
        self.solver = solver
        self.index = index

    def locate(self, step):
        """Set ``self.x, self.z`` from the placed body (``step.alpha``, ``step.h``, ``step.t``)."""
        raise NotImplementedError

    def sheds(self, step):
        """Whether the site sheds a vortex this step."""
        raise NotImplementedError

    def propose(self, step):
        """Position ``(x, z)`` (m, computation frame) of this step's new vortex."""
        raise NotImplementedError

    def border_row(self, step, proposals):
        """This site's row of the bordered system.

        Returns ``(reduced_row, d, e)``: the row over the bound circulations
        already multiplied by the inverse body matrix (``c A^-1``, from
        ``solver.system.kelvin_row`` or ``solver.system.reduce``), the
        coefficients of the strengths of ``proposals`` (this step's new
        vortices, in order; each has ``.site``, ``.x``, ``.z``) and the
        right-hand side.
        """
        raise NotImplementedError

    def commit(self, step):
        """After the solve: remember what the next step's proposal needs."""

    def report(self):
        """History entries of this site for its body's row (e.g. circulation shed so far)."""
        return {}


class TrailingEdgeSite(SheddingSite):
    """Sheds one vortex every step from a body's trailing edge; its row is Kelvin's theorem.

    The new vortex goes a fraction ``offset`` of the way from the trailing
    edge to where the air that left the trailing edge one step ago has got
    to (common practice: 0.2-0.3 of the last-step travel, J. Katz & A.
    Plotkin, *Low-Speed Aerodynamics*, 2nd ed., 2001, sec. 13.8).  Its
    strength keeps the body's total circulation (bound plus everything the
    body sheds this step) equal to the body's bound circulation of the step
    before (Kelvin's theorem).  With lumped vortices the Kutta condition is
    carried by the three-quarter-point collocation, so Kelvin is the row.

    Parameters
    ----------
    body : int
        Index of the body in the solver's list.
    offset : float
        Fraction of the last-step travel (see above).
    """

    kelvin = True

    def __init__(self, body=0, offset=0.3):
        super().__init__(body)
        self.offset = float(offset)

    def bind(self, solver, index):
        super().bind(solver, index)
        self.model = solver.models[self.body]
        self.previous = None

    def locate(self, step):
        xi, zeta = self.model.trailing_edge(step.t)
        self.x, self.z = to_inertial(xi, zeta, step.alpha, step.h)

    def sheds(self, step):
        return self.previous is not None

    def propose(self, step):
        sv = self.solver
        x_p, z_p = self.previous
        ua, wa = sv.U, 0.0
        if sv.gust is not None:
            gu, gw = sv.gust.velocity(np.array([x_p]), np.array([z_p]), step.t - sv.dt)
            ua += float(gu[0])
            wa += float(gw[0])
        return (self.x + self.offset * (x_p + ua * sv.dt - self.x),
                self.z + self.offset * (z_p + wa * sv.dt - self.z))

    def border_row(self, step, proposals):
        sv = self.solver
        d = [1.0 if p.site.body == self.body else 0.0 for p in proposals]
        return sv.system.kelvin_row(self.body), d, sv.bound_sum[self.body]

    def commit(self, step):
        self.previous = (self.x, self.z)


class LeadingEdgeSite(SheddingSite):
    """Sheds from a body's leading edge when its suction parameter would pass a critical value.

    The criterion is that of K. Ramesh, A. Gopalarathnam, K. Granlund, M. V.
    Ol & J. R. Edwards, J. Fluid Mech. 751 (2014) 500-538: the leading-edge
    suction parameter LESP (A0 of the bound vorticity, see
    :meth:`~unsteady.vortex.system.BodySystem.suction_row`) has a critical
    value for a given section and Reynolds number, independent of the
    motion.  Each step (after the first row) the site makes a trial solve
    with the sites before it (the body's trailing edge and, with several
    bodies, every earlier body's sites that shed this step); if that gives
    ``|LESP| > critical`` the site sheds one vortex whose strength, solved
    together with the trailing-edge vortex, brings ``LESP`` to
    ``sign(LESP) * critical`` exactly (its border row: ``q . gamma =
    +-critical``; the Kelvin row of the trailing edge counts this vortex too).
    Each body may have its own site and critical value; the step's bordered
    system then holds one such row per shedding leading edge, all solved
    exactly together.

    **Placement** (a rule of this program; the paper places each new
    leading-edge vortex a third of the way from the leading edge to the one
    before, from memory): the newest piece of the leading-edge shear layer
    is one step of travel long and leaves the edge tangentially, rolling up
    over the suction side, so the vortex goes ``offset * |V| dt`` from the
    leading edge along the bisector of the camber tangent there (aft) and
    the normal on the suction side (the upper side when LESP > 0), with
    ``V`` the air's velocity relative to the leading edge (freestream and
    gust less the body's motion).  The same ``offset`` as the trailing edge
    (common practice 0.2-0.3 of the step's travel) keeps it one fifth of a
    step's travel off the surface.  Its vortices meet the body through the
    soft core of :meth:`~unsteady.vortex.solver.VortexSolver._soften`
    (``soft_core``), are kept on their side of the camber line
    (``VortexSolver._keep_sides``), and the far wake lumps them as it lumps
    the trailing edge's.

    Parameters
    ----------
    body : int
        Index of the body.
    critical : float
        The critical LESP (> 0).
    offset : float
        Fraction of a step's travel (see above).
    """

    soft_core = True
    leading_edge = True

    def __init__(self, body=0, critical=0.2, offset=0.3):
        super().__init__(body)
        self.critical = float(critical)
        self.offset = float(offset)

    def bind(self, solver, index):
        super().bind(solver, index)
        g = solver.models[self.body].geometry
        self._le = (float(g.xi_0[0]), float(g.zeta_0[0]))
        self._dir = (float(g.t_xi[0]), float(g.t_zeta[0]), float(g.n_xi[0]), float(g.n_zeta[0]))
        self.sign = 0.0
        self.shed_total = 0.0      # circulation shed so far (m^2/s)
        self.onset = None          # time of the first shedding (s)

    def locate(self, step):
        self.x, self.z = to_inertial(self._le[0], self._le[1], step.alpha, step.h)

    def sheds(self, step):
        if step.n == 0:            # the first row is the settled attached flow (or rest)
            return False
        sv = self.solver
        props = step.proposals
        rows = [p.site.border_row(step, props) for p in props]
        g, _ = solve_bordered(sv.system.a_inv, [r[0] for r in rows], [p.column for p in props],
                              [r[1] for r in rows], step.rhs, [r[2] for r in rows])
        lesp = float(sv.system.suction_row(self.body, sv.U)[0] @ g)
        if abs(lesp) <= self.critical:
            return False
        self.sign = math.copysign(1.0, lesp)
        return True

    def propose(self, step):
        sv = self.solver
        t_xi, t_zeta, n_xi, n_zeta = self._dir
        ex, ez = rotate(t_xi + self.sign * n_xi, t_zeta + self.sign * n_zeta, step.alpha)
        ua, wa = sv.U, 0.0
        if sv.gust is not None:
            gu, gw = sv.gust.velocity(np.array([self.x]), np.array([self.z]), step.t)
            ua += float(gu[0])
            wa += float(gw[0])
        ua -= step.alpha_dot * (self.z - step.h)
        wa -= step.h_dot - step.alpha_dot * self.x
        d = self.offset * math.hypot(ua, wa) * sv.dt / math.sqrt(2.0)     # (ex, ez) has length sqrt 2
        return self.x + d * ex, self.z + d * ez

    def border_row(self, step, proposals):
        sv = self.solver
        return (sv.system.suction_row(self.body, sv.U)[1], [0.0] * len(proposals),
                self.sign * self.critical)

    def commit(self, step):
        for p in step.proposals:
            if p.site is self:
                self.shed_total += p.gamma
                if self.onset is None:
                    self.onset = step.t

    def report(self):
        return {"gamma_lev": self.shed_total}
