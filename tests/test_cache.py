"""The on-disk array cache (unsteady.core.cache) and the indicial tables kept in it."""

import numpy as np

from unsteady.core import cache


def test_cache_stores_reads_and_rebuilds_on_a_new_key(tmp_path, monkeypatch):
    monkeypatch.setenv("UNSTEADY_CACHE_DIR", str(tmp_path / "c"))
    calls = []

    def compute():
        calls.append(1)
        return {"a": np.arange(3.0) + len(calls)}

    first = cache.cached_arrays("t", "k1", compute)
    again = cache.cached_arrays("t", "k1", compute)
    assert len(calls) == 1 and np.array_equal(first["a"], again["a"])
    other = cache.cached_arrays("t", "k2", compute)          # the code changed: built afresh
    assert len(calls) == 2 and other["a"][0] == 2.0
    assert not [p for p in (tmp_path / "c").iterdir() if ".part" in p.name]


def test_unusable_cache_folder_only_costs_time(tmp_path, monkeypatch):
    blocker = tmp_path / "file"
    blocker.write_text("not a folder")
    monkeypatch.setenv("UNSTEADY_CACHE_DIR", str(blocker / "sub"))
    out = cache.cached_arrays("t", "k", lambda: {"a": np.ones(2)})
    assert np.array_equal(out["a"], np.ones(2))


def test_damaged_cache_entry_is_rebuilt(tmp_path, monkeypatch):
    monkeypatch.setenv("UNSTEADY_CACHE_DIR", str(tmp_path))
    (tmp_path / "t.npz").write_bytes(b"truncated")
    out = cache.cached_arrays("t", "k", lambda: {"a": np.zeros(1)})
    assert out["a"].shape == (1,)
    assert cache.cached_arrays("t", "k", lambda: {"a": np.ones(1)})["a"][0] == 0.0


def test_cached_wagner_table_equals_the_branch_cut_integral():
    """Wagner's function from the cached spline against direct quadrature of Garrick's Fourier
    integral of Theodorsen's function (I. E. Garrick, NACA Report 629, 1938), scipy quad."""
    from unsteady import theory
    s = np.array([0.5, 2.0, 7.5, 40.0])
    exact = np.array([theory.wagner_exact_point(v) for v in s])
    assert np.max(np.abs(theory.wagner(s) - exact)) < 1e-6
