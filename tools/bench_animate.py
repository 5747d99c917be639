"""Benchmark of films and pages: frames per second at 1280x720 for a wake of about 2,000 vortices, and the page of that run.

Usage: .venv/bin/python tools/bench_animate.py [--frames N] [--keep DIR] [--no-page]

Prints one line per case: frames, wall time, frames per second (render and
encode together, written to a real MP4 or GIF), the CPU time per frame of this
process and of ffmpeg, and the target the project set for it:
- 25 frames/s for the 720p film with the whole ~2,000-vortex wake in view (issue 13),
- 15 frames/s with 6 chords of wake in view, 5 with a smoothed vorticity field;
then the drawing alone (no encoding) of the main case, and the time to write the
run's page (``unsteady report``) with its film, made for the page and the run's
own film.mp4: target under 20 s each.  The machine's load average is printed
first: the figures are only comparable on an idle machine.
"""

from __future__ import annotations

import argparse
import os
import resource
import shutil
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

import unsteady
from unsteady.outputs.films import Film, FilmOptions, FilmRenderer, load_run, write_film

SCENARIO = {
    # a flapping flat plate (our own demo case), long enough for ~2,000 wake vortices
    "title": "Benchmark: flapping plate with a long wake",
    "flow": {"speed": 6.0, "density": 1.2},
    "airfoil": {"shape": "flat", "chord": 0.08, "elements": 40},
    "motion": {"pivot": 0.33,
               "pitch": {"law": "sine", "amplitude": 10.0, "reduced_frequency": 0.5, "phase": 90.0},
               "plunge": {"law": "sine", "amplitude": 0.02, "reduced_frequency": 0.5}},
    # frozen wake: the run is quick and every vortex stays on the chord's path, so with
    # --reach covering the whole wake all ~2,000 of them are drawn in every frame
    "run": {"chords": 52, "wake": "frozen", "far_wake": 1e9},   # keep all ~2,000 wake vortices
    "output": {"snapshot_every": 0.0002},
}
PAGE_TARGET_S = 20.0


def _cpu():
    """(CPU seconds of this process, of its finished children: ffmpeg)."""
    me, kids = resource.getrusage(resource.RUSAGE_SELF), resource.getrusage(resource.RUSAGE_CHILDREN)
    return me.ru_utime + me.ru_stime, kids.ru_utime + kids.ru_stime


def _verdict(value, target, below=False):
    if target is None:
        return ""
    ok = value < target if below else value >= target
    return f" (target {'<' if below else '>='} {target:g}: {'met' if ok else 'NOT met'})"


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--frames", type=int, default=150)
    ap.add_argument("--keep", default=None, help="folder to keep the run, the films and the page in")
    ap.add_argument("--no-page", action="store_true", help="skip the page timings")
    a = ap.parse_args(argv)
    base = Path(a.keep) if a.keep else Path(tempfile.mkdtemp(prefix="bench-animate-"))
    base.mkdir(parents=True, exist_ok=True)
    print(f"machine load average (1 min) {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    try:
        sc = unsteady.load_scenario(SCENARIO)
        t = time.perf_counter()
        res = unsteady.simulate(sc)
        run = res.save(base / "run", plots=False)
        res = load_run(run)
        n_wake = np.diff(res.snapshots["offsets"])
        print(f"run: {len(res.history['t']) - 1} steps in {time.perf_counter() - t:.1f} s; "
              f"{len(n_wake)} snapshots; wake vortices in the filmed snapshots: "
              f"{int(n_wake[-a.frames:].min())} to {int(n_wake.max())}")
        # the last part of the run, where the wake is longest
        span = (float(res.snapshots["t"][-min(a.frames, len(n_wake))]), None)
        whole = dict(reach=60.0)
        cases = [
            ("vortices, whole wake in view, MP4 1280x720", dict(flow="vortices", **whole), "film-vortices.mp4", 25.0),
            ("vortices, 6 chords of wake in view, MP4 1280x720", dict(flow="vortices"), "film-vortices-near.mp4",
             15.0),
            ("smoothed vorticity 160x90 grid, MP4 1280x720", dict(flow="vorticity", grid=(160, 90), **whole),
             "film-vorticity.mp4", 5.0),
            ("speed field 160x90 grid, MP4 1280x720", dict(flow="speed", grid=(160, 90)), "film-speed.mp4", None),
            ("streamlines 160x90 grid, MP4 1280x720", dict(flow="streamlines", grid=(160, 90)),
             "film-streamlines.mp4", None),
            ("vortices, GIF 640x360", dict(flow="vortices", width=640, height=360, **whole),
             "film-vortices.gif", None),
        ]
        for name, kw, fname, target in cases:
            opts = FilmOptions(frames=a.frames, span=span, **kw)
            t, (c0, k0) = time.perf_counter(), _cpu()
            write_film(res, base / fname, opts)
            dt = time.perf_counter() - t
            c1, k1 = _cpu()
            fps = a.frames / dt
            print(f"{name}: {a.frames} frames in {dt:.2f} s = {fps:.1f} frames/s{_verdict(fps, target)}; "
                  f"CPU per frame {1e3 * (c1 - c0) / a.frames:.1f} ms here, {1e3 * (k1 - k0) / a.frames:.1f} ms ffmpeg")
        # drawing alone (the frames of the first case, no encoder)
        renderer = FilmRenderer(Film(res, FilmOptions(frames=a.frames, span=span, flow="vortices", **whole)))
        t, (c0, _k) = time.perf_counter(), _cpu()
        for i in range(a.frames):
            renderer.frame_rgba(i)
        dt = time.perf_counter() - t
        print(f"drawing alone, vortices, whole wake, 1280x720: {a.frames / dt:.1f} frames/s "
              f"({1e3 * (_cpu()[0] - c0) / a.frames:.1f} ms CPU per frame)")
        if not a.no_page:
            from unsteady.outputs import report
            for label, own in (("a film made for the page", False), ("the run's own 720p film.mp4", True)):
                film = run / "film.mp4"
                if own:
                    shutil.copyfile(base / "film-vortices.mp4", film)
                elif film.exists():
                    film.unlink()
                t = time.perf_counter()
                out, _kind, info = report.write_report(run, film=True)
                dt = time.perf_counter() - t
                print(f"page of this run with {label} ({info.width}x{info.height}, {info.frames} frames): "
                      f"{dt:.1f} s, {out.stat().st_size / 2 ** 20:.2f} MB{_verdict(dt, PAGE_TARGET_S, below=True)}")
        if a.keep:
            print(f"films kept in {base}")
    finally:
        if not a.keep:
            shutil.rmtree(base, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
