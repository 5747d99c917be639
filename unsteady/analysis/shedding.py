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
    """``[airfoil] lesp_critical`` of a scenario, or None."""
    return sc.data.get("airfoil", {}).get("lesp_critical")


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


def shedding_summary(history, sc):
    """Summary entries: ``lesp_max`` (largest |LESP|, away from instantaneous changes of the
    motion) with ``t_lesp_max``; with ``lesp_critical`` also ``lev_onset_t`` (s, None if the
    leading edge never shed), ``gamma_lev_final`` and the caution of a shedding run."""
    out = {}
    if "lesp" in history and len(history["lesp"]):
        lesp = np.abs(np.asarray(history["lesp"], dtype=float))
        ok = _kept_rows(history, sc) & np.isfinite(lesp)
        if ok.any():
            i = np.nonzero(ok)[0][int(np.argmax(lesp[ok]))]
            out.update(lesp_max=float(lesp[i]), t_lesp_max=float(history["t"][i]))
    crit = critical_value(sc)
    if crit is not None and "gamma_lev" in history:
        g = np.asarray(history["gamma_lev"], dtype=float)
        shed = np.nonzero(g != 0.0)[0]
        out["lev_onset_t"] = float(history["t"][shed[0]]) if shed.size else None
        out["gamma_lev_final"] = float(g[-1]) if g.size else 0.0
        out["lesp_critical"] = float(crit)
        if shed.size:
            out["caution"] = SHEDDING_CAUTION
    return out


def lesp_warning(history, sc):
    """The warning line when a run without ``lesp_critical`` passes :data:`LESP_TYPICAL`, else None;
    it names when |LESP| first passed that value (where a shedding run would start to shed)."""
    if critical_value(sc) is not None or "lesp" not in history:
        return None
    s = shedding_summary(history, sc)
    if s.get("lesp_max", 0.0) <= LESP_TYPICAL:
        return None
    a = np.abs(np.asarray(history["lesp"], dtype=float))
    first = np.flatnonzero(np.isfinite(a) & (a > LESP_TYPICAL))
    passed = (f"; first past it at t = {float(np.asarray(history['t'])[first[0]]):.4g} s"
              if first.size else "")
    return (f"the leading-edge suction parameter |LESP| reached {s['lesp_max']:.3g} at "
            f"t = {s['t_lesp_max']:.4g} s, beyond the about {LESP_TYPICAL:g} at which thin sections "
            f"typically shed a leading-edge vortex (Ramesh et al. 2014, from memory{passed}): the flow would "
            f"separate at the leading edge; set airfoil.lesp_critical to let the vortex model shed there")
