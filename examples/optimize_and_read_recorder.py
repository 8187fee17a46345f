"""
Optimise the packaged turbo-electric demo, then read its history from the case file.

The driver history is read back with OpenMDAO's CaseReader.

Run: ``python examples/optimize_and_read_recorder.py [OUTDIR]``. The case file is written to
OUTDIR (default: a new temporary directory). Exit code 0 when the optimiser succeeds.
Conceptual estimates only: not for certification, flight or operational decisions.
"""

import os
import sys
import tempfile

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import openmdao.api as om

from voltwake.design.optimization import optimize

CASE_FILE = 'optimization_cases.sql'


def main(outdir=None):
    """
    Optimise the demo with a case recorder, print the optimum and the recorded history.

    Parameters
    ----------
    outdir : str or None
        Directory for the case file; None for a new temporary directory.

    Returns
    -------
    int
        0 when the optimiser reports success at a feasible, closed design, else 1.
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_')
    os.makedirs(outdir, exist_ok=True)
    case_file = os.path.join(outdir, CASE_FILE)

    # 1. Optimise. config=None is the packaged turbo-electric demo; its `optimization`
    #    section gives the objective, design variables, constraints and optimiser.
    result = optimize(recorder_path=case_file)
    print(f'optimiser: {result.message}')
    print(f'success: {result.success} ({result.evaluations} model evaluations)')
    print('optimum design:')
    for path, info in result.design.items():
        bound = '  (at a bound)' if info['active'] else ''
        print(f"  {path:<34s}{info['value']:12.5g} {info['units'] or '-'}{bound}")
    start = result.start['block_fuel_kg']
    if result.outputs:
        end = result.outputs['block_fuel_kg']
        print(
            f'block fuel: {start:.1f} kg at the start, {end:.1f} kg at the optimum '
            f'({100.0 * (end / start - 1.0):+.2f} %)'
        )

    # 2. Read the case file back: one driver case per optimiser iteration.
    reader = om.CaseReader(case_file)
    cases = reader.list_cases('driver', recurse=False, out_stream=None)
    print(f'case file: {case_file}')
    print(f'driver cases: {len(cases)}')
    print(f"{'case':<32s}{'block fuel [kg]':>16s}")
    for case_id in cases:
        case = reader.get_case(case_id)
        # Values are recorded under their promoted names; 'block_fuel' is the demo's objective.
        print(f"{case_id:<32s}{case.get_val('block_fuel', units='kg')[0]:16.2f}")
    return 0 if result.success else 1


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
