"""Thick sections on surface panels over the ground (``[airfoil] thick`` with ``[ground]``).

Sources, each named beside its check:
- L. M. Milne-Thomson, Theoretical Hydrodynamics (5th ed., 1968), the method of images: a
  flat wall along which the air slips is exactly the body's mirror image (and its wake's)
  with the opposite circulation, so the section over the ground carries the loads of the
  same section beside its mirror image in free air.  The solver runs one panel body only,
  so the two-body free-air problem is solved here directly: both outlines paneled, the
  linear-strength vortex panels of J. Katz & A. Plotkin, Low-Speed Aerodynamics (2nd ed.,
  2001), ch. 11, through the free-air kernel only, a Kutta row for each.
- Kelvin's theorem (common practice): bound plus shed circulation keeps its initial value.
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.inputs.sections import section_from_shape
from unsteady.vortex.bodies import to_inertial
from unsteady.vortex.ground import Ground
from unsteady.vortex.panel_kernels import panel_velocity_matrices
from unsteady.vortex.panels import SurfaceGeometry, SurfacePanels
from unsteady.vortex.solver import VortexSolver

C, PIVOT = 0.2, 0.25


class Held:
    def __init__(self, alpha):
        self.alpha = alpha

    def state(self, t):
        return (self.alpha, 0.0, 0.0, 0.0)

    def after_step(self, *a):
        pass


class Rows:
    def __init__(self, model):
        self.rows, self.gamma, self.model, self.cp = [], [], model, []

    def on_step(self, st):
        self.rows.append(dict(st.loads))
        self.gamma.append(st.gamma_bound.copy())
        self.cp.append(self.model.loads.cp_last.copy())


def two_bodies_in_free_air(geometry, alpha, z_g, U):
    """The steady section and its mirror image about z = z_g in free air, solved together.

    Unknowns: the node sheet strengths of both outlines; rows: no flow through either at the
    panel mid-points, the Kutta condition at each trailing edge (Katz & Plotkin 2001, ch. 11).
    Every influence is the free-air panel kernel; no image enters.  Returns the real body's node
    strengths gamma (m/s) and its lift coefficient by pressure integration with the steady
    Bernoulli equation, Cp = 1 - (q/U)^2, q = -gamma at the mid-points (the enclosed air at rest).
    """
    g = geometry
    N = g.n
    xa, za = to_inertial(g.xi_n, g.zeta_n, alpha, 0.0)
    xb, zb = xa, 2.0 * z_g - za
    bodies = [(xa, za), (xb, zb)]
    mids = [(0.5 * (x[:-1] + x[1:]), 0.5 * (z[:-1] + z[1:])) for x, z in bodies]
    normals = []
    for x, z in bodies:
        dx, dz = np.diff(x), np.diff(z)
        ds = np.hypot(dx, dz)
        normals.append((-dz / ds, dx / ds))
    A = np.zeros((2 * N + 2, 2 * N + 2))
    rhs = np.zeros(2 * N + 2)
    for i, ((xm, zm), (nx, nz)) in enumerate(zip(mids, normals)):
        rows = slice(i * N, (i + 1) * N)
        for j, (x, z) in enumerate(bodies):
            mu_u, mu_w = np.empty((N, N + 1)), np.empty((N, N + 1))
            own = np.arange(N, dtype=np.int64) if i == j else -np.ones(N, dtype=np.int64)
            panel_velocity_matrices(xm, zm, x, z, own, mu_u, mu_w)
            A[rows, j * (N + 1):(j + 1) * (N + 1)] = mu_u * nx[:, None] + mu_w * nz[:, None]
        rhs[rows] = -U * nx
    for i in range(2):                                 # Kutta: gamma_0 + gamma_N = 0 on each body
        A[2 * N + i, i * (N + 1)] = A[2 * N + i, i * (N + 1) + N] = 1.0
    gamma = np.linalg.solve(A, rhs)[:N + 1]
    q = -0.5 * (gamma[:-1] + gamma[1:])
    cp = 1.0 - (q / U) ** 2
    nx, nz = normals[0]
    ds = np.hypot(np.diff(xa), np.diff(za))
    cl = float((-cp * ds * nz).sum()) / g.chord
    return gamma, cl


@pytest.mark.parametrize("h_over_c", [0.25, 0.5, 1.0])
def test_thick_over_the_ground_is_the_section_beside_its_mirror_image(h_over_c):
    # Method of images (Milne-Thomson 1968): steady NACA 2412 at 6 degrees, the quarter chord
    # h above the ground.  Node circulations equal to 1e-9 of their peak (the same linear
    # system, assembled two ways); lift within 0.1 % (the solver blends the surface sum into
    # the pressure next to the trailing edge, the direct solution does not).
    geometry = SurfaceGeometry.from_section(section_from_shape("naca2412"), 120, C, PIVOT)
    alpha, U = math.radians(6.0), 10.0
    model = SurfacePanels(geometry)
    rows = Rows(model)
    z_g = -h_over_c * C
    VortexSolver(model, Held(alpha), speed=U, density=1.2, dt=0.002, steps=0, ground=Ground(z_g)).run([rows])
    gamma_ref, cl_ref = two_bodies_in_free_air(geometry, alpha, z_g, U)
    gamma = rows.gamma[0] / geometry.w
    assert np.abs(gamma - gamma_ref).max() < 1e-9 * np.abs(gamma_ref).max()
    assert rows.rows[0]["cl"] == pytest.approx(cl_ref, rel=1e-3)
    assert math.isnan(rows.rows[0]["cl_impulse"])      # the ground carries a share of the impulse


def scenario(ground=None, wake="free", chords=4.0, **over):
    d = {"flow": {"speed": 10.0, "density": 1.225},
         "airfoil": {"shape": "naca2412", "chord": C, "thick": True, "elements": 80},
         "motion": {"pivot": PIVOT, "pitch": {"law": "ramp", "from": 2.0, "to": 6.0, "start": 0.01,
                                               "duration": 0.03, "smoothing": 0.006}},
         "run": {"chords": chords, "wake": wake}, "output": {"plots": False}}
    if ground is not None:
        d["ground"] = {"height": ground}
    for k, v in over.items():
        sec, key = k.split("__")
        d.setdefault(sec, {})[key] = v
    return load_scenario(d)


@pytest.mark.parametrize("wake", ["frozen", "free"])
def test_a_distant_thick_ground_is_free_air(wake):
    # Method of images: the images' influence falls off as 1 / distance; 1,000 chords below,
    # the loads of a pitching thick section are those of free air within 0.1 % of the peak
    free = simulate(scenario(wake=wake)).history
    far = simulate(scenario(ground=1000 * C, wake=wake)).history
    peak = np.abs(free["cl"]).max()
    for key in ("cl", "cm", "cd"):
        assert np.abs(free[key] - far[key]).max() < 1e-3 * peak, key
    assert np.isnan(far["cl_impulse"]).all()


def test_kelvin_over_the_ground_with_thick_panels():
    # Kelvin's theorem (common practice): started impulsively, bound plus shed circulation stays
    # zero to round-off while the section pitches half a chord above the ground
    h = simulate(scenario(ground=0.5 * C, run__start="impulsive", chords=3.0)).history
    total = h["gamma_bound_m2_s"] + h["gamma_wake_m2_s"]
    assert np.abs(total).max() < 1e-9 * np.abs(h["gamma_bound_m2_s"]).max()
    assert np.isfinite(h["cl"]).all() and (h["ground_clearance_m"] > 0).all()
