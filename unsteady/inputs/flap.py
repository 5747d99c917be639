"""Checks of the flap (``[airfoil] flap_hinge`` with ``[motion] flap``) across the run: the deflection's bounds."""

from __future__ import annotations

import math

import numpy as np

from ..core.errors import InputError

__all__ = ["flap_problems", "FLAP_HINGE_RANGE", "FLAP_MAX_DEG", "FLAP_WARN_DEG"]

#: A flap hinge (fraction of chord) must lie strictly inside this range.
FLAP_HINGE_RANGE = (0.05, 0.95)
#: Largest flap deflection (deg) accepted, and the one beyond which check warns
#: (a plain flap's flow separates from its upper side beyond about 15-20 degrees
#: at the Reynolds numbers of small aircraft: common practice).
FLAP_MAX_DEG = 60.0
FLAP_WARN_DEG = 20.0


def flap_problems(out, base_dir, warnings):
    """Errors of a resolved scenario's flap (a list); warnings are appended to ``warnings``.

    The deflection is sampled over the run (every law's value at 2,001 times
    and at its singular times); beyond ``FLAP_MAX_DEG`` the straight flap
    model is refused, beyond ``FLAP_WARN_DEG`` the check warns.
    """
    from .motion import build_law
    af, mo, run = out.get("airfoil", {}), out.get("motion", {}), out.get("run", {})
    errors = []
    if "flap_hinge" not in af:
        return errors
    if "flap" not in mo or not run.get("duration"):
        return errors
    try:
        law = build_law(mo["flap"], scale=1.0, speed=out["flow"].get("speed"), chord=af.get("chord"),
                        base_dir=base_dir)
    except (InputError, ValueError):
        return errors
    t = np.concatenate([np.linspace(0.0, run["duration"], 2001), law.singular_times()])
    peak = float(np.max(np.abs(law.value(t))))
    if peak > FLAP_MAX_DEG:
        errors.append(InputError("motion.flap", f"reaches {peak:.3g} degrees; at most {FLAP_MAX_DEG:g} are accepted "
                                                "(a plain flap on a camber line)"))
    elif peak > FLAP_WARN_DEG:
        warnings.append(InputError("motion.flap", f"reaches {peak:.3g} degrees: beyond about {FLAP_WARN_DEG:g} "
                                                  "degrees the flow separates from a plain flap, which this "
                                                  "attached-flow model does not represent"))
    if not math.isfinite(peak):
        errors.append(InputError("motion.flap", "is not finite over the run"))
    elif af.get("thick") and peak <= FLAP_MAX_DEG and isinstance(af.get("elements"), int):
        from .sections import section_from_shape
        from .thick import MAX_PANEL_TURN_DEG, flap_fold_limit
        try:
            section = section_from_shape(af.get("shape", "flat"), base_dir)
        except (InputError, ValueError):
            return errors
        limit = flap_fold_limit(section, af["elements"], af["flap_hinge"], peak)
        if limit is not None:
            errors.append(InputError("motion.flap", f"reaches {peak:.3g} degrees, but the surface panels of "
                                     f"'{section.name}' next to the hinge turn by more than "
                                     f"{MAX_PANEL_TURN_DEG:g} degrees past {limit:g} degrees (the panel "
                                     f"inside the turn folds): deflect less, use fewer panels or a "
                                     f"hinge further aft"))
    return errors
