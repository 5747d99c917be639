"""Where the model is out of its depth, the user is told: check-time estimates and measured warnings.

Limits are common practice (attached flow to about 12 degrees, a section's
maximum lift about 1.5; see unsteady.analysis.verdict); the checks below test
that a gentle case gets no warning and that each kind of trouble gets its
one line, naming the file and the key, on stderr, in the summary and in the
scenario's warnings.
"""

import json
import subprocess
import sys
from pathlib import Path


import unsteady

ROOT = Path(__file__).resolve().parents[1]
BASE = {"flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.2, "elements": 16},
        "run": {"chords": 4}}


def _run(extra):
    sc = unsteady.load_scenario({**BASE, **extra})
    return sc, unsteady.simulate(sc)


def _keys(lines):
    return [w.split(": ", 3)[2] for w in lines]


def test_gentle_case_has_no_warning():
    sc, res = _run({"motion": {"pitch": {"law": "ramp", "from": 0.0, "to": 4.0, "start": 0.01,
                                         "duration": 0.05, "smoothing": 0.01}}})
    assert sc.warnings == ()
    assert "warnings" not in res.summary


def test_beyond_attached_flow_is_measured_and_said():
    # a 45-degree pitch-up in 0.08 s: 45 degrees is far past any section's stall (common practice)
    sc, res = _run({"motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.01,
                                                       "duration": 0.08, "smoothing": 0.01}}})
    assert _keys(sc.warnings) == ["motion.pitch"] and "effective angle" in sc.warnings[0]
    measured = [w for w in res.summary["warnings"] if w not in sc.warnings]
    texts = " | ".join(measured)
    assert "effective angle of attack reached" in texts
    assert "reduced pitch rate" in texts
    assert "lift coefficient reached" in texts
    assert all(w.startswith("warning: <dict>: ") for w in measured)


def test_instantaneous_motion_is_warned_at_check():
    sc = unsteady.load_scenario({**BASE, "motion": {"pitch": {"law": "step", "value": 2.0, "time": 0.02}}})
    assert len(sc.warnings) == 1 and "changes instantly at t = 0.02 s" in sc.warnings[0]


def test_reversed_flow_is_warned_at_check_and_measured():
    sc, res = _run({"gust": {"profile": "sine", "amplitude": 12.0, "wavelength": 0.4,
                             "direction": "streamwise"}})
    assert any("reverses the flow" in w and ": gust.amplitude: " in w for w in sc.warnings)
    assert any("meets the section from behind" in w for w in res.summary["warnings"])
    # a one-signed streamwise gust only adds to the stream: no reversed-flow warning
    calm = unsteady.load_scenario({**BASE, "gust": {"profile": "sharp-edged", "amplitude": 12.0,
                                                    "direction": "streamwise"}})
    assert not any("reverses" in w for w in calm.warnings)


def test_unresolved_flow_is_warned():
    # a plunge of 3 chords at k = 2 (the trouble case of the trust issue): frozen wake
    sc, res = _run({"run": {"chords": 4, "wake": "frozen"},
                    "motion": {"plunge": {"law": "sine", "amplitude": 0.6, "reduced_frequency": 2.0}}})
    lines = res.summary["warnings"]
    assert any(": run.dt: the pressure and impulse routes to the lift differ" in w for w in lines)
    # free wake: the body meets its own wake
    sc, res = _run({"motion": {"plunge": {"law": "sine", "amplitude": 0.6, "reduced_frequency": 2.0}}})
    assert any("wake vortices lie on the airfoil" in w for w in res.summary["warnings"])


def test_load_factor_beyond_the_section_maximum():
    # the survey drone in a 9 m/s 1-cosine gust: cl well past 1.5 (common practice)
    sc = unsteady.load_scenario(ROOT / "scenarios" / "drone-gust-1cos.toml",
                                overrides={"gust.amplitude": 9.0, "run.model": "linear"})
    res = unsteady.simulate(sc)
    w = [x for x in res.summary["warnings"] if ": aircraft.mass: " in x]
    assert len(w) == 1 and "more than such a section could give" in w[0]


def test_run_prints_measured_warnings_once(tmp_path):
    f = tmp_path / "fast.toml"
    f.write_text('[flow]\nspeed = 10.0\ndensity = 1.2\n[airfoil]\nchord = 0.2\nelements = 12\n'
                 '[motion]\npivot = 0.0\npitch = { law = "ramp", from = 0.0, to = 45.0, start = 0.01, '
                 'duration = 0.08, smoothing = 0.01 }\n[run]\nchords = 3\n')
    p = subprocess.run([sys.executable, "-m", "unsteady", "run", str(f), "--quiet", "--no-plots",
                        "--out", str(tmp_path / "r")], capture_output=True, text=True)
    assert p.returncode == 0, p.stderr
    lines = [x for x in p.stderr.splitlines() if x.startswith("warning:")]
    assert len(lines) == len(set(lines)) >= 3
    assert all(x.startswith(f"warning: {f}: ") for x in lines)
    summary = json.loads((tmp_path / "r" / "summary.json").read_text())
    assert set(lines) <= set(summary["warnings"])


def test_extreme_ground_effect_is_measured_and_said():
    # closer to the ground than 5 % of the chord (GROUND_NEAR, common practice): one line naming
    # [ground] height; the same section 0.2 chord up is silent
    near = {"motion": {"pitch": {"law": "constant", "value": 4.0}}, "ground": {"height": 0.0175}}
    sc, res = _run(near)
    assert "ground.height" in _keys(res.summary["warnings"])
    sc, res = _run({**near, "ground": {"height": 0.05}})
    assert "warnings" not in res.summary


def test_wake_inside_a_thick_outline_is_found_where_the_chord_band_misses_it():
    # NACA 0012 outline from the 4-digit thickness formula (Abbott & von Doenhoff, Theory of
    # Wing Sections, 1959, eq. 6.2): half-thickness 0.06 c near 30 % of the chord. A wake vortex
    # 4 % of the chord above the chord line there is inside the section though outside the 2 %
    # band used on a camber line; one 8 % above is outside both.
    import math
    from types import SimpleNamespace
    import numpy as np
    from unsteady.analysis.verdict import inside_outline, wake_through_airfoil
    beta = np.linspace(0.0, math.pi, 60)
    xc = 0.5 * (1.0 - np.cos(beta))
    yt = 5 * 0.12 * (0.2969 * np.sqrt(xc) - 0.1260 * xc - 0.3516 * xc ** 2 + 0.2843 * xc ** 3
                     - 0.1015 * xc ** 4)
    xs = np.concatenate([xc[::-1], xc[1:]])          # lower trailing edge -> leading edge -> upper
    zs = np.concatenate([-yt[::-1], yt[1:]])
    sc = SimpleNamespace(chord=0.2, pivot=0.25)
    c, p = sc.chord, sc.pivot

    def snaps(zeta_over_c, thick):
        d = {"t": np.array([0.1]), "offsets": np.array([0, 1]), "alpha": np.array([0.0]),
             "h": np.array([0.0]), "x": np.array([(0.3 - p) * c]), "z": np.array([zeta_over_c * c])}
        if thick:
            d.update(x_surface=xs, z_surface=zs)
        return d
    assert wake_through_airfoil(snaps(0.04, thick=False), sc) is None
    assert wake_through_airfoil(snaps(0.04, thick=True), sc) == 0.1
    assert wake_through_airfoil(snaps(0.08, thick=True), sc) is None
    assert wake_through_airfoil(snaps(-0.05, thick=True), sc) == 0.1
    # the crossing rule itself: a unit square (worked by hand)
    sq = (np.array([0.0, 1.0, 1.0, 0.0]), np.array([0.0, 0.0, 1.0, 1.0]))
    assert list(inside_outline([0.5, 1.5, 0.5, -0.1], [0.5, 0.5, 1.2, 0.5], *sq)) == [True, False, False, False]


def test_a_wake_through_a_further_element_is_measured_and_named():
    # a plunging wing sheds a wavy wake along its chord line; a tail on that line, 2 wing chords
    # back, has wake vortices on its camber line (the 2 % band of each element's own chord, as on
    # the first element); the same tail half a wing chord above the line is silent
    pair = {"airfoil": [{"shape": "flat", "chord": 0.2, "elements": 16},
                        {"shape": "flat", "chord": 0.1, "elements": 8, "position": [0.4, 0.0]}],
            "motion": {"plunge": {"law": "sine", "amplitude": 0.01, "reduced_frequency": 0.5}},
            "run": {"chords": 6}}
    sc, res = _run(pair)
    lines = res.summary["warnings"]
    assert _keys(lines) == ["airfoil[1].position"] and "element 2" in lines[0]
    pair["airfoil"][1]["position"] = [0.4, 0.1]
    sc, res = _run(pair)
    assert "warnings" not in res.summary
