"""Bad input through the command line, one case per rule of every scenario key and of ``--set``.

Each case runs ``unsteady run SCENARIO --out DIR`` (``unsteady check`` for the rules of a
sweep's cases) in this process and asserts: exit status 2, exactly one line on stderr,
``error: <the scenario file>: <the key>: <what is wrong>``, no traceback, and nothing
written (the folder holds what the test put there, and DIR does not exist).

To add a rule: one ``Case`` in ``CASES`` (a change of the good scenario below, the key
the line must name, and words of the message).
"""

from __future__ import annotations

import copy
import os
from dataclasses import dataclass, field
from pathlib import Path

import pytest
import tomli_w

from unsteady.apps.cli import main

#: A small scenario that passes every check without a warning.
GOOD = {
    "title": "bad-input suite",
    "flow": {"speed": 10.0, "density": 1.2},
    "airfoil": {"shape": "flat", "chord": 0.2, "elements": 8},
    "motion": {"pivot": 0.25,
               "pitch": {"law": "ramp", "from": 0.0, "to": 3.0, "start": 0.005, "duration": 0.02,
                         "smoothing": 0.004}},
    "run": {"chords": 2},
    "output": {"plots": False},
}

DEL = object()          # remove the key

GUST = {"profile": "one-minus-cosine", "amplitude": 1.0, "length": 1.0, "arrival": 0.0}
TURB = {"profile": "turbulence", "spectrum": "dryden", "intensity": 0.5, "scale_length": 10.0}
AIRCRAFT = {"mass": 0.5, "wing_area": 0.3}
PITCH_FREE = {"pitch_inertia": 0.01, "cg": 0.3}
TAIL = {"shape": "flat", "chord": 0.1, "elements": 6, "position": [0.8, 0.02], "incidence": -2.0}
SWEEP = {"grid": {"flow.speed": [10.0, 12.0]}}
TABLE = "t,value\n0,0\n0.01,1\n0.02,1\n"
POINTS = "".join(f"{x:.3f} {z:.3f}\n" for x, z in
                 [(1, 0), (0.75, 0.03), (0.5, 0.05), (0.25, 0.05), (0.1, 0.03), (0, 0),
                  (0.1, -0.02), (0.25, -0.03), (0.5, -0.03), (0.75, -0.02), (1, 0)])


@dataclass
class Case:
    id: str
    key: str                       # the key the one error line must name
    words: str                     # words of the message (what is wrong, what is allowed)
    change: dict = field(default_factory=dict)   # dotted key -> value (DEL: remove) on GOOD
    files: dict = field(default_factory=dict)    # extra files beside the scenario: name -> text or bytes
    text: str = None               # the scenario file's whole text instead of GOOD
    args: tuple = ()               # more command-line words
    command: str = "run"


def _tail(change):
    """A second element (TAIL) with keys changed (DEL: removed)."""
    return {k: v for k, v in {**TAIL, **change}.items() if v is not DEL}


def _pitch(**kw):
    return {"motion.pitch": kw}


CASES = [
    # --- the file itself
    Case("toml-syntax", "-", "is not valid TOML", text="[flow\nspeed = 3\n"),
    Case("no-such-file", "-", "no such file", text=DEL),
    Case("file-is-a-folder", "-", "is a folder, not a scenario file", text="FOLDER"),
    Case("unknown-section", "extra", "unknown key; allowed: ", {"extra": {"speed": 1.0}}),
    Case("misspelt-section", "flwo", "did you mean 'flow'", {"flow": DEL, "flwo": GOOD["flow"]}),
    *(Case(f"{sec}-not-a-table", sec, f"must be a table ([{sec}])", {sec: 3})
      for sec in ("flow", "airfoil", "motion", "run", "output")),
    Case("title-not-text", "title", "must be a non-empty text", {"title": 3}),
    # --- [flow]
    Case("speed-missing", "flow.speed", "is required", {"flow.speed": DEL}),
    Case("speed-not-number", "flow.speed", "must be a number", {"flow.speed": "fast"}),
    Case("speed-not-finite", "flow.speed", "must be finite", {"flow.speed": float("nan")}),
    Case("speed-range", "flow.speed", "must be >= 0.01 and <= 340", {"flow.speed": -10.0}),
    Case("speed-huge", "flow.speed", "<= 340", {"flow.speed": 1e300}),
    Case("density-and-altitude", "flow.density", "give exactly one", {"flow.altitude": 100.0}),
    Case("density-nor-altitude", "flow.density", "give exactly one", {"flow.density": DEL}),
    Case("density-range", "flow.density", "must be >= 0.01 and <= 2", {"flow.density": 5.0}),
    Case("altitude-not-number", "flow.altitude", "must be a number",
         {"flow.density": DEL, "flow.altitude": "high"}),
    Case("altitude-range", "flow.altitude", "", {"flow.density": DEL, "flow.altitude": 1e6}),
    Case("flow-unknown-key", "flow.sped", "did you mean 'speed'", {"flow.sped": 3.0}),
    # --- [airfoil]
    Case("chord-missing", "airfoil.chord", "is required", {"airfoil.chord": DEL}),
    Case("chord-range", "airfoil.chord", "must be >= 0.001 and <= 20", {"airfoil.chord": 0.0}),
    Case("chord-huge", "airfoil.chord", "<= 20", {"airfoil.chord": 1e300}),
    Case("elements-range", "airfoil.elements", "from 4 to 1000", {"airfoil.elements": 2}),
    Case("elements-whole", "airfoil.elements", "whole number", {"airfoil.elements": 10.5}),
    Case("elements-bool", "airfoil.elements", "whole number", {"airfoil.elements": True}),
    Case("lesp-critical-zero", "airfoil.lesp_critical", "must be > 0", {"airfoil.lesp_critical": 0.0}),
    Case("lesp-critical-negative", "airfoil.lesp_critical", "must be > 0", {"airfoil.lesp_critical": -0.2}),
    Case("lesp-critical-not-number", "airfoil.lesp_critical", "must be a number",
         {"airfoil.lesp_critical": "high"}),
    Case("lesp-critical-not-finite", "airfoil.lesp_critical", "must be finite",
         {"airfoil.lesp_critical": float("inf")}),
    Case("lesp-critical-linear-model", "airfoil.lesp_critical", "cannot shed from the leading edge",
         {"airfoil.lesp_critical": 0.2, "run.model": "linear"}),
    Case("shape-not-text", "airfoil.shape", "non-empty text", {"airfoil.shape": 3}),
    Case("shape-bad-naca", "airfoil.shape", "not a NACA 4-digit designation", {"airfoil.shape": "naca24121"}),
    Case("shape-unknown", "airfoil.shape", "did you mean \"flat\"", {"airfoil.shape": "falt"}),
    Case("shape-folder", "airfoil.shape", "is a folder", {"airfoil.shape": "sub"}, files={"sub/": None}),
    Case("shape-binary", "airfoil.shape", "not a text file", {"airfoil.shape": "s.dat"},
         files={"s.dat": b"\xff\xfe\x00\x81\x92" * 20}),
    Case("shape-not-two-numbers", "airfoil.shape", "is not two numbers", {"airfoil.shape": "s.dat"},
         files={"s.dat": POINTS + "1 zero\n"}),
    Case("shape-three-numbers", "airfoil.shape", "has 3 numbers", {"airfoil.shape": "s.dat"},
         files={"s.dat": POINTS + "1 0 0\n"}),
    Case("shape-not-finite", "airfoil.shape", "not finite", {"airfoil.shape": "s.dat"},
         files={"s.dat": POINTS + "1 nan\n"}),
    Case("shape-no-points", "airfoil.shape", "holds no x z points", {"airfoil.shape": "s.dat"},
         files={"s.dat": "# nothing\n"}),
    Case("shape-few-points", "airfoil.shape", "at least 10 are needed", {"airfoil.shape": "s.dat"},
         files={"s.dat": "1 0\n0.5 0.05\n0 0\n0.5 -0.03\n1 0\n"}),
    Case("shape-coincide", "airfoil.shape", "coincide", {"airfoil.shape": "s.dat"},
         files={"s.dat": "0.5 0\n" * 12}),
    Case("panels-renamed", "airfoil.panels", "was renamed", {"airfoil.panels": 30}),
    Case("thick-not-bool", "airfoil.thick", "must be true or false", {"airfoil.thick": "yes"}),
    Case("thick-flat-plate", "airfoil.thick", "leave thick = false",
         {"airfoil.thick": True, "airfoil.elements": 40}),
    Case("thick-too-few-panels", "airfoil.elements", "an even number of at least 40",
         {"airfoil.thick": True, "airfoil.shape": "naca0012", "airfoil.elements": 20}),
    Case("thick-odd-panels", "airfoil.elements", "an even number",
         {"airfoil.thick": True, "airfoil.shape": "naca0012", "airfoil.elements": 81}),
    Case("thick-linear-model", "airfoil.thick", "has no thickness",
         {"airfoil.thick": True, "airfoil.shape": "naca0012", "airfoil.elements": 40, "run.model": "linear"}),
    Case("thick-with-leading-edge-shedding", "airfoil.thick", "not available with thick = true",
         {"airfoil.thick": True, "airfoil.shape": "naca0012", "airfoil.elements": 40,
          "airfoil.lesp_critical": 0.2}),
    Case("thick-flap-folds", "motion.flap", "the panel inside the turn folds",
         {"airfoil.thick": True, "airfoil.shape": "naca0024", "airfoil.elements": 160,
          "airfoil.flap_hinge": 0.75, "motion.flap": {"law": "constant", "value": 20.0}}),
    Case("thick-open-outline", "airfoil.shape", "is not closed",
         {"airfoil.thick": True, "airfoil.shape": "s.dat", "airfoil.elements": 40},
         files={"s.dat": "".join(f"{x:.3f} {z:.3f}\n" for x, z in
                                 [(1, 0.02), (0.75, 0.03), (0.5, 0.05), (0.25, 0.05), (0.1, 0.03), (0, 0),
                                  (0.1, -0.02), (0.25, -0.03), (0.5, -0.03), (0.75, -0.02), (0.9, -0.4)])}),
    Case("thick-outline-crosses", "airfoil.shape", "cross",
         {"airfoil.thick": True, "airfoil.shape": "s.dat", "airfoil.elements": 40},
         files={"s.dat": "".join(f"{x:.3f} {z:.3f}\n" for x, z in
                                 [(1, 0), (0.75, -0.03), (0.5, -0.05), (0.25, 0.05), (0.1, 0.03), (0, 0),
                                  (0.1, -0.02), (0.25, -0.03), (0.5, 0.03), (0.75, 0.02), (1, 0)])}),
    Case("airfoil-unknown-key", "airfoil.chrod", "did you mean 'chord'", {"airfoil.chrod": 0.2}),
    # --- [[airfoil]]: several elements (inputs.elements)
    *(Case(f"elements-{name}", key, words, {"airfoil": [GOOD["airfoil"], _tail(tail)], **more})
      for name, key, words, tail, more in (
          ("position-missing", "airfoil[1].position", "is required", {"position": DEL}, {}),
          ("position-not-pair", "airfoil[1].position", "must be [x, z]", {"position": [0.5]}, {}),
          ("position-not-numbers", "airfoil[1].position", "must be [x, z]", {"position": ["a", 0.0]}, {}),
          ("incidence-range", "airfoil[1].incidence", "must be >= -45 and <= 45", {"incidence": 60.0}, {}),
          ("chord-missing", "airfoil[1].chord", "is required", {"chord": DEL}, {}),
          ("chord-range", "airfoil[1].chord", "must be >= 0.001", {"chord": 0.0}, {}),
          ("count-range", "airfoil[1].elements", "from 4 to 1000", {"elements": 2}, {}),
          ("shape-unknown", "airfoil[1].shape", "did you mean", {"shape": "falt"}, {}),
          ("overlap", "airfoil[1].position", "overlaps or touches element 1 (airfoil[0])",
           {"position": [0.05, 0.0]}, {}),
          ("crossing", "airfoil[1].position", "overlaps or touches element 1",
           {"position": [0.1, 0.02], "incidence": 30.0}, {}),
          ("thick-not-bool", "airfoil[1].thick", "must be true or false", {"thick": "yes"}, {}),
          ("thick-flat-plate", "airfoil[1].thick", "leave thick = false", {"thick": True, "elements": 40}, {}),
          ("thick-too-few-panels", "airfoil[1].elements", "an even number of at least 40",
           {"thick": True, "shape": "naca0012", "elements": 20}, {}),
          ("thick-odd-panels", "airfoil[1].elements", "an even number",
           {"thick": True, "shape": "naca0012", "elements": 41}, {}),
          ("thick-outline-overlap", "airfoil[1].position", "overlaps or touches element 1",
           {}, {"airfoil": [{**GOOD["airfoil"], "shape": "naca0012", "thick": True, "elements": 40},
                            _tail({"thick": True, "shape": "naca0024", "elements": 40, "position": [0.2, 0.01],
                                   "incidence": 0.0})]}),
          ("ground-thick-tail-lower-surface", "ground.height", "the elements' lowest point is 0.1039 m below",
           {"thick": True, "shape": "naca0009", "elements": 40, "position": [0.8, -0.1]},
           {"ground": {"height": 0.1}}),
          ("thick-flap", "airfoil[1].flap_hinge", "with surface panels (thick = true) is not supported",
           {"thick": True, "shape": "naca0012", "elements": 40, "flap_hinge": 0.7}, {}),
          ("lesp-zero", "airfoil[1].lesp_critical", "must be > 0", {"lesp_critical": 0.0}, {}),
          ("lesp-negative", "airfoil[1].lesp_critical", "must be > 0", {"lesp_critical": -0.2}, {}),
          ("lesp-not-number", "airfoil[1].lesp_critical", "must be a number", {"lesp_critical": "high"}, {}),
          ("lesp-not-finite", "airfoil[1].lesp_critical", "must be finite", {"lesp_critical": float("inf")}, {}),
          ("lesp-coarse", "airfoil[1].lesp_critical", "give airfoil[1].elements >= 5",
           {"lesp_critical": 0.2, "elements": 4, "chord": 0.12}, {}),
          ("flap-hinge-range", "airfoil[1].flap_hinge", "must be > 0.05 and < 0.95", {"flap_hinge": 0.99}, {}),
          ("flap-hinge-not-number", "airfoil[1].flap_hinge", "must be a number", {"flap_hinge": "aft"}, {}),
          ("flap-deflection-without-hinge", "airfoil[1].flap_deflection", "needs a flap on this element",
           {"flap_deflection": 5.0}, {}),
          ("flap-deflection-range", "airfoil[1].flap_deflection", "must be >= -60 and <= 60",
           {"flap_hinge": 0.7, "flap_deflection": 75.0}, {}),
          ("flap-deflection-not-number", "airfoil[1].flap_deflection", "must be a number",
           {"flap_hinge": 0.7, "flap_deflection": "down"}, {}),
          ("flap-deflection-crosses", "airfoil[2].position", "overlaps or touches element 2 (airfoil[1])",
           {"flap_hinge": 0.5, "flap_deflection": 40.0},
           {"airfoil": [GOOD["airfoil"], _tail({"flap_hinge": 0.5, "flap_deflection": 40.0}),
                        _tail({"position": [0.86, -0.005], "chord": 0.05, "incidence": 0.0})]}),
          ("unknown-key", "airfoil[1].positon", "did you mean 'position'", {"positon": [1.0, 0.0]}, {}),
          ("linear-model", "airfoil", "need run.model = \"vortex\"", {}, {"run": {"chords": 2, "model": "linear"}}),
          ("ground-tail-in-the-ground", "ground.height", "the elements' lowest point is 0.1003 m below",
           {"position": [0.8, -0.1]}, {"ground": {"height": 0.05}}),
          ("shedding-with-a-thick-tail", "airfoil.lesp_critical", "not available in a list with a thick element",
           {}, {"airfoil": [{**GOOD["airfoil"], "lesp_critical": 0.2},
                            _tail({"thick": True, "shape": "naca0012", "elements": 40})]}),
          ("thick-tail-sheds", "airfoil[1].lesp_critical", "not available in a list with a thick element",
           {"thick": True, "shape": "naca0012", "elements": 40, "lesp_critical": 0.2}, {}),
          ("first-thick-leading-edge-shedding", "airfoil.thick", "not available with thick = true", {},
           {"airfoil": [{**GOOD["airfoil"], "thick": True, "shape": "naca0012", "elements": 40,
                         "lesp_critical": 0.2}, TAIL]}),
      )),
    Case("elements-empty-list", "airfoil", "needs at least one table", {"airfoil": []}),
    Case("elements-too-many", "airfoil", "at most 8", {"airfoil": [GOOD["airfoil"]] + [
        {**TAIL, "position": [1.0 + 0.5 * i, 0.0]} for i in range(8)]}),
    # --- [motion]
    Case("pivot-range", "motion.pivot", "must be >= -0.5 and <= 1.5", {"motion.pivot": 2.0}),
    Case("pivot-not-number", "motion.pivot", "must be a number", {"motion.pivot": "quarter"}),
    Case("pitch-not-a-table", "motion.pitch", "must be a law table", {"motion.pitch": 3}),
    Case("law-missing", "motion.pitch.law", "missing", _pitch(value=1.0)),
    Case("law-unknown", "motion.pitch.law", "did you mean 'ramp'", _pitch(law="rmap")),
    Case("law-unknown-key", "motion.pitch.strat", "unknown key for the 'ramp' law",
         _pitch(law="ramp", **{"from": 0.0}, to=3.0, strat=0.0, duration=0.02)),
    Case("law-key-missing", "motion.pitch.duration", "missing",
         _pitch(law="ramp", **{"from": 0.0}, to=3.0, start=0.0)),
    Case("law-not-number", "motion.pitch.from", "expected a number",
         _pitch(law="ramp", **{"from": "zero"}, to=3.0, start=0.0, duration=0.02)),
    Case("law-not-finite", "motion.pitch.to", "must be a finite number",
         _pitch(law="ramp", **{"from": 0.0}, to=float("inf"), start=0.0, duration=0.02)),
    Case("ramp-duration", "motion.pitch.duration", "must be above 0",
         _pitch(law="ramp", **{"from": 0.0}, to=3.0, start=0.0, duration=0.0)),
    Case("ramp-smoothing", "motion.pitch.smoothing", "positive time",
         _pitch(law="ramp", **{"from": 0.0}, to=3.0, start=0.0, duration=0.02, smoothing=-1.0)),
    Case("sine-both-frequencies", "motion.pitch.reduced_frequency", "give exactly one",
         _pitch(law="sine", amplitude=2.0, frequency=5.0, reduced_frequency=0.1)),
    Case("sine-no-frequency", "motion.pitch.frequency", "give exactly one", _pitch(law="sine", amplitude=2.0)),
    Case("sine-frequency", "motion.pitch.frequency", "must be above 0 Hz",
         _pitch(law="sine", amplitude=2.0, frequency=-5.0)),
    Case("sine-reduced-frequency", "motion.pitch.reduced_frequency", "must be above 0",
         _pitch(law="sine", amplitude=2.0, reduced_frequency=0.0)),
    Case("table-file-not-text", "motion.pitch.file", "expected text", _pitch(law="table", file=3)),
    Case("table-file-empty-name", "motion.pitch.file", "is empty", _pitch(law="table", file=" ")),
    Case("table-interpolation", "motion.pitch.interpolation", "must be one of 'monotone', 'linear'",
         _pitch(law="table", file="p.csv", interpolation="spline"), files={"p.csv": TABLE}),
    Case("table-not-found", "motion.pitch.file", "not found", _pitch(law="table", file="none.csv")),
    Case("table-folder", "motion.pitch.file", "is a folder", _pitch(law="table", file="sub"),
         files={"sub/": None}),
    Case("table-binary", "motion.pitch.file", "not a text (CSV) file", _pitch(law="table", file="p.csv"),
         files={"p.csv": b"\xff\xfe\x00\x81" * 10}),
    Case("table-empty", "motion.pitch.file", "is empty", _pitch(law="table", file="p.csv"),
         files={"p.csv": "# only a comment\n"}),
    Case("table-no-column", "motion.pitch.file", "has no column 'value'", _pitch(law="table", file="p.csv"),
         files={"p.csv": "t,angle\n0,0\n1,1\n"}),
    Case("table-one-row", "motion.pitch.file", "has 1 data row", _pitch(law="table", file="p.csv"),
         files={"p.csv": "t,value\n0,0\n"}),
    Case("table-not-number", "motion.pitch.file", "row 2 (line 3)", _pitch(law="table", file="p.csv"),
         files={"p.csv": "t,value\n0,0\n0.01,ten\n"}),
    Case("table-not-finite", "motion.pitch.file", "is not finite", _pitch(law="table", file="p.csv"),
         files={"p.csv": "t,value\n0,0\n0.01,inf\n"}),
    Case("table-not-increasing", "motion.pitch.file", "must increase strictly",
         _pitch(law="table", file="p.csv"), files={"p.csv": "t,value\n0,0\n0.02,1\n0.01,2\n"}),
    # ranges of the laws' numbers (issue 10 item 13): nothing `check` passes makes `run` fail
    Case("step-time-range", "motion.pitch.time", "must be from -10000 to 10000 s",
         _pitch(law="step", value=2.0, time=1e300)),
    Case("ramp-start-range", "motion.pitch.start", "must be from -10000 to 10000 s",
         _pitch(law="ramp", **{"from": 0.0, "to": 2.0, "start": -1e300, "duration": 0.01})),
    Case("ramp-duration-long", "motion.pitch.duration", "must be at most 10000 s",
         _pitch(law="ramp", **{"from": 0.0, "to": 2.0, "start": 0.0, "duration": 1e300})),
    Case("ramp-smoothing-long", "motion.pitch.smoothing", "must be at most 10000 s",
         _pitch(law="ramp", **{"from": 0.0, "to": 2.0, "start": 0.0, "duration": 0.01, "smoothing": 1e300})),
    Case("ramp-smoothing-tiny", "motion.pitch.smoothing", "from 1e-06 to 10000 s",
         _pitch(law="ramp", **{"from": 0.0, "to": 2.0, "start": 0.0, "duration": 0.01, "smoothing": 1e-300})),
    Case("pitch-value-range", "motion.pitch.to", "must be from -180 to 180 deg",
         _pitch(law="ramp", **{"from": 0.0, "to": 1e300, "start": 0.0, "duration": 0.01})),
    Case("pitch-constant-range", "motion.pitch.value", "must be from -180 to 180 deg",
         _pitch(law="constant", value=400.0)),
    Case("sine-frequency-high", "motion.pitch.frequency", "must be at most 1000 Hz",
         _pitch(law="sine", amplitude=2.0, frequency=1e300)),
    Case("sine-reduced-frequency-high", "motion.pitch.reduced_frequency", "must be at most 20",
         _pitch(law="sine", amplitude=2.0, reduced_frequency=1e300)),
    Case("sine-phase-range", "motion.pitch.phase", "must be from -360 to 360 deg",
         _pitch(law="sine", amplitude=2.0, frequency=5.0, phase=1e300)),
    Case("sine-amplitude-range", "motion.pitch.amplitude", "must be from -180 to 180 deg",
         _pitch(law="sine", amplitude=1e300, frequency=5.0)),
    Case("sine-mean-range", "motion.pitch.mean", "must be from -180 to 180 deg",
         _pitch(law="sine", amplitude=1.0, mean=-1e300, frequency=5.0)),
    Case("plunge-range", "motion.plunge.amplitude", "must be from -20 to 20 m (100 chords)",
         {"motion.plunge": {"law": "sine", "amplitude": 1e300, "frequency": 5.0}}),
    Case("table-times-range", "motion.pitch.file", "times must be from -10000 to 10000 s",
         _pitch(law="table", file="p.csv"), files={"p.csv": "t,value\n0,0\n1e300,1\n"}),
    Case("table-values-range", "motion.pitch.file", "values must be from -180 to 180 deg",
         _pitch(law="table", file="p.csv"), files={"p.csv": "t,value\n0,0\n0.01,1e300\n"}),
    Case("law-list-empty", "motion.pitch.law", "the list of laws is empty", {"motion.pitch": []}),
    Case("law-list-item", "motion.pitch[1].value", "missing",
         {"motion.pitch": [{"law": "constant", "value": 1.0}, {"law": "constant"}]}),
    Case("plunge-law", "motion.plunge.amplitude", "missing", {"motion.plunge": {"law": "sine", "frequency": 5.0}}),
    # --- the flap ([airfoil] flap_hinge, [motion] flap)
    Case("flap-hinge-low", "airfoil.flap_hinge", "must be > 0.05 and < 0.95", {"airfoil.flap_hinge": 0.05}),
    Case("flap-hinge-high", "airfoil.flap_hinge", "must be > 0.05 and < 0.95", {"airfoil.flap_hinge": 0.97}),
    Case("flap-hinge-not-number", "airfoil.flap_hinge", "must be a number", {"airfoil.flap_hinge": "aft"}),
    Case("flap-without-hinge", "motion.flap", "needs a flap: give airfoil.flap_hinge",
         {"motion.flap": {"law": "constant", "value": 5.0}}),
    Case("flap-not-a-table", "motion.flap", "must be a law table", {"airfoil.flap_hinge": 0.75, "motion.flap": 3}),
    Case("flap-law", "motion.flap.value", "missing", {"airfoil.flap_hinge": 0.75, "motion.flap": {"law": "step",
                                                                                                 "time": 0.01}}),
    Case("flap-too-far", "motion.flap", "at most 60 are accepted",
         {"airfoil.flap_hinge": 0.75, "motion.flap": {"law": "constant", "value": 70.0}}),
    # --- [ground]
    Case("ground-not-a-table", "ground", "must be a table [ground]", {"ground": 0.1}),
    Case("ground-height-missing", "ground.height", "is required", {"ground": {}}),
    Case("ground-height-not-number", "ground.height", "must be a number", {"ground.height": "low"}),
    Case("ground-height-zero", "ground.height", "must be > 0", {"ground.height": 0.0}),
    Case("ground-height-huge", "ground.height", "<= 10000", {"ground.height": 1e6}),
    Case("ground-in-the-ground", "ground.height", "would start in the ground",
         {"ground.height": 0.02, "motion.pitch": {"law": "constant", "value": 10.0}}),
    Case("ground-flap-in-the-ground", "ground.height", "would start in the ground",
         {"ground.height": 0.01, "airfoil.flap_hinge": 0.6, "motion.flap": {"law": "constant", "value": 20.0},
          "motion.pivot": 0.0}),
    Case("ground-linear", "ground", "computed by the vortex model only", {"ground.height": 0.1,
                                                                         "run.model": "linear"}),
    Case("ground-thick-in-the-ground", "ground.height", "the lower surface's lowest point is",
         {"ground.height": 0.01, "airfoil.thick": True, "airfoil.shape": "naca0012", "airfoil.elements": 40}),
    Case("ground-unknown-key", "ground.hieght", "did you mean 'height'", {"ground.hieght": 0.1,
                                                                          "ground.height": 0.1}),
    # --- what this version does not do (several elements, pitch freedom)
    Case("pitch-inertia-one-element", "aircraft.pitch_inertia", "pitch freedom needs a wing and a tail",
         {"aircraft": {**AIRCRAFT, "pitch_inertia": 0.01, "cg": 0.3}, "motion": {}}),
    Case("cg-without-inertia", "aircraft.pitch_inertia", "is required with pitch freedom",
         {"aircraft": {**AIRCRAFT, "cg": 0.3}, "airfoil": [GOOD["airfoil"], TAIL], "motion": {}}),
    Case("inertia-without-cg", "aircraft.cg", "is required with pitch freedom",
         {"aircraft": {**AIRCRAFT, "pitch_inertia": 0.01}, "airfoil": [GOOD["airfoil"], TAIL], "motion": {}}),
    *(Case(f"pitch-freedom-{name}", key, words, {"aircraft": {**AIRCRAFT, **PITCH_FREE, **ac},
                                                 "airfoil": [{**GOOD["airfoil"], **first}, TAIL], "motion": mo})
      for name, key, words, ac, first, mo in (
          ("inertia-zero", "aircraft.pitch_inertia", "must be >= 1e-08", {"pitch_inertia": 0.0}, {}, {}),
          ("inertia-not-number", "aircraft.pitch_inertia", "must be a number", {"pitch_inertia": "big"}, {}, {}),
          ("cg-range", "aircraft.cg", "must be >= -0.5 and <= 1.5", {"cg": 3.0}, {}, {}),
          ("pitch-law", "motion.pitch", "cannot be prescribed with pitch freedom", {}, {},
           {"pitch": {"law": "constant", "value": 2.0}}),
          ("pivot", "motion.pivot", "turns about its centre of gravity", {}, {}, {"pivot": 0.5}),
          ("aspect-ratio", "aircraft.aspect_ratio", "cannot be used with pitch freedom", {"aspect_ratio": 8.0},
           {}, {}),
          ("heave-only-run-not-bool", "aircraft.heave_only_run", "must be true or false",
           {"heave_only_run": "yes"}, {}, {}),
          ("heave-only-run-number", "aircraft.heave_only_run", "must be true or false",
           {"heave_only_run": 1}, {}, {}),
      )),
    Case("pitch-freedom-elevator-deflection", "airfoil[1].flap_deflection", "is set by the trim",
         {"aircraft": {**AIRCRAFT, **PITCH_FREE}, "motion": {},
          "airfoil": [GOOD["airfoil"], {**TAIL, "flap_hinge": 0.7, "flap_deflection": 2.0}]}),
    Case("heave-only-run-without-pitch-freedom", "aircraft.heave_only_run", "belongs to pitch freedom",
         {"aircraft": {**AIRCRAFT, "heave_only_run": True}}),
    Case("first-element-flap-deflection", "airfoil.flap_deflection", "follows motion.flap",
         {"airfoil.flap_hinge": 0.7, "airfoil.flap_deflection": 3.0}),
    Case("pitch-freedom-no-elevator-trim", "aircraft.cg", "elevator) deflected within 20 degrees",
         {"aircraft": {**AIRCRAFT, **PITCH_FREE}, "motion": {},
          "airfoil": [GOOD["airfoil"], {**TAIL, "flap_hinge": 0.9, "incidence": 12.0}]}),
    Case("pitch-freedom-no-elevator-trim-check", "aircraft.cg", "elevator) deflected within 20 degrees",
         {"aircraft": {**AIRCRAFT, **PITCH_FREE}, "motion": {},
          "airfoil": [GOOD["airfoil"], {**TAIL, "flap_hinge": 0.9, "incidence": 12.0}]}, command="check"),
    Case("pitch-freedom-no-trim", "aircraft.cg", "no trim",
         {"aircraft": {**AIRCRAFT, **PITCH_FREE, "cg": 1.5},
          "airfoil": [GOOD["airfoil"], {**TAIL, "chord": 0.01, "position": [0.3, 0.02]}], "motion": {}}),
    Case("motion-unknown-key", "motion.plnge", "did you mean 'plunge'", {"motion.plnge": {"law": "constant"}}),
    # --- [run]
    Case("duration-and-chords", "run.duration", "give exactly one", {"run.duration": 0.1}),
    Case("duration-range", "run.duration", "must be > 0", {"run.chords": DEL, "run.duration": 0.0}),
    Case("chords-range", "run.chords", "must be > 0", {"run.chords": -1.0}),
    Case("dt-range", "run.dt", "must be >= 1e-07 and <= 10 s", {"run.dt": 0.0}),
    Case("dt-huge", "run.dt", "must be >= 1e-07 and <= 10 s", {"run.dt": 1e300}),
    Case("dt-longer-than-run", "run.dt", "longer than the run", {"run.dt": 1.0}),
    Case("dt-too-many-steps", "run.dt", "at most 5e6", {"run.dt": 1e-7, "run.chords": 2000}),
    Case("duration-long", "run.duration", "must be > 0 and <= 3600 s",
         {"run.chords": DEL, "run.duration": 1e300}),
    Case("chords-many", "run.chords", "must be > 0 and <= 100000", {"run.chords": 1e300}),
    Case("core-radius-wide", "run.core_radius", "<= 0.1 m (at most 0.5 chord)", {"run.core_radius": 1e3}),
    Case("far-wake-far", "run.far_wake", "must be > 1 and <= 100000", {"run.far_wake": 1e300}),
    Case("wake", "run.wake", "must be one of 'free', 'frozen'", {"run.wake": "rolling"}),
    Case("start", "run.start", "must be one of 'steady', 'impulsive'", {"run.start": "sudden"}),
    Case("model", "run.model", "must be one of 'vortex'", {"run.model": "panel"}),
    Case("shed-offset", "run.shed_offset", "must be >= 0.05 and <= 1", {"run.shed_offset": 2.0}),
    Case("core-radius", "run.core_radius", "must be > 0", {"run.core_radius": 0.0}),
    Case("far-wake", "run.far_wake", "must be > 1", {"run.far_wake": 1.0}),
    Case("run-unknown-key", "run.durration", "did you mean 'duration'", {"run.durration": 1.0}),
    # --- [output]
    Case("dir-empty", "output.dir", "must be a non-empty text", {"output.dir": ""}),
    Case("snapshot-every", "output.snapshot_every", "must be >= 0", {"output.snapshot_every": -1.0}),
    Case("plots", "output.plots", "must be true or false", {"output.plots": "yes"}),
    Case("output-unknown-key", "output.dri", "did you mean 'dir'", {"output.dri": "x"}),
    # --- [gust]
    Case("gust-not-a-table", "gust", "must be a table [gust] or a list", {"gust": 3}),
    Case("gust-empty-list", "gust", "must be a table [gust] or a list", {"gust": []}),
    Case("gust-profile-missing", "gust.profile", "is required", {"gust": {"amplitude": 1.0}}),
    Case("gust-profile-unknown", "gust.profile", "must be one of", {"gust": {**GUST, "profile": "gaussian"}}),
    Case("gust-unknown-key", "gust.amplitud", "unknown key", {"gust": {**GUST, "amplitud": 1.0}}),
    Case("gust-key-missing", "gust.length", "is required for the 'one-minus-cosine' profile",
         {"gust": {k: v for k, v in GUST.items() if k != "length"}}),
    Case("gust-direction", "gust.direction", "must be one of", {"gust": {**GUST, "direction": "sideways"}}),
    Case("gust-positive", "gust.amplitude", "must be > 0", {"gust": {**GUST, "amplitude": 0.0}}),
    Case("gust-arrival", "gust.arrival", "must be a number", {"gust": {**GUST, "arrival": "soon"}}),
    Case("gust-sine-both", "gust.wavelength", "give exactly one",
         {"gust": {"profile": "sine", "amplitude": 1.0, "wavelength": 2.0, "reduced_frequency": 0.2}}),
    Case("gust-spectrum", "gust.spectrum", "must be one of 'dryden', 'von-karman'",
         {"gust": {**TURB, "spectrum": "kolmogorov"}}),
    Case("gust-seed", "gust.seed", "must be >= 0", {"gust": {**TURB, "seed": -1}}),
    Case("gust-file-not-text", "gust.file", "must be a text", {"gust": {"profile": "table", "file": 3}}),
    Case("gust-file-missing", "gust.file", "not found", {"gust": {"profile": "table", "file": "g.csv"}}),
    Case("gust-file-negative-x", "gust.file", "distances into the gust are >= 0",
         {"gust": {"profile": "table", "file": "g.csv"}}, files={"g.csv": "x,w\n-1,0\n1,2\n"}),
    Case("gust-list-item", "gust[1].profile", "is required", {"gust": [GUST, {"amplitude": 1.0}]}),
    Case("gust-amplitude-range", "gust.amplitude", "<= 100 m/s", {"gust": {**GUST, "amplitude": 1e300}}),
    Case("gust-length-range", "gust.length", "<= 100000 m", {"gust": {**GUST, "length": 1e300}}),
    Case("gust-length-short", "gust.length", ">= 0.001", {"gust": {**GUST, "length": 1e-9}}),
    Case("gust-arrival-range", "gust.arrival", "<= 1e+06 s", {"gust": {**GUST, "arrival": 1e300}}),
    Case("gust-wavelength-range", "gust.wavelength", "<= 100000 m",
         {"gust": {"profile": "sine", "amplitude": 1.0, "wavelength": 1e300}}),
    Case("gust-reduced-frequency-range", "gust.reduced_frequency", "<= 50",
         {"gust": {"profile": "sine", "amplitude": 1.0, "reduced_frequency": 1e3}}),
    Case("gust-intensity-range", "gust.intensity", "<= 50 m/s", {"gust": {**TURB, "intensity": 1e9}}),
    Case("gust-scale-length-tiny", "gust.scale_length", ">= 0.01 and <= 100000 m",
         {"gust": {**TURB, "scale_length": 1e-9}}),
    Case("gust-turbulence-memory", "gust.scale_length", "GiB", {"gust": {**TURB, "scale_length": 1e5}}),
    Case("gust-realisations-zero", "gust.realisations", "must be from 1 to 64",
         {"gust": {**TURB, "realisations": 0}, "aircraft": AIRCRAFT}),
    Case("gust-realisations-list", "gust.realisations", "must list distinct seeds",
         {"gust": {**TURB, "realisations": [3, 3]}, "aircraft": AIRCRAFT}),
    Case("gust-realisations-list-long", "gust.realisations", "1 to 64 seeds",
         {"gust": {**TURB, "realisations": list(range(65))}, "aircraft": AIRCRAFT}),
    Case("gust-realisations-seed", "gust.realisations", "must be >= 0",
         {"gust": {**TURB, "realisations": [1, -2]}, "aircraft": AIRCRAFT}),
    Case("gust-realisations-not-turbulence", "gust.realisations", "need a 'turbulence' gust",
         {"gust": {**GUST, "realisations": 4}, "aircraft": AIRCRAFT}),
    Case("gust-realisations-no-aircraft", "gust.realisations", "need [aircraft]",
         {"gust": {**TURB, "realisations": 4}}),
    Case("gust-realisations-streamwise", "gust.realisations", "one vertical turbulence gust alone",
         {"gust": {**TURB, "realisations": 4, "direction": "streamwise"}, "aircraft": AIRCRAFT}),
    # --- [aircraft]
    Case("aircraft-not-a-table", "aircraft", "must be a table [aircraft]", {"aircraft": 3}),
    Case("aircraft-mass-missing", "aircraft.mass", "is required", {"aircraft": {"wing_area": 0.3}}),
    Case("aircraft-mass", "aircraft.mass", "must be > 0", {"aircraft": {**AIRCRAFT, "mass": -1.0}}),
    Case("aircraft-wing-area", "aircraft.wing_area", "must be > 0", {"aircraft": {**AIRCRAFT, "wing_area": 0.0}}),
    Case("aircraft-aspect-ratio", "aircraft.aspect_ratio", "must be > 0",
         {"aircraft": {**AIRCRAFT, "aspect_ratio": 0.0}}),
    Case("aircraft-span", "aircraft.span", "<= 200", {"aircraft": {**AIRCRAFT, "span": 300.0}}),
    Case("aircraft-span-disagrees", "aircraft.span", "make them agree within 1 %",
         {"aircraft": {**AIRCRAFT, "span": 1.5, "aspect_ratio": 5.0}}),
    Case("aircraft-with-plunge", "motion.plunge", "cannot be prescribed with [aircraft]",
         {"aircraft": AIRCRAFT, "motion.plunge": {"law": "constant", "value": 0.0}}),
    Case("aircraft-small-wing", "aircraft.wing_area", "less than chord^2",
         {"aircraft": {**AIRCRAFT, "wing_area": 0.01}}),
    Case("aircraft-too-heavy", "aircraft.mass", "level flight would need a section lift coefficient",
         {"aircraft": {**AIRCRAFT, "mass": 50.0}}),
    Case("aircraft-mass-huge", "aircraft.mass", "<= 1e+06 kg", {"aircraft": {**AIRCRAFT, "mass": 1e300}}),
    Case("aircraft-wing-area-huge", "aircraft.wing_area", "<= 1000 m^2",
         {"aircraft": {**AIRCRAFT, "wing_area": 1e300}}),
    Case("aircraft-aspect-ratio-huge", "aircraft.aspect_ratio", ">= 0.2 and <= 50",
         {"aircraft": {**AIRCRAFT, "aspect_ratio": 1e300}}),
    Case("aircraft-unknown-key", "aircraft.masss", "unknown key", {"aircraft": {**AIRCRAFT, "masss": 1.0}}),
    # --- [sweep]: the section
    Case("sweep-not-a-table", "sweep", "must be a table ([sweep])", {"sweep": 3}),
    Case("sweep-unknown-key", "sweep.gird", "did you mean 'grid'", {"sweep": {**SWEEP, "gird": {}}}),
    Case("sweep-save-runs", "sweep.save_runs", "must be true or false", {"sweep": {**SWEEP, "save_runs": "yes"}}),
    Case("sweep-grid-not-a-table", "sweep.grid", "must be a table of scenario keys", {"sweep": {"grid": 3}}),
    Case("sweep-grid-not-a-list", "sweep.grid.flow.speed", "must be a non-empty list",
         {"sweep": {"grid": {"flow.speed": 10.0}}}),
    Case("sweep-cases-not-a-list", "sweep.cases", "must be a list of tables", {"sweep": {"cases": 3}}),
    Case("sweep-case-not-a-table", "sweep.cases[0]", "must be a table of overrides", {"sweep": {"cases": [1]}}),
    Case("sweep-case-name", "sweep.cases[0].name", "it names a folder",
         {"sweep": {"cases": [{"name": "a b", "flow.speed": 12.0}]}}),
    Case("sweep-empty", "sweep", "needs a grid", {"sweep": {"save_runs": False}}),
    Case("sweep-too-many", "sweep.grid", "at most 100000",
         {"sweep": {"grid": {"flow.speed": [10.0 + i / 1000 for i in range(317)],
                             "flow.density": [1.0 + i / 1000 for i in range(317)]}}}),
    Case("sweep-name-not-text", "sweep.name", "must be a non-empty text", {"sweep": {**SWEEP, "name": 3}}),
    Case("sweep-name-unknown-key", "sweep.name", "not a grid key", {"sweep": {**SWEEP, "name": "V{flow.sped}"}}),
    Case("sweep-name-duplicate", "sweep.name", "both called", {"sweep": {**SWEEP, "name": "same"}}),
    Case("sweep-name-folder", "sweep.name", "it names a folder", {"sweep": {**SWEEP, "name": "V {flow.speed}"}}),
    Case("sweep-envelope-not-a-table", "sweep.envelope", "must be a table like",
         {"sweep": {**SWEEP, "envelope": 3}}),
    Case("sweep-envelope-unknown-key", "sweep.envelope.valeu", "unknown key",
         {"sweep": {**SWEEP, "envelope": {"valeu": "cl_max"}}}),
    Case("sweep-envelope-value", "sweep.envelope.value", "must be a text",
         {"sweep": {**SWEEP, "envelope": {"value": 3}}}),
    Case("sweep-envelope-across", "sweep.envelope.across", "must be one of the swept keys",
         {"sweep": {**SWEEP, "envelope": {"across": "flow.density"}}}),
    Case("sweep-envelope-lines", "sweep.envelope.lines", "must be one of the swept keys",
         {"sweep": {**SWEEP, "envelope": {"lines": "airfoil.chord"}}}),
    Case("sweep-name-format", "sweep.name", "does not apply", {"sweep": {**SWEEP, "name": "V{flow.speed:q}"}}),
    # --- [sweep]: its cases, as `unsteady check` sees them
    Case("sweep-grid-bad-key-once", "sweep[all 2 cases].flow.sped", "did you mean 'speed'",
         {"sweep": {"grid": {"flow.sped": [10.0, 12.0]}}}, command="check"),
    Case("sweep-envelope-value-not-given", "sweep.envelope.value", "no case of this sweep gives",
         {"sweep": {**SWEEP, "envelope": {"value": "n_max"}}}, command="check"),
    Case("sweep-envelope-lines-is-across", "sweep.envelope.lines", "is the key across the picture too",
         {"sweep": {"grid": {"flow.speed": [10.0, 12.0], "flow.density": [1.2, 1.1]},
                    "envelope": {"across": "flow.speed", "lines": "flow.speed"}}}, command="check"),
    Case("sweep-case-invalid", "sweep[case-001].flow.speed", "must be >= 0.01",
         {"sweep": {"grid": {"flow.speed": [-3.0]}}}, command="check"),
    # --- --set on the command line
    Case("set-no-equals", "--set flow.speed", "an override must look like key.path=value",
         args=("--set", "flow.speed")),
    Case("set-empty-part", "--set flow..speed=3", "an override must look like key.path=value",
         args=("--set", "flow..speed=3")),
    Case("set-inside-list", "--set motion.pitch.0.value", "is a list (of laws or gusts)",
         {"motion.pitch": [{"law": "constant", "value": 1.0}]}, args=("--set", "motion.pitch.0.value=1")),
    Case("set-not-a-table", "--set flow.speed.x", "'flow.speed' is not a table", args=("--set", "flow.speed.x=1")),
    Case("set-unknown-key", "airfoil.element", "did you mean 'elements'", args=("--set", "airfoil.element=30")),
    Case("set-bad-value", "flow.speed", "must be a number", args=("--set", "flow.speed=fast")),
]


#: A valid table of each gust profile (a new profile needs one here: the generated cases use it).
GUST_EXAMPLES = {
    "sharp-edged": {"amplitude": 1.0},
    "one-minus-cosine": {"amplitude": 1.0, "length": 1.0},
    "sine": {"amplitude": 1.0, "wavelength": 2.0},
    "table": {"file": "g.csv"},
    "turbulence": {"spectrum": "dryden", "intensity": 0.5, "scale_length": 10.0},
}
GUST_TABLE = "x,w\n0,0\n1,2\n2,0\n"


def _generated_cases():
    """Every key of every motion law and gust profile: a value of the wrong type (text where a
    number belongs, a number where a text belongs) and, for the keys that must be positive, zero."""
    from unsteady.inputs.gusts import PROFILES
    from unsteady.inputs.motion import LAWS
    out = []
    for name, law in LAWS.items():
        for key in (*law.KEYS, *law.OPTIONAL):
            spec = {"law": name, **{k: ("p.csv" if k in law.TEXT else 0.01) for k in law.KEYS}}
            spec[key] = 3 if key in law.TEXT else "x"
            out.append(Case(f"law-{name}-{key}-type", f"motion.pitch.{key}",
                            "expected text" if key in law.TEXT else "expected a number",
                            {"motion.pitch": spec}, files={"p.csv": TABLE}))
    for name, prof in PROFILES.items():
        keys = (*prof.KEYS, *prof.OPTIONAL)
        for key in keys:
            spec = {"profile": name, **GUST_EXAMPLES[name]}
            spec[key] = 3 if key in prof.TEXT else "x"
            out.append(Case(f"gust-{name}-{key}-type", f"gust.{key}", "must be a", {"gust": spec},
                            files={"g.csv": GUST_TABLE}))
        for key in prof.POSITIVE:
            spec = {"profile": name, **GUST_EXAMPLES[name], key: 0.0}
            if name == "sine" and key == "reduced_frequency":
                spec.pop("wavelength")
            out.append(Case(f"gust-{name}-{key}-positive", f"gust.{key}", "must be > 0", {"gust": spec}))
    return out


CASES += _generated_cases()


def _apply(raw, change):
    for dotted, value in change.items():
        parts = dotted.split(".")
        node = raw
        for p in parts[:-1]:
            node = node.setdefault(p, {})
        if value is DEL:
            node.pop(parts[-1], None)
        else:
            node[parts[-1]] = copy.deepcopy(value)
    return raw


def _write(tmp_path, case):
    path = tmp_path / "scenario.toml"
    for name, content in case.files.items():
        p = tmp_path / name
        if name.endswith("/"):
            p.mkdir()
        elif isinstance(content, bytes):
            p.write_bytes(content)
        else:
            p.write_text(content)
    if case.text is DEL:
        return path                                  # no file at all
    if case.text == "FOLDER":
        path.mkdir()
        return path
    if case.text is not None:
        path.write_text(case.text)
        return path
    path.write_text(tomli_w.dumps(_apply(copy.deepcopy(GOOD), case.change)))
    return path


def _listing(root):
    return sorted((str(p.relative_to(root)), p.stat().st_size if p.is_file() else -1) for p in root.rglob("*"))


def test_the_good_scenario_passes_without_a_word(tmp_path, capsys):
    path = _write(tmp_path, Case("good", "", ""))
    assert main(["check", str(path)]) == 0
    assert capsys.readouterr().err == ""


def _allowed_keys():
    """Every key the checks accept, asked of the checks themselves: an unknown key in each
    section is refused with the list of the allowed ones (so a key added later is seen here)."""
    from unsteady.inputs.scenario import ScenarioError, load_scenario

    def allowed(section):
        raw = copy.deepcopy(GOOD)
        if section:
            here = raw.get(section)
            raw[section] = {**(here if isinstance(here, dict) else {}), "zzzzz": 1}
        else:
            raw["zzzzz"] = 1
        try:
            load_scenario(raw)
        except ScenarioError as exc:
            for prob in exc.problems:
                if prob.key == (f"{section}.zzzzz" if section else "zzzzz") and "allowed: " in prob.message:
                    return [k.strip() for k in prob.message.split("allowed: ")[1].split(",")]
        return []
    top = allowed("")
    keys = set(top)
    for section in top:
        keys |= {f"{section}.{k}" for k in allowed(section)}
    return keys


def test_cases_cover_every_key_of_the_checks():
    """Every key the checks know (each section's keys, every motion law's and gust profile's) has a case."""
    from unsteady.inputs import gusts, motion
    keyed = {c.key.split("[")[0] for c in CASES} | {c.key.replace("[1]", "") for c in CASES}
    want = _allowed_keys()
    assert {"flow.speed", "airfoil.elements", "run.far_wake", "aircraft.span", "sweep.envelope"} <= want
    for law in motion.LAWS.values():
        want |= {f"motion.pitch.{k}" for k in (*law.KEYS, *law.OPTIONAL)}
    for prof in gusts.PROFILES.values():
        want |= {f"gust.{k}" for k in (*prof.KEYS, *prof.OPTIONAL)}
    want |= {"gust.profile", *(f"gust.{k}" for k in gusts.GustProfile.COMMON)}
    want |= {f"sweep.envelope.{k}" for k in ("value", "across", "lines")}
    assert not sorted(want - keyed), "keys without a bad-input case"


@pytest.mark.parametrize("case", CASES, ids=[c.id for c in CASES])
def test_bad_input_is_one_line_naming_file_and_key_exit_2_nothing_written(tmp_path, capsys, case):
    path = _write(tmp_path, case)
    out = tmp_path / "out"
    before = _listing(tmp_path)
    argv = [case.command, str(path), *case.args] + (["--out", str(out), "--quiet"] if case.command == "run" else [])
    assert main(argv) == 2
    got = capsys.readouterr()
    lines = got.err.strip().splitlines()
    assert len(lines) == 1, lines
    assert lines[0].startswith(f"error: {path}: {case.key}: "), lines[0]
    assert case.words in lines[0], lines[0]
    assert "Traceback" not in got.err and got.out == ""
    assert not out.exists() and _listing(tmp_path) == before


def test_a_run_that_will_not_fit_in_memory_is_refused(tmp_path, capsys, monkeypatch):
    from unsteady.inputs import scenario
    monkeypatch.setattr(scenario, "available_memory", lambda: 2 ** 20)      # a machine of 1 MiB
    path = _write(tmp_path, Case("memory", "", "", {"run.chords": 200}))
    before = _listing(tmp_path)
    assert main(["run", str(path), "--out", str(tmp_path / "out"), "--quiet"]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith(f"error: {path}: run.dt: the run would need about ")
    assert _listing(tmp_path) == before
