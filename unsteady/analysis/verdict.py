"""Where the model is out of its depth: the warnings a run measures on its own history.

The scenario check estimates some of these before anything runs (the gust
checker's effective-angle estimate, ``Scenario.warnings``); this module
measures them on what the run produced, so the user is told what actually
happened.  Each warning is a ``(key, message)`` pair naming the input that
drove it; the runner writes them into ``summary["warnings"]`` as lines
``warning: <file>: <key>: <message>`` after the scenario's own warnings,
``unsteady run`` prints the measured ones on stderr,
and the pictures, films and the report show them.  A gentle run gets none.

What is measured (limits marked common practice where no source is named):

1. **Effective angle** beyond the attached-flow range: the lag block's
   validity verdict (:func:`unsteady.analysis.lag.validity`: 12 degrees at
   the three-quarter chord, the ``alpha_eff_deg`` column).
2. **Reduced pitch rate** alpha_dot c / (2U) beyond 0.05 (the same verdict):
   a leading-edge vortex would form.
3. (Impulsive motion is known exactly from the inputs: the scenario check
   warns of it, :mod:`unsteady.inputs.estimates`.)
4. **Reversed flow**: a streamwise gust at least as strong as the flight
   speed (U + u <= 0 at the leading edge): the section then meets the air
   from behind, which no part of this model describes.
5. **Lift beyond a section's maximum**: |cl| beyond :data:`CL_MAX_TYPICAL`
   (1.5; common practice: NACA 4-digit sections reach about 1.2-1.6 at
   small-drone Reynolds numbers); with ``[aircraft]`` the load factor such a
   section could carry is given beside the computed one.
6. **The two load routes disagree** (vortex model): the pressure
   integration and the vortex impulse are two exact routes to the same
   force, so a gap beyond :data:`ROUTE_TOLERANCE` of the peak |cl|, away
   from instantaneous changes of the motion, means the step or the elements
   do not resolve the flow (with leading-edge shedding: on the running mean
   of the headline peaks).
7. **The wake passes through the airfoil** (vortex model, free wake): a
   wake vortex of a snapshot lies on the chord (within 2 % of the chord of
   it, between 2 % and 98 % of the chord), or for a thick section
   (surface panels) inside its outline, or, with several elements, on a
   further element's camber line (the same band on its own chord; the
   wing's wake meeting the tail), where the discrete vortices
   induce unbounded velocities and the loads stop meaning anything.
   Leading-edge vortices are left out, and once the leading edge has shed
   the check is not made: in separated flow vortices travel along the
   suction side by nature, and the model then lets every vortex but the
   newest trailing-edge ones meet the body through a soft core and keeps
   them on their side of it (``VortexSolver._soft_indices``).
8. **Leading-edge suction** (run without ``[airfoil] lesp_critical``):
   |LESP| beyond :data:`unsteady.analysis.shedding.LESP_TYPICAL` (0.18, a
   typical critical value of Ramesh et al. 2014, from memory): the leading
   edge would shed a vortex; the warning suggests ``lesp_critical``.  With
   ``lesp_critical`` the model sheds, so 1, 2 and 5 (the attached-flow
   limits) no longer apply and are not given; the caution of such a run
   says that the critical value is a model parameter.  With several
   elements each one without a ``lesp_critical`` of its own is judged on
   its ``lesp_<i>`` and named; 1 and 2 (the first element's effective
   angle) go with the first element's key, 5 (the total lift) with any.
9. **Extreme ground effect** (``[ground]``): the camber line closer to the
   ground than :data:`GROUND_NEAR` (5 %) of the chord, where the section's
   thickness and the ground's boundary layer set the flow under it.
"""

from __future__ import annotations

import math

import numpy as np

from ..inputs.estimates import angle_text, motion_key
from ..inputs.elements import sheds_anywhere
from .shedding import critical_value, lesp_warnings
from .summary import impulse_mask, running_mean

#: |cl| beyond which a real section would have stalled (common practice, see module docstring).
CL_MAX_TYPICAL = 1.5
#: Largest gap between the pressure and impulse lift, as a fraction of the peak |cl| (common practice).
ROUTE_TOLERANCE = 0.05
#: Half-thickness of the band about the chord (fraction of chord) where a wake vortex counts as inside.
WAKE_BAND = 0.02
#: Clearance above the ground (fraction of chord) below which the inviscid camber-line model is out of
#: its depth: the section's thickness and the ground's own boundary layer then set the flow under it
#: (extreme ground effect; common practice).
GROUND_NEAR = 0.05


def _gust_key(sc):
    """The key a gust warning names: the gust's strength, or the whole list of gusts."""
    g = sc.data.get("gust")
    if g is None:
        return None
    if isinstance(g, dict):
        return f"gust.{'intensity' if g.get('profile') == 'turbulence' else 'amplitude'}"
    return "gust"


def measured_warnings(history, sc, summary, snapshots=None):
    """The ``(key, message)`` pairs of a finished run (see the module docstring).

    Parameters
    ----------
    history : dict of ndarray
        The complete history (``alpha_eff_deg`` and ``pitch_rate_deg_s``
        columns included).
    sc : Scenario
    summary : dict
        The run's summary, its ``lag`` block (peaks and validity verdict) included.
    snapshots : dict, optional
        The run's snapshots (wake positions), for the wake-through-airfoil check.
    """
    out = []
    t = np.asarray(history["t"], dtype=float)
    if t.size == 0:
        return out
    gust_key = _gust_key(sc)
    mkey = motion_key(sc.data.get("motion", {}))
    vortex = sc.data["run"].get("model", "vortex") == "vortex"

    # 1-2: the attached-flow verdict, as the lag block found it (a run that may shed from
    # the leading edge has left attached flow on purpose: the LESP verdict, 8, replaces it)
    lag = summary["lag"]
    v = lag["validity"]
    sheds = critical_value(sc) is not None          # the first element's (its effective angle)
    sheds_any = sheds_anywhere(sc.data.get("airfoil", {}))
    a_max = abs(lag.get("peak_effective_alpha_deg", 0.0))
    if not sheds and a_max > v["alpha_eff_limit_deg"]:
        i = int(np.nanargmax(np.abs(history["alpha_eff_deg"])))
        out.append((gust_key or mkey,
                    f"the effective angle of attack reached {angle_text(a_max)} at t = {t[i]:.4g} s, "
                    f"beyond the {v['alpha_eff_limit_deg']:g} degrees of attached flow: a real section "
                    f"would separate or stall there, and these attached-flow loads overstate it"))
    k_max = lag.get("peak_pitch_rate", 0.0)
    if not sheds and k_max > v["pitch_rate_limit"]:
        out.append(("motion.pitch",
                    f"the reduced pitch rate alpha_dot c/(2U) reached {k_max:.3f}, beyond "
                    f"{v['pitch_rate_limit']:g}: the leading edge would shed a vortex, which an "
                    f"attached-flow run leaves out"))

    # 8: the leading-edge suction parameter past a typical critical value, without shedding
    # (per element: each one without lesp_critical of its own, named when there are several)
    for lesp in lesp_warnings(history, sc):
        out.append((gust_key or mkey, lesp))

    times = [T for T in sc.kinematics.singular_times() if t[0] <= T <= t[-1]]

    # 4: reversed flow
    if "u_gust" in history:
        u_min = float(np.nanmin(np.asarray(history["u_gust"], float)))
        if sc.speed + u_min <= 0.0:
            out.append((gust_key or "gust",
                        f"the streamwise gust reaches {u_min:.3g} m/s against a flight speed of "
                        f"{sc.speed:.3g} m/s: the air meets the section from behind, which this model "
                        f"does not describe"))

    # 5: lift beyond a section's maximum
    cl = np.asarray(history["cl"], float)
    keep = np.ones(t.shape, bool)
    if times:
        keep = ~impulse_mask(t, times, sc.dt, sc.chord / sc.speed)
    if "peaks_from_s" in summary:
        keep &= t >= summary["peaks_from_s"]
    if keep.any() and np.isfinite(cl[keep]).any():
        i = np.nonzero(keep)[0][int(np.nanargmax(np.abs(cl[keep])))]
        if abs(cl[i]) > CL_MAX_TYPICAL and not sheds_any:
            msg = (f"the section lift coefficient reached {cl[i]:.3g} at t = {t[i]:.4g} s, beyond the "
                   f"about {CL_MAX_TYPICAL:g} a real section carries before it stalls (common practice)")
            if "n" in history and np.isfinite(history["n"][i]) and cl[i] != cl[0]:
                # n - 1 grows with cl - cl(0) (the trimmed start carries n = 1)
                n_i = float(history["n"][i])
                n_cap = 1.0 + (n_i - 1.0) * (math.copysign(CL_MAX_TYPICAL, cl[i]) - cl[0]) / (cl[i] - cl[0])
                msg += (f": the load factor {n_i:.3g} there is more than such a section could give "
                        f"(about {n_cap:.3g})")
            out.append(("aircraft.mass" if "n" in history else gust_key or mkey, msg))

    # 6: the two load routes
    if vortex and "cl_impulse" in history and keep.any():
        cl_p, cl_i = cl, np.asarray(history["cl_impulse"], float)
        if summary.get("peaks_running_mean_s"):
            # a run that sheds from the leading edge: the routes compared as its peaks are, on the
            # running mean (each new vortex ripples both from step to step)
            k = int(round(summary["peaks_running_mean_s"] / sc.dt))
            cl_p, cl_i = running_mean(cl_p, k), running_mean(cl_i, k)
        gap = np.abs(cl_p - cl_i)
        peak = float(np.nanmax(np.abs(cl[keep])))
        if peak > 0.0 and np.isfinite(gap[keep]).any():
            j = np.nonzero(keep)[0][int(np.nanargmax(gap[keep]))]
            if gap[j] > ROUTE_TOLERANCE * peak:
                out.append(("run.dt",
                            f"the pressure and impulse routes to the lift differ by {gap[j]:.3g} "
                            f"({100 * gap[j] / peak:.0f} % of the peak) at t = {t[j]:.4g} s: the step or "
                            f"the elements do not resolve this flow; halve run.dt or raise "
                            f"airfoil.elements and compare"))

    # 9: extreme ground effect
    if "ground_clearance_m" in history and np.isfinite(history["ground_clearance_m"]).any():
        gap = np.asarray(history["ground_clearance_m"], float)
        i = int(np.nanargmin(gap))
        if gap[i] < GROUND_NEAR * sc.chord:
            out.append(("ground.height",
                        f"the section came within {gap[i]:.3g} m of the ground ({100 * gap[i] / sc.chord:.2g} % "
                        f"of the chord) at t = {t[i]:.4g} s, closer than {100 * GROUND_NEAR:g} %: there the "
                        f"section's thickness and the ground's boundary layer set the flow under it, which "
                        f"this inviscid camber-line model leaves out"))

    # 7: the wake through the airfoil (not once the leading edge has shed: every vortex near the
    # body then meets it through the soft core and is kept on its side, see the module docstring)
    if vortex and snapshots is not None and summary.get("lev_onset_t") is None:
        hit = wake_through_airfoil(snapshots, sc)
        if hit is not None:
            out.append((mkey,
                        f"wake vortices lie on the airfoil at t = {hit:.4g} s (the body meets its own "
                        f"wake): the loads after that are not to be trusted"))
        for i, hit in wake_through_elements(snapshots, sc):
            out.append((f"airfoil[{i - 1}].position",
                        f"wake vortices lie on element {i} at t = {hit:.4g} s (a wake passes through it): "
                        f"its loads after that are not to be trusted; move it out of the wake or "
                        f"halve run.dt and compare"))
    return out


def _wake_snapshots(snapshots):
    """Per non-empty snapshot: (t, x, z, alpha, h, leading-edge mask or None) of its wake vortices."""
    t = np.asarray(snapshots.get("t", ()), dtype=float)
    off = np.asarray(snapshots.get("offsets", ()), dtype=np.int64)
    if t.size == 0 or off.size < t.size + 1:
        return
    x, z = np.asarray(snapshots["x"], float), np.asarray(snapshots["z"], float)
    lev = snapshots.get("lev")
    lev = np.asarray(lev, bool) if lev is not None and len(lev) == len(snapshots["x"]) else None
    for k in range(t.size):
        a, b = off[k], off[k + 1]
        if b <= a:
            continue
        yield (float(t[k]), x[a:b], z[a:b], float(snapshots["alpha"][k]), float(snapshots["h"][k]),
               None if lev is None else lev[a:b])


def _wake_in_body_frame(snapshots):
    """Per snapshot: (t, xi, zeta) of its wake vortices in the body frame (m, origin at the pitch axis)
    and the snapshot's leading-edge mask (or None); nothing for an empty snapshot."""
    for t, x, z, al, h, lev in _wake_snapshots(snapshots):
        dz = z - h
        yield t, x * math.cos(al) - dz * math.sin(al), x * math.sin(al) + dz * math.cos(al), lev


def wake_through_elements(snapshots, sc):
    """[(i, first time (s))] for each further element i = 2, 3, ... of ``[[airfoil]]`` on whose camber
    line a wake vortex of a snapshot lies: within WAKE_BAND of its chord of the camber line, between
    2 % and 98 % of its chord (the same band as the first element's, :func:`wake_through_airfoil`),
    measured as the solver's crossing guard measures it (:meth:`unsteady.vortex.elements.CrossingGuard.offsets`,
    on the elements as the solver builds them)."""
    if not sc.data.get("airfoil", {}).get("_more"):
        return []
    from ..vortex.elements import CrossingGuard, build_elements
    guard = CrossingGuard([getattr(m, "geometry", m) for m in build_elements(sc)[1:]])
    first = {}
    for t, x, z, al, h, lev in _wake_snapshots(snapshots):
        for i, (s, d, L) in enumerate(guard.offsets(x, z, al, h), start=2):
            if i in first:
                continue
            inside = (np.abs(d) < WAKE_BAND * L) & (s > 0.02 * L) & (s < 0.98 * L)
            if lev is not None:
                inside &= ~lev
            if np.any(inside):
                first[i] = t
        if len(first) == len(guard.frames):
            break
    return sorted(first.items())


def wake_through_airfoil(snapshots, sc):
    """The first snapshot time (s) at which a wake vortex lies on the airfoil, else None.

    Wake positions are taken to body coordinates (the inverse of
    :func:`unsteady.vortex.bodies.to_inertial`). On a camber line a vortex
    counts when |zeta| < WAKE_BAND c and xi lies between 2 % and 98 % of
    the chord; on a thick section (snapshots with ``x_surface``,
    ``z_surface``, the panel mid-points in chord fractions) when it lies
    inside the outline (:func:`inside_outline`), whatever the thickness.
    """
    c, p = sc.chord, sc.pivot
    lo, hi = (0.02 - p) * c, (0.98 - p) * c
    xs, zs = snapshots.get("x_surface"), snapshots.get("z_surface")
    outline = None
    if xs is not None and zs is not None and len(xs) > 2 and len(xs) == len(zs):
        outline = ((np.asarray(xs, float) - p) * c, np.asarray(zs, float) * c)
    for t, xi, zeta, lev in _wake_in_body_frame(snapshots):
        if outline is not None:
            # only the vortices within the outline's bounding box can be inside it
            box = ((xi >= outline[0].min()) & (xi <= outline[0].max())
                   & (zeta >= outline[1].min()) & (zeta <= outline[1].max()))
            inside = np.zeros(xi.shape, bool)
            if box.any():
                inside[box] = inside_outline(xi[box], zeta[box], *outline)
        else:
            inside = (np.abs(zeta) < WAKE_BAND * c) & (xi > lo) & (xi < hi)
        if lev is not None:
            inside &= ~lev
        if np.any(inside):
            return t
    return None


def inside_outline(px, pz, xo, zo):
    """True for each point (px, pz) inside the closed polygon (xo, zo) (the last point joins the
    first): the even-odd crossing rule of a ray cast in +x (common practice in computational
    geometry)."""
    px, pz = np.asarray(px, float)[:, None], np.asarray(pz, float)[:, None]
    x0, z0 = np.asarray(xo, float)[None, :], np.asarray(zo, float)[None, :]
    x1, z1 = np.roll(x0, -1, axis=1), np.roll(z0, -1, axis=1)
    spans = (z0 > pz) != (z1 > pz)
    with np.errstate(divide="ignore", invalid="ignore"):
        xc = x0 + (pz - z0) * (x1 - x0) / (z1 - z0)
    crossings = spans & (px < xc)
    return (np.count_nonzero(crossings, axis=1) % 2) == 1


def warning_lines(pairs, source):
    """``warning: <file>: <key>: <message>`` lines of ``(key, message)`` pairs."""
    return [f"warning: {source}: {key}: {msg}" for key, msg in pairs]
