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
