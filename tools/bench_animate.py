"""Benchmark of film rendering and encoding: frames per second at 1280x720 for a wake of about 2,000 vortices.

Usage: .venv/bin/python tools/bench_animate.py [--frames N] [--keep DIR]

Prints one line per case: frames, wall time, frames per second (render and
encode together, written to a real MP4 or GIF), and the target the project set for it (15 frames/s with wake vortices, 5 with a
smoothed vorticity field, at 1280x720 with a wake of about 2,000 vortices).
"""

from __future__ import annotations

import argparse
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

import unsteady
from unsteady.outputs.films import FilmOptions, load_run, write_film

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


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--frames", type=int, default=150)
    ap.add_argument("--keep", default=None, help="folder to keep the run and the films in")
    a = ap.parse_args(argv)
    base = Path(a.keep) if a.keep else Path(tempfile.mkdtemp(prefix="bench-animate-"))
    base.mkdir(parents=True, exist_ok=True)
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
        ("vortices, whole wake in view, MP4 1280x720", dict(flow="vortices", **whole), "film-vortices.mp4", 15.0),
        ("vortices, 6 chords of wake in view, MP4 1280x720", dict(flow="vortices"), "film-vortices-near.mp4", 15.0),
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
        t = time.perf_counter()
        write_film(res, base / fname, opts)
        dt = time.perf_counter() - t
        fps = a.frames / dt
        goal = f" (target >= {target:g}: {'met' if fps >= target else 'NOT met'})" if target else ""
        print(f"{name}: {a.frames} frames in {dt:.2f} s = {fps:.1f} frames/s{goal}")
    if a.keep:
        print(f"films kept in {base}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
