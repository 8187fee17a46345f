"""Define the SameMassFlowFanComp class: free-stream reference fan of the same mass flow."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.gas import CP_AIR, GAMMA

# Exponent (gamma - 1) / gamma of the isentropic pressure-temperature relation.
_K = (GAMMA - 1.0) / GAMMA


class SameMassFlowFanComp(PointwiseComponent):
    r"""
    Free-stream fan that gives a set net thrust with a set mass flow (a reference fan).

    The fan has free-stream inflow (total temperature :math:`T_{t0}`, total pressure
    :math:`p_{t0}`, ram velocity :math:`V_0`) and a nozzle fully expanded to the ambient
    static pressure :math:`p_0`, as in :class:`voltwake.components.ducted_fan.DuctedFanComp`.
    Its fan pressure ratio is an output: the one at which the given mass flow :math:`\dot m`
    gives the net thrust :math:`F`. Jet velocity from the momentum balance:

    .. math::

        V_j = V_0 + \frac{F}{\dot m}

    Fan and nozzle, with isentropic fan efficiency :math:`\eta_f`, the isentropic temperature
    ratio :math:`\tau_s = \pi_f^{(\gamma-1)/\gamma}` and
    :math:`a = (p_0/p_{t0})^{(\gamma-1)/\gamma}`:

    .. math::

        V_j^2 = 2 c_p T_{t0} \left(1 + \frac{\tau_s - 1}{\eta_f}\right)
        \left(1 - \frac{a}{\tau_s}\right)

    With :math:`c = V_j^2 / (2 c_p T_{t0})`, multiplying by :math:`\eta_f \tau_s` gives
    :math:`c\,\eta_f \tau_s = (\tau_s + \eta_f - 1)(\tau_s - a)`, a quadratic in
    :math:`\tau_s`:

    .. math::

        \tau_s^2 - B \tau_s + a (1 - \eta_f) = 0, \qquad
        B = 1 + a - \eta_f + c\,\eta_f

    The physical root is the larger one,

    .. math::

        \tau_s = \frac{B + \sqrt{B^2 - 4 a (1 - \eta_f)}}{2}

    Root choice: the product of the roots is :math:`a(1 - \eta_f) < 1`, and the quadratic
    at :math:`\tau_s = 1` equals :math:`\eta_f (1 - a - c)`. For an isentropic free stream
    :math:`V_0^2 = 2 c_p T_{t0} (1 - a)`, so :math:`1 - a - c = (V_0^2 - V_j^2)/(2 c_p T_{t0})`:
    for :math:`V_j > V_0` the value 1 lies between the roots, the larger root is
    :math:`> 1` (a compressor) and the smaller :math:`< 1` (no compression; for
    :math:`\eta_f = 1` it is 0). At :math:`V_j = V_0` the larger root is exactly 1 (no work).
    The discriminant is at least :math:`(1 - a(1 - \eta_f))^2 > 0` for :math:`V_j \ge V_0`, so
    the root is smooth there. Fan pressure ratio and shaft power:

    .. math::

        \pi_f = \tau_s^{\gamma/(\gamma-1)}, \qquad
        P = \dot m \, c_p T_{t0} \, \frac{\tau_s - 1}{\eta_f}

    Sources: Cumpsty, Jet Propulsion, 2nd ed., one-dimensional propulsor relations for thrust,
    jet velocity and fan work (chapter numbers from memory); the closed-form inversion is
    derived above from those relations. Air is calorically perfect
    (``voltwake.components.gas``).

    Validity: the inputs should describe one isentropic free stream (as the flight-condition
    component gives them); otherwise the no-work limit :math:`F \to 0` gives a pressure ratio
    slightly off 1. The model is meant for :math:`F \ge 0` and :math:`\dot m > 0`.

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

        self.add_input('net_thrust', 7000.0 * ones, units='N', desc='Net thrust of the fan')
        self.add_input('mass_flow', 100.0 * ones, units='kg/s', desc='Fan mass flow')
        self.add_input(
            'true_airspeed', 231.0 * ones, units='m/s', desc='Flight speed (free-stream inflow)'
        )
        self.add_input(
            'total_temperature', 245.4 * ones, units='K', desc='Free-stream total temperature'
        )
        self.add_input(
            'total_pressure', 35600.0 * ones, units='Pa', desc='Free-stream total pressure'
        )
        self.add_input(
            'ambient_pressure',
            23842.0 * ones,
            units='Pa',
            desc='Free-stream static pressure, to which the nozzle expands',
        )
        self.add_input('fan_efficiency', 0.92 * ones, units=None, desc='Fan isentropic efficiency')

        self.add_output(
            'fan_pressure_ratio',
            1.3 * ones,
            units=None,
            desc='Fan total pressure ratio that gives the thrust with the mass flow',
        )
        self.add_output(
            'jet_velocity', 300.0 * ones, units='m/s', desc='Velocity of the fully expanded jet'
        )
        self.add_output(
            'shaft_power', 2.0e6 * ones, units='W', ref=1e6, desc='Shaft power absorbed by the fan'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        jet = ['net_thrust', 'mass_flow', 'true_airspeed']
        fan = jet + ['total_temperature', 'total_pressure', 'ambient_pressure', 'fan_efficiency']
        self.declare_diagonal_partials('jet_velocity', jet)
        self.declare_diagonal_partials(['fan_pressure_ratio', 'shaft_power'], fan)

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
        eta = inputs['fan_efficiency']
        s['vj'] = inputs['true_airspeed'] + inputs['net_thrust'] / inputs['mass_flow']
        s['c'] = s['vj'] ** 2 / (2.0 * CP_AIR * inputs['total_temperature'])
        s['a'] = (inputs['ambient_pressure'] / inputs['total_pressure']) ** _K
        s['b'] = 1.0 + s['a'] - eta + s['c'] * eta
        s['root'] = np.sqrt(s['b'] ** 2 - 4.0 * s['a'] * (1.0 - eta))
        s['tau_s'] = 0.5 * (s['b'] + s['root'])
        s['fpr'] = s['tau_s'] ** (1.0 / _K)
        s['work'] = CP_AIR * inputs['total_temperature'] * (s['tau_s'] - 1.0) / eta
        s['power'] = inputs['mass_flow'] * s['work']
        return s

    def compute(self, inputs, outputs):
        """
        Compute the jet velocity, fan pressure ratio and shaft power.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        s = self._states(inputs)
        outputs['jet_velocity'] = s['vj']
        outputs['fan_pressure_ratio'] = s['fpr']
        outputs['shaft_power'] = s['power']

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials by implicit differentiation of the quadratic.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        s = self._states(inputs)
        thrust = inputs['net_thrust']
        mdot = inputs['mass_flow']
        tt0 = inputs['total_temperature']
        eta = inputs['fan_efficiency']
        tau = s['tau_s']
        zero = np.zeros_like(tau)

        # Jet velocity vj = V0 + F / mdot.
        d_vj = {
            'net_thrust': 1.0 / mdot,
            'mass_flow': -thrust / mdot**2,
            'true_airspeed': np.ones_like(tau),
        }

        # c = vj^2 / (2 cp Tt0) and a = (p0 / pt0)^k.
        dc_dvj = s['vj'] / (CP_AIR * tt0)
        d_c = {name: dc_dvj * val for name, val in d_vj.items()}
        d_c['total_temperature'] = -s['c'] / tt0
        d_a = {
            'ambient_pressure': _K * s['a'] / inputs['ambient_pressure'],
            'total_pressure': -_K * s['a'] / inputs['total_pressure'],
        }

        # g(tau, a, c, eta) = tau^2 - B tau + a (1 - eta) = 0, g_tau = 2 tau - B = root.
        g_a = 1.0 - eta - tau
        g_c = -eta * tau
        g_eta = tau * (1.0 - s['c']) - s['a']
        names = (
            'net_thrust',
            'mass_flow',
            'true_airspeed',
            'total_temperature',
            'total_pressure',
            'ambient_pressure',
            'fan_efficiency',
        )
        d_tau = {
            name: -(g_a * d_a.get(name, zero) + g_c * d_c.get(name, zero)) / s['root']
            for name in names
        }
        d_tau['fan_efficiency'] = d_tau['fan_efficiency'] - g_eta / s['root']

        # FPR = tau^(1/k); P = mdot cp Tt0 (tau - 1) / eta.
        dfpr_dtau = s['fpr'] / (_K * tau)
        dp_dtau = mdot * CP_AIR * tt0 / eta
        d_power = {name: dp_dtau * val for name, val in d_tau.items()}
        d_power['mass_flow'] = d_power['mass_flow'] + s['work']
        d_power['total_temperature'] = d_power['total_temperature'] + s['power'] / tt0
        d_power['fan_efficiency'] = d_power['fan_efficiency'] - s['power'] / eta

        for name, val in d_vj.items():
            partials['jet_velocity', name] = val
        for name in names:
            partials['fan_pressure_ratio', name] = dfpr_dtau * d_tau[name]
            partials['shaft_power', name] = d_power[name]
