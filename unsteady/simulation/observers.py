"""Observers of the time loop: history recorder, wake snapshots, gust columns, progress bar.

An observer has ``on_step(state)`` and any of ``on_start(model)``,
``on_end(model)``, ``finish(history)`` (may add columns) and
``summary(history)`` (a dict merged into the summary); the runner
(:func:`unsteady.simulation.runner.simulate`) calls them for every model
(see :class:`unsteady.simulation.models.Model`).  The runner's own observers
also take a whole block of rows at once, ``on_rows(rows)``, from a model that
computes its rows in one pass (see :class:`Rows`); none of them reaches back
into the model.  A new output is one more small class here, passed to
:func:`unsteady.simulate`.
"""

from __future__ import annotations

import math
import sys
import time
from dataclasses import dataclass

import numpy as np

from ..inputs.gusts import gust_list

# history columns every run writes, in order (names of the public interface)
BASE_COLUMNS = ("t", "chords", "pitch_deg", "height_m", "cl", "cd", "cm")
EXTRA_COLUMNS = ("cm_pivot", "cl_impulse", "cd_impulse", "cm_impulse",
                 "pitch_rate_deg_s", "height_rate_m_s", "gamma_bound_m2_s", "gamma_wake_m2_s", "wake_vortices")


@dataclass
class Rows:
    """A block of rows 0 .. N-1 computed in one pass (what ``on_rows`` receives).

    Attributes
    ----------
    t, alpha, alpha_dot, h, h_dot : numpy.ndarray
        Time (s), pitch (rad, nose-up) and its rate (rad/s), height of the
        pitch axis (m, up) and its rate (m/s), one value per row.
    loads : dict of str -> numpy.ndarray
        History columns of the loads, by their public names (``cl``, ``cd``,
        ``cm``, ``cm_pivot``, ..., ``wake_vortices`` and the model's own).
    """

    t: np.ndarray
    alpha: np.ndarray
    alpha_dot: np.ndarray
    h: np.ndarray
    h_dot: np.ndarray
    loads: dict


class HistoryRecorder:
    """One row per step into preallocated arrays (``steps + 1`` rows, NaN until recorded)."""

    def __init__(self, steps, speed, chord, columns=()):
        self.U = speed
        self.c = chord
        self.names = list(BASE_COLUMNS) + list(EXTRA_COLUMNS) + [c for c in columns]
        self.data = {k: np.full(steps + 1, np.nan) for k in self.names}
        self.count = 0

    def on_step(self, s):
        i = s.n
        d = self.data
        d["t"][i] = s.t
        d["chords"][i] = self.U * s.t / self.c
        d["pitch_deg"][i] = math.degrees(s.alpha)
        d["height_m"][i] = s.h
        d["pitch_rate_deg_s"][i] = math.degrees(s.alpha_dot)
        d["height_rate_m_s"][i] = s.h_dot
        d["wake_vortices"][i] = s.x_wake.shape[0]
        for k, v in s.loads.items():
            if k in d:
                d[k][i] = v
        for k, v in s.extra.items():
            if k in d:
                d[k][i] = v
        self.count = i + 1

    def on_rows(self, rows):
        """Record a whole :class:`Rows` block (rows 0 .. N-1) at once."""
        d = self.data
        n = rows.t.shape[0]
        d["t"][:n] = rows.t
        d["chords"][:n] = self.U * rows.t / self.c
        d["pitch_deg"][:n] = np.degrees(rows.alpha)
        d["height_m"][:n] = rows.h
        d["pitch_rate_deg_s"][:n] = np.degrees(rows.alpha_dot)
        d["height_rate_m_s"][:n] = rows.h_dot
        for k, v in rows.loads.items():
            if k in d:
                d[k][:n] = v
        self.count = n

    def history(self):
        """The rows recorded so far, keyed by column name."""
        return {k: v[:self.count].copy() for k, v in self.data.items()}


class SnapshotRecorder:
    """Wake and body positions every ``every`` steps (and at the last step)."""

    def __init__(self, every, last_step):
        self.every = max(1, int(every))
        self.last = last_step
        self.t, self.alpha, self.h, self.offsets = [], [], [], [0]
        self.x, self.z, self.g = [], [], []
        self.x_te = []
        self.xb, self.zb, self.gb = [], [], []  # bound vortices (for flow pictures)
        self.bodyless = False                    # rows from a model without body points
        self.lev = []                            # per wake vortex: shed by a leading edge (1) or not

    def on_step(self, s):
        if s.n % self.every and s.n != self.last:
            return
        self.t.append(s.t)
        self.alpha.append(s.alpha)
        self.h.append(s.h)
        self.x.append(s.x_wake.astype(np.float32))
        self.z.append(s.z_wake.astype(np.float32))
        self.g.append(s.gamma_wake.astype(np.float32))
        self.offsets.append(self.offsets[-1] + s.x_wake.shape[0])
        le_sites = s.extra.get("leading_edge_sites") if s.extra else None
        if le_sites:
            self.lev.append(np.isin(s.wake_site, le_sites).astype(np.uint8))
        self.xb.append(np.asarray(s.x_body, np.float32).copy())
        self.zb.append(np.asarray(s.z_body, np.float32).copy())
        self.gb.append(np.asarray(s.gamma_bound, np.float32).copy())

    def on_rows(self, rows):
        """Snapshots of a :class:`Rows` block from a model with no wake or body points."""
        n = rows.t.shape[0]
        idx = np.arange(0, n, self.every)
        if self.last < n and (idx.size == 0 or idx[-1] != self.last):
            idx = np.append(idx, self.last)
        self.t.extend(rows.t[idx].tolist())
        self.alpha.extend(rows.alpha[idx].tolist())
        self.h.extend(rows.h[idx].tolist())
        self.offsets.extend([self.offsets[-1]] * idx.size)
        self.bodyless = True

    def arrays(self):
        cat = (lambda a: np.concatenate(a) if a else np.zeros(0, np.float32))
        out = {"t": np.array(self.t), "alpha": np.array(self.alpha), "h": np.array(self.h),
               "offsets": np.array(self.offsets, dtype=np.int64),
               "x": cat(self.x), "z": cat(self.z), "gamma": cat(self.g)}
        if self.lev:
            out["lev"] = np.concatenate(self.lev)        # 1: a leading-edge vortex (same order as x)
        if not self.bodyless:
            out.update(x_body=np.array(self.xb, np.float32), z_body=np.array(self.zb, np.float32),
                       gamma_body=np.array(self.gb, np.float32))
        return out


class GustObserver:
    """Records the gust at the leading edge (columns ``w_gust``, ``u_gust``); its summary adds the peak effective angle.

    ``alpha_eff_max_deg`` is the largest magnitude of the history column
    ``alpha_eff_deg``: both are :func:`unsteady.inputs.gusts.effective_angle_history`
    (the three-quarter-chord angle of thin-airfoil theory).

    Parameters
    ----------
    gust : GustField
        ``velocity(x, z, t) -> (u, w)``, m/s.
    sc : Scenario
        With ``[gust]``.
    """

    columns = ["w_gust", "u_gust"]

    def __init__(self, gust, sc):
        self.gust = gust
        self.chord = sc.chord
        self.pivot = sc.pivot
        self.U = sc.speed
        self.profiles = [d["profile"] for d in gust_list(sc.data["gust"])]
        self.rows = {k: [] for k in self.columns}

    def on_step(self, s):
        x_le = -self.pivot * self.chord * math.cos(s.alpha)
        u, w = self.gust.velocity(np.array([x_le]), np.array([s.h]), s.t)
        self.rows["w_gust"].append(float(w[0]))
        self.rows["u_gust"].append(float(u[0]))

    def on_rows(self, rows):
        """:meth:`on_step` for a whole :class:`Rows` block."""
        t = np.asarray(rows.t, dtype=float)
        alpha = np.asarray(rows.alpha, dtype=float)
        x_le = -self.pivot * self.chord * np.cos(alpha)
        u, w = self.gust.velocity(x_le, np.broadcast_to(rows.h, t.shape), t)  # xi is elementwise in t
        self.rows["w_gust"].extend(np.asarray(w, dtype=float).tolist())
        self.rows["u_gust"].extend(np.asarray(u, dtype=float).tolist())

    def finish(self, history):
        """Fill the columns of the recorded rows."""
        n = len(history["t"])
        for k, v in self.rows.items():
            history[k] = np.asarray(v[:n], dtype=float)

    def summary(self, history):
        """Profiles and extremes of the gust met at the leading edge, and of the effective angle."""
        out = {"gust_profiles": self.profiles}
        for k in ("w_gust", "u_gust"):
            v = history.get(k)
            if v is not None and len(v):
                out[f"{k}_max"] = float(np.nanmax(v))
                out[f"{k}_min"] = float(np.nanmin(v))
        if len(history["t"]):
            from ..inputs.gusts import effective_angle_history
            a = np.degrees(effective_angle_history(history, self.U, self.chord, self.pivot, self.gust))
            out["alpha_eff_max_deg"] = float(np.nanmax(np.abs(a)))
        return out


class ProgressBar:
    """A one-line bar on stderr, only when stderr is a terminal."""

    def __init__(self, total, label="run", stream=None, enabled=None):
        self.stream = stream or sys.stderr
        self.total = max(1, total)
        self.label = label
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.t0 = time.perf_counter()
        self.last = 0.0

    def update(self, done, note=""):
        if not self.enabled:
            return
        now = time.perf_counter()
        if done < self.total and now - self.last < 0.1:
            return
        self.last = now
        frac = done / self.total
        el = now - self.t0
        left = f"{el / frac - el:5.1f} s" if frac > 0 else "  ..."
        bar = "#" * int(30 * frac)
        self.stream.write(f"\r{self.label} [{bar:<30}] {100 * frac:5.1f}%  {note}  left {left} ")
        self.stream.flush()

    def close(self):
        if self.enabled:
            self.stream.write("\n")
            self.stream.flush()


class StepProgress(ProgressBar):
    """ProgressBar as a time-loop observer."""

    def on_step(self, s):
        self.update(s.n, f"step {s.n}/{self.total}  t = {s.t:.4g} s")

    def on_rows(self, rows):
        """A block of rows: the bar jumps to its last row."""
        n = rows.t.shape[0] - 1
        if n >= 0:
            self.update(n, f"step {n}/{self.total}  t = {float(rows.t[-1]):.4g} s")

    def on_end(self, model):
        self.close()
