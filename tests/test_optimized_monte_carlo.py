"""Monte Carlo with both aircraft re-optimised at every sample (sweep --monte-carlo --optimize)."""

import csv
import json
import math
import os
import subprocess
import sys

import pytest
import yaml

import voltwake
import voltwake.studies.optimized_monte_carlo as omc
from voltwake.cli import main
from voltwake.configuration.loader import demo_path, load_config

DEMO = demo_path('turbo_electric')

#: Technology inputs only: none of them acts on the conventional reference.
TECHNOLOGY = {
    'electrical.motor.specific_power': {'uniform': ['5 kW/kg', '20 kW/kg']},
    'electrical.motor.efficiency': {'triangular': [0.95, 0.96, 0.99]},
}


def _spy_jobs(monkeypatch):
    """Record every job that the study hands to map_jobs."""
    seen = []
    real = omc.map_jobs

    def spy(func, items, **kwargs):
        items = list(items)
        seen.extend(items)
        return real(func, items, **kwargs)

    monkeypatch.setattr(omc, 'map_jobs', spy)
    return seen


@pytest.fixture(scope='module')
def serial():
    """Four samples of technology inputs, optimised in this process (jobs=1)."""
    mp = pytest.MonkeyPatch()
    try:
        seen = _spy_jobs(mp)
        result = voltwake.monte_carlo(
            DEMO, samples=4, seed=2, distributions=TECHNOLOGY, optimize=True, jobs=1
        )
    finally:
        mp.undo()
    return result, seen


def test_wilson_interval_against_a_hand_value():
    # 7 wins of 10, z = 1.959964 (the 0.975 quantile of the standard normal), z² = 3.841459:
    # centre = (0.7 + z²/20) / (1 + z²/10) = 0.892073 / 1.384146 = 0.644493,
    # half = z sqrt(0.7 * 0.3 / 10 + z²/400) / 1.384146 = 1.959964 * 0.174939 / 1.384146
    #      = 0.342874 / 1.384146 = 0.247715, so the interval is 0.396778 to 0.892208.
    lower, upper = omc.wilson_interval(7, 10)
    assert lower == pytest.approx(0.396778, abs=2e-6)
    assert upper == pytest.approx(0.892208, abs=2e-6)
    # No win of 6: the lower end is 0 and the upper one z² / (n + z²) = 3.841459 / 9.841459.
    lower, upper = omc.wilson_interval(0, 6)
    assert lower == 0.0
    assert upper == pytest.approx(3.841459 / 9.841459, rel=1e-6)
    assert all(math.isnan(v) for v in omc.wilson_interval(0, 0))


def test_the_reference_is_optimised_once_when_only_technology_inputs_are_sampled(serial):
    result, seen = serial
    roles = [(job['role'], job['sample']) for job in seen]
    assert roles.count(('reference', None)) == 1  # the nominal reference, and no other
    assert [r for r, _ in roles].count('reference') == 1
    assert sorted(s for r, s in roles if r == 'design' and s is not None) == [0, 1, 2, 3]
    assert result.data['reference']['optimised'] == 'once'
    assert 'no sampled input acts on the conventional reference' in result.data['reference']['why']
    ref = result.points['reference_block_fuel_kg']
    assert (ref == result.data['reference']['fuel_kg']).all()


def test_every_sample_has_an_optimum_and_the_summary_its_statistics(serial):
    result, _ = serial
    data = result.data
    assert data['kind'] == 'montecarlo_optimized' and data['status'] == 'complete'
    assert list(result.points['status']) == ['optimum'] * 4
    change = result.points['fuel_burn_change_percent']
    fuel, ref = (
        result.points['turbo_electric_block_fuel_kg'],
        result.points['reference_block_fuel_kg'],
    )
    assert change == pytest.approx(100 * (fuel - ref) / ref, rel=1e-12)
    assert data['wins'] == int((change < 0).sum()) and data['successful_samples'] == 4
    assert data['probability_of_win'] == data['wins'] / 4
    ci = data['probability_of_win_interval']
    assert ci['method'] == 'Wilson score interval' and ci['confidence'] == 0.95
    assert (ci['lower'], ci['upper']) == omc.wilson_interval(data['wins'], 4)
    assert data['fuel_burn_change_percent']['p05'] <= data['fuel_burn_change_percent']['p95']
    dv = data['design_variables']['aft_fan.thrust_fraction']
    assert dv['lower'] == 0.05 and dv['upper'] == 0.45
    assert dv['p05'] <= dv['p50'] <= dv['p95']
    assert 0 <= dv['at_lower'] + dv['at_upper'] <= 4
    text = result.text()
    assert 'both aircraft re-optimised at every sample' in text
    assert 'Wilson score interval' in text and 'of 4 successful samples' in text


def test_samples_are_warm_started_from_the_nominal_optimum(serial):
    result, seen = serial
    nominal = result.data['nominal']['design']
    sample = next(job for job in seen if job['sample'] == 0 and job['role'] == 'design')
    start = load_config(sample['data'])
    for path, value in nominal.items():
        assert start.values[path] == pytest.approx(value, rel=1e-12)


def test_the_same_rows_with_two_processes(serial):
    result, _ = serial
    parallel = voltwake.monte_carlo(
        DEMO, samples=4, seed=2, distributions=TECHNOLOGY, optimize=True, jobs=2
    )
    assert parallel.csv_text() == result.csv_text()


def test_a_sample_at_the_nominal_inputs_reproduces_the_nominal_optimum():
    # The demo's configured motor: 9 kW/kg, efficiency 0.96. `voltwake compare --optimize`
    # gives +4.14 % for the optimised pair at these inputs.
    near = {'electrical.motor.specific_power': {'uniform': ['8.9999 kW/kg', '9.0001 kW/kg']}}
    result = voltwake.monte_carlo(DEMO, samples=1, seed=1, distributions=near, optimize=True)
    nominal = result.data['nominal']['fuel_burn_change_percent']
    assert nominal == pytest.approx(4.14, abs=0.01)
    assert result.points['fuel_burn_change_percent'][0] == pytest.approx(nominal, abs=1e-3)


def test_a_lighter_motor_lowers_the_fuel_of_the_turbo_electric_optimum():
    config = load_config(DEMO)
    fuels = []
    for power in ('6 kW/kg', '10 kW/kg', '16 kW/kg'):
        job = omc._job(config, 'design', 0, {'electrical.motor.specific_power': power}, {})
        out = omc.optimize_design_job(job)
        assert out['status'] == omc.OPTIMUM, out['message']
        fuels.append(out['fuel']['block_fuel_kg'])
    assert fuels[0] > fuels[1] > fuels[2]


def test_a_shared_input_optimises_the_reference_per_sample(monkeypatch):
    seen = _spy_jobs(monkeypatch)
    dists = {'mission.payload': {'uniform': ['11000 kg', '13000 kg']}}
    result = voltwake.monte_carlo(DEMO, samples=2, seed=1, distributions=dists, optimize=True)
    refs = [job['sample'] for job in seen if job['role'] == 'reference']
    assert refs == [None, 0, 1]
    assert result.data['reference']['optimised'] == 'per sample'
    assert result.data['reference']['shared_inputs'] == ['mission.payload']
    payload, ref = result.points['mission.payload'], result.points['reference_block_fuel_kg']
    assert list(result.points['status']) == ['optimum', 'optimum']
    # More payload, more fuel for the reference optimised to carry it.
    assert (ref[0] - ref[1]) * (payload[0] - payload[1]) > 0


def _fake_optimiser(job):
    """A stand-in optimiser: fuel falls with motor specific power; samples 1 and 3 fail."""
    sample, role = job['sample'], job['role']
    if role == 'reference':
        fuel = 1000.0
    else:
        power = load_config(job['data']).values['electrical.motor.specific_power']
        fuel = 1100.0 - power / 100.0  # below 1000 kg (a win) from 10 kW/kg
    base = {'sample': sample, 'role': role, 'design': {}, 'evaluations': 3, 'fuel': {}}
    if sample == 1 and role == 'design':
        return {**base, 'status': 'infeasible', 'success': False, 'message': 'worst 0.2'}
    if sample == 3 and role == 'design':
        return {**base, 'status': 'failed', 'success': False, 'message': 'Iteration limit'}
    design = {'aft_fan.thrust_fraction': 0.2, 'wing.loading': 600.0}
    return {
        **base,
        'status': 'optimum',
        'success': True,
        'message': 'ok',
        'fuel': {'block_fuel_kg': fuel},
        'design': design,
    }


def test_failed_samples_are_counted_listed_and_left_out_of_the_probability(monkeypatch):
    monkeypatch.setattr(omc, 'optimize_design_job', _fake_optimiser)
    dists = {'electrical.motor.specific_power': {'uniform': ['5 kW/kg', '20 kW/kg']}}
    result = omc.optimized_monte_carlo(DEMO, dists, samples=6, seed=3, jobs=1)
    data, points = result.data, result.points
    assert list(points['status']) == [
        'optimum',
        'infeasible',
        'optimum',
        'failed',
        'optimum',
        'optimum',
    ]
    assert points['message'][3] == 'Iteration limit'
    assert math.isnan(points['fuel_burn_change_percent'][1])
    assert data['status_counts'] == {'optimum': 4, 'infeasible': 1, 'failed': 1}
    assert [(b['sample'], b['status']) for b in data['unsuccessful_samples']] == [
        (1, 'infeasible'),
        (3, 'failed'),
    ]
    power = points['electrical.motor.specific_power']
    ok = points['status'] == 'optimum'
    wins = int((power[ok] > 10000.0).sum())
    assert data['wins'] == wins and data['successful_samples'] == 4
    assert data['probability_of_win'] == wins / 4
    text = result.text()
    assert f'({wins} of 4 successful samples' in text
    assert '2 of 6 samples without an optimum (1 infeasible, 1 failed)' in text
    assert 'sample 3: failed: Iteration limit' in text


def test_optimisation_outcomes_get_their_status():
    reference = load_config(DEMO).without_aft_fan()
    # No conventional design of the demo spans 10 m: the optimiser ends infeasible.
    tight = reference.with_overrides(
        {
            'optimization.constraints.wingspan': {'upper': '10 m'},
            'optimization.optimizer.max_iterations': 3,
        }
    )
    out = omc.optimize_design_job({'data': tight.data, 'sample': 0, 'role': 'reference'})
    assert out['status'] == omc.INFEASIBLE
    assert out['message'].startswith('no feasible design: wingspan binds by')
    broken = dict(reference.data, wing={'loading': 'heavy'})
    out = omc.optimize_design_job({'data': broken, 'sample': 1, 'role': 'reference'})
    assert out['status'] == omc.FAILED and out['message'].startswith('ConfigError')


def test_cli_writes_its_own_files_and_labels_the_analysis_only_study(tmp_path, capsys):
    out = tmp_path / 'mc'
    code = main(
        ['sweep', DEMO, '--monte-carlo', '2', '--optimize', '--jobs', '1', '--out', str(out)]
    )
    assert code == 0
    text = capsys.readouterr().out
    assert 'Monte Carlo, both aircraft re-optimised at every sample, 2 samples' in text
    summary = json.loads((out / 'montecarlo_optimized_summary.json').read_text())
    assert summary['status'] == 'complete' and summary['kind'] == 'montecarlo_optimized'
    assert not (out / 'montecarlo_summary.json').exists()
    with open(out / 'montecarlo_optimized_points.csv', newline='') as handle:
        rows = list(csv.DictReader(handle))
    assert len(rows) == 2
    assert 'electrical.motor.specific_power [kW/kg]' in rows[0]
    assert 'dv:aft_fan.thrust_fraction [-]' in rows[0] and rows[0]['status'] == 'optimum'
    report = (out / 'report.html').read_text()
    assert 'Wilson score interval' in report and 'montecarlo_optimized_design.png' in report
    # The analysis-only study says what it is.
    code = main(['sweep', DEMO, '--monte-carlo', '5', '--out', str(tmp_path / 'a')])
    assert code == 0
    assert 'analysis only (configured design point, not re-optimised)' in capsys.readouterr().out
    analysis = json.loads((tmp_path / 'a' / 'montecarlo_summary.json').read_text())
    assert analysis['analysis'] == 'analysis only (configured design point, not re-optimised)'
    assert (
        'analysis only (configured design point, not re-optimised)'
        in (tmp_path / 'a' / 'report.html').read_text()
    )


@pytest.mark.parametrize(
    'args, words',
    [
        (['--optimize'], 'needs --monte-carlo N'),
        (['--monte-carlo', '0', '--optimize'], 'expected a whole number >= 1'),
        (['--monte-carlo', '0'], 'expected a whole number >= 1'),
        (['--monte-carlo', '-3'], 'expected a whole number >= 1'),
    ],
)
def test_bad_monte_carlo_flags_exit_2_with_one_line(args, words, capsys):
    assert main(['sweep', DEMO, *args]) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and words in err


def test_optimize_without_an_optimization_section_exits_2(tmp_path, capsys):
    with open(DEMO, encoding='utf-8') as handle:
        data = yaml.safe_load(handle)
    del data['optimization']
    path = tmp_path / 'no_optimization.yaml'
    path.write_text(yaml.safe_dump(data))
    assert main(['sweep', str(path), '--monte-carlo', '3', '--optimize']) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "needs an 'optimization' section" in err
    with pytest.raises(voltwake.ConfigError, match="needs an 'optimization' section"):
        voltwake.monte_carlo(str(path), samples=3, optimize=True)


def test_ctrl_c_keeps_the_finished_samples_and_exits_130(tmp_path):
    out = tmp_path / 'mc'
    # A test double around the per-sample optimisation sends SIGINT to its own process as
    # the fourth sample starts (jobs=1: in this process), so exactly three are finished.
    interrupted = (
        'import signal, sys\n'
        'import voltwake.studies.optimized_monte_carlo as omc\n'
        'real = omc.optimize_design_job\n'
        'def interrupted(job):\n'
        '    if job.get("sample") == 3:\n'
        '        signal.raise_signal(signal.SIGINT)\n'
        '    return real(job)\n'
        'omc.optimize_design_job = interrupted\n'
        'from voltwake.cli import main\n'
        'sys.exit(main(sys.argv[1:]))\n'
    )
    proc = subprocess.run(
        [sys.executable, '-c', interrupted, 'sweep', DEMO, '--monte-carlo', '5', '--optimize']
        + ['--jobs', '1', '--json', '--out', str(out)],
        capture_output=True,
        text=True,
        env=dict(os.environ, OPENMDAO_REPORTS='0'),
        timeout=600,
    )
    err = proc.stderr
    assert proc.returncode == 130, err
    assert len(err.strip().splitlines()) == 1 and 'interrupted after 3 of 5 samples' in err
    summary = json.loads((out / 'montecarlo_optimized_summary.json').read_text())
    assert summary['status'] == 'partial' and summary['samples_finished'] == 3
    with open(out / 'montecarlo_optimized_points.csv', newline='') as handle:
        rows = list(csv.DictReader(handle))
    assert [row['sample'] for row in rows] == ['0', '1', '2']


@pytest.mark.parametrize('jobs', [1, 2])
def test_map_jobs_hands_every_result_over_as_it_finishes(jobs):
    from voltwake.studies.parallel import map_jobs

    seen = {}
    results = map_jobs(abs, [-3, -1, -2], jobs=jobs, on_result=seen.__setitem__)
    assert results == [3, 1, 2] and seen == {0: 3, 1: 1, 2: 2}


def test_mpi_ranks_give_the_csv_of_one_process(tmp_path):
    import shutil

    pytest.importorskip('mpi4py')
    local = os.path.join(os.path.dirname(sys.executable), 'mpiexec')
    mpiexec = local if os.access(local, os.X_OK) else shutil.which('mpiexec')
    if mpiexec is None:
        pytest.skip('no mpiexec')
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    args = ['-m', 'voltwake.cli', 'sweep', DEMO, '--monte-carlo', '3', '--optimize']
    runs = {}
    for name, launch in (('serial', []), ('mpi', [mpiexec, '-n', '2'])):
        cmd = [*launch, sys.executable, *args, '--out', str(tmp_path / name)]
        if name == 'serial':
            cmd += ['--jobs', '1']
        run = subprocess.run(cmd, capture_output=True, text=True, env=env, timeout=600)
        assert run.returncode == 0, run.stderr[-2000:]
        runs[name] = (tmp_path / name / 'montecarlo_optimized_points.csv').read_text()
    # The samples are dealt over the ranks; rank 0 writes the same rows as one process.
    assert runs['mpi'] == runs['serial'] and len(runs['serial'].splitlines()) == 4
