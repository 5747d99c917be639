"""Aircraft heave: the section stands for the wing and rises or sinks under its lift, giving the load factor.

Model (per unit span, common practice for gust-load estimates; K. G. Pratt
& W. G. Walker, NACA Report 1206, 1954, make the same assumptions: rigid
aeroplane, heave only, no pitch response)::

    m' h'' = L' - m' g,    L' = kappa cl q c,    n = L' / (m' g)

with m' = mass / span the wing mass per span, span = wing_area / chord,
q = rho U^2 / 2 and cl the section's lift coefficient from the vortex model
(circulatory and apparent-mass parts alike).  Without ``aspect_ratio``,
kappa = 1 (a 2-D section).  With it, kappa = a(A) / (2 pi), Helmbold's
finite-wing lift slope (H. B. Helmbold, 1942, as used in the USAF DATCOM)
over the thin-airfoil slope: the whole section lift is scaled, as a
quasi-steady correction; the unsteady finite-wing effects (the lag of the
trailing-vortex downwash) are NOT modelled, and the ``cl`` column stays the
section's.

Level flight at the start: the attitude is trimmed so that the steady
section lift in still air at t = 0 carries the weight, kappa cl q c = m' g.
The pitch law of ``[motion]`` (if any) is read as the change of attitude
from that trimmed attitude; a prescribed plunge is not allowed (the heave is
free).  The summary gives the trimmed attitude as ``alpha_trim_deg``.

Integration: the solver calls :meth:`HeaveMotion.state` before the solve at
each step and :meth:`HeaveMotion.after_step` after the loads; the heave rate
advances by second-order Adams-Bashforth and the height by the trapezoidal
rule.  The apparent mass of the section, pi rho c^2 / 4 per span, is a
fraction 1/(4 mu_g) of the wing mass (2-D); it enters explicitly, through
the loads of the previous step, which is stable for the mass ratios of
aircraft (mu_g of order 10 or more).
"""

from __future__ import annotations

import math

import numpy as np

from . import theory
from .errors import InputError
from .scenario import number, register_section, unknown_keys

__all__ = ["HeaveMotion", "check_aircraft_section", "G", "lift_scale"]

#: Standard acceleration of gravity, m/s^2 (U.S. Standard Atmosphere 1976).
G = 9.80665

#: Above this level-flight lift coefficient the check warns that the trimmed
#: section is near stall (thin sections reach cl of about 1 near 10-15 degrees
#: at drone Reynolds numbers: common practice).
CL_LEVEL_LIMIT = 1.0
#: Above this level-flight lift coefficient the check refuses the scenario.
CL_LEVEL_MAX = 2.0


def lift_scale(aspect_ratio):
    """kappa = a(A) / (2 pi) (Helmbold's slope over the 2-D one), 1 for no aspect ratio."""
    if aspect_ratio is None:
        return 1.0
    return theory.helmbold_lift_slope(aspect_ratio) / (2.0 * math.pi)


@register_section("aircraft")
def check_aircraft_section(value, ctx):
    """Check ``[aircraft]``: mass (kg), wing_area (m^2), optional aspect_ratio; (resolved, [InputError])."""
    if not isinstance(value, dict):
        return value, [InputError("aircraft", "must be a table [aircraft] with mass (kg) and wing_area (m^2)")]
    errors = unknown_keys(value, {"mass", "wing_area", "aspect_ratio"}, "aircraft.")
    out = {}
    for key, unit in (("mass", "kg"), ("wing_area", "m^2")):
        if key not in value:
            errors.append(InputError(f"aircraft.{key}", f"is required ({unit}, > 0)"))
            continue
        try:
            out[key] = number(f"aircraft.{key}", value[key], gt=0.0, unit=unit)
        except InputError as e:
            errors.append(e)
    if "aspect_ratio" in value:
        try:
            out["aspect_ratio"] = number("aircraft.aspect_ratio", value["aspect_ratio"], gt=0.0,
                                         unit="(span^2 / wing area)")
        except InputError as e:
            errors.append(e)
    if "plunge" in ctx.get("motion", {}):
        errors.append(InputError("motion.plunge", "cannot be prescribed with [aircraft]: the aircraft heaves "
                                                  "freely under its lift; remove motion.plunge or [aircraft]"))
    c = ctx.get("airfoil", {}).get("chord")
    if not errors and c and "wing_area" in out and out["wing_area"] < c * c:
        errors.append(InputError("aircraft.wing_area", f"is {out['wing_area']:g} m^2, less than chord^2 = "
                                                       f"{c * c:g} m^2: the span (wing_area / chord) would be "
                                                       f"shorter than the chord"))
    U, rho = ctx.get("flow", {}).get("speed"), ctx.get("flow", {}).get("density")
    if not errors and U and rho and isinstance(ctx.get("_warnings"), list):
        cl_w = out["mass"] * G / (0.5 * rho * U * U * out["wing_area"] * lift_scale(out.get("aspect_ratio")))
        if cl_w > CL_LEVEL_MAX:
            errors.append(InputError(
                "aircraft.mass", f"level flight would need a section lift coefficient of {cl_w:.2f}; an "
                                 f"attached-flow section gives at most about 1.5 before it stalls, and this model "
                                 f"accepts up to {CL_LEVEL_MAX:g}: raise flow.speed or aircraft.wing_area, or "
                                 f"lower aircraft.mass"))
        elif cl_w > CL_LEVEL_LIMIT:
            ctx["_warnings"].append(InputError(
                "aircraft.mass", f"level flight needs a section lift coefficient of {cl_w:.2f}, above "
                                 f"{CL_LEVEL_LIMIT:g}: the wing would be near stall, outside the attached-flow "
                                 f"model; raise flow.speed or aircraft.wing_area"))
    return out, errors


class _Fixed:
    """A motion frozen at one attitude (for trimming)."""

    def __init__(self, alpha, alpha_dot):
        self.s = (alpha, alpha_dot, 0.0, 0.0)

    def state(self, t):
        return self.s

    def after_step(self, t, dt, loads):
        pass


class _LastCl:
    def on_step(self, s):
        self.cl = s.loads["cl"]


class HeaveMotion:
    """Free heave of the aircraft under the section lift (the solver's motion AND an observer).

    Parameters
    ----------
    sc : Scenario
        With ``[aircraft]``.
    kinematics : Kinematics
        The prescribed pitch (read as the change from the trimmed attitude).

    Attributes
    ----------
    columns : list of str
        ``n`` (load factor) and ``h_ddot`` (heave acceleration, m/s^2).
    alpha_trim : float
        Attitude at t = 0 that carries the weight in level flight, rad.
    """

    columns = ["n", "h_ddot"]

    def __init__(self, sc, kinematics):
        ac = sc.data["aircraft"]
        self.sc = sc
        self.kin = kinematics
        self.mass = ac["mass"]
        self.S = ac["wing_area"]
        self.c = sc.chord
        self.span = self.S / self.c
        self.m_span = self.mass / self.span                  # m'
        self.W_span = self.m_span * G                        # m' g
        self.q = 0.5 * sc.density * sc.speed ** 2
        self.kappa = lift_scale(ac.get("aspect_ratio"))
        self.cl_level = self.W_span / (self.kappa * self.q * self.c)
        self.n_per_cl = self.kappa * self.q * self.c / self.W_span   # n = n_per_cl cl
        t0 = 0.0
        alpha0, alpha_dot0, _, _ = kinematics.state(t0)
        self.alpha_offset = self._trim(alpha0, alpha_dot0) - alpha0
        self.alpha_trim = alpha0 + self.alpha_offset
        self.h = 0.0
        self.h_dot = 0.0
        self.a_prev = None
        self.n_rows = []
        self.a_rows = []
        _register_plot()

    # -- trim ---------------------------------------------------------------
    def _steady_cl(self, body, alpha, alpha_dot):
        from .solver import VortexSolver
        obs = _LastCl()
        VortexSolver(body, _Fixed(alpha, alpha_dot), speed=self.sc.speed,
                     density=self.sc.density, dt=self.sc.dt, steps=0, start="steady").run([obs])
        return obs.cl

    def _trim(self, alpha0, alpha_dot0):
        """Attitude whose steady still-air cl equals cl_level (secant iteration on the vortex model)."""
        from .runner import build_body
        body = build_body(self.sc)
        a0 = alpha0
        f0 = self._steady_cl(body, a0, alpha_dot0) - self.cl_level
        a1 = a0 - f0 / (2.0 * math.pi)           # thin-airfoil slope for the first step
        for _ in range(20):
            f1 = self._steady_cl(body, a1, alpha_dot0) - self.cl_level
            if abs(f1) < 1e-12 * max(1.0, self.cl_level) or f1 == f0:
                break
            a0, a1, f0 = a1, a1 - f1 * (a1 - a0) / (f1 - f0), f1
        if not (math.isfinite(a1) and abs(a1) < math.radians(45.0)
                and abs(self._steady_cl(body, a1, alpha_dot0) - self.cl_level) < 1e-6 * max(1.0, self.cl_level)):
            raise InputError("aircraft.mass", f"no attitude below 45 degrees gives the level-flight lift "
                                              f"coefficient {self.cl_level:.3f}: raise flow.speed or "
                                              f"aircraft.wing_area, or lower aircraft.mass")
        return a1

    # -- the solver's motion interface --------------------------------------
    def state(self, t):
        """(alpha, alpha_dot, h, h_dot) at time t: prescribed pitch + trim, free heave."""
        alpha, alpha_dot, _, _ = self.kin.state(t)
        return alpha + self.alpha_offset, alpha_dot, self.h, self.h_dot

    def after_step(self, t, dt, loads):
        """Advance the heave from t to t + dt with the lift of step t: m' h'' = L' - m' g."""
        n = self.n_per_cl * loads["cl"]
        a = G * (n - 1.0)
        self.n_rows.append(n)
        self.a_rows.append(a)
        if self.a_prev is None:
            h_dot_new = self.h_dot + dt * a
        else:
            h_dot_new = self.h_dot + dt * (1.5 * a - 0.5 * self.a_prev)
        self.h += 0.5 * dt * (self.h_dot + h_dot_new)
        self.h_dot = h_dot_new
        self.a_prev = a

    # -- for a compiled march (unsteady.linear_kernels) ----------------------
    def pitch(self, t):
        """(alpha, alpha_dot) at times t (vectorised): the prescribed pitch plus the trim offset."""
        t = np.asarray(t, dtype=float)
        alpha, alpha_dot, _, _ = self.kin.state(t)
        return (np.broadcast_to(np.asarray(alpha, dtype=float) + self.alpha_offset, t.shape).copy(),
                np.broadcast_to(np.asarray(alpha_dot, dtype=float), t.shape).copy())

    def heave_constants(self):
        """The constants of :meth:`after_step`: ``n_per_cl`` (n = n_per_cl cl, i.e. kappa q c / (m' g)),
        ``g`` (m/s^2), and the start state ``h``, ``h_dot`` (m, m/s)."""
        return {"n_per_cl": self.n_per_cl, "g": G, "h": self.h, "h_dot": self.h_dot}

    def take_rows(self, n, h_ddot, h_end, h_dot_end):
        """Record the rows of a compiled march, as if :meth:`after_step` had run for each."""
        self.n_rows = list(np.asarray(n, dtype=float))
        self.a_rows = list(np.asarray(h_ddot, dtype=float))
        self.h, self.h_dot = float(h_end), float(h_dot_end)
        self.a_prev = self.a_rows[-1] if self.a_rows else None

    # -- observer -----------------------------------------------------------
    def on_step(self, s):
        pass

    def finish(self, history):
        """Fill the ``n`` and ``h_ddot`` columns."""
        k = len(history["t"])
        history["n"] = np.asarray(self.n_rows[:k], dtype=float)
        history["h_ddot"] = np.asarray(self.a_rows[:k], dtype=float)

    def summary(self, history):
        """Trim, mass ratio and, for one vertical 1-cosine gust, the gust-formula estimate."""
        lift_slope = 2.0 * math.pi * self.kappa
        wing_loading = self.mass * G / self.S
        mu_g = theory.gust_mass_ratio(wing_loading, self.sc.density, self.c, lift_slope, G)
        out = {
            "alpha_trim_deg": math.degrees(self.alpha_trim),
            "cl_level": self.cl_level,
            "wing_loading_N_m2": wing_loading,
            "mass_ratio_mu_g": mu_g,
            "lift_slope_per_rad": lift_slope,
            "lift_scaling": (f"section lift scaled by kappa = {self.kappa:.4f} (Helmbold slope for aspect ratio "
                             f"{self.sc.data['aircraft']['aspect_ratio']:g} over 2 pi); unsteady finite-wing "
                             f"effects are not modelled" if self.kappa != 1.0 else
                             "2-D section lift (no aspect-ratio correction)"),
        }
        n = history.get("n")
        if n is not None and np.isfinite(n).any():
            out["dn_max"] = float(np.nanmax(n) - 1.0)
            out["dn_min"] = float(np.nanmin(n) - 1.0)
        gusts = self.sc.data.get("gust")
        gusts = [gusts] if isinstance(gusts, dict) else list(gusts or [])
        if len(gusts) == 1 and gusts[0]["profile"] == "one-minus-cosine" \
                and gusts[0].get("direction", "vertical") == "vertical":
            U_de = gusts[0]["amplitude"]
            dn, K_g, _ = theory.gust_load_factor_increment(wing_loading, self.sc.density, self.sc.speed,
                                                           U_de, self.c, lift_slope, G)
            out.update(dn_formula=dn, gust_alleviation_factor=K_g,
                       gust_formula=("Pratt-Walker: dn = K_g rho U U_de a / (2 W/S), K_g = 0.88 mu_g / "
                                     "(5.3 + mu_g), mu_g = 2 (W/S) / (rho c a g); true airspeed and the "
                                     "flight density; derived for a 1-cosine gust 25 chords long"))
            # the peak comes while the aircraft is still in the gust or just after;
            # a run that ends before the gust has passed the airfoil has no peak yet
            t_passed = gusts[0].get("arrival", 0.0) + (gusts[0]["length"] + self.c) / self.sc.speed
            t_end = float(history["t"][-1]) if len(history["t"]) else 0.0
            if "dn_max" in out and t_end >= t_passed:
                out["dn_ratio"] = out["dn_max"] / dn
            elif "dn_max" in out:
                out["dn_ratio_note"] = (f"no ratio: the run ends at t = {t_end:.4g} s, before the gust has "
                                        f"passed the airfoil (t = {t_passed:.4g} s); lengthen run.duration")
        out["load_caution"] = theory.GUST_CAUTION
        return out


def plot_gust_loads(result, out_dir):
    """gust-loads.png: gust at the leading edge and load factor, with the peak, the gust-formula
    estimate and the full gust-load caution (written only for runs with ``n``)."""
    h, s = result.history, result.summary
    if "n" not in h or not len(h["n"]):
        return
    from pathlib import Path

    from . import plots
    fig = plots._figure(8, 5.4)
    ax1 = fig.add_subplot(2, 1, 1)
    ax2 = fig.add_subplot(2, 1, 2, sharex=ax1)
    for ax in (ax1, ax2):
        plots._style(ax)
    t = h["t"]
    if "w_gust" in h:
        ax1.plot(t, h["w_gust"], color=plots.LOOK["trace"], lw=1.2, label="vertical gust w")
    if "u_gust" in h and np.any(h["u_gust"] != 0):
        ax1.plot(t, h["u_gust"], color=plots.LOOK["second"], lw=1.0, ls="--", label="streamwise gust u")
    ax1.set_ylabel("gust at the leading edge (m/s)", fontsize=8)
    ax1.legend(fontsize=7, frameon=False, loc="best")
    ax2.plot(t, h["n"], color=plots.LOOK["trace"], lw=1.4, label="load factor n (vortex model)")
    ax2.axhline(1.0, color=plots.LOOK["muted"], lw=0.7, ls=":")
    if "n_max" in s:
        ax2.plot([s["t_n_max"]], [s["n_max"]], "o", color=plots.LOOK["second"], ms=4,
                 label=f"peak n = {s['n_max']:.3f}")
    if "dn_formula" in s:
        ax2.axhline(1.0 + s["dn_formula"], color=plots.LOOK["second"], lw=0.9, ls="--",
                    label=f"gust formula 1 + {s['dn_formula']:.3f} (mu_g = {s['mass_ratio_mu_g']:.1f})")
    ax2.set_ylabel("load factor n", fontsize=8)
    ax2.set_xlabel("time t (s)", fontsize=9)
    ax2.legend(fontsize=7, frameon=False, loc="best")
    fig.suptitle(plots._title(result, "gust loads"), fontsize=10)
    fig.tight_layout(rect=(0, 0.06, 1, 1))
    import textwrap
    fig.text(0.01, 0.005, "\n".join(textwrap.wrap(theory.GUST_CAUTION, 150)), fontsize=6.5,
             color=plots.LOOK["muted"], ha="left", va="bottom")
    plots._save(fig, Path(out_dir) / "gust-loads.png")


def _register_plot():
    from . import plots
    if plot_gust_loads not in plots.EXTRA_PLOTS:
        plots.EXTRA_PLOTS.append(plot_gust_loads)


_register_plot()   # runs with `n` get gust-loads.png, also when redrawn by `unsteady pictures`
