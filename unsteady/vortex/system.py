"""The bordered system of a step: the bodies' factored influence matrix and its Schur-complement solve."""

from __future__ import annotations

import numpy as np

from .kernels import normal_influence


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
        if hasattr(self.models[0], "influence_matrix"):    # surface panels: their own block
            if len(self.models) > 1:
                raise ValueError("a body with its own influence matrix (surface panels) must be the only body")
            a = self.models[0].influence_matrix()
        else:
            a = np.empty((self.n, self.n))
            normal_influence(cat(2), cat(3), cat(4), cat(5), cat(0), cat(1), 0.0, a)
        self.a_inv = np.linalg.inv(a)
        self.version += 1
        self._kelvin = {}

    def refactor_if_changed(self, t):
        """Rebuild and refactor the matrix if any body's points moved; True if it did."""
        for m in self.models:
            if m.changed(t):
                self._factor(t)
                return True
        return False

    def kelvin_row(self, body):
        """``c A^-1`` for the row that sums the bound circulation of one body (cached)."""
        row = self._kelvin.get(body)
        if row is None:
            row = self._kelvin[body] = self.a_inv[self.slices[body]].sum(axis=0)
        return row

    def reduce(self, c):
        """``c A^-1`` for any border row ``c`` over the bound circulations."""
        return np.asarray(c, float) @ self.a_inv
