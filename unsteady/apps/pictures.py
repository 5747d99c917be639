"""``unsteady pictures``: redraw the PNG pictures of a run directory."""

from __future__ import annotations

from pathlib import Path


def add_arguments(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--surface-pressure-at", metavar="T,T,...", default=None,
                   help="thick sections: times (s) of surface-pressure.png (up to 6; default: start, "
                        "highest and lowest lift, end)")
    p.add_argument("--quiet", action="store_true", help="print nothing")


def main(args):
    from ..core.errors import UsageError
    from ..core.files import owned_file, probe_writable
    from ..outputs.gallery import PICTURES, write_run_plots
    from ..outputs.rundir import load_run
    run_dir = Path(args.run_dir)
    res = load_run(run_dir)
    times = _surface_times(args.surface_pressure_at, res, run_dir) if args.surface_pressure_at is not None else None
    # before drawing: the folder takes new files, and a picture replaces only one of ours
    probe_writable(run_dir, run_dir, "RUN_DIR")
    for name in PICTURES:
        if (run_dir / name).exists() and not owned_file(run_dir / name):
            raise UsageError(f"error: {run_dir}: {name}: was not written by unsteady (or changed since); "
                             "move it away to redraw it (nothing was replaced)")
    before = {p.name: p.stat().st_mtime_ns for p in run_dir.glob("*.png")}
    write_run_plots(res, run_dir)
    if times:
        from ..outputs.pictures_surface import plot_surface_pressure
        plot_surface_pressure(res, run_dir / "surface-pressure.png", times=times)
    new = sorted(p.name for p in run_dir.glob("*.png") if before.get(p.name) != p.stat().st_mtime_ns)
    if not args.quiet:
        print(f"{run_dir}: redrew {', '.join(new) if new else 'nothing'}")
    return 0


def _surface_times(text, res, run_dir):
    """The times of ``--surface-pressure-at``, checked against the run (UsageError, exit 2)."""
    import math

    from ..core.errors import UsageError
    from ..outputs.pictures_surface import MAX_INSTANTS, has_surface_pressure
    key = f"error: {run_dir}: --surface-pressure-at:"
    if not has_surface_pressure(res):
        raise UsageError(f"{key} this run has no surface pressure; it is computed for thick sections "
                         "only ([airfoil] thick = true)")
    try:
        times = [float(x) for x in text.split(",")]
    except ValueError:
        raise UsageError(f"{key} {text!r} is not a list of times; allowed: numbers in s separated "
                         "by commas, e.g. 0.1,0.25") from None
    t = res.history["t"]
    lo, hi = float(t[0]), float(t[-1])
    if not 1 <= len(times) <= MAX_INSTANTS:
        raise UsageError(f"{key} {len(times)} times; allowed: 1 to {MAX_INSTANTS}")
    bad = [x for x in times if not (math.isfinite(x) and lo - 1e-12 <= x <= hi + 1e-12)]
    if bad:
        raise UsageError(f"{key} {bad[0]:g} s is outside the run; allowed: {lo:.4g} to {hi:.4g} s")
    return times
