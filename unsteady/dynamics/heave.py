"""Aircraft heave: the section stands for the wing and rises or sinks under its lift, giving the load factor.

Model (per unit span, common practice for gust-load estimates; K. G. Pratt
& W. G. Walker, NACA Report 1206, 1954, make the same assumptions: rigid
aeroplane, heave only, no pitch response)::

    m' h'' = L' - m' g,    L' = kappa cl q c,    n = L' / (m' g)

with m' = mass / span the wing mass per span, span = wing_area / chord,
q = rho U^2 / 2 and cl the section's lift coefficient from the run model
(circulatory and apparent-mass parts alike).  Without ``aspect_ratio``,
kappa = 1 (a 2-D section).  With it, kappa = a(A) / (2 pi), Helmbold's
finite-wing lift slope (H. B. Helmbold, 1942, as used in the USAF DATCOM)
over the thin-airfoil slope: the whole section lift is scaled, as a
quasi-steady correction; the unsteady finite-wing effects (the lag of the
trailing-vortex downwash) are NOT modelled, and the ``cl`` column stays the
section's.

Level flight at the start: the attitude is trimmed so that the steady
section lift in still air at t = 0 carries the weight, kappa cl q c = m' g
(:meth:`HeaveMotion.trim`, on the steady lift the run model gives:
:meth:`unsteady.simulation.models.Model.steady_cl`).
The pitch law of ``[motion]`` (if any) is read as the change of attitude
from that trimmed attitude; a prescribed plunge is not allowed (the heave is
free).  The summary gives the trimmed attitude as ``alpha_trim_deg``.

Integration: the model calls :meth:`HeaveMotion.state` before the solve at
each step and :meth:`HeaveMotion.after_step` after the loads; the heave rate
advances by second-order Adams-Bashforth and the height by the trapezoidal
rule (:func:`unsteady.linear.kernels.heave_step`, shared with the compiled
march of the linear model).  The apparent mass of the section, about
pi rho c^2 / 4 per span, is a fraction of about 1/(4 mu_g) of the wing mass
(2-D): with the loads of the previous step alone the step grew without
bound once that fraction reached a quarter, as in a light aircraft of broad
chord (measured: mu_g 0.53, W/S 10 N/m^2 on a 0.5 m chord, diverged in the
vortex model; mu_g 0.26 in the linear one).  So the run model hands over its
own apparent mass and the difference rule of its loads after the trim
(:meth:`HeaveMotion.set_apparent_mass`; the vortex model measures it,
:meth:`unsteady.simulation.models.VortexModel.heave_apparent_mass`), and the
step takes that part of the lift implicitly.
"""

from __future__ import annotations

import math

import numpy as np

from .. import theory
from ..core.cautions import GUST_CAUTION
from ..core.errors import InputError
from ..inputs.aircraft import G, lift_scale
from ..inputs.gusts import gust_list
from ..linear.kernels import heave_step

__all__ = ["HeaveMotion"]

class HeaveMotion:
    """Free heave of the aircraft under the section lift: a model's motion, and its columns and summary.

    Build it, then :meth:`trim` it on the run model's steady lift before the
    march; the runner calls :meth:`finish` and :meth:`summary` after it.

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
        self.alpha_offset = None          # set by trim()
        self.alpha_trim = None
        self.h = 0.0
        self.h_dot = 0.0
        self.rest_prev = 0.0
        self.h_rates = []                 # h' of the last steps, oldest first (the difference's input)
        self.h_diff = 0.0                 # the loads' difference of h' at the last step (m/s^2)
        self.apparent_mass = None         # set by set_apparent_mass()
        self.mu_a = None
        self.difference = None
        self.n_rows = []
        self.a_rows = []

    # -- trim ---------------------------------------------------------------
    def trim(self, steady_cl):
        """Trim for level flight: the attitude whose steady still-air cl equals ``cl_level``.

        Secant iteration on the model's own steady lift, started with the
        thin-airfoil slope 2 pi; sets ``alpha_offset`` (added to the pitch law)
        and ``alpha_trim``.  Call once, before the march.

        Parameters
        ----------
        steady_cl : callable
            ``steady_cl(alpha, alpha_dot) -> cl`` of the run model
            (:meth:`unsteady.simulation.models.Model.steady_cl`).

        Raises
        ------
        InputError
            (key ``aircraft.mass``) when no attitude below 45 degrees carries the weight.
        """
        alpha0, alpha_dot0, _, _ = self.kin.state(0.0)
        alpha = self._secant(lambda x: steady_cl(x, alpha_dot0) - self.cl_level, alpha0)
        self.alpha_offset = alpha - alpha0
        self.alpha_trim = alpha0 + self.alpha_offset
        return self

    def _secant(self, f, a0):
        """Root of f near a0 (rad), checked to lie below 45 degrees."""
        f0 = f(a0)
        a1 = a0 - f0 / (2.0 * math.pi)           # thin-airfoil slope for the first step
        for _ in range(20):
            f1 = f(a1)
            if abs(f1) < 1e-12 * max(1.0, self.cl_level) or f1 == f0:
                break
            a0, a1, f0 = a1, a1 - f1 * (a1 - a0) / (f1 - f0), f1
        if not (math.isfinite(a1) and abs(a1) < math.radians(45.0)
                and abs(f(a1)) < 1e-6 * max(1.0, self.cl_level)):
            raise InputError("aircraft.mass", f"no attitude below 45 degrees gives the level-flight lift "
                                              f"coefficient {self.cl_level:.3f}: raise flow.speed or "
                                              f"aircraft.wing_area, or lower aircraft.mass")
        return a1

    def set_apparent_mass(self, A, difference):
        """The run model's apparent mass ``A`` in heave (kg/m, per span; its lift's part -A h'') and
        the difference rule of its loads, ``difference(values, dt)`` (the time derivative of the last
        of a short history of h'); the heave step takes that part implicitly
        (:func:`unsteady.linear.kernels.heave_step`).  Call once, after the trim, before the march."""
        self.apparent_mass = float(A)
        self.mu_a = self.kappa * self.apparent_mass / self.m_span
        self.difference = difference
        return self

    # -- the solver's motion interface --------------------------------------
    def state(self, t):
        """(alpha, alpha_dot, h, h_dot) at time t: prescribed pitch + trim, free heave."""
        alpha, alpha_dot, _, _ = self.kin.state(t)
        return alpha + self._offset(), alpha_dot, self.h, self.h_dot

    def _offset(self):
        if self.alpha_offset is None:
            raise RuntimeError("HeaveMotion.trim(steady_cl) must run before the march")
        return self.alpha_offset

    def after_step(self, t, dt, loads):
        """Advance the heave from t to t + dt with the lift of step t (:func:`unsteady.linear.kernels.heave_step`)."""
        n, a = self._heave(dt, loads)
        self.n_rows.append(n)
        self.a_rows.append(a)

    def _heave(self, dt, loads):
        """The heave from t to t + dt (:func:`unsteady.linear.kernels.heave_step`); returns (n, h'')."""
        if self.mu_a is None:
            raise RuntimeError("HeaveMotion.set_apparent_mass(A, difference) must run before the march")
        first = not self.h_rates
        self.h_rates.append(self.h_dot)
        del self.h_rates[:-3]
        self.h_diff = float(self.difference(self.h_rates, dt))
        # the step's Python source as it stands (plain IEEE arithmetic; the compiled
        # form may fuse multiply-adds, which the vortex histories need not see)
        n, a, self.rest_prev, self.h, self.h_dot = heave_step.py_func(
            float(loads["cl"]), self.h, self.h_dot, self.rest_prev, first, dt, self.n_per_cl, G,
            self.mu_a, self.h_diff)
        return n, a

    # -- for a compiled march (unsteady.linear.kernels.march_heave) -----------
    def pitch(self, t):
        """(alpha, alpha_dot) at times t (vectorised): the prescribed pitch plus the trim offset."""
        t = np.asarray(t, dtype=float)
        alpha, alpha_dot, _, _ = self.kin.state(t)
        return (np.broadcast_to(np.asarray(alpha, dtype=float) + self._offset(), t.shape).copy(),
                np.broadcast_to(np.asarray(alpha_dot, dtype=float), t.shape).copy())

    def heave_constants(self):
        """The constants of :meth:`after_step`: ``n_per_cl`` (n = n_per_cl cl, i.e. kappa q c / (m' g)),
        ``g`` (m/s^2), ``mu_a`` (kappa A / m', :meth:`set_apparent_mass`) and the start state ``h``,
        ``h_dot`` (m, m/s)."""
        if self.mu_a is None:
            raise RuntimeError("HeaveMotion.set_apparent_mass(A, difference) must run before the march")
        return {"n_per_cl": self.n_per_cl, "g": G, "mu_a": self.mu_a, "h": self.h, "h_dot": self.h_dot}

    def take_rows(self, n, h_ddot, h_end, h_dot_end):
        """Record the rows of a compiled march, as if :meth:`after_step` had run for each."""
        self.n_rows = list(np.asarray(n, dtype=float))
        self.a_rows = list(np.asarray(h_ddot, dtype=float))
        self.h, self.h_dot = float(h_end), float(h_dot_end)

    # -- for the runner, after the march ------------------------------------
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
            # the run model's own apparent mass in heave (kg/m, per span) beside the wing's mass per span
            "apparent_mass_per_span": self.apparent_mass,
            "mass_per_span": self.m_span,
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
        gusts = gust_list(gusts)
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
