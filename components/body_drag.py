"""Zero-lift drag area of streamlined bodies (fuselage, nacelles) by component build-up."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.skin_friction import turbulent_skin_friction


def _form_factor(shape, fineness):
    """
    Return the form factor and its derivative with respect to fineness ratio.

    Parameters
    ----------
    shape : str
        'fuselage' or 'nacelle'.
    fineness : ndarray
        Length-to-diameter ratio.

    Returns
    -------
    tuple of ndarray
        Form factor and d(form factor)/d(fineness).
    """
    if shape == 'fuselage':
        return (1.0 + 60.0 / fineness**3 + fineness / 400.0, -180.0 / fineness**4 + 1.0 / 400.0)
    return 1.0 + 0.35 / fineness, -0.35 / fineness**2


def _wetted_area(shape, diameter, fineness):
    """
    Return the wetted area of one body and its derivatives.

    Parameters
    ----------
    shape : str
        'fuselage' or 'nacelle'.
    diameter : ndarray
        Maximum diameter, m.
    fineness : ndarray
        Length-to-diameter ratio.

    Returns
    -------
    tuple of ndarray
        Wetted area (m**2), d(area)/d(diameter) and d(area)/d(fineness).
    """
    # pi D L = pi D**2 f, times a shape correction g(f).
    if shape == 'fuselage':
        taper = 1.0 - 2.0 / fineness
        ends = 1.0 + 1.0 / fineness**2
        shape_factor = taper ** (2.0 / 3.0) * ends
        dshape_df = (
            2.0 / 3.0 * taper ** (-1.0 / 3.0) * 2.0 / fineness**2 * ends
            - taper ** (2.0 / 3.0) * 2.0 / fineness**3
        )
    else:
        shape_factor = np.ones_like(fineness)
        dshape_df = np.zeros_like(fineness)
    area = np.pi * diameter**2 * fineness * shape_factor
    darea_dd = 2.0 * area / diameter
    darea_df = np.pi * diameter**2 * (shape_factor + fineness * dshape_df)
    return area, darea_dd, darea_df


class BodyDragComp(PointwiseComponent):
    r"""
    Zero-lift drag area of one or more identical streamlined bodies.

    Component build-up: drag area = n cf FF Q S_wet, with body length l = f D and

    .. math::

        Re = \frac{\rho V l}{\mu}, \qquad
        c_f = \frac{0.455}{(\log_{10} Re)^{2.58}\,(1 + 0.144 M^2)^{0.65}}

    (Prandtl-Schlichting turbulent flat-plate skin friction with the compressibility
    correction; Raymer, Aircraft Design: A Conceptual Approach, 6th ed., ch. 12, eq. 12.27,
    equation number from memory; see ``voltwake.components.skin_friction``). At M = 0.78 the
    correction :math:`(1 + 0.144 M^2)^{-0.65}` is 0.9469.
    Form factor FF and wetted area S_wet of one body:

    * fuselage: FF = 1 + 60/f**3 + f/400 (Raymer, Aircraft Design: A Conceptual Approach,
      ch. 12, component drag build-up, fuselage and smooth canopy; from memory) and
      S_wet = pi D l (1 - 2/f)**(2/3) (1 + 1/f**2) (Torenbeek, Synthesis of Subsonic
      Airplane Design, fuselage wetted-area approximation; from memory). Needs f > 2.
    * nacelle: FF = 1 + 0.35/f (Raymer, same chapter, nacelle and smooth external store;
      from memory) and S_wet = pi D l (open cylinder, common practice).

    Q is the interference factor.

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
            'shape',
            default='fuselage',
            values=('fuselage', 'nacelle'),
            desc='Body type, selects the form factor and wetted-area model.',
        )
        self.options.declare(
            'count', types=int, default=1, lower=1, desc='Number of identical bodies.'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        fuselage = self.options['shape'] == 'fuselage'
        self.add_input(
            'diameter',
            np.full(n, 4.0 if fuselage else 2.0),
            units='m',
            desc='Maximum body diameter',
        )
        self.add_input(
            'fineness_ratio',
            np.full(n, 10.0 if fuselage else 2.5),
            units=None,
            desc='Body length divided by maximum diameter',
        )
        self.add_input('true_airspeed', np.full(n, 230.0), units='m/s', desc='True airspeed')
        self.add_input('mach', np.full(n, 0.78), units=None, desc='Flight Mach number')
        self.add_input('density', np.full(n, 0.38), units='kg/m**3', desc='Air density')
        self.add_input(
            'viscosity', np.full(n, 1.43e-5), units='Pa*s', desc='Dynamic viscosity of air'
        )
        self.add_input(
            'interference_factor',
            np.ones(n),
            units=None,
            desc='Interference factor Q on the body drag',
        )
        self.add_output('length', np.full(n, 40.0), units='m', desc='Body length')
        self.add_output(
            'reynolds_number', np.full(n, 2.0e8), units=None, desc='Reynolds number on body length'
        )
        self.add_output(
            'skin_friction_coefficient',
            np.full(n, 0.002),
            units=None,
            desc='Turbulent flat-plate skin friction coefficient, compressibility-corrected',
        )
        self.add_output('form_factor', np.full(n, 1.1), units=None, desc='Form factor')
        self.add_output(
            'wetted_area',
            np.full(n, 400.0),
            units='m**2',
            desc='Wetted area of all bodies together',
        )
        self.add_output(
            'drag_area',
            np.full(n, 1.0),
            units='m**2',
            desc='Zero-lift drag area D/q of all bodies together',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        flow = ['true_airspeed', 'density', 'viscosity']
        geometry = ['diameter', 'fineness_ratio']
        self.declare_diagonal_partials('length', geometry)
        self.declare_diagonal_partials('reynolds_number', geometry + flow)
        self.declare_diagonal_partials('skin_friction_coefficient', geometry + flow + ['mach'])
        self.declare_diagonal_partials('form_factor', 'fineness_ratio')
        self.declare_diagonal_partials('wetted_area', geometry)
        self.declare_diagonal_partials(
            'drag_area', geometry + flow + ['mach', 'interference_factor']
        )

    def compute(self, inputs, outputs):
        """
        Compute the drag build-up.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        shape = self.options['shape']
        count = self.options['count']
        diameter = inputs['diameter']
        fineness = inputs['fineness_ratio']
        length = fineness * diameter
        reynolds = inputs['density'] * inputs['true_airspeed'] * length / inputs['viscosity']
        friction, _, _ = turbulent_skin_friction(reynolds, inputs['mach'])
        form_factor, _ = _form_factor(shape, fineness)
        area, _, _ = _wetted_area(shape, diameter, fineness)

        outputs['length'] = length
        outputs['reynolds_number'] = reynolds
        outputs['skin_friction_coefficient'] = friction
        outputs['form_factor'] = form_factor
        outputs['wetted_area'] = count * area
        outputs['drag_area'] = count * friction * form_factor * inputs['interference_factor'] * area

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
        shape = self.options['shape']
        count = self.options['count']
        diameter = inputs['diameter']
        fineness = inputs['fineness_ratio']
        speed = inputs['true_airspeed']
        density = inputs['density']
        viscosity = inputs['viscosity']
        interference = inputs['interference_factor']

        length = fineness * diameter
        reynolds = density * speed * length / viscosity
        friction, dcf_dre, dcf_dmach = turbulent_skin_friction(reynolds, inputs['mach'])
        # d cf / d ln(Re); d ln(Re)/d x is 1/x for rho, V, D, f and -1/mu.
        dcf_dlnre = dcf_dre * reynolds
        form_factor, dff_df = _form_factor(shape, fineness)
        area, darea_dd, darea_df = _wetted_area(shape, diameter, fineness)

        partials['length', 'diameter'] = fineness
        partials['length', 'fineness_ratio'] = diameter

        for name, value in [
            ('diameter', diameter),
            ('fineness_ratio', fineness),
            ('true_airspeed', speed),
            ('density', density),
            ('viscosity', -viscosity),
        ]:
            partials['reynolds_number', name] = reynolds / value
            partials['skin_friction_coefficient', name] = dcf_dlnre / value
        partials['skin_friction_coefficient', 'mach'] = dcf_dmach

        partials['form_factor', 'fineness_ratio'] = dff_df
        partials['wetted_area', 'diameter'] = count * darea_dd
        partials['wetted_area', 'fineness_ratio'] = count * darea_df

        scale = count * interference
        for name, value in [
            ('true_airspeed', speed),
            ('density', density),
            ('viscosity', -viscosity),
        ]:
            partials['drag_area', name] = scale * form_factor * area * dcf_dlnre / value
        partials['drag_area', 'diameter'] = (
            scale * form_factor * (dcf_dlnre / diameter * area + friction * darea_dd)
        )
        partials['drag_area', 'fineness_ratio'] = scale * (
            dcf_dlnre / fineness * form_factor * area
            + friction * dff_df * area
            + friction * form_factor * darea_df
        )
        partials['drag_area', 'mach'] = scale * form_factor * area * dcf_dmach
        partials['drag_area', 'interference_factor'] = count * friction * form_factor * area
