"""Shared base class for components that act point by point on ``vec_size`` designs."""

import numpy as np
import openmdao.api as om


class PointwiseComponent(om.ExplicitComponent):
    """
    Explicit component whose outputs at each point depend only on inputs at that point.

    Every input and output has shape ``(vec_size,)``; the Jacobian of each output with respect
    to each input is therefore diagonal and is declared sparse by rows and columns.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def initialize(self):
        """
        Declare options.
        """
        self.options.declare(
            'vec_size',
            types=int,
            default=1,
            lower=1,
            desc='Number of independent design points evaluated at once.',
        )

    def declare_diagonal_partials(self, of, wrt):
        """
        Declare diagonal partials of outputs ``of`` with respect to inputs ``wrt``.

        Parameters
        ----------
        of : str or list of str
            Output name(s).
        wrt : str or list of str
            Input name(s).
        """
        idx = np.arange(self.options['vec_size'])
        for name in [of] if isinstance(of, str) else of:
            self.declare_partials(name, wrt, rows=idx, cols=idx)
