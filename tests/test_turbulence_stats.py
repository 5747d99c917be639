"""Statistics of a load-factor record (unsteady.analysis.turbulence).

Check: a synthetic stationary Gaussian record with a flat spectrum up to f_max has
N0 = f_max / sqrt(3) zero up-crossings per second and exceedance rates
N0 exp(-y^2 / 2 sigma^2) (S. O. Rice, Bell Syst. Tech. J. 23-24, 1944-45).
"""

import math
from pathlib import Path

import numpy as np
import pytest

import unsteady
from unsteady.analysis import turbulence

ROOT = Path(__file__).resolve().parents[1]


def _flat_band_record(f_max=5.0, seconds=2000.0, fs=100.0, seed=3):
    # Gaussian Fourier coefficients on the band 0 < f < f_max (an ideal low-pass of white noise)
    rng = np.random.default_rng(seed)
    m = int(seconds * fs)
    f = np.fft.rfftfreq(m, 1.0 / fs)
    X = (rng.standard_normal(f.size) + 1j * rng.standard_normal(f.size)) * ((f > 0) & (f < f_max))
    x = np.fft.irfft(X, m)
    t = np.arange(m) / fs
    return t, 1.0 + 0.3 * x / x.std()


def test_counted_rates_follow_rice_on_a_gaussian_record():
    t, n = _flat_band_record()
    st = turbulence.load_factor_statistics(t, n, sigma_w=1.5, discard_s=10.0)
    assert st["n_rms"] == pytest.approx(0.3, rel=0.03)
    assert st["A_bar"] == pytest.approx(st["n_rms"] / 1.5, rel=1e-12)
    assert st["N0"] == pytest.approx(5.0 / math.sqrt(3.0), rel=0.03)
    for e in st["exceedances"][:2]:                # 1 and 2 sigma: within the record's scatter
        assert e["counted_per_s"] == pytest.approx(e["rice_per_s"], rel=0.1)
    assert st["startup_discarded_s"] == 10.0 and st["record_s"] == pytest.approx(1990.0, abs=0.1)


def test_turbulence_run_gets_the_summary_block():
    sc = unsteady.load_scenario("scenarios/drone-turbulence.toml",
                                overrides=["run.model=linear", "run.duration=120.0", "output.plots=false"])
    res = unsteady.simulate(sc)
    block = turbulence.turbulence_summary(res.history, sc)
    assert block["A_bar"] == pytest.approx(block["n_rms"] / 1.5)
    psm = block["turbulence"]["power_spectral_method"]
    assert block["n_rms"] == pytest.approx(psm["sigma_n"], rel=0.15)   # 2 minutes of one realisation
    assert block["turbulence"]["startup_discarded_s"] == pytest.approx(turbulence.startup_interval(sc))


def test_no_statistics_for_a_short_record_or_a_discrete_gust():
    sc = unsteady.load_scenario("scenarios/drone-gust-1cos.toml", overrides=["run.model=linear"])
    assert turbulence.turbulence_summary(unsteady.simulate(sc).history, sc) == {}
    sc = unsteady.load_scenario("scenarios/drone-turbulence.toml",
                                overrides=["run.model=linear", "run.duration=0.5"])
    out = turbulence.turbulence_summary(unsteady.simulate(sc).history, sc)
    assert "no statistics" in out["turbulence"]["note"]


@pytest.mark.parametrize("model", ["vortex", "linear"])
def test_turbulence_run_starts_level_in_the_field(model):
    """The aircraft flies in the turbulence from t = 0: both models start trimmed in the field
    as it stands then (n = 1, common practice for a trimmed start), with no jump of the load factor
    at the start (the trust issue reported a jump of 5.5 in one step and a linear start at
    n = -4.5; measured before this change, the linear model began at 1.27), and the peaks leave
    the start-up out like the statistics."""
    sc = unsteady.load_scenario(ROOT / "scenarios" / "drone-turbulence.toml",
                                overrides={"run.model": model, "run.duration": 2.5})
    res = unsteady.simulate(sc)
    n, w = res.history["n"], res.history["w_gust"]
    assert abs(w[0]) > 0.05                     # the gust is there at t = 0
    assert abs(n[0] - 1.0) < (1e-9 if model == "vortex" else 2e-3)
    assert np.abs(np.diff(n[:20])).max() < 0.08
    settle = turbulence.startup_interval(sc)
    assert res.summary["peaks_from_s"] == pytest.approx(settle)
    late = res.history["t"] >= settle
    assert res.summary["n_max"] == pytest.approx(float(n[late].max()))
