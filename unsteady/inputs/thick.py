"""Check of ``[airfoil] thick`` (thick sections on surface panels): limits, refusals and the thickness warning."""

from __future__ import annotations

from ..core.errors import InputError

#: Default ``airfoil.elements`` with ``thick = true``: surface panels on both surfaces
#: (Joukowski and Karman-Trefftz lift within 0.1 %, NACA 2412 at 10 degrees within 0.1 % of
#: the quoted 1.456 at this count; tests/validation/test_thick_sections.py, tools/bench_thick.py).
DEFAULT_PANELS = 160
#: Fewest surface panels accepted (several panels round the leading-edge radius).
MIN_PANELS = 40
#: Thinnest section accepted (fraction of chord): thinner outlines bring the collocation
#: points of the two surfaces within a fraction of a panel of each other.
MIN_THICKNESS = 0.005
#: Thickness (fraction of chord) beyond which a camber-line run gets a warning: thin-airfoil
#: theory leaves out a lift-slope gain of roughly 0.8 t (common practice) and the
#: surface pressures, about 3 % of the lift at 4 % thickness.
WARN_THICKNESS = 0.04


def check_thick(af, airfoil, run_raw, section):
    """Problems of ``[airfoil] thick``; returns (thick, errors).

    ``af``: the raw ``[airfoil]`` table; ``airfoil``: the resolved one so far
    (``elements`` may still be missing: then the panel default is filled in
    here); ``run_raw``: the raw ``[run]`` table; ``section``: the Section or None.
    """
    errors = []
    thick = af.get("thick", False)
    if not isinstance(thick, bool):
        return False, [InputError("airfoil.thick", f"must be true or false, got {thick!r}")]
    if not thick:
        airfoil["thick"] = False           # the camber line chosen in so many words: no thickness warning
        return False, errors
    n = airfoil.get("elements")
    if "elements" not in af:
        airfoil["elements"] = n = DEFAULT_PANELS
    elif isinstance(n, int) and (n < MIN_PANELS or n % 2):
        errors.append(InputError("airfoil.elements", f"with thick = true counts surface panels, half on each "
                                 f"surface: an even number of at least {MIN_PANELS} (default {DEFAULT_PANELS}), "
                                 f"got {n}"))
    if section is not None and section.thickness < MIN_THICKNESS:
        errors.append(InputError("airfoil.thick", f"the section '{section.name}' is {100 * section.thickness:.2g} % "
                                 f"thick; surface panels need at least {100 * MIN_THICKNESS:.2g} %: leave "
                                 f"thick = false (the camber-line model) for a flat plate or a thinner section"))
    model = run_raw.get("model", "vortex") if isinstance(run_raw, dict) else "vortex"
    if model == "linear":
        errors.append(InputError("airfoil.thick", "the linear model (run.model = \"linear\") has no thickness: "
                                 "run thick sections with run.model = \"vortex\""))
    if af.get("lesp_critical") is not None:
        errors.append(InputError("airfoil.thick", "leading-edge shedding (airfoil.lesp_critical) is defined on "
                                 "the camber line's leading-edge suction, which surface panels do not carry: "
                                 "not available with thick = true"))
    if af.get("flap_hinge") is not None:
        errors.append(InputError("airfoil.thick", "a hinged flap (airfoil.flap_hinge) is built on the camber "
                                 "line's elements; surface panels do not yet turn about a hinge: not "
                                 "available with thick = true"))
    airfoil["thick"] = True
    return True, errors


def thickness_warning(data, section):
    """The warning of a section thicker than :data:`WARN_THICKNESS` run on its camber line, or None."""
    af = data.get("airfoil", {})
    if "thick" in af or data.get("run", {}).get("model") != "vortex" or section is None:
        return None
    if section.thickness <= WARN_THICKNESS:
        return None
    return InputError("airfoil.shape", f"'{section.name}' is {100 * section.thickness:.3g} % thick, but the "
                      f"camber-line model leaves the thickness out (about 0.8 t more lift slope and the "
                      f"pressure on each surface are missing): set airfoil.thick = true for surface panels, or "
                      f"thick = false to keep the camber line")
