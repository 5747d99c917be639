"""Aerodynamic loads of the lumped-vortex airfoil: by pressure and by impulse.

Two independent routes give the force and moment every step.

**Unsteady pressure jump** (J. Katz & A. Plotkin, *Low-Speed Aerodynamics*,
2nd ed., 2001, eqs. 13.37-13.40, 13.116-13.117).  Across element j the
pressure jump (lower minus upper surface, counter-clockwise-positive gamma)
is::

    dp_j = -rho [ (V_j . tau_j) Gamma_j / ds_j + d/dt Phi_j ]

where ``V_j`` is the velocity of the air relative to the element (freestream,
gust and wake, less the body's own motion), ``tau_j`` the element tangent and
``Phi_j`` the jump of velocity potential across the element, which with
lumped vortices is ``sum_{k<j} Gamma_k`` over the element's first quarter and
``sum_{k<=j} Gamma_k`` behind the vortex, each plus the jump at the
leading edge: zero in attached flow, and once the leading edge sheds the
circulation it has shed so far (its vortices' branch cuts run to the
leading edge, so that the jump at the trailing edge stays minus the
trailing-edge wake's circulation and the Kutta condition keeps the
pressure jump there zero).  The quasi-steady part is applied as
the Kutta-Joukowski force ``rho Gamma_j (w_j, -u_j)`` on each vortex, which
also carries the leading-edge suction of attached flow, so the drag of a
steady flat plate is zero (d'Alembert); the unsteady part is integrated
exactly over each element along its normal.

**Vortex impulse** (J. C. Wu, AIAA J. 19, 1981; P. G. Saffman, *Vortex
Dynamics*, 1992, sec. 3.2)::

    F = -rho d/dt sum_i Gamma_i (z_i, -x_i)
    M_ccw = (rho / 2) d/dt sum_i Gamma_i |r_i|^2

over all bound and wake vortices, in a frame where the air at infinity is
at rest; the starting vortex of a steady start sits at rest at infinity in
that frame and adds nothing.  Time derivatives are second-order backward
differences (first order on the first step).

The pressure route gives the reported ``cl``, ``cd``, ``cm``; the impulse route
(``*_impulse`` columns) is the independent check.  The impulse counts the force
on everything, so it equals the force on the airfoil only when the wake is
force-free, i.e. moves with the local flow: with a frozen wake (carried at U)
the two differ, in drag most (a plunging plate's mean thrust: pressure route
within 0.4 % of Garrick's formula, impulse route up to 17 % above it).
"""

from __future__ import annotations

import numpy as np


def backward_derivative(values, dt):
    """Second-order backward difference of the last entry of ``values``.

    ``values`` holds up to the last three samples, oldest first.  With two
    samples it is first order; with one it is zero.
    """
    if len(values) >= 3:
        return (3.0 * values[-1] - 4.0 * values[-2] + values[-3]) / (2.0 * dt)
    if len(values) == 2:
        return (values[-1] - values[-2]) / dt
    return 0.0 * values[-1]


class LoadHistory:
    """Computes each step's loads and keeps the short history the derivatives need.

    Coefficients: cl, cd = force / (q c), cm = nose-up moment about the
    quarter chord / (q c^2), q = rho U^2 / 2 with U the mean flight speed.
    """

    def __init__(self, body, speed, density, dt, hinge=None):
        self.body = body
        #: (xi_h, zeta_h, k, c_f): hinge point (body frame, m), first flap element, flap chord (m)
        self.hinge = hinge
        self.U = speed
        self.rho = density
        self.dt = dt
        self.q = 0.5 * density * speed * speed
        b = body
        ds = b.ds
        # Unsteady pressure: per element the integrals of the potential jump
        # over the element, P_j = ds_j (sum_{k<j} G_k + 3/4 G_j), and its first
        # moment along the element from its start node, Q_j.  Both linear in G:
        # P = Pm @ G, Q = Qm @ G.
        N = b.n
        lower = np.tril(np.ones((N, N)), -1)
        self.Pm = ds[:, None] * (lower + 0.75 * np.eye(N))
        self.Qm = (ds ** 2)[:, None] * (0.5 * lower + (15.0 / 32.0) * np.eye(N))
        # Nose-up moment arm of a unit normal force at each element's start
        # node about a reference point: m0 = (zeta0 - zeta_ref) n_xi - (xi0 - xi_ref) n_zeta,
        # and the rate along the element: t_zeta n_xi - t_xi n_zeta (= -1).
        self._arms()
        self.gamma_hist = []
        self.phi_hist = []
        self.imp_hist = []
        self.dcp_last = np.zeros(N)

    def _arms(self):
        b = self.body
        self.arm_ref = self._arm(b.xi_ref, b.zeta_ref)
        self.arm_piv = self._arm(0.0, 0.0)
        self.arm_slope = b.t_zeta * b.n_xi - b.t_xi * b.n_zeta
        if self.hinge is not None:
            self.arm_hinge = self._arm(self.hinge[0], self.hinge[1])

    def reshape(self, body):
        """The body's elements moved in its own frame (a deflected flap): new normals and arms.

        The element lengths are unchanged (the flap turns rigidly), so the
        potential-jump integrals ``Pm``, ``Qm`` stay.
        """
        self.body = body
        self._arms()

    def _arm(self, xi_r, zeta_r):
        b = self.body
        return (b.zeta_0 - zeta_r) * b.n_xi - (b.xi_0 - xi_r) * b.n_zeta

    def retire(self, xs, zs, gs):
        """Wake vortices leave the free wake for the far wake (moving with the air).

        Their share is taken out of the stored impulse sums as if they had
        always moved with the air at U (exact in the far wake), so the
        backward differences stay smooth; the caller adds their circulation
        to ``gamma_start``, whose impulse rate is U Gamma: a vortex drifting
        with the air adds nothing to the impulse rate in the air's frame,
        wherever it is.
        """
        self.imp_hist = retire_impulse(self.imp_hist, self.U, self.dt, xs, zs, gs)

    def add(self, n, t, alpha, h, gamma_b, u_rel, w_rel, xs, zs, gs, gamma_start, phi_le=None):
        """Loads at step n; returns a dict of coefficients for this step.

        ``phi_le`` (m^2/s): the potential jump at the leading edge, the
        circulation the leading edge has shed so far (None: it never sheds).
        """
        b, rho, U, dt, q = self.body, self.rho, self.U, self.dt, self.q
        c = b.chord
        self.gamma_hist.append(gamma_b.copy())
        if len(self.gamma_hist) > 3:
            self.gamma_hist.pop(0)
        dgamma = backward_derivative(self.gamma_hist, dt)
        dP = self.Pm @ dgamma                    # d/dt of the potential-jump integral
        dQ = self.Qm @ dgamma
        if phi_le is not None:
            self.phi_hist.append(float(phi_le))
            if len(self.phi_hist) > 3:
                self.phi_hist.pop(0)
            if any(self.phi_hist):
                # the jump starts at phi_le instead of 0 at the leading edge
                dphi = backward_derivative(self.phi_hist, dt)
                dP = dP + b.ds * dphi
                dQ = dQ + 0.5 * b.ds ** 2 * dphi
        # Kutta-Joukowski force on each lumped vortex (steady part)
        fx_kj = rho * gamma_b * w_rel
        fz_kj = -rho * gamma_b * u_rel
        ca, sa = np.cos(alpha), np.sin(alpha)
        # unsteady normal force per element, rotated into the computation frame
        f_n = -rho * dP
        nx = b.n_xi * ca + b.n_zeta * sa
        nz = -b.n_xi * sa + b.n_zeta * ca
        Fx = fx_kj.sum() + (f_n * nx).sum()
        Fz = fz_kj.sum() + (f_n * nz).sum()
        # moments (nose-up positive): KJ forces at the vortex points
        xv = b.xi_v * ca + b.zeta_v * sa
        zv = h - b.xi_v * sa + b.zeta_v * ca
        x_ref = b.xi_ref * ca + b.zeta_ref * sa
        z_ref = h - b.xi_ref * sa + b.zeta_ref * ca
        M_kj_ref = ((zv - z_ref) * fx_kj - (xv - x_ref) * fz_kj).sum()
        M_kj_piv = ((zv - h) * fx_kj - xv * fz_kj).sum()
        # unsteady normal load: rigid-body arms are rotation invariant
        M_un_ref = (-rho) * (self.arm_ref @ dP + self.arm_slope @ dQ)
        M_un_piv = (-rho) * (self.arm_piv @ dP + self.arm_slope @ dQ)
        M_ref = M_kj_ref + M_un_ref
        M_piv = M_kj_piv + M_un_piv
        # pressure-jump coefficient per element (positive pushes up), for plots
        v_t = u_rel * (b.t_xi * ca + b.t_zeta * sa) + w_rel * (-b.t_xi * sa + b.t_zeta * ca)
        dp = -rho * (v_t * gamma_b / b.ds + dP / b.ds)
        self.dcp_last = dp / q
        extra = {}
        if self.hinge is not None:
            extra["ch"] = self._hinge_moment(ca, sa, h, xv, zv, fx_kj, fz_kj, dP, dQ)
        # -- vortex impulse, in the frame of the air at rest
        Fx_i, Fz_i, M_ccw, self.imp_hist = impulse_loads(self.imp_hist, t, x_ref, z_ref, xs, zs, gs,
                                                         gamma_start, U, rho, dt)
        return {
            "cl": Fz / (q * c), "cd": Fx / (q * c), "cm": M_ref / (q * c * c),
            "cm_pivot": M_piv / (q * c * c),
            "cl_impulse": Fz_i / (q * c), "cd_impulse": Fx_i / (q * c),
            "cm_impulse": -M_ccw / (q * c * c),
            "gamma_bound_m2_s": float(gamma_b.sum()),
            "gamma_wake_m2_s": float(gs.sum() - gamma_b.sum()),
            **extra,
        }

    def _hinge_moment(self, ca, sa, h, xv, zv, fx_kj, fz_kj, dP, dQ):
        """ch = M_hinge / (q c_f^2): the flap elements' loads about the hinge, nose-up sense
        (positive pushes the trailing edge down), by the same two parts as the moment."""
        xi_h, zeta_h, k, c_f = self.hinge
        x_h = xi_h * ca + zeta_h * sa
        z_h = h - xi_h * sa + zeta_h * ca
        f = slice(k, None)
        M_kj = ((zv[f] - z_h) * fx_kj[f] - (xv[f] - x_h) * fz_kj[f]).sum()
        M_un = (-self.rho) * (self.arm_hinge[f] @ dP[f] + self.arm_slope[f] @ dQ[f])
        return float((M_kj + M_un) / (self.q * c_f * c_f))

def retire_impulse(imp_hist, U, dt, xs, zs, gs):
    """The stored impulse sums less vortices that leave for the far wake (see :meth:`LoadHistory.retire`)."""
    t_now = imp_hist[-1][0] + dt if imp_hist else 0.0
    hist = []
    for (tk, s0, s1x, s1z, s2) in imp_hist:
        x = xs - U * (t_now - tk)
        hist.append((tk, s0 - gs.sum(), s1x - (gs * x).sum(), s1z - (gs * zs).sum(),
                     s2 - (gs * (x * x + zs * zs)).sum()))
    return hist


def impulse_loads(imp_hist, t, x_ref, z_ref, xs, zs, gs, gamma_start, U, rho, dt):
    """Force and counter-clockwise moment about (x_ref, z_ref) by the vortex impulse (module docstring).

    ``imp_hist`` holds the last sums ``(t, S0, S1x, S1z, S2)``; returns
    ``(Fx, Fz, M_ccw, imp_hist)`` with this step's sums appended (at most three kept).
    """
    S0 = gs.sum()
    S1x = (gs * xs).sum()
    S1z = (gs * zs).sum()
    S2 = (gs * (xs * xs + zs * zs)).sum()
    imp_hist.append((t, S0, S1x, S1z, S2))
    if len(imp_hist) > 3:
        imp_hist.pop(0)
    Fx_i = -rho * backward_derivative([e[3] for e in imp_hist], dt)
    Fz_i = rho * (backward_derivative([e[2] for e in imp_hist], dt) + U * gamma_start)
    # angular impulse about an air-fixed origin O that coincides with the
    # quarter chord now: O(t') = r_ref + U (t' - t) x_hat in our frame
    f_vals = []
    for (tk, s0, s1x, s1z, s2) in imp_hist:
        ox = x_ref + U * (tk - t)
        oz = z_ref
        f_vals.append(s2 - 2.0 * (ox * s1x + oz * s1z) + (ox * ox + oz * oz) * s0)
    if len(f_vals) >= 2:
        M_ccw = 0.5 * rho * backward_derivative(f_vals, dt)
    else:
        # first row (settled start): nothing moves in our frame but the
        # origin O, at U along x, so df/dt = -2 U (S1x - x_ref S0)
        M_ccw = -rho * U * (S1x - x_ref * S0)
    return Fx_i, Fz_i, M_ccw, imp_hist
