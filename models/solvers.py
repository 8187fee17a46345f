"""Solver settings of the sizing loop."""

import numpy as np
import openmdao.api as om


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
        super()._single_iteration()
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
