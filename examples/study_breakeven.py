"""
Look for the motor specific power at which the turbo-electric demo breaks even.

A technology break-even with :func:`voltwake.breakeven`: the optimised turbo-electric demo,
with the motor's specific power held, against the optimised conventional reference, solved
for equal block fuel by Brent's method between 5 and 20 kW/kg. The demo has no break-even
there (it burns more fuel at both ends); the study says so and gives the sensitivity of
the optimised block fuel to every technology input held fixed (at the optimum, with the
motor's specific power at its configured value). Prints the evaluations, the answer and the
sensitivities, and writes the files of ``voltwake sweep --out`` to OUTDIR.

Run: ``python examples/study_breakeven.py [OUTDIR]`` (OUTDIR defaults to a new temporary
directory). Conceptual estimates only: not for certification, flight or operational
decisions.
"""

import os
import sys
import tempfile
import warnings

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

from openmdao.utils.units import convert_units  # noqa: E402

import voltwake  # noqa: E402

# OpenMDAO's advisory notes on the model's solvers, hidden as the voltwake command hides them
# (after the imports: importing OpenMDAO sets its own warning filters).
warnings.filterwarnings('ignore', module='openmdao')

PATH = 'electrical.motor.specific_power'


def main(outdir=None):
    """
    Run the break-even search, print the tables and write the study's files.

    Parameters
    ----------
    outdir : str or None
        Directory for the files; None for a new temporary directory.

    Returns
    -------
    int
        0 (a study without a break-even is an answer, not a failure).
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_breakeven_')
    result = voltwake.breakeven('demo_turbo_electric', PATH, '5 kW/kg', '20 kW/kg', jobs=2)
    points, units = result.points, result.units
    print(f"{'motor specific power [kW/kg]':>29s}{'block fuel [kg]':>17s}{'fuel change [%]':>17s}")
    for value, fuel, change in zip(
        points[PATH], points['block_fuel_kg'], points['fuel_burn_change_percent']
    ):
        print(f'{convert_units(value, units[PATH], "kW/kg"):29.2f}{fuel:17.1f}{change:+17.3f}')
    print(result.message)
    print('\nsensitivity of the optimised block fuel at 9 kW/kg (largest first):')
    print(f"{'technology input':<36s}{'elasticity [%/%]':>17s}")
    ranked = sorted(result.sensitivities.items(), key=lambda item: -abs(item[1]['elasticity']))
    for path, entry in ranked:
        print(f'{path:<36s}{entry["elasticity"]:+17.4f}')
    report = result.write(outdir, force=True)  # force: a second run may reuse the directory
    print(f'files written to {outdir}; open {os.path.basename(report)}')
    return 0


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
