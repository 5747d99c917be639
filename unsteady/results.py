"""Result of a run: history arrays, summary, snapshots; atomic run-directory I/O."""

from __future__ import annotations

import csv
import io
import json
import os
import shutil
import tempfile
from pathlib import Path

import numpy as np

from . import __version__

MODEL_CAUTION = (
    "Inviscid, attached-flow section model: it does not stall or separate, and a 2-D "
    "section over-predicts the lift of a finite wing. Treat results as estimates with "
    "margins; design loads follow the applicable airworthiness rules and are signed off "
    "by qualified engineers."
)


class Result:
    """What a run produced.

    Attributes
    ----------
    history : dict of str -> ndarray
        One entry per CSV column, one value per time step.
    summary : dict
        The headline numbers (as ``summary.json``).
    snapshots : dict of str -> ndarray
        Wake snapshots (see :class:`unsteady.observers.SnapshotRecorder`) and
        ``dcp`` (pressure-jump coefficient per step and element).
    scenario : Scenario or None
    error : str or None
        Set when the run stopped early (non-finite state); the history then
        holds the steps computed before.
    """

    def __init__(self, history, summary, snapshots=None, scenario=None, error=None):
        self.history = history
        self.summary = summary
        self.snapshots = snapshots or {}
        self.scenario = scenario
        self.error = error

    # ------------------------------------------------------------------
    def save(self, out_dir, plots=True):
        """Write the run directory atomically (temporary folder, then rename).

        Returns the Path written.  An existing run directory of the same name
        is replaced only once the new one is complete; any other existing
        folder is refused (see :func:`check_out_dir`), never deleted.
        """
        out_dir = Path(out_dir)
        problem = check_out_dir(out_dir)
        if problem:
            raise ValueError(problem)
        parent = out_dir.resolve().parent
        parent.mkdir(parents=True, exist_ok=True)
        tmp = Path(tempfile.mkdtemp(prefix=f".{out_dir.name}.", suffix=".part", dir=parent))
        os.chmod(tmp, 0o777 & ~_umask())
        try:
            (tmp / "history.csv").write_text(history_csv(self.history))
            (tmp / "summary.json").write_text(json.dumps(_jsonable(self.summary), indent=2) + "\n")
            if self.scenario is not None:
                (tmp / "scenario.toml").write_text(self.scenario.to_toml())
            if self.snapshots:
                np.savez_compressed(tmp / "snapshots.npz", **self.snapshots)
            if plots:
                from .plots import write_run_plots
                write_run_plots(self, tmp)
            if out_dir.exists():
                old = Path(tempfile.mkdtemp(prefix=f".{out_dir.name}.", suffix=".old", dir=parent))
                os.rename(out_dir, old / "x")
                os.rename(tmp, out_dir)
                shutil.rmtree(old, ignore_errors=True)
            else:
                os.rename(tmp, out_dir)
        except BaseException:
            shutil.rmtree(tmp, ignore_errors=True)
            raise
        return out_dir

    @classmethod
    def load(cls, run_dir):
        """Read a run directory written by :meth:`save`."""
        run_dir = Path(run_dir)
        history = read_history_csv(run_dir / "history.csv")
        summary = json.loads((run_dir / "summary.json").read_text())
        snaps = {}
        if (run_dir / "snapshots.npz").exists():
            with np.load(run_dir / "snapshots.npz") as z:
                snaps = {k: z[k] for k in z.files}
        scenario = None
        if (run_dir / "scenario.toml").exists():
            from .scenario import load_scenario
            try:
                scenario = load_scenario(run_dir / "scenario.toml")
            except Exception:
                scenario = None
        return cls(history, summary, snaps, scenario)


RUN_FILES = ("history.csv", "summary.json", "scenario.toml", "snapshots.npz")


def _umask():
    mask = os.umask(0)
    os.umask(mask)
    return mask


def check_out_dir(out_dir):
    """Why ``out_dir`` cannot take a run directory, or None when it can.

    A run may go to a new path, an empty folder, or a folder holding an
    earlier run (``history.csv`` or ``summary.json`` and only files a run
    writes); anything else is refused so that no user data is deleted.
    """
    out_dir = Path(out_dir)
    if out_dir.exists():
        if not out_dir.is_dir():
            return f"error: {out_dir}: --out: exists and is not a folder; give a new folder or an earlier run's"
        names = [p.name for p in out_dir.iterdir()]
        if names:
            is_run = any(n in ("history.csv", "summary.json") for n in names)
            strange = [n for n in names if not (n in RUN_FILES or n.endswith(".png") or n.endswith((".mp4", ".gif")))]
            if not is_run or strange:
                return (f"error: {out_dir}: --out: is a folder that does not hold an earlier run "
                        f"({len(names)} entries); give a new folder, an empty one or an earlier run's")
        return None
    anc = out_dir.absolute().parent
    while not anc.exists():
        anc = anc.parent
    if not anc.is_dir():
        return f"error: {out_dir}: --out: {anc} is a file, not a folder"
    if not os.access(anc, os.W_OK | os.X_OK):
        return f"error: {out_dir}: --out: cannot write in {anc}"
    return None


def history_csv(history) -> str:
    """The history as CSV text: a header of column names, one row per step."""
    names = list(history)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(names)
    cols = [np.asarray(history[k], dtype=float) for k in names]
    for row in zip(*cols):
        w.writerow([f"{v:.10g}" for v in row])
    return buf.getvalue()


def read_history_csv(path):
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    names = rows[0]
    data = np.array([[float(v) for v in r] for r in rows[1:]]) if len(rows) > 1 else np.zeros((0, len(names)))
    return {k: data[:, i] for i, k in enumerate(names)}


def _jsonable(x):
    if isinstance(x, dict):
        return {k: _jsonable(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_jsonable(v) for v in x]
    if isinstance(x, np.generic):
        x = x.item()
    if isinstance(x, float) and not np.isfinite(x):
        return None
    return x


def make_summary(history, *, steps, wall_time_s, extra=None):
    """Headline numbers of a history (keys as in the public interface)."""
    cl = history["cl"]
    cm = history["cm"]
    t = history["t"]
    ok = np.isfinite(cl)
    s = {"version": __version__, "steps": int(steps), "wall_time_s": float(wall_time_s)}
    if ok.any():
        i_max = int(np.nanargmax(cl))
        i_min = int(np.nanargmin(cl))
        s.update(cl_max=float(cl[i_max]), t_cl_max=float(t[i_max]),
                 cl_min=float(cl[i_min]), t_cl_min=float(t[i_min]),
                 cm_max=float(np.nanmax(cm)), cm_min=float(np.nanmin(cm)),
                 cd_mean=float(np.nanmean(history["cd"])),
                 cl_final=float(cl[ok][-1]))
    if "n" in history and np.isfinite(history["n"]).any():
        n = history["n"]
        j = int(np.nanargmax(n))
        s.update(n_max=float(n[j]), t_n_max=float(t[j]), n_min=float(np.nanmin(n)))
    s["caution"] = MODEL_CAUTION
    if extra:
        s.update(extra)
    return s
