"""Tests of the Breguet mission fuel component."""

import numpy as np
import openmdao.api as om
import pytest
from scipy.optimize import brentq

from voltwake.components.mission import MissionFuelComp

from partials import check_component_partials

G0 = 9.80665  # standard acceleration of gravity, m/s**2 (CGPM 1901, ISO 80000-3)
FT = 0.3048  # m per international foot (exact, international yard and pound agreement 1959)
LB = 0.45359237  # kg per pound mass (exact, same agreement)

# Anderson, Introduction to Flight, ch. 6, range example of the CP-1 propeller airplane
# (from memory; edition and example number not verified):
CP1_W0 = 2950.0  # lb, gross weight
CP1_W1 = 2583.0  # lb, weight with the fuel burnt
CP1_LD = 13.6  # (L/D)max
CP1_ETA_PR = 0.8  # propeller efficiency
CP1_C = 2.27e-7  # 1/ft, specific fuel consumption 0.45 lb/(hp h)
CP1_RANGE = 6.38e6  # ft, book result (about 1207 mi)
LHV = 43.0e6  # J/kg; any value works: the mapping below makes the result independent of it


def _cp1_inputs():
    """Mission inputs reproducing the plain cruise Breguet problem of the CP-1 example."""
    c_si = CP1_C / FT  # 1/m, weight of fuel per unit of shaft energy
    return {
        'mtow': CP1_W0 * LB,
        'lift_to_drag': CP1_LD,
        'fuel_heating_value': LHV,
        # prop Breguet R = (eta_pr / c) (L/D) ln(W0/W1) maps to ours by
        # eta_o = eta_pr g0 / (c LHV)
        'overall_efficiency': CP1_ETA_PR * G0 / (c_si * LHV),
        'takeoff_fraction': 1.0,
        'climb_fraction': 1.0,
        'landing_fraction': 1.0,
        'diversion_range': 0.0,
        'hold_time': 0.0,
        'contingency_fraction': 0.0,
    }


def _problem(vec_size=1):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', MissionFuelComp(vec_size=vec_size), promotes=['*'])
    prob.setup()
    return prob


def _run(inputs, vec_size=1):
    prob = _problem(vec_size)
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def test_breguet_cp1_fuel_fraction_from_book_range():
    inputs = _cp1_inputs()
    inputs['range'] = CP1_RANGE * FT
    prob = _run(inputs)
    # tolerance 0.5 %: the book rounds to three figures
    assert prob.get_val('cruise_fuel_fraction')[0] == pytest.approx(CP1_W1 / CP1_W0, rel=5e-3)
    assert prob.get_val('landing_mass', units='kg')[0] == pytest.approx(CP1_W1 * LB, rel=5e-3)
    assert prob.get_val('block_fuel', units='kg')[0] == pytest.approx(
        (CP1_W0 - CP1_W1) * LB, rel=5e-3
    )
    assert prob.get_val('reserve_fuel', units='kg')[0] == pytest.approx(0.0, abs=1e-9)


def test_breguet_cp1_range_from_book_weights():
    # the formula used backwards: find the range at which the component lands at W1
    prob = _problem()
    for name, value in _cp1_inputs().items():
        prob.set_val(name, value)

    def landing_error(range_m):
        prob.set_val('range', range_m)
        prob.run_model()
        return prob.get_val('landing_mass', units='kg')[0] - CP1_W1 * LB

    range_m = brentq(landing_error, 1.0e5, 1.0e8, xtol=1e-6, rtol=1e-12)
    # tolerance 0.5 %: the book rounds to three figures
    assert range_m / FT == pytest.approx(CP1_RANGE, rel=5e-3)
    assert range_m / (5280.0 * FT) == pytest.approx(1207.0, rel=5e-3)  # statute miles


# a realistic airliner mission at three points, all inputs different (demo values)
MISSION = {
    'mtow': [70000.0, 120000.0, 45000.0],
    'range': [5.0e6, 9.0e6, 1.5e6],
    'lift_to_drag': [17.0, 19.0, 15.0],
    'overall_efficiency': [0.35, 0.42, 0.30],
    'fuel_heating_value': [43.0e6, 43.2e6, 42.8e6],
    'takeoff_fraction': [0.975, 0.97, 0.98],
    'climb_fraction': [0.98, 0.985, 0.975],
    'landing_fraction': [0.982, 0.99, 0.985],
    'diversion_range': [370400.0, 400000.0, 200000.0],
    'hold_time': [1800.0, 2700.0, 1200.0],
    'true_airspeed': [230.0, 250.0, 200.0],
    'contingency_fraction': [0.05, 0.03, 0.1],
}


def test_closed_form_identities():
    prob = _run(MISSION, vec_size=3)
    v = {k: np.array(x) for k, x in MISSION.items()}
    a = G0 / (v['overall_efficiency'] * v['fuel_heating_value'] * v['lift_to_drag'])
    f_cr = np.exp(-a * v['range'])
    f_div = np.exp(-a * v['diversion_range'])
    # hold: Breguet endurance form at the cruise TSFC, exp(-a t_h V_cr)
    f_hold = np.exp(-a * v['hold_time'] * v['true_airspeed'])
    product = v['takeoff_fraction'] * v['climb_fraction'] * f_cr * v['landing_fraction']
    trip = v['mtow'] * (1.0 - product)
    np.testing.assert_allclose(prob.get_val('cruise_fuel_fraction'), f_cr, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('block_fuel'), trip, rtol=1e-12)

    # reserves flown step by step from the landing mass
    m_land = v['mtow'] - trip
    m = m_land * v['climb_fraction']
    m = m * f_div
    m = m * v['landing_fraction']
    m = m * f_hold
    reserve = v['contingency_fraction'] * trip + (m_land - m)
    np.testing.assert_allclose(prob.get_val('landing_mass'), m_land, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('reserve_fuel'), reserve, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('total_fuel'), trip + reserve, rtol=1e-12)
    np.testing.assert_allclose(
        prob.get_val('block_energy'), trip * v['fuel_heating_value'], rtol=1e-12
    )

    # mid-cruise mass is the geometric mean of the cruise start and end masses
    m_start = v['mtow'] * v['takeoff_fraction'] * v['climb_fraction']
    np.testing.assert_allclose(
        prob.get_val('mid_cruise_mass'), np.sqrt(m_start * m_start * f_cr), rtol=1e-12
    )
    # the top of climb is the start of cruise
    np.testing.assert_allclose(prob.get_val('top_of_climb_mass'), m_start, rtol=1e-14)


def test_cruise_fraction_multiplies_over_legs():
    # f_cr(R1 + R2) = f_cr(R1) f_cr(R2): exponential form of the Breguet equation
    r1, r2 = 2.3e6, 4.1e6
    prob = _run({'range': [r1, r2, r1 + r2]}, vec_size=3)
    f = prob.get_val('cruise_fuel_fraction')
    assert f[2] == pytest.approx(f[0] * f[1], rel=1e-12)
    assert 0.0 < f[2] < f[1] < f[0] < 1.0


def test_no_range_no_cruise_fuel():
    prob = _run(
        {'range': 0.0, 'takeoff_fraction': 1.0, 'climb_fraction': 1.0, 'landing_fraction': 1.0}
    )
    assert prob.get_val('cruise_fuel_fraction')[0] == 1.0
    assert prob.get_val('block_fuel')[0] == pytest.approx(0.0, abs=1e-9)


# Hold alone: no trip, no diversion, no contingency, so reserve = m_land (1 - f_hold).
HOLD_ONLY = {
    'mtow': 70000.0,
    'range': 0.0,
    'takeoff_fraction': 1.0,
    'climb_fraction': 1.0,
    'landing_fraction': 1.0,
    'diversion_range': 0.0,
    'contingency_fraction': 0.0,
    'hold_time': 1800.0,
    'true_airspeed': 230.0,
    'overall_efficiency': 0.35,
    'fuel_heating_value': 43.0e6,
    'lift_to_drag': 17.0,
}


def test_hold_endurance_form_with_explicit_tsfc():
    # Breguet endurance equation ln(m_i/m_f) = t g TSFC / (L/D) (e.g. Raymer, Aircraft
    # Design: A Conceptual Approach, ch. 17, endurance equation; from memory), with the
    # cruise TSFC = V_cr / (eta_o H) from the range form. Hand values from these equations:
    # TSFC = 230 / (0.35 * 43e6) = 1.52824e-5 kg/(N s) (0.5395 per hour as weight flow per
    # thrust); exponent 1800 * 9.80665 * 1.52824e-5 / 17 = 0.0158685; f_hold = 0.984257;
    # hold fuel from 70 t: 70000 (1 - 0.984257) = 1102.0 kg.
    v = HOLD_ONLY
    tsfc = v['true_airspeed'] / (v['overall_efficiency'] * v['fuel_heating_value'])
    assert tsfc == pytest.approx(1.52824e-5, rel=1e-5)
    f_hold = np.exp(-v['hold_time'] * G0 * tsfc / v['lift_to_drag'])
    assert f_hold == pytest.approx(0.984257, rel=1e-6)

    prob = _run(HOLD_ONLY)
    assert prob.get_val('landing_mass', units='kg')[0] == pytest.approx(70000.0, rel=1e-15)
    reserve = prob.get_val('reserve_fuel', units='kg')[0]
    assert reserve == pytest.approx(70000.0 * (1.0 - f_hold), rel=1e-12)
    assert reserve == pytest.approx(1102.03, rel=1e-5)


def test_hold_fuel_proportional_to_cruise_speed_not_hold_speed():
    # At a fixed overall efficiency the cruise TSFC = V_cr / (eta_o H) grows with V_cr, so the
    # hold fuel exponent does too: ln(1/f_hold) is proportional to t_h V_cr (hand identity).
    speeds = np.array([150.0, 230.0, 300.0])
    prob = _run(dict(HOLD_ONLY, true_airspeed=speeds), vec_size=3)
    f_hold = 1.0 - prob.get_val('reserve_fuel', units='kg') / 70000.0
    exponent = -np.log(f_hold)
    np.testing.assert_allclose(exponent / speeds, exponent[1] / speeds[1], rtol=1e-10)
    # the same exponent follows from swapping t_h and V_cr at a fixed product
    swapped = _run(dict(HOLD_ONLY, hold_time=230.0, true_airspeed=1800.0))
    assert swapped.get_val('reserve_fuel')[0] == pytest.approx(
        prob.get_val('reserve_fuel')[1], rel=1e-12
    )


def test_no_hold_time_no_hold_fuel():
    prob = _run(dict(HOLD_ONLY, hold_time=0.0))
    assert prob.get_val('reserve_fuel')[0] == pytest.approx(0.0, abs=1e-9)


def test_trip_fuel_does_not_depend_on_airspeed():
    # the range form depends on V only through eta_o; the speed input feeds only the hold
    prob = _run({'true_airspeed': [150.0, 230.0, 300.0]}, vec_size=3)
    for out in ('block_fuel', 'landing_mass', 'mid_cruise_mass', 'cruise_fuel_fraction'):
        values = prob.get_val(out)
        np.testing.assert_allclose(values, values[0], rtol=1e-15, err_msg=out)
    assert np.all(np.diff(prob.get_val('reserve_fuel')) > 0.0)


@pytest.mark.parametrize(
    'name, values',
    [('hold_time', [900.0, 1800.0, 2700.0]), ('true_airspeed', [150.0, 230.0, 300.0])],
)
def test_reserve_grows_with_hold_time_and_cruise_speed(name, values):
    prob = _run({name: values}, vec_size=3)
    for out in ('reserve_fuel', 'total_fuel'):
        assert np.all(np.diff(prob.get_val(out)) > 0.0), out


@pytest.mark.parametrize(
    'name, values, sign',
    [
        ('range', [3.0e6, 5.0e6, 7.0e6], +1),
        ('fuel_heating_value', [40.0e6, 43.0e6, 46.0e6], -1),
        ('lift_to_drag', [14.0, 17.0, 20.0], -1),
        ('overall_efficiency', [0.30, 0.35, 0.40], -1),
    ],
)
def test_fuel_trends(name, values, sign):
    prob = _run({name: values}, vec_size=3)
    for out in ('block_fuel', 'total_fuel'):
        assert np.all(sign * np.diff(prob.get_val(out)) > 0.0), out
    if name != 'range':
        assert np.all(sign * np.diff(prob.get_val('reserve_fuel')) > 0.0)


def test_partials():
    check_component_partials(MissionFuelComp(vec_size=3), MISSION)
    check_component_partials(
        MissionFuelComp(vec_size=3),
        {
            'mtow': [2000.0, 300000.0, 9000.0],
            'range': [4.0e5, 1.4e7, 2.0e6],
            'lift_to_drag': [11.0, 22.0, 13.6],
            'overall_efficiency': [0.2, 0.5, 0.25],
            'fuel_heating_value': [42.0e6, 120.0e6, 43.5e6],
            'takeoff_fraction': [0.99, 0.96, 1.0],
            'climb_fraction': [0.97, 0.99, 1.0],
            'landing_fraction': [0.995, 0.98, 1.0],
            'diversion_range': [1.0e5, 5.0e5, 0.0],
            'hold_time': [600.0, 3600.0, 0.0],
            'true_airspeed': [120.0, 260.0, 180.0],
            'contingency_fraction': [0.0, 0.05, 0.15],
        },
    )
