"""Tests of the electrical devices, thermal management, summary and the assembled power chain."""

import numpy as np
import openmdao.api as om
import pytest
from openmdao.utils.assert_utils import assert_check_totals

from voltwake.components.cable import CableComp
from voltwake.components.electrical_device import ElectricalDeviceComp
from voltwake.components.electrical_summary import ElectricalSummaryComp
from voltwake.components.thermal_management import ThermalManagementComp

from partials import check_component_partials

DEVICES = ['generator', 'rectifier', 'inverter', 'motor']
# Demo inputs for the chain (not check values): efficiency, specific power (W/kg), sizing factor.
DEMO_DEVICES = {
    'generator': (0.97, 12.0e3, 1.3),
    'rectifier': (0.99, 15.0e3, 1.3),
    'inverter': (0.99, 15.0e3, 1.3),
    'motor': (0.96, 8.0e3, 1.3),
}


def machine_in_published_range(specific_power_kw_per_kg, efficiency):
    """
    Whether an electric machine lies in the range reported for near-term aircraft machines.

    Published reviews of electric machines for aircraft propulsion (the 2019-2021
    literature on high-specific-power motors) report roughly 5-20 kW/kg specific power
    (active parts plus structure) and 0.95-0.99 efficiency; from memory.

    Parameters
    ----------
    specific_power_kw_per_kg : float
        Machine specific power (kW/kg).
    efficiency : float
        Machine efficiency.

    Returns
    -------
    bool
        True if both values lie inside the published range (bounds included).
    """
    return bool(5.0 <= specific_power_kw_per_kg <= 20.0 and 0.95 <= efficiency <= 0.99)


@pytest.mark.parametrize(
    'sp, eta, expected',
    [
        (10.0, 0.97, True),
        (5.0, 0.95, True),
        (20.0, 0.99, True),
        (2.0, 0.97, False),
        (25.0, 0.97, False),
        (10.0, 0.90, False),
        (10.0, 0.995, False),
    ],
)
def test_machine_in_published_range(sp, eta, expected):
    assert machine_in_published_range(sp, eta) is expected


def test_demo_machines_in_published_range():
    for name in ('generator', 'motor'):
        eta, sp, _ = DEMO_DEVICES[name]
        assert machine_in_published_range(sp / 1000.0, eta), name


def run_comp(comp, **inputs):
    """Run a single component and return the problem."""
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', comp, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def test_device_hand_case():
    # Hand arithmetic of P_in = P_out / eta, loss = P_in - P_out, P_rated = k P_out,
    # m = P_rated / P_spec: 3 MW at 0.96 -> 3.125 MW in, 125 kW loss; rated 3.9 MW;
    # at 8 kW/kg -> 487.5 kg.
    prob = run_comp(
        ElectricalDeviceComp(),
        output_power=3.0e6,
        efficiency=0.96,
        specific_power=8.0e3,
        sizing_factor=1.3,
    )
    assert prob.get_val('input_power')[0] == pytest.approx(3.125e6, rel=1e-12)
    assert prob.get_val('loss')[0] == pytest.approx(1.25e5, rel=1e-10)
    assert prob.get_val('rated_power')[0] == pytest.approx(3.9e6, rel=1e-12)
    assert prob.get_val('mass')[0] == pytest.approx(487.5, rel=1e-12)


def test_lossless_device():
    prob = run_comp(ElectricalDeviceComp(), output_power=2.0e6, efficiency=1.0)
    assert prob.get_val('input_power')[0] == pytest.approx(2.0e6, rel=1e-15)
    assert prob.get_val('loss')[0] == pytest.approx(0.0, abs=1e-9)


def test_device_trends():
    low = run_comp(ElectricalDeviceComp(), efficiency=0.95, specific_power=5.0e3)
    high = run_comp(ElectricalDeviceComp(), efficiency=0.99, specific_power=20.0e3)
    assert high.get_val('loss')[0] < low.get_val('loss')[0]
    assert high.get_val('mass')[0] < low.get_val('mass')[0]


def test_thermal_hand_case():
    # 50 + 10 + 5 + 20 + 80 kW = 165 kW; at 0.5 kg/kW -> 82.5 kg; at 0.02 N/kW -> 3.3 N.
    losses = {
        'generator_loss': 5.0e4,
        'rectifier_loss': 1.0e4,
        'cable_loss': 5.0e3,
        'inverter_loss': 2.0e4,
        'motor_loss': 8.0e4,
    }
    prob = run_comp(ThermalManagementComp(), specific_mass=0.5e-3, drag_per_power=2.0e-5, **losses)
    assert prob.get_val('heat_load')[0] == pytest.approx(1.65e5, rel=1e-12)
    assert prob.get_val('mass')[0] == pytest.approx(82.5, rel=1e-12)
    assert prob.get_val('drag')[0] == pytest.approx(3.3, rel=1e-12)


def test_thermal_custom_sources_and_no_drag_default():
    prob = run_comp(
        ThermalManagementComp(sources=['motor', 'battery']), motor_loss=1.0e4, battery_loss=3.0e3
    )
    assert prob.get_val('heat_load')[0] == pytest.approx(1.3e4, rel=1e-12)
    assert prob.get_val('drag')[0] == 0.0


def test_summary_hand_case():
    masses = {
        'generator_mass': 300.0,
        'rectifier_mass': 120.0,
        'cable_mass': 80.0,
        'inverter_mass': 110.0,
        'motor_mass': 450.0,
        'thermal_mass': 90.0,
    }
    prob = run_comp(
        ElectricalSummaryComp(), shaft_power_extracted=4.0e6, aft_fan_shaft_power=3.6e6, **masses
    )
    assert prob.get_val('electrical_mass')[0] == pytest.approx(1150.0, rel=1e-12)
    assert prob.get_val('chain_efficiency')[0] == pytest.approx(0.9, rel=1e-12)


def build_chain(vec_size=2):
    """
    The power chain, assembled backwards from the aft-fan shaft power.

    Parameters
    ----------
    vec_size : int
        Number of design points.

    Returns
    -------
    om.Problem
        Set up (with complex step allocated) and with the demo inputs set.
    """
    prob = om.Problem(reports=False)
    model = prob.model
    ivc = model.add_subsystem('ivc', om.IndepVarComp())
    ivc.add_output('aft_fan_shaft_power', np.full(vec_size, 3.0e6), units='W')
    ivc.add_output('voltage', np.full(vec_size, 1000.0), units='V')
    # Added in data-flow order (power flows backwards from the aft fan), so one pass runs it.
    for name in ('motor', 'inverter'):
        model.add_subsystem(name, ElectricalDeviceComp(vec_size=vec_size))
    model.add_subsystem('cable', CableComp(vec_size=vec_size))
    for name in ('rectifier', 'generator'):
        model.add_subsystem(name, ElectricalDeviceComp(vec_size=vec_size))
    model.add_subsystem('thermal', ThermalManagementComp(vec_size=vec_size))
    model.add_subsystem('summary', ElectricalSummaryComp(vec_size=vec_size))

    model.connect('ivc.aft_fan_shaft_power', ['motor.output_power', 'summary.aft_fan_shaft_power'])
    model.connect('ivc.voltage', 'cable.voltage')
    model.connect('motor.input_power', 'inverter.output_power')
    model.connect('inverter.input_power', 'cable.output_power')
    model.connect('cable.input_power', 'rectifier.output_power')
    model.connect('rectifier.input_power', 'generator.output_power')
    model.connect('generator.input_power', 'summary.shaft_power_extracted')
    for name in DEVICES + ['cable']:
        model.connect(f'{name}.loss', f'thermal.{name}_loss')
        model.connect(f'{name}.mass', f'summary.{name}_mass')
    model.connect('thermal.mass', 'summary.thermal_mass')

    model.add_design_var('ivc.aft_fan_shaft_power')
    model.add_design_var('ivc.voltage')
    model.add_objective('summary.electrical_mass', index=0)
    model.add_constraint('summary.chain_efficiency', lower=0.0)
    model.add_constraint('thermal.heat_load', lower=0.0)

    prob.setup(force_alloc_complex=True)
    for name, (eta, sp, k) in DEMO_DEVICES.items():
        prob.set_val(f'{name}.efficiency', eta)
        prob.set_val(f'{name}.specific_power', sp)
        prob.set_val(f'{name}.sizing_factor', k)
    prob.set_val('cable.length', 30.0)
    prob.set_val('cable.sizing_factor', 1.3)
    prob.set_val('cable.resistivity', 1.68e-8)  # copper, CRC Handbook (edition from memory)
    prob.set_val('cable.conductor_density', 8960.0)
    prob.set_val('thermal.specific_mass', 0.5e-3)
    prob.set_val('ivc.aft_fan_shaft_power', [3.0e6, 1.5e6])
    prob.set_val('ivc.voltage', [1000.0, 540.0])
    prob.run_model()
    return prob


def test_chain_power_balance():
    prob = build_chain()
    delivered = prob.get_val('ivc.aft_fan_shaft_power')
    extracted = prob.get_val('generator.input_power')
    eta_chain = prob.get_val('summary.chain_efficiency')
    np.testing.assert_allclose(extracted * eta_chain, delivered, rtol=1e-12)

    # The chain efficiency is the product of the device efficiencies.
    product = prob.get_val('cable.efficiency')
    for name in DEVICES:
        product = product * prob.get_val(f'{name}.efficiency')
    np.testing.assert_allclose(eta_chain, product, rtol=1e-12)

    # Energy conservation: all power not delivered is heat, and the heat load sums the losses.
    losses = sum(prob.get_val(f'{name}.loss') for name in DEVICES + ['cable'])
    heat = prob.get_val('thermal.heat_load')
    np.testing.assert_allclose(heat, losses, rtol=1e-12)
    np.testing.assert_allclose(heat, extracted - delivered, rtol=1e-12)


def test_chain_mass_totals():
    prob = build_chain()
    masses = sum(prob.get_val(f'{name}.mass') for name in DEVICES + ['cable', 'thermal'])
    np.testing.assert_allclose(prob.get_val('summary.electrical_mass'), masses, rtol=1e-12)
    np.testing.assert_allclose(
        prob.get_val('thermal.mass'), 0.5e-3 * prob.get_val('thermal.heat_load'), rtol=1e-12
    )


def test_chain_totals():
    prob = build_chain()
    data = prob.check_totals(method='cs', out_stream=None)
    assert_check_totals(data, atol=1e-8, rtol=1e-8)


@pytest.mark.parametrize(
    'point',
    [
        {
            'output_power': [3.0e6, 5.0e5, 1.2e6],
            'efficiency': [0.96, 0.99, 0.9],
            'specific_power': [8.0e3, 15.0e3, 4.0e3],
            'sizing_factor': [1.3, 1.0, 1.7],
        },
        {
            'output_power': [7.0e5, 2.5e6, 4.0e6],
            'efficiency': [0.985, 0.95, 0.97],
            'specific_power': [20.0e3, 6.0e3, 11.0e3],
            'sizing_factor': [1.1, 1.5, 2.0],
        },
    ],
)
def test_device_partials(point):
    check_component_partials(ElectricalDeviceComp(vec_size=3), point)


@pytest.mark.parametrize(
    'point',
    [
        {
            'generator_loss': [5.0e4, 1.0e4, 3.0e4],
            'rectifier_loss': [1.0e4, 2.0e3, 8.0e3],
            'cable_loss': [5.0e3, 1.0e3, 9.0e3],
            'inverter_loss': [2.0e4, 4.0e3, 6.0e3],
            'motor_loss': [8.0e4, 2.0e4, 5.0e4],
            'specific_mass': [0.5e-3, 1.0e-3, 0.3e-3],
            'drag_per_power': [2.0e-5, 0.0, 5.0e-5],
        },
        {
            'generator_loss': [1.0e3, 7.0e4, 2.0e4],
            'rectifier_loss': [3.0e3, 5.0e3, 1.0e3],
            'cable_loss': [2.0e3, 4.0e3, 6.0e3],
            'inverter_loss': [9.0e3, 1.0e3, 3.0e3],
            'motor_loss': [4.0e4, 6.0e4, 1.0e4],
            'specific_mass': [2.0e-3, 0.1e-3, 0.7e-3],
            'drag_per_power': [1.0e-5, 3.0e-5, 0.5e-5],
        },
    ],
)
def test_thermal_partials(point):
    check_component_partials(ThermalManagementComp(vec_size=3), point)


@pytest.mark.parametrize(
    'point',
    [
        {
            'generator_mass': [300.0, 150.0, 500.0],
            'rectifier_mass': [120.0, 60.0, 200.0],
            'cable_mass': [80.0, 30.0, 150.0],
            'inverter_mass': [110.0, 55.0, 190.0],
            'motor_mass': [450.0, 200.0, 700.0],
            'thermal_mass': [90.0, 40.0, 160.0],
            'shaft_power_extracted': [4.0e6, 2.0e6, 7.0e6],
            'aft_fan_shaft_power': [3.6e6, 1.7e6, 6.5e6],
        },
        {
            'generator_mass': [200.0, 350.0, 100.0],
            'rectifier_mass': [70.0, 90.0, 40.0],
            'cable_mass': [20.0, 60.0, 10.0],
            'inverter_mass': [65.0, 95.0, 35.0],
            'motor_mass': [250.0, 520.0, 120.0],
            'thermal_mass': [45.0, 85.0, 25.0],
            'shaft_power_extracted': [1.5e6, 5.0e6, 9.0e5],
            'aft_fan_shaft_power': [1.3e6, 4.4e6, 8.2e5],
        },
    ],
)
def test_summary_partials(point):
    check_component_partials(ElectricalSummaryComp(vec_size=3), point)
