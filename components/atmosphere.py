"""International Standard Atmosphere (0-20 km) and the flight condition derived from it."""

import numpy as np

from voltwake.components.base import PointwiseComponent

# ISO 2533:1975 / ICAO Doc 7488 defining constants.
T0 = 288.15  # sea-level temperature, K
P0 = 101325.0  # sea-level pressure, Pa
LAPSE = 6.5e-3  # troposphere temperature lapse rate (temperature falls), K/m
H_TROPOPAUSE = 11000.0  # geopotential altitude of the tropopause, m
R_AIR = 287.05287  # specific gas constant of dry air, J/(kg K)
G0 = 9.80665  # standard acceleration of gravity, m/s**2
GAMMA = 1.4  # ratio of specific heats of air
BETA_S = 1.458e-6  # Sutherland constant, kg/(m s K**0.5)
S_SUTHERLAND = 110.4  # Sutherland temperature, K

T_TROPOPAUSE = T0 - LAPSE * H_TROPOPAUSE  # 216.65 K
_EXPONENT = G0 / (R_AIR * LAPSE)  # pressure exponent of the troposphere
P_TROPOPAUSE = P0 * (T_TROPOPAUSE / T0) ** _EXPONENT  # 22632.06 Pa, continuous at 11 km


class AtmosphereComp(PointwiseComponent):
    r"""
    International Standard Atmosphere from geopotential altitude, 0 to 20 km.

    Troposphere (H < 11 km), linear temperature and hydrostatic pressure:

    .. math::

        T = T_0 - L H, \qquad p = p_0 (T / T_0)^{g_0 / (R L)}

    Lower stratosphere (11 km <= H <= 20 km), isothermal:

    .. math::

        T = T_{11}, \qquad p = p_{11} \exp\left(-\frac{g_0 (H - H_{11})}{R T_{11}}\right)

    and in both layers

    .. math::

        \rho = \frac{p}{R T}, \qquad a = \sqrt{\gamma R T}, \qquad
        \mu = \frac{\beta_s T^{3/2}}{T + S}

    with T0 = 288.15 K, p0 = 101325 Pa, L = 6.5e-3 K/m, R = 287.05287 J/(kg K),
    g0 = 9.80665 m/s**2, gamma = 1.4, beta_s = 1.458e-6 kg/(m s K**0.5), S = 110.4 K
    (ISO 2533:1975 Standard Atmosphere; ICAO Doc 7488 Manual of the ICAO Standard Atmosphere).
    The tropopause pressure p11 is computed from the troposphere formula, so pressure is
    continuous at 11 km. The layer is chosen on the real part of the altitude (complex-step safe).
    Outside 0-20 km the two layer formulas are simply extended; they are not the standard there.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def setup(self):
        """
        Add the altitude input and the atmospheric state outputs.
        """
        n = self.options['vec_size']
        self.add_input('altitude', np.full(n, 10668.0), units='m', desc='Geopotential altitude')
        self.add_output('temperature', np.full(n, T0), units='K', desc='Static air temperature')
        self.add_output('pressure', np.full(n, P0), units='Pa', desc='Static air pressure')
        self.add_output('density', np.full(n, 1.225), units='kg/m**3', desc='Air density')
        self.add_output('speed_of_sound', np.full(n, 340.0), units='m/s', desc='Speed of sound')
        self.add_output(
            'viscosity', np.full(n, 1.8e-5), units='Pa*s', desc='Dynamic viscosity of air'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials(
            ['temperature', 'pressure', 'density', 'speed_of_sound', 'viscosity'], 'altitude'
        )

    def _temperature_pressure(self, altitude):
        """
        Return temperature, pressure and dT/dH at each point.

        Parameters
        ----------
        altitude : ndarray
            Geopotential altitude, m (may be complex).

        Returns
        -------
        tuple of ndarray
            Temperature (K), pressure (Pa) and temperature gradient dT/dH (K/m).
        """
        low = altitude.real < H_TROPOPAUSE
        temperature = np.where(low, T0 - LAPSE * altitude, T_TROPOPAUSE + 0.0 * altitude)
        dT_dh = np.where(low, -LAPSE, 0.0)
        pressure = np.empty_like(altitude)
        pressure[low] = P0 * (temperature[low] / T0) ** _EXPONENT
        pressure[~low] = P_TROPOPAUSE * np.exp(
            -G0 * (altitude[~low] - H_TROPOPAUSE) / (R_AIR * T_TROPOPAUSE)
        )
        return temperature, pressure, dT_dh

    def compute(self, inputs, outputs):
        """
        Compute the standard atmosphere state.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        temperature, pressure, _ = self._temperature_pressure(inputs['altitude'])
        outputs['temperature'] = temperature
        outputs['pressure'] = pressure
        outputs['density'] = pressure / (R_AIR * temperature)
        outputs['speed_of_sound'] = np.sqrt(GAMMA * R_AIR * temperature)
        outputs['viscosity'] = BETA_S * temperature**1.5 / (temperature + S_SUTHERLAND)

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials with respect to altitude.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        temperature, pressure, dT_dh = self._temperature_pressure(inputs['altitude'])
        density = pressure / (R_AIR * temperature)
        # Hydrostatic equation holds in both layers: dp/dH = -rho g0.
        dp_dh = -density * G0
        sutherland = temperature + S_SUTHERLAND
        dmu_dT = (
            BETA_S * (1.5 * np.sqrt(temperature) * sutherland - temperature**1.5) / sutherland**2
        )

        partials['temperature', 'altitude'] = dT_dh
        partials['pressure', 'altitude'] = dp_dh
        partials['density', 'altitude'] = (dp_dh - density * R_AIR * dT_dh) / (R_AIR * temperature)
        partials['speed_of_sound', 'altitude'] = 0.5 * np.sqrt(GAMMA * R_AIR / temperature) * dT_dh
        partials['viscosity', 'altitude'] = dmu_dT * dT_dh


class FlightConditionComp(PointwiseComponent):
    r"""
    Airspeed, dynamic pressure and isentropic total (stagnation) conditions from Mach number.

    .. math::

        V = M a, \qquad q = \tfrac{1}{2} \rho V^2, \qquad
        T_t = T \left(1 + \frac{\gamma - 1}{2} M^2\right), \qquad
        p_t = p \left(1 + \frac{\gamma - 1}{2} M^2\right)^{\gamma / (\gamma - 1)}

    with gamma = 1.4 (isentropic flow of a calorically perfect gas; e.g. Anderson, Modern
    Compressible Flow, ch. 3, from memory).

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
        self.add_input('mach', np.full(n, 0.78), units=None, desc='Flight Mach number')
        self.add_input('temperature', np.full(n, 218.8), units='K', desc='Static air temperature')
        self.add_input('pressure', np.full(n, 23842.0), units='Pa', desc='Static air pressure')
        self.add_input('density', np.full(n, 0.3796), units='kg/m**3', desc='Air density')
        self.add_input('speed_of_sound', np.full(n, 296.5), units='m/s', desc='Speed of sound')
        self.add_output('true_airspeed', np.full(n, 230.0), units='m/s', desc='True airspeed')
        self.add_output(
            'dynamic_pressure', np.full(n, 1.0e4), units='Pa', desc='Dynamic pressure 0.5 rho V**2'
        )
        self.add_output(
            'total_temperature', np.full(n, 245.0), units='K', desc='Isentropic total temperature'
        )
        self.add_output(
            'total_pressure', np.full(n, 3.7e4), units='Pa', desc='Isentropic total pressure'
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        self.declare_diagonal_partials('true_airspeed', ['mach', 'speed_of_sound'])
        self.declare_diagonal_partials('dynamic_pressure', ['mach', 'speed_of_sound', 'density'])
        self.declare_diagonal_partials('total_temperature', ['mach', 'temperature'])
        self.declare_diagonal_partials('total_pressure', ['mach', 'pressure'])

    def compute(self, inputs, outputs):
        """
        Compute airspeed, dynamic pressure and total conditions.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        mach = inputs['mach']
        speed = mach * inputs['speed_of_sound']
        ratio = 1.0 + 0.5 * (GAMMA - 1.0) * mach**2
        outputs['true_airspeed'] = speed
        outputs['dynamic_pressure'] = 0.5 * inputs['density'] * speed**2
        outputs['total_temperature'] = inputs['temperature'] * ratio
        outputs['total_pressure'] = inputs['pressure'] * ratio ** (GAMMA / (GAMMA - 1.0))

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
        sound = inputs['speed_of_sound']
        density = inputs['density']
        speed = mach * sound
        ratio = 1.0 + 0.5 * (GAMMA - 1.0) * mach**2
        dratio_dmach = (GAMMA - 1.0) * mach
        exponent = GAMMA / (GAMMA - 1.0)

        partials['true_airspeed', 'mach'] = sound
        partials['true_airspeed', 'speed_of_sound'] = mach
        partials['dynamic_pressure', 'mach'] = density * speed * sound
        partials['dynamic_pressure', 'speed_of_sound'] = density * speed * mach
        partials['dynamic_pressure', 'density'] = 0.5 * speed**2
        partials['total_temperature', 'mach'] = inputs['temperature'] * dratio_dmach
        partials['total_temperature', 'temperature'] = ratio
        partials['total_pressure', 'mach'] = (
            inputs['pressure'] * exponent * ratio ** (exponent - 1.0) * dratio_dmach
        )
        partials['total_pressure', 'pressure'] = ratio**exponent
