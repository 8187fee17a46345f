"""Define the ThermalManagementComp class: heat load, mass and drag of the cooling system."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class ThermalManagementComp(PointwiseComponent):
    r"""
    Thermal-management system that rejects the losses of the electrical power chain.

    The heat load is the sum of the cruise losses of the heat sources; the system mass and
    the drag penalty of the heat rejection scale linearly with the heat load (common
    practice for conceptual sizing):

    .. math::

        Q = \sum_i P_{loss,i}, \qquad
        m = m'_{TMS} Q, \qquad
        D = D'_{TMS} Q

    For each name in option ``sources`` the component has an input ``<source>_loss``.

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
            'sources',
            types=list,
            default=['generator', 'rectifier', 'cable', 'inverter', 'motor'],
            desc='Names of the heat sources; each adds an input <source>_loss.',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        for source in self.options['sources']:
            self.add_input(
                f'{source}_loss', np.zeros(n), units='W', desc=f'Cruise heat loss of the {source}.'
            )
        self.add_input(
            'specific_mass',
            1.0e-3 * np.ones(n),
            units='kg/W',
            desc='Thermal-management mass per unit heat load.',
        )
        self.add_input(
            'drag_per_power', np.zeros(n), units='N/W', desc='Drag penalty per unit heat rejected.'
        )

        self.add_output(
            'heat_load', np.zeros(n), units='W', ref=1e6, desc='Total heat load at cruise.'
        )
        self.add_output('mass', np.zeros(n), units='kg', desc='Thermal-management system mass.')
        self.add_output('drag', np.zeros(n), units='N', desc='Drag penalty of heat rejection.')

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        losses = [f'{source}_loss' for source in self.options['sources']]
        idx = np.arange(self.options['vec_size'])
        for loss in losses:
            self.declare_partials('heat_load', loss, rows=idx, cols=idx, val=1.0)
        self.declare_diagonal_partials(['mass', 'drag'], losses)
        self.declare_diagonal_partials('mass', 'specific_mass')
        self.declare_diagonal_partials('drag', 'drag_per_power')

    def _heat_load(self, inputs):
        """
        Sum the losses of all sources.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        ndarray
            Heat load at each point (W).
        """
        heat = np.zeros_like(inputs['specific_mass'])
        for source in self.options['sources']:
            heat = heat + inputs[f'{source}_loss']
        return heat

    def compute(self, inputs, outputs):
        """
        Compute heat load, mass and drag.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        heat = self._heat_load(inputs)
        outputs['heat_load'] = heat
        outputs['mass'] = inputs['specific_mass'] * heat
        outputs['drag'] = inputs['drag_per_power'] * heat

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (heat-load partials are constant and set in setup).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        heat = self._heat_load(inputs)
        partials['mass', 'specific_mass'] = heat
        partials['drag', 'drag_per_power'] = heat
        for source in self.options['sources']:
            partials['mass', f'{source}_loss'] = inputs['specific_mass']
            partials['drag', f'{source}_loss'] = inputs['drag_per_power']
