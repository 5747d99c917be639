"""Tests of the classical closed-form and indicial references in unsteady.theory."""

import numpy as np
import pytest
from scipy import integrate, special

from unsteady import theory as th


# ---------------------------------------------------------------------------
# Theodorsen function
# ---------------------------------------------------------------------------

@pytest.mark.parametrize(
    "k, F, G",
    [
        (0.1, 0.832, -0.172),  # Theodorsen, NACA Rep. 496 tables (values from memory)
        (0.5, 0.598, -0.151),  # from memory
        (1.0, 0.539, -0.100),  # from memory
    ],
)
def test_theodorsen_known_values(k, F, G):
    C = th.theodorsen(k)
    assert C.real == pytest.approx(F, abs=1e-3)
    assert C.imag == pytest.approx(G, abs=1e-3)


def test_theodorsen_limits():
    # Theodorsen, NACA Rep. 496: C(0) = 1, F(inf) = 1/2, G(inf) = 0
    assert th.theodorsen(0.0) == 1.0
    assert th.theodorsen(np.inf) == 0.5
    C = th.theodorsen(1e4)
    assert C.real == pytest.approx(0.5, abs=1e-6)
    # large-k expansion of the Hankel functions (DLMF 10.17.4, from memory) gives
    # C ~ 1/2 - i/(8k)
    assert C.imag == pytest.approx(-1.0 / 8e4, rel=1e-3)
    assert abs(th.theodorsen(1e-12) - 1.0) < 1e-9


def test_theodorsen_equals_modified_bessel_form():
    # DLMF 10.27.8 (from memory): H_n^(2)(k) is proportional to K_n(ik), giving the
    # independent form C = K1(ik) / (K0(ik) + K1(ik)) with scipy's complex kv
    k = np.array([0.01, 0.07, 0.3, 1.0, 2.5, 12.0])
    p = 1j * k
    C_kv = special.kv(1, p) / (special.kv(0, p) + special.kv(1, p))
    assert np.allclose(th.theodorsen(k), C_kv, rtol=1e-12, atol=1e-12)


def test_theodorsen_vectorised_and_conjugate_symmetric():
    # common practice: real impulse response -> C(-k) = conj C(k)
    k = np.array([[0.1, 0.5], [1.0, 3.0]])
    C = th.theodorsen(k)
    assert C.shape == (2, 2)
    assert np.allclose(th.theodorsen(-k), np.conj(C))
    assert np.all(np.diff(th.theodorsen(np.linspace(0, 5, 50)).real) < 0)  # F falls from 1 to 1/2


# ---------------------------------------------------------------------------
# Theodorsen loads
# ---------------------------------------------------------------------------

def test_loads_quasi_steady_pitch():
    # Abbott & von Doenhoff ch. 4: cl = 2 pi alpha, cm_c/4 = 0 for a flat plate
    for pivot in (0.0, 0.25, 0.4, 1.0):
        cl, cm = th.theodorsen_loads(1e-9, 0.1, 0.0, pivot)
        assert cl == pytest.approx(2 * np.pi * 0.1, abs=1e-6)
        assert abs(cm) < 1e-8


def test_loads_quasi_steady_plunge_sign():
    # Theodorsen NACA Rep. 496 with h up: rising section sees alpha_eff = -h'/U, cl = -2 pi h'/U
    k, h_hat = 1e-5, 0.02
    cl, cm = th.theodorsen_loads(k, 0.0, h_hat, 0.25)
    h_dot_over_U = 2j * k * h_hat  # omega c h_hat / U = 2 i k h_hat
    assert cl == pytest.approx(-2 * np.pi * h_dot_over_U, rel=1e-3)
    assert abs(cm) < 1e-8


def test_plunge_lift_matches_theodorsen_direct_form():
    # Theodorsen NACA Rep. 496 (h down): L = pi rho b^2 h'' + 2 pi rho U b C h',
    # evaluated here dimensionally for a plunge of 5 mm at 8 Hz, U = 12 m/s, c = 0.3 m
    rho, U, c, f, h0 = 1.2, 12.0, 0.3, 8.0, 0.005
    b, omega = c / 2, 2 * np.pi * f
    k = omega * b / U
    hT = -h0  # Theodorsen's h (down) amplitude for our h = h0 e^{i w t} (up)
    L = np.pi * rho * b**2 * (-(omega**2) * hT) + 2 * np.pi * rho * U * b * th.theodorsen(k) * (1j * omega * hT)
    cl, _ = th.theodorsen_loads(k, 0.0, h0 / c, 0.25)
    assert cl == pytest.approx(L / (0.5 * rho * U**2 * c), rel=1e-12)


@pytest.mark.parametrize("k", [0.05, 0.3, 1.0, 4.0])
@pytest.mark.parametrize("pivot", [0.0, 0.25, 0.7, 1.3])
def test_loads_kinematic_identity(k, pivot):
    # common practice (rigid-body kinematics): nose-up pitch about x_p is pitch about
    # mid-chord plus a plunge of the mid-chord by -(0.5 - x_p) c alpha
    alpha_hat = 0.05 * np.exp(0.3j)
    cl_p, cm_p = th.theodorsen_loads(k, alpha_hat, 0.0, pivot)
    cl_m, cm_m = th.theodorsen_loads(k, alpha_hat, -(0.5 - pivot) * alpha_hat, 0.5)
    assert cl_p == pytest.approx(cl_m, rel=1e-12, abs=1e-14)
    assert cm_p == pytest.approx(cm_m, rel=1e-12, abs=1e-14)


def test_loads_moment_transfer():
    # statics (common practice): M_B = M_A + L (x_B - x_A) for lift up, x aft, nose-up moments
    k, a_hat, h_hat, pivot = 0.4, 0.03j, 0.01, 0.35
    cl, cm_qc = th.theodorsen_loads(k, a_hat, h_hat, pivot)
    _, cm_le = th.theodorsen_loads(k, a_hat, h_hat, pivot, moment_ref=0.0)
    assert cm_le == pytest.approx(cm_qc + cl * (0.0 - 0.25), rel=1e-12)


def test_quarter_chord_moment_is_apparent_mass_only():
    # Theodorsen NACA Rep. 496: the circulatory lift acts at the quarter chord, so
    # cm_c/4 = -(pi/2)(k^2 h + i k alpha - (1/8 - a/2) k^2 alpha) has no C(k) in it
    for k in (0.1, 0.8, 3.0):
        for pivot in (0.25, 0.5, 0.0):
            a = 2 * pivot - 1
            _, cm = th.theodorsen_loads(k, 0.02, 0.0, pivot)
            assert cm == pytest.approx(-(np.pi / 2) * (1j * k * 0.02 - (1 / 8 - a / 2) * k**2 * 0.02), rel=1e-12)
            _, cm = th.theodorsen_loads(k, 0.0, 0.01, pivot)
            assert cm == pytest.approx(-(np.pi / 2) * k**2 * 0.01, rel=1e-12)


def test_apparent_mass_limit_large_k():
    # Apparent mass pi rho b^2 per span and apparent moment of inertia pi rho b^4 / 8
    # about mid-chord of a flat plate (Theodorsen NACA Rep. 496; common practice).
    rho, U, c = 1.0, 1.0, 1.0
    b = c / 2
    k = 2000.0
    omega = k * U / b
    # plunge: L = -m_a h'' = m_a omega^2 h
    cl, _ = th.theodorsen_loads(k, 0.0, 1.0, 0.5)
    L_am = np.pi * rho * b**2 * omega**2 * c
    assert cl.real == pytest.approx(L_am / (0.5 * rho * U**2 * c), rel=1e-3)
    # pitch about mid-chord: M = -I_a alpha'' = (pi rho b^4 / 8) omega^2 alpha
    _, cm_mid = th.theodorsen_loads(k, 1.0, 0.0, 0.5, moment_ref=0.5)
    M_am = np.pi * rho * b**4 / 8 * omega**2
    assert cm_mid.real == pytest.approx(M_am / (0.5 * rho * U**2 * c**2), rel=1e-3)
    # pitch about mid-chord: no alpha'' lift, cl grows only like k: i k (pi + 2 pi C) alpha -> 1.5 pi i k alpha
    cl, _ = th.theodorsen_loads(k, 1.0, 0.0, 0.5)
    assert cl / k == pytest.approx(1.5j * np.pi, rel=1e-3)


def test_loads_vectorised():
    k = np.array([0.1, 0.2, 0.4])
    cl, cm = th.theodorsen_loads(k, 0.01, 0.0, 0.25)
    assert cl.shape == cm.shape == (3,)
    assert cl[1] == pytest.approx(th.theodorsen_loads(0.2, 0.01, 0.0, 0.25)[0])


# ---------------------------------------------------------------------------
# Wagner function
# ---------------------------------------------------------------------------

def _recovered_transfer(r, k, S=4000.0):
    """H(k) = 1 + i k int_0^inf (r(s) - 1) e^{-iks} ds from a step response r.

    Fourier transform of the indicial response (Garrick, NACA Rep. 629); the tail
    beyond S uses r - 1 ~ -c/s and int_S^inf e^{-iks}/s ds = E1(i k S).
    """
    f = lambda s: float(r(s)) - 1.0
    re = integrate.quad(f, 0.0, S, weight="cos", wvar=k, limit=2000)[0]
    im = -integrate.quad(f, 0.0, S, weight="sin", wvar=k, limit=2000)[0]
    c = S * (1.0 - float(r(S)))
    tail = -c * special.exp1(1j * k * S)
    return 1.0 + 1j * k * (re + 1j * im + tail)


@pytest.mark.parametrize("k", [0.1, 0.5, 1.0, 2.0])
def test_wagner_transforms_back_to_theodorsen(k):
    # Garrick, NACA Rep. 629: C(k) is the Fourier transform of the Wagner function;
    # checks the tabulated function against the Hankel-function formula of C(k)
    assert _recovered_transfer(th.wagner, k) == pytest.approx(th.theodorsen(k), abs=1e-7)


def test_wagner_end_values_and_monotone():
    # Wagner (1925): half the steady lift at once, then 1 asymptotically
    assert th.wagner(0.0) == pytest.approx(0.5, abs=1e-12)
    assert th.wagner(-1.0) == 0.0
    assert th.wagner(1e7) == pytest.approx(1.0, abs=1e-6)
    s = np.linspace(0.0, 300.0, 30001)
    assert np.all(np.diff(th.wagner(s)) > 0)


@pytest.mark.parametrize("s", [0.1, 1.0, 3.7, 12.0, 55.0, 180.0])
def test_wagner_table_matches_garrick_integrals(s):
    # Garrick, NACA Rep. 629: sine form with Re C and cosine form with Im C
    sine = th.wagner_exact_point(s, "sine")
    cosine = th.wagner_exact_point(s, "cosine")
    assert sine == pytest.approx(cosine, abs=1e-8)
    assert th.wagner(s) == pytest.approx(sine, abs=1e-8)


def test_wagner_jones_within_one_percent():
    # R. T. Jones, NACA Rep. 681: the approximation is within about 1 % on 0 <= s <= 100
    s = np.linspace(0.0, 100.0, 2001)
    rel = np.abs(th.wagner_jones(s) - th.wagner(s)) / th.wagner(s)
    assert rel.max() < 0.011
    # Jones tends to 1 exponentially, the exact function algebraically (below);
    # far out both are within 0.0011 of each other
    s = np.array([1000.0, 3000.0, 1e4])
    assert np.all(np.abs(th.wagner_jones(s) - th.wagner(s)) < 0.0011)


def test_wagner_algebraic_tail():
    # derived in unsteady.theory's notes: 1 - C(k) ~ -i k ln k at small k gives
    # 1 - phi ~ 1/s; checked against the direct branch-cut quadrature
    for s in (1e4, 5e4):
        assert s * (1.0 - th.wagner(s)) == pytest.approx(1.0, abs=2e-3)
    assert th.wagner(3e5) == pytest.approx(th.wagner_exact_point(3e5, "branch-cut"), abs=1e-9)


def test_wagner_vectorised_shape_nan():
    s = np.array([[0.0, 1.0], [np.nan, -2.0]])
    out = th.wagner(s)
    assert out.shape == (2, 2) and np.isnan(out[1, 0]) and out[1, 1] == 0.0
    assert isinstance(th.wagner(2.0), float)


# ---------------------------------------------------------------------------
# Sears function
# ---------------------------------------------------------------------------

@pytest.mark.parametrize("k", [0.05, 0.3, 1.0, 4.0])
def test_sears_formula(k):
    # Sears (1941): S = [J0 - i J1] C + i J1, written out with scipy.special.jv
    C = th.theodorsen(k)
    S = (special.jv(0, k) - 1j * special.jv(1, k)) * C + 1j * special.jv(1, k)
    assert th.sears(k) == pytest.approx(S, rel=1e-13)


def test_sears_limits():
    # Sears (1941): S(0) = 1; |S(k)| ~ 1 / sqrt(2 pi k) for large k
    assert th.sears(0.0) == 1.0
    for k in (100.0, 1000.0):
        assert abs(th.sears(k)) * np.sqrt(2 * np.pi * k) == pytest.approx(1.0, abs=2e-3)
    assert np.all(np.diff(np.abs(th.sears(np.linspace(0.0, 10.0, 200)))) < 0)


def test_sears_leading_edge_modified_bessel_form():
    # Independent form from I0 K1 + I1 K0 = 1/p (DLMF 10.28.2, from memory):
    # S e^{-ik} = e^{-p} / (p (K0(p) + K1(p))), p = i k, with scipy's scaled kve
    k = np.array([0.02, 0.2, 1.0, 5.0, 40.0])
    p = 1j * k
    expected = 1.0 / (p * (special.kve(0, p) + special.kve(1, p)))
    assert np.allclose(th.sears_leading_edge(k), expected, rtol=1e-10, atol=1e-12)


# ---------------------------------------------------------------------------
# Kuessner function
# ---------------------------------------------------------------------------

@pytest.mark.parametrize("k", [0.1, 0.5, 1.0, 2.0])
def test_kuessner_transforms_back_to_sears(k):
    # Garrick, NACA Rep. 629: S(k) e^{-ik} is the Fourier transform of Kuessner's
    # function; an independent check of the table against the Bessel-function formula
    assert _recovered_transfer(th.kuessner, k) == pytest.approx(th.sears_leading_edge(k), abs=1e-7)


def test_kuessner_end_values_and_monotone():
    # Kuessner (1936): no lift before the front arrives, steady lift at the end
    assert abs(th.kuessner(0.0)) < 1e-12
    assert th.kuessner(-3.0) == 0.0
    assert th.kuessner(1e7) == pytest.approx(1.0, abs=1e-6)
    s = np.linspace(0.0, 300.0, 30001)
    assert np.all(np.diff(th.kuessner(s)) > 0)


@pytest.mark.parametrize("s", [0.02, 0.5, 1.0, 4.2, 30.0, 150.0])
def test_kuessner_table_matches_garrick_integrals(s):
    # Garrick, NACA Rep. 629: sine form with Re S_LE and cosine form with Im S_LE
    sine = th.kuessner_exact_point(s, "sine")
    cosine = th.kuessner_exact_point(s, "cosine")
    assert sine == pytest.approx(cosine, abs=1e-8)
    assert th.kuessner(s) == pytest.approx(sine, abs=1e-8)


def test_kuessner_initial_square_root_growth():
    # derived: |S| ~ 1/sqrt(2 pi k) at large k (Sears 1941) makes psi ~ sqrt(2 s) / pi at small s
    for s in (1e-6, 1e-5):
        assert th.kuessner(s) / (np.sqrt(2 * s) / np.pi) == pytest.approx(1.0, abs=5e-3)


def test_kuessner_sears_sparks_rough():
    # W. R. Sears & B. O. Sparks (from memory): their exponential form is a rough approximation, about 10 % off near s = 1
    exact = th.kuessner(1.0)
    assert 0.05 < (exact - th.kuessner_sears_sparks(1.0)) / exact < 0.15
    s = np.linspace(0.0, 50.0, 501)
    assert np.max(np.abs(th.kuessner(s) - th.kuessner_sears_sparks(s))) < 0.1


def test_kuessner_lags_wagner_then_both_reach_one():
    # Kuessner (1936) / Wagner (1925): gust lift builds slower than the step-alpha lift
    s = np.linspace(0.01, 50.0, 500)
    assert np.all(th.kuessner(s) < th.wagner(s))


# ---------------------------------------------------------------------------
# Gust formula
# ---------------------------------------------------------------------------

def test_alleviation_factor_values():
    # Pratt & Walker NACA Rep. 1206: K_g = 0.88 mu / (5.3 + mu)
    assert th.gust_alleviation_factor(5.3) == pytest.approx(0.44, abs=1e-15)
    assert th.gust_alleviation_factor(1e9) == pytest.approx(0.88, rel=1e-6)
    assert th.gust_alleviation_factor(0.0) == 0.0


def test_gust_formula_against_imperial_regulation_form():
    # 14 CFR 23.341 (from memory): dn = K_g U_de V a / (498 (W/S)), V knots EAS, U_de ft/s,
    # W/S lb/ft^2; mu_g = 2 (W/S) / (rho C a g), slug/ft^3, ft, g = 32.2 ft/s^2.
    # A light aeroplane of our own: W/S 17 lb/ft^2, C 4.8 ft, a 5.0, 120 kt EAS,
    # U_de 50 ft/s, at 5000 ft (rho 0.002048 slug/ft^3, from memory).
    WS, C, a, V_kt, Ude, rho_imp = 17.0, 4.8, 5.0, 120.0, 50.0, 0.002048
    mu_imp = 2 * WS / (rho_imp * C * a * 32.2)
    dn_imp = th.gust_alleviation_factor(mu_imp) * Ude * V_kt * a / (498.0 * WS)
    lbft2, ft, kt, slug_ft3 = 47.880259, 0.3048, 0.514444, 515.378818
    dn, K_g, mu_g = th.gust_load_factor_increment(
        WS * lbft2, rho_imp * slug_ft3, V_kt * kt, Ude * ft, C * ft, a,
        reference_density=1.225,
    )
    assert mu_g == pytest.approx(mu_imp, rel=3e-3)
    assert dn == pytest.approx(dn_imp, rel=3e-3)
    assert 0 < K_g < 0.88


def test_gust_formula_consistent_parts():
    # Pratt & Walker NACA Rep. 1206: dn = K_g rho U U_de a / (2 W/S)
    dn, K_g, mu = th.gust_load_factor_increment(300.0, 1.1, 25.0, 7.0, 0.3, 5.2)
    assert mu == pytest.approx(2 * 300.0 / (1.1 * 0.3 * 5.2 * 9.80665))
    assert dn == pytest.approx(K_g * 1.1 * 25.0 * 7.0 * 5.2 / 600.0)
    assert "airworthiness" in th.GUST_CAUTION


# ---------------------------------------------------------------------------
# Turbulence spectra
# ---------------------------------------------------------------------------

@pytest.mark.parametrize("spectrum", [th.dryden_spectrum, th.von_karman_spectrum])
@pytest.mark.parametrize("component", ["vertical", "longitudinal"])
def test_spectra_integrate_to_variance(spectrum, component):
    # MIL-F-8785C / MIL-HDBK-1797: one-sided spatial PSD integrates to sigma^2
    sigma, L = 1.7, 530.0
    f = lambda W: spectrum(W, sigma, L, component)
    total = sum(integrate.quad(f, lo, hi, limit=500)[0]
                for lo, hi in ((0, 1 / L), (1 / L, 100 / L), (100 / L, np.inf)))
    assert total == pytest.approx(sigma**2, rel=5e-3)


def test_spectra_low_and_high_frequency():
    # MIL-F-8785C: Dryden and von Karman agree at Omega = 0 (sigma^2 L/pi vertical,
    # 2 sigma^2 L/pi longitudinal); high-frequency slopes -2 (Dryden) and -5/3
    # (von Karman, Kolmogorov inertial range; common practice)
    sigma, L = 2.0, 300.0
    assert th.dryden_spectrum(0.0, sigma, L) == pytest.approx(sigma**2 * L / np.pi)
    assert th.von_karman_spectrum(0.0, sigma, L) == pytest.approx(sigma**2 * L / np.pi)
    assert th.von_karman_spectrum(0.0, sigma, L, "longitudinal") == pytest.approx(2 * sigma**2 * L / np.pi)
    W = np.array([1e3, 1e4]) / L
    slope = lambda f: np.diff(np.log(f(W, sigma, L))) / np.diff(np.log(W))
    assert slope(th.dryden_spectrum)[0] == pytest.approx(-2.0, abs=1e-3)
    assert slope(th.von_karman_spectrum)[0] == pytest.approx(-5.0 / 3.0, abs=1e-3)


def test_spectra_reject_bad_input():
    with pytest.raises(ValueError, match="component"):
        th.dryden_spectrum(1.0, 1.0, 100.0, "sideways")
    with pytest.raises(ValueError, match="scale length"):
        th.von_karman_spectrum(1.0, 1.0, 0.0)


# ---------------------------------------------------------------------------
# Finite-wing lift slope
# ---------------------------------------------------------------------------

def test_helmbold():
    # H. B. Helmbold (1942), as used in the USAF DATCOM: a = 2 pi A / (2 + sqrt(A^2 + 4)) for a0 = 2 pi
    A = np.array([0.5, 3.0, 7.5, 20.0])
    assert np.allclose(th.helmbold_lift_slope(A), 2 * np.pi * A / (2 + np.sqrt(A**2 + 4)))
    # slender wing a = pi A / 2 (R. T. Jones, NACA Rep. 835, from memory)
    assert th.helmbold_lift_slope(1e-4) == pytest.approx(np.pi * 1e-4 / 2, rel=1e-4)
    # high aspect ratio: elliptic lifting line a = a0 / (1 + a0/(pi A)) (Prandtl; common practice)
    a0 = 5.9
    assert th.helmbold_lift_slope(30.0, a0) == pytest.approx(a0 / (1 + a0 / (np.pi * 30.0)), rel=2e-3)
    assert th.helmbold_lift_slope(1e8, a0) == pytest.approx(a0, rel=1e-6)
    with pytest.raises(ValueError):
        th.helmbold_lift_slope(0.0)


# ---------------------------------------------------------------------------
# Thin-airfoil theory and the NACA 4-digit mean line
# ---------------------------------------------------------------------------

def test_naca2412_thin_airfoil_values():
    # Abbott & von Doenhoff ch. 4: NACA 2412 alpha_L0 ~ -2.08 deg, cm_c/4 ~ -0.053 (from memory)
    slope = lambda x: th.naca4_slope(0.02, 0.4, x)
    assert np.degrees(th.zero_lift_angle(slope, breaks=[0.4])) == pytest.approx(-2.08, abs=0.01)
    assert th.cm_quarter_chord(slope, breaks=[0.4]) == pytest.approx(-0.053, abs=0.001)


def test_parabolic_arc_closed_form():
    # Abbott & von Doenhoff ch. 4 (from memory): circular-arc camber of height h,
    # z = 4 h x (1 - x): alpha_L0 = -2 h, cm_c/4 = -pi h
    h = 0.03
    slope = lambda x: 4 * h * (1 - 2 * x)
    assert th.zero_lift_angle(slope) == pytest.approx(-2 * h, rel=1e-10)
    assert th.cm_quarter_chord(slope) == pytest.approx(-np.pi * h, rel=1e-10)
    A0, A1, A2 = th.thin_airfoil_coefficients(slope, alpha=0.1)
    # cl = pi (2 A0 + A1) = 2 pi (alpha - alpha_L0)
    assert np.pi * (2 * A0 + A1) == pytest.approx(2 * np.pi * (0.1 + 2 * h), rel=1e-10)


def test_flat_plate():
    # Abbott & von Doenhoff ch. 4: flat plate, cl = 2 pi alpha, no zero-lift angle or moment
    flat = lambda x: th.naca4_slope(0.0, 0.0, x)
    assert th.zero_lift_angle(flat) == 0.0
    assert th.cm_quarter_chord(flat) == 0.0
    A0, A1, A2 = th.thin_airfoil_coefficients(flat, alpha=0.07)
    assert (A0, A1, A2) == (pytest.approx(0.07), 0.0, 0.0)


def test_naca4_mean_line():
    # Jacobs, Ward & Pinkerton NACA Rep. 460: z(0) = z(1) = 0, max m at x = p, slope = dz/dx
    m, p = 0.04, 0.3
    assert th.naca4_camber(m, p, 0.0) == 0.0
    assert th.naca4_camber(m, p, 1.0) == pytest.approx(0.0, abs=1e-15)
    x = np.linspace(0, 1, 1001)
    z = th.naca4_camber(m, p, x)
    assert z.max() == pytest.approx(m, rel=1e-12) and x[z.argmax()] == pytest.approx(p)
    xm = 0.5 * (x[1:] + x[:-1])
    assert np.allclose(np.diff(z) / np.diff(x), th.naca4_slope(m, p, xm), atol=1e-6)
    with pytest.raises(ValueError):
        th.naca4_camber(0.02, 0.0, 0.5)
