"""The ``[sweep]`` section of a scenario: its check and the expansion into cases.

Loading a scenario checks the section itself (:func:`check_section`);
:mod:`unsteady.inputs.sweep_cases` resolves every case; running them belongs
to :mod:`unsteady.apps.sweep`.
"""

from __future__ import annotations

import itertools
import json
import math
import re

from ..core.errors import InputError
from .checks import register_section, text, unknown_keys

SWEEP_KEYS = ("grid", "cases", "name", "envelope", "save_runs")
ENVELOPE_KEYS = ("value", "across", "lines")
MAX_CASES = 100_000

# --------------------------------------------------------------------------
# the [sweep] section

def _is_value_table(d):
    """A table that is one scenario value (a motion law or a gust), not a group of keys."""
    return isinstance(d, dict) and ("law" in d or "profile" in d)


def flatten(table, prefix=""):
    """Nested tables -> ``{"a.b": value}``; law and gust tables stay whole."""
    out = {}
    for k, v in table.items():
        key = f"{prefix}{k}"
        if isinstance(v, dict) and not _is_value_table(v):
            if not v:
                out[key] = v
            out.update(flatten(v, key + "."))
        else:
            out[key] = v
    return out


_PLACEHOLDER = re.compile(r"\{([^{}:]+)(?::([^{}]*))?\}")


def _fmt_value(v):
    """A swept value as a short text (table cells, case names)."""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, float):
        return repr(v)
    if isinstance(v, (int, str)):
        return str(v)
    return json.dumps(v, sort_keys=True, separators=(",", ":"))


def _name_from_pattern(pattern, values, index):
    """The name of a case from the pattern; InputError (``sweep.name``) when a placeholder's key
    is not set by the case or its format does not apply to the value."""
    def sub(m):
        key, spec = m.group(1), m.group(2)
        if key != "index" and key not in values:
            raise InputError("sweep.name", f"refers to {{{key}}}, which case {index} does not set; give "
                                           f"that case a name of its own or set {key} in it")
        v = index if key == "index" else values[key]
        if spec:
            try:
                return format(v, spec)
            except (ValueError, TypeError) as exc:
                raise InputError("sweep.name", f"the format {{{key}:{spec}}} does not apply to {v!r} "
                                               f"({exc}); use a Python format such as {{{key}:g}} or "
                                               f"{{{key}:.2f}}, or no format") from None
        return _fmt_value(v)
    return _PLACEHOLDER.sub(sub, pattern)


@register_section("sweep")
def check_section(value, ctx):
    """Check the ``[sweep]`` table itself (each case's scenario is checked by :func:`check_cases`).

    Returns the resolved section: ``grid`` (dotted key -> list), ``cases``
    (list of ``{"name": ..., dotted key: value}``), ``name``, ``envelope``,
    ``save_runs``.
    """
    errors = []
    if not isinstance(value, dict):
        return value, [InputError("sweep", "must be a table ([sweep]) with grid and/or cases")]
    errors += unknown_keys(value, SWEEP_KEYS, "sweep.")
    out = {"save_runs": value.get("save_runs", False)}
    if not isinstance(out["save_runs"], bool):
        errors.append(InputError("sweep.save_runs", f"must be true or false, got {out['save_runs']!r}"))
    grid = {}
    if "grid" in value:
        g = value["grid"]
        if not isinstance(g, dict) or not g:
            errors.append(InputError("sweep.grid", "must be a table of scenario keys to lists of values, "
                                                   "e.g. \"flow.speed\" = [12.0, 16.0]"))
        else:
            for k, v in flatten(g).items():
                if not isinstance(v, list) or not v:
                    errors.append(InputError(f"sweep.grid.{k}", f"must be a non-empty list of values, got {v!r}"))
                else:
                    grid[k] = v
    out["grid"] = grid
    cases = []
    if "cases" in value:
        cs = value["cases"]
        if not isinstance(cs, list) or not cs:
            errors.append(InputError("sweep.cases", "must be a list of tables of overrides ([[sweep.cases]])"))
        else:
            for i, c in enumerate(cs):
                if not isinstance(c, dict):
                    errors.append(InputError(f"sweep.cases[{i}]", f"must be a table of overrides, got {c!r}"))
                    continue
                c = dict(c)
                name = c.pop("name", None)
                case = {}
                if name is not None:
                    try:
                        case["name"] = _check_name(f"sweep.cases[{i}].name", name)
                    except InputError as e:
                        errors.append(e)
                case.update(flatten(c))
                cases.append(case)
    out["cases"] = cases
    if "grid" not in value and "cases" not in value:
        errors.append(InputError("sweep", "needs a grid (sweep.grid) and/or a list of cases ([[sweep.cases]])"))
    n_grid = math.prod(len(v) for v in grid.values()) if grid else 0
    if n_grid + len(cases) > MAX_CASES:
        errors.append(InputError("sweep.grid", f"gives {n_grid + len(cases)} cases; at most {MAX_CASES} are allowed"))
    if "name" in value:
        try:
            pat = text("sweep.name", value["name"])
            case_keys = [k for c in cases if "name" not in c for k in c]
            for m in _PLACEHOLDER.finditer(pat):
                if m.group(1) != "index" and m.group(1) not in grid and m.group(1) not in case_keys:
                    raise InputError("sweep.name", f"refers to {{{m.group(1)}}}, which is not a grid key "
                                                   f"nor a key of an unnamed case; allowed: "
                                                   f"{', '.join(dict.fromkeys(['index'] + list(grid) + case_keys))}")
            out["name"] = pat
        except InputError as e:
            errors.append(e)
    env = value.get("envelope", {})
    if not isinstance(env, dict):
        errors.append(InputError("sweep.envelope", "must be a table like { value = \"n_max\", across = \"gust.length\" }"))
        env = {}
    errors += unknown_keys(env, ENVELOPE_KEYS, "sweep.envelope.")
    swept = list(grid) + [k for c in cases for k in c if k != "name"]
    for k in ENVELOPE_KEYS:
        if k in env:
            if not isinstance(env[k], str) or not env[k]:
                errors.append(InputError(f"sweep.envelope.{k}", f"must be a text, got {env[k]!r}"))
            elif k != "value" and env[k] not in swept:
                errors.append(InputError(f"sweep.envelope.{k}", f"must be one of the swept keys "
                                                                 f"({', '.join(dict.fromkeys(swept))}), got {env[k]!r}"))
    out["envelope"] = {k: env[k] for k in ENVELOPE_KEYS if k in env}
    if not errors:
        try:
            expand(out)
        except InputError as e:
            errors.append(e)
    return out, errors


def _check_name(key, name):
    name = text(key, name)
    if not re.fullmatch(r"[A-Za-z0-9][A-Za-z0-9_.,=+-]*", name):
        raise InputError(key, f"must be letters, digits and _ . , = + - (it names a folder), got {name!r}")
    return name


def expand(sweep):
    """The cases of a resolved ``[sweep]`` section: a list of ``(name, overrides)``.

    Grid cases (Cartesian product in the order the keys are given, the last
    varying fastest) come first, then the listed cases.  Unnamed cases take
    the name pattern (``sweep.name``) when they set every key it names;
    otherwise they are called ``case-001``, ``case-002`` ... by their
    position.
    """
    out = []
    grid = sweep.get("grid") or {}
    pattern = sweep.get("name")
    if grid:
        keys = list(grid)
        for combo in itertools.product(*(grid[k] for k in keys)):
            values = dict(zip(keys, combo))
            i = len(out) + 1
            name = _name_from_pattern(pattern, values, i) if pattern else f"case-{i:03d}"
            out.append((name, values))
    for c in sweep.get("cases") or ():
        i = len(out) + 1
        ov = {k: v for k, v in c.items() if k != "name"}
        fits = pattern and all(m.group(1) == "index" or m.group(1) in ov for m in _PLACEHOLDER.finditer(pattern))
        name = c.get("name") or (_name_from_pattern(pattern, ov, i) if fits else f"case-{i:03d}")
        out.append((name, ov))
    seen = {}
    for name, _ in out:
        if name in seen:
            raise InputError("sweep.name", f"two cases are both called {name!r}; names must be unique")
        seen[name] = True
        if pattern:
            _check_name("sweep.name", name)
    return out
