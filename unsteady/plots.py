"""Static pictures of a run (PNG), written into the run directory."""

from __future__ import annotations

import os
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402


def _save(fig, path):
    path = Path(path)
    tmp = path.with_name(f".{path.stem}.part{path.suffix}")
    fig.savefig(tmp, dpi=110)
    plt.close(fig)
    os.replace(tmp, path)


def plot_histories(result, path):
    """Lift, moment and the motion against time, in one tall picture."""
    h = result.history
    t = h["t"]
    rows = [("cl", "lift coefficient cl"), ("cm", "moment coefficient cm (c/4, nose-up +)")]
    if "n" in h:
        rows.append(("n", "load factor n"))
    rows.append(("alpha_deg", "pitch angle (deg)"))
    rows.append(("h", "plunge height (m)"))
    fig, axes = plt.subplots(len(rows), 1, figsize=(8, 1.9 * len(rows) + 0.6), sharex=True)
    for ax, (k, label) in zip(axes, rows):
        ax.plot(t, h[k], color="#1f4e79", lw=1.4)
        if k == "cl" and "cl_quasi_steady" in h:
            ax.plot(t, h["cl_quasi_steady"], color="#b5651d", lw=1.0, ls="--", label="quasi-steady")
            ax.legend(loc="best", fontsize=8)
        ax.set_ylabel(label, fontsize=8)
        ax.grid(alpha=0.3)
    axes[-1].set_xlabel("time t (s)")
    title = (result.scenario.title if result.scenario is not None else "") or "run histories"
    fig.suptitle(title, fontsize=10)
    fig.tight_layout()
    _save(fig, path)


def write_run_plots(result, out_dir):
    """The pictures ``unsteady run`` writes by default."""
    out_dir = Path(out_dir)
    if len(result.history.get("t", [])) == 0:
        return
    plot_histories(result, out_dir / "histories.png")
    for fn in EXTRA_PLOTS:
        fn(result, out_dir)


# More pictures register here: fn(result, out_dir) writes one or more PNGs.
EXTRA_PLOTS = []
