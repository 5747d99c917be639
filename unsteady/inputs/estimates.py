"""Check-time estimates of where a scenario takes the model out of its depth (warnings, not errors).

``load_scenario`` adds these to ``Scenario.warnings`` (lines
``warning: <file>: <key>: ...``), which ``unsteady check`` and ``unsteady run``
print on stderr before anything runs.  They are estimates from the inputs
alone; the run measures the same things on its history
(:mod:`unsteady.analysis.verdict`) and says what actually happened.

1. The prescribed motion alone (no gust: the gust checker makes its own
   estimate with the motion included) raises the three-quarter-chord
   effective angle beyond :data:`unsteady.inputs.gusts.EFFECTIVE_ANGLE_LIMIT_DEG`
   (:func:`unsteady.theory.effective_angle` on the laws sampled over the run);
   the message points to ``[airfoil] lesp_critical``, or, when it is set,
   says that the leading edge sheds but trailing-edge stall is not modelled.
2. The motion changes instantly (a step, a ramp with sharp corners): its
   apparent-mass force is an impulse.
3. A streamwise gust that can blow against the stream (a sine, turbulence
   or table profile) at least as strong as the flight speed: reversed flow.
4. A section thicker than :data:`unsteady.inputs.thick.WARN_THICKNESS` run on its
   camber line (``[airfoil] thick`` false): the thickness is left out.
"""

from __future__ import annotations

import math

from ..core.errors import InputError


#: Profiles whose velocity has the sign of their (positive) amplitude: a streamwise one only adds to the stream.
ONE_SIGNED = ("sharp-edged", "one-minus-cosine")


def angle_text(deg):
    """An effective angle for a message: thin-airfoil theory's angle is linear in the
    velocities, so beyond 90 degrees it only says that they exceed the flight speed."""
    return f"about {deg:.0f} degrees" if deg < 90.0 else "more than 90 degrees (a motion faster than the flight speed)"


def motion_key(mo):
    """The motion key a warning names: the pitch law, unless only a plunge is given."""
    return "motion.pitch" if "pitch" in mo or "plunge" not in mo else "motion.plunge"


def estimate_warnings(sc):
    """The ``InputError(key, message)`` warnings of a checked :class:`~unsteady.inputs.scenario.Scenario`."""
    from .gusts import EFFECTIVE_ANGLE_LIMIT_DEG, PROFILES, _motion_angle_peak, gust_list
    out = []
    data = sc.data
    mo = data.get("motion", {})
    gusts = gust_list(data.get("gust"))
    if not gusts and mo:
        angle = math.degrees(_motion_angle_peak(data, 0.0))
        if angle > EFFECTIVE_ANGLE_LIMIT_DEG and data["airfoil"].get("lesp_critical") is None:
            out.append(InputError(motion_key(mo),
                                  f"the motion raises the effective angle of attack to {angle_text(angle)}, "
                                  f"beyond {EFFECTIVE_ANGLE_LIMIT_DEG:.0f}: the attached-flow model "
                                  f"is far outside its range there (real sections stall near 10-15 degrees; "
                                  f"airfoil.lesp_critical lets the leading edge shed vortices)"))
        elif angle > EFFECTIVE_ANGLE_LIMIT_DEG:
            out.append(InputError(motion_key(mo),
                                  f"the motion raises the effective angle of attack to {angle_text(angle)}, "
                                  f"beyond {EFFECTIVE_ANGLE_LIMIT_DEG:.0f}: the leading edge sheds "
                                  f"(airfoil.lesp_critical), but trailing-edge stall is not modelled"))
    times = [T for T in sc.kinematics.singular_times() if 0.0 <= T <= data["run"]["duration"]]
    if times:
        shown = ", ".join(f"{T:.4g}" for T in times[:4]) + (" ..." if len(times) > 4 else "")
        out.append(InputError(motion_key(mo),
                              f"changes instantly at t = {shown} s: its apparent-mass force is an impulse "
                              f"there (reported as 'impulses' in the summary and left out of the peaks); a "
                              f"smoothing time gives a force a real actuator could make"))
    from .thick import thickness_warning
    thin = thickness_warning(data, sc.section)
    if thin is not None:
        out.append(thin)
    U = data["flow"]["speed"]
    for i, g in enumerate(gusts):
        if g.get("direction", "vertical") != "streamwise":
            continue
        if g["profile"] in ONE_SIGNED:
            continue
        peak = PROFILES[g["profile"]].peak_of(g, data)
        if peak >= U:
            prefix = "gust." if isinstance(data.get("gust"), dict) else f"gust[{i}]."
            key = prefix + ("intensity" if g["profile"] == "turbulence" else "amplitude")
            out.append(InputError(key, f"a streamwise gust of about {peak:.3g} m/s against a flight speed "
                                       f"of {U:.3g} m/s reverses the flow over the section, which this model "
                                       f"does not describe"))
    return out
