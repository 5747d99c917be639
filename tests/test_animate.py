"""Films: MP4 and GIF decode with the requested frames, size and rate; the airfoil is where its kinematics put it; bad input; flat memory."""

import json
import math
import shutil
import subprocess
import sys

import imageio.v3 as iio
import numpy as np
import pytest

import unsteady
from unsteady.outputs.films import Film, FilmOptions, FilmRenderer, load_run, write_film
from unsteady.apps.cli import main
from unsteady.outputs.fields import chord_line

PITCH_AMP = 15.0       # deg
FREQ = 5.0             # Hz


@pytest.fixture(scope="module")
def run_dir(tmp_path_factory):
    """A NACA 0012 pitching about its quarter chord by 15 degrees at 5 Hz (one period, coarse, frozen wake)."""
    sc = unsteady.load_scenario({
        "title": "Pitching test section",
        "flow": {"speed": 10.0, "density": 1.225},
        "airfoil": {"shape": "naca0012", "chord": 0.25, "elements": 12},
        "motion": {"pivot": 0.25, "pitch": {"law": "sine", "amplitude": PITCH_AMP, "frequency": FREQ}},
        "run": {"duration": 0.2, "wake": "frozen", "dt": 0.002},
        "output": {"snapshot_every": 0.01},
    })
    res = unsteady.simulate(sc)
    d = tmp_path_factory.mktemp("films") / "pitching"
    res.save(d, plots=False)
    return d


def _mean_diff(a, b):
    return float(np.abs(a.astype(float) - b.astype(float)).mean())


def test_mp4_has_requested_frames_size_rate_and_moves(run_dir, tmp_path):
    out = tmp_path / "film.mp4"
    rc = main(["animate", str(run_dir), "--out", str(out), "--frames", "12", "--size", "320x180",
               "--frame-rate", "12", "--quiet"])
    assert rc == 0 and out.is_file()
    frames = iio.imread(out, index=None)
    assert frames.shape == (12, 180, 320, 3)
    meta = iio.immeta(out)
    assert meta["fps"] == pytest.approx(12.0)
    assert meta["codec"] == "h264" and meta["pix_fmt"].startswith("yuv420p")
    diffs = [_mean_diff(frames[i], frames[i + 1]) for i in range(11)]
    assert min(diffs) > 0.05          # every frame differs from the one before while the wake moves
    assert not list(tmp_path.glob(".*part*"))


def test_gif_loops_with_requested_frames_size_rate(run_dir, tmp_path):
    out = tmp_path / "film.gif"
    rc = main(["animate", str(run_dir), "--out", str(out), "--frames", "8", "--size", "240x136",
               "--frame-rate", "10", "--flow", "vorticity", "--quiet"])
    assert rc == 0
    frames = iio.imread(out, index=None)
    assert frames.shape[:3] == (8, 136, 240)
    meta = iio.immeta(out)
    assert meta["loop"] == 0                 # loops for ever
    assert meta["duration"] == pytest.approx(100, abs=1)    # ms per frame at 10 frames/s
    assert all(_mean_diff(frames[i], frames[i + 1]) > 0.05 for i in range(7))


def test_airfoil_drawn_where_its_kinematics_put_it(run_dir, tmp_path):
    # pitch = A sin(2 pi f t) (the scenario's law): nose-up extreme at t = 0.05 s, nose-down at 0.15 s
    res = load_run(run_dir)
    opts = FilmOptions(width=640, height=360, frame_rate=10, frames=3, span=(0.05, 0.15))
    out = tmp_path / "probe.mp4"
    film = write_film(res, out, opts)
    assert np.allclose(film.times, [0.05, 0.10, 0.15], atol=1e-9)
    frames = iio.imread(out, index=None)
    renderer = FilmRenderer(Film(res, opts))
    sc = res.scenario
    grey = lambda img, c, r: img[int(round(r)), int(round(c))].astype(float).mean()   # noqa: E731
    for own, other in ((0, 2), (2, 0)):
        a_own = math.radians(PITCH_AMP) * math.sin(2 * math.pi * FREQ * film.times[own])
        a_other = math.radians(PITCH_AMP) * math.sin(2 * math.pi * FREQ * film.times[other])
        assert abs(a_own - a_other) > math.radians(25)
        # points from 55 % to 90 % of the chord, well away from the pitch axis at 25 %
        x, z = chord_line(sc.chord, sc.pivot, a_own, 0.0, n=41)
        cols, rows = renderer.pixel_of(x[22:37], z[22:37])
        assert all(grey(frames[own], c, r) < 120 for c, r in zip(cols, rows))     # dark airfoil there
        x, z = chord_line(sc.chord, sc.pivot, a_other, 0.0, n=41)
        cols, rows = renderer.pixel_of(x[22:37], z[22:37])
        assert all(grey(frames[own], c, r) > 200 for c, r in zip(cols, rows))     # light paper where it is not


def test_slowdown_sets_the_frame_count_and_air_view_moves_the_airfoil(run_dir):
    res = load_run(run_dir)
    film = Film(res, FilmOptions(span=(0.0, 0.1), slowdown=4.0, frame_rate=25))
    assert film.n_frames == round(0.1 * 4.0 * 25) + 1
    assert film.slowdown == pytest.approx(4.0, rel=0.05)
    air = Film(res, FilmOptions(view="air", frames=5))
    # in still air the pitch axis moves upstream at the flight speed (x = -U (t - t0))
    assert air.x_shift(air.times[-1]) == pytest.approx(-10.0 * (air.times[-1] - air.times[0]))


def _lines(capsys):
    return capsys.readouterr().err.strip().splitlines()


def test_bad_input_is_one_line_exit_2_and_no_file(run_dir, tmp_path, capsys):
    out = tmp_path / "x.mp4"
    cases = [
        ["--flow", "smoke"],
        ["--view", "cockpit"],
        ["--trace", "n"],              # this run has no load factor
        ["--size", "321x180"],         # odd side for H.264 yuv420p
        ["--span", "5:6"],             # outside the run
        ["--camera", "drone"],
    ]
    for extra in cases:
        assert main(["animate", str(run_dir), "--out", str(out), "--quiet"] + extra) == 2, extra
        err = _lines(capsys)
        assert len(err) == 1 and err[0].startswith("error: "), (extra, err)
    assert main(["animate", str(run_dir), "--out", str(tmp_path / "none" / "x.mp4")]) == 2
    assert len(_lines(capsys)) == 1
    assert main(["animate", str(run_dir), "--out", str(tmp_path / "x.avi")]) == 2
    assert "allowed: .mp4, .gif" in _lines(capsys)[0]
    bare = tmp_path / "bare"
    shutil.copytree(run_dir, bare)
    (bare / "snapshots.npz").unlink()
    assert main(["animate", str(bare), "--out", str(out)]) == 2
    err = _lines(capsys)
    assert len(err) == 1 and "snapshots.npz" in err[0]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bare"]     # nothing written


def test_interrupted_film_leaves_no_file(run_dir, tmp_path, monkeypatch):
    res = load_run(run_dir)
    calls = {"n": 0}
    orig = FilmRenderer.draw

    def failing(self, i):
        calls["n"] += 1
        if calls["n"] > 3:
            raise RuntimeError("stop")
        return orig(self, i)
    monkeypatch.setattr(FilmRenderer, "draw", failing)
    with pytest.raises(RuntimeError):
        write_film(res, tmp_path / "f.mp4", FilmOptions(width=160, height=96, frames=10))
    assert list(tmp_path.iterdir()) == []


PEAK = """
import json, resource, sys
from unsteady.apps.cli import main
rc = main(["animate", sys.argv[1], "--out", sys.argv[2], "--frames", sys.argv[3], "--size", "320x180", "--quiet"])
print(json.dumps({"rc": rc,
                  "self": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
                  "children": resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss}))
"""


def test_memory_stays_flat_with_film_length(run_dir, tmp_path):
    # frames are streamed to the encoder one at a time: 1000 frames need no more than
    # 300 MB beyond 100 frames (project target); ru_maxrss is in kB on Linux
    peaks = {}
    for n in (100, 1000):
        p = subprocess.run([sys.executable, "-c", PEAK, str(run_dir), str(tmp_path / f"m{n}.mp4"), str(n)],
                           capture_output=True, text=True, timeout=240)
        rep = json.loads(p.stdout.strip().splitlines()[-1])
        assert rep["rc"] == 0, p.stderr
        peaks[n] = rep
    assert sum(1 for _ in iio.imiter(tmp_path / "m1000.mp4")) == 1000
    for k in ("self", "children"):
        assert (peaks[1000][k] - peaks[100][k]) / 1024 < 300, peaks


def test_gust_band_shows_the_up_gust_where_it_is(tmp_path):
    # a 1-cosine up-gust is a frozen pattern carried at U (common practice): at time t its
    # front, which met the leading edge at `arrival`, lies U (t - arrival) downstream of it
    sc = unsteady.load_scenario({
        "flow": {"speed": 10.0, "density": 1.225},
        "airfoil": {"shape": "flat", "chord": 0.2, "elements": 8},
        "gust": {"profile": "one-minus-cosine", "amplitude": 2.0, "length": 1.0, "arrival": 0.02},
        "run": {"duration": 0.1, "wake": "frozen"},
    })
    res = unsteady.simulate(sc)
    res.save(tmp_path / "g", plots=False)
    res = load_run(tmp_path / "g")
    film = Film(res, FilmOptions(width=640, height=360, frames=2, span=(0.07, 0.1)))
    r = FilmRenderer(film)
    img = r.frame(1)
    t = film.times[1]
    x_le = -sc.pivot * sc.chord
    z_mid = 0.5 * (r.g_band[0] + r.g_band[1]) + 0.3 * (r.g_band[1] - r.g_band[0])
    x_front = x_le + 10.0 * (t - 0.02)             # the gust front, downstream of the leading edge
    x_peak = x_front - 0.5                          # the peak, half a gust length behind the front
    inside = img[tuple(np.round(r.pixel_of(x_peak, z_mid)[::-1]).astype(int).ravel())].astype(int)
    outside = img[tuple(np.round(r.pixel_of(x_front + 0.3, z_mid)[::-1]).astype(int).ravel())].astype(int)
    assert inside[2] - inside[1] > 25          # violet (blue above green): air moving up
    assert abs(outside[2] - outside[1]) < 12   # plain paper beyond the front


def test_snapshots_of_a_2000_step_run_stay_small(tmp_path):
    # project target: a 2,000-step run's snapshot file under 50 MB, here at one snapshot per step
    sc = unsteady.load_scenario({
        "flow": {"speed": 10.0, "density": 1.225},
        "airfoil": {"shape": "flat", "chord": 0.2, "elements": 8},
        "motion": {"pitch": {"law": "sine", "amplitude": 3.0, "frequency": 4.0}},
        "run": {"duration": 2000 * 0.0025, "dt": 0.0025, "wake": "frozen"},
        "output": {"snapshot_every": 0.0025},
    })
    res = unsteady.simulate(sc)
    out = res.save(tmp_path / "big", plots=False)
    assert len(res.snapshots["t"]) == 2001
    assert (out / "snapshots.npz").stat().st_size < 50e6


# ---------------------------------------------------------------------------
# films that brief well (issue 13): each check fails on the film drawn before

@pytest.fixture(scope="module")
def heave_dir(tmp_path_factory):
    """A light aircraft heaving 0.2 m (0.8 chord) through a 3 m/s 1-cosine gust (16 chords, frozen wake)."""
    sc = unsteady.load_scenario({
        "title": "Heaving test plate",
        "flow": {"speed": 15.0, "density": 1.2},
        "airfoil": {"shape": "flat", "chord": 0.25, "elements": 8},
        "aircraft": {"mass": 1.0, "wing_area": 0.55},
        "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 2.0, "arrival": 0.02},
        "run": {"chords": 16, "wake": "frozen"},
        "output": {"snapshot_every": 0.01},
    })
    d = tmp_path_factory.mktemp("films") / "heave"
    unsteady.simulate(sc).save(d, plots=False)
    return d


def _foil_mid_z(renderer, i):
    renderer.update(i)
    xy = renderer.foil.get_xy()
    return 0.5 * (xy[:, 1].min() + xy[:, 1].max())


def test_camera_follows_a_heaving_airfoil_by_default(heave_dir, run_dir):
    res = load_run(heave_dir)
    h = res.snapshots["h"]
    assert np.ptp(h) > 0.15
    opts = dict(width=320, height=180, frames=6)
    follow = FilmRenderer(Film(res, FilmOptions(**opts)))
    fixed = FilmRenderer(Film(res, FilmOptions(camera="fixed", **opts)))
    assert follow.film.follow and not fixed.film.follow
    z_follow = [_foil_mid_z(follow, i) for i in range(6)]
    z_fixed = [_foil_mid_z(fixed, i) for i in range(6)]
    heights = [follow.film.frame_state(i)[3] for i in range(6)]
    # following, the airfoil stays at mid height; fixed, it moves with its heave
    assert np.ptp(z_follow) < 0.02 * res.scenario.chord
    assert np.ptp(z_fixed) == pytest.approx(np.ptp(heights), rel=0.05)
    lo, hi = follow.zlim
    assert lo < z_follow[0] < hi and hi - lo < fixed.zlim[1] - fixed.zlim[0] + 1e-12
    assert "height" in follow.clock_line
    # the wake is drawn at its height above the airfoil's pitch axis
    x, z, _g = follow.film.wake(5)
    k = follow.film.snap_index[5]
    o = res.snapshots["offsets"]
    assert np.allclose(z, res.snapshots["z"][o[k]:o[k + 1]] - h[k])
    # a pitching airfoil that does not heave keeps a fixed camera
    assert not Film(load_run(run_dir), FilmOptions(**opts)).follow


def test_zero_gust_draws_no_arrows_and_the_caption_stays_readable(heave_dir):
    res = load_run(heave_dir)
    film = Film(res, FilmOptions(width=640, height=360, frames=27, flow="speed", grid=(24, 12)))
    r = FilmRenderer(film)
    assert film.times[0] < 0.02                         # before the gust arrives: no gust anywhere
    r.update(0)
    assert np.asarray(r.quiv.Umask).all()      # no zero-length arrows (drawn as dots)
    i = int(np.argmin(np.abs(film.times - 0.02 - 1.0 / 15.0)))   # the gust's peak at the leading edge
    r.update(i)
    assert not np.asarray(r.quiv.Umask).all()
    # the caption lies clear of the band drawn along the bottom ...
    rend = r.canvas.get_renderer()
    cap, band = r.gust_caption.get_window_extent(rend), r.gust_img.get_window_extent(rend)
    assert cap.y0 >= band.y1 - 0.5
    # ... and every frame shows it as drawn on the background (nothing moving covers it)
    img = r.frame(i)
    r.canvas.restore_region(r.bg)
    bg = np.asarray(r.canvas.buffer_rgba())[..., :3]
    rows = slice(int(r.H - cap.y1) + 1, int(r.H - cap.y0) - 1)
    cols = slice(int(cap.x0) + 1, int(cap.x1) - 1)
    assert bg[rows, cols].std() > 5                      # there is text there
    assert np.array_equal(img[rows, cols], bg[rows, cols])


def test_vorticity_at_a_small_size_leaves_the_bound_vortices_out(run_dir):
    res = load_run(run_dir)
    film = Film(res, FilmOptions(width=320, height=180, frames=5, flow="vorticity"))
    r = FilmRenderer(film)
    i = 2
    t, k, alpha, hh = film.frame_state(i)
    om = r._field(i)
    g = r.grid
    # Stokes: the smoothed field integrates to the circulation of the wake vortices inside the grid
    # (common practice); the bound vortices are the airfoil itself and are not smeared over it
    x, z, gam = film.wake(i)
    inside = (x >= g.x[0]) & (x <= g.x[-1]) & (z >= g.z[0]) & (z <= g.z[-1])
    bound = float(np.sum(res.snapshots["gamma_body"][k]))
    assert abs(bound) > 0.2 * abs(gam[inside].sum())
    assert om.sum() * g.dx * g.dz == pytest.approx(gam[inside].sum(), rel=0.05, abs=1e-3 * abs(bound))
    # near the leading edge, a chord ahead of the wake, the field is quiet
    c = res.scenario.chord
    xl, zl = chord_line(c, res.scenario.pivot, alpha, 0.0, n=11)
    j, m = np.argmin(np.abs(g.x - xl[1])), np.argmin(np.abs(g.z - zl[1]))
    assert abs(om[m, j]) < 0.1 * r.field_norm.vmax


def test_warnings_banner_and_the_peak_of_the_trace(run_dir, heave_dir):
    # 15 deg at 5 Hz takes the effective angle beyond the attached-flow limit: the banner says so
    res = load_run(run_dir)
    assert res.summary["lag"]["validity"]["attached_flow_ok"] is False
    r = FilmRenderer(Film(res, FilmOptions(width=640, height=360, frames=3)))
    assert r.banner is not None and r.banner.get_text().startswith("caution: outside the model's attached-flow")
    r.frame(0)
    rend = r.canvas.get_renderer()
    assert r.banner.get_window_extent(rend).y0 >= r.ax.get_window_extent(rend).y1     # above the flow panel
    # a gentle run has no banner; its load-factor peak is marked once the film reaches it
    gentle = load_run(heave_dir)
    assert gentle.summary["lag"]["validity"]["attached_flow_ok"] is True and not gentle.scenario.warnings
    film = Film(gentle, FilmOptions(width=320, height=180, frames=27))
    r = FilmRenderer(film)
    assert r.banner is None
    tp, vp, word = r.peak
    assert (tp, vp, word) == (gentle.summary["t_n_max"], gentle.summary["n_max"], "peak")
    before = int(np.searchsorted(film.times, tp)) - 1
    r.update(before)
    assert not r.pk_mark.get_visible() and not r.pk_text.get_visible()
    r.update(before + 1)
    assert r.pk_mark.get_visible() and f"{vp:.4g}" in r.pk_text.get_text()


def test_wake_dots_are_drawn_where_the_vortices_are_with_their_sense(run_dir):
    # two vortices of opposite sense placed by hand: teal (blue above red) for counter-clockwise,
    # brick (red above blue) for clockwise, each centred on its own pixel
    res = load_run(run_dir)
    r = FilmRenderer(Film(res, FilmOptions(width=640, height=360, frames=2)))
    x = np.array([0.5 * (r.xlim[0] + r.xlim[1]), 0.75 * r.xlim[0] + 0.25 * r.xlim[1]])
    z = np.full(2, r.zlim[0] + 0.2 * (r.zlim[1] - r.zlim[0]))
    r.canvas.restore_region(r.bg)
    r.scat.set_data(x, z, np.array([r.g_lim, -r.g_lim]))
    r.ax.draw_artist(r.scat)
    img = np.asarray(r.canvas.buffer_rgba())[..., :3].astype(int)
    cols, rows = r.pixel_of(x, z)
    ccw = img[int(rows[0]), int(cols[0])]
    cw = img[int(rows[1]), int(cols[1])]
    assert ccw[2] - ccw[0] > 60 and cw[0] - cw[2] > 60
    assert img[int(rows[0]) - 12, int(cols[0])].mean() > 240      # paper a few dot radii away
