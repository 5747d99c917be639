"""An aircraft with a tail, free to heave and to pitch about its centre of gravity.

Model (per unit span, rigid aircraft, constant flight speed U; common
practice of the longitudinal short-period analysis, e.g. B. Etkin &
L. D. Reid, *Dynamics of Flight: Stability and Control*, 3rd ed., 1996,
ch. 4 and 6 (chapter numbers from memory))::

    m' h''     = L' - m' g,          L' = cl q c
    I' theta'' = M',                 M' = cm_cg q c^2

with m' = mass / span, I' = pitch_inertia / span, span = wing_area / c (c
the first element's chord), q = rho U^2 / 2, cl the total lift of every
element and cm_cg their nose-up moment about the centre of gravity, both
on the reference chord (:func:`unsteady.vortex.elements.combine_loads`;
the pitch axis of the run is the centre of gravity, ``Scenario.pivot``).
The 2-D sections stand for the wing and the tail with the same span: the
tail's area is span times its chord.  The rates advance by second-order
Adams-Bashforth and the attitude and height by the trapezoidal rule with
the loads of the step, less the part that answers the change of the rates
within the step (the elements' apparent inertia, measured on the run model
after the trim, :meth:`unsteady.simulation.models.VortexModel.apparent_inertia`),
which is taken implicitly: in the heave as for a single section
(:func:`unsteady.linear.kernels.heave_step`, its cross term from the pitch
explicit), then in the pitch with the heave's step (:func:`pitch_step`).
Taken explicitly, the apparent pitch inertia of a tail, about
pi rho (c_t/2)^2 l_t^2 per span, made the step grow without bound once it was
a quarter of I' (measured: a tail of the wing's chord 12 chords aft on
5 kg m^2, or 6 chords aft on 0.15 kg m^2), and sooner with a smaller step.

The start is trimmed (:meth:`PitchHeaveMotion.trim`): level flight, lift
equal to the weight and zero moment about the centre of gravity, solved by
Newton's method (a 2 x 2 system, its Jacobian by forward differences) on
the run model's own steady loads for the attitude and either the incidence
of the last element (an all-moving tail) or, when the last element has a
flap (``flap_hinge``), that flap's deflection (an elevator; the tail keeps
its given incidence).  No trim (no solution within 20 iterations, an
attitude beyond 20 degrees, a tail turned beyond 30 degrees from its given
incidence or an elevator beyond 20 degrees) stops the run with a clear
message before anything is written.

:class:`HeldAttitudeHeave` is the heave-only companion of a gust run: the
same aircraft, trim and tail, with the attitude held at the trim (the
classical gust-load assumption of heave alone, K. G. Pratt & W. G. Walker,
NACA Report 1206, 1954); the runner flies it beside the free-pitch run and
compares the peaks (:func:`heave_only_comparison`).
"""

from __future__ import annotations

import math

import numpy as np

from ..core.errors import InputError, RunStopped
from .heave import HeaveMotion

__all__ = ["PitchHeaveMotion", "HeldAttitudeHeave", "heave_only_comparison", "pitch_step"]

#: Largest trimmed attitude, tail turn and tail-flap (elevator) deflection accepted (deg).
MAX_TRIM_ALPHA_DEG = 20.0
MAX_TAIL_TURN_DEG = 30.0
MAX_TAIL_FLAP_DEG = 20.0
#: A run whose attitude leaves the trim by more than this (deg) stops (:class:`PitchRunaway`).
RUNAWAY_DEG = 90.0


class PitchRunaway(RunStopped):
    """The attitude left the trim by more than :data:`RUNAWAY_DEG`: the run stops there, the steps
    before it kept (``Result.error``; ``unsteady run`` exits 1)."""

    def __init__(self, step, t, change_deg):
        RuntimeError.__init__(self, f"the attitude left the trim by {change_deg:.3g} degrees at step {step} "
                                    f"(t = {t:.6g} s), beyond {RUNAWAY_DEG:g}: the aircraft diverges in pitch, "
                                    f"most likely statically unstable (the centre of gravity aft of the neutral "
                                    f"point); move aircraft.cg forward, or the tail aft or larger")
        self.step, self.t = step, t


def pitch_step(acc, rates, d_h, rest_prev, dt, inertia, apparent, heave_accel, difference):
    """One step of the free pitch, the model's apparent pitch inertia taken implicitly.

    The pitch equation (module docstring), I' theta'' = M'.  The step's moment holds a part that
    answers the change of the rates within the step, -(A_tt D_theta + A_th D_h), D the loads' own
    difference of the rates (``difference(values, dt)``, the model's rule; for the vortex model the
    second-order backward difference, :func:`unsteady.vortex.loads.backward_derivative`), A_tt and
    A_th the pitch row of the model's measured apparent inertia
    (:meth:`unsteady.simulation.models.VortexModel.apparent_inertia`).  Taken explicitly (the moment
    of the step driving the next rate) that part feeds back on itself and grows without bound once
    A_tt is about a quarter of I' (with the second-order difference); so it is moved to the left,
    the added-mass partitioned scheme of fluid-structure coupling (common practice; C. Förster,
    W. A. Wall & E. Ramm, Comput. Methods Appl. Mech. Engrg. 196, 2007, show why the explicit
    coupling fails)::

        M_rest,n = M'_n + A_tt D_theta,n + A_th D_h,n
        (I' + A_tt) (theta'_{n+1} - theta'_n) / dt = 1.5 M_rest,n - 0.5 M_rest,n-1 - A_th h''_n+

    (Euler on the first step) with h''_n+ = (h'_{n+1} - h'_n) / dt the heave's own step, taken
    first (:func:`unsteady.linear.kernels.heave_step`).  The angle follows by the trapezoidal rule.  With A = 0
    it is the explicit step.

    Parameters
    ----------
    acc : float
        M'_n / I' (rad/s^2).
    rates : list of float
        theta' of the steps so far, oldest first (the last three are used); the last is this step's.
    d_h : float
        D_h,n, the loads' difference of h' at this step (m/s^2; the heave's, ``HeaveMotion.h_diff``).
    rest_prev : float or None
        The previous step's M_rest / I' (None on the first step).
    dt, inertia : float
        Step (s) and I' (kg m^2 per span).
    apparent : (float, float)
        (A_tt, A_th), per span.
    heave_accel : float
        h''_n+ (m/s^2).
    difference : callable

    Returns
    -------
    rate_next, rest : float
        theta' at the next step, and this step's M_rest / I'.
    """
    a_tt, a_th = apparent
    rest = acc + (a_tt * difference(rates[-3:], dt) + a_th * d_h) / inertia
    drive = rest if rest_prev is None else 1.5 * rest - 0.5 * rest_prev
    return rates[-1] + dt * (inertia * drive - a_th * heave_accel) / (inertia + a_tt), rest


class PitchHeaveMotion(HeaveMotion):
    """Free heave and pitch of a wing with its tail (module docstring); a model's motion.

    Attributes
    ----------
    columns : list of str
        ``n``, ``height_accel_m_s2``, ``pitch_accel_deg_s2`` and ``tail_load_N`` (the last
        element's lift over the whole span, N).
    alpha_trim, tail_trim : float
        Trimmed attitude and the tail's change of incidence from the given one (rad).
    """

    columns = ["n", "height_accel_m_s2", "pitch_accel_deg_s2", "tail_load_N"]

    def __init__(self, sc, kinematics):
        super().__init__(sc, kinematics)
        ac = sc.data["aircraft"]
        self.I_span = ac["pitch_inertia"] / self.span          # I'
        self.m_per_cm = self.q * self.c * self.c / self.I_span  # theta'' per unit cm_cg
        more = sc.data["airfoil"]["_more"]
        self.n_el = len(more) + 1
        #: True when the last element has a flap: the trim deflects it (an elevator) instead of turning the tail
        self.elevator = "flap_hinge" in more[-1]
        self.tail_trim = 0.0
        self.tail_flap_trim = None
        self.theta = 0.0
        self.theta_dot = 0.0
        #: (A_tt, A_th), the pitch row of the model's apparent inertia (:meth:`set_apparent_inertia`)
        self.apparent = None
        self.theta_rates = []             # theta' of the last steps, oldest first
        self.pitch_rest_prev = None
        self.pa_rows = []
        self.tail_rows = []

    @property
    def tail_control(self):
        """(tail_turn, tail_flap) of the trim, rad, as the model's ``set_tail_turn`` takes them."""
        return self.tail_trim, self.tail_flap_trim

    def trim(self, steady_loads):
        """Trim on ``steady_loads(alpha, tail_turn[, tail_flap]) -> (cl, cm_cg)`` of the run model (rad).

        The unknowns are the attitude and the tail's turn, or with an elevator
        (:attr:`elevator`) its deflection (the tail's incidence as given).

        Raises
        ------
        InputError
            (key ``aircraft.cg``) when no trim exists within the limits.
        """
        x = np.array([math.radians(2.0), 0.0])
        cl_w = self.cl_level
        if self.elevator:
            def loads(v):
                return steady_loads(float(v[0]), 0.0, float(v[1]))
            limit, what = MAX_TAIL_FLAP_DEG, "the tail's flap (elevator) deflected"
        else:
            def loads(v):
                return steady_loads(float(v[0]), float(v[1]))
            limit, what = MAX_TAIL_TURN_DEG, "the tail turned"

        def f(v):
            cl, cm = loads(v)
            return np.array([cl - cl_w, cm])

        fx = f(x)
        ok = False
        for _ in range(20):
            h = 1e-4
            J = np.column_stack([(f(x + np.array([h, 0.0])) - fx) / h, (f(x + np.array([0.0, h])) - fx) / h])
            try:
                step = np.linalg.solve(J, -fx)
            except np.linalg.LinAlgError:
                break
            x = x + step
            if not np.isfinite(x).all() or abs(x[0]) > 1.0 or abs(x[1]) > 1.0:
                break
            fx = f(x)
            if abs(fx[0]) < 1e-9 * max(1.0, cl_w) and abs(fx[1]) < 1e-9:
                ok = True
                break
        if not ok or abs(math.degrees(x[0])) > MAX_TRIM_ALPHA_DEG or abs(math.degrees(x[1])) > limit:
            raise InputError("aircraft.cg", f"no trim: no attitude within {MAX_TRIM_ALPHA_DEG:g} degrees with "
                                            f"{what} within {limit:g} degrees carries the weight "
                                            f"(cl {cl_w:.3f}) with zero moment about the centre of gravity; "
                                            f"move aircraft.cg, the tail's position or incidence, or change "
                                            f"the speed or mass")
        self.alpha_offset = self.alpha_trim = float(x[0])
        if self.elevator:
            self.tail_flap_trim = float(x[1])
        else:
            self.tail_trim = float(x[1])
        self.theta = self.alpha_trim
        return self

    def trimmed(self):
        """The sentence saying what the trim set (the summary's ``trimmed``)."""
        if self.elevator:
            return (f"attitude {math.degrees(self.alpha_trim):.4g} deg and the tail's flap (last element, an "
                    f"elevator) deflected {math.degrees(self.tail_flap_trim):+.4g} deg (trailing edge down "
                    f"positive), the tail at its given incidence: lift equal to the weight, zero moment about "
                    f"the centre of gravity")
        return (f"attitude {math.degrees(self.alpha_trim):.4g} deg and the tail (last element) turned "
                f"{math.degrees(self.tail_trim):+.4g} deg from its given incidence: lift equal to the weight, "
                f"zero moment about the centre of gravity")

    def state(self, t):
        self._offset()
        return self.theta, self.theta_dot, self.h, self.h_dot

    def set_apparent_inertia(self, A, difference):
        """The run model's apparent inertia ``A`` (2 x 2, per span: rows M' and L', columns theta'' and
        h''; :meth:`unsteady.simulation.models.VortexModel.apparent_inertia`) and the difference rule
        of its loads (``difference(values, dt)``): its pitch row is taken implicitly by the step
        (:func:`pitch_step`).  Call once, after the trim, before the march."""
        A = np.asarray(A, dtype=float)
        self.apparent = (float(A[0, 0]), float(A[0, 1]))    # the pitch row
        self.set_apparent_mass(A[1, 1], difference)         # the heave's own (its cross term explicit)
        return self

    def after_step(self, t, dt, loads):
        if self.apparent is None:
            raise RuntimeError("PitchHeaveMotion.set_apparent_inertia(A, difference) must run before the march")
        h_dot = self.h_dot
        self.theta_rates.append(self.theta_dot)
        del self.theta_rates[:-3]
        n, a = self._heave(dt, loads)
        m = self.m_per_cm * float(loads["cm_pivot"])      # the pitch axis is the centre of gravity
        rate_next, self.pitch_rest_prev = pitch_step(m, self.theta_rates, self.h_diff, self.pitch_rest_prev, dt,
                                                     self.I_span, self.apparent, (self.h_dot - h_dot) / dt,
                                                     self.difference)
        self.theta += 0.5 * dt * (self.theta_dot + rate_next)
        self.theta_dot = rate_next
        self.n_rows.append(n)
        self.a_rows.append(a)
        self.pa_rows.append(math.degrees(m))
        self.tail_rows.append(float(loads[f"cl_{self.n_el}"]) * self.q * self.c * self.span)
        if not abs(self.theta - self.alpha_trim) <= math.radians(RUNAWAY_DEG):
            raise PitchRunaway(int(round(t / dt)), t, math.degrees(abs(self.theta - self.alpha_trim)))

    def pitch(self, t):
        raise NotImplementedError("pitch freedom runs with the vortex model only")

    def finish(self, history):
        super().finish(history)
        k = len(history["t"])
        history["pitch_accel_deg_s2"] = np.asarray(self.pa_rows[:k], dtype=float)
        history["tail_load_N"] = np.asarray(self.tail_rows[:k], dtype=float)

    def summary(self, history):
        out = super().summary(history)
        if self.elevator:
            out.update(trimmed=self.trimmed(), tail_flap_trim_deg=math.degrees(self.tail_flap_trim))
        else:
            out.update(trimmed=self.trimmed(), tail_trim_deg=math.degrees(self.tail_trim))
        out["pitch_inertia_per_span"] = self.I_span
        if self.apparent is not None:
            # the elements' apparent pitch inertia about the centre of gravity (per span), as measured
            out["apparent_pitch_inertia_per_span"] = self.apparent[0]
        p = history.get("pitch_deg")
        if p is not None and len(p):
            out["pitch_change_max_deg"] = float(np.nanmax(np.abs(np.asarray(p) - math.degrees(self.alpha_trim))))
        tl = history.get("tail_load_N")
        if tl is not None and np.isfinite(tl).any():
            out["tail_load_max_N"] = float(np.nanmax(tl))
            out["tail_load_min_N"] = float(np.nanmin(tl))
        return out


class HeldAttitudeHeave(HeaveMotion):
    """The heave-only companion of a free-pitch run: free heave with the attitude held at the trim.

    The same aircraft, trim and tail as ``pitched`` (a trimmed
    :class:`PitchHeaveMotion`): the attitude stays at its ``alpha_trim``
    (no pitch freedom), the heave follows :class:`HeaveMotion`, and the tail's
    load is recorded as in the free-pitch run (the classical gust-load
    assumption of heave alone: K. G. Pratt & W. G. Walker, NACA Report 1206,
    1954).  The run starts level to the trim's tolerance, as the free-pitch one.

    Attributes
    ----------
    columns : list of str
        ``n``, ``height_accel_m_s2`` and ``tail_load_N``.
    """

    columns = ["n", "height_accel_m_s2", "tail_load_N"]

    def __init__(self, sc, kinematics, pitched):
        super().__init__(sc, kinematics)
        self.alpha_offset = self.alpha_trim = pitched.alpha_trim
        self.n_el = pitched.n_el
        self.tail_rows = []

    def after_step(self, t, dt, loads):
        super().after_step(t, dt, loads)
        self.tail_rows.append(float(loads[f"cl_{self.n_el}"]) * self.q * self.c * self.span)

    def pitch(self, t):
        raise NotImplementedError("the heave-only companion runs with the vortex model only")

    def finish(self, history):
        super().finish(history)
        history["tail_load_N"] = np.asarray(self.tail_rows[:len(history["t"])], dtype=float)


def _dn_peak(n_max, n_min):
    """The peak load-factor increment: the larger excursion from level flight, up or down."""
    return max(n_max - 1.0, 1.0 - n_min)


def heave_only_comparison(pitched, held, rows):
    """The summary block comparing the free-pitch run with its heave-only companion.

    Parameters
    ----------
    pitched, held : dict
        ``n_max``, ``n_min`` (headline peaks, the same rows left out in both) and the
        ``tail_load_N`` column of each run.
    rows : int
        Rows of the companion run (fewer than the free-pitch run's when it stopped early).

    Returns
    -------
    dict
        ``heave_only`` {n_max, n_min, t_n_max, dn_peak, tail_load_max_N, tail_load_min_N,
        dtail_load_peak_N}, ``dn_ratio_pitch_to_heave_only`` (peak load-factor increment, the
        larger of n_max - 1 and 1 - n_min, with pitch over without) and
        ``tail_load_ratio_pitch_to_heave_only`` (the peak change of the tail load from its
        trimmed value, with pitch over without).
    """
    out = {}
    block = {k: held[k] for k in ("n_max", "n_min", "t_n_max") if held.get(k) is not None}
    dn_h = dn_p = None
    if "n_max" in block and "n_min" in block:
        dn_h = block["dn_peak"] = _dn_peak(block["n_max"], block["n_min"])
    if pitched.get("n_max") is not None and pitched.get("n_min") is not None:
        dn_p = _dn_peak(pitched["n_max"], pitched["n_min"])
    tl_h, tl_p = np.asarray(held["tail_load_N"], float), np.asarray(pitched["tail_load_N"], float)
    dtl_h = dtl_p = None
    if tl_h.size and np.isfinite(tl_h).any():
        block["tail_load_max_N"] = float(np.nanmax(tl_h))
        block["tail_load_min_N"] = float(np.nanmin(tl_h))
        dtl_h = block["dtail_load_peak_N"] = float(np.nanmax(np.abs(tl_h - tl_h[0])))
    if tl_p.size and np.isfinite(tl_p).any():
        dtl_p = float(np.nanmax(np.abs(tl_p - tl_p[0])))
    block["rows"] = int(rows)
    out["heave_only"] = block
    if dn_h and dn_p is not None:
        out["dn_ratio_pitch_to_heave_only"] = dn_p / dn_h
    if dtl_h and dtl_p is not None:
        out["tail_load_ratio_pitch_to_heave_only"] = dtl_p / dtl_h
    return out
