"""Margins of a quantity against its rating, and of a fan diameter against the fuselage."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class RatingMarginComp(PointwiseComponent):
    r"""
    Relative margin of a value below its rating.

    .. math::

        \text{margin} = 1 - \frac{x}{x_{rated}}

    The constraint is margin >= 0 (common practice for inequality constraints in design
    optimisation, normalised by the limit). Use it, for example, for a cable current density
    against its allowed value or a motor power against its rating.

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
            'units',
            types=(str, type(None)),
            default=None,
            desc='Units of both value and rating (None if dimensionless).',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        units = self.options['units']
        self.add_input('value', 0.5 * np.ones(n), units=units, desc='Quantity to be limited')
        self.add_input('rating', np.ones(n), units=units, desc='Allowed (rated) value')
        self.add_output(
            'margin', 0.5 * np.ones(n), units=None, desc='1 - value / rating (>= 0 is feasible)'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('margin', ['value', 'rating'])

    def compute(self, inputs, outputs):
        """
        Compute the margin.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['margin'] = 1.0 - inputs['value'] / inputs['rating']

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
        rating = inputs['rating']
        partials['margin', 'value'] = -1.0 / rating
        partials['margin', 'rating'] = inputs['value'] / rating**2


class DiameterLimitComp(PointwiseComponent):
    r"""
    Margin of a fan diameter below an allowed fraction of the fuselage diameter.

    .. math::

        \text{margin} = 1 - \frac{D_{fan}}{k \, D_{fus}}

    :math:`k` is the largest allowed ratio of fan diameter to fuselage diameter (a design
    choice, e.g. for ground clearance at rotation). The constraint is margin >= 0.

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
        self.add_input('fan_diameter', 2.0 * ones, units='m', desc='Fan diameter')
        self.add_input(
            'fuselage_diameter', 4.0 * ones, units='m', desc='Fuselage (maximum) diameter'
        )
        self.add_input(
            'max_diameter_ratio',
            ones,
            units=None,
            desc='Largest allowed fan diameter / fuselage diameter',
        )
        self.add_output(
            'diameter_margin',
            0.5 * ones,
            units=None,
            desc='1 - D_fan / (ratio D_fus) (>= 0 is feasible)',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'diameter_margin', ['fan_diameter', 'fuselage_diameter', 'max_diameter_ratio']
        )

    def compute(self, inputs, outputs):
        """
        Compute the diameter margin.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['diameter_margin'] = 1.0 - inputs['fan_diameter'] / (
            inputs['max_diameter_ratio'] * inputs['fuselage_diameter']
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
        ratio = inputs['max_diameter_ratio']
        fuselage = inputs['fuselage_diameter']
        used = inputs['fan_diameter'] / (ratio * fuselage)
        partials['diameter_margin', 'fan_diameter'] = -1.0 / (ratio * fuselage)
        partials['diameter_margin', 'fuselage_diameter'] = used / fuselage
        partials['diameter_margin', 'max_diameter_ratio'] = used / ratio
