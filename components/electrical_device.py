"""Define the ElectricalDeviceComp class: one electric machine or power converter."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class ElectricalDeviceComp(PointwiseComponent):
    r"""
    One device of the electrical power chain (electric machine or power converter).

    Power flows backwards from the load: the power the device must receive follows from
    the power it delivers and its efficiency. The device is sized for its rated power,
    which is the cruise output times a sizing factor covering the high-power flight phases
    (take-off, climb); its mass follows from a specific power.

    .. math::

        P_{in} = \frac{P_{out}}{\eta}, \qquad
        P_{loss} = P_{in} - P_{out}, \qquad
        P_{rated} = k_{size} P_{out}, \qquad
        m = \frac{P_{rated}}{P_{spec}}

    All relations are common practice for conceptual sizing. The rated power and the
    specific power both refer to the power the device *delivers*: shaft power for a motor,
    electrical power for a generator or converter.

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
            'output_power',
            1.0e6 * np.ones(n),
            units='W',
            desc='Power delivered by the device at cruise.',
        )
        self.add_input(
            'efficiency',
            0.98 * np.ones(n),
            units=None,
            desc='Device efficiency, output power / input power.',
        )
        self.add_input(
            'specific_power',
            10.0e3 * np.ones(n),
            units='W/kg',
            desc='Rated (delivered) power per unit device mass.',
        )
        self.add_input(
            'sizing_factor',
            np.ones(n),
            units=None,
            desc='Rated power / cruise output power (>= 1).',
        )

        self.add_output(
            'input_power',
            1.0e6 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Power the device receives at cruise.',
        )
        self.add_output(
            'loss',
            1.0e4 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Power dissipated as heat at cruise.',
        )
        self.add_output(
            'rated_power',
            1.0e6 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Rated power the device delivers (shaft or electrical).',
        )
        self.add_output('mass', 100.0 * np.ones(n), units='kg', desc='Device mass.')

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        self.declare_diagonal_partials(['input_power', 'loss'], ['output_power', 'efficiency'])
        self.declare_diagonal_partials('rated_power', ['output_power', 'sizing_factor'])
        self.declare_diagonal_partials('mass', ['output_power', 'sizing_factor', 'specific_power'])

    def compute(self, inputs, outputs):
        """
        Compute input power, loss, rated power and mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        p_out = inputs['output_power']
        eta = inputs['efficiency']
        k_size = inputs['sizing_factor']

        outputs['input_power'] = p_out / eta
        outputs['loss'] = p_out / eta - p_out
        outputs['rated_power'] = k_size * p_out
        outputs['mass'] = k_size * p_out / inputs['specific_power']

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
        p_out = inputs['output_power']
        eta = inputs['efficiency']
        k_size = inputs['sizing_factor']
        p_spec = inputs['specific_power']

        partials['input_power', 'output_power'] = 1.0 / eta
        partials['input_power', 'efficiency'] = -p_out / eta**2
        partials['loss', 'output_power'] = 1.0 / eta - 1.0
        partials['loss', 'efficiency'] = -p_out / eta**2
        partials['rated_power', 'output_power'] = k_size
        partials['rated_power', 'sizing_factor'] = p_out
        partials['mass', 'output_power'] = k_size / p_spec
        partials['mass', 'sizing_factor'] = p_out / p_spec
        partials['mass', 'specific_power'] = -k_size * p_out / p_spec**2
