"""Flow fields on grids against analytic flows: point vortex, Vatistas core, uniform stream."""

import math

import numpy as np
import pytest

from unsteady.outputs.fields import (Sources, airfoil_outline, chord_line, make_grid, speed, stream_function,
                             velocity_field, vorticity_field)
from unsteady.inputs.sections import section_from_shape


def point_vortex(x, z, x0, z0, G):
    """Singular point vortex, counter-clockwise positive: u_theta = G / (2 pi r)
    (P. G. Saffman, Vortex Dynamics, 1992, ch. 1)."""
    dx, dz = x - x0, z - z0
    r2 = dx * dx + dz * dz
    return -G * dz / (2 * np.pi * r2), G * dx / (2 * np.pi * r2)


def ring(x0, z0, R, n=64):
    th = np.linspace(0, 2 * np.pi, n, endpoint=False)
    return x0 + R * np.cos(th), z0 + R * np.sin(th)


def test_single_vortex_matches_analytic_field_away_from_core():
    # analytic point vortex (Saffman 1992); core r_c = 0.001 m, points at r >= 0.5 m where the
    # Vatistas core differs from the point vortex by (r_c/r)^4 / 2 < 1e-11 (Vatistas et al. 1991)
    G, x0, z0 = 1.7, 0.3, -0.2
    g = make_grid((-2, 2), (-1.5, 1.5), 41, 31)
    X, Z = np.meshgrid(g.x, g.z)
    far = np.hypot(X - x0, Z - z0) > 0.5
    u, w = velocity_field(X, Z, [Sources.of([x0], [z0], [G], 0.001)])
    ua, wa = point_vortex(X, Z, x0, z0, G)
    assert u.shape == X.shape
    assert np.allclose(u[far], ua[far], rtol=1e-10, atol=1e-14)
    assert np.allclose(w[far], wa[far], rtol=1e-10, atol=1e-14)
    # singular kernel (r_c = 0): equal to round-off
    u0, w0 = velocity_field(X[far], Z[far], [Sources.of([x0], [z0], [G], 0.0)])
    assert np.max(np.abs(u0 - ua[far])) < 1e-13 and np.max(np.abs(w0 - wa[far])) < 1e-13


def test_vatistas_core_inside():
    # u_theta = G r / (2 pi sqrt(r_c^4 + r^4)) (Vatistas, Kozel & Mih 1991, n = 2)
    G, r_c = 2.0, 0.1
    r = np.array([0.02, 0.05, 0.1, 0.2])
    u, w = velocity_field(r, 0.0 * r, [Sources.of([0.0], [0.0], [G], r_c)])
    assert np.allclose(w, G * r / (2 * np.pi * np.sqrt(r_c ** 4 + r ** 4)), rtol=1e-13)
    assert np.allclose(u, 0.0, atol=1e-15)


def test_uniform_stream_exact():
    # a uniform stream with no vortices (common practice): u = U, w = W, psi = U z - W x
    g = make_grid((-1, 1), (-1, 1), 7, 5)
    X, Z = np.meshgrid(g.x, g.z)
    u, w = velocity_field(X, Z, [], freestream=(14.0, -0.5))
    assert np.all(u == 14.0) and np.all(w == -0.5)
    psi = stream_function(X, Z, [], freestream=(14.0, -0.5))
    assert np.allclose(psi, 14.0 * Z + 0.5 * X, rtol=0, atol=1e-14)
    assert np.allclose(speed(u, w), math.hypot(14.0, 0.5))


def test_vortex_plus_stream_superpose_and_gust_is_added():
    # superposition of potential flows (common practice)
    G = -0.8
    x, z = np.array([1.0, -0.4]), np.array([0.5, 0.9])
    gust = (lambda xx, zz, t: (np.zeros_like(xx), 2.0 * np.ones_like(xx) * t))
    u, w = velocity_field(x, z, [Sources.of([0.0], [0.0], [G])], freestream=(10.0, 0.0), gust=gust, t=0.25)
    ua, wa = point_vortex(x, z, 0.0, 0.0, G)
    assert np.allclose(u, 10.0 + ua, rtol=1e-14) and np.allclose(w, wa + 0.5, rtol=1e-14)


def test_stream_function_of_point_vortex_and_its_derivatives():
    # psi = -G ln(r) / (2 pi) (Saffman 1992); u = d psi/dz, w = -d psi/dx
    G = 1.3
    x, z = np.array([0.7, -1.1, 2.0]), np.array([0.2, 0.4, -0.9])
    psi = stream_function(x, z, [Sources.of([0.0], [0.0], [G], 0.0)])
    assert np.allclose(psi, -G * np.log(np.hypot(x, z)) / (2 * np.pi), rtol=1e-13)
    rng = np.random.default_rng(3)
    src = [Sources.of(rng.normal(size=30), rng.normal(size=30) * 0.2, rng.normal(size=30), 0.05),
           Sources.of([0.0, 0.1], [0.0, 0.0], [0.5, -0.2], 0.0)]
    xp, zp = rng.normal(size=20) + 3.0, rng.normal(size=20) + 1.0
    e = 1e-5
    dpdz = (stream_function(xp, zp + e, src, freestream=(5.0, 0.0)) -
            stream_function(xp, zp - e, src, freestream=(5.0, 0.0))) / (2 * e)
    dpdx = (stream_function(xp + e, zp, src, freestream=(5.0, 0.0)) -
            stream_function(xp - e, zp, src, freestream=(5.0, 0.0))) / (2 * e)
    u, w = velocity_field(xp, zp, src, freestream=(5.0, 0.0))
    assert np.allclose(dpdz, u, rtol=1e-6, atol=1e-8)
    assert np.allclose(-dpdx, w, rtol=1e-6, atol=1e-8)


def test_circulation_round_a_loop_equals_enclosed_vortices():
    # Stokes: the line integral of the velocity round a closed loop equals the enclosed
    # circulation (common practice); trapezoid rule on a circle is spectrally accurate; the
    # cores (0.002 m, at >= 0.6 m from the loop) change it by (r_c/r)^4 / 2 < 1e-10
    src = [Sources.of([0.1, -0.2, 3.0], [0.0, 0.15, 0.0], [1.0, -0.3, 5.0], 0.002)]
    R, n = 0.8, 256
    x, z = ring(0.0, 0.0, R, n)
    u, w = velocity_field(x, z, src, freestream=(7.0, 1.0))
    th = np.linspace(0, 2 * np.pi, n, endpoint=False)
    circ = np.sum(-u * np.sin(th) + w * np.cos(th)) * R * 2 * np.pi / n
    assert circ == pytest.approx(0.7, rel=1e-9)


def test_smoothed_vorticity_is_a_gaussian_blob_and_conserves_circulation():
    # Gaussian blob omega = G / (2 pi s^2) exp(-r^2 / (2 s^2)) (vortex-blob smoothing, common practice)
    g = make_grid((-1, 1), (-1, 1), 201, 201)  # spacing 0.01
    G, s = 0.6, 0.05
    om = vorticity_field(g, [Sources.of([0.0], [0.0], [G])], sigma=s)
    X, Z = np.meshgrid(g.x, g.z)
    blob = G / (2 * np.pi * s * s) * np.exp(-(X ** 2 + Z ** 2) / (2 * s * s))
    assert np.max(np.abs(om - blob)) < 2e-3 * blob.max()
    # off-node vortices: circulation kept to round-off, centroid kept (area weighting)
    rng = np.random.default_rng(5)
    xs, zs, gs = rng.uniform(-0.5, 0.5, 40), rng.uniform(-0.5, 0.5, 40), rng.normal(size=40)
    gs[gs.argmax()] += 3.0
    om = vorticity_field(g, [Sources.of(xs, zs, gs)], sigma=0.03)
    assert om.sum() * g.dx * g.dz == pytest.approx(gs.sum(), rel=1e-9)
    assert (om * X).sum() * g.dx * g.dz == pytest.approx((gs * xs).sum(), rel=1e-6, abs=1e-9)
    # sense of rotation: a clockwise vortex gives negative vorticity
    assert vorticity_field(g, [Sources.of([0.0], [0.0], [-1.0])]).min() < 0


def test_outline_and_chord_line_follow_pitch_and_height():
    # body point (xi, zeta) -> (xi cos a + zeta sin a, h - xi sin a + zeta cos a) (solver frame)
    c, piv, a, h = 0.25, 0.25, math.radians(10.0), 0.03
    x, z = chord_line(c, piv, a, h)
    assert x[0] == pytest.approx(-piv * c * math.cos(a)) and z[0] == pytest.approx(h + piv * c * math.sin(a))
    assert x[1] == pytest.approx((1 - piv) * c * math.cos(a)) and z[1] == pytest.approx(h - (1 - piv) * c * math.sin(a))
    xo, zo = airfoil_outline(section_from_shape("naca0012", None), c, piv, a, h, x_shift=-1.0)
    # NACA 0012 is 12 % thick (Jacobs, Ward & Pinkerton, NACA Report 460, 1933): width across the chord
    ca, sa = math.cos(a), math.sin(a)
    zeta = (xo + 1.0) * sa + (zo - h) * ca
    assert zeta.max() - zeta.min() == pytest.approx(0.12 * c, rel=0.02)
