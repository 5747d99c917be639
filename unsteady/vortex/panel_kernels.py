"""Numba kernels of the surface-panel body: linear-strength vortex panels and the potential of a doublet chain.

**Linear-strength vortex panel** (J. Katz & A. Plotkin, *Low-Speed
Aerodynamics*, 2nd ed., 2001, ch. 10 and 11, the linear-strength vortex
element, written here in our own symbols).  A straight panel from node A to
node B, length l, local axes x along A -> B and z to its left, carries the
counter-clockwise vortex sheet gamma(xi) = gamma_a + (gamma_b - gamma_a) xi / l.
At a point (x, z) of the local frame, with theta = the angle subtended by
the panel, dth = atan2(z l, x (x - l) + z^2), and L = ln(r_a / r_b)::

    u = -(1 / 2 pi) [gamma_a dth + (gamma_b - gamma_a) / l (x dth - z L)]
    w =  (1 / 2 pi) [gamma_a L  + (gamma_b - gamma_a) / l (x L - l + z dth)]

(the integrals of the point-vortex kernel of :mod:`~unsteady.vortex.kernels`
along the panel).  At the panel's own mid-point dth is taken as 0 (the
principal value); the side of the sheet then adds -+ gamma / 2 along x.

**Doublet chain**: a straight segment from A to B of constant doublet
strength mu is the same flow as a vortex +mu at B and -mu at A; its
potential is mu / (2 pi) arg((P - B) / (P - A)), cut along the segment
itself (L. M. Milne-Thomson, *Theoretical Hydrodynamics*, 5th ed., 1968,
the complex potential of a vortex pair).  A chain of such segments through
the body's nodes and the wake carries the potential of all vortices with a
single cut along the body and the wake, so the potential is single-valued
in the air around the body.
"""

import math

from numba import njit

INV_2PI = 1.0 / (2.0 * math.pi)


@njit(cache=True, error_model="numpy")
def _panel_pair(xp, zp, xa, za, xb, zb, own):
    """Velocity (global axes) per unit gamma_a and per unit gamma_b of one panel at one point.

    ``own``: the point is the panel's mid-point (principal value).
    Returns (ua, wa, ub, wb).
    """
    dx = xb - xa
    dz = zb - za
    l = math.sqrt(dx * dx + dz * dz)
    tx = dx / l
    tz = dz / l
    # local coordinates: x along the panel from A, z to its left
    rx = xp - xa
    rz = zp - za
    x = rx * tx + rz * tz
    z = -rx * tz + rz * tx
    if own:
        dth = 0.0
        L = 0.0
    else:
        dth = math.atan2(z * l, x * (x - l) + z * z)
        ra2 = x * x + z * z
        rb2 = (x - l) * (x - l) + z * z
        L = 0.5 * math.log(ra2 / rb2)
    # u = -(1/2pi)[ga dth + (gb - ga)/l (x dth - z L)], w likewise
    cu = (x * dth - z * L) / l
    cw = (x * L - l + z * dth) / l
    u_a = -INV_2PI * (dth - cu)
    u_b = -INV_2PI * cu
    w_a = INV_2PI * (L - cw)
    w_b = INV_2PI * cw
    # back to global axes: e_x = t, e_z = (-tz, tx)
    ua = u_a * tx - w_a * tz
    wa = u_a * tz + w_a * tx
    ub = u_b * tx - w_b * tz
    wb = u_b * tz + w_b * tx
    return ua, wa, ub, wb


@njit(cache=True, error_model="numpy")
def panel_velocity_matrices(xt, zt, xn, zn, own_panel, mu_u, mu_w):
    """Velocity at targets per unit node vortex strength gamma_k (in place).

    Parameters
    ----------
    xt, zt : float64 arrays (m)
        Targets.
    xn, zn : float64 arrays (m), len N + 1
        Panel nodes in order; panel j runs from node j to node j + 1.
    own_panel : int64 array, len(xt)
        Index of the panel whose mid-point the target is (principal value
        there), or -1.
    mu_u, mu_w : (len(xt), N + 1) float64 arrays
        Output: u and w at target i per unit gamma at node k (1/(2 pi) units:
        velocity = sum_k mu[i, k] gamma_k, gamma in m/s, so mu is
        dimensionless).
    """
    nt = xt.shape[0]
    npan = xn.shape[0] - 1
    for i in range(nt):
        for k in range(npan + 1):
            mu_u[i, k] = 0.0
            mu_w[i, k] = 0.0
        for j in range(npan):
            ua, wa, ub, wb = _panel_pair(xt[i], zt[i], xn[j], zn[j], xn[j + 1], zn[j + 1],
                                         own_panel[i] == j)
            mu_u[i, j] += ua
            mu_w[i, j] += wa
            mu_u[i, j + 1] += ub
            mu_w[i, j + 1] += wb


@njit(cache=True, error_model="numpy")
def chain_potential(xt, zt, own_seg, xc, zc, mu, tail_mu, phi):
    """Potential of a doublet chain at targets (in place).

    Segment j runs from chain point j to j + 1 with doublet strength mu[j];
    after the last point a ray runs to x = +infinity with strength
    ``tail_mu``.  A target on its own segment (``own_seg[i] == j``) takes
    the limit on the segment's left side (angle +pi).

    Parameters
    ----------
    xt, zt : float64 arrays (m)
    own_seg : int64 array, len(xt) (-1: none)
    xc, zc : float64 arrays (m), the chain points
    mu : float64 array, len(xc) - 1 (m^2/s)
    tail_mu : float
    phi : float64 array, len(xt): output (m^2/s)
    """
    nt = xt.shape[0]
    ns = xc.shape[0] - 1
    for i in range(nt):
        s = 0.0
        for j in range(ns):
            if own_seg[i] == j:
                s += mu[j] * math.pi
                continue
            ax = xt[i] - xc[j]
            az = zt[i] - zc[j]
            bx = xt[i] - xc[j + 1]
            bz = zt[i] - zc[j + 1]
            s += mu[j] * math.atan2(ax * bz - az * bx, ax * bx + az * bz)
        if tail_mu != 0.0:
            ax = xt[i] - xc[ns]
            az = zt[i] - zc[ns]
            s += tail_mu * math.atan2(az, -ax)
        phi[i] = s * INV_2PI


@njit(cache=True, error_model="numpy")
def panel_image_velocity_matrices(xt, zt, xn, zn, z_g, mu_u, mu_w):
    """Velocity at targets per unit node vortex strength of the panels' ground images (in place).

    The image of a vortex sheet in a flat wall z = z_g along which the air
    slips is the sheet mirrored about the wall with the opposite strength
    (L. M. Milne-Thomson, *Theoretical Hydrodynamics*, 5th ed., 1968, the
    method of images), so panel j's image runs from node j' to node (j + 1)'
    (z' = 2 z_g - z) carrying -gamma; the straight-panel integral of
    :func:`_panel_pair` holds for any orientation of the panel.  No target
    lies on an image panel (the body is above the ground).  Arguments as
    :func:`panel_velocity_matrices`, with ``z_g`` the ground's height (m).
    """
    nt = xt.shape[0]
    npan = xn.shape[0] - 1
    for i in range(nt):
        for k in range(npan + 1):
            mu_u[i, k] = 0.0
            mu_w[i, k] = 0.0
        for j in range(npan):
            ua, wa, ub, wb = _panel_pair(xt[i], zt[i], xn[j], 2.0 * z_g - zn[j], xn[j + 1],
                                         2.0 * z_g - zn[j + 1], False)
            mu_u[i, j] -= ua
            mu_w[i, j] -= wa
            mu_u[i, j + 1] -= ub
            mu_w[i, j + 1] -= wb


@njit(cache=True, error_model="numpy")
def chain_image_potential(xt, zt, xc, zc, mu, tail_mu, z_g, phi):
    """Add the potential of a doublet chain's ground image at targets (in place).

    The image of the chain of :func:`chain_potential` in a flat wall z = z_g
    (Milne-Thomson 1968, the method of images): its points mirrored,
    z' = 2 z_g - z, each segment's strength and the tail ray's reversed.
    Its cut runs below the ground, so the potential stays single-valued in
    the air.  ``phi`` is added to, not overwritten.
    """
    nt = xt.shape[0]
    ns = xc.shape[0] - 1
    for i in range(nt):
        s = 0.0
        for j in range(ns):
            ax = xt[i] - xc[j]
            az = zt[i] - (2.0 * z_g - zc[j])
            bx = xt[i] - xc[j + 1]
            bz = zt[i] - (2.0 * z_g - zc[j + 1])
            s -= mu[j] * math.atan2(ax * bz - az * bx, ax * bx + az * bz)
        if tail_mu != 0.0:
            ax = xt[i] - xc[ns]
            az = zt[i] - (2.0 * z_g - zc[ns])
            s -= tail_mu * math.atan2(az, -ax)
        phi[i] += s * INV_2PI


@njit(cache=True, error_model="numpy")
def chain_segment_angles(xt, zt, xc, zc, out):
    """Potential at target i per unit doublet strength on segment j of a chain, all at once (in place).

    ``out[i, j]`` is what :func:`chain_potential` gives at target i for a unit
    strength on segment j alone (target i on its own segment i: the left-side
    limit, 1/2).  Used when a body's outline changes shape (a moving flap).
    """
    nt = xt.shape[0]
    ns = xc.shape[0] - 1
    for i in range(nt):
        for j in range(ns):
            if i == j:
                out[i, j] = math.pi * INV_2PI
                continue
            ax = xt[i] - xc[j]
            az = zt[i] - zc[j]
            bx = xt[i] - xc[j + 1]
            bz = zt[i] - zc[j + 1]
            out[i, j] = math.atan2(ax * bz - az * bx, ax * bx + az * bz) * INV_2PI


@njit(cache=True, error_model="numpy")
def ray_vortex_potential(xt, zt, xs, zs, gs, cx, cz, z_g, images, phi):
    """Add the potential of point vortices at targets, each with its cut along a ray pointing away
    from the point (cx, cz) (in place).

    A vortex Gamma at Q is a doublet ray of strength -Gamma from Q to infinity (the limit of the
    chain segments of :func:`chain_potential`); its potential at P, in axes turned so that the
    ray's direction d is +x, is -Gamma / (2 pi) atan2(a_z', -a_x') with a = P - Q.  With (cx, cz)
    inside a convex outline and Q outside it, the ray beyond Q never meets the outline, so the
    potential is continuous on it however the vortices move (used for the vortices of the other
    bodies of several elements).  ``images``: also each vortex's ground image, mirrored about
    z = z_g with the opposite strength (Milne-Thomson 1968, the method of images), whose ray
    points away from (cx, cz) as well.  ``phi`` is added to.
    """
    nt = xt.shape[0]
    ns = xs.shape[0]
    passes = 2 if images else 1
    for k in range(passes):
        sign = 1.0 if k == 0 else -1.0
        for j in range(ns):
            qx = xs[j]
            qz = zs[j] if k == 0 else 2.0 * z_g - zs[j]
            ex = qx - cx
            ez = qz - cz
            L = math.sqrt(ex * ex + ez * ez)
            if L > 0.0:
                dx = ex / L
                dz = ez / L
            else:
                dx = 1.0
                dz = 0.0
            g = -sign * gs[j] * INV_2PI
            for i in range(nt):
                ax = xt[i] - qx
                az = zt[i] - qz
                phi[i] += g * math.atan2(az * dx - ax * dz, -(ax * dx + az * dz))
