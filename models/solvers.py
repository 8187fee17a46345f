"""Solver settings of the sizing loop."""

import numpy as np
import openmdao.api as om
import scipy.sparse.linalg
from openmdao.core.analysis_error import AnalysisError
from openmdao.solvers.linear.direct import format_singular_error


class SizingNewtonSolver(om.NewtonSolver):
    """
    Newton's method that keeps the last state in which every output was finite.

    When a solve diverges to non-finite values, the state it leaves behind says nothing about
    why; the last finite state (``last_finite_state``) does, and the caller can restore it
    with :meth:`restore_last_finite` before diagnosing the design.

    Parameters
    ----------
    **kwargs : dict
        Options of :class:`openmdao.api.NewtonSolver`.
    """

    def __init__(self, **kwargs):
        super().__init__(**kwargs)
        self.last_finite_state = None

    def _iter_initialize(self):
        self.last_finite_state = None
        out = super()._iter_initialize()
        self._keep_if_finite()
        return out

    def _single_iteration(self):
        try:
            super()._single_iteration()
        except RuntimeError as err:
            # A singular or non-finite Jacobian means the design has left the physical
            # region: report a failed solve, as for any other non-convergence.
            raise AnalysisError(
                f"Solver '{self.SOLVER}' on system '{self._system().pathname}': {err}"
            ) from None
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


class _PermutedLU:
    """LU factors of P A P^T, solving A x = b (or A^T x = b) for the caller."""

    def __init__(self, lu, perm):
        self.lu, self.perm = lu, perm

    def solve(self, rhs, trans='N'):
        out = np.empty_like(rhs, dtype=np.result_type(rhs, self.lu.L.dtype))
        out[self.perm] = self.lu.solve(np.ascontiguousarray(rhs[self.perm]), trans)
        return out


class PointwiseDirectSolver(om.DirectSolver):
    """
    Direct solver for a group whose design points are independent of one another.

    OpenMDAO orders the unknowns variable by variable; with ``vec_size`` independent points
    the Jacobian is block diagonal once reordered point by point. This solver factorises that
    reordered matrix in its natural order, which keeps the fill inside each point's block
    and is faster than a general column ordering on large sweeps. The results are those of
    :class:`openmdao.api.DirectSolver` (same linear system).

    Parameters
    ----------
    **kwargs : dict
        Options of :class:`openmdao.api.DirectSolver`; ``assemble_jac`` must be True.
    """

    def __init__(self, **kwargs):
        kwargs.setdefault('assemble_jac', True)
        super().__init__(**kwargs)
        self._perm = None

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
        reordered = matrix[perm][:, perm].tocsc()
        try:
            lu = scipy.sparse.linalg.splu(reordered, permc_spec='NATURAL')
        except RuntimeError:
            raise RuntimeError(format_singular_error(system, matrix)) from None
        self._lu = _PermutedLU(lu, perm)
        self._lup = None
