"""Define the DistortedFanEfficiencyComp class: fan efficiency lost to non-uniform inflow."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class DistortedFanEfficiencyComp(PointwiseComponent):
    r"""
    Isentropic efficiency of a fan that ingests a non-uniform stream.

    .. math::

        \eta_f = \eta_{f,clean} - k_d \, \psi

    :math:`\psi` is the non-uniformity of the ingested stream (mass-weighted variance of the
    axial velocity over its mean square, from
    :class:`voltwake.components.boundary_layer.IngestedFlowComp`) and :math:`k_d` the
    sensitivity of the fan to it. Fans running in distorted inflow lose efficiency, commonly
    one to two points for boundary-layer ingestion (common practice); the linear law and its
    sensitivity are a stated assumption, not a published correlation. With the 1/7 power-law
    layer, any capture inside the layer has :math:`\psi = 1/81`, so :math:`k_d = 1.2` costs
    1.5 points, and the penalty fades as the fan swallows more free stream.

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
            'clean_fan_efficiency',
            0.92 * ones,
            units=None,
            desc='Fan isentropic efficiency on uniform inflow.',
        )
        self.add_input(
            'inflow_nonuniformity',
            0.0 * ones,
            units=None,
            desc='Velocity non-uniformity of the ingested stream (0 is uniform).',
        )
        self.add_input(
            'distortion_sensitivity',
            1.2 * ones,
            units=None,
            desc='Efficiency lost per unit non-uniformity.',
        )
        self.add_output(
            'fan_efficiency', 0.9 * ones, units=None, desc='Fan efficiency in distorted inflow.'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        idx = np.arange(self.options['vec_size'])
        self.declare_partials('fan_efficiency', 'clean_fan_efficiency', rows=idx, cols=idx, val=1.0)
        self.declare_diagonal_partials(
            'fan_efficiency', ['inflow_nonuniformity', 'distortion_sensitivity']
        )

    def compute(self, inputs, outputs):
        """
        Compute the efficiency in distorted inflow.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['fan_efficiency'] = (
            inputs['clean_fan_efficiency']
            - inputs['distortion_sensitivity'] * inputs['inflow_nonuniformity']
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
        partials['fan_efficiency', 'inflow_nonuniformity'] = -inputs['distortion_sensitivity']
        partials['fan_efficiency', 'distortion_sensitivity'] = -inputs['inflow_nonuniformity']
