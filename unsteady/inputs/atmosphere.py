"""Standard atmosphere (U.S. Standard Atmosphere 1976) from -500 m to 20 km."""

import numpy as np

__all__ = [
    "ALTITUDE_RANGE",
    "density",
    "temperature",
    "pressure",
    "speed_of_sound",
    "geopotential_altitude",
]

# Constants of the U.S. Standard Atmosphere 1976 (NOAA/NASA/USAF, 1976),
# section 1.2 (identical in ICAO Doc 7488 below 20 km).
g_0 = 9.80665  # m/s^2, standard acceleration of gravity
R_star = 8.31432  # J/(mol K), universal gas constant as adopted by the 1976 standard
M_0 = 28.9644e-3  # kg/mol, mean molar mass of sea-level air
R = R_star / M_0  # J/(kg K), specific gas constant of air (= 287.053)
gamma = 1.4  # ratio of specific heats of air
r_0 = 6356766.0  # m, effective Earth radius for the geopotential conversion
T_0 = 288.15  # K, sea-level temperature
P_0 = 101325.0  # Pa, sea-level pressure
L_M0 = -0.0065  # K/m, troposphere lapse rate (dT/dH, 0 to 11 km geopotential)
H_1 = 11000.0  # m, geopotential altitude of the tropopause
T_1 = T_0 + L_M0 * H_1  # K, = 216.65, isothermal layer 11 to 20 km geopotential
P_1 = P_0 * (T_1 / T_0) ** (-g_0 * M_0 / (R_star * L_M0))  # Pa, ~22632.06

#: Geometric altitudes (m) accepted by this module, lowest and highest.
ALTITUDE_RANGE = (-500.0, 20000.0)


def geopotential_altitude(altitude_m):
    """Geopotential altitude of a geometric altitude.

    H = r_0 Z / (r_0 + Z) (U.S. Standard Atmosphere 1976, eq. 18).

    Parameters
    ----------
    altitude_m : float or array_like
        Geometric altitude Z above mean sea level, m, within `ALTITUDE_RANGE`.

    Returns
    -------
    numpy.ndarray or float
        Geopotential altitude H, m'.

    Raises
    ------
    ValueError
        If any altitude is not finite or lies outside `ALTITUDE_RANGE`.
    """
    return _out(_geopotential(_checked(altitude_m)))


def temperature(altitude_m):
    """Air temperature of the standard atmosphere.

    T = T_0 + L_M0 H below H = 11 km, T = 216.65 K from 11 to 20 km
    geopotential (U.S. Standard Atmosphere 1976, eq. 23 and table 4).

    Parameters
    ----------
    altitude_m : float or array_like
        Geometric altitude above mean sea level, m, within `ALTITUDE_RANGE`.

    Returns
    -------
    numpy.ndarray or float
        Temperature, K.

    Raises
    ------
    ValueError
        If any altitude is not finite or lies outside `ALTITUDE_RANGE`.
    """
    H = _geopotential(_checked(altitude_m))
    return _out(_temperature_H(H))


def pressure(altitude_m):
    """Static pressure of the standard atmosphere.

    Troposphere: P = P_0 (T/T_0)^(-g_0 M_0 / (R* L_M0)); isothermal layer:
    P = P_1 exp(-g_0 M_0 (H - H_1) / (R* T_1))
    (U.S. Standard Atmosphere 1976, eqs. 33a and 33b).

    Parameters
    ----------
    altitude_m : float or array_like
        Geometric altitude above mean sea level, m, within `ALTITUDE_RANGE`.

    Returns
    -------
    numpy.ndarray or float
        Pressure, Pa.

    Raises
    ------
    ValueError
        If any altitude is not finite or lies outside `ALTITUDE_RANGE`.
    """
    H = _geopotential(_checked(altitude_m))
    return _out(_pressure_H(H))


def density(altitude_m):
    """Air density of the standard atmosphere.

    rho = P M_0 / (R* T) (U.S. Standard Atmosphere 1976, eq. 42), with the
    temperature and pressure of `temperature` and `pressure`.

    Parameters
    ----------
    altitude_m : float or array_like
        Geometric altitude above mean sea level, m, within `ALTITUDE_RANGE`.

    Returns
    -------
    numpy.ndarray or float
        Density, kg/m^3 (1.225 at sea level).

    Raises
    ------
    ValueError
        If any altitude is not finite or lies outside `ALTITUDE_RANGE`.
    """
    H = _geopotential(_checked(altitude_m))
    return _out(_pressure_H(H) / (R * _temperature_H(H)))


def speed_of_sound(altitude_m):
    """Speed of sound of the standard atmosphere.

    a = sqrt(gamma R* T / M_0) (U.S. Standard Atmosphere 1976, eq. 50).

    Parameters
    ----------
    altitude_m : float or array_like
        Geometric altitude above mean sea level, m, within `ALTITUDE_RANGE`.

    Returns
    -------
    numpy.ndarray or float
        Speed of sound, m/s (340.29 at sea level).

    Raises
    ------
    ValueError
        If any altitude is not finite or lies outside `ALTITUDE_RANGE`.
    """
    H = _geopotential(_checked(altitude_m))
    return _out(np.sqrt(gamma * R * _temperature_H(H)))


def _geopotential(Z):
    return r_0 * Z / (r_0 + Z)


def _temperature_H(H):
    return np.where(H <= H_1, T_0 + L_M0 * H, T_1)


def _pressure_H(H):
    H_trop = np.minimum(H, H_1)
    P_trop = P_0 * ((T_0 + L_M0 * H_trop) / T_0) ** (-g_0 * M_0 / (R_star * L_M0))
    H_strat = np.maximum(H, H_1)
    P_strat = P_1 * np.exp(-g_0 * M_0 * (H_strat - H_1) / (R_star * T_1))
    return np.where(H <= H_1, P_trop, P_strat)


def _checked(altitude_m):
    try:
        Z = np.asarray(altitude_m, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(
            f"altitude must be a number in metres, got {altitude_m!r}"
        ) from None
    if not np.all(np.isfinite(Z)):
        raise ValueError("altitude must be finite (a number of metres)")
    lo, hi = ALTITUDE_RANGE
    if np.any(Z < lo) or np.any(Z > hi):
        bad = Z[(Z < lo) | (Z > hi)].ravel()[0]
        raise ValueError(
            f"altitude {bad:g} m is outside the standard atmosphere range "
            f"of this program: {lo:g} m to {hi:g} m (geometric)"
        )
    return Z


def _out(x):
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x
