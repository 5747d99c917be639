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

Cut-off: the statistics are those of n low-passed at a cut-off set by the flow,
f_c = U / (LOW_PASS_WAVELENGTH_CHORDS c) (gust wavelengths shorter than that many
chords left out; zero-phase Butterworth of order LOW_PASS_ORDER, scipy.signal.
sosfiltfilt), and the power-spectral method is integrated with the same filter
(:func:`unsteady.theory.spectral_gust.zero_phase_butterworth_gain`).  Two reasons:
for a 2-D section the Sears function decays as k^-1/2, so N0 of the unfiltered
response grows with the logarithm of the cut-off and a record's N0 would follow its
step (its Nyquist frequency); and the vortex model's n carries noise at the scale
of the step (each shed vortex changes the circulation of the last wake element
abruptly), which adds up-crossings without adding much variance: measured on 8 s
of the drone-turbulence scenario (vortex model), the unfiltered N0 was 12.1 Hz at
the default step and 54 Hz at half of it (the noise sits near the Nyquist
frequency: a band above 800 Hz of rms 0.016 at dt/2), n_rms 0.2627 and 0.2631;
low-passed at 30 Hz (two chords) N0 was 4.28 Hz at both steps, at 60 Hz 4.87 Hz
at both (tools/bench_turbulence.py prints the comparison).
The unfiltered figures, with the power-spectral method to the record's Nyquist
frequency (or the turbulence grid's, U / (2 dx), when lower), are kept beside
them (``unfiltered``).

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
#: The statistics' low-pass cut-off is U / (this many chords): see the module docstring.
LOW_PASS_WAVELENGTH_CHORDS = 2.0
#: Order of the Butterworth low-pass (applied forward and backward).
LOW_PASS_ORDER = 6


def statistics_cut_off_hz(sc):
    """f_c = U / (LOW_PASS_WAVELENGTH_CHORDS c), Hz (see the module docstring)."""
    return sc.speed / (LOW_PASS_WAVELENGTH_CHORDS * sc.chord)


def low_pass(x, dt, cut_off_hz, order=LOW_PASS_ORDER):
    """``x`` low-passed at ``cut_off_hz`` with a zero-phase Butterworth filter (scipy.signal);
    unchanged when the cut-off is at or above the Nyquist frequency 1 / (2 dt)."""
    from scipy import signal
    if cut_off_hz is None or cut_off_hz >= 0.5 / dt or x.size < 8 * order:
        return x
    sos = signal.butter(order, cut_off_hz, fs=1.0 / dt, output="sos")
    return signal.sosfiltfilt(sos, x)


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


def load_factor_statistics(t, n, sigma_w, *, discard_s=0.0, cut_off_hz=None):
    """n_rms, A_bar, N0 and counted/Rice exceedances of a load-factor record.

    Parameters
    ----------
    t, n : ndarray
        Times (s, uniform steps) and load factor.
    sigma_w : float
        Turbulence intensity (rms gust velocity), m/s.
    discard_s : float
        Start-up left out, s.
    cut_off_hz : float, optional
        Low-pass the record (after its mean is removed) at this cut-off first
        (:func:`low_pass`); None: the record as it is, up to its Nyquist frequency.

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
    dt = float(tk[1] - tk[0])
    x = low_pass(x, dt, cut_off_hz)
    sigma = float(x.std())
    n0 = crossing_rate(x, 0.0, span)
    exceed = [{"y": y * sigma, "sigmas": y, "counted_per_s": crossing_rate(x, y * sigma, span),
               "rice_per_s": float(n0 * math.exp(-0.5 * y * y))} for y in EXCEEDANCE_SIGMAS]
    nyquist = 0.5 / dt
    cut = nyquist if cut_off_hz is None or cut_off_hz >= nyquist else float(cut_off_hz)
    return {"n_rms": sigma, "A_bar": sigma / sigma_w, "N0": n0, "exceedances": exceed,
            "record_s": span, "startup_discarded_s": float(discard_s), "cut_off_hz": cut,
            "low_pass": cut < nyquist}


def load_factor_spectrum(t, n, *, discard_s=0.0, segments=8):
    """One-sided PSD of n minus its mean (Welch, Hann window): (frequency Hz, PSD 1/Hz)."""
    from scipy import signal
    keep = t >= t[0] + discard_s
    x = n[keep] - n[keep].mean()
    fs = 1.0 / float(t[1] - t[0])
    f, p = signal.welch(x, fs=fs, nperseg=max(64, x.size // segments))
    return f, p


def _gust_psd(g):
    from .. import theory
    spectrum = {"dryden": theory.dryden_spectrum, "von-karman": theory.von_karman_spectrum}[g["spectrum"]]
    sig, L = g["intensity"], g["scale_length"]
    return lambda W: spectrum(W, sig, L)


def _section(sc):
    from ..inputs.aircraft import lift_scale
    return dict(speed=sc.speed, chord=sc.chord, density=sc.density, mass_per_span=_mass_per_span(sc),
                lift_scale=lift_scale(sc.data["aircraft"].get("aspect_ratio")))


def power_spectral_method(sc, omega_max, cut_off_hz=None):
    """The power-spectral statistics for the scenario's section free to heave (or None); with
    ``cut_off_hz``, of the response low-passed as :func:`low_pass` does."""
    from ..theory.spectral_gust import heave_gust_statistics
    g = turbulence_gust(sc)
    if g is None or "aircraft" not in sc.data:
        return None
    kw = {}
    if cut_off_hz is not None and 2 * math.pi * cut_off_hz < omega_max:
        kw = dict(omega_filter=2 * math.pi * cut_off_hz, filter_order=LOW_PASS_ORDER)
    return heave_gust_statistics(_gust_psd(g), g["intensity"], omega_max=omega_max, **_section(sc), **kw)


def power_spectral_psd(sc, f):
    """The power-spectral method's one-sided PSD of n per Hz at ``f`` (Hz), or None."""
    from ..theory.spectral_gust import heave_load_factor_psd
    g = turbulence_gust(sc)
    if g is None or "aircraft" not in sc.data:
        return None
    return heave_load_factor_psd(f, _gust_psd(g), **_section(sc))


STAT_KEYS = ("n_rms", "A_bar", "N0")


def combine_realisations(stats, seeds):
    """Average the statistics of several realisations and give their spread.

    ``stats``: one :func:`load_factor_statistics` dict per realisation (same
    cut-off).  Returns the mean of ``n_rms``, ``A_bar``, ``N0`` and of the
    counted exceedance rates, with, for each, the sample standard deviation
    over the realisations (``*_std``), the standard error of the mean
    (``*_sem`` = std / sqrt(m)), the lowest and the highest (common practice
    for independent records), and the per-realisation values.
    """
    m = len(stats)
    out = {"count": m, "seeds": list(seeds)}

    def spread(values):
        v = np.asarray(values, dtype=float)
        std = float(v.std(ddof=1)) if m > 1 else 0.0
        return {"mean": float(v.mean()), "std": std, "sem": std / math.sqrt(m),
                "min": float(v.min()), "max": float(v.max()), "each": [float(x) for x in v]}
    for k in STAT_KEYS:
        out[k] = spread([s[k] for s in stats])
    ex = []
    for j, e0 in enumerate(stats[0]["exceedances"]):
        row = {"sigmas": e0["sigmas"]}
        row["counted_per_s"] = spread([s["exceedances"][j]["counted_per_s"] for s in stats])
        row["rice_per_s"] = spread([s["exceedances"][j]["rice_per_s"] for s in stats])
        ex.append(row)
    out["exceedances"] = ex
    out["record_s_each"] = float(stats[0]["record_s"])
    return out


def record_statistics(history, sc, cut_off=True):
    """:func:`load_factor_statistics` of one run's history (None when too short)."""
    g = turbulence_gust(sc)
    t, n = np.asarray(history["t"]), np.asarray(history["n"])
    return load_factor_statistics(t, n, g["intensity"], discard_s=startup_interval(sc),
                                  cut_off_hz=statistics_cut_off_hz(sc) if cut_off else None)


def turbulence_summary(history, sc, more=()):
    """The summary block of a turbulence run with ``[aircraft]`` (empty dict otherwise).

    Keys: ``n_rms``, ``A_bar``, ``N0`` (Hz) at the top level (interface names; of n
    low-passed at ``N0_cut_off_Hz``, see the module docstring; with several
    realisations their mean), and a ``turbulence`` block with the exceedances, the
    record length, the start-up left out, the cut-off, the power-spectral method's
    figures with the same filter, the unfiltered figures beside the method to the
    record's Nyquist frequency and, with ``more`` (the statistics of the further
    realisations, :func:`record_statistics`), the ``realisations`` block.
    """
    g = turbulence_gust(sc)
    if g is None or "n" not in history or len(history["t"]) < 3:
        return {}
    from ..core.cautions import STATISTICS_CAUTION
    t = np.asarray(history["t"])
    discard = startup_interval(sc)
    st = record_statistics(history, sc)
    if st is None:
        return {"turbulence": {"note": f"no statistics: the record is shorter than the start-up "
                                       f"left out ({discard:.3g} s) plus 100 steps; lengthen run.duration"}}
    raw = record_statistics(history, sc, cut_off=False)
    dt = float(t[1] - t[0])
    block = dict(st)
    block["cut_off_note"] = (f"statistics of n low-passed at {st['cut_off_hz']:.4g} Hz (gust wavelengths "
                             f"under {LOW_PASS_WAVELENGTH_CHORDS:g} chords left out; zero-phase Butterworth, "
                             f"order {LOW_PASS_ORDER}): the unfiltered N0 of a 2-D section grows with the "
                             f"cut-off, and the model's step-scale noise adds crossings"
                             if st["low_pass"] else "the cut-off is the record's Nyquist frequency")
    psm = power_spectral_method(sc, math.pi / dt, st["cut_off_hz"] if st["low_pass"] else None)
    if psm is not None:
        block["power_spectral_method"] = dict(psm, cut_off_hz=st["cut_off_hz"])
    unf = {k: raw[k] for k in ("n_rms", "A_bar", "N0", "exceedances", "cut_off_hz")}
    # the record resolves frequencies up to its Nyquist frequency and the synthesised field up to
    # its grid's, U / (2 dx) (inputs.gusts.Turbulence: dx = min(c/16, L/200)); the lower one bounds it
    dx = min(sc.chord / 16.0, g["scale_length"] / 200.0)
    f_top = min(0.5 / dt, 0.5 * sc.speed / dx)
    psm0 = power_spectral_method(sc, 2.0 * math.pi * f_top)
    if psm0 is not None:
        unf["power_spectral_method"] = dict(psm0, cut_off_hz=f_top,
                                            note="2-D section: N0 grows with the log of the cut-off (here "
                                                 "the lower of the record's Nyquist frequency and the "
                                                 "turbulence grid's, U / (2 dx))")
    block["unfiltered"] = unf
    top = {"n_rms": st["n_rms"], "A_bar": st["A_bar"], "N0": st["N0"], "N0_cut_off_Hz": st["cut_off_hz"]}
    seeds = realisation_seeds_of(sc)
    if more:
        comb = combine_realisations([st] + list(more), seeds[:1 + len(more)])
        block["realisations"] = comb
        top.update({k: comb[k]["mean"] for k in STAT_KEYS})
        top.update({f"{k}_std": comb[k]["std"] for k in STAT_KEYS})
        block["realisations_note"] = (f"n_rms, A_bar and N0 are the means over {comb['count']} realisations "
                                      f"(seeds {', '.join(str(x) for x in comb['seeds'])}), each "
                                      f"{st['record_s']:.4g} s after the start-up; *_std is their spread "
                                      f"(sample standard deviation), the history is the first")
    block["statistics_caution"] = STATISTICS_CAUTION
    return dict(top, turbulence=block)


def realisation_seeds_of(sc):
    """The seeds of the scenario's turbulence realisations (the first is the run's own)."""
    from ..inputs.gusts import realisation_seeds
    g = turbulence_gust(sc)
    return realisation_seeds(g) if g is not None else []
