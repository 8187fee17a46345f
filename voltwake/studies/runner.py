"""
``voltwake sweep``: run the trade studies of a config's ``study`` section or of flags.

CSV, JSON/YAML summaries, plots and an HTML report are written under ``--out``.
"""

import math
import os
import sys

import numpy as np

from ..configuration.loader import field_at, load_config, parse_quantity
from ..errors import ConfigError, InterruptedRun
from ..outputs.files import write_atomic, write_results
from ..outputs.plots import NOT_CLOSED, OK, point_status
from ..outputs.report import write_report
from ..outputs.summary import axis_label, display_units, input_label, pretty_units
from .breakeven import breakeven, technology_sensitivities
from .maps import design_space_map, monte_carlo, parse_axis, points_csv
from .target_sweep import fixed_config, optimize_job, target_sweep

_STUDY_KEYS = ('map', 'targets', 'breakeven', 'uncertainty')


def _axis_from_spec(path, spec, where_path, need_count=True):
    where = {'source': 'study', 'path': where_path}
    field = field_at(path)
    if field is None or not field.target:
        raise ConfigError('not a model input; expected a config key path', **where)
    if 'values' in spec and isinstance(spec['values'], list) and spec['values']:
        return [
            parse_quantity(v, field.units, where, key=path) if field.units else float(v)
            for v in spec['values']
        ]
    keys = {'lower', 'upper', 'count'} if need_count else {'lower', 'upper'}
    if not isinstance(spec, dict) or set(spec) != keys:
        raise ConfigError(
            f'got {spec!r}; expected {{{", ".join(sorted(keys))}}} or {{values: [...]}}', **where
        )
    lo, hi = (
        parse_quantity(spec[k], field.units, where, key=path) if field.units else float(spec[k])
        for k in ('lower', 'upper')
    )
    if not need_count:
        return lo, hi
    count = spec['count']
    if isinstance(count, bool) or not isinstance(count, int) or count < 1:
        raise ConfigError(f'got count {count!r}; expected a whole number >= 1', **where)
    return list(np.linspace(lo, hi, count))


def study_spec(config, maps=(), targets=(), breakeven=None, samples=None, seed=None):
    """
    Build the study specification from command-line flags, or else the config's ``study``.

    Parameters
    ----------
    config : Config
        The configuration.
    maps, targets : sequence of str
        ``PATH=LO:HI:N`` axes of a design-space map / target sweep.
    breakeven : str or None
        ``PATH=LO:HI`` technology input of a break-even study.
    samples : int or None
        Monte Carlo samples (distributions from the config's ``study.uncertainty``).
    seed : int or None
        Monte Carlo seed.

    Returns
    -------
    dict
        Keys among ``map``, ``targets`` (path -> values), ``breakeven`` (path, lower, upper)
        and ``uncertainty`` (distributions, samples, seed).
    """
    study = config.values.get('study') or {}
    unknown = set(study) - set(_STUDY_KEYS)
    if unknown:
        raise ConfigError(
            f"unknown key {sorted(unknown)[0]!r}; expected {', '.join(_STUDY_KEYS)}",
            source=config.source,
            path='study',
        )
    spec = {}
    if maps or targets or breakeven or samples:
        for key, axes in (('map', maps), ('targets', targets)):
            if axes:
                spec[key] = {}
                for text in axes:
                    path, lo, hi, count = parse_axis(text)
                    spec[key][path] = list(np.linspace(lo, hi, count))
        if breakeven:
            path, lo, hi, _ = parse_axis(breakeven, count_required=False)
            spec['breakeven'] = (path, lo, hi)
        if samples:
            unc = study.get('uncertainty') or {}
            if not unc.get('distributions'):
                raise ConfigError(
                    '--monte-carlo needs study.uncertainty.distributions in the config',
                    source=config.source,
                    path='study.uncertainty',
                )
            spec['uncertainty'] = {
                'distributions': unc['distributions'],
                'samples': samples,
                'seed': seed if seed is not None else unc.get('seed', 1),
            }
        return spec
    for key in ('map', 'targets'):
        if key in study:
            if not isinstance(study[key], dict) or not study[key]:
                raise ConfigError(
                    'expected a mapping of config key paths to axes',
                    source=config.source,
                    path=f'study.{key}',
                )
            spec[key] = {
                path: _axis_from_spec(path, axis, f'study.{key}.{path}')
                for path, axis in study[key].items()
            }
    if 'breakeven' in study:
        entry = study['breakeven']
        if not isinstance(entry, dict) or len(entry) != 1:
            raise ConfigError(
                'expected one config key path with {lower, upper}',
                source=config.source,
                path='study.breakeven',
            )
        ((path, axis),) = entry.items()
        lo, hi = _axis_from_spec(path, axis, f'study.breakeven.{path}', need_count=False)
        spec['breakeven'] = (path, lo, hi)
    if 'uncertainty' in study:
        unc = study['uncertainty']
        if not isinstance(unc, dict) or not unc.get('distributions'):
            raise ConfigError(
                'expected distributions (and optionally samples, seed)',
                source=config.source,
                path='study.uncertainty',
            )
        spec['uncertainty'] = {
            'distributions': unc['distributions'],
            'samples': int(samples or unc.get('samples', 1000)),
            'seed': int(seed if seed is not None else unc.get('seed', 1)),
        }
    if not spec:
        raise ConfigError(
            'nothing to sweep: give --map, --targets, --breakeven or '
            '--monte-carlo, or a study section in the config',
            source=config.source,
            path='study',
        )
    return spec


def _axis(path, values):
    """Return the axis label (words and the units a reader sees) and the values in them."""
    field = field_at(path)
    values = np.asarray(values, dtype=float)
    if field is None:  # a model output held as a target: in the output's own units
        return f'{input_label(path)} [model units]', values
    _, factor = display_units(field.units)
    return axis_label(path, field.units), values * factor


def _label(path):
    return _axis(path, [])[0]


def _statuses(rows):
    return [point_status(r) for r in rows]


def _grid_arrays(axes, rows, key):
    paths = list(axes)
    ny, nx = len(axes[paths[0]]), len(axes[paths[1]])
    z = np.array([r.get(key, math.nan) for r in rows], dtype=float).reshape(ny, nx)
    status = np.array(_statuses(rows), dtype=object).reshape(ny, nx)
    closed = status != NOT_CLOSED
    _, x = _axis(paths[1], axes[paths[1]])
    _, y = _axis(paths[0], axes[paths[0]])
    return x, y, z, closed, status == OK


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


def _plots(kind, result, out_dir, config=None):
    """
    Draw the figures of one study; return the written paths.

    When matplotlib cannot be imported the study keeps its CSV and summaries, and the reason
    is returned in ``result['figures_note']`` (shown in the report) and printed on stderr.
    """
    try:
        from ..outputs import plots
    except ImportError:  # pragma: no cover - the module itself has no hard dependency
        return []
    made = []
    rows = result.get('points') or []
    try:
        axes = result.get('axes') or result.get('target_axes')
        if kind in ('map', 'targets') and axes and len(axes) == 2:
            x, y, z, closed, ok = _grid_arrays(axes, rows, 'fuel_burn_change_percent')
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
                )
            )
            _, _, psc, _, _ = _grid_arrays(axes, rows, 'power_saving_coefficient')
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
        if kind == 'montecarlo':
            made.append(
                plots.plot_histogram(
                    [r.get('fuel_burn_change_percent', math.nan) for r in rows],
                    os.path.join(out_dir, 'montecarlo.png'),
                    f'{_fuel_words(result)} change versus the reference [%]',
                    'Monte Carlo over the technology inputs',
                    closed=[point_status(r) == OK for r in rows],
                    win_label='turbo-electric design wins',
                )
            )
    except ConfigError as err:  # matplotlib missing: the study still has its CSV and summaries
        result['figures_note'] = f'no figures drawn: {err.message}'
        print(f"voltwake: note: {result['figures_note']}", file=sys.stderr)
        return made
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


def run_sweep(config, spec, jobs=None, out_dir=None, progress=None):
    """
    Run every study of ``spec`` and write its outputs.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration.
    spec : dict
        From :func:`study_spec`.
    jobs : int or None
        Local processes for the optimisations (default: all cores).
    out_dir : str or None
        Results directory (already prepared), or None to write nothing.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` for the optimisations.

    Returns
    -------
    dict
        Study kind -> its summary (points left out; they go to CSV).
    """
    config = load_config(config)
    summaries = {}
    for kind in ('map', 'targets', 'breakeven', 'uncertainty'):
        if kind not in spec:
            continue
        name = {'uncertainty': 'montecarlo'}.get(kind, kind)
        try:
            result = _run_study(kind, config, spec, jobs, progress)
        except KeyboardInterrupt:
            if out_dir:
                write_results(
                    out_dir,
                    f'{name}_summary',
                    {
                        'status': 'partial',
                        'kind': kind,
                        'message': f'interrupted by the user during the {kind} study; the '
                        'studies before it are complete, this one has no results',
                        'completed_studies': list(summaries),
                    },
                )
            raise InterruptedRun(
                f'sweep interrupted during the {kind} study', {'completed_studies': list(summaries)}
            ) from None
        points = result.pop('points', None)
        summaries[name] = result
        if points is not None:
            result['points_count'] = len(points)
            result['closed_count'] = sum(bool(r.get('closed', r.get('success'))) for r in points)
        if out_dir:
            if points:
                write_atomic(os.path.join(out_dir, f'{name}_points.csv'), points_csv(points))
                result['points'] = points
            plots = _plots(result.get('kind', name), result, out_dir, config)
            result.pop('points', None)
            result['plots'] = [os.path.basename(p) for p in plots]
            # The configuration the study ran on, for the report's collapsible copy.
            write_results(
                out_dir,
                f'{name}_summary',
                {'status': 'complete', **_clean(result), 'config': config.data},
            )
    if out_dir:
        write_report(out_dir)
    return summaries


def _run_study(kind, config, spec, jobs, progress):
    """Run one study and return its result (with its ``points``)."""
    if kind == 'map':
        return design_space_map(config, spec['map'])
    if kind == 'targets':
        result = target_sweep(config, spec['targets'], jobs=jobs, progress=progress)
        result['kind'] = 'targets'
        result['target_axes'] = {p: [float(v) for v in vals] for p, vals in spec['targets'].items()}
        return result
    if kind == 'breakeven':
        path, lo, hi = spec['breakeven']
        result = breakeven(config, path, lo, hi, jobs=jobs)
        result['kind'] = 'breakeven'
        result['sensitivities'] = technology_sensitivities(config)
        if result.get('found'):
            result['design_at_value'] = _optimum_at(config, path, result['value'])
        # Every optimised evaluation of the root solve is a point of the study's CSV.
        result['points'] = [
            {
                result['path']: e['value'],
                'fuel_burn_change_percent': e['difference'],
                'block_fuel_kg': e['block_fuel_kg'],
            }
            for e in result.get('evaluations', [])
        ]
        return result
    unc = spec['uncertainty']
    return monte_carlo(config, unc['distributions'], unc['samples'], unc['seed'])


def _optimum_at(config, path, value):
    """
    Optimise the design with ``path`` fixed at ``value``: what holds it at the break-even.

    Returns
    -------
    dict
        ``success``, ``message``, ``design`` (path -> value) and ``active`` (active
        constraints and ``'bound:<path>'`` for design variables at a bound).
    """
    res = optimize_job({'data': fixed_config(config, {path: value}).data})
    return {k: res[k] for k in ('success', 'message', 'design', 'active')}


def _clean(value):
    """Make a result JSON-ready and deterministic (NaN -> None, numpy -> Python)."""
    if isinstance(value, dict):
        return {str(k): _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    if isinstance(value, np.ndarray):
        return [_clean(v) for v in value.tolist()]
    if isinstance(value, (np.floating, float)):
        value = float(value)
        return None if math.isnan(value) or math.isinf(value) else value
    if isinstance(value, np.integer):
        return int(value)
    if isinstance(value, np.bool_):
        return bool(value)
    return value
