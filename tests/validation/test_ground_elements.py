"""Several elements (``[[airfoil]]``) over the flat ground (``[ground]``) against the method of images.

Sources, each named beside its check:
- L. M. Milne-Thomson, Theoretical Hydrodynamics (5th ed., 1968), sec. 13.6; J. Katz &
  A. Plotkin, Low-Speed Aerodynamics (2nd ed., 2001): a flat wall along which the air
  slips is exactly an inverted mirror image of every vortex, so a wing with its tail over
  the ground carries the loads of the same pair with the pair's mirror image as two more
  elements in free air; the images' influence falls off with distance, so a ground far
  below is free air.
- The single element in ground effect against the lumped-vortex result is in
  tests/validation/test_ground_classical.py.
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate

C, U, RHO, PIVOT = 0.2, 10.0, 1.225, 0.25
WING = {"shape": "flat", "chord": C, "elements": 24}
TAIL = {"shape": "flat", "chord": 0.5 * C, "elements": 12, "position": [2.5 * C, 0.25 * C], "incidence": -3.0}


def scenario(elements, pitch, chords, ground=None):
    raw = {"flow": {"speed": U, "density": RHO},
           "airfoil": elements,
           "motion": {"pivot": PIVOT, "pitch": {"law": "constant", "value": pitch}},
           "run": {"chords": chords, "start": "impulsive", "wake": "free"},
           "output": {"dir": "/tmp/never-written", "plots": False}}
    if ground is not None:
        raw["ground"] = {"height": ground}
    return load_scenario(raw)


def mirrored(el, alpha_deg, height):
    """A flat element's mirror image in a ground ``height`` below the pitch axis (the assembly at
    ``alpha_deg``), as a further element: its leading edge in the first element's chord axes and its
    incidence relative to the first."""
    a, p = math.radians(alpha_deg), PIVOT * C
    xi, zeta = el.get("position", [0.0, 0.0])
    # the leading edge in the computation frame (pitch axis at the origin; vortex.bodies.to_inertial)
    x = (xi - p) * math.cos(a) + zeta * math.sin(a)
    z = -(xi - p) * math.sin(a) + zeta * math.cos(a)
    zm = -2.0 * height - z                                   # its image
    pos = [x * math.cos(a) - zm * math.sin(a) + p, x * math.sin(a) + zm * math.cos(a)]
    return dict(el, position=pos, incidence=-2.0 * alpha_deg - el.get("incidence", 0.0))


@pytest.mark.parametrize("height", [0.12, 0.3])
def test_wing_and_tail_over_the_ground_are_the_mirrored_pair_both_ways(height):
    # Method of images (Milne-Thomson 1968; Katz & Plotkin 2001): the wing and tail over [ground]
    # carry, element by element, what the pair carries with its mirror image as elements 3 and 4 in
    # free air (0.2 % of the peak, each step after the first; measured: round-off), and the images
    # the opposite lift.  The other way: the ground's result is far from the pair's in free air.
    alpha = 5.0
    ground = simulate(scenario([WING, TAIL], alpha, 4.0, ground=height)).history
    four = simulate(scenario([WING, TAIL, mirrored(WING, alpha, height), mirrored(TAIL, alpha, height)],
                             alpha, 4.0)).history
    free = simulate(scenario([WING, TAIL], alpha, 4.0)).history
    assert ground["t"].size == four["t"].size
    for i in (1, 2):
        peak = np.abs(ground[f"cl_{i}"][1:]).max()
        for key in ("cl", "cd", "cm"):
            assert np.abs(four[f"{key}_{i}"][1:] - ground[f"{key}_{i}"][1:]).max() < 2e-3 * peak, (i, key)
        assert np.abs(four[f"cl_{i + 2}"][1:] + ground[f"cl_{i}"][1:]).max() < 2e-3 * peak, i
        assert abs(free[f"cl_{i}"][-1] - ground[f"cl_{i}"][-1]) > 0.02 * abs(ground[f"cl_{i}"][-1]), i
    # the clearance column: the lowest point of any element above the ground, here the wing's trailing
    # edge, 0.75 c aft of the pitch axis at 5 degrees nose-up (the tail's sits higher)
    drop = (1.0 - PIVOT) * C * math.sin(math.radians(alpha))
    assert ground["ground_clearance_m"][0] == pytest.approx(height - drop, abs=1e-9)


def test_a_distant_ground_is_free_air_for_wing_and_tail():
    # Method of images: 1,000 chords below, each element's loads are those of free air within 0.1 %
    # of its peak
    free = simulate(scenario([WING, TAIL], 5.0, 4.0)).history
    far = simulate(scenario([WING, TAIL], 5.0, 4.0, ground=1000 * C)).history
    for i in (1, 2):
        peak = np.abs(free[f"cl_{i}"][1:]).max()
        for key in ("cl", "cd", "cm"):
            assert np.abs(free[f"{key}_{i}"][1:] - far[f"{key}_{i}"][1:]).max() < 1e-3 * peak, (i, key)


def test_the_tail_touching_the_ground_stops_the_run_with_the_step_named():
    # a nose-up pitch ramp about the wing's quarter chord lowers the tail to the ground: the run stops
    # at contact with the step and time named, the steps computed so far kept (common practice: the
    # solid ground cannot be entered)
    raw = {"flow": {"speed": U, "density": RHO}, "airfoil": [WING, TAIL],
           "motion": {"pivot": PIVOT, "pitch": {"law": "ramp", "from": 0.0, "to": 30.0, "start": 0.0,
                                                 "duration": 0.1}},
           "ground": {"height": 0.15}, "run": {"chords": 6.0, "wake": "frozen"},
           "output": {"dir": "/tmp/never-written", "plots": False}}
    res = simulate(load_scenario(raw))
    assert res.error and "touch the ground" in res.error and "step" in res.error and "t = " in res.error
    n = len(res.history["t"])
    assert 1 < n < load_scenario(raw).steps + 1
    assert res.history["ground_clearance_m"][-1] > 0.0
    # the tail came down: its trailing edge is the lowest point at the end
    a = math.radians(float(res.history["pitch_deg"][-1]))
    xi = TAIL["position"][0] + TAIL["chord"] * math.cos(math.radians(TAIL["incidence"])) - PIVOT * C
    zeta = TAIL["position"][1] - TAIL["chord"] * math.sin(math.radians(TAIL["incidence"]))
    assert res.history["ground_clearance_m"][-1] == pytest.approx(
        0.15 + (-xi * math.sin(a) + zeta * math.cos(a)), abs=1e-9)


def test_pitch_freedom_trims_over_the_ground_with_the_ground_in_the_flow():
    # Trim (common practice: lift = weight, zero moment about the centre of gravity) solved on the
    # flow with the ground's images: level flight from the first row, and the ground's extra lift
    # (the lumped-vortex result Gamma_g / Gamma_inf = (1/4 + 4 (h/c)^2) / (4 (h/c)^2) > 1, Katz &
    # Plotkin 2001, see test_ground_classical.py) lowers the trimmed attitude below free air's.
    def case(ground):
        r = {"flow": {"speed": 15.0, "density": 1.2},
             "airfoil": [{"shape": "naca2412", "thick": False, "chord": 0.25, "elements": 16},
                         {"shape": "flat", "chord": 0.12, "elements": 8, "position": [0.9, 0.05],
                          "incidence": -2.0}],
             "aircraft": {"mass": 3.0, "wing_area": 0.55, "pitch_inertia": 0.15, "cg": 0.3},
             "run": {"chords": 2}, "output": {"dir": "/tmp/never-written", "plots": False}}
        if ground is not None:
            r["ground"] = {"height": ground}
        return simulate(load_scenario(r))
    low, free = case(0.12), case(None)
    h = low.history
    assert abs(h["n"][0] - 1.0) < 1e-8 and abs(h["cm_pivot"][0]) < 1e-8
    assert low.summary["alpha_trim_deg"] < free.summary["alpha_trim_deg"] - 0.1
