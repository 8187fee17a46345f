"""Define the TurbofanCoreComp and EngineMassComp classes: fuel burn and mass of one turbofan."""

import numpy as np

from voltwake.components.base import PointwiseComponent

# Standard acceleration of gravity in m/s**2 (ISO 80000-3; ISO 2533:1975).
G0 = 9.80665


class TurbofanCoreComp(PointwiseComponent):
    r"""
    Fuel flow and thrust-specific fuel consumption of one turbofan's gas-generator core.

    The core delivers the shaft power of its fan plus any shaft power extracted for a
    generator, at a core thermal efficiency :math:`\eta_{th}` defined as shaft power delivered
    over fuel power (common practice):

    .. math::

        \dot m_f = \frac{P_{fan} + P_{ext}}{\eta_{th} \, LHV},
        \qquad TSFC = \frac{\dot m_f}{F}

    :math:`F` is the net thrust of this engine's fan. TSFC is undefined at zero net thrust
    (division by zero); an engine that only drives a generator must not use ``tsfc``.

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
            'fan_shaft_power',
            5.5e6 * ones,
            units='W',
            desc='Shaft power absorbed by the fan of this engine',
        )
        self.add_input(
            'power_extraction',
            np.zeros(n),
            units='W',
            desc='Shaft power taken off the core for a generator',
        )
        self.add_input(
            'thermal_efficiency',
            0.47 * ones,
            units=None,
            desc='Core thermal efficiency: shaft power delivered / fuel power',
        )
        self.add_input(
            'fuel_heating_value',
            43.1e6 * ones,
            units='J/kg',
            desc='Lower heating value of the fuel',
        )
        self.add_input(
            'net_thrust', 18000.0 * ones, units='N', desc="Net thrust of this engine's fan"
        )

        self.add_output(
            'fuel_flow', 0.27 * ones, units='kg/s', desc='Fuel mass flow of this engine'
        )
        self.add_output(
            'tsfc', 1.5e-5 * ones, units='kg/(N*s)', desc='Thrust-specific fuel consumption'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        wrt = ['fan_shaft_power', 'power_extraction', 'thermal_efficiency', 'fuel_heating_value']
        self.declare_diagonal_partials('fuel_flow', wrt)
        self.declare_diagonal_partials('tsfc', wrt + ['net_thrust'])

    def compute(self, inputs, outputs):
        """
        Compute fuel flow and TSFC.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        power = inputs['fan_shaft_power'] + inputs['power_extraction']
        fuel = power / (inputs['thermal_efficiency'] * inputs['fuel_heating_value'])
        outputs['fuel_flow'] = fuel
        outputs['tsfc'] = fuel / inputs['net_thrust']

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
        eta = inputs['thermal_efficiency']
        lhv = inputs['fuel_heating_value']
        thrust = inputs['net_thrust']
        power = inputs['fan_shaft_power'] + inputs['power_extraction']
        fuel = power / (eta * lhv)

        d_fuel = {
            'fan_shaft_power': 1.0 / (eta * lhv),
            'power_extraction': 1.0 / (eta * lhv),
            'thermal_efficiency': -fuel / eta,
            'fuel_heating_value': -fuel / lhv,
        }
        for name, val in d_fuel.items():
            partials['fuel_flow', name] = val
            partials['tsfc', name] = val / thrust
        partials['tsfc', 'net_thrust'] = -fuel / thrust**2


class EngineMassComp(PointwiseComponent):
    r"""
    Rated thrust and installed mass of the under-wing turbofans from a thrust-to-weight ratio.

    .. math::

        F_{rated} = r \, F_{cruise},
        \qquad m_{eng} = \frac{F_{rated}}{(T/W) \, g_0},
        \qquad m_{total} = n \, m_{eng}

    :math:`r` is the ratio of rated sea-level static thrust to cruise thrust, :math:`T/W` the
    installed rated thrust over installed engine weight, :math:`g_0` standard gravity
    (ISO 80000-3) and :math:`n` the number of engines. Sizing the engine weight by a
    thrust-to-weight ratio is common practice in conceptual design.

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
        self.options.declare('count', types=int, default=2, lower=1, desc='Number of engines.')

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        ones = np.ones(n)

        self.add_input(
            'cruise_thrust', 18000.0 * ones, units='N', desc='Cruise net thrust per engine'
        )
        self.add_input(
            'rated_to_cruise_thrust',
            4.5 * ones,
            units=None,
            desc='Rated sea-level static thrust / cruise thrust',
        )
        self.add_input(
            'thrust_to_weight',
            5.0 * ones,
            units=None,
            desc='Installed rated thrust / installed engine weight',
        )

        self.add_output(
            'rated_thrust',
            81000.0 * ones,
            units='N',
            desc='Rated sea-level static thrust per engine',
        )
        self.add_output('engine_mass', 1650.0 * ones, units='kg', desc='Installed mass per engine')
        self.add_output(
            'total_engine_mass', 3300.0 * ones, units='kg', desc='Installed mass of all engines'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('rated_thrust', ['cruise_thrust', 'rated_to_cruise_thrust'])
        self.declare_diagonal_partials(
            ['engine_mass', 'total_engine_mass'],
            ['cruise_thrust', 'rated_to_cruise_thrust', 'thrust_to_weight'],
        )

    def compute(self, inputs, outputs):
        """
        Compute rated thrust and engine masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        rated = inputs['cruise_thrust'] * inputs['rated_to_cruise_thrust']
        mass = rated / (inputs['thrust_to_weight'] * G0)
        outputs['rated_thrust'] = rated
        outputs['engine_mass'] = mass
        outputs['total_engine_mass'] = self.options['count'] * mass

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
        cruise = inputs['cruise_thrust']
        ratio = inputs['rated_to_cruise_thrust']
        tw = inputs['thrust_to_weight']
        count = self.options['count']
        mass = cruise * ratio / (tw * G0)

        partials['rated_thrust', 'cruise_thrust'] = ratio
        partials['rated_thrust', 'rated_to_cruise_thrust'] = cruise
        d_mass = {
            'cruise_thrust': ratio / (tw * G0),
            'rated_to_cruise_thrust': cruise / (tw * G0),
            'thrust_to_weight': -mass / tw,
        }
        for name, val in d_mass.items():
            partials['engine_mass', name] = val
            partials['total_engine_mass', name] = count * val
