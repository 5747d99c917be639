"""Dimensional gust loads of the aircraft: lift in newtons, the wing's lift coefficient, root bending.

With ``[aircraft]`` the section stands for the wing and the load factor is
n = kappa cl q c / (m' g) (:mod:`unsteady.dynamics.heave`), so the whole
aircraft's lift is::

    lift_N = n m g          (N; the lift that drives the heave)
    cl_wing = kappa cl      (the wing's lift coefficient, when kappa != 1)

and, with ``[aircraft] span`` s_t (m, tip to tip), the aerodynamic bending
moment of one half-wing at the root for an elliptic spanwise loading (L.
Prandtl's lifting-line theory: the half-wing lift L/2 acts at 4 s / (3 pi)
from the root, s = s_t / 2 the semispan)::

    root_bending_Nm = (lift_N / 2) * 4 s / (3 pi)

No inertia relief: the wing's own weight and inertia, which lower the root
bending of a real wing, are not subtracted (the column is the aerodynamic
part alone).
"""

from __future__ import annotations

import math

import numpy as np

from ..core.cautions import DIMENSIONAL_CAUTION
from ..theory import G


def elliptic_root_bending(lift_N, span):
    """Root bending moment of one half-wing, N m: (L/2) 4 s / (3 pi), s = span / 2 (Prandtl)."""
    return 0.5 * np.asarray(lift_N, dtype=float) * 4.0 * (0.5 * span) / (3.0 * math.pi)


def add_dimensional_loads(history, sc):
    """Add ``lift_N``, ``cl_wing`` (kappa != 1) and ``root_bending_Nm`` (with span) to a history
    with ``n``; returns the summary entries (``lift_max_N``, ``root_bending_max_Nm``)."""
    from ..inputs.aircraft import lift_scale
    ac = sc.data.get("aircraft")
    if not ac or "n" not in history:
        return {}
    n = np.asarray(history["n"], dtype=float)
    history["lift_N"] = n * ac["mass"] * G
    kappa = lift_scale(ac.get("aspect_ratio"))
    if kappa != 1.0:
        history["cl_wing"] = kappa * np.asarray(history["cl"], dtype=float)
    out = {}
    ok = np.isfinite(n)
    if ok.any():
        out["lift_max_N"] = float(np.nanmax(history["lift_N"]))
    if "span" in ac:
        history["root_bending_Nm"] = elliptic_root_bending(history["lift_N"], ac["span"])
        if ok.any():
            out["root_bending_max_Nm"] = float(np.nanmax(history["root_bending_Nm"]))
        out["root_bending_note"] = ("aerodynamic bending of one half-wing at the root, elliptic spanwise "
                                    "loading (half-wing lift at 4 s / (3 pi) from the root), no inertia relief")
    out["dimensional_load_caution"] = DIMENSIONAL_CAUTION
    return out
