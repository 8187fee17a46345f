"""Define the PowerSavingComp class: the power saving coefficient of boundary-layer ingestion."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class PowerSavingComp(PointwiseComponent):
    r"""
    Power saving coefficient of a fan that ingests the fuselage boundary layer.

    The fan with ingestion is compared with the same fan (same net thrust, same fan pressure
    ratio) on free-stream inflow:

    .. math::

        PSC = 1 - \frac{P}{P_{ref}}

    Definition of the power saving coefficient from Smith, "Wake ingestion propulsion
    benefit", J. Propulsion and Power, 1993 (from memory).

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
        self.add_input(
            'shaft_power',
            1.8e6 * np.ones(n),
            units='W',
            desc='Shaft power of the fan with boundary-layer ingestion.',
        )
        self.add_input(
            'reference_shaft_power',
            2.0e6 * np.ones(n),
            units='W',
            desc='Shaft power of the same fan, same thrust, on free-stream inflow.',
        )
        self.add_output(
            'power_saving_coefficient',
            0.1 * np.ones(n),
            units=None,
            desc='1 - shaft power / reference shaft power.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        self.declare_diagonal_partials(
            'power_saving_coefficient', ['shaft_power', 'reference_shaft_power']
        )

    def compute(self, inputs, outputs):
        """
        Compute the power saving coefficient.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['power_saving_coefficient'] = (
            1.0 - inputs['shaft_power'] / inputs['reference_shaft_power']
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
        p_ref = inputs['reference_shaft_power']
        partials['power_saving_coefficient', 'shaft_power'] = -1.0 / p_ref
        partials['power_saving_coefficient', 'reference_shaft_power'] = (
            inputs['shaft_power'] / p_ref**2
        )
