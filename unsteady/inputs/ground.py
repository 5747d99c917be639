"""The ``[ground]`` section: a flat, fixed ground under the airfoil (its check)."""

from __future__ import annotations

import math

from ..core.errors import InputError
from .checks import number, register_section, unknown_keys

__all__ = ["check_ground_section", "lowest_below_axis"]


def lowest_below_axis(ctx):
    """Depth (m) of the lowest point below the pitch axis at t = 0 (pitch and flap at t = 0) of the camber
    line (with ``thick``: the lower surface) and of every further element of ``[[airfoil]]`` (placed by
    :func:`unsteady.inputs.elements.placed_nodes`; a thick one's lower surface by ``placed_outline``), or None when a section or a law cannot be built
    (their own checks report why)."""
    import numpy as np

    from .elements import placed_nodes, placed_outline
    from .motion import build_law
    from .sections import section_from_shape
    af, mo = ctx.get("airfoil", {}), ctx.get("motion", {})
    chord, pivot = af.get("chord"), mo.get("pivot")
    if chord is None or pivot is None:
        return None
    kw = dict(speed=ctx.get("flow", {}).get("speed"), chord=chord, base_dir=ctx.get("_base_dir"))
    try:
        section = section_from_shape(af.get("shape", "flat"), ctx.get("_base_dir"))
        alpha = float(build_law(mo["pitch"], scale=math.pi / 180.0, **kw).value(0.0)) if "pitch" in mo else 0.0
        beta = (float(build_law(mo["flap"], scale=math.pi / 180.0, **kw).value(0.0))
                if "flap" in mo and "flap_hinge" in af else 0.0)
    except (InputError, ValueError, KeyError):
        return None
    if af.get("thick"):                        # surface panels: the outline's lower surface
        _, _, x, z = (np.asarray(a, float) for a in section.outline(401))
    else:
        x = np.linspace(0.0, 1.0, 401)
        z = np.asarray(section.camber(x), float)
    if beta and "flap_hinge" in af:
        xh = af["flap_hinge"]
        zh = float(np.asarray(section.camber(np.array([xh])), float)[0])   # the hinge, on the mean line
        aft = x > xh
        dx, dz = x[aft] - xh, z[aft] - zh
        x[aft] = xh + dx * math.cos(beta) + dz * math.sin(beta)
        z[aft] = zh - dx * math.sin(beta) + dz * math.cos(beta)
    xi, zeta = (x - pivot) * chord, z * chord
    for el in af.get("_more") or ():           # further elements, in the first's chord axes
        try:
            sec = section_from_shape(el["shape"], ctx.get("_base_dir"))
            if el.get("thick"):                # surface panels: the placed outline's lower surface
                xe, ze = placed_outline(sec, 400, el["chord"], el["incidence"], el["position"], lower_only=True)
            else:
                flap = (el["flap_hinge"], el.get("flap_deflection") or 0.0) if "flap_hinge" in el else None
                xe, ze = placed_nodes(sec, 400, el["chord"], el["incidence"], el["position"], flap=flap)
        except (InputError, ValueError, KeyError, TypeError):
            return None
        xi, zeta = np.append(xi, xe - pivot * chord), np.append(zeta, ze)
    zz = -xi * math.sin(alpha) + zeta * math.cos(alpha)
    return float(-zz.min())


@register_section("ground")
def check_ground_section(value, ctx):
    """Check ``[ground]``: ``height`` (m, the pitch axis above a flat fixed ground at t = 0)."""
    if not isinstance(value, dict):
        return value, [InputError("ground", "must be a table [ground] with height (m, the pitch axis above "
                                            "the ground at t = 0)")]
    errors = unknown_keys(value, {"height"}, "ground.")
    out = {}
    if "height" not in value:
        errors.append(InputError("ground.height", "is required (m, the pitch axis above the ground at t = 0, > 0)"))
        return out, errors
    try:
        out["height"] = number("ground.height", value["height"], gt=0.0, le=1e4, unit="m")
    except InputError as e:
        errors.append(e)
        return out, errors
    if ctx.get("run", {}).get("model") == "linear":
        errors.append(InputError("ground", "is computed by the vortex model only (the images of its vortices); "
                                           "the linear model has no ground effect: set run.model = \"vortex\" "
                                           "or remove [ground]"))
    depth = lowest_below_axis(ctx)
    if depth is not None and out["height"] <= depth:
        af = ctx.get("airfoil", {})
        part = ("the elements' lowest point" if af.get("_more") else
                f"the {'lower surface' if af.get('thick') else 'camber line'}'s lowest point")
        errors.append(InputError("ground.height", f"is {out['height']:g} m, but {part} is {depth:.4g} m below "
                                                  f"the pitch axis at t = 0: the airfoil would start in the "
                                                  f"ground; give more than {depth:.4g} m"))
    return out, errors
