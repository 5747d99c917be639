"""The bordered system of a step: the bodies' factored influence matrix and its Schur-complement solve."""

from __future__ import annotations

import numpy as np

from .kernels import normal_influence, normal_influence_ground


def solve_bordered(a_inv, reduced_rows, columns, d, r, e):
    """Solve the bordered system exactly by the Schur complement of its body block.

    The system, for bound circulations ``g`` (N) and the strengths ``s`` (k)
    of the vortices shed this step, is::

        [ A  B ] [g]   [r]        B = [b_1 ... b_k]  (columns: influence of each new vortex)
        [ C  D ] [s] = [e]        C = [c_1 ... c_k]^T (rows: each site's condition)

    With ``A^-1`` known, ``g = A^-1 (r - B s)`` and the k x k Schur complement
    ``S = D - C A^-1 B`` gives ``S s = e - C A^-1 r`` (G. H. Golub & C. F. Van
    Loan, *Matrix Computations*, 4th ed., 2013, sec. 3.2.10, block
    elimination).  The rows enter already reduced, ``c_i A^-1``, so each step
    costs k^2 + k dot products, one matrix-vector product and a k x k solve.

    Parameters
    ----------
    a_inv : (N, N) array
        Inverse of the bodies' influence matrix A.
    reduced_rows : sequence of k (N,) arrays
        ``c_i A^-1`` for each border row.
    columns : sequence of k (N,) arrays
        ``b_j``: normal velocity at the collocation points per unit strength of new vortex j.
    d : (k, k) array-like
        Coefficients of the new strengths in the border rows.
    r : (N,) array
        Right-hand side of the no-penetration rows.
    e : (k,) array-like
        Right-hand side of the border rows.

    Returns
    -------
    g : (N,) array
        Bound circulations (m^2/s).
    s : sequence of k floats
        Strengths of the new vortices (m^2/s).
    """
    k = len(columns)
    if k == 0:
        return a_inv @ r, ()
    if k == 1:                                  # the common case, in scalars
        row, col = reduced_rows[0], columns[0]
        s = (e[0] - row @ r) / (d[0][0] - row @ col)
        return a_inv @ (r - col * s), (s,)
    schur = np.empty((k, k))
    rhs = np.empty(k)
    for i in range(k):
        rhs[i] = e[i] - reduced_rows[i] @ r
        for j in range(k):
            schur[i, j] = d[i][j] - reduced_rows[i] @ columns[j]
    s = np.linalg.solve(schur, rhs)
    return a_inv @ (r - s @ np.asarray(columns)), s


class BodySystem:
    """The influence matrix of all bodies' bound vortices on all collocation points, factored.

    The matrix is built in the assembly's body frame, where it is invariant
    under the assembly's rigid motion; it is rebuilt and refactored only when
    a body reports that its points moved in that frame (``changed(t)``).

    Parameters
    ----------
    models : list of body models
        See the body rules of :class:`~unsteady.vortex.solver.VortexSolver`.
    t0 : float
        Time (s) of the first factorization.
    """

    def __init__(self, models, t0=0.0):
        self.models = models
        sizes = [m.n for m in models]
        edges = np.concatenate([[0], np.cumsum(sizes)]).astype(int)
        #: slice of each body in the bound-vortex and collocation arrays
        self.slices = [slice(int(a), int(b)) for a, b in zip(edges[:-1], edges[1:])]
        self.n = int(edges[-1])
        #: factorizations so far (a new one invalidates cached reduced rows)
        self.version = 0
        self._factor(t0)

    def _factor(self, t):
        pts = [m.points(t) for m in self.models]
        cat = (lambda k: pts[0][k] if len(pts) == 1 else np.concatenate([p[k] for p in pts]))
        if len(self.models) == 1 and hasattr(self.models[0], "influence_matrix"):   # surface panels alone
            a = self.models[0].influence_matrix()
        else:
            # every body's bound vortices as point vortices on every collocation point, then each
            # surface-panel body's own block in its place
            a = np.empty((self.n, self.n))
            normal_influence(cat(2), cat(3), cat(4), cat(5), cat(0), cat(1), 0.0, a)
            for m, sl in zip(self.models, self.slices):
                if hasattr(m, "influence_matrix"):
                    a[sl, sl] = m.influence_matrix()
        self.a_inv = np.linalg.inv(a)
        self.version += 1
        self._kelvin = {}
        self._a, self._t = a, t
        self._suction = {}

    def refactor_if_changed(self, t):
        """Rebuild and refactor the matrix if any body's points moved; True if it did."""
        for m in self.models:
            if m.changed(t):
                self._factor(t)
                return True
        return False

    def refactor_placed(self, step, z_ground, moved):
        """With a ground: rebuild the matrix on the placed points (with the bound vortices' images).

        The images break the invariance under the assembly's motion, so the
        matrix is refactored whenever pitch or height changed since the last
        factorization, or a body's points ``moved``; True if it was.
        """
        key = (step.alpha, step.h)
        if not moved and key == getattr(self, "_placed_key", None):
            return False
        if len(self.models) == 1 and hasattr(self.models[0], "ground_matrix"):   # surface panels alone
            a = self.models[0].ground_matrix(step, z_ground)
        else:
            # point vortices and their images across bodies, then each surface-panel body's own block
            # with its images in its place
            a = np.empty((self.n, self.n))
            normal_influence_ground(step.xc, step.zc, step.nx, step.nz, step.xv, step.zv, 0.0,
                                    float(z_ground), a)
            for m, sl in zip(self.models, self.slices):
                if hasattr(m, "ground_matrix"):
                    a[sl, sl] = m.ground_matrix(BodyStep(step, sl), z_ground)
        self.a_inv = np.linalg.inv(a)
        self.version += 1
        self._kelvin = {}
        self._placed_key = key
        # the suction parameter reads the bodies' own (free-air) influence on themselves
        free = np.empty((self.n, self.n))
        normal_influence(step.xc, step.zc, step.nx, step.nz, step.xv, step.zv, 0.0, free)
        self._a, self._t = free, step.t
        self._suction = {}
        return True

    def kelvin_row(self, body):
        """``c A^-1`` for the row that sums the bound circulation of one body (cached)."""
        row = self._kelvin.get(body)
        if row is None:
            row = self._kelvin[body] = self.a_inv[self.slices[body]].sum(axis=0)
        return row

    def suction_row(self, body, speed):
        """The leading-edge suction parameter of one body as a row over all bound circulations.

        Returns ``(q, q A^-1)`` (cached until the next factorization):
        ``LESP = q . gamma``.  LESP is A0 of the body's bound vorticity
        (K. Ramesh, A. Gopalarathnam, K. Granlund, M. V. Ol & J. R. Edwards,
        J. Fluid Mech. 751, 2014, eq. 2.3): in thin-airfoil theory
        ``A0 = (1/pi) int_0^pi W(theta) / U dtheta`` with ``W`` the normal
        velocity of the air relative to the camber line that the bound
        vorticity cancels, ``x = c (1 - cos theta) / 2``.  Here ``W`` at the
        collocation points is minus the normal velocity the body's own bound
        vortices induce there (``-(A_bb gamma_b)_k``, exact where the
        no-penetration rows hold), and the integral is the rule of
        :func:`suction_weights` over the collocation points.  A steady flat
        plate gives ``sin alpha``; positive in nose-up attached flow.
        """
        row = self._suction.get(body)
        if row is None and not getattr(self.models[body], "leading_edge_suction", True):
            # a body without a camber line's leading-edge singularity (surface panels): no LESP
            row = self._suction[body] = (np.full(self.n, np.nan), np.full(self.n, np.nan))
        if row is None:
            sl = self.slices[body]
            model = self.models[body]
            w = suction_weights(model.points(self._t), model.geometry, model.trailing_edge(self._t))
            q = np.zeros(self.n)
            q[sl] = -(w @ self._a[sl, sl]) / (np.pi * float(speed))
            row = self._suction[body] = (q, q @ self.a_inv)
        return row

    def reduce(self, c):
        """``c A^-1`` for any border row ``c`` over the bound circulations."""
        return np.asarray(c, float) @ self.a_inv


class BodyStep:
    """One body's view of a step record: its placed points (slice ``sl`` of ``xc, zc, nx, nz, xv, zv``)."""

    def __init__(self, step, sl):
        for k in ("xc", "zc", "nx", "nz", "xv", "zv"):
            setattr(self, k, getattr(step, k)[sl])
        for k in ("alpha", "h", "t", "n"):
            setattr(self, k, getattr(step, k, None))


def suction_weights(points, geometry, trailing_edge):
    """Weights of ``int_0^pi f(theta) dtheta`` over a body's collocation points.

    Each collocation point is given its chord fraction x (projection on the
    line from the leading-edge node to the trailing edge) and its angle
    ``theta = arccos(1 - 2 x)``; point k stands for f on the cell between
    the mid-angles to its neighbours, the first cell starting at 0 and the
    last ending at pi (a midpoint rule in theta; the weights sum to pi, so
    a constant integrates exactly).
    """
    x0, z0 = float(geometry.xi_0[0]), float(geometry.zeta_0[0])
    xt, zt = trailing_edge
    ex, ez = xt - x0, zt - z0
    frac = ((points.xi_c - x0) * ex + (points.zeta_c - z0) * ez) / (ex * ex + ez * ez)
    theta = np.arccos(np.clip(1.0 - 2.0 * frac, -1.0, 1.0))
    edges = np.concatenate(([0.0], 0.5 * (theta[1:] + theta[:-1]), [np.pi]))
    return np.diff(edges)
