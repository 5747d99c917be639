"""Benchmark gust runs: a 1-cosine encounter with free heave, long turbulence runs and the far-wake choice.

Prints its figures; run with the project's venv:

    python tools/bench_gusts.py [--quick]

1. 1-cosine gust, aircraft free to heave, free wake, 2,000 steps (after a
   warm-up run that compiles the kernels).
2. The drone in turbulence (scenarios/drone-turbulence.toml) for growing
   lengths of run: wall time per simulated second, to show how the cost grows.
3. The effect of run.far_wake on the peak load factors of a turbulence run
   (the same realisation with the whole wake kept and with 10, 20, 40 chords).
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import unsteady

ROOT = Path(__file__).resolve().parents[1]


def one_cosine(steps=2000, far_wake=None):
    d = {"flow": {"speed": 15.0, "altitude": 400.0},
         "airfoil": {"shape": "naca2412", "chord": 0.25, "elements": 20},
         "aircraft": {"mass": 3.0, "wing_area": 0.55},
         "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 6.25, "arrival": 0.05},
         "run": {"chords": steps / 20.0, "wake": "free"},
         "output": {"plots": False}}
    d["run"]["far_wake"] = 1e5 if far_wake is None else far_wake   # None: whole wake free (the largest run.far_wake)
    return unsteady.load_scenario(d)


def turbulence(duration, far_wake="scenario"):
    sc = unsteady.load_scenario(ROOT / "scenarios" / "drone-turbulence.toml",
                                overrides=[f"run.duration={duration}"])
    if far_wake != "scenario":
        data = dict(sc.raw)
        run = dict(data["run"], duration=duration)
        run["far_wake"] = 1e5 if far_wake is None else far_wake   # None: whole wake free (the largest run.far_wake)
        data["run"] = run
        sc = unsteady.load_scenario(data, base_dir=sc.base_dir)
    return sc


def timed(sc):
    """(result, wall seconds); the CPU seconds of the process go to ``timed.cpu``."""
    t, c = time.perf_counter(), time.process_time()
    res = unsteady.simulate(sc)
    timed.cpu = time.process_time() - c
    return res, time.perf_counter() - t


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="shorter turbulence runs")
    args = ap.parse_args(argv)
    import os
    print(f"machine: {os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.1f} at the start")

    timed(one_cosine(steps=40))                     # compile / load the kernels
    for fw in (None, 30):
        res, wall = timed(one_cosine(far_wake=fw))
        s = res.summary
        label = "whole wake" if fw is None else f"{fw:g} chords"
        print(f"1-cosine gust, free heave, free wake, {s['steps']} steps, far_wake={label}: {wall:.2f} s "
              f"wall, {timed.cpu:.2f} s CPU "
              f"(n_max {s['n_max']:.4f}, formula ratio {s['dn_ratio']:.4f})")

    lengths = (2.0, 4.0, 8.0) if args.quick else (5.0, 10.0, 20.0, 60.0)
    print("turbulence (scenarios/drone-turbulence.toml), far_wake as in the scenario:")
    for T in lengths:
        res, wall = timed(turbulence(T))
        s = res.summary
        print(f"  {T:5.1f} s flight ({s['chords_travelled']:.0f} chords, {s['steps']} steps): {wall:7.2f} s wall, "
              f"{timed.cpu:7.2f} s CPU, {wall / T:.3f} s wall per flight second; n {s['n_min']:.3f} .. {s['n_max']:.3f}")

    T = 1.0 if args.quick else 3.0     # the whole free wake costs O(steps^3)
    print(f"far-wake choice, turbulence, {T:g} s flight (same realisation):")
    ref = None
    for fw in (None, 40.0, 20.0, 10.0):
        res, wall = timed(turbulence(T, far_wake=fw))
        s = res.summary
        if ref is None:
            ref = s
        print(f"  far_wake={'whole wake' if fw is None else f'{fw:g} chords':>12}: {wall:7.2f} s wall, {timed.cpu:7.2f} s CPU; "
              f"n_max {s['n_max']:.4f} ({s['n_max'] - ref['n_max']:+.2e}), "
              f"n_min {s['n_min']:.4f} ({s['n_min'] - ref['n_min']:+.2e})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
