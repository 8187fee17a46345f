"""Tests of TurbofanCoreComp, EngineMassComp and OverallEfficiencyComp."""

import math

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.ducted_fan import DuctedFanComp
from voltwake.components.overall_efficiency import OverallEfficiencyComp
from voltwake.components.turbofan_core import EngineMassComp, TurbofanCoreComp

from partials import check_component_partials

G0 = 9.80665  # m/s**2, standard gravity (ISO 80000-3)


def _run(comp, **inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', comp, promotes=['*'])
    prob.setup(force_alloc_complex=True)
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def test_core_hand_calculation():
    # fuel = (P_fan + P_ext) / (eta_th LHV); TSFC = fuel / F (definitions; demo inputs).
    prob = _run(
        TurbofanCoreComp(),
        fan_shaft_power=5.0e6,
        power_extraction=1.0e6,
        thermal_efficiency=0.45,
        fuel_heating_value=43.0e6,
        net_thrust=20000.0,
    )
    fuel = 6.0e6 / (0.45 * 43.0e6)
    assert prob.get_val('fuel_flow')[0] == pytest.approx(fuel, rel=1e-12)
    assert prob.get_val('tsfc')[0] == pytest.approx(fuel / 20000.0, rel=1e-12)


def test_power_extraction_costs_fuel():
    # Trend: extracting shaft power for a generator raises fuel flow at fixed fan power.
    prob = _run(TurbofanCoreComp(vec_size=3), power_extraction=[0.0, 1.0e6, 2.0e6])
    assert np.all(np.diff(prob.get_val('fuel_flow')) > 0.0)


def test_engine_mass_hand_calculation():
    # m = r F_cruise / ((T/W) g0), total = count m (definitions; demo inputs).
    prob = _run(
        EngineMassComp(count=3),
        cruise_thrust=20000.0,
        rated_to_cruise_thrust=4.0,
        thrust_to_weight=5.5,
    )
    mass = 20000.0 * 4.0 / (5.5 * G0)
    assert prob.get_val('rated_thrust')[0] == pytest.approx(80000.0, rel=1e-12)
    assert prob.get_val('engine_mass')[0] == pytest.approx(mass, rel=1e-12)
    assert prob.get_val('total_engine_mass')[0] == pytest.approx(3.0 * mass, rel=1e-12)


def test_overall_efficiency_hand_calculation():
    # eta_0 = F V / (mdot_f LHV) and eta_0 = V / (TSFC LHV) (definitions; demo inputs).
    prob = _run(
        OverallEfficiencyComp(),
        net_thrust=40000.0,
        true_airspeed=230.0,
        fuel_flow=0.6,
        fuel_heating_value=43.0e6,
    )
    eta0 = 40000.0 * 230.0 / (0.6 * 43.0e6)
    assert prob.get_val('overall_efficiency')[0] == pytest.approx(eta0, rel=1e-12)
    assert prob.get_val('tsfc')[0] == pytest.approx(0.6 / 40000.0, rel=1e-12)
    assert eta0 == pytest.approx(230.0 / (prob.get_val('tsfc')[0] * 43.0e6), rel=1e-12)


def test_demo_turbofan_tsfc_is_typical():
    # Fan + core + aircraft efficiency at a demo-like point: FPR 1.5, eta_f 0.92, eta_th 0.47,
    # LHV 43.1 MJ/kg, M 0.78 at 35,000 ft ISA (218.81 K, 23842 Pa; ISO 2533:1975).
    # Typical high-bypass turbofan cruise TSFC is 0.50-0.60 lb/(lbf h) = 14-17 g/(kN s)
    # (common practice). A single engine stands for the aircraft, so both TSFCs agree.
    gamma, r_air = 1.4, 287.05287
    temp, pres, mach = 218.81, 23842.0, 0.78
    f = 1.0 + 0.5 * (gamma - 1.0) * mach**2
    speed = mach * math.sqrt(gamma * r_air * temp)

    prob = om.Problem(reports=False)
    model = prob.model
    model.add_subsystem('fan', DuctedFanComp(), promotes_inputs=['net_thrust'])
    model.add_subsystem(
        'core', TurbofanCoreComp(), promotes_inputs=['net_thrust', 'fuel_heating_value']
    )
    model.add_subsystem(
        'aircraft', OverallEfficiencyComp(), promotes_inputs=['net_thrust', 'fuel_heating_value']
    )
    model.connect('fan.shaft_power', 'core.fan_shaft_power')
    model.connect('core.fuel_flow', 'aircraft.fuel_flow')
    model.set_input_defaults('net_thrust', 18000.0, units='N')
    model.set_input_defaults('fuel_heating_value', 43.1e6, units='J/kg')
    prob.setup()
    prob.set_val('net_thrust', 18000.0)
    prob.set_val('fuel_heating_value', 43.1e6)
    prob.set_val('fan.inflow_total_temperature', temp * f)
    prob.set_val('fan.inflow_total_pressure', pres * f ** (gamma / (gamma - 1.0)))
    prob.set_val('fan.ram_velocity', speed)
    prob.set_val('fan.ambient_pressure', pres)
    prob.set_val('fan.fan_pressure_ratio', 1.5)
    prob.set_val('fan.fan_efficiency', 0.92)
    prob.set_val('core.thermal_efficiency', 0.47)
    prob.set_val('aircraft.true_airspeed', speed)
    prob.run_model()

    tsfc = prob.get_val('aircraft.tsfc', units='g/(kN*s)')[0]
    assert 14.0 < tsfc < 17.0
    assert prob.get_val('core.tsfc', units='g/(kN*s)')[0] == pytest.approx(tsfc, rel=1e-12)


def test_partials_core():
    check_component_partials(
        TurbofanCoreComp(vec_size=3),
        {
            'fan_shaft_power': [4.0e6, 5.5e6, 7.0e6],
            'power_extraction': [0.0, 1.5e6, 3.0e6],
            'thermal_efficiency': [0.42, 0.47, 0.5],
            'fuel_heating_value': [42.8e6, 43.1e6, 43.5e6],
            'net_thrust': [15000.0, 18000.0, 24000.0],
        },
    )
    check_component_partials(
        TurbofanCoreComp(vec_size=3),
        {
            'fan_shaft_power': [1.0e6, 2.0e6, 3.0e6],
            'power_extraction': [5.0e6, 0.5e6, 0.0],
            'thermal_efficiency': [0.35, 0.4, 0.55],
            'fuel_heating_value': [120.0e6, 43.0e6, 50.0e6],
            'net_thrust': [5000.0, 60000.0, 9000.0],
        },
    )


def test_partials_engine_mass():
    for count, cruise, ratio, tw in (
        (2, [15000.0, 18000.0, 22000.0], [4.0, 4.5, 5.0], [4.5, 5.0, 5.5]),
        (4, [9000.0, 12000.0, 7000.0], [5.2, 3.8, 4.4], [6.0, 3.5, 4.8]),
    ):
        check_component_partials(
            EngineMassComp(vec_size=3, count=count),
            {
                'cruise_thrust': cruise,
                'rated_to_cruise_thrust': ratio,
                'thrust_to_weight': tw,
            },
        )


def test_partials_overall_efficiency():
    check_component_partials(
        OverallEfficiencyComp(vec_size=3),
        {
            'net_thrust': [30000.0, 36000.0, 45000.0],
            'true_airspeed': [220.0, 231.0, 240.0],
            'fuel_flow': [0.45, 0.54, 0.7],
            'fuel_heating_value': [42.8e6, 43.1e6, 43.5e6],
        },
    )
    check_component_partials(
        OverallEfficiencyComp(vec_size=3),
        {
            'net_thrust': [80000.0, 10000.0, 55000.0],
            'true_airspeed': [80.0, 150.0, 250.0],
            'fuel_flow': [1.5, 0.2, 0.9],
            'fuel_heating_value': [43.0e6, 120.0e6, 44.0e6],
        },
    )
