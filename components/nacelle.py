"""Nacelle size from the fan it houses."""

import numpy as np

from .base import PointwiseComponent


class NacelleGeometryComp(PointwiseComponent):
    """
    Nacelle maximum diameter from the fan tip diameter.

    .. math::

        D_{nac} = k_D D_{fan}

    with k_D the configured nacelle-to-fan diameter ratio (common practice for conceptual
    nacelle sizing: the nacelle scales with the fan it houses; its length follows from a
    configured fineness ratio in the drag component).

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input('fan_diameter', val=1.8 * np.ones(n), units='m', desc='Fan tip diameter')
        self.add_input(
            'diameter_ratio',
            val=1.25 * np.ones(n),
            units=None,
            desc='Nacelle maximum diameter / fan tip diameter',
        )
        self.add_output(
            'nacelle_diameter', val=2.2 * np.ones(n), units='m', desc='Nacelle maximum diameter'
        )

    def setup_partials(self):
        """
        Declare diagonal partials.
        """
        self.declare_diagonal_partials('nacelle_diameter', ['fan_diameter', 'diameter_ratio'])

    def compute(self, inputs, outputs):
        """
        Compute the nacelle diameter.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['nacelle_diameter'] = inputs['diameter_ratio'] * inputs['fan_diameter']

    def compute_partials(self, inputs, partials):
        """
        Compute the partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        partials['nacelle_diameter', 'fan_diameter'] = inputs['diameter_ratio']
        partials['nacelle_diameter', 'diameter_ratio'] = inputs['fan_diameter']
