"""Benchmark of sweeps: 8 gust cases on a local cluster of 1 and 2 workers, and the per-case overhead.

Usage::

    .venv/bin/python tools/bench_sweep.py [--chords 200] [--elements 20] [--repeat 2]

Prints the wall time of the 8 cases run one by one in this process, on a
Dask local cluster of one worker and of two (cluster start-up timed apart,
workers warmed up first; the best of ``--repeat`` tries), the speed-up of two workers over one, and the
overhead per case of the distributed path against running the case directly.
The cases are 1-cosine gusts met by a heaving section (demo numbers of our own).
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
# the direct runs use one numba thread, as each worker does (a fair comparison;
# set before numba is first imported)
os.environ.setdefault("NUMBA_NUM_THREADS", "1")

from unsteady import load_scenario  # noqa: E402

from unsteady.apps import sweep


def scenario(chords, elements):
    return {
        "title": "Sweep benchmark: 1-cosine gusts on a heaving section",
        "flow": {"speed": 16.0, "density": 1.2},
        "airfoil": {"shape": "naca2412", "chord": 0.22, "elements": elements},
        "motion": {"pivot": 0.25},
        "aircraft": {"mass": 2.4, "wing_area": 0.40},
        "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 2.2, "arrival": 0.02},
        "run": {"chords": chords, "wake": "frozen"},
        "sweep": {"grid": {"gust.length": [0.44, 1.1, 2.2, 4.4], "flow.speed": [12.0, 20.0]}},
    }


def _warm():
    """Load the compiled kernels on a worker (a tiny case)."""
    from unsteady.simulation.runner import simulate
    simulate({"flow": {"speed": 10.0, "density": 1.2}, "airfoil": {"chord": 0.2, "elements": 6},
              "run": {"chords": 2, "wake": "frozen"}})
    return True


def _empty_case(payload):
    """A case function that does no work: what is left is the sweep's own cost."""
    return {"status": "ok", "message": "", "summary": {"cl_max": 0.0}, "wall_time_s": 0.0, "version": ""}


def timed_sweep(sc, workers, case_fn=None):
    from distributed import Client
    t0 = time.perf_counter()
    cluster = sweep.start_local_cluster(workers)
    client = Client(cluster)
    client.wait_for_workers(workers)
    client.run(_warm)
    t_start = time.perf_counter() - t0
    try:
        with tempfile.TemporaryDirectory() as d:
            t0 = time.perf_counter()
            rep = sweep.run_sweep(sc, Path(d) / "out", client=client, case_fn=case_fn)
            t_run = time.perf_counter() - t0
        assert rep.ok == len(sweep.build_cases(sc)), rep
    finally:
        client.close()
        cluster.close()
    return t_start, t_run


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--chords", type=float, default=200.0, help="chords travelled per case (200: about 0.6 s a case, like a 40-element gust case of 50 chords)")
    ap.add_argument("--elements", type=int, default=20, help="elements on the camber line")
    ap.add_argument("--repeat", type=int, default=2, help="tries of each timing (the best is kept)")
    a = ap.parse_args(argv)
    sc = load_scenario(scenario(a.chords, a.elements))
    cases = sweep.build_cases(sc)
    n = len(cases)
    _warm()
    t_direct = float("inf")
    for _ in range(a.repeat):
        t0 = time.perf_counter()
        for c in cases:
            r = sweep.run_case({"raw": c.raw, "base_dir": str(sc.base_dir)})
            assert r["status"] == "ok", r["message"]
        t_direct = min(t_direct, time.perf_counter() - t0)
    print(f"{n} cases, {a.elements} elements, {a.chords:g} chords each ({cases[0].scenario.steps} to "
          f"{max(c.scenario.steps for c in cases)} steps)")
    print(f"one by one in this process : {t_direct:7.2f} s  ({t_direct / n:.3f} s per case)")
    print(f"numba threads in this process: {os.environ['NUMBA_NUM_THREADS']}; load average before: "
          f"{', '.join(f'{x:.2f}' for x in os.getloadavg())} on {os.cpu_count()} cores")
    s1, t1 = min((timed_sweep(sc, 1) for _ in range(a.repeat)), key=lambda st: st[1])
    print(f"local cluster, 1 worker    : {t1:7.2f} s  (start-up and warm-up {s1:.2f} s, not included)")
    s2, t2 = min((timed_sweep(sc, 2) for _ in range(a.repeat)), key=lambda st: st[1])
    print(f"local cluster, 2 workers   : {t2:7.2f} s  (start-up and warm-up {s2:.2f} s, not included)")
    print(f"speed-up of 2 workers over 1: {t1 / t2:.2f} x  (target >= 1.7 on 2 free cores)")
    print(f"overhead per case, distributed path against direct: {(t1 - t_direct) / n * 1000:.1f} ms "
          f"({100 * (t1 - t_direct) / t_direct:.1f} % of the direct time)")
    _, t0 = min((timed_sweep(sc, 1, _empty_case) for _ in range(a.repeat)), key=lambda st: st[1])
    print(f"sweep machinery alone (empty case function, 1 worker): {t0 / n * 1000:.1f} ms per case "
          "(submit, result, table rewrite)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
