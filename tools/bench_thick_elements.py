"""Thick elements among several (``[[airfoil]]`` with ``thick``): a thick wing with a camber-line tail
against the thick wing alone.

Usage: .venv/bin/python tools/bench_thick_elements.py [--repeats N] [--steps N]

Case: a NACA 0012 wing on 160 surface panels pitching 2 degrees about 3 degrees at k = 0.2, free
wake, U dt = c / 80 (the panel count's own step), far wake merged beyond 30 chords; the pair adds
a flat camber-line tail of half the chord (12 elements) 3 chords behind and 0.5 chord up.  Each
case runs once unrecorded (numba compilation, caches), then ``--repeats`` times (default 3); the
median wall time of the whole run and per step is printed, and the pair's ratio to the wing alone;
for scale, the same pair and wing on the camber line (80 elements, same step), whose ratio is the
cost of the second wake alone (every wake vortex acts on every other).
The extra cost of the pair is the tail's wake in every sum, each element's own impulse and the
other element's vortices in the wing's surface potential (one cut each,
``panel_kernels.ray_vortex_potential``).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from unsteady import load_scenario  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_thick import timed  # noqa: E402  (one run to compile, then the median of the repeats)

U, C = 10.0, 0.2


def case(pair, steps, thick=True):
    wing = ({"shape": "naca0012", "chord": C, "thick": True, "elements": 160} if thick else
            {"shape": "naca0012", "chord": C, "thick": False, "elements": 80})
    tail = {"shape": "flat", "chord": 0.5 * C, "elements": 12, "position": [3.0 * C, 0.5 * C], "incidence": -2.0}
    dt = C / (80 * U)
    return load_scenario({
        "flow": {"speed": U, "density": 1.2},
        "airfoil": [wing, tail] if pair else wing,
        "motion": {"pitch": {"law": "sine", "amplitude": 2.0, "mean": 3.0, "reduced_frequency": 0.2}},
        "run": {"duration": steps * dt, "dt": dt, "wake": "free", "far_wake": 30},
        "output": {"plots": False}})


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeats", type=int, default=3)
    p.add_argument("--steps", type=int, default=2000)
    a = p.parse_args()
    rows = []
    for label, pair, thick in (("thick wing alone (160 panels)", False, True),
                               ("thick wing + camber-line tail", True, True),
                               ("camber wing alone (80 elements)", False, False),
                               ("camber wing + camber-line tail", True, False)):
        sc = case(pair, a.steps, thick)
        t = timed(sc, a.repeats)
        rows.append(t)
        print(f"{label:32s} {sc.steps:5d} steps: {t:7.2f} s whole run, {1e3 * t / sc.steps:6.2f} ms per step "
              f"(median of {a.repeats})")
    print(f"thick pair / thick alone: {rows[1] / rows[0]:.2f}x; camber pair / camber alone (the second wake's "
          f"share, for scale): {rows[3] / rows[2]:.2f}x")


if __name__ == "__main__":
    main()
