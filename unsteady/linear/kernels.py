"""Compiled march of the linear model with free heave: windowed Duhamel sums, an exponential-sum memory tail, apparent mass and heave.

The indicial functions of :mod:`unsteady.theory` (Wagner's phi, Kuessner's
psi) have a deficit 1 - r(s) that decays only like 1/s, so a Duhamel sum
that keeps every past step costs O(n) per step and O(n^2) per run.  Here the
sum is split at a stated distance ``s_max`` (semichords):

* lags below s_max: the exact interval-mean weights W_m of
  :func:`unsteady.linear.indicial_weights`, summed directly;
* lags beyond s_max: W_m = 1 - D_m, where the deficit has the branch-cut
  form 1 - r(s) = int_0^inf K(x) e^{-x s} dx with a smooth positive K
  (derived in :mod:`unsteady.theory`; the Wagner kernel from Theodorsen's
  C(p) = K1/(K0 + K1), T. Theodorsen, NACA Report 496, 1935; the Kuessner
  kernel from Sears' function referred to the leading edge, W. R. Sears,
  J. Aeronaut. Sci. 8, 1941).  The integral, taken by the trapezoidal rule
  in ln x, is a finite sum of decaying exponentials, and each exponential
  is a one-term recursion: the far memory costs a fixed number of
  operations per step, whatever the length of the run (the sum-of-
  exponentials device is common practice for long-memory convolutions).

With ``tail=False`` the far memory is dropped instead (truncation: the
response forgets inputs older than s_max and reads them as settled).
"""

from __future__ import annotations

import functools
import math

import numpy as np
from numba import njit

from .. import theory

__all__ = ["memory_tail", "march_heave", "heave_step", "S_MAX_DEFAULT", "TAIL_STEP"]

#: Default window of the direct Duhamel sum, semichords (25 chords).  The far
#: memory beyond it is carried by the exponential sum, which matches the
#: tabulated weights to about 1e-9 of the deficit (tests/test_linear_kernels.py);
#: tools/benchmark_linear.py prints the change of the peak load factor against
#: a window of the whole run, and against dropping the far memory.
S_MAX_DEFAULT = 50.0

#: Step of the trapezoidal rule in u = ln x (the rule's error falls like
#: exp(-pi^2 / h) for an integrand analytic in a strip of half-width pi/2:
#: about 1e-14 at h = 0.3; common practice of the rule).
TAIL_STEP = 0.3


@functools.lru_cache(maxsize=32)
def _memory_tail_cached(name, ds, M, s_end):
    kernel = {"wagner": theory._wagner_kernel, "kuessner": theory._kuessner_kernel}[name]
    s_near = M * ds
    x_hi = 45.0 / s_near                    # e^{-x s} < 3e-20 for every lag beyond the window
    x_lo = 1e-13 / max(s_end, s_near)       # the piece below x_lo is < x_lo, relative 1e-13
    u = np.arange(math.log(x_lo), math.log(x_hi) + TAIL_STEP, TAIL_STEP)
    x = np.exp(u)
    # interval mean over [m ds, (m+1) ds] of e^{-x s}: e^{-x m ds} (1 - e^{-x ds}) / (x ds)
    mean = -np.expm1(-x * ds) / (x * ds)
    coef = TAIL_STEP * x * kernel(x) * mean * np.exp(-x * s_near)
    decay = np.exp(-x * ds)
    coef.setflags(write=False)
    decay.setflags(write=False)
    return coef, decay


def memory_tail(name, ds, M, s_end):
    """Exponential sum of the deficit of interval-mean weights beyond M lags.

    1 - W_m = sum_k coef_k decay_k^(m - M) for m >= M (see the module
    docstring), accurate for lags up to s_end semichords.

    Parameters
    ----------
    name : {"wagner", "kuessner"}
    ds : float
        Step in semichords.
    M : int
        First lag carried by the sum (the window of the direct sum), >= 1.
    s_end : float
        Longest lag needed, semichords (the run's length).

    Returns
    -------
    coef, decay : numpy.ndarray
        Read-only arrays (shared between calls with the same arguments).
    """
    return _memory_tail_cached(str(name), float(ds), int(M), float(s_end))


#: Theodorsen's apparent-mass terms compiled for the march: the one copy is
#: :func:`unsteady.theory.apparent_mass` (plain arithmetic, so numba compiles it as it stands).
#: Functions the march calls are compiled with its fastmath flags: LLVM drops the caller's
#: fast-math attributes when it inlines a callee without them (measured: the march ran 3x slower).
_apparent_mass = njit(cache=True, fastmath=True)(theory.apparent_mass)


@njit(cache=True, fastmath=True)
def heave_step(cl, h, h_dot, rest_prev, first, dt, n_per_cl, g, mu_a, d_rate):
    """One step of the free heave, m' h'' = L' - m' g (the one copy of this step).

    n = n_per_cl cl (n_per_cl = kappa q c / (m' g)), h'' = g (n - 1).  The
    lift holds a part that answers the change of the heave rate within the
    step, -kappa A D (A the run model's apparent mass per span, D = ``d_rate``
    its loads' own difference of h' at this step); taken with the lift of the
    step to drive the next rate it feeds back on itself and grows without
    bound once mu_a = kappa A / m' is about a quarter (the model's
    second-order difference) or a half (a first-order one), which a light
    aircraft with a broad chord reaches (mu_a = pi/(4 mu_g) a / (2 pi), mu_g
    the gust mass ratio).  So that part is moved to the left, the added-mass
    partitioned scheme of fluid-structure coupling (common practice;
    C. Förster, W. A. Wall & E. Ramm, Comput. Methods Appl. Mech. Engrg. 196,
    2007)::

        r_n = h''_n + mu_a D_n
        (1 + mu_a) (h'_{n+1} - h'_n) / dt = 1.5 r_n - 0.5 r_{n-1}   (Euler on the ``first`` step)

    second-order Adams-Bashforth on the rate and the trapezoidal rule on the
    height (common practice of multistep integration); with mu_a = 0 it is
    the explicit step.  Called by
    :meth:`unsteady.dynamics.heave.HeaveMotion.after_step` (from Python, for
    the vortex model and the Python march) and by :func:`march_heave`
    (compiled); it lives here, the lowest layer both reach.

    Parameters
    ----------
    cl : float
        Lift coefficient of the step.
    h, h_dot : float
        Height (m) and heave rate (m/s) at the step.
    rest_prev : float
        r of the previous step, m/s^2 (ignored when ``first``).
    first : bool
    dt, n_per_cl, g : float
        Step (s), load factor per unit cl, gravity (m/s^2).
    mu_a, d_rate : float
        kappa A / m' and the loads' difference of h' at the step (m/s^2).

    Returns
    -------
    n, h_ddot, rest, h_next, h_dot_next : float
        Load factor, heave acceleration and r of the step; height and rate at the next.
    """
    n = n_per_cl * cl
    acc = g * (n - 1.0)
    rest = acc + mu_a * d_rate
    if first:
        h_dot_next = h_dot + dt * rest / (1.0 + mu_a)
    else:
        h_dot_next = h_dot + dt * (1.5 * rest - 0.5 * rest_prev) / (1.0 + mu_a)
    return n, acc, rest, h + 0.5 * dt * (h_dot + h_dot_next), h_dot_next


@njit(cache=True, fastmath=True, error_model="numpy")
def march_heave(alpha, alpha_dot, alpha_ddot, w_le, u_le, f_q, f_cl, f_m, f_shift, R_w, R_k, W_w, W_k,
                cw, dw, ck, dk, h_ddot0, dt, U, c, pivot, alpha_L0, cm0, n_per_cl, g, mu_a,
                h, h_dot, h_ddot, n_load, cl, cd, cm, cm_pivot, cl_c, cl_nc, cl_gust, q34):
    """March the linear model with free heave over all rows (outputs filled in place).

    The arithmetic of :class:`unsteady.linear.model.LinearMarcher` driving
    :class:`unsteady.dynamics.heave.HeaveMotion`, row by row:

    * Q = alpha - alpha_L0 - h'/U + b (1/2 - a) alpha'/U; cl_c = 2 pi
      [x_0 R_n + sum_j dQ_j W_{n-j}], cl_g likewise with w_LE/U, psi
      (Duhamel superposition; H. Wagner, ZAMM 5, 1925; H. G. Kuessner,
      Luftfahrtforschung 13, 1936), lags of M = len(W) steps and more from
      the exponential sum (cw, dw), (ck, dk) (empty arrays: none);
    * apparent mass (T. Theodorsen, NACA Report 496, 1935;
      :func:`unsteady.theory.apparent_mass`), h'' from a backward difference
      of h' (row 0: ``h_ddot0``);
    * the heave by :func:`heave_step` (as HeaveMotion.after_step), ``mu_a`` its apparent mass
      over the aircraft's, D the h'' of the apparent-mass terms;
    * a prescribed flap's terms (:func:`unsteady.linear.model.flap_terms`, zeros
      without a flap): ``f_q`` added to Q, ``f_cl`` to the apparent-mass lift,
      ``f_m`` (2 cm about the pivot) to the moment, ``f_shift`` (T10 beta / pi)
      to the angle of the drag's normal-force tilt.

    Inputs are float64 arrays of the N rows (alpha with the trim offset)
    and floats; R_w, R_k are the start responses (1 for a steady start).
    """
    N = alpha.shape[0]
    b = 0.5 * c
    a = 2.0 * pivot - 1.0
    two_pi = 2.0 * math.pi
    Mw = W_w.shape[0]
    Mk = W_k.shape[0]
    Kw = cw.shape[0]
    Kk = ck.shape[0]
    Sw = np.zeros(Kw)
    Sk = np.zeros(Kk)
    dq = np.zeros(N)
    dwl = np.zeros(N)
    hc = 0.0
    hdc = 0.0
    hd_prev = 0.0
    r_prev = 0.0
    for n in range(N):
        ad_n = alpha_dot[n]
        hdd = h_ddot0 if n == 0 else (hdc - hd_prev) / dt
        q = alpha[n] - alpha_L0 - hdc / U + b * (0.5 - a) * ad_n / U + f_q[n]
        w = w_le[n]
        u = u_le[n]
        q34[n] = q
        h[n] = hc
        h_dot[n] = hdc
        if n > 0:
            dq[n] = q - q34[n - 1]
            dwl[n] = w - w_le[n - 1]
        # direct sums over the window: lags 0 .. M-1
        conv_q = 0.0
        lo = n - Mw + 1
        if lo < 1:
            lo = 1
        for j in range(lo, n + 1):
            conv_q += dq[j] * W_w[n - j]
        conv_w = 0.0
        lo = n - Mk + 1
        if lo < 1:
            lo = 1
        for j in range(lo, n + 1):
            conv_w += dwl[j] * W_k[n - j]
        # far memory: lags >= M, W = 1 - deficit
        jf = n - Mw
        if jf >= 1:
            far = 0.0
            for k in range(Kw):
                Sw[k] = Sw[k] * dw[k] + dq[jf]
                far += cw[k] * Sw[k]
            conv_q += (q34[jf] - q34[0]) - far
        jf = n - Mk
        if jf >= 1:
            far = 0.0
            for k in range(Kk):
                Sk[k] = Sk[k] * dk[k] + dwl[jf]
                far += ck[k] * Sk[k]
            conv_w += (w_le[jf] - w_le[0]) - far
        clc = two_pi * (q34[0] * R_w[n] + conv_q)
        clg = two_pi * (w_le[0] * R_k[n] + conv_w) / U
        hT_ddot = -b * hdd / (U * U)
        adb = b * ad_n / U
        add = b * b * alpha_ddot[n] / (U * U)
        clnc, M_nc = _apparent_mass(hT_ddot, adb, add, a)
        clnc = clnc + f_cl[n]
        M_nc = M_nc + f_m[n]
        cl_n = (clc + clnc + clg) * (1.0 + 2.0 * u / U)
        cmp_n = 0.5 * (M_nc + (a + 0.5) * clc) + clg * (pivot - 0.25) + cm0
        cl[n] = cl_n
        cm_pivot[n] = cmp_n
        cm[n] = cmp_n + (clc + clnc + clg) * (0.25 - pivot)
        a0 = (clc + clg) / two_pi - 0.5 * b * ad_n / U
        cd[n] = cl_n * (alpha[n] - alpha_L0 + f_shift[n]) - two_pi * a0 * a0
        cl_c[n] = clc
        cl_nc[n] = clnc
        cl_gust[n] = clg
        # heave: m' h'' = L' - m' g
        nl, acc, r_prev, h_new, hd_new = heave_step(cl_n, hc, hdc, r_prev, n == 0, dt, n_per_cl, g, mu_a, hdd)
        n_load[n] = nl
        h_ddot[n] = acc
        hd_prev = hdc
        hc = h_new
        hdc = hd_new
    return hc, hdc
