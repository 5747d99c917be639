"""Checks of several elements in one flow (``[[airfoil]]``, a list): the further elements' keys.

The first table is checked as the one ``[airfoil]`` of a single-element
scenario (:func:`unsteady.inputs.scenario.resolve`); the further ones here.
Each further element has its own ``shape``, ``chord``, ``elements``, its
``position = [x, z]`` (m, its leading edge from the first's, in the first's
chord axes at zero pitch) and ``incidence`` (deg, nose-up relative to the
first's chord).  Each may carry a plain trailing-edge flap of its own:
``flap_hinge`` (fraction of its chord, the first element's range) held at
``flap_deflection`` (deg, trailing edge down positive, default 0; the
first element's flap follows ``[motion] flap`` instead).  Whether the
elements overlap is checked on the built camber lines, flaps deflected
(:func:`element_problems`).
"""

from __future__ import annotations

import math

from ..core.errors import InputError
from .checks import integer, number, text, unknown_keys
from .thick import DEFAULT_PANELS

__all__ = ["check_further_elements", "element_problems", "flap_turn", "lesp_criticals", "place_points",
           "placed_outline", "sheds_anywhere",
           "MAX_ELEMENTS", "MAX_INCIDENCE_DEG"]

#: At most this many elements in one flow.
MAX_ELEMENTS = 8
#: |incidence| (deg) accepted for a further element.
MAX_INCIDENCE_DEG = 45.0
#: Nearest approach of two camber lines, in mean element lengths (c/N) of each: closer and the
#: lumped vortices of one sit on the collocation points of the other (common practice).
GAP_ELEMENTS = 0.5

_KEYS = {"shape", "chord", "elements", "position", "incidence", "flap_hinge", "flap_deflection",
         "lesp_critical", "thick"}
#: |flap_deflection| (deg) accepted for a further element's held flap: the limit of ``[motion] flap``
#: (inputs.flap.FLAP_MAX_DEG); past FLAP_WARN_DEG the check warns, as for the first element's flap.
MAX_FLAP_DEFLECTION_DEG = 60.0


def check_further_elements(items, base_dir, chord_range, warnings=None):
    """The further elements ``items`` (raw tables 2, 3, ... of ``[[airfoil]]``); returns (resolved list, errors).

    Warnings (a held flap past ``FLAP_WARN_DEG``) are appended to ``warnings`` when given."""
    from .flap import FLAP_HINGE_RANGE, FLAP_WARN_DEG
    from .sections import section_from_shape
    errors, out = [], []
    if len(items) + 1 > MAX_ELEMENTS:
        return [], [InputError("airfoil", f"gives {len(items) + 1} elements; at most {MAX_ELEMENTS} are allowed")]
    for i, af in enumerate(items, start=1):
        p = f"airfoil[{i}]."
        if not isinstance(af, dict):
            errors.append(InputError(f"airfoil[{i}]", "must be a table ([[airfoil]])"))
            continue
        errors += unknown_keys(af, _KEYS, p)
        el = {"shape": af.get("shape", "flat")}

        def grab(fn, *a, **k):
            try:
                return fn(*a, **k)
            except InputError as e:
                errors.append(e)
                return None

        if "chord" not in af:
            errors.append(InputError(p + "chord", "is required (m, > 0)"))
        else:
            el["chord"] = grab(number, p + "chord", af["chord"], ge=chord_range[0], le=chord_range[1], unit="m")
        el["elements"] = grab(integer, p + "elements",
                              af.get("elements", DEFAULT_PANELS if af.get("thick") is True else 40), ge=4, le=1000)
        if grab(text, p + "shape", el["shape"]) is not None:
            try:
                section_from_shape(el["shape"], base_dir)
            except InputError as e:
                errors.append(InputError(p + "shape", e.message))
        pos = af.get("position")
        if pos is None:
            errors.append(InputError(p + "position", "is required: [x, z] (m), the element's leading edge from "
                                                     "the first element's, x aft and z up"))
        elif (not isinstance(pos, list) or len(pos) != 2
              or not all(isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)
                         for v in pos)):
            errors.append(InputError(p + "position", f"must be [x, z], two numbers in metres, got {pos!r}"))
        else:
            el["position"] = [float(pos[0]), float(pos[1])]
        el["incidence"] = grab(number, p + "incidence", af.get("incidence", 0.0), ge=-MAX_INCIDENCE_DEG,
                               le=MAX_INCIDENCE_DEG, unit="deg (nose-up relative to the first element's chord)")
        if "thick" in af:                    # surface panels on this element (inputs.thick's limits)
            el["thick"] = _check_thick_element(af, el, p, base_dir, errors)
        if "flap_hinge" in af and el.get("thick"):
            errors.append(InputError(p + "flap_hinge", "a flap on a further element with surface panels "
                                                       "(thick = true) is not supported: give it on a "
                                                       "camber-line element (thick = false) or on the first"))
        elif "flap_hinge" in af:
            el["flap_hinge"] = grab(number, p + "flap_hinge", af["flap_hinge"], gt=FLAP_HINGE_RANGE[0],
                                    lt=FLAP_HINGE_RANGE[1], unit="(fraction of the element's chord aft of its "
                                                                  "leading edge)")
        if "flap_deflection" in af:
            if "flap_hinge" not in af:
                errors.append(InputError(p + "flap_deflection", "needs a flap on this element: give "
                                                                f"{p}flap_hinge (fraction of its chord, "
                                                                f"{FLAP_HINGE_RANGE[0]:g} to {FLAP_HINGE_RANGE[1]:g})"
                                                                " or remove flap_deflection"))
            else:
                beta = grab(number, p + "flap_deflection", af["flap_deflection"], ge=-MAX_FLAP_DEFLECTION_DEG,
                            le=MAX_FLAP_DEFLECTION_DEG, unit="deg (trailing edge down positive)")
                el["flap_deflection"] = beta
                if beta is not None and abs(beta) > FLAP_WARN_DEG and warnings is not None:
                    warnings.append(InputError(p + "flap_deflection", f"is {beta:g} degrees: beyond about "
                                               f"{FLAP_WARN_DEG:g} degrees the flow separates from a plain flap, "
                                               "which this attached-flow model does not represent"))
        if "lesp_critical" in af:
            # this element's own critical leading-edge suction parameter (Ramesh et al., J. Fluid
            # Mech. 751, 2014); absent: its leading edge never sheds
            el["lesp_critical"] = grab(number, p + "lesp_critical", af["lesp_critical"], gt=0.0,
                                       unit="(this element's critical leading-edge suction parameter; "
                                            "about 0.1-0.3 for thin sections at low Reynolds numbers)")
        out.append(el)
    return out, errors


def _check_thick_element(af, el, p, base_dir, errors):
    """``thick`` of a further element: true or false; surface panels need an even panel count of at
    least MIN_PANELS and a section of at least MIN_THICKNESS (inputs.thick); returns the flag."""
    from .sections import section_from_shape
    from .thick import DEFAULT_PANELS, MIN_PANELS, MIN_THICKNESS
    thick = af["thick"]
    if not isinstance(thick, bool):
        errors.append(InputError(p + "thick", f"must be true or false, got {thick!r}"))
        return False
    if not thick:
        return False
    n = el.get("elements")
    if isinstance(n, int) and (n < MIN_PANELS or n % 2):
        errors.append(InputError(p + "elements", f"with thick = true counts surface panels, half on each "
                                 f"surface: an even number of at least {MIN_PANELS} (default {DEFAULT_PANELS}), "
                                 f"got {n}"))
    try:
        section = section_from_shape(el["shape"], base_dir) if isinstance(el["shape"], str) else None
    except InputError:
        section = None                       # the shape's own error is reported
    if section is not None and section.thickness < MIN_THICKNESS:
        errors.append(InputError(p + "thick", f"the section '{section.name}' is {100 * section.thickness:.2g} % "
                                 f"thick; surface panels need at least {100 * MIN_THICKNESS:.2g} %: leave "
                                 f"thick = false (the camber-line model) for a flat plate or a thinner section"))
    return True


def placed_outline(section, n, chord, incidence_deg, position, lower_only=False):
    """Surface-panel outline nodes (x, z) (m) of a thick element (``n`` panels, lower trailing edge ->
    leading edge -> upper trailing edge; ``lower_only``: the lower surface alone), placed as
    :func:`placed_nodes` places a camber line."""
    from .thick import surface_nodes
    x, z = surface_nodes(section, n)
    if lower_only:
        x, z = x[:n // 2 + 1], z[:n // 2 + 1]
    return place_points(x, z, chord, incidence_deg, position)


def flap_turn(x, z, section, hinge, beta):
    """Turn the chord-fraction points (x, z) aft of ``hinge`` (fraction of the chord, on the camber
    line) by ``beta`` (rad, trailing edge down) about the hinge, in place."""
    import numpy as np
    z_h = float(np.asarray(section.camber(np.array([hinge])), float)[0])
    aft = x > hinge
    dx, dz = x[aft] - hinge, z[aft] - z_h
    x[aft] = hinge + dx * math.cos(beta) + dz * math.sin(beta)
    z[aft] = z_h - dx * math.sin(beta) + dz * math.cos(beta)


def place_points(x, z, chord, incidence_deg, position):
    """Chord-fraction points (x, z) of an element turned nose-up by ``incidence_deg`` about its leading
    edge (the body frame's convention, vortex.bodies.to_inertial) and set at ``position`` (m)."""
    a = math.radians(incidence_deg)
    ca, sa = math.cos(a), math.sin(a)
    return (position[0] + chord * (x * ca + z * sa), position[1] + chord * (-x * sa + z * ca))


def lesp_criticals(airfoil):
    """Each element's ``lesp_critical`` (None where its leading edge never sheds), in file order, from a
    resolved ``[airfoil]`` (a single element gives a list of one)."""
    return [airfoil.get("lesp_critical")] + [el.get("lesp_critical") for el in airfoil.get("_more") or ()]


def sheds_anywhere(airfoil):
    """Whether any element of a resolved ``[airfoil]`` may shed from its leading edge."""
    return any(c is not None for c in lesp_criticals(airfoil))


def placed_nodes(section, n, chord, incidence_deg, position, flap=None):
    """Camber-line nodes (x, z) (m) of an element, leading edge first, in the first element's
    chord axes at zero pitch with the origin at its leading edge (cosine spacing of ``n``);
    ``flap`` = (hinge fraction, deflection in deg, trailing edge down) turns the nodes aft of
    the hinge about it (a node is put on the hinge)."""
    import numpy as np
    x = 0.5 * (1.0 - np.cos(np.pi * np.arange(n + 1) / n))
    if flap is not None:
        x = np.unique(np.append(x, float(flap[0])))
    z = np.asarray(section.camber(x), float)
    if flap is not None and flap[1]:
        flap_turn(x, z, section, float(flap[0]), math.radians(flap[1]))
    return place_points(x, z, chord, incidence_deg, position)


def _orient(a, b, c):
    return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])


def segments_meet(p, q, r, s):
    """Whether the closed segments pq and rs meet (orientation test, common practice)."""
    d1, d2, d3, d4 = _orient(r, s, p), _orient(r, s, q), _orient(p, q, r), _orient(p, q, s)
    if d1 * d2 < 0 and d3 * d4 < 0:
        return True

    def on(a, b, c):
        return min(a[0], b[0]) <= c[0] <= max(a[0], b[0]) and min(a[1], b[1]) <= c[1] <= max(a[1], b[1])

    return ((d1 == 0 and on(r, s, p)) or (d2 == 0 and on(r, s, q)) or
            (d3 == 0 and on(p, q, r)) or (d4 == 0 and on(p, q, s)))


def crossing_pair(lines, clearance):
    """The first pair (i, j) (0-based) of polylines ``lines`` [(x, z), ...] that cross, touch or come
    nearer than ``clearance[i] + clearance[j]`` (m) node to node; None when all are apart."""
    import numpy as np
    for i in range(len(lines)):
        xa, za = lines[i]
        for j in range(i + 1, len(lines)):
            xb, zb = lines[j]
            gap = np.sqrt((xa[:, None] - xb[None, :]) ** 2 + (za[:, None] - zb[None, :]) ** 2).min()
            if gap < clearance[i] + clearance[j]:
                return i, j
            for k in range(xa.size - 1):
                p, q = (xa[k], za[k]), (xa[k + 1], za[k + 1])
                for m in range(xb.size - 1):
                    if segments_meet(p, q, (xb[m], zb[m]), (xb[m + 1], zb[m + 1])):
                        return i, j
    return None


def element_problems(first, further, base_dir):
    """Errors of the placed elements (resolved tables): a pair that crosses or comes too near, both named."""
    from .sections import section_from_shape
    tables = [dict(first, position=[0.0, 0.0], incidence=0.0)] + list(further)
    lines, clear = [], []
    for el in tables:
        sec = section_from_shape(el["shape"], base_dir)
        if el.get("thick"):                  # surface panels: the outline, its chordwise spacing
            lines.append(placed_outline(sec, el["elements"], el["chord"], el["incidence"], el["position"]))
            clear.append(GAP_ELEMENTS * el["chord"] / (el["elements"] // 2))
        else:
            flap = (el["flap_hinge"], el.get("flap_deflection", 0.0)) if el is not tables[0] and "flap_hinge" in el \
                else None
            lines.append(placed_nodes(sec, el["elements"], el["chord"], el["incidence"], el["position"], flap=flap))
            clear.append(GAP_ELEMENTS * el["chord"] / el["elements"])
    errors = []
    for j, el in enumerate(tables[1:], start=1):
        # the leading-edge vortices meet every element through one soft core, twice the first element's
        # length (vortex.solver.VortexSolver._soften): a coarser shedding element would pick out its own
        # lumped vortices one by one
        own, ref = el["chord"] / el["elements"], first["chord"] / first["elements"]
        if el.get("lesp_critical") is not None and own > ref * (1.0 + 1e-12):
            need = math.ceil(el["chord"] * first["elements"] / first["chord"] * (1.0 - 1e-12))
            errors.append(InputError(f"airfoil[{j}].lesp_critical",
                                     f"needs element {j + 1}'s element length (chord / elements = "
                                     f"{own:.4g} m) no longer than the first element's "
                                     f"({ref:.4g} m), through whose soft core the "
                                     f"leading-edge vortices meet every element: give airfoil[{j}].elements "
                                     f">= {need}"))
    pair = crossing_pair(lines, clear)
    if pair is None:
        return errors
    i, j = pair
    return errors + [InputError(f"airfoil[{j}].position",
                       f"element {j + 1} (airfoil[{j}]) overlaps or touches element {i + 1} (airfoil[{i}]): "
                       f"their camber lines (or outlines) must stay at least {GAP_ELEMENTS:g} element lengths (chord / "
                       f"elements) apart; move airfoil[{j}].position or change its incidence")]
