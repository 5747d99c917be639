"""A small on-disk cache for arrays that are costly to compute and never change for a given program.

The indicial-function tables (:mod:`unsteady.theory`) take about half a
second of numerical integration to build; a command that starts a new
process for one short run would spend most of its time there.  Like numba's
``cache=True``, the first process builds the arrays and stores them; later
processes read them back.  The key of an entry includes a digest of the
source file that computes it, so a change of the code builds them afresh.

The cache lives in ``$UNSTEADY_CACHE_DIR`` if set, else
``$XDG_CACHE_HOME/unsteady`` or ``~/.cache/unsteady``.  A cache that cannot be
read or written is simply not used: the arrays are computed as if there were
none (the values are the same either way; only the time differs).
"""

from __future__ import annotations

import hashlib
import os
from pathlib import Path

import numpy as np

from .files import atomic_path


def cache_dir() -> Path:
    """The folder of the cache (not created here)."""
    env = os.environ.get("UNSTEADY_CACHE_DIR")
    if env:
        return Path(env)
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "unsteady"


def source_digest(path) -> str:
    """A short digest of a source file's bytes (part of a cache key)."""
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()[:16]


def cached_arrays(name: str, key: str, compute):
    """The dict of arrays ``compute()`` returns, read from the cache when stored under ``name`` and ``key``.

    Parameters
    ----------
    name : str
        A file-name-safe name of the entry.
    key : str
        Everything the arrays depend on (typically a :func:`source_digest`
        and the parameters); an entry stored under another key is replaced.
    compute : callable
        Returns a dict of str -> ndarray.
    """
    path = cache_dir() / f"{name}.npz"
    try:
        with np.load(path, allow_pickle=False) as z:
            if str(z["__key__"]) == key:
                return {k: z[k] for k in z.files if k != "__key__"}
    except (OSError, KeyError, ValueError):
        pass
    arrays = compute()
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        with atomic_path(path) as tmp:
            with open(tmp, "wb") as f:
                np.savez(f, __key__=np.array(key), **arrays)
    except OSError:
        pass
    return arrays
