"""The report section of a Monte Carlo study that re-optimises both aircraft per sample."""

from ..summary import display_units, input_label, pretty_units
from .html import MAX_ROWS, NONE, _esc, _fmt, _number, _pct, _raw_td, _sig, _table, _td
from .optimisation import _key_values
from .study import Study
from .trade_studies import _distribution_text
from .wording import _fuel_field_of, _fuel_words

#: What the section says the reference is.
REFERENCE = 'the conventional reference, optimised to the same rules'


def _percent(value, digits=1):
    """Return a probability (0..1) as '12.3 %', or the dash."""
    value = _number(value)
    return NONE if value is None else f'{100.0 * value:.{digits}f} %'


def _answer(data):
    """Return the headline (HTML) and the verdict sentence of the study."""
    prob = _number(data.get('probability_of_win'))
    stats = data.get('fuel_burn_change_percent') or {}
    ci = data.get('probability_of_win_interval') or {}
    ok, samples = data.get('successful_samples') or 0, data.get('samples') or 0
    if prob is None:
        return (
            'no sample has an optimum of both aircraft',
            'No Monte Carlo sample has an optimum of both aircraft.',
        )
    names = ', '.join(input_label(p) for p in data.get('distributions') or {})
    interval = f'{_percent(ci.get("lower"))} to {_percent(ci.get("upper"))}'
    headline = (
        f'<span class="{"good" if prob >= 0.5 else "bad"}">probability of a win '
        f'{_percent(prob, 0)}</span> (95 % Wilson score interval {interval}; {ok} of '
        f'{samples} samples optimised; mean change {_pct(stats.get("mean"))}, 5–95 %: '
        f'{_pct(stats.get("p05"))} to {_pct(stats.get("p95"))})'
    )
    sentence = (
        f'With both aircraft re-optimised at every sample of {_esc(names)}, the turbo-electric '
        f'optimum burns less fuel than the optimised reference with a probability of '
        f'{_percent(prob, 0)} (95 % Wilson score interval {interval}, over the {ok} samples '
        f'of {samples} where both optimisations succeeded); the mean change is '
        f'{_pct(stats.get("mean"))}.'
    )
    return headline, sentence


def _statistics_table(data):
    """Return the table of the fuel-burn change and the probability of a win."""
    stats = data.get('fuel_burn_change_percent') or {}
    ci = data.get('probability_of_win_interval') or {}
    nominal = (data.get('nominal') or {}).get('fuel_burn_change_percent')
    counts = data.get('status_counts') or {}
    rows = [
        [
            _td('probability that the turbo-electric design wins'),
            _td(_percent(data.get('probability_of_win')), 'num'),
        ],
        [
            _td(f'95 % confidence interval ({ci.get("method", "Wilson score interval")})'),
            _td(f'{_percent(ci.get("lower"))} to {_percent(ci.get("upper"))}', 'num'),
        ],
        [
            _td('wins / samples with an optimum of both aircraft'),
            _td(f'{data.get("wins", 0)} / {data.get("successful_samples", 0)}', 'num'),
        ],
        [_td('mean fuel-burn change'), _td(_pct(stats.get('mean')), 'num')],
        [_td('standard deviation'), _td(_fmt(stats.get('std'), '{:.2f} %'), 'num')],
        [_td('5th percentile'), _td(_pct(stats.get('p05')), 'num')],
        [_td('median'), _td(_pct(stats.get('p50')), 'num')],
        [_td('95th percentile'), _td(_pct(stats.get('p95')), 'num')],
        [_td('change of the optima at the nominal inputs'), _td(_pct(nominal), 'num')],
        [
            _td('samples: optimum / infeasible / failed'),
            _td(
                f'{counts.get("optimum", 0)} / {counts.get("infeasible", 0)} / '
                f'{counts.get("failed", 0)}',
                'num',
            ),
        ],
    ]
    return _table(['statistic', 'value'], rows)


def _design_variable_table(data):
    """Return the table of the design variables at the optima."""
    rows = []
    for path, d in (data.get('design_variables') or {}).items():
        shown, factor = display_units(d.get('units'))

        def cell(key, d=d, factor=factor):
            value = _number(d.get(key))
            return _td(NONE if value is None else _sig(value * factor), 'num')

        rows.append(
            [
                _raw_td(f'{_esc(input_label(path))} <code>{_esc(path)}</code>'),
                _td(pretty_units(shown)),
                cell('lower'),
                cell('p05'),
                cell('p50'),
                cell('p95'),
                cell('upper'),
                _td(f'{d.get("at_lower", NONE)} / {d.get("at_upper", NONE)}', 'num'),
            ]
        )
    return _table(
        [
            'design variable',
            'units',
            'lower bound',
            '5 %',
            'median',
            '95 %',
            'upper bound',
            'optima at lower / upper bound',
        ],
        rows,
    )


def _failures_table(data):
    """Return the list of the samples without an optimum (or '')."""
    bad = data.get('unsuccessful_samples') or []
    if not bad:
        return ''
    rows = [
        [_td(str(b.get('sample')), 'num'), _td(str(b.get('status'))), _td(str(b.get('message')))]
        for b in bad[:MAX_ROWS]
    ]
    out = [
        '<h3>Samples without an optimum</h3>',
        f'<p class="note">{len(bad)} samples have no optimum of both aircraft; they are left '
        'out of the probability and the statistics, and listed here with the optimiser\'s '
        'message (and in the CSV file).</p>',
        _table(['sample', 'status', 'message'], rows),
    ]
    if len(bad) > MAX_ROWS:
        out.append(f'<p class="note">First {MAX_ROWS} of {len(bad)} shown.</p>')
    return '\n'.join(out)


def optimized_montecarlo_study(data, rows, figures):
    """
    Return the Study of a Monte Carlo study that re-optimises both aircraft per sample.

    Parameters
    ----------
    data : dict
        Its summary (``kind`` 'montecarlo_optimized').
    rows : list of dict
        Its CSV rows (the section reads the summary; the rows stay in the CSV file).
    figures : _Figures
        The figures of the results directory.

    Returns
    -------
    Study
        The section.
    """
    config = data.get('config') or {}
    field = _fuel_field_of(data, config)
    headline, sentence = _answer(data)
    body = [f'<p>{sentence}</p>']
    body.append(figures.take('montecarlo_optimized.png'))
    body.append('<h3>Distribution of the fuel-burn change of the optima</h3>')
    body.append(_statistics_table(data))
    body.append(
        '<p class="note">The interval is the Wilson score interval of a binomial proportion '
        '(Wilson 1927): it says how well this many samples pin the probability down, not how '
        'uncertain the model is.</p>'
    )
    body.append(_failures_table(data))
    body.append('<h3>Design variables of the turbo-electric optima</h3>')
    body.append(figures.take('montecarlo_optimized_design.png'))
    body.append(_design_variable_table(data))
    ref = data.get('reference') or {}
    body.append('<h3>Inputs of the study</h3>')
    body.append(
        _table(
            ['technology input', 'distribution'],
            [
                [
                    _raw_td(f'{_esc(input_label(p))} <code>{_esc(p)}</code>'),
                    _td(_distribution_text(s)),
                ]
                for p, s in (data.get('distributions') or {}).items()
            ],
        )
    )
    body.append(
        _key_values(
            [
                ('samples', str(data.get('samples', NONE))),
                ('seed', str(data.get('seed', NONE))),
                ('analysis', str(data.get('analysis', NONE))),
                ('objective', str(data.get('objective', NONE))),
                (
                    'conventional reference',
                    f'optimised {ref.get("optimised", NONE)}: {ref.get("why", "")}',
                ),
            ]
        )
    )
    if data.get('figures_note'):
        body.append(f'<p class="note">{_esc(data["figures_note"])}</p>')
    return Study(
        'montecarlo_optimized',
        'Monte Carlo, both aircraft re-optimised per sample',
        headline,
        _fuel_words(field, config),
        REFERENCE,
        '\n'.join(b for b in body if b),
        config,
        sentence,
    )
