"""The ``unsteady compare`` command (unsteady.compare)."""

import numpy as np
import pytest

from unsteady import load_scenario
from unsteady.apps.cli import main
from unsteady.simulation.runner import simulate


@pytest.fixture(scope="module")
def two_runs(tmp_path_factory):
    d = tmp_path_factory.mktemp("runs")
    base = {"flow": {"speed": 10.0, "density": 1.2},
            "airfoil": {"shape": "flat", "chord": 0.2, "elements": 12},
            "motion": {"pivot": 0.25, "pitch": {"law": "sine", "amplitude": 2.0, "reduced_frequency": 0.4}},
            "run": {"chords": 25, "wake": "frozen"}}
    out = []
    for model in ("vortex", "linear"):
        sc = load_scenario({**base, "run": {**base["run"], "model": model}})
        out.append(simulate(sc).save(d / model, plots=False))
    return out


def test_table_and_picture(two_runs, tmp_path, capsys):
    png = tmp_path / "c.png"
    assert main(["compare", str(two_runs[0]), str(two_runs[1]), "--out", str(png)]) == 0
    text = capsys.readouterr().out
    assert png.stat().st_size > 1000
    lines = text.splitlines()
    assert "amp_ratio" in lines[0] and "lag_deg" in lines[0]
    assert lines[1].split()[:2] == ["vortex", "vortex"] and lines[2].split()[:2] == ["linear", "linear"]
    # both models near Theodorsen's amplitude ratio at k = 0.4 (NACA Report 496):
    # the numbers printed are the runs' own summary values
    col = lines[0].split().index("amp_ratio")
    ratios = [float(line.split()[col]) for line in lines[1:3]]
    assert abs(ratios[0] - ratios[1]) < 0.05


def test_bad_run_dir_is_exit_2(tmp_path, capsys):
    assert main(["compare", str(tmp_path / "missing")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ") and "RUN_DIR" in err
    (tmp_path / "empty").mkdir()
    assert main(["compare", str(tmp_path / "empty")]) == 2
    assert "history.csv" in capsys.readouterr().err


def test_bad_out_is_exit_2(two_runs, tmp_path, capsys):
    assert main(["compare", str(two_runs[0]), "--out", str(tmp_path / "c.txt")]) == 2
    assert not (tmp_path / "c.txt").exists()


@pytest.fixture(scope="module")
def two_gust_runs(tmp_path_factory):
    """The same small aircraft in a 1-cosine gust, vortex and linear models, in one folder."""
    d = tmp_path_factory.mktemp("gusts")
    base = {"flow": {"speed": 15.0, "density": 1.2},
            "airfoil": {"shape": "flat", "chord": 0.25, "elements": 8},
            "aircraft": {"mass": 3.0, "wing_area": 0.55},
            "gust": {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 2.0, "arrival": 0.02},
            "run": {"chords": 10, "wake": "frozen"}}
    out = []
    for model in ("vortex", "linear"):
        sc = load_scenario({**base, "run": {**base["run"], "model": model}})
        out.append(simulate(sc).save(d / model, plots=False))
    return out


def test_gust_runs_compare_their_load_factors(two_gust_runs, tmp_path, capsys, monkeypatch):
    import unsteady.outputs.pictures as pictures
    figs = {}
    orig = pictures.save_png

    def keep(fig, path, **kw):          # keep the figure and write it as usual
        figs["fig"] = fig
        orig(fig, path, **kw)
    monkeypatch.setattr(pictures, "save_png", keep)
    png = tmp_path / "g.png"
    assert main(["compare", *map(str, two_gust_runs), "--out", str(png)]) == 0
    out = capsys.readouterr().out
    head = out.splitlines()[0].split()
    assert "n_max" in head and "t_n_max" in head and "t50" not in head     # no column every run lacks
    fig = figs["fig"]
    n_axes = [ax for ax in fig.axes if ax.get_ylabel() == "load factor n"]
    assert len(n_axes) == 1
    assert len([ln for ln in n_axes[0].get_lines() if ln.get_label().startswith("peak n")]) == 2
    # the pitch is held: the loops are drawn against the effective angle, not a vertical line
    loop = [ax for ax in fig.axes if "effective angle" in ax.get_xlabel()]
    assert len(loop) == 1 and np.ptp(loop[0].get_lines()[0].get_xdata()) > 1.0
    assert "caution:" in out


def test_out_may_be_a_folder_or_a_file_and_foreign_files_are_kept(two_runs, tmp_path, capsys):
    runs = [str(d) for d in two_runs]
    # default: beside the runs (their folder), not the current folder
    assert main(["compare", *runs, "--quiet"]) == 0
    beside = two_runs[0].parent / "compare.png"
    assert beside.is_file()
    # a new folder is made and gets compare.png
    assert main(["compare", *runs, "--out", str(tmp_path / "pics"), "--quiet"]) == 0
    assert (tmp_path / "pics" / "compare.png").is_file()
    # its own picture is replaced, a file it did not write is not
    assert main(["compare", *runs, "--out", str(tmp_path / "pics"), "--quiet"]) == 0
    foreign = tmp_path / "mine.png"
    foreign.write_bytes(b"holiday photo")
    assert main(["compare", *runs, "--out", str(foreign)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "not written by unsteady" in err[0]
    assert foreign.read_bytes() == b"holiday photo"
    (tmp_path / "old").mkdir()
    (tmp_path / "old" / "compare.png").write_bytes(b"x")
    assert main(["compare", *runs, "--out", str(tmp_path / "old")]) == 2
    assert (tmp_path / "old" / "compare.png").read_bytes() == b"x"


def test_runs_in_different_folders_need_out(two_runs, two_gust_runs, capsys):
    assert main(["compare", str(two_runs[0]), str(two_gust_runs[0])]) == 2
    err = capsys.readouterr().err
    assert "different folders" in err and "--out" in err
