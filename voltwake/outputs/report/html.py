"""HTML building blocks of the report: style sheet, escaping, number formats, tables."""

import html
import json
import math

from ..summary import display_units, pretty_units

#: Rows shown of a list of records before it is truncated.
MAX_ROWS = 200


#: Values shown of a list of scalars before it is truncated.
MAX_LIST_VALUES = 200


#: Dash shown for a quantity a design does not have.
NONE = '—'


_STYLE = """
:root { --ink: #1d2329; --muted: #5b6670; --line: #d3d9de; --accent: #1f5f99;
        --good: #1b7a3a; --bad: #b3261e; }
body { font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue",
       Arial, sans-serif; color: var(--ink); margin: 0 auto; max-width: 1080px;
       padding: 1.2em 2em 3em 2em; }
h1 { font-size: 1.55em; margin: 0.2em 0 0.1em 0; }
h2 { font-size: 1.25em; margin: 1.8em 0 0.4em 0; padding-bottom: 0.15em;
     border-bottom: 2px solid var(--line); }
h3 { font-size: 1.05em; margin: 1.3em 0 0.3em 0; }
p { margin: 0.4em 0 0.7em 0; }
.subtitle { color: var(--muted); margin: 0 0 0.8em 0; }
.caution { border: 1px solid #d9a5a0; background: #fdf3f2; padding: 0.45em 0.8em;
           font-size: 0.9em; }
.verdict { border-left: 5px solid var(--accent); background: #f2f6fa;
           padding: 0.7em 1em; margin: 0.8em 0; }
.verdict p { margin: 0.2em 0 0.6em 0; font-size: 1.05em; }
.scroll { overflow-x: auto; max-width: 100%; margin: 0.4em 0 1.1em 0; }
table { border-collapse: collapse; font-size: 0.88em; }
th, td { border: 1px solid var(--line); padding: 0.22em 0.55em; text-align: left;
         vertical-align: top; }
th { background: #eef1f4; font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.na { text-align: center; color: var(--muted); }
tr.group th { background: #dde5ec; text-align: left; }
tr.key td { font-weight: 600; background: #fbf7e6; }
table.headline { font-size: 0.95em; width: 100%; }
table.headline td:first-child { white-space: nowrap; font-weight: 600; }
.good { color: var(--good); font-weight: 600; }
.bad { color: var(--bad); font-weight: 600; }
.muted, .note { color: var(--muted); font-size: 0.9em; }
.tag { display: inline-block; padding: 0 0.4em; border-radius: 3px; font-size: 0.85em; }
.tag.active { background: #fbe3e1; color: var(--bad); }
.tag.free { background: #e4f1e7; color: var(--good); }
code { font-size: 0.9em; color: #39424a; }
figure { margin: 0.8em 0 1.4em 0; break-inside: avoid; page-break-inside: avoid; }
figure img { max-width: 100%; height: auto; border: 1px solid var(--line); }
figcaption { color: var(--ink); font-size: 0.92em; margin-top: 0.25em; }
figcaption .file { color: var(--muted); font-size: 0.9em; }
details { margin: 0.4em 0 1em 0; }
summary { cursor: pointer; color: var(--accent); }
pre { background: #f6f8fa; border: 1px solid var(--line); padding: 0.6em; font-size: 0.8em;
      overflow-x: auto; white-space: pre; }
nav ul { margin: 0.2em 0; padding-left: 1.2em; columns: 2; }
ul.assumptions li { margin: 0.15em 0; }
@page { size: A4; margin: 14mm 12mm; }
@media print {
  body { max-width: none; padding: 0; font-size: 10pt; }
  .scroll { overflow: visible; }
  table { font-size: 8pt; }
  td:not(.num) { overflow-wrap: anywhere; }
  th { overflow-wrap: break-word; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  tr, figure, .verdict { break-inside: avoid; page-break-inside: avoid; }
  figure img { max-height: 120mm; width: auto; }
  summary { color: var(--ink); }
  nav { display: none; }
  pre { white-space: pre-wrap; }
}
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
        return NONE
    if isinstance(value, bool):
        return 'yes' if value else 'no'
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
        return ', '.join(_text(v) for v in value[:MAX_LIST_VALUES]) + more
    return str(value)


def _number(value):
    """Return ``value`` as a finite float, or None."""
    if isinstance(value, bool) or value is None:
        return None
    try:
        out = float(value)
    except (TypeError, ValueError):
        return None
    return out if math.isfinite(out) else None


def _fmt(value, spec='{:,.4g}'):
    """Return a number formatted with ``spec`` (the dash for a missing value)."""
    value = _number(value)
    return NONE if value is None else spec.format(value)


def _sig(value, digits=4):
    """Return a number to ``digits`` significant figures with thousands separators."""
    value = _number(value)
    if value is None:
        return NONE
    if value != 0.0 and abs(value) >= 10**digits:
        return f'{value:,.0f}'
    text = f'{value:.{digits}g}'
    if 'e' not in text and abs(value) >= 1000:
        text = f'{value:,.{max(0, digits - len(str(int(abs(value)))))}f}'
    return text


def _pct(value, digits=2):
    """Return a signed percentage ('+4.12 %')."""
    value = _number(value)
    if value is None:
        return NONE
    if round(value, digits) == 0.0:
        value = 0.0  # no '-0.00 %'
    return f'{value:+.{digits}f} %'


def _cls(change):
    """Return the CSS class of a fuel-burn change: saving green, penalty red."""
    change = _number(change)
    if change is None:
        return ''
    return 'good' if change < 0.0 else 'bad'


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


def _td(text, css=None):
    """Return a ``<td>`` of already formatted text (escaped), with a class."""
    if text == NONE:
        css = 'na'
    cls = f' class="{css}"' if css else ''
    return f'<td{cls}>{_esc(text)}</td>'


def _raw_td(markup, css=None):
    """Return a ``<td>`` of ready markup."""
    cls = f' class="{css}"' if css else ''
    return f'<td{cls}>{markup}</td>'


def _table(header, rows, css=None):
    """
    Return an HTML table inside a horizontally scrolling block.

    Parameters
    ----------
    header : list of str
        Column titles.
    rows : list of list of str
        Ready-made ``<td>`` cells (or a single ready ``<tr>`` string).
    css : str or None
        Class of the table.

    Returns
    -------
    str
        The table.
    """
    head = ''.join(f'<th>{_esc(h)}</th>' for h in header)
    body = '\n'.join(
        row if isinstance(row, str) else '<tr>' + ''.join(row) + '</tr>' for row in rows
    )
    cls = f' class="{css}"' if css else ''
    return f'<div class="scroll"><table{cls}>\n<tr>{head}</tr>\n{body}\n</table></div>'


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
            'the full list is in the results file.</p>'
        )
    return out


def _shown(value, units):
    """Return (value, units) in the units a reader sees (kW/kg, deg, kN...)."""
    shown, factor = display_units(units)
    value = _number(value)
    return (None if value is None else value * factor), shown


def _quantity(value, units, digits=4):
    """Return '12.3 kW/kg' for an SI value with its units."""
    value, shown = _shown(value, units)
    if value is None:
        return NONE
    unit = pretty_units(shown)
    return f'{_sig(value, digits)} {unit}' if unit != '-' else _sig(value, digits)
