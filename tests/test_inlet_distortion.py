"""Tests of DistortedFanEfficiencyComp: fan efficiency lost to a non-uniform inflow."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.inlet_distortion import DistortedFanEfficiencyComp

from partials import check_component_partials


def test_hand_values_and_clean_limit():
    # eta = eta_clean - k psi (the stated assumption of the docstring). For a capture inside
    # a 1/7 power-law layer psi = 1/(n+2)^2 = 1/81, so k = 1.2 costs 1.2/81 = 0.0148.
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('eff', DistortedFanEfficiencyComp(vec_size=2), promotes=['*'])
    prob.setup()
    prob.set_val('clean_fan_efficiency', [0.92, 0.92])
    prob.set_val('inflow_nonuniformity', [1.0 / 81.0, 0.0])
    prob.set_val('distortion_sensitivity', [1.2, 1.2])
    prob.run_model()
    assert prob.get_val('fan_efficiency') == pytest.approx([0.92 - 1.2 / 81.0, 0.92], abs=1e-15)


def test_partials():
    for point in ([0.012, 0.004, 0.0], [0.0, 0.03, 0.011]):
        check_component_partials(
            DistortedFanEfficiencyComp(vec_size=3),
            {
                'clean_fan_efficiency': [0.9, 0.92, 0.94],
                'inflow_nonuniformity': point,
                'distortion_sensitivity': np.array([1.2, 0.5, 2.0]),
            },
        )
