"""
Set-up and run time of the demo sizing model (median of several runs).

Run: ``python benchmarks/bench_analysis.py``. Prints one table; numbers only, no assertions.
"""

import os
import statistics
import time

os.environ.setdefault('OPENMDAO_REPORTS', '0')

from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.sizing import build_model_problem, run_sizing


def main(repeats=7):
    """
    Time problem set-up and one converged ``run_model`` of each demo.

    Parameters
    ----------
    repeats : int
        Number of timed repetitions; the median is printed.
    """
    print(f'{"demo":<16s}{"setup [ms]":>12s}{"run_model [ms]":>16s}{"Newton its":>12s}')
    for name in ('conventional', 'turbo_electric'):
        config = load_config(demo_path(name))
        setups, runs = [], []
        for _ in range(repeats):
            t0 = time.perf_counter()
            prob = build_model_problem(config)
            t1 = time.perf_counter()
            its = run_sizing(prob, config.has_aft_fan)
            t2 = time.perf_counter()
            setups.append(t1 - t0)
            runs.append(t2 - t1)
        print(
            f'{name:<16s}{1e3 * statistics.median(setups):>12.1f}'
            f'{1e3 * statistics.median(runs):>16.1f}{its:>12d}'
        )


if __name__ == '__main__':
    main()
