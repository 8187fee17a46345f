"""Take-off field length from the take-off parameter correlation for jet transports."""

import numpy as np

from voltwake.components.atmosphere import G0
from voltwake.components.base import PointwiseComponent

# Exact unit definitions (international foot and pound-force, NIST SP 811).
_FOOT = 0.3048  # m
_LBF_PER_FT2 = 4.4482216152605 / _FOOT**2  # Pa, = 47.880259 Pa
# Field length per unit take-off parameter: 37.5 ft per lbf/ft**2, expressed in m per Pa.
TOFL_PER_TOP = 37.5 * _FOOT / _LBF_PER_FT2  # = 0.238721 m/Pa


class TakeoffFieldLengthComp(PointwiseComponent):
    r"""
    FAR/CS-25 take-off field length of a jet transport from the take-off parameter.

    .. math::

        \frac{W}{S} = \frac{m g_0}{S}, \qquad \frac{T}{W} = \frac{T}{m g_0}, \qquad
        TOP = \frac{W/S}{\sigma \, C_{L,max,TO} \, (T/W)}, \qquad
        s_{TOFL} = k \, TOP

    The correlation is :math:`s_{TOFL} = 37.5 \, TOP` with :math:`s_{TOFL}` in ft and
    :math:`TOP` in lbf/ft**2 (Roskam, Airplane Design Part I, 1985, sect. 3.4, eqs. 3.7-3.8,
    FAR 25 take-off field length of jet transports; from memory). Raymer, Aircraft Design: A
    Conceptual Approach, ch. 5, plots the same dependence on the take-off parameter (from
    memory). In SI, with 1 ft = 0.3048 m and 1 lbf/ft**2 = 47.880259 Pa (exact definitions),

    .. math::

        k = 37.5 \times \frac{0.3048}{47.880259} = 0.238721 \ \mathrm{m/Pa},

    so :math:`s_{TOFL}` is in m when :math:`TOP` is in N/m**2.

    The lift coefficient in :math:`TOP` is the maximum lift coefficient in the take-off
    configuration itself, as in the correlation above; the constant 37.5 was fitted to that
    definition. (Raymer's variant divides the maximum lift coefficient by 1.21, the lift
    coefficient at lift-off speed 1.1 V_stall; with that definition a smaller constant
    applies, so the two must not be mixed.) :math:`\sigma` is the density ratio of the
    airfield, :math:`T` the total installed static thrust at take-off and :math:`m` the
    take-off mass.

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
        self.add_input('mtow', 67000.0 * ones, units='kg', desc='Take-off mass')
        self.add_input('wing_area', 122.0 * ones, units='m**2', desc='Wing reference area')
        self.add_input(
            'takeoff_thrust',
            170000.0 * ones,
            units='N',
            desc='Total installed sea-level static thrust at take-off',
        )
        self.add_input(
            'max_lift_coefficient_takeoff',
            2.2 * ones,
            units=None,
            desc='Maximum lift coefficient in take-off configuration',
        )
        self.add_input(
            'density_ratio', ones, units=None, desc='Airfield air density / ISA sea-level density'
        )
        self.add_output(
            'takeoff_field_length', 2000.0 * ones, units='m', desc='FAR/CS-25 take-off field length'
        )
        self.add_output(
            'takeoff_parameter',
            8000.0 * ones,
            units='N/m**2',
            desc='Take-off parameter (W/S) / (sigma CLmax_TO T/W)',
        )
        self.add_output(
            'wing_loading', 5400.0 * ones, units='N/m**2', desc='Take-off weight / wing area'
        )
        self.add_output(
            'thrust_to_weight', 0.26 * ones, units=None, desc='Take-off thrust / take-off weight'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['takeoff_field_length', 'takeoff_parameter'],
            [
                'mtow',
                'wing_area',
                'takeoff_thrust',
                'max_lift_coefficient_takeoff',
                'density_ratio',
            ],
        )
        self.declare_diagonal_partials('wing_loading', ['mtow', 'wing_area'])
        self.declare_diagonal_partials('thrust_to_weight', ['mtow', 'takeoff_thrust'])

    def compute(self, inputs, outputs):
        """
        Compute wing loading, thrust-to-weight ratio, take-off parameter and field length.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        weight = inputs['mtow'] * G0
        wing_loading = weight / inputs['wing_area']
        thrust_to_weight = inputs['takeoff_thrust'] / weight
        top = wing_loading / (
            inputs['density_ratio'] * inputs['max_lift_coefficient_takeoff'] * thrust_to_weight
        )
        outputs['wing_loading'] = wing_loading
        outputs['thrust_to_weight'] = thrust_to_weight
        outputs['takeoff_parameter'] = top
        outputs['takeoff_field_length'] = TOFL_PER_TOP * top

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
        mass = inputs['mtow']
        area = inputs['wing_area']
        thrust = inputs['takeoff_thrust']
        cl_max = inputs['max_lift_coefficient_takeoff']
        sigma = inputs['density_ratio']
        weight = mass * G0
        # TOP = W**2 / (S sigma CL T): logarithmic derivatives are 2, -1, -1, -1, -1.
        top = weight**2 / (area * sigma * cl_max * thrust)
        d_top = {
            'mtow': 2.0 * top / mass,
            'wing_area': -top / area,
            'takeoff_thrust': -top / thrust,
            'max_lift_coefficient_takeoff': -top / cl_max,
            'density_ratio': -top / sigma,
        }
        for name, value in d_top.items():
            partials['takeoff_parameter', name] = value
            partials['takeoff_field_length', name] = TOFL_PER_TOP * value

        partials['wing_loading', 'mtow'] = G0 / area
        partials['wing_loading', 'wing_area'] = -weight / area**2
        partials['thrust_to_weight', 'takeoff_thrust'] = 1.0 / weight
        partials['thrust_to_weight', 'mtow'] = -thrust / (weight * mass)
