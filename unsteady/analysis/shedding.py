"""Leading-edge shedding in the headline numbers: onset, peak suction parameter, the typical critical value.

The leading-edge suction parameter LESP (the ``lesp`` column, A0 of the bound
vorticity; K. Ramesh, A. Gopalarathnam, K. Granlund, M. V. Ol & J. R.
Edwards, J. Fluid Mech. 751, 2014) tells where a rounded leading edge stops
carrying its suction: past a critical value, which depends on the section
and the Reynolds number but not on the motion, a leading-edge vortex forms.
With ``[airfoil] lesp_critical`` the vortex model sheds there
(:class:`unsteady.vortex.sites.LeadingEdgeSite`); without it, a run whose
|LESP| passes :data:`LESP_TYPICAL` is told that its attached flow would have
separated at the leading edge (:mod:`unsteady.analysis.verdict`).
"""

from __future__ import annotations

import numpy as np

from ..core.cautions import SHEDDING_CAUTION
from .summary import impulse_mask

#: A typical critical LESP: Ramesh et al. (2014) list critical values of about 0.1 to 0.25
#: for the thin and moderately thick sections and the Reynolds numbers (1e3 to 1e6) they
#: studied (from memory, not checked against the paper at hand); 0.18 stands for them.
LESP_TYPICAL = 0.18

#: Headline peaks of a run that sheds from the leading edge are those of a centred running
#: mean over max(steps, chords of travel) of these sizes: each step's new vortex makes the
#: loads ripple from step to step (common practice of discrete-vortex methods).
RUNNING_MEAN = (5, 0.1)


def critical_value(sc):
    """``[airfoil] lesp_critical`` of a scenario (the first element's), or None."""
    return sc.data.get("airfoil", {}).get("lesp_critical")


def element_criticals(sc):
    """Each element's ``lesp_critical`` (None where it never sheds), in file order."""
    from ..inputs.elements import lesp_criticals
    return lesp_criticals(sc.data.get("airfoil", {}))


def element_label(i, n):
    """How a message names element ``i`` (1-based) of ``n``: its table and the key prefix."""
    if n == 1:
        return "", "airfoil."
    return f"element {i} (airfoil[{i - 1}])", f"airfoil[{i - 1}]." if i > 1 else "airfoil."


def _kept_rows(history, sc):
    t = np.asarray(history["t"], dtype=float)
    times = [T for T in sc.kinematics.singular_times() if t.size and t[0] <= T <= t[-1]]
    if not times:
        return np.ones(t.shape, bool)
    return ~impulse_mask(t, times, sc.dt, sc.chord / sc.speed)


def running_mean_s(history, sc):
    """Width (s) of the running mean of the headline peaks, or None when the leading edge never shed."""
    if "gamma_lev" not in history or not np.any(np.asarray(history["gamma_lev"]) != 0.0):
        return None
    steps, chords = RUNNING_MEAN
    return max(steps * sc.dt, chords * sc.chord / sc.speed)


def _peak_lesp(history, sc, column):
    lesp = np.abs(np.asarray(history[column], dtype=float))
    ok = _kept_rows(history, sc) & np.isfinite(lesp)
    if not ok.any():
        return None
    i = np.nonzero(ok)[0][int(np.argmax(lesp[ok]))]
    return float(lesp[i]), float(history["t"][i])


def _onset(history, column):
    g = np.asarray(history[column], dtype=float)
    shed = np.nonzero(g != 0.0)[0]
    return (float(history["t"][shed[0]]) if shed.size else None), (float(g[-1]) if g.size else 0.0)


def shedding_summary(history, sc):
    """Summary entries: ``lesp_max`` (largest |LESP| of the first element, away from instantaneous
    changes of the motion) with ``t_lesp_max``; with ``lesp_critical`` also ``lev_onset_t`` (s, None if
    the leading edge never shed), ``gamma_lev_final`` and the caution of a shedding run.

    With several elements also ``lesp_max_<i>``, ``t_lesp_max_<i>`` for every element i and, for each
    that may shed, ``lev_onset_t_<i>``, ``gamma_lev_final_<i>``, ``lesp_critical_<i>``; then
    ``lev_onset_t`` is the first onset over the elements, ``gamma_lev_final`` their sum and
    ``lesp_critical`` the first element's (absent when it never sheds)."""
    out = {}
    if "lesp" in history and len(history["lesp"]):
        peak = _peak_lesp(history, sc, "lesp")
        if peak is not None:
            out.update(lesp_max=peak[0], t_lesp_max=peak[1])
    crits = element_criticals(sc)
    several = len(crits) > 1
    if several:
        for i in range(1, len(crits) + 1):
            if f"lesp_{i}" in history and len(history[f"lesp_{i}"]):
                peak = _peak_lesp(history, sc, f"lesp_{i}")
                if peak is not None:
                    out[f"lesp_max_{i}"], out[f"t_lesp_max_{i}"] = peak
    if not any(c is not None for c in crits) or "gamma_lev" not in history:
        return out
    if not several:
        out["lev_onset_t"], out["gamma_lev_final"] = _onset(history, "gamma_lev")
        out["lesp_critical"] = float(crits[0])
    else:
        onsets = []
        for i, c in enumerate(crits, start=1):
            if c is None or f"gamma_lev_{i}" not in history:
                continue
            t_i, g_i = _onset(history, f"gamma_lev_{i}")
            out[f"lev_onset_t_{i}"], out[f"gamma_lev_final_{i}"] = t_i, g_i
            out[f"lesp_critical_{i}"] = float(c)
            if t_i is not None:
                onsets.append(t_i)
        out["lev_onset_t"] = min(onsets) if onsets else None
        g = np.asarray(history["gamma_lev"], dtype=float)
        out["gamma_lev_final"] = float(g[-1]) if g.size else 0.0
        if crits[0] is not None:
            out["lesp_critical"] = float(crits[0])
    if out["lev_onset_t"] is not None:
        out["caution"] = SHEDDING_CAUTION
    return out


def lesp_warnings(history, sc):
    """The warning lines of the elements without ``lesp_critical`` whose |LESP| passes
    :data:`LESP_TYPICAL` (one per element, naming it when there are several); each names when |LESP|
    first passed that value (where a shedding run would start to shed)."""
    crits = element_criticals(sc)
    n = len(crits)
    out = []
    for i, c in enumerate(crits, start=1):
        column = "lesp" if n == 1 else f"lesp_{i}"
        if c is not None or column not in history or not len(history[column]):
            continue
        peak = _peak_lesp(history, sc, column)
        if peak is None or peak[0] <= LESP_TYPICAL:
            continue
        a = np.abs(np.asarray(history[column], dtype=float))
        first = np.flatnonzero(np.isfinite(a) & (a > LESP_TYPICAL))
        passed = (f"; first past it at t = {float(np.asarray(history['t'])[first[0]]):.4g} s"
                  if first.size else "")
        name, prefix = element_label(i, n)
        whose = f"the leading-edge suction parameter |LESP| of {name}" if name else \
            "the leading-edge suction parameter |LESP|"
        out.append(f"{whose} reached {peak[0]:.3g} at "
                   f"t = {peak[1]:.4g} s, beyond the about {LESP_TYPICAL:g} at which thin sections "
                   f"typically shed a leading-edge vortex (Ramesh et al. 2014, from memory{passed}): the flow "
                   f"would separate at {'its' if name else 'the'} leading edge; set {prefix}lesp_critical to "
                   f"let the vortex model shed there")
    return out
