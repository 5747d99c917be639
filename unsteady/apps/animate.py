"""``unsteady animate``: turn a run directory into a film (MP4 or GIF)."""

from __future__ import annotations

import math
import sys
from pathlib import Path

from ..core.errors import UsageError


def _pair(text, name, label, example):
    try:
        a, b = text.lower().split("x")
        return int(a), int(b)
    except ValueError:
        raise UsageError(f"error: {label}: {name}: {text!r}; allowed: two whole numbers joined by x, "
                         f"e.g. {example}") from None


def _span(text, label):
    try:
        a, b = text.split(":")
        return (float(a) if a.strip() else None, float(b) if b.strip() else None)
    except ValueError:
        raise UsageError(f"error: {label}: --span: {text!r}; allowed: START:END in seconds of run time, "
                         "either may be empty, e.g. 0.05:0.3") from None


def add_arguments(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--out", metavar="FILE", help="film to write, .mp4 (H.264) or .gif (default: RUN_DIR/film.mp4)")
    p.add_argument("--frame-rate", type=float, default=25.0, metavar="FPS", help="frames per second (default 25)")
    p.add_argument("--size", default="1280x720", metavar="WxH", help="picture size in pixels (default 1280x720)")
    p.add_argument("--span", default=None, metavar="START:END", help="part of the run to show, seconds (default: all)")
    g = p.add_mutually_exclusive_group()
    g.add_argument("--slowdown", type=float, default=None, metavar="F",
                   help="film seconds per second of flow: 10 = ten times slower than real time, "
                        "0.5 = twice as fast (default: one frame per wake snapshot)")
    g.add_argument("--frames", type=int, default=None, metavar="N", help="exact number of frames")
    p.add_argument("--view", default="airfoil", metavar="VIEW",
                   help="airfoil: ride with the airfoil (default); air: watch from the still air")
    p.add_argument("--flow", default="vortices", metavar="STYLE",
                   help="how the flow is drawn: vortices (default), vorticity, speed, streamlines")
    p.add_argument("--trace", default=None, metavar="NAME",
                   help="history drawn below: cl, cm, n (load factor), pitch, plunge "
                        "(default: n when the run has it, else cl)")
    p.add_argument("--grid", default=None, metavar="NXxNZ", help="field grid nodes (default: one per ~8 pixels)")
    p.add_argument("--reach", type=float, default=6.0, metavar="CHORDS",
                   help="chords of wake shown behind the trailing edge (default 6)")
    p.add_argument("--camera", default="auto", metavar="MODE",
                   help="auto (default): follow the airfoil when it heaves freely or its height changes by "
                        "more than a chord; follow: keep it at mid height; fixed: one frame holding the whole motion")
    p.add_argument("--surface-pressure", action="store_true",
                   help="thick sections: draw the pressure on both surfaces, a line off the outline "
                        "(outward for suction)")
    p.add_argument("--quiet", action="store_true", help="no progress bar or report")


def main(args):
    from ..core.files import check_out_file, has_mark
    from ..outputs.films import FilmOptions, check_out_path, load_run, write_film
    run_dir = Path(args.run_dir)
    if args.out is not None and not args.out.strip():
        raise UsageError("error: -: --out: is empty; give a film name ending in .mp4 or .gif "
                         "(or leave the option out for RUN_DIR/film.mp4)")
    out = Path(args.out) if args.out is not None else run_dir / "film.mp4"
    check_out_path(out)
    # before any drawing: a film replaces only a film of ours, in a folder we can write
    check_out_file(out, marked=has_mark, what="a film name ending in .mp4 or .gif")
    label = str(run_dir)
    w, h = _pair(args.size, "--size", label, "1280x720")
    opts = FilmOptions(frame_rate=args.frame_rate, width=w, height=h,
                       span=_span(args.span, label) if args.span else (None, None),
                       slowdown=args.slowdown, frames=args.frames, view=args.view, flow=args.flow,
                       trace=args.trace, grid=_pair(args.grid, "--grid", label, "160x90") if args.grid else None,
                       reach=args.reach, camera=args.camera, surface_pressure=args.surface_pressure)
    res = load_run(run_dir)
    film = write_film(res, out, opts, progress=not args.quiet, label=label)
    if not args.quiet:
        dur = film.n_frames / opts.frame_rate
        msg = (f"{out}: {film.n_frames} frames, {dur:.1f} s at {opts.frame_rate:g} frames/s, "
               f"{w}x{h}; run time {film.t0:.4g} to {film.t1:.4g} s")
        if math.isfinite(film.slowdown):
            msg += f" ({film.slowdown:.3g} x slower than real time)" if film.slowdown >= 1 else \
                   f" ({1 / film.slowdown:.3g} x faster than real time)"
        print(msg)
        if film.repeats > 0:
            print(f"note: {film.repeats} frames repeat a snapshot; for smoother slow motion rerun with "
                  "a smaller output.snapshot_every", file=sys.stderr)
    return 0

