"""
Trade-study performance, measured in one run, side by side.

1. A 100 x 100 design-space map of the demo solved as ONE vectorised model, against 100
   points analysed one at a time in a loop (both per point).
2. A 3 x 3 target sweep (an optimisation at every point) with ``jobs=2`` against ``jobs=1``.
3. Peak resident memory of the 10,000-point map (measured in a fresh process).

Run: ``python benchmarks/bench_sweep.py``. Prints one table; no assertions.
"""

import json
import os
import subprocess
import sys
import time

os.environ.setdefault('OPENMDAO_REPORTS', '0')

import numpy as np  # noqa: E402

import voltwake  # noqa: E402
from voltwake.design.batch import analyze_points, full_factorial
from voltwake.studies.target_sweep import target_sweep

AXES = {
    'aft_fan.fan_pressure_ratio': np.linspace(1.15, 1.6, 100),
    'aft_fan.thrust_fraction': np.linspace(0.05, 0.45, 100),
}

_RSS_CHILD = """
import os, resource, json, numpy as np, warnings
warnings.simplefilter('ignore')
from voltwake.design.batch import analyze_points, full_factorial
axes = {'aft_fan.fan_pressure_ratio': np.linspace(1.15, 1.6, 100),
        'aft_fan.thrust_fraction': np.linspace(0.05, 0.45, 100)}
before = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
r = analyze_points(None, full_factorial(axes))
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(json.dumps({'peak_kB': peak, 'before_kB': before, 'closed': int(r.closed.sum())}))
"""


def main():
    """Measure and print the table."""
    import warnings

    warnings.simplefilter('ignore')
    columns = full_factorial(AXES)
    # Memory first, in a fresh process started before this one grows (a child's peak RSS
    # starts from its parent's at fork on Linux).
    child = subprocess.run(
        [sys.executable, '-c', _RSS_CHILD],
        capture_output=True,
        text=True,
        check=True,
        env=dict(os.environ, OPENMDAO_REPORTS='0'),
    )
    rss = json.loads(child.stdout.strip().splitlines()[-1])

    t0 = time.perf_counter()
    batch = analyze_points(None, columns)
    t_map = time.perf_counter() - t0

    rng = np.random.default_rng(0)
    picks = rng.choice(len(batch.closed), 100, replace=False)
    t0 = time.perf_counter()
    worst = 0.0
    for i in picks:
        single = voltwake.analyze(
            None, {p: float(columns[p][i]) for p in columns}, keep_problem=False
        )
        worst = max(worst, abs(single.block_fuel_kg / batch.values['block_fuel_kg'][i] - 1))
    t_loop = time.perf_counter() - t0

    # Targets where the aft fan meets its minimum blade height (a smaller fan cannot wrap
    # the tail cone), so that every optimisation has a feasible design.
    targets = {
        'aft_fan.fan_pressure_ratio': [1.15, 1.2, 1.25],
        'aft_fan.thrust_fraction': [0.22, 0.26, 0.30],
    }
    t0 = time.perf_counter()
    serial = target_sweep(None, targets, jobs=1)
    t_serial = time.perf_counter() - t0
    t0 = time.perf_counter()
    parallel = target_sweep(None, targets, jobs=2)
    t_parallel = time.perf_counter() - t0
    same = all(
        a['block_fuel_kg'] == b['block_fuel_kg']
        for a, b in zip(serial['points'], parallel['points'])
    )

    per_map, per_loop = t_map / len(batch.closed), t_loop / len(picks)
    print('trade-study benchmark (2-core machine; wall times)')
    print(f'  {"case":<46s}{"time [s]":>10s}{"per point [ms]":>16s}')
    print(f'  {"10,000-point map, one vectorised model":<46s}{t_map:>10.2f}{1e3 * per_map:>16.3f}')
    print(f'  {"100 points analysed one at a time":<46s}{t_loop:>10.2f}{1e3 * per_loop:>16.3f}')
    print(
        f'  per-point speed-up of the vectorised map: {per_loop / per_map:.0f}x '
        f'(largest block-fuel difference {worst:.1e} relative); '
        f'{100 * batch.closure_rate:.1f}% closed'
    )
    ok = sum(p['success'] for p in serial['points'])
    print(f'  {"3 x 3 target sweep, jobs=1":<46s}{t_serial:>10.2f}')
    print(f'  {"3 x 3 target sweep, jobs=2":<46s}{t_parallel:>10.2f}')
    print(
        f'  parallel speed-up {t_serial / t_parallel:.2f}x; identical results: {same}; '
        f'{ok}/9 optimisations succeeded'
    )
    print(
        f'  peak RSS of the 10,000-point map: {rss["peak_kB"] / 1024:.0f} MiB '
        f'({rss["before_kB"] / 1024:.0f} MiB after imports)'
    )


if __name__ == '__main__':
    main()
