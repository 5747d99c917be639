"""Tests of the standard atmosphere against the U.S. Standard Atmosphere 1976."""

import numpy as np
import pytest

from unsteady.inputs import atmosphere as atm

# U.S. Standard Atmosphere 1976 table, geometric altitude (values from memory):
# altitude m: (temperature K, pressure Pa, density kg/m^3)
TABLE_1976 = {
    0.0: (288.150, 101325.0, 1.2250),
    1000.0: (281.651, 89876.0, 1.1117),
    5000.0: (255.676, 54048.0, 0.73643),
    11000.0: (216.774, 22700.0, 0.36480),
    20000.0: (216.650, 5529.3, 0.088910),
}


@pytest.mark.parametrize("z", sorted(TABLE_1976))
def test_density_matches_1976_table(z):
    # U.S. Standard Atmosphere 1976 table (from memory), within 0.1 %
    assert atm.density(z) == pytest.approx(TABLE_1976[z][2], rel=1e-3)


@pytest.mark.parametrize("z", sorted(TABLE_1976))
def test_temperature_and_pressure_match_1976_table(z):
    # U.S. Standard Atmosphere 1976 table (from memory)
    T, P, _ = TABLE_1976[z]
    assert atm.temperature(z) == pytest.approx(T, abs=2e-3)
    assert atm.pressure(z) == pytest.approx(P, rel=1e-4)


def test_sea_level_values_exact():
    # U.S. Standard Atmosphere 1976 defining sea-level values
    assert atm.temperature(0.0) == 288.15
    assert atm.pressure(0.0) == 101325.0
    # rho_0 = P_0 M_0 / (R* T_0) = 1.2250 kg/m^3 (1976 standard)
    assert atm.density(0.0) == pytest.approx(1.2250, abs=5e-5)
    # a_0 = 340.294 m/s (1976 standard, from memory)
    assert atm.speed_of_sound(0.0) == pytest.approx(340.294, abs=1e-3)


def test_troposphere_density_power_law():
    # U.S. Standard Atmosphere 1976, troposphere: rho = 1.225 (T/288.15)^4.2559 in the troposphere
    z = np.linspace(-500.0, 11000.0, 23)
    T = atm.temperature(z)
    assert np.allclose(atm.density(z), 1.225 * (T / 288.15) ** 4.2559, rtol=2e-5)


def test_continuity_at_tropopause():
    # 1976 standard: T and P continuous at H = 11 km geopotential
    Z11 = atm.r_0 * 11000.0 / (atm.r_0 - 11000.0)  # geometric altitude of H = 11 km
    assert atm.geopotential_altitude(Z11) == pytest.approx(11000.0, abs=1e-9)
    lo, hi = Z11 - 1e-6, Z11 + 1e-6
    for f in (atm.temperature, atm.pressure, atm.density, atm.speed_of_sound):
        assert f(lo) == pytest.approx(f(hi), rel=1e-9)
    assert atm.temperature(Z11) == pytest.approx(216.65, abs=1e-9)
    # tropopause pressure 22632 Pa (1976 standard, from memory)
    assert atm.pressure(Z11) == pytest.approx(22632.06, abs=0.05)


def test_stratosphere_isothermal_and_decreasing():
    # 1976 standard: isothermal 216.65 K from 11 to 20 km geopotential
    z = np.linspace(11100.0, 20000.0, 50)
    assert np.allclose(atm.temperature(z), 216.65)
    assert np.all(np.diff(atm.pressure(z)) < 0)
    assert np.all(np.diff(atm.density(z)) < 0)


def test_vectorised_shape_and_scalar_type():
    # common practice: arrays in, arrays of the same shape out; scalars give float
    z = np.array([[0.0, 1000.0], [5000.0, 15000.0]])
    assert atm.density(z).shape == (2, 2)
    assert isinstance(atm.density(100.0), float)
    assert atm.density(z)[0, 1] == atm.density(1000.0)


def test_geopotential_conversion():
    # 1976 standard: H = r0 Z / (r0 + Z), r0 = 6356766 m; H(11 km geometric) = 10981 m
    assert atm.geopotential_altitude(11000.0) == pytest.approx(10981.0, abs=1.0)


@pytest.mark.parametrize("bad", [-501.0, 20000.5, 1e6, [0.0, 25000.0]])
def test_out_of_range_raises_with_range_in_message(bad):
    # common practice: refuse altitudes outside the modelled layers, say what is allowed
    with pytest.raises(ValueError, match=r"-500 m to 20000 m"):
        atm.density(bad)


@pytest.mark.parametrize("bad", [float("nan"), float("inf"), [0.0, float("nan")]])
def test_non_finite_raises(bad):
    # common practice
    with pytest.raises(ValueError, match="finite"):
        atm.temperature(bad)


def test_range_constant_endpoints_accepted():
    lo, hi = atm.ALTITUDE_RANGE
    assert (lo, hi) == (-500.0, 20000.0)
    assert atm.density(lo) > atm.density(0.0) > atm.density(hi) > 0
