"""Define the fuselage boundary layer at the aft-fan station and the flow a fan captures from it."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.gas import CP_AIR, GAMMA


def _declare_profile_exponent(options):
    """
    Declare the ``profile_exponent`` option shared by the components of this module.

    Parameters
    ----------
    options : OptionsDictionary
        The component options.
    """
    options.declare(
        'profile_exponent',
        types=(int, float),
        default=7.0,
        lower=1.0,
        desc='Exponent n of the power-law velocity profile u/V = (y/delta)^(1/n).',
    )


def layer_flux_shapes(height, thickness, n, moment=0, powers=(1, 2, 3)):
    r"""
    Return the shape functions of the fluxes through a layer of a power-law boundary layer.

    For each k in ``powers`` (0 area, 1 mass, 2 momentum, 3 kinetic energy), with
    :math:`\eta = h/\delta`, the zeroth moment (``moment=0``, planar fluxes per unit
    perimeter) is

    .. math::

        f_k = \int_0^h \left(\frac{u}{V}\right)^k dy =
        \begin{cases}
            \delta \frac{n}{n+k} \eta^{(n+k)/n}, & \eta \le 1 \\
            h - \frac{k}{n+k} \delta, & \eta > 1
        \end{cases}

    and the first moment (``moment=1``, the curvature term of an annular layer) is

    .. math::

        g_k = \int_0^h \left(\frac{u}{V}\right)^k y \, dy =
        \begin{cases}
            \delta^2 \frac{n}{2n+k} \eta^{(2n+k)/n}, & \eta \le 1 \\
            \frac{h^2}{2} - \frac{k}{2(2n+k)} \delta^2, & \eta > 1
        \end{cases}

    The two branches meet with equal value and slope at :math:`\eta = 1`. For :math:`\eta < 0`
    (not physical; only a Newton iterate can stray there) the odd extension
    :math:`f(h) = -f(-h)` keeps the functions monotonic and defined.

    Parameters
    ----------
    height : ndarray
        Capture height h above the wall (m); may be complex.
    thickness : ndarray
        Boundary layer thickness delta (m); may be complex.
    n : float
        Exponent of the power-law profile.
    moment : int
        0 for f_k, 1 for g_k.
    powers : tuple of int
        The powers k to return.

    Returns
    -------
    f : list of ndarray
        Shape functions, one per power (m for moment 0, m**2 for moment 1).
    df_dh : list of ndarray
        Derivatives with respect to the height.
    df_dthick : list of ndarray
        Derivatives with respect to the thickness.
    """
    eta = height / thickness
    inner = eta.real <= 1.0
    sign = np.where(eta.real < 0.0, -1.0, 1.0)
    # On the inner branch eta_s = |eta| (by a sign flip, complex-step safe); the outer
    # branch is left untouched by the flip because sign = 1 there.
    eta_s = np.where(inner, sign * eta, 1.0)
    m1 = moment + 1
    scale = thickness**m1
    f, df_dh, df_dthick = [], [], []
    for k in powers:
        b_k = (m1 * n + k) / n
        c_k = n / (m1 * n + k)
        f_in = sign * scale * c_k * eta_s**b_k
        f_out = height**m1 / m1 - (k / (m1 * (m1 * n + k))) * scale
        f.append(np.where(inner, f_in, f_out))
        # d f / d h = (u/V)^k y^moment, the same on both branches (1 above the edge).
        slope = np.where(inner, eta_s ** (k / n), 1.0) * (sign * height) ** moment
        df_dh.append(slope)
        d_in = -sign * (k / (m1 * n + k)) * thickness**moment * eta_s**b_k
        d_out = -(k / (m1 * n + k)) * thickness**moment * np.ones_like(eta)
        df_dthick.append(np.where(inner, d_in, d_out))
    return f, df_dh, df_dthick


def annular_flux_shapes(height, thickness, radius, n, powers=(0, 1, 2, 3)):
    r"""
    Return the annular flux integrals of a power-law layer on a body of revolution.

    .. math::

        A_k = \int_0^h \left(\frac{u}{V}\right)^k 2\pi (r + y)\, dy = 2\pi (r f_k + g_k)

    with :math:`f_k, g_k` from :func:`layer_flux_shapes`. :math:`A_0` is the capture area
    :math:`\pi((r+h)^2 - r^2)`.

    Parameters
    ----------
    height : ndarray
        Capture height h above the wall (m).
    thickness : ndarray
        Boundary layer thickness delta (m).
    radius : ndarray
        Body radius r at the station (m).
    n : float
        Exponent of the power-law profile.
    powers : tuple of int
        The powers k to return.

    Returns
    -------
    area : list of ndarray
        A_k (m**2).
    d_h, d_thick, d_radius : list of ndarray
        Derivatives of A_k with respect to the height, the thickness and the radius.
    """
    f, f_h, f_d = layer_flux_shapes(height, thickness, n, 0, powers)
    g, g_h, g_d = layer_flux_shapes(height, thickness, n, 1, powers)
    two_pi = 2.0 * np.pi
    area = [two_pi * (radius * fk + gk) for fk, gk in zip(f, g)]
    d_h = [two_pi * (radius * a + b) for a, b in zip(f_h, g_h)]
    d_thick = [two_pi * (radius * a + b) for a, b in zip(f_d, g_d)]
    d_radius = [two_pi * fk for fk in f]
    return area, d_h, d_thick, d_radius


class FuselageBoundaryLayerComp(PointwiseComponent):
    r"""
    Thickness of the fuselage boundary layer at the aft-fan station.

    Far downstream the momentum deficit of the wake equals the fuselage drag. At the fan
    station the layer lies on a body of radius :math:`r_s = k_s d_{fus}/2` and is not thin
    compared with it, so the deficit is integrated over the annulus. With the power-law
    profile :math:`u/V = (y/\delta)^{1/n}`:

    .. math::

        \frac{D_{fus}}{\rho V^2} = \int_0^\delta \frac{u}{V}\left(1 - \frac{u}{V}\right)
        2\pi (r_s + y)\, dy = 2\pi \left(a_1 r_s \delta + a_2 \delta^2\right),
        \quad a_1 = \frac{n}{(n+1)(n+2)}, \quad a_2 = \frac{n}{(2n+1)(2n+2)}

    whose positive root is

    .. math::

        \delta = \frac{2K}{a_1 r_s + \sqrt{a_1^2 r_s^2 + 4 a_2 K}}, \qquad
        K = \frac{D_{fus}}{2\pi\rho V^2}, \qquad \theta = a_1 \delta

    (:math:`\theta` is the momentum thickness of the profile, planar definition). For a
    thin layer (:math:`\delta \ll r_s`) this tends to :math:`\theta = D/(\rho V^2 2\pi r_s)`.
    The momentum-deficit/drag relation is from Schlichting, Boundary-Layer Theory (momentum
    integral, drag of a body from its wake; common practice); the coefficients follow from
    integrating the power-law profile (n = 7 gives a_1 = 7/72, a_2 = 7/240).

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
        _declare_profile_exponent(self.options)

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'fuselage_drag',
            8.0e3 * np.ones(n),
            units='N',
            desc='Drag of the fuselage whose boundary layer reaches the fan.',
        )
        self.add_input('density', 0.38 * np.ones(n), units='kg/m**3', desc='Free-stream density.')
        self.add_input(
            'true_airspeed',
            230.0 * np.ones(n),
            units='m/s',
            desc='Free-stream velocity relative to the aircraft.',
        )
        self.add_input(
            'fuselage_diameter', 4.0 * np.ones(n), units='m', desc='Maximum fuselage diameter.'
        )
        self.add_input(
            'station_diameter_ratio',
            0.45 * np.ones(n),
            units=None,
            desc='Fuselage diameter at the fan station / maximum fuselage diameter.',
        )

        self.add_output(
            'station_diameter',
            1.8 * np.ones(n),
            units='m',
            desc='Fuselage diameter at the fan station (the aft-fan hub diameter).',
        )
        self.add_output(
            'momentum_thickness',
            0.05 * np.ones(n),
            units='m',
            desc='Momentum thickness of the boundary-layer profile at the fan station.',
        )
        self.add_output(
            'boundary_layer_thickness',
            0.5 * np.ones(n),
            units='m',
            desc='Boundary layer thickness delta at the fan station.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        geometry = ['fuselage_diameter', 'station_diameter_ratio']
        self.declare_diagonal_partials('station_diameter', geometry)
        self.declare_diagonal_partials(
            ['momentum_thickness', 'boundary_layer_thickness'],
            ['fuselage_drag', 'density', 'true_airspeed'] + geometry,
        )

    def _coefficients(self):
        """
        Return the profile coefficients a_1 and a_2.

        Returns
        -------
        tuple of float
            a_1 = n/((n+1)(n+2)) and a_2 = n/((2n+1)(2n+2)).
        """
        n = self.options['profile_exponent']
        return n / ((n + 1.0) * (n + 2.0)), n / ((2.0 * n + 1.0) * (2.0 * n + 2.0))

    def _thickness(self, inputs):
        """
        Return the station radius, K and the layer thickness.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        tuple of ndarray
            r_s (m), K (m**2) and delta (m).
        """
        a_1, a_2 = self._coefficients()
        radius = 0.5 * inputs['station_diameter_ratio'] * inputs['fuselage_diameter']
        k_def = inputs['fuselage_drag'] / (
            2.0 * np.pi * inputs['density'] * inputs['true_airspeed'] ** 2
        )
        delta = 2.0 * k_def / (a_1 * radius + np.sqrt((a_1 * radius) ** 2 + 4.0 * a_2 * k_def))
        return radius, k_def, delta

    def compute(self, inputs, outputs):
        """
        Compute the station diameter, momentum thickness and boundary layer thickness.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        a_1, _ = self._coefficients()
        radius, _, delta = self._thickness(inputs)
        outputs['station_diameter'] = 2.0 * radius
        outputs['momentum_thickness'] = a_1 * delta
        outputs['boundary_layer_thickness'] = delta

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials (implicit differentiation of the quadratic).

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        a_1, a_2 = self._coefficients()
        radius, k_def, delta = self._thickness(inputs)
        diam = inputs['fuselage_diameter']
        ratio = inputs['station_diameter_ratio']

        partials['station_diameter', 'fuselage_diameter'] = ratio
        partials['station_diameter', 'station_diameter_ratio'] = diam

        # a_1 r delta + a_2 delta^2 = K  =>  d delta = (dK - a_1 delta dr) / J
        jac = a_1 * radius + 2.0 * a_2 * delta
        d_delta_dk = 1.0 / jac
        d_delta_dr = -a_1 * delta / jac
        d_delta = {
            'fuselage_drag': d_delta_dk * k_def / inputs['fuselage_drag'],
            'density': -d_delta_dk * k_def / inputs['density'],
            'true_airspeed': -2.0 * d_delta_dk * k_def / inputs['true_airspeed'],
            'fuselage_diameter': d_delta_dr * 0.5 * ratio,
            'station_diameter_ratio': d_delta_dr * 0.5 * diam,
        }
        for name, value in d_delta.items():
            partials['boundary_layer_thickness', name] = value
            partials['momentum_thickness', name] = a_1 * value


class IngestedFlowComp(PointwiseComponent):
    r"""
    Flows a fan captures from the fuselage boundary layer, and their mixed-out state.

    The fan captures the layer from the wall at the station radius :math:`r_s` up to the
    height h. With the power-law profile :math:`u/V = (y/\delta)^{1/n}`, a density equal to
    the free-stream density (incompressible profile; documented simplification) and the
    annular integrals :math:`A_k = \int_0^h (u/V)^k \, 2\pi(r_s + y)\, dy` of
    :func:`annular_flux_shapes` (curvature of the body included):

    .. math::

        A_c = A_0 = \pi\left((r_s + h)^2 - r_s^2\right), \quad
        \dot m = \rho V A_1, \quad \dot M = \rho V^2 A_2, \quad \dot E = \tfrac12 \rho V^3 A_3

    The averaged inflow velocities are :math:`V_m = \dot M/\dot m` (momentum average, sets
    the ram drag of the fan) and :math:`V_e = \sqrt{2\dot E/\dot m}` (kinetic-energy
    average). The inflow total pressure is the mixed-out value: the captured stream mixed
    to a uniform state in a duct of constant area :math:`A_c` conserving mass and momentum
    (constant density, as the profile):

    .. math::

        V_x = \frac{\dot m}{\rho A_c}, \qquad
        p_x = p + \frac{\dot M - \dot m V_x}{A_c}, \qquad
        p_{t,in} = p_x \left(\frac{T_t}{T_t - V_x^2/(2 c_p)}\right)^{\gamma/(\gamma-1)}

    The mixing loss (the total pressure below the energy-averaged :math:`p + \rho V_e^2/2`)
    is part of it. The inflow total temperature equals the free-stream total temperature
    (adiabatic wall; common practice). The non-uniformity of the captured stream is the
    mass-weighted variance of the axial velocity over its mass-weighted mean square:

    .. math::

        \psi = 1 - \frac{V_m^2}{V_e^2} = 1 - \frac{A_2^2}{A_1 A_3}

    (0 for uniform inflow; :math:`1/(n+2)^2` for any planar capture inside the layer). The
    flux integrals are those of the power-law profile (Schlichting, Boundary-Layer Theory;
    common practice); the constant-area mixed-out average is the standard one-dimensional
    averaging of a non-uniform stream (Cumpsty, Jet Propulsion, 2nd ed.; common practice).

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
        _declare_profile_exponent(self.options)

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'capture_height',
            0.3 * np.ones(n),
            units='m',
            desc='Height above the fuselage wall up to which the fan captures flow.',
        )
        self.add_input(
            'boundary_layer_thickness',
            0.5 * np.ones(n),
            units='m',
            desc='Boundary layer thickness delta at the fan station.',
        )
        self.add_input(
            'station_diameter',
            1.8 * np.ones(n),
            units='m',
            desc='Fuselage diameter at the fan station.',
        )
        self.add_input('density', 0.38 * np.ones(n), units='kg/m**3', desc='Free-stream density.')
        self.add_input(
            'true_airspeed',
            230.0 * np.ones(n),
            units='m/s',
            desc='Free-stream velocity relative to the aircraft.',
        )
        self.add_input(
            'static_pressure', 2.4e4 * np.ones(n), units='Pa', desc='Free-stream static pressure.'
        )
        self.add_input(
            'total_temperature',
            245.0 * np.ones(n),
            units='K',
            desc='Free-stream total temperature.',
        )

        self.add_output(
            'captured_mass_flow',
            100.0 * np.ones(n),
            units='kg/s',
            desc='Mass flow captured from the wall up to the capture height.',
        )
        self.add_output(
            'ingested_momentum_flow',
            2.0e4 * np.ones(n),
            units='N',
            desc='Momentum flow of the captured stream.',
        )
        self.add_output(
            'ingested_kinetic_energy_flow',
            2.0e6 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Kinetic energy flow of the captured stream.',
        )
        self.add_output(
            'capture_area',
            2.0 * np.ones(n),
            units='m**2',
            desc='Area of the captured annulus upstream of the fan.',
        )
        self.add_output(
            'ram_velocity',
            200.0 * np.ones(n),
            units='m/s',
            desc='Momentum-averaged inflow velocity (sets the ram drag).',
        )
        self.add_output(
            'energy_velocity',
            200.0 * np.ones(n),
            units='m/s',
            desc='Kinetic-energy-averaged inflow velocity.',
        )
        self.add_output(
            'inflow_total_pressure',
            3.5e4 * np.ones(n),
            units='Pa',
            desc='Mixed-out (constant area) total pressure of the captured stream.',
        )
        self.add_output(
            'inflow_nonuniformity',
            0.01 * np.ones(n),
            units=None,
            desc='1 - V_m**2/V_e**2: mass-weighted velocity variance over mean square.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        geometry = ['capture_height', 'boundary_layer_thickness', 'station_diameter']
        self.declare_diagonal_partials(
            ['captured_mass_flow', 'ingested_momentum_flow', 'ingested_kinetic_energy_flow'],
            geometry + ['density', 'true_airspeed'],
        )
        self.declare_diagonal_partials('capture_area', ['capture_height', 'station_diameter'])
        self.declare_diagonal_partials(
            ['ram_velocity', 'energy_velocity'], geometry + ['true_airspeed']
        )
        self.declare_diagonal_partials(
            'inflow_total_pressure',
            geometry + ['density', 'true_airspeed', 'static_pressure', 'total_temperature'],
        )
        self.declare_diagonal_partials('inflow_nonuniformity', geometry)

    def _areas(self, inputs):
        """
        Return the annular integrals A_0..A_3 and their geometric derivatives.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        tuple of list of ndarray
            A_k, dA_k/dh, dA_k/ddelta, dA_k/d(station diameter).
        """
        area, d_h, d_thick, d_radius = annular_flux_shapes(
            inputs['capture_height'],
            inputs['boundary_layer_thickness'],
            0.5 * inputs['station_diameter'],
            self.options['profile_exponent'],
        )
        return area, d_h, d_thick, [0.5 * d for d in d_radius]

    @staticmethod
    def _mixed_out(area, rho, speed, p_static, tt):
        """
        Return the mixed-out velocity, static pressure, temperature ratio and total pressure.

        Parameters
        ----------
        area : list of ndarray
            A_0..A_3 (m**2).
        rho, speed, p_static, tt : ndarray
            Free-stream density, speed, static pressure and total temperature.

        Returns
        -------
        dict
            Intermediate quantities keyed by name.
        """
        a0, a1, a2, _ = area
        s = {'q': a2 / a0 - (a1 / a0) ** 2}
        s['vx'] = speed * a1 / a0
        s['px'] = p_static + rho * speed**2 * s['q']
        s['tx'] = tt - s['vx'] ** 2 / (2.0 * CP_AIR)
        s['x'] = tt / s['tx']
        s['e'] = GAMMA / (GAMMA - 1.0)
        s['pt'] = s['px'] * s['x'] ** s['e']
        return s

    def compute(self, inputs, outputs):
        """
        Compute the captured flows, averaged velocities and mixed-out total pressure.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        area, _, _, _ = self._areas(inputs)
        a0, a1, a2, a3 = area
        rho = inputs['density']
        speed = inputs['true_airspeed']
        s = self._mixed_out(
            area, rho, speed, inputs['static_pressure'], inputs['total_temperature']
        )
        outputs['captured_mass_flow'] = rho * speed * a1
        outputs['ingested_momentum_flow'] = rho * speed**2 * a2
        outputs['ingested_kinetic_energy_flow'] = 0.5 * rho * speed**3 * a3
        outputs['capture_area'] = a0
        outputs['ram_velocity'] = speed * a2 / a1
        outputs['energy_velocity'] = speed * np.sqrt(a3 / a1)
        outputs['inflow_total_pressure'] = s['pt']
        outputs['inflow_nonuniformity'] = 1.0 - a2**2 / (a1 * a3)

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials by the chain rule through A_0..A_3.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        area, d_h, d_thick, d_diam = self._areas(inputs)
        a0, a1, a2, a3 = area
        rho = inputs['density']
        speed = inputs['true_airspeed']
        tt = inputs['total_temperature']
        s = self._mixed_out(area, rho, speed, inputs['static_pressure'], tt)
        v_e = speed * np.sqrt(a3 / a1)

        # Sensitivities of each output to A_0..A_3 (index k).
        d_pt_dpx = s['x'] ** s['e']
        d_pt_dx = s['e'] * s['px'] * s['x'] ** (s['e'] - 1.0)
        d_x_dvx = tt * s['vx'] / (CP_AIR * s['tx'] ** 2)
        d_pt_dvx = d_pt_dx * d_x_dvx
        d_q = {0: -a2 / a0**2 + 2.0 * a1**2 / a0**3, 1: -2.0 * a1 / a0**2, 2: 1.0 / a0}
        d_vx = {0: -speed * a1 / a0**2, 1: speed / a0}
        by_area = {
            'captured_mass_flow': {1: rho * speed},
            'ingested_momentum_flow': {2: rho * speed**2},
            'ingested_kinetic_energy_flow': {3: 0.5 * rho * speed**3},
            'capture_area': {0: 1.0},
            'ram_velocity': {1: -speed * a2 / a1**2, 2: speed / a1},
            'energy_velocity': {1: -0.5 * v_e / a1, 3: 0.5 * v_e / a3},
            'inflow_total_pressure': {
                k: d_pt_dpx * rho * speed**2 * d_q.get(k, 0.0) + d_pt_dvx * d_vx.get(k, 0.0)
                for k in (0, 1, 2)
            },
            'inflow_nonuniformity': {
                1: a2**2 / (a1**2 * a3),
                2: -2.0 * a2 / (a1 * a3),
                3: a2**2 / (a1 * a3**2),
            },
        }
        geometry = (
            ('capture_height', d_h),
            ('boundary_layer_thickness', d_thick),
            ('station_diameter', d_diam),
        )
        for out, sens in by_area.items():
            for name, d_area in geometry:
                if out == 'capture_area' and name == 'boundary_layer_thickness':
                    continue
                partials[out, name] = sum(value * d_area[k] for k, value in sens.items())

        partials['captured_mass_flow', 'density'] = speed * a1
        partials['captured_mass_flow', 'true_airspeed'] = rho * a1
        partials['ingested_momentum_flow', 'density'] = speed**2 * a2
        partials['ingested_momentum_flow', 'true_airspeed'] = 2.0 * rho * speed * a2
        partials['ingested_kinetic_energy_flow', 'density'] = 0.5 * speed**3 * a3
        partials['ingested_kinetic_energy_flow', 'true_airspeed'] = 1.5 * rho * speed**2 * a3
        partials['ram_velocity', 'true_airspeed'] = a2 / a1
        partials['energy_velocity', 'true_airspeed'] = np.sqrt(a3 / a1)
        partials['inflow_total_pressure', 'density'] = d_pt_dpx * speed**2 * s['q']
        partials['inflow_total_pressure', 'true_airspeed'] = (
            d_pt_dpx * 2.0 * rho * speed * s['q'] + d_pt_dvx * a1 / a0
        )
        partials['inflow_total_pressure', 'static_pressure'] = d_pt_dpx
        partials['inflow_total_pressure', 'total_temperature'] = (
            -d_pt_dx * s['vx'] ** 2 / (2.0 * CP_AIR * s['tx'] ** 2)
        )
