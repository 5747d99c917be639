"""Static pictures of a run (PNG), written into the run directory, and the command that redraws them."""

from __future__ import annotations

import os
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.colors import LinearSegmentedColormap, Normalize  # noqa: E402
from matplotlib.lines import Line2D  # noqa: E402

# ---------------------------------------------------------------------------
# The look of the project's pictures and films (our own): warm paper, slate
# airfoil, teal for counter-clockwise spin, brick for clockwise, violet and
# ochre for up and down gusts.
LOOK = {
    "paper": "#fbfaf6",
    "ink": "#22252b",
    "muted": "#7d828c",
    "rule": "#dcd8cc",
    "airfoil": "#3a4150",
    "airfoil_edge": "#111318",
    "ccw": "#16808f",
    "cw": "#c4502f",
    "trace": "#284b8c",
    "second": "#b07a12",
    "marker": "#c4502f",
    "gust_up": "#6b4a9b",
    "gust_down": "#c98f12",
    "path": "#9aa0aa",
}
#: Diverging map for vorticity: brick (clockwise) through paper to teal (counter-clockwise).
SPIN_MAP = LinearSegmentedColormap.from_list(
    "unsteady_spin", ["#7a2a16", LOOK["cw"], "#efd9cd", LOOK["paper"], "#cfe6e6", LOOK["ccw"], "#0b4550"])
#: Wake vortex dots: the hue gives the sense of rotation and never fades into the paper.
VORTEX_MAP = LinearSegmentedColormap.from_list(
    "unsteady_spin_dots", [(0.0, "#6e2412"), (0.4999, "#e3866a"), (0.5001, "#63b7c0"), (1.0, "#0a4a55")])
#: Sequential map for flow speed.
SPEED_MAP = LinearSegmentedColormap.from_list(
    "unsteady_breeze", [LOOK["paper"], "#d7e3ea", "#8fb2cc", "#4a79a8", "#23406e", "#141d33"])
#: Diverging map for the vertical gust: ochre down, violet up.
GUST_MAP = LinearSegmentedColormap.from_list(
    "unsteady_updraft", [LOOK["gust_down"], "#f1e2bd", LOOK["paper"], "#ddd1ec", LOOK["gust_up"]])

#: Short form of the model caution printed on pictures and films.
CAUTION = ("Inviscid attached-flow model (no stall or separation): estimates only; design loads "
           "follow the applicable airworthiness rules.")


def _save(fig, path):
    """Write a figure atomically (temporary name, then rename) and close it."""
    path = Path(path)
    tmp = path.with_name(f".{path.stem}.part{path.suffix}")
    try:
        fig.savefig(tmp, dpi=110, facecolor=fig.get_facecolor())
        os.replace(tmp, path)
    finally:
        plt.close(fig)
        if tmp.exists():
            tmp.unlink()


def _figure(w, h):
    fig = plt.figure(figsize=(w, h), facecolor=LOOK["paper"])
    return fig


def _style(ax):
    ax.set_facecolor(LOOK["paper"])
    ax.grid(color=LOOK["rule"], lw=0.5)
    ax.tick_params(labelsize=8, colors=LOOK["ink"])
    for k, sp in ax.spines.items():
        sp.set_color(LOOK["rule"])
        sp.set_visible(k in ("left", "bottom"))


def _title(result, what):
    t = (result.scenario.title if result.scenario is not None else "") or "run"
    return f"{t}: {what}"


def _footer(fig):
    fig.text(0.99, 0.005, CAUTION, fontsize=6.5, color=LOOK["muted"], ha="right", va="bottom")


def plot_histories(result, path):
    """histories.png: lift, moment, load factor (when present), pitch and plunge against time."""
    h = result.history
    t = h["t"]
    rows = [("cl", "lift coefficient cl"), ("cm", "moment coefficient cm\n(quarter chord, nose-up +)")]
    if "n" in h:
        rows.append(("n", "load factor n"))
    if "w_gust" in h and np.any(h["w_gust"] != 0):
        rows.append(("w_gust", "vertical gust at the\nleading edge (m/s)"))
    rows.append(("alpha_deg", "pitch angle (deg)"))
    if np.any(h["h"] != 0):
        rows.append(("h", "plunge height h (m)"))
    fig, axes = plt.subplots(len(rows), 1, figsize=(8, 1.7 * len(rows) + 0.9), sharex=True,
                             facecolor=LOOK["paper"])
    axes = np.atleast_1d(axes)
    for ax, (k, label) in zip(axes, rows):
        _style(ax)
        ax.plot(t, h[k], color=LOOK["trace"], lw=1.4, label="vortex model" if k == "cl" else None)
        if k == "cl" and "cl_quasi_steady" in h:
            ax.plot(t, h["cl_quasi_steady"], color=LOOK["second"], lw=1.0, ls="--", label="quasi-steady")
            ax.legend(loc="best", fontsize=7, frameon=False)
        if k == "n":
            ax.axhline(1.0, color=LOOK["muted"], lw=0.7, ls=":")
        ax.set_ylabel(label, fontsize=8, color=LOOK["ink"])
    axes[-1].set_xlabel("time t (s)", fontsize=9)
    fig.suptitle(_title(result, "histories"), fontsize=10, color=LOOK["ink"])
    fig.tight_layout(rect=(0, 0.02, 1, 1))
    _footer(fig)
    _save(fig, path)


def plot_lift_loop(result, path):
    """lift-loop.png: cl against pitch angle, with the quasi-steady line when the run has it."""
    h = result.history
    fig = _figure(6.2, 5.0)
    ax = fig.add_subplot(111)
    _style(ax)
    a, cl = h["alpha_deg"], h["cl"]
    ax.plot(a, cl, color=LOOK["trace"], lw=1.3, label="vortex model")
    ok = np.isfinite(cl)
    if ok.sum() > 1:
        i0 = int(np.flatnonzero(ok)[0])
        i1 = int(np.flatnonzero(ok)[-1])
        ax.plot([a[i0]], [cl[i0]], "o", color=LOOK["trace"], ms=4, label="start")
        ax.plot([a[i1]], [cl[i1]], "s", color=LOOK["marker"], ms=4, label="end")
        # arrows along the loop show its sense
        step = max(1, ok.sum() // 8)
        for i in range(i0 + step, i1 - 1, step):
            if np.isfinite(cl[i]) and np.isfinite(cl[i + 1]) and (a[i + 1] != a[i] or cl[i + 1] != cl[i]):
                ax.annotate("", xy=(a[i + 1], cl[i + 1]), xytext=(a[i], cl[i]),
                            arrowprops=dict(arrowstyle="-|>", color=LOOK["trace"], lw=0.8, mutation_scale=9))
    if "cl_quasi_steady" in h:
        ax.plot(a, h["cl_quasi_steady"], color=LOOK["second"], lw=1.0, ls="--", label="quasi-steady")
    ax.set_xlabel("pitch angle (deg)", fontsize=9)
    ax.set_ylabel("lift coefficient cl", fontsize=9)
    ax.legend(fontsize=7, frameon=False, loc="best")
    fig.suptitle(_title(result, "lift against pitch"), fontsize=10, color=LOOK["ink"])
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    _footer(fig)
    _save(fig, path)


def _outline(result, alpha, h, x_shift=0.0):
    from . import fields
    sc = result.scenario
    return fields.airfoil_outline(sc.section, sc.chord, sc.pivot, alpha, h, x_shift=x_shift)


def plot_wake(result, path, k=-1):
    """wake.png: the wake vortices and the airfoil at snapshot ``k`` (default the last)."""
    s = result.snapshots
    sc = result.scenario
    if sc is None or "offsets" not in s or len(s.get("t", ())) == 0:
        return False
    k = k % len(s["t"])
    a, b = int(s["offsets"][k]), int(s["offsets"][k + 1])
    x, z, g = s["x"][a:b], s["z"][a:b], s["gamma"][a:b]
    fig = _figure(9.0, 4.2)
    ax = fig.add_subplot(111)
    _style(ax)
    ax.grid(False)
    gl = float(np.percentile(np.abs(s["gamma"]), 99.0)) if s["gamma"].size else 1.0
    gl = gl if gl > 0 else 1.0
    size = 1.5 + 30.0 * np.minimum(np.abs(g) / gl, 1.0)
    ax.scatter(x, z, c=g, s=size, cmap=VORTEX_MAP, norm=Normalize(-gl, gl), linewidths=0, zorder=2)
    xo, zo = _outline(result, s["alpha"][k], s["h"][k])
    ax.fill(xo, zo, facecolor=LOOK["airfoil"], edgecolor=LOOK["airfoil_edge"], lw=0.6, zorder=3)
    ax.set_aspect("equal", adjustable="datalim")
    ax.set_xlabel("x, downstream of the pitch axis (m)", fontsize=9)
    ax.set_ylabel("height z (m)", fontsize=9)
    handles = [Line2D([], [], ls="", marker="o", color=LOOK["ccw"], label="counter-clockwise"),
               Line2D([], [], ls="", marker="o", color=LOOK["cw"], label="clockwise")]
    ax.legend(handles=handles, fontsize=7, frameon=False, loc="upper right", ncol=2,
              title="wake vortices (dot size: strength)", title_fontsize=7)
    t = float(s["t"][k])
    fig.suptitle(_title(result, f"wake at t = {t:.4g} s ({b - a} vortices)"), fontsize=10, color=LOOK["ink"])
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    _footer(fig)
    _save(fig, path)
    return True


def pressure_instants(history, count=4):
    """Row indices worth a pressure picture: start, highest and lowest lift, end (distinct, in time order)."""
    cl = history["cl"]
    ok = np.flatnonzero(np.isfinite(cl))
    if ok.size == 0:
        return []
    picks = [int(ok[0]), int(ok[np.argmax(cl[ok])]), int(ok[np.argmin(cl[ok])]), int(ok[-1])]
    out = sorted(set(picks))
    if len(out) < count and ok.size >= count:     # fill evenly in time
        for i in np.linspace(ok[0], ok[-1], count + 2)[1:-1].astype(int):
            if len(out) >= count:
                break
            if int(i) not in out:
                out.append(int(i))
        out.sort()
    return out


def plot_pressure_jump(result, path):
    """pressure-jump.png: the pressure-jump coefficient along the chord at a few instants."""
    s = result.snapshots
    if "dcp" not in s or "x_dcp" not in s or len(s["dcp"]) == 0:
        return False
    dcp, xc = np.asarray(s["dcp"], dtype=float), np.asarray(s["x_dcp"], dtype=float)
    h = result.history
    rows = [i for i in pressure_instants(h) if i < len(dcp)]
    fig = _figure(7.0, 4.4)
    ax = fig.add_subplot(111)
    _style(ax)
    colors = [LOOK["trace"], LOOK["ccw"], LOOK["cw"], LOOK["second"], LOOK["gust_up"], LOOK["muted"]]
    for c, i in zip(colors, rows):
        ax.plot(xc, dcp[i], color=c, lw=1.3, marker="o", ms=2.2,
                label=f"t = {h['t'][i]:.4g} s (cl = {h['cl'][i]:.3f}, pitch {h['alpha_deg'][i]:.1f} deg)")
    ax.axhline(0.0, color=LOOK["muted"], lw=0.6)
    ax.set_xlim(0, 1)
    ax.set_xlabel("position along the chord x/c (leading edge 0, trailing edge 1)", fontsize=9)
    ax.set_ylabel("pressure-jump coefficient\n(lower minus upper surface)", fontsize=9)
    ax.legend(fontsize=7, frameon=False, loc="best")
    fig.suptitle(_title(result, "load along the chord"), fontsize=10, color=LOOK["ink"])
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    _footer(fig)
    _save(fig, path)
    return True


#: The pictures of this module, by file name (see :func:`write_run_plots`).
RUN_PLOTS = {
    "histories.png": plot_histories,
    "lift-loop.png": plot_lift_loop,
    "wake.png": plot_wake,
    "pressure-jump.png": plot_pressure_jump,
}


def write_run_plots(result, out_dir):
    """The pictures ``unsteady run`` writes by default: :data:`RUN_PLOTS`, then every ``EXTRA_PLOTS`` entry."""
    out_dir = Path(out_dir)
    if len(result.history.get("t", [])) == 0:
        return
    for name, fn in RUN_PLOTS.items():
        fn(result, out_dir / name)
    for fn in EXTRA_PLOTS:
        fn(result, out_dir)


# More pictures register here: fn(result, out_dir) writes one or more PNGs.
EXTRA_PLOTS = []


# ---------------------------------------------------------------------------
# command line: redraw the pictures of a run directory
def _add_redraw(p):
    p.add_argument("run_dir", metavar="RUN_DIR", help="run directory written by 'unsteady run'")
    p.add_argument("--quiet", action="store_true", help="print nothing")


def _register():
    from .cli import UsageError, command

    @command("pictures", "redraw the PNG pictures of a run directory")
    def cmd_pictures(args):
        from .results import Result
        run_dir = Path(args.run_dir)
        if not run_dir.is_dir():
            raise UsageError(f"error: {run_dir}: RUN_DIR: no such run directory; give a folder written by 'unsteady run'")
        if not (run_dir / "history.csv").is_file() or not (run_dir / "summary.json").is_file():
            raise UsageError(f"error: {run_dir}: history.csv: missing; give a folder written by 'unsteady run'")
        res = Result.load(run_dir)
        if res.scenario is None:
            from .animate import _read_resolved_scenario
            res.scenario = _read_resolved_scenario(run_dir)
        from . import aircraft, lag  # noqa: F401  (they add their pictures to EXTRA_PLOTS)
        before = {p.name: p.stat().st_mtime_ns for p in run_dir.glob("*.png")}
        write_run_plots(res, run_dir)
        if not args.quiet:
            new = sorted(p.name for p in run_dir.glob("*.png")
                         if before.get(p.name) != p.stat().st_mtime_ns)
            print(f"{run_dir}: redrew {', '.join(new) if new else 'nothing'}")
        return 0

    cmd_pictures.add_arguments = _add_redraw


_register()
