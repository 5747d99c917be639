"""The linear companion model's pieces and its scenario runs (unsteady.linear, unsteady.models)."""

import numpy as np
import pytest

from unsteady import load_scenario, theory

from unsteady.linear import model as linear

from unsteady.simulation import models
from unsteady.simulation.observers import BASE_COLUMNS, EXTRA_COLUMNS
from unsteady.simulation.runner import simulate

U, C = 12.0, 0.3


def test_weights_are_interval_means_and_cached():
    ds = 0.1
    W = linear.indicial_weights("wagner", ds, 50)
    assert W is linear.indicial_weights("wagner", ds, 50)
    # Wagner is increasing (H. Wagner 1925): each mean lies between its ends
    s = np.arange(51) * ds
    phi = theory.wagner(s)
    assert np.all(W > phi[:-1]) and np.all(W < phi[1:])


def test_duhamel_starts():
    ds, n = 0.05, 400
    x = np.full(n, 0.1)
    assert np.allclose(linear.duhamel(x, "wagner", ds, "steady"), 0.1)
    r = linear.duhamel(x, "wagner", ds, "impulsive")
    assert r[0] == 0.0                     # the instant before the start
    assert np.allclose(r[1:], 0.1 * theory.wagner(np.arange(1, n) * ds))


def test_superposition_is_linear():
    ds = 0.05
    rng = np.random.default_rng(1)
    a, b = rng.normal(size=300), rng.normal(size=300)
    lhs = linear.duhamel(2 * a + 3 * b, "kuessner", ds)
    rhs = 2 * linear.duhamel(a, "kuessner", ds) + 3 * linear.duhamel(b, "kuessner", ds)
    assert np.allclose(lhs, rhs, atol=1e-12)


class _Prescribed:
    def __init__(self, f):
        self.f = f

    def state(self, t):
        return self.f(t)

    def after_step(self, t, dt, row):
        pass


def test_marcher_equals_vectorised_for_prescribed_motion():
    w = 30.0
    f = lambda t: (0.05 * np.sin(w * t), 0.05 * w * np.cos(w * t), 0.0, 0.2 * np.cos(w * t))
    acc = lambda t: (-0.05 * w * w * np.sin(w * t), -0.2 * w * np.sin(w * t))
    dt, n = 1e-3, 600
    t = np.arange(n + 1) * dt
    gust = lambda tt, hh: 0.3 * (tt > 0.1)
    m = linear.LinearMarcher(_Prescribed(f), steps=n, dt=dt, speed=U, chord=C, pivot=0.4,
                             w_le=gust, accel=acc).run()
    a, ad, _, hd = f(t)
    add, hdd = acc(t)
    v = linear.linear_loads(t, a, ad, add, hd, hdd, speed=U, chord=C, pivot=0.4,
                            w_le=gust(t, 0.0).astype(float))
    # the marcher takes the plunge acceleration from a backward difference
    assert np.allclose(m["cl"], v["cl"], atol=2e-3)
    assert np.allclose(m["cl_c"], v["cl_c"], atol=1e-12)
    assert np.allclose(m["cl_gust"], v["cl_gust"], atol=1e-12)


def test_free_heave_settles_with_the_gust():
    # A section free to heave in a sharp-edged up-gust rises until it moves
    # with the air: h_dot -> w0 and the lift increment dies away (common practice).
    mass = 0.5      # kg per metre of span
    rho = 1.2

    class Heave:
        def __init__(self):
            self.h, self.hd = 0.0, 0.0

        def state(self, t):
            return 0.0, 0.0, self.h, self.hd

        def after_step(self, t, dt, row):
            lift = row["cl"] * 0.5 * rho * U**2 * C
            self.hd += lift / mass * dt
            self.h += self.hd * dt

    w0 = 0.5
    m = linear.LinearMarcher(Heave(), steps=4000, dt=5e-4, speed=U, chord=C, pivot=0.25,
                             w_le=lambda t, h: w0 * (t >= 0.01)).run()
    assert m["h_dot"][-1] == pytest.approx(w0, rel=0.01)
    assert abs(m["cl"][-1]) < 0.01 * 2 * np.pi * w0 / U


def test_model_registry_and_run_directory(tmp_path):
    assert "linear" in __import__("unsteady.inputs.scenario", fromlist=["RUN_MODELS"]).RUN_MODELS
    with pytest.raises(KeyError):
        models.get("no-such-model")
    sc = load_scenario({"flow": {"speed": U, "density": 1.2},
                        "airfoil": {"shape": "naca2412", "chord": C, "elements": 20},
                        "motion": {"pivot": 0.25,
                                   "pitch": {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.02,
                                             "duration": 0.05}},
                        "run": {"chords": 10, "model": "linear"},
                        "gust": {"profile": "sharp-edged", "amplitude": 0.4, "arrival": 0.1}})
    res = simulate(sc)
    for k in BASE_COLUMNS + EXTRA_COLUMNS + ("w_gust", "cl_quasi_steady", "alpha_eff_deg"):
        assert k in res.history and len(res.history[k]) == sc.steps + 1
    assert res.summary["model"] == "linear" and "lag" in res.summary
    out = res.save(tmp_path / "lin")
    assert (out / "history.csv").exists() and (out / "lag.png").exists()


def test_bad_model_name_is_an_input_error():
    from unsteady.inputs.scenario import ScenarioError
    with pytest.raises(ScenarioError, match="run.model"):
        load_scenario({"flow": {"speed": U, "density": 1.2}, "airfoil": {"chord": C},
                       "run": {"chords": 5, "model": "linaer"}})


def test_free_heave_in_a_gust_matches_the_vortex_model():
    # Both models drive the same heave model (unsteady.dynamics.heave); in a gentle
    # 1-cosine gust the vortex model is in its linear limit, so the load
    # factors must agree (common practice). Measured: n_max 2.3148 (linear)
    # against 2.3144 (vortex) over 40 chords; here 20 chords, 20 elements.
    d = {"flow": {"speed": 15.0, "density": 1.2}, "airfoil": {"chord": 0.2, "elements": 20},
         "run": {"chords": 20, "wake": "frozen"},
         "gust": {"profile": "one-minus-cosine", "amplitude": 2.0, "length": 2.0, "arrival": 0.05},
         "aircraft": {"mass": 2.0, "wing_area": 0.4}}
    n = {}
    for model in ("linear", "vortex"):
        d["run"]["model"] = model
        n[model] = simulate(load_scenario(d)).summary["n_max"]
    assert n["linear"] - 1 == pytest.approx(n["vortex"] - 1, rel=0.005)


def test_circulation_columns_match_the_vortex_model():
    # Kutta-Joukowski, L = -rho U Gamma with counter-clockwise-positive Gamma
    # (common practice sign): both models report the same bound and wake circulation
    d = {"flow": {"speed": 10.0, "density": 1.2},
         "airfoil": {"shape": "flat", "chord": 0.2, "elements": 20},
         "motion": {"pitch": {"law": "ramp", "from": 0.0, "to": 2.0, "start": 0.01, "duration": 0.02}},
         "run": {"chords": 6.0, "wake": "frozen"}, "output": {"plots": False}}
    v = simulate(d).history
    d["run"]["model"] = "linear"
    li = simulate(d).history
    for k in ("gamma_bound_m2_s", "gamma_wake_m2_s"):
        assert li[k][-1] == pytest.approx(v[k][-1], rel=0.02), k
    assert v["gamma_bound_m2_s"][-1] < 0 < v["cl"][-1]
