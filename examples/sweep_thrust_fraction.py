"""
Sweep the aft fan's share of cruise thrust on the packaged turbo-electric demo.

Each point is a full sizing analysis (:func:`voltwake.analyze`) with the configured
``aft_fan.thrust_fraction`` overridden. Prints one table and, when matplotlib is installed,
saves a plot to OUTDIR.

Run: ``python examples/sweep_thrust_fraction.py [OUTDIR]`` (OUTDIR defaults to a new
temporary directory). Conceptual estimates only: not for certification, flight or
operational decisions.
"""

import os
import sys
import tempfile

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import numpy as np

import voltwake

PLOT_FILE = 'thrust_fraction_sweep.png'

#: Aft-fan thrust fractions of the sweep (8 points).
FRACTIONS = np.linspace(0.05, 0.40, 8)


def sweep(fractions=FRACTIONS):
    """
    Size the demo at each aft-fan thrust fraction.

    Parameters
    ----------
    fractions : sequence of float
        Aft-fan share of cruise net thrust at each point.

    Returns
    -------
    rows : list of tuple
        (thrust fraction, power saving coefficient, block fuel in kg, electrical mass in kg)
        for the points whose sizing loop closed.
    failed : list of tuple
        (thrust fraction, reason) for the points whose sizing loop did not close.
    """
    rows, failed = [], []
    for fraction in fractions:
        try:
            res = voltwake.analyze(
                None, {'aft_fan.thrust_fraction': float(fraction)}, keep_problem=False
            )
        except voltwake.NotClosedError as err:  # keep the reason and go on
            failed.append((float(fraction), err.message))
            continue
        rows.append(
            (
                float(fraction),
                res.power_saving_coefficient,
                res.block_fuel_kg,
                res.electrical_mass_kg,
            )
        )
    return rows, failed


def plot(rows, path):
    """
    Save the sweep as a PNG, or say why not.

    Parameters
    ----------
    rows : list of tuple
        Output of :func:`sweep`.
    path : str
        PNG file to write.

    Returns
    -------
    bool
        True when the plot was saved.
    """
    try:
        import matplotlib

        matplotlib.use('Agg')  # no display needed
        import matplotlib.pyplot as plt
    except ImportError:
        print('matplotlib is not installed: plot skipped (pip install matplotlib)')
        return False
    data = np.array(rows)
    labels = ('power saving coefficient [-]', 'block fuel [kg]', 'electrical mass [kg]')
    fig, axes = plt.subplots(3, 1, sharex=True, figsize=(6.0, 7.5))
    for column, (ax, label) in enumerate(zip(axes, labels), start=1):
        ax.plot(data[:, 0], data[:, column], 'o-')
        ax.set_ylabel(label)
        ax.grid(True)
    axes[-1].set_xlabel('aft-fan thrust fraction [-]')
    axes[0].set_title('voltwake demo: aft-fan thrust fraction sweep')
    fig.tight_layout()
    fig.savefig(path, dpi=120)
    plt.close(fig)
    print(f'plot: {path}')
    return True


def main(outdir=None):
    """
    Run the sweep, print the table and save the plot.

    Parameters
    ----------
    outdir : str or None
        Directory for the plot; None for a new temporary directory.

    Returns
    -------
    int
        0 when at least one point closed, else 1.
    """
    outdir = outdir or tempfile.mkdtemp(prefix='voltwake_')
    os.makedirs(outdir, exist_ok=True)
    print(
        f"{'thrust fraction':>15s}{'PSC':>10s}{'block fuel [kg]':>17s}{'electrical mass [kg]':>22s}"
    )
    rows, failed = sweep()
    for fraction, psc, fuel, elec in rows:
        print(f'{fraction:15.3f}{psc:10.4f}{fuel:17.1f}{elec:22.1f}')
    for fraction, reason in failed:
        print(f'{fraction:15.3f}  does not close: {reason}')
    if not rows:
        return 1
    plot(rows, os.path.join(outdir, PLOT_FILE))
    return 0


if __name__ == '__main__':
    sys.exit(main(sys.argv[1] if len(sys.argv) > 1 else None))
