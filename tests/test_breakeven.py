"""Technology break-even against the optimised conventional reference; fuel sensitivities."""

import math

import pytest

from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.analysis import analyze
from voltwake.design.optimization import optimize
from voltwake.errors import ConfigError, OptimizationError
from voltwake.studies.breakeven import breakeven, default_technology_paths, technology_sensitivities

DEMO = load_config(demo_path('turbo_electric'))
MOTOR = 'electrical.motor.specific_power'


@pytest.fixture(scope='module')
def motor_breakeven():
    # With the turbo-electric corrections (aft fan round the tail cone with a minimum blade
    # height, take-off thrust from the rated motor power, cooling drag, distortion) the
    # optimised demo burns more fuel than its optimised reference over the whole published
    # range of motor specific power (5-20 kW/kg; see test_electrical.py), and below it.
    return breakeven(DEMO, MOTOR, 2000.0, 20000.0, jobs=2)


@pytest.fixture(scope='module')
def reference_fuel():
    result = optimize(DEMO.without_aft_fan())
    assert result.success, result.message
    return result.outputs['block_fuel_kg']


def test_the_demo_has_no_breakeven_in_motor_specific_power(motor_breakeven, reference_fuel):
    result = motor_breakeven
    assert result['found'] is False
    assert math.isnan(result['value'])
    assert result['difference_at_lower'] > 0.0 and result['difference_at_upper'] > 0.0
    # A lighter motor still helps, it just cannot close the gap.
    assert result['difference_at_upper'] < result['difference_at_lower']
    assert 'no break-even' in result['message']
    assert 'the optimised conventional reference burns less fuel at both ends' in result['message']
    assert len(result['evaluations']) == 2
    assert result['reference_block_fuel_kg'] == pytest.approx(reference_fuel, rel=1e-6)


def _synthetic_optimisation(job):
    """
    Stand-in for an optimisation (test double): block fuel linear in motor specific power.

    The reference burns 10,000 kg; the turbo-electric design 10,000 (1 + (4000 - x)/50,000)
    kg, so the break-even is at exactly 4000 W/kg.
    """
    data = job['data']
    if 'aft_fan' not in data:
        fuel = 10000.0
    else:
        x = float(data['electrical']['motor']['specific_power'])
        fuel = 10000.0 * (1.0 + (4000.0 - x) / 50000.0)
    return {'success': True, 'message': '', 'outputs': {'block_fuel_kg': fuel}}


def test_brent_finds_a_breakeven_where_the_difference_changes_sign(monkeypatch):
    # The root finding and its report, on a stand-in whose break-even is known (4000 W/kg).
    monkeypatch.setattr('voltwake.studies.breakeven.optimize_job', _synthetic_optimisation)
    result = breakeven(DEMO, MOTOR, 3000.0, 5000.0, jobs=1, xtol=1e-3)
    assert result['found'], result['message']
    assert result['path'] == MOTOR and result['units'] == 'W/kg'
    assert result['value'] == pytest.approx(4000.0, abs=1e-2)
    assert result['difference_at_lower'] > 0.0 > result['difference_at_upper']
    assert abs(result['difference_at_value']) < 1e-5
    assert [e['value'] for e in result['evaluations'][:2]] == [3000.0, 5000.0]
    assert result['message'].startswith(f'break-even at {MOTOR} = ')
    assert result['message'].endswith(' W/kg')


def test_no_sign_change_is_reported_not_raised(monkeypatch):
    monkeypatch.setattr('voltwake.studies.breakeven.optimize_job', _synthetic_optimisation)
    result = breakeven(DEMO, MOTOR, 9000.0, 20000.0, jobs=1)
    assert result['found'] is False
    assert math.isnan(result['value'])
    assert result['difference_at_lower'] < 0.0 and result['difference_at_upper'] < 0.0
    assert 'no break-even' in result['message'] and 'less fuel' in result['message']
    assert len(result['evaluations']) == 2


def test_a_failed_optimisation_is_an_error_not_a_breakeven():
    # Two optimiser iterations cannot converge: the reference optimisation fails.
    config = DEMO.with_overrides({'optimization.optimizer.max_iterations': 2})
    with pytest.raises(OptimizationError, match='conventional reference failed'):
        breakeven(config, MOTOR, 3000.0, 5000.0, jobs=1)


def test_breakeven_refuses_an_input_the_reference_has():
    with pytest.raises(ConfigError, match='aft_fan or electrical'):
        breakeven(DEMO, 'wing.area', 100.0, 140.0)


def test_breakeven_refuses_an_empty_interval():
    with pytest.raises(ConfigError, match='not below'):
        breakeven(DEMO, MOTOR, 5000.0, 3000.0)


@pytest.fixture(scope='module')
def sensitivities():
    return technology_sensitivities(DEMO)


def test_default_technology_inputs():
    assert default_technology_paths(DEMO) == [
        'aft_fan.fan_efficiency',
        'electrical.generator.efficiency',
        'electrical.generator.specific_power',
        'electrical.rectifier.efficiency',
        'electrical.rectifier.specific_power',
        'electrical.inverter.efficiency',
        'electrical.inverter.specific_power',
        'electrical.motor.efficiency',
        'electrical.motor.specific_power',
        'electrical.cable.voltage',
    ]


def test_sensitivities_match_central_differences_of_the_analysis(sensitivities):
    base = analyze(DEMO, keep_problem=False).block_fuel_kg
    for path, sens in sensitivities.items():
        x = DEMO.values[path]
        assert sens['value'] == x and sens['block_fuel_kg'] == pytest.approx(base, rel=1e-9)
        step = 1e-4 * x
        plus = analyze(DEMO, {path: x + step}, keep_problem=False).block_fuel_kg
        minus = analyze(DEMO, {path: x - step}, keep_problem=False).block_fuel_kg
        central = (plus - minus) / (2.0 * step)
        assert sens['derivative'] == pytest.approx(central, rel=1e-4), path
        # Elasticity: percent fuel change per percent input change.
        assert sens['elasticity'] == pytest.approx(central * x / base, rel=1e-4), path


def test_better_technology_burns_less_fuel(sensitivities):
    # Higher specific power (lighter machines), higher efficiency (smaller losses) and higher
    # cable voltage (less current, lighter cable) all reduce block fuel.
    for path, sens in sensitivities.items():
        assert sens['derivative'] < 0.0, path
        assert sens['elasticity'] < 0.0, path


def test_sensitivities_need_an_aft_fan():
    with pytest.raises(ConfigError, match='no aft fan'):
        technology_sensitivities(DEMO.without_aft_fan())


def test_the_answer_comes_back_in_the_unit_the_interval_was_written_in(monkeypatch):
    import voltwake
    from voltwake.outputs.summary import sweep_text

    monkeypatch.setattr('voltwake.studies.breakeven.optimize_job', _synthetic_optimisation)
    # The stand-in has no optimum to explain: that part is tested in test_breakeven_optimum.py.
    monkeypatch.setattr('voltwake.studies.runner.explain_breakeven', lambda config, res: res)
    result = voltwake.breakeven(DEMO, MOTOR, '3 kW/kg', '5 kW/kg', jobs=1, xtol=1e-3)
    shown = result.summary['display']
    assert shown['units'] == 'kW/kg' and shown['lower'] == 3.0 and shown['upper'] == 5.0
    assert shown['value'] == pytest.approx(4.0, abs=1e-5)
    assert result.summary['units'] == 'W/kg' and result.summary['value'] == pytest.approx(4000.0)
    text = sweep_text({'breakeven': result.summary})
    assert f'break-even {MOTOR} = 4 kW/kg' in text
