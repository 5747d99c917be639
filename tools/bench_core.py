"""Benchmark of the core vortex model: kernel throughput, run time, compile time.

Prints:
- wake-on-wake kernel pair interactions per second (float64), over wake sizes;
- a 2,000-step free-wake run (NACA 2412, 40 elements) once compiled;
- the first run in a fresh process with an empty numba cache (compile included);
- the time per step against the wake size.

Run:  python tools/bench_core.py [--repeat N] [--warm-only]

``--repeat N`` runs each compiled run N times and prints the best (the
machine may be shared); ``--warm-only`` skips the kernel and cold-start parts.
"""

import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

SCENARIO = {
    "flow": {"speed": 15.0, "density": 1.2},
    "airfoil": {"shape": "naca2412", "chord": 0.25, "elements": 40},
    "motion": {"pivot": 0.25, "pitch": {"law": "sine", "amplitude": 5.0, "frequency": 2.0, "mean": 3.0}},
    "run": {"chords": 50.0, "wake": "free", "dt": 0.25 / (15.0 * 40)},
    "output": {"plots": False},
}


def kernel_throughput():
    from unsteady.vortex.kernels import induced_velocity
    rng = np.random.default_rng(0)
    print("wake-on-wake kernel (float64, Vatistas core), both cores:")
    for n in (500, 1000, 2000, 4000, 8000):
        x, z, g = rng.random((3, n))
        u = np.empty(n)
        w = np.empty(n)
        induced_velocity(x, z, x, z, g, 0.01, u, w)
        reps = max(3, int(4e9 / n ** 2))
        t0 = time.perf_counter()
        for _ in range(reps):
            induced_velocity(x, z, x, z, g, 0.01, u, w)
        el = time.perf_counter() - t0
        print(f"  n = {n:5d}: {n * n * reps / el / 1e9:6.2f} e9 pair interactions / s")


def warm_run(repeat=1):
    import unsteady

    class StepTimer:
        def __init__(self):
            self.t = []
            self.m = []

        def on_step(self, s):
            self.t.append(time.perf_counter())
            self.m.append(s.x_wake.shape[0])

    unsteady.simulate({**SCENARIO, "run": {**SCENARIO["run"], "chords": 2.0}})   # compile / load cache
    for label, far in (("default far wake (merged beyond 30 chords)", None),
                       ("whole wake free", 1e5)):
        sc = {**SCENARIO, "run": {**SCENARIO["run"], **({"far_wake": far} if far else {})}}
        times = []
        for _ in range(max(1, repeat)):
            timer = StepTimer()
            t0 = time.perf_counter()
            res = unsteady.simulate(sc, observers=[timer])
            times.append(time.perf_counter() - t0)
        el = min(times)
        steps = len(res.history["t"]) - 1
        every = "" if len(times) == 1 else " (best of " + ", ".join(f"{x:.2f}" for x in times) + ")"
        print(f"\n{steps}-step free-wake run, NACA 2412, 40 elements, compiled, {label}: {el:.2f} s "
              f"({1e3 * el / steps:.3f} ms per step){every}")
    t = np.array(timer.t)
    m = np.array(timer.m)
    dt = np.diff(t)
    print("time per step against wake size:")
    for lo in range(0, len(dt), max(1, len(dt) // 5)):
        sl = slice(lo, min(lo + 100, len(dt)))
        print(f"  wake ~{int(m[sl].mean()):5d} vortices: {1e3 * np.median(dt[sl]):.3f} ms per step")


def cold_run():
    cache = Path(tempfile.mkdtemp(prefix="unsteady-numba-cache-"))
    env = dict(os.environ, NUMBA_CACHE_DIR=str(cache))
    code = ("import time; t0 = time.perf_counter(); import unsteady; "
            f"unsteady.simulate({SCENARIO!r}); print(time.perf_counter() - t0)")
    try:
        first = float(subprocess.run([sys.executable, "-c", code], env=env, capture_output=True,
                                     text=True, check=True).stdout.strip().splitlines()[-1])
        second = float(subprocess.run([sys.executable, "-c", code], env=env, capture_output=True,
                                      text=True, check=True).stdout.strip().splitlines()[-1])
    finally:
        shutil.rmtree(cache, ignore_errors=True)
    print(f"\nfirst run of a fresh install (empty numba cache, import + compile + 2,000 steps): {first:.2f} s")
    print(f"second process with the cache on disk: {second:.2f} s")


if __name__ == "__main__":
    import argparse
    ap = argparse.ArgumentParser(description="Benchmark of the core vortex model.")
    ap.add_argument("--repeat", type=int, default=1, help="compiled runs per case; the best is printed")
    ap.add_argument("--warm-only", action="store_true", help="only the compiled runs")
    args = ap.parse_args()
    if not args.warm_only:
        kernel_throughput()
    warm_run(args.repeat)
    if not args.warm_only:
        cold_run()
