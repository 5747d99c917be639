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


def grouped_problems(sc, cases):
    """The problems of the cases, one per distinct problem: the same key and message in several
    cases (a bad grid key, a bad base value) is one Problem naming the cases
    (``sweep[all 6 cases].flow.sped``, ``sweep[case-001, case-004].key``)."""
    groups = {}
    for c in cases:
        for p in c.problems:
            prefix = f"sweep[{c.name}]."
            sub = p.key[len(prefix):] if p.key.startswith(prefix) else p.key
            groups.setdefault((sub, p.message), []).append(c.name)
    out = []
    for (sub, message), names in groups.items():
        if len(names) == 1:
            who = names[0]
        elif len(names) == len(cases):
            who = f"all {len(cases)} cases"
        elif len(names) <= 3:
            who = ", ".join(names)
        else:
            who = f"{', '.join(names[:2])} and {len(names) - 2} more"
        out.append(Problem(sc.source, f"sweep[{who}].{sub}", message))
    return out


#: Summary numbers every run gives (and the model's own), by what the case has; the lag block's
#: numbers are flattened into the table under their own names.  tests/test_sweep.py checks that
#: the bundled scenarios give no number outside these.
ALWAYS_NUMBERS = ("steps", "cl_max", "t_cl_max", "cl_min", "t_cl_min", "cm_max", "cm_min", "cd_mean",
                  "cl_final", "dt", "elements", "far_wake_chords", "chords_travelled", "peaks_from_s",
                  "peak_pitch_rate", "peak_effective_alpha_deg", "t50", "t90", "t50_qs", "t90_qs",
                  "delay90", "delay90_chords", "t_begin", "amplitude_ratio", "phase_lag_deg", "loop_area",
                  "periods_used", "lesp_max", "t_lesp_max", "warnings_count")
LEV_NUMBERS = ("lev_onset_t", "gamma_lev_final", "lesp_critical")
#: a run that sheds takes its peaks from a running mean and keeps the largest single row beside them
LEV_PEAK_NUMBERS = ("cl_max_steps", "peaks_running_mean_s")
GUST_NUMBERS = ("w_gust_max", "w_gust_min", "u_gust_max", "u_gust_min", "alpha_eff_max_deg")
AIRCRAFT_NUMBERS = ("n_max", "t_n_max", "n_min", "t_n_min", "alpha_trim_deg", "cl_level", "wing_loading_N_m2",
                    "mass_ratio_mu_g", "lift_slope_per_rad", "apparent_mass_per_span", "mass_per_span", "dn_max",
                    "dn_min", "lift_max_N")
SPAN_NUMBERS = ("root_bending_max_Nm",)
FORMULA_NUMBERS = ("dn_formula", "gust_alleviation_factor", "dn_ratio")
#: pitch freedom (dynamics.pitch): the trim, the pitch response, the tail load; with a gust the
#: heave-only companion's ratios (its block's numbers are not flattened into the table)
PITCH_NUMBERS = ("tail_trim_deg", "tail_flap_trim_deg", "pitch_inertia_per_span", "apparent_pitch_inertia_per_span",
                 "pitch_change_max_deg", "tail_load_max_N", "tail_load_min_N")
HEAVE_ONLY_NUMBERS = ("dn_ratio_pitch_to_heave_only", "tail_load_ratio_pitch_to_heave_only")
TURBULENCE_NUMBERS = ("n_rms", "A_bar", "N0", "N0_cut_off_Hz", "n_rms_std", "A_bar_std", "N0_std")


def possible_numbers(case_sc):
    """The numeric summary keys a case's run can give (some only when the run gets that far:
    ``dn_ratio`` after the gust has passed, ``t90`` when it is reached)."""
    from .gusts import gust_list
    d = case_sc.data
    out = list(ALWAYS_NUMBERS)
    from .elements import lesp_criticals
    crits = lesp_criticals(d.get("airfoil", {}))
    if any(c is not None for c in crits):
        out += LEV_PEAK_NUMBERS
    if len(crits) == 1 and crits[0] is not None:
        out += LEV_NUMBERS
    elif len(crits) > 1:                 # several elements: each one's peak LESP, each shedding one's onset
        out += [f"{k}_{i}" for i in range(1, len(crits) + 1) for k in ("lesp_max", "t_lesp_max")]
        if any(c is not None for c in crits):
            out += [k for k in LEV_NUMBERS if k != "lesp_critical" or crits[0] is not None]
            out += [f"{k}_{i}" for i, c in enumerate(crits, start=1) if c is not None for k in LEV_NUMBERS]
    gusts = gust_list(d.get("gust"))
    if gusts:
        out += GUST_NUMBERS
    if d.get("aircraft"):
        out += AIRCRAFT_NUMBERS
        if "span" in d["aircraft"]:
            out += SPAN_NUMBERS
        if "pitch_inertia" in d["aircraft"]:
            out += PITCH_NUMBERS
            if gusts and d["aircraft"].get("heave_only_run", True):
                out += HEAVE_ONLY_NUMBERS
        if len(gusts) == 1 and gusts[0].get("direction", "vertical") == "vertical":
            if gusts[0]["profile"] == "one-minus-cosine":
                out += FORMULA_NUMBERS
            if gusts[0]["profile"] == "turbulence":
                out += TURBULENCE_NUMBERS
    return out


def envelope_problems(sc, cases):
    """``sweep.envelope.value`` must be a number the cases give; ``lines`` must differ from ``across``."""
    env = sc.data["sweep"].get("envelope") or {}
    out = []
    valid = [c for c in cases if c.scenario is not None]
    if "value" in env and valid:
        given = [set(possible_numbers(c.scenario)) for c in valid]
        if not any(env["value"] in g for g in given):
            allowed = [k for k in dict.fromkeys(k for c in valid for k in possible_numbers(c.scenario))]
            out.append(Problem(sc.source, "sweep.envelope.value",
                               f"is {env['value']!r}, a number no case of this sweep gives; allowed: "
                               f"{', '.join(allowed)}"))
    if env.get("lines") is not None and env.get("lines") == env.get("across"):
        out.append(Problem(sc.source, "sweep.envelope.lines", f"is the key across the picture too "
                                                             f"({env['lines']!r}); choose another swept key"))
    return out


def check_cases(sc, stream=None, cases=None):
    """Check every case of ``sc``'s ``[sweep]`` and its envelope; raise ScenarioError listing every
    problem once (:func:`grouped_problems`).

    Warnings of valid cases are written to ``stream`` (default stderr).  Returns the cases.
    """
    cases = build_cases(sc) if cases is None else cases
    problems = grouped_problems(sc, cases) + envelope_problems(sc, cases)
    if problems:
        raise ScenarioError(problems)
    for line in case_warnings(sc, cases):
        print(line, file=stream or sys.stderr)
    return cases


