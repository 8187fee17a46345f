"""The report sections of the trade studies: map, Monte Carlo, targets, break-even."""

from ..plots import FAILED, INFEASIBLE, NOT_CLOSED, OK, point_status
from ..summary import ANALYSIS_ONLY, binding_words, input_label, pretty_units
from .html import (
    MAX_ROWS,
    NONE,
    _cell,
    _cls,
    _esc,
    _fmt,
    _number,
    _pct,
    _quantity,
    _raw_td,
    _records_table,
    _shown,
    _sig,
    _table,
    _td,
    _text,
)
from .optimisation import _key_values
from .study import (
    Study,
    _active_words,
    _best,
    _dv_bounds,
    _inputs_of_axes,
    _point_name,
    _status_counts,
    _walk,
)
from .wording import _axis_text, _fuel_field_of, _fuel_words, _more_less, _path_units, side_by_side


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
    follows = data.get('reference_follows') or []
    if follows:
        body.append(_following_note(follows, 'point'))
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
    pairs = _inputs_of_axes(axes, data.get('axis_units')) + [
        (
            'points',
            f'{total} ({total - missing} closed, {data.get("recovered", 0)} of them by '
            'continuation)',
        ),
        ('analysis', 'the configured design analysed at every point (not re-optimised)'),
        ('reference', _reference_words(follows)),
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
        _compared_with(data),
        '\n'.join(body),
        config,
        sentence,
    )


def _reference_words(follows):
    """Say which reference a map or Monte Carlo compares every point with."""
    if follows:
        names = ', '.join(f'{input_label(p)} ({p})' for p in follows)
        return (
            f'the conventional reference as configured, re-analysed at every point with its '
            f'{names}: each point against its own reference'
        )
    return (
        'the conventional reference as configured, one for all points (the study varies '
        'technology inputs only)'
    )


def _following_note(follows, what):
    """Return the note that the reference follows inputs of the study (HTML)."""
    names = ', '.join(_esc(input_label(p)) for p in follows)
    return (
        f'<p class="note">The study varies inputs the conventional reference shares ({names}): '
        f'the reference is analysed at every {what} with the same values, and each change is '
        f"against that {what}'s own reference (its block fuel is in the CSV file).</p>"
    )


def _compared_with(data):
    """Return the words of the reference a map or Monte Carlo is compared with."""
    if data.get('reference_follows'):
        return 'the conventional reference as configured, re-analysed at every point'
    return 'the conventional reference as configured (not optimised)'


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
            f'Analysis only (configured design point, not re-optimised): over the stated '
            f'distributions of {_esc(names)}, the probability that the '
            f'turbo-electric design burns less fuel than the reference is {100.0 * prob:.0f} % '
            f"({samples} samples; mean change {_pct(stats.get('mean'))})."
        )
    else:
        headline = 'no sample closed'
        sentence = 'No Monte Carlo sample closed.'
    body = [f'<p>{sentence}</p>']
    if data.get('reference_follows'):
        body.append(_following_note(data['reference_follows'], 'sample'))
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
                ('analysis', f'{ANALYSIS_ONLY}: the configured design analysed at every sample'),
                ('reference', _reference_words(data.get('reference_follows') or [])),
            ]
        )
    )
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'montecarlo',
        f'Monte Carlo, {ANALYSIS_ONLY}',
        headline,
        _fuel_words(field, config),
        _compared_with(data),
        '\n'.join(body),
        config,
        sentence,
    )


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
    if data.get('infeasible_count'):  # a sweep that told infeasible points from failures
        failed.append(
            f"{data['infeasible_count']} points have no feasible design: {binding_words(data)}"
        )
    elif counts[INFEASIBLE]:
        failed.append(f'{counts[INFEASIBLE]} closed without a feasible optimum')
    if counts[FAILED]:
        failed.append(f'{counts[FAILED]} optimisations failed (the optimiser, not the design)')
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
            no_design = 'no feasible design' if 'status' in r else 'closed, no feasible optimum'
            words = {
                OK: 'optimum',
                INFEASIBLE: no_design,
                FAILED: 'optimiser failed',
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
        (
            input_label(p),
            _axis_text(p, v, (data.get('axis_units') or {}).get(p))
            .split(input_label(p), 1)[1]
            .strip()
            or 'model output',
        )
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
        for dep in data.get('bound_dependence') or []:
            if dep.get('material'):
                sentence += f' But {_esc(dep.get("message", ""))}.'
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
    body.extend(_breakeven_root_parts(data))
    sens = data.get('sensitivities') or {}
    if sens:
        at = data.get('sensitivities_at') or {}
        where = (
            f'at the break-even ({_esc(label)} = {_esc(_quantity(at.get("value"), units))})'
            if at.get('where') == 'break-even'
            else f'at the configured {_esc(label)} ({_esc(_quantity(at.get("value"), units))})'
        )
        body.append('<h3>Sensitivity of the optimised block fuel to the technology inputs</h3>')
        body.append(
            f'<p class="note">At the optimised turbo-electric design {where}, every design '
            'variable re-optimised (post-optimality sensitivity, envelope theorem: the '
            "objective's derivative plus the active constraints' multipliers times theirs). "
            'The derivative is in kg of block fuel per unit of the input as shown; the '
            'elasticity is the percent change of block fuel per percent change of the input. '
            'The conventional reference has none of these inputs: its sensitivities are zero. '
            'Inputs that are design variables are optimised, not fixed, and are not listed.</p>'
        )
        ordered = sorted(sens.items(), key=lambda kv: -abs(_number(kv[1].get('elasticity')) or 0))
        body.append(
            _table(
                ['technology input', 'value', 'd(block fuel)/d(input)', 'elasticity [% per %]'],
                [
                    [
                        _raw_td(f'{_esc(input_label(p))} <code>{_esc(p)}</code>'),
                        _td(_quantity(s.get('value'), s.get('units')), 'num'),
                        _td(_per_unit(s.get('derivative'), s.get('units')), 'num'),
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


def _per_unit(derivative, units):
    """Return a derivative of block fuel per unit of an input, in the unit it is shown in."""
    value = _number(derivative)
    if value is None:
        return '–'
    factor, shown = _shown(1.0, units)  # one SI unit in the shown unit
    per = value / factor if factor else value
    return f'{per:+.4g} kg per {pretty_units(shown) if units else "unit"}'


def _breakeven_root_parts(data):
    """Return the HTML parts of what holds the optimum at a break-even and its bounds."""
    held = data.get('design_at_value') or {}
    if not data.get('found') or not held.get('design_variables'):
        return []
    parts = ['<h3>The optimised design at the break-even</h3>']
    for dep in data.get('bound_dependence') or []:
        text = f'{_esc(dep.get("message", ""))}.'
        parts.append(
            f'<p><b>{text}</b></p>' if dep.get('material') else f'<p class="note">{text}</p>'
        )
    cons = held.get('active_constraints') or {}
    parts.append(
        _table(
            ['design variable', 'value', 'lower bound', 'upper bound', 'held at'],
            [
                [
                    _raw_td(f'{_esc(input_label(p))} <code>{_esc(p)}</code>'),
                    _td(_quantity(d.get('value'), d.get('units')), 'num'),
                    _td(_quantity(d.get('lower'), d.get('units')), 'num'),
                    _td(_quantity(d.get('upper'), d.get('units')), 'num'),
                    _td(f"its {d['at_bound']} bound" if d.get('at_bound') else '–'),
                ]
                for p, d in held['design_variables'].items()
            ],
        )
    )
    if cons:
        parts.append(
            _table(
                ['active constraint', 'value', 'limit', 'multiplier (kg per unit)'],
                [
                    [
                        _td(input_label(n)),
                        _td(_quantity(c.get('value'), c.get('units')), 'num'),
                        _td(
                            _quantity(
                                next(
                                    (
                                        c[k]
                                        for k in ('equals', 'upper', 'lower')
                                        if c.get(k) is not None
                                    ),
                                    None,
                                ),
                                c.get('units'),
                            ),
                            'num',
                        ),
                        _td(_fmt(c.get('multiplier'), '{:+.4g}'), 'num'),
                    ]
                    for n, c in cons.items()
                ],
            )
        )
    return parts


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
