"""The ``[aircraft]`` section: its check and the constants of level flight.

The heave itself is :mod:`unsteady.dynamics.heave`.
"""

from __future__ import annotations

import math

from .. import theory
from ..core.errors import InputError
from .checks import number, register_section, unknown_keys

__all__ = ["check_aircraft_section", "G", "lift_scale", "CL_LEVEL_LIMIT", "CL_LEVEL_MAX"]

G = theory.G   # standard gravity, m/s^2 (U.S. Standard Atmosphere 1976)

#: Above this level-flight lift coefficient the check warns that the trimmed
#: section is near stall (thin sections reach cl of about 1 near 10-15 degrees
#: at drone Reynolds numbers: common practice).
CL_LEVEL_LIMIT = 1.0
#: Above this level-flight lift coefficient the check refuses the scenario.
CL_LEVEL_MAX = 2.0

#: Physically meaningful ranges (low, high, unit words) of the aircraft's numbers: from a
#: gram-scale flier to a large transport (about 6e5 kg, common practice), wing areas from
#: 1 cm^2 to 1,000 m^2, aspect ratios from 0.2 (a disc-like planform) to 50 (beyond sailplanes).
RANGES = {
    "mass": (1e-3, 1e6, "kg"),
    "wing_area": (1e-4, 1e3, "m^2"),
    "aspect_ratio": (0.2, 50.0, "(span^2 / wing area)"),
}


def lift_scale(aspect_ratio):
    """kappa = a(A) / (2 pi) (Helmbold's slope over the 2-D one), 1 for no aspect ratio."""
    if aspect_ratio is None:
        return 1.0
    return theory.helmbold_lift_slope(aspect_ratio) / (2.0 * math.pi)


#: Keys of pitch freedom (a wing with its tail: dynamics.pitch).
PITCH_FREEDOM = ("pitch_inertia", "cg")
#: Ranges of the pitch-freedom keys: the inertia from a gram-scale flier to a large transport
#: (kg m^2), the centre of gravity in reference chords aft of the first element's leading edge.
PITCH_RANGES = {"pitch_inertia": (1e-8, 1e8), "cg": (-0.5, 1.5)}


def check_pitch_freedom(value, ctx):
    """Problems of ``pitch_inertia`` and ``cg``; returns (resolved part, errors)."""
    errors, out = [], {}
    for key, unit in (("pitch_inertia", "kg m^2 (about the centre of gravity, the whole aircraft)"),
                      ("cg", "(fraction of the first element's chord aft of its leading edge)")):
        if key not in value:
            errors.append(InputError(f"aircraft.{key}", "is required with pitch freedom: give both "
                                                        "aircraft.pitch_inertia (kg m^2) and aircraft.cg "
                                                        "(fraction of the reference chord)"))
            continue
        try:
            lo, hi = PITCH_RANGES[key]
            out[key] = number(f"aircraft.{key}", value[key], ge=lo, le=hi, unit=unit)
        except InputError as e:
            errors.append(e)
    af = ctx.get("airfoil", {})
    if not af.get("_more"):
        errors.append(InputError("aircraft.pitch_inertia", "pitch freedom needs a wing and a tail: give two or "
                                                           "more [[airfoil]] elements, or remove "
                                                           "aircraft.pitch_inertia and aircraft.cg"))
    mo = ctx.get("motion", {})
    if "pitch" in mo:
        errors.append(InputError("motion.pitch", "cannot be prescribed with pitch freedom: the attitude is "
                                                 "trimmed and then free; remove motion.pitch or "
                                                 "aircraft.pitch_inertia and aircraft.cg"))
    if "flap" in mo or "flap_hinge" in af:
        errors.append(InputError("aircraft.cg", "pitch freedom with a flap is not supported by this version: "
                                                "the trim turns the last element (an all-moving tail); remove "
                                                "the flap"))
    if "aspect_ratio" in value:
        errors.append(InputError("aircraft.aspect_ratio", "cannot be used with pitch freedom: the wing's "
                                                          "finite-span correction would also scale the tail's "
                                                          "lift and moment; remove aircraft.aspect_ratio"))
    pivot = mo.get("pivot")
    if "cg" in out and isinstance(pivot, (int, float)) and pivot != 0.25 and abs(pivot - out["cg"]) > 1e-12:
        errors.append(InputError("motion.pivot", f"is {pivot:g}, but with pitch freedom the aircraft turns "
                                                 f"about its centre of gravity (aircraft.cg = {out['cg']:g}): "
                                                 "remove motion.pivot"))
    return out, errors


@register_section("aircraft")
def check_aircraft_section(value, ctx):
    """Check ``[aircraft]``: mass (kg), wing_area (m^2), optional aspect_ratio and span (m); (resolved, [InputError])."""
    if not isinstance(value, dict):
        return value, [InputError("aircraft", "must be a table [aircraft] with mass (kg) and wing_area (m^2)")]
    errors = unknown_keys(value, {"mass", "wing_area", "aspect_ratio", "span", *PITCH_FREEDOM}, "aircraft.")
    out = {}
    if any(k in value for k in PITCH_FREEDOM):      # pitch freedom (dynamics.pitch)
        out, errs = check_pitch_freedom(value, ctx)
        errors += errs
    for key, unit in (("mass", "kg"), ("wing_area", "m^2")):
        if key not in value:
            errors.append(InputError(f"aircraft.{key}", f"is required ({unit}, > 0)"))
            continue
        try:
            number(f"aircraft.{key}", value[key], gt=0.0, unit=unit)
            lo, hi, unit = RANGES[key]
            out[key] = number(f"aircraft.{key}", value[key], ge=lo, le=hi, unit=unit)
        except InputError as e:
            errors.append(e)
    if "aspect_ratio" in value:
        try:
            number("aircraft.aspect_ratio", value["aspect_ratio"], gt=0.0)
            lo, hi, unit = RANGES["aspect_ratio"]
            out["aspect_ratio"] = number("aircraft.aspect_ratio", value["aspect_ratio"], ge=lo, le=hi, unit=unit)
        except InputError as e:
            errors.append(e)
    if "span" in value:
        try:
            out["span"] = number("aircraft.span", value["span"], gt=0.0, le=200.0, unit="m (tip to tip)")
        except InputError as e:
            errors.append(e)
    if {"span", "wing_area", "aspect_ratio"} <= set(out):
        ar = out["span"] ** 2 / out["wing_area"]
        if abs(ar - out["aspect_ratio"]) > 0.01 * out["aspect_ratio"]:
            errors.append(InputError("aircraft.span", f"gives span^2 / wing_area = {ar:.3g}, not the "
                                                      f"aspect_ratio {out['aspect_ratio']:g}: give two of the "
                                                      f"three, or make them agree within 1 %"))
    if "plunge" in ctx.get("motion", {}):
        errors.append(InputError("motion.plunge", "cannot be prescribed with [aircraft]: the aircraft heaves "
                                                  "freely under its lift; remove motion.plunge or [aircraft]"))
    c = ctx.get("airfoil", {}).get("chord")
    if not errors and c and "wing_area" in out and out["wing_area"] < c * c:
        errors.append(InputError("aircraft.wing_area", f"is {out['wing_area']:g} m^2, less than chord^2 = "
                                                       f"{c * c:g} m^2: the span (wing_area / chord) would be "
                                                       f"shorter than the chord"))
    U, rho = ctx.get("flow", {}).get("speed"), ctx.get("flow", {}).get("density")
    if not errors and U and rho and isinstance(ctx.get("_warnings"), list):
        cl_w = out["mass"] * G / (0.5 * rho * U * U * out["wing_area"] * lift_scale(out.get("aspect_ratio")))
        if cl_w > CL_LEVEL_MAX:
            errors.append(InputError(
                "aircraft.mass", f"level flight would need a section lift coefficient of {cl_w:.2f}; an "
                                 f"attached-flow section gives at most about 1.5 before it stalls, and this model "
                                 f"accepts up to {CL_LEVEL_MAX:g}: raise flow.speed or aircraft.wing_area, or "
                                 f"lower aircraft.mass"))
        elif cl_w > CL_LEVEL_LIMIT:
            ctx["_warnings"].append(InputError(
                "aircraft.mass", f"level flight needs a section lift coefficient of {cl_w:.2f}, above "
                                 f"{CL_LEVEL_LIMIT:g}: the wing would be near stall, outside the attached-flow "
                                 f"model; raise flow.speed or aircraft.wing_area"))
    return out, errors
