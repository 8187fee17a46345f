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
