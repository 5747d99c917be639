"""Run a scenario: build geometry, motion and fields, march the model, gather a Result."""

from __future__ import annotations

import time

from .observers import HistoryRecorder, SnapshotRecorder, StepProgress
from ..analysis.summary import make_summary
from .result import Result
from ..inputs.scenario import Scenario, load_scenario
from ..vortex.solver import SolverDiverged, VortexSolver, build_body


class PrescribedMotion:
    """Pitch and plunge given by motion laws (the solver's motion interface)."""

    def __init__(self, kinematics):
        self.kin = kinematics

    def state(self, t):
        return self.kin.state(t)

    def after_step(self, t, dt, loads):
        pass


def snapshot_interval(sc: Scenario) -> int:
    """Steps between wake snapshots (``output.snapshot_every`` seconds; 0 = ~200 per run)."""
    every_s = sc.data["output"].get("snapshot_every", 0.0) or 0.0
    if every_s > 0:
        return max(1, int(round(every_s / sc.dt)))
    return max(1, sc.steps // 200)


def simulate(scenario, observers=(), *, progress=False):
    """Run a scenario and return its :class:`~unsteady.results.Result`.

    Parameters
    ----------
    scenario : Scenario, dict, str or Path
        A checked scenario, or something :func:`load_scenario` accepts.
    observers : sequence
        Extra time-loop observers (``on_step(state)``, optional ``on_start``,
        ``on_end``).
    progress : bool
        Show a progress bar on stderr (only drawn when stderr is a terminal).

    A run whose state stops being finite returns the steps computed so far
    with ``Result.error`` set (it does not raise).
    """
    sc = scenario if isinstance(scenario, Scenario) else load_scenario(scenario)
    model = sc.data["run"].get("model", "vortex")
    if model != "vortex":
        from . import models
        return models.get(model)(sc, observers=observers, progress=progress)
    t_wall = time.perf_counter()
    body = build_body(sc)
    motion = PrescribedMotion(sc.kinematics)
    gust = None
    extra_obs = []
    columns = []
    summary_extra = {}
    if sc.data.get("gust"):
        from ..inputs.gusts import build_gust_field, GustObserver
        gust = build_gust_field(sc)
        g_obs = GustObserver(gust, sc)
        extra_obs.append(g_obs)
        columns += g_obs.columns
    if sc.data.get("aircraft"):
        from ..dynamics.heave import HeaveMotion
        motion = HeaveMotion(sc, sc.kinematics)
        columns += motion.columns
        extra_obs.append(motion)
    steps = sc.steps
    run = sc.data["run"]
    solver = VortexSolver(body, motion, speed=sc.speed, density=sc.density, dt=sc.dt,
                          steps=steps, wake=run["wake"], start=run["start"], gust=gust,
                          shed_offset=run.get("shed_offset", 0.3),
                          core_radius=run.get("core_radius"),
                          far_wake=run.get("far_wake"))
    rec = HistoryRecorder(steps, sc.elements, sc.speed, sc.chord, columns)
    snaps = SnapshotRecorder(snapshot_interval(sc), steps)
    obs = [rec, snaps] + extra_obs + list(observers)
    if progress:
        obs.append(StepProgress(steps, label="run"))
    error = None
    try:
        solver.run(obs)
    except SolverDiverged as exc:
        error = str(exc)
    history = rec.history()
    for o in extra_obs:
        if hasattr(o, "finish"):
            o.finish(history)
    snapshots = snaps.arrays()
    snapshots["dcp"] = rec.dcp[:rec.count]
    snapshots["x_dcp"] = (body.xi_0 + 0.5 * body.ds * body.t_xi) / sc.chord + sc.pivot   # element mid-points
    for o in extra_obs:
        if hasattr(o, "summary"):
            summary_extra.update(o.summary(history))
    summary = make_summary(history, steps=rec.count - 1, wall_time_s=time.perf_counter() - t_wall,
                           extra=summary_extra)
    travelled = float(history["chords"][-1] - history["chords"][0]) if len(history["t"]) else 0.0
    summary.update(model="vortex", dt=sc.dt, wake=run["wake"], start=run["start"],
                   elements=sc.elements, far_wake_chords=run.get("far_wake"), chords_travelled=travelled)
    if error:
        summary["error"] = error
    from ..analysis.lag import add_quasi_steady, lag_summary  # quasi-steady column, lag metrics, validity flag
    add_quasi_steady(history, sc)
    summary["lag"] = lag_summary(history, sc)
    return Result(history, summary, snapshots, sc, error=error)
