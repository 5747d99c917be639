"""Tests of unsteady.gusts: profiles, the frozen field, the [gust] check and streamwise gusts."""

import math
import subprocess
import sys

import numpy as np
import pytest

import unsteady
from unsteady.inputs import gusts
from unsteady.inputs.scenario import ScenarioError


def _sc(gust, speed=10.0, chord=0.5, elements=8, chords=4.0, **run):
    return unsteady.load_scenario({
        "flow": {"speed": speed, "density": 1.2},
        "airfoil": {"shape": "flat", "chord": chord, "elements": elements},
        "run": {"chords": chords, **run},
        "gust": gust,
    })


def _field(gust, **kw):
    return gusts.build_gust_field(_sc(gust, **kw))


def test_one_minus_cosine_shape():
    # Pratt & Walker (NACA Report 1206): w = (A/2)(1 - cos(2 pi xi / H)) on 0 <= xi <= H
    p = _field({"profile": "one-minus-cosine", "amplitude": 3.0, "length": 2.0}).profiles[0]
    xi = np.array([-0.1, 0.0, 0.5, 1.0, 1.5, 2.0, 2.1])
    expect = [0.0, 0.0, 1.5, 3.0, 1.5, 0.0, 0.0]
    assert p(xi) == pytest.approx(expect, abs=1e-12)


def test_frozen_pattern_penetration():
    # the pattern moves with the air at U: a point d metres aft of the leading
    # edge meets the same gust velocity d/U later (Kuessner's penetration;
    # common practice)
    U, arrival = 10.0, 0.2
    f = _field({"profile": "one-minus-cosine", "amplitude": 1.0, "length": 5.0, "arrival": arrival})
    x_le = -0.25 * 0.5
    t = arrival + 0.05
    _, w_le = f.velocity(np.array([x_le]), np.zeros(1), t)
    _, w_aft = f.velocity(np.array([x_le + 0.5]), np.array([0.3]), t + 0.5 / U)
    assert w_le[0] > 0
    assert w_aft[0] == pytest.approx(w_le[0], rel=1e-12)
    # the front reaches the leading edge at `arrival`: a point aft is not in the gust yet
    _, w_front = f.velocity(np.array([x_le, x_le + 0.3]), np.zeros(2), arrival + 0.01)
    assert w_front[0] > 0 and w_front[1] == 0.0


def test_sine_wavelength_from_reduced_frequency():
    # k = omega c / (2U) = pi c / lambda (Sears 1941 notation)
    p = _field({"profile": "sine", "amplitude": 1.0, "reduced_frequency": 0.5}).profiles[0]
    assert p.wavelength == pytest.approx(math.pi * 0.5 / 0.5)
    assert p(np.array([p.wavelength / 4]))[0] == pytest.approx(1.0)


def test_gusts_sum_and_directions():
    f = _field([{"profile": "sharp-edged", "amplitude": 1.0},
                {"profile": "sharp-edged", "amplitude": 2.0},
                {"profile": "sharp-edged", "amplitude": 0.5, "direction": "streamwise"}])
    u, w = f.velocity(np.array([-5.0]), np.zeros(1), 1.0)
    assert w[0] == pytest.approx(3.0)
    assert u[0] == pytest.approx(0.5)


def test_table_gust(tmp_path):
    (tmp_path / "g.csv").write_text("x,w\n0,0\n1,2\n2,0\n")
    sc = unsteady.load_scenario({
        "flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.5},
        "run": {"chords": 2}, "gust": {"profile": "table", "file": "g.csv"}}, base_dir=tmp_path)
    p = gusts.build_gust_field(sc).profiles[0]
    assert p(np.array([0.5, 1.0, 3.0])) == pytest.approx([1.0, 2.0, 0.0])


@pytest.mark.parametrize("text, words", [
    ("x,w\n0,0\n1,abc\n2,0\n", "row 2 (line 3) of 'g.csv': 'abc' in column w is not a number"),
    ("# a comment\nx,w\n0,0\n1\n", "row 2 (line 4) of 'g.csv': an empty cell in column w"),
    ("x,w\n0,0\n1,1\n0.5,0\n", "row 3 (line 4) of 'g.csv': x = 0.5 does not come after x = 1"),
    ("dist,w\n0,0\n1,1\n", "no column 'x'"),
    ("x,w\n-1,0\n1,1\n", "x starts at -1"),
])
def test_bad_gust_table_names_file_row_and_line(tmp_path, text, words):
    # the same reader as the motion table law (unsteady.inputs.tables)
    (tmp_path / "g.csv").write_text(text)
    with pytest.raises(ScenarioError) as exc:
        unsteady.load_scenario({
            "flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.5},
            "run": {"chords": 2}, "gust": {"profile": "table", "file": "g.csv"}}, base_dir=tmp_path)
    lines = [p.line() for p in exc.value.problems]
    assert len(lines) == 1 and ": gust.file: " in lines[0] and words in lines[0], lines


@pytest.mark.parametrize("gust, key, words", [
    ({"profile": "one-minus-cosine", "amplitude": 1.0, "length": 0.0}, "gust.length", "> 0"),
    ({"profile": "one-minus-cosine", "amplitude": -1.0, "length": 2.0}, "gust.amplitude", "> 0"),
    ({"profile": "one-minus-cosine", "amplitude": float("nan"), "length": 2.0}, "gust.amplitude", "finite"),
    ({"profile": "one-minus-cosin", "amplitude": 1.0}, "gust.profile", "one-minus-cosine"),
    ({"profile": "turbulence", "spectrum": "kolmogorov", "intensity": 1.0, "scale_length": 10.0},
     "gust.spectrum", "dryden"),
    ({"profile": "turbulence", "spectrum": "dryden", "intensity": 0.0, "scale_length": 10.0},
     "gust.intensity", "> 0"),
    ({"profile": "turbulence", "spectrum": "dryden", "intensity": 1.0, "scale_length": -3.0},
     "gust.scale_length", "> 0"),
    ({"profile": "sine", "amplitude": 1.0}, "gust.wavelength", "exactly one"),
    ({"profile": "sharp-edged", "amplitude": 1.0, "direction": "sideways"}, "gust.direction", "streamwise"),
    ({"profile": "table", "file": "missing.csv"}, "gust.file", "not found"),
])
def test_bad_gust_input(gust, key, words):
    with pytest.raises(ScenarioError) as exc:
        _sc(gust)
    lines = [p.line() for p in exc.value.problems]
    assert any(f": {key}: " in ln and words in ln for ln in lines), lines


def test_list_keys_are_indexed():
    with pytest.raises(ScenarioError) as exc:
        _sc([{"profile": "sharp-edged", "amplitude": 1.0}, {"profile": "sharp-edged", "amplitude": 0}])
    assert any(p.key == "gust[1].amplitude" for p in exc.value.problems)


def test_strong_gust_warns_not_fails():
    # 8 / 10 rad = 46 degrees at the 3/4 chord (Theodorsen, NACA Report 496) > 30: a warning, the scenario still loads
    sc = _sc({"profile": "one-minus-cosine", "amplitude": 8.0, "length": 2.0})
    assert len(sc.warnings) == 1
    assert sc.warnings[0].startswith("warning: <dict>: gust.amplitude: ")
    assert "30" in sc.warnings[0]
    assert _sc({"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.0}).warnings == ()


def test_cli_prints_warning_and_check_passes(tmp_path):
    f = tmp_path / "strong.toml"
    f.write_text('[flow]\nspeed = 10.0\ndensity = 1.2\n[airfoil]\nchord = 0.5\n[run]\nchords = 2\n'
                 '[gust]\nprofile = "sharp-edged"\namplitude = 9.0\n')
    p = subprocess.run([sys.executable, "-m", "unsteady", "check", str(f)], capture_output=True, text=True)
    assert p.returncode == 0
    assert p.stderr.startswith(f"warning: {f}: gust.amplitude: ")
    f.write_text(f.read_text().replace("9.0", "0.0"))
    p = subprocess.run([sys.executable, "-m", "unsteady", "check", str(f)], capture_output=True, text=True)
    assert p.returncode == 2
    assert p.stderr.strip().splitlines()[-1].startswith(f"error: {f}: gust.amplitude: must be > 0")


def test_turbulence_field_is_one_realisation_without_repetition():
    # spectral synthesis on a period longer than the run (common practice):
    # no repetition within the run: the correlation at lags beyond 20 scale
    # lengths stays small
    L, dx, length = 2.0, 0.05, 400.0
    w = gusts.turbulence_samples("dryden", 1.0, L, length, dx, 7)
    assert w.size == int(math.ceil(length / dx)) + 1
    w = w - w.mean()
    n = w.size
    spec = np.fft.rfft(w, 2 * n)
    acf = np.fft.irfft(spec * np.conj(spec))[:n] / np.arange(n, 0, -1)
    acf /= acf[0]
    lags = np.arange(n) * dx
    window = (lags > 20 * L) & (lags < length / 2)
    assert np.max(np.abs(acf[window])) < 0.25


def test_turbulence_profile_reproducible_from_seed():
    g = {"profile": "turbulence", "spectrum": "von-karman", "intensity": 1.0, "scale_length": 20.0, "seed": 5}
    a = _field(g).profiles[0]
    b = _field(g).profiles[0]
    assert np.array_equal(a.samples, b.samples)
    assert a.dx == pytest.approx(min(0.5 / 16, 20.0 / 200))
    c = _field({**g, "seed": 6}).profiles[0]
    assert not np.array_equal(a.samples, c.samples)


def test_uniform_streamwise_gust_scales_cl_by_speed_ratio_squared():
    # cl stays normalised by the mean speed U: a uniform streamwise gust du on
    # a steady airfoil settles at cl0 (1 + du/U)^2 (Kutta-Joukowski, common practice)
    U, du = 10.0, 1.0
    base = {"flow": {"speed": U, "density": 1.2},
            "airfoil": {"shape": "flat", "chord": 0.5, "elements": 8},
            "motion": {"pitch": {"law": "constant", "value": 3.0}},
            "run": {"chords": 20, "wake": "free"}}
    cl0 = unsteady.simulate(unsteady.load_scenario({**base, "run": {"chords": 1}})).history["cl"][-1]
    res = unsteady.simulate(unsteady.load_scenario(
        {**base, "gust": {"profile": "sharp-edged", "amplitude": du, "direction": "streamwise",
                          "arrival": 0.01}}))
    assert res.history["u_gust"][-1] == pytest.approx(du)
    assert res.history["cl"][-1] == pytest.approx(cl0 * (1 + du / U) ** 2, rel=0.01)


def test_gust_run_columns_and_summary():
    res = unsteady.simulate(_sc({"profile": "one-minus-cosine", "amplitude": 1.0, "length": 1.0,
                                 "arrival": 0.01}))
    h = res.history
    for k in ("w_gust", "u_gust", "alpha_eff_deg"):
        assert k in h and np.isfinite(h[k]).all()
    assert np.max(h["w_gust"]) == pytest.approx(1.0, abs=0.01)
    assert res.summary["w_gust_max"] == pytest.approx(np.max(h["w_gust"]))
    assert res.summary["gust_profiles"] == ["one-minus-cosine"]


def test_effective_angle_warning_counts_the_pitch_rate():
    # the check-time estimate is the 3/4-chord angle of thin-airfoil theory
    # (Theodorsen, NACA Report 496): a quick pitch-up about the quarter chord adds
    # c alpha_dot / (2 U) = 0.5 * 17.5 / 20 rad = 25 deg on top of 10 deg of pitch and
    # 3/10 rad = 17 deg of gust: warned, though pitch and gust alone stay under 30 deg
    base = {"flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.5},
            "run": {"chords": 2},
            "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 2.0}}
    calm = unsteady.load_scenario({**base, "motion": {"pitch": {"law": "constant", "value": 10.0}}})
    assert calm.warnings == ()
    quick = unsteady.load_scenario({**base, "motion": {"pitch": {
        "law": "ramp", "from": 0.0, "to": 10.0, "start": 0.01, "duration": 0.01}}})
    angle = [w for w in quick.warnings if "effective angle" in w]
    assert len(angle) == 1 and "about 52 degrees" in angle[0]


def test_sharp_edged_front_crosses_the_chord_smoothly():
    """Issue: a sharp-edged front made n jump by about 0.6 between steps while it crossed the chord.

    Reference: the linear model's exact Kuessner response (H. G. Kuessner,
    Luftfahrtforschung 13, 1936; the project's tabulated indicial function)
    sampled at the same step, whose largest step change is finite only
    because the step is: the vortex model may not change faster than it
    by more than a fifth, and its largest step change shrinks with the step.
    """
    from pathlib import Path
    scenario = Path(__file__).resolve().parents[1] / "scenarios" / "drone-gust-1cos.toml"

    def largest_step_change(model, elements):
        sc = unsteady.load_scenario(scenario, overrides={
            "gust": {"profile": "sharp-edged", "amplitude": 3.0, "arrival": 0.02},
            "run.duration": 0.08, "airfoil.elements": elements, "run.model": model})
        n = unsteady.simulate(sc).history["n"]
        return float(np.abs(np.diff(n)).max()), float(np.abs(np.diff(n, 2)).max())

    (coarse, bend), (fine, _) = largest_step_change("vortex", 40), largest_step_change("vortex", 80)
    assert bend < 0.1          # it was 0.93: the step change itself alternated in sign
    assert coarse < 1.2 * largest_step_change("linear", 40)[0]
    assert fine < 1.2 * largest_step_change("linear", 80)[0]
    assert fine < coarse
