"""
A self-contained HTML report of a results directory (no network, no matplotlib needed).

Every PNG is embedded as a base64 data URI; every JSON file is rendered as tables: the
inputs, the optimum (design variables with bounds and active marks), the constraints
(active ones marked), the remaining scalar results flattened to dotted keys, and lists of
records (histories, sweep points) as tables truncated to ``MAX_ROWS`` rows.
"""

import base64
import glob
import html
import json
import os

from .errors import ConfigError
from .results_io import write_atomic
from .summary import CAUTION

#: Rows shown of a list of records before it is truncated.
MAX_ROWS = 200

#: Values shown of a list of scalars before it is truncated.
MAX_LIST_VALUES = 200

_STYLE = """
body { font-family: sans-serif; margin: 2em auto; max-width: 1100px; color: #222; }
table { border-collapse: collapse; margin: 0.5em 0 1.5em 0; font-size: 0.9em; }
th, td { border: 1px solid #bbb; padding: 0.2em 0.6em; text-align: left; }
th { background: #eee; }
td.num { text-align: right; font-family: monospace; }
.caution { border: 2px solid #b00; background: #fff4f4; padding: 0.6em; }
.active-mark { color: #b00; font-weight: bold; }
.note { font-style: italic; color: #555; }
figure { margin: 1em 0; }
figure img { max-width: 100%; border: 1px solid #ccc; }
"""


def _esc(value):
    """
    Return the HTML-escaped text of a value.

    Parameters
    ----------
    value : object
        Any value.

    Returns
    -------
    str
        Escaped text.
    """
    return html.escape(_text(value), quote=True)


def _text(value):
    """
    Return the display text of a value (floats to 6 significant digits).

    Parameters
    ----------
    value : object
        Any JSON value.

    Returns
    -------
    str
        The text.
    """
    if value is None:
        return '-'
    if isinstance(value, bool):
        return 'true' if value else 'false'
    if isinstance(value, float):
        return f'{value:.6g}'
    if isinstance(value, list):
        more = (
            f' ... ({len(value)} values, first {MAX_LIST_VALUES} shown)'
            if len(value) > MAX_LIST_VALUES
            else ''
        )
        if any(isinstance(v, (dict, list)) for v in value):
            return json.dumps(value[:MAX_LIST_VALUES], sort_keys=True) + more
        return '[' + ', '.join(_text(v) for v in value[:MAX_LIST_VALUES]) + ']' + more
    return str(value)


def _cell(value):
    """
    Return one table cell, right-aligned for numbers.

    Parameters
    ----------
    value : object
        Any JSON value.

    Returns
    -------
    str
        The ``<td>`` element.
    """
    number = isinstance(value, (int, float)) and not isinstance(value, bool)
    return f'<td class="num">{_esc(value)}</td>' if number else f'<td>{_esc(value)}</td>'


def flatten(data, prefix=''):
    """
    Flatten nested dicts to dotted keys (lists are kept as values).

    Parameters
    ----------
    data : dict
        Nested mapping.
    prefix : str
        Key prefix.

    Returns
    -------
    dict
        Dotted key -> value, in the order of the input.
    """
    flat = {}
    for key, value in data.items():
        name = f'{prefix}{key}'
        if isinstance(value, dict) and value:
            flat.update(flatten(value, name + '.'))
        else:
            flat[name] = value
    return flat


def _table(header, rows):
    """
    Return an HTML table.

    Parameters
    ----------
    header : list of str
        Column titles.
    rows : list of list of str
        Ready-made ``<td>`` cells.

    Returns
    -------
    str
        The table.
    """
    head = ''.join(f'<th>{_esc(h)}</th>' for h in header)
    body = '\n'.join('<tr>' + ''.join(row) + '</tr>' for row in rows)
    return f'<table>\n<tr>{head}</tr>\n{body}\n</table>'


def _key_value_table(flat):
    """
    Return a two-column table of dotted keys and values.

    Parameters
    ----------
    flat : dict
        Dotted key -> value.

    Returns
    -------
    str
        The table.
    """
    return _table(
        ['quantity', 'value'], [[f'<td>{_esc(k)}</td>', _cell(v)] for k, v in flat.items()]
    )


def _records_table(records):
    """
    Return a table of a list of records (dicts), truncated to ``MAX_ROWS`` rows.

    Parameters
    ----------
    records : list of dict
        The records; nested dicts become dotted columns.

    Returns
    -------
    str
        The table (and a truncation note if rows were left out).
    """
    shown = [flatten(r) for r in records[:MAX_ROWS]]
    columns = list(dict.fromkeys(k for row in shown for k in row))
    rows = [[_cell(row.get(c)) for c in columns] for row in shown]
    out = _table(columns, rows)
    if len(records) > MAX_ROWS:
        out += (
            f'\n<p class="note">First {MAX_ROWS} of {len(records)} rows shown; '
            'the full list is in the JSON file.</p>'
        )
    return out


def _is_design(value):
    """
    Return True for a dict of design variables with value, bounds and active flag.

    Parameters
    ----------
    value : object
        Candidate.

    Returns
    -------
    bool
        Whether it has the shape of the optimum's design variables.
    """
    keys = {'value', 'lower', 'upper', 'active'}
    return (
        isinstance(value, dict)
        and bool(value)
        and all(isinstance(v, dict) and keys <= set(v) for v in value.values())
    )


def _is_constraints(value):
    """
    Return True for a dict of constraints with an active flag.

    Parameters
    ----------
    value : object
        Candidate.

    Returns
    -------
    bool
        Whether it has the shape of the optimum's constraints.
    """
    return (
        isinstance(value, dict)
        and bool(value)
        and all(isinstance(v, dict) and 'active' in v for v in value.values())
    )


def _mark(active):
    """
    Return the cell of an active mark.

    Parameters
    ----------
    active : bool
        Whether the bound or constraint is active.

    Returns
    -------
    str
        The ``<td>`` element.
    """
    return '<td><span class="active-mark">active</span></td>' if active else '<td></td>'


def _design_section(title, design):
    """
    Return the optimum's design-variable table with active bounds marked.

    Parameters
    ----------
    title : str
        Section title.
    design : dict
        Name -> {value, lower, upper, active, units (optional)}.

    Returns
    -------
    str
        The section.
    """
    rows = [
        [
            f'<td>{_esc(name)}</td>',
            _cell(dv['value']),
            _cell(dv['lower']),
            _cell(dv['upper']),
            f"<td>{_esc(dv.get('units') or '')}</td>",
            _mark(dv['active']),
        ]
        for name, dv in design.items()
    ]
    return f'<h3>{_esc(title)}</h3>\n' + _table(
        ['design variable', 'value', 'lower', 'upper', 'units', 'bound'], rows
    )


def _constraints_section(title, constraints):
    """
    Return the constraint table with the active ones marked and listed.

    Parameters
    ----------
    title : str
        Section title.
    constraints : dict
        Name -> {value, lower, upper, equals, units, active, ...}.

    Returns
    -------
    str
        The section.
    """
    rows = [
        [
            f'<td>{_esc(name)}</td>',
            _cell(con.get('value')),
            _cell(con.get('lower')),
            _cell(con.get('upper')),
            _cell(con.get('equals')),
            f"<td>{_esc(con.get('units') or '')}</td>",
            _mark(con['active']),
        ]
        for name, con in constraints.items()
    ]
    active = [name for name, con in constraints.items() if con['active']]
    listing = ', '.join(active) if active else 'none'
    return f'<h3>{_esc(title)}</h3>\n<p>Active constraints: {_esc(listing)}</p>\n' + _table(
        ['constraint', 'value', 'lower', 'upper', 'equals', 'units', 'active'], rows
    )


def _walk(data, prefix, parts):
    """
    Sort the content of a JSON mapping into report sections.

    Parameters
    ----------
    data : dict
        The mapping.
    prefix : str
        Dotted path of ``data``.
    parts : dict
        Collects 'inputs', 'design', 'constraints' and 'records' (lists of
        (title, value)) and 'scalars' (dotted key -> value).
    """
    for key, value in data.items():
        name = f'{prefix}{key}'
        if key in ('inputs', 'config') and isinstance(value, dict):
            parts['inputs'].append((name, value))
        elif key == 'design' and _is_design(value):
            parts['design'].append((name, value))
        elif key == 'constraints' and _is_constraints(value):
            parts['constraints'].append((name, value))
        elif isinstance(value, list) and value and all(isinstance(v, dict) for v in value):
            parts['records'].append((name, value))
        elif isinstance(value, dict) and value:
            _walk(value, name + '.', parts)
        else:
            parts['scalars'][name] = value


def _json_section(name, data):
    """
    Return the report section of one JSON file.

    Parameters
    ----------
    name : str
        File name.
    data : object
        Its parsed content.

    Returns
    -------
    str
        The section.
    """
    if not isinstance(data, dict):
        data = {'content': data}
    parts = {'inputs': [], 'design': [], 'constraints': [], 'records': [], 'scalars': {}}
    _walk(data, '', parts)
    out = [f'<h2>{_esc(name)}</h2>']
    for title, value in parts['inputs']:
        out.append(f'<h3>Inputs ({_esc(title)})</h3>\n' + _key_value_table(flatten(value)))
    for title, value in parts['design']:
        out.append(_design_section(f'Optimum: design variables ({title})', value))
    for title, value in parts['constraints']:
        out.append(_constraints_section(f'Constraints ({title})', value))
    if parts['scalars']:
        out.append('<h3>Results</h3>\n' + _key_value_table(parts['scalars']))
    for title, value in parts['records']:
        out.append(f'<h3>{_esc(title)} ({len(value)} rows)</h3>\n' + _records_table(value))
    return '\n'.join(out)


def _figure(path):
    """
    Return a PNG embedded as a data URI with a caption from its file name.

    Parameters
    ----------
    path : str
        The PNG.

    Returns
    -------
    str
        The ``<figure>`` element.
    """
    with open(path, 'rb') as handle:
        data = base64.b64encode(handle.read()).decode('ascii')
    caption = os.path.splitext(os.path.basename(path))[0].replace('_', ' ').replace('-', ' ')
    return (
        f'<figure><img src="data:image/png;base64,{data}" alt="{_esc(caption)}">'
        f'<figcaption>{_esc(caption)}</figcaption></figure>'
    )


def write_report(results_dir, out_path=None):
    """
    Write one self-contained HTML report of a results directory.

    Parameters
    ----------
    results_dir : str
        Directory holding the result files (``*.png``, ``*.json``; sorted by name).
    out_path : str or None
        Destination (default ``<results_dir>/report.html``).

    Returns
    -------
    str
        The path of the written report.

    Raises
    ------
    ConfigError
        If the directory does not exist, holds no PNG or JSON file, a JSON file cannot
        be read, or the destination's directory does not exist.
    """
    if not os.path.isdir(results_dir):
        raise ConfigError('the results directory does not exist', source=str(results_dir))
    pngs = sorted(glob.glob(os.path.join(glob.escape(results_dir), '*.png')))
    jsons = sorted(glob.glob(os.path.join(glob.escape(results_dir), '*.json')))
    if not pngs and not jsons:
        raise ConfigError(
            'the results directory holds no results (no .png or .json files)',
            source=str(results_dir),
        )
    out_path = out_path or os.path.join(results_dir, 'report.html')
    if not os.path.isdir(os.path.dirname(os.path.abspath(out_path))):
        raise ConfigError('the directory of the report does not exist', source=str(out_path))
    sections = []
    for path in jsons:
        try:
            with open(path, encoding='utf-8') as handle:
                data = json.load(handle)
        except (OSError, ValueError) as err:
            raise ConfigError(f'cannot read the JSON results ({err})', source=path) from None
        sections.append(_json_section(os.path.basename(path), data))
    if pngs:
        sections.append('<h2>Figures</h2>\n' + '\n'.join(_figure(p) for p in pngs))
    title = f'voltwake results: {os.path.basename(os.path.abspath(results_dir))}'
    caution = f'<p class="caution">{_esc(CAUTION)}</p>'
    text = (
        '\n'.join(
            [
                '<!DOCTYPE html>',
                '<html lang="en">',
                '<head>',
                '<meta charset="utf-8">',
                f'<title>{_esc(title)}</title>',
                f'<style>{_STYLE}</style>',
                '</head>',
                '<body>',
                f'<h1>{_esc(title)}</h1>',
                caution,
                *sections,
                caution,
                '</body>',
                '</html>',
            ]
        )
        + '\n'
    )
    write_atomic(out_path, text)
    return out_path
