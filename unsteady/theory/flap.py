"""A plain trailing-edge flap in thin-airfoil theory: steady (Glauert) and harmonic (Theodorsen) loads.

Symbols follow T. Theodorsen, NACA Report 496 (1935): b = c/2 the semichord,
a the pitch axis and c_h (written ``e`` in the code, to keep ``c`` free for
the chord) the hinge, both aft of mid-chord in semichords; beta the flap
deflection, trailing edge down positive; h_T the plunge positive down.  The
flap chord is c_f = b (1 - e).  The T functions are those of the report
(also R. L. Bisplinghoff, H. Ashley & R. L. Halfman, *Aeroelasticity*, 1955,
ch. 5); the T's beyond those written in the project's list of references are
stated from memory and checked in the tests: the steady limits against
Glauert's formulas and the harmonic ones against the discrete-vortex model.
"""

from __future__ import annotations

import numpy as np

__all__ = ["hinge_e", "t_functions", "glauert_flap", "theodorsen_flap_loads",
           "flap_nc_terms", "camber_hinge_moment"]


def hinge_e(hinge):
    """Hinge position e aft of mid-chord in semichords from the chord fraction x_h: e = 2 x_h - 1."""
    return 2.0 * float(hinge) - 1.0


def t_functions(e, a=-0.5):
    """Theodorsen's geometric functions T1 ... T14 of a flap hinged at e (pitch axis a).

    Returns a dict ``{1: T1, ..., 14: T14}`` (T. Theodorsen, NACA Report 496,
    1935; the hinge there is c, here e).
    """
    s = np.sqrt(1.0 - e * e)
    ac = np.arccos(e)
    T = {}
    T[1] = -(1.0 / 3.0) * s * (2.0 + e * e) + e * ac
    T[2] = e * (1.0 - e * e) - s * (1.0 + e * e) * ac + e * ac * ac
    T[3] = (-(0.125 + e * e) * ac * ac + 0.25 * e * s * ac * (7.0 + 2.0 * e * e)
            - 0.125 * (1.0 - e * e) * (5.0 * e * e + 4.0))
    T[4] = -ac + e * s
    T[5] = -(1.0 - e * e) - ac * ac + 2.0 * e * s * ac
    T[6] = T[2]
    T[7] = -(0.125 + e * e) * ac + 0.125 * e * s * (7.0 + 2.0 * e * e)
    T[8] = -(1.0 / 3.0) * s * (2.0 * e * e + 1.0) + e * ac
    T[9] = 0.5 * ((1.0 / 3.0) * s ** 3 + a * T[4])
    T[10] = s + ac
    T[11] = ac * (1.0 - 2.0 * e) + s * (2.0 - e)
    T[12] = s * (2.0 + e) - ac * (2.0 * e + 1.0)
    T[13] = 0.5 * (-T[7] - (e - a) * T[1])
    T[14] = 1.0 / 16.0 + 0.5 * a * e
    return T


def glauert_flap(hinge):
    """Steady thin-airfoil flap derivatives (per radian of deflection, trailing edge down).

    dcl/dbeta = 2 (pi - theta_h + sin theta_h) and dcm_c/4/dbeta =
    (sin 2 theta_h - 2 sin theta_h) / 4 with cos theta_h = 1 - 2 x_h
    (H. Glauert, *The Elements of Aerofoil and Airscrew Theory*, 1926;
    I. H. Abbott & A. E. von Doenhoff, *Theory of Wing Sections*, 1959, ch. 4).

    Returns
    -------
    dcl, dcm : float
    """
    th = np.arccos(1.0 - 2.0 * float(hinge))
    return (float(2.0 * (np.pi - th + np.sin(th))),
            float((np.sin(2.0 * th) - 2.0 * np.sin(th)) / 4.0))


def flap_nc_terms(e, a, beta, beta_dot, beta_ddot, alpha_dot=0.0, alpha_ddot=0.0, hT_ddot=0.0):
    """The flap's share of the lift and pitching moment, and the whole hinge moment, of Theodorsen's theory.

    Arguments are nondimensional as in :func:`unsteady.theory.apparent_mass`:
    ``beta`` (rad), ``beta_dot`` = b beta'/U, ``beta_ddot`` = b^2 beta''/U^2,
    ``alpha_dot`` = b alpha'/U, ``alpha_ddot`` = b^2 alpha''/U^2,
    ``hT_ddot`` = b h_T''/U^2 (h_T positive down).  Real or complex, scalars or arrays.

    Returns
    -------
    q_flap : the flap's 3/4-chord downwash over U, T10 beta / pi + T11 beta' / (2 pi)
        (added to the pitch-and-plunge Q before the lift deficiency C(k) or the Wagner sum);
    cl_nc : the flap's apparent-mass lift, L / (rho U^2 b): -T4 beta' - T1 beta'';
    M_nc : the flap's non-circulatory moment about the pitch axis, M / (rho U^2 b^2):
        -[(T4 + T10) beta + (T1 - T8 - (e - a) T4 + T11/2) beta' - (T7 + (e - a) T1) beta''];
    Mh_nc : the non-circulatory hinge moment M_beta / (rho U^2 b^2), trailing edge down
        positive: -[(-2 T9 - T1 + T4 (a - 1/2)) alpha' + 2 T13 alpha'' + (T5 - T4 T10) beta / pi
        - T4 T11 beta' / (2 pi) - T3 beta'' / pi - T1 h_T''];
    mh_circ : the factor of the circulatory hinge moment: M_beta,c / (rho U^2 b^2) = -T12 Q~
        with Q~ the lagged downwash (C(k) Q, or cl_c / (2 pi)).
    """
    T = t_functions(e, a)
    q_flap = T[10] * beta / np.pi + T[11] * beta_dot / (2.0 * np.pi)
    cl_nc = -T[4] * beta_dot - T[1] * beta_ddot
    M_nc = -((T[4] + T[10]) * beta + (T[1] - T[8] - (e - a) * T[4] + 0.5 * T[11]) * beta_dot
             - (T[7] + (e - a) * T[1]) * beta_ddot)
    Mh_nc = -((-2.0 * T[9] - T[1] + T[4] * (a - 0.5)) * alpha_dot + 2.0 * T[13] * alpha_ddot
              + (T[5] - T[4] * T[10]) * beta / np.pi - T[4] * T[11] * beta_dot / (2.0 * np.pi)
              - T[3] * beta_ddot / np.pi - T[1] * hT_ddot)
    return q_flap, cl_nc, M_nc, Mh_nc, -T[12]


def theodorsen_flap_loads(k, hinge, beta_amp=1.0, pivot=0.25):
    """Complex amplitudes of cl, cm_c/4 and ch of a harmonically deflected flap (no pitch or plunge).

    beta(t) = Re[beta_amp e^{i omega t}] (rad, trailing edge down), k = omega b / U.
    Theodorsen's flap terms (NACA Report 496, 1935): the lift
    pi rho b^2 (-(U/pi) T4 beta' - (b/pi) T1 beta'') + 2 pi rho U b C(k) ((U/pi) T10 beta
    + (b/2pi) T11 beta'), the moment and the hinge moment M_beta of the same report.
    cl = L / (0.5 rho U^2 c), cm nose-up about the quarter chord / (0.5 rho U^2 c^2),
    ch = M_beta / (0.5 rho U^2 c_f^2), c_f = (1 - x_h) c, positive pushing the trailing edge down.
    """
    from . import theodorsen
    k = np.asarray(k, dtype=float)
    e = hinge_e(hinge)
    a = 2.0 * float(pivot) - 1.0
    C = np.asarray(theodorsen(k))
    beta = np.asarray(beta_amp, dtype=complex)
    q, cl_nc, M_nc, Mh_nc, mh_c = flap_nc_terms(e, a, beta, 1j * k * beta, -(k ** 2) * beta)
    cl = cl_nc + 2.0 * np.pi * C * q
    cm_pivot = 0.5 * (M_nc + 2.0 * np.pi * (a + 0.5) * C * q)
    cm = cm_pivot + cl * (0.25 - float(pivot))
    ch = (Mh_nc + mh_c * C * q) / (0.5 * (1.0 - e) ** 2)
    return complex(cl) if cl.ndim == 0 else cl, complex(cm) if np.ndim(cm) == 0 else cm, \
        complex(ch) if np.ndim(ch) == 0 else ch


def camber_hinge_moment(slope_fn, hinge, n=200, breaks=(), terms=120):
    """Hinge-moment coefficient of a camber line's own loading at its zero-lift angle.

    Thin-airfoil loading dcp(theta) = 4 [A0 (1 + cos theta)/sin theta + sum An sin n theta]
    with A0 = alpha_L0 - (1/pi) int dz/dx dtheta and An = (2/pi) int dz/dx cos n theta
    dtheta (Abbott & von Doenhoff, *Theory of Wing Sections*, 1959, ch. 4), integrated
    over the flap: ch = -int_{x_h}^1 dcp (x - x_h) dx / (1 - x_h)^2 (trailing edge down
    positive).  At zero lift the flat-plate part (Theodorsen's T12 term on Q) is zero, so
    this is what the camber adds to the hinge moment.
    """
    from . import _theta_nodes, zero_lift_angle
    theta, w = _theta_nodes(int(n), breaks)
    dzdx = np.asarray(slope_fn(0.5 * (1.0 - np.cos(theta))), dtype=float)
    aL0 = zero_lift_angle(slope_fn, n, breaks)
    A0 = aL0 - np.sum(w * dzdx) / np.pi
    An = [2.0 / np.pi * np.sum(w * dzdx * np.cos(m * theta)) for m in range(1, terms + 1)]
    th_h = np.arccos(1.0 - 2.0 * float(hinge))
    tq, wq = np.polynomial.legendre.leggauss(200)
    th = 0.5 * (np.pi - th_h) * tq + 0.5 * (np.pi + th_h)
    wt = 0.5 * (np.pi - th_h) * wq
    # dx = sin(theta)/2 dtheta; A0 term's 1/sin theta cancels
    x = 0.5 * (1.0 - np.cos(th))
    load = 4.0 * A0 * (1.0 + np.cos(th)) * 0.5
    load = load + 4.0 * sum(A * np.sin((m + 1) * th) for m, A in enumerate(An)) * 0.5 * np.sin(th)
    return float(-np.sum(wt * load * (x - hinge)) / (1.0 - hinge) ** 2)
