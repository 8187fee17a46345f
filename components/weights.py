"""Define the airframe mass regression and the aircraft mass build-up components."""

import numpy as np

from voltwake.components.base import PointwiseComponent


class AirframeMassComp(PointwiseComponent):
    r"""
    Airframe empty mass from a power-law regression in the maximum take-off mass.

    The airframe mass covers structure, systems and furnishings; the propulsion system is
    not included and is added separately (see `MassBuildUpComp`).

    .. math::

        m_{af} = c \, \left(\frac{m_{TO}}{1\,\mathrm{kg}}\right)^{k} \; 1\,\mathrm{kg}

    This is the statistical empty-mass-fraction regression used in conceptual design,
    :math:`m_e / m_{TO} = A \, m_{TO}^{C}`, written for the mass itself (:math:`k = 1 + C`)
    (Raymer, Aircraft Design: A Conceptual Approach, ch. 3; from memory). The constants
    :math:`c` and :math:`k` are fitted to airframe-only data and come from the configuration.

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
        self.add_input('mtow', np.full(n, 70000.0), units='kg', desc='Maximum take-off mass')
        self.add_input(
            'airframe_mass_coefficient',
            np.full(n, 0.5),
            units=None,
            desc='Regression coefficient c (multiplies the mass in kg)',
        )
        self.add_input(
            'airframe_mass_exponent', np.full(n, 1.0), units=None, desc='Regression exponent k'
        )
        self.add_output(
            'airframe_mass',
            np.full(n, 35000.0),
            units='kg',
            desc='Airframe empty mass, propulsion excluded',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'airframe_mass', ['mtow', 'airframe_mass_coefficient', 'airframe_mass_exponent']
        )

    def compute(self, inputs, outputs):
        """
        Compute the airframe mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        m_to = inputs['mtow']
        outputs['airframe_mass'] = (
            inputs['airframe_mass_coefficient'] * m_to ** inputs['airframe_mass_exponent']
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
        m_to = inputs['mtow']
        c = inputs['airframe_mass_coefficient']
        k = inputs['airframe_mass_exponent']
        power = m_to**k
        partials['airframe_mass', 'mtow'] = c * k * m_to ** (k - 1.0)
        partials['airframe_mass', 'airframe_mass_coefficient'] = power
        partials['airframe_mass', 'airframe_mass_exponent'] = c * power * np.log(m_to)


class MassBuildUpComp(PointwiseComponent):
    r"""
    Sum the component masses into the operating empty mass and the take-off mass.

    .. math::

        m_{prop} &= \sum_i m_i \\
        m_{OE} &= m_{af} + m_{prop} \\
        m_{TO} &= m_{OE} + m_{pay} + m_{fuel}

    where :math:`m_i` are the masses of the propulsion items named in the option
    ``propulsion_items`` (common practice mass build-up).

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
            'propulsion_items',
            types=(list, tuple),
            default=['engines'],
            desc='Names of the propulsion mass items; each adds an input '
            '"<item>_mass" (kg) summed into "propulsion_mass".',
        )

    def _item_inputs(self):
        """
        Return the input names of the propulsion items, checked for clashes.

        Returns
        -------
        list of str
            The input names ``<item>_mass``.
        """
        names = [f'{item}_mass' for item in self.options['propulsion_items']]
        clashes = set(names) & {'airframe_mass', 'propulsion_mass'}
        if clashes or len(set(names)) != len(names):
            raise ValueError(
                f'{self.msginfo}: propulsion_items must be unique and must not '
                f'clash with the other variables; got '
                f'{list(self.options["propulsion_items"])}.'
            )
        return names

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'airframe_mass',
            np.full(n, 35000.0),
            units='kg',
            desc='Airframe empty mass, propulsion excluded',
        )
        for name in self._item_inputs():
            self.add_input(name, np.full(n, 5000.0), units='kg', desc='Mass of a propulsion item')
        self.add_input('payload', np.full(n, 15000.0), units='kg', desc='Payload mass')
        self.add_input(
            'total_fuel',
            np.full(n, 15000.0),
            units='kg',
            desc='Total fuel mass (trip plus reserves)',
        )
        self.add_output(
            'propulsion_mass',
            np.full(n, 5000.0),
            units='kg',
            desc='Sum of the propulsion item masses',
        )
        self.add_output('oew', np.full(n, 40000.0), units='kg', desc='Operating empty mass')
        self.add_output('mtow', np.full(n, 70000.0), units='kg', desc='Maximum take-off mass')

    def setup_partials(self):
        """
        Declare the diagonal partials (constant, set in compute_partials).
        """
        items = self._item_inputs()
        if items:
            self.declare_diagonal_partials(['propulsion_mass', 'oew', 'mtow'], items)
        self.declare_diagonal_partials(['oew', 'mtow'], 'airframe_mass')
        self.declare_diagonal_partials('mtow', ['payload', 'total_fuel'])

    def compute(self, inputs, outputs):
        """
        Compute the mass build-up.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        m_prop = np.zeros(self.options['vec_size'], dtype=inputs['airframe_mass'].dtype)
        for name in self._item_inputs():
            m_prop = m_prop + inputs[name]
        outputs['propulsion_mass'] = m_prop
        outputs['oew'] = inputs['airframe_mass'] + m_prop
        outputs['mtow'] = outputs['oew'] + inputs['payload'] + inputs['total_fuel']

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (all unity).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        for name in self._item_inputs():
            for out in ('propulsion_mass', 'oew', 'mtow'):
                partials[out, name] = 1.0
        for out in ('oew', 'mtow'):
            partials[out, 'airframe_mass'] = 1.0
        partials['mtow', 'payload'] = 1.0
        partials['mtow', 'total_fuel'] = 1.0


class MassSumComp(PointwiseComponent):
    r"""
    A mass as the sum of item masses (component mass build-up).

    .. math::

        m = \sum_i m_i

    where :math:`m_i` are the masses named in the option ``items``, and the output is named
    by the option ``total`` (e.g. the airframe mass from wing, fuselage, tails, landing gear
    and systems; common practice mass build-up, e.g. Raymer, Aircraft Design: A Conceptual
    Approach, weights chapter; from memory).

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
            'items',
            types=(list, tuple),
            default=['wing', 'fuselage'],
            desc='Names of the items; each adds an input "<item>_mass" (kg).',
        )
        self.options.declare(
            'total', types=str, default='airframe_mass', desc='Name of the output (kg).'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        for item in self.options['items']:
            self.add_input(f'{item}_mass', np.full(n, 5000.0), units='kg', desc=f'{item} mass')
        self.add_output(
            self.options['total'], np.full(n, 35000.0), units='kg', desc='Sum of the items'
        )

    def setup_partials(self):
        """
        Declare the constant diagonal partials.
        """
        idx = np.arange(self.options['vec_size'])
        for item in self.options['items']:
            self.declare_partials(
                self.options['total'], f'{item}_mass', rows=idx, cols=idx, val=1.0
            )

    def compute(self, inputs, outputs):
        """
        Sum the item masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        total = 0.0
        for item in self.options['items']:
            total = total + inputs[f'{item}_mass']
        outputs[self.options['total']] = total
