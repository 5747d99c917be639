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
tail's area is span times its chord.  The heave is
:func:`unsteady.linear.kernels.heave_step`; the pitch rate advances by
second-order Adams-Bashforth and the attitude by the trapezoidal rule, the
same scheme, with the moment of the previous step (explicit, like the
heave: stable while the apparent pitch inertia of the elements is a small
part of I').

The start is trimmed (:meth:`PitchHeaveMotion.trim`): level flight, lift
equal to the weight and zero moment about the centre of gravity, solved by
Newton's method for the attitude and the incidence of the last element (an
all-moving tail) on the run model's own steady loads.  No trim (no
solution within 20 iterations, an attitude beyond 20 degrees or a tail
turned beyond 30 degrees from its given incidence) stops the run with a
clear message before anything is written.
"""

from __future__ import annotations

import math

import numpy as np

from ..core.errors import InputError
from ..inputs.aircraft import G
from ..linear.kernels import heave_step
from .heave import HeaveMotion

__all__ = ["PitchHeaveMotion", "pitch_step"]

#: Largest trimmed attitude and tail turn accepted (deg).
MAX_TRIM_ALPHA_DEG = 20.0
MAX_TAIL_TURN_DEG = 30.0


def pitch_step(m_coef, theta, theta_dot, acc_prev, first, dt):
    """One step of the free pitch: theta'' = ``m_coef`` (rad/s^2, from the step's moment); AB2 on
    the rate (Euler on the ``first`` step), trapezoidal rule on the angle (common practice)."""
    if first:
        rate_next = theta_dot + dt * m_coef
    else:
        rate_next = theta_dot + dt * (1.5 * m_coef - 0.5 * acc_prev)
    return theta + 0.5 * dt * (theta_dot + rate_next), rate_next


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
        self.n_el = len(sc.data["airfoil"]["_more"]) + 1
        self.tail_trim = 0.0
        self.theta = 0.0
        self.theta_dot = 0.0
        self.m_prev = None
        self.pa_rows = []
        self.tail_rows = []

    def trim(self, steady_loads):
        """Trim on ``steady_loads(alpha, tail_turn) -> (cl, cm_cg)`` of the run model (rad, rad).

        Raises
        ------
        InputError
            (key ``aircraft.cg``) when no trim exists within the limits.
        """
        x = np.array([math.radians(2.0), 0.0])
        cl_w = self.cl_level

        def f(v):
            cl, cm = steady_loads(float(v[0]), float(v[1]))
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
            fx = f(x)
            if not np.isfinite(x).all() or abs(x[0]) > 1.0 or abs(x[1]) > 1.0:
                break
            if abs(fx[0]) < 1e-9 * max(1.0, cl_w) and abs(fx[1]) < 1e-9:
                ok = True
                break
        if not ok or abs(math.degrees(x[0])) > MAX_TRIM_ALPHA_DEG or abs(math.degrees(x[1])) > MAX_TAIL_TURN_DEG:
            raise InputError("aircraft.cg", f"no trim: no attitude within {MAX_TRIM_ALPHA_DEG:g} degrees with the "
                                            f"tail turned within {MAX_TAIL_TURN_DEG:g} degrees carries the weight "
                                            f"(cl {cl_w:.3f}) with zero moment about the centre of gravity; "
                                            f"move aircraft.cg, the tail's position or incidence, or change "
                                            f"the speed or mass")
        self.alpha_offset = self.alpha_trim = float(x[0])
        self.tail_trim = float(x[1])
        self.theta = self.alpha_trim
        return self

    def state(self, t):
        self._offset()
        return self.theta, self.theta_dot, self.h, self.h_dot

    def after_step(self, t, dt, loads):
        first = self.a_prev is None
        n, a, self.h, self.h_dot = heave_step.py_func(float(loads["cl"]), self.h, self.h_dot,
                                                      0.0 if first else self.a_prev, first, dt,
                                                      self.n_per_cl, G)
        m = self.m_per_cm * float(loads["cm_pivot"])      # the pitch axis is the centre of gravity
        self.theta, self.theta_dot = pitch_step(m, self.theta, self.theta_dot,
                                                0.0 if first else self.m_prev, first, dt)
        self.m_prev = m
        self.n_rows.append(n)
        self.a_rows.append(a)
        self.a_prev = a
        self.pa_rows.append(math.degrees(m))
        self.tail_rows.append(float(loads[f"cl_{self.n_el}"]) * self.q * self.c * self.span)

    def pitch(self, t):
        raise NotImplementedError("pitch freedom runs with the vortex model only")

    def finish(self, history):
        super().finish(history)
        k = len(history["t"])
        history["pitch_accel_deg_s2"] = np.asarray(self.pa_rows[:k], dtype=float)
        history["tail_load_N"] = np.asarray(self.tail_rows[:k], dtype=float)

    def summary(self, history):
        out = super().summary(history)
        out.update(trimmed=(f"attitude {math.degrees(self.alpha_trim):.4g} deg and the tail (last element) "
                            f"turned {math.degrees(self.tail_trim):+.4g} deg from its given incidence: lift "
                            f"equal to the weight, zero moment about the centre of gravity"),
                   tail_trim_deg=math.degrees(self.tail_trim),
                   pitch_inertia_per_span=self.I_span)
        p = history.get("pitch_deg")
        if p is not None and len(p):
            out["pitch_change_max_deg"] = float(np.nanmax(np.abs(np.asarray(p) - math.degrees(self.alpha_trim))))
        tl = history.get("tail_load_N")
        if tl is not None and np.isfinite(tl).any():
            out["tail_load_max_N"] = float(np.nanmax(tl))
            out["tail_load_min_N"] = float(np.nanmin(tl))
        return out
