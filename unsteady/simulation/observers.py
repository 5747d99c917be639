"""Observers of the time loop: history recorder, wake snapshots, progress bar.

The solver calls ``on_start(solver)``, ``on_step(state)`` after every step
and ``on_end(solver)``; none of them reaches back into the solver.  A new
output is one more small class here, passed to :func:`unsteady.simulate`.
"""

from __future__ import annotations

import math
import sys
import time

import numpy as np

# history columns every run writes, in order (names of the public interface)
BASE_COLUMNS = ("t", "chords", "pitch_deg", "height_m", "cl", "cd", "cm")
EXTRA_COLUMNS = ("cm_pivot", "cl_impulse", "cd_impulse", "cm_impulse",
                 "pitch_rate_deg_s", "height_rate_m_s", "gamma_bound_m2_s", "gamma_wake_m2_s", "wake_vortices")


class HistoryRecorder:
    """One row per step into preallocated arrays, plus the pressure jump per element."""

    def __init__(self, steps, elements, speed, chord, columns=()):
        self.U = speed
        self.c = chord
        self.names = list(BASE_COLUMNS) + list(EXTRA_COLUMNS) + [c for c in columns]
        self.data = {k: np.full(steps + 1, np.nan) for k in self.names}
        self.dcp = np.full((steps + 1, elements), np.nan, dtype=np.float32)
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
        self.dcp[i] = s.dcp
        self.count = i + 1

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
        self.xb.append(np.asarray(s.x_body, np.float32).copy())
        self.zb.append(np.asarray(s.z_body, np.float32).copy())
        self.gb.append(np.asarray(s.gamma_bound, np.float32).copy())

    def arrays(self):
        cat = (lambda a: np.concatenate(a) if a else np.zeros(0, np.float32))
        return {"t": np.array(self.t), "alpha": np.array(self.alpha), "h": np.array(self.h),
                "offsets": np.array(self.offsets, dtype=np.int64),
                "x": cat(self.x), "z": cat(self.z), "gamma": cat(self.g),
                "x_body": np.array(self.xb, np.float32), "z_body": np.array(self.zb, np.float32),
                "gamma_body": np.array(self.gb, np.float32)}


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

    def on_end(self, solver):
        self.close()
