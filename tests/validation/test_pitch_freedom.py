"""A wing with its tail free to pitch (``[aircraft] pitch_inertia, cg``) against limits from outside the project.

Sources, each named beside its check:
- Rigid-body dynamics (common practice; B. Etkin & L. D. Reid, Dynamics of Flight:
  Stability and Control, 3rd ed., 1996, the longitudinal equations, chapter from
  memory): with a pitch inertia far beyond the aerodynamic moments' reach the attitude
  cannot change within the run, so heave and pitch reduce to heave alone with the
  attitude held, which is what the heave-only run computes.
- Trim (common practice): the trimmed start carries the weight with zero moment about
  the centre of gravity, so the first rows are level flight (load factor 1, no pitch
  acceleration).
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.core.errors import InputError

U, RHO, C = 15.0, 1.2, 0.25


def raw(pitch=True, tail_incidence=-2.0, inertia=0.15, cg=0.3, gust=True, chords=30):
    r = {"flow": {"speed": U, "density": RHO},
         "airfoil": [{"shape": "naca2412", "thick": False, "chord": C, "elements": 16},
                     {"shape": "flat", "chord": 0.12, "elements": 8, "position": [0.9, 0.05],
                      "incidence": tail_incidence}],
         "aircraft": {"mass": 3.0, "wing_area": 0.55},
         "run": {"chords": chords, "far_wake": 30},
         "output": {"dir": "/tmp/never-written", "plots": False}}
    if pitch:
        r["aircraft"].update(pitch_inertia=inertia, cg=cg)
    else:
        r["motion"] = {"pivot": cg}
    if gust:
        r["gust"] = {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 25 * C, "arrival": 0.02}
    return r


def test_trimmed_start_is_level_flight():
    # Trim (common practice): n = 1 and zero moment about the centre of gravity at the start.
    res = simulate(load_scenario(raw(gust=False, chords=3)))
    h, s = res.history, res.summary
    assert abs(h["n"][0] - 1.0) < 1e-8 and abs(h["cm_pivot"][0]) < 1e-8
    assert np.abs(h["n"] - 1.0).max() < 1e-6 and np.abs(h["pitch_deg"] - h["pitch_deg"][0]).max() < 1e-6
    assert "tail (last element) turned" in s["trimmed"]


def test_frozen_attitude_limit_is_the_heave_only_run():
    # Rigid-body dynamics (Etkin & Reid 1996): a huge pitch inertia holds the attitude, and the load
    # factor is the heave-only run's (same geometry: the tail at its trimmed incidence) within 0.5 %
    # of the peak increment; a realistic inertia differs by more (the check has teeth).
    free = simulate(load_scenario(raw(inertia=1e7)))
    turn = free.summary["tail_trim_deg"]
    only = simulate(load_scenario(raw(pitch=False, tail_incidence=-2.0 + turn)))
    assert abs(free.summary["alpha_trim_deg"] - only.summary["alpha_trim_deg"]) < 1e-6
    dn = np.abs(only.history["n"] - 1.0).max()
    assert np.abs(free.history["n"] - only.history["n"]).max() < 5e-3 * dn
    real = simulate(load_scenario(raw(inertia=0.15))).history
    assert np.abs(real["n"] - only.history["n"]).max() > 0.05 * dn


def test_no_trim_is_refused():
    # A small tail close behind the wing cannot balance the wing's lift about a centre of gravity far aft
    # within the tail's travel (30 degrees): refused, not run.
    r = raw(cg=1.5, gust=False, chords=2)
    r["airfoil"][1].update(chord=0.03, position=[0.3, 0.02])
    with pytest.raises(InputError, match="no trim"):
        simulate(load_scenario(r))
