"""Linear companion model: indicial (Wagner, Kuessner) Duhamel superposition plus Theodorsen's apparent-mass terms."""

from __future__ import annotations

import functools
import math

import numpy as np

from .. import theory

__all__ = [
    "indicial_weights",
    "duhamel",
    "motion_loads",
    "gust_lift",
    "linear_loads",
    "LinearMarcher",
    "heave_marcher",
    "section_constants",
]


def _fft_convolve(a, b):
    """The full linear convolution of ``a`` and ``b`` by numpy's real FFT (zero-padded to a power of two).

    numpy's FFT rather than scipy.signal: importing scipy.signal costs about
    a second of a short run's start-up.
    """
    n = len(a) + len(b) - 1
    size = 1 << (n - 1).bit_length()
    return np.fft.irfft(np.fft.rfft(a, size) * np.fft.rfft(b, size), size)[:n]


_GAUSS_POINTS = 8


@functools.lru_cache(maxsize=32)
def _weights_cached(name, ds, n):
    fn = {"wagner": theory.wagner, "kuessner": theory.kuessner}[name]
    g, w = np.polynomial.legendre.leggauss(_GAUSS_POINTS)
    m = np.arange(n, dtype=float)[:, None]
    lam = (m + 0.5 * (1.0 + g[None, :])) * ds
    W = (fn(lam) * (0.5 * w[None, :])).sum(axis=1)
    W.setflags(write=False)
    return W


def indicial_weights(name, ds, n):
    """Interval means of an exact indicial function, tabulated once and cached.

    W_m = (1/ds) int_{m ds}^{(m+1) ds} r(lambda) d lambda, m = 0 .. n-1, with
    r the exact Wagner function phi or Kuessner function psi of
    :mod:`unsteady.theory` (H. Wagner, ZAMM 5, 1925; H. G. Kuessner,
    Luftfahrtforschung 13, 1936; values as tabulated there from I. E.
    Garrick's integrals, NACA Report 629, 1938). These are the exact Duhamel
    weights of an input that varies linearly between samples.

    Parameters
    ----------
    name : {"wagner", "kuessner"}
    ds : float
        Sample spacing in semichords travelled, ds = 2 U dt / c.
    n : int
        Number of weights.

    Returns
    -------
    numpy.ndarray
        Read-only array of n weights (shared between calls with the same
        arguments: do not modify).
    """
    return _weights_cached(str(name), float(ds), int(n))


def duhamel(x, name, ds, start="steady"):
    """Duhamel superposition of an indicial function on a sampled input.

    r(s_n) = x_0 R_n + sum_{j=1..n} (x_j - x_{j-1}) W_{n-j}, the exact
    convolution r(s) = x(0) R(s) + int_0^s x'(sigma) r_ind(s - sigma) d sigma
    for an input linear between samples (see :func:`indicial_weights`).

    Parameters
    ----------
    x : array_like
        Input sampled at s_j = j ds (an effective angle of attack, rad).
    name : {"wagner", "kuessner"}
        Indicial function.
    ds : float
        Sample spacing, semichords.
    start : {"steady", "impulsive"}
        "steady": x_0 has acted for ever (R_n = 1, the settled flow);
        "impulsive": x_0 is switched on at s = 0 (R_n = r_ind(s_n), and R_0 = 0:
        the first row is the instant before the start, as in the vortex model).

    Returns
    -------
    numpy.ndarray
        Response r_n, same length as x (unit final value per unit input).
    """
    x = np.asarray(x, dtype=float)
    n = x.shape[0]
    out = np.empty(n)
    if n == 0:
        return out
    if start == "steady":
        out[:] = x[0]
    else:
        fn = {"wagner": theory.wagner, "kuessner": theory.kuessner}[name]
        R = fn(np.arange(n) * ds)
        R[0] = 0.0
        out[:] = x[0] * R
    if n > 1:
        W = indicial_weights(name, ds, n - 1)
        dx = np.diff(x)
        if n > 256:
            conv = _fft_convolve(dx, W)[: n - 1]
        else:
            conv = np.convolve(dx, W)[: n - 1]
        out[1:] += conv
    return out


def motion_loads(q34, alpha_dot, alpha_ddot, h_ddot, *, speed, chord, pivot, ds, start="steady"):
    """Lift and moment of a thin section in small pitch and plunge (h up).

    The circulatory lift is the Wagner superposition of the downwash at the
    three-quarter chord, cl_c = 2 pi [phi * Q](s); the non-circulatory
    (apparent-mass) terms are Theodorsen's (T. Theodorsen, NACA Report 496,
    1935; h_T = -h), :func:`unsteady.theory.apparent_mass`:

        cl_nc = pi (b h_T''/U^2 + b alpha'/U - a b^2 alpha''/U^2)
        2 cm_pivot = pi (a b h_T''/U^2 - (1/2 - a) b alpha'/U - (1/8 + a^2) b^2 alpha''/U^2)
                     + (a + 1/2) cl_c

    with b = c/2 and a = 2 pivot - 1.

    Parameters
    ----------
    q34 : array_like
        Q = alpha - alpha_L0 - h'/U + b (1/2 - a) alpha'/U, rad (see
        :func:`three_quarter_downwash`).
    alpha_dot, alpha_ddot : array_like
        Pitch rate (rad/s) and acceleration (rad/s^2).
    h_ddot : array_like
        Plunge acceleration, m/s^2, positive up.
    speed, chord, pivot : float
        U (m/s), c (m), pitch axis (fraction of chord aft of the leading edge).
    ds : float
        Sample spacing in semichords.
    start : {"steady", "impulsive"}

    Returns
    -------
    dict
        cl_c, cl_nc, cl, cm_pivot (about the pivot), cm (about the quarter
        chord, without the camber moment).
    """
    U, b = float(speed), 0.5 * float(chord)
    a = 2.0 * float(pivot) - 1.0
    cl_c = 2.0 * np.pi * duhamel(q34, "wagner", ds, start)
    hT_ddot = -b * np.asarray(h_ddot, dtype=float) / U**2
    ad = b * np.asarray(alpha_dot, dtype=float) / U
    add = b**2 * np.asarray(alpha_ddot, dtype=float) / U**2
    cl_nc, M_nc = theory.apparent_mass(hT_ddot, ad, add, a)
    cl = cl_c + cl_nc
    cm_pivot = 0.5 * (M_nc + (a + 0.5) * cl_c)
    cm = cm_pivot + cl * (0.25 - float(pivot))
    return {"cl_c": cl_c, "cl_nc": cl_nc, "cl": cl, "cm_pivot": cm_pivot, "cm": cm}


def three_quarter_downwash(alpha, alpha_dot, h_dot, *, speed, chord, pivot, alpha_L0=0.0):
    """Q = alpha - alpha_L0 - h'/U + b (1/2 - a) alpha'/U (rad), h up.

    The normal velocity at the three-quarter chord over U (T. Theodorsen,
    NACA Report 496, 1935), less the section's zero-lift angle: 2 pi Q is the
    quasi-steady circulatory lift.
    """
    b = 0.5 * float(chord)
    a = 2.0 * float(pivot) - 1.0
    U = float(speed)
    return (np.asarray(alpha, dtype=float) - alpha_L0 - np.asarray(h_dot, dtype=float) / U
            + b * (0.5 - a) * np.asarray(alpha_dot, dtype=float) / U)


def gust_lift(w_le, *, speed, ds, start="steady"):
    """Lift of a frozen vertical gust by Kuessner superposition.

    cl_g = 2 pi [psi * (w_LE / U)](s), with w_LE the gust's vertical velocity
    at the leading edge and psi the exact Kuessner function (H. G. Kuessner,
    Luftfahrtforschung 13, 1936; its transform is Sears' function referred
    to the leading edge, W. R. Sears, J. Aeronaut. Sci. 8, 1941). The whole
    gust lift (including its apparent-mass part) is in psi; it acts at the
    quarter chord (a property of the Sears solution, stated from memory), so
    it adds no moment about c/4.

    Parameters
    ----------
    w_le : array_like
        Vertical gust velocity met by the leading edge, m/s, sampled every ds.
    speed : float
        U, m/s.
    ds : float
        Sample spacing, semichords.
    start : {"steady", "impulsive"}

    Returns
    -------
    numpy.ndarray
        cl_g.
    """
    return 2.0 * np.pi * duhamel(np.asarray(w_le, dtype=float) / float(speed), "kuessner", ds, start)


def leading_edge_a0(cl_c, alpha_dot, *, speed, chord):
    """Leading-edge suction parameter of the linear solution, A0 = cl_c/(2 pi) - b alpha'/(2U).

    Quasi-steady thin-airfoil theory gives A0 = Q - b alpha'/(2U) (the pitch
    rate's linear downwash averages out of A0 but not out of Q); the wake's
    lag is carried by replacing Q with cl_c / (2 pi) (derived for this
    program in the spirit of Garrick's propulsion analysis, I. E. Garrick,
    NACA Report 567, 1936; an approximation for the drag column only).
    """
    return np.asarray(cl_c) / (2.0 * np.pi) - 0.25 * float(chord) * np.asarray(alpha_dot) / float(speed)


def linear_loads(t, alpha, alpha_dot, alpha_ddot, h_dot, h_ddot, *, speed, chord, pivot,
                 alpha_L0=0.0, cm0=0.0, w_le=None, u_le=None, start="steady", gust_start=None,
                 flap=None):
    """Lift, drag and moment histories of the linear model from plain arrays.

    Parameters
    ----------
    t : array_like
        Uniformly spaced times, s.
    alpha, alpha_dot, alpha_ddot : array_like
        Pitch (rad, nose-up), its rate and acceleration.
    h_dot, h_ddot : array_like
        Plunge velocity (m/s) and acceleration (m/s^2), positive up.
    speed, chord, pivot : float
        U (m/s), c (m), pitch axis (chord fraction aft of the leading edge).
    alpha_L0, cm0 : float
        Zero-lift angle (rad) and quarter-chord moment of the section's camber
        (thin-airfoil theory, Abbott & von Doenhoff, Theory of Wing Sections,
        1959, ch. 4).
    w_le, u_le : array_like, optional
        Vertical and streamwise gust velocity at the leading edge, m/s. The
        streamwise part enters only to first order, quasi-steadily, as the
        change of dynamic pressure on the lift (cl (1 + 2 u/U)); a
        simplification of this program.
    start : {"steady", "impulsive"}
    gust_start : {"steady", "impulsive"}, optional
        How the gust input began (default ``start``): see :func:`gust_start`.
    flap : tuple, optional
        ``(hinge, beta, beta_dot, beta_ddot, ch0)``: a plain flap hinged at
        chord fraction ``hinge``, its deflection (rad, trailing edge down)
        with exact rate and acceleration, and the camber's own hinge moment
        ``ch0`` (:func:`unsteady.theory.flap.camber_hinge_moment`).  See
        :func:`flap_loads`.

    Returns
    -------
    dict of numpy.ndarray
        cl, cd, cm (quarter chord), cm_pivot, cl_c (circulatory, motion),
        cl_nc, cl_gust, q34 (rad), a0; with a flap also ch.
    """
    t = np.asarray(t, dtype=float)
    U, c = float(speed), float(chord)
    ds = 2.0 * U * (t[1] - t[0]) / c if t.shape[0] > 1 else 1.0
    alpha = np.asarray(alpha, dtype=float)
    q34 = three_quarter_downwash(alpha, alpha_dot, h_dot, speed=U, chord=c, pivot=pivot,
                                 alpha_L0=alpha_L0)
    if flap is not None:
        fl = flap_terms(flap, alpha_dot, alpha_ddot, h_ddot, speed=U, chord=c, pivot=pivot)
        q34 = q34 + fl["q"]
    out = motion_loads(q34, alpha_dot, alpha_ddot, h_ddot, speed=U, chord=c, pivot=pivot,
                       ds=ds, start=start)
    if flap is not None:
        out["cl_nc"] = out["cl_nc"] + fl["cl_nc"]
        out["cl"] = out["cl"] + fl["cl_nc"]
        out["cm_pivot"] = out["cm_pivot"] + 0.5 * fl["M_nc"]
        out["cm"] = out["cm_pivot"] + out["cl"] * (0.25 - float(pivot))
    cl_gust = np.zeros_like(t)
    if w_le is not None:
        cl_gust = gust_lift(w_le, speed=U, ds=ds, start=gust_start or start)
    cl = out["cl"] + cl_gust
    cl_c_total = out["cl_c"] + cl_gust
    if u_le is not None:
        cl = cl * (1.0 + 2.0 * np.asarray(u_le, dtype=float) / U)
    cm_pivot = out["cm_pivot"] + cl_gust * (float(pivot) - 0.25) + cm0
    cm = out["cm"] + cm0
    a0 = leading_edge_a0(cl_c_total, alpha_dot, speed=U, chord=c)
    extra = {}
    if flap is not None:
        # hinge moment: apparent mass + T12 on the lagged downwash (C(k) Q <-> cl_c / 2 pi; the
        # gust's lagged lift taken with the same flat-plate factor, its quasi-steady limit)
        extra["ch"] = (fl["Mh_nc"] + fl["mh_c"] * cl_c_total / (2.0 * np.pi)) * fl["to_ch"] + flap[4]
    # Normal force tilted back by the pitch, less the leading-edge suction
    # 2 pi A0^2 (thin-airfoil theory: zero drag in steady flow); the camber
    # counts as a shift of the angle by alpha_L0, and so does a flap's steady
    # share, by -T10 beta / pi (its term of Theodorsen's downwash).
    shift = alpha_L0 if flap is None else alpha_L0 - fl["T10"] * np.asarray(flap[1], dtype=float) / np.pi
    cd = cl * (alpha - shift) - 2.0 * np.pi * a0**2
    return {"cl": cl, "cd": cd, "cm": cm, "cm_pivot": cm_pivot, "cl_c": out["cl_c"],
            "cl_nc": out["cl_nc"], "cl_gust": cl_gust, "q34": q34, "a0": a0, **extra}


def flap_terms(flap, alpha_dot, alpha_ddot, h_ddot, *, speed, chord, pivot):
    """The flap's terms of Theodorsen's theory on sampled arrays (see :func:`unsteady.theory.flap.flap_nc_terms`).

    T. Theodorsen, NACA Report 496 (1935): the flap adds T10 beta/pi + b T11
    beta'/(2 pi U) to the 3/4-chord downwash Q (so the Wagner sum lags it
    like the pitch), apparent-mass lift and moment, and the hinge moment
    M_beta (apparent mass plus -T12 times the lagged downwash).

    Returns a dict: ``q`` (rad), ``cl_nc``, ``M_nc`` (2 cm_nc about the pivot),
    ``Mh_nc``, ``mh_c`` (hinge moment / (rho U^2 b^2) and the factor of the
    lagged downwash), ``to_ch`` (from M / (rho U^2 b^2) to ch = M / (q c_f^2)),
    ``T10``.
    """
    from ..theory.flap import flap_nc_terms, hinge_e
    hinge, beta, beta_dot, beta_ddot = flap[:4]
    U, b = float(speed), 0.5 * float(chord)
    a = 2.0 * float(pivot) - 1.0
    e = hinge_e(hinge)
    arr = (lambda v: np.asarray(v, dtype=float))
    q, cl_nc, M_nc, Mh_nc, mh_c = flap_nc_terms(
        e, a, arr(beta), b * arr(beta_dot) / U, b * b * arr(beta_ddot) / U ** 2,
        alpha_dot=b * arr(alpha_dot) / U, alpha_ddot=b * b * arr(alpha_ddot) / U ** 2,
        hT_ddot=-b * arr(h_ddot) / U ** 2)
    return {"q": q, "cl_nc": cl_nc, "M_nc": M_nc, "Mh_nc": Mh_nc, "mh_c": mh_c,
            "to_ch": 1.0 / (0.5 * (1.0 - e) ** 2), "T10": math.sqrt(1.0 - e * e) + math.acos(e)}


def section_constants(section):
    """(alpha_L0, cm0): zero-lift angle (rad) and quarter-chord moment of a section's camber.

    Thin-airfoil theory (Abbott & von Doenhoff, Theory of Wing Sections, 1959,
    ch. 4) through :func:`unsteady.theory.zero_lift_angle` and
    :func:`unsteady.theory.cm_quarter_chord`; a kink of a NACA 4-digit mean
    line at p splits the quadrature.
    """
    key = (type(section).__name__, repr(section))
    if key not in _SECTION_CACHE:
        p = getattr(section, "p", None)
        breaks = (p,) if p else ()
        _SECTION_CACHE[key] = (theory.zero_lift_angle(section.slope, breaks=breaks),
                               theory.cm_quarter_chord(section.slope, breaks=breaks))
    return _SECTION_CACHE[key]


_SECTION_CACHE = {}


def gust_start(start, gust):
    """How the gust input of the linear model began: "steady" or "impulsive".

    A steady run start in a gust field that already surrounds the airfoil
    at t = 0 (turbulence, or a front that arrived before;
    :attr:`unsteady.inputs.gusts.GustField.present_at_start`) has carried the
    gust met at t = 0 forever, like the vortex model's steady start in the
    field as it stands then.  A gust whose front arrives at or after t = 0
    did not exist before: its Kuessner response starts from zero at s = 0,
    whatever the motion's start (else the half-amplitude sample of a
    sharp-edged front spread about the leading edge would count as a gust
    flown in forever).
    """
    if start == "steady" and gust is not None and gust.present_at_start:
        return "steady"
    return "impulsive"


def _start_responses(start, N, ds, gust_start=None):
    """Wagner and Kuessner weights of the state before the first row.

    A steady start has carried its attitude forever (1); an impulsive
    start began at s = 0, so the responses are phi(s) and psi(s), 0 at s = 0.
    The Kuessner weights follow ``gust_start`` (default ``start``).
    """
    s = np.arange(N) * ds

    def response(kind, fn):
        if kind == "steady":
            return np.ones(N)
        r = fn(s)
        r[0] = 0.0
        return r
    return response(start, theory.wagner), response(gust_start or start, theory.kuessner)


class LinearMarcher:
    """Step-by-step linear model for motions that depend on the loads (free heave).

    The same Duhamel sums as :func:`duhamel`, evaluated one step at a time so
    that a motion object can integrate its state from the loads of each step
    (the solver's motion interface: ``state(t) -> (alpha, alpha_dot, h,
    h_dot)`` before the step, ``after_step(t, dt, loads)`` after it). The
    pitch acceleration comes from ``accel(t) -> (alpha_ddot, h_ddot)`` when
    given, else from a backward difference of the rate; the plunge
    acceleration always from a backward difference of h_dot (a free-heave
    model knows it only through its rate; the heave step takes the
    apparent-mass term that this gives implicitly,
    :func:`unsteady.linear.kernels.heave_step`).

    Parameters
    ----------
    motion : object
        ``state(t)`` and ``after_step(t, dt, loads)``.
    steps : int
        Steps after the first row.
    dt, speed, chord, pivot : float
    alpha_L0, cm0 : float
        Section camber constants (see :func:`section_constants`).
    w_le, u_le : callable, optional
        ``f(t, h) -> float``: gust velocity at the leading edge.
    accel : callable, optional
        ``accel(t) -> (alpha_ddot, h_ddot)`` of the prescribed motion.
    start : {"steady", "impulsive"}
    gust_start : {"steady", "impulsive"}, optional
        How the gust input began (default ``start``): see :func:`gust_start`.
    w_series, u_series : array_like, optional
        The gust at the leading edge already sampled at every row (steps + 1
        values, m/s); used instead of ``w_le``/``u_le`` when given.
    s_max : float, optional
        Window of the direct Duhamel sums of the compiled march, semichords
        (default :data:`unsteady.linear.kernels.S_MAX_DEFAULT`); older
        inputs are carried by the exponential-sum tail (``tail=True``) or
        forgotten (``tail=False``).  See :mod:`unsteady.linear.kernels`.
    compiled : bool
        Use the compiled march when the motion offers it (a
        :class:`~unsteady.dynamics.heave.HeaveMotion`: ``pitch``,
        ``heave_constants``, ``take_rows``) and ``accel`` is given; else the
        step-by-step Python march, which also serves any other motion object.
    flap : dict, optional
        A prescribed flap's terms at every row (steps + 1 values each): ``q``
        (added to Q), ``cl_nc``, ``M_nc`` (2 cm_nc about the pivot) and
        ``shift`` (T10 beta / pi, the drag's angle), from :func:`flap_terms`.
    """

    def __init__(self, motion, *, steps, dt, speed, chord, pivot, alpha_L0=0.0, cm0=0.0,
                 w_le=None, u_le=None, accel=None, start="steady", w_series=None, u_series=None,
                 s_max=None, tail=True, compiled=True, gust_start=None, flap=None):
        self.motion = motion
        self.N = int(steps) + 1
        self.dt = float(dt)
        self.U, self.c, self.pivot = float(speed), float(chord), float(pivot)
        self.alpha_L0, self.cm0 = float(alpha_L0), float(cm0)
        self.w_series = None if w_series is None else np.asarray(w_series, dtype=float)
        self.u_series = None if u_series is None else np.asarray(u_series, dtype=float)
        if self.w_series is not None and w_le is None:
            w_le = lambda tt, hh: self.w_series[int(round(tt / self.dt))]
        if self.u_series is not None and u_le is None:
            u_le = lambda tt, hh: self.u_series[int(round(tt / self.dt))]
        self.w_le, self.u_le, self.accel = w_le, u_le, accel
        self.start = start
        self.gust_start = gust_start or start
        self.ds = 2.0 * self.U * self.dt / self.c
        from .kernels import S_MAX_DEFAULT
        self.s_max = S_MAX_DEFAULT if s_max is None else float(s_max)
        if not self.s_max > 0.0:
            raise ValueError(f"s_max must be > 0 semichords, got {s_max!r}")
        self.tail = bool(tail)
        self.compiled = bool(compiled)
        zero = np.zeros(self.N)
        self.flap = {k: (zero if flap is None else np.ascontiguousarray(flap[k], dtype=float))
                     for k in ("q", "cl_nc", "M_nc", "shift")}

    def _can_compile(self, on_row):
        m = self.motion
        return (self.compiled and on_row is None and self.accel is not None
                and all(hasattr(m, k) for k in ("pitch", "heave_constants", "take_rows"))
                and (self.w_le is None or self.w_series is not None)
                and (self.u_le is None or self.u_series is not None))

    def run(self, on_row=None):
        """March all steps; returns a dict of history arrays (t, alpha, alpha_dot, h, h_dot, loads)."""
        if self._can_compile(on_row):
            return self._run_compiled()
        N, dt, U, c, pv = self.N, self.dt, self.U, self.c, self.pivot
        b, a = 0.5 * c, 2.0 * pv - 1.0
        names = ("t", "alpha", "alpha_dot", "h", "h_dot", "cl", "cd", "cm", "cm_pivot",
                 "cl_c", "cl_nc", "cl_gust", "q34", "w_le", "u_le")
        H = {k: np.zeros(N) for k in names}
        Ww = indicial_weights("wagner", self.ds, max(N - 1, 1))
        Wk = indicial_weights("kuessner", self.ds, max(N - 1, 1))
        R_w, R_k = _start_responses(self.start, N, self.ds, self.gust_start)
        dq = np.zeros(N)
        dw = np.zeros(N)
        prev = None
        for n in range(N):
            t = n * dt
            alpha, alpha_dot, h, h_dot = (float(v) for v in self.motion.state(t))
            alpha_ddot, h_ddot = ((float(v) for v in self.accel(t)) if self.accel is not None
                                  else (0.0, 0.0))
            if prev is not None:
                # the plunge of a free-heave model is known only through its rate
                h_ddot = (h_dot - prev[1]) / dt
                if self.accel is None:
                    alpha_ddot = (alpha_dot - prev[0]) / dt
            w = float(self.w_le(t, h)) if self.w_le is not None else 0.0
            u = float(self.u_le(t, h)) if self.u_le is not None else 0.0
            q = float(three_quarter_downwash(alpha, alpha_dot, h_dot, speed=U, chord=c,
                                             pivot=pv, alpha_L0=self.alpha_L0)) + self.flap["q"][n]
            H["q34"][n], H["w_le"][n] = q, w
            if n > 0:
                dq[n] = q - H["q34"][n - 1]
                dw[n] = w - H["w_le"][n - 1]
            rev = slice(n - 1, None, -1) if n > 1 else slice(0, 1)
            conv_q = float(np.dot(dq[1:n + 1], Ww[rev])) if n else 0.0
            conv_w = float(np.dot(dw[1:n + 1], Wk[rev])) if n else 0.0
            cl_c = 2.0 * np.pi * (H["q34"][0] * R_w[n] + conv_q)
            cl_g = 2.0 * np.pi * (H["w_le"][0] * R_k[n] + conv_w) / U
            hT_ddot = -b * h_ddot / U**2
            ad = b * alpha_dot / U
            add = b**2 * alpha_ddot / U**2
            cl_nc, M_nc = theory.apparent_mass(hT_ddot, ad, add, a)
            cl_nc = cl_nc + self.flap["cl_nc"][n]
            M_nc = M_nc + self.flap["M_nc"][n]
            cl = (cl_c + cl_nc + cl_g) * (1.0 + 2.0 * u / U)
            cm_pivot = 0.5 * (M_nc + (a + 0.5) * cl_c) + cl_g * (pv - 0.25) + self.cm0
            cm = cm_pivot + (cl_c + cl_nc + cl_g) * (0.25 - pv)
            a0 = (cl_c + cl_g) / (2.0 * np.pi) - 0.5 * b * alpha_dot / U
            cd = cl * (alpha - self.alpha_L0 + self.flap["shift"][n]) - 2.0 * np.pi * a0**2
            row = {"cl": cl, "cd": cd, "cm": cm, "cm_pivot": cm_pivot, "cl_impulse": cl,
                   "cd_impulse": cd, "cm_impulse": cm}
            for k, v in (("t", t), ("alpha", alpha), ("alpha_dot", alpha_dot), ("h", h),
                         ("h_dot", h_dot), ("cl", cl), ("cd", cd), ("cm", cm),
                         ("cm_pivot", cm_pivot), ("cl_c", cl_c), ("cl_nc", cl_nc),
                         ("cl_gust", cl_g), ("u_le", u)):
                H[k][n] = v
            if on_row is not None:
                on_row(n, row)
            self.motion.after_step(t, dt, row)
            prev = (alpha_dot, h_dot)
        return H

    def _run_compiled(self):
        """The march of :meth:`run` in :func:`unsteady.linear.kernels.march_heave` (free heave)."""
        from .kernels import march_heave, memory_tail
        N, dt = self.N, self.dt
        t = np.arange(N) * dt
        alpha, alpha_dot = self.motion.pitch(t)
        alpha_ddot, h_ddot_p = (np.broadcast_to(np.asarray(v, dtype=float), t.shape)
                                for v in self.accel(t))
        alpha_ddot = np.ascontiguousarray(alpha_ddot)
        hc = self.motion.heave_constants()
        if hc["h"] != 0.0 or hc["h_dot"] != 0.0:
            raise ValueError("the compiled march starts from h = h_dot = 0")
        zero = np.zeros(N)
        w = zero if self.w_series is None else np.ascontiguousarray(self.w_series[:N])
        u = zero if self.u_series is None else np.ascontiguousarray(self.u_series[:N])
        # window of the direct sums (lags 0 .. M-1); the whole run when it is shorter
        M = max(1, min(N - 1, int(math.ceil(self.s_max / self.ds))))
        Ww = indicial_weights("wagner", self.ds, M)
        Wk = indicial_weights("kuessner", self.ds, M)
        empty = np.zeros(0)
        cw = dw = ck = dk = empty
        if self.tail and M < N - 1:
            cw, dw = memory_tail("wagner", self.ds, M, N * self.ds)
            ck, dk = memory_tail("kuessner", self.ds, M, N * self.ds)
        R_w, R_k = _start_responses(self.start, N, self.ds, self.gust_start)
        names = ("h", "h_dot", "h_ddot", "n", "cl", "cd", "cm", "cm_pivot", "cl_c", "cl_nc",
                 "cl_gust", "q34")
        out = {k: np.empty(N) for k in names}
        h_end, h_dot_end = march_heave(
            alpha, alpha_dot, alpha_ddot, w, u, self.flap["q"], self.flap["cl_nc"], self.flap["M_nc"],
            self.flap["shift"], R_w, R_k, Ww, Wk, cw, dw, ck, dk,
            float(h_ddot_p[0]), dt, self.U, self.c, self.pivot, self.alpha_L0, self.cm0,
            float(hc["n_per_cl"]), float(hc["g"]), float(hc["mu_a"]), *(out[k] for k in names))
        self.motion.take_rows(out["n"], out["h_ddot"], h_end, h_dot_end)
        H = {"t": t, "alpha": alpha, "alpha_dot": alpha_dot}
        H.update(out)
        H["w_le"] = w.copy()
        H["u_le"] = u.copy()
        self.window_semichords = M * self.ds
        return H


# ---------------------------------------------------------------------------
# A scenario run with the linear model (``[run] model = "linear"``)
# ---------------------------------------------------------------------------

def heave_marcher(sc, motion, gust=None, **options):
    """The :class:`LinearMarcher` of a scenario with ``[aircraft]`` (free heave).

    Parameters
    ----------
    sc : Scenario
        With ``[aircraft]``.
    motion : HeaveMotion
        The free heave (trimmed), the marcher's motion.
    gust : GustField, optional
        Built from the scenario's ``[gust]`` when not given.
    **options
        ``s_max``, ``tail``, ``compiled`` of :class:`LinearMarcher`.
    """
    if gust is None and sc.data.get("gust"):
        from ..inputs.gusts import build_gust_field
        gust = build_gust_field(sc)
    alpha_L0, cm0 = section_constants(sc.section)
    steps, dt = sc.steps, sc.dt
    u_arr = w_arr = None
    if gust is not None:
        # a frozen pattern carried by the air: the leading edge's path at
        # zero pitch meets it at known times, whatever the heave
        t_all = np.arange(steps + 1) * dt
        u_arr, w_arr = _gust_series(gust, -sc.pivot * sc.chord, t_all, np.zeros_like(t_all))
    flap = None
    if sc.flap_law is not None:
        t_all = np.arange(steps + 1) * dt
        law = sc.flap_law
        zero = np.zeros_like(t_all)
        fl = flap_terms((sc.data["airfoil"]["flap_hinge"], law.value(t_all), law.rate(t_all),
                         law.accel(t_all)), zero, zero, zero, speed=sc.speed, chord=sc.chord,
                        pivot=sc.pivot)
        flap = {"q": fl["q"], "cl_nc": fl["cl_nc"], "M_nc": fl["M_nc"],
                "shift": fl["T10"] * np.asarray(law.value(t_all), dtype=float) / np.pi}
    return LinearMarcher(
        motion, steps=steps, dt=dt, speed=sc.speed, chord=sc.chord, pivot=sc.pivot,
        alpha_L0=alpha_L0, cm0=cm0, w_series=w_arr,
        u_series=u_arr if gust is not None and gust.streamwise else None,
        accel=sc.kinematics.accel, start=sc.data["run"]["start"],
        gust_start=gust_start(sc.data["run"]["start"], gust), flap=flap, **options)


def _gust_series(gust, x_le, t, h):
    """Gust (u, w) at the leading edge's path for an array of times."""
    t = np.asarray(t, dtype=float)
    if hasattr(gust, "profiles") and hasattr(gust, "xi"):
        # a GustField: its pattern depends on xi(x, t) only, which is elementwise
        # in t, so one call per profile samples the whole path
        u, w = gust.velocity(np.full(t.shape, float(x_le)), np.broadcast_to(h, t.shape), t)
        return np.asarray(u, dtype=float), np.asarray(w, dtype=float)
    u = np.empty(np.shape(t))
    w = np.empty(np.shape(t))
    h = np.broadcast_to(h, np.shape(t))
    for i, (ti, hi) in enumerate(zip(t, h)):
        ui, wi = gust.velocity(np.array([x_le]), np.array([hi]), float(ti))
        u[i], w[i] = ui[0], wi[0]
    return u, w
