"""Typed checks of scenario values and the registry of optional sections.

Each check returns the cleaned value or raises :class:`InputError`; section
checkers registered with :func:`register_section` are called by
:func:`unsteady.inputs.scenario.resolve`.
"""

from __future__ import annotations

import difflib
import math
from dataclasses import dataclass

from ..core.errors import InputError


class ScenarioError(ValueError):
    """One or more problems with a scenario; ``str()`` gives one line each."""

    def __init__(self, problems):
        self.problems = list(problems)
        super().__init__("\n".join(p.line() for p in self.problems))


@dataclass(frozen=True)
class Problem:
    file: str
    key: str
    message: str

    def line(self) -> str:
        return f"error: {self.file}: {self.key}: {self.message}"


# --------------------------------------------------------------------------
# small typed checks; each returns the cleaned value or raises InputError

def _is_number(v):
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def number(key, v, *, gt=None, ge=None, lt=None, le=None, unit=""):
    """A finite real number within the given bounds."""
    u = f" {unit}" if unit else ""
    if not _is_number(v):
        raise InputError(key, f"must be a number{u}, got {v!r}")
    v = float(v)
    if not math.isfinite(v):
        raise InputError(key, f"must be finite, got {v!r}")
    bounds = []
    if gt is not None:
        bounds.append(f"> {gt:g}")
    if ge is not None:
        bounds.append(f">= {ge:g}")
    if lt is not None:
        bounds.append(f"< {lt:g}")
    if le is not None:
        bounds.append(f"<= {le:g}")
    ok = ((gt is None or v > gt) and (ge is None or v >= ge)
          and (lt is None or v < lt) and (le is None or v <= le))
    if not ok:
        raise InputError(key, f"must be {' and '.join(bounds)}{u}, got {v:g}")
    return v


def integer(key, v, *, ge=None, le=None):
    if isinstance(v, bool) or not (isinstance(v, int) or (isinstance(v, float) and v.is_integer())):
        raise InputError(key, f"must be a whole number, got {v!r}")
    v = int(v)
    if (ge is not None and v < ge) or (le is not None and v > le):
        rng = f"from {ge} to {le}" if ge is not None and le is not None else (f">= {ge}" if ge is not None else f"<= {le}")
        raise InputError(key, f"must be {rng}, got {v}")
    return v


def choice(key, v, allowed):
    if not isinstance(v, str) or v not in allowed:
        near = difflib.get_close_matches(str(v), allowed, n=1)
        hint = f" (did you mean \"{near[0]}\"?)" if near else ""
        raise InputError(key, f"must be one of {', '.join(repr(a) for a in allowed)}, got {v!r}{hint}")
    return v


def text(key, v):
    if not isinstance(v, str) or not v.strip():
        raise InputError(key, f"must be a non-empty text, got {v!r}")
    return v


def available_memory():
    """Physical memory of this machine in bytes (None where the system does not say)."""
    import os
    try:
        return os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES")
    except (ValueError, OSError, AttributeError):
        return None


def unknown_keys(table, allowed, prefix):
    """InputErrors for keys of ``table`` not in ``allowed``, with the nearest suggested."""
    out = []
    for k in table:
        if k not in allowed:
            near = difflib.get_close_matches(k, list(allowed), n=1, cutoff=0.5)
            hint = f"; did you mean '{near[0]}'?" if near else f"; allowed: {', '.join(sorted(allowed))}"
            out.append(InputError(f"{prefix}{k}", f"unknown key{hint}"))
    return out


# --------------------------------------------------------------------------
# registry of optional sections owned by other modules

_SECTIONS = {}


def register_section(name):
    """Decorator: ``checker(value, ctx) -> (resolved_value, [InputError...])``.

    ``ctx`` is the partly resolved scenario dict (flow, airfoil, run already
    checked) plus ``_base_dir``; keys in the errors are full dotted paths.
    """
    def deco(fn):
        _SECTIONS[name] = fn
        return fn
    return deco
