"""Load pictures of a run in continuous turbulence (registered in :data:`unsteady.outputs.pictures.PICTURES`).

``turbulence-loads.png`` (runs with ``[aircraft]`` and one vertical
``turbulence`` gust whose record is long enough for statistics):

- left, the exceedance rate of load-factor increments above the mean: counted
  in the record (n low-passed at the statistics' cut-off, the start-up left
  out, :mod:`unsteady.analysis.turbulence`) against Rice's formula
  N(y) = N0 exp(-y^2 / (2 sigma^2)) with the record's own N0 and sigma
  (S. O. Rice, Bell Syst. Tech. J. 23-24, 1944-45) and with the power-spectral
  method's (J. C. Houbolt, R. Steiner & K. G. Pratt, NASA TR R-199, 1964);
  with several realisations, the lowest and highest counted rate at 1, 2 and
  3 sigma; a second axis gives the increment as lift in newtons (m g per unit
  of load factor);
- right, the one-sided power spectrum of n (Welch's method on the unfiltered
  record) against the power-spectral method's, with the cut-off marked.

The statistics caution is the footer.
"""

from __future__ import annotations

import numpy as np

from ..analysis import turbulence as turb
from ..core.cautions import STATISTICS_CAUTION
from ..theory import G
from .pictures import (LOOK, finish_figure, house_legend, house_style, new_figure, picture, run_title,
                       warning_notes)

#: Levels (in units of the record's sigma) at which the exceedance curve is counted.
LEVELS = np.linspace(0.0, 4.0, 41)


@picture("turbulence-loads.png")
def plot_turbulence_loads(result, path):
    """turbulence-loads.png: exceedance rates and the power spectrum of n (see the module docstring)."""
    h, s, sc = result.history, result.summary or {}, result.scenario
    block = s.get("turbulence") or {}
    if sc is None or "n" not in h or "N0" not in s or "exceedances" not in block \
            or turb.turbulence_gust(sc) is None or "aircraft" not in sc.data:
        return False
    t, n = np.asarray(h["t"], dtype=float), np.asarray(h["n"], dtype=float)
    keep = t >= t[0] + block["startup_discarded_s"]
    dt = float(t[1] - t[0])
    x = n[keep] - n[keep].mean()
    span = float(t[keep][-1] - t[keep][0])
    xf = turb.low_pass(x, dt, block["cut_off_hz"] if block.get("low_pass") else None)
    sigma, n0 = float(xf.std()), turb.crossing_rate(xf, 0.0, span)
    weight = sc.data["aircraft"]["mass"] * G

    fig = new_figure(10.0, 4.8)
    ax1 = house_style(fig.add_subplot(1, 2, 1))
    ax2 = house_style(fig.add_subplot(1, 2, 2))
    y = LEVELS * sigma
    counted = np.array([turb.crossing_rate(xf, v, span) for v in y])
    ok = counted > 0
    ax1.semilogy(y[ok], counted[ok], "o", ms=3.2, color=LOOK["trace"], mfc=LOOK["paper"], mew=1.1,
                 label=f"counted in the record ({span:.4g} s)")
    ax1.semilogy(y, n0 * np.exp(-0.5 * LEVELS ** 2), color=LOOK["cw"], lw=1.3,
                 label=f"Rice, record's N0 {n0:.3g} Hz and sigma {sigma:.3g}")
    psm = block.get("power_spectral_method")
    if psm:
        ax1.semilogy(y, turb_rice(y, psm["N0"], psm["sigma_n"]), color=LOOK["second"], lw=1.1, ls="--",
                     label=f"power-spectral method, N0 {psm['N0']:.3g} Hz, sigma {psm['sigma_n']:.3g}")
    reals = block.get("realisations")
    if reals:
        for e in reals["exceedances"]:
            yy = e["sigmas"] * sigma
            lo, hi = e["counted_per_s"]["min"], e["counted_per_s"]["max"]
            if lo > 0:
                ax1.plot([yy, yy], [lo, hi], color=LOOK["muted"], lw=2.2, alpha=0.7, solid_capstyle="butt")
        ax1.plot([], [], color=LOOK["muted"], lw=2.2, alpha=0.7,
                 label=f"lowest to highest of {reals['count']} realisations")
    ax1.set_ylim(bottom=max(0.3 / span, 1e-6))
    ax1.set_xlabel("load-factor increment above the mean, delta n", fontsize=8.5)
    ax1.set_ylabel("exceedances per second (up-crossings, 1/s)", fontsize=8.5)
    top = ax1.secondary_xaxis("top", functions=(lambda d: d * weight, lambda L: L / weight))
    top.set_xlabel("the same increment as lift on the aircraft (N)", fontsize=8)
    top.tick_params(labelsize=7.5, colors=LOOK["muted"])
    house_legend(ax1, loc="lower left")

    from scipy import signal
    f, p = signal.welch(x, fs=1.0 / dt, nperseg=max(64, min(x.size, int(round(8.0 / dt)))))
    f, p = f[1:], p[1:]
    ax2.loglog(f, p, color=LOOK["trace"], lw=1.1, label="record (Welch, unfiltered)")
    theory_p = turb.power_spectral_psd(sc, f)
    if theory_p is not None:
        ax2.loglog(f, theory_p, color=LOOK["second"], lw=1.3, ls="--",
                   label="power-spectral method, section free to heave")
    if block.get("low_pass"):
        ax2.axvline(block["cut_off_hz"], color=LOOK["cw"], lw=0.9, ls=":",
                    label=f"cut-off of the statistics, {block['cut_off_hz']:.3g} Hz")
    ax2.set_xlabel("frequency f (Hz)", fontsize=8.5)
    ax2.set_ylabel("PSD of the load factor (1/Hz)", fontsize=8.5)
    house_legend(ax2, loc="lower left")

    notes = [f"n_rms {s['n_rms']:.3g} (lift {s['n_rms'] * weight:.3g} N rms), A_bar {s['A_bar']:.3g} per m/s, "
             f"N0 {s['N0']:.3g} Hz at a cut-off of {s.get('N0_cut_off_Hz', block['cut_off_hz']):.3g} Hz; "
             f"the first {block['startup_discarded_s']:.3g} s (start-up) left out"
             + (f"; means over {reals['count']} realisations" if reals else "")]
    return finish_figure(fig, path, run_title(result, "load factor in continuous turbulence"),
                         notes + warning_notes(result), caution=STATISTICS_CAUTION,
                         left=0.75, right=0.2, bottom=0.6, top=0.45, gap=0.75, cols=2)


def turb_rice(y, N0, sigma):
    """Rice's exceedance rate (see :func:`unsteady.theory.spectral_gust.rice_exceedance_rate`)."""
    from ..theory.spectral_gust import rice_exceedance_rate
    return rice_exceedance_rate(y, N0, sigma)
