"""Vectorised design-space maps and Monte Carlo studies, and the sweep command."""

import csv
import json

import numpy as np
import pytest

import voltwake
from voltwake.cli import main
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.batch import analyze_points, full_factorial
from voltwake.errors import ConfigError
from voltwake.studies.maps import design_space_map, monte_carlo, parse_axis, points_csv

TURBO_ELECTRIC = demo_path('turbo_electric')


def test_vectorised_map_matches_points_analysed_one_at_a_time():
    axes = {'aft_fan.fan_pressure_ratio': [1.2, 1.35, 1.5], 'aft_fan.thrust_fraction': [0.1, 0.3]}
    batch = analyze_points(TURBO_ELECTRIC, full_factorial(axes))
    assert batch.closed.all()
    for i, (fpr, frac) in enumerate(zip(*full_factorial(axes).values())):
        single = voltwake.analyze(
            TURBO_ELECTRIC, {'aft_fan.fan_pressure_ratio': fpr, 'aft_fan.thrust_fraction': frac}
        )
        for key in ('block_fuel_kg', 'mtow_kg', 'power_saving_coefficient'):
            assert batch.values[key][i] == pytest.approx(single.values[key], rel=1e-8)


def test_points_that_do_not_close_are_marked_not_dropped():
    # At a fan pressure ratio of 1.01 the under-wing fans give almost no thrust: those points
    # cannot close; the others must still close and match their single analyses.
    columns = {'turbofans.fan_pressure_ratio': [1.01, 1.45, 1.01, 1.6]}
    batch = analyze_points(TURBO_ELECTRIC, columns)
    assert batch.closed.tolist() == [False, True, False, True]
    assert 'did not close' in batch.reasons[0] and batch.reasons[1] is None
    assert np.isnan(batch.values['block_fuel_kg'][[0, 2]]).all()
    single = voltwake.analyze(TURBO_ELECTRIC, {'turbofans.fan_pressure_ratio': 1.6})
    assert batch.values['block_fuel_kg'][3] == pytest.approx(single.block_fuel_kg, rel=1e-8)


def test_far_points_close_and_impossible_ones_are_reported():
    # 4,500 km with 16 t of payload is far from the configured design but closes (MTOW near
    # 111 t); 20,000 km with 16 t has no solution: the weight runs away (the single analysis
    # does not close either).
    columns = {
        'mission.range': [2.0e6, 4.5e6, 20.0e6],
        'mission.payload': [10000.0, 16000.0, 16000.0],
    }
    batch = analyze_points(TURBO_ELECTRIC, columns)
    assert batch.closed.tolist() == [True, True, False]
    assert 'weight grows without bound' in batch.reasons[2]
    single = voltwake.analyze(TURBO_ELECTRIC, {'mission.range': 4.5e6, 'mission.payload': 16000.0})
    assert batch.values['mtow_kg'][1] == pytest.approx(single.mtow_kg, rel=1e-8)
    with pytest.raises(voltwake.NotClosedError, match='weight grows without bound'):
        voltwake.analyze(TURBO_ELECTRIC, {'mission.range': 20.0e6, 'mission.payload': 16000.0})


def test_a_single_analysis_far_from_the_start_closes_by_continuation():
    # 10,000 km with 16 t, airframe mass from the regression: Newton's method from the
    # default start diverges on its first step, yet the design has a solution (MTOW near
    # 410 t). The single analysis walks to it from the same aircraft on a tenth of the range,
    # and agrees with the batch analysis. (The build-up closes this case directly.)
    regression = load_config(
        TURBO_ELECTRIC,
        {
            'structure.method': 'regression',
            'structure.airframe_mass_coefficient': 1.1,
            'structure.airframe_mass_exponent': 0.94,
        },
    )
    overrides = {'mission.range': 10.0e6, 'mission.payload': 16000.0}
    single = voltwake.analyze(regression, overrides)
    assert single.continuation and single.to_dict()['closed_by_continuation']
    batch = analyze_points(regression, {path: [v] for path, v in overrides.items()})
    assert batch.closed[0] and batch.recovered == 1
    assert single.mtow_kg == pytest.approx(batch.values['mtow_kg'][0], rel=1e-8)
    assert single.mtow_kg > 3.5e5
    # A design that closes from the default start does not need the walk.
    assert not voltwake.analyze(TURBO_ELECTRIC).continuation


def test_map_rows_and_csv_units():
    result = design_space_map(TURBO_ELECTRIC, {'aft_fan.thrust_fraction': [0.1, 0.2]})
    points = result['points']  # column -> array
    ref = result['reference']['block_fuel_kg']
    assert result['reference_follows'] == []  # a technology input: one fixed reference
    assert points['fuel_burn_change_percent'] == pytest.approx(
        100 * (points['block_fuel_kg'] - ref) / ref, rel=1e-12
    )
    text = points_csv(points)
    header = next(csv.reader(text.splitlines()))
    assert 'block_fuel_kg [kg]' in header and 'fuel_burn_change_percent [%]' in header
    assert 'aft_fan.thrust_fraction [-]' in header


def test_monte_carlo_is_reproducible_and_consistent():
    dists = {
        'electrical.motor.specific_power': {'uniform': ['5 kW/kg', '20 kW/kg']},
        'electrical.motor.efficiency': {'triangular': [0.95, 0.96, 0.99]},
    }
    one = monte_carlo(TURBO_ELECTRIC, dists, samples=40, seed=7)
    two = monte_carlo(TURBO_ELECTRIC, dists, samples=40, seed=7)
    assert list(one['points']) == list(two['points'])
    for column, values in one['points'].items():
        assert values.tolist() == two['points'][column].tolist(), column
    change = one['points']['fuel_burn_change_percent']
    assert one['probability_of_win'] == pytest.approx(np.mean(change < 0))
    assert one['fuel_burn_change_percent']['mean'] == pytest.approx(change.mean())
    speeds = one['points']['electrical.motor.specific_power']
    assert 5e3 <= speeds.min() and speeds.max() <= 20e3
    # More specific power -> less fuel, sample by sample at equal motor efficiency (trend).
    order = np.argsort(speeds)
    assert np.corrcoef(speeds[order], change[order])[0, 1] < 0


def test_batch_values_are_checked_like_config_values():
    with pytest.raises(voltwake.ConfigError, match='expected a value > 1'):
        analyze_points(TURBO_ELECTRIC, {'turbofans.fan_pressure_ratio': [1.4, 0.9]})


def test_axis_parsing():
    assert parse_axis('electrical.motor.specific_power=5 kW/kg:20 kW/kg:4') == (
        'electrical.motor.specific_power',
        5000.0,
        20000.0,
        4,
    )
    with pytest.raises(voltwake.ConfigError, match='expected PATH=LO:HI:N'):
        parse_axis('aft_fan.thrust_fraction=0.1:0.2')
    with pytest.raises(voltwake.ConfigError, match='not a model input'):
        parse_axis('wing.span=1:2:3')


def test_sweep_command_writes_csv_plots_and_report(tmp_path, capsys):
    out = tmp_path / 'study'
    code = main(
        [
            'sweep',
            '--map',
            'aft_fan.fan_pressure_ratio=1.2:1.5:4',
            '--map',
            'aft_fan.thrust_fraction=0.1:0.3:3',
            '--out',
            str(out),
        ]
    )
    assert code == 0
    assert 'closed' in capsys.readouterr().out
    rows = list(csv.DictReader((out / 'map_points.csv').read_text().splitlines()))
    assert len(rows) == 12
    summary = json.loads((out / 'map_summary.json').read_text())
    assert summary['status'] == 'complete' and summary['closure_rate'] == 1.0
    report = (out / 'report.html').read_text()
    assert 'not for certification' in report
    for png in summary['plots']:
        assert (out / png).stat().st_size > 1000
        assert png.replace('_', ' ').replace('.png', '') in report


def test_sweep_without_a_study_is_a_clear_error(capsys):
    code = main(['sweep', demo_path('conventional')])
    assert code == 2
    assert 'nothing to sweep' in capsys.readouterr().err


def test_sweep_from_the_config_study_section(tmp_path):
    data = load_config(TURBO_ELECTRIC).data
    data['study'] = {'map': {'aft_fan.thrust_fraction': {'lower': 0.1, 'upper': 0.2, 'count': 3}}}
    from voltwake.studies.runner import run_sweep, study_spec

    config = load_config(data)
    result = run_sweep(config, study_spec(config))
    assert result['map']['closure_rate'] == 1.0 and result['map']['points_count'] == 3


def test_ctrl_c_during_a_sweep_exits_130_with_a_partial_summary(tmp_path):
    import os
    import subprocess
    import sys

    out = tmp_path / 'sweep'
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    # The packaged demo's study: a 100 x 100 map, then a Monte Carlo study. A test double
    # around the map sends SIGINT to its own process as the map starts, so the interrupt
    # lands during the map at a known point, however fast or slow the machine.
    interrupted = (
        'import signal, sys\n'
        'import voltwake.studies.runner as sweep\n'
        'run_map = sweep.design_space_map\n'
        'def interrupted(*args, **kwargs):\n'
        '    signal.raise_signal(signal.SIGINT)\n'
        '    return run_map(*args, **kwargs)\n'
        'sweep.design_space_map = interrupted\n'
        'from voltwake.cli import main\n'
        'sys.exit(main(sys.argv[1:]))\n'
    )
    proc = subprocess.run(
        [sys.executable, '-c', interrupted, 'sweep', '--out', str(out)],
        capture_output=True,
        text=True,
        env=env,
        timeout=300,
    )
    err = proc.stderr
    assert proc.returncode == 130, err
    assert len(err.strip().splitlines()) == 1 and 'interrupted' in err
    summaries = sorted(out.glob('*_summary.json'))
    partial = [json.loads(p.read_text()) for p in summaries]
    assert any(s['status'] == 'partial' for s in partial)


def test_cli_sweep_under_mpiexec_matches_the_serial_run(tmp_path):
    import os
    import shutil
    import subprocess
    import sys

    pytest.importorskip('mpi4py')
    local = os.path.join(os.path.dirname(sys.executable), 'mpiexec')
    mpiexec = local if os.access(local, os.X_OK) else shutil.which('mpiexec')
    if mpiexec is None:
        pytest.skip('no mpiexec')
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    args = ['-m', 'voltwake.cli', 'sweep', '--targets', 'aft_fan.thrust_fraction=0.1:0.15:2']
    serial = subprocess.run(
        [sys.executable, *args, '--jobs', '1', '--out', str(tmp_path / 'serial')],
        capture_output=True,
        text=True,
        env=env,
        timeout=600,
    )
    assert serial.returncode == 0, serial.stderr
    ranked = subprocess.run(
        [mpiexec, '-n', '2', sys.executable, *args, '--out', str(tmp_path / 'mpi')],
        capture_output=True,
        text=True,
        env=env,
        timeout=600,
    )
    assert ranked.returncode == 0, ranked.stderr
    assert (tmp_path / 'mpi' / 'targets_points.csv').read_text() == (
        tmp_path / 'serial' / 'targets_points.csv'
    ).read_text()


def test_breakeven_and_monte_carlo_studies_write_csv_plots_and_report(tmp_path):
    out = tmp_path / 'studies'
    code = main(
        [
            'sweep',
            '--breakeven',
            'electrical.motor.specific_power=3 kW/kg:5 kW/kg',
            '--monte-carlo',
            '30',
            '--seed',
            '3',
            '--jobs',
            '1',
            '--out',
            str(out),
        ]
    )
    assert code == 7  # no break-even in the interval; both studies are written all the same
    report = (out / 'report.html').read_text()
    for name in ('breakeven', 'montecarlo'):
        rows = list(csv.DictReader((out / f'{name}_points.csv').read_text().splitlines()))
        assert rows
        summary = json.loads((out / f'{name}_summary.json').read_text())
        assert summary['plots']
        for png in summary['plots']:
            assert (out / png).stat().st_size > 1000
            assert png.replace('_', ' ').replace('.png', '') in report
    breakeven = json.loads((out / 'breakeven_summary.json').read_text())
    # The demo has no break-even on this interval (see test_breakeven.py): it is reported.
    assert not breakeven['found'] and 'no break-even' in breakeven['message']
    assert len(rows) == 30  # the Monte Carlo samples


def test_inputs_this_design_does_not_have_are_refused_saying_why():
    with pytest.raises(ConfigError, match='gives wing.loading instead'):
        analyze_points(TURBO_ELECTRIC, {'wing.area': [100.0, 120.0]})
    with pytest.raises(ConfigError, match='this design has no aft fan'):
        analyze_points(demo_path('conventional'), {'aft_fan.thrust_fraction': [0.1]})
    with pytest.raises(ConfigError, match="expected a config key path such as"):
        analyze_points(TURBO_ELECTRIC, {'wing.span': [30.0]})


# --- the study section is checked like the rest of the config ------------------------------

_STUDY_ERRORS = [
    (
        'mapp:\n  aft_fan.thrust_fraction: {lower: 0.1, upper: 0.2, count: 3}\n',
        1,
        "study.mapp: unknown study kind (did you mean 'map'?); expected one of map, targets",
    ),
    (
        'map:\n  aft_fan.thrust_fractoin: {lower: 0.1, upper: 0.2, count: 3}\n',
        2,
        "study.map.aft_fan.thrust_fractoin: not a model input (did you mean "
        "'aft_fan.thrust_fraction'?)",
    ),
    (
        'map:\n  aft_fan.thrust_fraction: {lower: 0.1, upper: 0.2, cout: 3}\n',
        2,
        "study.map.aft_fan.thrust_fraction.cout: unknown key (did you mean 'count'?)",
    ),
    (
        'map:\n  aft_fan.thrust_fraction:\n    lower: 0.1\n    upper: 1.5\n    count: 3\n',
        4,
        'study.map.aft_fan.thrust_fraction.upper: got 1.5; expected a value in [0, 1)',
    ),
    (
        'map:\n  aft_fan.thrust_fraction: {lower: 0.1, upper: 0.2, count: 2.5}\n',
        2,
        'study.map.aft_fan.thrust_fraction.count: got 2.5; expected a whole number >= 1',
    ),
    (
        'map:\n  wing.area: {lower: 80 m**2, upper: 90 m**2, count: 2}\n',
        2,
        'study.map.wing.area: not a model input of this design; this design gives wing.loading',
    ),
    (
        'targets:\n  mission.range: {lower: 1000, upper: 2000, count: 3}\n',
        2,
        'study.targets.mission.range.lower: got 1000 with no unit (read as 1000 m); expected a '
        "value with its unit, e.g. '1000 nmi'",
    ),
    (
        'targets:\n  mission.range:\n    values: [1000 nmi, 1500 km, 1800]\n',
        3,
        'study.targets.mission.range.values.2: got 1800 with no unit',
    ),
    (
        'breakeven:\n  electrical.motor.specfic_power: {lower: 2 kW/kg, upper: 20 kW/kg}\n',
        2,
        "study.breakeven.electrical.motor.specfic_power: not a model input (did you mean "
        "'electrical.motor.specific_power'?)",
    ),
    (
        'breakeven:\n  electrical.motor.specific_power: {lower: 2 kW/kg, upper: 20 kg}\n',
        2,
        "study.breakeven.electrical.motor.specific_power.upper: got '20 kg': unit 'kg' cannot "
        'be converted to W/kg',
    ),
    (
        'uncertainty:\n  sample: 10\n  distributions:\n'
        '    electrical.motor.efficiency: {triangular: [0.95, 0.96, 0.99]}\n',
        2,
        "study.uncertainty.sample: unknown key (did you mean 'samples'?)",
    ),
    (
        'uncertainty:\n  distributions:\n'
        '    electrical.motor.efficency: {triangular: [0.95, 0.96, 0.99]}\n',
        3,
        "study.uncertainty.distributions.electrical.motor.efficency: not a model input (did "
        "you mean 'electrical.motor.efficiency'?)",
    ),
    (
        'uncertainty:\n  distributions:\n'
        '    electrical.motor.efficiency: {triangle: [0.95, 0.96, 0.99]}\n',
        3,
        'study.uncertainty.distributions.electrical.motor.efficiency.triangle: unknown '
        "distribution (did you mean 'triangular'?)",
    ),
    (
        'uncertainty:\n  distributions:\n    electrical.motor.specific_power:\n'
        '      uniform:\n        - 5 kW/kg\n        - 20\n',
        6,
        'study.uncertainty.distributions.electrical.motor.specific_power.uniform.1: got 20 '
        'with no unit (read as 20 W/kg)',
    ),
    (
        'uncertainty:\n  seed: -3\n  distributions:\n'
        '    electrical.motor.efficiency: {triangular: [0.95, 0.96, 0.99]}\n',
        2,
        'study.uncertainty.seed: got -3; expected a whole number >= 0',
    ),
]


def config_with_study(tmp_path, study):
    """The turbo-electric demo with its study section replaced; return (path, study line)."""
    text = open(TURBO_ELECTRIC, encoding='utf-8').read()
    text = text[: text.index('\nstudy:\n') + 1]
    first = len(text.splitlines()) + 1  # the line of 'study:'
    indented = ''.join(f'  {line}\n' for line in study.splitlines())
    path = tmp_path / 'study.yaml'
    path.write_text(f'{text}study:\n{indented}', encoding='utf-8')
    return str(path), first


@pytest.mark.parametrize('study, offset, expected', _STUDY_ERRORS)
def test_study_section_errors_name_file_line_and_key(tmp_path, study, offset, expected):
    from voltwake.studies.runner import study_spec

    path, first = config_with_study(tmp_path, study)
    with pytest.raises(ConfigError) as err:
        study_spec(load_config(path))
    # The line of the key as written (the section's own line plus its offset in it).
    assert err.value.message.startswith(f'{path}:{first + offset}: {expected}'), err.value.message


def test_sweep_with_a_bad_study_section_exits_2_with_one_line(tmp_path, capsys):
    path, first = config_with_study(tmp_path, _STUDY_ERRORS[1][0])
    assert main(['sweep', path]) == 2
    captured = capsys.readouterr()
    lines = captured.err.splitlines()
    assert len(lines) == 1 and captured.out == ''
    assert lines[0].startswith(f'voltwake: error: {path}:{first + 2}: study.map.aft_fan.thrust')
    # --monte-carlo reads the distributions of the study section: the same checks apply.
    path, first = config_with_study(tmp_path, _STUDY_ERRORS[-2][0])
    assert main(['sweep', path, '--monte-carlo', '5']) == 2
    assert f'{path}:{first + 6}: study.uncertainty' in capsys.readouterr().err


def test_study_section_values_with_units_come_back_in_si(tmp_path):
    from voltwake.studies.runner import study_spec

    study = (
        'map:\n  mission.cruise_altitude: {lower: 33000 ft, upper: 37000 ft, count: 3}\n'
        'breakeven:\n  electrical.motor.specific_power: {lower: 2 kW/kg, upper: 20 kW/kg}\n'
        'uncertainty:\n  samples: 7\n  distributions:\n'
        '    electrical.motor.specific_power: {uniform: [5 kW/kg, 20 kW/kg]}\n'
    )
    spec = study_spec(load_config(config_with_study(tmp_path, study)[0]))
    # 1 ft = 0.3048 m exactly (international foot): hand values.
    assert spec['map']['mission.cruise_altitude'] == pytest.approx(
        [33000 * 0.3048, 35000 * 0.3048, 37000 * 0.3048], rel=1e-12
    )
    assert spec['breakeven'] == ('electrical.motor.specific_power', 2000.0, 20000.0)
    assert spec['uncertainty']['samples'] == 7 and spec['uncertainty']['seed'] == 1


def test_grid_values_are_the_exact_decimal_grid(tmp_path):
    from voltwake.design.batch import decimal_grid

    assert decimal_grid(0.1, 0.4, 4) == [0.1, 0.2, 0.3, 0.4]
    assert decimal_grid(1.15, 1.6, 10)[3] == 1.3
    assert decimal_grid(2.0, 2.0, 1) == [2.0]
    from voltwake.studies.runner import study_spec

    spec = study_spec(load_config(TURBO_ELECTRIC), maps=['aft_fan.thrust_fraction=0.1:0.4:4'])
    assert spec['map']['aft_fan.thrust_fraction'] == [0.1, 0.2, 0.3, 0.4]
    result = voltwake.design_map(TURBO_ELECTRIC, {'aft_fan.thrust_fraction': '0.1:0.4:4'})
    path = tmp_path / 'map.csv'
    result.to_csv(path)
    text = path.read_text()
    assert '0.30000000000000004' not in text and '\n0.3,' in text
