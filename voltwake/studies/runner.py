"""
Run the trade studies, from Python or from ``voltwake sweep``.

:func:`design_map`, :func:`target_sweep`, :func:`breakeven` and :func:`monte_carlo`
(exported as ``voltwake.design_map``...) take their inputs with units or in SI and return
the result objects of :mod:`voltwake.studies.results`. ``voltwake sweep`` reads the same
studies from its flags or the config's ``study`` section (:func:`study_spec`) and runs them
through the same code (:func:`run_sweep`), writing CSV, JSON/YAML summaries, figures and an
HTML report under ``--out``.
"""

import difflib
import math
import numbers
import os
from collections.abc import Mapping

import numpy as np

from ..configuration.loader import (
    _check_field,
    absent_input_hint,
    field_at,
    input_paths,
    load_config,
    parse_quantity,
    written_unit,
)
from ..design.batch import decimal_grid
from ..errors import ConfigError, InterruptedRun
from ..outputs.files import write_results
from ..outputs.report import write_report
from ..outputs.summary import ANALYSIS_ONLY
from .breakeven import breakeven as _breakeven
from .breakeven import no_breakeven_message
from .breakeven_optimum import explain_breakeven
from .chunked import chunk_size_or_error, stream_to_csv
from .figures import study_figures as _plots  # noqa: F401 - the name earlier callers use
from .maps import design_space_map, parse_axis
from .maps import monte_carlo as _monte_carlo
from .optimized_monte_carlo import optimized_monte_carlo
from .results import (
    BreakevenResult,
    DesignMapResult,
    MonteCarloResult,
    StudyResult,
    TargetSweepResult,
)
from .target_sweep import is_config_input, output_axis
from .target_sweep import target_sweep as _target_sweep

_STUDY_KEYS = ('map', 'targets', 'breakeven', 'uncertainty')


_AXIS_KEYS = ('lower', 'upper', 'count', 'values')
_UNCERTAINTY_KEYS = ('distributions', 'samples', 'seed')
_DISTRIBUTION_SIZES = {'uniform': 2, 'triangular': 3}
_DISTRIBUTION_FORM = '{uniform: [lo, hi]} or {triangular: [lo, mode, hi]}'


def _study_where(config, parts):
    """Return the ConfigError keywords (file, line, key path) of a key of the study section."""
    return config.where(('study', *parts))


def _unknown(key, known, where, what='key'):
    """Raise the error of an unknown key, with a did-you-mean suggestion when one is close."""
    close = difflib.get_close_matches(str(key), list(known), n=1, cutoff=0.6)
    hint = f" (did you mean '{close[0]}'?)" if close else ''
    raise ConfigError(f"unknown {what}{hint}; expected one of {', '.join(known)}", **where)


def _study_input(config, parts):
    """
    Return the schema field of the config key path that ends ``parts``, or raise.

    The path must name a numeric model input of this design (a misspelt one gets a
    did-you-mean, an input the design does not have says why).
    """
    path = parts[-1]
    where = _study_where(config, parts)
    field = field_at(path)
    if field is None or not field.target:
        close = difflib.get_close_matches(path, input_paths(), n=1, cutoff=0.6)
        hint = f" (did you mean '{close[0]}'?)" if close else ''
        raise ConfigError(
            f'not a model input{hint}; expected a config key path such as '
            "'aft_fan.thrust_fraction'",
            **where,
        )
    if field.target not in config.model_inputs():
        raise ConfigError(
            f'not a model input of this design{absent_input_hint(config, path)}', **where
        )
    return field


def _study_value(config, field, path, value, parts):
    """
    Check one value of a study the way the same key is checked in its own section.

    Units are converted (a bare number is held to the key's plausible range) and the key's
    physical check applies; the error names the study key's file, line and path.

    Returns
    -------
    float
        The value in SI.
    """
    where = _study_where(config, parts)
    try:
        return float(_check_field(field, value, {**where, 'path': path}))
    except ConfigError as err:
        raise ConfigError(err.detail, **where) from None


def _study_whole(value, least, where):
    """Return a whole number >= ``least`` of the study section, or raise."""
    if isinstance(value, bool) or not isinstance(value, numbers.Integral) or value < least:
        raise ConfigError(f'got {value!r}; expected a whole number >= {least}', **where)
    return int(value)


def _axis_from_spec(config, kind, path, spec, need_count=True):
    """
    Read one axis of the study section: ``study.<kind>.<path>``.

    Parameters
    ----------
    config : Config
        The configuration (for the file, the lines and the design's inputs).
    kind : str
        'map', 'targets' or 'breakeven'.
    path : str
        The config key path swept (as written: one key of the study section).
    spec : object
        ``{lower, upper, count}`` (``{lower, upper}`` for a break-even) or ``{values: [...]}``.
    need_count : bool
        Whether the axis is a grid (False for a break-even interval).

    Returns
    -------
    list of float or tuple of float
        The grid values, or (lower, upper) for a break-even; SI.
    """
    path = str(path)
    parts = (kind, path)
    where = _study_where(config, parts)
    field = _study_input(config, parts)
    known = _AXIS_KEYS if need_count else ('lower', 'upper')
    form = '{lower, upper, count} or {values: [...]}' if need_count else '{lower, upper}'
    if not isinstance(spec, dict):
        raise ConfigError(f'got {spec!r}; expected {form}', **where)
    for key in spec:
        if key not in known:
            _unknown(key, known, _study_where(config, (*parts, str(key))))
    if 'values' in spec:
        values = spec['values']
        if set(spec) != {'values'}:
            raise ConfigError(f'got {spec!r}; expected {form}, not both', **where)
        if not isinstance(values, list) or not values:
            raise ConfigError(
                f'got {values!r}; expected a non-empty list of values',
                **_study_where(config, (*parts, 'values')),
            )
        return [
            _study_value(config, field, path, v, (*parts, 'values', str(i)))
            for i, v in enumerate(values)
        ]
    needed = ('lower', 'upper', 'count') if need_count else ('lower', 'upper')
    missing = [key for key in needed if key not in spec]
    if missing:
        raise ConfigError(f"missing key '{missing[0]}'; expected {form}", **where)
    lo, hi = (_study_value(config, field, path, spec[k], (*parts, k)) for k in ('lower', 'upper'))
    if not need_count:
        if not lo < hi:
            raise ConfigError(
                f"got lower {spec['lower']!r} and upper {spec['upper']!r}; expected lower < upper",
                **where,
            )
        return lo, hi
    count = _study_whole(spec['count'], 1, _study_where(config, (*parts, 'count')))
    return decimal_grid(lo, hi, count)


def _uncertainty_from_spec(config, unc, samples=None, seed=None):
    """
    Read and check ``study.uncertainty``: its distributions, samples and seed.

    Parameters
    ----------
    config : Config
        The configuration.
    unc : object
        The section as written.
    samples, seed : int or None
        Values from the command line, which take precedence.

    Returns
    -------
    dict
        ``distributions`` (as written, every path and value checked), ``samples``, ``seed``.
    """
    where = _study_where(config, ('uncertainty',))
    if not isinstance(unc, dict):
        raise ConfigError(
            f'got {unc!r}; expected a mapping with distributions (and optionally samples, seed)',
            **where,
        )
    for key in unc:
        if key not in _UNCERTAINTY_KEYS:
            _unknown(key, _UNCERTAINTY_KEYS, _study_where(config, ('uncertainty', str(key))))
    dists = unc.get('distributions')
    if not isinstance(dists, dict) or not dists:
        raise ConfigError(
            'missing distributions; expected a mapping of config key paths to '
            f'{_DISTRIBUTION_FORM}',
            **(_study_where(config, ('uncertainty', 'distributions')) if dists else where),
        )
    for path, spec in dists.items():
        parts = ('uncertainty', 'distributions', str(path))
        field = _study_input(config, parts)
        if not isinstance(spec, dict) or len(spec) != 1:
            raise ConfigError(
                f'got {spec!r}; expected {_DISTRIBUTION_FORM}', **_study_where(config, parts)
            )
        ((shape, params),) = spec.items()
        if shape not in _DISTRIBUTION_SIZES:
            _unknown(
                shape,
                tuple(_DISTRIBUTION_SIZES),
                _study_where(config, (*parts, str(shape))),
                what='distribution',
            )
        size = _DISTRIBUTION_SIZES[shape]
        if not isinstance(params, list) or len(params) != size:
            names = '[lo, hi]' if size == 2 else '[lo, mode, hi]'
            raise ConfigError(
                f'got {params!r}; expected {size} values {names}',
                **_study_where(config, (*parts, shape)),
            )
        vals = [
            _study_value(config, field, str(path), v, (*parts, shape, str(i)))
            for i, v in enumerate(params)
        ]
        if vals != sorted(vals) or vals[0] == vals[-1]:
            raise ConfigError(
                f'got {params!r}; expected lo < hi (and lo <= mode <= hi)',
                **_study_where(config, (*parts, shape)),
            )
    if samples is None:
        samples = _study_whole(
            unc.get('samples', 1000), 1, _study_where(config, ('uncertainty', 'samples'))
        )
    if seed is None:
        seed = _study_whole(unc.get('seed', 1), 0, _study_where(config, ('uncertainty', 'seed')))
    return {'distributions': dists, 'samples': samples, 'seed': seed}


def study_spec(
    config, maps=(), targets=(), breakeven=None, samples=None, seed=None, optimize=False
):
    """
    Build the study specification from command-line flags, or else the config's ``study``.

    Every key of the ``study`` section read is checked like the rest of the config: an
    unknown study kind or key, or a misspelt config key path, gets a did-you-mean; values
    are converted from their units (a bare number is held to the key's plausible range)
    and held to the key's physical check; errors name the file, line and key path.

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
    optimize : bool
        Re-optimise both aircraft at every Monte Carlo sample (needs ``samples`` and an
        ``optimization`` section).

    Returns
    -------
    dict
        Keys among ``map``, ``targets`` (path -> values), ``breakeven`` (path, lower, upper)
        and ``uncertainty`` (distributions, samples, seed and ``optimize``).
    """
    study = config.values.get('study') or {}
    for key in study:
        if key not in _STUDY_KEYS:
            _unknown(key, _STUDY_KEYS, _study_where(config, (str(key),)), what='study kind')
    if samples is not None:
        samples = _study_whole(samples, 1, {'source': '--monte-carlo'})
    if seed is not None:
        seed = _study_whole(seed, 0, {'source': '--seed'})
    if optimize:
        _check_optimize(config, samples)
    spec = {}
    if maps or targets or breakeven or samples is not None:
        for key, axes in (('map', maps), ('targets', targets)):
            if axes:
                spec[key] = {}
                for text in axes:
                    name = str(text).partition('=')[0].strip()
                    if key == 'targets' and not is_config_input(name):
                        # A model output held as an equality constraint, in its own units.
                        path, lo, hi, count, _ = output_axis(config, text)
                        spec[key][path] = decimal_grid(lo, hi, count)
                        continue
                    path, lo, hi, count = parse_axis(text)
                    spec[key][path] = decimal_grid(lo, hi, count)
                    unit = _written_units(str(text).partition('=')[2].split(':')[:2])
                    if unit:
                        spec.setdefault('axis_units', {})[path] = unit
        if breakeven:
            path, lo, hi, _ = parse_axis(breakeven, count_required=False)
            spec['breakeven'] = (path, lo, hi)
            spec['breakeven_units'] = _written_units(str(breakeven).partition('=')[2].split(':'))
        if samples is not None:
            if 'uncertainty' not in study:
                raise ConfigError(
                    '--monte-carlo needs study.uncertainty.distributions in the config',
                    source=config.source,
                    path='study.uncertainty',
                )
            spec['uncertainty'] = _uncertainty_from_spec(
                config, study['uncertainty'], samples, seed
            )
            spec['uncertainty']['optimize'] = bool(optimize)
        return spec
    for key in ('map', 'targets'):
        if key in study:
            if not isinstance(study[key], dict) or not study[key]:
                raise ConfigError(
                    f'got {study[key]!r}; expected a mapping of config key paths to axes',
                    **_study_where(config, (key,)),
                )
            spec[key] = {
                str(path): _axis_from_spec(config, key, path, axis)
                for path, axis in study[key].items()
            }
            for path, axis in study[key].items():
                written = (
                    [axis.get('lower'), axis.get('upper')] + list(axis.get('values') or [])
                    if isinstance(axis, dict)
                    else []
                )
                unit = _written_units(written)
                if unit:
                    spec.setdefault('axis_units', {})[str(path)] = unit
    if 'breakeven' in study:
        entry = study['breakeven']
        if not isinstance(entry, dict) or len(entry) != 1:
            raise ConfigError(
                f'got {entry!r}; expected one config key path with {{lower, upper}}',
                **_study_where(config, ('breakeven',)),
            )
        ((path, axis),) = entry.items()
        lo, hi = _axis_from_spec(config, 'breakeven', path, axis, need_count=False)
        spec['breakeven'] = (str(path), lo, hi)
        if isinstance(axis, dict):
            spec['breakeven_units'] = _written_units([axis.get('lower'), axis.get('upper')])
    if 'uncertainty' in study:
        spec['uncertainty'] = _uncertainty_from_spec(config, study['uncertainty'], samples, seed)
    if not spec:
        raise ConfigError(
            'nothing to sweep: give --map, --targets, --breakeven or '
            '--monte-carlo, or a study section in the config',
            source=config.source,
            path='study',
        )
    return spec


def _check_optimize(config, samples):
    """Raise ConfigError unless a re-optimised Monte Carlo study can run on ``config``."""
    if not samples:
        raise ConfigError(
            'needs --monte-carlo N: it re-optimises both aircraft at every Monte Carlo sample',
            source='--optimize',
        )
    if 'optimization.design_variables' not in config.values:
        raise ConfigError(
            "needs an 'optimization' section in the config (design_variables, constraints "
            'and an objective)',
            source='--optimize',
        )


def run_sweep(config, spec, jobs=None, out_dir=None, progress=None, chunk_size=None):
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
        ``progress(done, failed, total, elapsed)`` for the optimisations (and, in points,
        after every chunk of a map or Monte Carlo).
    chunk_size : int or None
        Points per vectorised solve of a map or Monte Carlo (default
        :data:`voltwake.studies.chunked.DEFAULT_CHUNK_SIZE`); their rows are appended to
        the CSV under ``out_dir`` chunk by chunk.

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
        if kind == 'uncertainty' and spec['uncertainty'].get('optimize'):
            name = 'montecarlo_optimized'
        try:
            result = _run_study(
                kind, config, spec, jobs, progress, out_dir=out_dir, chunk_size=chunk_size
            )
        except InterruptedRun as stop:
            # A study that keeps its finished points (the re-optimised Monte Carlo) hands
            # them over: its CSV and a summary with status 'partial'.
            if out_dir and isinstance(stop.partial, StudyResult):
                stop.partial.write_files(out_dir)
            raise
        except KeyboardInterrupt as stop:
            partial = getattr(stop, 'partial', None)
            if out_dir:
                message = (
                    f'interrupted by the user during the {kind} study; the '
                    'studies before it are complete, this one has no results'
                )
                if partial:
                    message = (
                        f'interrupted by the user during the {kind} study after '
                        f"{partial['points_done']} of {partial['points_total']} points; the "
                        f'finished chunks are in {name}_points.csv'
                    )
                write_results(
                    out_dir,
                    f'{name}_summary',
                    {
                        'status': 'partial',
                        'kind': kind,
                        'message': message,
                        **(partial or {}),
                        'completed_studies': list(summaries),
                    },
                )
            after = (
                f" after {partial['points_done']} of {partial['points_total']} points"
                if partial
                else ''
            )
            raise InterruptedRun(
                f'sweep interrupted during the {kind} study{after}',
                {'completed_studies': list(summaries)},
            ) from None
        summaries[name] = result.data
        if out_dir:
            result.write_files(out_dir)
    if out_dir:
        write_report(out_dir)
    return summaries


def _points_sink(out_dir, name, config, spec, written):
    """Return the CSV writer of a chunked study under ``out_dir`` (None without one)."""
    if not out_dir:
        return None
    shown = {**written, **{f'target:{p}': u for p, u in written.items()}}
    return stream_to_csv(os.path.join(out_dir, f'{name}_points.csv'), None, shown)


def _run_chunked_study(kind, config, spec, jobs, progress, out_dir, chunk_size):
    """Run a map or an analysis-only Monte Carlo in chunks, its rows streamed to CSV."""
    written = spec.get('axis_units') or {}
    if kind == 'map':
        written = {p: u for p, u in written.items() if p in spec['map']}
    else:
        unc = spec['uncertainty']
        written = {
            path: unit
            for path, shape in unc['distributions'].items()
            if isinstance(shape, Mapping)
            for unit in [_written_units([v for params in shape.values() for v in _as_list(params)])]
            if unit
        }
    name = 'map' if kind == 'map' else 'montecarlo'
    sink = _points_sink(out_dir, name, config, spec, written)
    options = {'chunk_size': chunk_size, 'jobs': jobs, 'progress': progress, 'sink': sink}
    try:
        if kind == 'map':
            result = design_space_map(config, spec['map'], **options)
        else:
            result = _monte_carlo(
                config, unc['distributions'], unc['samples'], unc['seed'], **options
            )
    finally:
        if sink is not None:
            sink.close()
    result['axis_units'] = written
    if kind != 'map':
        result['analysis'] = ANALYSIS_ONLY
    cls = DesignMapResult if kind == 'map' else MonteCarloResult
    study = cls.from_study(result, config)
    if sink is not None:
        study.streamed = os.path.join(out_dir, f'{name}_points.csv')
    return study


def _run_study(kind, config, spec, jobs, progress, xtol=None, out_dir=None, chunk_size=None):
    """Run one study of ``spec`` (values in SI) and return its result object."""
    written = spec.get('axis_units') or {}
    if kind == 'map' or (kind == 'uncertainty' and not spec['uncertainty'].get('optimize')):
        return _run_chunked_study(kind, config, spec, jobs, progress, out_dir, chunk_size)
    if kind == 'targets':
        result = _target_sweep(config, spec['targets'], jobs=jobs, progress=progress)
        result['axis_units'] = {p: u for p, u in written.items() if p in spec['targets']}
        result['kind'] = 'targets'
        result['target_axes'] = {p: [float(v) for v in vals] for p, vals in spec['targets'].items()}
        return TargetSweepResult.from_study(result, config)
    if kind == 'breakeven':
        path, lo, hi = spec['breakeven']
        result = _breakeven(config, path, lo, hi, jobs=jobs, xtol=xtol)
        result['kind'] = 'breakeven'
        explain_breakeven(config, result)
        _add_display(result, spec.get('breakeven_units'))
        if not result['found']:
            result['message'] = no_breakeven_message(result)
        elif result.get('display'):
            shown = result['display']
            result['message'] = result['message'].replace(
                f"{result['value']:.6g} {result['units']}", f"{shown['value']:.6g} {shown['units']}"
            )
        # Every optimised evaluation of the root solve is a point of the study's CSV.
        result['points'] = [
            {
                result['path']: e['value'],
                'fuel_burn_change_percent': e['difference'],
                'block_fuel_kg': e['block_fuel_kg'],
            }
            for e in result.get('evaluations', [])
        ]
        return BreakevenResult.from_study(result, config)
    unc = spec['uncertainty']
    written = {
        path: unit
        for path, shape in unc['distributions'].items()
        if isinstance(shape, Mapping)
        for unit in [_written_units([v for params in shape.values() for v in _as_list(params)])]
        if unit
    }
    return optimized_monte_carlo(
        config,
        unc['distributions'],
        unc['samples'],
        unc['seed'],
        jobs=jobs,
        progress=progress,
        written=written,
    )


def _as_list(params):
    """Return a distribution's parameters as a list (one value as a list of one)."""
    return list(params) if isinstance(params, (list, tuple)) else [params]


def _written_units(values):
    """Return the unit the first of ``values`` written with a unit has, or None."""
    for value in values:
        unit = written_unit(value.strip() if isinstance(value, str) else value)
        if unit is not None:
            return unit
    return None


def _add_display(result, units):
    """Give a break-even its value and interval in the unit the user wrote (``display``)."""
    si = result.get('units')
    if not units or not si or units == si:
        return
    from openmdao.utils.units import convert_units

    def shown(value):
        if value is None or not math.isfinite(value):
            return value
        return float(convert_units(value, si, units))

    result['display'] = {
        'units': units,
        **{key: shown(result.get(key)) for key in ('value', 'lower', 'upper')},
    }


# --- The studies from Python -----------------------------------------------------------------


def design_map(config, axes, overrides=None, chunk_size=None, jobs=1):
    """
    Analyse a full-factorial grid of designs in vectorised chunks (a design-space map).

    The same study as ``voltwake sweep --map``: every point is sized (analysis only, no
    optimisation) and compared with the conventional reference as configured, or, when an
    axis is an input the reference shares (``mission.range``...), with the reference at that
    point's values (``reference_follows`` in the summary); points that do not close keep
    their row with the reason.

    Parameters
    ----------
    config : Config, dict, str or None
        A Config, a mapping, a YAML file, the name of a packaged demo
        (``'demo_turbo_electric'``) or None for the turbo-electric demo.
    axes : dict
        Config key path -> its values: a sequence of numbers (SI; a bare number is held to
        the key's plausible range, as in a config file) or strings with units
        (``'2 kW/kg'``), or the command line's ``'LO:HI:N'`` (``'5 kW/kg:20 kW/kg:4'``).
        Full factorial; the first axis varies slowest.
    overrides : dict or None
        Config key path -> value applied to the configuration first.
    chunk_size : int or None
        Points per vectorised solve (default
        :data:`voltwake.studies.chunked.DEFAULT_CHUNK_SIZE`); the numbers do not depend on
        it.
    jobs : int or None
        Local processes over which the chunks run (default 1; None for all cores).

    Returns
    -------
    DesignMapResult
        Per-point arrays with their units, the summary, ``to_csv`` and ``write``.
    """
    chunk_size = chunk_size_or_error(chunk_size, 'chunk_size')
    config = load_config(config, overrides)
    written = {}
    spec = {'map': _axes(config, axes, 'design_map', 'map', written), 'axis_units': written}
    return _run_study('map', config, spec, jobs, None, chunk_size=chunk_size)


def target_sweep(config, targets, jobs=None, progress=None, overrides=None):
    """
    Optimise the design at every point of a full-factorial grid of targets.

    The same study as ``voltwake sweep --targets``: at each point the swept config inputs
    are fixed (and leave the design variables), swept model outputs become equality
    constraints, every other design variable is optimised, and the optimum is compared with
    the optimised conventional reference. Needs an ``optimization`` section.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration (see :func:`design_map`).
    targets : dict
        Config key path -> values, as the axes of :func:`design_map`; or a model output
        (``'power_saving_coefficient'``) -> a sequence of numbers in that output's units.
        The first target varies slowest.
    jobs : int or None
        Local processes for the optimisations (default: all cores); the rows do not depend
        on it.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` after each optimisation.
    overrides : dict or None
        Config key path -> value applied to the configuration first.

    Returns
    -------
    TargetSweepResult
        Per-point arrays with their units, the summary, ``to_csv`` and ``write``.
    """
    config = load_config(config, overrides)
    written = {}
    spec = {
        'targets': _axes(config, targets, 'target_sweep', 'targets', written),
        'axis_units': written,
    }
    return _run_study('targets', config, spec, jobs, progress)


def breakeven(config, path, lower, upper, jobs=None, xtol=None, overrides=None):
    """
    Find the technology value at which the design burns the fuel of the optimised reference.

    The same study as ``voltwake sweep --breakeven``: Brent's method on the fuel-burn
    difference of the optimised turbo-electric design (input fixed) against the optimised
    conventional reference, with the sensitivities of block fuel to every technology input
    and, when a break-even is found, what holds the optimum there.

    Parameters
    ----------
    config : Config, dict, str or None
        A turbo-electric configuration with an ``optimization`` section (see
        :func:`design_map`).
    path : str
        A numeric input of the ``aft_fan`` or ``electrical`` section, e.g.
        ``'electrical.motor.specific_power'``.
    lower, upper : float or str
        The search interval: numbers in SI or strings with units (``'2 kW/kg'``).
    jobs : int or None
        Local processes for the first optimisations (default: all cores).
    xtol : float or None
        Tolerance on the value, SI (default: 1e-5 of the interval).
    overrides : dict or None
        Config key path -> value applied to the configuration first.

    Returns
    -------
    BreakevenResult
        ``found``, ``value`` (SI), the evaluations as per-point arrays with their units, the
        summary, ``to_csv`` and ``write``.
    """
    config = load_config(config, overrides)
    path = str(path)
    field = field_at(path)
    where = {'source': 'breakeven', 'path': path}
    shown = _written_units([lower, upper])
    lower, upper = (
        parse_quantity(v, field.units, where, key=path)
        if field is not None and field.units
        else _number(v, where)
        for v in (lower, upper)
    )
    spec = {'breakeven': (path, lower, upper), 'breakeven_units': shown}
    return _run_study('breakeven', config, spec, jobs, None, xtol)


def monte_carlo(
    config=None,
    samples=None,
    seed=None,
    distributions=None,
    overrides=None,
    optimize=False,
    chunk_size=None,
    jobs=None,
    progress=None,
):
    """
    Sample technology inputs; analyse the configured design, or re-optimise both aircraft.

    The same study as ``voltwake sweep --monte-carlo``: analysis only (configured design
    point, not re-optimised), every sample evaluated as one vectorised model against the
    conventional reference as configured. With ``optimize=True`` (``--optimize``) the
    turbo-electric design and its conventional reference are optimised at every sample to
    the same objective and constraints, and the probability that the turbo-electric optimum
    wins comes with its 95 % Wilson score interval.

    Parameters
    ----------
    config : Config, dict, str or None
        A turbo-electric configuration (see :func:`design_map`).
    samples : int or None
        Number of samples (default: ``study.uncertainty.samples`` of the config, else 1000).
    seed : int or None
        Seed of the random generator (default: ``study.uncertainty.seed``, else 1); the same
        seed gives the same samples.
    distributions : dict or None
        Config key path -> ``{'uniform': [lo, hi]}`` or ``{'triangular': [lo, mode, hi]}``
        (numbers in SI or strings with units); default: the config's
        ``study.uncertainty.distributions``.
    overrides : dict or None
        Config key path -> value applied to the configuration first.
    optimize : bool
        Re-optimise both aircraft at every sample (needs an ``optimization`` section).
    chunk_size : int or None
        Samples per vectorised solve of the analysis-only study (see :func:`design_map`).
    jobs : int or None
        Local processes: for the optimisations with ``optimize`` (default: all cores), else
        over which the chunks run (default: this process). The rows do not depend on it.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` after each optimisation, or each chunk.

    Returns
    -------
    MonteCarloResult or OptimizedMonteCarloResult
        ``probability_of_win``, the statistics of the fuel-burn change, the samples as
        per-point arrays with their units, the summary, ``to_csv`` and ``write``; with
        ``optimize``, also ``probability_of_win_interval`` and per sample its ``status``.
    """
    chunk_size = chunk_size_or_error(chunk_size, 'chunk_size')
    if jobs is None and not optimize:
        jobs = 1
    config = load_config(config, overrides)
    where = {'source': 'monte_carlo'}
    if optimize and 'optimization.design_variables' not in config.values:
        raise ConfigError(
            "optimize=True needs an 'optimization' section in the config (design_variables, "
            'constraints and an objective)',
            source=config.source,
        )
    samples = None if samples is None else _study_whole(samples, 1, where)
    seed = None if seed is None else _study_whole(seed, 0, where)
    study = config.values.get('study') or {}
    if distributions is None:
        if 'uncertainty' not in study:
            raise ConfigError(
                'no distributions: give distributions={path: {uniform: [lo, hi]}, ...} or a '
                'study.uncertainty.distributions section in the config',
                source=config.source,
                path='study.uncertainty',
            )
        # The config's section, checked as `voltwake sweep` checks it (file, line, key).
        spec = {'uncertainty': _uncertainty_from_spec(config, study['uncertainty'], samples, seed)}
        spec['uncertainty']['optimize'] = bool(optimize)
        return _run_study('uncertainty', config, spec, jobs, progress, chunk_size=chunk_size)
    if not isinstance(distributions, Mapping) or not distributions:
        raise ConfigError(
            f'got {distributions!r}; expected a mapping of config key paths to distributions',
            **where,
        )
    configured = study.get('uncertainty') if isinstance(study.get('uncertainty'), dict) else {}
    samples = (
        _study_whole(configured.get('samples', 1000), 1, where) if samples is None else samples
    )
    seed = _study_whole(configured.get('seed', 1), 0, where) if seed is None else seed
    spec = {
        'uncertainty': {
            'distributions': dict(distributions),
            'samples': samples,
            'seed': seed,
            'optimize': bool(optimize),
        }
    }
    return _run_study('uncertainty', config, spec, jobs, progress, chunk_size=chunk_size)


def _axes(config, axes, source, kind, written=None):
    """
    Return the axes of a map (``kind`` 'map') or target sweep ('targets') in SI.

    The unit each axis was written in goes into ``written`` (path -> unit), when given.
    """
    if not isinstance(axes, Mapping) or not axes:
        raise ConfigError(
            f'got {axes!r}; expected a mapping of config key paths to values', source=source
        )
    out = {}
    for path, axis in axes.items():
        path = str(path)
        where = {'source': source, 'path': path}
        if kind == 'targets' and not is_config_input(path):
            # A model output held as a target: numbers in its own units ('LO:HI:N' with
            # units as on the command line); the sweep checks the name against the outputs.
            if isinstance(axis, str):
                _, lo, hi, count, _ = output_axis(config, f'{path}={axis}')
                out[path] = decimal_grid(lo, hi, count)
                continue
            out[path] = [_number(v, where) for v in _sequence(axis, where, grid=False)]
            continue
        field = field_at(path)
        if field is None or not field.target:
            close = difflib.get_close_matches(path, input_paths(), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ''
            raise ConfigError(
                f'not a model input{hint}; expected a config key path such as '
                "'aft_fan.thrust_fraction'",
                **where,
            )
        if isinstance(axis, str):  # 'LO:HI:N', read as the command line reads it
            flag = {'map': 'maps', 'targets': 'targets'}[kind]
            try:
                spec = study_spec(config, **{flag: [f'{path}={axis}']})
            except ConfigError as err:
                raise ConfigError(err.detail, **where) from None
            out[path] = spec[kind][path]
            if written is not None and path in spec.get('axis_units', {}):
                written[path] = spec['axis_units'][path]
            continue
        unit = _written_units(list(_sequence(axis, where)))
        if written is not None and unit:
            written[path] = unit
        out[path] = [
            parse_quantity(v, field.units, where, key=path) if field.units else _number(v, where)
            for v in _sequence(axis, where)
        ]
    return out


def _sequence(axis, where, grid=True):
    """Return the values of an axis given as a sequence, or raise."""
    if isinstance(axis, np.ndarray):
        axis = axis.tolist()
    if isinstance(axis, (list, tuple, range)) and len(axis) and np.ndim(axis) == 1:
        return list(axis)
    expected = "a non-empty sequence of values or 'LO:HI:N'" if grid else 'a non-empty sequence'
    raise ConfigError(f'got {axis!r}; expected {expected}', **where)


def _number(value, where):
    """Return ``value`` as a finite float, or raise."""
    try:
        if isinstance(value, bool) or not isinstance(value, (numbers.Real, str)):
            raise ValueError
        number = float(value)
    except ValueError:
        raise ConfigError(f'got {value!r}; expected a number', **where) from None
    if not math.isfinite(number):
        raise ConfigError(f'got {value!r}; expected a finite number', **where)
    return number
