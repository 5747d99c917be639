"""Thick (surface-panel) elements among several elements (``[[airfoil]]`` with ``thick``) against
results from outside the project.

Sources, each named beside its check:
- Superposition of potential flows (common practice): an element 100 chords from another feels
  it only through a dipole (its bound vortex and the starting vortex a few chords behind), of
  order (d / D)^2 smaller than its own flow, so each carries its loads alone to better than 0.1 %.
- L. M. Milne-Thomson, Theoretical Hydrodynamics (5th ed., 1968), the method of images; J. Katz &
  A. Plotkin, Low-Speed Aerodynamics (2nd ed., 2001), ground effect by images: a flat wall along
  which the air slips is exactly an inverted mirror image of every vortex, so a wing and tail
  with their mirror images as two more elements carry the loads of the pair over the ground.
- Kelvin's circulation theorem (Katz & Plotkin 2001, sec. 2.7): each element's bound circulation
  plus the circulation it has shed stays what it was at the start (zero from rest).
- Vortex impulse (J. C. Wu, AIAA J. 19, 1981; P. G. Saffman, Vortex Dynamics, 1992, sec. 3.2),
  split per element with the Kutta-Joukowski forces between the elements' point vortices
  (:class:`unsteady.vortex.elements.ElementImpulseLoads`; derivation in
  tests/validation/test_elements_classical.py): each element's lift by the pressure route and by
  its own impulse agree.
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate
from unsteady.simulation.runner import PrescribedMotion
from unsteady.vortex.elements import build_elements
from unsteady.vortex.panels import build_surface
from unsteady.vortex.solver import VortexSolver

C, U, RHO = 0.2, 10.0, 1.225
WING = {"shape": "naca0012", "thick": True, "chord": C, "elements": 60}
TAIL = {"shape": "naca0009", "thick": True, "chord": 0.5 * C, "elements": 60}


def scenario(elements, pitch=4.0, chords=6.0, ground=None, motion=None, dt=None, duration=None):
    run = {"chords": chords} if dt is None else {"dt": dt, "duration": duration}
    raw = {"flow": {"speed": U, "density": RHO},
           "airfoil": elements if len(elements) > 1 else elements[0],
           "motion": motion or {"pitch": {"law": "constant", "value": pitch}},
           "run": {**run, "start": "impulsive", "wake": "free"},
           "output": {"dir": "/tmp/never-written", "plots": False}}
    if ground is not None:
        raw["ground"] = {"height": ground}
    return load_scenario(raw)


@pytest.mark.parametrize("wing", [WING, {"shape": "naca2412", "chord": C, "elements": 20}],
                         ids=["thick-wing", "camber-wing"])
def test_thick_element_far_behind_a_wing_behaves_as_if_alone(wing):
    # Superposition (common practice, module docstring): a thick tail 100 chords behind the wing;
    # each element's lift is its single-body run's within 0.1 % of its peak, every step after the first.
    tail = dict(TAIL, position=[100.0 * C, 0.0], incidence=-1.5)
    pair = simulate(scenario([wing, tail])).history
    alone_w = simulate(scenario([wing])).history
    dt, end = float(pair["t"][1]), float(pair["t"][-1])
    alone_t = simulate(scenario([{k: v for k, v in TAIL.items()}], pitch=2.5, dt=dt, duration=end)).history
    assert pair["t"].size == alone_w["t"].size
    peak = np.abs(alone_w["cl"][1:]).max()
    assert np.abs(pair["cl_1"][1:] - alone_w["cl"][1:]).max() < 1e-3 * peak
    assert np.abs(pair["cm_1"][1:] - alone_w["cm"][1:]).max() < 1e-3 * peak
    n = min(pair["t"].size, alone_t["t"].size)
    cl_t = pair["cl_2"][:n] * 2.0                          # on the tail's own chord
    peak_t = np.abs(alone_t["cl"][1:n]).max()
    assert np.abs(cl_t[1:n] - alone_t["cl"][1:n]).max() < 1e-3 * peak_t
    # each element's own impulse: the single body's impulse column
    assert np.abs(pair["cl_impulse_1"][1:] - alone_w["cl_impulse"][1:]).max() < 1e-3 * peak


def mirrored(pos, incidence, alpha_deg, height, pivot=0.25):
    """An element's mirror image in a ground ``height`` below the pitch axis: its leading edge in the
    first element's chord axes (from the first's leading edge) and its incidence, at pitch alpha."""
    a = math.radians(alpha_deg)
    p = pivot * C
    xi, zeta = pos[0] - p, pos[1]
    x, z = xi * math.cos(a) + zeta * math.sin(a), -xi * math.sin(a) + zeta * math.cos(a)
    zm = -2.0 * height - z
    xi_m, zeta_m = x * math.cos(a) - zm * math.sin(a), x * math.sin(a) + zm * math.cos(a)
    return [xi_m + p, zeta_m], -2.0 * alpha_deg - incidence


@pytest.mark.parametrize("height", [0.1, 0.3])
def test_thick_pair_with_its_mirror_image_is_the_pair_over_the_ground(height):
    # Method of images (Milne-Thomson 1968; Katz & Plotkin 2001, ground effect): a thick wing and
    # thick tail (symmetric sections, so the mirror image of each is the same section turned the
    # other way) with their mirror images as elements 3 and 4 in free air carry what the pair
    # carries over [ground]: 0.1 % of the peak every step after the first, the mirrors the opposite lift.
    a = 4.0
    tail = dict(TAIL, position=[2.5 * C, 0.4 * C], incidence=-2.0)
    els = [WING, tail]
    for el, pos, inc in ((WING, [0.0, 0.0], 0.0), (tail, tail["position"], tail["incidence"])):
        p, i = mirrored(pos, inc, a, height)
        els.append(dict(el, position=p, incidence=i))
    quad = simulate(scenario(els, pitch=a, chords=4.0)).history
    grd = simulate(scenario([WING, tail], pitch=a, chords=4.0, ground=height)).history
    peak = np.abs(grd["cl"][1:]).max()
    for key in ("cl_1", "cl_2", "cm_1", "cm_2", "cd_1", "cd_2"):
        assert np.abs(quad[key][1:] - grd[key][1:]).max() < 1e-3 * peak, key
    assert np.abs(quad["cl_3"][1:] + grd["cl_1"][1:]).max() < 1e-3 * peak
    assert np.abs(quad["cl_4"][1:] + grd["cl_2"][1:]).max() < 1e-3 * peak
    # the check has teeth: free air is far from the ground result
    free = simulate(scenario([WING, tail], pitch=a, chords=4.0)).history
    assert abs(free["cl"][-1] - grd["cl"][-1]) > 0.05 * abs(grd["cl"][-1])


class Record:
    def __init__(self):
        self.steps = []

    def on_step(self, st):
        self.steps.append(dict(gamma=st.gamma_bound.copy(), gw=st.gamma_wake.copy(), site=st.wake_site.copy()))


def test_kelvin_per_element_thick_wing_camber_tail():
    # Kelvin's theorem (Katz & Plotkin 2001, sec. 2.7), for each element from rest: its bound
    # circulation plus its own wake's stays zero (a thick wing, a camber-line tail, pitching).
    tail = {"shape": "flat", "chord": 0.5 * C, "elements": 12, "position": [3.0 * C, 0.3 * C], "incidence": -3.0}
    sc = scenario([WING, tail], chords=4.0,
                  motion={"pitch": {"law": "sine", "amplitude": 3.0, "reduced_frequency": 0.4, "mean": 2.0}})
    bodies = [build_surface(sc)] + build_elements(sc)[1:]
    rec = Record()
    VortexSolver(bodies, PrescribedMotion(sc.kinematics), speed=U, density=RHO, dt=sc.dt, steps=sc.steps,
                 wake="free", start="impulsive").run([rec])
    n0 = bodies[0].n
    assert n0 == WING["elements"] + 1                       # the panel body's node circulations
    for st in rec.steps[1:]:
        for b, sl in enumerate((slice(0, n0), slice(n0, None))):
            total = st["gamma"][sl].sum() + st["gw"][st["site"] == b].sum()
            assert abs(total) < 1e-10 * U * C, (b, total)
        assert abs(st["gamma"][:n0].sum()) > 1e-3 * U * C     # the wing carries circulation (teeth)


@pytest.mark.parametrize("tail", [
    {"shape": "flat", "chord": 0.5 * C, "elements": 12},
    {"shape": "naca0009", "thick": True, "chord": 0.5 * C, "elements": 60}], ids=["camber-tail", "thick-tail"])
def test_pressure_and_impulse_lift_agree_per_element(tail):
    # Vortex impulse per element (Wu 1981; Saffman 1992, sec. 3.2; with the mutual Kutta-Joukowski
    # forces, module docstring) against each element's pressure-route lift on a pitch oscillation:
    # within 1 % of the element's peak after the impulsive start's first steps.
    wing = dict(WING, elements=160)
    tail = dict(tail, position=[3.0 * C, 0.5 * C], incidence=-3.0)
    h = simulate(scenario([wing, tail], chords=6.0, motion={
        "pitch": {"law": "sine", "amplitude": 3.0, "reduced_frequency": 0.4, "mean": 2.0}})).history
    for i in (1, 2):
        cl, cli = h[f"cl_{i}"][5:], h[f"cl_impulse_{i}"][5:]
        peak = np.abs(cl).max()
        assert peak > 0.1
        assert np.abs(cl - cli).max() < 0.01 * peak, (i, np.abs(cl - cli).max() / peak)
    # the two elements' impulse lifts add up to the assembly's impulse column
    assert np.allclose(h["cl_impulse_1"][3:] + h["cl_impulse_2"][3:], h["cl_impulse"][3:],
                       rtol=0, atol=2e-3 * np.abs(h["cl"]).max())


MIXED = """title = "Thick wing and camber-line tail in a 1-cosine gust (demo)"
[flow]
speed = 10.0
density = 1.225
[[airfoil]]
shape = "naca0012"
thick = true
chord = 0.2
elements = 60
[[airfoil]]
shape = "naca0009"
thick = {tail_thick}
chord = 0.1
elements = {tail_elements}
position = [0.6, 0.05]
incidence = -1.0
[motion]
pitch = {{law = "constant", value = 3.0}}
[gust]
profile = "one-minus-cosine"
amplitude = 1.0
length = 1.0
arrival = 0.01
[run]
chords = 4
"""


@pytest.mark.parametrize("tail_thick", [False, True], ids=["camber-tail", "thick-tail"])
def test_mixed_elements_run_through_the_command_line_with_pictures_and_film(tmp_path, tail_thick):
    # A thick wing with a tail through `unsteady run` (common practice: what the run writes is what
    # the pictures and the film read): the history's per-element columns, the first thick
    # element's Cp in the snapshots, the surface-pressure picture, a film with the pressure line.
    from unsteady.apps.cli import main
    path = tmp_path / "mixed.toml"
    path.write_text(MIXED.format(tail_thick="true" if tail_thick else "false",
                                 tail_elements=40 if tail_thick else 12))
    out = tmp_path / "run"
    assert main(["run", str(path), "--out", str(out), "--quiet"]) == 0
    for name in ("history.csv", "snapshots.npz", "surface-pressure.png", "histories.png", "wake.png"):
        assert (out / name).is_file(), name
    h = np.genfromtxt(out / "history.csv", delimiter=",", names=True)
    for key in ("cl_1", "cl_2", "cl_impulse_1", "cd_impulse_2"):
        assert key in h.dtype.names, key
    assert np.allclose(h["cl"], h["cl_1"] + h["cl_2"], rtol=0, atol=1e-8)   # the csv keeps 10 digits
    snap = np.load(out / "snapshots.npz")
    assert int(snap["cp_element"]) == 1
    assert snap["cp"].shape[1] == 60 and snap["x_surface"].shape == (60,) and snap["z_surface"].shape == (60,)
    # the stagnation point (Cp = 1, Bernoulli; common practice) near the leading edge at the start
    assert 0.9 < float(np.nanmax(snap["cp"][1])) <= 1.05
    film = tmp_path / "film.gif"
    assert main(["animate", str(out), "--out", str(film), "--frames", "3", "--size", "320x180",
                 "--surface-pressure", "--quiet"]) == 0
    assert film.stat().st_size > 1000


def test_cp_of_a_thick_further_element_goes_to_the_snapshots(tmp_path):
    # A camber-line wing with a thick tail: the snapshots carry the tail's Cp (cp_element 2) and the
    # wing's pressure jump; a steady start's stagnation point on the tail (Bernoulli, Cp = 1; common practice).
    from unsteady.apps.cli import main
    text = MIXED.format(tail_thick="true", tail_elements=40).replace(
        'shape = "naca0012"\nthick = true\nchord = 0.2\nelements = 60', 'shape = "naca0012"\nthick = false\nchord = 0.2\nelements = 20')
    path = tmp_path / "tail.toml"
    path.write_text(text)
    out = tmp_path / "run"
    assert main(["run", str(path), "--out", str(out), "--quiet"]) == 0
    snap = np.load(out / "snapshots.npz")
    assert int(snap["cp_element"]) == 2
    assert snap["cp"].shape[1] == 40 and snap["dcp"].shape[1] == 20
    assert 0.9 < float(np.nanmax(snap["cp"][1])) <= 1.05
    assert (out / "surface-pressure.png").is_file()
    film = tmp_path / "film.gif"
    assert main(["animate", str(out), "--out", str(film), "--frames", "2", "--size", "320x180",
                 "--surface-pressure", "--quiet"]) == 0


def test_a_thick_tail_touching_the_ground_stops_the_run_at_its_lower_surface():
    # A nose-up ramp about the wing's quarter chord lowers a thick tail to the ground: the run stops
    # before contact (common practice: the solid ground cannot be entered), and the clearance of its
    # last row is that of the tail's placed outline (its lower surface), not of its camber line.
    from unsteady.inputs.sections import section_from_shape
    from unsteady.inputs.thick import surface_nodes
    tail = dict(TAIL, shape="naca0012", elements=40, position=[2.5 * C, 0.0], incidence=-20.0)   # nose down
    raw = {"flow": {"speed": U, "density": RHO}, "airfoil": [dict(WING, elements=40), tail],
           "motion": {"pivot": 0.25, "pitch": {"law": "ramp", "from": 0.0, "to": 30.0, "start": 0.0,
                                                "duration": 0.1}},
           "ground": {"height": 0.15}, "run": {"chords": 6.0, "wake": "frozen"},
           "output": {"dir": "/tmp/never-written", "plots": False}}
    res = simulate(load_scenario(raw))
    assert res.error and "touch the ground" in res.error
    n = len(res.history["t"])
    assert 1 < n < load_scenario(raw).steps + 1
    a = math.radians(float(res.history["pitch_deg"][-1]))
    x, z = surface_nodes(section_from_shape("naca0012"), 40)
    b = math.radians(tail["incidence"])

    def placed(x, z):                                  # turned about its leading edge, then placed
        return (tail["position"][0] - 0.25 * C + tail["chord"] * (x * math.cos(b) + z * math.sin(b)),
                tail["position"][1] + tail["chord"] * (-x * math.sin(b) + z * math.cos(b)))

    xi, zeta = placed(x, z)
    outline = 0.15 + float((-xi * math.sin(a) + zeta * math.cos(a)).min())
    xi, zeta = placed(x, 0.0 * x)                      # the (straight) camber line
    camber = 0.15 + float((-xi * math.sin(a) + zeta * math.cos(a)).min())
    assert res.history["ground_clearance_m"][-1] == pytest.approx(outline, abs=1e-9)
    assert outline < camber - 1e-3 * C               # the thickness counts


def test_a_flap_on_a_thick_first_element_keeps_working_in_a_list():
    # A 5-degree flap ramp on a thick wing with a camber-line tail (the matrix refactored while the
    # flap moves): each element's pressure lift and its own impulse (Wu 1981; Saffman 1992, sec. 3.2;
    # module docstring) agree within 1 % of the peak, the flap raises the wing's lift (thin-airfoil
    # theory, Glauert 1926: a trailing-edge-down flap adds lift), and the hinge moment is reported.
    tail = {"shape": "flat", "chord": 0.5 * C, "elements": 12, "position": [3.0 * C, 0.25 * C], "incidence": -1.0}
    wing = dict(WING, elements=80, flap_hinge=0.75)
    h = simulate(scenario([wing, tail], chords=4.0, motion={
        "pitch": {"law": "constant", "value": 2.0},
        "flap": {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.01, "duration": 0.02}})).history
    assert h["flap_deg"][-1] == pytest.approx(5.0) and np.isfinite(h["ch"]).all()
    plain = simulate(scenario([dict(WING, elements=80), tail], pitch=2.0, chords=4.0)).history
    assert h["cl_1"][-1] > plain["cl_1"][-1] + 0.1
    for i in (1, 2):
        cl, cli = h[f"cl_{i}"][5:], h[f"cl_impulse_{i}"][5:]
        assert np.abs(cl - cli).max() < 0.01 * np.abs(cl).max(), i
