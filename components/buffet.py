"""Margin between the cruise lift coefficient and the buffet-onset lift coefficient."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class BuffetMarginComp(PointwiseComponent):
    r"""
    Buffet-onset margin at cruise for a manoeuvre load factor.

    .. math::

        \text{margin} = \frac{C_{L,buffet}}{n \, C_L} - 1

    :math:`C_{L,buffet}` is the buffet-onset lift coefficient at the cruise Mach number,
    :math:`C_L` the cruise lift coefficient and :math:`n` the load factor the aircraft must
    reach before buffet onset. A 1.3 g margin (about a 40 deg banked turn) is common practice
    for cruise, tied to the buffet-onset boundaries of CS 25.251 / 14 CFR 25.251 (from
    memory). The constraint is margin >= 0.

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
        ones = np.ones(n)
        self.add_input('lift_coefficient', 0.5 * ones, units=None, desc='Cruise lift coefficient')
        self.add_input(
            'buffet_lift_coefficient',
            0.7 * ones,
            units=None,
            desc='Buffet-onset lift coefficient at the cruise Mach number',
        )
        self.add_input(
            'buffet_margin_load_factor',
            1.3 * ones,
            units=None,
            desc='Load factor to be reached before buffet onset',
        )
        self.add_output(
            'buffet_margin',
            0.0 * ones,
            units=None,
            desc='CL_buffet / (n CL) - 1 (>= 0 is feasible)',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'buffet_margin',
            ['lift_coefficient', 'buffet_lift_coefficient', 'buffet_margin_load_factor'],
        )

    def compute(self, inputs, outputs):
        """
        Compute the buffet margin.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['buffet_margin'] = (
            inputs['buffet_lift_coefficient']
            / (inputs['buffet_margin_load_factor'] * inputs['lift_coefficient'])
            - 1.0
        )

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
        cl = inputs['lift_coefficient']
        load_factor = inputs['buffet_margin_load_factor']
        ratio = inputs['buffet_lift_coefficient'] / (load_factor * cl)
        partials['buffet_margin', 'buffet_lift_coefficient'] = 1.0 / (load_factor * cl)
        partials['buffet_margin', 'lift_coefficient'] = -ratio / cl
        partials['buffet_margin', 'buffet_margin_load_factor'] = -ratio / load_factor
