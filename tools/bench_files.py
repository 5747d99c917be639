"""What keeping files safe costs: saving a run folder, replacing it (the claim reads and digests
every file of the earlier run), and the claim alone, for snapshots of a few sizes.

usage: python tools/bench_files.py [MB ...]     (default 1 10 100)
"""

import sys
import tempfile
import time
from pathlib import Path

import numpy as np

from unsteady.core import files
from unsteady.outputs.rundir import save_run
from unsteady.simulation.result import Result


def fake_run(mb):
    n = 2000
    t = np.linspace(0.0, 1.0, n)
    history = {"t": t, "chords": t * 50, "pitch_deg": np.sin(t), "height_m": 0 * t,
               "cl": np.cos(t), "cd": 0 * t, "cm": 0 * t}
    rng = np.random.default_rng(1)
    k = int(mb * 2 ** 20 / 8)
    snaps = {"t": t[::10], "offsets": np.arange(201), "x": rng.random(k)}   # random: does not compress
    return Result(history, {"cl_max": 1.0, "steps": n, "version": "bench"}, snaps, None)


def main(sizes):
    print(f"{'snapshots':>10} {'first save':>11} {'replace':>9} {'claim':>8} {'digest rate':>12}")
    for mb in sizes:
        res = fake_run(mb)
        with tempfile.TemporaryDirectory() as tmp:
            out = Path(tmp) / "run"
            t0 = time.perf_counter()
            save_run(res, out, plots=False)
            t1 = time.perf_counter()
            save_run(res, out, plots=False)
            t2 = time.perf_counter()
            files.claim_out_dir(out, "run")
            t3 = time.perf_counter()
            size = (out / "snapshots.npz").stat().st_size
            t4 = time.perf_counter()
            files.digest(out / "snapshots.npz")
            rate = size / (time.perf_counter() - t4) / 2 ** 20
        print(f"{size / 2 ** 20:8.1f} MB {t1 - t0:9.3f} s {t2 - t1:7.3f} s {t3 - t2:6.3f} s "
              f"{rate:8.0f} MB/s")


if __name__ == "__main__":
    main([float(a) for a in sys.argv[1:]] or [1.0, 10.0, 100.0])
