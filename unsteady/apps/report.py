"""``unsteady report``: one self-contained HTML page of a run or a sweep folder."""

from __future__ import annotations


def add_arguments(p):
    p.add_argument("folder", metavar="RUN_DIR|SWEEP_DIR",
                   help="run directory written by 'unsteady run' or sweep folder written by 'unsteady sweep'")
    p.add_argument("--out", metavar="FILE.html", default=None,
                   help="page to write (default: report.html in the folder); pictures and film inside it")
    p.add_argument("--no-film", action="store_true",
                   help="leave the film out (a smaller page); by default the run's film.mp4, or one made for the page")
    p.add_argument("--quiet", action="store_true", help="no progress and no closing line")


def main(args):
    from ..outputs.report import write_report
    out, kind, film = write_report(args.folder, args.out, film=not args.no_film, progress=not args.quiet)
    if not args.quiet:
        size = out.stat().st_size
        what = "a sweep" if kind == "sweep" else "a run"
        extra = f", film {film.width}x{film.height} of {film.frames} frames" if film is not None else ""
        print(f"{out}: page of {what}, {size / 1024:.0f} KB{extra}; opens in any browser with no network")
    return 0
