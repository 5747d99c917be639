"""Static pictures of a run (PNG), written into the run directory, and the command that redraws them."""

from __future__ import annotations

import textwrap
from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import LinearSegmentedColormap, Normalize
from matplotlib.figure import Figure
from matplotlib.lines import Line2D

from ..analysis.lag import ALPHA_EFF_LIMIT_DEG
from ..core.cautions import GUST_CAUTION, PICTURE_CAUTION
from ..core.files import atomic_path

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

CAUTION = PICTURE_CAUTION   # the short caution on every picture


def new_figure(w, h, paper=True, **kw):
    """A w x h inch figure on an Agg canvas (no pyplot state: nothing to close), on paper or white."""
    fig = Figure(figsize=(w, h), facecolor=LOOK["paper"] if paper else "white", **kw)
    FigureCanvasAgg(fig)
    return fig


def save_png(fig, path, dpi=110):
    """Write a figure of :func:`new_figure` as PNG atomically (:func:`unsteady.core.files.atomic_path`)."""
    with atomic_path(path) as tmp:
        fig.savefig(tmp, format="png", dpi=dpi, facecolor=fig.get_facecolor())




def fixed_margins(fig, left=0.8, right=0.2, bottom=0.6, top=0.45, gap=0.25, rows=1, cols=1):
    """Place a grid of axes with margins and gaps in inches.

    Used instead of a layout engine, which draws the whole figure once more
    only to measure its labels (about a third of a picture's time).
    """
    w, h = fig.get_size_inches()
    ax_h = (h - top - bottom - (rows - 1) * gap) / rows
    ax_w = (w - left - right - (cols - 1) * gap) / cols
    fig.subplots_adjust(left=left / w, right=1.0 - right / w, bottom=bottom / h, top=1.0 - top / h,
                        hspace=gap / ax_h, wspace=gap / ax_w)


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


def _finish(fig, result, what, path, **margins):
    """Title, margins (:func:`fixed_margins`) and the caution footer of a run picture; then write it."""
    fig.suptitle(_title(result, what), fontsize=10, color=LOOK["ink"])
    fixed_margins(fig, **margins)
    _footer(fig)
    save_png(fig, path)


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
    rows.append(("pitch_deg", "pitch angle (deg)"))
    if np.any(h["height_m"] != 0):
        rows.append(("height_m", "height of the pitch axis (m)"))
    fig = new_figure(8, 1.7 * len(rows) + 0.9)
    axes = np.atleast_1d(fig.subplots(len(rows), 1, sharex=True))
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
    _finish(fig, result, "histories", path, left=1.0, bottom=0.65, gap=0.18, rows=len(rows))


def plot_lift_loop(result, path):
    """lift-loop.png: cl against pitch angle, with the quasi-steady line when the run has it."""
    h = result.history
    fig = new_figure(6.2, 5.0)
    ax = fig.add_subplot(111)
    _style(ax)
    a, cl = h["pitch_deg"], h["cl"]
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
    _finish(fig, result, "lift against pitch", path, left=0.75)


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
    fig = new_figure(9.0, 4.2)
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
    _finish(fig, result, f"wake at t = {t:.4g} s ({b - a} vortices)", path, left=0.75)
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
    fig = new_figure(7.0, 4.4)
    ax = fig.add_subplot(111)
    _style(ax)
    colors = [LOOK["trace"], LOOK["ccw"], LOOK["cw"], LOOK["second"], LOOK["gust_up"], LOOK["muted"]]
    for c, i in zip(colors, rows):
        ax.plot(xc, dcp[i], color=c, lw=1.3, marker="o", ms=2.2,
                label=f"t = {h['t'][i]:.4g} s (cl = {h['cl'][i]:.3f}, pitch {h['pitch_deg'][i]:.1f} deg)")
    ax.axhline(0.0, color=LOOK["muted"], lw=0.6)
    ax.set_xlim(0, 1)
    ax.set_xlabel("position along the chord x/c (leading edge 0, trailing edge 1)", fontsize=9)
    ax.set_ylabel("pressure-jump coefficient\n(lower minus upper surface)", fontsize=9)
    ax.legend(fontsize=7, frameon=False, loc="best")
    _finish(fig, result, "load along the chord", path, left=0.9)
    return True


#: The pictures of a run, by file name: ``fn(result, path) -> bool`` (False: nothing
#: to draw for this run).  :func:`picture` adds one.
PICTURES = {}


def picture(name):
    """Decorator: register ``fn(result, path)`` as the picture ``name`` (a PNG file name)."""
    def deco(fn):
        if name in PICTURES:
            raise ValueError(f"a picture named {name!r} is already registered")
        PICTURES[name] = fn
        return fn
    return deco


for _name, _fn in (("histories.png", plot_histories), ("lift-loop.png", plot_lift_loop),
                   ("wake.png", plot_wake), ("pressure-jump.png", plot_pressure_jump)):
    picture(_name)(_fn)


def write_run_plots(result, out_dir):
    """Draw every registered picture of a run into ``out_dir`` (those that apply to it)."""
    out_dir = Path(out_dir)
    if len(result.history.get("t", [])) == 0:
        return
    for name, fn in PICTURES.items():
        fn(result, out_dir / name)


@picture("lag.png")
def plot_lag(result, path):
    """lag.png: cl against the quasi-steady cl and the effective angle, with the validity flag."""
    h = result.history
    if "cl_quasi_steady" not in h or len(h["t"]) < 2:
        return
    lag = result.summary.get("lag", {})
    val = lag.get("validity", {})
    fig = new_figure(8, 5.2, paper=False)
    ax1, ax2 = fig.subplots(2, 1, sharex=True)
    t = h["t"]
    ax1.plot(t, h["cl"], color="#23395b", lw=1.4, label=f"cl ({result.summary.get('model', 'run')})")
    ax1.plot(t, h["cl_quasi_steady"], color="#c0392b", lw=1.0, ls="--", label="quasi-steady cl")
    ax1.set_ylabel("lift coefficient cl", fontsize=8)
    ax1.legend(fontsize=8, loc="best")
    ax1.grid(alpha=0.3)
    ax2.plot(t, h["alpha_eff_deg"], color="#2e7d32", lw=1.2, label="effective angle (3/4 chord)")
    lim = val.get("alpha_eff_limit_deg", ALPHA_EFF_LIMIT_DEG)
    ax2.axhspan(lim, max(lim, float(np.nanmax(h["alpha_eff_deg"]))) + 1.0, color="#f4c27a", alpha=0.4,
                label=f"beyond {lim:g} deg: separation likely")
    ax2.axhspan(min(-lim, float(np.nanmin(h["alpha_eff_deg"]))) - 1.0, -lim, color="#f4c27a", alpha=0.4)
    ax2.set_ylabel("effective angle (deg)", fontsize=8)
    ax2.set_xlabel("time t (s)")
    ax2.legend(fontsize=8, loc="best")
    ax2.grid(alpha=0.3)
    if val and not val.get("attached_flow_ok", True):
        note = "OUTSIDE the attached-flow range: " + "; ".join(val.get("reasons", []))
    else:
        note = "within the attached-flow range of the model"
    fig.suptitle("lift lag against the quasi-steady estimate\n" + note, fontsize=8)
    fixed_margins(fig, left=0.75, bottom=0.5, top=0.5, gap=0.18, rows=2)
    save_png(fig, path)
    return True


@picture("gust-loads.png")
def plot_gust_loads(result, path):
    """gust-loads.png: gust at the leading edge and load factor, with the peak, the gust-formula
    estimate and the full gust-load caution (written only for runs with ``n``)."""
    h, s = result.history, result.summary
    if "n" not in h or not len(h["n"]):
        return
    fig = new_figure(8, 5.4)
    ax1 = fig.add_subplot(2, 1, 1)
    ax2 = fig.add_subplot(2, 1, 2, sharex=ax1)
    for ax in (ax1, ax2):
        _style(ax)
    t = h["t"]
    if "w_gust" in h:
        ax1.plot(t, h["w_gust"], color=LOOK["trace"], lw=1.2, label="vertical gust w")
    if "u_gust" in h and np.any(h["u_gust"] != 0):
        ax1.plot(t, h["u_gust"], color=LOOK["second"], lw=1.0, ls="--", label="streamwise gust u")
    ax1.set_ylabel("gust at the leading edge (m/s)", fontsize=8)
    ax1.legend(fontsize=7, frameon=False, loc="best")
    ax2.plot(t, h["n"], color=LOOK["trace"], lw=1.4, label="load factor n (vortex model)")
    ax2.axhline(1.0, color=LOOK["muted"], lw=0.7, ls=":")
    if "n_max" in s:
        ax2.plot([s["t_n_max"]], [s["n_max"]], "o", color=LOOK["second"], ms=4,
                 label=f"peak n = {s['n_max']:.3f}")
    if "dn_formula" in s:
        ax2.axhline(1.0 + s["dn_formula"], color=LOOK["second"], lw=0.9, ls="--",
                    label=f"gust formula 1 + {s['dn_formula']:.3f} (mu_g = {s['mass_ratio_mu_g']:.1f})")
    ax2.set_ylabel("load factor n", fontsize=8)
    ax2.set_xlabel("time t (s)", fontsize=9)
    ax2.legend(fontsize=7, frameon=False, loc="best")
    fig.suptitle(_title(result, "gust loads"), fontsize=10)
    fixed_margins(fig, left=0.75, bottom=0.85, gap=0.18, rows=2)
    fig.text(0.01, 0.005, "\n".join(textwrap.wrap(GUST_CAUTION, 150)), fontsize=6.5,
             color=LOOK["muted"], ha="left", va="bottom")
    save_png(fig, path)
    return True
