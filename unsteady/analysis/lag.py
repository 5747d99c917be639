"""Quasi-steady reference lift, lag metrics and the attached-flow validity flag of a run."""

from __future__ import annotations

import math

import numpy as np

__all__ = [
    "ALPHA_EFF_LIMIT_DEG",
    "PITCH_RATE_LIMIT",
    "effective_alpha",
    "add_quasi_steady",
    "crossing_time",
    "lag_summary",
    "validity",
    "harmonic",
]

#: Effective angle (deg) beyond which attached, inviscid results stop being
#: trustworthy: thin sections stall near 10-15 degrees at the Reynolds numbers
#: of small drones (common practice).
ALPHA_EFF_LIMIT_DEG = 12.0

#: Reduced pitch rate alpha_dot c / (2 U) beyond which a leading-edge vortex
#: forms early in a pitch-up and the attached-flow lift is no longer a good
#: guide (rounded value of common practice, stated from memory).
PITCH_RATE_LIMIT = 0.05


def effective_alpha(history, sc, gust=None):
    """Effective angle of attack at the three-quarter chord of every row, rad.

    alpha_eff = alpha - h'/U + b (1/2 - a) alpha'/U + w_g(x_3/4)/U, with h
    up, b = c/2, a = 2 pivot - 1 (T. Theodorsen, NACA Report 496, 1935;
    Abbott & von Doenhoff, Theory of Wing Sections, 1959, ch. 4): the one
    definition, :func:`unsteady.theory.effective_angle`, evaluated on the
    history by :func:`unsteady.inputs.gusts.effective_angle_history` (which
    the gust check's warning and the summary's ``alpha_eff_max_deg`` use too).

    Parameters
    ----------
    history : dict of ndarray
        Needs t, pitch_deg, pitch_rate_deg_s, height_m, height_rate_m_s.
    sc : Scenario
    gust : GustField, optional
        The scenario's gust field when the caller has it already (a long
        turbulence realisation is costly to draw twice); built otherwise.

    Returns
    -------
    numpy.ndarray
    """
    from ..inputs.gusts import build_gust_field, effective_angle_history
    if sc.data.get("gust") and gust is None:
        gust = build_gust_field(sc)
    return effective_angle_history(history, sc.speed, sc.chord, sc.pivot, gust if sc.data.get("gust") else None)


def add_quasi_steady(history, sc, gust=None, steady=None):
    """Add the columns ``alpha_eff_deg`` and ``cl_quasi_steady`` to a history (in place).

    cl_qs = 2 pi (alpha_eff - alpha_L0): the steady thin-airfoil lift at the
    instantaneous effective angle (Abbott & von Doenhoff, Theory of Wing
    Sections, 1959, ch. 4), alpha_L0 the section's zero-lift angle; with a
    flap, plus Glauert's steady flap lift dcl/dbeta beta (H. Glauert, 1926;
    :func:`unsteady.theory.flap.glauert_flap`).  Where the run model gives
    its own steady lift (``steady(alpha_eff, height) -> array``, rule 7 of
    :class:`unsteady.simulation.models.Model`: a thick section, several
    elements, a ground) that replaces 2 pi (alpha_eff - alpha_L0); its flap
    sits at its deflection at t = 0, so Glauert's term adds the change since.
    """
    from ..linear.model import section_constants
    alpha_L0, _cm0 = section_constants(sc.section)
    ae = effective_alpha(history, sc, gust)
    history["alpha_eff_deg"] = np.degrees(ae)
    own = steady(ae, history["height_m"]) if steady is not None else None
    history["cl_quasi_steady"] = 2.0 * np.pi * (ae - alpha_L0) if own is None else own
    if "flap_hinge" in sc.data["airfoil"] and "flap_deg" in history:
        from ..theory.flap import glauert_flap
        dcl, _dcm = glauert_flap(sc.data["airfoil"]["flap_hinge"])
        beta = np.radians(history["flap_deg"])
        if own is not None and len(beta):
            beta = beta - beta[0]
        history["cl_quasi_steady"] = history["cl_quasi_steady"] + dcl * beta
    return history


def crossing_time(t, y, y0, y1, fraction):
    """Time from which y stays beyond ``fraction`` of its change y0 -> y1.

    The last sample still short of y0 + fraction (y1 - y0) is found, and the
    crossing is interpolated linearly to the next sample; an early overshoot
    (an apparent-mass spike) that falls back does not count.

    Returns
    -------
    float
        The time, or nan when y is never beyond for good or the change is 0.
    """
    dy = y1 - y0
    if not np.isfinite(dy) or dy == 0.0:
        return math.nan
    f = (np.asarray(y, dtype=float) - y0) / dy
    short = np.nonzero(~(f >= fraction))[0]
    if short.size == 0:
        return float(t[0])
    i = int(short[-1])
    if i == len(f) - 1:
        return math.nan
    f0, f1 = f[i], f[i + 1]
    w = (fraction - f0) / (f1 - f0) if np.isfinite(f0) and f1 != f0 else 1.0
    return float(t[i] + w * (t[i + 1] - t[i]))


def harmonic(t, y, omega):
    """First-harmonic complex amplitude of y at omega (y ~ Re[Y e^{i omega t}]) over the samples given."""
    t = np.asarray(t, dtype=float)
    y = np.asarray(y, dtype=float)
    return 2.0 * np.mean(y * np.exp(-1j * omega * t))


def _laws(spec):
    if isinstance(spec, dict):
        return [spec]
    return list(spec or [])


def _motion_kind(sc):
    """("periodic", omega) for a sine law, ("transient", t_begin) for a ramp or step, else (None, None)."""
    mo = sc.data.get("motion", {})
    U, c = sc.speed, sc.chord
    for q in ("pitch", "plunge", "flap"):
        for law in _laws(mo.get(q)):
            if law.get("law") == "sine":
                if "frequency" in law:
                    return "periodic", 2.0 * math.pi * float(law["frequency"])
                return "periodic", 2.0 * U * float(law["reduced_frequency"]) / c
    begins = []
    leads = [0.0]
    for q in ("pitch", "plunge", "flap"):
        for law in _laws(mo.get(q)):
            if law.get("law") == "ramp":
                begins.append(float(law.get("start", 0.0)))
                # a rounded ramp starts moving about 4 smoothing times early
                # (log-cosh tail below 0.1 % of its rate); the baseline is taken there
                leads.append(4.0 * float(law.get("smoothing", 0.0) or 0.0))
            elif law.get("law") == "step":
                begins.append(float(law.get("time", 0.0)))
    if begins:
        return "transient", (min(begins), max(leads))
    return None, None


def validity(alpha_eff_deg, pitch_rate_reduced):
    """Attached-flow validity flag.

    Parameters
    ----------
    alpha_eff_deg : array_like
        Effective angle history, degrees.
    pitch_rate_reduced : array_like
        alpha_dot c / (2 U) history.

    Returns
    -------
    dict
        ``attached_flow_ok`` (bool), ``reasons`` (list of text), and the
        thresholds used with their basis.
    """
    a_max = float(np.nanmax(np.abs(alpha_eff_deg))) if np.size(alpha_eff_deg) else 0.0
    k_max = float(np.nanmax(np.abs(pitch_rate_reduced))) if np.size(pitch_rate_reduced) else 0.0
    reasons = []
    if a_max > ALPHA_EFF_LIMIT_DEG:
        reasons.append(f"effective angle reaches {a_max:.1f} deg, beyond {ALPHA_EFF_LIMIT_DEG:g} deg: "
                       "a real section would separate or stall there")
    if k_max > PITCH_RATE_LIMIT:
        reasons.append(f"reduced pitch rate reaches {k_max:.3f}, beyond {PITCH_RATE_LIMIT:g}: "
                       "a leading-edge vortex would change the lift")
    return {"attached_flow_ok": not reasons, "reasons": reasons,
            "alpha_eff_limit_deg": ALPHA_EFF_LIMIT_DEG, "pitch_rate_limit": PITCH_RATE_LIMIT,
            "basis": "common practice: thin sections stall near 10-15 deg at small-drone "
                     "Reynolds numbers; the pitch-rate limit is a rounded value from memory"}


def lag_summary(history, sc):
    """The ``lag`` block of summary.json.

    Always: ``peak_pitch_rate`` (max |alpha_dot| c / 2U), ``peak_effective_alpha_deg``
    (the effective angle of largest magnitude, signed) and ``validity``.
    Ramps and steps of pitch, plunge or flap (from the change's start): ``t50``,
    ``t90`` (s after the change begins from which cl stays beyond 50 % / 90 % of
    its final change; with a flap also ``ch_t50``, ``ch_t90`` of the hinge
    moment, its final change that to the last row),
    ``t50_qs``, ``t90_qs`` (the same for the quasi-steady cl), ``delay90`` =
    t90 - t90_qs and ``delay90_chords`` = delay90 U / c. The final change is
    that of the quasi-steady cl (the settled value after the motion stops).
    Periodic motion (over the whole periods of the run's second half):
    ``amplitude_ratio`` and ``phase_lag_deg`` (positive when cl trails) of the
    cl first harmonic against the quasi-steady cl's, and ``loop_area`` (the
    area of the cl-pitch loop per cycle, cl x degrees; positive when the loop
    runs counter-clockwise).
    """
    if "cl_quasi_steady" not in history:
        add_quasi_steady(history, sc)
    t = history["t"]
    cl, qs = history["cl"], history["cl_quasi_steady"]
    U, c = sc.speed, sc.chord
    rate = np.radians(history["pitch_rate_deg_s"]) * c / (2.0 * U)
    ae = history["alpha_eff_deg"]
    out = {}
    if len(t):
        out["peak_pitch_rate"] = float(np.nanmax(np.abs(rate)))
        j = int(np.nanargmax(np.abs(ae)))
        out["peak_effective_alpha_deg"] = float(ae[j])
    out["validity"] = validity(ae, rate)
    crit = sc.data.get("airfoil", {}).get("lesp_critical")
    if crit is not None and not out["validity"]["attached_flow_ok"]:
        # the leading edge sheds (LESP criterion): separation there is modelled, not left out
        out["validity"]["reasons"] = [
            f"beyond attached flow: the leading edge sheds vortices past LESP = {crit:g} (a model "
            "parameter), but trailing-edge stall and viscous effects are not modelled"]
    kind, par = _motion_kind(sc)
    out["motion"] = kind or "other"
    if len(t) and not np.isfinite(qs).any():
        out["note"] = ("no quasi-steady lift: at the run's effective angles and heights the body held "
                       "steady would touch the ground, so the lag metrics are left out")
        return out
    if kind == "transient" and len(t) > 1:
        t_begin, lead = par
        # the last sample before the change (a step's value at its own time is the new one)
        eps = 1e-9 * (t[1] - t[0])
        i0 = max(int(np.searchsorted(t, t_begin - lead - eps, side="left")) - 1, 0)
        sel = slice(i0, None)
        y0, y1 = cl[i0], qs[-1]
        q0 = qs[i0]
        for name, y, base in (("", cl, y0), ("_qs", qs, q0)):
            for pct in (50, 90):
                tc = crossing_time(t[sel], y[sel], base, y1, pct / 100.0)
                # interpolation inside the sampled step may land a hair before it
                out[f"t{pct}{name}"] = max(tc - t_begin, 0.0) if np.isfinite(tc) else None
        if out["t90"] is not None and out["t90_qs"] is not None:
            out["delay90"] = out["t90"] - out["t90_qs"]
            out["delay90_chords"] = out["delay90"] * U / c
        else:
            out["delay90"] = out["delay90_chords"] = None
        missing = [k for k in ("t50", "t90", "t50_qs", "t90_qs") if out[k] is None]
        if missing:
            out["note"] = (f"{', '.join(missing)} null: cl{' (quasi-steady)' if all(k.endswith('_qs') for k in missing) else ''} "
                           f"had not stayed beyond that share of its final change "
                           f"({y1 - y0:+.3g}) by the end of the run (t = {t[-1]:.4g} s) "
                           f"or crossed it back; lengthen run.duration to see it settle")
        out["t_begin"] = t_begin
        if "ch" in history and np.isfinite(history["ch"][-1]):
            # the hinge moment's lag: its final change taken as that to the run's last row
            ch = history["ch"]
            for pct in (50, 90):
                tc = crossing_time(t[sel], ch[sel], ch[i0], ch[-1], pct / 100.0)
                out[f"ch_t{pct}"] = max(tc - t_begin, 0.0) if np.isfinite(tc) else None
    elif kind == "periodic" and len(t) > 1:
        omega = par
        T = 2.0 * math.pi / omega
        periods = int((t[-1] - t[0]) / 2.0 // T)
        if periods >= 1:
            t_end = t[-1]
            sel = t > t_end - periods * T + 1e-12 * T
            sel_idx = np.nonzero(sel)[0]
            cl_hat = harmonic(t[sel], cl[sel], omega)
            qs_hat = harmonic(t[sel], qs[sel], omega)
            if abs(qs_hat) > 0:
                out["amplitude_ratio"] = float(abs(cl_hat) / abs(qs_hat))
                out["phase_lag_deg"] = float(-np.degrees(np.angle(cl_hat / qs_hat)))
            a = history["pitch_deg"]
            i = np.r_[sel_idx[0] - 1, sel_idx] if sel_idx[0] > 0 else sel_idx
            # -oint cl d(alpha) is positive for a counter-clockwise loop
            area = -np.sum(0.5 * (cl[i][1:] + cl[i][:-1]) * np.diff(a[i])) / periods
            out["loop_area"] = float(area) if np.ptp(a[i]) > 0 else None
            out["periods_used"] = periods
        else:
            out.update(amplitude_ratio=None, phase_lag_deg=None, loop_area=None,
                       note=f"periodic metrics null: they are taken over whole periods of the run's second "
                            f"half, and the run ({t[-1] - t[0]:.4g} s) is shorter than two periods "
                            f"({2.0 * T:.4g} s); lengthen run.duration")
    elif kind is None and len(t) > 1:
        out["note"] = ("no lag metrics: they are defined for a single ramp or step of pitch (t50, t90) "
                       "or a periodic motion (amplitude ratio, phase lag), not for this motion")
    return out
