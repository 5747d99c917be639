"""Check of ``[airfoil] thick`` (thick sections on surface panels): limits, refusals and the thickness warning."""

from __future__ import annotations

import math

import numpy as np

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


def surface_nodes(section, n_panels, stations=None):
    """Nodes of the outline in chord fractions, lower trailing edge -> leading edge -> upper trailing edge.

    Parameters
    ----------
    section : Section
        With ``outline(n)`` (upper and lower surfaces at cosine-spaced x).
    n_panels : int
        Even number of panels, half on each surface.
    stations : array of n_panels / 2 + 1 chord fractions, optional
        The chord stations of the nodes on each surface (default: cosine spaced).

    Returns
    -------
    x, z : ndarrays of n_panels + 1 points; the first and last are the trailing edge.
    """
    half = int(n_panels) // 2
    xu, zu, xl, zl = (np.asarray(a, dtype=float) for a in
                      (section.outline(half + 1) if stations is None else section.outline(half + 1, x=stations)))
    te = 0.5 * (zu[-1] + zl[-1])
    if zu[-1] != zl[-1]:                       # open trailing edge: shear each surface onto the mean point
        zu = zu - xu * (zu[-1] - te)
        zl = zl - xl * (zl[-1] - te)
    x = np.concatenate((xl[::-1], xu[1:]))
    z = np.concatenate((zl[::-1], zu[1:]))
    x[0] = x[-1] = xu[-1]
    z[0] = z[-1] = te
    return x, z


def flap_outline(section, n_panels, hinge):
    """The outline nodes (chord fractions, as :func:`surface_nodes`) with a node at the hinge station
    on each surface, and the mask of the nodes aft of them (those that turn with a flap)."""
    from .sections import hinge_nodes
    half = int(n_panels) // 2
    stations, k = hinge_nodes(half, hinge)
    x, z = surface_nodes(section, n_panels, stations=stations)
    idx = np.arange(x.shape[0])
    return x, z, (idx < half - k) | (idx > half + k)


def turn_nodes(x, z, moving, x_h, z_h, beta):
    """Nodes ``moving`` turned by beta (rad, trailing edge down) about (x_h, z_h), same units."""
    x, z = np.array(x, float), np.array(z, float)
    dx, dz = x[moving] - x_h, z[moving] - z_h
    c, s = math.cos(beta), math.sin(beta)
    x[moving] = x_h + dx * c + dz * s
    z[moving] = z_h - dx * s + dz * c
    return x, z


#: Sharpest turn accepted between neighbouring panels of a deflected thick flap (deg): past it the
#: panel from a hinge node to the first turned one folds back (measured: NACA 0024 at 160 panels
#: folds at 16 degrees of flap with the hinge at 0.75).
MAX_PANEL_TURN_DEG = 75.0


def flap_fold_limit(section, n_panels, hinge, peak_deg):
    """None if the thick outline turns no sharper than :data:`MAX_PANEL_TURN_DEG` at every deflection up to
    ``peak_deg`` both ways (a degree apart); else the largest deflection (deg) that keeps it."""
    x, z, moving = flap_outline(section, n_panels, hinge)
    z_h = float(np.asarray(section.camber(np.array([float(hinge)])), float)[0])
    limit = math.cos(math.radians(MAX_PANEL_TURN_DEG))
    # only the turns at the hinge nodes and the first turned ones change with the deflection
    hinge_side = moving[:-1] != moving[1:]
    at = np.flatnonzero(hinge_side[:-1] | hinge_side[1:])
    ok = 0.0
    for b in np.append(np.arange(1.0, math.floor(peak_deg) + 1.0), peak_deg):
        for sign in (1.0, -1.0):
            xb, zb = turn_nodes(x, z, moving, float(hinge), z_h, math.radians(sign * b))
            dx, dz = np.diff(xb), np.diff(zb)
            ds = np.hypot(dx, dz)
            turn = (dx[:-1] * dx[1:] + dz[:-1] * dz[1:]) / (ds[:-1] * ds[1:])
            if turn[at].min() < limit:
                return ok
        ok = b
    return None
