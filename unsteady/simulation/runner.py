"""Run a scenario: one pipeline for every model (gust, heave, recorders, observers, summary) into a Result."""

from __future__ import annotations

import copy
import dataclasses
import math
import time

from ..analysis.lag import add_quasi_steady, lag_summary
from ..analysis.loads import add_dimensional_loads
from ..analysis.shedding import running_mean_s, shedding_summary
from ..analysis.summary import make_summary
from ..analysis.turbulence import record_statistics, realisation_seeds_of, startup_interval, turbulence_summary
from ..analysis.verdict import measured_warnings, warning_lines
from ..dynamics.heave import HeaveMotion
from ..dynamics.pitch import HeldAttitudeHeave, PitchHeaveMotion, heave_only_comparison
from ..inputs.gusts import build_gust_field
from ..inputs.scenario import Scenario, load_scenario
from . import models
from .observers import GustObserver, HistoryRecorder, SnapshotRecorder, StepProgress
from .result import Result


class PrescribedMotion:
    """Pitch and plunge given by motion laws (the models' motion interface)."""

    def __init__(self, kinematics):
        self.kin = kinematics

    def state(self, t):
        """(alpha, alpha_dot, h, h_dot) at time(s) t (rad, rad/s, m, m/s)."""
        return self.kin.state(t)

    def accel(self, t):
        """(alpha_ddot, h_ddot) at time(s) t (rad/s^2, m/s^2)."""
        return self.kin.accel(t)

    def after_step(self, t, dt, loads):
        pass


def singular_times(sc: Scenario):
    """Instants (s) at which pitch, plunge or the flap change instantly (the summary leaves them out of the peaks)."""
    times = set(sc.kinematics.singular_times())
    if sc.flap_law is not None:
        times |= set(sc.flap_law.singular_times())
    return sorted(times)


def snapshot_interval(sc: Scenario) -> int:
    """Steps between wake snapshots (``output.snapshot_every`` seconds; 0 = ~200 per run)."""
    every_s = sc.data["output"].get("snapshot_every", 0.0) or 0.0
    if every_s > 0:
        return max(1, int(round(every_s / sc.dt)))
    return max(1, sc.steps // 200)


def simulate(scenario, observers=(), *, progress=False, label="run"):
    """Run a scenario with the model of ``[run] model`` and return its :class:`~unsteady.simulation.result.Result`.

    The one pipeline for every registered model
    (:class:`~unsteady.simulation.models.Model`): it builds the gust field
    and the motion (free heave with ``[aircraft]``, trimmed on the model's
    steady lift), records the history and the snapshots, marches the model
    with the observers, then adds the gust and heave columns, the summary,
    the quasi-steady column and the lag metrics.

    Parameters
    ----------
    scenario : Scenario, dict, str or Path
        A checked scenario, or something :func:`load_scenario` accepts.
    observers : sequence
        Extra time-loop observers.  Each has ``on_step(state)`` (a
        :class:`~unsteady.vortex.solver.StepState`; a model without wake
        gives empty wake and body arrays) and any of ``on_start(model)``,
        ``on_end(model)`` (also when the run diverges), ``finish(history)``
        (called once the history is complete, quasi-steady column included;
        it may add columns, one value per row) and ``summary(history)``
        (its dict is merged into the summary, after the built-in keys).
    progress : bool
        Show a progress bar on stderr (only drawn when stderr is a terminal).
    label : str
        The progress bar's label.

    With ``[gust] realisations`` (a turbulence gust), the further realisations
    are run after the first with the same model, and their load-factor
    statistics averaged with the first's into the summary
    (:func:`unsteady.analysis.turbulence.turbulence_summary`); the history,
    snapshots and pictures are the first realisation's.

    Returns
    -------
    Result
        A run whose state stops being finite returns the steps computed so
        far with ``Result.error`` set (it does not raise).
    """
    sc = scenario if isinstance(scenario, Scenario) else load_scenario(scenario)
    t_wall = time.perf_counter()
    cls = models.get(sc.data["run"].get("model", "vortex"))
    gust = build_gust_field(sc) if sc.data.get("gust") else None
    ac = sc.data.get("aircraft")
    pitching = bool(ac) and "pitch_inertia" in ac            # a wing with its tail free to pitch
    heave = (PitchHeaveMotion(sc, sc.kinematics) if pitching else
             HeaveMotion(sc, sc.kinematics) if ac else None)
    model = cls(sc, gust, heave if heave is not None else PrescribedMotion(sc.kinematics))
    if pitching:
        heave.trim(model.steady_loads)
        model.set_tail_turn(*heave.tail_control)
        heave.set_apparent_inertia(model.apparent_inertia(heave.alpha_trim), model.rate_difference)
    elif heave is not None:
        heave.trim(model.steady_cl)
        heave.set_apparent_mass(model.heave_apparent_mass(heave.alpha_trim), model.rate_difference)
    builtin = ([GustObserver(gust, sc)] if gust is not None else []) + ([heave] if heave is not None else [])
    columns = list(model.COLUMNS)                # a model may add columns for its scenario
    for o in builtin:
        columns += [k for k in o.columns if k not in columns]
    rec = HistoryRecorder(sc.steps, sc.speed, sc.chord, columns)
    snaps = SnapshotRecorder(snapshot_interval(sc), sc.steps)
    step_obs = [rec, snaps] + [o for o in builtin if hasattr(o, "on_step")] + list(observers)
    if progress:
        step_obs.append(StepProgress(sc.steps, label=label))
    error = model.run(step_obs)
    history = rec.history()
    summary = _summarise(model, history, builtin, rec.count - 1, time.perf_counter() - t_wall, error)
    if pitching and gust is not None and ac.get("heave_only_run", True) and not error:
        summary.update(_heave_only_companion(sc, cls, gust, heave, history, summary, progress))
    snapshots = snaps.arrays()
    snapshots.update(model.snapshot_extras())
    add_quasi_steady(history, sc, gust, steady=model.quasi_steady_cl)   # quasi-steady column, lag, validity
    summary["lag"] = lag_summary(history, sc)
    lines = list(sc.warnings) + list(summary.get("warnings", []))
    lines += warning_lines(measured_warnings(history, sc, summary, snapshots), sc.source)
    if lines:
        summary["warnings"] = list(dict.fromkeys(lines))      # check's first, then measured; once each
    seeds = realisation_seeds_of(sc)
    if len(seeds) > 1 and not error and "n" in history:
        more, lost = _further_realisations(sc, seeds[1:], progress)
        if more:
            summary.update(turbulence_summary(history, sc, more))
        if lost:
            summary.setdefault("turbulence", {})["realisations_lost"] = lost
    for o in observers:
        if hasattr(o, "finish"):
            o.finish(history)
    for o in observers:
        if hasattr(o, "summary"):
            summary.update(o.summary(history))
    return Result(history, summary, snapshots, sc, error=error)


def trim_of(scenario):
    """What the trim of pitch freedom sets (the summary's ``trimmed`` sentence), without running the
    scenario; None without pitch freedom.  For ``unsteady check``.

    Raises
    ------
    InputError
        (key ``aircraft.cg``) when no trim exists within the limits
        (:meth:`~unsteady.dynamics.pitch.PitchHeaveMotion.trim`).
    """
    sc = scenario if isinstance(scenario, Scenario) else load_scenario(scenario)
    ac = sc.data.get("aircraft")
    if not ac or "pitch_inertia" not in ac:
        return None
    gust = build_gust_field(sc) if sc.data.get("gust") else None
    motion = PitchHeaveMotion(sc, sc.kinematics)
    model = models.get(sc.data["run"].get("model", "vortex"))(sc, gust, motion)
    motion.trim(model.steady_loads)
    return motion.trimmed()


def _summarise(model, history, builtin, steps, wall_time_s, error):
    """Fill the built-in observers' columns and build the summary (before the lag block)."""
    for o in builtin:
        o.finish(history)
    extra = {}
    for o in builtin:
        extra.update(o.summary(history))
    sc = model.sc
    extra.update(add_dimensional_loads(history, sc))      # lift_N, cl_wing, root_bending_Nm
    extra.update(turbulence_summary(history, sc))         # n_rms, A_bar, N0 in turbulence
    extra.update(shedding_summary(history, sc))           # lesp_max; lev_onset_t with lesp_critical
    gust = model.gust
    settle = (startup_interval(sc) if gust is not None and gust.present_at_start
              and sc.data.get("aircraft") else 0.0)
    summary = make_summary(history, steps=steps, wall_time_s=wall_time_s, extra=extra,
                           impulse_times=singular_times(sc), dt=sc.dt,
                           chord_time=sc.chord / sc.speed, settle_s=settle,
                           running_mean_s=running_mean_s(history, sc),
                           impulsive_start=sc.data["run"].get("start") == "impulsive")
    travelled = float(history["chords"][-1] - history["chords"][0]) if len(history["t"]) else 0.0
    summary.update(model=model.name, **model.summary(), chords_travelled=travelled)
    if error:
        summary["error"] = error
    return summary



def _heave_only_companion(sc, cls, gust, pitched, history, summary, progress):
    """Fly the trimmed aircraft of a free-pitch gust run again with its attitude held at the trim
    (:class:`~unsteady.dynamics.pitch.HeldAttitudeHeave`: same model, step, gust, tail); adds the
    columns ``n_heave_only`` and ``tail_load_heave_only_N`` to ``history`` (NaN past the rows it
    computed) and returns the comparison block (:func:`~unsteady.dynamics.pitch.heave_only_comparison`)."""
    import numpy as np
    t_wall = time.perf_counter()
    held = HeldAttitudeHeave(sc, sc.kinematics, pitched)
    model = cls(sc, gust, held)
    model.set_tail_turn(*pitched.tail_control)
    held.set_apparent_mass(pitched.apparent_mass, model.rate_difference)
    rec = HistoryRecorder(sc.steps, sc.speed, sc.chord, list(model.COLUMNS))
    obs = [rec] + ([StepProgress(sc.steps, label="heave-only run")] if progress else [])
    error = model.run(obs)
    only = rec.history()
    held.finish(only)
    rows = len(only["t"])
    k = len(history["t"])
    for src, dst in (("n", "n_heave_only"), ("tail_load_N", "tail_load_heave_only_N")):
        col = np.full(k, np.nan)
        m = min(k, rows)
        col[:m] = only[src][:m]
        history[dst] = col
    peaks = make_summary(only, steps=rows - 1, wall_time_s=0.0, impulse_times=singular_times(sc), dt=sc.dt,
                         chord_time=sc.chord / sc.speed, running_mean_s=running_mean_s(only, sc),
                         settle_s=startup_interval(sc) if gust.present_at_start else 0.0,
                         impulsive_start=sc.data["run"].get("start") == "impulsive")
    out = heave_only_comparison({"n_max": summary.get("n_max"), "n_min": summary.get("n_min"),
                                 "tail_load_N": history.get("tail_load_N", [])},
                                {**peaks, "tail_load_N": only["tail_load_N"]}, rows)
    out["heave_only"]["alpha_deg"] = math.degrees(pitched.alpha_trim)
    out["heave_only"]["note"] = ("the same trimmed aircraft, gust, model and step with the attitude held at "
                                 "the trim (heave only); dn_peak is the larger of n_max - 1 and 1 - n_min, "
                                 "the tail-load ratio compares the peak changes from the trimmed tail load")
    out["heave_only"]["wall_time_s"] = time.perf_counter() - t_wall
    if error:
        out["heave_only"]["error"] = error
    return out


def _further_realisations(sc, seeds, progress):
    """The load-factor statistics of the scenario flown again in the turbulence of each seed
    (same model and step); ([statistics], [notes of realisations that gave none])."""
    out, lost = [], []
    for i, seed in enumerate(seeds, 2):
        data = copy.deepcopy(sc.data)
        g = data["gust"][0] if isinstance(data["gust"], list) else data["gust"]
        g["seed"] = int(seed)
        g.pop("realisations", None)
        if "pitch_inertia" in (data.get("aircraft") or {}):
            data["aircraft"]["heave_only_run"] = False     # only the statistics are kept
        one = dataclasses.replace(sc, data=data, warnings=())
        res = simulate(one, progress=progress, label=f"realisation {i}/{len(seeds) + 1}")
        st = record_statistics(res.history, one) if not res.error else None
        if st is None:
            lost.append(f"seed {seed}: " + (f"run stopped early: {res.error}" if res.error else "record too short"))
        else:
            out.append(st)
    return out, lost
