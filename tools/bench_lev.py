"""Benchmark leading-edge shedding: what the LESP criterion costs against the same run without it.

Prints its figures; run with the project's venv:

    python tools/bench_lev.py

The case: a flat plate pitched up by 45 degrees about its leading edge at a
reduced pitch rate alpha_dot c / (2U) = 0.2 (corners rounded over 0.01 s),
then held, 10 chords of travel in all, 40 elements, free wake, default step.
Both runs are timed after a warm-up that compiles the kernels; the best of
three is taken.  Trailing- and leading-edge vortices live in one wake array,
so the Biot-Savart sums stay one kernel call each; what shedding adds is the
trial solve of each step, the soft-core corrections of the leading-edge
vortices (two small kernel calls) and the larger wake (leading-edge vortices
shed on top of the trailing edge's).
"""

from __future__ import annotations

import math
import time

import numpy as np

import unsteady

U, C = 10.0, 0.2


def case(crit, chords=10.0):
    d = {"flow": {"speed": U, "density": 1.2}, "airfoil": {"chord": C, "elements": 40},
         "motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0,
                                            "duration": math.radians(45.0) / (0.4 * U / C), "smoothing": 0.01}},
         "run": {"chords": chords, "wake": "free"}, "output": {"plots": False}}
    if crit is not None:
        d["airfoil"]["lesp_critical"] = crit
    return unsteady.load_scenario(d)


def best_of(sc, n=3):
    best, res = float("inf"), None
    for _ in range(n):
        t0 = time.perf_counter()
        res = unsteady.simulate(sc)
        best = min(best, time.perf_counter() - t0)
    return best, res


def main():
    unsteady.simulate(case(0.18, chords=0.5))           # compile and warm the caches
    rows = []
    for label, crit in (("attached (no lesp_critical)", None), ("lesp_critical = 0.18", 0.18)):
        sc = case(crit)
        wall, res = best_of(sc)
        h = res.history
        rows.append((label, wall, sc.steps, int(h["wake_vortices"][-1]), res.summary))
    base = rows[0][1]
    print(f"45-degree pitch-up about the leading edge, k = 0.2, 10 chords, 40 elements, free wake, "
          f"{rows[0][2]} steps:")
    for label, wall, steps, wake, s in rows:
        extra = (f"; onset at t = {s['lev_onset_t']:.4g} s, cl_max {s['cl_max']:.3f} (running mean)"
                 if s.get("lev_onset_t") is not None else f"; cl_max {s['cl_max']:.3f}")
        print(f"  {label:30s} {wall:6.2f} s  ({1e3 * wall / steps:.2f} ms/step, {wake} wake vortices "
              f"at the end{extra})")
    ratio = rows[1][1] / base
    print(f"  shedding costs {ratio:.2f}x the attached run (target: within 3x)")
    h_lev = rows[1][4]
    print(f"  |LESP| max with shedding {h_lev['lesp_max']:.4f}; without {rows[0][4]['lesp_max']:.4f}")
    return 0 if np.isfinite(ratio) else 1


if __name__ == "__main__":
    raise SystemExit(main())
