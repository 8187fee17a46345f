"""Nacelle geometry and propulsion-system bookkeeping."""

import numpy as np

from voltwake.components.nacelle import NacelleGeometryComp
from voltwake.components.propulsion_system import PropulsionSystemComp

from partials import check_component_partials


def test_nacelle_partials_and_value():
    prob = check_component_partials(
        NacelleGeometryComp(vec_size=3),
        {'fan_diameter': [1.2, 1.8, 2.4], 'diameter_ratio': [1.1, 1.25, 1.4]},
    )
    np.testing.assert_allclose(prob.get_val('nacelle_diameter'), [1.32, 2.25, 3.36])


def test_propulsion_system_partials_and_values():
    for count in (1, 2, 4):
        prob = check_component_partials(
            PropulsionSystemComp(vec_size=3, num_engines=count),
            {'engine_fuel_flow': [0.2, 0.3, 0.4], 'shaft_power_extracted': [0.0, 1e6, 3e6]},
        )
        np.testing.assert_allclose(prob.get_val('fuel_flow'), count * np.array([0.2, 0.3, 0.4]))
        np.testing.assert_allclose(
            prob.get_val('engine_power_extraction'), np.array([0.0, 1e6, 3e6]) / count
        )
