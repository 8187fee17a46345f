"""
Optimise the packaged turbo-electric demo at three aft-fan thrust shares.

A target sweep with :func:`voltwake.target_sweep`: at each point the aft fan's share of
cruise thrust is held, every other design variable of the demo's ``optimization`` section is
optimised, and the optimum is compared with the optimised conventional reference (same
objective and constraints, no aft fan). The four optimisations run on two processes. Prints
one row per point and writes the files of ``voltwake sweep --out`` to OUTDIR.

Run: ``python examples/study_target_sweep.py [OUTDIR]`` (OUTDIR defaults to a new
temporary directory). Conceptual estimates only: not for certification, flight or
operational decisions.
"""

import os
import sys
import tempfile

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import voltwake  # noqa: E402

#: The held aft-fan thrust fractions.
FRACTIONS = [0.15, 0.25, 0.35]


def main(outdir=None):
    """
    Run the sweep, print the table and write the study's files.

    Parameters
    ----------
    outdir : str or None
        Directory for the files; None for a new temporary directory.

    Returns
    -------
    int
        0 when every optimisation succeeded, else 1.
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_targets_')
    result = voltwake.target_sweep(
        'demo_turbo_electric', {'aft_fan.thrust_fraction': FRACTIONS}, jobs=2
    )
    points, units = result.points, result.units
    print(
        f"{'thrust fraction':>15s}{'optimised':>10s}"
        f"{'block fuel [' + units['block_fuel_kg'] + ']':>18s}"
        f"{'fuel change [%]':>16s}"
        f"{'wing loading [' + units['dv:wing.loading'] + ']':>24s}"
        f"{'aft-fan FPR':>12s}"
    )
    for i, ok in enumerate(points['success']):
        print(
            f'{points["target:aft_fan.thrust_fraction"][i]:15.3f}{"yes" if ok else "no":>10s}'
            f'{points["block_fuel_kg"][i]:18.1f}{points["fuel_burn_change_percent"][i]:+16.2f}'
            f'{points["dv:wing.loading"][i]:24.1f}{points["dv:aft_fan.fan_pressure_ratio"][i]:12.3f}'
        )
    reference = result.reference
    if reference['success']:
        print(f'optimised reference block fuel {reference["outputs"]["block_fuel_kg"]:.1f} kg')
    else:
        print(f'the reference could not be optimised: {reference["message"]}')
    report = result.write(outdir, force=True)  # force: a second run may reuse the directory
    print(f'files written to {outdir}; open {os.path.basename(report)}')
    return 0 if points['success'].all() else 1


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
