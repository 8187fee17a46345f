"""Zero-lift drag area of lifting surfaces (wing and tails) by component build-up."""

import numpy as np

from voltwake.components.base import PointwiseComponent
from voltwake.components.skin_friction import turbulent_skin_friction

#: Chordwise position of maximum thickness (x/c)_m of a conventional section (Raymer,
#: Aircraft Design: A Conceptual Approach, parasite drag chapter; from memory).
MAX_THICKNESS_POSITION = 0.3

#: Wetted-to-exposed planform area ratio S_wet/S = WETTED_BASE + WETTED_SLOPE t/c (Raymer,
#: same book, configuration layout chapter, wetted area of wings and tails; from memory).
WETTED_BASE = 1.977
WETTED_SLOPE = 0.52


class LiftingSurfaceDragComp(PointwiseComponent):
    r"""
    Zero-lift drag area of one or more identical lifting surfaces (wing or tails).

    Component build-up: drag area = n cf FF Q S_wet (Raymer, Aircraft Design: A Conceptual
    Approach, parasite drag chapter, component build-up method; from memory). The Reynolds
    number is taken on the mean chord :math:`\bar c = \sqrt{S/A}` of the planform:

    .. math::

        Re = \frac{\rho V \bar c}{\mu}, \qquad
        c_f = \frac{0.455}{(\log_{10} Re)^{2.58}\,(1 + 0.144 M^2)^{0.65}}

    (Prandtl-Schlichting turbulent flat-plate skin friction with the compressibility
    correction; Raymer, Aircraft Design: A Conceptual Approach, 6th ed., ch. 12, eq. 12.27,
    equation number from memory; see ``voltwake.components.skin_friction``. The same as
    ``BodyDragComp``, so that bodies and surfaces are consistent.)
    Wetted area of one surface (Raymer, same book, configuration layout chapter, wetted area
    of wings and tails, valid for t/c > 0.05; from memory):

    .. math::

        S_{wet} = S \left(1.977 + 0.52 \frac{t}{c}\right)

    with S the exposed planform: the reference planform of a tail (it has no
    fuselage-covered part in its reference area, common practice), the exposed planform of
    the wing (``ExposedWingComp``). Form factor (Raymer,
    parasite drag chapter, wing, tail, strut and pylon form factor; from memory):

    .. math::

        FF = \left[1 + \frac{0.6}{(x/c)_m} \frac{t}{c} + 100 \left(\frac{t}{c}\right)^4\right]
             \left[1.34 M^{0.18} (\cos\Lambda_m)^{0.28}\right]

    with :math:`(x/c)_m = 0.3` for conventional sections (same source; from memory) and the
    sweep :math:`\Lambda_m` of the maximum-thickness line taken equal to the quarter-chord
    sweep (input ``sweep``). The Mach factor is an empirical fit for flight Mach numbers: it
    is 1 near M = 0.2 and, as written, tends to zero at rest, so M must be positive. Q is the
    interference factor (default 1.04, conventional tails; Raymer, parasite drag chapter;
    from memory).

    The output ``wetted_area`` is per surface; ``drag_area`` is the total of all ``count``
    surfaces.

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
            'count', types=int, default=1, lower=1, desc='Number of identical surfaces.'
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input('area', np.full(n, 25.0), units='m**2', desc='Planform area of one surface')
        self.add_input('aspect_ratio', np.full(n, 4.5), units=None, desc='Aspect ratio')
        self.add_input(
            'thickness_to_chord',
            np.full(n, 0.10),
            units=None,
            desc='Thickness-to-chord ratio of the section',
        )
        self.add_input(
            'sweep',
            np.full(n, np.radians(30.0)),
            units='rad',
            desc='Sweep of the maximum-thickness line, taken as the quarter-chord sweep',
        )
        self.add_input('mach', np.full(n, 0.78), units=None, desc='Flight Mach number')
        self.add_input('true_airspeed', np.full(n, 230.0), units='m/s', desc='True airspeed')
        self.add_input('density', np.full(n, 0.38), units='kg/m**3', desc='Air density')
        self.add_input(
            'viscosity', np.full(n, 1.43e-5), units='Pa*s', desc='Dynamic viscosity of air'
        )
        self.add_input(
            'interference_factor',
            np.full(n, 1.04),
            units=None,
            desc='Interference factor Q on the surface drag',
        )
        self.add_output('mean_chord', np.full(n, 2.36), units='m', desc='Mean chord sqrt(S/A)')
        self.add_output(
            'reynolds_number',
            np.full(n, 1.5e7),
            units=None,
            ref=1.0e7,
            desc='Reynolds number on the mean chord',
        )
        self.add_output(
            'skin_friction_coefficient',
            np.full(n, 0.003),
            units=None,
            desc='Turbulent flat-plate skin friction coefficient, compressibility-corrected',
        )
        self.add_output('form_factor', np.full(n, 1.5), units=None, desc='Form factor')
        self.add_output(
            'wetted_area', np.full(n, 50.0), units='m**2', desc='Wetted area of one surface'
        )
        self.add_output(
            'drag_area',
            np.full(n, 0.2),
            units='m**2',
            desc='Zero-lift drag area D/q of all surfaces together',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        planform = ['area', 'aspect_ratio']
        flow = ['true_airspeed', 'density', 'viscosity']
        shape = ['thickness_to_chord', 'mach', 'sweep']
        self.declare_diagonal_partials('mean_chord', planform)
        self.declare_diagonal_partials('reynolds_number', planform + flow)
        self.declare_diagonal_partials('skin_friction_coefficient', planform + flow + ['mach'])
        self.declare_diagonal_partials('form_factor', shape)
        self.declare_diagonal_partials('wetted_area', ['area', 'thickness_to_chord'])
        self.declare_diagonal_partials(
            'drag_area', planform + flow + shape + ['interference_factor']
        )

    @staticmethod
    def _form_factor(thickness, mach, sweep):
        """
        Return the form factor and its partials.

        Parameters
        ----------
        thickness : ndarray
            Thickness-to-chord ratio.
        mach : ndarray
            Flight Mach number (positive).
        sweep : ndarray
            Sweep of the maximum-thickness line, rad.

        Returns
        -------
        tuple of ndarray
            Form factor and its partials with respect to t/c, Mach number and sweep.
        """
        section = 1.0 + 0.6 / MAX_THICKNESS_POSITION * thickness + 100.0 * thickness**4
        dsection_dt = 0.6 / MAX_THICKNESS_POSITION + 400.0 * thickness**3
        compressibility = 1.34 * mach**0.18 * np.cos(sweep) ** 0.28
        form_factor = section * compressibility
        return (
            form_factor,
            dsection_dt * compressibility,
            0.18 * form_factor / mach,
            -0.28 * form_factor * np.tan(sweep),
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
        area = inputs['area']
        thickness = inputs['thickness_to_chord']
        chord = np.sqrt(area / inputs['aspect_ratio'])
        reynolds = inputs['density'] * inputs['true_airspeed'] * chord / inputs['viscosity']
        friction, _, _ = turbulent_skin_friction(reynolds, inputs['mach'])
        form_factor, _, _, _ = self._form_factor(thickness, inputs['mach'], inputs['sweep'])
        wetted = area * (WETTED_BASE + WETTED_SLOPE * thickness)

        outputs['mean_chord'] = chord
        outputs['reynolds_number'] = reynolds
        outputs['skin_friction_coefficient'] = friction
        outputs['form_factor'] = form_factor
        outputs['wetted_area'] = wetted
        outputs['drag_area'] = (
            self.options['count'] * friction * form_factor * inputs['interference_factor'] * wetted
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
        count = self.options['count']
        area = inputs['area']
        aspect = inputs['aspect_ratio']
        thickness = inputs['thickness_to_chord']
        speed = inputs['true_airspeed']
        density = inputs['density']
        viscosity = inputs['viscosity']
        interference = inputs['interference_factor']

        chord = np.sqrt(area / aspect)
        reynolds = density * speed * chord / viscosity
        friction, dcf_dre, dcf_dmach = turbulent_skin_friction(reynolds, inputs['mach'])
        # d cf / d ln(Re); d ln(Re)/d x is 1/x for rho and V, -1/mu, 1/(2 S) and -1/(2 A).
        dcf_dlnre = dcf_dre * reynolds
        form_factor, dff_dt, dff_dm, dff_ds = self._form_factor(
            thickness, inputs['mach'], inputs['sweep']
        )
        wetted_ratio = WETTED_BASE + WETTED_SLOPE * thickness
        wetted = area * wetted_ratio

        partials['mean_chord', 'area'] = 0.5 * chord / area
        partials['mean_chord', 'aspect_ratio'] = -0.5 * chord / aspect

        scale = count * interference
        for name, log_slope in [
            ('area', 0.5 / area),
            ('aspect_ratio', -0.5 / aspect),
            ('true_airspeed', 1.0 / speed),
            ('density', 1.0 / density),
            ('viscosity', -1.0 / viscosity),
        ]:
            partials['reynolds_number', name] = reynolds * log_slope
            partials['skin_friction_coefficient', name] = dcf_dlnre * log_slope
            partials['drag_area', name] = scale * form_factor * wetted * dcf_dlnre * log_slope
        partials['drag_area', 'area'] = (
            scale * form_factor * (wetted * dcf_dlnre * 0.5 / area + friction * wetted_ratio)
        )
        partials['skin_friction_coefficient', 'mach'] = dcf_dmach

        partials['form_factor', 'thickness_to_chord'] = dff_dt
        partials['form_factor', 'mach'] = dff_dm
        partials['form_factor', 'sweep'] = dff_ds

        partials['wetted_area', 'area'] = wetted_ratio
        partials['wetted_area', 'thickness_to_chord'] = WETTED_SLOPE * area

        partials['drag_area', 'thickness_to_chord'] = (
            scale * friction * (dff_dt * wetted + form_factor * WETTED_SLOPE * area)
        )
        partials['drag_area', 'mach'] = (
            scale * wetted * (dcf_dmach * form_factor + friction * dff_dm)
        )
        partials['drag_area', 'sweep'] = scale * friction * dff_ds * wetted
        partials['drag_area', 'interference_factor'] = count * friction * form_factor * wetted
