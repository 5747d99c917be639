"""Bodies of the vortex model: camber-line geometry, frames, and the rigid body model."""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from ..inputs.sections import camber_elements


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
    """Body coordinates -> computation frame (x, z) at pitch alpha, height h.

    The computation runs in a frame that follows the aircraft's mean flight,
    so the air streams past at ``+U`` along x; z is up.  The pitch axis
    (pivot) sits at x = 0 and at height ``h(t)``.  A body point with body
    coordinates (xi, zeta) (xi aft of the pivot along the chord, zeta up,
    both at zero pitch) lies at::

        x = xi cos(alpha) + zeta sin(alpha)
        z = h - xi sin(alpha) + zeta cos(alpha)

    with ``alpha`` nose-up; its velocity is ``(alpha_dot (z - h), h_dot -
    alpha_dot x)``.
    """
    ca, sa = math.cos(alpha), math.sin(alpha)
    return xi * ca + zeta * sa, h - xi * sa + zeta * ca


def rotate(v_xi, v_zeta, alpha):
    """Rotate a body-frame vector into the computation frame."""
    ca, sa = math.cos(alpha), math.sin(alpha)
    return v_xi * ca + v_zeta * sa, -v_xi * sa + v_zeta * ca


def build_body(sc) -> Body:
    """The rigid camber line of the scenario, in metres about the pivot."""
    p = camber_elements(sc.section, sc.elements)
    return Body.from_section(sc.section, sc.elements, sc.chord, sc.pivot, x_nodes=p.x_nodes)


class BodyPoints(NamedTuple):
    """A body's points in the assembly's body frame (metres about the pivot, zero pitch)."""

    xi_v: np.ndarray
    zeta_v: np.ndarray
    xi_c: np.ndarray
    zeta_c: np.ndarray
    n_xi: np.ndarray
    n_zeta: np.ndarray


class RigidCamber:
    """The body model of a rigid camber line (see the body rules of :class:`VortexSolver`).

    Its points never move in the body frame, so the influence matrix is
    factored once and never refactored.

    Parameters
    ----------
    geometry : Body
        The camber line, in the assembly's body frame.
    """

    def __init__(self, geometry):
        self.geometry = geometry
        b = geometry
        self._points = BodyPoints(b.xi_v, b.zeta_v, b.xi_c, b.zeta_c, b.nc_xi, b.nc_zeta)

    @property
    def n(self) -> int:
        """Number of bound vortices (and collocation points)."""
        return self.geometry.n

    def points(self, t):
        """Vortex points, collocation points and collocation normals at time ``t``."""
        return self._points

    def changed(self, t):
        """Whether the points moved in the body frame since the last factorization: never."""
        return False

    def trailing_edge(self, t):
        """The trailing edge (xi, zeta) in the body frame at time ``t``."""
        return self.geometry.xi_te, self.geometry.zeta_te


def as_body_models(body):
    """A body, a body model or a sequence of either -> a list of body models."""
    items = list(body) if isinstance(body, (list, tuple)) else [body]
    if not items:
        raise ValueError("the solver needs at least one body")
    return [RigidCamber(b) if isinstance(b, Body) else b for b in items]
