"""A flat, fixed ground under the airfoil: its height in the computation frame and the clearance watch.

The ground's effect on the flow is the image of every vortex (the kernels'
``ground`` option, :mod:`unsteady.vortex.kernels`): a flat wall along which
the air slips is exactly an inverted mirror image of every vortex (L. M.
Milne-Thomson, *Theoretical Hydrodynamics*, 5th ed., 1968, sec. 13.6;
J. Katz & A. Plotkin, *Low-Speed Aerodynamics*, 2nd ed., 2001).  The
computation frame moves with the aircraft's mean flight, so the ground
slides past at -U along itself, which an inviscid wall does not feel.
"""

from __future__ import annotations

import numpy as np

from .bodies import to_inertial
from .solver import GroundContact

__all__ = ["Ground", "GroundContact", "lowest_point"]


def lowest_point(models, alpha, h):
    """Lowest z (m, computation frame) of every element node and trailing edge (or outline node) of the bodies."""
    low = np.inf
    for m in models:
        g = m.geometry
        if hasattr(g, "xi_n"):                     # surface panels: the outline's nodes
            xi, zeta = g.xi_n, g.zeta_n
        else:
            xi = np.append(g.xi_0, g.xi_te)
            zeta = np.append(g.zeta_0, g.zeta_te)
        _, z = to_inertial(xi, zeta, alpha, h)
        low = min(low, float(z.min()))
    return low


class Ground:
    """A flat ground at height ``z`` (m) in the computation frame (the pitch axis is at h(t) above x = 0).

    Parameters
    ----------
    z : float
        The ground's height: h(0) - ``[ground] height``.
    """

    def __init__(self, z):
        self.z = float(z)

    def clearance(self, models, step):
        """Height (m) of the bodies' lowest point above the ground at this step; stops the run at contact.

        Raises
        ------
        GroundContact
            When the lowest point is at or below the ground.
        """
        gap = lowest_point(models, step.alpha, step.h) - self.z
        if not gap > 0.0:
            raise GroundContact(step.n, step.t, gap)
        return gap
