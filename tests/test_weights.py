"""Tests of the airframe mass regression and the mass build-up."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.weights import AirframeMassComp, MassBuildUpComp, MassSumComp

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_airframe_regression_hand_value():
    # hand calculation of the regression formula m = c * MTOW**k:
    # ln(80000) = 11.28978, * 0.95 = 10.72529, exp = 45492.05, * 0.9 = 40942.84 kg
    prob = _run(
        AirframeMassComp(),
        {'mtow': 80000.0, 'airframe_mass_coefficient': 0.9, 'airframe_mass_exponent': 0.95},
    )
    assert prob.get_val('airframe_mass', units='kg')[0] == pytest.approx(40942.84, rel=1e-6)


def test_airframe_regression_limits_and_trend():
    # k = 1: the airframe mass is the constant fraction c of MTOW (formula limit)
    prob = _run(
        AirframeMassComp(vec_size=3),
        {'mtow': [5e4, 1e5, 2e5], 'airframe_mass_coefficient': 0.45, 'airframe_mass_exponent': 1.0},
    )
    np.testing.assert_allclose(
        prob.get_val('airframe_mass'), [22500.0, 45000.0, 90000.0], rtol=1e-12
    )
    # k < 1: the airframe mass fraction falls as MTOW grows (economy of scale)
    prob = _run(
        AirframeMassComp(vec_size=3),
        {'mtow': [5e4, 1e5, 2e5], 'airframe_mass_coefficient': 0.9, 'airframe_mass_exponent': 0.95},
    )
    frac = prob.get_val('airframe_mass') / np.array([5e4, 1e5, 2e5])
    assert np.all(np.diff(frac) < 0.0)


def test_airframe_partials():
    for mtow, c, k in (
        ([4e4, 8e4, 3e5], [0.9, 0.5, 1.2], [0.95, 1.0, 0.9]),
        ([1.5e3, 2e4, 6e5], [0.3, 0.7, 2.0], [1.05, 0.97, 0.85]),
    ):
        check_component_partials(
            AirframeMassComp(vec_size=3),
            {'mtow': mtow, 'airframe_mass_coefficient': c, 'airframe_mass_exponent': k},
        )


def test_mass_build_up_sums():
    items = ['engines', 'generators', 'aft_fan']
    prob = _run(
        MassBuildUpComp(vec_size=2, propulsion_items=items),
        {
            'airframe_mass': [30000.0, 41000.0],
            'engines_mass': [6000.0, 7000.0],
            'generators_mass': [1500.0, 1200.0],
            'aft_fan_mass': [800.0, 900.0],
            'payload': [18000.0, 20000.0],
            'total_fuel': [12000.0, 15500.0],
        },
    )
    np.testing.assert_allclose(prob.get_val('propulsion_mass'), [8300.0, 9100.0], rtol=1e-14)
    np.testing.assert_allclose(prob.get_val('oew'), [38300.0, 50100.0], rtol=1e-14)
    np.testing.assert_allclose(prob.get_val('mtow'), [68300.0, 85600.0], rtol=1e-14)


def test_mass_build_up_default_item_and_empty_list():
    prob = _run(
        MassBuildUpComp(),
        {
            'airframe_mass': 30000.0,
            'engines_mass': 6000.0,
            'payload': 18000.0,
            'total_fuel': 12000.0,
        },
    )
    assert prob.get_val('oew')[0] == pytest.approx(36000.0, rel=1e-14)
    prob = _run(
        MassBuildUpComp(propulsion_items=[]),
        {'airframe_mass': 30000.0, 'payload': 18000.0, 'total_fuel': 12000.0},
    )
    assert prob.get_val('propulsion_mass')[0] == 0.0
    assert prob.get_val('mtow')[0] == pytest.approx(60000.0, rel=1e-14)


@pytest.mark.parametrize('items', [['airframe'], ['propulsion'], ['engines', 'engines']])
def test_mass_build_up_rejects_clashing_items(items):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', MassBuildUpComp(propulsion_items=items))
    with pytest.raises(ValueError):
        prob.setup()


def test_mass_build_up_partials():
    items = ['engines', 'generators', 'aft_fan']
    points = (
        {
            'airframe_mass': [30000.0, 41000.0, 25000.0],
            'engines_mass': [6e3, 7e3, 5e3],
            'generators_mass': [1500.0, 1200.0, 900.0],
            'aft_fan_mass': [800.0, 900.0, 650.0],
            'payload': [18000.0, 20000.0, 14000.0],
            'total_fuel': [12e3, 15.5e3, 9e3],
        },
        {
            'airframe_mass': [1e3, 2e5, 5e4],
            'engines_mass': [1e2, 3e4, 8e3],
            'generators_mass': [10.0, 4e3, 2e3],
            'aft_fan_mass': [5.0, 3e3, 1e3],
            'payload': [500.0, 6e4, 2e4],
            'total_fuel': [300.0, 1e5, 2e4],
        },
    )
    for inputs in points:
        check_component_partials(MassBuildUpComp(vec_size=3, propulsion_items=items), inputs)
    check_component_partials(
        MassBuildUpComp(vec_size=3),
        {
            'airframe_mass': [3e4, 4e4, 5e4],
            'engines_mass': [5e3, 6e3, 7e3],
            'payload': [1e4, 2e4, 3e4],
            'total_fuel': [9e3, 8e3, 7e3],
        },
    )


def test_mass_sum_hand_value_and_partials():
    # m_af = sum of the items (the build-up's bookkeeping).
    items = ['wing', 'fuselage', 'landing_gear']
    prob = check_component_partials(
        MassSumComp(vec_size=3, items=items),
        {
            'wing_mass': [7000.0, 8000.0, 9500.0],
            'fuselage_mass': [8000.0, 9000.0, 7000.0],
            'landing_gear_mass': [2500.0, 2800.0, 3000.0],
        },
    )
    np.testing.assert_allclose(prob.get_val('airframe_mass'), [17500.0, 19800.0, 19500.0])
    other = check_component_partials(
        MassSumComp(vec_size=3, items=['a', 'b'], total='ab_mass'),
        {'a_mass': [1.0, 2.0, 3.0], 'b_mass': [10.0, 20.0, 30.0]},
    )
    np.testing.assert_allclose(other.get_val('ab_mass'), [11.0, 22.0, 33.0])
