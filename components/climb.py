"""Turbofan thrust lapse and the top-of-climb thrust requirement."""

import numpy as np

from voltwake.components.atmosphere import G0, P0, T0
from voltwake.components.base import PointwiseComponent

# Coefficients of the high-bypass-ratio turbofan thrust lapse (Mattingly, Heiser & Pratt,
# Aircraft Engine Design, 2nd ed., AIAA 2002, sect. 2.3.2; from memory).
_MACH_ROOT_COEFF = 0.49
_HOT_COEFF = 3.0
_HOT_MACH_OFFSET = 1.5
_HALF_GAMMA_MINUS_ONE = 0.2  # (gamma - 1) / 2 for gamma = 1.4
_GAMMA_EXPONENT = 3.5  # gamma / (gamma - 1) for gamma = 1.4


class ThrustLapseComp(PointwiseComponent):
    r"""
    Maximum thrust of a high-bypass-ratio turbofan relative to its sea-level static rating.

    With the total (stagnation) temperature and pressure ratios of the free stream

    .. math::

        \theta_0 = \frac{T}{T_{SL}} \left(1 + \frac{\gamma - 1}{2} M^2\right), \qquad
        \delta_0 = \frac{p}{p_{SL}} \left(1 + \frac{\gamma - 1}{2} M^2\right)^{\gamma/(\gamma-1)}

    the installed thrust lapse :math:`\alpha = T / T_{SLS}` is

    .. math::

        \alpha = \delta_0 \left(1 - 0.49 \sqrt{M}\right)
        \quad \text{if } \theta_0 \le TR, \qquad
        \alpha = \delta_0 \left(1 - 0.49 \sqrt{M} - \frac{3 (\theta_0 - TR)}{1.5 + M}\right)
        \quad \text{if } \theta_0 > TR

    (Mattingly, Heiser & Pratt, Aircraft Engine Design, 2nd ed., AIAA 2002, sect. 2.3.2,
    high-bypass turbofan at maximum power; from memory). :math:`TR` is the engine throttle
    ratio, the value of :math:`\theta_0` at which the engine control reaches both its
    compressor pressure ratio and turbine entry temperature limits (about 1.0-1.1, from
    memory). :math:`T_{SL}` = 288.15 K, :math:`p_{SL}` = 101325 Pa and gamma = 1.4 (ISO
    2533:1975). The branch is chosen on the real part of :math:`\theta_0` (complex-step
    safe). The Mach derivative is unbounded at M = 0; use M > 0 whenever derivatives are
    needed.

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
        self.add_input('pressure', 23842.0 * ones, units='Pa', desc='Static air pressure')
        self.add_input('temperature', 218.8 * ones, units='K', desc='Static air temperature')
        self.add_input('mach', 0.78 * ones, units=None, desc='Flight Mach number')
        self.add_input(
            'throttle_ratio',
            ones,
            units=None,
            desc='Engine throttle ratio (theta_0 at the control break)',
        )
        self.add_output(
            'thrust_lapse',
            0.2 * ones,
            units=None,
            desc='Available thrust / sea-level static rated thrust',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            'thrust_lapse', ['pressure', 'temperature', 'mach', 'throttle_ratio']
        )

    def _terms(self, inputs):
        """
        Return the intermediate quantities shared by compute and compute_partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        tuple of ndarray
            Ram factor 1 + 0.2 M**2, delta_0, theta_0, hot-branch mask, bracket term.
        """
        mach = inputs['mach']
        ram = 1.0 + _HALF_GAMMA_MINUS_ONE * mach**2
        delta0 = inputs['pressure'] / P0 * ram**_GAMMA_EXPONENT
        theta0 = inputs['temperature'] / T0 * ram
        hot = theta0.real > inputs['throttle_ratio'].real
        hot_term = np.where(
            hot, _HOT_COEFF * (theta0 - inputs['throttle_ratio']) / (_HOT_MACH_OFFSET + mach), 0.0
        )
        bracket = 1.0 - _MACH_ROOT_COEFF * np.sqrt(mach) - hot_term
        return ram, delta0, theta0, hot, bracket

    def compute(self, inputs, outputs):
        """
        Compute the thrust lapse.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        _, delta0, _, _, bracket = self._terms(inputs)
        outputs['thrust_lapse'] = delta0 * bracket

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
        mach = inputs['mach']
        pressure = inputs['pressure']
        temperature = inputs['temperature']
        ram, delta0, theta0, hot, bracket = self._terms(inputs)
        denom = _HOT_MACH_OFFSET + mach

        d_ram_d_mach = 2.0 * _HALF_GAMMA_MINUS_ONE * mach
        d_delta0_d_mach = (
            pressure / P0 * _GAMMA_EXPONENT * ram ** (_GAMMA_EXPONENT - 1.0) * d_ram_d_mach
        )
        d_theta0_d_mach = temperature / T0 * d_ram_d_mach
        d_hot_d_mach = np.where(
            hot,
            _HOT_COEFF * (d_theta0_d_mach * denom - (theta0 - inputs['throttle_ratio'])) / denom**2,
            0.0,
        )
        d_bracket_d_mach = -0.5 * _MACH_ROOT_COEFF / np.sqrt(mach) - d_hot_d_mach

        partials['thrust_lapse', 'pressure'] = ram**_GAMMA_EXPONENT / P0 * bracket
        partials['thrust_lapse', 'temperature'] = np.where(
            hot, -delta0 * _HOT_COEFF * ram / (T0 * denom), 0.0
        )
        partials['thrust_lapse', 'throttle_ratio'] = np.where(hot, delta0 * _HOT_COEFF / denom, 0.0)
        partials['thrust_lapse', 'mach'] = d_delta0_d_mach * bracket + delta0 * d_bracket_d_mach


class TopOfClimbComp(PointwiseComponent):
    r"""
    Thrust margin at top of climb with a residual rate of climb.

    .. math::

        T_{av} = \alpha \, T_{SLS} + k_e F_{e}, \qquad
        T_{req} = \frac{m g_0}{L/D} + \frac{m g_0 \, \dot h}{V}, \qquad
        \text{margin} = \frac{T_{av}}{T_{req}} - 1

    :math:`T_{req}` follows from the steady climb equation :math:`T - D = W \sin\gamma` with
    :math:`\dot h = V \sin\gamma` and, for a small climb angle, :math:`L \approx W` so that
    :math:`D = W / (L/D)` (common practice; e.g. Anderson, Introduction to Flight, ch. 6,
    rate of climb; from memory). A residual rate of climb of 300 ft/min (1.524 m/s) at the
    top of climb is common practice for engine sizing. The constraint is margin >= 0.

    :math:`T_{SLS}` is the take-off thrust of the turbofans, lapsed by :math:`\alpha`.
    An electrically driven fan does not lapse with its turbofans' thrust: its motor can
    give its rated power, :math:`k_e` times its cruise power, and at a fixed fan pressure
    ratio and inflow the thrust scales with the shaft power, so it adds :math:`k_e F_e`
    with :math:`F_e` its cruise thrust (common practice for a first sizing pass).

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
        self.add_input(
            'rated_thrust',
            170000.0 * ones,
            units='N',
            desc='Sea-level static take-off thrust of the turbofans (lapses with altitude)',
        )
        self.add_input(
            'electric_thrust',
            0.0 * ones,
            units='N',
            desc='Cruise thrust of an electrically driven fan (0 if none)',
        )
        self.add_input(
            'electric_power_ratio',
            ones,
            units=None,
            desc='Rated / cruise power of the electric drive at top of climb',
        )
        self.add_input(
            'thrust_lapse',
            0.2 * ones,
            units=None,
            desc='Available thrust / sea-level static rated thrust at top of climb',
        )
        self.add_input('mass', 65000.0 * ones, units='kg', desc='Aircraft mass at top of climb')
        self.add_input(
            'lift_to_drag', 17.0 * ones, units=None, desc='Lift-to-drag ratio at top of climb'
        )
        self.add_input(
            'true_airspeed', 230.0 * ones, units='m/s', desc='True airspeed at top of climb'
        )
        self.add_input(
            'residual_climb_rate',
            1.524 * ones,
            units='m/s',
            desc='Required rate of climb at top of climb',
        )
        self.add_output(
            'available_thrust',
            34000.0 * ones,
            units='N',
            desc='Total available thrust at top of climb',
        )
        self.add_output(
            'required_thrust',
            40000.0 * ones,
            units='N',
            desc='Thrust for steady climb at the residual rate of climb',
        )
        self.add_output(
            'thrust_margin',
            0.0 * ones,
            units=None,
            desc='Available / required thrust - 1 (>= 0 is feasible)',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        available = ['rated_thrust', 'thrust_lapse', 'electric_thrust', 'electric_power_ratio']
        self.declare_diagonal_partials('available_thrust', available)
        required = ['mass', 'lift_to_drag', 'true_airspeed', 'residual_climb_rate']
        self.declare_diagonal_partials('required_thrust', required)
        self.declare_diagonal_partials('thrust_margin', available + required)

    def compute(self, inputs, outputs):
        """
        Compute available thrust, required thrust and thrust margin.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        available = (
            inputs['thrust_lapse'] * inputs['rated_thrust']
            + inputs['electric_power_ratio'] * inputs['electric_thrust']
        )
        weight = inputs['mass'] * G0
        required = weight * (
            1.0 / inputs['lift_to_drag'] + inputs['residual_climb_rate'] / inputs['true_airspeed']
        )
        outputs['available_thrust'] = available
        outputs['required_thrust'] = required
        outputs['thrust_margin'] = available / required - 1.0

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
        rated = inputs['rated_thrust']
        lapse = inputs['thrust_lapse']
        mass = inputs['mass']
        l_over_d = inputs['lift_to_drag']
        speed = inputs['true_airspeed']
        climb_rate = inputs['residual_climb_rate']
        weight = mass * G0
        k_e = inputs['electric_power_ratio']
        f_e = inputs['electric_thrust']
        available = lapse * rated + k_e * f_e
        required = weight * (1.0 / l_over_d + climb_rate / speed)

        d_available = {
            'rated_thrust': lapse,
            'thrust_lapse': rated,
            'electric_thrust': k_e,
            'electric_power_ratio': f_e,
        }
        for name, value in d_available.items():
            partials['available_thrust', name] = value
            partials['thrust_margin', name] = value / required

        d_required = {
            'mass': required / mass,
            'lift_to_drag': -weight / l_over_d**2,
            'true_airspeed': -weight * climb_rate / speed**2,
            'residual_climb_rate': weight / speed,
        }
        for name, value in d_required.items():
            partials['required_thrust', name] = value
            partials['thrust_margin', name] = -available / required**2 * value
