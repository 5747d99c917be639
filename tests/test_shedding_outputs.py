"""Leading-edge shedding as the user sees it: summary, verdict, pictures, film, console.

The physics is checked against its sources in tests/validation/test_leading_edge.py;
here the outputs around it.  The typical critical LESP of the verdict (0.18) stands
for the values Ramesh et al. (J. Fluid Mech. 751, 2014) list, from memory.
"""

import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

import unsteady
from unsteady.analysis.shedding import LESP_TYPICAL
from unsteady.core.cautions import PICTURE_SHEDDING_CAUTION, SHEDDING_CAUTION
from unsteady.outputs.films import Film, FilmOptions, FilmRenderer
from unsteady.outputs.pictures import run_caution

ROOT = Path(__file__).resolve().parents[1]
U, C = 10.0, 0.2


def _pitch_up(crit, chords=2.5, elements=24):
    d = {"flow": {"speed": U, "density": 1.2}, "airfoil": {"chord": C, "elements": elements},
         "motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0,
                                            "duration": math.radians(45.0) / (0.4 * U / C), "smoothing": 0.01}},
         "run": {"chords": chords}, "output": {"snapshot_every": 0.002}}
    if crit is not None:
        d["airfoil"]["lesp_critical"] = crit
    sc = unsteady.load_scenario(d)
    return sc, unsteady.simulate(sc)


@pytest.fixture(scope="module")
def shed():
    return _pitch_up(0.18)


@pytest.fixture(scope="module")
def attached():
    return _pitch_up(None)


def test_summary_of_a_shedding_run(shed):
    sc, res = shed
    s = res.summary
    assert 0.0 < s["lev_onset_t"] < 0.02
    assert s["lesp_max"] == pytest.approx(0.18, rel=1e-9)        # held at the critical value
    assert s["lesp_critical"] == 0.18 and s["gamma_lev_final"] < 0.0
    assert s["caution"] == SHEDDING_CAUTION
    # the headline peak describes the flow: a running mean, never above the largest single row
    assert s["peaks_running_mean_s"] >= 5 * sc.dt
    assert s["cl_max"] <= s["cl_max_steps"]
    assert "running mean" in s["peaks_running_mean_note"]
    assert {"lesp", "gamma_lev"} <= set(res.history)


def test_attached_run_has_lesp_but_no_leading_edge_columns(attached):
    sc, res = attached
    assert "lesp" in res.history and "gamma_lev" not in res.history
    assert "lev_onset_t" not in res.summary and "peaks_running_mean_s" not in res.summary
    assert res.summary["lesp_max"] > LESP_TYPICAL


def test_verdict_suggests_lesp_critical_without_it(attached):
    sc, res = attached
    lines = [w for w in res.summary["warnings"] if "leading-edge suction parameter" in w]
    assert len(lines) == 1
    assert lines[0].startswith("warning: <dict>: motion.pitch: ")
    assert "airfoil.lesp_critical" in lines[0] and f"{LESP_TYPICAL:g}" in lines[0]
    # it says when |LESP| first passed the typical value: where a shedding run would start
    t_first = float(res.history["t"][np.flatnonzero(np.abs(res.history["lesp"]) > LESP_TYPICAL)[0]])
    assert f"first past it at t = {t_first:.4g} s" in lines[0]
    # the attached-flow limits still speak in an attached run
    assert any("reduced pitch rate" in w for w in res.summary["warnings"])


def test_verdict_of_a_shedding_run_drops_the_attached_flow_limits(shed):
    sc, res = shed
    text = " ".join(res.summary.get("warnings", []))
    for gone in ("effective angle of attack reached", "reduced pitch rate", "lift coefficient reached",
                 "leading-edge suction parameter"):
        assert gone not in text
    reasons = res.summary["lag"]["validity"]["reasons"]
    assert len(reasons) == 1 and "sheds vortices past LESP = 0.18" in reasons[0]


def test_snapshots_mark_leading_edge_vortices(shed, attached):
    _sc, res = shed
    s = res.snapshots
    assert s["lev"].shape == s["x"].shape and 0 < s["lev"].sum() < s["lev"].size
    assert "lev" not in attached[1].snapshots


def test_pictures_and_film_of_a_shedding_run(shed, tmp_path):
    sc, res = shed
    path = res.save(tmp_path / "run", plots=True)
    for name in ("histories.png", "wake.png", "lift-loop.png"):
        assert (path / name).is_file()
    assert run_caution(res) == PICTURE_SHEDDING_CAUTION
    back = unsteady.Result.load(path)
    film = Film(back, FilmOptions(width=320, height=180, frames=4))
    assert film.lev_onset() == pytest.approx(res.summary["lev_onset_t"])
    r = FilmRenderer(film)
    assert r.lev_dots is not None
    last = r.frame(3)
    r.lev_dots.set_visible(False)
    without = r.frame(3)
    assert last.shape == (180, 320, 3)
    assert np.abs(last.astype(int) - without.astype(int)).sum() > 0     # the diamonds are drawn


def test_run_prints_the_onset_and_the_caution(tmp_path):
    out = tmp_path / "perch"
    p = subprocess.run([sys.executable, "-m", "unsteady", "run", str(ROOT / "scenarios" / "perching-lev.toml"),
                        "--out", str(out), "--no-plots", "--set", "airfoil.elements=16",
                        "--set", "run.duration=0.12"], capture_output=True, text=True, cwd=tmp_path)
    assert p.returncode == 0, p.stderr
    assert "leading edge sheds from t = " in p.stdout and SHEDDING_CAUTION in p.stdout
    s = json.loads((out / "summary.json").read_text())
    assert s["lev_onset_t"] is not None and s["lesp_critical"] == 0.19


# --- several elements, each with its own lesp_critical (or none)

def _pair(crit_1, crit_2, chords=2.0, elements=24):
    first = {"chord": C, "elements": elements}
    second = {"chord": C, "elements": elements, "position": [1.5 * C, 1.5 * C]}
    if crit_1 is not None:
        first["lesp_critical"] = crit_1
    if crit_2 is not None:
        second["lesp_critical"] = crit_2
    d = {"flow": {"speed": U, "density": 1.2}, "airfoil": [first, second],
         "motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0,
                                            "duration": math.radians(45.0) / (0.4 * U / C), "smoothing": 0.01}},
         "run": {"chords": chords}, "output": {"snapshot_every": 0.002}}
    sc = unsteady.load_scenario(d)
    return sc, unsteady.simulate(sc)


@pytest.fixture(scope="module")
def second_only():
    """Only the second element may shed; the first, attached, passes the typical value."""
    return _pair(None, 0.2)


def test_columns_and_summary_per_element(second_only):
    sc, res = second_only
    h, s = res.history, res.summary
    assert {"lesp", "lesp_1", "lesp_2", "gamma_lev", "gamma_lev_2"} <= set(h)
    assert "gamma_lev_1" not in h                                   # the first never sheds
    assert np.array_equal(h["lesp"], h["lesp_1"]) and np.array_equal(h["gamma_lev"], h["gamma_lev_2"])
    assert s["lev_onset_t"] == s["lev_onset_t_2"] is not None and "lev_onset_t_1" not in s
    assert s["lesp_critical_2"] == 0.2 and "lesp_critical" not in s    # lesp_critical: the first's
    # held at its own value after the first row (the settled start at the initial rates, which never
    # sheds: there the second element, sinking as the pair pitches about the first's leading edge, is past it)
    assert np.abs(h["lesp_2"][1:]).max() == pytest.approx(0.2, rel=1e-9)
    assert s["lesp_max_2"] == np.abs(h["lesp_2"]).max()
    assert s["lesp_max_1"] == s["lesp_max"] > LESP_TYPICAL
    assert s["gamma_lev_final_2"] == s["gamma_lev_final"] < 0.0
    assert s["caution"] == SHEDDING_CAUTION


def test_verdict_names_the_element_without_lesp_critical(second_only):
    # the first element passes the typical value without a critical value of its own: its warning names it;
    # the second sheds, so no warning speaks of it
    sc, res = second_only
    lines = [w for w in res.summary["warnings"] if "leading-edge suction parameter" in w]
    assert len(lines) == 1
    assert "of element 1 (airfoil[0])" in lines[0] and "set airfoil.lesp_critical" in lines[0]
    both_attached = _pair(None, None, chords=1.0)[1]
    lines = [w for w in both_attached.summary["warnings"] if "leading-edge suction parameter" in w]
    assert len(lines) == 2
    assert "element 2 (airfoil[1])" in lines[1] and "set airfoil[1].lesp_critical" in lines[1]


def test_pictures_mark_every_elements_leading_edge_vortices(second_only, tmp_path):
    sc, res = second_only
    s = res.snapshots
    assert 0 < s["lev"].sum() < s["lev"].size                     # the second's vortices are marked
    assert run_caution(res) == PICTURE_SHEDDING_CAUTION
    path = res.save(tmp_path / "run", plots=True)
    for name in ("histories.png", "wake.png"):
        assert (path / name).is_file()


def test_run_prints_each_elements_onset(tmp_path):
    scen = tmp_path / "pair.toml"
    scen.write_text(f"""
[flow]
speed = {U}
density = 1.2
[[airfoil]]
chord = {C}
elements = 16
lesp_critical = 0.18
[[airfoil]]
chord = {C}
elements = 16
position = [{1.5 * C}, {1.5 * C}]
lesp_critical = 50.0
[motion]
pivot = 0.0
pitch = {{ law = "ramp", from = 0.0, to = 45.0, start = 0.0, duration = 0.04, smoothing = 0.01 }}
[run]
chords = 1.0
""")
    p = subprocess.run([sys.executable, "-m", "unsteady", "run", str(scen), "--out", str(tmp_path / "out"),
                        "--no-plots"], capture_output=True, text=True, cwd=tmp_path)
    assert p.returncode == 0, p.stderr
    assert "element 1 from t = " in p.stdout and "element 2 never (lesp_critical = 50)" in p.stdout
    s = json.loads((tmp_path / "out" / "summary.json").read_text())
    assert s["lev_onset_t_2"] is None and s["lev_onset_t"] == s["lev_onset_t_1"]


@pytest.mark.parametrize("crits", [(0.18, 0.2), (None, 0.2), (0.18, None)])
def test_sweep_numbers_cover_what_shedding_elements_give(crits):
    # the envelope check's list of numbers (sweep_cases.possible_numbers) against real runs of a pair
    from unsteady.apps import sweep
    from unsteady.inputs.sweep_cases import possible_numbers
    first, second = {"chord": C, "elements": 16}, {"chord": C, "elements": 16, "position": [1.5 * C, 1.5 * C]}
    for el, c in zip((first, second), crits):
        if c is not None:
            el["lesp_critical"] = c
    sc = unsteady.load_scenario({
        "flow": {"speed": U, "density": 1.2}, "airfoil": [first, second],
        "motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0,
                                           "duration": 0.04, "smoothing": 0.01}},
        "run": {"chords": 1.0}, "output": {"plots": False}})
    got = set(sweep.run_case({"raw": sc.raw, "base_dir": str(sc.base_dir), "source": sc.source})["summary"])
    assert {"lev_onset_t", "lesp_max_2"} <= got
    assert got <= set(possible_numbers(sc)), got - set(possible_numbers(sc))
