"""`unsteady report`: the self-contained page of a run and of a sweep, its bad inputs, and the page in a
real browser (headless Chromium driven over the DevTools protocol on a pipe: no network port)."""

from __future__ import annotations

import base64
import json
import os
import re
import shutil
import subprocess
import tempfile
import time
from pathlib import Path

import numpy as np
import pytest

import unsteady
from unsteady.apps import cli
from unsteady.core.cautions import GUST_CAUTION, MODEL_CAUTION, SWEEP_CAUTION
from unsteady.core.version import __version__
from unsteady.outputs import report

ROOT = Path(__file__).resolve().parents[1]

GUST = """
title = "Test drone in a 1-cosine gust"
[flow]
speed = 15.0
altitude = 400.0
[airfoil]
shape = "naca2412"
chord = 0.25
elements = 12
[aircraft]
mass = 3.0
wing_area = 0.55
[gust]
profile = "one-minus-cosine"
amplitude = 3.0
length = 1.0
arrival = 0.01
[run]
chords = 8
wake = "free"
[output]
snapshot_every = 0.004
"""

SWEEP = """
title = "Test sweep"
[flow]
speed = 16.0
altitude = 400.0
[airfoil]
shape = "naca2412"
chord = 0.22
elements = 8
[aircraft]
mass = 2.4
wing_area = 0.40
[gust]
profile = "one-minus-cosine"
amplitude = 4.0
length = 1.1
arrival = 0.02
[run]
chords = 12
wake = "frozen"
model = "linear"
[sweep]
name = "H{gust.length}"
envelope = { value = "n_max", across = "gust.length" }
[sweep.grid]
"gust.length" = [0.44, 1.1]
"""


def _run(tmp, text, name, overrides=None, plots=True):
    p = tmp / f"{name}.toml"
    p.write_text(text)
    res = unsteady.simulate(unsteady.load_scenario(p, overrides=overrides))
    return res.save(tmp / name, plots=plots)


@pytest.fixture(scope="module")
def gust_run(tmp_path_factory):
    """A small vortex run free to heave in a gust (about 180 steps), with its pictures."""
    return _run(tmp_path_factory.mktemp("gust"), GUST, "gust")


@pytest.fixture(scope="module")
def gust_page(gust_run):
    out, kind, film = report.write_report(gust_run)
    return out, film


@pytest.fixture(scope="module")
def pitch_run(tmp_path_factory):
    """The bundled pitch ramp on the linear model, saved without pictures (the page must draw them)."""
    tmp = tmp_path_factory.mktemp("pitch")
    text = (ROOT / "scenarios" / "pitch-up.toml").read_text()
    return _run(tmp, text, "pitch", ["run.model=linear", "run.duration=0.2", "output.snapshot_every=0.01"],
                plots=False)


@pytest.fixture(scope="module")
def sweep_dir(tmp_path_factory):
    """Two tiny linear cases run with run_sweep on an in-process cluster."""
    from distributed import Client, LocalCluster

    from unsteady.apps.sweep import run_sweep
    tmp = tmp_path_factory.mktemp("sweep")
    p = tmp / "sw.toml"
    p.write_text(SWEEP)
    with LocalCluster(n_workers=1, threads_per_worker=1, processes=False, dashboard_address=None) as lc, \
            Client(lc) as client:
        run_sweep(unsteady.load_scenario(p), tmp / "out", client=client)
    return tmp / "out"


def _refs(text):
    """Every address the page names: src/href/poster attributes and CSS url()."""
    attrs = re.findall(r"""\b(?:src|href|poster|data|action)\s*=\s*["']([^"']*)["']""", text)
    return attrs + re.findall(r"url\(([^)]*)\)", text)


def _assert_self_contained(text):
    assert "<script" not in text.lower()
    refs = _refs(text)
    assert refs, "the page names no picture at all"
    bad = [r[:60] for r in refs if not (r.startswith("data:") or r.startswith("#"))]
    assert not bad, f"the page refers outside itself: {bad}"
    # outside the data URIs no address of any kind
    plain = re.sub(r"data:[a-z/0-9.+-]+;base64,[A-Za-z0-9+/=]+", "", text)
    assert not re.search(r"https?:|//|file:", plain), re.search(r".{40}(https?:|//|file:).{40}", plain)


# ---------------------------------------------------------------------------
# the page of a run

def test_run_page_holds_every_section_and_number(gust_run, gust_page):
    out, film = gust_page
    text = out.read_text()
    s = json.loads((gust_run / "summary.json").read_text())
    assert out == gust_run / "report.html" and report.MARK in text[:4096]
    for ident in ("scenario", "numbers", "validity", "film", "pictures", "every-number", "scenario-file"):
        assert f'id="{ident}"' in text
    assert "Test drone in a 1-cosine gust" in text
    # the scenario in words
    assert "Flight speed 15 m/s" in text and "standard atmosphere at 400 m" in text
    assert "a NACA 2412 section, chord 0.25 m" in text
    assert "a 1-cosine vertical gust of 3 m/s peak, 1 m long (4 chords)" in text
    assert "mass 3 kg" in text and "wing area 0.55 m&sup2;" in text
    # headline numbers with units and times
    for key in ("cl_max", "cl_min", "cm_max", "cm_min", "n_max", "dn_formula", "dn_max"):
        assert report.fmt(s[key]) in text, key
    assert f"t = {report.fmt(s['t_n_max'])} s" in text
    assert "Largest load factor n" in text and "Gust-formula estimate of the increment" in text
    ratio = s.get("dn_ratio")
    assert (report.fmt(ratio) in text) if ratio is not None else (s["dn_ratio_note"] in text)
    # verdict, cautions, resolved scenario, version
    assert "attached-flow range" in text
    assert MODEL_CAUTION in text and GUST_CAUTION in text
    assert 'profile = &quot;one-minus-cosine&quot;' in text
    assert f"unsteady {__version__}" in text
    # every PNG of the run, and the film, inside the page
    pngs = sorted(p.name for p in gust_run.glob("*.png"))
    assert len(pngs) >= 5
    for name in pngs:
        blob = base64.b64encode((gust_run / name).read_bytes()).decode()
        assert f"data:image/png;base64,{blob}" in text, name
    assert film is not None and (film.width, film.height) == report.FILM_SIZE
    assert 'data:video/mp4;base64,' in text and f'width="{film.width}" height="{film.height}"' in text
    assert film.frames <= report.FILM_FRAMES and film.made
    _assert_self_contained(text)


def test_words_of_a_pitch_ramp_and_a_sine():
    sc = unsteady.load_scenario(ROOT / "scenarios" / "pitch-up.toml")
    words = " ".join(report.scenario_words(sc))
    assert ("Pitch: a ramp from 2 to 10 deg over 0.1 s, starting at t = 0.05 s (corners rounded over 0.01 s), "
            "about the quarter chord.") in words
    assert "No prescribed motion" not in words and "Gust" not in words
    # k = omega c / (2 U) (the interface's definition): k = 0.2 at U = 10 m/s, c = 0.5 m is f = 2 U k / (2 pi c)
    w = report.law_words({"law": "sine", "amplitude": 2.0, "reduced_frequency": 0.2}, "deg", 10.0, 0.5)
    assert w == f"a sine of amplitude 2 deg at {10.0 * 0.2 / (np.pi * 0.5):.4g} Hz (reduced frequency k = 0.2)"
    both = [{"law": "constant", "value": 1.0}, {"law": "step", "value": 3.0, "time": 0.1}]
    assert report.law_words(both, "deg") == "held at 1 deg plus a step to 3 deg at t = 0.1 s"


def test_missing_pictures_are_drawn_elsewhere_and_lag_shown(pitch_run):
    before = sorted(os.listdir(pitch_run))
    assert not any(n.endswith(".png") for n in before)
    out = pitch_run / "page.html"
    assert cli.main(["report", str(pitch_run), "--out", str(out), "--quiet", "--no-film"]) == 0
    assert sorted(os.listdir(pitch_run)) == sorted(before + ["page.html"])
    text = out.read_text()
    assert text.count("data:image/png;base64,") >= 3 and "histories.png" in text
    s = json.loads((pitch_run / "summary.json").read_text())
    assert report.fmt(s["lag"]["t90"]) in text and "Delay of the 90 % point behind quasi-steady" in text
    assert GUST_CAUTION not in text and MODEL_CAUTION in text   # no load factors: the model caution only
    assert "linear indicial model" in text
    assert "left out on request (--no-film)" in text and "data:video/mp4" not in text


def test_a_runs_own_film_is_used(gust_run, tmp_path):
    from unsteady.outputs.films import FilmOptions, load_run, write_film
    run = tmp_path / "own"
    shutil.copytree(gust_run, run)
    (run / "report.html").unlink()
    write_film(load_run(run), run / "film.mp4", FilmOptions(width=320, height=180, frames=12))
    out, kind, film = report.write_report(run)
    assert (film.width, film.height, film.frames, film.made) == (320, 180, 12, False)
    blob = base64.b64encode((run / "film.mp4").read_bytes()).decode()
    assert f"data:video/mp4;base64,{blob}" in out.read_text() and "the run&#x27;s own film.mp4" in out.read_text()


def test_page_is_replaced_only_when_ours(gust_run, tmp_path, capsys):
    run = tmp_path / "r"
    shutil.copytree(gust_run, run)
    first = (run / "report.html").read_text()
    assert cli.main(["report", str(run), "--quiet"]) == 0        # our own page: replaced
    assert (run / "report.html").read_text() != first            # (a new time stamp at least)
    assert capsys.readouterr() == ("", "")                       # --quiet: nothing said


def test_writing_is_atomic(gust_run, tmp_path, monkeypatch):
    run = tmp_path / "r"
    shutil.copytree(gust_run, run)
    old = (run / "report.html").read_bytes()

    def broken(src, dst):
        raise OSError("disk full")
    monkeypatch.setattr(os, "replace", broken)
    with pytest.raises(OSError):
        report.write_report(run)
    assert (run / "report.html").read_bytes() == old
    assert not [n for n in os.listdir(run) if ".part" in n]


# ---------------------------------------------------------------------------
# the page of a sweep

def test_sweep_page_lists_and_links_every_case(sweep_dir):
    out = sweep_dir / "report.html"
    assert cli.main(["report", str(sweep_dir), "--quiet"]) == 0
    text = out.read_text()
    rows = report.read_sweep(sweep_dir)[1]            # keyed by column, the header less its unit
    assert len(rows) == 2 and {r["status"] for r in rows} == {"ok"}
    env = base64.b64encode((sweep_dir / "envelope.png").read_bytes()).decode()
    assert f"data:image/png;base64,{env}" in text
    assert "<th>gust.length (m)</th>" in text and "ratio to gust formula" in text and "n max" in text
    for i, r in enumerate(rows, 1):
        assert f'<a href="#case-{i}">{r["name"]}</a>' in text and f'id="case-{i}"' in text
        for key in ("n_max", "cl_max", "dn_ratio", "dn_formula", "t_n_max"):
            assert report.fmt(float(r[key])) in text, key
    assert SWEEP_CAUTION in text
    best = max(rows, key=lambda r: float(r["n_max"]))
    assert f"The largest load factor is {report.fmt(float(best['n_max']))}, in case {best['name']}." in text
    _assert_self_contained(text)


# ---------------------------------------------------------------------------
# bad input: one line, exit 2, nothing written

def _bad_cases(tmp, gust_run):
    empty = tmp / "empty"
    empty.mkdir()
    cases = {"neither": (empty, None, "RUN_DIR|SWEEP_DIR: is neither a run")}
    for name, file, content, why in (("no-summary", "summary.json", None, "summary.json: missing"),
                                     ("bad-summary", "summary.json", "{ not json", "summary.json: damaged"),
                                     ("no-history", "history.csv", None, "history.csv: missing"),
                                     ("bad-history", "history.csv", "t,cl,cd,cm\n0,1,x,2\n", "history.csv: damaged"),
                                     ("short-history", "history.csv", "t,cl\n0,1\n", "history.csv: lacks")):
        d = tmp / name
        shutil.copytree(gust_run, d)
        (d / "report.html").unlink()
        if content is None:
            (d / file).unlink()
        else:
            (d / file).write_text(content)
        cases[name] = (d, None, why)
    good = tmp / "good"
    shutil.copytree(gust_run, good)
    (good / "report.html").unlink()
    (good / "notes.html").write_text("<html>my own notes</html>")
    cases["not-html"] = (good, good / "page.txt", "--out: must end in .html")
    cases["no-folder"] = (good, tmp / "nowhere" / "page.html", "--out: folder")
    cases["foreign"] = (good, good / "notes.html", "--out: exists and was not written by 'unsteady report'")
    cases["out-is-folder"] = (good, tmp / "empty.html", "--out: is a folder")
    (tmp / "empty.html").mkdir()
    return cases


def _listing(root):
    return sorted((str(p.relative_to(root)), p.stat().st_size if p.is_file() else -1) for p in root.rglob("*"))


def test_bad_inputs_exit_2_and_write_nothing(gust_run, tmp_path, capsys):
    cases = _bad_cases(tmp_path, gust_run)
    before = _listing(tmp_path)
    for name, (folder, out, why) in cases.items():
        argv = ["report", str(folder)] + (["--out", str(out)] if out is not None else [])
        assert cli.main(argv) == 2, name
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and err[0].startswith("error: ") and why in err[0], (name, err)
        assert _listing(tmp_path) == before, name
    assert cli.main(["report", str(tmp_path / "absent")]) == 2
    assert "no such folder" in capsys.readouterr().err


def test_damaged_sweep_table(tmp_path, capsys):
    (tmp_path / "sweep.csv").write_text("a,b\n1,2\n")
    assert cli.main(["report", str(tmp_path)]) == 2
    assert "sweep.csv: damaged" in capsys.readouterr().err
    assert sorted(os.listdir(tmp_path)) == ["sweep.csv"]


# ---------------------------------------------------------------------------
# in a real browser

def _chromium():
    for name in ("chromium", "chromium-browser", "google-chrome"):
        exe = shutil.which(name)
        if exe:
            return exe
    return None


class Browser:
    """Headless Chromium driven over the DevTools protocol on a pipe (fds 3 and 4; no port opened)."""

    def __init__(self, exe):
        r_in, w_in = os.pipe()       # we write, the browser reads on fd 3
        r_out, w_out = os.pipe()     # the browser writes on fd 4, we read
        self.profile = tempfile.mkdtemp(prefix="unsteady-browser-")

        def child():
            a, b = os.dup(r_in), os.dup(w_out)
            os.dup2(a, 3)
            os.dup2(b, 4)
        self.proc = subprocess.Popen(
            [exe, "--headless", "--no-sandbox", "--disable-gpu", "--remote-debugging-pipe", "--no-first-run",
             "--mute-audio", "--hide-scrollbars", f"--user-data-dir={self.profile}", "about:blank"],
            pass_fds=(3, 4), preexec_fn=child, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        os.close(r_in)
        os.close(w_out)
        self.w = os.fdopen(w_in, "wb", buffering=0)
        self.r = os.fdopen(r_out, "rb", buffering=0)
        self.buf, self.n, self.events = b"", 0, []

    def _message(self):
        while b"\0" not in self.buf:
            chunk = self.r.read(1 << 16)
            if not chunk:
                raise RuntimeError("the browser closed the pipe")
            self.buf += chunk
        msg, self.buf = self.buf.split(b"\0", 1)
        return json.loads(msg)

    def call(self, method, params=None, session=None):
        self.n += 1
        msg = {"id": self.n, "method": method, "params": params or {}}
        if session:
            msg["sessionId"] = session
        self.w.write(json.dumps(msg).encode() + b"\0")
        while True:
            m = self._message()
            if m.get("id") == self.n:
                if "error" in m:
                    raise RuntimeError(f"{method}: {m['error']}")
                return m["result"]
            self.events.append(m)

    def wait_event(self, method, timeout=60.0):
        t_end = time.monotonic() + timeout
        while time.monotonic() < t_end:
            for e in self.events:
                if e.get("method") == method:
                    self.events.remove(e)
                    return e
            self.events.append(self._message())
        raise TimeoutError(method)

    def open(self, url, width=1100, height=1400):
        """A new tab showing ``url``, with the network log on; returns its session."""
        target = self.call("Target.createTarget", {"url": "about:blank"})["targetId"]
        s = self.call("Target.attachToTarget", {"targetId": target, "flatten": True})["sessionId"]
        for m in ("Network.enable", "Page.enable"):
            self.call(m, session=s)
        self.call("Emulation.setDeviceMetricsOverride",
                  {"width": width, "height": height, "deviceScaleFactor": 1, "mobile": False}, session=s)
        self.events.clear()
        self.call("Page.navigate", {"url": url}, session=s)
        self.wait_event("Page.loadEventFired")
        return s

    def requested(self):
        return [e["params"]["request"]["url"] for e in self.events if e.get("method") == "Network.requestWillBeSent"]

    def close(self):
        try:
            self.call("Browser.close")
            self.proc.wait(timeout=20)
        except Exception:
            self.proc.kill()
            self.proc.wait()
        shutil.rmtree(self.profile, ignore_errors=True)


@pytest.fixture(scope="module")
def browser():
    exe = _chromium()
    if exe is None:
        print("no browser: .ci/run installs Debian's chromium; it could not be installed here")
        pytest.skip("no chromium on this machine (and .ci/run could not install it)")
    b = Browser(exe)
    yield b
    b.close()


FILM_STATE = """new Promise((done) => {
  const v = document.querySelector('video');
  if (!v) { done(JSON.stringify({event: 'no video'})); return; }
  const tell = (what) => done(JSON.stringify({event: what, width: v.videoWidth, height: v.videoHeight,
                                              duration: v.duration, error: v.error && v.error.code}));
  if (v.readyState >= 2) tell('loadeddata');
  v.addEventListener('loadeddata', () => tell('loadeddata'));
  v.addEventListener('error', () => tell('error'));
  v.load();
  setTimeout(() => tell('timeout'), 20000);
})"""


def _screenshot_varies(b, s, path):
    shot = b.call("Page.captureScreenshot", {"format": "png", "captureBeyondViewport": False}, session=s)
    path.write_bytes(base64.b64decode(shot["data"]))
    import imageio.v3 as iio
    img = iio.imread(path)[..., :3].astype(float)
    colours = np.unique(img.reshape(-1, 3), axis=0).shape[0]
    return img.std(), colours


def test_in_a_browser_the_film_plays_and_nothing_is_fetched(browser, gust_page, tmp_path):
    out, film = gust_page
    url = out.resolve().as_uri()
    s = browser.open(url)
    state = browser.call("Runtime.evaluate", {"expression": FILM_STATE, "awaitPromise": True,
                                              "returnByValue": True}, session=s)["result"]["value"]
    state = json.loads(state)
    assert state["event"] == "loadeddata", state
    assert (state["width"], state["height"]) == (film.width, film.height) == report.FILM_SIZE
    assert abs(state["duration"] - film.frames / film.fps) < 0.2
    urls = browser.requested()
    assert url in urls
    assert all(u == url or u.startswith("data:") for u in urls), [u[:60] for u in urls]
    std, colours = _screenshot_varies(browser, s, tmp_path / "run.png")
    assert std > 10 and colours > 50, (std, colours)


def test_in_a_browser_the_sweep_page_shows(browser, sweep_dir, tmp_path):
    out = sweep_dir / "report.html"
    if not out.exists():
        report.write_report(sweep_dir)
    url = out.resolve().as_uri()
    s = browser.open(url)
    urls = browser.requested()
    assert all(u == url or u.startswith("data:") for u in urls), [u[:60] for u in urls]
    n = browser.call("Runtime.evaluate", {"expression": "document.querySelectorAll('img').length",
                                          "returnByValue": True}, session=s)["result"]["value"]
    loaded = browser.call("Runtime.evaluate", {"expression": "[...document.images].every(i => i.naturalWidth > 0)",
                                               "returnByValue": True}, session=s)["result"]["value"]
    assert n == 1 and loaded
    std, colours = _screenshot_varies(browser, s, tmp_path / "sweep.png")
    assert std > 10 and colours > 20, (std, colours)


def test_in_a_browser_the_checks_catch_an_outside_reference(browser, gust_run, tmp_path):
    # negative control: a page that names a local picture is flagged by both checks
    pic = tmp_path / "outside.png"
    shutil.copy(next(gust_run.glob("*.png")), pic)
    leaky = tmp_path / "leaky.html"
    leaky.write_text(report.page("leaky", f'<p>x</p><img src="{pic.as_uri()}" alt="x">'))
    with pytest.raises(AssertionError):
        _assert_self_contained(leaky.read_text())
    browser.open(leaky.as_uri())
    assert pic.as_uri() in browser.requested()
