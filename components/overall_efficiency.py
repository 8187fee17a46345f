"""Define the OverallEfficiencyComp class: overall efficiency and TSFC of the whole aircraft."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class OverallEfficiencyComp(PointwiseComponent):
    r"""
    Overall propulsion efficiency and thrust-specific fuel consumption of the aircraft.

    Thrust power over fuel power and fuel flow per unit thrust (Cumpsty, Jet Propulsion,
    2nd ed., definition of overall efficiency; chapter number from memory):

    .. math::

        \eta_0 = \frac{F V}{\dot m_f \, LHV}, \qquad TSFC = \frac{\dot m_f}{F}

    :math:`F` is the total net thrust of the aircraft, :math:`V` the true airspeed and
    :math:`\dot m_f` the total fuel flow. Both outputs are undefined at zero thrust or zero
    fuel flow respectively.

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

        self.add_input(
            'net_thrust', 36000.0 * ones, units='N', desc='Total net thrust of the aircraft'
        )
        self.add_input('true_airspeed', 231.0 * ones, units='m/s', desc='True airspeed')
        self.add_input(
            'fuel_flow', 0.54 * ones, units='kg/s', desc='Total fuel flow of the aircraft'
        )
        self.add_input(
            'fuel_heating_value',
            43.1e6 * ones,
            units='J/kg',
            desc='Lower heating value of the fuel',
        )

        self.add_output(
            'overall_efficiency', 0.36 * ones, units=None, desc='Thrust power / fuel power'
        )
        self.add_output(
            'tsfc',
            1.5e-5 * ones,
            units='kg/(N*s)',
            desc='Thrust-specific fuel consumption of the aircraft',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'overall_efficiency', ['net_thrust', 'true_airspeed', 'fuel_flow', 'fuel_heating_value']
        )
        self.declare_diagonal_partials('tsfc', ['net_thrust', 'fuel_flow'])

    def compute(self, inputs, outputs):
        """
        Compute overall efficiency and TSFC.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        thrust = inputs['net_thrust']
        fuel = inputs['fuel_flow']
        outputs['overall_efficiency'] = (
            thrust * inputs['true_airspeed'] / (fuel * inputs['fuel_heating_value'])
        )
        outputs['tsfc'] = fuel / thrust

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
        thrust = inputs['net_thrust']
        speed = inputs['true_airspeed']
        fuel = inputs['fuel_flow']
        lhv = inputs['fuel_heating_value']
        eta0 = thrust * speed / (fuel * lhv)

        partials['overall_efficiency', 'net_thrust'] = speed / (fuel * lhv)
        partials['overall_efficiency', 'true_airspeed'] = thrust / (fuel * lhv)
        partials['overall_efficiency', 'fuel_flow'] = -eta0 / fuel
        partials['overall_efficiency', 'fuel_heating_value'] = -eta0 / lhv
        partials['tsfc', 'net_thrust'] = -fuel / thrust**2
        partials['tsfc', 'fuel_flow'] = 1.0 / thrust
