"""Benchmark: wall time of the linear model against the vortex model on the same scenarios; prints the figures."""

import sys
import time
from pathlib import Path

from unsteady import load_scenario
from unsteady.runner import simulate

ROOT = Path(__file__).resolve().parent.parent
CASES = ["pitch-step.toml", "pitch-up.toml", "flapping-plate.toml", "perching.toml"]


def best_of(sc, n):
    best = float("inf")
    for _ in range(n):
        t0 = time.perf_counter()
        simulate(sc)
        best = min(best, time.perf_counter() - t0)
    return best


def main(argv):
    chords = float(argv[1]) if len(argv) > 1 else 10.0
    print(f"linear vs vortex model, {chords:g} chords per run, best of 3 (linear) / 1 (vortex)")
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
        tv = best_of(sc_v, 1)
        tl = best_of(sc_l, 3)
        print(f"{name:<22}{sc_v.steps:>7}{tv:>11.3f}{tl:>11.4f}{tv / tl:>10.0f}")


if __name__ == "__main__":
    main(sys.argv)
