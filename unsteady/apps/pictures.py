"""``unsteady pictures``: redraw the PNG pictures of a run directory."""

from __future__ import annotations

from pathlib import Path


def add_arguments(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--quiet", action="store_true", help="print nothing")


def main(args):
    from ..core.errors import UsageError
    from ..core.files import owned_file, probe_writable
    from ..outputs.picture_set import PICTURES, write_run_plots
    from ..outputs.rundir import load_run
    run_dir = Path(args.run_dir)
    res = load_run(run_dir)
    # before drawing: the folder takes new files, and a picture replaces only one of ours
    probe_writable(run_dir, run_dir, "RUN_DIR")
    for name in PICTURES:
        if (run_dir / name).exists() and not owned_file(run_dir / name):
            raise UsageError(f"error: {run_dir}: {name}: was not written by unsteady (or changed since); "
                             "move it away to redraw it (nothing was replaced)")
    before = {p.name: p.stat().st_mtime_ns for p in run_dir.glob("*.png")}
    write_run_plots(res, run_dir)
    new = sorted(p.name for p in run_dir.glob("*.png") if before.get(p.name) != p.stat().st_mtime_ns)
    if not args.quiet:
        print(f"{run_dir}: redrew {', '.join(new) if new else 'nothing'}")
    return 0
