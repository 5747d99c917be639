"""Sweeps: many cases of one scenario run in parallel on a Dask cluster, with a resumable table.

A ``[sweep]`` section varies scenario keys (dotted paths, as for ``--set``)::

    [sweep]
    name = "H{gust.length}-V{flow.speed}"      # optional name pattern of the grid cases
    save_runs = false                          # optional: keep each case's run directory
    envelope = { value = "n_max", across = "gust.length", lines = "flow.speed" }

    [sweep.grid]                               # Cartesian product, last key varies fastest
    "gust.length" = [0.5, 1.0, 2.5]
    "flow.speed" = [12.0, 16.0, 20.0]

    [[sweep.cases]]                            # explicit cases, run after the grid ones
    name = "calm"
    "run.wake" = "frozen"

A table with a ``law`` or ``profile`` key (a motion law, a gust) is one value:
it replaces the whole law rather than being merged key by key.

Every case is re-resolved from the raw input with its overrides applied, so
derived defaults (time step, density from altitude) follow the case.  Results
go to ``sweep.csv`` (rewritten atomically after every finished case), keyed by
a hash of the fully resolved case scenario and the package version: running
the same sweep again skips the finished cases.  The headers carry the units
(``t_cl_max (s)``, ``flow.speed (m/s)``; coefficients, load factors and
counts have none).  Each row also gives the case's verdict (``ok``, or where
the attached-flow model is out of its depth), the number of warnings, the lag
metrics, and for gust cases with ``[aircraft]`` the gust-formula estimate and
ratio, ``lift_max_N`` and ``root_bending_max_Nm``.  The base scenario (with its
``[sweep]``) is saved beside the table as ``sweep-scenario.toml``; a table of
another definition of the sweep (base, grid or version changed) is refused,
never mixed.  A grid with an invalid case is refused as a whole, before
anything runs.
"""

from __future__ import annotations

import csv
import io
import logging
import math
import os
import signal
import sys
import time
from dataclasses import dataclass
from pathlib import Path

from ..core.cautions import SWEEP_CAUTION
from ..core.errors import UsageError
from ..core.files import claim_out_dir, write_text
from ..core.version import __version__
from ..inputs.scenario import ScenarioError, load_scenario
from ..outputs.report import column_header, column_key
from ..inputs.sweep import _fmt_value, expand  # noqa: F401
from ..inputs.sweep_cases import build_cases, case_key, case_warnings, check_cases  # noqa: F401

TABLE_NAME = "sweep.csv"
PICTURE_NAME = "envelope.png"
BASE_NAME = "sweep-scenario.toml"

# headline numbers first, in this order, when a case's summary has them
HEADLINE = ("verdict", "warnings_count", "cl_max", "t_cl_max", "cl_min", "t_cl_min", "cm_max", "cm_min",
            "n_max", "t_n_max", "n_min", "t_n_min", "dn_max", "dn_formula", "dn_ratio", "lift_max_N",
            "root_bending_max_Nm", "n_rms", "A_bar", "N0", "N0_cut_off_Hz")
# summary numbers that describe the run rather than the result
NOT_RESULTS = {"wall_time_s", "version", "caution"}



# --------------------------------------------------------------------------
# the case function (runs on a worker)

def _numbers(summary):
    return {k: v for k, v in summary.items()
            if isinstance(v, (int, float)) and not isinstance(v, bool) and k not in NOT_RESULTS}


def run_case(payload):
    """Run one case; never raises for a problem of the case itself.

    Parameters
    ----------
    payload : dict
        ``raw`` (the case's raw scenario dict), ``base_dir``, ``source``,
        optional ``save_dir`` (write the case's run directory there).

    Returns
    -------
    dict
        ``status`` ("ok" or "failed"), ``message``, ``summary`` (the numeric
        summary entries), ``wall_time_s``, ``version``.
    """
    t0 = time.perf_counter()
    out = {"status": "ok", "message": "", "summary": {}, "version": __version__}
    try:
        from ..simulation.runner import simulate
        sc = load_scenario(payload["raw"], source_name=payload.get("source"), base_dir=payload.get("base_dir"))
        res = simulate(sc)
        out["summary"] = dict(_numbers(res.summary), **_numbers(res.summary.get("lag") or {}))
        out["summary"]["warnings_count"] = len(res.summary.get("warnings") or [])
        out["verdict"] = verdict_of(res.summary)
        if res.error:
            out["status"], out["message"] = "failed", f"run stopped early: {res.error}"
        if payload.get("save_dir"):
            res.save(payload["save_dir"], plots=False)
    except ScenarioError as e:
        out["status"], out["message"] = "failed", "; ".join(f"{p.key}: {p.message}" for p in e.problems)
    except Exception as e:  # a failing case is recorded, the sweep goes on
        out["status"], out["message"] = "failed", f"{type(e).__name__}: {e}"
    out["wall_time_s"] = time.perf_counter() - t0
    return out


def verdict_of(summary):
    """``ok``, or in a few words where the attached-flow model is out of its depth for the case
    (the lag block's validity reasons, then the run's warnings without their file prefix)."""
    val = (summary.get("lag") or {}).get("validity") or {}
    reasons = list(val.get("reasons") or []) if val.get("attached_flow_ok") is False else []
    for w in summary.get("warnings") or []:
        parts = str(w).split(": ", 3)
        reasons.append(": ".join(parts[2:]) if len(parts) >= 3 else str(w))
    return "ok" if not reasons else "out of range: " + "; ".join(dict.fromkeys(reasons))


# --------------------------------------------------------------------------
# the results table


class SweepTable:
    """``sweep.csv``: one row per case, rewritten atomically (temp file, rename) on every record."""

    FIRST = ("name", "case_key")

    def __init__(self, path, swept_keys):
        self.path = Path(path)
        self.swept = list(swept_keys)
        self.rows = {}          # case_key -> dict of column -> text
        self.order = []         # case keys of this sweep, in case order
        if self.path.exists():
            for r in read_table(self.path):
                if r.get("case_key"):
                    self.rows[r["case_key"]] = r

    def done(self, key, retry_failed=False):
        r = self.rows.get(key)
        return r is not None and (r.get("status") == "ok" or (r.get("status") == "failed" and not retry_failed))

    def record(self, case, result):
        row = {"name": case.name, "case_key": case.key}
        for k in self.swept:
            if k in case.overrides:
                row[k] = _fmt_value(case.overrides[k])
        row["status"] = result["status"]
        row["message"] = " ".join(str(result.get("message", "")).split())
        if "verdict" in result:
            row["verdict"] = " ".join(str(result["verdict"]).split())
        for k, v in result.get("summary", {}).items():
            row[k] = repr(float(v)) if isinstance(v, float) else str(v)
        if "wall_time_s" in result:
            row["wall_time_s"] = f"{result['wall_time_s']:.3f}"
        row["version"] = result.get("version", __version__)
        self.rows[case.key] = row
        self.write()

    def columns(self, rows):
        nums = []
        for r in rows:
            for k in r:
                if k not in nums:
                    nums.append(k)
        fixed = list(self.FIRST) + self.swept + ["status", "message"]
        extra_swept = [k for k in nums if k not in fixed and "." in k]
        head = [k for k in HEADLINE if k in nums]
        rest = [k for k in nums if k not in fixed and k not in extra_swept and k not in head
                and k not in ("wall_time_s", "version")]
        tail = [k for k in ("wall_time_s", "version") if k in nums]
        return fixed + extra_swept + head + rest + tail

    def sweep_rows(self):
        """The rows of this sweep's cases, in case order (missing ones left out)."""
        return [self.rows[k] for k in self.order if k in self.rows]

    def ordered_rows(self):
        """This sweep's rows in case order, then rows of earlier definitions of the sweep."""
        known = set(self.order)
        return self.sweep_rows() + [r for k, r in self.rows.items() if k not in known]

    def write(self):
        rows = self.ordered_rows()
        cols = self.columns(rows)
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow([column_header(k) for k in cols])
        w.writerows([[r.get(k, "") for k in cols] for r in rows])
        write_text(self.path, buf.getvalue())


def read_table(path):
    """Read a ``sweep.csv``: a list of dicts of key (the header less its unit) -> text."""
    with open(path, newline="") as f:
        return [{column_key(k): v for k, v in r.items() if k is not None} for r in csv.DictReader(f)]


# --------------------------------------------------------------------------
# running

def default_workers():
    return max(1, os.cpu_count() or 1)


class _NoSigint:
    """Ignore SIGINT while worker processes are started, so a Ctrl-C on the
    terminal reaches only this process, which then stops them cleanly."""

    def __enter__(self):
        try:
            self.old = signal.signal(signal.SIGINT, signal.SIG_IGN)
        except ValueError:      # not the main thread
            self.old = None
        return self

    def __exit__(self, *exc):
        if self.old is not None:
            signal.signal(signal.SIGINT, self.old)


def start_local_cluster(workers):
    """A Dask local cluster of ``workers`` processes, one thread and one numba thread each."""
    from distributed import LocalCluster
    with _NoSigint():
        return LocalCluster(n_workers=workers, threads_per_worker=1, processes=True,
                            dashboard_address=None, silence_logs=logging.ERROR,
                            env={"NUMBA_NUM_THREADS": "1", "OMP_NUM_THREADS": "1"})


def _worker_version():
    from ..core.version import __version__ as v
    return v


@dataclass
class SweepReport:
    """What a sweep did: counts and where its files are."""

    out_dir: Path
    total: int
    skipped: int = 0
    ok: int = 0
    failed: int = 0
    invalid: int = 0
    interrupted: bool = False
    finished: int = 0
    failed_total: int = 0
    picture: Path = None

    @property
    def table(self):
        return self.out_dir / TABLE_NAME


def swept_keys(sweep):
    keys = list(sweep.get("grid") or {})
    for c in sweep.get("cases") or ():
        keys += [k for k in c if k != "name" and k not in keys]
    return keys


def run_sweep(sc, out_dir, *, workers=None, scheduler=None, client=None, progress=False,
              retry_failed=False, case_fn=None, retries=2, on_record=None, warnings_to=None):
    """Run every case of ``sc``'s ``[sweep]`` not already in ``out_dir/sweep.csv``.

    Parameters
    ----------
    sc : Scenario
        With a ``[sweep]`` section.
    out_dir : path
        Folder of ``sweep.csv``, the envelope picture and (``save_runs``) ``runs/<case>``.
    workers : int, optional
        Processes of the local cluster (default: the number of cores).
    scheduler : str, optional
        Address of an existing Dask scheduler (``tcp://host:port``) instead.
    client : distributed.Client, optional
        An existing client to use (not closed here).
    progress : bool
        Draw a progress bar on stderr (only on a terminal).
    retry_failed : bool
        Run again the cases recorded as failed.
    case_fn : callable, optional
        The case function (default :func:`run_case`); must be importable by the workers.
    retries : int
        Extra tries of a case whose function raised outside its own error handling.
    on_record : callable, optional
        ``on_record(case, result)`` after each case is recorded (used by tests).
    warnings_to : file, optional
        Where to write the cases' warnings (none written when None).

    Returns
    -------
    SweepReport

    Raises
    ------
    ScenarioError
        When any case is invalid, or the envelope asks for a number no case gives (one problem a
        line; nothing is run or written then).
    UsageError
        When ``out_dir`` holds a table of another definition of the sweep.
    """
    case_fn = case_fn or run_case
    cases = check_cases(sc, stream=warnings_to if warnings_to is not None else io.StringIO())
    valid = cases
    out_dir = Path(out_dir)
    save_runs = sc.data["sweep"].get("save_runs", False)
    keys = swept_keys(sc.data["sweep"])
    claim_out_dir(out_dir, "sweep", create=True, folders=("runs",))   # ours, or refused: before running
    table = SweepTable(out_dir / TABLE_NAME, keys)
    table.order = [c.key for c in cases]
    foreign = [k for k in table.rows if k not in set(table.order)]
    if foreign:
        base = out_dir / BASE_NAME
        raise UsageError(
            f"error: {sc.source}: sweep: {table.path} holds {len(foreign)} case(s) of another definition of "
            f"this sweep (its base scenario, grid or cases, or the program's version changed"
            + (f"; that definition is in {base}" if base.is_file() else "")
            + f"): give another folder with --out, or remove {out_dir} to start a fresh table")
    write_text(out_dir / BASE_NAME, "# The base scenario of this sweep (with its [sweep]), as resolved when it "
                                    "last ran; sweep.csv holds its cases.\n" + sc.to_toml())
    rep = SweepReport(out_dir=out_dir, total=len(cases))
    todo = []
    for c in valid:
        if table.done(c.key, retry_failed):
            rep.skipped += 1
        else:
            todo.append(c)
    table.write()
    if todo:
        _run_cases(todo, sc, out_dir, table, rep, workers=workers, scheduler=scheduler, client=client,
                   progress=progress, case_fn=case_fn, retries=retries, save_runs=save_runs,
                   on_record=on_record)
    rows = table.sweep_rows()
    rep.finished = len(rows)
    rep.failed_total = sum(r.get("status") != "ok" for r in rows)
    try:
        rep.picture = write_envelope(sc, out_dir, table.sweep_rows())
    except Exception as exc:    # a picture problem must not lose the table
        print(f"unsteady: sweep: no envelope picture ({type(exc).__name__}: {exc})", file=sys.stderr)
    return rep


def _run_cases(todo, sc, out_dir, table, rep, *, workers, scheduler, client, progress, case_fn,
               retries, save_runs, on_record):
    from distributed import Client, as_completed
    from ..simulation.observers import ProgressBar

    cluster = None
    own_client = client is None
    bar = ProgressBar(len(todo), label="sweep", enabled=None if progress else False)
    futures = {}
    try:
        if client is None:
            if scheduler:
                client = Client(scheduler, timeout="20s")
                versions = set(client.run(_worker_version).values())
                if versions and versions != {__version__}:
                    raise RuntimeError(f"the workers at {scheduler} run unsteady {', '.join(sorted(versions))}, "
                                       f"this is {__version__}: install the same version there")
            else:
                cluster = start_local_cluster(workers or default_workers())
                client = Client(cluster)
        for c in todo:
            payload = {"raw": c.raw, "base_dir": str(sc.base_dir), "source": sc.source,
                       "save_dir": str((out_dir / "runs" / c.name).resolve()) if save_runs else None}
            fut = client.submit(case_fn, payload, key=f"unsteady-case-{c.key}", pure=False, retries=retries)
            futures[fut] = c
        done = 0
        bar.t0 = time.perf_counter()        # time left counts from here, not from the cluster's start
        bar.update(0, f"0 ok, 0 failed, {rep.skipped} done before")
        for fut in as_completed(list(futures)):
            c = futures[fut]
            try:
                result = fut.result()
            except Exception as exc:     # worker lost too often: not recorded, a rerun retries it
                print(f"unsteady: sweep: case {c.name} not finished ({type(exc).__name__}: {exc}); "
                      "run the sweep again to retry it", file=sys.stderr)
                continue
            table.record(c, result)
            if result["status"] == "ok":
                rep.ok += 1
            else:
                rep.failed += 1
            done += 1
            if on_record:
                on_record(c, result)
            bar.update(done, f"{rep.ok} ok, {rep.failed} failed, {rep.skipped} done before")
    except KeyboardInterrupt:
        rep.interrupted = True
    finally:
        bar.close()
        with _NoSigint():
            for f in futures:
                if not f.done():
                    f.cancel()
            if own_client and client is not None:
                try:
                    client.close(timeout=10)
                except Exception:
                    pass
            if cluster is not None:
                try:
                    cluster.close(timeout=20)
                except Exception:
                    pass


# --------------------------------------------------------------------------
# the envelope picture

def _as_float(v):
    try:
        return float(v)
    except (TypeError, ValueError):
        return math.nan


def envelope_choice(sc, rows):
    """(value, across, lines) for the envelope picture: the scenario's choice or defaults."""
    sw = sc.data["sweep"]
    env = sw.get("envelope") or {}
    keys = swept_keys(sw)
    has_n = any(math.isfinite(_as_float(r.get("n_max", ""))) for r in rows)
    value = env.get("value") or ("n_max" if has_n else "cl_max")
    across = env.get("across") or (keys[0] if keys else None)
    lines = env.get("lines") if "lines" in env else next((k for k in keys if k != across), None)
    return value, across, lines


def write_envelope(sc, out_dir, rows):
    """Plot a headline number against a swept key, one line per value of another, in the house
    style (:mod:`unsteady.outputs.pictures`): units on the axes, the gust-formula estimate as a
    dashed line where the cases have one (``dn_formula``: 1 + dn for ``n_max``, dn for ``dn_max``,
    1 for ``dn_ratio``), cases out of the model's range (verdict not ``ok``) marked, and the
    sweep caution.

    Writes ``envelope.png`` (atomically) and returns its path, or None when
    the chosen key is not numeric or no case has finished.
    """
    value, across, lines = envelope_choice(sc, rows)
    ok = [r for r in rows if r.get("status") == "ok"]
    if across is None or not ok:
        return None
    xs = [_as_float(r.get(across)) for r in ok]
    if not any(math.isfinite(x) for x in xs):
        return None
    from ..outputs.pictures import LOOK, SERIES, finish_figure, house_legend, house_style, new_figure
    from ..outputs.report import unit_of

    def label(key):
        u = unit_of(key)
        return f"{key} ({u})" if u else key
    groups = {}
    for r, x in zip(ok, xs):
        groups.setdefault(r.get(lines, "") if lines else "", []).append(
            (x, _as_float(r.get(value)), _as_float(r.get("dn_formula")), r.get("verdict", "ok") != "ok"))
    fig = new_figure(7.6, 5.0)
    ax = house_style(fig.add_subplot())
    formula_shift = {"n_max": 1.0, "dn_max": 0.0}
    drew_formula = drew_out = False
    for i, (g, pts) in enumerate(groups.items()):
        colour = SERIES[i % len(SERIES)]
        pts = sorted(p for p in pts if math.isfinite(p[0]) and math.isfinite(p[1]))
        if not pts:
            continue
        ax.plot([p[0] for p in pts], [p[1] for p in pts], marker="o", ms=4.5, color=colour, lw=1.4,
                mfc=colour, label=f"{label(lines)} = {g}" if lines else value)
        bad = [p for p in pts if p[3]]
        if bad:
            ax.plot([p[0] for p in bad], [p[1] for p in bad], "o", ms=10, mfc="none", mec=LOOK["warn"], mew=1.4)
            drew_out = True
        est = [p for p in pts if math.isfinite(p[2])]
        if est and (value in formula_shift or value == "dn_ratio"):
            y = [1.0 if value == "dn_ratio" else formula_shift[value] + p[2] for p in est]
            ax.plot([p[0] for p in est], y, ls="--", lw=1.0, color=colour, alpha=0.85)
            drew_formula = True
    if drew_formula:
        ax.plot([], [], ls="--", lw=1.0, color=LOOK["muted"],
                label="gust formula (Pratt-Walker)" if value != "dn_ratio" else "equal to the gust formula")
    if drew_out:
        ax.plot([], [], "o", ms=10, mfc="none", mec=LOOK["warn"], mew=1.4,
                label="outside the attached-flow range (see the verdict in sweep.csv)")
    ax.set_xlabel(label(across), fontsize=9)
    ax.set_ylabel(label(value), fontsize=9)
    house_legend(ax)
    notes = [f"{len(ok)} of {len(rows)} cases finished" + (f"; {sum(p[3] for g in groups.values() for p in g)} "
                                                             "outside the model's range (ringed)" if drew_out else "")]
    if drew_out:
        notes = [(notes[0], LOOK["warn"])]
    path = Path(out_dir) / PICTURE_NAME
    finish_figure(fig, path, f"{sc.title or 'sweep'}: envelope of {value}", notes, caution=SWEEP_CAUTION,
                  left=0.8, bottom=0.6, top=0.2)
    return path


# --------------------------------------------------------------------------
# the command

def add_arguments(p):
    p.add_argument("scenario", help="scenario file (TOML) with a [sweep] section")
    p.add_argument("--out", metavar="DIR", help="sweep folder (default: output.dir of the scenario + '-sweep')")
    p.add_argument("--workers", type=int, metavar="N", help="processes of the local cluster (default: the cores)")
    p.add_argument("--scheduler", metavar="ADDRESS", help="run on the Dask cluster at ADDRESS (tcp://host:port)")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                   help="override a scenario key for every case (repeatable)")
    p.add_argument("--retry-failed", action="store_true", help="run again the cases recorded as failed")
    p.add_argument("--quiet", action="store_true", help="no progress bar or report")


def main(args):
    from .common import load
    from ..core.errors import UsageError
    sc = load(args)       # prints the scenario's warnings
    if "sweep" not in sc.data:
        raise UsageError(f"error: {args.scenario}: sweep: the scenario has no [sweep] section; "
                             "add [sweep.grid] or [[sweep.cases]]")
    if args.workers is not None and args.workers < 1:
        raise UsageError(f"error: {args.scenario}: --workers: must be 1 or more, got {args.workers}")
    if args.workers is not None and args.scheduler:
        raise UsageError(f"error: {args.scenario}: --workers: give either --workers (local cluster) "
                             "or --scheduler (existing cluster), not both")
    out = Path(args.out) if args.out is not None else Path(str(sc.out_dir()) + "-sweep")
    if args.out is not None:                                  # refused before the cluster starts
        claim_out_dir(args.out, "sweep")
    else:
        claim_out_dir(out, "sweep", "output.dir", source=args.scenario)
    rep = run_sweep(sc, out, workers=args.workers, scheduler=args.scheduler,
                    progress=not args.quiet, retry_failed=args.retry_failed, warnings_to=sys.stderr)
    if rep.interrupted:
        print(f"unsteady: sweep interrupted; {rep.ok + rep.failed} cases finished this time are in "
              f"{rep.table}; run the same command again to finish the rest", file=sys.stderr)
        return 130
    if not args.quiet:
        print(f"{rep.table}: {rep.finished} of {rep.total} cases recorded ({rep.failed_total} failed); "
              f"this time {rep.ok} ran ok, {rep.failed + rep.invalid} failed, {rep.skipped} done before"
              + (f"; picture {rep.picture}" if rep.picture else ""))
        print(f"caution: {SWEEP_CAUTION}")
    # 1 when a case failed or could not be finished (the table says which)
    return 0 if rep.finished == rep.total and not rep.failed_total else 1

