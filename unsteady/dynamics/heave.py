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

from .. import theory
from ..core.cautions import GUST_CAUTION
from ..core.errors import InputError
from ..inputs.aircraft import G, lift_scale

__all__ = ["HeaveMotion"]

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
        ``n`` (load factor) and ``height_accel_m_s2`` (heave acceleration, m/s^2).
    alpha_trim : float
        Attitude at t = 0 that carries the weight in level flight, rad.
    """

    columns = ["n", "height_accel_m_s2"]

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

    # -- trim ---------------------------------------------------------------
    def _steady_cl(self, body, alpha, alpha_dot):
        from ..vortex.solver import VortexSolver
        obs = _LastCl()
        VortexSolver(body, _Fixed(alpha, alpha_dot), speed=self.sc.speed,
                     density=self.sc.density, dt=self.sc.dt, steps=0, start="steady").run([obs])
        return obs.cl

    def _trim(self, alpha0, alpha_dot0):
        """Attitude whose steady still-air cl equals cl_level (secant iteration on the vortex model)."""
        from ..vortex.solver import build_body
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
        """Fill the ``n`` and ``height_accel_m_s2`` columns."""
        k = len(history["t"])
        history["n"] = np.asarray(self.n_rows[:k], dtype=float)
        history["height_accel_m_s2"] = np.asarray(self.a_rows[:k], dtype=float)

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
        out["load_caution"] = GUST_CAUTION
        return out
