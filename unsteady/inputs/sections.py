"""Airfoil sections (flat plate, NACA 4-digit, coordinate files) and the cosine-spaced camber-line elements of the vortex model."""

from __future__ import annotations

import difflib
import math
import pathlib
import re
from dataclasses import dataclass

import numpy as np

from ..core.errors import InputError

__all__ = [
    "Section",
    "hinge_nodes",
    "FlatPlate",
    "Naca4",
    "CoordinateSection",
    "naca4_half_thickness",
    "section_from_shape",
    "cosine_nodes",
    "CamberPanels",
    "camber_elements",
]

ALLOWED_SHAPES = 'allowed: "flat", "nacaMPTT" (NACA 4-digit) or a path to a coordinates file'

#: Thickness (fraction of chord) of the outline drawn for sections thinner than this,
#: so that a flat plate is visible in pictures.  Pictures only: the model uses the camber line.
DISPLAY_THICKNESS = 0.01


def naca4_half_thickness(x, t, closed=True):
    """Half-thickness of the NACA 4-digit symmetrical section.

    y_t = 5 t (0.2969 sqrt(x) - 0.1260 x - 0.3516 x^2 + 0.2843 x^3 + a4 x^4)
    from E. N. Jacobs, K. E. Ward & R. M. Pinkerton, NACA Report 460 (1933),
    with a4 = -0.1015 as published (a small open trailing edge, 2 y_t(1) = 0.021 t)
    or, by default, the closed-trailing-edge variant a4 = -0.1036 (common practice).

    Parameters
    ----------
    x : array_like
        Chordwise position, fraction of chord, in [0, 1].
    t : float
        Maximum thickness, fraction of chord (0.12 for a NACA xx12).
    closed : bool, optional
        True (default): a4 = -0.1036, zero thickness at x = 1.
        False: a4 = -0.1015, the coefficient of Report 460.

    Returns
    -------
    ndarray
        y_t, half the thickness measured perpendicular to the mean line.
    """
    x = np.clip(np.asarray(x, dtype=float), 0.0, 1.0)
    a4 = -0.1036 if closed else -0.1015
    y_t = 5.0 * t * (0.2969 * np.sqrt(x) - 0.1260 * x - 0.3516 * x**2 + 0.2843 * x**3 + a4 * x**4)
    return np.maximum(y_t, 0.0)  # the closed form rounds to -1e-18 at x = 1


class Section:
    """Shape of an airfoil section in chord fractions (x aft from the leading edge, z up).

    The vortex model uses only the camber line; thickness serves pictures and
    summaries.  A new kind of section implements:

    1. ``name`` (str): a short label for plots and summaries.
    2. ``camber(x)`` -> z: the mean (camber) line, vectorised over x in [0, 1],
       with camber(0) = camber(1) = 0 (chord line from (0, 0) to (1, 0)).
    3. ``slope(x)`` -> dz/dx: the derivative of ``camber``, vectorised, consistent
       with it (the exact derivative, or the derivative of the same smooth fit).
    4. ``half_thickness(x)``: half the local thickness (fraction of chord),
       vectorised; and ``thickness`` (float): the largest thickness / chord.
    5. Optionally ``outline(n)``; the default lays ``half_thickness`` off
       perpendicular to the camber line, as the NACA sections are built
       (NACA Report 460), and draws sections thinner than
       ``DISPLAY_THICKNESS`` (the flat plate) with a 1 % thick outline.
    """

    name: str = "section"
    thickness: float = 0.0

    def camber(self, x):
        """Mean-line height z(x) in chord fractions (vectorised)."""
        raise NotImplementedError

    def slope(self, x):
        """Mean-line slope dz/dx (vectorised)."""
        raise NotImplementedError

    def half_thickness(self, x):
        """Half the local thickness in chord fractions (vectorised); zero by default."""
        return np.zeros_like(np.asarray(x, dtype=float))

    def outline(self, n=121, x=None):
        """Upper and lower surfaces for pictures.

        Parameters
        ----------
        n : int, optional
            Points per surface, cosine spaced from leading to trailing edge.
        x : array, optional
            Chord stations to use instead (from 0 to 1; a flap's hinge among them).

        Returns
        -------
        x_upper, z_upper, x_lower, z_lower : ndarray
            Chord fractions, each of length n, from leading to trailing edge.
        """
        x = cosine_nodes(max(int(n), 2) - 1) if x is None else np.asarray(x, dtype=float)
        zc = np.asarray(self.camber(x), dtype=float)
        theta = np.arctan(np.asarray(self.slope(x), dtype=float))
        if self.thickness >= DISPLAY_THICKNESS:
            yt = self.half_thickness(x)
        else:
            yt = naca4_half_thickness(x, DISPLAY_THICKNESS)
        s, c = np.sin(theta), np.cos(theta)
        return x - yt * s, zc + yt * c, x + yt * s, zc - yt * c

    def __repr__(self):
        return f"<{type(self).__name__} {self.name}>"


class FlatPlate(Section):
    """The flat plate: a straight camber line, z = 0.

    Drawn with a 1 % thick outline (NACA 4-digit thickness form) so it is visible.
    """

    name = "flat plate"
    thickness = 0.0

    def camber(self, x):
        """Zero everywhere."""
        return np.zeros_like(np.asarray(x, dtype=float))

    def slope(self, x):
        """Zero everywhere."""
        return np.zeros_like(np.asarray(x, dtype=float))


class Naca4(Section):
    """NACA 4-digit section.

    Mean line (E. N. Jacobs, K. E. Ward & R. M. Pinkerton, NACA Report 460, 1933)::

        z = m / p^2 (2 p x - x^2)                    0 <= x < p
        z = m / (1-p)^2 ((1 - 2 p) + 2 p x - x^2)    p <= x <= 1

    with the exact slope dz/dx = 2 m / p^2 (p - x) ahead of p and
    2 m / (1-p)^2 (p - x) behind.  Sections with p = 0 or m = 0 are symmetric
    (flat mean line).  The outline lays the thickness of
    :func:`naca4_half_thickness` (closed trailing edge, a4 = -0.1036)
    perpendicular to the mean line, as in Report 460.

    Parameters
    ----------
    m : float
        Maximum camber, fraction of chord (first digit / 100).
    p : float
        Chordwise position of maximum camber, fraction of chord (second digit / 10).
    t : float
        Maximum thickness, fraction of chord (last two digits / 100).
    """

    def __init__(self, m, p, t):
        for key, v in (("m", m), ("p", p), ("t", t)):
            if isinstance(v, bool) or not isinstance(v, (int, float, np.integer, np.floating)) or not math.isfinite(v):
                raise InputError("shape", f"NACA 4-digit {key} must be a finite number, got {v!r}")
        if not 0.0 <= m < 1.0 or not 0.0 <= p < 1.0 or not 0.0 <= t < 1.0:
            raise InputError("shape", f"NACA 4-digit parameters must lie in [0, 1): m={m}, p={p}, t={t}")
        self.m, self.p, self.t = float(m), float(p), float(t)
        self.thickness = self.t
        digits = (self.m * 100, self.p * 10, self.t * 100)
        if all(abs(d - round(d)) < 1e-9 for d in digits) and digits[0] < 10 and digits[1] < 10 and digits[2] < 100:
            self.name = f"NACA {round(digits[0])}{round(digits[1])}{round(digits[2]):02d}"
        else:
            self.name = f"NACA 4-digit m={self.m:g} p={self.p:g} t={self.t:g}"

    @classmethod
    def from_digits(cls, digits):
        """Section from a four-digit designation such as "2412" (m = 2 %, p = 40 %, t = 12 %)."""
        if not (isinstance(digits, str) and re.fullmatch(r"\d{4}", digits)):
            raise InputError("shape", f"a NACA 4-digit designation needs four digits, got {digits!r}")
        return cls(int(digits[0]) / 100.0, int(digits[1]) / 10.0, int(digits[2:]) / 100.0)

    @property
    def symmetric(self):
        """True when the mean line is flat (m = 0 or p = 0)."""
        return self.m == 0.0 or self.p == 0.0

    def camber(self, x):
        """Mean line z(x) of Report 460 (vectorised)."""
        x = np.asarray(x, dtype=float)
        if self.symmetric:
            return np.zeros_like(x)
        m, p = self.m, self.p
        return np.where(x < p, m / p**2 * (2 * p * x - x**2), m / (1 - p) ** 2 * ((1 - 2 * p) + 2 * p * x - x**2))

    def slope(self, x):
        """Exact slope dz/dx of the Report 460 mean line (vectorised)."""
        x = np.asarray(x, dtype=float)
        if self.symmetric:
            return np.zeros_like(x)
        m, p = self.m, self.p
        return np.where(x < p, 2 * m / p**2 * (p - x), 2 * m / (1 - p) ** 2 * (p - x))

    def half_thickness(self, x):
        """Half-thickness y_t(x), closed trailing edge (see :func:`naca4_half_thickness`)."""
        return naca4_half_thickness(x, self.t, closed=True)


# ----------------------------------------------------------------------------
# Coordinate files


def _shape_error(message):
    return InputError("shape", message)


def _read_points(path):
    """Read x z pairs; return (points (N, 2), counts or None, title or None)."""
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise _shape_error(f"coordinates file '{path}' not found; {ALLOWED_SHAPES}") from None
    except IsADirectoryError:
        raise _shape_error(f"'{path}' is a folder, not a coordinates file; {ALLOWED_SHAPES}") from None
    except UnicodeDecodeError:
        raise _shape_error(f"'{path}' is not a text file of x z coordinates") from None
    except OSError as exc:
        raise _shape_error(f"cannot read coordinates file '{path}' ({exc.strerror or exc})") from None

    title = None
    rows = []
    for lineno, line in enumerate(text.splitlines(), start=1):
        s = line.strip()
        if not s or s.startswith("#"):
            continue
        fields = [f for f in re.split(r"[\s,;]+", s) if f]
        try:
            values = [float(f) for f in fields]
        except ValueError:
            if title is None and not rows:
                title = s
                continue
            raise _shape_error(f"line {lineno} of '{path.name}' is not two numbers x z: '{s[:40]}'") from None
        if len(values) != 2:
            raise _shape_error(f"line {lineno} of '{path.name}' has {len(values)} numbers; each line needs two: x z")
        if not all(math.isfinite(v) for v in values):
            raise _shape_error(f"line {lineno} of '{path.name}' holds a value that is not finite: '{s[:40]}'")
        rows.append(values)

    if not rows:
        raise _shape_error(f"'{path.name}' holds no x z points")
    pts = np.array(rows, dtype=float)
    counts = None
    a, b = pts[0]
    if a == round(a) and b == round(b) and a >= 2 and b >= 2 and round(a + b) == len(pts) - 1:
        counts = (int(a), int(b))
        pts = pts[1:]
    if len(pts) < 10:
        raise _shape_error(f"'{path.name}' has only {len(pts)} points; at least 10 are needed, covering both surfaces")
    return pts, counts, title


_ORDERS = ("list both surfaces, either trailing edge -> upper -> leading edge -> lower -> trailing edge, "
           "or upper then lower, each from leading to trailing edge")


def _as_loop(pts, counts, fname):
    """Arrange the points as one loop trailing edge -> surface -> leading edge -> surface -> trailing edge."""
    span = float(np.hypot(np.ptp(pts[:, 0]), np.ptp(pts[:, 1])))
    if span == 0.0:
        raise _shape_error(f"all points of '{fname}' coincide")
    if counts is not None:
        first, second = pts[: counts[0]], pts[counts[0]:]
    else:
        step = np.hypot(*np.diff(pts, axis=0).T)
        jumps = np.flatnonzero(step > 0.5 * span)
        if len(jumps) > 1:
            raise _shape_error(f"the outline in '{fname}' jumps across the section {len(jumps)} times, so the surfaces "
                               f"cannot be told apart; {_ORDERS}")
        if len(jumps) == 0:
            return pts, span
        first, second = pts[: jumps[0] + 1], pts[jumps[0] + 1:]
    if len(first) < 3 or len(second) < 3:
        raise _shape_error(f"one surface in '{fname}' has fewer than 3 points; {_ORDERS}")
    if np.hypot(*(first[0] - second[0])) > 0.05 * span:
        raise _shape_error(f"the two blocks of points in '{fname}' do not start at the same leading edge; {_ORDERS}")
    if np.hypot(*(first[0] - second[0])) <= 1e-9 * span:
        second = second[1:]
    return np.vstack([first[::-1], second]), span


class CoordinateSection(Section):
    """Section read from a file of x z points of both surfaces.

    Accepted layouts: two numbers per line separated by spaces, tabs or commas;
    an optional title line first (it becomes the section's name) and, after
    it, an optional line with the point counts of the two blocks; lines
    starting with ``#`` are skipped.  The points run either trailing edge ->
    upper surface -> leading edge -> lower surface -> trailing edge, or as an
    upper block and a lower block, each from leading to trailing edge (the
    loop is turned to run counter-clockwise, so a lower-first file is read
    correctly too).  Any chord length, offset and inclination.

    Construction:

    1. The outline is a parametric cubic spline through the points
       (centripetal parameter: the running sum of the square roots of the
       distances between points, which keeps a coarse nose from looping);
       the trailing edge is the midpoint of the end points.
    2. In the frame of the current chord (first guess: leading edge at the
       point farthest from the trailing edge) both surfaces are sampled at
       common x and their mean z_m = (z_u + z_l) / 2 is taken.
    3. The NACA sections lay the thickness off perpendicular to the mean line
       (NACA Report 460), which lifts the mean of the surfaces at common x
       above the mean line by y_t dy_t/dx dz_c/dx to first order; the camber
       is corrected for it: z_c = z_m - (1/2) d(y_t^2)/dx dz_m/dx, with
       y_t = (z_u - z_l) / 2.  Without the correction a NACA 2412 would come
       out 1.5e-3 chord off near the nose.
    4. The leading edge is the forward end of the mean line and the chord
       joins it to the trailing edge (I. H. Abbott & A. E. von Doenhoff,
       Theory of Wing Sections, 1959, sec. 6.2, from memory).  With the
       nose circle centred on the mean line (as in Report 460) that end is
       the point of the outline standing farthest forward along the mean
       line's direction at the nose.  Steps 2-4 are repeated in the new
       chord's frame until the leading edge settles.
    5. The section is moved, derotated and scaled so that the leading edge is
       at (0, 0) and the trailing edge at (1, 0).  The camber is a
       least-squares cubic spline through the corrected mean-line points
       from x = 0.002 aft (knots cosine spaced, their number tied to the
       density of the data); ahead of 1 % chord, where the first-order
       correction fails, it is a parabola through the leading edge fitted to
       the mean line over 1-10 % chord, blended smoothly into the spline by
       2 % chord.  The slope is the exact derivative of this camber.

    For files built from the NACA 4-digit equations this recovers the
    Report 460 mean line to a few 1e-4 chord.

    Parameters
    ----------
    path : str or pathlib.Path
        The coordinates file.

    Attributes
    ----------
    chord : float
        Chord length in the file's units.
    incidence : float
        Nose-up inclination of the chord line in the file, radians.

    Raises
    ------
    InputError
        Key ``"shape"``: the file is missing or unreadable, has fewer than 10
        points, a line that is not two numbers (named by its line number), an
        outline that is not closed or cannot be split into two surfaces, or
        surfaces that cross.
    """

    #: Points per surface of the dense sampling of the spline outline.
    _DENSE = 1201
    #: Mean-line stations (cosine spaced), and the first of them used (chord fraction).
    _STATIONS = 240
    _X_NOSE = 2e-3
    #: Ahead of the first of these the camber is a parabola through the leading edge, behind the
    #: second the spline; blended smoothly between.
    _X_BLEND = (0.01, 0.02)

    def __init__(self, path):
        path = pathlib.Path(path)
        self.path = path
        pts, counts, title = _read_points(path)
        self.name = title if title else path.stem
        loop, span = _as_loop(pts, counts, path.name)
        fname = path.name

        # drop repeated points, then the closure check
        keep = np.concatenate([[True], np.hypot(*np.diff(loop, axis=0).T) > 1e-9 * span])
        loop = loop[keep]
        if len(loop) < 10:
            raise _shape_error(f"'{fname}' has only {len(loop)} distinct points; at least 10 are needed")
        gap = float(np.hypot(*(loop[0] - loop[-1])))
        if gap > 0.1 * span:
            raise _shape_error(f"the outline in '{fname}' is not closed: its ends are {gap / span:.2f} chords apart; "
                               f"{_ORDERS}")
        area = 0.5 * float(np.sum(loop[:-1, 0] * loop[1:, 1] - loop[1:, 0] * loop[:-1, 1]))
        if area < 0.0:
            loop = loop[::-1]

        from scipy.interpolate import CubicSpline   # here: only coordinate files need it
        # 1. parametric spline; first guess of the leading edge: the farthest point from the trailing edge
        s = np.concatenate([[0.0], np.cumsum(np.sqrt(np.hypot(*np.diff(loop, axis=0).T)))])
        spline = CubicSpline(s, loop, axis=0)
        te = 0.5 * (loop[0] + loop[-1])
        i = int(np.argmax(np.sum((loop - te) ** 2, axis=1)))
        if i == 0 or i == len(loop) - 1:
            raise _shape_error(f"no leading edge found in '{fname}': the point farthest from the trailing edge is an "
                               f"end point; {_ORDERS}")
        s_le = _extreme(spline, s, i, lambda p: float(np.sum((p - te) ** 2)))

        # 2-4. mean line and leading edge, iterated in the frame of the current chord
        for _ in range(10):
            frame = _ChordFrame(spline(s_le), te)
            upper, lower = self._branches(spline, s, s_le, frame, fname)
            fit, slope0, _ = self._mean_line(*upper, *lower, len(loop), fname)
            theta0 = math.atan(slope0)
            # direction of the mean line at the nose, in file coordinates
            t0 = np.array([frame.ex * math.cos(theta0) - frame.ez * math.sin(theta0),
                           frame.ez * math.cos(theta0) + frame.ex * math.sin(theta0)])
            s_new = _support(spline, s, s_le, t0)
            moved = float(np.hypot(*(spline(s_new) - spline(s_le)))) / frame.c
            s_le = s_new
            if moved < 1e-10:
                break

        # 5. final frame
        frame = _ChordFrame(spline(s_le), te)
        self.chord = frame.c
        self.incidence = math.atan2(-frame.ez, frame.ex)
        self._upper, self._lower = self._branches(spline, s, s_le, frame, fname)
        fit, _, self._nose = self._mean_line(*self._upper, *self._lower, len(loop), fname)
        self._camber_fit = fit
        self._slope_fit = fit.derivative()
        # removes the last rounding so that camber(1) = 0 exactly (camber(0) = 0 by the nose parabola)
        self._z1 = float(fit(1.0))
        xg = cosine_nodes(400)
        self.thickness = float(np.max(self.half_thickness(xg)) * 2.0)

    @classmethod
    def _branches(cls, spline, s, s_le, frame, fname):
        """Upper and lower surfaces in the body frame, leading to trailing edge, x strictly increasing."""
        frac = 1.0 - np.cos(0.5 * np.pi * np.linspace(0.0, 1.0, cls._DENSE))  # dense near the nose
        upper = cls._monotone(*frame.to_body(spline(s_le * (1.0 - frac))), "upper", fname)
        lower = cls._monotone(*frame.to_body(spline(s_le + (s[-1] - s_le) * frac)), "lower", fname)
        return upper, lower

    @staticmethod
    def _monotone(x, z, which, fname):
        """Check that x increases from nose to trailing edge along a surface; return strictly increasing samples."""
        drop = np.maximum.accumulate(x) - x
        if np.max(drop) > 5e-3:
            where = x[int(np.argmax(drop))]
            raise _shape_error(f"the {which} surface in '{fname}' turns back near x = {where:.3f} chord, so the "
                               f"outline cannot be split into upper and lower surfaces; {_ORDERS}")
        x = np.maximum.accumulate(x)
        keep = np.concatenate([[True], np.diff(x) > 0.0])
        return x[keep], z[keep]

    @classmethod
    def _mean_line(cls, xu, zu, xl, zl, n_points, fname):
        """Least-squares cubic spline of the corrected mean line (steps 2, 3 and 5 listed in the class docstring)."""
        from scipy.interpolate import make_lsq_spline
        xi = cosine_nodes(cls._STATIONS)
        z_u, z_l = np.interp(xi, xu, zu), np.interp(xi, xl, zl)
        crossing = (xi > 1e-3) & (xi < 1.0 - 1e-3) & (z_u - z_l < -2e-4)
        if np.any(crossing):
            x_bad = xi[crossing]
            raise _shape_error(f"the surfaces in '{fname}' cross: the upper surface lies below the lower one between "
                               f"x = {x_bad[0]:.3f} and {x_bad[-1]:.3f} chord; it must stay above it")
        use = (xi >= cls._X_NOSE) & (xi <= 1.0 - 1e-4)
        xi, z_u, z_l = xi[use], z_u[use], z_l[use]
        x_lo = float(xi[0])
        interior = cosine_nodes(int(np.clip(n_points // 4, 4, 30)))[1:-1]
        knots = np.concatenate([[x_lo] * 4, interior[interior > 2.0 * x_lo], [1.0] * 4])
        z_m = 0.5 * (z_u + z_l)
        y_t = 0.5 * (z_u - z_l)
        fit_m = make_lsq_spline(xi, z_m, knots, k=3)
        fit_t2 = make_lsq_spline(xi, y_t**2, knots, k=3)
        z_c = z_m - 0.5 * fit_t2.derivative()(xi) * fit_m.derivative()(xi)
        # the nose: a parabola through the mean line over 1-10 % chord, where the correction
        # holds; closer to the nose the first-order correction fails
        front = (xi >= cls._X_BLEND[0]) & (xi <= 0.1)
        slope0 = float(np.polyfit(xi[front], z_c[front], 2)[1])  # free parabola: the slope at the nose
        a = np.column_stack([xi[front], xi[front] ** 2])         # through (0, 0): the nose model
        nose = np.linalg.lstsq(a, z_c[front], rcond=None)[0]
        return make_lsq_spline(xi, z_c, knots, k=3), slope0, (float(nose[0]), float(nose[1]))

    def _blend(self, x):
        """Weight of the nose parabola: 1 ahead of 1 % chord, 0 behind 2 %, smoothstep between."""
        x_a, x_b = self._X_BLEND
        u = np.clip((x - x_a) / (x_b - x_a), 0.0, 1.0)
        return 1.0 - u * u * (3.0 - 2.0 * u), -6.0 * u * (1.0 - u) / (x_b - x_a)

    def camber(self, x):
        """Mean line z(x): the nose parabola blended into the least-squares cubic spline, vectorised."""
        x = np.asarray(x, dtype=float)
        b1, b2 = self._nose
        w, _ = self._blend(x)
        return w * (b1 * x + b2 * x * x) + (1.0 - w) * self._camber_fit(x) - self._z1 * x

    def slope(self, x):
        """Exact derivative of :meth:`camber`, vectorised."""
        x = np.asarray(x, dtype=float)
        b1, b2 = self._nose
        w, dw = self._blend(x)
        nose, fit = b1 * x + b2 * x * x, self._camber_fit(x)
        return w * (b1 + 2.0 * b2 * x) + (1.0 - w) * self._slope_fit(x) + dw * (nose - fit) - self._z1

    def half_thickness(self, x):
        """Half the vertical distance between the surfaces at x."""
        x = np.asarray(x, dtype=float)
        return 0.5 * (np.interp(x, *self._upper) - np.interp(x, *self._lower))

    def outline(self, n=121, x=None):
        """The normalised surfaces from the file, resampled at n cosine-spaced x (see :meth:`Section.outline`)."""
        x = cosine_nodes(max(int(n), 2) - 1) if x is None else np.asarray(x, dtype=float)
        return x, np.interp(x, *self._upper), x.copy(), np.interp(x, *self._lower)


def _support(spline, s, s_le, t0):
    """Parameter of the point of the outline farthest back along -t0, searched near s_le (the nose)."""
    from scipy.optimize import minimize_scalar
    near = int(np.searchsorted(s, s_le))
    lo, hi = s[max(near - 8, 0)], s[min(near + 8, len(s) - 1)]
    u = np.linspace(lo, hi, 801)
    k = int(np.argmin(spline(u) @ t0))
    res = minimize_scalar(lambda v: float(spline(v) @ t0), bounds=(u[max(k - 1, 0)], u[min(k + 1, len(u) - 1)]),
                          method="bounded", options={"xatol": 1e-13 * s[-1]})
    return float(res.x)


def _extreme(spline, s, i, score):
    """Parameter near the point i of the loop where the spline maximises score(point)."""
    from scipy.optimize import minimize_scalar
    lo, hi = s[max(i - 1, 0)], s[min(i + 1, len(s) - 1)]
    res = minimize_scalar(lambda u: -score(spline(u)), bounds=(lo, hi), method="bounded",
                          options={"xatol": 1e-13 * s[-1]})
    return float(res.x)


class _ChordFrame:
    """Move, derotate and scale file coordinates so that le -> (0, 0) and te -> (1, 0)."""

    def __init__(self, le, te):
        self.le = np.asarray(le, dtype=float)
        d = np.asarray(te, dtype=float) - self.le
        self.c = float(np.hypot(*d))
        self.ex, self.ez = d / self.c

    def to_body(self, p):
        d = np.asarray(p, dtype=float) - self.le
        return ((d[..., 0] * self.ex + d[..., 1] * self.ez) / self.c,
                (-d[..., 0] * self.ez + d[..., 1] * self.ex) / self.c)


def section_from_shape(shape: str, base_dir: pathlib.Path | None = None) -> Section:
    """Section named by the scenario's ``airfoil.shape``.

    Parameters
    ----------
    shape : str
        ``"flat"``; ``"naca"`` followed by four digits, any case (``"naca2412"``,
        ``"NACA0012"``; a space or hyphen after NACA is accepted); otherwise the
        path of a coordinates file (see :class:`CoordinateSection`).
    base_dir : pathlib.Path, optional
        Folder that relative paths are taken from (the scenario file's folder).

    Returns
    -------
    Section

    Raises
    ------
    InputError
        Key ``"shape"`` for anything else, or for a bad coordinates file.
    """
    if not isinstance(shape, str) or not shape.strip():
        raise InputError("shape", f"expected text, got {shape!r}; {ALLOWED_SHAPES}")
    text = shape.strip()
    if text.lower() == "flat":
        return FlatPlate()
    match = re.fullmatch(r"naca[ \-]?(\d{4})", text, flags=re.IGNORECASE)
    if match:
        return Naca4.from_digits(match.group(1))
    path = pathlib.Path(text).expanduser()
    if not path.is_absolute() and base_dir is not None:
        path = pathlib.Path(base_dir) / path
    if not path.exists():
        if re.match(r"naca", text, flags=re.IGNORECASE):
            raise InputError("shape", f"'{text}' is not a NACA 4-digit designation (NACA and four digits, e.g. "
                                      f"\"naca2412\"); {ALLOWED_SHAPES}")
        near = difflib.get_close_matches(text.lower(), ["flat", "flat plate", "flatplate", "plate"], n=1, cutoff=0.6)
        hint = " (did you mean \"flat\"?)" if near else ""
        raise InputError("shape", f"unknown shape '{text}'{hint}: no such file '{path}'; {ALLOWED_SHAPES}")
    return CoordinateSection(path)


def cosine_nodes(n):
    """Cosine-spaced points along the chord.

    x_i = (1 - cos(pi i / n)) / 2, i = 0..n: dense near both edges, where the
    bound vorticity changes fastest (common practice).

    Parameters
    ----------
    n : int
        Number of intervals (at least 1).

    Returns
    -------
    ndarray
        n + 1 chord fractions from 0 to 1, exactly 0 and 1 at the ends and
        symmetric about 1/2.
    """
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or n < 1:
        raise InputError("elements", f"the number of elements must be a whole number of at least 1, got {n!r}")
    i = np.arange(n + 1)
    x = 0.5 * (1.0 - np.cos(np.pi * i / n))
    x[0], x[-1] = 0.0, 1.0
    half = n // 2
    x[n - half:] = 1.0 - x[half::-1]  # exact symmetry about 1/2
    return x


@dataclass(frozen=True)
class CamberPanels:
    """Straight elements along the camber line, with lumped-vortex points.

    Each element j runs from node j to node j + 1.  Its bound vortex sits at
    1/4 of its length and its collocation point (where the flow must be
    tangent) at 3/4: the lumped-vortex element of J. Katz & A. Plotkin,
    Low-Speed Aerodynamics, 2nd ed. (2001), sec. 11.1 (steady) and ch. 13
    (time-stepping).  All coordinates are chord fractions in the body frame
    (x aft from the leading edge, z up) at zero pitch.

    Attributes
    ----------
    x_nodes, z_nodes : ndarray, shape (n + 1,)
        End points of the elements.
    ds : ndarray, shape (n,)
        Element lengths.
    tx, tz : ndarray, shape (n,)
        Unit tangents, leading edge towards trailing edge.
    nx, nz : ndarray, shape (n,)
        Unit normals (-tz, tx), towards the upper side; (0, 1) on a flat plate.
    xv, zv : ndarray, shape (n,)
        Bound-vortex points (1/4 of each element).
    xc, zc : ndarray, shape (n,)
        Collocation points (3/4 of each element).
    """

    x_nodes: np.ndarray
    z_nodes: np.ndarray
    ds: np.ndarray
    tx: np.ndarray
    tz: np.ndarray
    nx: np.ndarray
    nz: np.ndarray
    xv: np.ndarray
    zv: np.ndarray
    xc: np.ndarray
    zc: np.ndarray

    @property
    def n(self):
        """Number of elements."""
        return len(self.ds)


def camber_elements(section: Section, n: int) -> CamberPanels:
    """Split the camber line of a section into n cosine-spaced straight elements.

    Parameters
    ----------
    section : Section
        The airfoil section.
    n : int
        Number of elements (at least 1).

    Returns
    -------
    CamberPanels
        Read-only arrays; vortex points at 1/4 and collocation points at 3/4 of
        each element (Katz & Plotkin 2001, sec. 11.1 and ch. 13).
    """
    x = cosine_nodes(n)
    z = np.array(section.camber(x), dtype=float)
    dx, dz = np.diff(x), np.diff(z)
    ds = np.hypot(dx, dz)
    tx, tz = dx / ds, dz / ds
    nx, nz = -tz, tx
    arrays = dict(
        x_nodes=x, z_nodes=z, ds=ds, tx=tx, tz=tz, nx=nx, nz=nz,
        xv=x[:-1] + 0.25 * dx, zv=z[:-1] + 0.25 * dz,
        xc=x[:-1] + 0.75 * dx, zc=z[:-1] + 0.75 * dz,
    )
    for a in arrays.values():
        a.setflags(write=False)
    return CamberPanels(**arrays)


def hinge_nodes(n, hinge):
    """n + 1 element nodes (chord fractions) cosine-spaced on each side of the hinge, one node exactly on it.

    x = (1 - cos theta) / 2 with theta uniform on [0, theta_h] and on
    [theta_h, pi], cos theta_h = 1 - 2 x_h, the elements shared out in
    proportion to the two theta ranges (at least one on each side).  Away
    from the hinge this is the usual cosine spacing (common practice).
    """
    th_h = math.acos(1.0 - 2.0 * float(hinge))
    n1 = min(n - 1, max(1, int(round(n * th_h / math.pi))))
    theta = np.concatenate([np.linspace(0.0, th_h, n1 + 1), np.linspace(th_h, math.pi, n - n1 + 1)[1:]])
    x = 0.5 * (1.0 - np.cos(theta))
    x[0], x[n1], x[-1] = 0.0, float(hinge), 1.0
    return x, n1
