"""Tests of unsteady.dynamics.heave: trim, free heave, load factor, aspect-ratio scaling and the [aircraft] check."""

import math

import numpy as np
import pytest

import unsteady
from unsteady import theory
from unsteady.dynamics import heave as aircraft
from unsteady.inputs.scenario import ScenarioError


def _drone(gust=None, **ac):
    d = {"flow": {"speed": 15.0, "altitude": 400.0},
         "airfoil": {"shape": "naca2412", "chord": 0.25, "elements": 8},
         "run": {"chords": 12, "wake": "frozen"},
         "aircraft": {"mass": 3.0, "wing_area": 0.55, **ac}}
    if gust:
        d["gust"] = gust
    return unsteady.load_scenario(d)


def test_level_flight_is_trimmed_and_stays_level():
    # lift = weight at the initial attitude: n = 1 and no heave in still air
    res = unsteady.simulate(_drone())
    n = res.history["n"]
    assert n[0] == pytest.approx(1.0, abs=1e-9)
    assert np.max(np.abs(n - 1.0)) < 1e-6
    assert np.max(np.abs(res.history["height_m"])) < 1e-6
    # the trimmed attitude: thin-airfoil cl = 2 pi (alpha - alpha_L0) (Abbott &
    # von Doenhoff, ch. 4) gives it within the lumped-vortex model's accuracy
    s = res.summary
    q = 0.5 * res.scenario.density * 15.0**2
    cl_w = 3.0 * 9.80665 / (q * 0.55)
    assert s["cl_level"] == pytest.approx(cl_w, rel=1e-12)
    alpha_L0 = theory.zero_lift_angle(lambda x: theory.naca4_slope(0.02, 0.4, x), breaks=(0.4,))
    assert math.radians(s["alpha_trim_deg"]) == pytest.approx(cl_w / (2 * math.pi) + alpha_L0, abs=math.radians(0.3))


def test_gust_raises_load_factor_and_summary_has_formula():
    res = unsteady.simulate(_drone({"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.5,
                                    "arrival": 0.01}))
    s = res.summary
    assert s["n_max"] > 1.0 and s["t_n_max"] > 0.01
    for k in ("dn_formula", "gust_alleviation_factor", "mass_ratio_mu_g", "dn_ratio", "alpha_trim_deg",
              "load_caution"):
        assert k in s
    # Pratt & Walker (NACA Report 1206) with the values the summary used
    dn, K_g, mu_g = theory.gust_load_factor_increment(3.0 * 9.80665 / 0.55, res.scenario.density, 15.0,
                                                      1.0, 0.25, 2 * math.pi)
    assert s["dn_formula"] == pytest.approx(dn)
    assert s["mass_ratio_mu_g"] == pytest.approx(mu_g)
    assert s["dn_ratio"] == pytest.approx((s["n_max"] - 1.0) / dn)
    # heave: the aircraft is pushed up, and h'' = g (n - 1) (Newton)
    h = res.history
    assert h["height_m"][-1] > 0.0
    assert h["height_accel_m_s2"] == pytest.approx(aircraft.G * (h["n"] - 1.0))


def test_aspect_ratio_scales_the_lift():
    # Helmbold (1942): a = 2 pi A / (2 + sqrt(A^2 + 4)); the load-factor
    # increment in a gust shrinks by about that ratio
    g = {"profile": "one-minus-cosine", "amplitude": 0.5, "length": 2.5, "arrival": 0.01}
    r2 = unsteady.simulate(_drone(g))
    r7 = unsteady.simulate(_drone(g, aspect_ratio=7.0))
    kappa = 7.0 / (2.0 + math.sqrt(49.0 + 4.0))
    assert aircraft.lift_scale(7.0) == pytest.approx(kappa)
    assert r7.summary["lift_slope_per_rad"] == pytest.approx(2 * math.pi * kappa)
    assert "not modelled" in r7.summary["lift_scaling"]
    ratio = (r7.summary["n_max"] - 1.0) / (r2.summary["n_max"] - 1.0)
    assert ratio == pytest.approx(kappa, rel=0.1)
    assert r7.history["n"][0] == pytest.approx(1.0, abs=1e-9)


@pytest.mark.parametrize("ac, key, words", [
    ({"mass": 0.0, "wing_area": 0.55}, "aircraft.mass", "> 0"),
    ({"mass": 3.0, "wing_area": float("inf")}, "aircraft.wing_area", "finite"),
    ({"mass": 3.0}, "aircraft.wing_area", "required"),
    ({"mass": 3.0, "wing_area": 0.55, "aspect_ratio": -1.0}, "aircraft.aspect_ratio", "> 0"),
    ({"mass": 3.0, "wing_area": 0.55, "wingspan": 2.0}, "aircraft.wingspan", "unknown"),
    ({"mass": 300.0, "wing_area": 0.55}, "aircraft.mass", "lift coefficient"),
])
def test_bad_aircraft_input(ac, key, words):
    with pytest.raises(ScenarioError) as exc:
        unsteady.load_scenario({"flow": {"speed": 15.0, "density": 1.2}, "airfoil": {"chord": 0.25},
                                "run": {"chords": 2}, "aircraft": ac})
    lines = [p.line() for p in exc.value.problems]
    assert any(f": {key}: " in ln and words in ln for ln in lines), lines


def test_prescribed_plunge_conflicts_with_free_heave():
    with pytest.raises(ScenarioError) as exc:
        unsteady.load_scenario({"flow": {"speed": 15.0, "density": 1.2}, "airfoil": {"chord": 0.25},
                                "motion": {"plunge": {"law": "constant", "value": 0.0}},
                                "run": {"chords": 2}, "aircraft": {"mass": 1.0, "wing_area": 0.5}})
    assert any(p.key == "motion.plunge" for p in exc.value.problems)


def test_heavy_wing_loading_warns():
    sc = unsteady.load_scenario({"flow": {"speed": 15.0, "density": 1.2}, "airfoil": {"chord": 0.25},
                                 "run": {"chords": 2}, "aircraft": {"mass": 9.0, "wing_area": 0.55}})
    assert any(w.startswith("warning: <dict>: aircraft.mass:") for w in sc.warnings)


def test_heave_step_integrates_a_linear_acceleration_exactly():
    # Second-order Adams-Bashforth is exact for a rate whose derivative is
    # linear in time (each step then uses the mid-step value), the trapezoidal
    # rule for a height whose rate is linear (common practice of multistep
    # integration); only the first, Euler step is off, by k dt^2 / 2 in the rate.
    from unsteady.linear.kernels import heave_step
    n_per_cl, dt, c0, c1 = 1.7, 0.01, 0.8, 3.0          # cl = c0 + c1 t, so h'' = g (n_per_cl cl - 1)
    k = aircraft.G * n_per_cl * c1                       # d h'' / dt
    for step in (heave_step, heave_step.py_func):
        h = h_dot = r_prev = 0.0
        for i in range(50):
            t = i * dt
            n, acc, r_prev, h, h_dot = step(c0 + c1 * t, h, h_dot, r_prev, i == 0, dt, n_per_cl, aircraft.G,
                                            0.0, 0.0)
            assert acc == pytest.approx(aircraft.G * (n_per_cl * (c0 + c1 * t) - 1.0), rel=1e-14)
        t = 50 * dt
        a0 = aircraft.G * (n_per_cl * c0 - 1.0)
        assert h_dot == pytest.approx(a0 * t + 0.5 * k * t**2 - 0.5 * k * dt**2, rel=1e-12)
