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

A second block times the same pitch-up for two equal plates (the second 1.5
chords aft of and 1.5 chords above the first's leading edge): attached, only
the first shedding, and both shedding with their own critical values (0.18 and
0.2), the border then growing to four rows on the steps both leading edges shed.
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


def pair_case(crit_1, crit_2, chords=10.0):
    first = {"chord": C, "elements": 40}
    second = {"chord": C, "elements": 40, "position": [1.5 * C, 1.5 * C]}
    if crit_1 is not None:
        first["lesp_critical"] = crit_1
    if crit_2 is not None:
        second["lesp_critical"] = crit_2
    d = {"flow": {"speed": U, "density": 1.2}, "airfoil": [first, second],
         "motion": {"pivot": 0.0, "pitch": {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0,
                                            "duration": math.radians(45.0) / (0.4 * U / C), "smoothing": 0.01}},
         "run": {"chords": chords, "wake": "free"}, "output": {"plots": False}}
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
    pairs = []
    for label, c1, c2 in (("attached", None, None), ("first sheds (0.18)", 0.18, None),
                          ("both shed (0.18, 0.2)", 0.18, 0.2)):
        sc = pair_case(c1, c2)
        wall, res = best_of(sc)
        pairs.append((label, wall, sc.steps, int(res.history["wake_vortices"][-1]), res.summary))
    print(f"two plates (the second 1.5 chords aft and above), the same pitch-up, 40 + 40 elements, "
          f"{pairs[0][2]} steps:")
    for label, wall, steps, wake, s in pairs:
        onsets = ", ".join(f"element {k[-1]} from {s[k]:.4g} s" for k in ("lev_onset_t_1", "lev_onset_t_2")
                           if s.get(k) is not None)
        print(f"  {label:30s} {wall:6.2f} s  ({1e3 * wall / steps:.2f} ms/step, {wake} wake vortices at the end"
              + (f"; {onsets}" if onsets else "") + ")")
    print(f"  both shedding cost {pairs[2][1] / pairs[0][1]:.2f}x the attached pair, "
          f"{pairs[2][1] / pairs[1][1]:.2f}x the pair with only the first shedding")
    return 0 if np.isfinite(ratio) else 1


if __name__ == "__main__":
    raise SystemExit(main())
