"""Every warning of a run in one list: the one source for pictures, films and the report.

No matplotlib here, so the report and the films read the same lines as the
pictures without importing each other.
"""

from __future__ import annotations

__all__ = ["run_warnings", "without_prefix"]


def without_prefix(line):
    """A warning line without its ``warning: <file>:`` prefix (pictures have no room for the path)."""
    parts = str(line).split(": ", 2)
    return parts[2] if len(parts) == 3 and parts[0] == "warning" else str(line)


def run_warnings(result, *, verdict=True, short=True):
    """Where the model is out of its depth in this run, one line each, duplicates dropped.

    In this order: the attached-flow verdict (``summary["lag"]["validity"]``,
    when not ok; ``verdict=False`` leaves it to a caller that shows it on its
    own), the scenario's warnings (``Scenario.warnings``), the summary's
    ``warnings`` list (the measured ones, :mod:`unsteady.analysis.verdict`)
    and a run stopped early (``summary["error"]``).  ``short`` drops the
    ``warning: <file>:`` prefix of each line.
    """
    s = result.summary or {}
    out = []
    if verdict:
        val = (s.get("lag") or {}).get("validity") or {}
        if isinstance(val, dict) and val.get("attached_flow_ok") is False:
            out.append("outside the model's attached-flow range: " + "; ".join(val.get("reasons", [])))
    sc = result.scenario
    out += [str(w) for w in (sc.warnings if sc is not None else ())]
    extra = s.get("warnings") or []
    out += [extra] if isinstance(extra, str) else [str(w) for w in extra]
    if s.get("error"):
        out.append(f"the run stopped early: {s['error']}")
    if short:
        out = [without_prefix(w) for w in out]
    seen = set()
    return [w for w in out if not (w in seen or seen.add(w))]
