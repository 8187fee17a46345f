"""Rating margin and fan diameter limit."""

import numpy as np
import openmdao.api as om

from voltwake.components.ratings import DiameterLimitComp, RatingMarginComp

from partials import check_component_partials


def test_rating_partials_two_points():
    check_component_partials(
        RatingMarginComp(vec_size=3, units='W'),
        {'value': [1e6, 2e6, 3e6], 'rating': [2e6, 2e6, 2.5e6]},
    )
    check_component_partials(
        RatingMarginComp(vec_size=3), {'value': [0.2, 1.5, 0.9], 'rating': [1.0, 1.2, 3.0]}
    )


def test_rating_values_and_units():
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', RatingMarginComp(vec_size=3, units='A/m**2'), promotes=['*'])
    prob.setup()
    prob.set_val('value', [2.0, 5.0, 6.0], units='A/mm**2')
    prob.set_val('rating', [5e6, 5e6, 5e6], units='A/m**2')
    prob.run_model()
    # 1 - value / rating, hand arithmetic (2, 5, 6 A/mm**2 against 5 A/mm**2).
    np.testing.assert_allclose(prob.get_val('margin'), [0.6, 0.0, -0.2], atol=1e-14)


def test_diameter_partials_two_points():
    check_component_partials(
        DiameterLimitComp(vec_size=3),
        {
            'fan_diameter': [1.5, 2.0, 2.8],
            'fuselage_diameter': [3.9, 4.0, 4.2],
            'max_diameter_ratio': [0.6, 0.8, 1.0],
        },
    )
    check_component_partials(
        DiameterLimitComp(vec_size=3),
        {
            'fan_diameter': [3.5, 1.0, 2.2],
            'fuselage_diameter': [3.0, 5.5, 4.0],
            'max_diameter_ratio': [1.1, 0.5, 0.55],
        },
    )


def test_diameter_values():
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', DiameterLimitComp(vec_size=3), promotes=['*'])
    prob.setup()
    prob.set_val('fan_diameter', [2.0, 3.2, 3.6])
    prob.set_val('fuselage_diameter', [4.0, 4.0, 4.0])
    prob.set_val('max_diameter_ratio', [0.8, 0.8, 0.8])
    prob.run_model()
    # 1 - D_fan / (ratio D_fus) with ratio D_fus = 3.2 m, hand arithmetic.
    np.testing.assert_allclose(
        prob.get_val('diameter_margin'), [1.0 - 2.0 / 3.2, 0.0, 1.0 - 3.6 / 3.2], atol=1e-14
    )
