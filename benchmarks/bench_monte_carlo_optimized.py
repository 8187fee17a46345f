"""
Monte Carlo with both aircraft re-optimised at every sample, measured as a user runs it.

``voltwake sweep demo_turbo_electric --monte-carlo 100 --optimize --jobs 2`` in a fresh
process: wall time including start-up (imports, the two nominal optimisations, the figures
and the report). The goal is under 5 minutes on the 2-core machine. Also printed: the
distribution of the fuel-burn change of the optima, the probability of a win with its 95 %
Wilson score interval, and the model evaluations per optimisation (warm starts).

Run: ``python benchmarks/bench_monte_carlo_optimized.py [SAMPLES] [JOBS]``. Prints one
table; no assertions.
"""

import json
import os
import subprocess
import sys
import tempfile
import time


def main():
    """Run the command once and print the table."""
    samples = int(sys.argv[1]) if len(sys.argv) > 1 else 100
    jobs = int(sys.argv[2]) if len(sys.argv) > 2 else 2
    with tempfile.TemporaryDirectory() as tmp:
        out = os.path.join(tmp, 'mc')
        command = [
            sys.executable,
            '-m',
            'voltwake.cli',
            'sweep',
            'demo_turbo_electric',
            '--monte-carlo',
            str(samples),
            '--optimize',
            '--jobs',
            str(jobs),
            '--out',
            out,
        ]
        t0 = time.perf_counter()
        proc = subprocess.run(
            command,
            capture_output=True,
            text=True,
            env=dict(os.environ, OPENMDAO_REPORTS='0'),
            check=False,
        )
        wall = time.perf_counter() - t0
        if proc.returncode != 0:
            print(proc.stderr)
            raise SystemExit(proc.returncode)
        with open(os.path.join(out, 'montecarlo_optimized_summary.json'), encoding='utf-8') as f:
            data = json.load(f)
        with open(os.path.join(out, 'montecarlo_optimized_points.csv'), encoding='utf-8') as f:
            header = f.readline().split(',')
            column = next(i for i, h in enumerate(header) if h.startswith('evaluations'))
            evaluations = [int(line.split(',')[column]) for line in f if line.strip()]
    stats = data['fuel_burn_change_percent']
    ci = data['probability_of_win_interval']
    counts = data['status_counts']
    print(f're-optimised Monte Carlo benchmark (2-core machine; {samples} samples, jobs={jobs})')
    print(f'  wall time including start-up: {wall:.1f} s (goal < 300 s)')
    print(f'  per sample: {wall / samples:.2f} s')
    print(
        f"  samples: {counts['optimum']} optimum, {counts['infeasible']} infeasible, "
        f"{counts['failed']} failed; reference optimised {data['reference']['optimised']}"
    )
    print(
        f"  model evaluations per sample optimisation: mean "
        f'{sum(evaluations) / len(evaluations):.1f}, max {max(evaluations)}'
    )
    print(
        f"  nominal optima: fuel-burn change {data['nominal']['fuel_burn_change_percent']:+.3f} %"
    )
    print(
        f"  fuel-burn change of the optima: mean {stats['mean']:+.3f} %, std {stats['std']:.3f} %,"
        f" 5/50/95 %: {stats['p05']:+.3f} / {stats['p50']:+.3f} / {stats['p95']:+.3f} %"
    )
    print(
        f"  P(win) {100 * data['probability_of_win']:.1f} % ({data['wins']} of "
        f"{data['successful_samples']}); 95 % Wilson score interval "
        f"{100 * ci['lower']:.1f} % to {100 * ci['upper']:.1f} %"
    )


if __name__ == '__main__':
    main()
