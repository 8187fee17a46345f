"""Tests of the landing-gear and the systems, furnishings and operating-items mass components."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.equipment_mass import LandingGearMassComp, SystemsMassComp

from partials import check_component_partials

KG_PER_LB = 0.45359237  # exact definition of the pound


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def _imperial_gear_kg(mass_kg, a, b, c, d, k_uc=1.0):
    """Torenbeek's undercarriage formula (Synthesis of Subsonic Airplane Design; from memory)."""
    w = mass_kg / KG_PER_LB
    return k_uc * (a + b * w**0.75 + c * w + d * w**1.5) * KG_PER_LB


# Jet transports, retractable gear (Torenbeek, Synthesis of Subsonic Airplane Design, ch. 8;
# coefficients from memory).
MAIN = (40.0, 0.16, 0.019, 1.5e-5)
NOSE = (20.0, 0.10, 0.0, 2.0e-6)


def test_gear_hand_value_of_the_twin():
    # Hand value from the equation above: W = 70,000 kg = 154,323.58 lb, W**0.75 = 7,783.0,
    # W**1.5 = 6.0624e7; main 40 + 1,245.3 + 2,932.1 + 909.4 = 5,127.30 lb = 2,325.71 kg;
    # nose 20 + 778.3 + 121.2 = 919.87 lb = 417.24 kg; together 2,742.95 kg.
    prob = _run(LandingGearMassComp(), {'design_mass': 70000.0})
    assert prob.get_val('main_gear_mass')[0] == pytest.approx(2325.706134412, rel=1e-11)
    assert prob.get_val('nose_gear_mass')[0] == pytest.approx(417.2445132545, rel=1e-11)
    assert prob.get_val('landing_gear_mass')[0] == pytest.approx(2742.950647667, rel=1e-11)
    assert prob.get_val('main_gear_mass')[0] / KG_PER_LB == pytest.approx(5127.3043557, rel=1e-10)


@pytest.mark.parametrize('position, k_uc', [('low', 1.0), ('high', 1.08)])
def test_gear_against_an_independent_imperial_evaluation(position, k_uc):
    masses = np.array([20000.0, 70000.0, 300000.0])
    prob = _run(LandingGearMassComp(vec_size=3, wing_position=position), {'design_mass': masses})
    main = [_imperial_gear_kg(m, *MAIN, k_uc=k_uc) for m in masses]
    nose = [_imperial_gear_kg(m, *NOSE, k_uc=k_uc) for m in masses]
    np.testing.assert_allclose(prob.get_val('main_gear_mass'), main, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('nose_gear_mass'), nose, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('landing_gear_mass'), np.add(main, nose), rtol=1e-12)


def test_gear_mass_rises_with_design_mass_and_plausibility():
    masses = np.array([40000.0, 70000.0, 100000.0])
    prob = _run(LandingGearMassComp(vec_size=3), {'design_mass': masses})
    gear = prob.get_val('landing_gear_mass')
    assert np.all(np.diff(gear) > 0.0)
    # Plausibility, additional to the hand values: the landing gear of a jet transport is
    # about 3-5 % of MTOW (common practice, from memory).
    assert np.all((gear / masses > 0.03) & (gear / masses < 0.05))


def test_wing_position_is_validated():
    with pytest.raises(ValueError):
        LandingGearMassComp(wing_position='mid')


def test_systems_hand_values_and_defaults():
    # Defaults: f_sys = 0.08, 100 kg per passenger, 50 kg furnishings and 15 kg operating
    # items per passenger (common practice, from memory). 12,000 kg payload = 120
    # passengers: systems 0.08 * 70,000 = 5,600 kg, furnishings 120 * 50 = 6,000 kg,
    # operating items 120 * 15 = 1,800 kg (hand values from the equations).
    prob = _run(SystemsMassComp(), {'design_mass': 70000.0, 'payload': 12000.0})
    assert prob.get_val('systems_mass')[0] == pytest.approx(5600.0, rel=1e-15)
    assert prob.get_val('furnishings_mass')[0] == pytest.approx(6000.0, rel=1e-15)
    assert prob.get_val('operating_items_mass')[0] == pytest.approx(1800.0, rel=1e-15)


def test_systems_hand_values_per_point():
    prob = _run(
        SystemsMassComp(vec_size=3),
        {
            'design_mass': [40000.0, 70000.0, 200000.0],
            'payload': [9000.0, 12000.0, 30000.0],
            'systems_fraction': [0.1, 0.08, 0.07],
            'mass_per_passenger': [90.0, 100.0, 120.0],
            'furnishings_per_passenger': [45.0, 50.0, 60.0],
            'operating_items_per_passenger': [15.0, 15.0, 20.0],
        },
    )
    # Hand values: 100, 120 and 250 passengers.
    np.testing.assert_allclose(prob.get_val('systems_mass'), [4000.0, 5600.0, 14000.0], rtol=1e-14)
    np.testing.assert_allclose(
        prob.get_val('furnishings_mass'), [4500.0, 6000.0, 15000.0], rtol=1e-14
    )
    np.testing.assert_allclose(
        prob.get_val('operating_items_mass'), [1500.0, 1800.0, 5000.0], rtol=1e-14
    )


def test_furnishings_rise_with_passengers():
    # More payload at the same mass per passenger means more passengers; the same payload
    # at a higher mass per passenger means fewer.
    more = _run(SystemsMassComp(vec_size=3), {'payload': [8000.0, 12000.0, 16000.0]})
    for name in ['furnishings_mass', 'operating_items_mass']:
        assert np.all(np.diff(more.get_val(name)) > 0.0)
    fewer = _run(SystemsMassComp(vec_size=3), {'mass_per_passenger': [90.0, 100.0, 110.0]})
    assert np.all(np.diff(fewer.get_val('furnishings_mass')) < 0.0)
    np.testing.assert_allclose(more.get_val('systems_mass'), 5600.0, rtol=1e-15)


@pytest.mark.parametrize('position', ['low', 'high'])
@pytest.mark.parametrize(
    'masses', [[20000.0, 70000.0, 300000.0], [55000.0, 9000.0, 140000.0]], ids=['a', 'b']
)
def test_gear_partials(position, masses):
    check_component_partials(
        LandingGearMassComp(vec_size=3, wing_position=position), {'design_mass': masses}
    )


@pytest.mark.parametrize(
    'point',
    [
        {
            'design_mass': [40000.0, 70000.0, 200000.0],
            'payload': [9000.0, 12000.0, 30000.0],
            'systems_fraction': [0.1, 0.08, 0.07],
            'mass_per_passenger': [90.0, 100.0, 120.0],
            'furnishings_per_passenger': [45.0, 50.0, 60.0],
            'operating_items_per_passenger': [15.0, 17.0, 20.0],
        },
        {
            'design_mass': [90000.0, 25000.0, 60000.0],
            'payload': [15000.0, 5000.0, 11000.0],
            'systems_fraction': [0.09, 0.1, 0.075],
            'mass_per_passenger': [105.0, 95.0, 100.0],
            'furnishings_per_passenger': [55.0, 40.0, 58.0],
            'operating_items_per_passenger': [18.0, 12.0, 16.0],
        },
    ],
)
def test_systems_partials(point):
    check_component_partials(SystemsMassComp(vec_size=3), point)
