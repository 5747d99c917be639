"""Thick sections on surface panels: speed against the camber-line model, and the accuracy figures quoted in README.

Usage: .venv/bin/python tools/bench_thick.py [--repeats N]

Speed: a NACA 0012 pitching 2 degrees about 3 degrees at k = 0.2, free wake,
2,000 steps with U dt = c / 40, far wake merged beyond 30 chords: the surface
panels at 160 panels against the camber line at 40 elements on the same case.
Each model runs once unrecorded (numba compilation, caches), then ``--repeats``
times (default 3); the median wall time is printed and the ratio (target:
at most 2x).

Accuracy (steady starts, 160 panels unless said): lift of Joukowski and
Karman-Trefftz sections against the exact conformal-map values, NACA 2412 at
10 degrees (300 panels), and the largest deviation from Wagner's function of
an impulsive start of a 1 % thick section (s = 1 to 30); the harmonic pitch of a
12 % section against Theodorsen.  The checks with their sources are in
tests/validation/test_thick_sections.py, whose helpers this script reuses.
"""

from __future__ import annotations

import argparse
import math
import statistics
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests" / "validation"))

from unsteady import load_scenario, simulate, theory  # noqa: E402


def case(thick):
    U, c = 10.0, 0.2
    return load_scenario({
        "flow": {"speed": U, "density": 1.2},
        "airfoil": {"shape": "naca0012", "chord": c, "thick": thick, "elements": 160 if thick else 40},
        "motion": {"pitch": {"law": "sine", "amplitude": 2.0, "mean": 3.0, "reduced_frequency": 0.2}},
        "run": {"duration": 2000 * c / (40 * U), "dt": c / (40 * U), "wake": "free"},
        "output": {"plots": False}})


def timed(sc, repeats):
    simulate(sc)
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        simulate(sc)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def accuracy():
    import test_thick_sections as v
    from unsteady.inputs.sections import section_from_shape
    from unsteady.vortex.panels import SurfaceGeometry, SurfacePanels
    for name, x0, y0, tau in v.CASES:
        for n in (80, 160, 320):
            x, z, theta, cp_exact, cl_exact = v.conformal_section(x0, y0, n, tau)
            loads, _ = v.steady(SurfacePanels(SurfaceGeometry.from_nodes(x, z, 1.0, 0.25)), 8.0)
            print(f"{name:32s} {n:4d} panels, 8 deg: cl {100 * (loads['cl'] / cl_exact(8.0) - 1):+.3f} % "
                  f"(impulse {100 * (loads['cl_impulse'] / cl_exact(8.0) - 1):+.3f} %)")
    loads, _ = v.steady(SurfacePanels(SurfaceGeometry.from_section(section_from_shape("naca2412"), 300, 1.0, 0.25)), 10.0)
    print(f"NACA 2412, 10 deg, 300 panels: cl {loads['cl']:.4f} (impulse {loads['cl_impulse']:.4f}; "
          f"quoted 1.456)")
    kw = dict(airfoil__shape="naca0001", motion__pitch={"law": "constant", "value": 2.0})
    h = simulate(v.thick_scenario(run__chords=15.0, **kw)).history
    cl_ss = simulate(v.thick_scenario(run__chords=0.05, run__start="steady", **kw)).history["cl"][0]
    s = 2.0 * h["chords"]
    keep = (s >= 1.0) & (s <= 30.0)
    dev = h["cl"][keep] / cl_ss / theory.wagner(s[keep]) - 1.0
    print(f"impulsive start, 1 % section: largest deviation from Wagner (s = 1..30) {100 * np.max(np.abs(dev)):.2f} %")
    k = 0.2
    sc = v.thick_scenario(motion__pitch={"law": "sine", "amplitude": 2.0, "reduced_frequency": k},
                          run__chords=12.0, run__start="steady")
    h = simulate(sc).history
    t = h["t"]
    omega = 2 * sc.speed * k / sc.chord
    last = t >= t[-1] - 2 * (2 * math.pi / omega)
    basis = np.column_stack([np.cos(omega * t[last]), np.sin(omega * t[last]), np.ones(last.sum())])
    (a, b, _), *_ = np.linalg.lstsq(basis, h["cl"][last], rcond=None)
    ref = theory.theodorsen_loads(k, alpha_amp=math.radians(2.0), pivot=0.25)[0] * -1j
    ratio = complex(a, -b) / ref
    print(f"NACA 0012 pitching 2 deg at k = 0.2: lift amplitude {abs(ratio):.4f} x Theodorsen, "
          f"phase {math.degrees(np.angle(ratio)):+.2f} deg")


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeats", type=int, default=3)
    args = ap.parse_args()
    t_thin = timed(case(False), args.repeats)
    t_thick = timed(case(True), args.repeats)
    print(f"2,000 steps, free wake: camber line (40 elements) {t_thin:.2f} s, surface panels (160) "
          f"{t_thick:.2f} s: {t_thick / t_thin:.2f}x (target at most 2x)")
    accuracy()


if __name__ == "__main__":
    main()
