"""Tests of ThrustSplitComp."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.thrust_split import ThrustSplitComp

from partials import check_component_partials


def _run(num_engines, **inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'split', ThrustSplitComp(vec_size=3, num_engines=num_engines), promotes=['*']
    )
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def test_hand_calculation():
    # F_tf = (1 - phi) D / n, F_aft = phi D (definitions; demo inputs).
    prob = _run(2, drag=[40000.0, 40000.0, 50000.0], aft_thrust_fraction=[0.0, 0.2, 0.5])
    assert prob.get_val('turbofan_thrust') == pytest.approx([20000.0, 16000.0, 12500.0], rel=1e-12)
    assert prob.get_val('aft_fan_thrust') == pytest.approx(
        [0.0, 8000.0, 25000.0], rel=1e-12, abs=1e-9
    )


def test_thrust_sums_to_drag():
    # Steady level flight: total net thrust equals drag (common practice).
    drag = np.array([35000.0, 42000.0, 51000.0])
    prob = _run(4, drag=drag, aft_thrust_fraction=[0.1, 0.25, 0.4])
    total = 4 * prob.get_val('turbofan_thrust') + prob.get_val('aft_fan_thrust')
    assert np.allclose(total, drag, rtol=1e-12)


def test_partials():
    check_component_partials(
        ThrustSplitComp(vec_size=3, num_engines=2),
        {
            'drag': [35000.0, 40000.0, 48000.0],
            'aft_thrust_fraction': [0.0, 0.15, 0.3],
        },
    )
    check_component_partials(
        ThrustSplitComp(vec_size=3, num_engines=3),
        {
            'drag': [60000.0, 25000.0, 41000.0],
            'aft_thrust_fraction': [0.45, 0.05, 0.2],
        },
    )
