"""
Map the aft fan's pressure ratio and thrust share of the packaged turbo-electric demo.

A 3 x 3 design-space map with :func:`voltwake.design_map`: every point is sized (analysis
only, all nine as one vectorised model) and compared with the conventional reference as
configured. Prints one row per point and writes the files of ``voltwake sweep --out``
(``map_points.csv``, ``map_summary.json``/``.yaml``, the figures and ``report.html``) to
OUTDIR.

Run: ``python examples/study_design_map.py [OUTDIR]`` (OUTDIR defaults to a new temporary
directory). Conceptual estimates only: not for certification, flight or operational
decisions.
"""

import os
import sys
import tempfile

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import voltwake  # noqa: E402

#: The map's axes (config key paths -> values); the first varies slowest.
AXES = {
    'aft_fan.fan_pressure_ratio': [1.2, 1.3, 1.4],
    'aft_fan.thrust_fraction': [0.15, 0.25, 0.35],
}


def main(outdir=None):
    """
    Run the map, print the table and write the study's files.

    Parameters
    ----------
    outdir : str or None
        Directory for the files; None for a new temporary directory.

    Returns
    -------
    int
        0 when at least one point closed, else 1.
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_map_')
    result = voltwake.design_map('demo_turbo_electric', AXES)
    points, units = result.points, result.units
    print(
        f"{'aft-fan FPR':>11s}{'thrust fraction':>16s}"
        f"{'block fuel [' + units['block_fuel_kg'] + ']':>18s}"
        f"{'PSC [-]':>9s}{'fuel change [' + units['fuel_burn_change_percent'] + ']':>17s}"
    )
    for i, closed in enumerate(points['closed']):
        fpr = points['aft_fan.fan_pressure_ratio'][i]
        fraction = points['aft_fan.thrust_fraction'][i]
        if not closed:
            print(f'{fpr:11.3f}{fraction:16.3f}  did not close: {points["reason"][i]}')
            continue
        print(
            f'{fpr:11.3f}{fraction:16.3f}{points["block_fuel_kg"][i]:18.1f}'
            f'{points["power_saving_coefficient"][i]:9.4f}'
            f'{points["fuel_burn_change_percent"][i]:+17.2f}'
        )
    reference = result.reference['block_fuel_kg']
    print(
        f'{points["closed"].sum()} of {points["closed"].size} designs closed; conventional '
        f'reference block fuel {reference:.1f} kg'
    )
    # force=True: a second run may write into the same directory.
    report = result.write(outdir, force=True)
    print(f'files written to {outdir}; open {os.path.basename(report)}')
    return 0 if points['closed'].any() else 1


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
