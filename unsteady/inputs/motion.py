"""Motion laws for pitch and plunge (value and exact time derivatives), registered by the name the scenario uses."""

from __future__ import annotations

import difflib
import math
import numbers
import pathlib
from dataclasses import dataclass
from typing import Mapping

import numpy as np

from ..core.errors import InputError
from ..core.registry import registrar
from .tables import read_table, table_path

__all__ = [
    "LAWS",
    "register_law",
    "LawContext",
    "Law",
    "Constant",
    "Step",
    "Ramp",
    "Sine",
    "Table",
    "SumLaw",
    "build_law",
    "law_problems",
    "Kinematics",
    "logcosh",
]

#: The registry: law name as written in a scenario (``law = "ramp"``) -> class.
LAWS: dict[str, type["Law"]] = {}


#: Class decorator: add a :class:`Law` subclass to :data:`LAWS` under ``name``.
register_law = registrar(LAWS, "motion law")

#: Largest |time| (s) a law may name (start, time, a table's t): past an hour and more no run goes.
TIME_LIMIT = 1.0e4
#: Largest frequency (Hz) of a sine law: beyond the flapping and vibration of any flying wing.
FREQUENCY_LIMIT = 1.0e3
#: Largest reduced frequency k = omega c / (2 U) of a sine law; k of a few is already strongly
#: unsteady, and k = 20 needs about 130 steps a chord of travel (common practice).
REDUCED_FREQUENCY_LIMIT = 20.0
#: Smallest smoothing time (s) of a rounded ramp (0 = sharp corners): below it the default step,
#: a tenth of the smoothing, would ask for millions of steps.
SMOOTHING_MIN = 1.0e-6


@dataclass(frozen=True)
class LawContext:
    """What a law may need beyond its own keys.

    Attributes
    ----------
    scale : float
        Factor from the scenario unit of the quantity to the unit the law
        returns: pi/180 for pitch (degrees in, radians out), 1 for plunge (m).
    speed : float or None
        Flight speed U, m/s (for a reduced frequency).
    chord : float or None
        Chord c, m (for a reduced frequency).
    base_dir : pathlib.Path or None
        Folder that relative file paths are taken from.
    limit : (float, str) or None
        Largest magnitude of the moved quantity in its scenario unit, and
        that unit (``(180, "deg")`` for pitch): the SCALED keys and a table's
        values beyond it are refused by :func:`law_problems`.  None: not checked.
    """

    scale: float = 1.0
    speed: float | None = None
    chord: float | None = None
    base_dir: pathlib.Path | None = None
    limit: tuple | None = None


class Law:
    """A prescribed time history q(t) of pitch or plunge, with its exact derivatives.

    What a new law implements (the public :meth:`value`, :meth:`rate` and
    :meth:`accel`, and the checks in :func:`build_law`, are the base's and
    are not overridden):

    1. Subclass ``Law`` and decorate it with ``@register_law("name")``; the
       name is what a scenario writes as ``law = "name"``.  Cite the source of
       the formula in the class docstring.
    2. ``KEYS``: tuple of the required keys (besides ``law``).
    3. ``OPTIONAL``: dict of the optional keys and their defaults; a default
       of ``None`` means "absent unless given".
    4. ``TEXT``: keys holding text (every other key holds a number), and
       ``SCALED``: keys holding the moved quantity itself (degrees of pitch,
       metres of plunge); the base multiplies them by ``context.scale`` into
       ``self.scaled[key]``.  Times, frequencies and phases are not scaled.
    5. ``check(spec)`` (classmethod): the rules between values (a duration
       above zero, exactly one of two keys, ...).  It is called with the
       defaults filled in and after the base has checked that required keys
       are present, that no key is unknown, and that numbers are finite real
       numbers (not booleans) and texts are text.  It raises
       ``InputError(key, message)`` with the key relative to the law table
       and a message that says what is allowed.
    6. ``__init__(self, spec, context)``: call ``super().__init__(spec,
       context)`` and prepare.  Problems that need the context (a file to
       read, the flight speed) raise ``InputError`` here.
    7. ``_value(t)``, ``_rate(t)`` and ``_accel(t)``: for a float ndarray t,
       arrays of t's shape holding q, the EXACT first derivative dq/dt and the
       exact second derivative d2q/dt2 (the classical apparent-mass terms use
       it), all multiplied by the scale.  No finite differences.
    """

    name: str = ""
    KEYS: tuple = ()
    OPTIONAL: dict = {}
    TEXT: tuple = ()
    SCALED: tuple = ()
    #: key -> (lowest, highest, unit) of the plain numbers (not SCALED: those take the context's
    #: limit), checked by the base before :meth:`check`; a key given as None is not checked.
    BOUNDS: dict = {}

    def __init__(self, spec: Mapping, context: LawContext = LawContext()):
        self.spec = dict(spec)
        self.context = context
        self.scale = float(context.scale)
        self.scaled = {key: self.scale * float(self.spec[key]) for key in self.SCALED
                       if self.spec.get(key) is not None}

    @classmethod
    def check(cls, spec: Mapping) -> None:
        """Rules between the values of a law table (see rule 5); none by default."""

    # -- public evaluation, owned by the base ---------------------------------
    @staticmethod
    def _out(t, q):
        q = np.broadcast_to(np.asarray(q, dtype=float), np.shape(t))
        return float(q) if q.ndim == 0 else np.array(q)

    def value(self, t):
        """q(t); a float for a scalar t, else an array of t's shape."""
        t = np.asarray(t, dtype=float)
        return self._out(t, self._value(t))

    def rate(self, t):
        """Exact first time derivative dq/dt."""
        t = np.asarray(t, dtype=float)
        return self._out(t, self._rate(t))

    def accel(self, t):
        """Exact second time derivative d2q/dt2."""
        t = np.asarray(t, dtype=float)
        return self._out(t, self._accel(t))

    def resolved(self):
        """The law table with its defaults filled in, as a scenario would write it."""
        out = {"law": self.name}
        out.update({k: v for k, v in self.spec.items() if v is not None})
        return out

    def singular_times(self):
        """Times (s) at which the law changes instantly: its value or its rate jumps, so its
        acceleration is a delta function (an impulse of the apparent-mass force).  None by default."""
        return []

    def _value(self, t):
        raise NotImplementedError

    def _rate(self, t):
        raise NotImplementedError

    def _accel(self, t):
        raise NotImplementedError

    def __repr__(self):
        return f"<{type(self).__name__} {self.resolved()}>"


@register_law("constant")
class Constant(Law):
    """q(t) = value."""

    KEYS = ("value",)
    SCALED = ("value",)

    def _value(self, t):
        return np.full_like(t, self.scaled["value"])

    def _rate(self, t):
        return np.zeros_like(t)

    def _accel(self, t):
        return np.zeros_like(t)


@register_law("step")
class Step(Law):
    """q(t) = 0 before ``time``, ``value`` from ``time`` on.

    The rate and acceleration are zero everywhere: the impulse (and its
    derivative) that a true step carries at ``time`` is not represented, so a
    model that needs dq/dt sees the step only through the value.  For a
    physically finite rate use a ``ramp`` with a short ``duration``.
    """

    KEYS = ("value", "time")
    SCALED = ("value",)
    BOUNDS = {"time": (-TIME_LIMIT, TIME_LIMIT, "s")}

    def singular_times(self):
        return [float(self.spec["time"])] if self.scaled["value"] != 0.0 else []

    def _value(self, t):
        return np.where(t >= float(self.spec["time"]), self.scaled["value"], 0.0)

    def _rate(self, t):
        return np.zeros_like(t)

    def _accel(self, t):
        return np.zeros_like(t)


def logcosh(x):
    """ln(cosh x) without overflow: |x| + log1p(exp(-2|x|)) - ln 2 (vectorised)."""
    a = np.abs(x)
    return a + np.log1p(np.square(np.exp(-a))) - math.log(2.0)


def _sech2(x):
    """sech^2 x = 4 e^(-2|x|) / (1 + e^(-2|x|))^2, without overflow."""
    e = np.square(np.exp(-np.abs(x)))
    return 4.0 * e / (1.0 + e) ** 2


@register_law("ramp")
class Ramp(Law):
    """Ramp from ``from`` to ``to`` over ``duration`` seconds, beginning at ``start``.

    Sharp (``smoothing`` = 0): piecewise linear; the rate is the slope
    (to - from)/D on [t0, t1) and zero elsewhere, the acceleration zero (its
    impulses at the corners are not represented).

    Smoothed (``smoothing`` = sigma > 0, in seconds): the log-cosh rounded
    ramp used for canonical pitch ramps by J. D. Eldredge, C. Wang &
    M. V. Ol, AIAA 2009-3687 (2009)::

        q = q0 + (q1 - q0) [1/2 + sigma/(2 D) ln(cosh((t - t0)/sigma) / cosh((t - t1)/sigma))]

    with t1 = t0 + D.  It is evaluated as the sharp ramp plus a bounded
    correction, using ln cosh a = |a| + phi(a), phi(a) = log1p(e^(-2|a|)) - ln 2,
    and |a| - |b| = (2 clip(t - t0, 0, D) - D)/sigma, so that it returns
    exactly q0 and q1 far from the corners and differs from the sharp ramp by
    at most |q1 - q0| sigma ln 2 / (2 D).  Exact derivatives:
    dq/dt = (q1 - q0)(tanh a - tanh b)/(2 D) and
    d2q/dt2 = (q1 - q0)(sech^2 a - sech^2 b)/(2 D sigma), a = (t - t0)/sigma,
    b = (t - t1)/sigma.
    """

    KEYS = ("from", "to", "start", "duration")
    OPTIONAL = {"smoothing": 0.0}
    SCALED = ("from", "to")
    BOUNDS = {"start": (-TIME_LIMIT, TIME_LIMIT, "s"), "duration": (None, TIME_LIMIT, "s"),
              "smoothing": (None, TIME_LIMIT, "s")}

    @classmethod
    def check(cls, spec):
        if spec["duration"] <= 0:
            raise InputError("duration", f"must be above 0 s (and at most {TIME_LIMIT:g} s), got {spec['duration']}")
        if spec["smoothing"] < 0:
            raise InputError("smoothing", f"must be 0 (sharp corners) or a positive time in seconds, "
                                          f"got {spec['smoothing']}")
        if 0 < spec["smoothing"] < SMOOTHING_MIN:
            raise InputError("smoothing", f"must be 0 (sharp corners) or from {SMOOTHING_MIN:g} to "
                                          f"{TIME_LIMIT:g} s, got {spec['smoothing']:g}")

    def __init__(self, spec, context=LawContext()):
        super().__init__(spec, context)
        self.q0, self.q1 = self.scaled["from"], self.scaled["to"]
        self.t0 = float(self.spec["start"])
        self.D = float(self.spec["duration"])
        self.t1 = self.t0 + self.D
        self.sigma = float(self.spec["smoothing"])

    def singular_times(self):
        """The two corners, when they are sharp (smoothing 0) and the ramp moves."""
        return [self.t0, self.t1] if self.sigma == 0.0 and self.q1 != self.q0 else []

    def _value(self, t):
        f = np.clip(t - self.t0, 0.0, self.D) / self.D  # the sharp ramp, 0..1
        if self.sigma > 0.0:
            a, b = (t - self.t0) / self.sigma, (t - self.t1) / self.sigma
            phi_a = np.log1p(np.square(np.exp(-np.abs(a))))
            phi_b = np.log1p(np.square(np.exp(-np.abs(b))))
            f = f + self.sigma / (2.0 * self.D) * (phi_a - phi_b)
        return self.q0 * (1.0 - f) + self.q1 * f

    def _rate(self, t):
        dq = self.q1 - self.q0
        if self.sigma > 0.0:
            a, b = (t - self.t0) / self.sigma, (t - self.t1) / self.sigma
            return dq * (np.tanh(a) - np.tanh(b)) / (2.0 * self.D)
        u = t - self.t0  # the same test as the clip in _value, so value and rate agree at the corners
        return np.where((u >= 0.0) & (u < self.D), dq / self.D, 0.0)

    def _accel(self, t):
        if self.sigma > 0.0:
            a, b = (t - self.t0) / self.sigma, (t - self.t1) / self.sigma
            return (self.q1 - self.q0) * (_sech2(a) - _sech2(b)) / (2.0 * self.D * self.sigma)
        return np.zeros_like(t)


@register_law("sine")
class Sine(Law):
    """q(t) = mean + amplitude sin(omega t + phase).

    omega = 2 pi ``frequency`` (Hz), or omega = 2 U k / c from the
    ``reduced_frequency`` k = omega c / (2 U) (T. Theodorsen, NACA Report 496,
    1935).  ``phase`` is in degrees whatever the quantity.  Exact derivatives:
    amplitude omega cos(omega t + phase) and -amplitude omega^2 sin(omega t + phase).
    """

    KEYS = ("amplitude",)
    OPTIONAL = {"frequency": None, "reduced_frequency": None, "mean": 0.0, "phase": 0.0}
    SCALED = ("amplitude", "mean")
    BOUNDS = {"frequency": (None, FREQUENCY_LIMIT, "Hz"),
              "reduced_frequency": (None, REDUCED_FREQUENCY_LIMIT, "(k = omega c / (2 U))"),
              "phase": (-360.0, 360.0, "deg")}

    @classmethod
    def check(cls, spec):
        f, k = spec["frequency"], spec["reduced_frequency"]
        if (f is None) == (k is None):
            key = "frequency" if f is None else "reduced_frequency"
            raise InputError(key, "give exactly one of frequency (Hz) and reduced_frequency (k = omega c / (2 U))")
        if f is not None and f <= 0:
            raise InputError("frequency", f"must be above 0 Hz (and at most {FREQUENCY_LIMIT:g} Hz), got {f}")
        if k is not None and k <= 0:
            raise InputError("reduced_frequency", f"must be above 0 (and at most {REDUCED_FREQUENCY_LIMIT:g}), got {k}")

    def __init__(self, spec, context=LawContext()):
        super().__init__(spec, context)
        if self.spec.get("frequency") is not None:
            self.omega = 2.0 * math.pi * float(self.spec["frequency"])
        else:
            U, c = context.speed, context.chord
            if U is None or c is None or not (U > 0 and c > 0):
                raise InputError("reduced_frequency", "needs a valid flow speed and airfoil chord (omega = 2 U k / c); "
                                                      "or give frequency in Hz")
            self.omega = 2.0 * float(U) * float(self.spec["reduced_frequency"]) / float(c)
        self.A = self.scaled["amplitude"]
        self.q_mean = self.scaled["mean"]
        self.phi = math.radians(float(self.spec["phase"]))

    def _value(self, t):
        return self.q_mean + self.A * np.sin(self.omega * t + self.phi)

    def _rate(self, t):
        return self.A * self.omega * np.cos(self.omega * t + self.phi)

    def _accel(self, t):
        return -self.A * self.omega**2 * np.sin(self.omega * t + self.phi)


@register_law("table")
class Table(Law):
    """q(t) interpolated in a CSV table with columns ``t`` (s) and ``value``.

    ``interpolation = "monotone"`` (default): the shape-preserving piecewise
    cubic Hermite interpolant (F. N. Fritsch & R. E. Carlson, SIAM J. Numer.
    Anal. 17, 1980; scipy.interpolate.PchipInterpolator): it never overshoots
    the data (a table 0, 0, 10, 10 stays within 0..10) and its first derivative
    is continuous; its rate and acceleration are the interpolant's own exact
    derivatives.  ``interpolation = "linear"``: straight lines between the
    points, the rate piecewise constant and the acceleration zero inside each
    interval (the jumps of the rate at the points carry an apparent-mass
    impulse that this law does not supply: prefer "monotone" for loads).
    Before the first time and after the last the end values are held (rate
    and acceleration zero there).  Other columns are ignored; blank lines and
    lines starting with ``#`` are skipped.  ``value`` is in the quantity's
    scenario unit (degrees of pitch, metres of plunge).
    """

    KEYS = ("file",)
    OPTIONAL = {"interpolation": "monotone"}
    TEXT = ("file", "interpolation")
    INTERPOLATIONS = ("monotone", "linear")

    @classmethod
    def check(cls, spec):
        if not spec["file"].strip():
            raise InputError("file", "is empty; give the path of a CSV file with columns t and value")
        if spec["interpolation"] not in cls.INTERPOLATIONS:
            raise InputError("interpolation", f"must be one of {', '.join(map(repr, cls.INTERPOLATIONS))}, "
                                              f"got {spec['interpolation']!r}")

    def __init__(self, spec, context=LawContext()):
        super().__init__(spec, context)
        self.path = table_path(self.spec["file"], context.base_dir)
        t, q = read_table(self.path, {"t": "s", "value": "the quantity's scenario unit"})
        self.t_first, self.t_last = float(t[0]), float(t[-1])
        self.q_first, self.q_last = self.scale * float(q[0]), self.scale * float(q[-1])
        self._t, self._q = np.asarray(t, float), self.scale * np.asarray(q, float)
        if self.spec.get("interpolation", "monotone") == "monotone":
            from scipy.interpolate import PchipInterpolator
            self._curve = PchipInterpolator(self._t, self._q)
            self._d1 = self._curve.derivative(1)
            self._d2 = self._curve.derivative(2)
        else:
            self._curve = lambda x: np.interp(x, self._t, self._q)
            slopes = np.diff(self._q) / np.diff(self._t)
            self._d1 = lambda x: slopes[np.clip(np.searchsorted(self._t, x, side="right") - 1,
                                                0, slopes.size - 1)]
            self._d2 = lambda x: np.zeros(np.shape(x))

    def singular_times(self):
        """Linear interpolation: every point where the slope changes (and the ends, where it
        stops); the monotone cubic has a continuous rate."""
        if self.spec.get("interpolation", "monotone") == "monotone":
            return []
        slopes = np.r_[0.0, np.diff(self._q) / np.diff(self._t), 0.0]
        return [float(ti) for ti, a, b in zip(self._t, slopes[:-1], slopes[1:]) if a != b]

    def _inside(self, t):
        return (t >= self.t_first) & (t <= self.t_last)

    def _value(self, t):
        tc = np.clip(t, self.t_first, self.t_last)
        return self._curve(tc)

    def _rate(self, t):
        return np.where(self._inside(t), self._d1(np.clip(t, self.t_first, self.t_last)), 0.0)

    def _accel(self, t):
        return np.where(self._inside(t), self._d2(np.clip(t, self.t_first, self.t_last)), 0.0)


class SumLaw(Law):
    """The sum of several laws (a scenario's list of law tables): value and derivatives add."""

    name = "sum"

    def __init__(self, laws):
        super().__init__({}, laws[0].context if laws else LawContext())
        self.laws = list(laws)

    def resolved(self):
        """The list of law tables, defaults filled in."""
        return [law.resolved() for law in self.laws]

    def singular_times(self):
        return sorted({ti for law in self.laws for ti in law.singular_times()})

    def _value(self, t):
        return sum((law._value(t) for law in self.laws), np.zeros_like(t))

    def _rate(self, t):
        return sum((law._rate(t) for law in self.laws), np.zeros_like(t))

    def _accel(self, t):
        return sum((law._accel(t) for law in self.laws), np.zeros_like(t))

    def __repr__(self):
        return f"<SumLaw {self.resolved()}>"


# ----------------------------------------------------------------------------
# building and checking


def _allowed_laws():
    return ", ".join(LAWS)


def _is_number(v):
    return isinstance(v, numbers.Real) and not isinstance(v, (bool, np.bool_))


def _nearest(word, choices):
    near = difflib.get_close_matches(str(word), list(choices), n=1, cutoff=0.6)
    return near[0] if near else None


def _one(spec, context, *, stop_early):
    """Check and build one law table: (problems, law or None)."""
    if not isinstance(spec, Mapping):
        return [InputError("law", f"expected a law table like {{ law = \"ramp\", ... }}, got {type(spec).__name__}")], None
    name = spec.get("law")
    if name is None:
        return [InputError("law", f"missing: say which law, one of {_allowed_laws()}")], None
    if not isinstance(name, str) or name not in LAWS:
        near = _nearest(name, LAWS) if isinstance(name, str) else None
        hint = f" (did you mean '{near}'?)" if near else ""
        return [InputError("law", f"unknown law '{name}'{hint}; allowed: {_allowed_laws()}")], None
    cls = LAWS[name]
    known = (*cls.KEYS, *cls.OPTIONAL)
    problems = []
    for key in spec:
        if key == "law":
            continue
        if key not in known:
            near = _nearest(key, known)
            hint = f" (did you mean '{near}'?)" if near else ""
            problems.append(InputError(str(key), f"unknown key for the '{name}' law{hint}; allowed: {', '.join(known)}"))
            continue
        v = spec[key]
        if key in cls.TEXT:
            if not isinstance(v, str):
                problems.append(InputError(key, f"expected text{' (a file path)' if key == 'file' else ''}, got {v!r}"))
        elif not _is_number(v):
            got = f"the text '{v}'" if isinstance(v, str) else repr(v)
            problems.append(InputError(key, f"expected a number, got {got}"))
        elif not math.isfinite(v):
            problems.append(InputError(key, f"must be a finite number, got {v}"))
    for key in cls.KEYS:
        if key not in spec:
            problems.append(InputError(key, f"missing; the '{name}' law needs {', '.join(cls.KEYS)}"))
    if problems:
        return (problems[:1] if stop_early else problems), None
    full = {key: spec[key] for key in cls.KEYS}
    full.update({key: spec.get(key, default) for key, default in cls.OPTIONAL.items()})
    try:
        cls.check(full)
        _bounded(cls, full, context)
        law = cls(full, context)
        if context.limit is not None and isinstance(law, Table):
            _table_bounded(law, context)
        return [], law
    except InputError as exc:
        return [exc], None


def _range_text(lo, hi, unit):
    u = f" {unit}" if unit else ""
    if lo is None:
        return f"at most {hi:g}{u}"
    return f"from {lo:g} to {hi:g}{u}"


def _bounded(cls, full, context):
    """The base's range rules: each BOUNDS key within its range, each SCALED key within the
    context's limit (when given); raises InputError with the range in the message."""
    for key, (lo, hi, unit) in cls.BOUNDS.items():
        v = full.get(key)
        if v is None:
            continue
        if (lo is not None and v < lo) or v > hi:
            raise InputError(key, f"must be {_range_text(lo, hi, unit)}, got {v:g}")
    if context.limit is not None:
        top, unit = context.limit
        for key in cls.SCALED:
            v = full.get(key)
            if v is not None and abs(v) > top:
                raise InputError(key, f"must be {_range_text(-top, top, unit)}, got {v:g}")


def _table_bounded(law, context):
    """A table's times within +-TIME_LIMIT and its values within the context's limit."""
    top, unit = context.limit
    if law.t_first < -TIME_LIMIT or law.t_last > TIME_LIMIT:
        raise InputError("file", f"{law.path}: times must be {_range_text(-TIME_LIMIT, TIME_LIMIT, 's')}, "
                                 f"got {law.t_first:g} to {law.t_last:g}")
    q = np.abs(law._q) / (law.scale if law.scale else 1.0)
    if q.size and float(np.max(q)) > top:
        raise InputError("file", f"{law.path}: values must be {_range_text(-top, top, unit)}, "
                                 f"got {float(np.max(q)):g} in magnitude")


def _all(spec, context, *, stop_early):
    """Check and build a law table or list of them: (problems, law or None)."""
    if isinstance(spec, (list, tuple)):
        if not spec:
            return [InputError("law", f"the list of laws is empty; give at least one, e.g. "
                                      f"{{ law = \"constant\", value = 0 }}")], None
        problems, laws = [], []
        for i, item in enumerate(spec):
            found, law = _one(item, context, stop_early=stop_early)
            problems += [InputError(f"[{i}].{e.key}", e.message) for e in found]
            if stop_early and problems:
                return problems, None
            laws.append(law)
        return (problems, None) if problems else ([], SumLaw(laws))
    return _one(spec, context, stop_early=stop_early)


def build_law(spec, *, scale=1.0, speed=None, chord=None, base_dir=None) -> Law:
    """Build a motion law from its scenario table, or the sum of a list of tables.

    Parameters
    ----------
    spec : dict or list of dict
        ``{"law": "ramp", "from": 0, "to": 20, "start": 0.05, "duration": 0.1}``
        or a list of such tables, which are summed (:class:`SumLaw`).
    scale : float, optional
        Scenario unit -> returned unit of the moved quantity: pi/180 for pitch
        (degrees in, radians out), 1 for plunge (metres).
    speed, chord : float, optional
        Flight speed U (m/s) and chord c (m); needed only for a
        ``reduced_frequency`` (omega = 2 U k / c).
    base_dir : pathlib.Path, optional
        Folder that a table's relative ``file`` is taken from.

    Returns
    -------
    Law

    Raises
    ------
    InputError
        The first problem found, keyed relative to the law table (``"duration"``),
        or to the list (``"[1].duration"``): an unknown law or key (with the
        nearest valid name), a missing key, a value of the wrong type
        (booleans are not numbers), a number that is not finite or out of
        range, a bad table file.
    """
    context = LawContext(scale=float(scale), speed=speed, chord=chord,
                         base_dir=None if base_dir is None else pathlib.Path(base_dir))
    problems, law = _all(spec, context, stop_early=True)
    if problems:
        raise problems[0]
    return law


def law_problems(spec, *, speed=None, chord=None, base_dir=None, limit=None) -> list[InputError]:
    """Every problem of a law table (or list of them), without raising.

    Same checks and keys as :func:`build_law`, collected: all key and type
    problems of each table, or else its first rule problem (and, for a table
    file or a reduced frequency, the problem of building it).  An empty list
    means :func:`build_law` will succeed with the same arguments.  ``limit``
    = (largest magnitude, unit) of the moved quantity in its scenario unit
    bounds the SCALED keys and a table's values too.
    """
    context = LawContext(scale=1.0, speed=speed, chord=chord,
                         base_dir=None if base_dir is None else pathlib.Path(base_dir), limit=limit)
    problems, _ = _all(spec, context, stop_early=False)
    return problems


def _zero():
    return Constant({"value": 0.0})


@dataclass(frozen=True)
class Kinematics:
    """Prescribed pitch and plunge of the airfoil.

    Parameters
    ----------
    pivot : float
        Pitch axis, fraction of chord aft of the leading edge.
    pitch : Law, optional
        alpha(t) in radians, positive nose-up; zero if omitted.
    plunge : Law, optional
        h(t) in metres, positive up; zero if omitted.
    """

    pivot: float
    pitch: Law | None = None
    plunge: Law | None = None

    def __post_init__(self):
        if not _is_number(self.pivot) or not math.isfinite(self.pivot):
            raise InputError("pivot", f"must be a finite number (fraction of chord aft of the leading edge), "
                                      f"got {self.pivot!r}")
        if self.pitch is None:
            object.__setattr__(self, "pitch", _zero())
        if self.plunge is None:
            object.__setattr__(self, "plunge", _zero())

    def state(self, t):
        """(alpha, alpha_dot, h, h_dot) at time(s) t: rad, rad/s, m, m/s."""
        return self.pitch.value(t), self.pitch.rate(t), self.plunge.value(t), self.plunge.rate(t)

    def singular_times(self):
        """Times (s) at which pitch or plunge changes instantly (see :meth:`Law.singular_times`)."""
        return sorted(set(self.pitch.singular_times()) | set(self.plunge.singular_times()))

    def accel(self, t):
        """(alpha_ddot, h_ddot) at time(s) t: rad/s^2, m/s^2."""
        return self.pitch.accel(t), self.plunge.accel(t)
