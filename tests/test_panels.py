"""Surface panels (unsteady.vortex.panels, panel_kernels): kernels against plain-NumPy twins, the run's outputs."""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.inputs.sections import section_from_shape
from unsteady.vortex.panel_kernels import chain_potential, panel_velocity_matrices
from unsteady.vortex.panels import SurfaceGeometry, SurfacePanels, surface_nodes


def twin_panel_velocity(xt, zt, xn, zn, n_gauss=400):
    """Oracle: the point-vortex kernel integrated along each panel by Gauss-Legendre quadrature."""
    g, wg = np.polynomial.legendre.leggauss(n_gauss)
    s, ws = 0.5 * (g + 1.0), 0.5 * wg
    out_u = np.zeros((len(xt), len(xn)))
    out_w = np.zeros((len(xt), len(xn)))
    for j in range(len(xn) - 1):
        l = math.hypot(xn[j + 1] - xn[j], zn[j + 1] - zn[j])
        xs = xn[j] + s * (xn[j + 1] - xn[j])
        zs = zn[j] + s * (zn[j + 1] - zn[j])
        dx = xt[:, None] - xs[None, :]
        dz = zt[:, None] - zs[None, :]
        r2 = dx * dx + dz * dz
        for k, shape in ((j, 1.0 - s), (j + 1, s)):
            out_u[:, k] += (-dz / r2 * shape * ws).sum(axis=1) * l / (2 * math.pi)
            out_w[:, k] += (dx / r2 * shape * ws).sum(axis=1) * l / (2 * math.pi)
    return out_u, out_w


def test_panel_kernel_matches_quadrature_off_the_panels():
    rng = np.random.default_rng(3)
    xn = np.array([0.0, 0.3, 0.7, 1.0, 1.2])
    zn = np.array([0.0, 0.1, 0.05, -0.1, 0.0])
    xt = rng.uniform(-0.5, 1.5, 20)
    zt = rng.uniform(0.3, 0.8, 20) * rng.choice([-1, 1], 20)
    mu_u = np.empty((20, 5))
    mu_w = np.empty((20, 5))
    panel_velocity_matrices(xt, zt, xn, zn, -np.ones(20, dtype=np.int64), mu_u, mu_w)
    ru, rw = twin_panel_velocity(xt, zt, xn, zn)
    assert np.allclose(mu_u, ru, atol=1e-9)
    assert np.allclose(mu_w, rw, atol=1e-9)


def test_panel_kernel_principal_value_on_its_own_panel():
    # on a straight sheet of constant strength the velocity just above is -gamma/2 along it and the
    # principal value is 0 (the tangential jump across a vortex sheet; common practice)
    xn, zn = np.array([0.0, 1.0]), np.array([0.0, 0.0])
    mu_u, mu_w = np.empty((1, 2)), np.empty((1, 2))
    panel_velocity_matrices(np.array([0.5]), np.array([0.0]), xn, zn, np.array([0], np.int64), mu_u, mu_w)
    assert abs(mu_u.sum()) < 1e-15 and abs(mu_w.sum()) < 1e-15
    panel_velocity_matrices(np.array([0.5]), np.array([1e-9]), xn, zn, -np.ones(1, np.int64), mu_u, mu_w)
    assert mu_u.sum() == pytest.approx(-0.5, abs=1e-6)


def test_chain_potential_gradient_is_the_vortices_velocity():
    # oracle: the velocity of the point vortices the chain stands for (vortex mu_{p-1} - mu_p at point p)
    rng = np.random.default_rng(5)
    xc, zc = rng.uniform(0, 2, 6), rng.uniform(-1, 1, 6)
    mu = rng.normal(size=5)
    tail = 0.7
    gam = np.concatenate(([0.0], mu)) - np.concatenate((mu, [tail]))
    P = np.array([[-0.7, 0.4], [2.6, -1.3], [0.9, 1.8]])
    h = 1e-6
    for x, z in P:
        def phi(a, b):
            out = np.empty(1)
            chain_potential(np.array([a]), np.array([b]), -np.ones(1, np.int64), xc, zc, mu, tail, out)
            return out[0]
        u = (phi(x + h, z) - phi(x - h, z)) / (2 * h)
        w = (phi(x, z + h) - phi(x, z - h)) / (2 * h)
        dx, dz = x - xc, z - zc
        r2 = dx * dx + dz * dz
        assert u == pytest.approx(float((-gam * dz / r2).sum() / (2 * math.pi)), abs=1e-6)
        assert w == pytest.approx(float((gam * dx / r2).sum() / (2 * math.pi)), abs=1e-6)


def test_ray_vortex_potential_is_the_vortices_potential_with_cuts_away_from_a_centre():
    # oracle: point vortices and their ground images (Milne-Thomson 1968, a vortex's complex potential and
    # the method of images): the gradient is their velocity; plain NumPy twin of the kernel's sum; the
    # potential is continuous round a circle about the centre the cuts point away from (no cut crosses it)
    from unsteady.vortex.panel_kernels import ray_vortex_potential
    rng = np.random.default_rng(9)
    xs, zs, gs = rng.uniform(-3, 3, 7), rng.uniform(0.5, 3, 7), rng.normal(size=7)
    xs[:3] = [2.5, -2.5, 0.0]                      # outside the unit circle round the centre
    cx, cz, z_g = 0.1, 1.9, -0.4
    keep = np.hypot(xs - cx, zs - cz) > 1.2
    xs, zs, gs = xs[keep], zs[keep], gs[keep]

    def phi(x, z, images):
        out = np.zeros(np.size(x))
        ray_vortex_potential(np.atleast_1d(np.asarray(x, float)), np.atleast_1d(np.asarray(z, float)),
                             xs, zs, gs, cx, cz, z_g, images, out)
        return out

    h = 1e-6
    for images in (False, True):
        for x, z in ((0.3, 1.5), (-0.5, 2.4)):
            u = (phi(x + h, z, images) - phi(x - h, z, images))[0] / (2 * h)
            w = (phi(x, z + h, images) - phi(x, z - h, images))[0] / (2 * h)
            srcs = [(zs, gs)] + ([(2 * z_g - zs, -gs)] if images else [])
            uu = sum(float((-g * (z - q) / ((x - xs) ** 2 + (z - q) ** 2)).sum()) for q, g in srcs) / (2 * math.pi)
            ww = sum(float((g * (x - xs) / ((x - xs) ** 2 + (z - q) ** 2)).sum()) for q, g in srcs) / (2 * math.pi)
            assert u == pytest.approx(uu, abs=1e-6) and w == pytest.approx(ww, abs=1e-6)
        th = np.linspace(0, 2 * math.pi, 2001)
        ring = phi(cx + np.cos(th), cz + np.sin(th), images)
        jump = np.abs(np.diff(ring)).max()
        assert jump < 0.01 * np.abs(gs).sum(), jump        # continuous: small steps only
        assert abs(ring[-1] - ring[0]) < 1e-9 * np.abs(gs).sum()   # and single-valued round it
        # plain NumPy twin
        ref = np.zeros(th.size)
        for q, g, k in [(zs, gs, 1.0)] + ([(2 * z_g - zs, gs, -1.0)] if images else []):
            for xq, zq, gq in zip(xs, q, g):
                ex, ez = xq - cx, zq - cz
                L = math.hypot(ex, ez)
                dx, dz = ex / L, ez / L
                ax, az = cx + np.cos(th) - xq, cz + np.sin(th) - zq
                ref += -k * gq * np.arctan2(az * dx - ax * dz, -(ax * dx + az * dz)) / (2 * math.pi)
        assert np.allclose(ring, ref, rtol=0, atol=1e-12)


def test_outline_closed_clockwise_with_cosine_stations():
    x, z = surface_nodes(section_from_shape("naca2412"), 80)
    assert x[0] == x[-1] == 1.0 and z[0] == z[-1]
    assert np.argmin(x) == 40 and x[40] == 0.0
    area = 0.5 * np.sum(x[1:] * z[:-1] - x[:-1] * z[1:])
    assert area > 0           # clockwise: outside to the left of each panel
    # the area of a NACA 4-digit section is about 0.685 t c^2 (common practice; from memory)
    assert area == pytest.approx(0.685 * 0.12, rel=0.02)


def scenario(**over):
    base = {"flow": {"speed": 10.0, "density": 1.2},
            "airfoil": {"shape": "naca0012", "chord": 0.2, "thick": True, "elements": 60},
            "motion": {"pitch": {"law": "sine", "amplitude": 2.0, "mean": 2.0, "reduced_frequency": 0.3}},
            "run": {"chords": 2.0}, "output": {"plots": False}}
    for k, v in over.items():
        sec, key = k.split("__")
        base.setdefault(sec, {})[key] = v
    return load_scenario(base)


def test_thick_run_snapshots_and_summary(tmp_path):
    sc = scenario()
    assert sc.dt == pytest.approx(sc.chord / (sc.speed * 30))    # U dt = c / (panels per surface)
    res = simulate(sc)
    s = res.snapshots
    assert s["cp"].shape == (sc.steps + 1, 60)
    assert s["x_surface"].shape == (60,) and s["z_surface"].shape == (60,)
    assert s["x_surface"].min() < 0.01 and s["x_surface"].max() > 0.99
    assert np.all(np.isfinite(s["cp"]))
    assert res.summary["section_model"].startswith("surface panels")
    # steady start: Cp is 1 at the stagnation point, within the panel resolution
    assert 0.9 < float(np.max(s["cp"][0])) <= 1.0 + 1e-9


def test_thick_changes_the_lift_and_camber_line_unchanged():
    thin = simulate(scenario(airfoil__thick=False, airfoil__elements=40))
    again = simulate(scenario(airfoil__thick=False, airfoil__elements=40))
    assert np.array_equal(thin.history["cl"], again.history["cl"])
    thick = simulate(scenario())
    assert thick.history["cl"][0] > 1.03 * thin.history["cl"][0]     # thickness adds lift slope


def _camber_line(**over):
    """The same scenario with ``thick`` left out (the camber line by default)."""
    base = {"flow": {"speed": 10.0, "density": 1.2},
            "airfoil": {"shape": "naca0012", "chord": 0.2, "elements": 40},
            "motion": {"pitch": {"law": "constant", "value": 2.0}},
            "run": {"chords": 2.0}, "output": {"plots": False}}
    base["airfoil"].update(over)
    return load_scenario(base)


def test_thick_section_on_camber_line_is_warned():
    # thickness left out silently is what the warning is for; a section above 4 %
    # (NACA 0012) on the camber line by default is warned, the thin one is not
    sc = _camber_line()
    assert any("airfoil.shape" in w and "thick = true" in w for w in sc.warnings)
    assert not any("thick = true" in w for w in _camber_line(shape="naca0003").warnings)
    assert not any("thick = true" in w for w in scenario().warnings)
    # the camber line chosen in so many words (thick = false) is a decision, not an oversight
    chosen = _camber_line(thick=False)
    assert not any("thick = true" in w for w in chosen.warnings)
    assert chosen.data["airfoil"]["thick"] is False


def test_film_draws_the_surface_pressure_line_and_refuses_it_without_panels(tmp_path, capsys):
    from unsteady.apps.cli import main
    from unsteady.outputs.films import PRESSURE_OFFSET, Film, FilmOptions, FilmRenderer
    thick = scenario(output__snapshot_every=0.01)
    res = simulate(thick)
    d = tmp_path / "thick"
    res.save(d, plots=False)
    from unsteady.outputs.films import load_run
    film = Film(load_run(d), FilmOptions(width=320, height=180, frames=3, surface_pressure=True))
    r = FilmRenderer(film)
    t, k, alpha, h = film.frame_state(2)
    x, z = r._pressure_line(t, alpha, h, 0.0)
    # at the suction peak of the upper surface the line stands -Cp * offset chords off the outline
    row = int(np.argmin(np.abs(res.history["t"] - t)))
    cp = res.snapshots["cp"][row]
    i = int(np.argmin(cp))
    xi = (res.snapshots["x_surface"][i] - thick.pivot) * thick.chord
    zeta = res.snapshots["z_surface"][i] * thick.chord
    x0 = xi * math.cos(alpha) + zeta * math.sin(alpha)
    z0 = h - xi * math.sin(alpha) + zeta * math.cos(alpha)
    assert math.hypot(x[i] - x0, z[i] - z0) == pytest.approx(-cp[i] * PRESSURE_OFFSET * thick.chord, rel=1e-4)
    assert r.frame(2).shape == (180, 320, 3)
    thin = tmp_path / "thin"
    simulate(scenario(airfoil__thick=False, airfoil__elements=40)).save(thin, plots=False)
    out = tmp_path / "f.gif"
    assert main(["animate", str(thin), "--out", str(out), "--quiet", "--surface-pressure"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--surface-pressure" in err[0] and "thick = true" in err[0]
    assert not out.exists()


def test_open_trailing_edge_of_a_coordinates_file_is_closed(tmp_path):
    # NACA 0012 with the published (open) trailing edge, a4 = -0.1015 (NACA Rep. 460)
    from unsteady.inputs.sections import naca4_half_thickness
    x = 0.5 * (1 - np.cos(np.linspace(0, math.pi, 41)))
    yt = naca4_half_thickness(x, 0.12, closed=False)
    pts = [(xi, yi) for xi, yi in zip(x[::-1], yt[::-1])] + [(xi, -yi) for xi, yi in zip(x[1:], yt[1:])]
    f = tmp_path / "open.dat"
    f.write_text("".join(f"{a:.6f} {b:.6f}\n" for a, b in pts))
    assert yt[-1] > 1e-3                       # the file's trailing edge is open
    xn, zn = surface_nodes(section_from_shape(str(f), tmp_path), 80)
    assert xn[0] == xn[-1] and zn[0] == zn[-1]
    model = SurfacePanels(SurfaceGeometry.from_nodes(xn, zn, 1.0, 0.25))
    assert np.isfinite(np.linalg.cond(model.influence_matrix()))


def test_surface_pressure_picture_at_chosen_instants(tmp_path, capsys):
    from unsteady.apps.cli import main
    d = tmp_path / "thick"
    res = simulate(scenario())
    res.save(d, plots=True)
    assert (d / "surface-pressure.png").is_file()
    before = (d / "surface-pressure.png").read_bytes()
    assert main(["pictures", str(d), "--quiet", "--surface-pressure-at", "0.01,0.03"]) == 0
    assert (d / "surface-pressure.png").read_bytes() != before        # other instants drawn
    for bad, words in (("9", "outside the run"), ("a,b", "not a list of times"),
                       (",".join(["0.01"] * 7), "allowed: 1 to 6")):
        assert main(["pictures", str(d), "--quiet", "--surface-pressure-at", bad]) == 2
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and words in err[0], err
    thin = tmp_path / "thin"
    simulate(scenario(airfoil__thick=False, airfoil__elements=40)).save(thin, plots=False)
    assert main(["pictures", str(thin), "--quiet", "--surface-pressure-at", "0.01"]) == 2
    assert "thick = true" in capsys.readouterr().err
    assert not (thin / "surface-pressure.png").exists()


def test_panel_image_kernel_is_the_mirrored_sheet_with_opposite_strength():
    # method of images (Milne-Thomson 1968): the image of the sheet in z = z_g is the sheet mirrored
    # about it, strength reversed; oracle: quadrature along the mirrored panels
    from unsteady.vortex.panel_kernels import panel_image_velocity_matrices
    rng = np.random.default_rng(7)
    xn = np.array([0.0, 0.3, 0.7, 1.0, 1.2])
    zn = np.array([0.0, 0.1, 0.05, -0.1, 0.0])
    z_g = -0.6
    xt = rng.uniform(-0.5, 1.5, 20)
    zt = rng.uniform(-0.3, 0.8, 20)
    mu_u, mu_w = np.empty((20, 5)), np.empty((20, 5))
    panel_image_velocity_matrices(xt, zt, xn, zn, z_g, mu_u, mu_w)
    ru, rw = twin_panel_velocity(xt, zt, xn, 2 * z_g - zn)
    assert np.allclose(mu_u, -ru, atol=1e-9)
    assert np.allclose(mu_w, -rw, atol=1e-9)


def test_chain_image_potential_is_the_mirrored_chain_reversed():
    # method of images: the image chain (points mirrored, strengths and tail reversed), added in place
    from unsteady.vortex.panel_kernels import chain_image_potential
    rng = np.random.default_rng(8)
    xc, zc = rng.uniform(0, 2, 6), rng.uniform(-1, 1, 6)
    mu, tail, z_g = rng.normal(size=5), 0.4, -2.0
    xt, zt = rng.uniform(-1, 3, 9), rng.uniform(-1.5, 2, 9)
    ref = np.empty(9)
    chain_potential(xt, zt, -np.ones(9, np.int64), xc, 2 * z_g - zc, -mu, -tail, ref)
    out = np.full(9, 0.25)
    chain_image_potential(xt, zt, xc, zc, mu, tail, z_g, out)
    assert np.allclose(out - 0.25, ref, atol=1e-13)


def test_chain_segment_angles_are_the_unit_chains():
    # oracle: chain_potential with one unit segment at a time (own segment: its left side)
    from unsteady.vortex.panel_kernels import chain_segment_angles
    g = SurfaceGeometry.from_section(section_from_shape("naca2412"), 40, 0.2, 0.25)
    out = np.empty((40, 40))
    chain_segment_angles(g.xi_c, g.zeta_c, g.xi_n, g.zeta_n, out)
    unit, col = np.zeros(40), np.empty(40)
    for j in range(40):
        unit[j] = 1.0
        chain_potential(g.xi_c, g.zeta_c, np.arange(40, dtype=np.int64), g.xi_n, g.zeta_n, unit, 0.0, col)
        unit[j] = 0.0
        assert np.array_equal(out[:, j], col)
