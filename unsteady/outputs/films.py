"""Films of a run (MP4 or GIF): the airfoil, its wake, the gust and a history trace, drawn frame by frame."""

from __future__ import annotations

import math
import os
import shutil
import subprocess
import tempfile
from dataclasses import dataclass
from pathlib import Path

import numpy as np  # noqa: E402
from matplotlib.artist import Artist  # noqa: E402
from matplotlib.backends.backend_agg import FigureCanvasAgg  # noqa: E402
from matplotlib.colors import Normalize  # noqa: E402
from matplotlib.figure import Figure  # noqa: E402
from matplotlib.lines import Line2D  # noqa: E402
from matplotlib.patches import Polygon  # noqa: E402
from matplotlib.path import Path as MplPath  # noqa: E402
from matplotlib.transforms import Affine2D, IdentityTransform  # noqa: E402

from . import fields, rundir  # noqa: E402
from ..core.errors import UsageError  # noqa: E402
from ..core.files import append_mark, atomic_path  # noqa: E402
from .pictures import (GUST_MAP, LOOK, SPEED_MAP, SPIN_MAP, VORTEX_MAP, lev_mask, run_caution,  # noqa: E402
                       run_warnings, wrap_to_width)

__all__ = ["FilmOptions", "Film", "FilmRenderer", "write_film", "load_run", "LOOK",
           "FLOW_STYLES", "VIEWS", "TRACES", "CAMERAS"]

FLOW_STYLES = {
    "vortices": "wake vortices (teal: counter-clockwise, brick: clockwise; size: strength)",
    "vorticity": "smoothed vorticity of the wake (1/s)",
    "speed": "flow speed (m/s)",
    "streamlines": "streamlines",
}
#: Shorter wordings of FLOW_STYLES and VIEWS for small films.
FLOW_SHORT = {"vortices": "wake vortices (dot size: strength)", "vorticity": "wake vorticity (1/s)",
              "speed": "flow speed (m/s)", "streamlines": "streamlines"}
VIEWS_SHORT = {"airfoil": "riding with the airfoil", "air": "from the still air"}
VIEWS = {
    "airfoil": "seen riding with the airfoil (the air streams past to the right)",
    "air": "seen from the still air (the airfoil flies through it to the left)",
}
CAMERAS = {
    "auto": "follows the airfoil when it heaves freely ([aircraft]) or its height changes by more than a chord",
    "follow": "keeps the airfoil's pitch axis at the middle height of the picture",
    "fixed": "one frame for the whole film, holding the whole motion",
}
#: Height change (chords) beyond which the automatic camera follows the airfoil.
FOLLOW_BEYOND_CHORDS = 1.0
# trace name -> (history column, label)
TRACES = {
    "cl": ("cl", "lift coefficient cl"),
    "cm": ("cm", "moment coefficient cm\n(quarter chord, nose-up +)"),
    "n": ("n", "load factor n"),
    "pitch": ("pitch_deg", "pitch angle (deg)"),
    "plunge": ("height_m", "height of the pitch axis (m)"),
    "ch": ("ch", "hinge moment ch\n(trailing edge down +)"),
    "flap": ("flap_deg", "flap angle (deg)\n(trailing edge down +)"),
}
FORMATS = (".mp4", ".gif")


@dataclass(frozen=True)
class FilmOptions:
    """How a film is made (all have defaults; see ``unsteady animate --help``).

    Attributes
    ----------
    frame_rate : float
        Frames per second of the film.
    width, height : int
        Picture size in pixels (even for MP4).
    span : (float or None, float or None)
        Part of the run to show, seconds of run time (None: from the first /
        to the last snapshot).
    slowdown : float or None
        Film seconds per second of flow (10 = ten times slower than real
        time, 0.5 = twice as fast).  None with ``frames`` None: one frame per
        snapshot.
    frames : int or None
        Exact number of frames (sets the slowdown).
    view : {"airfoil", "air"}
    flow : {"vortices", "vorticity", "speed", "streamlines"}
    trace : {"cl", "cm", "n", "pitch", "plunge"} or None
        None: the load factor when the run has it, else cl.
    grid : (int, int) or None
        Field grid nodes (nx, nz); None: about one node per 8 pixels.
    reach : float
        Chords of wake shown behind the trailing edge.
    camera : {"auto", "follow", "fixed"}
        See :data:`CAMERAS`: following, heights are drawn relative to the
        pitch axis and the clock gives the airfoil's height.
    surface_pressure : bool
        Draw the pressure on both surfaces of a thick section (runs with
        ``[airfoil] thick = true``): a line off the outline, outward by
        :data:`PRESSURE_OFFSET` chords per unit of suction (-Cp), inward for
        positive Cp.
    """

    frame_rate: float = 25.0
    width: int = 1280
    height: int = 720
    span: tuple = (None, None)
    slowdown: float = None
    frames: int = None
    view: str = "airfoil"
    flow: str = "vortices"
    trace: str = None
    grid: tuple = None
    reach: float = 6.0
    camera: str = "auto"
    surface_pressure: bool = False


#: Chords off the outline per unit of -Cp of the film's surface-pressure line.
PRESSURE_OFFSET = 0.12


# ---------------------------------------------------------------------------
#: Most frames of one film (6.7 min at 25 frames/s); a longer film is refused before drawing.
MAX_FRAMES = 10_000
#: The files of a run directory a film needs besides the history and summary.
FILM_FILES = ("scenario.toml", "snapshots.npz")


def load_run(run_dir):
    """Read a run directory for a film (see :func:`unsteady.outputs.rundir.load_run`; UsageError, exit 2)."""
    return rundir.load_run(run_dir, need=FILM_FILES)


class Film:
    """What a film shows, decided once for all frames: times, views, limits, colours.

    Parameters
    ----------
    result : Result
        A run (with scenario and wake snapshots).
    options : FilmOptions
    label : str
        Where the run came from, for error messages.
    """

    def __init__(self, result, options=FilmOptions(), label="run"):
        self.res = result
        self.opt = options
        self.sc = sc = result.scenario
        self.snap = result.snapshots
        self.hist = result.history
        self.label = label
        self.U, self.c, self.pivot = float(sc.speed), float(sc.chord), float(sc.pivot)
        self.section = sc.section
        self.r_wake, self.r_body = fields.core_radii(sc)
        self._check_options()
        ts = np.asarray(self.snap["t"], dtype=float)
        t0 = ts[0] if options.span[0] is None else float(options.span[0])
        t1 = ts[-1] if options.span[1] is None else float(options.span[1])
        t0, t1 = max(t0, ts[0]), min(t1, ts[-1])
        if not t1 >= t0:
            raise UsageError(f"error: {label}: --span: {options.span[0]}:{options.span[1]} holds no snapshot; "
                             f"the run's snapshots cover {ts[0]:.4g} to {ts[-1]:.4g} s")
        self.t0, self.t1 = t0, t1
        in_span = np.flatnonzero((ts >= t0 - 1e-12) & (ts <= t1 + 1e-12))
        if options.frames is not None:
            n = int(options.frames)
        elif options.slowdown is not None:
            n = max(1, int(round((t1 - t0) * options.slowdown * options.frame_rate)) + 1)
            if n > MAX_FRAMES:
                top = (MAX_FRAMES - 1) / ((t1 - t0) * options.frame_rate)
                raise UsageError(f"error: {label}: --slowdown: {options.slowdown:g} gives {n} frames; "
                                 f"allowed here: up to {top:.4g} ({MAX_FRAMES} frames at "
                                 f"{options.frame_rate:g} frames/s), or a shorter --span")
        else:
            n = max(1, in_span.size)
        self.n_frames = n
        if options.frames is None and options.slowdown is None:
            self.snap_index = in_span if in_span.size else np.array([int(np.argmin(abs(ts - t0)))])
        else:
            times = np.linspace(t0, t1, n) if n > 1 else np.array([t0])
            j = np.clip(np.searchsorted(ts, times), 1, ts.size - 1) if ts.size > 1 else np.zeros(n, int)
            if ts.size > 1:
                j = np.where(np.abs(ts[j - 1] - times) <= np.abs(ts[j] - times), j - 1, j)
            self.snap_index = j.astype(int)
        self.times = ts[self.snap_index]
        self.repeats = n - np.unique(self.snap_index).size
        # film time between frames 1/fps covers (t1 - t0)/(n - 1) of flow time
        self.slowdown = ((n - 1) / options.frame_rate) / (t1 - t0) if t1 > t0 and n > 1 else float("nan")
        self.air = options.view == "air"
        self.trace_name = options.trace or ("n" if "n" in self.hist else "cl")
        self.trace_col, self.trace_label = TRACES[self.trace_name]
        hs = np.asarray(self.snap["h"], dtype=float)[self.snap_index]
        self.heaves = bool(np.ptp(hs) > 0) if hs.size else False
        if options.camera == "auto":
            self.follow = self.heaves and ("n" in self.hist or float(np.ptp(hs)) > FOLLOW_BEYOND_CHORDS * self.c)
        else:
            self.follow = options.camera == "follow"
        #: Where the model is out of its depth (banner of every frame).
        self.warnings = run_warnings(result)
        self._gust_setup()

    # -- checks ------------------------------------------------------------
    def _check_options(self):
        o, lab = self.opt, self.label
        if o.view not in VIEWS:
            raise UsageError(f"error: {lab}: --view: unknown view {o.view!r}; allowed: {', '.join(VIEWS)}")
        if o.flow not in FLOW_STYLES:
            raise UsageError(f"error: {lab}: --flow: unknown drawing {o.flow!r}; allowed: {', '.join(FLOW_STYLES)}")
        if o.trace is not None and o.trace not in TRACES:
            raise UsageError(f"error: {lab}: --trace: unknown history {o.trace!r}; allowed: {', '.join(TRACES)}")
        if o.trace is not None and TRACES[o.trace][0] not in self.hist:
            have = [k for k, (col, _) in TRACES.items() if col in self.hist]
            why = " (the scenario has no [aircraft] section)" if o.trace == "n" else ""
            raise UsageError(f"error: {lab}: --trace: this run has no {o.trace!r} history{why}; "
                             f"allowed here: {', '.join(have)}")
        if not (o.frame_rate > 0 and o.frame_rate <= 120):
            raise UsageError(f"error: {lab}: --frame-rate: {o.frame_rate}; allowed: more than 0, at most 120 per second")
        if not (64 <= o.width <= 7680 and 64 <= o.height <= 4320):
            raise UsageError(f"error: {lab}: --size: {o.width}x{o.height}; allowed: 64x64 to 7680x4320 pixels")
        if o.slowdown is not None and not (o.slowdown > 0 and math.isfinite(o.slowdown)):
            raise UsageError(f"error: {lab}: --slowdown: {o.slowdown}; allowed: a positive number")
        if o.frames is not None and not (1 <= o.frames <= MAX_FRAMES):
            raise UsageError(f"error: {lab}: --frames: {o.frames}; allowed: 1 to {MAX_FRAMES} "
                             f"({MAX_FRAMES / 25 / 60:.3g} min at 25 frames/s)")
        if o.grid is not None and not (4 <= o.grid[0] <= 2000 and 4 <= o.grid[1] <= 2000):
            raise UsageError(f"error: {lab}: --grid: {o.grid[0]}x{o.grid[1]}; allowed: 4x4 to 2000x2000 nodes")
        if not (o.reach > 0 and math.isfinite(o.reach)):
            raise UsageError(f"error: {lab}: --reach: {o.reach}; allowed: a positive number of chords")
        if o.camera not in CAMERAS:
            raise UsageError(f"error: {lab}: --camera: unknown camera {o.camera!r}; allowed: {', '.join(CAMERAS)}")
        if o.surface_pressure and "cp" not in self.snap:
            raise UsageError(f"error: {lab}: --surface-pressure: this run has no surface pressure; "
                             f"it is computed for thick sections only ([airfoil] thick = true)")

    # -- gust --------------------------------------------------------------
    def _gust_setup(self):
        """w(x, t) of the gust in the solver's frame: from the scenario's gust field, else from w_gust."""
        self.gust_w = None
        self.gust_field = None
        if self.sc.data.get("gust"):
            try:
                from ..inputs.gusts import build_gust_field
                self.gust_field = build_gust_field(self.sc)
                self.gust_w = lambda x, t: self.gust_field.velocity(x, np.zeros_like(x), t)[1]
            except (ImportError, AttributeError):
                self.gust_field = None
        if self.gust_w is None and "w_gust" in self.hist and np.any(self.hist["w_gust"] != 0):
            th, wg = self.hist["t"], self.hist["w_gust"]
            x_le = -self.pivot * self.c
            # a frozen pattern carried at U: what is at x now was at the leading edge at t - (x - x_le) / U
            self.gust_w = lambda x, t: np.interp(t - (x - x_le) / self.U, th, wg)
        if self.gust_w is not None:
            wmax = 0.0
            if "w_gust" in self.hist:
                wmax = float(np.nanmax(np.abs(self.hist["w_gust"])))
            if not wmax > 0:
                xs = np.linspace(-5 * self.c, 5 * self.c, 50)
                wmax = max(float(np.max(np.abs(self.gust_w(xs, t)))) for t in self.times[:: max(1, len(self.times) // 20)])
            if not wmax > 0:
                self.gust_w = None
            self.gust_max = wmax

    # -- frames ------------------------------------------------------------
    def x_shift(self, t):
        """Shift (m) from the solver's frame to the picture's frame at time t."""
        return -self.U * (t - self.t0) if self.air else 0.0

    def z_shift(self, i):
        """Shift (m) of heights from the solver's frame to the picture's at frame i (-h when following)."""
        return -float(self.snap["h"][int(self.snap_index[i])]) if self.follow else 0.0

    def frame_state(self, i):
        """(t, snapshot index, alpha, h) of frame i (h: the airfoil's true height)."""
        k = int(self.snap_index[i])
        return float(self.snap["t"][k]), k, float(self.snap["alpha"][k]), float(self.snap["h"][k])

    def sources(self, i):
        """Wake and bound vortices of frame i, in the picture's frame."""
        t, k, _, _ = self.frame_state(i)
        return fields.snapshot_sources(self.snap, k, self.r_wake, self.r_body, self.x_shift(t), self.z_shift(i))

    def wake(self, i):
        """(x, z, gamma) of the wake vortices of frame i, in the picture's frame."""
        t, k, _, _ = self.frame_state(i)
        o = self.snap["offsets"]
        a, b = int(o[k]), int(o[k + 1])
        return (self.snap["x"][a:b] + self.x_shift(t), self.snap["z"][a:b] + self.z_shift(i),
                self.snap["gamma"][a:b])

    def lev(self, i):
        """Which wake vortices of frame i the leading edge shed (boolean, the order of :meth:`wake`)."""
        k = int(self.snap_index[i])
        o = self.snap["offsets"]
        return lev_mask(self.snap, int(o[k]), int(o[k + 1]))

    def lev_onset(self):
        """Time (s) the leading edge first shed, or None."""
        t0 = (self.res.summary or {}).get("lev_onset_t")
        return None if t0 is None else float(t0)

    def trace_peak(self):
        """(t, value, word) of the traced quantity's extreme, or None when outside the film.

        The summary's headline peak where it has one (``<col>_max``/``<col>_min``
        with their times: they leave out one-step transients), the one further
        from the start; otherwise the sample of the history furthest from the start.
        """
        h, s = self.hist, self.res.summary or {}
        y, t = np.asarray(h[self.trace_col], dtype=float), np.asarray(h["t"], dtype=float)
        ok = np.isfinite(y)
        if not ok.any():
            return None
        y0 = float(y[ok][0])
        name = self.trace_name
        cands = []
        for end, word in (("max", "peak"), ("min", "lowest")):
            v = s.get(f"{name}_{end}")
            if isinstance(v, (int, float)) and math.isfinite(v):
                tv = s.get(f"t_{name}_{end}")
                if not isinstance(tv, (int, float)) or not math.isfinite(tv):
                    tv = float(t[ok][np.argmin(np.abs(y[ok] - v))])
                cands.append((abs(v - y0), float(tv), float(v), word))
        if not cands:
            i = int(np.flatnonzero(ok)[np.argmax(np.abs(y[ok] - y0))])
            cands.append((abs(y[i] - y0), float(t[i]), float(y[i]), "peak" if y[i] >= y0 else "lowest"))
        dev, tp, vp, word = max(cands)
        if not dev > 0 or not (self.t0 - 1e-12 <= tp <= self.t1 + 1e-12):
            return None
        return tp, vp, word


class WakeDots(Artist):
    """Wake vortices as dots whose colour and size follow their circulation, drawn fast.

    The circulation range [-g_lim, g_lim] is cut into ``levels`` bins; each bin is
    one colour and one dot size, stamped by the renderer's marker routine (a
    dot rasterised once, then copied to every position), weakest bin first.
    The marker routine puts stamps on whole pixels, so each bin is stamped in
    ``phases`` x ``phases`` sub-pixel shifts: positions are kept to 1/phases
    of a pixel.  A scatter collection draws every dot as its own path: two to
    four times slower for 2,000 vortices, and the film's largest cost.
    """

    def __init__(self, ax, g_lim, cmap, r_min_px, r_max_px, alpha=1.0, levels=32, phases=2, shape="circle"):
        super().__init__()
        self.axes = ax
        self.set_figure(ax.figure)
        self.set_animated(True)
        self.edges = np.linspace(-g_lim, g_lim, levels + 1)
        mids = 0.5 * (self.edges[:-1] + self.edges[1:])
        a = np.abs(mids) / g_lim
        self.colours = [tuple(cmap(0.5 + 0.5 * m / g_lim)[:3]) + (alpha,) for m in mids]
        self.radii = r_min_px + (r_max_px - r_min_px) * a
        self.phases = p = int(phases)
        # rank of each bin in drawing order (weakest first: strong vortices on top)
        self.rank = np.empty(levels, dtype=np.int64)
        self.rank[np.argsort(a, kind="stable")] = np.arange(levels)
        self.by_rank = np.argsort(a, kind="stable")
        # a circle, or a diamond (leading-edge vortices) of the same area
        circle = MplPath.unit_circle() if shape == "circle" else \
            MplPath.unit_regular_polygon(4).transformed(Affine2D().scale(1.25))
        self.stamps = [[circle.transformed(Affine2D().scale(r).translate((i + 0.5) / p, (j + 0.5) / p))
                        for i in range(p) for j in range(p)] for r in self.radii]
        self.xy = np.zeros((0, 2))
        self.gamma = np.zeros(0)

    def set_data(self, x, z, gamma):
        self.xy = np.column_stack([x, z])
        self.gamma = np.asarray(gamma, dtype=float)

    def bins(self):
        """Bin index of every dot (the circulation clipped to the bins' range)."""
        return np.clip(np.searchsorted(self.edges, self.gamma, side="right") - 1, 0, len(self.radii) - 1)

    def draw(self, renderer):
        if not self.get_visible() or self.gamma.size == 0:
            return
        p = self.phases
        pix = self.axes.transData.transform(self.xy)
        whole = np.floor(pix)
        sub = np.minimum(((pix - whole) * p).astype(np.int64), p - 1)
        key = (self.rank[self.bins()] * p + sub[:, 0]) * p + sub[:, 1]
        order = np.argsort(key, kind="stable")
        ks = key[order]
        starts = np.r_[0, np.flatnonzero(np.diff(ks)) + 1]
        ends = np.r_[starts[1:], ks.size]
        pts = whole[order]
        gc = renderer.new_gc()
        gc.set_clip_rectangle(self.axes.bbox)
        gc.set_linewidth(0)
        ident = IdentityTransform()
        for a, b in zip(starts, ends):
            k = int(ks[a])
            j = int(self.by_rank[k // (p * p)])
            renderer.draw_markers(gc, self.stamps[j][k % (p * p)], ident, MplPath(pts[a:b]), ident,
                                  self.colours[j])
        gc.restore()


class FilmRenderer:
    """Draws the frames of a :class:`Film` into one reused figure (blitting on a fixed background).

    ``frame(i)`` returns an (height, width, 3) uint8 array.  The axes limits,
    colour limits and every static element are set once in the constructor.
    """

    DPI = 100.0

    def __init__(self, film: Film):
        self.film = f = film
        o = f.opt
        self.W, self.H = int(o.width), int(o.height)
        s = (self.H / 720.0) ** 0.6
        self.fs = max(5.0, 10.5 * s)
        fig = Figure(figsize=((self.W + 0.01) / self.DPI, (self.H + 0.01) / self.DPI), dpi=self.DPI,
                     facecolor=LOOK["paper"])
        self.fig = fig
        self.canvas = FigureCanvasAgg(fig)
        field_mode = o.flow in ("vorticity", "speed")
        right = 0.905 if field_mode else 0.975
        # a quiet banner of the run's warnings takes a strip above the flow panel
        self.flow_top = 0.855 if f.warnings else 0.895
        self.ax = fig.add_axes([0.075, 0.365, right - 0.075, self.flow_top - 0.365], facecolor=LOOK["paper"])
        self.ax_tr = fig.add_axes([0.075, 0.1, 0.9, 0.185], facecolor=LOOK["paper"])
        self._limits()
        self.animated = []
        #: Static artists pasted back over the moving ones every frame (their pixels, copied once).
        self.stickers = []
        self._static_text()
        self._banner()
        self._build_flow(field_mode)
        self._build_trace()
        self.canvas.draw()
        if np.asarray(self.canvas.buffer_rgba()).shape != (self.H, self.W, 4):
            raise RuntimeError(f"the film canvas is not {self.W}x{self.H} pixels")
        self.bg = self.canvas.copy_from_bbox(fig.bbox)
        rend = self.canvas.get_renderer()
        self.sticker_regions = [self.canvas.copy_from_bbox(a.get_window_extent(rend).expanded(1.02, 1.1))
                                for a in self.stickers]

    # -- layout ------------------------------------------------------------
    def _limits(self):
        """Fixed view: x from just ahead of the airfoil to ``reach`` chords of wake, z to the panel's aspect."""
        f, c = self.film, self.film.c
        t0, t1 = f.t0, f.t1
        x_le0 = -f.pivot * c
        x_te0 = (1 - f.pivot) * c
        more = f.sc.data["airfoil"].get("_more", ())
        if more:                               # [[airfoil]]: frame the furthest trailing edge too
            x_te0 = max([x_te0] + [el["position"][0] + el["chord"] - f.pivot * c for el in more])
        if f.air:
            x_lo = x_le0 + f.x_shift(t1) - 0.8 * c
            x_hi = x_te0 + f.opt.reach * c
        else:
            x_lo = x_le0 - 0.8 * c
            x_hi = x_te0 + f.opt.reach * c
        hs = f.snap["h"][f.snap_index] * (0.0 if f.follow else 1.0)
        alphas = f.snap["alpha"][f.snap_index]
        z_lo = float(np.min(hs)) - c * (0.6 + 0.5 * abs(math.sin(float(np.max(np.abs(alphas))))))
        z_hi = float(np.max(hs)) + c * (0.6 + 0.5 * abs(math.sin(float(np.max(np.abs(alphas))))))
        if more:                               # the further elements' heights (and their swing in pitch)
            reach = max(math.hypot(el["position"][0] + el["chord"] - f.pivot * c, el["position"][1])
                        for el in more) * abs(math.sin(float(np.max(np.abs(alphas)))))
            z_lo = min(z_lo, min(el["position"][1] for el in more) + float(np.min(hs)) - reach - 0.3 * c)
            z_hi = max(z_hi, max(el["position"][1] for el in more) + float(np.max(hs)) + reach + 0.3 * c)
        bb = self.ax.get_position()
        aspect = (bb.width * self.W) / (bb.height * self.H)    # pixels across / pixels up
        width = x_hi - x_lo
        height = width / aspect
        if height < z_hi - z_lo:                               # widen to keep the motion in view
            height = z_hi - z_lo
            extra = height * aspect - width
            x_hi += extra
            width = x_hi - x_lo
        zc = 0.5 * (z_lo + z_hi)
        self.xlim = (x_lo, x_hi)
        self.zlim = (zc - 0.5 * height, zc + 0.5 * height)
        self.ax.set_xlim(*self.xlim)
        self.ax.set_ylim(*self.zlim)
        self.ax_tr.set_xlim(t0, t1 if t1 > t0 else t0 + 1e-9)

    def pixel_of(self, x, z):
        """Pixel (column, row from the top) where the flow panel draws the point (x, z) in metres."""
        pts = self.ax.transData.transform(np.column_stack([np.ravel(x), np.ravel(z)]))
        return pts[:, 0], self.H - pts[:, 1]

    def _static_text(self):
        f, fig, fs = self.film, self.fig, self.fs
        title = f.sc.title or Path(str(f.sc.out_dir())).name
        fig.text(0.075, 0.965, title, fontsize=fs * 1.25, color=LOOK["ink"], weight="bold", va="top")
        fig.text(0.075, 0.925, self._subtitle(0.9 * self.W / self.DPI, fs * 0.85),
                 fontsize=fs * 0.85, color=LOOK["muted"], va="top")
        fig.text(0.975, 0.012, run_caution(f.res), fontsize=fs * 0.7, color=LOOK["muted"], ha="right",
                 va="bottom")
        ax = self.ax
        for a in (ax, self.ax_tr):
            a.tick_params(labelsize=fs * 0.8, colors=LOOK["ink"], length=3)
            for sp in a.spines.values():
                sp.set_color(LOOK["rule"])
            a.spines["top"].set_visible(False)
            a.spines["right"].set_visible(False)
        ax.set_xlabel("x, still air (m)" if f.air else "x, downstream of the pitch axis (m)",
                      fontsize=fs * 0.85, color=LOOK["ink"], labelpad=1)
        ax.set_ylabel("z above the pitch axis (m)" if f.follow else "height z (m)",
                      fontsize=fs * 0.85, color=LOOK["ink"])
        self.path = None
        if f.air:   # the path of the pitch axis through the still air
            th = f.hist["t"]
            sel = (th >= f.t0) & (th <= f.t1)
            self.path_x, self.path_z = -f.U * (th[sel] - f.t0), f.hist["height_m"][sel]
            self.path, = ax.plot(self.path_x, self.path_z, color=LOOK["path"], lw=0.8, ls=(0, (4, 4)),
                                 animated=f.follow)
            if f.follow:          # heights relative to the airfoil: the path moves with it
                self.animated.append(self.path)

    def _subtitle(self, width_in, size):
        """What the flow panel shows, in the longest wording that fits the width."""
        f = self.film
        flow, view = f.opt.flow, f.opt.view
        cam = ("; the camera follows the airfoil", "; camera following") if f.follow else ("", "")
        for text in (f"{FLOW_STYLES[flow]}, {VIEWS[view]}{cam[0]}",
                     f"{FLOW_SHORT[flow]}, {VIEWS[view]}{cam[0]}",
                     f"{FLOW_SHORT[flow]}, {VIEWS_SHORT[view]}{cam[1]}"):
            if len(wrap_to_width(text, width_in, size)) == 1:
                return text
        return text

    def _banner(self):
        """The run's warnings (:func:`unsteady.outputs.notices.run_warnings`) in one quiet line."""
        f, fs = self.film, self.fs
        self.banner = None
        if not f.warnings:
            return
        size = fs * 0.78
        width = self.ax.get_position().x1 * self.W / self.DPI - 0.075 * self.W / self.DPI - 0.1
        more = len(f.warnings) - 1
        tail = f" (+{more} more: see summary.json and the report)" if more else ""
        first = wrap_to_width("caution: " + f.warnings[0], width - (0.3 * len(tail) * size / 72.0), size)
        text = first[0] + (" ..." if len(first) > 1 else "") + tail
        self.banner = self.fig.text(0.075, 0.5 * (self.flow_top + 0.905), text, fontsize=size,
                                    color=LOOK["warn"], va="center", ha="left",
                                    bbox=dict(boxstyle="round,pad=0.3", facecolor=LOOK["note_bg"],
                                              edgecolor="none"))

    # -- flow panel --------------------------------------------------------
    def _build_flow(self, field_mode):
        f, ax, fs = self.film, self.ax, self.fs
        o = f.opt
        self.img = None
        self.contours = None
        self.scat = None
        self.lev_dots = None
        self.legend = None
        self.gust_img = None
        self.quiv = None
        # gust band (under everything else)
        if f.gust_w is not None:
            self.g_x = np.linspace(*self.xlim, 241)
            zs = self.zlim
            if o.flow == "vortices":
                hm = 0.0 if f.follow else float(np.mean(f.snap["h"][f.snap_index]))
                band = (hm - 0.75 * f.c, hm + 0.75 * f.c)
            else:
                band = (zs[0], zs[0] + 0.07 * (zs[1] - zs[0]))
            self.g_band = band
            self.gust_img = ax.imshow(np.zeros((1, self.g_x.size)), extent=(self.xlim[0], self.xlim[1], *band),
                                      origin="lower", aspect="auto", cmap=GUST_MAP, alpha=0.55,
                                      norm=Normalize(-f.gust_max, f.gust_max), interpolation="bilinear",
                                      zorder=0.5, animated=True)
            self.q_x = np.linspace(*self.xlim, 25)[1:-1]
            zq = np.full_like(self.q_x, 0.5 * (band[0] + band[1]))
            half = 0.45 * (band[1] - band[0])
            self.g_follow = o.flow == "vortices" and not f.follow    # the band rides at the airfoil's height
            self.quiv = ax.quiver(self.q_x, zq - 0.0, np.zeros_like(self.q_x), np.zeros_like(self.q_x),
                                  angles="xy", scale_units="xy", scale=f.gust_max / half, pivot="middle",
                                  color=LOOK["ink"], alpha=0.55, width=0.0025, headwidth=3.5, headlength=4,
                                  zorder=0.6, animated=True)
            # the caption goes above a band drawn along the bottom; it is a sticker (pasted over the
            # moving artists every frame, on a paper box), so that the band never covers it
            zs = self.zlim
            y_cap = 0.012 if o.flow == "vortices" else (band[1] - zs[0]) / (zs[1] - zs[0]) + 0.012
            self.gust_caption = ax.text(
                0.005, y_cap, f"band and arrows: vertical gust (violet up, ochre down; peak {f.gust_max:.2g} m/s)",
                transform=ax.transAxes, fontsize=fs * 0.72, color=LOOK["muted"], va="bottom", zorder=6,
                bbox=dict(boxstyle="square,pad=0.15", facecolor=LOOK["paper"], edgecolor="none"))
            self.stickers.append(self.gust_caption)
            self.animated += [self.gust_img, self.quiv]
        # field
        if o.flow in ("vorticity", "speed", "streamlines"):
            ppx = self.W * ax.get_position().width
            if o.grid is not None:
                nx, nz = o.grid
            else:
                nx = int(max(24, ppx // 8))
                nz = int(max(12, round(nx * (self.zlim[1] - self.zlim[0]) / (self.xlim[1] - self.xlim[0]))))
            self.grid = fields.make_grid(self.xlim, self.zlim, nx, nz)
            self._field_limits()
        if field_mode:
            cmap = SPIN_MAP if o.flow == "vorticity" else SPEED_MAP
            self.img = ax.imshow(np.zeros(self.grid.shape), extent=self.grid.extent, origin="lower",
                                 aspect="auto", cmap=cmap, norm=self.field_norm, interpolation="bilinear",
                                 zorder=0.3, animated=True)
            self.animated.insert(0, self.img)
            cax = self.fig.add_axes([0.925, 0.365, 0.012, self.flow_top - 0.365])
            cb = self.fig.colorbar(self.img, cax=cax)
            cb.set_label(FLOW_STYLES[o.flow], fontsize=fs * 0.8, color=LOOK["ink"])
            cb.ax.tick_params(labelsize=fs * 0.75, colors=LOOK["ink"])
            cb.outline.set_edgecolor(LOOK["rule"])
        # wake vortices
        g_all = np.abs(f.snap["gamma"])
        self.g_lim = float(np.percentile(g_all, 99.0)) if g_all.size else 1.0
        self.g_lim = self.g_lim if self.g_lim > 0 else 1.0
        s = (self.H / 720.0) ** 0.8
        px = self.DPI / 72.0                     # pixels per point
        if o.flow != "vorticity":
            alpha = 0.9 if o.flow == "vortices" else 0.5
            # dot diameters 1.6 to 7.5 points at 720 lines
            self.scat = WakeDots(ax, self.g_lim, VORTEX_MAP, 0.8 * s * px, 3.75 * s * px, alpha=alpha)
            self.animated.append(self.scat)
            if f.lev_onset() is not None:
                # leading-edge vortices: diamonds of the same colours, drawn over the trailing edge's dots
                self.lev_dots = WakeDots(ax, self.g_lim, VORTEX_MAP, 0.8 * s * px, 3.75 * s * px,
                                         alpha=alpha, shape="diamond")
                self.animated.append(self.lev_dots)
            if o.flow == "vortices":
                handles = [Line2D([], [], ls="", marker="o", color=LOOK["ccw"], label="counter-clockwise"),
                           Line2D([], [], ls="", marker="o", color=LOOK["cw"], label="clockwise")]
                if self.lev_dots is not None:
                    handles.append(Line2D([], [], ls="", marker="D", color=LOOK["muted"],
                                          label="from the leading edge"))
                leg = ax.legend(handles=handles, loc="lower right", fontsize=fs * 0.75, frameon=False,
                                handletextpad=0.2, ncol=len(handles), columnspacing=1.0)
                self.legend = leg
                self.stickers.append(leg)     # pasted over the dots, not drawn under them
        # airfoil
        self.foil = Polygon(np.zeros((3, 2)), closed=True, facecolor=LOOK["airfoil"],
                            edgecolor=LOOK["airfoil_edge"], lw=0.6, zorder=3, animated=True)
        ax.add_patch(self.foil)
        self.animated.append(self.foil)
        self.more_foils = []                  # the further elements of [[airfoil]]
        for _ in f.sc.data["airfoil"].get("_more", ()):
            p = Polygon(np.zeros((3, 2)), closed=True, facecolor=LOOK["airfoil"],
                        edgecolor=LOOK["airfoil_edge"], lw=0.6, zorder=3, animated=True)
            ax.add_patch(p)
            self.animated.append(p)
            self.more_foils.append(p)
        # the ground ([ground]): fixed, or moving with the heights when the camera follows
        self.ground_z = fields.ground_height(f.sc)
        self.ground = None
        if self.ground_z is not None:
            self.ground = ax.axhline(self.ground_z, color=LOOK["ink"], lw=1.6, zorder=4, animated=f.follow)
            if f.follow:
                self.animated.append(self.ground)
        self.cp_line = None
        if f.opt.surface_pressure:
            self.cp_line, = ax.plot([], [], color=LOOK["ccw"], lw=1.3, animated=True, zorder=4)
            self.animated.append(self.cp_line)
            # above the gust band's caption when there is one (both sit at the bottom left)
            gust_cap = getattr(self, "gust_caption", None)
            y_cp = 0.02 if gust_cap is None else gust_cap.get_position()[1] + 0.045
            ax.text(0.01, y_cp, f"line round the airfoil: surface pressure, {PRESSURE_OFFSET:g} chord off the "
                    "outline per unit of -Cp (outward: suction; inviscid)", transform=ax.transAxes,
                    fontsize=self.fs * 0.7, color=LOOK["ccw"], ha="left", va="bottom")
        self._build_clock()

    def _build_clock(self):
        """The clock line: its words a sticker drawn once, its numbers (monospace, fixed widths) per frame.

        Rendering glyphs is a film's second largest cost; the numbers are a
        quarter of the line's glyphs.
        """
        f, ax, fs = self.film, self.ax, self.fs
        snaps = f.snap
        idx = f.snap_index
        fields_ = [("t = ", "{:.3f}", [f.t1]), (" s   ", "{:.1f}", [f.U * f.t1 / f.c]),
                   (" chords flown   pitch ", "{:+.1f}", np.degrees(snaps["alpha"][idx])), (" deg", None, None)]
        if f.heaves:
            fields_[-1:] = [(" deg   height ", "{:+.3f}", snaps["h"][idx]), (" m", None, None)]
        if f.gust_w is not None:
            fields_[-1:] = [(fields_[-1][0] + "   gust at leading edge ", "{:+.2f}", [f.gust_max, -f.gust_max]),
                            (" m/s", None, None)]
        flap = f.hist.get("flap_deg")
        self.flap_moves = flap is not None and bool(np.ptp(flap) > 0)
        if self.flap_moves:
            fields_[-1:] = [(fields_[-1][0] + "   flap ", "{:+.1f}", [np.max(flap), np.min(flap)]),
                            (" deg", None, None)]
        self.clock_fields = [(pre, fmt, max(len(fmt.format(float(v))) for v in vals) if fmt else 0)
                             for pre, fmt, vals in fields_]
        words = "".join(pre + " " * w for pre, _fmt, w in self.clock_fields)
        kw = dict(transform=ax.transAxes, fontsize=fs, color=LOOK["ink"], va="top", ha="left", zorder=5,
                  family="monospace")
        self.clock_words = ax.text(0.012, 0.985, words, bbox=dict(boxstyle="square,pad=0.25", alpha=0.8,
                                                                facecolor=LOOK["paper"], edgecolor="none"), **kw)
        self.stickers.append(self.clock_words)
        self.clock = ax.text(0.012, 0.985, "", animated=True, **kw)
        self.overlays = [self.clock]
        self.clock_line = ""

    def _clock_numbers(self, values):
        """(numbers-only text, whole line) for the clock's values, in the order of its fields."""
        nums, line = [], []
        for (pre, fmt, w), v in zip(self.clock_fields, list(values) + [None]):
            text = fmt.format(v).rjust(w) if fmt else ""
            nums.append(" " * len(pre) + text)
            line.append(pre + text)
        return "".join(nums), "".join(line)

    def _field(self, i):
        """The field of frame i on the grid (vorticity, speed or stream function)."""
        f = self.film
        t = f.frame_state(i)[0]
        src = f.sources(i)
        if f.opt.flow == "vorticity":
            # the wake's vorticity only: the bound vortices are the airfoil itself (drawn as such);
            # smoothed over a coarse grid they would spread across and beyond it
            sigma = max(1.5 * max(self.grid.dx, self.grid.dz), f.r_wake)
            return fields.vorticity_field(self.grid, src[:1], sigma=sigma)
        U = 0.0 if f.air else f.U
        X, Z = np.meshgrid(self.grid.x, self.grid.z)
        if f.opt.flow == "speed":
            gust = None
            if f.gust_field is not None:
                sh, zsh = f.x_shift(t), f.z_shift(i)
                gust = (lambda x, z, tt: f.gust_field.velocity(x - sh, z - zsh, tt))
            u, w = fields.velocity_field(X, Z, src, freestream=(U, 0.0), gust=gust, t=t)
            return fields.speed(u, w)
        return fields.stream_function(X, Z, src, freestream=(U, 0.0))

    def _field_limits(self):
        """Colour limits (or contour levels) fixed for the film, from a few sample frames."""
        f = self.film
        n = f.n_frames
        picks = sorted(set(int(round(v)) for v in np.linspace(0, n - 1, min(n, 5))))
        vals = [self._field(i) for i in picks]
        if f.opt.flow == "vorticity":
            m = max(float(np.percentile(np.abs(v), 99.7)) for v in vals) or 1.0
            self.field_norm = Normalize(-m, m)
        elif f.opt.flow == "speed":
            hi = max(float(np.percentile(v, 99.5)) for v in vals)
            lo = 0.0 if f.air else min(float(np.percentile(v, 0.5)) for v in vals)
            self.field_norm = Normalize(lo, hi if hi > lo else lo + 1.0)
        else:
            if f.air:
                lo = min(float(np.percentile(v, 2)) for v in vals)
                hi = max(float(np.percentile(v, 98)) for v in vals)
                self.levels = np.linspace(lo, hi, 31) if hi > lo else np.linspace(lo - 1, lo + 1, 31)
            else:
                dz = (self.zlim[1] - self.zlim[0]) / 28.0
                psi_lo = min(float(v.min()) for v in vals)
                psi_hi = max(float(v.max()) for v in vals)
                step = f.U * dz
                self.levels = np.arange(math.floor(psi_lo / step), math.ceil(psi_hi / step) + 1) * step

    # -- trace panel -------------------------------------------------------
    def _build_trace(self):
        f, ax, fs = self.film, self.ax_tr, self.fs
        th = f.hist["t"]
        y = f.hist[f.trace_col]
        sel = (th >= f.t0 - 1e-12) & (th <= f.t1 + 1e-12)
        self.tr_t, self.tr_y = th[sel], y[sel]
        ok = np.isfinite(self.tr_y)
        lo, hi = (float(self.tr_y[ok].min()), float(self.tr_y[ok].max())) if ok.any() else (0.0, 1.0)
        if f.trace_name == "n":
            lo, hi = min(lo, 1.0), max(hi, 1.0)
            ax.axhline(1.0, color=LOOK["rule"], lw=0.8, ls=(0, (3, 3)))
        pad = 0.1 * (hi - lo) if hi > lo else max(0.1 * abs(hi), 0.05)
        ax.set_ylim(lo - pad, hi + pad)
        ax.set_xlabel("time t (s)", fontsize=fs * 0.85, color=LOOK["ink"], labelpad=1)
        ax.set_ylabel(f.trace_label, fontsize=fs * 0.8, color=LOOK["ink"])
        ax.grid(color=LOOK["rule"], lw=0.5, alpha=0.8)
        onset = f.lev_onset()
        if onset is not None and f.t0 <= onset <= f.t1:
            # where the leading edge first sheds: drawn once, with the static background
            ax.axvline(onset, color=LOOK["lev"], lw=1.0, ls=(0, (4, 2)))
            ax.annotate(f"leading edge sheds ({onset:.4g} s)", xy=(onset, 1.0), xycoords=("data", "axes fraction"),
                        xytext=(3, -2), textcoords="offset points", ha="left", va="top", fontsize=fs * 0.7,
                        color=LOOK["lev"], annotation_clip=False)
        self.tr_line, = ax.plot([], [], color=LOOK["trace"], lw=1.6, animated=True)
        self.tr_dot, = ax.plot([], [], "o", color=LOOK["marker"], ms=5.5 * self.H / 720.0, clip_on=False, animated=True)
        self.animated += [self.tr_line, self.tr_dot]
        # the extreme of the trace, marked once the film reaches it
        self.peak = f.trace_peak()
        self.pk_mark = self.pk_text = None
        if self.peak is not None:
            tp, vp, word = self.peak
            self.pk_mark, = ax.plot([tp], [vp], "o", ms=8.0 * self.H / 720.0, mfc="none", mec=LOOK["second"],
                                    mew=1.4, clip_on=False, animated=True, visible=False)
            right = tp > f.t0 + 0.7 * (f.t1 - f.t0)
            self.pk_text = ax.annotate(f"{word} {f.trace_name} = {vp:.4g} at t = {tp:.4g} s", xy=(tp, vp),
                                       xytext=(-8 if right else 8, 3 if word == "peak" else -3),
                                       textcoords="offset points", ha="right" if right else "left",
                                       va="bottom" if word == "peak" else "top", fontsize=fs * 0.75,
                                       color=LOOK["second"], animated=True, visible=False,
                                       annotation_clip=False)
            self.animated += [self.pk_mark, self.pk_text]

    # -- one frame ---------------------------------------------------------
    def update(self, i):
        """Set every moving artist to frame i."""
        f = self.film
        t, k, alpha, h = f.frame_state(i)
        sh = f.x_shift(t)
        hv = h + f.z_shift(i)              # the airfoil's height in the picture
        ax = self.ax
        if self.img is not None:
            self.img.set_data(self._field(i))
        if f.opt.flow == "streamlines":
            if self.contours is not None:
                self.contours.remove()
            psi = self._field(i)
            self.contours = ax.contour(self.grid.x, self.grid.z, psi, levels=self.levels,
                                       colors=LOOK["trace"], linewidths=0.7, linestyles="solid",
                                       alpha=0.8, zorder=1)
            self.contours.set_animated(True)
        if self.gust_img is not None:
            w = f.gust_w(self.g_x - sh, t)
            self.gust_img.set_data(w[None, :])
            wq = np.asarray(f.gust_w(self.q_x - sh, t), dtype=float)
            # no arrow where the gust is (all but) zero: a zero-length arrow would draw as a dot
            wq = np.where(np.abs(wq) > 0.01 * f.gust_max, wq, np.nan)
            self.quiv.set_UVC(np.zeros_like(self.q_x), wq)
            if self.g_follow:
                lo, hi = hv - 0.75 * f.c, hv + 0.75 * f.c
                self.gust_img.set_extent((self.xlim[0], self.xlim[1], lo, hi))
                self.quiv.set_offsets(np.column_stack([self.q_x, np.full_like(self.q_x, hv)]))
        if self.path is not None and f.follow:
            self.path.set_ydata(self.path_z - h)
        if self.scat is not None:
            x, z, g = f.wake(i)
            if self.lev_dots is not None:
                lev = f.lev(i)
                self.scat.set_data(x[~lev], z[~lev], g[~lev])
                self.lev_dots.set_data(x[lev], z[lev], g[lev])
            else:
                self.scat.set_data(x, z, g)
        if self.ground is not None and f.follow:
            self.ground.set_ydata([self.ground_z + f.z_shift(i)] * 2)
        xo, zo = fields.airfoil_outline(f.section, f.c, f.pivot, alpha, hv, n=61, x_shift=sh,
                                        flap=fields.flap_at(f.sc, f.hist, t))
        self.foil.set_xy(np.column_stack([xo, zo]))
        if self.more_foils:
            for p, (xe, ze) in zip(self.more_foils, fields.element_outlines(
                    f.sc, alpha, hv, n=61, x_shift=sh, more_flaps=fields.element_flaps_at(f.sc, f.hist, t))[1:]):
                p.set_xy(np.column_stack([xe, ze]))
        if self.cp_line is not None:
            self.cp_line.set_data(*self._pressure_line(t, alpha, hv, sh))
        values = [t, f.U * t / f.c, math.degrees(alpha)]
        if f.heaves:
            values.append(h)
        if f.gust_w is not None:
            values.append(float(f.gust_w(np.array([-f.pivot * f.c]), t)[0]))
        if self.flap_moves:
            values.append(float(np.interp(t, f.hist["t"], f.hist["flap_deg"])))
        nums, self.clock_line = self._clock_numbers(values)
        self.clock.set_text(nums)
        j = int(np.searchsorted(self.tr_t, t + 1e-12))
        self.tr_line.set_data(self.tr_t[:j], self.tr_y[:j])
        if j > 0:
            self.tr_dot.set_data([self.tr_t[j - 1]], [self.tr_y[j - 1]])
        else:
            self.tr_dot.set_data([], [])
        if self.peak is not None:
            reached = t >= self.peak[0] - 1e-12
            self.pk_mark.set_visible(reached)
            self.pk_text.set_visible(reached)

    def _pressure_line(self, t, alpha, hv, sh):
        """The surface-pressure line at time t: each surface point moved along its outward normal by
        -Cp * PRESSURE_OFFSET chords (a closed loop, in the picture's frame)."""
        f = self.film
        row = int(np.argmin(np.abs(np.asarray(f.hist["t"])[:len(f.snap["cp"])] - t)))
        cp = np.asarray(f.snap["cp"][row], dtype=float)
        xi = (np.asarray(f.snap["x_surface"], dtype=float) - f.pivot) * f.c
        zeta = np.asarray(f.snap["z_surface"], dtype=float) * f.c
        k = int(f.snap["cp_element"]) if "cp_element" in f.snap else 1
        if k > 1:                               # a further element of [[airfoil]]: placed as the solver places it
            from ..inputs.elements import place_points
            el = f.sc.data["airfoil"]["_more"][k - 2]
            x, zeta = place_points(xi / f.c + f.pivot, zeta / f.c, el["chord"], el["incidence"], el["position"])
            xi = x - f.pivot * f.c
        tx, tz = np.roll(xi, -1) - np.roll(xi, 1), np.roll(zeta, -1) - np.roll(zeta, 1)
        norm = np.hypot(tx, tz)
        nx, nz = -tz / norm, tx / norm          # outward: the points run clockwise
        d = -cp * PRESSURE_OFFSET * f.c
        px, pz = xi + d * nx, zeta + d * nz
        ca, sa = math.cos(alpha), math.sin(alpha)
        x, z = px * ca + pz * sa + sh, hv - px * sa + pz * ca
        return np.append(x, x[0]), np.append(z, z[0])

    def draw(self, i):
        """Draw frame i on the canvas: the background, the moving artists, the stickers."""
        self.update(i)
        self.canvas.restore_region(self.bg)
        for a in self.animated:
            a.axes.draw_artist(a)
        if self.contours is not None:
            self.ax.draw_artist(self.contours)
            self.ax.draw_artist(self.foil)
        for region in self.sticker_regions:
            self.canvas.restore_region(region)
        for a in self.overlays:
            a.axes.draw_artist(a)

    def frame_rgba(self, i):
        """Frame i as the canvas's own (H, W, 4) RGBA buffer: no copy, valid until the next frame is drawn."""
        self.draw(i)
        return np.asarray(self.canvas.buffer_rgba())

    def frame(self, i):
        """Frame i as an (H, W, 3) uint8 array (a new array)."""
        buf = self.frame_rgba(i)
        return np.ascontiguousarray(buf[:self.H, :self.W, :3])


# ---------------------------------------------------------------------------
# writers: frames go to ffmpeg one at a time
class _Mp4Writer:
    def __init__(self, path, size, fps):
        import imageio_ffmpeg
        self.gen = imageio_ffmpeg.write_frames(
            str(path), size, fps=fps, codec="libx264", pix_fmt_in="rgba", pix_fmt_out="yuv420p",
            macro_block_size=2, ffmpeg_log_level="error", quality=None,
            output_params=["-crf", "20", "-preset", "veryfast", "-movflags", "+faststart"])
        self.gen.send(None)

    def add(self, rgba):
        self.gen.send(rgba.data)       # the (H, W, 4) buffer as it is: ffmpeg converts

    def close(self):
        self.gen.close()


class _GifWriter:
    """A looping GIF through ffmpeg with one palette for the whole film (chosen from sample frames)."""

    def __init__(self, path, size, fps, samples):
        import imageio_ffmpeg
        from PIL import Image
        self.tmpdir = tempfile.mkdtemp(prefix=".unsteady-gif-")
        mosaic = np.concatenate(samples, axis=0)
        q = Image.fromarray(mosaic).quantize(colors=256, method=Image.Quantize.MEDIANCUT)
        pal = np.array(q.getpalette()[:768], dtype=np.uint8)
        pal = np.concatenate([pal, np.zeros(768 - pal.size, np.uint8)]).reshape(16, 16, 3)
        pal_path = os.path.join(self.tmpdir, "palette.png")
        Image.fromarray(pal).save(pal_path)
        w, h = size
        cmd = [imageio_ffmpeg.get_ffmpeg_exe(), "-hide_banner", "-loglevel", "error", "-y",
               "-f", "rawvideo", "-pix_fmt", "rgba", "-s", f"{w}x{h}", "-r", f"{fps}", "-i", "-",
               "-i", pal_path, "-lavfi", "[0:v][1:v]paletteuse=dither=bayer:bayer_scale=4:diff_mode=rectangle",
               "-loop", "0", "-f", "gif", str(path)]
        self.proc = subprocess.Popen(cmd, stdin=subprocess.PIPE, stderr=subprocess.PIPE)

    def add(self, rgba):
        self.proc.stdin.write(rgba.data)

    def close(self):
        try:
            self.proc.stdin.close()
            err = self.proc.stderr.read().decode(errors="replace")
            if self.proc.wait() != 0:
                raise RuntimeError(f"ffmpeg could not write the GIF: {err.strip()[-300:]}")
        finally:
            shutil.rmtree(self.tmpdir, ignore_errors=True)

    def abort(self):
        try:
            self.proc.kill()
            self.proc.wait()
        finally:
            shutil.rmtree(self.tmpdir, ignore_errors=True)


def check_out_path(out, label="--out"):
    """The output path's folder must exist and its suffix be .mp4 or .gif (else UsageError)."""
    out = Path(out)
    if out.suffix.lower() not in FORMATS:
        raise UsageError(f"error: {out}: {label}: unknown film format {out.suffix or '(none)'!r}; "
                         f"allowed: {', '.join(FORMATS)}")
    if not out.parent.resolve().is_dir():
        raise UsageError(f"error: {out}: {label}: folder {out.parent} does not exist; create it first")
    if out.is_dir():
        raise UsageError(f"error: {out}: {label}: is a folder; give a file name ending in .mp4 or .gif")
    return out


def write_film(result, out, options=FilmOptions(), *, progress=False, label="run"):
    """Render a run into an MP4 or GIF at ``out`` (atomic: a temporary name, then rename).

    Parameters
    ----------
    result : Result
    out : path ending in .mp4 or .gif
    options : FilmOptions
    progress : bool
        Progress bar on stderr (drawn only on a terminal).

    Returns
    -------
    Film
        What was drawn (frame times, view, limits).
    """
    out = check_out_path(out)
    if out.suffix.lower() == ".mp4" and (options.width % 2 or options.height % 2):
        raise UsageError(f"error: {out}: --size: {options.width}x{options.height} has an odd side; "
                         "MP4 (H.264, yuv420p) needs an even width and height")
    film = Film(result, options, label=label)
    renderer = FilmRenderer(film)
    bar = None
    if progress:
        from ..simulation.observers import ProgressBar
        bar = ProgressBar(film.n_frames, label="film")
    try:
        with atomic_path(out) as tmp:
            _encode(renderer, tmp, bar)
            append_mark(tmp)        # proves the film ours (core.files.check_out_file)
    finally:
        if bar is not None:
            bar.close()
    return film


def _encode(renderer, path, bar=None):
    """Stream every frame of ``renderer`` to an MP4 or GIF at ``path``; ffmpeg is stopped on any error."""
    film, o = renderer.film, renderer.film.opt
    size = (o.width, o.height)
    if path.suffix.lower() == ".gif":
        n = film.n_frames
        picks = sorted(set(int(round(v)) for v in np.linspace(0, n - 1, min(n, 4))))
        samples = [renderer.frame(i)[::2, ::2] for i in picks]
        writer = _GifWriter(path, size, o.frame_rate, samples)
    else:
        writer = _Mp4Writer(path, size, o.frame_rate)
    try:
        for i in range(film.n_frames):
            writer.add(renderer.frame_rgba(i))
            if bar is not None:
                bar.update(i + 1, f"frame {i + 1}/{film.n_frames}")
    except BaseException:
        try:
            (writer.abort if hasattr(writer, "abort") else writer.close)()
        except Exception:
            pass
        raise
    writer.close()
