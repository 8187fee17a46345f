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


def layer_flux_shapes(height, thickness, n):
    r"""
    Return the shape functions of the fluxes through a layer of a power-law boundary layer.

    For k = 1, 2, 3 (mass, momentum, kinetic energy) and :math:`\eta = h/\delta`:

    .. math::

        f_k = \int_0^h \left(\frac{u}{V}\right)^k dy =
        \begin{cases}
            \delta \frac{n}{n+k} \eta^{(n+k)/n}, & \eta \le 1 \\
            h - \frac{k}{n+k} \delta, & \eta > 1
        \end{cases}

    The two branches meet with equal value and slope at :math:`\eta = 1`. For :math:`\eta < 0`
    (not physical; only a Newton iterate can stray there) the odd extension
    :math:`f_k(h) = -f_k(-h)` keeps the functions monotonic and defined.

    Parameters
    ----------
    height : ndarray
        Capture height h above the wall (m); may be complex.
    thickness : ndarray
        Boundary layer thickness delta (m); may be complex.
    n : float
        Exponent of the power-law profile.

    Returns
    -------
    f : list of ndarray
        Shape functions f_1, f_2, f_3 (m).
    df_dh : list of ndarray
        Derivatives of f_k with respect to the height (dimensionless).
    df_dthick : list of ndarray
        Derivatives of f_k with respect to the thickness (dimensionless).
    """
    eta = height / thickness
    inner = eta.real <= 1.0
    sign = np.where(eta.real < 0.0, -1.0, 1.0)
    # On the inner branch eta_s = |eta| (by a sign flip, complex-step safe); the outer
    # branch is left untouched by the flip because sign = 1 there.
    eta_s = sign * eta
    f, df_dh, df_dthick = [], [], []
    for k in (1, 2, 3):
        c_k = k / (n + k)
        b_k = (n + k) / n
        eta_in = np.where(inner, eta_s, 1.0)
        f_in = sign * thickness * (n / (n + k)) * eta_in**b_k
        f_out = height - c_k * thickness
        f.append(np.where(inner, f_in, f_out))
        df_dh.append(np.where(inner, eta_in ** (k / n), 1.0))
        df_dthick.append(np.where(inner, -sign * c_k * eta_in**b_k, -c_k))
    return f, df_dh, df_dthick


class FuselageBoundaryLayerComp(PointwiseComponent):
    r"""
    Thickness of the fuselage boundary layer at the aft-fan station.

    Far downstream the momentum deficit of the wake equals the fuselage drag; in the planar
    approximation (layer thin compared to the local radius) the momentum thickness at the fan
    station is that deficit spread over the local perimeter. A power-law velocity profile
    :math:`u/V = (y/\delta)^{1/n}` then gives the layer thickness:

    .. math::

        C = \pi\, r_s\, d_{fus}, \qquad
        \theta = \frac{D_{fus}}{\rho V^2 C}, \qquad
        \frac{\theta}{\delta} = \frac{n}{(n+1)(n+2)}

    The momentum-deficit/drag relation is from Schlichting, Boundary-Layer Theory (momentum
    integral, drag of a body from its wake; common practice); the thickness ratio follows
    from integrating the power-law profile (n = 7 gives 7/72).

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
            0.6 * np.ones(n),
            units=None,
            desc='Fuselage diameter at the fan station / maximum fuselage diameter.',
        )

        self.add_output(
            'perimeter', 7.5 * np.ones(n), units='m', desc='Fuselage perimeter at the fan station.'
        )
        self.add_output(
            'momentum_thickness',
            0.05 * np.ones(n),
            units='m',
            desc='Momentum thickness of the boundary layer at the fan station.',
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
        self.declare_diagonal_partials('perimeter', ['fuselage_diameter', 'station_diameter_ratio'])
        self.declare_diagonal_partials(
            ['momentum_thickness', 'boundary_layer_thickness'],
            [
                'fuselage_drag',
                'density',
                'true_airspeed',
                'fuselage_diameter',
                'station_diameter_ratio',
            ],
        )

    def _thickness_ratio(self):
        """
        Return delta / theta of the power-law profile.

        Returns
        -------
        float
            (n + 1)(n + 2) / n.
        """
        n = self.options['profile_exponent']
        return (n + 1.0) * (n + 2.0) / n

    def compute(self, inputs, outputs):
        """
        Compute perimeter, momentum thickness and boundary layer thickness.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        perimeter = np.pi * inputs['station_diameter_ratio'] * inputs['fuselage_diameter']
        theta = inputs['fuselage_drag'] / (
            inputs['density'] * inputs['true_airspeed'] ** 2 * perimeter
        )
        outputs['perimeter'] = perimeter
        outputs['momentum_thickness'] = theta
        outputs['boundary_layer_thickness'] = self._thickness_ratio() * theta

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
        drag = inputs['fuselage_drag']
        rho = inputs['density']
        speed = inputs['true_airspeed']
        diam = inputs['fuselage_diameter']
        ratio = inputs['station_diameter_ratio']
        theta = drag / (rho * speed**2 * np.pi * ratio * diam)

        partials['perimeter', 'fuselage_diameter'] = np.pi * ratio
        partials['perimeter', 'station_diameter_ratio'] = np.pi * diam

        d_theta = {
            'fuselage_drag': theta / drag,
            'density': -theta / rho,
            'true_airspeed': -2.0 * theta / speed,
            'fuselage_diameter': -theta / diam,
            'station_diameter_ratio': -theta / ratio,
        }
        k_delta = self._thickness_ratio()
        for name, value in d_theta.items():
            partials['momentum_thickness', name] = value
            partials['boundary_layer_thickness', name] = k_delta * value


class IngestedFlowComp(PointwiseComponent):
    r"""
    Mass, momentum and kinetic-energy flows a fan captures from the fuselage boundary layer.

    The fan captures the layer from the wall up to the height h, all around the perimeter C.
    With the power-law profile :math:`u/V = (y/\delta)^{1/n}`, a density equal to the
    free-stream density (incompressible profile; documented simplification) and
    :math:`\eta = h/\delta`, the captured flows for :math:`h \le \delta` are

    .. math::

        \dot m = C \rho V \delta \frac{n}{n+1} \eta^{(n+1)/n}, \quad
        \dot M = C \rho V^2 \delta \frac{n}{n+2} \eta^{(n+2)/n}, \quad
        \dot E = \tfrac12 C \rho V^3 \delta \frac{n}{n+3} \eta^{(n+3)/n}

    and for :math:`h > \delta` the free-stream flow through :math:`h - \delta` is added
    (:math:`C\rho V`, :math:`C\rho V^2`, :math:`\tfrac12 C \rho V^3` times :math:`h-\delta`).
    Both branches join with equal value and slope at :math:`h = \delta`.
    The averaged inflow velocities and the inflow total pressure are

    .. math::

        V_m = \frac{\dot M}{\dot m}, \qquad
        V_e = \sqrt{\frac{2 \dot E}{\dot m}}, \qquad
        p_{t,in} = p \left(\frac{T_t}{T_t - V_e^2 / (2 c_p)}\right)^{\gamma/(\gamma-1)}

    :math:`V_m` (momentum average) sets the ram drag of the fan; :math:`V_e`
    (kinetic-energy average) sets the mixed-out total pressure at the fan face. The inflow
    total temperature equals the free-stream total temperature (adiabatic wall; common
    practice), so :math:`T_t` is the free-stream total temperature. The flux integrals are
    those of the power-law profile (Schlichting, Boundary-Layer Theory; common practice); the
    averaging by momentum and by kinetic energy is common practice for ingested flows.

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
            'perimeter', 7.5 * np.ones(n), units='m', desc='Fuselage perimeter at the fan station.'
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
            desc='Mixed-out total pressure of the captured stream.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        geometry = ['capture_height', 'boundary_layer_thickness']
        self.declare_diagonal_partials(
            ['captured_mass_flow', 'ingested_momentum_flow', 'ingested_kinetic_energy_flow'],
            geometry + ['perimeter', 'density', 'true_airspeed'],
        )
        self.declare_diagonal_partials(
            ['ram_velocity', 'energy_velocity'], geometry + ['true_airspeed']
        )
        self.declare_diagonal_partials(
            'inflow_total_pressure',
            geometry + ['true_airspeed', 'static_pressure', 'total_temperature'],
        )

    def compute(self, inputs, outputs):
        """
        Compute the captured flows, averaged velocities and inflow total pressure.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        (f1, f2, f3), _, _ = layer_flux_shapes(
            inputs['capture_height'],
            inputs['boundary_layer_thickness'],
            self.options['profile_exponent'],
        )
        speed = inputs['true_airspeed']
        flux = inputs['perimeter'] * inputs['density'] * speed
        tt = inputs['total_temperature']
        ratio_e = f3 / f1
        dyn_temp = speed**2 * ratio_e / (2.0 * CP_AIR)

        outputs['captured_mass_flow'] = flux * f1
        outputs['ingested_momentum_flow'] = flux * speed * f2
        outputs['ingested_kinetic_energy_flow'] = 0.5 * flux * speed**2 * f3
        outputs['ram_velocity'] = speed * f2 / f1
        outputs['energy_velocity'] = speed * np.sqrt(ratio_e)
        outputs['inflow_total_pressure'] = inputs['static_pressure'] * (tt / (tt - dyn_temp)) ** (
            GAMMA / (GAMMA - 1.0)
        )

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
        (f1, f2, f3), df_dh, df_dd = layer_flux_shapes(
            inputs['capture_height'],
            inputs['boundary_layer_thickness'],
            self.options['profile_exponent'],
        )
        perim = inputs['perimeter']
        rho = inputs['density']
        speed = inputs['true_airspeed']
        p_static = inputs['static_pressure']
        tt = inputs['total_temperature']
        flux = perim * rho * speed
        expo = GAMMA / (GAMMA - 1.0)

        ratio_e = f3 / f1
        sqrt_e = np.sqrt(ratio_e)
        dyn_temp = speed**2 * ratio_e / (2.0 * CP_AIR)
        t_static = tt - dyn_temp
        x_ratio = tt / t_static
        dpt_dx = p_static * expo * x_ratio ** (expo - 1.0)
        dx_dq = tt / t_static**2
        dq_dratio = speed**2 / (2.0 * CP_AIR)

        flows = (
            ('captured_mass_flow', 1.0, f1, 1),
            ('ingested_momentum_flow', 1.0, f2, 2),
            ('ingested_kinetic_energy_flow', 0.5, f3, 3),
        )
        for name, coef, f_k, k in flows:
            scale = coef * flux * speed ** (k - 1)
            partials[name, 'capture_height'] = scale * df_dh[k - 1]
            partials[name, 'boundary_layer_thickness'] = scale * df_dd[k - 1]
            partials[name, 'perimeter'] = scale * f_k / perim
            partials[name, 'density'] = scale * f_k / rho
            partials[name, 'true_airspeed'] = k * scale * f_k / speed

        partials['ram_velocity', 'true_airspeed'] = f2 / f1
        partials['energy_velocity', 'true_airspeed'] = sqrt_e
        partials['inflow_total_pressure', 'true_airspeed'] = (
            dpt_dx * dx_dq * speed * ratio_e / CP_AIR
        )
        partials['inflow_total_pressure', 'static_pressure'] = x_ratio**expo
        partials['inflow_total_pressure', 'total_temperature'] = -dpt_dx * dyn_temp / t_static**2

        geometry = (('capture_height', df_dh), ('boundary_layer_thickness', df_dd))
        for name, d_f in geometry:
            d_ratio_m = (d_f[1] * f1 - f2 * d_f[0]) / f1**2
            d_ratio_e = (d_f[2] * f1 - f3 * d_f[0]) / f1**2
            partials['ram_velocity', name] = speed * d_ratio_m
            partials['energy_velocity', name] = speed * d_ratio_e / (2.0 * sqrt_e)
            partials['inflow_total_pressure', name] = dpt_dx * dx_dq * dq_dratio * d_ratio_e
