"""Define StaticThrustPerPowerComp and TakeoffThrustComp: take-off thrust from shaft power."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.gas import CP_AIR, GAMMA

# Exponent (gamma - 1) / gamma of the isentropic pressure-temperature relation.
_K = (GAMMA - 1.0) / GAMMA


class StaticThrustPerPowerComp(PointwiseComponent):
    r"""
    Sea-level static thrust per unit shaft power of one ducted fan.

    The one-dimensional relations of :class:`voltwake.components.ducted_fan.DuctedFanComp`
    at zero flight speed: the inflow total state is the ambient static state
    (:math:`T_{t,in} = T_0`, :math:`p_{t,in} = p_0`) and the ram velocity is zero. With
    :math:`k = (\gamma - 1)/\gamma`, fan pressure ratio :math:`\pi_f` and isentropic fan
    efficiency :math:`\eta_f`:

    .. math::

        \tau_s = \pi_f^{k}, \qquad
        \Delta T = \frac{T_0 (\tau_s - 1)}{\eta_f}, \qquad
        T_{t2} = T_0 + \Delta T

    Nozzle fully expanded to :math:`p_0` (so :math:`p_0 / p_{t2} = \pi_f^{-1}`), jet velocity,
    and thrust per unit shaft power from :math:`F = \dot m V_j` and
    :math:`P = \dot m c_p \Delta T`:

    .. math::

        V_j = \sqrt{2 c_p T_{t2} \left(1 - \pi_f^{-k}\right)}, \qquad
        s = \frac{F}{P} = \frac{V_j}{c_p \, \Delta T}

    Sources: Cumpsty, Jet Propulsion, 2nd ed., one-dimensional propulsor relations for thrust,
    jet velocity and fan work (chapter numbers from memory). Air is calorically perfect
    (``voltwake.components.gas``). The ambient pressure cancels and is not an input; ``s``
    scales as :math:`T_0^{-1/2}` (follows from the relations above). With :math:`\eta_f = 1`
    the fan work equals the jet kinetic energy, :math:`c_p \Delta T = V_j^2/2`, and
    :math:`s = 2/V_j`: a higher fan pressure ratio gives a faster jet and less static thrust
    per unit power (follows from the relations above).

    Assumptions and omissions:

    * The fan runs at its design fan pressure ratio and efficiency at take-off. The real
      take-off pressure ratio follows from the fan map and the nozzle schedule; taking the
      design values is a simplification (common practice for a first sizing pass).
    * The mass flow :math:`\dot m = F / V_j` must pass through the fan annulus sized at
      cruise; this model does not check it.
    * Static thrust only (zero flight speed); the thrust fall-off with speed during the
      take-off run (ram drag) is not modelled here. No fuel flow, no nozzle losses.

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
            'fan_pressure_ratio', 1.5 * ones, units=None, desc='Fan total pressure ratio'
        )
        self.add_input('fan_efficiency', 0.92 * ones, units=None, desc='Fan isentropic efficiency')
        self.add_input(
            'ambient_temperature',
            288.15 * ones,
            units='K',
            desc='Ambient static temperature at the airfield (default ISA sea level)',
        )
        self.add_output(
            'static_jet_velocity',
            270.0 * ones,
            units='m/s',
            desc='Velocity of the fully expanded jet at zero flight speed',
        )
        self.add_output(
            'thrust_per_power',
            7.0e-3 * ones,
            units='N/W',
            ref=1e-2,
            desc='Static thrust per unit fan shaft power',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        wrt = ['fan_pressure_ratio', 'fan_efficiency', 'ambient_temperature']
        self.declare_diagonal_partials(['static_jet_velocity', 'thrust_per_power'], wrt)

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
        fpr = inputs['fan_pressure_ratio']
        t0 = inputs['ambient_temperature']
        s = {}
        s['tau_s'] = fpr**_K
        s['x'] = 1.0 / s['tau_s']
        s['dt'] = t0 * (s['tau_s'] - 1.0) / inputs['fan_efficiency']
        s['tt2'] = t0 + s['dt']
        s['vj'] = np.sqrt(2.0 * CP_AIR * s['tt2'] * (1.0 - s['x']))
        s['spp'] = s['vj'] / (CP_AIR * s['dt'])
        return s

    def compute(self, inputs, outputs):
        """
        Compute the static jet velocity and thrust per unit shaft power.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        s = self._states(inputs)
        outputs['static_jet_velocity'] = s['vj']
        outputs['thrust_per_power'] = s['spp']

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
        fpr = inputs['fan_pressure_ratio']
        eta = inputs['fan_efficiency']
        t0 = inputs['ambient_temperature']
        zero = np.zeros_like(fpr)

        # Temperature rise dt = T0 (tau_s - 1) / eta; exit temperature tt2 = T0 + dt.
        d_dt = {
            'fan_pressure_ratio': t0 * _K * s['tau_s'] / (fpr * eta),
            'fan_efficiency': -s['dt'] / eta,
            'ambient_temperature': (s['tau_s'] - 1.0) / eta,
        }
        d_tt2 = dict(d_dt)
        d_tt2['ambient_temperature'] = 1.0 + d_dt['ambient_temperature']
        # Expansion term x = FPR^-k.
        d_x = {'fan_pressure_ratio': -_K * s['x'] / fpr}

        # Jet velocity vj^2 = 2 cp tt2 (1 - x); thrust per power spp = vj / (cp dt).
        a_tt2 = CP_AIR * (1.0 - s['x']) / s['vj']
        a_x = -CP_AIR * s['tt2'] / s['vj']
        for name in d_dt:
            d_vj = a_tt2 * d_tt2[name] + a_x * d_x.get(name, zero)
            partials['static_jet_velocity', name] = d_vj
            partials['thrust_per_power', name] = (
                d_vj / (CP_AIR * s['dt']) - s['spp'] / s['dt'] * d_dt[name]
            )


class TakeoffThrustComp(PointwiseComponent):
    r"""
    Sea-level static take-off thrust of the turbofans and of the aft fan.

    The turbofans' cores are sized to drive their fans at the rated thrust *and* the
    generators at their rated power (:class:`voltwake.components.turbofan_core.EngineMassComp`
    carries the mass of that core), so each turbofan delivers its rated thrust at take-off
    with the extraction. The aft fan gets the shaft power :math:`P_{mot}` that its motor
    delivers at take-off (its rated power) and makes thrust at its own static thrust per unit
    shaft power :math:`s_{aft}` (:class:`StaticThrustPerPowerComp`):

    .. math::

        F_{tf,TO} = F_{rated}, \qquad
        P_{aft,TO} = P_{mot}, \qquad
        F_{aft,TO} = s_{aft} P_{mot}, \qquad
        F_{TO} = N F_{tf,TO} + F_{aft,TO}

    With no motor power (a conventional aircraft) :math:`F_{TO} = N F_{rated}` exactly.
    Assumptions: the aft fan runs at its design fan pressure ratio at take-off (see
    :class:`StaticThrustPerPowerComp`); the model does not check that the motor power matches
    the generator power less the chain losses, which the sizing loop ensures at cruise and the
    common sizing factor at take-off.

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
            'num_engines', types=int, default=2, lower=1, desc='Number of under-wing turbofans'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        ones = np.ones(n)
        self.add_input(
            'turbofan_rated_thrust',
            9.0e4 * ones,
            units='N',
            desc='Rated sea-level static thrust of one turbofan',
        )
        self.add_input(
            'motor_rated_power',
            np.zeros(n),
            units='W',
            desc='Shaft power the aft-fan motor delivers at take-off',
        )
        self.add_input(
            'aft_thrust_per_power',
            8.0e-3 * ones,
            units='N/W',
            desc='Static thrust per unit fan shaft power of the aft fan',
        )
        self.add_output(
            'turbofan_takeoff_thrust',
            9.0e4 * ones,
            units='N',
            ref=1e5,
            desc='Static take-off thrust of one turbofan',
        )
        self.add_output(
            'turbofans_takeoff_thrust',
            1.8e5 * ones,
            units='N',
            ref=1e5,
            desc='Static take-off thrust of all turbofans',
        )
        self.add_output(
            'aft_fan_takeoff_power',
            np.zeros(n),
            units='W',
            ref=1e6,
            desc='Shaft power of the aft fan at take-off',
        )
        self.add_output(
            'aft_fan_takeoff_thrust',
            np.zeros(n),
            units='N',
            ref=1e4,
            desc='Static take-off thrust of the aft fan',
        )
        self.add_output(
            'installed_thrust',
            1.8e5 * ones,
            units='N',
            ref=1e5,
            desc='Total sea-level static take-off thrust of all propulsors',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials, with their values where they are constant.
        """
        idx = np.arange(self.options['vec_size'])
        count = float(self.options['num_engines'])
        for out, val in (
            ('turbofan_takeoff_thrust', 1.0),
            ('turbofans_takeoff_thrust', count),
            ('installed_thrust', count),
        ):
            self.declare_partials(out, 'turbofan_rated_thrust', rows=idx, cols=idx, val=val)
        self.declare_partials(
            'aft_fan_takeoff_power', 'motor_rated_power', rows=idx, cols=idx, val=1.0
        )
        aft = ['motor_rated_power', 'aft_thrust_per_power']
        self.declare_diagonal_partials(['aft_fan_takeoff_thrust', 'installed_thrust'], aft)

    def compute(self, inputs, outputs):
        """
        Compute the take-off thrusts and the aft fan's take-off power.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        count = self.options['num_engines']
        f_aft = inputs['aft_thrust_per_power'] * inputs['motor_rated_power']
        outputs['turbofan_takeoff_thrust'] = inputs['turbofan_rated_thrust']
        outputs['turbofans_takeoff_thrust'] = count * inputs['turbofan_rated_thrust']
        outputs['aft_fan_takeoff_power'] = inputs['motor_rated_power']
        outputs['aft_fan_takeoff_thrust'] = f_aft
        outputs['installed_thrust'] = count * inputs['turbofan_rated_thrust'] + f_aft

    def compute_partials(self, inputs, partials):
        """
        Compute the partials that depend on the inputs (the constant ones are set in setup).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        d_aft = {
            'motor_rated_power': inputs['aft_thrust_per_power'],
            'aft_thrust_per_power': inputs['motor_rated_power'],
        }
        for name, val in d_aft.items():
            partials['aft_fan_takeoff_thrust', name] = val
            partials['installed_thrust', name] = val
