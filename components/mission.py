"""Define the Breguet mission fuel component (trip fuel, reserves and cruise masses)."""

import numpy as np

from voltwake.components.base import PointwiseComponent

G0 = 9.80665  # standard acceleration of gravity, m/s**2 (ISO 80000-3 / CGPM 1901)

_INPUTS = (
    'mtow',
    'range',
    'lift_to_drag',
    'overall_efficiency',
    'fuel_heating_value',
    'takeoff_fraction',
    'climb_fraction',
    'landing_fraction',
    'diversion_range',
    'hold_time',
    'true_airspeed',
    'contingency_fraction',
)

# inputs that the cruise fuel fraction depends on
_CRUISE = ('range', 'lift_to_drag', 'overall_efficiency', 'fuel_heating_value')
# inputs that the landing mass (and so the trip fuel) depends on
_TRIP = ('mtow',) + _CRUISE + ('takeoff_fraction', 'climb_fraction', 'landing_fraction')


class MissionFuelComp(PointwiseComponent):
    r"""
    Trip and reserve fuel from the Breguet range equation and segment mass fractions.

    Cruise at constant speed and lift-to-drag ratio, with the Breguet range equation written
    with the overall efficiency :math:`\eta_o` and the fuel heating value :math:`H`
    (Breguet range equation; e.g. Raymer, Aircraft Design: A Conceptual Approach, ch. 3 and 17,
    and Anderson, Introduction to Flight, ch. 6; from memory):

    .. math::

        f_{cr}(R) = \frac{m_{end}}{m_{start}} = \exp\left(-\frac{R\, g_0}{\eta_o H\, (L/D)}\right)

    This equals the thrust-specific form :math:`R = V/(g\,\mathrm{TSFC})\,(L/D)\ln(m_i/m_f)`
    with :math:`\eta_o = V/(\mathrm{TSFC}\, H)`, so the cruise thrust-specific fuel
    consumption (fuel mass flow per unit thrust) is
    :math:`\mathrm{TSFC}_{cr} = V_{cr}/(\eta_o H)`. Historical mass fractions cover the other
    segments (e.g. Roskam, Airplane Design Part I, Table 2.1; from memory):

    .. math::

        m_1 &= m_{TO} f_{to}, \quad m_2 = m_1 f_{cl}, \quad m_3 = m_2 f_{cr}(R),
        \quad m_{land} = m_3 f_{ld} \\
        m_{trip} &= m_{TO} - m_{land} \\
        m_{res} &= c_{cont}\, m_{trip}
                   + m_{land}\left(1 - f_{cl} f_{cr}(R_{div}) f_{ld} f_{hold}\right) \\
        m_{fuel} &= m_{trip} + m_{res}, \quad m_{toc} = m_2, \quad
        m_{mid} = m_2 \sqrt{f_{cr}(R)}, \quad E_{trip} = m_{trip} H

    The diversion is flown from the landing mass (climb, cruise over the diversion range,
    landing), then a hold of duration :math:`t_h`. The hold uses the Breguet endurance
    equation :math:`\ln(m_i/m_f) = t\, g\, \mathrm{TSFC}/(L/D)` (e.g. Raymer, Aircraft
    Design: A Conceptual Approach, ch. 17, endurance equation; from memory) at the cruise
    TSFC and the cruise lift-to-drag ratio:

    .. math::

        f_{hold} = \exp\left(-\frac{t_h\, g_0\, \mathrm{TSFC}_{cr}}{L/D}\right)
                 = \exp\left(-\frac{t_h\, g_0\, V_{cr}}{\eta_o H\, (L/D)}\right)

    The hold speed does not enter: at a given TSFC and L/D the fuel burnt per unit time does
    not depend on the speed. Taking the cruise TSFC and L/D is a documented simplification on
    the conservative side: a real hold, flown near the minimum-drag speed at low altitude,
    has a higher L/D and a somewhat lower TSFC, so it burns less fuel. The mid-cruise mass is
    the geometric mean of the cruise start and end masses.

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

        def add_in(name, val, units, desc):
            self.add_input(name, np.full(n, val), units=units, desc=desc)

        add_in('mtow', 70000.0, 'kg', 'Maximum take-off mass')
        add_in('range', 5.0e6, 'm', 'Design cruise range')
        add_in('lift_to_drag', 17.0, None, 'Cruise lift-to-drag ratio')
        add_in(
            'overall_efficiency',
            0.35,
            None,
            'Overall propulsive efficiency (thrust power over fuel power)',
        )
        add_in('fuel_heating_value', 43.0e6, 'J/kg', 'Fuel lower heating value')
        # default fractions: transport jet values, Roskam Part I Table 2.1 (from memory)
        add_in('takeoff_fraction', 0.975, None, 'Mass fraction for engine start, taxi and take-off')
        add_in('climb_fraction', 0.98, None, 'Mass fraction for climb')
        add_in('landing_fraction', 0.982, None, 'Mass fraction for descent, landing and taxi')
        add_in('diversion_range', 370400.0, 'm', 'Diversion cruise range')
        add_in('hold_time', 1800.0, 's', 'Reserve hold time')
        add_in('true_airspeed', 230.0, 'm/s', 'Cruise true airspeed (sets the cruise TSFC)')
        add_in('contingency_fraction', 0.05, None, 'Contingency fuel as a fraction of trip fuel')

        self.add_output(
            'cruise_fuel_fraction',
            np.full(n, 0.9),
            units=None,
            desc='Cruise end-to-start mass ratio',
        )
        self.add_output('block_fuel', np.full(n, 10000.0), units='kg', desc='Trip fuel')
        self.add_output('reserve_fuel', np.full(n, 3000.0), units='kg', desc='Reserve fuel')
        self.add_output(
            'total_fuel', np.full(n, 13000.0), units='kg', desc='Trip plus reserve fuel'
        )
        self.add_output(
            'top_of_climb_mass',
            np.full(n, 67000.0),
            units='kg',
            desc='Aircraft mass at the top of climb (start of cruise)',
        )
        self.add_output(
            'mid_cruise_mass', np.full(n, 65000.0), units='kg', desc='Aircraft mass at mid-cruise'
        )
        self.add_output(
            'landing_mass',
            np.full(n, 60000.0),
            units='kg',
            desc='Aircraft mass at landing after the trip',
        )
        self.add_output(
            'block_energy',
            np.full(n, 4.3e11),
            units='J',
            ref=1e11,
            desc='Fuel energy of the trip fuel',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('cruise_fuel_fraction', list(_CRUISE))
        self.declare_diagonal_partials(['block_fuel', 'landing_mass', 'block_energy'], list(_TRIP))
        self.declare_diagonal_partials(
            'mid_cruise_mass', [name for name in _TRIP if name != 'landing_fraction']
        )
        self.declare_diagonal_partials(
            'top_of_climb_mass', ['mtow', 'takeoff_fraction', 'climb_fraction']
        )
        self.declare_diagonal_partials(['reserve_fuel', 'total_fuel'], list(_INPUTS))

    @staticmethod
    def _breguet_constant(inputs):
        """
        Return a = g0 / (eta_o H L/D), the exponent per metre of range.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        ndarray
            The exponent per metre, 1/m.
        """
        return G0 / (
            inputs['overall_efficiency'] * inputs['fuel_heating_value'] * inputs['lift_to_drag']
        )

    def compute(self, inputs, outputs):
        """
        Compute the mission fuel and masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        a = self._breguet_constant(inputs)
        m_to = inputs['mtow']
        f_to = inputs['takeoff_fraction']
        f_cl = inputs['climb_fraction']
        f_ld = inputs['landing_fraction']

        f_cr = np.exp(-a * inputs['range'])
        # diversion cruise times hold: exp(-a (R_div + t_h V_cr))
        f_div_hold = np.exp(
            -a * (inputs['diversion_range'] + inputs['hold_time'] * inputs['true_airspeed'])
        )

        m_land = m_to * f_to * f_cl * f_cr * f_ld
        m_trip = m_to - m_land
        m_res = inputs['contingency_fraction'] * m_trip + m_land * (1.0 - f_cl * f_ld * f_div_hold)

        outputs['cruise_fuel_fraction'] = f_cr
        outputs['block_fuel'] = m_trip
        outputs['reserve_fuel'] = m_res
        outputs['total_fuel'] = m_trip + m_res
        outputs['top_of_climb_mass'] = m_to * f_to * f_cl
        outputs['mid_cruise_mass'] = m_to * f_to * f_cl * np.sqrt(f_cr)
        outputs['landing_mass'] = m_land
        outputs['block_energy'] = m_trip * inputs['fuel_heating_value']

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
        a = self._breguet_constant(inputs)
        m_to = inputs['mtow']
        f_to = inputs['takeoff_fraction']
        f_cl = inputs['climb_fraction']
        f_ld = inputs['landing_fraction']
        eta = inputs['overall_efficiency']
        lhv = inputs['fuel_heating_value']
        l_d = inputs['lift_to_drag']
        r_cr = inputs['range']
        t_h = inputs['hold_time']
        v_cr = inputs['true_airspeed']
        c_cont = inputs['contingency_fraction']
        s_res = inputs['diversion_range'] + t_h * v_cr

        f_cr = np.exp(-a * r_cr)
        e_res = np.exp(-a * s_res)
        q_res = f_cl * f_ld * e_res
        m_land = m_to * f_to * f_cl * f_cr * f_ld
        m_trip = m_to - m_land
        sqrt_cr = np.sqrt(f_cr)
        m_mid = m_to * f_to * f_cl * sqrt_cr

        # derivatives of the Breguet constant a
        da = {
            'overall_efficiency': -a / eta,
            'fuel_heating_value': -a / lhv,
            'lift_to_drag': -a / l_d,
        }

        # d(f_cr)/dx and d(e_res)/dx
        d_fcr = {'range': -a * f_cr}
        d_eres = {
            'diversion_range': -a * e_res,
            'hold_time': -a * v_cr * e_res,
            'true_airspeed': -a * t_h * e_res,
        }
        for name, da_dx in da.items():
            d_fcr[name] = -r_cr * f_cr * da_dx
            d_eres[name] = -s_res * e_res * da_dx

        # d(m_land)/dx
        d_land = {
            'mtow': f_to * f_cl * f_cr * f_ld,
            'takeoff_fraction': m_to * f_cl * f_cr * f_ld,
            'climb_fraction': m_to * f_to * f_cr * f_ld,
            'landing_fraction': m_to * f_to * f_cl * f_cr,
        }
        for name, d in d_fcr.items():
            d_land[name] = m_to * f_to * f_cl * f_ld * d

        # d(q_res)/dx
        d_q = {'climb_fraction': f_ld * e_res, 'landing_fraction': f_cl * e_res}
        for name, d in d_eres.items():
            d_q[name] = f_cl * f_ld * d

        for name in _INPUTS:
            dm_to = 1.0 if name == 'mtow' else 0.0
            dl = d_land.get(name, 0.0)
            dq = d_q.get(name, 0.0)
            d_trip = dm_to - dl
            d_res = c_cont * d_trip + dl * (1.0 - q_res) - m_land * dq
            if name == 'contingency_fraction':
                d_res = d_res + m_trip
            partials['reserve_fuel', name] = d_res
            partials['total_fuel', name] = d_trip + d_res

        for name in _CRUISE:
            partials['cruise_fuel_fraction', name] = d_fcr[name]

        for name in _TRIP:
            d_trip = (1.0 if name == 'mtow' else 0.0) - d_land[name]
            partials['landing_mass', name] = d_land[name]
            partials['block_fuel', name] = d_trip
            d_energy = lhv * d_trip
            if name == 'fuel_heating_value':
                d_energy = d_energy + m_trip
            partials['block_energy', name] = d_energy

        partials['top_of_climb_mass', 'mtow'] = f_to * f_cl
        partials['top_of_climb_mass', 'takeoff_fraction'] = m_to * f_cl
        partials['top_of_climb_mass', 'climb_fraction'] = m_to * f_to
        partials['mid_cruise_mass', 'mtow'] = f_to * f_cl * sqrt_cr
        partials['mid_cruise_mass', 'takeoff_fraction'] = m_to * f_cl * sqrt_cr
        partials['mid_cruise_mass', 'climb_fraction'] = m_to * f_to * sqrt_cr
        for name in _CRUISE:
            partials['mid_cruise_mass', name] = 0.5 * m_mid / f_cr * d_fcr[name]
