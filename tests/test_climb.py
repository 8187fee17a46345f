"""Thrust lapse and top-of-climb thrust margin."""

import numpy as np
import openmdao.api as om
from ambiance import Atmosphere

from voltwake.components.atmosphere import AtmosphereComp, FlightConditionComp
from voltwake.components.climb import ThrustLapseComp, TopOfClimbComp

from partials import check_component_partials

G0 = 9.80665  # standard gravity, m/s**2 (ISO 80000-3)
P_SL, T_SL = 101325.0, 288.15  # ISA sea level, ISO 2533:1975


def _lapse_by_hand(pressure, temperature, mach, throttle_ratio):
    """
    Return the high-bypass turbofan lapse, written out in plain floats.

    Mattingly, Heiser & Pratt, Aircraft Engine Design, 2nd ed. (2002), sect. 2.3.2 (from
    memory).
    """
    ram = 1.0 + 0.2 * mach**2
    delta0 = pressure / P_SL * ram**3.5
    theta0 = temperature / T_SL * ram
    bracket = 1.0 - 0.49 * mach**0.5
    if theta0 > throttle_ratio:
        bracket -= 3.0 * (theta0 - throttle_ratio) / (1.5 + mach)
    return delta0 * bracket


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_lapse_partials_both_branches():
    # Points 1 and 3 are on the cold branch (theta_0 < TR), point 2 on the hot branch.
    check_component_partials(
        ThrustLapseComp(vec_size=3),
        {
            'pressure': [23842.0, 101325.0, 54048.0],
            'temperature': [218.8, 288.15, 255.7],
            'mach': [0.78, 0.3, 0.5],
            'throttle_ratio': [1.0, 1.0, 1.05],
        },
    )
    # All hot: low throttle ratio, hot day.
    check_component_partials(
        ThrustLapseComp(vec_size=3),
        {
            'pressure': [90000.0, 70000.0, 30000.0],
            'temperature': [300.0, 280.0, 240.0],
            'mach': [0.2, 0.45, 0.85],
            'throttle_ratio': [0.98, 1.0, 0.9],
        },
    )


def test_lapse_hand_values_against_standard_atmosphere():
    # Static conditions from the reference library ambiance (ICAO 1993 standard atmosphere).
    cruise = Atmosphere(11000.0)
    sea_level = Atmosphere(0.0)
    p = [cruise.pressure[0], sea_level.pressure[0], sea_level.pressure[0]]
    t = [cruise.temperature[0], sea_level.temperature[0], sea_level.temperature[0]]
    mach = [0.78, 0.3, 0.0]
    prob = _run(
        ThrustLapseComp(vec_size=3),
        {'pressure': p, 'temperature': t, 'mach': mach, 'throttle_ratio': [1.0] * 3},
    )
    expected = [_lapse_by_hand(p[i], t[i], mach[i], 1.0) for i in range(3)]
    np.testing.assert_allclose(prob.get_val('thrust_lapse'), expected, rtol=1e-12)
    # Static at ISA sea level the engine gives its rating: delta_0 = 1, theta_0 = 1 = TR.
    np.testing.assert_allclose(prob.get_val('thrust_lapse')[2], 1.0, rtol=1e-12)
    # Point 2 is on the hot branch (theta_0 = 1.018 > TR = 1): lower than the cold formula.
    ram = 1.0 + 0.2 * 0.3**2
    assert prob.get_val('thrust_lapse')[1] < ram**3.5 * (1.0 - 0.49 * 0.3**0.5)
    # Top-of-climb thrust of high-bypass turbofans is about 15-25 % of the sea-level static
    # rating (common practice).
    assert 0.15 < prob.get_val('thrust_lapse')[0] < 0.25


def test_lapse_continuous_at_throttle_break():
    mach, tr = 0.5, 1.05
    t_break = tr * T_SL / (1.0 + 0.2 * mach**2)
    prob = _run(
        ThrustLapseComp(vec_size=2),
        {
            'pressure': [80000.0] * 2,
            'temperature': [t_break * (1 - 1e-9), t_break * (1 + 1e-9)],
            'mach': [mach] * 2,
            'throttle_ratio': [tr] * 2,
        },
    )
    lapse = prob.get_val('thrust_lapse')
    np.testing.assert_allclose(lapse[0], lapse[1], rtol=1e-8)


def test_lapse_falls_with_altitude_and_with_throttle_ratio_below_theta0():
    altitudes = np.array([0.0, 3000.0, 6000.0, 9000.0, 11000.0, 13000.0])
    n = altitudes.size
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('atm', AtmosphereComp(vec_size=n), promotes=['*'])
    prob.model.add_subsystem('lapse', ThrustLapseComp(vec_size=n), promotes=['*'])
    prob.setup()
    prob.set_val('altitude', altitudes)
    prob.set_val('mach', np.full(n, 0.6))
    prob.run_model()
    assert np.all(np.diff(prob.get_val('thrust_lapse')) < 0.0)

    hot = _run(
        ThrustLapseComp(vec_size=3),
        {
            'pressure': [101325.0] * 3,
            'temperature': [303.15] * 3,
            'mach': [0.25] * 3,
            'throttle_ratio': [1.0, 1.03, 1.06],
        },
    )
    # Hot day at sea level: a higher throttle ratio keeps more thrust.
    assert np.all(np.diff(hot.get_val('thrust_lapse')) > 0.0)


def test_top_of_climb_partials_two_points():
    check_component_partials(
        TopOfClimbComp(vec_size=3),
        {
            'rated_thrust': [1.5e5, 1.7e5, 2.4e5],
            'thrust_lapse': [0.18, 0.2, 0.23],
            'mass': [55e3, 65e3, 75e3],
            'lift_to_drag': [15.0, 17.0, 19.0],
            'true_airspeed': [220.0, 230.0, 240.0],
            'residual_climb_rate': [1.524, 1.524, 2.54],
            'electric_thrust': [0.0, 8.0e3, 1.2e4],
            'electric_power_ratio': [1.5, 1.3, 1.7],
        },
    )
    check_component_partials(
        TopOfClimbComp(vec_size=3),
        {
            'rated_thrust': [3.0e5, 0.9e5, 1.2e5],
            'thrust_lapse': [0.25, 0.3, 0.15],
            'mass': [90e3, 25e3, 48e3],
            'lift_to_drag': [20.0, 13.0, 16.0],
            'true_airspeed': [250.0, 190.0, 215.0],
            'residual_climb_rate': [0.5, 2.0, 1.0],
            'electric_thrust': [5.0e3, 0.0, 2.0e4],
            'electric_power_ratio': [1.0, 2.0, 1.2],
        },
    )


def test_top_of_climb_hand_values_and_trends():
    rated, lapse, mass, l_over_d, speed, roc = 1.7e5, 0.2, 65e3, 17.0, 230.0, 1.524
    prob = _run(
        TopOfClimbComp(vec_size=3),
        {
            'rated_thrust': [rated] * 3,
            'thrust_lapse': [lapse] * 3,
            'mass': [mass] * 3,
            'lift_to_drag': [l_over_d, 18.0, 19.0],
            'true_airspeed': [speed] * 3,
            'residual_climb_rate': [roc] * 3,
        },
    )
    # Steady climb, small angle: T = W / (L/D) + W ROC / V (common practice).
    weight = mass * G0
    required = weight / l_over_d + weight * roc / speed
    available = lapse * rated
    np.testing.assert_allclose(prob.get_val('required_thrust')[0], required, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('available_thrust')[0], available, rtol=1e-12)
    np.testing.assert_allclose(
        prob.get_val('thrust_margin')[0], available / required - 1.0, rtol=1e-12
    )
    # Better L/D needs less thrust and raises the margin.
    assert np.all(np.diff(prob.get_val('thrust_margin')) > 0.0)


def test_top_of_climb_electric_thrust_does_not_lapse():
    # An electric fan of 8 kN cruise thrust with a 1.5 rated/cruise power ratio adds
    # 1.5 * 8 kN to the lapsed turbofan thrust (hand value from the docstring's equation).
    prob = _run(
        TopOfClimbComp(vec_size=1),
        {
            'rated_thrust': [1.5e5],
            'thrust_lapse': [0.2],
            'electric_thrust': [8.0e3],
            'electric_power_ratio': [1.5],
        },
    )
    np.testing.assert_allclose(prob.get_val('available_thrust'), [0.2 * 1.5e5 + 1.2e4])


def test_top_of_climb_chain_from_atmosphere():
    altitude, mach = 10668.0, 0.78  # 35,000 ft geopotential
    prob = om.Problem(reports=False)
    model = prob.model
    model.add_subsystem('atm', AtmosphereComp(), promotes=['*'])
    model.add_subsystem('flight', FlightConditionComp(), promotes=['*'])
    model.add_subsystem('lapse', ThrustLapseComp(), promotes=['*'])
    model.add_subsystem('toc', TopOfClimbComp(), promotes=['*'])
    prob.setup()
    prob.set_val('altitude', altitude)
    prob.set_val('mach', mach)
    prob.set_val('rated_thrust', 1.7e5)
    prob.set_val('mass', 65e3)
    prob.set_val('lift_to_drag', 17.0)
    prob.set_val('residual_climb_rate', 1.524)
    prob.run_model()
    # Static conditions from the reference library ambiance (takes geometric height).
    ref = Atmosphere(Atmosphere.geop2geom_height(altitude))
    lapse = _lapse_by_hand(ref.pressure[0], ref.temperature[0], mach, 1.0)
    speed = mach * ref.speed_of_sound[0]
    required = 65e3 * G0 * (1.0 / 17.0 + 1.524 / speed)
    np.testing.assert_allclose(prob.get_val('thrust_lapse'), [lapse], rtol=1e-5)
    np.testing.assert_allclose(
        prob.get_val('thrust_margin'), [lapse * 1.7e5 / required - 1.0], rtol=1e-5
    )
