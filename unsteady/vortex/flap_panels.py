"""A thick section with a plain trailing-edge flap: surface panels whose nodes aft of the hinge turn about it.

A body model of the solver's body rules (:class:`~unsteady.vortex.solver.VortexSolver`)
that joins :mod:`~unsteady.vortex.panels` (the outline on linear-strength vortex
panels, J. Katz & A. Plotkin, *Low-Speed Aerodynamics*, 2nd ed., 2001, ch. 11) and
:mod:`~unsteady.vortex.flap` (the hinged flap of the camber line).

**Geometry.**  Both surfaces carry a node at the chord station of the hinge
(:func:`~unsteady.inputs.sections.hinge_nodes` on each surface, :func:`~unsteady.inputs.thick.flap_outline`), where the normal to
the mean line through the hinge point (x_h, z_c(x_h)) meets them; the nodes aft
of it (both surfaces, the trailing edge included) turn rigidly about the hinge
point by beta(t), trailing edge down positive.  The two hinge nodes stay, so the
panel from each of them to the first turned node bends and stretches with the
deflection: the outline stays closed, kinked at the hinge on both surfaces (a
sealed plain flap, common practice for inviscid flap models).  Past a certain
deflection the panel on the inside of the turn folds back; ``check`` refuses a
flap law that brings neighbouring panels to turn by more than 75 degrees
(:func:`~unsteady.inputs.thick.flap_fold_limit`): more panels, a thinner section
or a hinge further aft allow more.

**Motion.**  While beta changes the outline is rebuilt and the matrix refactored
(``changed``), and the nodes move with their own velocity beta' x (r - r_h)
(aft of the hinge, zero ahead), the panel mid-points with the mean of their two
nodes' (each panel stays straight), which the boundary condition subtracts
(``surface_velocity``).  The enclosed air then has a second pattern, per unit
flap rate (``inner_flap``, from one solve of the panel system with the flap's
normal velocity alone, as ``inner_rotation`` for the pitch rate), which the
pressure of :class:`~unsteady.vortex.panels.SurfaceLoads` adds.

**Hinge moment** ``ch``: the pressure on the panels aft of the hinge nodes about
the hinge point, nose-up sense (= trailing edge down), over q c_f^2 with c_f the
distance from the hinge to the trailing edge.
"""

from __future__ import annotations

import math

import numpy as np

from ..inputs.thick import flap_outline, turn_nodes
from .flap import HeldDeflection
from .panels import SurfaceGeometry, SurfacePanels

__all__ = ["HingedFlapPanels", "build_flap_surface"]


class HingedFlapPanels(HeldDeflection):
    """Surface panels with a plain flap hinged at chord fraction ``hinge`` (the body rules of the solver).

    Parameters
    ----------
    section : Section
    n_panels : int
        Even number of surface panels, half on each surface.
    chord, pivot : float
        Chord (m) and pitch axis (chord fraction).
    hinge : float
        Hinge station (chord fraction), on the mean line.
    law : Law
        beta(t) in radians with its exact rate.
    """

    def __init__(self, section, n_panels, chord, pivot, hinge, law):
        x, z, self.moving = flap_outline(section, n_panels, hinge)
        #: outline nodes (chord fractions) undeflected; ``moving``: those aft of the hinge nodes
        self.base_x, self.base_z = x, z
        self.chord, self.pivot = float(chord), float(pivot)
        self.z_ref = float(np.asarray(section.camber(np.array([0.25])), float)[0])
        self.x_h = float(hinge)
        self.z_h = float(np.asarray(section.camber(np.array([self.x_h])), float)[0])
        self.xi_h, self.zeta_h = (self.x_h - self.pivot) * self.chord, self.z_h * self.chord
        self.law = law
        flap = self.moving[:-1] | self.moving[1:]          # panels with a turning node
        xi_te, zeta_te = (x[-1] - self.pivot) * self.chord, z[-1] * self.chord
        c_f = math.hypot(xi_te - self.xi_h, zeta_te - self.zeta_h)
        #: (xi_h, zeta_h, flap panels, c_f) for the hinge moment of SurfaceLoads
        self.hinge = (self.xi_h, self.zeta_h, flap, c_f)
        self._beta_points = None
        self._beta_matrix = None
        self.loads = None
        self._set(float(law.value(0.0)))

    # -- shape ---------------------------------------------------------
    def _set(self, beta):
        if beta == self._beta_points:
            return
        x, z = turn_nodes(self.base_x, self.base_z, self.moving, self.x_h, self.z_h, beta)
        geometry = SurfaceGeometry.from_nodes(x, z, self.chord, self.pivot, self.z_ref)
        if geometry.area <= 0.0:                    # check keeps deflections well short of this
            raise ValueError(f"the thick flap's outline folds at {math.degrees(beta):.3g} degrees")
        self.panels = SurfacePanels(geometry)
        self.geometry = geometry
        self.inner_flap = self._inner_flap()
        self._beta_points = beta

    def _unit_flap_velocity(self):
        """Node and mid-point velocity (body frame, m/s) per unit flap rate (rad/s), nose-up sense."""
        g = self.geometry
        u = np.where(self.moving, g.zeta_n - self.zeta_h, 0.0)
        w = np.where(self.moving, -(g.xi_n - self.xi_h), 0.0)
        return u, w, 0.5 * (u[:-1] + u[1:]), 0.5 * (w[:-1] + w[1:])

    def _inner_flap(self):
        """Tangential velocity of the enclosed air relative to the outline per unit flap rate (m/s per rad/s).

        As :meth:`~unsteady.vortex.panels.SurfacePanels._inner_rotation`: one solve of the
        panel system with the flap's normal velocity alone (inside limit: principal value +
        gamma / 2), less the outline's own velocity.
        """
        g = self.geometry
        _, _, um, wm = self._unit_flap_velocity()
        rhs = np.append(um * g.n_xi + wm * g.n_zeta, 0.0)
        gamma = np.linalg.solve(self.panels.influence_matrix(), rhs) / g.w
        inside = self.panels.tangent_gamma @ gamma + 0.25 * (gamma[:-1] + gamma[1:])
        return inside - (um * g.t_xi + wm * g.t_zeta)

    # -- the body rules ------------------------------------------------
    @property
    def n(self) -> int:
        return self.geometry.n + 1

    leading_edge_suction = False

    def points(self, t):
        self._set(self._held(t))
        return self.panels.points(t)

    def trailing_edge(self, t):
        self._set(self._held(t))
        return self.panels.trailing_edge(t)

    def influence_matrix(self):
        return self.panels.influence_matrix()

    def ground_matrix(self, step, z_ground):
        return self.panels.ground_matrix(step, z_ground)

    def surface_velocity(self, t, alpha, h):
        """The flap's own velocity (m/s, computation frame) at the collocation points (mid-points and the
        Kutta point, the trailing edge) and the nodes; None while the flap does not move."""
        rate = self.flap_rate(t)
        if rate == 0.0:
            return None
        u, w, um, wm = self._unit_flap_velocity()
        ca, sa = math.cos(alpha), math.sin(alpha)

        def placed(a, b):                       # body-frame vectors into the computation frame
            return rate * (a * ca + b * sa), rate * (-a * sa + b * ca)
        uc, wc = placed(np.append(um, u[-1]), np.append(wm, w[-1]))
        uv, wv = placed(u, w)
        return uc, wc, uv, wv

    # SurfaceLoads reads these of its model
    @property
    def inner_rotation(self):
        return self.panels.inner_rotation

    @property
    def tangent_gamma(self):
        return self.panels.tangent_gamma

    @property
    def resolved(self):
        return self.panels.resolved

    @property
    def image_velocity(self):
        return self.panels.image_velocity

    def load_history(self, speed, density, dt):
        from .panels import SurfaceLoads
        self.loads = SurfaceLoads(self, speed, density, dt)
        return self.loads


def build_flap_surface(sc, law):
    """The scenario's thick section on surface panels with its flap (``[airfoil] flap_hinge``) moved by ``law`` (rad)."""
    return HingedFlapPanels(sc.section, sc.elements, sc.chord, sc.pivot, sc.data["airfoil"]["flap_hinge"], law)
