"""Bookkeeping between the per-engine turbofan model and the whole aircraft."""

import numpy as np

from .base import PointwiseComponent


class PropulsionSystemComp(PointwiseComponent):
    r"""
    Aircraft fuel flow and per-engine shaft-power extraction.

    .. math::

        \dot m_{f,total} = N \dot m_{f,engine}

        P_{ext,engine} = P_{ext,total} / N

    The generators' shaft power demand is shared evenly by the N under-wing turbofans
    (identical engines; common practice).

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
            'num_engines', types=int, default=2, lower=1, desc='Number of under-wing turbofans'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'engine_fuel_flow', val=0.3 * np.ones(n), units='kg/s', desc='Fuel flow of one turbofan'
        )
        self.add_input(
            'shaft_power_extracted',
            val=np.zeros(n),
            units='W',
            desc='Shaft power taken off all turbofans for the generators',
        )
        self.add_output(
            'fuel_flow', val=0.6 * np.ones(n), units='kg/s', desc='Fuel flow of the aircraft'
        )
        self.add_output(
            'engine_power_extraction',
            val=np.zeros(n),
            units='W',
            ref=1e6,
            desc='Shaft power taken off each turbofan',
        )

    def setup_partials(self):
        """
        Declare diagonal partials with their constant values.
        """
        idx = np.arange(self.options['vec_size'])
        count = float(self.options['num_engines'])
        self.declare_partials('fuel_flow', 'engine_fuel_flow', rows=idx, cols=idx, val=count)
        self.declare_partials(
            'engine_power_extraction', 'shaft_power_extracted', rows=idx, cols=idx, val=1.0 / count
        )

    def compute(self, inputs, outputs):
        """
        Compute aircraft fuel flow and per-engine extraction.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        count = self.options['num_engines']
        outputs['fuel_flow'] = count * inputs['engine_fuel_flow']
        outputs['engine_power_extraction'] = inputs['shaft_power_extracted'] / count


class InstalledThrustComp(PointwiseComponent):
    """
    Installed rated (sea-level static) thrust of all propulsors.

    .. math::

        T_{inst} = N T_{rated,engine} + r T_{aft,cruise}

    The aft fan is taken to offer the same rated-to-cruise thrust ratio r as the turbofans
    (its motor and electrical chain are rated by the electrical sizing factor); a simple
    conceptual assumption (common practice for a first sizing pass).

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
            'num_engines', types=int, default=2, lower=1, desc='Number of under-wing turbofans'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'turbofan_rated_thrust',
            val=9.0e4 * np.ones(n),
            units='N',
            desc='Rated sea-level static thrust of one turbofan',
        )
        self.add_input(
            'aft_fan_thrust', val=np.zeros(n), units='N', desc='Aft-fan net thrust at cruise'
        )
        self.add_input(
            'rated_to_cruise_thrust',
            val=5.0 * np.ones(n),
            units=None,
            desc='Rated sea-level static thrust / cruise thrust',
        )
        self.add_output(
            'installed_thrust',
            val=1.8e5 * np.ones(n),
            units='N',
            ref=1e5,
            desc='Installed rated thrust of all propulsors',
        )

    def setup_partials(self):
        """
        Declare diagonal partials.
        """
        idx = np.arange(self.options['vec_size'])
        self.declare_partials(
            'installed_thrust',
            'turbofan_rated_thrust',
            rows=idx,
            cols=idx,
            val=float(self.options['num_engines']),
        )
        self.declare_diagonal_partials(
            'installed_thrust', ['aft_fan_thrust', 'rated_to_cruise_thrust']
        )

    def compute(self, inputs, outputs):
        """
        Compute the installed thrust.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['installed_thrust'] = (
            self.options['num_engines'] * inputs['turbofan_rated_thrust']
            + inputs['rated_to_cruise_thrust'] * inputs['aft_fan_thrust']
        )

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
        partials['installed_thrust', 'aft_fan_thrust'] = inputs['rated_to_cruise_thrust']
        partials['installed_thrust', 'rated_to_cruise_thrust'] = inputs['aft_fan_thrust']
