"""Buffet-onset margin."""

import numpy as np
import openmdao.api as om

from voltwake.components.buffet import BuffetMarginComp

from partials import check_component_partials


def test_partials_two_points():
    check_component_partials(
        BuffetMarginComp(vec_size=3),
        {
            'lift_coefficient': [0.4, 0.5, 0.6],
            'buffet_lift_coefficient': [0.6, 0.7, 0.8],
            'buffet_margin_load_factor': [1.3, 1.3, 1.5],
        },
    )
    check_component_partials(
        BuffetMarginComp(vec_size=3),
        {
            'lift_coefficient': [0.7, 0.3, 0.55],
            'buffet_lift_coefficient': [0.75, 0.65, 0.9],
            'buffet_margin_load_factor': [1.2, 1.4, 1.0],
        },
    )


def test_values_and_boundary():
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', BuffetMarginComp(vec_size=3), promotes=['*'])
    prob.setup()
    prob.set_val('lift_coefficient', [0.5, 0.5, 0.6])
    prob.set_val('buffet_lift_coefficient', [0.65, 0.78, 0.7])
    prob.set_val('buffet_margin_load_factor', [1.3, 1.3, 1.3])
    prob.run_model()
    margin = prob.get_val('buffet_margin')
    # margin = CL_buffet / (n CL) - 1, hand arithmetic.
    np.testing.assert_allclose(
        margin, [0.65 / 0.65 - 1.0, 0.78 / 0.65 - 1.0, 0.7 / 0.78 - 1.0], rtol=1e-12, atol=1e-15
    )
    assert abs(margin[0]) < 1e-14  # exactly at the 1.3 g boundary
    assert margin[1] > 0.0 > margin[2]
