"""Quasi-steady reference, lag metrics and validity flag (unsteady.lag)."""

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from unsteady import load_scenario, theory

from unsteady.analysis import lag
from unsteady.simulation.runner import simulate


def _sc(pitch, model="linear", chords=30.0, shape="flat", elements=40, plunge=None, **run):
    motion = {"pivot": 0.25, "pitch": pitch}
    if plunge is not None:
        motion["plunge"] = plunge
    return load_scenario({"flow": {"speed": 18.0, "density": 1.2},
                          "airfoil": {"shape": shape, "chord": 0.2, "elements": elements},
                          "motion": motion,
                          "run": {"chords": chords, "model": model, **run}})


def test_step_lag_equals_wagner():
    # H. Wagner, ZAMM 5 (1925): after a step, cl / cl_final = phi(s), so t50 = 0
    # (phi(0) = 1/2) and t90 = s90 c / (2U) with phi(s90) = 0.9; the
    # quasi-steady cl jumps at once (t50_qs = t90_qs = 0).
    sc = _sc({"law": "step", "value": 3.0, "time": 0.01})
    res = simulate(sc)
    L = res.summary["lag"]
    s90 = brentq(lambda s: theory.wagner(s) - 0.9, 0.1, 100.0)
    t90 = s90 * sc.chord / (2 * sc.speed)
    # one time step of slack: the sampled step rises over one interval
    assert L["t90"] == pytest.approx(t90, abs=sc.dt)
    assert L["t50"] == pytest.approx(0.0, abs=sc.dt)
    assert L["t90_qs"] == pytest.approx(0.0, abs=sc.dt)
    assert L["delay90"] == pytest.approx(L["t90"] - L["t90_qs"])
    assert L["delay90_chords"] == pytest.approx(L["delay90"] * sc.speed / sc.chord)
    assert L["validity"]["attached_flow_ok"]


def test_quasi_steady_column_is_thin_airfoil_lift():
    # Abbott & von Doenhoff (1959) ch. 4: cl = 2 pi (alpha - alpha_L0); with a
    # constant pitch rate about the quarter chord the 3/4-chord angle adds
    # b (1/2 - a) alpha_dot / U = c alpha_dot / (2U) (Theodorsen, NACA Report 496).
    sc = _sc({"law": "ramp", "from": 0.0, "to": 4.0, "start": 0.01, "duration": 0.02},
             shape="naca2412", chords=5)
    res = simulate(sc)
    h = res.history
    a_L0 = theory.zero_lift_angle(sc.section.slope, breaks=(0.4,))
    alpha = np.radians(h["pitch_deg"])
    ad = np.radians(h["pitch_rate_deg_s"])
    expect = 2 * np.pi * (alpha + sc.chord * ad / (2 * sc.speed) - a_L0)
    assert np.allclose(h["cl_quasi_steady"], expect, atol=1e-9)
    assert np.allclose(h["alpha_eff_deg"], np.degrees(expect / (2 * np.pi) + a_L0))
    assert res.summary["lag"]["peak_pitch_rate"] == pytest.approx(
        np.max(np.abs(ad)) * sc.chord / (2 * sc.speed))


def test_periodic_metrics_match_theodorsen():
    # Pure pitch about the quarter chord at k: the quasi-steady cl is
    # 2 pi (1 + i k) alpha_hat, the model's cl Theodorsen's (NACA Report 496),
    # so amplitude ratio and phase lag follow from theory.theodorsen_loads.
    k = 0.3
    sc = _sc({"law": "sine", "amplitude": 2.0, "reduced_frequency": k}, chords=60)
    L = simulate(sc).summary["lag"]
    a_hat = np.radians(2.0) * (-1j)          # sin(omega t) = Re[-i e^{i omega t}]
    cl_ref, _ = theory.theodorsen_loads(k, a_hat, 0.0, 0.25)
    qs_ref = 2 * np.pi * (1 + 1j * k) * a_hat
    assert L["amplitude_ratio"] == pytest.approx(abs(cl_ref) / abs(qs_ref), rel=0.005)
    assert L["phase_lag_deg"] == pytest.approx(-np.degrees(np.angle(cl_ref / qs_ref)), abs=0.5)
    # loop area = pi |cl_hat| |alpha_hat| sin(phase of cl behind alpha) (an ellipse; common practice)
    phase = np.angle(cl_ref / a_hat)
    area = -np.pi * abs(cl_ref) * 2.0 * np.sin(phase)
    assert L["loop_area"] == pytest.approx(area, rel=0.02)


def test_validity_flag_trips():
    v = lag.validity([0.0, 20.0], [0.0, 0.01])
    assert not v["attached_flow_ok"] and "effective angle" in v["reasons"][0]
    v = lag.validity([0.0, 5.0], [0.0, 0.2])
    assert not v["attached_flow_ok"] and "pitch rate" in v["reasons"][0]
    assert lag.validity([1.0, 5.0], [0.0, 0.01])["attached_flow_ok"]


def test_crossing_time_ignores_early_spike():
    t = np.arange(6.0)
    y = np.array([0.0, 2.0, 0.2, 0.6, 0.95, 1.0])   # spike then a slow rise
    assert lag.crossing_time(t, y, 0.0, 1.0, 0.5) == pytest.approx(2.75)
    assert math.isnan(lag.crossing_time(t, y, 0.0, 0.0, 0.5))


def test_rounded_fast_ramp_lags_like_a_step():
    # Pitching about the three-quarter chord, the circulatory lift sees the
    # angle alone (Theodorsen, NACA Rep. 496: the rate term b (1/2 - a) alpha'
    # vanishes at a = 1/2), so a very fast rounded ramp (1 ms rise, 0.2 ms
    # rounding) lags like a step (Wagner 1925): t90 within 2 ms of the step's
    # s90 c / (2U), although its apparent-mass rise starts before t_begin.
    sc = _sc({"law": "ramp", "from": 0.0, "to": 3.0, "start": 0.01, "duration": 0.001,
              "smoothing": 0.0002})
    sc = sc.with_overrides({"motion.pivot": 0.75})
    L = simulate(sc).summary["lag"]
    s90 = brentq(lambda s: theory.wagner(s) - 0.9, 0.1, 100.0)
    assert L["t90"] == pytest.approx(s90 * sc.chord / (2 * sc.speed), abs=0.002)


@pytest.mark.parametrize("pivot", [0.0, 0.25, 0.5, 0.75, 1.0])
def test_effective_angle_is_the_three_quarter_chord_normal_velocity(pivot):
    # Theodorsen, NACA Report 496 (1935): alpha_eff = alpha - h'/U + b (1/2 - a) alpha'/U + w/U.
    # With b (1/2 - a) = (3/4 - pivot) c this is the upwash at the 3/4-chord point of a rigid
    # chord turning about its pivot (velocity = rate x distance: common practice), over U.
    U, c = 12.0, 0.3
    alpha, alpha_dot, h_dot, w = 0.05, 2.0, 0.4, 0.9
    expect = alpha + ((0.75 - pivot) * c * alpha_dot - h_dot + w) / U
    got = theory.effective_angle(alpha, alpha_dot, h_dot, U, c, pivot, w)
    assert float(got) == pytest.approx(expect, rel=1e-14)
    assert float(theory.effective_angle(alpha, alpha_dot, h_dot, U, c, pivot)) == pytest.approx(expect - w / U)


@pytest.mark.parametrize("model", ["linear", "vortex"])
def test_summary_peak_effective_angle_is_the_column_peak(model):
    # one definition behind the column, the summary key and the lag block (a 1-cosine gust
    # during a pitch ramp, so the pitch rate and the gust both count)
    sc = load_scenario({"flow": {"speed": 15.0, "density": 1.2},
                        "airfoil": {"shape": "flat", "chord": 0.25, "elements": 12},
                        "motion": {"pivot": 0.25, "pitch": {"law": "ramp", "from": 0.0, "to": 3.0,
                                                             "start": 0.01, "duration": 0.03}},
                        "gust": {"profile": "one-minus-cosine", "amplitude": 1.5, "length": 1.0,
                                 "arrival": 0.02},
                        "run": {"chords": 8, "model": model, "wake": "frozen"}})
    res = simulate(sc)
    col = res.history["alpha_eff_deg"]
    assert res.summary["alpha_eff_max_deg"] == float(np.max(np.abs(col)))
    assert abs(res.summary["lag"]["peak_effective_alpha_deg"]) == res.summary["alpha_eff_max_deg"]
    # and it is the 3/4-chord angle, not a leading-edge one: the gust peak (1.5 m/s) adds
    # about 1.5/15 rad on top of the 3 degree pitch
    assert 3.0 + 0.8 * math.degrees(0.1) < res.summary["alpha_eff_max_deg"] < 3.0 + 1.2 * math.degrees(0.1)


def test_null_lag_metrics_say_why():
    """A null t90 or periodic metric comes with its reason in the summary (the trust issue)."""
    import unsteady
    flat = {"flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.2, "elements": 12}}
    ramp = unsteady.simulate(unsteady.load_scenario({**flat, "run": {"chords": 3}, "motion": {
        "pitch": {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.0, "duration": 0.05, "smoothing": 0.005}}}))
    lag = ramp.summary["lag"]
    assert lag["t90"] is None and "t90 null" in lag["note"] and "run.duration" in lag["note"]
    sine = unsteady.simulate(unsteady.load_scenario({**flat, "run": {"chords": 2}, "motion": {
        "pitch": {"law": "sine", "amplitude": 2.0, "reduced_frequency": 0.2}}}))
    lag = sine.summary["lag"]
    assert lag["amplitude_ratio"] is None and "shorter than two periods" in lag["note"]
