"""Define the ThrustSplitComp class: share of the cruise net thrust between the propulsors."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class ThrustSplitComp(PointwiseComponent):
    r"""
    Split the required cruise net thrust between the under-wing turbofans and the aft fan.

    In steady level flight the total net thrust equals the airplane drag :math:`D`. With the
    aft-fan share :math:`\phi` and :math:`n` under-wing engines (common practice):

    .. math::

        F_{tf} = \frac{(1 - \phi) D}{n}, \qquad F_{aft} = \phi D

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def initialize(self):
        """
        Declare options.
        """
        super().initialize()
        self.options.declare(
            'num_engines', types=int, default=2, lower=1, desc='Number of under-wing turbofans.'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        ones = np.ones(n)

        self.add_input(
            'drag',
            40000.0 * ones,
            units='N',
            desc='Total airplane drag = required cruise net thrust',
        )
        self.add_input(
            'aft_thrust_fraction',
            np.zeros(n),
            units=None,
            desc='Share of the net thrust produced by the aft fan',
        )

        self.add_output(
            'turbofan_thrust', 20000.0 * ones, units='N', desc='Net thrust per under-wing turbofan'
        )
        self.add_output('aft_fan_thrust', np.zeros(n), units='N', desc='Net thrust of the aft fan')

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['turbofan_thrust', 'aft_fan_thrust'], ['drag', 'aft_thrust_fraction']
        )

    def compute(self, inputs, outputs):
        """
        Compute the thrust of each propulsor.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        drag = inputs['drag']
        phi = inputs['aft_thrust_fraction']
        outputs['turbofan_thrust'] = (1.0 - phi) * drag / self.options['num_engines']
        outputs['aft_fan_thrust'] = phi * drag

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        drag = inputs['drag']
        phi = inputs['aft_thrust_fraction']
        n_eng = self.options['num_engines']
        partials['turbofan_thrust', 'drag'] = (1.0 - phi) / n_eng
        partials['turbofan_thrust', 'aft_thrust_fraction'] = -drag / n_eng
        partials['aft_fan_thrust', 'drag'] = phi
        partials['aft_fan_thrust', 'aft_thrust_fraction'] = drag
