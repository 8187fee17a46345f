"""
The figures of a trade study: fuel-burn and PSC maps, curves, histogram, mass breakdown.

:func:`study_figures` draws the figures of one study (as written by ``voltwake sweep --out``
and by :meth:`voltwake.studies.results.StudyResult.write`) in the units a reader sees.
"""

import contextvars
import math
import os
import sys

import numpy as np
from openmdao.utils.units import convert_units

from ..configuration.loader import field_at
from ..errors import ConfigError
from ..outputs.plots import NOT_CLOSED, OK, point_status
from ..outputs.summary import (
    ANALYSIS_ONLY,
    axis_label,
    display_units,
    input_label,
    pretty_units,
)

#: The unit the user wrote each axis of the study being drawn in (path -> unit).
_WRITTEN = contextvars.ContextVar('written_axis_units', default={})


def _axis(path, values):
    """
    Return the axis label (words and units) and the values in those units.

    The units are those the user wrote the axis in, else the units a reader sees.
    """
    field = field_at(path)
    values = np.asarray(values, dtype=float)
    if field is None:  # a model output held as a target: in the output's own units
        return f'{input_label(path)} [model units]', values
    written = _WRITTEN.get().get(path)
    if written and field.units and written != field.units:
        factor = float(convert_units(1.0, field.units, written))
        return f'{input_label(path)} [{pretty_units(written)}]', values * factor
    _, factor = display_units(field.units)
    return axis_label(path, field.units), values * factor


def _label(path):
    return _axis(path, [])[0]


def _statuses(rows):
    columns = getattr(rows, 'columns', None)  # a map or Monte Carlo held as columns
    if columns is not None and 'closed' in columns:
        return [OK if closed else NOT_CLOSED for closed in columns['closed'].tolist()]
    return [point_status(r) for r in rows]


def _values(rows, key):
    """Return the ``key`` of every row as floats (NaN where a row has none)."""
    column = getattr(rows, 'column', None)
    if column is not None:
        return np.asarray(column(key), dtype=float)
    return np.array([r.get(key, math.nan) for r in rows], dtype=float)


def _grid_arrays(axes, rows, key):
    paths = list(axes)
    ny, nx = len(axes[paths[0]]), len(axes[paths[1]])
    z = _values(rows, key).reshape(ny, nx)
    status = np.array(_statuses(rows), dtype=object).reshape(ny, nx)
    closed = status != NOT_CLOSED
    _, x = _axis(paths[1], axes[paths[1]])
    _, y = _axis(paths[0], axes[paths[0]])
    return x, y, z, closed, status == OK, status


def _design_marker(config, paths):
    """Return the configured design on a map: (x, y, label) in the axes' units, or None."""
    if config is None:
        return None
    try:
        xv = _axis(paths[1], [config.values[paths[1]]])[1][0]
        yv = _axis(paths[0], [config.values[paths[0]]])[1][0]
    except (KeyError, TypeError, ValueError):
        return None
    return float(xv), float(yv), 'configured design'


def study_figures(kind, result, out_dir, config=None):
    """
    Draw the figures of one study; return the written paths.

    When matplotlib cannot be imported the study keeps its CSV and summaries, and the reason
    is returned in ``result['figures_note']`` (shown in the report) and printed on stderr.

    Parameters
    ----------
    kind : str
        ``'map'``, ``'targets'``, ``'breakeven'`` or ``'montecarlo'``.
    result : dict
        The study's numbers with its rows under ``points`` (SI); ``figures_note`` is set
        here when no figures can be drawn.
    out_dir : str
        The results directory.
    config : Config or None
        The configuration the study ran on (marks the configured design on a map).

    Returns
    -------
    list of str
        The PNG files written.
    """
    token = _WRITTEN.set(dict(result.get('axis_units') or {}))
    try:
        return _study_figures(kind, result, out_dir, config)
    finally:
        _WRITTEN.reset(token)


def _study_figures(kind, result, out_dir, config):
    """Draw the figures of one study (see :func:`study_figures`)."""
    try:
        from ..outputs import plots
    except ImportError:  # pragma: no cover - the module itself has no hard dependency
        return []
    made = []
    rows = result.get('points') or []
    try:
        axes = result.get('axes') or result.get('target_axes')
        # A map needs two values on each axis (a 1 x N grid has no area to draw).
        grid = axes and len(axes) == 2 and all(len(v) >= 2 for v in axes.values())
        if kind in ('map', 'targets') and grid:
            x, y, z, closed, ok, status = _grid_arrays(axes, rows, 'fuel_burn_change_percent')
            status = status if kind == 'targets' else None
            paths = list(axes)
            feasible = ok if kind == 'targets' else None
            marker = _design_marker(config, paths) if kind == 'map' else None
            reference = (
                'the conventional reference as configured (not optimised)'
                if kind == 'map'
                else 'the optimised conventional reference'
            )
            made.append(
                plots.plot_fuel_map(
                    x,
                    y,
                    z,
                    closed,
                    _label(paths[1]),
                    _label(paths[0]),
                    os.path.join(out_dir, f'{kind}_fuel_change.png'),
                    title=f'Fuel-burn change versus {reference}',
                    feasible=feasible,
                    marker=marker,
                    bar_label=f"{_fuel_words(result)} change versus the reference [%]",
                    status=status,
                )
            )
            _, _, psc, _, _, _ = _grid_arrays(axes, rows, 'power_saving_coefficient')
            made.append(
                plots.plot_psc_map(
                    x,
                    y,
                    psc,
                    closed,
                    _label(paths[1]),
                    _label(paths[0]),
                    os.path.join(out_dir, f'{kind}_psc.png'),
                    feasible=feasible,
                    marker=marker,
                    status=status,
                )
            )
        if kind == 'targets' and axes and len(axes) == 1:
            ((path, values),) = axes.items()
            change = [r.get('fuel_burn_change_percent', math.nan) for r in rows]
            made.append(
                plots.plot_line(
                    _axis(path, values)[1],
                    {'optimised design vs optimised reference': change},
                    _label(path),
                    f'{_fuel_words(result)} change versus the reference [%]',
                    os.path.join(out_dir, 'targets_fuel_change.png'),
                    title='Fuel-burn change of the optimised design versus the optimised reference',
                    status=_statuses(rows),
                    zero_line='break-even (0 %)',
                )
            )
        if kind == 'targets':
            best = _best_row(rows)
            ref = (result.get('reference') or {}).get('outputs')
            if best is not None and ref:
                made.append(
                    plots.plot_mass_breakdown(
                        {'optimised reference': ref, 'best target point': _row_masses(best)},
                        os.path.join(out_dir, 'targets_mass_breakdown.png'),
                        title='Mass breakdown of the best target point beside the optimised '
                        'reference',
                    )
                )
        if kind == 'breakeven' and rows:
            path = result['path']
            rows = sorted(rows, key=lambda r: r[path])
            x = _axis(path, [r[path] for r in rows])[1]
            shown, factor = display_units(result.get('units'))
            span = (
                f"{result['lower'] * factor:g}–{result['upper'] * factor:g} "
                f"{pretty_units(shown) if shown else ''}"
            ).strip()
            found = result.get('found') and result.get('value') is not None
            vertical = None
            if found:
                value = result['value'] * factor
                vertical = (value, f'break-even {value:.4g} {pretty_units(shown)}')
                title = f'Break-even {input_label(path)}: {value:.4g} {pretty_units(shown)}'
            else:
                title = f'No break-even of {input_label(path)} in {span}'
            made.append(
                plots.plot_line(
                    x,
                    {
                        'optimised design vs optimised reference': [
                            r['fuel_burn_change_percent'] for r in rows
                        ]
                    },
                    _label(path),
                    f'{_fuel_words(result)} change versus the reference [%]',
                    os.path.join(out_dir, 'breakeven.png'),
                    title=title,
                    zero_line='break-even (0 %)',
                    vertical=vertical,
                )
            )
        if kind == 'montecarlo_optimized':
            made += _optimized_monte_carlo_figures(plots, result, rows, out_dir)
        if kind == 'montecarlo':
            made.append(
                plots.plot_histogram(
                    _values(rows, 'fuel_burn_change_percent'),
                    os.path.join(out_dir, 'montecarlo.png'),
                    f'{_fuel_words(result)} change versus the reference [%]',
                    f'Monte Carlo over the technology inputs,\n{ANALYSIS_ONLY}',
                    closed=[status == OK for status in _statuses(rows)],
                    win_label='turbo-electric design wins',
                )
            )
    except ConfigError as err:  # matplotlib missing: the study still has its CSV and summaries
        result['figures_note'] = f'no figures drawn: {err.message}'
        print(f"voltwake: note: {result['figures_note']}", file=sys.stderr)
        return made
    return made


def _optimized_monte_carlo_figures(plots, result, rows, out_dir):
    """
    Draw the figures of a Monte Carlo study that re-optimises both aircraft per sample.

    The histogram of the fuel-burn change of the optima (zero marked; samples without an
    optimum counted) and the distributions of the design variables at the optima.
    """
    ok = [r.get('status') == 'optimum' for r in rows]
    if not any(ok):
        return []
    made = [
        plots.plot_histogram(
            [r.get('fuel_burn_change_percent', math.nan) for r in rows],
            os.path.join(out_dir, 'montecarlo_optimized.png'),
            f'{_fuel_words(result)} change of the optimum versus the optimised reference [%]',
            'Monte Carlo over the technology inputs, both aircraft re-optimised per sample',
            closed=ok,
            win_label='turbo-electric design wins',
            dropped_label='without an optimum',
        )
    ]
    columns = {}
    for path, entry in (result.get('design_variables') or {}).items():
        shown, factor = display_units(entry.get('units'))
        values = [
            r.get(f'dv:{path}', math.nan) * factor if good else math.nan
            for r, good in zip(rows, ok)
        ]
        label = f'{input_label(path)} [{pretty_units(shown)}]'
        columns[label] = (values, entry['lower'] * factor, entry['upper'] * factor)
    if columns:
        made.append(
            plots.plot_value_distributions(
                columns,
                os.path.join(out_dir, 'montecarlo_optimized_design.png'),
                'Design variables of the turbo-electric optima over the samples',
            )
        )
    return made


def _fuel_words(result):
    if result.get('fuel_burn_measured_on') == 'economic_block_fuel_kg':
        return 'economic-mission block-fuel'
    return 'block-fuel'


def _best_row(rows):
    done = [r for r in rows if r.get('success') and math.isfinite(r.get('block_fuel_kg', math.nan))]
    return min(done, key=lambda r: r['block_fuel_kg']) if done else None


def _row_masses(row):
    """Mass breakdown of a target-sweep row (airframe and payload from the balances)."""
    parts = {
        k: row[k]
        for k in (
            'engines_mass_kg',
            'aft_fan_mass_kg',
            'electrical_mass_kg',
            'total_fuel_kg',
            'mtow_kg',
        )
    }
    parts['airframe_mass_kg'] = (
        row['oew_kg'] - row['engines_mass_kg'] - row['aft_fan_mass_kg'] - row['electrical_mass_kg']
    )
    parts['payload_kg'] = row['mtow_kg'] - row['oew_kg'] - row['total_fuel_kg']
    return parts
