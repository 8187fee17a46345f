"""Define the TurbofanCoreComp and EngineMassComp classes: fuel burn and mass of one turbofan."""

import numpy as np

from voltwake.components.base import PointwiseComponent

# Standard acceleration of gravity in m/s**2 (ISO 80000-3; ISO 2533:1975).
G0 = 9.80665


class TurbofanCoreComp(PointwiseComponent):
    r"""
    Fuel flow and thrust-specific fuel consumption of one turbofan's gas-generator core.

    The core delivers the shaft power of its fan plus any shaft power extracted for a
    generator, at a core thermal efficiency :math:`\eta_{th}` defined as shaft power delivered
    over fuel power (common practice):

    .. math::

        \dot m_f = \frac{P_{fan} + P_{ext}}{\eta_{th} \, LHV},
        \qquad TSFC = \frac{\dot m_f}{F}

    :math:`F` is the net thrust of this engine's fan. TSFC is undefined at zero net thrust
    (division by zero); an engine that only drives a generator must not use ``tsfc``.

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
            'fan_shaft_power',
            5.5e6 * ones,
            units='W',
            desc='Shaft power absorbed by the fan of this engine',
        )
        self.add_input(
            'power_extraction',
            np.zeros(n),
            units='W',
            desc='Shaft power taken off the core for a generator',
        )
        self.add_input(
            'thermal_efficiency',
            0.47 * ones,
            units=None,
            desc='Core thermal efficiency: shaft power delivered / fuel power',
        )
        self.add_input(
            'fuel_heating_value',
            43.1e6 * ones,
            units='J/kg',
            desc='Lower heating value of the fuel',
        )
        self.add_input(
            'net_thrust', 18000.0 * ones, units='N', desc="Net thrust of this engine's fan"
        )

        self.add_output(
            'fuel_flow', 0.27 * ones, units='kg/s', desc='Fuel mass flow of this engine'
        )
        self.add_output(
            'tsfc', 1.5e-5 * ones, units='kg/(N*s)', desc='Thrust-specific fuel consumption'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        wrt = ['fan_shaft_power', 'power_extraction', 'thermal_efficiency', 'fuel_heating_value']
        self.declare_diagonal_partials('fuel_flow', wrt)
        self.declare_diagonal_partials('tsfc', wrt + ['net_thrust'])

    def compute(self, inputs, outputs):
        """
        Compute fuel flow and TSFC.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        power = inputs['fan_shaft_power'] + inputs['power_extraction']
        fuel = power / (inputs['thermal_efficiency'] * inputs['fuel_heating_value'])
        outputs['fuel_flow'] = fuel
        outputs['tsfc'] = fuel / inputs['net_thrust']

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
        eta = inputs['thermal_efficiency']
        lhv = inputs['fuel_heating_value']
        thrust = inputs['net_thrust']
        power = inputs['fan_shaft_power'] + inputs['power_extraction']
        fuel = power / (eta * lhv)

        d_fuel = {
            'fan_shaft_power': 1.0 / (eta * lhv),
            'power_extraction': 1.0 / (eta * lhv),
            'thermal_efficiency': -fuel / eta,
            'fuel_heating_value': -fuel / lhv,
        }
        for name, val in d_fuel.items():
            partials['fuel_flow', name] = val
            partials['tsfc', name] = val / thrust
        partials['tsfc', 'net_thrust'] = -fuel / thrust**2


class EngineMassComp(PointwiseComponent):
    r"""
    Rated thrust, core shaft power and mass of the under-wing turbofans and their nacelles.

    The rated sea-level static thrust of one turbofan is a multiple :math:`r` of its cruise
    thrust. The core of each engine is sized to its maximum shaft power, at take-off: it
    drives the fan at rated thrust and the generators at their rated power, so the rated
    thrust is delivered with the extraction:

    .. math::

        F_{rated} = r \, F_{cruise}, \qquad
        P_{core} = \frac{F_{rated}}{s_{tf}} + \frac{k \, P_{ext}}{N}

    :math:`s_{tf}` is the fan's sea-level static thrust per unit shaft power
    (:class:`voltwake.components.takeoff_thrust.StaticThrustPerPowerComp`), :math:`P_{ext}`
    the cruise shaft power taken off all :math:`N` turbofans for the generators, shared
    evenly, and :math:`k` the electrical sizing factor (rated / cruise power of the
    generators). Bare engine mass, nacelle mass and totals, per engine unless summed:

    .. math::

        m_{eng} = m''_{fan} \, \frac{\pi D^2}{4} + \frac{P_{core}}{p_{core}}, \qquad
        m_{nac} = m''_{nac} \, S_{wet,nac} / N, \qquad
        m_{total} = N \left(m_{eng} + m_{nac}\right)

    Physical reading: the fan section (fan blades and disc, fan containment case, gearbox
    and low-pressure shaft) scales with the fan disc area :math:`\pi D^2/4` of tip diameter
    :math:`D` at areal mass :math:`m''_{fan}`; the core (compressors, combustor, turbines
    including the turbine that drives the fan) scales with the shaft power it must deliver,
    at specific power :math:`p_{core}`; the nacelle (inlet, cowls, thrust reverser, pylon
    fairing) scales with its share of the wetted area :math:`S_{wet,nac}` of all nacelles at
    areal mass :math:`m''_{nac}`. A lower fan pressure ratio at the same thrust needs a larger fan
    (heavier fan section, larger nacelle) but less shaft power (lighter core); shaft power
    extracted for generators makes the core heavier. Component-wise engine mass scaling of
    this kind is common practice in conceptual design.

    The default areal masses and core specific power are demo values, not data: chosen so
    that a turbofan of 95 kN rated thrust, fan pressure ratio 1.5 (fan efficiency 0.92),
    fan diameter 1.63 m and nacelle wetted area 26 m**2 without extraction has an installed
    rated thrust-to-weight :math:`F_{rated}/((m_{eng} + m_{nac}) g_0)` of about 3.5
    (the range 3.3-3.8 is typical of this class; from memory), and that the bare engine
    mass per rated thrust rises as the fan pressure ratio falls at the same rated thrust.
    :math:`g_0` is standard gravity (ISO 80000-3).

    Assumptions and omissions: the fan diameter is the one sized at cruise (the caller
    supplies it); the core specific power stands for the core's technology level and does
    not vary with overall pressure ratio, turbine entry temperature or core size; the
    gearbox mass is counted with the fan section, not with the power it transmits.

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
        self.options.declare('count', types=int, default=2, lower=1, desc='Number of engines.')

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        ones = np.ones(n)

        self.add_input(
            'cruise_thrust', 18000.0 * ones, units='N', desc='Cruise net thrust per engine'
        )
        self.add_input(
            'rated_to_cruise_thrust',
            4.5 * ones,
            units=None,
            desc='Rated sea-level static thrust / cruise thrust',
        )
        self.add_input(
            'static_thrust_per_power',
            7.0e-3 * ones,
            units='N/W',
            desc='Sea-level static thrust per unit fan shaft power of one turbofan',
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
        self.add_input('fan_diameter', 1.63 * ones, units='m', desc='Fan tip diameter')
        self.add_input(
            'fan_areal_mass',
            500.0 * ones,
            units='kg/m**2',
            desc='Fan, fan case, gearbox and low-pressure shaft mass per fan disc area',
        )
        self.add_input(
            'core_specific_power',
            11.5e3 * ones,
            units='W/kg',
            desc='Maximum core shaft power per unit core mass',
        )
        self.add_input(
            'nacelle_wetted_area',
            52.0 * ones,
            units='m**2',
            desc='Wetted area of all the nacelles together',
        )
        self.add_input(
            'nacelle_areal_mass',
            20.0 * ones,
            units='kg/m**2',
            desc='Nacelle mass per wetted area',
        )

        self.add_output(
            'rated_thrust',
            81000.0 * ones,
            units='N',
            desc='Rated sea-level static thrust per engine',
        )
        self.add_output(
            'core_shaft_power',
            1.16e7 * ones,
            units='W',
            ref=1e6,
            desc='Maximum (take-off) core shaft power per engine, fan plus generators',
        )
        self.add_output(
            'engine_mass', 2050.0 * ones, units='kg', desc='Bare engine mass per engine'
        )
        self.add_output('nacelle_mass', 520.0 * ones, units='kg', desc='Mass of one nacelle')
        self.add_output(
            'total_nacelle_mass', 1040.0 * ones, units='kg', desc='Mass of all nacelles'
        )
        self.add_output(
            'total_engine_mass',
            5140.0 * ones,
            units='kg',
            desc='Mass of all engines including their nacelles',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        thrust = ['cruise_thrust', 'rated_to_cruise_thrust']
        power = thrust + ['static_thrust_per_power', 'shaft_power_extracted', 'sizing_factor']
        engine = power + ['fan_diameter', 'fan_areal_mass', 'core_specific_power']
        nacelle = ['nacelle_wetted_area', 'nacelle_areal_mass']
        self.declare_diagonal_partials('rated_thrust', thrust)
        self.declare_diagonal_partials('core_shaft_power', power)
        self.declare_diagonal_partials('engine_mass', engine)
        self.declare_diagonal_partials(['nacelle_mass', 'total_nacelle_mass'], nacelle)
        self.declare_diagonal_partials('total_engine_mass', engine + nacelle)

    def compute(self, inputs, outputs):
        """
        Compute rated thrust, core shaft power and the engine and nacelle masses.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        count = self.options['count']
        rated = inputs['cruise_thrust'] * inputs['rated_to_cruise_thrust']
        power = (
            rated / inputs['static_thrust_per_power']
            + inputs['sizing_factor'] * inputs['shaft_power_extracted'] / count
        )
        fan = inputs['fan_areal_mass'] * 0.25 * np.pi * inputs['fan_diameter'] ** 2
        engine = fan + power / inputs['core_specific_power']
        nacelle = inputs['nacelle_areal_mass'] * inputs['nacelle_wetted_area'] / count

        outputs['rated_thrust'] = rated
        outputs['core_shaft_power'] = power
        outputs['engine_mass'] = engine
        outputs['nacelle_mass'] = nacelle
        outputs['total_nacelle_mass'] = count * nacelle
        outputs['total_engine_mass'] = count * (engine + nacelle)

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
        count = self.options['count']
        cruise = inputs['cruise_thrust']
        ratio = inputs['rated_to_cruise_thrust']
        s_tf = inputs['static_thrust_per_power']
        p_ext = inputs['shaft_power_extracted']
        k_size = inputs['sizing_factor']
        diameter = inputs['fan_diameter']
        areal_fan = inputs['fan_areal_mass']
        p_core = inputs['core_specific_power']
        area_nac = inputs['nacelle_wetted_area']
        areal_nac = inputs['nacelle_areal_mass']
        rated = cruise * ratio
        power = rated / s_tf + k_size * p_ext / count

        partials['rated_thrust', 'cruise_thrust'] = ratio
        partials['rated_thrust', 'rated_to_cruise_thrust'] = cruise

        # Core shaft power; the core mass is power / p_core.
        d_power = {
            'cruise_thrust': ratio / s_tf,
            'rated_to_cruise_thrust': cruise / s_tf,
            'static_thrust_per_power': -rated / s_tf**2,
            'shaft_power_extracted': k_size / count,
            'sizing_factor': p_ext / count,
        }
        d_engine = {name: val / p_core for name, val in d_power.items()}
        d_engine['fan_diameter'] = areal_fan * 0.5 * np.pi * diameter
        d_engine['fan_areal_mass'] = 0.25 * np.pi * diameter**2
        d_engine['core_specific_power'] = -power / p_core**2
        d_nacelle = {
            'nacelle_wetted_area': areal_nac / count,
            'nacelle_areal_mass': area_nac / count,
        }

        for name, val in d_power.items():
            partials['core_shaft_power', name] = val
        for name, val in d_engine.items():
            partials['engine_mass', name] = val
            partials['total_engine_mass', name] = count * val
        for name, val in d_nacelle.items():
            partials['nacelle_mass', name] = val
            partials['total_nacelle_mass', name] = count * val
            partials['total_engine_mass', name] = count * val
