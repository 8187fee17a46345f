"""Tests of the lifting-surface (tail) zero-lift drag build-up component."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere

from voltwake.components.body_drag import BodyDragComp
from voltwake.components.surface_drag import LiftingSurfaceDragComp

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


# Cruise at 35000 ft (geopotential, ISA), Mach 0.78; atmosphere from the `ambiance`
# reference library, whose constructor takes geometric height.
ATM = Atmosphere(Atmosphere.geop2geom_height(35000.0 * 0.3048))
RHO = float(ATM.density[0])  # 0.3795968 kg/m**3
MU = float(ATM.dynamic_viscosity[0])  # 1.433448e-5 Pa*s
SPEED = 0.78 * float(ATM.speed_of_sound[0])  # 231.2976 m/s

# Horizontal tail of 25 m**2, aspect ratio 4.5, t/c 0.10, 30 deg sweep (demo geometry).
CRUISE_TAIL = {
    'area': 25.0,
    'aspect_ratio': 4.5,
    'thickness_to_chord': 0.10,
    'sweep': np.radians(30.0),
    'mach': 0.78,
    'true_airspeed': SPEED,
    'density': RHO,
    'viscosity': MU,
    'interference_factor': 1.04,
}


def test_cruise_tail_hand_values():
    prob = _run(LiftingSurfaceDragComp(), CRUISE_TAIL)
    # Hand values from the equations of the class docstring:
    # c = sqrt(25 / 4.5) = 2.357022604 m.
    np.testing.assert_allclose(prob.get_val('mean_chord'), 2.3570226039551585, rtol=1e-14)
    # Re = rho V c / mu = 0.3795968 * 231.2976 * 2.357023 / 1.433448e-5 = 1.4436953e7.
    np.testing.assert_allclose(prob.get_val('reynolds_number'), 1.4436952901268e7, rtol=1e-12)
    # cf = 0.455 / (log10 1.4436953e7)**2.58 / (1 + 0.144 * 0.78**2)**0.65
    #    = 0.455 / 7.159477**2.58 * 0.9468747 = 2.834118e-3 * 0.9468747 = 2.683554e-3.
    np.testing.assert_allclose(
        prob.get_val('skin_friction_coefficient'), 2.834117656574e-3 * 0.9468747357762, rtol=1e-11
    )
    # FF = [1 + 0.6/0.3 * 0.1 + 100 * 0.1**4] [1.34 * 0.78**0.18 * cos(30 deg)**0.28]
    #    = 1.21 * 1.230808264456 = 1.489277999992.
    np.testing.assert_allclose(prob.get_val('form_factor'), 1.489277999992, rtol=1e-12)
    # S_wet = 25 (1.977 + 0.52 * 0.1) = 50.725 m**2.
    np.testing.assert_allclose(prob.get_val('wetted_area'), 50.725, rtol=1e-14)
    # D/q = cf FF Q S_wet = 2.683554e-3 * 1.489278 * 1.04 * 50.725 = 0.2226635 * 0.9468747
    #     = 0.2108344 m**2 (about 17 drag counts on a 122 m**2 wing).
    np.testing.assert_allclose(
        prob.get_val('drag_area'), 0.222663506880 * 0.9468747357762, rtol=1e-11
    )


def test_skin_friction_matches_bodies():
    # Same compressibility-corrected skin friction as the bodies: with S = 400 m**2 and A = 4
    # the mean chord is 10 m, and rho = 1, mu = 1e-5, V = 1, 10, 100 m/s give Re = 1e6, 1e7,
    # 1e8; a body with D = 1 m and f = 10 has the same Re.
    flow = {
        'true_airspeed': [1.0, 10.0, 100.0],
        'mach': [0.2, 0.78, 0.85],
        'density': [1.0, 1.0, 1.0],
        'viscosity': [1.0e-5, 1.0e-5, 1.0e-5],
    }
    surface = _run(
        LiftingSurfaceDragComp(vec_size=3), dict(flow, area=[400.0] * 3, aspect_ratio=[4.0] * 3)
    )
    body = _run(
        BodyDragComp(vec_size=3, shape='nacelle'),
        dict(flow, diameter=[1.0] * 3, fineness_ratio=[10.0] * 3),
    )
    np.testing.assert_allclose(surface.get_val('mean_chord'), 10.0, rtol=1e-15)
    np.testing.assert_allclose(
        surface.get_val('reynolds_number'), [1.0e6, 1.0e7, 1.0e8], rtol=1e-13
    )
    # 0.455 / 6**2.58, 0.455 / 7**2.58, 0.455 / 8**2.58 evaluated by hand, times the
    # compressibility correction (1 + 0.144 M**2)**-0.65 at M = 0.2, 0.78, 0.85 (Raymer,
    # Aircraft Design: A Conceptual Approach, 6th ed., ch. 12, eq. 12.27; equation number
    # from memory): 1.00576**-0.65 = 0.9962737, 0.9468747, 0.9376913 (hand values).
    np.testing.assert_allclose(
        surface.get_val('skin_friction_coefficient'),
        np.array([0.004470758085612, 0.003003713133159, 0.002128331291413])
        * [0.996273701438, 0.9468747357762, 0.9376912739477],
        rtol=1e-12,
    )
    np.testing.assert_allclose(
        surface.get_val('skin_friction_coefficient'),
        body.get_val('skin_friction_coefficient'),
        rtol=1e-15,
    )


def test_form_factor_limits():
    # Zero thickness, no sweep and the Mach number at which 1.34 M**0.18 = 1 give FF = 1;
    # t/c = 0.2 unswept at that Mach number gives 1 + 2 * 0.2 + 100 * 0.2**4 = 1.56.
    unit_mach = (1.0 / 1.34) ** (1.0 / 0.18)  # 0.19673, hand value from the equation
    prob = _run(
        LiftingSurfaceDragComp(vec_size=3),
        {
            'thickness_to_chord': [0.0, 0.2, 0.1],
            'sweep': [0.0, 0.0, np.radians(60.0)],
            'mach': [unit_mach] * 3,
        },
    )
    # Third point: 1.21 * cos(60 deg)**0.28 = 1.21 * 0.5**0.28 = 0.996545 (hand value).
    np.testing.assert_allclose(
        prob.get_val('form_factor'), [1.0, 1.56, 1.21 * 0.5**0.28], rtol=1e-13
    )
    # Zero thickness: the wetted area is 1.977 times the planform (not quite both sides).
    np.testing.assert_allclose(prob.get_val('wetted_area')[0], 1.977 * 25.0, rtol=1e-15)


def test_count_scales_drag_area_only():
    one = _run(LiftingSurfaceDragComp(), CRUISE_TAIL)
    two = _run(LiftingSurfaceDragComp(count=2), CRUISE_TAIL)
    np.testing.assert_allclose(two.get_val('drag_area'), 2.0 * one.get_val('drag_area'), rtol=1e-15)
    for name in [
        'mean_chord',
        'reynolds_number',
        'skin_friction_coefficient',
        'form_factor',
        'wetted_area',
    ]:
        np.testing.assert_allclose(two.get_val(name), one.get_val(name), rtol=1e-15)


def _sweep_one(name, values):
    inputs = {key: [value] * 3 for key, value in CRUISE_TAIL.items()}
    inputs[name] = values
    return _run(LiftingSurfaceDragComp(vec_size=3), inputs)


def test_trend_with_area():
    areas = np.array([10.0, 25.0, 60.0])
    prob = _sweep_one('area', areas)
    drag_area = prob.get_val('drag_area')
    assert np.all(np.diff(drag_area) > 0.0)
    # Scale effect: a larger chord has a higher Reynolds number and a lower skin friction,
    # so the drag area per unit planform area falls.
    assert np.all(np.diff(prob.get_val('skin_friction_coefficient')) < 0.0)
    assert np.all(np.diff(drag_area / areas) < 0.0)


def test_trend_with_thickness():
    prob = _sweep_one('thickness_to_chord', [0.08, 0.10, 0.14])
    assert np.all(np.diff(prob.get_val('form_factor')) > 0.0)
    assert np.all(np.diff(prob.get_val('wetted_area')) > 0.0)
    assert np.all(np.diff(prob.get_val('drag_area')) > 0.0)


def test_trend_with_sweep():
    prob = _sweep_one('sweep', np.radians([0.0, 30.0, 45.0]))
    assert np.all(np.diff(prob.get_val('form_factor')) < 0.0)
    assert np.all(np.diff(prob.get_val('drag_area')) < 0.0)
    np.testing.assert_allclose(prob.get_val('wetted_area'), 50.725, rtol=1e-14)


def test_options_are_validated():
    with pytest.raises(ValueError):
        LiftingSurfaceDragComp(count=0)


POINTS = [
    {
        'area': [25.0, 32.0, 18.0],
        'aspect_ratio': [4.5, 5.0, 1.6],
        'thickness_to_chord': [0.10, 0.12, 0.09],
        'sweep': np.radians([30.0, 25.0, 40.0]),
        'mach': [0.78, 0.30, 0.85],
        'true_airspeed': [231.0, 100.0, 245.0],
        'density': [0.38, 1.1, 0.31],
        'viscosity': [1.43e-5, 1.77e-5, 1.42e-5],
        'interference_factor': [1.04, 1.05, 1.0],
    },
    {
        'area': [5.0, 12.0, 45.0],
        'aspect_ratio': [3.0, 6.0, 4.0],
        'thickness_to_chord': [0.06, 0.15, 0.11],
        'sweep': np.radians([0.0, 10.0, 35.0]),
        'mach': [0.2, 0.5, 0.7],
        'true_airspeed': [68.0, 160.0, 215.0],
        'density': [1.225, 0.74, 0.45],
        'viscosity': [1.79e-5, 1.63e-5, 1.48e-5],
        'interference_factor': [1.2, 1.0, 1.08],
    },
]


@pytest.mark.parametrize('count', [1, 2])
@pytest.mark.parametrize('point', POINTS)
def test_partials(count, point):
    # atol=0: skin-friction gradients are as small as 2e-6 per unit input in SI, so an
    # absolute tolerance would hide errors in them; complex step is exact to round-off.
    check_component_partials(LiftingSurfaceDragComp(vec_size=3, count=count), point, atol=0.0)
