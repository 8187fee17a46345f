"""Define the tail sizing (volume coefficients) and the statistical tail mass components."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.imperial import FT_TO_M, LB_TO_KG

# Configuration constants of a conventional low-tail transport, fixed in the tail-mass
# equations (Raymer, Aircraft Design: A Conceptual Approach, 6th ed., ch. 15, cargo/transport
# equations; definitions of the constants from memory, values as stated beside each).

#: K_uht: 1.0 for a fixed (trimmable) stabiliser with elevator; 1.143 would be an all-moving
#: (unit) tail (from memory).
K_UHT = 1.0
#: F_w/B_h: fuselage width at the horizontal-tail junction over the horizontal-tail span;
#: about 2.3 m over 11.6 m (30 m**2 at aspect ratio 4.5) for a single-aisle twin, rounded to
#: 0.2 (common practice estimate, from memory).
FUSELAGE_WIDTH_OVER_HT_SPAN = 0.2
#: K_y/L_t: pitching radius of gyration over tail arm, K_y ~ 0.3 L_t (from memory).
K_Y_OVER_TAIL_ARM = 0.3
#: K_z/L_t: yawing radius of gyration over tail arm, K_z ~ L_t (from memory).
K_Z_OVER_TAIL_ARM = 1.0
#: Aspect ratio of the horizontal tail (common practice for jet transports, from memory).
HT_ASPECT_RATIO = 4.5
#: Quarter-chord sweep of the horizontal tail, rad (30 deg; common practice, from memory).
HT_SWEEP = np.deg2rad(30.0)
#: Elevator area over horizontal-tail area, S_e/S_ht (common practice).
ELEVATOR_AREA_FRACTION = 0.25
#: H_t/H_v: height of the horizontal tail above the fuselage over the vertical-tail height;
#: 0 for a conventional low tail, 1 for a T-tail (from memory).
HT_HEIGHT_OVER_VT_HEIGHT = 0.0
#: Aspect ratio of the vertical tail (common practice for jet transports, from memory).
VT_ASPECT_RATIO = 1.6
#: Quarter-chord sweep of the vertical tail, rad (35 deg; common practice, from memory).
VT_SWEEP = np.deg2rad(35.0)
#: Root thickness-to-chord ratio of the vertical tail (common practice). The horizontal-tail
#: equation has no thickness term.
VT_THICKNESS_TO_CHORD = 0.10

# Exponents of the horizontal-tail equation:
# W_ht = 0.0379 K_uht (1 + F_w/B_h)^-0.25 W_dg^0.639 N_z^0.10 S_ht^0.75 L_t^-1 K_y^0.704
#        (cos Lambda_ht)^-1 A_h^0.166 (1 + S_e/S_ht)^0.1
#: Exponent of the design weight in the horizontal-tail equation.
HT_EXP_MASS = 0.639
#: Exponent of the ultimate load factor in the horizontal-tail equation.
HT_EXP_LOAD = 0.10
#: Exponent of the horizontal-tail area.
HT_EXP_AREA = 0.75
#: Exponent of the pitching radius of gyration K_y.
HT_EXP_GYRATION = 0.704
#: Net exponent of the tail arm once K_y = 0.3 L_t is substituted: -1 + 0.704 = -0.296.
HT_EXP_ARM = -1.0 + HT_EXP_GYRATION

# Exponents of the vertical-tail equation:
# W_vt = 0.0026 (1 + H_t/H_v)^0.225 W_dg^0.556 N_z^0.536 L_t^-0.5 S_vt^0.5 K_z^0.875
#        (cos Lambda_vt)^-1 A_v^0.35 (t/c)^-0.5
#: Exponent of the design weight in the vertical-tail equation.
VT_EXP_MASS = 0.556
#: Exponent of the ultimate load factor in the vertical-tail equation.
VT_EXP_LOAD = 0.536
#: Exponent of the vertical-tail area.
VT_EXP_AREA = 0.5
#: Exponent of the yawing radius of gyration K_z.
VT_EXP_GYRATION = 0.875
#: Net exponent of the tail arm once K_z = L_t is substituted: -0.5 + 0.875 = 0.375.
VT_EXP_ARM = -0.5 + VT_EXP_GYRATION

#: Horizontal-tail coefficient of the printed (lb, ft) form with the fixed configuration
#: constants folded in (all factors except W_dg, N_z, S_ht and the net L_t power).
HT_COEFF_IMPERIAL = (
    0.0379
    * K_UHT
    * (1.0 + FUSELAGE_WIDTH_OVER_HT_SPAN) ** -0.25
    * K_Y_OVER_TAIL_ARM**HT_EXP_GYRATION
    / np.cos(HT_SWEEP)
    * HT_ASPECT_RATIO**0.166
    * (1.0 + ELEVATOR_AREA_FRACTION) ** 0.1
)

#: Horizontal-tail coefficient for SI inputs (kg, m**2, m) and a result in kg. Derivation:
#: W_dg,lb = m / LB_TO_KG, S_ft2 = S / FT_TO_M**2, L_ft = L / FT_TO_M, m_ht = LB_TO_KG W_lb, so
#: C_SI = C_imp LB_TO_KG^(1 - 0.639) FT_TO_M^-(2 * 0.75 + (-0.296)).
HT_COEFF_SI = (
    HT_COEFF_IMPERIAL
    * LB_TO_KG ** (1.0 - HT_EXP_MASS)
    * FT_TO_M ** (-(2.0 * HT_EXP_AREA + HT_EXP_ARM))
)

#: Vertical-tail coefficient of the printed (lb, ft) form with the fixed configuration
#: constants folded in (all factors except W_dg, N_z, S_vt and the net L_t power).
VT_COEFF_IMPERIAL = (
    0.0026
    * (1.0 + HT_HEIGHT_OVER_VT_HEIGHT) ** 0.225
    * K_Z_OVER_TAIL_ARM**VT_EXP_GYRATION
    / np.cos(VT_SWEEP)
    * VT_ASPECT_RATIO**0.35
    * VT_THICKNESS_TO_CHORD**-0.5
)

#: Vertical-tail coefficient for SI inputs (kg, m**2, m) and a result in kg. Derivation as for
#: the horizontal tail: C_SI = C_imp LB_TO_KG^(1 - 0.556) FT_TO_M^-(2 * 0.5 + 0.375).
VT_COEFF_SI = (
    VT_COEFF_IMPERIAL
    * LB_TO_KG ** (1.0 - VT_EXP_MASS)
    * FT_TO_M ** (-(2.0 * VT_EXP_AREA + VT_EXP_ARM))
)


class TailSizingComp(PointwiseComponent):
    r"""
    Horizontal and vertical tail areas from the tail volume coefficients.

    The tail volume-coefficient method (Raymer, Aircraft Design: A Conceptual Approach,
    6th ed., ch. 6, initial sizing, tail volume coefficients; from memory):

    .. math::

        S_{HT} = \frac{c_{HT}\, \bar c_w\, S_w}{L_{HT}}, \qquad
        S_{VT} = \frac{c_{VT}\, b_w\, S_w}{L_{VT}}, \qquad
        b_w = \sqrt{A S_w}, \qquad \bar c_w = \frac{S_w}{b_w}, \qquad
        L_{HT} = L_{VT} = L_t = k_t\, l_{fus}

    so that :math:`S_{HT} = c_{HT} S_w^{3/2} A^{-1/2}/L_t` and
    :math:`S_{VT} = c_{VT} S_w^{3/2} A^{1/2}/L_t`. The defaults are the book's values for
    jet transports, :math:`c_{HT} = 1.00` and :math:`c_{VT} = 0.09` (table of tail volume
    coefficients, from memory), and the tail arm fraction :math:`k_t = 0.5`, the rule of
    thumb of about 50-55 % of the fuselage length for engines on the wing (same chapter,
    from memory). The wing chord here is the geometric mean chord :math:`S/b`; the mean
    aerodynamic chord of a tapered wing is longer (by 12 % at taper ratio 0.25), so the
    horizontal tail comes out correspondingly smaller than with the MAC.

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
        self.add_input('wing_area', np.full(n, 122.0), units='m**2', desc='Wing reference area')
        self.add_input('aspect_ratio', np.full(n, 9.5), units=None, desc='Wing aspect ratio')
        self.add_input('fuselage_length', np.full(n, 38.0), units='m', desc='Fuselage length')
        self.add_input(
            'horizontal_tail_volume_coefficient',
            np.full(n, 1.0),
            units=None,
            desc='Horizontal tail volume coefficient c_HT',
        )
        self.add_input(
            'vertical_tail_volume_coefficient',
            np.full(n, 0.09),
            units=None,
            desc='Vertical tail volume coefficient c_VT',
        )
        self.add_input(
            'tail_arm_fraction',
            np.full(n, 0.5),
            units=None,
            desc='Tail moment arm over fuselage length (both tails)',
        )
        self.add_output(
            'horizontal_tail_area', np.full(n, 23.0), units='m**2', desc='Horizontal tail area'
        )
        self.add_output(
            'vertical_tail_area', np.full(n, 20.0), units='m**2', desc='Vertical tail area'
        )
        self.add_output(
            'tail_arm',
            np.full(n, 19.0),
            units='m',
            desc='Moment arm of both tails (wing to tail quarter-chord)',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        common = ['wing_area', 'aspect_ratio', 'fuselage_length', 'tail_arm_fraction']
        self.declare_diagonal_partials(
            'horizontal_tail_area', common + ['horizontal_tail_volume_coefficient']
        )
        self.declare_diagonal_partials(
            'vertical_tail_area', common + ['vertical_tail_volume_coefficient']
        )
        self.declare_diagonal_partials('tail_arm', ['fuselage_length', 'tail_arm_fraction'])

    @staticmethod
    def _geometry(inputs):
        """
        Evaluate the tail arm and the volume-coefficient areas per unit coefficient.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        arm : ndarray
            Tail moment arm (m).
        per_c_ht : ndarray
            Horizontal tail area per unit volume coefficient, mean chord x area / arm (m**2).
        per_c_vt : ndarray
            Vertical tail area per unit volume coefficient, span x area / arm (m**2).
        """
        area = inputs['wing_area']
        span = np.sqrt(inputs['aspect_ratio'] * area)
        chord = area / span
        arm = inputs['tail_arm_fraction'] * inputs['fuselage_length']
        return arm, chord * area / arm, span * area / arm

    def compute(self, inputs, outputs):
        """
        Compute the tail areas and the tail arm.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        arm, per_c_ht, per_c_vt = self._geometry(inputs)
        outputs['tail_arm'] = arm
        outputs['horizontal_tail_area'] = inputs['horizontal_tail_volume_coefficient'] * per_c_ht
        outputs['vertical_tail_area'] = inputs['vertical_tail_volume_coefficient'] * per_c_vt

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (power laws in area, aspect ratio and arm).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        arm, per_c_ht, per_c_vt = self._geometry(inputs)
        s_ht = inputs['horizontal_tail_volume_coefficient'] * per_c_ht
        s_vt = inputs['vertical_tail_volume_coefficient'] * per_c_vt
        area = inputs['wing_area']
        aspect = inputs['aspect_ratio']
        length = inputs['fuselage_length']
        fraction = inputs['tail_arm_fraction']

        partials['tail_arm', 'fuselage_length'] = fraction
        partials['tail_arm', 'tail_arm_fraction'] = length

        partials['horizontal_tail_area', 'horizontal_tail_volume_coefficient'] = per_c_ht
        partials['horizontal_tail_area', 'wing_area'] = 1.5 * s_ht / area
        partials['horizontal_tail_area', 'aspect_ratio'] = -0.5 * s_ht / aspect
        partials['horizontal_tail_area', 'fuselage_length'] = -s_ht / length
        partials['horizontal_tail_area', 'tail_arm_fraction'] = -s_ht / fraction

        partials['vertical_tail_area', 'vertical_tail_volume_coefficient'] = per_c_vt
        partials['vertical_tail_area', 'wing_area'] = 1.5 * s_vt / area
        partials['vertical_tail_area', 'aspect_ratio'] = 0.5 * s_vt / aspect
        partials['vertical_tail_area', 'fuselage_length'] = -s_vt / length
        partials['vertical_tail_area', 'tail_arm_fraction'] = -s_vt / fraction


class TailMassComp(PointwiseComponent):
    r"""
    Horizontal and vertical tail masses from the statistical cargo/transport tail equations.

    Raymer's cargo/transport tail-weight equations (Raymer, Aircraft Design: A Conceptual
    Approach, 6th ed., ch. 15, eqs. 15.26 and 15.27; equation numbers from memory), in pounds
    and feet:

    .. math::

        W_{HT} &= 0.0379\, K_{uht} \left(1 + \frac{F_w}{B_h}\right)^{-0.25} W_{dg}^{0.639}\,
                 N_z^{0.10}\, S_{HT}^{0.75}\, L_t^{-1}\, K_y^{0.704}\,
                 (\cos\Lambda_{HT})^{-1} A_{HT}^{0.166} \left(1 + \frac{S_e}{S_{HT}}\right)^{0.1}
        \\
        W_{VT} &= 0.0026 \left(1 + \frac{H_t}{H_v}\right)^{0.225} W_{dg}^{0.556}\,
                 N_z^{0.536}\, L_t^{-0.5}\, S_{VT}^{0.5}\, K_z^{0.875}\,
                 (\cos\Lambda_{VT})^{-1} A_{VT}^{0.35}\, (t/c)_{VT}^{-0.5}

    with :math:`W_{dg}` the design gross weight (lb), :math:`N_z` the ultimate load factor,
    :math:`S` the tail areas (ft**2) and :math:`L_t` the tail arm (ft). The configuration
    constants are fixed to a conventional low-tail transport (module constants):

    ======================  ===========  ===================================================
    constant                value        note
    ======================  ===========  ===================================================
    :math:`K_{uht}`         1.0          fixed stabiliser with elevator (1.143 all-moving;
                                         from memory)
    :math:`F_w/B_h`         0.2          fuselage width at the tail over tail span (common
                                         practice estimate, from memory)
    :math:`K_y`             0.3 L_t      pitching radius of gyration (from memory)
    :math:`K_z`             L_t          yawing radius of gyration (from memory)
    :math:`A_{HT}`          4.5          common practice, from memory
    :math:`\Lambda_{HT}`    30 deg       quarter-chord sweep; common practice, from memory
    :math:`S_e/S_{HT}`      0.25         elevator area fraction; common practice
    :math:`H_t/H_v`         0            low tail (1 for a T-tail; from memory)
    :math:`A_{VT}`          1.6          common practice, from memory
    :math:`\Lambda_{VT}`    35 deg       quarter-chord sweep; common practice, from memory
    :math:`(t/c)_{VT}`      0.10         root thickness ratio; common practice
    ======================  ===========  ===================================================

    The horizontal-tail equation has no thickness term and the vertical-tail equation no
    rudder-area term, so neither needs the other's constant. With :math:`K_y = 0.3 L_t` and
    :math:`K_z = L_t` the tail arm enters with the net exponents :math:`-1 + 0.704 = -0.296`
    (horizontal) and :math:`-0.5 + 0.875 = 0.375` (vertical). The fixed factors and the exact
    unit conversions (1 lb = 0.45359237 kg, 1 ft = 0.3048 m, weight in lb equal to mass in lb
    at standard gravity) fold into one coefficient per tail (``HT_COEFF_SI``,
    ``VT_COEFF_SI``, derived beside their definitions):

    .. math::

        m_{HT} = C_{HT}\, m_{dg}^{0.639} N_z^{0.10} S_{HT}^{0.75} L_t^{-0.296}, \qquad
        m_{VT} = C_{VT}\, m_{dg}^{0.556} N_z^{0.536} S_{VT}^{0.5} L_t^{0.375}

    The partials are those of a power law, :math:`\partial \ln m / \partial \ln x` equal to
    the exponent of :math:`x`.

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
            'horizontal_tail_area', np.full(n, 23.0), units='m**2', desc='Horizontal tail area'
        )
        self.add_input(
            'vertical_tail_area', np.full(n, 20.0), units='m**2', desc='Vertical tail area'
        )
        self.add_input(
            'tail_arm',
            np.full(n, 19.0),
            units='m',
            desc='Tail moment arm (wing to tail quarter-chord)',
        )
        self.add_output(
            'horizontal_tail_mass', np.full(n, 500.0), units='kg', desc='Horizontal tail mass'
        )
        self.add_output(
            'vertical_tail_mass', np.full(n, 500.0), units='kg', desc='Vertical tail mass'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        common = ['design_mass', 'ultimate_load_factor', 'tail_arm']
        self.declare_diagonal_partials('horizontal_tail_mass', common + ['horizontal_tail_area'])
        self.declare_diagonal_partials('vertical_tail_mass', common + ['vertical_tail_area'])

    @staticmethod
    def _masses(inputs):
        """
        Evaluate both tail masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        m_ht : ndarray
            Horizontal tail mass (kg).
        m_vt : ndarray
            Vertical tail mass (kg).
        """
        mass = inputs['design_mass']
        load = inputs['ultimate_load_factor']
        arm = inputs['tail_arm']
        m_ht = (
            HT_COEFF_SI
            * mass**HT_EXP_MASS
            * load**HT_EXP_LOAD
            * inputs['horizontal_tail_area'] ** HT_EXP_AREA
            * arm**HT_EXP_ARM
        )
        m_vt = (
            VT_COEFF_SI
            * mass**VT_EXP_MASS
            * load**VT_EXP_LOAD
            * inputs['vertical_tail_area'] ** VT_EXP_AREA
            * arm**VT_EXP_ARM
        )
        return m_ht, m_vt

    def compute(self, inputs, outputs):
        """
        Compute the tail masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        outputs['horizontal_tail_mass'], outputs['vertical_tail_mass'] = self._masses(inputs)

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
        m_ht, m_vt = self._masses(inputs)
        mass = inputs['design_mass']
        load = inputs['ultimate_load_factor']
        arm = inputs['tail_arm']

        partials['horizontal_tail_mass', 'design_mass'] = HT_EXP_MASS * m_ht / mass
        partials['horizontal_tail_mass', 'ultimate_load_factor'] = HT_EXP_LOAD * m_ht / load
        partials['horizontal_tail_mass', 'horizontal_tail_area'] = (
            HT_EXP_AREA * m_ht / inputs['horizontal_tail_area']
        )
        partials['horizontal_tail_mass', 'tail_arm'] = HT_EXP_ARM * m_ht / arm

        partials['vertical_tail_mass', 'design_mass'] = VT_EXP_MASS * m_vt / mass
        partials['vertical_tail_mass', 'ultimate_load_factor'] = VT_EXP_LOAD * m_vt / load
        partials['vertical_tail_mass', 'vertical_tail_area'] = (
            VT_EXP_AREA * m_vt / inputs['vertical_tail_area']
        )
        partials['vertical_tail_mass', 'tail_arm'] = VT_EXP_ARM * m_vt / arm
