"""The hinged trailing-edge flap: a camber line whose elements aft of the hinge rotate about it.

A body model of the solver's body rules (:class:`~unsteady.vortex.solver.VortexSolver`):
its points move in the body frame when the deflection changes (``changed``
then asks for one refactorization), and its flap elements move with their
own velocity, which the boundary condition and the loads see through
``surface_velocity``.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from ..inputs.sections import hinge_nodes
from .bodies import Body, BodyPoints, rotate, to_inertial

__all__ = ["hinge_nodes", "HingedFlapCamber", "HeldLaw", "build_flap_body", "BETA_TOL"]

#: Changes of the deflection below this (rad) keep the flap's points and the factored matrix
#: as they are: a smoothed law creeps towards its end values for many steps, and a
#: refactorization per step for a change of 1e-12 rad would buy nothing.
BETA_TOL = 1e-9


def _deflect(xi, zeta, xi_h, zeta_h, beta):
    """Points of the flap rotated by beta (trailing edge down) about the hinge, in the body frame."""
    x, z = to_inertial(xi - xi_h, zeta - zeta_h, beta, 0.0)
    return x + xi_h, z + zeta_h


class HeldLaw:
    """A deflection held still at ``beta`` (rad): the law of a further element's flap
    (``[[airfoil]] flap_deflection``), with the law interface the flap bodies read."""

    def __init__(self, beta):
        self.beta = float(beta)

    def value(self, t):
        return self.beta + 0.0 * np.asarray(t, float) if np.ndim(t) else self.beta

    def rate(self, t):
        return 0.0 * np.asarray(t, float) if np.ndim(t) else 0.0

    def accel(self, t):
        return self.rate(t)

    def singular_times(self):
        return []


class HeldDeflection:
    """The deflection rules shared by the flap bodies (camber line and surface panels).

    A subclass sets ``law`` (beta(t), rad, with its exact rate), ``_beta_points``
    (the deflection its points were built at, or None) and ``_beta_matrix``
    (the one of the last factorization, or None), and ``_set(beta)``.
    """

    def deflection(self, t):
        """beta(t), rad (trailing edge down): the law's value."""
        return float(self.law.value(t))

    def flap_rate(self, t):
        """beta'(t), rad/s."""
        return float(self.law.rate(t))

    def _held(self, t):
        """The deflection the points use: beta(t), or the one in use while they differ by under BETA_TOL."""
        beta = self.deflection(t)
        if self._beta_points is not None and abs(beta - self._beta_points) <= BETA_TOL:
            return self._beta_points
        return beta

    def changed(self, t):
        """True (once) when beta(t) differs from the deflection of the last factorization."""
        beta = self._held(t)
        if beta == self._beta_matrix:
            return False
        self._beta_matrix = beta
        return True


class HingedFlapCamber(HeldDeflection):
    """A camber line with a plain flap hinged at a node (the body rules of the solver).

    The elements from node ``k`` (the hinge) to the trailing edge rotate
    rigidly about the hinge by beta(t) (trailing edge down positive, the same
    sense as a nose-up pitch); the camber line kinks there.  ``points(t)``
    gives the deflected points, ``changed(t)`` is True when beta differs from
    the one the matrix was built with (by more than :data:`BETA_TOL`), ``surface_velocity`` the flap's own
    velocity beta' x (r - r_hinge) at its collocation and vortex points, and
    ``geometry`` the deflected :class:`~unsteady.vortex.bodies.Body` (for the
    loads).  ``hinge`` = (xi_h, zeta_h, k, c_f) for the hinge moment.

    Parameters
    ----------
    geometry : Body
        The undeflected camber line, with an element edge at the hinge.
    k : int
        Index of the hinge node (the first flap element).
    law : Law
        beta(t) in radians with its exact rate (``value``, ``rate``).
    """

    def __init__(self, geometry, k, law):
        self.base = geometry
        self.k = int(k)
        self.law = law
        b = geometry
        self.xi_h, self.zeta_h = float(b.xi_0[k]), float(b.zeta_0[k])
        self.chord_f = float(math.hypot(b.xi_te - self.xi_h, b.zeta_te - self.zeta_h))
        self.hinge = (self.xi_h, self.zeta_h, self.k, self.chord_f)
        self._beta_matrix = None
        self._beta_points = None
        self._set(float(law.value(0.0)))

    @property
    def n(self) -> int:
        return self.base.n

    def _set(self, beta):
        if beta == self._beta_points:
            return
        b, k = self.base, self.k
        f = slice(k, None)

        def turned(xi, zeta):
            x, z = np.array(xi, float), np.array(zeta, float)
            x[f], z[f] = _deflect(x[f], z[f], self.xi_h, self.zeta_h, beta)
            return x, z

        def turned_vec(vx, vz):
            x, z = np.array(vx, float), np.array(vz, float)
            x[f], z[f] = rotate(x[f], z[f], beta)
            return x, z

        xi_v, zeta_v = turned(b.xi_v, b.zeta_v)
        xi_c, zeta_c = turned(b.xi_c, b.zeta_c)
        xi_0, zeta_0 = turned(b.xi_0, b.zeta_0)
        n_xi, n_zeta = turned_vec(b.n_xi, b.n_zeta)
        t_xi, t_zeta = turned_vec(b.t_xi, b.t_zeta)
        nc_xi, nc_zeta = turned_vec(b.nc_xi, b.nc_zeta)
        te = _deflect(np.array([b.xi_te]), np.array([b.zeta_te]), self.xi_h, self.zeta_h, beta)
        self.geometry = dataclasses.replace(
            b, xi_v=xi_v, zeta_v=zeta_v, xi_c=xi_c, zeta_c=zeta_c, n_xi=n_xi, n_zeta=n_zeta,
            t_xi=t_xi, t_zeta=t_zeta, xi_0=xi_0, zeta_0=zeta_0, xi_te=float(te[0][0]),
            zeta_te=float(te[1][0]), nc_xi=nc_xi, nc_zeta=nc_zeta)
        self._points = BodyPoints(xi_v, zeta_v, xi_c, zeta_c, nc_xi, nc_zeta)
        self._beta_points = beta

    def points(self, t):
        """Vortex points, collocation points and collocation normals at time ``t`` (deflected)."""
        self._set(self._held(t))
        return self._points

    def trailing_edge(self, t):
        """The deflected trailing edge (xi, zeta) in the body frame."""
        self._set(self._held(t))
        return self.geometry.xi_te, self.geometry.zeta_te

    def surface_velocity(self, t, alpha, h):
        """The flap's own velocity (m/s, computation frame) at the collocation and vortex points.

        A rotation at beta' about the hinge (in the nose-up sense, as beta is
        trailing edge down): (u, w) = beta' (z - z_h, -(x - x_h)); zero ahead
        of the hinge.  Returns ``(u_c, w_c, u_v, w_v)`` over the body's
        elements, or None while the flap does not move.
        """
        rate = float(self.law.rate(t))
        if rate == 0.0:
            return None
        g, k = self.geometry, self.k
        x_h, z_h = to_inertial(self.xi_h, self.zeta_h, alpha, h)
        out = []
        for xi, zeta in ((g.xi_c, g.zeta_c), (g.xi_v, g.zeta_v)):
            x, z = to_inertial(xi, zeta, alpha, h)
            u = np.zeros(self.n)
            w = np.zeros(self.n)
            u[k:] = rate * (z[k:] - z_h)
            w[k:] = -rate * (x[k:] - x_h)
            out += [u, w]
        return tuple(out)


def build_flap_body(sc, law):
    """The scenario's camber line with its flap (``[airfoil] flap_hinge``) deflected by ``law`` (rad)."""
    hinge = sc.data["airfoil"]["flap_hinge"]
    x, k = hinge_nodes(sc.elements, hinge)
    body = Body.from_section(sc.section, sc.elements, sc.chord, sc.pivot, x_nodes=x)
    return HingedFlapCamber(body, k, law)
