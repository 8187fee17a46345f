"""The studies from Python: result objects, their units, and the files of ``voltwake sweep``."""

import csv
import json
import math
import re

import numpy as np
import pytest

import voltwake
from voltwake.cli import main
from voltwake.configuration.loader import load_config
from voltwake.errors import ConfigError
from voltwake.studies import runner

DEMO = 'demo_turbo_electric'
MOTOR = 'electrical.motor.specific_power'


def cli_sweep(out, *flags, code=0):
    """Run ``voltwake sweep FLAGS --out OUT`` in-process; check its exit code; return OUT."""
    assert main(['sweep', *flags, '--out', str(out)]) == code
    return out


def api_write(result, out):
    """Write a result as ``voltwake sweep --out`` would; return the directory."""
    report = result.write(out)
    assert report == str(out / 'report.html')
    return out


def files(folder):
    return sorted(p.name for p in folder.iterdir())


def header(text):
    return next(csv.reader(text.splitlines()))


@pytest.fixture(scope='module')
def maps(tmp_path_factory):
    """The same 2 x 2 map from the command line and from Python (strings and lists)."""
    base = tmp_path_factory.mktemp('maps')
    cli = cli_sweep(
        base / 'cli',
        '--map',
        'aft_fan.fan_pressure_ratio=1.2:1.4:2',
        '--map',
        f'{MOTOR}=5 kW/kg:10 kW/kg:2',
    )
    as_text = voltwake.design_map(
        DEMO, {'aft_fan.fan_pressure_ratio': '1.2:1.4:2', MOTOR: '5 kW/kg:10 kW/kg:2'}
    )
    as_values = voltwake.design_map(
        DEMO, {'aft_fan.fan_pressure_ratio': [1.2, 1.4], MOTOR: ['5 kW/kg', 10000.0]}
    )
    return cli, as_text, as_values, base


def test_the_four_studies_are_the_public_api():
    for name in ('design_map', 'target_sweep', 'breakeven', 'monte_carlo'):
        assert name in voltwake.__all__
        assert getattr(voltwake, name) is getattr(runner, name)
    for name in ('StudyResult', 'DesignMapResult', 'TargetSweepResult', 'BreakevenResult'):
        assert name in voltwake.__all__


def test_map_points_are_arrays_with_their_units(maps):
    _, _, result, _ = maps
    assert isinstance(result, voltwake.DesignMapResult)
    points, units = result.points, result.units
    assert set(points) == set(units) == set(result.rows[0])
    # Full factorial, the first axis slowest; the motor axis given with units and in SI.
    assert points['aft_fan.fan_pressure_ratio'].tolist() == [1.2, 1.2, 1.4, 1.4]
    assert points[MOTOR].tolist() == [5000.0, 10000.0, 5000.0, 10000.0]
    assert units[MOTOR] == 'W/kg' and units['aft_fan.fan_pressure_ratio'] == '-'
    assert units['block_fuel_kg'] == 'kg' and units['fuel_burn_change_percent'] == '%'
    assert units['closed'] is None and units['reason'] is None
    assert points['closed'].dtype == bool and points['closed'].all()
    assert points['block_fuel_kg'].dtype == float and points['block_fuel_kg'].shape == (4,)
    assert points['reason'].dtype == object
    for column, array in points.items():
        assert array.tolist() == [row[column] for row in result.rows], column
    # Change = 100 (F - F_ref) / F_ref against the reference as configured (hand value from
    # the equation in studies/maps.py).
    ref = result.reference['block_fuel_kg']
    change = 100.0 * (points['block_fuel_kg'] - ref) / ref
    assert points['fuel_burn_change_percent'] == pytest.approx(change, rel=1e-12)
    # A lighter motor gives a lighter aircraft at the same fan pressure ratio (mass =
    # power / specific power, common practice).
    assert np.all(points['mtow_kg'][1::2] < points['mtow_kg'][0::2])
    assert result.axes[MOTOR].tolist() == [5000.0, 10000.0]
    assert result.closure_rate == 1.0
    assert 'points=4' in repr(result)


def test_units_are_the_csv_header(maps):
    _, _, result, _ = maps
    columns = header(result.csv_text())
    assert columns == [f'{c} [{u}]' if u else c for c, u in result.csv_units.items()]
    # the arrays stay in SI, in result.units
    assert all(result.units[c] == 'W/kg' for c in result.units if c.endswith('specific_power'))


def test_map_csv_summary_and_files_are_those_of_the_command_line(maps):
    cli, as_text, as_values, base = maps
    text = (cli / 'map_points.csv').read_text()
    assert as_text.csv_text() == text and as_values.csv_text() == text
    csv_path = as_text.to_csv(base / 'api.csv')
    assert (base / 'api.csv').read_text() == text and csv_path == str(base / 'api.csv')
    out = api_write(as_text, base / 'api')
    assert files(out) == files(cli)
    written = json.loads((out / 'map_summary.json').read_text())
    assert written == json.loads((cli / 'map_summary.json').read_text())
    assert as_text.summary == written
    assert written['status'] == 'complete' and written['plots']


def test_write_needs_an_empty_directory_or_force(maps, tmp_path):
    _, result, _, _ = maps
    result.write(tmp_path / 'both')
    with pytest.raises(ConfigError, match='already holds results'):
        result.write(tmp_path / 'both')
    mc = voltwake.monte_carlo(DEMO, 10, seed=4)
    mc.write(tmp_path / 'both', force=True)
    names = files(tmp_path / 'both')
    assert 'map_summary.json' in names and 'montecarlo_summary.json' in names
    report = (tmp_path / 'both' / 'report.html').read_text()
    assert 'map fuel change' in report and 'montecarlo' in report


@pytest.fixture(scope='module')
def targets(tmp_path_factory):
    base = tmp_path_factory.mktemp('targets')
    cli = cli_sweep(base / 'cli', '--targets', 'aft_fan.thrust_fraction=0.2:0.3:2', '--jobs', '2')
    result = voltwake.target_sweep(DEMO, {'aft_fan.thrust_fraction': [0.2, 0.3]}, jobs=2)
    return cli, result, base


def test_target_sweep_arrays_units_and_files(targets):
    cli, result, base = targets
    assert isinstance(result, voltwake.TargetSweepResult)
    points, units = result.points, result.units
    assert points['target:aft_fan.thrust_fraction'].tolist() == [0.2, 0.3]
    assert points['success'].all()
    assert units['target:aft_fan.thrust_fraction'] == '-'
    assert units['dv:wing.loading'] == 'kg/m**2' and units['dv:electrical.cable.voltage'] == 'V'
    assert 'dv:aft_fan.thrust_fraction' not in points  # held, so not optimised
    ref = result.reference['outputs']['block_fuel_kg']
    change = 100.0 * (points['block_fuel_kg'] - ref) / ref
    assert points['fuel_burn_change_percent'] == pytest.approx(change, rel=1e-12)
    assert result.targets == ['aft_fan.thrust_fraction']
    assert result.csv_text() == (cli / 'targets_points.csv').read_text()
    assert files(api_write(result, base / 'api')) == files(cli)
    assert 'wing.loading [kg/m**2]' in ' '.join(header(result.csv_text()))


@pytest.fixture(scope='module')
def breakevens(tmp_path_factory):
    base = tmp_path_factory.mktemp('breakeven')
    # No break-even in the interval: exit code 7, the files written all the same.
    cli = cli_sweep(base / 'cli', '--breakeven', f'{MOTOR}=3 kW/kg:5 kW/kg', '--jobs', '2', code=7)
    result = voltwake.breakeven(DEMO, MOTOR, '3 kW/kg', 5000.0, jobs=2)
    return cli, result, base


def test_breakeven_result_and_files(breakevens):
    cli, result, base = breakevens
    assert isinstance(result, voltwake.BreakevenResult)
    # The demo has no break-even on this interval (see test_breakeven.py).
    assert result.found is False and math.isnan(result.value)
    assert result.value_units == 'W/kg' and 'no break-even' in result.message
    assert result.points[MOTOR].tolist() == [3000.0, 5000.0]
    assert result.units == {MOTOR: 'W/kg', 'fuel_burn_change_percent': '%', 'block_fuel_kg': 'kg'}
    assert result.summary['value'] is None  # NaN in JSON
    assert set(result.sensitivities) >= {MOTOR, 'electrical.motor.efficiency'}
    assert result.csv_text() == (cli / 'breakeven_points.csv').read_text()
    out = api_write(result, base / 'api')
    assert files(out) == files(cli)
    written = json.loads((out / 'breakeven_summary.json').read_text())
    assert written == json.loads((cli / 'breakeven_summary.json').read_text())


@pytest.fixture(scope='module')
def monte_carlos(tmp_path_factory):
    base = tmp_path_factory.mktemp('montecarlo')
    cli = cli_sweep(base / 'cli', '--monte-carlo', '30', '--seed', '3')
    return cli, voltwake.monte_carlo(DEMO, 30, seed=3), base


def test_monte_carlo_defaults_to_the_config_distributions(monte_carlos):
    cli, result, base = monte_carlos
    assert isinstance(result, voltwake.MonteCarloResult)
    configured = load_config(DEMO).data['study']['uncertainty']
    assert result.data['distributions'] == configured['distributions']
    assert set(configured['distributions']) <= set(result.points)
    assert result.points[MOTOR].shape == (30,) and result.units[MOTOR] == 'W/kg'
    # Uniform on 5-20 kW/kg in the demo's study section.
    assert configured['distributions'][MOTOR] == {'uniform': ['5 kW/kg', '20 kW/kg']}
    assert 5000.0 <= result.points[MOTOR].min() and result.points[MOTOR].max() <= 20000.0
    change = result.points['fuel_burn_change_percent'][result.points['closed']]
    assert result.probability_of_win == pytest.approx(np.mean(change < 0))
    assert result.fuel_burn_change_percent['mean'] == pytest.approx(change.mean())
    assert result.csv_text() == (cli / 'montecarlo_points.csv').read_text()
    assert files(api_write(result, base / 'api')) == files(cli)
    # The seed defaults to the config's (1): the same samples as seed=1.
    one = voltwake.monte_carlo(DEMO, 8)
    assert one.csv_text() == voltwake.monte_carlo(DEMO, 8, seed=1).csv_text()
    assert one.data['seed'] == configured['seed'] == 1


def test_monte_carlo_with_its_own_distributions():
    dists = {'electrical.motor.efficiency': {'triangular': [0.95, 0.96, 0.99]}}
    result = voltwake.monte_carlo(DEMO, 12, seed=5, distributions=dists)
    assert MOTOR not in result.points  # only the given inputs are sampled
    efficiency = result.points['electrical.motor.efficiency']
    assert efficiency.shape == (12,) and result.units['electrical.motor.efficiency'] == '-'
    assert np.all((efficiency >= 0.95) & (efficiency <= 0.99))


def test_inputs_with_units_and_bare_numbers_are_read_as_in_a_config():
    result = voltwake.design_map(DEMO, {'reserves.hold_time': ['30 min', 2700.0]})
    assert result.points['reserves.hold_time'].tolist() == [1800.0, 2700.0]
    assert result.units['reserves.hold_time'] == 's'
    # A bare number outside the key's plausible range is refused, as in a config file.
    with pytest.raises(ConfigError, match='did you forget the unit'):
        voltwake.design_map(DEMO, {'reserves.hold_time': [30, 45]})
    with pytest.raises(ConfigError, match='did you forget the unit'):
        voltwake.breakeven(DEMO, MOTOR, 3, 5)


@pytest.mark.parametrize(
    'call, message',
    [
        (
            lambda: voltwake.design_map(DEMO, {'aft_fan.thrust_fracton': [0.1]}),
            "did you mean 'aft_fan.thrust_fraction'",
        ),
        (lambda: voltwake.design_map(DEMO, {'wing.span': [30.0]}), 'not a model input'),
        (lambda: voltwake.design_map(DEMO, {}), 'expected a mapping'),
        (
            lambda: voltwake.design_map(DEMO, {'aft_fan.thrust_fraction': 0.1}),
            "expected a non-empty sequence of values or 'LO:HI:N'",
        ),
        (
            lambda: voltwake.design_map(DEMO, {'aft_fan.thrust_fraction': '0.1:0.2'}),
            'expected PATH=LO:HI:N',
        ),
        (
            lambda: voltwake.design_map(DEMO, {'aft_fan.thrust_fraction': [0.1, None]}),
            'expected a number',
        ),
        (
            # An output's axis may be written 'LO:HI:N' too; its ends must be numbers.
            lambda: voltwake.target_sweep(DEMO, {'power_saving_coefficient': 'a:b:3'}),
            "got 'a'; expected a number",
        ),
        (lambda: voltwake.monte_carlo(DEMO, 0), 'expected a whole number >= 1'),
        (lambda: voltwake.monte_carlo(DEMO, 10, seed=1.5), 'expected a whole number >= 0'),
        (lambda: voltwake.breakeven(DEMO, 'mission.range', 1e6, 2e6), 'aft_fan or electrical'),
    ],
)
def test_bad_study_inputs_are_refused_saying_what_was_expected(call, message):
    with pytest.raises(ConfigError, match=re.escape(message)):
        call()


def test_monte_carlo_without_distributions_says_where_they_go():
    data = load_config(DEMO).data
    del data['study']
    with pytest.raises(ConfigError, match='study.uncertainty.distributions') as err:
        voltwake.monte_carlo(data, 10)
    assert err.value.path == 'study.uncertainty'


def test_axes_come_back_in_the_units_they_were_written_in(tmp_path):
    # the CSV and the figures show an axis in the unit the user wrote it in (the arrays of
    # the result object stay in SI, with their SI units)
    from voltwake.studies import figures

    result = voltwake.design_map(
        'demo_turbo_electric',
        {
            'mission.cruise_altitude': '30000 ft:40000 ft:3',
            'electrical.motor.specific_power': '5 kW/kg:20 kW/kg:2',
        },
    )
    path = tmp_path / 'map.csv'
    result.to_csv(path)
    header, first = path.read_text().splitlines()[:2]
    assert header.startswith(
        'mission.cruise_altitude [ft],electrical.motor.specific_power [kW/kg],'
    )
    assert first.startswith('30000.0,5.0,')
    assert result.units['mission.cruise_altitude'] == 'm'
    assert result.points['mission.cruise_altitude'][0] == pytest.approx(9144.0)
    token = figures._WRITTEN.set({'mission.cruise_altitude': 'ft'})
    try:
        label, values = figures._axis('mission.cruise_altitude', [9144.0])
    finally:
        figures._WRITTEN.reset(token)
    assert label.endswith('[ft]') and values[0] == pytest.approx(30000.0)
    report = result.write(tmp_path / 'out')
    assert '30,000–40,000 ft (3 values)' in open(report, encoding='utf-8').read()


def test_monte_carlo_csv_gives_the_sampled_inputs_in_their_written_units():
    # the demo's distributions are written in kW/kg: the CSV columns are in kW/kg, the
    # arrays in W/kg (SI)
    result = voltwake.monte_carlo('demo_turbo_electric', samples=20, seed=1)
    header = result.csv_text().splitlines()[0].split(',')
    assert f'{MOTOR} [kW/kg]' in header
    assert result.units[MOTOR] == 'W/kg'
    column = header.index(f'{MOTOR} [kW/kg]')
    first = float(result.csv_text().splitlines()[1].split(',')[column])
    assert first == pytest.approx(result.points[MOTOR][0] / 1000.0, rel=1e-11)
    assert 5.0 <= first <= 20.0
