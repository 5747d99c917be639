"""Behaviour of the flap and the ground: kernels against a NumPy twin, refactorization, the contact stop,
columns and summary, pictures and films, the command line."""

import json
import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.apps.cli import main
from unsteady.inputs.motion import build_law
from unsteady.vortex.bodies import Body
from unsteady.vortex.flap import HingedFlapCamber, hinge_nodes
from unsteady.vortex.kernels import induced_velocity, normal_influence_ground
from unsteady.vortex.solver import VortexSolver

C = 0.2


def twin_ground(xt, zt, xs, zs, gamma, r_c, z_g, real=True):
    """Plain-NumPy sum of regularised vortices and their ground images (the oracle)."""
    out_u, out_w = np.zeros_like(xt), np.zeros_like(xt)
    for zz, gg, on in ((zs, gamma, real), (2 * z_g - zs, -gamma, True)):
        if not on:
            continue
        dx = xt[:, None] - xs[None, :]
        dz = zt[:, None] - zz[None, :]
        r2 = dx * dx + dz * dz
        f = gg[None, :] / (2 * np.pi * np.sqrt(r2 * r2 + r_c ** 4))
        out_u += (-f * dz).sum(axis=1)
        out_w += (f * dx).sum(axis=1)
    return out_u, out_w


@pytest.mark.parametrize("n_src", [50, 3000])          # one-thread and threaded paths
@pytest.mark.parametrize("images_only", [False, True])
def test_ground_kernel_matches_numpy_twin(n_src, images_only):
    rng = np.random.default_rng(3)
    xs, zs, g = rng.normal(size=(3, n_src))
    xt, zt = rng.normal(size=(2, 97))
    z_g = -4.0
    u, w = np.empty(97), np.empty(97)
    induced_velocity(xt, zt, xs, zs, g, 0.01, u, w, ground=z_g, images_only=images_only)
    ut, wt = twin_ground(xt, zt, xs, zs, g, 0.01, z_g, real=not images_only)
    assert np.allclose(u, ut, rtol=1e-11, atol=1e-12 * np.abs(ut).max())
    assert np.allclose(w, wt, rtol=1e-11, atol=1e-12 * np.abs(wt).max())


def test_ground_influence_matrix_is_velocity_dot_normal_with_images():
    rng = np.random.default_rng(4)
    xt, zt = rng.normal(size=(2, 12))
    th = rng.uniform(0, 2 * np.pi, 12)
    nx, nz = np.cos(th), np.sin(th)
    xs, zs = rng.normal(size=(2, 9)) + 2.0
    a = np.empty((12, 9))
    normal_influence_ground(xt, zt, nx, nz, xs, zs, 0.0, -3.0, a)
    for j in range(9):
        e = np.zeros(9)
        e[j] = 1.0
        u, w = twin_ground(xt, zt, xs, zs, e, 0.0, -3.0)
        assert np.allclose(a[:, j], u * nx + w * nz, rtol=1e-12, atol=1e-14)


def test_the_ground_velocity_is_zero_normal_to_the_ground():
    # the image makes the ground a streamline (Milne-Thomson 1968): w = 0 on z = z_g
    rng = np.random.default_rng(5)
    xs, zs, g = rng.normal(size=(3, 40))
    xt = np.linspace(-3, 3, 31)
    u, w = np.empty(31), np.empty(31)
    induced_velocity(xt, np.full(31, -5.0), xs, zs, g, 0.0, u, w, ground=-5.0)
    assert np.abs(w).max() < 1e-14 * max(1.0, np.abs(u).max())


# ---------------------------------------------------------------- the flap body

class Held:
    def state(self, t):
        return (0.0, 0.0, 0.0, 0.0)

    def after_step(self, *a):
        pass


def test_the_hinge_is_a_node_and_the_flap_turns_about_it():
    x, k = hinge_nodes(40, 0.72)
    assert x[k] == 0.72 and x[0] == 0.0 and x[-1] == 1.0 and np.all(np.diff(x) > 0)
    body = Body.from_nodes(x, np.zeros_like(x), C, 0.25)
    law = build_law({"law": "constant", "value": 10.0}, scale=math.pi / 180)
    m = HingedFlapCamber(body, k, law)
    g = m.geometry
    # trailing edge down by c_f sin(beta); the element lengths kept; ahead of the hinge nothing moves
    c_f = 0.28 * C
    assert g.zeta_te == pytest.approx(-c_f * math.sin(math.radians(10.0)), rel=1e-12)
    assert g.xi_te == pytest.approx((0.72 - 0.25) * C + c_f * math.cos(math.radians(10.0)), rel=1e-12)
    assert np.allclose(np.hypot(np.diff(np.append(g.xi_0, g.xi_te)), np.diff(np.append(g.zeta_0, g.zeta_te))),
                       body.ds, rtol=1e-12)
    assert np.array_equal(g.xi_v[:k], body.xi_v[:k]) and np.array_equal(g.zeta_c[:k], body.zeta_c[:k])


def test_the_matrix_is_refactored_only_while_the_flap_moves():
    n = 30
    x, k = hinge_nodes(n, 0.7)
    body = Body.from_nodes(x, np.zeros_like(x), C, 0.25)
    dt = C / (10.0 * n)
    law = build_law({"law": "ramp", "from": 0.0, "to": 6.0, "start": 20 * dt, "duration": 10 * dt},
                    scale=math.pi / 180)

    class Count:
        def on_start(self, solver):
            self.solver = solver
            self.versions = []

        def on_step(self, st):
            self.versions.append(self.solver.system.version)
    obs = Count()
    VortexSolver([HingedFlapCamber(body, k, law)], Held(), speed=10.0, density=1.2, dt=dt,
                 steps=60, wake="frozen").run([obs])
    refactored = np.flatnonzero(np.diff(obs.versions)) + 1
    beta = law.value(np.arange(61) * dt)
    moved = np.flatnonzero(np.diff(beta)) + 1
    assert refactored.tolist() == moved.tolist()
    assert 9 <= len(moved) <= 11                       # the ramp's steps, and only those


def test_a_smoothed_flap_law_refactors_only_around_its_change():
    # a rounded ramp creeps towards its end values; changes under BETA_TOL keep the matrix
    n = 30
    x, k = hinge_nodes(n, 0.7)
    body = Body.from_nodes(x, np.zeros_like(x), C, 0.25)
    dt = C / (10.0 * n)
    law = build_law({"law": "ramp", "from": 0.0, "to": 6.0, "start": 100 * dt, "duration": 10 * dt,
                     "smoothing": 2 * dt}, scale=math.pi / 180)
    model = HingedFlapCamber(body, k, law)
    solver = VortexSolver([model], Held(), speed=10.0, density=1.2, dt=dt, steps=400, wake="frozen")
    solver.run([])
    assert solver.system.version < 60                  # not one per step of the 400


# ---------------------------------------------------------------- scenarios through the runner

def flap_ground(tmp_path=None, **over):
    d = {"flow": {"speed": 10.0, "density": 1.2},
         "airfoil": {"shape": "naca2412", "chord": C, "elements": 24, "flap_hinge": 0.75},
         "motion": {"pivot": 0.25, "pitch": {"law": "constant", "value": 3.0},
                    "flap": {"law": "ramp", "from": 0.0, "to": 10.0, "start": 0.01, "duration": 0.02,
                             "smoothing": 0.005}},
         "run": {"chords": 6}, "ground": {"height": 0.1}, "output": {"plots": False}}
    for k, v in over.items():
        sec, key = k.split("__")
        if v is None:
            d[sec].pop(key, None)
        else:
            d.setdefault(sec, {})[key] = v
    return d


def test_columns_and_summary_of_a_flap_over_the_ground():
    res = simulate(flap_ground())
    h, s = res.history, res.summary
    for col in ("flap_deg", "ch", "ground_clearance_m"):
        assert col in h and np.isfinite(h[col]).all()
    assert abs(h["flap_deg"][0]) < 0.03 and h["flap_deg"][-1] == pytest.approx(10.0)   # a smoothed ramp
    # a trailing-edge-down flap is pushed up by the air: the hinge moment falls (TE up, negative)
    assert h["ch"][-1] < h["ch"][0] < 0.0
    assert s["ch_min"] == pytest.approx(np.min(h["ch"])) and "t_ch_min" in s and "t_ch_max" in s
    # clearance at t = 0: the ground 0.1 m below the pitch axis, the camber line's lowest point its
    # trailing edge, turned by the flap's beta about the hinge (x = 0.75), then by the pitch
    sc = res.scenario
    zc = (lambda x: float(sc.section.camber(np.array([x]))[0]) * C)
    beta, alpha = math.radians(h["flap_deg"][0]), math.radians(3.0)
    dx, dz = 0.25 * C, zc(1.0) - zc(0.75)
    xi_te = 0.5 * C + dx * math.cos(beta) + dz * math.sin(beta)
    zeta_te = zc(0.75) - dx * math.sin(beta) + dz * math.cos(beta)
    te = -xi_te * math.sin(alpha) + zeta_te * math.cos(alpha)
    assert h["ground_clearance_m"][0] == pytest.approx(0.1 + te, rel=1e-9)
    assert s["ground_clearance_min_m"] == pytest.approx(h["ground_clearance_m"].min())
    assert np.isnan(h["cl_impulse"]).all() and "impulse_loads" in s
    assert res.error is None


def test_without_the_new_keys_nothing_changes():
    # the flap at zero and no ground: the same physics as the plain section, to round-off
    d = flap_ground(ground__height=None, motion__flap=None)
    d.pop("ground")
    plain = json.loads(json.dumps(d))
    plain["airfoil"].pop("flap_hinge")
    a = simulate(d).history
    b = simulate(plain).history
    assert np.abs(a["cl"] - b["cl"]).max() < 2e-3 * np.abs(b["cl"]).max()   # the hinge node moves the nodes
    assert "flap_deg" not in b and "ground_clearance_m" not in b


def test_touching_the_ground_stops_the_run_with_the_step_and_time(tmp_path, capsys):
    d = flap_ground(motion__flap=None,
                    motion__plunge={"law": "ramp", "from": 0.0, "to": -0.2, "start": 0.01, "duration": 0.05})
    res = simulate(d)
    assert res.error and "touch the ground" in res.error and "step" in res.error and "t = " in res.error
    n = len(res.history["t"])
    assert 0 < n < load_scenario(d).steps + 1
    assert res.history["ground_clearance_m"][-1] > 0.0
    # held steady at the run's lowest heights the plate would be in the ground: no quasi-steady lift, said so
    assert not np.isfinite(res.history["cl_quasi_steady"]).any()
    assert "touch the ground" in res.summary["lag"]["note"] and "t90" not in res.summary["lag"]
    # through the command line: exit 1, the message, the steps computed kept
    import tomli_w
    path = tmp_path / "flare.toml"
    path.write_text(tomli_w.dumps(d))
    out = tmp_path / "run"
    assert main(["run", str(path), "--out", str(out), "--quiet"]) == 1
    err = capsys.readouterr().err
    assert "touch the ground" in err and "steps computed so far" in err
    assert (out / "history.csv").exists()
    assert len((out / "history.csv").read_text().splitlines()) == n + 1


def test_the_linear_model_writes_the_flap_columns():
    d = flap_ground(run__model="linear")
    d.pop("ground")
    h = simulate(d).history
    assert h["flap_deg"][-1] == pytest.approx(10.0) and np.isfinite(h["ch"]).all()


# ---------------------------------------------------------------- pictures and films

@pytest.fixture(scope="module")
def flap_run(tmp_path_factory):
    import tomli_w
    root = tmp_path_factory.mktemp("flaprun")
    d = flap_ground(motion__flap={"law": "constant", "value": 20.0}, motion__pitch={"law": "constant",
                                                                                    "value": 0.0},
                    airfoil__flap_hinge=0.6, airfoil__shape="naca0012", run__chords=4)
    d["output"] = {"plots": True}
    path = root / "s.toml"
    path.write_text(tomli_w.dumps(d))
    out = root / "run"
    assert main(["run", str(path), "--out", str(out), "--quiet"]) == 0
    return out


def test_pictures_of_a_flap_over_the_ground(flap_run):
    for name in ("histories.png", "wake.png"):
        assert (flap_run / name).stat().st_size > 10_000


def test_film_draws_the_deflected_flap_and_the_ground(flap_run, tmp_path):
    from unsteady.outputs.films import Film, FilmOptions, FilmRenderer
    from unsteady.outputs.rundir import load_run
    res = load_run(flap_run)
    rend = FilmRenderer(Film(res, FilmOptions(width=960, height=540, frames=2, trace="ch", camera="fixed")))
    img = rend.frame(1).astype(float).mean(axis=2)
    grey = (lambda c, r: img[int(round(r)), int(round(c))])
    c, xh = C, 0.6
    beta = math.radians(20.0)
    # along the deflected flap (55 % to 90 % of its chord): dark; where an undeflected flap would be: light
    s = np.linspace(0.55, 0.9, 8) * (1 - xh) * c
    x0 = (xh - 0.25) * c
    cols, rows = rend.pixel_of(x0 + s * math.cos(beta), -s * math.sin(beta))
    assert all(grey(a, b) < 120 for a, b in zip(cols, rows))
    cols, rows = rend.pixel_of(x0 + s, np.zeros_like(s))
    assert all(grey(a, b) > 200 for a, b in zip(cols, rows))
    # the ground line at 0.1 m below the pitch axis
    cols, rows = rend.pixel_of(np.array([0.3, 0.5]), np.array([-0.1, -0.1]))
    assert all(grey(a, b) < 120 for a, b in zip(cols, rows))


def test_animate_trace_ch(flap_run, tmp_path, capsys):
    out = tmp_path / "f.mp4"
    assert main(["animate", str(flap_run), "--out", str(out), "--trace", "ch", "--frames", "3",
                 "--size", "320x180", "--quiet"]) == 0
    assert out.stat().st_size > 1000


def test_film_clock_reads_the_flap_angle(flap_run, tmp_path):
    from unsteady.outputs.films import Film, FilmOptions, FilmRenderer
    from unsteady.outputs.rundir import load_run
    import tomli_w
    d = flap_ground(ground__height=None)
    d.pop("ground")
    d["output"] = {"plots": False}
    path = tmp_path / "s.toml"
    path.write_text(tomli_w.dumps(d))
    assert main(["run", str(path), "--out", str(tmp_path / "r"), "--quiet"]) == 0
    rend = FilmRenderer(Film(load_run(tmp_path / "r"), FilmOptions(width=640, height=360, frames=3)))
    rend.frame(2)
    assert "flap +10.0 deg" in rend.clock_line
    # a fixed flap is no clock entry
    rend = FilmRenderer(Film(load_run(flap_run), FilmOptions(width=640, height=360, frames=2)))
    rend.frame(1)
    assert "flap" not in rend.clock_line


def test_compare_sets_the_vortex_and_linear_flap_side_by_side(tmp_path, capsys):
    import tomli_w
    d = flap_ground(run__chords=8)
    d.pop("ground")
    d["output"] = {"plots": False}
    path = tmp_path / "s.toml"
    path.write_text(tomli_w.dumps(d))
    assert main(["run", str(path), "--out", str(tmp_path / "vortex"), "--quiet"]) == 0
    assert main(["run", str(path), "--out", str(tmp_path / "linear"), "--set", "run.model=linear",
                 "--quiet"]) == 0
    capsys.readouterr()
    assert main(["compare", str(tmp_path / "vortex"), str(tmp_path / "linear"), "--out",
                 str(tmp_path / "c.png")]) == 0
    out = capsys.readouterr().out
    assert "ch_min" in out and (tmp_path / "c.png").exists()
    # the two models agree on the settled hinge moment within 5 % (Theodorsen's steady terms and the
    # camber's thin-airfoil share against the lumped-vortex section at 24 elements)
    v = json.loads((tmp_path / "vortex" / "summary.json").read_text())
    lin = json.loads((tmp_path / "linear" / "summary.json").read_text())
    assert v["ch_min"] == pytest.approx(lin["ch_min"], rel=0.05)


def test_linear_free_heave_with_a_flap_compiled_and_python_marches_agree():
    # the compiled march against its Python twin (the oracle), and against the vortex model: a flap
    # step of a free-heaving section, n_max within 3 % (Theodorsen's flap terms against the
    # lumped-vortex section at 30 elements)
    from unsteady.simulation.models import linear_heave_marcher
    d = {"flow": {"speed": 12.0, "density": 1.2},
         "airfoil": {"shape": "naca2412", "chord": C, "elements": 30, "flap_hinge": 0.75},
         "motion": {"flap": {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.02, "duration": 0.03,
                             "smoothing": 0.005}},
         "aircraft": {"mass": 0.6, "wing_area": 0.3}, "run": {"chords": 40}, "output": {"plots": False}}
    sc = load_scenario(d)
    a = linear_heave_marcher(sc).run()
    b = linear_heave_marcher(sc, compiled=False).run()
    for k in ("cl", "cm", "cd", "h"):
        assert np.abs(a[k] - b[k]).max() < 1e-9 * max(1.0, np.abs(a[k]).max()), k
    lin = simulate(sc.with_overrides({"run.model": "linear"}))
    vor = simulate(sc)
    assert lin.summary["n_max"] == pytest.approx(vor.summary["n_max"], rel=0.03)
    assert lin.summary["ch_min"] == pytest.approx(vor.summary["ch_min"], rel=0.05)
    assert np.isfinite(lin.history["ch"]).all() and lin.history["flap_deg"][-1] == pytest.approx(5.0)
