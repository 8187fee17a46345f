"""Define the AftFanMassComp class: mass of the boundary-layer-ingesting aft fan installation."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class AftFanMassComp(PointwiseComponent):
    r"""
    Mass of the aft fan, its nacelle and the extra tail-cone structure that carries them.

    Areal-mass scaling: the fan (blades, casing, drive shaft) scales with its annulus area
    :math:`A = \pi (D_t^2 - d_h^2)/4` (the hub is the fuselage tail cone, which the fan
    wraps), the nacelle with its wetted area, and the extra tail-cone structure is a
    fraction of the two:

    .. math::

        m = (1 + f_s) \left( m''_{fan} A + m''_{nac} S_{wet} \right)

    Conceptual areal-mass scaling (common practice).

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
            'fan_face_area', 2.0 * np.ones(n), units='m**2', desc='Fan-face annulus area.'
        )
        self.add_input(
            'fan_areal_mass',
            150.0 * np.ones(n),
            units='kg/m**2',
            desc='Fan, casing and drive shaft mass per fan-face annulus area.',
        )
        self.add_input(
            'nacelle_wetted_area',
            15.0 * np.ones(n),
            units='m**2',
            desc='Wetted area of the aft-fan nacelle.',
        )
        self.add_input(
            'nacelle_areal_mass',
            15.0 * np.ones(n),
            units='kg/m**2',
            desc='Nacelle mass per wetted area.',
        )
        self.add_input(
            'structure_fraction',
            0.2 * np.ones(n),
            units=None,
            desc='Extra tail-cone structure mass / (fan + nacelle mass).',
        )
        self.add_output(
            'mass', 800.0 * np.ones(n), units='kg', desc='Mass of the aft fan installation.'
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        self.declare_diagonal_partials(
            'mass',
            [
                'fan_face_area',
                'fan_areal_mass',
                'nacelle_wetted_area',
                'nacelle_areal_mass',
                'structure_fraction',
            ],
        )

    @staticmethod
    def _bare(inputs):
        """
        Return the fan and nacelle mass before the tail-cone structure.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        ndarray
            Bare mass (kg).
        """
        return (
            inputs['fan_areal_mass'] * inputs['fan_face_area']
            + inputs['nacelle_areal_mass'] * inputs['nacelle_wetted_area']
        )

    def compute(self, inputs, outputs):
        """
        Compute the installation mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['mass'] = (1.0 + inputs['structure_fraction']) * self._bare(inputs)

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
        factor = 1.0 + inputs['structure_fraction']
        partials['mass', 'fan_face_area'] = factor * inputs['fan_areal_mass']
        partials['mass', 'fan_areal_mass'] = factor * inputs['fan_face_area']
        partials['mass', 'nacelle_wetted_area'] = factor * inputs['nacelle_areal_mass']
        partials['mass', 'nacelle_areal_mass'] = factor * inputs['nacelle_wetted_area']
        partials['mass', 'structure_fraction'] = self._bare(inputs)
