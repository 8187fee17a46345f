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
    Total sea-level static take-off thrust of the turbofans and the motor-driven aft fan.

    The generators are rated at the electrical sizing factor :math:`k_{size}` times their
    cruise power and draw that rated power at take-off, taken off the :math:`N` turbofans
    evenly. Each turbofan's core delivers the same shaft power as without extraction, so the
    turbofan loses the thrust its fan would have made with the diverted shaft power, at the
    fan's static thrust per unit shaft power :math:`s_{tf}` (common practice):

    .. math::

        P_{ext,TO} = k_{size} P_{ext}, \qquad
        F_{tf,TO} = F_{rated} - s_{tf} \frac{P_{ext,TO}}{N}

    The aft fan gets the shaft power :math:`P_{mot}` that its motor delivers at take-off
    (its rated power) and makes thrust at its own static thrust per unit shaft power
    :math:`s_{aft}` (:class:`StaticThrustPerPowerComp`):

    .. math::

        P_{aft,TO} = P_{mot}, \qquad
        F_{aft,TO} = s_{aft} P_{mot}, \qquad
        F_{TO} = N F_{tf,TO} + F_{aft,TO}

    With no extraction and no motor power (a conventional aircraft) :math:`F_{TO} = N
    F_{rated}` exactly. :math:`F_{rated}` is the rated sea-level static thrust of one turbofan
    without power extraction.

    Assumptions and omissions: at fixed fan pressure ratio and efficiency the fan thrust is
    proportional to its shaft power (the mass flow scales), so the loss :math:`s_{tf}
    P_{ext,TO}/N` is exact within :class:`StaticThrustPerPowerComp`'s model; a real fan with a
    fixed nozzle moves down its working line to a lower pressure ratio, where the thrust per
    unit power is higher, so the real loss is smaller (the estimate is conservative; follows
    from the trend of :math:`s` with fan pressure ratio). The core
    is not run hotter to make up for the extraction. The model does not check that the motor
    power matches the generator power less the chain losses; the caller supplies both.

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
            desc='Rated sea-level static thrust of one turbofan without power extraction',
        )
        self.add_input(
            'turbofan_thrust_per_power',
            7.0e-3 * ones,
            units='N/W',
            desc='Static thrust per unit fan shaft power of a turbofan',
        )
        self.add_input(
            'shaft_power_extracted',
            np.zeros(n),
            units='W',
            desc='Cruise shaft power taken off all turbofans for the generators',
        )
        self.add_input(
            'sizing_factor',
            ones,
            units=None,
            desc='Rated / cruise power of the electrical devices',
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
            'takeoff_power_extraction',
            np.zeros(n),
            units='W',
            ref=1e6,
            desc='Shaft power taken off all turbofans at take-off',
        )
        self.add_output(
            'turbofan_takeoff_thrust',
            9.0e4 * ones,
            units='N',
            ref=1e5,
            desc='Static take-off thrust of one turbofan net of power extraction',
        )
        self.add_output(
            'turbofans_takeoff_thrust',
            1.8e5 * ones,
            units='N',
            ref=1e5,
            desc='Static take-off thrust of all turbofans net of power extraction',
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
        self.declare_diagonal_partials(
            'takeoff_power_extraction', ['shaft_power_extracted', 'sizing_factor']
        )
        self.declare_partials(
            'turbofan_takeoff_thrust', 'turbofan_rated_thrust', rows=idx, cols=idx, val=1.0
        )
        extraction = ['turbofan_thrust_per_power', 'shaft_power_extracted', 'sizing_factor']
        self.declare_diagonal_partials(
            ['turbofan_takeoff_thrust', 'turbofans_takeoff_thrust', 'installed_thrust'], extraction
        )
        self.declare_partials(
            'aft_fan_takeoff_power', 'motor_rated_power', rows=idx, cols=idx, val=1.0
        )
        aft = ['motor_rated_power', 'aft_thrust_per_power']
        self.declare_diagonal_partials(['aft_fan_takeoff_thrust', 'installed_thrust'], aft)
        self.declare_partials(
            ['installed_thrust', 'turbofans_takeoff_thrust'],
            'turbofan_rated_thrust',
            rows=idx,
            cols=idx,
            val=count,
        )

    def compute(self, inputs, outputs):
        """
        Compute the take-off extraction, powers and thrusts.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        count = self.options['num_engines']
        p_ext = inputs['sizing_factor'] * inputs['shaft_power_extracted']
        f_tf = inputs['turbofan_rated_thrust'] - inputs['turbofan_thrust_per_power'] * p_ext / count
        f_aft = inputs['aft_thrust_per_power'] * inputs['motor_rated_power']
        outputs['takeoff_power_extraction'] = p_ext
        outputs['turbofan_takeoff_thrust'] = f_tf
        outputs['turbofans_takeoff_thrust'] = count * f_tf
        outputs['aft_fan_takeoff_power'] = inputs['motor_rated_power']
        outputs['aft_fan_takeoff_thrust'] = f_aft
        outputs['installed_thrust'] = count * f_tf + f_aft

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
        count = self.options['num_engines']
        k_size = inputs['sizing_factor']
        p_cruise = inputs['shaft_power_extracted']
        s_tf = inputs['turbofan_thrust_per_power']
        p_ext = k_size * p_cruise

        partials['takeoff_power_extraction', 'shaft_power_extracted'] = k_size
        partials['takeoff_power_extraction', 'sizing_factor'] = p_cruise

        # Thrust of one turbofan; the installed thrust carries N times the same terms.
        d_tf = {
            'turbofan_thrust_per_power': -p_ext / count,
            'shaft_power_extracted': -s_tf * k_size / count,
            'sizing_factor': -s_tf * p_cruise / count,
        }
        for name, val in d_tf.items():
            partials['turbofan_takeoff_thrust', name] = val
            partials['turbofans_takeoff_thrust', name] = count * val
            partials['installed_thrust', name] = count * val

        d_aft = {
            'motor_rated_power': inputs['aft_thrust_per_power'],
            'aft_thrust_per_power': inputs['motor_rated_power'],
        }
        for name, val in d_aft.items():
            partials['aft_fan_takeoff_thrust', name] = val
            partials['installed_thrust', name] = val
