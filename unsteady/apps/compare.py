"""The ``unsteady compare`` command: overlay several runs and tabulate their headline numbers and lag metrics."""

from __future__ import annotations

import math
import os
from pathlib import Path

from ..core.errors import UsageError
from ..core.cautions import MODEL_CAUTION

#: Columns of the printed table: (summary key, header, format).  A column no run has a value for is left out.
TABLE = [
    ("model", "model", "{}"),
    ("cl_max", "cl_max", "{:.4f}"),
    ("t_cl_max", "t_cl_max", "{:.4g}"),
    ("cl_min", "cl_min", "{:.4f}"),
    ("cm_max", "cm_max", "{:.4f}"),
    ("cm_min", "cm_min", "{:.4f}"),
    ("ch_max", "ch_max", "{:.4f}"),
    ("ch_min", "ch_min", "{:.4f}"),
    ("t_ch_min", "t_ch_min", "{:.4g}"),
    ("ground_clearance_min_m", "clear_min_m", "{:.4g}"),
    ("n_max", "n_max", "{:.4f}"),
    ("t_n_max", "t_n_max", "{:.4g}"),
    ("n_min", "n_min", "{:.4f}"),
    ("dn_ratio", "dn/formula", "{:.3f}"),
    ("heave_only.n_max", "n_max_held", "{:.4f}"),
    ("dn_ratio_pitch_to_heave_only", "dn_free/held", "{:.3f}"),
    ("tail_load_ratio_pitch_to_heave_only", "tail_free/held", "{:.3f}"),
    ("lag.t50", "t50", "{:.4g}"),
    ("lag.t90", "t90", "{:.4g}"),
    ("lag.delay90_chords", "delay90/c", "{:.3g}"),
    ("lag.amplitude_ratio", "amp_ratio", "{:.4f}"),
    ("lag.phase_lag_deg", "lag_deg", "{:.2f}"),
    ("lag.loop_area", "loop_area", "{:.4g}"),
    ("lag.peak_effective_alpha_deg", "alpha_eff_pk", "{:.2f}"),
    ("lag.validity.attached_flow_ok", "attached", "{}"),
    ("lesp_max", "lesp_max", "{:.3f}"),
    ("lev_onset_t", "lev_onset", "{:.4g}"),
]

#: File name of the picture when --out names a folder (or is not given).
PICTURE = "compare.png"


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
    """The comparison table as text: one row per run, one column per headline number any run has."""
    cols = [(key, hd, fmt) for key, hd, fmt in TABLE
            if any(_get(s, key) is not None for _l, _h, s in runs)]
    headers = ["run"] + [h for _, h, _ in cols]
    rows = []
    for label, _h, s in runs:
        row = [label]
        for key, _hd, fmt in cols:
            v = _get(s, key)
            if v is None or (isinstance(v, float) and not math.isfinite(v)):
                row.append("-")
            else:
                row.append(fmt.format(v))
        rows.append(row)
    widths = [max(len(r[i]) for r in rows + [headers]) for i in range(len(headers))]
    lines = ["  ".join(c.rjust(w) for c, w in zip(r, widths)) for r in [headers] + rows]
    return "\n".join(lines)


def _loop_axis(runs):
    """What the loops are drawn against: the pitch when any run pitches, else what the runs share."""
    from ..outputs.pictures import loop_abscissa
    kinds = [loop_abscissa(h) for _l, h, _s in runs]
    if any(k[2] == "pitch" for k in kinds) and len({k[2] for k in kinds}) > 1:
        return [h["pitch_deg"] for _l, h, _s in runs], "pitch angle (deg)", "pitch"
    return [k[0] for k in kinds], kinds[0][1], kinds[0][2]


def plot_compare(runs, path, title=""):
    """One picture in the house style: cl, cm and (when a run has it) the load factor n against time,
    each run's quasi-steady cl dashed, and the lift loops against what moved."""
    from ..core.cautions import GUST_CAUTION, PICTURE_CAUTION
    from ..outputs.pictures import LOOK, SERIES, dress, house_legend, house_style, new_figure, save_png
    has_n = any("n" in h for _l, h, _s in runs)
    rows = [("cl", "lift coefficient cl"), ("cm", "moment coefficient cm\n(quarter chord)")]
    if any("ch" in h for _l, h, _s in runs):
        rows.append(("ch", "hinge moment ch\n(trailing edge down +)"))
    if has_n:
        rows.append(("n", "load factor n"))
    fig = new_figure(11, 2.3 * len(rows) + 1.4)
    gs = fig.add_gridspec(len(rows), 2)
    axes = [house_style(fig.add_subplot(gs[0, 0]))]
    for r in range(1, len(rows)):
        axes.append(house_style(fig.add_subplot(gs[r, 0], sharex=axes[0])))
    ax_loop = house_style(fig.add_subplot(gs[:, 1]))
    xs, xlabel, what = _loop_axis(runs)
    for i, ((label, h, s), x) in enumerate(zip(runs, xs)):
        col = SERIES[i % len(SERIES)]
        name = f"{label} ({s.get('model', '?')})"
        for ax, (k, _lab) in zip(axes, rows):
            if k in h:
                ax.plot(h["t"], h[k], color=col, lw=1.3 if k == "cl" else 1.1, label=name if k == "cl" else None)
        ax_loop.plot(x, h["cl"], color=col, lw=1.1, label=name)
        if "cl_quasi_steady" in h:
            axes[0].plot(h["t"], h["cl_quasi_steady"], color=col, lw=0.9, ls="--", alpha=0.8)
            ax_loop.plot(x, h["cl_quasi_steady"], color=col, lw=0.9, ls="--", alpha=0.8)
    if any("cl_quasi_steady" in h for _l, h, _s in runs):
        for ax in (axes[0], ax_loop):       # one legend entry for the dashed lines, in a neutral colour
            ax.plot([], [], color=LOOK["muted"], lw=0.9, ls="--", label="quasi-steady cl of each run")
    if has_n:
        axes[-1].axhline(1.0, color=LOOK["muted"], lw=0.7, ls=":")
        for i, (label, h, s) in enumerate(runs):
            if s.get("n_max") is not None and s.get("t_n_max") is not None:
                axes[-1].plot([s["t_n_max"]], [s["n_max"]], "o", color=SERIES[i % len(SERIES)], ms=4,
                              label=f"peak n = {s['n_max']:.3f}")
        house_legend(axes[-1])
    for ax, (_k, lab) in zip(axes, rows):
        ax.set_ylabel(lab, fontsize=8)
    for ax in axes[:-1]:
        ax.tick_params(labelbottom=False)
    axes[-1].set_xlabel("time t (s)", fontsize=9)
    ax_loop.set_xlabel(xlabel, fontsize=9)
    ax_loop.set_ylabel("lift coefficient cl", fontsize=8)
    house_legend(axes[0])
    house_legend(ax_loop)
    bad = [label for label, _h, s in runs if _get(s, "lag.validity.attached_flow_ok") is False]
    notes = [(f"outside the model's attached-flow range: {', '.join(bad)}", LOOK["warn"])] if bad else []
    if what != "pitch":
        notes.insert(0, f"the pitch is held: the loops are drawn against the {what}")
    left, right, gap_w = 0.9, 0.25, 0.9
    caution = PICTURE_CAUTION
    if any(s.get("lev_onset_t") is not None for _l, _h, s in runs):
        from ..core.cautions import PICTURE_SHEDDING_CAUTION
        caution = PICTURE_CAUTION + " " + PICTURE_SHEDDING_CAUTION
    dress(fig, title or "comparison of runs", notes, caution=GUST_CAUTION if has_n else caution,
          left=left, right=right, bottom=0.75 if "\n" in xlabel else 0.6, gap=0.2, rows=len(rows), cols=2)
    # the loop panel keeps a wider gap from the time panels than the rows from each other
    fig.subplots_adjust(wspace=gap_w / ((fig.get_size_inches()[0] - left - right - gap_w) / 2))
    save_png(fig, path)


def add_arguments(p):
    p.add_argument("run_dirs", nargs="+", metavar="RUN_DIR", help="run folders written by 'unsteady run'")
    p.add_argument("--out", metavar="FOLDER|FILE.png", default=None,
                   help=f"where the picture goes: a folder (gets {PICTURE}, made if missing) or a file ending "
                        f"in .png (default: {PICTURE} in the folder holding the runs)")
    p.add_argument("--title", default="", help="title of the picture")
    p.add_argument("--quiet", action="store_true", help="do not print the table")


def out_path(out, run_dirs):
    """The picture's path from ``--out`` (a folder or a .png file) or, without it, beside the runs.

    Raises UsageError (exit 2) for a path that is neither, a folder that cannot be made, or an
    existing file that 'unsteady compare' did not write (it is never replaced).
    """
    from ..outputs.pictures import written_by_unsteady
    if out is None:
        parents = {Path(d).absolute().parent for d in run_dirs}
        if len(parents) != 1:
            raise UsageError(f"error: {run_dirs[0]}: --out: the runs are in different folders "
                             f"({', '.join(sorted(str(p) for p in parents))}); give --out FOLDER or FILE.png")
        target = parents.pop() / PICTURE
    else:
        out = Path(out)
        if out.is_dir():
            target = out / PICTURE
        elif out.suffix.lower() == ".png":
            target = out
            if not out.absolute().parent.is_dir():
                raise UsageError(f"error: {out}: --out: folder {out.parent} does not exist; create it first "
                                 "or give a folder")
        elif out.suffix:
            raise UsageError(f"error: {out}: --out: must be a folder or a file ending in .png, "
                             f"not {out.suffix!r}")
        elif out.exists():
            raise UsageError(f"error: {out}: --out: exists and is not a folder; give a folder or FILE.png")
        else:
            target = out / PICTURE          # a new folder, made when the runs have been read
    anc = target.absolute().parent
    while not anc.exists():
        anc = anc.parent
    if not os.access(anc, os.W_OK | os.X_OK):
        raise UsageError(f"error: {target}: --out: cannot write in {anc}; give --out a writable folder")
    if target.exists() and (target.is_dir() or not written_by_unsteady(target)):
        raise UsageError(f"error: {target}: --out: exists and was not written by unsteady; "
                         "give another name or move that file away")
    return target


def main(args):
    runs = [load_run(d) for d in args.run_dirs]
    out = out_path(args.out, args.run_dirs)
    if not out.parent.exists():
        try:
            out.parent.mkdir(parents=True)
        except OSError as exc:
            raise UsageError(f"error: {out.parent}: --out: cannot make the folder ({exc.strerror})") from None
    plot_compare(runs, out, args.title)
    if not args.quiet:
        print(table_text(runs))
        print(f"picture: {out}")
        print(f"note: {MODEL_CAUTION}")
        if any(s.get("lev_onset_t") is not None for _l, _h, s in runs):
            from ..core.cautions import SHEDDING_CAUTION
            print(f"note: runs that shed from the leading edge: {SHEDDING_CAUTION}")
        if any("n" in h for _l, h, _s in runs):
            from ..core.cautions import GUST_CAUTION
            print(f"caution: {GUST_CAUTION}")
    return 0
