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


LOSSES = {
    'generator_loss': 5.0e4,
    'rectifier_loss': 1.0e4,
    'cable_loss': 5.0e3,
    'inverter_loss': 2.0e4,
    'motor_loss': 8.0e4,
}


def test_thermal_hand_case():
    # Hand values from Q = sum P_loss, Q_rated = sum k**e P_loss, m = m' Q_rated, D = D' Q:
    # Q = 50 + 10 + 5 + 20 + 80 kW = 165 kW; at k = 1.3 the devices (e = 1) give
    # 1.3 * 160 = 208 kW and the cable (e = 2) 1.69 * 5 = 8.45 kW, Q_rated = 216.45 kW;
    # at 0.5 kg/kW -> 108.225 kg; at 0.02 N/kW -> 3.3 N (on the cruise heat).
    prob = run_comp(
        ThermalManagementComp(),
        sizing_factor=1.3,
        specific_mass=0.5e-3,
        drag_per_power=2.0e-5,
        **LOSSES,
    )
    assert prob.get_val('heat_load')[0] == pytest.approx(1.65e5, rel=1e-12)
    assert prob.get_val('rated_heat_load')[0] == pytest.approx(2.1645e5, rel=1e-12)
    assert prob.get_val('mass')[0] == pytest.approx(108.225, rel=1e-12)
    assert prob.get_val('drag')[0] == pytest.approx(3.3, rel=1e-12)


def test_thermal_defaults():
    # Default k = 1.5: Q_rated = 1.5 * 160 kW + 2.25 * 5 kW = 251.25 kW; at the default
    # 1 kg/kW -> 251.25 kg. Default drag per power from the ram-air duct estimate in the
    # component docstring (common practice; hand estimate, not a published figure):
    # D/Q = V0 (1 - Ve/V0) / (cp dT_c) = 230 * 0.25 / (1005 * 40) = 1.430e-3 N/W, used
    # rounded to 1.4e-3 N/W -> 165 kW * 1.4e-3 N/W = 231 N.
    prob = run_comp(ThermalManagementComp(), **LOSSES)
    assert prob.get_val('rated_heat_load')[0] == pytest.approx(2.5125e5, rel=1e-12)
    assert prob.get_val('mass')[0] == pytest.approx(251.25, rel=1e-12)
    assert prob.get_val('drag_per_power')[0] == pytest.approx(1.4e-3, rel=1e-12)
    assert prob.get_val('drag')[0] == pytest.approx(231.0, rel=1e-12)
    duct_estimate = 230.0 * (1.0 - 0.75) / (1005.0 * 40.0)
    assert duct_estimate == pytest.approx(1.430e-3, rel=1e-3)
    # the default is the estimate rounded to two figures
    assert prob.get_val('drag_per_power')[0] == pytest.approx(duct_estimate, rel=0.025)


def test_thermal_custom_sources_and_documented_drag_default():
    # two sources, exponents 1 and 2; k = 2: Q = 13 kW, Q_rated = 2 * 10 + 4 * 3 = 32 kW;
    # drag at the documented default 1.4e-3 N/W: 13 kW -> 18.2 N.
    prob = run_comp(
        ThermalManagementComp(sources={'motor': 1, 'battery': 2}),
        motor_loss=1.0e4,
        battery_loss=3.0e3,
        sizing_factor=2.0,
    )
    assert prob.get_val('heat_load')[0] == pytest.approx(1.3e4, rel=1e-12)
    assert prob.get_val('rated_heat_load')[0] == pytest.approx(3.2e4, rel=1e-12)
    assert prob.get_val('drag')[0] == pytest.approx(18.2, rel=1e-12)


def test_thermal_cable_scales_with_k_squared_device_with_k():
    # one source at a time, k = 1, 1.5, 2: the rated loss of a constant-efficiency device
    # is k P_loss, that of the resistive cable (I**2 R, current ~ power) is k**2 P_loss.
    k = np.array([1.0, 1.5, 2.0])
    for source, expected in (('motor', k), ('cable', k**2)):
        inputs = {name: np.zeros(3) for name in LOSSES}
        inputs[f'{source}_loss'] = np.full(3, 1.0e4)
        prob = run_comp(ThermalManagementComp(vec_size=3), sizing_factor=k, **inputs)
        np.testing.assert_allclose(
            prob.get_val('rated_heat_load'), 1.0e4 * expected, rtol=1e-12, err_msg=source
        )
        # the cruise heat load and the drag do not depend on k
        np.testing.assert_allclose(prob.get_val('heat_load'), 1.0e4, rtol=1e-12)
        np.testing.assert_allclose(prob.get_val('drag'), 14.0, rtol=1e-12)


def test_thermal_unit_sizing_factor_rated_equals_cruise():
    prob = run_comp(ThermalManagementComp(), sizing_factor=1.0, **LOSSES)
    assert prob.get_val('rated_heat_load')[0] == pytest.approx(1.65e5, rel=1e-12)


@pytest.mark.parametrize('sources', [{'motor': -1}, {'motor': '1'}, {'motor': True}])
def test_thermal_rejects_bad_exponents(sources):
    with pytest.raises((TypeError, ValueError)):
        ThermalManagementComp(sources=sources)


def test_thermal_rejects_list_of_sources():
    with pytest.raises(TypeError):
        ThermalManagementComp(sources=['motor', 'cable'])


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
    prob.set_val('thermal.sizing_factor', 1.3)
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
    # thermal mass on the rated heat: devices scale with k = 1.3, the cable with k**2
    rated = sum(1.3 * prob.get_val(f'{name}.loss') for name in DEVICES)
    rated = rated + 1.3**2 * prob.get_val('cable.loss')
    np.testing.assert_allclose(prob.get_val('thermal.rated_heat_load'), rated, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('thermal.mass'), 0.5e-3 * rated, rtol=1e-12)


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
            'sizing_factor': [1.3, 1.0, 1.7],
        },
        {
            'generator_loss': [1.0e3, 7.0e4, 2.0e4],
            'rectifier_loss': [3.0e3, 5.0e3, 1.0e3],
            'cable_loss': [2.0e3, 4.0e3, 6.0e3],
            'inverter_loss': [9.0e3, 1.0e3, 3.0e3],
            'motor_loss': [4.0e4, 6.0e4, 1.0e4],
            'specific_mass': [2.0e-3, 0.1e-3, 0.7e-3],
            'drag_per_power': [1.0e-5, 3.0e-5, 0.5e-5],
            'sizing_factor': [1.1, 1.5, 2.0],
        },
    ],
)
def test_thermal_partials(point):
    check_component_partials(ThermalManagementComp(vec_size=3), point)


def test_thermal_partials_custom_exponents():
    # non-integer and zero exponents, k below and above 1
    check_component_partials(
        ThermalManagementComp(vec_size=3, sources={'a': 0, 'b': 1.5, 'c': 3}),
        {
            'a_loss': [1.0e3, 2.0e4, 5.0e3],
            'b_loss': [4.0e4, 1.0e3, 7.0e3],
            'c_loss': [2.0e3, 6.0e3, 3.0e4],
            'sizing_factor': [0.8, 1.25, 2.5],
            'specific_mass': [0.4e-3, 1.2e-3, 0.9e-3],
            'drag_per_power': [1.4e-3, 0.7e-3, 2.0e-3],
        },
    )


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
