"""Stall speed, approach speed and landing field length in landing configuration."""

import numpy as np

from voltwake.components.atmosphere import G0
from voltwake.components.base import PointwiseComponent

# Reference landing speed over the reference stall speed in landing configuration
# (CS 25.125(b)(2) / 14 CFR 25.125(b)(2): V_REF not less than 1.23 V_SR0; from memory).
APPROACH_SPEED_FACTOR = 1.23

# Exact unit definitions (international foot and knot, NIST SP 811).
_FOOT = 0.3048  # m
_KNOT = 1852.0 / 3600.0  # m/s
# Field length per squared approach speed: 0.3 ft per kt**2, expressed in m per (m/s)**2.
LFL_PER_VAPP2 = 0.3 * _FOOT / _KNOT**2  # = 0.345509 s**2/m


class LandingComp(PointwiseComponent):
    r"""
    Stall speed, approach speed and FAR/CS-25 landing field length.

    .. math::

        V_{S} = \sqrt{\frac{2 m g_0}{\rho S C_{L,max,L}}}, \qquad
        V_{app} = 1.23 \, V_{S}, \qquad
        s_{LFL} = k \, V_{app}^2

    :math:`V_S` is the 1-g stall speed in landing configuration from the lift equation
    (common practice) and :math:`V_{app}` the reference landing speed, not less than
    1.23 V_SR0 (CS 25.125(b)(2) / 14 CFR 25.125(b)(2); from memory).

    The landing field length of jet transports is :math:`s_{LFL} = 0.3 \, V_{app}^2` with
    :math:`s_{LFL}` in ft and :math:`V_{app}` in kt (Roskam, Airplane Design Part I, 1985,
    sect. 3.5, eq. 3.16; from memory). Roskam defines the approach speed there as 1.3 times
    the minimum stall speed of the older rules, which is close to 1.23 times the 1-g stall
    speed used here. With 1 ft = 0.3048 m and 1 kt = 1852/3600 m/s (exact definitions),

    .. math::

        k = 0.3 \times \frac{0.3048}{(1852/3600)^2} = 0.345509 \ \mathrm{s^2/m},

    so :math:`s_{LFL}` is in m when :math:`V_{app}` is in m/s.

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
        self.add_input('landing_mass', 60000.0 * ones, units='kg', desc='Landing mass')
        self.add_input('wing_area', 122.0 * ones, units='m**2', desc='Wing reference area')
        self.add_input(
            'max_lift_coefficient_landing',
            2.7 * ones,
            units=None,
            desc='Maximum lift coefficient in landing configuration',
        )
        self.add_input('density', 1.225 * ones, units='kg/m**3', desc='Airfield air density')
        self.add_output(
            'stall_speed', 55.0 * ones, units='m/s', desc='1-g stall speed in landing configuration'
        )
        self.add_output(
            'approach_speed',
            68.0 * ones,
            units='m/s',
            desc='Reference landing (approach) speed, 1.23 V_stall',
        )
        self.add_output(
            'landing_field_length', 1600.0 * ones, units='m', desc='FAR/CS-25 landing field length'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['stall_speed', 'approach_speed', 'landing_field_length'],
            ['landing_mass', 'wing_area', 'max_lift_coefficient_landing', 'density'],
        )

    def compute(self, inputs, outputs):
        """
        Compute stall speed, approach speed and landing field length.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        stall_speed_sq = (
            2.0
            * inputs['landing_mass']
            * G0
            / (inputs['density'] * inputs['wing_area'] * inputs['max_lift_coefficient_landing'])
        )
        approach_speed = APPROACH_SPEED_FACTOR * np.sqrt(stall_speed_sq)
        outputs['stall_speed'] = np.sqrt(stall_speed_sq)
        outputs['approach_speed'] = approach_speed
        outputs['landing_field_length'] = LFL_PER_VAPP2 * approach_speed**2

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
        mass = inputs['landing_mass']
        area = inputs['wing_area']
        cl_max = inputs['max_lift_coefficient_landing']
        density = inputs['density']
        stall_speed_sq = 2.0 * mass * G0 / (density * area * cl_max)
        stall_speed = np.sqrt(stall_speed_sq)
        length = LFL_PER_VAPP2 * APPROACH_SPEED_FACTOR**2 * stall_speed_sq
        # V_S**2 is proportional to m / (rho S CL): logarithmic derivative +1 or -1,
        # so V_S carries half of it and the field length all of it.
        for name, value, sign in (
            ('landing_mass', mass, 1.0),
            ('wing_area', area, -1.0),
            ('max_lift_coefficient_landing', cl_max, -1.0),
            ('density', density, -1.0),
        ):
            partials['stall_speed', name] = 0.5 * sign * stall_speed / value
            partials['approach_speed', name] = (
                0.5 * sign * APPROACH_SPEED_FACTOR * stall_speed / value
            )
            partials['landing_field_length', name] = sign * length / value
