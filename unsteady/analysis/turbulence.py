"""Statistics of the load factor in continuous turbulence: rms, A_bar, N0, exceedances, spectrum.

From a history with the load factor ``n`` (a run with ``[aircraft]`` and a
``turbulence`` gust), after a start-up interval is left out:

- ``n_rms``: the standard deviation of n (the rms of n minus its mean);
- ``A_bar = n_rms / sigma_w`` (1/(m/s)), sigma_w the turbulence intensity;
- ``N0``: zero up-crossings per second of n minus its mean;
- exceedance rates of load-factor increments y = 1, 2, 3 sigma above the mean,
  counted in the record and from Rice's formula N(y) = N0 exp(-y^2 / (2 sigma^2))
  (S. O. Rice, Bell Syst. Tech. J. 23-24, 1944-45);
- the one-sided power spectrum of n (Welch's method, scipy.signal.welch);
- beside them, the power-spectral method for the section free to heave
  (:func:`unsteady.theory.spectral_gust.heave_gust_statistics`; J. C. Houbolt, R. Steiner &
  K. G. Pratt, NASA TR R-199, 1964), integrated to the record's Nyquist
  frequency, for a single vertical turbulence gust.

Start-up: the aircraft starts trimmed, and the heave response settles with
the heave subsidence time tau = 2 m' / (rho U c a) (a the lift slope); the
first ``max(10 tau, 50 c / U)`` seconds (ten subsidence times, and fifty
chords of wake) are left out of every statistic (common practice: discard
the transient of the start so the record is stationary).
"""

from __future__ import annotations

import math

import numpy as np

#: Increments, in units of the record's sigma_n, whose exceedance rates are reported.
EXCEEDANCE_SIGMAS = (1.0, 2.0, 3.0)


def _mass_per_span(sc):
    """m' = mass / (wing_area / chord), kg/m: the section stands for the wing."""
    ac = sc.data["aircraft"]
    return ac["mass"] / (ac["wing_area"] / sc.chord)


def startup_interval(sc):
    """Seconds left out at the start: max(10 tau_heave, 50 c / U) (see module docstring)."""
    from ..inputs.aircraft import lift_scale
    a = 2.0 * math.pi * lift_scale(sc.data["aircraft"].get("aspect_ratio"))
    tau = 2.0 * _mass_per_span(sc) / (sc.density * sc.speed * sc.chord * a)
    return max(10.0 * tau, 50.0 * sc.chord / sc.speed)


def turbulence_gust(sc):
    """The single vertical turbulence gust of a scenario, or None."""
    from ..inputs.gusts import gust_list
    gusts = gust_list(sc.data.get("gust"))
    turb = [x for x in gusts if x.get("profile") == "turbulence"]
    if len(turb) == 1 and len(gusts) == 1 and turb[0].get("direction", "vertical") == "vertical":
        return turb[0]
    return None


def crossing_rate(x, level, duration):
    """Up-crossings of ``level`` per second by the samples ``x`` over ``duration`` s."""
    return float(np.count_nonzero((x[:-1] < level) & (x[1:] >= level))) / duration


def load_factor_statistics(t, n, sigma_w, *, discard_s=0.0):
    """n_rms, A_bar, N0 and counted/Rice exceedances of a load-factor record.

    Parameters
    ----------
    t, n : ndarray
        Times (s, uniform steps) and load factor.
    sigma_w : float
        Turbulence intensity (rms gust velocity), m/s.
    discard_s : float
        Start-up left out, s.

    Returns
    -------
    dict or None
        None when fewer than 100 samples remain.
    """
    keep = t >= t[0] + discard_s
    tk, x = t[keep], n[keep]
    if x.size < 100:
        return None
    span = float(tk[-1] - tk[0])
    x = x - x.mean()
    sigma = float(x.std())
    n0 = crossing_rate(x, 0.0, span)
    exceed = [{"y": y * sigma, "sigmas": y, "counted_per_s": crossing_rate(x, y * sigma, span),
               "rice_per_s": float(n0 * math.exp(-0.5 * y * y))} for y in EXCEEDANCE_SIGMAS]
    return {"n_rms": sigma, "A_bar": sigma / sigma_w, "N0": n0, "exceedances": exceed,
            "record_s": span, "startup_discarded_s": float(discard_s)}


def load_factor_spectrum(t, n, *, discard_s=0.0, segments=8):
    """One-sided PSD of n minus its mean (Welch, Hann window): (frequency Hz, PSD 1/Hz)."""
    from scipy import signal
    keep = t >= t[0] + discard_s
    x = n[keep] - n[keep].mean()
    fs = 1.0 / float(t[1] - t[0])
    f, p = signal.welch(x, fs=fs, nperseg=max(64, x.size // segments))
    return f, p


def power_spectral_method(sc, omega_max):
    """The power-spectral statistics for the scenario's section free to heave (or None)."""
    from .. import theory
    from ..inputs.aircraft import lift_scale
    from ..theory.spectral_gust import heave_gust_statistics
    g = turbulence_gust(sc)
    if g is None or "aircraft" not in sc.data:
        return None
    ac = sc.data["aircraft"]
    spectrum = {"dryden": theory.dryden_spectrum, "von-karman": theory.von_karman_spectrum}[g["spectrum"]]
    sig, L = g["intensity"], g["scale_length"]
    return heave_gust_statistics(
        lambda W: spectrum(W, sig, L), sig, speed=sc.speed, chord=sc.chord, density=sc.density,
        mass_per_span=_mass_per_span(sc), lift_scale=lift_scale(ac.get("aspect_ratio")),
        omega_max=omega_max)


def turbulence_summary(history, sc):
    """The summary block of a turbulence run with ``[aircraft]`` (empty dict otherwise).

    Keys: ``n_rms``, ``A_bar``, ``N0`` (Hz) at the top level (interface names), and
    a ``turbulence`` block with the exceedances, the record length, the start-up left
    out and the power-spectral method's figures with their cut-off.
    """
    g = turbulence_gust(sc)
    if g is None or "n" not in history or len(history["t"]) < 3:
        return {}
    t, n = np.asarray(history["t"]), np.asarray(history["n"])
    discard = startup_interval(sc)
    st = load_factor_statistics(t, n, g["intensity"], discard_s=discard)
    if st is None:
        return {"turbulence": {"note": f"no statistics: the record is shorter than the start-up "
                                       f"left out ({discard:.3g} s) plus 100 steps; lengthen run.duration"}}
    dt = float(t[1] - t[0])
    block = dict(st)
    psm = power_spectral_method(sc, math.pi / dt)
    if psm is not None:
        block["power_spectral_method"] = dict(psm, cut_off_hz=psm["omega_max"] / (2 * math.pi),
                                              note="2-D section: N0 grows with the log of the cut-off "
                                                   "(the record's Nyquist frequency)")
    return {"n_rms": st["n_rms"], "A_bar": st["A_bar"], "N0": st["N0"], "turbulence": block}
