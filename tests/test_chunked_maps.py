"""Maps and analysis-only Monte Carlo solved in chunks: same numbers, streamed CSV, reference."""

import json
import os
import shutil
import subprocess
import sys

import numpy as np
import pytest

import voltwake
from voltwake.cli import main
from voltwake.design.compare import compare
from voltwake.errors import ConfigError
from voltwake.studies.chunked import DEFAULT_CHUNK_SIZE, chunk_bounds

DEMO = 'demo_turbo_electric'
FPR = 'aft_fan.fan_pressure_ratio'
FRACTION = 'aft_fan.thrust_fraction'
MOTOR = 'electrical.motor.specific_power'
ENV = dict(os.environ, OPENMDAO_REPORTS='0')


def sweep(out, *flags):
    """Run ``voltwake sweep --json FLAGS --out OUT`` in-process; return the CSV text."""
    assert main(['sweep', '--json', *flags, '--out', str(out)]) == 0
    return (out / 'map_points.csv').read_text()


def test_chunks_are_nearly_equal_and_cover_every_point():
    assert chunk_bounds(10, 4) == [(0, 3), (3, 7), (7, 10)]
    assert chunk_bounds(3, 10) == [(0, 3)]
    assert chunk_bounds(0, 5) == []
    bounds = chunk_bounds(2025, 300)
    assert bounds[0][0] == 0 and bounds[-1][1] == 2025
    assert all(a[1] == b[0] for a, b in zip(bounds, bounds[1:]))
    assert {stop - start for start, stop in bounds} <= {289, 290} and len(bounds) == 7
    assert DEFAULT_CHUNK_SIZE >= 1000


def test_a_map_in_chunks_gives_the_numbers_of_one_solve():
    # 45 x 45 = 2,025 points: in chunks of at most 300 (seven models of 290 points, the
    # last padded) and as one solve of all of them.
    axes = {FPR: '1.15:1.6:45', FRACTION: '0.05:0.45:45'}
    chunked = voltwake.design_map(DEMO, axes, chunk_size=300)
    whole = voltwake.design_map(DEMO, axes, chunk_size=5000)
    assert list(chunked.points) == list(whole.points)
    assert chunked.points['closed'].tolist() == whole.points['closed'].tolist()
    assert chunked.points['reason'].tolist() == whole.points['reason'].tolist()
    for column, one in whole.points.items():
        if one.dtype != float:
            continue
        other = chunked.points[column]
        assert np.array_equal(np.isnan(one), np.isnan(other)), column
        # Relative to the field's largest magnitude over the map: margins (differences of
        # two quantities of order one) come close to zero at some points.
        scale = np.nanmax(np.abs(one)) or 1.0
        assert np.nanmax(np.abs(one - other)) <= 1e-12 * scale, column


def test_streamed_csv_equals_the_result_in_memory(tmp_path):
    axes = ['--map', f'{FPR}=1.2:1.4:3', '--map', f'{MOTOR}=5 kW/kg:10 kW/kg:4']
    text = sweep(tmp_path / 'cli', *axes, '--chunk-size', '5', '--jobs', '1')
    api = voltwake.design_map(DEMO, {FPR: '1.2:1.4:3', MOTOR: '5 kW/kg:10 kW/kg:4'}, chunk_size=5)
    assert api.csv_text() == text
    assert len(text.splitlines()) == 1 + 12
    summary = json.loads((tmp_path / 'cli' / 'map_summary.json').read_text())
    assert summary['status'] == 'complete' and summary['points_count'] == 12
    assert summary['reference_follows'] == []


@pytest.mark.parametrize('value', ['0', '-3', '1.5', 'many'])
def test_bad_chunk_size_is_one_line_and_exit_2(value, capsys):
    code = main(['sweep', '--map', f'{FRACTION}=0.1:0.2:2', f'--chunk-size={value}'])
    err = capsys.readouterr().err
    assert code == 2
    assert err.count('\n') == 1 and '--chunk-size' in err and repr(value) in err


@pytest.mark.parametrize('value', [0, -1, 2.5, True])
def test_bad_chunk_size_from_python_is_a_config_error(value):
    with pytest.raises(ConfigError, match='chunk_size'):
        voltwake.design_map(DEMO, {FRACTION: [0.1]}, chunk_size=value)


def test_the_reference_follows_the_range_and_each_point_equals_compare():
    result = voltwake.design_map(DEMO, {'mission.range': ['800 nmi', '2600 nmi']}, chunk_size=1)
    assert result.data['reference_follows'] == ['mission.range']
    assert result.reference is None  # no single reference applies to every point
    points = result.points
    assert points['reference_closed'].all() and result.units['reference_block_fuel_kg'] == 'kg'
    # Each point against its own reference: voltwake compare at the same range.
    for i, distance in enumerate(points['mission.range']):
        both = compare(DEMO, {'mission.range': float(distance)})
        assert points['fuel_burn_change_percent'][i] == pytest.approx(
            both.fuel_burn_change_percent, rel=1e-9
        )
        assert points['reference_block_fuel_kg'][i] == pytest.approx(
            both.reference.values['block_fuel_kg'], rel=1e-9
        )
    # A longer range needs more fuel for the reference too.
    assert points['reference_block_fuel_kg'][1] > 2.0 * points['reference_block_fuel_kg'][0]
    assert 'following mission.range' in result.text()


def test_a_map_over_technology_keeps_one_reference():
    result = voltwake.design_map(DEMO, {FRACTION: [0.1, 0.2, 0.3]}, chunk_size=2)
    assert result.data['reference_follows'] == []
    assert not any(c.startswith('reference') for c in result.points)
    ref = result.reference['block_fuel_kg']
    fuel = result.points['block_fuel_kg']
    assert result.points['fuel_burn_change_percent'] == pytest.approx(
        100.0 * (fuel - ref) / ref, rel=1e-12
    )
    assert f'{ref:,.1f} kg' in result.text()


def test_monte_carlo_over_a_shared_input_has_a_reference_per_sample():
    dists = {'mission.range': {'uniform': ['1000 nmi', '2000 nmi']}}
    result = voltwake.monte_carlo(DEMO, samples=5, seed=3, distributions=dists, chunk_size=2)
    assert result.data['reference_follows'] == ['mission.range']
    refs = result.points['reference_block_fuel_kg']
    assert len(set(refs.tolist())) == 5
    change = 100.0 * (result.points['block_fuel_kg'] - refs) / refs
    assert result.points['fuel_burn_change_percent'] == pytest.approx(change, rel=1e-12)


def test_two_processes_write_the_csv_of_one(tmp_path):
    axes = ['--map', f'{FRACTION}=0.1:0.3:12', '--chunk-size', '4']
    one = sweep(tmp_path / 'one', *axes, '--jobs', '1')
    two = sweep(tmp_path / 'two', *axes, '--jobs', '2')
    assert two == one


def test_ctrl_c_keeps_the_finished_chunks(tmp_path):
    out = tmp_path / 'sweep'
    # A test double around the chunk solver sends SIGINT to its own process as the third
    # chunk starts: the first two chunks (6 points) are finished and written.
    interrupted = (
        'import signal, sys\n'
        'import voltwake.studies.chunked as chunked\n'
        'solve = chunked.solve_chunk\n'
        'calls = []\n'
        'def interrupted(job):\n'
        '    calls.append(job)\n'
        '    if len(calls) == 3:\n'
        '        signal.raise_signal(signal.SIGINT)\n'
        '    return solve(job)\n'
        'chunked.solve_chunk = interrupted\n'
        'from voltwake.cli import main\n'
        'sys.exit(main(sys.argv[1:]))\n'
    )
    args = ['sweep', '--map', f'{FRACTION}=0.1:0.3:12', '--chunk-size', '3', '--jobs', '1']
    proc = subprocess.run(
        [sys.executable, '-c', interrupted, *args, '--json', '--out', str(out)],
        capture_output=True,
        text=True,
        env=ENV,
        timeout=300,
    )
    assert proc.returncode == 130, proc.stderr
    assert proc.stderr.strip().splitlines() == [
        'voltwake: error: sweep interrupted during the map study after 6 of 12 points'
    ]
    summary = json.loads((out / 'map_summary.json').read_text())
    assert summary['status'] == 'partial'
    assert (summary['points_done'], summary['points_total']) == (6, 12)
    rows = (out / 'map_points.csv').read_text().splitlines()
    assert len(rows) == 1 + 6
    # The rows written are those of the finished chunks, as a full run writes them.
    full = voltwake.design_map(DEMO, {FRACTION: '0.1:0.3:12'}, chunk_size=3)
    assert full.csv_text().splitlines()[:7] == rows


def test_mpi_ranks_write_the_csv_of_one_process(tmp_path):
    pytest.importorskip('mpi4py')
    local = os.path.join(os.path.dirname(sys.executable), 'mpiexec')
    mpiexec = local if os.access(local, os.X_OK) else shutil.which('mpiexec')
    if mpiexec is None:
        pytest.skip('no mpiexec')
    args = ['-m', 'voltwake.cli', 'sweep', '--map', f'{FRACTION}=0.1:0.3:10', '--chunk-size', '3']
    serial = sweep(tmp_path / 'serial', '--map', f'{FRACTION}=0.1:0.3:10', '--chunk-size', '3')
    ranked = subprocess.run(
        [mpiexec, '-n', '2', sys.executable, *args, '--json', '--out', str(tmp_path / 'mpi')],
        capture_output=True,
        text=True,
        env=ENV,
        timeout=600,
    )
    assert ranked.returncode == 0, ranked.stderr[-2000:]
    assert (tmp_path / 'mpi' / 'map_points.csv').read_text() == serial
