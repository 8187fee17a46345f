"""
Break-even answers: exit 7 without one, what holds the optimum at one, sensitivities.

The post-optimality sensitivities of block fuel are checked against re-optimised fuel.
"""

import contextlib
import io
import json

import pytest

import voltwake
from voltwake.cli import main
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.optimization import optimize
from voltwake.errors import EXIT_NO_BREAKEVEN
from voltwake.outputs.summary import sweep_text
from voltwake.studies.post_optimality import optimum_sensitivities
from voltwake.studies.target_sweep import fixed_config

DEMO = load_config(demo_path('turbo_electric'))
MOTOR = 'electrical.motor.specific_power'
EFFICIENCY = 'electrical.motor.efficiency'

#: Technology values (invented, for this test) at which the demo's optimised turbo-electric
#: design breaks even with its optimised reference near 18.4 kW/kg of motor specific power,
#: with the turbofans' rated-to-cruise thrust ratio held at its upper bound (8) there (found
#: by exploring).
ADVANCED = {
    'electrical.thermal.drag_per_power': '0.3 N/kW',
    'electrical.thermal.specific_mass': '0.3 kg/kW',
    'electrical.generator.specific_power': '20 kW/kg',
    'electrical.generator.efficiency': 0.99,
    'electrical.motor.efficiency': 0.99,
    'electrical.inverter.efficiency': 0.995,
    'electrical.rectifier.efficiency': 0.995,
    'aft_fan.distortion_sensitivity': 0.5,
    'aft_fan.fan_efficiency': 0.95,
}
RATED = 'turbofans.rated_to_cruise_thrust'


def _run(argv):
    """Run ``main`` in-process; return (exit code, stdout, stderr)."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(argv)
    return code, out.getvalue(), err.getvalue()


@pytest.fixture(scope='module')
def no_breakeven(tmp_path_factory):
    out = tmp_path_factory.mktemp('breakeven') / 'out'
    argv = ['sweep', demo_path('turbo_electric'), '--breakeven', f'{MOTOR}=8 kW/kg:10 kW/kg']
    return (*_run([*argv, '--out', str(out), '--jobs', '1']), out)


def test_no_breakeven_exits_7_with_one_message_and_writes_the_files(no_breakeven):
    code, stdout, stderr, out = no_breakeven
    assert code == EXIT_NO_BREAKEVEN
    [line] = stderr.splitlines()
    assert line.startswith(f'voltwake: error: no break-even of {MOTOR} in [8 kW/kg, 10 kW/kg]: ')
    assert 'the optimised conventional reference burns less fuel at both ends' in line
    assert 'at 8 kW/kg' in line and 'at 10 kW/kg' in line
    # A lighter motor helps: the gap narrows upward, and the straight line says where.
    assert 'the gap narrows toward the upper end' in line and 'widening the interval upward' in line
    assert 'no break-even' not in stdout  # said once, on standard error
    assert f'results written to {out}' in stdout
    for name in ('breakeven_summary.json', 'breakeven_points.csv', 'report.html'):
        assert (out / name).is_file(), name
    summary = json.loads((out / 'breakeven_summary.json').read_text())
    assert summary['found'] is False and summary['message'] == line[len('voltwake: error: ') :]
    assert summary['difference_at_lower'] > summary['difference_at_upper'] > 0.0
    trend = summary['trend']
    assert trend['winner'] == 'reference' and trend['narrows_toward'] == 'upper'
    assert trend['straight_line_zero'] > 10000.0 and trend['straight_line_zero_possible']
    at = summary['sensitivities_at']
    assert at['where'] == 'configured value' and at['value'] == 9000.0
    assert at['reference']['derivative'] == 0.0


def test_the_json_sensitivities_are_those_of_the_optimum(no_breakeven, sensitivities_at_9):
    *_, out = no_breakeven
    summary = json.loads((out / 'breakeven_summary.json').read_text())
    sens, _ = sensitivities_at_9
    for path in (MOTOR, EFFICIENCY):
        written = summary['sensitivities'][path]
        assert written['derivative'] == pytest.approx(sens['inputs'][path]['derivative'], rel=1e-6)
        assert written['difference_per_unit'] == pytest.approx(
            100.0 * written['derivative'] / summary['reference_block_fuel_kg'], rel=1e-12
        )
    assert summary['sensitivities_at']['optimised_inputs'] == ['electrical.cable.voltage']


def _optimised_fuel(overrides):
    result = optimize(fixed_config(DEMO, overrides))
    assert result.success, result.message
    return result.outputs['block_fuel_kg']


@pytest.fixture(scope='module')
def sensitivities_at_9():
    result = optimize(fixed_config(DEMO, {MOTOR: 9000.0}))
    assert result.success, result.message
    sens = optimum_sensitivities(
        result.problem, result, [MOTOR, EFFICIENCY, 'electrical.cable.voltage']
    )
    return sens, result


@pytest.mark.parametrize(
    ('path', 'step', 'rel'),
    [
        # Block fuel goes about as the inverse of the specific power: a central difference
        # with a 500 W/kg step at 9000 W/kg is off by about (500/9000)^2 = 0.3 % (truncation),
        # hence 1 %; the design held (explicit derivative) is 16 % away.
        (MOTOR, 500.0, 1e-2),
        # Nearly linear in the efficiency: the step's truncation is small; the optimiser's
        # tolerance (1e-8 on the scaled objective) leaves the fuel good to ~1e-6 kg.
        (EFFICIENCY, 0.005, 1e-3),
    ],
)
def test_sensitivities_at_the_optimum_match_reoptimised_differences(
    sensitivities_at_9, path, step, rel
):
    sens, _ = sensitivities_at_9
    assert sens['residual'] < 1e-3 and sens['wrong_sign'] == []
    assert sens['optimised'] == ['electrical.cable.voltage']
    x = 9000.0 if path == MOTOR else DEMO.values[path]
    base = {MOTOR: 9000.0}
    plus = _optimised_fuel({**base, path: x + step})
    minus = _optimised_fuel({**base, path: x - step})
    central = (plus - minus) / (2.0 * step)
    entry = sens['inputs'][path]
    assert entry['value'] == pytest.approx(x, rel=1e-12)
    assert entry['derivative'] == pytest.approx(central, rel=rel)
    # The re-optimisation matters: the derivative with the design held is further off.
    assert abs(entry['explicit'] / central - 1.0) > 3.0 * rel
    assert entry['elasticity'] == pytest.approx(
        entry['derivative'] * x / sens['objective_value'], rel=1e-12
    )


@pytest.fixture(scope='module')
def bound_driven(tmp_path_factory):
    config = DEMO.with_overrides(ADVANCED)
    result = voltwake.breakeven(config, MOTOR, '18 kW/kg', '19 kW/kg', jobs=2, xtol=50.0)
    return result


def test_the_root_says_what_holds_the_optimum(bound_driven):
    result = bound_driven
    assert result.found, result.message
    assert 18000.0 < result.value < 19000.0
    held = result.data['design_at_value']
    assert held['success']
    # The span, field length and approach speed limit the wing; the aft fan's blade height
    # and the cable's discharge margin limit the fan and the bus voltage.
    assert set(held['active_constraints']) == {
        'wingspan',
        'takeoff_field_length',
        'approach_speed',
        'aft_fan_hub_to_tip_margin',
        'cable_voltage_margin',
    }
    assert f'bound:{RATED}' in held['active']
    assert held['design_variables'][RATED]['at_bound'] == 'upper'
    assert held['design'][RATED] == pytest.approx(8.0, rel=1e-6)
    # Upper-bound constraints have multipliers >= 0, lower-bound ones <= 0 (f + λ g).
    cons = held['active_constraints']
    assert cons['wingspan']['multiplier'] > 0.0 > cons['aft_fan_hub_to_tip_margin']['multiplier']
    assert held['stationarity_residual'] < 1e-3 and held['wrong_sign'] == []
    assert result.data['sensitivities_at']['where'] == 'break-even'


def test_a_root_held_by_a_bound_is_flagged(bound_driven):
    result = bound_driven
    [dep] = result.data['bound_dependence']
    assert dep['path'] == RATED and dep['bound'] == 'upper' and dep['bound_value'] == 8.0
    # Relaxed by a fifth of the range (4.5 to 8): to 8.7.
    assert dep['relaxed_to'] == pytest.approx(8.7)
    assert dep['reference_relaxed'] is True
    assert dep['difference_at_value'] < -0.1 and dep['material'] is True
    expected = (
        f'the break-even depends on the bound of {RATED} (at its upper bound 8): with the '
        'bound relaxed to 8.7 the difference at this value is '
    )
    assert dep['message'].startswith(expected)
    assert expected in result.message
    summary = json.loads(json.dumps(result.summary))
    assert summary['bound_dependence'][0]['material'] is True
    text = sweep_text({'breakeven': result.summary})
    assert expected in text and f'{RATED} at its upper bound' in text
