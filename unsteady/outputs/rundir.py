"""The run directory on disk: atomic writing, the one loader, the CSV history format."""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

import numpy as np

from ..core.errors import OutputError, UsageError
from ..core.files import atomic_dir, claim_out_dir
from ..simulation.result import Result

#: The files a run directory holds besides its pictures and films.
RUN_FILES = ("history.csv", "summary.json", "scenario.toml", "snapshots.npz")
#: Files every reader needs.
ALWAYS = ("history.csv", "summary.json")
#: What to say when a needed file is missing (default: it is not a run directory).
MISSING_HINT = {
    "snapshots.npz": "the run kept no wake snapshots; rerun it with 'unsteady run' "
                     "(output.snapshot_every sets their spacing)",
}


def save_run(result, out_dir, plots=True):
    """Write the run directory atomically (temporary folder, then swapped in).

    Returns the Path written.  An existing folder is replaced only when it is
    the tool's own earlier run, unchanged (its record lists every file; see
    :func:`check_out_dir`), and only once the new one is complete; anything
    else is refused (UsageError), never deleted.  A write that fails (a full
    disk) raises OutputError with one line; the earlier run is then intact and
    no temporary is left.
    """
    out_dir = Path(out_dir)
    problem = check_out_dir(out_dir)
    if problem:
        raise UsageError(problem)
    existed = out_dir.is_dir()
    try:
        with atomic_dir(out_dir, kind="run") as tmp:
            write_run_files(result, tmp, plots)
    except OSError as exc:
        where = f"{Path(exc.filename).name}: " if exc.filename else ""
        kept = "the earlier run there is intact" if existed else "nothing was left behind"
        raise OutputError(f"unsteady: {out_dir}: could not be written ({where}{exc.strerror or exc}); "
                          f"{kept}") from None
    return out_dir


def write_run_files(result, folder, plots=True):
    """The files of a run directory, written into ``folder`` (a temporary one: see :func:`save_run`)."""
    folder = Path(folder)
    (folder / "history.csv").write_text(history_csv(result.history))
    (folder / "summary.json").write_text(json.dumps(_jsonable(result.summary), indent=2) + "\n")
    if result.scenario is not None:
        (folder / "scenario.toml").write_text(result.scenario.to_toml())
    if result.snapshots:
        np.savez_compressed(folder / "snapshots.npz", **result.snapshots)
    if plots:
        from .gallery import write_run_plots
        write_run_plots(result, folder)


def load_run(run_dir, need=(), columns=(), read=RUN_FILES, keys=()):
    """Read a run directory written by :func:`save_run`, checking what the caller needs.

    Parameters
    ----------
    run_dir : path
    need : sequence of str
        Files that must be there besides ``history.csv`` and ``summary.json``
        (``"scenario.toml"``, ``"snapshots.npz"``: then it must hold at least
        one wake snapshot).
    columns : sequence of str
        History columns that must be there.
    keys : sequence of str
        Summary keys that must be there.
    read : sequence of str
        Files to read when present (the others are left alone: a caller that
        needs no scenario does not pay for loading one).

    Returns
    -------
    Result
        ``scenario`` None and ``snapshots`` empty when not read or absent.

    Raises
    ------
    UsageError
        ``error: <run_dir>: <file>: <what is wrong>`` for a missing folder or
        file, a damaged or truncated file, a missing column or summary key.
    """
    d = Path(run_dir)
    if not d.is_dir():
        raise UsageError(f"error: {d}: RUN_DIR: no such folder; give a folder written by 'unsteady run'")
    need = [*ALWAYS, *(n for n in need if n not in ALWAYS)]
    for name in need:
        if not (d / name).is_file():
            hint = MISSING_HINT.get(name, "give a folder written by 'unsteady run'")
            raise UsageError(f"error: {d}: {name}: missing; {hint}")
    parts = {}
    for name, reader in _READERS.items():
        if (name in need or name in read) and (d / name).is_file():
            try:
                parts[name] = reader(d / name)
            except UsageError:
                raise
            except Exception as exc:        # damaged, truncated, not what a run writes
                raise UsageError(f"error: {d}: {name}: damaged ({_why(exc)}); rerun the scenario") from None
    history, summary = parts["history.csv"], parts["summary.json"]
    for name, have, want, what in (("history.csv", history, columns, "the column(s)"),
                                   ("summary.json", summary, keys, "the key(s)")):
        lacking = [k for k in want if k not in have]
        if lacking:
            raise UsageError(f"error: {d}: {name}: lacks {what} {', '.join(lacking)}; "
                             "give a run directory written by 'unsteady run'")
    rows = len(next(iter(history.values()))) if history else 0
    steps = summary.get("steps") if isinstance(summary, dict) else None
    if isinstance(steps, int) and not summary.get("error") and rows != steps + 1:
        # a file cut at a line boundary still parses: its length against the summary's steps tells
        raise UsageError(f"error: {d}: history.csv: damaged (holds {rows} rows where the summary's "
                         f"{steps} steps make {steps + 1}: cut short); rerun the scenario")
    snaps = parts.get("snapshots.npz", {})
    if "snapshots.npz" in need and (len(snaps.get("t", ())) == 0 or "offsets" not in snaps):
        raise UsageError(f"error: {d}: snapshots.npz: holds no wake snapshots; rerun the scenario")
    return Result(history, summary, snaps, parts.get("scenario.toml"))


def _why(exc):
    text = str(exc).strip()[:160]
    if isinstance(exc, ValueError) and text:
        return text
    return f"{type(exc).__name__}: {text}" if text else type(exc).__name__


def read_summary(path):
    """summary.json as a dict (ValueError when it is not a JSON object)."""
    summary = json.loads(Path(path).read_text())
    if not isinstance(summary, dict):
        raise ValueError("not a JSON object")
    return summary


def read_snapshots(path):
    """The arrays of snapshots.npz, read into memory."""
    with np.load(path) as z:
        return {k: z[k] for k in z.files}


def read_run_scenario(path):
    """A run's scenario.toml, tolerating a resolved file that lists both density and altitude."""
    from ..inputs.scenario import ScenarioError, load_scenario, read_toml
    from ..core.errors import InputError
    path = Path(path)
    try:
        raw = read_toml(path)
        flow = raw.get("flow", {})
        if isinstance(flow, dict) and "density" in flow and "altitude" in flow:
            flow.pop("altitude")
        return load_scenario(raw, source_name=str(path), base_dir=path.parent)
    except ScenarioError as exc:
        first = exc.problems[0]
        raise ValueError(f"{first.key}: {first.message}") from None
    except InputError as exc:
        raise ValueError(exc.message) from None


def check_out_dir(out_dir, label="--out", source=None):
    """Why ``out_dir`` cannot take a run directory, or None when it can (checked before computing).

    A run may go to a new path, an empty folder, or a folder holding the
    tool's own earlier run: every entry listed, unchanged, in its record
    (``core.files.RECORD``; pictures, films and pages the tool added since
    join it).  Anything else is refused, naming the first entry the tool did
    not write, and so is a folder that cannot be written (a read-only file
    system, ``/proc``, a read-only earlier run).  Stale leftovers of an
    interrupted save are removed first (see :func:`unsteady.core.files.claim_out_dir`;
    ``source``: the scenario file when the folder is its ``output.dir``).
    """
    try:
        claim_out_dir(out_dir, "run", label, source=source)
    except UsageError as exc:
        return str(exc)
    return None


def history_csv(history) -> str:
    """The history as CSV text: a header of column names, one row per step, numbers as ``%.10g``."""
    names = list(history)
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerow(names)
    if names:
        rows = np.column_stack([np.asarray(history[k], dtype=float) for k in names]).tolist()
        line = ",".join(["%.10g"] * len(names)) + "\n"
        buf.write("".join(line % tuple(r) for r in rows))
    return buf.getvalue()


def read_history_csv(path):
    """history.csv as {column: array}; ValueError naming the line when it is damaged or truncated."""
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    if not rows or not rows[0]:
        raise ValueError("empty: no header row of column names")
    names = rows[0]
    data = np.empty((len(rows) - 1, len(names)))
    for i, r in enumerate(rows[1:]):
        if len(r) != len(names):
            raise ValueError(f"line {i + 2} has {len(r)} values where the header names {len(names)}")
        try:
            data[i] = [float(v) for v in r]
        except ValueError:
            raise ValueError(f"line {i + 2} holds a value that is not a number") from None
    return {k: data[:, i] for i, k in enumerate(names)}


#: Reader of each file of a run directory (history and summary first).
_READERS = {"history.csv": read_history_csv, "summary.json": read_summary,
            "snapshots.npz": read_snapshots, "scenario.toml": read_run_scenario}


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
