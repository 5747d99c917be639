"""The one run pipeline (unsteady.simulation.runner.simulate) and the Model contract, for every model."""

import ast
import math
from pathlib import Path

import numpy as np
import pytest

import unsteady
from unsteady.inputs.aircraft import G
from unsteady.simulation import models
from unsteady.vortex.solver import SolverDiverged, StepState

PKG = Path(unsteady.__file__).resolve().parent


def _scenario(model, aircraft=False, gust=True, **output):
    # a small made-up drone section, 3 chords of flight (invented demo values)
    d = {"flow": {"speed": 15.0, "density": 1.2},
         "airfoil": {"shape": "naca2412", "chord": 0.25, "elements": 8},
         "run": {"chords": 3, "wake": "frozen", "model": model},
         "output": {"plots": False, **output}}
    if aircraft:
        d["aircraft"] = {"mass": 3.0, "wing_area": 0.55}
    else:
        d["motion"] = {"pitch": {"law": "ramp", "from": 0.0, "to": 2.0, "start": 0.01, "duration": 0.02}}
    if gust:
        d["gust"] = {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 1.0, "arrival": 0.01}
    return unsteady.load_scenario(d)


class Spy:
    """Logs every hook call; adds a column in finish and a key in summary."""

    def __init__(self):
        self.calls = []
        self.steps = []
        self.cl = []

    def on_start(self, model):
        self.calls.append(("on_start", model))

    def on_step(self, state):
        self.calls.append(("on_step", state.n))
        self.steps.append(state.n)
        self.cl.append(state.loads["cl"])

    def on_end(self, model):
        self.calls.append(("on_end", model))

    def finish(self, history):
        self.calls.append(("finish", len(history["t"])))
        history["spy_cl_twice"] = 2.0 * history["cl"]

    def summary(self, history):
        self.calls.append(("summary", "spy_cl_twice" in history))
        return {"spy_rows": len(history["t"])}


@pytest.mark.parametrize("aircraft", [False, True])
@pytest.mark.parametrize("model", ["vortex", "linear"])
def test_every_hook_is_called_in_order(model, aircraft):
    sc = _scenario(model, aircraft)
    spy = Spy()
    res = unsteady.simulate(sc, [spy])
    N = sc.steps + 1
    names = [c[0] for c in spy.calls]
    assert names == ["on_start"] + ["on_step"] * N + ["on_end", "finish", "summary"]
    started, ended = spy.calls[0][1], spy.calls[N + 1][1]
    assert started is ended and isinstance(started, models.get(model)) and started.name == model
    assert spy.steps == list(range(N))
    assert spy.calls[-2] == ("finish", N) and spy.calls[-1] == ("summary", True)
    # the states were the rows of the run, and the hooks' outputs landed in the Result
    assert np.array_equal(np.asarray(spy.cl), res.history["cl"])
    assert np.array_equal(res.history["spy_cl_twice"], 2.0 * res.history["cl"])
    assert res.summary["spy_rows"] == N
    assert res.summary["model"] == model and "lag" in res.summary
    if aircraft:
        assert "n" in res.history and "alpha_trim_deg" in res.summary


def test_a_run_without_user_observers_is_unchanged_by_one():
    # stepping a spy through the rows must not change what the model computes
    for model in ("vortex", "linear"):
        sc = _scenario(model, aircraft=True)
        a = unsteady.simulate(sc).history
        b = unsteady.simulate(sc, [Spy()]).history
        for k in a:
            assert np.array_equal(a[k], b[k], equal_nan=True), (model, k)


class _TestModel(models.Model):
    """A stand-in model (rule 4a, row by row): steady lift 2 pi alpha + 0.1, rows of that lift, a stop after ``stop`` rows."""

    COLUMNS = ("test_col",)
    stop = None

    def steady_cl(self, alpha, alpha_dot):
        return 2.0 * math.pi * alpha + 0.1

    def _march(self, observers):
        sc = self.sc
        for n in range(sc.steps + 1):
            if n == self.stop:
                raise SolverDiverged(n, n * sc.dt, "a test stop")
            t = n * sc.dt
            alpha, alpha_dot, h, h_dot = self.motion.state(t)
            cl = self.steady_cl(alpha, alpha_dot)
            loads = {k: 0.0 for k in ("cd", "cm", "cm_pivot", "cl_impulse", "cd_impulse", "cm_impulse",
                                      "gamma_bound_m2_s", "gamma_wake_m2_s")}
            loads.update(cl=cl, test_col=float(n))
            e = np.zeros(0)
            st = StepState(n=n, t=t, alpha=alpha, alpha_dot=alpha_dot, h=h, h_dot=h_dot,
                           gamma_bound=e, x_wake=e, z_wake=e, gamma_wake=e, x_body=e, z_body=e,
                           loads=loads, dcp=e)
            for o in observers:
                o.on_step(st)
            self.motion.after_step(t, sc.dt, loads)


def test_the_trim_asks_the_model(monkeypatch):
    # the heave is trimmed on the model's own steady lift: 2 pi alpha + 0.1 = cl_level
    monkeypatch.setitem(models.MODELS, "linear", type("M", (_TestModel,), {"name": "linear"}))
    res = unsteady.simulate(_scenario("linear", aircraft=True, gust=False))
    s = res.summary
    q = 0.5 * 1.2 * 15.0**2
    cl_level = 3.0 * G / (q * 0.55)
    assert s["cl_level"] == pytest.approx(cl_level, rel=1e-12)
    assert math.radians(s["alpha_trim_deg"]) == pytest.approx((cl_level - 0.1) / (2 * math.pi), rel=1e-10)
    # level flight: n = 1 and no heave (Newton's law, h'' = g (n - 1))
    assert np.max(np.abs(res.history["n"] - 1.0)) < 1e-10
    assert np.max(np.abs(res.history["height_m"])) < 1e-12
    assert np.array_equal(res.history["test_col"], np.arange(len(res.history["t"]), dtype=float))


def test_divergence_stops_the_run_and_every_hook_still_runs(monkeypatch):
    cls = type("M", (_TestModel,), {"name": "linear", "stop": 7})
    monkeypatch.setitem(models.MODELS, "linear", cls)
    spy = Spy()
    res = unsteady.simulate(_scenario("linear", aircraft=True), [spy])
    assert res.error and "step 7" in res.error and res.summary["error"] == res.error
    assert len(res.history["t"]) == 7 and len(res.history["n"]) == 7
    assert [c[0] for c in spy.calls] == ["on_start"] + ["on_step"] * 7 + ["on_end", "finish", "summary"]
    assert res.summary["spy_rows"] == 7


def test_registry_refuses_names_the_scenario_check_does_not_know():
    with pytest.raises(ValueError, match="RUN_MODELS"):
        models.register_model("no-such-model")
    assert set(models.MODELS) == {"vortex", "linear"}
    with pytest.raises(KeyError, match="registered: linear, vortex"):
        models.get("lattice")


def test_linear_snapshots_follow_snapshot_every():
    sc = _scenario("linear", snapshot_every=0.01)
    snaps = unsteady.simulate(sc).snapshots
    every = round(0.01 / sc.dt)
    expected = np.unique(np.r_[np.arange(0, sc.steps + 1, every), sc.steps]) * sc.dt
    assert np.allclose(snaps["t"], expected, rtol=0, atol=1e-12)
    assert snaps["offsets"].shape == (expected.size + 1,) and not snaps["offsets"].any()


def test_progress_bar_is_wired_for_every_model(monkeypatch):
    from unsteady.simulation import observers
    drawn = []
    monkeypatch.setattr(observers.ProgressBar, "update", lambda self, done, note="": drawn.append(done))
    for model in ("vortex", "linear"):
        drawn.clear()
        sc = _scenario(model)
        unsteady.simulate(sc, progress=True)
        assert drawn and drawn[-1] == sc.steps, model


def test_dynamics_imports_nothing_of_the_vortex_model():
    # the heave trims on whatever model runs; the import-graph test
    # (tests/test_layers.py) checks the layers, this the one edge that was removed
    for path in (PKG / "dynamics").rglob("*.py"):
        for node in ast.walk(ast.parse(path.read_text())):
            names = ([a.name for a in node.names] if isinstance(node, ast.Import) else
                     [node.module or ""] if isinstance(node, ast.ImportFrom) else [])
            assert not any("vortex" in n for n in names), path
