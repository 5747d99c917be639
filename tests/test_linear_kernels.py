"""The compiled free-heave march of the linear model (unsteady.linear.kernels) against the Python march."""

import numpy as np
import pytest

from unsteady import load_scenario, theory

from unsteady.linear import model as linear
from unsteady.linear.kernels import memory_tail
from unsteady.simulation import models
from unsteady.simulation.runner import simulate

COLUMNS = ("cl", "cd", "cm", "cm_pivot", "cl_c", "cl_nc", "cl_gust", "q34", "h", "h_dot")


def _scenario(start="steady", gusts=None, pitch=True, chords=24):
    # A small made-up drone section in a 1-cosine up-gust, free to heave,
    # with a pitch ramp on top so that every apparent-mass term is exercised.
    d = {"flow": {"speed": 15.0, "density": 1.2},
         "airfoil": {"shape": "naca2412", "chord": 0.25, "elements": 12},
         "aircraft": {"mass": 3.0, "wing_area": 0.55, "aspect_ratio": 8.8},
         "gust": gusts or {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 2.5,
                           "arrival": 0.02},
         "run": {"chords": chords, "start": start, "model": "linear"}}
    if pitch:
        d["motion"] = {"pivot": 0.3, "pitch": {"law": "ramp", "from": 0.0, "to": 2.0,
                                               "start": 0.05, "duration": 0.1, "smoothing": 0.3}}
    return load_scenario(d)


def _march(sc, **options):
    m = models.linear_heave_marcher(sc, **options)
    H = m.run()
    H["n"] = np.asarray(m.motion.n_rows)
    return H


@pytest.mark.parametrize("start", ["steady", "impulsive"])
def test_compiled_march_equals_python_march(start):
    # The Python march of LinearMarcher (one row at a time through
    # HeaveMotion.after_step) is the oracle: with a window of the whole run
    # the compiled march must repeat it to round-off (common practice).  Both
    # take the apparent-mass terms and the heave step from their one copy
    # (theory.apparent_mass, kernels.heave_step: checked on their own in
    # tests/validation/test_linear_classical.py and tests/test_aircraft.py);
    # what this compares is the rest: the windowed Duhamel sums, the order of
    # the row's steps, the backward difference of h', the load sums.
    sc = _scenario(start)
    ref = _march(sc, compiled=False)
    fast = _march(sc, s_max=1e9)
    for k in COLUMNS + ("n",):
        scale = max(1.0, float(np.max(np.abs(ref[k]))))
        assert np.max(np.abs(fast[k] - ref[k])) < 1e-12 * scale, k
    assert ref["n"].max() > 1.3          # a real encounter, not a flat line


def test_streamwise_gust_and_summed_gusts_match():
    sc = _scenario(gusts=[{"profile": "one-minus-cosine", "amplitude": 2.0, "length": 2.5,
                           "arrival": 0.02},
                          {"profile": "sine", "amplitude": 1.0, "wavelength": 1.5,
                           "direction": "streamwise"}], pitch=False)
    ref = _march(sc, compiled=False)
    fast = _march(sc, s_max=1e9)
    for k in ("cl", "cm", "h", "n"):
        assert np.max(np.abs(fast[k] - ref[k])) < 1e-12 * max(1.0, np.max(np.abs(ref[k]))), k


def test_memory_tail_matches_the_tabulated_weights():
    # 1 - W_m from the exact tables (branch-cut integrals of unsteady.theory,
    # checked there against Garrick's integrals, NACA Report 629, 1938)
    # against the exponential sum, for lags of M .. 100 M; the tables are
    # exact to about 1e-9.
    for name in ("wagner", "kuessner"):
        for ds, M in ((0.05, 40), (1.0 / 6.0, 300)):
            n = 100 * M
            W = linear.indicial_weights(name, ds, n)
            coef, decay = memory_tail(name, ds, M, n * ds)
            m = np.arange(M, n, 7)
            D = (coef[None, :] * decay[None, :] ** (m - M)[:, None]).sum(axis=1)
            exact = 1.0 - W[m]
            assert np.max(np.abs(D / exact - 1.0)) < 5e-9, (name, ds)


def test_deficit_decays_like_one_over_s():
    # Both kernels of the branch-cut integrals tend to 1 as x -> 0, so
    # 1 - r(s) ~ 1/s far downstream (unsteady.theory, module notes): the
    # reason a plain truncation of the memory loses ~x/s_max.
    s = np.array([1e3, 1e4])
    for fn in (theory.wagner, theory.kuessner):
        assert np.allclose(s * (1.0 - fn(s)), 1.0, atol=0.02)


def test_window_and_tail_effect_on_peak_load_factor():
    # 48 chords (96 semichords) with a 4-semichord window: the tail keeps
    # n_max to 1e-9 of the whole-memory result (measured: 6e-11 of dn);
    # dropping the far memory instead reads older inputs as settled and
    # raises dn by 22 % (measured). Common practice of convolution sums.
    sc = _scenario(chords=48)
    whole = _march(sc, s_max=1e9)["n"]
    tail = _march(sc, s_max=4.0)["n"]
    cut = _march(sc, s_max=4.0, tail=False)["n"]
    dn = whole.max() - 1.0
    assert abs(tail.max() - whole.max()) < 1e-9 * dn
    assert np.max(np.abs(tail - whole)) < 1e-9 * dn
    assert abs(cut.max() - whole.max()) > 1e3 * abs(tail.max() - whole.max())


def test_scenario_run_uses_the_compiled_march():
    # simulate() with [aircraft] fills n, height_accel_m_s2, w_gust and the summary as
    # before; its rows equal the Python march's (default window, tail on).
    sc = _scenario()
    res = simulate(sc)
    ref = _march(sc, compiled=False)
    for k, col in (("cl", "cl"), ("h", "height_m"), ("n", "n")):
        assert np.max(np.abs(res.history[col] - ref[k])) < 1e-9, k
    for k in ("n_max", "n_min", "t_n_max", "alpha_trim_deg", "dn_formula"):
        assert k in res.summary
    assert res.summary["n_max"] == pytest.approx(ref["n"].max(), abs=1e-9)
    assert np.all(np.isfinite(res.history["w_gust"])) and np.all(np.isfinite(res.history["height_accel_m_s2"]))
