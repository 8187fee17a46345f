"""
The table of a study's points: its columns' units and the CSV text of its rows.

Shared by the studies that write ``<study>_points.csv``: rows formatted here read the same
whether a study writes them all at once or chunk by chunk as it runs.
"""

import csv
import io
import math

import numpy as np
from openmdao.utils.units import convert_units

from ..configuration.loader import field_at

#: Fields written for every point of a study, with their units for the CSV header.
POINT_FIELDS = {
    'block_fuel_kg': 'kg',
    'total_fuel_kg': 'kg',
    'mtow_kg': 'kg',
    'oew_kg': 'kg',
    'cruise_lift_to_drag': '-',
    'tsfc_g_per_kN_s': 'g/(kN*s)',
    'overall_efficiency': '-',
    'power_saving_coefficient': '-',
    'aft_fan_diameter_m': 'm',
    'aft_fan_shaft_power_kW': 'kW',
    'electrical_mass_kg': 'kg',
    'aft_fan_mass_kg': 'kg',
    'engines_mass_kg': 'kg',
    'electrical_chain_efficiency': '-',
    'capture_height_m': 'm',
}


def csv_header(columns, units=None, shown=None):
    """
    Return the CSV header line of a study's columns and the factors of the shown axes.

    Parameters
    ----------
    columns : sequence of str
        The columns, in order.
    units : dict or None
        Column -> units overriding the known ones.
    shown : dict or None
        Column -> the unit the user wrote that axis in (see :func:`points_csv`).

    Returns
    -------
    tuple
        (header line with its newline, column -> factor from SI to the shown unit).
    """
    units = points_units(columns, units)
    factors = {}
    for column, unit in (shown or {}).items():
        if column in units and units[column] not in (None, '-') and unit != units[column]:
            factors[column] = float(convert_units(1.0, units[column], unit))
            units[column] = unit
    buf = io.StringIO()
    csv.writer(buf, lineterminator='\n').writerow(
        [f'{c} [{units[c]}]' if units[c] else c for c in columns]
    )
    return buf.getvalue(), factors


def csv_lines(columns, factors=None):
    """
    Return the CSV rows of columns of points, formatted as :func:`points_csv` formats rows.

    Parameters
    ----------
    columns : dict
        Column -> array (one value per point), in CSV order.
    factors : dict or None
        Column -> factor from SI to the unit shown (from :func:`csv_header`).

    Returns
    -------
    str
        One line per point.
    """
    factors = factors or {}
    cells = []
    for column, values in columns.items():
        values = np.asarray(values)
        if column in factors:
            factor = factors[column]
            cells.append([_cell(float(f'{v * factor:.12g}')) for v in values.tolist()])
        elif values.dtype.kind in 'fb' and values.size:
            # repr of a list formats its floats and flags as _cell does ('nan', shortest
            # round trip, 'True'), all at once.
            cells.append(repr(values.tolist())[1:-1].split(', '))
        else:
            cells.append([_cell(v) for v in values.tolist()])
    buf = io.StringIO()
    csv.writer(buf, lineterminator='\n').writerows(zip(*cells))
    return buf.getvalue()


def points_units(columns, units=None):
    """
    Return the units of the columns of a study's rows, as the CSV header shows them.

    Parameters
    ----------
    columns : sequence of str
        Column names: result fields, config key paths (also as ``target:<path>`` and
        ``dv:<path>`` in a target sweep) and flags or text such as ``closed``, ``reason``.
    units : dict or None
        Column -> units, overriding the known ones.

    Returns
    -------
    dict
        Column -> units (``'-'`` for a dimensionless number), or None for a column without
        units (flags, text, indices, model outputs named as targets).
    """
    known = {
        **POINT_FIELDS,
        'economic_block_fuel_kg': 'kg',
        'fuel_burn_change_percent': '%',
        'reference_block_fuel_kg': 'kg',
        'reference_economic_block_fuel_kg': 'kg',
        'reference_closed': None,
        **(units or {}),
    }
    out = {}
    for column in columns:
        if column in known:
            out[column] = known[column] or None
            continue
        path = column.split(':', 1)[1] if column.startswith(('target:', 'dv:')) else column
        field = field_at(path)
        out[column] = (field.units or '-') if field is not None else None
    return out


def _cell(value):
    if isinstance(value, float):
        return 'nan' if math.isnan(value) else repr(value)
    if isinstance(value, (list, tuple)):
        return ';'.join(str(v) for v in value)
    return value
