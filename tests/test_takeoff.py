"""Take-off field length from the take-off parameter correlation."""

import numpy as np
import openmdao.api as om

from voltwake.components.takeoff import TakeoffFieldLengthComp

from partials import check_component_partials

G0 = 9.80665  # standard gravity, m/s**2 (ISO 80000-3)
FT = 0.3048  # international foot, m (exact, NIST SP 811)
LBF = 4.4482216152605  # pound-force, N (exact, NIST SP 811)


def _run(**inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'comp', TakeoffFieldLengthComp(vec_size=len(inputs['mtow'])), promotes=['*']
    )
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_partials_two_points():
    check_component_partials(
        TakeoffFieldLengthComp(vec_size=3),
        {
            'mtow': [40e3, 67e3, 90e3],
            'wing_area': [90.0, 122.0, 150.0],
            'takeoff_thrust': [1.2e5, 1.7e5, 2.6e5],
            'max_lift_coefficient_takeoff': [1.9, 2.2, 2.5],
            'density_ratio': [1.0, 0.9, 0.8],
        },
    )
    check_component_partials(
        TakeoffFieldLengthComp(vec_size=3),
        {
            'mtow': [75e3, 20e3, 55e3],
            'wing_area': [130.0, 60.0, 100.0],
            'takeoff_thrust': [2.0e5, 0.7e5, 1.3e5],
            'max_lift_coefficient_takeoff': [2.0, 1.7, 2.8],
            'density_ratio': [0.75, 1.05, 1.0],
        },
    )


def test_hand_calculation_in_imperial_units():
    mass, area, thrust, cl_max, sigma = 67000.0, 122.0, 170000.0, 2.2, 0.9
    prob = _run(
        mtow=[mass],
        wing_area=[area],
        takeoff_thrust=[thrust],
        max_lift_coefficient_takeoff=[cl_max],
        density_ratio=[sigma],
    )
    # Roskam, Airplane Design Part I (1985), eqs. 3.7-3.8 (from memory):
    # TOFL [ft] = 37.5 TOP, TOP = (W/S) / (sigma CLmax_TO T/W) in lbf/ft**2.
    weight_lbf = mass * G0 / LBF
    area_ft2 = area / FT**2
    thrust_lbf = thrust / LBF
    top_imperial = (weight_lbf / area_ft2) / (sigma * cl_max * thrust_lbf / weight_lbf)
    tofl_ft = 37.5 * top_imperial
    # Back to SI with the exact unit definitions above.
    np.testing.assert_allclose(prob.get_val('takeoff_field_length'), [tofl_ft * FT], rtol=1e-12)
    np.testing.assert_allclose(
        prob.get_val('takeoff_parameter'), [top_imperial * LBF / FT**2], rtol=1e-12
    )
    np.testing.assert_allclose(prob.get_val('wing_loading'), [mass * G0 / area], rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('thrust_to_weight'), [thrust / (mass * G0)], rtol=1e-12)


def test_trends():
    base = {
        'mtow': [67e3] * 3,
        'wing_area': [122.0] * 3,
        'takeoff_thrust': [1.7e5] * 3,
        'max_lift_coefficient_takeoff': [2.2] * 3,
        'density_ratio': [1.0] * 3,
    }
    more_thrust = _run(**{**base, 'takeoff_thrust': [1.5e5, 1.7e5, 1.9e5]})
    assert np.all(np.diff(more_thrust.get_val('takeoff_field_length')) < 0.0)
    more_lift = _run(**{**base, 'max_lift_coefficient_takeoff': [2.0, 2.2, 2.4]})
    assert np.all(np.diff(more_lift.get_val('takeoff_field_length')) < 0.0)
    hot_high = _run(**{**base, 'density_ratio': [1.0, 0.9, 0.8]})
    assert np.all(np.diff(hot_high.get_val('takeoff_field_length')) > 0.0)
    heavier = _run(**{**base, 'mtow': [60e3, 67e3, 74e3]})
    assert np.all(np.diff(heavier.get_val('takeoff_field_length')) > 0.0)


def test_plausible_for_120_seat_twin():
    # 120-seat twin: MTOW 67 t, S = 122 m**2, 2 x 85 kN, CLmax,TO = 2.2, ISA sea level.
    # Take-off field lengths of about 1,500-2,300 m are typical of the class (common practice).
    prob = _run(
        mtow=[67e3],
        wing_area=[122.0],
        takeoff_thrust=[2 * 85e3],
        max_lift_coefficient_takeoff=[2.2],
        density_ratio=[1.0],
    )
    tofl = prob.get_val('takeoff_field_length')[0]
    assert 1500.0 < tofl < 2300.0
