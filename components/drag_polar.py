"""Drag polar (component zero-lift drag, induced and wave drag), total drag and L/D."""

import numpy as np

from voltwake.components.base import PointwiseComponent

_DRAG_AREAS = (
    'wing_drag_area',
    'fuselage_drag_area',
    'nacelle_drag_area',
    'aft_nacelle_drag_area',
    'horizontal_tail_drag_area',
    'vertical_tail_drag_area',
)


class DragPolarComp(PointwiseComponent):
    r"""
    Parabolic drag polar with a zero-lift term built up by component, plus wave drag.

    .. math::

        C_{D0} = C_{D,misc} + \frac{1}{S} \sum_c (C_D A)_c, \qquad
        C_{Di} = \frac{C_L^2}{\pi e A}, \qquad C_D = C_{D0} + C_{Di} + C_{Dw}

    with the drag areas :math:`(C_D A)_c` of the wing, fuselage, under-wing nacelles, aft-fan
    nacelle and both tails (each from its wetted area, skin friction, form factor and
    interference factor: the component build-up method, Raymer, Aircraft Design: A Conceptual
    Approach, parasite drag chapter; from memory), :math:`C_{D,misc}` a configured increment for
    excrescences, leakage and interference not in the components' factors, and
    :math:`C_{Dw}` the transonic wave drag (``WaveDragComp``).

    .. math::

        D = q S C_D + D_{extra}, \qquad L/D = \frac{C_L q S}{D}, \qquad
        D_{fus} = q (C_D A)_{fus}

    (parabolic drag polar with Oswald efficiency e, e.g. Anderson, Introduction to Flight,
    ch. 6; from memory). D_extra is a drag force added outside the polar, such as
    heat-exchanger drag.

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
            'lift_coefficient',
            np.full(n, 0.5),
            units=None,
            desc='Lift coefficient on wing reference area',
        )
        self.add_input('aspect_ratio', np.full(n, 9.5), units=None, desc='Wing aspect ratio')
        self.add_input(
            'oswald_efficiency', np.full(n, 0.8), units=None, desc='Oswald span efficiency factor'
        )
        self.add_input('wing_area', np.full(n, 120.0), units='m**2', desc='Wing reference area')
        self.add_input(
            'dynamic_pressure', np.full(n, 1.0e4), units='Pa', desc='Flight dynamic pressure'
        )
        self.add_input(
            'miscellaneous_drag_coefficient',
            np.full(n, 0.001),
            units=None,
            desc='Zero-lift drag increment of excrescences, leakage and interference',
        )
        self.add_input(
            'wave_drag_coefficient',
            np.zeros(n),
            units=None,
            desc='Transonic wave drag coefficient',
        )
        self.add_input(
            'wing_drag_area',
            np.full(n, 0.7),
            units='m**2',
            desc='Zero-lift drag area of the wing',
        )
        self.add_input(
            'fuselage_drag_area',
            np.full(n, 0.8),
            units='m**2',
            desc='Zero-lift drag area of the fuselage',
        )
        self.add_input(
            'nacelle_drag_area',
            np.full(n, 0.2),
            units='m**2',
            desc='Zero-lift drag area of the under-wing nacelles',
        )
        self.add_input(
            'aft_nacelle_drag_area',
            np.zeros(n),
            units='m**2',
            desc='Zero-lift drag area of the aft-fan nacelle',
        )
        for tail in ('horizontal', 'vertical'):
            self.add_input(
                f'{tail}_tail_drag_area',
                np.zeros(n),
                units='m**2',
                desc=f'Zero-lift drag area of the {tail} tail',
            )
        self.add_input(
            'extra_drag',
            np.zeros(n),
            units='N',
            desc='Drag force added outside the polar (e.g. heat exchangers)',
        )
        self.add_output(
            'zero_lift_drag_coefficient',
            np.full(n, 0.02),
            units=None,
            desc='Zero-lift drag coefficient CD0',
        )
        self.add_output(
            'induced_drag_coefficient',
            np.full(n, 0.01),
            units=None,
            desc='Induced (lift-dependent) drag coefficient',
        )
        self.add_output(
            'drag_coefficient',
            np.full(n, 0.03),
            units=None,
            desc='Total drag coefficient: zero-lift, induced and wave drag',
        )
        self.add_output(
            'drag', np.full(n, 3.6e4), units='N', desc='Total drag force including extra_drag'
        )
        self.add_output('lift_to_drag', np.full(n, 17.0), units=None, desc='Lift-to-drag ratio')
        self.add_output(
            'fuselage_drag',
            np.full(n, 8.0e3),
            units='N',
            desc='Zero-lift drag force of the fuselage',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        induced = ['lift_coefficient', 'aspect_ratio', 'oswald_efficiency']
        zero_lift = ['miscellaneous_drag_coefficient', 'wing_area'] + list(_DRAG_AREAS)
        total = zero_lift + induced + ['wave_drag_coefficient']
        self.declare_diagonal_partials('zero_lift_drag_coefficient', zero_lift)
        self.declare_diagonal_partials('induced_drag_coefficient', induced)
        self.declare_diagonal_partials('drag_coefficient', total)
        self.declare_diagonal_partials(
            ['drag', 'lift_to_drag'], total + ['dynamic_pressure', 'extra_drag']
        )
        self.declare_diagonal_partials('fuselage_drag', ['dynamic_pressure', 'fuselage_drag_area'])

    def compute(self, inputs, outputs):
        """
        Compute the drag coefficients, drag and lift-to-drag ratio.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        area = inputs['wing_area']
        q = inputs['dynamic_pressure']
        lift_coefficient = inputs['lift_coefficient']
        body_area = sum(inputs[name] for name in _DRAG_AREAS)
        cd0 = inputs['miscellaneous_drag_coefficient'] + body_area / area
        cdi = lift_coefficient**2 / (np.pi * inputs['oswald_efficiency'] * inputs['aspect_ratio'])
        cd = cd0 + cdi + inputs['wave_drag_coefficient']
        drag = q * area * cd + inputs['extra_drag']

        outputs['zero_lift_drag_coefficient'] = cd0
        outputs['induced_drag_coefficient'] = cdi
        outputs['drag_coefficient'] = cd
        outputs['drag'] = drag
        outputs['lift_to_drag'] = lift_coefficient * q * area / drag
        outputs['fuselage_drag'] = q * inputs['fuselage_drag_area']

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
        area = inputs['wing_area']
        q = inputs['dynamic_pressure']
        lift_coefficient = inputs['lift_coefficient']
        efficiency = inputs['oswald_efficiency']
        aspect_ratio = inputs['aspect_ratio']
        body_area = sum(inputs[name] for name in _DRAG_AREAS)
        cd0 = inputs['miscellaneous_drag_coefficient'] + body_area / area
        cdi = lift_coefficient**2 / (np.pi * efficiency * aspect_ratio)
        cd = cd0 + cdi + inputs['wave_drag_coefficient']
        drag = q * area * cd + inputs['extra_drag']
        lift = lift_coefficient * q * area

        # Partials of the drag coefficient (zero-lift plus induced parts).
        dcd = {
            'miscellaneous_drag_coefficient': np.ones_like(area),
            'wave_drag_coefficient': np.ones_like(area),
            'wing_area': -body_area / area**2,
            'lift_coefficient': 2.0 * lift_coefficient / (np.pi * efficiency * aspect_ratio),
            'oswald_efficiency': -cdi / efficiency,
            'aspect_ratio': -cdi / aspect_ratio,
        }
        for name in _DRAG_AREAS:
            dcd[name] = 1.0 / area
        for name in ('miscellaneous_drag_coefficient', 'wing_area') + _DRAG_AREAS:
            partials['zero_lift_drag_coefficient', name] = dcd[name]
        for name in ('lift_coefficient', 'oswald_efficiency', 'aspect_ratio'):
            partials['induced_drag_coefficient', name] = dcd[name]

        # Drag and lift partials; D = q S CD + extra, L = CL q S.
        ddrag = {name: q * area * value for name, value in dcd.items()}
        ddrag['wing_area'] = ddrag['wing_area'] + q * cd
        ddrag['dynamic_pressure'] = area * cd
        ddrag['extra_drag'] = np.ones_like(area)
        dlift = {
            'lift_coefficient': q * area,
            'dynamic_pressure': lift_coefficient * area,
            'wing_area': lift_coefficient * q,
        }
        for name, value in ddrag.items():
            if name in dcd:
                partials['drag_coefficient', name] = dcd[name]
            partials['drag', name] = value
            partials['lift_to_drag', name] = (dlift.get(name, 0.0) * drag - lift * value) / drag**2

        partials['fuselage_drag', 'dynamic_pressure'] = inputs['fuselage_drag_area']
        partials['fuselage_drag', 'fuselage_drag_area'] = q
