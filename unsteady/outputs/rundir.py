"""The run directory on disk: atomic writing, reading back, the CSV history format."""

from __future__ import annotations

import csv
import io
import json
import os
import shutil
import tempfile
from pathlib import Path

import numpy as np

from ..simulation.result import Result


def save_run(result, out_dir, plots=True):
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
        (tmp / "history.csv").write_text(history_csv(result.history))
        (tmp / "summary.json").write_text(json.dumps(_jsonable(result.summary), indent=2) + "\n")
        if result.scenario is not None:
            (tmp / "scenario.toml").write_text(result.scenario.to_toml())
        if result.snapshots:
            np.savez_compressed(tmp / "snapshots.npz", **result.snapshots)
        if plots:
            from .pictures import write_run_plots
            write_run_plots(result, tmp)
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


def load_run(run_dir):
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
        from ..inputs.scenario import load_scenario
        try:
            scenario = load_scenario(run_dir / "scenario.toml")
        except Exception:
            scenario = None
    return Result(history, summary, snaps, scenario)


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
