"""The hinged trailing-edge flap against thin-airfoil theory (Glauert) and Theodorsen's flap terms (NACA Report 496).

Sources, each named beside its check:
- H. Glauert, The Elements of Aerofoil and Airscrew Theory (1926); I. H. Abbott &
  A. E. von Doenhoff, Theory of Wing Sections (1959), ch. 4: steady flap derivatives
  and the thin-airfoil loading of a camber line.
- T. Theodorsen, NACA Report 496 (1935): lift, moment and hinge moment of a flap in
  harmonic motion (the T functions; those beyond the project's list of references are
  stated from memory, which is why they are checked twice: steady against the
  thin-airfoil integral, harmonic against the discrete-vortex model, an independent
  computation).
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate, theory
from unsteady.theory import flap

U, C = 10.0, 0.2


def first_harmonic(t, y, omega, periods=2):
    """Complex amplitude Y of y ~ a + b t + Re[Y e^{i omega t}] over the last periods."""
    T = 2 * math.pi / omega
    sel = t >= t[-1] - periods * T
    tt = t[sel]
    M = np.column_stack([np.ones_like(tt), tt - tt.mean(), np.cos(omega * tt), np.sin(omega * tt)])
    coef = np.linalg.lstsq(M, y[sel], rcond=None)[0]
    return coef[2] - 1j * coef[3]


def flap_scenario(hinge, flap_law, elements=80, wake="frozen", chords=4, pitch=0.0, shape="flat", **run):
    return load_scenario({
        "flow": {"speed": U, "density": 1.2},
        "airfoil": {"shape": shape, "chord": C, "elements": elements, "flap_hinge": hinge},
        "motion": {"pivot": 0.25, "pitch": {"law": "constant", "value": pitch}, "flap": flap_law},
        "run": {"chords": chords, "wake": wake, **run},
        "output": {"plots": False},
    })


# ---------------------------------------------------------------- theory itself

@pytest.mark.parametrize("hinge", [0.6, 0.75, 0.9])
def test_theodorsen_steady_limit_is_glauert_and_the_thin_airfoil_hinge_moment(hinge):
    # k = 0 of Theodorsen's flap terms against Glauert's dcl/dbeta, dcm_c/4/dbeta
    # (Glauert 1926; Abbott & von Doenhoff ch. 4), and the hinge moment against the
    # thin-airfoil loading of the deflected flap taken as a kinked camber line
    # (Abbott & von Doenhoff ch. 4), integrated over the flap.
    beta = 1e-3
    cl, cm, ch = flap.theodorsen_flap_loads(0.0, hinge, beta)
    dcl, dcm = flap.glauert_flap(hinge)
    assert cl.real == pytest.approx(dcl * beta, rel=1e-12)
    assert cm.real == pytest.approx(dcm * beta, rel=1e-12)
    slope = (lambda x: np.where(x > hinge, -beta, 0.0))
    a_L0 = theory.zero_lift_angle(slope, breaks=(hinge,))
    assert -2 * math.pi * a_L0 == pytest.approx(cl.real, rel=1e-9)
    e = flap.hinge_e(hinge)
    T = flap.t_functions(e)
    ch_thin = (flap.camber_hinge_moment(slope, hinge, breaks=(hinge,), terms=400)
               - 2 * T[12] / (1 - e) ** 2 * (0.0 - a_L0))
    assert ch.real == pytest.approx(ch_thin, rel=2e-4)


# ---------------------------------------------------------------- steady flap, vortex model

@pytest.mark.parametrize("hinge", [0.6, 0.75, 0.9])
def test_steady_flap_against_glauert(hinge):
    # dcl/dbeta within 2 % and dcm_c/4/dbeta within 0.003 per 3 degrees of Glauert's thin-airfoil
    # flap (Glauert 1926; Abbott & von Doenhoff 1959, ch. 4) at 80 elements: the settled flow.
    res = simulate(flap_scenario(hinge, {"law": "constant", "value": 3.0}, chords=1))
    beta = math.radians(3.0)
    dcl, dcm = flap.glauert_flap(hinge)
    assert res.history["cl"][0] == pytest.approx(dcl * beta, rel=0.02)
    assert abs(res.history["cm"][0] - dcm * beta) < 0.003
    # the hinge moment against Theodorsen's at k = 0 (checked against thin-airfoil theory above)
    ch_ref = flap.theodorsen_flap_loads(0.0, hinge, beta)[2].real
    assert res.history["ch"][0] == pytest.approx(ch_ref, rel=0.03)


def test_flap_adds_to_camber_and_pitch_as_thin_airfoil_theory_says():
    # Thin-airfoil theory is linear (Abbott & von Doenhoff ch. 4): the lift of a NACA 2412 at
    # 2 degrees with its flap at 3 degrees is the sum of its parts, within 1 % at 80 elements
    # (the lumped-vortex model is linear in the angles to second order).
    both = simulate(flap_scenario(0.75, {"law": "constant", "value": 3.0}, pitch=2.0, shape="naca2412",
                                  chords=1)).history["cl"][0]
    dcl, _ = flap.glauert_flap(0.75)
    a_L0 = theory.zero_lift_angle(lambda x: theory.naca4_slope(0.02, 0.4, x), breaks=(0.4,))
    ref = 2 * math.pi * (math.radians(2.0) - a_L0) + dcl * math.radians(3.0)
    assert both == pytest.approx(ref, rel=0.01)


# ---------------------------------------------------------------- harmonic flap

@pytest.mark.parametrize("k", [0.1, 0.5, 1.0])
def test_harmonic_flap_against_theodorsen(k):
    # Frozen wake, small amplitude: first harmonic of cl within 2 % and 2 degrees, of the hinge
    # moment within 5 % (and 3 degrees), of Theodorsen's flap terms (NACA Report 496).
    # Measured at 80 elements: cl 0.6-0.8 % low, phase < 0.1 deg; ch 1.7-2.8 % high, < 0.4 deg.
    hinge, A = 0.75, 1.0
    omega = 2 * U * k / C
    periods = 4 if k >= 0.5 else 3
    sc = flap_scenario(hinge, {"law": "sine", "amplitude": A, "reduced_frequency": k},
                       chords=max(periods * math.pi / k, 60.0))
    h = simulate(sc).history
    cl_ref, cm_ref, ch_ref = flap.theodorsen_flap_loads(k, hinge, -1j * math.radians(A))
    for name, ref, amp, phase in (("cl", cl_ref, 0.02, 2.0), ("cm", cm_ref, 0.02, 2.0), ("ch", ch_ref, 0.05, 3.0)):
        y = first_harmonic(h["t"], h[name], omega)
        assert abs(y) == pytest.approx(abs(ref), rel=amp), name
        assert abs(math.degrees(np.angle(y / ref))) < phase, name


@pytest.mark.parametrize("k", [0.1, 0.5, 1.0])
def test_linear_model_flap_against_theodorsen(k):
    # The linear model's Wagner/Duhamel march of Theodorsen's flap terms against their
    # frequency response with C(k) (NACA Report 496; Wagner's function is C(k)'s indicial
    # counterpart, Garrick, NACA Report 629): within 1 % and 1 degree.
    hinge, A = 0.7, 2.0
    omega = 2 * U * k / C
    sc = flap_scenario(hinge, {"law": "sine", "amplitude": A, "reduced_frequency": k},
                       chords=max(5 * math.pi / k, 80.0), model="linear")
    h = simulate(sc).history
    refs = flap.theodorsen_flap_loads(k, hinge, -1j * math.radians(A))
    for name, ref in zip(("cl", "cm", "ch"), refs):
        y = first_harmonic(h["t"], h[name], omega)
        assert abs(y) == pytest.approx(abs(ref), rel=0.01), name
        assert abs(math.degrees(np.angle(y / ref))) < 1.0, name


# ---------------------------------------------------------------- conservation, two load routes

def flap_ramp_run(wake="free"):
    return simulate(flap_scenario(0.7, {"law": "ramp", "from": 0.0, "to": 8.0, "start": 0.01,
                                        "duration": 0.02, "smoothing": 0.004},
                                  elements=40, wake=wake, chords=12, pitch=3.0))


def test_kelvin_holds_while_the_flap_moves():
    # Kelvin's theorem (bound plus shed circulation constant; any text on ideal flow,
    # e.g. Katz & Plotkin 2001, sec. 13.1), through the flap's motion
    h = flap_ramp_run().history
    total = h["gamma_bound_m2_s"] + h["gamma_wake_m2_s"]
    assert np.ptp(total) < 1e-12 * max(1.0, np.abs(h["gamma_bound_m2_s"]).max())


def test_pressure_and_impulse_loads_agree_with_a_moving_flap():
    # The two load routes (Katz & Plotkin 2001 eqs. 13.37-13.40; Wu 1981) on a free wake,
    # within 1 % of the peak lift, the flap moving at a finite rate
    h = flap_ramp_run().history
    peak = np.abs(h["cl"]).max()
    assert np.abs(h["cl"] - h["cl_impulse"]).max() < 0.01 * peak
