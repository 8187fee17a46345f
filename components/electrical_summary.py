"""Define the ElectricalSummaryComp class: total mass and efficiency of the power chain."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class ElectricalSummaryComp(PointwiseComponent):
    r"""
    Totals of the electrical power chain: mass and end-to-end efficiency.

    .. math::

        m_{elec} = \sum_i m_i, \qquad
        \eta_{chain} = \frac{P_{fan}}{P_{extracted}}

    where :math:`P_{extracted}` is the shaft power taken from the turbofans (generator
    input power) and :math:`P_{fan}` the shaft power delivered to the aft fan (motor output
    power); common practice. For each name in option ``devices`` the component has an input
    ``<device>_mass``.

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
            'devices',
            types=list,
            default=['generator', 'rectifier', 'cable', 'inverter', 'motor', 'thermal'],
            desc='Names of the mass items; each adds an input <device>_mass.',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        for device in self.options['devices']:
            self.add_input(f'{device}_mass', np.zeros(n), units='kg', desc=f'Mass of the {device}.')
        self.add_input(
            'shaft_power_extracted',
            1.0e6 * np.ones(n),
            units='W',
            desc='Shaft power taken from the turbofans (generator input power).',
        )
        self.add_input(
            'aft_fan_shaft_power',
            0.9e6 * np.ones(n),
            units='W',
            desc='Shaft power delivered to the aft fan (motor output power).',
        )

        self.add_output(
            'electrical_mass',
            np.zeros(n),
            units='kg',
            desc='Total mass of the electrical power chain.',
        )
        self.add_output(
            'chain_efficiency',
            0.9 * np.ones(n),
            units=None,
            desc='Aft-fan shaft power / extracted shaft power.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials; the mass partials are constant.
        """
        idx = np.arange(self.options['vec_size'])
        for device in self.options['devices']:
            self.declare_partials('electrical_mass', f'{device}_mass', rows=idx, cols=idx, val=1.0)
        self.declare_diagonal_partials(
            'chain_efficiency', ['shaft_power_extracted', 'aft_fan_shaft_power']
        )

    def compute(self, inputs, outputs):
        """
        Compute the total mass and the chain efficiency.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        total = np.zeros_like(inputs['shaft_power_extracted'])
        for device in self.options['devices']:
            total = total + inputs[f'{device}_mass']
        outputs['electrical_mass'] = total
        outputs['chain_efficiency'] = (
            inputs['aft_fan_shaft_power'] / inputs['shaft_power_extracted']
        )

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials of the chain efficiency.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        p_ext = inputs['shaft_power_extracted']
        partials['chain_efficiency', 'aft_fan_shaft_power'] = 1.0 / p_ext
        partials['chain_efficiency', 'shaft_power_extracted'] = (
            -inputs['aft_fan_shaft_power'] / p_ext**2
        )
