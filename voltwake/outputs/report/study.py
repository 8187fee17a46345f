"""Reading a results directory: study files, points, figures and shared helpers."""

import base64
import csv
import glob
import json
import math
import os

from ...configuration.loader import parse_quantity
from ...errors import ConfigError
from ..plots import FAILED, INFEASIBLE, NOT_CLOSED, OK, point_status
from ..summary import input_label
from .html import _esc, _number, _quantity
from .wording import ACTIVE_PHRASES, CONSTRAINT_WORDS, _axis_text, _path_units


def _read_json(path):
    """Return the parsed JSON file or raise ConfigError naming it."""
    try:
        with open(path, encoding='utf-8') as handle:
            return json.load(handle)
    except (OSError, ValueError) as err:
        raise ConfigError(f'cannot read the JSON results ({err})', source=path) from None


def read_points(path):
    """
    Read a study's ``<name>_points.csv`` into rows of numbers and text.

    The header carries units in brackets (``mtow_kg [kg]``); they are stripped from the
    keys. 'True'/'False' become booleans, numbers floats ('nan' a NaN), the rest text.

    Parameters
    ----------
    path : str
        The CSV file.

    Returns
    -------
    list of dict
        The rows (empty when the file is missing or unreadable).
    """
    try:
        with open(path, encoding='utf-8', newline='') as handle:
            reader = csv.reader(handle)
            header = next(reader, None)
            if not header:
                return []
            keys = [h.split(' [')[0] for h in header]
            rows = []
            for values in reader:
                row = {}
                for key, text in zip(keys, values):
                    if text in ('True', 'False'):
                        row[key] = text == 'True'
                        continue
                    try:
                        row[key] = float(text)
                    except ValueError:
                        row[key] = text
                rows.append(row)
            return rows
    except OSError:
        return []


#: One-sentence captions of the figures the commands write (what to read from each).
CAPTIONS = {
    'map_fuel_change.png': 'Fuel-burn change of the turbo-electric design against the '
    'conventional reference over the map: blue is a saving, red a penalty, white and the bold '
    'line labelled break-even mark no change, and dark crosses mark designs that did not '
    'close.',
    'map_psc.png': 'Power saving coefficient of the aft fan over the map (against a clean '
    'free-stream fan of the same thrust and pressure ratio): read where ingestion pays most; '
    'it is an upper estimate (see the assumptions).',
    'montecarlo.png': 'Distribution of the fuel-burn change over the sampled technology '
    'inputs, analysis only (configured design point, not re-optimised): the samples left of '
    'the black line are those where the turbo-electric design wins.',
    'montecarlo_optimized.png': 'Distribution of the fuel-burn change of the turbo-electric '
    'optimum against the optimised reference over the sampled technology inputs: the samples '
    'left of the black zero line are those where the turbo-electric design wins.',
    'montecarlo_optimized_design.png': 'Where the optimiser put each design variable over the '
    'samples, between its bounds (dashed): a pile-up at a bound means the bound, not the '
    'technology, holds the optimum.',
    'targets_fuel_change.png': 'Fuel-burn change of the design optimised at each target '
    'against the optimised conventional reference: blue is a saving, red a penalty; hatched '
    'cells with purple circles have no feasible design (the summary names the constraints '
    'that bind there), red squares mark optimiser failures and dark crosses designs that '
    'did not close.',
    'targets_psc.png': 'Power saving coefficient of the aft fan at each optimised target '
    'point: read how much shaft power ingestion saves where the optimiser put the design.',
    'targets_mass_breakdown.png': 'Masses of the best target point beside the optimised '
    'reference, by system and (right) by device of the aft fan and electrical chain: read '
    'where the turbo-electric design gains or loses mass.',
    'breakeven.png': 'Fuel-burn change of the optimised design against the optimised '
    'reference as the technology input varies: it breaks even where the curve crosses the '
    'black zero line.',
    'mass_breakdown.png': 'Masses by system, start before optimum (and beside the optimised '
    'reference), with values in kg; the right panel splits the aft fan and electrical chain '
    'by device so the small items stay readable.',
    'power_flow.png': 'Electrical power at cruise from the turbofan shafts to the aft fan: '
    'read how much of the extracted power each device loses.',
    'convergence.png': 'How the optimiser got there: the objective at each model evaluation '
    'and the worst constraint violation, which must end below the feasibility line.',
}


def _figure(path, caption=None):
    """
    Return a PNG embedded as a data URI with its caption.

    Parameters
    ----------
    path : str
        The PNG.
    caption : str or None
        One sentence saying what to read from it (None: from the file name).

    Returns
    -------
    str
        The ``<figure>`` element.
    """
    with open(path, 'rb') as handle:
        data = base64.b64encode(handle.read()).decode('ascii')
    name = os.path.basename(path)
    words = os.path.splitext(name)[0].replace('_', ' ').replace('-', ' ')
    text = caption or CAPTIONS.get(name) or words
    return (
        f'<figure><img src="data:image/png;base64,{data}" alt="{_esc(words)}">'
        f'<figcaption>{_esc(text)} <span class="file">({_esc(name)})</span></figcaption>'
        '</figure>'
    )


class _Figures:
    """The PNG files of a results directory, handed out once each to the sections."""

    def __init__(self, folder):
        self.folder = folder
        self.left = {
            os.path.basename(p): p
            for p in sorted(glob.glob(os.path.join(glob.escape(folder), '*.png')))
        }

    def take(self, *names):
        """Return the figures of these file names that exist (each only once)."""
        out = []
        for name in names:
            path = self.left.pop(name, None)
            if path is not None:
                out.append(_figure(path))
        return '\n'.join(out)


class Study:
    """
    One study of a results directory, rendered.

    Parameters
    ----------
    kind : str
        'optimization', 'map', 'montecarlo', 'targets', 'breakeven' or 'other'.
    title : str
        Section title.
    answer : str
        The study's answer in one line (HTML).
    fuel : str
        What the fuel-burn change is measured on.
    reference : str
        What the design is compared with.
    body : str
        The section's HTML.
    config : dict or None
        The configuration the study ran on.
    sentence : str
        The answer as a sentence of the verdict paragraph (HTML), or ''.
    """

    def __init__(self, kind, title, answer, fuel, reference, body, config=None, sentence=''):
        self.kind, self.title, self.answer = kind, title, answer
        self.fuel, self.reference, self.body = fuel, reference, body
        self.config, self.sentence = config, sentence

    @property
    def anchor(self):
        """str: Fragment identifier of the section."""
        return f'study-{self.kind}'


def _status_counts(rows):
    """Return the counts of OK, INFEASIBLE, FAILED and NOT_CLOSED rows."""
    statuses = [point_status(r) for r in rows]
    return {s: statuses.count(s) for s in (OK, INFEASIBLE, FAILED, NOT_CLOSED)}


def field_short(field):
    """
    Return the short words of a fuel field.

    Parameters
    ----------
    field : str
        'block_fuel_kg' or 'economic_block_fuel_kg'.

    Returns
    -------
    str
        'block fuel' or 'economic-mission block fuel'.
    """
    return 'economic-mission block fuel' if field == 'economic_block_fuel_kg' else 'block fuel'


def _inputs_of_axes(axes, written=None):
    """Return the rows of a study's axes: label, lo–hi with units (as written), count."""
    written = written or {}
    return [
        (input_label(p), _axis_text(p, v, written.get(p)).split(input_label(p), 1)[1].strip())
        for p, v in axes.items()
    ]


def _best(rows, key='fuel_burn_change_percent'):
    """Return the OK row with the lowest ``key`` (or None)."""
    good = [r for r in rows if point_status(r) == OK and _number(r.get(key)) is not None]
    return min(good, key=lambda r: r[key]) if good else None


def _point_name(row, paths, prefix=''):
    """Return 'aft-fan thrust fraction 0.13, motor specific power 9.2 kW/kg'."""
    return ', '.join(
        f'{input_label(p)} {_quantity(row.get(prefix + p), _path_units(p))}' for p in paths
    )


def _dv_bounds(config):
    """Return design-variable path -> (lower, upper) in SI from a config's optimisation."""
    out = {}
    dvs = ((config or {}).get('optimization') or {}).get('design_variables') or {}
    for path, spec in dvs.items():
        units = _path_units(path)
        try:
            out[path] = tuple(
                (
                    parse_quantity(spec[k], units, {'path': path}, check_bare=False)
                    if units
                    else float(spec[k])
                )
                if isinstance(spec, dict) and spec.get(k) is not None
                else None
                for k in ('lower', 'upper')
            )
        except (ConfigError, TypeError, ValueError):
            continue
    return out


def _active_words(active, row=None, bounds=None):
    """
    Return the active constraints and bounds of a target-sweep row in words.

    Parameters
    ----------
    active : list of str or str
        Active constraint names and ``'bound:<path>'`` (';'-separated in a CSV file).
    row : dict or None
        The row (its ``'dv:<path>'`` values tell which bound is active).
    bounds : dict or None
        Path -> (lower, upper) of the design variables.

    Returns
    -------
    str
        E.g. 'the span limit, wing loading at its lower bound'.
    """
    if isinstance(active, str):
        active = [a for a in active.split(';') if a]
    words = []
    for item in active or []:
        if item.startswith('bound:'):
            path = item[6:]
            value = _number((row or {}).get(f'dv:{path}'))
            lower, upper = (bounds or {}).get(path, (None, None))
            side = 'a'
            if value is not None and (lower is not None or upper is not None):
                d_lo = abs(value - lower) if lower is not None else math.inf
                d_hi = abs(value - upper) if upper is not None else math.inf
                side = 'its lower' if d_lo <= d_hi else 'its upper'
            words.append(f'{input_label(path)} at {side} bound')
        else:
            words.append(ACTIVE_PHRASES.get(item, CONSTRAINT_WORDS.get(item, item)))
    return ', '.join(words) if words else 'nothing active'


def _walk(data, prefix, parts):
    """
    Sort the content of an unknown JSON mapping into scalars and record lists.

    Parameters
    ----------
    data : dict
        The mapping.
    prefix : str
        Dotted path of ``data``.
    parts : dict
        Collects 'records' (list of (title, value)) and 'scalars' (dotted key -> value).
    """
    for key, value in data.items():
        name = f'{prefix}{key}'
        if isinstance(value, list) and value and all(isinstance(v, dict) for v in value):
            parts['records'].append((name, value))
        elif isinstance(value, dict) and value:
            _walk(value, name + '.', parts)
        else:
            parts['scalars'][name] = value
