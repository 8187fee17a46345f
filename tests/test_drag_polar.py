"""Tests of the parabolic drag polar component."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.drag_polar import DragPolarComp

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_hand_values():
    prob = _run(
        DragPolarComp(),
        {
            'lift_coefficient': 0.5,
            'aspect_ratio': 10.0,
            'oswald_efficiency': 0.8,
            'wing_area': 100.0,
            'dynamic_pressure': 1.0e4,
            'miscellaneous_drag_coefficient': 0.001,
            'wing_drag_area': 0.9,
            'fuselage_drag_area': 0.6,
            'nacelle_drag_area': 0.3,
            'aft_nacelle_drag_area': 0.1,
            'wave_drag_coefficient': 0.0005,
            'extra_drag': 500.0,
        },
    )
    # Hand calculation from the formulas in the class docstring:
    # CD0 = 0.001 + (0.9 + 0.6 + 0.3 + 0.1) / 100 = 0.02; CDi = 0.25 / (8 pi)
    # = 0.009947183943243; CD = CD0 + CDi + 0.0005;
    # D = 1e4 * 100 * CD + 500 = 30947.18394324 N; L/D = 5e5 / D = 16.15654137...
    assert prob.get_val('zero_lift_drag_coefficient')[0] == pytest.approx(0.02, rel=1e-14)
    assert prob.get_val('induced_drag_coefficient')[0] == pytest.approx(
        0.009947183943243, rel=1e-12
    )
    assert prob.get_val('drag_coefficient')[0] == pytest.approx(0.030447183943243, rel=1e-12)
    assert prob.get_val('drag')[0] == pytest.approx(30947.18394324, rel=1e-12)
    assert prob.get_val('lift_to_drag')[0] == pytest.approx(5.0e5 / 30947.18394324, rel=1e-12)
    assert prob.get_val('fuselage_drag')[0] == pytest.approx(6000.0, rel=1e-14)


def test_best_lift_to_drag_by_scan():
    # Maximum L/D of a parabolic polar is at CL* = sqrt(CD0 pi e A), where
    # (L/D)max = 0.5 sqrt(pi e A / CD0) (Anderson, Introduction to Flight, ch. 6; from memory).
    lift_coefficient = np.linspace(0.1, 1.5, 4001)
    step = lift_coefficient[1] - lift_coefficient[0]
    n = lift_coefficient.size
    prob = _run(
        DragPolarComp(vec_size=n),
        {
            'lift_coefficient': lift_coefficient,
            'aspect_ratio': np.full(n, 9.5),
            'oswald_efficiency': np.full(n, 0.8),
            'wing_area': np.full(n, 120.0),
            'miscellaneous_drag_coefficient': np.full(n, 0.002),
            'wing_drag_area': np.full(n, 1.2),
            'fuselage_drag_area': np.full(n, 0.8),
            'nacelle_drag_area': np.full(n, 0.2),
            'aft_nacelle_drag_area': np.full(n, 0.1),
        },
    )
    cd0 = 0.002 + 2.3 / 120.0
    best_cl = np.sqrt(cd0 * np.pi * 0.8 * 9.5)
    ratio = prob.get_val('lift_to_drag')
    assert lift_coefficient[np.argmax(ratio)] == pytest.approx(best_cl, abs=step)
    assert ratio.max() == pytest.approx(0.5 * np.sqrt(np.pi * 0.8 * 9.5 / cd0), rel=1e-6)


def test_extra_drag_adds_force_only():
    base = {'lift_coefficient': [0.5, 0.5], 'dynamic_pressure': [1.0e4, 1.0e4]}
    prob = _run(DragPolarComp(vec_size=2), dict(base, extra_drag=[0.0, 1000.0]))
    drag = prob.get_val('drag')
    assert drag[1] - drag[0] == pytest.approx(1000.0, rel=1e-12)
    coefficient = prob.get_val('drag_coefficient')
    assert coefficient[1] == coefficient[0]
    ratio = prob.get_val('lift_to_drag')
    assert ratio[1] == pytest.approx(ratio[0] * drag[0] / drag[1], rel=1e-13)


POINTS = [
    {
        'lift_coefficient': [0.3, 0.5, 0.7],
        'aspect_ratio': [9.0, 10.5, 12.0],
        'oswald_efficiency': [0.75, 0.8, 0.85],
        'wing_area': [110.0, 122.0, 140.0],
        'dynamic_pressure': [8.0e3, 1.0e4, 1.3e4],
        'miscellaneous_drag_coefficient': [0.0010, 0.0012, 0.0014],
        'wing_drag_area': [0.8, 1.0, 1.3],
        'wave_drag_coefficient': [0.0, 0.0004, 0.003],
        'fuselage_drag_area': [0.7, 0.8, 0.9],
        'nacelle_drag_area': [0.15, 0.2, 0.25],
        'aft_nacelle_drag_area': [0.0, 0.05, 0.1],
        'horizontal_tail_drag_area': [0.08, 0.1, 0.0],
        'vertical_tail_drag_area': [0.07, 0.0, 0.09],
        'extra_drag': [0.0, 300.0, 800.0],
    },
    {
        'lift_coefficient': [1.2, 0.9, 0.2],
        'aspect_ratio': [7.0, 14.0, 8.0],
        'oswald_efficiency': [0.7, 0.9, 0.82],
        'wing_area': [60.0, 300.0, 90.0],
        'dynamic_pressure': [3.0e3, 6.0e3, 1.6e4],
        'miscellaneous_drag_coefficient': [0.002, 0.0009, 0.0],
        'wing_drag_area': [0.5, 2.6, 0.7],
        'wave_drag_coefficient': [0.01, 0.0, 1e-5],
        'fuselage_drag_area': [0.4, 1.8, 0.6],
        'nacelle_drag_area': [0.1, 0.5, 0.12],
        'aft_nacelle_drag_area': [0.02, 0.2, 0.0],
        'horizontal_tail_drag_area': [0.2, 0.05, 0.11],
        'vertical_tail_drag_area': [0.15, 0.04, 0.1],
        'extra_drag': [100.0, 0.0, 2000.0],
    },
]


@pytest.mark.parametrize('point', POINTS)
def test_partials(point):
    # Tiny atol: L/D wrt dynamic pressure is exactly zero when extra_drag is 0 (complex step
    # gives round-off ~1e-19 there); the smallest true partials here are ~1e-6.
    check_component_partials(DragPolarComp(vec_size=3), point, atol=1e-15)
