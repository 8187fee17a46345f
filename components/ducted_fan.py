"""Define the DuctedFanComp class: one-dimensional compressible model of a single ducted fan."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.gas import CP_AIR, GAMMA, R_AIR

# Exponent (gamma - 1) / gamma of the isentropic pressure-temperature relation.
_K = (GAMMA - 1.0) / GAMMA
# Exponent (gamma + 1) / (2 (gamma - 1)) of the compressible mass-flow function.
_E = (GAMMA + 1.0) / (2.0 * (GAMMA - 1.0))


class DuctedFanComp(PointwiseComponent):
    r"""
    One-dimensional compressible model of one ducted fan with a fully expanded nozzle.

    The same model serves a podded fan in free stream (the fans of the under-wing turbofans)
    and a fan that ingests the fuselage boundary layer; in the latter case the inflow total
    conditions and the ram (momentum-averaged inflow) velocity describe the ingested stream.

    Fan exit total state, with isentropic fan efficiency :math:`\eta_f` and fan pressure ratio
    :math:`\pi_f`:

    .. math::

        T_{t2} = T_{t,in} \left[1 + \frac{\pi_f^{(\gamma-1)/\gamma} - 1}{\eta_f}\right],
        \qquad p_{t2} = \pi_f \, p_{t,in}

    Nozzle fully expanded to the ambient static pressure :math:`p_0`, net thrust, mass flow
    and shaft power:

    .. math::

        V_j = \sqrt{2 c_p T_{t2} \left[1 - (p_0 / p_{t2})^{(\gamma-1)/\gamma}\right]},
        \qquad \dot m = \frac{F}{V_j - V_{ram}},
        \qquad P = \dot m \, c_p (T_{t2} - T_{t,in})

    Fan-face annulus area from the compressible mass-flow function at the fan-face Mach number
    :math:`M_f` with the inflow total conditions (the diameters follow from the annulus in
    :class:`voltwake.components.fan_annulus.FanAnnulusComp`):

    .. math::

        \dot m = A \, p_{t,in} \sqrt{\frac{\gamma}{R T_{t,in}}} \, M_f
        \left(1 + \frac{\gamma-1}{2} M_f^2\right)^{-\frac{\gamma+1}{2(\gamma-1)}}

    Sources: Cumpsty, Jet Propulsion, 2nd ed., one-dimensional propulsor relations for thrust,
    jet velocity and fan work (chapter numbers from memory); Mattingly, Elements of Propulsion,
    mass flow parameter (equation number from memory). Air is calorically perfect
    (``voltwake.components.gas``).

    Validity: the model holds only while :math:`V_j > V_{ram}`. A fan pressure ratio too low
    for the inflow gives no thrust; the model then returns a negative specific thrust, a
    negative mass flow, shaft power and fan-face area (and for
    :math:`p_{t2} < p_0` a NaN jet velocity). This is not hidden here: the enclosing model
    must check it, e.g. by a constraint ``specific_thrust > 0``.

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

        self.add_input('net_thrust', 18000.0 * ones, units='N', desc='Net thrust of this fan')
        self.add_input(
            'inflow_total_temperature',
            245.4 * ones,
            units='K',
            desc='Total temperature of the stream entering the fan',
        )
        self.add_input(
            'inflow_total_pressure',
            35600.0 * ones,
            units='Pa',
            desc='Total pressure of the stream entering the fan',
        )
        self.add_input(
            'ram_velocity',
            231.0 * ones,
            units='m/s',
            desc='Momentum-averaged inflow velocity (free-stream speed for a podded fan)',
        )
        self.add_input(
            'ambient_pressure',
            23842.0 * ones,
            units='Pa',
            desc='Static pressure to which the nozzle expands',
        )
        self.add_input(
            'fan_pressure_ratio', 1.5 * ones, units=None, desc='Fan total pressure ratio'
        )
        self.add_input('fan_efficiency', 0.92 * ones, units=None, desc='Fan isentropic efficiency')
        self.add_input(
            'fan_face_mach', 0.65 * ones, units=None, desc='Axial Mach number at the fan face'
        )

        self.add_output(
            'jet_velocity', 340.0 * ones, units='m/s', desc='Velocity of the fully expanded jet'
        )
        self.add_output(
            'specific_thrust',
            110.0 * ones,
            units='m/s',
            desc='Net thrust per unit mass flow, V_jet - V_ram',
        )
        self.add_output('mass_flow', 160.0 * ones, units='kg/s', desc='Fan mass flow')
        self.add_output(
            'shaft_power', 5.0e6 * ones, units='W', ref=1e6, desc='Shaft power absorbed by the fan'
        )
        self.add_output('fan_face_area', 2.0 * ones, units='m**2', desc='Fan-face annulus area')
        self.add_output(
            'fan_exit_total_temperature',
            275.0 * ones,
            units='K',
            desc='Total temperature behind the fan',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        core = ['inflow_total_temperature', 'fan_pressure_ratio', 'fan_efficiency']
        jet = core + ['inflow_total_pressure', 'ambient_pressure']
        self.declare_diagonal_partials('fan_exit_total_temperature', core)
        self.declare_diagonal_partials('jet_velocity', jet)
        self.declare_diagonal_partials('specific_thrust', jet + ['ram_velocity'])
        flow = jet + ['ram_velocity', 'net_thrust']
        self.declare_diagonal_partials(['mass_flow', 'shaft_power'], flow)
        self.declare_diagonal_partials('fan_face_area', flow + ['fan_face_mach'])

    def _states(self, inputs):
        """
        Evaluate the intermediate quantities shared by compute and compute_partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        dict
            Intermediate quantities keyed by name.
        """
        s = {}
        tt_in = inputs['inflow_total_temperature']
        pt_in = inputs['inflow_total_pressure']
        fpr = inputs['fan_pressure_ratio']
        mach = inputs['fan_face_mach']

        s['tau_s'] = fpr**_K
        s['dt'] = tt_in * (s['tau_s'] - 1.0) / inputs['fan_efficiency']
        s['tt2'] = tt_in + s['dt']
        s['x'] = (inputs['ambient_pressure'] / (fpr * pt_in)) ** _K
        s['vj'] = np.sqrt(2.0 * CP_AIR * s['tt2'] * (1.0 - s['x']))
        s['st'] = s['vj'] - inputs['ram_velocity']
        s['mdot'] = inputs['net_thrust'] / s['st']
        s['power'] = s['mdot'] * CP_AIR * s['dt']
        s['mfp'] = np.sqrt(GAMMA / R_AIR) * mach * (1.0 + 0.5 * (GAMMA - 1.0) * mach**2) ** (-_E)
        s['area'] = s['mdot'] * np.sqrt(tt_in) / (pt_in * s['mfp'])
        return s

    def compute(self, inputs, outputs):
        """
        Compute the fan exit state, jet velocity, mass flow, shaft power and fan-face area.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        s = self._states(inputs)
        outputs['fan_exit_total_temperature'] = s['tt2']
        outputs['jet_velocity'] = s['vj']
        outputs['specific_thrust'] = s['st']
        outputs['mass_flow'] = s['mdot']
        outputs['shaft_power'] = s['power']
        outputs['fan_face_area'] = s['area']

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
        s = self._states(inputs)
        tt_in = inputs['inflow_total_temperature']
        pt_in = inputs['inflow_total_pressure']
        fpr = inputs['fan_pressure_ratio']
        eta = inputs['fan_efficiency']
        mach = inputs['fan_face_mach']
        p_amb = inputs['ambient_pressure']
        zero = np.zeros_like(tt_in)

        # Temperature rise dt = Tt_in (tau_s - 1) / eta and exit temperature tt2 = Tt_in + dt.
        d_dt = {
            'inflow_total_temperature': (s['tau_s'] - 1.0) / eta,
            'fan_pressure_ratio': tt_in * _K * s['tau_s'] / (fpr * eta),
            'fan_efficiency': -s['dt'] / eta,
        }
        d_tt2 = dict(d_dt)
        d_tt2['inflow_total_temperature'] = 1.0 + d_dt['inflow_total_temperature']

        # Expansion term x = (p_amb / (FPR pt_in))^k.
        d_x = {
            'fan_pressure_ratio': -_K * s['x'] / fpr,
            'inflow_total_pressure': -_K * s['x'] / pt_in,
            'ambient_pressure': _K * s['x'] / p_amb,
        }

        # Jet velocity vj^2 = 2 cp tt2 (1 - x).
        a_tt2 = CP_AIR * (1.0 - s['x']) / s['vj']
        a_x = -CP_AIR * s['tt2'] / s['vj']
        d_vj = {}
        for name in (
            'inflow_total_temperature',
            'fan_pressure_ratio',
            'fan_efficiency',
            'inflow_total_pressure',
            'ambient_pressure',
        ):
            d_vj[name] = a_tt2 * d_tt2.get(name, zero) + a_x * d_x.get(name, zero)

        # Specific thrust, mass flow and shaft power.
        d_st = dict(d_vj)
        d_st['ram_velocity'] = -np.ones_like(tt_in)
        d_mdot = {name: -s['mdot'] / s['st'] * val for name, val in d_st.items()}
        d_mdot['net_thrust'] = 1.0 / s['st']
        d_power = {
            name: CP_AIR * (s['dt'] * val + s['mdot'] * d_dt.get(name, zero))
            for name, val in d_mdot.items()
        }

        # Fan-face area A = mdot sqrt(Tt_in) / (pt_in mfp).
        d_area = {name: s['area'] / s['mdot'] * val for name, val in d_mdot.items()}
        d_area['inflow_total_temperature'] += 0.5 * s['area'] / tt_in
        d_area['inflow_total_pressure'] -= s['area'] / pt_in
        dlnmfp_dmach = 1.0 / mach - _E * (GAMMA - 1.0) * mach / (
            1.0 + 0.5 * (GAMMA - 1.0) * mach**2
        )
        d_area['fan_face_mach'] = -s['area'] * dlnmfp_dmach

        for out, derivs in (
            ('fan_exit_total_temperature', d_tt2),
            ('jet_velocity', d_vj),
            ('specific_thrust', d_st),
            ('mass_flow', d_mdot),
            ('shaft_power', d_power),
            ('fan_face_area', d_area),
        ):
            for name, val in derivs.items():
                partials[out, name] = val
