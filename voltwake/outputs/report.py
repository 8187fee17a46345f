"""
A self-contained HTML report of a results directory that reads as an engineer's answer.

The report opens with the verdict: a short paragraph and a headline table with one line per
study found in the directory (an optimisation and its optimised conventional reference, a
design-space map, a Monte Carlo study, a target sweep, a technology break-even). Each study
then has the design beside its reference, grouped (masses, fuel, aerodynamics, propulsion,
electrical chain, performance margins) with units and a change column ("—" where the
reference has no such part), what holds the optimum in words, the figures where the reader
needs them with a one-sentence caption each, and the inputs of the study in a compact
table. The configuration used is in a collapsible block; the assumptions that matter
(abridged from docs/theory.md, section 6) and the cautions close the report.

The file needs nothing from outside: PNG figures are embedded as base64 data URIs, there is
no JavaScript and no web font, and a print style sheet lays it out for PDF. Values the
results do not carry are derived here from what the JSON and CSV files hold (e.g. the share
of a map where the turbo-electric design wins). matplotlib is not needed to write it.
"""

import base64
import csv
import glob
import html
import json
import math
import os

from ..configuration.loader import field_at, parse_quantity
from ..errors import ConfigError
from .files import write_atomic
from .plots import INFEASIBLE, NOT_CLOSED, OK, point_status
from .summary import CAUTION, display_units, input_label, pretty_units

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

# ------------------------------------------------------------------------- formatting


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


# ----------------------------------------------------------- quantities of a design

#: Aft-fan and electrical-chain quantities a conventional reference does not have (stored
#: there as 0, or 1 for an efficiency): shown as a dash.
_AFT_ONLY_PREFIXES = (
    'aft_',
    'cable_',
    'generator_',
    'rectifier_',
    'inverter_',
    'motor_',
    'thermal_',
    'electrical_',
    'power_saving_',
)
_AFT_ONLY = {'capture_height_m', 'boundary_layer_thickness_m', 'turbofan_power_extraction_kW'}

#: Grouped quantities of the side-by-side tables: (label, key, units, format, change).
#: The change is '%' (relative) or 'abs' (difference, for margins and coefficients).
QUANTITIES = [
    (
        'Masses',
        [
            ('MTOW', 'mtow_kg', 'kg', '{:,.0f}', '%'),
            ('Operating empty mass', 'oew_kg', 'kg', '{:,.0f}', '%'),
            ('Airframe', 'airframe_mass_kg', 'kg', '{:,.0f}', '%'),
            ('wing', 'wing_mass_kg', 'kg', '{:,.0f}', '%'),
            ('fuselage', 'fuselage_mass_kg', 'kg', '{:,.0f}', '%'),
            ('horizontal tail', 'horizontal_tail_mass_kg', 'kg', '{:,.0f}', '%'),
            ('vertical tail', 'vertical_tail_mass_kg', 'kg', '{:,.0f}', '%'),
            ('landing gear', 'landing_gear_mass_kg', 'kg', '{:,.0f}', '%'),
            ('systems, furnishings, operating items', 'systems_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Turbofans (with nacelles)', 'engines_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Aft fan', 'aft_fan_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Electrical chain (with thermal)', 'electrical_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Payload', 'payload_kg', 'kg', '{:,.0f}', '%'),
        ],
    ),
    (
        'Fuel',
        [
            ('Block fuel, design mission', 'block_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Reserve fuel', 'reserve_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Total fuel', 'total_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Block energy, design mission', 'block_energy_MJ', 'MJ', '{:,.0f}', '%'),
            ('Block fuel, economic mission', 'economic_block_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Block energy, economic mission', 'economic_block_energy_MJ', 'MJ', '{:,.0f}', '%'),
        ],
    ),
    (
        'Aerodynamics (cruise)',
        [
            ('Wing area', 'wing_area_m2', 'm²', '{:.2f}', '%'),
            ('Wing loading (MTOW / area)', 'wing_loading_kg_per_m2', 'kg/m²', '{:.1f}', '%'),
            ('Span', 'wingspan_m', 'm', '{:.2f}', '%'),
            ('Lift coefficient', 'cruise_cl', '-', '{:.4f}', 'abs'),
            ('Lift-to-drag ratio', 'cruise_lift_to_drag', '-', '{:.3f}', '%'),
            ('Zero-lift drag coefficient', 'zero_lift_drag_coefficient', '-', '{:.5f}', '%'),
            ('Induced drag coefficient', 'induced_drag_coefficient', '-', '{:.5f}', '%'),
            ('Wave drag coefficient', 'wave_drag_coefficient', '-', '{:.5f}', 'abs'),
            ('Drag-divergence Mach number', 'drag_divergence_mach', '-', '{:.4f}', 'abs'),
            ('Drag', 'cruise_drag_kN', 'kN', '{:.3f}', '%'),
        ],
    ),
    (
        'Propulsion',
        [
            ('TSFC', 'tsfc_g_per_kN_s', 'g/(kN·s)', '{:.3f}', '%'),
            ('Overall efficiency', 'overall_efficiency', '-', '{:.4f}', '%'),
            ('Turbofan fan diameter', 'turbofan_fan_diameter_m', 'm', '{:.3f}', '%'),
            ('Turbofan cruise net thrust (each)', 'turbofan_cruise_thrust_kN', 'kN', '{:.3f}', '%'),
            ('Turbofan rated thrust (each)', 'turbofan_rated_thrust_kN', 'kN', '{:.2f}', '%'),
            ('Aft-fan thrust fraction', 'aft_thrust_fraction', '-', '{:.4f}', 'abs'),
            ('Aft-fan shaft power', 'aft_fan_shaft_power_kW', 'kW', '{:,.1f}', '%'),
            ('Aft-fan tip diameter', 'aft_fan_diameter_m', 'm', '{:.3f}', '%'),
            ('Aft-fan hub-to-tip ratio', 'aft_fan_hub_to_tip_ratio', '-', '{:.3f}', 'abs'),
            (
                'Aft-fan efficiency in ingested flow',
                'aft_fan_installed_efficiency',
                '-',
                '{:.4f}',
                'abs',
            ),
            ('PSC vs same-FPR clean fan', 'power_saving_coefficient', '-', '{:.4f}', 'abs'),
            (
                'PSC vs same-mass-flow clean fan',
                'power_saving_coefficient_same_mass_flow',
                '-',
                '{:.4f}',
                'abs',
            ),
            ('Capture height', 'capture_height_m', 'm', '{:.4f}', '%'),
        ],
    ),
    (
        'Electrical chain',
        [
            ('Turbofan power extraction', 'turbofan_power_extraction_kW', 'kW', '{:,.1f}', '%'),
            ('Chain efficiency', 'electrical_chain_efficiency', '-', '{:.4f}', 'abs'),
            ('Motor rated power', 'motor_rated_power_kW', 'kW', '{:,.1f}', '%'),
            ('Generators', 'generator_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Rectifiers', 'rectifier_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Cable', 'cable_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Inverter', 'inverter_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Motor', 'motor_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Thermal management', 'thermal_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Heat load at cruise', 'thermal_load_kW', 'kW', '{:,.1f}', '%'),
            ('Cable current', 'cable_current_A', 'A', '{:,.1f}', '%'),
        ],
    ),
    (
        'Performance margins',
        [
            ('Take-off field length', 'takeoff_field_length_m', 'm', '{:,.0f}', '%'),
            ('Landing field length', 'landing_field_length_m', 'm', '{:,.0f}', '%'),
            ('Approach speed', 'approach_speed_kn', 'kn', '{:.1f}', '%'),
            ('Top-of-climb thrust margin', 'climb_thrust_margin', '-', '{:.4f}', 'abs'),
            ('Buffet margin', 'buffet_margin', '-', '{:.4f}', 'abs'),
            ('Aft-fan diameter margin', 'aft_fan_diameter_margin', '-', '{:.4f}', 'abs'),
            ('Aft-fan hub-to-tip margin', 'aft_fan_hub_to_tip_margin', '-', '{:.4f}', 'abs'),
            ('Motor power margin', 'motor_power_margin', '-', '{:.4f}', 'abs'),
            ('Cable partial-discharge margin', 'cable_voltage_margin', '-', '{:.4f}', 'abs'),
            ('Economic take-off mass margin', 'economic_takeoff_mass_margin', '-', '{:.4f}', 'abs'),
        ],
    ),
]

#: Sub-items of a group (indented in the table).
_SUB_ITEMS = {
    'wing_mass_kg',
    'fuselage_mass_kg',
    'horizontal_tail_mass_kg',
    'vertical_tail_mass_kg',
    'landing_gear_mass_kg',
    'systems_mass_kg',
}


def _aft_only(key):
    """Return True for a quantity only a design with an aft fan has."""
    return key in _AFT_ONLY or key.startswith(_AFT_ONLY_PREFIXES)


def _has_aft_fan(values):
    """Return True when a design's fields describe an aft fan."""
    return (_number(values.get('aft_thrust_fraction')) or 0.0) > 0.0 or (
        _number(values.get('aft_fan_mass_kg')) or 0.0
    ) > 0.0


def _with_derived(values):
    """Return the fields with the wing loading they imply (MTOW / wing area)."""
    out = dict(values or {})
    mtow, area = _number(out.get('mtow_kg')), _number(out.get('wing_area_m2'))
    if mtow is not None and area:
        out['wing_loading_kg_per_m2'] = mtow / area
    return out


def _value_of(values, key):
    """Return a design's value of ``key`` (None for a missing one or one it does not have)."""
    if _aft_only(key) and not _has_aft_fan(values):
        return None
    return _number(values.get(key))


def _change_text(a, b, mode, spec):
    """Return the change of ``a`` against ``b`` ('+1.23 %' or a signed difference)."""
    if a is None or b is None:
        return NONE
    if mode == '%':
        return NONE if b == 0.0 else _pct(100.0 * (a - b) / abs(b))
    text = spec.format(a - b)
    if text.lstrip('-').strip('0.,') == '':
        text = spec.format(0.0)  # no '-0.0000'
    return text if text.startswith('-') else '+' + text


def side_by_side(columns, changes, key_field=None, require=None):
    """
    Return the grouped table of designs side by side with change columns.

    Parameters
    ----------
    columns : list of tuple
        (header, fields) of each design; fields are result fields (kg, kW, ...).
    changes : list of tuple
        (header, i, j): a column with the change of design ``i`` against design ``j``.
    key_field : str or None
        Field of the fuel-burn verdict (highlighted).
    require : int or None
        Show only the quantities the design of this column holds (a study row that keeps
        the main fields only); None for every quantity any design has.

    Returns
    -------
    str
        The table. A quantity a design does not have (the aft fan and electrical chain of a
        conventional design, stored as 0 or 1) is a dash; rows no design has are left out.
    """
    designs = [_with_derived(fields) for _, fields in columns]
    header = ['quantity', 'units'] + [h for h, _ in columns] + [h for h, _, _ in changes]
    rows = []
    for group, items in QUANTITIES:
        lines = []
        for label, key, units, spec, mode in items:
            values = [_value_of(d, key) for d in designs]
            if all(v is None for v in values):
                continue
            if require is not None and key not in designs[require]:
                continue
            label_text = ('\u2003' + label) if key in _SUB_ITEMS else label
            cells = [_td(label_text), _td(units)]
            cells += [_td(NONE if v is None else spec.format(v), 'num') for v in values]
            for _, i, j in changes:
                cells.append(_td(_change_text(values[i], values[j], mode, spec), 'num'))
            css = ' class="key"' if key == key_field else ''
            lines.append(f'<tr{css}>' + ''.join(cells) + '</tr>')
        if lines:
            rows.append(f'<tr class="group"><th colspan="{len(header)}">{_esc(group)}</th></tr>')
            rows += lines
    return _table(header, rows, css='compare')


# --------------------------------------------------------------- words and labels

#: Words for the constraint outputs of an optimisation.
CONSTRAINT_WORDS = {
    'wingspan': 'wing span',
    'takeoff_field_length': 'take-off field length',
    'approach_speed': 'approach speed',
    'landing_field_length': 'landing field length',
    'climb_thrust_margin': 'top-of-climb thrust margin',
    'buffet_margin': 'buffet margin',
    'aft_fan_diameter_margin': 'aft-fan tip diameter margin (tail-strike line)',
    'aft_fan_hub_to_tip_margin': 'aft-fan hub-to-tip margin (minimum blade height)',
    'motor_power_margin': 'motor power margin',
    'cable_current_density_margin': 'cable current-density margin',
    'cable_voltage_margin': 'bus-voltage partial-discharge margin',
}

#: Fields of objectives and fuel measures -> words.
FIELD_WORDS = {
    'block_fuel': 'block fuel',
    'mtow': 'MTOW',
    'block_energy': 'block energy',
    'total_energy': 'block energy',
    'total_fuel': 'total fuel',
    'economic_block_fuel': 'economic-mission block fuel',
    'economic_block_energy': 'economic-mission block energy',
}

#: The words of an active constraint in a sentence ("held by the span limit (36 m)").
ACTIVE_PHRASES = {
    'wingspan': 'the span limit',
    'takeoff_field_length': 'the take-off field length limit',
    'approach_speed': 'the approach speed limit',
    'landing_field_length': 'the landing field length limit',
    'climb_thrust_margin': 'the top-of-climb thrust requirement',
    'buffet_margin': 'the buffet margin',
    'aft_fan_diameter_margin': 'the aft-fan diameter limit (tail-strike line)',
    'aft_fan_hub_to_tip_margin': 'the minimum aft-fan blade height',
    'motor_power_margin': 'the motor power limit',
    'cable_current_density_margin': 'the cable current-density limit',
    'cable_voltage_margin': 'the partial-discharge limit of the bus voltage',
}

_KNOT = 0.514444  # m/s per knot (1852 m / 3600 s, exact by definition of the nautical mile)


def objective_label(objective, outputs=None, history=None):
    """
    Return the axis label of an optimisation objective with its units.

    The units are those of the result field whose value is the objective at the optimum
    (``block_fuel`` -> ``block_fuel_kg`` -> kg), found by matching the values.

    Parameters
    ----------
    objective : str
        The objective name of the config (``block_fuel``, ``mtow``, an output name...).
    outputs : dict or None
        Result fields of the optimum.
    history : list of dict or None
        The evaluations (their objective values).

    Returns
    -------
    str
        E.g. ``'block fuel [kg]'``.
    """
    words = FIELD_WORDS.get(objective, str(objective).replace('_', ' '))
    target = {'total_energy': 'block_energy'}.get(objective, objective)
    values = [e['objective'] for e in (history or []) if e.get('closed')]
    value = _number(values[-1]) if values else None
    for key, field in (outputs or {}).items():
        if not key.startswith(f'{target}_'):
            continue
        field = _number(field)
        if field is not None and value is not None and abs(field - value) <= 1e-6 * abs(field):
            units = key[len(target) + 1 :]
            return f'{words} [{pretty_units(units)}]'
    for key in outputs or {}:
        if key.startswith(f'{target}_') and key[len(target) + 1 :] in ('kg', 'MJ', 'm', 'kN'):
            return f'{words} [{key[len(target) + 1 :]}]'
    return f'{words} [model units]'


def _fuel_words(field, config=None):
    """Return the words of the fuel a change is measured on, with the mission."""
    config = config or {}
    if field == 'economic_block_fuel_kg':
        mission = config.get('economic_mission') or {}
        what = 'block fuel of the economic mission'
    else:
        mission = config.get('mission') or {}
        what = 'block fuel of the design mission'
    parts = [str(mission[k]) for k in ('range',) if k in mission]
    if 'payload' in mission:
        parts.append(f"{mission['payload']} payload")
    return what + (f" ({', '.join(parts)})" if parts else '')


def _fuel_field_of(data, config=None):
    """Return the field a fuel-burn change is measured on (given, or from the objective)."""
    field = data.get('fuel_burn_measured_on')
    if field:
        return field
    objective = str(((config or {}).get('optimization') or {}).get('objective', 'block_fuel'))
    objective = data.get('objective', objective) or objective
    return 'economic_block_fuel_kg' if str(objective).startswith('economic_') else 'block_fuel_kg'


def _more_less(change, what='fuel'):
    """Return 'burns 4.1 % more fuel' / 'burns 2.0 % less fuel'."""
    change = _number(change)
    if change is None:
        return f'has no {what} figure'
    word = 'more' if change > 0.0 else 'less'
    return f'burns {abs(change):.2f} % {word} {what}'


def _axis_text(path, values):
    """Return 'motor specific power 2–20 kW/kg (6 values)'."""
    field = field_at(path)
    units = field.units if field is not None else None
    nums = [_number(v) for v in values]
    nums = [v for v in nums if v is not None]
    if not nums:
        return input_label(path)
    lo, shown = _shown(min(nums), units)
    hi, _ = _shown(max(nums), units)
    unit = pretty_units(shown)
    unit = '' if unit == '-' else f' {unit}'
    return f'{input_label(path)} {_sig(lo)}–{_sig(hi)}{unit} ({len(nums)} values)'


def _path_units(path):
    """Return the SI units of a config key path (None for dimensionless or unknown)."""
    field = field_at(path)
    return field.units if field is not None else None


# ------------------------------------------------------------------------- reading


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


# -------------------------------------------------------------------------- figures

#: One-sentence captions of the figures the commands write (what to read from each).
CAPTIONS = {
    'map_fuel_change.png': 'Fuel-burn change of the turbo-electric design against the '
    'conventional reference over the map: blue is a saving, red a penalty, white and the bold '
    'line labelled break-even mark no change, and grey symbols mark points without a result.',
    'map_psc.png': 'Power saving coefficient of the aft fan over the map (against a clean '
    'free-stream fan of the same thrust and pressure ratio): read where ingestion pays most; '
    'it is an upper estimate (see the assumptions).',
    'montecarlo.png': 'Distribution of the fuel-burn change over the sampled technology '
    'inputs: the samples left of the black line are those where the turbo-electric design '
    'wins.',
    'targets_fuel_change.png': 'Fuel-burn change of the design optimised at each target '
    'against the optimised conventional reference: blue is a saving, red a penalty; grey '
    'symbols mark optimisations without a feasible optimum and designs that did not close.',
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


# ------------------------------------------------------------------------- studies


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
    """Return the counts of OK, INFEASIBLE and NOT_CLOSED rows."""
    statuses = [point_status(r) for r in rows]
    return {s: statuses.count(s) for s in (OK, INFEASIBLE, NOT_CLOSED)}


def _design_variables_section(design, constraints):
    """
    Return 'what holds the optimum': each design variable and constraint in words.

    Parameters
    ----------
    design : dict
        Path -> {value, lower, upper, units, active}.
    constraints : dict
        Name -> {value, lower, upper, equals, units, active}.

    Returns
    -------
    tuple
        (HTML, sentence naming what holds the design).
    """
    rows, held, bounds_held = [], [], []
    for path, dv in (design or {}).items():
        units = dv.get('units')
        value, lower, upper = (_number(dv.get(k)) for k in ('value', 'lower', 'upper'))
        if dv.get('active') and value is not None:
            at_lower = lower is not None and (
                upper is None or abs(value - lower) <= abs(value - upper)
            )
            side = 'lower' if at_lower else 'upper'
            words = (
                f'at its {side} bound: the optimiser would take it '
                f"{'lower' if at_lower else 'higher'} if it could"
            )
            tag = '<span class="tag active">bound</span> '
            bounds_held.append(
                f'the {side} bound of the {input_label(path)} ({_quantity(value, units)})'
            )
        else:
            words = 'free: set by the objective against the active constraints'
            tag = '<span class="tag free">free</span> '
        bounds = f'{_quantity(lower, units)} to {_quantity(upper, units)}'
        rows.append(
            [
                _raw_td(f'{_esc(input_label(path))}<br><code>{_esc(path)}</code>'),
                _td(_quantity(value, units), 'num'),
                _td(bounds),
                _raw_td(tag + _esc(words)),
            ]
        )
    out = []
    if rows:
        out.append(_table(['design variable', 'optimum', 'bounds', 'held by'], rows))
    crow = []
    for name, con in (constraints or {}).items():
        units = con.get('units')
        factor, shown = 1.0, units
        if units == 'm/s':
            factor, shown = 1.0 / _KNOT, 'kn'
        value = _number(con.get('value'))
        scale = max([1.0] + [abs(_number(con.get(k)) or 0.0) for k in ('lower', 'upper', 'equals')])
        if value is not None and abs(value) < 1e-8 * scale:
            value = 0.0  # on the limit to the optimiser's tolerance: shown as 0, not 2e-16

        def show(v):
            v = _number(v)
            if v is None:
                return None
            unit = pretty_units(shown)
            return f'{_sig(v * factor)}' + ('' if unit == '-' else f' {unit}')

        limits = [
            f'{word} {show(con.get(k))}'
            for k, word in (('lower', '≥'), ('upper', '≤'), ('equals', '='))
            if _number(con.get(k)) is not None
        ]
        words = CONSTRAINT_WORDS.get(name, name.replace('_', ' '))
        if con.get('active'):
            if _number(con.get('equals')) is not None:
                status = 'held at its target'
            elif 'margin' in name:
                status = 'used up: the design sits on this limit'
            else:
                status = 'at its limit: the design sits on it'
            tag = '<span class="tag active">active</span> '
            phrase = ACTIVE_PHRASES.get(name, f'the limit on the {words}')
            limit = next(
                (show(con.get(k)) for k in ('upper', 'lower', 'equals') if _number(con.get(k))),
                None,
            )
            held.append(f'{phrase} ({limit})' if limit else phrase)
        else:
            status = 'inside its limit'
            tag = '<span class="tag free">slack</span> '
        crow.append(
            [
                _raw_td(f'{_esc(words)}<br><code>{_esc(name)}</code>'),
                _td(show(value) or NONE, 'num'),
                _td(', '.join(limits) or NONE),
                _raw_td(tag + _esc(status)),
            ]
        )
    if crow:
        out.append(_table(['constraint', 'at the optimum', 'limit', 'status'], crow))
    everything = held + bounds_held
    if everything:
        listing = (
            everything[0]
            if len(everything) == 1
            else ', '.join(everything[:-1]) + ' and ' + everything[-1]
        )
        sentence = f'It is held by {listing}.'
    else:
        sentence = 'No bound or constraint is active: the optimum is an interior minimum.'
    counts = (len(held), len(bounds_held))
    return '\n'.join(out), sentence, counts


def _history_table(history, design):
    """Return the optimisation history as a table (in a collapsible block)."""
    paths = list(design or {})
    if not paths and history:
        paths = list(history[0].get('design') or {})
    header = ['evaluation', 'objective', 'worst violation', 'closed'] + [
        f'{input_label(p)} [{pretty_units(_shown(0, (design or {}).get(p, {}).get("units"))[1])}]'
        for p in paths
    ]
    rows = []
    for entry in history[:MAX_ROWS]:
        cells = [
            _td(_fmt(entry.get('evaluation'), '{:.0f}'), 'num'),
            _td(_sig(entry.get('objective'), 7), 'num'),
            _td(_fmt(entry.get('max_violation'), '{:.2e}'), 'num'),
            _td('yes' if entry.get('closed') else 'did not close'),
        ]
        for p in paths:
            units = (design or {}).get(p, {}).get('units')
            cells.append(_td(_sig(_shown((entry.get('design') or {}).get(p), units)[0], 5), 'num'))
        rows.append(cells)
    note = (
        f'<p class="note">First {MAX_ROWS} of {len(history)} rows shown; the full list is in '
        'the results file.</p>'
        if len(history) > MAX_ROWS
        else ''
    )
    return (
        f'<details><summary>Every evaluation ({len(history)} rows)</summary>\n'
        + _table(header, rows)
        + note
        + '</details>'
    )


def _key_values(pairs):
    """Return a compact two-column table of (label, text) pairs."""
    return _table(['input', 'value'], [[_td(k), _td(v)] for k, v in pairs])


def _optimization_study(data, reference, figures):
    """Return the Study of an optimisation (``optimize --out``)."""
    config = data.get('inputs') if isinstance(data.get('inputs'), dict) else {}
    outputs = data.get('outputs') or {}
    start = data.get('start') or {}
    field = _fuel_field_of(data, config)
    fuel = _fuel_words(field, config)
    ref_out = (reference or {}).get('outputs') if (reference or {}).get('success') else None
    success = bool(data.get('success'))
    opt_fuel, start_fuel = _number(outputs.get(field)), _number(start.get(field))
    from_start = 100.0 * (opt_fuel - start_fuel) / start_fuel if opt_fuel and start_fuel else None
    state = '' if success else ' (NOT a successful optimum: ' + _esc(data.get('message', '')) + ')'
    if ref_out and _number(ref_out.get(field)):
        ref_fuel = _number(ref_out[field])
        change = 100.0 * (opt_fuel - ref_fuel) / ref_fuel if opt_fuel is not None else None
        answer = (
            f'The optimised turbo-electric design <span class="{_cls(change)}">'
            f'{_more_less(change)}</span> than the optimised reference '
            f'({_fmt(opt_fuel, "{:,.0f}")} kg against {_fmt(ref_fuel, "{:,.0f}")} kg){state}.'
        )
        compared = (
            'the conventional reference (aft fan removed), optimised with the same '
            'objective and constraints'
        )
    else:
        change = None
        why = (
            f"its optimisation failed: {_esc((reference or {}).get('message', ''))}"
            if reference
            else 'no optimised reference in this directory'
        )
        answer = (
            f'The optimum <span class="{_cls(from_start)}">{_more_less(from_start)}</span> '
            'than its start '
            f'({_fmt(opt_fuel, "{:,.0f}")} kg against {_fmt(start_fuel, "{:,.0f}")} kg){state}; '
            f'{why}.'
        )
        compared = 'the start of the optimisation'
    holds_html, holds, (n_cons, n_bounds) = _design_variables_section(
        data.get('design'), data.get('constraints')
    )
    sentence = answer + ' ' + _esc(holds)
    body = [
        f'<p>{answer} The optimiser changed it by {_pct(from_start)} from its start. '
        f'{_esc(holds)}</p>'
    ]
    columns = [('start', start), ('optimum', outputs)]
    changes = [('change vs start', 1, 0)]
    if ref_out:
        columns.append(('optimised reference', ref_out))
        changes.append(('change vs reference', 1, 2))
    body.append('<h3>The design beside its reference</h3>')
    body.append(
        '<p class="note">Changes of masses, fuel, powers and lengths are relative (%); '
        'changes of coefficients, ratios and margins are differences in their own units. '
        f'{NONE} marks what a design does not have. The highlighted row is the fuel the '
        'verdict is measured on.</p>'
    )
    body.append(side_by_side(columns, changes, key_field=field))
    body.append(figures.take('mass_breakdown.png', 'power_flow.png'))
    body.append('<h3>What holds the optimum</h3>')
    body.append(holds_html)
    body.append(figures.take('convergence.png'))
    optimizer = (config.get('optimization') or {}).get('optimizer') or {}
    pairs = [
        ('objective', objective_label(data.get('objective', ''), outputs, data.get('history'))),
        ('optimiser', ', '.join(f'{k} {v}' for k, v in optimizer.items()) or NONE),
        ('outcome', str(data.get('message', NONE))),
        (
            'model evaluations',
            f"{data.get('evaluations', NONE)} ({data.get('failed_points', 0)} trial points "
            'did not close)',
        ),
    ]
    if reference is not None:
        pairs.append(
            (
                'optimised reference',
                str(reference.get('message', NONE))
                + (
                    f", {reference.get('evaluations')} evaluations"
                    if reference.get('evaluations') is not None
                    else ''
                ),
            )
        )
    body.append('<h3>Inputs of the optimisation</h3>')
    body.append(_key_values(pairs))
    if data.get('history'):
        body.append(_history_table(data['history'], data.get('design')))
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    title = 'Optimisation'
    line = (
        f'<span class="{_cls(change)}">{_pct(change)}</span> {_esc(field_short(field))} against '
        'the optimised reference'
        if change is not None
        else f'{_pct(from_start)} {_esc(field_short(field))} against its start'
    )
    plural = {1: ''}
    headline = (
        f'{line}; held by {n_cons} active constraint{plural.get(n_cons, "s")} and {n_bounds} '
        f'bound{plural.get(n_bounds, "s")}'
    )
    return Study('optimization', title, headline, fuel, compared, '\n'.join(body), config, sentence)


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


def _inputs_of_axes(axes):
    """Return the rows of a study's axes: label, lo–hi with units, count."""
    return [
        (input_label(p), _axis_text(p, v).split(input_label(p), 1)[1].strip())
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


def _map_study(data, rows, figures):
    """Return the Study of a design-space map."""
    config = data.get('config') or {}
    field = _fuel_field_of(data, config)
    axes = data.get('axes') or {}
    counts = _status_counts(rows)
    changes = [
        r['fuel_burn_change_percent']
        for r in rows
        if point_status(r) == OK and _number(r.get('fuel_burn_change_percent')) is not None
    ]
    wins = sum(c < 0.0 for c in changes)
    total = len(rows) or data.get('points_count') or 0
    if changes:
        share = 100.0 * wins / len(changes)
        spread = f'{_pct(min(changes))} to {_pct(max(changes))}'
        headline = (
            f'<span class="{"good" if wins else "bad"}">wins at {share:.0f} % of the map</span> '
            f'({wins} of {len(changes)} points with a result; change {spread})'
        )
        sentence = (
            f'Over the design-space map the turbo-electric design burns less fuel than the '
            f'conventional reference at {wins} of {len(changes)} points ({share:.0f} %); the '
            f'change runs from {spread}.'
        )
    else:
        headline = 'no point of the map has a result'
        sentence = 'No point of the design-space map closed.'
    body = [f'<p>{sentence}</p>']
    missing = total - len(changes)
    if missing:
        body.append(
            f'<p class="note">{counts[NOT_CLOSED]} of {total} points did not close; they are '
            'marked on the maps and listed with the reason in the CSV file.</p>'
        )
    body.append(figures.take('map_fuel_change.png', 'map_psc.png'))
    best = _best(rows)
    ref = data.get('reference') or {}
    if best is not None and ref:
        body.append('<h3>The best point of the map beside the reference</h3>')
        body.append(
            f'<p class="note">Best point: {_esc(_point_name(best, list(axes)))}. The map '
            'keeps only the main fields of each point; the reference is the conventional '
            'design as configured (not optimised).</p>'
        )
        body.append(
            side_by_side(
                [('best map point', best), ('reference', ref)],
                [('change', 0, 1)],
                key_field=field,
                require=0,
            )
        )
    pairs = _inputs_of_axes(axes) + [
        (
            'points',
            f'{total} ({total - missing} closed, {data.get("recovered", 0)} of them by '
            'continuation)',
        ),
        ('analysis', 'the configured design analysed at every point (not re-optimised)'),
    ]
    body.append('<h3>Inputs of the map</h3>')
    body.append(_key_values(pairs))
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'map',
        'Design-space map',
        headline,
        _fuel_words(field, config),
        'the conventional reference as configured (not optimised)',
        '\n'.join(body),
        config,
        sentence,
    )


def _distribution_text(spec):
    """Return 'uniform 5 kW/kg to 20 kW/kg' from ``{'uniform': [lo, hi]}``."""
    if not isinstance(spec, dict) or len(spec) != 1:
        return _text(spec)
    ((kind, params),) = spec.items()
    params = [str(p) for p in params] if isinstance(params, list) else [str(params)]
    if kind == 'triangular' and len(params) == 3:
        return f'triangular: {params[0]} to {params[2]}, most likely {params[1]}'
    if kind == 'uniform' and len(params) == 2:
        return f'uniform: {params[0]} to {params[1]}'
    return f'{kind}: {", ".join(params)}'


def _montecarlo_study(data, rows, figures):
    """Return the Study of a Monte Carlo study."""
    config = data.get('config') or {}
    field = _fuel_field_of(data, config)
    stats = data.get('fuel_burn_change_percent') or {}
    prob = _number(data.get('probability_of_win'))
    samples = data.get('samples') or len(rows)
    counts = _status_counts(rows) if rows else None
    closed = (counts[OK] if counts else None) or data.get('closed_count')
    dists = data.get('distributions') or {}
    names = ', '.join(input_label(p) for p in dists)
    if prob is not None:
        headline = (
            f'<span class="{"good" if prob >= 0.5 else "bad"}">probability of a win '
            f'{100.0 * prob:.0f} %</span> over {samples} samples (mean change '
            f"{_pct(stats.get('mean'))}, 5–95 %: {_pct(stats.get('p05'))} to "
            f"{_pct(stats.get('p95'))})"
        )
        sentence = (
            f'Over the stated distributions of {_esc(names)}, the probability that the '
            f'turbo-electric design burns less fuel than the reference is {100.0 * prob:.0f} % '
            f"({samples} samples; mean change {_pct(stats.get('mean'))})."
        )
    else:
        headline = 'no sample closed'
        sentence = 'No Monte Carlo sample closed.'
    body = [f'<p>{sentence}</p>']
    body.append(figures.take('montecarlo.png'))
    srows = [
        [
            _td('probability that the turbo-electric design wins'),
            _td(NONE if prob is None else f'{100.0 * prob:.1f} %', 'num'),
        ],
        [_td('mean fuel-burn change'), _td(_pct(stats.get('mean')), 'num')],
        [_td('standard deviation'), _td(_fmt(stats.get('std'), '{:.2f} %'), 'num')],
        [_td('5th percentile'), _td(_pct(stats.get('p05')), 'num')],
        [_td('median'), _td(_pct(stats.get('p50')), 'num')],
        [_td('95th percentile'), _td(_pct(stats.get('p95')), 'num')],
        [_td('samples with a result'), _td(f'{closed} of {samples}', 'num')],
    ]
    body.append('<h3>Distribution of the fuel-burn change</h3>')
    body.append(_table(['statistic', 'value'], srows))
    body.append('<h3>Inputs of the Monte Carlo study</h3>')
    body.append(
        _table(
            ['technology input', 'distribution'],
            [
                [
                    _raw_td(f'{_esc(input_label(p))} <code>{_esc(p)}</code>'),
                    _td(_distribution_text(s)),
                ]
                for p, s in dists.items()
            ],
        )
    )
    body.append(
        _key_values(
            [
                ('samples', str(samples)),
                ('seed', str(data.get('seed', NONE))),
                ('analysis', 'the configured design analysed at every sample (not re-optimised)'),
            ]
        )
    )
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'montecarlo',
        'Monte Carlo',
        headline,
        _fuel_words(field, config),
        'the conventional reference as configured (not optimised)',
        '\n'.join(body),
        config,
        sentence,
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


def _targets_study(data, rows, figures):
    """Return the Study of a target sweep."""
    config = data.get('config') or {}
    field = rows[0].get('fuel_burn_measured_on') if rows else None
    field = field or _fuel_field_of(data, config)
    axes = data.get('target_axes') or {p: [] for p in data.get('targets') or []}
    bounds = _dv_bounds(config)
    counts = _status_counts(rows)
    best = _best(rows)
    wins = sum(
        1
        for r in rows
        if point_status(r) == OK and (_number(r.get('fuel_burn_change_percent')) or 0.0) < 0.0
    )
    paths = list(axes)
    if best is not None:
        change = best['fuel_burn_change_percent']
        headline = (
            f'best point <span class="{_cls(change)}">{_pct(change)}</span> against the '
            f'optimised reference ({_esc(_point_name(best, paths, "target:"))}); wins at '
            f'{wins} of {len(rows)} points'
        )
        sentence = (
            f'Optimised at each target, the turbo-electric design at its best point '
            f'({_esc(_point_name(best, paths, "target:"))}) {_more_less(change)} than the '
            f'optimised reference; it wins at {wins} of {len(rows)} points.'
        )
    else:
        change = None
        headline = 'no target point has a feasible optimum'
        sentence = 'No target point has a feasible optimum.'
    failed = []
    if counts[INFEASIBLE]:
        failed.append(f'{counts[INFEASIBLE]} closed without a feasible optimum')
    if counts[NOT_CLOSED]:
        failed.append(f'{counts[NOT_CLOSED]} did not close')
    if failed:
        headline += f'; {", ".join(failed)}'
        sentence += f' Of the {len(rows)} points, {" and ".join(failed)}.'
    body = [f'<p>{sentence}</p>']
    body.append(figures.take('targets_fuel_change.png', 'targets_psc.png'))
    ref = (data.get('reference') or {}).get('outputs') or {}
    if best is not None and ref:
        body.append('<h3>The best target point beside the optimised reference</h3>')
        body.append(
            '<p class="note">A target-sweep row keeps the main masses and fuel; the airframe '
            'mass is the operating empty mass less the propulsion and electrical masses.</p>'
        )
        fields = dict(best)
        try:
            fields['airframe_mass_kg'] = (
                best['oew_kg']
                - best['engines_mass_kg']
                - best['aft_fan_mass_kg']
                - best['electrical_mass_kg']
            )
            fields['payload_kg'] = best['mtow_kg'] - best['oew_kg'] - best['total_fuel_kg']
        except (KeyError, TypeError):
            pass
        body.append(
            side_by_side(
                [('best target point', fields), ('optimised reference', ref)],
                [('change', 0, 1)],
                key_field=field,
                require=0,
            )
        )
        body.append(
            f'<p>At the best point the optimum is held by: '
            f"{_esc(_active_words(best.get('active_constraints'), best, bounds))}.</p>"
        )
    body.append(figures.take('targets_mass_breakdown.png'))
    if rows:
        body.append('<h3>Every target point</h3>')
        trows = []
        for r in rows[:MAX_ROWS]:
            status = point_status(r)
            words = {
                OK: 'optimum',
                INFEASIBLE: 'closed, no feasible optimum',
                NOT_CLOSED: 'did not close',
            }[status]
            chg = r.get('fuel_burn_change_percent')
            cells = [_td(_quantity(r.get(f'target:{p}'), _path_units(p)), 'num') for p in paths]
            cells += [
                _td(words),
                _td(_pct(chg), 'num ' + _cls(chg) if status == OK else 'num'),
                _td(_fmt(r.get('mtow_kg'), '{:,.0f}'), 'num'),
                _td(
                    _active_words(r.get('active_constraints'), r, bounds)
                    if status == OK
                    else str(r.get('message', ''))
                ),
            ]
            trows.append(cells)
        body.append(
            _table(
                [input_label(p) for p in paths]
                + ['result', 'fuel-burn change', 'MTOW [kg]', 'held by (or why it failed)'],
                trows,
            )
        )
        if len(rows) > MAX_ROWS:
            body.append(
                f'<p class="note">First {MAX_ROWS} of {len(rows)} points shown; all are in '
                'targets_points.csv.</p>'
            )
    pairs = [
        (input_label(p), _axis_text(p, v).split(input_label(p), 1)[1].strip() or 'model output')
        for p, v in axes.items()
    ]
    pairs.append(
        (
            'optimisations',
            f'{len(rows)} points and {len(data.get("references") or [])} '
            'reference(s), each optimised with the configured objective',
        )
    )
    body.append('<h3>Inputs of the target sweep</h3>')
    body.append(_key_values(pairs))
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'targets',
        'Target sweep',
        headline,
        _fuel_words(field, config),
        'the optimised conventional reference',
        '\n'.join(body),
        config,
        sentence,
    )


def _breakeven_study(data, rows, figures):
    """Return the Study of a technology break-even."""
    config = data.get('config') or {}
    field = _fuel_field_of(data, config)
    path = data.get('path', '')
    units = data.get('units')
    label = input_label(path)
    lo, hi = _quantity(data.get('lower'), units), _quantity(data.get('upper'), units)
    span = f'{_sig(_shown(data.get("lower"), units)[0])}–{hi}'
    at = data.get('design_at_value') or {}
    if data.get('found'):
        value = _quantity(data.get('value'), units)
        holds = (
            _active_words(
                at.get('active'),
                {f'dv:{k}': v for k, v in (at.get('design') or {}).items()},
                _dv_bounds(config),
            )
            if at.get('success')
            else None
        )
        headline = f'break-even {_esc(label)} <b>{_esc(value)}</b>'
        sentence = (
            f'The optimised turbo-electric design breaks even with the optimised reference at '
            f'{_esc(label)} = {_esc(value)}; above it the turbo-electric design burns '
            f"{'less' if (_number(data.get('difference_at_upper')) or 0) < 0 else 'more'} fuel."
        )
        if holds:
            headline += f'; held there by {_esc(holds)}'
            sentence += f' There the optimum is held by {_esc(holds)}.'
    else:
        d_lo, d_hi = data.get('difference_at_lower'), data.get('difference_at_upper')
        headline = (
            f'no break-even in {_esc(span)}: <span class="{_cls(d_lo)}">{_pct(d_lo)}</span> at '
            f'{_esc(lo)}, <span class="{_cls(d_hi)}">{_pct(d_hi)}</span> at {_esc(hi)}'
        )
        sentence = (
            f'There is no break-even of {_esc(label)} in {_esc(span)}: the optimised design '
            f'{_more_less(d_lo)} than the optimised reference at {_esc(lo)} and '
            f'{_more_less(d_hi).replace("burns ", "")} at {_esc(hi)}.'
        )
    body = [f'<p>{sentence}</p>']
    body.append(figures.take('breakeven.png'))
    evals = sorted(data.get('evaluations') or [], key=lambda e: e.get('value', 0.0))
    if evals:
        body.append('<h3>Optimised evaluations</h3>')
        body.append(
            _table(
                [
                    f'{label} [{pretty_units(_shown(0, units)[1])}]',
                    'fuel burn [kg]',
                    'change against the reference',
                ],
                [
                    [
                        _td(_sig(_shown(e.get('value'), units)[0]), 'num'),
                        _td(_fmt(e.get('block_fuel_kg'), '{:,.1f}'), 'num'),
                        _td(_pct(e.get('difference')), 'num ' + _cls(e.get('difference'))),
                    ]
                    for e in evals
                ],
            )
        )
    sens = data.get('sensitivities') or {}
    if sens:
        body.append('<h3>Sensitivity of block fuel to the technology inputs</h3>')
        body.append(
            '<p class="note">Local derivatives at the configured design (not re-optimised): '
            'the elasticity is the percent change of block fuel per percent change of the '
            'input.</p>'
        )
        ordered = sorted(sens.items(), key=lambda kv: -abs(_number(kv[1].get('elasticity')) or 0))
        body.append(
            _table(
                ['technology input', 'configured value', 'elasticity [% per %]'],
                [
                    [
                        _raw_td(f'{_esc(input_label(p))} <code>{_esc(p)}</code>'),
                        _td(_quantity(s.get('value'), s.get('units')), 'num'),
                        _td(_fmt(s.get('elasticity'), '{:+.4f}'), 'num'),
                    ]
                    for p, s in ordered
                ],
            )
        )
    pairs = [
        ('technology input', f'{label} ({path})'),
        ('search interval', f'{lo} to {hi}'),
        ('reference fuel burn', _fmt(data.get('reference_block_fuel_kg'), '{:,.1f} kg')),
        ('method', "Brent's method on the optimised fuel-burn difference"),
    ]
    body.append('<h3>Inputs of the break-even study</h3>')
    body.append(_key_values(pairs))
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'breakeven',
        'Technology break-even',
        headline,
        _fuel_words(field, config),
        'the optimised conventional reference',
        '\n'.join(body),
        config,
        sentence,
    )


# --------------------------------------------------------- generic JSON (fallback)


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


def _other_study(name, data):
    """Return a Study of a JSON file the report does not know, as plain tables."""
    if not isinstance(data, dict):
        data = {'content': data}
    parts = {'records': [], 'scalars': {}}
    _walk(data, '', parts)
    body = [f'<details><summary>Every value of {_esc(name)}</summary>']
    if parts['scalars']:
        body.append(
            _table(
                ['quantity', 'value'],
                [[_td(k), _cell(v)] for k, v in parts['scalars'].items()],
            )
        )
    for title, value in parts['records']:
        body.append(f'<h3>{_esc(title)} ({len(value)} rows)</h3>\n' + _records_table(value))
    body.append('</details>')
    return Study('other', f'Other results: {name}', 'see its section', NONE, NONE, '\n'.join(body))


# -------------------------------------------------------------------- the document

#: The simplifications that matter for the answer (docs/theory.md, section 6, abridged).
ASSUMPTIONS = [
    'One cruise point at the mid-cruise mass stands for the whole cruise, the diversion and '
    'the hold; take-off, climb, descent and landing are fixed historical fuel fractions. The '
    'economic mission keeps the design cruise point’s overall efficiency (no part-power '
    'TSFC change, no off-design ingestion).',
    'Drag: a parabolic polar with a constant Oswald efficiency plus the wing’s wave drag '
    '(Korn equation with simple sweep theory); fully turbulent skin friction; one constant '
    'miscellaneous drag coefficient. Results well past the drag-divergence Mach number are '
    'extrapolation.',
    'Masses: statistical equations fitted to past, mostly metallic transports (Raymer, '
    'Aircraft Design: A Conceptual Approach; Torenbeek for the landing gear); very high '
    'aspect ratios or composite structure are extrapolation. Electrical devices scale '
    'linearly with rated power; turbofan masses use demo constants, not data.',
    'Fans are one-dimensional (fully expanded nozzle, no intake, duct or nozzle losses); the '
    'turbofan core is a shaft-power source of constant thermal efficiency.',
    'Boundary-layer ingestion pays only through a lower aft-fan shaft power; the drag is not '
    'reduced. The layer is axisymmetric with a power-law profile taken from the whole '
    'fuselage drag, and distortion costs efficiency through a stated linear law. Read the '
    'power saving coefficients as upper estimates.',
    'Electrical chain: constant cruise efficiencies, losses at cruise, a DC cable at 20 °C, '
    'and a partial-discharge limit from Paschen’s law for one assumed air gap.',
    'Take-off and landing at ISA sea level with statistical field-length correlations; no '
    'engine-failure case. The performance constraints act only through an optimisation.',
    'Design-space maps and Monte Carlo studies analyse the configured design without '
    're-optimising it; target sweeps and break-even studies optimise every point and the '
    'reference. The optimiser is local: its result depends on the start. Brent’s method '
    'finds one break-even in the interval.',
]

_ORDER = ['optimization', 'targets', 'breakeven', 'montecarlo', 'map', 'other']


def _kind_of(name, data):
    """Return the study kind of a JSON file, 'reference' or 'other'."""
    if not isinstance(data, dict):
        return 'other'
    if data.get('role') == 'optimised conventional reference' or name == 'reference_results.json':
        return 'reference'
    if data.get('status') == 'partial':
        return 'partial'
    kind = data.get('kind')
    if kind in ('map', 'montecarlo', 'targets', 'breakeven'):
        return kind
    if 'design' in data and 'history' in data:
        return 'optimization'
    return 'other'


def collect_studies(results_dir):
    """
    Read every result of a directory and render its studies.

    Parameters
    ----------
    results_dir : str
        The results directory.

    Returns
    -------
    tuple
        (list of Study in reading order, list of notes on partial results, _Figures).
    """
    jsons = sorted(glob.glob(os.path.join(glob.escape(results_dir), '*.json')))
    loaded = [(os.path.basename(p), _read_json(p)) for p in jsons]
    figures = _Figures(results_dir)
    reference = next((d for n, d in loaded if _kind_of(n, d) == 'reference'), None)
    studies, notes = [], []
    for name, data in loaded:
        kind = _kind_of(name, data)
        stem = name[: -len('_summary.json')] if name.endswith('_summary.json') else None
        rows = read_points(os.path.join(results_dir, f'{stem}_points.csv')) if stem else []
        if kind == 'optimization':
            studies.append(_optimization_study(data, reference, figures))
        elif kind == 'map':
            studies.append(_map_study(data, rows, figures))
        elif kind == 'montecarlo':
            studies.append(_montecarlo_study(data, rows, figures))
        elif kind == 'targets':
            studies.append(_targets_study(data, rows, figures))
        elif kind == 'breakeven':
            studies.append(_breakeven_study(data, rows, figures))
        elif kind == 'partial':
            notes.append(f'{name}: {data.get("message", "partial results")}')
        elif kind == 'other':
            studies.append(_other_study(name, data))
    studies.sort(key=lambda s: _ORDER.index(s.kind))
    return studies, notes, figures


def _verdict(studies, notes):
    """Return the verdict paragraph and the headline table."""
    main = [s for s in studies if s.kind != 'other']
    sentences = ' '.join(s.sentence for s in main if s.sentence)
    if not sentences:
        sentences = 'This directory holds no study with a fuel-burn answer.'
    rows = [
        [
            _raw_td(f'<a href="#{s.anchor}">{_esc(s.title)}</a>'),
            _raw_td(s.answer),
            _td(s.fuel),
            _td(s.reference),
        ]
        for s in main
    ]
    out = [
        '<section class="verdict" id="verdict">',
        '<h2 style="margin-top:0.2em;border:none">Verdict</h2>',
        f'<p>{sentences}</p>',
    ]
    if rows:
        out.append(
            _table(['study', 'answer', 'fuel burn measured on', 'compared with'], rows, 'headline')
        )
    for note in notes:
        out.append(f'<p class="note">Incomplete: {_esc(note)}</p>')
    out.append('</section>')
    return '\n'.join(out)


def _config_section(studies):
    """Return the configurations used, collapsible (one block per distinct one)."""
    import yaml

    seen = []
    for s in studies:
        if s.config and s.config not in [c for c, _ in seen]:
            seen.append((s.config, s.title))
    if not seen:
        return ''
    out = ['<h2 id="configuration">Configuration used</h2>']
    for config, title in seen:
        text = yaml.safe_dump(config, sort_keys=False, default_flow_style=False, allow_unicode=True)
        which = '' if len(seen) == 1 else f' by {title}'
        out.append(
            f'<details><summary>The configuration used{_esc(which)} '
            f'({_esc(config.get("aircraft", ""))}, {text.count(chr(10))} lines of YAML)</summary>'
            f'<pre>{_esc(text)}</pre></details>'
        )
    return '\n'.join(out)


def write_report(results_dir, out_path=None):
    """
    Write one self-contained HTML report of a results directory.

    Parameters
    ----------
    results_dir : str
        Directory holding the result files (``*.json``, ``*_points.csv``, ``*.png``).
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
    pngs = glob.glob(os.path.join(glob.escape(results_dir), '*.png'))
    jsons = glob.glob(os.path.join(glob.escape(results_dir), '*.json'))
    if not pngs and not jsons:
        raise ConfigError(
            'the results directory holds no results (no .png or .json files)',
            source=str(results_dir),
        )
    out_path = out_path or os.path.join(results_dir, 'report.html')
    if not os.path.isdir(os.path.dirname(os.path.abspath(out_path))):
        raise ConfigError('the directory of the report does not exist', source=str(out_path))
    studies, notes, figures = collect_studies(results_dir)
    design = next(
        (s.config.get('aircraft') for s in studies if s.config and s.config.get('aircraft')),
        None,
    )
    folder = os.path.basename(os.path.abspath(results_dir))
    title = design or f'voltwake results: {folder}'
    kinds = ', '.join(s.title for s in studies) or 'figures only'
    parts = [
        f'<h1>{_esc(title)}</h1>',
        '<p class="subtitle">Does the turbo-electric design with a wake-ingesting aft fan burn '
        'less fuel than the conventional aircraft built to the same rules? · voltwake report '
        f'of <code>{_esc(folder)}</code>: {_esc(kinds)}</p>',
        f'<p class="caution"><b>Caution.</b> {_esc(CAUTION)}</p>',
        _verdict(studies, notes),
    ]
    if len(studies) > 1:
        links = ''.join(f'<li><a href="#{s.anchor}">{_esc(s.title)}</a></li>' for s in studies)
        parts.append(
            f'<nav><b>Contents</b><ul>{links}'
            '<li><a href="#assumptions">Assumptions and cautions</a></li></ul></nav>'
        )
    for s in studies:
        parts.append(f'<h2 id="{s.anchor}">{_esc(s.title)}</h2>')
        parts.append(s.body)
    leftover = figures.take(*sorted(figures.left))
    if leftover:
        parts.append('<h2 id="figures">Other figures</h2>')
        parts.append(leftover)
    elif not pngs:
        parts.append(
            '<p class="note">This directory holds no figures (they need matplotlib, a '
            'dependency of voltwake).</p>'
        )
    parts.append(_config_section(studies))
    parts.append('<h2 id="assumptions">Assumptions that matter</h2>')
    parts.append(
        '<ul class="assumptions">'
        + ''.join(f'<li>{_esc(a)}</li>' for a in ASSUMPTIONS)
        + '</ul><p class="note">The full list: docs/theory.md, section 6 '
        '"Simplifications and validity".</p>'
    )
    parts.append('<h2 id="cautions">Cautions</h2>')
    parts.append(f'<p class="caution">{_esc(CAUTION)}</p>')
    text = (
        '\n'.join(
            [
                '<!DOCTYPE html>',
                '<html lang="en">',
                '<head>',
                '<meta charset="utf-8">',
                '<meta name="viewport" content="width=device-width, initial-scale=1">',
                f'<title>{_esc(title)}</title>',
                f'<style>{_STYLE}</style>',
                '</head>',
                '<body>',
                *parts,
                '</body>',
                '</html>',
            ]
        )
        + '\n'
    )
    write_atomic(out_path, text)
    return out_path
