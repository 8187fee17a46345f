"""map_jobs over local processes and MPI ranks, its progress callback and the progress bar."""

import io
import json
import os
import shutil
import subprocess
import sys
import time

import numpy as np
import pytest

from voltwake.studies.parallel import ProgressBar, is_root, map_jobs, mpi_comm
from voltwake.studies.target_sweep import target_sweep

SCRIPT = os.path.join(os.path.dirname(__file__), 'mpi_jobs_script.py')


def slow_square(item):
    """Return item**2; earlier items take longer, so they finish out of order in a pool."""
    time.sleep(0.05 * (3 - item) if item < 3 else 0.0)
    return item * item


def solve(seed):
    """Solve a random dense linear system (LAPACK through numpy) and return the solution."""
    rng = np.random.default_rng(seed)
    a = rng.standard_normal((300, 300)) + 300.0 * np.eye(300)
    return np.linalg.solve(a, rng.standard_normal(300))


def fail_on_odd(item):
    """A job result that reports failure for odd items."""
    return {'success': item % 2 == 0, 'item': item}


def raise_on_two(item):
    """Raise for item 2."""
    if item == 2:
        raise RuntimeError('item 2 broke')
    return item


def test_results_come_back_in_item_order():
    assert map_jobs(slow_square, range(6), jobs=2) == [0, 1, 4, 9, 16, 25]


def test_two_processes_give_exactly_the_serial_results():
    serial = map_jobs(solve, range(4), jobs=1)
    pooled = map_jobs(solve, range(4), jobs=2)
    for one, two in zip(serial, pooled):
        assert np.array_equal(one, two)


@pytest.mark.parametrize('jobs', [1, 2])
def test_progress_counts_done_and_failed_points(jobs):
    calls = []
    results = map_jobs(fail_on_odd, range(5), jobs=jobs, progress=lambda *args: calls.append(args))
    assert [r['item'] for r in results] == list(range(5))
    assert [c[0] for c in calls] == [1, 2, 3, 4, 5]
    assert all(c[2] == 5 for c in calls)
    assert calls[-1][1] == 2  # items 1 and 3 failed
    assert [c[1] for c in calls] == sorted(c[1] for c in calls)
    elapsed = [c[3] for c in calls]
    assert elapsed == sorted(elapsed) and elapsed[0] >= 0.0


def test_an_error_in_a_job_reaches_the_caller():
    with pytest.raises(RuntimeError, match='item 2 broke'):
        map_jobs(raise_on_two, range(4), jobs=2)


def test_bad_job_count_is_refused():
    with pytest.raises(ValueError, match='at least 1'):
        map_jobs(slow_square, [1], jobs=0)


def test_without_mpi_this_process_is_root():
    assert mpi_comm() is None
    assert is_root()


def test_progress_line_states_counts_elapsed_and_time_left():
    bar = ProgressBar(stream=io.StringIO())
    # 3 of 9 done in 12 s: 12 / 3 * 6 = 24 s left at the same pace.
    assert bar.format(3, 1, 9, 12.0) == 'points 3/9 (1 failed), 00:12 elapsed, 00:24 left'
    assert bar.format(9, 0, 9, 3725.0) == 'points 9/9, 1:02:05 elapsed'


def test_progress_bar_writes_a_line_per_tenth_when_not_a_terminal():
    stream = io.StringIO()
    bar = ProgressBar(stream=stream)
    for done in range(1, 21):
        bar(done, 0, 20, float(done))
    lines = stream.getvalue().splitlines()
    assert len(lines) == 10
    assert lines[0].startswith('points 2/20,') and lines[-1].startswith('points 20/20,')


class _Terminal(io.StringIO):
    def isatty(self):
        return True


def test_progress_bar_rewrites_one_line_on_a_terminal():
    stream = _Terminal()
    bar = ProgressBar(stream=stream)
    for done in range(1, 4):
        bar(done, 0, 3, 1.0)
    text = stream.getvalue()
    assert text.count('\r') == 3 and text.count('\n') == 1 and text.endswith('3/3, 00:01 elapsed\n')


def _mpiexec():
    """Return the mpiexec next to this Python (the mpich wheel's), else the one on PATH."""
    local = os.path.join(os.path.dirname(sys.executable), 'mpiexec')
    return local if os.access(local, os.X_OK) else shutil.which('mpiexec')


def test_mpi_ranks_give_the_serial_sweep_on_every_rank(tmp_path):
    pytest.importorskip('mpi4py')
    mpiexec = _mpiexec()
    if mpiexec is None:
        pytest.skip('no mpiexec')
    targets = {'aft_fan.thrust_fraction': [0.1, 0.2]}
    out = str(tmp_path / 'rank')
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    run = subprocess.run(
        [mpiexec, '-n', '2', sys.executable, SCRIPT, out, json.dumps(targets)],
        check=False,
        capture_output=True,
        text=True,
        timeout=300,
        env=env,
    )
    assert run.returncode == 0, run.stderr[-2000:]
    records = []
    for rank in (0, 1):
        with open(f'{out}.{rank}.json') as handle:
            records.append(json.load(handle))
    assert [(r['rank'], r['size'], r['root']) for r in records] == [(0, 2, True), (1, 2, False)]
    serial = json.loads(json.dumps(target_sweep(None, targets, jobs=1)))
    assert all(p['success'] for p in serial['points'])
    for record in records:  # gathered on rank 0 and broadcast: the serial numbers exactly
        assert record['sweep'] == serial
        assert record['error'] == 'item 1 fails'  # the first failing item, on every rank
    # Progress only on rank 0, counting the study's two points (the reference optimisation
    # is not one of them), none failed.
    assert records[0]['progress'] == [[1, 0, 2], [2, 0, 2]]
    assert records[1]['progress'] == []
