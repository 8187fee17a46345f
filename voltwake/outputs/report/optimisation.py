"""The report section of an optimisation: the design beside its reference, what holds it."""

from ..summary import input_label, pretty_units
from .html import (
    MAX_ROWS,
    NONE,
    _cls,
    _esc,
    _fmt,
    _number,
    _pct,
    _quantity,
    _raw_td,
    _shown,
    _sig,
    _table,
    _td,
)
from .study import Study, field_short
from .wording import (
    _KNOT,
    ACTIVE_PHRASES,
    CONSTRAINT_WORDS,
    _fuel_field_of,
    _fuel_words,
    _more_less,
    objective_label,
    side_by_side,
)


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
