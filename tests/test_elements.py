"""Several elements: placing, combining loads, the crossing guard, the scenario round trip."""

import math

import numpy as np

from unsteady import load_scenario
from unsteady.vortex.bodies import Body, to_inertial
from unsteady.vortex.elements import CrossingGuard, combine_loads, place_element

C = 0.2


def flat(n=8, chord=C, pivot=0.0):
    x = 0.5 * (1.0 - np.cos(np.pi * np.arange(n + 1) / n))
    return Body.from_nodes(x, 0.0 * x, chord, pivot)


def test_place_element_turns_nose_up_about_its_leading_edge():
    # a nose-up incidence puts the trailing edge below the leading edge (the body frame's convention)
    b = place_element(flat(chord=0.1), math.radians(10.0), [0.5, 0.02], 0.25 * C)
    assert math.isclose(b.xi_0[0], 0.5 - 0.05) and math.isclose(b.zeta_0[0], 0.02)
    assert math.isclose(b.xi_te, 0.45 + 0.1 * math.cos(math.radians(10.0)))
    assert math.isclose(b.zeta_te, 0.02 - 0.1 * math.sin(math.radians(10.0)))
    assert np.allclose(np.hypot(b.n_xi, b.n_zeta), 1.0)


def test_combined_moment_transfers_by_the_arms():
    # common practice (statics): a body's own row, moved to the reference chord and point; one body
    # alone gives back its row, and the moment about the reference point follows M_R = M_P - (z_R - h) Fx + x_R Fz
    ref = flat(pivot=0.25)
    row = {"cl": 0.5, "cd": 0.02, "cm_pivot": -0.01, "gamma_bound_m2_s": -1.0, "gamma_wake_m2_s": 1.0}
    out = combine_loads([row, dict(row)], [ref, ref], math.radians(5.0), 0.1)
    assert math.isclose(out["cl"], 1.0) and math.isclose(out["cl_1"], 0.5)
    x_r, z_r = to_inertial(ref.xi_ref, ref.zeta_ref, math.radians(5.0), 0.1)
    assert math.isclose(out["cm_1"], -0.01 - (z_r - 0.1) / C * 0.02 + x_r / C * 0.5)


def test_crossing_guard_mirrors_a_vortex_that_stepped_through():
    b = flat(chord=C, pivot=0.25)
    g = CrossingGuard([b])
    x, z = np.array([0.05, 0.3]), np.array([0.01, 0.01])     # one over the plate, one behind it
    sides = g.before(x, z, 0.0, 0.0)
    x2, z2 = x.copy(), np.array([-0.004, -0.004])            # both step down by 14 mm
    g.after(x2, z2, 0.0, 0.0, sides)
    assert math.isclose(z2[0], 0.004) and z2[1] == -0.004     # only the one over the chord is put back


def test_elements_round_trip_through_toml():
    import tomllib
    raw = {"flow": {"speed": 10.0, "density": 1.2},
           "airfoil": [{"shape": "flat", "chord": C, "elements": 10},
                       {"shape": "naca0012", "chord": 0.1, "elements": 8, "position": [0.6, 0.05], "incidence": -2}],
           "run": {"chords": 2}, "output": {"plots": False}}
    sc = load_scenario(raw)
    again = load_scenario(tomllib.loads(sc.to_toml()))
    assert again.data == sc.data


def _single_and_pair_runs():
    from unsteady import simulate
    base = {"flow": {"speed": 10.0, "density": 1.2}, "run": {"chords": 1.5, "wake": "free"},
            "motion": {"pitch": {"law": "ramp", "from": 0.0, "to": 20.0, "start": 0.0, "duration": 0.02}},
            "output": {"plots": False}}
    wing = {"shape": "naca2412", "chord": C, "elements": 12}
    singles = [dict(base, airfoil=wing), dict(base, airfoil=dict(wing, lesp_critical=0.1)),
               dict(base, airfoil=wing, ground={"height": 0.1}), dict(base, airfoil=dict(wing, flap_hinge=0.75))]
    pair = dict(base, airfoil=[wing, {"shape": "flat", "chord": 0.5 * C, "elements": 6,
                                      "position": [2.5 * C, 0.0], "incidence": 0.0}])
    return simulate, singles, pair


def test_single_elements_never_take_the_cross_core_path(monkeypatch):
    # Histories are bit-sensitive (the free wake is chaotic; common practice of this project, DEVELOPERS.md):
    # the cross cores and the once-per-pair wake sum of several elements must never run for one element,
    # whatever else it has (leading-edge shedding, a ground, a flap); two elements do take them.
    from unsteady.vortex import kernels
    simulate, singles, pair = _single_and_pair_runs()
    calls = []

    def spy(name):
        real = getattr(kernels, name)

        def wrapped(*a, **k):
            calls.append(name)
            return real(*a, **k)
        return wrapped

    for name in ("induced_velocity_grouped", "normal_influence_grouped", "wake_self_velocity"):
        monkeypatch.setattr(kernels, name, spy(name))
    for raw in singles:
        simulate(load_scenario(raw))
    assert calls == []
    simulate(load_scenario(pair))
    assert {"induced_velocity_grouped", "normal_influence_grouped", "wake_self_velocity"} <= set(calls)


def test_cross_cores_own_element_small_other_elements_their_spacing():
    # a wake vortex meets its own element through r_b, another element b through max(r_c, 2 c_b / N_b)
    # (vortex blob of about b's bound-vortex spacing; common practice), the same both ways (one table
    # entry serves the vortex on b's points and b's bound vortices on the vortex); images count as
    # another element's; soft (leading-edge) vortices take r_soft on their own element
    from unsteady.vortex.elements import CrossCores
    wing, tail = flat(20, C), flat(5, 0.4 * C)
    r_c, r_b, r_soft = 0.004, 0.0004, 0.02
    cc = CrossCores([wing, tail], [0, 1], r_c, r_b, r_soft)
    r = cc.core4 ** 0.25
    ri = cc.core4_img ** 0.25
    assert np.allclose(cc.r_x, [max(r_c, 2 * C / 20), max(r_c, 2 * 0.4 * C / 5)])
    assert np.allclose(r[:, :2], [[r_b, 2 * C / 20], [2 * 0.4 * C / 5, r_b]])
    assert np.allclose(ri[:, :2], [[2 * C / 20] * 2, [2 * 0.4 * C / 5] * 2])
    assert np.allclose(r[:, 2:], [[r_soft, max(r_soft, 2 * C / 20)], [max(r_soft, 2 * 0.4 * C / 5), r_soft]])
    assert list(cc.wake_groups(np.array([0, 1, 1, 0]), soft=np.array([3]))) == [0, 1, 1, 2]
