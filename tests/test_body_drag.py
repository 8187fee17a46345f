"""Tests of the body zero-lift drag build-up component."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.body_drag import BodyDragComp

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


# rho V f D / mu with rho = 1, mu = 1e-5, D = 1 m, f = 10 gives Re = 1e6, 1e7, 1e8.
UNIT_BODY = {
    'diameter': [1.0, 1.0, 1.0],
    'fineness_ratio': [10.0, 10.0, 10.0],
    'true_airspeed': [1.0, 10.0, 100.0],
    'density': [1.0, 1.0, 1.0],
    'viscosity': [1.0e-5, 1.0e-5, 1.0e-5],
}


# Prandtl-Schlichting cf = 0.455 / (log10 Re)**2.58 at Re = 1e6, 1e7, 1e8 (M = 0), evaluated
# by hand: 0.455 / 6**2.58, 0.455 / 7**2.58, 0.455 / 8**2.58.
INCOMPRESSIBLE_CF = np.array([0.004470758085612, 0.003003713133159, 0.002128331291413])


@pytest.mark.parametrize('shape', ['fuselage', 'nacelle'])
def test_skin_friction_hand_values(shape):
    prob = _run(BodyDragComp(vec_size=3, shape=shape), dict(UNIT_BODY, mach=[0.0, 0.78, 0.85]))
    np.testing.assert_allclose(prob.get_val('reynolds_number'), [1.0e6, 1.0e7, 1.0e8], rtol=1e-13)
    np.testing.assert_allclose(prob.get_val('length'), [10.0, 10.0, 10.0], rtol=1e-15)
    # Compressibility correction (1 + 0.144 M**2)**-0.65 (Raymer, Aircraft Design: A
    # Conceptual Approach, 6th ed., ch. 12, eq. 12.27; equation number from memory), hand
    # values: 1 at M = 0, 1.0876096**-0.65 = 0.9468747 at M = 0.78, 1.10404**-0.65 = 0.9376913
    # at M = 0.85.
    np.testing.assert_allclose(
        prob.get_val('skin_friction_coefficient'),
        INCOMPRESSIBLE_CF * [1.0, 0.9468747357762, 0.9376912739477],
        rtol=1e-12,
    )


def test_compressibility_scales_friction_and_drag_area():
    # At fixed Reynolds number the Mach number acts only through the correction factor.
    prob = _run(BodyDragComp(vec_size=3), dict(UNIT_BODY, mach=[0.78, 0.78, 0.78]))
    rest = _run(BodyDragComp(vec_size=3), dict(UNIT_BODY, mach=[0.0, 0.0, 0.0]))
    np.testing.assert_allclose(
        rest.get_val('skin_friction_coefficient'), INCOMPRESSIBLE_CF, rtol=1e-12
    )
    for name in ['skin_friction_coefficient', 'drag_area']:
        np.testing.assert_allclose(
            prob.get_val(name) / rest.get_val(name), 0.9468747357762, rtol=1e-12
        )
    for name in ['reynolds_number', 'form_factor', 'wetted_area']:
        np.testing.assert_allclose(prob.get_val(name), rest.get_val(name), rtol=1e-15)


def test_fuselage_form_factor_wetted_area_and_drag_area():
    prob = _run(
        BodyDragComp(vec_size=3, shape='fuselage'),
        dict(UNIT_BODY, interference_factor=[1.0, 1.0, 1.1]),
    )
    # FF = 1 + 60 / 10**3 + 10 / 400 = 1.085 (Raymer fuselage form factor, from memory).
    np.testing.assert_allclose(prob.get_val('form_factor'), 1.085, rtol=1e-14)
    # S_wet = pi D L (1 - 2/f)**(2/3) (1 + 1/f**2) = pi * 10 * 0.8**(2/3) * 1.01
    #       = 27.34415902717 m**2 (Torenbeek approximation, from memory; evaluated by hand).
    np.testing.assert_allclose(prob.get_val('wetted_area'), 27.34415902717, rtol=1e-11)
    cf = prob.get_val('skin_friction_coefficient')
    np.testing.assert_allclose(
        prob.get_val('drag_area'),
        cf * 1.085 * np.array([1.0, 1.0, 1.1]) * 27.34415902717,
        rtol=1e-11,
    )


def test_nacelle_form_factor_and_wetted_area():
    prob = _run(BodyDragComp(vec_size=3, shape='nacelle'), UNIT_BODY)
    # FF = 1 + 0.35 / 10 = 1.035 (Raymer nacelle form factor, from memory).
    np.testing.assert_allclose(prob.get_val('form_factor'), 1.035, rtol=1e-14)
    # Open cylinder: pi D L = 10 pi m**2 (common practice).
    np.testing.assert_allclose(prob.get_val('wetted_area'), 10.0 * np.pi, rtol=1e-14)


@pytest.mark.parametrize('shape', ['fuselage', 'nacelle'])
def test_count_scales_area_not_coefficients(shape):
    one = _run(BodyDragComp(vec_size=3, shape=shape), UNIT_BODY)
    two = _run(BodyDragComp(vec_size=3, shape=shape, count=2), UNIT_BODY)
    for name in ['wetted_area', 'drag_area']:
        np.testing.assert_allclose(two.get_val(name), 2.0 * one.get_val(name), rtol=1e-14)
    for name in ['skin_friction_coefficient', 'form_factor', 'reynolds_number']:
        np.testing.assert_allclose(two.get_val(name), one.get_val(name), rtol=1e-14)


def test_trends():
    # Skin friction falls with Reynolds number; the fuselage form factor has its minimum
    # at f = 72000**0.25 = 16.4 (d FF / d f = 0); the fuselage wetted area tends to the
    # cylinder pi D L for very slender bodies.
    fineness = np.array([8.0, 72000.0**0.25, 25.0])
    prob = _run(BodyDragComp(vec_size=3), {'diameter': [4.0, 4.0, 4.0], 'fineness_ratio': fineness})
    assert np.all(np.diff(prob.get_val('skin_friction_coefficient')) < 0.0)
    form_factor = prob.get_val('form_factor')
    assert form_factor[1] < form_factor[0] and form_factor[1] < form_factor[2]
    slender = _run(BodyDragComp(), {'diameter': [1.0], 'fineness_ratio': [1.0e4]})
    assert slender.get_val('wetted_area')[0] == pytest.approx(np.pi * 1.0e4, rel=2e-4)


def test_options_are_validated():
    with pytest.raises(ValueError):
        BodyDragComp(shape='wing')
    with pytest.raises(ValueError):
        BodyDragComp(count=0)


POINTS = [
    {
        'diameter': [3.9, 4.1, 6.0],
        'fineness_ratio': [9.5, 11.0, 12.5],
        'true_airspeed': [230.0, 75.0, 250.0],
        'mach': [0.78, 0.3, 0.85],
        'density': [0.38, 1.2, 0.31],
        'viscosity': [1.43e-5, 1.79e-5, 1.42e-5],
        'interference_factor': [1.0, 1.05, 1.2],
    },
    {
        'diameter': [2.2, 1.8, 3.0],
        'fineness_ratio': [3.0, 4.5, 6.0],
        'true_airspeed': [120.0, 200.0, 240.0],
        'mach': [0.3, 0.85, 0.78],
        'density': [0.9, 0.5, 0.36],
        'viscosity': [1.7e-5, 1.5e-5, 1.42e-5],
        'interference_factor': [1.3, 1.0, 1.1],
    },
]


@pytest.mark.parametrize('count', [1, 2])
@pytest.mark.parametrize('shape', ['fuselage', 'nacelle'])
@pytest.mark.parametrize('point', POINTS)
def test_partials(shape, count, point):
    # atol=0: skin-friction gradients are as small as 1e-7 per unit input in SI, so an
    # absolute tolerance would hide errors in them; complex step is exact to round-off.
    check_component_partials(BodyDragComp(vec_size=3, shape=shape, count=count), point, atol=0.0)
