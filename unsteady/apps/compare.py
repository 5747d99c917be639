"""The ``unsteady compare`` command: overlay several runs and tabulate their headline numbers and lag metrics."""

from __future__ import annotations

import math
from pathlib import Path

from ..core.errors import UsageError
from ..core.cautions import MODEL_CAUTION

#: Columns of the printed table: (summary key, header, format).
TABLE = [
    ("model", "model", "{}"),
    ("cl_max", "cl_max", "{:.4f}"),
    ("t_cl_max", "t_cl_max", "{:.4g}"),
    ("cl_min", "cl_min", "{:.4f}"),
    ("cm_max", "cm_max", "{:.4f}"),
    ("cm_min", "cm_min", "{:.4f}"),
    ("lag.t50", "t50", "{:.4g}"),
    ("lag.t90", "t90", "{:.4g}"),
    ("lag.delay90_chords", "delay90/c", "{:.3g}"),
    ("lag.amplitude_ratio", "amp_ratio", "{:.4f}"),
    ("lag.phase_lag_deg", "lag_deg", "{:.2f}"),
    ("lag.loop_area", "loop_area", "{:.4g}"),
    ("lag.peak_effective_alpha_deg", "alpha_eff_pk", "{:.2f}"),
    ("lag.validity.attached_flow_ok", "attached", "{}"),
]


#: History columns the picture draws.
COLUMNS = ("t", "cl", "cm", "pitch_deg")


def load_run(run_dir):
    """(label, history, summary) of a run directory; UsageError if it is not one."""
    from ..outputs.rundir import ALWAYS, load_run as read_run
    res = read_run(run_dir, columns=COLUMNS, read=ALWAYS)
    return Path(run_dir).name, res.history, res.summary


def _get(summary, dotted):
    v = summary
    for part in dotted.split("."):
        if not isinstance(v, dict) or part not in v:
            return None
        v = v[part]
    return v


def table_text(runs):
    """The comparison table as text: one row per run, one column per headline number."""
    headers = ["run"] + [h for _, h, _ in TABLE]
    rows = []
    for label, _h, s in runs:
        row = [label]
        for key, _hd, fmt in TABLE:
            v = _get(s, key)
            if v is None or (isinstance(v, float) and not math.isfinite(v)):
                row.append("-")
            else:
                row.append(fmt.format(v))
        rows.append(row)
    widths = [max(len(r[i]) for r in rows + [headers]) for i in range(len(headers))]
    lines = ["  ".join(c.rjust(w) for c, w in zip(r, widths)) for r in [headers] + rows]
    return "\n".join(lines)


def plot_compare(runs, path, title=""):
    """One picture: cl and cm against time (with each run's quasi-steady cl dashed) and the cl-pitch loops."""
    from ..outputs.pictures import fixed_margins, new_figure, save_png
    fig = new_figure(11, 6.2, paper=False)
    ax_cl = fig.add_subplot(2, 2, 1)
    ax_cm = fig.add_subplot(2, 2, 3, sharex=ax_cl)
    ax_loop = fig.add_subplot(1, 2, 2)
    colours = ["#23395b", "#c0392b", "#2e7d32", "#8e44ad", "#d35400", "#16a085", "#7f8c8d"]
    qs_drawn = False
    for i, (label, h, s) in enumerate(runs):
        col = colours[i % len(colours)]
        name = f"{label} ({s.get('model', '?')})"
        ax_cl.plot(h["t"], h["cl"], color=col, lw=1.3, label=name)
        ax_cm.plot(h["t"], h["cm"], color=col, lw=1.1)
        ax_loop.plot(h["pitch_deg"], h["cl"], color=col, lw=1.1, label=name)
        if "cl_quasi_steady" in h and not qs_drawn:
            ax_cl.plot(h["t"], h["cl_quasi_steady"], color="#555555", lw=1.0, ls="--",
                       label="quasi-steady cl")
            ax_loop.plot(h["pitch_deg"], h["cl_quasi_steady"], color="#555555", lw=1.0, ls="--",
                         label="quasi-steady cl")
            qs_drawn = True
    ax_cl.set_ylabel("cl", fontsize=9)
    ax_cm.set_ylabel("cm (c/4)", fontsize=9)
    ax_cm.set_xlabel("time t (s)")
    ax_loop.set_xlabel("pitch angle (deg)")
    ax_loop.set_ylabel("cl", fontsize=9)
    for ax in (ax_cl, ax_cm, ax_loop):
        ax.grid(alpha=0.3)
    ax_cl.legend(fontsize=7, loc="best")
    ax_loop.legend(fontsize=7, loc="best")
    bad = [label for label, _h, s in runs if _get(s, "lag.validity.attached_flow_ok") is False]
    note = ("outside the attached-flow range: " + ", ".join(bad)) if bad else ""
    fig.suptitle((title or "comparison of runs") + ("\n" + note if note else ""), fontsize=9)
    fig.text(0.5, 0.005, MODEL_CAUTION, ha="center", va="bottom", fontsize=6, wrap=True)
    fixed_margins(fig, left=0.75, bottom=0.75, top=0.6, gap=0.6, rows=2, cols=2)
    save_png(fig, path)


def add_arguments(p):
    p.add_argument("run_dirs", nargs="+", metavar="RUN_DIR", help="run folders written by 'unsteady run'")
    p.add_argument("--out", metavar="FILE.png", default="compare.png",
                   help="picture to write (default compare.png)")
    p.add_argument("--title", default="", help="title of the picture")
    p.add_argument("--quiet", action="store_true", help="do not print the table")


def main(args):
    runs = [load_run(d) for d in args.run_dirs]
    out = Path(args.out)
    if out.suffix.lower() != ".png":
        raise UsageError(f"error: {out}: --out: must end in .png")
    if not out.parent.exists():
        raise UsageError(f"error: {out}: --out: folder {out.parent} does not exist")
    plot_compare(runs, out, args.title)
    if not args.quiet:
        print(table_text(runs))
        print(f"picture: {out}")
        print(f"note: {MODEL_CAUTION}")
    return 0


