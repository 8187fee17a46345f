"""Define the CableComp class: DC distribution cable with supply and return conductors."""

import numpy as np

from voltwake.components.base import PointwiseComponent

# Inputs that set the cable's relative loss k = 2 rho_e L J_lim / (k_size V).
_LOSS_INPUTS = ('resistivity', 'length', 'current_density_limit', 'sizing_factor', 'voltage')
# Inputs that, with output_power, set the current, the conductor size and the loss.
_POWER_INPUTS = _LOSS_INPUTS + ('output_power',)


class CableComp(PointwiseComponent):
    r"""
    DC distribution cable made of a supply and a return conductor of equal size.

    Each conductor is sized so that it carries the rated current (cruise current times a
    sizing factor) at the allowed current density; the resistive loss follows at cruise
    current from Ohm's law and Joule's law (common practice):

    .. math::

        A = \frac{k_{size} I}{J_{lim}}, \qquad
        R = \frac{2 \rho_e L}{A}, \qquad
        I = \frac{P_{in}}{V}, \qquad
        P_{loss} = I^2 R

    where :math:`V` is the bus voltage at the source end and :math:`L` the one-way length.
    The cruise current density is :math:`J = I / A = J_{lim} / k_{size}`, so

    .. math::

        P_{loss} = 2 \rho_e L J I = P_{in} \frac{2 \rho_e L J_{lim}}{k_{size} V} = k P_{in}

    and, with :math:`P_{in} = P_{out} + P_{loss}`, the closed form

    .. math::

        \eta = 1 - k = 1 - \frac{2 \rho_e L J_{lim}}{k_{size} V}, \qquad
        P_{in} = \frac{P_{out}}{\eta}.

    The relative loss equals the relative voltage drop :math:`I R / V`. The component
    evaluates :math:`\eta` and :math:`P_{in}` from the closed form, then the current, the
    conductor area, the resistance and the loss :math:`I^2 R` explicitly. The cable mass
    counts both conductors, :math:`m = 2 L A \rho_m f_m`, where :math:`f_m` adds insulation,
    shield and support mass per conductor mass. The model is meaningful for :math:`k < 1`.

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
        self.add_input(
            'output_power',
            1.0e6 * np.ones(n),
            units='W',
            desc='Power delivered at the load end of the cable at cruise.',
        )
        self.add_input(
            'voltage', 1000.0 * np.ones(n), units='V', desc='Bus voltage at the source end.'
        )
        self.add_input('length', 20.0 * np.ones(n), units='m', desc='One-way cable length.')
        self.add_input(
            'current_density_limit',
            5.0e6 * np.ones(n),
            units='A/m**2',
            desc='Allowed conductor current density at rated current.',
        )
        self.add_input(
            'sizing_factor', np.ones(n), units=None, desc='Rated current / cruise current (>= 1).'
        )
        self.add_input(
            'resistivity',
            1.7e-8 * np.ones(n),
            units='ohm*m',
            desc='Electrical resistivity of the conductor material.',
        )
        self.add_input(
            'conductor_density',
            9000.0 * np.ones(n),
            units='kg/m**3',
            desc='Density of the conductor material.',
        )
        self.add_input(
            'mass_factor',
            1.6 * np.ones(n),
            units=None,
            desc='Total cable mass / conductor mass (insulation, shield, support).',
        )

        self.add_output(
            'input_power',
            1.0e6 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Power fed into the cable at the source end at cruise.',
        )
        self.add_output(
            'loss',
            1.0e3 * np.ones(n),
            units='W',
            ref=1e6,
            desc='Resistive loss of both conductors at cruise.',
        )
        self.add_output('efficiency', np.ones(n), units=None, desc='Output power / input power.')
        self.add_output('current', 1.0e3 * np.ones(n), units='A', desc='Cruise current.')
        self.add_output(
            'rated_current',
            1.0e3 * np.ones(n),
            units='A',
            desc='Rated current the conductors are sized for.',
        )
        self.add_output(
            'cross_section_area',
            2.0e-4 * np.ones(n),
            units='m**2',
            desc='Cross-section area of one conductor.',
        )
        self.add_output(
            'resistance',
            1.0e-3 * np.ones(n),
            units='ohm',
            desc='Loop resistance (supply plus return conductor).',
        )
        self.add_output(
            'current_density',
            5.0e6 * np.ones(n),
            units='A/m**2',
            desc='Conductor current density at cruise.',
        )
        self.add_output(
            'mass',
            50.0 * np.ones(n),
            units='kg',
            desc='Cable mass, both conductors with insulation and support.',
        )
        self.add_output(
            'voltage_drop',
            1.0 * np.ones(n),
            units='V',
            desc='Voltage drop over the loop at cruise.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        self.declare_diagonal_partials('efficiency', _LOSS_INPUTS)
        self.declare_diagonal_partials('voltage_drop', _LOSS_INPUTS)
        self.declare_diagonal_partials(
            ['input_power', 'loss', 'current', 'rated_current', 'cross_section_area', 'resistance'],
            _POWER_INPUTS,
        )
        self.declare_diagonal_partials(
            'current_density', ['current_density_limit', 'sizing_factor']
        )
        self.declare_diagonal_partials('mass', _POWER_INPUTS + ('conductor_density', 'mass_factor'))

    def compute(self, inputs, outputs):
        """
        Compute cable power, current, conductor size, loss and mass.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        p_out = inputs['output_power']
        volt = inputs['voltage']
        length = inputs['length']
        j_lim = inputs['current_density_limit']
        k_size = inputs['sizing_factor']
        rho_e = inputs['resistivity']

        eta = 1.0 - 2.0 * rho_e * length * j_lim / (k_size * volt)
        p_in = p_out / eta
        current = p_in / volt
        rated_current = k_size * current
        area = rated_current / j_lim
        resistance = 2.0 * rho_e * length / area

        outputs['efficiency'] = eta
        outputs['input_power'] = p_in
        outputs['current'] = current
        outputs['rated_current'] = rated_current
        outputs['cross_section_area'] = area
        outputs['resistance'] = resistance
        outputs['loss'] = current**2 * resistance
        outputs['current_density'] = j_lim / k_size
        outputs['voltage_drop'] = current * resistance
        outputs['mass'] = 2.0 * length * area * inputs['conductor_density'] * inputs['mass_factor']

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
        p_out = inputs['output_power']
        volt = inputs['voltage']
        length = inputs['length']
        j_lim = inputs['current_density_limit']
        k_size = inputs['sizing_factor']
        rho_e = inputs['resistivity']
        rho_m = inputs['conductor_density']
        f_m = inputs['mass_factor']

        # Relative loss k and its derivatives.
        k = 2.0 * rho_e * length * j_lim / (k_size * volt)
        d_k = {
            'resistivity': 2.0 * length * j_lim / (k_size * volt),
            'length': 2.0 * rho_e * j_lim / (k_size * volt),
            'current_density_limit': 2.0 * rho_e * length / (k_size * volt),
            'sizing_factor': -k / k_size,
            'voltage': -k / volt,
        }
        eta = 1.0 - k
        p_in = p_out / eta
        current = p_in / volt
        rated_current = k_size * current
        area = rated_current / j_lim
        resistance = 2.0 * rho_e * length / area

        zero = np.zeros_like(p_out)
        d_k['output_power'] = zero

        d_p_in = {x: p_out / eta**2 * d_k[x] for x in _POWER_INPUTS}
        d_p_in['output_power'] = 1.0 / eta

        d_cur = {x: d_p_in[x] / volt for x in _POWER_INPUTS}
        d_cur['voltage'] = d_cur['voltage'] - p_in / volt**2

        d_rated = {x: k_size * d_cur[x] for x in _POWER_INPUTS}
        d_rated['sizing_factor'] = d_rated['sizing_factor'] + current

        d_area = {x: d_rated[x] / j_lim for x in _POWER_INPUTS}
        d_area['current_density_limit'] = d_area['current_density_limit'] - rated_current / j_lim**2

        d_res = {x: -resistance / area * d_area[x] for x in _POWER_INPUTS}
        d_res['resistivity'] = d_res['resistivity'] + 2.0 * length / area
        d_res['length'] = d_res['length'] + 2.0 * rho_e / area

        for x in _LOSS_INPUTS:
            partials['efficiency', x] = -d_k[x]
            partials['voltage_drop', x] = resistance * d_cur[x] + current * d_res[x]

        for x in _POWER_INPUTS:
            partials['input_power', x] = d_p_in[x]
            partials['current', x] = d_cur[x]
            partials['rated_current', x] = d_rated[x]
            partials['cross_section_area', x] = d_area[x]
            partials['resistance', x] = d_res[x]
            partials['loss', x] = 2.0 * current * resistance * d_cur[x] + current**2 * d_res[x]
            d_mass = 2.0 * length * rho_m * f_m * d_area[x]
            if x == 'length':
                d_mass = d_mass + 2.0 * area * rho_m * f_m
            partials['mass', x] = d_mass

        partials['mass', 'conductor_density'] = 2.0 * length * area * f_m
        partials['mass', 'mass_factor'] = 2.0 * length * area * rho_m

        partials['current_density', 'current_density_limit'] = 1.0 / k_size
        partials['current_density', 'sizing_factor'] = -j_lim / k_size**2
