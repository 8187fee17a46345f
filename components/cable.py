"""Define the CableComp class: DC distribution cable with supply and return conductors."""

import numpy as np

from voltwake.components.base import PointwiseComponent

# Inputs that set the cable's relative loss k = 2 rho_e L J_lim / (k_size V).
_LOSS_INPUTS = ('resistivity', 'length', 'current_density_limit', 'sizing_factor', 'voltage')
# Inputs that, with output_power, set the current, the conductor size and the loss.
_POWER_INPUTS = _LOSS_INPUTS + ('output_power',)
# Inputs that set the insulation wall thickness t_ins = k_d V / E_d.
_WALL_INPUTS = ('voltage', 'dielectric_strength', 'insulation_design_factor')

#: One torr in pascal, exact by definition (1 atm = 101325 Pa = 760 Torr).
TORR = 101325.0 / 760.0
#: One centimetre in metre.
CM = 0.01

#: Paschen constant A of air, 1/(cm Torr) (Raizer, Gas Discharge Physics, Springer 1991,
#: ch. 4, table of the constants A and B, fitted for E/p = 100-800 V/(cm Torr); from memory).
PASCHEN_A_CGS = 15.0
#: Paschen constant B of air, V/(cm Torr) (same source; from memory).
PASCHEN_B_CGS = 365.0
#: Paschen constant A of air in SI: 15 / (0.01 m * 101325/760 Pa) = 11.2509 1/(Pa m).
PASCHEN_A = PASCHEN_A_CGS / (CM * TORR)
#: Paschen constant B of air in SI: 365 V / (0.01 m * 101325/760 Pa) = 273.772 V/(Pa m).
PASCHEN_B = PASCHEN_B_CGS / (CM * TORR)
#: Secondary electron emission coefficient of the cathode (common practice; from memory).
SECONDARY_EMISSION = 0.01

#: ln(ln(1 + 1/gamma)), the constant in the denominator of Paschen's law.
_PASCHEN_C = np.log(np.log(1.0 + 1.0 / SECONDARY_EMISSION))
#: Product p d (Pa m) at the minimum of the Paschen curve: A (p d)_min = e ln(1 + 1/gamma).
PASCHEN_PD_MIN = np.e * np.log(1.0 + 1.0 / SECONDARY_EMISSION) / PASCHEN_A
#: Breakdown voltage (V) at the minimum of the Paschen curve, B (p d)_min (about 305 V).
PASCHEN_V_MIN = PASCHEN_B * PASCHEN_PD_MIN


def paschen_voltage(pd):
    r"""
    Breakdown voltage of an air gap on the right branch of the Paschen curve.

    Below the minimum of the curve, :math:`p d \le (p d)_{min}`, the minimum breakdown
    voltage is returned (a conservative lower bound of the left branch); value and slope are
    continuous there, since the slope of the right branch is zero at the minimum. The branch
    is chosen on the real part, so the function is complex-step safe.

    Parameters
    ----------
    pd : ndarray
        Product of gas pressure and gap width (Pa m); real or complex.

    Returns
    -------
    v_b : ndarray
        Breakdown voltage (V).
    dv_dpd : ndarray
        Derivative of the breakdown voltage with respect to p d (V/(Pa m)).
    """
    right = np.real(pd) > PASCHEN_PD_MIN
    # Evaluate the logarithm only where it is defined; the other points take the minimum.
    pd_right = np.where(right, pd, PASCHEN_PD_MIN)
    denom = np.log(PASCHEN_A * pd_right) - _PASCHEN_C
    v_b = np.where(right, PASCHEN_B * pd_right / denom, PASCHEN_V_MIN)
    dv_dpd = np.where(right, PASCHEN_B * (denom - 1.0) / denom**2, 0.0)
    return v_b, dv_dpd


class CableComp(PointwiseComponent):
    r"""
    DC distribution cable made of a supply and a return conductor of equal size.

    **Conductors.** Each conductor is sized so that it carries the rated current (cruise
    current times a sizing factor) at the allowed current density; the resistive loss follows
    at cruise current from Ohm's law and Joule's law (common practice):

    .. math::

        A = \frac{k_{size} I}{J_{lim}}, \qquad
        R = \frac{2 \rho_e L}{A}, \qquad
        I = \frac{P_{in}}{V}, \qquad
        P_{loss} = I^2 R

    where :math:`V` is the bus voltage at the source end and :math:`L` the one-way length.
    The cruise current density is :math:`J = I / A = J_{lim} / k_{size}`, so

    .. math::

        P_{loss} = 2 \rho_e L J I = P_{in} \frac{2 \rho_e L J_{lim}}{k_{size} V} = k P_{in}

    and, with :math:`P_{in} = P_{out} + P_{loss}`, the closed form

    .. math::

        \eta = 1 - k = 1 - \frac{2 \rho_e L J_{lim}}{k_{size} V}, \qquad
        P_{in} = \frac{P_{out}}{\eta}.

    The relative loss equals the relative voltage drop :math:`I R / V`. The component
    evaluates :math:`\eta` and :math:`P_{in}` from the closed form, then the current, the
    conductor area, the resistance and the loss :math:`I^2 R` explicitly. The model is
    meaningful for :math:`k < 1`.

    **Insulation.** Each conductor is round, of radius :math:`r_c = \sqrt{A/\pi}`, with an
    insulation wall that holds the bus voltage at the dielectric strength :math:`E_d` divided
    by a design factor :math:`k_d` for long-term ageing and transients (common practice):

    .. math::

        t_{ins} = \frac{k_d V}{E_d}, \qquad
        m_{ins} = 2 L \rho_{ins} \pi \left[(r_c + t_{ins})^2 - r_c^2\right]
                = 2 L \rho_{ins} \left(2 \sqrt{\pi A}\, t_{ins} + \pi t_{ins}^2\right).

    The wall is the electrical requirement only; a minimum wall for handling and abrasion is
    not modelled. The default :math:`E_d = 100` kV/mm is the low end of the short-term
    dielectric strength of thin polyimide or fluoropolymer film (from memory; strength falls
    with thickness), the default density 1,420 kg/m**3 that of polyimide (from memory). The
    cable mass counts both conductors with shield and supports, plus the insulation,

    .. math::

        m = 2 L A \rho_m f_m + m_{ins},

    where :math:`f_m` (shield and support mass per conductor mass, plus one) no longer
    includes the insulation.

    **Partial discharge.** An air gap of width :math:`d` at the cable surface or at a
    termination breaks down at Paschen's law (Townsend breakdown of a uniform field gap;
    e.g. Raizer, Gas Discharge Physics, Springer 1991, ch. 4; from memory)

    .. math::

        V_b = \frac{B\, p d}{\ln(A\, p d) - \ln\ln(1 + 1/\gamma)}

    with the air constants :math:`A = 15` /(cm Torr) and :math:`B = 365` V/(cm Torr) (same
    source; from memory) and :math:`\gamma = 0.01` (common practice; from memory). With
    1 Torr = 101325/760 Pa exactly and 1 cm = 0.01 m, 1 cm Torr = 1.333224 Pa m, so
    :math:`A = 11.2509` /(Pa m) and :math:`B = 273.772` V/(Pa m). The gap voltage is taken
    equal to the peak bus voltage :math:`V_{peak} = V` (DC bus; conservative, as the
    insulation in series with a gap takes part of the voltage). With a safety factor
    :math:`k_{pd}`,

    .. math::

        V_{pd} = \frac{V_b}{k_{pd}}, \qquad
        \text{margin} = 1 - \frac{V_{peak}}{V_{pd}} \quad (\ge 0 \text{ is feasible}).

    Validity: the law is used on its right branch, :math:`p d` above the minimum of the curve
    at :math:`A (p d)_{min} = e \ln(1 + 1/\gamma)`, that is
    :math:`(p d)_{min} = 1.115` Pa m (0.836 cm Torr), where
    :math:`V_{b,min} = B (p d)_{min} = 305` V. The constants were fitted for
    :math:`E/p` = 100-800 V/(cm Torr), which on the right branch is :math:`p d` up to about
    16 Pa m (11.8 cm Torr); 1 mm at 35,000 ft (23.8 Pa m) is just above that range and
    1 mm at sea level (101 Pa m) well above it, where the law over-predicts measured
    breakdown of air by about 10 % (from memory), which the safety factor covers. Near the
    minimum the curve is flat and the law's denominator tends to zero to the left of it (at
    :math:`A p d = \ln(1+1/\gamma)`), so for :math:`p d \le (p d)_{min}` the component
    returns :math:`V_{b,min}`, a conservative lower bound of the left branch; value and
    slope are continuous there. A gap smaller than the design gap (a void) can reach the
    minimum: at 35,000 ft a gap of about 47 micrometres breaks down at 305 V.

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
            'output_power',
            1.0e6 * np.ones(n),
            units='W',
            desc='Power delivered at the load end of the cable at cruise.',
        )
        self.add_input(
            'voltage', 1000.0 * np.ones(n), units='V', desc='Bus voltage at the source end.'
        )
        self.add_input('length', 20.0 * np.ones(n), units='m', desc='One-way cable length.')
        self.add_input(
            'current_density_limit',
            5.0e6 * np.ones(n),
            units='A/m**2',
            desc='Allowed conductor current density at rated current.',
        )
        self.add_input(
            'sizing_factor', np.ones(n), units=None, desc='Rated current / cruise current (>= 1).'
        )
        self.add_input(
            'resistivity',
            1.7e-8 * np.ones(n),
            units='ohm*m',
            desc='Electrical resistivity of the conductor material.',
        )
        self.add_input(
            'conductor_density',
            9000.0 * np.ones(n),
            units='kg/m**3',
            desc='Density of the conductor material.',
        )
        self.add_input(
            'mass_factor',
            1.6 * np.ones(n),
            units=None,
            desc='(Conductor + shield + support mass) / conductor mass; insulation excluded.',
        )
        self.add_input(
            'dielectric_strength',
            1.0e8 * np.ones(n),
            units='V/m',
            desc='Short-term dielectric strength of the insulation material.',
        )
        self.add_input(
            'insulation_design_factor',
            10.0 * np.ones(n),
            units=None,
            desc='Dielectric strength / design field in the insulation wall (ageing, transients).',
        )
        self.add_input(
            'insulation_density',
            1420.0 * np.ones(n),
            units='kg/m**3',
            desc='Density of the insulation material.',
        )
        self.add_input(
            'ambient_pressure',
            23842.0 * np.ones(n),
            units='Pa',
            desc='Static pressure of the air around the cable (cruise).',
        )
        self.add_input(
            'discharge_gap',
            1.0e-3 * np.ones(n),
            units='m',
            desc='Characteristic air gap at the cable surface and terminations.',
        )
        self.add_input(
            'discharge_safety_factor',
            1.5 * np.ones(n),
            units=None,
            desc='Paschen breakdown voltage / allowed peak voltage.',
        )

        self.add_output(
            'input_power',
            1.0e6 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Power fed into the cable at the source end at cruise.',
        )
        self.add_output(
            'loss',
            1.0e3 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Resistive loss of both conductors at cruise.',
        )
        self.add_output('efficiency', np.ones(n), units=None, desc='Output power / input power.')
        self.add_output('current', 1.0e3 * np.ones(n), units='A', desc='Cruise current.')
        self.add_output(
            'rated_current',
            1.0e3 * np.ones(n),
            units='A',
            desc='Rated current the conductors are sized for.',
        )
        self.add_output(
            'cross_section_area',
            2.0e-4 * np.ones(n),
            units='m**2',
            desc='Cross-section area of one conductor.',
        )
        self.add_output(
            'resistance',
            1.0e-3 * np.ones(n),
            units='ohm',
            desc='Loop resistance (supply plus return conductor).',
        )
        self.add_output(
            'current_density',
            5.0e6 * np.ones(n),
            units='A/m**2',
            desc='Conductor current density at cruise.',
        )
        self.add_output(
            'mass',
            50.0 * np.ones(n),
            units='kg',
            desc='Cable mass: both conductors with shield, support and insulation.',
        )
        self.add_output(
            'voltage_drop',
            1.0 * np.ones(n),
            units='V',
            desc='Voltage drop over the loop at cruise.',
        )
        self.add_output(
            'insulation_thickness',
            1.0e-4 * np.ones(n),
            units='m',
            desc='Insulation wall thickness of each conductor.',
        )
        self.add_output(
            'insulation_mass',
            1.0 * np.ones(n),
            units='kg',
            desc='Insulation mass of both conductors.',
        )
        self.add_output(
            'discharge_voltage',
            1.0e3 * np.ones(n),
            units='V',
            ref=1e3,
            desc='Allowed peak voltage: Paschen breakdown voltage of the gap / safety factor.',
        )
        self.add_output(
            'voltage_margin',
            np.zeros(n),
            units=None,
            desc='1 - peak bus voltage / allowed peak voltage (>= 0 is feasible).',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        self.declare_diagonal_partials('efficiency', _LOSS_INPUTS)
        self.declare_diagonal_partials('voltage_drop', _LOSS_INPUTS)
        self.declare_diagonal_partials(
            ['input_power', 'loss', 'current', 'rated_current', 'cross_section_area', 'resistance'],
            _POWER_INPUTS,
        )
        self.declare_diagonal_partials(
            'current_density', ['current_density_limit', 'sizing_factor']
        )
        self.declare_diagonal_partials('insulation_thickness', _WALL_INPUTS)
        ins_inputs = _POWER_INPUTS + _WALL_INPUTS[1:] + ('insulation_density',)
        self.declare_diagonal_partials('insulation_mass', ins_inputs)
        self.declare_diagonal_partials('mass', ins_inputs + ('conductor_density', 'mass_factor'))
        discharge_inputs = ['ambient_pressure', 'discharge_gap', 'discharge_safety_factor']
        self.declare_diagonal_partials('discharge_voltage', discharge_inputs)
        self.declare_diagonal_partials('voltage_margin', discharge_inputs + ['voltage'])

    def compute(self, inputs, outputs):
        """
        Compute cable power, current, conductor size, loss, insulation, mass and discharge limit.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        p_out = inputs['output_power']
        volt = inputs['voltage']
        length = inputs['length']
        j_lim = inputs['current_density_limit']
        k_size = inputs['sizing_factor']
        rho_e = inputs['resistivity']
        rho_ins = inputs['insulation_density']

        eta = 1.0 - 2.0 * rho_e * length * j_lim / (k_size * volt)
        p_in = p_out / eta
        current = p_in / volt
        rated_current = k_size * current
        area = rated_current / j_lim
        resistance = 2.0 * rho_e * length / area

        t_ins = inputs['insulation_design_factor'] * volt / inputs['dielectric_strength']
        m_ins = 2.0 * length * rho_ins * (2.0 * np.sqrt(np.pi * area) * t_ins + np.pi * t_ins**2)
        m_cond = 2.0 * length * area * inputs['conductor_density'] * inputs['mass_factor']

        v_b, _ = paschen_voltage(inputs['ambient_pressure'] * inputs['discharge_gap'])
        v_pd = v_b / inputs['discharge_safety_factor']

        outputs['efficiency'] = eta
        outputs['input_power'] = p_in
        outputs['current'] = current
        outputs['rated_current'] = rated_current
        outputs['cross_section_area'] = area
        outputs['resistance'] = resistance
        outputs['loss'] = current**2 * resistance
        outputs['current_density'] = j_lim / k_size
        outputs['voltage_drop'] = current * resistance
        outputs['insulation_thickness'] = t_ins
        outputs['insulation_mass'] = m_ins
        outputs['mass'] = m_cond + m_ins
        outputs['discharge_voltage'] = v_pd
        outputs['voltage_margin'] = 1.0 - volt / v_pd

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials by the chain rule through the intermediate quantities.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        p_out = inputs['output_power']
        volt = inputs['voltage']
        length = inputs['length']
        j_lim = inputs['current_density_limit']
        k_size = inputs['sizing_factor']
        rho_e = inputs['resistivity']
        rho_m = inputs['conductor_density']
        f_m = inputs['mass_factor']
        e_d = inputs['dielectric_strength']
        k_d = inputs['insulation_design_factor']
        rho_ins = inputs['insulation_density']
        pres = inputs['ambient_pressure']
        gap = inputs['discharge_gap']
        k_pd = inputs['discharge_safety_factor']

        # Relative loss k and its derivatives.
        k = 2.0 * rho_e * length * j_lim / (k_size * volt)
        d_k = {
            'resistivity': 2.0 * length * j_lim / (k_size * volt),
            'length': 2.0 * rho_e * j_lim / (k_size * volt),
            'current_density_limit': 2.0 * rho_e * length / (k_size * volt),
            'sizing_factor': -k / k_size,
            'voltage': -k / volt,
        }
        eta = 1.0 - k
        p_in = p_out / eta
        current = p_in / volt
        rated_current = k_size * current
        area = rated_current / j_lim
        resistance = 2.0 * rho_e * length / area

        zero = np.zeros_like(p_out)
        d_k['output_power'] = zero

        d_p_in = {x: p_out / eta**2 * d_k[x] for x in _POWER_INPUTS}
        d_p_in['output_power'] = 1.0 / eta

        d_cur = {x: d_p_in[x] / volt for x in _POWER_INPUTS}
        d_cur['voltage'] = d_cur['voltage'] - p_in / volt**2

        d_rated = {x: k_size * d_cur[x] for x in _POWER_INPUTS}
        d_rated['sizing_factor'] = d_rated['sizing_factor'] + current

        d_area = {x: d_rated[x] / j_lim for x in _POWER_INPUTS}
        d_area['current_density_limit'] = d_area['current_density_limit'] - rated_current / j_lim**2

        d_res = {x: -resistance / area * d_area[x] for x in _POWER_INPUTS}
        d_res['resistivity'] = d_res['resistivity'] + 2.0 * length / area
        d_res['length'] = d_res['length'] + 2.0 * rho_e / area

        for x in _LOSS_INPUTS:
            partials['efficiency', x] = -d_k[x]
            partials['voltage_drop', x] = resistance * d_cur[x] + current * d_res[x]

        # Insulation wall t = k_d V / E_d and mass m_ins = 2 L rho_ins (2 sqrt(pi A) t + pi t^2).
        t_ins = k_d * volt / e_d
        d_t = {
            'voltage': k_d / e_d,
            'dielectric_strength': -t_ins / e_d,
            'insulation_design_factor': volt / e_d,
        }
        for x, value in d_t.items():
            partials['insulation_thickness', x] = value
        sqrt_pi_a = np.sqrt(np.pi * area)
        ring = 2.0 * sqrt_pi_a * t_ins + np.pi * t_ins**2
        m_ins = 2.0 * length * rho_ins * ring
        dm_ins_darea = 2.0 * length * rho_ins * t_ins * np.pi / sqrt_pi_a
        dm_ins_dt = 2.0 * length * rho_ins * (2.0 * sqrt_pi_a + 2.0 * np.pi * t_ins)
        d_m_ins = {x: dm_ins_darea * d_area[x] for x in _POWER_INPUTS}
        d_m_ins['length'] = d_m_ins['length'] + 2.0 * rho_ins * ring
        for x, value in d_t.items():
            d_m_ins[x] = d_m_ins.get(x, zero) + dm_ins_dt * value
        d_m_ins['insulation_density'] = m_ins / rho_ins

        for x in _POWER_INPUTS:
            partials['input_power', x] = d_p_in[x]
            partials['current', x] = d_cur[x]
            partials['rated_current', x] = d_rated[x]
            partials['cross_section_area', x] = d_area[x]
            partials['resistance', x] = d_res[x]
            partials['loss', x] = 2.0 * current * resistance * d_cur[x] + current**2 * d_res[x]

        for x, value in d_m_ins.items():
            partials['insulation_mass', x] = value
            d_mass = value
            if x in _POWER_INPUTS:
                d_mass = d_mass + 2.0 * length * rho_m * f_m * d_area[x]
            if x == 'length':
                d_mass = d_mass + 2.0 * area * rho_m * f_m
            partials['mass', x] = d_mass

        partials['mass', 'conductor_density'] = 2.0 * length * area * f_m
        partials['mass', 'mass_factor'] = 2.0 * length * area * rho_m

        partials['current_density', 'current_density_limit'] = 1.0 / k_size
        partials['current_density', 'sizing_factor'] = -j_lim / k_size**2

        # Paschen limit: V_pd = V_b(p d) / k_pd, margin = 1 - V k_pd / V_b.
        v_b, dv_dpd = paschen_voltage(pres * gap)
        partials['discharge_voltage', 'ambient_pressure'] = dv_dpd * gap / k_pd
        partials['discharge_voltage', 'discharge_gap'] = dv_dpd * pres / k_pd
        partials['discharge_voltage', 'discharge_safety_factor'] = -v_b / k_pd**2
        dmargin_dvb = volt * k_pd / v_b**2
        partials['voltage_margin', 'ambient_pressure'] = dmargin_dvb * dv_dpd * gap
        partials['voltage_margin', 'discharge_gap'] = dmargin_dvb * dv_dpd * pres
        partials['voltage_margin', 'discharge_safety_factor'] = -volt / v_b
        partials['voltage_margin', 'voltage'] = -k_pd / v_b
