"""Files are never lost: outputs replace only what the tool wrote, unusable outputs are refused before
computing, a full disk or a killed process leaves the earlier output (or the new one) and no
leftovers, Ctrl-C and SIGTERM are one line at any point, damaged run folders are one line."""

import errno
import json
import os
import shutil
import signal
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest

from unsteady.apps.cli import main
from unsteady.core import files
from unsteady.outputs import rundir

GOOD = """
title = "files test"
[flow]
speed = 10.0
density = 1.2
[airfoil]
shape = "flat"
chord = 0.2
elements = 12
[motion]
pitch = { law = "ramp", from = 0.0, to = 4.0, start = 0.005, duration = 0.02, smoothing = 0.004 }
[run]
chords = 3
[output]
plots = false
"""

ROOT = Path(__file__).resolve().parents[1]


def _env():
    env = dict(os.environ, NUMBA_NUM_THREADS="1", PYTHONPATH=str(ROOT))
    env.pop("PYTEST_CURRENT_TEST", None)
    return env


@pytest.fixture
def scen(tmp_path):
    f = tmp_path / "good.toml"
    f.write_text(GOOD)
    return f


def _listing(root):
    """Every path under ``root`` with its size and digest (what must not change)."""
    out = {}
    for p in sorted(Path(root).rglob("*")):
        out[str(p.relative_to(root))] = files.digest(p) if p.is_file() else "dir"
    return out


def _err(capsys):
    return capsys.readouterr().err.strip().splitlines()


@pytest.fixture
def no_computing(monkeypatch):
    """Make any simulation fail loudly: a refusal must come before computing."""
    import unsteady.simulation.runner as runner

    def never(*a, **k):
        raise AssertionError("computed although the output was unusable")
    monkeypatch.setattr(runner, "simulate", never)


def _leftovers(folder):
    return [n for n in os.listdir(folder) if files._TEMP.match(n) or n.startswith(".unsteady-probe")]


# ---------------------------------------------------------------------------
# 1, 2: only what the tool can prove it wrote is replaced

def test_a_users_folder_that_looks_like_a_run_is_refused_before_computing(tmp_path, scen, capsys, no_computing):
    # the folder of the report: a history, a photograph and a flight film of the user's own
    victim = tmp_path / "flight-test"
    victim.mkdir()
    (victim / "history.csv").write_text("t,cl,cd,cm\n0,0.1,0.01,0\n")
    (victim / "tunnel-photo.png").write_bytes(b"\x89PNG\r\n\x1a\n photo")
    (victim / "test-flight.mp4").write_bytes(b"\x00\x00\x00\x18ftypmp42 film")
    before = _listing(tmp_path)
    assert main(["run", str(scen), "--out", str(victim), "--quiet"]) == 2
    err = _err(capsys)
    assert len(err) == 1 and err[0].startswith(f"error: {victim}: --out: holds history.csv, "), err
    assert _listing(tmp_path) == before


def test_a_folder_named_by_output_dir_is_refused_naming_the_scenario_and_key(tmp_path, capsys, no_computing):
    victim = tmp_path / "photos"
    victim.mkdir()
    (victim / "wing.jpg").write_bytes(b"\xff\xd8 a photograph")
    scen = tmp_path / "s.toml"
    scen.write_text(GOOD.replace("plots = false", f"plots = false\ndir = '{victim}'"))
    before = _listing(tmp_path)
    assert main(["run", str(scen), "--quiet"]) == 2
    err = _err(capsys)
    assert len(err) == 1 and err[0].startswith(f"error: {scen}: output.dir: {victim} holds wing.jpg, "), err
    assert _listing(tmp_path) == before


def test_an_earlier_run_is_replaced_and_anything_added_or_changed_refused(tmp_path, scen, capsys):
    out = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    assert files.read_record(out)["kind"] == "run"
    assert main(["run", str(scen), "--out", str(out), "--quiet", "--set", "run.chords=2"]) == 0
    t = np.loadtxt(out / "history.csv", delimiter=",", skiprows=1)[:, 1]
    assert t[-1] == pytest.approx(2.0, abs=0.1)                  # replaced
    # a file of the user's dropped into the run: refused, named, kept
    (out / "notes.txt").write_text("my notes")
    before = _listing(tmp_path)
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 2
    err = _err(capsys)
    assert len(err) == 1 and "--out: holds notes.txt, which unsteady did not write" in err[0]
    assert _listing(tmp_path) == before
    (out / "notes.txt").unlink()
    # a file of the run edited by hand is the user's now
    with open(out / "history.csv", "a") as f:
        f.write("# checked by hand\n")
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 2
    assert "holds history.csv, changed since unsteady wrote it" in _err(capsys)[0]


def test_films_and_pages_join_the_record_of_their_run(tmp_path, scen, capsys):
    out = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    assert main(["animate", str(out), "--out", str(out / "film.gif"), "--frames", "4",
                 "--size", "96x64", "--quiet"]) == 0
    rec = files.read_record(out)["files"]
    assert rec["film.gif"]["sha256"] == files.digest(out / "film.gif")
    assert files.foreign_entry(out, "run") is None
    # the film is the run's: a rerun replaces the folder, film and all
    assert main(["run", str(scen), "--out", str(out), "--quiet", "--set", "run.chords=2"]) == 0
    assert not (out / "film.gif").exists()


def test_animate_never_overwrites_a_file_it_did_not_write(tmp_path, scen, capsys):
    run = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    mine = tmp_path / "holiday.mp4"
    mine.write_bytes(b"\x00\x00\x00\x18ftypmp42 not a film of the tool's")
    before = _listing(tmp_path)
    for target in (mine, run / "film.mp4"):
        if target.parent == run:                     # a foreign film inside the run folder too
            shutil.copy(mine, target)
            before = _listing(tmp_path)
        assert main(["animate", str(run), "--out", str(target), "--frames", "3", "--size", "96x64",
                     "--quiet"]) == 2
        err = _err(capsys)
        assert len(err) == 1 and err[0].startswith(f"error: {target}: --out: exists and was not written "
                                                   "by unsteady"), err
        assert _listing(tmp_path) == before
    (run / "film.mp4").unlink()
    # a film of ours (marked inside, also outside any run folder) is replaced
    film = tmp_path / "ours.mp4"
    for _ in range(2):
        assert main(["animate", str(run), "--out", str(film), "--frames", "3", "--size", "96x64",
                     "--quiet"]) == 0
    assert files.has_mark(film) and not _leftovers(tmp_path)
    import imageio
    with imageio.get_reader(film) as reader:         # the mark does not disturb a reader
        assert sum(1 for _ in reader) == 3


def test_a_sweep_folder_is_claimed_before_running(tmp_path, capsys):
    text = GOOD + '[sweep.grid]\n"flow.speed" = [10.0, 12.0]\n'
    scen = tmp_path / "s.toml"
    scen.write_text(text)
    users = tmp_path / "mine"
    users.mkdir()
    (users / "sweep.csv").write_text("speed,lift\n10,1.2\n")
    before = _listing(tmp_path)
    assert main(["sweep", str(scen), "--out", str(users), "--quiet"]) == 2
    err = _err(capsys)
    assert len(err) == 1 and err[0].startswith(f"error: {users}: --out: holds sweep.csv, which unsteady "
                                               "did not write"), err
    assert _listing(tmp_path) == before
    # a run folder is not a sweep folder, and the other way round
    run = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    assert main(["sweep", str(scen), "--out", str(run), "--quiet"]) == 2
    assert "is a run folder of unsteady, not a sweep folder" in _err(capsys)[0]
    # the function the sweep uses makes the folder and its record, and accepts it again
    d = files.claim_out_dir(tmp_path / "sw", "sweep", create=True, folders=("runs",))
    files.write_text(d / "sweep.csv", "name\n")
    files.record(d / "sweep.csv")
    assert files.claim_out_dir(d, "sweep") == d
    assert main(["run", str(scen), "--out", str(d), "--quiet"]) == 2
    assert "is a sweep folder of unsteady, not a run folder" in _err(capsys)[0]


@pytest.mark.parametrize("command", ["run", "animate", "report", "sweep"])
def test_an_empty_out_is_refused(tmp_path, scen, capsys, command):
    run = tmp_path / "run"
    if command in ("animate", "report"):
        assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    if command == "sweep":
        scen.write_text(GOOD + '[sweep.grid]\n"flow.speed" = [10.0, 12.0]\n')
    before = _listing(tmp_path)
    cwd = os.getcwd()
    os.chdir(tmp_path)                 # an empty path must not fall back to a default either
    try:
        target = str(run) if command in ("animate", "report") else str(scen)
        assert main([command, target, "--out", "", "--quiet"]) == 2
    finally:
        os.chdir(cwd)
    err = _err(capsys)
    assert len(err) == 1 and err[0].startswith("error: -: --out: is empty"), err
    assert _listing(tmp_path) == before


# ---------------------------------------------------------------------------
# 2: writability before computing; a full disk

def test_an_unwritable_out_is_refused_before_computing(tmp_path, scen, capsys, no_computing):
    for out in ("/proc/x", "/proc/self/x/y", str(scen / "x")):
        assert main(["run", str(scen), "--out", out, "--quiet"]) == 2, out
        err = _err(capsys)
        assert len(err) == 1 and err[0].startswith(f"error: {out}: --out: "), err
        assert "Traceback" not in err[0]


def _read_only(folder, argv):
    """``python -m unsteady argv`` with ``folder`` read-only: by its permissions for a user, by a
    private read-only bind mount for the superuser (whom permissions do not stop)."""
    cmd = [sys.executable, "-m", "unsteady", *argv]
    if os.geteuid() != 0:
        mode = folder.stat().st_mode
        folder.chmod(0o555)
        try:
            return subprocess.run(cmd, capture_output=True, text=True, env=_env())
        finally:
            folder.chmod(mode)
    if not shutil.which("unshare"):
        pytest.skip("superuser without unshare: no way to make a folder read-only")
    script = ('mount --make-rprivate / && mount --bind "$1" "$1" && mount -o remount,bind,ro "$1" '
              '|| exit 99; shift; exec "$@"')
    r = subprocess.run(["unshare", "-m", "sh", "-c", script, "sh", str(folder), *cmd],
                       capture_output=True, text=True, env=_env())
    if r.returncode == 99:
        pytest.skip("superuser who cannot make a read-only mount here")
    return r


def test_a_read_only_parent_or_earlier_run_is_refused_before_computing(tmp_path, scen):
    parent = tmp_path / "locked"
    parent.mkdir()
    r = _read_only(parent, ["run", str(scen), "--out", str(parent / "new"), "--quiet"])
    assert r.returncode == 2, r.stderr
    lines = r.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith(f"error: {parent / 'new'}: --out: cannot be written: no file can be made in {parent} "), lines
    assert os.listdir(parent) == []
    run = tmp_path / "earlier"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    before = _listing(tmp_path)
    r = _read_only(run, ["run", str(scen), "--out", str(run), "--quiet"])
    assert r.returncode == 2, r.stderr
    lines = r.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith(f"error: {run}: --out: cannot be written: no file can be made in {run} "), lines
    assert _listing(tmp_path) == before


def test_a_full_disk_while_saving_keeps_the_earlier_run_and_leaves_nothing(tmp_path, scen, capsys, monkeypatch):
    out = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    before = _listing(tmp_path)

    def full(path, **arrays):              # the snapshots fill the disk half way through
        with open(path, "wb") as f:
            f.write(b"PK\x03\x04 half")
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC), str(path))
    monkeypatch.setattr(rundir.np, "savez_compressed", full)
    assert main(["run", str(scen), "--out", str(out), "--quiet", "--set", "run.chords=2"]) == 1
    err = _err(capsys)
    assert len(err) == 1 and "No space left on device" in err[0] and "earlier run there is intact" in err[0], err
    assert _listing(tmp_path) == before
    assert not _leftovers(tmp_path) and not _leftovers(out)
    # a new folder: nothing at all is left
    assert main(["run", str(scen), "--out", str(tmp_path / "fresh"), "--quiet"]) == 1
    assert "nothing was left behind" in _err(capsys)[0]
    assert _listing(tmp_path) == before


# ---------------------------------------------------------------------------
# 3: leftovers, unique temporaries, signals

KILLER = r"""
import os, signal, sys
from unsteady.core import files
from unsteady.outputs import rundir
point, sig = sys.argv[1], getattr(signal, sys.argv[2])

def die():
    os.kill(os.getpid(), sig)
    raise SystemExit("the signal should have stopped the process")

if point == "filling":          # history.csv written, summary.json not yet
    orig_json = rundir._jsonable
    rundir._jsonable = lambda x: die()
elif point == "recorded":       # the new folder complete, not yet in place
    orig_record = files.write_record
    def write_record(*a, **k):
        orig_record(*a, **k)
        die()
    files.write_record = write_record
elif point == "swapped":        # the new folder in place, the earlier one not yet deleted
    orig_swap = files._swap_in
    def swap(*a, **k):
        orig_swap(*a, **k)
        die()
    files._swap_in = swap
elif point == "between-renames":   # a system that cannot swap in one step, cut in the middle
    files._exchange = lambda a, b: False
    orig_rename = os.rename
    def rename(a, b):
        orig_rename(a, b)
        if str(b).endswith(os.sep + "x"):
            die()
    os.rename = rename
from unsteady.apps.cli import main
sys.argv = ["unsteady", "run", sys.argv[3], "--out", sys.argv[4], "--quiet", "--set", "run.chords=2"]
sys.exit(main())
"""


def _consistent(folder):
    """The folder is a complete run of the tool: every file its record lists, unchanged."""
    rec = files.read_record(folder)
    return (rec is not None and rec["complete"] and files.foreign_entry(folder, "run") is None
            and {"history.csv", "summary.json", "scenario.toml", "snapshots.npz"} <= set(rec["files"]))


def _chords(folder):
    return float(np.loadtxt(folder / "history.csv", delimiter=",", skiprows=1)[-1, 1])


@pytest.mark.parametrize("point,expect", [("filling", "earlier"), ("swapped", "new"),
                                          ("between-renames", "moved aside")])
def test_sigkill_while_saving_leaves_a_whole_run_and_the_next_run_cleans(tmp_path, scen, point, expect):
    out = tmp_path / "out"
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    earlier = _listing(out)
    script = tmp_path / "killer.py"
    script.write_text(KILLER)
    r = subprocess.run([sys.executable, str(script), point, "SIGKILL", str(scen), str(out)],
                       capture_output=True, text=True, env=_env(), timeout=300)
    assert r.returncode == -signal.SIGKILL, r.stderr
    if expect == "earlier":
        assert _listing(out) == earlier and _consistent(out)
    elif expect == "new":
        assert _consistent(out) and _chords(out) == pytest.approx(2.0, abs=0.1)
    else:   # only where the system cannot swap two folders in one step: the earlier run waits aside
        assert not out.exists()
        (aside,) = [p for p in tmp_path.iterdir() if p.name.startswith(".out.") and p.name.endswith(".old")]
        assert _listing(aside / "x") == earlier
    assert _leftovers(tmp_path)                          # something was left by the killed process
    # the next run: cleans what is left, and (where the earlier run waited aside) puts it back first
    if expect == "moved aside":
        assert files.clean_leftovers(tmp_path, "out") and _listing(out) == earlier
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    assert _consistent(out) and _chords(out) == pytest.approx(3.0, abs=0.1)
    assert not _leftovers(tmp_path) and not _leftovers(out)


def test_sigterm_while_saving_is_one_line_and_leaves_the_earlier_run(tmp_path, scen):
    out = tmp_path / "out"
    assert main(["run", str(scen), "--out", str(out), "--quiet"]) == 0
    earlier = _listing(out)
    script = tmp_path / "killer.py"
    script.write_text(KILLER)
    r = subprocess.run([sys.executable, str(script), "filling", "SIGTERM", str(scen), str(out)],
                       capture_output=True, text=True, env=_env(), timeout=300)
    assert (r.returncode, r.stderr) == (143, "unsteady: terminated\n")
    assert _listing(out) == earlier and not _leftovers(tmp_path)


def test_a_file_stopped_right_after_its_rename_is_still_vouched_for(tmp_path, monkeypatch):
    # the sweep table is rewritten after every case: a Ctrl-C between the rename of the new
    # table and the update of the record must not make the folder look foreign
    d = files.claim_out_dir(tmp_path / "sw", "sweep", create=True)
    files.write_text(d / "sweep.csv", "name\ncase-001\n")
    calls = []
    update = files._update_record

    def stopped(folder, entries):
        calls.append(entries)
        if len(calls) == 2:                 # the update after the rename
            raise KeyboardInterrupt
        update(folder, entries)
    monkeypatch.setattr(files, "_update_record", stopped)
    with pytest.raises(KeyboardInterrupt):
        files.write_text(d / "sweep.csv", "name\ncase-001\ncase-002\n")
    monkeypatch.undo()
    assert (d / "sweep.csv").read_text().endswith("case-002\n")        # the new table is in place
    assert files.foreign_entry(d, "sweep") is None and files.claim_out_dir(d, "sweep") == d


def test_a_temporary_in_use_is_not_a_leftover_and_foreign_lookalikes_stay(tmp_path):
    target = tmp_path / "run"
    with files.atomic_dir(target) as tmp:
        (tmp / "history.csv").write_text("t\n0\n")
        assert files.clean_leftovers(tmp_path) == [] and tmp.exists()       # being written: locked
    with files.atomic_path(tmp_path / "film.mp4") as part:
        assert files.clean_leftovers(tmp_path) == [] and part.exists()
    # a folder named like a temporary but holding the user's files (no record) is not ours
    lookalike = tmp_path / ".run.abcd1234.part"
    lookalike.mkdir()
    (lookalike / "thesis.tex").write_text("mine")
    assert files.clean_leftovers(tmp_path) == [] and (lookalike / "thesis.tex").exists()
    # a leftover of a killed writer (nobody holds its lock) goes
    dead = tmp_path / ".film.abcd1234.part.mp4"
    dead.write_bytes(b"half a film")
    assert files.clean_leftovers(tmp_path) == [dead.name] and not dead.exists()


def test_two_films_to_one_path_at_once_give_one_whole_film(tmp_path, scen):
    run = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    film = run / "film.gif"
    cmd = [sys.executable, "-m", "unsteady", "animate", str(run), "--out", str(film), "--frames", "8",
           "--size", "96x64", "--quiet"]
    procs = [subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=_env())
             for _ in range(2)]
    results = [p.communicate(timeout=300) + (p.returncode,) for p in procs]
    assert [r[2] for r in results] == [0, 0], results
    import imageio.v3 as iio
    assert iio.imread(film, index=None).shape[:3] == (8, 64, 96)
    assert files.read_record(run)["files"]["film.gif"]["sha256"] == files.digest(film)
    assert not _leftovers(run)


def _sigcgt(pid):
    """The set of signals process ``pid`` catches (Linux /proc), or None when it has gone."""
    try:
        text = Path(f"/proc/{pid}/status").read_text()
    except OSError:
        return None
    mask = int(next(line.split()[1] for line in text.splitlines() if line.startswith("SigCgt:")), 16)
    return {s for s in range(1, 65) if mask >> (s - 1) & 1}


def _started(p, deadline=20.0):
    """Wait until the program has set its own signal handlers (it then catches SIGTERM)."""
    t0 = time.monotonic()
    while time.monotonic() - t0 < deadline:
        caught = _sigcgt(p.pid)
        if caught is None or signal.SIGTERM in caught:
            return caught is not None
        time.sleep(0.001)
    return False


@pytest.mark.skipif(not Path("/proc/self/status").exists(), reason="needs /proc to see the handlers")
def test_ctrl_c_at_any_point_of_start_up_is_one_line_exit_130(tmp_path, scen):
    out = tmp_path / "out"
    cmd = [sys.executable, "-m", "unsteady", "run", str(scen), "--out", str(out), "--quiet",
           "--set", "run.chords=400"]
    for delay in (0.0, 0.01, 0.03, 0.06, 0.1, 0.2, 0.4, 0.8):
        p = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=_env())
        try:
            assert _started(p), "the program set no handler of its own (SIGTERM) at start-up"
            time.sleep(delay)
            p.send_signal(signal.SIGINT)
            _, err = p.communicate(timeout=120)
        finally:
            p.kill()
            p.wait()
        assert (p.returncode, err) == (130, "unsteady: interrupted\n"), (delay, err[-2000:])
        assert not out.exists() and not _leftovers(tmp_path)
    # SIGTERM the same way, one line, its own status
    p = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=_env())
    assert _started(p)
    time.sleep(0.3)
    p.send_signal(signal.SIGTERM)
    _, err = p.communicate(timeout=120)
    assert (p.returncode, err) == (143, "unsteady: terminated\n")


# ---------------------------------------------------------------------------
# 14: damaged run folders, bounds

def _damage(run, name, how):
    p = run / name
    data = p.read_bytes()
    p.write_bytes(data[: len(data) // 2] if how == "truncate" else b"\x00garbage\x01" + data[7:])


@pytest.mark.parametrize("name", ["summary.json", "history.csv", "snapshots.npz"])
def test_every_reader_of_a_damaged_run_says_which_file_in_one_line(tmp_path, scen, capsys, name):
    run = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    _damage(run, name, "truncate")
    before = _listing(tmp_path)
    commands = [["pictures", str(run), "--quiet"],
                ["animate", str(run), "--out", str(tmp_path / "f.gif"), "--quiet"],
                ["report", str(run), "--out", str(tmp_path / "page.html"), "--no-film", "--quiet"],
                ["report", str(run), "--out", str(tmp_path / "page.html"), "--quiet"]]
    if name != "snapshots.npz":          # compare reads no snapshots
        commands.append(["compare", str(run), "--out", str(tmp_path / "c.png"), "--quiet"])
    for argv in commands:
        assert main(argv) == 2, argv
        err = _err(capsys)
        assert len(err) == 1 and err[0].startswith(f"error: {run}: {name}: "), (argv, err)
        assert "damaged" in err[0] or "line" in err[0], err
        assert _listing(tmp_path) == before, argv


def test_film_length_is_bounded_with_the_range_in_the_message(tmp_path, scen, capsys):
    run = tmp_path / "run"
    assert main(["run", str(scen), "--out", str(run), "--quiet"]) == 0
    before = _listing(tmp_path)
    for extra, words in ((["--frames", "200000"], "--frames: 200000; allowed: 1 to 10000"),
                         (["--frames", "0"], "--frames: 0; allowed: 1 to 10000"),
                         (["--slowdown", "1e6"], "--slowdown: 1e+06 gives ")):
        assert main(["animate", str(run), "--quiet", *extra]) == 2
        err = _err(capsys)
        assert len(err) == 1 and words in err[0], err
    assert _listing(tmp_path) == before
