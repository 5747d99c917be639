"""Classical closed-form and indicial references of unsteady thin-airfoil theory."""

import functools

import numpy as np

# scipy's submodules are imported in the functions that use them: loading a
# scenario imports this package, and scipy.integrate/special cost a large share of start-up.

__all__ = [
    "GUST_CAUTION",
    "steady_a0",
    "theodorsen",
    "theodorsen_loads",
    "apparent_mass",
    "wagner",
    "wagner_exact_point",
    "wagner_jones",
    "sears",
    "sears_leading_edge",
    "kuessner",
    "kuessner_exact_point",
    "kuessner_sears_sparks",
    "gust_mass_ratio",
    "gust_alleviation_factor",
    "gust_load_factor_increment",
    "dryden_spectrum",
    "von_karman_spectrum",
    "effective_angle",
    "helmbold_lift_slope",
    "thin_airfoil_coefficients",
    "zero_lift_angle",
    "cm_quarter_chord",
    "naca4_camber",
    "naca4_slope",
]

#: Caution to show wherever a gust load or load factor from this program is reported.
from ..core.cautions import GUST_CAUTION  # noqa: E402  (re-exported: the caution of gust-load numbers)


# ---------------------------------------------------------------------------
# Theodorsen function and harmonic pitch/plunge loads
# ---------------------------------------------------------------------------

def theodorsen(k):
    """Theodorsen's lift-deficiency function C(k).

    C(k) = F + i G = H1(k) / (H1(k) + i H0(k)), with Hn = Hn^(2) the Hankel
    functions of the second kind (T. Theodorsen, NACA Report 496, 1935, eq. VI
    and the function C(k) defined there).

    Parameters
    ----------
    k : float or array_like
        Reduced frequency k = omega b / U = omega c / (2 U). Negative k gives
        the complex conjugate (C(-k) = conj C(k)); k = 0 gives exactly 1 and
        k = inf gives exactly 1/2.

    Returns
    -------
    complex or numpy.ndarray of complex
        C(k).
    """
    from scipy import special
    k = np.asarray(k, dtype=float)
    k_abs = np.abs(k)
    tiny = k_abs < 1e-300  # below this, 1 - C(k) ~ k ln k is far under 1e-290
    big = np.isinf(k_abs)
    k_safe = np.where(tiny | big, 1.0, k_abs)
    with np.errstate(all="ignore"):
        H1 = special.hankel2(1, k_safe)
        H0 = special.hankel2(0, k_safe)
        C = H1 / (H1 + 1j * H0)
    C = np.where(tiny, 1.0 + 0j, np.where(big, 0.5 + 0j, C))
    C = np.where(k < 0, np.conj(C), C)
    C = np.where(np.isnan(k), np.nan + 0j, C)
    return complex(C) if C.ndim == 0 else C


def apparent_mass(hT_ddot, alpha_dot, alpha_ddot, a):
    """Theodorsen's non-circulatory (apparent-mass) lift and pitching moment of a thin section.

    In the nondimensional derivatives of T. Theodorsen, NACA Report 496, 1935
    (the pi rho b^2 terms of P and M_alpha; h_T positive down)::

        cl_nc = pi (h_T'' + alpha' - a alpha'')
        M_nc  = pi (a h_T'' - (1/2 - a) alpha' - (1/8 + a^2) alpha'')

    with h_T'' = b h_T''/U^2, alpha' = b alpha'/U, alpha'' = b^2 alpha''/U^2
    (b = c/2), a the pitch axis aft of mid-chord in semichords,
    cl_nc = L_nc / (rho U^2 b) and M_nc = M_nc / (rho U^2 b^2) = 2 cm_nc about
    the pitch axis (nose-up).  The one copy of these terms: the harmonic loads
    (:func:`theodorsen_loads`), the linear model's sums and its compiled march
    (through a numba-compiled twin of this function) call it.  Plain
    arithmetic, so real or complex scalars and arrays alike.

    Parameters
    ----------
    hT_ddot, alpha_dot, alpha_ddot : float, complex or array_like
        b h_T''/U^2, b alpha'/U and b^2 alpha''/U^2 (h_T = -h of this program).
    a : float or array_like
        Pitch axis aft of mid-chord, semichords (a = 2 pivot - 1).

    Returns
    -------
    cl_nc, M_nc
        Apparent-mass lift coefficient and 2 cm_nc about the pitch axis.
    """
    cl_nc = np.pi * (hT_ddot + alpha_dot - a * alpha_ddot)
    M_nc = np.pi * (a * hT_ddot - (0.5 - a) * alpha_dot - (0.125 + a * a) * alpha_ddot)
    return cl_nc, M_nc


def theodorsen_loads(k, alpha_amp=0.0, h_amp_c=0.0, pivot=0.25, moment_ref=0.25):
    """Complex lift and moment amplitudes of a harmonically pitching and plunging section.

    Theodorsen's lift and moment (T. Theodorsen, NACA Report 496, 1935,
    eqs. for P and M_alpha, in the form with h positive down):

        L = pi rho b^2 (h'' + U alpha' - b a alpha'')
            + 2 pi rho U b C(k) [h' + U alpha + b (1/2 - a) alpha']
        M_a = pi rho b^2 [b a h'' - U b (1/2 - a) alpha' - b^2 (1/8 + a^2) alpha'']
              + 2 pi rho U b^2 (a + 1/2) C(k) [h' + U alpha + b (1/2 - a) alpha']

    with b = c/2 and a = 2 pivot - 1 the pitch axis aft of mid-chord in
    semichords; M_a is the nose-up moment about the pitch axis. The moment is
    then carried to `moment_ref`. The plunge of this program is positive UP,
    so h_Theodorsen = -h here.

    Motion: alpha(t) = Re[alpha_amp e^{i omega t}] (rad, nose-up),
    h(t) = Re[h_amp_c c e^{i omega t}] (up), omega = 2 U k / c.
    Loads: cl(t) = Re[cl_hat e^{i omega t}], cl = L / (0.5 rho U^2 c), lift up;
    cm(t) = Re[cm_hat e^{i omega t}], cm = M / (0.5 rho U^2 c^2), nose-up.

    In these variables (alpha_hat, h_hat = h_amp_c, Q = alpha_hat + i k (1/2 - a)
    alpha_hat - 2 i k h_hat):

        cl_hat = pi (2 k^2 h_hat + i k alpha_hat + a k^2 alpha_hat) + 2 pi C(k) Q
        cm_c/4 = -(pi/2) (k^2 h_hat + i k alpha_hat - (1/8 - a/2) k^2 alpha_hat)

    (the circulatory part has no moment about the quarter chord).

    Parameters
    ----------
    k : float or array_like
        Reduced frequency omega c / (2 U).
    alpha_amp : complex or array_like, optional
        Complex pitch amplitude, rad.
    h_amp_c : complex or array_like, optional
        Complex plunge amplitude as a fraction of the chord, positive up.
    pivot : float or array_like, optional
        Pitch axis, fraction of the chord aft of the leading edge.
    moment_ref : float or array_like, optional
        Moment reference point, fraction of the chord aft of the leading edge
        (default the quarter chord, as in the history files).

    Returns
    -------
    cl_hat, cm_hat : complex or numpy.ndarray of complex
        First-harmonic complex amplitudes of cl and of cm about `moment_ref`.
        Both include the non-circulatory (apparent-mass) and circulatory parts.
    """
    k = np.asarray(k, dtype=float)
    alpha_hat = np.asarray(alpha_amp, dtype=complex)
    h_hat = np.asarray(h_amp_c, dtype=complex)
    a = 2.0 * np.asarray(pivot, dtype=float) - 1.0
    C = np.asarray(theodorsen(k))
    # Nondimensional derivatives with omega b / U = k, b = c/2 and h_T = -h:
    #   h_T'/U = -2 i k h_hat,  b h_T''/U^2 = 2 k^2 h_hat,
    #   b alpha'/U = i k alpha_hat,  b^2 alpha''/U^2 = -k^2 alpha_hat.
    hT_dot = -2j * k * h_hat
    hT_ddot = 2.0 * k**2 * h_hat
    alpha_dot = 1j * k * alpha_hat
    alpha_ddot = -(k**2) * alpha_hat
    Q = hT_dot + alpha_hat + (0.5 - a) * alpha_dot  # 3/4-chord downwash / U
    # L / (rho U^2 b) = cl  (since 0.5 rho U^2 c = rho U^2 b)
    # M_a / (rho U^2 b^2) = 2 cm_pivot  (since 0.5 rho U^2 c^2 = 2 rho U^2 b^2)
    cl_nc, M_nc = apparent_mass(hT_ddot, alpha_dot, alpha_ddot, a)
    cl_c = 2.0 * np.pi * C * Q
    cl_hat = cl_nc + cl_c
    M_c = 2.0 * np.pi * (a + 0.5) * C * Q
    cm_pivot = 0.5 * (M_nc + M_c)
    # Transfer: M_ref = M_pivot + L (x_ref - x_pivot), lift up, x aft, nose-up.
    x_ref = np.asarray(moment_ref, dtype=float)
    cm_hat = cm_pivot + cl_hat * (x_ref - np.asarray(pivot, dtype=float))
    return _complex_out(cl_hat), _complex_out(cm_hat)


def _complex_out(z):
    z = np.asarray(z, dtype=complex)
    return complex(z) if z.ndim == 0 else z


# ---------------------------------------------------------------------------
# Sears function
# ---------------------------------------------------------------------------

def sears(k):
    """Sears' function S(k) for a sinusoidal vertical gust, phase at mid-chord.

    S(k) = [J0(k) - i J1(k)] C(k) + i J1(k) (W. R. Sears, J. Aeronaut. Sci. 8,
    1941), with C(k) Theodorsen's function: the lift of a section meeting the
    gust w = w0 e^{i omega (t - x/U)} is cl = 2 pi S(k) w0 e^{i omega t} / U,
    where x is measured from mid-chord.

    Parameters
    ----------
    k : float or array_like
        Reduced frequency k = omega c / (2 U) (gust wavelength 2 pi b / k).

    Returns
    -------
    complex or numpy.ndarray of complex
        S(k); S(0) = 1, |S(k)| ~ 1/sqrt(2 pi k) for large k.
    """
    from scipy import special
    k = np.asarray(k, dtype=float)
    S = (special.j0(k) - 1j * special.j1(k)) * np.asarray(theodorsen(k)) + 1j * special.j1(k)
    return _complex_out(S)


def sears_leading_edge(k):
    """Sears' function with the gust phase referred to the leading edge.

    S_LE(k) = S(k) e^{-i k} (Sears 1941, phase shifted by one semichord). It is
    the transfer whose indicial response is Kuessner's function: the gust at
    mid-chord lags the gust at the leading edge by one semichord of travel.

    Parameters
    ----------
    k : float or array_like
        Reduced frequency omega c / (2 U).

    Returns
    -------
    complex or numpy.ndarray of complex
        S(k) e^{-ik}.
    """
    k = np.asarray(k, dtype=float)
    return _complex_out(np.asarray(sears(k)) * np.exp(-1j * k))


# ---------------------------------------------------------------------------
# Indicial functions: Wagner and Kuessner
# ---------------------------------------------------------------------------
#
# Two independent routes give the exact indicial functions.
#
# 1. Fourier (I. E. Garrick, NACA Report 629, 1938): for a causal step
#    response r(s) of a transfer H(k),
#        r(s) = (2/pi) int_0^inf Re H(k) sin(k s) / k dk          ("sine")
#        r(s) = H(0) + (2/pi) int_0^inf Im H(k) cos(k s) / k dk   ("cosine"),
#    with H = C(k) for Wagner and H = S(k) e^{-ik} for Kuessner.
#
# 2. Branch cut (derived for this program): with p = i k, H_n^(2)(k) is
#    proportional to K_n(p), so C = K1(p) / (K0(p) + K1(p)) and
#    S e^{-ik} = e^{-p} / (p (K0(p) + K1(p))) (using I0 K1 + I1 K0 = 1/p).
#    Inverting r = L^-1[H(p)/p] around the branch cut of K_n on the negative
#    real axis (K_n(x e^{i pi}) = (-1)^n K_n(x) - i pi I_n(x)) gives
#        1 - phi(s) = int_0^inf e^{-x s} dx / (x^2 D(x)),
#        1 - psi(s) = int_0^inf e^{-x s} e^{x} (I0 + I1) dx / (x^2 D(x)),
#        D(x) = (K0(x) - K1(x))^2 + pi^2 (I0(x) + I1(x))^2.
#    Both kernels tend to 1 as x -> 0, so 1 - phi ~ 1/s and 1 - psi ~ 1/s
#    for large s. These integrands are smooth and do not oscillate; the
#    tables are built from them and the tests compare them with route 1.

_S_TABLE_MAX = 1.0e5
_FOURIER_SPLIT = 1.0  # k where the Fourier integrals switch to the infinite-range rule


def _branch_cut_denominator(x):
    """x^2 D(x) e^{-2x}, written with exponentially scaled Bessel functions."""
    from scipy import special
    return x**2 * (
        np.exp(-4.0 * x) * (special.k0e(x) - special.k1e(x)) ** 2
        + np.pi**2 * (special.i0e(x) + special.i1e(x)) ** 2
    )


def _wagner_kernel(x):
    """1 / (x^2 D(x)); tends to 1 as x -> 0 and decays as e^{-2x}."""
    x = np.asarray(x, dtype=float)
    with np.errstate(all="ignore"):
        f = np.exp(-2.0 * x) / _branch_cut_denominator(x)
    return np.where(x == 0.0, 1.0, f)


def _kuessner_kernel(x):
    """e^x (I0 + I1) / (x^2 D(x)); tends to 1 as x -> 0 and decays as x^(-3/2)."""
    from scipy import special
    x = np.asarray(x, dtype=float)
    with np.errstate(all="ignore"):
        f = (special.i0e(x) + special.i1e(x)) / _branch_cut_denominator(x)
    return np.where(x == 0.0, 1.0, f)


_KERNELS = {"wagner": _wagner_kernel, "kuessner": _kuessner_kernel}


def _branch_cut_values(name, s):
    """1 - r(s) by the branch-cut integral, all s at once (scipy quad_vec)."""
    from scipy import integrate
    kernel = _KERNELS[name]
    s = np.asarray(s, dtype=float)
    deficit, _err = integrate.quad_vec(
        lambda x: kernel(x) * np.exp(-x * s),
        0.0,
        np.inf,
        epsabs=1e-13,
        epsrel=1e-12,
        norm="max",
        limit=20000,
    )
    return 1.0 - deficit


def _branch_cut_point(name, s):
    """1 - r(s) by the branch-cut integral at one s, with x = u / s (scipy quad)."""
    from scipy import integrate
    if s < 0.0:
        return 0.0
    kernel = _KERNELS[name]
    if s == 0.0:
        g = lambda x: float(kernel(x))
    else:
        g = lambda u: float(kernel(u / s)) * np.exp(-u) / s
    deficit = sum(integrate.quad(g, lo, hi, epsabs=1e-13, epsrel=1e-12, limit=400)[0]
                  for lo, hi in ((0.0, 1.0), (1.0, np.inf)))
    return 1.0 - deficit


@functools.lru_cache(maxsize=None)
def _table(name):
    """Cubic spline of r(s) in v = sqrt(s) on [0, _S_TABLE_MAX] (breakpoints, coefficients), and the 1/s tail constant.

    sqrt(s) is the natural variable: psi(s) grows as sqrt(s) from s = 0, and
    both functions are smooth in sqrt(s).  The spline interpolates the
    branch-cut integral at 900 points; its piecewise-polynomial coefficients
    are kept in the on-disk cache (:mod:`unsteady.core.cache`, keyed on this
    file's source) so that a new process does not integrate again.
    """
    from ..core.cache import cached_arrays, source_digest

    def compute():
        from scipy import interpolate
        v_near = np.linspace(0.0, 2.0, 201)  # s from 0 to 4, ds ~ 0.0001 near 0
        s_far = np.geomspace(4.0, _S_TABLE_MAX, 700)[1:]
        s = np.concatenate([v_near**2, s_far])
        r = _branch_cut_values(name, s)
        spline = interpolate.CubicSpline(np.sqrt(s), r)
        return {"x": spline.x, "c": spline.c, "r_end": r[-1:]}

    t = cached_arrays(f"indicial-{name}", f"{source_digest(__file__)}:{_S_TABLE_MAX!r}", compute)
    tail = _S_TABLE_MAX * (1.0 - float(t["r_end"][0]))  # 1 - r ~ tail / s beyond the table
    return t["x"], t["c"], tail


def _spline_eval(x, c, v):
    """Evaluate the piecewise cubic of breakpoints ``x`` and coefficients ``c`` (scipy PPoly layout) at ``v``."""
    i = np.clip(np.searchsorted(x, v, side="right") - 1, 0, len(x) - 2)
    d = v - x[i]
    return ((c[0, i] * d + c[1, i]) * d + c[2, i]) * d + c[3, i]


def _indicial(name, s):
    s = np.asarray(s, dtype=float)
    x, c, tail = _table(name)
    with np.errstate(all="ignore"):
        inside = _spline_eval(x, c, np.sqrt(np.clip(s, 0.0, _S_TABLE_MAX)))
        outside = 1.0 - tail / s
    r = np.where(s > _S_TABLE_MAX, outside, inside)
    r = np.where(s < 0.0, 0.0, r)
    r = np.where(np.isnan(s), np.nan, r)
    return float(r) if r.ndim == 0 else r


def _fourier_step_response(H, s, form, r_zero):
    """Causal step response r(s) of transfer H(k) by Garrick's Fourier integrals.

    H(0) must be 1. The sine form splits at k = K:
    int_0^K Re H sin(ks)/k = Si(K s) + int_0^K (Re H - 1) sin(ks)/k (bounded
    integrand), and int_K^inf by QUADPACK's Fourier rule (QAWF).
    """
    from scipy import integrate, special
    if s < 0.0:
        return 0.0
    if s == 0.0:
        return r_zero
    K = _FOURIER_SPLIT
    k_min = 1e-300  # QUADPACK's Fourier rule samples k = 0; the integrands have a finite or log limit there
    if form == "sine":
        near, _ = integrate.quad(
            lambda k: (H(max(k, k_min)).real - 1.0) / max(k, k_min), 0.0, K, weight="sin", wvar=s, limit=400
        )
        far, _ = integrate.quad(
            lambda k: H(k).real / k, K, np.inf, weight="sin", wvar=s, limlst=200
        )
        return (2.0 / np.pi) * (special.sici(K * s)[0] + near + far)
    if form == "cosine":
        near, _ = integrate.quad(
            lambda k: H(max(k, k_min)).imag / max(k, k_min), 0.0, K, weight="cos", wvar=s, limit=400
        )
        far, _ = integrate.quad(
            lambda k: H(k).imag / k, K, np.inf, weight="cos", wvar=s, limlst=200
        )
        return 1.0 + (2.0 / np.pi) * (near + far)
    raise ValueError(f"method must be 'sine', 'cosine' or 'branch-cut', got {form!r}")


def _exact_point(name, H, r_zero, s, method):
    s_arr = np.asarray(s, dtype=float)
    if method == "branch-cut":
        out = np.array([_branch_cut_point(name, float(v)) for v in s_arr.ravel()])
    else:
        out = np.array([_fourier_step_response(H, float(v), method, r_zero)
                        for v in s_arr.ravel()])
    out = out.reshape(s_arr.shape)
    return float(out) if out.ndim == 0 else out


def wagner(s):
    """Exact Wagner function phi(s): lift growth after a step in angle of attack.

    cl(s) = 2 pi alpha phi(s) for a step alpha at s = 0 (H. Wagner, ZAMM 5,
    1925). Values are exact to about 1e-9: tabulated once per process from the
    branch-cut integral of Theodorsen's C (see `wagner_exact_point`), checked
    against Garrick's Fourier integrals (I. E. Garrick, NACA Report 629, 1938),
    and interpolated by a cubic spline in sqrt(s). Beyond s = 1e5 the tail
    1 - phi ~ const/s is used.

    Parameters
    ----------
    s : float or array_like
        Distance travelled in semichords, s = 2 U t / c.

    Returns
    -------
    float or numpy.ndarray
        phi(s): 0 for s < 0, 0.5 at s = 0, rising monotonically to 1.
    """
    return _indicial("wagner", s)


def wagner_exact_point(s, method="sine"):
    """Wagner function by direct quadrature (slow; for checks).

    "sine": phi(s) = (2/pi) int_0^inf F(k) sin(ks)/k dk;
    "cosine": phi(s) = 1 + (2/pi) int_0^inf G(k) cos(ks)/k dk, with C = F + iG
    (I. E. Garrick, NACA Report 629, 1938);
    "branch-cut": 1 - phi(s) = int_0^inf e^{-xs} dx / (x^2 [(K0 - K1)^2 +
    pi^2 (I0 + I1)^2]), Bessel functions of x (derived in this module's notes
    from C(p) = K1(p)/(K0(p) + K1(p)), p = ik).

    Parameters
    ----------
    s : float or array_like
        Semichords travelled.
    method : {"sine", "cosine", "branch-cut"}, optional
        Integral form.

    Returns
    -------
    float or numpy.ndarray
        phi(s); at s = 0 the limit from above, 0.5.
    """
    return _exact_point("wagner", theodorsen, 0.5, s, method)


def wagner_jones(s):
    """R. T. Jones' two-exponential approximation of the Wagner function.

    phi(s) ~ 1 - 0.165 e^{-0.0455 s} - 0.335 e^{-0.3 s} (R. T. Jones, NACA
    Report 681, 1940). It differs from the exact function by up to about 1 %
    and, unlike it, approaches 1 exponentially.

    Parameters
    ----------
    s : float or array_like
        Semichords travelled.

    Returns
    -------
    float or numpy.ndarray
        Approximate phi(s); 0 for s < 0.
    """
    s = np.asarray(s, dtype=float)
    with np.errstate(over="ignore"):
        phi = 1.0 - 0.165 * np.exp(-0.0455 * s) - 0.335 * np.exp(-0.3 * s)
    phi = np.where(s < 0.0, 0.0, phi)
    return float(phi) if phi.ndim == 0 else phi


def kuessner(s):
    """Exact Kuessner function psi(s): lift growth on entering a sharp-edged gust.

    cl(s) = 2 pi (w0 / U) psi(s) for a vertical gust w0 whose front reaches
    the leading edge at s = 0 (H. G. Kuessner, Luftfahrtforschung 13, 1936).
    Values are exact to about 1e-9: tabulated once per process from the
    branch-cut integral of the leading-edge-referred Sears function
    S(k) e^{-ik} (see `kuessner_exact_point`), checked against Garrick's
    Fourier integrals (I. E. Garrick, NACA Report 629, 1938), and
    interpolated by a cubic spline in sqrt(s) (psi grows as sqrt(s) at first).

    Parameters
    ----------
    s : float or array_like
        Semichords travelled since the gust front met the leading edge.

    Returns
    -------
    float or numpy.ndarray
        psi(s): 0 for s <= 0, rising monotonically to 1.
    """
    return _indicial("kuessner", s)


def kuessner_exact_point(s, method="sine"):
    """Kuessner function by direct quadrature (slow; for checks).

    "sine": psi(s) = (2/pi) int_0^inf Re S_LE(k) sin(ks)/k dk;
    "cosine": psi(s) = 1 + (2/pi) int_0^inf Im S_LE(k) cos(ks)/k dk, with
    S_LE = S(k) e^{-ik} (I. E. Garrick, NACA Report 629, 1938);
    "branch-cut": 1 - psi(s) = int_0^inf e^{-xs} e^x (I0 + I1) dx /
    (x^2 [(K0 - K1)^2 + pi^2 (I0 + I1)^2]) (derived in this module's notes
    from S_LE(p) = e^{-p} / (p (K0(p) + K1(p))), p = ik).

    Parameters
    ----------
    s : float or array_like
        Semichords travelled since the gust front met the leading edge.
    method : {"sine", "cosine", "branch-cut"}, optional
        Integral form.

    Returns
    -------
    float or numpy.ndarray
        psi(s); 0 at s = 0.
    """
    return _exact_point("kuessner", sears_leading_edge, 0.0, s, method)


def kuessner_sears_sparks(s):
    """Rough exponential approximation of the Kuessner function.

    psi(s) ~ 1 - 0.5 e^{-0.13 s} - 0.5 e^{-s}, the form usually credited to
    Sears and Sparks (coefficients quoted from memory, not from a document at
    hand). It is some 10 % low near s = 1 and approaches 1 far too fast.

    Parameters
    ----------
    s : float or array_like
        Semichords travelled since the gust front met the leading edge.

    Returns
    -------
    float or numpy.ndarray
        Approximate psi(s); 0 for s < 0.
    """
    s = np.asarray(s, dtype=float)
    with np.errstate(over="ignore"):
        psi = 1.0 - 0.5 * np.exp(-0.13 * s) - 0.5 * np.exp(-s)
    psi = np.where(s < 0.0, 0.0, psi)
    return float(psi) if psi.ndim == 0 else psi


# ---------------------------------------------------------------------------
# Gust load factor (Pratt & Walker)
# ---------------------------------------------------------------------------

#: Standard acceleration of gravity, m/s^2 (U.S. Standard Atmosphere 1976).
G = 9.80665


def gust_mass_ratio(wing_loading, density, chord, lift_slope, g=9.80665):
    """Aeroplane mass ratio for gust loads.

    mu_g = 2 (W/S) / (rho c a g) (K. G. Pratt & W. G. Walker, NACA Report
    1206, 1954; also 14 CFR 23.341).

    Parameters
    ----------
    wing_loading : float or array_like
        W/S, weight (a force) per wing area, N/m^2.
    density : float or array_like
        Air density rho at the flight altitude, kg/m^3.
    chord : float or array_like
        Mean geometric chord c, m.
    lift_slope : float or array_like
        Lift-curve slope a of the aeroplane, per radian.
    g : float, optional
        Acceleration of gravity, m/s^2.

    Returns
    -------
    float or numpy.ndarray
        mu_g, dimensionless.
    """
    mu_g = 2.0 * np.asarray(wing_loading, dtype=float) / (
        np.asarray(density, dtype=float) * np.asarray(chord, dtype=float)
        * np.asarray(lift_slope, dtype=float) * g
    )
    return float(mu_g) if np.ndim(mu_g) == 0 else mu_g


def gust_alleviation_factor(mu_g):
    """Gust alleviation factor K_g = 0.88 mu_g / (5.3 + mu_g).

    K. G. Pratt & W. G. Walker, NACA Report 1206 (1954); also 14 CFR 23.341.
    It accounts for the lag of lift (Kuessner/Wagner) and the heave of the
    aeroplane in a 1-cosine gust of length 25 chords.

    Parameters
    ----------
    mu_g : float or array_like
        Mass ratio from `gust_mass_ratio`.

    Returns
    -------
    float or numpy.ndarray
        K_g, between 0 and 0.88.
    """
    mu_g = np.asarray(mu_g, dtype=float)
    K_g = 0.88 * mu_g / (5.3 + mu_g)
    return float(K_g) if K_g.ndim == 0 else K_g


def gust_load_factor_increment(wing_loading, density, speed, gust_speed, chord,
                               lift_slope, g=9.80665, reference_density=None):
    """Load-factor increment of the Pratt-Walker gust formula.

    dn = K_g rho U U_de a / (2 W/S), K_g = 0.88 mu_g / (5.3 + mu_g),
    mu_g = 2 (W/S) / (rho c a g) (K. G. Pratt & W. G. Walker, NACA Report
    1206, 1954; the same formula stood in 14 CFR 23.341). It was derived for
    a 1-cosine gust 25 chords long with the aeroplane free to heave (no pitch).

    Caution: an estimate from an inviscid attached-flow model with no stall;
    design gust loads follow the applicable airworthiness rules, with their
    margins, and are signed off by qualified engineers (see `GUST_CAUTION`).

    Parameters
    ----------
    wing_loading : float or array_like
        W/S, N/m^2.
    density : float or array_like
        Air density at the flight altitude, kg/m^3 (used in mu_g, and in dn
        unless `reference_density` is given).
    speed : float or array_like
        Flight speed U, m/s (true airspeed with `density`, or equivalent
        airspeed with `reference_density`).
    gust_speed : float or array_like
        Derived gust velocity U_de, m/s (true, or equivalent as `speed`).
    chord : float or array_like
        Mean geometric chord, m.
    lift_slope : float or array_like
        Lift-curve slope a, per radian.
    g : float, optional
        Acceleration of gravity, m/s^2.
    reference_density : float, optional
        Density used in dn instead of `density`; the regulation's form uses
        sea-level density (1.225 kg/m^3) with equivalent airspeeds.

    Returns
    -------
    dn : float or numpy.ndarray
        Load-factor increment (1 g level flight plus or minus dn).
    K_g : float or numpy.ndarray
        Gust alleviation factor.
    mu_g : float or numpy.ndarray
        Mass ratio.
    """
    mu_g = gust_mass_ratio(wing_loading, density, chord, lift_slope, g)
    K_g = gust_alleviation_factor(mu_g)
    rho = density if reference_density is None else reference_density
    dn = (K_g * np.asarray(rho, dtype=float) * np.asarray(speed, dtype=float)
          * np.asarray(gust_speed, dtype=float) * np.asarray(lift_slope, dtype=float)
          / (2.0 * np.asarray(wing_loading, dtype=float)))
    dn = float(dn) if np.ndim(dn) == 0 else dn
    return dn, K_g, mu_g


# ---------------------------------------------------------------------------
# Turbulence spectra
# ---------------------------------------------------------------------------

_VON_KARMAN_A = 1.339  # MIL-F-8785C constant a in (a L Omega)


def _spectrum_args(Omega, sigma, L, component):
    Omega = np.abs(np.asarray(Omega, dtype=float))
    sigma = np.asarray(sigma, dtype=float)
    L = np.asarray(L, dtype=float)
    if np.any(L <= 0.0):
        raise ValueError("scale length L must be positive (metres)")
    if np.any(sigma < 0.0):
        raise ValueError("intensity sigma must be non-negative (m/s)")
    if component not in ("vertical", "lateral", "longitudinal"):
        raise ValueError(
            f"component must be 'vertical', 'lateral' or 'longitudinal', got {component!r}"
        )
    return Omega, sigma, L


def dryden_spectrum(Omega, sigma, L, component="vertical"):
    """One-sided Dryden spatial power spectral density of turbulence.

    Vertical (and lateral): Phi(Omega) = sigma^2 (L/pi) (1 + 3 (L Omega)^2) /
    (1 + (L Omega)^2)^2; longitudinal: Phi(Omega) = sigma^2 (2L/pi) /
    (1 + (L Omega)^2) (MIL-F-8785C, 1980, and MIL-HDBK-1797; the longitudinal
    form is quoted from memory). int_0^inf Phi dOmega = sigma^2.

    Parameters
    ----------
    Omega : float or array_like
        Spatial frequency, rad/m (the spectrum is even; |Omega| is used).
    sigma : float
        Turbulence intensity (rms velocity), m/s.
    L : float
        Scale length, m.
    component : {"vertical", "lateral", "longitudinal"}, optional
        Velocity component.

    Returns
    -------
    float or numpy.ndarray
        Phi, (m/s)^2 per rad/m.
    """
    Omega, sigma, L = _spectrum_args(Omega, sigma, L, component)
    LO2 = (L * Omega) ** 2
    if component == "longitudinal":
        Phi = sigma**2 * (2.0 * L / np.pi) / (1.0 + LO2)
    else:
        Phi = sigma**2 * (L / np.pi) * (1.0 + 3.0 * LO2) / (1.0 + LO2) ** 2
    return float(Phi) if Phi.ndim == 0 else Phi


def von_karman_spectrum(Omega, sigma, L, component="vertical"):
    """One-sided von Karman spatial power spectral density of turbulence.

    Vertical (and lateral): Phi(Omega) = sigma^2 (L/pi) (1 + 8/3 (1.339 L
    Omega)^2) / (1 + (1.339 L Omega)^2)^(11/6); longitudinal: Phi(Omega) =
    sigma^2 (2L/pi) / (1 + (1.339 L Omega)^2)^(5/6) (MIL-F-8785C, 1980, and
    MIL-HDBK-1797; the longitudinal form is quoted from memory).
    int_0^inf Phi dOmega = sigma^2.

    Parameters
    ----------
    Omega : float or array_like
        Spatial frequency, rad/m (|Omega| is used).
    sigma : float
        Turbulence intensity (rms velocity), m/s.
    L : float
        Scale length, m.
    component : {"vertical", "lateral", "longitudinal"}, optional
        Velocity component.

    Returns
    -------
    float or numpy.ndarray
        Phi, (m/s)^2 per rad/m.
    """
    Omega, sigma, L = _spectrum_args(Omega, sigma, L, component)
    aLO2 = (_VON_KARMAN_A * L * Omega) ** 2
    if component == "longitudinal":
        Phi = sigma**2 * (2.0 * L / np.pi) / (1.0 + aLO2) ** (5.0 / 6.0)
    else:
        Phi = (sigma**2 * (L / np.pi) * (1.0 + 8.0 / 3.0 * aLO2)
               / (1.0 + aLO2) ** (11.0 / 6.0))
    return float(Phi) if Phi.ndim == 0 else Phi


# ---------------------------------------------------------------------------
# Effective angle of attack (three-quarter chord)
# ---------------------------------------------------------------------------

def effective_angle(alpha, alpha_dot, h_dot, speed, chord, pivot, w=None):
    """Effective angle of attack of thin-airfoil theory: the normal velocity at the three-quarter chord over U, rad.

    alpha_eff = alpha - h'/U + b (1/2 - a) alpha'/U + w/U, with b = c/2 the
    semichord, a = 2 pivot - 1 the pitch axis aft of mid-chord in semichords,
    h (plunge) and w (vertical gust at the three-quarter chord) positive up:
    the downwash term of T. Theodorsen, NACA Report 496 (1935), whose
    2 pi alpha_eff is the quasi-steady circulatory lift, and the
    three-quarter-chord point of thin-airfoil theory (I. H. Abbott &
    A. E. von Doenhoff, Theory of Wing Sections, 1959, ch. 4).  Small-angle
    form with U the flight speed; a streamwise gust does not enter.

    Parameters
    ----------
    alpha, alpha_dot : float or array_like
        Pitch (rad, nose-up) and pitch rate (rad/s).
    h_dot : float or array_like
        Plunge rate, m/s, up.
    speed, chord : float
        U (m/s) and c (m).
    pivot : float
        Pitch axis, fraction of chord aft of the leading edge.
    w : float or array_like, optional
        Vertical gust velocity at the three-quarter chord, m/s (none: 0).

    Returns
    -------
    numpy.ndarray
        alpha_eff, rad.
    """
    U = float(speed)
    b, a = 0.5 * float(chord), 2.0 * float(pivot) - 1.0
    out = (np.asarray(alpha, dtype=float) - np.asarray(h_dot, dtype=float) / U
           + b * (0.5 - a) * np.asarray(alpha_dot, dtype=float) / U)
    if w is not None:
        out = out + np.asarray(w, dtype=float) / U
    return out


# ---------------------------------------------------------------------------
# Finite-wing lift slope
# ---------------------------------------------------------------------------

def helmbold_lift_slope(aspect_ratio, a0=2.0 * np.pi):
    """Helmbold's lift-curve slope of a straight finite wing.

    a = a0 A / (a0/pi + sqrt((a0/pi)^2 + A^2)) (H. B. Helmbold, 1942, as used
    in the USAF DATCOM); for a0 = 2 pi this is a = 2 pi A / (2 + sqrt(A^2 + 4)).
    Tends to a0 for A -> inf and to pi A / 2 for A -> 0.

    Parameters
    ----------
    aspect_ratio : float or array_like
        Aspect ratio A = span^2 / area, > 0.
    a0 : float or array_like, optional
        Section lift-curve slope, per radian.

    Returns
    -------
    float or numpy.ndarray
        Wing lift-curve slope, per radian.
    """
    A = np.asarray(aspect_ratio, dtype=float)
    a0 = np.asarray(a0, dtype=float)
    if np.any(~(A > 0.0)):
        raise ValueError("aspect ratio must be positive")
    a0_pi = a0 / np.pi
    a = a0 * A / (a0_pi + np.sqrt(a0_pi**2 + A**2))
    return float(a) if a.ndim == 0 else a


# ---------------------------------------------------------------------------
# Thin-airfoil theory and the NACA 4-digit mean line
# ---------------------------------------------------------------------------

def _theta_nodes(n, breaks):
    """Gauss-Legendre nodes and weights in theta on [0, pi], split at chord fractions."""
    theta_b = [np.arccos(1.0 - 2.0 * float(xb)) for xb in breaks if 0.0 < float(xb) < 1.0]
    edges = np.unique(np.concatenate([[0.0, np.pi], theta_b]))
    t, w = np.polynomial.legendre.leggauss(n)
    thetas, weights = [], []
    for lo, hi in zip(edges[:-1], edges[1:]):
        thetas.append(0.5 * (hi - lo) * t + 0.5 * (hi + lo))
        weights.append(0.5 * (hi - lo) * w)
    return np.concatenate(thetas), np.concatenate(weights)


def thin_airfoil_coefficients(slope_fn, alpha=0.0, n=200, breaks=()):
    """Fourier coefficients A0, A1, A2 of thin-airfoil theory.

    A0 = alpha - (1/pi) int_0^pi (dz/dx) dtheta,
    An = (2/pi) int_0^pi (dz/dx) cos(n theta) dtheta, x/c = (1 - cos theta)/2
    (I. H. Abbott & A. E. von Doenhoff, Theory of Wing Sections, 1959, ch. 4).

    Parameters
    ----------
    slope_fn : callable
        Camber-line slope dz/dx as a function of x/c in [0, 1] (vectorised).
    alpha : float, optional
        Angle of attack, rad.
    n : int, optional
        Gauss-Legendre points per theta segment.
    breaks : sequence of float, optional
        Chord fractions where the slope has a kink (e.g. p of a NACA 4-digit
        mean line); the quadrature is split there.

    Returns
    -------
    A0, A1, A2 : float
        Then cl = pi (2 A0 + A1) and cm_c/4 = (pi/4) (A2 - A1).
    """
    theta, w = _theta_nodes(int(n), breaks)
    dzdx = np.asarray(slope_fn(0.5 * (1.0 - np.cos(theta))), dtype=float)
    A0 = alpha - np.sum(w * dzdx) / np.pi
    A1 = 2.0 / np.pi * np.sum(w * dzdx * np.cos(theta))
    A2 = 2.0 / np.pi * np.sum(w * dzdx * np.cos(2.0 * theta))
    return float(A0), float(A1), float(A2)


def zero_lift_angle(slope_fn, n=200, breaks=()):
    """Zero-lift angle of a thin cambered section.

    alpha_L0 = -(1/pi) int_0^pi (dz/dx) (cos theta - 1) dtheta (Abbott & von
    Doenhoff, Theory of Wing Sections, 1959, ch. 4).

    Parameters
    ----------
    slope_fn : callable
        Camber-line slope dz/dx as a function of x/c.
    n : int, optional
        Gauss-Legendre points per theta segment.
    breaks : sequence of float, optional
        Chord fractions where the slope has a kink.

    Returns
    -------
    float
        alpha_L0, rad (negative for positive camber).
    """
    theta, w = _theta_nodes(int(n), breaks)
    dzdx = np.asarray(slope_fn(0.5 * (1.0 - np.cos(theta))), dtype=float)
    return float(-np.sum(w * dzdx * (np.cos(theta) - 1.0)) / np.pi)


def steady_a0(alpha, slope_fn=None, n=200, breaks=()):
    """A0 of steady thin-airfoil theory: the leading-edge suction parameter of a steady section.

    A0 = alpha - (1/pi) int_0^pi (dz/dx) dtheta (Abbott & von Doenhoff,
    Theory of Wing Sections, 1959, ch. 4; the LESP of K. Ramesh et al.,
    J. Fluid Mech. 751, 2014).  A flat plate (``slope_fn`` None) gives alpha.

    Parameters
    ----------
    alpha : float
        Angle of attack, rad.
    slope_fn, n, breaks
        As :func:`zero_lift_angle`.
    """
    if slope_fn is None:
        return float(alpha)
    theta, w = _theta_nodes(int(n), breaks)
    dzdx = np.asarray(slope_fn(0.5 * (1.0 - np.cos(theta))), dtype=float)
    return float(alpha - np.sum(w * dzdx) / np.pi)


def cm_quarter_chord(slope_fn, n=200, breaks=()):
    """Quarter-chord moment coefficient of a thin cambered section.

    cm_c/4 = (pi/4) (A2 - A1), independent of the angle of attack (Abbott &
    von Doenhoff, Theory of Wing Sections, 1959, ch. 4).

    Parameters
    ----------
    slope_fn : callable
        Camber-line slope dz/dx as a function of x/c.
    n : int, optional
        Gauss-Legendre points per theta segment.
    breaks : sequence of float, optional
        Chord fractions where the slope has a kink.

    Returns
    -------
    float
        cm_c/4, nose-up positive.
    """
    _A0, A1, A2 = thin_airfoil_coefficients(slope_fn, 0.0, n, breaks)
    return float(np.pi / 4.0 * (A2 - A1))


def _naca4_check(m, p):
    if not (0.0 <= m < 0.5):
        raise ValueError(f"maximum camber m must be a chord fraction in [0, 0.5), got {m!r}")
    if m > 0.0 and not (0.0 < p < 1.0):
        raise ValueError(f"camber position p must lie in (0, 1) when m > 0, got {p!r}")


def naca4_camber(m, p, x):
    """NACA 4-digit mean line z/c.

    z = m/p^2 (2 p x - x^2) for x < p, z = m/(1-p)^2 ((1 - 2p) + 2 p x - x^2)
    for x >= p (E. N. Jacobs, K. E. Ward & R. M. Pinkerton, NACA Report 460,
    1933). For NACA 2412, m = 0.02 and p = 0.4.

    Parameters
    ----------
    m : float
        Maximum camber, fraction of the chord.
    p : float
        Chordwise position of the maximum camber, fraction of the chord.
    x : float or array_like
        Chord fraction x/c in [0, 1].

    Returns
    -------
    float or numpy.ndarray
        z/c.
    """
    m, p = float(m), float(p)
    _naca4_check(m, p)
    x = np.asarray(x, dtype=float)
    if m == 0.0:
        z = np.zeros_like(x)
    else:
        z = np.where(x < p, m / p**2 * (2.0 * p * x - x**2),
                     m / (1.0 - p) ** 2 * ((1.0 - 2.0 * p) + 2.0 * p * x - x**2))
    return float(z) if z.ndim == 0 else z


def naca4_slope(m, p, x):
    """Slope dz/dx of the NACA 4-digit mean line.

    dz/dx = 2 m/p^2 (p - x) for x < p, 2 m/(1-p)^2 (p - x) for x >= p
    (derivative of the mean line of Jacobs, Ward & Pinkerton, NACA Report
    460, 1933).

    Parameters
    ----------
    m : float
        Maximum camber, fraction of the chord.
    p : float
        Position of the maximum camber, fraction of the chord.
    x : float or array_like
        Chord fraction x/c in [0, 1].

    Returns
    -------
    float or numpy.ndarray
        dz/dx.
    """
    m, p = float(m), float(p)
    _naca4_check(m, p)
    x = np.asarray(x, dtype=float)
    if m == 0.0:
        dz = np.zeros_like(x)
    else:
        dz = np.where(x < p, 2.0 * m / p**2 * (p - x), 2.0 * m / (1.0 - p) ** 2 * (p - x))
    return float(dz) if dz.ndim == 0 else dz

