"""Benchmark: wall time of the linear model against the vortex model on the same scenarios; prints the figures.

    python tools/benchmark_linear.py [CHORDS] [--quick]

1. Prescribed motion (pitch-step, pitch-up, flapping-plate, perching), CHORDS
   chords per run (default 10).
2. Free heave in a 1-cosine gust (scenarios/drone-gust-1cos.toml as it
   stands): vortex model, the linear model's compiled march, the same run
   with one user observer (the runner then steps it through every row), and
   the Python march (the oracle of tests/test_linear_kernels.py).
3. A long turbulence run with free heave (scenarios/drone-turbulence.toml,
   60 s of flight, 3,600 chords; 10 s with --quick): both models, and the
   effect of the linear model's Duhamel window on the peak load factors
   (default window with the exponential-sum tail, a window of the whole run,
   and the default window with the far memory dropped).

Caution: both are inviscid attached-flow section models (no stall); load
factors here are benchmark figures, not design loads.
"""

import sys
import time
from pathlib import Path

from unsteady import load_scenario

from unsteady.linear import model as linear
from unsteady.linear.kernels import S_MAX_DEFAULT
from unsteady.simulation import models
from unsteady.simulation.runner import simulate

ROOT = Path(__file__).resolve().parent.parent
CASES = ["pitch-step.toml", "pitch-up.toml", "flapping-plate.toml", "perching.toml"]
NO_FILES = ["output.plots=false"]


def best_of(sc, n):
    best, res = float("inf"), None
    for _ in range(n):
        t0 = time.perf_counter()
        res = simulate(sc)
        best = min(best, time.perf_counter() - t0)
    return best, res


def timed(fn, n=1):
    best, out = float("inf"), None
    for _ in range(n):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def prescribed(chords):
    print(f"prescribed motion: linear vs vortex model, {chords:g} chords per run, best of 3 (linear) / 1 (vortex)")
    print(f"{'scenario':<22}{'steps':>7}{'vortex s':>11}{'linear s':>11}{'speed-up':>10}")
    for name in CASES:
        path = ROOT / "scenarios" / name
        base = load_scenario(path)
        key = "chords" if "chords" in base.data["run"] else "duration"
        value = chords if key == "chords" else chords * base.chord / base.speed
        sc_v = load_scenario(path, [f"run.{key}={value}"])
        sc_l = load_scenario(path, [f"run.{key}={value}", 'run.model="linear"'])
        simulate(sc_l)                     # warm: tables and imports
        simulate(load_scenario(path, [f"run.{key}={value / 50}"]))   # warm: numba
        tv, _ = best_of(sc_v, 1)
        tl, _ = best_of(sc_l, 3)
        print(f"{name:<22}{sc_v.steps:>7}{tv:>11.3f}{tl:>11.4f}{tv / tl:>10.0f}")


def heave_case(label, path, overrides, python_march=True):
    sc_v = load_scenario(path, overrides)
    sc_l = load_scenario(path, overrides + ['run.model="linear"'])
    simulate(sc_l)                                              # warm: tables, compiled march
    key, value = (("chords", 2) if "chords" in load_scenario(path).data["run"]
                  else ("duration", 2 * sc_v.chord / sc_v.speed))
    simulate(load_scenario(path, overrides + [f"run.{key}={value}"]))  # warm: vortex kernels
    tv, rv = best_of(sc_v, 1)
    tl, rl = best_of(sc_l, 3)
    print(f"\n{label}: {sc_v.steps} steps, {sc_v.data['run']['wake']} wake (vortex)")
    print(f"  vortex model           {tv:10.3f} s   n_max {rv.summary['n_max']:.5f}  n_min {rv.summary['n_min']:.5f}")
    print(f"  linear, compiled march {tl:10.4f} s   n_max {rl.summary['n_max']:.5f}  n_min {rl.summary['n_min']:.5f}"
          f"   speed-up {tv / tl:.0f}x")
    to, _ = timed(lambda: simulate(sc_l, [_CountRows()]), 3)
    print(f"  linear, one observer   {to:10.4f} s   (on_step for each of {sc_l.steps + 1} rows)")
    if python_march:
        tp, _ = timed(lambda: simulate_python_march(sc_l))
        print(f"  linear, Python march   {tp:10.4f} s   (speed-up {tv / tp:.0f}x; the compiled march is "
              f"{tp / tl:.0f}x faster)")
    return sc_l


class _CountRows:
    """A user observer that only counts the rows it sees."""

    rows = 0

    def on_step(self, state):
        self.rows += 1


def simulate_python_march(sc):
    """The whole linear run with the step-by-step Python march (as before the compiled one)."""
    orig = linear.heave_marcher

    def python(*a, **k):
        return orig(*a, compiled=False, **k)
    linear.heave_marcher = python
    try:
        return simulate(sc)
    finally:
        linear.heave_marcher = orig


def window_effect(sc):
    """Peak load factors of the free-heave march with three treatments of the Duhamel memory."""
    ds = 2.0 * sc.speed * sc.dt / sc.chord
    print(f"  Duhamel memory (linear march only, {sc.steps} steps, {sc.steps * ds:.0f} semichords):")
    rows = [(f"window {S_MAX_DEFAULT:g} semichords + exponential-sum tail (default)", {}),
            ("window = whole run (exact sums, O(n^2))", {"s_max": 1e12}),
            (f"window {S_MAX_DEFAULT:g} semichords, far memory dropped", {"tail": False})]
    ref = None
    for label, opts in rows:
        def run():
            m = models.linear_heave_marcher(sc, **opts)
            m.run()
            return m.motion.n_rows
        t, n = timed(run)
        n_max, n_min = max(n), min(n)
        if ref is None:
            ref = (n_max, n_min)
        print(f"    {label:<58}{t:8.3f} s  n_max {n_max:.9f}  n_min {n_min:.9f}  "
              f"(vs default {n_max - ref[0]:+.1e}, {n_min - ref[1]:+.1e})")


def main(argv):
    quick = "--quick" in argv
    args = [a for a in argv[1:] if not a.startswith("--")]
    chords = float(args[0]) if args else 10.0
    prescribed(chords)
    heave_case("free heave, 1-cosine gust (drone-gust-1cos.toml)",
               ROOT / "scenarios" / "drone-gust-1cos.toml", NO_FILES)
    seconds = 10.0 if quick else 60.0
    sc = heave_case(f"free heave, {seconds:g} s of von Karman turbulence (drone-turbulence.toml)",
                    ROOT / "scenarios" / "drone-turbulence.toml",
                    NO_FILES + [f"run.duration={seconds}"], python_march=quick)
    window_effect(sc)


if __name__ == "__main__":
    main(sys.argv)
