"""One self-contained HTML page (pictures and film inside it as data URIs) of a run or a sweep folder."""

from __future__ import annotations

import base64
import csv
import datetime
import html
import sys
import tempfile
from dataclasses import dataclass, field
from pathlib import Path

from ..core.cautions import GUST_CAUTION, MODEL_CAUTION, SHEDDING_CAUTION, SWEEP_CAUTION
from ..core.errors import UsageError
from ..core.files import write_text
from ..core.version import __version__
from .notices import run_warnings
from ..theory import G

__all__ = ["write_report", "folder_kind", "check_report_path", "run_page", "sweep_page",
           "scenario_words", "unit_of", "MARK", "FILM_SIZE", "FILM_FRAMES"]

#: Written into every page's head; an existing file without it is never replaced.
MARK = '<meta name="generator" content="unsteady report">'
#: Size (pixels) and most frames of a film made for a page when the run has none.
FILM_SIZE = (960, 540)
FILM_FRAMES = 200
#: A run's own film.mp4 above this size is not embedded (a smaller one is made).
FILM_BYTES_LIMIT = 25 * 2 ** 20
SUMMARY_REQUIRED = ("cl_max", "cl_min", "t_cl_max", "cm_max", "cm_min", "steps", "version")
HISTORY_REQUIRED = ("t", "cl", "cd", "cm")
ARG = "RUN_DIR|SWEEP_DIR"


# ---------------------------------------------------------------------------
# input checks

def folder_kind(folder):
    """``"run"`` or ``"sweep"`` for a folder written by ``unsteady run`` / ``unsteady sweep``.

    Raises
    ------
    UsageError
        For anything else (the one-line message of exit status 2).
    """
    folder = Path(folder)
    if not folder.is_dir():
        raise UsageError(f"error: {folder}: {ARG}: no such folder; give a folder written by "
                         "'unsteady run' or 'unsteady sweep'")
    if (folder / "sweep.csv").is_file():
        return "sweep"
    if (folder / "summary.json").exists() or (folder / "history.csv").exists():
        return "run"
    raise UsageError(f"error: {folder}: {ARG}: is neither a run (summary.json, history.csv) nor a sweep "
                     "(sweep.csv); give a folder written by 'unsteady run' or 'unsteady sweep'")


def check_report_path(out):
    """The page's path, checked: ends in .html, its folder exists and takes files, no foreign file is
    replaced (our page carries :data:`MARK`, or is listed unchanged in its folder's record)."""
    from ..core.files import clean_leftovers, owned_file, probe_writable
    if not str(out).strip():
        raise UsageError("error: -: --out: is empty; give a file name ending in .html "
                         "(or leave the option out for report.html in the folder)")
    out = Path(out)
    if out.suffix.lower() != ".html":
        raise UsageError(f"error: {out}: --out: must end in .html (one self-contained page), "
                         f"not {out.suffix or '(no suffix)'!r}")
    parent = out.absolute().parent
    if not parent.is_dir():
        raise UsageError(f"error: {out}: --out: folder {parent} does not exist; create it first")
    probe_writable(parent, out)
    if out.is_dir():
        raise UsageError(f"error: {out}: --out: is a folder; give a file name ending in .html")
    clean_leftovers(parent, out.name)
    if out.exists() and not owned_file(out):
        try:
            with open(out, "rb") as f:
                head = f.read(4096).decode("utf-8", errors="replace")
        except OSError as exc:
            raise UsageError(f"error: {out}: --out: exists and cannot be read ({exc.strerror})") from None
        if MARK not in head:
            raise UsageError(f"error: {out}: --out: exists and was not written by 'unsteady report'; "
                             "give a new file name or move that file away")
    return out


@dataclass
class RunInput:
    """A run folder read for its page: the Result and what could not be read, in words."""

    folder: Path
    result: object
    notes: list = field(default_factory=list)
    scenario_text: str = ""


def read_run(folder):
    """Read a run folder for its page (:func:`unsteady.outputs.rundir.load_run`).

    A missing or damaged summary or history, or a damaged snapshots.npz,
    raises UsageError; missing snapshots and a scenario that cannot be read
    back are said in ``notes`` (the page then has no film, or no scenario
    description).
    """
    from .rundir import ALWAYS, load_run, read_run_scenario, read_snapshots
    folder = Path(folder)
    res = load_run(folder, columns=HISTORY_REQUIRED, keys=SUMMARY_REQUIRED, read=ALWAYS)
    if len(res.history["t"]) == 0:
        raise UsageError(f"error: {folder}: history.csv: holds no time step; rerun the scenario")
    notes = []
    if (folder / "snapshots.npz").is_file():
        try:
            res.snapshots = read_snapshots(folder / "snapshots.npz")
        except Exception as exc:   # damaged, truncated: say so rather than make a page without
            raise UsageError(f"error: {folder}: snapshots.npz: damaged ({type(exc).__name__}: "
                             f"{str(exc)[:160]}); rerun the scenario") from None
    text = ""
    toml = folder / "scenario.toml"
    if toml.is_file():
        text = toml.read_text(errors="replace")
        try:
            res.scenario = read_run_scenario(toml)
        except Exception as exc:
            notes.append(f"scenario.toml cannot be read back ({exc}): the scenario cannot be described")
    else:
        notes.append("the run folder holds no scenario.toml: the scenario cannot be described and no film made")
    return RunInput(folder, res, notes, text)


# ---------------------------------------------------------------------------
# numbers and units

#: Units of summary and sweep keys that no suffix rule gives ("" = a coefficient or a count).
UNITS = {
    "dt": "s", "lev_onset_t": "s", "t_begin": "s", "t50": "s", "t90": "s", "t50_qs": "s",
    "t90_qs": "s", "delay90": "s", "delay90_chords": "chords", "chords_travelled": "chords",
    "far_wake_chords": "chords", "lift_slope_per_rad": "1/rad", "A_bar": "1/(m/s)", "N0": "Hz",
    "loop_area": "cl x deg", "peak_pitch_rate": "", "pitch_rate_limit": "",
    "w_gust_max": "m/s", "w_gust_min": "m/s", "u_gust_max": "m/s", "u_gust_min": "m/s",
    "flow.speed": "m/s", "flow.density": "kg/m^3", "flow.altitude": "m", "airfoil.chord": "m",
    "gust.amplitude": "m/s", "gust.length": "m", "gust.wavelength": "m", "gust.arrival": "s",
    "gust.intensity": "m/s", "gust.scale_length": "m", "aircraft.mass": "kg",
    "aircraft.wing_area": "m^2", "aircraft.span": "m", "run.duration": "s", "run.dt": "s",
    "run.chords": "chords", "motion.pivot": "chord fraction", "ground.height": "m",
}
#: Unit by the end of a name, longest first (the interface names columns this way).
SUFFIXES = (("_N_m2", "N/m^2"), ("_Nm", "N m"), ("_m_s2", "m/s^2"), ("_m_s", "m/s"), ("_deg_s", "deg/s"),
            ("_deg", "deg"), ("_chords", "chords"), ("_m2_s", "m^2/s"), ("_N", "N"), ("_s", "s"),
            ("_m", "m"), ("_Hz", "Hz"), ("_kg", "kg"))


def unit_of(key):
    """The unit of a summary or sweep key ("" for coefficients, counts and unknown keys)."""
    last = key.split(".")[-1]
    if key in UNITS or last in UNITS:
        return UNITS.get(key, UNITS.get(last))
    if key.startswith(("motion.pitch", "motion.flap")) and last in ("value", "from", "to", "amplitude", "mean"):
        return "deg"
    if key.startswith("motion.plunge") and last in ("value", "from", "to", "amplitude", "mean"):
        return "m"
    for suffix, unit in SUFFIXES:
        if last.endswith(suffix):
            return unit
    if last.startswith("t_"):
        return "s"
    return ""


def column_header(key):
    """A table header: the key with its unit, ``t_cl_max (s)`` (none for coefficients, load
    factors and counts, nor where the name already ends in its unit, ``lift_max_N``)."""
    u = unit_of(key)
    if not u or key in FIXED_COLUMNS or any(key.endswith(suf) for suf, _ in SUFFIXES):
        return key
    return f"{key} ({u})"


def column_key(header):
    """The key of a header written by :func:`column_header`."""
    h = header.strip()
    if h.endswith(")") and " (" in h:
        return h[:h.rindex(" (")]
    return h


#: Sweep-table columns that are texts, written without a unit.
FIXED_COLUMNS = ("name", "case_key", "status", "message", "verdict", "version")


def fmt(v, digits=4):
    """A number for the page: ``digits`` significant figures, None as a dash."""
    if v is None or v == "":
        return "\u2014"
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if v != v:
            return "not a number"
        return f"{v:.{digits}g}".replace("e-0", "e-").replace("e+0", "e")
    return str(v)


def _e(text):
    return html.escape(str(text), quote=True)


def _u(unit):
    """A unit as HTML, powers as superscripts (m^2 -> m&sup2;)."""
    return _e(unit).replace("^2", "&sup2;").replace("^3", "&sup3;")


# ---------------------------------------------------------------------------
# the scenario in words

PIVOTS = {0.0: "the leading edge", 0.25: "the quarter chord", 0.5: "mid-chord", 1.0: "the trailing edge"}


def _pivot_words(p):
    return PIVOTS.get(float(p), f"{fmt(100 * float(p))} % of the chord aft of the leading edge")


def law_words(spec, unit, speed=None, chord=None):
    """A motion law (or a list of laws, summed) in words, e.g. 'a ramp from 2 to 10 deg over 0.1 s ...'."""
    if isinstance(spec, (list, tuple)):
        return " plus ".join(law_words(s, unit, speed, chord) for s in spec)
    g = spec.get
    law = g("law")
    if law == "constant":
        return f"held at {fmt(g('value'))} {unit}"
    if law == "step":
        return f"a step to {fmt(g('value'))} {unit} at t = {fmt(g('time'))} s"
    if law == "ramp":
        s = (f"a ramp from {fmt(g('from'))} to {fmt(g('to'))} {unit} over {fmt(g('duration'))} s, "
             f"starting at t = {fmt(g('start'))} s")
        return s + (f" (corners rounded over {fmt(g('smoothing'))} s)" if g("smoothing") else "")
    if law == "sine":
        return _sine_words(spec, unit, speed, chord)
    if law == "table":
        return f"values read from the table {g('file')}"
    rest = ", ".join(f"{k} = {v}" for k, v in spec.items() if k != "law")
    return f"law {law!r} ({rest})"


def _sine_words(spec, unit, speed, chord):
    f, k = spec.get("frequency"), spec.get("reduced_frequency")
    if f is None and k is not None and speed and chord:
        f = float(k) * speed / (3.141592653589793 * chord)       # omega = 2 U k / c
    elif k is None and f is not None and speed and chord:
        k = 3.141592653589793 * float(f) * chord / speed
    s = f"a sine of amplitude {fmt(spec.get('amplitude'))} {unit}"
    if spec.get("mean"):
        s += f" about {fmt(spec['mean'])} {unit}"
    s += f" at {fmt(f)} Hz (reduced frequency k = {fmt(k, 3)})"
    if spec.get("phase"):
        s += f", phase {fmt(spec['phase'])} deg"
    return s


def _flow_words(d):
    fl = d.get("flow", {})
    s = f"Flight speed {fmt(fl.get('speed'))} m/s, air density {fmt(fl.get('density'))} kg/m^3"
    if fl.get("altitude") is not None:
        s += f" (standard atmosphere at {fmt(fl['altitude'])} m)"
    return s + "."


def _shape_words(shape):
    s = str(shape)
    if s.lower() == "flat":
        return "a flat plate"
    if s.lower().startswith("naca") and s[4:].isdigit():
        return f"a NACA {s[4:]} section"
    return f"the section of the coordinates file {s}"


def _element_words(a, c_ref=None):
    s = f"{_shape_words(a.get('shape', 'flat'))}, chord {fmt(a.get('chord'))} m"
    if c_ref is not None and a.get("position") is not None:
        x, z = a["position"]
        s += (f", leading edge {fmt(x)} m aft and {fmt(z)} m above the first's, "
              f"incidence {fmt(a.get('incidence', 0.0))} deg")
    kind = "surface panels on both surfaces" if a.get("thick") else "vortex elements on the camber line"
    if a.get("elements"):
        s += f", modelled with {a['elements']} {kind}"
    if a.get("flap_hinge") is not None:
        s += f"; a plain flap hinged at {fmt(100 * a['flap_hinge'])} % of the chord"
        if c_ref is not None and a.get("flap_deflection") is not None:
            s += f", held at {fmt(a['flap_deflection'])} deg (trailing edge down positive)"
    if a.get("lesp_critical") is not None:
        s += f"; the leading edge sheds vortices when the suction parameter LESP exceeds {fmt(a['lesp_critical'])}"
    return s


def _section_words(d):
    af = d.get("airfoil", {})
    if isinstance(af, list):
        parts = [f"element {i + 1}: {_element_words(a, None if i == 0 else af[0].get('chord'))}"
                 for i, a in enumerate(af)]
        return f"{len(af)} elements moving as one: " + "; ".join(parts) + "."
    return "Section: " + _element_words(af) + "."


def _motion_words(d):
    mo = d.get("motion", {})
    fl, c = d.get("flow", {}), _ref_chord(d)
    U = fl.get("speed")
    out = []
    if "pitch" in mo:
        out.append(f"Pitch: {law_words(mo['pitch'], 'deg', U, c)}, about {_pivot_words(mo.get('pivot', 0.25))}.")
    if "plunge" in mo:
        out.append(f"Plunge (height of the pitch axis): {law_words(mo['plunge'], 'm', U, c)}.")
    if "flap" in mo:
        out.append(f"Flap (trailing edge down positive): {law_words(mo['flap'], 'deg', U, c)}.")
    if not out:
        out.append(f"No prescribed motion: the section holds its attitude (pitch axis at "
                   f"{_pivot_words(mo.get('pivot', 0.25))}).")
    return out


def _ref_chord(d):
    af = d.get("airfoil", {})
    return (af[0] if isinstance(af, list) and af else af).get("chord") if af else None


GUST_DIRECTIONS = {"vertical": "vertical", "streamwise": "streamwise (along the flight path)"}


def gust_words(g, chord=None):
    """One gust of ``[gust]`` in words."""
    kind = GUST_DIRECTIONS.get(g.get("direction", "vertical"), g.get("direction"))
    arr = f"its front reaching the leading edge at t = {fmt(g.get('arrival', 0.0))} s"
    p = g.get("profile")
    if p == "sharp-edged":
        return f"a sharp-edged {kind} gust of {fmt(g.get('amplitude'))} m/s, {arr}"
    if p == "one-minus-cosine":
        H = g.get("length")
        chords = f" ({fmt(H / chord, 3)} chords)" if H and chord else ""
        return f"a 1-cosine {kind} gust of {fmt(g.get('amplitude'))} m/s peak, {fmt(H)} m long{chords}, {arr}"
    if p == "sine":
        wl = (f"wavelength {fmt(g['wavelength'])} m" if g.get("wavelength") is not None
              else f"reduced frequency {fmt(g.get('reduced_frequency'))}")
        return f"a sinusoidal {kind} gust of {fmt(g.get('amplitude'))} m/s amplitude, {wl}, {arr}"
    if p == "turbulence":
        sp = {"dryden": "Dryden", "von-karman": "von K\u00e1rm\u00e1n"}.get(g.get("spectrum"), g.get("spectrum"))
        return (f"{sp} {kind} turbulence of {fmt(g.get('intensity'))} m/s rms, scale length "
                f"{fmt(g.get('scale_length'))} m, random seed {g.get('seed')}, {arr}")
    if p == "table":
        return f"a {kind} gust read from the table {g.get('file')}, {arr}"
    return f"a {kind} gust of profile {p!r}"


def _aircraft_words(ac, d):
    s = (f"Aircraft free to heave under the lift (weight carried in level flight): mass {fmt(ac.get('mass'))} kg, "
         f"wing area {fmt(ac.get('wing_area'))} m^2")
    if ac.get("mass") and ac.get("wing_area"):
        s += f" (wing loading {fmt(ac['mass'] * G / ac['wing_area'])} N/m^2)"
    if ac.get("aspect_ratio"):
        s += f", aspect ratio {fmt(ac['aspect_ratio'])} (finite-wing lift-slope correction)"
    if ac.get("span"):
        s += f", span {fmt(ac['span'])} m (root bending moment, elliptic loading)"
    return s + "."


def _run_words(d):
    ru, c, U = d.get("run", {}), _ref_chord(d), d.get("flow", {}).get("speed")
    T, dt = ru.get("duration"), ru.get("dt")
    s = f"Run of {fmt(T)} s"
    if T and c and U:
        s += f" ({fmt(T * U / c, 3)} chords travelled)"
    if T and dt:
        s += f", time step {fmt(dt * 1e3)} ms (about {round(T / dt)} steps)"
    model = {"vortex": "discrete-vortex model", "linear": "linear indicial model"}.get(ru.get("model"), ru.get("model"))
    wake = {"free": "a free wake that rolls up", "frozen": "a frozen wake carried at the flight speed"}.get(
        ru.get("wake"), ru.get("wake"))
    start = {"steady": "starting from the settled flow at the initial attitude",
             "impulsive": "starting impulsively from rest"}.get(ru.get("start"), ru.get("start"))
    return s + f"; {model} with {wake}, {start}."


def scenario_words(sc):
    """The scenario as sentences: flow, section, motion, gusts, aircraft, ground, run."""
    d = sc.data
    out = [_flow_words(d), _section_words(d)] + _motion_words(d)
    gusts = d.get("gust")
    if gusts:
        gusts = gusts if isinstance(gusts, list) else [gusts]
        words = [gust_words(g, _ref_chord(d)) for g in gusts]
        out.append(("Gust: " if len(words) == 1 else "Gusts (summed): ") + "; ".join(words) + ".")
    if d.get("aircraft"):
        out.append(_aircraft_words(d["aircraft"], d))
    if d.get("ground"):
        h = d["ground"].get("height")
        out.append(f"Flat, fixed ground: the pitch axis starts {fmt(h)} m above it.")
    out.append(_run_words(d))
    return out


# ---------------------------------------------------------------------------
# pictures and film, as data URIs

CAPTIONS = {
    "histories.png": "Lift and moment coefficients (and load factor, when free to heave), and the inputs that "
                     "moved (gust, pitch, plunge or heave) against time; an input held constant is written "
                     "under the title.",
    "lift-loop.png": "Lift coefficient against the pitch angle (or, when the pitch is held, the effective angle "
                     "of attack), beside the quasi-steady line.",
    "wake.png": "The near wake, a few chords behind the section in true proportions, and below it the whole "
                "shed wake at the last snapshot.",
    "pressure-jump.png": "Pressure jump across the camber line along the chord at a few instants, scaled on the "
                         "chord behind the leading edge (the leading-edge value is written).",
    "lag.png": "Lift coefficient against the quasi-steady value and the effective angle of attack, "
               "with the t50/t90 marks of a ramp or step and the attached-flow check.",
    "gust-loads.png": "Gust velocity met at the leading edge and the load factor, with the peak and "
                      "the gust-formula estimate.",
}


def data_uri(blob, mime):
    """``data:<mime>;base64,...`` of some bytes."""
    return f"data:{mime};base64," + base64.b64encode(blob).decode("ascii")


def collect_pictures(run, tmp, say=None):
    """[(name, PNG bytes)]: every PNG of the run folder, and the registered pictures it lacks,
    drawn into the temporary folder ``tmp`` (never into the run folder)."""
    from .gallery import PICTURES
    folder, res = run.folder, run.result
    have = {p.name: p for p in sorted(folder.glob("*.png"))}
    missing = [n for n in PICTURES if n not in have]
    if missing and say:
        say(f"drawing {len(missing)} picture(s) the run folder lacks")
    for name in missing:
        try:
            if PICTURES[name](res, Path(tmp) / name) is not False and (Path(tmp) / name).is_file():
                have[name] = Path(tmp) / name
        except Exception as exc:
            run.notes.append(f"the picture {name} could not be drawn ({type(exc).__name__}: {exc})")
    order = [n for n in PICTURES if n in have] + sorted(n for n in have if n not in PICTURES)
    return [(n, have[n].read_bytes()) for n in order]


@dataclass
class FilmInfo:
    """The film on the page: its bytes, size, frame count and where it came from."""

    blob: bytes
    width: int
    height: int
    frames: int
    fps: float
    origin: str
    poster: bytes = b""
    made: bool = False


def probe_film(path):
    """(codec, (width, height), frames, fps, PNG of a frame two thirds in) of an MP4, read with ffmpeg."""
    import imageio.v3 as iio
    import imageio_ffmpeg
    gen = imageio_ffmpeg.read_frames(str(path))
    meta = next(gen)
    w, h = meta["size"]
    frames = [f for f in gen]
    pick = frames[min(len(frames) - 1, (2 * len(frames)) // 3)] if frames else None
    poster = b""
    if pick is not None:
        import numpy as np
        img = np.frombuffer(pick, dtype=np.uint8).reshape(h, w, 3)
        poster = iio.imwrite("<bytes>", img, extension=".png")
    return str(meta.get("codec", "")), (int(w), int(h)), len(frames), float(meta.get("fps", 0.0)), poster


def film_options(result):
    """The options of a film made for a page: FILM_SIZE, at most FILM_FRAMES frames at 25 per second."""
    from .films import FilmOptions
    n = len(result.snapshots.get("t", ()))
    return FilmOptions(width=FILM_SIZE[0], height=FILM_SIZE[1], frame_rate=25.0,
                       frames=FILM_FRAMES if n > FILM_FRAMES else None)


def collect_film(run, tmp, progress=False, say=None):
    """The run's film.mp4 (H.264) when it has one of a mailable size, else one made into ``tmp``; None when
    the run cannot be filmed (the reason goes to ``run.notes``)."""
    own = run.folder / "film.mp4"
    if own.is_file():
        info, why = _own_film(own)
        if info is not None:
            return info
        run.notes.append(f"the run's film.mp4 is not used ({why}); this page holds a film made for it")
    res = run.result
    if res.scenario is None or not res.snapshots or len(res.snapshots.get("t", ())) == 0:
        run.notes.append("no film: the run kept no wake snapshots (snapshots.npz) or its scenario cannot "
                         "be read; rerun it with 'unsteady run'")
        return None
    from .films import write_film
    if say:
        say("making a film for the page")
    path = Path(tmp) / "film.mp4"
    try:
        write_film(res, path, film_options(res), progress=progress, label=str(run.folder))
    except Exception as exc:
        run.notes.append(f"no film: it could not be made ({type(exc).__name__}: {exc})")
        return None
    codec, (w, h), n, fps, poster = probe_film(path)
    return FilmInfo(path.read_bytes(), w, h, n, fps, "made for this page from the run's wake snapshots", poster,
                    made=True)


def _own_film(path):
    """(FilmInfo, None) for a run's film.mp4 fit for a page, else (None, why not)."""
    size = path.stat().st_size
    if size > FILM_BYTES_LIMIT:
        return None, f"{size / 2 ** 20:.0f} MB, more than {FILM_BYTES_LIMIT / 2 ** 20:.0f} MB for one page"
    try:
        codec, (w, h), n, fps, poster = probe_film(path)
    except Exception as exc:
        return None, f"it cannot be read: {type(exc).__name__}"
    if "h264" not in codec.lower():
        return None, f"coded as {codec or 'unknown'}, not H.264, which every current browser plays"
    return FilmInfo(path.read_bytes(), w, h, n, fps, "the run's own film.mp4", poster), None


# ---------------------------------------------------------------------------
# the page: head, styles, pieces

CSP = ("default-src 'none'; img-src data:; media-src data:; style-src 'unsafe-inline'; "
       "script-src 'none'; form-action 'none'; base-uri 'none'")

STYLE = """
body{margin:0;background:#fff;color:#1e2528;font:15px/1.5 "DejaVu Sans","Liberation Sans",Arial,sans-serif}
main{max-width:980px;margin:0 auto;padding:22px 28px 40px}
h1{font-size:1.55em;margin:0 0 .15em;color:#173a40}
h2{font-size:1.18em;margin:1.7em 0 .5em;padding-bottom:.15em;border-bottom:2px solid #b7ccd0;color:#173a40}
h3{font-size:1.02em;margin:1.2em 0 .3em;color:#173a40}
.sub{color:#586468;margin:.1em 0}
code,pre{font-family:"DejaVu Sans Mono","Liberation Mono",monospace}
table{border-collapse:collapse;width:100%;margin:.4em 0;font-variant-numeric:tabular-nums}
th,td{text-align:left;padding:3px 8px;border-bottom:1px solid #dce3e5;vertical-align:top}
th{background:#edf2f3;font-weight:600}
td.n{text-align:right;white-space:nowrap}
.box{padding:9px 14px;margin:.7em 0;border-left:5px solid #8a979b;background:#f5f7f7}
.ok{border-color:#3d7a4c;background:#eff6f0}
.bad{border-color:#b3532b;background:#fbf0ea}
.care{border-color:#b8912a;background:#fcf8ea}
.failed td{color:#8a3a1c}
figure{margin:1.1em 0;break-inside:avoid}
figure img,video{display:block;max-width:100%;height:auto;border:1px solid #dce3e5}
.case table{width:auto;min-width:60%}
figcaption{color:#4b5659;font-size:.92em;margin-top:.25em}
pre{background:#f6f8f8;border:1px solid #dce3e5;padding:9px;overflow-x:auto;font-size:.84em}
nav ol{margin:.3em 0;padding-left:1.4em;columns:2}
a{color:#1f5a8a}
.print-only{display:none}
@page{margin:15mm 13mm}
@media print{
body{font-size:10.5pt}
main{max-width:none;padding:0}
nav,video,.screen-only{display:none}
.print-only{display:block}
section#film,section#pictures,section#envelope{break-before:page}
figure img{max-height:205mm;width:auto;max-width:100%}
h2,h3{break-after:avoid}
tr{break-inside:avoid}
pre{white-space:pre-wrap}
a{color:inherit;text-decoration:none}
}
"""


def page(title, body):
    """A whole page: no script, no external reference; the content policy forbids fetching anything."""
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n" + MARK + "\n"
            f"<meta http-equiv=\"Content-Security-Policy\" content=\"{CSP}\">\n"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
            f"<title>{_e(title)}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n<main>\n"
            + body + "\n</main>\n</body>\n</html>\n")


class Num(str):
    """A table cell (escaped HTML) holding a number: right-aligned."""


def _table(head, rows, classes=None):
    """An HTML table of cells of escaped HTML (:class:`Num` cells right-aligned); ``classes`` per row."""
    out = ["<table><thead><tr>" + "".join(f"<th>{h}</th>" for h in head) + "</tr></thead><tbody>"]
    for j, r in enumerate(rows):
        cls = f" class=\"{classes[j]}\"" if classes and classes[j] else ""
        cells = "".join(f"<td class=\"n\">{c}</td>" if isinstance(c, Num) else f"<td>{c}</td>" for c in r)
        out.append(f"<tr{cls}>{cells}</tr>")
    return "\n".join(out) + "</tbody></table>"


def _section(ident, title, inner):
    return f"<section id=\"{ident}\">\n<h2>{_e(title)}</h2>\n{inner}\n</section>"


def _nav(items):
    links = "".join(f"<li><a href=\"#{i}\">{_e(t)}</a></li>" for i, t in items)
    return f"<nav><strong>Contents</strong><ol>{links}</ol></nav>"


def _figure(uri, caption, alt):
    return (f"<figure><img src=\"{uri}\" alt=\"{_e(alt)}\">"
            f"<figcaption>{caption}</figcaption></figure>")


def _cautions(*texts):
    return "".join(f"<div class=\"box care\"><strong>Caution.</strong> {_e(t)}</div>" for t in texts)


def flatten(d, prefix=""):
    """{dotted key: value} of a nested summary."""
    out = {}
    for k, v in d.items():
        if isinstance(v, dict):
            out.update(flatten(v, f"{prefix}{k}."))
        else:
            out[prefix + k] = v
    return out


# ---------------------------------------------------------------------------
# the page of a run

#: (label, summary key, key of the time it happens or None), by group; rows only for keys present.
HEADLINES = {
    "Loads": [
        ("Largest lift coefficient cl", "cl_max", "t_cl_max"),
        ("Smallest lift coefficient cl", "cl_min", "t_cl_min"),
        ("Largest moment coefficient cm (quarter chord, nose-up positive)", "cm_max", None),
        ("Smallest moment coefficient cm", "cm_min", None),
        ("Mean drag coefficient cd (negative: thrust)", "cd_mean", None),
        ("Lift coefficient at the end of the run", "cl_final", None),
        ("Largest hinge moment ch of the flap (trailing edge down positive)", "ch_max", "t_ch_max"),
        ("Smallest hinge moment ch of the flap", "ch_min", "t_ch_min"),
        ("Lowest clearance above the ground (m)", "ground_clearance_min_m", "t_ground_clearance_min"),
        ("Largest effective angle of attack in the gust", "alpha_eff_max_deg", None),
        ("Leading-edge vortex shedding begins", "lev_onset_t", None),
    ],
    "Aircraft response": [
        ("Largest load factor n", "n_max", "t_n_max"),
        ("Smallest load factor n", "n_min", None),
        ("Largest load-factor increment", "dn_max", None),
        ("Gust-formula estimate of the increment", "dn_formula", None),
        ("Ratio of the increment to the gust-formula estimate", "dn_ratio", None),
        ("Gust alleviation factor K_g of the formula", "gust_alleviation_factor", None),
        ("Aircraft mass ratio mu_g", "mass_ratio_mu_g", None),
        ("Wing loading", "wing_loading_N_m2", None),
        ("Lift-curve slope used", "lift_slope_per_rad", None),
        ("Angle of attack in level flight", "alpha_trim_deg", None),
        ("rms load factor (about its mean)", "n_rms", None),
        ("rms load factor per m/s of rms gust", "A_bar", None),
        ("Zero up-crossings of the load factor", "N0", None),
    ],
    "Lag behind the quasi-steady response": [
        ("Peak effective angle of attack", "lag.peak_effective_alpha_deg", None),
        ("Peak reduced pitch rate (alpha_dot c / 2U)", "lag.peak_pitch_rate", None),
        ("cl settles past 50 % of its change, after the change begins", "lag.t50", None),
        ("... the quasi-steady cl", "lag.t50_qs", None),
        ("cl settles past 90 % of its change, after the change begins", "lag.t90", None),
        ("... the quasi-steady cl", "lag.t90_qs", None),
        ("Delay of the 90 % point behind quasi-steady", "lag.delay90", None),
        ("... in chords travelled", "lag.delay90_chords", None),
        ("Amplitude of cl over the quasi-steady amplitude", "lag.amplitude_ratio", None),
        ("Phase lag of cl behind the quasi-steady cl", "lag.phase_lag_deg", None),
        ("Area of the cl-pitch loop per cycle", "lag.loop_area", None),
    ],
}
#: Explanations in words that the summary may carry, shown under the numbers.
SUMMARY_TEXTS = (("gust_formula", "Gust formula"), ("dn_ratio_note", "Ratio"), ("lift_scaling", "Lift scaling"))
#: Long texts shown elsewhere on the page, left out of the table of every number.
SHOWN_ELSEWHERE = {"caution", "load_caution", "lag.validity.reasons", "lag.validity.basis", "warnings"}


def _when(summary, key, U, c):
    t = summary.get(key) if key else None
    if not isinstance(t, (int, float)):
        return ""
    s = f"t = {fmt(t)} s"
    return s + (f" ({fmt(t * U / c, 3)} chords)" if U and c else "")


def _headline_rows(flat, rows, U, c):
    out = []
    for label, key, tkey in rows:
        if key not in flat:
            continue
        v = flat[key]
        value = "never" if key == "lev_onset_t" and v is None else fmt(v)
        out.append([_e(label), Num(_e(value)), _u(unit_of(key)), _e(_when(flat, tkey, U, c))])
    return out


def headline_html(summary, sc):
    """The headline numbers, by group, with units and the time they happen."""
    flat = flatten(summary)
    U, c = (sc.speed, sc.chord) if sc is not None else (None, None)
    parts = []
    for group, rows in HEADLINES.items():
        body = _headline_rows(flat, rows, U, c)
        if body:
            parts.append(f"<h3>{_e(group)}</h3>" + _table(["Quantity", "Value", "Unit", "When"], body))
    texts = [f"<li><strong>{_e(lab)}:</strong> {_e(summary[k])}</li>" for k, lab in SUMMARY_TEXTS
             if isinstance(summary.get(k), str)]
    if texts:
        parts.append("<ul>" + "".join(texts) + "</ul>")
    return "\n".join(parts)


def validity_html(run):
    """The attached-flow verdict (``lag.validity``) and the list of warnings."""
    v = (run.result.summary.get("lag") or {}).get("validity")
    if not isinstance(v, dict):
        box = "<div class=\"box\">The summary holds no attached-flow verdict (lag.validity).</div>"
    elif v.get("attached_flow_ok"):
        box = (f"<div class=\"box ok\"><strong>Within the model's attached-flow range.</strong> The effective "
               f"angle of attack stays within {fmt(v.get('alpha_eff_limit_deg'))} deg and the reduced pitch "
               f"rate within {fmt(v.get('pitch_rate_limit'))}. Basis: {_e(v.get('basis', ''))}.</div>")
    else:
        reasons = "".join(f"<li>{_e(r)}</li>" for r in v.get("reasons", []))
        box = (f"<div class=\"box bad\"><strong>Outside the model's attached-flow range:</strong> the "
               f"numbers describe a flow that a real section would not keep.<ul>{reasons}</ul>"
               f"Basis: {_e(v.get('basis', ''))}.</div>")
    warns = run_warnings(run.result, verdict=False, short=False)
    listing = ("<ul>" + "".join(f"<li><code>{_e(w)}</code></li>" for w in warns) + "</ul>") if warns \
        else "<p>No warnings: the checks of the scenario found nothing out of the model's depth.</p>"
    return box + f"<h3>Warnings ({len(warns)})</h3>" + listing


def film_html(film):
    """The film as an inline H.264 MP4 (and, for print, one frame as a picture)."""
    if film is None:
        return "<p>No film (see the notes at the top of the page).</p>"
    dur = film.frames / film.fps if film.fps else 0.0
    cap = (f"Film, {film.width} x {film.height} pixels, {film.frames} frames at {fmt(film.fps, 3)} frames/s "
           f"({fmt(dur, 3)} s), {_e(film.origin)}.")
    if film.made:
        cap += " Seen riding with the section: the air streams past to the right; the trace follows the history."
    poster = ""
    if film.poster:
        poster = (f"<img class=\"print-only\" src=\"{data_uri(film.poster, 'image/png')}\" "
                  "alt=\"one frame of the film\">")
    return (f"<figure id=\"the-film\"><video controls muted loop preload=\"auto\" "
            f"width=\"{film.width}\" height=\"{film.height}\" src=\"{data_uri(film.blob, 'video/mp4')}\">"
            f"</video>{poster}<figcaption>{cap}</figcaption></figure>")


def pictures_html(pictures):
    if not pictures:
        return "<p>The run has no pictures and none could be drawn.</p>"
    figs = [_figure(data_uri(blob, "image/png"), f"<strong>{_e(name)}</strong>: {_e(CAPTIONS.get(name, ''))}",
                    name) for name, blob in pictures]
    return "\n".join(figs)


def every_number_html(summary):
    rows = []
    for k, v in flatten(summary).items():
        if k in SHOWN_ELSEWHERE:
            continue
        if isinstance(v, (list, tuple)):
            cell = _e(", ".join(map(str, v)) or "\u2014")
        else:
            cell = Num(_e(fmt(v, 6))) if isinstance(v, (int, float)) and not isinstance(v, bool) else _e(fmt(v))
        rows.append([f"<code>{_e(k)}</code>", cell, _u(unit_of(k))])
    return _table(["Key", "Value", "Unit"], rows)

def _stamp():
    return datetime.datetime.now().astimezone().strftime("%Y-%m-%d %H:%M %Z").strip()


def run_page(folder, *, film=True, progress=False, say=None):
    """(HTML text, FilmInfo or None) of a run folder; pictures and film are drawn in a temporary folder."""
    run = read_run(folder)
    res, s = run.result, run.result.summary
    sc = res.scenario
    with tempfile.TemporaryDirectory(prefix="unsteady-report-") as tmp:
        pictures = collect_pictures(run, tmp, say)
        if film:
            film = collect_film(run, tmp, progress, say)
        else:
            run.notes.append("the film was left out on request (--no-film)")
            film = None
    title = (sc.title if sc is not None else "") or f"Run {run.folder.resolve().name}"
    head = (f"<header><h1>{_e(title)}</h1><p class=\"sub\">Report of the run folder "
            f"<code>{_e(run.folder.resolve().name)}</code>: {_e(s.get('steps'))} time steps, run by unsteady "
            f"{_e(s.get('version'))}; page written {_e(_stamp())} by unsteady {_e(__version__)}.</p></header>")
    if run.notes:
        head += ("<div class=\"box\"><strong>About this page.</strong><ul>"
                 + "".join(f"<li>{_e(n)}</li>" for n in run.notes) + "</ul></div>")
    words = "<ul>" + "".join(f"<li>{_u(w)}</li>" for w in scenario_words(sc)) + "</ul>" if sc is not None \
        else "<p>The scenario cannot be described (see the notes above).</p>"
    cautions = ([SHEDDING_CAUTION] if s.get("lev_onset_t") is not None else [MODEL_CAUTION]) \
        + ([GUST_CAUTION] if "n_max" in s else [])
    parts = [("scenario", "What was run", words),
             ("numbers", "Headline numbers", headline_html(s, sc) + _cautions(*cautions)),
             ("validity", "Validity and warnings", validity_html(run)),
             ("film", "Film", film_html(film)),
             ("pictures", "Pictures", pictures_html(pictures)),
             ("every-number", "Every number of the summary", every_number_html(s)),
             ("scenario-file", "The resolved scenario (scenario.toml)",
              f"<pre>{_e(run.scenario_text)}</pre>" if run.scenario_text else "<p>No scenario.toml.</p>")]
    body = [head, _nav([(i, t) for i, t, _ in parts])] + [_section(*p) for p in parts]
    body.append(f"<footer><p class=\"sub\">unsteady {_e(__version__)}.</p></footer>")
    return page(title, "\n".join(body)), film


# ---------------------------------------------------------------------------
# the page of a sweep

#: Columns of the case table after the swept keys and the status, when any case has them.
SWEEP_COLUMNS = (("cl_max", "cl max"), ("cl_min", "cl min"), ("cm_max", "cm max"), ("cm_min", "cm min"),
                 ("n_max", "n max"), ("n_min", "n min"), ("dn_ratio", "ratio to gust formula"))
SWEEP_FIXED = ("name", "case_key", "status", "message")


def read_sweep(folder):
    """(columns, rows) of a sweep folder's sweep.csv; a damaged table raises UsageError."""
    folder = Path(folder)
    try:
        with open(folder / "sweep.csv", newline="") as f:
            reader = csv.DictReader(f)
            rows = [{(column_key(k) if k is not None else None): v for k, v in r.items()} for r in reader]
            cols = [column_key(c) for c in (reader.fieldnames or [])]
    except (OSError, UnicodeDecodeError, csv.Error) as exc:
        raise UsageError(f"error: {folder}: sweep.csv: cannot be read ({type(exc).__name__}: {exc}); "
                         "rerun 'unsteady sweep'") from None
    lacking = [k for k in ("name", "status") if k not in cols]
    if lacking:
        raise UsageError(f"error: {folder}: sweep.csv: damaged (no column {', '.join(lacking)}); "
                         "give a folder written by 'unsteady sweep'")
    if not rows:
        raise UsageError(f"error: {folder}: sweep.csv: holds no case; rerun 'unsteady sweep'")
    if any(None in r for r in rows):
        raise UsageError(f"error: {folder}: sweep.csv: damaged (a row has more cells than the header); "
                         "rerun 'unsteady sweep'")
    return cols, rows


def _number(text):
    try:
        return float(text)
    except (TypeError, ValueError):
        return None


def _cell(text):
    """A sweep table cell: a number (right-aligned) or escaped text."""
    v = _number(text)
    return Num(_e(fmt(v))) if v is not None else _e(text or "\u2014")


def _head(key, label=None):
    u = unit_of(key)
    return _e(label or key) + (f" ({_u(u)})" if u else "")


def _swept(cols):
    """The swept keys: the dotted columns (scenario key paths)."""
    return [k for k in cols if "." in k]


def _sweep_overview(cols, rows):
    ok = [r for r in rows if r.get("status") == "ok"]
    items = [f"{len(rows)} cases: {len(ok)} finished, {len(rows) - len(ok)} failed or invalid."]
    for k in _swept(cols):
        vals = list(dict.fromkeys(r.get(k, "") for r in rows if r.get(k, "") != ""))
        items.append(f"Swept {k}{' (' + unit_of(k) + ')' if unit_of(k) else ''}: {', '.join(vals)}.")
    for key, label in (("n_max", "largest load factor"), ("cl_max", "largest lift coefficient"),
                       ("dn_ratio", "largest ratio to the gust formula")):
        vals = [(_number(r.get(key)), r["name"]) for r in ok if _number(r.get(key)) is not None]
        if vals:
            v, name = max(vals)
            items.append(f"The {label} is {fmt(v)}, in case {name}.")
    return "<ul>" + "".join(f"<li>{_e(i)}</li>" for i in items) + "</ul>"


def _case_table(cols, rows):
    swept = _swept(cols)
    shown = [(k, lab) for k, lab in SWEEP_COLUMNS if k in cols]
    head = ["Case"] + [_head(k) for k in swept] + ["Status"] + [_head(k, lab) for k, lab in shown]
    body, classes = [], []
    for i, r in enumerate(rows):
        status = r.get("status", "")
        if status != "ok" and r.get("message"):
            status += ": " + r["message"]
        body.append([f"<a href=\"#case-{i + 1}\">{_e(r['name'])}</a>"] + [_cell(r.get(k)) for k in swept]
                    + [_e(status)] + [_cell(r.get(k)) for k, _ in shown])
        classes.append("" if r.get("status") == "ok" else "failed")
    return _table(head, body, classes)


def _case_sections(cols, rows):
    out = []
    for i, r in enumerate(rows):
        cells = [[f"<code>{_e(k)}</code>", _cell(r.get(k)), _u(unit_of(k))]
                 for k in cols if k not in ("name",) and r.get(k, "") != ""]
        out.append(f"<section id=\"case-{i + 1}\" class=\"case\"><h3>Case {i + 1}: {_e(r['name'])}</h3>"
                   + _table(["Key", "Value", "Unit"], cells)
                   + "<p class=\"screen-only\"><a href=\"#cases\">back to the table of cases</a></p></section>")
    return "\n".join(out)


def sweep_page(folder, say=None):
    """The whole page of a sweep folder (HTML text): envelope, table of cases, each case's numbers."""
    folder = Path(folder)
    cols, rows = read_sweep(folder)
    name = folder.resolve().name
    title = f"Sweep {name}"
    env = folder / "envelope.png"
    figure = (_figure(data_uri(env.read_bytes(), "image/png"), "<strong>envelope.png</strong>: the swept "
                      "headline number across the cases, as drawn by 'unsteady sweep'.", "envelope")
              if env.is_file() else "<p>The sweep folder holds no envelope.png.</p>")
    head = (f"<header><h1>{_e(title)}</h1><p class=\"sub\">Report of the sweep folder <code>{_e(name)}</code> "
            f"(sweep.csv); page written {_e(_stamp())} by unsteady {_e(__version__)}.</p></header>")
    parts = [("overview", "Overview", _sweep_overview(cols, rows) + _cautions(SWEEP_CAUTION)),
             ("envelope", "Envelope", figure),
             ("cases", "Cases", _case_table(cols, rows)),
             ("case-numbers", "Every number of each case", _case_sections(cols, rows))]
    body = [head, _nav([(i, t) for i, t, _ in parts])] + [_section(*p) for p in parts]
    body.append(f"<footer><p class=\"sub\">unsteady {_e(__version__)}.</p></footer>")
    return page(title, "\n".join(body))


# ---------------------------------------------------------------------------
# writing

def write_report(folder, out=None, *, film=True, progress=False):
    """Write the page of a run or sweep folder, atomically (a temporary file beside it, then renamed).

    Parameters
    ----------
    folder : path
        A run directory (``unsteady run``) or a sweep folder (``unsteady sweep``).
    out : path, optional
        The page, ending in .html (default ``folder/report.html``).
    film : bool
        Put the run's film on the page (made for it when the run has no film.mp4).
    progress : bool
        Say what is being done on stderr (only on a terminal).

    Returns
    -------
    (Path, str, FilmInfo or None)
        The page written, the folder's kind (``"run"`` or ``"sweep"``) and the film on the page.

    Raises
    ------
    UsageError
        Bad input (exit status 2); nothing is written then.
    """
    folder = Path(folder)
    kind = folder_kind(folder)
    out = check_report_path(out if out is not None else folder / "report.html")
    show = progress and sys.stderr.isatty()
    say = (lambda m: print(f"report: {m}", file=sys.stderr)) if show else None
    if kind == "run":
        text, film = run_page(folder, film=film, progress=show, say=say)
    else:
        text, film = sweep_page(folder, say=say), None
    write_text(out, text)
    return out, kind, film
