"""The power-spectral method for a section free to heave (unsteady.theory.spectral_gust)
against the time-marching models, and the statistics of a long turbulence record.

Sources: T. Theodorsen, NACA Report 496 (1935), plunge terms; W. R. Sears,
J. Aeronaut. Sci. 8 (1941), gust lift; J. C. Houbolt, R. Steiner & K. G. Pratt,
NASA TR R-199 (1964), power-spectral gust loads; S. O. Rice, Bell Syst. Tech. J.
23-24 (1944-45), zero crossings and exceedances; MIL-F-8785C (1980), Dryden spectrum.
"""

import math

import numpy as np
import pytest

import unsteady
from unsteady import theory
from unsteady.theory import spectral_gust as sg

C, U, RHO, MASS, AREA = 0.25, 15.0, 1.2, 3.0, 0.55     # a small drone of our own
M_SPAN = MASS / (AREA / C)


def _heave_scenario(model, gust, duration, elements=24):
    return unsteady.load_scenario({
        "flow": {"speed": U, "density": RHO}, "airfoil": {"shape": "flat", "chord": C, "elements": elements},
        "aircraft": {"mass": MASS, "wing_area": AREA}, "gust": gust,
        "run": {"duration": duration, "model": model, "wake": "frozen"}, "output": {"plots": False}})


@pytest.mark.parametrize("model, k, tol", [("linear", 0.05, 1e-3), ("linear", 0.2, 1e-3), ("linear", 0.6, 1e-3),
                                           ("vortex", 0.05, 0.01), ("vortex", 0.6, 0.015)])
def test_heave_response_to_a_sine_gust_matches_the_transfer_function(model, k, tol):
    # Theodorsen plunge + Sears gust lift, free heave: |dn / w| at reduced frequency k
    wavelength = 2 * math.pi * (C / 2) / k
    period = wavelength / U
    res = unsteady.simulate(_heave_scenario(model, {"profile": "sine", "amplitude": 0.5,
                                                    "wavelength": wavelength}, 12 * period))
    t, n = res.history["t"], res.history["n"]
    sel = t > 6 * period                               # past the start-up
    w = 2 * math.pi / period
    A = np.c_[np.cos(w * t[sel]), np.sin(w * t[sel]), np.ones(sel.sum())]
    a, b, _ = np.linalg.lstsq(A, n[sel], rcond=None)[0]
    H = sg.heave_load_factor_response(2 * math.pi / wavelength, speed=U, chord=C, density=RHO,
                                          mass_per_span=M_SPAN)
    assert math.hypot(a, b) / 0.5 == pytest.approx(abs(H), rel=tol)


def test_transfer_function_limits():
    # slow gusts: the aircraft rides with the air (dn -> 0); fast: the apparent-mass-loaded
    # lift of Sears' function over the total mass (common practice for the limits)
    H0 = sg.heave_load_factor_response(1e-6, speed=U, chord=C, density=RHO, mass_per_span=M_SPAN)
    assert abs(H0) < 1e-4
    W = 1e4
    Hinf = sg.heave_load_factor_response(W, speed=U, chord=C, density=RHO, mass_per_span=M_SPAN)
    b = C / 2
    ref = 2 * math.pi * RHO * U * b * theory.sears(W * b) / (9.80665 * (M_SPAN + math.pi * RHO * b * b))
    assert abs(Hinf - ref) < 1e-3 * abs(ref)


def test_long_dryden_record_statistics_match_the_power_spectral_method():
    sig, L = 1.5, 100.0
    sc = _heave_scenario("linear", {"profile": "turbulence", "spectrum": "dryden", "intensity": sig,
                                    "scale_length": L, "seed": 7}, 400.0)
    res = unsteady.simulate(sc)
    t, n = res.history["t"], res.history["n"]
    sel = t > 20 * L / U                               # start-up left out: 20 scale lengths flown
    x = n[sel] - n[sel].mean()
    span = t[sel][-1] - t[sel][0]
    st = sg.heave_gust_statistics(lambda W: theory.dryden_spectrum(W, sig, L), sig, speed=U, chord=C,
                                      density=RHO, mass_per_span=M_SPAN, omega_max=math.pi / sc.dt)
    assert x.std() == pytest.approx(st["sigma_n"], rel=0.05)
    assert st["A_bar"] == pytest.approx(st["sigma_n"] / sig, rel=1e-12)
    up = np.sum((x[:-1] < 0) & (x[1:] >= 0)) / span
    assert up == pytest.approx(st["N0"], rel=0.15)      # N0 to the record's Nyquist frequency
    for y in (1.0, 2.0):                               # Rice's exceedances, within the record's scatter
        lev = y * x.std()
        count = np.sum((x[:-1] < lev) & (x[1:] >= lev)) / span
        assert count == pytest.approx(sg.rice_exceedance_rate(lev, up, x.std()), rel=0.25)
