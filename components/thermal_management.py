"""Define the ThermalManagementComp class: heat load, mass and drag of the cooling system."""

from numbers import Real

import numpy as np

from voltwake.components.base import PointwiseComponent

#: Default drag per unit heat rejected, N/W: hand estimate of a ram-air heat-exchanger duct
#: (see the ThermalManagementComp docstring), 1.43e-3 N/W rounded to 1.4e-3 N/W.
DRAG_PER_POWER = 1.4e-3

#: Loss exponents of the electrical chain's heat sources: loss ~ power**exponent, 1 for a
#: device of constant efficiency, 2 for the cable's resistive loss (current squared).
CHAIN_LOSS_EXPONENTS = {'generator': 1, 'rectifier': 1, 'cable': 2, 'inverter': 1, 'motor': 1}


def _check_sources(name, value):
    """
    Check that every heat source maps to a real, non-negative loss exponent.

    Parameters
    ----------
    name : str
        Name of the option.
    value : dict
        Source name -> loss exponent.
    """
    for source, exponent in value.items():
        if not isinstance(source, str):
            raise TypeError(f"Option '{name}': source names must be strings, got {source!r}.")
        if isinstance(exponent, bool) or not isinstance(exponent, Real) or exponent < 0:
            raise ValueError(
                f"Option '{name}': the loss exponent of '{source}' must be a real number >= 0, "
                f'got {exponent!r}.'
            )


class ThermalManagementComp(PointwiseComponent):
    r"""
    Thermal-management system that rejects the losses of the electrical power chain.

    The cruise heat load :math:`Q` is the sum of the cruise losses of the heat sources. The
    system is sized on the rated heat load :math:`Q_{rated}`, the heat at the rated power of
    the devices, which is the sizing factor :math:`k` (rated power over cruise power) times
    the cruise power. A device of constant efficiency has a loss proportional to its power
    (loss exponent :math:`e_i = 1`); the resistive loss of the cable goes with the current
    squared (:math:`e_i = 2`). The mass scales with the rated heat load, the drag with the
    cruise heat load, since that is what is rejected in cruise (linear scaling: common
    practice for conceptual sizing):

    .. math::

        Q = \sum_i P_{loss,i}, \qquad
        Q_{rated} = \sum_i k^{e_i} P_{loss,i}, \qquad
        m = m'_{TMS}\, Q_{rated}, \qquad
        D = D'_{TMS}\, Q

    Default drag per unit heat, from the momentum balance of a ram-air heat-exchanger duct
    (hand estimate; the duct relations are common practice). The cooling air takes up
    :math:`Q` with a temperature rise :math:`\Delta T_c`, so its mass flow is
    :math:`\dot m_c = Q/(c_p \Delta T_c)`; it enters at the flight speed :math:`V_0` and
    leaves at :math:`V_e`, so the duct drag is :math:`D = \dot m_c (V_0 - V_e)` and

    .. math::

        D'_{TMS} = \frac{D}{Q} = \frac{V_0\,(1 - V_e/V_0)}{c_p\, \Delta T_c}

    With :math:`V_0 = 230` m/s (Mach 0.78 at 35,000 ft), :math:`\Delta T_c = 40` K,
    :math:`V_e/V_0 = 0.75` and :math:`c_p = 1005` J/(kg K) this is
    :math:`57.5/40200 = 1.43 \times 10^{-3}` N/W; the default is
    :math:`1.4 \times 10^{-3}` N/W (1.4 N/kW), rounded to the two figures the parameters
    justify. The parameters are common practice; this is a hand estimate, not a published
    figure. The Meredith effect (thrust recovered from the heated exit flow) is left out, so
    the estimate is on the high side.

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
            types=dict,
            default=dict(CHAIN_LOSS_EXPONENTS),
            check_valid=_check_sources,
            desc='Heat sources, name -> loss exponent (loss ~ power**exponent: 1 for a device '
            'of constant efficiency, 2 for a resistive cable); each adds an input '
            '<source>_loss.',
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
            'sizing_factor',
            1.5 * np.ones(n),
            units=None,
            desc='Rated power over cruise power of the electrical devices.',
        )
        self.add_input(
            'specific_mass',
            1.0e-3 * np.ones(n),
            units='kg/W',
            desc='Thermal-management mass per unit rated heat load.',
        )
        self.add_input(
            'drag_per_power',
            DRAG_PER_POWER * np.ones(n),
            units='N/W',
            desc='Cruise drag penalty per unit heat rejected.',
        )

        self.add_output(
            'heat_load', np.zeros(n), units='W', ref=1e6, desc='Total heat load at cruise.'
        )
        self.add_output(
            'rated_heat_load',
            np.zeros(n),
            units='W',
            ref=1e6,
            desc='Total heat load at the rated power of the devices.',
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
        self.declare_diagonal_partials(['rated_heat_load', 'mass', 'drag'], losses)
        self.declare_diagonal_partials(['rated_heat_load', 'mass'], 'sizing_factor')
        self.declare_diagonal_partials('mass', 'specific_mass')
        self.declare_diagonal_partials('drag', 'drag_per_power')

    def _heat_loads(self, inputs):
        """
        Sum the cruise losses and the rated losses of all sources.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        heat : ndarray
            Cruise heat load at each point (W).
        rated : ndarray
            Rated heat load at each point (W).
        d_rated : ndarray
            Derivative of the rated heat load with respect to the sizing factor (W).
        """
        k = inputs['sizing_factor']
        heat = np.zeros_like(k)
        rated = np.zeros_like(k)
        d_rated = np.zeros_like(k)
        for source, exponent in self.options['sources'].items():
            loss = inputs[f'{source}_loss']
            heat = heat + loss
            rated = rated + k**exponent * loss
            if exponent != 0:
                d_rated = d_rated + exponent * k ** (exponent - 1) * loss
        return heat, rated, d_rated

    def compute(self, inputs, outputs):
        """
        Compute the heat loads, mass and drag.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        heat, rated, _ = self._heat_loads(inputs)
        outputs['heat_load'] = heat
        outputs['rated_heat_load'] = rated
        outputs['mass'] = inputs['specific_mass'] * rated
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
        heat, rated, d_rated = self._heat_loads(inputs)
        k = inputs['sizing_factor']
        m_spec = inputs['specific_mass']
        partials['rated_heat_load', 'sizing_factor'] = d_rated
        partials['mass', 'sizing_factor'] = m_spec * d_rated
        partials['mass', 'specific_mass'] = rated
        partials['drag', 'drag_per_power'] = heat
        for source, exponent in self.options['sources'].items():
            scale = k**exponent
            partials['rated_heat_load', f'{source}_loss'] = scale
            partials['mass', f'{source}_loss'] = m_spec * scale
            partials['drag', f'{source}_loss'] = inputs['drag_per_power']
