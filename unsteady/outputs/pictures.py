"""Static pictures of a run (PNG), written into the run directory, and the house style every picture shares.

The house style (used by the run pictures here, ``unsteady compare`` and any
other picture of the project): :func:`new_figure` (paper, Agg canvas, no
pyplot), :func:`house_style` on every axes, colours from :data:`LOOK` and
:data:`SERIES`, :func:`house_legend`, and :func:`finish_figure` for the title,
the notes (warnings in the warning colour), the caution footer, the margins
and the atomic write.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import LinearSegmentedColormap, Normalize
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle

from ..analysis.lag import ALPHA_EFF_LIMIT_DEG
from ..core.cautions import DIMENSIONAL_CAUTION, GUST_CAUTION, PICTURE_CAUTION, PICTURE_SHEDDING_CAUTION
from ..core.files import atomic_path
from ..inputs.elements import sheds_anywhere
from ..core.version import __version__
from .notices import run_warnings

__all__ = ["LOOK", "SERIES", "SPIN_MAP", "VORTEX_MAP", "SPEED_MAP", "GUST_MAP", "CAUTION", "PNG_MARK",
           "new_figure", "save_png", "fixed_margins", "house_style", "house_legend", "dress", "finish_figure",
           "wrap_to_width", "written_by_unsteady", "run_warnings", "warning_notes", "run_title", "moves",
           "loop_abscissa",
           "PICTURES", "picture", "write_run_plots", "pressure_instants"]

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
    "band": "#f1e3c8",      # fill of a range where the model is out of its depth
    "warn": "#a8432a",      # text of warnings on pictures and films
    "note_bg": "#f6eee9",   # quiet background behind a warning line
    "lev": "#4f5d1c",       # leading-edge vortices (edge of their diamonds) and the onset of shedding
}
#: Colours of several lines of one kind in one picture (runs compared, cases of a sweep), in order.
SERIES = (LOOK["trace"], LOOK["cw"], LOOK["ccw"], LOOK["second"], LOOK["gust_up"], "#5b6b3a", LOOK["muted"])
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
#: ``Software`` text written into every PNG of :func:`save_png`: files carrying it were written by unsteady.
PNG_MARK = f"unsteady {__version__}"

# sizes (points) of the house style
TITLE_SIZE = 10.0
NOTE_SIZE = 7.5
LABEL_SIZE = 8.5
FOOT_SIZE = 6.5


def new_figure(w, h, paper=True, **kw):
    """A w x h inch figure on an Agg canvas (no pyplot state: nothing to close), on paper or white."""
    fig = Figure(figsize=(w, h), facecolor=LOOK["paper"] if paper else "white", **kw)
    FigureCanvasAgg(fig)
    return fig


def save_png(fig, path, dpi=110):
    """Write a figure of :func:`new_figure` as PNG atomically (:func:`unsteady.core.files.atomic_path`).

    The PNG carries ``Software = PNG_MARK`` (see :func:`written_by_unsteady`).
    """
    with atomic_path(path) as tmp:
        fig.savefig(tmp, format="png", dpi=dpi, facecolor=fig.get_facecolor(),
                    metadata={"Software": PNG_MARK})


def written_by_unsteady(path):
    """True when ``path`` is a PNG written by :func:`save_png` (its ``Software`` text starts with unsteady)."""
    try:
        from PIL import Image
        with Image.open(path) as img:
            return img.format == "PNG" and str(img.info.get("Software", "")).startswith("unsteady")
    except Exception:
        return False


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


def house_style(ax, grid=True):
    """The house style of one axes: paper, light rules, ink ticks, only the left and bottom spines."""
    ax.set_facecolor(LOOK["paper"])
    if grid:
        ax.grid(color=LOOK["rule"], lw=0.5)
    ax.tick_params(labelsize=8, colors=LOOK["ink"])
    for k, sp in ax.spines.items():
        sp.set_color(LOOK["rule"])
        sp.set_visible(k in ("left", "bottom"))
    ax.xaxis.label.set_color(LOOK["ink"])
    ax.yaxis.label.set_color(LOOK["ink"])
    return ax


def house_legend(ax, **kw):
    """A legend in the house style (small, no frame)."""
    kw.setdefault("fontsize", 7)
    kw.setdefault("frameon", False)
    kw.setdefault("loc", "best")
    return ax.legend(**kw)


_ADVANCES = {}


def _text_width_in(text, fontsize):
    """Width (inches) of one line of text in the picture font: the sum of the glyphs' advances.

    Advances are read once per character from the font (kerning, a few
    hundredths of an em, is left out; the wrapping keeps a margin for it).
    Measuring whole strings with a renderer took 3 ms a line.
    """
    font = _ADVANCES.get("font")
    if font is None:
        from matplotlib.font_manager import FontProperties, findfont
        from matplotlib.ft2font import FT2Font
        font = _ADVANCES["font"] = FT2Font(findfont(FontProperties()))     # our own: its size stays put
        font.set_size(100.0, 72.0)
    total = 0.0
    for ch in text:
        adv = _ADVANCES.get(ch)
        if adv is None:
            try:
                adv = font.load_char(ord(ch)).linearHoriAdvance / 65536.0 / 100.0     # ems
            except Exception:
                adv = 0.6
            _ADVANCES[ch] = adv
        total += adv
    return total * fontsize / 72.0


def wrap_to_width(text, width_in, fontsize):
    """``text`` wrapped into lines that fit ``width_in`` inches at ``fontsize`` points (measured, not guessed)."""
    lines = []
    for para in str(text).split("\n"):
        words, cur = para.split(" "), ""
        for word in words:
            trial = f"{cur} {word}" if cur else word
            if cur and _text_width_in(trial, fontsize) > 0.97 * width_in:
                lines.append(cur)
                cur = word
            else:
                cur = trial
        lines.append(cur)
    return lines or [""]


def dress(fig, title, notes=(), caution=CAUTION, **margins):
    """Title, notes and caution of a picture, and its margins (:func:`fixed_margins`, inches).

    Parameters
    ----------
    title : str
        Wrapped to the figure's width (never cut at its sides).
    notes : sequence of str or (str, colour)
        Lines under the title, wrapped too: plain notes in the muted colour,
        ``(text, LOOK["warn"])`` for warnings (drawn on a quiet background).
    caution : str
        The footer (wrapped; the short picture caution by default).
    margins : left, right, bottom, top, gap, rows, cols
        ``top`` and ``bottom`` are the room for the axes' own labels; the
        title, notes and caution lines are added to them.
    """
    w, h = fig.get_size_inches()
    usable = w - 0.3
    y = h - 0.12                       # inches from the bottom, going down
    lines = wrap_to_width(title, usable, TITLE_SIZE)
    fig.text(0.5, y / h, "\n".join(lines), fontsize=TITLE_SIZE, color=LOOK["ink"], ha="center", va="top",
             linespacing=1.25)
    y -= len(lines) * TITLE_SIZE * 1.3 / 72.0 + 0.04
    for note in notes:
        text, colour = (note, LOOK["muted"]) if isinstance(note, str) else note
        nl = wrap_to_width(text, usable - 0.2, NOTE_SIZE)
        box = dict(boxstyle="round,pad=0.25", facecolor=LOOK["note_bg"], edgecolor="none") \
            if colour == LOOK["warn"] else None
        fig.text(0.5, y / h, "\n".join(nl), fontsize=NOTE_SIZE, color=colour, ha="center", va="top",
                 linespacing=1.2, bbox=box)
        y -= len(nl) * NOTE_SIZE * 1.25 / 72.0 + 0.06
    foot = wrap_to_width(caution, usable, FOOT_SIZE)
    fig.text(0.99, 0.005, "\n".join(foot), fontsize=FOOT_SIZE, color=LOOK["muted"], ha="right", va="bottom")
    m = dict(margins)
    m["top"] = (h - y) + m.get("top", 0.2)
    m["bottom"] = m.get("bottom", 0.6) + (len(foot) - 1) * FOOT_SIZE * 1.2 / 72.0
    fixed_margins(fig, **m)


def finish_figure(fig, path, title, notes=(), caution=CAUTION, **margins):
    """:func:`dress` the figure, then write it (:func:`save_png`); returns True."""
    dress(fig, title, notes, caution, **margins)
    save_png(fig, path)
    return True


# ---------------------------------------------------------------------------
# what a run's pictures share

def moves(y, rel=1e-9):
    """True when the finite values of ``y`` are not all the same (beyond round-off)."""
    y = np.asarray(y, dtype=float)
    y = y[np.isfinite(y)]
    return y.size > 1 and float(np.ptp(y)) > rel * max(1.0, float(np.max(np.abs(y))))


def warning_notes(result):
    """The run's warnings (:func:`run_warnings`) as picture notes in the warning colour."""
    return [(w, LOOK["warn"]) for w in run_warnings(result)]


def run_title(result, what):
    """A run picture's title: the scenario's title, then what the picture shows."""
    t = (result.scenario.title if result.scenario is not None else "") or "run"
    return f"{t}: {what}"


_warning_notes, _title = warning_notes, run_title


def run_caution(result):
    """The short caution of a run's pictures and films (its own for a run that sheds from the leading edge)."""
    sc = result.scenario
    if sc is not None and sheds_anywhere(sc.data.get("airfoil", {})):      # any element's leading edge
        return PICTURE_SHEDDING_CAUTION
    return CAUTION


def _finish(fig, result, what, path, notes=(), **margins):
    """Title, the run's warnings, margins and caution of a run picture; then write it."""
    return finish_figure(fig, path, _title(result, what), list(notes) + _warning_notes(result),
                         caution=run_caution(result), **margins)


def loop_abscissa(history):
    """What the lift is drawn against in a loop: (values, axis label, words).

    The pitch angle when the pitch moves; else the flap angle when a flap moves;
    else the effective angle of attack
    at three-quarter chord (``alpha_eff_deg``: plunge or heave rate and gust
    included) when the run has it; else the vertical gust at the leading edge;
    else the pitch angle (nothing moved).
    """
    h = history
    if moves(h["pitch_deg"]):
        return h["pitch_deg"], "pitch angle (deg)", "pitch"
    if "flap_deg" in h and moves(h["flap_deg"]):
        return h["flap_deg"], "flap angle (deg, trailing edge down +)", "flap angle"
    if "alpha_eff_deg" in h and moves(h["alpha_eff_deg"]):
        return (h["alpha_eff_deg"], "effective angle of attack at 3/4 chord (deg)\n"
                "(pitch, plunge or heave rate and gust together)", "effective angle")
    if "w_gust" in h and moves(h["w_gust"]):
        return h["w_gust"], "vertical gust at the leading edge (m/s)", "gust velocity"
    return h["pitch_deg"], "pitch angle (deg)", "pitch"


# ---------------------------------------------------------------------------
# the run pictures

#: History rows of histories.png: (column, label, unit for the "held constant" note).
HISTORY_ROWS = (
    ("cl", "lift coefficient cl", ""),
    ("cm", "moment coefficient cm\n(quarter chord, nose-up +)", ""),
    ("ch", "hinge moment ch\n(trailing edge down +)", ""),
    ("n", "load factor n", ""),
    ("w_gust", "vertical gust at the\nleading edge (m/s)", " m/s"),
    ("u_gust", "streamwise gust at the\nleading edge (m/s)", " m/s"),
    ("pitch_deg", "pitch angle (deg)", " deg"),
    ("height_m", "height of the pitch axis (m)", " m"),
    ("flap_deg", "flap angle (deg)", " deg"),
    ("ground_clearance_m", "clearance above\nthe ground (m)", " m"),
)
#: Inputs drawn only when they move (the loads are always drawn).
INPUTS = ("w_gust", "u_gust", "pitch_deg", "height_m", "flap_deg", "ground_clearance_m")
_INPUT_WORDS = {"w_gust": "vertical gust", "u_gust": "streamwise gust", "pitch_deg": "pitch",
                "height_m": "height", "flap_deg": "flap", "ground_clearance_m": "ground clearance"}


def plot_histories(result, path):
    """histories.png: lift, moment, load factor (when present) and what moved (gust, pitch, plunge, flap).

    An input that stays constant gets no panel; its value is written under the title.
    """
    h = result.history
    t = h["t"]
    rows, held = [], []
    for k, label, unit in HISTORY_ROWS:
        if k not in h:
            continue
        if k in INPUTS and not moves(h[k]):
            if k == "pitch_deg" or np.any(h[k] != 0):     # (no plunge needs no note)
                v = float(h[k][np.isfinite(h[k])][0]) if np.isfinite(h[k]).any() else float("nan")
                held.append(f"{_INPUT_WORDS[k]} {v:.4g}{unit}")
            continue
        rows.append((k, label))
    fig = new_figure(8, 1.7 * len(rows) + 1.0)
    axes = np.atleast_1d(fig.subplots(len(rows), 1, sharex=True))
    for ax, (k, label) in zip(axes, rows):
        house_style(ax)
        ax.plot(t, h[k], color=LOOK["trace"], lw=1.4, label="vortex model" if k == "cl" else None)
        if k == "cl" and "cl_quasi_steady" in h:
            ax.plot(t, h["cl_quasi_steady"], color=LOOK["second"], lw=1.0, ls="--", label="quasi-steady")
            house_legend(ax)
        if k == "n":
            ax.axhline(1.0, color=LOOK["muted"], lw=0.7, ls=":")
        if k == "cl":
            mark_onset(ax, result)
        ax.set_ylabel(label, fontsize=8)
    axes[-1].set_xlabel("time t (s)", fontsize=9)
    notes = [("held constant: " + ", ".join(held))] if held else []
    _finish(fig, result, "histories", path, notes, left=1.0, bottom=0.65, gap=0.18, rows=len(rows))
    return True


def plot_lift_loop(result, path):
    """lift-loop.png: cl against what moved (:func:`loop_abscissa`), with the quasi-steady line when the run has it."""
    h = result.history
    a, xlabel, what = loop_abscissa(h)
    fig = new_figure(6.2, 5.0)
    ax = house_style(fig.add_subplot(111))
    cl = h["cl"]
    ax.plot(a, cl, color=LOOK["trace"], lw=1.3, label="vortex model")
    ok = np.isfinite(cl) & np.isfinite(a)
    if ok.sum() > 1:
        i0 = int(np.flatnonzero(ok)[0])
        i1 = int(np.flatnonzero(ok)[-1])
        ax.plot([a[i0]], [cl[i0]], "o", color=LOOK["trace"], ms=4, label="start")
        ax.plot([a[i1]], [cl[i1]], "s", color=LOOK["marker"], ms=4, label="end")
        # arrows along the loop show its sense
        step = max(1, ok.sum() // 8)
        for i in range(i0 + step, i1 - 1, step):
            if ok[i] and ok[i + 1] and (a[i + 1] != a[i] or cl[i + 1] != cl[i]):
                ax.annotate("", xy=(a[i + 1], cl[i + 1]), xytext=(a[i], cl[i]),
                            arrowprops=dict(arrowstyle="-|>", color=LOOK["trace"], lw=0.8, mutation_scale=9))
    if "cl_quasi_steady" in h:
        ax.plot(a, h["cl_quasi_steady"], color=LOOK["second"], lw=1.0, ls="--", label="quasi-steady")
    ax.set_xlabel(xlabel, fontsize=9)
    ax.set_ylabel("lift coefficient cl", fontsize=9)
    house_legend(ax)
    notes = []
    if what != "pitch":
        notes.append(f"the pitch is held at {float(h['pitch_deg'][0]):.3g} deg: the lift is drawn against the {what}")
    return _finish(fig, result, f"lift against {what}", path, notes, left=0.8,
                   bottom=0.75 if "\n" in xlabel else 0.6)


def _outline(result, alpha, h, x_shift=0.0, t=None):
    """The airfoil's outline at pitch alpha, height h (and its flap as deflected at time t)."""
    from . import fields
    sc = result.scenario
    flap = None if t is None else fields.flap_at(sc, result.history, t)
    return fields.airfoil_outline(sc.section, sc.chord, sc.pivot, alpha, h, x_shift=x_shift, flap=flap)


def draw_ground(ax, sc, z_shift=0.0, **kw):
    """The ground line of a run with ``[ground]`` (a solid rule across the axes), or None."""
    from . import fields
    z_g = fields.ground_height(sc)
    if z_g is None:
        return None
    return ax.axhline(z_g + z_shift, color=LOOK["ink"], lw=1.4, zorder=4, **kw)


#: Chords of wake behind the trailing edge framed by the near-wake panel of wake.png.
NEAR_WAKE_CHORDS = 4.0
#: Chords shown ahead of the leading edge in that panel.
NEAR_WAKE_AHEAD = 0.75


def mark_onset(ax, result, y="cl"):
    """Mark where the leading edge first sheds on a trace against time (a line and a diamond); False if never."""
    t0 = (result.summary or {}).get("lev_onset_t")
    h = result.history
    if t0 is None or y not in h or not len(h["t"]):
        return False
    i = int(np.argmin(np.abs(np.asarray(h["t"]) - t0)))
    ax.axvline(t0, color=LOOK["lev"], lw=0.8, ls=(0, (4, 2)), zorder=1)
    # several elements: name the ones whose leading edge sheds first
    first = [k[len("lev_onset_t_"):] for k, v in (result.summary or {}).items()
             if k.startswith("lev_onset_t_") and v == t0]
    who = (f"leading edge of element {' and '.join(first)} sheds" if len(first) == 1 else
           f"leading edges of elements {' and '.join(first)} shed" if first else "leading edge sheds")
    ax.plot([t0], [h[y][i]], "D", color=LOOK["paper"], mec=LOOK["lev"], mew=1.3, ms=5, zorder=5,
            label=f"{who} ({t0:.4g} s)")
    house_legend(ax)
    return True


def lev_mask(snapshots, a, b):
    """Which wake vortices of snapshot rows a:b the leading edge shed (all False without that record)."""
    lev = snapshots.get("lev")
    if lev is None or len(lev) != len(snapshots["x"]):
        return np.zeros(b - a, bool)
    return np.asarray(lev[a:b], bool)


def plot_wake(result, path, k=-1):
    """wake.png: the near wake (a few chords behind the airfoil, true proportions) at snapshot ``k``
    (default the last), and below it the whole wake with the near-wake frame marked."""
    s = result.snapshots
    sc = result.scenario
    if sc is None or "offsets" not in s or len(s.get("t", ())) == 0:
        return False
    k = k % len(s["t"])
    a, b = int(s["offsets"][k]), int(s["offsets"][k + 1])
    x, z, g = s["x"][a:b], s["z"][a:b], s["gamma"][a:b]
    lev = lev_mask(s, a, b)
    c = float(sc.chord)
    from . import fields
    outlines = fields.element_outlines(sc, s["alpha"][k], s["h"][k],
                                       flap=fields.flap_at(sc, result.history, float(s["t"][k])))
    xo, zo = np.concatenate([o[0] for o in outlines]), np.concatenate([o[1] for o in outlines])
    x0 = float(xo.min()) - NEAR_WAKE_AHEAD * c
    x1 = float(xo.max()) + NEAR_WAKE_CHORDS * c
    zc = 0.5 * (float(zo.min()) + float(zo.max()))
    whole = x.size > 0 and (float(x.max()) > x1 or float(x.min()) < x0)
    fig = new_figure(9.0, 6.4 if whole else 4.4)
    if whole:
        ax, ax_all = fig.subplots(2, 1, gridspec_kw={"height_ratios": [2.3, 1.0]})
    else:
        ax, ax_all = fig.add_subplot(111), None
    gl = float(np.percentile(np.abs(s["gamma"]), 99.0)) if s["gamma"].size else 1.0
    gl = gl if gl > 0 else 1.0
    size = 1.5 + 30.0 * np.minimum(np.abs(g) / gl, 1.0)
    norm = Normalize(-gl, gl)
    for axis, dots in ((ax, size), (ax_all, 0.4 + 0.3 * size)):
        if axis is None:
            continue
        house_style(axis, grid=False)
        te = ~lev
        axis.scatter(x[te], z[te], c=g[te], s=dots[te], cmap=VORTEX_MAP, norm=norm, linewidths=0, zorder=2)
        if lev.any():
            axis.scatter(x[lev], z[lev], c=g[lev], s=dots[lev] * 1.3, cmap=VORTEX_MAP, norm=norm, marker="D",
                         edgecolors=LOOK["lev"], linewidths=0.5, zorder=2.5)
        for xe, ze in outlines:               # every element ([[airfoil]])
            axis.fill(xe, ze, facecolor=LOOK["airfoil"], edgecolor=LOOK["airfoil_edge"], lw=0.6, zorder=3)
        draw_ground(axis, sc)
    ax.set_ylabel("height z (m)", fontsize=9)
    handles = [Line2D([], [], ls="", marker="o", color=LOOK["ccw"], label="counter-clockwise"),
               Line2D([], [], ls="", marker="o", color=LOOK["cw"], label="clockwise")]
    if lev.any():
        handles.append(Line2D([], [], ls="", marker="D", color=LOOK["paper"], mec=LOOK["lev"], mew=1.0,
                              label="from the leading edge"))
    if sc.data.get("ground"):
        handles.append(Line2D([], [], color=LOOK["ink"], lw=1.4, label="ground"))
    house_legend(ax, handles=handles, loc="upper right", ncol=len(handles),
                 title="wake vortices (dot size: strength)", title_fontsize=7)
    near = f"near wake: {NEAR_WAKE_CHORDS:g} chords behind the trailing edge"
    if whole:
        ax.set_title(near, fontsize=8, color=LOOK["muted"], loc="left")
        ax_all.set_xlabel("x, downstream of the pitch axis (m)", fontsize=9)
        ax_all.set_ylabel("z (m)", fontsize=9)
        ax_all.set_title(f"whole wake ({(float(x.max()) - float(xo.min())) / c:.0f} chords; "
                         "the box is the frame above)", fontsize=8, color=LOOK["muted"], loc="left")
        ax_all.set_aspect("equal", adjustable="datalim")
    else:
        ax.set_xlabel("x, downstream of the pitch axis (m)", fontsize=9)
    t = float(s["t"][k])
    dress(fig, _title(result, f"wake at t = {t:.4g} s ({b - a} vortices)"), _warning_notes(result),
          run_caution(result), left=0.8, bottom=0.6, gap=0.55, rows=2 if whole else 1)
    # the near frame in true proportions: z range from the panel's shape
    bb = ax.get_position()
    w_in, h_in = fig.get_size_inches()
    half = 0.5 * (x1 - x0) * (bb.height * h_in) / (bb.width * w_in)
    ax.set_xlim(x0, x1)
    ax.set_ylim(zc - half, zc + half)
    if whole:
        ax_all.add_patch(Rectangle((x0, zc - half), x1 - x0, 2 * half, fill=False, edgecolor=LOOK["muted"],
                                   lw=0.8, ls="--", zorder=4))
    save_png(fig, path)
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


#: Fraction of the chord behind the leading edge from which pressure-jump.png sets its scale: the
#: inverse-square-root peak at the leading edge (thin-airfoil theory) would flatten the rest.
PRESSURE_SCALE_FROM = 0.1


def plot_pressure_jump(result, path):
    """pressure-jump.png: the pressure-jump coefficient along the chord at a few instants.

    The scale is set by the chord behind :data:`PRESSURE_SCALE_FROM`; the
    leading-edge zone is shaded and a leading-edge value beyond the frame is
    written at the frame's edge.
    """
    s = result.snapshots
    if "dcp" not in s or "x_dcp" not in s or len(s["dcp"]) == 0:
        return False
    dcp, xc = np.asarray(s["dcp"], dtype=float), np.asarray(s["x_dcp"], dtype=float)
    h = result.history
    rows = [i for i in pressure_instants(h) if i < len(dcp)]
    fig = new_figure(7.0, 4.6)
    ax = house_style(fig.add_subplot(111))
    colors = [LOOK["trace"], LOOK["ccw"], LOOK["cw"], LOOK["second"], LOOK["gust_up"], LOOK["muted"]]
    rest = xc >= PRESSURE_SCALE_FROM
    vals = dcp[rows][:, rest] if rows and rest.any() else dcp[rows]
    vals = vals[np.isfinite(vals)]
    lo, hi = (min(0.0, float(vals.min())), max(0.0, float(vals.max()))) if vals.size else (-1.0, 1.0)
    pad = 0.12 * (hi - lo) if hi > lo else 1.0
    lo, hi = lo - pad, hi + pad
    le = int(np.argmin(xc))
    beyond = {"top": 0, "bottom": 0}
    for c, i in zip(colors, rows):
        ax.plot(xc, dcp[i], color=c, lw=1.3, marker="o", ms=2.2,
                label=f"t = {h['t'][i]:.4g} s (cl = {h['cl'][i]:.3f}, pitch {h['pitch_deg'][i]:.1f} deg)")
        v = float(dcp[i][le])
        if np.isfinite(v) and not lo <= v <= hi:
            side = "top" if v > hi else "bottom"
            n = beyond[side]
            beyond[side] += 1
            y = hi if side == "top" else lo
            ax.plot([xc[le]], [y], "^" if side == "top" else "v", color=c, ms=6, clip_on=False, zorder=5,
                    label="_leading edge")
            off = -11 * (n + 1) if side == "top" else 11 * (n + 1)
            ax.annotate(f"leading edge {v:.3g}", xy=(xc[le], y), xytext=(6, off), textcoords="offset points",
                        fontsize=7, color=c, va="center", ha="left")
    ax.axvspan(0.0, PRESSURE_SCALE_FROM, color=LOOK["rule"], alpha=0.35, lw=0, zorder=0)
    ax.axhline(0.0, color=LOOK["muted"], lw=0.6)
    ax.set_xlim(0, 1)
    ax.set_ylim(lo, hi)
    ax.set_xlabel("position along the chord x/c (leading edge 0, trailing edge 1)", fontsize=9)
    ax.set_ylabel("pressure-jump coefficient\n(lower minus upper surface)", fontsize=9)
    house_legend(ax, loc="upper right")
    notes = [f"scale set by the chord behind {PRESSURE_SCALE_FROM:g} c (shaded: leading-edge zone, where the "
             "load rises as 1/sqrt(x); values beyond the frame are written at its edge)"]
    return _finish(fig, result, "load along the chord", path, notes, left=0.9)


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
    """Draw every registered picture of a run into ``out_dir`` (those that apply to it); callers
    take it from :mod:`unsteady.outputs.gallery`, which loads every picture module first."""
    out_dir = Path(out_dir)
    if len(result.history.get("t", [])) == 0:
        return
    for name, fn in PICTURES.items():
        fn(result, out_dir / name)


def _fmt(v, unit="s"):
    return f"{v:.3g} {unit}".strip()


@picture("lag.png")
def plot_lag(result, path):
    """lag.png: cl against the quasi-steady cl and the effective angle, with the validity flag;
    ramps and steps get their t50 / t90 marks, periodic motion its amplitude ratio and phase lag."""
    h = result.history
    if "cl_quasi_steady" not in h or len(h["t"]) < 2:
        return False
    lag = result.summary.get("lag", {}) or {}
    val = lag.get("validity", {}) or {}
    fig = new_figure(8, 5.6)
    ax1, ax2 = fig.subplots(2, 1, sharex=True)
    house_style(ax1)
    house_style(ax2)
    t = h["t"]
    ax1.plot(t, h["cl"], color=LOOK["trace"], lw=1.4, label=f"cl ({result.summary.get('model', 'run')} model)")
    ax1.plot(t, h["cl_quasi_steady"], color=LOOK["second"], lw=1.0, ls="--", label="quasi-steady cl")
    t0 = lag.get("t_begin")
    marks = ((50, "o"), (90, "D"))
    if t0 is not None:
        ax1.axvline(t0, color=LOOK["muted"], lw=0.7, ls=":", label=f"change begins ({_fmt(t0)})")
        lines = []
        for suffix, y, col, who in (("", h["cl"], LOOK["trace"], "cl"),
                                    ("_qs", h["cl_quasi_steady"], LOOK["second"], "quasi-steady")):
            said = []
            for pct, mk in marks:
                dt = lag.get(f"t{pct}{suffix}")
                if dt is None or not math.isfinite(dt):
                    said.append(f"t{pct} not reached")
                    continue
                tm = t0 + dt
                ym = float(np.interp(tm, t, y))
                ax1.plot([tm], [ym], mk, color=col, ms=5, mfc=LOOK["paper"], mew=1.3, zorder=5,
                         label=f"_t{pct}{suffix}")
                ax1.annotate(f"t{pct}", xy=(tm, ym), xytext=(5, -9 if suffix else 4), textcoords="offset points",
                             fontsize=7, color=col)
                said.append(f"t{pct} {_fmt(dt)}")
            lines.append(f"{who}: " + ", ".join(said))
        if lag.get("delay90") is not None:
            lines.append(f"t90 delay behind quasi-steady: {_fmt(lag['delay90'])} = "
                         f"{lag.get('delay90_chords', float('nan')):.3g} chords flown")
        ax1.text(0.99, 0.04, "times after the change begins\n" + "\n".join(lines), transform=ax1.transAxes,
                 ha="right", va="bottom", fontsize=7.5, color=LOOK["ink"], linespacing=1.3, multialignment="left",
                 bbox=dict(boxstyle="round,pad=0.3", facecolor=LOOK["paper"], edgecolor=LOOK["rule"]))
        for pct, mk in marks:
            ax1.plot([], [], mk, color=LOOK["muted"], ms=5, mfc=LOOK["paper"], mew=1.3,
                     label=f"t{pct}: from here on beyond {pct} % of the final change")
    elif lag.get("amplitude_ratio") is not None:
        ax1.text(0.99, 0.04, f"amplitude ratio {lag['amplitude_ratio']:.3f}, phase lag "
                 f"{lag.get('phase_lag_deg', float('nan')):.2f} deg (cl against quasi-steady, "
                 f"{lag.get('periods_used', '?')} periods)",
                 transform=ax1.transAxes, ha="right", va="bottom", fontsize=7.5, color=LOOK["ink"],
                 bbox=dict(boxstyle="round,pad=0.3", facecolor=LOOK["paper"], edgecolor=LOOK["rule"]))
    ax1.set_ylabel("lift coefficient cl", fontsize=8)
    house_legend(ax1, loc="upper left" if t0 is not None else "best")
    ae = h["alpha_eff_deg"]
    ax2.plot(t, ae, color=LOOK["ccw"], lw=1.2, label="effective angle (3/4 chord)")
    lim = val.get("alpha_eff_limit_deg", ALPHA_EFF_LIMIT_DEG)
    a_hi, a_lo = float(np.nanmax(ae)), float(np.nanmin(ae))
    ax2.axhspan(lim, max(lim, a_hi) + 1.0, color=LOOK["band"], lw=0,
                label=f"beyond {lim:g} deg: separation likely")
    ax2.axhspan(min(-lim, a_lo) - 1.0, -lim, color=LOOK["band"], lw=0)
    ax2.set_ylabel("effective angle (deg)", fontsize=8)
    ax2.set_xlabel("time t (s)", fontsize=9)
    house_legend(ax2)
    if val and not val.get("attached_flow_ok", True):
        notes = _warning_notes(result)
    else:
        notes = [f"within the attached-flow range of the model (effective angle within {lim:g} deg, reduced "
                 f"pitch rate within {val.get('pitch_rate_limit', float('nan')):g})"] + _warning_notes(result)
    return finish_figure(fig, path, _title(result, "lift lag against the quasi-steady estimate"), notes,
                         left=0.8, bottom=0.55, top=0.15, gap=0.18, rows=2)


@picture("gust-loads.png")
def plot_gust_loads(result, path):
    """gust-loads.png: gust at the leading edge, load factor (with the peak and the gust-formula
    estimate) and, where the history has ``lift_N``, the aircraft's lift in newtons with the
    half-wing root bending moment (``root_bending_Nm``, with ``[aircraft] span``) on a second
    axis; the full gust-load caution and, beside the newtons, the dimensional-load caution
    (written only for runs with ``n``)."""
    h, s = result.history, result.summary
    if "n" not in h or not len(h["n"]):
        return False
    dimensional = "lift_N" in h and len(h["lift_N"]) == len(h["t"])
    rows = 3 if dimensional else 2
    fig = new_figure(8, 7.4 if dimensional else 5.4)
    ax1 = house_style(fig.add_subplot(rows, 1, 1))
    ax2 = house_style(fig.add_subplot(rows, 1, 2, sharex=ax1))
    t = h["t"]
    if "w_gust" in h:
        ax1.plot(t, h["w_gust"], color=LOOK["trace"], lw=1.2, label="vertical gust w")
    if "u_gust" in h and np.any(h["u_gust"] != 0):
        ax1.plot(t, h["u_gust"], color=LOOK["second"], lw=1.0, ls="--", label="streamwise gust u")
    ax1.set_ylabel("gust at the leading edge (m/s)", fontsize=8)
    house_legend(ax1)
    ax2.plot(t, h["n"], color=LOOK["trace"], lw=1.4, label="load factor n (vortex model)")
    ax2.axhline(1.0, color=LOOK["muted"], lw=0.7, ls=":")
    if "n_max" in s:
        ax2.plot([s["t_n_max"]], [s["n_max"]], "o", color=LOOK["second"], ms=4,
                 label=f"peak n = {s['n_max']:.3f}")
    if "dn_formula" in s:
        ax2.axhline(1.0 + s["dn_formula"], color=LOOK["second"], lw=0.9, ls="--",
                    label=f"gust formula 1 + {s['dn_formula']:.3f} (mu_g = {s['mass_ratio_mu_g']:.1f})")
    ax2.set_ylabel("load factor n", fontsize=8)
    notes = _warning_notes(result)
    caution = GUST_CAUTION
    if dimensional:
        ax3 = house_style(fig.add_subplot(rows, 1, 3, sharex=ax1))
        ax3.plot(t, h["lift_N"], color=LOOK["trace"], lw=1.4, label="lift of the aircraft (N)")
        if "lift_max_N" in s:
            i = int(np.nanargmax(h["lift_N"]))
            ax3.plot([t[i]], [s["lift_max_N"]], "o", color=LOOK["second"], ms=4,
                     label=f"peak lift {s['lift_max_N']:.4g} N")
        ax3.set_ylabel("lift (N)", fontsize=8)
        handles, labels = ax3.get_legend_handles_labels()
        if "root_bending_Nm" in h:
            ax4 = ax3.twinx()
            ax4.plot(t, h["root_bending_Nm"], color=LOOK["ccw"], lw=1.0, ls="--",
                     label="root bending, one half-wing (N m)")
            lo, hi = ax3.get_ylim()
            factor = float(np.nanmax(h["root_bending_Nm"]) / np.nanmax(h["lift_N"])) \
                if np.nanmax(h["lift_N"]) > 0 else 1.0
            ax4.set_ylim(lo * factor, hi * factor)    # the same curve scaled: elliptic loading
            ax4.set_ylabel("root bending moment (N m)", fontsize=8, color=LOOK["ccw"])
            ax4.tick_params(labelsize=7, colors=LOOK["ccw"])
            for k, sp in ax4.spines.items():
                sp.set_color(LOOK["rule"])
                sp.set_visible(k == "right")
            if "root_bending_max_Nm" in s:
                handles.append(Line2D([], [], color=LOOK["ccw"], lw=1.0, ls="--"))
                labels.append(f"root bending, one half-wing (peak {s['root_bending_max_Nm']:.4g} N m)")
        ax3.legend(handles, labels, fontsize=7, frameon=False, loc="best")
        ax3.set_xlabel("time t (s)", fontsize=9)
        notes = [f"newtons: {DIMENSIONAL_CAUTION}"] + notes
    else:
        ax2.set_xlabel("time t (s)", fontsize=9)
    house_legend(ax2)
    return finish_figure(fig, path, _title(result, "gust loads"), notes, caution=caution,
                         left=0.8, right=0.8 if dimensional else 0.3, bottom=0.6,
                         gap=0.32 if dimensional else 0.18, rows=rows)
