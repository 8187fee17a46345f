"""
Design-space maps at scale, measured in one run, side by side.

1. ``voltwake sweep --map ... --out DIR --jobs 1`` as a child process at 4, ~10^3, 10^4 and
   ~10^5 points (316 x 316): wall time including start-up and the child's peak resident
   memory (``os.wait4``), and the cost per point above the 4-point run (start-up,
   reference, figures and report).
2. The ~10^5-point map with ``--jobs 2`` against ``--jobs 1`` (speed-up; the memory is that
   of the largest process).
   A control beside it: a pure-Python CPU loop through the same
   :func:`voltwake.studies.parallel.stream_jobs`, one process against two, which tells how
   many cores the machine actually gives (a shared machine may give fewer than it has).
3. Chunked against one solve: the 10^4-point map with the default chunk size and as one
   vectorised solve, the largest difference of any field (relative to that field's largest
   magnitude over the map, and point by point).

Goals: 10^5 points under 1.5 GB and 60 s with one process, a flat cost per point, ``--jobs
2`` at least 1.6x faster, chunked equal to one solve to 1e-12.

Run: ``python benchmarks/bench_map_scale.py``. Prints one table; no assertions. The machine
may be shared: the load average is printed with the figures.
"""

import json
import os
import subprocess
import sys
import tempfile
import time

os.environ.setdefault('OPENMDAO_REPORTS', '0')

#: Map sizes: points per axis (two axes).
SIZES = (2, 32, 100, 316)

_COMPARE_CHILD = """
import json, warnings
import numpy as np
warnings.simplefilter('ignore')
import voltwake
from voltwake.studies.chunked import DEFAULT_CHUNK_SIZE
axes = {'aft_fan.fan_pressure_ratio': '1.15:1.6:100', 'aft_fan.thrust_fraction': '0.05:0.45:100'}
chunked = voltwake.design_map(None, axes, chunk_size=DEFAULT_CHUNK_SIZE)
whole = voltwake.design_map(None, axes, chunk_size=10000)
normwise = pointwise = 0.0
for column, one in whole.points.items():
    if one.dtype != float:
        continue
    other = chunked.points[column]
    diff = np.abs(one - other)
    if np.isfinite(diff).any():
        normwise = max(normwise, float(np.nanmax(diff) / (np.nanmax(np.abs(one)) or 1.0)))
        with np.errstate(all='ignore'):
            rel = diff / np.maximum(np.abs(one), np.abs(other))
        pointwise = max(pointwise, float(np.nanmax(np.where(diff == 0, 0.0, rel))))
same = chunked.points['closed'].tolist() == whole.points['closed'].tolist()
print(json.dumps({'normwise': normwise, 'pointwise': pointwise, 'same_closed': same,
                  'chunk': DEFAULT_CHUNK_SIZE}))
"""


def spin(count):
    """
    Return the sum of ``range(count)`` computed in a Python loop (CPU only, no memory).

    Parameters
    ----------
    count : int
        Loop length.

    Returns
    -------
    int
        The sum.
    """
    total = 0
    for k in range(count):
        total += k
    return total


def control_speedup():
    """Return the speed-up of two processes over one on a pure-Python CPU loop."""
    from voltwake.studies.parallel import stream_jobs

    walls = []
    for jobs in (1, 2):
        start = time.perf_counter()
        list(stream_jobs(spin, [5_000_000] * 8, jobs))
        walls.append(time.perf_counter() - start)
    return walls[0] / walls[1]


def _axes(n):
    return [
        '--map',
        f'aft_fan.fan_pressure_ratio=1.15:1.6:{n}',
        '--map',
        f'aft_fan.thrust_fraction=0.05:0.45:{n}',
    ]


def run_sweep(n, jobs, out):
    """
    Run ``voltwake sweep`` on an n x n map in a child process.

    Returns
    -------
    tuple
        (wall seconds including start-up, peak resident memory of the child in MB, exit code).
    """
    cmd = [sys.executable, '-m', 'voltwake.cli', 'sweep', *_axes(n), '--out', out]
    cmd += ['--jobs', str(jobs), '--json']
    start = time.perf_counter()
    child = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _, status, usage = os.wait4(child.pid, 0)
    wall = time.perf_counter() - start
    child.returncode = os.waitstatus_to_exitcode(status)
    return wall, usage.ru_maxrss / 1024.0, child.returncode


def main():
    """Measure and print the table."""
    load_before = os.getloadavg()
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        for n in SIZES:
            wall, rss, code = run_sweep(n, 1, os.path.join(tmp, f'map{n}'))
            rows.append((n * n, 1, wall, rss, code))
        big = SIZES[-1]
        wall2, rss2, code2 = run_sweep(big, 2, os.path.join(tmp, 'map_jobs2'))
        control = control_speedup()
        lines = open(os.path.join(tmp, f'map{big}', 'map_points.csv')).read().count('\n')
    compare = subprocess.run(
        [sys.executable, '-c', _COMPARE_CHILD], capture_output=True, text=True, check=True
    )
    diff = json.loads(compare.stdout.strip().splitlines()[-1])
    load_after = os.getloadavg()

    base = rows[0][2]
    print(f'load average before {load_before[0]:.2f}, after {load_after[0]:.2f} (2 cores)')
    print(
        f"{'points':>8} {'jobs':>4} {'wall [s]':>9} {'peak RSS [MB]':>14} "
        f"{'us/point above 4-pt run':>24} {'exit':>5}"
    )
    for index, (points, jobs, wall, rss, code) in enumerate(rows):
        per = f'{1e6 * (wall - base) / points:.0f}' if index else ''
        print(f'{points:>8} {jobs:>4} {wall:>9.1f} {rss:>14.0f} {per:>24} {code:>5}')
    points = big * big
    per2 = 1e6 * (wall2 - base) / points
    print(f'{points:>8} {2:>4} {wall2:>9.1f} {rss2:>14.0f} {per2:>24.0f} {code2:>5}')
    print(f'CSV rows of the {points}-point map: {lines - 1}')
    print(
        f'--jobs 2 speed-up at {points} points: {rows[-1][2] / wall2:.2f}x '
        f'(control, a pure-Python loop in 2 processes: {control:.2f}x)'
    )
    print(
        f"chunked ({diff['chunk']} points) vs one solve, 10,000 points: largest difference "
        f"{diff['normwise']:.2e} of the field's largest magnitude, {diff['pointwise']:.2e} "
        f"point by point; same closed points: {diff['same_closed']}"
    )


if __name__ == '__main__':
    main()
