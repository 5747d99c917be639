"""The headline numbers of a history (summary.json).

Headline peaks describe the flow, never a numerical transient.  Where a motion
law changes instantly (a ``step``, a ``ramp`` with sharp corners, the points of
a linearly interpolated ``table``), the acceleration is a delta function and
the apparent-mass force an impulse: its peak grows as 1/dt while its time
integral stays finite.  The rows within a few steps of such an instant are
therefore left out of the peaks, and the impulse is reported on its own, as
the time integrals of cl and cm above the level the flow has on either side
(``impulses``), which converge as the step shrinks.
"""

from __future__ import annotations

import numpy as np

from ..core.cautions import MODEL_CAUTION
from ..core.version import __version__

#: Rows with T - 0.5 dt < t < T + max(2.5 dt, 0.1 c / U) of an instantaneous change at T are
#: left out of the peaks: the vortex model's pressure route carries the impulse on the first
#: two rows at or after T (a second-order backward difference of the potential jump), and the
#: circulatory response right after a jump of the motion is resolved only as the step
#: shrinks, so a fixed tenth of a chord of travel is left out too (the peaks then converge).
IMPULSE_WINDOW = (0.5, 2.5, 0.1)


def impulse_mask(t, times, dt, chord_time=0.0):
    """True on the rows inside the window of any of ``times`` (see :data:`IMPULSE_WINDOW`);
    ``chord_time`` = c / U, s."""
    t = np.asarray(t, dtype=float)
    out = np.zeros(t.shape, dtype=bool)
    lo, hi, chords = IMPULSE_WINDOW
    for T in times:
        out |= (t > T - lo * dt) & (t < T + max(hi * dt, chords * chord_time))
    return out


def apparent_mass_impulses(history, times, dt):
    """Per instant T: ``t_s``, and the integrals (s) of cl and cm above the straight line
    joining the rows on either side of the few steps that carry the impulse itself
    (``cl_impulse_s``, ``cm_impulse_s``)."""
    t = np.asarray(history["t"], dtype=float)
    out = []
    for T in times:
        idx = np.nonzero(impulse_mask(t, [T], dt))[0]
        if idx.size == 0 or idx[0] == 0 or idx[-1] + 1 >= t.size:
            continue
        a, b = idx[0] - 1, idx[-1] + 1
        row = {"t_s": float(T)}
        for k in ("cl", "cm"):
            y = np.asarray(history[k], dtype=float)
            base = np.interp(t[idx], [t[a], t[b]], [y[a], y[b]])
            row[f"{k}_impulse_s"] = float(np.sum(y[idx] - base) * dt)
        out.append(row)
    return out


def _peaks(s, name, y, t, keep):
    """``<name>_max``, ``t_<name>_max``, ``<name>_min``, ``t_<name>_min`` over the kept rows."""
    ok = keep & np.isfinite(y)
    if not ok.any():
        return
    i = np.nonzero(ok)[0]
    i_max, i_min = i[int(np.argmax(y[ok]))], i[int(np.argmin(y[ok]))]
    s.update({f"{name}_max": float(y[i_max]), f"t_{name}_max": float(t[i_max]),
              f"{name}_min": float(y[i_min]), f"t_{name}_min": float(t[i_min])})


def running_mean(y, k):
    """Centred running mean of ``y`` over ``k`` rows (ends: over the rows there are)."""
    y = np.asarray(y, dtype=float)
    k = int(k)
    if k <= 1 or y.size == 0:
        return y
    c = np.concatenate(([0.0], np.cumsum(y)))
    i = np.arange(y.size)
    lo = np.maximum(i - (k - 1) // 2, 0)
    hi = np.minimum(i + k // 2 + 1, y.size)
    return (c[hi] - c[lo]) / (hi - lo)


def make_summary(history, *, steps, wall_time_s, extra=None, impulse_times=(), dt=None, chord_time=0.0,
                 settle_s=0.0, running_mean_s=None, impulsive_start=False):
    """Headline numbers of a history (keys as in the public interface).

    Parameters
    ----------
    history : dict of ndarray
    steps : int
    wall_time_s : float
    extra : dict, optional
        Merged in last.
    impulse_times : sequence of float
        Instants (s) at which the motion changes instantly
        (:meth:`unsteady.inputs.motion.Kinematics.singular_times`); needs ``dt``.
    dt : float, optional
        Time step (s).
    chord_time : float, optional
        c / U (s), for the window after an instantaneous change.
    settle_s : float, optional
        Seconds of start-up left out of the peaks (a run started inside a
        turbulence field: the start is trimmed in the field as it stands at
        t = 0, not in the flow its past would have left; see
        :func:`unsteady.analysis.turbulence.startup_interval`).  Ignored, and
        said so, when no row would remain.
    running_mean_s : float, optional
        The peaks of cl, cm and n are those of a centred running mean over
        this many seconds (needs ``dt``; a run that sheds from the leading
        edge ripples from step to step, :mod:`unsteady.analysis.shedding`);
        ``cl_max_steps`` keeps the largest single row.
    impulsive_start : bool, optional
        The run starts impulsively (``run.start = "impulsive"``): the speed
        jumps from rest at the first row, an impulse of the apparent-mass force
        like an instantaneous motion, so the rows of :data:`IMPULSE_WINDOW`
        after the first are left out of the peaks too (needs ``dt``), and said so.
    """
    cl = np.asarray(history["cl"], dtype=float)
    t = np.asarray(history["t"], dtype=float)
    keep = np.ones(t.shape, dtype=bool)
    times = [T for T in impulse_times if t.size and t[0] <= T <= t[-1]] if dt else []
    if times:
        keep = ~impulse_mask(t, times, dt, chord_time)
    s = {"version": __version__, "steps": int(steps), "wall_time_s": float(wall_time_s)}
    if impulsive_start and dt and t.size > 1:
        start = impulse_mask(t, [float(t[0])], dt, chord_time)
        if (keep & ~start).any():
            keep = keep & ~start
            s["start_note"] = ("the run starts impulsively: the first rows carry the apparent-mass "
                               "impulse of the start from rest, so the peaks leave out the first "
                               f"{IMPULSE_WINDOW[1]:g} steps or {IMPULSE_WINDOW[2]:g} chord of travel, "
                               "whichever is longer")
    if settle_s > 0.0 and t.size:
        settled = t >= t[0] + settle_s
        if (keep & settled).any():
            keep = keep & settled
            s["peaks_from_s"] = float(t[0] + settle_s)
            s["peaks_note"] = (f"the first {settle_s:.3g} s (the start-up: the run starts trimmed in the "
                               "turbulence as it stands at t = 0, not in the flow its past would have "
                               "left) are left out of the peaks, as from the statistics")
        else:
            s["peaks_note"] = (f"the record is shorter than the start-up ({settle_s:.3g} s): the peaks "
                               "include it and describe the start as much as the turbulence")
    cm = np.asarray(history["cm"], dtype=float)
    k = 1
    if running_mean_s and dt:
        k = max(1, int(round(running_mean_s / dt)))
        ok = keep & np.isfinite(cl)
        if ok.any():
            s["cl_max_steps"] = float(cl[ok].max())
        cl, cm = running_mean(cl, k), running_mean(cm, k)
        s["peaks_running_mean_s"] = float(k * dt)
        s["peaks_running_mean_note"] = (f"the peaks of cl, cm and n are those of a centred running mean "
                                        f"over {k} steps ({k * dt:.3g} s): each new leading-edge vortex "
                                        f"makes the loads ripple from step to step; cl_max_steps is the "
                                        f"largest single row")
    _peaks(s, "cl", cl, t, keep)
    ok = keep & np.isfinite(cm)
    if ok.any():
        s.update(cm_max=float(cm[ok].max()), cm_min=float(cm[ok].min()),
                 cd_mean=float(np.nanmean(history["cd"])), cl_final=float(cl[np.isfinite(cl)][-1]))
    if "ch" in history:                   # a flap's hinge moment
        _peaks(s, "ch", np.asarray(history["ch"], dtype=float), t, keep)
    if "ground_clearance_m" in history and np.isfinite(history["ground_clearance_m"]).any():
        g = np.asarray(history["ground_clearance_m"], dtype=float)
        i = int(np.nanargmin(g))
        s.update(ground_clearance_min_m=float(g[i]), t_ground_clearance_min=float(t[i]))
    if "n" in history and np.isfinite(history["n"]).any():
        n = running_mean(np.asarray(history["n"], dtype=float), k)
        _peaks(s, "n", n, t, keep)
    if times:
        s["impulses"] = apparent_mass_impulses(history, times, dt)
        s["impulses_note"] = ("the motion changes instantly at these times (a step or a sharp corner): "
                              "the apparent-mass force is an impulse there, given as the time integrals "
                              "of cl and cm (s); the peaks above leave out the rows from "
                              f"{IMPULSE_WINDOW[0]:g} step before to {IMPULSE_WINDOW[1]:g} steps or "
                              f"{IMPULSE_WINDOW[2]:g} chord of travel after, whichever is longer")
    s["caution"] = MODEL_CAUTION
    if extra:
        s.update(extra)
    return s
