"""Start-up benchmark of the command line, as ratios to ``python -c "import numpy, numba"``, and picture drawing times.

Usage: .venv/bin/python tools/bench_cli.py [--repeats N] [--no-pictures]

Each command runs in a fresh process, ``--repeats`` times (default 7), after
one unrecorded run that warms the numba cache and the disk cache.  Within a
repeat the baseline and every command run one after another, so a load that
drifts (other work on the machine) touches both; the ratio printed is the
median time of the command over the median time of the baseline.

Targets set by the project: ``--help`` at most 1.3x, ``check`` at most
1.6x, a 1-second linear-model ``run`` without pictures at most 2.5x, and
each run picture drawn (Agg canvas) in at most 0.25 s.

The pictures are timed in this process on two runs made here (the bundled
pitch-up with the vortex model; the 1-cosine gust with ``[aircraft]`` for
the gust-load picture): one unrecorded draw of each first (fonts, caches),
then the median of three draws.
"""

from __future__ import annotations

import argparse
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
    t0 = time.perf_counter()
    p = subprocess.run(argv, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    dt = time.perf_counter() - t0
    if p.returncode != 0:
        raise SystemExit(f"bench_cli: {' '.join(argv)} failed ({p.returncode}): {p.stderr.strip()[-400:]}")
    return dt


def time_commands(repeats, tmp):
    """Median wall times (s): {"baseline": ..., name: ...}."""
    cmds = commands(tmp)
    _time(BASELINE)
    for _name, argv in cmds:          # warm: numba cache, disk cache
        _time(argv)
    samples = {"baseline": []} | {name: [] for name, _ in cmds}
    for _ in range(repeats):
        samples["baseline"].append(_time(BASELINE))
        for name, argv in cmds:
            samples[name].append(_time(argv))
    return {k: statistics.median(v) for k, v in samples.items()}


def time_pictures(tmp, repeats=3):
    """{picture name: (first draw s, median draw s)} over the pitch-up and 1-cosine gust runs."""
    import unsteady
    from unsteady.outputs.pictures import PICTURES
    out = {}
    for path in (PITCH_UP, GUST):
        res = unsteady.simulate(unsteady.load_scenario(path))
        folder = Path(tmp) / f"pictures-{path.stem}"
        folder.mkdir()
        for name, fn in PICTURES.items():
            if name in out:
                continue
            t0 = time.perf_counter()
            drawn = fn(res, folder / name)
            first = time.perf_counter() - t0
            if drawn is False or not (folder / name).exists():
                continue
            runs = []
            for _ in range(repeats):
                t0 = time.perf_counter()
                fn(res, folder / name)
                runs.append(time.perf_counter() - t0)
            out[name] = (first, statistics.median(runs))
    return out


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeats", type=int, default=7)
    ap.add_argument("--no-pictures", action="store_true", help="time the commands only")
    a = ap.parse_args(argv)
    tmp = tempfile.mkdtemp(prefix="bench-cli-")
    try:
        med = time_commands(a.repeats, tmp)
        base = med["baseline"]
        print(f"baseline  python -c 'import numpy, numba': {base:.3f} s (median of {a.repeats})")
        for name, target in TARGETS.items():
            r = med[name] / base
            print(f"{name:<20} {med[name]:6.3f} s  {r:5.2f}x  (target <= {target:g}x: "
                  f"{'ok' if r <= target else 'MISSED'})")
        if not a.no_pictures:
            for name, (first, typical) in time_pictures(tmp).items():
                print(f"picture {name:<18} {typical:6.3f} s  (first draw {first:.3f} s; target <= "
                      f"{PICTURE_TARGET_S:g} s: {'ok' if typical <= PICTURE_TARGET_S else 'MISSED'})")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
