"""Load and validate scenario files (TOML or dicts), fill defaults, apply overrides.

Every check happens here, once, at the boundary: the rest of the package
trusts a :class:`Scenario`.  Problems are collected (not stopped at the
first) and reported one line each as ``error: <file>: <key>: <message>``.

Extra sections (``[gust]``, ``[aircraft]``, ``[sweep]``) are checked by the
modules that own them through :func:`register_section`.
"""

from __future__ import annotations

import copy
import dataclasses
import math
import tomllib
from dataclasses import dataclass, field
from functools import cached_property
from pathlib import Path

from ..core.errors import InputError
from .checks import (_SECTIONS, Problem, ScenarioError, _is_number, choice, integer,  # noqa: F401
                     number, register_section, text, unknown_keys)
from .flap import FLAP_HINGE_RANGE


def _load_plugins():
    # Importing these modules registers their sections.
    from . import aircraft, ground, gusts, sweep  # noqa: F401


CORE_SECTIONS = ("title", "flow", "airfoil", "motion", "run", "output")
RUN_MODELS = ("vortex", "linear")   # [run] model; unsteady.simulation.models registers one function each


STEPS_PER_PERIOD = 120
#: Steps across a ramp's smoothing time (see :func:`default_dt`).
STEPS_PER_SMOOTHING = 32

#: Allowed ranges of the flight condition and the section (physically meaningful
#: for a low-speed, incompressible section model of a small aircraft or rig).
SPEED_RANGE = (0.01, 340.0)       # m/s
DENSITY_RANGE = (0.01, 2.0)       # kg/m^3
CHORD_RANGE = (1e-3, 20.0)        # m
PITCH_LIMIT_DEG = 180.0           # |pitch| of a motion law: a half turn either way
PLUNGE_LIMIT_CHORDS = 100.0       # |plunge| of a motion law, chords
RUN_DURATION_LIMIT = 3600.0       # s: an hour of flight
RUN_CHORDS_LIMIT = 1.0e5          # chord lengths travelled
DT_RANGE = (1e-7, 10.0)           # s
FAR_WAKE_LIMIT = RUN_CHORDS_LIMIT  # chords: as far as the longest run flies (nothing merged)
CORE_RADIUS_LIMIT = 0.5           # chords: a vortex core no wider than the section


def memory_estimate(steps, elements):
    """Bytes a vortex run of ``steps`` steps and ``elements`` elements holds at its peak (an
    upper estimate: history ~30 columns, the pressure jump per element, wake arrays of
    up to one vortex per step, snapshots of up to 200 wakes)."""
    rows = steps + 1
    return int(rows * 30 * 8 + rows * elements * 4 + (elements + rows) * 12 * 8 + 200 * min(rows, 2e5) * 12)


from .checks import available_memory  # noqa: E402  (tests replace scenario.available_memory)
DEFAULT_FAR_WAKE = 30.0   # chords


def default_dt(chord, speed, elements, frequency=0.0, smoothing=0.0):
    """Default time step (s).

    The air travels one mean element length per step, U dt = c / N; with the
    shed vortex at 0.3 of the last step's travel this reproduces the Wagner
    function within 0.2 % from 20 to 160 elements (tests/validation).  A
    faster sinusoidal motion also gets at least 120 steps per period
    (common practice; Theodorsen's lift at k = 2 is then within 1 %).  A
    ramp rounded over a smoothing time sigma gets at least 32 steps across
    it: its apparent-mass force follows the pitch acceleration, which rises
    and falls within sigma, and the pressure route's difference of the
    potential jump is first-order in dt; measured on the bundled scenarios,
    the moment peaks then move by under 1.5 % when dt is halved (they moved
    by 3 % at 3.6 steps per sigma, tests/test_convergence.py).
    """
    dt = chord / (speed * elements)
    if frequency > 0.0:
        dt = min(dt, 1.0 / (STEPS_PER_PERIOD * frequency))
    if smoothing > 0.0:
        dt = min(dt, smoothing / STEPS_PER_SMOOTHING)
    return dt


def shortest_smoothing(spec):
    """Shortest positive ``smoothing`` (s) of the ramp laws in a motion-law spec (or list); 0 if none."""
    if isinstance(spec, list):
        return min((x for x in map(shortest_smoothing, spec) if x > 0.0), default=0.0)
    if isinstance(spec, dict) and spec.get("law") == "ramp" and _is_number(spec.get("smoothing")):
        return max(float(spec["smoothing"]), 0.0)
    return 0.0


def fastest_frequency(spec, speed, chord):
    """Highest frequency (Hz) of the sine laws in a motion-law spec (or list)."""
    if isinstance(spec, list):
        return max([fastest_frequency(s, speed, chord) for s in spec] + [0.0])
    if not isinstance(spec, dict) or spec.get("law") != "sine":
        return 0.0
    if _is_number(spec.get("frequency")):
        return abs(float(spec["frequency"]))
    k = spec.get("reduced_frequency")
    if _is_number(k) and speed and chord:
        return abs(float(k)) * speed / (math.pi * chord)   # omega = 2 U k / c
    return 0.0


# --------------------------------------------------------------------------

@dataclass(frozen=True)
class Scenario:
    """A checked scenario: ``data`` is the fully resolved dict (file units:
    degrees, metres, seconds); the properties give SI/radian values."""

    data: dict
    source: str = "<dict>"
    base_dir: Path = field(default_factory=Path.cwd)
    # the input as given (after --set overrides, before defaults were filled):
    # sweeps re-resolve each case from it so derived defaults (dt, density) follow
    raw: dict = field(default=None, compare=False, repr=False)
    #: ``warning: <file>: <key>: <message>`` lines from the checks (the run goes ahead).
    warnings: tuple = field(default=(), compare=False)

    # -- plain values
    @property
    def title(self):
        return self.data.get("title", "")

    @property
    def speed(self):
        return self.data["flow"]["speed"]

    @property
    def density(self):
        return self.data["flow"]["density"]

    @property
    def chord(self):
        return self.data["airfoil"]["chord"]

    @property
    def elements(self):
        return self.data["airfoil"]["elements"]

    @property
    def pivot(self):
        """The pitch axis (fraction of the first chord): with pitch freedom the centre of gravity."""
        ac = self.data.get("aircraft") or {}
        return ac["cg"] if "cg" in ac else self.data["motion"]["pivot"]

    @property
    def dt(self):
        return self.data["run"]["dt"]

    @property
    def duration(self):
        return self.data["run"]["duration"]

    @property
    def steps(self):
        return int(math.ceil(self.duration / self.dt - 1e-9))

    @cached_property
    def section(self):
        from .sections import section_from_shape
        return section_from_shape(self.data["airfoil"]["shape"], self.base_dir)

    @cached_property
    def flap_law(self):
        """beta(t) (rad, trailing edge down) of ``[motion] flap``; a zero law with only
        ``[airfoil] flap_hinge``; None without a flap."""
        if "flap_hinge" not in self.data["airfoil"]:
            return None
        from .motion import build_law
        spec = self.data["motion"].get("flap", {"law": "constant", "value": 0.0})
        return build_law(spec, scale=math.pi / 180.0, speed=self.speed, chord=self.chord,
                         base_dir=self.base_dir)

    @cached_property
    def kinematics(self):
        from .motion import Kinematics, build_law
        mo = self.data["motion"]
        kw = dict(speed=self.speed, chord=self.chord, base_dir=self.base_dir)
        pitch = build_law(mo.get("pitch", {"law": "constant", "value": 0.0}), scale=math.pi / 180.0, **kw)
        plunge = build_law(mo.get("plunge", {"law": "constant", "value": 0.0}), scale=1.0, **kw)
        return Kinematics(mo["pivot"], pitch, plunge)

    def out_dir(self):
        return Path(self.data["output"]["dir"])

    def to_toml(self) -> str:
        """The resolved scenario as TOML, loadable again (gives the same run)."""
        import tomli_w
        data = copy.deepcopy(self.data)
        if "chords" in data.get("run", {}):
            data["run"].pop("duration", None)    # exactly one of the two may be given
        if "_more" in data.get("airfoil", {}):   # [[airfoil]]: the list as given
            more = data["airfoil"].pop("_more")
            data["airfoil"] = [data["airfoil"]] + more
        if "altitude" in data.get("flow", {}):
            data["flow"].pop("density", None)
        return tomli_w.dumps(_tomlable(data))

    def with_overrides(self, overrides):
        """A new scenario with ``key.path=value`` overrides applied to the input
        as given (so derived defaults such as dt follow) and re-checked."""
        raw = copy.deepcopy(self.raw if self.raw is not None else self.data)
        apply_overrides(raw, overrides)
        return load_scenario(raw, source_name=self.source, base_dir=self.base_dir)


def _tomlable(d):
    if isinstance(d, dict):
        return {k: _tomlable(v) for k, v in d.items() if v is not None and not k.startswith("_")}
    if isinstance(d, (list, tuple)):
        return [_tomlable(v) for v in d]
    return d


def parse_override(text_):
    """``"a.b=1"`` -> ("a.b", 1): the value is read as TOML, else kept as text."""
    if "=" not in text_:
        raise InputError(text_, "an override must look like key.path=value")
    key, val = text_.split("=", 1)
    key = key.strip()
    if not key or any(not p for p in key.split(".")):
        raise InputError(text_, "an override must look like key.path=value")
    try:
        value = tomllib.loads(f"v = {val.strip()}")["v"]
    except tomllib.TOMLDecodeError:
        value = val.strip()
    return key, value


# Pairs of keys of which a scenario gives exactly one: overriding one drops the other.
EITHER_OR = (("run.duration", "run.chords"), ("flow.density", "flow.altitude"))


def apply_overrides(raw, overrides):
    """Apply overrides (list of ``"k=v"`` texts or a dict of dotted keys) in place.

    Setting one key of an :data:`EITHER_OR` pair (``run.chords`` for a
    scenario that gave ``run.duration``, say) removes the other.
    """
    items = list(overrides.items() if isinstance(overrides, dict)
                 else (parse_override(o) for o in overrides or ()))
    keys = {k for k, _ in items}
    for a, b in EITHER_OR:
        for this, other in ((a, b), (b, a)):
            if this in keys and other not in keys:
                sec, k = other.split(".")
                if isinstance(raw.get(sec), dict):
                    raw[sec].pop(k, None)
    for key, value in items:
        parts = key.split(".")
        node = raw
        for i, p in enumerate(parts[:-1]):
            nxt = node.get(p)
            if isinstance(nxt, list):
                raise InputError(key, f"'{'.'.join(parts[:i + 1])}' is a list (of laws or gusts); a key "
                                      "inside a list cannot be set: override the whole list")
            if not isinstance(nxt, dict):
                if nxt is not None and not isinstance(nxt, dict):
                    raise InputError(key, f"'{'.'.join(parts[:i + 1])}' is not a table")
                nxt = node[p] = {}
            node = nxt
        node[parts[-1]] = value
    return raw


def read_toml(path):
    """Read a TOML file; InputError with the line for syntax errors."""
    path = Path(path)
    try:
        with open(path, "rb") as f:
            return tomllib.load(f)
    except FileNotFoundError:
        raise InputError("-", "no such file") from None
    except IsADirectoryError:
        raise InputError("-", "is a folder, not a scenario file") from None
    except OSError as exc:
        raise InputError("-", f"cannot be read ({exc.strerror})") from None
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise InputError("-", f"is not valid TOML ({exc})") from None


def load_scenario(source, overrides=None, *, source_name=None, base_dir=None, source_label=None, **kw):
    """Load, check and resolve a scenario.

    Parameters
    ----------
    source : str, Path or dict
        A TOML file or an already parsed dict.
    overrides : list of str or dict, optional
        ``"key.path=value"`` texts (as ``--set``) or a dict of dotted keys.

    Returns
    -------
    Scenario

    Raises
    ------
    ScenarioError
        With every problem found, one line each.
    """
    if isinstance(source, dict):
        raw = copy.deepcopy(source)
        name = source_name or "<dict>"
        base = Path(base_dir) if base_dir else Path.cwd()
        stem = "scenario"
    else:
        path = Path(source)
        name = source_name or str(source)
        base = Path(base_dir) if base_dir else path.resolve().parent
        stem = path.stem
        try:
            raw = read_toml(path)
        except InputError as e:
            raise ScenarioError([Problem(name, e.key, e.message)]) from None
    if overrides:
        try:
            apply_overrides(raw, overrides)
        except InputError as e:
            raise ScenarioError([Problem(name, f"--set {e.key}", e.message)]) from None
    data, errors = resolve(raw, base, stem)
    if errors:
        raise ScenarioError([Problem(name, e.key, e.message) for e in errors])
    found = list(data.pop("_warnings", ()))
    sc = Scenario(data=data, source=name, base_dir=base, raw=copy.deepcopy(raw))
    from .estimates import estimate_warnings      # it reads the gust registry, filled below this module
    found += estimate_warnings(sc)
    return dataclasses.replace(sc, warnings=tuple(f"warning: {name}: {w.key}: {w.message}" for w in found))


def one_per_problem(errors, not_tables=()):
    """The errors less those another one already explains: the keys of a section that is not a
    table, and a key reported missing that the "did you mean" of a misspelt key names."""
    import re
    meant = set()
    for e in errors:
        m = re.search(r"did you mean '([^']+)'", e.message)
        if m and "unknown key" in e.message:
            meant.add(e.key.rsplit(".", 1)[0] + "." + m.group(1) if "." in e.key else m.group(1))
    implied = ("is required", "missing", "give exactly one")
    return [e for e in errors
            if not any(e.key.startswith(sec + ".") for sec in not_tables)
            and not (any(e.key == k or e.key.startswith(k + ".") for k in meant)
                     and e.message.startswith(implied))]


def resolve(raw, base_dir, stem="scenario"):
    """Check ``raw`` and return (resolved dict, list of InputError)."""
    _load_plugins()
    errors = []
    out = {}
    warn_list = []                           # warnings of the core sections' checks (InputError)

    def grab(fn, *a, **k):
        try:
            return fn(*a, **k)
        except InputError as e:
            errors.append(e)
            return None

    allowed = set(CORE_SECTIONS) | set(_SECTIONS)
    errors += unknown_keys(raw, allowed, "")
    not_tables = []
    further = None                           # [[airfoil]]: the raw tables after the first
    if isinstance(raw.get("airfoil"), list):
        items = raw["airfoil"]
        if not items or not isinstance(items[0], dict):
            errors.append(InputError("airfoil", "[[airfoil]] needs at least one table, the reference element"))
            raw = {**raw, "airfoil": {}}
            not_tables.append("airfoil")
        else:
            further = list(items[1:])
            raw = {**raw, "airfoil": items[0]}
    for sec in ("flow", "airfoil", "motion", "run", "output"):
        if sec in raw and not isinstance(raw[sec], dict):
            errors.append(InputError(sec, "must be a table ([" + sec + "])"))
            raw = {**raw, sec: {}}
            not_tables.append(sec)
    if "title" in raw:
        out["title"] = grab(text, "title", raw["title"])

    # [flow]
    fl = raw.get("flow", {})
    errors += unknown_keys(fl, {"speed", "density", "altitude"}, "flow.")
    flow = {}
    if "speed" not in fl:
        errors.append(InputError("flow.speed", "is required (m/s, > 0)"))
    else:
        flow["speed"] = grab(number, "flow.speed", fl["speed"], ge=SPEED_RANGE[0], le=SPEED_RANGE[1],
                             unit="m/s (an incompressible model: below the speed of sound)")
    if ("density" in fl) == ("altitude" in fl):
        errors.append(InputError("flow.density", "give exactly one of flow.density (kg/m^3) or flow.altitude (m, standard atmosphere)"))
    elif "density" in fl:
        flow["density"] = grab(number, "flow.density", fl["density"], ge=DENSITY_RANGE[0], le=DENSITY_RANGE[1],
                               unit="kg/m^3 (air: 1.225 at sea level, 0.09 at 20 km)")
    else:
        alt = grab(number, "flow.altitude", fl["altitude"], unit="m")
        if alt is not None:
            from . import atmosphere
            try:
                flow["density"] = float(atmosphere.density(alt))
                flow["altitude"] = alt
            except ValueError as exc:
                errors.append(InputError("flow.altitude", str(exc)))
    out["flow"] = flow

    # [airfoil]
    af = raw.get("airfoil", {})
    if "panels" in af:
        errors.append(InputError("airfoil.panels", "was renamed: write airfoil.elements (vortex elements on "
                                                   "the camber line, 4 to 1000)"))
        af = {k: v for k, v in af.items() if k != "panels"}
    if "flap_deflection" in af:              # a further element's key (inputs.elements)
        errors.append(InputError("airfoil.flap_deflection", "is for a further element's flap; the first "
                                                            "element's flap follows motion.flap: give "
                                                            "motion.flap = { law = \"constant\", value = ... }"))
        af = {k: v for k, v in af.items() if k != "flap_deflection"}
    errors += unknown_keys(af, {"shape", "chord", "elements", "lesp_critical", "thick", "flap_hinge"}, "airfoil.")
    airfoil = {"shape": af.get("shape", "flat")}
    if "chord" not in af:
        errors.append(InputError("airfoil.chord", "is required (m, > 0)"))
    else:
        airfoil["chord"] = grab(number, "airfoil.chord", af["chord"], ge=CHORD_RANGE[0], le=CHORD_RANGE[1], unit="m")
    airfoil["elements"] = grab(integer, "airfoil.elements", af.get("elements", 40), ge=4, le=1000)
    section = None
    if grab(text, "airfoil.shape", airfoil["shape"]) is not None:
        from .sections import section_from_shape
        try:
            section = section_from_shape(airfoil["shape"], base_dir)
        except InputError as e:
            errors.append(InputError("airfoil.shape", e.message))
    if "lesp_critical" in af:
        # the critical leading-edge suction parameter (Ramesh et al., J. Fluid Mech. 751, 2014)
        airfoil["lesp_critical"] = grab(number, "airfoil.lesp_critical", af["lesp_critical"], gt=0.0,
                                        unit="(critical leading-edge suction parameter; about 0.1-0.3 "
                                             "for thin sections at low Reynolds numbers)")
    if "flap_hinge" in af:
        airfoil["flap_hinge"] = grab(number, "airfoil.flap_hinge", af["flap_hinge"], gt=FLAP_HINGE_RANGE[0],
                                     lt=FLAP_HINGE_RANGE[1], unit="(fraction of chord aft of the leading edge)")
    if "thick" in af:                      # surface panels (inputs.thick); absent: as before
        from .thick import check_thick
        thick, errs = check_thick(af, airfoil, raw.get("run", {}), section)
        errors += errs
    if further is not None:                  # several elements (inputs.elements)
        from .elements import check_further_elements
        more, errs = check_further_elements(further, base_dir, CHORD_RANGE, warn_list)
        errors += errs
        if (raw.get("run", {}) if isinstance(raw.get("run"), dict) else {}).get("model") == "linear":
            errors.append(InputError("airfoil", "several elements ([[airfoil]]) need run.model = \"vortex\": "
                                                "the linear model is one thin airfoil alone"))
        airfoil["_more"] = more
        # leading-edge shedding and surface panels in one list: not supported (the soft core through which
        # leading-edge vortices meet the bodies is tied to camber-line elements)
        shedding = ([] if airfoil.get("thick") else
                    (["airfoil.lesp_critical"] if airfoil.get("lesp_critical") is not None else [])) + [
            f"airfoil[{j}].lesp_critical" for j, el in enumerate(more, start=1) if el.get("lesp_critical") is not None]
        if shedding and (airfoil.get("thick") or any(el.get("thick") for el in more)):
            errors.append(InputError(shedding[0], "leading-edge shedding is not available in a list with a thick "
                                                  "element (surface panels): leave lesp_critical out, or set every "
                                                  "element's thick = false"))
    out["airfoil"] = airfoil

    speed = flow.get("speed")
    chord = airfoil.get("chord")
    elements = airfoil.get("elements")
    # the time step follows the chordwise spacing: with surface panels, half of them per surface
    step_elements = elements // 2 if airfoil.get("thick") and elements else elements

    # [motion]
    mo = raw.get("motion", {})
    errors += unknown_keys(mo, {"pivot", "pitch", "plunge", "flap"}, "motion.")
    motion = {"pivot": grab(number, "motion.pivot", mo.get("pivot", 0.25), ge=-0.5, le=1.5,
                            unit="(fraction of chord aft of the leading edge)")}
    from .motion import law_problems
    n_before_motion = len(errors)
    for q in ("pitch", "plunge", "flap"):
        if q in mo:
            spec = mo[q]
            if not isinstance(spec, (dict, list)):
                errors.append(InputError(f"motion.{q}", "must be a law table like { law = \"sine\", ... } or a list of them"))
                continue
            limit = {"pitch": (PITCH_LIMIT_DEG, "deg"),
                     "plunge": (PLUNGE_LIMIT_CHORDS * chord, f"m ({PLUNGE_LIMIT_CHORDS:g} chords)")
                     if chord else None}.get(q)          # the flap has its own limit (inputs/flap.py)
            for e in law_problems(spec, speed=speed, chord=chord, base_dir=base_dir, limit=limit):
                k = e.key if e.key.startswith("[") else "." + e.key
                errors.append(InputError(f"motion.{q}{k}", e.message))
            motion[q] = spec
    if "flap" in motion and "flap_hinge" not in af:
        errors.append(InputError("motion.flap", "needs a flap: give airfoil.flap_hinge (fraction of chord, "
                                                f"{FLAP_HINGE_RANGE[0]:g} to {FLAP_HINGE_RANGE[1]:g}) or remove "
                                                "motion.flap"))
    out["motion"] = motion
    motion_errors = errors[n_before_motion:]      # a refused law gives no default step

    # [run]
    ru = raw.get("run", {})
    run_keys = {"duration", "chords", "dt", "wake", "start", "model", "shed_offset",
                "core_radius", "far_wake"}
    errors += unknown_keys(ru, run_keys, "run.")
    run = {}
    if ("duration" in ru) == ("chords" in ru):
        errors.append(InputError("run.duration", "give exactly one of run.duration (s) or run.chords (chord lengths travelled)"))
    elif "duration" in ru:
        run["duration"] = grab(number, "run.duration", ru["duration"], gt=0.0, le=RUN_DURATION_LIMIT, unit="s")
    else:
        ch = grab(number, "run.chords", ru["chords"], gt=0.0, le=RUN_CHORDS_LIMIT)
        if ch is not None:
            run["chords"] = ch
            if speed and chord:
                run["duration"] = ch * chord / speed
    if "dt" in ru:
        run["dt"] = grab(number, "run.dt", ru["dt"], ge=DT_RANGE[0], le=DT_RANGE[1], unit="s")
    elif speed and chord and step_elements and len(motion_errors) == 0:
        f_max = max(fastest_frequency(mo.get(q), speed, chord) for q in ("pitch", "plunge", "flap"))
        sigma = min((x for x in (shortest_smoothing(mo.get(q)) for q in ("pitch", "plunge", "flap"))
                     if x > 0.0), default=0.0)
        run["dt"] = default_dt(chord, speed, step_elements, f_max, sigma)
    run["wake"] = grab(choice, "run.wake", ru.get("wake", "free"), ["free", "frozen"])
    run["start"] = grab(choice, "run.start", ru.get("start", "steady"), ["steady", "impulsive"])
    run["model"] = grab(choice, "run.model", ru.get("model", "vortex"), RUN_MODELS)
    if "lesp_critical" in af and run["model"] == "linear":
        errors.append(InputError("airfoil.lesp_critical", "needs run.model = \"vortex\": the linear model "
                                 "keeps the flow attached and cannot shed from the leading edge; remove "
                                 "airfoil.lesp_critical or run the vortex model"))
    run["shed_offset"] = grab(number, "run.shed_offset", ru.get("shed_offset", 0.3), ge=0.05, le=1.0)
    if "core_radius" in ru:
        run["core_radius"] = grab(number, "run.core_radius", ru["core_radius"], gt=0.0,
                                  le=CORE_RADIUS_LIMIT * chord if chord else None,
                                  unit=f"m (at most {CORE_RADIUS_LIMIT:g} chord)")
    # Beyond far_wake chords the wake is merged chord by chord into lumps that
    # drift with the air (solver.VortexSolver): in 10 s of turbulence, 20-40
    # chords changed the peak load factor by about 1e-5 (tools/bench_gusts.py)
    run["far_wake"] = grab(number, "run.far_wake", ru.get("far_wake", DEFAULT_FAR_WAKE), gt=1.0,
                           le=FAR_WAKE_LIMIT,
                           unit="chords (distance behind the airfoil beyond which the wake is merged)")
    if run.get("duration") and run.get("dt"):
        steps = run["duration"] / run["dt"]
        if steps > 5e6:
            errors.append(InputError("run.dt", f"gives {steps:.3g} steps; at most 5e6 are allowed: shorten run.duration or raise run.dt"))
        elif steps < 1:
            errors.append(InputError("run.dt", "is longer than the run itself: lower run.dt or lengthen run.duration"))
    if not errors and run.get("duration") and run.get("dt") and elements:
        # thick sections keep Cp per panel and the lower-minus-upper difference per station
        need = memory_estimate(int(math.ceil(run["duration"] / run["dt"])),
                               elements * 5 // 2 if airfoil.get("thick") else elements)
        have = available_memory()
        if have and need > 0.5 * have:
            errors.append(InputError("run.dt", f"the run would need about {need / 2**30:.3g} GiB of memory "
                                               f"(history, wake and snapshots), over half of the "
                                               f"{have / 2**30:.3g} GiB this machine has: shorten run.duration, "
                                               f"raise run.dt or use fewer airfoil.elements"))
    out["run"] = run

    # [output]
    ou = raw.get("output", {})
    errors += unknown_keys(ou, {"dir", "snapshot_every", "plots"}, "output.")
    output = {"dir": grab(text, "output.dir", ou.get("dir", f"runs/{stem}")),
              "snapshot_every": grab(number, "output.snapshot_every", ou.get("snapshot_every", 0.0), ge=0.0,
                                     unit="s (time between wake snapshots; 0 picks about 200 over the run)"),
              "plots": ou.get("plots", True)}
    if not isinstance(output["plots"], bool):
        errors.append(InputError("output.plots", f"must be true or false, got {output['plots']!r}"))
    out["output"] = output

    # registered sections
    ctx = dict(out)
    ctx["_base_dir"] = base_dir
    ctx["_warnings"] = list(warn_list)   # checkers append InputError(key, message) for warnings
    for name, checker in _SECTIONS.items():
        if name in raw:
            value, errs = checker(raw[name], ctx)
            errors += errs
            out[name] = value
            ctx[name] = value          # a later section may depend on an earlier one (gust on aircraft)
    if not errors and out["airfoil"].get("_more"):
        from .elements import element_problems
        errors += element_problems(out["airfoil"], out["airfoil"]["_more"], base_dir)
    if not errors and "flap_hinge" in out["airfoil"]:
        from .flap import flap_problems
        errors += flap_problems(out, base_dir, ctx["_warnings"])
    if ctx["_warnings"]:
        out["_warnings"] = ctx["_warnings"]
    return out, one_per_problem(errors, not_tables)
