"""Stall speed, approach speed and landing field length."""

import numpy as np
import openmdao.api as om

from voltwake.components.landing import LandingComp

from partials import check_component_partials

G0 = 9.80665  # standard gravity, m/s**2 (ISO 80000-3)
KT = 1852.0 / 3600.0  # knot, m/s (exact, NIST SP 811)
FT = 0.3048  # international foot, m (exact, NIST SP 811)


def _run(**inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'comp', LandingComp(vec_size=len(inputs['landing_mass'])), promotes=['*']
    )
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_partials_two_points():
    check_component_partials(
        LandingComp(vec_size=3),
        {
            'landing_mass': [35e3, 60e3, 80e3],
            'wing_area': [90.0, 122.0, 150.0],
            'max_lift_coefficient_landing': [2.3, 2.7, 3.1],
            'density': [1.225, 1.1, 1.0],
        },
    )
    check_component_partials(
        LandingComp(vec_size=3),
        {
            'landing_mass': [70e3, 18e3, 50e3],
            'wing_area': [140.0, 55.0, 110.0],
            'max_lift_coefficient_landing': [2.9, 2.0, 2.5],
            'density': [0.95, 1.25, 1.225],
        },
    )


def test_hand_calculation():
    mass, area, cl_max, rho = 60000.0, 122.0, 2.7, 1.225
    prob = _run(
        landing_mass=[mass], wing_area=[area], max_lift_coefficient_landing=[cl_max], density=[rho]
    )
    # Lift equation at the 1-g stall (common practice).
    v_stall = (2.0 * mass * G0 / (rho * area * cl_max)) ** 0.5
    # V_REF = 1.23 V_SR0, CS 25.125(b)(2) / 14 CFR 25.125(b)(2) (from memory).
    v_app = 1.23 * v_stall
    # Roskam, Airplane Design Part I (1985), eq. 3.16 (from memory): LFL [ft] = 0.3 V_A[kt]**2.
    lfl_ft = 0.3 * (v_app / KT) ** 2
    np.testing.assert_allclose(prob.get_val('stall_speed'), [v_stall], rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('approach_speed'), [v_app], rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('landing_field_length'), [lfl_ft * FT], rtol=1e-12)


def test_trends():
    base = {
        'landing_mass': [60e3] * 3,
        'wing_area': [122.0] * 3,
        'max_lift_coefficient_landing': [2.7] * 3,
        'density': [1.225] * 3,
    }
    more_lift = _run(**{**base, 'max_lift_coefficient_landing': [2.4, 2.7, 3.0]})
    assert np.all(np.diff(more_lift.get_val('approach_speed')) < 0.0)
    assert np.all(np.diff(more_lift.get_val('landing_field_length')) < 0.0)
    heavier = _run(**{**base, 'landing_mass': [50e3, 60e3, 70e3]})
    assert np.all(np.diff(heavier.get_val('approach_speed')) > 0.0)
    assert np.all(np.diff(heavier.get_val('landing_field_length')) > 0.0)
    # Stall speed scales with the square root of wing loading (lift equation).
    np.testing.assert_allclose(
        heavier.get_val('stall_speed') / heavier.get_val('stall_speed')[0],
        np.sqrt(np.array([50.0, 60.0, 70.0]) / 50.0),
        rtol=1e-12,
    )


def test_plausible_for_120_seat_twin():
    # 120-seat twin: S = 122 m**2, CLmax,L = 2.7, landing between 0.85 MTOW and MTOW (67 t).
    # Approach speeds of about 120-145 kt are typical of the class (common practice).
    prob = _run(
        landing_mass=[0.85 * 67e3, 67e3],
        wing_area=[122.0] * 2,
        max_lift_coefficient_landing=[2.7] * 2,
        density=[1.225] * 2,
    )
    v_app_kt = prob.get_val('approach_speed', units='kn')
    assert np.all((v_app_kt > 120.0) & (v_app_kt < 145.0))
