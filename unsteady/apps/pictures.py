"""``unsteady pictures``: redraw the PNG pictures of a run directory."""

from __future__ import annotations

from pathlib import Path

from ..core.errors import UsageError


def add_arguments(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--quiet", action="store_true", help="print nothing")


def main(args):
    from ..outputs.pictures import write_run_plots
    from ..simulation.result import Result
    run_dir = Path(args.run_dir)
    if not run_dir.is_dir():
        raise UsageError(f"error: {run_dir}: RUN_DIR: no such run directory; give a folder written by 'unsteady run'")
    if not (run_dir / "history.csv").is_file() or not (run_dir / "summary.json").is_file():
        raise UsageError(f"error: {run_dir}: history.csv: missing; give a folder written by 'unsteady run'")
    res = Result.load(run_dir)
    if res.scenario is None:
        from ..outputs.films import _read_resolved_scenario
        res.scenario = _read_resolved_scenario(run_dir)
    before = {p.name: p.stat().st_mtime_ns for p in run_dir.glob("*.png")}
    write_run_plots(res, run_dir)
    if not args.quiet:
        new = sorted(p.name for p in run_dir.glob("*.png")
                     if before.get(p.name) != p.stat().st_mtime_ns)
        print(f"{run_dir}: redrew {', '.join(new) if new else 'nothing'}")
    return 0

