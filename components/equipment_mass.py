"""Define the landing-gear mass and the systems, furnishings and operating-items mass components."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.imperial import LB_TO_KG

#: Gear-group coefficients (A, B, C, D) of W = k_uc (A + B W**0.75 + C W + D W**1.5), W in lb,
#: for jet transports with retractable gear (Torenbeek, Synthesis of Subsonic Airplane Design,
#: ch. 8, weight prediction, undercarriage group; coefficients from memory).
GEAR_COEFFICIENTS_LB = {
    'main': (40.0, 0.16, 0.019, 1.5e-5),
    'nose': (20.0, 0.10, 0.0, 2.0e-6),
}


def _si_coefficients(a, b, c, d):
    """
    Fold the exact pound definition into the gear coefficients.

    With W_lb = m / LB_TO_KG and m_gear = LB_TO_KG W_gear,lb the gear equation becomes
    m_gear = A LB_TO_KG + B LB_TO_KG**0.25 m**0.75 + C m + D LB_TO_KG**-0.5 m**1.5
    (m in kg).

    Parameters
    ----------
    a, b, c, d : float
        Coefficients of the equation in pounds.

    Returns
    -------
    tuple of float
        Coefficients of the equation in kilograms.
    """
    return (a * LB_TO_KG, b * LB_TO_KG**0.25, c, d * LB_TO_KG**-0.5)


#: Gear-group coefficients in kilograms (derived from GEAR_COEFFICIENTS_LB above).
GEAR_COEFFICIENTS = {leg: _si_coefficients(*abcd) for leg, abcd in GEAR_COEFFICIENTS_LB.items()}

#: Wing-position factor k_uc: 1.0 for a low wing, 1.08 for a high wing (longer gear legs)
#: (same source, from memory).
WING_POSITION_FACTOR = {'low': 1.0, 'high': 1.08}

#: Default systems mass fraction of the design mass: transports carry about 0.07-0.10 of
#: MTOW in systems (common practice, from memory); the lower middle of the band is taken.
SYSTEMS_FRACTION = 0.08
#: Default payload mass per passenger including baggage, kg (common practice).
MASS_PER_PASSENGER = 100.0
#: Default furnishings mass per passenger (seats, galleys, lavatories, linings, emergency
#: equipment), kg; about 45-60 kg per seat for single-aisle transports (common practice,
#: from memory).
FURNISHINGS_PER_PASSENGER = 50.0
#: Default operating-items mass per passenger (crew and their bags, catering, potable water,
#: unusable fuel, oil, safety items), kg; about 15-20 kg per passenger (common practice,
#: from memory).
OPERATING_ITEMS_PER_PASSENGER = 15.0


class LandingGearMassComp(PointwiseComponent):
    r"""
    Main and nose landing-gear mass of a jet transport.

    Undercarriage-group formula, one per gear leg group, in pounds (Torenbeek, Synthesis of
    Subsonic Airplane Design, ch. 8, weight prediction; coefficients for jet transports with
    retractable gear, from memory):

    .. math::

        W_g = k_{uc} \left( A + B\, W_{TO}^{0.75} + C\, W_{TO} + D\, W_{TO}^{1.5} \right)

    with :math:`(A, B, C, D) = (40, 0.16, 0.019, 1.5\times 10^{-5})` for the main gear and
    :math:`(20, 0.10, 0, 2.0\times 10^{-6})` for the nose gear; :math:`k_{uc} = 1.0` for a low
    wing and 1.08 for a high wing. The exact pound definition (1 lb = 0.45359237 kg) is
    folded into the coefficients at module level, so that in kilograms

    .. math::

        m_g = k_{uc} \left( A\,\mathrm{lb} + B\,\mathrm{lb}^{0.25} m^{0.75} + C\, m
              + D\,\mathrm{lb}^{-0.5} m^{1.5} \right), \qquad
        m_{gear} = m_{g,main} + m_{g,nose}

    with :math:`\mathrm{lb} = 0.45359237` and :math:`m` the design (take-off) mass in kg.

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
            'wing_position',
            default='low',
            values=tuple(WING_POSITION_FACTOR),
            desc='Wing position; sets the gear factor k_uc (1.0 low wing, 1.08 high wing).',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'design_mass',
            np.full(n, 70000.0),
            units='kg',
            desc='Design (maximum take-off) mass.',
        )
        self.add_output(
            'main_gear_mass', np.full(n, 2300.0), units='kg', ref=1e3, desc='Main gear mass.'
        )
        self.add_output(
            'nose_gear_mass', np.full(n, 400.0), units='kg', ref=1e3, desc='Nose gear mass.'
        )
        self.add_output(
            'landing_gear_mass',
            np.full(n, 2700.0),
            units='kg',
            ref=1e3,
            desc='Main plus nose landing-gear mass.',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['main_gear_mass', 'nose_gear_mass', 'landing_gear_mass'], 'design_mass'
        )

    def _leg(self, leg, mass):
        """
        Return the mass of one gear group and its derivative with respect to the design mass.

        Parameters
        ----------
        leg : str
            'main' or 'nose'.
        mass : ndarray
            Design mass (kg).

        Returns
        -------
        tuple of ndarray
            Gear mass (kg) and d(gear mass)/d(design mass) (-).
        """
        a, b, c, d = GEAR_COEFFICIENTS[leg]
        k = WING_POSITION_FACTOR[self.options['wing_position']]
        root = np.sqrt(mass)
        quarter = mass**0.75
        gear = k * (a + b * quarter + c * mass + d * mass * root)
        dgear = k * (0.75 * b * quarter / mass + c + 1.5 * d * root)
        return gear, dgear

    def compute(self, inputs, outputs):
        """
        Compute the gear masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        mass = inputs['design_mass']
        main, _ = self._leg('main', mass)
        nose, _ = self._leg('nose', mass)
        outputs['main_gear_mass'] = main
        outputs['nose_gear_mass'] = nose
        outputs['landing_gear_mass'] = main + nose

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
        mass = inputs['design_mass']
        _, dmain = self._leg('main', mass)
        _, dnose = self._leg('nose', mass)
        partials['main_gear_mass', 'design_mass'] = dmain
        partials['nose_gear_mass', 'design_mass'] = dnose
        partials['landing_gear_mass', 'design_mass'] = dmain + dnose


class SystemsMassComp(PointwiseComponent):
    r"""
    Systems, furnishings and operating-items masses of a transport aircraft.

    The systems (flight controls, hydraulics, electrical, avionics and instruments, APU, air
    conditioning and pressurisation, anti-ice) are a fraction :math:`f_{sys}` of the design
    mass; furnishings and operating items scale with the passenger count, taken as the payload
    over the payload mass per passenger (bags included):

    .. math::

        m_{sys} = f_{sys}\, m, \qquad
        n_{pax} = \frac{m_{pay}}{m_{pax}}, \qquad
        m_{furn} = m'_{furn}\, n_{pax}, \qquad
        m_{op} = m'_{op}\, n_{pax}

    All three are common-practice conceptual estimates. Defaults: :math:`f_{sys} = 0.08`
    (transports carry about 0.07-0.10 of MTOW in systems; common practice, from memory),
    :math:`m_{pax} = 100` kg with baggage (common practice), :math:`m'_{furn} = 50` kg
    (about 45-60 kg per seat for single-aisle transports; common practice, from memory) and
    :math:`m'_{op} = 15` kg (crew, catering, water, unusable fuel and oil, safety items; about
    15-20 kg per passenger; common practice, from memory). The systems here are the
    airframe's own; the electrical propulsion chain and its cooling are counted elsewhere.
    Operating items belong to the operating empty mass, not to the manufacturer's empty mass.
    The passenger count is continuous (not rounded) so that the masses are differentiable.

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
            'design_mass',
            np.full(n, 70000.0),
            units='kg',
            desc='Design (maximum take-off) mass.',
        )
        self.add_input(
            'payload', np.full(n, 12000.0), units='kg', desc='Design payload (passengers + bags).'
        )
        self.add_input(
            'systems_fraction',
            np.full(n, SYSTEMS_FRACTION),
            units=None,
            desc='Systems mass over design mass.',
        )
        self.add_input(
            'mass_per_passenger',
            np.full(n, MASS_PER_PASSENGER),
            units='kg',
            desc='Payload mass per passenger, baggage included.',
        )
        self.add_input(
            'furnishings_per_passenger',
            np.full(n, FURNISHINGS_PER_PASSENGER),
            units='kg',
            desc='Furnishings mass per passenger.',
        )
        self.add_input(
            'operating_items_per_passenger',
            np.full(n, OPERATING_ITEMS_PER_PASSENGER),
            units='kg',
            desc='Operating-items mass per passenger.',
        )
        self.add_output(
            'systems_mass', np.full(n, 5600.0), units='kg', ref=1e3, desc='Systems mass.'
        )
        self.add_output(
            'furnishings_mass', np.full(n, 6000.0), units='kg', ref=1e3, desc='Furnishings mass.'
        )
        self.add_output(
            'operating_items_mass',
            np.full(n, 1800.0),
            units='kg',
            ref=1e3,
            desc='Operating-items mass.',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('systems_mass', ['design_mass', 'systems_fraction'])
        self.declare_diagonal_partials(
            'furnishings_mass', ['payload', 'mass_per_passenger', 'furnishings_per_passenger']
        )
        self.declare_diagonal_partials(
            'operating_items_mass',
            ['payload', 'mass_per_passenger', 'operating_items_per_passenger'],
        )

    def compute(self, inputs, outputs):
        """
        Compute the masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        passengers = inputs['payload'] / inputs['mass_per_passenger']
        outputs['systems_mass'] = inputs['systems_fraction'] * inputs['design_mass']
        outputs['furnishings_mass'] = inputs['furnishings_per_passenger'] * passengers
        outputs['operating_items_mass'] = inputs['operating_items_per_passenger'] * passengers

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
        per_pax = inputs['mass_per_passenger']
        passengers = inputs['payload'] / per_pax
        partials['systems_mass', 'design_mass'] = inputs['systems_fraction']
        partials['systems_mass', 'systems_fraction'] = inputs['design_mass']
        for output, unit_mass in [
            ('furnishings_mass', inputs['furnishings_per_passenger']),
            ('operating_items_mass', inputs['operating_items_per_passenger']),
        ]:
            partials[output, 'payload'] = unit_mass / per_pax
            partials[output, 'mass_per_passenger'] = -unit_mass * passengers / per_pax
        partials['furnishings_mass', 'furnishings_per_passenger'] = passengers
        partials['operating_items_mass', 'operating_items_per_passenger'] = passengers
