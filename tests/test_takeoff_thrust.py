"""Tests of StaticThrustPerPowerComp and TakeoffThrustComp: partials, hand values, trends."""

import math

import numpy as np
import openmdao.api as om

from voltwake.components.takeoff_thrust import StaticThrustPerPowerComp, TakeoffThrustComp

from partials import check_component_partials

GAMMA = 1.4  # common practice (calorically perfect air)
R = 287.05287  # J/(kg K), ISO 2533:1975 standard atmosphere
CP = GAMMA * R / (GAMMA - 1.0)  # = 1004.685045 J/(kg K)
T_SL = 288.15  # K, ISA sea-level temperature, ISO 2533:1975


def _run(comp, **inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', comp, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def _static(fpr, eta, t0=T_SL):
    prob = _run(
        StaticThrustPerPowerComp(vec_size=np.size(fpr)),
        fan_pressure_ratio=fpr,
        fan_efficiency=eta,
        ambient_temperature=t0,
    )
    return prob.get_val('static_jet_velocity'), prob.get_val('thrust_per_power')


def test_static_partials():
    check_component_partials(
        StaticThrustPerPowerComp(vec_size=3),
        {
            'fan_pressure_ratio': [1.25, 1.4, 1.65],
            'fan_efficiency': [0.9, 0.92, 0.94],
            'ambient_temperature': [288.15, 303.15, 268.15],
        },
    )
    check_component_partials(
        StaticThrustPerPowerComp(vec_size=3),
        {
            'fan_pressure_ratio': [1.1, 1.3, 2.0],
            'fan_efficiency': [0.85, 0.95, 0.88],
            'ambient_temperature': [250.0, 288.15, 320.0],
        },
    )


def test_static_hand_value():
    # Hand value from the equations in StaticThrustPerPowerComp, step by step, at FPR 1.3,
    # efficiency 0.92 and ISA sea level (288.15 K):
    #   tau_s = 1.3**(0.4/1.4)            = 1.0778423
    #   dT    = 288.15 (tau_s - 1) / 0.92 = 24.380732 K
    #   Tt2   = 288.15 + dT               = 312.530732 K
    #   Vj    = sqrt(2 cp Tt2 (1 - 1/tau_s)) = 212.96424 m/s
    #   s     = Vj / (cp dT)              = 8.6942076e-3 N/W
    vj, spp = _static(1.3, 0.92)
    np.testing.assert_allclose(vj, 212.96424, rtol=1e-7)
    np.testing.assert_allclose(spp, 8.6942076e-3, rtol=1e-7)
    # The same from the formulas written out independently.
    tau = 1.3 ** ((GAMMA - 1.0) / GAMMA)
    dt = T_SL * (tau - 1.0) / 0.92
    vj_hand = math.sqrt(2.0 * CP * (T_SL + dt) * (1.0 - 1.0 / tau))
    np.testing.assert_allclose(vj, vj_hand, rtol=1e-12)
    np.testing.assert_allclose(spp, vj_hand / (CP * dt), rtol=1e-12)


def test_static_example_magnitude():
    # A 2.75 MW shaft at FPR 1.3, efficiency 0.92, ISA sea level static:
    # F = s P = 8.6942076e-3 N/W * 2.75e6 W = 23909.07 N (hand value from the equations).
    prob = _run(
        TakeoffThrustComp(vec_size=1),
        motor_rated_power=2.75e6,
        aft_thrust_per_power=_static(1.3, 0.92)[1],
    )
    np.testing.assert_allclose(prob.get_val('aft_fan_takeoff_thrust'), 23909.07, rtol=1e-6)


def test_static_matches_momentum_and_energy():
    # F = mdot Vj and P = mdot cp dT for any mass flow, so F / P = Vj / (cp dT); check that the
    # output thrust per power equals the momentum/energy ratio with dT from the fan relation.
    fpr = np.array([1.2, 1.45, 1.8])
    eta = np.array([0.9, 0.92, 0.94])
    vj, spp = _static(fpr, eta)
    dt = T_SL * (fpr ** ((GAMMA - 1.0) / GAMMA) - 1.0) / eta
    mdot = 500.0  # kg/s, demo value; it cancels
    np.testing.assert_allclose(spp, (mdot * vj) / (mdot * CP * dt), rtol=1e-12)


def test_static_ideal_fan_limit():
    # With fan efficiency 1, cp dT = cp T0 (tau_s - 1) = Vj**2 / 2 exactly (the jet kinetic
    # energy equals the fan work), so s = 2 / Vj: the ideal static propulsor, F = mdot Vj,
    # P = mdot Vj**2 / 2 (follows from the equations; momentum theory, common practice).
    vj, spp = _static(np.array([1.15, 1.4, 1.9]), np.ones(3), np.array([288.15, 260.0, 310.0]))
    np.testing.assert_allclose(spp, 2.0 / vj, rtol=1e-12)


def test_static_trends():
    fpr = np.array([1.2, 1.3, 1.5, 1.8])
    vj, spp = _static(fpr, 0.92 * np.ones(4))
    # Higher fan pressure ratio: faster jet, less static thrust per unit power.
    assert np.all(np.diff(vj) > 0.0)
    assert np.all(np.diff(spp) < 0.0)
    # Higher fan efficiency: more static thrust per unit power.
    _, spp_eta = _static(1.4 * np.ones(3), np.array([0.88, 0.92, 0.96]))
    assert np.all(np.diff(spp_eta) > 0.0)


def test_static_temperature_scaling():
    # Vj ~ sqrt(T0) and dT ~ T0, so s ~ T0**-0.5 (follows from the equations).
    _, spp = _static(1.4 * np.ones(2), 0.92 * np.ones(2), np.array([288.15, 318.15]))
    np.testing.assert_allclose(spp[1] / spp[0], math.sqrt(288.15 / 318.15), rtol=1e-12)


def test_takeoff_partials():
    for count in (1, 2, 4):
        check_component_partials(
            TakeoffThrustComp(vec_size=3, num_engines=count),
            {
                'turbofan_rated_thrust': [8.0e4, 9.5e4, 1.1e5],
                'motor_rated_power': [6.0e5, 2.5e6, 5.0e6],
                'aft_thrust_per_power': [9.5e-3, 8.7e-3, 8.0e-3],
            },
        )
        check_component_partials(
            TakeoffThrustComp(vec_size=3, num_engines=count),
            {
                'turbofan_rated_thrust': [1.2e5, 7.0e4, 9.0e4],
                'motor_rated_power': [3.5e6, 1.2e6, 0.0],
                'aft_thrust_per_power': [7.5e-3, 1.0e-2, 8.5e-3],
            },
        )


def test_takeoff_hand_values():
    # Hand values from the equations in TakeoffThrustComp, two engines (the cores are sized
    # for the generators' take-off draw, so each turbofan gives its rated thrust):
    #   F_aft,TO = 8.6942076e-3 * 2.5e6    = 21735.519 N
    #   F_TO     = 2 * 9.0e4 + 21735.519   = 201735.519 N
    prob = _run(
        TakeoffThrustComp(vec_size=1, num_engines=2),
        turbofan_rated_thrust=9.0e4,
        motor_rated_power=2.5e6,
        aft_thrust_per_power=8.6942076e-3,
    )
    np.testing.assert_allclose(prob.get_val('turbofan_takeoff_thrust'), 9.0e4, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('turbofans_takeoff_thrust'), 1.8e5, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('aft_fan_takeoff_power'), 2.5e6, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('aft_fan_takeoff_thrust'), 21735.519, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('installed_thrust'), 201735.519, rtol=1e-12)


def test_takeoff_conventional_limit():
    # No motor: exactly N times the rated thrust, whatever the aft fan's thrust per power.
    for count in (1, 2, 3, 4):
        prob = _run(
            TakeoffThrustComp(vec_size=3, num_engines=count),
            turbofan_rated_thrust=[8.0e4, 9.5e4, 1.2e5],
            aft_thrust_per_power=[7.0e-3, 8.0e-3, 9.0e-3],
        )
        np.testing.assert_array_equal(
            prob.get_val('installed_thrust'), count * np.array([8.0e4, 9.5e4, 1.2e5])
        )
        np.testing.assert_array_equal(
            prob.get_val('turbofan_takeoff_thrust'), [8.0e4, 9.5e4, 1.2e5]
        )
        np.testing.assert_array_equal(prob.get_val('aft_fan_takeoff_thrust'), np.zeros(3))
