"""Target sweeps: fixed inputs, output targets, the reference, serial against parallel."""

import copy
import math

import numpy as np
import pytest

from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.optimization import optimize
from voltwake.errors import ConfigError
from voltwake.studies.target_sweep import fixed_config, target_sweep

DEMO = load_config(demo_path('turbo_electric'))

#: Inside the demo's design-variable bounds (aft-fan pressure ratio 1.15-1.6, thrust
#: fraction 0.05-0.45) and large enough for the aft fan's minimum blade height.
TARGETS = {
    'aft_fan.fan_pressure_ratio': np.array([1.15, 1.2]),
    'aft_fan.thrust_fraction': [0.22, 0.26],
}

#: Design variables of the demo that stay free when both aft-fan variables are swept.
FREE = [
    'wing.loading',
    'wing.aspect_ratio',
    'wing.sweep',
    'wing.thickness_to_chord',
    'turbofans.fan_pressure_ratio',
    'turbofans.rated_to_cruise_thrust',
    'electrical.cable.voltage',
]


@pytest.fixture(scope='module')
def serial():
    return target_sweep(DEMO, TARGETS, jobs=1)


@pytest.fixture(scope='module')
def parallel():
    return target_sweep(DEMO, TARGETS, jobs=2)


@pytest.fixture(scope='module')
def demo_optimum():
    result = optimize(DEMO)
    assert result.success, result.message
    return result


def _by_hand(updates):
    """The demo with inputs set in their sections and taken out of the design variables."""
    data = copy.deepcopy(DEMO.data)
    for path, value in updates.items():
        section, key = path.split('.')
        data[section][key] = value
        del data['optimization']['design_variables'][path]
    return load_config(data)


def test_full_factorial_with_the_first_target_slowest(serial):
    assert serial['targets'] == list(TARGETS)
    got = [
        (p['target:aft_fan.fan_pressure_ratio'], p['target:aft_fan.thrust_fraction'])
        for p in serial['points']
    ]
    assert got == [(1.15, 0.22), (1.15, 0.26), (1.2, 0.22), (1.2, 0.26)]
    assert all(type(value) is float for pair in got for value in pair)  # JSON-ready


def test_every_point_succeeds_and_only_the_free_variables_are_optimised(serial):
    for point in serial['points']:
        assert point['success'], point['message']
        assert sorted(k[3:] for k in point if k.startswith('dv:')) == sorted(FREE)
        assert all(
            math.isfinite(point[key])
            for key in ('block_fuel_kg', 'mtow_kg', 'power_saving_coefficient')
        )
        assert point['electrical_mass_kg'] > 0.0 and point['aft_fan_mass_kg'] > 0.0
        # The bus voltage is held by the partial-discharge limit at every point.
        assert 'cable_voltage_margin' in point['active_constraints']
        assert all(isinstance(name, str) for name in point['active_constraints'])


def test_a_point_is_the_optimum_with_its_targets_fixed(serial):
    single = optimize(
        _by_hand({'aft_fan.fan_pressure_ratio': 1.2, 'aft_fan.thrust_fraction': 0.26})
    )
    assert single.success, single.message
    point = serial['points'][3]
    assert point['block_fuel_kg'] == pytest.approx(single.outputs['block_fuel_kg'], rel=1e-6)
    for path in FREE:
        assert point[f'dv:{path}'] == pytest.approx(single.design[path]['si']['value'], rel=1e-4)
    active_bounds = sorted(f'bound:{p}' for p, dv in single.design.items() if dv['active'])
    assert sorted(n for n in point['active_constraints'] if n.startswith('bound:')) == active_bounds


def test_one_and_two_processes_give_identical_rows(serial, parallel):
    assert parallel['points'] == serial['points']
    assert parallel['references'] == serial['references']


def test_fuel_burn_change_is_against_the_optimised_conventional_reference(serial):
    reference = serial['reference']
    assert reference['success'], reference['message']
    assert len(serial['references']) == 1 and reference['targets'] == {}
    # The reference has no aft-fan design variables and no aft fan.
    assert sorted(reference['design']) == sorted(FREE[:-1])
    assert reference['outputs']['power_saving_coefficient'] == 0.0
    alone = optimize(DEMO.without_aft_fan())
    assert reference['outputs']['block_fuel_kg'] == pytest.approx(
        alone.outputs['block_fuel_kg'], rel=1e-6
    )
    fuel = reference['outputs']['block_fuel_kg']
    for point in serial['points']:
        assert point['fuel_burn_change_percent'] == pytest.approx(
            100.0 * (point['block_fuel_kg'] - fuel) / fuel, rel=1e-12
        )
    # At these aft-fan thrust shares the fan is larger than its minimum blade height needs
    # (the demo optimum, near 0.17, sits on that limit); past it, a larger share costs fuel:
    # the chain's losses and mass grow faster than the ingestion saving.
    changes = [p['fuel_burn_change_percent'] for p in serial['points']]
    assert changes[1] > changes[0] and changes[3] > changes[2]
    for point in serial['points']:
        assert 'aft_fan_hub_to_tip_margin' not in point['active_constraints']


def test_an_output_target_is_an_equality_constraint(demo_optimum):
    # Targets below the PSC of the free optimum (at the optimum itself the equality would
    # duplicate the active blade-height limit, a degenerate pair for SLSQP).
    reached = demo_optimum.outputs['power_saving_coefficient']
    near, far = reached - 0.005, reached - 0.015
    sweep = target_sweep(DEMO, {'power_saving_coefficient': [near, far]}, jobs=2)
    low, lower = sweep['points']
    for point, target in ((low, near), (lower, far)):
        assert point['success'], point['message']
        assert point['power_saving_coefficient'] == pytest.approx(target, rel=1e-6)
        assert 'power_saving_coefficient' in point['active_constraints']
        # The aft-fan variables stay free with an output target.
        assert 'dv:aft_fan.thrust_fraction' in point
        # Away from the free optimum the constrained optimum cannot burn less ...
        assert point['block_fuel_kg'] > demo_optimum.outputs['block_fuel_kg'] * (1.0 - 1e-7)
    # ... and the further the target, the more it costs.
    assert lower['block_fuel_kg'] > low['block_fuel_kg']


def test_a_conventional_input_target_gets_a_reference_of_its_own():
    # International nautical mile = 1852 m (ICAO Annex 5; from memory).
    ranges = [1200 * 1852.0, 1500 * 1852.0]
    sweep = target_sweep(DEMO, {'mission.range': ranges}, jobs=2)
    assert [p['reference'] for p in sweep['points']] == [0, 1]
    assert [r['targets'] for r in sweep['references']] == [{'mission.range': r} for r in ranges]
    short, long = sweep['references']
    assert short['success'] and long['success']
    assert short['outputs']['block_fuel_kg'] < long['outputs']['block_fuel_kg']
    for point, ref in zip(sweep['points'], sweep['references']):
        fuel = ref['outputs']['block_fuel_kg']
        assert point['fuel_burn_change_percent'] == pytest.approx(
            100.0 * (point['block_fuel_kg'] - fuel) / fuel, rel=1e-12
        )


def test_an_output_target_the_reference_shares_holds_the_reference_too():
    # A 33 m span (below the 36 m the free optima reach) binds both aircraft: the reference
    # is optimised at the same span, while the power saving coefficient, which only the
    # turbo-electric model has, leaves it free.
    sweep = target_sweep(DEMO, {'wingspan': [33.0]}, jobs=1)
    (point,), (ref,) = sweep['points'], sweep['references']
    assert point['success'] and ref['success'], (point['message'], ref['message'])
    assert ref['targets'] == {'wingspan': 33.0}
    assert ref['outputs']['wingspan_m'] == pytest.approx(33.0, rel=1e-5)
    free = optimize(DEMO.without_aft_fan())
    assert ref['outputs']['block_fuel_kg'] > free.outputs['block_fuel_kg']
    fuel = ref['outputs']['block_fuel_kg']
    assert point['fuel_burn_change_percent'] == pytest.approx(
        100.0 * (point['block_fuel_kg'] - fuel) / fuel, rel=1e-12
    )


def test_fixed_config_sets_the_input_and_frees_its_design_variable():
    config = fixed_config(DEMO, {'aft_fan.thrust_fraction': 0.2})
    assert 'aft_fan.thrust_fraction' not in config.values['optimization.design_variables']
    assert config.values['aft_fan.thrust_fraction'] == 0.2


def test_failed_points_keep_their_rows_with_nan_numbers():
    # Two optimiser iterations cannot converge: every optimisation reports failure.
    config = DEMO.with_overrides({'optimization.optimizer.max_iterations': 2})
    sweep = target_sweep(config, {'aft_fan.thrust_fraction': [0.15, 0.2]}, jobs=1)
    assert len(sweep['points']) == 2
    assert not sweep['reference']['success']
    for point in sweep['points']:
        assert point['success'] is False and point['message']
        assert point['status'] == 'failed'  # a feasible design exists: the optimiser's failure
        assert math.isnan(point['block_fuel_kg']) and math.isnan(point['fuel_burn_change_percent'])
        assert math.isnan(point['dv:wing.loading'])
        assert point['active_constraints'] == []


def test_an_unknown_target_is_refused_with_a_hint():
    with pytest.raises(
        ConfigError,
        match="power_saving_coeficient: neither a config key.*"
        "did you mean 'power_saving_coefficient'",
    ):
        target_sweep(DEMO, {'power_saving_coeficient': [0.2]})


def test_targeting_every_design_variable_is_refused():
    every = {path: [1.0] for path in DEMO.values['optimization.design_variables']}
    with pytest.raises(ConfigError, match='nothing is left to optimise'):
        target_sweep(DEMO, every)
