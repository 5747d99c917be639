"""Thick sections on surface panels with a hinged trailing-edge flap (``[airfoil] thick`` with ``flap_hinge``).

Sources, each named beside its check:
- H. Glauert, The Elements of Aerofoil and Airscrew Theory (1926); I. H. Abbott & A. E. von
  Doenhoff, Theory of Wing Sections (1959), ch. 4: the thin-airfoil flap derivative
  dcl/dbeta = 2 (pi - theta_h + sin theta_h) (``unsteady.theory.flap.glauert_flap``).
- Thickness correction (common practice, from memory): in inviscid flow the thickness raises
  the lift of a section by about the factor it raises the lift slope (roughly 1 + 0.8 t), for
  the change of circulation a flap makes as for one made by incidence.  Expected here: the
  thick flap derivative over Glauert's within 2 % of the section's own lift slope over 2 pi.
- The camber-line flap (``unsteady.vortex.flap``, validated against Glauert and Theodorsen in
  test_flap_classical.py): the thick model at 1 % thickness must come close to it.
- L. M. Milne-Thomson, Theoretical Hydrodynamics (5th ed., 1968), the method of images (the
  deflected section over the ground against the section and its mirror image solved directly).
- Kelvin's theorem (common practice); J. C. Wu, AIAA J. 19 (1981): the vortex-impulse force.
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.inputs.motion import build_law
from unsteady.inputs.sections import section_from_shape
from unsteady.theory.flap import glauert_flap
from unsteady.vortex.flap_panels import HingedFlapPanels
from unsteady.vortex.ground import Ground
from unsteady.vortex.solver import VortexSolver

C = 0.2


def scenario(shape="naca0012", flap=None, alpha=0.0, thick=True, n=160, hinge=0.75, chords=0.05,
             start="steady", wake="free"):
    d = {"flow": {"speed": 10.0, "density": 1.2},
         "airfoil": {"shape": shape, "chord": C, "thick": thick, "elements": n, "flap_hinge": hinge},
         "motion": {"pivot": 0.25, "pitch": {"law": "constant", "value": alpha},
                    "flap": flap if flap is not None else {"law": "constant", "value": 0.0}},
         "run": {"chords": chords, "start": start, "wake": wake}, "output": {"plots": False}}
    return load_scenario(d)


def first_row(**kw):
    return {k: v[0] for k, v in simulate(scenario(**kw)).history.items()}


@pytest.mark.parametrize("hinge", [0.6, 0.75, 0.9])
def test_steady_flap_effectiveness_against_glauert_with_the_thickness_factor(hinge):
    # Glauert (1926) with the thickness factor (see the module docstring): NACA 0012, 160 panels,
    # 3 degrees of flap at zero incidence, against 3 degrees of incidence without flap.
    # Measured: dcl/dbeta / Glauert = 1.116, 1.110, 1.094 (hinge 0.6, 0.75, 0.9) against the lift
    # slope's 1.100; a hinge moment 7-18 % smaller than the camber line's.
    beta = math.radians(3.0)
    flap = first_row(hinge=hinge, flap={"law": "constant", "value": 3.0})
    slope = first_row(hinge=hinge, alpha=3.0)["cl"] / beta
    factor = slope / (2.0 * math.pi)
    assert 1.06 < factor < 1.14                         # roughly 1 + 0.8 t, t = 0.12
    ratio = (flap["cl"] / beta) / glauert_flap(hinge)[0]
    assert ratio == pytest.approx(factor, rel=0.02)
    assert flap["ch"] < 0.0                             # the air pushes a lowered flap back up


def test_thin_thick_flap_is_the_camber_line_flap():
    # The camber-line flap (itself within 0.8 % of Glauert at 80 elements) against NACA 0001 on
    # 160 panels, 3 degrees at the hinge 0.75: lift within 1.5 % (measured 1.3 %, 1.1 % at 320:
    # about 0.8 t of it is the thickness, the rest the kinked panels at the hinge), hinge moment
    # within 2.5 % (measured 1.9 %, 1.3 % at 320)
    flap = {"law": "constant", "value": 3.0}
    thick = first_row(shape="naca0001", flap=flap)
    thin = first_row(shape="flat", thick=False, n=80, flap=flap)
    assert thick["cl"] == pytest.approx(thin["cl"], rel=0.015)
    assert thick["ch"] == pytest.approx(thin["ch"], rel=0.025)


def test_moving_thick_flap_follows_the_camber_line_and_keeps_kelvin():
    # A 5-degree flap ramp over 1 chord, NACA 0001 on 160 panels against the camber line at 80
    # elements, started impulsively, free wake: cl within 1.5 % of the peak, ch within 3 % of its
    # peak (the camber-line model as the reference, see above); Kelvin's theorem (common practice)
    # to round-off; pressure and impulse lift within 1 % of the peak (Wu 1981)
    flap = {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.004, "duration": 0.02}
    kw = dict(flap=flap, chords=2.5, start="impulsive")
    thick = simulate(scenario(shape="naca0001", **kw)).history
    thin = simulate(scenario(shape="flat", thick=False, n=80, **kw)).history
    t = np.union1d(thick["t"], thin["t"])
    cl_a, cl_b = np.interp(t, thick["t"], thick["cl"]), np.interp(t, thin["t"], thin["cl"])
    ch_a, ch_b = np.interp(t, thick["t"], thick["ch"]), np.interp(t, thin["t"], thin["ch"])
    late = t > 0.004 + 2 * 2.5e-4                       # after the ramp's first instant (its impulse)
    peak = np.abs(cl_b).max()
    assert np.abs(cl_a - cl_b)[late].max() < 0.015 * peak
    assert np.abs(ch_a - ch_b)[late].max() < 0.03 * np.abs(ch_b).max()
    total = thick["gamma_bound_m2_s"] + thick["gamma_wake_m2_s"]
    assert np.abs(total).max() < 1e-9 * np.abs(thick["gamma_bound_m2_s"]).max()
    row = thick["t"] > 0.004 + 2 * 2.5e-4
    assert np.abs(thick["cl"] - thick["cl_impulse"])[row].max() < 0.01 * np.abs(thick["cl"]).max()


class Held:
    def state(self, t):
        return (0.0, 0.0, 0.0, 0.0)

    def after_step(self, *a):
        pass


def test_the_thick_matrix_is_refactored_only_while_the_flap_moves():
    # as the camber-line flap (common practice: refactor only when the points move)
    n, dt = 60, C / (10.0 * 30)
    law = build_law({"law": "ramp", "from": 0.0, "to": 6.0, "start": 20 * dt, "duration": 10 * dt},
                    scale=math.pi / 180)
    model = HingedFlapPanels(section_from_shape("naca0012"), n, C, 0.25, 0.7, law)

    class Count:
        def on_start(self, solver):
            self.solver, self.versions = solver, []

        def on_step(self, st):
            self.versions.append(self.solver.system.version)
    obs = Count()
    VortexSolver(model, Held(), speed=10.0, density=1.2, dt=dt, steps=60, wake="frozen").run([obs])
    refactored = np.flatnonzero(np.diff(obs.versions)) + 1
    moved = np.flatnonzero(np.diff(law.value(np.arange(61) * dt))) + 1
    assert refactored.tolist() == moved.tolist()


def test_deflected_thick_flap_over_the_ground_is_the_mirror_pair():
    # Method of images (Milne-Thomson 1968): the deflected section 0.4 chord over the ground against
    # the same outline and its mirror image solved directly in free air (test_thick_ground.py)
    import sys
    import pathlib
    sys.path.insert(0, str(pathlib.Path(__file__).parent))
    from test_thick_ground import Rows, two_bodies_in_free_air
    law = build_law({"law": "constant", "value": 8.0}, scale=math.pi / 180)
    model = HingedFlapPanels(section_from_shape("naca2412"), 120, C, 0.25, 0.75, law)
    rows = Rows(model)
    z_g = -0.4 * C
    VortexSolver(model, Held(), speed=10.0, density=1.2, dt=0.002, steps=0, ground=Ground(z_g)).run([rows])
    gamma_ref, cl_ref = two_bodies_in_free_air(model.geometry, 0.0, z_g, 10.0)
    gamma = rows.gamma[0] / model.geometry.w
    assert np.abs(gamma - gamma_ref).max() < 1e-9 * np.abs(gamma_ref).max()
    assert rows.rows[0]["cl"] == pytest.approx(cl_ref, rel=1e-3)
    assert "ch" in rows.rows[0]


def test_a_distant_ground_is_free_air_with_a_moving_thick_flap():
    # Method of images: 1,000 chords below, within 0.1 % of the peak lift
    flap = {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.004, "duration": 0.01}
    free = simulate(scenario(flap=flap, chords=1.5, n=80)).history
    d = scenario(flap=flap, chords=1.5, n=80).raw
    d["ground"] = {"height": 1000 * C}
    far = simulate(load_scenario(d)).history
    peak = np.abs(free["cl"]).max()
    for key in ("cl", "cm", "ch"):
        assert np.abs(free[key] - far[key]).max() < 1e-3 * peak, key
