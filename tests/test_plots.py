"""Static pictures of a run: what each picture draws, and the command that redraws them."""

import math
import shutil

import numpy as np
import pytest

import unsteady
from matplotlib.colors import to_rgb
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


# ---------------------------------------------------------------------------
# pictures that brief well (issue 13): each check fails on the picture drawn before

@pytest.fixture(scope="module")
def gust_run():
    """A flat plate free to heave through a 1-cosine up-gust, pitch held (12 chords, frozen wake)."""
    sc = unsteady.load_scenario({
        "title": "Gust test plate",
        "flow": {"speed": 15.0, "density": 1.2},
        "airfoil": {"shape": "flat", "chord": 0.25, "elements": 8},
        "aircraft": {"mass": 3.0, "wing_area": 0.55},
        "gust": {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.0, "arrival": 0.02},
        "run": {"chords": 12, "wake": "frozen"}})
    return unsteady.simulate(sc)


def test_lift_loop_of_a_gust_run_is_drawn_against_the_effective_angle(gust_run, captured):
    res = gust_run
    assert not plots.moves(res.history["pitch_deg"])        # the pitch is held (trimmed)
    plots.plot_lift_loop(res, plots.Path("loop.png"))
    ax = captured["loop.png"].axes[0]
    line = [ln for ln in ax.get_lines() if ln.get_label() == "vortex model"][0]
    x = np.asarray(line.get_xdata())
    assert np.array_equal(x, res.history["alpha_eff_deg"])
    # a 1 m/s gust at 15 m/s raises the angle by up to atan(1/15) = 3.8 deg (less the heave rate)
    assert np.ptp(x) > 1.0
    lo, hi = ax.get_xlim()
    assert hi - lo > 1.0                  # not a vertical line
    assert "effective angle" in ax.get_xlabel()


def test_histories_of_a_gust_run_show_what_moved(gust_run, captured):
    plots.plot_histories(gust_run, plots.Path("h.png"))
    fig = captured["h.png"]
    labels = [ax.get_ylabel() for ax in fig.axes]
    assert "pitch angle (deg)" not in labels
    assert any("gust" in lab for lab in labels) and "height of the pitch axis (m)" in labels
    for ax in fig.axes:
        y = np.asarray(ax.get_lines()[0].get_ydata(), dtype=float)
        assert plots.moves(y), ax.get_ylabel()              # no flat panel
    texts = [t.get_text() for t in fig.texts]
    assert any(t.startswith("held constant: pitch") for t in texts)


def test_wake_picture_frames_the_near_wake_and_shows_the_whole_below(gust_run, captured):
    res = gust_run
    assert plots.plot_wake(res, plots.Path("w.png"))
    fig = captured["w.png"]
    near, whole = fig.axes[:2]
    c = res.scenario.chord
    s = res.snapshots
    a, b = s["offsets"][-2], s["offsets"][-1]
    x = s["x"][a:b]
    lo, hi = near.get_xlim()
    assert (hi - lo) / c == pytest.approx(1.0 + plots.NEAR_WAKE_CHORDS + plots.NEAR_WAKE_AHEAD, rel=0.02)
    assert x.max() - x.min() > 2 * (hi - lo)               # the wake is longer than the frame
    # true proportions in the near panel: metres per pixel the same across and up
    bb = near.get_window_extent()
    z0, z1 = near.get_ylim()
    assert (hi - lo) / bb.width == pytest.approx((z1 - z0) / bb.height, rel=1e-6)
    # every wake vortex on the whole-wake panel, and the frame of the near panel marked on it
    assert np.allclose(whole.collections[0].get_offsets(), np.column_stack([x, s["z"][a:b]]))
    frames = [p for p in whole.patches if isinstance(p, plots.Rectangle)]
    assert len(frames) == 1 and frames[0].get_width() == pytest.approx(hi - lo)


def test_pressure_jump_is_scaled_on_the_chord_behind_the_leading_edge(run, captured):
    res, _ = run
    plots.plot_pressure_jump(res, plots.Path("p.png"))
    ax = captured["p.png"].axes[0]
    lo, hi = ax.get_ylim()
    s = res.snapshots
    rows = plots.pressure_instants(res.history)
    dcp = np.asarray(s["dcp"], dtype=float)[rows]
    rest = s["x_dcp"] >= plots.PRESSURE_SCALE_FROM
    le = int(np.argmin(s["x_dcp"]))
    # thin-airfoil load 4 alpha sqrt((1 - x)/x) is singular at the leading edge (Katz & Plotkin 2001,
    # sec. 5.2, from memory): the first element carries several times the load of the rest
    assert dcp[:, le].max() > 2 * dcp[:, rest].max()
    assert lo <= dcp[:, rest].min() and hi >= dcp[:, rest].max()       # the rest fits
    assert hi < dcp[:, le].max()                                         # the leading edge does not...
    written = [t.get_text() for t in ax.texts if t.get_text().startswith("leading edge")]
    assert f"leading edge {dcp[:, le].max():.3g}" in written             # ... and is written instead


def test_lag_picture_has_t50_t90_marks_house_style_and_an_uncut_title(run, captured):
    res, _ = run
    lag = res.summary["lag"]
    long_reasons = ["effective angle reaches 45.7 deg, beyond 12 deg: a real section would separate or "
                    "stall there", "reduced pitch rate reaches 0.070, beyond 0.05: a leading-edge vortex "
                    "would change the lift"]
    summary = dict(res.summary, lag=dict(lag, validity=dict(lag["validity"], attached_flow_ok=False,
                                                            reasons=long_reasons)))
    sc = res.scenario
    long = unsteady.Result(res.history, summary, res.snapshots, sc)
    plots.plot_lag(long, plots.Path("lag.png"))
    fig = captured["lag.png"]
    ax1 = fig.axes[0]
    t = res.history["t"]
    for key, who in (("t50", "cl"), ("t90_qs", "cl_quasi_steady")):
        tm = lag["t_begin"] + lag[key]
        mark = [ln for ln in ax1.get_lines() if ln.get_label() == f"_{key}"]
        assert len(mark) == 1
        assert mark[0].get_xdata()[0] == pytest.approx(tm)
        assert mark[0].get_ydata()[0] == pytest.approx(np.interp(tm, t, res.history[who]))
    assert lag["t90"] is None and any("t90 not reached" in tx.get_text() for tx in ax1.texts)
    # the house style of the other pictures (paper, not white)
    assert fig.get_facecolor()[:3] == pytest.approx(to_rgb(plots.LOOK["paper"]))
    # no title or note cut at the figure's sides
    fig.canvas.draw()
    r = fig.canvas.get_renderer()
    fb = fig.bbox
    for tx in fig.texts:
        bb = tx.get_window_extent(r)
        assert bb.x0 >= fb.x0 - 0.5 and bb.x1 <= fb.x1 + 0.5, tx.get_text()[:40]
    assert any("reduced pitch rate reaches 0.070" in tx.get_text().replace("\n", " ") for tx in fig.texts)


def test_every_png_is_marked_as_written_by_unsteady(run, tmp_path):
    res, _ = run
    plots.plot_histories(res, tmp_path / "h.png")
    assert plots.written_by_unsteady(tmp_path / "h.png")
    (tmp_path / "other.png").write_bytes(b"\x89PNG\r\n\x1a\n not ours")
    assert not plots.written_by_unsteady(tmp_path / "other.png")


def test_gust_loads_picture_shows_newtons_and_root_bending_with_the_dimensional_caution(tmp_path, captured):
    # issue 15 item 1: lift in newtons (n m g) and the elliptic-loading root bending moment
    # (Prandtl's lifting line: lift/2 at 4 s / (3 pi) from the root) drawn beside the load factor
    from unsteady.core.cautions import DIMENSIONAL_CAUTION
    sc = unsteady.load_scenario({
        "title": "Gust test plate",
        "flow": {"speed": 15.0, "density": 1.2},
        "airfoil": {"shape": "flat", "chord": 0.25, "elements": 8},
        "aircraft": {"mass": 3.0, "wing_area": 0.55, "span": 1.8},
        "gust": {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.0, "arrival": 0.02},
        "run": {"chords": 8, "wake": "frozen"}})
    res = unsteady.simulate(sc)
    plots.plot_gust_loads(res, plots.Path("gust-loads.png"))
    fig = captured["gust-loads.png"]
    ys = [ln.get_ydata() for ln in _lines(fig) if len(ln.get_ydata()) == len(res.history["t"])]
    assert any(np.allclose(y, res.history["lift_N"]) for y in ys)
    assert any(np.allclose(y, res.history["root_bending_Nm"]) for y in ys)
    labels = " ".join(ax.get_ylabel() for ax in fig.axes)
    assert "lift (N)" in labels and "root bending moment (N m)" in labels
    texts = " ".join(t.get_text().replace("\n", " ") for t in fig.texts)
    assert DIMENSIONAL_CAUTION.split()[0] in texts and "inertia relief" in texts
    # without newtons in the history the picture keeps its two panels and no dimensional caution
    captured.clear()
    del res.history["lift_N"], res.history["root_bending_Nm"]
    plots.plot_gust_loads(res, plots.Path("gust-loads.png"))
    fig = captured["gust-loads.png"]
    assert len(fig.axes) == 2
    assert "inertia relief" not in " ".join(t.get_text().replace("\n", " ") for t in fig.texts)
