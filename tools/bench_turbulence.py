"""Benchmark the continuous-turbulence statistics: a 900-second record, the vortex model's cost, N0 against dt.

Prints its figures; run with the project's venv:

    python tools/bench_turbulence.py [--quick]

1. The statistics of 900 s of flight in scenarios/drone-turbulence.toml with the
   linear model (1.3 million steps): a whole Python process that loads the
   scenario, runs it and prints the statistics with the power-spectral method,
   against the target of 30 s; and the same as ``unsteady run`` with the run
   folder saved (no pictures; its history.csv of 1.3 million rows is most of
   that time).
2. The vortex model on the same scenario: wall time per simulated second (after
   a warm-up run that compiles the kernels), and what 900 s would cost.
3. (skipped with ``--quick``) N0 of the vortex model on an 8-s record at the
   default step and at half of it, unfiltered and low-passed at the statistics'
   cut-off (see :mod:`unsteady.analysis.turbulence`).
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import unsteady
from unsteady.analysis import turbulence as turb

ROOT = Path(__file__).resolve().parents[1]
SCENARIO = ROOT / "scenarios" / "drone-turbulence.toml"
UNSTEADY = Path(sys.executable).parent / "unsteady"


STATS = """
import json, sys, unsteady
sc = unsteady.load_scenario(sys.argv[1], overrides=["run.model=linear", "run.duration=" + sys.argv[2],
                                                    "output.plots=false"])
s = unsteady.simulate(sc).summary
print(json.dumps({k: s[k] for k in ("steps", "n_rms", "A_bar", "N0", "N0_cut_off_Hz", "turbulence")}))
"""


def statistics_process(duration=900.0):
    t0 = time.perf_counter()
    out = subprocess.run([sys.executable, "-c", STATS, str(SCENARIO), f"{duration:g}"], check=True,
                         capture_output=True, text=True).stdout
    return time.perf_counter() - t0, json.loads(out)


def whole_process(duration=900.0):
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "run"
        cmd = [str(UNSTEADY), "run", str(SCENARIO), "--set", "run.model=linear", "--set",
               f"run.duration={duration:g}", "--no-plots", "--quiet", "--out", str(out)]
        t0 = time.perf_counter()
        subprocess.run(cmd, check=True, env=dict(os.environ))
        wall = time.perf_counter() - t0
        s = json.loads((out / "summary.json").read_text())
    return wall, s


def vortex_cost(seconds=3.0):
    warm = unsteady.load_scenario(SCENARIO, overrides=["run.duration=0.2", "output.plots=false"])
    unsteady.simulate(warm)
    sc = unsteady.load_scenario(SCENARIO, overrides=[f"run.duration={seconds}", "output.plots=false"])
    t0 = time.perf_counter()
    unsteady.simulate(sc)
    return (time.perf_counter() - t0) / seconds, sc.steps


def n0_against_dt(seconds=8.0):
    base = unsteady.load_scenario(SCENARIO, overrides=[f"run.duration={seconds}", "output.plots=false"])
    rows = []
    for f in (1.0, 0.5):
        sc = unsteady.load_scenario(SCENARIO, overrides=[f"run.duration={seconds}", f"run.dt={base.dt * f!r}",
                                                         "output.plots=false"])
        h = unsteady.simulate(sc).history
        raw = turb.record_statistics(h, sc, cut_off=False)
        cut = turb.record_statistics(h, sc)
        rows.append((sc.dt, raw["n_rms"], raw["N0"], raw["cut_off_hz"], cut["n_rms"], cut["N0"], cut["cut_off_hz"]))
    return rows


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="skip the N0-against-dt runs")
    args = ap.parse_args(argv)

    wall, s = statistics_process()
    b = s["turbulence"]
    psm, unf = b["power_spectral_method"], b["unfiltered"]
    print(f"linear model, statistics of 900 s of drone-turbulence ({s['steps']} steps), whole process: "
          f"{wall:.1f} s (target < 30 s)")
    print(f"  n_rms {s['n_rms']:.4f} (power-spectral method {psm['sigma_n']:.4f}), N0 {s['N0']:.3f} Hz "
          f"(method {psm['N0']:.3f} Hz), both at the cut-off {s['N0_cut_off_Hz']:.3g} Hz")
    print(f"  unfiltered: n_rms {unf['n_rms']:.4f} (method {unf['power_spectral_method']['sigma_n']:.4f}), "
          f"N0 {unf['N0']:.3f} Hz (method {unf['power_spectral_method']['N0']:.3f} Hz to the Nyquist "
          f"frequency of record and field, {unf['power_spectral_method']['cut_off_hz']:.4g} Hz)")
    for e in b["exceedances"]:
        print(f"  exceedances of {e['sigmas']:g} sigma: counted {e['counted_per_s']:.4f} /s, "
              f"Rice {e['rice_per_s']:.4f} /s")
    wall_run, _ = whole_process()
    print(f"  the same with the run folder saved (unsteady run --no-plots): {wall_run:.1f} s")

    per_s, steps = vortex_cost()
    print(f"vortex model, same scenario ({steps} steps for 3 s): {per_s:.2f} s per simulated second; "
          f"900 s would take about {per_s * 900 / 60:.0f} min")

    if not args.quick:
        print("vortex model, 8 s record: N0 against the step")
        for dt, r_rms, r_n0, r_cut, c_rms, c_n0, c_cut in n0_against_dt():
            print(f"  dt {dt:.3e} s: unfiltered n_rms {r_rms:.4f}, N0 {r_n0:.2f} Hz (to {r_cut:.4g} Hz); "
                  f"low-passed n_rms {c_rms:.4f}, N0 {c_n0:.3f} Hz (at {c_cut:.3g} Hz)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
