"""The command line: exit codes, one-line errors, nothing half-written."""

import json
import subprocess
import sys

import numpy as np
import pytest

from unsteady.apps.cli import main

GOOD = """
title = "cli test"
[flow]
speed = 10.0
density = 1.2
[airfoil]
shape = "flat"
chord = 0.2
elements = 12
[motion]
pitch = { law = "ramp", from = 0.0, to = 4.0, start = 0.005, duration = 0.02 }
[run]
chords = 3
[output]
plots = false
"""


def test_run_writes_run_directory(tmp_path, capsys):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    out = tmp_path / "out"
    assert main(["run", str(f), "--out", str(out), "--quiet"]) == 0
    names = {p.name for p in out.iterdir()}
    assert {"history.csv", "summary.json", "scenario.toml", "snapshots.npz"} <= names
    header = (out / "history.csv").read_text().splitlines()[0].split(",")
    assert header[:7] == ["t", "chords", "pitch_deg", "height_m", "cl", "cd", "cm"]
    s = json.loads((out / "summary.json").read_text())
    for k in ("cl_max", "cl_min", "t_cl_max", "cm_max", "cm_min", "steps", "wall_time_s", "version"):
        assert k in s
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".")]   # no temporaries left


def test_set_override_and_check(tmp_path, capsys):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    assert main(["check", str(f), "--set", "airfoil.elements=20"]) == 0
    assert "20 elements" in capsys.readouterr().out


def test_bad_input_exit_2_one_line_nothing_written(tmp_path, capsys):
    f = tmp_path / "bad.toml"
    f.write_text(GOOD.replace("speed = 10.0", "speed = -10.0").replace("elements = 12", "elements = 2"))
    out = tmp_path / "never"
    assert main(["run", str(f), "--out", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 2 and all(line.startswith(f"error: {f}: ") for line in err)
    assert not out.exists() and "Traceback" not in "".join(err)


def test_missing_file_exit_2(tmp_path, capsys):
    assert main(["run", str(tmp_path / "nope.toml")]) == 2
    assert "no such file" in capsys.readouterr().err


def test_bad_override_exit_2(tmp_path, capsys):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    assert main(["run", str(f), "--set", "airfoil.element=30", "--out", str(tmp_path / "o")]) == 2
    assert "did you mean 'elements'" in capsys.readouterr().err
    assert not (tmp_path / "o").exists()


def test_entry_point_runs_as_module(tmp_path):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    r = subprocess.run([sys.executable, "-m", "unsteady", "check", str(f)], capture_output=True, text=True)
    assert r.returncode == 0, r.stderr


def test_rerun_replaces_directory_atomically(tmp_path):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    out = tmp_path / "out"
    assert main(["run", str(f), "--out", str(out), "--quiet", "--no-plots"]) == 0
    assert main(["run", str(f), "--out", str(out), "--quiet", "--set", "run.chords=2",
                 "--set", "output.plots=true"]) == 0
    assert (out / "wake.png").exists()
    t = np.loadtxt(out / "history.csv", delimiter=",", skiprows=1)[:, 1]
    assert t[-1] == pytest.approx(2.0, abs=0.1)
    # the pictures of that run are its own: a run without them replaces it whole
    assert main(["run", str(f), "--out", str(out), "--quiet"]) == 0
    assert not (out / "wake.png").exists()


def test_out_never_deletes_a_folder_that_is_not_a_run(tmp_path, capsys):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    victim = tmp_path / "victim"
    (victim / "precious").mkdir(parents=True)
    (victim / "precious" / "data.txt").write_text("keep")
    assert main(["run", str(f), "--out", str(victim), "--quiet"]) == 2
    assert (victim / "precious" / "data.txt").read_text() == "keep"
    assert "--out: holds precious, which unsteady did not write" in capsys.readouterr().err
    # an empty folder is fine, and so is a path under a new folder
    (tmp_path / "empty").mkdir()
    assert main(["run", str(f), "--out", str(tmp_path / "empty"), "--quiet"]) == 0
    assert main(["run", str(f), "--out", str(tmp_path / "new" / "deeper"), "--quiet"]) == 0


def test_out_under_a_file_is_refused_before_running(tmp_path, capsys):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    (tmp_path / "afile").write_text("x")
    assert main(["run", str(f), "--out", str(tmp_path / "afile" / "x")]) == 2
    assert "is a file" in capsys.readouterr().err


def test_run_folder_permissions_follow_umask(tmp_path):
    import os
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    old = os.umask(0o022)
    try:
        assert main(["run", str(f), "--out", str(tmp_path / "o"), "--quiet"]) == 0
    finally:
        os.umask(old)
    assert (tmp_path / "o").stat().st_mode & 0o777 == 0o755


def test_usage_errors_are_one_line_exit_2(capsys):
    with pytest.raises(SystemExit) as ei:
        main(["run"])
    assert ei.value.code == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("error: ") and "scenario" in err[0]


@pytest.fixture
def saved_run(tmp_path):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    out = tmp_path / "run"
    assert main(["run", str(f), "--out", str(out), "--quiet"]) == 0
    return out


def _damage(run, name, how):
    p = run / name
    data = p.read_bytes()
    p.write_bytes(data[: len(data) // 2] if how == "truncate" else b"\x00garbage\x01" + data[7:])


@pytest.mark.parametrize("name,how", [("history.csv", "truncate"), ("summary.json", "truncate"),
                                      ("summary.json", "garble"), ("snapshots.npz", "truncate"),
                                      ("scenario.toml", "garble")])
def test_damaged_run_files_are_one_line_exit_2(saved_run, name, how, capsys):
    _damage(saved_run, name, how)
    capsys.readouterr()
    for argv in (["pictures", str(saved_run), "--quiet"],
                 ["animate", str(saved_run), "--out", str(saved_run / "f.gif"), "--quiet"]):
        assert main(argv) == 2, argv
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and err[0].startswith(f"error: {saved_run}: {name}: "), (argv, err)
    assert not (saved_run / "f.gif").exists()


def test_a_truncated_history_names_its_line(saved_run, capsys):
    _damage(saved_run, "history.csv", "truncate")
    n_lines = (saved_run / "history.csv").read_text().count("\n") + 1
    assert main(["compare", str(saved_run), "--out", str(saved_run.parent / "c.png")]) == 2
    err = capsys.readouterr().err.strip()
    assert f"line {n_lines} has" in err and "\n" not in err
    assert not (saved_run.parent / "c.png").exists()


def test_the_loader_checks_what_the_caller_needs(saved_run):
    from unsteady.core.errors import UsageError
    from unsteady.outputs.rundir import load_run
    (saved_run / "scenario.toml").unlink()
    res = load_run(saved_run)                   # not needed: absent is fine
    assert res.scenario is None and len(res.history["t"]) > 10
    with pytest.raises(UsageError, match=r"scenario.toml: missing"):
        load_run(saved_run, need=("scenario.toml",))
    with pytest.raises(UsageError, match=r"history.csv: lacks the column\(s\) lift_N"):
        load_run(saved_run, columns=("cl", "lift_N"))
    with pytest.raises(UsageError, match=r"summary.json: lacks the key\(s\) n_max"):
        load_run(saved_run, keys=("cl_max", "n_max"))


def test_an_interrupt_inside_a_c_callback_is_repeated_and_not_reported():
    # A Ctrl-C that lands while a C library calls back into Python (numba
    # compiling a kernel) is dropped by Python with an "Exception ignored"
    # report; the program repeats the interrupt until it unwinds and keeps
    # that report off the one-line message (common practice for signal handling).
    code = (
        "import ctypes, signal, sys, time\n"
        "from unsteady.apps import cli\n"
        "sys.unraisablehook = getattr(cli, '_quiet_unraisable', sys.unraisablehook)\n"
        "signal.signal(signal.SIGINT, cli._on_signal)\n"
        "CB = ctypes.CFUNCTYPE(None)\n"
        "def inside():\n"
        "    signal.raise_signal(signal.SIGINT)\n"
        "CB(inside)()\n"
        "try:\n"
        "    time.sleep(5)\n"
        "    print('ran on')\n"
        "except KeyboardInterrupt:\n"
        "    cli._settle()\n"
        "    print('interrupted')\n")
    p = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert p.stdout.strip() == "interrupted"
    assert p.stderr == ""
