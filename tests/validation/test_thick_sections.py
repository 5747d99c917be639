"""Thick sections on surface panels (unsteady.vortex.panels) against exact and published results.

Sources: the Joukowski and Karman-Trefftz conformal maps (exact surface speed and lift;
L. M. Milne-Thomson, Theoretical Aerodynamics, 4th ed., 1958; J. Katz & A. Plotkin,
Low-Speed Aerodynamics, 2nd ed., 2001, ch. 6); I. H. Abbott & A. E. von Doenhoff,
Theory of Wing Sections (1959), Appendix I (NACA 0012 surface speeds, values written
down from memory, see below); Wagner (1925) with the exact values of
unsteady.theory.wagner (Garrick's Fourier integral, NACA Rep. 629); Theodorsen,
NACA Rep. 496 (unsteady.theory.theodorsen_loads).
"""

import math

import numpy as np
import pytest

from unsteady import load_scenario, simulate, theory
from unsteady.inputs.sections import section_from_shape
from unsteady.vortex.panels import SurfaceGeometry, SurfacePanels
from unsteady.vortex.solver import VortexSolver


class Fixed:
    def __init__(self, alpha):
        self.s = (alpha, 0.0, 0.0, 0.0)

    def state(self, t):
        return self.s

    def after_step(self, t, dt, loads):
        pass


class Rows:
    def __init__(self, model=None):
        self.rows, self.model, self.cp = [], model, []

    def on_step(self, s):
        self.rows.append(dict(s.loads, t=s.t))
        if self.model is not None:
            self.cp.append(self.model.loads.cp_last.copy())


def steady(model, alpha_deg):
    """Steady start at alpha: (loads, Cp at the mid-points)."""
    obs = Rows(model)
    VortexSolver(model, Fixed(math.radians(alpha_deg)), speed=1.0, density=1.0, dt=0.01, steps=0).run([obs])
    return obs.rows[0], obs.cp[0]


# ------------------------------------------------------------- conformal maps

def conformal_section(x0, y0, n_panels, trailing_angle_deg=0.0, lam=1.0):
    """Outline nodes and exact flow of the circle |zeta - zeta0| = R through zeta = lam, mapped by
    Joukowski (z = zeta + lam^2 / zeta) or, with a trailing-edge angle tau, Karman-Trefftz
    ((z - n lam)/(z + n lam) = ((zeta - lam)/(zeta + lam))^n, n = 2 - tau/pi); Milne-Thomson (1958).

    Returns the nodes in chord fractions (clockwise from the trailing edge), and a function
    (alpha_deg, theta) -> Cp at circle angles theta, and the exact cl(alpha_deg).
    """
    zeta0 = complex(x0, y0)
    R = abs(lam - zeta0)
    beta = math.atan2(y0, lam - x0)
    n = 2.0 - math.radians(trailing_angle_deg) / math.pi

    def to_z(zeta):
        q = ((zeta - lam) / (zeta + lam)) ** n
        return n * lam * (1 + q) / (1 - q)

    def dz_dzeta(zeta):
        q = ((zeta - lam) / (zeta + lam)) ** n
        dq = q * n * (1 / (zeta - lam) - 1 / (zeta + lam))
        return 2 * n * lam * dq / (1 - q) ** 2

    fine = np.linspace(0, 2 * math.pi, 20001)
    zf = to_z(zeta0 + R * np.exp(1j * (-beta - fine[1:-1])))
    z_te = complex(n * lam, 0.0)
    z_le = zf[np.argmax(np.abs(zf - z_te))]
    chord = abs(z_te - z_le)
    phi_c = np.angle(z_te - z_le)
    rot = np.exp(-1j * phi_c)

    theta = -beta - 2 * math.pi * np.arange(n_panels + 1) / n_panels
    zn = to_z(zeta0 + R * np.exp(1j * theta))
    zn[0] = zn[-1] = z_te
    local = (zn - z_le) * rot / chord

    def cp(alpha_deg, th):
        a = math.radians(alpha_deg) + phi_c        # the stream's angle in the map's frame
        zeta = zeta0 + R * np.exp(1j * th)
        gamma_cw = 4 * math.pi * R * math.sin(a + beta)
        w = np.exp(-1j * a) - R ** 2 * np.exp(1j * a) / (zeta - zeta0) ** 2 + 1j * gamma_cw / (2 * math.pi * (zeta - zeta0))
        return 1 - np.abs(w / dz_dzeta(zeta)) ** 2, (to_z(zeta) - z_le) * rot / chord

    def cl(alpha_deg):
        return 8 * math.pi * R * math.sin(math.radians(alpha_deg) + phi_c + beta) / chord

    return local.real, local.imag, theta, cp, cl


# A cusped trailing edge with camber (a cambered Joukowski section) converges slowly on
# straight panels: the two surfaces meet tangentially, so the collocation points of one come
# within a small fraction of a panel of the other (measured, x0 = -0.1, y0 = 0.05: cl 1.2-1.8 %
# low at 160 and at 320 panels, by pressure and by impulse alike).  Real sections have a finite trailing-edge angle; the cambered
# cases are Karman-Trefftz sections.
CASES = [("joukowski 12 % symmetric", -0.1, 0.0, 0.0),
         ("karman-trefftz cambered 10 deg", -0.08, 0.08, 10.0),
         ("karman-trefftz 5 deg", -0.1, 0.05, 5.0)]


@pytest.mark.parametrize("name,x0,y0,tau", CASES)
@pytest.mark.parametrize("alpha_deg", [4.0, 8.0])
def test_conformal_sections_lift_and_pressure(name, x0, y0, tau, alpha_deg):
    # exact conformal-map flow (Milne-Thomson 1958; Katz & Plotkin 2001 ch. 6):
    # lift within 1 % and surface Cp within 2 % rms of its peak (5 % to 90 % chord), 160 panels
    x, z, theta, cp_exact, cl_exact = conformal_section(x0, y0, 160, tau)
    model = SurfacePanels(SurfaceGeometry.from_nodes(x, z, 1.0, 0.25))
    loads, cp = steady(model, alpha_deg)
    assert loads["cl"] == pytest.approx(cl_exact(alpha_deg), rel=0.01)
    assert loads["cl_impulse"] == pytest.approx(cl_exact(alpha_deg), rel=0.01)
    ref, zs = cp_exact(alpha_deg, 0.5 * (theta[:-1] + theta[1:]))
    keep = (zs.real > 0.05) & (zs.real < 0.9)
    rms = np.sqrt(np.mean((cp[keep] - ref[keep]) ** 2))
    assert rms < 0.02 * np.max(np.abs(ref[keep]))


def test_conformal_lift_converges_with_panels():
    # the lift error shrinks as the panels are refined (cambered Karman-Trefftz, 8 degrees;
    # measured: 0.09 % low at 160 panels, 0.02 % at 320)
    errors = []
    for n in (40, 80, 160, 320):
        x, z, theta, cp_exact, cl_exact = conformal_section(-0.08, 0.08, n, 10.0)
        loads, _ = steady(SurfacePanels(SurfaceGeometry.from_nodes(x, z, 1.0, 0.25)), 8.0)
        errors.append(abs(loads["cl"] / cl_exact(8.0) - 1))
    assert errors[0] > errors[1] > errors[2] > errors[3]
    assert errors[2] < 0.01


# ------------------------------------------------------------- NACA sections

# NACA 0012 at zero angle, v/V on the surface (Abbott & von Doenhoff 1959, Appendix I).
# Written down from memory of the table, not copied from a document at hand.
NACA0012_SPEED = {0.05: 1.174, 0.10: 1.188, 0.20: 1.183, 0.30: 1.162, 0.40: 1.135, 0.50: 1.108,
                  0.60: 1.080, 0.70: 1.053, 0.80: 1.022, 0.90: 0.978}


def test_naca0012_surface_speed():
    # within 1.5 % of the tabulated speeds (the table is for the published, slightly open
    # trailing edge; the panels close it, which matters only near the trailing edge)
    model = SurfacePanels(SurfaceGeometry.from_section(section_from_shape("naca0012"), 200, 1.0, 0.25))
    loads, cp = steady(model, 0.0)
    g = model.geometry
    upper = slice(g.n // 2, g.n)
    v = np.sqrt(1 - cp[upper])
    for x, ref in NACA0012_SPEED.items():
        assert np.interp(x, g.x_surface[upper], v) == pytest.approx(ref, rel=0.015), x
    assert abs(loads["cl"]) < 1e-9


def test_naca2412_lift_at_ten_degrees():
    # inviscid cl near 1.456 at 10 degrees (a figure commonly quoted in the trade; the
    # project's seed document states it), within 2 %, with several hundred panels
    model = SurfacePanels(SurfaceGeometry.from_section(section_from_shape("naca2412"), 300, 1.0, 0.25))
    loads, _ = steady(model, 10.0)
    assert loads["cl"] == pytest.approx(1.456, rel=0.02)
    assert loads["cl_impulse"] == pytest.approx(1.456, rel=0.02)


# ------------------------------------------------------------- unsteady

def thick_scenario(**over):
    base = {"flow": {"speed": 10.0, "density": 1.2},
            "airfoil": {"shape": "naca0012", "chord": 0.2, "thick": True},
            "motion": {"pivot": 0.25},
            "run": {"chords": 15.0, "wake": "free", "start": "impulsive"},
            "output": {"plots": False}}
    for k, v in over.items():
        sec, key = k.split("__")
        base.setdefault(sec, {})[key] = v
    return load_scenario(base)


def test_impulsive_start_follows_wagner():
    # a 1 % thick symmetric section started impulsively at 2 degrees: cl / cl_steady follows
    # Wagner's function (exact values, Garrick NACA Rep. 629) within 1 % for s = 1 to 30
    sc = thick_scenario(airfoil__shape="naca0001", motion__pitch={"law": "constant", "value": 2.0},
                        run__chords=15.0)
    res = simulate(sc)
    h = res.history
    steady_sc = thick_scenario(airfoil__shape="naca0001", motion__pitch={"law": "constant", "value": 2.0},
                               run__chords=0.05, run__start="steady")
    cl_ss = simulate(steady_sc).history["cl"][0]
    s = 2.0 * h["chords"]
    for sv in (1.0, 2.0, 5.0, 10.0, 20.0, 29.9):
        i = int(np.argmin(np.abs(s - sv)))
        assert h["cl"][i] / cl_ss == pytest.approx(theory.wagner(np.array([s[i]]))[0], rel=0.01), sv
    # Kelvin's theorem: the bound and shed circulation add up to zero
    total = h["gamma_bound_m2_s"] + h["gamma_wake_m2_s"]
    assert np.max(np.abs(total)) < 1e-9 * np.max(np.abs(h["gamma_bound_m2_s"]))


def test_harmonic_pitch_against_theodorsen_and_impulse():
    # 12 % section pitching 2 degrees about the quarter chord at k = 0.2, free wake.
    # Theodorsen (NACA Rep. 496) is the thin-plate limit: the thick section's lift amplitude
    # lies above it by the thickness's lift-slope gain, about 0.8 t ~ 10 % (common practice),
    # within 4 to 15 %; the phase within 3 degrees.  Pressure and impulse lift agree within
    # 1 % of the peak.
    k = 0.2
    sc = thick_scenario(motion__pitch={"law": "sine", "amplitude": 2.0, "reduced_frequency": k},
                        run__chords=12.0, run__start="steady")
    res = simulate(sc)
    h = res.history
    t = h["t"]
    omega = 2 * sc.speed * k / sc.chord
    last = t >= t[-1] - 2 * (2 * math.pi / omega)
    basis = np.column_stack([np.cos(omega * t[last]), np.sin(omega * t[last]), np.ones(last.sum())])
    (a, b, _), *_ = np.linalg.lstsq(basis, h["cl"][last], rcond=None)
    cl_hat = complex(a, -b)
    ref, _ = theory.theodorsen_loads(k, alpha_amp=math.radians(2.0), pivot=0.25)
    ref = ref * -1j                            # the sine law: alpha = A sin(omega t) = Re[-i A e^(i omega t)]
    ratio = abs(cl_hat) / abs(ref)
    assert 1.04 < ratio < 1.15
    assert abs(math.degrees(np.angle(cl_hat / ref))) < 3.0
    peak = np.max(np.abs(h["cl"][last]))
    assert np.max(np.abs(h["cl"][last] - h["cl_impulse"][last])) < 0.01 * peak
