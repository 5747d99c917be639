"""Static pictures of a run: what each picture draws, and the command that redraws them."""

import math
import shutil

import numpy as np
import pytest

import unsteady
from unsteady.outputs import pictures as plots
from unsteady.apps.cli import main

ALPHA_DEG = 4.0


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    """A flat plate settled at 4 degrees, then ramped up by 3 degrees (short run, frozen wake)."""
    sc = unsteady.load_scenario({
        "title": "Test plate",
        "flow": {"speed": 10.0, "density": 1.225},
        "airfoil": {"shape": "flat", "chord": 0.2, "elements": 40},
        "motion": {"pivot": 0.25, "pitch": [{"law": "constant", "value": ALPHA_DEG},
                                            {"law": "ramp", "from": 0.0, "to": 3.0, "start": 0.02,
                                             "duration": 0.02}]},
        "run": {"duration": 0.06, "wake": "frozen"},
    })
    res = unsteady.simulate(sc)
    d = tmp_path_factory.mktemp("plots") / "run"
    res.save(d, plots=False)
    return res, d


@pytest.fixture
def captured(monkeypatch):
    """Keep the figures instead of writing them."""
    figs = {}

    def keep(fig, path):
        figs[path.name] = fig
    monkeypatch.setattr(plots, "save_png", keep)
    return figs


def _lines(fig):
    return [ln for ax in fig.axes for ln in ax.get_lines()]


def test_run_writes_the_four_pictures(run, tmp_path):
    res, _ = run
    plots.write_run_plots(res, tmp_path)
    import imageio.v3 as iio
    for name in ("histories.png", "lift-loop.png", "wake.png", "pressure-jump.png"):
        img = iio.imread(tmp_path / name)
        assert img.ndim == 3 and img.shape[0] > 200 and img.shape[1] > 300
        assert img[..., :3].std() > 5     # not blank
    assert not list(tmp_path.glob(".*part*"))    # no temporary left behind


def test_histories_draw_the_columns(run, captured):
    res, _ = run
    plots.plot_histories(res, plots.Path("histories.png"))
    fig = captured["histories.png"]
    labels = [ax.get_ylabel() for ax in fig.axes]
    assert labels[0] == "lift coefficient cl" and "pitch angle (deg)" in labels
    cl_line = fig.axes[0].get_lines()[0]
    assert np.array_equal(cl_line.get_ydata(), res.history["cl"])


def test_lift_loop_with_and_without_quasi_steady_line(run, captured):
    res, _ = run
    h = dict(res.history)
    h.pop("cl_quasi_steady", None)
    bare = unsteady.Result(h, res.summary, res.snapshots, res.scenario)
    plots.plot_lift_loop(bare, plots.Path("a.png"))
    assert all(ln.get_label() != "quasi-steady" for ln in _lines(captured["a.png"]))
    # thin-airfoil quasi-steady line cl = 2 pi alpha (Abbott & von Doenhoff 1959, ch. 4)
    h["cl_quasi_steady"] = 2 * math.pi * np.radians(h["pitch_deg"])
    withqs = unsteady.Result(h, res.summary, res.snapshots, res.scenario)
    plots.plot_lift_loop(withqs, plots.Path("b.png"))
    qs = [ln for ln in _lines(captured["b.png"]) if ln.get_label() == "quasi-steady"]
    assert len(qs) == 1
    assert np.array_equal(qs[0].get_xdata(), h["pitch_deg"])
    assert np.array_equal(qs[0].get_ydata(), h["cl_quasi_steady"])
    main_line = [ln for ln in _lines(captured["b.png"]) if ln.get_label() == "vortex model"][0]
    assert np.array_equal(main_line.get_ydata(), h["cl"])


def test_pressure_jump_picture_shows_the_flat_plate_load(run, captured):
    res, _ = run
    plots.plot_pressure_jump(res, plots.Path("p.png"))
    lines = [ln for ln in _lines(captured["p.png"]) if ln.get_label().startswith("t = ")]
    rows = plots.pressure_instants(res.history)
    assert len(lines) == len(rows) >= 3
    h = res.history
    assert rows[0] == 0 and rows[-1] == len(h["t"]) - 1
    assert int(np.argmax(h["cl"])) in rows and int(np.argmin(h["cl"])) in rows
    for ln, i in zip(lines, rows):
        assert np.allclose(ln.get_ydata(), res.snapshots["dcp"][i])
    # first instant: the settled flat plate; thin-airfoil load 4 alpha sqrt((1 - x)/x)
    # (J. Katz & A. Plotkin, Low-Speed Aerodynamics, 2nd ed., 2001, sec. 5.2, from memory);
    # the lumped-vortex elements follow it within 3 % between 5 % and 70 % chord
    x = lines[0].get_xdata()
    a = math.radians(ALPHA_DEG)
    sel = (x > 0.05) & (x < 0.7)
    ref = 4 * a * np.sqrt((1 - x[sel]) / x[sel])
    assert np.allclose(lines[0].get_ydata()[sel], ref, rtol=0.03)


def test_wake_picture_draws_the_last_snapshot(run, captured):
    res, _ = run
    assert plots.plot_wake(res, plots.Path("w.png"))
    fig = captured["w.png"]
    coll = fig.axes[0].collections[0]
    s = res.snapshots
    a, b = s["offsets"][-2], s["offsets"][-1]
    assert np.allclose(coll.get_offsets(), np.column_stack([s["x"][a:b], s["z"][a:b]]))
    assert np.allclose(coll.get_array(), s["gamma"][a:b])


def test_pictures_command_redraws_and_rejects_a_missing_folder(run, tmp_path, capsys):
    _, d = run
    copy = tmp_path / "copy"
    shutil.copytree(d, copy)
    assert main(["pictures", str(copy), "--quiet"]) == 0
    for name in ("histories.png", "lift-loop.png", "wake.png", "pressure-jump.png"):
        assert (copy / name).is_file()
    assert main(["pictures", str(tmp_path / "nowhere")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("error: ")


def test_pictures_command_redraws_the_gust_load_picture(tmp_path, capsys):
    # a run with an aircraft gets gust-loads.png (with its caution) from `pictures` too
    sc = unsteady.load_scenario({
        "flow": {"speed": 15.0, "density": 1.2},
        "airfoil": {"shape": "flat", "chord": 0.25, "elements": 8},
        "aircraft": {"mass": 3.0, "wing_area": 0.55},
        "gust": {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.0, "arrival": 0.02},
        "run": {"chords": 6, "wake": "frozen"}})
    out = unsteady.simulate(sc).save(tmp_path / "g", plots=False)
    assert main(["pictures", str(out)]) == 0
    assert (out / "gust-loads.png").is_file()
