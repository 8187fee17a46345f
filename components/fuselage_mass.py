"""Define the FuselageMassComp class: statistical fuselage mass of a transport aircraft."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.imperial import FT_TO_M, LB_TO_KG

#: Cargo-door factor of the fuselage equation: 1.06 for one side cargo door (Raymer, Aircraft
#: Design: A Conceptual Approach, 5th/6th ed., ch. 15, cargo/transport weights; from memory. The
#: other values are 1.0 with no cargo door, 1.12 for two side doors or an aft clamshell door,
#: 1.25 for two side doors and an aft door).
K_DOOR = 1.06
#: Landing-gear factor of the fuselage equation: 1.0 for wing-mounted main gear (1.12 if the
#: main gear is mounted on the fuselage; same source, from memory).
K_LG = 1.0

#: Leading constant of the fuselage equation in SI (0.6459 for kg, m and m**2). The equation
#: in pounds and feet reads
#: W_lb = 0.3280 K_door K_Lg (W_lb N_z)**0.5 L_ft**0.25 S_ft2**0.302 (1 + K_ws)**0.04 (L/D)**0.10,
#: with W_lb = m / LB_TO_KG, L_ft = L / FT_TO_M, S_ft2 = S / FT_TO_M**2 and
#: m_f = LB_TO_KG W_f,lb (K_ws and L/D are dimensionless). Collecting the unit factors,
#: m_f = 0.3280 K_door K_Lg LB_TO_KG**(1 - 0.5) FT_TO_M**(-0.25 - 2 * 0.302) (m N_z)**0.5
#: L**0.25 S**0.302 (1 + K_ws)**0.04 (L/D)**0.10 with m in kg, L in m and S in m**2.
FUSELAGE_COEFFICIENT = 0.3280 * K_DOOR * K_LG * LB_TO_KG**0.5 * FT_TO_M ** (-0.25 - 2.0 * 0.302)

#: Exponents of the fuselage equation (same source).
_E_LOAD = 0.5
_E_LENGTH = 0.25
_E_AREA = 0.302
_E_SWEEP = 0.04
_E_FINENESS = 0.10
#: Factor of the sweep term K_ws = 0.75 (1 + 2 lambda)/(1 + lambda) B_w tan(Lambda) / L.
_K_WS = 0.75


class FuselageMassComp(PointwiseComponent):
    r"""
    Statistical fuselage structure mass of a transport aircraft.

    Cargo/transport fuselage equation, in pounds and feet (Raymer, Aircraft Design: A
    Conceptual Approach, 5th/6th ed., ch. 15, cargo/transport weights, eq. 15.28; equation
    number from memory), times a configurable pressurisation factor :math:`k_p`:

    .. math::

        W_f = k_p \, 0.3280\, K_{door} K_{Lg} (W_{dg} N_z)^{0.5} L^{0.25} S_f^{0.302}
              (1 + K_{ws})^{0.04} (L/D)^{0.10}

    .. math::

        K_{ws} = 0.75 \, \frac{1 + 2\lambda}{1 + \lambda} \, \frac{B_w \tan\Lambda}{L}

    :math:`W_{dg}` is the design gross weight, :math:`N_z` the ultimate load factor,
    :math:`L` the fuselage structural length, :math:`S_f` the fuselage wetted area,
    :math:`D` the fuselage structural depth, :math:`B_w` the wingspan, :math:`\Lambda` the
    quarter-chord sweep and :math:`\lambda` the taper ratio of the wing. The factors are
    fixed to :math:`K_{door} = 1.06` (one side cargo door) and :math:`K_{Lg} = 1.0` (main gear
    on the wing). The exact unit definitions (1 lb = 0.45359237 kg, 1 ft = 0.3048 m) are
    folded into the module constant ``FUSELAGE_COEFFICIENT``, so the component takes and
    returns SI values:

    .. math::

        m_f = k_p\, C\, (m\, N_z)^{0.5} L^{0.25} S_f^{0.302} (1 + K_{ws})^{0.04} (L/D)^{0.10},
        \qquad C = 0.3280\, K_{door} K_{Lg}\, \mathrm{lb}^{0.5}\, \mathrm{ft}^{-0.854}

    with :math:`\mathrm{lb} = 0.45359237` and :math:`\mathrm{ft} = 0.3048`.

    Pressurisation: the equation is a regression over cargo and transport aircraft whose
    fuselages are pressurised, and unlike the general-aviation fuselage equation of the same
    chapter it has no separate pressurisation term (from memory); it is read here as already
    including the pressurisation structure, so :math:`k_p` defaults to 1.0. Torenbeek's
    fuselage method (Synthesis of Subsonic Airplane Design, ch. 8, weight prediction; from
    memory) adds about 8 % for a pressurised cabin to an unpressurised basic fuselage;
    :math:`k_p = 1.08` applies that increment on top, as a sensitivity. :math:`L` is the
    structural length (radome and tail cap excluded); the overall length, if given instead,
    raises the mass slightly (logarithmic slope about 0.34).

    Valid for :math:`\tan\Lambda \ge 0` and positive geometry; :math:`\Lambda` near
    90 degrees is outside the data.

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
            desc='Design gross mass (maximum take-off mass for transports).',
        )
        self.add_input(
            'ultimate_load_factor',
            np.full(n, 3.75),
            units=None,
            desc='Ultimate load factor (1.5 times the limit load factor).',
        )
        self.add_input(
            'fuselage_length',
            np.full(n, 37.0),
            units='m',
            desc='Fuselage structural length.',
        )
        self.add_input(
            'fuselage_wetted_area',
            np.full(n, 390.0),
            units='m**2',
            desc='Fuselage wetted area.',
        )
        self.add_input(
            'fuselage_diameter',
            np.full(n, 3.9),
            units='m',
            desc='Fuselage structural depth (diameter of a circular fuselage).',
        )
        self.add_input('wingspan', np.full(n, 36.0), units='m', desc='Wingspan.')
        self.add_input(
            'sweep',
            np.full(n, np.radians(25.0)),
            units='rad',
            desc='Wing quarter-chord sweep angle.',
        )
        self.add_input('taper_ratio', np.full(n, 0.25), units=None, desc='Wing taper ratio.')
        self.add_input(
            'pressurisation_factor',
            np.ones(n),
            units=None,
            desc='Multiplier on the fuselage mass for pressurisation not covered by the '
            'transport regression (1.0: included in the regression).',
        )
        self.add_output(
            'fuselage_mass',
            np.full(n, 6000.0),
            units='kg',
            ref=1e3,
            desc='Fuselage structure mass.',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'fuselage_mass',
            [
                'design_mass',
                'ultimate_load_factor',
                'fuselage_length',
                'fuselage_wetted_area',
                'fuselage_diameter',
                'wingspan',
                'sweep',
                'taper_ratio',
                'pressurisation_factor',
            ],
        )

    @staticmethod
    def _evaluate(inputs):
        """
        Evaluate the fuselage mass before the pressurisation factor, and the sweep term.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        mass : ndarray
            Fuselage mass with a pressurisation factor of one (kg).
        k_ws : ndarray
            Sweep term K_ws (-).
        """
        length = inputs['fuselage_length']
        taper = inputs['taper_ratio']
        k_ws = (
            _K_WS
            * (1.0 + 2.0 * taper)
            / (1.0 + taper)
            * inputs['wingspan']
            * np.tan(inputs['sweep'])
            / length
        )
        mass = (
            FUSELAGE_COEFFICIENT
            * (inputs['design_mass'] * inputs['ultimate_load_factor']) ** _E_LOAD
            * length**_E_LENGTH
            * inputs['fuselage_wetted_area'] ** _E_AREA
            * (1.0 + k_ws) ** _E_SWEEP
            * (length / inputs['fuselage_diameter']) ** _E_FINENESS
        )
        return mass, k_ws

    def compute(self, inputs, outputs):
        """
        Compute the fuselage mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        mass, _ = self._evaluate(inputs)
        outputs['fuselage_mass'] = inputs['pressurisation_factor'] * mass

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (logarithmic derivatives of the power law).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        base, k_ws = self._evaluate(inputs)
        mass = inputs['pressurisation_factor'] * base
        length = inputs['fuselage_length']
        taper = inputs['taper_ratio']
        sweep = inputs['sweep']
        # d ln(m) / d ln(1 + K_ws) = 0.04; K_ws is proportional to B_w tan(sweep) / L.
        sweep_term = _E_SWEEP * mass / (1.0 + k_ws)
        span_term = (
            _K_WS * (1.0 + 2.0 * taper) / (1.0 + taper) * inputs['wingspan'] / length
        )  # K_ws / tan(sweep)

        partials['fuselage_mass', 'design_mass'] = _E_LOAD * mass / inputs['design_mass']
        partials['fuselage_mass', 'ultimate_load_factor'] = (
            _E_LOAD * mass / inputs['ultimate_load_factor']
        )
        partials['fuselage_mass', 'fuselage_length'] = (
            _E_LENGTH + _E_FINENESS
        ) * mass / length - sweep_term * k_ws / length
        partials['fuselage_mass', 'fuselage_wetted_area'] = (
            _E_AREA * mass / inputs['fuselage_wetted_area']
        )
        partials['fuselage_mass', 'fuselage_diameter'] = (
            -_E_FINENESS * mass / inputs['fuselage_diameter']
        )
        partials['fuselage_mass', 'wingspan'] = sweep_term * k_ws / inputs['wingspan']
        partials['fuselage_mass', 'sweep'] = sweep_term * span_term / np.cos(sweep) ** 2
        # d/d lambda of (1 + 2 lambda)/(1 + lambda) is 1/(1 + lambda)**2.
        partials['fuselage_mass', 'taper_ratio'] = (
            sweep_term * k_ws / ((1.0 + 2.0 * taper) * (1.0 + taper))
        )
        partials['fuselage_mass', 'pressurisation_factor'] = base
