"""Solver behaviour beyond the classical checks: divergence handling, far wake, frames."""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.vortex.solver import Body, SolverDiverged, VortexSolver

BASE = {
    "flow": {"speed": 10.0, "density": 1.2},
    "airfoil": {"shape": "flat", "chord": 0.2, "elements": 16},
    "motion": {"pitch": {"law": "constant", "value": 3.0}},
    "run": {"chords": 4.0, "start": "impulsive"},
    "output": {"plots": False},
}


class BrokenMotion:
    """Pitch becomes NaN after t_bad (stands in for a numerical blow-up)."""

    def __init__(self, kin, t_bad):
        self.kin, self.t_bad = kin, t_bad

    def state(self, t):
        a, ad, h, hd = self.kin.state(t)
        return (float("nan") if t > self.t_bad else a), ad, h, hd

    def accel(self, t):
        return self.kin.accel(t)

    def singular_times(self):
        return self.kin.singular_times()


def test_divergence_stops_at_once_and_keeps_history():
    sc = load_scenario(BASE)
    t_bad = 10 * sc.dt + 1e-12
    sc.__dict__["kinematics"] = BrokenMotion(sc.kinematics, t_bad)
    res = simulate(sc)
    assert res.error is not None and "step 11" in res.error and "t = " in res.error
    assert len(res.history["t"]) == 11 and np.isfinite(res.history["cl"]).all()
    assert res.summary["steps"] == 10 and "error" in res.summary


def test_solver_raises_with_step_and_time():
    x = np.linspace(0, 1, 9)
    body = Body.from_nodes(x, 0 * x, 0.2, 0.25)

    class M:
        def state(self, t):
            return (float("nan") if t > 0.001 else 0.05), 0.0, 0.0, 0.0

        def after_step(self, *a):
            pass

    with pytest.raises(SolverDiverged) as ei:
        VortexSolver(body, M(), speed=10.0, density=1.2, dt=0.0005, steps=20).run()
    assert ei.value.step == 3 and ei.value.t == pytest.approx(0.0015)


def test_far_wake_keeps_kelvin_and_bounds_wake():
    # Kelvin's theorem with retired vortices booked at infinity: bound + active wake
    # + retired stays zero for an impulsive start (common practice bookkeeping)
    sc = load_scenario({**BASE, "run": {"chords": 24.0, "start": "impulsive", "far_wake": 10.0}})
    res = simulate(sc)
    h = res.history
    assert h["wake_vortices"].max() <= 10.0 * 16 + 16 + 3
    full = simulate(sc.with_overrides({"run.far_wake": 1000.0}))   # the largest allowed: nothing merged in 24 chords
    # The far wake keeps the starting vortex's pull (merged, drifting at U): the
    # lift stays within 0.2 % of the full free wake (dropping it instead would
    # cost the whole Wagner deficit 1 - phi(s) ~ 1/s, Garrick 1938: about 2 %)
    change = abs(h["cl"][-1] - full.history["cl"][-1]) / abs(full.history["cl"][-1])
    assert change < 0.002
    assert h["gamma_bound_m2_s"][-1] + h["gamma_wake_m2_s"][-1] == pytest.approx(0.0, abs=1e-12)
    # Kelvin: bound plus wake (the far-wake lumps included) stays zero
    assert full.history["gamma_bound_m2_s"][-1] + full.history["gamma_wake_m2_s"][-1] == pytest.approx(0.0, abs=1e-12)


def test_steady_start_has_no_transient():
    sc = load_scenario({**BASE, "run": {"chords": 3.0, "start": "steady"}})
    cl = simulate(sc).history["cl"]
    # thin-airfoil theory: cl = 2 pi alpha (Abbott & von Doenhoff 1959)
    assert np.allclose(cl, 2 * math.pi * math.radians(3.0), rtol=2e-3)
    assert np.ptp(cl) < 1e-9


def test_plunge_equals_pitch_in_quasi_steady_limit():
    # A slow plunge at velocity h' is an angle of attack -h'/U (common practice, thin airfoil)
    U, c = 10.0, 0.2
    hdot = -0.1
    sc = load_scenario({**BASE, "motion": {"plunge": {"law": "ramp", "from": 0.0, "to": hdot * 100.0,
                                                       "start": -1.0, "duration": 100.0}},
                        "run": {"chords": 2.0, "start": "steady", "wake": "frozen"}})
    cl = simulate(sc).history["cl"]
    assert cl[-1] == pytest.approx(2 * math.pi * (-hdot / U), rel=5e-3)
