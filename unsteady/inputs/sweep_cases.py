"""The cases of a scenario's ``[sweep]``: each resolved, checked and keyed for resuming."""

from __future__ import annotations

import copy
import hashlib
import json
import sys
from dataclasses import dataclass, field

from ..core.errors import InputError
from ..core.version import __version__
from .checks import Problem, ScenarioError
from .scenario import _tomlable, apply_overrides, load_scenario
from .sweep import expand

# --------------------------------------------------------------------------
# cases

@dataclass
class Case:
    """One case of a sweep: its overrides, its raw input and, when valid, its scenario."""

    index: int
    name: str
    overrides: dict
    raw: dict
    scenario: object = None
    problems: list = field(default_factory=list)
    key: str = ""


def base_raw(sc):
    """The raw input of a scenario without its ``[sweep]`` (what each case overrides)."""
    if sc.raw is not None:
        raw = copy.deepcopy(sc.raw)
    else:   # built without load_scenario: undo the defaults that derive from other keys
        raw = copy.deepcopy(sc.data)
        if "altitude" in raw.get("flow", {}):
            raw["flow"].pop("density", None)
        if "chords" in raw.get("run", {}):
            raw["run"].pop("duration", None)
        raw.get("run", {}).pop("dt", None)
    raw.pop("sweep", None)
    # keep the base's output folder (a file stem is lost when a dict is re-read)
    raw.setdefault("output", {})
    if isinstance(raw["output"], dict):
        raw["output"]["dir"] = sc.data["output"]["dir"]
    return raw


def case_raw(base, overrides):
    """``base`` with the overrides applied (a new dict)."""
    raw = copy.deepcopy(base)
    apply_overrides(raw, overrides)      # also drops the other key of an either-or pair
    return raw


# sections of a scenario that cannot change a case's numbers (left out of its key,
# so that moving or renaming the sweep keeps what it has done)
NOT_HASHED = ("title", "output")


def case_key(sc):
    """Hash of a fully resolved case scenario and the package version (the resume key).

    The scenario is hashed as ``Scenario.to_toml()`` writes it, less the
    sections in ``NOT_HASHED``.
    """
    import tomli_w
    data = {k: v for k, v in sc.data.items() if k not in NOT_HASHED}
    h = hashlib.sha256()
    h.update(tomli_w.dumps(_tomlable(data)).encode())
    h.update(b"\0unsteady " + __version__.encode())
    return h.hexdigest()[:16]


def build_cases(sc):
    """Expand and resolve every case of a scenario's ``[sweep]``.

    Returns
    -------
    list of Case
        Invalid cases have ``problems`` (``Problem`` with keys like
        ``sweep[case-003].flow.speed``) and no scenario.
    """
    base = base_raw(sc)
    cases = []
    for i, (name, ov) in enumerate(expand(sc.data["sweep"])):
        c = Case(i, name, ov, {})
        try:
            c.raw = case_raw(base, ov)
            c.scenario = load_scenario(c.raw, source_name=sc.source, base_dir=sc.base_dir)
            c.key = case_key(c.scenario)
        except InputError as e:
            c.problems = [Problem(sc.source, f"sweep[{name}].{e.key}", e.message)]
        except ScenarioError as e:
            c.problems = [Problem(sc.source, f"sweep[{name}].{p.key}", p.message) for p in e.problems]
        if c.problems:
            h = hashlib.sha256(json.dumps([c.raw, __version__], sort_keys=True, default=str).encode())
            c.key = "x" + h.hexdigest()[:15]
        cases.append(c)
    return cases


def case_warnings(sc, cases):
    """The warnings of the cases (e.g. a gust beyond the attached-flow range), as
    ``warning: <file>: sweep[<name>].<key>: ...`` lines, those of the base scenario left out."""
    base = set(sc.warnings)
    prefix = f"warning: {sc.source}: "
    out = []
    for c in cases:
        for w in (c.scenario.warnings if c.scenario is not None else ()):
            if w not in base and w.startswith(prefix):
                out.append(f"{prefix}sweep[{c.name}].{w[len(prefix):]}")
    return out


def check_cases(sc, stream=None):
    """Check every case of ``sc``'s ``[sweep]``; raise ScenarioError listing all invalid ones.

    Warnings of valid cases are written to ``stream`` (default stderr).
    """
    cases = build_cases(sc)
    for line in case_warnings(sc, cases):
        print(line, file=stream or sys.stderr)
    problems = [p for c in cases for p in c.problems]
    if problems:
        raise ScenarioError(problems)
    return True


