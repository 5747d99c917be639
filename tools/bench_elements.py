"""Several elements in one flow: a wing with its tail against the wing alone (speed figure quoted in README).

Usage: .venv/bin/python tools/bench_elements.py [--repeats N]

A NACA 2412 wing of 0.25 m (30 elements) with a flat tail of 0.12 m (15
elements) 0.9 m behind it, heaving freely (a 3 kg aircraft, 0.55 m^2) through a
1-cosine gust of 25 chords, 3 m/s, over 60 chords of flight; both wakes free,
merged beyond 30 chords.  The wing alone is the same case without the tail.
Each runs once unrecorded (numba compilation, caches), then ``--repeats`` times
(default 1); the median wall and CPU times and their ratios are printed (target:
at most 3x). Both wakes free doubles the wake, and its sum on itself grows as the
square of its size: that sum is most of the time of either run.  With several
elements it is taken once per pair (``kernels.wake_self_velocity``: one square
root for both vortices of a pair, rows in tiles of four so that the loop
vectorizes); the wing alone keeps the full sum (its history unchanged to the bit).
On a shared machine read the CPU figures: the wall times of threaded sums swing
with the other processes' load.
"""

from __future__ import annotations

import argparse
import os
import statistics
import time

from unsteady import load_scenario, simulate

WING = {"shape": "naca2412", "thick": False, "chord": 0.25, "elements": 30}
TAIL = {"shape": "flat", "chord": 0.12, "elements": 15, "position": [0.9, 0.05], "incidence": -2.0}


def case(with_tail):
    return load_scenario({
        "flow": {"speed": 15.0, "density": 1.2},
        "airfoil": [WING, TAIL] if with_tail else WING,
        "aircraft": {"mass": 3.0, "wing_area": 0.55},
        "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 6.25, "arrival": 0.05},
        "run": {"chords": 60, "wake": "free", "far_wake": 30},
        "output": {"plots": False}})


def timed(sc, repeats):
    """Median wall time and CPU time (all threads of the process; steadier on a shared machine), s."""
    simulate(sc)
    wall, cpu = [], []
    for _ in range(repeats):
        t0, c0 = time.perf_counter(), time.process_time()
        simulate(sc)
        wall.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    return statistics.median(wall), statistics.median(cpu)


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeats", type=int, default=1)
    args = ap.parse_args()
    alone, pair = case(False), case(True)
    t_alone = timed(alone, args.repeats)
    t_pair = timed(pair, args.repeats)
    print(f"wing alone (30 elements), 60 chords, {alone.steps} steps: {t_alone[0]:.2f} s wall, "
          f"{t_alone[1]:.2f} s CPU")
    print(f"wing + tail (30 + 15 elements), same run: {t_pair[0]:.2f} s wall, {t_pair[1]:.2f} s CPU")
    print(f"ratio: {t_pair[0] / t_alone[0]:.2f}x wall, {t_pair[1] / t_alone[1]:.2f}x CPU (target: at most 3x)")
    print(f"load average (1 min): {os.getloadavg()[0]:.1f}")


if __name__ == "__main__":
    main()
