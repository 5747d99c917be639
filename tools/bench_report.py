"""Benchmark of ``unsteady report``: the time to write the page of a run, film made on the fly, and its size.

Usage: .venv/bin/python tools/bench_report.py [--scenario FILE] [--keep DIR]

Runs a bundled scenario (default scenarios/drone-gust-1cos.toml), then writes its
page three ways and prints one line each: wall time and page size
- the command ``unsteady report RUN_DIR`` in a new process, the film made for the page
  (the run has no film.mp4): target under 20 s;
- with the run's own film.mp4 (made beforehand by write_film, same size);
- with --no-film.
"""

from __future__ import annotations

import argparse
import os
import resource
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import unsteady
from unsteady.outputs import report
from unsteady.outputs.films import load_run, write_film

ROOT = Path(__file__).resolve().parents[1]
TARGET_S = 20.0


def _cpu():
    """CPU seconds of this process and its finished children (ffmpeg)."""
    me, kids = resource.getrusage(resource.RUSAGE_SELF), resource.getrusage(resource.RUSAGE_CHILDREN)
    return me.ru_utime + me.ru_stime + kids.ru_utime + kids.ru_stime


def _timed(folder, **kw):
    """(wall s, CPU s, page bytes, film) of one page written."""
    t0, c0 = time.perf_counter(), _cpu()
    out, kind, film = report.write_report(folder, **kw)
    return time.perf_counter() - t0, _cpu() - c0, out.stat().st_size, film


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--scenario", default=str(ROOT / "scenarios" / "drone-gust-1cos.toml"))
    ap.add_argument("--keep", default=None, help="folder to keep the run and its pages in")
    a = ap.parse_args(argv)
    tmp = Path(a.keep) if a.keep else Path(tempfile.mkdtemp(prefix="bench-report-"))
    try:
        t0 = time.perf_counter()
        res = unsteady.simulate(unsteady.load_scenario(a.scenario))
        run = res.save(tmp / "run")
        print(f"run {Path(a.scenario).name}: {res.summary['steps']} steps, "
              f"{len(res.snapshots.get('t', ()))} wake snapshots, {time.perf_counter() - t0:.1f} s (not counted)")
        print(f"machine load average (1 min) {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
        t0, c0 = time.perf_counter(), _cpu()
        subprocess.run([sys.executable, "-m", "unsteady", "report", str(run), "--quiet"], check=True)
        dt, cpu, size = time.perf_counter() - t0, _cpu() - c0, (run / "report.html").stat().st_size
        verdict = "ok" if dt < TARGET_S else "OVER"
        print(f"'unsteady report RUN_DIR', a film made for the page ({report.FILM_SIZE[0]}x{report.FILM_SIZE[1]}, "
              f"at most {report.FILM_FRAMES} frames), whole command: {dt:.1f} s wall, {cpu:.1f} s CPU, "
              f"{size / 2 ** 20:.2f} MB (target < {TARGET_S:g} s: {verdict})")
        write_film(load_run(run), run / "film.mp4", report.film_options(res))
        dt, cpu, size, film = _timed(run)
        print(f"page with the run's own film.mp4 ({film.frames} frames): {dt:.1f} s wall, {cpu:.1f} s CPU, "
              f"{size / 2 ** 20:.2f} MB")
        dt, cpu, size, _ = _timed(run, film=False)
        print(f"page without a film (--no-film): {dt:.1f} s wall, {cpu:.1f} s CPU, {size / 2 ** 20:.2f} MB")
    finally:
        if not a.keep:
            shutil.rmtree(tmp, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
