"""Registry of alternative run models, chosen by ``[run] model`` (the vortex model is the default)."""

from __future__ import annotations

import time

import numpy as np

from ..analysis.lag import add_quasi_steady, lag_summary
from ..analysis.summary import make_summary
from ..dynamics.heave import HeaveMotion
from ..inputs import scenario
from ..inputs.gusts import GustObserver, build_gust_field
from ..linear import model as linear
from ..linear.model import _gust_series, linear_loads, section_constants
from .observers import BASE_COLUMNS, EXTRA_COLUMNS
from .result import Result

#: name -> fn(sc, observers=(), progress=False) -> Result
MODELS = {}


def register_model(name):
    """Decorator: register ``fn(sc, observers=(), progress=False) -> Result`` under ``name``.

    The name becomes an allowed value of ``[run] model``.
    """
    if name not in scenario.RUN_MODELS:
        raise ValueError(f"model {name!r} is not an allowed value of [run] model; "
                         f"add it to unsteady.inputs.scenario.RUN_MODELS")

    def deco(fn):
        MODELS[name] = fn
        return fn
    return deco


def get(name):
    """The run function registered as ``name``.

    Raises
    ------
    KeyError
        With the registered names, when ``name`` is not one of them.
    """
    try:
        return MODELS[name]
    except KeyError:
        raise KeyError(f"no run model {name!r}; registered: {', '.join(sorted(MODELS))}") from None


@register_model("linear")
def run_linear(sc, observers=(), progress=False):
    """Classical indicial-response model (Wagner, Kuessner, Theodorsen): see :mod:`unsteady.linear`."""
    return simulate_linear(sc, observers=observers, progress=progress)


def linear_heave_marcher(sc, **options):
    """The linear model's free-heave marcher of a scenario with ``[aircraft]``, trimmed.

    ``options``: ``s_max``, ``tail``, ``compiled`` of :class:`unsteady.linear.model.LinearMarcher`.
    """
    return linear.heave_marcher(sc, HeaveMotion(sc, sc.kinematics), **options)


class _LightState:
    """What a time-loop observer sees from the linear model (no wake, no body points)."""

    def __init__(self, n, t, alpha, alpha_dot, h, h_dot, loads):
        self.n, self.t = n, t
        self.alpha, self.alpha_dot, self.h, self.h_dot = alpha, alpha_dot, h, h_dot
        self.loads = loads
        empty = np.zeros(0)
        self.gamma_bound = self.x_wake = self.z_wake = self.gamma_wake = empty
        self.x_body = self.z_body = self.dcp = empty
        self.extra = {}


def simulate_linear(sc, observers=(), progress=False):
    """Run a scenario with the linear model and return a :class:`~unsteady.results.Result`.

    The same run directory and history columns as the vortex model (the
    vortex-only columns get their linear equivalents: ``gamma_bound`` is the
    circulation that carries the circulatory lift by Kutta-Joukowski,
    ``gamma_wake`` the circulation shed since the start, ``wake_vortices`` 0).
    Prescribed motion is summed in one pass of FFT convolutions; with
    ``[aircraft]`` the loads drive the heave, and the model marches step by
    step (:class:`LinearMarcher`).

    Parameters
    ----------
    sc : Scenario
    observers : sequence
        Time-loop observers; they see each row's time, motion and loads (no
        wake or body points, which this model does not have).
    progress : bool
        Accepted for symmetry with the vortex model; the run takes well under
        a second, so no bar is drawn.
    """

    t_wall = time.perf_counter()
    U, c, pv, dt = sc.speed, sc.chord, sc.pivot, sc.dt
    steps = sc.steps
    start = sc.data["run"]["start"]
    alpha_L0, cm0 = section_constants(sc.section)
    kin = sc.kinematics
    gust = g_obs = None
    extra_obs, columns = [], []
    if sc.data.get("gust"):
        gust = build_gust_field(sc)
        g_obs = GustObserver(gust, sc)
        extra_obs.append(g_obs)
        columns += list(g_obs.columns)
    x_le = -pv * c

    def gust_at_le(t, h):
        """Gust (u, w) met by the leading edge (its path at zero pitch), m/s."""
        return _gust_series(gust, x_le, np.atleast_1d(t), np.atleast_1d(h))

    motion = None
    if sc.data.get("aircraft"):
        motion = HeaveMotion(sc, kin)
        columns += [k for k in motion.columns if k not in columns]
        extra_obs.append(motion)

    rows = []
    if motion is None:
        t = np.arange(steps + 1) * dt
        alpha, alpha_dot, h, h_dot = (np.broadcast_to(np.asarray(v, dtype=float), t.shape).copy()
                                      for v in kin.state(t))
        alpha_ddot, h_ddot = (np.broadcast_to(np.asarray(v, dtype=float), t.shape).copy()
                              for v in kin.accel(t))
        u_le = w_le = None
        if gust is not None:
            u_le, w_le = gust_at_le(t, h)
        out = linear_loads(t, alpha, alpha_dot, alpha_ddot, h_dot, h_ddot, speed=U, chord=c,
                           pivot=pv, alpha_L0=alpha_L0, cm0=cm0, w_le=w_le,
                           u_le=u_le if gust is not None and gust.streamwise else None, start=start)
        cl_c = out["cl_c"] + out["cl_gust"]
    else:
        H = linear.heave_marcher(sc, motion, gust).run()
        t, alpha, alpha_dot, h, h_dot = H["t"], H["alpha"], H["alpha_dot"], H["h"], H["h_dot"]
        out = H
        cl_c = H["cl_c"] + H["cl_gust"]

    history = {"t": t, "chords": U * t / c, "pitch_deg": np.degrees(alpha), "height_m": h,
               "cl": out["cl"], "cd": out["cd"], "cm": out["cm"], "cm_pivot": out["cm_pivot"],
               "cl_impulse": out["cl"], "cd_impulse": out["cd"], "cm_impulse": out["cm"],
               "pitch_rate_deg_s": np.degrees(alpha_dot), "height_rate_m_s": h_dot}
    gamma_b = -0.5 * U * c * cl_c     # counter-clockwise positive, as the vortex model (L = -rho U Gamma)
    history["gamma_bound_m2_s"] = gamma_b
    history["gamma_wake_m2_s"] = (gamma_b[0] if start == "steady" else 0.0) - gamma_b
    history["wake_vortices"] = np.zeros_like(t)
    history["cl_circulatory"] = cl_c
    for k in columns:
        history.setdefault(k, np.full(t.shape, np.nan))
    assert all(k in history for k in BASE_COLUMNS + EXTRA_COLUMNS)

    # Observers see every row (the gust observer fills its columns here).
    if g_obs is not None and not observers and hasattr(g_obs, "record_rows"):
        g_obs.record_rows(t, alpha, h, h_dot)      # the same rows, in one call
    elif extra_obs or observers:
        for n in range(t.shape[0]):
            loads = {k: float(history[k][n]) for k in ("cl", "cd", "cm", "cm_pivot")}
            st = _LightState(n, float(t[n]), float(alpha[n]), float(alpha_dot[n]),
                             float(h[n]), float(h_dot[n]), loads)
            for o in ([g_obs] if g_obs is not None else []) + list(observers):
                o.on_step(st)
            for k, v in st.extra.items():
                if k in history:
                    history[k][n] = v
    for o in extra_obs:
        if hasattr(o, "finish"):
            o.finish(history)
    summary_extra = {}
    for o in extra_obs:
        if hasattr(o, "summary"):
            summary_extra.update(o.summary(history))
    every = max(1, steps // 200)
    idx = np.unique(np.r_[np.arange(0, steps + 1, every), steps])
    snapshots = {"t": t[idx], "alpha": alpha[idx], "h": h[idx],
                 "offsets": np.zeros(idx.size + 1, dtype=np.int64),
                 "x": np.zeros(0, np.float32), "z": np.zeros(0, np.float32),
                 "gamma": np.zeros(0, np.float32)}
    summary = make_summary(history, steps=steps, wall_time_s=time.perf_counter() - t_wall,
                           extra=summary_extra)
    summary.update(model="linear", dt=dt, start=start, elements=sc.elements,
                   chords_travelled=float(history["chords"][-1] - history["chords"][0]))
    add_quasi_steady(history, sc, gust)
    summary["lag"] = lag_summary(history, sc)
    return Result(history, summary, snapshots, sc)
