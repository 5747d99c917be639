"""The ``unsteady compare`` command (unsteady.compare)."""

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
    ratios = [float(line.split()[10]) for line in lines[1:3]]
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
