"""
Solver settings of the sizing loop.

Large sweeps put many independent design points into one vectorised model; the Jacobian of the
sizing loop is then block diagonal (one block per point, the same sparsity in every block).
:class:`PointwiseDirectSolver` factorises all blocks at once in one static pivot order taken
from one representative block (:class:`BatchedBlockLU`) and checks the backward error of every
point's solution; a point that fails the check is factorised by SuperLU instead.
"""

import numpy as np
import openmdao.api as om
import scipy.sparse
import scipy.sparse.linalg
from openmdao.core.analysis_error import AnalysisError
from openmdao.solvers.linear.direct import format_singular_error


class SizingNewtonSolver(om.NewtonSolver):
    """
    Newton's method that keeps the last finite state and converges design points one by one.

    When a solve diverges to non-finite values, the state it leaves behind says nothing about
    why; the last finite state (``last_finite_state``) does, and the caller can restore it
    with :meth:`restore_last_finite` before diagnosing the design.

    In a vectorised model (``vec_size`` > 1, every variable one value per point) the design
    points are independent, so each point gets its own convergence test: the point's residual
    norm against ``atol`` and against ``rtol`` times its own initial norm, the test a
    one-point model applies to its whole residual. A point that passes is frozen: it takes no
    further step while the others iterate, and a point whose residual is not finite stops
    too. Every point's answer is then the one it would get alone, whatever its neighbours
    (how many there are, how fast they converge): a map solved in chunks gives the numbers of
    one solve. Points listed in ``held_points`` (set by the caller, e.g. points that closed
    in an earlier solve of the same problem) are frozen from the start.

    Parameters
    ----------
    **kwargs : dict
        Options of :class:`openmdao.api.NewtonSolver`.
    """

    def __init__(self, **kwargs):
        super().__init__(**kwargs)
        self.last_finite_state = None
        self.held_points = None
        self._frozen = None
        self._point_norm0 = None
        self._dead_seen = False
        self._points_of = None

    def _point_count(self):
        """Design points of a pointwise solve, or None for a solve of the whole vector."""
        system = self._system()
        if system.under_complex_step or 'vec_size' not in system.options:
            return None
        points = system.options['vec_size']
        if points < 2:
            return None
        key = (id(system._outputs), points)
        if self._points_of is None or self._points_of[0] != key:
            sizes = [flat.size for _, flat in system._outputs._abs_item_iter()]
            self._points_of = (key, all(size == points for size in sizes))
        return points if self._points_of[1] else None

    def _iter_initialize(self):
        self.last_finite_state = None
        points = self._point_count()
        self._point_norm0 = None
        self._frozen = None
        self._dead_seen = False
        if points is not None:
            held = self.held_points
            self._frozen = (
                np.zeros(points, dtype=bool)
                if held is None or len(held) != points
                else np.array(held, dtype=bool)
            )
        out = super()._iter_initialize()
        self._keep_if_finite()
        return out

    def _iter_get_norm(self):
        """
        Return the residual norm, or in a pointwise solve a flag for the loop of the solver.

        Pointwise: 1.0 while a point still iterates, 0.0 when every point has converged,
        NaN when every point has stopped and one of them on a non-finite residual.
        """
        if self._frozen is None:
            return super()._iter_get_norm()
        points = self._frozen.size
        res = self._system()._residuals.asarray().reshape(-1, points)
        with np.errstate(all='ignore'):
            norm = np.sqrt(np.sum(np.abs(res) ** 2, axis=0))
        if self._point_norm0 is None:
            self._point_norm0 = np.where(norm == 0.0, 1.0, norm)
        with np.errstate(invalid='ignore'):
            relative = norm / self._point_norm0
        done = (norm <= self.options['atol']) | (relative <= self.options['rtol'])
        dead = ~np.isfinite(norm) & ~self._frozen
        self._dead_seen = self._dead_seen or bool(dead.any())
        self._frozen |= done | dead
        if not self._frozen.all():
            return 1.0
        return np.nan if self._dead_seen else 0.0

    def _single_iteration(self):
        frozen = self._frozen if self._frozen is not None and self._frozen.any() else None
        if frozen is not None:
            system = self._system()
            points = frozen.size
            outputs = system._outputs.asarray().reshape(-1, points)
            kept = outputs[:, frozen].copy()
            # No step for a frozen point: a zero right-hand side, its outputs put back after.
            system._residuals.asarray().reshape(-1, points)[:, frozen] = 0.0
        try:
            super()._single_iteration()
        except RuntimeError as err:
            # A singular or non-finite Jacobian means the design has left the physical
            # region: report a failed solve, as for any other non-convergence.
            raise AnalysisError(
                f"Solver '{self.SOLVER}' on system '{self._system().pathname}': {err}"
            ) from None
        finally:
            if frozen is not None:
                system._outputs.asarray().reshape(-1, points)[:, frozen] = kept
        self._keep_if_finite()

    def _keep_if_finite(self):
        values = self._system()._outputs.asarray()
        if np.all(np.isfinite(values)):
            self.last_finite_state = values.copy()

    def restore_last_finite(self):
        """
        Put the last finite state back into the system's outputs.

        Returns
        -------
        bool
            True when a finite state was available.
        """
        if self.last_finite_state is None:
            return False
        self._system()._outputs.set_val(self.last_finite_state)
        return True


#: Fewest design points for which :class:`PointwiseDirectSolver` factorises the point blocks
#: all at once (:class:`BatchedBlockLU`); below it, one SuperLU factorisation of the whole
#: matrix is faster (one factorisation and solve of the demo's sizing loop: equal at about
#: 32 points, the batched LU 2x faster at 64 points and 5x at 256).
MIN_BATCHED_POINTS = 64

#: Largest backward error of a batched solution accepted for a point (normwise, of the
#: equilibrated block: see :class:`BatchedBlockLU`); a point above it, or with a non-finite
#: factor, is factorised by SuperLU instead. A stable LU gives a few machine epsilons times
#: the element growth.
BACKWARD_ERROR_LIMIT = 1e-10


class PointBlocks:
    """
    Where the entries of each point's block sit in a point-by-point CSC matrix.

    OpenMDAO orders the unknowns variable by variable: unknown ``j`` of point ``p`` has the
    global index ``j * points + p``. The matrix is block diagonal by points when every entry
    couples two unknowns of one point; this class holds, for every entry of the local block
    pattern (the same for all points), the position of that entry in the matrix's data array
    at each point.

    Parameters
    ----------
    rows, cols : ndarray of int
        Local row and column of each block entry (in CSC order of the blocks).
    gather : ndarray of int, shape (entries, points)
        Index into the matrix's ``data`` of each block entry at each point.
    size : int
        Unknowns per point.
    points : int
        Number of points.
    """

    def __init__(self, rows, cols, gather, size, points):
        self.rows, self.cols, self.gather = rows, cols, gather
        self.size, self.points = size, points

    @classmethod
    def of(cls, matrix, points):
        """
        Find the point blocks of a CSC matrix.

        Parameters
        ----------
        matrix : scipy.sparse.csc_matrix
            Square matrix in variable-major order (sorted indices within each column).
        points : int
            Number of independent points.

        Returns
        -------
        PointBlocks or None
            None unless the matrix is block diagonal by points with the same pattern in every
            block, no repeated entry and no empty row or column.
        """
        n = matrix.shape[0]
        if matrix.shape != (n, n) or points < 1 or n % points or n == 0:
            return None
        size = n // points
        indptr = np.asarray(matrix.indptr, dtype=np.int64)
        counts = np.diff(indptr).reshape(size, points)
        if np.any(counts != counts[:, :1]):
            return None
        per_col = counts[:, 0]
        entries = int(per_col.sum())
        if entries == 0:
            return None
        cols = np.repeat(np.arange(size), per_col)
        offset = np.arange(entries) - np.repeat(np.cumsum(per_col) - per_col, per_col)
        # Columns j * points + p (p = 0, 1, ...) are adjacent and hold per_col[j] entries each.
        first = indptr[:n:points][cols] + offset
        gather = first[:, None] + per_col[cols][:, None] * np.arange(points)
        found = matrix.indices[gather]
        rows = found[:, 0] // points
        if np.any(found != rows[:, None] * points + np.arange(points)):
            return None
        key = rows * size + cols
        if np.unique(key).size != entries or np.unique(rows).size != size or np.any(per_col == 0):
            return None  # repeated entries, or an empty row or column (singular)
        return cls(rows, cols, gather, size, points)

    def block(self, values, point):
        """
        Return one point's block as a CSC matrix.

        Parameters
        ----------
        values : ndarray, shape (entries, points)
            Block entries of every point.
        point : int
            The point.

        Returns
        -------
        scipy.sparse.csc_matrix
            The block, ``size`` x ``size``.
        """
        return scipy.sparse.csc_matrix(
            (values[:, point], (self.rows, self.cols)), shape=(self.size, self.size)
        )

    def block_diagonal(self, values, which):
        """
        Return the blocks of some points as one block-diagonal CSC matrix (point-major).

        Parameters
        ----------
        values : ndarray, shape (entries, points)
            Block entries of every point.
        which : ndarray of int
            The points, in the order of the diagonal blocks.

        Returns
        -------
        scipy.sparse.csc_matrix
            Square matrix of size ``len(which) * size``.
        """
        shift = self.size * np.arange(len(which))
        rows = (self.rows[:, None] + shift).ravel()
        cols = (self.cols[:, None] + shift).ravel()
        n = self.size * len(which)
        return scipy.sparse.csc_matrix((values[:, which].ravel(), (rows, cols)), shape=(n, n))


class StaticPivotPlan:
    """
    Symbolic LU of the point blocks in one fixed row and column order.

    The block reordered as :math:`B = A[r, c]` (rows ``r``, columns ``c``) is factorised
    without further pivoting, :math:`B = L U` with unit lower :math:`L`. The plan holds the
    filled pattern of :math:`L + U` (slots) and, for each elimination step :math:`k`, the
    slots of column :math:`k` of :math:`L`, of row :math:`k` of :math:`U` and of the entries
    they update (right-looking elimination). The slots of step :math:`k` are numbered
    ``[U_kk, U_k,k+1.., L_k+1..,k]`` so that a row of :math:`U` and a column of :math:`L` are
    contiguous.

    Parameters
    ----------
    rows, cols : ndarray of int
        Local row and column of each block entry.
    size : int
        Unknowns per block.
    row_order, col_order : ndarray of int
        Pivot order: step ``k`` eliminates row ``row_order[k]`` and column ``col_order[k]``.
    """

    def __init__(self, rows, cols, size, row_order, col_order):
        self.row_order = np.asarray(row_order)
        self.col_order = np.asarray(col_order)
        self.size = size
        inv_r = np.empty(size, dtype=np.int64)
        inv_r[self.row_order] = np.arange(size)
        inv_c = np.empty(size, dtype=np.int64)
        inv_c[self.col_order] = np.arange(size)
        fill = np.zeros((size, size), dtype=bool)
        fill[inv_r[rows], inv_c[cols]] = True
        fill[np.diag_indices(size)] = True  # a structurally zero pivot fails numerically
        below, right = [], []
        for k in range(size):
            lower = k + 1 + np.flatnonzero(fill[k + 1 :, k])
            upper = k + 1 + np.flatnonzero(fill[k, k + 1 :])
            if lower.size and upper.size:
                fill[np.ix_(lower, upper)] = True
            below.append(lower)
            right.append(upper)
        slot = np.full((size, size), -1, dtype=np.int64)
        self.diag = np.empty(size, dtype=np.int64)
        self.u_slice, self.l_slice = [], []
        count = 0
        for k in range(size):
            slot[k, k] = self.diag[k] = count
            count += 1
            slot[k, right[k]] = count + np.arange(right[k].size)
            self.u_slice.append(slice(count, count + right[k].size))
            count += right[k].size
            slot[below[k], k] = count + np.arange(below[k].size)
            self.l_slice.append(slice(count, count + below[k].size))
            count += below[k].size
        self.slots = count
        self.l_rows, self.u_cols = below, right
        self.targets = [slot[np.ix_(below[k], right[k])].ravel() for k in range(size)]
        self.entry_slot = slot[inv_r[rows], inv_c[cols]]
        self.fill_slot = np.setdiff1d(np.arange(count), self.entry_slot)

    def matches(self, row_order, col_order):
        """
        Tell whether the plan uses this pivot order.

        Parameters
        ----------
        row_order, col_order : ndarray of int
            Pivot order.

        Returns
        -------
        bool
            True for the same order.
        """
        return np.array_equal(row_order, self.row_order) and np.array_equal(
            col_order, self.col_order
        )

    def factorize(self, values, out=None):
        """
        Factorise every block (numeric phase).

        Parameters
        ----------
        values : ndarray, shape (entries, points)
            Block entries of every point.
        out : ndarray or None
            Array of shape (slots, points) and the dtype of ``values`` to hold the factors.

        Returns
        -------
        ndarray, shape (slots, points)
            :math:`L` (below the diagonal) and :math:`U` of every point, by slot.
        """
        points = values.shape[1]
        lu = np.empty((self.slots, points), dtype=values.dtype) if out is None else out
        lu[self.fill_slot] = 0.0
        lu[self.entry_slot] = values
        with np.errstate(all='ignore'):
            for k in range(self.size):
                lower, upper = self.l_slice[k], self.u_slice[k]
                if lower.start == lower.stop:
                    continue
                lu[lower] /= lu[self.diag[k]]
                if upper.start < upper.stop:
                    lu[self.targets[k]] -= (lu[lower, None, :] * lu[None, upper, :]).reshape(
                        -1, points
                    )
        return lu

    def solve(self, lu, rhs, trans='N'):
        """
        Solve with the factors of every block.

        Parameters
        ----------
        lu : ndarray, shape (slots, points)
            Factors from :meth:`factorize`.
        rhs : ndarray, shape (size, points)
            Right-hand sides, one column per point.
        trans : str
            'N' solves :math:`A x = b`, 'T' solves :math:`A^T x = b`.

        Returns
        -------
        ndarray, shape (size, points)
            Solutions.
        """
        dtype = np.result_type(lu, rhs)
        out = np.empty(rhs.shape, dtype=dtype)
        with np.errstate(all='ignore'):
            if trans == 'N':
                # B y = b[r] with L (forward, by columns) then U (backward, by rows); x[c] = y.
                y = rhs[self.row_order].astype(dtype)
                for k in range(self.size):
                    if self.l_rows[k].size:
                        y[self.l_rows[k]] -= lu[self.l_slice[k]] * y[k]
                for k in range(self.size - 1, -1, -1):
                    if self.u_cols[k].size:
                        y[k] -= np.einsum('ij,ij->j', lu[self.u_slice[k]], y[self.u_cols[k]])
                    y[k] /= lu[self.diag[k]]
                out[self.col_order] = y
            else:
                # B^T y = b[c] with U^T (forward) then L^T (backward); x[r] = y.
                y = rhs[self.col_order].astype(dtype)
                for k in range(self.size):
                    y[k] /= lu[self.diag[k]]
                    if self.u_cols[k].size:
                        y[self.u_cols[k]] -= lu[self.u_slice[k]] * y[k]
                for k in range(self.size - 1, -1, -1):
                    if self.l_rows[k].size:
                        y[k] -= np.einsum('ij,ij->j', lu[self.l_slice[k]], y[self.l_rows[k]])
                out[self.row_order] = y
        return out


def _superlu_solve(lu, rhs, trans, complex_factors):
    """Solve with SuperLU factors; a complex right-hand side of real factors in two parts."""
    if np.iscomplexobj(rhs) and not complex_factors:
        return lu.solve(np.ascontiguousarray(rhs.real), trans) + 1j * lu.solve(
            np.ascontiguousarray(rhs.imag), trans
        )
    return lu.solve(np.ascontiguousarray(rhs), trans)


class Workspace:
    """
    Arrays that one batched factorisation hands on to the next.

    Large arrays allocated afresh at every Newton iteration add page faults to the arithmetic
    on them; a solver keeps one workspace and every :class:`BatchedBlockLU` made with it takes
    the arrays over. Only the latest factors (the ``owner``) may be used: older ones refuse
    to solve.
    """

    def __init__(self):
        self.owner = None
        self._arrays = {}

    def array(self, name, shape, dtype):
        """
        Return an array of this shape and dtype, reusing the memory of the last one.

        Parameters
        ----------
        name : str
            Purpose of the array.
        shape : tuple of int
            Shape.
        dtype : numpy dtype
            Data type.

        Returns
        -------
        ndarray
            Uninitialised C-contiguous array.
        """
        size = int(np.prod(shape))
        held = self._arrays.get(name)
        if held is None or held.dtype != dtype or held.size < size:
            held = self._arrays[name] = np.empty(size, dtype=dtype)
        return held[:size].reshape(shape)


class BatchedBlockLU:
    r"""
    LU factors of all point blocks of a point-by-point matrix, computed at once.

    Every block is factorised in the pivot order SuperLU chooses for one representative block
    (column order COLAMD, partial pivoting), with numpy operations over all points at a time
    (:class:`StaticPivotPlan`). A static pivot order can be unstable for a block whose values
    differ from the representative's, so every solution is checked, point by point, with the
    normwise backward error of the equilibrated block :math:`\hat A = D_r^{-1} A D_c^{-1}`
    (row scales :math:`D_r`: the largest magnitude in each row of the representative block;
    column scales :math:`D_c`: the largest magnitude in each column of its row-scaled block;
    so that the check does not depend on the units of the unknowns and residuals):

    .. math::

        \eta = \frac{\| D_r^{-1} (b - A x) \|_\infty}
                    {\| \hat A \|_\infty \| D_c x \|_\infty + \| D_r^{-1} b \|_\infty}

    (for :math:`A^T x = b` the roles of :math:`D_r` and :math:`D_c` swap). A backward-stable
    solve gives :math:`\eta` of a few machine epsilons times the element growth (Higham,
    Accuracy and Stability of Numerical Algorithms, 2nd ed., ch. 7 and 9; from memory). A
    point whose factors are not finite, or whose :math:`\eta` exceeds
    :data:`BACKWARD_ERROR_LIMIT`, is factorised and solved by SuperLU instead, for this and
    every later solve with these factors.

    Parameters
    ----------
    matrix : scipy.sparse.csc_matrix
        The matrix, variable-major (see :class:`PointBlocks`).
    blocks : PointBlocks
        Its point blocks.
    plan : StaticPivotPlan or None
        A plan to reuse when the representative block gives the same pivot order.
    representative : int or None
        Point whose block sets the pivot order (default: the middle point, or the first
        point with finite entries).
    workspace : Workspace or None
        Arrays to reuse (the factors made before with it can no longer solve).

    Attributes
    ----------
    plan : StaticPivotPlan or None
        The plan used (None when every point went to SuperLU).
    fallback_points : ndarray of int
        Points solved by SuperLU.
    """

    def __init__(self, matrix, blocks, plan=None, representative=None, workspace=None):
        self.blocks = blocks
        if workspace is None:
            workspace = Workspace()
        self._workspace = workspace
        workspace.owner = self
        data = np.asarray(matrix.data)
        self.values = workspace.array('values', blocks.gather.shape, data.dtype)
        np.take(data, blocks.gather, out=self.values, mode='clip')  # indices valid
        # A copy of the matrix (in its own order) for the residuals of the check.
        copy = workspace.array('matrix', data.shape, data.dtype)
        np.copyto(copy, data)
        self.matrix = scipy.sparse.csc_matrix(
            (copy, matrix.indices, matrix.indptr), shape=matrix.shape
        )
        self._scales, self._norms = None, {}
        self._complex = np.iscomplexobj(self.values)
        self._superlu = []
        self.fallback_points = np.zeros(0, dtype=np.int64)
        self.plan = self._plan(plan, representative)
        if self.plan is None:
            self._lu = None
            self._to_superlu(np.arange(blocks.points))
            return
        factors = workspace.array('factors', (self.plan.slots, blocks.points), data.dtype)
        self._lu = self.plan.factorize(self.values, out=factors)
        finite = np.isfinite(self._lu).all(axis=0)
        if not finite.all():
            self._to_superlu(np.flatnonzero(~finite))

    def _plan(self, plan, representative):
        points = self.blocks.points
        finite = np.isfinite(self.values).all(axis=0)
        candidates = [points // 2 if representative is None else representative]
        candidates += list(np.flatnonzero(finite)[:1])
        for point in candidates:
            if not finite[point]:
                continue
            try:
                lu = scipy.sparse.linalg.splu(self.blocks.block(self.values, point))
            except RuntimeError:
                continue
            # SuperLU's factors are those of A[r][:, c], r = argsort(perm_r), c = argsort(perm_c).
            row_order, col_order = np.argsort(lu.perm_r), np.argsort(lu.perm_c)
            self._scales = self._equilibrate(point)
            if plan is not None and plan.matches(row_order, col_order):
                return plan
            return StaticPivotPlan(
                self.blocks.rows, self.blocks.cols, self.blocks.size, row_order, col_order
            )
        return None

    def _equilibrate(self, point):
        """Row and column scales of the block of ``point`` (largest magnitudes)."""
        blocks = self.blocks
        mag = np.abs(self.values[:, point])
        row = np.zeros(blocks.size)
        np.maximum.at(row, blocks.rows, mag)
        row[row == 0] = 1.0
        col = np.zeros(blocks.size)
        np.maximum.at(col, blocks.cols, mag / row[blocks.rows])
        col[col == 0] = 1.0
        return row, col

    def _to_superlu(self, which):
        """Factorise points ``which`` by SuperLU (raises RuntimeError when singular)."""
        which = np.setdiff1d(which, self.fallback_points)
        if not which.size:
            return
        sub = self.blocks.block_diagonal(self.values, which)
        self._superlu.append((which, scipy.sparse.linalg.splu(sub, permc_spec='NATURAL')))
        self.fallback_points = np.sort(np.concatenate([self.fallback_points, which]))

    def _superlu_solve(self, rhs, out, trans, groups):
        size = self.blocks.size
        for which, lu in groups:
            sub = rhs[:, which].T.ravel()
            sol = _superlu_solve(lu, sub, trans, self._complex)
            out[:, which] = sol.reshape(which.size, size).T

    def _norm(self, trans):
        """Infinity norm of every equilibrated block (of its transpose for 'T')."""
        if trans not in self._norms:
            blocks = self.blocks
            row, col = self._scales
            weight = 1.0 / (row[blocks.rows] * col[blocks.cols])
            group = blocks.rows if trans == 'N' else blocks.cols
            entries = np.arange(weight.size)
            summing = scipy.sparse.csr_matrix(
                (weight, (group, entries)), shape=(blocks.size, weight.size)
            )
            mag = self._workspace.array('magnitude', self.values.shape, float)
            with np.errstate(all='ignore'):
                self._norms[trans] = (summing @ np.abs(self.values, out=mag)).max(axis=0)
        return self._norms[trans]

    def backward_error(self, rhs, x, trans='N'):
        r"""
        Normwise backward error of the equilibrated block at every point.

        Parameters
        ----------
        rhs, x : ndarray, shape (size * points,)
            Right-hand side and solution, variable-major.
        trans : str
            'N' for :math:`A x = b`, 'T' for :math:`A^T x = b`.

        Returns
        -------
        ndarray, shape (points,)
            :math:`\eta` of each point (inf where it is not finite).
        """
        row, col = self._scales
        if trans != 'N':
            row, col = col, row
        norm = self._norm(trans)
        row, col = row[:, None], col[:, None]
        shape = (self.blocks.size, self.blocks.points)
        mat = self.matrix if trans == 'N' else self.matrix.T
        with np.errstate(all='ignore'):
            res = np.abs(rhs - mat @ x).reshape(shape) / row
            scale = norm * (np.abs(x).reshape(shape) * col).max(axis=0)
            scale += (np.abs(rhs).reshape(shape) / row).max(axis=0)
            res = res.max(axis=0)
            eta = np.where(scale > 0, res / scale, np.where(res > 0, np.inf, 0.0))
        return np.where(np.isfinite(eta), eta, np.inf)

    def solve(self, rhs, trans='N'):
        """
        Solve :math:`A x = b` (or :math:`A^T x = b`) at every point.

        Parameters
        ----------
        rhs : ndarray, shape (size * points,)
            Right-hand side, variable-major.
        trans : str
            'N' or 'T'.

        Returns
        -------
        ndarray, shape (size * points,)
            Solution, variable-major.
        """
        if self._workspace.owner is not self:
            raise RuntimeError('these batched LU factors were replaced by a later factorisation')
        size, points = self.blocks.size, self.blocks.points
        b = np.asarray(rhs).reshape(size, points)
        if self._lu is None:
            out = np.empty(b.shape, dtype=np.result_type(b, self.values))
        else:
            out = self.plan.solve(self._lu, b, trans)
        self._superlu_solve(b, out, trans, self._superlu)
        flat = out.ravel()
        if self._lu is None:
            return flat
        omega = self.backward_error(np.asarray(rhs).ravel(), flat, trans)
        bad = omega > BACKWARD_ERROR_LIMIT
        bad[self.fallback_points] = False
        if bad.any():
            count = len(self._superlu)
            try:
                self._to_superlu(np.flatnonzero(bad))
            except RuntimeError:
                raise RuntimeError(
                    f'Singular point block(s) at point(s) {np.flatnonzero(bad)[:10].tolist()}'
                ) from None
            self._superlu_solve(b, out, trans, self._superlu[count:])
            flat = out.ravel()
        return flat


class _PermutedLU:
    """LU factors of P A P^T, solving A x = b (or A^T x = b) for the caller."""

    def __init__(self, lu, perm, dtype):
        self.lu, self.perm, self.complex = lu, perm, np.issubdtype(dtype, np.complexfloating)

    def solve(self, rhs, trans='N'):
        out = np.empty_like(rhs, dtype=np.result_type(rhs, np.complex128 if self.complex else 1.0))
        out[self.perm] = _superlu_solve(self.lu, rhs[self.perm], trans, self.complex)
        return out


class PointwiseDirectSolver(om.DirectSolver):
    """
    Direct solver for a group whose design points are independent of one another.

    OpenMDAO orders the unknowns variable by variable; with ``vec_size`` independent points
    the Jacobian is block diagonal once reordered point by point. From
    ``min_batched_points`` points on, when every block has the same sparsity, all blocks are
    factorised at once in one static pivot order (:class:`BatchedBlockLU`, which checks every
    solution and hands the points that fail the check to SuperLU). Otherwise the solver
    factorises the point-major matrix by SuperLU in its natural order, which keeps the fill
    inside each point's block. The results are those of :class:`openmdao.api.DirectSolver`
    (same linear system) to round-off.

    Parameters
    ----------
    **kwargs : dict
        Options of :class:`openmdao.api.DirectSolver`; ``assemble_jac`` must be True.
    """

    def __init__(self, **kwargs):
        kwargs.setdefault('assemble_jac', True)
        super().__init__(**kwargs)
        self._perm = None
        self._blocks = self._blocks_of = None
        self._plan = None
        self._workspace = Workspace()

    def _declare_options(self):
        super()._declare_options()
        self.options.declare(
            'min_batched_points',
            default=None,
            allow_none=True,
            types=int,
            lower=1,
            desc='Fewest points factorised all at once (default MIN_BATCHED_POINTS).',
        )

    def _point_permutation(self, size):
        system = self._system()
        points = system.options['vec_size']
        if points == 1 or size % points:
            return None
        if self._perm is None or self._perm.size != size:
            # Every variable has shape (vec_size,): unknown k of variable j sits at
            # j * points + k; point-major order takes k first.
            self._perm = np.arange(size).reshape(size // points, points).T.ravel()
        return self._perm

    def _batched(self, matrix):
        """Batched factors of ``matrix``, or None when its blocks do not allow them."""
        if not scipy.sparse.issparse(matrix) or matrix.format != 'csc':
            return None
        points = self._system().options['vec_size']
        least = self.options['min_batched_points']
        if points < (MIN_BATCHED_POINTS if least is None else least):
            return None
        key = (matrix.shape, matrix.nnz, points, id(matrix.indptr), id(matrix.indices))
        if self._blocks_of is None or self._blocks_of[0] != key:
            # Map the blocks once per sparsity pattern (also when they do not allow batching).
            self._blocks = PointBlocks.of(matrix, points)
            self._blocks_of = (key, matrix.indptr, matrix.indices)  # keeps the ids valid
            self._plan = None
        if self._blocks is None:
            return None
        lu = BatchedBlockLU(matrix, self._blocks, plan=self._plan, workspace=self._workspace)
        self._plan = lu.plan or self._plan
        return lu

    def _linearize(self):
        system = self._system()
        jac = system._get_assembled_jac()
        matrix = jac.get_dr_do_matrix() if jac is not None else None
        perm = (
            self._point_permutation(matrix.shape[0])
            if matrix is not None
            and hasattr(matrix, 'tocsc')
            and not isinstance(matrix, np.ndarray)
            else None
        )
        if perm is None:
            super()._linearize()
            return
        try:
            lu = self._batched(matrix)
            if lu is None:
                reordered = matrix[perm][:, perm].tocsc()
                lu = _PermutedLU(
                    scipy.sparse.linalg.splu(reordered, permc_spec='NATURAL'), perm, matrix.dtype
                )
        except RuntimeError:
            raise RuntimeError(format_singular_error(system, matrix)) from None
        self._lu = lu
        self._lup = None
        if self._lin_rhs_checker is not None:
            self._lin_rhs_checker.clear()
