"""
Trade studies: design-space maps and Monte Carlo over technology inputs.

Each is evaluated in chunks of vectorised models (see :mod:`voltwake.studies.chunked`) and
compared with the conventional reference: the reference as configured, or, when the study
varies inputs the reference shares, the reference at every point.
"""

import csv
import io
import math

import numpy as np
from openmdao.utils.units import convert_units

from ..configuration.loader import field_at, load_config, parse_quantity
from ..design.analysis import analyze
from ..design.batch import full_factorial
from ..design.fields import fuel_burn_field
from ..errors import ConfigError
from .chunked import reference_follows, run_chunks
from .csv_table import POINT_FIELDS, _cell, csv_header, csv_lines, points_units
from .parallel import on_this_process


def parse_axis(text, count_required=True):
    """
    Parse ``PATH=LO:HI[:N]`` (units allowed on LO and HI) into a path and values.

    Parameters
    ----------
    text : str
        The axis specification, e.g. ``aft_fan.fan_pressure_ratio=1.2:1.6:100``.
    count_required : bool
        Whether ``:N`` must be given.

    Returns
    -------
    tuple
        (path, lower, upper, count or None) with bounds in SI.
    """
    path, sep, spec = str(text).partition('=')
    parts = spec.split(':')
    where = {'source': 'command line', 'path': path.strip() or None}
    if not sep or len(parts) not in ((3,) if count_required else (2, 3)):
        form = 'PATH=LO:HI:N' if count_required else 'PATH=LO:HI'
        raise ConfigError(f'got {text!r}; expected {form}', **where)
    path = path.strip()
    field = field_at(path)
    if field is None or not field.target:
        raise ConfigError(
            'not a model input; expected a config key path such as \'aft_fan.thrust_fraction\'',
            **where,
        )
    lower, upper = (
        parse_quantity(p.strip(), field.units, where, key=path)
        if field.units
        else axis_number(p, where)
        for p in parts[:2]
    )
    count = axis_count(parts[2], where) if len(parts) == 3 else None
    return path, lower, upper, count


def axis_count(text, where):
    """
    Return the ``N`` of an axis ``LO:HI:N`` as a whole number >= 1, or raise.

    Parameters
    ----------
    text : str
        The count as written.
    where : dict
        The ConfigError keywords (source, path).

    Returns
    -------
    int
        The number of points.
    """
    try:
        count = int(text)
    except ValueError:
        count = 0
    if count < 1:
        raise ConfigError(f'got {text!r} points; expected a whole number >= 1', **where)
    return count


def axis_number(text, where):
    """
    Return an axis end written without units as a finite float, or raise.

    Parameters
    ----------
    text : str
        The number as written.
    where : dict
        The ConfigError keywords (source, path).

    Returns
    -------
    float
        The value.
    """
    try:
        value = float(text)
    except ValueError:
        raise ConfigError(f'got {text!r}; expected a number', **where) from None
    if not math.isfinite(value):
        raise ConfigError(f'got {text!r}; expected a finite number', **where)
    return value


def _reference(config):
    ref = analyze(config.without_aft_fan(), keep_problem=False)
    return ref.values


def _point_fields(config):
    """Return the study fields of a design: POINT_FIELDS, and the economic fuel if flown."""
    extra = ['economic_block_fuel_kg'] if config.has_economic_mission else []
    return list(POINT_FIELDS) + extra


def design_space_map(config, axes, chunk_size=None, jobs=1, progress=None, sink=None):
    """
    Analyse a full-factorial grid of design points, chunk by chunk.

    Parameters
    ----------
    config : Config, dict, str or None
        The base configuration.
    axes : dict
        Dotted config path -> 1-D sequence of values (SI); the first varies slowest.
    chunk_size : int or None
        Points per vectorised solve (default
        :data:`voltwake.studies.chunked.DEFAULT_CHUNK_SIZE`).
    jobs : int or None
        Local processes over which the chunks run (None: all cores).
    progress : callable or None
        ``progress(done, not_closed, total, elapsed)`` in points, after every chunk.
    sink : callable or None
        ``sink(chunk_columns)`` for every chunk, in point order (e.g. the CSV writer).

    Returns
    -------
    dict
        ``kind``, ``axes`` (path -> values), ``points`` (column -> array, including
        ``closed`` and ``reason``), ``reference`` (the analysed conventional reference, or
        None when it follows inputs of the map), ``reference_follows`` (those inputs),
        ``closure_rate`` and ``recovered`` (points closed by continuation).
    """
    config = load_config(config)
    run = _run_chunked(config, full_factorial(axes), chunk_size, jobs, progress, sink)
    return {
        'kind': 'map',
        'axes': {p: [float(v) for v in vals] for p, vals in axes.items()},
        **run,
        'design': config.name,
    }


def _run_chunked(config, columns, chunk_size, jobs, progress, sink):
    """Run a map or Monte Carlo in chunks; return its points and reference entries."""
    field = fuel_burn_field(config)
    follows = reference_follows(config, list(columns))
    with on_this_process():
        reference = None if follows else _reference(config)
    run = run_chunks(
        config,
        columns,
        _point_fields(config),
        field,
        reference,
        chunk_size,
        jobs,
        progress,
        sink,
    )
    points = run['columns']
    closed = points.get('closed', np.zeros(0, dtype=bool))
    out = {
        'points': points,
        'fuel_burn_measured_on': field,
        'reference': reference,
        'reference_follows': follows,
        'closure_rate': float(np.mean(closed)) if closed.size else 1.0,
        'recovered': run['recovered'],
    }
    if follows:
        ref_closed = points.get('reference_closed', np.zeros(0, dtype=bool))
        out['reference_closure_rate'] = float(np.mean(ref_closed)) if ref_closed.size else 1.0
    return out


def sample_distributions(distributions, samples, seed):
    """
    Draw samples of technology inputs.

    Parameters
    ----------
    distributions : dict
        Dotted config path -> ``{'uniform': [lo, hi]}`` or ``{'triangular': [lo, mode, hi]}``
        (values in SI or strings with units).
    samples : int
        Number of samples.
    seed : int
        Seed of the random generator (the same seed gives the same samples).

    Returns
    -------
    dict
        Dotted config path -> array of samples (SI).
    """
    rng = np.random.default_rng(seed)
    out = {}
    for path in sorted(distributions):
        spec = distributions[path]
        where = {'source': 'study.uncertainty', 'path': path}
        field = field_at(path)
        if field is None or not field.target:
            raise ConfigError('not a model input; expected a config key path', **where)
        if not isinstance(spec, dict) or len(spec) != 1:
            raise ConfigError(
                f'got {spec!r}; expected {{uniform: [lo, hi]}} or {{triangular: [lo, mode, hi]}}',
                **where,
            )
        ((kind, params),) = spec.items()
        sizes = {'uniform': 2, 'triangular': 3}
        if kind not in sizes or not isinstance(params, list) or len(params) != sizes[kind]:
            raise ConfigError(
                f'got {spec!r}; expected {{uniform: [lo, hi]}} or {{triangular: [lo, mode, hi]}}',
                **where,
            )
        vals = [
            parse_quantity(p, field.units, where, key=path)
            if field.units
            else axis_number(p, where)
            for p in params
        ]
        if vals != sorted(vals) or vals[0] == vals[-1]:
            raise ConfigError(f'got {params!r}; expected lo < hi (and lo <= mode <= hi)', **where)
        out[path] = (
            rng.uniform(vals[0], vals[1], samples)
            if kind == 'uniform'
            else rng.triangular(vals[0], vals[1], vals[2], samples)
        )
    return out


def monte_carlo(
    config, distributions, samples=1000, seed=1, chunk_size=None, jobs=1, progress=None, sink=None
):
    """
    Evaluate sampled technology inputs, chunk by chunk, against the reference.

    Parameters
    ----------
    config : Config, dict, str or None
        The turbo-electric configuration.
    distributions : dict
        See :func:`sample_distributions`.
    samples : int
        Number of samples.
    seed : int
        Random seed.
    chunk_size, jobs, progress, sink
        As for :func:`design_space_map`.

    Returns
    -------
    dict
        ``points`` (column -> array), ``reference`` (None when it follows sampled inputs),
        ``reference_follows``, the distribution of ``fuel_burn_change_percent`` (mean,
        standard deviation, percentiles 5/50/95) and ``probability_of_win`` (share of the
        samples with a result that burn less fuel than their reference).
    """
    config = load_config(config)
    if not config.has_aft_fan:
        raise ConfigError(
            'a Monte Carlo study needs a turbo-electric design (aft_fan section)',
            source=config.source,
        )
    columns = sample_distributions(distributions, samples, seed)
    run = _run_chunked(config, columns, chunk_size, jobs, progress, sink)
    change = run['points'].get('fuel_burn_change_percent', np.zeros(0))
    change = change[np.isfinite(change)]
    stats = {}
    if change.size:
        stats = {
            'mean': float(change.mean()),
            'std': float(change.std(ddof=1)) if change.size > 1 else 0.0,
            'p05': float(np.percentile(change, 5)),
            'p50': float(np.percentile(change, 50)),
            'p95': float(np.percentile(change, 95)),
        }
    return {
        'kind': 'montecarlo',
        'samples': samples,
        'seed': seed,
        'distributions': distributions,
        **run,
        'fuel_burn_change_percent': stats,
        'probability_of_win': float(np.mean(change < 0.0)) if change.size else float('nan'),
        'design': config.name,
    }


def points_csv(rows, units=None, shown=None):
    """
    Return the rows of a study as CSV text with units in the header.

    Parameters
    ----------
    rows : list of dict or dict
        One dict per point (same keys), or column -> array (one value per point).
    units : dict or None
        Column -> units shown in the header as ``name [units]``.
    shown : dict or None
        Column -> the unit the user wrote that axis in: its values are converted from SI to
        it (rounded to 12 significant digits, so that a decimal grid stays decimal) and the
        header names it.

    Returns
    -------
    str
        The CSV document.
    """
    if isinstance(rows, dict):  # columns of arrays (a map or Monte Carlo)
        if not rows or not len(next(iter(rows.values()))):
            return ''
        header, factors = csv_header(list(rows), units, shown)
        return header + csv_lines(rows, factors)
    if not rows:
        return ''
    columns = list(rows[0])
    units = points_units(columns, units)
    factors = {}
    for column, unit in (shown or {}).items():
        if column in units and units[column] not in (None, '-') and unit != units[column]:
            factors[column] = float(convert_units(1.0, units[column], unit))
            units[column] = unit
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator='\n')
    writer.writerow([f'{c} [{units[c]}]' if units[c] else c for c in columns])
    for row in rows:
        writer.writerow(
            [
                _cell(float(f'{row[c] * factors[c]:.12g}')) if c in factors else _cell(row[c])
                for c in columns
            ]
        )
    return buf.getvalue()
