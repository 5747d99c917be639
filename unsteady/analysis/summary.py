"""The headline numbers of a history (summary.json)."""

from __future__ import annotations

import numpy as np

from ..core.cautions import MODEL_CAUTION
from ..core.version import __version__


def make_summary(history, *, steps, wall_time_s, extra=None):
    """Headline numbers of a history (keys as in the public interface)."""
    cl = history["cl"]
    cm = history["cm"]
    t = history["t"]
    ok = np.isfinite(cl)
    s = {"version": __version__, "steps": int(steps), "wall_time_s": float(wall_time_s)}
    if ok.any():
        i_max = int(np.nanargmax(cl))
        i_min = int(np.nanargmin(cl))
        s.update(cl_max=float(cl[i_max]), t_cl_max=float(t[i_max]),
                 cl_min=float(cl[i_min]), t_cl_min=float(t[i_min]),
                 cm_max=float(np.nanmax(cm)), cm_min=float(np.nanmin(cm)),
                 cd_mean=float(np.nanmean(history["cd"])),
                 cl_final=float(cl[ok][-1]))
    if "n" in history and np.isfinite(history["n"]).any():
        n = history["n"]
        j = int(np.nanargmax(n))
        s.update(n_max=float(n[j]), t_n_max=float(t[j]), n_min=float(np.nanmin(n)))
    s["caution"] = MODEL_CAUTION
    if extra:
        s.update(extra)
    return s
