"""Define the FanAnnulusComp class: tip and hub diameters of a fan from its annulus area."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class FanAnnulusComp(PointwiseComponent):
    r"""
    Tip diameter of a fan whose fan-face annulus area is known.

    With the hub set by a hub-to-tip ratio :math:`\nu` (a podded fan, option
    ``hub='ratio'``):

    .. math::

        A = \frac{\pi}{4} D_t^2 (1 - \nu^2) \quad\Rightarrow\quad
        D_t = \sqrt{\frac{4A}{\pi (1 - \nu^2)}}, \quad d_h = \nu D_t

    With the hub set by a diameter :math:`d_h` (a fan wrapped around the fuselage tail
    cone, whose hub is the fuselage at the fan station; option ``hub='diameter'``):

    .. math::

        D_t = \sqrt{d_h^2 + \frac{4A}{\pi}}, \qquad \nu = \frac{d_h}{D_t}

    Geometry of an annulus (common practice).

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
            'hub',
            values=('ratio', 'diameter'),
            default='ratio',
            desc="'ratio': the hub-to-tip ratio is an input; 'diameter': the hub diameter is "
            'an input and the hub-to-tip ratio an output.',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        ones = np.ones(n)
        self.add_input('fan_face_area', 2.0 * ones, units='m**2', desc='Fan-face annulus area')
        if self.options['hub'] == 'ratio':
            self.add_input('hub_to_tip_ratio', 0.3 * ones, units=None, desc='Hub / tip diameter')
            self.add_output('hub_diameter', 0.5 * ones, units='m', desc='Fan hub diameter')
        else:
            self.add_input('hub_diameter', 1.8 * ones, units='m', desc='Fan hub diameter')
            self.add_output('hub_to_tip_ratio', 0.7 * ones, units=None, desc='Hub / tip diameter')
        self.add_output('fan_diameter', 1.7 * ones, units='m', desc='Fan tip diameter')

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        hub_in = 'hub_to_tip_ratio' if self.options['hub'] == 'ratio' else 'hub_diameter'
        hub_out = 'hub_diameter' if self.options['hub'] == 'ratio' else 'hub_to_tip_ratio'
        self.declare_diagonal_partials(['fan_diameter', hub_out], ['fan_face_area', hub_in])

    def compute(self, inputs, outputs):
        """
        Compute the tip diameter and the other hub quantity.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        area = inputs['fan_face_area']
        if self.options['hub'] == 'ratio':
            ratio = inputs['hub_to_tip_ratio']
            tip = np.sqrt(4.0 * area / (np.pi * (1.0 - ratio**2)))
            outputs['hub_diameter'] = ratio * tip
        else:
            hub = inputs['hub_diameter']
            tip = np.sqrt(hub**2 + 4.0 * area / np.pi)
            outputs['hub_to_tip_ratio'] = hub / tip
        outputs['fan_diameter'] = tip

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
        area = inputs['fan_face_area']
        if self.options['hub'] == 'ratio':
            ratio = inputs['hub_to_tip_ratio']
            tip = np.sqrt(4.0 * area / (np.pi * (1.0 - ratio**2)))
            d_tip_da = 0.5 * tip / area
            d_tip_dr = tip * ratio / (1.0 - ratio**2)
            partials['fan_diameter', 'fan_face_area'] = d_tip_da
            partials['fan_diameter', 'hub_to_tip_ratio'] = d_tip_dr
            partials['hub_diameter', 'fan_face_area'] = ratio * d_tip_da
            partials['hub_diameter', 'hub_to_tip_ratio'] = tip + ratio * d_tip_dr
        else:
            hub = inputs['hub_diameter']
            tip = np.sqrt(hub**2 + 4.0 * area / np.pi)
            d_tip_da = 2.0 / (np.pi * tip)
            d_tip_dh = hub / tip
            partials['fan_diameter', 'fan_face_area'] = d_tip_da
            partials['fan_diameter', 'hub_diameter'] = d_tip_dh
            partials['hub_to_tip_ratio', 'fan_face_area'] = -hub / tip**2 * d_tip_da
            partials['hub_to_tip_ratio', 'hub_diameter'] = 1.0 / tip - hub / tip**2 * d_tip_dh
