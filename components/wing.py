"""Wing area sized to a wing loading, span from planform, and the lift coefficient needed."""

import numpy as np

from voltwake.components.base import PointwiseComponent

#: Standard acceleration of gravity, m/s**2 (ISO 80000-3).
G0 = 9.80665


class WingAreaComp(PointwiseComponent):
    r"""
    Wing reference area sized to carry the take-off mass at a given wing loading.

    .. math::

        S = \frac{m_{TO}}{(m/S)}

    The wing grows with the aircraft ("rubber wing" sizing at fixed wing loading, as in
    constraint-diagram methods, common practice). Inside the sizing loop this fixes the
    cruise lift coefficient at a given altitude, so the mass balance cannot run away through
    a wing that is too small for the weight it ends up carrying.

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
        self.add_input('mtow', np.full(n, 7.0e4), units='kg', desc='Maximum take-off mass')
        self.add_input(
            'design_wing_loading',
            np.full(n, 580.0),
            units='kg/m**2',
            desc='Maximum take-off mass per unit wing reference area',
        )
        self.add_output('wing_area', np.full(n, 120.0), units='m**2', desc='Wing reference area')

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('wing_area', ['mtow', 'design_wing_loading'])

    def compute(self, inputs, outputs):
        """
        Compute the wing area.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['wing_area'] = inputs['mtow'] / inputs['design_wing_loading']

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
        loading = inputs['design_wing_loading']
        partials['wing_area', 'mtow'] = 1.0 / loading
        partials['wing_area', 'design_wing_loading'] = -inputs['mtow'] / loading**2


class WingGeometryComp(PointwiseComponent):
    r"""
    Wing span from reference area and aspect ratio.

    .. math::

        b = \sqrt{A S}

    (definition of aspect ratio A = b**2 / S, common practice).

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
        self.add_input('wing_area', np.full(n, 120.0), units='m**2', desc='Wing reference area')
        self.add_input('aspect_ratio', np.full(n, 9.5), units=None, desc='Wing aspect ratio')
        self.add_output('wingspan', np.full(n, 33.8), units='m', desc='Wing span')

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('wingspan', ['wing_area', 'aspect_ratio'])

    def compute(self, inputs, outputs):
        """
        Compute the span.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['wingspan'] = np.sqrt(inputs['aspect_ratio'] * inputs['wing_area'])

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
        span = np.sqrt(inputs['aspect_ratio'] * inputs['wing_area'])
        partials['wingspan', 'wing_area'] = 0.5 * inputs['aspect_ratio'] / span
        partials['wingspan', 'aspect_ratio'] = 0.5 * inputs['wing_area'] / span


class ExposedWingComp(PointwiseComponent):
    r"""
    Exposed planform of a trapezoidal wing: the reference wing outside the fuselage.

    The reference trapezoid runs to the aircraft centre line; the fuselage of diameter d
    covers its inner part. With the root chord :math:`c_r = 2S / (b(1 + \lambda))` and the
    chord at the fuselage side :math:`c_s = c_r (1 - (1 - \lambda) d / b)`:

    .. math::

        S_{exp} = S - d\, \frac{c_r + c_s}{2}
                = S - d\, c_r \left(1 - (1 - \lambda) \frac{d}{2b}\right), \qquad
        b_{exp} = b - d, \qquad A_{exp} = \frac{b_{exp}^2}{S_{exp}}

    (trapezoidal-wing geometry, common practice). The exposed planform is what the wing's
    wetted area and skin friction are taken on; its mean chord :math:`S_{exp}/b_{exp}` sets the
    wing's Reynolds number.

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
        self.add_input('wing_area', np.full(n, 120.0), units='m**2', desc='Wing reference area')
        self.add_input('wingspan', np.full(n, 34.0), units='m', desc='Wing span')
        self.add_input('taper_ratio', np.full(n, 0.25), units=None, desc='Tip / root chord')
        self.add_input(
            'fuselage_diameter', np.full(n, 3.9), units='m', desc='Maximum fuselage diameter'
        )
        self.add_output(
            'exposed_wing_area',
            np.full(n, 100.0),
            units='m**2',
            desc='Wing planform area outside the fuselage',
        )
        self.add_output(
            'exposed_wing_aspect_ratio',
            np.full(n, 9.0),
            units=None,
            desc='Aspect ratio of the exposed planform (both panels joined)',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['exposed_wing_area', 'exposed_wing_aspect_ratio'],
            ['wing_area', 'wingspan', 'taper_ratio', 'fuselage_diameter'],
        )

    @staticmethod
    def _exposed(inputs):
        """Return the exposed area, its exposed span and the partials of the area."""
        area, span = inputs['wing_area'], inputs['wingspan']
        taper, diameter = inputs['taper_ratio'], inputs['fuselage_diameter']
        root = 2.0 * area / (span * (1.0 + taper))
        side = 1.0 - (1.0 - taper) * diameter / (2.0 * span)
        exposed = area - diameter * root * side
        d_area = {
            'wing_area': 1.0 - diameter * side * root / area,
            'wingspan': diameter * root * (side - (1.0 - taper) * diameter / (2.0 * span)) / span,
            'taper_ratio': diameter * root * (side / (1.0 + taper) - diameter / (2.0 * span)),
            'fuselage_diameter': -root * side + diameter * root * (1.0 - taper) / (2.0 * span),
        }
        return exposed, span - diameter, d_area

    def compute(self, inputs, outputs):
        """
        Compute the exposed planform.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        exposed, exposed_span, _ = self._exposed(inputs)
        outputs['exposed_wing_area'] = exposed
        outputs['exposed_wing_aspect_ratio'] = exposed_span**2 / exposed

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
        exposed, exposed_span, d_area = self._exposed(inputs)
        aspect = exposed_span**2 / exposed
        d_span = {'wingspan': 1.0, 'fuselage_diameter': -1.0}
        for name, value in d_area.items():
            partials['exposed_wing_area', name] = value
            partials['exposed_wing_aspect_ratio', name] = (
                2.0 * exposed_span * d_span.get(name, 0.0) - aspect * value
            ) / exposed


class LiftCoefficientComp(PointwiseComponent):
    r"""
    Lift coefficient for level flight, lift equal to weight.

    .. math::

        C_L = \frac{m g_0}{q S}

    (definition of the lift coefficient, common practice; g0 = 9.80665 m/s**2, the standard
    acceleration of gravity of ISO 80000-3).

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
            'mass',
            np.full(n, 6.0e4),
            units='kg',
            desc='Aircraft mass (its weight is the lift to be generated)',
        )
        self.add_input(
            'dynamic_pressure', np.full(n, 1.0e4), units='Pa', desc='Flight dynamic pressure'
        )
        self.add_input('wing_area', np.full(n, 120.0), units='m**2', desc='Wing reference area')
        self.add_output(
            'lift_coefficient',
            np.full(n, 0.5),
            units=None,
            desc='Lift coefficient on wing reference area',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'lift_coefficient', ['mass', 'dynamic_pressure', 'wing_area']
        )

    def compute(self, inputs, outputs):
        """
        Compute the lift coefficient.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['lift_coefficient'] = (
            G0 * inputs['mass'] / (inputs['dynamic_pressure'] * inputs['wing_area'])
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
        q = inputs['dynamic_pressure']
        area = inputs['wing_area']
        lift_coefficient = G0 * inputs['mass'] / (q * area)
        partials['lift_coefficient', 'mass'] = G0 / (q * area)
        partials['lift_coefficient', 'dynamic_pressure'] = -lift_coefficient / q
        partials['lift_coefficient', 'wing_area'] = -lift_coefficient / area
