"""
Maps and analysis-only Monte Carlo solved in chunks of points, streamed in point order.

A study of many points is cut into chunks; each chunk is one vectorised analysis
(:class:`voltwake.design.batch.PointBatch`, built once per process and solved again for
every chunk). The chunks run over local processes or MPI ranks
(:func:`voltwake.studies.parallel.stream_jobs`) and come back in point order, so that the
caller writes each chunk's rows as soon as it is done and keeps only numpy columns. Every
point converges on its own, so the chunks give the numbers of one solve of all points.

The conventional reference shares inputs with the design (mission, payload, wing,
turbofans...): when a study varies one of those, the reference is analysed at every point
too (same chunks), and each point is compared with its own reference.
"""

import time
import uuid

import numpy as np

from ..configuration.loader import field_at
from ..design.batch import PointBatch
from .csv_table import csv_header, csv_lines
from .parallel import stream_jobs

#: Default points per chunk. Measured on the demo's 100 x 100 map (2 cores, shared; the
#: model re-used from chunk to chunk): 1,000 points 535 us per point and 285 MB peak
#: resident, 2,500 points 414 us and 464 MB, 5,000 points 689 us and 756 MB (about 120 kB
#: per point above the 140 MB of the program itself). Past a few thousand points the
#: per-point cost no longer falls while the memory keeps growing, so 2,500 points keeps a
#: process under half a gigabyte at close to the best speed.
DEFAULT_CHUNK_SIZE = 2500

#: The models this process has built, for the study under way (token -> batches).
_BATCHES = {}


class StudyInterrupted(KeyboardInterrupt):
    """
    Ctrl-C during a chunked study: the chunks finished before it are kept.

    Parameters
    ----------
    points_done : int
        Points of the chunks finished (and written) before the interrupt.
    points_total : int
        Points of the study.
    """

    def __init__(self, points_done, points_total):
        super().__init__(f'interrupted after {points_done} of {points_total} points')
        self.partial = {'points_done': int(points_done), 'points_total': int(points_total)}


def chunk_size_or_error(value, source='--chunk-size'):
    """
    Check a chunk size: a whole number >= 1 (None gives the default).

    Parameters
    ----------
    value : object
        The chunk size given.
    source : str
        Where it was given, for the error.

    Returns
    -------
    int
        The chunk size.
    """
    from ..errors import ConfigError

    if value is None:
        return DEFAULT_CHUNK_SIZE
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise ConfigError(f'got {value!r}; expected a whole number of points >= 1', source=source)
    return int(value)


def chunk_bounds(total, chunk_size):
    """
    Cut ``total`` points into chunks of at most ``chunk_size``, of nearly equal size.

    Parameters
    ----------
    total : int
        Points of the study.
    chunk_size : int
        Largest chunk.

    Returns
    -------
    list of tuple
        (start, stop) of every chunk, in point order.
    """
    if total <= 0:
        return []
    count = -(-total // chunk_size)
    edges = [round(i * total / count) for i in range(count + 1)]
    return list(zip(edges[:-1], edges[1:]))


def reference_follows(config, paths):
    """
    Return the paths among ``paths`` that the conventional reference also has as inputs.

    Parameters
    ----------
    config : Config
        The turbo-electric configuration.
    paths : sequence of str
        The inputs a study varies.

    Returns
    -------
    list of str
        Those the reference shares (mission, payload, wing, turbofans...), in order; empty
        when every path is a technology input of the aft fan or the electrical chain.
    """
    if not config.has_aft_fan:
        return []
    inputs = config.without_aft_fan().model_inputs()
    return [p for p in paths if field_at(p) is not None and field_at(p).target in inputs]


def _batches(job):
    """Return this process's models of the study ``job['token']`` (built on first use)."""
    token = job['token']
    if token not in _BATCHES:
        _BATCHES.clear()
        config = job['config']
        design = PointBatch(config, list(job['columns']), job['size'], job['fields'])
        follows = job['follows']
        reference = (
            PointBatch(config.without_aft_fan(), follows, job['size'], job['reference_fields'])
            if follows
            else None
        )
        _BATCHES[token] = (design, reference)
    return _BATCHES[token]


def solve_chunk(job):
    """
    Analyse one chunk of a study (and its references, when the reference follows).

    Parameters
    ----------
    job : dict
        ``token`` (the study), ``config``, ``columns`` (path -> this chunk's values, SI),
        ``size`` (largest chunk), ``fields``, ``fuel_field``, ``fixed_fuel`` (the fixed
        reference's fuel, or None when the reference follows), ``follows`` (the paths it
        follows), ``reference_fields`` and ``csv_factors`` (None: no CSV text wanted).

    Returns
    -------
    dict
        ``columns`` (the chunk's CSV columns: inputs, ``closed``, ``reason``, the fields,
        ``fuel_burn_change_percent`` and, when the reference follows, ``reference_*``),
        ``recovered`` and ``csv`` (the chunk's CSV rows, formatted here so that the
        formatting runs in parallel too; None when not wanted).
    """
    design, reference = _batches(job)
    batch = design.solve(job['columns'])
    ref = None
    if reference is not None:
        ref = reference.solve({p: job['columns'][p] for p in job['follows']})
    columns = _chunk_columns(batch, ref, list(job['columns']), job['fuel_field'], job['fixed_fuel'])
    text = None if job['csv_factors'] is None else csv_lines(columns, job['csv_factors'])
    return {'columns': columns, 'recovered': batch.recovered, 'csv': text}


def release_batches():
    """Drop the models this process built for a study (their memory goes back)."""
    _BATCHES.clear()


def run_chunks(
    config,
    columns,
    fields,
    fuel_field,
    fixed_reference,
    chunk_size=None,
    jobs=None,
    progress=None,
    sink=None,
):
    """
    Analyse the points of ``columns`` chunk by chunk; return the study's columns.

    Parameters
    ----------
    config : Config
        The configuration.
    columns : dict
        Dotted config path -> values (SI), one per point.
    fields : list of str
        Result fields kept per point.
    fuel_field : str
        The field the fuel-burn change is measured on.
    fixed_reference : dict or None
        Result fields of the reference when it follows no input of the study.
    chunk_size : int or None
        Points per chunk (default :data:`DEFAULT_CHUNK_SIZE`).
    jobs : int or None
        Local processes (default: all cores); ignored under MPI.
    progress : callable or None
        ``progress(done, not_closed, total, elapsed)`` in points, after every chunk.
    sink : callable or None
        ``sink(chunk_columns, text)`` with the columns of every chunk and their CSV rows,
        in point order (:func:`stream_to_csv`); its ``factors`` are those of the axes
        shown in the units the user wrote them in.

    Returns
    -------
    dict
        ``columns`` (column -> array, one value per point, in CSV order), ``follows`` (the
        inputs the reference follows), ``recovered`` (points closed by continuation) and
        ``total`` (points).
    """
    chunk_size = chunk_size_or_error(chunk_size, 'chunk_size')
    paths = list(columns)
    arrays = {p: np.asarray(columns[p], dtype=float).ravel() for p in paths}
    total = len(next(iter(arrays.values()))) if arrays else 0
    bounds = chunk_bounds(total, chunk_size)
    size = max((stop - start for start, stop in bounds), default=1)
    follows = reference_follows(config, paths)
    reference_fields = [fuel_field] + (['block_fuel_kg'] if fuel_field != 'block_fuel_kg' else [])
    token = uuid.uuid4().hex
    jobs_list = [
        {
            'token': token,
            'config': config,
            'columns': {p: arrays[p][start:stop] for p in paths},
            'size': size,
            'fields': fields,
            'follows': follows,
            'reference_fields': reference_fields,
            'fuel_field': fuel_field,
            'fixed_fuel': None if follows else float(fixed_reference[fuel_field]),
            'csv_factors': None if sink is None else sink.factors(paths),
        }
        for start, stop in bounds
    ]
    parts, done, not_closed, recovered = [], 0, 0, 0
    begin = time.monotonic()
    stream = stream_jobs(solve_chunk, jobs_list, jobs)
    try:
        for chunk in stream:
            part = chunk['columns']
            if sink is not None:
                sink(part, chunk['csv'])
            parts.append(part)
            count = len(part['closed'])
            done += count
            not_closed += int(count - np.count_nonzero(part['closed']))
            recovered += chunk['recovered']
            if progress is not None:
                progress(done, not_closed, total, time.monotonic() - begin)
    except KeyboardInterrupt:
        stream.close()
        raise StudyInterrupted(done, total) from None
    finally:
        release_batches()
    merged = {
        key: np.concatenate([part[key] for part in parts]) if parts else np.zeros(0)
        for key in (parts[0] if parts else {})
    }
    return {'columns': merged, 'follows': follows, 'recovered': recovered, 'total': total}


def _chunk_columns(batch, ref, paths, fuel_field, fixed_fuel):
    """Return the CSV columns of one chunk: inputs, closed, reason, fields, change, reference."""
    closed = np.asarray(batch.closed, dtype=bool)
    reason = np.empty(closed.size, dtype=object)
    reason[:] = [r or '' for r in batch.reasons]
    out = {p: np.asarray(batch.inputs[p], dtype=float) for p in paths}
    out['closed'] = closed
    out['reason'] = reason
    for key in batch.values:
        out[key] = np.asarray(batch.values[key], dtype=float)
    fuel = out[fuel_field]
    if ref is not None:
        reference = np.asarray(ref.values[fuel_field], dtype=float)
        usable = closed & ref.closed
    else:
        reference = np.full(closed.size, float(fixed_fuel))
        usable = closed
    with np.errstate(all='ignore'):
        change = 100.0 * (fuel - reference) / reference
    out['fuel_burn_change_percent'] = np.where(usable, change, np.nan)
    if ref is not None:
        for key in ref.values:
            out[f'reference_{key}'] = np.asarray(ref.values[key], dtype=float)
        out['reference_closed'] = np.asarray(ref.closed, dtype=bool)
    return out


def stream_to_csv(path, units=None, shown=None):
    """
    Return a sink that appends every chunk's rows to the CSV file ``path`` (header first).

    Parameters
    ----------
    path : str
        The CSV file (created; its directory exists).
    units : dict or None
        Column -> units overriding the known ones, for the header.
    shown : dict or None
        Column -> the unit the user wrote that axis in (see
        :func:`voltwake.studies.maps.points_csv`).

    Returns
    -------
    callable
        ``sink(chunk_columns, text=None)`` (``text``: the chunk's rows already formatted);
        ``sink.factors(columns)`` gives the factors of the shown axes and ``sink.close()``
        closes the file.
    """
    state = {'handle': None}

    def factors(columns):
        return csv_header(list(columns), units, shown)[1]

    def sink(part, text=None):
        header, scale = csv_header(list(part), units, shown)
        if state['handle'] is None:
            state['handle'] = open(path, 'w', newline='', encoding='utf-8')
            state['handle'].write(header)
        state['handle'].write(csv_lines(part, scale) if text is None else text)
        state['handle'].flush()

    def close():
        if state['handle'] is not None:
            state['handle'].close()

    sink.factors = factors
    sink.close = close
    return sink
