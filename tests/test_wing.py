"""Tests of the wing area, span and lift coefficient components."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.wing import (
    ExposedWingComp,
    LiftCoefficientComp,
    WingAreaComp,
    WingGeometryComp,
)

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_wing_area_hand_values():
    # S = m / (m/S): 70,000 kg at 560 kg/m**2 is 125 m**2; 36,000 / 600 = 60;
    # 300,000 / 750 = 400.
    prob = _run(
        WingAreaComp(vec_size=3),
        {'mtow': [7.0e4, 3.6e4, 3.0e5], 'design_wing_loading': [560.0, 600.0, 750.0]},
    )
    np.testing.assert_allclose(prob.get_val('wing_area'), [125.0, 60.0, 400.0], rtol=1e-14)


def test_wing_area_units():
    # A loading in lb/ft**2 is converted by OpenMDAO: 1 lb/ft**2 = 4.88243 kg/m**2
    # (0.45359237 kg / 0.09290304 m**2, exact definitions of the pound and foot).
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', WingAreaComp(), promotes=['*'])
    prob.setup()
    prob.set_val('mtow', 0.45359237e4, units='kg')
    prob.set_val('design_wing_loading', 100.0, units='lbm/ft**2')
    prob.run_model()
    assert prob.get_val('wing_area', units='ft**2')[0] == pytest.approx(100.0, rel=1e-12)


@pytest.mark.parametrize(
    'point',
    [
        {'mtow': [7.0e4, 3.6e4, 3.0e5], 'design_wing_loading': [560.0, 600.0, 750.0]},
        {'mtow': [2.0e3, 9.0e4, 5.5e5], 'design_wing_loading': [150.0, 420.0, 800.0]},
    ],
)
def test_wing_area_partials(point):
    # atol=0 so that only the relative error counts (complex step is exact to round-off).
    check_component_partials(WingAreaComp(vec_size=3), point, atol=0.0)


def test_wingspan_hand_values():
    # b = sqrt(A S): sqrt(9 * 100) = 30 m, sqrt(12 * 75) = 30 m, sqrt(8 * 50) = 20 m.
    prob = _run(
        WingGeometryComp(vec_size=3),
        {'wing_area': [100.0, 75.0, 50.0], 'aspect_ratio': [9.0, 12.0, 8.0]},
    )
    np.testing.assert_allclose(prob.get_val('wingspan'), [30.0, 30.0, 20.0], rtol=1e-14)


def test_lift_coefficient_hand_values():
    # CL = m g0 / (q S): 6e5 N / (1e4 * 120) = 0.5; 4e5 N / (8e3 * 100) = 0.5;
    # 1e5 N / (5e3 * 40) = 0.5, with the masses m = W / 9.80665.
    prob = _run(
        LiftCoefficientComp(vec_size=3),
        {
            'mass': np.array([6.0e5, 4.0e5, 1.0e5]) / 9.80665,
            'dynamic_pressure': [1.0e4, 8.0e3, 5.0e3],
            'wing_area': [120.0, 100.0, 40.0],
        },
    )
    np.testing.assert_allclose(prob.get_val('lift_coefficient'), [0.5, 0.5, 0.5], rtol=1e-14)


def test_lift_coefficient_units():
    # A mass given in tonnes must be converted by OpenMDAO, not by the component.
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', LiftCoefficientComp(), promotes=['*'])
    prob.setup()
    prob.set_val('mass', 600.0 / 9.80665, units='t')
    prob.run_model()
    assert prob.get_val('lift_coefficient')[0] == pytest.approx(0.5, rel=1e-14)


@pytest.mark.parametrize(
    'point',
    [
        {'wing_area': [100.0, 122.0, 360.0], 'aspect_ratio': [9.0, 10.5, 8.7]},
        {'wing_area': [20.0, 60.0, 200.0], 'aspect_ratio': [12.0, 7.0, 14.0]},
    ],
)
def test_wing_geometry_partials(point):
    # atol=0 so that only the relative error counts (complex step is exact to round-off).
    check_component_partials(WingGeometryComp(vec_size=3), point, atol=0.0)


@pytest.mark.parametrize(
    'point',
    [
        {
            'mass': [6.0e4, 7.5e4, 2.0e5],
            'dynamic_pressure': [1.0e4, 1.2e4, 9.0e3],
            'wing_area': [120.0, 130.0, 360.0],
        },
        {
            'mass': [1.0e4, 3.0e4, 5.0e4],
            'dynamic_pressure': [3.0e3, 6.0e3, 1.5e4],
            'wing_area': [40.0, 90.0, 110.0],
        },
    ],
)
def test_lift_coefficient_partials(point):
    # atol=0 so that only the relative error counts (complex step is exact to round-off).
    check_component_partials(LiftCoefficientComp(vec_size=3), point, atol=0.0)


def test_exposed_wing_hand_values():
    # hand value from the trapezoid of the class docstring: S = 122 m**2, b = 36 m,
    # taper 0.25, d = 3.9 m: c_r = 244 / 45 = 5.4222 m, c_s = c_r (1 - 0.75 * 3.9 / 36)
    # = 4.9817 m, S_exp = 122 - 3.9 (c_r + c_s) / 2 = 101.712 m**2; b_exp = 32.1 m.
    prob = _run(
        ExposedWingComp(),
        {'wing_area': 122.0, 'wingspan': 36.0, 'taper_ratio': 0.25, 'fuselage_diameter': 3.9},
    )
    root = 244.0 / 45.0
    side = root * (1.0 - 0.75 * 3.9 / 36.0)
    exposed = 122.0 - 3.9 * 0.5 * (root + side)
    assert exposed == pytest.approx(101.712, abs=1e-3)
    assert prob.get_val('exposed_wing_area')[0] == pytest.approx(exposed, rel=1e-13)
    assert prob.get_val('exposed_wing_aspect_ratio')[0] == pytest.approx(
        32.1**2 / exposed, rel=1e-13
    )


def test_exposed_wing_limits():
    # no fuselage: the whole reference wing is exposed; a rectangular wing loses d * chord.
    prob = _run(
        ExposedWingComp(vec_size=2),
        {
            'wing_area': [100.0, 100.0],
            'wingspan': [30.0, 30.0],
            'taper_ratio': [0.3, 1.0],
            'fuselage_diameter': [0.0, 3.0],
        },
    )
    assert prob.get_val('exposed_wing_area') == pytest.approx([100.0, 100.0 - 3.0 * 100.0 / 30.0])
    assert prob.get_val('exposed_wing_aspect_ratio')[0] == pytest.approx(9.0, rel=1e-14)


@pytest.mark.parametrize(
    'point',
    [
        {
            'wing_area': [80.0, 122.0, 200.0],
            'wingspan': [28.0, 36.0, 52.0],
            'taper_ratio': [0.2, 0.3, 0.45],
            'fuselage_diameter': [3.7, 3.9, 5.6],
        },
        {
            'wing_area': [60.0, 140.0, 90.0],
            'wingspan': [20.0, 48.0, 30.0],
            'taper_ratio': [1.0, 0.15, 0.6],
            'fuselage_diameter': [2.0, 4.5, 3.0],
        },
    ],
)
def test_exposed_wing_partials(point):
    check_component_partials(ExposedWingComp(vec_size=3), point)
