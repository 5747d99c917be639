"""Tests of unsteady.sweep: case expansion, checks, hashing, the results table, and
sweeps on a Dask local cluster and on a scheduler and workers started here."""

from __future__ import annotations

import csv
import os
import signal
import socket
import subprocess
import sys
import time
from pathlib import Path

import pytest

from unsteady.apps import cli

from unsteady.apps import sweep
from unsteady.inputs import sweep_cases as sweep_spec
from unsteady.inputs.scenario import ScenarioError, default_dt, load_scenario

ROOT = Path(__file__).resolve().parents[1]
# the console scripts of the environment running the tests (any venv name)
BIN = Path(sys.executable).parent
DASK = BIN / "dask"
UNSTEADY = BIN / "unsteady"

# A small case (8 elements, 4 chords travelled) so that a sweep takes seconds.
BASE = """
title = "Trim-step sweep of a test section"
[flow]
speed = 18.0
density = 1.2
[airfoil]
shape = "naca0012"
chord = 0.20
elements = 8
[motion]
pivot = 0.25
pitch = {{ law = "step", value = 3.0, time = 0.01 }}
[run]
chords = {chords}
wake = "frozen"
"""

SIX = BASE + """
[sweep]
name = "V{{flow.speed}}-N{{airfoil.elements}}"
[sweep.grid]
"flow.speed" = [12.0, 18.0, 24.0]
airfoil.elements = [6, 8]
"""


def write(tmp_path, text, name="s.toml"):
    p = tmp_path / name
    p.write_text(text)
    return p


def rows_of(path):
    """The table's rows keyed by column (the header less its unit)."""
    return sweep.read_table(path)


RESULT_COLUMNS = ("cl_max", "t_cl_max", "cl_min", "t_cl_min", "cm_max", "cm_min", "cd_mean", "cl_final", "steps")


def direct_results(sc):
    """Each case of the sweep run one by one in this process, without Dask."""
    out = {}
    for c in sweep.build_cases(sc):
        if not c.problems:
            r = sweep.run_case({"raw": c.raw, "base_dir": str(sc.base_dir), "source": sc.source})
            out[c.name] = {k: (repr(float(v)) if isinstance(v, float) else str(v)) for k, v in r["summary"].items()}
    return out


def free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


# --------------------------------------------------------------------------
# expansion, checks, hashing (no cluster)

def test_grid_is_a_cartesian_product_then_listed_cases(tmp_path):
    # Cartesian product, last key fastest: the order of itertools.product (common practice)
    sc = load_scenario(write(tmp_path, SIX.format(chords=4) + """
[[sweep.cases]]
name = "flat-plate"
airfoil.shape = "flat"
[[sweep.cases]]
motion.pitch = { law = "sine", amplitude = 2.0, frequency = 5.0 }
"""))
    cases = sweep.expand(sc.data["sweep"])
    assert [n for n, _ in cases] == ["V12.0-N6", "V12.0-N8", "V18.0-N6", "V18.0-N8", "V24.0-N6", "V24.0-N8",
                                     "flat-plate", "case-008"]
    assert cases[3][1] == {"flow.speed": 18.0, "airfoil.elements": 8}
    # a law table is one value: it replaces the whole pitch law, not merged into the step law
    built = sweep.build_cases(sc)
    assert not any(c.problems for c in built)
    assert built[7].scenario.data["motion"]["pitch"] == {"law": "sine", "amplitude": 2.0, "frequency": 5.0}
    assert built[6].scenario.data["airfoil"]["shape"] == "flat"


def test_each_case_rederives_its_defaults(tmp_path):
    # the default step is the project's own rule U dt = c / N (scenario.default_dt);
    # density from altitude follows the 1976 standard atmosphere (unsteady.atmosphere)
    from unsteady.inputs import atmosphere
    text = (SIX.format(chords=4).replace('"flow.speed" = [12.0, 18.0, 24.0]', '"flow.altitude" = [0.0, 2000.0]')
            .replace('name = "V{flow.speed}-N{airfoil.elements}"\n', ''))
    sc = load_scenario(write(tmp_path, text))
    for c in sweep.build_cases(sc):
        s = c.scenario
        assert s.dt == pytest.approx(default_dt(0.20, 18.0, s.elements), rel=1e-15)
        assert s.duration == pytest.approx(4 * 0.20 / 18.0, rel=1e-15)
        assert s.density == pytest.approx(float(atmosphere.density(s.data["flow"]["altitude"])), rel=1e-15)
    assert {c.scenario.density for c in sweep.build_cases(sc)} != {1.2}


def test_check_reports_every_invalid_case_at_once(tmp_path, capsys):
    p = write(tmp_path, SIX.format(chords=4) + """
[[sweep.cases]]
name = "too-slow"
flow.speed = -3.0
[[sweep.cases]]
name = "odd-wake"
run.wake = "rolling"
""")
    assert cli.main(["check", str(p)]) == 2
    err = [line for line in capsys.readouterr().err.strip().splitlines()
           if not line.startswith("warning:")]          # the base's step law is warned of as impulsive
    assert len(err) == 2
    assert err[0].startswith(f"error: {p}: sweep[too-slow].flow.speed: must be >= 0.01 and <= 340 m/s")
    assert err[1].startswith(f"error: {p}: sweep[odd-wake].run.wake: must be one of")
    # a good sweep checks
    assert cli.main(["check", str(write(tmp_path, SIX.format(chords=4), "ok.toml"))]) == 0


def test_check_passes_on_case_warnings(tmp_path):
    # a 12 m/s gust at 18 m/s (atan(12/18) = 34 degrees): beyond the gust checker's 30-degree warning
    text = BASE.format(chords=4) + """
[gust]
profile = "one-minus-cosine"
amplitude = 1.0
length = 1.0
arrival = 0.01
[sweep.grid]
"gust.amplitude" = [1.0, 12.0]
"""
    sc = load_scenario(write(tmp_path, text))
    import io
    buf = io.StringIO()
    assert sweep.check_cases(sc, stream=buf)
    lines = buf.getvalue().splitlines()
    assert len(lines) == 1 and lines[0].startswith(f"warning: {sc.source}: sweep[case-002].gust.")


@pytest.mark.parametrize("section, key", [
    ('[sweep.grid]\n"flow.speed" = []\n', "sweep.grid.flow.speed"),
    ('[sweep]\ngrid = 3\n', "sweep.grid"),
    ('[sweep]\nname = "A{run.wake}"\n[sweep.grid]\n"flow.speed" = [1.0]\n', "sweep.name"),
    ('[sweep]\nname = "same"\n[sweep.grid]\n"flow.speed" = [1.0, 2.0]\n', "sweep.name"),
    ('[sweep]\nrepeat = 2\n[sweep.grid]\n"flow.speed" = [1.0]\n', "sweep.repeat"),
    ('[sweep]\nenvelope = { across = "flow.density" }\n[sweep.grid]\n"flow.speed" = [1.0]\n',
     "sweep.envelope.across"),
])
def test_bad_sweep_section(tmp_path, section, key):
    with pytest.raises(ScenarioError) as exc:
        load_scenario(write(tmp_path, BASE.format(chords=4) + section))
    assert [p.key for p in exc.value.problems] == [key]


def test_case_key_follows_the_resolved_scenario_and_version(tmp_path, monkeypatch):
    sc = load_scenario(write(tmp_path, SIX.format(chords=4)))
    a = sweep.build_cases(sc)
    b = sweep.build_cases(load_scenario(write(tmp_path, SIX.format(chords=4), "copy.toml")))
    assert [c.key for c in a] == [c.key for c in b]
    assert len({c.key for c in a}) == 6
    # an override that leaves the resolved scenario as it was gives the same key
    same = sweep.build_cases(load_scenario(write(tmp_path, SIX.format(chords=4)), ["run.start=steady"]))
    assert [c.key for c in same] == [c.key for c in a]
    longer = sweep.build_cases(load_scenario(write(tmp_path, SIX.format(chords=5), "l.toml")))
    assert not {c.key for c in longer} & {c.key for c in a}
    monkeypatch.setattr(sweep_spec, "__version__", "0.0.0-other")
    assert sweep_spec.case_key(a[0].scenario) != a[0].key


def test_a_raising_case_is_recorded_not_raised(tmp_path, monkeypatch):
    import unsteady.simulation.runner as sim

    def boom(sc, observers=(), progress=False):
        raise FloatingPointError("made to fail")
    monkeypatch.setattr(sim, "simulate", boom)
    sc = load_scenario(write(tmp_path, SIX.format(chords=4)))
    c = sweep.build_cases(sc)[0]
    r = sweep.run_case({"raw": c.raw})
    assert r["status"] == "failed" and r["message"] == "FloatingPointError: made to fail"


def test_table_rewrites_keep_earlier_rows(tmp_path):
    sc = load_scenario(write(tmp_path, SIX.format(chords=4)))
    cases = sweep.build_cases(sc)
    t = sweep.SweepTable(tmp_path / "sweep.csv", ["flow.speed", "airfoil.elements"])
    t.order = [c.key for c in cases]
    t.record(cases[1], {"status": "ok", "summary": {"cl_max": 0.1 + 0.2}, "wall_time_s": 1.0})
    t.record(cases[0], {"status": "failed", "message": "a\nb", "summary": {}})
    rows = rows_of(tmp_path / "sweep.csv")
    assert [r["name"] for r in rows] == [cases[0].name, cases[1].name]
    assert rows[1]["cl_max"] == repr(0.1 + 0.2)           # round-trips exactly
    assert float(rows[1]["cl_max"]) == 0.1 + 0.2
    assert rows[0]["message"] == "a b"
    again = sweep.SweepTable(tmp_path / "sweep.csv", [])
    assert again.done(cases[1].key) and again.done(cases[0].key) and not again.done(cases[0].key, True)
    assert not list(tmp_path.glob(".sweep.csv.*"))       # no temporary file left


# --------------------------------------------------------------------------
# the local cluster

def test_local_cluster_matches_one_by_one_and_resumes(tmp_path):
    text = SIX.format(chords=4).replace("[sweep]\n", "[sweep]\nsave_runs = true\n")
    sc = load_scenario(write(tmp_path, text))
    want = direct_results(sc)
    assert len(want) == 6
    out = tmp_path / "out"
    rep = sweep.run_sweep(sc, out, workers=2)
    assert (rep.ok, rep.failed, rep.invalid, rep.skipped) == (6, 0, 0, 0)
    rows = rows_of(out / "sweep.csv")
    assert len(rows) == 6
    for r in rows:
        assert r["status"] == "ok"
        for k in RESULT_COLUMNS:
            assert r[k] == want[r["name"]][k], (r["name"], k)     # bit for bit
    assert (out / "envelope.png").stat().st_size > 1000
    assert (out / "sweep-scenario.toml").is_file()
    # each case's own run directory, as `unsteady run` writes it
    import json
    saved = json.loads((out / "runs" / "V18.0-N8" / "summary.json").read_text())
    assert repr(saved["cl_max"]) == want["V18.0-N8"]["cl_max"]
    # again: nothing reruns, the table is unchanged
    before = (out / "sweep.csv").read_text()
    rep2 = sweep.run_sweep(sc, out, workers=2)
    assert (rep2.ok, rep2.failed, rep2.skipped) == (0, 0, 6)
    assert (out / "sweep.csv").read_text() == before


def _env():
    env = dict(os.environ, NUMBA_NUM_THREADS="1", PYTHONUNBUFFERED="1")
    env.pop("PYTEST_CURRENT_TEST", None)
    return env


def test_interrupted_sweep_resumes_without_rerunning(tmp_path):
    # 6 cases of 60 chords on one worker: seconds each, so a Ctrl-C lands mid-sweep
    text = SIX.format(chords=60).replace("airfoil.elements = [6, 8]", "airfoil.elements = [12, 14]")
    p = write(tmp_path, text)
    out = tmp_path / "out"
    cmd = [str(UNSTEADY), "sweep", str(p), "--out", str(out), "--workers", "1", "--quiet"]
    proc = subprocess.Popen(cmd, env=_env(), start_new_session=True, stderr=subprocess.PIPE, text=True)
    try:
        t_end = time.monotonic() + 90
        while time.monotonic() < t_end:
            if (out / "sweep.csv").exists() and len(rows_of(out / "sweep.csv")) >= 1:
                break
            if proc.poll() is not None:
                break
            time.sleep(0.05)
        os.killpg(proc.pid, signal.SIGINT)       # as Ctrl-C on a terminal: the whole group
        _, err = proc.communicate(timeout=60)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
            proc.wait()
    assert proc.returncode == 130, err
    assert "Traceback" not in err
    first = {r["case_key"]: r for r in rows_of(out / "sweep.csv")}
    assert 1 <= len(first) < 6
    res = subprocess.run(cmd[:-1], env=_env(), capture_output=True, text=True, timeout=180)
    assert res.returncode == 0, res.stderr
    assert f"{len(first)} done before" in res.stdout
    rows = rows_of(out / "sweep.csv")
    assert len(rows) == 6 and all(r["status"] == "ok" for r in rows)
    for r in rows:                                   # finished cases were not run again
        if r["case_key"] in first:
            assert r == first[r["case_key"]]


# --------------------------------------------------------------------------
# a real scheduler and two workers started here

def test_scheduler_and_workers_survive_a_killed_worker(tmp_path):
    from distributed import Client
    text = SIX.format(chords=40).replace("airfoil.elements = [6, 8]", "airfoil.elements = [10, 12]")
    sc = load_scenario(write(tmp_path, text))
    port = free_port()
    addr = f"tcp://127.0.0.1:{port}"
    procs = []

    def start(args):
        procs.append(subprocess.Popen([str(DASK)] + args, env=_env(), start_new_session=True,
                                      stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL))
        return procs[-1]
    client = None
    try:
        start(["scheduler", "--host", "127.0.0.1", "--port", str(port), "--no-dashboard"])
        workers = [start(["worker", addr, "--nthreads", "1", "--nworkers", "1", "--host", "127.0.0.1",
                          "--no-dashboard", "--name", f"w{i}", "--death-timeout", "60"]) for i in range(2)]
        client = Client(addr, timeout="60s")
        client.wait_for_workers(2, timeout=60)
        killed = []
        recorded = []

        def kill_one(case, result):
            recorded.append(case.name)
            if not killed:
                os.killpg(workers[1].pid, signal.SIGKILL)      # the worker and its nanny
                killed.append(len(recorded))
        rep = sweep.run_sweep(sc, tmp_path / "out", client=client, on_record=kill_one)
        assert killed == [1]                 # killed after the first of 6 cases: mid-sweep
        assert len(client.scheduler_info()["workers"]) == 1
        assert workers[1].wait(timeout=10) is not None
        assert rep.ok == 6 and rep.failed == 0
        rows = rows_of(tmp_path / "out" / "sweep.csv")
        want = direct_results(sc)
        assert sorted(r["name"] for r in rows) == sorted(want)
        for r in rows:
            assert r["status"] == "ok"
            for k in RESULT_COLUMNS:
                assert r[k] == want[r["name"]][k], (r["name"], k)
    finally:
        if client is not None:
            client.close(timeout=10)
        for pr in reversed(procs):
            if pr.poll() is None:
                try:
                    os.killpg(pr.pid, signal.SIGTERM)
                    pr.wait(timeout=10)
                except (subprocess.TimeoutExpired, ProcessLookupError):
                    os.killpg(pr.pid, signal.SIGKILL)
                    pr.wait()


def test_sweep_command_through_a_scheduler_address(tmp_path):
    # the --scheduler path of the command, on a scheduler with one in-process worker
    from distributed import LocalCluster
    p = write(tmp_path, SIX.format(chords=4))
    with LocalCluster(n_workers=1, threads_per_worker=1, processes=False, dashboard_address=None) as lc:
        assert cli.main(["sweep", str(p), "--out", str(tmp_path / "o"), "--scheduler", lc.scheduler_address,
                         "--quiet"]) == 0
    rows = rows_of(tmp_path / "o" / "sweep.csv")
    assert len(rows) == 6 and {r["status"] for r in rows} == {"ok"}


def test_sweep_command_bad_input_writes_nothing(tmp_path, capsys):
    p = write(tmp_path, BASE.format(chords=4) + '[sweep.grid]\n"flow.speed" = [-1.0, -2.0]\n')
    assert cli.main(["sweep", str(p), "--out", str(tmp_path / "o")]) == 2
    err = [line for line in capsys.readouterr().err.strip().splitlines()
           if not line.startswith("warning:")]          # the base's step law is warned of as impulsive
    assert len(err) == 2 and all(e.startswith(f"error: {p}: sweep[case-00") for e in err)
    assert not (tmp_path / "o").exists()
    assert cli.main(["sweep", str(write(tmp_path, BASE.format(chords=4), "n.toml"))]) == 2


# --------------------------------------------------------------------------
# the demo scenario

def test_drone_gust_envelope_scenario_checks():
    sc = load_scenario(ROOT / "scenarios" / "drone-gust-envelope.toml")
    cases = sweep.build_cases(sc)
    assert sweep.check_cases(sc)
    assert len(cases) == 15
    lengths = sorted({c.scenario.data["gust"]["length"] for c in cases})
    # 1-cosine gust lengths from 2 to 50 chords, as the scenario's comment says
    assert lengths[0] == pytest.approx(2 * sc.chord) and lengths[-1] == pytest.approx(50 * sc.chord)


# --------------------------------------------------------------------------
# refusals before running, the table of a report, the envelope

def test_a_grid_with_an_invalid_case_is_refused_as_a_whole_before_running(tmp_path, capsys):
    p = write(tmp_path, SIX.format(chords=4).replace('"flow.speed" = [12.0, 18.0, 24.0]',
                                                     '"flow.speed" = [12.0, -18.0, 24.0]'))
    out = tmp_path / "o"
    assert cli.main(["sweep", str(p), "--out", str(out), "--quiet"]) == 2
    err = [x for x in capsys.readouterr().err.splitlines() if x.startswith("error:")]
    # one problem (the speed -18 in its two cases), one line
    assert len(err) == 1 and err[0].startswith(f"error: {p}: sweep[V-18.0-N6, V-18.0-N8].flow.speed: ")
    assert not out.exists()


def test_a_rerun_after_the_base_scenario_changed_is_refused(tmp_path, capsys):
    p = write(tmp_path, SIX.format(chords=4).replace("airfoil.elements = [6, 8]", "airfoil.elements = [6]"))
    out = tmp_path / "o"
    assert cli.main(["sweep", str(p), "--out", str(out), "--workers", "1", "--quiet"]) == 0
    before = (out / "sweep.csv").read_text()
    saved = (out / "sweep-scenario.toml").read_text()
    assert "[sweep]" in saved and "density = 1.2" in saved
    p.write_text(p.read_text().replace("density = 1.2", "density = 1.1"))
    capsys.readouterr()
    assert cli.main(["sweep", str(p), "--out", str(out), "--workers", "1", "--quiet"]) == 2
    err = [x for x in capsys.readouterr().err.splitlines() if not x.startswith("warning:")]   # the step law
    assert len(err) == 1 and "another definition of this sweep" in err[0] and "--out" in err[0]
    assert (out / "sweep.csv").read_text() == before                 # never mixed
    assert (out / "sweep-scenario.toml").read_text() == saved


def test_gust_envelope_table_has_units_verdicts_formula_and_loads(tmp_path):
    """A 1-cosine gust sweep of the drone with span: units in the headers, the verdict, the
    gust-formula estimate (Pratt-Walker, NACA Report 1206) and ratio, lift and root bending."""
    text = (ROOT / "scenarios" / "drone-gust-1cos.toml").read_text()
    p = write(tmp_path, text + '\n[sweep]\nenvelope = { value = "n_max", across = "gust.length" }\n'
                              '[sweep.grid]\n"gust.length" = [1.0, 5.0]\n"gust.amplitude" = [2.0, 14.0]\n')
    sc = load_scenario(p, overrides=["run.model=linear", "aircraft.span=2.2"])
    rep = sweep.run_sweep(sc, tmp_path / "o", workers=1)
    assert rep.ok == 4
    header = (tmp_path / "o" / "sweep.csv").read_text().splitlines()[0].split(",")
    for h in ("gust.length (m)", "gust.amplitude (m/s)", "t_cl_max (s)", "t_n_max (s)", "lift_max_N",
              "root_bending_max_Nm", "dn_formula", "dn_ratio", "verdict", "warnings_count",
              "peak_effective_alpha_deg", "wall_time_s"):
        assert h in header, h
    rows = rows_of(tmp_path / "o" / "sweep.csv")
    for r in rows:
        assert float(r["dn_ratio"]) == pytest.approx((float(r["n_max"]) - 1.0) / float(r["dn_formula"]), rel=1e-9)
        assert float(r["lift_max_N"]) == pytest.approx(float(r["n_max"]) * 3.0 * 9.80665, rel=1e-9)
    verdicts = {r["name"]: r["verdict"] for r in rows}
    assert verdicts["case-001"] == "ok"                       # 2 m/s over 1 m: gentle
    assert verdicts["case-004"].startswith("out of range")    # 14 m/s: beyond the attached-flow range
    from unsteady.outputs.pictures import written_by_unsteady
    assert written_by_unsteady(tmp_path / "o" / "envelope.png")


@pytest.mark.parametrize("name, extra", [("drone-gust-1cos", ["run.model=linear"]),
                                         ("drone-turbulence", ["run.model=linear", "run.duration=20"]),
                                         ("pitch-up", ["run.model=linear"]), ("flapping-plate", ["run.model=linear"]),
                                         ("perching-lev", ["run.chords=2", "airfoil.elements=12"]),
                                         ("drone-tail-gust-pitch", ["run.chords=12"])])
def test_possible_numbers_cover_what_the_runs_give(name, extra):
    """The envelope check's list of numbers (sweep_cases.possible_numbers) against real runs."""
    import unsteady
    sc = load_scenario(ROOT / "scenarios" / f"{name}.toml", overrides=["output.plots=false"] + extra)
    res = unsteady.simulate(sc)
    got = set(sweep.run_case({"raw": sc.raw, "base_dir": str(sc.base_dir), "source": sc.source})["summary"])
    assert res.summary and got <= set(sweep_spec.possible_numbers(sc)), got - set(sweep_spec.possible_numbers(sc))
