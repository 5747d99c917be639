"""``unsteady pictures``: redraw the PNG pictures of a run directory."""

from __future__ import annotations

from pathlib import Path


def add_arguments(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--quiet", action="store_true", help="print nothing")


def main(args):
    from ..outputs.pictures import write_run_plots
    from ..outputs.rundir import load_run
    run_dir = Path(args.run_dir)
    res = load_run(run_dir)
    before = {p.name: p.stat().st_mtime_ns for p in run_dir.glob("*.png")}
    write_run_plots(res, run_dir)
    if not args.quiet:
        new = sorted(p.name for p in run_dir.glob("*.png")
                     if before.get(p.name) != p.stat().st_mtime_ns)
        print(f"{run_dir}: redrew {', '.join(new) if new else 'nothing'}")
    return 0
