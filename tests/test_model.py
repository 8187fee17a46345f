"""The assembled sizing model: closure, total derivatives, limits, balances and trends."""

import numpy as np
import pytest
from openmdao.utils.assert_utils import assert_check_totals

import voltwake
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.derivatives import check_totals_cs, checked_totals
from voltwake.design.sizing import build_model_problem, run_sizing

CONVENTIONAL = demo_path('conventional')
TURBO_ELECTRIC = demo_path('turbo_electric')


@pytest.fixture(scope='module')
def demo():
    return voltwake.analyze(TURBO_ELECTRIC)


@pytest.fixture(scope='module')
def reference():
    return voltwake.analyze(CONVENTIONAL)


def test_demos_close_in_a_handful_of_newton_iterations(demo, reference):
    for result in (demo, reference):
        assert result.converged
        assert 1 <= result.iterations <= 8
        # The mass balance closes: MTOW = OEW + payload + fuel.
        assert result.mtow_kg == pytest.approx(
            result.oew_kg + result.payload_kg + result.total_fuel_kg, rel=1e-10
        )


def test_demo_tsfc_is_typical_of_high_bypass_turbofans(reference):
    # Cruise TSFC of modern high-bypass turbofans is about 0.50-0.60 lb/(lbf h), i.e. about
    # 14-17 g/(kN s) (common practice).
    assert 14.0 <= reference.tsfc_g_per_kN_s <= 17.0


def _with_fixed_wing_area(path, area=122.0):
    """The demo with a fixed wing area instead of a wing sized to its wing loading."""
    data = load_config(path).data
    del data['wing']['loading']
    data['wing']['area'] = area
    return load_config(data)


@pytest.mark.parametrize('path', [CONVENTIONAL, TURBO_ELECTRIC])
@pytest.mark.parametrize('wing', ['loading', 'area'])
def test_total_derivatives_of_the_converged_model(path, wing):
    config = load_config(path) if wing == 'loading' else _with_fixed_wing_area(path)
    prob = build_model_problem(config, vec_size=3)
    prob.set_val('range', [2.0e6, 2.778e6, 3.5e6])
    of, wrt = checked_totals(config)
    assert wrt[0] == {'loading': 'design_wing_loading', 'area': 'wing_area'}[wing]
    prob.set_val(wrt[0], config.model_inputs()[wrt[0]][0] * np.array([0.95, 1.0, 1.05]))
    run_sizing(prob, config.has_aft_fan)
    data = check_totals_cs(prob, of, wrt)
    assert_check_totals(data, atol=1e-10, rtol=1e-7)


def test_total_derivative_check_catches_a_wrong_partial(monkeypatch):
    # The check must not compare the analytic totals with themselves (see check_totals_cs):
    # a 1% error in one partial of the power saving coefficient must show.
    from voltwake.components.power_saving import PowerSavingComp

    right = PowerSavingComp.compute_partials

    def wrong(self, inputs, partials):
        right(self, inputs, partials)
        partials['power_saving_coefficient', 'shaft_power'] *= 1.01

    monkeypatch.setattr(PowerSavingComp, 'compute_partials', wrong)
    prob = build_model_problem(load_config(TURBO_ELECTRIC))
    run_sizing(prob, True)
    data = check_totals_cs(prob, ['power_saving_coefficient'], ['aft_fan_pressure_ratio'])
    with pytest.raises(ValueError):
        assert_check_totals(data, atol=1e-10, rtol=1e-7)


def test_vectorised_points_match_single_analyses():
    config = load_config(TURBO_ELECTRIC)
    prob = build_model_problem(config, vec_size=3)
    fractions = [0.1, 0.2, 0.3]
    prob.set_val('aft_thrust_fraction', fractions)
    run_sizing(prob, True)
    for i, frac in enumerate(fractions):
        single = voltwake.analyze(config, {'aft_fan.thrust_fraction': frac})
        assert prob.get_val('block_fuel')[i] == pytest.approx(single.block_fuel_kg, rel=1e-8)


def test_power_balance_and_heat_load(demo):
    prob = demo.problem
    extracted = prob.get_val('generator_input_power')[0]
    delivered = prob.get_val('aft_shaft_power')[0]
    efficiency = prob.get_val('electrical_chain_efficiency')[0]
    assert extracted * efficiency == pytest.approx(delivered, rel=1e-12)
    losses = sum(
        prob.get_val(f'{d}_loss')[0]
        for d in ('generator', 'rectifier', 'cable', 'inverter', 'motor')
    )
    assert prob.get_val('thermal_load')[0] == pytest.approx(losses, rel=1e-12)
    assert losses == pytest.approx(extracted - delivered, rel=1e-10)
    # The extracted power is shared by the turbofans and paid for in their fuel flow.
    assert prob.get_val('engine_power_extraction')[0] == pytest.approx(extracted / 2, rel=1e-12)


def test_demo_machines_inside_published_ranges():
    # Near-term aircraft-class electric machines: about 5-20 kW/kg and 0.95-0.99 efficiency
    # (reviews of electric machines for aircraft propulsion, 2019-2021 literature; from memory).
    config = load_config(TURBO_ELECTRIC)
    for machine in ('motor', 'generator'):
        assert 5e3 <= config.value(f'electrical.{machine}.specific_power') <= 20e3
        assert 0.95 <= config.value(f'electrical.{machine}.efficiency') <= 0.99


def test_power_saving_coefficient_of_the_demo(demo):
    # Fuselage boundary-layer ingestion: a few percent to a few tens of percent at the fan;
    # wind-tunnel tests measured roughly 8% less power than a podded propulsor (common
    # practice). Order-of-magnitude check: positive and between 2% and 40%.
    assert 0.02 < demo.power_saving_coefficient < 0.40


def test_psc_vanishes_as_the_layer_becomes_thin_relative_to_the_fan():
    # A very clean fuselage (tiny drag area) leaves a thin layer; a large aft fan captures
    # mostly free stream: PSC -> 0.
    thin = voltwake.analyze(
        TURBO_ELECTRIC, {'fuselage.interference_factor': 0.01, 'aft_fan.thrust_fraction': 0.4}
    )
    base = voltwake.analyze(TURBO_ELECTRIC, {'aft_fan.thrust_fraction': 0.4})
    assert thin.capture_height_m > 3 * thin.boundary_layer_thickness_m
    assert 0 < thin.power_saving_coefficient < 0.25 * base.power_saving_coefficient


def test_zero_thrust_fraction_is_the_conventional_aircraft(reference):
    zero = voltwake.analyze(TURBO_ELECTRIC, {'aft_fan.thrust_fraction': 0.0})
    assert zero.mtow_kg == pytest.approx(reference.mtow_kg, rel=1e-10)
    assert zero.block_fuel_kg == pytest.approx(reference.block_fuel_kg, rel=1e-10)
    assert zero.electrical_mass_kg == 0.0
    # The limit is not continuous, as in a real aircraft: a tiny aft fan still wraps the
    # tail cone, so its blades are very short (hub-to-tip ratio near 1, far beyond the
    # minimum blade height) and its nacelle ring weighs and drags.
    tiny = voltwake.analyze(TURBO_ELECTRIC, {'aft_fan.thrust_fraction': 1e-4})
    assert tiny.aft_fan_hub_to_tip_ratio > 0.99 and tiny.aft_fan_hub_to_tip_margin < 0.0
    assert tiny.block_fuel_kg > reference.block_fuel_kg


def _fuel(path, **overrides):
    return voltwake.analyze(path, overrides).block_fuel_kg


def test_foundation_trends():
    base = _fuel(CONVENTIONAL)
    assert _fuel(CONVENTIONAL, **{'mission.range': '1800 nmi'}) > base
    assert _fuel(CONVENTIONAL, **{'fuel.heating_value': '45 MJ/kg'}) < base
    heavy = voltwake.analyze(CONVENTIONAL, {'mission.payload': 14000})
    assert heavy.mtow_kg > voltwake.analyze(CONVENTIONAL).mtow_kg


def test_turbo_electric_trends(demo):
    base = demo.block_fuel_kg
    assert _fuel(TURBO_ELECTRIC, **{'electrical.motor.specific_power': '15 kW/kg'}) < base
    assert _fuel(TURBO_ELECTRIC, **{'electrical.generator.efficiency': 0.985}) < base
    assert _fuel(TURBO_ELECTRIC, **{'electrical.inverter.efficiency': 0.995}) < base
    # Higher aft-fan pressure ratio at fixed thrust -> smaller aft fan.
    high = voltwake.analyze(TURBO_ELECTRIC, {'aft_fan.fan_pressure_ratio': 1.45})
    assert high.aft_fan_diameter_m < demo.aft_fan_diameter_m


def test_turbofans_shrink_as_the_aft_fan_takes_thrust(demo, reference):
    assert demo.turbofan_cruise_thrust_kN < reference.turbofan_cruise_thrust_kN
    assert demo.turbofan_fan_diameter_m < reference.turbofan_fan_diameter_m


def test_weight_that_grows_without_bound_is_reported():
    with pytest.raises(voltwake.NotClosedError, match='did not close'):
        voltwake.analyze(
            CONVENTIONAL,
            {
                'structure.method': 'regression',
                'structure.airframe_mass_coefficient': 1.1,
                'structure.airframe_mass_exponent': 1.2,
            },
        )


def test_fan_pressure_ratio_too_low_for_thrust_is_reported():
    with pytest.raises(voltwake.NotClosedError, match='no thrust|did not close'):
        voltwake.analyze(CONVENTIONAL, {'turbofans.fan_pressure_ratio': 1.01})


def test_result_values_are_finite(demo):
    assert all(np.isfinite(v) for v in demo.values.values())
