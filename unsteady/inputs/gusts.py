"""Gust fields: frozen patterns of air velocity carried past the airfoil, registered by profile name.

A gust is a pattern of air velocity frozen in the air, which moves past the
airfoil at the flight speed U.  With xi the distance into the gust, measured
from its front along the flight path::

    xi(x, t) = U (t - arrival) - (x - x_LE)

where x_LE = -pivot c is the leading edge's path in the computation frame
(pitch axis at x = 0, air streaming towards +x).  The front reaches the
leading edge at t = arrival, and every other point (collocation points
further aft, wake vortices downstream) meets it later, at its own time: the
penetration effect of the classical sharp-edged-gust problem (H. G. Kuessner,
Luftfahrtforschung 13, 1936).  The pattern depends on xi only (it is the same
at every height).

Each gust in ``[gust]`` / ``[[gust]]`` is one :class:`GustProfile`; several
are summed.  ``direction = "vertical"`` (default) gives the vertical velocity
w (positive up); ``"streamwise"`` gives u along +x, so u > 0 adds to the
speed of the air past the airfoil (a head gust).  A streamwise gust changes the local airspeed seen by the airfoil:
the solver adds it to the velocities of the no-penetration condition, of the
Kutta-Joukowski loads and of the free wake, while ``cl``, ``cd`` and ``cm``
stay normalised by the MEAN flight speed U (q = rho U^2 / 2), so a uniform
streamwise gust du on a steady airfoil raises the settled cl by
(1 + du/U)^2.

Adding a profile: see :class:`GustProfile`.  Adding a turbulence spectrum:
see :class:`Spectrum`.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from .. import theory
from ..core.errors import InputError
from ..core.registry import registrar
from .checks import choice, integer, number, register_section, unknown_keys
from .tables import read_table, table_path

__all__ = [
    "PROFILES",
    "SPECTRA",
    "register_profile",
    "register_spectrum",
    "GustProfile",
    "SharpEdged",
    "OneMinusCosine",
    "SineGust",
    "Turbulence",
    "TableGust",
    "Spectrum",
    "Dryden",
    "VonKarman",
    "turbulence_samples",
    "GustField",
    "build_gust_field",
    "check_gust_section",
    "effective_angle_history",
    "EFFECTIVE_ANGLE_LIMIT_DEG",
]

#: Above this effective angle of attack (degrees) the attached-flow model is
#: far outside its range (thin sections stall near 10-15 degrees at drone
#: Reynolds numbers: common practice); the check warns.
EFFECTIVE_ANGLE_LIMIT_DEG = 30.0

#: The profile registry: the ``profile`` value of a scenario -> class.
PROFILES: dict = {}
#: The turbulence spectrum registry: the ``spectrum`` value -> class.
SPECTRA: dict = {}

DIRECTIONS = ("vertical", "streamwise")

#: Physically meaningful ranges of the gust numbers (key -> (low, high, unit)), checked for
#: every profile that has the key: gust velocities up to 100 m/s (the strongest design gusts
#: of the airworthiness rules are about 20 m/s true airspeed; common practice), gust lengths
#: and wavelengths from a millimetre to 100 km, turbulence scale lengths from a centimetre
#: (grid turbulence of a tunnel) to 100 km (the atmosphere's are metres to a few hundred
#: metres, MIL-F-8785C), reduced frequencies up to 50, arrivals within a million seconds.
RANGES = {
    "amplitude": (0.0, 100.0, "m/s"),
    "intensity": (0.0, 50.0, "m/s"),
    "length": (1e-3, 1e5, "m"),
    "wavelength": (1e-3, 1e5, "m"),
    "scale_length": (0.01, 1e5, "m"),
    "reduced_frequency": (0.0, 50.0, ""),
    "arrival": (-1e6, 1e6, "s"),
}

#: At most this many realisations of a turbulence gust (``realisations``) in one run.
MAX_REALISATIONS = 64


#: Class decorators: add a :class:`GustProfile` / :class:`Spectrum` subclass by name.
register_profile = registrar(PROFILES, "gust profile")
register_spectrum = registrar(SPECTRA, "turbulence spectrum")


# ---------------------------------------------------------------------------
# profiles
# ---------------------------------------------------------------------------

class GustProfile:
    """A gust pattern: air velocity as a function of the distance xi into the gust.

    What a new profile implements (the public :meth:`__call__`, the common
    keys ``direction`` and ``arrival`` and the scenario check are the
    base's):

    1. Subclass ``GustProfile`` and decorate it with
       ``@register_profile("name")``; the name is what a scenario writes as
       ``profile = "name"``.  Cite the source of the shape in the docstring.
    2. ``KEYS``: dict of the required keys -> a short text of what is allowed
       (used in error messages).  ``OPTIONAL``: dict of optional keys -> their
       defaults (``None``: absent unless given).  Numbers are checked to be
       finite by the base; a key listed in ``POSITIVE`` must also be > 0.
    3. ``check(spec, ctx)`` (classmethod, optional): rules between the
       values; raise ``InputError(key, message)`` with the key relative to
       the gust table.  ``ctx`` is the resolved core scenario (``flow.speed``
       may be missing).
    4. ``__init__(self, spec, ctx)``: call ``super().__init__(spec, ctx)`` and
       prepare (read a file, draw a realisation); ``self.span`` is the range
       of xi (m) the run will ask for.
    5. ``shape(xi)``: the velocity (m/s) for a float ndarray of xi >= 0.  The
       base returns 0 ahead of the front (xi < 0), unless the class sets
       ``FILLS_SPACE = True`` (a pattern with no front, such as turbulence,
       that the aircraft is already flying in at t = 0): then ``shape`` is
       asked for every xi the run reaches, ahead of the front too.
    6. ``peak_of(spec, ctx)`` (classmethod): the largest |velocity| the
       pattern reaches (m/s), for the effective-angle warning (a likely peak
       for a random pattern); it must not need the whole realisation.
    """

    name = ""
    KEYS: dict = {}
    OPTIONAL: dict = {}
    POSITIVE: tuple = ()
    TEXT: tuple = ()
    COMMON = {"direction": "vertical", "arrival": 0.0}
    FILLS_SPACE = False

    def __init__(self, spec, ctx):
        self.spec = dict(spec)
        self.direction = spec.get("direction", "vertical")
        self.arrival = float(spec.get("arrival", 0.0))
        self.span = _xi_span(ctx, self.arrival)

    @classmethod
    def check(cls, spec, ctx):
        """Rules between values (rule 3); none by default."""

    def shape(self, xi):
        raise NotImplementedError

    @classmethod
    def peak_of(cls, spec, ctx):
        return float(spec["amplitude"])

    def __call__(self, xi):
        """Velocity (m/s) at distances ``xi`` (m) into the gust; 0 ahead of the front."""
        xi = np.asarray(xi, dtype=float)
        if self.FILLS_SPACE:
            return self.shape(xi)
        inside = xi >= 0.0
        out = np.zeros_like(xi)
        if inside.any():
            out[inside] = self.shape(xi[inside])
        return out


def _xi_span(ctx, arrival):
    """(0, xi_max): distances into the gust a run reaches, with a margin of 2 chords."""
    flow, run, af = ctx.get("flow", {}), ctx.get("run", {}), ctx.get("airfoil", {})
    U, T, c = flow.get("speed"), run.get("duration"), af.get("chord")
    if not (U and T and c):
        return 0.0, 0.0
    return 0.0, max(U * (T - arrival), 0.0) + 2.0 * c


@register_profile("sharp-edged")
class SharpEdged(GustProfile):
    """Sharp-edged gust: w = amplitude behind the front (H. G. Kuessner, Luftfahrtforschung 13, 1936).

    The time march samples the gust once per step at discrete collocation
    points, so an exactly sharp front switches each point on at one step and
    kicks the lift (the bound circulation jumps, and the pressure and impulse
    routes both see its rate).  The front is therefore spread over six
    steps' travel d = 6 U dt, centred on it, with a half-cosine rise
    w = (A/2) (1 - cos(pi u)), u = min(1, max(0, xi/d + 1/2)), whose slope is
    continuous (a linear ramp's kinks each kick the apparent-mass lift as a
    point enters or leaves it).  At the default step (U dt = c/N) d is 6 c/N,
    about four of the widest cosine-spaced elements (1.57 c/N).  Measured
    (NACA 2412 drone section, free heave, 40 and 80 elements): with a linear
    ramp over 2 U dt the load factor oscillated with a three-step period
    while the front crossed the chord, 0.59 per step at both; with this front
    the largest step change is 0.11 and 0.08, within 10 % of the linear
    model's Kuessner response sampled at the same step (0.10, 0.07), and it
    shrinks with dt.  The front's mean position is unchanged and d -> 0 as
    dt -> 0; the lift after the crossing is not affected (tests/validation:
    the Kuessner function within 3 % from s = 2 on with 20 elements).
    """

    KEYS = {"amplitude": "gust velocity, m/s, > 0"}
    POSITIVE = ("amplitude",)

    def __init__(self, spec, ctx):
        super().__init__(spec, ctx)
        run, flow = ctx.get("run", {}), ctx.get("flow", {})
        self.d = 6.0 * float(flow.get("speed") or 0.0) * float(run.get("dt") or 0.0)

    def __call__(self, xi):
        xi = np.asarray(xi, dtype=float)
        A = float(self.spec["amplitude"])
        if self.d <= 0.0:
            return np.where(xi >= 0.0, A, 0.0)
        u = np.clip(xi / self.d + 0.5, 0.0, 1.0)
        return 0.5 * A * (1.0 - np.cos(np.pi * u))


@register_profile("one-minus-cosine")
class OneMinusCosine(GustProfile):
    """1-cosine gust: w = (A/2) (1 - cos(2 pi xi / H)) for 0 <= xi <= H, else 0.

    A is the peak velocity and H the whole gust length (K. G. Pratt &
    W. G. Walker, NACA Report 1206, 1954, who take H = 25 chords; the same
    shape stood in 14 CFR 23.341).
    """

    KEYS = {"amplitude": "peak gust velocity, m/s, > 0", "length": "whole gust length H, m, > 0"}
    POSITIVE = ("amplitude", "length")

    def shape(self, xi):
        A, H = float(self.spec["amplitude"]), float(self.spec["length"])
        return np.where(xi <= H, 0.5 * A * (1.0 - np.cos(2.0 * np.pi * xi / H)), 0.0)


@register_profile("sine")
class SineGust(GustProfile):
    """Sinusoidal gust from its front on: w = A sin(2 pi xi / lambda) for xi >= 0.

    Once the starting transient has passed, the lift follows Sears' function
    (W. R. Sears, J. Aeronaut. Sci. 8, 1941) at the reduced frequency
    k = omega c / (2U) = pi c / lambda; ``reduced_frequency`` gives lambda
    = pi c / k.
    """

    KEYS = {"amplitude": "gust velocity amplitude, m/s, > 0"}
    OPTIONAL = {"wavelength": None, "reduced_frequency": None}
    POSITIVE = ("amplitude", "wavelength", "reduced_frequency")

    @classmethod
    def check(cls, spec, ctx):
        if ("wavelength" in spec) == ("reduced_frequency" in spec):
            raise InputError("wavelength", "give exactly one of wavelength (m, > 0) or "
                                           "reduced_frequency (omega c / 2U, > 0)")

    def __init__(self, spec, ctx):
        super().__init__(spec, ctx)
        if "wavelength" in spec:
            self.wavelength = float(spec["wavelength"])
        else:
            self.wavelength = math.pi * ctx["airfoil"]["chord"] / float(spec["reduced_frequency"])

    def shape(self, xi):
        return float(self.spec["amplitude"]) * np.sin(2.0 * np.pi * xi / self.wavelength)


@register_profile("table")
class TableGust(GustProfile):
    """A gust read from a CSV file with columns x (m, distance into the gust) and w (m/s).

    Linear interpolation between rows; zero ahead of the first row and
    beyond the last.  For a streamwise gust the column ``w`` holds u.
    """

    KEYS = {"file": "CSV file with columns x (m) and w (m/s)"}
    TEXT = ("file",)

    def __init__(self, spec, ctx):
        super().__init__(spec, ctx)
        self.x, self.w = read_gust_table(table_path(spec["file"], ctx.get("_base_dir")))

    @classmethod
    def check(cls, spec, ctx):
        cls(spec, ctx)  # reading the file is the check

    def shape(self, xi):
        return np.interp(xi, self.x, self.w, left=0.0, right=0.0)

    @classmethod
    def peak_of(cls, spec, ctx):
        return float(np.max(np.abs(cls(spec, ctx).w)))


def read_gust_table(path):
    """Columns x and w of a CSV gust table (:func:`unsteady.inputs.tables.read_table`), x from 0 on."""
    x, w = read_table(path, {"x": "m, distance into the gust", "w": "m/s"})
    if x[0] < 0.0:
        raise InputError("file", f"'{Path(path).name}': x starts at {x[0]:g}; distances into the gust are >= 0")
    return x, w


# ---------------------------------------------------------------------------
# turbulence
# ---------------------------------------------------------------------------

class Spectrum:
    """A one-sided spatial power spectral density of turbulence.

    What a new spectrum implements: decorate the subclass with
    ``@register_spectrum("name")`` (the scenario's ``spectrum`` value), cite
    its source, and implement ``psd(Omega, sigma, L, component)`` returning
    Phi (m/s)^2 per rad/m at spatial frequencies Omega (rad/m), one-sided, so
    that its integral over 0..inf is sigma^2.  ``component`` is
    "vertical" or "longitudinal".
    """

    name = ""

    @staticmethod
    def psd(Omega, sigma, L, component):
        raise NotImplementedError


@register_spectrum("dryden")
class Dryden(Spectrum):
    """Dryden spectrum (MIL-F-8785C, 1980; MIL-HDBK-1797), via :func:`unsteady.theory.dryden_spectrum`."""

    @staticmethod
    def psd(Omega, sigma, L, component):
        return theory.dryden_spectrum(Omega, sigma, L, component)


@register_spectrum("von-karman")
class VonKarman(Spectrum):
    """Von Karman spectrum (MIL-F-8785C, 1980; MIL-HDBK-1797), via :func:`unsteady.theory.von_karman_spectrum`."""

    @staticmethod
    def psd(Omega, sigma, L, component):
        return theory.von_karman_spectrum(Omega, sigma, L, component)


def turbulence_samples(spectrum, sigma, L, length, dx, seed, component="vertical"):
    """One realisation of frozen turbulence on a regular grid, by spectral synthesis.

    The pattern is w_j = sum_k sqrt(Phi(Omega_k) dOmega) (a_k cos Omega_k x_j
    + b_k sin Omega_k x_j), x_j = j dx, with a_k, b_k independent standard
    normal numbers and Omega_k = k dOmega, dOmega = 2 pi / P, on a period P
    of at least ``length`` plus 10 scale lengths and at least 64 scale
    lengths (rounded up to a power-of-two number of points), so that no part
    repeats within ``length`` and the variance lost below dOmega is small
    (a Gaussian random process with the given one-sided spectrum: common
    practice of spectral synthesis).  Its expected variance is the integral
    of Phi from dOmega to the grid's Nyquist frequency pi/dx, slightly below
    sigma^2: for the vertical Dryden spectrum the part above pi/dx is about
    3 sigma^2 dx / (pi^2 L).

    Parameters
    ----------
    spectrum : str or Spectrum
        Name in :data:`SPECTRA` or a spectrum class.
    sigma, L : float
        Intensity (rms, m/s) and scale length (m).
    length : float
        Length of the pattern needed, m.
    dx : float
        Grid spacing, m.
    seed : int
        Seed of numpy's default generator (PCG64): the same seed and the same
        grid give the same pattern bit for bit.
    component : {"vertical", "longitudinal"}

    Returns
    -------
    numpy.ndarray
        Velocities at x_j = j dx for j = 0 .. ceil(length / dx).
    """
    from scipy import fft as sp_fft
    spec = SPECTRA[spectrum] if isinstance(spectrum, str) else spectrum
    n_need = int(math.ceil(length / dx)) + 1
    n_min = max(n_need + int(math.ceil(10.0 * L / dx)), int(math.ceil(64.0 * L / dx)), 16)
    N = 1 << (n_min - 1).bit_length()
    dOmega = 2.0 * np.pi / (N * dx)
    k = np.arange(N // 2 + 1)
    Phi = spec.psd(k * dOmega, sigma, L, component)
    amp = np.sqrt(Phi * dOmega)
    amp[0] = 0.0            # no mean
    amp[-1] = 0.0           # no Nyquist term
    rng = np.random.default_rng(seed)
    a = rng.standard_normal(k.size)
    b = rng.standard_normal(k.size)
    Y = 0.5 * N * amp * (a - 1j * b)
    w = sp_fft.irfft(Y, n=N)
    return w[:n_need]


@register_profile("turbulence")
class Turbulence(GustProfile):
    """Frozen random turbulence with the Dryden or von Karman spectrum.

    Spectra of MIL-F-8785C (1980) and MIL-HDBK-1797: vertical gusts use the
    vertical form, streamwise gusts the longitudinal form.  The pattern is
    drawn once over the whole flight path of the run (see
    :func:`turbulence_samples`) on a grid of spacing min(c/16, L/200) and
    read by linear interpolation, so a long run is one continuous
    realisation.  The pattern has no front: the aircraft is already flying
    in it at t = 0 (``arrival`` shifts the pattern), so a run starts from the
    steady flow in the turbulence as it stands then, trimmed there (see
    :meth:`GustField.present_at_start`), not from a front crossing the chord.
    The realisation depends on ``seed``, the spectrum, the
    intensity, the scale length, the chord and the run's length of path
    (the period of the synthesis grows in powers of two).
    """

    KEYS = {"spectrum": "'dryden' or 'von-karman'", "intensity": "rms velocity, m/s, > 0",
            "scale_length": "m, > 0"}
    FILLS_SPACE = True        # the aircraft flies in it from t = 0 (see the class docstring)
    AHEAD_CHORDS = 3.0
    OPTIONAL = {"seed": 0, "realisations": None}
    POSITIVE = ("intensity", "scale_length")
    TEXT = ("spectrum",)

    @classmethod
    def check(cls, spec, ctx):
        choice("spectrum", spec["spectrum"], list(SPECTRA))
        integer("seed", spec.get("seed", 0), ge=0)
        c = ctx.get("airfoil", {}).get("chord")
        if c:
            n, dx = cls.grid_points(spec, ctx)
            need = n * cls.BYTES_PER_POINT
            from . import checks
            have = checks.available_memory()
            if n > cls.MAX_POINTS or (have and need > 0.25 * have):
                raise InputError("scale_length", f"with the path of the run the turbulence pattern needs "
                                                 f"{n:.3g} points every {dx:.3g} m (about {need / 2**30:.3g} GiB; "
                                                 f"at most {cls.MAX_POINTS:.3g} points and a quarter of the "
                                                 f"machine's memory): raise scale_length or shorten "
                                                 f"run.duration")

    #: Bytes per point of the synthesis (samples, abscissae, the complex spectrum, the normals).
    BYTES_PER_POINT = 64
    #: At most this many points in one pattern (2^28: about 17 GiB of working arrays).
    MAX_POINTS = 2 ** 28

    @classmethod
    def grid_points(cls, spec, ctx):
        """(points of the synthesis period, grid spacing m) of :func:`turbulence_samples` for this run."""
        c = ctx["airfoil"]["chord"]
        L = float(spec["scale_length"])
        dx = min(c / 16.0, L / 200.0)
        span = _xi_span(ctx, float(spec.get("arrival", 0.0)))
        length = max(span[1] + cls.AHEAD_CHORDS * c, dx)
        n_min = max(length / dx + 1 + 10.0 * L / dx, 64.0 * L / dx, 16)
        return float(2.0 ** math.ceil(math.log2(n_min))), dx

    def __init__(self, spec, ctx):
        super().__init__(spec, ctx)
        self.sigma = float(spec["intensity"])
        self.L = float(spec["scale_length"])
        c = ctx["airfoil"]["chord"]
        self.dx = min(c / 16.0, self.L / 200.0)
        component = "vertical" if self.direction == "vertical" else "longitudinal"
        # the pattern starts AHEAD_CHORDS chords ahead of the leading edge's
        # position at t = arrival: at t = 0 the whole airfoil and everything
        # it sheds lie at xi > -(1 + shed offset) c, inside the pattern
        self.x0 = -self.AHEAD_CHORDS * c
        self.samples = turbulence_samples(spec["spectrum"], self.sigma, self.L,
                                          max(self.span[1] - self.x0, self.dx), self.dx,
                                          realisation_seeds(spec)[0], component)
        self.x = self.x0 + np.arange(self.samples.size) * self.dx

    def shape(self, xi):
        return np.interp(xi, self.x, self.samples, right=0.0)

    @classmethod
    def peak_of(cls, spec, ctx):
        return 3.0 * float(spec["intensity"])  # a 3-sigma peak (common practice)


# ---------------------------------------------------------------------------
# the field the solver sees
# ---------------------------------------------------------------------------

class GustField:
    """The sum of gust profiles as a field ``velocity(x, z, t) -> (u, w)`` for the solver.

    Parameters
    ----------
    profiles : list of GustProfile
    speed : float
        Flight speed U, m/s (the patterns move with the air at U).
    x_le : float
        The leading edge's path in the computation frame, m (-pivot c).
    """

    def __init__(self, profiles, speed, x_le):
        self.profiles = list(profiles)
        self.U = float(speed)
        self.x_le = float(x_le)
        self.vertical = [p for p in self.profiles if p.direction == "vertical"]
        self.streamwise = [p for p in self.profiles if p.direction == "streamwise"]

    @property
    def present_at_start(self):
        """True when the airfoil is inside a gust at t = 0 (a pattern with no front,
        or a front that arrived before): the run then starts from the steady flow
        in the field as it stands at t = 0, and the trim includes it."""
        return any(p.FILLS_SPACE or p.arrival < 0.0 for p in self.profiles)

    def xi(self, x, t, arrival):
        """Distance into a gust of the given arrival time, m (see the module docstring)."""
        return self.U * (t - arrival) - (np.asarray(x, dtype=float) - self.x_le)

    def velocity(self, x, z, t):
        """Air velocity (u, w) of the gusts at points (x, z) at time t, m/s."""
        x = np.asarray(x, dtype=float)
        u = np.zeros_like(x)
        w = np.zeros_like(x)
        for p in self.vertical:
            w += p(self.xi(x, t, p.arrival))
        for p in self.streamwise:
            u += p(self.xi(x, t, p.arrival))
        return u, w


def gust_list(value):
    """The ``[gust]`` / ``[[gust]]`` value as a list of gust tables (empty for none)."""
    return [value] if isinstance(value, dict) else list(value or [])


def build_gust_field(sc):
    """The :class:`GustField` of a scenario's ``[gust]`` / ``[[gust]]``."""
    ctx = dict(sc.data)
    ctx["_base_dir"] = sc.base_dir
    profiles = [PROFILES[g["profile"]](g, ctx) for g in gust_list(sc.data["gust"])]
    return GustField(profiles, sc.speed, -sc.pivot * sc.chord)


def effective_angle_history(history, speed, chord, pivot, field=None):
    """The effective angle (rad) of every row of a history, with the gust of ``field`` at the three-quarter chord.

    :func:`unsteady.theory.effective_angle` on the columns ``pitch_deg``,
    ``pitch_rate_deg_s`` and ``height_rate_m_s``; the vertical gust is read
    at x = (3/4 - pivot) c and the row's height (the pattern depends on
    xi(x, t) only, so one call serves all rows).  The one evaluation behind
    the history column ``alpha_eff_deg`` and the summary's ``alpha_eff_max_deg``.
    """
    w = None
    if field is not None:
        t = np.asarray(history["t"], dtype=float)
        x34 = (0.75 - pivot) * chord
        w = field.velocity(np.full(t.shape, x34), np.asarray(history["height_m"], dtype=float), t)[1]
    return theory.effective_angle(np.radians(history["pitch_deg"]), np.radians(history["pitch_rate_deg_s"]),
                                  history["height_rate_m_s"], speed, chord, pivot, w)


# ---------------------------------------------------------------------------
# the scenario check
# ---------------------------------------------------------------------------

def _check_one(g, prefix, ctx):
    """(resolved gust table, [InputError]) for one gust table."""
    if not isinstance(g, dict):
        return g, [InputError(prefix.rstrip("."), 'must be a table like { profile = "one-minus-cosine", ... }')]
    name = g.get("profile")
    if name is None:
        return g, [InputError(f"{prefix}profile", f"is required: one of {', '.join(PROFILES)}")]
    try:
        choice(f"{prefix}profile", name, list(PROFILES))
    except InputError as e:
        return g, [e]
    cls = PROFILES[name]
    errors = []
    if "realisations" in g and "realisations" not in cls.OPTIONAL:
        errors.append(InputError(f"{prefix}realisations", f"statistics over realisations need a 'turbulence' "
                                                          f"gust; a '{name}' gust is one fixed pattern"))
        g = {k: v for k, v in g.items() if k != "realisations"}
    errors += unknown_keys(g, {"profile", *cls.KEYS, *cls.OPTIONAL, *GustProfile.COMMON}, prefix)
    for key, what in cls.KEYS.items():
        if key not in g:
            errors.append(InputError(f"{prefix}{key}", f"is required for the '{name}' profile ({what})"))
    out = {"profile": name}
    for key, v in g.items():
        if key == "profile" or key not in {**cls.KEYS, **cls.OPTIONAL, **GustProfile.COMMON}:
            continue
        try:
            if key == "direction":
                out[key] = choice(f"{prefix}direction", v, list(DIRECTIONS))
            elif key in cls.TEXT:
                if not isinstance(v, str) or not v.strip():
                    raise InputError(f"{prefix}{key}", f"must be a text, got {v!r}")
                out[key] = v
            elif key == "seed":
                out[key] = integer(f"{prefix}seed", v, ge=0)
            elif key == "realisations":
                out[key] = check_realisations(f"{prefix}realisations", v)
            else:
                lo, hi, unit = RANGES.get(key, (None, None, ""))
                if key in cls.POSITIVE:
                    out[key] = number(f"{prefix}{key}", v, gt=0.0)
                    if lo:
                        out[key] = number(f"{prefix}{key}", v, ge=lo, le=hi, unit=unit)
                    elif hi is not None:
                        out[key] = number(f"{prefix}{key}", v, gt=0.0, le=hi, unit=unit)
                else:
                    out[key] = number(f"{prefix}{key}", v, ge=lo, le=hi, unit=unit)
        except InputError as e:
            errors.append(e)
    for key, default in {**GustProfile.COMMON, **cls.OPTIONAL}.items():
        if key not in out and default is not None and key not in g:
            out[key] = default
    if errors:
        return out, errors
    try:
        cls.check(out, ctx)
    except InputError as e:
        errors.append(InputError(f"{prefix}{e.key}", e.message))
    return out, errors


def check_realisations(key, v):
    """``realisations``: a positive whole number (that many seeds from ``seed`` on) or a list of
    distinct seeds (whole numbers >= 0; it replaces ``seed``, the run itself flies the first);
    at most :data:`MAX_REALISATIONS`.  Returns it cleaned."""
    if isinstance(v, list):
        if not v or len(v) > MAX_REALISATIONS:
            raise InputError(key, f"must be a list of 1 to {MAX_REALISATIONS} seeds, got {len(v)} entries")
        seeds = [integer(key, x, ge=0) for x in v]
        if len(set(seeds)) != len(seeds):
            raise InputError(key, f"must list distinct seeds (each one is a realisation), got {v!r}")
        return seeds
    if isinstance(v, bool) or not (isinstance(v, int) or (isinstance(v, float) and v.is_integer())):
        raise InputError(key, f"must be a positive whole number or a list of seeds, got {v!r}")
    return integer(key, v, ge=1, le=MAX_REALISATIONS)


def realisation_seeds(spec):
    """The seeds of a turbulence gust's realisations: ``[seed]`` without ``realisations``."""
    r = spec.get("realisations")
    seed = int(spec.get("seed", 0))
    if r is None:
        return [seed]
    if isinstance(r, list):
        return [int(x) for x in r]
    return [seed + i for i in range(int(r))]


def _motion_angle_peak(ctx, w_peak):
    """Largest |effective angle| (rad) of the prescribed motion with a vertical gust of ``w_peak`` at its worst instant.

    :func:`unsteady.theory.effective_angle` on the pitch and plunge laws
    sampled at 2001 instants of the run, the gust added with either sign
    (an upper estimate: the gust need not meet the motion's peak).  The free
    heave of ``[aircraft]`` is left out: it lowers the angle.
    """
    U, chord = ctx["flow"]["speed"], ctx["airfoil"]["chord"]
    mo = ctx.get("motion", {})
    t = np.linspace(0.0, ctx.get("run", {}).get("duration") or 0.0, 2001)
    alpha = alpha_dot = h_dot = np.zeros_like(t)
    try:
        from .motion import build_law
        kw = dict(speed=U, chord=chord, base_dir=ctx.get("_base_dir"))
        if "pitch" in mo:
            pitch = build_law(mo["pitch"], scale=math.pi / 180.0, **kw)
            alpha, alpha_dot = pitch.value(t), pitch.rate(t)
        if "plunge" in mo:
            h_dot = build_law(mo["plunge"], scale=1.0, **kw).rate(t)
    except InputError:  # the motion's own check reports its problems
        pass
    pivot = mo.get("pivot", 0.25)      # the scenario default, when the motion has problems of its own
    return max(float(np.max(np.abs(theory.effective_angle(alpha, alpha_dot, h_dot, U, chord, pivot, w))))
               for w in (w_peak, -w_peak))


def _effective_angle_warning(specs, keys, ctx):
    """A warning line's (key, message) when the gusts can push the effective angle past the limit."""
    if not ctx.get("flow", {}).get("speed"):
        return None
    peaks = [PROFILES[g["profile"]].peak_of(g, ctx) for g in specs]
    vertical = [g.get("direction", "vertical") == "vertical" for g in specs]
    w_peak = sum(p for p, v in zip(peaks, vertical) if v)
    angle = math.degrees(_motion_angle_peak(ctx, w_peak))
    if angle > EFFECTIVE_ANGLE_LIMIT_DEG:
        i = int(np.argmax([p if v else 0.0 for p, v in zip(peaks, vertical)]))
        return (keys[i], f"the gust can raise the effective angle of attack to about {angle:.0f} degrees, "
                         f"beyond {EFFECTIVE_ANGLE_LIMIT_DEG:.0f}: the attached-flow model is far outside "
                         f"its range there (real sections stall near 10-15 degrees)")
    return None


@register_section("gust")
def check_gust_section(value, ctx):
    """Check ``[gust]`` (one table) or ``[[gust]]`` (a list, summed): (resolved, [InputError])."""
    if isinstance(value, dict):
        items, prefixes = [value], ["gust."]
    elif isinstance(value, list) and value:
        items, prefixes = value, [f"gust[{i}]." for i in range(len(value))]
    else:
        return value, [InputError("gust", 'must be a table [gust] or a list [[gust]] of gust tables')]
    resolved, errors = [], []
    for g, prefix in zip(items, prefixes):
        r, e = _check_one(g, prefix, ctx)
        resolved.append(r)
        errors += e
    for r, prefix in zip(resolved, prefixes):
        if r.get("realisations") is None or any(e.key == f"{prefix}realisations" for e in errors):
            continue
        if len(resolved) > 1 or r.get("direction", "vertical") != "vertical":
            errors.append(InputError(f"{prefix}realisations", "load-factor statistics are made for one "
                                                              "vertical turbulence gust alone; remove the "
                                                              "other gusts or realisations"))
        elif "aircraft" not in ctx:
            errors.append(InputError(f"{prefix}realisations", "load-factor statistics need [aircraft] (mass "
                                                              "and wing_area: the load factor); add it or "
                                                              "remove realisations"))
    if not errors and ctx.get("flow", {}).get("speed") and ctx.get("airfoil", {}).get("chord"):
        warn = _effective_angle_warning(resolved, [p + "amplitude" if "amplitude" in r else p + "intensity"
                                                   for p, r in zip(prefixes, resolved)], ctx)
        if warn is not None and isinstance(ctx.get("_warnings"), list):
            ctx["_warnings"].append(InputError(*warn))
    return (resolved[0] if isinstance(value, dict) else resolved), errors
