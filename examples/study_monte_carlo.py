"""
Monte Carlo over the electrical technology of the packaged turbo-electric demo.

:func:`voltwake.monte_carlo` samples the distributions of the demo's
``study.uncertainty`` section (specific power and efficiency of the motor and the
generator), sizes every sample (all of them as one vectorised model) and compares it with
the conventional reference as configured. Prints the sampled ranges and the distribution of
the fuel-burn change, and writes the files of ``voltwake sweep --out`` to OUTDIR.

Run: ``python examples/study_monte_carlo.py [OUTDIR]`` (OUTDIR defaults to a new temporary
directory). Conceptual estimates only: not for certification, flight or operational
decisions.
"""

import os
import sys
import tempfile

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import voltwake  # noqa: E402

#: Samples and seed (the same seed gives the same samples).
SAMPLES, SEED = 300, 1


def main(outdir=None):
    """
    Run the Monte Carlo study, print the tables and write the study's files.

    Parameters
    ----------
    outdir : str or None
        Directory for the files; None for a new temporary directory.

    Returns
    -------
    int
        0 when at least one sample closed, else 1.
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_montecarlo_')
    result = voltwake.monte_carlo('demo_turbo_electric', SAMPLES, seed=SEED)
    points, units = result.points, result.units
    print(f"{'sampled input':<38s}{'units':>7s}{'min':>12s}{'mean':>12s}{'max':>12s}")
    for path in sorted(result.data['distributions']):
        values = points[path]
        print(
            f'{path:<38s}{units[path]:>7s}{values.min():12.6g}{values.mean():12.6g}'
            f'{values.max():12.6g}'
        )
    stats = result.fuel_burn_change_percent
    print(f'\n{points["closed"].sum()} of {points["closed"].size} samples closed')
    print(f"{'fuel-burn change [%]':<22s}{'mean':>9s}{'std':>9s}{'p05':>9s}{'p50':>9s}{'p95':>9s}")
    print(f"{'':<22s}" + ''.join(f'{stats[k]:+9.3f}' for k in ('mean', 'std', 'p05', 'p50', 'p95')))
    print(
        f'probability that the turbo-electric design wins: {100 * result.probability_of_win:.1f} %'
    )
    report = result.write(outdir, force=True)  # force: a second run may reuse the directory
    print(f'files written to {outdir}; open {os.path.basename(report)}')
    return 0 if points['closed'].any() else 1


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
