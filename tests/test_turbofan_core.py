"""Tests of TurbofanCoreComp, EngineMassComp and OverallEfficiencyComp."""

import math

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.ducted_fan import DuctedFanComp
from voltwake.components.fan_annulus import FanAnnulusComp
from voltwake.components.overall_efficiency import OverallEfficiencyComp
from voltwake.components.takeoff_thrust import StaticThrustPerPowerComp
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
    # Hand values from the equations in EngineMassComp's docstring (demo inputs):
    # F_rated = r F_cruise, P_core = F_rated / s_tf + k P_ext / N,
    # m_eng = m''_fan pi D^2 / 4 + P_core / p_core, m_nac = m''_nac S_wet,nac,
    # total = N (m_eng + m_nac).
    prob = _run(
        EngineMassComp(count=3),
        cruise_thrust=20000.0,
        rated_to_cruise_thrust=4.0,
        static_thrust_per_power=8.0e-3,
        shaft_power_extracted=3.0e6,
        sizing_factor=1.2,
        fan_diameter=2.0,
        fan_areal_mass=400.0,
        core_specific_power=10.0e3,
        nacelle_wetted_area=90.0,  # three nacelles of 30 m**2
        nacelle_areal_mass=15.0,
    )
    # 80000 / 8e-3 = 10.0 MW for the fan, 1.2 * 3.0 MW / 3 = 1.2 MW for the generators.
    power = 10.0e6 + 1.2e6
    engine = 400.0 * math.pi + 1120.0  # 400 kg/m**2 * pi (2 m)^2 / 4 + 11.2 MW / 10 kW/kg
    assert prob.get_val('rated_thrust')[0] == pytest.approx(80000.0, rel=1e-12)
    assert prob.get_val('core_shaft_power')[0] == pytest.approx(power, rel=1e-12)
    assert prob.get_val('engine_mass')[0] == pytest.approx(engine, rel=1e-12)
    assert prob.get_val('nacelle_mass')[0] == pytest.approx(450.0, rel=1e-12)
    assert prob.get_val('total_nacelle_mass')[0] == pytest.approx(1350.0, rel=1e-12)
    assert prob.get_val('total_engine_mass')[0] == pytest.approx(3.0 * (engine + 450.0), rel=1e-12)


def test_engine_mass_without_extraction():
    # Limit: with no extraction the core delivers only the fan's rated power, F_rated / s_tf,
    # whatever the sizing factor (hand value from the equations above; demo inputs).
    prob = _run(
        EngineMassComp(vec_size=3, count=2),
        cruise_thrust=[15000.0, 18000.0, 21000.0],
        rated_to_cruise_thrust=6.0,
        static_thrust_per_power=[6.0e-3, 7.0e-3, 8.0e-3],
        sizing_factor=[1.0, 1.5, 2.0],
    )
    rated = 6.0 * np.array([15000.0, 18000.0, 21000.0])
    power = rated / np.array([6.0e-3, 7.0e-3, 8.0e-3])
    np.testing.assert_allclose(prob.get_val('core_shaft_power'), power, rtol=1e-12)
    engine = prob.get_val('engine_mass')
    nacelle = prob.get_val('nacelle_mass')
    np.testing.assert_allclose(prob.get_val('total_engine_mass'), 2.0 * (engine + nacelle))


def test_engine_mass_per_thrust_rises_with_fan_diameter():
    # Trend: at fixed rated thrust and core power a larger fan makes a heavier engine, so the
    # bare and installed mass per rated thrust rise with the fan diameter.
    prob = _run(EngineMassComp(vec_size=3), fan_diameter=[1.4, 1.63, 1.9])
    rated = prob.get_val('rated_thrust')
    np.testing.assert_allclose(rated, rated[0], rtol=0.0)
    assert np.all(np.diff(prob.get_val('engine_mass') / rated) > 0.0)
    assert np.all(np.diff(prob.get_val('total_engine_mass') / rated) > 0.0)


def test_core_mass_rises_with_extraction():
    # Trend: shaft power taken off for generators makes the core, and so the engine, heavier.
    # Hand value: each engine's mass grows by k dP_ext / (N p_core) (equations above).
    prob = _run(
        EngineMassComp(vec_size=3, count=2),
        shaft_power_extracted=[0.0, 2.0e6, 4.0e6],
        sizing_factor=1.5,
        core_specific_power=10.0e3,
    )
    assert np.all(np.diff(prob.get_val('core_shaft_power')) > 0.0)
    np.testing.assert_allclose(
        np.diff(prob.get_val('engine_mass')), 1.5 * 2.0e6 / (2 * 10.0e3), rtol=1e-10
    )
    nacelle = prob.get_val('nacelle_mass')
    np.testing.assert_allclose(nacelle, nacelle[0], rtol=0.0)


def test_demo_engine_mass_calibration():
    # The default areal masses and core specific power are demo values. This checks that they
    # do what they were chosen for: a 95 kN turbofan (cruise thrust = rated / 6 at Mach 0.78,
    # 35,000 ft ISA: 218.81 K, 23842 Pa, ISO 2533:1975; fan efficiency 0.92, fan-face Mach 0.6,
    # hub-to-tip 0.3) sized by the project's fan and annulus models. At fan pressure ratio 1.5
    # the fan diameter is about 1.63 m and, with a 26 m**2 nacelle, the installed rated
    # thrust-to-weight is in 3.3-3.8 (typical of this class; from memory). The bare engine
    # mass per rated thrust rises as the fan pressure ratio falls from 1.5 to 1.35.
    gamma, r_air = 1.4, 287.05287
    temp, pres, mach = 218.81, 23842.0, 0.78
    f = 1.0 + 0.5 * (gamma - 1.0) * mach**2
    rated = 95000.0

    prob = om.Problem(reports=False)
    model = prob.model
    model.add_subsystem('fan', DuctedFanComp(vec_size=3))
    model.add_subsystem('annulus', FanAnnulusComp(vec_size=3))
    model.add_subsystem('static', StaticThrustPerPowerComp(vec_size=3))
    model.add_subsystem('mass', EngineMassComp(vec_size=3, count=2))
    model.connect('fan.fan_face_area', 'annulus.fan_face_area')
    model.connect('annulus.fan_diameter', 'mass.fan_diameter')
    model.connect('static.thrust_per_power', 'mass.static_thrust_per_power')
    prob.setup()
    fpr = [1.35, 1.5, 1.8]
    prob.set_val('fan.net_thrust', rated / 6.0)
    prob.set_val('fan.inflow_total_temperature', temp * f)
    prob.set_val('fan.inflow_total_pressure', pres * f ** (gamma / (gamma - 1.0)))
    prob.set_val('fan.ram_velocity', mach * math.sqrt(gamma * r_air * temp))
    prob.set_val('fan.ambient_pressure', pres)
    prob.set_val('fan.fan_face_mach', 0.6)
    prob.set_val('annulus.hub_to_tip_ratio', 0.3)
    for name in ('fan', 'static'):
        prob.set_val(f'{name}.fan_pressure_ratio', fpr)
        prob.set_val(f'{name}.fan_efficiency', 0.92)
    prob.set_val('mass.cruise_thrust', rated / 6.0)
    prob.set_val('mass.rated_to_cruise_thrust', 6.0)
    prob.set_val('mass.nacelle_wetted_area', 52.0)  # two nacelles of 26 m**2
    prob.run_model()

    assert prob.get_val('mass.rated_thrust')[1] == pytest.approx(rated, rel=1e-12)
    assert prob.get_val('annulus.fan_diameter')[1] == pytest.approx(1.63, abs=0.01)
    installed = prob.get_val('mass.engine_mass') + prob.get_val('mass.nacelle_mass')
    assert 3.3 < rated / (installed[1] * G0) < 3.8
    per_thrust = prob.get_val('mass.engine_mass') / prob.get_val('mass.rated_thrust')
    assert per_thrust[0] > 1.05 * per_thrust[1]


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
    points = (
        (
            1,
            {
                'cruise_thrust': [15000.0, 18000.0, 22000.0],
                'rated_to_cruise_thrust': [4.0, 4.5, 5.0],
                'static_thrust_per_power': [6.0e-3, 7.0e-3, 8.0e-3],
                'shaft_power_extracted': [0.0, 0.0, 0.0],
                'sizing_factor': [1.0, 1.0, 1.0],
                'fan_diameter': [1.5, 1.63, 1.9],
                'fan_areal_mass': [450.0, 500.0, 550.0],
                'core_specific_power': [10.0e3, 11.5e3, 13.0e3],
                'nacelle_wetted_area': [22.0, 26.0, 35.0],
                'nacelle_areal_mass': [18.0, 20.0, 24.0],
            },
        ),
        (
            2,
            {
                'cruise_thrust': [9000.0, 12000.0, 7000.0],
                'rated_to_cruise_thrust': [5.2, 3.8, 6.0],
                'static_thrust_per_power': [5.6e-3, 8.1e-3, 6.4e-3],
                'shaft_power_extracted': [1.0e6, 3.5e6, 0.2e6],
                'sizing_factor': [1.1, 1.3, 1.0],
                'fan_diameter': [1.2, 2.1, 1.7],
                'fan_areal_mass': [300.0, 650.0, 480.0],
                'core_specific_power': [8.0e3, 14.0e3, 9.5e3],
                'nacelle_wetted_area': [15.0, 40.0, 28.0],
                'nacelle_areal_mass': [25.0, 12.0, 19.0],
            },
        ),
        (
            4,
            {
                'cruise_thrust': [25000.0, 6000.0, 14000.0],
                'rated_to_cruise_thrust': [4.4, 7.0, 5.5],
                'static_thrust_per_power': [7.5e-3, 5.9e-3, 9.0e-3],
                'shaft_power_extracted': [8.0e6, 0.5e6, 2.5e6],
                'sizing_factor': [1.25, 1.0, 1.6],
                'fan_diameter': [2.4, 1.1, 1.55],
                'fan_areal_mass': [520.0, 420.0, 610.0],
                'core_specific_power': [12.0e3, 7.5e3, 16.0e3],
                'nacelle_wetted_area': [45.0, 12.0, 24.0],
                'nacelle_areal_mass': [21.0, 17.0, 23.0],
            },
        ),
    )
    for count, inputs in points:
        check_component_partials(EngineMassComp(vec_size=3, count=count), inputs)


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
