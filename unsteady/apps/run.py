"""``unsteady run``: run a scenario and write its run directory."""

from __future__ import annotations

import sys
from pathlib import Path

from ..core.errors import UsageError
from .common import add_set, load


def add_arguments(p):
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--out", metavar="DIR", help="run directory (default: output.dir of the scenario); "
                   "an existing folder is replaced only when it is an earlier run, unchanged")
    add_set(p)
    p.add_argument("--quiet", action="store_true", help="no progress bar or report")
    p.add_argument("--no-plots", action="store_true", help="skip the PNG pictures")


def main(args):
    from ..outputs.rundir import check_out_dir
    sc = load(args)
    if args.out is not None:
        out, problem = Path(args.out), check_out_dir(args.out)           # before any computing
    else:
        out = sc.out_dir()
        problem = check_out_dir(out, "output.dir", source=args.scenario)
    if problem:
        raise UsageError(problem)
    from ..simulation.runner import simulate
    res = simulate(sc, progress=not args.quiet)
    path = res.save(out, plots=sc.data["output"].get("plots", True) and not args.no_plots)
    for line in res.summary.get("warnings", []):     # measured on the run (the check's were printed on loading)
        if line not in sc.warnings:
            print(line, file=sys.stderr)
    if res.error:
        print(f"unsteady: run stopped early: {res.error}; the {len(res.history['t'])} steps "
              f"computed so far are in {path}", file=sys.stderr)
        return 1
    if not args.quiet:
        s = res.summary
        print(f"{path}: {s['steps']} steps in {s['wall_time_s']:.2f} s; "
              f"cl {s.get('cl_min', float('nan')):.4f} .. {s.get('cl_max', float('nan')):.4f} "
              f"(max at t = {s.get('t_cl_max', float('nan')):.4g} s)"
              + (f"; load factor {s['n_min']:.3f} .. {s['n_max']:.3f}" if "n_max" in s else ""))
        if s.get("lev_onset_t") is not None:
            from ..core.cautions import SHEDDING_CAUTION
            several = [k[len("lev_onset_t_"):] for k in s if k.startswith("lev_onset_t_")]
            if not several:
                print(f"leading edge sheds from t = {s['lev_onset_t']:.4g} s (lesp_critical = "
                      f"{s['lesp_critical']:g}); caution: {SHEDDING_CAUTION}")
            else:
                parts = [f"element {i} from t = {s['lev_onset_t_' + i]:.4g} s (lesp_critical = "
                         f"{s['lesp_critical_' + i]:g})" if s["lev_onset_t_" + i] is not None else
                         f"element {i} never (lesp_critical = {s['lesp_critical_' + i]:g})" for i in several]
                print(f"leading edges shed: {'; '.join(parts)}; caution: {SHEDDING_CAUTION}")
        if "lift_max_N" in s:
            print(f"loads: lift up to {s['lift_max_N']:.4g} N"
                  + (f", root bending of a half-wing up to {s['root_bending_max_Nm']:.4g} N m (elliptic "
                     f"loading, no inertia relief)" if "root_bending_max_Nm" in s else ""))
        if "N0" in s:
            reals = (s.get("turbulence") or {}).get("realisations")
            print(f"turbulence: n_rms {s['n_rms']:.4g}, A_bar {s['A_bar']:.4g} per m/s, N0 {s['N0']:.4g} Hz "
                  f"(n low-passed at {s['N0_cut_off_Hz']:.4g} Hz, the first "
                  f"{s['turbulence']['startup_discarded_s']:.3g} s left out)"
                  + (f"; means of {reals['count']} realisations, spread n_rms {s['n_rms_std']:.2g}, "
                     f"N0 {s['N0_std']:.2g} Hz" if reals else ""))
        if "n_max" in s:
            from ..core.cautions import DIMENSIONAL_CAUTION, GUST_CAUTION, STATISTICS_CAUTION
            print(f"caution: {GUST_CAUTION}")
            if "lift_max_N" in s:
                print(f"caution: {DIMENSIONAL_CAUTION}")
            if "N0" in s:
                print(f"caution: {STATISTICS_CAUTION}")
    return 0
