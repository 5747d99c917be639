"""Power-spectral gust loads of a section free to heave (continuous turbulence).

The load-factor response of a rigid aeroplane free to heave only, in a vertical
gust pattern frozen in the air, and the statistics of the response in
stationary Gaussian turbulence (J. C. Houbolt, R. Steiner & K. G. Pratt,
NASA TR R-199, 1964; S. O. Rice, Bell Syst. Tech. J. 23-24, 1944-45).

Harmonic motion ~ e^{i omega t}, heave h positive up, per unit span::

    m' h'' = kappa L' ,
    L' = -pi rho b^2 h'' - 2 pi rho U b C(k) h' + 2 pi rho U b S(k) w

(Theodorsen's plunge terms, NACA Report 496, with his downward h turned up;
Sears' gust lift, phase at mid-chord), b = c/2, k = omega b / U, and kappa the
finite-wing factor that scales the whole section lift (1 for a 2-D section).
The load-factor increment is dn = h'' / g, so::

    H_n(omega) = dn / w = -omega^2 kappa 2 pi rho U b S(k)
                 / (g [ -(m' + kappa pi rho b^2) omega^2 + i omega kappa 2 pi rho U b C(k) ])

(units 1/(m/s)).  For a pattern frozen in the air, omega = U Omega with Omega
the spatial frequency of the gust spectrum (rad/m).  Then::

    sigma_n^2 = int_0^Omega_max |H_n|^2 Phi_w dOmega ,      A_bar = sigma_n / sigma_w ,
    N0 = (1 / 2 pi) sqrt( int omega^2 |H_n|^2 Phi_w dOmega / int |H_n|^2 Phi_w dOmega )

(N0: zero up-crossings of dn per second), and the exceedance rate of a level y
above the mean is N(y) = N0 exp(-y^2 / (2 sigma_n^2)) (Rice).

For a 2-D section |S(k)|^2 ~ 1 / (2 pi k) at large k, so |H_n|^2 Phi_w decays as
Omega^-3 (sigma_n converges) but omega^2 |H_n|^2 Phi_w only as Omega^-1: N0
grows with the logarithm of the cut-off ``Omega_max``, which must be given (a
record sampled every dt resolves up to its Nyquist frequency, Omega_max =
pi / (U dt)).
"""

from __future__ import annotations

import math

import numpy as np
from scipy import integrate

from . import G, sears, theodorsen

def heave_load_factor_response(Omega, *, speed, chord, density, mass_per_span, lift_scale=1.0):
    """H_n(Omega): load-factor increment per unit vertical gust velocity, free heave.

    Parameters
    ----------
    Omega : float or array_like
        Spatial frequency of the gust pattern, rad/m (>= 0).
    speed, chord, density : float
        Flight speed U (m/s), chord c (m), air density rho (kg/m^3).
    mass_per_span : float
        m' = aircraft mass / span, kg/m (span = wing area / chord for a section
        that stands for the wing).
    lift_scale : float
        kappa, the factor on the whole section lift (finite-wing correction).

    Returns
    -------
    complex or numpy.ndarray of complex
        H_n, 1/(m/s).
    """
    Om = np.asarray(Omega, dtype=float)
    U, b, rho, m, kap = float(speed), 0.5 * float(chord), float(density), float(mass_per_span), float(lift_scale)
    omega = U * Om
    k = Om * b
    C = np.asarray(theodorsen(k))
    S = np.asarray(sears(k))
    num = -omega ** 2 * kap * 2.0 * math.pi * rho * U * b * S
    den = G * (-(m + kap * math.pi * rho * b * b) * omega ** 2
               + 1j * omega * kap * 2.0 * math.pi * rho * U * b * C)
    with np.errstate(invalid="ignore", divide="ignore"):
        H = np.where(omega == 0.0, 0.0 + 0.0j, num / np.where(omega == 0.0, 1.0, den))
    return complex(H) if H.ndim == 0 else H


def zero_phase_butterworth_gain(omega, omega_c, order):
    """Power gain (1 + (omega/omega_c)^(2N))^-2 of an order-N Butterworth low-pass applied forward
    and backward (zero phase: the magnitude response squared twice; S. Butterworth, Wireless
    Engineer 7, 1930; the forward-backward use is ``scipy.signal.sosfiltfilt``)."""
    x = (np.asarray(omega, dtype=float) / float(omega_c)) ** (2 * int(order))
    return 1.0 / (1.0 + x) ** 2


def heave_gust_statistics(psd, sigma_w, *, speed, chord, density, mass_per_span, lift_scale=1.0,
                          omega_max, omega_filter=None, filter_order=6):
    """sigma_n, A_bar and N0 of the heave response to turbulence of spectrum ``psd``.

    Parameters
    ----------
    psd : callable
        ``psd(Omega)``: one-sided spatial PSD of the vertical gust, (m/s)^2 per
        rad/m, e.g. ``lambda W: dryden_spectrum(W, sigma, L)``.
    sigma_w : float
        The rms gust velocity of ``psd`` (m/s), for A_bar.
    speed, chord, density, mass_per_span, lift_scale
        As :func:`heave_load_factor_response`.
    omega_max : float
        Upper limit of the integrals in circular frequency omega = U Omega,
        rad/s (e.g. the Nyquist frequency pi / dt of a record).
    omega_filter : float, optional
        Cut-off (rad/s) of a zero-phase Butterworth low-pass of order
        ``filter_order`` applied to the response before the statistics
        (:func:`zero_phase_butterworth_gain` weights the integrands), as
        done to a record whose highest frequencies are numerical noise.

    Returns
    -------
    dict
        ``sigma_n`` (rms load-factor increment), ``A_bar`` (sigma_n / sigma_w,
        1/(m/s)), ``N0`` (Hz), ``omega_max`` (rad/s).
    """
    kw = dict(speed=speed, chord=chord, density=density, mass_per_span=mass_per_span,
              lift_scale=lift_scale)
    U = float(speed)

    def f(lnW, moment):
        W = math.exp(lnW)
        h2 = abs(heave_load_factor_response(W, **kw)) ** 2
        if omega_filter is not None:
            h2 *= float(zero_phase_butterworth_gain(U * W, omega_filter, filter_order))
        return h2 * float(psd(W)) * (U * W) ** moment * W     # dOmega = W dlnW

    lo, hi = math.log(1e-8 / max(chord, 1e-12)), math.log(omega_max / U)
    pts = np.linspace(lo, hi, 60)
    m0 = sum(integrate.quad(f, a, b, args=(0,), limit=200)[0] for a, b in zip(pts[:-1], pts[1:]))
    m2 = sum(integrate.quad(f, a, b, args=(2,), limit=200)[0] for a, b in zip(pts[:-1], pts[1:]))
    sigma_n = math.sqrt(m0)
    out = {"sigma_n": sigma_n, "A_bar": sigma_n / float(sigma_w),
           "N0": math.sqrt(m2 / m0) / (2.0 * math.pi), "omega_max": float(omega_max)}
    if omega_filter is not None:
        out.update(omega_filter=float(omega_filter), filter_order=int(filter_order))
    return out


def heave_load_factor_psd(f, psd, *, speed, chord, density, mass_per_span, lift_scale=1.0):
    """One-sided PSD of the load factor per Hz at frequencies ``f`` (Hz), free heave:
    Phi_n(f) = 2 pi |H_n|^2 Phi_w(Omega) / U with Omega = 2 pi f / U (the spatial PSD carried
    to time by the frozen pattern, Houbolt, Steiner & Pratt, NASA TR R-199)."""
    f = np.asarray(f, dtype=float)
    U = float(speed)
    Om = 2.0 * math.pi * f / U
    H = heave_load_factor_response(Om, speed=speed, chord=chord, density=density,
                                   mass_per_span=mass_per_span, lift_scale=lift_scale)
    return 2.0 * math.pi * np.abs(H) ** 2 * np.asarray(psd(Om), dtype=float) / U


def rice_exceedance_rate(y, N0, sigma):
    """N(y) = N0 exp(-y^2 / (2 sigma^2)): crossings per second of the level y above the
    mean of a stationary Gaussian process (S. O. Rice, Bell Syst. Tech. J. 23-24, 1944-45)."""
    y = np.asarray(y, dtype=float)
    return N0 * np.exp(-y * y / (2.0 * sigma * sigma))
