"""The bundled scenarios' headline numbers describe the flow, not the step: halving dt moves them by under 2 %.

Convergence with the time step is the test of a time-marching method (common
practice).  Peaks of cl and n are compared relative to themselves; the moment
peaks relative to the largest |cm| of the run (a peak near zero has no
relative size of its own).  The turbulence scenario is left out here: its
peaks are extremes of one random record; its statistics are checked against
the power-spectral method in tests/test_turbulence_stats.py.
"""

from pathlib import Path

import pytest

import unsteady

ROOT = Path(__file__).resolve().parents[1]
HEADLINE = ("cl_max", "cl_min", "n_max", "n_min", "cm_max", "cm_min")


@pytest.mark.parametrize("name, overrides", [
    ("pitch-up", {"airfoil.elements": 20, "run.duration": 0.3}),
    ("pitch-step", {"run.duration": 0.03}),
    ("perching", {"airfoil.elements": 20, "run.duration": 0.2}),
    ("flapping-plate", {"airfoil.elements": 20, "run.chords": 8}),
    ("drone-gust-1cos", {"airfoil.elements": 15}),
])
def test_headline_numbers_converge_with_the_step(name, overrides):
    sc = unsteady.load_scenario(ROOT / "scenarios" / f"{name}.toml", overrides=overrides)
    a = unsteady.simulate(sc).summary
    b = unsteady.simulate(unsteady.load_scenario(ROOT / "scenarios" / f"{name}.toml",
                                                 overrides={**overrides, "run.dt": sc.dt / 2})).summary
    cm_scale = max(abs(a["cm_max"]), abs(a["cm_min"]))
    for k in HEADLINE:
        if k not in a:
            continue
        scale = cm_scale if k.startswith("cm") else abs(a[k])
        if scale < 1e-6:            # a zero peak (cl_min of a pitch-up from zero): absolute
            assert abs(a[k] - b[k]) < 1e-3, k
        else:
            assert abs(a[k] - b[k]) < 0.02 * scale, (k, a[k], b[k])
