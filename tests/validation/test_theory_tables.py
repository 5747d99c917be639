"""Validation of unsteady.theory against published tables and classical approximations."""

import numpy as np
import pytest

from unsteady import theory as th

# Theodorsen function C(k) = F + iG as tabulated in T. Theodorsen, NACA Report 496
# (1935) and reprinted in the aeroelasticity handbooks; values from memory,
# four decimals, so checked to 1e-3.
THEODORSEN_TABLE = [
    # k, F, G
    (0.05, 0.9090, -0.1305),
    (0.10, 0.8319, -0.1723),
    (0.20, 0.7276, -0.1886),
    (0.30, 0.6650, -0.1793),
    (0.40, 0.6250, -0.1650),
    (0.50, 0.5979, -0.1507),
    (1.00, 0.5394, -0.1003),
    (2.00, 0.5129, -0.0577),
    (10.0, 0.5006, -0.0124),
]


@pytest.mark.parametrize("k, F, G", THEODORSEN_TABLE)
def test_theodorsen_table(k, F, G):
    # Theodorsen NACA Rep. 496 table (from memory)
    C = th.theodorsen(k)
    assert C.real == pytest.approx(F, abs=1e-3)
    assert C.imag == pytest.approx(G, abs=1e-3)


def test_minimum_of_G_near_k_02():
    # Theodorsen NACA Rep. 496 (from memory): G is most negative, about -0.189, near k = 0.2
    k = np.linspace(0.05, 1.0, 2000)
    G = th.theodorsen(k).imag
    assert k[G.argmin()] == pytest.approx(0.2, abs=0.03)
    assert G.min() == pytest.approx(-0.189, abs=2e-3)


def test_wagner_garrick_rational_approximation():
    # I. E. Garrick, NACA Rep. 629 (from memory): phi(s) ~ (s + 2) / (s + 4), within about 2 %
    s = np.linspace(0.0, 100.0, 2001)
    approx = (s + 2.0) / (s + 4.0)
    assert np.max(np.abs(approx - th.wagner(s))) < 0.025
    # it is exact at s = 0 (phi = 1/2) and very close near s = 1
    assert th.wagner(1.0) == pytest.approx(3.0 / 5.0, abs=2e-3)


def test_kuessner_jones_three_exponential_approximation():
    # R. T. Jones' fit of the Kuessner function (coefficients from memory):
    # psi ~ 1 - 0.236 e^{-0.058 s} - 0.513 e^{-0.364 s} - 0.171 e^{-2.42 s};
    # it does not start from 0 (psi(0) = 0.08) but is within about 0.015 for s >= 1
    s = np.linspace(1.0, 100.0, 1981)
    approx = 1 - 0.236 * np.exp(-0.058 * s) - 0.513 * np.exp(-0.364 * s) - 0.171 * np.exp(-2.42 * s)
    assert np.max(np.abs(approx - th.kuessner(s))) < 0.015

