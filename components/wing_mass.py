"""Define the WingMassComp class: statistical wing mass of a transport aircraft."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.imperial import FT_TO_M, LB_TO_KG

#: Exponent of the design weight times the ultimate load factor in the wing-mass equation.
WING_EXP_LOAD = 0.557
#: Exponent of the wing area in the wing-mass equation.
WING_EXP_AREA = 0.649
#: Exponent of the aspect ratio in the wing-mass equation.
WING_EXP_ASPECT = 0.5
#: Exponent of the thickness-to-chord ratio in the wing-mass equation.
WING_EXP_THICKNESS = -0.4
#: Exponent of (1 + taper ratio) in the wing-mass equation.
WING_EXP_TAPER = 0.1
#: Exponent of the control-surface area in the wing-mass equation.
WING_EXP_CONTROL = 0.1

#: Leading coefficient of the wing-mass equation in its printed (lb, ft**2) form.
WING_COEFF_IMPERIAL = 0.0051

#: Leading coefficient of the wing-mass equation for SI inputs (kg, m**2) and a result in kg.
#: Derivation: the printed form is W_lb = 0.0051 (W_dg,lb N_z)^0.557 S_ft2^0.649 ... S_csw,ft2^0.1
#: with W_dg,lb = m / LB_TO_KG, S_ft2 = S / FT_TO_M**2, S_csw,ft2 = f_cs S / FT_TO_M**2 and
#: m_w = LB_TO_KG W_lb. Collecting the conversion factors,
#: m_w = 0.0051 LB_TO_KG^(1 - 0.557) FT_TO_M^(-2 (0.649 + 0.1)) (m N_z)^0.557 S^0.649 ...
#: (S f_cs)^0.1, i.e. the coefficient below (2.1302e-2 for kg and m**2).
WING_COEFF_SI = (
    WING_COEFF_IMPERIAL
    * LB_TO_KG ** (1.0 - WING_EXP_LOAD)
    * FT_TO_M ** (-2.0 * (WING_EXP_AREA + WING_EXP_CONTROL))
)


class WingMassComp(PointwiseComponent):
    r"""
    Wing mass of a transport aircraft from the statistical cargo/transport wing equation.

    Raymer's cargo/transport wing-weight equation (Raymer, Aircraft Design: A Conceptual
    Approach, 6th ed., ch. 15, weights of cargo/transport aircraft, eq. 15.25; equation
    number from memory), in pounds and feet:

    .. math::

        W_w = 0.0051\,(W_{dg} N_z)^{0.557}\, S_w^{0.649}\, A^{0.5}\,
              (t/c)^{-0.4}\, (1+\lambda)^{0.1}\, (\cos\Lambda)^{-1}\, S_{csw}^{0.1}

    with :math:`W_{dg}` the design gross weight (lb), :math:`N_z` the ultimate load factor,
    :math:`S_w` the trapezoidal wing area (ft**2), :math:`A` the aspect ratio, :math:`t/c`
    the root thickness-to-chord ratio, :math:`\lambda` the taper ratio, :math:`\Lambda` the
    quarter-chord sweep and :math:`S_{csw}` the area of the wing-mounted control surfaces
    (ft**2). Here :math:`S_{csw} = f_{cs} S_w` with the control-surface fraction
    :math:`f_{cs}` (default 0.2, common practice for ailerons, spoilers and flaps of a
    transport wing), and the result is multiplied by a technology factor :math:`k_{tech}`
    (default 1, the metallic structure of the statistics; below 1 for composite structure,
    e.g. 0.85-0.90 for an advanced-composite wing, Raymer, 6th ed., ch. 15, table of
    weight fudge factors, from memory).

    Unit conversion: the inputs are SI (kg, m**2). The design weight in pounds is the mass in
    pounds (:math:`W_{dg} = m_{dg}/0.45359237`, standard gravity), the areas in square feet
    are :math:`S/0.3048^2`, and the result is converted back with 0.45359237 kg/lb (both
    factors exact by definition). As the equation is a pure power law, the conversions fold
    into the single coefficient ``WING_COEFF_SI`` (derived beside its definition), so that

    .. math::

        m_w = k_{tech}\, C_{SI}\, (m_{dg} N_z)^{0.557}\, S_w^{0.649 + 0.1}\,
              f_{cs}^{0.1}\, A^{0.5}\, (t/c)^{-0.4}\, (1+\lambda)^{0.1} / \cos\Lambda,
        \qquad C_{SI} = 0.0051 \cdot 0.45359237^{1-0.557} \cdot 0.3048^{-2(0.649+0.1)}

    Ultimate load factor: :math:`N_z = 1.5 \times 2.5 = 3.75`, the factor of safety 1.5
    (CS-25/FAR 25.303) times the limit manoeuvring load factor 2.5 g that CS-25/FAR 25.337
    sets for transports of more than about 50,000 lb (from memory for both clauses).

    All partials are those of a power law, :math:`\partial \ln m_w / \partial \ln x` equal to
    the exponent of :math:`x`; the sweep enters as :math:`\partial m_w/\partial\Lambda = m_w
    \tan\Lambda`. The sweep is an input in rad, so the code is complex-step safe.

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
            np.full(n, 7.0e4),
            units='kg',
            desc='Design gross mass (the mass at which the ultimate load factor applies)',
        )
        self.add_input(
            'ultimate_load_factor',
            np.full(n, 3.75),
            units=None,
            desc='Ultimate load factor N_z (1.5 x limit load factor)',
        )
        self.add_input(
            'wing_area', np.full(n, 122.0), units='m**2', desc='Trapezoidal wing reference area'
        )
        self.add_input('aspect_ratio', np.full(n, 9.5), units=None, desc='Wing aspect ratio')
        self.add_input(
            'sweep',
            np.full(n, np.deg2rad(25.0)),
            units='rad',
            desc='Quarter-chord sweep of the wing',
        )
        self.add_input(
            'thickness_to_chord',
            np.full(n, 0.12),
            units=None,
            desc='Root thickness-to-chord ratio of the wing',
        )
        self.add_input('taper_ratio', np.full(n, 0.25), units=None, desc='Wing taper ratio')
        self.add_input(
            'control_surface_fraction',
            np.full(n, 0.2),
            units=None,
            desc='Wing-mounted control-surface area over wing area, S_csw/S_w',
        )
        self.add_input(
            'technology_factor',
            np.ones(n),
            units=None,
            desc='Multiplier on the statistical mass (1: metallic; below 1: composite)',
        )
        self.add_output('wing_mass', np.full(n, 9.0e3), units='kg', ref=1e4, desc='Wing mass')

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'wing_mass',
            [
                'design_mass',
                'ultimate_load_factor',
                'wing_area',
                'aspect_ratio',
                'sweep',
                'thickness_to_chord',
                'taper_ratio',
                'control_surface_fraction',
                'technology_factor',
            ],
        )

    @staticmethod
    def _statistical_mass(inputs):
        """
        Evaluate the statistical wing mass without the technology factor.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        ndarray
            Wing mass before the technology factor (kg).
        """
        area = inputs['wing_area']
        return (
            WING_COEFF_SI
            * (inputs['design_mass'] * inputs['ultimate_load_factor']) ** WING_EXP_LOAD
            * area**WING_EXP_AREA
            * (inputs['control_surface_fraction'] * area) ** WING_EXP_CONTROL
            * inputs['aspect_ratio'] ** WING_EXP_ASPECT
            * inputs['thickness_to_chord'] ** WING_EXP_THICKNESS
            * (1.0 + inputs['taper_ratio']) ** WING_EXP_TAPER
            / np.cos(inputs['sweep'])
        )

    def compute(self, inputs, outputs):
        """
        Compute the wing mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['wing_mass'] = inputs['technology_factor'] * self._statistical_mass(inputs)

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (power law: d ln m / d ln x is the exponent of x).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        base = self._statistical_mass(inputs)
        mass = inputs['technology_factor'] * base
        wrt = 'wing_mass'
        partials[wrt, 'technology_factor'] = base
        partials[wrt, 'design_mass'] = WING_EXP_LOAD * mass / inputs['design_mass']
        partials[wrt, 'ultimate_load_factor'] = (
            WING_EXP_LOAD * mass / inputs['ultimate_load_factor']
        )
        partials[wrt, 'wing_area'] = (WING_EXP_AREA + WING_EXP_CONTROL) * mass / inputs['wing_area']
        partials[wrt, 'control_surface_fraction'] = (
            WING_EXP_CONTROL * mass / inputs['control_surface_fraction']
        )
        partials[wrt, 'aspect_ratio'] = WING_EXP_ASPECT * mass / inputs['aspect_ratio']
        partials[wrt, 'thickness_to_chord'] = (
            WING_EXP_THICKNESS * mass / inputs['thickness_to_chord']
        )
        partials[wrt, 'taper_ratio'] = WING_EXP_TAPER * mass / (1.0 + inputs['taper_ratio'])
        partials[wrt, 'sweep'] = mass * np.tan(inputs['sweep'])
