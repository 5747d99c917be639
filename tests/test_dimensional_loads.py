"""Lift in newtons and root bending of the aircraft (unsteady.analysis.loads).

Checks: lift_N = n m g at every step (the definition of the load factor); the
root bending of an elliptic loading, (L/2) 4 s / (3 pi) (L. Prandtl's lifting
line; the centroid of a half-ellipse lies at 4 s / (3 pi), a handbook formula).
"""

import math

import numpy as np
import pytest
from scipy import integrate

import unsteady
import unsteady.theory
from unsteady.analysis.loads import G, add_dimensional_loads, elliptic_root_bending


def _scenario(**ac):
    return unsteady.load_scenario("scenarios/drone-gust-1cos.toml",
                                  overrides=["run.model=linear"] + [f"aircraft.{k}={v}" for k, v in ac.items()])


def test_lift_is_n_times_weight_and_root_bending_is_elliptic():
    sc = _scenario(span=2.2)
    res = unsteady.simulate(sc)
    h = dict(res.history)
    extra = add_dimensional_loads(h, sc)
    assert np.array_equal(h["lift_N"], h["n"] * 3.0 * G)
    s = 1.1
    # independent: the moment of an elliptic lift distribution l(y) = l0 sqrt(1 - (y/s)^2)
    l0 = 1.0
    half_lift = integrate.quad(lambda y: l0 * math.sqrt(1 - (y / s) ** 2), 0, s)[0]
    moment = integrate.quad(lambda y: y * l0 * math.sqrt(1 - (y / s) ** 2), 0, s)[0]
    assert elliptic_root_bending(2 * half_lift, 2.2) == pytest.approx(moment, rel=1e-9)
    assert h["root_bending_Nm"] == pytest.approx(elliptic_root_bending(h["lift_N"], 2.2), rel=1e-12)
    assert extra["lift_max_N"] == pytest.approx(res.summary["n_max"] * 3.0 * G)
    kappa = unsteady.theory.helmbold_lift_slope(8.8) / (2 * math.pi)   # Helmbold, aspect ratio 8.8
    assert h["cl_wing"] == pytest.approx(kappa * h["cl"], rel=1e-12)
    assert res.summary["t_n_min"] == pytest.approx(h["t"][int(np.argmin(h["n"]))])


@pytest.mark.parametrize("span, msg", [(-1.0, "must be > 0"), (3.0, "aspect_ratio")])
def test_bad_span_is_refused(span, msg):
    with pytest.raises(unsteady.ScenarioError, match=msg):
        _scenario(span=span)
