"""Shedding sites: where a body sheds vortices, and the condition that sets their strength."""

from __future__ import annotations

import numpy as np

from .bodies import to_inertial


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
