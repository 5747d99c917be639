"""Flow fields on picture grids: velocity, stream function and smoothed vorticity of the vortex model."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..vortex.kernels import induced_stream_function, induced_velocity
from ..vortex.solver import default_core_radii, to_inertial

__all__ = [
    "Grid",
    "Sources",
    "make_grid",
    "velocity_field",
    "stream_function",
    "vorticity_field",
    "speed",
    "snapshot_sources",
    "snapshot_count",
    "core_radii",
    "airfoil_outline",
    "element_flaps_at",
    "flap_at",
    "ground_height",
    "chord_line",
]


@dataclass(frozen=True)
class Grid:
    """Evenly spaced picture grid: nodes ``x`` (nx,) and ``z`` (nz,), in metres.

    Field arrays on the grid have shape ``(nz, nx)`` (rows are heights, the
    layout of ``imshow(origin="lower")``).
    """

    x: np.ndarray
    z: np.ndarray

    @property
    def shape(self):
        return (self.z.size, self.x.size)

    @property
    def dx(self):
        return float(self.x[1] - self.x[0]) if self.x.size > 1 else 1.0

    @property
    def dz(self):
        return float(self.z[1] - self.z[0]) if self.z.size > 1 else 1.0

    @property
    def extent(self):
        """(left, right, bottom, top) of the cells centred on the nodes, for ``imshow``."""
        return (self.x[0] - 0.5 * self.dx, self.x[-1] + 0.5 * self.dx,
                self.z[0] - 0.5 * self.dz, self.z[-1] + 0.5 * self.dz)

    def points(self):
        """All nodes as flat float64 arrays (x, z), row by row."""
        X, Z = np.meshgrid(self.x, self.z)
        return X.ravel().astype(np.float64), Z.ravel().astype(np.float64)

    def shifted(self, dx):
        """The same grid moved by ``dx`` along x."""
        return Grid(self.x + dx, self.z)


def make_grid(x_range, z_range, nx, nz) -> Grid:
    """A grid of ``nx`` by ``nz`` nodes spanning the closed ranges (m)."""
    nx, nz = int(nx), int(nz)
    if nx < 2 or nz < 2:
        raise ValueError("a field grid needs at least 2 x 2 nodes")
    return Grid(np.linspace(*x_range, nx), np.linspace(*z_range, nz))


@dataclass(frozen=True)
class Sources:
    """A group of regularised point vortices: positions, strengths, core radius.

    ``gamma`` is the circulation (m^2/s), counter-clockwise positive;
    ``r_c`` the Vatistas core radius (m) with which the group acts on others.
    """

    x: np.ndarray
    z: np.ndarray
    gamma: np.ndarray
    r_c: float = 0.0

    @classmethod
    def of(cls, x, z, gamma, r_c=0.0):
        f = (lambda a: np.ascontiguousarray(np.ravel(a), dtype=np.float64))
        return cls(f(x), f(z), f(gamma), float(r_c))

    def shifted(self, dx):
        return Sources(self.x + dx, self.z, self.gamma, self.r_c)


def _flat(x, z):
    x = np.asarray(x, dtype=np.float64)
    z = np.asarray(z, dtype=np.float64)
    x, z = np.broadcast_arrays(x, z)
    return x.shape, np.ascontiguousarray(x.ravel()), np.ascontiguousarray(z.ravel())


def velocity_field(x, z, sources, *, freestream=(0.0, 0.0), gust=None, t=0.0):
    """Velocity (m/s) at points from groups of regularised vortices.

    The velocity of each group is the regularised Biot-Savart sum of the
    solver's kernel :func:`unsteady.kernels.induced_velocity` (Vatistas n = 2
    core), so the picture shows exactly the flow the model computes.

    Parameters
    ----------
    x, z : array_like (m)
        Points (any shape, broadcast together), in the frame of the sources.
    sources : sequence of Sources
    freestream : (float, float)
        Uniform velocity (u, w) added everywhere (m/s): ``(U, 0)`` in the
        solver's frame, which follows the aircraft; ``(0, 0)`` in still air.
    gust : callable, optional
        ``gust(x, z, t) -> (u, w)``: the air's own velocity, added.
    t : float
        Time passed to ``gust`` (s).

    Returns
    -------
    u, w : ndarray
        Same shape as the broadcast points.
    """
    shape, xf, zf = _flat(x, z)
    u = np.full(xf.shape, float(freestream[0]))
    w = np.full(xf.shape, float(freestream[1]))
    du = np.empty_like(xf)
    dw = np.empty_like(xf)
    for s in sources:
        if s.x.size == 0:
            continue
        induced_velocity(xf, zf, s.x, s.z, s.gamma, float(s.r_c), du, dw)
        u += du
        w += dw
    if gust is not None:
        gu, gw = gust(xf, zf, t)
        u += gu
        w += gw
    return u.reshape(shape), w.reshape(shape)


def stream_function(x, z, sources, *, freestream=(0.0, 0.0)):
    """Stream function psi (m^2/s) of the vortices plus a uniform stream.

    ``u = d psi / dz``, ``w = -d psi / dx``; a uniform stream (U, W) adds
    ``U z - W x``.  Contours of psi are streamlines (exact in 2-D
    incompressible flow; common practice).  Gusts are left out (a frozen
    vertical gust pattern has its own stream function -int w dx).
    """
    shape, xf, zf = _flat(x, z)
    psi = freestream[0] * zf - freestream[1] * xf
    tmp = np.empty_like(xf)
    for s in sources:
        if s.x.size == 0:
            continue
        induced_stream_function(xf, zf, s.x, s.z, s.gamma, float(s.r_c), tmp)
        psi += tmp
    return psi.reshape(shape)


def vorticity_field(grid: Grid, sources, sigma=None):
    """Smoothed vorticity (1/s, counter-clockwise positive) on a grid.

    Each vortex is spread as a Gaussian blob,

        omega(r) = gamma / (2 pi sigma^2) exp(-r^2 / (2 sigma^2)),

    (vortex-blob smoothing, common practice), carried out by depositing the
    circulation on the grid nodes by area weighting (cloud in cell) and
    filtering with a Gaussian of standard deviation ``sigma``.  The field
    integrates to the total circulation of the vortices inside the grid.

    Parameters
    ----------
    grid : Grid
    sources : sequence of Sources
    sigma : float, optional
        Smoothing length (m); default 1.5 grid spacings.

    Returns
    -------
    ndarray, shape grid.shape
    """
    nz, nx = grid.shape
    dx, dz = grid.dx, grid.dz
    acc = np.zeros(nz * nx)
    for s in sources:
        if s.x.size == 0:
            continue
        fx = (s.x - grid.x[0]) / dx
        fz = (s.z - grid.z[0]) / dz
        inside = (fx >= 0) & (fx <= nx - 1) & (fz >= 0) & (fz <= nz - 1)
        fx, fz, g = fx[inside], fz[inside], s.gamma[inside]
        i = np.minimum(fx.astype(np.int64), nx - 2)
        j = np.minimum(fz.astype(np.int64), nz - 2)
        ax, az = fx - i, fz - j
        for di, dj, wgt in ((0, 0, (1 - ax) * (1 - az)), (1, 0, ax * (1 - az)),
                            (0, 1, (1 - ax) * az), (1, 1, ax * az)):
            acc += np.bincount((j + dj) * nx + (i + di), weights=g * wgt, minlength=nz * nx)
    omega = acc.reshape(nz, nx) / (dx * dz)
    from scipy.ndimage import gaussian_filter     # here: only the vorticity drawing needs it
    if sigma is None:
        sigma = 1.5 * max(dx, dz)
    return gaussian_filter(omega, sigma=(sigma / dz, sigma / dx), mode="constant", truncate=4.0)


def speed(u, w):
    """Magnitude of the velocity (m/s)."""
    return np.hypot(u, w)


# ---------------------------------------------------------------------------
# Run snapshots -> sources
def core_radii(scenario):
    """(wake core, body core) radii (m) the solver used for this scenario."""
    r_wake, r_body = default_core_radii(scenario.chord, scenario.speed, scenario.dt)
    rc = scenario.data.get("run", {}).get("core_radius")
    return (float(rc) if rc is not None else r_wake), r_body


def snapshot_count(snapshots) -> int:
    """Number of wake snapshots in a snapshot dict (``snapshots.npz``)."""
    return int(len(snapshots.get("t", ())))


def snapshot_sources(snapshots, k, r_wake, r_body, x_shift=0.0, z_shift=0.0):
    """Wake and bound vortices of snapshot ``k`` as two :class:`Sources`.

    ``x_shift`` (m) moves them along x: ``-U t`` gives the still-air frame;
    ``z_shift`` (m) moves them up: ``-h`` gives heights above the pitch axis
    (a camera following the airfoil).  Bound vortices are absent from
    snapshots written before they were kept.
    """
    o = snapshots["offsets"]
    a, b = int(o[k]), int(o[k + 1])
    wake = Sources.of(snapshots["x"][a:b] + x_shift, snapshots["z"][a:b] + z_shift, snapshots["gamma"][a:b], r_wake)
    out = [wake]
    if "gamma_body" in snapshots and len(snapshots["gamma_body"]) > k:
        out.append(Sources.of(snapshots["x_body"][k] + x_shift, snapshots["z_body"][k] + z_shift,
                              snapshots["gamma_body"][k], r_body))
    return out


def airfoil_outline(section, chord, pivot, alpha, h, n=81, x_shift=0.0, flap=None):
    """Closed outline (x, z) in metres of the section at pitch ``alpha`` (rad), height ``h``.

    Body coordinates (xi aft of the pivot, zeta up) go to the solver's frame
    by :func:`unsteady.solver.to_inertial`; ``x_shift`` moves the result along x.
    ``flap = (hinge, beta)``: the outline aft of the hinge (chord fraction) turned
    by beta (rad, trailing edge down) about the hinge's point on the camber line.
    """
    xu, zu, xl, zl = section.outline(n)
    xf = np.concatenate([xu, xl[::-1]])
    zf = np.concatenate([zu, zl[::-1]])
    if flap is not None and flap[1] != 0.0:
        hinge, beta = float(flap[0]), float(flap[1])
        z_h = float(np.asarray(section.camber(np.array([hinge])), float)[0])
        aft = xf > hinge
        dx, dz = xf[aft] - hinge, zf[aft] - z_h
        xf, zf = xf.copy(), zf.copy()
        xf[aft] = hinge + dx * math.cos(beta) + dz * math.sin(beta)
        zf[aft] = z_h - dx * math.sin(beta) + dz * math.cos(beta)
    x, z = to_inertial((xf - pivot) * chord, zf * chord, float(alpha), float(h))
    return x + x_shift, z


def element_outlines(sc, alpha, h, n=81, x_shift=0.0, flap=None, more_flaps=None):
    """Closed outlines (x, z) (m) of every element of the run at pitch ``alpha``, height ``h``: the
    first (with its flap) and, with ``[[airfoil]]``, each further one at its position and incidence;
    ``more_flaps`` (one per further element, ``(hinge, beta)`` or None; :func:`element_flaps_at`)
    turns a further element's outline aft of its hinge."""
    out = [airfoil_outline(sc.section, sc.chord, sc.pivot, alpha, h, n=n, x_shift=x_shift, flap=flap)]
    from ..inputs.elements import flap_turn
    from ..inputs.sections import section_from_shape
    for i, el in enumerate(sc.data["airfoil"].get("_more", ())):
        section = section_from_shape(el["shape"], sc.base_dir)
        xu, zu, xl, zl = section.outline(n)
        xf = np.concatenate([xu, xl[::-1]])
        zf = np.concatenate([zu, zl[::-1]])
        fl = more_flaps[i] if more_flaps is not None and i < len(more_flaps) else None
        if fl is not None and fl[1] != 0.0:
            flap_turn(xf, zf, section, float(fl[0]), float(fl[1]))
        xf, zf = xf * el["chord"], zf * el["chord"]
        xi, zeta = to_inertial(xf, zf, math.radians(el["incidence"]), 0.0)   # turned about its leading edge
        x, z = to_inertial(xi + el["position"][0] - sc.pivot * sc.chord, zeta + el["position"][1],
                           float(alpha), float(h))
        out.append((x + x_shift, z))
    return out


def flap_at(sc, history, t):
    """``(hinge, beta)`` of the run's flap at time t (beta in rad, from the ``flap_deg`` history), or None."""
    if sc is None or "flap_hinge" not in sc.data.get("airfoil", {}) or "flap_deg" not in history:
        return None
    beta = float(np.interp(float(t), history["t"], history["flap_deg"]))
    return float(sc.data["airfoil"]["flap_hinge"]), math.radians(beta)


def element_flaps_at(sc, history, t):
    """One entry per further element of ``[[airfoil]]``: ``(hinge, beta)`` of its flap at time t (beta in
    rad, from its ``flap_deg_<i>`` history column), or None; None without further elements."""
    more = [] if sc is None else sc.data.get("airfoil", {}).get("_more") or []
    if not more:
        return None
    out = []
    for i, el in enumerate(more, start=2):
        col = history.get(f"flap_deg_{i}")
        if "flap_hinge" not in el or col is None or not len(col):
            out.append(None)
            continue
        out.append((float(el["flap_hinge"]), math.radians(float(np.interp(float(t), history["t"], col)))))
    return out


def ground_height(sc):
    """Height z (m, the solver's frame) of the run's ground (``[ground]``), or None."""
    if sc is None or not sc.data.get("ground"):
        return None
    return float(sc.kinematics.plunge.value(0.0)) - float(sc.data["ground"]["height"])


def chord_line(chord, pivot, alpha, h, n=2, x_shift=0.0):
    """Points (x, z) along the chord line, leading to trailing edge (m)."""
    xi = (np.linspace(0.0, 1.0, n) - pivot) * chord
    x, z = to_inertial(xi, np.zeros_like(xi), float(alpha), float(h))
    return x + x_shift, z
