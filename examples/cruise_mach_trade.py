"""
Block fuel of the packaged conventional demo against its cruise Mach number.

Every point is a full sizing analysis of the whole aircraft at that cruise Mach number
(same wing, same mission; the aircraft is re-sized so that it closes). Below the critical
Mach number the faster aircraft costs only a little fuel (the turbofans' overall efficiency
even rises with flight speed); past it the Korn/Lock wave drag grows with the fourth power
of the Mach excess and the fuel climbs steeply. The drag-divergence Mach number of each
design is printed beside it and the row nearest to it is marked.

Run: ``python examples/cruise_mach_trade.py`` (one table; no files). Conceptual estimates
only: not for certification, flight or operational decisions.
"""

import os

os.environ.setdefault('OPENMDAO_REPORTS', '0')  # no OpenMDAO report files

import numpy as np  # noqa: E402

from voltwake.configuration.loader import demo_path
from voltwake.design.batch import analyze_points

#: Cruise Mach numbers of the table.
MACHS = np.round(np.arange(0.70, 0.951, 0.025), 3)

FIELDS = [
    'block_fuel_kg',
    'mtow_kg',
    'cruise_lift_to_drag',
    'wave_drag_coefficient',
    'drag_divergence_mach',
]


def trade(machs=MACHS, config=None):
    """
    Size the demo at each cruise Mach number.

    Parameters
    ----------
    machs : sequence of float
        Cruise Mach numbers.
    config : str or None
        Configuration path (default: the packaged conventional demo).

    Returns
    -------
    BatchResult
        One design per Mach number, solved as one vectorised model.
    """
    path = config or demo_path('conventional')
    return analyze_points(path, {'mission.cruise_mach': list(machs)}, field_names=FIELDS)


def main():
    """Print the table."""
    result = trade()
    values = result.values
    base = values['block_fuel_kg'][0]
    divergence = values['drag_divergence_mach']
    nearest = int(np.argmin(np.abs(MACHS - divergence)))
    print('Conventional demo: block fuel against cruise Mach number (design re-sized at each)')
    print(
        f'{"Mach":>6s}{"block fuel [kg]":>17s}{"vs M 0.70":>11s}{"MTOW [kg]":>11s}'
        f'{"L/D":>8s}{"CDw [counts]":>14s}{"M_dd":>8s}'
    )
    for i, mach in enumerate(MACHS):
        mark = '  <- drag divergence' if i == nearest else ''
        print(
            f'{mach:6.3f}{values["block_fuel_kg"][i]:17,.0f}'
            f'{100 * (values["block_fuel_kg"][i] / base - 1):+10.1f}%'
            f'{values["mtow_kg"][i]:11,.0f}{values["cruise_lift_to_drag"][i]:8.2f}'
            f'{1e4 * values["wave_drag_coefficient"][i]:14.1f}{divergence[i]:8.4f}{mark}'
        )
    print(f'{int(result.closed.sum())} of {len(MACHS)} designs closed')


if __name__ == '__main__':
    main()
