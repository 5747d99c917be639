"""Start-up benchmark of the command line, as ratios to ``python -c "import numpy, numba"``, and picture drawing times.

Usage: .venv/bin/python tools/bench_cli.py [--repeats N] [--no-pictures]

Each command runs in a fresh process, ``--repeats`` times (default 7), after
one unrecorded run that warms the numba cache and the disk cache.  Within a
repeat the baseline and every command run one after another, so a load that
drifts (other work on the machine) touches both; the ratio printed is the
median wall time of the command over the median wall time of the baseline,
with the same ratio of CPU times (user + system of the child process)
beside it, which a busy machine disturbs less.

Targets set by the project: ``--help`` at most 1.3x, ``check`` at most
1.6x, a 1-second linear-model ``run`` without pictures at most 2.5x, and
each run picture drawn (Agg canvas) in at most 0.25 s.

The pictures are timed in this process on two runs made here (the bundled
pitch-up with the vortex model; the 1-cosine gust with ``[aircraft]`` for
the gust-load picture): one unrecorded draw of each first (fonts, caches),
then the median of three draws, wall and CPU time, for each picture of each run.
"""

from __future__ import annotations

import argparse
import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
PITCH_UP = ROOT / "scenarios" / "pitch-up.toml"
GUST = ROOT / "scenarios" / "drone-gust-1cos.toml"

BASELINE = [sys.executable, "-c", "import numpy, numba"]
TARGETS = {"--help": 1.3, "check": 1.6, "run (linear, 1 s)": 2.5}
PICTURE_TARGET_S = 0.25


def _unsteady():
    """The ``unsteady`` launcher beside this Python, else ``python -m unsteady``."""
    exe = Path(sys.executable).with_name("unsteady")
    return [str(exe)] if exe.exists() else [sys.executable, "-m", "unsteady"]


def commands(tmp):
    """(name, argv) of every command timed."""
    u = _unsteady()
    return [
        ("--help", u + ["--help"]),
        ("check", u + ["check", str(PITCH_UP)]),
        ("run (linear, 1 s)", u + ["run", str(PITCH_UP), "--set", "run.model=linear",
                                   "--set", "run.duration=1.0", "--no-plots", "--quiet",
                                   "--out", str(Path(tmp) / "linear-run")]),
    ]


def _time(argv):
    """(wall s, CPU s of the child: user + system) of one run of ``argv``."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    p = subprocess.run(argv, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if p.returncode != 0:
        raise SystemExit(f"bench_cli: {' '.join(argv)} failed ({p.returncode}): {p.stderr.strip()[-400:]}")
    return wall, (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)


def time_commands(repeats, tmp):
    """Median (wall s, CPU s) of the baseline and of every command: {"baseline": ..., name: ...}."""
    cmds = commands(tmp)
    _time(BASELINE)
    for _name, argv in cmds:          # warm: numba cache, disk cache
        _time(argv)
    samples = {"baseline": []} | {name: [] for name, _ in cmds}
    for _ in range(repeats):
        samples["baseline"].append(_time(BASELINE))
        for name, argv in cmds:
            samples[name].append(_time(argv))
    return {k: tuple(statistics.median(x) for x in zip(*v)) for k, v in samples.items()}


def time_pictures(tmp, repeats=3):
    """{(scenario, picture): (first draw s, median wall s, median CPU s)} over the two runs."""
    import unsteady
    from unsteady.outputs.gallery import PICTURES
    out = {}
    for path in (PITCH_UP, GUST):
        res = unsteady.simulate(unsteady.load_scenario(path))
        folder = Path(tmp) / f"pictures-{path.stem}"
        folder.mkdir()
        for name, fn in PICTURES.items():
            t0 = time.perf_counter()
            drawn = fn(res, folder / name)
            first = time.perf_counter() - t0
            if drawn is False or not (folder / name).exists():
                continue
            wall, cpu = [], []
            for _ in range(repeats):
                t0, c0 = time.perf_counter(), time.process_time()
                fn(res, folder / name)
                wall.append(time.perf_counter() - t0)
                cpu.append(time.process_time() - c0)
            out[(path.stem, name)] = (first, statistics.median(wall), statistics.median(cpu))
    return out


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeats", type=int, default=7)
    ap.add_argument("--no-pictures", action="store_true", help="time the commands only")
    a = ap.parse_args(argv)
    tmp = tempfile.mkdtemp(prefix="bench-cli-")
    try:
        med = time_commands(a.repeats, tmp)
        base, base_cpu = med["baseline"]
        print(f"baseline  python -c 'import numpy, numba': {base:.3f} s wall, {base_cpu:.3f} s CPU "
              f"(median of {a.repeats})")
        for name, target in TARGETS.items():
            wall, cpu = med[name]
            r = wall / base
            print(f"{name:<20} {wall:6.3f} s  {r:5.2f}x wall  ({cpu / base_cpu:5.2f}x CPU; target <= {target:g}x: "
                  f"{'ok' if r <= target else 'MISSED'})")
        if not a.no_pictures:
            for (run, name), (first, wall, cpu) in time_pictures(tmp).items():
                print(f"picture {run:<16} {name:<18} {wall:6.3f} s wall, {cpu:6.3f} s CPU (first draw "
                      f"{first:.3f} s; target <= {PICTURE_TARGET_S:g} s: "
                      f"{'ok' if wall <= PICTURE_TARGET_S else 'MISSED'})")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
